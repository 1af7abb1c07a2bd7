package thermal

import (
	"context"
	"errors"
	"math"
	"strings"
	"testing"
)

// wickstrom returns the temperature, °C, at depth xM (m) after tMin of ISO 834
// by Wickström's method (Wickström 1986; PD 7974-3:2003; thermal.md §4.1):
// ΔT_x = η_x·η_w·ΔT_f, η_w = 1 − 0.0616·t^−0.88, η_x = 0.18·ln(t/x²) − 0.81 (t in h).
func wickstrom(xM, tMin float64) float64 {
	th := tMin / 60
	dtf := 345 * math.Log10(480*th+1)
	etaW := 1 - 0.0616*math.Pow(th, -0.88)
	etaX := math.Max(0, math.Min(1, 0.18*math.Log(th/(xM*xM))-0.81))
	return 20 + etaX*etaW*dtf
}

func wickstrom2D(xM, yM, tMin float64) float64 {
	th := tMin / 60
	dtf := 345 * math.Log10(480*th+1)
	etaW := 1 - 0.0616*math.Pow(th, -0.88)
	ex := math.Max(0, math.Min(1, 0.18*math.Log(th/(xM*xM))-0.81))
	ey := math.Max(0, math.Min(1, 0.18*math.Log(th/(yM*yM))-0.81))
	return 20 + (etaW*(ex+ey-2*ex*ey)+ex*ey)*etaW*dtf
}

// isoSlab solves a 200 mm slab under uncut ISO 834 to 240 min with the
// EN 1992-1-2 Annex A assumptions (lower λ, u = 1.5 %), probes every 10 mm.
func isoSlab(t *testing.T) *Field {
	t.Helper()
	var probes []Point
	for y := 0.0; y <= 100; y += 5 {
		probes = append(probes, Point{500, y})
	}
	f, err := Solve(context.Background(), Shape{WidthMM: 1000, DepthMM: 200, Slab: true, CellMM: 2, Exposed: []Face{Bottom}},
		ISO834(), Concrete{MoisturePct: 1.5}, &Options{EndMin: 240, Probes: probes})
	if err != nil {
		t.Fatal(err)
	}
	return f
}

func TestWickstrom(t *testing.T) {
	t.Parallel()
	f := isoSlab(t)
	// Wickström's method is a fit to standard-fire results for normal-weight
	// concrete; its accuracy is of the order of ±10–15 % at 20–60 mm depth
	// (thermal.md §4.1, from memory). Tolerance: 15 % of Wickström's rise,
	// from 60 min (at 30 min and below 20 mm the method is outside its fit).
	for _, tm := range []float64{60, 90, 120, 180} {
		for _, depth := range []float64{20, 30, 40, 50} {
			pr := f.Probes[int(depth/5)]
			got := pr.TempsC[int(tm)]
			want := wickstrom(depth/1000, tm)
			t.Logf("slab %g mm at %g min: %.0f °C, Wickström %.0f (%+.1f %% of rise)", depth, tm, got, want, 100*(got-want)/(want-20))
			if math.Abs(got-want) > 0.15*(want-20) {
				t.Errorf("slab %g mm at %g min: %.0f °C, Wickström %.0f (tol 15 %% of rise)", depth, tm, got, want)
			}
		}
	}
}

func TestTabulatedAxisDistances(t *testing.T) {
	t.Parallel()
	f := isoSlab(t)
	// EN 1992-1-2 Table 5.8 (one-way slabs): axis distance a = 10/20/30/40/55/65 mm
	// for REI 30/60/90/120/180/240, sized for a critical steel temperature of
	// 500 °C (§5.2(5)); from memory. Tolerance ±60 °C: tabulated data are rounded
	// to 5–10 mm of axis distance (≈ 40–60 °C at these depths).
	for _, c := range []struct{ tm, a float64 }{{30, 10}, {60, 20}, {90, 30}, {120, 40}, {180, 55}, {240, 65}} {
		got := probeAt(t, f, c.a, c.tm)
		t.Logf("R%g, a = %g mm: %.0f °C", c.tm, c.a, got)
		if !near(got, 500, 60) {
			t.Errorf("R%g at a = %g mm: %.0f °C, want 500 ± 60 (EN 1992-1-2 Table 5.8)", c.tm, c.a, got)
		}
	}
}

