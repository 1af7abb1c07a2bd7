package thermal

import (
	"math"
	"strings"
	"testing"
)

// close reports |got − want| ≤ tol.
func near(got, want, tol float64) bool { return math.Abs(got-want) <= tol }

func TestISO834(t *testing.T) {
	t.Parallel()
	// ISO 834-1 §6.1.1 / EN 1991-1-2 §3.2.1 (3.4) evaluated by hand at each
	// time; 5–60 min agree with the IMO FTP Code Part 3 §8.3.1.2 rounded
	// values (thermal.md §1.2). Tolerance 0.05 °C: the hand values carry one decimal.
	cases := []struct{ t, want float64 }{
		{30, 841.8}, {60, 945.3}, {90, 1006.0}, {120, 1049.0}, {180, 1109.7}, {240, 1152.8},
	}
	e := ISO834()
	for _, c := range cases {
		if got := e.GasTemperature(c.t); !near(got, c.want, 0.05) {
			t.Errorf("ISO834(%g min) = %.2f °C, want %.1f (tol 0.05)", c.t, got, c.want)
		}
	}
	if e.Convection() != 25 { // EN 1991-1-2 §3.2.1(2)
		t.Errorf("ISO834 α_c = %g, want 25", e.Convection())
	}
	if g := e.GasTemperature(0); g != AmbientC {
		t.Errorf("ISO834(0) = %g, want 20", g)
	}
}

func TestHydrocarbon(t *testing.T) {
	t.Parallel()
	// EN 1991-1-2 §3.2.3 (3.6) evaluated by hand; plateau 1100 °C. Tol 0.05 °C.
	cases := []struct{ t, want float64 }{{5, 947.7}, {10, 1033.9}, {15, 1071.3}, {30, 1097.7}, {120, 1100.0}}
	e := Hydrocarbon()
	for _, c := range cases {
		if got := e.GasTemperature(c.t); !near(got, c.want, 0.05) {
			t.Errorf("Hydrocarbon(%g min) = %.2f °C, want %.1f (tol 0.05)", c.t, got, c.want)
		}
	}
	if e.Convection() != 50 { // EN 1991-1-2 §3.2.3(2)
		t.Errorf("Hydrocarbon α_c = %g, want 50", e.Convection())
	}
}

func TestASTME119(t *testing.T) {
	t.Parallel()
	// ASTM E119 Table X1.1 points (°F) as reproduced in thermal.md §1.3 [C:R3,R4];
	// tolerance 0.01 °C (exact conversion of the tabulated °F).
	cases := []struct{ t, f float64 }{
		{0, 68}, {5, 1000}, {10, 1300}, {30, 1550}, {60, 1700}, {120, 1850}, {240, 2000}, {480, 2300}, {600, 2300},
	}
	e := ASTME119()
	for _, c := range cases {
		want := (c.f - 32) * 5 / 9
		if got := e.GasTemperature(c.t); !near(got, want, 0.01) {
			t.Errorf("ASTME119(%g min) = %.2f °C, want %.2f (%g °F)", c.t, got, want, c.f)
		}
	}
	// Linear between points: 7.5 min is midway between 1000 and 1300 °F.
	if got, want := e.GasTemperature(7.5), (1150-32)*5/9.0; !near(got, want, 1e-9) {
		t.Errorf("ASTME119(7.5) = %g, want %g (linear interpolation)", got, want)
	}
	// Table X1.1 10-min entries between 2 h and 3 h (1862, 1875, 1888, 1900, 1912 °F at
	// 130–170 min, from memory) follow from the hourly points within the 1 °F rounding.
	for k, f := range []float64{1862, 1875, 1888, 1900, 1912} {
		tm := 130 + 10*float64(k)
		if got := e.GasTemperature(tm)*9/5 + 32; !near(got, f, 1) {
			t.Errorf("ASTME119(%g) = %.1f °F, want %g ± 1 (Table X1.1, from memory)", tm, got, f)
		}
	}
}

