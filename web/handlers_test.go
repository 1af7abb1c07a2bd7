package web

import (
	"fmt"
	"net/http"
	"net/url"
	"strings"
	"testing"
	"time"

	"residuum/assess"
)

// TestPagesStatus is a table of requests to every page with the status and the element each
// must show (or the error page).
func TestPagesStatus(t *testing.T) {
	ts := newTestServer(t)
	proj := ts.createProject(t, "Status table project")
	other := ts.createProject(t, "Another project")
	code, body, h := ts.post(t, proj+"/members", beamForm("B1"))
	if code != http.StatusSeeOther {
		t.Fatalf("save member: %d %s", code, errorSummary(t, body))
	}
	member := h.Get("Location")
	mid := member[strings.LastIndex(member, "/")+1:]

	cases := []struct {
		name     string
		path     string
		wantCode int
		testID   string
	}{
		{"home redirects to the projects", "/", http.StatusSeeOther, ""},
		{"projects list", "/projects", http.StatusOK, "projects"},
		{"project", proj, http.StatusOK, "members"},
		{"empty project", other, http.StatusOK, "no-members"},
		{"missing project", "/projects/9999", http.StatusNotFound, "error-title"},
		{"project id not a number", "/projects/abc", http.StatusBadRequest, "error-title"},
		{"new member editor", proj + "/members/new", http.StatusOK, "section-drawing"},
		{"new slab editor", proj + "/members/new?kind=slab", http.StatusOK, "section-drawing"},
		{"member", member, http.StatusOK, "no-revisions"},
		{"member edit", member + "/edit", http.StatusOK, "member-form"},
		{"member of another project", other + "/members/" + mid, http.StatusNotFound, "error-title"},
		{"missing member", proj + "/members/9999", http.StatusNotFound, "error-title"},
		{"missing revision", member + "/revisions/7", http.StatusNotFound, "error-title"},
		{"revision not a number", member + "/revisions/x", http.StatusBadRequest, "error-title"},
		{"missing revision report", member + "/revisions/7/report", http.StatusNotFound, "error-title"},
		{"missing revision pdf", member + "/revisions/7/report.pdf", http.StatusNotFound, "error-title"},
		{"compare without revisions", member + "/compare", http.StatusBadRequest, "error-title"},
		{"compare missing revisions", member + "/compare?a=1&b=2", http.StatusNotFound, "error-title"},
		{"missing job", "/jobs/nope", http.StatusNotFound, "error-title"},
		{"missing job status", "/jobs/nope/status", http.StatusNotFound, "error-title"},
		{"unknown address", "/no/such/page", http.StatusNotFound, "error-title"},
		{"htmx", "/static/htmx.min.js", http.StatusOK, ""},
		{"htmx licence", "/static/htmx.LICENSE", http.StatusOK, ""},
		{"stylesheet", "/static/site.css", http.StatusOK, ""},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			code, body, _ := ts.get(t, c.path)
			if code != c.wantCode {
				t.Fatalf("GET %s = %d, want %d", c.path, code, c.wantCode)
			}
			if c.testID != "" {
				mustOne(t, parseHTML(t, body), c.testID)
			}
		})
	}
}

// TestProjectCreateInvalid: a project without a name is refused with the message beside the
// name field, and what was typed is kept.
func TestProjectCreateInvalid(t *testing.T) {
	ts := newTestServer(t)
	code, body, _ := ts.post(t, "/projects", url.Values{"name": {""}, "site_address": {"kept address"}})
	if code != http.StatusUnprocessableEntity {
		t.Fatalf("status %d, want 422", code)
	}
	doc := parseHTML(t, body)
	if msg := textOf(mustOne(t, doc, "err-name")); !strings.Contains(msg, "required") {
		t.Errorf("name message %q, want it to say the name is required", msg)
	}
	if !strings.Contains(body, `value="kept address"`) {
		t.Errorf("the typed site address was not kept")
	}
}

