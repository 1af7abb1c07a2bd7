package thermal

import (
	"fmt"
	"math"
)

// Conductivity selects the EN 1992-1-2 §3.3.3 thermal conductivity limit.
type Conductivity string

// Conductivity limits of EN 1992-1-2 §3.3.3(2).
const (
	Lower Conductivity = "lower" // default; the limit used for EN 1992-1-2 Annex A
	Upper Conductivity = "upper"
)

// Aggregate is the concrete's aggregate type.
type Aggregate string

// Aggregate types. Siliceous and calcareous normal-weight concrete share the
// EN 1992-1-2 §3.3 thermal properties.
const (
	Siliceous   Aggregate = "siliceous"
	Calcareous  Aggregate = "calcareous"
	Lightweight Aggregate = "lightweight"
)

// Concrete selects the thermal properties of the concrete.
//
// Normal-weight concrete (siliceous, calcareous; "" = siliceous) follows
// EN 1992-1-2:2004 §3.3: conductivity lower (default) or upper limit, specific
// heat with the moisture peak for MoisturePct u, density falling with
// temperature. Lightweight concrete follows EN 1994-1-2:2005 §3.3.2:
// λ = 1.0 − θ/1600 W/mK up to 800 °C and 0.5 above, c = 840 J/kgK, constant
// density; MoisturePct and Conductivity are then not used.
type Concrete struct {
	Aggregate    Aggregate
	MoisturePct  float64      // u, 0–4 % by weight (EN 1992-1-2 §3.3.2)
	Conductivity Conductivity // "lower" (default) | "upper"
	DensityKgM3  float64      // ρ at 20 °C; 0 = 2300 (normal weight, accepted 2000–2600) / 1800 (lightweight, 1600–2000)
}

// material is a set of thermal properties as functions of temperature, °C.
// Solve uses the EN properties; tests use constant properties.
type material interface {
	conductivity(theta float64) float64 // λ, W/mK
	heatCapacity(theta float64) float64 // ρ·c_p, J/m³K (density at θ times specific heat)
}

// enConcrete is Concrete after validation and defaults.
type enConcrete struct {
	light bool
	upper bool
	u     float64
	rho20 float64
}

func (c Concrete) material() (enConcrete, error) {
	var m enConcrete
	switch c.Aggregate {
	case "", Siliceous, Calcareous:
	case Lightweight:
		m.light = true
	default:
		return m, fmt.Errorf("thermal: Concrete.Aggregate = %q unknown (accepted siliceous, calcareous, lightweight)", c.Aggregate)
	}
	switch c.Conductivity {
	case "", Lower:
	case Upper:
		m.upper = true
	default:
		return m, fmt.Errorf("thermal: Concrete.Conductivity = %q unknown (accepted lower, upper)", c.Conductivity)
	}
	if !(c.MoisturePct >= 0 && c.MoisturePct <= 4) {
		return m, fmt.Errorf("thermal: Concrete.MoisturePct = %g out of range (accepted 0–4 %% by weight)", c.MoisturePct)
	}
	m.u = c.MoisturePct
	m.rho20 = c.DensityKgM3
	lo, hi, def := 2000.0, 2600.0, 2300.0
	if m.light {
		lo, hi, def = 1600, 2000, 1800
	}
	if m.rho20 == 0 {
		m.rho20 = def
	}
	if !(m.rho20 >= lo && m.rho20 <= hi) {
		return m, fmt.Errorf("thermal: Concrete.DensityKgM3 = %g out of range (accepted %g–%g for %s concrete)", c.DensityKgM3, lo, hi, map[bool]string{false: "normal-weight", true: "lightweight"}[m.light])
	}
	return m, nil
}

// ConductivityAt returns λ_c(θ), W/mK, EN 1992-1-2 §3.3.3(2) for normal-weight
// concrete (held at its 20 °C and 1200 °C values outside 20–1200 °C) or
// EN 1994-1-2 §3.3.2 for lightweight concrete.
func (c Concrete) ConductivityAt(theta float64) (float64, error) {
	m, err := c.material()
	if err != nil {
		return 0, err
	}
	return m.conductivity(theta), nil
}