// probeAt returns the history value of a probe at depth (multiple of 5 mm) and time.
func probeAt(t *testing.T, f *Field, depth, tm float64) float64 {
	t.Helper()
	k := int(depth / 5)
	if depth != 5*float64(k) {
		lo := f.Probes[k].TempsC[int(tm)]
		hi := f.Probes[k+1].TempsC[int(tm)]
		return lo + (hi-lo)*(depth-5*float64(k))/5
	}
	return f.Probes[k].TempsC[int(tm)]
}

func TestBeamCornerWickstrom(t *testing.T) {
	t.Parallel()
	// Wickström's 2-D rule for a corner (thermal.md §4.1, [M]) at a corner bar,
	// x = y = 40 and 50 mm: 300 × 600 beam heated on three sides, ISO 834.
	// Tolerance 15 % of the predicted rise, as for the 1-D method.
	pts := []Point{{40, 40}, {50, 50}}
	f, err := Solve(context.Background(), Shape{WidthMM: 300, DepthMM: 600, CellMM: 10, Exposed: []Face{Bottom, Left, Right}},
		ISO834(), Concrete{MoisturePct: 1.5}, &Options{EndMin: 120, Probes: pts})
	if err != nil {
		t.Fatal(err)
	}
	for i, p := range pts {
		for _, tm := range []float64{60, 90, 120} {
			got := f.Probes[i].TempsC[int(tm)]
			want := wickstrom2D(p.XMM/1000, p.YMM/1000, tm)
			t.Logf("corner %v at %g min: %.0f °C, Wickström 2-D %.0f", p, tm, got, want)
			if math.Abs(got-want) > 0.15*(want-20) {
				t.Errorf("corner %v at %g min: %.0f °C, Wickström 2-D %.0f (tol 15 %% of rise)", p, tm, got, want)
			}
		}
	}
}

func TestWideBeamMatchesSlab(t *testing.T) {
	t.Parallel()
	// Consistency: a beam 1000 mm wide heated from below is one-dimensional at mid-width.
	exp, _ := NewCooled(ISO834(), 60, 0)
	c := Concrete{MoisturePct: 1.5}
	opt := &Options{EndMin: 180}
	slab, err := Solve(context.Background(), Shape{WidthMM: 1000, DepthMM: 200, Slab: true, CellMM: 10, Exposed: []Face{Bottom}}, exp, c, opt)
	if err != nil {
		t.Fatal(err)
	}
	beam, err := Solve(context.Background(), Shape{WidthMM: 1000, DepthMM: 200, CellMM: 10, Exposed: []Face{Bottom}}, exp, c, opt)
	if err != nil {
		t.Fatal(err)
	}
	for y := 5.0; y < 200; y += 10 {
		a, b := slab.PeakAt(Point{500, y}), beam.PeakAt(Point{500, y})
		if !near(a, b, 0.01) { // 0.01 °C: the side faces are 500 mm away
			t.Errorf("y = %g: slab %.3f, beam %.3f (want equal ± 0.01)", y, a, b)
		}
	}
}

