package web

import (
	"math"
)

// grid is a scalar field sampled at cell centres: value (i, j) is V[j*Nx+i], i along x from the
// left, j along y from the bottom, centre at ((i+0.5)·Cell, (j+0.5)·Cell) mm. NaN marks a cell
// that is not part of the section (outside the outline or removed by spalling).
type grid struct {
	Nx, Ny int
	Cell   float64 // mm
	V      []float64
}

func (g grid) at(i, j int) float64 { return g.V[j*g.Nx+i] }

// segment is one piece of an isoline, in section millimetres (y from the bottom).
type segment struct{ A, B pt }

// isoline returns the level-θ contour of g by marching squares over the squares formed by four
// neighbouring cell centres, joined into polylines. Squares with a missing corner are skipped.
// The ambiguous saddle cases are resolved by the mean of the four corners.
func isoline(g grid, level float64) [][]pt {
	var segs []segment
	for j := 0; j+1 < g.Ny; j++ {
		for i := 0; i+1 < g.Nx; i++ {
			segs = append(segs, squareSegments(g, i, j, level)...)
		}
	}
	return joinSegments(segs)
}

// squareSegments returns the contour pieces inside the square whose lower-left corner is the centre
// of cell (i, j).
func squareSegments(g grid, i, j int, level float64) []segment {
	// corners counter-clockwise from lower-left
	v := [4]float64{g.at(i, j), g.at(i+1, j), g.at(i+1, j+1), g.at(i, j+1)}
	for _, x := range v {
		if math.IsNaN(x) {
			return nil
		}
	}
	c := g.Cell
	x0, y0 := (float64(i)+0.5)*c, (float64(j)+0.5)*c
	p := [4]pt{{x0, y0}, {x0 + c, y0}, {x0 + c, y0 + c}, {x0, y0 + c}}
	idx := 0
	for k := range 4 {
		if v[k] >= level {
			idx |= 1 << k
		}
	}
	if idx == 0 || idx == 15 {
		return nil
	}
	// edge k joins corner k and k+1
	cross := func(k int) pt {
		a, b := k, (k+1)%4
		t := (level - v[a]) / (v[b] - v[a])
		return pt{p[a].X + t*(p[b].X-p[a].X), p[a].Y + t*(p[b].Y-p[a].Y)}
	}
	var edges []int
	for k := range 4 {
		inA := v[k] >= level
		inB := v[(k+1)%4] >= level
		if inA != inB {
			edges = append(edges, k)
		}
	}
	if len(edges) == 2 {
		return []segment{{cross(edges[0]), cross(edges[1])}}
	}
	// saddle: four crossings on edges 0,1,2,3
	mean := (v[0] + v[1] + v[2] + v[3]) / 4
	hiDiag02 := v[0] >= level // corners 0 and 2 are above (idx 5) or 1 and 3 (idx 10)
	if (mean >= level) == hiDiag02 {
		// the high corners are connected through the centre: cut off the low corners 1 and 3
		return []segment{{cross(0), cross(1)}, {cross(2), cross(3)}}
	}
	return []segment{{cross(3), cross(0)}, {cross(1), cross(2)}}
}

// joinSegments chains segments that share end points into polylines.
func joinSegments(segs []segment) [][]pt {
	type key struct{ x, y int64 }
	k := func(p pt) key { return key{int64(math.Round(p.X * 1e4)), int64(math.Round(p.Y * 1e4))} }
	ends := map[key][]int{}
	for i, s := range segs {
		ends[k(s.A)] = append(ends[k(s.A)], i)
		ends[k(s.B)] = append(ends[k(s.B)], i)
	}
	used := make([]bool, len(segs))
	next := func(p pt) (pt, bool) {
		for _, i := range ends[k(p)] {
			if used[i] {
				continue
			}
			used[i] = true
			if k(segs[i].A) == k(p) {
				return segs[i].B, true
			}
			return segs[i].A, true
		}
		return pt{}, false
	}
	var lines [][]pt
	for i, s := range segs {
		if used[i] {
			continue
		}
		used[i] = true
		line := []pt{s.A, s.B}
		for {
			q, ok := next(line[len(line)-1])
			if !ok {
				break
			}
			line = append(line, q)
		}
		// extend backwards from the first point
		var head []pt
		for {
			from := line[0]
			if len(head) > 0 {
				from = head[len(head)-1]
			}
			q, ok := next(from)
			if !ok {
				break
			}
			head = append(head, q)
		}
		if len(head) > 0 {
			rev := make([]pt, 0, len(head)+len(line))
			for h := len(head) - 1; h >= 0; h-- {
				rev = append(rev, head[h])
			}
			line = append(rev, line...)
		}
		lines = append(lines, line)
	}
	return lines
}
