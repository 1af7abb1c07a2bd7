package api

import (
	"context"
	"encoding/json"
	"errors"
	"net/http"
	"sync"
	"testing"
	"time"

	"residuum/assess"
)

func TestAssessmentLifecycle(t *testing.T) {
	t.Parallel()
	e := newEnv(t)
	pid := e.createProject("Assessments")
	m := e.createMember(pid, "slab.json", "")
	path := memberPath(m.ID) + "/assessments"

	var recs []assess.AssessmentRecord
	for i, body := range []any{nil, map[string]string{"author": "A. Tester"}} {
		res := e.do("POST", path, body)
		if res.Code != http.StatusCreated {
			t.Fatalf("POST assessment %d = %d %.500s, want 201", i+1, res.Code, res.Body)
		}
		var a assess.AssessmentRecord
		res.decode(t, &a)
		if a.Revision != i+1 || a.MemberID != m.ID || a.ProjectID != pid || a.State != assess.StateDraft {
			t.Errorf("revision %d = %+v", i+1, a)
		}
		if len(a.Input) == 0 || len(a.Result) == 0 || a.MethodVersion != assess.MethodVersion || a.InputHash == "" {
			t.Errorf("revision %d lacks input, result, method version or hash", i+1)
		}
		if got := res.Header.Get("Location"); got != assessmentPath(a.ID) {
			t.Errorf("Location = %q, want %q", got, assessmentPath(a.ID))
		}
		recs = append(recs, a)
	}
	if recs[1].Author != "A. Tester" {
		t.Errorf("author = %q, want %q", recs[1].Author, "A. Tester")
	}
	// The summary columns agree with the stored result.
	var res1 assess.Result
	if err := json.Unmarshal(recs[0].Result, &res1); err != nil {
		t.Fatal(err)
	}
	if recs[0].SaggingRatio == nil || *recs[0].SaggingRatio != res1.Capacity.Sagging.Ratio {
		t.Errorf("sagging_ratio = %v, want the result's %g", recs[0].SaggingRatio, res1.Capacity.Sagging.Ratio)
	}
	if recs[0].DamageClass != res1.Damage.Label || recs[0].Action != res1.Action {
		t.Errorf("damage class %q action %q, want %q %q", recs[0].DamageClass, recs[0].Action, res1.Damage.Label, res1.Action)
	}

	res := e.do("GET", path, nil)
	var l list[assess.AssessmentRecord]
	res.decode(t, &l)
	if len(l.Items) != 2 || l.Items[0].Revision != 1 || l.Items[1].Revision != 2 || l.Items[0].Result != nil {
		t.Errorf("revision list = %+v, want revisions 1, 2 without results", l.Items)
	}
	res = e.do("GET", path+"/2", nil)
	var a assess.AssessmentRecord
	res.decode(t, &a)
	if res.Code != http.StatusOK || a.ID != recs[1].ID || len(a.Result) == 0 {
		t.Errorf("GET revision 2 = %d id %d, want %d with result", res.Code, a.ID, recs[1].ID)
	}
	if res := e.do("GET", path+"/3", nil); res.Code != http.StatusNotFound {
		t.Errorf("GET revision 3 = %d, want 404", res.Code)
	}
	res = e.do("GET", assessmentPath(recs[0].ID), nil)
	res.decode(t, &a)
	if res.Code != http.StatusOK || a.Revision != 1 || !jsonEqual(a.Result, recs[0].Result) {
		t.Errorf("GET assessment = %d revision %d, want 200, revision 1 with the same result", res.Code, a.Revision)
	}

	res = e.do("POST", assessmentPath(recs[0].ID)+"/issue", nil)
	res.decode(t, &a)
	if res.Code != http.StatusOK || a.State != assess.StateIssued || a.IssuedAt == nil {
		t.Errorf("issue = %d %+v, want 200 issued with issued_at", res.Code, a.State)
	}
	if res := e.do("POST", assessmentPath(recs[0].ID)+"/issue", nil); res.Code != http.StatusConflict {
		t.Errorf("issue twice = %d, want 409", res.Code)
	} else {
		res.problem(t)
	}
	if res := e.do("DELETE", memberPath(m.ID), nil); res.Code != http.StatusConflict {
		t.Errorf("DELETE member with an issued revision = %d, want 409", res.Code)
	}
	if res := e.do("DELETE", projectPath(pid), nil); res.Code != http.StatusConflict {
		t.Errorf("DELETE project with an issued revision = %d, want 409", res.Code)
	}

	res = e.do("GET", projectPath(pid)+"/latest-assessments", nil)
	res.decode(t, &l)
	if len(l.Items) != 1 || l.Items[0].Revision != 2 {
		t.Errorf("latest assessments = %+v, want revision 2 of the one member", l.Items)
	}

	if res := e.do("DELETE", projectPath(pid)+"?force=true", nil); res.Code != http.StatusNoContent {
		t.Errorf("DELETE ?force=true = %d, want 204", res.Code)
	}
	if res := e.do("POST", path, nil); res.Code != http.StatusConflict {
		t.Errorf("POST assessment in a soft-deleted project = %d %s, want 409", res.Code, res.Body)
	}
	if res := e.do("POST", memberPath(999999)+"/assessments", nil); res.Code != http.StatusNotFound {
		t.Errorf("POST assessment of a missing member = %d, want 404", res.Code)
	}
	if res := e.do("POST", path, `{"writer": "x"}`); res.Code != http.StatusBadRequest {
		t.Errorf("POST assessment with an unknown field = %d, want 400", res.Code)
	}
}

