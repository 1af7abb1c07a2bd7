package assess

import (
	"fmt"
	"math"
)

// DamageScheme names the damage-class scheme used by Judge.
const DamageScheme = "Five visual damage classes 0–4 of the Concrete Society TR68 (2008) lineage (TR15, TR33; fib Bulletin 46), criteria for beams and floors from memory (unconfirmed), quantified by Residuum"

// damageLabels are the class names (repair category tied to each class,
// research/residual.md §4.1 [M]).
var damageLabels = [5]string{
	"0 — unaffected",
	"1 — superficial damage",
	"2 — general repair",
	"3 — principal repair",
	"4 — major repair or replacement",
}

const (
	srcTR68   = "Concrete Society TR68 (2008) damage classes, beam/floor table, from memory (unconfirmed)"
	srcOwn    = "Residuum's own engineering judgement (no published threshold confirmed)"
	srcSteel  = "Permanent-loss thresholds by steel class after cooling (hot-rolled ~600 °C, cold-worked ~450 °C, quenched-and-tempered ~400 °C, prestressing ~300 °C): older UK guidance as quoted in secondary sources (primary not confirmed); trends in Hertz 2006, Rafi et al. 2021, Hager et al. 2021"
	srcColour = "Colour zones: pink 300–600 °C, whitish grey 600–900 °C (Bessey 1950; Annerel & Taerwe 2008; Guise 1997); TR68 colour columns from memory"
)

// judgeInput gathers what the damage class depends on.
type judgeInput struct {
	fire           bool
	d300, d600     float64 // deepest computed/measured depth over the exposed faces, mm (0 = not reached)
	maxSpallMM     float64
	barsTotal      float64      // bars counted (slab groups count their bars)
	barsExposed    float64      // exposed by the spalled surface or seen exposed on site
	barsSeen       float64      // seen exposed on site (evidence.exposed_bars)
	hotBar         *RebarResult // the bar furthest above (or nearest to) its threshold
	ratio          float64      // minimum relevant residual/undamaged ratio; NaN if none relevant
	ratioDir       string
	utilisation    float64 // maximum demand / residual design resistance; NaN if no demand
	utilisationDir string
}

// judge assigns the damage class, its reasons and the recommended action.
func judge(j judgeInput) (Damage, string, string) {
	d := Damage{Scheme: DamageScheme}
	add := func(ind string, class int, src, format string, args ...any) {
		d.Reasons = append(d.Reasons, Reason{Indicator: ind, Class: class, Detail: fmt.Sprintf(format, args...), Source: src})
		if class > d.Class {
			d.Class = class
		}
	}
	if !j.fire {
		add("fire", 0, srcTR68, "no fire exposure and no site evidence given: the member is assessed undamaged")
	} else {
		switch {
		case j.d600 >= 20:
			add("colour-depth", 3, srcColour+"; 20 mm: "+srcOwn, "peak temperature above 600 °C (whitish grey) to %.0f mm depth", j.d600)
		case j.d300 > 0:
			add("colour-depth", 2, srcColour, "pink/red zone (peak above 300 °C) to %.0f mm depth%s", j.d300, tern(j.d600 > 0, fmt.Sprintf(", above 600 °C to %.0f mm", j.d600), ""))
		default:
			add("colour-depth", 1, srcColour, "no concrete reached 300 °C: colour normal")
		}
	}
	switch {
	case j.barsExposed > 0:
		frac := j.barsExposed / math.Max(j.barsTotal, 1)
		class := 2
		if frac > 0.5 {
			class = 4
		} else if frac > 0.1 {
			class = 3
		}
		src := srcTR68 + "; bar fractions ~10 % / ~50 % of TR68 applied to the bars of the cross-section"
		if j.barsSeen > 0 {
			add("exposed-bars", class, src+"; a layer reported exposed on site counts with all its bars",
				"%.0f of %.0f bars exposed (%.0f %%; %.0f in layers seen exposed on site); bond of exposed bars is lost", j.barsExposed, j.barsTotal, 100*frac, j.barsSeen)
		} else {
			add("exposed-bars", class, src,
				"spalling exposes %.0f of %.0f bars (%.0f %%); bond of exposed bars is lost", j.barsExposed, j.barsTotal, 100*frac)
		}
	case j.maxSpallMM >= 10:
		add("spalling", 2, srcTR68+"; 10 mm: "+srcOwn, "spalling to %.0f mm, bars not exposed (localised patches)", j.maxSpallMM)
	case j.maxSpallMM > 0:
		add("spalling", 1, srcTR68+"; 10 mm: "+srcOwn, "minor spalling to %.0f mm", j.maxSpallMM)
	}
	if j.hotBar != nil && j.fire {
		b := j.hotBar
		if b.AboveThreshold {
			add("bar-temperature", 3, srcSteel, "%s (%s) reached %.0f °C, above the %.0f °C threshold of its class: permanent strength loss (residual factor %.2f)",
				b.Label, b.Steel, b.PeakC, b.ThresholdC, b.ResidualFactor)
		} else {
			add("bar-temperature", 1, srcSteel, "hottest bar %s (%s) reached %.0f °C, below the %.0f °C threshold of its class",
				b.Label, b.Steel, b.PeakC, b.ThresholdC)
		}
	}
	if !math.IsNaN(j.ratio) {
		class := 1
		switch {
		case j.ratio < 0.70:
			class = 4
		case j.ratio < 0.85:
			class = 3
		case j.ratio < 0.95:
			class = 2
		}
		if !j.fire {
			class = 0
		}
		add("capacity-ratio", class, srcOwn+": ≥ 0.95 class 1, 0.85–0.95 class 2, 0.70–0.85 class 3, < 0.70 class 4",
			"residual/undamaged characteristic capacity %.3f (%s)", j.ratio, j.ratioDir)
	}
	if !math.IsNaN(j.utilisation) && j.utilisation > 1 {
		add("utilisation", 4, srcOwn, "demand exceeds the residual design resistance in %s (utilisation %.2f)", j.utilisationDir, j.utilisation)
	}
	d.Label = damageLabels[d.Class]
	code, text := action(d.Class, j)
	return d, code, text
}

