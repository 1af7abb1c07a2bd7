package web

import (
	"bytes"
	"fmt"
	"image/color"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgsvg"

	"residuum/assess"
)

// seriesStyle is one entry of the plot style cycle: colour, dash pattern and marker all differ,
// so series stay distinct in greyscale print.
type seriesStyle struct {
	Colour color.RGBA
	Dash   []vg.Length
	Glyph  draw.GlyphDrawer
}

var seriesStyles = []seriesStyle{
	{colSeriesA, nil, draw.CircleGlyph{}},
	{colSeriesB, []vg.Length{vg.Points(6), vg.Points(3)}, draw.TriangleGlyph{}},
	{colSeriesC, []vg.Length{vg.Points(1.5), vg.Points(2.5)}, draw.BoxGlyph{}},
	{colSeriesD, []vg.Length{vg.Points(6), vg.Points(2), vg.Points(1.5), vg.Points(2)}, draw.CrossGlyph{}},
	{colMuted, []vg.Length{vg.Points(10), vg.Points(3)}, draw.RingGlyph{}},
	{colFire, []vg.Length{vg.Points(3), vg.Points(3)}, draw.PlusGlyph{}},
}

func sans(size float64) font.Font {
	return font.Font{Typeface: "Liberation", Variant: "Sans", Size: vg.Points(size)}
}

// newPlot makes a plot with Residuum's text styles and labelled axes (units in the labels).
func newPlot(title, xLabel, yLabel string) *plot.Plot {
	p := plot.New()
	p.Title.Text = title
	p.Title.TextStyle.Font = sans(11)
	p.Title.TextStyle.Color = colInk
	p.X.Label.Text, p.Y.Label.Text = xLabel, yLabel
	for _, ax := range []*plot.Axis{&p.X, &p.Y} {
		ax.Label.TextStyle.Font = sans(10)
		ax.Label.TextStyle.Color = colInk
		ax.Tick.Label.Font = sans(9)
		ax.Tick.Label.Color = colInk
		ax.LineStyle.Color = colInk
		ax.Tick.LineStyle.Color = colInk
	}
	p.Legend.TextStyle.Font = sans(8.5)
	p.Legend.Padding = vg.Points(2.5)
	p.X.Tick.Marker = cleanTicks{}
	p.Y.Tick.Marker = cleanTicks{}
	p.Legend.TextStyle.Color = colInk
	p.Legend.Top = true
	p.BackgroundColor = color.White
	g := plotter.NewGrid()
	g.Vertical.Color = mustHex("#e3e5e9")
	g.Horizontal.Color = mustHex("#e3e5e9")
	p.Add(g)
	return p
}

// addSeries adds a line with markers at about eight places along it, styled by index k.
func addSeries(p *plot.Plot, k int, name string, xy [][2]float64) error {
	if len(xy) == 0 {
		return nil
	}
	st := seriesStyles[k%len(seriesStyles)]
	pts := make(plotter.XYs, 0, len(xy))
	for _, q := range xy {
		if math.IsNaN(q[0]) || math.IsNaN(q[1]) || math.IsInf(q[0], 0) || math.IsInf(q[1], 0) {
			continue
		}
		pts = append(pts, plotter.XY{X: q[0], Y: q[1]})
	}
	if len(pts) == 0 {
		return nil
	}
	l, err := plotter.NewLine(pts)
	if err != nil {
		return fmt.Errorf("line %q: %w", name, err)
	}
	l.Color, l.Width, l.Dashes = st.Colour, vg.Points(1.6), st.Dash
	step := max(len(pts)/8, 1)
	var marks plotter.XYs
	for i := step / 2; i < len(pts); i += step {
		marks = append(marks, pts[i])
	}
	sc, err := plotter.NewScatter(marks)
	if err != nil {
		return fmt.Errorf("markers %q: %w", name, err)
	}
	sc.GlyphStyle = draw.GlyphStyle{Color: st.Colour, Radius: vg.Points(3), Shape: st.Glyph}
	p.Add(l, sc)
	if name != "" {
		p.Legend.Add(name, l, sc)
	}
	return nil
}

