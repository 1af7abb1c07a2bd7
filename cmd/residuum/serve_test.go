package main

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"io"
	"net/http"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"sync"
	"testing"
	"time"
)

// syncBuffer is a bytes.Buffer safe for the concurrent writes of run and
// the reads of the test.
type syncBuffer struct {
	mu sync.Mutex
	b  bytes.Buffer
}

func (s *syncBuffer) Write(p []byte) (int, error) {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.Write(p)
}

func (s *syncBuffer) String() string {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.String()
}

// mapEnv is a getenv over a map.
func mapEnv(m map[string]string) func(string) string {
	return func(k string) string { return m[k] }
}

var listenRE = regexp.MustCompile(`residuum: listening on (http://[0-9.:\[\]a-z]+)`)

// inProcess is a serve started through run() in a goroutine.
type inProcess struct {
	URL    string
	stdout *syncBuffer
	stderr *syncBuffer
	cancel context.CancelFunc
	done   chan error
}

// startInProcess runs `residuum serve args...` in-process and waits until
// it prints its address. The service is stopped (and must stop cleanly)
// when the test ends, unless the test stopped it first.
func startInProcess(t *testing.T, env map[string]string, args ...string) *inProcess {
	t.Helper()
	ctx, cancel := context.WithCancel(context.Background())
	p := &inProcess{stdout: &syncBuffer{}, stderr: &syncBuffer{}, cancel: cancel, done: make(chan error, 1)}
	go func() {
		p.done <- run(ctx, append([]string{"serve"}, args...), mapEnv(env), strings.NewReader(""), p.stdout, p.stderr)
	}()
	deadline := time.Now().Add(30 * time.Second)
	for {
		if m := listenRE.FindStringSubmatch(p.stdout.String()); m != nil {
			p.URL = m[1]
			break
		}
		select {
		case err := <-p.done:
			t.Fatalf("serve ended before listening: %v\nstderr: %s", err, p.stderr.String())
		case <-time.After(10 * time.Millisecond):
		}
		if time.Now().After(deadline) {
			cancel()
			t.Fatalf("serve did not print its address within 30 s; stdout %q stderr %q", p.stdout.String(), p.stderr.String())
		}
	}
	t.Cleanup(func() {
		if err := p.stop(); err != nil {
			t.Errorf("serve: %v\nstderr: %s", err, p.stderr.String())
		}
	})
	return p
}

// stop cancels run's context (as SIGINT/SIGTERM do in main) and waits for
// it to return.
func (p *inProcess) stop() error {
	p.cancel()
	select {
	case err, ok := <-p.done:
		if !ok {
			return nil
		}
		close(p.done)
		return err
	case <-time.After(60 * time.Second):
		return errors.New("serve did not stop within 60 s of its context being cancelled")
	}
}

// call sends one request and returns the status and body.
func call(t *testing.T, method, url string, body []byte, hdr ...string) (int, http.Header, []byte) {
	t.Helper()
	req, err := http.NewRequest(method, url, bytes.NewReader(body))
	if err != nil {
		t.Fatal(err)
	}
	if body != nil {
		req.Header.Set("Content-Type", "application/json")
	}
	for i := 0; i+1 < len(hdr); i += 2 {
		req.Header.Set(hdr[i], hdr[i+1])
	}
	res, err := http.DefaultClient.Do(req)
	if err != nil {
		t.Fatalf("%s %s: %v", method, url, err)
	}
	defer res.Body.Close()
	b, err := io.ReadAll(res.Body)
	if err != nil {
		t.Fatal(err)
	}
	return res.StatusCode, res.Header, b
}

func TestServeHelpNamesEveryEnvVar(t *testing.T) {
	t.Parallel()
	var stdout, stderr bytes.Buffer
	if err := run(context.Background(), []string{"serve", "-h"}, mapEnv(nil), nil, &stdout, &stderr); err != nil {
		t.Fatalf("serve -h = %v, want nil", err)
	}
	for _, env := range []string{envAddr, envPublic, envData, envDatabaseURL, envWorkers, envQueue, envRunTimeout, envShutdownTimeout, envDemo, envLogLevel, envLogFormat} {
		if !strings.Contains(stderr.String(), env) {
			t.Errorf("serve -h does not mention %s", env)
		}
	}
	for _, flag := range []string{"-addr", "-public", "-data", "-database-url"} {
		if !strings.Contains(stderr.String(), "  "+flag) {
			t.Errorf("serve -h does not list %s", flag)
		}
	}
}

func TestServeAddressRules(t *testing.T) {
	t.Parallel()
	tests := []struct {
		name     string
		args     []string
		env      map[string]string
		wantCode int
		wantErr  string
	}{
		{"a non-loopback address needs -public", []string{"-addr", "0.0.0.0:0"}, nil, 2, "-public"},
		{"so does an empty host (every interface)", []string{"-addr", ":0"}, nil, 2, "-public"},
		{"so does one from the environment", nil, map[string]string{envAddr: "192.0.2.1:8080"}, 2, "-public"},
		{"a malformed address", []string{"-addr", "nonsense"}, nil, 2, "-addr"},
		{"a bad environment value names the variable", nil, map[string]string{envWorkers: "many"}, 1, envWorkers},
		{"an unknown flag", []string{"-colour"}, nil, 2, ""},
		{"a bad log level", []string{"-log-level", "loud"}, nil, 2, "-log-level"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			t.Parallel()
			var stdout, stderr bytes.Buffer
			args := append([]string{"serve", "-data", t.TempDir()}, tt.args...)
			err := run(context.Background(), args, mapEnv(tt.env), nil, &stdout, &stderr)
			if got := exitCode(err); got != tt.wantCode {
				t.Fatalf("run(%q) exit %d (%v), want %d", args, got, err, tt.wantCode)
			}
			if tt.wantErr != "" && !strings.Contains(err.Error(), tt.wantErr) {
				t.Errorf("error %q does not mention %q", err, tt.wantErr)
			}
			if strings.Contains(stdout.String(), "listening") {
				t.Errorf("refused configuration still listened: %s", stdout.String())
			}
		})
	}
}

