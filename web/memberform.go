package web

import (
	"encoding/json"
	"fmt"
	"math"
	"net/url"
	"strconv"
	"strings"

	"residuum/assess"
)

// memberForm is the member editor as typed: every value is kept as text so that a re-rendered
// form shows exactly what the user entered, even when it does not parse. Form field names are the
// JSON paths of assess.Input ("member.layers[0].cover_mm"), so validation problems, which name
// those paths, land next to the field they concern.
type memberForm struct {
	Label, Location, Kind                  string
	Width, Depth, FlangeWidth, FlangeDepth string
	LinkDia                                string
	Fck, Aggregate, Moisture, Conductivity string
	Layers                                 []layerForm
	Bars                                   []barForm
	Exposed                                map[string]bool
	Curve, Duration, Cooling               string
	ParamO, ParamB, ParamQ, ParamGrowth    string
	Points                                 string // "min, °C" per line
	Progressive                            []progForm
	Colour                                 []colourForm
	Spalls                                 []spallForm
	EvidenceNotes                          string
	Sagging, Hogging, Axial                string
	CellMM, ConcreteModel, SteelModel      string
	GammaC, GammaS, AlphaCC                string
	FitFamily, FitO, FitB, FitGrowth       string
	Version                                int64
	Errors                                 map[string]string // by field name; "" = not tied to a field

	// ExposedBarsListed: the stored input carried evidence.exposed_bars, so the list (one
	// entry per layer, from Layer.Exposed) is written back even when no box is ticked.
	ExposedBarsListed bool
}

// layerForm is one reinforcement layer row; Exposed is its "bars seen exposed on site" box
// (evidence.exposed_bars[i] of the input, kept with the row so that it moves when rows are removed).
type layerForm struct {
	Face, Cover, Count, Spacing, Dia, Steel, Fyk, Prestress, Area string
	Exposed                                                       bool
}
type barForm struct{ X, Y, Dia, Steel, Fyk, Prestress, Area string }
type progForm struct{ Face, Start, Rate, Max string }
type colourForm struct{ Face, Isotherm, Depth, Sd string }
type spallForm struct{ Face, Depth, From, To string }

// maxRows bounds every repeated group of the form.
const maxRows = 40

// newMemberForm is the form a new member starts from: a plausible rectangular beam, so the
// drawing shows something at once and the user edits rather than types from nothing.
func newMemberForm() memberForm {
	return memberForm{
		Kind: "beam", Width: "300", Depth: "500", LinkDia: "8",
		Fck: "30", Aggregate: "siliceous", Conductivity: "lower",
		Layers: []layerForm{
			{Face: "bottom", Cover: "30", Count: "3", Dia: "20", Steel: "hot-rolled", Fyk: "500"},
			{Face: "top", Cover: "30", Count: "2", Dia: "12", Steel: "hot-rolled", Fyk: "500"},
		},
		Exposed: map[string]bool{"bottom": true, "left": true, "right": true},
		Curve:   "iso834", Duration: "60",
		Sagging: "", Hogging: "", Axial: "",
		ConcreteModel: "", SteelModel: "", FitFamily: "",
	}
}

func num(v float64) string {
	if v == 0 {
		return ""
	}
	return fmtInput(v)
}

