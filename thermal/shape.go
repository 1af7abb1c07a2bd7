package thermal

import (
	"fmt"
	"math"
)

// Face names a side of the cross-section.
type Face string

// Faces of a section. "bottom" is every downward-facing surface (web soffit and
// flange outstand soffits of a T-beam), "left"/"right" the web sides, "top" the
// top surface.
const (
	Bottom Face = "bottom"
	Top    Face = "top"
	Left   Face = "left"
	Right  Face = "right"
)

// faceIndex returns 0–3 for bottom, top, left, right.
func (f Face) index() (int, bool) {
	switch f {
	case Bottom:
		return 0, true
	case Top:
		return 1, true
	case Left:
		return 2, true
	case Right:
		return 3, true
	}
	return -1, false
}

var faceNames = [4]Face{Bottom, Top, Left, Right}

// Spall removes concrete to DepthMM from a face before the run. FromMM/ToMM limit it to part of the face,
// measured along the face from the section's left (for bottom/top) or bottom (for left/right); both 0 = whole face.
// A cell is removed when its centre lies within DepthMM of the original surface.
type Spall struct {
	Face                  Face
	DepthMM, FromMM, ToMM float64
}

// ProgressiveSpall removes layers from a face during the run: from StartMin at RateMMPerMin up to MaxDepthMM.
// The spalled depth is d(t) = min(MaxDepthMM, RateMMPerMin·(t − StartMin)) from the original surface; a layer of
// cells goes when d(t) reaches its centre. Remaining temperatures are kept and the face's boundary condition
// moves to the new surface.
type ProgressiveSpall struct {
	Face                               Face
	StartMin, RateMMPerMin, MaxDepthMM float64
}

// Shape is the cross-section to solve. Coordinates: x from the section's left edge, y from its bottom, mm.
// For a T-beam the left edge is the left end of the flange (the grid covers the bounding box).
// T-beam: flange on top, centred on the web, FlangeDepthMM is part of DepthMM. Flange ends are adiabatic
// (cut of a continuous slab). Dimensions are represented by whole cells (rounded to the nearest cell;
// flange outstands to whole cells on each side).
type Shape struct {
	WidthMM, DepthMM             float64 // web width (slab: analysed width, e.g. 1000) and overall depth, mm (each 0 < d ≤ 10000)
	FlangeWidthMM, FlangeDepthMM float64 // 0, 0 = rectangle
	Slab                         bool    // solve 1-D through the depth (Nx = 1); left/right not allowed
	CellMM                       float64 // 1–25 (0 = 5)
	Exposed                      []Face
	Spalled                      []Spall
	Progressive                  []ProgressiveSpall
}

// Point is a position in the section, mm from its left edge (x) and bottom (y).
type Point struct{ XMM, YMM float64 }

// Cell states.
const (
	cellOutside int8 = -1 // outside the outline
	cellActive  int8 = 0
	// 1..4: removed by spalling from face index state-1.
)

// grid is the cell layout of a Shape.
type grid struct {
	nx, ny     int
	cellMM     float64
	d          float64 // m
	slab       bool
	widthMM    float64 // analysed width (slab) or bounding-box width
	flangeRows int     // rows at the top forming the flange (0 = rectangle)
	webLo      int     // web columns [webLo, webHi)
	webHi      int
	status     []int8
	exposed    [4]bool
	lines      [4][][]int32 // per face: lines of cells from the original surface inward
	lineAlong  [4][]float64 // per face and line: position along the face of the line's centre, mm

	mirrorRight bool // right edge is the adiabatic centre line of a mirrored half
}

func (g *grid) inOutline(i, j int) bool {
	if i < 0 || j < 0 || i >= g.nx || j >= g.ny {
		return false
	}
	if j >= g.ny-g.flangeRows {
		return true
	}
	return i >= g.webLo && i < g.webHi
}

func (g *grid) cells() int { return g.nx * g.ny }

