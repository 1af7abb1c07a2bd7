package api

import (
	"context"
	"errors"
	"fmt"
	"log/slog"
	"net/http"
	"strconv"

	"github.com/go-chi/chi/v5/middleware"

	"residuum/assess"
	"residuum/internal/runqueue"
)

// problem is an RFC 9457 problem details object, sent as
// application/problem+json for every error answer.
type problem struct {
	Type      string           `json:"type"`
	Title     string           `json:"title"`
	Status    int              `json:"status"`
	Detail    string           `json:"detail"`
	Instance  string           `json:"instance,omitempty"`
	RequestID string           `json:"request_id,omitempty"`
	Errors    []assess.Problem `json:"errors,omitempty"`
}

// Problem type URIs. They are URNs rather than links: the title and the
// OpenAPI document describe them.
const (
	typeBadRequest     = "urn:residuum:problem:bad-request"
	typeInvalid        = "urn:residuum:problem:invalid-input"
	typeNotFound       = "urn:residuum:problem:not-found"
	typeMethod         = "urn:residuum:problem:method-not-allowed"
	typeConflict       = "urn:residuum:problem:conflict"
	typePrecondition   = "urn:residuum:problem:precondition-failed"
	typeNeedsIfMatch   = "urn:residuum:problem:precondition-required"
	typeTooLarge       = "urn:residuum:problem:request-too-large"
	typeMediaType      = "urn:residuum:problem:unsupported-media-type"
	typeBusy           = "urn:residuum:problem:busy"
	typeUnavailable    = "urn:residuum:problem:unavailable"
	typeInternal       = "urn:residuum:problem:internal"
	typeClientGone     = "urn:residuum:problem:client-closed-request"
	retryAfterBusy     = 2  // s: the queue turns over quickly
	retryAfterStore    = 5  // s: a database restart or failover
	retryAfterTimedOut = 30 // s: the machine is overloaded
)

// statusClientClosed is the (non-standard, widely logged) status recorded
// when the client went away before the answer was ready.
const statusClientClosed = 499

// Request errors raised by the handlers themselves; the store and the engine
// raise the assess kinds.
var (
	errBadRequest           = errors.New("bad request")
	errUnsupportedMedia     = errors.New("unsupported media type")
	errPreconditionFailed   = errors.New("precondition failed")
	errPreconditionRequired = errors.New("precondition required")
)

// badRequest is a malformed request: a body that is not JSON, a path or
// query parameter that is not a number. Field names the offending part.
type badRequest struct {
	Field string
	Msg   string
}

func (e *badRequest) Error() string {
	if e.Field == "" {
		return e.Msg
	}
	return e.Field + ": " + e.Msg
}

func (e *badRequest) Is(target error) bool { return target == errBadRequest }

