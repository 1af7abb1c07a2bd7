// Package storetest is the contract every assess.Store must pass. Each
// backend calls Run (and RunClock) from its own tests with a function that
// opens a fresh, empty, migrated store for one test.
//
// The checks follow from the assess.Store documentation, not from any
// backend's output: every expected value below is either set by the test
// itself or a rule stated there (revisions 1, 2, 3 …, versions counting up
// from 1, UTC at microsecond resolution, JSON kept byte for byte).
package storetest

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"slices"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/google/go-cmp/cmp"

	"residuum/assess"
)

// Run runs every behavioural test of the assess.Store contract, each as a
// parallel subtest on a store returned by open. open must return a new,
// empty store and arrange (t.Cleanup) for it to be closed.
func Run(t *testing.T, open func(t *testing.T) assess.Store) {
	tests := []struct {
		name string
		fn   func(t *testing.T, s assess.Store)
	}{
		{"Ping", testPing},
		{"ProjectCRUD", testProjectCRUD},
		{"ProjectValidation", testProjectValidation},
		{"ProjectStaleVersion", testProjectStaleVersion},
		{"MemberCRUD", testMemberCRUD},
		{"MemberValidation", testMemberValidation},
		{"MemberStaleVersion", testMemberStaleVersion},
		{"MemberConcurrentUpdate", testMemberConcurrentUpdate},
		{"NotFound", testNotFound},
		{"Revisions", testRevisions},
		{"RevisionsConcurrent", testRevisionsConcurrent},
		{"AssessmentValidation", testAssessmentValidation},
		{"Issue", testIssue},
		{"DeleteProjectWithoutIssued", testDeleteProjectWithoutIssued},
		{"DeleteProjectWithIssued", testDeleteProjectWithIssued},
		{"DeleteMember", testDeleteMember},
		{"PaginationProjects", testPaginationProjects},
		{"PaginationMembersAndAssessments", testPaginationMembersAndAssessments},
		{"ListMembersExistence", testListMembersExistence},
		{"PageValidation", testPageValidation},
		{"LatestAssessments", testLatestAssessments},
		{"TimesUTC", testTimesUTC},
		{"JSONRoundTrip", testJSONRoundTrip},
		{"Unicode", testUnicode},
		{"CancelledContext", testCancelledContext},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			t.Parallel()
			tt.fn(t, open(t))
		})
	}
}

// RunClock checks that the store takes every time it writes from its
// injected clock, converted to UTC and truncated to the microsecond. open
// must return a new, empty store whose clock is now.
func RunClock(t *testing.T, open func(t *testing.T, now func() time.Time) assess.Store) {
	// A clock in a zone east of UTC with sub-microsecond digits: stored
	// times must come back as the same instant, in UTC, truncated.
	zone := time.FixedZone("UTC+13", 13*3600)
	var mu sync.Mutex
	cur := time.Date(2026, 3, 14, 9, 26, 53, 589793238, zone)
	now := func() time.Time {
		mu.Lock()
		defer mu.Unlock()
		return cur
	}
	advance := func(d time.Duration) {
		mu.Lock()
		defer mu.Unlock()
		cur = cur.Add(d)
	}
	want := func(d time.Duration) time.Time {
		return time.Date(2026, 3, 13, 20, 26, 53, 589793000, time.UTC).Add(d)
	}
	ctx := context.Background()
	s := open(t, now)

	p := newProject("Clock")
	must(t, s.CreateProject(ctx, p))
	checkTime(t, "project.CreatedAt", p.CreatedAt, want(0))
	checkTime(t, "project.UpdatedAt", p.UpdatedAt, want(0))

	advance(time.Hour)
	p.Notes = "later"
	must(t, s.UpdateProject(ctx, p))
	checkTime(t, "project.CreatedAt after update", p.CreatedAt, want(0))
	checkTime(t, "project.UpdatedAt after update", p.UpdatedAt, want(time.Hour))

	m := newMember(p.ID, "C1")
	must(t, s.CreateMember(ctx, m))
	checkTime(t, "member.CreatedAt", m.CreatedAt, want(time.Hour))

	advance(time.Minute)
	a := newAssessment(m.ID)
	must(t, s.CreateAssessment(ctx, a))
	checkTime(t, "assessment.CreatedAt", a.CreatedAt, want(time.Hour+time.Minute))

	advance(24 * time.Hour)
	got, err := s.IssueAssessment(ctx, a.ID)
	must(t, err)
	if got.IssuedAt == nil {
		t.Fatal("IssuedAt = nil after IssueAssessment")
	}
	checkTime(t, "assessment.IssuedAt", *got.IssuedAt, want(25*time.Hour+time.Minute))

	back, err := s.GetAssessment(ctx, a.ID)
	must(t, err)
	checkTime(t, "stored assessment.CreatedAt", back.CreatedAt, want(time.Hour+time.Minute))
	checkTime(t, "stored assessment.IssuedAt", *back.IssuedAt, want(25*time.Hour+time.Minute))

	must(t, s.DeleteProject(ctx, p.ID, true))
	gp, err := s.GetProject(ctx, p.ID)
	must(t, err)
	if gp.DeletedAt == nil {
		t.Fatal("DeletedAt = nil after forced delete")
	}
	checkTime(t, "project.DeletedAt", *gp.DeletedAt, want(25*time.Hour+time.Minute))
}

// checkTime requires got to be exactly want, in UTC.
func checkTime(t *testing.T, what string, got, want time.Time) {
	t.Helper()
	if got.Location() != time.UTC {
		t.Errorf("%s location = %v, want UTC", what, got.Location())
	}
	if !got.Equal(want) {
		t.Errorf("%s = %v, want %v", what, got, want)
	}
}

// Fixtures. Every field a client can set has a distinctive value so that a
// column mix-up in a backend shows.

func newProject(name string) *assess.Project {
	return &assess.Project{
		Name:        name,
		SiteAddress: "12 Kiln Street, Harbourside",
		ClientRef:   "CL-0042",
		Notes:       "fire on level 2, east bay",
	}
}

func newMember(projectID int64, label string) *assess.MemberRecord {
	return &assess.MemberRecord{
		ProjectID: projectID,
		Label:     label,
		Location:  "grid C/3–4, level 2",
		Kind:      assess.MemberKindBeam,
		Input:     json.RawMessage(`{"member":{"type":"beam","width_mm":300,"depth_mm":600}}`),
	}
}

func ratio(v float64) *float64 { return &v }

