package sqlite_test

import (
	"context"
	"errors"
	"testing"

	"residuum/assess"
)

// TestListMembersExistence covers the cases where ListMembers must tell an
// empty page from a missing project, now that it checks the project only
// when the page is empty (assess.Store: "A missing project gives
// ErrNotFound"; a cursor or offset past the end is an empty page).
func TestListMembersExistence(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	s := mustOpen(t)
	empty := &assess.Project{Name: "Empty"}
	full := &assess.Project{Name: "Three members"}
	for _, p := range []*assess.Project{empty, full} {
		if err := s.CreateProject(ctx, p); err != nil {
			t.Fatal(err)
		}
	}
	var last int64
	for _, label := range []string{"B1", "B2", "S1"} {
		m := &assess.MemberRecord{ProjectID: full.ID, Label: label, Kind: assess.MemberKindBeam, Input: []byte(`{}`)}
		if err := s.CreateMember(ctx, m); err != nil {
			t.Fatal(err)
		}
		last = m.ID
	}
	for _, tc := range []struct {
		name     string
		project  int64
		pg       assess.Page
		wantLen  int
		notFound bool
	}{
		{"project without members", empty.ID, assess.Page{}, 0, false},
		{"first page", full.ID, assess.Page{Limit: 2}, 2, false},
		{"keyset page", full.ID, assess.Page{Limit: 2, AfterID: last - 1}, 1, false},
		{"cursor past the end", full.ID, assess.Page{AfterID: last}, 0, false},
		{"offset past the end", full.ID, assess.Page{Offset: 3}, 0, false},
		{"missing project", full.ID + 1000, assess.Page{}, 0, true},
	} {
		ms, err := s.ListMembers(ctx, tc.project, tc.pg)
		if tc.notFound {
			if !errors.Is(err, assess.ErrNotFound) {
				t.Errorf("%s: error %v, want ErrNotFound", tc.name, err)
			}
			continue
		}
		if err != nil || len(ms) != tc.wantLen {
			t.Errorf("%s: %d members, error %v; want %d, no error", tc.name, len(ms), err, tc.wantLen)
		}
		for _, m := range ms {
			if m.ProjectID != tc.project || m.Input != nil || m.CreatedAt.IsZero() || m.UpdatedAt.IsZero() {
				t.Errorf("%s: member %+v, want project %d, no input, both times set", tc.name, m, tc.project)
			}
		}
	}

	// A project deleted for good (nothing issued) is not found any more.
	if err := s.DeleteProject(ctx, empty.ID, false); err != nil {
		t.Fatal(err)
	}
	if _, err := s.ListMembers(ctx, empty.ID, assess.Page{}); !errors.Is(err, assess.ErrNotFound) {
		t.Errorf("deleted project: error %v, want ErrNotFound", err)
	}
}
