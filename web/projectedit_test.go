package web

import (
	"context"
	"encoding/json"
	"errors"
	"net/http"
	"net/url"
	"strconv"
	"strings"
	"testing"

	"residuum/assess"
)

// storeProject creates a project straight in the store and returns it.
func storeProject(t *testing.T, ts *testServer, name string) *assess.Project {
	t.Helper()
	p := &assess.Project{Name: name, SiteAddress: "1 Invented Street", ClientRef: "C-1"}
	if err := ts.Store.CreateProject(context.Background(), p); err != nil {
		t.Fatalf("create project: %v", err)
	}
	return p
}

// storeMember adds a member to project pid with one revision in state st ("" = none).
func storeMember(t *testing.T, ts *testServer, pid int64, label string, st assess.AssessmentState) *assess.MemberRecord {
	t.Helper()
	ctx := context.Background()
	m := &assess.MemberRecord{ProjectID: pid, Label: label, Kind: assess.MemberKindBeam, Input: json.RawMessage(`{}`)}
	if err := ts.Store.CreateMember(ctx, m); err != nil {
		t.Fatalf("create member: %v", err)
	}
	if st != "" {
		a := &assess.AssessmentRecord{MemberID: m.ID, Input: json.RawMessage(`{}`), Result: json.RawMessage(`{}`), MethodVersion: "test", State: st}
		if err := ts.Store.CreateAssessment(ctx, a); err != nil {
			t.Fatalf("create assessment: %v", err)
		}
	}
	return m
}

func editForm(p *assess.Project, version int64) url.Values {
	return url.Values{"name": {p.Name}, "site_address": {p.SiteAddress}, "client_reference": {p.ClientRef},
		"notes": {p.Notes}, "version": {strconv.FormatInt(version, 10)}}
}

func TestProjectEdit(t *testing.T) {
	ts := newTestServer(t)
	ctx := context.Background()

	t.Run("form shows stored values and links from the project page", func(t *testing.T) {
		p := storeProject(t, ts, "Edit form")
		_, body, _ := ts.get(t, projectURL(p.ID))
		if href, _ := attr(mustOne(t, parseHTML(t, body), "edit-project"), "href"); href != projectEditURL(p.ID) {
			t.Errorf("edit link = %q, want %q", href, projectEditURL(p.ID))
		}
		code, body, _ := ts.get(t, projectEditURL(p.ID))
		if code != http.StatusOK {
			t.Fatalf("GET edit = %d", code)
		}
		doc := parseHTML(t, body)
		for _, in := range elementsByTag(doc, "input") {
			n, _ := attr(in, "name")
			v, _ := attr(in, "value")
			want := map[string]string{"name": "Edit form", "client_reference": "C-1", "version": "1"}[n]
			if want != "" && v != want {
				t.Errorf("input %s = %q, want %q", n, v, want)
			}
		}
	})

	t.Run("save", func(t *testing.T) {
		p := storeProject(t, ts, "Before")
		p.Name, p.Notes = "After", "Soffit inspected 3 March."
		code, _, h := ts.post(t, projectEditURL(p.ID), editForm(p, 1))
		if code != http.StatusSeeOther || h.Get("Location") != projectURL(p.ID) {
			t.Fatalf("POST edit = %d to %q, want 303 to %q", code, h.Get("Location"), projectURL(p.ID))
		}
		got, err := ts.Store.GetProject(ctx, p.ID)
		if err != nil {
			t.Fatal(err)
		}
		if got.Name != "After" || got.Notes != "Soffit inspected 3 March." || got.Version != 2 {
			t.Errorf("stored %q %q v%d, want \"After\", the notes, v2", got.Name, got.Notes, got.Version)
		}
	})

	t.Run("validation error beside the field", func(t *testing.T) {
		p := storeProject(t, ts, "Valid")
		p.Name = "   "
		code, body, _ := ts.post(t, projectEditURL(p.ID), editForm(p, 1))
		if code != http.StatusUnprocessableEntity {
			t.Fatalf("POST blank name = %d, want 422", code)
		}
		doc := parseHTML(t, body)
		if msg := textOf(mustOne(t, doc, "err-name")); msg == "" {
			t.Error("no message beside the name field")
		}
		if got, _ := ts.Store.GetProject(ctx, p.ID); got.Name != "Valid" || got.Version != 1 {
			t.Errorf("stored %q v%d after a refused save, want unchanged", got.Name, got.Version)
		}
	})

	t.Run("stale version is not written over", func(t *testing.T) {
		p := storeProject(t, ts, "Shared")
		other := *p
		other.Name = "Changed by a colleague"
		if err := ts.Store.UpdateProject(ctx, &other); err != nil {
			t.Fatal(err)
		}
		mine := *p
		mine.Name = "My change"
		code, body, _ := ts.post(t, projectEditURL(p.ID), editForm(&mine, 1))
		if code != http.StatusConflict {
			t.Fatalf("POST stale = %d, want 409", code)
		}
		doc := parseHTML(t, body)
		if msg := textOf(mustOne(t, doc, "stale-version")); !strings.Contains(msg, "someone else changed") || !strings.Contains(msg, "My change") {
			t.Errorf("stale message %q: want the explanation and what was typed", msg)
		}
		got, _ := ts.Store.GetProject(ctx, p.ID)
		if got.Name != "Changed by a colleague" {
			t.Errorf("stored name %q, want the colleague's", got.Name)
		}
		if !strings.Contains(body, `name="version" value="2"`) {
			t.Error("re-shown form does not carry the current version 2")
		}
	})

	t.Run("bad version", func(t *testing.T) {
		p := storeProject(t, ts, "Bad version")
		if code, _, _ := ts.post(t, projectEditURL(p.ID), editForm(p, 0)); code != http.StatusBadRequest {
			t.Errorf("POST version 0 = %d, want 400", code)
		}
	})
}

