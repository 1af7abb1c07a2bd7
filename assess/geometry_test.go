package assess

import (
	"math"
	"testing"
)

// TestLayerPositions: cover is to the bar surface plus the link; bars spread
// evenly between the side covers; a T-beam's top layer spreads over the
// flange; a slab layer lumps its bars per analysed width (geometry by
// definition of the input, exact to 1e-9 mm).
func TestLayerPositions(t *testing.T) {
	m := Member{Kind: KindBeam, WidthMM: 300, DepthMM: 600, LinkDiaMM: 10,
		Layers: []Layer{{Face: "bottom", CoverMM: 30, Count: 4, DiaMM: 20}, {Face: "top", CoverMM: 25, Count: 1, DiaMM: 16}}}
	b := m.barSpecs()
	wantX := []float64{50, 50 + 200.0/3, 50 + 2*200.0/3, 250}
	for i := 0; i < 4; i++ {
		if math.Abs(b[i].XMM-wantX[i]) > 1e-9 || math.Abs(b[i].YMM-50) > 1e-9 {
			t.Errorf("bar %d at (%g, %g), want (%g, 50)", i, b[i].XMM, b[i].YMM, wantX[i])
		}
		if math.Abs(b[i].AreaMM2-math.Pi*100) > 1e-9 || b[i].CoverMM != 40 {
			t.Errorf("bar %d area %g cover %g", i, b[i].AreaMM2, b[i].CoverMM)
		}
	}
	if math.Abs(b[4].XMM-150) > 1e-9 || math.Abs(b[4].YMM-(600-25-10-8)) > 1e-9 {
		t.Errorf("single top bar at (%g, %g), want (150, 557)", b[4].XMM, b[4].YMM)
	}

	tb := Member{Kind: KindBeam, WidthMM: 300, DepthMM: 550, FlangeWidthMM: 1200, FlangeDepthMM: 150,
		Layers: []Layer{{Face: "top", CoverMM: 30, Count: 2, DiaMM: 16}, {Face: "bottom", CoverMM: 30, Count: 2, DiaMM: 20}}}
	b = tb.barSpecs()
	if math.Abs(b[0].XMM-38) > 1e-9 || math.Abs(b[1].XMM-1162) > 1e-9 {
		t.Errorf("flange bars at x = %g, %g, want 38 and 1162 (across the flange)", b[0].XMM, b[1].XMM)
	}
	if math.Abs(b[2].XMM-(450+40)) > 1e-9 || math.Abs(b[3].XMM-(750-40)) > 1e-9 {
		t.Errorf("web bars at x = %g, %g, want 490 and 710 (within the web)", b[2].XMM, b[3].XMM)
	}

	s := Member{Kind: KindSlab, WidthMM: 1000, DepthMM: 200, Layers: []Layer{{Face: "bottom", CoverMM: 20, SpacingMM: 200, DiaMM: 10}}}
	b = s.barSpecs()
	if len(b) != 1 || math.Abs(b[0].AreaMM2-5*math.Pi*25) > 1e-9 || math.Abs(b[0].YMM-25) > 1e-9 || b[0].Count != 5 {
		t.Errorf("slab layer %+v, want 5 bars of 10 mm per metre at y = 25", b)
	}
}

// TestGridGeometry: the grid keeps whole cells and the T-beam's web centred.
func TestGridGeometry(t *testing.T) {
	tb := Member{Kind: KindBeam, WidthMM: 300, DepthMM: 550, FlangeWidthMM: 1200, FlangeDepthMM: 150}
	g := newGridGeom(&tb, 10)
	if g.nx != 120 || g.ny != 55 || g.webLo != 45 || g.webHi != 75 || g.flangeRows != 15 || g.dx != 0 {
		t.Errorf("grid %+v", g)
	}
	if !g.inOutline(50, 10) || g.inOutline(10, 10) || !g.inOutline(10, 50) {
		t.Error("outline mask wrong")
	}
	along, x, y, nx, ny := g.midFace("left")
	if along != 200 || x != 450 || y != 200 || nx != 1 || ny != 0 {
		t.Errorf("left mid-face %g (%g, %g) n (%g, %g)", along, x, y, nx, ny)
	}
}

