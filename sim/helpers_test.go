package sim

import (
	"math"
	"testing"
)

// Test fixtures shared by the sim tests.

// rb87MassKg is the rubidium-87 mass, 86.909180520 u (D. A. Steck, "Rubidium
// 87 D Line Data", rev. 2.3.3, table 2) times m_u = 1.66053906660e-27 kg
// (CODATA 2018), written out here rather than taken from the package so that
// the Sagnac check does not lean on the constants under test.
const rb87MassKg = 86.909180520 * 1.66053906660e-27

// hbarRef is the reduced Planck constant h / (2 pi), h = 6.62607015e-34 J s
// (exact, 2019 SI).
const hbarRef = 6.62607015e-34 / (2 * math.Pi)

// rb87Ring is an N-site ring of the given radius holding a rubidium-87 atom.
func rb87Ring(sites int, radiusM float64) Ring {
	return Ring{Sites: sites, RadiusM: radiusM, MassKg: rb87MassKg}
}

// recoilHz returns E_s/h = N^2 E_rot / (4h), the energy unit of the Mathieu
// mapping (docs/model.md, Hamiltonian).
func recoilHz(r Ring) float64 {
	n := float64(r.Sites)
	return n * n * r.RotationalHz() / 4
}

// depthForQ returns the depth V0/h in Hz that gives the Mathieu parameter
// q = V0 / (4 E_s) on ring r.
func depthForQ(r Ring, q float64) float64 { return 4 * q * recoilHz(r) }

// mustBasis is NewBasis for arguments known to be valid.
func mustBasis(t testing.TB, sites, grid int) Basis {
	t.Helper()
	b, err := NewBasis(sites, grid)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// restDrive is a drive whose lattice stays at angle 0: Sign 0 switches the
// sequence off. It gives diagnose a zero lattice speed.
func restDrive() Drive {
	return Drive{Seq: Sequence{Up: Sin2{DurationS: 1, CruiseRadS: 1}}}
}

// linearMotion is a lattice moving at constant angular velocity w from angle
// 0 at full depth: a(t) = w t.
type linearMotion struct{ w float64 }

func (m linearMotion) angle(t float64) float64 { return m.w * t }
func (m linearMotion) depth(float64) float64   { return 1 }

// reversed plays motion m backwards over [0, T]: a(t) = a_m(T - t).
type reversed struct {
	m motion
	T float64
}

func (r reversed) angle(t float64) float64 { return r.m.angle(r.T - t) }
func (r reversed) depth(t float64) float64 { return r.m.depth(r.T - t) }

// timeReverse applies the antiunitary time reversal psi(theta) ->
// conj(psi(theta)), i.e. psi_l -> conj(psi_{-l}). The one state without a
// partner in the basis (l = LMin) is set to zero; tests keep its amplitude
// negligible by the choice of grid.
func timeReverse(s State) State {
	out := State{Basis: s.Basis, Amp: make([]complex128, len(s.Amp))}
	l0 := s.Basis.LMin()
	for i := range out.Amp {
		j := -(l0 + i) - l0
		if j >= 0 && j < len(s.Amp) {
			out.Amp[i] = complexConj(s.Amp[j])
		}
	}
	return out
}

// distance returns the 2-norm of s - t.
func distance(s, t State) float64 {
	var d float64
	for i, a := range s.Amp {
		x := a - t.Amp[i]
		d += real(x)*real(x) + imag(x)*imag(x)
	}
	return math.Sqrt(d)
}

// groundWannier returns the band-0 Wannier state of site 0 for ring r at
// depth depthHz in basis b, with the lattice at rest.
func groundWannier(b Basis, r Ring, depthHz float64) State {
	es := diagonalise(b, r.rotationalRate(), 0, 2*math.Pi*depthHz)
	return wannier(b, r, es, 0, 2*math.Pi*r.TrapHz(depthHz))
}

// fieldOf returns a one-level field holding s.
func fieldOf(s State) *field {
	f := newField(s.Basis, 1)
	f.set(0, s)
	return f
}
