// Package pgtest gives tests a throwaway PostgreSQL server.
//
// If RESIDUUM_TEST_DATABASE_URL is set, that server is used: each test gets
// a fresh database on it (or, where the role may not create databases, a
// fresh schema selected through search_path). Otherwise pgtest looks for
// initdb and pg_ctl (on PATH, then /usr/lib/postgresql/*/bin), creates a
// cluster in a temporary directory, listening on 127.0.0.1 on a free port
// with fsync off, and removes it when the tests end. PostgreSQL refuses to
// run as root, so when the tests run as root the cluster belongs to the
// "postgres" user and its commands are run through runuser.
//
// Typical use in a package's tests:
//
//	func TestMain(m *testing.M) { pgtest.Main(m) }
//
//	func TestSomething(t *testing.T) {
//		url := pgtest.Need(t).NewDatabase(t) // skips without PostgreSQL (fails if CI=true)
//		...
//	}
package pgtest

import (
	"context"
	"errors"
	"fmt"
	"net"
	neturl "net/url"
	"os"
	"os/exec"
	"os/user"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"
	"testing"
	"time"

	"github.com/jackc/pgx/v5"
	"github.com/jackc/pgx/v5/pgconn"
)

// EnvURL names the environment variable with the URL of an existing
// PostgreSQL server to test against (a role that may create databases, or
// at least schemas).
const EnvURL = "RESIDUUM_TEST_DATABASE_URL"

// ErrNoPostgres means no PostgreSQL server can be used: EnvURL is unset
// and no initdb/pg_ctl was found, or the server in EnvURL cannot be reached.
var ErrNoPostgres = errors.New("pgtest: no PostgreSQL available")

// Cluster is a PostgreSQL server for tests: either one pgtest started
// (Owned) or the one named by EnvURL.
type Cluster struct {
	admin string // URL of the maintenance database, for CREATE/DROP DATABASE

	// Set only for a cluster pgtest started.
	dir   string // temp dir: data/, log, socket
	bin   string // directory holding pg_ctl and initdb
	runAs string // "postgres" when running as root, else ""
	port  int

	mu      sync.Mutex
	created []created // databases or schemas to drop at Stop
	stopped bool
}

type created struct {
	name   string
	schema bool // a schema in the admin database, not a database
}

var seq atomic.Int64

// Start returns a running cluster: the server in EnvURL if set, otherwise a
// new one in a temporary directory. The error wraps ErrNoPostgres when there
// is no PostgreSQL to use. Call Stop when done.
func Start(ctx context.Context) (*Cluster, error) {
	if u := os.Getenv(EnvURL); u != "" {
		c := &Cluster{admin: u}
		conn, err := pgx.Connect(ctx, u)
		if err != nil {
			return nil, fmt.Errorf("%w: %s: %v", ErrNoPostgres, EnvURL, err)
		}
		conn.Close(ctx)
		return c, nil
	}
	bin, err := findBin()
	if err != nil {
		return nil, err
	}
	c := &Cluster{bin: bin}
	if os.Geteuid() == 0 {
		if _, err := user.Lookup("postgres"); err != nil {
			return nil, fmt.Errorf("%w: running as root and there is no postgres user to run the server as", ErrNoPostgres)
		}
		if _, err := exec.LookPath("runuser"); err != nil {
			return nil, fmt.Errorf("%w: running as root and runuser is not available", ErrNoPostgres)
		}
		c.runAs = "postgres"
	}
	if err := c.create(ctx); err != nil {
		c.Stop()
		return nil, err
	}
	return c, nil
}

// findBin returns the directory that holds pg_ctl and initdb.
func findBin() (string, error) {
	if p, err := exec.LookPath("pg_ctl"); err == nil {
		dir := filepath.Dir(p)
		if resolved, err := filepath.EvalSymlinks(p); err == nil {
			dir = filepath.Dir(resolved)
		}
		if _, err := os.Stat(filepath.Join(dir, "initdb")); err == nil {
			return dir, nil
		}
	}
	matches, _ := filepath.Glob(libGlob)
	sort.Slice(matches, func(i, j int) bool { return version(matches[i]) > version(matches[j]) })
	for _, m := range matches {
		dir := filepath.Dir(m)
		if _, err := os.Stat(filepath.Join(dir, "initdb")); err == nil {
			return dir, nil
		}
	}
	return "", fmt.Errorf("%w: %s is unset and initdb/pg_ctl are neither on PATH nor in /usr/lib/postgresql/*/bin", ErrNoPostgres, EnvURL)
}