// newGrid validates sh and lays out its cells, with measured spalling removed.
func newGrid(sh Shape) (*grid, error) {
	cell := sh.CellMM
	if cell == 0 {
		cell = 5
	}
	if !(cell >= 1 && cell <= 25) {
		return nil, fmt.Errorf("thermal: CellMM = %g out of range (accepted 1–25)", sh.CellMM)
	}
	if !(sh.WidthMM > 0 && sh.WidthMM <= 10000) {
		return nil, fmt.Errorf("thermal: WidthMM = %g out of range (accepted 0 < width ≤ 10000)", sh.WidthMM)
	}
	if !(sh.DepthMM > 0 && sh.DepthMM <= 10000) {
		return nil, fmt.Errorf("thermal: DepthMM = %g out of range (accepted 0 < depth ≤ 10000)", sh.DepthMM)
	}
	if sh.DepthMM < cell {
		return nil, fmt.Errorf("thermal: CellMM = %g is larger than DepthMM = %g (accepted CellMM ≤ depth)", cell, sh.DepthMM)
	}
	if !sh.Slab && sh.WidthMM < cell {
		return nil, fmt.Errorf("thermal: CellMM = %g is larger than WidthMM = %g (accepted CellMM ≤ width)", cell, sh.WidthMM)
	}
	g := &grid{cellMM: cell, d: cell / 1000, slab: sh.Slab, widthMM: sh.WidthMM}
	g.ny = int(math.Round(sh.DepthMM / cell))
	flanged := sh.FlangeWidthMM != 0 || sh.FlangeDepthMM != 0
	if sh.Slab {
		if flanged {
			return nil, fmt.Errorf("thermal: FlangeWidthMM = %g, FlangeDepthMM = %g not allowed for a slab (accepted 0, 0)", sh.FlangeWidthMM, sh.FlangeDepthMM)
		}
		g.nx, g.webLo, g.webHi = 1, 0, 1
	} else {
		nw := int(math.Round(sh.WidthMM / cell))
		g.nx, g.webLo, g.webHi = nw, 0, nw
		if flanged {
			if !(sh.FlangeWidthMM > sh.WidthMM && sh.FlangeWidthMM <= 20000) {
				return nil, fmt.Errorf("thermal: FlangeWidthMM = %g out of range (accepted WidthMM = %g < flange width ≤ 20000)", sh.FlangeWidthMM, sh.WidthMM)
			}
			if !(sh.FlangeDepthMM >= cell && sh.FlangeDepthMM < sh.DepthMM) {
				return nil, fmt.Errorf("thermal: FlangeDepthMM = %g out of range (accepted CellMM = %g ≤ flange depth < DepthMM = %g)", sh.FlangeDepthMM, cell, sh.DepthMM)
			}
			out := int(math.Round((sh.FlangeWidthMM - sh.WidthMM) / 2 / cell))
			if out < 1 {
				return nil, fmt.Errorf("thermal: FlangeWidthMM = %g gives outstands under one cell (accepted ≥ WidthMM + 2·CellMM = %g)", sh.FlangeWidthMM, sh.WidthMM+2*cell)
			}
			g.nx = nw + 2*out
			g.webLo, g.webHi = out, out+nw
			g.flangeRows = int(math.Round(sh.FlangeDepthMM / cell))
			if g.flangeRows >= g.ny {
				g.flangeRows = g.ny - 1
			}
			g.widthMM = float64(g.nx) * cell
		}
	}
	if n := g.nx * g.ny; n > maxCells {
		return nil, fmt.Errorf("thermal: %d × %d = %d cells exceeds the limit of %d (accepted CellMM ≥ %.3g for this section)", g.nx, g.ny, n, maxCells, cell*math.Sqrt(float64(n)/maxCells))
	}
	if len(sh.Exposed) == 0 {
		return nil, fmt.Errorf("thermal: Exposed is empty (accepted one or more of bottom, top, left, right)")
	}
	for k, f := range sh.Exposed {
		fi, ok := f.index()
		if !ok {
			return nil, fmt.Errorf("thermal: Exposed[%d] = %q unknown (accepted bottom, top, left, right)", k, f)
		}
		if sh.Slab && fi >= 2 {
			return nil, fmt.Errorf("thermal: Exposed[%d] = %q not allowed for a slab (accepted bottom, top)", k, f)
		}
		g.exposed[fi] = true
	}
	g.status = make([]int8, g.nx*g.ny)
	for j := 0; j < g.ny; j++ {
		for i := 0; i < g.nx; i++ {
			if !g.inOutline(i, j) {
				g.status[j*g.nx+i] = cellOutside
			}
		}
	}
	g.buildLines()
	for k, sp := range sh.Spalled {
		fi, ok := sp.Face.index()
		if !ok {
			return nil, fmt.Errorf("thermal: Spalled[%d].Face = %q unknown (accepted bottom, top, left, right)", k, sp.Face)
		}
		if sh.Slab && fi >= 2 {
			return nil, fmt.Errorf("thermal: Spalled[%d].Face = %q not allowed for a slab (accepted bottom, top)", k, sp.Face)
		}
		thick := g.thickness(fi)
		if !(sp.DepthMM > 0 && sp.DepthMM < thick) {
			return nil, fmt.Errorf("thermal: Spalled[%d].DepthMM = %g out of range (accepted 0 < depth < %g, the section across that face)", k, sp.DepthMM, thick)
		}
		length := g.faceLength(fi)
		if !(sp.FromMM == 0 && sp.ToMM == 0) && !(sp.FromMM >= 0 && sp.ToMM > sp.FromMM && sp.ToMM <= length) {
			return nil, fmt.Errorf("thermal: Spalled[%d] FromMM = %g, ToMM = %g out of range (accepted both 0, or 0 ≤ from < to ≤ %g)", k, sp.FromMM, sp.ToMM, length)
		}
		whole := sp.FromMM == 0 && sp.ToMM == 0
		for li, line := range g.lines[fi] {
			a := g.lineAlong[fi][li]
			if !whole && (a < sp.FromMM || a > sp.ToMM) {
				continue
			}
			for c, idx := range line {
				if (float64(c)+0.5)*cell > sp.DepthMM+1e-9 {
					break
				}
				if g.status[idx] == cellActive {
					g.status[idx] = int8(fi + 1)
				}
			}
		}
	}
	active := 0
	for _, s := range g.status {
		if s == cellActive {
			active++
		}
	}
	if active == 0 {
		return nil, fmt.Errorf("thermal: Spalled removes every cell of the section (accepted depths leaving some concrete)")
	}
	for k, ps := range sh.Progressive {
		fi, ok := ps.Face.index()
		if !ok {
			return nil, fmt.Errorf("thermal: Progressive[%d].Face = %q unknown (accepted bottom, top, left, right)", k, ps.Face)
		}
		if sh.Slab && fi >= 2 {
			return nil, fmt.Errorf("thermal: Progressive[%d].Face = %q not allowed for a slab (accepted bottom, top)", k, ps.Face)
		}
		if !(ps.StartMin >= 0 && ps.StartMin <= maxEndMin) {
			return nil, fmt.Errorf("thermal: Progressive[%d].StartMin = %g out of range (accepted 0–%g)", k, ps.StartMin, maxEndMin)
		}
		if !(ps.RateMMPerMin > 0 && ps.RateMMPerMin <= 100) {
			return nil, fmt.Errorf("thermal: Progressive[%d].RateMMPerMin = %g out of range (accepted 0 < rate ≤ 100)", k, ps.RateMMPerMin)
		}
		thick := g.thickness(fi)
		if !(ps.MaxDepthMM > 0 && ps.MaxDepthMM < thick) {
			return nil, fmt.Errorf("thermal: Progressive[%d].MaxDepthMM = %g out of range (accepted 0 < depth < %g, the section across that face)", k, ps.MaxDepthMM, thick)
		}
	}
	return g, nil
}

