package web

import (
	"fmt"
	"html"
	"math"
	"strings"

	"residuum/assess"
)

// sectionGeom is the cross-section as the drawing needs it, in section millimetres: x from the
// left of the bounding box (a T-beam's flange tip), y from the bottom, as in package assess.
type sectionGeom struct {
	Slab        bool
	W, D        float64 // web (or analysed slab) width, overall depth
	FW, FD      float64 // flange width and depth (0 = rectangle)
	LinkDia     float64
	Bars        []barGeom
	Covers      []coverDim
	Exposed     map[string]bool
	Spalls      []assess.MeasuredSpall
	Colour      []assess.ColourDepth
	Progressive []assess.ProgressiveSpall
	Problems    []string // why parts could not be drawn
}

type barGeom struct{ X, Y, Dia float64 }

// coverDim is a cover dimension to draw: from the face to the surface of the bar at (X, Y).
type coverDim struct {
	Face      string
	X, Y, Dia float64
	Cover     float64 // to the bar surface, mm (includes the link)
}

func (g sectionGeom) isT() bool { return !g.Slab && g.FW > 0 && g.FD > 0 }
func (g sectionGeom) boxW() float64 {
	if g.isT() {
		return math.Max(g.FW, g.W)
	}
	return g.W
}

// web returns the x range of the web.
func (g sectionGeom) web() (float64, float64) {
	if g.isT() {
		x0 := (g.boxW() - g.W) / 2
		return x0, x0 + g.W
	}
	return 0, g.W
}

// webHeight is the height of the web below the flange (the whole depth for a rectangle).
func (g sectionGeom) webHeight() float64 {
	if g.isT() {
		return g.D - g.FD
	}
	return g.D
}

// maxDrawnBars bounds the bars drawn for one layer or list.
const maxDrawnBars = 200

// geomFromInput places the bars of a member by the engine's own layout rule (assess.Member.BarPositions)
// and collects what else the drawing shows. It never fails: parts that cannot be drawn are listed
// in Problems.
func geomFromInput(in assess.Input) sectionGeom {
	m := in.Member
	g := sectionGeom{Slab: m.Kind == assess.KindSlab, W: m.WidthMM, D: m.DepthMM, FW: m.FlangeWidthMM, FD: m.FlangeDepthMM,
		LinkDia: math.Max(m.LinkDiaMM, 0), Exposed: map[string]bool{}}
	if g.Slab {
		g.FW, g.FD, g.LinkDia = 0, 0, 0
		if g.W == 0 {
			g.W = 1000
		}
	}
	if g.isT() && (g.FW < g.W || g.FD >= g.D) {
		g.Problems = append(g.Problems, "the flange must be wider than the web and shallower than the section")
		g.FW, g.FD = 0, 0
	}
	if !(g.W > 0 && g.D > 0) || g.W > 20000 || g.D > 5000 {
		g.Problems = append(g.Problems, "enter a width and a depth to see the section")
		return g
	}
	for _, e := range m.Exposed {
		g.Exposed[e] = true
	}
	if len(m.Exposed) == 0 {
		g.Exposed["bottom"] = true
		if !g.Slab {
			g.Exposed["left"], g.Exposed["right"] = true, true
		}
	}
	// The member as drawn (defaults applied, an impossible flange dropped), laid out by the engine.
	drawn := m
	drawn.Kind = assess.KindBeam
	if g.Slab {
		drawn.Kind = assess.KindSlab
	}
	drawn.WidthMM, drawn.FlangeWidthMM, drawn.FlangeDepthMM, drawn.LinkDiaMM = g.W, g.FW, g.FD, g.LinkDia
	pos := drawn.BarPositions()
	byLayer := map[int][]assess.BarPosition{}
	for _, p := range pos {
		if p.Layer >= 0 {
			byLayer[p.Layer] = append(byLayer[p.Layer], p)
		}
	}
	for li, l := range m.Layers {
		if !(l.DiaMM > 0) || !(l.CoverMM >= 0) {
			g.Problems = append(g.Problems, fmt.Sprintf("layer %d needs a cover and a bar diameter", li+1))
			continue
		}
		if g.Slab && !(l.SpacingMM >= 10) {
			g.Problems = append(g.Problems, fmt.Sprintf("layer %d needs a bar spacing of at least 10 mm", li+1))
			continue
		}
		if !g.Slab && l.Count <= 0 {
			g.Problems = append(g.Problems, fmt.Sprintf("layer %d needs a number of bars", li+1))
			continue
		}
		ps := byLayer[li]
		if len(ps) > maxDrawnBars {
			ps = ps[:maxDrawnBars]
		}
		for _, p := range ps {
			g.Bars = append(g.Bars, barGeom{p.XMM, p.YMM, p.DiaMM})
		}
		if len(ps) > 0 {
			g.Covers = append(g.Covers, coverDim{Face: l.Face, X: ps[0].XMM, Y: ps[0].YMM, Dia: ps[0].DiaMM, Cover: ps[0].CoverMM})
		}
	}
	for _, p := range pos {
		if p.Layer < 0 && p.Index < maxDrawnBars {
			g.Bars = append(g.Bars, barGeom{p.XMM, p.YMM, p.DiaMM})
		}
	}
	if ev := in.Evidence; ev != nil {
		g.Spalls = ev.Spalling
		g.Colour = ev.ColourDepths
	}
	if in.Fire != nil {
		g.Progressive = in.Fire.Spalling
	}
	return g
}