// formFromInput fills the form from a stored input and its record.
func formFromInput(in assess.Input, label, location string, version int64) memberForm {
	m := in.Member
	f := memberForm{
		Label: label, Location: location, Kind: m.Kind, Version: version,
		Width: num(m.WidthMM), Depth: num(m.DepthMM), FlangeWidth: num(m.FlangeWidthMM), FlangeDepth: num(m.FlangeDepthMM),
		LinkDia: num(m.LinkDiaMM), Fck: num(m.Concrete.FckMPa), Aggregate: m.Concrete.Aggregate,
		Conductivity: m.Concrete.Conductivity, Exposed: map[string]bool{},
		Sagging: num(in.Demand.SaggingKNm), Hogging: num(in.Demand.HoggingKNm), Axial: num(in.Demand.AxialKN),
		CellMM: num(in.Options.CellMM), ConcreteModel: in.Options.ConcreteModel, SteelModel: in.Options.SteelModel,
		GammaC: num(in.Options.GammaC), GammaS: num(in.Options.GammaS), AlphaCC: num(in.Options.AlphaCC),
	}
	if m.Concrete.MoisturePct != nil {
		f.Moisture = fmtInput(*m.Concrete.MoisturePct)
	}
	var seen []bool
	if in.Evidence != nil {
		seen = in.Evidence.ExposedBars
		f.ExposedBarsListed = len(seen) > 0
	}
	for i, l := range m.Layers {
		f.Layers = append(f.Layers, layerForm{Face: l.Face, Cover: num(l.CoverMM), Count: numi(l.Count), Spacing: num(l.SpacingMM),
			Dia: num(l.DiaMM), Steel: l.Steel, Fyk: num(l.FykMPa), Prestress: num(l.PrestressMPa), Area: num(l.AreaMM2),
			Exposed: i < len(seen) && seen[i]})
	}
	for _, b := range m.Bars {
		f.Bars = append(f.Bars, barForm{fmtInput(b.XMM), fmtInput(b.YMM), num(b.DiaMM), b.Steel, num(b.FykMPa), num(b.PrestressMPa), num(b.AreaMM2)})
	}
	exposed := m.Exposed
	if exposed == nil {
		// absent: the engine's default faces, ticked so that saving keeps their meaning (an
		// untouched box list is posted as the explicit list, and no box means no face exposed)
		exposed = []string{"bottom", "left", "right"}
		if m.Kind == assess.KindSlab {
			exposed = []string{"bottom"}
		}
	}
	for _, e := range exposed {
		f.Exposed[e] = true
	}
	if fi := in.Fire; fi != nil {
		f.Curve, f.Duration, f.Cooling = fi.Curve, num(fi.DurationMin), num(fi.CoolingRateCPerMin)
		if p := fi.Parametric; p != nil {
			f.ParamO, f.ParamB, f.ParamQ, f.ParamGrowth = num(p.OpeningFactorM05), num(p.BJM2S05K), num(p.FireLoadMJM2), p.Growth
		}
		var b strings.Builder
		for _, p := range fi.Points {
			fmt.Fprintf(&b, "%s, %s\n", fmtInput(p[0]), fmtInput(p[1]))
		}
		f.Points = b.String()
		for _, s := range fi.Spalling {
			f.Progressive = append(f.Progressive, progForm{s.Face, fmtInput(s.StartMin), num(s.RateMMPerMin), num(s.MaxDepthMM)})
		}
	}
	if ev := in.Evidence; ev != nil {
		for _, c := range ev.ColourDepths {
			f.Colour = append(f.Colour, colourForm{c.Face, num(c.IsothermC), num(c.DepthMM), num(c.SdMM)})
		}
		for _, s := range ev.Spalling {
			f.Spalls = append(f.Spalls, spallForm{s.Face, num(s.DepthMM), num(s.FromMM), num(s.ToMM)})
		}
		f.EvidenceNotes = ev.Notes
	}
	if fo := in.Options.Fit; fo != nil {
		f.FitFamily, f.FitO, f.FitB, f.FitGrowth = fo.Family, num(fo.OpeningFactorM05), num(fo.BJM2S05K), fo.Growth
		if f.FitFamily == "" {
			// a fit block without a family is the default family; the select's blank choice
			// would drop the block altogether
			f.FitFamily = assess.FitStandard
		}
	}
	return f
}

func numi(v int) string {
	if v == 0 {
		return ""
	}
	return strconv.Itoa(v)
}

