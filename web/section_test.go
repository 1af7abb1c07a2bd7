package web

import (
	"context"
	"math"
	"strings"
	"testing"

	"residuum/assess"
)

// TestBarPositions checks the drawn bar centres against hand calculations of the layout rule of
// assess/geometry.go (centre at cover + link + ½ diameter from the face; a beam layer spread
// evenly between the side covers; a slab layer at its spacing from half a spacing in).
func TestBarPositions(t *testing.T) {
	t.Parallel()
	beam := assess.Input{Member: assess.Member{Kind: "beam", WidthMM: 300, DepthMM: 500, LinkDiaMM: 8,
		Layers: []assess.Layer{
			{Face: "bottom", CoverMM: 30, Count: 3, DiaMM: 20},
			{Face: "top", CoverMM: 25, Count: 2, DiaMM: 12},
		}}}
	tbeam := assess.Input{Member: assess.Member{Kind: "beam", WidthMM: 300, DepthMM: 600, FlangeWidthMM: 1200, FlangeDepthMM: 150,
		Layers: []assess.Layer{{Face: "top", CoverMM: 30, Count: 2, DiaMM: 10}, {Face: "bottom", CoverMM: 40, Count: 2, DiaMM: 20}}}}
	slab := assess.Input{Member: assess.Member{Kind: "slab", DepthMM: 200,
		Layers: []assess.Layer{{Face: "bottom", CoverMM: 25, SpacingMM: 150, DiaMM: 12}}}}
	cases := []struct {
		name string
		in   assess.Input
		want []barGeom
	}{
		// bottom: y = 30 + 8 + 10 = 48; x from 48 to 300 − 48 = 252. top: y = 500 − (25 + 8 + 6) = 461; x 39 and 261.
		{"rectangular beam", beam, []barGeom{{48, 48, 20}, {150, 48, 20}, {252, 48, 20}, {39, 461, 12}, {261, 461, 12}}},
		// top layer spans the flange: x from 30 + 5 = 35 to 1200 − 35 = 1165, y = 600 − 35 = 565;
		// bottom layer in the web (450 to 750): x from 450 + 50 = 500 to 700, y = 50.
		{"T-beam", tbeam, []barGeom{{35, 565, 10}, {1165, 565, 10}, {500, 50, 20}, {700, 50, 20}}},
		// default analysed width 1000 mm; bars at 75, 225, …, 975 (7 bars), y = 25 + 6 = 31.
		{"slab", slab, []barGeom{{75, 31, 12}, {225, 31, 12}, {375, 31, 12}, {525, 31, 12}, {675, 31, 12}, {825, 31, 12}, {975, 31, 12}}},
	}
	for _, c := range cases {
		g := geomFromInput(c.in)
		if len(g.Bars) != len(c.want) {
			t.Errorf("%s: %d bars drawn, want %d", c.name, len(g.Bars), len(c.want))
			continue
		}
		for i, b := range g.Bars {
			w := c.want[i]
			// positions are sums and ratios of whole millimetres: exact to rounding
			if math.Abs(b.X-w.X) > 1e-9 || math.Abs(b.Y-w.Y) > 1e-9 || b.Dia != w.Dia {
				t.Errorf("%s: bar %d at (%g, %g) Ø%g, want (%g, %g) Ø%g", c.name, i, b.X, b.Y, b.Dia, w.X, w.Y, w.Dia)
			}
		}
	}
}

