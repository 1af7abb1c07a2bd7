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

// barSpecs lists the steel fibres of a normalised member: layers first (in
// order, bars left to right), then the single bars.
func (m *Member) barSpecs() []barSpec {
	var out []barSpec
	for li, l := range m.Layers {
		y := m.layerY(l)
		area := math.Pi * l.DiaMM * l.DiaMM / 4
		if m.Kind == KindSlab {
			n := m.WidthMM / l.SpacingMM
			out = append(out, barSpec{
				Label: fmt.Sprintf("layer %d (%s, %.0f mm at %.0f mm)", li+1, l.Face, l.DiaMM, l.SpacingMM),
				XMM:   m.WidthMM / 2, YMM: y, DiaMM: l.DiaMM, AreaMM2: area * n, Count: n,
				Steel: l.Steel, FykMPa: l.FykMPa, PrestressMPa: l.PrestressMPa, Face: l.Face, CoverMM: l.CoverMM,
			})
			continue
		}
		x0, x1 := m.layerSpan(l)
		for i := 0; i < l.Count; i++ {
			x := (x0 + x1) / 2
			if l.Count > 1 {
				x = x0 + (x1-x0)*float64(i)/float64(l.Count-1)
			}
			out = append(out, barSpec{
				Label: fmt.Sprintf("layer %d bar %d", li+1, i+1),
				XMM:   x, YMM: y, DiaMM: l.DiaMM, AreaMM2: area, Count: 1,
				Steel: l.Steel, FykMPa: l.FykMPa, PrestressMPa: l.PrestressMPa, Face: l.Face,
				CoverMM: l.CoverMM + m.LinkDiaMM,
			})
		}
	}
	for bi, b := range m.Bars {
		face, cover := m.nearestFace(b.XMM, b.YMM, b.DiaMM)
		out = append(out, barSpec{
			Label: fmt.Sprintf("bar %d", bi+1),
			XMM:   b.XMM, YMM: b.YMM, DiaMM: b.DiaMM, AreaMM2: math.Pi * b.DiaMM * b.DiaMM / 4, Count: 1,
			Steel: b.Steel, FykMPa: b.FykMPa, PrestressMPa: b.PrestressMPa, Face: face, CoverMM: cover,
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

// barSurfaceToward returns the point of a bar's surface closest to a face.
func barSurfaceToward(b barSpec, face string) (x, y float64) {
	r := b.DiaMM / 2
	switch face {
	case "bottom":
		return b.XMM, b.YMM - r
	case "top":
		return b.XMM, b.YMM + r
	case "left":
		return b.XMM - r, b.YMM
	default:
		return b.XMM + r, b.YMM
	}
}
