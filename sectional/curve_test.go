package sectional

import (
	"context"
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
)

// prBlock returns the stress-block factors of a fully developed
// parabola–rectangle compression zone (EN 1992-1-1 §3.1.7(1)) whose extreme
// fibre is at ecu: the mean stress α·fc over the depth x and the depth β·x
// of the resultant below the compression face. By integration of
// σ/fc = 1 - (1 - u/εc2)^n over u = 0..εc2 and 1 over εc2..εcu:
//
//	α·εcu = εc2·n/(n+1) + (εcu - εc2)
//	I     = εc2²·(1/2 - 1/((n+1)(n+2))) + (εcu² - εc2²)/2   (first moment about the neutral axis)
//	β     = 1 - I/(α·εcu²)
//
// For n = 2, εc2 = 2 ‰, εcu = 3.5 ‰ this gives the textbook α = 17/21 =
// 0.8095 and β = 99/238 = 0.4160.
func prBlock(n, ec2, ecu float64) (alpha, beta float64) {
	alpha = (ec2*n/(n+1) + (ecu - ec2)) / ecu
	i := ec2*ec2*(0.5-1/((n+1)*(n+2))) + (ecu*ecu-ec2*ec2)/2
	return alpha, 1 - i/(alpha*ecu*ecu)
}

func TestPRBlockConstants(t *testing.T) {
	t.Parallel()
	// Textbook constants for the EN 1992-1-1 parabola–rectangle, fck ≤ 50:
	// α = 17/21, β = 99/238 (exact fractions; tolerance 1e-12).
	a, b := prBlock(2, 0.002, 0.0035)
	if !scalar.EqualWithinRel(a, 17.0/21, 1e-12) || !scalar.EqualWithinRel(b, 99.0/238, 1e-12) {
		t.Errorf("prBlock(2, 2‰, 3.5‰) = (%g, %g), want (17/21, 99/238)", a, b)
	}
}

func relDiff(got, want float64) float64 { return math.Abs(got-want) / math.Abs(want) }

var (
	b500 = BilinearSteel{Fy: 500, Es: 200000}
	c30  = EC2ParabolaRectangle(30)
)

func mustCurve(t *testing.T, s Section, dir Direction, opt *Options) *Curve {
	t.Helper()
	c, err := MomentCurvature(context.Background(), s, dir, opt)
	if err != nil {
		t.Fatalf("MomentCurvature(%s): %v", dir, err)
	}
	return c
}

// TestSinglyReinforcedEC2 compares a 300 × 500 beam with 1500 mm² at
// d = 450 mm (fc = 30, fy = 500 MPa) with hand calculations.
func TestSinglyReinforcedEC2(t *testing.T) {
	t.Parallel()
	const (
		b, h, d, as, fc, fy = 300.0, 500.0, 450.0, 1500.0, 30.0, 500.0
	)
	s := rectBeam(b, h, 1, c30, layer(b, h-d, as, 3, b500))
	c := mustCurve(t, s, Sagging, nil)

	// EN 1992-1-1 §3.1.7(3) rectangular block, λ = 0.8, η = 1 (fck ≤ 50):
	//   x = As·fy/(η·fc·λ·b) = 750 000/(0.8·30·300) = 104.17 mm
	//   M = As·fy·(d - λx/2)  = 750 000·(450 - 41.67) = 306.25 kN·m
	xBlock := as * fy / (1 * fc * 0.8 * b)
	mBlock := as * fy * (d - 0.8*xBlock/2) / 1e6
	// Parabola–rectangle integrated exactly (prBlock): x = As·fy/(α·fc·b),
	// M = As·fy·(d - β·x) = 305.41 kN·m.
	alpha, beta := prBlock(2, 0.002, 0.0035)
	xPR := as * fy / (alpha * fc * b)
	mPR := as * fy * (d - beta*xPR) / 1e6

	// Block against parabola: the block is a fit to the parabola, 1.5 %.
	if r := relDiff(c.CapacityKNm, mBlock); r > 0.015 {
		t.Errorf("capacity = %.2f kN·m, want rectangular block %.2f (diff %.2f %% > 1.5 %%)", c.CapacityKNm, mBlock, 100*r)
	}
	// Exact parabola: 0.1 % covers the 1 mm strips (the limit is checked at
	// the top strip's centre, 0.5 mm below the face) and solver tolerances.
	if r := relDiff(c.CapacityKNm, mPR); r > 0.001 {
		t.Errorf("capacity = %.3f kN·m, want parabola–rectangle %.3f (diff %.3f %% > 0.1 %%)", c.CapacityKNm, mPR, 100*r)
	}
	last := c.Points[len(c.Points)-1]
	if r := relDiff(last.NeutralAxisMM, xPR); r > 0.01 {
		t.Errorf("neutral axis at capacity = %.2f mm, want %.2f (1 %%)", last.NeutralAxisMM, xPR)
	}
	if c.Mode != ModeYieldThenCrush {
		t.Errorf("mode = %v, want %v (steel strain at crushing ≈ %.4f > εy)", c.Mode, ModeYieldThenCrush, 0.0035*(d-xPR)/xPR)
	}
	if !(c.KappaYield > 0 && c.KappaYield < c.KappaAtPeak) {
		t.Errorf("KappaYield = %g, want within (0, KappaAtPeak = %g)", c.KappaYield, c.KappaAtPeak)
	}
	// At first yield the bar strain is fy/Es (definition; 1e-6 relative
	// covers the bisection in curvature).
	for _, p := range c.Points {
		if p.KappaPerM == c.KappaYield && relDiff(p.SteelStrain, fy/200000) > 1e-6 {
			t.Errorf("steel strain at first yield = %g, want %g", p.SteelStrain, fy/200000)
		}
	}
	t.Logf("capacity %.3f kN·m; EC2 block %.3f (%.2f %%), exact parabola %.3f (%.3f %%); x = %.2f mm vs %.2f",
		c.CapacityKNm, mBlock, 100*(c.CapacityKNm/mBlock-1), mPR, 100*(c.CapacityKNm/mPR-1), last.NeutralAxisMM, xPR)

	// Capacity (fast path) must agree with the curve: same method, 1e-6.
	mc, mode, err := Capacity(context.Background(), s, Sagging, nil)
	if err != nil || relDiff(mc, c.CapacityKNm) > 1e-6 || mode != c.Mode {
		t.Errorf("Capacity = %g, %v, %v; want %g, %v", mc, mode, err, c.CapacityKNm, c.Mode)
	}
}

