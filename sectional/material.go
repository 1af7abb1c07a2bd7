package sectional

import (
	"errors"
	"fmt"
	"math"
)

// Material is a uniaxial stress–strain law of one fibre.
//
// Strain and stress are positive in tension and negative in compression.
// Stress is in MPa. Limits returns the limit strains of the law: the
// compression limit is ≤ 0 (for example -0.0035) and the tension limit is ≥ 0
// (math.Inf(1) if there is none). A fibre strained beyond a limit ends the
// moment–curvature analysis.
type Material interface {
	Stress(strain float64) float64
	Limits() (compression, tension float64)
}

// Validator is implemented by materials that can check their own parameters.
// Section checks call it for every fibre; all the laws of this package
// implement it.
type Validator interface {
	Validate() error
}

// Yielder is implemented by reinforcement laws that have a yield strain: the
// positive strain magnitude at which the bar leaves its linear elastic range.
// It decides the curvature at first yield and the failure mode.
type Yielder interface {
	YieldStrain() float64
}

// ParabolaRectangle is the concrete law of EN 1992-1-1 §3.1.7(1), Expression
// (3.17), with no tensile strength:
//
//	σ = -Fc·[1 - (1 - |ε|/εc2)^n]   for 0 ≤ |ε| ≤ εc2 (compression)
//	σ = -Fc                          for εc2 < |ε| (the law stays flat beyond εcu2)
//	σ = 0                            for ε ≥ 0 (tension)
//
// Fc is the compressive strength in MPa (≥ 0: f_ck, f_cd or a residual value,
// as the caller chooses). EpsC2 and EpsCU2 are strain magnitudes (positive);
// the compression limit strain is -EpsCU2. N is the exponent n.
type ParabolaRectangle struct{ Fc, EpsC2, EpsCU2, N float64 }

// EC2ParabolaRectangle returns the parabola–rectangle law for strength fc
// (MPa, read as f_ck for the choice of parameters) with εc2, εcu2 and n from
// EN 1992-1-1 Table 3.1:
//
//	fc ≤ 50: εc2 = 2.0 ‰, εcu2 = 3.5 ‰, n = 2
//	fc > 50: εc2 = 2.0 + 0.085·(fc - 50)^0.53 ‰
//	         εcu2 = 2.6 + 35·((90 - fc)/100)^4 ‰
//	         n = 1.4 + 23.4·((90 - fc)/100)^4
//
// Table 3.1 stops at C90/105; above 90 MPa the C90 values are used. Near
// C90 the εc2 expression gives slightly more than εcu2 (2.6005 ‰ against
// 2.6 ‰; both are tabulated as 2.6), so εc2 is capped at εcu2.
func EC2ParabolaRectangle(fc float64) ParabolaRectangle {
	if !(fc > 50) { // includes NaN, which Validate then reports
		return ParabolaRectangle{Fc: fc, EpsC2: 0.002, EpsCU2: 0.0035, N: 2}
	}
	f := math.Min(fc, 90)
	r4 := math.Pow((90-f)/100, 4)
	cu2 := (2.6 + 35*r4) / 1000
	return ParabolaRectangle{
		Fc:     fc,
		EpsC2:  math.Min((2.0+0.085*math.Pow(f-50, 0.53))/1000, cu2),
		EpsCU2: cu2,
		N:      1.4 + 23.4*r4,
	}
}

// Stress returns the stress in MPa at strain (tension positive).
func (m ParabolaRectangle) Stress(strain float64) float64 {
	return prStress(strain, m.Fc, m.EpsC2, m.N)
}

func prStress(e, fc, ec2, n float64) float64 {
	if e >= 0 {
		return 0
	}
	if -e >= ec2 {
		return -fc
	}
	t := 1 + e/ec2 // 1 - |ε|/εc2
	if n == 2 {
		return -fc * (1 - t*t)
	}
	return -fc * (1 - math.Pow(t, n))
}

// Limits returns (-EpsCU2, +Inf): crushing at εcu2, no tension limit.
func (m ParabolaRectangle) Limits() (compression, tension float64) {
	return -m.EpsCU2, math.Inf(1)
}

