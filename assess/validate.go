package assess

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"reflect"
	"slices"
	"strconv"
	"strings"
)

// MaxInputBytes bounds the size of one JSON input read by Decode.
const MaxInputBytes = 4 << 20

// Limits that bound the computation of one assessment.
const (
	maxBars         = 200     // steel fibres of one section
	maxCells        = 120_000 // thermal cells (= concrete fibres) of one section
	maxObservations = 20      // colour-change depths
	maxFirePoints   = 2000    // tabulated fire points
	maxSpalls       = 20      // spalls per list
)

// Decode reads one JSON assessment input from r, rejects unknown fields and
// values of the wrong type (naming each by its JSON path), applies the
// defaults (Normalize) and validates every value (Validate). Problems with
// the input are returned as *InvalidError (errors.Is(err, ErrInvalid)).
func Decode(r io.Reader) (Input, error) {
	data, err := io.ReadAll(io.LimitReader(r, MaxInputBytes+1))
	if err != nil {
		return Input{}, fmt.Errorf("read input: %w", err)
	}
	return DecodeBytes(data)
}

// DecodeBytes is Decode on a byte slice.
func DecodeBytes(data []byte) (Input, error) {
	var in Input
	probs := &InvalidError{}
	if len(data) > MaxInputBytes {
		probs.Addf("", "input is larger than %d bytes (accepted: at most %d bytes)", MaxInputBytes, MaxInputBytes)
		return in, probs
	}
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.UseNumber()
	var raw any
	if err := dec.Decode(&raw); err != nil {
		probs.Addf("", "not valid JSON: %s (accepted: one JSON object)", cleanJSONError(err))
		return in, probs
	}
	if _, err := dec.Token(); !errors.Is(err, io.EOF) {
		probs.Add("", "unexpected data after the JSON object (accepted: exactly one JSON object)")
		return in, probs
	}
	if _, ok := raw.(map[string]any); !ok {
		probs.Add("", "the input must be a JSON object (accepted: {\"member\": …, \"fire\": …, …})")
		return in, probs
	}
	walkJSON(raw, reflect.TypeOf(in), "", probs)
	if err := probs.Err(); err != nil {
		return in, err
	}
	strict := json.NewDecoder(bytes.NewReader(data))
	strict.DisallowUnknownFields()
	if err := strict.Decode(&in); err != nil {
		probs.Addf("", "cannot decode: %s (accepted: the documented input keys and types)", cleanJSONError(err))
		return in, probs
	}
	in.Normalize()
	if err := in.check(); err != nil {
		return in, err
	}
	return in, nil
}

func cleanJSONError(err error) string {
	return strings.TrimPrefix(err.Error(), "json: ")
}

// walkJSON checks a generic JSON value against the Go type it will be
// decoded into: unknown keys (exact, case-sensitive match required), wrong
// kinds and unrepresentable numbers are reported with their path.
func walkJSON(v any, t reflect.Type, path string, probs *InvalidError) {
	if t.Kind() == reflect.Pointer {
		if v == nil {
			return
		}
		t = t.Elem()
	}
	if v == nil {
		return // null leaves the zero value, as encoding/json does
	}
	name := func() string {
		if path == "" {
			return "(input)"
		}
		return path
	}
	switch t.Kind() {
	case reflect.Struct:
		obj, ok := v.(map[string]any)
		if !ok {
			probs.Add(name(), "must be an object (accepted: {…} with the documented keys)")
			return
		}
		fields := map[string]reflect.StructField{}
		var known []string
		for i := 0; i < t.NumField(); i++ {
			f := t.Field(i)
			tag := strings.Split(f.Tag.Get("json"), ",")[0]
			if tag == "" || tag == "-" {
				continue
			}
			fields[tag] = f
			known = append(known, tag)
		}
		keys := make([]string, 0, len(obj))
		for k := range obj {
			keys = append(keys, k)
		}
		slices.Sort(keys)
		for _, k := range keys {
			p := k
			if path != "" {
				p = path + "." + k
			}
			f, ok := fields[k]
			if !ok {
				probs.Addf(p, "unknown field (accepted: %s)", strings.Join(known, ", "))
				continue
			}
			walkJSON(obj[k], f.Type, p, probs)
		}
	case reflect.Slice, reflect.Array:
		arr, ok := v.([]any)
		if !ok {
			probs.Add(name(), "must be a list (accepted: [ … ])")
			return
		}
		if t.Kind() == reflect.Array && len(arr) != t.Len() {
			probs.Addf(name(), "must have exactly %d elements, got %d (accepted: [time_min, temperature_c])", t.Len(), len(arr))
			return
		}
		if len(arr) > 10000 {
			probs.Addf(name(), "has %d elements (accepted: at most 10000)", len(arr))
			return
		}
		for i, e := range arr {
			walkJSON(e, t.Elem(), fmt.Sprintf("%s[%d]", path, i), probs)
		}
	case reflect.String:
		if _, ok := v.(string); !ok {
			probs.Add(name(), "must be a string (accepted: text in double quotes)")
		}
	case reflect.Bool:
		if _, ok := v.(bool); !ok {
			probs.Add(name(), "must be true or false (accepted: true | false)")
		}
	case reflect.Float64:
		n, ok := v.(json.Number)
		if !ok {
			probs.Add(name(), "must be a number (accepted: a JSON number)")
			return
		}
		f, err := strconv.ParseFloat(string(n), 64)
		if err != nil || math.IsInf(f, 0) || math.IsNaN(f) {
			probs.Addf(name(), "number %s cannot be represented (accepted: a finite number)", string(n))
		}
	case reflect.Int:
		n, ok := v.(json.Number)
		if !ok {
			probs.Add(name(), "must be a whole number (accepted: an integer)")
			return
		}
		if _, err := strconv.ParseInt(string(n), 10, 32); err != nil {
			probs.Addf(name(), "must be a whole number, got %s (accepted: an integer)", string(n))
		}
	}
}

