package web

import (
	"cmp"
	"errors"
	"fmt"
	"net/http"
	"net/url"
	"slices"
	"strings"

	"residuum/assess"
)

func (s *server) handleProjects() http.HandlerFunc {
	return func(w http.ResponseWriter, r *http.Request) {
		v, err := s.projectsView(r)
		if err != nil {
			s.serveError(w, r, err)
			return
		}
		s.render(w, r, http.StatusOK, projectsPage(v))
	}
}

func (s *server) projectsView(r *http.Request) (projectsView, error) {
	var v projectsView
	ps, err := s.Store.ListProjects(r.Context(), assess.ProjectFilter{}, assess.Page{Limit: assess.MaxPageLimit})
	if err != nil {
		return v, fmt.Errorf("list projects: %w", err)
	}
	for _, p := range ps {
		v.Projects = append(v.Projects, projectRow{
			ID: p.ID, URL: projectURL(p.ID), Name: p.Name, Site: p.SiteAddress, ClientRef: p.ClientRef,
			Created: fmtDate(p.CreatedAt),
		})
	}
	return v, nil
}

func (s *server) handleProjectCreate() http.HandlerFunc {
	return func(w http.ResponseWriter, r *http.Request) {
		if err := r.ParseForm(); err != nil {
			s.serveError(w, r, fmt.Errorf("parse project form: %v: %w", err, errBadRequest))
			return
		}
		f := projectForm{
			Name:      strings.TrimSpace(r.PostFormValue("name")),
			Site:      strings.TrimSpace(r.PostFormValue("site_address")),
			ClientRef: strings.TrimSpace(r.PostFormValue("client_reference")),
			Notes:     strings.TrimSpace(r.PostFormValue("notes")),
		}
		p := &assess.Project{Name: f.Name, SiteAddress: f.Site, ClientRef: f.ClientRef, Notes: f.Notes}
		err := s.Store.CreateProject(r.Context(), p)
		var inv *assess.InvalidError
		if errors.As(err, &inv) {
			v, lerr := s.projectsView(r)
			if lerr != nil {
				s.serveError(w, r, lerr)
				return
			}
			f.Errors = problemMap(inv, nil)
			v.Form = f
			s.render(w, r, http.StatusUnprocessableEntity, projectsPage(v))
			return
		}
		if err != nil {
			s.serveError(w, r, fmt.Errorf("create project: %w", err))
			return
		}
		http.Redirect(w, r, projectURL(p.ID), http.StatusSeeOther)
	}
}

// problemMap turns validation problems into messages keyed by form field name; rename maps a
// JSON path to a field name (nil: the path is the name). Problems without a matching field are
// collected under "".
func problemMap(inv *assess.InvalidError, rename func(string) string) map[string]string {
	m := map[string]string{}
	for _, p := range inv.Problems {
		k := p.Field
		if rename != nil {
			k = rename(k)
		}
		if m[k] != "" {
			m[k] += "; " + p.Message
		} else {
			m[k] = p.Message
		}
	}
	return m
}

func projectURL(id int64) string { return fmt.Sprintf("/projects/%d", id) }

func memberURL(pid, mid int64) string { return fmt.Sprintf("/projects/%d/members/%d", pid, mid) }

func revisionURL(pid, mid int64, rev int) string {
	return fmt.Sprintf("/projects/%d/members/%d/revisions/%d", pid, mid, rev)
}

func (s *server) handleProject() http.HandlerFunc {
	return func(w http.ResponseWriter, r *http.Request) {
		pid, err := idParam(r, "pid")
		if err != nil {
			s.serveError(w, r, err)
			return
		}
		ctx := r.Context()
		p, err := s.Store.GetProject(ctx, pid)
		if err != nil {
			s.serveError(w, r, fmt.Errorf("get project %d: %w", pid, err))
			return
		}
		var members []assess.MemberRecord
		for pg := (assess.Page{Limit: assess.MaxPageLimit}); ; {
			ms, err := s.Store.ListMembers(ctx, pid, pg)
			if err != nil {
				s.serveError(w, r, fmt.Errorf("list members of project %d: %w", pid, err))
				return
			}
			members = append(members, ms...)
			if len(ms) < pg.Limit || len(members) >= 5000 {
				break
			}
			pg.AfterID = ms[len(ms)-1].ID
		}
		latest, err := s.Store.ListLatestAssessments(ctx, pid)
		if err != nil {
			s.serveError(w, r, fmt.Errorf("list latest assessments of project %d: %w", pid, err))
			return
		}
		q := r.URL.Query()
		v := buildProjectView(p, members, latest, q.Get("sort"), q.Get("dir") == "desc", q.Get("action"))
		s.render(w, r, http.StatusOK, projectPage(v))
	}
}

// triageRow pairs a member with its latest assessment for sorting.
type triageRow struct {
	m memberRow
	a *assess.AssessmentRecord
	r *assess.MemberRecord
}

var triageColumns = []struct {
	Key, Label string
	Num        bool
}{
	{"label", "Member", false},
	{"location", "Location", false},
	{"kind", "Kind", false},
	{"sagging", "Sagging ratio", true},
	{"hogging", "Hogging ratio", true},
	{"class", "Damage class", false},
	{"action", "Recommended action", false},
	{"state", "State", false},
	{"date", "Date", false},
}

