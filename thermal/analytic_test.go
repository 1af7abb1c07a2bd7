package thermal

import (
	"context"
	"math"
	"testing"
)

// constGas is a constant gas temperature with a given convection coefficient.
type constGas struct{ theta, alpha float64 }

func (c constGas) GasTemperature(float64) float64 { return c.theta }
func (c constGas) Convection() float64            { return c.alpha }
func (c constGas) HeatingEnd() float64            { return math.Inf(1) }
func (c constGas) AmbientAt() float64             { return math.Inf(1) }
func (c constGas) Name() string                   { return "constant gas" }

// Constant properties of thermal.md §5: k = 1 W/mK, ρc = 1e6 J/m³K, α = 1e-6 m²/s.
var unitMaterial = constMaterial{k: 1, rhoC: 1e6}

const aDiff = 1e-6

// solveLinear solves with constant properties, no radiation, adiabatic
// unexposed faces (the linear problems of Carslaw & Jaeger), with the
// explicit scheme.
func solveLinear(t *testing.T, sh Shape, gas constGas, endMin float64) *Field {
	t.Helper()
	return solveLinearWith(t, sh, gas, endMin, boundary{adiabatic: true, explicit: true})
}

func solveLinearWith(t *testing.T, sh Shape, gas constGas, endMin float64, bc boundary) *Field {
	t.Helper()
	f, err := solve(context.Background(), sh, gas, newTables(unitMaterial), &Options{EndMin: endMin}, bc)
	if err != nil {
		t.Fatal(err)
	}
	return f
}

// erfcSemiInfinite is Carslaw & Jaeger §2.7 / Incropera (5.60): semi-infinite
// solid, convection h to T∞, as (T − Ti)/(T∞ − Ti).
func convectiveSemiInfinite(x, tS, h float64) float64 {
	k := 1.0
	eta := x / (2 * math.Sqrt(aDiff*tS))
	beta := h * math.Sqrt(aDiff*tS) / k
	return math.Erfc(eta) - math.Exp(h*x/k+beta*beta)*math.Erfc(eta+beta)
}

// maxError returns the largest |T − exact| over the cell centres of a slab
// down to depthMM from the exposed bottom face.
func maxError(f *Field, depthMM float64, exact func(xM float64) float64) float64 {
	e := 0.0
	for j := 0; j < f.Ny; j++ {
		x := (float64(j) + 0.5) * f.CellMM
		if x > depthMM {
			break
		}
		e = math.Max(e, math.Abs(f.Final[j]-exact(x/1000)))
	}
	return e
}

func TestSemiInfiniteDirichlet(t *testing.T) {
	t.Parallel()
	// Carslaw & Jaeger §2.4 / Incropera (5.57): surface held at Ts = 1020 °C
	// (α_c = 1e8 W/m²K, no radiation), Ti = 20 °C: T = Ts − (Ts − Ti)·erf(x/2√(αt)).
	// A 300 mm slab with an adiabatic back is semi-infinite to < 0.01 °C at 600 s.
	exact := func(x float64) float64 { return 1020 - 1000*math.Erf(x/(2*math.Sqrt(aDiff*600))) }
	// Cross-check of the formula against thermal.md §5 vectors (t = 600 s): 792.830 at 10 mm, 583.703 at 20 mm.
	if !near(exact(0.01), 792.830, 0.001) || !near(exact(0.02), 583.703, 0.001) {
		t.Fatalf("erf formula disagrees with thermal.md §5 vectors")
	}
	var errs []float64
	cells := []float64{4, 2, 1}
	for _, d := range cells {
		f := solveLinear(t, Shape{WidthMM: 1000, DepthMM: 300, Slab: true, CellMM: d, Exposed: []Face{Bottom}}, constGas{1020, 1e8}, 10)
		errs = append(errs, maxError(f, 60, exact))
	}
	for i := range errs {
		t.Logf("Dirichlet, cell %g mm (dt ∝ cell²): max error %.4f °C", cells[i], errs[i])
	}
	// Tolerance: 1 °C at 1 mm cells (0.1 % of the 1000 °C rise).
	if errs[2] > 1 {
		t.Errorf("1 mm cells: max error %.3f °C, want ≤ 1", errs[2])
	}
	// Second order in space with dt ∝ Δx² (explicit Euler): error ratio ≈ 4 per halving.
	for i := 1; i < len(errs); i++ {
		order := math.Log2(errs[i-1] / errs[i])
		t.Logf("observed order %g→%g mm: %.2f", cells[i-1], cells[i], order)
		if order < 1.6 {
			t.Errorf("observed order %.2f between %g and %g mm, want ≈ 2 (≥ 1.6)", order, cells[i-1], cells[i])
		}
	}
}