// Normalize applies the documented defaults in place. It copies the slices
// it changes, so an Input sharing slices with another is not altered through them.
func (in *Input) Normalize() {
	m := &in.Member
	if m.Kind == KindSlab && m.WidthMM == 0 {
		m.WidthMM = 1000
	}
	if m.Concrete.Aggregate == "" {
		m.Concrete.Aggregate = "siliceous"
	}
	if m.Concrete.MoisturePct == nil {
		u := 1.5
		m.Concrete.MoisturePct = &u
	} else {
		u := *m.Concrete.MoisturePct
		m.Concrete.MoisturePct = &u
	}
	if m.Concrete.Conductivity == "" {
		m.Concrete.Conductivity = "lower"
	}
	m.Layers = slices.Clone(m.Layers)
	for i := range m.Layers {
		if m.Layers[i].Steel == "" {
			m.Layers[i].Steel = SteelHotRolled
		}
	}
	m.Bars = slices.Clone(m.Bars)
	for i := range m.Bars {
		if m.Bars[i].Steel == "" {
			m.Bars[i].Steel = SteelHotRolled
		}
	}
	if m.Exposed == nil {
		if m.Kind == KindSlab {
			m.Exposed = []string{"bottom"}
		} else {
			m.Exposed = []string{"bottom", "left", "right"}
		}
	} else {
		m.Exposed = slices.Clone(m.Exposed)
	}
	if in.Fire != nil {
		f := *in.Fire
		if f.Parametric != nil {
			p := *f.Parametric
			if p.Growth == "" {
				p.Growth = "medium"
			}
			f.Parametric = &p
		}
		f.Points = slices.Clone(f.Points)
		f.Spalling = slices.Clone(f.Spalling)
		in.Fire = &f
	}
	if in.Evidence != nil {
		e := *in.Evidence
		e.ColourDepths = slices.Clone(e.ColourDepths)
		for i := range e.ColourDepths {
			if e.ColourDepths[i].IsothermC == 0 {
				e.ColourDepths[i].IsothermC = 300
			}
			if e.ColourDepths[i].SdMM == 0 {
				e.ColourDepths[i].SdMM = 5
			}
		}
		e.Spalling = slices.Clone(e.Spalling)
		e.ExposedBars = slices.Clone(e.ExposedBars)
		in.Evidence = &e
	}
	o := &in.Options
	if o.CellMM == 0 {
		o.CellMM = 5
	}
	if o.ConcreteModel == "" {
		o.ConcreteModel = ConcreteEN1994AnnexC
	}
	if o.SteelModel == "" {
		o.SteelModel = SteelResidualByClass
	}
	if o.GammaC == 0 {
		o.GammaC = 1.5
	}
	if o.GammaS == 0 {
		o.GammaS = 1.15
	}
	if o.AlphaCC == 0 {
		o.AlphaCC = 1.0
	}
	if o.Fit != nil {
		f := *o.Fit
		o.Fit = &f
	} else if in.Evidence != nil && len(in.Evidence.ColourDepths) > 0 {
		o.Fit = &FitOptions{}
	}
	if o.Fit != nil {
		if o.Fit.Family == "" {
			o.Fit.Family = FitStandard
		}
		if o.Fit.Family == FitParametric && o.Fit.Growth == "" {
			o.Fit.Growth = "medium"
		}
	}
}

