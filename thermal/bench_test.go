package thermal

import (
	"context"
	"testing"
)

// benchmarkRun solves sh under ISO 834 for 120 min, then EN 1991-1-2 Annex A
// cooling until every peak has passed, and reports the cell updates actually
// computed per second (a symmetric beam solves its half).
func benchmarkRun(b *testing.B, sh Shape) {
	exp, err := NewCooled(ISO834(), 120, 0)
	if err != nil {
		b.Fatal(err)
	}
	c := Concrete{MoisturePct: 1.5}
	ctx := context.Background()
	var updates float64
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		f, err := Solve(ctx, sh, exp, c, nil)
		if err != nil {
			b.Fatal(err)
		}
		updates += f.updates
	}
	b.ReportMetric(updates/b.Elapsed().Seconds(), "cell-updates/s")
}

// BenchmarkSlab: slab 200 mm, 1 mm cells, exposed below.
func BenchmarkSlab(b *testing.B) {
	benchmarkRun(b, Shape{WidthMM: 1000, DepthMM: 200, Slab: true, CellMM: 1, Exposed: []Face{Bottom}})
}

// BenchmarkBeam: beam 300 × 600 mm, 5 mm cells, exposed bottom, left and right.
func BenchmarkBeam(b *testing.B) {
	benchmarkRun(b, Shape{WidthMM: 300, DepthMM: 600, CellMM: 5, Exposed: []Face{Bottom, Left, Right}})
}

func TestAllocationsIndependentOfSteps(t *testing.T) {
	// Zero allocations per step: a run four times as long allocates the same
	// (without probes, whose histories grow with the run).
	ctx := context.Background()
	for _, sh := range []Shape{
		{WidthMM: 300, DepthMM: 400, CellMM: 10, Exposed: []Face{Bottom, Left, Right}},
		{WidthMM: 1000, DepthMM: 200, Slab: true, CellMM: 1, Exposed: []Face{Bottom}},
	} {
		allocs := func(end float64) float64 {
			return testing.AllocsPerRun(2, func() {
				if _, err := Solve(ctx, sh, ISO834(), Concrete{}, &Options{EndMin: end}); err != nil {
					t.Fatal(err)
				}
			})
		}
		a, b := allocs(30), allocs(120)
		if a != b {
			t.Errorf("%v: %g allocations for 30 min, %g for 120 min; want equal", sh.Exposed, a, b)
		}
	}
}
