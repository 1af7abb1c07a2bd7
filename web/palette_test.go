package web

import (
	"math"
	"os"
	"regexp"
	"strings"
	"testing"
)

// TestContrastAA checks every text/background pair of the palette against WCAG 2.x success
// criterion 1.4.3 (contrast minimum, level AA): at least 4.5:1 for body-size text. The ratio and
// the relative luminance are computed by the WCAG 2.x definitions (W3C, "Web Content
// Accessibility Guidelines 2.1", definitions of relative luminance and contrast ratio).
func TestContrastAA(t *testing.T) {
	t.Parallel()
	for _, p := range textPairs {
		if got := contrastRatio(p.FG, p.BG); got < 4.5 {
			t.Errorf("%s: contrast %s on %s = %.2f, want ≥ 4.5 (WCAG 2.x AA)", p.Role, hexOf(p.FG), hexOf(p.BG), got)
		}
	}
}

// TestContrastRatioKnownValues checks the formula on the extreme pair and a worked value:
// black on white is 21:1 by definition (WCAG 2.x); #777777 on white is about 4.48:1, the
// often-quoted grey that just fails AA (common practice; computed by hand from the definition:
// L(#777) = ((0x77/255+0.055)/1.055)^2.4 = 0.1845, (1.05)/(0.2345) = 4.478).
func TestContrastRatioKnownValues(t *testing.T) {
	t.Parallel()
	cases := []struct {
		a, b string
		want float64
		tol  float64 // absolute; the hand value is given to three decimals
	}{
		{"#000000", "#ffffff", 21, 1e-9},
		{"#777777", "#ffffff", 4.478, 0.002},
		{"#ffffff", "#ffffff", 1, 1e-12},
	}
	for _, c := range cases {
		if got := contrastRatio(mustHex(c.a), mustHex(c.b)); math.Abs(got-c.want) > c.tol {
			t.Errorf("contrastRatio(%s, %s) = %.4f, want %.4f ± %g", c.a, c.b, got, c.want, c.tol)
		}
	}
}

// TestRampPerceptuallyOrdered checks that the heat-map ramp gets strictly darker (CIELAB L*
// falls) as the temperature rises, so hotter is always darker, in colour and in greyscale.
// L* is recomputed from the 8-bit sRGB output (CIE 1976 L* from relative luminance Y).
func TestRampPerceptuallyOrdered(t *testing.T) {
	t.Parallel()
	prev := math.Inf(1)
	for tc := 20.0; tc <= 1100; tc += 20 {
		l := rgbToL(rampColour(tc))
		// 8-bit rounding can move L* by ~0.4; demand a fall of at least 0.5 per 20 °C step
		if l > prev-0.5 {
			t.Errorf("ramp L*(%g °C) = %.2f, not darker than L*(%g °C) = %.2f", tc, l, tc-20, prev)
		}
		prev = l
	}
	if a, b := rampColour(-50), rampColour(20); a != b {
		t.Errorf("ramp below 20 °C = %v, want the 20 °C colour %v (clamped)", a, b)
	}
}

// TestLabRoundTrip checks the CIELAB conversion on white and mid grey: L* 100 is white, and
// L* 53.39 is the grey whose relative luminance is 0.2140 (CIE 1976 formula, worked by hand:
// ((53.39+16)/116)^3 = 0.2140 → sRGB 0.5 → 128).
func TestLabRoundTrip(t *testing.T) {
	t.Parallel()
	if got := labToRGB(100, 0, 0); got != mustHex("#ffffff") {
		t.Errorf("labToRGB(100, 0, 0) = %v, want white", got)
	}
	g := labToRGB(53.39, 0, 0)
	for _, v := range []uint8{g.R, g.G, g.B} {
		// D65 white in the matrix gives equal channels within one step of 8-bit rounding
		if v < 127 || v > 129 {
			t.Errorf("labToRGB(53.39, 0, 0) = %v, want about (128, 128, 128)", g)
		}
	}
}

// TestStylesheetUsesPalette: the colours the stylesheet declares are the palette's, so the
// contrast checked above is the contrast the pages have.
func TestStylesheetUsesPalette(t *testing.T) {
	t.Parallel()
	css, err := os.ReadFile("static/site.css")
	if err != nil {
		t.Fatal(err)
	}
	re := regexp.MustCompile(`(--[a-z]+):\s*(#[0-9a-fA-F]{6})`)
	found := map[string]string{}
	for _, m := range re.FindAllStringSubmatch(string(css), -1) {
		found[m[1]] = strings.ToLower(m[2])
	}
	for name, want := range cssVars {
		if got := found[name]; got != hexOf(want) {
			t.Errorf("site.css %s = %q, want the palette's %s", name, got, hexOf(want))
		}
	}
}