func TestParametric(t *testing.T) {
	t.Parallel()
	// Γ = 1 (O = 0.04, b = 1160): EN 1991-1-2 Annex A note — the heating curve
	// approximates ISO 834. Over the first hour the two agree within 3.5 %
	// (largest in the first 15 min; thermal.md §1.7 heating vectors 841.0/944.1
	// vs 841.8/945.3 at 30/60 min).
	p, err := NewParametric(ParametricInput{OpeningFactor: 0.04, B: 1160, FireLoad: 600, Growth: Medium})
	if err != nil {
		t.Fatal(err)
	}
	if !near(p.Gamma(), 1, 1e-12) {
		t.Errorf("Gamma = %g, want 1 (EN 1991-1-2 (A.2a) with O/b = 0.04/1160)", p.Gamma())
	}
	iso := ISO834()
	for tm := 5.0; tm <= 60; tm += 5 {
		a, b := p.GasTemperature(tm), iso.GasTemperature(tm)
		if math.Abs(a-b) > 0.035*b {
			t.Errorf("parametric Γ=1 at %g min = %.1f, ISO 834 = %.1f (differ by > 3.5 %%)", tm, a, b)
		}
	}
	// Defining properties: peak at t_max = 0.2e-3·q/O = 3 h (A.7), ventilation-controlled.
	if p.FuelControlled() || !near(p.TMaxMin(), 180, 1e-9) {
		t.Errorf("t_max = %g min, fuel = %v; want 180, ventilation-controlled (A.7)", p.TMaxMin(), p.FuelControlled())
	}
	if got := p.GasTemperature(p.TMaxMin()); !near(got, p.PeakC(), 1e-9) {
		t.Errorf("θ(t_max) = %g, want PeakC %g", got, p.PeakC())
	}
	for _, dt := range []float64{-30, -1, 1, 30} {
		if p.GasTemperature(p.TMaxMin()+dt) > p.PeakC() {
			t.Errorf("θ(t_max%+g) above the peak", dt)
		}
	}
	// Cooling slope (A.11): t*_max = 3 ≥ 2 → 250 °C/h of t*, Γ = 1 → 250/60 °C/min.
	s := (p.GasTemperature(200) - p.GasTemperature(230)) / 30
	if !near(s, 250.0/60, 1e-9) {
		t.Errorf("cooling slope = %g °C/min, want %g (EN 1991-1-2 (A.11c))", s, 250.0/60)
	}

	// Regression locks [X] from thermal.md §1.7 (computed from the Annex A
	// formulas by the research helper, not published values); tol 0.1 °C (one decimal).
	locks := []struct {
		in    ParametricInput
		fuel  bool
		peak  float64
		times []float64
		temps []float64
	}{
		{ParametricInput{0.04, 1160, 600, Medium}, false, 1107.7, []float64{10, 20, 30, 60, 90, 120, 180}, []float64{699.8, 788.9, 841.0, 944.1, 1005.9, 1048.2, 1107.7}},
		{ParametricInput{0.08, 1500, 600, Medium}, false, 1134.9, []float64{10, 20, 30, 60, 90, 120, 180}, []float64{811.0, 909.3, 971.7, 1074.3, 1134.9, 835.9, 237.9}},
		{ParametricInput{0.10, 1500, 300, Medium}, false, 1064.9, []float64{10, 20, 30, 60, 90, 120}, []float64{872.2, 977.9, 1038.3, 691.1, 223.9, 20}},
		{ParametricInput{0.20, 1500, 200, Fast}, true, 866.3, []float64{10, 20, 30}, []float64{811.0, 554.8, 20}},
	}
	for _, l := range locks {
		p, err := NewParametric(l.in)
		if err != nil {
			t.Fatal(err)
		}
		if p.FuelControlled() != l.fuel || !near(p.PeakC(), l.peak, 0.1) {
			t.Errorf("%+v: fuel %v peak %.2f, want %v %.1f [X lock]", l.in, p.FuelControlled(), p.PeakC(), l.fuel, l.peak)
		}
		for i, tm := range l.times {
			if got := p.GasTemperature(tm); !near(got, l.temps[i], 0.1) {
				t.Errorf("%+v: θ(%g) = %.2f, want %.1f [X lock]", l.in, tm, got, l.temps[i])
			}
		}
	}
	// Fuel-controlled with the k factor (A.9): O > 0.04, q < 75, b < 1160 raises Γ_lim.
	pk, err := NewParametric(ParametricInput{OpeningFactor: 0.1, B: 800, FireLoad: 60, Growth: Fast})
	if err != nil {
		t.Fatal(err)
	}
	oLim := 0.1e-3 * 60 / 0.25
	gLim := math.Pow(oLim/800/(0.04/1160), 2)
	k := 1 + ((0.1-0.04)/0.04)*((60-75)/75.0)*((1160-800)/1160.0)
	if want := annexAHeating(0.25 * gLim * k); !pk.FuelControlled() || !near(pk.PeakC(), want, 1e-9) {
		t.Errorf("k-factor case: peak %g fuel %v, want %g (EN 1991-1-2 (A.9))", pk.PeakC(), pk.FuelControlled(), want)
	}
}