// Validate checks Fc ≥ 0, 0 < EpsC2 ≤ EpsCU2 ≤ 0.1 and 1 ≤ N ≤ 5.
func (m ParabolaRectangle) Validate() error {
	switch {
	case !finite(m.Fc) || m.Fc < 0 || m.Fc > 500:
		return fmt.Errorf("parabola-rectangle Fc = %g MPa: want 0 to 500", m.Fc)
	case !finite(m.EpsC2) || m.EpsC2 <= 0 || m.EpsC2 > 0.1:
		return fmt.Errorf("parabola-rectangle EpsC2 = %g: want a strain magnitude in (0, 0.1]", m.EpsC2)
	case !finite(m.EpsCU2) || m.EpsCU2 < m.EpsC2 || m.EpsCU2 > 0.1:
		return fmt.Errorf("parabola-rectangle EpsCU2 = %g: want EpsC2 (%g) to 0.1", m.EpsCU2, m.EpsC2)
	case !finite(m.N) || m.N < 1 || m.N > 5:
		return fmt.Errorf("parabola-rectangle N = %g: want 1 to 5", m.N)
	}
	return nil
}

// FireConcrete is the concrete law of EN 1992-1-2 §3.2.2.1 (Figure 3.1) with
// the linear descending branch and no tensile strength:
//
//	σ = -3·|ε|·Fc / (EpsC1·(2 + (|ε|/EpsC1)³))   for |ε| ≤ EpsC1 (range I)
//	σ = -Fc·(EpsCU1 - |ε|)/(EpsCU1 - EpsC1)      for EpsC1 < |ε| ≤ EpsCU1
//	σ = 0                                        beyond EpsCU1, and for ε ≥ 0
//
// Fc is f_c,θ in MPa (≥ 0); EpsC1 (ε_c1,θ) and EpsCU1 (ε_cu1,θ) are strain
// magnitudes. The compression limit strain is -EpsCU1.
type FireConcrete struct{ Fc, EpsC1, EpsCU1 float64 }

// Stress returns the stress in MPa at strain (tension positive).
func (m FireConcrete) Stress(strain float64) float64 {
	return fireConcreteStress(strain, m.Fc, m.EpsC1, m.EpsCU1)
}

func fireConcreteStress(e, fc, ec1, ecu1 float64) float64 {
	if e >= 0 {
		return 0
	}
	a := -e
	if a <= ec1 {
		r := a / ec1
		return -3 * r * fc / (2 + r*r*r)
	}
	if a < ecu1 {
		return -fc * (ecu1 - a) / (ecu1 - ec1)
	}
	return 0
}

// Limits returns (-EpsCU1, +Inf).
func (m FireConcrete) Limits() (compression, tension float64) {
	return -m.EpsCU1, math.Inf(1)
}

// Validate checks Fc ≥ 0 and 0 < EpsC1 < EpsCU1 ≤ 0.1.
func (m FireConcrete) Validate() error {
	switch {
	case !finite(m.Fc) || m.Fc < 0 || m.Fc > 500:
		return fmt.Errorf("fire concrete Fc = %g MPa: want 0 to 500", m.Fc)
	case !finite(m.EpsC1) || m.EpsC1 <= 0 || m.EpsC1 > 0.1:
		return fmt.Errorf("fire concrete EpsC1 = %g: want a strain magnitude in (0, 0.1]", m.EpsC1)
	case !finite(m.EpsCU1) || m.EpsCU1 <= m.EpsC1 || m.EpsCU1 > 0.1:
		return fmt.Errorf("fire concrete EpsCU1 = %g: want more than EpsC1 (%g), at most 0.1", m.EpsCU1, m.EpsC1)
	}
	return nil
}

// BilinearSteel is an elastic–plastic reinforcement law, the same in tension
// and compression, with optional linear hardening (EN 1992-1-1 §3.2.7(2),
// Figure 3.8, curves A and B):
//
//	σ = Es·ε                                       for |ε| ≤ εy = Fy/Es
//	σ = ±(Fy + (Fu - Fy)·(|ε| - εy)/(EpsU - εy))   for εy < |ε|
//
// Fy and Fu are in MPa, Es in MPa (200 000 for EN 1992-1-1 §3.2.7(4)). Fu = 0
// means Fu = Fy (no hardening). EpsU is the rupture strain magnitude; 0 means
// no rupture limit. Hardening (Fu > Fy) needs EpsU > εy. Beyond EpsU the
// stress stays at Fu; the analysis stops there.
type BilinearSteel struct{ Fy, Es, Fu, EpsU float64 }

