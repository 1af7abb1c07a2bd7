package sectional

import (
	"context"
	"errors"
	"fmt"
	"math"
	"slices"
)

// Direction is the sense of bending about the horizontal axis.
type Direction string

// Bending directions.
const (
	Sagging Direction = "sagging" // bottom in tension
	Hogging Direction = "hogging" // top in tension
)

// Defaults of Options.
const (
	DefaultStep               = 2.5e-4 // κ·H per step
	DefaultMaxCurvatureStrain = 1.0    // κ·H at which the analysis gives up
	DefaultDropFraction       = 0.8    // moment drop that ends the analysis
)

// Options controls a moment–curvature analysis. The zero value (or a nil
// pointer) means no axial force and the documented defaults.
type Options struct {
	// AxialKN is the axial force, kN, compression positive. It must lie
	// strictly between minus the tension capacity and the squash load.
	AxialKN float64
	// Step is the base curvature increment, as κ·H where H is the depth of
	// the Outline (so 2.5e-4 is a change of 0.25 ‰ between the extreme
	// fibres). Steps start at Step/8 after the origin and after first yield,
	// double while the curve is smooth up to max(Step, 5 % of κ·H), and are
	// halved (down to Step/64) where the moment departs by more than 2 % of
	// the peak from the straight extrapolation of the last two points.
	// 0 = DefaultStep; otherwise 1e-6 to 0.01. Capacity uses four times it.
	Step float64
	// MaxCurvatureStrain ends the analysis when κ·H reaches it without a
	// limit (ModeCurvatureLimit, or ModeNoCapacity if no moment built up).
	// 0 = DefaultMaxCurvatureStrain; otherwise 0.001 to 10.
	MaxCurvatureStrain float64
	// DropFraction ends the analysis when the moment falls below this
	// fraction of its peak (ModeMomentDrop). 0 = DefaultDropFraction;
	// otherwise 0.05 to 0.99.
	DropFraction float64
}

func (o *Options) withDefaults() (Options, error) {
	var v Options
	if o != nil {
		v = *o
	}
	if !finite(v.AxialKN) {
		return v, fmt.Errorf("options.AxialKN = %g: want a finite force, kN", v.AxialKN)
	}
	switch {
	case v.Step == 0:
		v.Step = DefaultStep
	case !(v.Step >= 1e-6 && v.Step <= 0.01):
		return v, fmt.Errorf("options.Step = %g: want 0 (default %g) or 1e-6 to 0.01", v.Step, DefaultStep)
	}
	switch {
	case v.MaxCurvatureStrain == 0:
		v.MaxCurvatureStrain = DefaultMaxCurvatureStrain
	case !(v.MaxCurvatureStrain >= 0.001 && v.MaxCurvatureStrain <= 10):
		return v, fmt.Errorf("options.MaxCurvatureStrain = %g: want 0 (default %g) or 0.001 to 10",
			v.MaxCurvatureStrain, DefaultMaxCurvatureStrain)
	}
	switch {
	case v.DropFraction == 0:
		v.DropFraction = DefaultDropFraction
	case !(v.DropFraction >= 0.05 && v.DropFraction <= 0.99):
		return v, fmt.Errorf("options.DropFraction = %g: want 0 (default %g) or 0.05 to 0.99", v.DropFraction, DefaultDropFraction)
	}
	return v, nil
}

// Mode is the way a moment–curvature analysis ended.
type Mode int

// Failure modes.
const (
	ModeNone              Mode = iota // no analysis
	ModeYieldThenCrush                // tension steel yields, then concrete crushes
	ModeCrushSteelElastic             // concrete crushes with the tension steel elastic
	ModeBarRupture                    // a bar reaches its limit (rupture) strain
	ModeConcreteTension               // a concrete fibre reaches a tensile limit strain (custom laws only)
	ModeMomentDrop                    // the moment falls below Options.DropFraction of its peak
	ModeCurvatureLimit                // Options.MaxCurvatureStrain reached before any limit
	ModeNoCapacity                    // no moment builds up (nothing resists tension)
	ModeAxialLoss                     // beyond the last point no strain state carries the axial force
)