// Validate reports every problem of the input (after applying the defaults to
// a copy) as *InvalidError, or nil if the input can be assessed.
func (in Input) Validate() error {
	in.Normalize()
	return in.check()
}

// checker collects problems with ranges in a uniform wording.
type checker struct{ p *InvalidError }

func fmtNum(v float64) string { return strconv.FormatFloat(v, 'g', 6, 64) }

// rng checks lo ≤ v ≤ hi.
func (c checker) rng(path string, v, lo, hi float64, unit string) bool {
	if v < lo || v > hi || math.IsNaN(v) {
		c.p.Addf(path, "out of range, got %s (accepted: %s–%s%s)", fmtNum(v), fmtNum(lo), fmtNum(hi), unitSuffix(unit))
		return false
	}
	return true
}

// rngOrZero checks v == 0 or lo ≤ v ≤ hi.
func (c checker) rngOrZero(path string, v, lo, hi float64, unit, zeroMeans string) bool {
	if v == 0 {
		return true
	}
	if v < lo || v > hi {
		c.p.Addf(path, "out of range, got %s (accepted: 0 for %s, or %s–%s%s)", fmtNum(v), zeroMeans, fmtNum(lo), fmtNum(hi), unitSuffix(unit))
		return false
	}
	return true
}

func unitSuffix(u string) string {
	if u == "" {
		return ""
	}
	return " " + u
}

func (c checker) oneOf(path, v string, allowed ...string) bool {
	if !slices.Contains(allowed, v) {
		c.p.Addf(path, "unknown value %q (accepted: %s)", v, strings.Join(allowed, " | "))
		return false
	}
	return true
}

func (c checker) add(path, format string, args ...any) { c.p.Addf(path, format, args...) }

// check validates a normalised input.
func (in *Input) check() error {
	c := checker{&InvalidError{}}
	m := &in.Member
	geomOK := in.checkMember(c)
	exposed := map[string]bool{}
	for _, f := range m.Exposed {
		exposed[f] = true
	}
	if in.Fire != nil {
		in.checkFire(c, exposed, geomOK)
	}
	if in.Evidence != nil {
		in.checkEvidence(c, exposed, geomOK)
	}
	if (in.Fire != nil || in.Evidence != nil) && len(m.Exposed) == 0 {
		c.add("member.exposed", "no exposed face although a fire or evidence is given (accepted: one or more of %s)", strings.Join(m.faces(), ", "))
	}
	perM := ""
	if m.Kind == KindSlab {
		perM = " per metre width"
	}
	c.rng("demand.sagging_knm", in.Demand.SaggingKNm, 0, 100000, "kN·m"+perM)
	c.rng("demand.hogging_knm", in.Demand.HoggingKNm, 0, 100000, "kN·m"+perM)
	c.rng("demand.axial_kn", in.Demand.AxialKN, -100000, 100000, "kN"+perM+" (compression positive)")
	in.checkOptions(c, geomOK)
	return c.p.Err()
}

