package assess

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strings"
)

// WriteText writes the one-screen summary of the result, for pasting into a
// site note: the member, the fire, bar temperatures, isotherm depths, the fit,
// capacities, the damage class with its reasons, the action and the cautions.
func (r *Result) WriteText(w io.Writer) error {
	b := bufio.NewWriter(w)
	p := func(format string, args ...any) { fmt.Fprintf(b, format, args...) }
	unit := "kN·m"
	if r.Member.PerMetre {
		unit = "kN·m/m"
	}
	label := r.Member.Label
	if label == "" {
		label = "(no label)"
	}
	p("RESIDUUM post-fire residual capacity — %s\n", label)
	switch {
	case r.Member.Kind == KindSlab:
		p("Member: slab strip %s mm deep, analysed width %s mm (results per metre)", fmtNum(r.Member.DepthMM), fmtNum(r.Member.WidthMM))
	case r.Member.FlangeWidthMM > 0:
		p("Member: T-beam, web %s × %s mm overall, flange %s × %s mm", fmtNum(r.Member.WidthMM), fmtNum(r.Member.DepthMM), fmtNum(r.Member.FlangeWidthMM), fmtNum(r.Member.FlangeDepthMM))
	default:
		p("Member: rectangular beam %s × %s mm", fmtNum(r.Member.WidthMM), fmtNum(r.Member.DepthMM))
	}
	p(", exposed: %s\n", strings.Join(r.Member.Exposed, ", "))
	switch {
	case r.Fire != nil:
		p("Fire (%s): %s; heating ends %.0f min, peak gas %.0f °C\n", r.Fire.Source, r.Fire.Name, r.Fire.HeatingEndMin, r.Fire.PeakGasC)
	default:
		p("Fire: none given — assessed undamaged\n")
	}
	if f := r.Fit; f != nil {
		val := ""
		if f.DurationMin != nil {
			val = fmt.Sprintf("t = %.0f min (range %.0f–%.0f)", *f.DurationMin, f.Range[0], f.Range[1])
		} else if f.FireLoadMJM2 != nil {
			val = fmt.Sprintf("q = %.0f MJ/m² (range %.0f–%.0f)", *f.FireLoadMJM2, f.Range[0], f.Range[1])
		}
		status := "matched"
		if !f.Matched {
			status = "NOT MATCHED"
		}
		p("Fit (%s family): %s, χ² = %.2f, %s", f.Family, val, f.ChiSq, status)
		if f.Agreement != "" {
			p("; given fire %s", f.Agreement)
		}
		p("\n")
		for _, o := range f.Observations {
			comp := "not reached"
			if o.ComputedMM != nil {
				comp = fmt.Sprintf("%.1f mm", *o.ComputedMM)
			}
			p("  %s %g °C: measured %.1f ± %.1f mm, computed %s (misfit %+.1f mm)\n", o.Face, o.IsothermC, o.MeasuredMM, o.SdMM, comp, o.MisfitMM)
		}
	}
	if len(r.Isotherms) > 0 {
		p("Isotherm depths at mid-face (300 / 500 / 600 °C):")
		for _, face := range r.Member.Exposed {
			iso := r.Isotherms[face]
			p("  %s %s / %s / %s mm;", face, depthStr(iso["300"]), depthStr(iso["500"]), depthStr(iso["600"]))
		}
		p("\n")
	}
	if len(r.Rebar) > 0 {
		hot := 0
		for i := range r.Rebar {
			if r.Rebar[i].PeakC > r.Rebar[hot].PeakC {
				hot = i
			}
		}
		h := r.Rebar[hot]
		exposed, seen := 0, 0
		above := 0
		for _, bar := range r.Rebar {
			if bar.ExposedBySpalling {
				exposed++
			}
			if bar.ExposedOnSite {
				seen++
			}
			if bar.AboveThreshold {
				above++
			}
		}
		onSite := ""
		if seen > 0 {
			onSite = fmt.Sprintf(", %d seen exposed on site", seen)
		}
		p("Bars: %d; hottest %s %.0f °C peak (%.0f °C at end of heating), %s threshold %.0f °C; %d above threshold, %d exposed by spalling%s\n",
			len(r.Rebar), h.Label, h.PeakC, h.EndOfHeatingC, h.Steel, h.ThresholdC, above, exposed, onSite)
	}
	p("Capacity (%s)          undamaged  residual  ratio   design: undamaged residual  demand  utilisation\n", unit)
	for _, d := range []struct {
		n string
		c Direction
	}{{"sagging", r.Capacity.Sagging}, {"hogging", r.Capacity.Hogging}} {
		u := "—"
		if d.c.Utilisation != nil && d.c.DemandKNm > 0 {
			u = fmt.Sprintf("%.2f", *d.c.Utilisation)
		} else if d.c.DemandKNm > 0 {
			u = "∞"
		}
		rng := ""
		if d.c.ResidualRangeKNm[1]-d.c.ResidualRangeKNm[0] > 1e-6*math.Max(1, d.c.ResidualKNm) {
			rng = fmt.Sprintf(" (%.1f–%.1f)", d.c.ResidualRangeKNm[0], d.c.ResidualRangeKNm[1])
		}
		p("  %-8s %18.1f %9.1f %6.3f %17.1f %8.1f %7.1f  %s%s\n", d.n, d.c.UndamagedKNm, d.c.ResidualKNm, d.c.Ratio,
			d.c.UndamagedDesignKNm, d.c.ResidualDesignKNm, d.c.DemandKNm, u, rng)
	}
	p("  (γc = %s, γs = %s, αcc = %s)\n", fmtNum(r.Design.GammaC), fmtNum(r.Design.GammaS), fmtNum(r.Design.AlphaCC))
	p("Damage class %s\n", r.Damage.Label)
	for _, rs := range r.Damage.Reasons {
		p("  [%d] %s: %s\n", rs.Class, rs.Indicator, rs.Detail)
	}
	p("Action: %s — %s\n", r.Action, r.ActionText)
	p("Cautions:\n")
	for _, c := range r.Cautions {
		p("  - %s\n", c)
	}
	p("Method %s; input sha256 %s\n", r.MethodVersion, r.InputSHA256)
	return b.Flush()
}

func depthStr(v *float64) string {
	if v == nil {
		return "—"
	}
	return fmt.Sprintf("%.0f", *v)
}
