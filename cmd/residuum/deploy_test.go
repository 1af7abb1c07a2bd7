package main

import (
	"bytes"
	"context"
	"net"
	"net/http"
	"net/http/httptest"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strings"
	"testing"
	"time"

	"gopkg.in/yaml.v3"

	"residuum/api"
	"residuum/assess/sqlite"
	"residuum/internal/runqueue"
)

// composeFile is the part of docker-compose.yml the checks read.
type composeFile struct {
	Services map[string]struct {
		Image       string            `yaml:"image"`
		Build       any               `yaml:"build"`
		Environment map[string]string `yaml:"environment"`
		Ports       []string          `yaml:"ports"`
		DependsOn   map[string]struct {
			Condition string `yaml:"condition"`
		} `yaml:"depends_on"`
		Healthcheck struct {
			Test []string `yaml:"test"`
		} `yaml:"healthcheck"`
		Volumes         []string `yaml:"volumes"`
		StopGracePeriod string   `yaml:"stop_grace_period"`
	} `yaml:"services"`
	Volumes map[string]any `yaml:"volumes"`
}

// serveEnvNames returns every environment variable serve reads.
func serveEnvNames() []string {
	var c serveConfig
	e := newEnvFlags("serve", func(string) string { return "" }, &bytes.Buffer{})
	serveFlags(e, &c)
	return e.names
}

// TestComposeFile checks docker-compose.yml against the code (there is no
// Docker engine in the test environment): PostgreSQL with a named volume
// and a health check, the service waiting for it to be healthy, every
// variable passed to the service one that serve reads, the published port
// the one it listens on, and its health check a probe it serves.
func TestComposeFile(t *testing.T) {
	t.Parallel()
	raw, err := os.ReadFile(filepath.Join("..", "..", "docker-compose.yml"))
	if err != nil {
		t.Fatal(err)
	}
	var cf composeFile
	if err := yaml.Unmarshal(raw, &cf); err != nil {
		t.Fatalf("docker-compose.yml: %v", err)
	}
	db, ok := cf.Services["db"]
	if !ok || !strings.HasPrefix(db.Image, "postgres:") {
		t.Fatalf("no PostgreSQL service \"db\": %+v", cf.Services)
	}
	if len(db.Healthcheck.Test) == 0 || !strings.Contains(strings.Join(db.Healthcheck.Test, " "), "pg_isready") {
		t.Errorf("db health check = %q, want pg_isready", db.Healthcheck.Test)
	}
	named := false
	for _, v := range db.Volumes {
		name, _, _ := strings.Cut(v, ":")
		if _, ok := cf.Volumes[name]; ok {
			named = true
		}
	}
	if !named {
		t.Errorf("db volumes %q: want a named volume declared under volumes:", db.Volumes)
	}

	svc, ok := cf.Services["residuum"]
	if !ok || svc.Build == nil {
		t.Fatalf("no service \"residuum\" built from the Dockerfile")
	}
	if got := svc.DependsOn["db"].Condition; got != "service_healthy" {
		t.Errorf("residuum depends_on db condition %q, want service_healthy", got)
	}
	known := serveEnvNames()
	for k := range svc.Environment {
		if !slices.Contains(known, k) {
			t.Errorf("docker-compose.yml passes %s, which serve does not read (it reads %v)", k, known)
		}
	}
	url := svc.Environment[envDatabaseURL]
	if !strings.HasPrefix(url, "postgres://") || !strings.Contains(url, "@db:5432/") {
		t.Errorf("DATABASE_URL = %q, want postgres://…@db:5432/…", url)
	}
	if _, err := checkAddr(svc.Environment[envAddr], svc.Environment[envPublic] == "true"); err != nil {
		t.Errorf("RESIDUUM_ADDR/RESIDUUM_PUBLIC as passed would be refused: %v", err)
	}
	_, port, err := net.SplitHostPort(svc.Environment[envAddr])
	if err != nil {
		t.Fatalf("RESIDUUM_ADDR %q: %v", svc.Environment[envAddr], err)
	}
	published := false
	for _, p := range svc.Ports {
		if strings.HasSuffix(p, ":"+port) {
			published = true
		}
	}
	if !published {
		t.Errorf("ports %q do not publish the container port %s", svc.Ports, port)
	}
	check := strings.Join(svc.Healthcheck.Test, " ")
	m := regexp.MustCompile(`http://127\.0\.0\.1:(\d+)(/\S*)`).FindStringSubmatch(check)
	if m == nil {
		t.Fatalf("service health check %q: want a http://127.0.0.1:PORT/PATH probe", check)
	}
	if m[1] != port {
		t.Errorf("health check port %s, service listens on %s", m[1], port)
	}
	if code := probe(t, m[2]); code != http.StatusOK {
		t.Errorf("health check path %s answers %d on a healthy service, want 200", m[2], code)
	}
	if d, err := time.ParseDuration(svc.StopGracePeriod); err != nil {
		t.Errorf("stop_grace_period %q: %v", svc.StopGracePeriod, err)
	} else if sd, err := time.ParseDuration(svc.Environment[envShutdownTimeout]); err == nil && d <= sd {
		t.Errorf("stop_grace_period %v is not longer than the shutdown timeout %v", d, sd)
	}
}

// TestDockerfile checks the image recipe: multi-stage, a static binary
// (CGO off), a non-root user, the port and probe the code uses.
func TestDockerfile(t *testing.T) {
	t.Parallel()
	raw, err := os.ReadFile(filepath.Join("..", "..", "Dockerfile"))
	if err != nil {
		t.Fatal(err)
	}
	df := string(raw)
	if n := len(regexp.MustCompile(`(?m)^FROM `).FindAllString(df, -1)); n < 2 {
		t.Errorf("Dockerfile has %d FROM lines, want a multi-stage build", n)
	}
	for _, want := range []string{"CGO_ENABLED=0", "./cmd/residuum", "USER 10001", "EXPOSE 8080", "/readyz", `CMD ["serve"]`} {
		if !strings.Contains(df, want) {
			t.Errorf("Dockerfile lacks %q", want)
		}
	}
	for _, env := range regexp.MustCompile(`(RESIDUUM_[A-Z_]+|DATABASE_URL)=`).FindAllStringSubmatch(df, -1) {
		if !slices.Contains(serveEnvNames(), env[1]) {
			t.Errorf("Dockerfile sets %s, which serve does not read", env[1])
		}
	}
	if code := probe(t, "/readyz"); code != http.StatusOK {
		t.Errorf("/readyz = %d, want 200", code)
	}
}

// probe answers GET path on the service's handler over a fresh store.
func probe(t *testing.T, path string) int {
	t.Helper()
	st, err := sqlite.Open(context.Background(), filepath.Join(t.TempDir(), "probe.db"))
	if err != nil {
		t.Fatal(err)
	}
	defer st.Close()
	q := runqueue.New(1, 0, time.Minute)
	defer q.Close(context.Background())
	rec := httptest.NewRecorder()
	api.New(api.Deps{Store: st, Queue: q}).ServeHTTP(rec, httptest.NewRequest("GET", path, nil))
	return rec.Code
}