func (in *Input) checkMember(c checker) bool {
	m := &in.Member
	ok := true
	if !c.oneOf("member.kind", m.Kind, KindBeam, KindSlab) {
		return false
	}
	if len([]rune(m.Label)) > 200 {
		c.add("member.label", "has %d characters (accepted: at most 200)", len([]rune(m.Label)))
	}
	slab := m.Kind == KindSlab
	if slab {
		ok = c.rng("member.width_mm", m.WidthMM, 100, 10000, "mm (analysed slab width)") && ok
		ok = c.rng("member.depth_mm", m.DepthMM, 50, 1000, "mm") && ok
		if m.FlangeWidthMM != 0 {
			c.add("member.flange_width_mm", "a slab has no flange, got %s (accepted: 0)", fmtNum(m.FlangeWidthMM))
			ok = false
		}
		if m.FlangeDepthMM != 0 {
			c.add("member.flange_depth_mm", "a slab has no flange, got %s (accepted: 0)", fmtNum(m.FlangeDepthMM))
			ok = false
		}
		if m.LinkDiaMM != 0 {
			c.add("member.link_dia_mm", "a slab has no links, got %s (accepted: 0)", fmtNum(m.LinkDiaMM))
			ok = false
		}
	} else {
		ok = c.rng("member.width_mm", m.WidthMM, 100, 2000, "mm (web width)") && ok
		ok = c.rng("member.depth_mm", m.DepthMM, 100, 3000, "mm") && ok
		ok = c.rngOrZero("member.link_dia_mm", m.LinkDiaMM, 4, 20, "mm", "no links") && ok
		if m.FlangeWidthMM != 0 || m.FlangeDepthMM != 0 {
			if m.FlangeWidthMM <= m.WidthMM || m.FlangeWidthMM > 6000 {
				c.add("member.flange_width_mm", "got %s (accepted: 0 for a rectangle, or more than the web width %s up to 6000 mm)", fmtNum(m.FlangeWidthMM), fmtNum(m.WidthMM))
				ok = false
			}
			hi := m.DepthMM - 50
			if m.FlangeDepthMM < 40 || m.FlangeDepthMM > hi {
				c.add("member.flange_depth_mm", "got %s (accepted: 0 for a rectangle, or 40–%s mm: at least 50 mm of web below the flange)", fmtNum(m.FlangeDepthMM), fmtNum(math.Max(hi, 40)))
				ok = false
			}
		}
	}
	cc := m.Concrete
	c.rng("member.concrete.fck_mpa", cc.FckMPa, 12, 90, "MPa")
	c.oneOf("member.concrete.aggregate", cc.Aggregate, "siliceous", "calcareous", "lightweight")
	if cc.MoisturePct != nil {
		c.rng("member.concrete.moisture_pct", *cc.MoisturePct, 0, 4, "% by weight")
	}
	c.oneOf("member.concrete.conductivity", cc.Conductivity, "lower", "upper")

	for i, f := range m.Exposed {
		p := fmt.Sprintf("member.exposed[%d]", i)
		if slab && (f == "left" || f == "right") {
			c.add(p, "a slab has no %s face (accepted: bottom, top for a slab)", f)
			continue
		}
		if c.oneOf(p, f, m.faces()...) && slices.Index(m.Exposed, f) != i {
			c.add(p, "face %q listed twice (accepted: each face once)", f)
		}
	}

	if len(m.Layers) == 0 && len(m.Bars) == 0 {
		c.add("member.layers", "no reinforcement given (accepted: at least one layer or bar)")
	}
	nbars := 0
	for i, l := range m.Layers {
		p := fmt.Sprintf("member.layers[%d]", i)
		c.oneOf(p+".face", l.Face, "bottom", "top")
		dOK := c.rng(p+".dia_mm", l.DiaMM, 4, 50, "mm")
		steelOK := c.checkSteel(p, l.Steel, l.FykMPa, l.PrestressMPa)
		_ = steelOK
		if dOK {
			c.checkArea(p, l.AreaMM2, l.DiaMM)
		}
		covOK := c.rng(p+".cover_mm", l.CoverMM, 5, 200, "mm")
		if covOK && dOK && ok {
			hiCover := m.DepthMM/2 - m.LinkDiaMM - l.DiaMM
			if m.isT() && l.Face == "bottom" {
				hiCover = math.Min(hiCover, (m.DepthMM-m.FlangeDepthMM)-m.LinkDiaMM-l.DiaMM)
			}
			if l.CoverMM > hiCover {
				c.add(p+".cover_mm", "cover %s mm puts the bars past mid-depth of a %s mm deep member (accepted: 5–%s mm for %s mm bars%s)",
					fmtNum(l.CoverMM), fmtNum(m.DepthMM), fmtNum(math.Max(hiCover, 5)), fmtNum(l.DiaMM), linkNote(m.LinkDiaMM))
				covOK = false
			}
		}
		if slab {
			if l.Count != 0 {
				c.add(p+".count", "a slab layer is given by spacing_mm, got count %d (accepted: 0 or absent)", l.Count)
			}
			if c.rng(p+".spacing_mm", l.SpacingMM, 50, 500, "mm") && dOK && l.SpacingMM < l.DiaMM {
				c.add(p+".spacing_mm", "spacing %s mm is less than the bar diameter (accepted: ≥ %s mm)", fmtNum(l.SpacingMM), fmtNum(l.DiaMM))
			}
			nbars++
		} else {
			if l.SpacingMM != 0 {
				c.add(p+".spacing_mm", "a beam layer is given by count, got spacing_mm %s (accepted: 0 or absent)", fmtNum(l.SpacingMM))
			}
			if l.Count < 1 || l.Count > 50 {
				c.add(p+".count", "out of range, got %d (accepted: 1–50 bars)", l.Count)
			} else if covOK && dOK && ok {
				x0, x1 := m.layerSpan(l)
				span := x1 - x0
				maxN := 1
				if span >= 0 {
					maxN = 1 + int(math.Floor(span/l.DiaMM+1e-9))
				}
				if span < 0 {
					c.add(p+".count", "the side covers leave no room for %s mm bars (accepted: a smaller cover or bar)", fmtNum(l.DiaMM))
				} else if l.Count > maxN {
					c.add(p+".count", "%d bars of %s mm do not fit between the side covers (accepted: 1–%d)", l.Count, fmtNum(l.DiaMM), maxN)
				}
			}
			nbars += l.Count
		}
	}
	for i, b := range m.Bars {
		p := fmt.Sprintf("member.bars[%d]", i)
		dOK := c.rng(p+".dia_mm", b.DiaMM, 4, 50, "mm")
		c.checkSteel(p, b.Steel, b.FykMPa, b.PrestressMPa)
		if dOK {
			c.checkArea(p, b.AreaMM2, b.DiaMM)
		}
		xOK := c.rng(p+".x_mm", b.XMM, 0, math.Max(m.boxWidth(), 0), "mm")
		yOK := c.rng(p+".y_mm", b.YMM, 0, math.Max(m.DepthMM, 0), "mm")
		if ok && dOK && xOK && yOK && !m.inside(b.XMM, b.YMM, b.DiaMM/2) {
			c.add(p, "bar at (%s, %s) mm with diameter %s mm is not wholly inside the concrete section (accepted: inside the outline, x from the left edge%s, y from the bottom)",
				fmtNum(b.XMM), fmtNum(b.YMM), fmtNum(b.DiaMM), tNote(m))
		}
		nbars++
	}
	if nbars > maxBars {
		c.add("member.layers", "%d bars in all (accepted: at most %d)", nbars, maxBars)
	}
	return ok
}

