package assess

import "math"

// Residual (after-cooling) material properties as functions of the peak
// temperature θmax a fibre reached during heating and cooling.

// table is a piecewise-linear function given at increasing abscissae; it is
// held constant beyond its ends.
type table struct{ x, y []float64 }

func (t table) at(x float64) float64 {
	n := len(t.x)
	if math.IsNaN(x) || x <= t.x[0] {
		return t.y[0]
	}
	if x >= t.x[n-1] {
		return t.y[n-1]
	}
	i := 1
	for t.x[i] < x {
		i++
	}
	f := (x - t.x[i-1]) / (t.x[i] - t.x[i-1])
	return t.y[i-1] + f*(t.y[i]-t.y[i-1])
}

var tempRows = []float64{20, 100, 200, 300, 400, 500, 600, 700, 800, 900, 1000, 1100, 1200}

// kcSiliceous and kcCalcareous are f_c,θ/f_ck of EN 1992-1-2:2004 Table 3.1
// (hot strength of normal-weight concrete), columns 2 and 5.
var (
	kcSiliceous  = table{tempRows, []float64{1, 1, 0.95, 0.85, 0.75, 0.60, 0.45, 0.30, 0.15, 0.08, 0.04, 0.01, 0}}
	kcCalcareous = table{tempRows, []float64{1, 1, 0.97, 0.91, 0.85, 0.74, 0.60, 0.43, 0.27, 0.15, 0.06, 0.02, 0}}
	// kcLightweight is the lightweight-concrete column of EN 1994-1-2:2005
	// Table 3.3 as recalled in research/residual.md §1.1 (tagged there [M?]:
	// unconfirmed; a caution goes with every lightweight result).
	kcLightweight = table{tempRows, []float64{1, 1, 1, 1, 0.88, 0.76, 0.64, 0.52, 0.40, 0.28, 0.16, 0.04, 0}}
	// epsC1 is ε_c1,θ of EN 1992-1-2:2004 Table 3.1 (strain at peak stress, hot,
	// transient creep included); the 1200 °C row repeats 0.025.
	epsC1 = table{tempRows, []float64{0.0025, 0.0040, 0.0055, 0.0070, 0.0100, 0.0150, 0.0250, 0.0250, 0.0250, 0.0250, 0.0250, 0.0250, 0.0250}}
)

// hotConcreteFactor is k_c(θ) = f_c,θ/f_ck for the aggregate: EN 1992-1-2
// Table 3.1 (siliceous, calcareous) or EN 1994-1-2 Table 3.3 LC (lightweight).
func hotConcreteFactor(aggregate string, theta float64) float64 {
	switch aggregate {
	case "calcareous":
		return kcCalcareous.at(theta)
	case "lightweight":
		return kcLightweight.at(theta)
	default:
		return kcSiliceous.at(theta)
	}
}

// ResidualConcrete is the residual compressive strength ratio and peak-strain
// ratio of concrete after cooling from a peak temperature.
type ResidualConcrete struct {
	StrengthRatio   float64 // f_c,res / f_ck
	PeakStrainRatio float64 // ε_c1,res / ε_c1,20
}