func TestProjectDelete(t *testing.T) {
	ts := newTestServer(t)
	ctx := context.Background()

	t.Run("nothing issued: hard delete", func(t *testing.T) {
		p := storeProject(t, ts, "Drafts only")
		storeMember(t, ts, p.ID, "B1", assess.StateDraft)
		code, body, _ := ts.get(t, projectDeleteURL(p.ID))
		if code != http.StatusOK {
			t.Fatalf("GET delete = %d", code)
		}
		doc := parseHTML(t, body)
		if msg := textOf(mustOne(t, doc, "delete-explain")); !strings.Contains(msg, "deleted for good") || !strings.Contains(msg, "1 member") {
			t.Errorf("explanation %q: want hard delete of 1 member", msg)
		}
		if len(byTestID(doc, "confirm-archive")) != 0 {
			t.Error("archive confirmation offered for a project with nothing issued")
		}
		code, _, h := ts.post(t, projectDeleteURL(p.ID), url.Values{})
		if code != http.StatusSeeOther || h.Get("Location") != "/projects" {
			t.Fatalf("POST delete = %d to %q, want 303 to /projects", code, h.Get("Location"))
		}
		if _, err := ts.Store.GetProject(ctx, p.ID); !errors.Is(err, assess.ErrNotFound) {
			t.Errorf("after delete GetProject err = %v, want ErrNotFound", err)
		}
	})

	t.Run("issued: plain delete refused, archive needs the box", func(t *testing.T) {
		p := storeProject(t, ts, "Issued")
		storeMember(t, ts, p.ID, "B1", assess.StateIssued)
		_, body, _ := ts.get(t, projectDeleteURL(p.ID))
		doc := parseHTML(t, body)
		if msg := textOf(mustOne(t, doc, "delete-explain")); !strings.Contains(msg, "1 issued revision") || !strings.Contains(msg, "archived") {
			t.Errorf("explanation %q: want the issued revision and archiving", msg)
		}
		mustOne(t, doc, "confirm-archive")

		code, body, _ := ts.post(t, projectDeleteURL(p.ID), url.Values{})
		if code != http.StatusConflict {
			t.Fatalf("POST plain delete = %d, want 409", code)
		}
		mustOne(t, parseHTML(t, body), "delete-refused")

		code, body, _ = ts.post(t, projectDeleteURL(p.ID), url.Values{"force": {"true"}})
		if code != http.StatusUnprocessableEntity {
			t.Fatalf("POST force without the box = %d, want 422", code)
		}
		mustOne(t, parseHTML(t, body), "err-confirm_archive")
		if got, _ := ts.Store.GetProject(ctx, p.ID); got.DeletedAt != nil {
			t.Fatal("archived without the confirmation")
		}

		code, _, _ = ts.post(t, projectDeleteURL(p.ID), url.Values{"force": {"true"}, "confirm_archive": {"yes"}})
		if code != http.StatusSeeOther {
			t.Fatalf("POST archive = %d, want 303", code)
		}
		got, err := ts.Store.GetProject(ctx, p.ID)
		if err != nil || got.DeletedAt == nil {
			t.Fatalf("after archive: %v, deleted_at %v; want kept and soft-deleted", err, got)
		}
		if code, _, _ := ts.get(t, projectEditURL(p.ID)); code != http.StatusConflict {
			t.Errorf("GET edit of an archived project = %d, want 409", code)
		}
	})

	t.Run("missing project", func(t *testing.T) {
		if code, _, _ := ts.get(t, projectDeleteURL(999999)); code != http.StatusNotFound {
			t.Errorf("GET delete of a missing project = %d, want 404", code)
		}
	})
}