func linkNote(link float64) string {
	if link == 0 {
		return ""
	}
	return fmt.Sprintf(" inside %s mm links", fmtNum(link))
}

func tNote(m *Member) string {
	if m.isT() {
		return " of the flange"
	}
	return ""
}

// checkArea checks a nominal area against the circle of the nominal
// diameter: a strand fills about 0.75 of it (EN 10138-3), a bar or wire all of it.
func (c checker) checkArea(p string, area, dia float64) {
	circle := math.Pi * dia * dia / 4
	c.rngOrZero(p+".area_mm2", area, 0.6*circle, 1.05*circle, "mm² (0.6–1.05·π·dia²/4 for a "+fmtNum(dia)+" mm bar or strand)", "π·dia²/4")
}

// checkSteel checks a bar's class, strength and prestress.
func (c checker) checkSteel(p, steel string, fyk, prestress float64) bool {
	if !c.oneOf(p+".steel", steel, SteelHotRolled, SteelQuenchedTempered, SteelColdWorked, SteelPrestressing) {
		return false
	}
	if steel == SteelPrestressing {
		if !c.rng(p+".fyk_mpa", fyk, 1000, 2100, "MPa (0.1 % proof strength of prestressing steel)") {
			return false
		}
		if prestress < 0 || prestress > 0.8*fyk {
			c.add(p+".prestress_mpa", "out of range, got %s (accepted: 0–%s MPa, at most 0.8·fyk)", fmtNum(prestress), fmtNum(0.8*fyk))
			return false
		}
		return true
	}
	if prestress != 0 {
		c.add(p+".prestress_mpa", "only prestressing steel carries a prestress, got %s (accepted: 0 or absent)", fmtNum(prestress))
	}
	return c.rng(p+".fyk_mpa", fyk, 200, 700, "MPa (reinforcing steel)")
}