func TestSymmetryAndPeaks(t *testing.T) {
	t.Parallel()
	exp, _ := NewCooled(ISO834(), 60, 0)
	sh := Shape{WidthMM: 300, DepthMM: 400, CellMM: 10, Exposed: []Face{Bottom, Left, Right}}
	c := Concrete{MoisturePct: 3}
	tb := newTables(func() enConcrete { m, _ := c.material(); return m }())
	opt := &Options{Probes: []Point{{150, 50}, {40, 40}}}
	// The whole grid, without the mirror shortcut: a beam heated alike on both
	// sides must come out symmetric (to rounding, 1e-6 °C).
	whole, err := solve(context.Background(), sh, exp, tb, opt, boundary{fireEps: emissivity, ambAlpha: 4, ambEps: emissivity, noMirror: true})
	if err != nil {
		t.Fatal(err)
	}
	nx := whole.Nx
	for j := 0; j < whole.Ny; j++ {
		for i := 0; i < nx/2; i++ {
			a, b := whole.Peak[j*nx+i], whole.Peak[j*nx+nx-1-i]
			if !near(a, b, 1e-6) {
				t.Fatalf("cell (%d,%d) %.9f vs mirror %.9f", i, j, a, b)
			}
		}
	}
	// The mirrored half solution is the same field (1e-6 °C) and stops at the same time.
	f, err := Solve(context.Background(), sh, exp, c, opt)
	if err != nil {
		t.Fatal(err)
	}
	if f.Nx != whole.Nx || f.EndMin != whole.EndMin {
		t.Fatalf("mirrored: Nx %d EndMin %g, whole grid: %d %g", f.Nx, f.EndMin, whole.Nx, whole.EndMin)
	}
	for k := range f.Peak {
		if !near(f.Peak[k], whole.Peak[k], 1e-6) || f.Active[k] != whole.Active[k] {
			t.Fatalf("cell %d: mirrored %.9f, whole %.9f", k, f.Peak[k], whole.Peak[k])
		}
	}
	for k := range f.Probes {
		if !near(f.Probes[k].PeakC, whole.Probes[k].PeakC, 1e-6) {
			t.Errorf("probe %v: mirrored %.6f, whole %.6f", f.Probes[k].At, f.Probes[k].PeakC, whole.Probes[k].PeakC)
		}
	}
	for k := range f.Peak {
		if f.Peak[k] < f.Final[k]-1e-9 || f.Peak[k] < f.EndOfHeating[k]-1e-9 {
			t.Fatalf("cell %d: peak %g below final %g or end-of-heating %g", k, f.Peak[k], f.Final[k], f.EndOfHeating[k])
		}
	}
	for _, pr := range f.Probes {
		for _, v := range pr.TempsC {
			if v > pr.PeakC+1e-9 {
				t.Fatalf("probe %v: history %g above its peak %g", pr.At, v, pr.PeakC)
			}
		}
	}
	// Post-fire practice (thermal.md §1.1, EN 1991-1-2 §2.4(4)): 50 mm inside,
	// the peak comes after the end of heating.
	if pt := f.Probes[0].PeakTimeMin; !(pt > 60) {
		t.Errorf("peak at 50 mm at %g min, want after the 60 min end of heating", pt)
	}
	// Automatic end: gas back at ambient and peaks passed, within 72 h.
	if !(f.EndMin >= exp.AmbientAt() && f.EndMin <= maxEndMin) {
		t.Errorf("EndMin = %g, want between %g and %g", f.EndMin, exp.AmbientAt(), maxEndMin)
	}
}