func newAssessment(memberID int64) *assess.AssessmentRecord {
	return &assess.AssessmentRecord{
		MemberID:      memberID,
		Input:         json.RawMessage(`{"member":{"type":"beam","width_mm":300,"depth_mm":600},"fire":{"curve":"iso834","duration_min":90}}`),
		Result:        json.RawMessage(`{"capacity":{"sagging":{"undamaged_knm":412.5,"residual_knm":301.2}},"damage":{"class":"2"}}`),
		MethodVersion: "test-1",
		InputHash:     "9f86d081884c7d659a2feaa0c55ad015a3bf4f1b2b0b822cd15d6c15b0f00a08",
		Author:        "A. Assessor",
		SaggingRatio:  ratio(0.7302),
		HoggingRatio:  nil,
		DamageClass:   "2",
		Action:        "repair",
	}
}

func must(t *testing.T, err error) {
	t.Helper()
	if err != nil {
		t.Fatal(err)
	}
}

// wantKind requires err to wrap kind.
func wantKind(t *testing.T, what string, err, kind error) {
	t.Helper()
	if !errors.Is(err, kind) {
		t.Errorf("%s: error = %v, want one wrapping %v", what, err, kind)
	}
}

// wantProblem requires err to be an *assess.InvalidError naming field.
func wantProblem(t *testing.T, what string, err error, field string) {
	t.Helper()
	if !errors.Is(err, assess.ErrInvalid) {
		t.Errorf("%s: error = %v, want one wrapping ErrInvalid", what, err)
		return
	}
	var ie *assess.InvalidError
	if !errors.As(err, &ie) {
		t.Errorf("%s: error %v is not an *assess.InvalidError", what, err)
		return
	}
	for _, p := range ie.Problems {
		if p.Field == field {
			if p.Message == "" {
				t.Errorf("%s: problem for %q has no message", what, field)
			}
			return
		}
	}
	t.Errorf("%s: problems = %+v, want one for field %q", what, ie.Problems, field)
}

func seed(t *testing.T, s assess.Store) (*assess.Project, *assess.MemberRecord) {
	t.Helper()
	ctx := context.Background()
	p := newProject("Seed project")
	must(t, s.CreateProject(ctx, p))
	m := newMember(p.ID, "B1")
	must(t, s.CreateMember(ctx, m))
	return p, m
}

func testPing(t *testing.T, s assess.Store) {
	must(t, s.Ping(context.Background()))
}

func testProjectCRUD(t *testing.T, s assess.Store) {
	ctx := context.Background()
	p := newProject("Warehouse 7")
	must(t, s.CreateProject(ctx, p))
	if p.ID <= 0 || p.Version != 1 || p.CreatedAt.IsZero() || !p.UpdatedAt.Equal(p.CreatedAt) || p.DeletedAt != nil {
		t.Fatalf("after create: %+v, want ID > 0, Version 1, CreatedAt = UpdatedAt set, DeletedAt nil", p)
	}
	got, err := s.GetProject(ctx, p.ID)
	must(t, err)
	if diff := cmp.Diff(p, got); diff != "" {
		t.Errorf("GetProject differs from created (-created +got):\n%s", diff)
	}

	q := newProject("Warehouse 8")
	must(t, s.CreateProject(ctx, q))
	if q.ID <= p.ID {
		t.Errorf("second project ID %d, want > %d (IDs grow with creation order)", q.ID, p.ID)
	}

	upd := *got
	upd.Name, upd.SiteAddress, upd.ClientRef, upd.Notes = "Warehouse 7 (east)", "14 Kiln Street", "CL-0043", ""
	upd.CreatedAt = time.Time{} // store-set fields are ignored on input
	must(t, s.UpdateProject(ctx, &upd))
	if upd.Version != 2 {
		t.Errorf("Version after update = %d, want 2", upd.Version)
	}
	if !upd.CreatedAt.Equal(p.CreatedAt) || upd.UpdatedAt.Before(p.UpdatedAt) {
		t.Errorf("times after update: created %v updated %v; want created %v, updated ≥ it", upd.CreatedAt, upd.UpdatedAt, p.CreatedAt)
	}
	got, err = s.GetProject(ctx, p.ID)
	must(t, err)
	if diff := cmp.Diff(&upd, got); diff != "" {
		t.Errorf("GetProject after update (-want +got):\n%s", diff)
	}

	list, err := s.ListProjects(ctx, assess.ProjectFilter{}, assess.Page{})
	must(t, err)
	if diff := cmp.Diff([]assess.Project{*got, *q}, list); diff != "" {
		t.Errorf("ListProjects (-want +got):\n%s", diff)
	}
}

func testProjectValidation(t *testing.T, s assess.Store) {
	ctx := context.Background()
	tests := []struct {
		name  string
		edit  func(p *assess.Project)
		field string
	}{
		{"empty name", func(p *assess.Project) { p.Name = "" }, "name"},
		{"name of 201 characters", func(p *assess.Project) { p.Name = strings.Repeat("x", 201) }, "name"},
		{"name not UTF-8", func(p *assess.Project) { p.Name = "bad \xff" }, "name"},
		{"name with NUL", func(p *assess.Project) { p.Name = "a\x00b" }, "name"},
		{"address of 501 characters", func(p *assess.Project) { p.SiteAddress = strings.Repeat("a", 501) }, "site_address"},
		{"client reference of 101 characters", func(p *assess.Project) { p.ClientRef = strings.Repeat("r", 101) }, "client_reference"},
		{"notes of 10 001 characters", func(p *assess.Project) { p.Notes = strings.Repeat("n", 10001) }, "notes"},
	}
	for _, tt := range tests {
		p := newProject("Valid")
		tt.edit(p)
		wantProblem(t, "CreateProject with "+tt.name, s.CreateProject(ctx, p), tt.field)
	}
	// Boundary: exactly 200 characters is accepted.
	must(t, s.CreateProject(ctx, newProject(strings.Repeat("y", 200))))

	// Several problems are reported together.
	p := newProject("")
	p.Notes = strings.Repeat("n", 10001)
	err := s.CreateProject(ctx, p)
	wantProblem(t, "two problems", err, "name")
	wantProblem(t, "two problems", err, "notes")

	// Updates are validated too.
	q := newProject("Valid")
	must(t, s.CreateProject(ctx, q))
	q.Name = ""
	wantProblem(t, "UpdateProject with empty name", s.UpdateProject(ctx, q), "name")

	list, err := s.ListProjects(ctx, assess.ProjectFilter{}, assess.Page{})
	must(t, err)
	if len(list) != 2 {
		t.Errorf("ListProjects after invalid creates: %d projects, want 2 (only the valid ones)", len(list))
	}
}