var modeWords = [...]string{
	ModeNone:              "no analysis",
	ModeYieldThenCrush:    "tension steel yields, then concrete crushes",
	ModeCrushSteelElastic: "concrete crushes with the tension steel elastic",
	ModeBarRupture:        "bar rupture",
	ModeConcreteTension:   "concrete reaches a tensile limit strain",
	ModeMomentDrop:        "moment falls well below its peak",
	ModeCurvatureLimit:    "curvature limit reached before any limit strain",
	ModeNoCapacity:        "no moment capacity (nothing resists tension)",
	ModeAxialLoss:         "the section can no longer carry the axial force",
}

// String returns the mode in words.
func (m Mode) String() string {
	if m >= 0 && int(m) < len(modeWords) {
		return modeWords[m]
	}
	return fmt.Sprintf("Mode(%d)", int(m))
}

// CurvePoint is one equilibrium state of the moment–curvature curve.
type CurvePoint struct {
	KappaPerM float64 // curvature, 1/m
	MomentKNm float64 // moment about the Outline centroid, kN·m, positive in the analysed direction
	RefStrain float64 // strain at the centroid height (tension positive)
	// NeutralAxisMM is the depth of the zero-strain line below the
	// compression face (the top for sagging, the bottom for hogging), mm. It
	// can lie outside the section; 0 at zero curvature, where it is undefined.
	NeutralAxisMM float64
	// ConcreteStrain is the strain of the most compressed concrete fibre
	// centre (negative in compression).
	ConcreteStrain float64
	// SteelStrain is the strain of the most stretched bar (positive in
	// tension; 0 if the section has no bars).
	SteelStrain float64
}

// Curve is the result of MomentCurvature.
type Curve struct {
	Direction Direction
	AxialKN   float64 // compression positive
	// Points are in increasing curvature from κ = 0 up to the end state:
	// the last state within every limit strain, or the first point below
	// the drop fraction.
	Points         []CurvePoint
	CapacityKNm    float64 // peak moment before the first limit, kN·m
	KappaAtPeak    float64 // 1/m
	KappaYield     float64 // curvature at first yield of tension steel, 1/m (0 if none)
	MomentYieldKNm float64 // moment at first yield, kN·m (0 if none)
	KappaUltimate  float64 // curvature of the last point, 1/m
	Mode           Mode
	Solves         int // equilibrium solutions
	Evaluations    int // section force evaluations
}

// MomentCurvature computes the moment–curvature curve of s bent in dir under
// the axial force opt.AxialKN, up to the first limit (see the package doc).
func MomentCurvature(ctx context.Context, s Section, dir Direction, opt *Options) (*Curve, error) {
	c, err := analyse(ctx, s, dir, opt, true)
	if err != nil {
		return nil, fmt.Errorf("moment-curvature (%s): %w", dir, err)
	}
	return c, nil
}

// Capacity returns the peak moment (kN·m) of s bent in dir before the first
// limit, and the failure mode. It follows the same path as MomentCurvature
// with four times coarser steps, no points kept and no bisection for first
// yield; the peak and the limit are still located exactly.
func Capacity(ctx context.Context, s Section, dir Direction, opt *Options) (float64, Mode, error) {
	c, err := analyse(ctx, s, dir, opt, false)
	if err != nil {
		return 0, ModeNone, fmt.Errorf("capacity (%s): %w", dir, err)
	}
	return c.CapacityKNm, c.Mode, nil
}

