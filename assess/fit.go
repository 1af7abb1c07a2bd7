package assess

import (
	"fmt"
	"math"
	"slices"

	"residuum/thermal"
)

// The inverse fit: choose the fire severity v of a one-parameter family so
// that the computed depths D_i(v) of the observed isotherms match the
// measured depths m_i in the weighted least-squares sense,
//
//	χ²(v) = Σ ((D_i(v) + δ_i − m_i) / sd_i)²,
//
// searched in u = ln v. D_i comes from a cheap 1-D solution through the
// observed face (exposed on it and, if exposed, on the opposite face); δ_i
// corrects it to the member's own section (the 2-D beam, for a slab δ_i = 0)
// from a full solution at the current best v, repeated until v settles.
// The range is the Δχ² ≤ 1 interval of v (one standard deviation for one
// fitted parameter), searched on the corrected surrogate.

// family is a one-parameter set of fires.
type family struct {
	name, param string
	lo, hi      float64
	make        func(v float64) (thermal.Exposure, error)
}

func (rn *runner) family(fo *FitOptions) family { return fitFamily(fo) }

// FitExposure returns the fire of the fit family that fo selects at severity
// v: for the standard family (fo nil or Family "standard") ISO 834 heated for
// v minutes, then cooled at the EN 1991-1-2 Annex A rate; for the parametric
// family the EN 1991-1-2 Annex A fire with fo's opening factor, b and growth
// rate (default "medium", as Normalize applies) and a fire-load density of v
// MJ/m². The fit and the pages that draw its range use this one mapping.
func FitExposure(fo *FitOptions, v float64) (thermal.Exposure, error) {
	return fitFamily(fo).make(v)
}

func fitFamily(fo *FitOptions) family {
	if fo != nil && fo.Family == FitParametric {
		o, b, gr := fo.OpeningFactorM05, fo.BJM2S05K, fo.Growth
		if gr == "" {
			gr = "medium"
		}
		return family{name: FitParametric, param: "fire_load_mj_m2", lo: 50, hi: 1000, make: func(q float64) (thermal.Exposure, error) {
			return thermal.NewParametric(thermal.ParametricInput{OpeningFactor: o, B: b, FireLoad: q, Growth: thermal.Growth(gr)})
		}}
	}
	return family{name: FitStandard, param: "duration_min", lo: 10, hi: 360, make: func(t float64) (thermal.Exposure, error) {
		return thermal.NewCooled(thermal.ISO834(), t, 0)
	}}
}

// fitProgress spreads the progress of a fit over its thermal solutions. Their
// number is not known in advance, so the work done w, in member-solution
// equivalents and advancing continuously within each solution (thermal
// Options.Progress), is mapped to lo + (hi − lo)·(1 − e^(−w/scale)); the scale
// is a third of the expected work, so a typical fit ends near 95 % of its
// share and the rest is reported at the end. Reports never go back.
type fitProgress struct {
	report func(stage string, frac float64)
	lo, hi float64
	scale  float64
	done   float64 // work of the finished solutions
	last   float64
}

// newFitProgress starts the fit's share [lo, hi] of the run's progress.
func (rn *runner) newFitProgress(lo, hi float64, faces int) *fitProgress {
	g := rn.g
	cells := 0
	for j := 0; j < g.ny; j++ {
		for i := 0; i < g.nx; i++ {
			if g.inOutline(i, j) {
				cells++
			}
		}
	}
	// A fit makes about ten member solutions (a slab about three: its strip
	// is its own model) and strip solutions at about sixty severities per
	// observed face; a strip costs its cells over the member's.
	members, strip := 10.0, 1.0
	if g.slab {
		members = 3
	} else if cells > 0 {
		strip = math.Min(1, float64(g.ny)/float64(cells))
	}
	expect := members + 60*float64(max(faces, 1))*strip
	p := &fitProgress{report: rn.prog, lo: lo, hi: hi, scale: expect / 3, last: lo}
	p.report("fit", lo)
	return p
}

// within returns the thermal progress callback of a solution of the given
// weight (nil on a nil tracker).
func (p *fitProgress) within(weight float64) func(float64) {
	if p == nil {
		return nil
	}
	return func(f float64) { p.at(p.done + weight*math.Max(0, math.Min(1, f))) }
}

