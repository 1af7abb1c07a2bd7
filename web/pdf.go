package web

import (
	"bytes"
	"fmt"
	"net/http"
	"strings"

	"codeberg.org/go-fonts/liberation/liberationsansbold"
	"codeberg.org/go-fonts/liberation/liberationsansregular"
	"codeberg.org/go-pdf/fpdf"
	"gonum.org/v1/plot/vg"

	"residuum/assess"
)

// The PDF report is drawn with fpdf on A4 portrait: text in Liberation Sans (embedded, so every
// symbol of the trade — °, κ, γ, ·, – — prints), the section and the heat map as vector graphics
// through the same pen as the SVG drawings, and the line plots rasterised from gonum/plot at
// 200 dpi. Streams are left uncompressed so the text of a filed report can be searched and
// checked by simple tools.

const (
	pdfFont   = "rsans"
	pdfMargin = 15.0 // mm
	pdfLine   = 4.6  // mm, body line height
)

type pdfDoc struct {
	f    *fpdf.Fpdf
	w, h float64 // page size, mm
}

func newPDFDoc(title, footer string) *pdfDoc {
	f := fpdf.New("P", "mm", "A4", "")
	f.SetCompression(false)
	f.AddUTF8FontFromBytes(pdfFont, "", liberationsansregular.TTF)
	f.AddUTF8FontFromBytes(pdfFont, "B", liberationsansbold.TTF)
	f.SetMargins(pdfMargin, pdfMargin+4, pdfMargin)
	f.SetAutoPageBreak(true, pdfMargin+6)
	f.SetTitle(title, true)
	f.SetCreator("Residuum", true)
	f.AliasNbPages("{nb}")
	d := &pdfDoc{f: f}
	d.w, d.h = f.GetPageSize()
	f.SetHeaderFunc(func() {
		f.SetFont(pdfFont, "", 7.5)
		f.SetTextColor(rgbOf(hexOf(colMuted)))
		f.SetXY(pdfMargin, 8)
		f.CellFormat(d.w-2*pdfMargin, 4, "Residuum · post-fire residual capacity assessment", "B", 0, "L", false, 0, "")
		f.SetXY(pdfMargin, pdfMargin+4)
	})
	f.SetFooterFunc(func() {
		f.SetY(-12)
		f.SetFont(pdfFont, "", 7.5)
		f.SetTextColor(rgbOf(hexOf(colMuted)))
		f.CellFormat(d.w-2*pdfMargin, 4, fmt.Sprintf("%s · page %d of {nb}", footer, f.PageNo()), "T", 0, "L", false, 0, "")
	})
	f.AddPage()
	return d
}

func (d *pdfDoc) ink() { d.f.SetTextColor(rgbOf(hexOf(colInk))) }

func (d *pdfDoc) textWidth() float64 { return d.w - 2*pdfMargin }

// need starts a new page unless h mm are left above the bottom margin.
func (d *pdfDoc) need(h float64) {
	if d.f.GetY()+h > d.h-pdfMargin-6 {
		d.f.AddPage()
	}
}

func (d *pdfDoc) heading(s string) {
	d.need(14)
	d.f.Ln(2.5)
	d.f.SetFont(pdfFont, "B", 11.5)
	d.ink()
	d.f.CellFormat(d.textWidth(), 6.5, s, "B", 1, "L", false, 0, "")
	d.f.Ln(1.5)
}

func (d *pdfDoc) para(s string, size float64, bold bool) {
	st := ""
	if bold {
		st = "B"
	}
	d.f.SetFont(pdfFont, st, size)
	d.ink()
	d.f.MultiCell(d.textWidth(), size*0.45, s, "", "L", false)
	d.f.Ln(1)
}

// table draws rows with wrapped cells; widths are fractions of the text width; the first row is a
// header when header is true.
func (d *pdfDoc) table(widths []float64, rows [][]string, header bool, size float64) {
	f := d.f
	lh := size * 0.42
	for ri, row := range rows {
		bold := header && ri == 0
		st := ""
		if bold {
			st = "B"
		}
		f.SetFont(pdfFont, st, size)
		lines := make([][]string, len(row))
		n := 1
		for i, c := range row {
			w := widths[i]*d.textWidth() - 2
			lines[i] = f.SplitText(c, w)
			n = max(n, len(lines[i]))
		}
		h := float64(n)*lh + 1.6
		if bold && ri+1 < len(rows) {
			d.need(h + 3*lh + 2) // keep a header with its first row
		} else {
			d.need(h)
		}
		x0, y0 := pdfMargin, f.GetY()
		if bold {
			f.SetFillColor(rgbOf(hexOf(colPanel)))
			f.Rect(x0, y0, d.textWidth(), h, "F")
		}
		x := x0
		for i := range row {
			w := widths[i] * d.textWidth()
			f.SetXY(x+1, y0+0.8)
			d.ink()
			for k, ln := range lines[i] {
				f.SetXY(x+1, y0+0.8+float64(k)*lh)
				f.CellFormat(w-2, lh, ln, "", 0, "L", false, 0, "")
			}
			x += w
		}
		f.SetDrawColor(rgbOf(hexOf(colRule)))
		f.SetLineWidth(0.2)
		f.SetDashPattern(nil, 0)
		f.Line(x0, y0+h, x0+d.textWidth(), y0+h)
		f.SetXY(x0, y0+h)
	}
	f.Ln(1.5)
}

