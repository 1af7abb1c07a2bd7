package api

import (
	"encoding/json"
	"fmt"
	"log/slog"
	"net/http"
	"strconv"
	"time"

	"residuum/assess"
)

// memberRequest is the body of a member create or update. Label and kind may
// be left out: they are then taken from input.member. An update replaces
// every field.
type memberRequest struct {
	Label    string          `json:"label"`
	Location string          `json:"location"`
	Kind     string          `json:"kind"`
	Input    json.RawMessage `json:"input"`
}

// memberJSON is a member as the API shows it. Lists leave Input out.
type memberJSON struct {
	ID        int64           `json:"id"`
	ProjectID int64           `json:"project_id"`
	Label     string          `json:"label"`
	Location  string          `json:"location"`
	Kind      string          `json:"kind"`
	Input     json.RawMessage `json:"input,omitempty"`
	Version   int64           `json:"version"`
	CreatedAt time.Time       `json:"created_at"`
	UpdatedAt time.Time       `json:"updated_at"`
}

func newMemberJSON(m *assess.MemberRecord, withInput bool) memberJSON {
	j := memberJSON{
		ID: m.ID, ProjectID: m.ProjectID, Label: m.Label, Location: m.Location, Kind: m.Kind,
		Version: m.Version, CreatedAt: m.CreatedAt, UpdatedAt: m.UpdatedAt,
	}
	if withInput {
		j.Input = m.Input
	}
	return j
}

func memberPath(id int64) string { return "/api/v1/members/" + strconv.FormatInt(id, 10) }

// apply validates the request and copies it into m. The input must be a
// valid assessment input; its problems are reported under "input.".
func (mr memberRequest) apply(m *assess.MemberRecord) error {
	var prob assess.InvalidError
	if len(mr.Input) == 0 || string(mr.Input) == "null" {
		prob.Add("input", "is required (the assessment input object, as for POST /api/v1/assess)")
		return prob.Err()
	}
	in, err := decodeInput(mr.Input)
	if err != nil {
		return prefixProblems(err, "input")
	}
	if mr.Kind == "" {
		mr.Kind = in.Member.Kind
	} else if mr.Kind != in.Member.Kind {
		prob.Addf("kind", "must match input.member.kind %q, got %q", in.Member.Kind, mr.Kind)
	}
	if mr.Label == "" {
		mr.Label = in.Member.Label
	}
	if mr.Label == "" {
		prob.Add("label", "is required (1–200 characters) when input.member.label is empty")
	}
	m.Label, m.Location, m.Kind, m.Input = mr.Label, mr.Location, mr.Kind, mr.Input
	return prob.Err()
}

// handleMemberList lists a project's members in creation order, without
// their inputs (GET the member for that).
func handleMemberList(store assess.Store, log *slog.Logger) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		pid, err := pathID(r, "projectID")
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		pg, err := page(r)
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		ms, err := store.ListMembers(r.Context(), pid, pg)
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		// The hot list path: appended by hand into a pooled buffer instead
		// of through encoding/json's reflection (same bytes, see
		// appendMemberList).
		buf := getBuf()
		defer putBuf(buf)
		body, err := appendMemberList(*buf, ms, pg)
		if err != nil {
			serveError(w, r, log, fmt.Errorf("encode response: %w", err))
			return
		}
		*buf = body
		writeJSON(w, http.StatusOK, body)
	})
}

// appendMemberList appends the list answer for one page of members (their
// inputs left out) followed by a newline: byte for byte what marshal gives
// for newList of their memberJSON values, which TestAppendMemberList checks.
// Keep it in step with memberJSON and list.
func appendMemberList(b []byte, ms []assess.MemberRecord, pg assess.Page) ([]byte, error) {
	b = append(b, `{"items":[`...)
	for i := range ms {
		if i > 0 {
			b = append(b, ',')
		}
		var err error
		if b, err = appendMember(b, &ms[i]); err != nil {
			return nil, err
		}
	}
	b = append(b, `],"next_after_id":`...)
	if n := len(ms); n > 0 && n == pg.Limit { // as newList: a full page may be followed by more
		b = strconv.AppendInt(b, ms[n-1].ID, 10)
	} else {
		b = append(b, "null"...)
	}
	return append(b, "}\n"...), nil
}

