package thermal

import (
	"math"
	"testing"
)

func TestConcreteProperties(t *testing.T) {
	t.Parallel()
	// EN 1992-1-2 §3.3.3(2) conductivity limits, §3.3.2 specific heat with the
	// moisture peak and density, evaluated by hand (thermal.md §2.1 table).
	// Tolerances: 0.001 W/mK (three decimals), 0.5 J/kgK, 0.5 kg/m³.
	lower := Concrete{MoisturePct: 1.5}
	upper := Concrete{MoisturePct: 3, Conductivity: Upper}
	dry := Concrete{}
	cases := []struct {
		theta               float64
		lamLo, lamUp        float64
		cp0, cp15, cp3, rho float64
	}{
		{20, 1.333, 1.951, 900, 900, 900, 2300},
		{100, 1.230, 1.766, 900, 900, 900, 2300},
		{115, 1.211, 1.732, 915, 1470, 2020, 2300},
		{150, 1.169, 1.656, 950, 1276, 1600, 2300 * (1 - 0.02*35/85)},
		{200, 1.111, 1.553, 1000, 1000, 1000, 2300 * 0.98},
		{400, 0.907, 1.191, 1100, 1100, 1100, 2300 * 0.95},
		{1200, 0.549, 0.600, 1100, 1100, 1100, 2300 * 0.88},
	}
	for _, c := range cases {
		lo, _ := lower.ConductivityAt(c.theta)
		up, _ := upper.ConductivityAt(c.theta)
		if !near(lo, c.lamLo, 0.001) || !near(up, c.lamUp, 0.001) {
			t.Errorf("λ(%g) = %.4f / %.4f, want %.3f / %.3f (EN 1992-1-2 §3.3.3)", c.theta, lo, up, c.lamLo, c.lamUp)
		}
		c0, _ := dry.SpecificHeatAt(c.theta)
		c15, _ := lower.SpecificHeatAt(c.theta)
		c3, _ := upper.SpecificHeatAt(c.theta)
		if !near(c0, c.cp0, 0.5) || !near(c15, c.cp15, 0.5) || !near(c3, c.cp3, 0.5) {
			t.Errorf("c_p(%g) = %.1f / %.1f / %.1f, want %g / %g / %g (EN 1992-1-2 §3.3.2)", c.theta, c0, c15, c3, c.cp0, c.cp15, c.cp3)
		}
		rho, _ := dry.DensityAt(c.theta)
		if !near(rho, c.rho, 0.5) {
			t.Errorf("ρ(%g) = %.1f, want %.1f (EN 1992-1-2 §3.3.2(3))", c.theta, rho, c.rho)
		}
	}
	// Moisture between and beyond the published points: linear (EN 1992-1-2 §3.3.2(2));
	// above 3 % extrapolated with the 1.5–3 % slope (our choice, see Concrete).
	for _, c := range []struct{ u, want float64 }{{0.75, 1185}, {2.25, 1745}, {4, 2020 + 550/1.5}} {
		got, _ := Concrete{MoisturePct: c.u}.SpecificHeatAt(110)
		if !near(got, c.want, 0.5) {
			t.Errorf("c_p,peak(u = %g) = %g, want %g", c.u, got, c.want)
		}
	}
	// Lightweight, EN 1994-1-2 §3.3.2: λ = 1 − θ/1600 to 800 °C, 0.5 beyond; c = 840.
	lw := Concrete{Aggregate: Lightweight}
	for _, c := range []struct{ theta, lam float64 }{{20, 1 - 20.0/1600}, {400, 0.75}, {1000, 0.5}} {
		got, _ := lw.ConductivityAt(c.theta)
		cp, _ := lw.SpecificHeatAt(c.theta)
		rho, _ := lw.DensityAt(c.theta)
		if !near(got, c.lam, 1e-12) || cp != 840 || rho != 1800 {
			t.Errorf("lightweight at %g: λ %g c %g ρ %g, want %g, 840, 1800", c.theta, got, cp, rho, c.lam)
		}
	}
}

func TestEnthalpyTables(t *testing.T) {
	t.Parallel()
	m, err := Concrete{MoisturePct: 3}.material()
	if err != nil {
		t.Fatal(err)
	}
	tb := newTables(m)
	// Inversion: θ(H(θ)) = θ within 0.01 °C over the whole range (identity check).
	for th := 0.0; th <= 1500; th += 0.37 {
		if got := tb.temperature(tb.enthalpy(th)); !near(got, th, 0.01) {
			t.Fatalf("θ(H(%g)) = %g, want %g ± 0.01", th, got, th)
		}
	}
	// Latent heat of the moisture peak: ∫₁₀₀²⁰⁰ ρc dθ by hand for u = 3 %:
	// ρ = 2300 to 115 °C then falling; c = 2020 on (100, 115], linear to 1000 at 200.
	// Exact integral by fine midpoint sum; tables within 0.01 %.
	want := 0.0
	const n = 200000
	for i := 0; i < n; i++ {
		th := 100 + (float64(i)+0.5)*100/n
		want += m.heatCapacity(th) * 100 / n
	}
	if got := tb.enthalpy(200) - tb.enthalpy(100); math.Abs(got-want) > 1e-4*want {
		t.Errorf("H(200) − H(100) = %g J/m³, want %g (±0.01 %%)", got, want)
	}
}