// TestBarPositions: the exported layout is the engine's own (the same
// centres as the steel fibres of a beam), slab layers are spread at their
// spacing from half a spacing in, defaults are applied to a copy, and
// unvalidated input neither panics nor places unbounded bars. Check values by
// hand from the definition of the input (cover to the bar surface plus link,
// centre ½ diameter further in), exact to 1e-9 mm (sums of whole mm).
func TestBarPositions(t *testing.T) {
	m := Member{Kind: KindBeam, WidthMM: 300, DepthMM: 600, LinkDiaMM: 10,
		Layers: []Layer{{Face: "bottom", CoverMM: 30, Count: 4, DiaMM: 20, Steel: SteelColdWorked}, {Face: "top", CoverMM: 25, Count: 1, DiaMM: 16}},
		Bars:   []Bar{{XMM: 150, YMM: 300, DiaMM: 12}}}
	p := m.BarPositions()
	specs := m.barSpecs()
	if len(p) != len(specs) || len(p) != 6 {
		t.Fatalf("%d positions, %d fibres, want 6 each", len(p), len(specs))
	}
	for i := range p {
		if math.Abs(p[i].XMM-specs[i].XMM) > 1e-9 || math.Abs(p[i].YMM-specs[i].YMM) > 1e-9 || p[i].CoverMM != specs[i].CoverMM || p[i].Face != specs[i].Face {
			t.Errorf("position %d %+v differs from fibre %+v", i, p[i], specs[i])
		}
	}
	// bottom: y = 30 + 10 + 10 = 50, x from 50 to 250; top: y = 600 − (25 + 10 + 8) = 557 at mid-width
	want := []BarPosition{
		{XMM: 50, YMM: 50, DiaMM: 20, Steel: SteelColdWorked, Face: "bottom", CoverMM: 40, Layer: 0, Index: 0},
		{XMM: 50 + 200.0/3, YMM: 50, DiaMM: 20, Steel: SteelColdWorked, Face: "bottom", CoverMM: 40, Layer: 0, Index: 1},
		{XMM: 50 + 400.0/3, YMM: 50, DiaMM: 20, Steel: SteelColdWorked, Face: "bottom", CoverMM: 40, Layer: 0, Index: 2},
		{XMM: 250, YMM: 50, DiaMM: 20, Steel: SteelColdWorked, Face: "bottom", CoverMM: 40, Layer: 0, Index: 3},
		{XMM: 150, YMM: 557, DiaMM: 16, Steel: SteelHotRolled, Face: "top", CoverMM: 35, Layer: 1, Index: 0},
		// single bar at the centre: side covers 150 − 6 = 144 tie (bottom/top 294); the left side is taken first
		{XMM: 150, YMM: 300, DiaMM: 12, Steel: SteelHotRolled, Face: "left", CoverMM: 144, Layer: -1, Index: 0},
	}
	for i := range want {
		g, w := p[i], want[i]
		if math.Abs(g.XMM-w.XMM) > 1e-9 || math.Abs(g.YMM-w.YMM) > 1e-9 || g.DiaMM != w.DiaMM || g.Steel != w.Steel ||
			g.Face != w.Face || math.Abs(g.CoverMM-w.CoverMM) > 1e-9 || g.Layer != w.Layer || g.Index != w.Index {
			t.Errorf("bar %d = %+v, want %+v", i, g, w)
		}
	}

	// Slab, width defaulted to 1000 mm: 150 mm spacing gives bars at 75, 225, …, 975 (7 bars), y = 25 + 6 = 31.
	s := Member{Kind: KindSlab, DepthMM: 200, Layers: []Layer{{Face: "bottom", CoverMM: 25, SpacingMM: 150, DiaMM: 12}}}
	sp := s.BarPositions()
	if len(sp) != 7 {
		t.Fatalf("slab: %d bars, want 7", len(sp))
	}
	for k, b := range sp {
		if math.Abs(b.XMM-(75+150*float64(k))) > 1e-9 || math.Abs(b.YMM-31) > 1e-9 || b.Index != k {
			t.Errorf("slab bar %d at (%g, %g), want (%g, 31)", k, b.XMM, b.YMM, 75+150*float64(k))
		}
	}
	if s.WidthMM != 0 {
		t.Error("BarPositions changed the member")
	}

	// Unvalidated input: no panic, bounded, unplaceable layers left out.
	bad := Member{Kind: KindSlab, DepthMM: 200, Layers: []Layer{
		{Face: "bottom", CoverMM: 25, SpacingMM: 1e-9, DiaMM: 12},
		{Face: "bottom", CoverMM: math.NaN(), SpacingMM: 100, DiaMM: 12},
		{Face: "bottom", CoverMM: 25, SpacingMM: 0, DiaMM: 12},
	}}
	if n := len(bad.BarPositions()); n != maxLayerBars {
		t.Errorf("slab with 1e-9 mm spacing: %d bars placed, want the bound %d", n, maxLayerBars)
	}
	huge := Member{Kind: KindBeam, WidthMM: 300, DepthMM: 600, Layers: []Layer{{Face: "bottom", CoverMM: 30, Count: 1 << 30, DiaMM: 20}, {Face: "top", CoverMM: 30, Count: 2, DiaMM: 0}},
		Bars: []Bar{{XMM: 10, YMM: 10, DiaMM: -1}}}
	if n := len(huge.BarPositions()); n != maxLayerBars {
		t.Errorf("beam layer of 2^30 bars: %d placed, want the bound %d", n, maxLayerBars)
	}
}
