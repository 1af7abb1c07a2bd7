package web

import (
	"fmt"
	"net/http"
	"strings"

	"residuum/assess"
)

func (s *server) handleMember() http.HandlerFunc {
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
		revs, err := s.Store.ListAssessments(r.Context(), m.ID, assess.Page{Limit: assess.MaxPageLimit})
		if err != nil {
			s.serveError(w, r, fmt.Errorf("list revisions of member %d: %w", m.ID, err))
			return
		}
		v := memberView{ProjectID: p.ID, ProjectName: p.Name, ID: m.ID, Label: m.Label, Location: m.Location, Kind: m.Kind,
			Updated: fmtDate(m.UpdatedAt), EditURL: memberURL(p.ID, m.ID) + "/edit", RunURL: memberURL(p.ID, m.ID) + "/run",
			CompareURL: memberURL(p.ID, m.ID) + "/compare", Closed: p.DeletedAt != nil,
			SectionSVG: sectionSVG(geomFromInput(in)), Inputs: inputGroups(in, m.Location)}
		if j := s.jobs.running(m.ID); j != nil {
			v.RunningURL = "/jobs/" + j.ID
		}
		for _, a := range revs {
			v.Revisions = append(v.Revisions, revisionRow{Rev: a.Revision, URL: revisionURL(p.ID, m.ID, a.Revision),
				State: string(a.State), Issued: a.State == assess.StateIssued, Created: fmtDate(a.CreatedAt),
				Sagging: fmtRatio(a.SaggingRatio), Hogging: fmtRatio(a.HoggingRatio), DamageClass: a.DamageClass,
				Action: actionName(a.Action), Method: a.MethodVersion})
		}
		s.render(w, r, http.StatusOK, memberPage(v))
	}
}

// withUnit formats a number with its unit, or the default text when the value was left blank.
func withUnit(v float64, unit, blank string) string {
	if v == 0 {
		return blank
	}
	return fmtInput(v) + " " + unit
}

// areaNote words a bar's given cross-section area (0 = π·d²/4, not mentioned).
func areaNote(a float64) string {
	if a == 0 {
		return ""
	}
	return ", area " + fmtInput(a) + " mm² each"
}

