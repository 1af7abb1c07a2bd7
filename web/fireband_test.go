package web

import (
	"bytes"
	"context"
	"encoding/json"
	"math"
	"net/http"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"golang.org/x/net/html"

	"residuum/assess"
	"residuum/thermal"
)

// iso834 is the EN 1991-1-2 §3.2.1 (3.4) standard temperature–time curve, °C at t min.
func iso834(t float64) float64 { return 20 + 345*math.Log10(8*t+1) }

// fireResult builds a result whose fire curve is ISO 834 for heatMin minutes then cooling,
// sampled every minute; src is the fire's source ("fitted" or "input").
func fireResult(t *testing.T, src string, heatMin float64, fit *assess.FitResult) *assess.Result {
	t.Helper()
	e, err := thermal.NewCooled(thermal.ISO834(), heatMin, 0)
	if err != nil {
		t.Fatalf("cooled exposure: %v", err)
	}
	res := &assess.Result{Fire: &assess.FireSummary{Name: e.Name(), Source: src, HeatingEndMin: heatMin, PeakGasC: e.GasTemperature(heatMin)}, Fit: fit}
	for m := 0.0; m <= 3*heatMin; m++ {
		res.FireCurve = append(res.FireCurve, [2]float64{m, e.GasTemperature(m)})
	}
	return res
}

func TestFireCurveBand(t *testing.T) {
	fit := &assess.FitResult{Family: assess.FitStandard, Parameter: "duration_min", Range: [2]float64{50, 70}}
	cases := []struct {
		name     string
		res      *assess.Result
		wantBand bool
	}{
		{"fitted from evidence", fireResult(t, "fitted", 60, fit), true},
		{"given fire checked against evidence", fireResult(t, "input", 60, fit), false},
		{"given fire, no evidence", fireResult(t, "input", 60, nil), false},
		{"fitted, zero-width range", fireResult(t, "fitted", 60, &assess.FitResult{Family: assess.FitStandard, Range: [2]float64{60, 60}}), false},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			p, err := fireCurvePlot(c.res, nil)
			if err != nil {
				t.Fatalf("fireCurvePlot: %v", err)
			}
			svg, err := plotSVG(p, "plot-fire-svg", "fire curve")
			if err != nil {
				t.Fatalf("plotSVG: %v", err)
			}
			if got := strings.Contains(svg, fireBandLabel); got != c.wantBand {
				t.Errorf("SVG has band label %q = %v, want %v", fireBandLabel, got, c.wantBand)
			}
		})
	}
}

// TestFittedFireBandCurves checks the bounding curves against the standard curve itself:
// both follow ISO 834 (EN 1991-1-2 §3.2.1 eq. 3.4) while heating, so the low bound at 30 min and
// the high bound at its own heating end (70 min) are the standard-curve values; after 50 min the low
// bound cools while the high one still heats, so the band has width. Tolerance 0.5 °C: the thermal
// package evaluates the same closed-form curve, the slack covers rounding only.
func TestFittedFireBandCurves(t *testing.T) {
	fit := &assess.FitResult{Family: assess.FitStandard, Parameter: "duration_min", Range: [2]float64{50, 70}}
	b, err := fittedFireBand(fireResult(t, "fitted", 60, fit), nil)
	if err != nil || b == nil {
		t.Fatalf("fittedFireBand = %v, %v; want a band", b, err)
	}
	at := func(xy [][2]float64, tm float64) float64 {
		for _, p := range xy {
			if p[0] == tm {
				return p[1]
			}
		}
		t.Fatalf("no sample at %v min", tm)
		return 0
	}
	checks := []struct {
		what string
		got  float64
		want float64
	}{
		{"low bound at 30 min", at(b.Low, 30), iso834(30)},
		{"high bound at 30 min", at(b.High, 30), iso834(30)},
		{"high bound at 70 min", at(b.High, 70), iso834(70)},
		{"low bound at 50 min", at(b.Low, 50), iso834(50)},
	}
	for _, c := range checks {
		if math.Abs(c.got-c.want) > 0.5 {
			t.Errorf("%s = %.2f °C, want %.2f ± 0.5 (ISO 834)", c.what, c.got, c.want)
		}
	}
	if lo, hi := at(b.Low, 70), at(b.High, 70); !(hi > lo+50) {
		t.Errorf("at 70 min low %.1f, high %.1f °C: want the band at least 50 °C wide (low bound cooling since 50 min)", lo, hi)
	}
	if last := b.High[len(b.High)-1]; last[0] < 180 {
		t.Errorf("band ends at %v min; want it to reach the result's curve end (180 min)", last[0])
	}
	if _, err := fittedFireBand(fireResult(t, "fitted", 60, &assess.FitResult{Family: assess.FitParametric, Range: [2]float64{300, 500}}), nil); err == nil || !strings.Contains(err.Error(), "options.fit") {
		t.Errorf("parametric fit without options: err = %v, want one naming options.fit", err)
	}
}