func TestSpalling(t *testing.T) {
	t.Parallel()
	exp, _ := NewCooled(ISO834(), 90, 0)
	c := Concrete{MoisturePct: 1.5}
	bar := []Point{{500, 40}}
	base := Shape{WidthMM: 1000, DepthMM: 200, Slab: true, CellMM: 2, Exposed: []Face{Bottom}}
	run := func(sh Shape, end float64) *Field {
		f, err := Solve(context.Background(), sh, exp, c, &Options{EndMin: end, Probes: bar})
		if err != nil {
			t.Fatal(err)
		}
		return f
	}
	plain := run(base, 300)
	sp := base
	sp.Spalled = []Spall{{Face: Bottom, DepthMM: 15}}
	measured := run(sp, 300)
	// Measured spalling of 15 mm with 2 mm cells removes the cells whose centres
	// lie within 15 mm: 1, 3, …, 15 mm → 8 cells (16 mm).
	if n := inactive(measured); n != 8 {
		t.Errorf("measured 15 mm: %d cells removed, want 8", n)
	}
	if !(measured.Probes[0].PeakC > plain.Probes[0].PeakC+20) {
		t.Errorf("bar at 40 mm: spalled %.0f °C, intact %.0f; want the spalled section hotter", measured.Probes[0].PeakC, plain.Probes[0].PeakC)
	}
	// Progressive: from 10 min at 1 mm/min to 30 mm; layers go when the front
	// passes their centres: at 24 min the front is at 14 mm → 7 layers; finally 15.
	pg := base
	pg.Progressive = []ProgressiveSpall{{Face: Bottom, StartMin: 10, RateMMPerMin: 1, MaxDepthMM: 30}}
	for _, c := range []struct {
		end  float64
		want int
	}{{10.5, 0}, {11, 1}, {24, 7}, {39, 15}, {200, 15}} {
		if n := inactive(run(pg, c.end)); n != c.want {
			t.Errorf("progressive at %g min: %d layers removed, want %d", c.end, n, c.want)
		}
	}
	prog := run(pg, 300)
	if !(prog.Probes[0].PeakC > plain.Probes[0].PeakC+20) {
		t.Errorf("bar: progressive %.0f °C, intact %.0f; want hotter", prog.Probes[0].PeakC, plain.Probes[0].PeakC)
	}
	// The fire boundary moved: the new surface cell is near the gas temperature at 90 min.
	if v := prog.EndOfHeating[15]; !(v > 900) {
		t.Errorf("new surface cell at end of heating %.0f °C, want > 900", v)
	}
	d, ok := prog.IsothermDepth(Bottom, 500, 300)
	dp, okp := plain.IsothermDepth(Bottom, 500, 300)
	// Measured from the original surface (30 mm removed), the 300 °C isotherm lies deeper.
	if !ok || !okp || !(d+30 > dp) {
		t.Errorf("300 °C isotherm from the original surface: spalled %.1f (ok %v), intact %.1f; want deeper", d+30, ok, dp)
	}

	// Partial spalling of a beam soffit: only the cells under From–To go.
	b := Shape{WidthMM: 300, DepthMM: 500, CellMM: 10, Exposed: []Face{Bottom, Left, Right},
		Spalled: []Spall{{Face: Bottom, DepthMM: 20, FromMM: 100, ToMM: 200}}}
	f, err := Solve(context.Background(), b, exp, c, &Options{EndMin: 30})
	if err != nil {
		t.Fatal(err)
	}
	for i := 0; i < f.Nx; i++ {
		x := (float64(i) + 0.5) * 10
		want := !(x >= 100 && x <= 200)
		if f.Active[i] != want || f.Active[f.Nx+i] != want || !f.Active[2*f.Nx+i] {
			t.Errorf("column x = %g: active rows 0,1,2 = %v %v %v, want %v %v true", x, f.Active[i], f.Active[f.Nx+i], f.Active[2*f.Nx+i], want, want)
		}
	}
}

func inactive(f *Field) int {
	n := 0
	for _, a := range f.Active {
		if !a {
			n++
		}
	}
	return n
}

func TestIsothermDepth(t *testing.T) {
	t.Parallel()
	exp, _ := NewCooled(ISO834(), 60, 0)
	f, err := Solve(context.Background(), Shape{WidthMM: 300, DepthMM: 500, FlangeWidthMM: 800, FlangeDepthMM: 120, CellMM: 10,
		Exposed: []Face{Bottom, Left, Right}}, exp, Concrete{MoisturePct: 1.5}, nil)
	if err != nil {
		t.Fatal(err)
	}
	// Identity: the peak field at the returned depth is the isotherm value
	// (±2 °C: linear interpolation on the same profile, 10 mm cells).
	xMid := float64(f.Nx) * 10 / 2
	d, ok := f.IsothermDepth(Bottom, xMid, 500)
	if !ok {
		t.Fatal("no 500 °C isotherm at the soffit")
	}
	if got := f.PeakAt(Point{xMid, d}); !near(got, 500, 2) {
		t.Errorf("soffit: peak at the 500 °C isotherm depth %.1f mm = %.1f °C, want 500 ± 2", d, got)
	}
	dl, ok := f.IsothermDepth(Left, 200, 500)
	if !ok {
		t.Fatal("no 500 °C isotherm on the web side")
	}
	x0 := (float64(f.Nx) - 30) / 2 * 10 // web's left surface
	if got := f.PeakAt(Point{x0 + dl, 200}); !near(got, 500, 2) {
		t.Errorf("web side: peak at %.1f mm = %.1f, want 500 ± 2", dl, got)
	}
	if _, ok := f.IsothermDepth(Bottom, xMid, 1500); ok {
		t.Error("1500 °C isotherm reported although the surface never got there")
	}
	if d, ok := f.IsothermDepth(Bottom, xMid, 21); !ok || d != 500 {
		t.Errorf("21 °C isotherm: %g, %v; want the whole depth 500 mm", d, ok)
	}
	// Flange outstand soffit (x = 50 mm from the flange end) is bottom-exposed too.
	if d, ok := f.IsothermDepth(Bottom, 50, 300); !ok || !(d > 0 && d < 120) {
		t.Errorf("outstand soffit 300 °C isotherm %g, %v; want inside the 120 mm flange", d, ok)
	}
}