// TestMemberValidation posts editor forms with one bad value each and checks that the message
// sits beside the field it concerns and names the accepted range.
func TestMemberValidation(t *testing.T) {
	ts := newTestServer(t)
	proj := ts.createProject(t, "Validation project")
	cases := []struct {
		name    string
		field   string // form field changed
		value   string
		errID   string // data-testid of the message
		mention string // the message must contain this
		extra   url.Values
	}{
		{"width not a number", "member.width_mm", "abc", "err-member-width_mm", "must be a number", nil},
		{"web width too small", "member.width_mm", "50", "err-member-width_mm", "100–2000", nil},
		{"cover too small", "member.layers[0].cover_mm", "2", "err-member-layers-0-cover_mm", "5–200", nil},
		{"too many bars", "member.layers[0].count", "60", "err-member-layers-0-count", "1–50", nil},
		{"fck out of range", "member.concrete.fck_mpa", "200", "err-member-concrete-fck_mpa", "12–90", nil},
		{"no label", "member.label", "", "err-member-label", "required", nil},
		{"unknown curve", "fire.curve", "campfire", "err-fire-curve", "iso834", nil},
		{"negative demand", "demand.sagging_knm", "-5", "err-demand-sagging_knm", "0–100000", nil},
		// 20 mm bar: π·20²/4 = 314 mm², accepted 0.6–1.05 of it
		{"bar area too small", "member.layers[0].area_mm2", "100", "err-member-layers-0-area_mm2", "0.6–1.05·π·dia²/4", nil},
		{"area not a number", "member.layers[1].area_mm2", "x", "err-member-layers-1-area_mm2", "must be a number", nil},
		// the top layer of a rectangular beam can only be exposed through the top or the sides
		{"top bars seen exposed, top and sides not exposed", "evidence.exposed_bars[1]", "true", "err-evidence-exposed_bars-1", "member.exposed",
			url.Values{"member.exposed": {"bottom"}}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			f := beamForm("V1")
			f.Set(c.field, c.value)
			for k, v := range c.extra {
				f[k] = v
			}
			code, body, _ := ts.post(t, proj+"/members", f)
			if code != http.StatusUnprocessableEntity {
				t.Fatalf("status %d, want 422", code)
			}
			doc := parseHTML(t, body)
			msg := textOf(mustOne(t, doc, c.errID))
			if !strings.Contains(msg, c.mention) {
				t.Errorf("message %q does not mention %q", msg, c.mention)
			}
			// beside the field: the message and the input share their parent
			input := fieldID(c.field)
			ctl := mustOne(t, doc, c.errID).Parent
			found := false
			for n := ctl.FirstChild; n != nil; n = n.NextSibling {
				if id, _ := attr(n, "id"); id == input {
					found = true
					if v, _ := attr(n, "aria-invalid"); v != "true" {
						t.Errorf("field %s is not marked aria-invalid", input)
					}
				}
			}
			if !found {
				t.Errorf("message %s is not beside field #%s", c.errID, input)
			}
			mustOne(t, doc, "error-summary")
		})
	}
}

// TestEditorRows: the add/remove buttons change the rows without saving anything.
func TestEditorRows(t *testing.T) {
	ts := newTestServer(t)
	proj := ts.createProject(t, "Rows project")
	f := beamForm("R1")
	f.Set("op", "add-layer")
	code, body, _ := ts.post(t, proj+"/members", f)
	if code != http.StatusOK {
		t.Fatalf("add layer: status %d", code)
	}
	if n := len(byTestID(parseHTML(t, body), "layer-row")); n != 3 {
		t.Errorf("after add: %d layer rows, want 3", n)
	}
	f.Set("op", "remove-layer:0")
	_, body, _ = ts.post(t, proj+"/members", f)
	doc := parseHTML(t, body)
	rows := byTestID(doc, "layer-row")
	if len(rows) != 1 {
		t.Fatalf("after remove: %d layer rows, want 1", len(rows))
	}
	if !strings.Contains(body, `name="member.layers[0].face"`) || strings.Contains(body, `name="member.layers[1].face"`) {
		t.Errorf("the remaining layer is not renumbered to index 0")
	}
	_, body, _ = ts.get(t, proj)
	mustOne(t, parseHTML(t, body), "no-members")
}