// TestAssessStateless: POST /api/v1/assess answers the result and stores
// nothing; bad input is 400 (not JSON) or 422 naming the field.
func TestAssessStateless(t *testing.T) {
	t.Parallel()
	e := newEnv(t)
	in := readTestdata(t, "beam.json")
	res := e.do("POST", "/api/v1/assess", in)
	if res.Code != http.StatusOK {
		t.Fatalf("POST /api/v1/assess = %d %.500s, want 200", res.Code, res.Body)
	}
	var r assess.Result
	res.decode(t, &r)
	if r.MethodVersion != assess.MethodVersion || r.Member.Label != "test beam" || !(r.Capacity.Sagging.UndamagedKNm > 0) {
		t.Errorf("result: method %q label %q sagging %g, want %q, %q, > 0", r.MethodVersion, r.Member.Label, r.Capacity.Sagging.UndamagedKNm, assess.MethodVersion, "test beam")
	}
	ps, err := e.store.ListProjects(context.Background(), assess.ProjectFilter{IncludeDeleted: true}, assess.Page{})
	if err != nil || len(ps) != 0 {
		t.Errorf("store after /assess: %d projects, %v; want none", len(ps), err)
	}
	if res := e.do("POST", "/api/v1/assess", `{"member": `); res.Code != http.StatusBadRequest {
		t.Errorf("malformed input = %d, want 400", res.Code)
	}
	var bad map[string]any
	_ = json.Unmarshal(in, &bad)
	bad["options"].(map[string]any)["cell_mm"] = 500
	res = e.do("POST", "/api/v1/assess", bad)
	if res.Code != http.StatusUnprocessableEntity {
		t.Fatalf("cell_mm 500 = %d, want 422", res.Code)
	}
	if p := res.problem(t); len(p.Errors) == 0 || p.Errors[0].Field != "options.cell_mm" {
		t.Errorf("cell_mm 500: errors %+v, want options.cell_mm", p.Errors)
	}
	if res := e.do("POST", "/api/v1/assess", nil); res.Code != http.StatusBadRequest {
		t.Errorf("no body = %d, want 400", res.Code)
	}
}

// TestQueueFull: with the only worker busy and no waiting room, an engine
// request is refused at once with 503 and Retry-After.
func TestQueueFull(t *testing.T) {
	t.Parallel()
	e := newEnv(t, withQueue(1, 0, time.Minute))
	started, release := make(chan struct{}), make(chan struct{})
	var once sync.Once
	free := func() { once.Do(func() { close(release) }) }
	defer free() // whatever happens, the worker is released before Close
	done := make(chan error, 1)
	go func() {
		done <- e.queue.Do(context.Background(), func(ctx context.Context) error {
			close(started)
			select {
			case <-release:
			case <-ctx.Done():
			}
			return nil
		})
	}()
	<-started
	t0 := time.Now()
	res := e.do("POST", "/api/v1/assess", readTestdata(t, "beam.json"))
	if res.Code != http.StatusServiceUnavailable {
		t.Fatalf("POST /assess on a full queue = %d, want 503", res.Code)
	}
	if res.Header.Get("Retry-After") == "" {
		t.Error("503 without Retry-After")
	}
	res.problem(t)
	if d := time.Since(t0); d > 2*time.Second {
		t.Errorf("refusal took %v, want immediate", d)
	}
	pid := e.createProject("Busy")
	m := e.createMember(pid, "slab.json", "")
	if res := e.do("POST", memberPath(m.ID)+"/assessments", nil); res.Code != http.StatusServiceUnavailable {
		t.Errorf("POST assessment on a full queue = %d, want 503", res.Code)
	}
	free()
	if err := <-done; err != nil {
		t.Fatal(err)
	}
	if res := e.do("POST", memberPath(m.ID)+"/assessments", nil); res.Code != http.StatusCreated {
		t.Errorf("POST assessment after the queue emptied = %d, want 201", res.Code)
	}
}