// ResidualConcreteEN1994 is the default residual concrete model,
// "en1994-annex-c": EN 1994-1-2:2005 Annex C (informative) on top of
// EN 1992-1-2:2004 Table 3.1 (research/residual.md §1.1).
//
// Strength, our reading of Annex C: f_c,θ,20°C = φ·k_c(θmax)·f_ck with
//   - θmax ≤ 100 °C: ratio 1.0 (no loss);
//   - θmax ≥ 300 °C: φ = 0.9, ratio 0.9·k_c(θmax, aggregate);
//   - 100–300 °C: the ratio itself (not φ) falls linearly from 1.0 at 100 °C to
//     0.9·k_c(300 °C) at 300 °C. For siliceous concrete this is the Annex C
//     expression 1.0 − 0.235(θmax − 100)/200, which meets 0.9·0.85 = 0.765 at
//     300 °C only when read as the residual ratio f_c,θ,20/f_c (research/residual.md
//     §1.1 explains why φ itself cannot be meant); for calcareous concrete the same
//     construction keeps the curve continuous (0.9·0.91 = 0.819 at 300 °C).
//   - Calcareous above 600 °C: no credit over siliceous concrete (decarbonation
//     and CaO rehydration after cooling, research/residual.md §1.2 and Dias 1992):
//     the siliceous ratio is used.
//
// Peak strain: Annex C keeps the strain at peak stress of θmax during cooling,
// so PeakStrainRatio = ε_c1(θmax)/ε_c1(20 °C) from EN 1992-1-2 Table 3.1.
func ResidualConcreteEN1994(aggregate string, thetaMax float64) ResidualConcrete {
	theta := math.Max(thetaMax, 20)
	agg := aggregate
	if agg == "calcareous" && theta > 600 {
		agg = "siliceous"
	}
	var r float64
	switch {
	case theta <= 100:
		r = 1
	case theta < 300:
		r300 := 0.9 * hotConcreteFactor(agg, 300)
		r = 1 - (1-r300)*(theta-100)/200
	default:
		r = 0.9 * hotConcreteFactor(agg, theta)
	}
	return ResidualConcrete{StrengthRatio: r, PeakStrainRatio: epsC1.at(theta) / epsC1.at(20)}
}

// ResidualConcreteChang2006 is the alternative residual concrete model,
// "chang-2006": the regressions of Chang Y.F., Chen Y.H., Sheu M.S., Yao G.C.,
// "Residual stress–strain relationship for concrete after exposure to high
// temperatures", Cem. Concr. Res. 36:1999–2005 (2006), as recalled in
// research/residual.md §1.6 (siliceous aggregate, tested one month after cooling):
//
//	f'c,T/f'c = 1.01 − 0.00055·T        (100 ≤ T ≤ 200 °C)
//	          = 1.15 − 0.00125·T        (200 < T ≤ 800 °C; extended linearly to 0 at 920 °C)
//	ε0,T/ε0   = 1 + (1500·T + 5·T²)·10⁻⁶ (T ≥ 100 °C)
//
// Below 100 °C (outside the tests) both ratios are interpolated linearly from
// 1.0 at 20 °C to their 100 °C values. The strength ratio is capped at 1.
// The regression is for siliceous aggregate and is used unchanged for the
// others (conservative for calcareous and lightweight concrete up to ~600 °C).
func ResidualConcreteChang2006(aggregate string, thetaMax float64) ResidualConcrete {
	T := math.Max(thetaMax, 20)
	strength := func(T float64) float64 {
		if T <= 200 {
			return 1.01 - 0.00055*T
		}
		return math.Max(0, 1.15-0.00125*T)
	}
	strain := func(T float64) float64 { return 1 + (1500*T+5*T*T)*1e-6 }
	if T < 100 {
		f := (T - 20) / 80
		return ResidualConcrete{
			StrengthRatio:   1 + f*(strength(100)-1),
			PeakStrainRatio: 1 + f*(strain(100)-1),
		}
	}
	return ResidualConcrete{StrengthRatio: math.Min(1, strength(T)), PeakStrainRatio: strain(T)}
}

// residualConcrete dispatches on the model name.
func residualConcrete(model, aggregate string, thetaMax float64) ResidualConcrete {
	if model == ConcreteChang2006 {
		return ResidualConcreteChang2006(aggregate, thetaMax)
	}
	return ResidualConcreteEN1994(aggregate, thetaMax)
}