// SpecificHeatAt returns c_p(θ), J/kgK (EN 1992-1-2 §3.3.2 with the moisture
// peak; EN 1994-1-2 §3.3.2 for lightweight concrete).
func (c Concrete) SpecificHeatAt(theta float64) (float64, error) {
	m, err := c.material()
	if err != nil {
		return 0, err
	}
	return m.specificHeat(theta), nil
}

// DensityAt returns ρ(θ), kg/m³ (EN 1992-1-2 §3.3.2(3); constant for lightweight concrete).
func (c Concrete) DensityAt(theta float64) (float64, error) {
	m, err := c.material()
	if err != nil {
		return 0, err
	}
	return m.density(theta), nil
}

func clampTheta(theta float64) float64 { return math.Max(20, math.Min(1200, theta)) }

func (m enConcrete) conductivity(theta float64) float64 {
	th := clampTheta(theta)
	if m.light {
		if th <= 800 {
			return 1 - th/1600
		}
		return 0.5
	}
	r := th / 100
	if m.upper {
		return 2 - 0.2451*r + 0.0107*r*r
	}
	return 1.36 - 0.136*r + 0.0057*r*r
}

// peakCp returns c_p,peak, J/kgK, for moisture u %: 900 / 1470 / 2020 at
// 0 / 1.5 / 3 % (EN 1992-1-2 §3.3.2(2)), linear in between and extrapolated
// linearly with the 1.5–3 % slope above 3 % (2387 J/kgK at 4 %).
func peakCp(u float64) float64 {
	if u <= 1.5 {
		return 900 + (1470-900)*u/1.5
	}
	return 1470 + (2020-1470)*(u-1.5)/1.5
}

func dryCp(th float64) float64 {
	switch {
	case th <= 100:
		return 900
	case th <= 200:
		return 900 + (th - 100)
	case th <= 400:
		return 1000 + (th-200)/2
	default:
		return 1100
	}
}

func (m enConcrete) specificHeat(theta float64) float64 {
	th := clampTheta(theta)
	if m.light {
		return 840
	}
	dry := dryCp(th)
	if m.u == 0 || th <= 100 || th > 200 {
		return dry
	}
	// Moisture peak: constant c_p,peak on (100, 115], then linear to the dry
	// value 1000 J/kgK at 200 °C. Never below the dry curve.
	p := math.Max(peakCp(m.u), dryCp(115))
	if th <= 115 {
		return p
	}
	return p + (1000-p)*(th-115)/85
}

func (m enConcrete) density(theta float64) float64 {
	if m.light {
		return m.rho20
	}
	th := clampTheta(theta)
	var f float64
	switch {
	case th <= 115:
		f = 1
	case th <= 200:
		f = 1 - 0.02*(th-115)/85
	case th <= 400:
		f = 0.98 - 0.03*(th-200)/200
	default:
		f = 0.95 - 0.07*(th-400)/800
	}
	return m.rho20 * f
}

func (m enConcrete) heatCapacity(theta float64) float64 {
	return m.density(theta) * m.specificHeat(theta)
}

// constMaterial has constant properties (analytic test solutions).
type constMaterial struct{ k, rhoC float64 }

func (c constMaterial) conductivity(float64) float64 { return c.k }
func (c constMaterial) heatCapacity(float64) float64 { return c.rhoC }

// Property tables over temperature, used by the solver instead of the formulas.
const (
	tabMaxC = 2000 // table range 0–2000 °C at 1 °C
	invPerC = 4    // inverse-enthalpy entries per °C of the smallest heat capacity
)

