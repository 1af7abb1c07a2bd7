package assess

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"fmt"
	"math"

	"residuum/thermal"
)

// InputSHA256 is the hex SHA-256 of the canonical JSON of the normalised
// input (defaults applied, keys in the fixed order of the Go types), so two
// requests that mean the same assessment hash alike.
func InputSHA256(in Input) string {
	in.Normalize()
	b, err := json.Marshal(in)
	if err != nil {
		// Input holds only strings, finite numbers, slices and structs.
		b = []byte(fmt.Sprintf("%#v", in))
	}
	sum := sha256.Sum256(b)
	return hex.EncodeToString(sum[:])
}

// judgement fills res.Damage, res.Action and res.Cautions.
func (rn *runner) judgement(res *Result, field *thermal.Field) {
	in := rn.in
	j := judgeInput{fire: field != nil, ratio: math.NaN(), utilisation: math.NaN()}
	for _, iso := range res.Isotherms {
		if v := iso["300"]; v != nil {
			j.d300 = math.Max(j.d300, *v)
		}
		if v := iso["600"]; v != nil {
			j.d600 = math.Max(j.d600, *v)
		}
	}
	if in.Evidence != nil {
		for _, o := range in.Evidence.ColourDepths {
			if o.IsothermC <= 300 && o.DepthMM > 0 && o.IsothermC >= 250 {
				j.d300 = math.Max(j.d300, o.DepthMM)
			}
			if o.IsothermC >= 600 && o.DepthMM > 0 {
				j.d600 = math.Max(j.d600, o.DepthMM)
			}
		}
		for _, s := range in.Evidence.Spalling {
			j.maxSpallMM = math.Max(j.maxSpallMM, s.DepthMM)
		}
	}
	if in.Fire != nil && field != nil {
		for _, s := range in.Fire.Spalling {
			d := math.Min(s.MaxDepthMM, s.RateMMPerMin*math.Max(0, field.EndMin-s.StartMin))
			j.maxSpallMM = math.Max(j.maxSpallMM, d)
		}
	}
	var worst float64 = math.Inf(-1)
	for i := range res.Rebar {
		b := &res.Rebar[i]
		n := 1.0
		if rn.g.slab {
			n = b.BarsPerMetre
		}
		j.barsTotal += n
		if b.ExposedBySpalling || b.ExposedOnSite {
			j.barsExposed += n
		}
		if b.ExposedOnSite {
			j.barsSeen += n
		}
		if e := b.PeakC - b.ThresholdC; e > worst {
			worst = e
			j.hotBar = b
		}
	}
	if rn.g.slab {
		// slab layers: count layers, not bars per metre
		j.barsTotal, j.barsExposed, j.barsSeen = 0, 0, 0
		for i := range res.Rebar {
			j.barsTotal++
			if res.Rebar[i].ExposedBySpalling || res.Rebar[i].ExposedOnSite {
				j.barsExposed++
			}
			if res.Rebar[i].ExposedOnSite {
				j.barsSeen++
			}
		}
	}
	type dirv struct {
		name string
		d    Direction
	}
	dirs := []dirv{{"sagging", res.Capacity.Sagging}, {"hogging", res.Capacity.Hogging}}
	anyDemand := in.Demand.SaggingKNm > 0 || in.Demand.HoggingKNm > 0
	maxUnd := math.Max(res.Capacity.Sagging.UndamagedKNm, res.Capacity.Hogging.UndamagedKNm)
	for _, d := range dirs {
		relevant := d.d.DemandKNm > 0 || (!anyDemand && d.d.UndamagedKNm > 0.05*maxUnd)
		if relevant && d.d.UndamagedKNm > 0 && (math.IsNaN(j.ratio) || d.d.Ratio < j.ratio) {
			j.ratio, j.ratioDir = d.d.Ratio, d.name
		}
		if d.d.DemandKNm > 0 {
			u := math.Inf(1)
			if d.d.Utilisation != nil {
				u = *d.d.Utilisation
			}
			if math.IsNaN(j.utilisation) || u > j.utilisation {
				j.utilisation, j.utilisationDir = u, d.name
			}
		}
	}
	res.Damage, res.Action, res.ActionText = judge(j)
	res.Cautions = rn.cautions(res, j)
}