// finish books a finished solution of the given weight.
func (p *fitProgress) finish(weight float64) {
	if p == nil {
		return
	}
	p.done += weight
	p.at(p.done)
}

// end reports the whole share done.
func (p *fitProgress) end() {
	if p != nil && p.hi > p.last {
		p.last = p.hi
		p.report("fit", p.hi)
	}
}

func (p *fitProgress) at(w float64) {
	v := p.lo + (p.hi-p.lo)*(1-math.Exp(-w/p.scale))
	// steps under 0.1 % of the run are not worth a report
	if v >= p.last+0.001 && v <= p.hi {
		p.last = v
		p.report("fit", v)
	}
}

// stripWeight is the cost of a strip solution in member solutions.
func (rn *runner) stripWeight(face string) float64 {
	if rn.g.slab {
		return 1
	}
	cells := 0
	for j := 0; j < rn.g.ny; j++ {
		for i := 0; i < rn.g.nx; i++ {
			if rn.g.inOutline(i, j) {
				cells++
			}
		}
	}
	return math.Min(1, rn.g.thickness(face)/rn.g.cell/math.Max(1, float64(cells)))
}

// fitOutcome is what the fit hands to the rest of the run.
type fitOutcome struct {
	result      *FitResult
	field       *thermal.Field   // the member's field at the best fit (evidence mode)
	exposure    thermal.Exposure // the best-fit fire (evidence mode)
	fitted      bool             // the field comes from the fit
	rangeFields []*thermal.Field // fields at the ends of the range (evidence mode)
}

// surrogate evaluates computed isotherm depths cheaply.
type surrogate struct {
	rn    *runner
	fam   family
	obs   []ColourDepth
	cache map[float64][]float64
	n     int     // 1-D solutions
	pts   []point // member (2-D) solutions, sorted by u
}

// point is one solution of the member's own section at severity v = e^u.
type point struct {
	u, v   float64
	field  *thermal.Field
	exp    thermal.Exposure
	d2, d1 []float64 // member and surrogate depths per observation
}

// corr is the correction δ_i(u) = D2_i − D1_i, linear in u through the
// member solutions nearest to u (constant with one; none: 0). With two or
// more solutions the corrected surrogate equals the member model at each of
// them, so minimising it is a secant step on the member model.
func (s *surrogate) corr(i int, u float64) float64 {
	n := len(s.pts)
	switch n {
	case 0:
		return 0
	case 1:
		return s.pts[0].d2[i] - s.pts[0].d1[i]
	}
	k := 1
	for k < n-1 && s.pts[k].u < u {
		k++
	}
	a, b := s.pts[k-1], s.pts[k]
	da, db := a.d2[i]-a.d1[i], b.d2[i]-b.d1[i]
	if b.u == a.u {
		return db
	}
	t := (u - a.u) / (b.u - a.u)
	// extrapolate at most one spacing beyond the solutions
	t = math.Max(-1, math.Min(2, t))
	return da + t*(db-da)
}

func opposite(face string) string {
	switch face {
	case "bottom":
		return "top"
	case "top":
		return "bottom"
	case "left":
		return "right"
	default:
		return "left"
	}
}

// depths returns D_i(v) (without δ) for every observation.
func (s *surrogate) depths(v float64) ([]float64, error) {
	if d, ok := s.cache[v]; ok {
		return d, nil
	}
	exp, err := s.fam.make(v)
	if err != nil {
		return nil, fmt.Errorf("fit: fire for %s = %g: %w", s.fam.param, v, err)
	}
	rn := s.rn
	out := make([]float64, len(s.obs))
	fields := map[string]*thermal.Field{}
	for i, o := range s.obs {
		f, ok := fields[o.Face]
		if !ok {
			sh := rn.oneD(o.Face)
			s.n++
			w := rn.stripWeight(o.Face)
			f, err = thermal.Solve(rn.ctx, sh, exp, rn.tc, &thermal.Options{Progress: rn.fitProg.within(w)})
			rn.fitProg.finish(w)
			if err != nil {
				if e := rn.ctx.Err(); e != nil {
					return nil, e
				}
				return nil, fmt.Errorf("fit: 1-D thermal analysis through the %s face: %w", o.Face, err)
			}
			fields[o.Face] = f
		}
		face := thermal.Bottom
		if rn.g.slab {
			face = thermal.Face(o.Face)
		}
		out[i] = isoDepth(f, face, 0, o.IsothermC)
	}
	s.cache[v] = out
	return out, nil
}

