package web

import (
	"context"
	"net/http"
	"net/url"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"golang.org/x/net/html"

	"residuum/assess"
)

// TestEditorHTMLRoundTrip opens every example input in the member editor and saves it back
// untouched, the way a browser would: it reads the rendered HTML form (not the form model),
// collects what a browser submits for it (HTML Living Standard §4.10.21.4 "constructing the
// entry list": enabled named controls, checked boxes only, the selected or else the first option
// of a select, textarea text with CRLF line breaks, a number input's value only if it is a valid
// floating-point number), posts it with the save button, and checks that the stored input means
// exactly what the original did (both decoded and normalised by the engine). Any engine field the
// editor has no control for, or renders in a way that does not parse back, shows up as a
// difference. Floats are compared exactly: the editor writes numbers in their shortest
// round-trip form, so nothing may change at all.
func TestEditorHTMLRoundTrip(t *testing.T) {
	t.Parallel()
	ts := newTestServer(t)
	ppath := ts.createProject(t, "Round trip")
	pid, err := strconv.ParseInt(strings.TrimPrefix(ppath, "/projects/"), 10, 64)
	if err != nil {
		t.Fatalf("project path %q: %v", ppath, err)
	}

	type example struct {
		name string
		raw  []byte
	}
	var examples []example
	for _, glob := range []string{"../testdata/*.json", "testdata/*.json"} {
		files, err := filepath.Glob(glob)
		if err != nil {
			t.Fatal(err)
		}
		for _, f := range files {
			b, err := os.ReadFile(f)
			if err != nil {
				t.Fatal(err)
			}
			examples = append(examples, example{f, b})
		}
	}
	if len(examples) < 10 {
		t.Fatalf("found only %d example inputs; the test data moved?", len(examples))
	}
	// the editor's own test form (helpers_test.go), as the editor first stored it
	code, _, h := ts.post(t, ppath+"/members", beamForm("Web test beam"))
	if code != http.StatusSeeOther {
		t.Fatalf("create the test form's member: status %d", code)
	}
	examples = append(examples, example{"beamForm", ts.storedInput(t, h.Get("Location"))})

	sawProgressive := false
	for _, ex := range examples {
		t.Run(filepath.Base(ex.name), func(t *testing.T) {
			want, err := assess.DecodeBytes(ex.raw)
			if err != nil {
				t.Fatalf("example does not decode: %v", err)
			}
			sawProgressive = sawProgressive || (want.Fire != nil && len(want.Fire.Spalling) > 0)
			rec := &assess.MemberRecord{ProjectID: pid, Label: want.Member.Label, Location: "invented grid A/1",
				Kind: want.Member.Kind, Input: ex.raw}
			if err := ts.Store.CreateMember(context.Background(), rec); err != nil {
				t.Fatalf("create member: %v", err)
			}
			mpath := memberURL(pid, rec.ID)
			code, body, _ := ts.get(t, mpath+"/edit")
			if code != http.StatusOK {
				t.Fatalf("GET edit: status %d", code)
			}
			form := mustOne(t, parseHTML(t, body), "member-form")
			action, _ := attr(form, "action")
			vals := browserSubmission(form)
			vals.Set("op", "save")
			code, body, _ = ts.post(t, action, vals)
			if code != http.StatusSeeOther {
				msg := ""
				if s := byTestID(parseHTML(t, body), "error-summary"); len(s) == 1 {
					msg = textOf(s[0])
				}
				t.Fatalf("saving the untouched editor: status %d, want 303; %s", code, msg)
			}
			got, err := assess.DecodeBytes(ts.storedInput(t, mpath))
			if err != nil {
				t.Fatalf("stored input does not decode: %v", err)
			}
			// faces are a set; nil and empty lists mean the same after normalisation
			opts := cmp.Options{cmpopts.EquateEmpty(), cmpopts.SortSlices(func(a, b string) bool { return a < b })}
			if diff := cmp.Diff(want, got, opts); diff != "" {
				t.Errorf("saving the untouched editor changed the input (-original +stored):\n%s", diff)
			}
		})
	}
	if !sawProgressive {
		t.Error("no example has fire.spalling; the test no longer covers progressive spalling")
	}
}

// storedInput reads the stored input JSON of the member at path /projects/{pid}/members/{mid}.
func (ts *testServer) storedInput(t *testing.T, path string) []byte {
	t.Helper()
	i := strings.LastIndex(path, "/")
	mid, err := strconv.ParseInt(path[i+1:], 10, 64)
	if err != nil {
		t.Fatalf("member path %q: %v", path, err)
	}
	m, err := ts.Store.GetMember(context.Background(), mid)
	if err != nil {
		t.Fatalf("get member %d: %v", mid, err)
	}
	return m.Input
}

// validFloat is the HTML "valid floating-point number" (HTML Living Standard §2.3.4.3); a
// number input whose value is not one is submitted empty.
var validFloat = regexp.MustCompile(`^-?(\d+(\.\d+)?|\.\d+)([eE][+-]?\d+)?$`)

