// Package web serves Residuum's HTML pages: projects, the member editor with its live section
// drawing, assessment results with their plots, revision history, and the printable and PDF
// reports. Pages are rendered on the server with templ and work without JavaScript; the vendored
// htmx (static/htmx.min.js) only makes them quicker to use (live drawing, progress polling).
//
// Every route is listed in routes.go. Handlers are maker functions over Deps; serveError is the
// one place that maps error kinds to HTTP statuses.
package web

import (
	"bytes"
	"context"
	"errors"
	"io"
	"log/slog"
	"net/http"

	"github.com/a-h/templ"

	"residuum/assess"
	"residuum/internal/runqueue"
)

// Deps are the services the pages need. Store and Queue are required; Log may be nil (then
// messages are discarded).
type Deps struct {
	Store assess.Store
	Queue *runqueue.Queue
	Log   *slog.Logger
}

// New returns the handler for every HTML page, the static assets under /static/, and the report
// downloads. The JSON API is mounted separately by the caller.
func New(d Deps) http.Handler {
	if d.Log == nil {
		d.Log = slog.New(slog.NewTextHandler(io.Discard, nil))
	}
	s := &server{Deps: d, jobs: newJobs()}
	return s.routes()
}

// server holds the dependencies and the in-memory table of running assessments.
type server struct {
	Deps
	jobs *jobs
}

// render writes c with the given status after rendering it completely into a buffer, so a failed
// render never sends half a page.
func (s *server) render(w http.ResponseWriter, r *http.Request, status int, c templ.Component) {
	var buf bytes.Buffer
	if err := c.Render(r.Context(), &buf); err != nil {
		s.serveError(w, r, err)
		return
	}
	w.Header().Set("Content-Type", "text/html; charset=utf-8")
	w.WriteHeader(status)
	_, _ = buf.WriteTo(w)
}

// errBadRequest marks a malformed request (an ID that is not a number, a form that cannot be
// parsed).
var errBadRequest = errors.New("bad request")

// serveError is the only place that chooses a status for an error, logs it (500s only, with the
// internal text) and shows a user-safe message.
func (s *server) serveError(w http.ResponseWriter, r *http.Request, err error) {
	status, title, msg := http.StatusInternalServerError, "Something went wrong",
		"The server could not complete the request. The problem has been logged."
	var inv *assess.InvalidError
	switch {
	case errors.Is(err, assess.ErrNotFound):
		status, title, msg = http.StatusNotFound, "Not found", "There is no such page, project, member or revision."
	case errors.Is(err, assess.ErrConflict):
		status, title, msg = http.StatusConflict, "Conflict", "The record was changed or issued meanwhile; reload it and try again."
	case errors.As(err, &inv):
		status, title, msg = http.StatusUnprocessableEntity, "Invalid input", inv.Error()
	case errors.Is(err, errBadRequest):
		status, title, msg = http.StatusBadRequest, "Bad request", "The address or the form could not be read."
	case errors.Is(err, runqueue.ErrFull):
		status, title, msg = http.StatusServiceUnavailable, "Busy", "Every worker is busy. Try again in a minute."
		w.Header().Set("Retry-After", "30")
	case errors.Is(err, assess.ErrUnavailable):
		status, title, msg = http.StatusServiceUnavailable, "Store unavailable", "The database cannot be reached right now. Try again shortly."
		w.Header().Set("Retry-After", "10")
	case errors.Is(err, context.Canceled):
		status, title, msg = 499, "Cancelled", "The request was cancelled."
	}
	if status >= 500 {
		s.Log.Error("web request failed", "method", r.Method, "path", r.URL.Path, "err", err)
	} else {
		s.Log.Info("web request refused", "method", r.Method, "path", r.URL.Path, "status", status, "err", err)
	}
	var buf bytes.Buffer
	if rerr := errorPage(status, title, msg).Render(r.Context(), &buf); rerr != nil {
		http.Error(w, title, status)
		return
	}
	w.Header().Set("Content-Type", "text/html; charset=utf-8")
	w.WriteHeader(status)
	_, _ = buf.WriteTo(w)
}