// beta1 is the ACI 318-19 Table 22.2.2.4.3 factor: 0.85 up to 28 MPa, less
// 0.05 per 7 MPa above, not below 0.65.
func beta1(fc float64) float64 {
	return math.Max(0.65, math.Min(0.85, 0.85-0.05*(fc-28)/7))
}

// TestACIBlock compares with the ACI 318 equivalent rectangular block
// (22.2.2.4.1: 0.85 f'c over a = β1·c, εcu = 0.003 by 22.2.2.1).
//
// The fibre model uses a parabola–rectangle with fc = 0.85 f'c, εc2 = 2 ‰ and
// εcu = 3 ‰. The assumptions differ: ACI's block has the force 0.85·β1·f'c·c
// at β1·c/2, the parabola 0.778·0.85·f'c·x at 0.405·x. Both balance the same
// yielded steel force, so the moments differ only through the lever arm,
// by less than 1 % for these under-reinforced beams; tolerance 1.5 %.
func TestACIBlock(t *testing.T) {
	t.Parallel()
	tests := []struct {
		name                string
		fc, fy, b, d, h, as float64
		published           float64 // kN·m, 0 if none
	}{
		// Published: the SI worked example "Example 4-1M Analysis of Singly
		// Reinforced Beams: Tension Steel Yielding" of a reinforced-concrete
		// textbook to ACI 318 (found with the search tool; attributed from
		// memory to Wight & MacGregor, Reinforced Concrete: Mechanics and
		// Design): f'c = 20 MPa, fy = 420 MPa, b = 250, d = 500, h = d + 65 mm,
		// 3 No. 25 = 1530 mm²: a = 151 mm, c = 178 mm, Mn = 273 kN·m.
		{"textbook Example 4-1M", 20, 420, 250, 500, 565, 1530, 273},
		// Hand calculation with β1 = 0.80 (f'c = 35 MPa).
		{"f'c 35 MPa, β1 0.80", 35, 420, 300, 550, 600, 2000, 0},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			a := tc.as * tc.fy / (0.85 * tc.fc * tc.b)
			c := a / beta1(tc.fc)
			mn := tc.as * tc.fy * (tc.d - a/2) / 1e6
			if tc.published != 0 && relDiff(mn, tc.published) > 0.002 {
				t.Fatalf("hand Mn = %.2f kN·m, published %.0f (rounding 0.2 %%)", mn, tc.published)
			}
			steel := BilinearSteel{Fy: tc.fy, Es: 200000}
			conc := ParabolaRectangle{Fc: 0.85 * tc.fc, EpsC2: 0.002, EpsCU2: 0.003, N: 2}
			s := rectBeam(tc.b, tc.h, 1, conc, layer(tc.b, tc.h-tc.d, tc.as, 3, steel))
			cv := mustCurve(t, s, Sagging, nil)
			if r := relDiff(cv.CapacityKNm, mn); r > 0.015 {
				t.Errorf("capacity = %.2f kN·m, want ACI Mn %.2f (diff %.2f %% > 1.5 %%)", cv.CapacityKNm, mn, 100*r)
			}
			// The steel must be yielding at εcu = 0.003 (ACI εt = 0.003(d-c)/c > εy).
			if et := 0.003 * (tc.d - c) / c; et < tc.fy/200000 || cv.Mode != ModeYieldThenCrush {
				t.Errorf("εt = %.4f, mode %v: want yielding steel and %v", et, cv.Mode, ModeYieldThenCrush)
			}
			x := cv.Points[len(cv.Points)-1].NeutralAxisMM
			t.Logf("capacity %.2f kN·m vs ACI %.2f (%.2f %%); neutral axis %.1f mm vs ACI c = %.1f (β1 = %.2f; the shapes differ)",
				cv.CapacityKNm, mn, 100*(cv.CapacityKNm/mn-1), x, c, beta1(tc.fc))
		})
	}
}

