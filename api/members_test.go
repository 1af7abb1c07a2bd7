package api

import (
	"bytes"
	"encoding/json"
	"fmt"
	"net/http"
	"net/http/httptest"
	"strings"
	"sync"
	"sync/atomic"
	"testing"
)

func TestMemberCRUD(t *testing.T) {
	t.Parallel()
	e := newEnv(t)
	pid := e.createProject("Members")
	m := e.createMember(pid, "slab.json", "")
	// label and kind default to input.member.label and .kind.
	if m.Label != "test slab" || m.Kind != "slab" || m.ProjectID != pid || m.Version != 1 || len(m.Input) == 0 {
		t.Errorf("created member = %+v, want label %q, kind slab, project %d, version 1, with input", m, "test slab", pid)
	}
	path := memberPath(m.ID)
	res := e.do("GET", path, nil)
	if res.Code != http.StatusOK || res.Header.Get("ETag") != `"v1"` {
		t.Fatalf("GET member = %d ETag %q, want 200 \"v1\"", res.Code, res.Header.Get("ETag"))
	}
	var got memberJSON
	res.decode(t, &got)
	if !jsonEqual(got.Input, readTestdata(t, "slab.json")) {
		t.Errorf("GET member input differs from the input posted")
	}

	upd := map[string]any{"label": "S9", "location": "grid A/1", "input": json.RawMessage(readTestdata(t, "beam.json"))}
	if res := e.do("PUT", path, upd); res.Code != http.StatusPreconditionRequired {
		t.Errorf("PUT without If-Match = %d, want 428", res.Code)
	}
	res = e.do("PUT", path, upd, header("If-Match", `"v1"`))
	if res.Code != http.StatusOK || res.Header.Get("ETag") != `"v2"` {
		t.Fatalf("PUT = %d %s, want 200 with ETag \"v2\"", res.Code, res.Body)
	}
	res.decode(t, &got)
	if got.Label != "S9" || got.Location != "grid A/1" || got.Kind != "beam" || got.Version != 2 {
		t.Errorf("updated member = %+v, want S9, grid A/1, beam, version 2", got)
	}
	if res := e.do("PUT", path, upd, header("If-Match", `"v1"`)); res.Code != http.StatusPreconditionFailed {
		t.Errorf("PUT with the replaced version = %d, want 412", res.Code)
	} else if p := res.problem(t); !strings.Contains(p.Detail, "version 2") {
		t.Errorf("412 detail %q does not name the current version", p.Detail)
	}

	res = e.do("GET", projectPath(pid)+"/members", nil)
	var l list[memberJSON]
	res.decode(t, &l)
	if len(l.Items) != 1 || l.Items[0].ID != m.ID || l.Items[0].Input != nil {
		t.Errorf("member list = %+v, want the one member without its input", l.Items)
	}
	if res := e.do("DELETE", path, nil, header("If-Match", `"v1"`)); res.Code != http.StatusPreconditionFailed {
		t.Errorf("DELETE with a stale If-Match = %d, want 412", res.Code)
	}
	if res := e.do("DELETE", path, nil, header("If-Match", `"v2"`)); res.Code != http.StatusNoContent {
		t.Errorf("DELETE = %d %s, want 204", res.Code, res.Body)
	}
	if res := e.do("GET", path, nil); res.Code != http.StatusNotFound {
		t.Errorf("GET deleted member = %d, want 404", res.Code)
	}
}

// TestMemberValidation: problems of the engine input are reported with
// their JSON path under "input.", with the accepted range.
func TestMemberValidation(t *testing.T) {
	t.Parallel()
	e := newEnv(t)
	pid := e.createProject("Validation")
	var in map[string]any
	if err := json.Unmarshal(readTestdata(t, "slab.json"), &in); err != nil {
		t.Fatal(err)
	}
	in["member"].(map[string]any)["depth_mm"] = -5
	tests := []struct {
		name      string
		body      any
		wantCode  int
		wantField string
	}{
		{"an out-of-range depth names input.member.depth_mm", map[string]any{"input": in}, 422, "input.member.depth_mm"},
		{"a missing input", map[string]any{"label": "x"}, 422, "input"},
		{"an input that is not an object", map[string]any{"input": []int{1}}, 422, "input"},
		{"a kind that contradicts the input", map[string]any{"kind": "beam", "input": json.RawMessage(readTestdata(t, "slab.json"))}, 422, "kind"},
		{"an unknown kind", map[string]any{"kind": "column", "input": json.RawMessage(readTestdata(t, "slab.json"))}, 422, "kind"},
		{"an unknown input field", map[string]any{"input": map[string]any{"membre": map[string]any{}}}, 422, "input.membre"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			res := e.do("POST", projectPath(pid)+"/members", tt.body)
			if res.Code != tt.wantCode {
				t.Fatalf("POST member = %d %s, want %d", res.Code, res.Body, tt.wantCode)
			}
			p := res.problem(t)
			found := false
			for _, pr := range p.Errors {
				if pr.Field == tt.wantField && pr.Message != "" {
					found = true
				}
			}
			if !found {
				t.Errorf("errors = %+v, want one for %q", p.Errors, tt.wantField)
			}
		})
	}
	if res := e.do("POST", "/api/v1/projects/99999/members", map[string]any{"input": json.RawMessage(readTestdata(t, "slab.json"))}); res.Code != http.StatusNotFound {
		t.Errorf("POST member into a missing project = %d, want 404", res.Code)
	}
}