func TestParametricLimits(t *testing.T) {
	t.Parallel()
	ok := ParametricInput{OpeningFactor: 0.04, B: 1160, FireLoad: 600, Growth: Medium}
	cases := []struct {
		name  string
		mod   func(*ParametricInput)
		field string
	}{
		{"O low", func(p *ParametricInput) { p.OpeningFactor = 0.019 }, "OpeningFactor"},
		{"O high", func(p *ParametricInput) { p.OpeningFactor = 0.21 }, "OpeningFactor"},
		{"b low", func(p *ParametricInput) { p.B = 99 }, "B ="},
		{"b high", func(p *ParametricInput) { p.B = 2201 }, "B ="},
		{"q low", func(p *ParametricInput) { p.FireLoad = 49 }, "FireLoad"},
		{"q high", func(p *ParametricInput) { p.FireLoad = 1001 }, "FireLoad"},
		{"q NaN", func(p *ParametricInput) { p.FireLoad = math.NaN() }, "FireLoad"},
		{"growth", func(p *ParametricInput) { p.Growth = "ultra" }, "Growth"},
	}
	for _, c := range cases {
		in := ok
		c.mod(&in)
		_, err := NewParametric(in)
		if err == nil || !strings.Contains(err.Error(), c.field) || !strings.Contains(err.Error(), "accepted") {
			t.Errorf("%s: err = %v, want one naming %q and the accepted range", c.name, err, c.field)
		}
	}
}

func TestCooled(t *testing.T) {
	t.Parallel()
	// EN 1991-1-2 (A.11) with Γ = 1, t*_max = t_h/60: 90 min → 250·(3 − 1.5) = 375 °C/h;
	// 20 min → 625 °C/h; 180 min → 250 °C/h.
	for _, c := range []struct{ th, rate float64 }{{90, 375.0 / 60}, {20, 625.0 / 60}, {180, 250.0 / 60}} {
		e, err := NewCooled(ISO834(), c.th, 0)
		if err != nil {
			t.Fatal(err)
		}
		th := ISO834().GasTemperature(c.th)
		if got := e.GasTemperature(c.th); got != th {
			t.Errorf("cut at %g: θ = %g, want %g", c.th, got, th)
		}
		if got := (e.GasTemperature(c.th+5) - e.GasTemperature(c.th+10)) / 5; !near(got, c.rate, 1e-9) {
			t.Errorf("cut at %g: slope %g, want %g °C/min", c.th, got, c.rate)
		}
		if want := c.th + (th-20)/c.rate; !near(e.AmbientAt(), want, 1e-9) || e.GasTemperature(want+1) != 20 {
			t.Errorf("cut at %g: ambient at %g, want %g", c.th, e.AmbientAt(), want)
		}
		if e.HeatingEnd() != c.th || e.Convection() != 25 {
			t.Errorf("cut at %g: heating end %g, α_c %g", c.th, e.HeatingEnd(), e.Convection())
		}
	}
	e, err := NewCooled(Hydrocarbon(), 60, 10)
	if err != nil {
		t.Fatal(err)
	}
	if got := e.GasTemperature(70); !near(got, 1100-100, 0.05) || e.Convection() != 50 {
		t.Errorf("hydrocarbon cut at 60 min, 10 °C/min: θ(70) = %g α = %g, want ≈1000, 50", got, e.Convection())
	}
	for _, bad := range []struct{ th, rate float64 }{{0, 0}, {-5, 0}, {5000, 0}, {60, -1}, {60, math.NaN()}} {
		if _, err := NewCooled(ISO834(), bad.th, bad.rate); err == nil || !strings.Contains(err.Error(), "accepted") {
			t.Errorf("NewCooled(%g, %g) err = %v, want a range error", bad.th, bad.rate, err)
		}
	}
	if _, err := NewCooled(nil, 60, 0); err == nil {
		t.Error("NewCooled(nil) gave no error")
	}
}

