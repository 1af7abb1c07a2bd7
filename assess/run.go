package assess

import (
	"context"
	"fmt"
	"math"
	"slices"

	"residuum/sectional"
	"residuum/thermal"
)

// MethodVersion identifies the assessment method (the workflow, the residual
// models, the damage-class scheme and their constants). It changes whenever a
// change could alter a result.
const MethodVersion = "residuum-assess/1.1.0"

// RunOptions control a run; nil means no progress reports.
type RunOptions struct {
	// Progress, if set, is called with the stage ("thermal", "fit",
	// "section") and the fraction of the whole run done, in [0, 1].
	Progress func(stage string, frac float64)
}

// runner carries one assessment through its stages.
type runner struct {
	ctx    context.Context
	in     *Input
	g      gridGeom
	bars   []barSpec
	barPos []thermal.Point // grid coordinates
	tc     thermal.Concrete
	prog   func(stage string, frac float64)
	warn   []string
	solves int
	// fitProg, while a fit runs, turns its thermal solutions' progress into
	// the run's (nil otherwise).
	fitProg *fitProgress
}

// Run assesses one member: the peak temperature field (forward from the fire
// or fitted to the evidence), residual properties per fibre, moment–curvature
// of the residual and undamaged sections in sagging and hogging, and the
// judgement. Invalid input gives *InvalidError; cancellation of ctx stops the
// run with ctx's error.
func Run(ctx context.Context, in Input, opt *RunOptions) (*Result, error) {
	in.Normalize()
	if err := in.check(); err != nil {
		return nil, err
	}
	rn := &runner{ctx: ctx, in: &in, g: newGridGeom(&in.Member, in.Options.CellMM)}
	rn.prog = func(string, float64) {}
	if opt != nil && opt.Progress != nil {
		rn.prog = opt.Progress
	}
	rn.bars = in.Member.barSpecs()
	for _, b := range rn.bars {
		x, y := rn.g.mapPoint(b.XMM, b.YMM)
		rn.barPos = append(rn.barPos, thermal.Point{XMM: x, YMM: y})
	}
	rn.tc = thermal.Concrete{
		Aggregate:    thermal.Aggregate(in.Member.Concrete.Aggregate),
		MoisturePct:  *in.Member.Concrete.MoisturePct,
		Conductivity: thermal.Conductivity(in.Member.Concrete.Conductivity),
	}
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	res := &Result{MethodVersion: MethodVersion, InputSHA256: InputSHA256(in)}
	rn.roundingWarning()
	rn.slabSpallWarning()

	// Stage 1–2: the peak temperature field.
	var field *thermal.Field
	var exp thermal.Exposure
	var fit *fitOutcome
	var err error
	switch {
	case in.Fire == nil && in.Evidence == nil:
		res.Scenario = "undamaged"
	case in.Fire != nil:
		res.Scenario = "fire"
		if in.Evidence != nil && len(in.Evidence.ColourDepths) > 0 {
			res.Scenario = "fire+evidence"
		}
		exp, err = rn.fireExposure(in.Fire)
		if err != nil {
			return nil, err
		}
		field, err = rn.solve2D(exp, func(f float64) { rn.prog("thermal", 0.6*f) })
		if err != nil {
			return nil, err
		}
		if res.Scenario == "fire+evidence" {
			fit, err = rn.checkScenario(field, exp)
			if err != nil {
				return nil, err
			}
		}
	default:
		res.Scenario = "evidence"
		fit, err = rn.fitEvidence()
		if err != nil {
			return nil, err
		}
		field, exp = fit.field, fit.exposure
	}
	rn.prog("section", 0.7)

	// Stage 3–4: sections and capacities.
	if err := rn.capacities(res, field, fit); err != nil {
		return nil, err
	}
	rn.prog("section", 0.98)

	// Thermal outputs.
	rn.thermalOutputs(res, field, exp, fit)
	// Stage 5: judgement.
	rn.judgement(res, field)
	res.Method = rn.methods(res)
	res.Warnings = append([]string{}, rn.warn...)
	rn.prog("done", 1)
	return res, nil
}

