package sectional

import "math"

// grid returns concrete fibres of dx × dy cells filling the rectangle
// [x0, x0+b] × [y0, y0+h] (mm), all with material mat.
func grid(x0, y0, b, h, dx, dy float64, mat Material) []Fibre {
	nx := int(math.Round(b / dx))
	ny := int(math.Round(h / dy))
	dx, dy = b/float64(nx), h/float64(ny)
	fs := make([]Fibre, 0, nx*ny)
	for j := 0; j < ny; j++ {
		for i := 0; i < nx; i++ {
			fs = append(fs, Fibre{
				XMM: x0 + (float64(i)+0.5)*dx, YMM: y0 + (float64(j)+0.5)*dy,
				AreaMM2: dx * dy, Material: mat,
			})
		}
	}
	return fs
}

// layer returns n bars of total area as (mm²) evenly spread across width b at
// height y.
func layer(b, y, as float64, n int, mat Material) []Fibre {
	fs := make([]Fibre, n)
	for i := range fs {
		fs[i] = Fibre{XMM: b * (float64(i) + 0.5) / float64(n), YMM: y, AreaMM2: as / float64(n), Material: mat, Bar: true}
	}
	return fs
}

// rectBeam is a b × h rectangle in strips of thickness dy (the full width:
// exact for bending about the horizontal axis) plus bars.
func rectBeam(b, h, dy float64, conc Material, bars ...[]Fibre) Section {
	s := Section{Fibres: grid(0, 0, b, h, b, dy, conc), Outline: []Rect{{0, 0, b, h}}}
	for _, l := range bars {
		s.Fibres = append(s.Fibres, l...)
	}
	return s
}
