package web

import (
	"fmt"
	"math"
	"slices"

	"residuum/assess"
	"residuum/thermal"
)

// fireBandLabel is the legend entry of the fitted-severity band on the fire-curve plot.
const fireBandLabel = "range consistent with the evidence (±1 sd)"

// fireBand holds the two gas-temperature curves, [min, °C], that bound the
// severities consistent with the evidence: Low at Fit.Range[0] and High at
// Fit.Range[1], sampled at the same times so the band between them can be filled.
type fireBand struct {
	Low, High [][2]float64
}

// maxBandSamples bounds the sampling of the band curves.
const maxBandSamples = 2000

// fittedFireBand builds the bounding curves of a fitted fire from the fit's
// family and range with assess.FitExposure, the mapping the fit itself uses
// (fo supplies the parametric family's opening factor, b and growth rate). It returns nil, nil when the fire was not fitted
// or the range has no width.
func fittedFireBand(res *assess.Result, fo *assess.FitOptions) (*fireBand, error) {
	if res == nil || res.Fire == nil || res.Fire.Source != "fitted" || res.Fit == nil || len(res.FireCurve) < 2 {
		return nil, nil
	}
	lo, hi := res.Fit.Range[0], res.Fit.Range[1]
	if !(lo > 0) || !(hi > lo) || math.IsInf(hi, 0) {
		return nil, nil
	}
	switch res.Fit.Family {
	case assess.FitStandard:
	case assess.FitParametric:
		if fo == nil {
			return nil, fmt.Errorf("fire band: parametric fit without options.fit in the input")
		}
	default:
		return nil, fmt.Errorf("fire band: unknown fit family %q (want %q or %q)", res.Fit.Family, assess.FitStandard, assess.FitParametric)
	}
	mk := func(v float64) (thermal.Exposure, error) { return assess.FitExposure(fo, v) }
	eLo, err := mk(lo)
	if err != nil {
		return nil, fmt.Errorf("fire band: low end %s: %w", fmtSig(lo), err)
	}
	eHi, err := mk(hi)
	if err != nil {
		return nil, fmt.Errorf("fire band: high end %s: %w", fmtSig(hi), err)
	}

	// Sample at the result's own fire-curve times (as res.FireCurve), extended
	// at the same step to where the more severe curve is back at ambient, plus
	// the heating-end corners of both bounds.
	last := res.FireCurve[len(res.FireCurve)-1][0]
	dt := res.FireCurve[1][0] - res.FireCurve[0][0]
	if !(dt > 0) {
		return nil, fmt.Errorf("fire band: fire curve times not increasing")
	}
	end := last
	if a := eHi.AmbientAt(); !math.IsInf(a, 0) && a > end {
		end = a
	}
	end = math.Min(end, last+dt*maxBandSamples)
	times := make([]float64, 0, len(res.FireCurve)+8)
	for _, p := range res.FireCurve {
		times = append(times, p[0])
	}
	for t := last + dt; t < end+1e-9 && len(times) < maxBandSamples; t += dt {
		times = append(times, t)
	}
	for _, e := range []thermal.Exposure{eLo, eHi} {
		if h := e.HeatingEnd(); h > 0 && h < end && !math.IsInf(h, 0) {
			times = append(times, h)
		}
	}
	slices.Sort(times)
	times = slices.Compact(times)
	b := &fireBand{Low: make([][2]float64, len(times)), High: make([][2]float64, len(times))}
	for i, t := range times {
		b.Low[i] = [2]float64{t, eLo.GasTemperature(t)}
		b.High[i] = [2]float64{t, eHi.GasTemperature(t)}
	}
	return b, nil
}

// fireCaption is the caption of the fire-curve figure; a fitted fire also explains its band.
func fireCaption(res *assess.Result) string {
	c := "Gas temperature the section was solved for (heating and cooling)."
	if res.Fire != nil && res.Fire.Source == "fitted" && res.Fit != nil && res.Fit.Range[1] > res.Fit.Range[0] {
		c += fmt.Sprintf(" Shaded between dashed lines: the fires of the family whose %s lies within one standard deviation of the fit, %s–%s.",
			fitParamWords(res.Fit.Parameter), fmtSig(res.Fit.Range[0]), fmtSig(res.Fit.Range[1]))
	}
	return c
}

func fitParamWords(p string) string {
	switch p {
	case "duration_min":
		return "heating duration (min)"
	case "fire_load_mj_m2":
		return "fire load (MJ/m²)"
	}
	return p
}

// inputFitOptions returns the input's fit options, or nil.
func inputFitOptions(in assess.Input) *assess.FitOptions {
	return in.Options.Fit
}
