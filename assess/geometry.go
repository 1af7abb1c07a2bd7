package assess

import (
	"fmt"
	"math"
)

// Section geometry in the coordinates shared with package thermal: x from the
// left edge of the section's bounding box (the flange tip of a T-beam), y from
// its bottom, mm.

// rect is an axis-aligned rectangle of concrete, mm.
type rect struct{ x0, y0, x1, y1 float64 }

func (r rect) contains(x, y float64) bool {
	return x >= r.x0 && x <= r.x1 && y >= r.y0 && y <= r.y1
}

// isT reports whether the member is a T-beam (a flange on top).
func (m *Member) isT() bool {
	return m.Kind == KindBeam && m.FlangeWidthMM > 0 && m.FlangeDepthMM > 0
}

// boxWidth is the width of the bounding box: the flange width of a T-beam,
// otherwise the (web or analysed) width.
func (m *Member) boxWidth() float64 {
	if m.isT() {
		return m.FlangeWidthMM
	}
	return m.WidthMM
}

// web returns the x range of the web.
func (m *Member) web() (x0, x1 float64) {
	if m.isT() {
		x0 = (m.FlangeWidthMM - m.WidthMM) / 2
		return x0, x0 + m.WidthMM
	}
	return 0, m.WidthMM
}

// outline is the gross concrete outline as a union of rectangles.
func (m *Member) outline() []rect {
	if m.isT() {
		x0, x1 := m.web()
		hw := m.DepthMM - m.FlangeDepthMM
		return []rect{{x0, 0, x1, hw}, {0, hw, m.FlangeWidthMM, m.DepthMM}}
	}
	return []rect{{0, 0, m.WidthMM, m.DepthMM}}
}

// inside reports whether the circle (x, y, r) lies wholly in the concrete outline.
func (m *Member) inside(x, y, r float64) bool {
	const eps = 1e-9
	for _, rc := range m.outline() {
		if x-r >= rc.x0-eps && x+r <= rc.x1+eps && y-r >= rc.y0-eps && y+r <= rc.y1+eps {
			return true
		}
	}
	if m.isT() {
		// A bar may straddle the web–flange junction.
		x0, x1 := m.web()
		hw := m.DepthMM - m.FlangeDepthMM
		if x-r >= x0-eps && x+r <= x1+eps && y-r >= -eps && y+r <= m.DepthMM+eps {
			return true
		}
		if y-r >= hw-eps && y+r <= m.DepthMM+eps && x-r >= -eps && x+r <= m.FlangeWidthMM+eps {
			return true
		}
	}
	return false
}

// faces lists the faces a member has.
func (m *Member) faces() []string {
	if m.Kind == KindSlab {
		return []string{"bottom", "top"}
	}
	return []string{"bottom", "left", "right", "top"}
}

// faceLength is the length of the measure along a face used by spalling
// ranges: bottom/top along x over the bounding box, left/right along y.
func (m *Member) faceLength(face string) float64 {
	switch face {
	case "left", "right":
		return m.DepthMM
	default:
		return m.boxWidth()
	}
}

// faceThickness is the member's dimension normal to a face (the depth of
// concrete an isotherm can reach from it): depth for bottom/top, web width for sides.
func (m *Member) faceThickness(face string) float64 {
	switch face {
	case "left", "right":
		return m.WidthMM
	default:
		return m.DepthMM
	}
}

// midFace is the position along a face (same measure as faceLength) of the
// mid-face point from which isotherm depths and profiles are taken: the web
// centre line for bottom and top, the web's mid-height for the sides.
func (m *Member) midFace(face string) float64 {
	switch face {
	case "left", "right":
		if m.isT() {
			return (m.DepthMM - m.FlangeDepthMM) / 2
		}
		return m.DepthMM / 2
	default:
		return m.boxWidth() / 2
	}
}

// facePoint returns the surface point of a face at mid-face and the inward
// unit normal there.
func (m *Member) facePoint(face string) (x, y, nx, ny float64) {
	along := m.midFace(face)
	switch face {
	case "bottom":
		return along, 0, 0, 1
	case "top":
		return along, m.DepthMM, 0, -1
	case "left":
		x0, _ := m.web()
		return x0, along, 1, 0
	default: // right
		_, x1 := m.web()
		return x1, along, -1, 0
	}
}

// barSpec is one steel fibre: a single bar of a beam, or for a slab one
// layer's bars over the analysed width lumped at mid-width.
type barSpec struct {
	Label        string
	XMM, YMM     float64
	DiaMM        float64
	AreaMM2      float64
	Count        float64 // bars represented (slab: bars per analysed width)
	Steel        string
	FykMPa       float64
	PrestressMPa float64
	Face         string // the layer's face, or the nearest face for single bars
	CoverMM      float64
	Layer        int // index in Member.Layers, -1 for a single bar
}