// sectionLayout maps section millimetres to drawing units.
type sectionLayout struct {
	g             sectionGeom
	sc            float64 // drawing units per mm
	ml, mt        float64
	width, height float64
}

func (l sectionLayout) X(x float64) float64 { return l.ml + x*l.sc }
func (l sectionLayout) Y(y float64) float64 { return l.mt + (l.g.D-y)*l.sc }

func newSectionLayout(g sectionGeom, boxW, boxH float64) sectionLayout {
	l := sectionLayout{g: g, ml: 84, mt: 18}
	if g.isT() {
		l.mt = 42
	}
	l.sc = math.Min(boxW/g.boxW(), boxH/g.D)
	l.width = l.ml + g.boxW()*l.sc + 70
	l.height = l.mt + g.D*l.sc + 78
	if len(g.Colour) > 0 {
		l.height += 14
		l.width = math.Max(l.width, 400)
	}
	return l
}

// sectionSVG draws the section as an inline SVG document.
func sectionSVG(g sectionGeom) string {
	if g.W <= 0 || g.D <= 0 || (len(g.Problems) > 0 && g.Bars == nil && len(g.Covers) == 0 && !(g.W > 0 && g.D > 0)) {
		return emptySectionSVG(g.Problems)
	}
	l := newSectionLayout(g, 340, 320)
	var p svgPen
	drawSection(&p, l)
	return svgDocument(l.width, l.height, "section-drawing", sectionTitle(g), p.b.String())
}

func emptySectionSVG(problems []string) string {
	var p svgPen
	msg := "enter a width and a depth to see the section"
	if len(problems) > 0 {
		msg = problems[0]
	}
	p.Rect(10, 10, 380, 120, stroke{Stroke: hexOf(colRule), Width: 1, Dash: []float64{4, 3}})
	p.Text(200, 75, msg, textStyle{Size: 13, Anchor: "middle", Colour: hexOf(colMuted)})
	return svgDocument(400, 140, "section-drawing", "Cross-section (not drawable yet)", p.b.String())
}

func sectionTitle(g sectionGeom) string {
	kind := "Beam"
	if g.Slab {
		kind = "Slab strip"
	} else if g.isT() {
		kind = "T-beam"
	}
	var faces []string
	for _, f := range []string{"bottom", "left", "right", "top"} {
		if g.Exposed[f] {
			faces = append(faces, f)
		}
	}
	return fmt.Sprintf("%s cross-section %s × %s mm, %d bars, fire-exposed faces: %s", kind,
		fmtInput(g.boxW()), fmtInput(g.D), len(g.Bars), strings.Join(faces, ", "))
}

// outline returns the section's outline polygon in section millimetres, counter-clockwise from the
// web's bottom-left corner.
func (g sectionGeom) outline() []pt {
	if !g.isT() {
		return []pt{{0, 0}, {g.W, 0}, {g.W, g.D}, {0, g.D}}
	}
	w0, w1 := g.web()
	hw := g.webHeight()
	return []pt{{w0, 0}, {w1, 0}, {w1, hw}, {g.boxW(), hw}, {g.boxW(), g.D}, {0, g.D}, {0, hw}, {w0, hw}}
}