// fireExposure builds the exposure of a fire scenario.
func (rn *runner) fireExposure(f *Fire) (thermal.Exposure, error) {
	var base thermal.Exposure
	switch f.Curve {
	case CurveISO834:
		base = thermal.ISO834()
	case CurveASTME119:
		base = thermal.ASTME119()
	case CurveHydrocarbon:
		base = thermal.Hydrocarbon()
	case CurveParametric:
		p := f.Parametric
		pe, err := thermal.NewParametric(thermal.ParametricInput{
			OpeningFactor: p.OpeningFactorM05, B: p.BJM2S05K, FireLoad: p.FireLoadMJM2, Growth: thermal.Growth(p.Growth),
		})
		if err != nil {
			return nil, invalid("fire.parametric", err)
		}
		return pe, nil
	case CurveTabulated:
		tab, err := thermal.NewTabulated(f.Points)
		if err != nil {
			return nil, invalid("fire.points", err)
		}
		if f.DurationMin == 0 {
			return tab, nil
		}
		base = tab
	default:
		return nil, invalid("fire.curve", fmt.Errorf("unknown curve %q", f.Curve))
	}
	e, err := thermal.NewCooled(base, f.DurationMin, f.CoolingRateCPerMin)
	if err != nil {
		return nil, invalid("fire.duration_min", err)
	}
	return e, nil
}

// invalid wraps a lower-level rejection of an input value as a Problem.
func invalid(field string, err error) error {
	p := &InvalidError{}
	p.Add(field, err.Error())
	return p
}

// measuredSpalls converts the evidence's spalling into grid coordinates.
func (rn *runner) measuredSpalls() []thermal.Spall {
	if rn.in.Evidence == nil {
		return nil
	}
	var out []thermal.Spall
	for _, s := range rn.in.Evidence.Spalling {
		sp := thermal.Spall{Face: thermal.Face(s.Face), DepthMM: s.DepthMM, FromMM: s.FromMM, ToMM: s.ToMM}
		switch {
		case rn.g.slab:
			// The slab strip is solved through its depth at mid-width: a spall
			// over part of the width is taken over the whole strip, so the
			// capacity per metre is that of the spalled zone (slabSpallWarning).
			sp.FromMM, sp.ToMM = 0, 0
		case (s.Face == "bottom" || s.Face == "top") && !(s.FromMM == 0 && s.ToMM == 0):
			sp.FromMM = math.Max(0, s.FromMM+rn.g.dx)
			sp.ToMM = math.Min(rn.g.widthMM, s.ToMM+rn.g.dx)
		}
		out = append(out, sp)
	}
	return out
}

// progressiveSpalls lists the fire's progressive spalling.
func (rn *runner) progressiveSpalls() []thermal.ProgressiveSpall {
	if rn.in.Fire == nil {
		return nil
	}
	var out []thermal.ProgressiveSpall
	for _, s := range rn.in.Fire.Spalling {
		out = append(out, thermal.ProgressiveSpall{Face: thermal.Face(s.Face), StartMin: s.StartMin, RateMMPerMin: s.RateMMPerMin, MaxDepthMM: s.MaxDepthMM})
	}
	return out
}

// solve2D solves the member's own section (2-D beam or 1-D slab) for exp.
func (rn *runner) solve2D(exp thermal.Exposure, progress func(float64)) (*thermal.Field, error) {
	sh := rn.g.shape(&rn.in.Member, rn.measuredSpalls(), rn.progressiveSpalls())
	rn.solves++
	f, err := thermal.Solve(rn.ctx, sh, exp, rn.tc, &thermal.Options{Probes: rn.barPos, HistoryStepMin: 1, Progress: progress})
	if err != nil {
		if ctxErr := rn.ctx.Err(); ctxErr != nil {
			return nil, ctxErr
		}
		return nil, fmt.Errorf("thermal analysis of %s: %w", exp.Name(), err)
	}
	return f, nil
}

// peak returns the peak temperature of cell k (20 °C without a field).
func peakOf(field *thermal.Field, k int) float64 {
	if field == nil {
		return thermal.AmbientC
	}
	return field.Peak[k]
}

// removed reports whether cell k of the outline was spalled away.
func removedCell(field *thermal.Field, k int) bool {
	return field != nil && !field.Active[k]
}

