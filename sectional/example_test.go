package sectional_test

import (
	"context"
	"fmt"

	"residuum/sectional"
)

// A 300 × 500 mm beam of C30 concrete in 5 mm cells with three bars of
// 500 mm² at 50 mm from the bottom. The exact parabola–rectangle hand value
// is As·fy·(d - 0.416·x) with x = As·fy/(0.8095·fc·b) = 102.9 mm: 305.4 kN·m.
// Crushing is checked at the top cell centre, 2.5 mm below the face, so the
// final curvature is about εcu2/(x - 2.5 mm) = 0.035 1/m.
func ExampleMomentCurvature() {
	conc := sectional.EC2ParabolaRectangle(30)
	steel := sectional.BilinearSteel{Fy: 500, Es: 200000}
	s := sectional.Section{Outline: []sectional.Rect{{X0: 0, Y0: 0, X1: 300, Y1: 500}}}
	for y := 2.5; y < 500; y += 5 {
		for x := 2.5; x < 300; x += 5 {
			s.Fibres = append(s.Fibres, sectional.Fibre{XMM: x, YMM: y, AreaMM2: 25, Material: conc})
		}
	}
	for _, x := range []float64{50, 150, 250} {
		s.Fibres = append(s.Fibres, sectional.Fibre{XMM: x, YMM: 50, AreaMM2: 500, Material: steel, Bar: true})
	}

	c, err := sectional.MomentCurvature(context.Background(), s, sectional.Sagging, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	last := c.Points[len(c.Points)-1]
	fmt.Printf("capacity %.1f kN·m: %v\n", c.CapacityKNm, c.Mode)
	fmt.Printf("first yield at κ = %.4f 1/m, M = %.0f kN·m\n", c.KappaYield, c.MomentYieldKNm)
	fmt.Printf("at crushing: κ = %.4f 1/m, neutral axis %.0f mm, steel strain %.1f ‰\n",
		last.KappaPerM, last.NeutralAxisMM, 1000*last.SteelStrain)
	// Output:
	// capacity 305.4 kN·m: tension steel yields, then concrete crushes
	// first yield at κ = 0.0086 1/m, M = 295 kN·m
	// at crushing: κ = 0.0350 1/m, neutral axis 102 mm, steel strain 12.2 ‰
}
