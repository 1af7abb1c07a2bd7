package thermal

import (
	"fmt"
	"math"
)

// AmbientC is the initial and ambient temperature, °C (EN 1991-1-2 §3.2.1: 20 °C).
const AmbientC = 20.0

// Exposure is a gas-temperature history and the convection coefficient that goes with it.
type Exposure interface {
	GasTemperature(tMin float64) float64 // °C at time t (minutes from ignition)
	Convection() float64                 // α_c, W/m²K, on fire-exposed faces
	HeatingEnd() float64                 // min: end of the heating phase (math.Inf(1) for an uncut nominal curve)
	AmbientAt() float64                  // min: time from which the gas is back at ambient (Inf if never)
	Name() string                        // e.g. "ISO 834 standard fire, 90 min, then cooling at 6.25 °C/min"
}

// nominal is an uncut nominal curve given by a formula or a table.
type nominal struct {
	name  string
	alpha float64
	f     func(tMin float64) float64
}

func (n *nominal) GasTemperature(tMin float64) float64 {
	if tMin <= 0 {
		return AmbientC
	}
	return n.f(tMin)
}
func (n *nominal) Convection() float64 { return n.alpha }
func (n *nominal) HeatingEnd() float64 { return math.Inf(1) }
func (n *nominal) AmbientAt() float64  { return math.Inf(1) }
func (n *nominal) Name() string        { return n.name }

// ISO834 returns the standard temperature–time curve of ISO 834-1 and EN 1991-1-2 §3.2.1,
//
//	θ_g = 20 + 345·log₁₀(8t + 1)   (°C, t in min),
//
// with α_c = 25 W/m²K. It never cools; cut it with NewCooled.
func ISO834() Exposure {
	return &nominal{name: "ISO 834 standard fire", alpha: 25, f: func(t float64) float64 {
		return AmbientC + 345*math.Log10(8*t+1)
	}}
}

// Hydrocarbon returns the hydrocarbon curve of EN 1991-1-2 §3.2.3,
//
//	θ_g = 1080·(1 − 0.325·e^(−0.167t) − 0.675·e^(−2.5t)) + 20   (°C, t in min),
//
// with α_c = 50 W/m²K.
func Hydrocarbon() Exposure {
	return &nominal{name: "EN 1991-1-2 hydrocarbon fire", alpha: 50, f: func(t float64) float64 {
		return 1080*(1-0.325*math.Exp(-0.167*t)-0.675*math.Exp(-2.5*t)) + AmbientC
	}}
}

// astmE119 holds the ASTM E119 Table X1.1 points, [min, °F]. Beyond 8 h the
// curve is held at 2300 °F. Points to 2 h are at 5-min steps; from 2 h to 8 h
// the table rises by 75 °F per hour, so hourly points interpolated linearly
// reproduce its 10-min entries to within its 1 °F rounding.
var astmE119 = [][2]float64{
	{0, 68}, {5, 1000}, {10, 1300}, {15, 1399}, {20, 1462}, {25, 1510}, {30, 1550},
	{35, 1584}, {40, 1613}, {45, 1638}, {50, 1661}, {55, 1681}, {60, 1700},
	{65, 1718}, {70, 1735}, {75, 1750}, {80, 1765}, {85, 1779}, {90, 1792},
	{95, 1804}, {100, 1815}, {105, 1826}, {110, 1835}, {115, 1843}, {120, 1850},
	{180, 1925}, {240, 2000}, {300, 2075}, {360, 2150}, {420, 2225}, {480, 2300},
}

// ASTME119 returns the ASTM E119 standard time–temperature curve (Table X1.1
// points converted from °F, interpolated linearly), with α_c = 25 W/m²K.
func ASTME119() Exposure {
	pts := make([][2]float64, len(astmE119))
	for i, p := range astmE119 {
		pts[i] = [2]float64{p[0], (p[1] - 32) * 5 / 9}
	}
	return &nominal{name: "ASTM E119 standard fire", alpha: 25, f: func(t float64) float64 {
		return interpTable(pts, t)
	}}
}

// interpTable interpolates linearly in pts (time strictly increasing) and
// holds the end values outside the table.
func interpTable(pts [][2]float64, t float64) float64 {
	if t <= pts[0][0] {
		return pts[0][1]
	}
	n := len(pts)
	if t >= pts[n-1][0] {
		return pts[n-1][1]
	}
	lo, hi := 0, n-1
	for hi-lo > 1 {
		m := (lo + hi) / 2
		if pts[m][0] <= t {
			lo = m
		} else {
			hi = m
		}
	}
	a, b := pts[lo], pts[hi]
	return a[1] + (b[1]-a[1])*(t-a[0])/(b[0]-a[0])
}

// tabulated is a gas-temperature curve given as points [min, °C], interpolated
// linearly and held at its end values outside the table.
type tabulated struct {
	pts     [][2]float64
	alpha   float64
	peakT   float64
	ambient float64
}

// NewTabulated returns a curve through points [min, °C] with α_c = 25 W/m²K.
// Times must start at 0 or later, increase strictly and end by 4320 min (72 h);
// temperatures must lie in 0–1400 °C. The heating phase ends at the first
// maximum; the gas is back at ambient from the first time after which the
// curve stays at or below 21 °C.
func NewTabulated(points [][2]float64) (Exposure, error) {
	return NewTabulatedConvection(points, 25)
}