// inputGroups lists the inputs as entered (not normalised), grouped as in the editor.
func inputGroups(in assess.Input, location string) []inputGroup {
	m := in.Member
	shape := "rectangle"
	switch {
	case m.Kind == assess.KindSlab:
		shape = "slab strip"
	case m.FlangeWidthMM > 0 && m.FlangeDepthMM > 0:
		shape = "T-beam"
	}
	geo := inputGroup{Title: "Member", Rows: []inputRow{
		{"Label", m.Label}, {"Location", location}, {"Kind", m.Kind + " (" + shape + ")"},
		{"Width", withUnit(m.WidthMM, "mm", "1000 mm (default)")},
		{"Overall depth", withUnit(m.DepthMM, "mm", "–")},
	}}
	if shape == "T-beam" {
		geo.Rows = append(geo.Rows, inputRow{"Flange", fmt.Sprintf("%s × %s mm", fmtInput(m.FlangeWidthMM), fmtInput(m.FlangeDepthMM))})
	}
	if m.LinkDiaMM > 0 {
		geo.Rows = append(geo.Rows, inputRow{"Link diameter", withUnit(m.LinkDiaMM, "mm", "")})
	}
	moist := "1.5 % (default)"
	if m.Concrete.MoisturePct != nil {
		moist = fmtInput(*m.Concrete.MoisturePct) + " %"
	}
	geo.Rows = append(geo.Rows,
		inputRow{"Concrete", fmt.Sprintf("f_ck %s MPa, %s aggregate, moisture %s, %s conductivity", fmtInput(m.Concrete.FckMPa),
			orDefault(m.Concrete.Aggregate, "siliceous"), moist, orDefault(m.Concrete.Conductivity, "lower"))})
	for i, l := range m.Layers {
		bars := fmt.Sprintf("%d × %s mm", l.Count, fmtInput(l.DiaMM))
		if m.Kind == assess.KindSlab {
			bars = fmt.Sprintf("%s mm at %s mm", fmtInput(l.DiaMM), fmtInput(l.SpacingMM))
		}
		geo.Rows = append(geo.Rows, inputRow{fmt.Sprintf("Layer %d", i+1),
			fmt.Sprintf("%s, %s, cover %s mm, %s, f_yk %s MPa%s", l.Face, bars, fmtInput(l.CoverMM), orDefault(l.Steel, "hot-rolled"), fmtInput(l.FykMPa), areaNote(l.AreaMM2))})
	}
	for i, b := range m.Bars {
		geo.Rows = append(geo.Rows, inputRow{fmt.Sprintf("Bar %d", i+1),
			fmt.Sprintf("Ø%s mm at x %s, y %s mm, %s, f_yk %s MPa%s", fmtInput(b.DiaMM), fmtInput(b.XMM), fmtInput(b.YMM), orDefault(b.Steel, "hot-rolled"), fmtInput(b.FykMPa), areaNote(b.AreaMM2))})
	}
	exp := strings.Join(m.Exposed, ", ")
	if exp == "" {
		exp = "default (beam: bottom, left, right; slab: bottom)"
	}
	geo.Rows = append(geo.Rows, inputRow{"Exposed faces", exp})
	out := []inputGroup{geo}

	fire := inputGroup{Title: "Fire"}
	if f := in.Fire; f == nil {
		fire.Rows = append(fire.Rows, inputRow{"Scenario", "not given: fitted to the site evidence"})
	} else {
		fire.Rows = append(fire.Rows, inputRow{"Curve", curveName(f.Curve)})
		if f.DurationMin > 0 {
			fire.Rows = append(fire.Rows, inputRow{"Heating duration", fmtInput(f.DurationMin) + " min"})
		}
		fire.Rows = append(fire.Rows, inputRow{"Cooling rate", withUnit(f.CoolingRateCPerMin, "°C/min", "EN 1991-1-2 Annex A rate (default)")})
		if p := f.Parametric; p != nil {
			fire.Rows = append(fire.Rows, inputRow{"Parametric fire", fmt.Sprintf("O = %s m^0.5, b = %s J/m²s^0.5K, q_t,d = %s MJ/m², growth %s",
				fmtInput(p.OpeningFactorM05), fmtInput(p.BJM2S05K), fmtInput(p.FireLoadMJM2), orDefault(p.Growth, "medium"))})
		}
		if len(f.Points) > 0 {
			fire.Rows = append(fire.Rows, inputRow{"Tabulated points", fmt.Sprintf("%d points, %s–%s min", len(f.Points), fmtInput(f.Points[0][0]), fmtInput(f.Points[len(f.Points)-1][0]))})
		}
		for i, sp := range f.Spalling {
			fire.Rows = append(fire.Rows, inputRow{fmt.Sprintf("Progressive spalling %d", i+1),
				fmt.Sprintf("%s face from %s min at %s mm/min, up to %s mm", sp.Face, fmtInput(sp.StartMin), fmtInput(sp.RateMMPerMin), fmtInput(sp.MaxDepthMM))})
		}
	}
	out = append(out, fire)

	ev := inputGroup{Title: "Site evidence"}
	if e := in.Evidence; e == nil {
		ev.Rows = append(ev.Rows, inputRow{"Evidence", "none entered"})
	} else {
		for i, c := range e.ColourDepths {
			iso := c.IsothermC
			if iso == 0 {
				iso = 300
			}
			sd := c.SdMM
			if sd == 0 {
				sd = 5
			}
			ev.Rows = append(ev.Rows, inputRow{fmt.Sprintf("Colour-change depth %d", i+1),
				fmt.Sprintf("%s face: %s °C at %s mm (± %s mm)", c.Face, fmtInput(iso), fmtInput(c.DepthMM), fmtInput(sd))})
		}
		for i, sp := range e.Spalling {
			where := "whole face"
			if sp.FromMM != 0 || sp.ToMM != 0 {
				where = fmt.Sprintf("%s–%s mm along the face", fmtInput(sp.FromMM), fmtInput(sp.ToMM))
			}
			ev.Rows = append(ev.Rows, inputRow{fmt.Sprintf("Spalling %d", i+1), fmt.Sprintf("%s face, %s mm deep, %s", sp.Face, fmtInput(sp.DepthMM), where)})
		}
		var seen []string
		for i, on := range e.ExposedBars {
			if on {
				seen = append(seen, fmt.Sprintf("layer %d", i+1))
			}
		}
		if len(seen) > 0 {
			ev.Rows = append(ev.Rows, inputRow{"Bars seen exposed on site", strings.Join(seen, ", ")})
		}
		if e.Notes != "" {
			ev.Rows = append(ev.Rows, inputRow{"Notes", e.Notes})
		}
	}
	out = append(out, ev)

	per := ""
	if m.Kind == assess.KindSlab {
		per = " per metre"
	}
	out = append(out, inputGroup{Title: "Demand and options", Rows: []inputRow{
		{"Sagging demand", withUnit(in.Demand.SaggingKNm, "kN·m"+per, "none")},
		{"Hogging demand", withUnit(in.Demand.HoggingKNm, "kN·m"+per, "none")},
		{"Axial force", withUnit(in.Demand.AxialKN, "kN (compression +)", "none")},
		{"Cell size", withUnit(in.Options.CellMM, "mm", "5 mm (default)")},
		{"Residual models", fmt.Sprintf("concrete %s, steel %s", orDefault(in.Options.ConcreteModel, "en1994-annex-c"), orDefault(in.Options.SteelModel, "residual-by-class"))},
		{"Partial factors", fmt.Sprintf("γ_c %s, γ_s %s, α_cc %s", orDefaultNum(in.Options.GammaC, "1.5"), orDefaultNum(in.Options.GammaS, "1.15"), orDefaultNum(in.Options.AlphaCC, "1.0"))},
	}})
	return out
}

func orDefault(s, d string) string {
	if s == "" {
		return d
	}
	return s
}

func orDefaultNum(v float64, d string) string {
	if v == 0 {
		return d
	}
	return fmtInput(v)
}

func curveName(c string) string {
	for _, o := range curveOpts {
		if o.Value == c {
			return o.Label
		}
	}
	return c
}
