package assess

import (
	"context"
	"encoding/json"
	"math"
	"path/filepath"
	"strings"
	"testing"
)

// TestJudgeClasses checks the class each indicator implies (the scheme's
// published lineage is Concrete Society TR68, from memory; the numerical
// thresholds are Residuum's own and are checked here as specified).
func TestJudgeClasses(t *testing.T) {
	nan := math.NaN()
	hot := &RebarResult{Label: "b", Steel: SteelHotRolled, PeakC: 650, ThresholdC: 600, AboveThreshold: true, ResidualFactor: 0.99}
	cool := &RebarResult{Label: "b", Steel: SteelHotRolled, PeakC: 400, ThresholdC: 600}
	cases := []struct {
		name   string
		j      judgeInput
		class  int
		action string
	}{
		{"no fire", judgeInput{ratio: 1, utilisation: nan}, 0, "no-action"},
		{"fire, colour normal", judgeInput{fire: true, hotBar: cool, ratio: 0.99, utilisation: nan}, 1, "clean-and-redecorate"},
		{"pink zone", judgeInput{fire: true, d300: 30, d600: 5, hotBar: cool, ratio: 0.99, utilisation: nan}, 2, "reinstate-cover"},
		{"whitish grey 25 mm", judgeInput{fire: true, d300: 60, d600: 25, hotBar: cool, ratio: 0.99, utilisation: nan}, 3, "structural-repair"},
		{"bar above threshold", judgeInput{fire: true, d300: 30, hotBar: hot, ratio: 0.99, utilisation: nan}, 3, "structural-repair"},
		{"minor spalling", judgeInput{fire: true, maxSpallMM: 5, hotBar: cool, ratio: 0.99, utilisation: nan}, 1, "clean-and-redecorate"},
		{"spalling 15 mm", judgeInput{fire: true, maxSpallMM: 15, hotBar: cool, ratio: 0.99, utilisation: nan}, 2, "reinstate-cover"},
		{"1 of 20 bars exposed", judgeInput{fire: true, barsTotal: 20, barsExposed: 1, hotBar: cool, ratio: 0.99, utilisation: nan}, 2, "reinstate-cover"},
		{"3 of 10 bars exposed", judgeInput{fire: true, barsTotal: 10, barsExposed: 3, hotBar: cool, ratio: 0.99, utilisation: nan}, 3, "structural-repair"},
		{"most bars exposed", judgeInput{fire: true, barsTotal: 4, barsExposed: 3, hotBar: cool, ratio: 0.99, utilisation: nan}, 4, "major-repair"},
		{"ratio 0.90", judgeInput{fire: true, hotBar: cool, ratio: 0.90, utilisation: nan}, 2, "reinstate-cover"},
		{"ratio 0.80", judgeInput{fire: true, hotBar: cool, ratio: 0.80, utilisation: nan}, 3, "structural-repair"},
		{"ratio 0.60", judgeInput{fire: true, hotBar: cool, ratio: 0.60, utilisation: nan}, 4, "strengthen"},
		{"ratio 0.40", judgeInput{fire: true, hotBar: cool, ratio: 0.40, utilisation: nan}, 4, "replace-or-strengthen"},
		{"over-utilised", judgeInput{fire: true, hotBar: cool, ratio: 0.97, utilisation: 1.1}, 4, "strengthen"},
		{"far over-utilised", judgeInput{fire: true, hotBar: cool, ratio: 0.97, utilisation: 1.5}, 4, "replace-or-strengthen"},
	}
	for _, c := range cases {
		d, act, text := judge(c.j)
		if d.Class != c.class || act != c.action {
			t.Errorf("%s: class %d action %s, want %d %s (reasons %+v)", c.name, d.Class, act, c.class, c.action, d.Reasons)
		}
		if text == "" || len(d.Reasons) == 0 || d.Label == "" {
			t.Errorf("%s: empty action text, reasons or label", c.name)
		}
		top := 0
		for _, r := range d.Reasons {
			if r.Source == "" || r.Detail == "" {
				t.Errorf("%s: reason without source or detail: %+v", c.name, r)
			}
			top = max(top, r.Class)
		}
		if top != d.Class {
			t.Errorf("%s: class %d is not the highest reason's %d", c.name, d.Class, top)
		}
	}
}