// parseMemberForm reads the posted form. Rows whose inputs are all blank are dropped (and the
// rest renumbered), so that the indices of the form rows and of the built input agree.
func parseMemberForm(v url.Values) memberForm {
	g := func(k string) string { return strings.TrimSpace(v.Get(k)) }
	f := memberForm{
		Label: g("member.label"), Location: g("location"), Kind: g("member.kind"),
		Width: g("member.width_mm"), Depth: g("member.depth_mm"),
		FlangeWidth: g("member.flange_width_mm"), FlangeDepth: g("member.flange_depth_mm"),
		LinkDia: g("member.link_dia_mm"),
		Fck:     g("member.concrete.fck_mpa"), Aggregate: g("member.concrete.aggregate"),
		Moisture: g("member.concrete.moisture_pct"), Conductivity: g("member.concrete.conductivity"),
		Exposed: map[string]bool{},
		Curve:   g("fire.curve"), Duration: g("fire.duration_min"), Cooling: g("fire.cooling_rate_c_per_min"),
		ParamO: g("fire.parametric.opening_factor_m05"), ParamB: g("fire.parametric.b_j_m2s05k"),
		ParamQ: g("fire.parametric.fire_load_mj_m2"), ParamGrowth: g("fire.parametric.growth"),
		Points: v.Get("fire.points"),
		// browsers send a textarea's line breaks as CRLF; the input keeps them as LF
		EvidenceNotes: strings.ReplaceAll(g("evidence.notes"), "\r\n", "\n"),
		Sagging:       g("demand.sagging_knm"), Hogging: g("demand.hogging_knm"), Axial: g("demand.axial_kn"),
		CellMM: g("options.cell_mm"), ConcreteModel: g("options.concrete_model"), SteelModel: g("options.steel_model"),
		GammaC: g("options.gamma_c"), GammaS: g("options.gamma_s"), AlphaCC: g("options.alpha_cc"),
		FitFamily: g("options.fit.family"), FitO: g("options.fit.opening_factor_m05"),
		FitB: g("options.fit.b_j_m2s05k"), FitGrowth: g("options.fit.growth"),
	}
	f.Version, _ = strconv.ParseInt(g("version"), 10, 64)
	for _, e := range v["member.exposed"] {
		switch e {
		case "bottom", "top", "left", "right":
			f.Exposed[e] = true
		}
	}
	f.ExposedBarsListed = g("evidence.exposed_bars") == "listed"
	// rows returns the non-blank rows of a group with the index each had in the posted form.
	type row struct {
		at   int
		vals []string
	}
	rows := func(prefix string, keys ...string) []row {
		var out []row
		for i := 0; i < maxRows; i++ {
			vals := make([]string, len(keys))
			blank, present := true, false
			for k, key := range keys {
				name := fmt.Sprintf("%s[%d].%s", prefix, i, key)
				if _, ok := v[name]; ok {
					present = true
				}
				vals[k] = g(name)
				// selects always carry a value; only typed numbers decide whether a row is blank
				if vals[k] != "" && !isChoiceKey(key) {
					blank = false
				}
			}
			if !present {
				continue
			}
			if !blank {
				out = append(out, row{i, vals})
			}
		}
		return out
	}
	for _, r := range rows("member.layers", "face", "cover_mm", "count", "spacing_mm", "dia_mm", "steel", "fyk_mpa", "prestress_mpa", "area_mm2") {
		v := r.vals
		// the box is named by the engine's path for the row as posted; a ticked box alone does not keep a blank row
		f.Layers = append(f.Layers, layerForm{Face: v[0], Cover: v[1], Count: v[2], Spacing: v[3], Dia: v[4], Steel: v[5], Fyk: v[6],
			Prestress: v[7], Area: v[8], Exposed: g(fmt.Sprintf("evidence.exposed_bars[%d]", r.at)) == "true"})
	}
	for _, r := range rows("member.bars", "x_mm", "y_mm", "dia_mm", "steel", "fyk_mpa", "prestress_mpa", "area_mm2") {
		f.Bars = append(f.Bars, barForm{r.vals[0], r.vals[1], r.vals[2], r.vals[3], r.vals[4], r.vals[5], r.vals[6]})
	}
	for _, r := range rows("fire.spalling", "face", "start_min", "rate_mm_per_min", "max_depth_mm") {
		f.Progressive = append(f.Progressive, progForm{r.vals[0], r.vals[1], r.vals[2], r.vals[3]})
	}
	for _, r := range rows("evidence.colour_depths", "face", "isotherm_c", "depth_mm", "sd_mm") {
		f.Colour = append(f.Colour, colourForm{r.vals[0], r.vals[1], r.vals[2], r.vals[3]})
	}
	for _, r := range rows("evidence.spalling", "face", "depth_mm", "from_mm", "to_mm") {
		f.Spalls = append(f.Spalls, spallForm{r.vals[0], r.vals[1], r.vals[2], r.vals[3]})
	}
	return f
}