// buildProjectView makes the triage table: one row per member with its latest revision, filtered
// by action and sorted by the chosen column (members without an assessment sort last).
func buildProjectView(p *assess.Project, members []assess.MemberRecord, latest []assess.AssessmentRecord, sortKey string, desc bool, action string) projectView {
	v := projectView{ID: p.ID, Name: p.Name, Site: p.SiteAddress, ClientRef: p.ClientRef, Notes: p.Notes,
		Deleted: p.DeletedAt != nil, NewURL: projectURL(p.ID) + "/members/new", Total: len(members), Action: action}
	byMember := map[int64]*assess.AssessmentRecord{}
	for i := range latest {
		byMember[latest[i].MemberID] = &latest[i]
	}
	actions := map[string]bool{}
	var rows []triageRow
	for i := range members {
		m := &members[i]
		row := memberRow{URL: memberURL(p.ID, m.ID), Label: m.Label, Location: m.Location, Kind: m.Kind,
			Sagging: "–", Hogging: "–", State: "not assessed", Date: fmtDate(m.UpdatedAt)}
		a := byMember[m.ID]
		if a != nil {
			row.Sagging, row.Hogging = fmtRatio(a.SaggingRatio), fmtRatio(a.HoggingRatio)
			row.SagLow = a.SaggingRatio != nil && *a.SaggingRatio < 0.85
			row.HogLow = a.HoggingRatio != nil && *a.HoggingRatio < 0.85
			row.DamageClass, row.Action, row.ActionCode = a.DamageClass, actionName(a.Action), a.Action
			row.State = fmt.Sprintf("%s (rev. %d)", a.State, a.Revision)
			row.Date = fmtDate(a.CreatedAt)
			if a.IssuedAt != nil {
				row.Date = fmtDate(*a.IssuedAt)
			}
			if a.Action != "" {
				actions[a.Action] = true
			}
		}
		if action != "" && row.ActionCode != action {
			continue
		}
		rows = append(rows, triageRow{row, a, m})
	}
	valid := false
	for _, c := range triageColumns {
		valid = valid || c.Key == sortKey
	}
	if !valid {
		sortKey = ""
	}
	if sortKey != "" {
		slices.SortStableFunc(rows, func(x, y triageRow) int {
			c := compareTriage(x, y, sortKey)
			if desc {
				c = -c
			}
			return c
		})
		// unassessed members stay at the bottom whatever the direction
		slices.SortStableFunc(rows, func(x, y triageRow) int {
			return cmp.Compare(b2i(x.a == nil && needsAssessment(sortKey)), b2i(y.a == nil && needsAssessment(sortKey)))
		})
	}
	for _, r := range rows {
		v.Members = append(v.Members, r.m)
	}
	for a := range actions {
		v.Actions = append(v.Actions, a)
	}
	slices.SortFunc(v.Actions, func(a, b string) int { return strings.Compare(actionRank(a), actionRank(b)) })
	v.Sort, v.Desc = sortKey, desc
	for _, c := range triageColumns {
		sc := sortColumn{Key: c.Key, Label: c.Label, Num: c.Num}
		q := url.Values{"sort": {c.Key}}
		if c.Key == sortKey {
			if desc {
				sc.Sort = "descending"
			} else {
				sc.Sort = "ascending"
				q.Set("dir", "desc")
			}
		}
		if action != "" {
			q.Set("action", action)
		}
		sc.URL = projectURL(p.ID) + "?" + q.Encode()
		v.Columns = append(v.Columns, sc)
	}
	return v
}

func needsAssessment(key string) bool {
	switch key {
	case "sagging", "hogging", "class", "action":
		return true
	}
	return false
}

func b2i(b bool) int {
	if b {
		return 1
	}
	return 0
}

func compareTriage(x, y triageRow, key string) int {
	ratio := func(t triageRow, hog bool) float64 {
		if t.a == nil {
			return 0
		}
		r := t.a.SaggingRatio
		if hog {
			r = t.a.HoggingRatio
		}
		if r == nil {
			return 0
		}
		return *r
	}
	switch key {
	case "label":
		return naturalCompare(x.m.Label, y.m.Label)
	case "location":
		return strings.Compare(strings.ToLower(x.m.Location), strings.ToLower(y.m.Location))
	case "kind":
		return strings.Compare(x.m.Kind, y.m.Kind)
	case "sagging":
		return cmp.Compare(ratio(x, false), ratio(y, false))
	case "hogging":
		return cmp.Compare(ratio(x, true), ratio(y, true))
	case "class":
		return naturalCompare(x.m.DamageClass, y.m.DamageClass)
	case "action":
		return cmp.Compare(actionRank(x.m.ActionCode), actionRank(y.m.ActionCode))
	case "state":
		return strings.Compare(x.m.State, y.m.State)
	case "date":
		return strings.Compare(x.m.Date, y.m.Date)
	}
	return 0
}

// actionRank orders the engine's action codes by severity so that sorting by action groups the
// worst members together; unknown codes sort after the known ones, alphabetically.
func actionRank(code string) string {
	for i, a := range actionWords {
		if a.Code == code {
			return fmt.Sprintf("%02d", i)
		}
	}
	return "99" + code
}

// naturalCompare compares labels so that "B2" sorts before "B10".
func naturalCompare(a, b string) int {
	a, b = strings.ToLower(a), strings.ToLower(b)
	for a != "" && b != "" {
		da, db := leadingDigits(a), leadingDigits(b)
		if da != "" && db != "" {
			if c := cmp.Compare(len(strings.TrimLeft(da, "0")), len(strings.TrimLeft(db, "0"))); c != 0 {
				return c
			}
			if c := strings.Compare(strings.TrimLeft(da, "0"), strings.TrimLeft(db, "0")); c != 0 {
				return c
			}
			a, b = a[len(da):], b[len(db):]
			continue
		}
		if a[0] != b[0] {
			return cmp.Compare(a[0], b[0])
		}
		a, b = a[1:], b[1:]
	}
	return cmp.Compare(len(a), len(b))
}

func leadingDigits(s string) string {
	i := 0
	for i < len(s) && s[i] >= '0' && s[i] <= '9' {
		i++
	}
	return s[:i]
}
