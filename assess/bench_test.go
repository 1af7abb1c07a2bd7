package assess

import (
	"context"
	"os"
	"path/filepath"
	"testing"
)

func benchInput(b *testing.B, name string) Input {
	b.Helper()
	f, err := os.Open(filepath.Join("..", "testdata", name))
	if err != nil {
		b.Fatal(err)
	}
	defer f.Close()
	in, err := Decode(f)
	if err != nil {
		b.Fatal(err)
	}
	return in
}

// BenchmarkAssessForward is the forward assessment of the 300 × 600 mm beam
// exposed on three sides to 90 min of ISO 834 (5 mm cells: thermal solution
// of heating and cooling + 4 moment–curvature curves + 4 design capacities).
// Target: ≤ 150 ms.
func BenchmarkAssessForward(b *testing.B) {
	in := benchInput(b, "beam-3side-iso90.json")
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := Run(context.Background(), in, nil); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkAssessFit is the same beam fitted to two colour-change depths
// (bottom and left, 5 mm cells), range and capacity range included.
// Target: ≤ 1 s.
func BenchmarkAssessFit(b *testing.B) {
	in := benchInput(b, "beam-colour-fit.json")
	in.Options.CellMM = 5
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		res, err := Run(context.Background(), in, nil)
		if err != nil {
			b.Fatal(err)
		}
		b.ReportMetric(float64(res.Fit.Trials), "member-solves/op")
		b.ReportMetric(float64(res.Fit.StripSolutions), "strip-solves/op")
	}
}