func TestTabulated(t *testing.T) {
	t.Parallel()
	e, err := NewTabulated([][2]float64{{0, 20}, {10, 800}, {30, 900}, {90, 20}})
	if err != nil {
		t.Fatal(err)
	}
	if got := e.GasTemperature(20); !near(got, 850, 1e-9) {
		t.Errorf("θ(20) = %g, want 850 (linear)", got)
	}
	if e.HeatingEnd() != 30 || e.Convection() != 25 {
		t.Errorf("heating end %g α %g, want 30, 25", e.HeatingEnd(), e.Convection())
	}
	if want := 30 + 60*(900-21)/880.0; !near(e.AmbientAt(), want, 1e-9) {
		t.Errorf("ambient at %g, want %g", e.AmbientAt(), want)
	}
	bad := []struct {
		name string
		pts  [][2]float64
		want string
	}{
		{"back in time", [][2]float64{{0, 20}, {10, 500}, {5, 600}}, "points[2] time"},
		{"repeated time", [][2]float64{{0, 20}, {10, 500}, {10, 600}}, "points[2] time"},
		{"too hot", [][2]float64{{0, 20}, {10, 1500}}, "points[1] temperature"},
		{"negative", [][2]float64{{0, -5}, {10, 100}}, "points[0] temperature"},
		{"one point", [][2]float64{{0, 20}}, "points"},
		{"negative time", [][2]float64{{-1, 20}, {10, 100}}, "points[0] time"},
	}
	for _, b := range bad {
		_, err := NewTabulated(b.pts)
		if err == nil || !strings.Contains(err.Error(), b.want) || !strings.Contains(err.Error(), "accepted") {
			t.Errorf("%s: err = %v, want one naming %q", b.name, err, b.want)
		}
	}
	if _, err := NewTabulatedConvection([][2]float64{{0, 20}, {10, 100}}, 0); err == nil {
		t.Error("α_c = 0 accepted")
	}
}

func TestEquivalentTime(t *testing.T) {
	t.Parallel()
	// EN 1991-1-2 Annex F (F.1)–(F.3), hand calculation: q_f,d = 600, b = 1500
	// (k_b = 0.055), H = 3 m, A_f = 100, A_v = 10 (α_v = 0.1), no roof openings:
	// w_f = 2^0.3·(0.62 + 90·0.3⁴/1) = 1.231144·1.349 = 1.660813; t_e,d = 600·0.055·1.660813 = 54.807 min.
	got, err := EquivalentTime(EquivalentTimeInput{FireLoad: 600, B: 1500, HeightM: 3, FloorAreaM2: 100, VerticalOpeningM2: 10})
	if err != nil {
		t.Fatal(err)
	}
	want := 600 * 0.055 * math.Pow(2, 0.3) * (0.62 + 90*math.Pow(0.3, 4))
	if !near(got, want, 1e-9) || !near(got, 54.81, 0.01) {
		t.Errorf("EquivalentTime = %g min, want %g (≈54.81, hand calculation)", got, want)
	}
	if _, err := EquivalentTime(EquivalentTimeInput{FireLoad: 600, HeightM: 3, FloorAreaM2: 100, VerticalOpeningM2: 30}); err == nil || !strings.Contains(err.Error(), "α_v") {
		t.Errorf("α_v = 0.3: err = %v, want a range error", err)
	}
}