// NewTabulatedConvection is NewTabulated with a given convection coefficient
// alphaC, W/m²K (accepted 1–100).
func NewTabulatedConvection(points [][2]float64, alphaC float64) (Exposure, error) {
	if !(alphaC >= 1 && alphaC <= 100) {
		return nil, fmt.Errorf("thermal: tabulated convection α_c = %g W/m²K out of range (accepted 1–100)", alphaC)
	}
	if len(points) < 2 || len(points) > 100000 {
		return nil, fmt.Errorf("thermal: tabulated curve has %d points (accepted 2–100000)", len(points))
	}
	pts := make([][2]float64, len(points))
	copy(pts, points)
	tb := &tabulated{pts: pts, alpha: alphaC, ambient: math.Inf(1)}
	peak := math.Inf(-1)
	for i, p := range pts {
		if !(p[0] >= 0 && p[0] <= maxEndMin) {
			return nil, fmt.Errorf("thermal: tabulated points[%d] time = %g min out of range (accepted 0–%g)", i, p[0], maxEndMin)
		}
		if i > 0 && !(p[0] > pts[i-1][0]) {
			return nil, fmt.Errorf("thermal: tabulated points[%d] time = %g min is not after points[%d] = %g min (accepted: times strictly increasing)", i, p[0], i-1, pts[i-1][0])
		}
		if !(p[1] >= 0 && p[1] <= 1400) {
			return nil, fmt.Errorf("thermal: tabulated points[%d] temperature = %g °C out of range (accepted 0–1400)", i, p[1])
		}
		if p[1] > peak {
			peak, tb.peakT = p[1], p[0]
		}
	}
	// Last time from which the curve stays at or below ambient + 1 °C.
	n := len(pts)
	if pts[n-1][1] <= AmbientC+1 {
		k := n - 1
		for k > 0 && pts[k-1][1] <= AmbientC+1 {
			k--
		}
		if k == 0 {
			tb.ambient = pts[0][0]
		} else {
			a, b := pts[k-1], pts[k]
			tb.ambient = a[0] + (b[0]-a[0])*(a[1]-(AmbientC+1))/(a[1]-b[1])
		}
	}
	return tb, nil
}

func (tb *tabulated) GasTemperature(tMin float64) float64 { return interpTable(tb.pts, tMin) }
func (tb *tabulated) Convection() float64                 { return tb.alpha }
func (tb *tabulated) HeatingEnd() float64                 { return tb.peakT }
func (tb *tabulated) AmbientAt() float64                  { return tb.ambient }
func (tb *tabulated) Name() string {
	return fmt.Sprintf("tabulated fire curve, %d points, peak %.0f °C at %g min", len(tb.pts), interpTable(tb.pts, tb.peakT), tb.peakT)
}

// annexACoolingRate is the EN 1991-1-2 Annex A (A.11) cooling rate in °C per
// hour of fictitious time for a fictitious peak time tStarMax, h.
func annexACoolingRate(tStarMax float64) float64 {
	switch {
	case tStarMax <= 0.5:
		return 625
	case tStarMax < 2:
		return 250 * (3 - tStarMax)
	default:
		return 250
	}
}

// cooled is a base curve cut at a heating duration, then cooled linearly.
type cooled struct {
	base    Exposure
	th      float64 // min
	thetaH  float64 // °C at th
	rate    float64 // °C/min
	ambient float64 // min
	annexA  bool
}

// NewCooled cuts base at heatingMin and follows it with a linear decay to 20 °C at rateCPerMin
// (rateCPerMin == 0: the EN 1991-1-2 Annex A cooling rate for t*_max = heatingMin/60 with Γ = 1,
// i.e. 625 °C/h for t*_max ≤ 0.5 h, 250·(3 − t*_max) °C/h up to 2 h, 250 °C/h beyond).
// heatingMin is accepted in (0, 4320] and no later than base's own end of heating;
// rateCPerMin in 0–1000 °C/min. The convection coefficient is base's.
func NewCooled(base Exposure, heatingMin, rateCPerMin float64) (Exposure, error) {
	if base == nil {
		return nil, fmt.Errorf("thermal: NewCooled base exposure is nil")
	}
	if !(heatingMin > 0 && heatingMin <= maxEndMin) {
		return nil, fmt.Errorf("thermal: heating duration = %g min out of range (accepted 0 < t ≤ %g)", heatingMin, maxEndMin)
	}
	if he := base.HeatingEnd(); heatingMin > he {
		return nil, fmt.Errorf("thermal: heating duration = %g min is after the end of heating of %s (accepted ≤ %g)", heatingMin, base.Name(), he)
	}
	if !(rateCPerMin >= 0 && rateCPerMin <= 1000) {
		return nil, fmt.Errorf("thermal: cooling rate = %g °C/min out of range (accepted 0–1000; 0 = EN 1991-1-2 Annex A)", rateCPerMin)
	}
	c := &cooled{base: base, th: heatingMin, thetaH: base.GasTemperature(heatingMin), rate: rateCPerMin}
	if rateCPerMin == 0 {
		c.rate = annexACoolingRate(heatingMin/60) / 60
		c.annexA = true
	}
	c.ambient = c.th + math.Max(0, c.thetaH-AmbientC)/c.rate
	return c, nil
}

func (c *cooled) GasTemperature(tMin float64) float64 {
	if tMin <= c.th {
		return c.base.GasTemperature(tMin)
	}
	return math.Max(AmbientC, c.thetaH-c.rate*(tMin-c.th))
}
func (c *cooled) Convection() float64 { return c.base.Convection() }
func (c *cooled) HeatingEnd() float64 { return c.th }
func (c *cooled) AmbientAt() float64  { return c.ambient }
func (c *cooled) Name() string {
	how := ""
	if c.annexA {
		how = " (EN 1991-1-2 Annex A rate)"
	}
	return fmt.Sprintf("%s, %g min, then cooling at %.3g °C/min%s", c.base.Name(), c.th, c.rate, how)
}