// action words the recommended action for a class (Residuum's own wording,
// after the repair categories tied to the classes, research/residual.md §4.1).
func action(class int, j judgeInput) (string, string) {
	switch class {
	case 0:
		return "no-action", "No structural action."
	case 1:
		return "clean-and-redecorate", "No structural action: clean off soot and make good the finishes."
	case 2:
		return "reinstate-cover", "Repair: break out loose and pink (weakened) cover concrete and reinstate the cover with repair mortar or sprayed concrete, to restore durability and fire protection."
	case 3:
		return "structural-repair", "Structural repair: remove the concrete weakened above about 300 °C where it matters, reinstate the section and add or splice reinforcement where bars were weakened or exposed; confirm with cores and bar coupons before design."
	}
	u := !math.IsNaN(j.utilisation)
	r := !math.IsNaN(j.ratio)
	if (u && j.utilisation > 1.25) || (r && j.ratio < 0.5) {
		return "replace-or-strengthen", "Prop the member now; replace it, or strengthen it to carry the full demand, after testing confirms the loss."
	}
	if !(u && j.utilisation > 1) && !(r && j.ratio < 0.70) {
		return "major-repair", "Major repair: prop as needed, break out to sound concrete behind the exposed or weakened bars, replace buckled or weakened bars or add new ones, and recast or spray the section; check bond, anchorage and laps."
	}
	return "strengthen", "Strengthen the member (added reinforcement with sprayed concrete, bonded plates or FRP) to restore the required capacity; prop first where the demand exceeds the residual resistance."
}

func tern(c bool, a, b string) string {
	if c {
		return a
	}
	return b
}

// baseCautions accompany every result (DESIGN.md §1, research/residual.md §7).
var baseCautions = []string{
	"Screening estimate only: the result rests on the reported inputs and on generic published residual-property curves; it is not a structural assessment.",
	"A qualified (chartered or licensed) structural engineer must review it; decisions to reoccupy, repair or demolish are theirs, under the local codes and the authority having jurisdiction, whose rules prevail. Propping and the safety of people come first.",
	"Testing of the actual materials governs: cores sliced by depth, petrography and bar coupons replace the generic curves before any decision.",
	"Only bending is checked: shear, anchorage and laps, punching, connections, deflection and distortion, and thermal-restraint damage to adjacent members are not covered.",
	"The cooling regime (fire-fighting water can cost a further 30–35 % of concrete strength) and the time since the fire (strength loss or regain on rehydration) are not modelled.",
	"Where the result is marginal or ambiguous, consider a load test (e.g. ACI 437.2) or strengthening.",
}
