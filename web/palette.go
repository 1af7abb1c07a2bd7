package web

import (
	"fmt"
	"image/color"
	"math"
)

// The palette is Residuum's own. Text/background pairs are checked for WCAG 2.x AA contrast in
// palette_test.go; plot series differ by line style and marker as well as colour, so they stay
// readable in greyscale print.
var (
	colPaper   = mustHex("#fbfaf7") // page background
	colInk     = mustHex("#1c2430") // body text
	colMuted   = mustHex("#4d5868") // secondary text, units
	colRule    = mustHex("#c9ccd2") // table rules, outlines of light boxes
	colLink    = mustHex("#1a5a8c") // links and primary buttons
	colPanel   = mustHex("#eef1f4") // side panels, table header
	colCaution = mustHex("#7a2c06") // caution text
	colCauBg   = mustHex("#fdf0e4") // caution box background
	colError   = mustHex("#9b1c1c") // field error text
	colOK      = mustHex("#1f5e34") // "issued" and good states
	colConc    = mustHex("#d9d4c9") // concrete fill in the section drawing
	colSteel   = mustHex("#2b2f36") // bars
	colFire    = mustHex("#c0390b") // exposed-face marks
	colSpall   = mustHex("#6b4a2b") // spalled-zone hatching
	colSeriesA = mustHex("#1c2430") // undamaged (solid line, circle markers)
	colSeriesB = mustHex("#b5540c") // residual (dashed line, triangle markers)
	colSeriesC = mustHex("#1a5a8c") // third series (dotted, squares)
	colSeriesD = mustHex("#6a3d7a") // fourth series (dash-dot, crosses)
	colBand    = mustHex("#f1ddcf") // fitted-severity band fill behind the fire curve
)

// textPairs lists every foreground/background combination the stylesheet uses for text, with the
// role it plays; the contrast test walks this list.
var textPairs = []struct {
	Role   string
	FG, BG color.RGBA
}{
	{"body text", colInk, colPaper},
	{"muted text", colMuted, colPaper},
	{"link", colLink, colPaper},
	{"body text on panel", colInk, colPanel},
	{"muted text on panel", colMuted, colPanel},
	{"link on panel", colLink, colPanel},
	{"caution", colCaution, colCauBg},
	{"field error", colError, colPaper},
	{"issued badge", colOK, colPaper},
	{"button label", colPaper, colLink},
	{"label on concrete", colInk, colConc},
	{"body text on figure", colInk, mustHex("#ffffff")},
	{"muted text on figure", colMuted, mustHex("#ffffff")},
	{"caution on white print", colCaution, mustHex("#ffffff")},
	{"isotherm label on its white ground", colInk, mustHex("#ffffff")},
}

// cssVars are the stylesheet's custom properties and the palette colour each must equal
// (palette_test.go checks static/site.css against them).
var cssVars = map[string]color.RGBA{
	"--paper": colPaper, "--ink": colInk, "--muted": colMuted, "--rule": colRule, "--link": colLink,
	"--panel": colPanel, "--caution": colCaution, "--caubg": colCauBg, "--error": colError, "--ok": colOK,
}

func mustHex(s string) color.RGBA {
	var r, g, b uint8
	if _, err := fmt.Sscanf(s, "#%02x%02x%02x", &r, &g, &b); err != nil {
		panic("web: bad colour " + s)
	}
	return color.RGBA{r, g, b, 255}
}

// hexOf returns the colour as #rrggbb for SVG and CSS.
func hexOf(c color.RGBA) string { return fmt.Sprintf("#%02x%02x%02x", c.R, c.G, c.B) }

// relativeLuminance is the WCAG 2.x relative luminance of an sRGB colour (0 black … 1 white).
func relativeLuminance(c color.RGBA) float64 {
	lin := func(v uint8) float64 {
		s := float64(v) / 255
		if s <= 0.04045 {
			return s / 12.92
		}
		return math.Pow((s+0.055)/1.055, 2.4)
	}
	return 0.2126*lin(c.R) + 0.7152*lin(c.G) + 0.0722*lin(c.B)
}

// contrastRatio is the WCAG 2.x contrast ratio (1 … 21) of two colours.
func contrastRatio(a, b color.RGBA) float64 {
	la, lb := relativeLuminance(a), relativeLuminance(b)
	if la < lb {
		la, lb = lb, la
	}
	return (la + 0.05) / (lb + 0.05)
}

// The heat-map ramp runs from a pale warm grey at 20 °C to a deep aubergine at 1100 °C through
// ochre and brick red. Anchors are given in CIELAB with lightness L* falling strictly, and the ramp
// is interpolated in CIELAB, so darker always means hotter (perceptually ordered, also in greyscale).
var rampAnchors = []struct {
	TempC   float64
	L, A, B float64
}{
	{20, 96, 1, 6},
	{200, 86, 4, 32},
	{400, 74, 16, 58},
	{600, 60, 38, 52},
	{800, 45, 48, 34},
	{1000, 30, 36, 4},
	{1100, 20, 26, -10},
}

// rampColour returns the heat-map colour for a peak temperature in °C (clamped to the ramp's range).
func rampColour(tC float64) color.RGBA {
	a := rampAnchors
	if math.IsNaN(tC) || tC <= a[0].TempC {
		return labToRGB(a[0].L, a[0].A, a[0].B)
	}
	for i := 1; i < len(a); i++ {
		if tC <= a[i].TempC {
			f := (tC - a[i-1].TempC) / (a[i].TempC - a[i-1].TempC)
			return labToRGB(a[i-1].L+f*(a[i].L-a[i-1].L), a[i-1].A+f*(a[i].A-a[i-1].A), a[i-1].B+f*(a[i].B-a[i-1].B))
		}
	}
	l := a[len(a)-1]
	return labToRGB(l.L, l.A, l.B)
}

// labToRGB converts CIELAB (D65 white) to 8-bit sRGB, clipping out-of-gamut channels.
func labToRGB(l, a, b float64) color.RGBA {
	fy := (l + 16) / 116
	fx := fy + a/500
	fz := fy - b/200
	finv := func(t float64) float64 {
		if t > 6.0/29 {
			return t * t * t
		}
		return 3 * (6.0 / 29) * (6.0 / 29) * (t - 4.0/29)
	}
	x, y, z := 0.95047*finv(fx), 1.0*finv(fy), 1.08883*finv(fz)
	r := 3.2406*x - 1.5372*y - 0.4986*z
	g := -0.9689*x + 1.8758*y + 0.0415*z
	bl := 0.0557*x - 0.2040*y + 1.0570*z
	enc := func(v float64) uint8 {
		if v <= 0.0031308 {
			v *= 12.92
		} else {
			v = 1.055*math.Pow(v, 1/2.4) - 0.055
		}
		return uint8(math.Round(math.Max(0, math.Min(1, v)) * 255))
	}
	return color.RGBA{enc(r), enc(g), enc(bl), 255}
}

// rgbToLab converts 8-bit sRGB to CIELAB lightness L* (0–100); used by tests to check ordering.
func rgbToL(c color.RGBA) float64 {
	y := relativeLuminance(c) // Y relative to white, same linearisation
	if y > 216.0/24389 {
		return 116*math.Cbrt(y) - 16
	}
	return 24389.0 / 27 * y
}