func testProjectStaleVersion(t *testing.T, s assess.Store) {
	ctx := context.Background()
	p := newProject("Stale")
	must(t, s.CreateProject(ctx, p))
	a, b := *p, *p
	a.Name = "first writer"
	must(t, s.UpdateProject(ctx, &a))
	b.Name = "second writer"
	wantKind(t, "UpdateProject with version 1 after an update", s.UpdateProject(ctx, &b), assess.ErrConflict)
	got, err := s.GetProject(ctx, p.ID)
	must(t, err)
	if got.Name != "first writer" || got.Version != 2 {
		t.Errorf("stored after stale update: name %q version %d, want %q version 2", got.Name, got.Version, "first writer")
	}
}

func testMemberCRUD(t *testing.T, s assess.Store) {
	ctx := context.Background()
	p := newProject("Members")
	must(t, s.CreateProject(ctx, p))
	m := newMember(p.ID, "B1")
	must(t, s.CreateMember(ctx, m))
	if m.ID <= 0 || m.Version != 1 || m.CreatedAt.IsZero() || !m.UpdatedAt.Equal(m.CreatedAt) {
		t.Fatalf("after create: %+v, want ID > 0, Version 1, CreatedAt = UpdatedAt set", m)
	}
	got, err := s.GetMember(ctx, m.ID)
	must(t, err)
	if diff := cmp.Diff(m, got); diff != "" {
		t.Errorf("GetMember differs from created (-created +got):\n%s", diff)
	}

	slab := newMember(p.ID, "S1")
	slab.Kind = assess.MemberKindSlab
	slab.Input = json.RawMessage(`{"member":{"type":"slab","depth_mm":200}}`)
	must(t, s.CreateMember(ctx, slab))

	upd := *got
	upd.Label, upd.Location, upd.Kind = "B1a", "grid D/1, roof", assess.MemberKindSlab
	upd.Input = json.RawMessage(`{"member":{"type":"slab","depth_mm":250}}`)
	must(t, s.UpdateMember(ctx, &upd))
	if upd.Version != 2 || upd.ProjectID != p.ID || !upd.CreatedAt.Equal(m.CreatedAt) {
		t.Errorf("after update: version %d project %d created %v; want 2, %d, %v", upd.Version, upd.ProjectID, upd.CreatedAt, p.ID, m.CreatedAt)
	}
	got, err = s.GetMember(ctx, m.ID)
	must(t, err)
	if diff := cmp.Diff(&upd, got); diff != "" {
		t.Errorf("GetMember after update (-want +got):\n%s", diff)
	}

	list, err := s.ListMembers(ctx, p.ID, assess.Page{})
	must(t, err)
	wantGot, wantSlab := *got, *slab
	wantGot.Input, wantSlab.Input = nil, nil // listings leave the input document out
	if diff := cmp.Diff([]assess.MemberRecord{wantGot, wantSlab}, list); diff != "" {
		t.Errorf("ListMembers (-want +got):\n%s", diff)
	}

	// Members of another project are not listed.
	other := newProject("Other")
	must(t, s.CreateProject(ctx, other))
	must(t, s.CreateMember(ctx, newMember(other.ID, "X1")))
	list, err = s.ListMembers(ctx, p.ID, assess.Page{})
	must(t, err)
	if len(list) != 2 {
		t.Errorf("ListMembers lists %d members, want the project's 2", len(list))
	}
}

func testMemberValidation(t *testing.T, s assess.Store) {
	ctx := context.Background()
	p := newProject("Validation")
	must(t, s.CreateProject(ctx, p))
	tests := []struct {
		name  string
		edit  func(m *assess.MemberRecord)
		field string
	}{
		{"empty label", func(m *assess.MemberRecord) { m.Label = "" }, "label"},
		{"label of 201 characters", func(m *assess.MemberRecord) { m.Label = strings.Repeat("L", 201) }, "label"},
		{"location of 201 characters", func(m *assess.MemberRecord) { m.Location = strings.Repeat("l", 201) }, "location"},
		{"kind column", func(m *assess.MemberRecord) { m.Kind = "column" }, "kind"},
		{"empty kind", func(m *assess.MemberRecord) { m.Kind = "" }, "kind"},
		{"no input", func(m *assess.MemberRecord) { m.Input = nil }, "input"},
		{"input not JSON", func(m *assess.MemberRecord) { m.Input = json.RawMessage(`{"width_mm":`) }, "input"},
		{"input an array", func(m *assess.MemberRecord) { m.Input = json.RawMessage(`[1,2]`) }, "input"},
		{"input null", func(m *assess.MemberRecord) { m.Input = json.RawMessage(`null`) }, "input"},
		{"input over 1 MiB", func(m *assess.MemberRecord) {
			m.Input = json.RawMessage(`{"pad":"` + strings.Repeat("p", 1<<20) + `"}`)
		}, "input"},
	}
	for _, tt := range tests {
		m := newMember(p.ID, "B1")
		tt.edit(m)
		wantProblem(t, "CreateMember with "+tt.name, s.CreateMember(ctx, m), tt.field)
	}
	m := newMember(p.ID, "B1")
	must(t, s.CreateMember(ctx, m))
	m.Kind = "wall"
	wantProblem(t, "UpdateMember with kind wall", s.UpdateMember(ctx, m), "kind")
	list, err := s.ListMembers(ctx, p.ID, assess.Page{})
	must(t, err)
	if len(list) != 1 || list[0].Kind != assess.MemberKindBeam || list[0].Version != 1 {
		t.Errorf("members after invalid writes: %+v, want the one valid beam at version 1", list)
	}
}

func testMemberStaleVersion(t *testing.T, s assess.Store) {
	ctx := context.Background()
	_, m := seed(t, s)
	stale := *m
	m.Label = "B1 renamed"
	must(t, s.UpdateMember(ctx, m))
	stale.Label = "B1 other"
	wantKind(t, "UpdateMember with the version read before an update", s.UpdateMember(ctx, &stale), assess.ErrConflict)
	future := *m
	future.Version = m.Version + 5
	wantKind(t, "UpdateMember with a version never issued", s.UpdateMember(ctx, &future), assess.ErrConflict)
	got, err := s.GetMember(ctx, m.ID)
	must(t, err)
	if got.Label != "B1 renamed" || got.Version != 2 {
		t.Errorf("stored: label %q version %d, want %q version 2", got.Label, got.Version, "B1 renamed")
	}
}

