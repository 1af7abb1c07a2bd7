package sectional

import (
	"cmp"
	"errors"
	"fmt"
	"math"
	"slices"
)

// Fibre is one piece of the section: a concrete cell or a bar. Its strain is
// the strain of the plane section at its centre.
type Fibre struct {
	XMM, YMM float64 // centre, mm from the section's bottom-left corner
	AreaMM2  float64 // area, mm² (≥ 0)
	// Material is the fibre's own law; nil means removed (spalled or
	// destroyed): the fibre carries nothing and has no limits.
	Material Material
	// Bar marks reinforcement: its strain is reported as the steel strain, its
	// yield decides KappaYield and the failure mode, and it must lie inside
	// the Outline.
	Bar bool
}

// Rect is an axis-aligned rectangle, mm: X0 < X1 and Y0 < Y1.
type Rect struct{ X0, Y0, X1, Y1 float64 }

// Section is a fibre section.
type Section struct {
	Fibres []Fibre
	// Outline is the gross concrete outline, the union of the rectangles
	// (they may overlap). Bars must lie inside it. Moments are taken about
	// the horizontal axis through its geometric centroid, so a damaged
	// section and its undamaged original share the reference axis.
	Outline []Rect
}

// law selects an inlined stress function for the laws of this package; the
// others go through the Material interface.
type law uint8

const (
	lawGeneric law = iota
	lawParabola
	lawFireConcrete
	lawBilinear
	lawFireSteel
	lawParabola2 // parabola–rectangle with n = 2 (a fast loop only; never stored per group)
)

// fibreSet is a struct of arrays of fibre groups: fibres with the same
// material (by value) at the same height are merged into one group, which is
// exact for bending about the horizontal axis.
type fibreSet struct {
	d, a       []float64 // lever (mm, from the reference axis, positive towards the tension face) and area (mm²)
	law        []law
	p0, p1, p2 []float64   // law parameters (see stress)
	fs         []fireSteel // constants of the EN 1992-1-2 steel groups, indexed by their p0 (read-only, shared by copies)
	mat        []Material
	lc, lt     []float64 // limit strains
	ey         []float64 // yield strain, 0 if unknown
}

func (s *fibreSet) len() int { return len(s.d) }

// grow reserves room for n groups.
func (s *fibreSet) grow(n int) {
	s.d, s.a, s.law = make([]float64, 0, n), make([]float64, 0, n), make([]law, 0, n)
	s.p0, s.p1, s.p2 = make([]float64, 0, n), make([]float64, 0, n), make([]float64, 0, n)
	s.mat = make([]Material, 0, n)
	s.lc, s.lt, s.ey = make([]float64, 0, n), make([]float64, 0, n), make([]float64, 0, n)
}

func (s *fibreSet) add(d, a float64, m Material) {
	lc, lt := m.Limits()
	var (
		l          = lawGeneric
		p0, p1, p2 float64
		ey         float64
	)
	switch v := m.(type) {
	case ParabolaRectangle:
		l, p0, p1, p2 = lawParabola, v.Fc, v.EpsC2, v.N
	case FireConcrete:
		l, p0, p1, p2 = lawFireConcrete, v.Fc, v.EpsC1, v.EpsCU1
	case BilinearSteel:
		l, p0, p1, p2 = lawBilinear, v.Fy, v.Es, v.hardening()
	case FireSteel:
		sy, st, su := v.strains()
		l, p0 = lawFireSteel, float64(len(s.fs))
		s.fs = append(s.fs, fireSteelParams(v.Fsy, v.Fsp, v.Es, sy, st, su))
	}
	if y, ok := m.(Yielder); ok {
		ey = y.YieldStrain()
	}
	s.d = append(s.d, d)
	s.a = append(s.a, a)
	s.law = append(s.law, l)
	s.p0 = append(s.p0, p0)
	s.p1 = append(s.p1, p1)
	s.p2 = append(s.p2, p2)
	s.mat = append(s.mat, m)
	s.lc = append(s.lc, lc)
	s.lt = append(s.lt, lt)
	s.ey = append(s.ey, ey)
}

// stress returns the stress of group i at strain e.
func (s *fibreSet) stress(i int, e float64) float64 {
	switch s.law[i] {
	case lawParabola:
		return prStress(e, s.p0[i], s.p1[i], s.p2[i])
	case lawFireConcrete:
		return fireConcreteStress(e, s.p0[i], s.p1[i], s.p2[i])
	case lawBilinear:
		return bilinearStress(e, s.p0[i], s.p1[i], s.p2[i])
	case lawFireSteel:
		return fireSteelStress(e, &s.fs[int(s.p0[i])])
	}
	return s.mat[i].Stress(e)
}

