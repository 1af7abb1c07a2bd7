package web

import (
	"context"
	"errors"
	"fmt"
	"net/http"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/chromedp/chromedp"
)

const chromiumPath = "/usr/bin/chromium"

// browserContext starts headless Chromium with a fresh profile. Without the browser the test is
// skipped, except under CI=true where it fails.
func browserContext(t *testing.T) context.Context {
	t.Helper()
	if _, err := os.Stat(chromiumPath); err != nil {
		if os.Getenv("CI") == "true" {
			t.Fatalf("browser tests need %s under CI: %v", chromiumPath, err)
		}
		t.Skipf("no browser at %s: %v", chromiumPath, err)
	}
	opts := []chromedp.ExecAllocatorOption{
		chromedp.ExecPath(chromiumPath),
		chromedp.Headless,
		chromedp.NoSandbox,
		chromedp.DisableGPU,
		chromedp.NoFirstRun,
		chromedp.NoDefaultBrowserCheck,
		chromedp.Flag("disable-background-networking", true),
		chromedp.Flag("disable-component-update", true),
		chromedp.Flag("disable-sync", true),
		chromedp.Flag("disable-quic", true),
		chromedp.Flag("disable-dev-shm-usage", true),
		chromedp.UserDataDir(filepath.Join(t.TempDir(), "profile")),
		chromedp.WindowSize(1280, 900),
	}
	actx, cancelA := chromedp.NewExecAllocator(context.Background(), opts...)
	ctx, cancelB := chromedp.NewContext(actx)
	ctx, cancelC := context.WithTimeout(ctx, 90*time.Second)
	t.Cleanup(func() { cancelC(); cancelB(); cancelA() })
	return ctx
}

// consoleErrors collects console errors and uncaught exceptions of the page.
type consoleErrors struct {
	mu   sync.Mutex // guards msgs
	msgs []string
}

func watchConsole(ctx context.Context) *consoleErrors {
	ce := &consoleErrors{}
	msgs := chromedp.Console(ctx)
	go func() {
		for m, err := range msgs {
			if err != nil {
				return
			}
			// The editor answers a refused form with 422 on purpose; the browser logs that status
			// as a network error, which is expected here and not a fault of the page.
			if m.Source == "network" && strings.Contains(m.Text, "422") {
				continue
			}
			if m.Type == chromedp.ConsoleError || m.Type == chromedp.ConsoleException {
				ce.mu.Lock()
				ce.msgs = append(ce.msgs, fmt.Sprintf("%s: %s (%s:%d)", m.Type, m.Text, m.URL, m.Line))
				ce.mu.Unlock()
			}
		}
	}()
	return ce
}

func (ce *consoleErrors) list() []string {
	ce.mu.Lock()
	defer ce.mu.Unlock()
	return append([]string(nil), ce.msgs...)
}

// shotDir is where screenshots go: $RESIDUUM_SCREENSHOTS if set (to keep them), else the test's
// temporary folder.
func shotDir(t *testing.T) string {
	if d := os.Getenv("RESIDUUM_SCREENSHOTS"); d != "" {
		if err := os.MkdirAll(d, 0o755); err == nil {
			return d
		}
	}
	return t.TempDir()
}

func screenshot(t *testing.T, ctx context.Context, dir, name string) {
	t.Helper()
	png, err := chromedp.Run(ctx, chromedp.FullScreenshot(100))
	if err != nil {
		t.Errorf("screenshot %s: %v", name, err)
		return
	}
	p := filepath.Join(dir, name+".png")
	if err := os.WriteFile(p, png, 0o644); err != nil {
		t.Errorf("save screenshot: %v", err)
		return
	}
	t.Logf("screenshot %s", p)
}

// waitFor evaluates a JavaScript condition until it is true, across page loads (an evaluation
// that fails because the page is navigating is tried again).
func waitFor(ctx context.Context, cond string, timeout time.Duration) error {
	deadline := time.Now().Add(timeout)
	var last error
	for time.Now().Before(deadline) {
		ok, err := chromedp.Run(ctx, chromedp.Evaluate[bool](cond))
		if err == nil && ok {
			return nil
		}
		last = err
		time.Sleep(150 * time.Millisecond)
	}
	if last == nil {
		last = errors.New("condition stayed false")
	}
	return fmt.Errorf("waited %s for %s: %w", timeout, cond, last)
}