func TestBadInput(t *testing.T) {
	t.Parallel()
	ok := Shape{WidthMM: 300, DepthMM: 500, CellMM: 10, Exposed: []Face{Bottom}}
	cases := []struct {
		name  string
		mod   func(*Shape, *Options, *Concrete)
		field string
	}{
		{"cell too big", func(s *Shape, _ *Options, _ *Concrete) { s.CellMM = 30 }, "CellMM = 30 out of range (accepted 1–25)"},
		{"cell too small", func(s *Shape, _ *Options, _ *Concrete) { s.CellMM = 0.5 }, "CellMM"},
		{"zero width", func(s *Shape, _ *Options, _ *Concrete) { s.WidthMM = 0 }, "WidthMM"},
		{"negative depth", func(s *Shape, _ *Options, _ *Concrete) { s.DepthMM = -100 }, "DepthMM"},
		{"NaN depth", func(s *Shape, _ *Options, _ *Concrete) { s.DepthMM = math.NaN() }, "DepthMM"},
		{"cell larger than member", func(s *Shape, _ *Options, _ *Concrete) { s.WidthMM = 8 }, "larger than WidthMM"},
		{"too many cells", func(s *Shape, _ *Options, _ *Concrete) { s.WidthMM, s.DepthMM, s.CellMM = 2000, 2000, 2 }, "exceeds the limit of 200000"},
		{"unknown face", func(s *Shape, _ *Options, _ *Concrete) { s.Exposed = []Face{"side"} }, "Exposed[0]"},
		{"no face", func(s *Shape, _ *Options, _ *Concrete) { s.Exposed = nil }, "Exposed is empty"},
		{"slab side", func(s *Shape, _ *Options, _ *Concrete) { s.Slab, s.Exposed = true, []Face{Left} }, "not allowed for a slab"},
		{"flange narrow", func(s *Shape, _ *Options, _ *Concrete) { s.FlangeWidthMM, s.FlangeDepthMM = 200, 100 }, "FlangeWidthMM"},
		{"flange deep", func(s *Shape, _ *Options, _ *Concrete) { s.FlangeWidthMM, s.FlangeDepthMM = 800, 500 }, "FlangeDepthMM"},
		{"spall face", func(s *Shape, _ *Options, _ *Concrete) { s.Spalled = []Spall{{Face: "front", DepthMM: 10}} }, "Spalled[0].Face"},
		{"spall depth", func(s *Shape, _ *Options, _ *Concrete) { s.Spalled = []Spall{{Face: Bottom, DepthMM: 600}} }, "Spalled[0].DepthMM"},
		{"spall range", func(s *Shape, _ *Options, _ *Concrete) {
			s.Spalled = []Spall{{Face: Bottom, DepthMM: 10, FromMM: 200, ToMM: 100}}
		}, "FromMM"},
		{"progressive rate", func(s *Shape, _ *Options, _ *Concrete) {
			s.Progressive = []ProgressiveSpall{{Face: Bottom, RateMMPerMin: 0, MaxDepthMM: 10}}
		}, "Progressive[0].RateMMPerMin"},
		{"progressive depth", func(s *Shape, _ *Options, _ *Concrete) {
			s.Progressive = []ProgressiveSpall{{Face: Left, RateMMPerMin: 1, MaxDepthMM: 400}}
		}, "Progressive[0].MaxDepthMM"},
		{"end", func(_ *Shape, o *Options, _ *Concrete) { o.EndMin = 5000 }, "EndMin"},
		{"history", func(_ *Shape, o *Options, _ *Concrete) { o.HistoryStepMin = -1 }, "HistoryStepMin"},
		{"probe", func(_ *Shape, o *Options, _ *Concrete) { o.Probes = []Point{{400, 10}} }, "Probes[0]"},
		{"moisture", func(_ *Shape, _ *Options, c *Concrete) { c.MoisturePct = 5 }, "MoisturePct"},
		{"aggregate", func(_ *Shape, _ *Options, c *Concrete) { c.Aggregate = "granite" }, "Aggregate"},
		{"conductivity", func(_ *Shape, _ *Options, c *Concrete) { c.Conductivity = "mid" }, "Conductivity"},
		{"density", func(_ *Shape, _ *Options, c *Concrete) { c.DensityKgM3 = 3000 }, "DensityKgM3"},
	}
	exp, _ := NewCooled(ISO834(), 30, 0)
	for _, c := range cases {
		sh, opt, con := ok, Options{EndMin: 10}, Concrete{}
		c.mod(&sh, &opt, &con)
		_, err := Solve(context.Background(), sh, exp, con, &opt)
		if err == nil || !strings.Contains(err.Error(), c.field) || !strings.Contains(err.Error(), "accepted") && !strings.Contains(err.Error(), "outside") {
			t.Errorf("%s: err = %v, want one naming %q and the accepted range", c.name, err, c.field)
		}
	}
	if _, err := Solve(context.Background(), ok, ISO834(), Concrete{}, nil); err == nil || !strings.Contains(err.Error(), "EndMin") {
		t.Errorf("uncut curve with automatic end: err = %v, want one naming EndMin", err)
	}
	if _, err := Solve(context.Background(), ok, badGas{}, Concrete{}, &Options{EndMin: 10}); err == nil || !strings.Contains(err.Error(), "gas temperature") {
		t.Errorf("NaN gas temperature: err = %v, want a range error", err)
	}
	if _, err := Solve(context.Background(), ok, nil, Concrete{}, nil); err == nil {
		t.Error("nil exposure accepted")
	}
}