// TestClientDisconnectCancelsRun: a client that goes away cancels its
// engine run; the worker is freed long before the run would have ended and
// nothing is stored.
func TestClientDisconnectCancelsRun(t *testing.T) {
	t.Parallel()
	e := newEnv(t, withQueue(1, 0, time.Minute))
	pid := e.createProject("Cancel")
	m := e.createMember(pid, "slow-beam.json", "")
	ctx, cancel := context.WithCancel(context.Background())
	done := make(chan *response, 1)
	go func() {
		done <- e.do("POST", memberPath(m.ID)+"/assessments", nil, withContext(ctx))
	}()
	deadline := time.Now().Add(10 * time.Second)
	for e.queue.Busy() == 0 {
		if time.Now().After(deadline) {
			t.Fatal("the run never started")
		}
		time.Sleep(5 * time.Millisecond)
	}
	cancel()
	t0 := time.Now()
	select {
	case res := <-done:
		if res.Code == http.StatusCreated {
			t.Errorf("cancelled run answered 201")
		}
	case <-time.After(20 * time.Second):
		t.Fatal("the handler did not return within 20 s of the client leaving")
	}
	t.Logf("run stopped %v after the client left", time.Since(t0))
	as, err := e.store.ListAssessments(context.Background(), m.ID, assess.Page{})
	if err != nil || len(as) != 0 {
		t.Errorf("assessments after a cancelled run: %d, %v; want none", len(as), err)
	}
}

// failingStore fails every call it overrides with err.
type failingStore struct {
	assess.Store
	err error
}

func (s failingStore) ListProjects(context.Context, assess.ProjectFilter, assess.Page) ([]assess.Project, error) {
	return nil, s.err
}
func (s failingStore) Ping(context.Context) error { return s.err }

// TestStoreFailures: an unreachable store is 503 with Retry-After; any other
// store error is a 500 that does not show its text.
func TestStoreFailures(t *testing.T) {
	t.Parallel()
	tests := []struct {
		name     string
		err      error
		wantCode int
	}{
		{"unavailable is 503", errors.Join(assess.ErrUnavailable, errors.New("dial tcp 10.0.0.9:5432: connection refused")), 503},
		{"anything else is 500", errors.New("near \"SELEC\": syntax error in secret_table"), 500},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			e := newEnv(t, withStore(func(s assess.Store) assess.Store { return failingStore{s, tt.err} }))
			for _, path := range []string{"/api/v1/projects", "/readyz"} {
				res := e.do("GET", path, nil)
				want := tt.wantCode
				if path == "/readyz" {
					want = 503 // any ping failure means not ready
				}
				if res.Code != want {
					t.Errorf("GET %s = %d, want %d", path, res.Code, want)
					continue
				}
				res.problem(t)
				if res.contains("secret_table") || res.contains("10.0.0.9") {
					t.Errorf("GET %s leaks the internal error: %s", path, res.Body)
				}
				if want == 503 && res.Header.Get("Retry-After") == "" {
					t.Errorf("GET %s: 503 without Retry-After", path)
				}
			}
		})
	}
}

func TestHealth(t *testing.T) {
	t.Parallel()
	e := newEnv(t)
	for _, path := range []string{"/healthz", "/readyz"} {
		if res := e.do("GET", path, nil); res.Code != http.StatusOK {
			t.Errorf("GET %s = %d, want 200", path, res.Code)
		}
	}
	res := e.do("GET", "/api/v1/openapi.json", nil)
	var doc map[string]any
	res.decode(t, &doc)
	if doc["openapi"] != "3.1.0" {
		t.Errorf("served document has openapi %v, want 3.1.0", doc["openapi"])
	}
	if res.Header.Get("X-Request-Id") == "" {
		t.Error("answer without X-Request-Id")
	}
}