// sortByLever orders the groups by increasing lever (stable).
func (s *fibreSet) sortByLever() {
	if slices.IsSorted(s.d) {
		return
	}
	idx := make([]int, s.len())
	for i := range idx {
		idx[i] = i
	}
	slices.SortStableFunc(idx, func(a, b int) int { return cmp.Compare(s.d[a], s.d[b]) })
	*s = *s.permuted(idx, 1)
}

// oriented returns a copy whose levers are sign·d, in increasing order (the
// most compressed group first under positive curvature). The set must be
// sorted by lever.
func (s *fibreSet) oriented(sign float64) *fibreSet {
	n := s.len()
	idx := make([]int, n)
	for i := range idx {
		idx[i] = i
		if sign < 0 {
			idx[i] = n - 1 - i
		}
	}
	return s.permuted(idx, sign)
}

// permuted returns the groups in the order idx with levers scaled by sign.
func (s *fibreSet) permuted(idx []int, sign float64) *fibreSet {
	n := len(idx)
	o := &fibreSet{
		d: make([]float64, n), a: make([]float64, n), law: make([]law, n),
		p0: make([]float64, n), p1: make([]float64, n), p2: make([]float64, n),
		fs: s.fs, mat: make([]Material, n),
		lc: make([]float64, n), lt: make([]float64, n), ey: make([]float64, n),
	}
	for k, i := range idx {
		o.d[k] = sign * s.d[i]
		o.a[k], o.law[k] = s.a[i], s.law[i]
		o.p0[k], o.p1[k], o.p2[k] = s.p0[i], s.p1[i], s.p2[i]
		o.mat[k] = s.mat[i]
		o.lc[k], o.lt[k], o.ey[k] = s.lc[i], s.lt[i], s.ey[i]
	}
	return o
}

// peakCompression returns the largest compressive stress magnitude of group
// i's law up to its compression limit (MPa): exact for the laws of this
// package, sampled for others.
func (s *fibreSet) peakCompression(i int) float64 {
	switch s.law[i] {
	case lawParabola, lawFireConcrete:
		return s.p0[i]
	case lawBilinear:
		return math.Abs(s.stress(i, math.Max(s.lc[i], -1)))
	case lawFireSteel:
		return s.fs[int(s.p0[i])].fsy
	}
	lim := math.Max(s.lc[i], -0.1)
	var peak float64
	for k := 1; k <= 100; k++ {
		peak = math.Max(peak, math.Abs(s.stress(i, lim*float64(k)/100)))
	}
	return peak
}

// model is a validated section ready for analysis.
type model struct {
	yc, ymin, ymax float64  // centroid height and vertical extent of the Outline, mm
	conc, bars     fibreSet // levers d = y - yc
	// concNoTension is true when every concrete law has zero stress for
	// ε ≥ 0 (the laws of this package), which lets the force loop stop at the
	// neutral axis.
	concNoTension bool
	// squashBound is Σ A·(largest compressive stress of the law), N: an
	// upper bound of the squash load that scales the force tolerance.
	squashBound float64
	// squashN and tensionN are the axial capacities, N (both ≥ 0), valid
	// once haveCaps is set (see capacities).
	squashN, tensionN float64
	haveCaps          bool
}