func TestCancel(t *testing.T) {
	t.Parallel()
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	exp, _ := NewCooled(ISO834(), 60, 0)
	_, err := Solve(ctx, Shape{WidthMM: 300, DepthMM: 500, CellMM: 10, Exposed: []Face{Bottom}}, exp, Concrete{}, nil)
	if !errors.Is(err, context.Canceled) {
		t.Errorf("err = %v, want context.Canceled", err)
	}
}

func TestProgress(t *testing.T) {
	t.Parallel()
	exp, _ := NewCooled(ISO834(), 30, 0)
	last := -1.0
	_, err := Solve(context.Background(), Shape{WidthMM: 1000, DepthMM: 150, Slab: true, CellMM: 5, Exposed: []Face{Bottom}}, exp, Concrete{},
		&Options{Progress: func(fr float64) {
			if fr < last || fr < 0 || fr > 1 {
				t.Errorf("progress %g after %g", fr, last)
			}
			last = fr
		}})
	if err != nil || last != 1 {
		t.Errorf("err %v, last progress %g (want 1)", err, last)
	}
}

func TestMirrorWithSpalling(t *testing.T) {
	t.Parallel()
	exp, _ := NewCooled(Hydrocarbon(), 45, 0)
	c := Concrete{MoisturePct: 1.5}
	m, _ := c.material()
	tb := newTables(m)
	sh := Shape{WidthMM: 300, DepthMM: 400, FlangeWidthMM: 700, FlangeDepthMM: 100, CellMM: 10, Exposed: []Face{Bottom, Left, Right},
		Spalled: []Spall{{Face: Bottom, DepthMM: 20, FromMM: 250, ToMM: 450}},
		Progressive: []ProgressiveSpall{
			{Face: Left, StartMin: 5, RateMMPerMin: 2, MaxDepthMM: 30},
			{Face: Right, StartMin: 5, RateMMPerMin: 2, MaxDepthMM: 30},
		}}
	opt := &Options{EndMin: 150, Probes: []Point{{245, 45}, {455, 45}}}
	bc := defaultBoundary(false)
	f, err := solve(context.Background(), sh, exp, tb, opt, bc)
	if err != nil {
		t.Fatal(err)
	}
	bc.noMirror = true
	whole, err := solve(context.Background(), sh, exp, tb, opt, bc)
	if err != nil {
		t.Fatal(err)
	}
	// Mirrored half and whole grid agree to rounding (1e-6 °C), cell by cell.
	for k := range f.Peak {
		if f.Active[k] != whole.Active[k] || (f.Active[k] && !near(f.Peak[k], whole.Peak[k], 1e-6)) {
			t.Fatalf("cell %d: mirrored %v %.6f, whole %v %.6f", k, f.Active[k], f.Peak[k], whole.Active[k], whole.Peak[k])
		}
	}
	// 30 mm of each web side (3 cells of 10 mm, centres 5/15/25) are gone.
	// Row 20 (y = 205 mm, in the web): 40 outstand-region cells outside the
	// outline plus 3 removed on each side.
	n := 0
	for i := 0; i < f.Nx; i++ {
		if !f.Active[20*f.Nx+i] {
			n++
		}
	}
	if n != 46 {
		t.Errorf("row 20: %d inactive cells, want 46 (40 outside + 2 × 3 spalled)", n)
	}
	for _, face := range []Face{Left, Right} {
		d, ok := f.IsothermDepth(face, 150, 500)
		dw, okw := whole.IsothermDepth(face, 150, 500)
		if !ok || !okw || !near(d, dw, 1e-6) {
			t.Errorf("%s 500 °C isotherm: mirrored %g (%v), whole %g (%v)", face, d, ok, dw, okw)
		}
	}
	dl, _ := f.IsothermDepth(Left, 150, 500)
	dr, _ := f.IsothermDepth(Right, 150, 500)
	if !near(dl, dr, 1e-6) {
		t.Errorf("left %g vs right %g", dl, dr)
	}
	if !near(f.Probes[0].PeakC, f.Probes[1].PeakC, 1e-6) || !near(f.energyIn, whole.energyIn, 1e-6*whole.energyIn) {
		t.Errorf("mirror probes %g / %g, energy %g / %g", f.Probes[0].PeakC, f.Probes[1].PeakC, f.energyIn, whole.energyIn)
	}
}