// libGlob is where Debian-style packages install the server programs
// (a variable for the test of the no-PostgreSQL case).
var libGlob = "/usr/lib/postgresql/*/bin/pg_ctl"

// version extracts N from /usr/lib/postgresql/N/bin/pg_ctl.
func version(path string) int {
	n, _ := strconv.Atoi(filepath.Base(filepath.Dir(filepath.Dir(path))))
	return n
}

// create runs initdb and starts the server.
func (c *Cluster) create(ctx context.Context) error {
	dir, err := os.MkdirTemp("", "residuum-pg-")
	if err != nil {
		return fmt.Errorf("pgtest: %w", err)
	}
	c.dir = dir
	if c.runAs != "" {
		u, err := user.Lookup(c.runAs)
		if err != nil {
			return fmt.Errorf("pgtest: %w", err)
		}
		uid, _ := strconv.Atoi(u.Uid)
		gid, _ := strconv.Atoi(u.Gid)
		if err := os.Chown(dir, uid, gid); err != nil {
			return fmt.Errorf("pgtest: chown %s to %s: %w", dir, c.runAs, err)
		}
	}
	if out, err := c.run(ctx, "initdb", "-D", c.dataDir(), "-U", "postgres", "-A", "trust",
		"-E", "UTF8", "--locale=C", "--no-sync"); err != nil {
		return fmt.Errorf("pgtest: initdb: %w\n%s", err, out)
	}
	c.port, err = freePort()
	if err != nil {
		return err
	}
	conf := fmt.Sprintf(`
# pgtest: a throwaway cluster; speed over durability.
listen_addresses = '127.0.0.1'
port = %d
unix_socket_directories = '%s'
fsync = off
synchronous_commit = off
full_page_writes = off
max_connections = 200
shared_buffers = 32MB
log_min_messages = warning
`, c.port, c.dir)
	f, err := os.OpenFile(filepath.Join(c.dataDir(), "postgresql.conf"), os.O_APPEND|os.O_WRONLY, 0)
	if err != nil {
		return fmt.Errorf("pgtest: %w", err)
	}
	if _, err := f.WriteString(conf); err != nil {
		f.Close()
		return fmt.Errorf("pgtest: %w", err)
	}
	if err := f.Close(); err != nil {
		return fmt.Errorf("pgtest: %w", err)
	}
	c.admin = c.URL("postgres")
	return c.StartServer()
}

func (c *Cluster) dataDir() string { return filepath.Join(c.dir, "data") }

// run runs one of the PostgreSQL programs, as the postgres user if needed.
func (c *Cluster) run(ctx context.Context, prog string, args ...string) ([]byte, error) {
	path := filepath.Join(c.bin, prog)
	var cmd *exec.Cmd
	if c.runAs != "" {
		cmd = exec.CommandContext(ctx, "runuser", append([]string{"-u", c.runAs, "--", path}, args...)...)
	} else {
		cmd = exec.CommandContext(ctx, path, args...)
	}
	cmd.Dir = c.dir
	cmd.Env = append(os.Environ(), "LC_ALL=C", "PGTZ=UTC")
	return cmd.CombinedOutput()
}

func freePort() (int, error) {
	l, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		return 0, fmt.Errorf("pgtest: free port: %w", err)
	}
	defer l.Close()
	return l.Addr().(*net.TCPAddr).Port, nil
}

// Owned reports whether pgtest started this cluster (so that StopServer,
// StartServer and Restart are possible).
func (c *Cluster) Owned() bool { return c.dir != "" }

// URL returns the connection URL of database dbname on the cluster.
func (c *Cluster) URL(dbname string) string {
	if c.Owned() {
		return fmt.Sprintf("postgres://postgres@127.0.0.1:%d/%s?sslmode=disable", c.port, neturl.PathEscape(dbname))
	}
	return withDatabase(c.admin, dbname)
}

// withDatabase replaces the database of a URL or key=value DSN.
func withDatabase(dsn, dbname string) string {
	if u, err := neturl.Parse(dsn); err == nil && (u.Scheme == "postgres" || u.Scheme == "postgresql") {
		u.Path = "/" + dbname
		return u.String()
	}
	return dsn + " dbname=" + dbname
}