// isoDepth is the computed depth of an isotherm, 0 where the face never reached it.
func isoDepth(f *thermal.Field, face thermal.Face, along, theta float64) float64 {
	d, ok := f.IsothermDepth(face, along, theta)
	if !ok {
		return 0
	}
	return d
}

// oneD is the 1-D shape through a face: the member's own shape for a slab;
// for a beam a strip as thick as the section across the face, exposed on it
// (as "bottom") and on the opposite face if that is exposed, with the spalling
// that covers mid-face.
func (rn *runner) oneD(face string) thermal.Shape {
	m := &rn.in.Member
	if rn.g.slab {
		return rn.g.shape(m, rn.measuredSpalls(), rn.progressiveSpalls())
	}
	exposed := map[string]bool{}
	for _, f := range m.Exposed {
		exposed[f] = true
	}
	opp := opposite(face)
	sh := thermal.Shape{Slab: true, WidthMM: 1000, DepthMM: rn.g.thickness(face), CellMM: rn.g.cell, Exposed: []thermal.Face{thermal.Bottom}}
	if exposed[opp] {
		sh.Exposed = append(sh.Exposed, thermal.Top)
	}
	mapFace := func(f string) (thermal.Face, bool) {
		switch f {
		case face:
			return thermal.Bottom, true
		case opp:
			return thermal.Top, true
		}
		return "", false
	}
	if rn.in.Evidence != nil {
		for _, s := range rn.in.Evidence.Spalling {
			tf, ok := mapFace(s.Face)
			if !ok {
				continue
			}
			mid := m.midFace(s.Face)
			if !(s.FromMM == 0 && s.ToMM == 0) && (mid < s.FromMM || mid > s.ToMM) {
				continue
			}
			sh.Spalled = append(sh.Spalled, thermal.Spall{Face: tf, DepthMM: s.DepthMM})
		}
	}
	if rn.in.Fire != nil {
		for _, s := range rn.in.Fire.Spalling {
			if tf, ok := mapFace(s.Face); ok {
				sh.Progressive = append(sh.Progressive, thermal.ProgressiveSpall{Face: tf, StartMin: s.StartMin, RateMMPerMin: s.RateMMPerMin, MaxDepthMM: s.MaxDepthMM})
			}
		}
	}
	return sh
}

// chi2 returns χ²(v) on the corrected surrogate.
func (s *surrogate) chi2(v float64) (float64, error) {
	d, err := s.depths(v)
	if err != nil {
		return 0, err
	}
	var sum float64
	u := math.Log(v)
	for i, o := range s.obs {
		r := (d[i] + s.corr(i, u) - o.DepthMM) / o.SdMM
		sum += r * r
	}
	return sum, nil
}

// minimise finds the v of least χ² in [lo, hi]: a log-spaced scan, then a
// golden-section search between the scan points around the least value.
func (s *surrogate) minimise() (v, chi float64, err error) {
	const nScan = 9
	ulo, uhi := math.Log(s.fam.lo), math.Log(s.fam.hi)
	us := make([]float64, nScan)
	cs := make([]float64, nScan)
	best := 0
	for k := range us {
		us[k] = ulo + (uhi-ulo)*float64(k)/(nScan-1)
		if k == nScan-1 {
			us[k] = uhi
		}
		if cs[k], err = s.chi2(math.Exp(us[k])); err != nil {
			return 0, 0, err
		}
		if cs[k] < cs[best] {
			best = k
		}
	}
	a, b := us[max(best-1, 0)], us[min(best+1, nScan-1)]
	f := func(u float64) (float64, error) { return s.chi2(math.Exp(u)) }
	const gr = 0.6180339887498949
	x1, x2 := b-gr*(b-a), a+gr*(b-a)
	f1, err := f(x1)
	if err != nil {
		return 0, 0, err
	}
	f2, err := f(x2)
	if err != nil {
		return 0, 0, err
	}
	for it := 0; it < 60 && b-a > 5e-4; it++ {
		if err := s.rn.ctx.Err(); err != nil {
			return 0, 0, err
		}
		if f1 <= f2 {
			b, x2, f2 = x2, x1, f1
			x1 = b - gr*(b-a)
			if f1, err = f(x1); err != nil {
				return 0, 0, err
			}
		} else {
			a, x1, f1 = x1, x2, f2
			x2 = a + gr*(b-a)
			if f2, err = f(x2); err != nil {
				return 0, 0, err
			}
		}
	}
	// the scan ends may beat the interior (monotone misfit at a bound)
	uBest, cBest := x1, f1
	if f2 < cBest {
		uBest, cBest = x2, f2
	}
	if cs[best] < cBest {
		uBest, cBest = us[best], cs[best]
	}
	return math.Exp(uBest), cBest, nil
}

