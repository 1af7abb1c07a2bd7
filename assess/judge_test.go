package assess

import (
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