// prepare validates s and builds its model.
func prepare(s Section) (*model, error) {
	if len(s.Fibres) == 0 {
		return nil, errors.New("section.Fibres: empty, want at least one concrete fibre")
	}
	if len(s.Outline) == 0 {
		return nil, errors.New("section.Outline: empty, want at least one rectangle")
	}
	for i, r := range s.Outline {
		if !finite(r.X0) || !finite(r.X1) || !finite(r.Y0) || !finite(r.Y1) || r.X1 <= r.X0 || r.Y1 <= r.Y0 {
			return nil, fmt.Errorf("section.Outline[%d] = %+v: want finite X0 < X1 and Y0 < Y1 (mm)", i, r)
		}
	}
	_, yc, ymin, ymax := outlineCentroid(s.Outline)
	m := &model{yc: yc, ymin: ymin, ymax: ymax, concNoTension: true}

	// Fibres with the same material (by value) at the same height and of the
	// same kind merge into one group. A fibre is compared with the group of
	// the previous fibre and with the last group at its height, which finds
	// the merges of row-by-row grids and of layered (slab) temperature fields
	// without comparing every pair. The first pass only assigns groups (a
	// representative fibre and the summed area); the second builds the
	// arrays at their final size.
	type group struct {
		rep  int // index of the first fibre of the group
		area float64
	}
	type rowKey struct {
		y   float64
		bar bool
	}
	var concG, barG []group
	lastInRow := make(map[rowKey]int)
	prevGroup, prevBar := -1, false
	merge := func(gs []group, g int, f Fibre) bool {
		r := s.Fibres[gs[g].rep]
		return r.YMM == f.YMM && sameMaterial(r.Material, f.Material)
	}

	nConc := 0
	for i, f := range s.Fibres {
		if !finite(f.XMM) || !finite(f.YMM) {
			return nil, fmt.Errorf("section.Fibres[%d]: position (%g, %g) mm: want finite coordinates", i, f.XMM, f.YMM)
		}
		if !finite(f.AreaMM2) || f.AreaMM2 < 0 {
			return nil, fmt.Errorf("section.Fibres[%d].AreaMM2 = %g: want a finite area ≥ 0 mm²", i, f.AreaMM2)
		}
		if f.Bar && !inside(s.Outline, f.XMM, f.YMM) {
			return nil, fmt.Errorf("section.Fibres[%d]: bar at (%g, %g) mm lies outside the concrete outline", i, f.XMM, f.YMM)
		}
		if f.Material == nil || f.AreaMM2 == 0 {
			continue
		}
		gs := &concG
		if f.Bar {
			gs = &barG
		}
		if prevGroup >= 0 && prevBar == f.Bar && merge(*gs, prevGroup, f) {
			(*gs)[prevGroup].area += f.AreaMM2
			continue
		}
		rk := rowKey{f.YMM, f.Bar}
		if g, ok := lastInRow[rk]; ok && merge(*gs, g, f) {
			(*gs)[g].area += f.AreaMM2
			prevGroup, prevBar = g, f.Bar
			continue
		}
		if v, ok := f.Material.(Validator); ok {
			if err := v.Validate(); err != nil {
				return nil, fmt.Errorf("section.Fibres[%d].Material: %w", i, err)
			}
		}
		lc, lt := f.Material.Limits()
		if math.IsNaN(lc) || math.IsNaN(lt) || lc > 0 || lt < 0 {
			return nil, fmt.Errorf("section.Fibres[%d].Material: limit strains (%g, %g): want compression ≤ 0 and tension ≥ 0", i, lc, lt)
		}
		if !f.Bar {
			nConc++
			switch f.Material.(type) {
			case ParabolaRectangle, FireConcrete:
			default:
				m.concNoTension = false
			}
		}
		*gs = append(*gs, group{rep: i, area: f.AreaMM2})
		prevGroup, prevBar = len(*gs)-1, f.Bar
		lastInRow[rk] = prevGroup
	}
	for _, x := range []struct {
		gs  []group
		set *fibreSet
	}{{concG, &m.conc}, {barG, &m.bars}} {
		x.set.grow(len(x.gs))
		for _, g := range x.gs {
			f := s.Fibres[g.rep]
			x.set.add(f.YMM-yc, g.area, f.Material)
		}
	}
	if nConc == 0 {
		return nil, errors.New("section.Fibres: no concrete fibre with a material and an area, so nothing can carry compression")
	}
	// Order by height so that oriented copies need no sorting.
	m.conc.sortByLever()
	m.bars.sortByLever()
	for _, set := range []*fibreSet{&m.conc, &m.bars} {
		for i := range set.d {
			m.squashBound += set.a[i] * set.peakCompression(i)
		}
	}
	if !(m.squashBound > 0) {
		return nil, errors.New("section: the fibres carry no compression (all concrete strengths are zero)")
	}
	return m, nil
}

// sameMaterial reports whether a and b are equal laws. Laws whose dynamic
// type cannot be compared are never equal.
func sameMaterial(a, b Material) (eq bool) {
	switch x := a.(type) {
	case ParabolaRectangle:
		y, ok := b.(ParabolaRectangle)
		return ok && x == y
	case FireConcrete:
		y, ok := b.(FireConcrete)
		return ok && x == y
	case BilinearSteel:
		y, ok := b.(BilinearSteel)
		return ok && x == y
	case FireSteel:
		y, ok := b.(FireSteel)
		return ok && x == y
	}
	defer func() {
		if recover() != nil {
			eq = false
		}
	}()
	return a == b
}

// capacities returns the squash load and the tension capacity, N, computing
// them on first use.
func (m *model) capacities() (squash, tension float64, err error) {
	if !m.haveCaps {
		if m.squashN, err = m.uniformExtreme(-1); err != nil {
			return 0, 0, err
		}
		if m.tensionN, err = m.uniformExtreme(1); err != nil {
			return 0, 0, err
		}
		m.haveCaps = true
	}
	return m.squashN, m.tensionN, nil
}

// outlineCentroid returns the area (mm²), centroid height and vertical extent
// of the union of rects, by splitting the plane on every rectangle edge.
func outlineCentroid(rects []Rect) (area, yc, ymin, ymax float64) {
	var xs, ys []float64
	for _, r := range rects {
		xs = append(xs, r.X0, r.X1)
		ys = append(ys, r.Y0, r.Y1)
	}
	slices.Sort(xs)
	slices.Sort(ys)
	xs = slices.Compact(xs)
	ys = slices.Compact(ys)
	var moment float64
	for j := 0; j+1 < len(ys); j++ {
		ym := 0.5 * (ys[j] + ys[j+1])
		for i := 0; i+1 < len(xs); i++ {
			if !inside(rects, 0.5*(xs[i]+xs[i+1]), ym) {
				continue
			}
			a := (xs[i+1] - xs[i]) * (ys[j+1] - ys[j])
			area += a
			moment += a * ym
		}
	}
	return area, moment / area, ys[0], ys[len(ys)-1]
}