// TestSpallingExposesBars runs the example beam whose soffit spalls past the
// cover: the bottom bars are flagged, bond-loss caution given, class 4.
func TestSpallingExposesBars(t *testing.T) {
	res := exampleResult(t, filepath.Join("..", "testdata", "beam-spalling.json"))
	exposed := 0
	for _, b := range res.Rebar {
		if b.ExposedBySpalling {
			exposed++
			if b.Face != "bottom" {
				t.Errorf("%s on face %s flagged as exposed", b.Label, b.Face)
			}
		}
	}
	if exposed != 3 {
		t.Errorf("%d bars exposed, want the 3 bottom bars (cover 25 + 10 mm links < 40 mm spalled)", exposed)
	}
	if res.Damage.Class != 4 {
		t.Errorf("damage class %d, want 4", res.Damage.Class)
	}
	if res.Concrete.RemovedAreaPct <= 0 {
		t.Error("no concrete removed")
	}
	found := false
	for _, c := range res.Cautions {
		found = found || strings.Contains(c, "bond")
	}
	if !found {
		t.Error("no bond caution")
	}
	// removed cells are null in the field and carry nothing
	nulls := 0
	for _, v := range res.Field.PeakC {
		if v == nil {
			nulls++
		}
	}
	if nulls == 0 {
		t.Error("no removed cell is null in the field")
	}
}

// TestResultInvariants checks every example: cautions never empty, the
// required keys present, ratios consistent, methods listed.
func TestResultInvariants(t *testing.T) {
	for _, path := range exampleInputs(t) {
		res := exampleResult(t, path)
		if len(res.Cautions) < len(baseCautions) {
			t.Errorf("%s: %d cautions", path, len(res.Cautions))
		}
		if len(res.Method) < 5 || res.InputSHA256 == "" || res.MethodVersion != MethodVersion {
			t.Errorf("%s: method list %d, hash %q", path, len(res.Method), res.InputSHA256)
		}
		for _, d := range []Direction{res.Capacity.Sagging, res.Capacity.Hogging} {
			if d.UndamagedKNm > 0 && math.Abs(d.Ratio-d.ResidualKNm/d.UndamagedKNm) > 1e-12 {
				t.Errorf("%s: ratio %g ≠ %g/%g", path, d.Ratio, d.ResidualKNm, d.UndamagedKNm)
			}
			if d.ResidualKNm > d.UndamagedKNm*(1+2e-3) {
				t.Errorf("%s: residual %g above undamaged %g", path, d.ResidualKNm, d.UndamagedKNm)
			}
			if d.ResidualDesignKNm > d.ResidualKNm || d.UndamagedDesignKNm > d.UndamagedKNm {
				t.Errorf("%s: design resistance above characteristic", path)
			}
		}
		if len(res.Rebar) == 0 || len(res.Isotherms) != len(res.Member.Exposed) || len(res.Profiles) != len(res.Member.Exposed) {
			t.Errorf("%s: rebar %d, isotherms %d, profiles %d", path, len(res.Rebar), len(res.Isotherms), len(res.Profiles))
		}
		for _, b := range res.Rebar {
			if b.PeakC+1e-9 < b.EndOfHeatingC {
				t.Errorf("%s: %s peak %g below end of heating %g", path, b.Label, b.PeakC, b.EndOfHeatingC)
			}
		}
		if res.Field == nil || len(res.Field.PeakC) != res.Field.Nx*res.Field.Ny {
			t.Errorf("%s: field size", path)
		}
		if (res.Scenario == "evidence" || res.Scenario == "fire+evidence") != (res.Fit != nil) {
			t.Errorf("%s: scenario %s with fit %v", path, res.Scenario, res.Fit != nil)
		}
	}
}

