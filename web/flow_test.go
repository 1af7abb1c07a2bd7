package web

import (
	"fmt"
	"net/http"
	"net/url"
	"strings"
	"testing"
)

// TestFlow walks the pages without a browser: project, member, run, result, issue, report, PDF,
// second revision and comparison.
func TestFlow(t *testing.T) {
	ts := newTestServer(t)
	proj := ts.createProject(t, "Invented warehouse fire")

	code, body, _ := ts.get(t, proj)
	if code != http.StatusOK {
		t.Fatalf("GET %s = %d", proj, code)
	}
	mustOne(t, parseHTML(t, body), "no-members")

	form := beamForm("B12")
	form.Set("evidence.exposed_bars[0]", "true") // the bottom layer's bars were seen exposed on site
	code, body, h := ts.post(t, proj+"/members", form)
	if code != http.StatusSeeOther {
		t.Fatalf("save member: status %d, want 303; body:\n%s", code, errorSummary(t, body))
	}
	member := h.Get("Location")
	code, body, _ = ts.get(t, member)
	if code != http.StatusOK {
		t.Fatalf("GET %s = %d", member, code)
	}
	doc := parseHTML(t, body)
	mustOne(t, doc, "section-drawing")
	if got := textOf(mustOne(t, doc, "member-label")); got != "B12" {
		t.Errorf("member label = %q, want B12", got)
	}

	code, _, h = ts.post(t, member+"/run", url.Values{})
	if code != http.StatusSeeOther || !strings.HasPrefix(h.Get("Location"), "/jobs/") {
		t.Fatalf("run: status %d location %q, want 303 to /jobs/…", code, h.Get("Location"))
	}
	result := ts.waitJob(t, h.Get("Location"))
	code, body, _ = ts.get(t, result)
	if code != http.StatusOK {
		t.Fatalf("GET %s = %d", result, code)
	}
	doc = parseHTML(t, body)
	for _, id := range []string{"capacity-table", "heat-map", "cautions", "damage", "action", "method", "plot-fire", "plot-rebar", "plot-profile", "plot-mk-sagging", "plot-mk-hogging"} {
		if len(byTestID(doc, id)) == 0 {
			t.Errorf("result page has no [data-testid=%q]", id)
		}
	}
	if n := len(byTestID(doc, "caution")); n == 0 {
		t.Errorf("result page shows no caution")
	}
	// the bar table notes the bars of layer 1 (3 bottom bars) as seen exposed on site, and only them
	barRows := 0
	for _, tr := range elementsByTag(mustOne(t, doc, "bars"), "tr") {
		if strings.Contains(textOf(tr), "seen exposed on site") {
			barRows++
		}
	}
	if barRows != 3 {
		t.Errorf("bar table marks %d bars as seen exposed on site, want the 3 bars of layer 1", barRows)
	}
	mustOne(t, doc, "issue")
	_, body, _ = ts.get(t, result+"/report")
	rdoc := parseHTML(t, body)
	mustOne(t, rdoc, "draft-notice")
	if !strings.Contains(textOf(mustOne(t, rdoc, "bars")), "seen exposed on site") {
		t.Errorf("the report's bar table does not note the bars seen exposed on site")
	}

	code, _, _ = ts.post(t, result+"/issue", url.Values{})
	if code != http.StatusSeeOther {
		t.Fatalf("issue: status %d", code)
	}
	_, body, _ = ts.get(t, result)
	doc = parseHTML(t, body)
	if got := textOf(mustOne(t, doc, "state")); !strings.HasPrefix(got, "issued") {
		t.Errorf("state after issue = %q, want issued…", got)
	}
	if len(byTestID(doc, "issue")) != 0 {
		t.Errorf("issued revision still offers the issue button")
	}

	code, body, _ = ts.get(t, result+"/report")
	if code != http.StatusOK {
		t.Fatalf("report: %d", code)
	}
	doc = parseHTML(t, body)
	mustOne(t, doc, "signoff")
	if len(byTestID(doc, "draft-notice")) != 0 {
		t.Errorf("the issued report still says draft")
	}

	code, pdf, hdr := ts.get(t, result+"/report.pdf")
	if code != http.StatusOK || hdr.Get("Content-Type") != "application/pdf" || !strings.HasPrefix(pdf, "%PDF-") {
		t.Fatalf("pdf: status %d type %q head %q", code, hdr.Get("Content-Type"), pdf[:min(8, len(pdf))])
	}
	text := strings.Join(strings.Fields(pdfText(pdf)), " ")
	if !strings.Contains(text, "B12") {
		t.Errorf("pdf text lacks the member label")
	}
	// every caution of the stored result is in the report (first words; lines wrap between words)
	rec, err := ts.Store.GetRevision(t.Context(), memberID(t, member), 1)
	if err != nil {
		t.Fatal(err)
	}
	_, res, err := decodeRevision(rec)
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Cautions) == 0 {
		t.Fatalf("the result has no cautions")
	}
	for _, c := range res.Cautions {
		if w := firstWords(c, "", 5); !strings.Contains(text, w) {
			t.Errorf("pdf lacks the caution %q", w)
		}
	}
	for _, w := range []string{"seen exposed on site", "Input SHA-256", rec.InputHash, rec.MethodVersion, "Review by the engineer of record", "Method and references"} {
		if !strings.Contains(text, w) {
			t.Errorf("pdf lacks %q", w)
		}
	}

	// project table shows the member with its ratios
	_, body, _ = ts.get(t, proj)
	doc = parseHTML(t, body)
	rows := byTestID(doc, "member-row")
	if len(rows) != 1 {
		t.Fatalf("project lists %d members, want 1", len(rows))
	}
	if got := textOf(mustOne(t, doc, "ratio-sagging")); got == "–" || got == "" {
		t.Errorf("sagging ratio cell = %q, want a number", got)
	}
}

func errorSummary(t testing.TB, body string) string {
	doc := parseHTML(t, body)
	if ns := byTestID(doc, "error-summary"); len(ns) > 0 {
		return textOf(ns[0])
	}
	if ns := byTestID(doc, "error-message"); len(ns) > 0 {
		return textOf(ns[0])
	}
	return body[:min(len(body), 2000)]
}

func memberID(t testing.TB, memberPath string) int64 {
	t.Helper()
	var id int64
	if _, err := fmt.Sscanf(memberPath[strings.LastIndex(memberPath, "/")+1:], "%d", &id); err != nil {
		t.Fatalf("member id of %s: %v", memberPath, err)
	}
	return id
}