// faceSegments lists the pieces of a face's surface (section mm) with the inward normal.
func (g sectionGeom) faceSegments(face string) (segs [][2]pt, nx, ny float64) {
	w0, w1 := g.web()
	hw := g.webHeight()
	switch face {
	case "bottom":
		segs = append(segs, [2]pt{{w0, 0}, {w1, 0}})
		if g.isT() {
			segs = append(segs, [2]pt{{0, hw}, {w0, hw}}, [2]pt{{w1, hw}, {g.boxW(), hw}})
		}
		return segs, 0, 1
	case "top":
		return [][2]pt{{{0, g.D}, {g.boxW(), g.D}}}, 0, -1
	case "left":
		return [][2]pt{{{w0, 0}, {w0, hw}}}, 1, 0
	case "right":
		return [][2]pt{{{w1, 0}, {w1, hw}}}, -1, 0
	}
	return nil, 0, 0
}

// spallRects returns the removed zones of a measured spall as rectangles (x0, y0, x1, y1 in mm).
func (g sectionGeom) spallRects(s assess.MeasuredSpall) [][4]float64 {
	d := s.DepthMM
	if !(d > 0) {
		return nil
	}
	from, to := s.FromMM, s.ToMM
	whole := from == 0 && to == 0
	clip := func(a, b float64) (float64, float64, bool) {
		if whole {
			return a, b, b > a
		}
		a, b = math.Max(a, from), math.Min(b, to)
		return a, b, b > a
	}
	segs, nx, ny := g.faceSegments(s.Face)
	var out [][4]float64
	for _, sg := range segs {
		if ny != 0 { // horizontal face: along x
			a, b, ok := clip(sg[0].X, sg[1].X)
			if !ok {
				continue
			}
			y := sg[0].Y
			out = append(out, [4]float64{a, math.Min(y, y+ny*d), b, math.Max(y, y+ny*d)})
		} else { // vertical face: along y
			a, b, ok := clip(sg[0].Y, sg[1].Y)
			if !ok {
				continue
			}
			x := sg[0].X
			out = append(out, [4]float64{math.Min(x, x+nx*d), a, math.Max(x, x+nx*d), b})
		}
	}
	return out
}

// hatch draws 45° lines every gap drawing units inside the rectangle (drawing units).
func hatch(p pen, x0, y0, x1, y1, gap float64, s stroke) {
	w, h := x1-x0, y1-y0
	if w <= 0 || h <= 0 {
		return
	}
	for c := gap; c < w+h; c += gap {
		// line x - (y - y0) = x0 + c - h  …  param by the diagonal x + y = x0 + y0 + c
		ax, ay := x0+c, y0
		bx, by := x0, y0+c
		if ax > x1 {
			ay += ax - x1
			ax = x1
		}
		if by > y1 {
			bx += by - y1
			by = y1
		}
		p.Line(ax, ay, bx, by, s)
	}
}

