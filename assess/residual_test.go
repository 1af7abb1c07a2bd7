package assess

import (
	"math"
	"testing"
)

// Residual factors at their table points. Tolerance 1e-9: the values are
// table entries (or the products the rules define), so only rounding of the
// float arithmetic is allowed.
const tableTol = 1e-9

// TestResidualConcreteEN1994 checks the default concrete model at the rows of
// EN 1992-1-2:2004 Table 3.1 with φ = 0.9 of EN 1994-1-2:2005 Annex C
// (values from research/residual.md §1.1, column "Residual f_c,θ,20/f_c",
// [D] = 0.9 × Table 3.1 siliceous k_c at and above 300 °C).
func TestResidualConcreteEN1994(t *testing.T) {
	cases := []struct {
		agg         string
		theta, want float64
		src         string
	}{
		{"siliceous", 20, 1.00, "Annex C: no loss at or below 100 °C"},
		{"siliceous", 100, 1.00, "Annex C: no loss at or below 100 °C"},
		{"siliceous", 200, 0.8825, "Annex C 100–300 °C branch 1 − 0.235·(200 − 100)/200"},
		{"siliceous", 300, 0.765, "0.9 × 0.85 (Table 3.1)"},
		{"siliceous", 400, 0.675, "0.9 × 0.75"},
		{"siliceous", 500, 0.540, "0.9 × 0.60"},
		{"siliceous", 600, 0.405, "0.9 × 0.45"},
		{"siliceous", 700, 0.270, "0.9 × 0.30"},
		{"siliceous", 800, 0.135, "0.9 × 0.15"},
		{"siliceous", 1000, 0.036, "0.9 × 0.04"},
		{"siliceous", 1200, 0, "0.9 × 0"},
		{"calcareous", 300, 0.819, "0.9 × 0.91 (Table 3.1 calcareous)"},
		{"calcareous", 500, 0.666, "0.9 × 0.74"},
		{"calcareous", 600, 0.540, "0.9 × 0.60"},
		{"calcareous", 700, 0.270, "no credit over siliceous above 600 °C (residual.md §1.2): 0.9 × 0.30"},
		{"lightweight", 300, 0.900, "0.9 × 1.00 (EN 1994-1-2 Table 3.3 LC, from memory)"},
		{"lightweight", 500, 0.684, "0.9 × 0.76"},
	}
	for _, c := range cases {
		got := ResidualConcreteEN1994(c.agg, c.theta).StrengthRatio
		if math.Abs(got-c.want) > tableTol {
			t.Errorf("%s %g °C: ratio %.6f, want %.6f (%s)", c.agg, c.theta, got, c.want, c.src)
		}
	}
	// Peak strain kept at ε_c1(θmax) of Table 3.1: 7.0 ‰ at 300 °C, 15 ‰ at 500 °C.
	for _, c := range []struct{ theta, eps float64 }{{20, 0.0025}, {300, 0.007}, {500, 0.015}, {700, 0.025}} {
		got := ResidualConcreteEN1994("siliceous", c.theta).PeakStrainRatio * 0.0025
		if math.Abs(got-c.eps) > tableTol {
			t.Errorf("ε_c1 at %g °C: %g, want %g (EN 1992-1-2 Table 3.1)", c.theta, got, c.eps)
		}
	}
	// Continuity of the 100–300 °C branch at both ends (our reading of Annex C).
	for _, agg := range []string{"siliceous", "calcareous"} {
		for _, th := range []float64{100, 300} {
			lo := ResidualConcreteEN1994(agg, th-1e-7).StrengthRatio
			hi := ResidualConcreteEN1994(agg, th+1e-7).StrengthRatio
			if math.Abs(lo-hi) > 1e-6 {
				t.Errorf("%s: jump at %g °C: %g → %g", agg, th, lo, hi)
			}
		}
	}
}