// Stress returns the stress in MPa at strain (tension positive).
func (m BilinearSteel) Stress(strain float64) float64 {
	return bilinearStress(strain, m.Fy, m.Es, m.hardening())
}

// hardening returns the post-yield slope in MPa.
func (m BilinearSteel) hardening() float64 {
	if m.Fu <= m.Fy || m.EpsU <= 0 {
		return 0
	}
	return (m.Fu - m.Fy) / (m.EpsU - m.Fy/m.Es)
}

func bilinearStress(e, fy, es, h float64) float64 {
	a := math.Abs(e)
	ey := fy / es
	if a <= ey {
		return es * e
	}
	s := fy + h*(a-ey)
	if e < 0 {
		return -s
	}
	return s
}

// Limits returns (-EpsU, +EpsU), or infinite limits if EpsU is 0.
func (m BilinearSteel) Limits() (compression, tension float64) {
	if m.EpsU <= 0 {
		return math.Inf(-1), math.Inf(1)
	}
	return -m.EpsU, m.EpsU
}

// YieldStrain returns Fy/Es.
func (m BilinearSteel) YieldStrain() float64 { return m.Fy / m.Es }

// Validate checks 0 < Fy ≤ 2000, 1 000 ≤ Es ≤ 300 000, Fu = 0 or Fy ≤ Fu,
// and EpsU = 0 or EpsU > Fy/Es (required when Fu > Fy).
func (m BilinearSteel) Validate() error {
	switch {
	case !finite(m.Fy) || m.Fy <= 0 || m.Fy > 2000:
		return fmt.Errorf("bilinear steel Fy = %g MPa: want more than 0, at most 2000", m.Fy)
	case !finite(m.Es) || m.Es < 1000 || m.Es > 300000:
		return fmt.Errorf("bilinear steel Es = %g MPa: want 1000 to 300000", m.Es)
	case !finite(m.Fu) || (m.Fu != 0 && m.Fu < m.Fy) || m.Fu > 3000:
		return fmt.Errorf("bilinear steel Fu = %g MPa: want 0 (no hardening) or Fy (%g) to 3000", m.Fu, m.Fy)
	case !finite(m.EpsU) || m.EpsU < 0 || m.EpsU > 1 || (m.EpsU != 0 && m.EpsU <= m.Fy/m.Es):
		return fmt.Errorf("bilinear steel EpsU = %g: want 0 (no rupture) or more than Fy/Es (%g), at most 1", m.EpsU, m.Fy/m.Es)
	case m.Fu > m.Fy && m.EpsU == 0:
		return errors.New("bilinear steel: hardening (Fu > Fy) needs a rupture strain EpsU")
	}
	return nil
}

// FireSteel is the reinforcement law of EN 1992-1-2 §3.2.3 (Figure 3.3,
// Table 3.2a), the same in tension and compression. With εsp = Fsp/Es:
//
//	σ = Es·ε                                  for |ε| ≤ εsp
//	σ = Fsp - c + (b/a)·√(a² - (εsy - |ε|)²)  for εsp < |ε| ≤ εsy
//	σ = Fsy                                   for εsy < |ε| ≤ εst
//	σ = Fsy·(1 - (|ε| - εst)/(εsu - εst))     for εst < |ε| ≤ εsu
//	σ = 0                                     beyond εsu
//
//	a² = (εsy - εsp)·(εsy - εsp + c/Es)
//	b² = c·(εsy - εsp)·Es + c²
//	c  = (Fsy - Fsp)² / ((εsy - εsp)·Es - 2·(Fsy - Fsp))
//
// Fsy (f_sy,θ), Fsp (f_sp,θ) and Es (E_s,θ) are in MPa. EpsSy, EpsSt and
// EpsSu are ε_sy,θ, ε_st,θ and ε_su,θ; zero values mean the class N values
// 0.02, 0.15 and 0.20 (class A: 0.02, 0.05, 0.10). The limit strains are
// ±EpsSu.
type FireSteel struct{ Fsy, Fsp, Es, EpsSy, EpsSt, EpsSu float64 }