// TestSectionPreview: the live drawing endpoint answers an SVG fragment for a form.
func TestSectionPreview(t *testing.T) {
	ts := newTestServer(t)
	proj := ts.createProject(t, "Preview project")
	f := beamForm("P1")
	f.Set("member.width_mm", "420")
	code, body, _ := ts.post(t, proj+"/section.svg", f)
	if code != http.StatusOK || !strings.HasPrefix(body, "<svg") {
		t.Fatalf("preview: status %d body %.60q", code, body)
	}
	if !strings.Contains(body, "420 × 500 mm") {
		t.Errorf("preview title does not follow the width: %.300q", body)
	}
}

// TestRunCancel starts a slow run (an evidence fit on 2 mm cells, many seconds), waits until the
// progress page shows the engine's stage, cancels it, and checks that the page says so promptly
// and no revision is stored.
func TestRunCancel(t *testing.T) {
	ts := newTestServer(t)
	proj := ts.createProject(t, "Cancel project")
	f := beamForm("C1")
	f.Set("options.cell_mm", "2")
	f.Set("member.depth_mm", "400")
	f.Set("fire.curve", "")
	f.Set("evidence.colour_depths[0].face", "bottom")
	f.Set("evidence.colour_depths[0].depth_mm", "30")
	f.Set("op", "run")
	code, body, h := ts.post(t, proj+"/members", f)
	if code != http.StatusSeeOther {
		t.Fatalf("save and run: %d %s", code, errorSummary(t, body))
	}
	job := h.Get("Location")
	code, body, _ = ts.get(t, job)
	if code != http.StatusOK {
		t.Fatalf("progress page: %d", code)
	}
	mustOne(t, parseHTML(t, body), "job-progress")
	for deadline := time.Now().Add(10 * time.Second); !strings.Contains(body, "Fitting the fire"); {
		if time.Now().After(deadline) {
			t.Fatalf("the progress page never showed the fit stage: %s", textOf(parseHTML(t, body)))
		}
		time.Sleep(20 * time.Millisecond)
		_, body, _ = ts.get(t, job+"/status")
	}
	cancelled := time.Now()
	code, _, _ = ts.post(t, job+"/cancel", url.Values{})
	if code != http.StatusSeeOther {
		t.Fatalf("cancel: status %d", code)
	}
	deadline := time.Now().Add(20 * time.Second)
	for {
		_, body, _ = ts.get(t, job+"/status")
		if strings.Contains(body, `data-testid="job-failed"`) {
			break
		}
		if time.Now().After(deadline) {
			t.Fatalf("run still going 20 s after cancel: %s", body)
		}
		time.Sleep(50 * time.Millisecond)
	}
	t.Logf("the run stopped %s after the cancel", time.Since(cancelled).Round(time.Millisecond))
	if !strings.Contains(body, "cancelled") {
		t.Errorf("status after cancel: %q, want it to say cancelled", textOf(parseHTML(t, body)))
	}
	members, err := ts.Store.ListMembers(t.Context(), 1, assess.Page{})
	if err != nil || len(members) != 1 {
		t.Fatalf("members: %v %v", members, err)
	}
	revs, err := ts.Store.ListAssessments(t.Context(), members[0].ID, assess.Page{})
	if err != nil || len(revs) != 0 {
		t.Errorf("a cancelled run stored %d revisions (err %v), want 0", len(revs), err)
	}
}