// TestModelOptions: the alternative models are used and named in the result's
// method list; the hot-strength steel bound never gives more capacity than
// the residual-by-class default (its factors are lower at every θ).
func TestModelOptions(t *testing.T) {
	base := rectBeam(Layer{Face: "bottom", CoverMM: 20, Count: 3, DiaMM: 20, Steel: SteelColdWorked, FykMPa: 500})
	base.Options.CellMM = 10
	base.Fire = &Fire{Curve: CurveISO834, DurationMin: 90}
	def := mustRun(t, base)
	alt := base
	alt.Options.ConcreteModel = ConcreteChang2006
	alt.Options.SteelModel = SteelHotStrength
	res := mustRun(t, alt)
	names := map[string]bool{}
	for _, m := range res.Method {
		names[m.Name] = true
	}
	if !names[ConcreteChang2006] || !names[SteelHotStrength] {
		t.Errorf("method list %v lacks the chosen models", names)
	}
	if res.Capacity.Sagging.ResidualKNm > def.Capacity.Sagging.ResidualKNm {
		t.Errorf("hot-strength sagging %g above residual-by-class %g", res.Capacity.Sagging.ResidualKNm, def.Capacity.Sagging.ResidualKNm)
	}
	if res.Capacity.Sagging.UndamagedKNm != def.Capacity.Sagging.UndamagedKNm {
		t.Error("the model options changed the undamaged capacity")
	}
}

// TestExposedBarsOnSite: evidence.exposed_bars (DESIGN.md §4) makes a layer's
// bars count as exposed without any spalling geometry. The 300 × 600 mm beam
// of testdata/beam-3side-iso90.json has 4 bottom and 2 top bars; reporting
// the bottom layer exposed exposes 4 of 6 bars (67 % > ~50 %), which the TR68
// beam/floor table (research/residual.md §4.1, from memory [M]) places in
// class 4, and brings the bond caution (research/residual.md §5.1). The flag
// is a judgement input only: every capacity must stay exactly as it was.
func TestExposedBarsOnSite(t *testing.T) {
	base := []byte(`{
  "member": {"kind": "beam", "width_mm": 300, "depth_mm": 600,
    "concrete": {"fck_mpa": 30, "aggregate": "siliceous", "moisture_pct": 1.5},
    "layers": [
      {"face": "bottom", "cover_mm": 30, "count": 4, "dia_mm": 20, "steel": "hot-rolled", "fyk_mpa": 500},
      {"face": "top", "cover_mm": 30, "count": 2, "dia_mm": 12, "steel": "hot-rolled", "fyk_mpa": 500}],
    "link_dia_mm": 10, "exposed": ["bottom", "left", "right"]},
  "fire": {"curve": "iso834", "duration_min": 30},
  "options": {"cell_mm": 20}
}`)
	run := func(data []byte) *Result {
		t.Helper()
		in, err := DecodeBytes(data)
		if err != nil {
			t.Fatalf("decode: %v", err)
		}
		res, err := Run(context.Background(), in, nil)
		if err != nil {
			t.Fatalf("run: %v", err)
		}
		return res
	}
	plain := run(base)
	seen := run(mutate(t, string(base), "evidence.exposed_bars", []any{true, false}))
	for _, r := range plain.Damage.Reasons {
		if r.Indicator == "exposed-bars" {
			t.Fatalf("without exposed_bars the class already has an exposed-bars reason: %+v", r)
		}
	}
	if plain.Damage.Class == 4 {
		t.Fatalf("the 30 min case is already class 4; the test could not fail")
	}
	var reason *Reason
	for i, r := range seen.Damage.Reasons {
		if r.Indicator == "exposed-bars" {
			reason = &seen.Damage.Reasons[i]
		}
	}
	if reason == nil || reason.Class != 4 || seen.Damage.Class != 4 {
		t.Errorf("bottom layer seen exposed: class %d, exposed-bars reason %+v; want class 4 (4 of 6 bars > 50 %%)", seen.Damage.Class, reason)
	} else if !strings.Contains(reason.Detail, "4 of 6") || !strings.Contains(reason.Detail, "on site") {
		t.Errorf("reason detail %q does not say 4 of 6 bars, seen on site", reason.Detail)
	}
	n := 0
	for _, b := range seen.Rebar {
		if b.ExposedOnSite != (b.Face == "bottom") {
			t.Errorf("%s (%s): exposed_on_site = %v", b.Label, b.Face, b.ExposedOnSite)
		}
		if b.ExposedOnSite {
			n++
		}
	}
	if n != 4 {
		t.Errorf("%d bars flagged exposed on site, want the 4 bottom bars", n)
	}
	bond := false
	for _, c := range seen.Cautions {
		bond = bond || (strings.Contains(c, "bond") && strings.Contains(c, "on site"))
	}
	if !bond {
		t.Errorf("no bond caution for bars seen exposed on site: %q", seen.Cautions)
	}
	if a, b := mustJSON(t, seen.Capacity), mustJSON(t, plain.Capacity); a != b {
		t.Errorf("exposed_bars changed the capacities: %s vs %s", a, b)
	}
	js, err := json.Marshal(seen.Rebar[0])
	if err != nil || !strings.Contains(string(js), `"exposed_on_site":true`) {
		t.Errorf("rebar JSON %s lacks \"exposed_on_site\":true (%v)", js, err)
	}
	if js, _ := json.Marshal(plain.Rebar[0]); strings.Contains(string(js), "exposed_on_site") {
		t.Errorf("rebar JSON %s carries exposed_on_site although none was reported", js)
	}
}

