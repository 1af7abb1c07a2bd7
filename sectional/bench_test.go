package sectional

import (
	"context"
	"math"
	"testing"
)

// benchSection is the benchmark section of the issue: 300 × 600 mm as 7 200
// concrete fibres of 5 mm plus 8 bars (4 × 491 mm² at 50 mm from the bottom,
// 4 × 201 mm² at 50 mm from the top). heated gives every concrete fibre its
// own residual law (strength and peak strain varying with the distance from
// the bottom and side faces), so no two fibres can be grouped.
func benchSection(heated bool) Section {
	s := Section{Outline: []Rect{{0, 0, 300, 600}}}
	for j := 0; j < 120; j++ {
		for i := 0; i < 60; i++ {
			x, y := 2.5+5*float64(i), 2.5+5*float64(j)
			var m Material = c30
			if heated {
				d := math.Min(y, math.Min(x, 300-x)) // distance to the nearest exposed face
				k := 1 - 0.6*math.Exp(-d/40)
				m = FireConcrete{Fc: 30 * k, EpsC1: 0.0025 + 0.01*(1-k), EpsCU1: 0.02 + 0.01*(1-k)}
			}
			s.Fibres = append(s.Fibres, Fibre{XMM: x, YMM: y, AreaMM2: 25, Material: m})
		}
	}
	s.Fibres = append(s.Fibres, layer(300, 50, 4*491, 4, b500)...)
	s.Fibres = append(s.Fibres, layer(300, 550, 4*201, 4, b500)...)
	return s
}

func BenchmarkMomentCurvature(b *testing.B) {
	ctx := context.Background()
	for _, bc := range []struct {
		name   string
		heated bool
	}{{"undamaged", false}, {"heated", true}} {
		s := benchSection(bc.heated)
		b.Run(bc.name+"/curve", func(b *testing.B) {
			b.ReportAllocs()
			var c *Curve
			for b.Loop() {
				var err error
				if c, err = MomentCurvature(ctx, s, Sagging, nil); err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64(len(c.Points)), "points")
			b.ReportMetric(float64(c.Evaluations), "evals")
		})
		b.Run(bc.name+"/capacity", func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, _, err := Capacity(ctx, s, Sagging, nil); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// TestSolveAllocs: one equilibrium solution (a curvature step) allocates
// nothing (issue requirement: allocations per curvature step ≈ 0).
func TestSolveAllocs(t *testing.T) {
	m, err := prepare(benchSection(true))
	if err != nil {
		t.Fatal(err)
	}
	sv := newSolver(m, Sagging, 0)
	k := 0.0
	allocs := testing.AllocsPerRun(50, func() {
		k += 1e-7
		st, err := sv.solve(k, 0, 1e-5)
		if err != nil {
			t.Fatal(err)
		}
		_ = sv.check(st)
	})
	if allocs != 0 {
		t.Errorf("allocations per solve = %g, want 0", allocs)
	}
}