// TestDoublyReinforced: compression steel that stays elastic, by strain
// compatibility (hand calculation with the exact parabola–rectangle block).
// 300 × 500, fc = 30, As = 2400 mm² at d = 450, As' = 1000 mm² at d' = 60.
// With εcu = 3.5 ‰ at the top and yielded tension steel:
//
//	α·fc·b·x + Es·εcu·As'·(x - d')/x = As·fy
//	⇒ α·fc·b·x² + (Es·εcu·As' - As·fy)·x - Es·εcu·As'·d' = 0   (x ≈ 117.6 mm)
//	εs' = εcu·(x - d')/x ≈ 1.71 ‰ < εy = 2.5 ‰
//	M = α·fc·b·x·(d - β·x) + Es·εs'·As'·(d - d')   (about the tension steel; N = 0)
//
// The concrete displaced by the bars is not deducted (neither in the model).
func TestDoublyReinforced(t *testing.T) {
	t.Parallel()
	const (
		b, h, d, d2, as, as2, fc, fy, es, ecu = 300.0, 500.0, 450.0, 60.0, 2400.0, 1000.0, 30.0, 500.0, 200000.0, 0.0035
	)
	alpha, beta := prBlock(2, 0.002, ecu)
	qa := alpha * fc * b
	qb := es*ecu*as2 - as*fy
	qc := -es * ecu * as2 * d2
	x := (-qb + math.Sqrt(qb*qb-4*qa*qc)) / (2 * qa)
	eps2 := ecu * (x - d2) / x
	if eps2 >= fy/es {
		t.Fatalf("hand calculation: compression steel strain %g should be elastic", eps2)
	}
	mHand := (qa*x*(d-beta*x) + es*eps2*as2*(d-d2)) / 1e6

	s := rectBeam(b, h, 1, c30, layer(b, h-d, as, 4, b500), layer(b, h-d2, as2, 2, b500))
	c := mustCurve(t, s, Sagging, nil)
	if r := relDiff(c.CapacityKNm, mHand); r > 0.002 {
		t.Errorf("capacity = %.3f kN·m, want %.3f (diff %.3f %% > 0.2 %%: strips and limit at strip centre)", c.CapacityKNm, mHand, 100*r)
	}
	last := c.Points[len(c.Points)-1]
	// Compression bar strain at the end from the plane section (lever of
	// the bar from the centroid is -(h/2 - d2) for sagging).
	e2 := last.RefStrain + last.KappaPerM/1000*(-(h/2 - d2))
	if r := relDiff(-e2, eps2); r > 0.01 {
		t.Errorf("compression steel strain = %.5f, want %.5f (1 %%)", -e2, eps2)
	}
	if c.Mode != ModeYieldThenCrush {
		t.Errorf("mode = %v, want %v", c.Mode, ModeYieldThenCrush)
	}
	t.Logf("capacity %.3f kN·m, hand %.3f (%.3f %%); x = %.2f mm vs %.2f; εs' = %.5f vs %.5f",
		c.CapacityKNm, mHand, 100*(c.CapacityKNm/mHand-1), last.NeutralAxisMM, x, -e2, eps2)
}

