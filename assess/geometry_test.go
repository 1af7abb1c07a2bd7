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