func testMemberConcurrentUpdate(t *testing.T, s assess.Store) {
	ctx := context.Background()
	_, m := seed(t, s)
	const n = 20
	start := warmUp(t, s, m.ID, n)
	errs := make([]error, n)
	var wg sync.WaitGroup
	for i := range n {
		wg.Add(1)
		go func() {
			defer wg.Done()
			<-start
			u := *m // every writer read version 1
			u.Label = fmt.Sprintf("writer %d", i)
			errs[i] = s.UpdateMember(ctx, &u)
		}()
	}
	close(start)
	wg.Wait()
	winner := -1
	for i, err := range errs {
		switch {
		case err == nil:
			if winner >= 0 {
				t.Errorf("writers %d and %d both succeeded from version 1", winner, i)
			}
			winner = i
		case !errors.Is(err, assess.ErrConflict):
			t.Errorf("writer %d: error = %v, want nil or ErrConflict", i, err)
		}
	}
	if winner < 0 {
		t.Fatal("no writer succeeded")
	}
	got, err := s.GetMember(ctx, m.ID)
	must(t, err)
	if want := fmt.Sprintf("writer %d", winner); got.Label != want || got.Version != 2 {
		t.Errorf("stored: label %q version %d, want %q version 2", got.Label, got.Version, want)
	}
}

func testNotFound(t *testing.T, s assess.Store) {
	ctx := context.Background()
	p, m := seed(t, s)
	a := newAssessment(m.ID)
	must(t, s.CreateAssessment(ctx, a))
	const missing = 987654321
	_, err := s.GetProject(ctx, missing)
	wantKind(t, "GetProject", err, assess.ErrNotFound)
	_, err = s.GetMember(ctx, missing)
	wantKind(t, "GetMember", err, assess.ErrNotFound)
	_, err = s.GetAssessment(ctx, missing)
	wantKind(t, "GetAssessment", err, assess.ErrNotFound)
	_, err = s.GetRevision(ctx, m.ID, 2)
	wantKind(t, "GetRevision of an unused revision number", err, assess.ErrNotFound)
	_, err = s.GetRevision(ctx, missing, 1)
	wantKind(t, "GetRevision of a missing member", err, assess.ErrNotFound)
	_, err = s.ListMembers(ctx, missing, assess.Page{})
	wantKind(t, "ListMembers", err, assess.ErrNotFound)
	_, err = s.ListAssessments(ctx, missing, assess.Page{})
	wantKind(t, "ListAssessments", err, assess.ErrNotFound)
	_, err = s.ListLatestAssessments(ctx, missing)
	wantKind(t, "ListLatestAssessments", err, assess.ErrNotFound)
	_, err = s.IssueAssessment(ctx, missing)
	wantKind(t, "IssueAssessment", err, assess.ErrNotFound)

	mp := newProject("Missing")
	mp.ID, mp.Version = missing, 1
	wantKind(t, "UpdateProject", s.UpdateProject(ctx, mp), assess.ErrNotFound)
	wantKind(t, "DeleteProject", s.DeleteProject(ctx, missing, false), assess.ErrNotFound)
	wantKind(t, "DeleteProject force", s.DeleteProject(ctx, missing, true), assess.ErrNotFound)
	wantKind(t, "CreateMember in a missing project", s.CreateMember(ctx, newMember(missing, "B9")), assess.ErrNotFound)
	wantKind(t, "CreateMember with project 0", s.CreateMember(ctx, newMember(0, "B9")), assess.ErrNotFound)
	mm := newMember(p.ID, "B9")
	mm.ID, mm.Version = missing, 1
	wantKind(t, "UpdateMember", s.UpdateMember(ctx, mm), assess.ErrNotFound)
	wantKind(t, "DeleteMember", s.DeleteMember(ctx, missing), assess.ErrNotFound)
	wantKind(t, "CreateAssessment of a missing member", s.CreateAssessment(ctx, newAssessment(missing)), assess.ErrNotFound)
}

func testRevisions(t *testing.T, s assess.Store) {
	ctx := context.Background()
	p, m := seed(t, s)
	other := newMember(p.ID, "B2")
	must(t, s.CreateMember(ctx, other))

	var made []*assess.AssessmentRecord
	for i := range 3 {
		a := newAssessment(m.ID)
		a.Author = fmt.Sprintf("run %d", i+1)
		a.InputHash = "" // optional
		a.HoggingRatio = ratio(0.25 * float64(i))
		must(t, s.CreateAssessment(ctx, a))
		if a.Revision != i+1 || a.ID <= 0 || a.ProjectID != p.ID || a.State != assess.StateDraft || a.IssuedAt != nil {
			t.Fatalf("create %d: revision %d id %d project %d state %q issued %v; want revision %d, id > 0, project %d, draft, not issued",
				i+1, a.Revision, a.ID, a.ProjectID, a.State, a.IssuedAt, i+1, p.ID)
		}
		made = append(made, a)
	}
	// Numbering is per member.
	oa := newAssessment(other.ID)
	must(t, s.CreateAssessment(ctx, oa))
	if oa.Revision != 1 {
		t.Errorf("first assessment of a second member: revision %d, want 1", oa.Revision)
	}
	// Editing the member does not disturb the numbering.
	m.Label = "B1 edited"
	must(t, s.UpdateMember(ctx, m))
	a4 := newAssessment(m.ID)
	must(t, s.CreateAssessment(ctx, a4))
	if a4.Revision != 4 {
		t.Errorf("revision after member edit = %d, want 4", a4.Revision)
	}
	made = append(made, a4)

	for _, a := range made {
		got, err := s.GetAssessment(ctx, a.ID)
		must(t, err)
		if diff := cmp.Diff(a, got); diff != "" {
			t.Errorf("GetAssessment(%d) (-created +got):\n%s", a.ID, diff)
		}
		got, err = s.GetRevision(ctx, m.ID, a.Revision)
		must(t, err)
		if diff := cmp.Diff(a, got); diff != "" {
			t.Errorf("GetRevision(%d) (-created +got):\n%s", a.Revision, diff)
		}
	}

	list, err := s.ListAssessments(ctx, m.ID, assess.Page{})
	must(t, err)
	var want []assess.AssessmentRecord
	for _, a := range made {
		w := *a
		w.Input, w.Result = nil, nil // lists carry the summary only
		want = append(want, w)
	}
	if diff := cmp.Diff(want, list); diff != "" {
		t.Errorf("ListAssessments (-want +got):\n%s", diff)
	}
}

// warmUp reads member id from n goroutines at once, so that a pooled store
// has its connections open before a race starts, and returns the channel
// whose closing starts the racers together.
func warmUp(t *testing.T, s assess.Store, id int64, n int) chan struct{} {
	t.Helper()
	var wg sync.WaitGroup
	for range n {
		wg.Add(1)
		go func() {
			defer wg.Done()
			if _, err := s.GetMember(context.Background(), id); err != nil {
				t.Error(err)
			}
		}()
	}
	wg.Wait()
	return make(chan struct{})
}