func TestSemiInfiniteConvective(t *testing.T) {
	t.Parallel()
	// Carslaw & Jaeger §2.7 / Incropera (5.60), h = 25 W/m²K, T∞ = 1020 °C.
	exact := func(tS float64) func(float64) float64 {
		return func(x float64) float64 { return 20 + 1000*convectiveSemiInfinite(x, tS, 25) }
	}
	// Cross-check against thermal.md §5 vectors: 457.680 (x = 0, 600 s), 545.493 (20 mm, 3600 s).
	if !near(exact(600)(0), 457.680, 0.001) || !near(exact(3600)(0.02), 545.493, 0.001) {
		t.Fatalf("convective formula disagrees with thermal.md §5 vectors")
	}
	var errs []float64
	cells := []float64{4, 2, 1}
	for _, d := range cells {
		f := solveLinear(t, Shape{WidthMM: 1000, DepthMM: 400, Slab: true, CellMM: d, Exposed: []Face{Bottom}}, constGas{1020, 25}, 60)
		errs = append(errs, maxError(f, 100, exact(3600)))
		// Surface temperature (the solver's θ_s) against the exact surface value, tol 1 °C.
		if got, want := f.surfPeak[0], exact(3600)(0); !near(got, want, 1) {
			t.Errorf("cell %g: surface %.2f °C, want %.2f ± 1", d, got, want)
		}
	}
	for i := range errs {
		t.Logf("convective, cell %g mm: max error %.4f °C", cells[i], errs[i])
	}
	if errs[2] > 0.5 {
		t.Errorf("1 mm cells: max error %.3f °C, want ≤ 0.5 (0.05 %% of the rise)", errs[2])
	}
	for i := 1; i < len(errs); i++ {
		order := math.Log2(errs[i-1] / errs[i])
		t.Logf("observed order %g→%g mm: %.2f", cells[i-1], cells[i], order)
		if order < 1.6 {
			t.Errorf("observed order %.2f, want ≈ 2 (≥ 1.6)", order)
		}
	}
}

func TestFiniteSlabSeries(t *testing.T) {
	t.Parallel()
	// Carslaw & Jaeger §3.4 / Incropera (5.42): wall of thickness L = 0.1 m,
	// convection h = 25 at x = 0, adiabatic at x = L: Bi = 2.5,
	// θ* = Σ C_n exp(−ζ_n² Fo) cos(ζ_n x*), ζ_n tan ζ_n = Bi, x* from the adiabatic face.
	const L, h, bi = 0.1, 25.0, 2.5
	var zeta []float64
	for n := 0; n < 200; n++ {
		lo, hi := float64(n)*math.Pi+1e-12, float64(n)*math.Pi+math.Pi/2-1e-12
		for it := 0; it < 200; it++ {
			m := (lo + hi) / 2
			if m*math.Tan(m) < bi {
				lo = m
			} else {
				hi = m
			}
		}
		zeta = append(zeta, (lo+hi)/2)
	}
	if !near(zeta[0], 1.142227, 1e-6) || !near(zeta[1], 3.731838, 1e-6) { // thermal.md §5 roots
		t.Fatalf("roots %v disagree with thermal.md §5", zeta[:2])
	}
	exact := func(x, tS float64) float64 {
		fo := aDiff * tS / (L * L)
		xs := (L - x) / L
		s := 0.0
		for _, z := range zeta {
			s += 4 * math.Sin(z) / (2*z + math.Sin(2*z)) * math.Exp(-z*z*fo) * math.Cos(z*xs)
		}
		return 1020 - 1000*s
	}
	if !near(exact(0, 3600), 707.635, 0.01) || !near(exact(0.05, 7200), 626.497, 0.01) {
		t.Fatalf("series disagrees with thermal.md §5 vectors: %g, %g", exact(0, 3600), exact(0.05, 7200))
	}
	f := solveLinear(t, Shape{WidthMM: 1000, DepthMM: 100, Slab: true, CellMM: 1, Exposed: []Face{Bottom}}, constGas{1020, h}, 120)
	e := maxError(f, 100, func(x float64) float64 { return exact(x, 7200) })
	t.Logf("finite slab, 1 mm cells, 7200 s: max error %.4f °C", e)
	if e > 0.5 {
		t.Errorf("max error %.3f °C, want ≤ 0.5 (0.05 %% of the rise)", e)
	}
}