// TestResidualConcreteChang2006 checks the alternative model against the
// values research/residual.md §1.6 derives from Chang et al. (2006):
// 0.775 / 0.525 / 0.40 / 0.15 at 300 / 500 / 600 / 800 °C, the branches meeting
// at 0.90 at 200 °C, and peak-strain ratios 1.9 / 3.0 / 3.7 / 5.4.
func TestResidualConcreteChang2006(t *testing.T) {
	for _, c := range []struct{ theta, f, eps float64 }{
		{200, 0.90, 1 + (1500*200+5*200*200)*1e-6},
		{300, 0.775, 1.9},
		{500, 0.525, 3.0},
		{600, 0.40, 3.7},
		{800, 0.15, 5.4},
	} {
		r := ResidualConcreteChang2006("siliceous", c.theta)
		if math.Abs(r.StrengthRatio-c.f) > tableTol {
			t.Errorf("%g °C: strength ratio %.6f, want %.6f", c.theta, r.StrengthRatio, c.f)
		}
		if math.Abs(r.PeakStrainRatio-c.eps) > tableTol {
			t.Errorf("%g °C: peak-strain ratio %.6f, want %.6f", c.theta, r.PeakStrainRatio, c.eps)
		}
	}
	if r := ResidualConcreteChang2006("siliceous", 20); r.StrengthRatio != 1 || r.PeakStrainRatio != 1 {
		t.Errorf("20 °C: %+v, want ratios 1 (unheated reference)", r)
	}
	if r := ResidualConcreteChang2006("siliceous", 1100); r.StrengthRatio != 0 {
		t.Errorf("1100 °C: strength ratio %g, want 0 (linear branch extended to zero)", r.StrengthRatio)
	}
}

// TestResidualSteel checks the steel factors at their table points: the
// residual-by-class working values of research/residual.md §2.2 (anchors
// [C]: hot-rolled 0.95 and cold-worked 0.70 after 800 °C; 1.0 below the
// thresholds of §6) and the hot-strength bound at EN 1992-1-2 Table 3.2a
// class N (hot-rolled 0.78/0.47/0.23 at 500/600/700 °C; cold-worked
// 0.94/0.67/0.40 at 400/500/600 °C) and Table 3.3 (cold-worked prestressing
// class A 0.70/0.50/0.30 at 300/400/500 °C).
func TestResidualSteel(t *testing.T) {
	cases := []struct {
		model, steel string
		theta, want  float64
	}{
		{SteelResidualByClass, SteelHotRolled, 500, 1},
		{SteelResidualByClass, SteelHotRolled, 600, 1},
		{SteelResidualByClass, SteelHotRolled, 800, 0.95},
		{SteelResidualByClass, SteelColdWorked, 450, 1},
		{SteelResidualByClass, SteelColdWorked, 800, 0.70},
		{SteelResidualByClass, SteelQuenchedTempered, 400, 1},
		{SteelResidualByClass, SteelQuenchedTempered, 600, 0.90},
		{SteelResidualByClass, SteelPrestressing, 300, 1},
		{SteelResidualByClass, SteelPrestressing, 500, 0.80},
		{SteelHotStrength, SteelHotRolled, 400, 1},
		{SteelHotStrength, SteelHotRolled, 500, 0.78},
		{SteelHotStrength, SteelHotRolled, 600, 0.47},
		{SteelHotStrength, SteelHotRolled, 700, 0.23},
		{SteelHotStrength, SteelColdWorked, 400, 0.94},
		{SteelHotStrength, SteelColdWorked, 500, 0.67},
		{SteelHotStrength, SteelColdWorked, 600, 0.40},
		{SteelHotStrength, SteelPrestressing, 300, 0.70},
		{SteelHotStrength, SteelPrestressing, 400, 0.50},
		{SteelHotStrength, SteelPrestressing, 500, 0.30},
	}
	for _, c := range cases {
		got := ResidualSteelFactor(c.model, c.steel, c.theta)
		if math.Abs(got-c.want) > tableTol {
			t.Errorf("%s %s %g °C: %.6f, want %.6f", c.model, c.steel, c.theta, got, c.want)
		}
	}
	// Every class: 1.0 up to its threshold, never above 1, non-increasing.
	for _, st := range []string{SteelHotRolled, SteelColdWorked, SteelQuenchedTempered, SteelPrestressing} {
		if k := ResidualSteelFactor(SteelResidualByClass, st, SteelThresholdC(st)); k != 1 {
			t.Errorf("%s at its threshold %g °C: %g, want 1", st, SteelThresholdC(st), k)
		}
		prev := 1.0
		for th := 20.0; th <= 1200; th += 10 {
			for _, model := range []string{SteelResidualByClass, SteelHotStrength} {
				k := ResidualSteelFactor(model, st, th)
				if k > 1 || k < 0 {
					t.Fatalf("%s %s %g °C: factor %g outside [0, 1]", model, st, th, k)
				}
			}
			k := ResidualSteelFactor(SteelResidualByClass, st, th)
			if k > prev+1e-12 {
				t.Errorf("%s: factor rises from %g to %g at %g °C", st, prev, k, th)
			}
			prev = k
			// the hot strength is a lower bound of the residual strength
			if h := ResidualSteelFactor(SteelHotStrength, st, th); h > k+1e-12 {
				t.Errorf("%s %g °C: hot-strength %g above residual %g", st, th, h, k)
			}
		}
	}
}