// TestServePublicWarns: -public allows any address and warns that there
// are no accounts.
func TestServePublicWarns(t *testing.T) {
	t.Parallel()
	p := startInProcess(t, map[string]string{envDemo: "false"}, "-addr", "0.0.0.0:0", "-public", "-data", t.TempDir())
	if !strings.Contains(p.stderr.String(), "no accounts") {
		t.Errorf("no warning on stderr: %q", p.stderr.String())
	}
}

// TestServeFromEnvironment: configuration from the environment only, a
// port chosen by the system, the real address printed, the SQLite file in
// the data folder, and a clean stop when the context is cancelled.
func TestServeFromEnvironment(t *testing.T) {
	t.Parallel()
	data := filepath.Join(t.TempDir(), "nested", "data")
	p := startInProcess(t, map[string]string{envAddr: "127.0.0.1:0", envData: data, envDemo: "false", envLogLevel: "warn"})
	if strings.HasSuffix(p.URL, ":0") {
		t.Errorf("printed address %s, want the real port", p.URL)
	}
	code, _, body := call(t, "POST", p.URL+"/api/v1/projects", []byte(`{"name": "From env"}`))
	if code != http.StatusCreated {
		t.Fatalf("POST project = %d %s", code, body)
	}
	code, _, body = call(t, "GET", p.URL+"/api/v1/projects", nil)
	if code != http.StatusOK || !strings.Contains(string(body), "From env") {
		t.Errorf("GET projects = %d %s", code, body)
	}
	for _, path := range []string{"/healthz", "/readyz"} {
		if code, _, _ := call(t, "GET", p.URL+path, nil); code != http.StatusOK {
			t.Errorf("GET %s = %d, want 200", path, code)
		}
	}
	if _, err := os.Stat(filepath.Join(data, sqliteFile)); err != nil {
		t.Errorf("SQLite file not in the data folder: %v", err)
	}
	if err := p.stop(); err != nil {
		t.Fatalf("stop: %v", err)
	}
	if _, err := http.Get(p.URL + "/healthz"); err == nil {
		t.Error("still answering after stop")
	}
}

// TestAssessAPIMatchesCLI is a fixed point of the contract: POST
// /api/v1/assess answers exactly the bytes `residuum assess -format json`
// prints for the same input.
func TestAssessAPIMatchesCLI(t *testing.T) {
	t.Parallel()
	p := startInProcess(t, nil, "-addr", "127.0.0.1:0", "-data", t.TempDir(), "-demo=false", "-log-level", "warn")
	for _, name := range []string{"slab.json", "beam.json"} {
		file := filepath.Join("..", "..", "api", "testdata", name)
		in, err := os.ReadFile(file)
		if err != nil {
			t.Fatal(err)
		}
		var cli, cliErr bytes.Buffer
		if err := run(context.Background(), []string{"assess", "-in", file, "-format", "json"}, mapEnv(nil), nil, &cli, &cliErr); err != nil {
			t.Fatalf("assess -in %s: %v\n%s", file, err, cliErr.String())
		}
		code, hdr, body := call(t, "POST", p.URL+"/api/v1/assess", in)
		if code != http.StatusOK || hdr.Get("Content-Type") != "application/json" {
			t.Fatalf("POST /api/v1/assess %s = %d %s %.300s", name, code, hdr.Get("Content-Type"), body)
		}
		if !bytes.Equal(body, cli.Bytes()) {
			t.Errorf("%s: API answer (%d bytes) differs from the CLI output (%d bytes)", name, len(body), cli.Len())
		}
		if !json.Valid(body) {
			t.Errorf("%s: answer is not JSON", name)
		}
	}
}

func TestMigrate(t *testing.T) {
	t.Parallel()
	data := t.TempDir()
	var out, errOut bytes.Buffer
	if err := run(context.Background(), []string{"migrate", "-data", data}, mapEnv(nil), nil, &out, &errOut); err != nil {
		t.Fatalf("migrate: %v\n%s", err, errOut.String())
	}
	if !strings.Contains(out.String(), "up to date") || strings.Contains(out.String(), "(0 migration(s)") {
		t.Errorf("first migrate printed %q, want migrations applied", out.String())
	}
	out.Reset()
	if err := run(context.Background(), []string{"migrate"}, mapEnv(map[string]string{envData: data}), nil, &out, &errOut); err != nil {
		t.Fatalf("second migrate: %v", err)
	}
	if !strings.Contains(out.String(), "(0 migration(s) applied now)") {
		t.Errorf("second migrate printed %q, want nothing applied", out.String())
	}
	if _, err := os.Stat(filepath.Join(data, sqliteFile)); err != nil {
		t.Errorf("no SQLite file after migrate: %v", err)
	}
}
