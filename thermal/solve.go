package thermal

import (
	"context"
	"fmt"
	"math"
	"sort"
	"sync"
)

// Limits and constants of the solver.
const (
	maxCells  = 200000 // cells per section
	maxEndMin = 4320.0 // 72 h, the longest simulated run

	sigmaSB    = 5.67e-8 // Stefan–Boltzmann constant, W/m²K⁴
	emissivity = 0.7     // ε_m of concrete, EN 1992-1-2 §2.2(2); ε_f = 1.0 (EN 1991-1-2 §3.1(6))
	kelvin     = 273.15

	dtMaxS     = 15.0 // s, cap on the time step (resolves the gas curves)
	dtSafety   = 0.95 // fraction of the explicit stability limit
	windowMin  = 15.0 // min, window of the automatic end test
	riseTolC   = 0.1  // °C, a peak rising less than this over a window has passed
	ambientTol = 1.0  // °C, the gas is "near ambient" within this of 20 °C

	coolRelaxS = 1800 // s after the end of heating from which the implicit step grows
	lateFactor = 2    // by this factor
)

// Options controls a run; nil means the zero value.
type Options struct {
	EndMin          float64            // 0 = automatic (every cell past its peak and gas back near ambient); ≤ 4320 (72 h)
	LumpedUnexposed bool               // 9 W/m²K lumped on unexposed faces instead of 4 W/m²K + radiation
	Probes          []Point            // histories recorded here (bar centres), bilinear interpolation
	HistoryStepMin  float64            // sampling of probe histories, 0 = 1 min (accepted 0–60)
	Progress        func(frac float64) // optional, called from the solving goroutine, frac in [0,1]
}

// boundary holds the boundary-condition constants of a run.
type boundary struct {
	fireEps   float64 // ε_m·ε_f on fire-exposed faces
	ambAlpha  float64 // α_c on unexposed faces, W/m²K
	ambEps    float64 // ε_m on unexposed faces (0 when lumped)
	adiabatic bool    // unexposed faces adiabatic (analytic tests only)
	noMirror  bool    // solve symmetric beams on the whole grid (tests only)
	explicit  bool    // never use the implicit line solver (tests only)
	dtLine    float64 // implicit line-solver step, s (0 = dtImplicitS; tests only)
	lineIter  int     // implicit iterations per step (0 = 1; tests only)
}

func defaultBoundary(lumped bool) boundary {
	if lumped {
		return boundary{fireEps: emissivity, ambAlpha: 9}
	}
	return boundary{fireEps: emissivity, ambAlpha: 4, ambEps: emissivity}
}

var tableCache sync.Map // enConcrete → *tables

// Solve computes the transient temperature field of the section sh exposed to
// exp, from 20 °C through heating and cooling, and returns the peak field.
// See the package documentation for the method.
func Solve(ctx context.Context, sh Shape, exp Exposure, c Concrete, opt *Options) (*Field, error) {
	if exp == nil {
		return nil, fmt.Errorf("thermal: exposure is nil")
	}
	m, err := c.material()
	if err != nil {
		return nil, err
	}
	v, ok := tableCache.Load(m)
	if !ok {
		v, _ = tableCache.LoadOrStore(m, newTables(m))
	}
	tb := v.(*tables)
	if opt == nil {
		opt = &Options{}
	}
	return solve(ctx, sh, exp, tb, opt, defaultBoundary(opt.LumpedUnexposed))
}

// sides is a list of boundary cell sides with one boundary condition.
type sides struct {
	cell []int32   // cell index
	slot []int32   // cell·4 + direction (surface peak index)
	ts   []float64 // surface temperature, °C (Newton warm start)
}

func (s *sides) reset() { s.cell, s.slot, s.ts = s.cell[:0], s.slot[:0], s.ts[:0] }

// spallEvent removes layer k of face fi at time tS, s.
type spallEvent struct {
	tS    float64
	face  int
	layer int
}

// probeState is the interpolation of one probe.
type probeState struct {
	idx  [4]int32
	w    [4]float64
	prev float64
}