// addRule adds a thin reference line (a demand, a heating end) without markers.
func addRule(p *plot.Plot, name string, a, b [2]float64, c color.RGBA, dash []vg.Length) error {
	l, err := plotter.NewLine(plotter.XYs{{X: a[0], Y: a[1]}, {X: b[0], Y: b[1]}})
	if err != nil {
		return fmt.Errorf("rule %q: %w", name, err)
	}
	l.Color, l.Width, l.Dashes = c, vg.Points(1), dash
	p.Add(l)
	if name != "" {
		p.Legend.Add(name, l)
	}
	return nil
}

// fireCurvePlot is the gas temperature the section was solved for. When the fire was fitted to
// the evidence it also shows, as a light band edged with dashed lines, the curves of the range of
// severities consistent with the evidence (fo: the input's fit options, needed for the parametric family).
func fireCurvePlot(res *assess.Result, fo *assess.FitOptions) (*plot.Plot, error) {
	if len(res.FireCurve) == 0 {
		return nil, nil
	}
	title := "Gas temperature"
	if res.Fire != nil {
		title = res.Fire.Name
		if res.Fire.Source == "fitted" {
			title += " (fitted to the evidence)"
		}
	}
	p := newPlot(wrapTitle(title, 60), "time (min)", "gas temperature (°C)")
	band, err := fittedFireBand(res, fo)
	if err != nil {
		return nil, err
	}
	if band != nil {
		if err := addBand(p, fireBandLabel, band); err != nil {
			return nil, err
		}
	}
	if err := addSeries(p, 0, "gas", res.FireCurve); err != nil {
		return nil, err
	}
	if f := res.Fire; f != nil && f.HeatingEndMin > 0 && !math.IsInf(f.HeatingEndMin, 0) {
		top := f.PeakGasC
		if top <= 0 {
			top = 1000
		}
		if err := addRule(p, fmt.Sprintf("end of heating, %s min", fmtSig(f.HeatingEndMin)), [2]float64{f.HeatingEndMin, 0},
			[2]float64{f.HeatingEndMin, top}, colSeriesB, []vg.Length{vg.Points(4), vg.Points(3)}); err != nil {
			return nil, err
		}
	}
	p.Y.Min = 0
	p.Legend.Left = false
	return p, nil
}

// addBand fills the region between two curves sampled at the same times with a light tint and
// edges it with thin dashed lines, so it reads as a band in colour and in greyscale.
func addBand(p *plot.Plot, name string, b *fireBand) error {
	n := len(b.Low)
	if n < 2 || len(b.High) != n {
		return fmt.Errorf("band %q: need two curves of the same length ≥ 2, have %d and %d", name, n, len(b.High))
	}
	upper := make(plotter.XYs, n)
	lower := make(plotter.XYs, n)
	for i := range n {
		lo, hi := b.Low[i][1], b.High[i][1]
		upper[i] = plotter.XY{X: b.Low[i][0], Y: math.Max(lo, hi)}
		lower[i] = plotter.XY{X: b.Low[i][0], Y: math.Min(lo, hi)}
	}
	ring := make(plotter.XYs, 0, 2*n)
	ring = append(ring, upper...)
	for i := n - 1; i >= 0; i-- {
		ring = append(ring, lower[i])
	}
	poly, err := plotter.NewPolygon(ring)
	if err != nil {
		return fmt.Errorf("band %q: %w", name, err)
	}
	poly.Color = colBand
	poly.LineStyle.Width = 0
	dash := []vg.Length{vg.Points(3), vg.Points(2)}
	edges := make([]*plotter.Line, 0, 2)
	for _, xy := range []plotter.XYs{upper, lower} {
		l, err := plotter.NewLine(xy)
		if err != nil {
			return fmt.Errorf("band %q edge: %w", name, err)
		}
		l.Color, l.Width, l.Dashes = colMuted, vg.Points(0.9), dash
		edges = append(edges, l)
	}
	p.Add(poly, edges[0], edges[1])
	p.Legend.Add(name, poly, edges[0])
	return nil
}

