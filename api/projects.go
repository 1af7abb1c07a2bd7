package api

import (
	"errors"
	"fmt"
	"log/slog"
	"net/http"
	"strconv"

	"residuum/assess"
)

// projectRequest is the body of a project create or update: the fields a
// client sets. An update replaces all of them.
type projectRequest struct {
	Name        string `json:"name"`
	SiteAddress string `json:"site_address"`
	ClientRef   string `json:"client_reference"`
	Notes       string `json:"notes"`
}

func (pr projectRequest) apply(p *assess.Project) {
	p.Name, p.SiteAddress, p.ClientRef, p.Notes = pr.Name, pr.SiteAddress, pr.ClientRef, pr.Notes
}

func projectPath(id int64) string { return "/api/v1/projects/" + strconv.FormatInt(id, 10) }

// handleProjectList lists projects in creation order, one page at a time.
// ?deleted=include adds soft-deleted projects, ?deleted=only lists just those.
func handleProjectList(store assess.Store, log *slog.Logger) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		pg, err := page(r)
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		var f assess.ProjectFilter
		switch d := r.URL.Query().Get("deleted"); d {
		case "", "exclude":
		case "include":
			f.IncludeDeleted = true
		case "only":
			f.OnlyDeleted = true
		default:
			serveError(w, r, log, &badRequest{Field: "deleted", Msg: fmt.Sprintf(`must be "exclude", "include" or "only", got %q`, d)})
			return
		}
		ps, err := store.ListProjects(r.Context(), f, pg)
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		encode(w, r, log, http.StatusOK, newList(ps, pg, func(p assess.Project) int64 { return p.ID }))
	})
}

// handleProjectCreate creates a project and answers 201 with it.
func handleProjectCreate(store assess.Store, log *slog.Logger) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		req, err := decode[projectRequest](w, r)
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		var p assess.Project
		req.apply(&p)
		if err := store.CreateProject(r.Context(), &p); err != nil {
			serveError(w, r, log, err)
			return
		}
		w.Header().Set("Location", projectPath(p.ID))
		w.Header().Set("ETag", etag(p.Version))
		encode(w, r, log, http.StatusCreated, p)
	})
}

// handleProjectGet answers one project, soft-deleted or not, with its ETag.
func handleProjectGet(store assess.Store, log *slog.Logger) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		id, err := pathID(r, "projectID")
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		p, err := store.GetProject(r.Context(), id)
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		w.Header().Set("ETag", etag(p.Version))
		encode(w, r, log, http.StatusOK, p)
	})
}

// handleProjectUpdate replaces a project's fields. It requires If-Match
// (428 without it) and answers 412 when the project changed meanwhile.
func handleProjectUpdate(store assess.Store, log *slog.Logger) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		id, err := pathID(r, "projectID")
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		want, given, err := ifMatch(r)
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		if !given {
			serveError(w, r, log, errPreconditionRequired)
			return
		}
		req, err := decode[projectRequest](w, r)
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		p, err := store.GetProject(r.Context(), id)
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		if err := checkVersion(want, p.Version, fmt.Sprintf("project %d", id)); err != nil {
			serveError(w, r, log, err)
			return
		}
		req.apply(p)
		used := p.Version
		if err := store.UpdateProject(r.Context(), p); err != nil {
			serveError(w, r, log, versionConflict(err, used, func() (int64, error) {
				q, err := store.GetProject(r.Context(), id)
				if err != nil {
					return 0, err
				}
				return q.Version, nil
			}, fmt.Sprintf("project %d", id)))
			return
		}
		w.Header().Set("ETag", etag(p.Version))
		encode(w, r, log, http.StatusOK, p)
	})
}

// handleProjectDelete deletes a project. A project with issued assessments
// is kept (409) unless ?force=true, which soft-deletes it.
func handleProjectDelete(store assess.Store, log *slog.Logger) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		id, err := pathID(r, "projectID")
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		force := false
		switch f := r.URL.Query().Get("force"); f {
		case "", "false":
		case "true":
			force = true
		default:
			serveError(w, r, log, &badRequest{Field: "force", Msg: fmt.Sprintf(`must be "true" or "false", got %q`, f)})
			return
		}
		want, _, err := ifMatch(r)
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		if want != 0 {
			p, err := store.GetProject(r.Context(), id)
			if err != nil {
				serveError(w, r, log, err)
				return
			}
			if err := checkVersion(want, p.Version, fmt.Sprintf("project %d", id)); err != nil {
				serveError(w, r, log, err)
				return
			}
		}
		if err := store.DeleteProject(r.Context(), id, force); err != nil {
			serveError(w, r, log, err)
			return
		}
		w.WriteHeader(http.StatusNoContent)
	})
}

// versionConflict explains an error from an update sent with version used
// (the version the client's If-Match named, or the one just read for "*"):
// if the stored version has moved on, another client won the race and the
// answer is 412, like a stale If-Match; a conflict with another cause (a
// soft-deleted project) stays 409.
func versionConflict(err error, used int64, current func() (int64, error), what string) error {
	if !errors.Is(err, assess.ErrConflict) {
		return fmt.Errorf("update %s: %w", what, err)
	}
	if v, gerr := current(); gerr == nil && v != used {
		return checkVersion(used, v, what)
	}
	return fmt.Errorf("update %s: %w", what, err)
}
