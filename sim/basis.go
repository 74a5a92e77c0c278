package sim

import (
	"fmt"

	"rampart/internal/plural"
)

// Basis is the truncated angular-momentum basis on the ring: Block states in
// each of the Sites quasi-momentum classes c = l mod N, so Sites*Block states
// in all, with
//
//	l(c, j) = -N (Block/2) + N j + c,  j = 0 .. Block-1,  c = 0 .. N-1.
//
// The lattice couples l only to l +- N, so each class is an independent
// tridiagonal block. Block is even, which keeps the window symmetric up to
// one class and lets the lattice eigenbasis split into even and odd halves.
type Basis struct {
	Sites int
	Block int
}

// NewBasis returns the basis with grid momentum states in all. grid must be
// a positive multiple of 2*sites.
func NewBasis(sites, grid int) (Basis, error) {
	if sites < 1 {
		return Basis{}, fmt.Errorf("ring has %s, need at least 1", plural.Count(sites, "site"))
	}
	if grid < 2*sites || grid%(2*sites) != 0 {
		return Basis{}, fmt.Errorf("grid %d is not a positive multiple of 2*sites = %d", grid, 2*sites)
	}
	return Basis{Sites: sites, Block: grid / sites}, nil
}

// Size returns the number of momentum states, Sites*Block.
func (b Basis) Size() int { return b.Sites * b.Block }

// LMin returns the lowest angular momentum quantum number in the basis.
func (b Basis) LMin() int { return -b.Sites * (b.Block / 2) }

// L returns the angular momentum quantum number of state j of class c.
func (b Basis) L(c, j int) int { return b.LMin() + b.Sites*j + c }

// State is a wavefunction on the ring in the momentum basis: Amp[i] is the
// amplitude of l = LMin + i. Amplitudes are normalised so that the sum of
// |Amp|^2 is the norm.
type State struct {
	Basis Basis
	Amp   []complex128
}

// Norm returns the sum of |Amp|^2.
func (s State) Norm() float64 {
	var n float64
	for _, a := range s.Amp {
		n += real(a)*real(a) + imag(a)*imag(a)
	}
	return n
}

// Overlap returns <s|t>.
func (s State) Overlap(t State) complex128 {
	if s.Basis != t.Basis {
		panic("sim: Overlap of states in different bases")
	}
	var z complex128
	for i, a := range s.Amp {
		b := t.Amp[i]
		z += complex(real(a)*real(b)+imag(a)*imag(b), real(a)*imag(b)-imag(a)*real(b))
	}
	return z
}

// Wavefunction returns psi(theta) = sum_l Amp_l e^{i l theta} / sqrt(2 pi).
func (s State) Wavefunction(theta float64) complex128 {
	var z complex128
	l0 := s.Basis.LMin()
	for i, a := range s.Amp {
		z += a * cis(float64(l0+i)*theta)
	}
	return z / complex(sqrt2Pi, 0)
}
