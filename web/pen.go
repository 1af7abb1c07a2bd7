package web

import (
	"fmt"
	"html"
	"strconv"
	"strings"

	"codeberg.org/go-pdf/fpdf"
)

// pt is a point in drawing units (px in SVG, before scaling for PDF), y growing downwards.
type pt struct{ X, Y float64 }

// stroke describes how a shape is drawn. Empty Stroke means no outline, empty Fill no fill.
type stroke struct {
	Stroke string    // #rrggbb
	Width  float64   // drawing units
	Dash   []float64 // dash pattern, drawing units; nil = solid
	Fill   string    // #rrggbb
}

// textStyle describes a text run.
type textStyle struct {
	Size   float64 // drawing units (≈ px)
	Anchor string  // "start" | "middle" | "end"
	Colour string  // #rrggbb
	Bold   bool
	Rotate bool // vertical, reading upwards
}

// pen is the small set of primitives the hand-made drawings (section, heat map) use, so the same
// drawing code produces SVG for the pages and vector graphics in the PDF report.
type pen interface {
	Rect(x, y, w, h float64, s stroke)
	Circle(cx, cy, r float64, s stroke)
	Line(x1, y1, x2, y2 float64, s stroke)
	Polyline(p []pt, s stroke)
	Polygon(p []pt, s stroke)
	Text(x, y float64, s string, ts textStyle)
	// Group opens a group with a test id and an accessible title (SVG only; ignored in PDF).
	Group(testID, title string)
	End()
}

// svgPen writes SVG elements into a builder.
type svgPen struct{ b strings.Builder }

func f1(v float64) string { return strconv.FormatFloat(v, 'f', 1, 64) }

func (p *svgPen) attrs(s stroke) string {
	var a strings.Builder
	if s.Fill != "" {
		fmt.Fprintf(&a, ` fill="%s"`, s.Fill)
	} else {
		a.WriteString(` fill="none"`)
	}
	if s.Stroke != "" {
		fmt.Fprintf(&a, ` stroke="%s" stroke-width="%s"`, s.Stroke, f1(s.Width))
		if len(s.Dash) > 0 {
			ds := make([]string, len(s.Dash))
			for i, d := range s.Dash {
				ds[i] = f1(d)
			}
			fmt.Fprintf(&a, ` stroke-dasharray="%s"`, strings.Join(ds, " "))
		}
	}
	return a.String()
}

func (p *svgPen) Rect(x, y, w, h float64, s stroke) {
	fmt.Fprintf(&p.b, `<rect x="%s" y="%s" width="%s" height="%s"%s/>`, f1(x), f1(y), f1(w), f1(h), p.attrs(s))
}

func (p *svgPen) Circle(cx, cy, r float64, s stroke) {
	fmt.Fprintf(&p.b, `<circle cx="%s" cy="%s" r="%s"%s/>`, f1(cx), f1(cy), strconv.FormatFloat(r, 'f', 2, 64), p.attrs(s))
}

func (p *svgPen) Line(x1, y1, x2, y2 float64, s stroke) {
	fmt.Fprintf(&p.b, `<line x1="%s" y1="%s" x2="%s" y2="%s"%s/>`, f1(x1), f1(y1), f1(x2), f1(y2), p.attrs(s))
}

func pointsAttr(ps []pt) string {
	var b strings.Builder
	for i, q := range ps {
		if i > 0 {
			b.WriteByte(' ')
		}
		b.WriteString(f1(q.X))
		b.WriteByte(',')
		b.WriteString(f1(q.Y))
	}
	return b.String()
}

func (p *svgPen) Polyline(ps []pt, s stroke) {
	fmt.Fprintf(&p.b, `<polyline points="%s"%s/>`, pointsAttr(ps), p.attrs(s))
}

func (p *svgPen) Polygon(ps []pt, s stroke) {
	fmt.Fprintf(&p.b, `<polygon points="%s"%s/>`, pointsAttr(ps), p.attrs(s))
}

func (p *svgPen) Text(x, y float64, s string, ts textStyle) {
	anchor := ts.Anchor
	if anchor == "" {
		anchor = "start"
	}
	col := ts.Colour
	if col == "" {
		col = hexOf(colInk)
	}
	extra := ""
	if ts.Bold {
		extra += ` font-weight="bold"`
	}
	if ts.Rotate {
		extra += fmt.Sprintf(` transform="rotate(-90 %s %s)"`, f1(x), f1(y))
	}
	fmt.Fprintf(&p.b, `<text x="%s" y="%s" font-size="%s" text-anchor="%s" fill="%s"%s>%s</text>`,
		f1(x), f1(y), f1(ts.Size), anchor, col, extra, html.EscapeString(s))
}

func (p *svgPen) Group(testID, title string) {
	fmt.Fprintf(&p.b, `<g data-testid="%s"><title>%s</title>`, html.EscapeString(testID), html.EscapeString(title))
}