func drawSection(p pen, l sectionLayout) {
	g := l.g
	ink, muted := hexOf(colInk), hexOf(colMuted)
	small := textStyle{Size: 11, Colour: ink}
	// concrete
	var poly []pt
	for _, q := range g.outline() {
		poly = append(poly, pt{l.X(q.X), l.Y(q.Y)})
	}
	p.Group("section-outline", "concrete outline")
	p.Polygon(poly, stroke{Stroke: ink, Width: 1.4, Fill: hexOf(colConc)})
	p.End()
	// links
	if g.LinkDia > 0 && len(g.Covers) > 0 {
		c := g.Covers[0].Cover - g.LinkDia
		w0, w1 := g.web()
		lw := math.Max(g.LinkDia*l.sc, 0.8)
		x0, x1 := l.X(w0+c+g.LinkDia/2), l.X(w1-c-g.LinkDia/2)
		y0, y1 := l.Y(g.D-c-g.LinkDia/2), l.Y(c+g.LinkDia/2)
		if x1 > x0 && y1 > y0 {
			p.Rect(x0, y0, x1-x0, y1-y0, stroke{Stroke: "#9aa1ab", Width: lw})
		}
	}
	// spalled zones
	if len(g.Spalls) > 0 {
		p.Group("spalled-zones", "spalled concrete, removed before the thermal run")
		for _, s := range g.Spalls {
			for _, r := range g.spallRects(s) {
				x0, y0, x1, y1 := l.X(r[0]), l.Y(r[3]), l.X(r[2]), l.Y(r[1])
				p.Rect(x0, y0, x1-x0, y1-y0, stroke{Fill: hexOf(colPaper)})
				hatch(p, x0, y0, x1, y1, 4, stroke{Stroke: hexOf(colSpall), Width: 0.8})
				p.Rect(x0, y0, x1-x0, y1-y0, stroke{Stroke: hexOf(colSpall), Width: 1, Dash: []float64{3, 2}})
			}
		}
		p.End()
	}
	// progressive spalling: its greatest depth, outlined only
	for _, s := range g.Progressive {
		for _, r := range g.spallRects(assess.MeasuredSpall{Face: s.Face, DepthMM: s.MaxDepthMM}) {
			x0, y0, x1, y1 := l.X(r[0]), l.Y(r[3]), l.X(r[2]), l.Y(r[1])
			p.Rect(x0, y0, x1-x0, y1-y0, stroke{Stroke: hexOf(colSpall), Width: 1, Dash: []float64{1, 2}})
		}
	}
	// colour-change depths
	for _, c := range g.Colour {
		segs, nx, ny := g.faceSegments(c.Face)
		if len(segs) == 0 || !(c.DepthMM > 0) {
			continue
		}
		sg := segs[0]
		a := pt{sg[0].X + nx*c.DepthMM, sg[0].Y + ny*c.DepthMM}
		b := pt{sg[1].X + nx*c.DepthMM, sg[1].Y + ny*c.DepthMM}
		p.Line(l.X(a.X), l.Y(a.Y), l.X(b.X), l.Y(b.Y), stroke{Stroke: hexOf(colSeriesD), Width: 1.2, Dash: []float64{6, 2, 1, 2}})
	}
	// bars, true size
	p.Group("section-bars", fmt.Sprintf("%d reinforcing bars at true size", len(g.Bars)))
	for _, b := range g.Bars {
		p.Circle(l.X(b.X), l.Y(b.Y), math.Max(b.Dia/2*l.sc, 0.8), stroke{Stroke: ink, Width: 0.6, Fill: hexOf(colSteel)})
	}
	p.End()
	// exposed faces: a zig-zag just outside the face
	p.Group("exposed-faces", "fire-exposed faces")
	for _, face := range []string{"bottom", "left", "right", "top"} {
		if !g.Exposed[face] {
			continue
		}
		segs, nx, ny := g.faceSegments(face)
		for _, sg := range segs {
			a := pt{l.X(sg[0].X), l.Y(sg[0].Y)}
			b := pt{l.X(sg[1].X), l.Y(sg[1].Y)}
			// outward normal in drawing units (y flips)
			ox, oy := -nx, ny
			p.Polyline(zigzag(a, b, ox, oy, 5, 5), stroke{Stroke: hexOf(colFire), Width: 1.6})
		}
	}
	p.End()
	// dimensions
	p.Group("dimensions", "dimensions in mm")
	w0, w1 := g.web()
	dimStyle := stroke{Stroke: muted, Width: 0.8}
	yb := l.Y(0) + 22
	dimLine(p, pt{l.X(w0), yb}, pt{l.X(w1), yb}, fmtInput(g.W), false, dimStyle, small)
	xr := l.X(g.boxW()) + 24
	dimLine(p, pt{xr, l.Y(0)}, pt{xr, l.Y(g.D)}, fmtInput(g.D), true, dimStyle, small)
	if g.isT() {
		yt := l.Y(g.D) - 20
		dimLine(p, pt{l.X(0), yt}, pt{l.X(g.boxW()), yt}, fmtInput(g.FW), false, dimStyle, small)
		xf := l.X(g.boxW()) + 48
		dimLine(p, pt{xf, l.Y(g.webHeight())}, pt{xf, l.Y(g.D)}, fmtInput(g.FD), true, dimStyle, small)
	}
	// covers: a short dimension from the face to the first bar of each layer, labelled at the left
	for i, c := range g.Covers {
		var y0, y1 float64
		if c.Face == "top" {
			y0, y1 = l.Y(g.D), l.Y(c.Y+c.Dia/2)
		} else {
			y0, y1 = l.Y(0), l.Y(c.Y-c.Dia/2)
		}
		x := l.X(c.X)
		p.Line(x, y0, x, y1, stroke{Stroke: ink, Width: 0.9})
		p.Line(x-3, y0, x+3, y0, stroke{Stroke: ink, Width: 0.9})
		p.Line(x-3, y1, x+3, y1, stroke{Stroke: ink, Width: 0.9})
		ym := (y0 + y1) / 2
		xl := l.X(0) - 16
		p.Line(xl+2, ym, x-1, ym, stroke{Stroke: muted, Width: 0.6, Dash: []float64{2, 2}})
		p.Text(xl, ym+4+float64(i%2)*0, "c "+fmtInput(c.Cover), textStyle{Size: 11, Anchor: "end", Colour: ink})
	}
	p.End()
	// legend
	ly := l.mt + g.D*l.sc + 64
	p.Polyline(zigzag(pt{l.ml - 60, ly - 4}, pt{l.ml - 36, ly - 4}, 0, 1, 4, 4), stroke{Stroke: hexOf(colFire), Width: 1.6})
	p.Text(l.ml-32, ly, "fire-exposed face", textStyle{Size: 10, Colour: muted})
	lx := l.ml + 70
	if len(g.Spalls) > 0 || len(g.Progressive) > 0 {
		p.Rect(lx, ly-10, 12, 10, stroke{Fill: hexOf(colPaper)})
		hatch(p, lx, ly-10, lx+12, ly, 3, stroke{Stroke: hexOf(colSpall), Width: 0.8})
		p.Rect(lx, ly-10, 12, 10, stroke{Stroke: hexOf(colSpall), Width: 1, Dash: []float64{3, 2}})
		p.Text(lx+16, ly, "spalled", textStyle{Size: 10, Colour: muted})
		lx += 70
	}
	p.Circle(lx, ly-5, 4, stroke{Fill: hexOf(colSteel)})
	p.Text(lx+8, ly, "bar (true size)", textStyle{Size: 10, Colour: muted})
	if len(g.Colour) > 0 {
		ly2 := ly + 14
		p.Line(l.ml-60, ly2-4, l.ml-36, ly2-4, stroke{Stroke: hexOf(colSeriesD), Width: 1.2, Dash: []float64{6, 2, 1, 2}})
		var parts []string
		for _, c := range g.Colour {
			iso := c.IsothermC
			if iso == 0 {
				iso = 300
			}
			parts = append(parts, fmt.Sprintf("%s %s °C at %s mm", c.Face, fmtInput(iso), fmtInput(c.DepthMM)))
		}
		p.Text(l.ml-32, ly2, "colour change seen: "+strings.Join(parts, "; "), textStyle{Size: 10, Colour: muted})
	}
}

