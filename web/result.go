package web

import (
	"encoding/json"
	"fmt"
	"net/http"
	"strconv"
	"strings"

	"github.com/go-chi/chi/v5"

	"residuum/assess"
)

// resultView is one revision's result page (and the body of its report).
type resultView struct {
	ProjectID    int64
	ProjectName  string
	ProjectSite  string
	ProjectRef   string
	MemberID     int64
	MemberURL    string
	Label        string
	Location     string
	Kind         string
	Rev          int
	Issued       bool
	IssuedAt     string
	Created      string
	Author       string
	Method       string
	InputHash    string
	IssueURL     string
	ReportURL    string
	PDFURL       string
	Scenario     string
	FireText     string
	FitText      string
	FitRows      []inputRow
	Facts        []fact
	Capacity     []capacityRow
	PerMetre     bool
	DesignBasis  string
	DamageLabel  string
	DamageScheme string
	Reasons      []assess.Reason
	ActionCode   string
	ActionText   string
	Cautions     []string
	Warnings     []string
	Methods      []assess.Method
	Bars         []barRow
	Isotherms    []isoRow
	Concrete     []inputRow
	Inputs       []inputGroup
	Plots        []figure
	Stale        bool // the member was edited after this revision was run
	RunURL       string
}

// fact is one headline number of the result.
type fact struct {
	Name, Value, Note, TestID string
}

// capacityRow is one line of the capacity table.
type capacityRow struct {
	Dir                                       string
	UndamagedK, ResidualK, Ratio              string
	UndamagedD, ResidualD, Demand, Util, Mode string
	Range                                     string
}

type barRow struct {
	Label, Position, Cover, Steel, Peak, PeakTime, Threshold, Factor, Fy, Note string
}

type isoRow struct{ Face, D300, D500, D600 string }

// figure is a plot on the result page.
type figure struct {
	TestID  string
	Caption string
	SVG     string
}

// loadRevision reads the project, member and revision of the URL.
func (s *server) loadRevision(w http.ResponseWriter, r *http.Request) (*assess.Project, *assess.MemberRecord, *assess.AssessmentRecord, bool) {
	p, m, ok := s.memberFor(w, r)
	if !ok {
		return nil, nil, nil, false
	}
	rev, err := strconv.Atoi(chi.URLParam(r, "rev"))
	if err != nil || rev <= 0 {
		s.serveError(w, r, errBadRequestf("revision must be a positive integer"))
		return nil, nil, nil, false
	}
	a, err := s.Store.GetRevision(r.Context(), m.ID, rev)
	if err != nil {
		s.serveError(w, r, fmt.Errorf("get revision %d of member %d: %w", rev, m.ID, err))
		return nil, nil, nil, false
	}
	return p, m, a, true
}

// decodeRevision reads the stored input and result of a revision.
func decodeRevision(a *assess.AssessmentRecord) (assess.Input, *assess.Result, error) {
	in, err := lenientInput(a.Input)
	if err != nil {
		return in, nil, fmt.Errorf("revision %d input: %w", a.Revision, err)
	}
	var res assess.Result
	if err := json.Unmarshal(a.Result, &res); err != nil {
		return in, nil, fmt.Errorf("revision %d result: %w", a.Revision, err)
	}
	return in, &res, nil
}

func (s *server) handleResult() http.HandlerFunc {
	return func(w http.ResponseWriter, r *http.Request) {
		p, m, a, ok := s.loadRevision(w, r)
		if !ok {
			return
		}
		v, err := buildResultView(p, m, a, true)
		if err != nil {
			s.serveError(w, r, err)
			return
		}
		s.render(w, r, http.StatusOK, resultPage(v))
	}
}

func (s *server) handleReport() http.HandlerFunc {
	return func(w http.ResponseWriter, r *http.Request) {
		p, m, a, ok := s.loadRevision(w, r)
		if !ok {
			return
		}
		v, err := buildResultView(p, m, a, true)
		if err != nil {
			s.serveError(w, r, err)
			return
		}
		s.render(w, r, http.StatusOK, reportPage(v))
	}
}

func (s *server) handleIssue() http.HandlerFunc {
	return func(w http.ResponseWriter, r *http.Request) {
		p, m, a, ok := s.loadRevision(w, r)
		if !ok {
			return
		}
		if a.State == assess.StateIssued {
			// issuing twice is harmless for the user: show the issued revision
			http.Redirect(w, r, revisionURL(p.ID, m.ID, a.Revision), http.StatusSeeOther)
			return
		}
		if _, err := s.Store.IssueAssessment(r.Context(), a.ID); err != nil {
			s.serveError(w, r, fmt.Errorf("issue revision %d of member %d: %w", a.Revision, m.ID, err))
			return
		}
		http.Redirect(w, r, revisionURL(p.ID, m.ID, a.Revision), http.StatusSeeOther)
	}
}

func knm(v float64) string { return fmtSig(v) }