// TestExposedBarsValidation: a layer can only be seen exposed where an
// exposed face could have spalled to it; the message names the field and
// what is accepted.
func TestExposedBarsValidation(t *testing.T) {
	slab := `{
  "member": {"kind": "slab", "depth_mm": 200, "concrete": {"fck_mpa": 30},
    "layers": [{"face": "bottom", "cover_mm": 20, "spacing_mm": 150, "dia_mm": 10, "fyk_mpa": 500},
               {"face": "top", "cover_mm": 20, "spacing_mm": 150, "dia_mm": 10, "fyk_mpa": 500}],
    "exposed": ["bottom"]},
  "fire": {"curve": "iso834", "duration_min": 60},
  "evidence": {"exposed_bars": [false, true]}
}`
	probs := problemsOf(t, []byte(slab))
	if len(probs) != 1 || probs[0].Field != "evidence.exposed_bars[1]" || !strings.Contains(probs[0].Message, "accepted") {
		t.Errorf("top layer of a slab exposed below only: %v, want one problem at evidence.exposed_bars[1] with the accepted values", probs)
	}
	if p := problemsOf(t, mutate(t, slab, "evidence.exposed_bars", []any{true, false})); len(p) != 0 {
		t.Errorf("bottom layer of a slab exposed below rejected: %v", p)
	}
	if p := problemsOf(t, mutate(t, slab, "evidence.exposed_bars", []any{"yes", false})); len(p) == 0 || p[0].Field != "evidence.exposed_bars[0]" {
		t.Errorf("a string in exposed_bars: %v, want a problem at evidence.exposed_bars[0]", p)
	}
}