// tables holds λ(θ) at 1 °C, H(θ) = ∫₀^θ ρc dθ at 1 °C and the inverse θ(H)
// on a uniform enthalpy grid.
type tables struct {
	lam, dlam []float64  // λ at k °C and λ(k+1) − λ(k)
	h         []float64  // H at k °C, J/m³
	inv       []invEntry // at H = j·dH
	invDH     float64    // 1/dH
	dH        float64
	lamMax    float64 // max λ, W/mK
	cMin      float64 // min slope of H, J/m³K
}

func newTables(m material) *tables {
	t := &tables{}
	n := tabMaxC + 1
	t.lam = make([]float64, n)
	t.dlam = make([]float64, n)
	t.h = make([]float64, n)
	for k := 0; k < n; k++ {
		t.lam[k] = m.conductivity(float64(k))
		t.lamMax = math.Max(t.lamMax, t.lam[k])
	}
	for k := 0; k+1 < n; k++ {
		t.dlam[k] = t.lam[k+1] - t.lam[k]
	}
	t.cMin = math.Inf(1)
	for k := 1; k < n; k++ {
		// Composite Simpson over 4 sub-intervals: exact for the piecewise
		// quadratic ρ·c of EN 1992-1-2 between its integer breakpoints, up to
		// the jump at 100 °C, which is taken on its right-hand value.
		a := float64(k - 1)
		const s = 4
		sum := 0.0
		for i := 0; i < s; i++ {
			x0 := a + float64(i)/s
			x1 := x0 + 1.0/s
			f0 := m.heatCapacity(x0 + 1e-9)
			fm := m.heatCapacity((x0 + x1) / 2)
			f1 := m.heatCapacity(x1 - 1e-9)
			sum += (f0 + 4*fm + f1) / 6 / s
		}
		t.h[k] = t.h[k-1] + sum
		t.cMin = math.Min(t.cMin, sum)
	}
	t.dH = t.cMin / invPerC
	t.invDH = 1 / t.dH
	nInv := int(t.h[n-1]/t.dH) + 2
	t.inv = make([]invEntry, nInv)
	k := 0
	for j := 0; j < nInv; j++ {
		hj := float64(j) * t.dH
		for k < n-2 && t.h[k+1] < hj {
			k++
		}
		// Linear in the 1 °C bin [k, k+1] (extrapolated past the end).
		th := float64(k) + (hj-t.h[k])/(t.h[k+1]-t.h[k])
		t.inv[j].th = th
		t.inv[j].lam = t.conductivity(th)
	}
	for j := 0; j+1 < nInv; j++ {
		t.inv[j].dth = t.inv[j+1].th - t.inv[j].th
		t.inv[j].dlam = t.inv[j+1].lam - t.inv[j].lam
	}
	t.inv[nInv-1].dth = t.inv[nInv-2].dth
	return t
}

// invEntry is one row of the inverse table: θ and λ at H = j·dH and their
// increments to the next row, so that one lookup gives both.
type invEntry struct{ th, dth, lam, dlam float64 }

// conductivity returns λ(θ) by table.
func (t *tables) conductivity(theta float64) float64 {
	k := int(theta)
	if k < 0 {
		k = 0
	} else if k > tabMaxC-1 {
		k = tabMaxC - 1
	}
	return t.lam[k] + (theta-float64(k))*t.dlam[k]
}

// enthalpy returns H(θ), J/m³, by table.
func (t *tables) enthalpy(theta float64) float64 {
	k := int(theta)
	if k < 0 {
		k = 0
	} else if k > tabMaxC-1 {
		k = tabMaxC - 1
	}
	return t.h[k] + (theta-float64(k))*(t.h[k+1]-t.h[k])
}

// temperature returns θ(H), °C, by the inverse table.
func (t *tables) temperature(h float64) float64 {
	x := h * t.invDH
	j := int(x)
	if j < 0 {
		j = 0
	} else if j > len(t.inv)-2 {
		j = len(t.inv) - 2
	}
	return t.inv[j].th + (x-float64(j))*t.inv[j].dth
}