// zigzag returns a zig-zag line from a to b offset outward by off along (ox, oy), with teeth of
// the given pitch (drawing units).
func zigzag(a, b pt, ox, oy, off, pitch float64) []pt {
	dx, dy := b.X-a.X, b.Y-a.Y
	L := math.Hypot(dx, dy)
	if L == 0 {
		return nil
	}
	n := max(int(L/pitch), 1)
	out := make([]pt, 0, n+1)
	for i := 0; i <= n; i++ {
		t := float64(i) / float64(n)
		o := off
		if i%2 == 1 {
			o += pitch * 0.8
		}
		out = append(out, pt{a.X + t*dx + ox*o, a.Y + t*dy + oy*o})
	}
	return out
}

// dimLine draws a dimension line with end ticks and its value in the middle.
func dimLine(p pen, a, b pt, label string, vertical bool, s stroke, ts textStyle) {
	p.Line(a.X, a.Y, b.X, b.Y, s)
	if vertical {
		p.Line(a.X-4, a.Y, a.X+4, a.Y, s)
		p.Line(b.X-4, b.Y, b.X+4, b.Y, s)
		ts.Anchor, ts.Rotate = "middle", true
		p.Text(a.X-5, (a.Y+b.Y)/2, label, ts)
		return
	}
	p.Line(a.X, a.Y-4, a.X, a.Y+4, s)
	p.Line(b.X, b.Y-4, b.X, b.Y+4, s)
	ts.Anchor = "middle"
	p.Text((a.X+b.X)/2, a.Y+14, label, ts)
}

// sectionPreview is the drawing with the reasons why parts of it could not be drawn, for the
// editor's preview box.
func sectionPreview(g sectionGeom) string {
	svg := sectionSVG(g)
	if len(g.Problems) == 0 || !(g.W > 0 && g.D > 0) {
		return svg
	}
	var b strings.Builder
	b.WriteString(svg)
	b.WriteString(`<ul class="drawing-notes muted" data-testid="drawing-notes">`)
	for _, p := range g.Problems {
		b.WriteString("<li>")
		b.WriteString(html.EscapeString(p))
		b.WriteString("</li>")
	}
	b.WriteString("</ul>")
	return b.String()
}
