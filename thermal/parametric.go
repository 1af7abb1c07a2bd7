package thermal

import (
	"fmt"
	"math"
)

// Growth is the fire growth rate of EN 1991-1-2 Annex E, which sets t_lim of
// Annex A: "slow" 25 min, "medium" 20 min, "fast" 15 min.
type Growth string

// Growth rates of EN 1991-1-2 Annex E (Table E.5).
const (
	Slow   Growth = "slow"
	Medium Growth = "medium"
	Fast   Growth = "fast"
)

// tLimMin returns t_lim in minutes (EN 1991-1-2 Annex A (A.7) note).
func (g Growth) tLimMin() (float64, bool) {
	switch g {
	case Slow:
		return 25, true
	case Medium:
		return 20, true
	case Fast:
		return 15, true
	}
	return 0, false
}

// ParametricInput is the data of an EN 1991-1-2 Annex A parametric fire.
type ParametricInput struct {
	OpeningFactor float64 // O, m^0.5 (0.02–0.20)
	B             float64 // b = √(ρcλ) of the enclosure, J/m²s^0.5K (100–2200)
	FireLoad      float64 // q_t,d, MJ/m² of total enclosure area (50–1000)
	Growth        Growth  // slow | medium | fast
}

// Parametric is the EN 1991-1-2 Annex A parametric temperature–time curve:
// heating (A.1)
//
//	θ_g = 20 + 1325·(1 − 0.324·e^(−0.2t*) − 0.204·e^(−1.7t*) − 0.472·e^(−19t*)),  t* = Γ·t (h)
//
// up to t_max = max(0.2·10⁻³·q_t,d/O; t_lim), then the linear cooling branch
// (A.11) down to 20 °C. It implements Exposure with α_c = 35 W/m²K.
type Parametric struct {
	in         ParametricInput
	gamma      float64 // Γ
	gammaHeat  float64 // Γ used in heating (Γ_lim·k when fuel-controlled)
	tMaxH      float64 // t_max, h (real time of the peak)
	tStarMaxC  float64 // t*_max of the cooling formulas = (0.2e-3·q/O)·Γ, h
	x          float64 // x of (A.11)
	peak       float64 // θ_max, °C
	rateH      float64 // cooling rate, °C per hour of fictitious time
	ambientMin float64
	fuel       bool
}

// NewParametric checks p against the Annex A limits and returns the curve.
func NewParametric(p ParametricInput) (*Parametric, error) {
	if !(p.OpeningFactor >= 0.02 && p.OpeningFactor <= 0.20) {
		return nil, fmt.Errorf("thermal: parametric OpeningFactor = %g m^0.5 out of range (accepted 0.02–0.20, EN 1991-1-2 A(7))", p.OpeningFactor)
	}
	if !(p.B >= 100 && p.B <= 2200) {
		return nil, fmt.Errorf("thermal: parametric B = %g J/m²s^0.5K out of range (accepted 100–2200, EN 1991-1-2 A(7))", p.B)
	}
	if !(p.FireLoad >= 50 && p.FireLoad <= 1000) {
		return nil, fmt.Errorf("thermal: parametric FireLoad = %g MJ/m² out of range (accepted 50–1000, EN 1991-1-2 A(7))", p.FireLoad)
	}
	tLim, ok := p.Growth.tLimMin()
	if !ok {
		return nil, fmt.Errorf("thermal: parametric Growth = %q unknown (accepted slow, medium, fast)", p.Growth)
	}
	const ref = 0.04 / 1160
	pf := &Parametric{in: p}
	pf.gamma = math.Pow(p.OpeningFactor/p.B/ref, 2)
	tLimH := tLim / 60
	tVent := 0.2e-3 * p.FireLoad / p.OpeningFactor // h
	pf.tStarMaxC = tVent * pf.gamma
	if tVent >= tLimH {
		// Ventilation-controlled.
		pf.tMaxH = tVent
		pf.gammaHeat = pf.gamma
		pf.x = 1
	} else {
		// Fuel-controlled (A.8)–(A.10).
		pf.fuel = true
		pf.tMaxH = tLimH
		oLim := 0.1e-3 * p.FireLoad / tLimH
		g := math.Pow(oLim/p.B/ref, 2)
		if p.OpeningFactor > 0.04 && p.FireLoad < 75 && p.B < 1160 {
			g *= 1 + ((p.OpeningFactor-0.04)/0.04)*((p.FireLoad-75)/75)*((1160-p.B)/1160)
		}
		pf.gammaHeat = g
		pf.x = tLimH * pf.gamma / pf.tStarMaxC
	}
	pf.peak = annexAHeating(pf.tMaxH * pf.gammaHeat)
	pf.rateH = annexACoolingRate(pf.tStarMaxC)
	// θ_g reaches 20 °C at t* = t*_max·x + (θ_max − 20)/rate.
	tStarEnd := pf.tStarMaxC*pf.x + (pf.peak-AmbientC)/pf.rateH
	pf.ambientMin = tStarEnd / pf.gamma * 60
	return pf, nil
}

