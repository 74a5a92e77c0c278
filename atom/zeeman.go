package atom

import (
	"fmt"
	"math"
)

// State is a ground hyperfine state |F, m_F> of rubidium-87, F = 1 or 2.
type State struct {
	F int
	M int
}

// Validate reports whether s is a ground state of rubidium-87.
func (s State) Validate() error {
	if s.F != 1 && s.F != 2 {
		return fmt.Errorf("hyperfine level F = %d: rubidium-87's ground state has F = 1 or 2", s.F)
	}
	if s.M < -s.F || s.M > s.F {
		return fmt.Errorf("state |F=%d, m=%d>: m must lie in [%d, %d]", s.F, s.M, -s.F, s.F)
	}
	return nil
}

func (s State) mustValidate() {
	if err := s.Validate(); err != nil {
		panic("atom: " + err.Error())
	}
}

// String returns |F,m>.
func (s State) String() string { return fmt.Sprintf("|%d,%d>", s.F, s.M) }

// LandeG returns the low-field hyperfine Lande factor
//
//	g_F = g_J [F(F+1) - I(I+1) + J(J+1)] / [2F(F+1)]
//	    + g_I [F(F+1) + I(I+1) - J(J+1)] / [2F(F+1)],   J = 1/2,
//
// so that E = g_F mu_B m_F B at small B (Steck, eq. (25)).
func (s State) LandeG() float64 {
	s.mustValidate()
	f := float64(s.F * (s.F + 1))
	ii := NuclearSpin * (NuclearSpin + 1)
	jj := 0.75
	return ElectronG*(f-ii+jj)/(2*f) + NuclearG*(f+ii-jj)/(2*f)
}

// EnergyHz returns the energy E/h of s in a field of b gauss by the
// Breit-Rabi formula (Steck, eq. (30)), relative to the centre of gravity
// of the hyperfine manifold at zero field:
//
//	E = -dE/(2(2I+1)) + g_I mu_B m B +- (dE/2) sqrt(1 + 4 m x/(2I+1) + x^2),
//	x = (g_J - g_I) mu_B B / dE,
//
// with + for F = 2 and - for F = 1 (dE the hyperfine splitting). For the
// stretched states m = +-2 the root is taken as the analytic 1 +- x, so
// the F = 2, m = -2 level stays itself past x = 1.
func (s State) EnergyHz(b float64) float64 {
	e, _, _ := s.derivatives(b)
	return e
}

// derivatives returns E/h, dE/dB and d^2E/dB^2 (Hz, Hz/G, Hz/G^2) at b.
func (s State) derivatives(b float64) (e, d1, d2 float64) {
	s.mustValidate()
	m := float64(s.M)
	c := (ElectronG - NuclearG) * BohrMagnetonHzPerG / HyperfineHz // x per gauss
	x := c * b
	a := 4 * m / (2*NuclearSpin + 1)
	var f, f1, f2 float64 // sqrt(1 + a x + x^2) and its x-derivatives
	if s.F == 2 && math.Abs(a) == 2 {
		f, f1 = 1+a/2*x, a/2
	} else {
		f = math.Sqrt(1 + a*x + x*x)
		f1 = (a/2 + x) / f
		f2 = (1 - a*a/4) / (f * f * f)
	}
	sign := 1.0
	if s.F == 1 {
		sign = -1
	}
	lin := NuclearG * BohrMagnetonHzPerG * m
	e = -HyperfineHz/(2*(2*NuclearSpin+1)) + lin*b + sign*HyperfineHz/2*f
	d1 = lin + sign*HyperfineHz/2*c*f1
	d2 = sign * HyperfineHz / 2 * c * c * f2
	return e, d1, d2
}