// appendMember appends one member as memberJSON without its input.
func appendMember(b []byte, m *assess.MemberRecord) ([]byte, error) {
	b = append(b, `{"id":`...)
	b = strconv.AppendInt(b, m.ID, 10)
	b = append(b, `,"project_id":`...)
	b = strconv.AppendInt(b, m.ProjectID, 10)
	b = append(b, `,"label":`...)
	b = appendJSONString(b, m.Label)
	b = append(b, `,"location":`...)
	b = appendJSONString(b, m.Location)
	b = append(b, `,"kind":`...)
	b = appendJSONString(b, m.Kind)
	b = append(b, `,"version":`...)
	b = strconv.AppendInt(b, m.Version, 10)
	b = append(b, `,"created_at":`...)
	b, err := appendJSONTime(b, m.CreatedAt)
	if err != nil {
		return nil, err
	}
	b = append(b, `,"updated_at":`...)
	if b, err = appendJSONTime(b, m.UpdatedAt); err != nil {
		return nil, err
	}
	return append(b, '}'), nil
}

// appendJSONTime appends t as time.Time's MarshalJSON does: a quoted RFC
// 3339 time with as many fractional digits as needed (none for a whole
// second). Like MarshalJSON it refuses years outside 0–9999, which RFC 3339
// cannot write.
func appendJSONTime(b []byte, t time.Time) ([]byte, error) {
	if y := t.Year(); y < 0 || y > 9999 {
		return nil, fmt.Errorf("time %v: year outside of range [0,9999]", t)
	}
	b = append(b, '"')
	b = t.AppendFormat(b, time.RFC3339Nano)
	return append(b, '"'), nil
}

// handleMemberCreate adds a member to a project and answers 201 with it.
func handleMemberCreate(store assess.Store, log *slog.Logger) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		pid, err := pathID(r, "projectID")
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		req, err := decode[memberRequest](w, r)
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		m := assess.MemberRecord{ProjectID: pid}
		if err := req.apply(&m); err != nil {
			serveError(w, r, log, err)
			return
		}
		if err := store.CreateMember(r.Context(), &m); err != nil {
			serveError(w, r, log, err)
			return
		}
		w.Header().Set("Location", memberPath(m.ID))
		w.Header().Set("ETag", etag(m.Version))
		encode(w, r, log, http.StatusCreated, newMemberJSON(&m, true))
	})
}

// handleMemberGet answers one member with its input and its ETag.
func handleMemberGet(store assess.Store, log *slog.Logger) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		id, err := pathID(r, "memberID")
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		m, err := store.GetMember(r.Context(), id)
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		w.Header().Set("ETag", etag(m.Version))
		encode(w, r, log, http.StatusOK, newMemberJSON(m, true))
	})
}

// handleMemberUpdate replaces a member's label, location, kind and input.
// It requires If-Match (428 without it); a version that is not the current
// one, or a concurrent update that got in first, gives 412. Exactly one of
// several clients updating from the same version succeeds.
func handleMemberUpdate(store assess.Store, log *slog.Logger) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		id, err := pathID(r, "memberID")
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
		req, err := decode[memberRequest](w, r)
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		m, err := store.GetMember(r.Context(), id)
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		what := fmt.Sprintf("member %d", id)
		if err := checkVersion(want, m.Version, what); err != nil {
			serveError(w, r, log, err)
			return
		}
		if err := req.apply(m); err != nil {
			serveError(w, r, log, err)
			return
		}
		used := m.Version
		if err := store.UpdateMember(r.Context(), m); err != nil {
			serveError(w, r, log, versionConflict(err, used, func() (int64, error) {
				cur, err := store.GetMember(r.Context(), id)
				if err != nil {
					return 0, err
				}
				return cur.Version, nil
			}, what))
			return
		}
		w.Header().Set("ETag", etag(m.Version))
		encode(w, r, log, http.StatusOK, newMemberJSON(m, true))
	})
}

// handleMemberDelete deletes a member and its drafts; a member with an
// issued assessment is kept (409). If-Match is optional here; a stale one
// gives 412.
func handleMemberDelete(store assess.Store, log *slog.Logger) http.Handler {
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		id, err := pathID(r, "memberID")
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		want, _, err := ifMatch(r)
		if err != nil {
			serveError(w, r, log, err)
			return
		}
		if want != 0 {
			m, err := store.GetMember(r.Context(), id)
			if err != nil {
				serveError(w, r, log, err)
				return
			}
			if err := checkVersion(want, m.Version, fmt.Sprintf("member %d", id)); err != nil {
				serveError(w, r, log, err)
				return
			}
		}
		if err := store.DeleteMember(r.Context(), id); err != nil {
			serveError(w, r, log, err)
			return
		}
		w.WriteHeader(http.StatusNoContent)
	})
}