// barPeaks returns each bar's peak temperature (20 °C without a field).
func (rn *runner) barPeaks(field *thermal.Field) []float64 {
	out := make([]float64, len(rn.bars))
	for i := range out {
		out[i] = thermal.AmbientC
		if field != nil && i < len(field.Probes) {
			out[i] = field.Probes[i].PeakC
		}
	}
	return out
}

// sectionKind selects the fibre laws of a section.
type sectionKind struct {
	residual bool // residual properties from the field; false = undamaged (20 °C, nothing removed)
	design   bool // f/γ
}

// section builds the fibre section. Concrete fibres are the thermal cells;
// bars are separate fibres at their centres (the concrete they displace is not
// deducted). Concrete law: EN 1992-1-1 §3.1.7(1) parabola–rectangle with
// f_c = residual ratio·f_ck (·α_cc/γ_c for design); the strain at peak stress
// ε_c2 of EN 1992-1-1 Table 3.1 for f_ck is scaled by the residual peak-strain
// ratio of the concrete model (EN 1994-1-2 Annex C keeps the peak strain of
// θmax), and the ultimate strain is ε_cu2 of Table 3.1 or, where the scaled
// peak strain exceeds it, that peak strain (no descending branch is credited;
// the residual section is then never stiffer or more ductile in compression
// than the undamaged one). Steel: EN 1992-1-1 §3.2.7(2)(b) elastic–plastic
// with f_y = residual factor·f_yk (/γ_s for design), rupture at ε_ud.
func (rn *runner) section(field *thermal.Field, kind sectionKind) sectional.Section {
	in := rn.in
	g := rn.g
	fck := in.Member.Concrete.FckMPa
	base := sectional.EC2ParabolaRectangle(fck)
	cf := 1.0
	sf := 1.0
	if kind.design {
		cf = in.Options.AlphaCC / in.Options.GammaC
		sf = 1 / in.Options.GammaS
	}
	cache := map[float64]sectional.Material{}
	concrete := func(theta float64) sectional.Material {
		key := math.Round(theta*2) / 2
		if mat, ok := cache[key]; ok {
			return mat
		}
		rc := ResidualConcrete{StrengthRatio: 1, PeakStrainRatio: 1}
		if kind.residual {
			rc = residualConcrete(in.Options.ConcreteModel, in.Member.Concrete.Aggregate, key)
		}
		mat := sectional.ParabolaRectangle{
			Fc:     fck * rc.StrengthRatio * cf,
			EpsC2:  base.EpsC2 * rc.PeakStrainRatio,
			EpsCU2: math.Max(base.EpsCU2, base.EpsC2*rc.PeakStrainRatio),
			N:      base.N,
		}
		cache[key] = mat
		return mat
	}
	sec := sectional.Section{Outline: g.outline()}
	for j := 0; j < g.ny; j++ {
		for i := 0; i < g.nx; i++ {
			if !g.inOutline(i, j) {
				continue
			}
			k := j*g.nx + i
			x, y, a := g.cellCentre(i, j)
			fib := sectional.Fibre{XMM: x, YMM: y, AreaMM2: a}
			switch {
			case !kind.residual:
				fib.Material = concrete(thermal.AmbientC)
			case removedCell(field, k):
				// spalled: carries nothing
			default:
				fib.Material = concrete(peakOf(field, k))
			}
			sec.Fibres = append(sec.Fibres, fib)
		}
	}
	peaks := rn.barPeaks(field)
	for bi, b := range rn.bars {
		k := 1.0
		if kind.residual {
			k = ResidualSteelFactor(in.Options.SteelModel, b.Steel, peaks[bi])
		}
		es, epsU := steelClassProps(b.Steel)
		var mat sectional.Material = sectional.BilinearSteel{Fy: b.FykMPa * k * sf, Es: es, EpsU: epsU}
		if b.PrestressMPa > 0 {
			// Effective prestress after the fire taken in proportion to the
			// residual strength factor (engineering judgement: relaxation and
			// creep of heated tendons are permanent).
			mat = prestrained{BilinearSteel: mat.(sectional.BilinearSteel), eps0: b.PrestressMPa * k / es}
		}
		sec.Fibres = append(sec.Fibres, sectional.Fibre{XMM: rn.barPos[bi].XMM, YMM: rn.barPos[bi].YMM, AreaMM2: b.AreaMM2, Material: mat, Bar: true})
	}
	return sec
}