// TestOverReinforced: 6000 mm² at d = 450 in a 300 × 500 beam (fc = 30).
// Strain compatibility with elastic steel at εcu = 3.5 ‰:
//
//	α·fc·b·x = Es·εcu·(d - x)/x·As ⇒ α·fc·b·x² + Es·εcu·As·x - Es·εcu·As·d = 0   (x ≈ 297 mm)
//	εs = εcu·(d - x)/x ≈ 1.8 ‰ < εy,  M = α·fc·b·x·(d - β·x)
func TestOverReinforced(t *testing.T) {
	t.Parallel()
	const (
		b, h, d, as, fc, es, ecu = 300.0, 500.0, 450.0, 6000.0, 30.0, 200000.0, 0.0035
	)
	alpha, beta := prBlock(2, 0.002, ecu)
	qa := alpha * fc * b
	qb := es * ecu * as
	x := (-qb + math.Sqrt(qb*qb+4*qa*qb*d)) / (2 * qa)
	epsS := ecu * (d - x) / x
	mHand := qa * x * (d - beta*x) / 1e6

	s := rectBeam(b, h, 1, c30, layer(b, h-d, as, 6, b500))
	c := mustCurve(t, s, Sagging, nil)
	if c.Mode != ModeCrushSteelElastic {
		t.Errorf("mode = %v, want %v (hand steel strain %.5f < εy 0.0025)", c.Mode, ModeCrushSteelElastic, epsS)
	}
	if c.KappaYield != 0 {
		t.Errorf("KappaYield = %g, want 0 (steel stays elastic)", c.KappaYield)
	}
	if r := relDiff(c.CapacityKNm, mHand); r > 0.002 {
		t.Errorf("capacity = %.3f kN·m, want %.3f (diff %.3f %% > 0.2 %%)", c.CapacityKNm, mHand, 100*r)
	}
	last := c.Points[len(c.Points)-1]
	if r := relDiff(last.SteelStrain, epsS); r > 0.01 {
		t.Errorf("steel strain at crushing = %.5f, want %.5f (1 %%)", last.SteelStrain, epsS)
	}
	t.Logf("capacity %.3f kN·m, hand %.3f (%.3f %%); εs %.5f vs %.5f", c.CapacityKNm, mHand, 100*(c.CapacityKNm/mHand-1), last.SteelStrain, epsS)
}

// TestNoTensionSteel: with no concrete tensile strength (EN 1992-1-1
// §6.1(2)P, tensile strength ignored) and no bars, N = 0 needs zero
// compression, so the moment is zero at every curvature (analytic).
// Tolerance 1e-9 kN·m: the force tolerance times the lever.
func TestNoTensionSteel(t *testing.T) {
	t.Parallel()
	s := rectBeam(300, 500, 5, c30)
	c := mustCurve(t, s, Sagging, nil)
	if c.CapacityKNm > 1e-9 {
		t.Errorf("capacity = %g kN·m, want 0", c.CapacityKNm)
	}
	if c.Mode != ModeNoCapacity {
		t.Errorf("mode = %v, want %v", c.Mode, ModeNoCapacity)
	}
	for _, p := range c.Points {
		if math.Abs(p.MomentKNm) > 1e-9 {
			t.Fatalf("moment at κ = %g is %g, want 0", p.KappaPerM, p.MomentKNm)
		}
	}
}

// twoLayer is a 300 × 500 beam on a 5 mm grid with bars at 50 mm from the
// bottom (asBot) and from the top (asTop).
func twoLayer(asBot, asTop float64) Section {
	s := Section{Fibres: grid(0, 0, 300, 500, 5, 5, c30), Outline: []Rect{{0, 0, 300, 500}}}
	if asBot > 0 {
		s.Fibres = append(s.Fibres, layer(300, 50, asBot, 3, b500)...)
	}
	if asTop > 0 {
		s.Fibres = append(s.Fibres, layer(300, 450, asTop, 2, b500)...)
	}
	return s
}

// TestSymmetry: mirror symmetry of the section about mid-depth (analytic):
// a symmetric section has equal sagging and hogging capacity, and mirroring
// the bars swaps the two. Tolerance 1e-6 relative: equilibrium tolerance
// only, the grids are mirror images.
func TestSymmetry(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	capOf := func(s Section, dir Direction) float64 {
		m, _, err := Capacity(ctx, s, dir, nil)
		if err != nil {
			t.Fatalf("Capacity(%s): %v", dir, err)
		}
		return m
	}
	sym := twoLayer(1473, 1473)
	if sg, hg := capOf(sym, Sagging), capOf(sym, Hogging); relDiff(sg, hg) > 1e-6 {
		t.Errorf("symmetric section: sagging %.6f, hogging %.6f kN·m, want equal", sg, hg)
	}
	a := twoLayer(1473, 226)
	bm := twoLayer(226, 1473)
	sa, ha := capOf(a, Sagging), capOf(a, Hogging)
	sb, hb := capOf(bm, Sagging), capOf(bm, Hogging)
	if relDiff(sa, hb) > 1e-6 || relDiff(ha, sb) > 1e-6 {
		t.Errorf("mirrored bars: sagging/hogging %.6f/%.6f and %.6f/%.6f kN·m, want swapped", sa, ha, sb, hb)
	}
	if !(ha < sa) {
		t.Errorf("hogging %.3f should be below sagging %.3f with the larger bars at the bottom", ha, sa)
	}
}