// cautions lists the base cautions and those the case calls for.
func (rn *runner) cautions(res *Result, j judgeInput) []string {
	in := rn.in
	out := append([]string{}, baseCautions...)
	add := func(s string) { out = append(out, s) }
	if res.Scenario == "evidence" || res.Scenario == "fire+evidence" {
		add("Colour-change depths depend on the aggregate and cement and change as the concrete ages after the fire; calibrate them on site (Guise 1997; Annerel & Taerwe 2008). The 300 °C reading of the pink onset is itself uncertain by about ±50 °C.")
	}
	if res.Fit != nil && !res.Fit.Matched {
		add("The evidence could not be matched by any fire of the family searched: " + res.Fit.Message + " The temperatures used are those of the nearest bound and must not be relied on.")
	}
	switch in.Member.Concrete.Aggregate {
	case "calcareous":
		add("Calcareous aggregate: no residual credit over siliceous concrete is taken above 600 °C (decarbonation and CaO rehydration after cooling can cause further loss; Dias 1992).")
	case "lightweight":
		add("Lightweight aggregate: the residual factors use the EN 1994-1-2 lightweight hot-strength column recalled from memory (unconfirmed); colour change is unreliable in kiln-fired aggregate.")
	}
	if in.Member.Concrete.FckMPa > 55 {
		add("High-strength concrete (f_ck > 55 MPa): the normal-strength residual curves are used; high-strength concrete can lose more strength below 450 °C and is prone to explosive spalling (Phan & Carino, NIST; EN 1992-1-2 §6.2).")
	}
	switch {
	case j.barsSeen > 0:
		add("Bars seen exposed on site or reached by the spalled surface have lost bond; the flexural analysis assumes perfect bond. Check anchorage and laps with reduced bond and inspect the bars for buckling (residual bond after heating: Fire Safety J. 44(6) 2009; Ergün et al. 2016).")
		add("Bars reported exposed on site (evidence.exposed_bars) keep the temperature computed with their cover in place unless measured spalling reaches them; a bar exposed during the fire may have come close to the gas temperature: take bar coupons.")
	case j.barsExposed > 0:
		add("Bars exposed by spalling have lost bond; the flexural analysis assumes perfect bond. Check anchorage and laps with reduced bond and inspect the bars for buckling (residual bond after heating: Fire Safety J. 44(6) 2009; Ergün et al. 2016).")
	}
	hasPrestress := false
	for _, b := range res.Rebar {
		if b.Steel == SteelPrestressing {
			hasPrestress = true
		}
	}
	if hasPrestress {
		add("Prestressing steel loses strength permanently above about 300 °C and prestress by relaxation during the fire; the residual prestress is taken in proportion to the residual strength factor (an assumption). Test the tendons.")
		if rn.tendonAreaDefaulted() {
			add("Tendon areas without area_mm2 are taken as π·d²/4 of the nominal diameter, right for a wire; a seven-wire strand has about 0.75 of that (EN 10138-3, e.g. 93 mm² for 12.5 mm strand), so give area_mm2 for strands or the capacity is overestimated.")
		}
	}
	for _, b := range res.Rebar {
		if b.PeakC > 723 {
			add(fmt.Sprintf("Some bars (e.g. %s, %.0f °C) exceeded 723 °C (Ac1): if they were quenched by fire-fighting water they may be brittle; take coupons (Dias 1992).", b.Label, b.PeakC))
			break
		}
	}
	if in.Options.SteelModel == SteelHotStrength {
		add("Steel model \"hot-strength\": the EN 1992-1-2 hot strength at θmax is used as a conservative lower bound; bars largely recover on cooling.")
	}
	if rn.g.slab {
		add("Slab: one-way strip analysed through its depth (1-D heat flow); moments and axial force are per metre width.")
	}
	for _, w := range rn.warn {
		add("Note: " + w + ".")
	}
	return out
}

// tendonAreaDefaulted reports whether some prestressing steel has no nominal area given.
func (rn *runner) tendonAreaDefaulted() bool {
	m := &rn.in.Member
	for _, l := range m.Layers {
		if l.Steel == SteelPrestressing && l.AreaMM2 == 0 {
			return true
		}
	}
	for _, b := range m.Bars {
		if b.Steel == SteelPrestressing && b.AreaMM2 == 0 {
			return true
		}
	}
	return false
}

