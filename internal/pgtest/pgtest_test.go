package pgtest

import (
	"context"
	"errors"
	"path/filepath"
	"regexp"
	"testing"

	"github.com/jackc/pgx/v5"
)

func TestMain(m *testing.M) { Main(m) }

func TestDBName(t *testing.T) {
	valid := regexp.MustCompile(`^[a-z_][a-z0-9_]*$`)
	seen := map[string]bool{}
	for _, name := range []string{
		"TestStore/ProjectCRUD",
		"TestStore/ProjectCRUD",
		"Test_Ünïcode/Ω",
		"TestAVeryLongNameThatGoesOnAndOnAndOnBeyondTheSixtyThreeByteLimitOfPostgres/sub",
	} {
		got := dbName(name)
		if len(got) > 63 || !valid.MatchString(got) {
			t.Errorf("dbName(%q) = %q: not a valid identifier of ≤ 63 bytes", name, got)
		}
		if seen[got] {
			t.Errorf("dbName(%q) = %q repeats", name, got)
		}
		seen[got] = true
	}
}

func TestWithDatabase(t *testing.T) {
	tests := []struct{ in, db, want string }{
		{"postgres://u:p@h:5432/app?sslmode=disable", "t_1", "postgres://u:p@h:5432/t_1?sslmode=disable"},
		{"postgresql://h/app", "x", "postgresql://h/x"},
		{"host=h user=u dbname=app", "t_1", "host=h user=u dbname=app dbname=t_1"},
	}
	for _, tt := range tests {
		if got := withDatabase(tt.in, tt.db); got != tt.want {
			t.Errorf("withDatabase(%q, %q) = %q, want %q", tt.in, tt.db, got, tt.want)
		}
	}
	if got, want := withSearchPath("postgres://h/app?sslmode=disable", "s1"),
		"postgres://h/app?search_path=s1&sslmode=disable"; got != want {
		t.Errorf("withSearchPath = %q, want %q", got, want)
	}
}

// TestCluster checks the started cluster and the EnvURL mode against it:
// a role that may create databases gets a database, one that may not gets
// a schema selected by search_path.
func TestCluster(t *testing.T) {
	ctx := context.Background()
	cl := Need(t)
	url := cl.NewDatabase(t)
	if got := queryString(t, url, `SELECT current_database()`); got == "postgres" || got == "" {
		t.Errorf("NewDatabase connected to %q, want a fresh database", got)
	}
	if got := queryString(t, url, `SHOW fsync`); cl.Owned() && got != "off" {
		t.Errorf("fsync = %q, want off", got)
	}
	if !cl.Owned() {
		t.Skipf("skipping the %s checks: already running against %s", EnvURL, EnvURL)
	}

	// EnvURL pointing at the same server, as the superuser: databases.
	t.Setenv(EnvURL, cl.URL("postgres"))
	ext, err := Start(ctx)
	if err != nil {
		t.Fatal(err)
	}
	if ext.Owned() {
		t.Fatal("Start with EnvURL set started its own cluster")
	}
	u, err := ext.CreateDatabase(ctx, "ext_db_1")
	if err != nil {
		t.Fatal(err)
	}
	if got := queryString(t, u, `SELECT current_database()`); got != "ext_db_1" {
		t.Errorf("external CreateDatabase connected to %q, want ext_db_1", got)
	}

	// A role without CREATEDB: a schema instead.
	admin, err := pgx.Connect(ctx, cl.URL("postgres"))
	if err != nil {
		t.Fatal(err)
	}
	defer admin.Close(ctx)
	for _, q := range []string{
		`CREATE ROLE pgtest_limited LOGIN NOCREATEDB`,
		`GRANT CREATE ON DATABASE postgres TO pgtest_limited`,
	} {
		if _, err := admin.Exec(ctx, q); err != nil {
			t.Fatal(err)
		}
	}
	t.Setenv(EnvURL, withUser(cl.URL("postgres"), "pgtest_limited"))
	lim, err := Start(ctx)
	if err != nil {
		t.Fatal(err)
	}
	su, err := lim.CreateDatabase(ctx, "ext_schema_1")
	if err != nil {
		t.Fatal(err)
	}
	if got := queryString(t, su, `SELECT current_schema()`); got != "ext_schema_1" {
		t.Errorf("schema fallback: current_schema() = %q, want ext_schema_1", got)
	}

	// Stop drops what each made.
	if err := ext.Stop(); err != nil {
		t.Error(err)
	}
	if err := lim.Stop(); err != nil {
		t.Error(err)
	}
	var n int
	if err := admin.QueryRow(ctx, `SELECT count(*) FROM pg_database WHERE datname = 'ext_db_1'`).Scan(&n); err != nil || n != 0 {
		t.Errorf("database after Stop: count %d, %v; want 0", n, err)
	}
	if err := admin.QueryRow(ctx, `SELECT count(*) FROM pg_namespace WHERE nspname = 'ext_schema_1'`).Scan(&n); err != nil || n != 0 {
		t.Errorf("schema after Stop: count %d, %v; want 0", n, err)
	}
	if _, err := admin.Exec(ctx, `REVOKE CREATE ON DATABASE postgres FROM pgtest_limited`); err != nil {
		t.Error(err)
	}
	if _, err := admin.Exec(ctx, `DROP ROLE pgtest_limited`); err != nil {
		t.Error(err)
	}
}

func withUser(url, user string) string {
	return regexp.MustCompile(`//[^@/]*@`).ReplaceAllString(url, "//"+user+"@")
}

func queryString(t *testing.T, url, q string) string {
	t.Helper()
	ctx := context.Background()
	conn, err := pgx.Connect(ctx, url)
	if err != nil {
		t.Fatal(err)
	}
	defer conn.Close(ctx)
	var s string
	if err := conn.QueryRow(ctx, q).Scan(&s); err != nil {
		t.Fatal(err)
	}
	return s
}

func TestNoPostgres(t *testing.T) {
	t.Setenv(EnvURL, "")
	t.Setenv("PATH", t.TempDir())
	old := libGlob
	libGlob = filepath.Join(t.TempDir(), "*", "bin", "pg_ctl")
	defer func() { libGlob = old }()
	_, err := Start(context.Background())
	if !errors.Is(err, ErrNoPostgres) {
		t.Fatalf("Start without PostgreSQL: %v, want ErrNoPostgres", err)
	}
	env := func(ci string) func(string) string {
		return func(k string) string {
			if k == "CI" {
				return ci
			}
			return ""
		}
	}
	if !skip(err, env("")) {
		t.Error("no PostgreSQL outside CI: want skip")
	}
	if skip(err, env("true")) {
		t.Error("no PostgreSQL with CI=true: want failure, not skip")
	}
	if skip(errors.New("initdb: exit status 1"), env("")) {
		t.Error("a broken start-up: want failure, not skip")
	}
}
