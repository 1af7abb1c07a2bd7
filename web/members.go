package web

import (
	"encoding/json"
	"errors"
	"fmt"
	"net/http"
	"sort"
	"strconv"
	"strings"

	"residuum/assess"
)

// editorFields lists the form field names the editor renders for f, so that validation problems
// can be placed beside their field.
func editorFields(f memberForm) map[string]bool {
	k := map[string]bool{}
	for _, n := range []string{"member.label", "location", "member.kind", "member.width_mm", "member.depth_mm",
		"member.flange_width_mm", "member.flange_depth_mm", "member.link_dia_mm", "member.concrete.fck_mpa",
		"member.concrete.aggregate", "member.concrete.moisture_pct", "member.concrete.conductivity", "member.layers",
		"member.exposed", "fire.curve", "fire.duration_min", "fire.cooling_rate_c_per_min",
		"fire.parametric.opening_factor_m05", "fire.parametric.b_j_m2s05k", "fire.parametric.fire_load_mj_m2",
		"fire.parametric.growth", "fire.points", "demand.sagging_knm", "demand.hogging_knm", "demand.axial_kn",
		"options.cell_mm", "options.concrete_model", "options.steel_model", "options.gamma_c", "options.gamma_s",
		"options.alpha_cc", "options.fit.family", "options.fit.opening_factor_m05", "options.fit.b_j_m2s05k",
		"options.fit.growth", "evidence.exposed_bars", "fire.spalling", "evidence.notes"} {
		k[n] = true
	}
	add := func(group string, n int, keys ...string) {
		for i := range n {
			for _, key := range keys {
				k[rowName(group, i, key)] = true
			}
		}
	}
	add("member.layers", len(f.Layers), "face", "cover_mm", "count", "spacing_mm", "dia_mm", "steel", "fyk_mpa", "prestress_mpa", "area_mm2")
	add("member.bars", len(f.Bars), "x_mm", "y_mm", "dia_mm", "steel", "fyk_mpa", "prestress_mpa", "area_mm2")
	add("fire.spalling", len(f.Progressive), "face", "start_min", "rate_mm_per_min", "max_depth_mm")
	for i := range f.Layers {
		k[exposedBarsName(i)] = true
	}
	add("evidence.colour_depths", len(f.Colour), "face", "isotherm_c", "depth_mm", "sd_mm")
	add("evidence.spalling", len(f.Spalls), "face", "depth_mm", "from_mm", "to_mm")
	return k
}

// placeProblems maps each problem's JSON path to the editor field it concerns: the field itself,
// else the first field inside it ("member.bars[0]" → its x), else the nearest enclosing field
// ("member.exposed[1]" → "member.exposed"); problems with no field go to the summary only.
func placeProblems(f memberForm, inv *assess.InvalidError) (map[string]string, []fieldProblem) {
	known := editorFields(f)
	names := make([]string, 0, len(known))
	for n := range known {
		// a whole-row problem ("member.bars[0]") goes to a required field of the row, never to
		// the optional area that happens to sort first
		if !strings.HasSuffix(n, ".area_mm2") {
			names = append(names, n)
		}
	}
	sort.Strings(names)
	resolve := func(p string) string {
		if known[p] {
			return p
		}
		for _, n := range names {
			if strings.HasPrefix(n, p+".") {
				return n
			}
		}
		for q := p; q != ""; {
			i := strings.LastIndexAny(q, ".[")
			if i < 0 {
				break
			}
			q = q[:i]
			if known[q] {
				return q
			}
		}
		return ""
	}
	errs := map[string]string{}
	var sum []fieldProblem
	for _, p := range inv.Problems {
		field := p.Field
		// store validation of the record names its own fields
		switch field {
		case "label":
			field = "member.label"
		case "kind":
			field = "member.kind"
		}
		at := resolve(field)
		fp := fieldProblem{Field: field, Message: p.Message}
		if at != "" {
			fp.ID = fieldID(at)
			if errs[at] != "" {
				errs[at] += "; " + p.Message
			} else {
				errs[at] = p.Message
			}
		}
		if fp.Field == "" {
			fp.Field = "input"
		}
		sum = append(sum, fp)
	}
	return errs, sum
}