// interval returns the Δχ² ≤ 1 range around vBest.
func (s *surrogate) interval(vBest, cBest float64) ([2]float64, error) {
	target := cBest + 1
	side := func(bound float64) (float64, error) {
		cb, err := s.chi2(bound)
		if err != nil {
			return 0, err
		}
		if cb <= target {
			return bound, nil
		}
		a, b := math.Log(vBest), math.Log(bound) // χ²(a) < target < χ²(b)
		for it := 0; it < 40 && math.Abs(b-a) > 5e-4; it++ {
			mid := (a + b) / 2
			c, err := s.chi2(math.Exp(mid))
			if err != nil {
				return 0, err
			}
			if c <= target {
				a = mid
			} else {
				b = mid
			}
		}
		return math.Exp((a + b) / 2), nil
	}
	lo, err := side(s.fam.lo)
	if err != nil {
		return [2]float64{}, err
	}
	hi, err := side(s.fam.hi)
	if err != nil {
		return [2]float64{}, err
	}
	return [2]float64{math.Min(lo, vBest), math.Max(hi, vBest)}, nil
}

// memberDepths returns the computed depths of the observations in the
// member's own field.
func (rn *runner) memberDepths(f *thermal.Field, obs []ColourDepth) []float64 {
	out := make([]float64, len(obs))
	for i, o := range obs {
		along, _, _, _, _ := rn.g.midFace(o.Face)
		out[i] = isoDepth(f, thermal.Face(o.Face), along, o.IsothermC)
	}
	return out
}

// addPoint records a member solution at v (solving it unless field is given).
func (s *surrogate) addPoint(v float64, field *thermal.Field, exp thermal.Exposure) (*point, error) {
	rn := s.rn
	var err error
	if field == nil {
		exp, err = s.fam.make(v)
		if err != nil {
			return nil, fmt.Errorf("fit: %w", err)
		}
		field, err = rn.solve2D(exp, rn.fitProg.within(1))
		if err != nil {
			return nil, err
		}
		rn.fitProg.finish(1)
	}
	d1, err := s.depths(v)
	if err != nil {
		return nil, err
	}
	p := point{u: math.Log(v), v: v, field: field, exp: exp, d2: rn.memberDepths(field, s.obs), d1: d1}
	k := 0
	for k < len(s.pts) && s.pts[k].u < p.u {
		k++
	}
	s.pts = append(s.pts, point{})
	copy(s.pts[k+1:], s.pts[k:])
	s.pts[k] = p
	return &s.pts[k], nil
}

// near returns the member solution within 0.2 % of v, or nil.
func (s *surrogate) near(v float64) *point {
	for k := range s.pts {
		if math.Abs(s.pts[k].u-math.Log(v)) < 0.002 {
			return &s.pts[k]
		}
	}
	return nil
}

// chiOf is χ² of depths d.
func chiOf(d []float64, obs []ColourDepth) float64 {
	var c float64
	for i, o := range obs {
		r := (d[i] - o.DepthMM) / o.SdMM
		c += r * r
	}
	return c
}