func TestStableAllCellSizes(t *testing.T) {
	t.Parallel()
	// Explicit stability (positive coefficients, Δt from the largest λ and
	// boundary coefficient): for 1–25 mm cells the field stays within the
	// range of the initial and gas temperatures (maximum principle).
	exp, _ := NewCooled(Hydrocarbon(), 60, 0)
	for _, cell := range []float64{1, 3, 7, 12.5, 25} {
		for _, c := range []Concrete{{MoisturePct: 4, Conductivity: Upper}, {Aggregate: Lightweight}} {
			sh := Shape{WidthMM: 300, DepthMM: 300, CellMM: cell, Exposed: []Face{Bottom, Left}}
			if cell < 3 {
				sh = Shape{WidthMM: 1000, DepthMM: 300, Slab: true, CellMM: cell, Exposed: []Face{Bottom, Top}}
			}
			f, err := Solve(context.Background(), sh, exp, c, &Options{EndMin: 120, LumpedUnexposed: true})
			if err != nil {
				t.Fatal(err)
			}
			for k, v := range f.Peak {
				if math.IsNaN(v) || v < 19.99 || v > 1100.01 {
					t.Fatalf("cell %g mm, %+v: cell %d peak %g outside [20, 1100]", cell, c, k, v)
				}
			}
		}
	}
}

// badGas is an exposure whose gas temperature is not a number.
type badGas struct{ constGas }

func (badGas) GasTemperature(float64) float64 { return math.NaN() }
func (badGas) Convection() float64            { return 25 }