// prestrained is a tendon with an initial tensile strain eps0 (the effective
// prestress over E_p) on top of the section's strain.
type prestrained struct {
	sectional.BilinearSteel
	eps0 float64
}

func (p prestrained) Stress(e float64) float64 { return p.BilinearSteel.Stress(e + p.eps0) }
func (p prestrained) Limits() (float64, float64) {
	c, t := p.BilinearSteel.Limits()
	return c - p.eps0, t - p.eps0
}
func (p prestrained) YieldStrain() float64 {
	return math.Max(1e-6, p.BilinearSteel.YieldStrain()-p.eps0)
}

// perMetre is the factor from the analysed width to one metre (slabs).
func (rn *runner) perMetre() float64 {
	if rn.g.slab {
		return 1000 / rn.g.widthMM
	}
	return 1
}

// axialKN is the demand's axial force over the analysed section.
func (rn *runner) axialKN() float64 {
	return rn.in.Demand.AxialKN / rn.perMetre()
}

// capacities runs the eight section analyses and fills res.Capacity,
// res.MomentCurvature, res.Design and res.Concrete.
func (rn *runner) capacities(res *Result, field *thermal.Field, fit *fitOutcome) error {
	in := rn.in
	secs := map[sectionKind]sectional.Section{}
	for _, k := range []sectionKind{{false, false}, {true, false}, {false, true}, {true, true}} {
		secs[k] = rn.section(field, k)
	}
	N := rn.axialKN()
	if N != 0 {
		for _, k := range []sectionKind{{true, true}, {false, false}} {
			comp, tens, err := sectional.AxialCapacity(secs[k])
			if err != nil {
				return fmt.Errorf("axial capacity: %w", err)
			}
			if N >= 0.9*comp || -N >= 0.9*tens {
				p := &InvalidError{}
				p.Addf("demand.axial_kn", "axial force %s kN is beyond 90 %% of the section's axial capacity (accepted: -%s to %s kN%s)",
					fmtNum(in.Demand.AxialKN), fmtNum(0.9*tens*rn.perMetre()), fmtNum(0.9*comp*rn.perMetre()), tern(rn.g.slab, " per metre", ""))
				return p
			}
		}
	}
	opt := &sectional.Options{AxialKN: N}
	// Capacity (the fast path) runs at four times Step; a quarter of the
	// default keeps its peak as fine as the recorded curves'.
	fast := &sectional.Options{AxialKN: N, Step: sectional.DefaultStep / 4}
	pm := rn.perMetre()
	dirs := []struct {
		d      sectional.Direction
		out    *Direction
		curves *CurvePair
		demand float64
	}{
		{sectional.Sagging, &res.Capacity.Sagging, &res.MomentCurvature.Sagging, in.Demand.SaggingKNm},
		{sectional.Hogging, &res.Capacity.Hogging, &res.MomentCurvature.Hogging, in.Demand.HoggingKNm},
	}
	step := 0
	for _, d := range dirs {
		und, err := sectional.MomentCurvature(rn.ctx, secs[sectionKind{false, false}], d.d, opt)
		if err != nil {
			return rn.sectErr("undamaged", d.d, err)
		}
		rn.prog("section", 0.7+0.28*float64(step)/8)
		step++
		resid, err := sectional.MomentCurvature(rn.ctx, secs[sectionKind{true, false}], d.d, opt)
		if err != nil {
			return rn.sectErr("residual", d.d, err)
		}
		rn.prog("section", 0.7+0.28*float64(step)/8)
		step++
		undD, _, err := sectional.Capacity(rn.ctx, secs[sectionKind{false, true}], d.d, fast)
		if err != nil {
			return rn.sectErr("undamaged design", d.d, err)
		}
		step++
		resD, _, err := sectional.Capacity(rn.ctx, secs[sectionKind{true, true}], d.d, fast)
		if err != nil {
			return rn.sectErr("residual design", d.d, err)
		}
		step++
		rn.prog("section", 0.7+0.28*float64(step)/8)
		o := d.out
		o.UndamagedKNm = und.CapacityKNm * pm
		o.ResidualKNm = resid.CapacityKNm * pm
		if o.UndamagedKNm > 0 {
			o.Ratio = o.ResidualKNm / o.UndamagedKNm
		}
		o.ResidualRangeKNm = [2]float64{o.ResidualKNm, o.ResidualKNm}
		o.UndamagedDesignKNm = undD * pm
		o.ResidualDesignKNm = resD * pm
		o.DemandKNm = d.demand
		o.Utilisation = utilisation(d.demand, o.ResidualDesignKNm)
		o.UndamagedUtilisation = utilisation(d.demand, o.UndamagedDesignKNm)
		o.ModeUndamaged = und.Mode.String()
		o.ModeResidual = resid.Mode.String()
		o.KappaAtPeakPerM = resid.KappaAtPeak
		d.curves.Undamaged = curvePoints(und, pm)
		d.curves.Residual = curvePoints(resid, pm)
	}
	if fit != nil && fit.fitted && len(fit.rangeFields) > 0 {
		for _, f := range fit.rangeFields {
			sec := rn.section(f, sectionKind{true, false})
			for _, d := range dirs {
				c, _, err := sectional.Capacity(rn.ctx, sec, d.d, fast)
				if err != nil {
					return rn.sectErr("residual (fit range)", d.d, err)
				}
				c *= pm
				r := &d.out.ResidualRangeKNm
				r[0] = math.Min(r[0], c)
				r[1] = math.Max(r[1], c)
			}
		}
	}
	res.Design = DesignBasis{
		GammaC: in.Options.GammaC, GammaS: in.Options.GammaS, AlphaCC: in.Options.AlphaCC,
		Basis: fmt.Sprintf("design resistances: the same fibre analysis with f_c = α_cc·f_c,res/γ_c and f_y = f_y,res/γ_s (EN 1992-1-1 §2.4.2.4 partial factors γ_c = %s, γ_s = %s; α_cc = %s, §3.1.6)",
			fmtNum(in.Options.GammaC), fmtNum(in.Options.GammaS), fmtNum(in.Options.AlphaCC)),
	}
	rn.concreteSummary(res, field)
	return nil
}

