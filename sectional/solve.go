package sectional

import (
	"errors"
	"fmt"
	"math"
)

// errNoEquilibrium reports a curvature at which no reference strain balances
// the axial force.
var errNoEquilibrium = errors.New("no axial equilibrium")

// Tolerances and caps of the equilibrium solver.
const (
	// forceTolRel scales the force tolerance: |ΣσA + N| ≤ forceTolRel·(|N| + Σ A·f_peak),
	// where Σ A·f_peak bounds the squash load from above.
	forceTolRel = 1e-8
	// strainTol is the bracket width in strain at which the solver stops.
	strainTol = 1e-13
	// maxBrent caps the Brent iterations; reaching it is an error.
	maxBrent = 200
	// maxExpand caps the bracket doublings; reaching it is an error.
	maxExpand = 80
	// maxRefStrain bounds the reference strain searched for equilibrium.
	maxRefStrain = 10.0
)

// solver evaluates and balances the section in one bending direction.
type solver struct {
	conc, bars *fibreSet // oriented: lever d > 0 towards the tension face
	noTension  bool      // concrete stress is zero for ε ≥ 0 (lets the loop stop)
	concLaw    law       // the one law of all concrete groups (lawParabola2: n = 2), else lawGeneric
	target     float64   // required internal force, N (tension positive) = -N_axial
	ftol       float64   // force tolerance, N
	dFace      float64   // lever of the compression face, mm (negative)
	solves     int       // equilibrium solutions found
	evals      int       // section evaluations
}

// state is one equilibrium state.
type state struct {
	k, e0 float64 // curvature (1/mm) and reference strain at the centroid
	m     float64 // moment about the centroid, N·mm (positive in the chosen direction)
}

func newSolver(m *model, dir Direction, axialKN float64) *solver {
	sign := -1.0 // sagging: tension at the bottom, lever d = yc - y
	dFace := m.yc - m.ymax
	if dir == Hogging {
		sign = 1
		dFace = m.ymin - m.yc
	}
	conc := m.conc.oriented(sign)
	return &solver{
		conc:      conc,
		concLaw:   conc.commonLaw(),
		bars:      m.bars.oriented(sign),
		noTension: m.concNoTension,
		target:    -axialKN * 1000,
		ftol:      forceTolRel * (math.Abs(axialKN*1000) + m.squashBound),
		dFace:     dFace,
	}
}

// forces returns the internal axial force (N, tension positive) and moment
// (N·mm) for reference strain e0 and curvature k (1/mm, k ≥ 0).
func (s *solver) forces(e0, k float64) (n, mom float64) {
	s.evals++
	c := s.conc
	// Levers increase along the set, so with no concrete tension the loops
	// stop at the first group in tension: every later one is too.
	switch s.concLaw {
	case lawParabola2:
		for i, d := range c.d {
			e := e0 + k*d
			if e >= 0 {
				break
			}
			fc, ec2 := c.p0[i], c.p1[i]
			var sg float64
			if -e >= ec2 {
				sg = -fc
			} else {
				t := 1 + e/ec2
				sg = -fc * (1 - t*t)
			}
			f := sg * c.a[i]
			n += f
			mom += f * d
		}
	case lawFireConcrete:
		for i, d := range c.d {
			e := e0 + k*d
			if e >= 0 {
				break
			}
			f := fireConcreteStress(e, c.p0[i], c.p1[i], c.p2[i]) * c.a[i]
			n += f
			mom += f * d
		}
	default:
		for i, d := range c.d {
			e := e0 + k*d
			if e >= 0 && s.noTension {
				break
			}
			f := c.stress(i, e) * c.a[i]
			n += f
			mom += f * d
		}
	}
	b := s.bars
	for i, d := range b.d {
		f := b.stress(i, e0+k*d) * b.a[i]
		n += f
		mom += f * d
	}
	return n, mom
}

// solve finds the reference strain that balances the axial force at
// curvature k, starting from guess. It expands a bracket from the guess by
// steps that start at h0 (a strain, the expected error of the guess) and
// double, then runs Brent's method on it. It returns an error if no bracket
// is found within |ε0| ≤ maxRefStrain or an iteration cap is hit.
func (s *solver) solve(k, guess, h0 float64) (state, error) {
	r := func(e0 float64) (float64, float64) {
		n, m := s.forces(e0, k)
		return n - s.target, m
	}
	a := guess
	fa, ma := r(a)
	if math.Abs(fa) <= s.ftol {
		s.solves++
		return state{k: k, e0: a, m: ma}, nil
	}
	// The residual grows with e0 for laws without softening: step towards
	// the root.
	dir := 1.0
	if fa > 0 {
		dir = -1
	}
	h := math.Max(h0, 1e-9)
	b, fb, mb := a, fa, ma
	found := false
	for i := 0; i < maxExpand; i++ {
		b = a + dir*h
		if math.Abs(b) > maxRefStrain {
			break
		}
		fb, mb = r(b)
		if math.Abs(fb) <= s.ftol {
			s.solves++
			return state{k: k, e0: b, m: mb}, nil
		}
		if (fb > 0) != (fa > 0) {
			found = true
			break
		}
		a, fa = b, fb
		h *= 2
	}
	if !found {
		return state{}, fmt.Errorf("%w at curvature %g 1/m: no sign change of the force residual for reference strains up to %g",
			errNoEquilibrium, k*1000, maxRefStrain)
	}
	x, m, err := s.brent(r, a, b, fa, fb)
	if err != nil {
		return state{}, fmt.Errorf("curvature %g 1/m: %w", k*1000, err)
	}
	s.solves++
	return state{k: k, e0: x, m: m}, nil
}