func TestCornerProduct(t *testing.T) {
	t.Parallel()
	// Carslaw & Jaeger §2.7 product solution for the quarter-space, convection
	// on both faces: θ*(x, y) = θ*₁(x)·θ*₁(y) (thermal.md §5 F: 794.843 at
	// x = y = 20 mm, 3600 s). 200 × 200 mm beam, bottom and left exposed,
	// adiabatic elsewhere (semi-infinite to < 0.1 °C at 1 h), 4 mm cells.
	f := solveLinear(t, Shape{WidthMM: 200, DepthMM: 200, CellMM: 4, Exposed: []Face{Bottom, Left}}, constGas{1020, 25}, 60)
	worst := 0.0
	for _, p := range []float64{2, 10, 18, 30, 50} {
		th1 := convectiveSemiInfinite(p/1000, 3600, 25)
		want := 1020 - 1000*(1-th1)*(1-th1)
		got := f.PeakAt(Point{p, p})
		worst = math.Max(worst, math.Abs(got-want))
		// Tolerance 2 °C: 4 mm cells, second-order error ≈ 16× the 1 mm 1-D error.
		if !near(got, want, 2) {
			t.Errorf("corner (%g, %g) mm: %.2f °C, want %.2f ± 2", p, p, got, want)
		}
	}
	t.Logf("corner: worst error %.3f °C", worst)
	if w := 1020 - 1000*math.Pow(1-convectiveSemiInfinite(0.02, 3600, 25), 2); !near(w, 794.843, 0.01) {
		t.Errorf("product formula %g disagrees with thermal.md §5 F 794.843", w)
	}
}

func TestEnergyBalance(t *testing.T) {
	t.Parallel()
	// Conservation: heat in through the boundary = change of stored enthalpy
	// ∫(H(θ_end) − H(20)) dA + enthalpy carried off by spalled cells, within
	// 0.5 % (brief); H here from the forward EN table, independent of the solver's state.
	exp, err := NewCooled(ISO834(), 60, 0)
	if err != nil {
		t.Fatal(err)
	}
	for _, sh := range []Shape{
		{WidthMM: 300, DepthMM: 500, CellMM: 10, Exposed: []Face{Bottom, Left, Right}},
		{WidthMM: 300, DepthMM: 500, CellMM: 10, Exposed: []Face{Bottom, Left, Right},
			Progressive: []ProgressiveSpall{{Face: Bottom, StartMin: 10, RateMMPerMin: 1, MaxDepthMM: 30}}},
		{WidthMM: 1000, DepthMM: 150, CellMM: 2, Slab: true, Exposed: []Face{Bottom}},
	} {
		f, err := Solve(context.Background(), sh, exp, Concrete{MoisturePct: 3}, &Options{EndMin: 180})
		if err != nil {
			t.Fatal(err)
		}
		d := f.CellMM / 1000
		stored := 0.0
		for k, a := range f.Active {
			if a {
				stored += (f.tb.enthalpy(f.Final[k]) - f.tb.enthalpy(AmbientC)) * d * d
			}
		}
		bal := stored + f.energyOut
		rel := math.Abs(bal-f.energyIn) / f.energyIn
		t.Logf("%v: in %.4g J/m, stored %.4g + removed %.4g, relative imbalance %.2e", sh.Exposed, f.energyIn, stored, f.energyOut, rel)
		if rel > 0.005 {
			t.Errorf("energy imbalance %.3g %%, want ≤ 0.5 %%", rel*100)
		}
	}
}