// do runs the steps and fails the test with the step name on error.
func do(t *testing.T, ctx context.Context, step string, actions ...chromedp.Action[chromedp.Void]) {
	t.Helper()
	if err := chromedp.Do(ctx, actions...); err != nil {
		t.Fatalf("%s: %v", step, err)
	}
}

func text(t *testing.T, ctx context.Context, sel string) string {
	t.Helper()
	s, err := chromedp.Run(ctx, chromedp.Text(chromedp.CSS(sel)))
	if err != nil {
		t.Fatalf("text of %s: %v", sel, err)
	}
	return s
}

// setField replaces a visible field's value by typing, so the page sees input events.
func setField(sel, value string) []chromedp.Action[chromedp.Void] {
	return []chromedp.Action[chromedp.Void]{
		chromedp.Clear(chromedp.CSS(sel)),
		chromedp.SendKeys(chromedp.CSS(sel), value),
	}
}

func steps(groups ...[]chromedp.Action[chromedp.Void]) []chromedp.Action[chromedp.Void] {
	var out []chromedp.Action[chromedp.Void]
	for _, g := range groups {
		out = append(out, g...)
	}
	return out
}

func one(a chromedp.Action[chromedp.Void]) []chromedp.Action[chromedp.Void] {
	return []chromedp.Action[chromedp.Void]{a}
}

