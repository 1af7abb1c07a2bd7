package web

import (
	"context"
	"errors"
	"fmt"
	"net/http"
	"strconv"
	"strings"

	"residuum/assess"
)

// maxDeleteScan bounds the members and revisions read to explain a delete.
const maxDeleteScan = 5000

func int64Text(v int64) string { return strconv.FormatInt(v, 10) }

// countWord writes n with the singular or plural noun: "1 member", "3 members".
func countWord(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return strconv.Itoa(n) + " " + many
}

func projectEditURL(id int64) string   { return projectURL(id) + "/edit" }
func projectDeleteURL(id int64) string { return projectURL(id) + "/delete" }
func memberDeleteURL(pid, mid int64) string {
	return memberURL(pid, mid) + "/delete"
}

// readProjectForm reads the project fields of a posted form, trimmed.
func readProjectForm(r *http.Request) projectForm {
	return projectForm{
		Name:      strings.TrimSpace(r.PostFormValue("name")),
		Site:      strings.TrimSpace(r.PostFormValue("site_address")),
		ClientRef: strings.TrimSpace(r.PostFormValue("client_reference")),
		Notes:     strings.TrimSpace(r.PostFormValue("notes")),
	}
}

// openProject reads the project named by the URL; a soft-deleted one gives ErrConflict
// (it is read-only).
func (s *server) openProject(r *http.Request) (*assess.Project, error) {
	pid, err := idParam(r, "pid")
	if err != nil {
		return nil, err
	}
	p, err := s.Store.GetProject(r.Context(), pid)
	if err != nil {
		return nil, fmt.Errorf("get project %d: %w", pid, err)
	}
	if p.DeletedAt != nil {
		return nil, fmt.Errorf("project %d is archived and read-only: %w", pid, assess.ErrConflict)
	}
	return p, nil
}

func editView(p *assess.Project) projectEditView {
	return projectEditView{ID: p.ID, Name: p.Name, Action: projectEditURL(p.ID), Version: p.Version,
		Form: projectForm{Name: p.Name, Site: p.SiteAddress, ClientRef: p.ClientRef, Notes: p.Notes}}
}

func (s *server) handleProjectEdit() http.HandlerFunc {
	return func(w http.ResponseWriter, r *http.Request) {
		p, err := s.openProject(r)
		if err != nil {
			s.serveError(w, r, err)
			return
		}
		s.render(w, r, http.StatusOK, projectEditPage(editView(p)))
	}
}

func (s *server) handleProjectUpdate() http.HandlerFunc {
	return func(w http.ResponseWriter, r *http.Request) {
		p, err := s.openProject(r)
		if err != nil {
			s.serveError(w, r, err)
			return
		}
		if err := r.ParseForm(); err != nil {
			s.serveError(w, r, fmt.Errorf("parse project form: %v: %w", err, errBadRequest))
			return
		}
		f := readProjectForm(r)
		ver, err := strconv.ParseInt(r.PostFormValue("version"), 10, 64)
		if err != nil || ver <= 0 {
			s.serveError(w, r, errBadRequestf("version must be a positive integer"))
			return
		}
		up := *p
		up.Name, up.SiteAddress, up.ClientRef, up.Notes, up.Version = f.Name, f.Site, f.ClientRef, f.Notes, ver
		err = s.Store.UpdateProject(r.Context(), &up)
		var inv *assess.InvalidError
		switch {
		case errors.As(err, &inv):
			v := editView(p)
			v.Version = ver // keep the version the user started from: a later save still detects a change
			f.Errors = problemMap(inv, projectField)
			v.Form = f
			s.render(w, r, http.StatusUnprocessableEntity, projectEditPage(v))
			return
		case errors.Is(err, assess.ErrConflict):
			cur, gerr := s.Store.GetProject(r.Context(), p.ID)
			if gerr != nil {
				s.serveError(w, r, fmt.Errorf("reread project %d after a conflict: %w", p.ID, gerr))
				return
			}
			if cur.DeletedAt != nil {
				s.serveError(w, r, fmt.Errorf("update project %d: archived meanwhile: %w", p.ID, assess.ErrConflict))
				return
			}
			v := editView(cur)
			v.Stale, v.Yours = true, f
			s.render(w, r, http.StatusConflict, projectEditPage(v))
			return
		case err != nil:
			s.serveError(w, r, fmt.Errorf("update project %d: %w", p.ID, err))
			return
		}
		http.Redirect(w, r, projectURL(p.ID), http.StatusSeeOther)
	}
}

// projectField maps a store problem path to the form field it concerns ("" when none matches).
func projectField(path string) string {
	switch path {
	case "name", "site_address", "client_reference", "notes":
		return path
	}
	return ""
}

// projectCounts counts a project's members, its draft and its issued revisions (bounded scan).
func (s *server) projectCounts(ctx context.Context, pid int64) (members, drafts, issued int, err error) {
	pg := assess.Page{Limit: assess.MaxPageLimit}
	for members < maxDeleteScan {
		ms, err := s.Store.ListMembers(ctx, pid, pg)
		if err != nil {
			return 0, 0, 0, fmt.Errorf("list members of project %d: %w", pid, err)
		}
		for _, m := range ms {
			d, i, err := s.memberCounts(ctx, m.ID)
			if err != nil {
				return 0, 0, 0, err
			}
			drafts += d
			issued += i
		}
		members += len(ms)
		if len(ms) < pg.Limit {
			break
		}
		pg.AfterID = ms[len(ms)-1].ID
	}
	return members, drafts, issued, nil
}