func isChoiceKey(k string) bool { return k == "face" || k == "steel" }

// applyOp performs an editor button that changes the form without saving: adding or removing a
// row. It reports whether op was such a button.
func (f *memberForm) applyOp(op string) bool {
	kind, idx, _ := strings.Cut(op, ":")
	i, err := strconv.Atoi(idx)
	if idx != "" && err != nil {
		return false
	}
	del := func(n int) bool { return idx != "" && i >= 0 && i < n }
	switch kind {
	case "add-layer":
		if len(f.Layers) < maxRows {
			face := "bottom"
			if len(f.Layers) > 0 && f.Layers[len(f.Layers)-1].Face == "bottom" {
				face = "top"
			}
			f.Layers = append(f.Layers, layerForm{Face: face, Steel: "hot-rolled", Fyk: "500"})
		}
	case "remove-layer":
		if del(len(f.Layers)) {
			f.Layers = append(f.Layers[:i], f.Layers[i+1:]...)
		}
	case "add-bar":
		if len(f.Bars) < maxRows {
			f.Bars = append(f.Bars, barForm{Steel: "hot-rolled", Fyk: "500"})
		}
	case "remove-bar":
		if del(len(f.Bars)) {
			f.Bars = append(f.Bars[:i], f.Bars[i+1:]...)
		}
	case "add-colour":
		if len(f.Colour) < maxRows {
			f.Colour = append(f.Colour, colourForm{Face: "bottom", Isotherm: "300"})
		}
	case "remove-colour":
		if del(len(f.Colour)) {
			f.Colour = append(f.Colour[:i], f.Colour[i+1:]...)
		}
	case "add-spall":
		if len(f.Spalls) < maxRows {
			f.Spalls = append(f.Spalls, spallForm{Face: "bottom"})
		}
	case "remove-spall":
		if del(len(f.Spalls)) {
			f.Spalls = append(f.Spalls[:i], f.Spalls[i+1:]...)
		}
	case "add-progressive":
		if len(f.Progressive) < maxRows {
			f.Progressive = append(f.Progressive, progForm{Face: "bottom"})
		}
	case "remove-progressive":
		if del(len(f.Progressive)) {
			f.Progressive = append(f.Progressive[:i], f.Progressive[i+1:]...)
		}
	case "redraw":
	default:
		return false
	}
	return true
}