// TestAxial checks the axial capacities of a 300 × 500 section with
// 1500 mm² at the top and at the bottom (fc = 30, fy = 500, Es = 200 000).
func TestAxial(t *testing.T) {
	t.Parallel()
	const (
		b, h, as, fc, fy, es = 300.0, 500.0, 1500.0, 30.0, 500.0, 200000.0
	)
	s := rectBeam(b, h, 1, c30, layer(b, 50, as, 3, b500), layer(b, h-50, as, 3, b500))
	comp, tens, err := AxialCapacity(s)
	if err != nil {
		t.Fatal(err)
	}
	// Uniform strain up to εcu2 = 3.5 ‰ > εy: N = fc·Ac + fy·As (gross
	// concrete, bars not deducted) = 4500 + 1500 = 6000 kN. Exact sums: 1e-9.
	if want := (fc*b*h + fy*2*as) / 1000; relDiff(comp, want) > 1e-9 {
		t.Errorf("compression capacity = %.6f kN, want %.6f", comp, want)
	}
	if want := fy * 2 * as / 1000; relDiff(tens, want) > 1e-9 {
		t.Errorf("tension capacity = %.6f kN, want %.6f (no concrete tension)", tens, want)
	}
	// EN 1992-1-1 §6.1(5) variant: strain limited to εc2 = 2 ‰, bars at
	// min(fy, Es·0.002) = 400 MPa: 4500 + 1200 = 5700 kN.
	n2, err := AxialForce(s, -0.002)
	if err != nil {
		t.Fatal(err)
	}
	if want := (fc*b*h + math.Min(fy, es*0.002)*2*as) / 1000; relDiff(n2, want) > 1e-9 {
		t.Errorf("AxialForce(-0.002) = %.6f kN, want %.6f", n2, want)
	}

	// Balanced point by hand: εcu = 3.5 ‰ at the top when the bottom bar
	// reaches εy = 2.5 ‰ (d = 450): x = 3.5/(3.5 + 2.5)·450 = 262.5 mm; the
	// top bar (d' = 50) has 3.5·212.5/262.5 = 2.83 ‰ > εy, so it yields.
	//   N = α·fc·b·x + fy·As' - fy·As = 1912.5 kN
	//   M = α·fc·b·x·(h/2 - β·x) + fy·As'·(h/2 - 50) + fy·As·(450 - h/2)   (about mid-depth)
	alpha, beta := prBlock(2, 0.002, 0.0035)
	x := 0.0035 / (0.0035 + fy/es) * 450
	nb := alpha * fc * b * x / 1000
	mb := (alpha*fc*b*x*(h/2-beta*x) + fy*as*(h/2-50) + fy*as*(450-h/2)) / 1e6
	m, mode, err := Capacity(context.Background(), s, Sagging, &Options{AxialKN: nb})
	if err != nil {
		t.Fatal(err)
	}
	// 0.5 %: strips of 1 mm and the limit checked at the top strip's
	// centre; the two limits coincide, so either mode words may result.
	if r := relDiff(m, mb); r > 0.005 {
		t.Errorf("balanced point: M(N = %.1f kN) = %.2f kN·m, want %.2f (diff %.2f %% > 0.5 %%)", nb, m, mb, 100*r)
	}
	t.Logf("balanced point N = %.1f kN: M = %.2f kN·m (%v), hand %.2f (%.3f %%)", nb, m, mode, mb, 100*(m/mb-1))

	pts, err := Interaction(context.Background(), s, Sagging, 7)
	if err != nil {
		t.Fatal(err)
	}
	if pts[0].AxialKN != -tens || pts[6].AxialKN != comp || pts[0].MomentKNm != 0 || pts[6].MomentKNm != 0 {
		t.Errorf("interaction ends = %+v, %+v: want (-%g, 0) and (%g, 0)", pts[0], pts[6], tens, comp)
	}
	for _, p := range pts[1:6] {
		if !(p.MomentKNm > 0) {
			t.Errorf("interaction point %+v: want a positive moment", p)
		}
	}
	t.Logf("interaction: %+v", pts)
}

