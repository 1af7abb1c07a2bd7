package api

import (
	"bytes"
	"context"
	"encoding/json"
	"flag"
	"fmt"
	"io"
	"net/http"
	"net/http/httptest"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/getkin/kin-openapi/openapi3"
	"github.com/getkin/kin-openapi/openapi3filter"
	"github.com/getkin/kin-openapi/routers"
	"github.com/getkin/kin-openapi/routers/legacy"

	"residuum/assess"
	"residuum/assess/sqlite"
	"residuum/internal/runqueue"
)

// The OpenAPI document, loaded and checked once for all tests.
var (
	specOnce   sync.Once
	specDoc    *openapi3.T
	specRouter routers.Router
	specErr    error
)

func loadSpec(t testing.TB) (*openapi3.T, routers.Router) {
	t.Helper()
	specOnce.Do(func() {
		loader := openapi3.NewLoader()
		specDoc, specErr = loader.LoadFromData(OpenAPI())
		if specErr != nil {
			return
		}
		if specErr = specDoc.Validate(loader.Context); specErr != nil {
			return
		}
		specRouter, specErr = legacy.NewRouter(specDoc)
	})
	if specErr != nil {
		t.Fatalf("OpenAPI document: %v", specErr)
	}
	return specDoc, specRouter
}

// exercised records every documented operation a test sent a request to.
var exercised sync.Map

// TestMain checks, after a full run of the tests, that every operation of
// the OpenAPI document was exercised through env.do (and so validated).
func TestMain(m *testing.M) {
	code := m.Run()
	if code == 0 && flag.Lookup("test.run").Value.String() == "" && !testing.Short() {
		doc, err := openapi3.NewLoader().LoadFromData(OpenAPI())
		if err != nil {
			fmt.Fprintln(os.Stderr, err)
			os.Exit(1)
		}
		for path, item := range doc.Paths.Map() {
			for method := range item.Operations() {
				if _, ok := exercised.Load(method + " " + path); !ok {
					fmt.Fprintf(os.Stderr, "FAIL: no test sends a validated request to %s %s\n", method, path)
					code = 1
				}
			}
		}
	}
	os.Exit(code)
}

// env is one API under test: a fresh SQLite store in a temporary folder, a
// small queue and the full router.
type env struct {
	t     testing.TB
	store assess.Store
	queue *runqueue.Queue
	h     http.Handler
}

type envOpt func(*envConfig)

type envConfig struct {
	workers, depth int
	perRun         time.Duration
	wrap           func(assess.Store) assess.Store
}

func withQueue(workers, depth int, perRun time.Duration) envOpt {
	return func(c *envConfig) { c.workers, c.depth, c.perRun = workers, depth, perRun }
}

func withStore(wrap func(assess.Store) assess.Store) envOpt {
	return func(c *envConfig) { c.wrap = wrap }
}

func newEnv(t testing.TB, opts ...envOpt) *env {
	t.Helper()
	cfg := envConfig{workers: 2, depth: 8, perRun: time.Minute}
	for _, o := range opts {
		o(&cfg)
	}
	db, err := sqlite.Open(context.Background(), filepath.Join(t.TempDir(), "api-test.db"))
	if err != nil {
		t.Fatalf("sqlite.Open: %v", err)
	}
	var st assess.Store = db
	if cfg.wrap != nil {
		st = cfg.wrap(db)
	}
	q := runqueue.New(cfg.workers, cfg.depth, cfg.perRun)
	t.Cleanup(func() {
		ctx, cancel := context.WithTimeout(context.Background(), 30*time.Second)
		defer cancel()
		if err := q.Close(ctx); err != nil {
			t.Errorf("queue close: %v", err)
		}
		db.Close()
	})
	return &env{t: t, store: st, queue: q, h: New(Deps{Store: st, Queue: q})}
}

// response is a recorded answer.
type response struct {
	Code   int
	Header http.Header
	Body   []byte
}

// decode unmarshals the body into v or fails the test.
func (r *response) decode(t testing.TB, v any) {
	t.Helper()
	if err := json.Unmarshal(r.Body, v); err != nil {
		t.Fatalf("decode %d answer %.300s: %v", r.Code, r.Body, err)
	}
}

// problem decodes a problem answer and checks its media type and status.
func (r *response) problem(t testing.TB) problem {
	t.Helper()
	if ct := r.Header.Get("Content-Type"); ct != "application/problem+json" {
		t.Errorf("error answer %d has Content-Type %q, want application/problem+json", r.Code, ct)
	}
	var p problem
	r.decode(t, &p)
	if p.Status != r.Code {
		t.Errorf("problem status %d, HTTP status %d: want equal", p.Status, r.Code)
	}
	if p.Type == "" || p.Title == "" || p.Detail == "" {
		t.Errorf("problem %+v lacks type, title or detail", p)
	}
	return p
}