// toInput builds the engine input from the form. Text that is not a number is reported against
// its field (the engine's own validation then checks ranges); blank numbers are left at zero, the
// documented "default" of each field.
func (f memberForm) toInput() (assess.Input, *assess.InvalidError) {
	var prob assess.InvalidError
	fl := func(field, s string) float64 {
		if s == "" {
			return 0
		}
		x, err := strconv.ParseFloat(strings.ReplaceAll(s, ",", "."), 64)
		if err != nil || math.IsNaN(x) || math.IsInf(x, 0) {
			prob.Addf(field, "must be a number, got %q", s)
			return 0
		}
		return x
	}
	it := func(field, s string) int {
		if s == "" {
			return 0
		}
		x, err := strconv.Atoi(s)
		if err != nil {
			prob.Addf(field, "must be a whole number, got %q", s)
			return 0
		}
		return x
	}
	var in assess.Input
	m := &in.Member
	m.Kind, m.Label = f.Kind, f.Label
	m.WidthMM = fl("member.width_mm", f.Width)
	m.DepthMM = fl("member.depth_mm", f.Depth)
	m.FlangeWidthMM = fl("member.flange_width_mm", f.FlangeWidth)
	m.FlangeDepthMM = fl("member.flange_depth_mm", f.FlangeDepth)
	m.LinkDiaMM = fl("member.link_dia_mm", f.LinkDia)
	m.Concrete.FckMPa = fl("member.concrete.fck_mpa", f.Fck)
	m.Concrete.Aggregate = f.Aggregate
	m.Concrete.Conductivity = f.Conductivity
	if f.Moisture != "" {
		x := fl("member.concrete.moisture_pct", f.Moisture)
		m.Concrete.MoisturePct = &x
	}
	for i, l := range f.Layers {
		p := fmt.Sprintf("member.layers[%d].", i)
		m.Layers = append(m.Layers, assess.Layer{
			Face: l.Face, CoverMM: fl(p+"cover_mm", l.Cover), Count: it(p+"count", l.Count),
			SpacingMM: fl(p+"spacing_mm", l.Spacing), DiaMM: fl(p+"dia_mm", l.Dia), Steel: l.Steel,
			FykMPa: fl(p+"fyk_mpa", l.Fyk), PrestressMPa: fl(p+"prestress_mpa", l.Prestress), AreaMM2: fl(p+"area_mm2", l.Area),
		})
	}
	for i, b := range f.Bars {
		p := fmt.Sprintf("member.bars[%d].", i)
		m.Bars = append(m.Bars, assess.Bar{
			XMM: fl(p+"x_mm", b.X), YMM: fl(p+"y_mm", b.Y), DiaMM: fl(p+"dia_mm", b.Dia), Steel: b.Steel,
			FykMPa: fl(p+"fyk_mpa", b.Fyk), PrestressMPa: fl(p+"prestress_mpa", b.Prestress), AreaMM2: fl(p+"area_mm2", b.Area),
		})
	}
	for _, face := range []string{"bottom", "left", "right", "top"} {
		if f.Exposed[face] {
			m.Exposed = append(m.Exposed, face)
		}
	}
	if m.Exposed == nil {
		m.Exposed = []string{}
	}
	if f.Curve != "" {
		fi := &assess.Fire{Curve: f.Curve, DurationMin: fl("fire.duration_min", f.Duration),
			CoolingRateCPerMin: fl("fire.cooling_rate_c_per_min", f.Cooling)}
		if f.Curve == assess.CurveParametric {
			fi.Parametric = &assess.ParametricFire{
				OpeningFactorM05: fl("fire.parametric.opening_factor_m05", f.ParamO),
				BJM2S05K:         fl("fire.parametric.b_j_m2s05k", f.ParamB),
				FireLoadMJM2:     fl("fire.parametric.fire_load_mj_m2", f.ParamQ),
				Growth:           f.ParamGrowth,
			}
		}
		if f.Curve == assess.CurveTabulated {
			for n, line := range strings.Split(f.Points, "\n") {
				line = strings.TrimSpace(line)
				if line == "" {
					continue
				}
				parts := strings.FieldsFunc(line, func(r rune) bool { return r == ',' || r == ';' || r == '\t' || r == ' ' })
				if len(parts) != 2 {
					prob.Addf("fire.points", "line %d must be two numbers, minutes and °C, got %q", n+1, line)
					continue
				}
				t, e1 := strconv.ParseFloat(parts[0], 64)
				c, e2 := strconv.ParseFloat(parts[1], 64)
				if e1 != nil || e2 != nil {
					prob.Addf("fire.points", "line %d must be two numbers, minutes and °C, got %q", n+1, line)
					continue
				}
				fi.Points = append(fi.Points, [2]float64{t, c})
			}
		}
		for i, s := range f.Progressive {
			p := fmt.Sprintf("fire.spalling[%d].", i)
			fi.Spalling = append(fi.Spalling, assess.ProgressiveSpall{Face: s.Face, StartMin: fl(p+"start_min", s.Start),
				RateMMPerMin: fl(p+"rate_mm_per_min", s.Rate), MaxDepthMM: fl(p+"max_depth_mm", s.Max)})
		}
		in.Fire = fi
	}
	ticked := false
	for _, l := range f.Layers {
		ticked = ticked || l.Exposed
	}
	if len(f.Colour) > 0 || len(f.Spalls) > 0 || f.EvidenceNotes != "" || ticked || (f.ExposedBarsListed && len(f.Layers) > 0) {
		ev := &assess.Evidence{Notes: f.EvidenceNotes}
		// evidence.exposed_bars must have one entry per layer (or be absent): it is built from the
		// layer rows themselves, and sent when a box is ticked or the stored input listed it.
		if ticked || f.ExposedBarsListed {
			ev.ExposedBars = make([]bool, len(f.Layers))
			for i, l := range f.Layers {
				ev.ExposedBars[i] = l.Exposed
			}
		}
		for i, c := range f.Colour {
			p := fmt.Sprintf("evidence.colour_depths[%d].", i)
			ev.ColourDepths = append(ev.ColourDepths, assess.ColourDepth{Face: c.Face,
				IsothermC: fl(p+"isotherm_c", c.Isotherm), DepthMM: fl(p+"depth_mm", c.Depth), SdMM: fl(p+"sd_mm", c.Sd)})
		}
		for i, s := range f.Spalls {
			p := fmt.Sprintf("evidence.spalling[%d].", i)
			ev.Spalling = append(ev.Spalling, assess.MeasuredSpall{Face: s.Face, DepthMM: fl(p+"depth_mm", s.Depth),
				FromMM: fl(p+"from_mm", s.From), ToMM: fl(p+"to_mm", s.To)})
		}
		in.Evidence = ev
	}
	in.Demand = assess.Demand{SaggingKNm: fl("demand.sagging_knm", f.Sagging), HoggingKNm: fl("demand.hogging_knm", f.Hogging),
		AxialKN: fl("demand.axial_kn", f.Axial)}
	in.Options = assess.Options{CellMM: fl("options.cell_mm", f.CellMM), ConcreteModel: f.ConcreteModel, SteelModel: f.SteelModel,
		GammaC: fl("options.gamma_c", f.GammaC), GammaS: fl("options.gamma_s", f.GammaS), AlphaCC: fl("options.alpha_cc", f.AlphaCC)}
	if f.FitFamily != "" {
		in.Options.Fit = &assess.FitOptions{Family: f.FitFamily, OpeningFactorM05: fl("options.fit.opening_factor_m05", f.FitO),
			BJM2S05K: fl("options.fit.b_j_m2s05k", f.FitB), Growth: f.FitGrowth}
	}
	if len(prob.Problems) > 0 {
		return in, &prob
	}
	return in, nil
}

// inputJSON encodes an input as the stored member JSON.
func inputJSON(in assess.Input) (json.RawMessage, error) {
	b, err := json.Marshal(in)
	if err != nil {
		return nil, fmt.Errorf("encode member input: %w", err)
	}
	return b, nil
}

// hasErrorUnder reports whether a field whose name starts with prefix has a message, so that a
// collapsed section holding it is shown open.
func hasErrorUnder(errs map[string]string, prefix string) bool {
	for k, msg := range errs {
		if msg != "" && strings.HasPrefix(k, prefix) {
			return true
		}
	}
	return false
}

// fieldID turns a JSON-path field name into an HTML id ("member.layers[0].cover_mm" →
// "member-layers-0-cover_mm").
func fieldID(name string) string {
	r := strings.NewReplacer(".", "-", "[", "-", "]", "")
	return r.Replace(name)
}
