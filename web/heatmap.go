package web

import (
	"fmt"
	"math"
	"sort"

	"residuum/assess"
)

// isothermStyles are the isotherms drawn on the heat map and the line style of each, so they
// are told apart in greyscale as well as in colour.
var isothermStyles = []struct {
	C    float64
	Dash []float64
	Name string
}{
	{300, []float64{6, 3}, "300 °C (dashed): pink colour onset"},
	{500, nil, "500 °C (solid): EN 1992-1-2 Annex B.1 boundary"},
	{600, []float64{1.5, 2.5}, "600 °C (dotted)"},
}

// heatField turns the result's field into a grid (NaN for removed or outside cells).
func heatField(f *assess.FieldPlot) (grid, bool) {
	if f == nil || f.Nx <= 0 || f.Ny <= 0 || len(f.PeakC) != f.Nx*f.Ny || !(f.CellMM > 0) {
		return grid{}, false
	}
	g := grid{Nx: f.Nx, Ny: f.Ny, Cell: f.CellMM, V: make([]float64, len(f.PeakC))}
	for i, v := range f.PeakC {
		if v == nil {
			g.V[i] = math.NaN()
		} else {
			g.V[i] = *v
		}
	}
	return g, true
}

// heatLayout maps field millimetres to drawing units.
type heatLayout struct {
	ml, mt, w, h float64 // plot area origin and size (drawing units)
	sx, sy       float64 // drawing units per mm
	widthMM      float64
	depthMM      float64
	total        [2]float64
}

func (l heatLayout) X(x float64) float64 { return l.ml + x*l.sx }
func (l heatLayout) Y(y float64) float64 { return l.mt + (l.depthMM-y)*l.sy }

// heatMapSVG draws the peak-temperature field as a heat map with the isotherms and the bars.
func heatMapSVG(res *assess.Result) string {
	var p svgPen
	w, h, ok := drawHeatMap(&p, res)
	if !ok {
		return ""
	}
	return svgDocument(w, h, "heat-map", "Peak temperature in the section with the 300, 500 and 600 °C isotherms", p.b.String())
}

