package sim

import (
	"fmt"
	"math"

	"rampart/internal/plural"
)

// Ring is the geometry of a ring lattice: Sites bright sites equally spaced on
// a circle of radius RadiusM, holding an atom of mass MassKg.
type Ring struct {
	Sites   int
	RadiusM float64
	MassKg  float64
}

// Validate reports whether the ring is physically meaningful.
func (r Ring) Validate() error {
	switch {
	case r.Sites < 1:
		return fmt.Errorf("ring has %s, need at least 1", plural.Count(r.Sites, "site"))
	case !(r.RadiusM > 0) || math.IsInf(r.RadiusM, 0):
		return fmt.Errorf("ring radius %g m is not a positive finite length", r.RadiusM)
	case !(r.MassKg > 0) || math.IsInf(r.MassKg, 0):
		return fmt.Errorf("atom mass %g kg is not a positive finite mass", r.MassKg)
	}
	return nil
}

// Inertia returns the moment of inertia I = m R^2 in kg m^2.
func (r Ring) Inertia() float64 { return r.MassKg * r.RadiusM * r.RadiusM }

// RotationalHz returns the rotational energy E_rot/h = hbar/(4 pi I) in Hz.
func (r Ring) RotationalHz() float64 { return Hbar / (4 * math.Pi * r.Inertia()) }

// rotationalRate returns E_rot/hbar = hbar/(2 I) in rad/s.
func (r Ring) rotationalRate() float64 { return Hbar / (2 * r.Inertia()) }

// TrapHz returns the harmonic trap frequency nu = N sqrt(V0 E_rot) of one
// site, in Hz, for a lattice depth V0/h of depthHz.
func (r Ring) TrapHz(depthHz float64) float64 {
	return float64(r.Sites) * math.Sqrt(depthHz*r.RotationalHz())
}

// MomentumOf returns the angular momentum quantum number l0 = I w / hbar of
// rigid rotation at w rad/s.
func (r Ring) MomentumOf(w float64) float64 { return r.Inertia() * w / Hbar }

// ScaleFactor returns the Sagnac scale factor K = 2 I phi / hbar in s (rad of
// phase per rad/s of rotation) for a one-way arm angle phi in rad.
func (r Ring) ScaleFactor(phi float64) float64 { return 2 * r.Inertia() * phi / Hbar }