// TestMeshConvergence: capacity on square grids of 10, 5 and 2.5 mm against
// the exact parabola–rectangle hand values of TestSinglyReinforcedEC2
// (under-reinforced) and TestOverReinforced (concrete governs). The limit
// εcu2 is checked at the top cell centre, half a cell below the face, so the
// crushing state is reached slightly late; where the concrete governs this
// gives a first-order error (half the cell, half the error: the ratio must
// lie in 0.35–0.65). Where the yielded steel governs the moment hardly
// depends on it (0.05 % on every grid). The log gives the change between
// grids.
func TestMeshConvergence(t *testing.T) {
	t.Parallel()
	alpha, beta := prBlock(2, 0.002, 0.0035)
	xu := 1500 * 500 / (alpha * 30 * 300)
	qa, qb := alpha*30*300, 200000*0.0035*6000.0
	xo := (-qb + math.Sqrt(qb*qb+4*qa*qb*450)) / (2 * qa)
	tests := []struct {
		name       string
		as         float64
		want       float64
		tolPerMM   float64 // relative tolerance per mm of cell
		firstOrder bool
	}{
		{"under-reinforced", 1500, 1500 * 500 * (450 - beta*xu) / 1e6, 0.0005 / 10, false},
		{"over-reinforced", 6000, qa * xo * (450 - beta*xo) / 1e6, 0.006 / 10, true},
	}
	for _, tc := range tests {
		var errs, caps []float64
		for _, cell := range []float64{10, 5, 2.5} {
			s := Section{Fibres: grid(0, 0, 300, 500, cell, cell, c30), Outline: []Rect{{0, 0, 300, 500}}}
			s.Fibres = append(s.Fibres, layer(300, 50, tc.as, 3, b500)...)
			m, _, err := Capacity(context.Background(), s, Sagging, nil)
			if err != nil {
				t.Fatal(err)
			}
			e := relDiff(m, tc.want)
			change := "first grid"
			if len(caps) > 0 {
				change = fmt.Sprintf("change from previous grid %+.4f %%", 100*(m/caps[len(caps)-1]-1))
			}
			t.Logf("%s, cell %4.1f mm (%d fibres): capacity %.4f kN·m, hand %.4f, error %.4f %%, %s",
				tc.name, cell, len(s.Fibres)-3, m, tc.want, 100*e, change)
			tol := tc.tolPerMM * 10
			if tc.firstOrder {
				tol = tc.tolPerMM * cell
			}
			if e > tol {
				t.Errorf("%s, cell %g mm: error %.4f %% > %.4f %%", tc.name, cell, 100*e, 100*tol)
			}
			if tc.firstOrder && len(errs) > 0 {
				if r := e / errs[len(errs)-1]; r < 0.35 || r > 0.65 {
					t.Errorf("%s, cell %g mm: error ratio to the coarser grid %.3f, want 0.35–0.65 (first order)", tc.name, cell, r)
				}
			}
			errs, caps = append(errs, e), append(caps, m)
		}
	}
}

// TestScaledStrength: a section whose fibres all carry k·fc (as after a
// uniform heating to a residual factor k) follows the hand calculation with
// fc scaled: x = As·fy/(α·k·fc·b), M = As·fy·(d - β·x). 0.1 % as in
// TestSinglyReinforcedEC2.
func TestScaledStrength(t *testing.T) {
	t.Parallel()
	alpha, beta := prBlock(2, 0.002, 0.0035)
	for _, k := range []float64{1, 0.765, 0.5} {
		conc := ParabolaRectangle{Fc: k * 30, EpsC2: 0.002, EpsCU2: 0.0035, N: 2}
		s := rectBeam(300, 500, 1, conc, layer(300, 50, 1500, 3, b500))
		x := 1500 * 500 / (alpha * k * 30 * 300)
		want := 1500 * 500 * (450 - beta*x) / 1e6
		m, _, err := Capacity(context.Background(), s, Sagging, nil)
		if err != nil {
			t.Fatal(err)
		}
		if r := relDiff(m, want); r > 0.001 {
			t.Errorf("k = %g: capacity %.3f kN·m, want %.3f (diff %.3f %%)", k, m, want, 100*r)
		}
	}
}

// TestRemovedFibres: fibres with a nil material carry nothing. Removing the
// top 20 mm of a 300 × 500 beam leaves the hand calculation with the
// compression face 20 mm lower: M = As·fy·(d - 20 - β·x). With N = 0 the
// moment is a couple, so the reference axis (the gross centroid) does not
// matter. 0.1 % as above.
func TestRemovedFibres(t *testing.T) {
	t.Parallel()
	s := rectBeam(300, 500, 1, c30, layer(300, 50, 1500, 3, b500))
	for i := range s.Fibres {
		if !s.Fibres[i].Bar && s.Fibres[i].YMM > 480 {
			s.Fibres[i].Material = nil
		}
	}
	alpha, beta := prBlock(2, 0.002, 0.0035)
	x := 1500 * 500 / (alpha * 30 * 300)
	want := 1500 * 500 * (430 - beta*x) / 1e6
	c := mustCurve(t, s, Sagging, nil)
	if r := relDiff(c.CapacityKNm, want); r > 0.001 {
		t.Errorf("capacity = %.3f kN·m, want %.3f (diff %.3f %%)", c.CapacityKNm, want, 100*r)
	}
	// The neutral axis depth is still measured from the gross top face.
	if last := c.Points[len(c.Points)-1]; relDiff(last.NeutralAxisMM, 20+x) > 0.01 {
		t.Errorf("neutral axis = %.2f mm, want %.2f below the gross top face", last.NeutralAxisMM, 20+x)
	}
}