// barArea is the area of one bar, wire or strand: the given nominal area, or
// π·d²/4 when none is given, mm².
func barArea(dia, nominal float64) float64 {
	if nominal > 0 {
		return nominal
	}
	return math.Pi * dia * dia / 4
}

// layerY is the height of the bar centres of a layer.
func (m *Member) layerY(l Layer) float64 {
	in := l.CoverMM + m.LinkDiaMM + l.DiaMM/2
	if l.Face == "top" {
		return m.DepthMM - in
	}
	return in
}

// layerSpan is the x range available to a beam layer's bar centres.
func (m *Member) layerSpan(l Layer) (x0, x1 float64) {
	edge := l.CoverMM + m.LinkDiaMM + l.DiaMM/2
	if l.Face == "top" && m.isT() {
		return edge, m.FlangeWidthMM - edge
	}
	w0, w1 := m.web()
	return w0 + edge, w1 - edge
}

// maxLayerBars bounds the bars BarPositions places for one layer of an
// unvalidated member (a validated one has at most maxBars in all).
const maxLayerBars = maxBars

// layerBarXs returns the x of each bar centre of a layer, left to right, at
// most limit of them. A beam layer spreads its Count bars evenly between the
// side covers (one bar: at mid-span); a slab layer places its bars at
// SpacingMM from half a spacing in from the left edge, across the width.
func (m *Member) layerBarXs(l Layer, limit int) []float64 {
	var xs []float64
	if m.Kind == KindSlab {
		if !(l.SpacingMM > 0) || !(m.WidthMM > 0) {
			return nil
		}
		for k := 0; k < limit; k++ {
			x := l.SpacingMM/2 + float64(k)*l.SpacingMM
			if !(x < m.WidthMM) {
				break
			}
			xs = append(xs, x)
		}
		return xs
	}
	n := min(l.Count, limit)
	x0, x1 := m.layerSpan(l)
	for i := 0; i < n; i++ {
		x := (x0 + x1) / 2
		if n > 1 {
			x = x0 + (x1-x0)*float64(i)/float64(n-1)
		}
		xs = append(xs, x)
	}
	return xs
}

// BarPosition is one bar of a member as the engine lays it out.
type BarPosition struct {
	// XMM, YMM: the bar centre, mm; x from the left edge of the section's
	// bounding box (a T-beam's flange tip), y from its bottom.
	XMM   float64 `json:"x_mm"`
	YMM   float64 `json:"y_mm"`
	DiaMM float64 `json:"dia_mm"`
	Steel string  `json:"steel"`
	// Face is the layer's face ("bottom" | "top"), or for a single bar the
	// nearest face; CoverMM is from that face to the bar surface, mm (links included).
	Face    string  `json:"face"`
	CoverMM float64 `json:"cover_mm"`
	// Layer is the index in Member.Layers, or -1 for a bar of Member.Bars;
	// Index is the bar's place in its layer (left to right) or in Member.Bars.
	Layer int `json:"layer"`
	Index int `json:"index"`
}

// BarPositions lists every bar of the member as the engine places it: layers
// first (in order, bars left to right), then the single bars. A layer's bar
// centres sit at cover + link diameter + ½ bar diameter from its face; a beam
// layer spreads its bars evenly between the side covers (a T-beam's top layer
// across the flange, a bottom layer within the web); a slab layer places its
// bars at its spacing from half a spacing in from the left edge (the analysis
// lumps them per layer at mid-width). Single bars are where they are given.
//
// It works on unvalidated input for drawings: the defaults of Normalize that
// affect positions are applied to a copy (slab width 1000 mm, steel
// "hot-rolled"; a slab has no links), a layer that cannot be placed (diameter
// not positive, cover negative, no count or spacing) and a single bar without
// a positive diameter are left out, and at most 200 bars are placed per layer.
func (m *Member) BarPositions() []BarPosition {
	mm := *m
	if mm.Kind == KindSlab {
		if mm.WidthMM == 0 {
			mm.WidthMM = 1000
		}
		mm.LinkDiaMM = 0
	}
	if !(mm.LinkDiaMM > 0) {
		mm.LinkDiaMM = 0
	}
	steel := func(s string) string {
		if s == "" {
			return SteelHotRolled
		}
		return s
	}
	var out []BarPosition
	for li, l := range mm.Layers {
		if !(l.DiaMM > 0) || !(l.CoverMM >= 0) {
			continue
		}
		y := mm.layerY(l)
		for i, x := range mm.layerBarXs(l, maxLayerBars) {
			out = append(out, BarPosition{XMM: x, YMM: y, DiaMM: l.DiaMM, Steel: steel(l.Steel), Face: l.Face,
				CoverMM: l.CoverMM + mm.LinkDiaMM, Layer: li, Index: i})
		}
	}
	for bi, b := range mm.Bars {
		if !(b.DiaMM > 0) {
			continue
		}
		face, cover := mm.nearestFace(b.XMM, b.YMM, b.DiaMM)
		out = append(out, BarPosition{XMM: b.XMM, YMM: b.YMM, DiaMM: b.DiaMM, Steel: steel(b.Steel), Face: face,
			CoverMM: cover, Layer: -1, Index: bi})
	}
	return out
}