// storeRun runs the engine on a testdata input and stores it as a draft revision of a new member
// of project pid; it returns the result page's path.
func storeRun(t *testing.T, ts *testServer, pid int64, file string) string {
	t.Helper()
	raw, err := os.ReadFile(filepath.Join("..", "testdata", file))
	if err != nil {
		t.Fatal(err)
	}
	in, err := assess.Decode(bytes.NewReader(raw))
	if err != nil {
		t.Fatalf("%s: %v", file, err)
	}
	res, err := assess.Run(context.Background(), in, nil)
	if err != nil {
		t.Fatalf("run %s: %v", file, err)
	}
	rj, err := json.Marshal(res)
	if err != nil {
		t.Fatal(err)
	}
	m := &assess.MemberRecord{ProjectID: pid, Label: file, Kind: in.Member.Kind, Input: raw}
	if err := ts.Store.CreateMember(context.Background(), m); err != nil {
		t.Fatal(err)
	}
	a := &assess.AssessmentRecord{MemberID: m.ID, Input: raw, Result: rj, MethodVersion: assess.MethodVersion}
	if err := ts.Store.CreateAssessment(context.Background(), a); err != nil {
		t.Fatal(err)
	}
	return revisionURL(pid, m.ID, a.Revision)
}

// TestResultPageFireBand renders the result page of an assessment fitted to colour-change
// depths (band expected) and of one with a given fire checked against evidence (no band: the
// fire is not in doubt there).
func TestResultPageFireBand(t *testing.T) {
	ts := newTestServer(t)
	p := storeProject(t, ts, "Fire band")
	for _, c := range []struct {
		file string
		want bool
	}{
		{"beam-colour-fit.json", true},
		{"beam-fire-and-evidence.json", false},
		{"slab-iso60.json", false},
	} {
		t.Run(c.file, func(t *testing.T) {
			code, body, _ := ts.get(t, storeRun(t, ts, p.ID, c.file))
			if code != http.StatusOK {
				t.Fatalf("GET result = %d", code)
			}
			fig := mustOne(t, parseHTML(t, body), "plot-fire")
			var svg strings.Builder
			for _, n := range elementsByTag(fig, "svg") {
				if err := html.Render(&svg, n); err != nil {
					t.Fatal(err)
				}
			}
			if svg.Len() == 0 {
				t.Fatal("fire figure has no svg")
			}
			if got := strings.Contains(svg.String(), fireBandLabel); got != c.want {
				t.Errorf("fire plot has the band label = %v, want %v", got, c.want)
			}
		})
	}
}

// TestFittedFireBandParametric: for O = 0.04 m^0.5 and b = 1160 J/m²s^0.5K, Γ = 1 (EN 1991-1-2
// Annex A eq. A.2a), and with fire loads 300–500 MJ/m² t_max = 0.2·10⁻³·q/O ≥ 1.5 h (A.7), so at
// 30 min both bounds are on the heating curve (A.1): θ = 20 + 1325(1 − 0.324e^(−0.2·0.5) −
// 0.204e^(−1.7·0.5) − 0.472e^(−19·0.5)) = 841.0 °C (hand calculation). Tolerance 1 °C covers the
// rounding of the hand value.
func TestFittedFireBandParametric(t *testing.T) {
	res := fireResult(t, "fitted", 90, &assess.FitResult{Family: assess.FitParametric, Parameter: "fire_load_mj_m2", Range: [2]float64{300, 500}})
	b, err := fittedFireBand(res, &assess.FitOptions{Family: assess.FitParametric, OpeningFactorM05: 0.04, BJM2S05K: 1160})
	if err != nil || b == nil {
		t.Fatalf("fittedFireBand = %v, %v; want a band", b, err)
	}
	checked := 0
	for i, p := range b.Low {
		if p[0] == 30 || p[0] == 150 {
			checked++
		}
		if p[0] == 30 {
			for _, got := range []float64{p[1], b.High[i][1]} {
				if math.Abs(got-841.0) > 1 {
					t.Errorf("bound at 30 min = %.2f °C, want 841.0 ± 1 (EN 1991-1-2 A.1)", got)
				}
			}
		}
		if p[0] == 150 && !(b.High[i][1] > p[1]+50) {
			t.Errorf("at 150 min low %.1f, high %.1f °C: want the larger fire load hotter by > 50 °C (it heats to ≥ 2.5 h, the smaller cools from 1.5 h)", p[1], b.High[i][1])
		}
	}
	if checked != 2 {
		t.Fatalf("band has %d of the samples at 30 and 150 min, want both", checked)
	}
}
