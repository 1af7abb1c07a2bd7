package thermal_test

import (
	"context"
	"fmt"

	"residuum/thermal"
)

// A 200 mm slab exposed from below to 60 min of ISO 834, then cooled at the
// EN 1991-1-2 Annex A rate: the bar at 30 mm reaches its peak after the fire.
func ExampleSolve() {
	fire, err := thermal.NewCooled(thermal.ISO834(), 60, 0)
	if err != nil {
		fmt.Println(err)
		return
	}
	sh := thermal.Shape{WidthMM: 1000, DepthMM: 200, Slab: true, CellMM: 2, Exposed: []thermal.Face{thermal.Bottom}}
	f, err := thermal.Solve(context.Background(), sh, fire, thermal.Concrete{MoisturePct: 1.5},
		&thermal.Options{Probes: []thermal.Point{{XMM: 500, YMM: 30}}})
	if err != nil {
		fmt.Println(err)
		return
	}
	bar := f.Probes[0]
	d500, _ := f.IsothermDepth(thermal.Bottom, 500, 500)
	fmt.Println(fire.Name())
	fmt.Printf("bar at 30 mm: %.0f °C at end of heating, peak %.0f °C (%.0f min after the fire ended)\n",
		bar.EndOfHeatingC, bar.PeakC, bar.PeakTimeMin-60)
	fmt.Printf("500 °C isotherm at %.0f mm\n", d500)
	_, err = thermal.Solve(context.Background(), thermal.Shape{WidthMM: 300, DepthMM: 500, CellMM: 30, Exposed: []thermal.Face{thermal.Bottom}},
		fire, thermal.Concrete{}, nil)
	fmt.Println(err)
	// Output:
	// ISO 834 standard fire, 60 min, then cooling at 8.33 °C/min (EN 1991-1-2 Annex A rate)
	// bar at 30 mm: 393 °C at end of heating, peak 452 °C (29 min after the fire ended)
	// 500 °C isotherm at 25 mm
	// thermal: CellMM = 30 out of range (accepted 1–25)
}