// Residual yield factors f_y,res/f_yk by steel class ("residual-by-class"),
// working values from research/residual.md §2.2 (mid-points of the recalled
// envelopes) with the confirmed anchors: hot-rolled 0.95 and cold-worked 0.70
// after 800 °C, prestressing wire/strand permanent loss above 300 °C, and the
// thresholds of research/residual.md §6. Values below the threshold are 1.0.
var (
	resHotRolled = table{[]float64{20, 600, 700, 800, 900}, []float64{1, 1, 0.97, 0.95, 0.85}}
	resColdWork  = table{[]float64{20, 450, 500, 600, 700, 800, 900}, []float64{1, 1, 0.97, 0.92, 0.82, 0.70, 0.65}}
	resQT        = table{[]float64{20, 400, 500, 600, 700, 800}, []float64{1, 1, 0.95, 0.90, 0.80, 0.75}}
	resPrestress = table{[]float64{20, 300, 500, 600, 700, 800}, []float64{1, 1, 0.80, 0.62, 0.47, 0.42}}
)

// Hot-strength factors used by the "hot-strength" lower bound: EN 1992-1-2:2004
// Table 3.2a class N (k_s hot-rolled and cold-worked; quenched-and-tempered bars
// take the hot-rolled column) and Table 3.3 (cold-worked prestressing steel,
// class A, f_py,θ/(β·f_pk)).
var (
	ksHotRolled  = table{tempRows, []float64{1, 1, 1, 1, 1, 0.78, 0.47, 0.23, 0.11, 0.06, 0.04, 0.02, 0}}
	ksColdWorked = table{tempRows, []float64{1, 1, 1, 1, 0.94, 0.67, 0.40, 0.12, 0.11, 0.08, 0.05, 0.03, 0}}
	kpColdWorked = table{tempRows, []float64{1, 1, 0.87, 0.70, 0.50, 0.30, 0.14, 0.06, 0.04, 0.02, 0, 0, 0}}
)

// SteelThresholdC is the peak temperature above which a steel class loses
// strength permanently on cooling (research/residual.md §2.2 and §6:
// hot-rolled ≈ 600 °C, cold-worked ≈ 450 °C (sources differ, 450–600 °C; the
// lower value is used), quenched-and-tempered ≈ 400 °C, prestressing wire and
// strand ≈ 300 °C [C]).
func SteelThresholdC(steel string) float64 {
	switch steel {
	case SteelColdWorked:
		return 450
	case SteelQuenchedTempered:
		return 400
	case SteelPrestressing:
		return 300
	default:
		return 600
	}
}

// ResidualSteelFactor is f_y,res/f_yk after cooling from thetaMax for a steel
// class under the named model: "residual-by-class" (default; the working
// residual values above) or "hot-strength" (the EN 1992-1-2 hot factor
// k_s(θmax), a conservative lower bound since steel recovers on cooling).
func ResidualSteelFactor(model, steel string, thetaMax float64) float64 {
	if model == SteelHotStrength {
		switch steel {
		case SteelColdWorked:
			return ksColdWorked.at(thetaMax)
		case SteelPrestressing:
			return kpColdWorked.at(thetaMax)
		default:
			return ksHotRolled.at(thetaMax)
		}
	}
	switch steel {
	case SteelColdWorked:
		return resColdWork.at(thetaMax)
	case SteelQuenchedTempered:
		return resQT.at(thetaMax)
	case SteelPrestressing:
		return resPrestress.at(thetaMax)
	default:
		return resHotRolled.at(thetaMax)
	}
}

// steelClassProps are the ambient properties taken for each class: modulus
// (MPa) and the design rupture strain ε_ud = 0.9·ε_uk (EN 1992-1-1 §3.2.7(2)
// with ε_uk of Annex C class B 5 % for hot-rolled and quenched-and-tempered
// bars, class A 2.5 % for cold-worked bars; prestressing ε_uk 3.5 %, §3.3.6(7)).
func steelClassProps(steel string) (es, epsU float64) {
	switch steel {
	case SteelColdWorked:
		return 200000, 0.9 * 0.025
	case SteelPrestressing:
		return 195000, 0.9 * 0.035
	default:
		return 200000, 0.9 * 0.05
	}
}