// annexAHeating is EN 1991-1-2 (A.1) at fictitious time tStar, h.
func annexAHeating(tStar float64) float64 {
	return AmbientC + 1325*(1-0.324*math.Exp(-0.2*tStar)-0.204*math.Exp(-1.7*tStar)-0.472*math.Exp(-19*tStar))
}

// GasTemperature returns θ_g, °C, at tMin minutes.
func (pf *Parametric) GasTemperature(tMin float64) float64 {
	if tMin <= 0 {
		return AmbientC
	}
	t := tMin / 60
	if t <= pf.tMaxH {
		return annexAHeating(t * pf.gammaHeat)
	}
	th := pf.peak - pf.rateH*(t*pf.gamma-pf.tStarMaxC*pf.x)
	return math.Max(AmbientC, math.Min(pf.peak, th))
}

// Convection returns α_c = 35 W/m²K (EN 1991-1-2 §3.3.1.1(3)).
func (pf *Parametric) Convection() float64 { return 35 }

// HeatingEnd returns t_max, min.
func (pf *Parametric) HeatingEnd() float64 { return pf.tMaxH * 60 }

// AmbientAt returns the time, min, at which the cooling branch reaches 20 °C.
func (pf *Parametric) AmbientAt() float64 { return pf.ambientMin }

// Gamma returns Γ = (O/b)²/(0.04/1160)².
func (pf *Parametric) Gamma() float64 { return pf.gamma }

// TMaxMin returns t_max, the real time of the peak gas temperature, min.
func (pf *Parametric) TMaxMin() float64 { return pf.tMaxH * 60 }

// PeakC returns θ_max, °C.
func (pf *Parametric) PeakC() float64 { return pf.peak }

// FuelControlled reports whether t_max = t_lim (fuel-controlled fire).
func (pf *Parametric) FuelControlled() bool { return pf.fuel }

// CoolingRate returns the cooling rate of (A.11) in °C per minute of real time.
func (pf *Parametric) CoolingRate() float64 { return pf.rateH * pf.gamma / 60 }

// Name describes the fire.
func (pf *Parametric) Name() string {
	ctl := "ventilation-controlled"
	if pf.fuel {
		ctl = "fuel-controlled"
	}
	return fmt.Sprintf("EN 1991-1-2 Annex A parametric fire (O = %g m^0.5, b = %g J/m²s^0.5K, q_t,d = %g MJ/m², %s growth; Γ = %.3g, %s, θ_max = %.0f °C at %.0f min)",
		pf.in.OpeningFactor, pf.in.B, pf.in.FireLoad, pf.in.Growth, pf.gamma, ctl, pf.peak, pf.tMaxH*60)
}

