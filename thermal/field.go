package thermal

import "math"

// Field is the result. Cell (i, j) has index j*Nx+i, i along x from the left, j along y from the bottom;
// its centre is at ((i+0.5)·CellMM, (j+0.5)·CellMM) (for a slab Nx = 1 and x is the mid-width).
// Values of cells that are not Active are not meaningful (cells outside the outline stay at 20 °C;
// removed cells keep the values they had when they went).
type Field struct {
	Nx, Ny       int
	CellMM       float64
	Active       []bool    // false for cells outside the outline or removed by spalling (by the end of the run)
	Peak         []float64 // °C, maximum over heating AND cooling
	PeakTimeMin  []float64 // min, time of Peak
	EndOfHeating []float64 // °C at Exposure.HeatingEnd() (or at the end of the run if that is later)
	Final        []float64 // °C at EndMin
	EndMin       float64   // simulated end time, min
	Probes       []Probe
	Steps        int     // number of time steps taken
	TimeStepS    float64 // time step at the end of the run, s

	g                   *grid
	surfPeak            []float64 // per cell side (cell·4 + direction): peak surface temperature, °C
	energyIn, energyOut float64   // J/m: through the boundary; carried off by removed cells
	h                   []float64 // final enthalpy, J/m³
	tb                  *tables
	updates             float64 // cell updates computed (cells solved × steps)
	iters               int     // implicit iterations (line solver)
}

// Probe is the temperature history at a point (a bar centre), interpolated
// bilinearly between the centres of the active cells around it. When every
// cell around it has spalled away the probe takes the gas temperature.
type Probe struct {
	At            Point
	PeakC         float64   // °C, maximum of the history (over every time step)
	PeakTimeMin   float64   // min
	EndOfHeatingC float64   // °C at the end of heating
	TimesMin      []float64 // sample times, min, from 0 at Options.HistoryStepMin
	TempsC        []float64 // °C at TimesMin
}

// contains reports whether p lies in the section's outline.
func (g *grid) contains(p Point) bool {
	if math.IsNaN(p.XMM) || math.IsNaN(p.YMM) {
		return false
	}
	w := float64(g.nx) * g.cellMM
	if g.slab {
		w = g.widthMM
	}
	hgt := float64(g.ny) * g.cellMM
	if p.XMM < 0 || p.XMM > w || p.YMM < 0 || p.YMM > hgt {
		return false
	}
	if g.slab {
		return true
	}
	i := min(int(p.XMM/g.cellMM), g.nx-1)
	j := min(int(p.YMM/g.cellMM), g.ny-1)
	return g.inOutline(i, j)
}

// weights returns the four cells around p and their bilinear weights; cells
// that are not active get weight 0.
func (g *grid) weights(p Point) (idx [4]int32, w [4]float64) {
	fy := math.Max(0, math.Min(float64(g.ny-1), p.YMM/g.cellMM-0.5))
	j0 := min(int(fy), max(g.ny-2, 0))
	ty := fy - float64(j0)
	fx, i0, tx := 0.0, 0, 0.0
	if g.nx > 1 {
		fx = math.Max(0, math.Min(float64(g.nx-1), p.XMM/g.cellMM-0.5))
		i0 = min(int(fx), g.nx-2)
		tx = fx - float64(i0)
	}
	k := 0
	for dj := 0; dj < 2; dj++ {
		for di := 0; di < 2; di++ {
			i, j := i0+di, j0+dj
			wt := (1 - tx + float64(di)*(2*tx-1)) * (1 - ty + float64(dj)*(2*ty-1))
			if i >= g.nx || j >= g.ny || wt <= 0 || g.status[j*g.nx+i] != cellActive {
				idx[k], w[k] = 0, 0
			} else {
				idx[k], w[k] = int32(j*g.nx+i), wt
			}
			k++
		}
	}
	return idx, w
}

// PeakAt returns the peak temperature, °C, at p, interpolated bilinearly between
// the centres of the active cells around it (NaN if p is outside the section or
// every cell around it is gone).
func (f *Field) PeakAt(p Point) float64 {
	if f.g == nil || !f.g.contains(p) {
		return math.NaN()
	}
	idx, w := f.g.weights(p)
	v, s := 0.0, 0.0
	for k := range idx {
		if w[k] > 0 {
			v += w[k] * f.Peak[idx[k]]
			s += w[k]
		}
	}
	if s == 0 {
		return math.NaN()
	}
	return v / s
}

// IsothermDepth: depth (mm) from the face's current surface along the inward normal, starting at the point
// alongMM on the face (same measure as Spall.FromMM), at which the peak field falls to thetaC.
// ok=false where the surface peak is below thetaC; depth = whole section if never below.
// The profile runs through the peak surface temperature and the peak at each cell centre on the line,
// interpolated linearly.
func (f *Field) IsothermDepth(face Face, alongMM, thetaC float64) (depthMM float64, ok bool) {
	fi, known := face.index()
	if f.g == nil || !known || math.IsNaN(thetaC) {
		return 0, false
	}
	line, found := f.g.lineAt(fi, alongMM)
	if !found {
		return 0, false
	}
	k0 := 0
	for k0 < len(line) && f.g.status[line[k0]] != cellActive {
		k0++
	}
	if k0 == len(line) {
		return 0, false
	}
	first := line[k0]
	surf := math.Max(f.surfPeak[4*int(first)+fi], f.Peak[first])
	if surf < thetaC {
		return 0, false
	}
	cell := f.CellMM
	prevD, prevV := 0.0, surf
	m := 0
	for k := k0; k < len(line) && f.g.status[line[k]] == cellActive; k++ {
		d := (float64(m) + 0.5) * cell
		v := f.Peak[line[k]]
		if v <= thetaC {
			if v == prevV {
				return d, true
			}
			return prevD + (thetaC-prevV)*(d-prevD)/(v-prevV), true
		}
		prevD, prevV = d, v
		m++
	}
	return float64(m) * cell, true
}