// analyse runs the curvature loop; record keeps the points and locates the
// first yield.
func analyse(ctx context.Context, s Section, dir Direction, opt *Options, record bool) (*Curve, error) {
	if dir != Sagging && dir != Hogging {
		return nil, fmt.Errorf("direction %q: want %q or %q", dir, Sagging, Hogging)
	}
	o, err := opt.withDefaults()
	if err != nil {
		return nil, err
	}
	m, err := prepare(s)
	if err != nil {
		return nil, err
	}
	if o.AxialKN != 0 {
		squash, tension, err := m.capacities()
		if err != nil {
			return nil, err
		}
		if o.AxialKN*1000 >= squash || -o.AxialKN*1000 >= tension {
			return nil, fmt.Errorf("options.AxialKN = %g kN: want strictly between %g (tension capacity) and %g (squash load)",
				o.AxialKN, -tension/1000, squash/1000)
		}
	}
	sv := newSolver(m, dir, o.AxialKN)
	a := &run{
		ctx: ctx, sv: sv, record: record,
		h:    m.ymax - m.ymin,
		base: o.Step, maxS: o.MaxCurvatureStrain, drop: o.DropFraction,
		c: &Curve{Direction: dir, AxialKN: o.AxialKN},
	}
	if !record {
		a.base *= 4
	}
	if err := a.loop(); err != nil {
		return nil, err
	}
	a.c.Solves, a.c.Evaluations = sv.solves, sv.evals
	return a.c, nil
}

// run is the state of one curvature loop.
type run struct {
	ctx    context.Context
	sv     *solver
	record bool
	h      float64 // outline depth, mm
	base   float64 // base step in κ·H
	maxS   float64
	drop   float64
	c      *Curve

	peak           state
	peakLo, peakHi float64 // curvatures bracketing the peak (peakHi < 0: none after it yet)
	yielded        bool
}

const (
	maxSteps     = 100000 // curvature steps; reaching it is an error
	maxBisect    = 200    // bisections to locate a limit or first yield
	bisectRelTol = 1e-9   // relative width in κ at which a bisection stops
	bendTol      = 0.02   // departure from extrapolation, fraction of the peak, that halves the step
	relGrowth    = 0.05   // steps may grow to this fraction of κ·H
)

func (a *run) add(st state, fc fibreCheck) {
	if a.record {
		a.c.Points = append(a.c.Points, a.sv.point(st, fc))
	}
}

