package postgres_test

import (
	"context"
	"errors"
	"testing"
	"time"

	"github.com/jackc/pgx/v5"
	"github.com/jackc/pgx/v5/pgconn"

	"residuum/assess"
	"residuum/assess/postgres"
	"residuum/assess/storetest"
	"residuum/internal/pgtest"
)

func TestMain(m *testing.M) { pgtest.Main(m) }

// mustOpen opens a store on a fresh database of the shared test cluster.
func mustOpen(t *testing.T) *postgres.DB {
	t.Helper()
	url := pgtest.Need(t).NewDatabase(t)
	db, err := postgres.Open(context.Background(), url)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { db.Close() })
	return db
}

func TestStore(t *testing.T) {
	storetest.Run(t, func(t *testing.T) assess.Store { return mustOpen(t) })
}

func TestClock(t *testing.T) {
	storetest.RunClock(t, func(t *testing.T, now func() time.Time) assess.Store {
		db := mustOpen(t)
		db.Now = now
		return db
	})
}

func TestMigrate(t *testing.T) {
	ctx := context.Background()
	url := pgtest.Need(t).NewDatabase(t)
	applied, err := postgres.Migrate(ctx, url)
	if err != nil {
		t.Fatal(err)
	}
	if len(applied) == 0 {
		t.Fatal("Migrate on an empty database applied nothing")
	}
	again, err := postgres.Migrate(ctx, url)
	if err != nil || len(again) != 0 {
		t.Fatalf("second Migrate: %v, %v; want nothing to apply", again, err)
	}
	// Open on a migrated database works and applies nothing new.
	db, err := postgres.Open(ctx, url)
	if err != nil {
		t.Fatal(err)
	}
	db.Close()
}

func TestOpenInvalidURL(t *testing.T) {
	_, err := postgres.Open(context.Background(), "postgres://a b@/::bad")
	if !errors.Is(err, assess.ErrInvalid) {
		t.Errorf("Open with a malformed URL: %v, want ErrInvalid", err)
	}
	_, err = postgres.Open(context.Background(), "")
	if !errors.Is(err, assess.ErrInvalid) {
		t.Errorf("Open with no URL: %v, want ErrInvalid", err)
	}
}

// TestOutage stops the server under an open store: calls fail with
// ErrUnavailable, and once the server is back the same store works again
// without being reopened. It must not run in parallel with other tests of
// this package (they share the cluster).
func TestOutage(t *testing.T) {
	cl := pgtest.Need(t)
	if !cl.Owned() {
		t.Skipf("skipping: needs a cluster pgtest starts itself, not %s", pgtest.EnvURL)
	}
	ctx := context.Background()
	db := mustOpen(t)
	p := &assess.Project{Name: "Before the outage"}
	if err := db.CreateProject(ctx, p); err != nil {
		t.Fatal(err)
	}

	if err := cl.StopServer(); err != nil {
		t.Fatal(err)
	}
	stopped := true
	t.Cleanup(func() {
		if stopped {
			cl.StartServer()
		}
	})
	if err := db.Ping(ctx); !errors.Is(err, assess.ErrUnavailable) {
		t.Errorf("Ping with the server down: %v, want ErrUnavailable", err)
	}
	if err := db.CreateProject(ctx, &assess.Project{Name: "During"}); !errors.Is(err, assess.ErrUnavailable) {
		t.Errorf("CreateProject with the server down: %v, want ErrUnavailable", err)
	}
	if _, err := db.GetProject(ctx, p.ID); !errors.Is(err, assess.ErrUnavailable) {
		t.Errorf("GetProject with the server down: %v, want ErrUnavailable", err)
	}

	if err := cl.StartServer(); err != nil {
		t.Fatal(err)
	}
	stopped = false
	deadline := time.Now().Add(15 * time.Second)
	for {
		err := db.Ping(ctx)
		if err == nil {
			break
		}
		if !errors.Is(err, assess.ErrUnavailable) {
			t.Fatalf("Ping after restart: %v, want nil or ErrUnavailable", err)
		}
		if time.Now().After(deadline) {
			t.Fatalf("store still unavailable 15 s after the server came back: %v", err)
		}
		time.Sleep(100 * time.Millisecond)
	}
	got, err := db.GetProject(ctx, p.ID)
	if err != nil {
		t.Fatalf("GetProject after the outage: %v", err)
	}
	if got.Name != p.Name {
		t.Errorf("project after the outage: %q, want %q", got.Name, p.Name)
	}
	if err := db.CreateProject(ctx, &assess.Project{Name: "After"}); err != nil {
		t.Errorf("CreateProject after the outage: %v", err)
	}

	// A restart (stop and start while connections are pooled) also heals.
	if err := cl.Restart(); err != nil {
		t.Fatal(err)
	}
	var lastErr error
	for range 3 {
		if _, lastErr = db.GetProject(ctx, p.ID); lastErr == nil {
			break
		}
		if !errors.Is(lastErr, assess.ErrUnavailable) {
			t.Fatalf("GetProject after Restart: %v, want nil or ErrUnavailable", lastErr)
		}
	}
	if lastErr != nil {
		t.Errorf("GetProject still failing after Restart and 3 tries: %v", lastErr)
	}
}

// TestIssuedImmutableInSchema checks the schema's own guard: even SQL that
// bypasses the store cannot change or delete an issued revision (directly
// or by cascade). The refusal carries SQLSTATE 23000, which formatError
// maps to assess.ErrConflict.
func TestIssuedImmutableInSchema(t *testing.T) {
	ctx := context.Background()
	url := pgtest.Need(t).NewDatabase(t)
	db, err := postgres.Open(ctx, url)
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	p := &assess.Project{Name: "P"}
	if err := db.CreateProject(ctx, p); err != nil {
		t.Fatal(err)
	}
	m := &assess.MemberRecord{ProjectID: p.ID, Label: "B1", Kind: "beam", Input: []byte(`{}`)}
	if err := db.CreateMember(ctx, m); err != nil {
		t.Fatal(err)
	}
	a := &assess.AssessmentRecord{MemberID: m.ID, Input: []byte(`{}`), Result: []byte(`{"r":1}`), MethodVersion: "t"}
	if err := db.CreateAssessment(ctx, a); err != nil {
		t.Fatal(err)
	}
	if _, err := db.IssueAssessment(ctx, a.ID); err != nil {
		t.Fatal(err)
	}

	conn, err := pgx.Connect(ctx, url)
	if err != nil {
		t.Fatal(err)
	}
	defer conn.Close(ctx)
	for _, q := range []string{
		`UPDATE assessments SET result = '{"r":2}' WHERE id = $1`,
		`DELETE FROM assessments WHERE id = $1`,
		`DELETE FROM members WHERE id = (SELECT member_id FROM assessments WHERE id = $1)`,
	} {
		_, err := conn.Exec(ctx, q, a.ID)
		var pe *pgconn.PgError
		if !errors.As(err, &pe) || pe.Code != "23000" {
			t.Errorf("%s: error %v, want SQLSTATE 23000 from the trigger", q, err)
		}
	}
	got, err := db.GetAssessment(ctx, a.ID)
	if err != nil {
		t.Fatal(err)
	}
	if string(got.Result) != `{"r":1}` {
		t.Errorf("result after refused UPDATE = %s, want {\"r\":1}", got.Result)
	}
}