// inside reports whether (x, y) lies in one of rects (boundary included).
func inside(rects []Rect, x, y float64) bool {
	for _, r := range rects {
		if x >= r.X0 && x <= r.X1 && y >= r.Y0 && y <= r.Y1 {
			return true
		}
	}
	return false
}

// axialForce returns the internal force (N, tension positive) at a uniform
// strain e.
func (m *model) axialForce(e float64) float64 {
	var n float64
	for _, set := range []*fibreSet{&m.conc, &m.bars} {
		for i := range set.d {
			n += set.stress(i, e) * set.a[i]
		}
	}
	return n
}

// uniformExtreme returns the largest force magnitude (N) that a uniform
// strain of the given sign (-1 compression, +1 tension) produces before the
// first fibre passes its limit strain in that direction. If no fibre has a
// finite limit, strains up to 10 % are searched. The search samples the
// strain range and refines the best sample by golden sections.
func (m *model) uniformExtreme(sign float64) (float64, error) {
	lim := math.Inf(1)
	for _, set := range []*fibreSet{&m.conc, &m.bars} {
		for i := range set.d {
			l := set.lt[i]
			if sign < 0 {
				l = -set.lc[i]
			}
			lim = math.Min(lim, l)
		}
	}
	if math.IsInf(lim, 1) {
		lim = 0.1
	}
	f := func(e float64) float64 { return sign * m.axialForce(sign*e) }
	const samples = 200
	best, bestE := f(lim), lim
	for k := 1; k < samples; k++ {
		e := lim * float64(k) / samples
		if v := f(e); v > best {
			best, bestE = v, e
		}
	}
	if bestE < lim {
		lo, hi := math.Max(0, bestE-lim/samples), math.Min(lim, bestE+lim/samples)
		if v, e := goldenMax(f, lo, hi, 1e-12*lim); v > best {
			best, bestE = v, e
		}
	}
	if !finite(best) {
		return 0, fmt.Errorf("section: axial force at uniform strain %g is not finite", sign*bestE)
	}
	return math.Max(best, 0), nil
}

// goldenMax maximises f on [lo, hi] by golden-section search to width tol.
func goldenMax(f func(float64) float64, lo, hi, tol float64) (fmax, x float64) {
	const g = 0.6180339887498949
	a, b := lo, hi
	c, d := b-g*(b-a), a+g*(b-a)
	fc, fd := f(c), f(d)
	for i := 0; i < 200 && b-a > tol; i++ {
		if fc >= fd {
			b, d, fd = d, c, fc
			c = b - g*(b-a)
			fc = f(c)
		} else {
			a, c, fc = c, d, fd
			d = a + g*(b-a)
			fd = f(d)
		}
	}
	if fc >= fd {
		return fc, c
	}
	return fd, d
}

// AxialCapacity returns the squash load in compression and the capacity in
// pure tension, both as positive kN. Each is the largest axial force that a
// uniform strain produces before the first fibre reaches its limit strain;
// for parabola–rectangle concrete and bilinear steel the compression value is
//
//	N = Σ Fc·Ac + Σ σs(-εcu2)·As
//
// (the limit εcu2, not the εc2 of EN 1992-1-1 §6.1(5); use AxialForce at
// -εc2 for that variant). Concrete carries no tension, so the tension value
// is the bars' alone.
func AxialCapacity(s Section) (compressionKN, tensionKN float64, err error) {
	m, err := prepare(s)
	if err != nil {
		return 0, 0, fmt.Errorf("axial capacity: %w", err)
	}
	c, t, err := m.capacities()
	if err != nil {
		return 0, 0, fmt.Errorf("axial capacity: %w", err)
	}
	return c / 1000, t / 1000, nil
}

// AxialForce returns the axial force (kN, compression positive) that the
// section carries at a uniform strain (tension positive), e.g. -0.002 for the
// EN 1992-1-1 §6.1(5) squash load.
func AxialForce(s Section, strain float64) (float64, error) {
	if !finite(strain) || math.Abs(strain) > 1 {
		return 0, fmt.Errorf("axial force: strain = %g: want a finite strain, |ε| ≤ 1", strain)
	}
	m, err := prepare(s)
	if err != nil {
		return 0, fmt.Errorf("axial force: %w", err)
	}
	return -m.axialForce(strain) / 1000, nil
}