func (a *run) loop() error {
	sv := a.sv
	st0, err := sv.solve(0, 0, 1e-5)
	if err != nil {
		return err
	}
	c0 := sv.check(st0)
	if c0.util > 1 {
		return fmt.Errorf("options.AxialKN = %g kN: the axial force alone strains a fibre past its limit", a.c.AxialKN)
	}
	a.add(st0, c0)
	a.yielded = c0.yieldUtil >= 1
	a.peak, a.peakLo, a.peakHi = st0, 0, -1
	prev, prev2 := st0, state{k: math.NaN()}
	minDs := a.base / 64
	ds := a.base / 8
	var last state
	for step := 0; ; step++ {
		if step >= maxSteps {
			return fmt.Errorf("no limit after %d curvature steps", maxSteps)
		}
		if step%32 == 0 {
			if err := a.ctx.Err(); err != nil {
				return err
			}
		}
		sPrev := prev.k * a.h
		if sPrev >= a.maxS*(1-1e-12) {
			a.c.Mode = ModeCurvatureLimit
			if !(a.peak.m > 0) {
				a.c.Mode = ModeNoCapacity
			}
			last = prev
			break
		}
		sNew := math.Min(sPrev+ds, a.maxS)
		kNew := sNew / a.h
		guess, h0 := prev.e0, 1e-5
		if !math.IsNaN(prev2.k) && prev.k > prev2.k {
			// Linear extrapolation of the reference strain; its error is
			// of the order of a tenth of the change.
			de := (prev.e0 - prev2.e0) * (kNew - prev.k) / (prev.k - prev2.k)
			guess, h0 = prev.e0+de, 0.1*math.Abs(de)
		}
		st, err := sv.solve(kNew, guess, h0)
		if err != nil {
			if ds > minDs {
				ds /= 2
				continue
			}
			if errors.Is(err, errNoEquilibrium) && prev.k > 0 {
				// The section softens until it cannot carry the axial
				// force: the curve ends at the last equilibrium.
				a.c.Mode = ModeAxialLoss
				last = prev
				break
			}
			return err
		}
		fc := sv.check(st)
		if fc.util > 1 {
			lo, hi, hiFC, err := a.bisect(prev, st, fc, func(f fibreCheck) float64 { return f.util - 1 })
			if err != nil {
				return err
			}
			// The limit state is the end nearer to the limit: lo (within
			// all limits) unless hi passes it by at most 1e-10 and lo is
			// farther off.
			loFC := sv.check(lo)
			if hiFC.util-1 <= 1e-10 && 1-loFC.util > hiFC.util-1 {
				lo, loFC = hi, hiFC
			}
			if lo.k > prev.k {
				a.add(lo, loFC)
				a.update(lo, prev.k)
			}
			if !a.yielded && loFC.yieldUtil >= 1 {
				a.setYield(lo)
			}
			a.c.Mode = a.limitMode(hiFC)
			last = lo
			break
		}
		if !a.yielded && fc.yieldUtil >= 1 {
			if a.record {
				lo, hi, hiFC, err := a.bisect(prev, st, fc, func(f fibreCheck) float64 { return f.yieldUtil - 1 })
				if err != nil {
					return err
				}
				// Take the end nearer to first yield (at most 1e-10 off
				// unless the bracket closed first).
				st, fc = hi, hiFC
				if loFC := sv.check(lo); 1-loFC.yieldUtil < hiFC.yieldUtil-1 {
					st, fc = lo, loFC
				}
				a.setYield(st)
				a.add(st, fc)
				a.update(st, prev.k)
				prev2, prev = prev, st
				ds = a.base / 8
				continue
			}
			a.setYield(st)
		}
		// Halve the step where the curve bends sharply.
		if ds > minDs && !math.IsNaN(prev2.k) && prev.k > prev2.k {
			pred := prev.m + (prev.m-prev2.m)*(st.k-prev.k)/(prev.k-prev2.k)
			scale := math.Max(math.Abs(a.peak.m), math.Abs(st.m))
			if math.Abs(st.m-pred) > bendTol*scale {
				ds /= 2
				continue
			}
		}
		a.add(st, fc)
		a.update(st, prev.k)
		prev2, prev = prev, st
		if a.peak.m > 0 && st.m < a.drop*a.peak.m {
			a.c.Mode = ModeMomentDrop
			last = st
			break
		}
		ds = math.Min(2*ds, math.Max(a.base, relGrowth*sNew))
	}
	if err := a.refinePeak(); err != nil {
		return err
	}
	a.c.CapacityKNm = math.Max(0, a.peak.m/1e6)
	a.c.KappaAtPeak = a.peak.k * 1000
	a.c.KappaUltimate = last.k * 1000
	return nil
}

// update records st as a new point for the peak search; kPrev is the
// curvature of the point before it.
func (a *run) update(st state, kPrev float64) {
	if st.m > a.peak.m {
		a.peak, a.peakLo, a.peakHi = st, kPrev, -1
	} else if a.peakHi < 0 {
		a.peakHi = st.k
	}
}

func (a *run) setYield(st state) {
	a.yielded = true
	a.c.KappaYield = st.k * 1000
	a.c.MomentYieldKNm = st.m / 1e6
}

// bisect narrows [lo, hi] in curvature, where g(check(lo)) ≤ 0 < g(check(hi))
// for a function g continuous in the curvature, by the Illinois variant of
// regula falsi (bisection when it stalls). It stops at a relative width
// bisectRelTol or when g(lo) ≥ -1e-10 or g(hi) ≤ 1e-10.
func (a *run) bisect(lo, hi state, hiFC fibreCheck, g func(fibreCheck) float64) (state, state, fibreCheck, error) {
	glo, ghi := g(a.sv.check(lo)), g(hiFC)
	side := 0
	for i := 0; i < maxBisect && hi.k-lo.k > bisectRelTol*hi.k && glo < -1e-10 && ghi > 1e-10; i++ {
		t := glo / (glo - ghi)
		if !(t > 0.01 && t < 0.99) {
			t = 0.5
		}
		k := lo.k + t*(hi.k-lo.k)
		de := hi.e0 - lo.e0
		mid, err := a.sv.solve(k, lo.e0+t*de, 0.1*math.Abs(de))
		if err != nil {
			return lo, hi, hiFC, err
		}
		fc := a.sv.check(mid)
		if gm := g(fc); gm > 0 {
			hi, hiFC, ghi = mid, fc, gm
			if side == 1 {
				glo /= 2
			}
			side = 1
		} else {
			lo, glo = mid, gm
			if side == -1 {
				ghi /= 2
			}
			side = -1
		}
	}
	return lo, hi, hiFC, nil
}