// thickness returns the section's extent across face fi, mm.
func (g *grid) thickness(fi int) float64 {
	if fi < 2 {
		return float64(g.ny) * g.cellMM
	}
	return float64(g.webHi-g.webLo) * g.cellMM
}

// faceLength returns the face's extent along itself, mm.
func (g *grid) faceLength(fi int) float64 {
	if fi < 2 {
		if g.slab {
			return g.widthMM
		}
		return float64(g.nx) * g.cellMM
	}
	return float64(g.ny-g.flangeRows) * g.cellMM
}

// buildLines lists, per face, the lines of outline cells perpendicular to it,
// ordered from the original surface inward.
func (g *grid) buildLines() {
	for fi := 0; fi < 4; fi++ {
		g.lines[fi] = nil
		g.lineAlong[fi] = nil
	}
	for i := 0; i < g.nx; i++ {
		along := (float64(i) + 0.5) * g.cellMM
		if g.slab {
			along = g.widthMM / 2
		}
		var up, down []int32
		for j := 0; j < g.ny; j++ {
			if g.inOutline(i, j) {
				up = append(up, int32(j*g.nx+i))
			}
		}
		for j := g.ny - 1; j >= 0; j-- {
			if g.inOutline(i, j) {
				down = append(down, int32(j*g.nx+i))
			}
		}
		g.lines[0] = append(g.lines[0], up)
		g.lineAlong[0] = append(g.lineAlong[0], along)
		g.lines[1] = append(g.lines[1], down)
		g.lineAlong[1] = append(g.lineAlong[1], along)
	}
	if g.slab {
		return
	}
	for j := 0; j < g.ny-g.flangeRows; j++ {
		along := (float64(j) + 0.5) * g.cellMM
		var right, left []int32
		for i := g.webLo; i < g.webHi; i++ {
			right = append(right, int32(j*g.nx+i))
		}
		for i := g.webHi - 1; i >= g.webLo; i-- {
			left = append(left, int32(j*g.nx+i))
		}
		g.lines[2] = append(g.lines[2], right)
		g.lineAlong[2] = append(g.lineAlong[2], along)
		g.lines[3] = append(g.lines[3], left)
		g.lineAlong[3] = append(g.lineAlong[3], along)
	}
}

// lineAt returns the line of face fi nearest to the position alongMM.
func (g *grid) lineAt(fi int, alongMM float64) ([]int32, bool) {
	n := len(g.lines[fi])
	if n == 0 || math.IsNaN(alongMM) {
		return nil, false
	}
	if g.slab && fi < 2 {
		return g.lines[fi][0], true
	}
	k := int(math.Floor(alongMM / g.cellMM))
	if alongMM < 0 || k >= n {
		return nil, false
	}
	return g.lines[fi][k], true
}