// TestSpallRects: a whole-face soffit spall of a T-beam removes concrete under the web and under
// both flange outstands (assess: "bottom" exposes every downward-facing surface); a partial spall
// is clipped to its from/to range along the face.
func TestSpallRects(t *testing.T) {
	t.Parallel()
	g := geomFromInput(assess.Input{Member: assess.Member{Kind: "beam", WidthMM: 300, DepthMM: 600, FlangeWidthMM: 1200, FlangeDepthMM: 150}})
	got := g.spallRects(assess.MeasuredSpall{Face: "bottom", DepthMM: 20})
	want := [][4]float64{{450, 0, 750, 20}, {0, 450, 450, 470}, {750, 450, 1200, 470}}
	if len(got) != len(want) {
		t.Fatalf("whole soffit spall: %v, want %v", got, want)
	}
	for i := range want {
		if got[i] != want[i] {
			t.Errorf("rect %d = %v, want %v", i, got[i], want[i])
		}
	}
	part := g.spallRects(assess.MeasuredSpall{Face: "bottom", DepthMM: 20, FromMM: 500, ToMM: 900})
	wantPart := [][4]float64{{500, 0, 750, 20}, {750, 450, 900, 470}}
	if len(part) != 2 || part[0] != wantPart[0] || part[1] != wantPart[1] {
		t.Errorf("partial spall = %v, want %v", part, wantPart)
	}
	side := g.spallRects(assess.MeasuredSpall{Face: "right", DepthMM: 15})
	if len(side) != 1 || side[0] != [4]float64{735, 0, 750, 450} {
		t.Errorf("right-face spall = %v, want [[735 0 750 450]] (web side below the flange)", side)
	}
}

// TestSectionSVG checks the drawing's structure: outline, one circle per bar, exposed faces and
// hatched spalls, and a readable message instead of a drawing for an impossible section.
func TestSectionSVG(t *testing.T) {
	t.Parallel()
	in := assess.Input{Member: assess.Member{Kind: "beam", WidthMM: 300, DepthMM: 500, LinkDiaMM: 8,
		Layers: []assess.Layer{{Face: "bottom", CoverMM: 30, Count: 3, DiaMM: 20}}, Exposed: []string{"bottom", "left"}},
		Evidence: &assess.Evidence{Spalling: []assess.MeasuredSpall{{Face: "bottom", DepthMM: 10}},
			ColourDepths: []assess.ColourDepth{{Face: "bottom", IsothermC: 300, DepthMM: 25}}}}
	doc := parseHTML(t, sectionSVG(geomFromInput(in)))
	for _, id := range []string{"section-drawing", "section-outline", "section-bars", "exposed-faces", "spalled-zones", "dimensions"} {
		mustOne(t, doc, id)
	}
	if n := len(elementsByTag(mustOne(t, doc, "section-bars"), "circle")); n != 3 {
		t.Errorf("drawing has %d bar circles, want 3", n)
	}
	if n := len(elementsByTag(mustOne(t, doc, "exposed-faces"), "polyline")); n != 2 {
		t.Errorf("drawing marks %d exposed faces, want 2", n)
	}
	if !strings.Contains(textOf(doc), "c 38") {
		t.Errorf("cover 30 + link 8 not dimensioned as c 38: %q", textOf(doc))
	}
	bad := sectionSVG(geomFromInput(assess.Input{Member: assess.Member{Kind: "beam"}}))
	if !strings.Contains(bad, "enter a width and a depth") {
		t.Errorf("empty section: %q, want a prompt for width and depth", bad)
	}
}

// TestHeatMapFromResult draws the heat map of an engine result: the cells are
// coloured and the three isotherms are drawn.
func TestHeatMapFromResult(t *testing.T) {
	t.Parallel()
	res := cheapResult(t)
	svg := heatMapSVG(res)
	doc := parseHTML(t, svg)
	mustOne(t, doc, "heat-map")
	if n := len(elementsByTag(mustOne(t, doc, "heat-cells"), "rect")); n == 0 {
		t.Fatalf("heat map has no cells")
	}
	if n := len(elementsByTag(mustOne(t, doc, "isotherms"), "polyline")); n < 3 {
		t.Errorf("heat map has %d isotherm polylines, want ≥ 3 (300, 500, 600 °C, halo + line each)", n)
	}
}

// cheapResult runs the engine on a small beam with a soffit spall (20 mm cells, well under a
// second) so the drawing tests see real engine output.
func cheapResult(t testing.TB) *assess.Result {
	t.Helper()
	in, _, inv := validateForm(parseMemberForm(beamForm("B1")))
	if inv != nil {
		t.Fatalf("fixture input invalid: %v", inv)
	}
	res, err := assess.Run(context.Background(), in, nil)
	if err != nil {
		t.Fatalf("run: %v", err)
	}
	return res
}