// EquivalentTimeInput is the data of the EN 1991-1-2 Annex F equivalent time of
// fire exposure.
type EquivalentTimeInput struct {
	FireLoad float64 // q_f,d, design fire load density per floor area, MJ/m² (1–10000)
	// B is the thermal absorptivity b of the enclosure, J/m²s^0.5K; 0 = not
	// assessed in detail (k_b = 0.07 min·m²/MJ).
	B                   float64
	HeightM             float64 // compartment height H, m (0.5–50)
	FloorAreaM2         float64 // A_f, m² (> 0)
	VerticalOpeningM2   float64 // A_v, m²; α_v = A_v/A_f must be 0.025–0.25
	HorizontalOpeningM2 float64 // A_h, roof openings, m² (≥ 0)
	// Kc is the material correction k_c; 0 = 1.0 (reinforced concrete, F(2)).
	Kc float64
}

// EquivalentTime returns the EN 1991-1-2 Annex F equivalent time of standard
// fire exposure t_e,d = q_f,d·k_b·w_f·k_c, min, with
//
//	w_f = (6/H)^0.3·[0.62 + 90·(0.4 − α_v)⁴/(1 + b_v·α_h)] ≥ 0.5,
//	b_v = 12.5·(1 + 10·α_v − α_v²) ≥ 10,
//
// and k_b = 0.04 (b > 2500), 0.055 (720 ≤ b ≤ 2500), 0.07 (b < 720 or not assessed).
func EquivalentTime(in EquivalentTimeInput) (float64, error) {
	if !(in.FireLoad >= 1 && in.FireLoad <= 10000) {
		return 0, fmt.Errorf("thermal: equivalent time FireLoad = %g MJ/m² out of range (accepted 1–10000)", in.FireLoad)
	}
	if !(in.B == 0 || (in.B >= 1 && in.B <= 10000)) {
		return 0, fmt.Errorf("thermal: equivalent time B = %g J/m²s^0.5K out of range (accepted 0 = not assessed, or 1–10000)", in.B)
	}
	if !(in.HeightM >= 0.5 && in.HeightM <= 50) {
		return 0, fmt.Errorf("thermal: equivalent time HeightM = %g m out of range (accepted 0.5–50)", in.HeightM)
	}
	if !(in.FloorAreaM2 > 0 && in.FloorAreaM2 <= 1e6) {
		return 0, fmt.Errorf("thermal: equivalent time FloorAreaM2 = %g m² out of range (accepted 0 < A_f ≤ 1e6)", in.FloorAreaM2)
	}
	av := in.VerticalOpeningM2 / in.FloorAreaM2
	if !(av >= 0.025 && av <= 0.25) {
		return 0, fmt.Errorf("thermal: equivalent time VerticalOpeningM2 = %g m² gives α_v = %.4g out of range (accepted α_v = A_v/A_f 0.025–0.25)", in.VerticalOpeningM2, av)
	}
	if !(in.HorizontalOpeningM2 >= 0 && in.HorizontalOpeningM2 <= in.FloorAreaM2) {
		return 0, fmt.Errorf("thermal: equivalent time HorizontalOpeningM2 = %g m² out of range (accepted 0–A_f)", in.HorizontalOpeningM2)
	}
	kc := in.Kc
	if kc == 0 {
		kc = 1
	}
	if !(kc > 0 && kc <= 5) {
		return 0, fmt.Errorf("thermal: equivalent time Kc = %g out of range (accepted 0 = 1.0, or 0 < k_c ≤ 5)", in.Kc)
	}
	kb := 0.07
	switch {
	case in.B > 2500:
		kb = 0.04
	case in.B >= 720:
		kb = 0.055
	}
	ah := in.HorizontalOpeningM2 / in.FloorAreaM2
	bv := math.Max(10, 12.5*(1+10*av-av*av))
	wf := math.Pow(6/in.HeightM, 0.3) * (0.62 + 90*math.Pow(0.4-av, 4)/(1+bv*ah))
	wf = math.Max(wf, 0.5)
	return in.FireLoad * kb * wf * kc, nil
}