func testRevisionsConcurrent(t *testing.T, s assess.Store) {
	ctx := context.Background()
	_, m := seed(t, s)
	const n = 20
	start := warmUp(t, s, m.ID, n)
	revs := make([]int, n)
	errs := make([]error, n)
	var wg sync.WaitGroup
	for i := range n {
		wg.Add(1)
		go func() {
			defer wg.Done()
			<-start
			a := newAssessment(m.ID)
			a.Author = fmt.Sprintf("writer %d", i)
			errs[i] = s.CreateAssessment(ctx, a)
			revs[i] = a.Revision
		}()
	}
	close(start)
	wg.Wait()
	for i, err := range errs {
		if err != nil {
			t.Errorf("writer %d: %v", i, err)
		}
	}
	slices.Sort(revs)
	want := make([]int, n)
	for i := range want {
		want[i] = i + 1
	}
	if !slices.Equal(revs, want) {
		t.Errorf("revisions handed out = %v, want 1..%d without gaps or duplicates", revs, n)
	}
	list, err := s.ListAssessments(ctx, m.ID, assess.Page{})
	must(t, err)
	var stored []int
	for _, a := range list {
		stored = append(stored, a.Revision)
	}
	if !slices.Equal(stored, want) {
		t.Errorf("stored revisions in list order = %v, want 1..%d", stored, n)
	}
}

func testAssessmentValidation(t *testing.T, s assess.Store) {
	ctx := context.Background()
	_, m := seed(t, s)
	tests := []struct {
		name  string
		edit  func(a *assess.AssessmentRecord)
		field string
	}{
		{"no input", func(a *assess.AssessmentRecord) { a.Input = nil }, "input"},
		{"no result", func(a *assess.AssessmentRecord) { a.Result = nil }, "result"},
		{"result not JSON", func(a *assess.AssessmentRecord) { a.Result = json.RawMessage(`{"a":1,}`) }, "result"},
		{"result a string", func(a *assess.AssessmentRecord) { a.Result = json.RawMessage(`"ok"`) }, "result"},
		{"no method version", func(a *assess.AssessmentRecord) { a.MethodVersion = "" }, "method_version"},
		{"hash of 129 characters", func(a *assess.AssessmentRecord) { a.InputHash = strings.Repeat("f", 129) }, "input_sha256"},
		{"author of 201 characters", func(a *assess.AssessmentRecord) { a.Author = strings.Repeat("a", 201) }, "author"},
		{"state final", func(a *assess.AssessmentRecord) { a.State = "final" }, "state"},
		{"negative sagging ratio", func(a *assess.AssessmentRecord) { a.SaggingRatio = ratio(-0.1) }, "sagging_ratio"},
		{"NaN hogging ratio", func(a *assess.AssessmentRecord) { a.HoggingRatio = ratio(nan()) }, "hogging_ratio"},
		{"damage class of 51 characters", func(a *assess.AssessmentRecord) { a.DamageClass = strings.Repeat("c", 51) }, "damage_class"},
		{"action of 201 characters", func(a *assess.AssessmentRecord) { a.Action = strings.Repeat("x", 201) }, "action"},
	}
	for _, tt := range tests {
		a := newAssessment(m.ID)
		tt.edit(a)
		wantProblem(t, "CreateAssessment with "+tt.name, s.CreateAssessment(ctx, a), tt.field)
	}
	// No revision number was used up by the rejected creates.
	a := newAssessment(m.ID)
	must(t, s.CreateAssessment(ctx, a))
	if a.Revision != 1 {
		t.Errorf("first valid assessment after rejected ones: revision %d, want 1", a.Revision)
	}
}

func nan() float64 {
	zero := 0.0
	return zero / zero
}

func testIssue(t *testing.T, s assess.Store) {
	ctx := context.Background()
	_, m := seed(t, s)
	a := newAssessment(m.ID)
	must(t, s.CreateAssessment(ctx, a))
	got, err := s.IssueAssessment(ctx, a.ID)
	must(t, err)
	if got.State != assess.StateIssued || got.IssuedAt == nil || got.IssuedAt.Before(a.CreatedAt) {
		t.Fatalf("after issue: state %q issued %v, want issued at or after %v", got.State, got.IssuedAt, a.CreatedAt)
	}
	want := *a
	want.State, want.IssuedAt = assess.StateIssued, got.IssuedAt
	if diff := cmp.Diff(&want, got); diff != "" {
		t.Errorf("IssueAssessment result (-want +got):\n%s", diff)
	}

	_, err = s.IssueAssessment(ctx, a.ID)
	wantKind(t, "IssueAssessment twice", err, assess.ErrConflict)
	stored, err := s.GetAssessment(ctx, a.ID)
	must(t, err)
	if diff := cmp.Diff(got, stored); diff != "" {
		t.Errorf("stored after second issue (-first issue +stored):\n%s", diff)
	}

	// A re-run is a new revision; the issued one stays as it was.
	b := newAssessment(m.ID)
	b.Result = json.RawMessage(`{"capacity":{"sagging":{"residual_knm":280}}}`)
	must(t, s.CreateAssessment(ctx, b))
	if b.Revision != 2 || b.State != assess.StateDraft {
		t.Errorf("re-run: revision %d state %q, want 2 draft", b.Revision, b.State)
	}

	// Created directly as issued.
	c := newAssessment(m.ID)
	c.State = assess.StateIssued
	must(t, s.CreateAssessment(ctx, c))
	if c.IssuedAt == nil || !c.IssuedAt.Equal(c.CreatedAt) {
		t.Errorf("created issued: IssuedAt %v, want = CreatedAt %v", c.IssuedAt, c.CreatedAt)
	}
	_, err = s.IssueAssessment(ctx, c.ID)
	wantKind(t, "IssueAssessment of one created issued", err, assess.ErrConflict)
	stored, err = s.GetAssessment(ctx, c.ID)
	must(t, err)
	if diff := cmp.Diff(c, stored); diff != "" {
		t.Errorf("GetAssessment of one created issued (-created +got):\n%s", diff)
	}
}

func testDeleteProjectWithoutIssued(t *testing.T, s assess.Store) {
	ctx := context.Background()
	for _, force := range []bool{false, true} {
		p, m := seed(t, s)
		a := newAssessment(m.ID)
		must(t, s.CreateAssessment(ctx, a))
		must(t, s.DeleteProject(ctx, p.ID, force))
		// No issued revision: the project is deleted for good.
		_, err := s.GetProject(ctx, p.ID)
		wantKind(t, fmt.Sprintf("GetProject after delete (force %v)", force), err, assess.ErrNotFound)
		_, err = s.GetMember(ctx, m.ID)
		wantKind(t, "GetMember of a deleted project's member", err, assess.ErrNotFound)
		_, err = s.GetAssessment(ctx, a.ID)
		wantKind(t, "GetAssessment of a deleted project's draft", err, assess.ErrNotFound)
		list, err := s.ListProjects(ctx, assess.ProjectFilter{IncludeDeleted: true}, assess.Page{})
		must(t, err)
		if len(list) != 0 {
			t.Errorf("ListProjects(IncludeDeleted) after hard delete: %d projects, want 0", len(list))
		}
	}
}

