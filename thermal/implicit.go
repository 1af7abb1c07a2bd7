package thermal

import "math"

// dtImplicitS is the time step of the implicit line solver for slabs, s.
const dtImplicitS = 20.0

// lineSolver holds the work arrays of the implicit 1-D (slab) step.
type lineSolver struct {
	theta, a, b, c, d, q, dq, cp []float64
}

func newLineSolver(n int) *lineSolver {
	mk := func() []float64 { return make([]float64, n) }
	return &lineSolver{theta: mk(), a: mk(), b: mk(), c: mk(), d: mk(), q: mk(), dq: mk(), cp: mk()}
}

// stepImplicit advances a one-column field by dt with backward Euler in
// enthalpy: for each cell
//
//	V·(H(θ_k) − H_k^n)/Δt = Σ G(θ_nb − θ_k) + q_b(θ_k),
//
// G from λ at the start of the step, solved by chord-Newton iterations on a
// tridiagonal system (Thomas algorithm). The step is then closed
// conservatively: H_k ← H_k^n + Δt/V·(flows at the final iterate), θ = θ(H).
func (r *run) stepImplicit(t, dt, gas float64) {
	g, ls, tb := r.g, r.line, r.tb
	n := r.n
	V := g.d * g.d
	T, lam, h, wy := r.t, r.lam, r.h, r.wy
	th := ls.theta
	copy(th, T)
	a, b, cc, d, cp := ls.a, ls.b, ls.c, ls.d, ls.cp
	// Face conductances, fixed over the step (λ at its start).
	for k := 0; k < n; k++ {
		a[k], cc[k] = 0, 0
		if g.status[k] != cellActive {
			continue
		}
		if k > 0 {
			a[k] = -wy[k-1] * (lam[k-1] + lam[k])
		}
		if k < n-1 {
			cc[k] = -wy[k] * (lam[k] + lam[k+1])
		}
	}
	for it := 0; it < r.maxIter; it++ {
		for k := 0; k < n; k++ {
			ls.q[k], ls.dq[k] = 0, 0
		}
		r.surfaceLin(&r.fire, gas, r.alphaFire, r.bc.fireEps, false)
		if !r.bc.adiabatic {
			r.surfaceLin(&r.amb, AmbientC, r.bc.ambAlpha, r.bc.ambEps, false)
		}
		for k := 0; k < n; k++ {
			if g.status[k] != cellActive {
				b[k], d[k] = 1, T[k]
				continue
			}
			var hm, capa float64
			if dth := th[k] - T[k]; math.Abs(dth) > 0.5 {
				hm = tb.enthalpy(th[k])
				capa = (hm - h[k]) / dth // chord: robust across the c_p jump at 100 °C
			} else {
				hm = tb.enthalpy(th[k])
				i := min(max(int(th[k]), 0), tabMaxC-1)
				capa = tb.h[i+1] - tb.h[i]
			}
			vc := V * capa / dt
			b[k] = vc - a[k] - cc[k] - ls.dq[k]
			d[k] = V*(capa*th[k]-hm+h[k])/dt + ls.q[k] - ls.dq[k]*th[k]
		}
		// Thomas algorithm.
		inv := 1 / b[0]
		cp[0] = cc[0] * inv
		d[0] *= inv
		for k := 1; k < n; k++ {
			inv = 1 / (b[k] - a[k]*cp[k-1])
			cp[k] = cc[k] * inv
			d[k] = (d[k] - a[k]*d[k-1]) * inv
		}
		x := d[n-1]
		change := math.Abs(x - th[n-1])
		th[n-1] = x
		for k := n - 2; k >= 0; k-- {
			x = d[k] - cp[k]*x
			if dx := math.Abs(x - th[k]); dx > change {
				change = dx
			}
			th[k] = x
		}
		r.iters++
		if change < 1e-2 {
			break
		}
	}
	// Conservative close with the flows at the final iterate.
	for k := 0; k < n; k++ {
		ls.q[k], ls.dq[k] = 0, 0
	}
	in := r.surfaceLin(&r.fire, gas, r.alphaFire, r.bc.fireEps, true)
	if !r.bc.adiabatic {
		in += r.surfaceLin(&r.amb, AmbientC, r.bc.ambAlpha, r.bc.ambEps, true)
	}
	r.energyIn += in * dt
	q := ls.q
	for k := 0; k+1 < n; k++ {
		fl := wy[k] * (lam[k] + lam[k+1]) * (th[k+1] - th[k])
		q[k] += fl
		q[k+1] -= fl
	}
	c := dt / V
	tNew := t + dt
	for k := 0; k < n; k++ {
		if g.status[k] != cellActive {
			continue
		}
		h[k] += c * q[k]
		v := tb.temperature(h[k])
		T[k] = v
		lam[k] = tb.conductivity(v)
		if v > r.peak[k] {
			r.peak[k], r.peakT[k] = v, tNew
		}
	}
}

// surfaceLin is surface for the implicit step: it evaluates the flow through
// each side at the iterate ls.theta into ls.q and its derivative with respect
// to the cell temperature into ls.dq. With commit it also keeps θ_s and the
// surface peak and returns the total flow, W/m.
func (r *run) surfaceLin(s *sides, gas, alpha, eps float64, commit bool) float64 {
	ls := r.line
	tg := gas + kelvin
	es := eps * sigmaSB
	tg4 := es * tg * tg * tg * tg
	d := r.g.d
	sum := 0.0
	for k, c := range s.cell {
		tc := ls.theta[c]
		kk := 2 * r.lam[c] / d
		ts := s.ts[k]
		var hs float64
		for it := 0; it < 4; it++ {
			a := ts + kelvin
			a3 := a * a * a
			fv := alpha*(gas-ts) + tg4 - es*a3*a - kk*(ts-tc)
			hs = alpha + 4*es*a3
			dx := fv / (-hs - kk)
			ts -= dx
			if math.Abs(dx) < 1e-4 {
				break
			}
		}
		fl := kk * (ts - tc) * d
		ls.q[c] += fl
		ls.dq[c] -= kk * hs / (kk + hs) * d
		sum += fl
		if commit {
			s.ts[k] = ts
			if sl := s.slot[k]; ts > r.surfPeak[sl] {
				r.surfPeak[sl] = ts
			}
		}
	}
	return sum
}
