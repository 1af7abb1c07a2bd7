package web

import (
	"encoding/json"
	"net/url"
	"os"
	"testing"
	"time"

	"github.com/google/go-cmp/cmp"

	"residuum/assess"
)

func ptr(v float64) *float64 { return &v }

// TestTriageTable sorts and filters the project's member table as an insurer would use it.
func TestTriageTable(t *testing.T) {
	t.Parallel()
	p := &assess.Project{ID: 1, Name: "P"}
	at := time.Date(2026, 11, 1, 9, 0, 0, 0, time.UTC)
	members := []assess.MemberRecord{
		{ID: 1, Label: "B10", Kind: "beam", UpdatedAt: at},
		{ID: 2, Label: "B2", Kind: "beam", UpdatedAt: at},
		{ID: 3, Label: "S1", Kind: "slab", UpdatedAt: at},
		{ID: 4, Label: "B3", Kind: "beam", UpdatedAt: at}, // not assessed
	}
	latest := []assess.AssessmentRecord{
		{MemberID: 1, Revision: 2, State: assess.StateIssued, SaggingRatio: ptr(0.62), HoggingRatio: ptr(0.9), DamageClass: "4 — major repair or replacement", Action: "replace-or-strengthen", CreatedAt: at},
		{MemberID: 2, Revision: 1, State: assess.StateDraft, SaggingRatio: ptr(0.97), HoggingRatio: ptr(0.99), DamageClass: "1 — superficial damage", Action: "clean-and-redecorate", CreatedAt: at},
		{MemberID: 3, Revision: 1, State: assess.StateDraft, SaggingRatio: ptr(0.88), HoggingRatio: ptr(0.8), DamageClass: "2 — general repair", Action: "reinstate-cover", CreatedAt: at},
	}
	labels := func(v projectView) []string {
		var out []string
		for _, m := range v.Members {
			out = append(out, m.Label)
		}
		return out
	}
	cases := []struct {
		name   string
		sort   string
		desc   bool
		action string
		want   []string
	}{
		{"stored order", "", false, "", []string{"B10", "B2", "S1", "B3"}},
		{"label, natural order", "label", false, "", []string{"B2", "B3", "B10", "S1"}},
		{"worst sagging first", "sagging", false, "", []string{"B10", "S1", "B2", "B3"}},
		{"best sagging first, unassessed still last", "sagging", true, "", []string{"B2", "S1", "B10", "B3"}},
		{"most severe action first", "action", true, "", []string{"B10", "S1", "B2", "B3"}},
		{"filter by action", "", false, "reinstate-cover", []string{"S1"}},
	}
	for _, c := range cases {
		v := buildProjectView(p, members, latest, c.sort, c.desc, c.action)
		if diff := cmp.Diff(c.want, labels(v)); diff != "" {
			t.Errorf("%s: order (-want +got):\n%s", c.name, diff)
		}
	}
	v := buildProjectView(p, members, latest, "sagging", false, "")
	if v.Members[0].Sagging != "0.62" || v.Members[3].Sagging != "–" || v.Members[3].State != "not assessed" {
		t.Errorf("row cells: %+v", v.Members)
	}
	if diff := cmp.Diff([]string{"clean-and-redecorate", "reinstate-cover", "replace-or-strengthen"}, v.Actions); diff != "" {
		t.Errorf("filter choices (-want +got):\n%s", diff)
	}
	for _, c := range v.Columns {
		if c.Key == "sagging" && c.Sort != "ascending" {
			t.Errorf("sagging column aria-sort = %q, want ascending", c.Sort)
		}
	}
}

