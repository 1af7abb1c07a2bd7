package api

import (
	"bytes"
	"context"
	"log/slog"
	"net/http"
	"net/http/httptest"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"

	"residuum/assess/sqlite"
	"residuum/internal/runqueue"
)

// lockedBuffer collects log output from concurrent handlers.
type lockedBuffer struct {
	mu sync.Mutex
	b  bytes.Buffer
}

func (l *lockedBuffer) Write(p []byte) (int, error) {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.b.Write(p)
}

func (l *lockedBuffer) String() string {
	l.mu.Lock()
	defer l.mu.Unlock()
	return l.b.String()
}

// TestMiddleware: one structured log line per request with its id and
// status; a panic behind the router is a 500 (chi's Recoverer) and the
// service goes on; the fallback serves paths outside the API.
func TestMiddleware(t *testing.T) {
	t.Parallel()
	st, err := sqlite.Open(context.Background(), filepath.Join(t.TempDir(), "mw.db"))
	if err != nil {
		t.Fatal(err)
	}
	defer st.Close()
	q := runqueue.New(1, 0, time.Minute)
	defer q.Close(context.Background())
	var logs lockedBuffer
	log := slog.New(slog.NewJSONHandler(&logs, nil))
	fallback := http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		if r.URL.Path == "/boom" {
			panic("a bug in a page handler")
		}
		w.Write([]byte("page " + r.URL.Path))
	})
	h := New(Deps{Store: st, Queue: q, Log: log, Fallback: fallback})

	rec := httptest.NewRecorder()
	h.ServeHTTP(rec, httptest.NewRequest("GET", "/boom", nil))
	if rec.Code != http.StatusInternalServerError {
		t.Errorf("panicking handler = %d, want 500", rec.Code)
	}
	rec = httptest.NewRecorder()
	h.ServeHTTP(rec, httptest.NewRequest("GET", "/projects/1", nil))
	if rec.Code != http.StatusOK || rec.Body.String() != "page /projects/1" {
		t.Errorf("fallback = %d %q, want the page", rec.Code, rec.Body.String())
	}
	rec = httptest.NewRecorder()
	h.ServeHTTP(rec, httptest.NewRequest("GET", "/api/v1/nope", nil))
	if rec.Code != http.StatusNotFound || rec.Header().Get("Content-Type") != "application/problem+json" {
		t.Errorf("unknown API path = %d %s, want a 404 problem (not the fallback)", rec.Code, rec.Header().Get("Content-Type"))
	}
	id := rec.Header().Get("X-Request-Id")
	out := logs.String()
	if !strings.Contains(out, `"request_id":"`+id+`"`) || !strings.Contains(out, `"status":404`) {
		t.Errorf("request log lacks the 404 line with request id %q:\n%s", id, out)
	}
	if !strings.Contains(out, `"status":500`) {
		t.Errorf("request log lacks the 500 of the panic:\n%s", out)
	}
}