// TestFireLaws runs the EN 1992-1-2 laws through the same code. At 20 °C the
// EN 1992-1-2 steel law (fsp = fsy) is elastic–perfectly plastic to 15 %,
// so the capacity equals the bilinear one (1e-6). With the EN 1992-1-2
// concrete law of a heavily reinforced section the descending branch makes
// the moment fall before εcu1; the analysis must end by the 80 % drop rule
// with a last point below 80 % of the peak (the rule's definition).
func TestFireLaws(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	cold := FireSteel{Fsy: 500, Fsp: 500, Es: 200000}
	m1, _, err := Capacity(ctx, rectBeam(300, 500, 1, c30, layer(300, 50, 1500, 3, b500)), Sagging, nil)
	if err != nil {
		t.Fatal(err)
	}
	m2, _, err := Capacity(ctx, rectBeam(300, 500, 1, c30, layer(300, 50, 1500, 3, cold)), Sagging, nil)
	if err != nil {
		t.Fatal(err)
	}
	if relDiff(m1, m2) > 1e-6 {
		t.Errorf("capacity with EN 1992-1-2 steel at 20 °C = %.6f, bilinear %.6f kN·m", m2, m1)
	}

	fc := FireConcrete{Fc: 30, EpsC1: 0.0025, EpsCU1: 0.02}
	c := mustCurve(t, rectBeam(300, 500, 1, fc, layer(300, 50, 6000, 6, b500)), Sagging, nil)
	last := c.Points[len(c.Points)-1]
	if c.Mode != ModeMomentDrop || !(last.MomentKNm < 0.8*c.CapacityKNm) {
		t.Errorf("mode = %v, last moment %.2f of peak %.2f: want %v below 80 %%", c.Mode, last.MomentKNm, c.CapacityKNm, ModeMomentDrop)
	}
	for _, p := range c.Points {
		if p.MomentKNm > c.CapacityKNm {
			t.Fatalf("point %+v above the capacity %g", p, c.CapacityKNm)
		}
	}
}

// TestHoggingWithAxial checks the sign conventions with axial force: under
// compression N the hogging curve of a section with its big bars at the
// top mirrors the sagging curve of the mirrored section (1e-6, symmetry).
func TestHoggingWithAxial(t *testing.T) {
	t.Parallel()
	a := twoLayer(400, 1473)
	bm := twoLayer(1473, 400)
	opt := &Options{AxialKN: 800}
	ca := mustCurve(t, a, Hogging, opt)
	cb := mustCurve(t, bm, Sagging, opt)
	if relDiff(ca.CapacityKNm, cb.CapacityKNm) > 1e-6 || ca.Mode != cb.Mode {
		t.Errorf("hogging %.6f (%v) vs mirrored sagging %.6f (%v)", ca.CapacityKNm, ca.Mode, cb.CapacityKNm, cb.Mode)
	}
	p := ca.Points[len(ca.Points)-1]
	if !(p.ConcreteStrain < 0 && p.SteelStrain > 0 && p.NeutralAxisMM > 0 && p.NeutralAxisMM < 500) {
		t.Errorf("last hogging point %+v: want compression at the bottom, tension at the top bars", p)
	}
}

// TestErrors: bad input gives an error naming the problem, never a panic.
func TestErrors(t *testing.T) {
	t.Parallel()
	good := func() Section { return rectBeam(300, 500, 10, c30, layer(300, 50, 1500, 3, b500)) }
	tests := []struct {
		name string
		s    Section
		dir  Direction
		opt  *Options
		want string
	}{
		{"empty", Section{Outline: []Rect{{0, 0, 1, 1}}}, Sagging, nil, "empty"},
		{"no outline", Section{Fibres: good().Fibres}, Sagging, nil, "Outline"},
		{"bad outline", func() Section { s := good(); s.Outline = []Rect{{0, 0, 0, 500}}; return s }(), Sagging, nil, "Outline[0]"},
		{"NaN area", func() Section { s := good(); s.Fibres[3].AreaMM2 = math.NaN(); return s }(), Sagging, nil, "Fibres[3].AreaMM2"},
		{"negative area", func() Section { s := good(); s.Fibres[4].AreaMM2 = -1; return s }(), Sagging, nil, "Fibres[4].AreaMM2"},
		{"NaN position", func() Section { s := good(); s.Fibres[2].YMM = math.NaN(); return s }(), Sagging, nil, "Fibres[2]"},
		{"bar outside", func() Section {
			s := good()
			s.Fibres = append(s.Fibres, Fibre{XMM: 150, YMM: 520, AreaMM2: 100, Material: b500, Bar: true})
			return s
		}(), Sagging, nil, "outside"},
		{"NaN material", func() Section {
			s := good()
			s.Fibres[7].Material = ParabolaRectangle{Fc: math.NaN(), EpsC2: 0.002, EpsCU2: 0.0035, N: 2}
			return s
		}(), Sagging, nil, "Fibres[7].Material"},
		{"no compression fibre", Section{Fibres: layer(300, 50, 1500, 3, b500), Outline: []Rect{{0, 0, 300, 500}}}, Sagging, nil, "no concrete fibre"},
		{"all removed", func() Section {
			s := good()
			for i := range s.Fibres {
				if !s.Fibres[i].Bar {
					s.Fibres[i].Material = nil
				}
			}
			return s
		}(), Sagging, nil, "no concrete fibre"},
		{"direction", good(), Direction("sideways"), nil, "direction"},
		{"step", good(), Sagging, &Options{Step: -1}, "Step"},
		{"drop", good(), Sagging, &Options{DropFraction: 2}, "DropFraction"},
		{"NaN axial", good(), Sagging, &Options{AxialKN: math.NaN()}, "AxialKN"},
		{"axial above squash", good(), Sagging, &Options{AxialKN: 5300}, "AxialKN"}, // squash 4500 + 750 kN
		{"axial below tension", good(), Hogging, &Options{AxialKN: -800}, "AxialKN"},
	}
	for _, tc := range tests {
		_, err := MomentCurvature(context.Background(), tc.s, tc.dir, tc.opt)
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: MomentCurvature error = %v, want one containing %q", tc.name, err, tc.want)
		}
		if _, _, err := Capacity(context.Background(), tc.s, tc.dir, tc.opt); err == nil {
			t.Errorf("%s: Capacity error = nil", tc.name)
		}
	}
	if _, _, err := AxialCapacity(Section{}); err == nil {
		t.Error("AxialCapacity(empty) = nil error")
	}
	if _, err := Interaction(context.Background(), good(), Sagging, 1); err == nil {
		t.Error("Interaction(n = 1) = nil error")
	}
	if _, err := AxialForce(good(), math.Inf(-1)); err == nil {
		t.Error("AxialForce(-Inf) = nil error")
	}
}

