package assess

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

const baseBeam = `{
  "member": {"kind": "beam", "label": "test beam", "width_mm": 300, "depth_mm": 600,
    "concrete": {"fck_mpa": 30, "aggregate": "siliceous", "moisture_pct": 1.5},
    "layers": [{"face": "bottom", "cover_mm": 30, "count": 4, "dia_mm": 20, "steel": "hot-rolled", "fyk_mpa": 500}],
    "link_dia_mm": 10,
    "bars": [{"x_mm": 150, "y_mm": 550, "dia_mm": 16, "steel": "hot-rolled", "fyk_mpa": 500}],
    "exposed": ["bottom", "left", "right"]},
  "fire": {"curve": "iso834", "duration_min": 60,
    "spalling": [{"face": "bottom", "start_min": 10, "rate_mm_per_min": 1, "max_depth_mm": 20}]},
  "evidence": {"colour_depths": [{"face": "bottom", "isotherm_c": 300, "depth_mm": 25, "sd_mm": 5}],
    "spalling": [{"face": "left", "depth_mm": 10, "from_mm": 100, "to_mm": 300}]},
  "demand": {"sagging_knm": 100, "hogging_knm": 10, "axial_kn": 0},
  "options": {"cell_mm": 10, "gamma_c": 1.5, "gamma_s": 1.15, "alpha_cc": 1.0}
}`

const baseSlab = `{
  "member": {"kind": "slab", "depth_mm": 200,
    "concrete": {"fck_mpa": 30},
    "layers": [{"face": "bottom", "cover_mm": 20, "spacing_mm": 150, "dia_mm": 10, "fyk_mpa": 500}],
    "exposed": ["bottom"]},
  "fire": {"curve": "parametric", "parametric": {"opening_factor_m05": 0.04, "b_j_m2s05k": 1160, "fire_load_mj_m2": 400}},
  "demand": {"sagging_knm": 20}
}`