// TestFormRoundTrip: every example input of the project opens in the editor and comes back from
// the form unchanged (the editor can show and re-save whatever the API stored).
func TestFormRoundTrip(t *testing.T) {
	t.Parallel()
	files, err := os.ReadDir("../testdata")
	if err != nil {
		t.Skipf("no example inputs: %v", err)
	}
	n := 0
	for _, f := range files {
		if f.IsDir() || len(f.Name()) < 5 || f.Name()[len(f.Name())-5:] != ".json" {
			continue
		}
		b, err := os.ReadFile("../testdata/" + f.Name())
		if err != nil {
			t.Fatal(err)
		}
		var in assess.Input
		if err := json.Unmarshal(b, &in); err != nil || in.Member.Kind == "" {
			continue // not an input file
		}
		n++
		form := formFromInput(in, in.Member.Label, "loc", 3)
		vals := formValues(form)
		back := parseMemberForm(vals)
		got, perr := back.toInput()
		if perr != nil {
			t.Errorf("%s: the form does not parse back: %v", f.Name(), perr)
			continue
		}
		// the editor's tabulated points go through text; compare the JSON of both
		want := in
		if want.Member.Exposed == nil {
			// absent faces open as the engine's default faces, ticked, and are saved as that list
			n := in
			n.Normalize()
			want.Member.Exposed = n.Member.Exposed
		}
		if diff := cmp.Diff(want, got); diff != "" {
			t.Errorf("%s: round trip (-want +got):\n%s", f.Name(), diff)
		}
		if back.Location != "loc" || back.Version != 3 {
			t.Errorf("%s: record fields lost: %q %d", f.Name(), back.Location, back.Version)
		}
	}
	if n == 0 {
		t.Skip("no example inputs found")
	}
}

// TestFormExposedBarsAndArea: the per-layer "bars seen exposed on site" boxes and the bar and
// layer areas reach evidence.exposed_bars and area_mm2 as the engine expects them (one list entry
// per layer, in order; no list when nothing is ticked), survive removing rows and blank rows, and
// a form built this way passes the engine's validation.
func TestFormExposedBarsAndArea(t *testing.T) {
	t.Parallel()
	base := func() assess.Input {
		return assess.Input{
			Member: assess.Member{Kind: "beam", Label: "E1", WidthMM: 300, DepthMM: 500, LinkDiaMM: 8,
				Concrete: assess.Concrete{FckMPa: 30, Aggregate: "siliceous"},
				Layers: []assess.Layer{
					{Face: "bottom", CoverMM: 30, Count: 3, DiaMM: 12.5, Steel: "prestressing", FykMPa: 1640, PrestressMPa: 900, AreaMM2: 93},
					{Face: "top", CoverMM: 30, Count: 2, DiaMM: 12, Steel: "hot-rolled", FykMPa: 500},
				},
				Bars:    []assess.Bar{{XMM: 150, YMM: 250, DiaMM: 15.2, Steel: "prestressing", FykMPa: 1640, AreaMM2: 139}},
				Exposed: []string{"bottom", "left", "right"}},
			Fire:   &assess.Fire{Curve: "iso834", DurationMin: 60},
			Demand: assess.Demand{SaggingKNm: 50},
		}
	}
	roundTrip := func(in assess.Input) (memberForm, assess.Input) {
		t.Helper()
		back := parseMemberForm(formValues(formFromInput(in, in.Member.Label, "", 1)))
		got, perr := back.toInput()
		if perr != nil {
			t.Fatalf("form does not parse back: %v", perr)
		}
		return back, got
	}
	cases := []struct {
		name string
		ev   *assess.Evidence
	}{
		{"no evidence", nil},
		{"second layer seen exposed, no other evidence", &assess.Evidence{ExposedBars: []bool{false, true}}},
		{"explicit all-false list beside spalling", &assess.Evidence{Spalling: []assess.MeasuredSpall{{Face: "bottom", DepthMM: 10}}, ExposedBars: []bool{false, false}}},
		{"spalling, no list", &assess.Evidence{Spalling: []assess.MeasuredSpall{{Face: "bottom", DepthMM: 10}}}},
	}
	for _, c := range cases {
		in := base()
		in.Evidence = c.ev
		_, got := roundTrip(in)
		if diff := cmp.Diff(in, got); diff != "" {
			t.Errorf("%s: round trip (-want +got):\n%s", c.name, diff)
		}
		raw, err := inputJSON(got)
		if err != nil {
			t.Fatal(err)
		}
		if _, err := assess.DecodeBytes(raw); err != nil {
			t.Errorf("%s: the engine rejects the form's input: %v", c.name, err)
		}
	}

	// removing layer 1 keeps the tick with layer 2, which becomes layer 1
	in := base()
	in.Evidence = &assess.Evidence{ExposedBars: []bool{false, true}}
	f := formFromInput(in, "E1", "", 1)
	if !f.applyOp("remove-layer:0") {
		t.Fatal("remove-layer not applied")
	}
	got, perr := parseMemberForm(formValues(f)).toInput()
	if perr != nil {
		t.Fatal(perr)
	}
	if got.Evidence == nil || !cmp.Equal(got.Evidence.ExposedBars, []bool{true}) {
		t.Errorf("after removing layer 1: evidence %+v, want exposed_bars [true]", got.Evidence)
	}

	// a blank posted row is dropped: a box ticked on posted row 2 belongs to layer 2 of the input
	v := formValues(formFromInput(base(), "E1", "", 1))
	for k := range v {
		if len(k) > 16 && k[:16] == "member.layers[1]" {
			v[k[:14]+"2"+k[15:]] = v[k]
			if k[17:] == "face" || k[17:] == "steel" {
				continue // selects always post a value
			}
			v.Set(k, "")
		}
	}
	v.Set("member.layers[1].face", "bottom")
	v.Set("member.layers[1].steel", "hot-rolled")
	v.Set("evidence.exposed_bars[2]", "true")
	got, perr = parseMemberForm(v).toInput()
	if perr != nil {
		t.Fatal(perr)
	}
	if len(got.Member.Layers) != 2 || got.Evidence == nil || !cmp.Equal(got.Evidence.ExposedBars, []bool{false, true}) {
		t.Errorf("blank middle row: layers %d, evidence %+v, want 2 layers and exposed_bars [false true]", len(got.Member.Layers), got.Evidence)
	}
	if got.Member.Layers[0].AreaMM2 != 93 || got.Member.Bars[0].AreaMM2 != 139 {
		t.Errorf("areas = %v, %v, want 93, 139 mm² as entered", got.Member.Layers[0].AreaMM2, got.Member.Bars[0].AreaMM2)
	}

	// the engine's problems with the new fields land beside them
	f = memberForm{Layers: make([]layerForm, 2), Bars: make([]barForm, 1)}
	errs, _ := placeProblems(f, &assess.InvalidError{Problems: []assess.Problem{
		{Field: "evidence.exposed_bars[1]", Message: "a"},
		{Field: "member.layers[0].area_mm2", Message: "b"},
		{Field: "evidence.exposed_bars", Message: "c"},
		{Field: "member.bars[0]", Message: "d"},
	}})
	want := map[string]string{"evidence.exposed_bars[1]": "a", "member.layers[0].area_mm2": "b", "evidence.exposed_bars": "c", "member.bars[0].dia_mm": "d"}
	if diff := cmp.Diff(want, errs); diff != "" {
		t.Errorf("placed (-want +got):\n%s", diff)
	}
	if got := fieldLabel("evidence.exposed_bars[1]"); got != "Bars seen exposed on site, layer 2" {
		t.Errorf("fieldLabel = %q", got)
	}
}

