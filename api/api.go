// Package api serves Residuum's JSON API under /api/v1, the health probes
// /healthz and /readyz, and the OpenAPI 3.1 document that describes them
// (/api/v1/openapi.json, embedded from openapi.json and tested against every
// handler).
//
// Conventions of the API:
//
//   - Bodies are application/json, at most MaxBodyBytes; unknown fields are
//     refused. Errors are application/problem+json (RFC 9457) with type,
//     title, status, detail and, for validation failures, a list of
//     {field, message}.
//   - Lists answer {"items": [...], "next_after_id": n|null} in creation
//     order; pass ?after_id=n&limit=k for the next page.
//   - Projects and members carry an ETag ("v<version>"). PUT requires
//     If-Match (428 without it); a stale If-Match, or losing a race with a
//     concurrent update, is 412. DELETE accepts an optional If-Match.
//   - Engine runs go through a bounded queue: 503 with Retry-After when it
//     is full, and when the store cannot be reached.
//
// Handlers are maker functions over explicit dependencies; every route is
// in routes.go.
package api

import (
	"io"
	"log/slog"
	"net/http"

	"residuum/assess"
	"residuum/internal/runqueue"
)

// Deps are what the API needs. Store and Queue are required. Log may be nil
// (messages are then discarded). Fallback, if not nil, serves every path
// outside /api/v1, /healthz and /readyz (the HTML pages); it runs behind
// the same middleware (request id, request log, panic recovery, body limit).
type Deps struct {
	Store    assess.Store
	Queue    *runqueue.Queue
	Log      *slog.Logger
	Fallback http.Handler
}

// New returns the handler of the whole service: the JSON API, the probes
// and, through d.Fallback, everything else.
func New(d Deps) http.Handler {
	return newRouter(d)
}

func discardLogger() *slog.Logger { return slog.New(slog.NewTextHandler(io.Discard, nil)) }