// run is the state of one solution.
type run struct {
	g   *grid
	tb  *tables
	bc  boundary
	exp Exposure

	n            int
	h, t, lam, q []float64
	peak, peakT  []float64
	wx, wy       []float64 // 0.5 where the face joins two active cells, else 0
	surfPeak     []float64 // per cell side: peak surface temperature, °C (-Inf: never a boundary)
	fire, amb    sides
	dt           float64 // s
	alphaFire    float64
	energyIn     float64 // J/m, through the boundary
	energyOut    float64 // J/m, enthalpy of removed cells (above 0 °C)
	h0           float64 // J/m³ at 20 °C
	probes       []probeState
	probePts     []Point
	active       int // number of active cells
	implicit     bool
	line         *lineSolver
	iters        int     // implicit iterations taken
	maxIter      int     // implicit iterations per step
	dtLine       float64 // implicit step, s
}

func solve(ctx context.Context, sh Shape, exp Exposure, tb *tables, opt *Options, bc boundary) (*Field, error) {
	g, err := newGrid(sh)
	if err != nil {
		return nil, err
	}
	if !(opt.EndMin >= 0 && opt.EndMin <= maxEndMin) {
		return nil, fmt.Errorf("thermal: EndMin = %g out of range (accepted 0 = automatic, or up to %g)", opt.EndMin, maxEndMin)
	}
	histStep := opt.HistoryStepMin
	if histStep == 0 {
		histStep = 1
	}
	if !(histStep > 0 && histStep <= 60) {
		return nil, fmt.Errorf("thermal: HistoryStepMin = %g out of range (accepted 0 = 1 min, or up to 60)", opt.HistoryStepMin)
	}
	auto := opt.EndMin == 0
	ambientAt := exp.AmbientAt()
	if auto && (math.IsInf(ambientAt, 1) || math.IsNaN(ambientAt)) {
		return nil, fmt.Errorf("thermal: EndMin = 0 (automatic) needs an exposure that returns to ambient, but %s never does (give EndMin, accepted up to %g, or cut the curve with NewCooled)", exp.Name(), maxEndMin)
	}
	alpha := exp.Convection()
	if !(alpha > 0 && alpha <= 1e9) {
		return nil, fmt.Errorf("thermal: exposure convection α_c = %g W/m²K out of range (accepted 0 < α_c ≤ 1e9)", alpha)
	}
	for k, p := range opt.Probes {
		if !g.contains(p) {
			return nil, fmt.Errorf("thermal: Probes[%d] = (%g, %g) mm outside the section", k, p.XMM, p.YMM)
		}
	}

	// A beam symmetric about its vertical centre line is solved on its left
	// half, with the centre line adiabatic, and mirrored back at the end.
	full := g
	probes := opt.Probes
	half := !bc.noMirror && mirrorable(sh, g)
	if half {
		g = g.leftHalf()
		probes = make([]Point, len(opt.Probes))
		w := float64(full.nx) * full.cellMM
		for k, p := range opt.Probes {
			probes[k] = p
			if p.XMM > w/2 {
				probes[k].XMM = w - p.XMM
			}
		}
	}

	r := &run{g: g, tb: tb, bc: bc, exp: exp, alphaFire: alpha}
	n := g.cells()
	r.n = n
	r.h = make([]float64, n)
	r.t = make([]float64, n)
	r.lam = make([]float64, n)
	r.q = make([]float64, n)
	r.peak = make([]float64, n)
	r.peakT = make([]float64, n)
	r.wx = make([]float64, n)
	r.wy = make([]float64, n)
	r.surfPeak = make([]float64, 4*n)
	r.h0 = tb.enthalpy(AmbientC)
	t0 := tb.temperature(r.h0)
	for k := range r.h {
		r.h[k] = r.h0
		r.t[k] = t0
		r.lam[k] = tb.conductivity(t0)
		r.peak[k] = t0
	}
	for k := range r.surfPeak {
		r.surfPeak[k] = math.Inf(-1)
	}
	r.probePts = probes
	for _, s := range g.status {
		if s == cellActive {
			r.active++
		}
	}
	r.probes = make([]probeState, len(opt.Probes))
	r.rebuild()
	// A single column whose explicit step would be much shorter than the
	// implicit one (fine slab meshes) is solved by implicit line solves.
	if g.nx == 1 && !bc.explicit && r.dt < dtImplicitS/4 {
		r.implicit = true
		r.line = newLineSolver(n)
		r.dtLine = dtImplicitS
		r.maxIter = 1
		if bc.lineIter > 0 {
			r.maxIter = bc.lineIter
		}
		if bc.dtLine > 0 {
			r.dtLine = bc.dtLine
		}
		r.dt = r.dtLine
	}

	// Progressive spalling events, in time order.
	var events []spallEvent
	for _, ps := range sh.Progressive {
		fi, _ := ps.Face.index()
		if half && fi == 3 {
			continue // mirrored by the matching left-face spalling
		}
		for k := 0; ; k++ {
			depth := (float64(k) + 0.5) * g.cellMM
			if depth > ps.MaxDepthMM+1e-9 {
				break
			}
			events = append(events, spallEvent{tS: (ps.StartMin + depth/ps.RateMMPerMin) * 60, face: fi, layer: k})
		}
	}
	sort.SliceStable(events, func(a, b int) bool { return events[a].tS < events[b].tS })

	endS := maxEndMin * 60
	if !auto {
		endS = opt.EndMin * 60
	}
	heatEndS := exp.HeatingEnd() * 60
	ambientS := ambientAt * 60
	estS := endS
	if auto {
		estS = math.Min(endS, math.Max(2*ambientS, 3*math.Min(heatEndS, ambientS)))
	}

	f := &Field{Nx: g.nx, Ny: g.ny, CellMM: g.cellMM, g: g}
	f.EndOfHeating = make([]float64, n)
	f.Probes = make([]Probe, len(opt.Probes))
	histS := histStep * 60
	capHint := int(math.Min(estS, endS)/histS) + 2
	for k, p := range opt.Probes {
		v := r.probeValue(k, AmbientC)
		r.probes[k].prev = v
		f.Probes[k] = Probe{At: p, PeakC: v, EndOfHeatingC: math.NaN(),
			TimesMin: make([]float64, 1, capHint), TempsC: make([]float64, 1, capHint)}
		f.Probes[k].TempsC[0] = v
	}

	var (
		t         float64
		gotEOH    bool
		ev        int
		steps     int
		lastFrac  = -1.0
		peakRef   []float64
		nextCheck = windowMin * 60
	)
	if auto {
		peakRef = make([]float64, n)
		copy(peakRef, r.peak)
	}
	for t < endS-1e-9 {
		if steps&63 == 0 {
			if err := ctx.Err(); err != nil {
				return nil, fmt.Errorf("thermal: solve cancelled at %.1f min: %w", t/60, err)
			}
			if opt.Progress != nil {
				fr := math.Min(0.99, t/estS)
				if fr-lastFrac >= 0.01 {
					opt.Progress(fr)
					lastFrac = fr
				}
			}
		}
		if ev < len(events) && events[ev].tS <= t+1e-9 {
			removed := false
			for ev < len(events) && events[ev].tS <= t+1e-9 {
				removed = r.removeLayer(events[ev].face, events[ev].layer) || removed
				ev++
			}
			if removed {
				r.rebuild()
			}
		}
		step := r.dt
		if r.implicit && t >= heatEndS+coolRelaxS {
			// Well into cooling the field varies slowly: longer implicit steps.
			step = r.dt * lateFactor
		}
		if !gotEOH && heatEndS > t+1e-9 && t+step > heatEndS {
			step = heatEndS - t
		}
		if t+step > endS {
			step = endS - t
		}
		if ev < len(events) && t+step > events[ev].tS && events[ev].tS > t {
			step = events[ev].tS - t
		}
		gas := exp.GasTemperature((t + step/2) / 60)
		if !(gas >= 0 && gas <= 2000) {
			return nil, fmt.Errorf("thermal: gas temperature of %s = %g °C at %.2f min out of range (accepted 0–2000)", exp.Name(), gas, (t+step/2)/60)
		}
		if r.implicit {
			r.stepImplicit(t, step, gas)
		} else {
			r.step(t, step, gas)
		}
		t += step
		steps++

		for k := range r.probes {
			v := r.probeValue(k, exp.GasTemperature(t/60))
			pr := &f.Probes[k]
			for {
				ts := histS * float64(len(pr.TimesMin))
				if ts > t+1e-9 {
					break
				}
				a := r.probes[k].prev + (v-r.probes[k].prev)*(ts-(t-step))/step
				pr.TimesMin = append(pr.TimesMin, ts/60)
				pr.TempsC = append(pr.TempsC, a)
			}
			if v > pr.PeakC {
				pr.PeakC, pr.PeakTimeMin = v, t/60
			}
			r.probes[k].prev = v
		}
		if !gotEOH && t >= heatEndS-1e-9 {
			copy(f.EndOfHeating, r.t)
			for k := range r.probes {
				f.Probes[k].EndOfHeatingC = r.probes[k].prev
			}
			gotEOH = true
		}
		if auto && t >= nextCheck-1e-9 {
			nextCheck += windowMin * 60
			rise := 0.0
			for k, s := range g.status {
				if s == cellActive {
					rise = math.Max(rise, r.peak[k]-peakRef[k])
				}
			}
			copy(peakRef, r.peak)
			gas := exp.GasTemperature(t / 60)
			if t >= heatEndS-1e-9 && t >= ambientS-1e-9 && math.Abs(gas-AmbientC) <= ambientTol && rise < riseTolC {
				break
			}
		}
	}
	// Layers due at the final time go too.
	removed := false
	for ev < len(events) && events[ev].tS <= t+1e-9 {
		removed = r.removeLayer(events[ev].face, events[ev].layer) || removed
		ev++
	}
	if removed {
		r.rebuild()
	}
	if opt.Progress != nil {
		opt.Progress(1)
	}
	if !gotEOH {
		copy(f.EndOfHeating, r.t)
		for k := range r.probes {
			f.Probes[k].EndOfHeatingC = r.probes[k].prev
		}
	}
	f.EndMin = t / 60
	f.Active = make([]bool, n)
	for k, s := range g.status {
		f.Active[k] = s == cellActive
	}
	f.Peak = r.peak
	f.PeakTimeMin = r.peakT
	for k := range f.PeakTimeMin {
		f.PeakTimeMin[k] /= 60
	}
	f.Final = r.t
	f.surfPeak = r.surfPeak
	f.Steps = steps
	f.iters = r.iters
	f.TimeStepS = r.dt
	f.energyIn, f.energyOut, f.h = r.energyIn, r.energyOut, r.h
	f.tb = tb
	f.updates = float64(steps) * float64(n)
	if half {
		f.mirror(full)
	}
	return f, nil
}