// withSearchPath adds search_path=schema to a URL or key=value DSN.
func withSearchPath(dsn, schema string) string {
	if u, err := neturl.Parse(dsn); err == nil && (u.Scheme == "postgres" || u.Scheme == "postgresql") {
		q := u.Query()
		q.Set("search_path", schema)
		u.RawQuery = q.Encode()
		return u.String()
	}
	return dsn + " search_path=" + schema
}

// CreateDatabase creates an empty database called name and returns its
// URL. On a server from EnvURL whose role may not create databases it
// creates a schema called name instead and returns a URL whose search_path
// selects it.
func (c *Cluster) CreateDatabase(ctx context.Context, name string) (string, error) {
	conn, err := pgx.Connect(ctx, c.admin)
	if err != nil {
		return "", fmt.Errorf("pgtest: connect: %w", err)
	}
	defer conn.Close(ctx)
	ident := pgx.Identifier{name}.Sanitize()
	_, err = conn.Exec(ctx, "CREATE DATABASE "+ident)
	var pe *pgconn.PgError
	if err != nil && !c.Owned() && errors.As(err, &pe) && pe.Code == "42501" { // insufficient_privilege
		if _, err := conn.Exec(ctx, "CREATE SCHEMA "+ident); err != nil {
			return "", fmt.Errorf("pgtest: create schema %s: %w", name, err)
		}
		c.remember(created{name: name, schema: true})
		return withSearchPath(c.admin, name), nil
	}
	if err != nil {
		return "", fmt.Errorf("pgtest: create database %s: %w", name, err)
	}
	c.remember(created{name: name})
	return c.URL(name), nil
}

func (c *Cluster) remember(cr created) {
	c.mu.Lock()
	defer c.mu.Unlock()
	c.created = append(c.created, cr)
}

// DropDatabase drops a database (or schema) made by CreateDatabase,
// disconnecting anyone still using it.
func (c *Cluster) DropDatabase(ctx context.Context, name string) error {
	c.mu.Lock()
	var cr *created
	for i := range c.created {
		if c.created[i].name == name {
			cr = &c.created[i]
			c.created = append(c.created[:i:i], c.created[i+1:]...)
			break
		}
	}
	c.mu.Unlock()
	if cr == nil {
		return fmt.Errorf("pgtest: %s was not made by CreateDatabase", name)
	}
	return c.drop(ctx, *cr)
}

func (c *Cluster) drop(ctx context.Context, cr created) error {
	conn, err := pgx.Connect(ctx, c.admin)
	if err != nil {
		return fmt.Errorf("pgtest: connect: %w", err)
	}
	defer conn.Close(ctx)
	ident := pgx.Identifier{cr.name}.Sanitize()
	q := "DROP DATABASE IF EXISTS " + ident + " WITH (FORCE)"
	if cr.schema {
		q = "DROP SCHEMA IF EXISTS " + ident + " CASCADE"
	}
	if _, err := conn.Exec(ctx, q); err != nil {
		return fmt.Errorf("pgtest: drop %s: %w", cr.name, err)
	}
	return nil
}

// NewDatabase creates a database with a unique name derived from the
// test's, returns its URL and drops it when the test ends (after the
// test's own cleanups, so close pools in t.Cleanup registered later).
func (c *Cluster) NewDatabase(t testing.TB) string {
	t.Helper()
	name := dbName(t.Name())
	ctx, cancel := context.WithTimeout(context.Background(), 30*time.Second)
	defer cancel()
	url, err := c.CreateDatabase(ctx, name)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() {
		ctx, cancel := context.WithTimeout(context.Background(), 30*time.Second)
		defer cancel()
		if err := c.DropDatabase(ctx, name); err != nil && !c.isStopped() {
			t.Logf("pgtest: %v", err)
		}
	})
	return url
}

// dbName makes a valid, unique, lower-case identifier of at most 63 bytes.
func dbName(testName string) string {
	var b strings.Builder
	for _, r := range strings.ToLower(testName) {
		switch {
		case r >= 'a' && r <= 'z', r >= '0' && r <= '9':
			b.WriteRune(r)
		default:
			b.WriteByte('_')
		}
	}
	base := b.String()
	suffix := fmt.Sprintf("_%d_%d", os.Getpid(), seq.Add(1))
	if max := 63 - len("t_") - len(suffix); len(base) > max {
		base = base[len(base)-max:]
	}
	return "t_" + base + suffix
}

func (c *Cluster) isStopped() bool {
	c.mu.Lock()
	defer c.mu.Unlock()
	return c.stopped
}