// memberCounts counts a member's draft and issued revisions (bounded scan).
func (s *server) memberCounts(ctx context.Context, mid int64) (drafts, issued int, err error) {
	pg := assess.Page{Limit: assess.MaxPageLimit}
	for seen := 0; seen < maxDeleteScan; {
		as, err := s.Store.ListAssessments(ctx, mid, pg)
		if err != nil {
			return 0, 0, fmt.Errorf("list revisions of member %d: %w", mid, err)
		}
		for _, a := range as {
			if a.State == assess.StateIssued {
				issued++
			} else {
				drafts++
			}
		}
		seen += len(as)
		if len(as) < pg.Limit {
			break
		}
		pg.AfterID = as[len(as)-1].ID
	}
	return drafts, issued, nil
}

func (s *server) projectDeleteView(ctx context.Context, p *assess.Project) (deleteView, error) {
	v := deleteView{What: "project", Name: p.Name, Crumbs: []crumb{{"Projects", "/projects"}, {p.Name, projectURL(p.ID)}},
		Action: projectDeleteURL(p.ID), CancelURL: projectURL(p.ID)}
	var err error
	v.Members, v.Drafts, v.Issued, err = s.projectCounts(ctx, p.ID)
	return v, err
}

func (s *server) handleProjectDeleteConfirm() http.HandlerFunc {
	return func(w http.ResponseWriter, r *http.Request) {
		p, err := s.openProject(r)
		if err != nil {
			s.serveError(w, r, err)
			return
		}
		v, err := s.projectDeleteView(r.Context(), p)
		if err != nil {
			s.serveError(w, r, err)
			return
		}
		s.render(w, r, http.StatusOK, deletePage(v))
	}
}

func (s *server) handleProjectDelete() http.HandlerFunc {
	return func(w http.ResponseWriter, r *http.Request) {
		p, err := s.openProject(r)
		if err != nil {
			s.serveError(w, r, err)
			return
		}
		if err := r.ParseForm(); err != nil {
			s.serveError(w, r, fmt.Errorf("parse delete form: %v: %w", err, errBadRequest))
			return
		}
		force := r.PostFormValue("force") == "true"
		if force && r.PostFormValue("confirm_archive") != "yes" {
			v, err := s.projectDeleteView(r.Context(), p)
			if err != nil {
				s.serveError(w, r, err)
				return
			}
			v.Error = "Tick this box to confirm that the project is to be archived with its issued revisions."
			s.render(w, r, http.StatusUnprocessableEntity, deletePage(v))
			return
		}
		err = s.Store.DeleteProject(r.Context(), p.ID, force)
		if errors.Is(err, assess.ErrConflict) {
			// issued meanwhile (or the plain form was posted for a project with issued revisions)
			v, verr := s.projectDeleteView(r.Context(), p)
			if verr != nil {
				s.serveError(w, r, verr)
				return
			}
			v.Refused = "Not deleted: this project holds issued revisions. Confirm below to archive it instead."
			s.render(w, r, http.StatusConflict, deletePage(v))
			return
		}
		if err != nil {
			s.serveError(w, r, fmt.Errorf("delete project %d: %w", p.ID, err))
			return
		}
		http.Redirect(w, r, "/projects", http.StatusSeeOther)
	}
}

// openMember reads the project and member named by the URL; the member must belong to the project.
func (s *server) openMember(r *http.Request) (*assess.Project, *assess.MemberRecord, error) {
	p, err := s.openProject(r)
	if err != nil {
		return nil, nil, err
	}
	mid, err := idParam(r, "mid")
	if err != nil {
		return nil, nil, err
	}
	m, err := s.Store.GetMember(r.Context(), mid)
	if err != nil {
		return nil, nil, fmt.Errorf("get member %d: %w", mid, err)
	}
	if m.ProjectID != p.ID {
		return nil, nil, fmt.Errorf("member %d is not in project %d: %w", mid, p.ID, assess.ErrNotFound)
	}
	return p, m, nil
}

func (s *server) memberDeleteView(ctx context.Context, p *assess.Project, m *assess.MemberRecord) (deleteView, error) {
	v := deleteView{What: "member", Name: m.Label,
		Crumbs: []crumb{{"Projects", "/projects"}, {p.Name, projectURL(p.ID)}, {m.Label, memberURL(p.ID, m.ID)}},
		Action: memberDeleteURL(p.ID, m.ID), CancelURL: memberURL(p.ID, m.ID)}
	var err error
	v.Drafts, v.Issued, err = s.memberCounts(ctx, m.ID)
	return v, err
}

func (s *server) handleMemberDeleteConfirm() http.HandlerFunc {
	return func(w http.ResponseWriter, r *http.Request) {
		p, m, err := s.openMember(r)
		if err != nil {
			s.serveError(w, r, err)
			return
		}
		v, err := s.memberDeleteView(r.Context(), p, m)
		if err != nil {
			s.serveError(w, r, err)
			return
		}
		s.render(w, r, http.StatusOK, deletePage(v))
	}
}

func (s *server) handleMemberDelete() http.HandlerFunc {
	return func(w http.ResponseWriter, r *http.Request) {
		p, m, err := s.openMember(r)
		if err != nil {
			s.serveError(w, r, err)
			return
		}
		err = s.Store.DeleteMember(r.Context(), m.ID)
		if errors.Is(err, assess.ErrConflict) {
			v, verr := s.memberDeleteView(r.Context(), p, m)
			if verr != nil {
				s.serveError(w, r, verr)
				return
			}
			v.Refused = "Not deleted: this member has issued assessments, which are of record and are kept."
			s.render(w, r, http.StatusConflict, deletePage(v))
			return
		}
		if err != nil {
			s.serveError(w, r, fmt.Errorf("delete member %d: %w", m.ID, err))
			return
		}
		http.Redirect(w, r, projectURL(p.ID), http.StatusSeeOther)
	}
}