// mutate decodes base, sets the value at a dotted path (with [i] indices;
// a nil value deletes the key) and re-encodes it.
func mutate(t *testing.T, base, path string, value any) []byte {
	t.Helper()
	var doc any
	if err := json.Unmarshal([]byte(base), &doc); err != nil {
		t.Fatal(err)
	}
	parts := strings.Split(strings.ReplaceAll(path, "[", ".["), ".")
	cur := doc
	for i, p := range parts {
		last := i == len(parts)-1
		if strings.HasPrefix(p, "[") {
			idx, _ := strconv.Atoi(strings.Trim(p, "[]"))
			arr := cur.([]any)
			if last {
				arr[idx] = value
				break
			}
			cur = arr[idx]
			continue
		}
		obj := cur.(map[string]any)
		if last {
			if value == nil {
				delete(obj, p)
			} else {
				obj[p] = value
			}
			break
		}
		if _, ok := obj[p]; !ok {
			obj[p] = map[string]any{}
		}
		cur = obj[p]
	}
	b, err := json.Marshal(doc)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

func problemsOf(t *testing.T, data []byte) []Problem {
	t.Helper()
	_, err := DecodeBytes(data)
	if err == nil {
		return nil
	}
	var inv *InvalidError
	if !errors.As(err, &inv) {
		t.Fatalf("error is %T (%v), want *InvalidError", err, err)
	}
	if !errors.Is(err, ErrInvalid) {
		t.Fatalf("error does not match ErrInvalid: %v", err)
	}
	return inv.Problems
}

func TestBaseInputsValid(t *testing.T) {
	for name, b := range map[string]string{"beam": baseBeam, "slab": baseSlab} {
		if p := problemsOf(t, []byte(b)); len(p) > 0 {
			t.Errorf("%s base input rejected: %v", name, p)
		}
	}
}

// TestValidateRanges sets one field out of range at a time and expects a
// problem naming that field with the accepted range.
func TestValidateRanges(t *testing.T) {
	long := strings.Repeat("x", 201)
	cases := []struct {
		base, path string
		value      any
		field      string // expected problem field (default: path)
	}{
		{baseBeam, "member.kind", "column", ""},
		{baseBeam, "member.label", long, ""},
		{baseBeam, "member.width_mm", 50, ""},
		{baseBeam, "member.width_mm", 2500, ""},
		{baseBeam, "member.depth_mm", 80, ""},
		{baseBeam, "member.depth_mm", 3500, ""},
		{baseBeam, "member.flange_width_mm", 200, ""},
		{baseBeam, "member.flange_depth_mm", 20, ""},
		{baseBeam, "member.link_dia_mm", 2, ""},
		{baseBeam, "member.link_dia_mm", 30, ""},
		{baseBeam, "member.concrete.fck_mpa", 5, ""},
		{baseBeam, "member.concrete.fck_mpa", 120, ""},
		{baseBeam, "member.concrete.aggregate", "granite", ""},
		{baseBeam, "member.concrete.moisture_pct", 5, ""},
		{baseBeam, "member.concrete.moisture_pct", -1, ""},
		{baseBeam, "member.concrete.conductivity", "middle", ""},
		{baseBeam, "member.layers[0].face", "left", ""},
		{baseBeam, "member.layers[0].cover_mm", 2, ""},
		{baseBeam, "member.layers[0].cover_mm", 320, ""}, // larger than half the depth
		{baseBeam, "member.layers[0].count", 0, ""},
		{baseBeam, "member.layers[0].count", 60, ""},
		{baseBeam, "member.layers[0].count", 12, ""}, // 12 × 20 mm do not fit in 300 mm
		{baseBeam, "member.layers[0].dia_mm", 2, ""},
		{baseBeam, "member.layers[0].dia_mm", 60, ""},
		{baseBeam, "member.layers[0].steel", "rebar", ""},
		{baseBeam, "member.layers[0].fyk_mpa", 100, ""},
		{baseBeam, "member.layers[0].fyk_mpa", 900, ""},
		{baseBeam, "member.layers[0].spacing_mm", 150, ""},
		{baseBeam, "member.layers[0].prestress_mpa", 100, ""},
		{baseBeam, "member.bars[0].x_mm", -5, ""},
		{baseBeam, "member.bars[0].x_mm", 400, ""},
		{baseBeam, "member.bars[0].y_mm", 700, ""},
		{baseBeam, "member.bars[0].x_mm", 5, "member.bars[0]"}, // straddles the left face
		{baseBeam, "member.bars[0].y_mm", 595, "member.bars[0]"},
		{baseBeam, "member.bars[0].dia_mm", 70, ""},
		{baseBeam, "member.bars[0].steel", "wire", ""},
		{baseBeam, "member.exposed[0]", "front", ""},
		{baseBeam, "member.exposed[2]", "left", ""}, // listed twice
		{baseSlab, "member.exposed", []any{"bottom", "left"}, "member.exposed[1]"},
		{baseSlab, "member.width_mm", 50, ""},
		{baseSlab, "member.depth_mm", 2000, ""},
		{baseSlab, "member.flange_width_mm", 800, ""},
		{baseSlab, "member.link_dia_mm", 8, ""},
		{baseSlab, "member.layers[0].count", 4, ""},
		{baseSlab, "member.layers[0].spacing_mm", 20, ""},
		{baseSlab, "member.layers[0].spacing_mm", 900, ""},
		{baseSlab, "member.layers[0].cover_mm", 150, ""},
		{baseSlab, "member.layers", []any{}, "member.layers"},
		{baseBeam, "fire.curve", "iso999", ""},
		{baseBeam, "fire.duration_min", 0, ""},
		{baseBeam, "fire.duration_min", 600, ""},
		{baseBeam, "fire.cooling_rate_c_per_min", 0.1, ""},
		{baseBeam, "fire.cooling_rate_c_per_min", 500, ""},
		{baseBeam, "fire.spalling[0].face", "top", ""}, // not exposed
		{baseBeam, "fire.spalling[0].start_min", -1, ""},
		{baseBeam, "fire.spalling[0].rate_mm_per_min", 50, ""},
		{baseBeam, "fire.spalling[0].max_depth_mm", 400, ""},
		{baseSlab, "fire.parametric.opening_factor_m05", 0.5, ""},
		{baseSlab, "fire.parametric.b_j_m2s05k", 50, ""},
		{baseSlab, "fire.parametric.fire_load_mj_m2", 2000, ""},
		{baseSlab, "fire.parametric.growth", "ultra", ""},
		{baseSlab, "fire.parametric", nil, "fire.parametric"},
		{baseSlab, "fire.duration_min", 60, ""},
		{baseBeam, "evidence.colour_depths[0].face", "top", ""},
		{baseBeam, "evidence.colour_depths[0].isotherm_c", 50, ""},
		{baseBeam, "evidence.colour_depths[0].depth_mm", -1, ""},
		{baseBeam, "evidence.colour_depths[0].depth_mm", 700, ""},
		{baseBeam, "evidence.colour_depths[0].sd_mm", 0.1, ""},
		{baseBeam, "evidence.spalling[0].depth_mm", 0.5, ""},
		{baseBeam, "evidence.spalling[0].depth_mm", 400, ""},
		{baseBeam, "evidence.spalling[0].to_mm", 50, ""},
		{baseBeam, "evidence.spalling[0].from_mm", 900, ""},
		{baseBeam, "demand.sagging_knm", -1, ""},
		{baseBeam, "demand.sagging_knm", 2e5, ""},
		{baseBeam, "demand.hogging_knm", -3, ""},
		{baseBeam, "demand.axial_kn", 2e5, ""},
		{baseBeam, "options.cell_mm", 0.5, ""},
		{baseBeam, "options.cell_mm", 30, ""},
		{baseBeam, "options.concrete_model", "hertz", ""},
		{baseBeam, "options.steel_model", "magic", ""},
		{baseBeam, "options.gamma_c", 0.5, ""},
		{baseBeam, "options.gamma_s", 2, ""},
		{baseBeam, "options.alpha_cc", 0.5, ""},
		{baseBeam, "evidence.exposed_bars", []any{true, false}, ""}, // two entries for one layer
		{baseBeam, "member.layers[0].area_mm2", 100, ""},            // 0.32 of the 20 mm circle
		{baseBeam, "member.bars[0].area_mm2", 300, ""},              // more than the 16 mm circle
		{baseBeam, "options.fit", map[string]any{"family": "zone"}, "options.fit.family"},
		{baseBeam, "options.fit", map[string]any{"family": "parametric", "b_j_m2s05k": 1000}, "options.fit.opening_factor_m05"},
		{baseBeam, "options.fit", map[string]any{"family": "standard", "opening_factor_m05": 0.04}, "options.fit.opening_factor_m05"},
	}
	for _, c := range cases {
		want := c.field
		if want == "" {
			want = c.path
		}
		name := c.path + "=" + truncate(c.value)
		t.Run(name, func(t *testing.T) {
			probs := problemsOf(t, mutate(t, c.base, c.path, c.value))
			for _, p := range probs {
				if p.Field == want {
					if !strings.Contains(p.Message, "accepted") {
						t.Errorf("message for %s does not give the accepted range: %q", want, p.Message)
					}
					return
				}
			}
			t.Errorf("no problem for %s; got %v", want, probs)
		})
	}
}

func truncate(v any) string {
	s, _ := json.Marshal(v)
	if len(s) > 20 {
		return string(s[:20])
	}
	return string(s)
}

// TestValidateTabulated covers the tabulated curve's points.
func TestValidateTabulated(t *testing.T) {
	fire := func(points any) []byte {
		return mutate(t, baseSlab, "fire", map[string]any{"curve": "tabulated", "points": points})
	}
	cases := []struct {
		points any
		field  string
	}{
		{[]any{[]any{0, 20}}, "fire.points"},
		{[]any{[]any{0, 20}, []any{10, 1500}}, "fire.points[1][1]"},
		{[]any{[]any{0, 20}, []any{5000, 500}}, "fire.points[1][0]"},
		{[]any{[]any{5, 20}, []any{10, 500}}, "fire.points[0][0]"},
		{[]any{[]any{0, 20}, []any{10, 500}, []any{10, 600}}, "fire.points[2][0]"},
		{[]any{[]any{0, 20, 5}}, "fire.points[0]"},
		{[]any{[]any{0, 20}, []any{60, 900}}, "fire.points[1][1]"}, // never back to ambient
	}
	for _, c := range cases {
		probs := problemsOf(t, fire(c.points))
		found := false
		for _, p := range probs {
			found = found || p.Field == c.field
		}
		if !found {
			t.Errorf("points %v: no problem for %s; got %v", c.points, c.field, probs)
		}
	}
	ok := fire([]any{[]any{0, 20}, []any{10, 700}, []any{60, 900}, []any{120, 300}, []any{200, 20}})
	if p := problemsOf(t, ok); len(p) > 0 {
		t.Errorf("valid tabulated fire rejected: %v", p)
	}
}

// TestDecodeStructure covers unknown fields, wrong types and malformed JSON.
func TestDecodeStructure(t *testing.T) {
	cases := []struct {
		data  string
		field string
	}{
		{strings.Replace(baseBeam, `"kind": "beam"`, `"kind": "beam", "colour": "red"`, 1), "member.colour"},
		{strings.Replace(baseBeam, `"demand"`, `"extra": 1, "demand"`, 1), "extra"},
		{strings.Replace(baseBeam, `"count": 4`, `"count": 4, "bogus": true`, 1), "member.layers[0].bogus"},
		{strings.Replace(baseBeam, `"kind": "beam"`, `"Kind": "beam"`, 1), "member.Kind"},
		{strings.Replace(baseSlab, `"fire_load_mj_m2": 400`, `"fire_load_mj_m2": 400, "foo": 1`, 1), "fire.parametric.foo"},
		{strings.Replace(baseBeam, `"width_mm": 300`, `"width_mm": "300"`, 1), "member.width_mm"},
		{strings.Replace(baseBeam, `"count": 4`, `"count": 2.5`, 1), "member.layers[0].count"},
		{strings.Replace(baseBeam, `"exposed": ["bottom", "left", "right"]`, `"exposed": "bottom"`, 1), "member.exposed"},
		{strings.Replace(baseBeam, `"width_mm": 300`, `"width_mm": 1e400`, 1), "member.width_mm"},
		{`{"member": `, ""},
		{baseBeam + ` {}`, ""},
		{`[1, 2]`, ""},
		{``, ""},
		{`null`, ""},
	}
	for _, c := range cases {
		probs := problemsOf(t, []byte(c.data))
		found := false
		for _, p := range probs {
			found = found || p.Field == c.field
		}
		if !found {
			t.Errorf("%.60q: no problem for %q; got %v", c.data, c.field, probs)
		}
	}
}

// TestEvidenceWithoutDepths: evidence alone must give colour depths.
func TestEvidenceWithoutDepths(t *testing.T) {
	data := mutate(t, baseBeam, "fire", nil)
	data = []byte(strings.Replace(string(data), `"colour_depths":[{"depth_mm":25,"face":"bottom","isotherm_c":300,"sd_mm":5}],`, "", 1))
	probs := problemsOf(t, data)
	for _, p := range probs {
		if p.Field == "evidence.colour_depths" {
			return
		}
	}
	t.Errorf("no problem for evidence.colour_depths; got %v", probs)
}

// TestAxialBeyondSquash: an axial force the section cannot carry is an input
// problem found by Run, naming demand.axial_kn.
func TestAxialBeyondSquash(t *testing.T) {
	in, err := DecodeBytes(mutate(t, baseBeam, "demand.axial_kn", 9000))
	if err != nil {
		t.Fatal(err)
	}
	in.Fire, in.Evidence = nil, nil
	_, err = Run(context.Background(), in, nil)
	var inv *InvalidError
	if !errors.As(err, &inv) || len(inv.Problems) == 0 || inv.Problems[0].Field != "demand.axial_kn" {
		t.Fatalf("Run error %v, want an InvalidError on demand.axial_kn", err)
	}
}

// TestNormalizeDoesNotAlias: Validate must not change the caller's input.
func TestNormalizeDoesNotAlias(t *testing.T) {
	var in Input
	if err := json.Unmarshal([]byte(baseBeam), &in); err != nil {
		t.Fatal(err)
	}
	in.Member.Layers[0].Steel = ""
	if err := in.Validate(); err != nil {
		t.Fatal(err)
	}
	if in.Member.Layers[0].Steel != "" {
		t.Error("Validate changed the caller's layer")
	}
	h1 := InputSHA256(in)
	in2 := in
	in2.Member.Layers = append([]Layer{}, in.Member.Layers...)
	in2.Member.Layers[0].Steel = SteelHotRolled
	if h2 := InputSHA256(in2); h1 != h2 {
		t.Error("an explicit default changes the input hash")
	}
}

// FuzzDecode: the decoder and validator never panic; every rejection is an
// *InvalidError; an accepted input validates again and hashes stably.
func FuzzDecode(f *testing.F) {
	files, _ := filepath.Glob(filepath.Join("..", "testdata", "*.json"))
	for _, p := range files {
		if b, err := os.ReadFile(p); err == nil {
			f.Add(b)
		}
	}
	f.Add([]byte(baseBeam))
	f.Add([]byte(baseSlab))
	f.Add([]byte(`{"member":{"kind":"beam","bars":[{"x_mm":1e308}]}}`))
	f.Fuzz(func(t *testing.T, data []byte) {
		in, err := DecodeBytes(data)
		if err != nil {
			if !errors.Is(err, ErrInvalid) {
				t.Fatalf("rejection is not ErrInvalid: %v", err)
			}
			return
		}
		if err := in.Validate(); err != nil {
			t.Fatalf("decoded input fails Validate: %v", err)
		}
		b, err := json.Marshal(in)
		if err != nil {
			t.Fatal(err)
		}
		again, err := DecodeBytes(b)
		if err != nil {
			t.Fatalf("re-decoding the normalised input fails: %v", err)
		}
		if InputSHA256(again) != InputSHA256(in) {
			t.Fatal("hash changes on a round trip")
		}
		_ = bytes.MinRead
	})
}

// TestSlabDemandUnits: a slab's demand is per metre width (DESIGN.md §4:
// moments in kN·m per metre width for slabs); the range message must say so,
// and a beam's must not.
func TestSlabDemandUnits(t *testing.T) {
	for _, c := range []struct {
		base, path string
		perMetre   bool
	}{
		{baseSlab, "demand.sagging_knm", true}, {baseSlab, "demand.axial_kn", true},
		{baseBeam, "demand.sagging_knm", false}, {baseBeam, "demand.axial_kn", false},
	} {
		probs := problemsOf(t, mutate(t, c.base, c.path, 3e5))
		if len(probs) != 1 || probs[0].Field != c.path {
			t.Fatalf("%s out of range: %v, want one problem", c.path, probs)
		}
		if got := strings.Contains(probs[0].Message, "per metre width"); got != c.perMetre {
			t.Errorf("%s: message %q, per metre width stated = %v, want %v", c.path, probs[0].Message, got, c.perMetre)
		}
	}
}