// serveError is the only place that chooses the status for an error. It
// writes a problem document, logs internal errors with their text (500s
// only) and never sends the text of an internal error to the client.
func serveError(w http.ResponseWriter, r *http.Request, log *slog.Logger, err error) {
	p := problem{
		Instance:  r.URL.Path,
		RequestID: middleware.GetReqID(r.Context()),
	}
	retry := 0
	var (
		inv *assess.InvalidError
		bad *badRequest
		big *http.MaxBytesError
	)
	switch {
	case errors.As(err, &big):
		p.Type, p.Status, p.Title = typeTooLarge, http.StatusRequestEntityTooLarge, "Request body too large"
		p.Detail = fmt.Sprintf("the request body is limited to %d bytes", big.Limit)
	case errors.Is(err, errUnsupportedMedia):
		p.Type, p.Status, p.Title = typeMediaType, http.StatusUnsupportedMediaType, "Unsupported media type"
		p.Detail = "send the request body as application/json"
	case errors.As(err, &bad):
		p.Type, p.Status, p.Title = typeBadRequest, http.StatusBadRequest, "Bad request"
		p.Detail = bad.Error()
		p.Errors = []assess.Problem{{Field: bad.Field, Message: bad.Msg}}
	case errors.As(err, &inv):
		p.Type, p.Status, p.Title = typeInvalid, http.StatusUnprocessableEntity, "Invalid input"
		p.Detail = fmt.Sprintf("the input has %d problem(s); see errors", len(inv.Problems))
		p.Errors = inv.Problems
		if len(p.Errors) == 0 {
			p.Detail = "the input is invalid"
			p.Errors = []assess.Problem{{Message: "the input is invalid"}}
		}
	case errors.Is(err, assess.ErrInvalid):
		p.Type, p.Status, p.Title = typeInvalid, http.StatusUnprocessableEntity, "Invalid input"
		p.Detail = err.Error()
		p.Errors = []assess.Problem{{Message: err.Error()}}
	case errors.Is(err, errPreconditionRequired):
		p.Type, p.Status, p.Title = typeNeedsIfMatch, http.StatusPreconditionRequired, "If-Match required"
		p.Detail = "send the ETag of the version you edited in an If-Match header"
	case errors.Is(err, errPreconditionFailed):
		p.Type, p.Status, p.Title = typePrecondition, http.StatusPreconditionFailed, "Version changed"
		p.Detail = err.Error()
	case errors.Is(err, assess.ErrNotFound):
		p.Type, p.Status, p.Title = typeNotFound, http.StatusNotFound, "Not found"
		p.Detail = err.Error()
	case errors.Is(err, assess.ErrConflict):
		p.Type, p.Status, p.Title = typeConflict, http.StatusConflict, "Conflict"
		p.Detail = err.Error()
	case errors.Is(err, runqueue.ErrFull):
		p.Type, p.Status, p.Title = typeBusy, http.StatusServiceUnavailable, "Busy"
		p.Detail = "every assessment worker is busy and the queue is full; retry shortly"
		retry = retryAfterBusy
	case errors.Is(err, runqueue.ErrClosed):
		p.Type, p.Status, p.Title = typeBusy, http.StatusServiceUnavailable, "Shutting down"
		p.Detail = "the service is shutting down; retry shortly"
		retry = retryAfterStore
	case errors.Is(err, runqueue.ErrTimeout):
		p.Type, p.Status, p.Title = typeBusy, http.StatusServiceUnavailable, "Assessment timed out"
		p.Detail = "the assessment did not finish within the per-run time limit; retry later or use a coarser options.cell_mm"
		retry = retryAfterTimedOut
	case errors.Is(err, assess.ErrUnavailable):
		p.Type, p.Status, p.Title = typeUnavailable, http.StatusServiceUnavailable, "Store unavailable"
		p.Detail = "the database cannot be reached right now; retry shortly"
		retry = retryAfterStore
		log.LogAttrs(r.Context(), slog.LevelWarn, "store unavailable",
			slog.String("request_id", p.RequestID), slog.String("error", err.Error()))
	case r.Context().Err() != nil && errors.Is(err, context.Canceled):
		// The client went away; nobody reads this answer, the log keeps it.
		p.Type, p.Status, p.Title = typeClientGone, statusClientClosed, "Client closed request"
		p.Detail = "the request was cancelled by the client"
	default:
		p.Type, p.Status, p.Title = typeInternal, http.StatusInternalServerError, "Internal error"
		p.Detail = "the server could not complete the request; the problem has been logged"
		if p.RequestID != "" {
			p.Detail += " under request id " + p.RequestID
		}
		log.LogAttrs(r.Context(), slog.LevelError, "internal error",
			slog.String("request_id", p.RequestID), slog.String("method", r.Method),
			slog.String("path", r.URL.Path), slog.String("error", err.Error()))
	}
	if retry > 0 {
		w.Header().Set("Retry-After", strconv.Itoa(retry))
	}
	writeProblem(w, p)
}

// writeProblem sends p as application/problem+json.
func writeProblem(w http.ResponseWriter, p problem) {
	body, err := marshal(p)
	if err != nil { // cannot happen for this type; keep the status anyway
		body = []byte(`{"type":"` + typeInternal + `","title":"Internal error","status":500,"detail":""}` + "\n")
	}
	h := w.Header()
	h.Set("Content-Type", "application/problem+json")
	h.Set("X-Content-Type-Options", "nosniff")
	h.Del("ETag")
	w.WriteHeader(p.Status)
	_, _ = w.Write(body)
}

// notFound answers routes that do not exist.
func notFound(w http.ResponseWriter, r *http.Request) {
	writeProblem(w, problem{
		Type: typeNotFound, Title: "Not found", Status: http.StatusNotFound,
		Detail: "no route for " + r.URL.Path, Instance: r.URL.Path,
		RequestID: middleware.GetReqID(r.Context()),
	})
}

// methodNotAllowed answers a route that exists with another method.
func methodNotAllowed(w http.ResponseWriter, r *http.Request) {
	writeProblem(w, problem{
		Type: typeMethod, Title: "Method not allowed", Status: http.StatusMethodNotAllowed,
		Detail: r.Method + " is not allowed on " + r.URL.Path, Instance: r.URL.Path,
		RequestID: middleware.GetReqID(r.Context()),
	})
}