// limitMode names the limit that fc passed.
func (a *run) limitMode(fc fibreCheck) Mode {
	switch {
	case fc.utilBar:
		return ModeBarRupture
	case fc.utilTens:
		return ModeConcreteTension
	case a.yielded || fc.yieldUtil >= 1:
		return ModeYieldThenCrush
	}
	return ModeCrushSteelElastic
}

// refinePeak locates an interior peak (a point with lower moments on both
// sides) by golden-section search on the curvature.
func (a *run) refinePeak() error {
	if a.peakHi <= a.peakLo || !(a.peak.m > 0) {
		return nil
	}
	var serr error
	guess := a.peak.e0
	best := a.peak
	f := func(k float64) float64 {
		st, err := a.sv.solve(k, guess, 1e-5)
		if err != nil {
			serr = err
			return math.Inf(-1)
		}
		if st.m > best.m {
			if fc := a.sv.check(st); fc.util <= 1 {
				best = st
			}
		}
		return st.m
	}
	// The moment is flat at the peak: a relative width of 1e-5 in κ leaves
	// an error of order 1e-10 in M.
	goldenMax(f, a.peakLo, a.peakHi, 1e-5*a.peakHi)
	if serr != nil {
		return serr
	}
	if best.m > a.peak.m {
		a.peak = best
		if a.record {
			p := a.sv.point(best, a.sv.check(best))
			i, _ := slices.BinarySearchFunc(a.c.Points, p.KappaPerM, func(q CurvePoint, k float64) int {
				return cmpFloat(q.KappaPerM, k)
			})
			a.c.Points = slices.Insert(a.c.Points, i, p)
		}
	}
	return nil
}

func cmpFloat(a, b float64) int {
	switch {
	case a < b:
		return -1
	case a > b:
		return 1
	}
	return 0
}

// NMPoint is one point of an axial force–moment interaction curve.
type NMPoint struct {
	AxialKN   float64 // compression positive
	MomentKNm float64 // capacity in the analysed direction at that force
	Mode      Mode    // how the analysis at that force ended (ModeNone at the two ends)
}

// Interaction returns n ≥ 2 points of the N–M interaction curve of s bent in
// dir, at axial forces evenly spaced from the tension capacity (negative) to
// the squash load. The two ends carry no moment by definition; every other
// point is Capacity at that force.
func Interaction(ctx context.Context, s Section, dir Direction, n int) ([]NMPoint, error) {
	if n < 2 || n > 1000 {
		return nil, fmt.Errorf("interaction: n = %d points: want 2 to 1000", n)
	}
	comp, tens, err := AxialCapacity(s)
	if err != nil {
		return nil, fmt.Errorf("interaction: %w", err)
	}
	pts := make([]NMPoint, n)
	for i := range pts {
		nk := -tens + (comp+tens)*float64(i)/float64(n-1)
		pts[i].AxialKN = nk
		if i == 0 || i == n-1 {
			continue
		}
		mk, mode, err := Capacity(ctx, s, dir, &Options{AxialKN: nk})
		if err != nil {
			if errors.Is(err, context.Canceled) || errors.Is(err, context.DeadlineExceeded) {
				return nil, err
			}
			return nil, fmt.Errorf("interaction at %g kN: %w", nk, err)
		}
		pts[i].MomentKNm, pts[i].Mode = mk, mode
	}
	return pts, nil
}
