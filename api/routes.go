package api

import (
	"github.com/go-chi/chi/v5"
	"github.com/go-chi/chi/v5/middleware"
)

// newRouter lists every route of the service. The OpenAPI document
// (openapi.json) must list exactly the /api/v1 routes below and the probes;
// TestOpenAPICoversEveryRoute checks it.
func newRouter(d Deps) *chi.Mux {
	log := d.Log
	if log == nil {
		log = discardLogger()
	}
	s, q := d.Store, d.Queue

	r := chi.NewRouter()
	r.Use(middleware.RequestID)
	r.Use(echoRequestID)
	r.Use(requestLog(log))
	r.Use(middleware.Recoverer)
	r.Use(middleware.RequestSize(MaxBodyBytes))
	r.NotFound(notFound)
	r.MethodNotAllowed(methodNotAllowed)

	r.Method("GET", "/healthz", handleHealthz())
	r.Method("GET", "/readyz", handleReadyz(s, log))

	r.Route("/api/v1", func(r chi.Router) {
		r.NotFound(notFound)
		r.MethodNotAllowed(methodNotAllowed)

		r.Method("GET", "/openapi.json", handleOpenAPI())
		r.Method("POST", "/assess", handleAssess(q, log))

		r.Method("GET", "/projects", handleProjectList(s, log))
		r.Method("POST", "/projects", handleProjectCreate(s, log))
		r.Method("GET", "/projects/{projectID}", handleProjectGet(s, log))
		r.Method("PUT", "/projects/{projectID}", handleProjectUpdate(s, log))
		r.Method("DELETE", "/projects/{projectID}", handleProjectDelete(s, log))
		r.Method("GET", "/projects/{projectID}/members", handleMemberList(s, log))
		r.Method("POST", "/projects/{projectID}/members", handleMemberCreate(s, log))
		r.Method("GET", "/projects/{projectID}/latest-assessments", handleLatestAssessments(s, log))

		r.Method("GET", "/members/{memberID}", handleMemberGet(s, log))
		r.Method("PUT", "/members/{memberID}", handleMemberUpdate(s, log))
		r.Method("DELETE", "/members/{memberID}", handleMemberDelete(s, log))
		r.Method("GET", "/members/{memberID}/assessments", handleAssessmentList(s, log))
		r.Method("POST", "/members/{memberID}/assessments", handleAssessmentCreate(s, q, log))
		r.Method("GET", "/members/{memberID}/assessments/{revision}", handleRevisionGet(s, log))

		r.Method("GET", "/assessments/{assessmentID}", handleAssessmentGet(s, log))
		r.Method("POST", "/assessments/{assessmentID}/issue", handleAssessmentIssue(s, log))
	})

	if d.Fallback != nil {
		r.Handle("/*", d.Fallback)
	}
	return r
}