// buildResultView makes the view model of a stored revision; withPlots draws the SVG plots.
func buildResultView(p *assess.Project, m *assess.MemberRecord, a *assess.AssessmentRecord, withPlots bool) (resultView, error) {
	in, res, err := decodeRevision(a)
	if err != nil {
		return resultView{}, err
	}
	base := revisionURL(p.ID, m.ID, a.Revision)
	v := resultView{ProjectID: p.ID, ProjectName: p.Name, ProjectSite: p.SiteAddress, ProjectRef: p.ClientRef,
		MemberID: m.ID, MemberURL: memberURL(p.ID, m.ID), Label: m.Label, Location: m.Location, Kind: m.Kind,
		Rev: a.Revision, Issued: a.State == assess.StateIssued, Created: fmtDate(a.CreatedAt), Author: a.Author,
		Method: a.MethodVersion, InputHash: a.InputHash, IssueURL: base + "/issue", ReportURL: base + "/report",
		PDFURL: base + "/report.pdf", PerMetre: res.Member.PerMetre,
		DamageLabel: res.Damage.Label, DamageScheme: res.Damage.Scheme, Reasons: res.Damage.Reasons,
		ActionCode: res.Action, ActionText: res.ActionText, Cautions: res.Cautions, Warnings: res.Warnings,
		Methods: res.Method, Inputs: inputGroups(in, m.Location)}
	if a.IssuedAt != nil {
		v.IssuedAt = fmtDate(*a.IssuedAt)
	}
	if cur, err := lenientInput(m.Input); err == nil && a.InputHash != "" {
		v.Stale = assess.InputSHA256(cur) != a.InputHash
	}
	v.RunURL = memberURL(p.ID, m.ID) + "/run"
	v.Scenario = scenarioText(res.Scenario)
	if f := res.Fire; f != nil {
		v.FireText = fmt.Sprintf("%s (%s): heating ends at %s min, gas peak %s °C; the thermal run ends at %s min.",
			f.Name, f.Source, fmtSig(f.HeatingEndMin), fmtNum(f.PeakGasC, 0), fmtSig(f.EndMin))
	}
	if ft := res.Fit; ft != nil {
		v.FitText = ft.Message
		for _, o := range ft.Observations {
			comp := "not reached"
			if o.ComputedMM != nil {
				comp = fmtNum(*o.ComputedMM, 1) + " mm"
			}
			v.FitRows = append(v.FitRows, inputRow{fmt.Sprintf("%s face, %s °C", o.Face, fmtInput(o.IsothermC)),
				fmt.Sprintf("measured %s ± %s mm, computed %s (misfit %s mm)", fmtInput(o.MeasuredMM), fmtInput(o.SdMM), comp, fmtNum(o.MisfitMM, 1))})
		}
	}
	unit := "kN·m"
	if v.PerMetre {
		unit = "kN·m/m"
	}
	util := func(u *float64) string {
		if u == nil {
			return "> 9.99"
		}
		return fmtNum(*u, 2)
	}
	for _, d := range []struct {
		name string
		c    assess.Direction
	}{{"sagging", res.Capacity.Sagging}, {"hogging", res.Capacity.Hogging}} {
		row := capacityRow{Dir: d.name, UndamagedK: knm(d.c.UndamagedKNm), ResidualK: knm(d.c.ResidualKNm),
			Ratio: fmtNum(d.c.Ratio, 2), UndamagedD: knm(d.c.UndamagedDesignKNm), ResidualD: knm(d.c.ResidualDesignKNm),
			Demand: "–", Util: "–", Mode: d.c.ModeResidual}
		if d.c.DemandKNm > 0 {
			row.Demand, row.Util = knm(d.c.DemandKNm), util(d.c.Utilisation)
		}
		if rr := d.c.ResidualRangeKNm; knm(rr[0]) != knm(rr[1]) {
			row.Range = fmt.Sprintf("%s–%s", knm(rr[0]), knm(rr[1]))
		}
		v.Capacity = append(v.Capacity, row)
		v.Facts = append(v.Facts, fact{Name: strings.ToUpper(d.name[:1]) + d.name[1:] + " ratio", Value: fmtNum(d.c.Ratio, 2),
			Note: fmt.Sprintf("residual %s of %s %s", knm(d.c.ResidualKNm), knm(d.c.UndamagedKNm), unit), TestID: "fact-" + d.name})
	}
	v.Facts = append(v.Facts, fact{Name: "Damage class", Value: res.Damage.Label, TestID: "fact-class"},
		fact{Name: "Recommended action", Value: actionName(res.Action), TestID: "fact-action"})
	v.DesignBasis = fmt.Sprintf("%s (γ_c %s, γ_s %s, α_cc %s)", res.Design.Basis, fmtInput(res.Design.GammaC), fmtInput(res.Design.GammaS), fmtInput(res.Design.AlphaCC))
	for _, b := range res.Rebar {
		row := barRow{Label: b.Label, Position: fmt.Sprintf("%s, %s", fmtNum(b.XMM, 0), fmtNum(b.YMM, 0)),
			Cover: fmtNum(b.CoverMM, 0) + " (" + b.Face + ")", Steel: b.Steel, Peak: fmtNum(b.PeakC, 0),
			PeakTime: fmtNum(b.PeakTimeMin, 0), Threshold: fmtNum(b.ThresholdC, 0), Factor: fmtNum(b.ResidualFactor, 2),
			Fy: fmtNum(b.ResidualFyMPa, 0)}
		var notes []string
		if b.AboveThreshold {
			notes = append(notes, "above threshold")
		}
		if b.ExposedBySpalling {
			notes = append(notes, "exposed by spalling")
		}
		if b.ExposedOnSite {
			notes = append(notes, "seen exposed on site")
		}
		row.Note = strings.Join(notes, ", ")
		v.Bars = append(v.Bars, row)
	}
	for _, face := range []string{"bottom", "left", "right", "top"} {
		iso, ok := res.Isotherms[face]
		if !ok {
			continue
		}
		d := func(k string) string {
			if x := iso[k]; x != nil {
				return fmtNum(*x, 0)
			}
			return "not reached"
		}
		v.Isotherms = append(v.Isotherms, isoRow{face, d("300"), d("500"), d("600")})
	}
	c := res.Concrete
	v.Concrete = []inputRow{
		{"Residual concrete model", c.Model},
		{"Hottest concrete", fmtNum(c.MaxPeakC, 0) + " °C"},
		{"Area above 300 °C / 500 °C", fmt.Sprintf("%s %% / %s %% of the remaining section", fmtNum(c.Above300AreaPct, 1), fmtNum(c.Above500AreaPct, 1))},
		{"Area removed by spalling", fmtNum(c.RemovedAreaPct, 1) + " %"},
		{"Mean residual strength ratio", fmtNum(c.MeanResidualRatio, 2) + " (area-weighted f_c,res / f_ck, removed concrete = 0)"},
	}
	if withPlots {
		figs, err := resultFigures(res, in.Evidence, inputFitOptions(in))
		if err != nil {
			return v, err
		}
		sec := figure{TestID: "plot-section", SVG: sectionSVG(geomFromInput(in)),
			Caption: "The section as entered: bars at true size, fire-exposed faces zig-zagged, spalled zones hatched."}
		v.Plots = append([]figure{sec}, figs...)
	}
	return v, nil
}