// methods lists every model used, with its version and source.
func (rn *runner) methods(res *Result) []Method {
	in := rn.in
	ms := []Method{{Step: "workflow", Name: "Residuum assessment", Version: MethodVersion,
		Source: "peak temperature field → residual fibre properties → moment–curvature (DESIGN.md §3)"}}
	if res.Scenario != "undamaged" {
		ms = append(ms, Method{Step: "thermal", Name: "transient heat conduction, package thermal", Version: "EN 1992-1-2:2004 §3.3 properties; EN 1991-1-2:2002 §3.1 boundary",
			Source: fmt.Sprintf("finite volumes on %s mm cells, heating and cooling, peak temperature tracked per cell; conductivity %s limit, moisture %s %%",
				fmtNum(rn.g.cell), in.Member.Concrete.Conductivity, fmtNum(*in.Member.Concrete.MoisturePct))})
		if res.Fire != nil {
			ms = append(ms, Method{Step: "fire", Name: res.Fire.Name, Version: "EN 1991-1-2:2002", Source: fireSource(in, res)})
		}
	}
	if res.Fit != nil {
		src := "family A: ISO 834 heated for t (10–360 min) then cooled at the EN 1991-1-2 Annex A rate"
		if res.Fit.Family == FitParametric {
			src = "family B: EN 1991-1-2 Annex A parametric fire with the given O and b, fire load 50–1000 MJ/m²"
		}
		ms = append(ms, Method{Step: "fit", Name: "weighted least squares on colour-change depths", Version: "1",
			Source: src + "; 1-D surrogate through the face corrected by the 2-D section, golden-section search, Δχ² ≤ 1 range"})
	}
	cm := Method{Step: "concrete residual strength", Name: ConcreteEN1994AnnexC, Version: "EN 1994-1-2:2005 Annex C; EN 1992-1-2:2004 Table 3.1",
		Source: "f_c,res = φ·k_c(θmax)·f_ck, φ = 0.9 above 300 °C, linear ratio 100–300 °C; peak strain ε_c1(θmax) kept (EN 1994-1-2:2005 Annex C on EN 1992-1-2:2004 Table 3.1)"}
	if in.Options.ConcreteModel == ConcreteChang2006 {
		cm = Method{Step: "concrete residual strength", Name: ConcreteChang2006, Version: "Chang et al., Cem. Concr. Res. 36 (2006) 1999–2005",
			Source: "residual strength and peak-strain regressions, siliceous aggregate (Chang, Chen, Sheu & Yao, Cem. Concr. Res. 36 (2006) 1999–2005)"}
	}
	if in.Member.Concrete.Aggregate == "lightweight" {
		cm.Source += "; lightweight: EN 1994-1-2 Table 3.3 LC column (from memory)"
	}
	ms = append(ms, cm)
	sm := Method{Step: "steel residual strength", Name: SteelResidualByClass, Version: "working values from the published envelopes (TR68 2008; Neves et al. 1996; Tao, Wang & Uy 2013; Topçu & Karakurt 2008), from memory",
		Source: "f_y,res/f_yk by class: hot-rolled 1.0 to 600 °C (0.95 at 800 °C), cold-worked 1.0 to 450 °C (0.70 at 800 °C), quenched-and-tempered 1.0 to 400 °C, prestressing 1.0 to 300 °C"}
	if in.Options.SteelModel == SteelHotStrength {
		sm = Method{Step: "steel residual strength", Name: SteelHotStrength, Version: "EN 1992-1-2:2004 Tables 3.2a (class N) and 3.3",
			Source: "hot strength k_s(θmax) as a conservative lower bound of the residual strength"}
	}
	ms = append(ms, sm,
		Method{Step: "section", Name: "fibre moment–curvature, package sectional", Version: "EN 1992-1-1:2004 §3.1.7(1), §3.2.7(2)(b)",
			Source: "plane sections, perfect bond, no concrete tension; parabola–rectangle with residual f_c, ε_c2 scaled by the residual peak-strain ratio (EN 1994-1-2 Annex C keeps the peak strain of θmax), ε_cu2 kept unless the scaled ε_c2 exceeds it; elastic–plastic steel to ε_ud = 0.9·ε_uk; capacity = peak moment before the first limit strain"},
		Method{Step: "design", Name: "partial factors", Version: "EN 1992-1-1:2004 §2.4.2.4, §3.1.6",
			Source: fmt.Sprintf("γ_c = %s, γ_s = %s, α_cc = %s", fmtNum(in.Options.GammaC), fmtNum(in.Options.GammaS), fmtNum(in.Options.AlphaCC))},
		Method{Step: "damage class", Name: "five-class scheme", Version: "Concrete Society TR68 (2008) lineage, from memory", Source: DamageScheme},
	)
	return ms
}

func fireSource(in *Input, res *Result) string {
	if res.Scenario == "evidence" {
		return "fitted to the colour-change depths"
	}
	switch in.Fire.Curve {
	case CurveISO834:
		return "ISO 834-1 / EN 1991-1-2 §3.2.1 standard curve, cooled linearly after the given duration"
	case CurveASTME119:
		return "ASTM E119 Table X1.1 points, cooled linearly after the given duration"
	case CurveHydrocarbon:
		return "EN 1991-1-2 §3.2.3 hydrocarbon curve, cooled linearly after the given duration"
	case CurveParametric:
		return "EN 1991-1-2 Annex A parametric fire with its cooling branch"
	default:
		return "tabulated gas temperatures given by the user"
	}
}
