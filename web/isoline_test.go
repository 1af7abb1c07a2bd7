package web

import (
	"math"
	"testing"
)

// linearGrid is v = a·x + b·y + c at the cell centres of an nx × ny grid of cell mm.
func linearGrid(nx, ny int, cell, a, b, c float64) grid {
	g := grid{Nx: nx, Ny: ny, Cell: cell, V: make([]float64, nx*ny)}
	for j := range ny {
		for i := range nx {
			x, y := (float64(i)+0.5)*cell, (float64(j)+0.5)*cell
			g.V[j*nx+i] = a*x + b*y + c
		}
	}
	return g
}

// TestIsolineLinearField: for a field linear in x the level-θ contour is the straight line
// x = θ/a, exactly (linear interpolation along square edges is exact for a linear field —
// analytic solution).
func TestIsolineLinearField(t *testing.T) {
	t.Parallel()
	g := linearGrid(20, 10, 5, 10, 0, 0) // v = 10·x, x in mm
	lines := isoline(g, 500)             // x = 50 mm
	if len(lines) != 1 {
		t.Fatalf("isoline of a linear field gave %d lines, want 1", len(lines))
	}
	l := lines[0]
	if len(l) != g.Ny {
		t.Errorf("line has %d points, want %d (one per row of squares + 1)", len(l), g.Ny)
	}
	for _, p := range l {
		if math.Abs(p.X-50) > 1e-9 {
			t.Errorf("point %v off the line x = 50 mm", p)
		}
	}
	// it spans the cell centres from the first to the last row
	ys := []float64{l[0].Y, l[len(l)-1].Y}
	if math.Min(ys[0], ys[1]) != 2.5 || math.Max(ys[0], ys[1]) != 47.5 {
		t.Errorf("line runs from y %g to %g, want 2.5 to 47.5", ys[0], ys[1])
	}
}

// TestIsolineCircle: for v = distance from a centre the contour is a circle; marching squares
// with linear interpolation puts the points within a small fraction of a cell of it (the
// interpolation error of r = √(x²+y²) across a 2 mm cell at r = 30 mm is below
// cell²/(8r) ≈ 0.017 mm — Taylor bound of linear interpolation, common practice; 0.05 mm allowed).
func TestIsolineCircle(t *testing.T) {
	t.Parallel()
	n, cell := 40, 2.0
	g := grid{Nx: n, Ny: n, Cell: cell, V: make([]float64, n*n)}
	cx, cy := 40.0, 40.0
	for j := range n {
		for i := range n {
			x, y := (float64(i)+0.5)*cell, (float64(j)+0.5)*cell
			g.V[j*n+i] = math.Hypot(x-cx, y-cy)
		}
	}
	lines := isoline(g, 30)
	if len(lines) != 1 {
		t.Fatalf("circle gave %d polylines, want 1 closed loop", len(lines))
	}
	l := lines[0]
	if a, b := l[0], l[len(l)-1]; math.Hypot(a.X-b.X, a.Y-b.Y) > 1e-6 {
		t.Errorf("the circle is not closed: starts %v, ends %v", a, b)
	}
	for _, p := range l {
		if r := math.Hypot(p.X-cx, p.Y-cy); math.Abs(r-30) > 0.05 {
			t.Errorf("point %v at radius %.4f, want 30 ± 0.05", p, r)
		}
	}
}

// TestIsolineSkipsMissingCells: squares touching a removed (NaN) cell give no contour.
func TestIsolineSkipsMissingCells(t *testing.T) {
	t.Parallel()
	g := linearGrid(4, 4, 10, 10, 0, 0)
	for j := range 4 {
		g.V[j*4+2] = math.NaN() // a removed column in the middle of the crossing
	}
	// level 200 lies between columns 1 (150) and 2 (removed): nothing to draw
	if lines := isoline(g, 200); len(lines) != 0 {
		t.Errorf("got %d lines across removed cells, want 0", len(lines))
	}
}

// TestSaddle: the ambiguous square is resolved by its mean — with the centre above the level the
// two high corners stay connected, so the segments cut off the low corners.
func TestSaddle(t *testing.T) {
	t.Parallel()
	g := grid{Nx: 2, Ny: 2, Cell: 10, V: []float64{10, 0, 10, 0}} // V[0]=(0,0)=10, (1,0)=0, (0,1)=10, (1,1)=0 … not a saddle
	if segs := squareSegments(g, 0, 0, 5); len(segs) != 1 {
		t.Fatalf("plain square gave %d segments, want 1", len(segs))
	}
	// corners (0,0)=10, (1,0)=0, (1,1)=10, (0,1)=0: a saddle with mean 5
	g.V = []float64{10, 0, 0, 10}      // index j*2+i: (0,0)=10 (1,0)=0 (0,1)=0 (1,1)=10
	segs := squareSegments(g, 0, 0, 4) // mean 5 ≥ 4: high corners joined
	if len(segs) != 2 {
		t.Fatalf("saddle gave %d segments, want 2", len(segs))
	}
	// each segment must isolate a low corner: (1,0) at (15, 5) or (0,1) at (5, 15)
	for _, s := range segs {
		mid := pt{(s.A.X + s.B.X) / 2, (s.A.Y + s.B.Y) / 2}
		d1 := math.Hypot(mid.X-15, mid.Y-5)
		d2 := math.Hypot(mid.X-5, mid.Y-15)
		if math.Min(d1, d2) > 5 {
			t.Errorf("segment %v does not cut off a low corner", s)
		}
	}
}

// TestNiceTicks: round steps of 1, 2, 2.5 or 5 × 10^k covering the range (common practice).
func TestNiceTicks(t *testing.T) {
	t.Parallel()
	cases := []struct {
		lo, hi float64
		n      int
		want   []float64
	}{
		{0, 300, 5, []float64{0, 100, 200, 300}},
		{0, 500, 6, []float64{0, 100, 200, 300, 400, 500}},
		{0, 1000, 5, []float64{0, 200, 400, 600, 800, 1000}},
	}
	for _, c := range cases {
		got := niceTicks(c.lo, c.hi, c.n)
		if len(got) != len(c.want) {
			t.Errorf("niceTicks(%g, %g, %d) = %v, want %v", c.lo, c.hi, c.n, got, c.want)
			continue
		}
		for i := range got {
			if got[i] != c.want[i] {
				t.Errorf("niceTicks(%g, %g, %d) = %v, want %v", c.lo, c.hi, c.n, got, c.want)
				break
			}
		}
	}
	if got := niceTicks(5, 5, 4); got != nil {
		t.Errorf("niceTicks on an empty range = %v, want nil", got)
	}
}