func (in *Input) checkFire(c checker, exposed map[string]bool, geomOK bool) {
	f := in.Fire
	if !c.oneOf("fire.curve", f.Curve, CurveISO834, CurveASTME119, CurveHydrocarbon, CurveParametric, CurveTabulated) {
		return
	}
	switch f.Curve {
	case CurveISO834, CurveASTME119, CurveHydrocarbon:
		c.rng("fire.duration_min", f.DurationMin, 1, 480, "min (end of heating)")
		if f.Parametric != nil {
			c.add("fire.parametric", "only used with curve \"parametric\" (accepted: absent)")
		}
		if len(f.Points) > 0 {
			c.add("fire.points", "only used with curve \"tabulated\" (accepted: absent)")
		}
	case CurveParametric:
		if f.DurationMin != 0 {
			c.add("fire.duration_min", "the parametric fire sets its own heating and cooling, got %s (accepted: 0 or absent)", fmtNum(f.DurationMin))
		}
		if f.CoolingRateCPerMin != 0 {
			c.add("fire.cooling_rate_c_per_min", "the parametric fire has its own cooling branch, got %s (accepted: 0 or absent)", fmtNum(f.CoolingRateCPerMin))
		}
		if len(f.Points) > 0 {
			c.add("fire.points", "only used with curve \"tabulated\" (accepted: absent)")
		}
		if f.Parametric == nil {
			c.add("fire.parametric", "required with curve \"parametric\" (accepted: {opening_factor_m05, b_j_m2s05k, fire_load_mj_m2, growth})")
		} else {
			p := f.Parametric
			c.rng("fire.parametric.opening_factor_m05", p.OpeningFactorM05, 0.02, 0.20, "m^0.5")
			c.rng("fire.parametric.b_j_m2s05k", p.BJM2S05K, 100, 2200, "J/m²s^0.5K")
			c.rng("fire.parametric.fire_load_mj_m2", p.FireLoadMJM2, 50, 1000, "MJ/m² of total enclosure area")
			c.oneOf("fire.parametric.growth", p.Growth, "slow", "medium", "fast")
		}
	case CurveTabulated:
		if f.Parametric != nil {
			c.add("fire.parametric", "only used with curve \"parametric\" (accepted: absent)")
		}
		if len(f.Points) < 2 || len(f.Points) > maxFirePoints {
			c.add("fire.points", "has %d points (accepted: 2–%d points [min, °C])", len(f.Points), maxFirePoints)
		} else {
			for i, pt := range f.Points {
				p := fmt.Sprintf("fire.points[%d]", i)
				c.rng(p+"[0]", pt[0], 0, 4320, "min")
				c.rng(p+"[1]", pt[1], 0, 1400, "°C")
				if i == 0 && pt[0] != 0 {
					c.add(p+"[0]", "the first point must be at time 0, got %s (accepted: 0)", fmtNum(pt[0]))
				}
				if i > 0 && pt[0] <= f.Points[i-1][0] {
					c.add(p+"[0]", "time %s is not after the previous point's %s (accepted: strictly increasing times)", fmtNum(pt[0]), fmtNum(f.Points[i-1][0]))
				}
			}
			peakT, peak := 0.0, math.Inf(-1)
			for _, pt := range f.Points {
				if pt[1] > peak {
					peak, peakT = pt[1], pt[0]
				}
			}
			if f.DurationMin != 0 {
				c.rng("fire.duration_min", f.DurationMin, math.Min(1, peakT), math.Max(peakT, 1e-9), "min (a cut no later than the hottest tabulated point, or 0 to follow the points)")
			} else if last := f.Points[len(f.Points)-1]; last[1] > 21 {
				c.add(fmt.Sprintf("fire.points[%d][1]", len(f.Points)-1), "the tabulated curve ends at %s °C and never returns to ambient (accepted: a last point at 20 °C, or duration_min to cut the curve and cool it)", fmtNum(last[1]))
			}
		}
	}
	if f.Curve != CurveParametric {
		c.rngOrZero("fire.cooling_rate_c_per_min", f.CoolingRateCPerMin, 0.5, 100, "°C/min", "the EN 1991-1-2 Annex A rate")
	}
	if len(f.Spalling) > maxSpalls {
		c.add("fire.spalling", "has %d entries (accepted: at most %d)", len(f.Spalling), maxSpalls)
		return
	}
	for i, s := range f.Spalling {
		p := fmt.Sprintf("fire.spalling[%d]", i)
		in.checkFace(c, p+".face", s.Face, exposed)
		c.rng(p+".start_min", s.StartMin, 0, 480, "min")
		c.rng(p+".rate_mm_per_min", s.RateMMPerMin, 0.01, 20, "mm/min")
		if geomOK && slices.Contains(in.Member.faces(), s.Face) {
			c.rng(p+".max_depth_mm", s.MaxDepthMM, 1, in.Member.faceThickness(s.Face)/2, "mm (at most half the member's dimension normal to the face)")
		}
	}
}

// checkFace checks that a face exists on the member and was exposed.
func (in *Input) checkFace(c checker, path, face string, exposed map[string]bool) bool {
	m := &in.Member
	if m.Kind == KindSlab && (face == "left" || face == "right") {
		c.add(path, "a slab has no %s face (accepted: bottom, top for a slab)", face)
		return false
	}
	if !c.oneOf(path, face, m.faces()...) {
		return false
	}
	if !exposed[face] {
		c.add(path, "face %q is not in member.exposed (accepted: %s)", face, strings.Join(m.Exposed, ", "))
		return false
	}
	return true
}