// mirrorable reports whether sh is symmetric about the vertical centre line of
// its grid g: a beam with an even number of columns, left and right exposed
// alike, measured spalling symmetric and progressive spalling of the two sides
// matching.
func mirrorable(sh Shape, g *grid) bool {
	if g.slab || g.nx%2 != 0 || g.nx < 4 || g.exposed[2] != g.exposed[3] {
		return false
	}
	for j := 0; j < g.ny; j++ {
		row := g.status[j*g.nx : (j+1)*g.nx]
		for i := 0; i < g.nx/2; i++ {
			a, b := row[i], row[g.nx-1-i]
			if a == 3 {
				a = 4
			} else if a == 4 {
				a = 3
			}
			if a != b {
				return false
			}
		}
	}
	type key struct{ s, r, m float64 }
	count := map[key]int{}
	for _, ps := range sh.Progressive {
		k := key{ps.StartMin, ps.RateMMPerMin, ps.MaxDepthMM}
		switch ps.Face {
		case Left:
			count[k]++
		case Right:
			count[k]--
		}
	}
	for _, v := range count {
		if v != 0 {
			return false
		}
	}
	return true
}

// leftHalf returns the left half of g (columns 0 … nx/2 − 1) with its right
// edge adiabatic.
func (g *grid) leftHalf() *grid {
	h := *g
	h.nx = g.nx / 2
	h.webHi = h.nx
	h.mirrorRight = true
	h.status = make([]int8, h.nx*h.ny)
	for j := 0; j < h.ny; j++ {
		copy(h.status[j*h.nx:(j+1)*h.nx], g.status[j*g.nx:j*g.nx+h.nx])
	}
	h.buildLines()
	return &h
}