func scenarioText(s string) string {
	switch s {
	case "undamaged":
		return "No fire and no evidence given: the member is assessed undamaged."
	case "fire":
		return "Peak temperatures computed forward from the given fire (heating and cooling)."
	case "fire+evidence":
		return "Peak temperatures computed from the given fire and checked against the site evidence."
	case "evidence":
		return "Fire severity fitted to the measured colour-change depths; peak temperatures from the fitted fire."
	}
	return s
}

// resultFigures draws every plot of a result as inline SVG.
func resultFigures(res *assess.Result, ev *assess.Evidence, fo *assess.FitOptions) ([]figure, error) {
	var out []figure
	add := func(id, caption string, mk func() (string, error)) error {
		svg, err := mk()
		if err != nil {
			return err
		}
		if svg != "" {
			out = append(out, figure{TestID: id, Caption: caption, SVG: svg})
		}
		return nil
	}
	gp := func(id, title string, mk func() (plotT, error)) func() (string, error) {
		return func() (string, error) {
			p, err := mk()
			if err != nil || p == nil {
				return "", err
			}
			return plotSVG(p, id+"-svg", title)
		}
	}
	steps := []struct {
		id, caption string
		mk          func() (string, error)
	}{
		{"plot-fire", fireCaption(res),
			gp("plot-fire", "fire curve", func() (plotT, error) { return fireCurvePlot(res, fo) })},
		{"plot-heatmap", "Peak temperature reached in each part of the section, with the 300, 500 and 600 °C isotherms; white circles are the bars; blank cells were lost to spalling.",
			func() (string, error) { return heatMapSVG(res), nil }},
		{"plot-rebar", "Temperature at the bar centres: inner bars peak after the fire has died down.",
			gp("plot-rebar", "bar temperature histories", func() (plotT, error) { return rebarPlot(res) })},
		{"plot-profile", "Peak temperature against depth from each exposed face, at mid-face; triangles are the measured colour-change depths (bar: ± one standard deviation); dotted lines mark 300, 500 and 600 °C.",
			gp("plot-profile", "temperature–depth profiles", func() (plotT, error) { return profilePlot(res, ev) })},
		{"plot-mk-sagging", "Sagging moment–curvature, characteristic: undamaged (solid, circles) and residual (dashed, triangles).",
			gp("plot-mk-sagging", "sagging moment–curvature", func() (plotT, error) { return momentCurvaturePlot(res, "sagging") })},
		{"plot-mk-hogging", "Hogging moment–curvature, characteristic: the compression zone is the heated bottom concrete.",
			gp("plot-mk-hogging", "hogging moment–curvature", func() (plotT, error) { return momentCurvaturePlot(res, "hogging") })},
	}
	for _, st := range steps {
		if err := add(st.id, st.caption, st.mk); err != nil {
			return nil, err
		}
	}
	return out, nil
}