// validateForm builds the input from the form and validates it with the engine's own rules.
func validateForm(f memberForm) (assess.Input, []byte, *assess.InvalidError) {
	in, perr := f.toInput()
	var all assess.InvalidError
	if perr != nil {
		all.Problems = append(all.Problems, perr.Problems...)
	}
	if strings.TrimSpace(f.Label) == "" {
		all.Add("member.label", "is required (1–200 characters), e.g. B12")
	}
	raw, err := inputJSON(in)
	if err != nil {
		all.Add("", "the input could not be encoded")
		return in, nil, &all
	}
	if perr == nil {
		if _, err := assess.DecodeBytes(raw); err != nil {
			var inv *assess.InvalidError
			if errors.As(err, &inv) {
				all.Problems = append(all.Problems, inv.Problems...)
			} else {
				all.Add("", "the input could not be checked")
			}
		}
	}
	if len(all.Problems) > 0 {
		return in, raw, &all
	}
	return in, raw, nil
}

// lenientInput reads a stored member input without rejecting fields this version does not know,
// so an older or API-written member still opens in the editor.
func lenientInput(raw []byte) (assess.Input, error) {
	var in assess.Input
	if err := json.Unmarshal(raw, &in); err != nil {
		return in, fmt.Errorf("decode member input: %w", err)
	}
	return in, nil
}

func (s *server) projectFor(w http.ResponseWriter, r *http.Request) (*assess.Project, bool) {
	pid, err := idParam(r, "pid")
	if err != nil {
		s.serveError(w, r, err)
		return nil, false
	}
	p, err := s.Store.GetProject(r.Context(), pid)
	if err != nil {
		s.serveError(w, r, fmt.Errorf("get project %d: %w", pid, err))
		return nil, false
	}
	return p, true
}

// memberFor loads the project and member of the URL, answering 404 if the member belongs to
// another project.
func (s *server) memberFor(w http.ResponseWriter, r *http.Request) (*assess.Project, *assess.MemberRecord, bool) {
	p, ok := s.projectFor(w, r)
	if !ok {
		return nil, nil, false
	}
	mid, err := idParam(r, "mid")
	if err != nil {
		s.serveError(w, r, err)
		return nil, nil, false
	}
	m, err := s.Store.GetMember(r.Context(), mid)
	if err == nil && m.ProjectID != p.ID {
		err = fmt.Errorf("member %d is not in project %d: %w", mid, p.ID, assess.ErrNotFound)
	}
	if err != nil {
		s.serveError(w, r, fmt.Errorf("get member %d: %w", mid, err))
		return nil, nil, false
	}
	return p, m, true
}

func (s *server) editor(p *assess.Project, m *assess.MemberRecord, f memberForm) editorView {
	v := editorView{ProjectID: p.ID, ProjectName: p.Name, Form: f,
		PreviewURL: projectURL(p.ID) + "/section.svg"}
	if m == nil {
		v.Title, v.Action, v.CancelURL = "New member", projectURL(p.ID)+"/members", projectURL(p.ID)
	} else {
		v.Title, v.Action, v.CancelURL = "Edit "+m.Label, memberURL(p.ID, m.ID), memberURL(p.ID, m.ID)
	}
	in, _ := f.toInput()
	v.SectionSVG = sectionPreview(geomFromInput(in))
	return v
}

func (s *server) handleMemberNew() http.HandlerFunc {
	return func(w http.ResponseWriter, r *http.Request) {
		p, ok := s.projectFor(w, r)
		if !ok {
			return
		}
		f := newMemberForm()
		if r.URL.Query().Get("kind") == "slab" {
			f.Kind, f.Width, f.Depth, f.LinkDia = "slab", "1000", "200", ""
			f.Layers = []layerForm{{Face: "bottom", Cover: "25", Spacing: "150", Dia: "12", Steel: "hot-rolled", Fyk: "500"}}
			f.Exposed = map[string]bool{"bottom": true}
		}
		s.render(w, r, http.StatusOK, editorPage(s.editor(p, nil, f)))
	}
}