// fitMember runs the fit to convergence on the member's own model and
// returns the best member solution and the Δχ² ≤ 1 range.
func (s *surrogate) fitMember() (*point, [2]float64, error) {
	v, _, err := s.minimise()
	if err != nil {
		return nil, [2]float64{}, err
	}
	var best *point
	for iter := 0; iter < 6; iter++ {
		if p := s.near(v); p != nil {
			best = p
			break
		}
		if best, err = s.addPoint(v, nil, nil); err != nil {
			return nil, [2]float64{}, err
		}
		if s.rn.g.slab {
			break // the surrogate is the member's own model
		}
		if v, _, err = s.minimise(); err != nil {
			return nil, [2]float64{}, err
		}
	}
	if !s.rn.g.slab && len(s.pts) > 0 {
		// Polish: member solutions 0.5 % either side sharpen the correction
		// around the optimum; keep the member solution of least χ².
		v0 := best.v
		for _, f := range []float64{0.995, 1.005} {
			if w := v0 * f; w >= s.fam.lo && w <= s.fam.hi && s.near(w) == nil {
				if _, err := s.addPoint(w, nil, nil); err != nil {
					return nil, [2]float64{}, err
				}
			}
		}
		if v, _, err = s.minimise(); err != nil {
			return nil, [2]float64{}, err
		}
		if s.near(v) == nil {
			if _, err := s.addPoint(v, nil, nil); err != nil {
				return nil, [2]float64{}, err
			}
		}
		bestChi := math.Inf(1)
		for k := range s.pts {
			if c := chiOf(s.pts[k].d2, s.obs); c < bestChi {
				bestChi, best = c, &s.pts[k]
			}
		}
	}
	bv := best.v
	rng, err := s.interval(bv, chiOf(best.d2, s.obs))
	if err != nil {
		return nil, [2]float64{}, err
	}
	return s.near(bv), rng, nil
}

// fitEvidence reconstructs the field from the evidence alone.
func (rn *runner) fitEvidence() (*fitOutcome, error) {
	obs := rn.in.Evidence.ColourDepths
	fam := rn.family(rn.in.Options.Fit)
	s := &surrogate{rn: rn, fam: fam, obs: obs, cache: map[float64][]float64{}}
	rn.fitProg = rn.newFitProgress(0.02, 0.65, observedFaces(obs))
	defer func() { rn.fitProg = nil }()
	best, rng, err := s.fitMember()
	if err != nil {
		return nil, err
	}
	bv, bfield, bexp, bd := best.v, best.field, best.exp, slices.Clone(best.d2)
	// Refine the range ends on the member model (once), then keep their fields.
	var ends [2]*point
	for pass := 0; pass < 2; pass++ {
		moved := false
		for k, e := range rng {
			if p := s.near(e); p != nil {
				ends[k] = p
				continue
			}
			if _, err := s.addPoint(e, nil, nil); err != nil {
				return nil, err
			}
			moved = true
		}
		if !moved {
			break
		}
		if rng, err = s.interval(bv, chiOf(bd, obs)); err != nil {
			return nil, err
		}
	}
	out := &fitOutcome{field: bfield, exposure: bexp, fitted: true}
	for k, e := range rng {
		if ends[k] == nil || math.Abs(ends[k].u-math.Log(e)) >= 0.005 {
			p := s.near(e)
			if p == nil {
				var err error
				if p, err = s.addPoint(e, nil, nil); err != nil {
					return nil, err
				}
			}
			ends[k] = p
		}
		if math.Abs(ends[k].u-math.Log(bv)) >= 0.005 {
			out.rangeFields = append(out.rangeFields, ends[k].field)
		}
	}
	out.result = rn.fitResult(fam, bv, rng, bd, obs)
	out.result.Trials, out.result.StripSolutions = rn.solves, s.n
	rn.fitProg.end()
	return out, nil
}

// observedFaces counts the distinct faces of the observations.
func observedFaces(obs []ColourDepth) int {
	seen := map[string]bool{}
	for _, o := range obs {
		seen[o.Face] = true
	}
	return len(seen)
}