func (rn *runner) sectErr(what string, d sectional.Direction, err error) error {
	if ctxErr := rn.ctx.Err(); ctxErr != nil {
		return ctxErr
	}
	return fmt.Errorf("%s %s moment–curvature: %w", what, d, err)
}

func utilisation(demand, resistance float64) *float64 {
	var u float64
	switch {
	case demand == 0:
		u = 0
	case resistance <= 0:
		return nil
	default:
		u = demand / resistance
	}
	return &u
}

// curvePoints converts a curve to [κ 1/m, M kN·m] (per metre for slabs).
func curvePoints(c *sectional.Curve, pm float64) [][2]float64 {
	out := make([][2]float64, 0, len(c.Points))
	for _, p := range c.Points {
		out = append(out, [2]float64{round(p.KappaPerM, 1e-7), round(p.MomentKNm*pm, 1e-4)})
	}
	return out
}

// round rounds v to a multiple of q = 1/n for a whole n (for plot data only);
// dividing by n gives the nearest float to the decimal value.
func round(v, q float64) float64 {
	inv := math.Round(1 / q)
	r := math.Round(v*inv) / inv
	if r == 0 {
		return 0 // no negative zero
	}
	return r
}

func (rn *runner) concreteSummary(res *Result, field *thermal.Field) {
	g := rn.g
	in := rn.in
	var total, removed, a300, a500, ratioSum, maxPeak float64
	maxPeak = thermal.AmbientC
	for j := 0; j < g.ny; j++ {
		for i := 0; i < g.nx; i++ {
			if !g.inOutline(i, j) {
				continue
			}
			k := j*g.nx + i
			_, _, a := g.cellCentre(i, j)
			total += a
			if removedCell(field, k) {
				removed += a
				continue
			}
			p := peakOf(field, k)
			maxPeak = math.Max(maxPeak, p)
			if p > 300 {
				a300 += a
			}
			if p > 500 {
				a500 += a
			}
			ratioSum += a * residualConcrete(in.Options.ConcreteModel, in.Member.Concrete.Aggregate, p).StrengthRatio
		}
	}
	remain := math.Max(total-removed, 1e-9)
	res.Concrete = ConcreteSummary{
		FckMPa: in.Member.Concrete.FckMPa, Aggregate: in.Member.Concrete.Aggregate, Model: in.Options.ConcreteModel,
		RemovedAreaPct:    100 * removed / total,
		Above300AreaPct:   100 * a300 / remain,
		Above500AreaPct:   100 * a500 / remain,
		MeanResidualRatio: ratioSum / total,
		MaxPeakC:          maxPeak,
	}
}

