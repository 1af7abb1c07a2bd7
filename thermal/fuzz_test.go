package thermal

import (
	"context"
	"math"
	"testing"
)

// FuzzSolve feeds arbitrary shapes to Solve: it must return an error or a
// field of finite temperatures within [0, max gas], never panic.
func FuzzSolve(f *testing.F) {
	f.Add(300.0, 500.0, 10.0, 0.0, 0.0, 0.0, uint8(0), false, 0.0)
	f.Add(300.0, 500.0, 25.0, 700.0, 100.0, 30.0, uint8(2), false, 2.0)
	f.Add(1000.0, 150.0, 5.0, 0.0, 0.0, 20.0, uint8(1), true, 1.0)
	f.Add(8.0, 500.0, 10.0, 0.0, 0.0, 0.0, uint8(3), false, 0.0)
	f.Add(-1.0, math.NaN(), 0.0, 1.0, 1e9, -5.0, uint8(9), true, -1.0)
	exp, err := NewCooled(Hydrocarbon(), 5, 50)
	if err != nil {
		f.Fatal(err)
	}
	f.Fuzz(func(t *testing.T, w, d, cell, fw, fd, spall float64, face uint8, slab bool, rate float64) {
		if cell > 0 && w/cell*d/cell > 20000 {
			t.Skip("large mesh")
		}
		fc := Face([]string{"bottom", "top", "left", "right", "side"}[int(face)%5])
		sh := Shape{WidthMM: w, DepthMM: d, CellMM: cell, FlangeWidthMM: fw, FlangeDepthMM: fd, Slab: slab,
			Exposed: []Face{Bottom, fc}}
		if spall != 0 {
			sh.Spalled = []Spall{{Face: fc, DepthMM: spall}}
		}
		if rate != 0 {
			sh.Progressive = []ProgressiveSpall{{Face: Bottom, StartMin: 1, RateMMPerMin: rate, MaxDepthMM: spall}}
		}
		fl, err := Solve(context.Background(), sh, exp, Concrete{MoisturePct: 2}, &Options{EndMin: 10, Probes: []Point{{w / 2, d / 2}}})
		if err != nil {
			return
		}
		for k, v := range fl.Peak {
			if fl.Active[k] && !(v >= 0 && v <= 1100.01) {
				t.Fatalf("cell %d peak %g", k, v)
			}
		}
	})
}