// mirror expands a field solved on the left half of full to the whole grid.
func (f *Field) mirror(full *grid) {
	nxh, nx, ny := f.Nx, full.nx, full.ny
	n := nx * ny
	src := func(c int) (int, bool) {
		i, j := c%nx, c/nx
		if i < nxh {
			return j*nxh + i, false
		}
		return j*nxh + nx - 1 - i, true
	}
	expand := func(a []float64) []float64 {
		out := make([]float64, n)
		for c := range out {
			k, _ := src(c)
			out[c] = a[k]
		}
		return out
	}
	status := f.g.status
	f.Peak, f.PeakTimeMin = expand(f.Peak), expand(f.PeakTimeMin)
	f.EndOfHeating, f.Final, f.h = expand(f.EndOfHeating), expand(f.Final), expand(f.h)
	f.Active = make([]bool, n)
	sp := make([]float64, 4*n)
	for c := 0; c < n; c++ {
		k, mir := src(c)
		s := status[k]
		if mir && (s == 3 || s == 4) {
			s = 7 - s // removed from the left in the half = from the right here
		}
		full.status[c] = s
		f.Active[c] = s == cellActive
		for dir := 0; dir < 4; dir++ {
			d := dir
			if mir && dir >= 2 {
				d = 5 - dir
			}
			sp[4*c+dir] = f.surfPeak[4*k+d]
		}
	}
	f.surfPeak = sp
	f.energyIn *= 2
	f.energyOut *= 2
	f.Nx = nx
	f.g = full
}