// thermalOutputs fills the fire, field, rebar, isotherm and profile parts.
func (rn *runner) thermalOutputs(res *Result, field *thermal.Field, exp thermal.Exposure, fit *fitOutcome) {
	g := rn.g
	m := &rn.in.Member
	res.Member = MemberSummary{
		Label: m.Label, Kind: m.Kind, WidthMM: m.WidthMM, DepthMM: m.DepthMM,
		PerMetre: g.slab, Exposed: slices.Clone(m.Exposed),
	}
	switch {
	case g.slab:
		res.Member.Shape = "slab strip"
	case m.isT():
		res.Member.Shape = "T-beam"
		res.Member.FlangeWidthMM, res.Member.FlangeDepthMM = m.FlangeWidthMM, m.FlangeDepthMM
	default:
		res.Member.Shape = "rectangle"
	}
	cells := 0
	for j := 0; j < g.ny; j++ {
		for i := 0; i < g.nx; i++ {
			if g.inOutline(i, j) {
				cells++
			}
		}
	}
	res.Member.Fibres = cells + len(rn.bars)

	// Fire and its curve.
	res.FireCurve = [][2]float64{}
	if exp != nil && field != nil {
		src := "input"
		if res.Scenario == "evidence" {
			src = "fitted"
		}
		fs := &FireSummary{Name: exp.Name(), Source: src, HeatingEndMin: exp.HeatingEnd(), EndMin: field.EndMin}
		if fit != nil && fit.fitted && fit.result != nil {
			fs.Name = fittedFireName(rn.in, fit.result)
		}
		if math.IsInf(fs.HeatingEndMin, 0) {
			fs.HeatingEndMin = field.EndMin
		}
		end := field.EndMin
		if a := exp.AmbientAt(); !math.IsInf(a, 0) && a+30 < end {
			end = math.Max(a+30, fs.HeatingEndMin)
		}
		dt := 60.0
		for _, step := range []float64{0.5, 1, 2, 5, 10, 15, 30, 60} {
			if end/step <= 400 {
				dt = step
				break
			}
		}
		n := int(math.Ceil(end/dt - 1e-9))
		peakGas := thermal.AmbientC
		for k := 0; k <= n; k++ {
			t := math.Min(float64(k)*dt, end)
			th := exp.GasTemperature(t)
			res.FireCurve = append(res.FireCurve, [2]float64{round(t, 1e-3), round(th, 1e-2)})
			peakGas = math.Max(peakGas, th)
		}
		if h := fs.HeatingEndMin; h < end {
			peakGas = math.Max(peakGas, exp.GasTemperature(h))
			// keep the corner of the curve at the end of heating
			idx := slices.IndexFunc(res.FireCurve, func(p [2]float64) bool { return p[0] > h })
			if idx > 0 && res.FireCurve[idx-1][0] != round(h, 1e-3) {
				res.FireCurve = slices.Insert(res.FireCurve, idx, [2]float64{round(h, 1e-3), round(exp.GasTemperature(h), 1e-2)})
			}
		}
		fs.PeakGasC = peakGas
		res.Fire = fs
	}

	// Field.
	fp := &FieldPlot{Nx: g.nx, Ny: g.ny, CellMM: g.cell, WidthMM: g.widthMM, DepthMM: g.heightMM, PeakC: make([]*float64, g.nx*g.ny)}
	for j := 0; j < g.ny; j++ {
		for i := 0; i < g.nx; i++ {
			k := j*g.nx + i
			if !g.inOutline(i, j) || removedCell(field, k) {
				continue
			}
			v := round(peakOf(field, k), 0.1)
			fp.PeakC[k] = &v
		}
	}
	res.Field = fp

	// Rebar.
	peaks := rn.barPeaks(field)
	res.Rebar = make([]RebarResult, 0, len(rn.bars))
	for i, b := range rn.bars {
		r := RebarResult{
			Label: b.Label, XMM: rn.barPos[i].XMM, YMM: rn.barPos[i].YMM, DiaMM: b.DiaMM, AreaMM2: b.AreaMM2,
			Face: b.Face, CoverMM: b.CoverMM, Steel: b.Steel, FykMPa: b.FykMPa,
			PeakC: peaks[i], EndOfHeatingC: thermal.AmbientC, ThresholdC: SteelThresholdC(b.Steel),
			History: [][2]float64{},
		}
		if g.slab {
			r.BarsPerMetre = b.Count * rn.perMetre()
		}
		if field != nil && i < len(field.Probes) {
			p := field.Probes[i]
			r.PeakTimeMin = p.PeakTimeMin
			r.EndOfHeatingC = p.EndOfHeatingC
			r.History = history(p.TimesMin, p.TempsC, 300)
			r.ExposedBySpalling = rn.barExposed(field, i)
		}
		if ev := rn.in.Evidence; ev != nil && b.Layer >= 0 && b.Layer < len(ev.ExposedBars) {
			r.ExposedOnSite = ev.ExposedBars[b.Layer]
		}
		r.AboveThreshold = r.PeakC > r.ThresholdC
		r.ResidualFactor = ResidualSteelFactor(rn.in.Options.SteelModel, b.Steel, r.PeakC)
		r.ResidualFyMPa = r.ResidualFactor * b.FykMPa
		res.Rebar = append(res.Rebar, r)
	}

	// Isotherms and profiles per exposed face.
	res.Isotherms = map[string]map[string]*float64{}
	res.Profiles = []Profile{}
	for _, face := range m.Exposed {
		iso := map[string]*float64{}
		for _, th := range []float64{300, 500, 600} {
			key := fmt.Sprintf("%.0f", th)
			iso[key] = nil
			if field != nil {
				along, _, _, _, _ := g.midFace(face)
				if d, ok := field.IsothermDepth(thermal.Face(face), along, th); ok {
					v := d
					iso[key] = &v
				}
			}
		}
		res.Isotherms[face] = iso
		res.Profiles = append(res.Profiles, Profile{Face: face, Points: rn.profile(field, face)})
	}
	if fit != nil {
		res.Fit = fit.result
	}
}