func TestLineSolverConvergence(t *testing.T) {
	t.Parallel()
	// The implicit line solver (fine slab meshes) against Carslaw & Jaeger
	// §2.7 (convective surface, h = 25, 1020 °C, 1 mm cells, t = 3600 s).
	// Backward Euler: the error falls linearly with the step.
	exact := func(x float64) float64 { return 20 + 1000*convectiveSemiInfinite(x, 3600, 25) }
	sh := Shape{WidthMM: 1000, DepthMM: 400, Slab: true, CellMM: 1, Exposed: []Face{Bottom}}
	var errs []float64
	steps := []float64{40, 20, 10}
	for _, dt := range steps {
		f := solveLinearWith(t, sh, constGas{1020, 25}, 60, boundary{adiabatic: true, dtLine: dt})
		if f.iters == 0 {
			t.Fatal("line solver not used")
		}
		errs = append(errs, maxError(f, 100, exact))
	}
	for i := range errs {
		t.Logf("line solver, Δt = %g s: max error %.4f °C", steps[i], errs[i])
	}
	// Tolerance 1 °C at the default 20 s step (0.1 % of the 1000 °C rise).
	if errs[1] > 1 {
		t.Errorf("Δt = 20 s: max error %.3f °C, want ≤ 1", errs[1])
	}
	for i := 1; i < len(errs); i++ {
		order := math.Log2(errs[i-1] / errs[i])
		t.Logf("observed order in time %g→%g s: %.2f", steps[i-1], steps[i], order)
		if order < 0.8 {
			t.Errorf("observed order %.2f in time, want ≈ 1 (≥ 0.8)", order)
		}
	}
}

func TestLineSolverMatchesExplicit(t *testing.T) {
	t.Parallel()
	// The two schemes on the EN 1992-1-2 slab (u = 3 %, the sharpest moisture
	// peak), 1 mm cells, heating then Annex A cooling: peak fields agree within
	// 1 °C (the explicit scheme converges at order 2 to the analytic solutions).
	c := Concrete{MoisturePct: 3}
	m, _ := c.material()
	tb := newTables(m)
	sh := Shape{WidthMM: 1000, DepthMM: 200, Slab: true, CellMM: 1, Exposed: []Face{Bottom}}
	for _, base := range []Exposure{ISO834(), Hydrocarbon()} {
		exp, _ := NewCooled(base, 60, 0)
		bc := defaultBoundary(false)
		imp, err := solve(context.Background(), sh, exp, tb, &Options{}, bc)
		if err != nil {
			t.Fatal(err)
		}
		bc.explicit = true
		exp2, err := solve(context.Background(), sh, exp, tb, &Options{}, bc)
		if err != nil {
			t.Fatal(err)
		}
		worst := 0.0
		for k := range imp.Peak {
			worst = math.Max(worst, math.Abs(imp.Peak[k]-exp2.Peak[k]))
		}
		t.Logf("%s: line solver %d steps, explicit %d; largest peak difference %.3f °C", exp.Name(), imp.Steps, exp2.Steps, worst)
		if worst > 1 || imp.iters == 0 {
			t.Errorf("%s: peak fields differ by %.3f °C (want ≤ 1), line solver used %v", exp.Name(), worst, imp.iters > 0)
		}
	}
}