func testDeleteProjectWithIssued(t *testing.T, s assess.Store) {
	ctx := context.Background()
	p, m := seed(t, s)
	live := newProject("Live")
	must(t, s.CreateProject(ctx, live))
	a := newAssessment(m.ID)
	must(t, s.CreateAssessment(ctx, a))
	issued, err := s.IssueAssessment(ctx, a.ID)
	must(t, err)
	draft := newAssessment(m.ID)
	must(t, s.CreateAssessment(ctx, draft))

	wantKind(t, "DeleteProject with an issued assessment", s.DeleteProject(ctx, p.ID, false), assess.ErrConflict)
	got, err := s.GetProject(ctx, p.ID)
	must(t, err)
	if got.DeletedAt != nil {
		t.Fatalf("refused delete set DeletedAt %v", got.DeletedAt)
	}

	must(t, s.DeleteProject(ctx, p.ID, true))
	got, err = s.GetProject(ctx, p.ID)
	must(t, err)
	if got.DeletedAt == nil || got.DeletedAt.Before(got.CreatedAt) {
		t.Fatalf("after forced delete DeletedAt = %v, want set, ≥ CreatedAt %v", got.DeletedAt, got.CreatedAt)
	}

	ids := func(f assess.ProjectFilter) []int64 {
		list, err := s.ListProjects(ctx, f, assess.Page{})
		must(t, err)
		var out []int64
		for _, q := range list {
			out = append(out, q.ID)
		}
		return out
	}
	if got, want := ids(assess.ProjectFilter{}), []int64{live.ID}; !slices.Equal(got, want) {
		t.Errorf("ListProjects() = %v, want %v (soft-deleted left out)", got, want)
	}
	if got, want := ids(assess.ProjectFilter{IncludeDeleted: true}), []int64{p.ID, live.ID}; !slices.Equal(got, want) {
		t.Errorf("ListProjects(IncludeDeleted) = %v, want %v", got, want)
	}
	if got, want := ids(assess.ProjectFilter{OnlyDeleted: true}), []int64{p.ID}; !slices.Equal(got, want) {
		t.Errorf("ListProjects(OnlyDeleted) = %v, want %v", got, want)
	}

	// The record is still readable.
	stored, err := s.GetAssessment(ctx, a.ID)
	must(t, err)
	if diff := cmp.Diff(issued, stored); diff != "" {
		t.Errorf("issued assessment after soft delete (-before +after):\n%s", diff)
	}
	if _, err := s.GetMember(ctx, m.ID); err != nil {
		t.Errorf("GetMember in a soft-deleted project: %v", err)
	}
	if list, err := s.ListAssessments(ctx, m.ID, assess.Page{}); err != nil || len(list) != 2 {
		t.Errorf("ListAssessments in a soft-deleted project: %d rows, %v; want 2, nil", len(list), err)
	}

	// But nothing in it can be written.
	got.Name = "renamed"
	wantKind(t, "UpdateProject of a soft-deleted project", s.UpdateProject(ctx, got), assess.ErrConflict)
	wantKind(t, "CreateMember in a soft-deleted project", s.CreateMember(ctx, newMember(p.ID, "B7")), assess.ErrConflict)
	m.Label = "renamed"
	wantKind(t, "UpdateMember in a soft-deleted project", s.UpdateMember(ctx, m), assess.ErrConflict)
	wantKind(t, "DeleteMember in a soft-deleted project", s.DeleteMember(ctx, m.ID), assess.ErrConflict)
	wantKind(t, "CreateAssessment in a soft-deleted project", s.CreateAssessment(ctx, newAssessment(m.ID)), assess.ErrConflict)
	_, err = s.IssueAssessment(ctx, draft.ID)
	wantKind(t, "IssueAssessment in a soft-deleted project", err, assess.ErrConflict)
	wantKind(t, "DeleteProject again", s.DeleteProject(ctx, p.ID, true), assess.ErrNotFound)
}

func testDeleteMember(t *testing.T, s assess.Store) {
	ctx := context.Background()
	p, m := seed(t, s)
	a := newAssessment(m.ID)
	must(t, s.CreateAssessment(ctx, a))
	_, err := s.IssueAssessment(ctx, a.ID)
	must(t, err)
	wantKind(t, "DeleteMember with an issued assessment", s.DeleteMember(ctx, m.ID), assess.ErrConflict)
	if _, err := s.GetAssessment(ctx, a.ID); err != nil {
		t.Errorf("issued assessment after refused member delete: %v", err)
	}

	d := newMember(p.ID, "B2")
	must(t, s.CreateMember(ctx, d))
	da := newAssessment(d.ID)
	must(t, s.CreateAssessment(ctx, da))
	must(t, s.DeleteMember(ctx, d.ID))
	_, err = s.GetMember(ctx, d.ID)
	wantKind(t, "GetMember after delete", err, assess.ErrNotFound)
	_, err = s.GetAssessment(ctx, da.ID)
	wantKind(t, "GetAssessment of a deleted member's draft", err, assess.ErrNotFound)
	list, err := s.ListMembers(ctx, p.ID, assess.Page{})
	must(t, err)
	if len(list) != 1 || list[0].ID != m.ID {
		t.Errorf("members after delete: %+v, want only member %d", list, m.ID)
	}
}

// pages walks a list with pg's Limit by keyset (AfterID) or by Offset and
// returns the IDs seen, failing if a page is larger than the limit.
func pages(t *testing.T, limit int, keyset bool, list func(pg assess.Page) ([]int64, error)) []int64 {
	t.Helper()
	var all []int64
	pg := assess.Page{Limit: limit}
	for range 1000 {
		ids, err := list(pg)
		must(t, err)
		if len(ids) > limit {
			t.Fatalf("page %+v has %d rows, more than the limit", pg, len(ids))
		}
		if len(ids) == 0 {
			return all
		}
		all = append(all, ids...)
		if keyset {
			pg.AfterID = ids[len(ids)-1]
		} else {
			pg.Offset += len(ids)
		}
	}
	t.Fatal("pagination did not end")
	return nil
}

