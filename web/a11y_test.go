package web

import (
	"net/http"
	"net/url"
	"strings"
	"testing"

	"golang.org/x/net/html"

	"residuum/assess"
)

// TestEveryInputHasALabel walks the main pages and checks that every visible form control has
// an accessible name: a <label for>, an enclosing <label>, or aria-label (WCAG 2.x SC 1.3.1 and
// 4.1.2; HTML accessible-name computation).
func TestEveryInputHasALabel(t *testing.T) {
	ts := newTestServer(t)
	proj := ts.createProject(t, "Labels project")
	f := beamForm("L1")
	f.Set("evidence.colour_depths[0].face", "bottom")
	f.Set("evidence.colour_depths[0].depth_mm", "25")
	f.Set("member.bars[0].x_mm", "150")
	f.Set("member.bars[0].y_mm", "250")
	f.Set("member.bars[0].dia_mm", "16")
	f.Set("member.bars[0].fyk_mpa", "500")
	f.Set("fire.spalling[0].face", "bottom")
	f.Set("fire.spalling[0].start_min", "10")
	f.Set("fire.spalling[0].rate_mm_per_min", "1")
	f.Set("fire.spalling[0].max_depth_mm", "20")
	f.Set("op", "run")
	code, body, h := ts.post(t, proj+"/members", f)
	if code != http.StatusSeeOther {
		t.Fatalf("save and run: %d %s", code, errorSummary(t, body))
	}
	result := ts.waitJob(t, h.Get("Location"))
	member := result[:strings.Index(result, "/revisions/")]
	bad := beamForm("")
	_, invalid, _ := ts.post(t, proj+"/members", bad)
	pages := map[string]string{}
	for _, p := range []string{"/projects", proj, proj + "/members/new", member, member + "/edit", result, result + "/report"} {
		code, body, _ := ts.get(t, p)
		if code != http.StatusOK {
			t.Fatalf("GET %s = %d", p, code)
		}
		pages[p] = body
	}
	pages["invalid editor"] = invalid
	_, invalidEdit, _ := ts.post(t, proj+"/edit", url.Values{"name": {""}, "version": {"1"}})
	pages["invalid project edit"] = invalidEdit
	issued := storeProject(t, ts, "Issued project")
	storeMember(t, ts, issued.ID, "B9", assess.StateIssued)
	for _, p := range []string{proj + "/edit", proj + "/delete", member + "/delete", projectDeleteURL(issued.ID)} {
		code, body, _ := ts.get(t, p)
		if code != http.StatusOK {
			t.Fatalf("GET %s = %d", p, code)
		}
		pages[p] = body
	}
	if !strings.Contains(pages[projectDeleteURL(issued.ID)], `type="checkbox"`) {
		t.Fatal("archive confirmation page has no checkbox to check")
	}
	for name, body := range pages {
		doc := parseHTML(t, body)
		labelled := map[string]bool{}
		for _, l := range elementsByTag(doc, "label") {
			if id, ok := attr(l, "for"); ok {
				labelled[id] = true
			}
		}
		for _, tag := range []string{"input", "select", "textarea"} {
			for _, n := range elementsByTag(doc, tag) {
				if typ, _ := attr(n, "type"); typ == "hidden" {
					continue
				}
				if hid, _ := attr(n, "aria-hidden"); hid == "true" {
					continue
				}
				id, _ := attr(n, "id")
				aria, _ := attr(n, "aria-label")
				if labelled[id] || strings.TrimSpace(aria) != "" || insideLabel(n) {
					continue
				}
				nm, _ := attr(n, "name")
				t.Errorf("%s: <%s name=%q id=%q> has no label", name, tag, nm, id)
			}
		}
		// every id is unique, so labels and error links point at one element
		seen := map[string]bool{}
		var walk func(*html.Node)
		walk = func(n *html.Node) {
			if n.Type == html.ElementNode {
				if id, ok := attr(n, "id"); ok {
					if seen[id] {
						t.Errorf("%s: duplicate id %q", name, id)
					}
					seen[id] = true
				}
			}
			for c := n.FirstChild; c != nil; c = c.NextSibling {
				walk(c)
			}
		}
		walk(doc)
	}
}

func insideLabel(n *html.Node) bool {
	for p := n.Parent; p != nil; p = p.Parent {
		if p.Type == html.ElementNode && p.Data == "label" {
			return true
		}
	}
	return false
}