func (s *server) handleMemberEdit() http.HandlerFunc {
	return func(w http.ResponseWriter, r *http.Request) {
		p, m, ok := s.memberFor(w, r)
		if !ok {
			return
		}
		in, err := lenientInput(m.Input)
		if err != nil {
			s.serveError(w, r, fmt.Errorf("read member %d input: %w", m.ID, err))
			return
		}
		f := formFromInput(in, m.Label, m.Location, m.Version)
		s.render(w, r, http.StatusOK, editorPage(s.editor(p, m, f)))
	}
}

func (s *server) handleMemberCreate() http.HandlerFunc { return s.handleMemberSave(false) }
func (s *server) handleMemberUpdate() http.HandlerFunc { return s.handleMemberSave(true) }

// handleMemberSave serves the editor's buttons: add/remove a row and redraw re-render the form;
// save validates and stores the member (new or existing); run saves and then starts the
// assessment.
func (s *server) handleMemberSave(existing bool) http.HandlerFunc {
	return func(w http.ResponseWriter, r *http.Request) {
		var (
			p  *assess.Project
			m  *assess.MemberRecord
			ok bool
		)
		if existing {
			p, m, ok = s.memberFor(w, r)
		} else {
			p, ok = s.projectFor(w, r)
		}
		if !ok {
			return
		}
		if err := r.ParseForm(); err != nil {
			s.serveError(w, r, fmt.Errorf("parse member form: %v: %w", err, errBadRequest))
			return
		}
		f := parseMemberForm(r.PostForm)
		op := r.PostFormValue("op")
		if op != "save" && op != "run" {
			if !f.applyOp(op) {
				op = "save"
			} else {
				s.render(w, r, http.StatusOK, editorPage(s.editor(p, m, f)))
				return
			}
		}
		in, raw, inv := validateForm(f)
		if inv != nil {
			s.renderInvalid(w, r, p, m, f, inv)
			return
		}
		rec := &assess.MemberRecord{ProjectID: p.ID, Label: f.Label, Location: f.Location, Kind: in.Member.Kind, Input: raw}
		var err error
		if existing {
			rec.ID, rec.Version = m.ID, f.Version
			err = s.Store.UpdateMember(r.Context(), rec)
		} else {
			err = s.Store.CreateMember(r.Context(), rec)
		}
		var sinv *assess.InvalidError
		switch {
		case errors.As(err, &sinv):
			s.renderInvalid(w, r, p, m, f, sinv)
			return
		case errors.Is(err, assess.ErrConflict) && existing:
			inv := &assess.InvalidError{}
			inv.Add("", "this member was changed by someone else since you opened it, or its project is closed; reload the editor to see the stored values")
			s.renderInvalid(w, r, p, m, f, inv)
			return
		case err != nil:
			s.serveError(w, r, fmt.Errorf("save member: %w", err))
			return
		}
		if op == "run" {
			j, err := s.startRun(p, rec)
			if err != nil {
				s.serveError(w, r, err)
				return
			}
			http.Redirect(w, r, "/jobs/"+j.ID, http.StatusSeeOther)
			return
		}
		http.Redirect(w, r, memberURL(p.ID, rec.ID), http.StatusSeeOther)
	}
}

func (s *server) renderInvalid(w http.ResponseWriter, r *http.Request, p *assess.Project, m *assess.MemberRecord, f memberForm, inv *assess.InvalidError) {
	f.Errors, _ = placeProblems(f, inv)
	v := s.editor(p, m, f)
	_, v.Summary = placeProblems(f, inv)
	s.render(w, r, http.StatusUnprocessableEntity, editorPage(v))
}

// handleSectionPreview answers the editor's live redraw: the section drawing for the posted form,
// as an SVG fragment.
func (s *server) handleSectionPreview() http.HandlerFunc {
	return func(w http.ResponseWriter, r *http.Request) {
		if _, err := idParam(r, "pid"); err != nil {
			s.serveError(w, r, err)
			return
		}
		if err := r.ParseForm(); err != nil {
			s.serveError(w, r, fmt.Errorf("parse member form: %v: %w", err, errBadRequest))
			return
		}
		f := parseMemberForm(r.PostForm)
		in, _ := f.toInput()
		w.Header().Set("Content-Type", "text/html; charset=utf-8")
		w.Header().Set("Cache-Control", "no-store")
		_, _ = w.Write([]byte(sectionPreview(geomFromInput(in))))
	}
}