func mustJSON(t *testing.T, v any) string {
	t.Helper()
	b, err := json.Marshal(v)
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

// TestSpalledCoverExposesBars: a bar is exposed when the spalled depth reaches
// its cover over the bar's width (TR68 "exposed reinforcement", research/
// residual.md §4.1; the geometry of the input by definition). The flag must
// not depend on how whole thermal cells represent the spall: with 10 mm
// cells a 34 mm spall removes only the cells centred within 34 mm (to 30 mm),
// yet it has cut through a 24 + 10 mm cover; a 36 mm spall removes cells to
// 40 mm but leaves 4 mm over bars with 30 + 10 mm cover. A spall over part of
// the soffit (0–100 mm) exposes only the bars it covers.
func TestSpalledCoverExposesBars(t *testing.T) {
	beam := func(cover float64, spall MeasuredSpall) Input {
		return Input{Member: Member{Kind: KindBeam, WidthMM: 300, DepthMM: 600, LinkDiaMM: 10,
			Concrete: Concrete{FckMPa: 30},
			Layers:   []Layer{{Face: "bottom", CoverMM: cover, Count: 4, DiaMM: 20, FykMPa: 500}, {Face: "top", CoverMM: 30, Count: 2, DiaMM: 12, FykMPa: 500}},
			Exposed:  []string{"bottom", "left", "right"}},
			Fire:     &Fire{Curve: CurveISO834, DurationMin: 30},
			Evidence: &Evidence{Spalling: []MeasuredSpall{spall}},
			Options:  Options{CellMM: 10}}
	}
	cases := []struct {
		name string
		in   Input
		want []bool // bottom bars left to right; the top bars are never exposed
	}{
		{"34 mm spall, cover 24 + 10", beam(24, MeasuredSpall{Face: "bottom", DepthMM: 34}), []bool{true, true, true, true}},
		{"30 mm spall, cover 24 + 10", beam(24, MeasuredSpall{Face: "bottom", DepthMM: 30}), []bool{false, false, false, false}},
		{"36 mm spall, cover 30 + 10", beam(30, MeasuredSpall{Face: "bottom", DepthMM: 36}), []bool{false, false, false, false}},
		// bar centres at x = 44, 114.7, 185.3, 256 mm (24 + 10 + 10 from the sides), Ø20: only the first lies under 0–100 mm
		{"34 mm spall over 0–100 mm", beam(24, MeasuredSpall{Face: "bottom", DepthMM: 34, FromMM: 0, ToMM: 100}), []bool{true, false, false, false}},
		// a side spall reaches the corner bars only: side cover 24 + 10 = 34 mm to bar surface
		{"35 mm spall of the left side", beam(24, MeasuredSpall{Face: "left", DepthMM: 35}), []bool{true, false, false, false}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			res := mustRun(t, c.in)
			for i, b := range res.Rebar {
				want := i < 4 && c.want[i]
				if b.ExposedBySpalling != want {
					t.Errorf("%s (%s, cover %g mm): exposed_by_spalling = %v, want %v", b.Label, b.Face, b.CoverMM, b.ExposedBySpalling, want)
				}
			}
		})
	}
}

// TestSlabPartialSpall: a one-way slab strip is solved through its depth at
// mid-width, so a measured spall over part of its width (0–300 mm of 1000)
// must not be dropped because it misses mid-width: the capacity per metre of
// a one-way slab is governed by the strip through the spalled zone (common
// practice: the weakest strip of a one-way slab carries its own share of
// the load). The residual capacity must equal that of the same spall over the
// whole width (same model, so to 1e-9 relative), the 25 mm spall must expose
// the bars under 20 mm cover, and a warning must say what was assumed.
func TestSlabPartialSpall(t *testing.T) {
	slab := func(from, to float64) Input {
		return Input{Member: Member{Kind: KindSlab, DepthMM: 200, Concrete: Concrete{FckMPa: 30},
			Layers:  []Layer{{Face: "bottom", CoverMM: 20, SpacingMM: 150, DiaMM: 12, FykMPa: 500}},
			Exposed: []string{"bottom"}},
			Fire:     &Fire{Curve: CurveISO834, DurationMin: 60},
			Evidence: &Evidence{Spalling: []MeasuredSpall{{Face: "bottom", DepthMM: 25, FromMM: from, ToMM: to}}},
			Demand:   Demand{SaggingKNm: 20}}
	}
	part, whole := mustRun(t, slab(0, 300)), mustRun(t, slab(0, 0))
	plain := slab(0, 0)
	plain.Evidence = nil
	none := mustRun(t, plain)
	if whole.Capacity.Sagging.ResidualKNm >= none.Capacity.Sagging.ResidualKNm {
		t.Fatalf("a 25 mm soffit spall does not lower the residual capacity (%g vs %g kN·m/m): the test could not fail",
			whole.Capacity.Sagging.ResidualKNm, none.Capacity.Sagging.ResidualKNm)
	}
	p, w := part.Capacity.Sagging.ResidualKNm, whole.Capacity.Sagging.ResidualKNm
	if math.Abs(p-w) > 1e-9*w {
		t.Errorf("partial-width spall: residual %g kN·m/m, want that of the spalled strip %g", p, w)
	}
	if !part.Rebar[0].ExposedBySpalling {
		t.Error("25 mm spall over 20 mm cover: bars not flagged exposed")
	}
	found := false
	for _, s := range part.Warnings {
		found = found || strings.Contains(s, "evidence.spalling[0]")
	}
	if !found {
		t.Errorf("no warning about the partial-width slab spall: %q", part.Warnings)
	}
}
