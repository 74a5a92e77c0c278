package sim

import (
	"fmt"
	"math"
)

// BandGapHz returns the gap (E_1 - E_0)/h in Hz between the two lowest
// bands at quasi-momentum 0 of the lattice of ring r at rest, of depth
// V0/h = depthHz. In the Mathieu form of the lattice (docs/model.md,
// Hamiltonian) the quasi-momentum-0 levels are E_s a_0(q), E_s b_2(q), ...,
// so
//
//	Delta = E_s (b_2(q) - a_0(q)),  E_s = N^2 E_rot / 4,  q = V0 / (4 E_s),
//
// which in a deep lattice lies below the harmonic trap frequency
// N sqrt(V0 E_rot) = 4 sqrt(q) E_s by about E_s, the anharmonic shift of a
// cosine well (b_2 - a_0 ~ 4 sqrt(q) - 1 + O(q^-1/2), Abramowitz & Stegun
// 20.2.30); in a shallow one (q <= 1) it tends to the free 4 E_s instead.
// The levels are computed on a basis of K momentum states per class, K
// growing as sqrt(q) so that the truncated Fourier coefficients stay below
// double precision.
func (r Ring) BandGapHz(depthHz float64) float64 {
	es := float64(r.Sites*r.Sites) * r.RotationalHz() / 4
	q := depthHz / (4 * es)
	k := max(40, 2*int(4*math.Sqrt(q)))
	b, err := NewBasis(r.Sites, r.Sites*k)
	if err != nil {
		panic("sim: " + err.Error())
	}
	e := r.BandsHz(b, depthHz, 0)
	return e[1] - e[0]
}

// InverseGap is the inverse-engineered ramp (Inverse) designed for the
// lattice's actual band gap at quasi-momentum 0 (Ring.BandGapHz) at the
// design depth, in place of the harmonic trap frequency: omega = 2 pi Delta.
// A deep cosine well is softer than its harmonic approximation, so its
// oscillation frequency is lower (for the demo's ring at 20 kHz the gap is
// 4.066 kHz, the trap frequency 4.314 kHz, E_s 233 Hz), and a ramp
// designed for the harmonic frequency leaves the packet slightly out of
// step.
//
// References:
//
//	E. Torrontegui et al., Phys. Rev. A 83, 013415 (2011) (the inverse
//	engineering); M. Abramowitz and I. A. Stegun, Handbook of Mathematical
//	Functions (1964), ch. 20 (Mathieu characteristic values).
type InverseGap struct {
	Inverse
	GapHz float64 // the band gap the ramp is designed for
}

func (r InverseGap) Name() string { return "inverse-gap" }

// NewInverseGap returns the inverse-engineered ramp designed for the band
// gap at quasi-momentum 0 of ring r at a depth V0/h of designDepthHz.
func NewInverseGap(r Ring, durationS, cruiseRadS, designDepthHz float64) (InverseGap, error) {
	inv, err := NewInverse(r, durationS, cruiseRadS, designDepthHz)
	if err != nil {
		return InverseGap{}, err
	}
	if err := r.Validate(); err != nil {
		return InverseGap{}, fmt.Errorf("inverse-gap ramp: %w", err)
	}
	gap := r.BandGapHz(designDepthHz)
	inv.TrapRadS = 2 * math.Pi * gap
	return InverseGap{Inverse: inv, GapHz: gap}, nil
}