func testPaginationProjects(t *testing.T, s assess.Store) {
	ctx := context.Background()
	var want []int64
	for i := range 7 {
		p := newProject(fmt.Sprintf("Project %d", 7-i)) // names against ID order
		must(t, s.CreateProject(ctx, p))
		want = append(want, p.ID)
	}
	if !slices.IsSorted(want) {
		t.Fatalf("IDs %v not ascending in creation order", want)
	}
	list := func(pg assess.Page) ([]int64, error) {
		ps, err := s.ListProjects(ctx, assess.ProjectFilter{}, pg)
		var ids []int64
		for _, p := range ps {
			ids = append(ids, p.ID)
		}
		return ids, err
	}
	for _, limit := range []int{1, 3, 7, 200} {
		if got := pages(t, limit, true, list); !slices.Equal(got, want) {
			t.Errorf("keyset pages of %d: %v, want %v", limit, got, want)
		}
		if got := pages(t, limit, false, list); !slices.Equal(got, want) {
			t.Errorf("offset pages of %d: %v, want %v", limit, got, want)
		}
	}
	// The default limit (50) covers all 7.
	if got, err := list(assess.Page{}); err != nil || !slices.Equal(got, want) {
		t.Errorf("default page: %v, %v; want %v", got, err, want)
	}
	// A cursor past the end gives an empty page, not an error.
	if got, err := list(assess.Page{AfterID: want[6]}); err != nil || len(got) != 0 {
		t.Errorf("page after the last ID: %v, %v; want empty", got, err)
	}
}

func testPaginationMembersAndAssessments(t *testing.T, s assess.Store) {
	ctx := context.Background()
	p := newProject("Pages")
	must(t, s.CreateProject(ctx, p))
	var wantMembers []int64
	for i := range 5 {
		m := newMember(p.ID, fmt.Sprintf("B%d", 5-i))
		must(t, s.CreateMember(ctx, m))
		wantMembers = append(wantMembers, m.ID)
	}
	listMembers := func(pg assess.Page) ([]int64, error) {
		ms, err := s.ListMembers(ctx, p.ID, pg)
		var ids []int64
		for _, m := range ms {
			ids = append(ids, m.ID)
		}
		return ids, err
	}
	if got := pages(t, 2, true, listMembers); !slices.Equal(got, wantMembers) {
		t.Errorf("member keyset pages: %v, want %v", got, wantMembers)
	}
	if got := pages(t, 2, false, listMembers); !slices.Equal(got, wantMembers) {
		t.Errorf("member offset pages: %v, want %v", got, wantMembers)
	}

	var wantRevs []int64
	for range 5 {
		a := newAssessment(wantMembers[0])
		must(t, s.CreateAssessment(ctx, a))
		wantRevs = append(wantRevs, a.ID)
	}
	listRevs := func(pg assess.Page) ([]int64, error) {
		as, err := s.ListAssessments(ctx, wantMembers[0], pg)
		var ids []int64
		for _, a := range as {
			ids = append(ids, a.ID)
		}
		return ids, err
	}
	if got := pages(t, 2, true, listRevs); !slices.Equal(got, wantRevs) {
		t.Errorf("assessment keyset pages: %v, want %v", got, wantRevs)
	}
	if got := pages(t, 3, false, listRevs); !slices.Equal(got, wantRevs) {
		t.Errorf("assessment offset pages: %v, want %v", got, wantRevs)
	}
}

func testPageValidation(t *testing.T, s assess.Store) {
	ctx := context.Background()
	p, m := seed(t, s)
	bad := []struct {
		pg    assess.Page
		field string
	}{
		{assess.Page{Limit: -1}, "limit"},
		{assess.Page{Limit: 201}, "limit"},
		{assess.Page{AfterID: -1}, "after_id"},
		{assess.Page{Offset: -5}, "offset"},
		{assess.Page{AfterID: 3, Offset: 2}, "offset"},
	}
	for _, b := range bad {
		_, err := s.ListProjects(ctx, assess.ProjectFilter{}, b.pg)
		wantProblem(t, fmt.Sprintf("ListProjects(%+v)", b.pg), err, b.field)
		_, err = s.ListMembers(ctx, p.ID, b.pg)
		wantProblem(t, fmt.Sprintf("ListMembers(%+v)", b.pg), err, b.field)
		_, err = s.ListAssessments(ctx, m.ID, b.pg)
		wantProblem(t, fmt.Sprintf("ListAssessments(%+v)", b.pg), err, b.field)
	}
	if _, err := s.ListProjects(ctx, assess.ProjectFilter{}, assess.Page{Limit: 200}); err != nil {
		t.Errorf("limit 200 (the maximum): %v", err)
	}
}

func testLatestAssessments(t *testing.T, s assess.Store) {
	ctx := context.Background()
	p, m1 := seed(t, s)
	m2 := newMember(p.ID, "B2") // never assessed
	must(t, s.CreateMember(ctx, m2))
	m3 := newMember(p.ID, "S3")
	m3.Kind = assess.MemberKindSlab
	must(t, s.CreateMember(ctx, m3))

	empty, err := s.ListLatestAssessments(ctx, p.ID)
	must(t, err)
	if len(empty) != 0 {
		t.Errorf("latest before any assessment: %d rows, want 0", len(empty))
	}

	// m3's single revision is created first so that ID order and member
	// order differ; m1's latest is revision 3, a draft after an issued 2.
	a3 := newAssessment(m3.ID)
	a3.SaggingRatio, a3.HoggingRatio, a3.DamageClass, a3.Action = ratio(0.95), ratio(1), "1", "no structural action"
	must(t, s.CreateAssessment(ctx, a3))
	var last *assess.AssessmentRecord
	for i := range 3 {
		a := newAssessment(m1.ID)
		a.SaggingRatio = ratio(0.9 - 0.1*float64(i))
		must(t, s.CreateAssessment(ctx, a))
		if i == 1 {
			_, err := s.IssueAssessment(ctx, a.ID)
			must(t, err)
		}
		last = a
	}
	// Another project's assessments are not included.
	op := newProject("Other")
	must(t, s.CreateProject(ctx, op))
	om := newMember(op.ID, "X")
	must(t, s.CreateMember(ctx, om))
	must(t, s.CreateAssessment(ctx, newAssessment(om.ID)))

	got, err := s.ListLatestAssessments(ctx, p.ID)
	must(t, err)
	w1, w3 := *last, *a3
	w1.Input, w1.Result, w3.Input, w3.Result = nil, nil, nil, nil
	if diff := cmp.Diff([]assess.AssessmentRecord{w1, w3}, got); diff != "" {
		t.Errorf("ListLatestAssessments (-want +got):\n%s", diff)
	}
}

