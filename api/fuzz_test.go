package api

import (
	"bytes"
	"encoding/json"
	"net/http"
	"net/http/httptest"
	"os"
	"path/filepath"
	"testing"
	"time"
)

// fuzzHang is how long one fuzzed request may take; engine runs are
// limited to 100 ms and must stop soon after.
const fuzzHang = 5 * time.Second

// fuzzRoutes are the requests whose bodies FuzzAPIRequestBodies mutates:
// every route that decodes a JSON body. Project 1 and member 1 exist.
var fuzzRoutes = []struct{ method, path, ifMatch string }{
	{"POST", "/api/v1/projects", ""},
	{"PUT", "/api/v1/projects/1", "*"},
	{"POST", "/api/v1/projects/1/members", ""},
	{"PUT", "/api/v1/members/1", "*"},
	{"POST", "/api/v1/members/1/assessments", ""},
	{"POST", "/api/v1/assess", ""},
}

// FuzzAPIRequestBodies sends arbitrary bodies to every route that decodes
// JSON. Whatever the body, the answer is never a 500 and never a panic (the
// Recoverer would turn one into a 500), and every error is a problem
// document. Valid engine inputs run under a 100 ms limit per run, so a
// mutated expensive input ends as 503, not as a long run; a request still
// going after fuzzHang is a failure (a run that ignores its context).
func FuzzAPIRequestBodies(f *testing.F) {
	for _, name := range []string{"slab.json", "beam.json"} {
		in, err := os.ReadFile(filepath.Join("testdata", name))
		if err != nil {
			f.Fatal(err)
		}
		wrapped, _ := json.Marshal(map[string]any{"label": "L", "input": json.RawMessage(in)})
		for i := range fuzzRoutes {
			f.Add(uint8(i), in)
			f.Add(uint8(i), wrapped)
		}
	}
	for i := range fuzzRoutes {
		for _, s := range []string{
			`{"name": "P"}`, `{"name": ""}`, `{}`, `[]`, `null`, `""`, `{"name": "\u0000"}`,
			`{"input": {}}`, `{"input": null}`, `{"author": 1}`, `{"member": {"kind": "slab", "depth_mm": 1e309}}`,
			`{"member": {"layers": [{"count": -1}]}}`, `{"fire": {"points": [[0, 20], [1]]}}`, `{"options": {"cell_mm": "5"}}`,
		} {
			f.Add(uint8(i), []byte(s))
		}
	}
	e := newEnv(f, withQueue(2, 2, 100*time.Millisecond))
	e.createProject("fuzz")
	e.createMember(1, "slab.json", "fuzz member")
	f.Fuzz(func(t *testing.T, route uint8, body []byte) {
		rt := fuzzRoutes[int(route)%len(fuzzRoutes)]
		req := httptest.NewRequest(rt.method, rt.path, bytes.NewReader(body))
		req.Header.Set("Content-Type", "application/json")
		if rt.ifMatch != "" {
			req.Header.Set("If-Match", rt.ifMatch)
		}
		rec := httptest.NewRecorder()
		done := make(chan struct{})
		go func() {
			defer close(done)
			e.h.ServeHTTP(rec, req)
		}()
		select {
		case <-done:
		case <-time.After(fuzzHang):
			// The run limit is 100 ms: a run that goes on does not honour
			// its context.
			t.Fatalf("%s %s with %q still running after %v", rt.method, rt.path, body, fuzzHang)
		}
		if rec.Code >= 500 && rec.Code != http.StatusServiceUnavailable {
			t.Fatalf("%s %s with %q = %d %s", rt.method, rt.path, body, rec.Code, rec.Body.Bytes())
		}
		if rec.Code >= 400 {
			if ct := rec.Header().Get("Content-Type"); ct != "application/problem+json" {
				t.Fatalf("%s %s = %d with Content-Type %q", rt.method, rt.path, rec.Code, ct)
			}
			var p problem
			if err := json.Unmarshal(rec.Body.Bytes(), &p); err != nil || p.Status != rec.Code {
				t.Fatalf("%s %s = %d, problem %s: %v", rt.method, rt.path, rec.Code, rec.Body.Bytes(), err)
			}
		}
	})
}