// fitResult assembles the reported fit at v with the member's depths d.
func (rn *runner) fitResult(fam family, v float64, rng [2]float64, d []float64, obs []ColourDepth) *FitResult {
	fr := &FitResult{Family: fam.name, Parameter: fam.param, Range: rng, Bounds: [2]float64{fam.lo, fam.hi}, Matched: true}
	vv := v
	if fam.name == FitParametric {
		fr.FireLoadMJM2 = &vv
	} else {
		fr.DurationMin = &vv
	}
	allShort, allLong := true, true
	for i, o := range obs {
		r := d[i] - o.DepthMM
		fr.MisfitMM = append(fr.MisfitMM, r)
		fr.ChiSq += (r / o.SdMM) * (r / o.SdMM)
		ob := Observation{Face: o.Face, IsothermC: o.IsothermC, MeasuredMM: o.DepthMM, SdMM: o.SdMM, MisfitMM: r}
		if d[i] > 0 {
			dv := d[i]
			ob.ComputedMM = &dv
		}
		fr.Observations = append(fr.Observations, ob)
		if r > -o.SdMM {
			allShort = false
		}
		if r < o.SdMM {
			allLong = false
		}
	}
	atHi := v >= fam.hi*0.995
	atLo := v <= fam.lo*1.005
	switch {
	case atHi && allShort:
		fr.Matched = false
		fr.Message = fmt.Sprintf("the measured depths are deeper than the most severe fire of the family (%s = %s) produces, by more than one standard deviation.", fam.param, fmtNum(fam.hi))
	case atLo && allLong:
		fr.Matched = false
		fr.Message = fmt.Sprintf("the measured depths are shallower than the mildest fire of the family (%s = %s) produces, by more than one standard deviation.", fam.param, fmtNum(fam.lo))
	default:
		worst := 0.0
		for i, o := range obs {
			worst = math.Max(worst, math.Abs(fr.MisfitMM[i])/o.SdMM)
		}
		if worst > 2 {
			fr.Message = fmt.Sprintf("best fit %s = %.3g, but the observations disagree with each other: the worst misfit is %.1f standard deviations.", fam.param, v, worst)
		} else {
			fr.Message = fmt.Sprintf("best fit %s = %.3g (range %.3g–%.3g within one standard deviation).", fam.param, v, rng[0], rng[1])
		}
	}
	return fr
}

// checkScenario compares a given fire's field with the evidence and runs the
// fit for comparison (the capacity stays that of the given fire).
func (rn *runner) checkScenario(field *thermal.Field, exp thermal.Exposure) (*fitOutcome, error) {
	obs := rn.in.Evidence.ColourDepths
	fo := rn.in.Options.Fit
	f := rn.in.Fire
	var scenario *float64
	switch {
	case fo != nil && fo.Family == FitParametric:
		if f.Curve == CurveParametric && f.Parametric.OpeningFactorM05 == fo.OpeningFactorM05 && f.Parametric.BJM2S05K == fo.BJM2S05K && f.Parametric.Growth == fo.Growth {
			q := f.Parametric.FireLoadMJM2
			scenario = &q
		}
	case f.Curve == CurveParametric:
		fo = &FitOptions{Family: FitParametric, OpeningFactorM05: f.Parametric.OpeningFactorM05, BJM2S05K: f.Parametric.BJM2S05K, Growth: f.Parametric.Growth}
		q := f.Parametric.FireLoadMJM2
		scenario = &q
	default:
		fo = &FitOptions{Family: FitStandard}
		if f.Curve == CurveISO834 && f.CoolingRateCPerMin == 0 && f.DurationMin >= 10 && f.DurationMin <= 360 {
			t := f.DurationMin
			scenario = &t
		}
	}
	fam := rn.family(fo)
	s := &surrogate{rn: rn, fam: fam, obs: obs, cache: map[float64][]float64{}}
	dScen := rn.memberDepths(field, obs)
	if scenario != nil {
		if _, err := s.addPoint(*scenario, field, exp); err != nil {
			return nil, err
		}
	}
	rn.fitProg = rn.newFitProgress(0.62, 0.68, observedFaces(obs))
	defer func() { rn.fitProg = nil }()
	best, rng, err := s.fitMember()
	if err != nil {
		return nil, err
	}
	fr := rn.fitResult(fam, best.v, rng, best.d2, obs)
	fr.ScenarioValue = scenario
	worst := 0.0
	for i, o := range obs {
		r := dScen[i] - o.DepthMM
		rr := r
		fr.Observations[i].ScenarioMisfitMM = &rr
		if dScen[i] > 0 {
			dv := dScen[i]
			fr.Observations[i].ScenarioMM = &dv
		}
		worst = math.Max(worst, math.Abs(r)/o.SdMM)
	}
	switch {
	case worst <= 1:
		fr.Agreement = "consistent"
	case worst <= 2:
		fr.Agreement = "marginal"
	default:
		fr.Agreement = "inconsistent"
	}
	fr.Message = fmt.Sprintf("the given fire is %s with the evidence (worst misfit %.1f standard deviations); ", fr.Agreement, worst) + fr.Message
	fr.Trials, fr.StripSolutions = rn.solves, s.n
	rn.fitProg.end()
	return &fitOutcome{result: fr}, nil
}