func correctText(n int) string {
	if n == 1 {
		return "Please correct this entry"
	}
	return fmt.Sprintf("Please correct these %d entries", n)
}

// fieldNames are the editor's words for the input fields, by JSON path (row fields by their key).
var fieldNames = map[string]string{
	"member.label": "Label", "location": "Location", "member.kind": "Kind", "member.width_mm": "Width",
	"member.depth_mm": "Overall depth", "member.flange_width_mm": "Flange width", "member.flange_depth_mm": "Flange depth",
	"member.link_dia_mm": "Link diameter", "member.concrete.fck_mpa": "Concrete strength f_ck",
	"member.concrete.aggregate": "Aggregate", "member.concrete.moisture_pct": "Moisture",
	"member.concrete.conductivity": "Thermal conductivity", "member.layers": "Reinforcement", "member.bars": "Single bars",
	"member.exposed": "Exposed faces", "fire": "Fire scenario", "fire.curve": "Gas-temperature curve",
	"fire.duration_min": "Heating duration", "fire.cooling_rate_c_per_min": "Cooling rate",
	"fire.parametric.opening_factor_m05": "Opening factor", "fire.parametric.b_j_m2s05k": "Thermal absorptivity b",
	"fire.parametric.fire_load_mj_m2": "Fire load", "fire.parametric.growth": "Fire growth rate", "fire.points": "Tabulated points",
	"evidence": "Site evidence", "demand.sagging_knm": "Sagging moment", "demand.hogging_knm": "Hogging moment",
	"demand.axial_kn": "Axial force", "options.cell_mm": "Cell size", "options.gamma_c": "γ_c", "options.gamma_s": "γ_s",
	"options.alpha_cc": "α_cc", "options.fit.family": "Fire family fitted", "options.fit.opening_factor_m05": "Fit: opening factor",
	"options.fit.b_j_m2s05k": "Fit: thermal absorptivity b", "options.fit.growth": "Fit: growth rate",
	"options.concrete_model": "Residual concrete model", "options.steel_model": "Residual steel model",
	"evidence.exposed_bars": "Bars seen exposed on site", "fire.spalling": "Spalling during the fire",
	"evidence.notes": "Evidence notes",
}

var rowGroups = []struct{ Prefix, Name string }{
	{"member.layers[", "Layer"}, {"member.bars[", "Bar"}, {"member.exposed[", "Exposed face"},
	{"fire.spalling[", "Progressive spalling"}, {"evidence.colour_depths[", "Colour-change depth"},
	{"evidence.spalling[", "Spalling"}, {"fire.points[", "Fire point"},
	{"evidence.exposed_bars[", "Bars seen exposed on site, layer"},
}

var keyNames = map[string]string{
	"face": "face", "cover_mm": "cover", "count": "number of bars", "spacing_mm": "spacing", "dia_mm": "diameter",
	"steel": "steel class", "fyk_mpa": "f_yk", "prestress_mpa": "prestress", "x_mm": "x", "y_mm": "y",
	"isotherm_c": "isotherm", "depth_mm": "depth", "sd_mm": "standard deviation", "from_mm": "from", "to_mm": "to",
	"start_min": "start", "rate_mm_per_min": "rate", "max_depth_mm": "greatest depth", "area_mm2": "area",
}

// fieldLabel words a JSON path for the error summary ("member.layers[0].cover_mm" → "Layer 1 cover").
func fieldLabel(path string) string {
	if n, ok := fieldNames[path]; ok {
		return n
	}
	for _, g := range rowGroups {
		rest, ok := strings.CutPrefix(path, g.Prefix)
		if !ok {
			continue
		}
		idx, key, _ := strings.Cut(rest, "]")
		i, err := strconv.Atoi(idx)
		if err != nil {
			break
		}
		key = strings.TrimPrefix(key, ".")
		out := fmt.Sprintf("%s %d", g.Name, i+1)
		if key != "" {
			if k, ok := keyNames[key]; ok {
				key = k
			}
			out += " " + key
		}
		return out
	}
	return path
}