func TestMemberDelete(t *testing.T) {
	ts := newTestServer(t)
	ctx := context.Background()
	p := storeProject(t, ts, "Members")

	t.Run("draft member deleted", func(t *testing.T) {
		m := storeMember(t, ts, p.ID, "B1", assess.StateDraft)
		_, body, _ := ts.get(t, memberURL(p.ID, m.ID))
		if href, _ := attr(mustOne(t, parseHTML(t, body), "delete-member"), "href"); href != memberDeleteURL(p.ID, m.ID) {
			t.Errorf("delete link = %q", href)
		}
		code, body, _ := ts.get(t, memberDeleteURL(p.ID, m.ID))
		if code != http.StatusOK || !strings.Contains(textOf(mustOne(t, parseHTML(t, body), "delete-explain")), "1 draft revision") {
			t.Fatalf("GET member delete = %d; want an explanation naming 1 draft revision", code)
		}
		code, _, h := ts.post(t, memberDeleteURL(p.ID, m.ID), url.Values{})
		if code != http.StatusSeeOther || h.Get("Location") != projectURL(p.ID) {
			t.Fatalf("POST member delete = %d to %q", code, h.Get("Location"))
		}
		if _, err := ts.Store.GetMember(ctx, m.ID); !errors.Is(err, assess.ErrNotFound) {
			t.Errorf("member still there: %v", err)
		}
	})

	t.Run("issued member refused", func(t *testing.T) {
		m := storeMember(t, ts, p.ID, "B2", assess.StateIssued)
		code, body, _ := ts.post(t, memberDeleteURL(p.ID, m.ID), url.Values{})
		if code != http.StatusConflict {
			t.Fatalf("POST delete of an issued member = %d, want 409", code)
		}
		if msg := textOf(mustOne(t, parseHTML(t, body), "delete-refused")); !strings.Contains(msg, "issued assessments") {
			t.Errorf("refusal %q: want it to name the issued assessments", msg)
		}
		if _, err := ts.Store.GetMember(ctx, m.ID); err != nil {
			t.Errorf("issued member gone: %v", err)
		}
	})

	t.Run("member of another project", func(t *testing.T) {
		q := storeProject(t, ts, "Other")
		m := storeMember(t, ts, q.ID, "B3", "")
		if code, _, _ := ts.post(t, memberDeleteURL(p.ID, m.ID), url.Values{}); code != http.StatusNotFound {
			t.Errorf("POST delete through the wrong project = %d, want 404", code)
		}
	})
}