// step advances the field from t by dt seconds: explicit (forward Euler)
// enthalpy update, H ← H + dt/V·Σ(face flows), θ = θ(H).
func (r *run) step(t, dt, gas float64) {
	g := r.g
	nx, n := g.nx, r.n
	T, lam, q := r.t, r.lam, r.q
	wx, wy := r.wx, r.wy
	// Conduction between neighbours, per unit length: λ_face·(θ_b − θ_a),
	// λ_face the mean of the two cells' λ (square cells).
	if nx > 1 {
		for j := 0; j < g.ny; j++ {
			row := j * nx
			end := row + nx - 1
			carry := 0.0 // flow through the previous face, carried in a register
			for k := row; k < end; k++ {
				fl := wx[k] * (lam[k] + lam[k+1]) * (T[k+1] - T[k])
				q[k] += fl - carry
				carry = fl
			}
			q[end] -= carry
		}
	}
	ty := T[nx:n]
	ly := lam[nx:n]
	qy := q[nx:n]
	wy = wy[:n-nx]
	for k := range wy {
		fl := wy[k] * (lam[k] + ly[k]) * (ty[k] - T[k])
		q[k] += fl
		qy[k] -= fl
	}
	// Boundaries, with the gas temperature at mid-step.
	in := r.surface(&r.fire, gas, r.alphaFire, r.bc.fireEps)
	if !r.bc.adiabatic {
		in += r.surface(&r.amb, AmbientC, r.bc.ambAlpha, r.bc.ambEps)
	}
	r.energyIn += in * dt
	// Update.
	c := dt / (g.d * g.d)
	tb := r.tb
	h, peak, peakT := r.h, r.peak, r.peakT
	tNew := t + dt
	inv, invDH := tb.inv, tb.invDH
	jMax := len(inv) - 2
	for k := range h {
		hk := h[k] + c*q[k]
		q[k] = 0
		h[k] = hk
		x := hk * invDH
		j := int(x)
		if j < 0 {
			j = 0
		} else if j > jMax {
			j = jMax
		}
		e := &inv[j]
		fr := x - float64(j)
		th := e.th + fr*e.dth
		T[k] = th
		lam[k] = e.lam + fr*e.dlam
		if th > peak[k] {
			peak[k] = th
			peakT[k] = tNew
		}
	}
}

// surface adds the flows through the sides s, W/m, into q and returns their
// sum. The surface temperature θ_s solves
//
//	α(θ_g − θ_s) + εσ[(θ_g+273)⁴ − (θ_s+273)⁴] = (2λ/Δ)(θ_s − θ_c)
//
// by Newton's method from the previous step's θ_s.
func (r *run) surface(s *sides, gas, alpha, eps float64) float64 {
	tg := gas + kelvin
	es := eps * sigmaSB
	tg4 := es * tg * tg * tg * tg
	d := r.g.d
	sum := 0.0
	T, lam, q, sp := r.t, r.lam, r.q, r.surfPeak
	for k, c := range s.cell {
		tc := T[c]
		kk := 2 * lam[c] / d
		ts := s.ts[k]
		for it := 0; it < 3; it++ {
			a := ts + kelvin
			a3 := a * a * a
			fv := alpha*(gas-ts) + tg4 - es*a3*a - kk*(ts-tc)
			fp := -alpha - 4*es*a3 - kk
			dx := fv / fp
			ts -= dx
			if math.Abs(dx) < 1e-4 {
				break
			}
		}
		s.ts[k] = ts
		fl := kk * (ts - tc) * d
		q[c] += fl
		sum += fl
		if sl := s.slot[k]; ts > sp[sl] {
			sp[sl] = ts
		}
	}
	return sum
}