// TestConcurrentMemberEdits: 50 clients create members in one project and
// then all edit one shared member with read–modify–write under If-Match.
// Every client retries after a 412 until its own change is in. No update
// may be lost: the shared member's final notes list every client exactly
// once, and its version counts every successful update. Run with -race.
func TestConcurrentMemberEdits(t *testing.T) {
	t.Parallel()
	const clients = 50
	e := newEnv(t)
	srv := httptest.NewServer(e.h)
	defer srv.Close()
	pid := e.createProject("Concurrency")
	shared := e.createMember(pid, "slab.json", "shared")
	input := readTestdata(t, "slab.json")

	send := func(method, path, ifMatch string, body any) (int, string, []byte, error) {
		var raw []byte
		if body != nil {
			raw, _ = json.Marshal(body)
		}
		req, err := http.NewRequest(method, srv.URL+path, bytes.NewReader(raw))
		if err != nil {
			return 0, "", nil, err
		}
		if body != nil {
			req.Header.Set("Content-Type", "application/json")
		}
		if ifMatch != "" {
			req.Header.Set("If-Match", ifMatch)
		}
		res, err := srv.Client().Do(req)
		if err != nil {
			return 0, "", nil, err
		}
		defer res.Body.Close()
		var buf bytes.Buffer
		_, _ = buf.ReadFrom(res.Body)
		return res.StatusCode, res.Header.Get("ETag"), buf.Bytes(), nil
	}

	var wg sync.WaitGroup
	var ok, conflicts atomic.Int64
	errs := make(chan error, clients)
	for c := range clients {
		wg.Go(func() {
			code, _, body, err := send("POST", projectPath(pid)+"/members", "", map[string]any{"label": fmt.Sprintf("M%02d", c), "input": json.RawMessage(input)})
			if err != nil || code != http.StatusCreated {
				errs <- fmt.Errorf("client %d create = %d %s %v", c, code, body, err)
				return
			}
			for attempt := 0; ; attempt++ {
				if attempt > 500 {
					errs <- fmt.Errorf("client %d: no update after 500 attempts", c)
					return
				}
				code, tag, body, err := send("GET", memberPath(shared.ID), "", nil)
				if err != nil || code != http.StatusOK {
					errs <- fmt.Errorf("client %d get = %d %v", c, code, err)
					return
				}
				var m memberJSON
				if err := json.Unmarshal(body, &m); err != nil {
					errs <- err
					return
				}
				upd := map[string]any{"label": m.Label, "location": m.Location + fmt.Sprintf("[%02d]", c), "input": m.Input}
				code, _, body, err = send("PUT", memberPath(shared.ID), tag, upd)
				switch {
				case err != nil:
					errs <- err
					return
				case code == http.StatusOK:
					ok.Add(1)
					return
				case code == http.StatusPreconditionFailed:
					conflicts.Add(1)
				default:
					errs <- fmt.Errorf("client %d put = %d %s", c, code, body)
					return
				}
			}
		})
	}
	wg.Wait()
	close(errs)
	for err := range errs {
		t.Error(err)
	}
	res := e.do("GET", memberPath(shared.ID), nil)
	var m memberJSON
	res.decode(t, &m)
	for c := range clients {
		if n := strings.Count(m.Location, fmt.Sprintf("[%02d]", c)); n != 1 {
			t.Errorf("client %d's edit appears %d times in the final location, want 1 (lost or doubled update)", c, n)
		}
	}
	if got, want := m.Version, int64(1+ok.Load()); got != want {
		t.Errorf("final version = %d, want 1 + %d successful updates", got, ok.Load())
	}
	res = e.do("GET", projectPath(pid)+"/members?limit=200", nil)
	var l list[memberJSON]
	res.decode(t, &l)
	if len(l.Items) != clients+1 {
		t.Errorf("members = %d, want %d", len(l.Items), clients+1)
	}
	t.Logf("%d updates, %d conflicts reported as 412 and retried", ok.Load(), conflicts.Load())
}

// jsonEqual compares two JSON documents by value.
func jsonEqual(a, b []byte) bool {
	var x, y any
	if json.Unmarshal(a, &x) != nil || json.Unmarshal(b, &y) != nil {
		return false
	}
	xa, _ := json.Marshal(x)
	ya, _ := json.Marshal(y)
	return bytes.Equal(xa, ya)
}
