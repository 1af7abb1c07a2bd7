package web

import (
	"context"
	"io"
	"log/slog"
	"net/http"
	"net/http/cookiejar"
	"net/http/httptest"
	"net/url"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"golang.org/x/net/html"

	"residuum/assess"
	"residuum/assess/sqlite"
	"residuum/internal/runqueue"
)

// testServer is the web face over a temporary SQLite store and a real run queue.
type testServer struct {
	*httptest.Server
	Store  assess.Store
	Client *http.Client // does not follow redirects
}

func newTestServer(t testing.TB) *testServer {
	t.Helper()
	ctx := context.Background()
	st, err := sqlite.Open(ctx, filepath.Join(t.TempDir(), "residuum.db"))
	if err != nil {
		t.Fatalf("open store: %v", err)
	}
	q := runqueue.New(2, 4, 2*time.Minute)
	log := slog.New(slog.NewTextHandler(io.Discard, nil))
	if testing.Verbose() {
		log = slog.New(slog.NewTextHandler(testWriter{t}, nil))
	}
	srv := httptest.NewServer(New(Deps{Store: st, Queue: q, Log: log}))
	t.Cleanup(func() {
		srv.Close()
		_ = q.Close(context.Background())
		_ = st.Close()
	})
	jar, _ := cookiejar.New(nil)
	c := &http.Client{Jar: jar, Timeout: 60 * time.Second, CheckRedirect: func(*http.Request, []*http.Request) error { return http.ErrUseLastResponse }}
	return &testServer{Server: srv, Store: st, Client: c}
}

type testWriter struct{ t testing.TB }

func (w testWriter) Write(p []byte) (int, error) {
	w.t.Log(strings.TrimSpace(string(p)))
	return len(p), nil
}

// get fetches a path and returns the status and body.
func (ts *testServer) get(t testing.TB, path string) (int, string, http.Header) {
	t.Helper()
	resp, err := ts.Client.Get(ts.URL + path)
	if err != nil {
		t.Fatalf("GET %s: %v", path, err)
	}
	defer resp.Body.Close()
	b, _ := io.ReadAll(resp.Body)
	return resp.StatusCode, string(b), resp.Header
}

// post submits a form and returns the status, body and headers (redirects are not followed).
func (ts *testServer) post(t testing.TB, path string, form url.Values) (int, string, http.Header) {
	t.Helper()
	resp, err := ts.Client.PostForm(ts.URL+path, form)
	if err != nil {
		t.Fatalf("POST %s: %v", path, err)
	}
	defer resp.Body.Close()
	b, _ := io.ReadAll(resp.Body)
	return resp.StatusCode, string(b), resp.Header
}

// parseHTML parses a page.
func parseHTML(t testing.TB, body string) *html.Node {
	t.Helper()
	n, err := html.Parse(strings.NewReader(body))
	if err != nil {
		t.Fatalf("parse html: %v", err)
	}
	return n
}

func attr(n *html.Node, key string) (string, bool) {
	for _, a := range n.Attr {
		if a.Key == key {
			return a.Val, true
		}
	}
	return "", false
}

// byTestID returns every element whose data-testid is id.
func byTestID(root *html.Node, id string) []*html.Node {
	var out []*html.Node
	var walk func(*html.Node)
	walk = func(n *html.Node) {
		if n.Type == html.ElementNode {
			if v, ok := attr(n, "data-testid"); ok && v == id {
				out = append(out, n)
			}
		}
		for c := n.FirstChild; c != nil; c = c.NextSibling {
			walk(c)
		}
	}
	walk(root)
	return out
}

// textOf returns the text content of a node, spaces collapsed.
func textOf(n *html.Node) string {
	var b strings.Builder
	var walk func(*html.Node)
	walk = func(n *html.Node) {
		if n.Type == html.TextNode {
			b.WriteString(n.Data)
			b.WriteByte(' ')
		}
		for c := n.FirstChild; c != nil; c = c.NextSibling {
			walk(c)
		}
	}
	walk(n)
	return strings.Join(strings.Fields(b.String()), " ")
}

// mustOne returns the single element with the test id, failing otherwise.
func mustOne(t testing.TB, root *html.Node, id string) *html.Node {
	t.Helper()
	ns := byTestID(root, id)
	if len(ns) != 1 {
		t.Fatalf("want one [data-testid=%q], found %d", id, len(ns))
	}
	return ns[0]
}

// elementsByTag returns the elements with the tag name.
func elementsByTag(root *html.Node, tag string) []*html.Node {
	var out []*html.Node
	var walk func(*html.Node)
	walk = func(n *html.Node) {
		if n.Type == html.ElementNode && n.Data == tag {
			out = append(out, n)
		}
		for c := n.FirstChild; c != nil; c = c.NextSibling {
			walk(c)
		}
	}
	walk(root)
	return out
}

// beamForm is a cheap two-layer beam with evidence, as the editor posts it.
func beamForm(label string) url.Values {
	return url.Values{
		"op": {"save"}, "member.label": {label}, "location": {"grid C/3–4, level 2"}, "member.kind": {"beam"},
		"member.width_mm": {"300"}, "member.depth_mm": {"500"}, "member.link_dia_mm": {"8"},
		"member.concrete.fck_mpa": {"30"}, "member.concrete.aggregate": {"siliceous"}, "member.concrete.conductivity": {"lower"},
		"member.layers[0].face": {"bottom"}, "member.layers[0].cover_mm": {"30"}, "member.layers[0].count": {"3"},
		"member.layers[0].dia_mm": {"20"}, "member.layers[0].steel": {"hot-rolled"}, "member.layers[0].fyk_mpa": {"500"},
		"member.layers[1].face": {"top"}, "member.layers[1].cover_mm": {"30"}, "member.layers[1].count": {"2"},
		"member.layers[1].dia_mm": {"12"}, "member.layers[1].steel": {"hot-rolled"}, "member.layers[1].fyk_mpa": {"500"},
		"member.exposed": {"bottom", "left", "right"},
		"fire.curve":     {"iso834"}, "fire.duration_min": {"60"},
		"evidence.spalling[0].face": {"bottom"}, "evidence.spalling[0].depth_mm": {"10"},
		"demand.sagging_knm": {"120"}, "demand.hogging_knm": {"40"},
		"options.cell_mm": {"20"},
	}
}

// createProject posts the new-project form and returns the project's path.
func (ts *testServer) createProject(t testing.TB, name string) string {
	t.Helper()
	code, _, h := ts.post(t, "/projects", url.Values{"name": {name}, "site_address": {"1 Invented Street"}})
	if code != http.StatusSeeOther {
		t.Fatalf("create project: status %d, want 303", code)
	}
	return h.Get("Location")
}

// waitJob follows a run's progress page until it redirects to the result, and returns that path.
func (ts *testServer) waitJob(t testing.TB, jobPath string) string {
	t.Helper()
	deadline := time.Now().Add(60 * time.Second)
	for time.Now().Before(deadline) {
		code, body, h := ts.get(t, jobPath)
		switch code {
		case http.StatusSeeOther:
			return h.Get("Location")
		case http.StatusOK:
			if strings.Contains(body, `data-testid="job-failed"`) {
				t.Fatalf("run failed: %s", textOf(mustOne(t, parseHTML(t, body), "job-failed")))
			}
		default:
			t.Fatalf("GET %s: status %d", jobPath, code)
		}
		time.Sleep(100 * time.Millisecond)
	}
	t.Fatalf("run %s did not finish in 60 s", jobPath)
	return ""
}
