package api

import (
	"fmt"
	"log/slog"
	"net/http"
	"strconv"

	"github.com/go-chi/chi/v5"

	"residuum/assess"
	"residuum/internal/runqueue"
)

func assessmentPath(id int64) string { return "/api/v1/assessments/" + strconv.FormatInt(id, 10) }

// handleAssess runs the engine on the posted input and answers the result,
// storing nothing. The answer is byte for byte what `residuum assess
// -format json` prints for the same input.
func handleAssess(q *runqueue.Queue, log *slog.Logger) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		body, err := readBody(w, r)
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		if body == nil {
			serveError(w, r, log, &badRequest{Msg: "a JSON request body is required (the assessment input)"})
			return
		}
		in, err := decodeInput(body)
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		res, err := runEngine(r.Context(), q, in)
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		out, err := resultJSON(res)
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		writeJSON(w, http.StatusOK, out)
	})
}

// handleAssessmentCreate runs the engine on a member's stored input and
// stores the result as its next draft revision (201). The body is optional:
// {"author": "..."}.
func handleAssessmentCreate(store assess.Store, q *runqueue.Queue, log *slog.Logger) http.Handler {
	type request struct {
		Author string `json:"author"`
	}
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		id, err := pathID(r, "memberID")
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		body, err := readBody(w, r)
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		var req request
		if body != nil {
			if err := unmarshalStrict(body, &req); err != nil {
				serveError(w, r, log, err)
				return
			}
		}
		m, err := store.GetMember(r.Context(), id)
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		a, err := Assess(r.Context(), store, q, m, req.Author)
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		w.Header().Set("Location", assessmentPath(a.ID))
		encode(w, r, log, http.StatusCreated, a)
	})
}

// handleAssessmentList lists a member's revisions in order, without their
// input and result.
func handleAssessmentList(store assess.Store, log *slog.Logger) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		id, err := pathID(r, "memberID")
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		pg, err := page(r)
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		as, err := store.ListAssessments(r.Context(), id, pg)
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		encode(w, r, log, http.StatusOK, newList(as, pg, func(a assess.AssessmentRecord) int64 { return a.ID }))
	})
}

// handleRevisionGet answers revision n of a member, with input and result.
func handleRevisionGet(store assess.Store, log *slog.Logger) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		id, err := pathID(r, "memberID")
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		rev, err := pathID(r, "revision")
		if err != nil || rev > 1<<31-1 {
			serveError(w, r, log, &badRequest{Field: "revision", Msg: fmt.Sprintf("must be a revision number ≥ 1, got %q", chi.URLParam(r, "revision"))})
			return
		}
		a, err := store.GetRevision(r.Context(), id, int(rev))
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		encode(w, r, log, http.StatusOK, a)
	})
}

// handleAssessmentGet answers one assessment with its input and result.
func handleAssessmentGet(store assess.Store, log *slog.Logger) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		id, err := pathID(r, "assessmentID")
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		a, err := store.GetAssessment(r.Context(), id)
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		encode(w, r, log, http.StatusOK, a)
	})
}

// handleAssessmentIssue issues a draft revision; an issued one cannot be
// issued again (409) and is never changed afterwards.
func handleAssessmentIssue(store assess.Store, log *slog.Logger) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		id, err := pathID(r, "assessmentID")
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		a, err := store.IssueAssessment(r.Context(), id)
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		encode(w, r, log, http.StatusOK, a)
	})
}

// handleLatestAssessments answers, for each member of a project that has
// been assessed, its latest revision without input and result: the rows of
// a triage table.
func handleLatestAssessments(store assess.Store, log *slog.Logger) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		id, err := pathID(r, "projectID")
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		as, err := store.ListLatestAssessments(r.Context(), id)
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		if as == nil {
			as = []assess.AssessmentRecord{}
		}
		encode(w, r, log, http.StatusOK, list[assess.AssessmentRecord]{Items: as})
	})
}