// brent finds a root of f in [a, b] with f(a), f(b) of opposite signs
// (Brent 1973, Algorithms for Minimization without Derivatives, ch. 4). It
// stops when |f| ≤ ftol or the bracket is narrower than strainTol.
func (s *solver) brent(f func(float64) (float64, float64), a, b, fa, fb float64) (x, m float64, err error) {
	c, fc := a, fa
	d := b - a
	e := d
	mb := math.NaN() // moment at b, unknown until f(b) is evaluated here
	for iter := 0; iter < maxBrent; iter++ {
		if (fb > 0) == (fc > 0) {
			c, fc = a, fa
			d = b - a
			e = d
		}
		if math.Abs(fc) < math.Abs(fb) {
			a, b, c = b, c, b
			fa, fb, fc = fb, fc, fb
			mb = math.NaN()
		}
		tol := 2*1e-16*math.Abs(b) + 0.5*strainTol
		xm := 0.5 * (c - b)
		if math.Abs(fb) <= s.ftol || math.Abs(xm) <= tol {
			if math.IsNaN(mb) {
				_, mb = f(b)
			}
			return b, mb, nil
		}
		if math.Abs(e) >= tol && math.Abs(fa) > math.Abs(fb) {
			var p, q float64
			sr := fb / fa
			if a == c {
				p = 2 * xm * sr
				q = 1 - sr
			} else {
				q = fa / fc
				rr := fb / fc
				p = sr * (2*xm*q*(q-rr) - (b-a)*(rr-1))
				q = (q - 1) * (rr - 1) * (sr - 1)
			}
			if p > 0 {
				q = -q
			}
			p = math.Abs(p)
			if 2*p < math.Min(3*xm*q-math.Abs(tol*q), math.Abs(e*q)) {
				e = d
				d = p / q
			} else {
				d = xm
				e = d
			}
		} else {
			d = xm
			e = d
		}
		a, fa = b, fb
		if math.Abs(d) > tol {
			b += d
		} else {
			b += math.Copysign(tol, xm)
		}
		fb, mb = f(b)
	}
	return 0, 0, fmt.Errorf("equilibrium not reached in %d Brent iterations", maxBrent)
}

// fibreCheck summarises the strains of a state.
type fibreCheck struct {
	concMin   float64 // most compressive concrete strain
	steelMax  float64 // largest bar strain (0 if there are no bars)
	util      float64 // largest ratio of strain to its limit strain (≥ 1: past a limit)
	utilBar   bool    // the governing fibre is a bar
	utilTens  bool    // the governing limit is a tension limit
	yieldUtil float64 // largest ratio of tensile bar strain to its yield strain
}

// check computes the strain summary of st. Limits count only for fibres with
// area and a material (removed fibres are not in the sets).
func (s *solver) check(st state) fibreCheck {
	fc := fibreCheck{}
	c := s.conc
	if c.len() > 0 {
		// The first group is the most compressed (levers increase).
		fc.concMin = st.e0 + st.k*c.d[0]
	}
	for i, d := range c.d {
		e := st.e0 + st.k*d
		if e < 0 {
			if u := e / c.lc[i]; u > fc.util {
				fc.util, fc.utilBar, fc.utilTens = u, false, false
			}
		} else if s.noTension {
			// Later groups are in tension; their limits are infinite.
			break
		} else if u := e / c.lt[i]; u > fc.util {
			fc.util, fc.utilBar, fc.utilTens = u, false, true
		}
	}
	b := s.bars
	if b.len() > 0 {
		// The last bar group is the most stretched.
		fc.steelMax = st.e0 + st.k*b.d[b.len()-1]
	}
	for i, d := range b.d {
		e := st.e0 + st.k*d
		if e < 0 {
			if u := e / b.lc[i]; u > fc.util {
				fc.util, fc.utilBar, fc.utilTens = u, true, false
			}
			continue
		}
		if u := e / b.lt[i]; u > fc.util {
			fc.util, fc.utilBar, fc.utilTens = u, true, true
		}
		if b.ey[i] > 0 {
			if u := e / b.ey[i]; u > fc.yieldUtil {
				fc.yieldUtil = u
			}
		}
	}
	return fc
}

// point converts a state to a curve point.
func (s *solver) point(st state, fc fibreCheck) CurvePoint {
	p := CurvePoint{
		KappaPerM:      st.k * 1000,
		MomentKNm:      st.m / 1e6,
		RefStrain:      st.e0,
		ConcreteStrain: fc.concMin,
		SteelStrain:    fc.steelMax,
	}
	if st.k > 0 {
		p.NeutralAxisMM = -st.e0/st.k - s.dFace
	}
	return p
}

// commonLaw returns the law shared by every group of the set, with
// lawParabola2 for parabola–rectangle laws that all have n = 2, and
// lawGeneric if the laws differ.
func (s *fibreSet) commonLaw() law {
	if s.len() == 0 {
		return lawGeneric
	}
	l := s.law[0]
	for i, li := range s.law {
		if li != l {
			return lawGeneric
		}
		if l == lawParabola && s.p2[i] != 2 {
			l = lawGeneric
			break
		}
	}
	if l == lawParabola {
		return lawParabola2
	}
	if l == lawFireConcrete {
		return l
	}
	return lawGeneric
}