// rebarPlot is the temperature history at the bar centres: one line per distinct history (bars of
// a symmetric layer share one), at most six.
func rebarPlot(res *assess.Result) (*plot.Plot, error) {
	if len(res.Rebar) == 0 {
		return nil, nil
	}
	p := newPlot("Temperature at the bar centres", "time (min)", "steel temperature (°C)")
	var seen []float64
	k := 0
	for _, b := range res.Rebar {
		if len(b.History) == 0 {
			continue
		}
		dup := false
		for _, s := range seen {
			if math.Abs(s-b.PeakC) < 1 {
				dup = true
			}
		}
		if dup || k >= len(seriesStyles) {
			continue
		}
		seen = append(seen, b.PeakC)
		name := fmt.Sprintf("%s, peak %s °C", b.Label, fmtNum(b.PeakC, 0))
		if err := addSeries(p, k, name, b.History); err != nil {
			return nil, err
		}
		k++
	}
	if k == 0 {
		return nil, nil
	}
	p.Y.Min = 0
	return p, nil
}

// profilePlot is the peak temperature against depth from each exposed face, with the measured
// colour-change depths (marker at the isotherm, bar ± one standard deviation).
func profilePlot(res *assess.Result, ev *assess.Evidence) (*plot.Plot, error) {
	if len(res.Profiles) == 0 {
		return nil, nil
	}
	p := newPlot("Peak temperature against depth", "depth from the exposed face (mm)", "peak temperature (°C)")
	faceStyle := map[string]int{}
	for k, pr := range res.Profiles {
		faceStyle[pr.Face] = k
		if err := addSeries(p, k, pr.Face+" face", pr.Points); err != nil {
			return nil, err
		}
	}
	xmax := 0.0
	for _, pr := range res.Profiles {
		if n := len(pr.Points); n > 0 {
			xmax = math.Max(xmax, pr.Points[n-1][0])
		}
	}
	for _, c := range []float64{300, 500, 600} {
		if err := addRule(p, "", [2]float64{0, c}, [2]float64{xmax, c}, mustHex("#9aa1ab"), []vg.Length{vg.Points(1), vg.Points(3)}); err != nil {
			return nil, err
		}
	}
	if ev != nil {
		for _, c := range ev.ColourDepths {
			iso, sd := c.IsothermC, c.SdMM
			if iso == 0 {
				iso = 300
			}
			if sd == 0 {
				sd = 5
			}
			st := seriesStyles[faceStyle[c.Face]%len(seriesStyles)]
			bar, err := plotter.NewLine(plotter.XYs{{X: math.Max(c.DepthMM-sd, 0), Y: iso}, {X: c.DepthMM + sd, Y: iso}})
			if err != nil {
				return nil, fmt.Errorf("evidence bar: %w", err)
			}
			bar.Color, bar.Width = colInk, vg.Points(1.2)
			sc, err := plotter.NewScatter(plotter.XYs{{X: c.DepthMM, Y: iso}})
			if err != nil {
				return nil, fmt.Errorf("evidence marker: %w", err)
			}
			sc.GlyphStyle = draw.GlyphStyle{Color: colInk, Radius: vg.Points(4.5), Shape: draw.PyramidGlyph{}}
			_ = st
			p.Add(bar, sc)
			p.Legend.Add(fmt.Sprintf("measured %s °C, %s face: %s ± %s mm", fmtInput(iso), c.Face, fmtInput(c.DepthMM), fmtInput(sd)), sc)
		}
	}
	p.Y.Min = 0
	p.Legend.Left = false
	return p, nil
}