// strains returns εsy, εst, εsu with the defaults applied.
func (m FireSteel) strains() (sy, st, su float64) {
	sy, st, su = m.EpsSy, m.EpsSt, m.EpsSu
	if sy == 0 {
		sy = 0.02
	}
	if st == 0 {
		st = 0.15
	}
	if su == 0 {
		su = 0.20
	}
	return sy, st, su
}

// Stress returns the stress in MPa at strain (tension positive).
func (m FireSteel) Stress(strain float64) float64 {
	sy, st, su := m.strains()
	p := fireSteelParams(m.Fsy, m.Fsp, m.Es, sy, st, su)
	return fireSteelStress(strain, &p)
}

// fireSteel holds the derived constants of the EN 1992-1-2 law.
type fireSteel struct {
	fsy, fsp, es, sp, sy, st, su, a, b, c float64
}

func fireSteelParams(fsy, fsp, es, sy, st, su float64) fireSteel {
	p := fireSteel{fsy: fsy, fsp: fsp, es: es, sp: fsp / es, sy: sy, st: st, su: su}
	d := fsy - fsp
	if d > 0 {
		p.c = d * d / ((sy-p.sp)*es - 2*d)
		p.a = math.Sqrt((sy - p.sp) * (sy - p.sp + p.c/es))
		p.b = math.Sqrt(p.c*(sy-p.sp)*es + p.c*p.c)
	}
	return p
}

func fireSteelStress(e float64, p *fireSteel) float64 {
	a := math.Abs(e)
	var s float64
	switch {
	case a <= p.sp:
		return p.es * e
	case a <= p.sy:
		if p.a == 0 { // Fsp = Fsy: elastic–perfectly plastic
			s = p.fsy
		} else {
			u := p.sy - a
			s = p.fsp - p.c + (p.b/p.a)*math.Sqrt(math.Max(0, p.a*p.a-u*u))
		}
	case a <= p.st:
		s = p.fsy
	case a < p.su:
		s = p.fsy * (1 - (a-p.st)/(p.su-p.st))
	default:
		s = 0
	}
	if e < 0 {
		return -s
	}
	return s
}

// Limits returns (-εsu, +εsu).
func (m FireSteel) Limits() (compression, tension float64) {
	_, _, su := m.strains()
	return -su, su
}

// YieldStrain returns the end of the linear range, Fsp/Es (the proportional
// limit ε_sp,θ).
func (m FireSteel) YieldStrain() float64 { return m.Fsp / m.Es }

// Validate checks 0 ≤ Fsp ≤ Fsy ≤ 2000, 100 ≤ Es ≤ 300 000,
// Fsp/Es < EpsSy < EpsSt < EpsSu ≤ 1 and (εsy - εsp)·Es > 2·(Fsy - Fsp), which
// the law needs for a real ellipse.
func (m FireSteel) Validate() error {
	sy, st, su := m.strains()
	switch {
	case !finite(m.Fsy) || m.Fsy < 0 || m.Fsy > 2000:
		return fmt.Errorf("fire steel Fsy = %g MPa: want 0 to 2000", m.Fsy)
	case !finite(m.Fsp) || m.Fsp < 0 || m.Fsp > m.Fsy:
		return fmt.Errorf("fire steel Fsp = %g MPa: want 0 to Fsy (%g)", m.Fsp, m.Fsy)
	case !finite(m.Es) || m.Es < 100 || m.Es > 300000:
		return fmt.Errorf("fire steel Es = %g MPa: want 100 to 300000", m.Es)
	case !finite(m.EpsSy) || !finite(m.EpsSt) || !finite(m.EpsSu) ||
		sy <= m.Fsp/m.Es || st <= sy || su <= st || su > 1:
		return fmt.Errorf("fire steel strains EpsSy = %g, EpsSt = %g, EpsSu = %g: want Fsp/Es (%g) < EpsSy < EpsSt < EpsSu ≤ 1 (0 = class N default)",
			sy, st, su, m.Fsp/m.Es)
	case (sy-m.Fsp/m.Es)*m.Es <= 2*(m.Fsy-m.Fsp):
		return fmt.Errorf("fire steel: (EpsSy - Fsp/Es)·Es = %g MPa must exceed 2·(Fsy - Fsp) = %g MPa",
			(sy-m.Fsp/m.Es)*m.Es, 2*(m.Fsy-m.Fsp))
	}
	return nil
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