// browserSubmission is what a browser submits for form when a submit button is pressed (the
// button itself is left to the caller): every enabled, named input, select and textarea inside it.
func browserSubmission(form *html.Node) url.Values {
	v := url.Values{}
	var walk func(*html.Node)
	walk = func(n *html.Node) {
		if n.Type == html.ElementNode {
			name, named := attr(n, "name")
			_, disabled := attr(n, "disabled")
			if named && name != "" && !disabled {
				switch n.Data {
				case "input":
					typ, _ := attr(n, "type")
					val, hasVal := attr(n, "value")
					switch strings.ToLower(typ) {
					case "submit", "button", "reset", "image", "file":
					case "checkbox", "radio":
						if _, on := attr(n, "checked"); on {
							if !hasVal {
								val = "on"
							}
							v.Add(name, val)
						}
					case "number":
						if !validFloat.MatchString(val) {
							val = ""
						}
						v.Add(name, val)
					default:
						v.Add(name, val)
					}
				case "select":
					var first, chosen *html.Node
					for _, o := range elementsByTag(n, "option") {
						if _, d := attr(o, "disabled"); d {
							continue
						}
						if first == nil {
							first = o
						}
						if _, sel := attr(o, "selected"); sel {
							chosen = o // the last selected option wins in a single select
						}
					}
					if chosen == nil {
						chosen = first
					}
					if chosen != nil {
						val, ok := attr(chosen, "value")
						if !ok {
							val = strings.Join(strings.Fields(textOf(chosen)), " ")
						}
						v.Add(name, val)
					}
				case "textarea":
					var b strings.Builder
					for c := n.FirstChild; c != nil; c = c.NextSibling {
						if c.Type == html.TextNode {
							b.WriteString(c.Data)
						}
					}
					s := strings.ReplaceAll(b.String(), "\r\n", "\n")
					v.Add(name, strings.ReplaceAll(s, "\n", "\r\n"))
				}
			}
			if n.Data == "select" || n.Data == "textarea" {
				return
			}
		}
		for c := n.FirstChild; c != nil; c = c.NextSibling {
			walk(c)
		}
	}
	walk(form)
	return v
}

// TestEditorProgressiveSpallingRows: the fire.spalling rows are added and removed by plain form
// posts (no script), a removed row takes its values with it while the rest are renumbered, a
// problem with a row lands beside its field with the accepted range, and a problem with an
// analysis setting opens the collapsed settings section so the message is seen.
func TestEditorProgressiveSpallingRows(t *testing.T) {
	t.Parallel()
	ts := newTestServer(t)
	proj := ts.createProject(t, "Progressive spalling rows")
	rowsOf := func(body string) []*html.Node { return byTestID(parseHTML(t, body), "progressive-row") }
	valueOf := func(body, name string) string {
		t.Helper()
		v := browserSubmission(mustOne(t, parseHTML(t, body), "member-form"))
		return v.Get(name)
	}

	f := beamForm("P1")
	f.Set("op", "add-progressive")
	code, body, _ := ts.post(t, proj+"/members", f)
	if code != http.StatusOK || len(rowsOf(body)) != 1 {
		t.Fatalf("add a row: status %d, %d rows; want 200 and 1 row", code, len(rowsOf(body)))
	}
	if got := valueOf(body, "fire.spalling[0].face"); got != "bottom" {
		t.Errorf("new row face = %q, want bottom", got)
	}

	f = beamForm("P1")
	for k, v := range map[string]string{
		"fire.spalling[0].face": "bottom", "fire.spalling[0].start_min": "10", "fire.spalling[0].rate_mm_per_min": "1.5", "fire.spalling[0].max_depth_mm": "40",
		"fire.spalling[1].face": "left", "fire.spalling[1].start_min": "5", "fire.spalling[1].rate_mm_per_min": "50", "fire.spalling[1].max_depth_mm": "10",
	} {
		f.Set(k, v)
	}
	f.Set("op", "remove-progressive:0")
	code, body, _ = ts.post(t, proj+"/members", f)
	if code != http.StatusOK || len(rowsOf(body)) != 1 {
		t.Fatalf("remove row 1 of 2: status %d, %d rows; want 200 and 1 row", code, len(rowsOf(body)))
	}
	if face, rate := valueOf(body, "fire.spalling[0].face"), valueOf(body, "fire.spalling[0].rate_mm_per_min"); face != "left" || rate != "50" {
		t.Errorf("after removing row 1 the remaining row is %s at %s mm/min, want the former row 2 (left, 50)", face, rate)
	}

	// rate range 0.01–20 mm/min: assess/validate.go (checkFire)
	f.Set("op", "save")
	f.Del("fire.spalling[0].face")
	f.Del("fire.spalling[0].start_min")
	f.Del("fire.spalling[0].rate_mm_per_min")
	f.Del("fire.spalling[0].max_depth_mm")
	f.Set("options.cell_mm", "100")
	code, body, _ = ts.post(t, proj+"/members", f)
	if code != http.StatusUnprocessableEntity {
		t.Fatalf("save with a bad rate: status %d, want 422", code)
	}
	doc := parseHTML(t, body)
	// the posted row 1 became row 0 once the blank row 0 was dropped
	msg := textOf(mustOne(t, doc, "err-fire-spalling-0-rate_mm_per_min"))
	if !strings.Contains(msg, "0.01") || !strings.Contains(msg, "20") {
		t.Errorf("rate message %q does not give the accepted range 0.01–20", msg)
	}
	for _, n := range elementsByTag(doc, "input") {
		if id, _ := attr(n, "id"); id == "fire-spalling-0-rate_mm_per_min" {
			if inv, _ := attr(n, "aria-invalid"); inv != "true" {
				t.Errorf("rate input aria-invalid = %q, want true", inv)
			}
		}
	}
	settings := mustOne(t, doc, "analysis-settings")
	if _, open := attr(settings, "open"); !open {
		t.Error("analysis settings stay collapsed although options.cell_mm has a problem")
	}
	if len(byTestID(settings, "err-options-cell_mm")) != 1 {
		t.Error("the cell-size problem is not shown beside its field")
	}

	// without a problem in it, the settings section starts collapsed
	_, body, _ = ts.get(t, proj+"/members/new")
	if _, open := attr(mustOne(t, parseHTML(t, body), "analysis-settings"), "open"); open {
		t.Error("analysis settings are open on a new member")
	}
}
