package sqlite_test

import (
	"context"
	"database/sql"
	"errors"
	"path/filepath"
	"testing"
	"time"

	"residuum/assess"
	"residuum/assess/sqlite"
	"residuum/assess/storetest"
)

// mustOpen opens a fresh database file in the test's temp dir.
func mustOpen(t *testing.T) *sqlite.DB {
	t.Helper()
	db, err := sqlite.Open(context.Background(), filepath.Join(t.TempDir(), "residuum.db"))
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() {
		if err := db.Close(); err != nil {
			t.Error(err)
		}
	})
	return db
}

func TestStore(t *testing.T) {
	storetest.Run(t, func(t *testing.T) assess.Store { return mustOpen(t) })
}

func TestStoreMemory(t *testing.T) {
	storetest.Run(t, func(t *testing.T) assess.Store {
		db, err := sqlite.Open(context.Background(), ":memory:")
		if err != nil {
			t.Fatal(err)
		}
		t.Cleanup(func() { db.Close() })
		return db
	})
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
	path := filepath.Join(t.TempDir(), "m.db")
	applied, err := sqlite.Migrate(ctx, path)
	if err != nil {
		t.Fatal(err)
	}
	if len(applied) == 0 {
		t.Fatal("Migrate on a new file applied nothing")
	}
	again, err := sqlite.Migrate(ctx, path)
	if err != nil || len(again) != 0 {
		t.Fatalf("second Migrate: %v, %v; want nothing to apply", again, err)
	}
	db, err := sqlite.Open(ctx, path)
	if err != nil {
		t.Fatal(err)
	}
	db.Close()

	// WAL is a property of the file, so a plain connection sees it.
	raw, err := sql.Open("sqlite", path)
	if err != nil {
		t.Fatal(err)
	}
	defer raw.Close()
	var mode string
	if err := raw.QueryRow(`PRAGMA journal_mode`).Scan(&mode); err != nil {
		t.Fatal(err)
	}
	if mode != "wal" {
		t.Errorf("journal_mode = %q, want wal", mode)
	}
}

// TestIssuedImmutableInSchema checks the schema's own guard: even SQL that
// bypasses the store cannot change or delete an issued revision.
func TestIssuedImmutableInSchema(t *testing.T) {
	ctx := context.Background()
	path := filepath.Join(t.TempDir(), "i.db")
	db, err := sqlite.Open(ctx, path)
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

	raw, err := sql.Open("sqlite", path+"?_pragma=busy_timeout(5000)")
	if err != nil {
		t.Fatal(err)
	}
	defer raw.Close()
	if _, err := raw.Exec(`UPDATE assessments SET result = '{"r":2}' WHERE id = ?`, a.ID); err == nil {
		t.Error("UPDATE of an issued assessment succeeded")
	}
	if _, err := raw.Exec(`DELETE FROM assessments WHERE id = ?`, a.ID); err == nil {
		t.Error("DELETE of an issued assessment succeeded")
	}
	got, err := db.GetAssessment(ctx, a.ID)
	if err != nil {
		t.Fatal(err)
	}
	if string(got.Result) != `{"r":1}` {
		t.Errorf("result after refused UPDATE = %s, want {\"r\":1}", got.Result)
	}
}

func TestOpenErrors(t *testing.T) {
	ctx := context.Background()
	_, err := sqlite.Open(ctx, "")
	if !errors.Is(err, assess.ErrInvalid) {
		t.Errorf("Open(\"\"): %v, want ErrInvalid", err)
	}
	_, err = sqlite.Open(ctx, filepath.Join(t.TempDir(), "no", "such", "dir", "x.db"))
	if !errors.Is(err, assess.ErrUnavailable) {
		t.Errorf("Open in a missing directory: %v, want ErrUnavailable", err)
	}
}