func testTimesUTC(t *testing.T, s assess.Store) {
	ctx := context.Background()
	before := time.Now().UTC().Truncate(time.Microsecond)
	p, m := seed(t, s)
	a := newAssessment(m.ID)
	must(t, s.CreateAssessment(ctx, a))
	issued, err := s.IssueAssessment(ctx, a.ID)
	must(t, err)
	after := time.Now().UTC()
	gp, err := s.GetProject(ctx, p.ID)
	must(t, err)
	gm, err := s.GetMember(ctx, m.ID)
	must(t, err)
	ga, err := s.GetAssessment(ctx, a.ID)
	must(t, err)
	for _, tc := range []struct {
		what        string
		wrote, read time.Time
	}{
		{"project created", p.CreatedAt, gp.CreatedAt},
		{"project updated", p.UpdatedAt, gp.UpdatedAt},
		{"member created", m.CreatedAt, gm.CreatedAt},
		{"member updated", m.UpdatedAt, gm.UpdatedAt},
		{"assessment created", a.CreatedAt, ga.CreatedAt},
		{"assessment issued", *issued.IssuedAt, *ga.IssuedAt},
	} {
		for _, v := range []time.Time{tc.wrote, tc.read} {
			if v.Location() != time.UTC {
				t.Errorf("%s: location %v, want UTC", tc.what, v.Location())
			}
			if v.Nanosecond()%1000 != 0 {
				t.Errorf("%s: %v has sub-microsecond digits", tc.what, v)
			}
			if v.Before(before) || v.After(after) {
				t.Errorf("%s: %v outside the test's run %v – %v", tc.what, v, before, after)
			}
		}
		// == on time.Time compares instant, location and monotonic reading.
		if tc.wrote != tc.read {
			t.Errorf("%s: wrote %#v, read back %#v", tc.what, tc.wrote, tc.read)
		}
	}
}

func testJSONRoundTrip(t *testing.T, s assess.Store) {
	ctx := context.Background()
	p := newProject("JSON")
	must(t, s.CreateProject(ctx, p))
	// Whitespace, key order, a duplicate key, escapes, raw non-ASCII, a
	// number beyond float64 and deep nesting must all survive unchanged.
	input := json.RawMessage("{\n  \"z\": 1,\t\"a\" : [1.50, 2e3, -0.0],\r\n" +
		`  "label": "Träger \u00e9 \"B-3\" — 梁 🔥", "a": "dup", "big": 123456789012345678901234567890, ` +
		`"deep": [[[[{"x": null}]]]], "esc": "\\ \/ \b\f\n\r\t"` + "\n}  ")
	m := newMember(p.ID, "B1")
	m.Input = input
	must(t, s.CreateMember(ctx, m))
	got, err := s.GetMember(ctx, m.ID)
	must(t, err)
	if !bytes.Equal(got.Input, input) {
		t.Errorf("member input changed:\n got %q\nwant %q", got.Input, input)
	}
	list, err := s.ListMembers(ctx, p.ID, assess.Page{})
	must(t, err)
	if len(list) != 1 {
		t.Fatalf("ListMembers gave %d members, want 1", len(list))
	}
	if list[0].Input != nil {
		t.Errorf("ListMembers gave the input %q; want none (listings leave it out)", list[0].Input)
	}

	result := json.RawMessage(`{"field":{"nx":3,"ny":2,"peak_c":[812.4,null,640.25,598.125,null,420]}, "fit" : {}}`)
	a := newAssessment(m.ID)
	a.Input, a.Result = input, result
	must(t, s.CreateAssessment(ctx, a))
	ga, err := s.GetAssessment(ctx, a.ID)
	must(t, err)
	if !bytes.Equal(ga.Input, input) || !bytes.Equal(ga.Result, result) {
		t.Errorf("assessment JSON changed:\n input %q\nresult %q", ga.Input, ga.Result)
	}

	// Ratios are float64 and come back exactly.
	b := newAssessment(m.ID)
	b.SaggingRatio, b.HoggingRatio = ratio(0.1234567890123456789), ratio(0)
	must(t, s.CreateAssessment(ctx, b))
	gb, err := s.GetAssessment(ctx, b.ID)
	must(t, err)
	if gb.SaggingRatio == nil || *gb.SaggingRatio != *b.SaggingRatio || gb.HoggingRatio == nil || *gb.HoggingRatio != 0 {
		t.Errorf("ratios %v %v, want %v and 0 exactly", gb.SaggingRatio, gb.HoggingRatio, *b.SaggingRatio)
	}
}

func testUnicode(t *testing.T, s assess.Store) {
	ctx := context.Background()
	p := newProject("Parkhaus Süd — Ebene −1 · 停车场")
	p.SiteAddress = "Rue de l’Étang 3, 1200 Genève"
	p.Notes = "Brandlast ≈ 600 MJ/m²; θ ≥ 500 °C ✓ 🔥"
	must(t, s.CreateProject(ctx, p))
	gp, err := s.GetProject(ctx, p.ID)
	must(t, err)
	if diff := cmp.Diff(p, gp); diff != "" {
		t.Errorf("unicode project (-want +got):\n%s", diff)
	}
	// Lengths are counted in characters: 200 three-byte characters fit.
	m := newMember(p.ID, strings.Repeat("梁", 200))
	m.Location = "Achse 4/5 – Ebene 2 (Δh = 3,2 m)"
	must(t, s.CreateMember(ctx, m))
	gm, err := s.GetMember(ctx, m.ID)
	must(t, err)
	if diff := cmp.Diff(m, gm); diff != "" {
		t.Errorf("unicode member (-want +got):\n%s", diff)
	}
	wantProblem(t, "label of 201 three-byte characters",
		s.CreateMember(ctx, newMember(p.ID, strings.Repeat("梁", 201))), "label")
}

func testCancelledContext(t *testing.T, s assess.Store) {
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	err := s.CreateProject(ctx, newProject("Never"))
	if !errors.Is(err, context.Canceled) {
		t.Errorf("CreateProject with a cancelled context: %v, want context.Canceled", err)
	}
	list, err := s.ListProjects(context.Background(), assess.ProjectFilter{IncludeDeleted: true}, assess.Page{})
	must(t, err)
	if len(list) != 0 {
		t.Errorf("projects after a cancelled create: %d, want 0", len(list))
	}
}

// testListMembersExistence covers the cases where ListMembers must tell an
// empty page from a missing project, now that it checks the project only
// when the page is empty (assess.Store: "A missing project gives
// ErrNotFound"; a cursor or offset past the end is an empty page).
func testListMembersExistence(t *testing.T, s assess.Store) {
	ctx := context.Background()
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