// history downsamples a probe history to at most n+1 points.
func history(ts, vs []float64, n int) [][2]float64 {
	out := [][2]float64{}
	if len(ts) == 0 {
		return out
	}
	stride := (len(ts) + n - 1) / n
	if stride < 1 {
		stride = 1
	}
	for k := 0; k < len(ts); k += stride {
		out = append(out, [2]float64{round(ts[k], 1e-3), round(vs[k], 0.1)})
	}
	if last := len(ts) - 1; last%stride != 0 {
		out = append(out, [2]float64{round(ts[last], 1e-3), round(vs[last], 0.1)})
	}
	return out
}

// profile samples the peak field along the inward normal at mid-face, from
// the original surface, at every cell centre; removed cells are skipped.
func (rn *runner) profile(field *thermal.Field, face string) [][2]float64 {
	g := rn.g
	_, x0, y0, nx, ny := g.midFace(face)
	T := g.thickness(face)
	out := [][2]float64{}
	for d := g.cell / 2; d < T; d += g.cell {
		x, y := x0+nx*d, y0+ny*d
		v := thermal.AmbientC
		if field != nil {
			i := min(int(x/g.cell), g.nx-1)
			if g.slab {
				i = 0
			}
			j := min(int(y/g.cell), g.ny-1)
			k := j*g.nx + i
			if !g.inOutline(i, j) || removedCell(field, k) {
				continue
			}
			v = field.Peak[k]
		}
		out = append(out, [2]float64{round(d, 1e-3), round(v, 0.1)})
	}
	return out
}