func (in *Input) checkEvidence(c checker, exposed map[string]bool, geomOK bool) {
	e := in.Evidence
	m := &in.Member
	if len(e.ColourDepths) == 0 && in.Fire == nil {
		c.add("evidence.colour_depths", "without a fire scenario at least one colour-change depth is needed to reconstruct the temperatures (accepted: 1–%d observations, or give a fire)", maxObservations)
	}
	if len(e.ColourDepths) > maxObservations {
		c.add("evidence.colour_depths", "has %d observations (accepted: at most %d)", len(e.ColourDepths), maxObservations)
		return
	}
	for i, o := range e.ColourDepths {
		p := fmt.Sprintf("evidence.colour_depths[%d]", i)
		fOK := in.checkFace(c, p+".face", o.Face, exposed)
		c.rng(p+".isotherm_c", o.IsothermC, 100, 1000, "°C")
		c.rng(p+".sd_mm", o.SdMM, 0.5, 50, "mm")
		if fOK && geomOK {
			c.rng(p+".depth_mm", o.DepthMM, 0, m.faceThickness(o.Face), "mm from the face")
		} else {
			c.rng(p+".depth_mm", o.DepthMM, 0, 3000, "mm from the face")
		}
	}
	if len(e.Spalling) > maxSpalls {
		c.add("evidence.spalling", "has %d entries (accepted: at most %d)", len(e.Spalling), maxSpalls)
		return
	}
	for i, s := range e.Spalling {
		p := fmt.Sprintf("evidence.spalling[%d]", i)
		if !in.checkFace(c, p+".face", s.Face, exposed) || !geomOK {
			continue
		}
		c.rng(p+".depth_mm", s.DepthMM, 1, m.faceThickness(s.Face)/2, "mm (at most half the member's dimension normal to the face)")
		L := m.faceLength(s.Face)
		if s.FromMM != 0 || s.ToMM != 0 {
			a := c.rng(p+".from_mm", s.FromMM, 0, L, "mm along the face")
			b := c.rng(p+".to_mm", s.ToMM, 0, L, "mm along the face")
			if a && b && s.ToMM <= s.FromMM {
				c.add(p+".to_mm", "ends at %s, not after from_mm %s (accepted: from_mm < to_mm ≤ %s mm, or both 0 for the whole face)", fmtNum(s.ToMM), fmtNum(s.FromMM), fmtNum(L))
			}
		}
	}
	in.checkExposedBars(c, exposed)
	if len([]rune(e.Notes)) > 4000 {
		c.add("evidence.notes", "has %d characters (accepted: at most 4000)", len([]rune(e.Notes)))
	}
}

// checkExposedBars checks evidence.exposed_bars: one entry per layer, and a
// layer marked exposed must lie where an exposed face could have spalled to it.
func (in *Input) checkExposedBars(c checker, exposed map[string]bool) {
	e := in.Evidence
	m := &in.Member
	if len(e.ExposedBars) == 0 {
		return
	}
	if len(e.ExposedBars) != len(m.Layers) {
		c.add("evidence.exposed_bars", "has %d entries for %d layers (accepted: absent, or one true/false per member.layers entry, in the same order)", len(e.ExposedBars), len(m.Layers))
		return
	}
	for i, seen := range e.ExposedBars {
		if !seen {
			continue
		}
		faces := m.layerReachedFrom(m.Layers[i].Face)
		reached := false
		for _, f := range faces {
			reached = reached || exposed[f]
		}
		if !reached {
			c.add(fmt.Sprintf("evidence.exposed_bars[%d]", i), "layer %d (%s) can only be exposed through the %s face, which is not in member.exposed (accepted: false, or expose one of those faces)",
				i+1, m.Layers[i].Face, strings.Join(faces, " or "))
		}
	}
}

// layerReachedFrom lists the faces from which spalling can reach the bars of
// a layer on the given face: a slab's own face; a beam's own face or its web
// sides; a T-beam's top layer (in the flange) from the top or the flange
// soffit ("bottom").
func (m *Member) layerReachedFrom(face string) []string {
	switch {
	case m.Kind == KindSlab:
		return []string{face}
	case m.isT() && face == "top":
		return []string{"top", "bottom"}
	default:
		return []string{face, "left", "right"}
	}
}