// image places a PNG w mm wide at the current position (or beside, at x).
func (d *pdfDoc) image(name string, png []byte, x, y, w float64) {
	opt := fpdf.ImageOptions{ImageType: "PNG"}
	d.f.RegisterImageOptionsReader(name, opt, bytes.NewReader(png))
	d.f.ImageOptions(name, x, y, w, 0, false, opt, 0, "")
}

// nullPen measures a drawing without drawing it.
type nullPen struct{}

func (nullPen) Rect(float64, float64, float64, float64, stroke) {}
func (nullPen) Circle(float64, float64, float64, stroke)        {}
func (nullPen) Line(float64, float64, float64, float64, stroke) {}
func (nullPen) Polyline([]pt, stroke)                           {}
func (nullPen) Polygon([]pt, stroke)                            {}
func (nullPen) Text(float64, float64, string, textStyle)        {}
func (nullPen) Group(string, string)                            {}
func (nullPen) End()                                            {}

// reportPDF writes the PDF report of a revision.
func reportPDF(v resultView, in assess.Input, res *assess.Result) ([]byte, error) {
	state := "draft"
	if v.Issued {
		state = "issued " + v.IssuedAt
	}
	footer := fmt.Sprintf("%s · %s · revision %d (%s) · %s", v.ProjectName, v.Label, v.Rev, state, v.Method)
	d := newPDFDoc(fmt.Sprintf("Post-fire assessment %s revision %d", v.Label, v.Rev), footer)
	f := d.f

	f.SetFont(pdfFont, "B", 16)
	d.ink()
	f.CellFormat(d.textWidth(), 8, "Post-fire residual capacity assessment", "", 1, "L", false, 0, "")
	f.SetFont(pdfFont, "", 9)
	f.SetTextColor(rgbOf(hexOf(colMuted)))
	f.CellFormat(d.textWidth(), 5, "Screening and decision support for qualified engineers", "", 1, "L", false, 0, "")
	f.Ln(2)
	if !v.Issued {
		f.SetFont(pdfFont, "B", 10)
		f.SetTextColor(rgbOf(hexOf(colCaution)))
		f.SetDrawColor(rgbOf(hexOf(colCaution)))
		f.SetLineWidth(0.4)
		f.CellFormat(d.textWidth(), 7, "DRAFT — not issued. This revision may still be superseded; issue it before filing.", "1", 1, "C", false, 0, "")
		f.Ln(1)
	}

	d.heading("Identification")
	ident := [][]string{{"Project", v.ProjectName}}
	if v.ProjectSite != "" {
		ident = append(ident, []string{"Site", v.ProjectSite})
	}
	if v.ProjectRef != "" {
		ident = append(ident, []string{"Client reference", v.ProjectRef})
	}
	ident = append(ident, []string{"Member", v.Label + " (" + v.Kind + ")"})
	if v.Location != "" {
		ident = append(ident, []string{"Location", v.Location})
	}
	ident = append(ident, []string{"Revision", fmt.Sprintf("%d, %s", v.Rev, state)}, []string{"Run", v.Created},
		[]string{"Method version", v.Method}, []string{"Input SHA-256", v.InputHash})
	d.table([]float64{0.28, 0.72}, ident, false, 9)

	// cautions: boxed, before the results
	d.need(30)
	d.heading("Cautions and limitations")
	f.SetFont(pdfFont, "", 8.8)
	for _, c := range v.Cautions {
		lines := f.SplitText(c, d.textWidth()-8)
		d.need(float64(len(lines))*4 + 1)
		y := f.GetY()
		f.SetFillColor(rgbOf(hexOf(colCaution)))
		f.Rect(pdfMargin, y, 1.2, float64(len(lines))*4, "F")
		f.SetTextColor(rgbOf(hexOf(colCaution)))
		f.SetXY(pdfMargin+4, y)
		f.MultiCell(d.textWidth()-6, 4, c, "", "L", false)
		f.Ln(0.8)
	}

	d.heading("Result")
	d.para(v.Scenario, 9.5, false)
	if v.FireText != "" {
		d.para(v.FireText, 9.5, false)
	}
	var facts [][]string
	for _, ft := range v.Facts {
		facts = append(facts, []string{ft.Name, ft.Value + "  " + ft.Note})
	}
	d.table([]float64{0.28, 0.72}, facts, false, 9.5)
	unit := "kN·m"
	if v.PerMetre {
		unit = "kN·m per metre"
	}
	capRows := [][]string{{"Direction", "Undamaged char.", "Residual char.", "Ratio", "Undamaged design", "Residual design", "Demand", "Utilisation", "Residual mode"}}
	for _, c := range v.Capacity {
		rk := c.ResidualK
		if c.Range != "" {
			rk += " (" + c.Range + ")"
		}
		capRows = append(capRows, []string{c.Dir, c.UndamagedK, rk, c.Ratio, c.UndamagedD, c.ResidualD, c.Demand, c.Util, c.Mode})
	}
	d.para("Capacity, "+unit+". Design: "+v.DesignBasis+".", 8.5, false)
	d.table([]float64{0.1, 0.1, 0.13, 0.07, 0.11, 0.1, 0.08, 0.1, 0.21}, capRows, true, 8)

	d.heading("Damage class " + v.DamageLabel)
	d.para(v.DamageScheme, 8, false)
	rs := [][]string{{"Indicator", "Class", "Finding", "Basis"}}
	for _, r := range v.Reasons {
		rs = append(rs, []string{r.Indicator, fmt.Sprint(r.Class), r.Detail, r.Source})
	}
	d.table([]float64{0.14, 0.07, 0.45, 0.34}, rs, true, 8)
	d.heading("Recommended action")
	d.para(actionName(v.ActionCode)+". "+v.ActionText, 10, true)

	// drawings
	d.heading("Section and peak temperatures")
	d.need(95)
	top := f.GetY()
	geo := geomFromInput(in)
	colW := (d.textWidth() - 6) / 2
	h1 := 0.0
	if geo.W > 0 && geo.D > 0 {
		l := newSectionLayout(geo, 340, 320)
		sc := colW / l.width
		drawSection(&pdfPen{f: f, X0: pdfMargin, Y0: top, Scale: sc, font: pdfFont}, l)
		h1 = l.height * sc
	}
	if w, h, ok := drawHeatMap(nullPen{}, res); ok {
		sc := min(colW/w, 95/h)
		drawHeatMap(&pdfPen{f: f, X0: pdfMargin + colW + 6, Y0: top, Scale: sc, font: pdfFont}, res)
		h1 = max(h1, h*sc)
	}
	f.SetDashPattern(nil, 0)
	f.SetXY(pdfMargin, top+h1+2)
	d.para("Left: the section as entered (bars at true size, exposed faces zig-zagged, spalled zones hatched). Right: peak temperature with the 300 °C (dashed), 500 °C (solid) and 600 °C (dotted) isotherms.", 7.8, false)

	// line plots, two per row
	type pp struct {
		name string
		mk   func() (plotT, error)
	}
	plots := []pp{
		{"fire", func() (plotT, error) { return fireCurvePlot(res, inputFitOptions(in)) }},
		{"rebar", func() (plotT, error) { return rebarPlot(res) }},
		{"profile", func() (plotT, error) { return profilePlot(res, in.Evidence) }},
		{"mk-sagging", func() (plotT, error) { return momentCurvaturePlot(res, "sagging") }},
		{"mk-hogging", func() (plotT, error) { return momentCurvaturePlot(res, "hogging") }},
	}
	pw, ph := vg.Points(430), vg.Points(300)
	imgH := colW * float64(ph) / float64(pw)
	col := 0
	var rowY float64
	for _, pl := range plots {
		p, err := pl.mk()
		if err != nil {
			return nil, err
		}
		if p == nil {
			continue
		}
		png, err := plotPNG(p, pw, ph, 200)
		if err != nil {
			return nil, err
		}
		if col == 0 {
			d.need(imgH + 3)
			rowY = f.GetY()
		}
		d.image("plot-"+pl.name, png, pdfMargin+float64(col)*(colW+6), rowY, colW)
		col++
		if col == 2 {
			col = 0
			f.SetXY(pdfMargin, rowY+imgH+3)
		}
	}
	if col == 1 {
		f.SetXY(pdfMargin, rowY+imgH+3)
	}

	d.heading("Bars")
	br := [][]string{{"Bar", "x, y mm", "Cover mm", "Steel", "Peak °C", "at min", "Threshold °C", "f_y,res/f_yk", "f_y,res MPa", "Note"}}
	for _, b := range v.Bars {
		br = append(br, []string{b.Label, b.Position, b.Cover, b.Steel, b.Peak, b.PeakTime, b.Threshold, b.Factor, b.Fy, b.Note})
	}
	d.table([]float64{0.16, 0.09, 0.1, 0.12, 0.07, 0.06, 0.09, 0.09, 0.08, 0.14}, br, true, 7.5)
	if len(v.Isotherms) > 0 {
		ir := [][]string{{"Face", "300 °C depth, mm", "500 °C depth, mm", "600 °C depth, mm"}}
		for _, r := range v.Isotherms {
			ir = append(ir, []string{r.Face, r.D300, r.D500, r.D600})
		}
		d.table([]float64{0.25, 0.25, 0.25, 0.25}, ir, true, 8)
	}
	var cr [][]string
	for _, r := range v.Concrete {
		cr = append(cr, []string{r.Name, r.Value})
	}
	d.table([]float64{0.35, 0.65}, cr, false, 8.5)
	if v.FitText != "" {
		d.heading("Fit to the site evidence")
		d.para(v.FitText, 9, false)
		var fr [][]string
		for _, r := range v.FitRows {
			fr = append(fr, []string{r.Name, r.Value})
		}
		d.table([]float64{0.35, 0.65}, fr, false, 8.5)
	}
	if len(v.Warnings) > 0 {
		d.heading("Warnings")
		for _, w := range v.Warnings {
			d.para("• "+w, 8.5, false)
		}
	}

	d.heading("Inputs as entered")
	for _, g := range v.Inputs {
		d.para(g.Title, 9.5, true)
		var rows [][]string
		for _, r := range g.Rows {
			rows = append(rows, []string{r.Name, r.Value})
		}
		d.table([]float64{0.3, 0.7}, rows, false, 8.5)
	}

	d.heading("Method and references")
	mr := [][]string{{"Step", "Method", "Version", "Source"}}
	for _, m := range v.Methods {
		mr = append(mr, []string{m.Step, m.Name, m.Version, m.Source})
	}
	d.table([]float64{0.14, 0.34, 0.14, 0.38}, mr, true, 7.8)

	// sign-off
	d.need(62)
	d.heading("Review by the engineer of record")
	d.para("The result above is a screening computation. It is to be checked against local codes, tests of the actual materials and the reviewing engineer's judgement.", 8.5, false)
	y := f.GetY() + 2
	f.SetDrawColor(rgbOf(hexOf(colInk)))
	f.SetLineWidth(0.3)
	f.Rect(pdfMargin, y, d.textWidth(), 44, "D")
	f.SetFont(pdfFont, "", 9)
	d.ink()
	for i, lbl := range []string{"Name and qualification", "Comments", "Signature and date"} {
		yy := y + 4 + float64(i)*13.5
		f.SetXY(pdfMargin+3, yy)
		f.CellFormat(60, 4, lbl, "", 0, "L", false, 0, "")
		f.Line(pdfMargin+3, yy+11, pdfMargin+d.textWidth()-3, yy+11)
	}
	f.SetXY(pdfMargin, y+46)

	var out bytes.Buffer
	if err := f.Output(&out); err != nil {
		return nil, fmt.Errorf("write pdf: %w", err)
	}
	return out.Bytes(), nil
}