// formValues renders a form model as the browser would post it (names as in editor.templ).
func formValues(f memberForm) url.Values {
	v := url.Values{}
	set := func(k, s string) { v.Set(k, s) }
	set("member.label", f.Label)
	set("location", f.Location)
	set("member.kind", f.Kind)
	set("version", fmtInput(float64(f.Version)))
	set("member.width_mm", f.Width)
	set("member.depth_mm", f.Depth)
	set("member.flange_width_mm", f.FlangeWidth)
	set("member.flange_depth_mm", f.FlangeDepth)
	set("member.link_dia_mm", f.LinkDia)
	set("member.concrete.fck_mpa", f.Fck)
	set("member.concrete.aggregate", f.Aggregate)
	set("member.concrete.moisture_pct", f.Moisture)
	set("member.concrete.conductivity", f.Conductivity)
	for i, l := range f.Layers {
		for k, s := range map[string]string{"face": l.Face, "cover_mm": l.Cover, "count": l.Count, "spacing_mm": l.Spacing, "dia_mm": l.Dia, "steel": l.Steel, "fyk_mpa": l.Fyk, "prestress_mpa": l.Prestress, "area_mm2": l.Area} {
			set(rowName("member.layers", i, k), s)
		}
		if l.Exposed { // a checkbox is posted only when ticked
			set(exposedBarsName(i), "true")
		}
	}
	if f.ExposedBarsListed {
		set("evidence.exposed_bars", "listed")
	}
	for i, b := range f.Bars {
		for k, s := range map[string]string{"x_mm": b.X, "y_mm": b.Y, "dia_mm": b.Dia, "steel": b.Steel, "fyk_mpa": b.Fyk, "prestress_mpa": b.Prestress, "area_mm2": b.Area} {
			set(rowName("member.bars", i, k), s)
		}
	}
	for face, on := range f.Exposed {
		if on {
			v.Add("member.exposed", face)
		}
	}
	set("fire.curve", f.Curve)
	set("fire.duration_min", f.Duration)
	set("fire.cooling_rate_c_per_min", f.Cooling)
	set("fire.parametric.opening_factor_m05", f.ParamO)
	set("fire.parametric.b_j_m2s05k", f.ParamB)
	set("fire.parametric.fire_load_mj_m2", f.ParamQ)
	set("fire.parametric.growth", f.ParamGrowth)
	set("fire.points", f.Points)
	for i, s := range f.Progressive {
		for k, x := range map[string]string{"face": s.Face, "start_min": s.Start, "rate_mm_per_min": s.Rate, "max_depth_mm": s.Max} {
			set(rowName("fire.spalling", i, k), x)
		}
	}
	for i, c := range f.Colour {
		for k, x := range map[string]string{"face": c.Face, "isotherm_c": c.Isotherm, "depth_mm": c.Depth, "sd_mm": c.Sd} {
			set(rowName("evidence.colour_depths", i, k), x)
		}
	}
	for i, s := range f.Spalls {
		for k, x := range map[string]string{"face": s.Face, "depth_mm": s.Depth, "from_mm": s.From, "to_mm": s.To} {
			set(rowName("evidence.spalling", i, k), x)
		}
	}
	set("evidence.notes", f.EvidenceNotes)
	set("demand.sagging_knm", f.Sagging)
	set("demand.hogging_knm", f.Hogging)
	set("demand.axial_kn", f.Axial)
	set("options.cell_mm", f.CellMM)
	set("options.concrete_model", f.ConcreteModel)
	set("options.steel_model", f.SteelModel)
	set("options.gamma_c", f.GammaC)
	set("options.gamma_s", f.GammaS)
	set("options.alpha_cc", f.AlphaCC)
	set("options.fit.family", f.FitFamily)
	set("options.fit.opening_factor_m05", f.FitO)
	set("options.fit.b_j_m2s05k", f.FitB)
	set("options.fit.growth", f.FitGrowth)
	return v
}