type reqOpt func(*http.Request)

func header(k, v string) reqOpt { return func(r *http.Request) { r.Header.Set(k, v) } }

func withContext(ctx context.Context) reqOpt {
	return func(r *http.Request) { *r = *r.WithContext(ctx) }
}

// do sends one request through the handler and validates it against the
// OpenAPI document: the answer always (its status must be documented), the
// request too when the answer is a success. body is sent as is if it is a
// string or []byte, else marshalled; a non-nil body is application/json
// unless an option says otherwise.
func (e *env) do(method, path string, body any, opts ...reqOpt) *response {
	e.t.Helper()
	var raw []byte
	switch b := body.(type) {
	case nil:
	case string:
		raw = []byte(b)
	case []byte:
		raw = b
	default:
		var err error
		if raw, err = json.Marshal(b); err != nil {
			e.t.Fatalf("marshal request: %v", err)
		}
	}
	req := httptest.NewRequest(method, path, bytes.NewReader(raw))
	if body != nil {
		req.Header.Set("Content-Type", "application/json")
	}
	for _, o := range opts {
		o(req)
	}
	rec := httptest.NewRecorder()
	e.h.ServeHTTP(rec, req)
	res := &response{Code: rec.Code, Header: rec.Header(), Body: rec.Body.Bytes()}
	validate(e.t, method, path, req.Header, raw, res)
	return res
}

// validate checks one exchange against the OpenAPI document.
func validate(t testing.TB, method, path string, h http.Header, body []byte, res *response) {
	t.Helper()
	_, router := loadSpec(t)
	req := httptest.NewRequest(method, path, bytes.NewReader(body))
	req.Header = h.Clone()
	route, params, err := router.FindRoute(req)
	if err == nil {
		exercised.Store(method+" "+route.Path, true)
	}
	if err != nil {
		if res.Code == http.StatusNotFound || res.Code == http.StatusMethodNotAllowed {
			return // a route that does not exist: nothing to validate against
		}
		t.Errorf("%s %s: not in the OpenAPI document: %v", method, path, err)
		return
	}
	ctx := context.Background()
	in := &openapi3filter.RequestValidationInput{
		Request: req, PathParams: params, Route: route,
		Options: &openapi3filter.Options{AuthenticationFunc: openapi3filter.NoopAuthenticationFunc},
	}
	if res.Code < 300 {
		if err := openapi3filter.ValidateRequest(ctx, in); err != nil {
			t.Errorf("%s %s: request does not match the OpenAPI document: %v", method, path, err)
		}
	}
	out := &openapi3filter.ResponseValidationInput{
		RequestValidationInput: in,
		Status:                 res.Code,
		Header:                 res.Header,
		Body:                   io.NopCloser(bytes.NewReader(res.Body)),
		Options:                &openapi3filter.Options{IncludeResponseStatus: true},
	}
	if err := openapi3filter.ValidateResponse(ctx, out); err != nil {
		t.Errorf("%s %s → %d: answer does not match the OpenAPI document: %v\nbody: %.500s", method, path, res.Code, err, res.Body)
	}
}

// readTestdata returns a file of testdata/.
func readTestdata(t testing.TB, name string) []byte {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("testdata", name))
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// createProject creates a project through the API and returns its id.
func (e *env) createProject(name string) int64 {
	e.t.Helper()
	res := e.do("POST", "/api/v1/projects", map[string]string{"name": name})
	if res.Code != http.StatusCreated {
		e.t.Fatalf("POST /api/v1/projects = %d %s, want 201", res.Code, res.Body)
	}
	var p assess.Project
	res.decode(e.t, &p)
	return p.ID
}

// createMember adds a member with the input in testdata/file.
func (e *env) createMember(projectID int64, file string, label string) memberJSON {
	e.t.Helper()
	body := map[string]any{"input": json.RawMessage(readTestdata(e.t, file))}
	if label != "" {
		body["label"] = label
	}
	res := e.do("POST", projectPath(projectID)+"/members", body)
	if res.Code != http.StatusCreated {
		e.t.Fatalf("POST members = %d %s, want 201", res.Code, res.Body)
	}
	var m memberJSON
	res.decode(e.t, &m)
	return m
}

// contains reports whether the body holds s.
func (r *response) contains(s string) bool { return strings.Contains(string(r.Body), s) }