// barSpecs lists the steel fibres of a normalised member: layers first (in
// order, bars left to right, placed by layerBarXs as BarPositions places
// them), then the single bars. A slab layer is one fibre at mid-width.
func (m *Member) barSpecs() []barSpec {
	var out []barSpec
	for li, l := range m.Layers {
		y := m.layerY(l)
		area := barArea(l.DiaMM, l.AreaMM2)
		if m.Kind == KindSlab {
			n := m.WidthMM / l.SpacingMM
			out = append(out, barSpec{
				Label: fmt.Sprintf("layer %d (%s, %.0f mm at %.0f mm)", li+1, l.Face, l.DiaMM, l.SpacingMM),
				XMM:   m.WidthMM / 2, YMM: y, DiaMM: l.DiaMM, AreaMM2: area * n, Count: n,
				Steel: l.Steel, FykMPa: l.FykMPa, PrestressMPa: l.PrestressMPa, Face: l.Face, CoverMM: l.CoverMM, Layer: li,
			})
			continue
		}
		for i, x := range m.layerBarXs(l, l.Count) {
			out = append(out, barSpec{
				Label: fmt.Sprintf("layer %d bar %d", li+1, i+1),
				XMM:   x, YMM: y, DiaMM: l.DiaMM, AreaMM2: area, Count: 1,
				Steel: l.Steel, FykMPa: l.FykMPa, PrestressMPa: l.PrestressMPa, Face: l.Face,
				CoverMM: l.CoverMM + m.LinkDiaMM, Layer: li,
			})
		}
	}
	for bi, b := range m.Bars {
		face, cover := m.nearestFace(b.XMM, b.YMM, b.DiaMM)
		out = append(out, barSpec{
			Label: fmt.Sprintf("bar %d", bi+1),
			XMM:   b.XMM, YMM: b.YMM, DiaMM: b.DiaMM, AreaMM2: barArea(b.DiaMM, b.AreaMM2), Count: 1,
			Steel: b.Steel, FykMPa: b.FykMPa, PrestressMPa: b.PrestressMPa, Face: face, CoverMM: cover, Layer: -1,
		})
	}
	return out
}

// nearestFace returns the face nearest a bar and the cover to its surface.
func (m *Member) nearestFace(x, y, d float64) (string, float64) {
	best, cover := "bottom", y-d/2
	if c := m.DepthMM - y - d/2; c < cover {
		best, cover = "top", c
	}
	if m.Kind == KindBeam {
		w0, w1 := m.web()
		hw := m.DepthMM
		if m.isT() {
			hw = m.DepthMM - m.FlangeDepthMM
		}
		if y <= hw {
			if c := x - w0 - d/2; c < cover {
				best, cover = "left", c
			}
			if c := w1 - x - d/2; c < cover {
				best, cover = "right", c
			}
		}
	}
	return best, cover
}

// coverToward returns the concrete between bar b and a face, along the face's
// inward normal (mm, from the face's original surface to the bar surface), and
// the bar centre's position along the face in the measure of spalling ranges
// (x for bottom/top, y for left/right). ok is false where the face does not
// lie in front of the bar (a web side for a bar in a T-beam's flange, a side
// of a slab). Under a T-beam's flange outstand the bottom face is the
// outstand's soffit.
func (m *Member) coverToward(b barSpec, face string) (cover, along float64, ok bool) {
	const eps = 1e-9
	r := b.DiaMM / 2
	w0, w1 := m.web()
	hw := m.DepthMM
	if m.isT() {
		hw = m.DepthMM - m.FlangeDepthMM
	}
	switch face {
	case "bottom":
		if m.isT() && (b.XMM < w0 || b.XMM > w1) {
			return b.YMM - r - hw, b.XMM, b.YMM-r >= hw-eps
		}
		return b.YMM - r, b.XMM, true
	case "top":
		return m.DepthMM - b.YMM - r, b.XMM, true
	case "left":
		if m.Kind == KindSlab || b.YMM > hw+eps || b.XMM < w0 {
			return 0, 0, false
		}
		return b.XMM - r - w0, b.YMM, true
	case "right":
		if m.Kind == KindSlab || b.YMM > hw+eps || b.XMM > w1 {
			return 0, 0, false
		}
		return w1 - b.XMM - r, b.YMM, true
	}
	return 0, 0, false
}