// TestBrowser drives the pages as a first-time user would: create a project, enter a beam with
// two layers and site evidence, watch the drawing follow the edits, run the assessment, read the
// result, issue the revision, download the PDF, and see a bad value refused beside its field.
func TestBrowser(t *testing.T) {
	if testing.Short() {
		t.Skip("browser test skipped in -short mode")
	}
	ts := newTestServer(t)
	ctx := browserContext(t)
	console := watchConsole(ctx)
	dir := shotDir(t)
	start := time.Now()

	do(t, ctx, "open the address", chromedp.Navigate(ts.URL), chromedp.WaitVisible(chromedp.CSS(`[data-testid="project-form"]`)))
	do(t, ctx, "create a project", steps(
		setField("#name", "Invented multi-storey car park"),
		setField("#site_address", "12 Example Road"),
		one(chromedp.Click(chromedp.CSS(`[data-testid="create-project"]`))),
		one(chromedp.WaitVisible(chromedp.CSS(`[data-testid="project-name"]`))),
	)...)
	screenshot(t, ctx, dir, "1-project")

	do(t, ctx, "open the member editor", chromedp.Click(chromedp.CSS(`[data-testid="add-member"]`)),
		chromedp.WaitVisible(chromedp.CSS(`[data-testid="section-drawing"]`)))
	if n, err := chromedp.Run(ctx, chromedp.Evaluate[int](`document.querySelectorAll('[data-testid="layer-row"]').length`)); err != nil || n != 2 {
		t.Fatalf("new beam has %d layer rows (err %v), want 2", n, err)
	}
	// the drawing follows the width as it is typed (htmx posts the form and swaps the SVG)
	do(t, ctx, "edit the width", setField("#member-width_mm", "350")...)
	title, err := chromedp.Run(ctx, chromedp.Poll[string](
		`(() => { const t = document.querySelector('[data-testid="section-drawing"] title'); return t && t.textContent.includes('350 ×') ? t.textContent : null })()`,
		chromedp.WithPollingTimeout(10*time.Second)))
	if err != nil {
		t.Fatalf("section drawing did not redraw for width 350: %v", err)
	}
	t.Logf("drawing: %s", title)

	// site evidence: a colour-change depth and a spalled zone; no known fire, so it is fitted
	do(t, ctx, "add evidence rows", chromedp.Click(chromedp.CSS(`[data-testid="add-colour"]`)),
		chromedp.WaitVisible(chromedp.CSS(`[data-testid="colour-row"]`)),
		chromedp.Click(chromedp.CSS(`[data-testid="add-spall"]`)),
		chromedp.WaitVisible(chromedp.CSS(`[data-testid="spall-row"]`)))
	do(t, ctx, "fill the member", steps(
		setField("#member-label", "B12 car-park beam"),
		setField("#location", "grid C/3–4, level 2"),
		setField("#evidence-colour_depths-0-depth_mm", "28"),
		setField("#evidence-spalling-0-depth_mm", "15"),
		setField("#evidence-spalling-0-from_mm", "100"),
		setField("#evidence-spalling-0-to_mm", "250"),
		setField("#demand-sagging_knm", "150"),
		setField("#demand-hogging_knm", "40"),
		one(chromedp.SetValue(chromedp.CSS("#fire-curve"), "")),
		one(chromedp.SetValue(chromedp.CSS("#options-cell_mm"), "20")),
	)...)
	if _, err := chromedp.Run(ctx, chromedp.Poll[bool](
		`!!document.querySelector('[data-testid="section-drawing"] [data-testid="spalled-zones"]')`,
		chromedp.WithPollingTimeout(10*time.Second))); err != nil {
		t.Errorf("the drawing shows no spalled zone after the spall was entered: %v", err)
	}
	screenshot(t, ctx, dir, "2-editor")

	do(t, ctx, "save and run", chromedp.Click(chromedp.CSS(`[data-testid="save-run"]`)))
	// the progress page follows the run and moves to the result by itself
	if err := waitFor(ctx, `location.pathname.includes('/revisions/') && !!document.querySelector('[data-testid="capacity-table"]')`, 60*time.Second); err != nil {
		loc, _ := chromedp.Run(ctx, chromedp.Location())
		body, _ := chromedp.Run(ctx, chromedp.Evaluate[string](`document.body.innerText`))
		t.Fatalf("the result page did not appear (at %s): %v\n%s", loc, err, body)
	}
	do(t, ctx, "see the result", chromedp.WaitVisible(chromedp.CSS(`[data-testid="heat-map"]`)),
		chromedp.WaitVisible(chromedp.CSS(`[data-testid="cautions"]`)))
	if got := text(t, ctx, `[data-testid="capacity-sagging"] [data-testid="ratio"]`); got == "" || got == "–" {
		t.Errorf("sagging ratio = %q, want a number", got)
	}
	cautions := text(t, ctx, `[data-testid="cautions"]`)
	screenshot(t, ctx, dir, "3-result")

	do(t, ctx, "issue the revision", chromedp.Click(chromedp.CSS(`[data-testid="issue"]`)),
		chromedp.WaitVisible(chromedp.CSS(`[data-testid="issued-note"]`)))
	if got := text(t, ctx, `[data-testid="state"]`); !strings.HasPrefix(got, "issued") {
		t.Errorf("state = %q after issuing, want issued…", got)
	}

	// the PDF link of the page: fetch it as the browser would download it
	href, err := chromedp.Run(ctx, chromedp.Evaluate[string](`document.querySelector('[data-testid="pdf-link"]').href`))
	if err != nil {
		t.Fatalf("pdf link: %v", err)
	}
	resp, err := http.Get(href)
	if err != nil {
		t.Fatalf("download pdf: %v", err)
	}
	pdfBytes, err := readAll(resp)
	if err != nil {
		t.Fatalf("download pdf: %v", err)
	}
	if !strings.HasPrefix(string(pdfBytes), "%PDF-") {
		t.Fatalf("download is not a PDF: starts %q", pdfBytes[:min(8, len(pdfBytes))])
	}
	pt := pdfText(string(pdfBytes))
	if !strings.Contains(pt, "B12 car-park beam") {
		t.Errorf("PDF text lacks the member label")
	}
	if !strings.Contains(pt, "Cautions and limitations") || !strings.Contains(strings.Join(strings.Fields(pt), " "), firstWords(cautions, "Cautions and limitations", 6)) {
		t.Errorf("PDF text lacks the cautions (%q)", firstWords(cautions, "Cautions and limitations", 6))
	}
	if err := os.WriteFile(filepath.Join(dir, "report.pdf"), pdfBytes, 0o644); err == nil {
		t.Logf("pdf %s", filepath.Join(dir, "report.pdf"))
	}

	do(t, ctx, "open the printable report", chromedp.Click(chromedp.CSS(`[data-testid="report-link"]`)),
		chromedp.WaitVisible(chromedp.CSS(`[data-testid="signoff"]`)))
	screenshot(t, ctx, dir, "4-report")
	// the print stylesheet lays the report out on A4
	printed, err := chromedp.Run(ctx, chromedp.PrintToPDF(chromedp.PDFPaper(chromedp.PaperA4), chromedp.PDFPreferCSSPageSize()))
	if err != nil || !strings.HasPrefix(string(printed), "%PDF-") {
		t.Errorf("print the report to PDF: %v", err)
	} else if err := os.WriteFile(filepath.Join(dir, "report-printed.pdf"), printed, 0o644); err == nil {
		t.Logf("printed report %s", filepath.Join(dir, "report-printed.pdf"))
	}

	// a bad value is refused with the message beside its field
	memberHref, err := chromedp.Run(ctx, chromedp.Evaluate[string](`document.querySelectorAll('[data-testid="crumbs"] a')[2].href`))
	if err != nil {
		t.Fatalf("member link: %v", err)
	}
	do(t, ctx, "edit the member", chromedp.Navigate(memberHref+"/edit"), chromedp.WaitVisible(chromedp.CSS("#member-width_mm")))
	do(t, ctx, "enter a bad cover", steps(setField("#member-layers-0-cover_mm", "2"),
		one(chromedp.Click(chromedp.CSS(`[data-testid="save-member"]`))),
		one(chromedp.WaitVisible(chromedp.CSS(`[data-testid="err-member-layers-0-cover_mm"]`))))...)
	msg := text(t, ctx, `[data-testid="err-member-layers-0-cover_mm"]`)
	if !strings.Contains(msg, "5") {
		t.Errorf("cover message %q does not give the accepted range", msg)
	}
	beside, err := chromedp.Run(ctx, chromedp.Evaluate[bool](
		`document.getElementById('member-layers-0-cover_mm').parentElement.contains(document.querySelector('[data-testid="err-member-layers-0-cover_mm"]'))`))
	if err != nil || !beside {
		t.Errorf("the cover message is not beside its field (err %v)", err)
	}
	screenshot(t, ctx, dir, "5-invalid")

	// by keyboard: correct the value and press Enter in the field; the form's default action is
	// "save" (not the first row's Remove button)
	do(t, ctx, "fix the cover and press Enter", steps(setField("#member-layers-0-cover_mm", "30"),
		one(chromedp.SendKeys(chromedp.CSS("#member-layers-0-cover_mm"), "\r")))...)
	if err := waitFor(ctx, `!location.pathname.endsWith('/edit') && !!document.querySelector('[data-testid="member-label"]') && document.querySelectorAll('[data-testid="revision-row"]').length === 1`, 10*time.Second); err != nil {
		body, _ := chromedp.Run(ctx, chromedp.Evaluate[string](`document.body.innerText`))
		t.Errorf("Enter in the editor did not save the member: %v\n%.800s", err, body)
	}

	time.Sleep(200 * time.Millisecond) // let late console events arrive
	if errs := console.list(); len(errs) > 0 {
		t.Errorf("console errors:\n%s", strings.Join(errs, "\n"))
	}
	t.Logf("browser test took %s", time.Since(start).Round(time.Millisecond))
}

func readAll(resp *http.Response) ([]byte, error) {
	defer resp.Body.Close()
	if resp.StatusCode != http.StatusOK {
		return nil, errors.New(resp.Status)
	}
	var b strings.Builder
	buf := make([]byte, 32<<10)
	for {
		n, err := resp.Body.Read(buf)
		b.Write(buf[:n])
		if err != nil {
			if err.Error() == "EOF" {
				return []byte(b.String()), nil
			}
			return nil, err
		}
	}
}

// firstWords returns the first n words of s after the heading.
func firstWords(s, after string, n int) string {
	s = strings.TrimSpace(strings.TrimPrefix(strings.TrimSpace(s), after))
	f := strings.Fields(s)
	return strings.Join(f[:min(n, len(f))], " ")
}