func (s *server) handleReportPDF() http.HandlerFunc {
	return func(w http.ResponseWriter, r *http.Request) {
		p, m, a, ok := s.loadRevision(w, r)
		if !ok {
			return
		}
		v, err := buildResultView(p, m, a, false)
		if err != nil {
			s.serveError(w, r, err)
			return
		}
		in, res, err := decodeRevision(a)
		if err != nil {
			s.serveError(w, r, err)
			return
		}
		b, err := reportPDF(v, in, res)
		if err != nil {
			s.serveError(w, r, fmt.Errorf("pdf report of member %d revision %d: %w", m.ID, a.Revision, err))
			return
		}
		name := fmt.Sprintf("residuum-%s-rev%d.pdf", fileSafe(m.Label), a.Revision)
		w.Header().Set("Content-Type", "application/pdf")
		w.Header().Set("Content-Disposition", `attachment; filename="`+name+`"`)
		_, _ = w.Write(b)
	}
}

// fileSafe keeps letters, digits, '-' and '_' of a label for a file name.
func fileSafe(s string) string {
	var b strings.Builder
	for _, r := range s {
		switch {
		case r >= 'a' && r <= 'z', r >= 'A' && r <= 'Z', r >= '0' && r <= '9', r == '-', r == '_':
			b.WriteRune(r)
		case r == ' ' || r == '/' || r == '.':
			b.WriteByte('-')
		}
	}
	if b.Len() == 0 {
		return "member"
	}
	return b.String()
}