// drawHeatMap draws the heat map and returns its size in drawing units.
func drawHeatMap(p pen, res *assess.Result) (float64, float64, bool) {
	g, ok := heatField(res.Field)
	if !ok {
		return 0, 0, false
	}
	slab := g.Nx == 1
	wmm, dmm := float64(g.Nx)*g.Cell, float64(g.Ny)*g.Cell
	if res.Field.WidthMM > 0 {
		wmm = math.Max(wmm, res.Field.WidthMM)
	}
	l := heatLayout{ml: 56, mt: 16, widthMM: wmm, depthMM: dmm}
	s := math.Min(300/wmm, 320/dmm)
	l.sx, l.sy = s, s
	if slab {
		l.sy = math.Min(320/dmm, 6)
		l.sx = 140 / wmm
	}
	l.w, l.h = wmm*l.sx, dmm*l.sy
	legendX := l.ml + l.w + 26
	total := [2]float64{legendX + 80, l.mt + l.h + 46 + 16*float64(len(isothermStyles))}
	ink, muted := hexOf(colInk), hexOf(colMuted)

	p.Group("heat-cells", "peak temperature of each cell")
	cw := g.Cell * l.sx
	if slab {
		cw = l.w
	}
	for j := 0; j < g.Ny; j++ {
		// merge runs of cells of the same 10 °C band
		i := 0
		for i < g.Nx {
			v := g.at(i, j)
			k := i + 1
			band := math.Round(v / 10)
			for k < g.Nx && !math.IsNaN(v) && math.Round(g.at(k, j)/10) == band {
				k++
			}
			if !math.IsNaN(v) {
				x := l.X(float64(i) * g.Cell)
				y := l.Y(float64(j+1) * g.Cell)
				p.Rect(x, y, cw*float64(k-i)+0.3, g.Cell*l.sy+0.3, stroke{Fill: hexOf(rampColour(band * 10))})
			}
			i = k
		}
	}
	p.End()

	p.Group("isotherms", "isotherms of the peak temperature")
	var placed []pt // isotherm labels already drawn, kept apart
	for _, is := range isothermStyles {
		var lines [][]pt
		if slab {
			for j := 0; j+1 < g.Ny; j++ {
				a, b := g.at(0, j), g.at(0, j+1)
				if math.IsNaN(a) || math.IsNaN(b) || (a-is.C)*(b-is.C) > 0 || a == b {
					continue
				}
				y := (float64(j) + 0.5 + (is.C-a)/(b-a)) * g.Cell
				lines = append(lines, []pt{{0, y}, {wmm, y}})
			}
		} else {
			lines = isoline(g, is.C)
		}
		sort.Slice(lines, func(a, b int) bool { return len(lines[a]) > len(lines[b]) })
		for n, line := range lines {
			pts := make([]pt, len(line))
			for k, q := range line {
				pts[k] = pt{l.X(q.X), l.Y(q.Y)}
			}
			p.Polyline(pts, stroke{Stroke: "#ffffff", Width: 3.2})
			p.Polyline(pts, stroke{Stroke: ink, Width: 1.4, Dash: is.Dash})
			if n == 0 && len(pts) > 0 {
				if q, ok := labelSpot(pts, placed, 16); ok {
					placed = append(placed, q)
					// a white ground keeps the label legible over the darkest cells
					p.Rect(q.X+1.5, q.Y-13, 22, 12, stroke{Fill: "#ffffff"})
					p.Text(q.X+3, q.Y-3, fmt.Sprintf("%.0f", is.C), textStyle{Size: 10, Colour: ink, Bold: true})
				}
			}
		}
	}
	p.End()

	// bars
	for _, b := range res.Rebar {
		x := b.XMM
		if slab {
			x = wmm / 2
		}
		p.Circle(l.X(x), l.Y(b.YMM), math.Max(b.DiaMM/2*l.sy, 1.5), stroke{Stroke: ink, Width: 1.2, Fill: "#ffffff"})
	}

	// axes
	axis := stroke{Stroke: ink, Width: 0.8}
	p.Line(l.ml, l.mt+l.h, l.ml+l.w, l.mt+l.h, axis)
	p.Line(l.ml, l.mt, l.ml, l.mt+l.h, axis)
	ts := textStyle{Size: 10, Colour: ink}
	if !slab {
		for _, x := range niceTicks(0, wmm, 5) {
			p.Line(l.X(x), l.mt+l.h, l.X(x), l.mt+l.h+4, axis)
			ts.Anchor = "middle"
			p.Text(l.X(x), l.mt+l.h+15, fmtInput(x), ts)
		}
	}
	for _, y := range niceTicks(0, dmm, 6) {
		p.Line(l.ml-4, l.Y(y), l.ml, l.Y(y), axis)
		ts.Anchor = "end"
		p.Text(l.ml-6, l.Y(y)+3.5, fmtInput(y), ts)
	}
	xl := "x (mm) from the left"
	if slab {
		xl = "slab strip (1-D through the depth)"
	}
	p.Text(l.ml+l.w/2, l.mt+l.h+30, xl, textStyle{Size: 11, Anchor: "middle", Colour: ink})
	p.Text(16, l.mt+l.h/2, "y (mm) from the bottom", textStyle{Size: 11, Anchor: "middle", Colour: ink, Rotate: true})

	// colour bar
	top, bot := 1100.0, 20.0
	bh := l.h
	if bh < 160 {
		bh = 160
	}
	for t := bot; t < top; t += 10 {
		y0 := l.mt + (top-t-10)/(top-bot)*bh
		p.Rect(legendX, y0, 14, bh/(top-bot)*10+0.4, stroke{Fill: hexOf(rampColour(t + 5))})
	}
	p.Rect(legendX, l.mt, 14, bh, stroke{Stroke: ink, Width: 0.6})
	for _, t := range []float64{20, 200, 400, 600, 800, 1000} {
		y := l.mt + (top-t)/(top-bot)*bh
		p.Line(legendX+14, y, legendX+18, y, axis)
		p.Text(legendX+20, y+3.5, fmtInput(t), textStyle{Size: 10, Colour: ink})
	}
	p.Text(legendX, l.mt+bh+14, "peak °C", textStyle{Size: 10, Colour: muted})
	if total[1] < l.mt+bh+30 {
		total[1] = l.mt + bh + 30
	}
	// isotherm legend
	ly := math.Max(l.mt+l.h+46, l.mt+bh+30)
	for k, is := range isothermStyles {
		y := ly + 16*float64(k)
		p.Line(l.ml, y-4, l.ml+28, y-4, stroke{Stroke: ink, Width: 1.4, Dash: is.Dash})
		p.Text(l.ml+34, y, is.Name, textStyle{Size: 10, Colour: ink})
	}
	total[1] = ly + 16*float64(len(isothermStyles))
	total[0] = math.Max(total[0], l.ml+300)
	return total[0], total[1], true
}

// niceTicks returns about n round tick values covering [lo, hi].
func niceTicks(lo, hi float64, n int) []float64 {
	if !(hi > lo) || n < 1 {
		return nil
	}
	raw := (hi - lo) / float64(n)
	mag := math.Pow(10, math.Floor(math.Log10(raw)))
	step := mag
	for _, m := range []float64{1, 2, 2.5, 5, 10} {
		if m*mag >= raw {
			step = m * mag
			break
		}
	}
	var out []float64
	for v := math.Ceil(lo/step) * step; v <= hi+1e-9; v += step {
		out = append(out, math.Round(v*1e6)/1e6)
	}
	return out
}

// labelSpot picks a point of the line for its label at least gap drawing units from every label
// already placed, trying the middle first.
func labelSpot(line, placed []pt, gap float64) (pt, bool) {
	for _, f := range []float64{0.5, 0.3, 0.7, 0.15, 0.85, 0.05, 0.95} {
		q := line[int(f*float64(len(line)-1))]
		ok := true
		for _, o := range placed {
			if math.Hypot(q.X-o.X, q.Y-o.Y) < gap {
				ok = false
				break
			}
		}
		if ok {
			return q, true
		}
	}
	return pt{}, false
}
