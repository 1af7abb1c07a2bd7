package web

import (
	"io/fs"
	"net/http"
	"strconv"

	"github.com/go-chi/chi/v5"
	"github.com/go-chi/chi/v5/middleware"
)

// routes lists every page of the web face.
func (s *server) routes() http.Handler {
	r := chi.NewRouter()
	r.Use(middleware.Recoverer)
	r.Use(middleware.RequestSize(4 << 20))

	r.Get("/", http.RedirectHandler("/projects", http.StatusSeeOther).ServeHTTP)
	r.Handle("/static/*", staticHandler())

	r.Get("/projects", s.handleProjects())
	r.Post("/projects", s.handleProjectCreate())
	r.Get("/projects/{pid}", s.handleProject())
	r.Get("/projects/{pid}/edit", s.handleProjectEdit())
	r.Post("/projects/{pid}/edit", s.handleProjectUpdate())
	r.Get("/projects/{pid}/delete", s.handleProjectDeleteConfirm())
	r.Post("/projects/{pid}/delete", s.handleProjectDelete())

	r.Get("/projects/{pid}/members/new", s.handleMemberNew())
	r.Post("/projects/{pid}/members", s.handleMemberCreate())
	r.Post("/projects/{pid}/section.svg", s.handleSectionPreview())
	r.Get("/projects/{pid}/members/{mid}", s.handleMember())
	r.Get("/projects/{pid}/members/{mid}/edit", s.handleMemberEdit())
	r.Post("/projects/{pid}/members/{mid}", s.handleMemberUpdate())
	r.Post("/projects/{pid}/members/{mid}/run", s.handleRun())
	r.Get("/projects/{pid}/members/{mid}/delete", s.handleMemberDeleteConfirm())
	r.Post("/projects/{pid}/members/{mid}/delete", s.handleMemberDelete())

	r.Get("/jobs/{jid}", s.handleJob())
	r.Get("/jobs/{jid}/status", s.handleJobStatus())
	r.Post("/jobs/{jid}/cancel", s.handleJobCancel())

	r.Get("/projects/{pid}/members/{mid}/revisions/{rev}", s.handleResult())
	r.Post("/projects/{pid}/members/{mid}/revisions/{rev}/issue", s.handleIssue())
	r.Get("/projects/{pid}/members/{mid}/revisions/{rev}/report", s.handleReport())
	r.Get("/projects/{pid}/members/{mid}/revisions/{rev}/report.pdf", s.handleReportPDF())
	r.Get("/projects/{pid}/members/{mid}/compare", s.handleCompare())

	r.NotFound(func(w http.ResponseWriter, r *http.Request) { s.serveError(w, r, errNotFoundPage) })
	return r
}

func staticHandler() http.Handler {
	sub, err := fs.Sub(staticFS, "static")
	if err != nil {
		panic("web: static assets missing: " + err.Error())
	}
	fsrv := http.StripPrefix("/static/", http.FileServer(http.FS(sub)))
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		w.Header().Set("Cache-Control", "public, max-age=3600")
		fsrv.ServeHTTP(w, r)
	})
}

// idParam reads a positive integer URL parameter.
func idParam(r *http.Request, name string) (int64, error) {
	v, err := strconv.ParseInt(chi.URLParam(r, name), 10, 64)
	if err != nil || v <= 0 {
		return 0, errBadRequestf("%s must be a positive integer", name)
	}
	return v, nil
}