func (in *Input) checkOptions(c checker, geomOK bool) {
	o := &in.Options
	m := &in.Member
	if c.rng("options.cell_mm", o.CellMM, 1, 25, "mm") && geomOK {
		nx := 1
		if m.Kind == KindBeam {
			nx = int(math.Ceil(m.boxWidth()/o.CellMM - 1e-9))
		}
		ny := int(math.Ceil(m.DepthMM/o.CellMM - 1e-9))
		if nx*ny > maxCells {
			c.add("options.cell_mm", "a %s mm cell gives %d cells (accepted: at most %d cells; use a larger cell, e.g. %s mm)",
				fmtNum(o.CellMM), nx*ny, maxCells, fmtNum(math.Ceil(math.Sqrt(m.boxWidth()*m.DepthMM/maxCells))))
		} else if ny < 6 {
			c.add("options.cell_mm", "a %s mm cell gives only %d cells through the %s mm depth (accepted: at least 6; use a smaller cell)", fmtNum(o.CellMM), ny, fmtNum(m.DepthMM))
		} else {
			in.checkGrid(c)
		}
	}
	c.oneOf("options.concrete_model", o.ConcreteModel, ConcreteEN1994AnnexC, ConcreteChang2006)
	c.oneOf("options.steel_model", o.SteelModel, SteelResidualByClass, SteelHotStrength)
	c.rng("options.gamma_c", o.GammaC, 1.0, 2.0, "")
	c.rng("options.gamma_s", o.GammaS, 1.0, 1.5, "")
	c.rng("options.alpha_cc", o.AlphaCC, 0.8, 1.0, "")
	if o.Fit != nil {
		f := o.Fit
		if c.oneOf("options.fit.family", f.Family, FitStandard, FitParametric) && f.Family == FitParametric {
			c.rng("options.fit.opening_factor_m05", f.OpeningFactorM05, 0.02, 0.20, "m^0.5")
			c.rng("options.fit.b_j_m2s05k", f.BJM2S05K, 100, 2200, "J/m²s^0.5K")
			c.oneOf("options.fit.growth", f.Growth, "slow", "medium", "fast")
		} else if f.Family == FitStandard {
			if f.OpeningFactorM05 != 0 {
				c.add("options.fit.opening_factor_m05", "only used with family \"parametric\" (accepted: 0 or absent)")
			}
			if f.BJM2S05K != 0 {
				c.add("options.fit.b_j_m2s05k", "only used with family \"parametric\" (accepted: 0 or absent)")
			}
			if f.Growth != "" {
				c.add("options.fit.growth", "only used with family \"parametric\" (accepted: absent)")
			}
		}
	}
}

// checkGrid checks that the member survives its representation by whole
// cells: T-beam outstands and flange of at least one cell, every bar centre
// inside the cell outline.
func (in *Input) checkGrid(c checker) {
	m := &in.Member
	cell := in.Options.CellMM
	if m.Kind == KindBeam && m.WidthMM < 3*cell {
		c.add("options.cell_mm", "a %s mm cell leaves fewer than 3 cells across the %s mm web (accepted: at most %s mm)", fmtNum(cell), fmtNum(m.WidthMM), fmtNum(m.WidthMM/3))
		return
	}
	if m.isT() {
		if out := (m.FlangeWidthMM - m.WidthMM) / 2; math.Round(out/cell) < 1 {
			c.add("options.cell_mm", "the %s mm flange outstands are less than one %s mm cell (accepted: a cell of at most %s mm)", fmtNum(out), fmtNum(cell), fmtNum(out))
			return
		}
		if math.Round(m.FlangeDepthMM/cell) < 1 {
			c.add("options.cell_mm", "the %s mm flange is less than one %s mm cell deep (accepted: a cell of at most %s mm)", fmtNum(m.FlangeDepthMM), fmtNum(cell), fmtNum(m.FlangeDepthMM))
			return
		}
	}
	g := newGridGeom(m, cell)
	for _, b := range m.barSpecs() {
		x, y := g.mapPoint(b.XMM, b.YMM)
		i, j := 0, int(math.Floor(y/cell))
		if !g.slab {
			i = int(math.Floor(x / cell))
		}
		if !g.inOutline(i, j) || x <= 0 || y <= 0 || x >= g.widthMM || y >= g.heightMM {
			c.add("options.cell_mm", "with %s mm cells %s at (%s, %s) mm falls outside the section as represented by whole cells (accepted: a smaller cell, e.g. %s mm)",
				fmtNum(cell), b.Label, fmtNum(b.XMM), fmtNum(b.YMM), fmtNum(math.Max(1, math.Floor(cell/2))))
			return
		}
	}
}