// TestRevisionsAndCompare runs a member twice with different fire durations and compares the
// revisions: the inputs that differ and the key numbers are listed.
func TestRevisionsAndCompare(t *testing.T) {
	ts := newTestServer(t)
	proj := ts.createProject(t, "Compare project")
	f := beamForm("K1")
	f.Set("op", "run")
	code, body, h := ts.post(t, proj+"/members", f)
	if code != http.StatusSeeOther {
		t.Fatalf("save and run: %d %s", code, errorSummary(t, body))
	}
	r1 := ts.waitJob(t, h.Get("Location"))
	member := r1[:strings.Index(r1, "/revisions/")]
	mid := member[strings.LastIndex(member, "/")+1:]
	// issuing freezes revision 1; a second issue is harmless
	for range 2 {
		if code, _, _ := ts.post(t, r1+"/issue", url.Values{}); code != http.StatusSeeOther {
			t.Fatalf("issue: %d", code)
		}
	}
	f.Set("fire.duration_min", "90")
	f.Set("version", "1")
	code, body, h = ts.post(t, member, f)
	if code != http.StatusSeeOther {
		t.Fatalf("update and run: %d %s", code, errorSummary(t, body))
	}
	r2 := ts.waitJob(t, h.Get("Location"))
	if !strings.HasSuffix(r2, "/revisions/2") {
		t.Fatalf("second run went to %s, want revision 2", r2)
	}
	// revision 1 was run with the old inputs: its page says the member has changed since
	_, body, _ = ts.get(t, r1)
	mustOne(t, parseHTML(t, body), "stale")
	_, body, _ = ts.get(t, r2)
	if n := len(byTestID(parseHTML(t, body), "stale")); n != 0 {
		t.Errorf("the latest revision is marked stale")
	}
	_, body, _ = ts.get(t, member)
	doc := parseHTML(t, body)
	if n := len(byTestID(doc, "revision-row")); n != 2 {
		t.Errorf("member lists %d revisions, want 2", n)
	}
	mustOne(t, doc, "compare-form")
	code, body, _ = ts.get(t, fmt.Sprintf("%s/compare?a=1&b=2", member))
	if code != http.StatusOK {
		t.Fatalf("compare: %d", code)
	}
	doc = parseHTML(t, body)
	in := textOf(mustOne(t, doc, "compare-inputs"))
	if !strings.Contains(in, "60 min") || !strings.Contains(in, "90 min") {
		t.Errorf("input differences %q do not show 60 → 90 min", in)
	}
	differ := 0
	for _, r := range byTestID(mustOne(t, doc, "compare-results"), "compare-row") {
		if v, _ := attr(r, "data-differs"); v == "true" {
			differ++
		}
	}
	if differ == 0 {
		t.Errorf("a longer fire changed none of the key numbers")
	}
	// the stale editor version is refused, not silently overwritten
	f.Set("op", "save")
	code, body, _ = ts.post(t, member, f)
	if code != http.StatusUnprocessableEntity || !strings.Contains(body, "changed by someone else") {
		t.Errorf("stale update: status %d, want 422 with a conflict message", code)
	}
	_ = mid
}

// TestRunInvalidStoredInput: a member stored through the API with an input that no longer passes
// opens in the editor with the engine's message beside the field instead of starting a run.
func TestRunInvalidStoredInput(t *testing.T) {
	ts := newTestServer(t)
	proj := ts.createProject(t, "API project")
	in, raw, inv := validateForm(parseMemberForm(beamForm("A1")))
	if inv != nil {
		t.Fatal(inv)
	}
	in.Member.WidthMM = 40
	raw, err := inputJSON(in)
	if err != nil {
		t.Fatal(err)
	}
	rec := &assess.MemberRecord{ProjectID: 1, Label: "A1", Kind: "beam", Input: raw}
	if err := ts.Store.CreateMember(t.Context(), rec); err != nil {
		t.Fatal(err)
	}
	code, body, _ := ts.post(t, fmt.Sprintf("%s/members/%d/run", proj, rec.ID), url.Values{})
	if code != http.StatusUnprocessableEntity {
		t.Fatalf("run of an invalid member: status %d, want 422", code)
	}
	if msg := textOf(mustOne(t, parseHTML(t, body), "err-member-width_mm")); !strings.Contains(msg, "100–2000") {
		t.Errorf("width message %q, want the accepted range", msg)
	}
}