// TestPlaceProblems: engine problems land on their field, a whole-bar problem on the bar's first
// field, and a face list problem on the face list; unknown paths go to the summary only.
func TestPlaceProblems(t *testing.T) {
	t.Parallel()
	f := memberForm{Layers: make([]layerForm, 2), Bars: make([]barForm, 1)}
	inv := &assess.InvalidError{Problems: []assess.Problem{
		{Field: "member.layers[1].cover_mm", Message: "a"},
		{Field: "member.bars[0]", Message: "b"},
		{Field: "member.exposed[1]", Message: "c"},
		{Field: "label", Message: "d"},
		{Field: "", Message: "e"},
	}}
	errs, sum := placeProblems(f, inv)
	want := map[string]string{"member.layers[1].cover_mm": "a", "member.bars[0].dia_mm": "b", "member.exposed": "c", "member.label": "d"}
	if diff := cmp.Diff(want, errs); diff != "" {
		t.Errorf("placed (-want +got):\n%s", diff)
	}
	if len(sum) != 5 || sum[4].ID != "" || sum[0].ID != "member-layers-1-cover_mm" {
		t.Errorf("summary = %+v", sum)
	}
	for path, want := range map[string]string{
		"member.layers[1].cover_mm":          "Layer 2 cover",
		"evidence.colour_depths[0].depth_mm": "Colour-change depth 1 depth",
		"member.width_mm":                    "Width",
		"member.bars[2]":                     "Bar 3",
	} {
		if got := fieldLabel(path); got != want {
			t.Errorf("fieldLabel(%q) = %q, want %q", path, got, want)
		}
	}
}

// TestNaturalCompare orders labels with numbers as a person would.
func TestNaturalCompare(t *testing.T) {
	t.Parallel()
	cases := []struct {
		a, b string
		want int
	}{{"B2", "B10", -1}, {"B10", "B2", 1}, {"b2", "B2", 0}, {"B02", "B2", 0}, {"B2a", "B2b", -1}, {"S1", "B9", 1}}
	for _, c := range cases {
		if got := naturalCompare(c.a, c.b); got != c.want {
			t.Errorf("naturalCompare(%q, %q) = %d, want %d", c.a, c.b, got, c.want)
		}
	}
}