// momentCurvaturePlot compares the undamaged and residual characteristic curves in one direction,
// with the demand as a reference line.
func momentCurvaturePlot(res *assess.Result, dir string) (*plot.Plot, error) {
	pair, cap := res.MomentCurvature.Sagging, res.Capacity.Sagging
	if dir == "hogging" {
		pair, cap = res.MomentCurvature.Hogging, res.Capacity.Hogging
	}
	if len(pair.Undamaged) == 0 && len(pair.Residual) == 0 {
		return nil, nil
	}
	unit := "kN·m"
	if res.Member.PerMetre {
		unit = "kN·m per m"
	}
	title := strings.ToUpper(dir[:1]) + dir[1:] + " moment–curvature"
	p := newPlot(title, "curvature κ (1/m)", "moment M ("+unit+")")
	if err := addSeries(p, 0, fmt.Sprintf("undamaged, M_u %s", fmtSig(cap.UndamagedKNm)), pair.Undamaged); err != nil {
		return nil, err
	}
	if err := addSeries(p, 1, fmt.Sprintf("residual, M_u %s", fmtSig(cap.ResidualKNm)), pair.Residual); err != nil {
		return nil, err
	}
	if cap.DemandKNm > 0 {
		kmax := 0.0
		for _, c := range [][][2]float64{pair.Undamaged, pair.Residual} {
			for _, q := range c {
				kmax = math.Max(kmax, q[0])
			}
		}
		if err := addRule(p, fmt.Sprintf("demand %s", fmtSig(cap.DemandKNm)), [2]float64{0, cap.DemandKNm}, [2]float64{kmax, cap.DemandKNm},
			colSeriesD, []vg.Length{vg.Points(6), vg.Points(2), vg.Points(1.5), vg.Points(2)}); err != nil {
			return nil, err
		}
	}
	p.X.Min, p.Y.Min = 0, 0
	p.Legend.Left = false
	p.Legend.Top = false
	p.Legend.YOffs = vg.Points(4)
	return p, nil
}

// wrapTitle breaks a plot title into lines of at most n characters at spaces
// (a single longer word stays whole), so long fire names fit the plot width.
func wrapTitle(s string, n int) string {
	var lines []string
	line := ""
	for _, w := range strings.Fields(s) {
		switch {
		case line == "":
			line = w
		case utf8.RuneCountInString(line)+1+utf8.RuneCountInString(w) <= n:
			line += " " + w
		default:
			lines = append(lines, line)
			line = w
		}
	}
	if line != "" {
		lines = append(lines, line)
	}
	return strings.Join(lines, "\n")
}

// plotSize is the size the plots are drawn at (points); the pages scale them to their column.
var plotW, plotH = vg.Points(430), vg.Points(300)

// plotSVG renders a plot as an inline SVG element (the XML prologue removed).
func plotSVG(p *plot.Plot, testID, title string) (string, error) {
	c := vgsvg.New(plotW, plotH)
	p.Draw(draw.New(c))
	var b bytes.Buffer
	if _, err := c.WriteTo(&b); err != nil {
		return "", fmt.Errorf("render plot %s: %w", testID, err)
	}
	s := b.String()
	if i := strings.Index(s, "<svg"); i >= 0 {
		s = s[i:]
	}
	attrs := fmt.Sprintf(`<svg role="img" aria-label="%s" data-testid="%s" class="drawing"`, htmlAttr(title), testID)
	return strings.Replace(s, "<svg", attrs, 1), nil
}

// plotPNG renders a plot as a PNG at the given resolution, for the PDF report.
func plotPNG(p *plot.Plot, w, h vg.Length, dpi int) ([]byte, error) {
	c := vgimg.NewWith(vgimg.UseWH(w, h), vgimg.UseDPI(dpi), vgimg.UseBackgroundColor(color.White))
	p.Draw(draw.New(c))
	var b bytes.Buffer
	if _, err := (vgimg.PngCanvas{Canvas: c}).WriteTo(&b); err != nil {
		return nil, fmt.Errorf("render png: %w", err)
	}
	return b.Bytes(), nil
}

func htmlAttr(s string) string {
	r := strings.NewReplacer(`&`, "&amp;", `"`, "&quot;", `<`, "&lt;", `>`, "&gt;")
	return r.Replace(s)
}

// plotT is the plot type the figure builders return.
type plotT = *plot.Plot

// cleanTicks are gonum's default tick positions with labels that carry no trailing zeros
// ("50", not "50.00").
type cleanTicks struct{}

// Ticks returns the default ticks for [min, max] relabelled.
func (cleanTicks) Ticks(min, max float64) []plot.Tick {
	ts := plot.DefaultTicks{}.Ticks(min, max)
	for i := range ts {
		if ts[i].Label != "" {
			ts[i].Label = strconv.FormatFloat(ts[i].Value, 'f', -1, 64)
			if len(ts[i].Label) > 8 {
				ts[i].Label = strconv.FormatFloat(ts[i].Value, 'g', 4, 64)
			}
		}
	}
	return ts
}
