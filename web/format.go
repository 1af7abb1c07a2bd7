package web

import (
	"fmt"
	"math"
	"net/http"
	"strconv"
	"strings"
	"time"
)

func statusText(code int) string {
	if t := http.StatusText(code); t != "" {
		return fmt.Sprintf("%d %s", code, t)
	}
	return strconv.Itoa(code)
}

// ariaInvalid is "true" when a field has a message, for aria-invalid.
func ariaInvalid(msg string) string {
	if msg != "" {
		return "true"
	}
	return "false"
}

// describedBy links a field to its error message for screen readers.
func describedBy(id, msg string) string {
	if msg != "" {
		return id + "-err"
	}
	return ""
}

func countText(shown, total int) string {
	if shown == total {
		return fmt.Sprintf("%d members", total)
	}
	return fmt.Sprintf("%d of %d members", shown, total)
}

func thClass(num bool) string {
	if num {
		return "num"
	}
	return ""
}

// fmtDate formats a UTC time as a date and time to the minute.
func fmtDate(t time.Time) string {
	if t.IsZero() {
		return ""
	}
	return t.UTC().Format("2006-01-02 15:04 UTC")
}

// fmtNum formats v with the given number of decimals; NaN and ±Inf become "–".
func fmtNum(v float64, dec int) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return "–"
	}
	s := strconv.FormatFloat(v, 'f', dec, 64)
	if strings.HasPrefix(s, "-") && strings.Trim(s, "-0.") == "" {
		s = s[1:] // no "-0.0"
	}
	return s
}

// fmtSig formats v to about three significant figures for tables of results (kN·m, MPa, mm).
func fmtSig(v float64) string {
	a := math.Abs(v)
	switch {
	case math.IsNaN(v) || math.IsInf(v, 0):
		return "–"
	case a == 0:
		return "0"
	case a >= 100:
		return fmtNum(v, 0)
	case a >= 10:
		return fmtNum(v, 1)
	case a >= 1:
		return fmtNum(v, 2)
	default:
		return fmtNum(v, 3)
	}
}

// fmtRatio formats a capacity ratio (residual/undamaged) with two decimals, or "–" if absent.
func fmtRatio(r *float64) string {
	if r == nil {
		return "–"
	}
	return fmtNum(*r, 2)
}

// fmtInput formats a number as typed into a form: no trailing zeros, "" for zero when blank is
// allowed.
func fmtInput(v float64) string {
	return strconv.FormatFloat(v, 'f', -1, 64)
}

// stageText words the engine's progress stage for the progress page.
func stageText(stage string) string {
	switch stage {
	case "thermal":
		return "Solving the temperature field of the section"
	case "fit":
		return "Fitting the fire to the colour-change depths"
	case "section":
		return "Moment–curvature analysis, undamaged and residual"
	case "":
		return "Working"
	}
	return strings.ToUpper(stage[:1]) + stage[1:]
}