func (p *svgPen) End() { p.b.WriteString(`</g>`) }

// svgDocument wraps drawn elements into an inline <svg> with a viewBox, an accessible title and
// a test id.
func svgDocument(w, h float64, testID, title, body string) string {
	return fmt.Sprintf(`<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 %s %s" width="%s" height="%s" role="img" aria-labelledby="%s-t" data-testid="%s" class="drawing" font-family="Liberation Sans, Arial, Helvetica, sans-serif"><title id="%s-t">%s</title>%s</svg>`,
		f1(w), f1(h), f1(w), f1(h), testID, testID, testID, html.EscapeString(title), body)
}

// pdfPen draws onto an fpdf page: drawing unit u maps to X0 + u·Scale mm (same for y).
type pdfPen struct {
	f      *fpdf.Fpdf
	X0, Y0 float64
	Scale  float64 // mm per drawing unit
	font   string  // UTF-8 font family registered on f
}

func rgbOf(hex string) (int, int, int) {
	c := mustHex(hex)
	return int(c.R), int(c.G), int(c.B)
}

func (p *pdfPen) style(s stroke) string {
	st := ""
	if s.Fill != "" {
		p.f.SetFillColor(rgbOf(s.Fill))
		st += "F"
	}
	if s.Stroke != "" {
		p.f.SetDrawColor(rgbOf(s.Stroke))
		p.f.SetLineWidth(s.Width * p.Scale)
		if len(s.Dash) > 0 {
			ds := make([]float64, len(s.Dash))
			for i, d := range s.Dash {
				ds[i] = d * p.Scale
			}
			p.f.SetDashPattern(ds, 0)
		} else {
			p.f.SetDashPattern(nil, 0)
		}
		st += "D"
	}
	return st
}

func (p *pdfPen) x(v float64) float64 { return p.X0 + v*p.Scale }
func (p *pdfPen) y(v float64) float64 { return p.Y0 + v*p.Scale }

func (p *pdfPen) Rect(x, y, w, h float64, s stroke) {
	if st := p.style(s); st != "" {
		p.f.Rect(p.x(x), p.y(y), w*p.Scale, h*p.Scale, st)
	}
}

func (p *pdfPen) Circle(cx, cy, r float64, s stroke) {
	if st := p.style(s); st != "" {
		p.f.Circle(p.x(cx), p.y(cy), r*p.Scale, st)
	}
}

func (p *pdfPen) Line(x1, y1, x2, y2 float64, s stroke) {
	if s.Stroke == "" {
		return
	}
	p.style(stroke{Stroke: s.Stroke, Width: s.Width, Dash: s.Dash})
	p.f.Line(p.x(x1), p.y(y1), p.x(x2), p.y(y2))
}

func (p *pdfPen) Polyline(ps []pt, s stroke) {
	if s.Stroke == "" || len(ps) < 2 {
		return
	}
	p.style(stroke{Stroke: s.Stroke, Width: s.Width, Dash: s.Dash})
	p.f.MoveTo(p.x(ps[0].X), p.y(ps[0].Y))
	for _, q := range ps[1:] {
		p.f.LineTo(p.x(q.X), p.y(q.Y))
	}
	p.f.DrawPath("D")
}

func (p *pdfPen) Polygon(ps []pt, s stroke) {
	if len(ps) < 3 {
		return
	}
	st := p.style(s)
	if st == "" {
		return
	}
	q := make([]fpdf.PointType, len(ps))
	for i, v := range ps {
		q[i] = fpdf.PointType{X: p.x(v.X), Y: p.y(v.Y)}
	}
	p.f.Polygon(q, st)
}

func (p *pdfPen) Text(x, y float64, s string, ts textStyle) {
	style := ""
	if ts.Bold {
		style = "B"
	}
	sizePt := ts.Size * p.Scale * 72 / 25.4
	p.f.SetFont(p.font, style, sizePt)
	col := ts.Colour
	if col == "" {
		col = hexOf(colInk)
	}
	p.f.SetTextColor(rgbOf(col))
	w := p.f.GetStringWidth(s)
	if ts.Rotate {
		dy := 0.0
		switch ts.Anchor {
		case "middle":
			dy = w / 2
		case "end":
			dy = w
		}
		p.f.TransformBegin()
		p.f.TransformRotate(90, p.x(x), p.y(y))
		p.f.Text(p.x(x)-dy, p.y(y), s)
		p.f.TransformEnd()
		return
	}
	dx := 0.0
	switch ts.Anchor {
	case "middle":
		dx = w / 2
	case "end":
		dx = w
	}
	p.f.Text(p.x(x)-dx, p.y(y), s)
}

func (p *pdfPen) Group(string, string) {}
func (p *pdfPen) End()                 {}