// TestCancel: a cancelled context stops the analysis with its error.
func TestCancel(t *testing.T) {
	t.Parallel()
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	_, err := MomentCurvature(ctx, rectBeam(300, 500, 10, c30, layer(300, 50, 1500, 3, b500)), Sagging, nil)
	if !errors.Is(err, context.Canceled) {
		t.Errorf("error = %v, want context.Canceled", err)
	}
}

// customLaw is a Material outside this package whose type cannot be a map
// key (it holds a slice): the section must still work, one group per fibre.
type customLaw struct{ pts []float64 }

func (c customLaw) Stress(e float64) float64 { return prStress(e, c.pts[0], 0.002, 2) }
func (c customLaw) Limits() (float64, float64) {
	return -0.0035, math.Inf(1)
}

// TestCustomMaterial: a user law equal to the parabola gives the same
// capacity through the interface path (1e-9, same arithmetic).
func TestCustomMaterial(t *testing.T) {
	t.Parallel()
	s1 := rectBeam(300, 500, 5, c30, layer(300, 50, 1500, 3, b500))
	s2 := rectBeam(300, 500, 5, customLaw{pts: []float64{30}}, layer(300, 50, 1500, 3, b500))
	m1, _, err1 := Capacity(context.Background(), s1, Sagging, nil)
	m2, _, err2 := Capacity(context.Background(), s2, Sagging, nil)
	if err1 != nil || err2 != nil || relDiff(m1, m2) > 1e-9 {
		t.Errorf("capacities %g (%v) and %g (%v), want equal", m1, err1, m2, err2)
	}
}

// TestSofteningUnderAxialLoad: a plain section with the EN 1992-1-2
// concrete law (descending branch) under 30 % of its squash load, followed
// to a 5 % drop, softens until no strain state carries the force. The
// analysis must end without an error at the last equilibrium, within the
// limit strain εcu1 (definition of the limit), with the mode saying so.
func TestSofteningUnderAxialLoad(t *testing.T) {
	t.Parallel()
	fc := FireConcrete{Fc: 30, EpsC1: 0.0025, EpsCU1: 0.02}
	s := rectBeam(300, 500, 1, fc)
	comp, _, err := AxialCapacity(s)
	if err != nil {
		t.Fatal(err)
	}
	// Uniform strain at εc1 gives fc over the gross area (EN 1992-1-2
	// Figure 3.1 peak): 4500 kN, 1e-9.
	if relDiff(comp, 30*300*500/1000) > 1e-9 {
		t.Errorf("squash load = %g kN, want 4500", comp)
	}
	c := mustCurve(t, s, Sagging, &Options{AxialKN: 0.3 * comp, DropFraction: 0.05})
	last := c.Points[len(c.Points)-1]
	if c.Mode != ModeAxialLoss && c.Mode != ModeMomentDrop && c.Mode != ModeCrushSteelElastic {
		t.Errorf("mode = %v, want the axial force lost, a moment drop or crushing", c.Mode)
	}
	if last.ConcreteStrain < -0.02 || !(c.CapacityKNm > 0) {
		t.Errorf("last point %+v, capacity %g: want within εcu1 and a positive capacity", last, c.CapacityKNm)
	}
	t.Logf("N = %.0f kN: capacity %.2f kN·m, %v at κ = %.4f 1/m", 0.3*comp, c.CapacityKNm, c.Mode, c.KappaUltimate)
}