// barExposed reports whether spalling reached bar i: some measured spall, or
// a progressive spall at the depth it had reached by the end of the run, cut
// at least the bar's cover toward its face, over part of the bar's width. It
// uses the nominal geometry, so the flag does not depend on how whole cells
// represent the spall (a cell is removed only when its centre is within the
// spalled depth).
func (rn *runner) barExposed(field *thermal.Field, i int) bool {
	m := &rn.in.Member
	b := rn.bars[i]
	r := b.DiaMM / 2
	cuts := func(face string, depth, from, to float64) bool {
		cover, along, ok := m.coverToward(b, face)
		if !ok || depth < cover-1e-9 {
			return false
		}
		return (from == 0 && to == 0) || rn.g.slab || (from < along+r && to > along-r)
	}
	if ev := rn.in.Evidence; ev != nil {
		for _, s := range ev.Spalling {
			if cuts(s.Face, s.DepthMM, s.FromMM, s.ToMM) {
				return true
			}
		}
	}
	if f := rn.in.Fire; f != nil && field != nil {
		for _, s := range f.Spalling {
			d := math.Min(s.MaxDepthMM, s.RateMMPerMin*math.Max(0, field.EndMin-s.StartMin))
			if d > 0 && cuts(s.Face, d, 0, 0) {
				return true
			}
		}
	}
	return false
}

// fittedFireName describes a fitted fire with rounded numbers.
func fittedFireName(in *Input, fr *FitResult) string {
	if fr.FireLoadMJM2 != nil {
		f := in.Options.Fit
		return fmt.Sprintf("EN 1991-1-2 Annex A parametric fire, O = %s m^0.5, b = %s J/m²s^0.5K, %s growth, fitted q_t,d = %.0f MJ/m² (range %.0f–%.0f)",
			fmtNum(f.OpeningFactorM05), fmtNum(f.BJM2S05K), f.Growth, *fr.FireLoadMJM2, fr.Range[0], fr.Range[1])
	}
	return fmt.Sprintf("ISO 834 standard fire for a fitted %.1f min (range %.1f–%.1f), then cooling at the EN 1991-1-2 Annex A rate",
		*fr.DurationMin, fr.Range[0], fr.Range[1])
}

// slabSpallWarning notes measured slab spalls over part of the width, which
// the 1-D strip takes over its whole width (the strip through the spalled
// zone governs the capacity per metre of a one-way slab).
func (rn *runner) slabSpallWarning() {
	if !rn.g.slab || rn.in.Evidence == nil {
		return
	}
	for i, s := range rn.in.Evidence.Spalling {
		if s.FromMM == 0 && s.ToMM == 0 {
			continue
		}
		rn.warn = append(rn.warn, fmt.Sprintf("evidence.spalling[%d] covers %s–%s mm of the slab width: the strip is analysed through the spalled zone, as if the %s mm spall ran over the whole width (per metre, the capacity of the spalled zone)",
			i, fmtNum(s.FromMM), fmtNum(s.ToMM), fmtNum(s.DepthMM)))
	}
}

// roundingWarning notes dimensions that the whole-cell grid changes.
func (rn *runner) roundingWarning() {
	m := &rn.in.Member
	g := rn.g
	w0, w1 := g.webX()
	changed := math.Abs(g.heightMM-m.DepthMM) > 1e-9
	if !g.slab {
		changed = changed || math.Abs((w1-w0)-m.WidthMM) > 1e-9
		if m.isT() {
			changed = changed || math.Abs(g.widthMM-m.FlangeWidthMM) > 1e-9 ||
				math.Abs(float64(g.flangeRows)*g.cell-m.FlangeDepthMM) > 1e-9
		}
	}
	if !changed {
		return
	}
	if g.slab {
		rn.warn = append(rn.warn, fmt.Sprintf("the %s mm depth is represented by whole %s mm cells: analysed as %s mm",
			fmtNum(m.DepthMM), fmtNum(g.cell), fmtNum(g.heightMM)))
		return
	}
	msg := fmt.Sprintf("dimensions are represented by whole %s mm cells: web %s × %s mm analysed as %s × %s mm",
		fmtNum(g.cell), fmtNum(m.WidthMM), fmtNum(m.DepthMM), fmtNum(w1-w0), fmtNum(g.heightMM))
	if m.isT() {
		msg += fmt.Sprintf(", flange %s × %s mm as %s × %s mm", fmtNum(m.FlangeWidthMM), fmtNum(m.FlangeDepthMM),
			fmtNum(g.widthMM), fmtNum(float64(g.flangeRows)*g.cell))
	}
	rn.warn = append(rn.warn, msg)
}
