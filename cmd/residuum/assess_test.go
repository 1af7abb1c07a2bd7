package main

import (
	"bytes"
	"context"
	"encoding/json"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"residuum/assess"
)

func runCmd(t *testing.T, stdin string, args ...string) (code int, stdout, stderr string) {
	t.Helper()
	var out, errb bytes.Buffer
	err := run(context.Background(), args, func(string) string { return "" }, strings.NewReader(stdin), &out, &errb)
	return exitCode(err), out.String(), errb.String()
}

func example(name string) string { return filepath.Join("..", "..", "testdata", name) }

// TestAssessJSON: exit 0, the required keys, and exactly the bytes the engine
// marshals (what POST /api/v1/assess answers).
func TestAssessJSON(t *testing.T) {
	path := example("beam-colour-fit.json")
	code, out, errs := runCmd(t, "", "assess", "-in", path)
	if code != 0 {
		t.Fatalf("exit %d, stderr %s", code, errs)
	}
	var doc map[string]any
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatalf("output is not JSON: %v", err)
	}
	get := func(path ...string) any {
		var cur any = doc
		for _, p := range path {
			m, ok := cur.(map[string]any)
			if !ok {
				return nil
			}
			cur = m[p]
		}
		return cur
	}
	for _, p := range [][]string{
		{"capacity", "sagging", "undamaged_knm"}, {"capacity", "sagging", "residual_knm"}, {"capacity", "sagging", "ratio"},
		{"capacity", "hogging", "undamaged_knm"}, {"capacity", "hogging", "residual_knm"}, {"capacity", "hogging", "ratio"},
		{"fit", "duration_min"}, {"fit", "range"}, {"fit", "misfit_mm"},
		{"damage", "class"}, {"damage", "reasons"}, {"action"}, {"cautions"}, {"method"}, {"input_sha256"},
		{"fire_curve"}, {"field", "nx"}, {"field", "peak_c"}, {"profiles"}, {"moment_curvature", "sagging", "residual"},
	} {
		if get(p...) == nil {
			t.Errorf("key %s missing", strings.Join(p, "."))
		}
	}
	iso, _ := get("isotherms", "bottom").(map[string]any)
	for _, k := range []string{"300", "500", "600"} {
		if _, ok := iso[k]; !ok {
			t.Errorf("isotherms.bottom.%s missing", k)
		}
	}
	rebar, _ := doc["rebar"].([]any)
	if len(rebar) != 6 {
		t.Errorf("%d rebar entries, want 6", len(rebar))
	}
	for _, r := range rebar {
		m := r.(map[string]any)
		if _, ok := m["peak_c"]; !ok {
			t.Error("rebar entry without peak_c")
		}
		if _, ok := m["end_of_heating_c"]; !ok {
			t.Error("rebar entry without end_of_heating_c")
		}
	}
	if c, _ := doc["cautions"].([]any); len(c) == 0 {
		t.Error("cautions empty")
	}
	// identical to the engine's own bytes
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	in, err := assess.Decode(f)
	if err != nil {
		t.Fatal(err)
	}
	res, err := assess.Run(context.Background(), in, nil)
	if err != nil {
		t.Fatal(err)
	}
	want, err := assess.MarshalJSON(res)
	if err != nil {
		t.Fatal(err)
	}
	if out != string(want) {
		t.Error("CLI output differs from assess.MarshalJSON of the same run")
	}
}

func TestAssessTextAndStdin(t *testing.T) {
	data, err := os.ReadFile(example("slab-iso60.json"))
	if err != nil {
		t.Fatal(err)
	}
	code, out, errs := runCmd(t, string(data), "assess", "-in", "-", "-format", "text")
	if code != 0 {
		t.Fatalf("exit %d, stderr %s", code, errs)
	}
	for _, want := range []string{"Damage class", "Capacity", "Action:", "Cautions:", "sagging", "kN·m/m"} {
		if !strings.Contains(out, want) {
			t.Errorf("text output lacks %q", want)
		}
	}
	if n := strings.Count(out, "\n"); n > 40 {
		t.Errorf("text summary has %d lines, want one screen", n)
	}
}

var problemLine = regexp.MustCompile(`^[a-z_\[\]0-9.()]+: .+\(accepted: .+\)$`)

// TestAssessInvalid: exit 2, one line per problem naming the field.
func TestAssessInvalid(t *testing.T) {
	cases := []struct {
		name, input string
		fields      []string
	}{
		{"slab side face", `{"member":{"kind":"slab","depth_mm":200,"concrete":{"fck_mpa":30},
			"layers":[{"face":"bottom","cover_mm":20,"spacing_mm":150,"dia_mm":10,"fyk_mpa":500}],"exposed":["bottom","left"]},
			"fire":{"curve":"iso834","duration_min":60},"demand":{}}`, []string{"member.exposed[1]"}},
		{"several problems", `{"member":{"kind":"beam","width_mm":30,"depth_mm":600,"concrete":{"fck_mpa":300},
			"layers":[{"face":"bottom","cover_mm":400,"count":2,"dia_mm":20,"fyk_mpa":500}]},"demand":{"sagging_knm":-5}}`,
			[]string{"member.width_mm", "member.concrete.fck_mpa", "demand.sagging_knm"}},
		{"unknown field", `{"member":{"kind":"beam","wdth_mm":300}}`, []string{"member.wdth_mm"}},
		{"bar outside", `{"member":{"kind":"beam","width_mm":300,"depth_mm":600,"concrete":{"fck_mpa":30},
			"bars":[{"x_mm":350,"y_mm":50,"dia_mm":20,"fyk_mpa":500}]},"demand":{}}`, []string{"member.bars[0].x_mm"}},
		{"cover over half depth", `{"member":{"kind":"beam","width_mm":300,"depth_mm":300,"concrete":{"fck_mpa":30},
			"layers":[{"face":"bottom","cover_mm":160,"count":2,"dia_mm":20,"fyk_mpa":500}]},"demand":{}}`, []string{"member.layers[0].cover_mm"}},
		{"not JSON", `{"member":`, []string{"(input)"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			code, out, errs := runCmd(t, c.input, "assess", "-in", "-")
			if code != 2 {
				t.Fatalf("exit %d, want 2 (stderr %s)", code, errs)
			}
			if out != "" {
				t.Errorf("stdout not empty: %q", out)
			}
			lines := strings.Split(strings.TrimSpace(errs), "\n")
			for _, l := range lines {
				if !problemLine.MatchString(l) {
					t.Errorf("line %q is not \"path: message (accepted: range)\"", l)
				}
			}
			for _, f := range c.fields {
				found := false
				for _, l := range lines {
					found = found || strings.HasPrefix(l, f+": ")
				}
				if !found {
					t.Errorf("no line for %s in:\n%s", f, errs)
				}
			}
		})
	}
}

func TestAssessUsage(t *testing.T) {
	for _, args := range [][]string{
		{"assess"},
		{"assess", "-in", "x.json", "-format", "html5"},
		{"assess", "-in", filepath.Join(t.TempDir(), "missing.json")},
		{"assess", "-bogus"},
		{"assess", "-in", "a.json", "extra"},
	} {
		if code, _, errs := runCmd(t, "", args...); code != 2 || errs == "" {
			t.Errorf("%v: exit %d, stderr %q; want 2 with a message", args, code, errs)
		}
	}
}