// StopServer shuts the server down (fast mode) and keeps its data, to
// simulate an outage; StartServer brings it back on the same port.
func (c *Cluster) StopServer() error {
	if !c.Owned() {
		return errors.New("pgtest: StopServer needs a cluster started by pgtest, not " + EnvURL)
	}
	ctx, cancel := context.WithTimeout(context.Background(), time.Minute)
	defer cancel()
	if out, err := c.run(ctx, "pg_ctl", "-D", c.dataDir(), "-m", "fast", "-w", "stop"); err != nil {
		return fmt.Errorf("pgtest: pg_ctl stop: %w\n%s", err, out)
	}
	return nil
}

// StartServer starts the server again after StopServer and waits until it
// accepts connections.
func (c *Cluster) StartServer() error {
	if !c.Owned() {
		return errors.New("pgtest: StartServer needs a cluster started by pgtest, not " + EnvURL)
	}
	ctx, cancel := context.WithTimeout(context.Background(), time.Minute)
	defer cancel()
	if out, err := c.run(ctx, "pg_ctl", "-D", c.dataDir(), "-l", filepath.Join(c.dir, "log"),
		"-w", "-t", "60", "start"); err != nil {
		log, _ := os.ReadFile(filepath.Join(c.dir, "log"))
		return fmt.Errorf("pgtest: pg_ctl start: %w\n%s\n%s", err, out, log)
	}
	return nil
}

// Restart stops and starts the server (fast mode): open connections break,
// data stays.
func (c *Cluster) Restart() error {
	if err := c.StopServer(); err != nil {
		return err
	}
	return c.StartServer()
}

// Stop ends the cluster. For one pgtest started it stops the server
// (immediate mode) and removes its directory; for the EnvURL server it
// drops every database and schema CreateDatabase made.
func (c *Cluster) Stop() error {
	c.mu.Lock()
	if c.stopped {
		c.mu.Unlock()
		return nil
	}
	c.stopped = true
	left := c.created
	c.created = nil
	c.mu.Unlock()
	ctx, cancel := context.WithTimeout(context.Background(), time.Minute)
	defer cancel()
	if !c.Owned() {
		var errs []error
		for _, cr := range left {
			errs = append(errs, c.drop(ctx, cr))
		}
		return errors.Join(errs...)
	}
	var errs []error
	if _, err := os.Stat(filepath.Join(c.dataDir(), "postmaster.pid")); err == nil {
		if out, err := c.run(ctx, "pg_ctl", "-D", c.dataDir(), "-m", "immediate", "-w", "stop"); err != nil {
			errs = append(errs, fmt.Errorf("pgtest: pg_ctl stop: %w\n%s", err, out))
		}
	}
	if err := os.RemoveAll(c.dir); err != nil {
		errs = append(errs, fmt.Errorf("pgtest: %w", err))
	}
	return errors.Join(errs...)
}

// The package's shared cluster, started on first Need and stopped by Main.
var shared struct {
	once    sync.Once
	cluster *Cluster
	err     error
}

// Main runs a package's tests (call it from TestMain) and stops the shared
// cluster, if Need started one, when they end.
func Main(m *testing.M) {
	code := m.Run()
	if c := shared.cluster; c != nil {
		if err := c.Stop(); err != nil {
			fmt.Fprintln(os.Stderr, err)
		}
	}
	os.Exit(code)
}

// Need returns the package's shared cluster, starting it on first use. If
// there is no PostgreSQL it skips the test with the reason, except when the
// environment has CI=true: then the test fails. Any other start-up failure
// fails the test. The package's TestMain must call Main, which stops the
// cluster.
func Need(t testing.TB) *Cluster {
	t.Helper()
	shared.once.Do(func() {
		ctx, cancel := context.WithTimeout(context.Background(), 2*time.Minute)
		defer cancel()
		shared.cluster, shared.err = Start(ctx)
	})
	if shared.err == nil {
		return shared.cluster
	}
	if skip(shared.err, os.Getenv) {
		t.Skipf("skipping: %v (set %s, or install the PostgreSQL server programs)", shared.err, EnvURL)
	}
	t.Fatalf("PostgreSQL is required here: %v", shared.err)
	return nil
}

// skip reports whether a start-up error should skip the test rather than
// fail it: only when there is no PostgreSQL at all and CI is not "true".
func skip(err error, getenv func(string) string) bool {
	return errors.Is(err, ErrNoPostgres) && getenv("CI") != "true"
}
