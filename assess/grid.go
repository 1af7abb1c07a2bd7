package assess

import (
	"math"

	"residuum/sectional"
	"residuum/thermal"
)

// gridGeom is the member as the thermal grid represents it: every dimension
// rounded to whole cells (package thermal's rule), so that concrete fibres are
// exactly the thermal cells. Bar positions are carried over from the nominal
// geometry: x relative to the web, y relative to the nearer of bottom and top.
type gridGeom struct {
	slab       bool
	cell       float64
	nx, ny     int
	webLo      int
	webHi      int
	flangeRows int
	widthMM    float64 // slab: analysed width; beam: nx·cell
	dx         float64 // grid x − nominal x (T-beam outstand rounding)
	heightMM   float64 // ny·cell
	nominalH   float64
}

func newGridGeom(m *Member, cell float64) gridGeom {
	g := gridGeom{slab: m.Kind == KindSlab, cell: cell, nominalH: m.DepthMM}
	g.ny = int(math.Round(m.DepthMM / cell))
	g.heightMM = float64(g.ny) * cell
	if g.slab {
		g.nx, g.webLo, g.webHi, g.widthMM = 1, 0, 1, m.WidthMM
		return g
	}
	nw := int(math.Round(m.WidthMM / cell))
	g.nx, g.webLo, g.webHi = nw, 0, nw
	if m.isT() {
		out := int(math.Round((m.FlangeWidthMM - m.WidthMM) / 2 / cell))
		g.nx = nw + 2*out
		g.webLo, g.webHi = out, out+nw
		g.flangeRows = int(math.Round(m.FlangeDepthMM / cell))
		if g.flangeRows >= g.ny {
			g.flangeRows = g.ny - 1
		}
		g.dx = float64(out)*cell - (m.FlangeWidthMM-m.WidthMM)/2
	}
	g.widthMM = float64(g.nx) * cell
	return g
}

func (g gridGeom) inOutline(i, j int) bool {
	if i < 0 || j < 0 || i >= g.nx || j >= g.ny {
		return false
	}
	if j >= g.ny-g.flangeRows {
		return true
	}
	return i >= g.webLo && i < g.webHi
}

// webX returns the x range of the web in grid coordinates.
func (g gridGeom) webX() (float64, float64) {
	if g.slab {
		return 0, g.widthMM
	}
	return float64(g.webLo) * g.cell, float64(g.webHi) * g.cell
}

// webTop is the height of the web's top (the flange soffit), mm.
func (g gridGeom) webTop() float64 { return float64(g.ny-g.flangeRows) * g.cell }

// mapPoint maps a nominal position into grid coordinates.
func (g gridGeom) mapPoint(x, y float64) (float64, float64) {
	if g.slab {
		x = g.widthMM / 2
	} else {
		x += g.dx
	}
	if y > g.nominalH/2 {
		y += g.heightMM - g.nominalH
	}
	return x, y
}

// outline returns the grid outline for package sectional.
func (g gridGeom) outline() []sectional.Rect {
	if g.slab {
		return []sectional.Rect{{X0: 0, Y0: 0, X1: g.widthMM, Y1: g.heightMM}}
	}
	w0, w1 := g.webX()
	if g.flangeRows == 0 {
		return []sectional.Rect{{X0: w0, Y0: 0, X1: w1, Y1: g.heightMM}}
	}
	return []sectional.Rect{
		{X0: w0, Y0: 0, X1: w1, Y1: g.webTop()},
		{X0: 0, Y0: g.webTop(), X1: g.widthMM, Y1: g.heightMM},
	}
}

// cellCentre returns the centre of cell (i, j) and the fibre area, mm and mm².
func (g gridGeom) cellCentre(i, j int) (x, y, area float64) {
	y = (float64(j) + 0.5) * g.cell
	if g.slab {
		return g.widthMM / 2, y, g.widthMM * g.cell
	}
	return (float64(i) + 0.5) * g.cell, y, g.cell * g.cell
}

// midFace returns the along-face position (thermal's measure) of a face's
// mid-face line, the surface point there and the inward normal.
func (g gridGeom) midFace(face string) (along, x, y, nx, ny float64) {
	w0, w1 := g.webX()
	switch face {
	case "bottom":
		along = (w0 + w1) / 2
		return along, along, 0, 0, 1
	case "top":
		along = g.widthMM / 2
		return along, along, g.heightMM, 0, -1
	case "left":
		along = g.webTop() / 2
		return along, w0, along, 1, 0
	default:
		along = g.webTop() / 2
		return along, w1, along, -1, 0
	}
}

// thickness is the grid's extent normal to a face, mm.
func (g gridGeom) thickness(face string) float64 {
	if face == "left" || face == "right" {
		w0, w1 := g.webX()
		return w1 - w0
	}
	return g.heightMM
}

// shape builds the thermal shape of the member on this grid.
func (g gridGeom) shape(m *Member, spalls []thermal.Spall, prog []thermal.ProgressiveSpall) thermal.Shape {
	sh := thermal.Shape{
		WidthMM: m.WidthMM, DepthMM: m.DepthMM,
		Slab: g.slab, CellMM: g.cell,
		Spalled: spalls, Progressive: prog,
	}
	if m.isT() {
		sh.FlangeWidthMM, sh.FlangeDepthMM = m.FlangeWidthMM, m.FlangeDepthMM
	}
	for _, f := range m.Exposed {
		sh.Exposed = append(sh.Exposed, thermal.Face(f))
	}
	return sh
}