// rebuild recomputes face weights, boundary lists, the time step and probe
// weights after the set of active cells changed.
func (r *run) rebuild() {
	g := r.g
	nx, ny := g.nx, g.ny
	st := g.status
	old := make(map[int32]float64, len(r.fire.cell)+len(r.amb.cell))
	for _, s := range []*sides{&r.fire, &r.amb} {
		for k, sl := range s.slot {
			old[sl] = s.ts[k]
		}
		s.reset()
	}
	for k := range r.wx {
		r.wx[k], r.wy[k] = 0, 0
	}
	lamMax := r.tb.lamMax
	hFire := r.alphaFire + 4*r.bc.fireEps*sigmaSB*math.Pow(1700+kelvin, 3)
	hAmb := r.bc.ambAlpha + 4*r.bc.ambEps*sigmaSB*math.Pow(1700+kelvin, 3)
	gb := func(h float64) float64 { return 1 / (1/(2*lamMax) + 1/(h*g.d)) }
	gFire, gAmb := gb(hFire), gb(hAmb)
	maxSum := 0.0
	for j := 0; j < ny; j++ {
		for i := 0; i < nx; i++ {
			c := j*nx + i
			if st[c] != cellActive {
				continue
			}
			sum := 0.0
			for dir := 0; dir < 4; dir++ {
				ni, nj := i, j
				switch dir {
				case 0:
					nj--
				case 1:
					nj++
				case 2:
					ni--
				case 3:
					ni++
				}
				face := -1 // boundary face index; -2 internal; -3 adiabatic
				if ni >= 0 && nj >= 0 && ni < nx && nj < ny {
					switch s := st[nj*nx+ni]; {
					case s == cellActive:
						face = -2
					case s > 0:
						face = int(s - 1)
					}
				}
				if face == -1 && dir == 3 && g.mirrorRight && i == nx-1 {
					face = -3 // centre line of a mirrored beam
				}
				if face == -1 {
					switch dir {
					case 0:
						face = 0
					case 1:
						face = 1
					default:
						if g.slab || j >= ny-g.flangeRows {
							face = -3
						} else {
							face = dir
						}
					}
				}
				switch {
				case face == -2:
					sum += lamMax
					if dir == 1 {
						r.wy[c] = 0.5
					} else if dir == 3 {
						r.wx[c] = 0.5
					}
				case face >= 0:
					slot := int32(4*c + dir)
					ts, ok := old[slot]
					if !ok {
						ts = r.t[c]
					}
					if g.exposed[face] {
						r.fire.cell = append(r.fire.cell, int32(c))
						r.fire.slot = append(r.fire.slot, slot)
						r.fire.ts = append(r.fire.ts, ts)
						sum += gFire
					} else if !r.bc.adiabatic {
						r.amb.cell = append(r.amb.cell, int32(c))
						r.amb.slot = append(r.amb.slot, slot)
						r.amb.ts = append(r.amb.ts, ts)
						sum += gAmb
					}
				}
			}
			maxSum = math.Max(maxSum, sum)
		}
	}
	r.dt = dtMaxS
	if maxSum > 0 {
		r.dt = math.Min(dtMaxS, dtSafety*r.tb.cMin*g.d*g.d/maxSum)
	}
	if r.implicit {
		r.dt = r.dtLine
	}
	for k, p := range r.probePts {
		r.probes[k].idx, r.probes[k].w = g.weights(p)
	}
}

// removeLayer removes layer k of face fi (counted from the original surface)
// and reports whether any cell went. A layer that would leave no concrete at
// all is kept.
func (r *run) removeLayer(fi, k int) bool {
	g := r.g
	var gone []int32
	for _, line := range g.lines[fi] {
		if k < len(line) && g.status[line[k]] == cellActive {
			gone = append(gone, line[k])
		}
	}
	if len(gone) == 0 || len(gone) >= r.active {
		return false
	}
	for _, c := range gone {
		g.status[c] = int8(fi + 1)
		r.energyOut += (r.h[c] - r.h0) * g.d * g.d
	}
	r.active -= len(gone)
	return true
}

// probeValue returns the interpolated temperature of probe k, or gas when
// every surrounding cell is gone (a bar exposed by spalling sees the fire).
func (r *run) probeValue(k int, gas float64) float64 {
	p := &r.probes[k]
	v, w := 0.0, 0.0
	for i := 0; i < 4; i++ {
		if p.w[i] > 0 {
			v += p.w[i] * r.t[p.idx[i]]
			w += p.w[i]
		}
	}
	if w == 0 {
		return gas
	}
	return v / w
}
