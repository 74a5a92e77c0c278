package sim

import (
	"fmt"
	"math"
)

// Ramp is the ramp-up of a drive profile: the lattice speed rises from zero
// at t = 0 to the cruise speed at t = Duration(). The ramp-down of a
// sequence is its time mirror.
type Ramp interface {
	// Duration returns the ramp time t_r in s.
	Duration() float64
	// Speed returns the drive speed Omega(t) in rad/s for 0 <= t <= t_r.
	Speed(t float64) float64
	// Angle returns the integral of Speed from 0 to t, in rad.
	Angle(t float64) float64
	// Name returns a short label such as "sin2".
	Name() string
}

// Cruise returns the cruise speed of a ramp, its speed at the end.
func Cruise(r Ramp) float64 { return r.Speed(r.Duration()) }

// Sin2 is the ramp Omega = Omega_0 sin^2(pi s / 2), s = t / t_r.
type Sin2 struct {
	DurationS  float64 // t_r
	CruiseRadS float64 // Omega_0
}

func (r Sin2) Duration() float64 { return r.DurationS }
func (r Sin2) Name() string      { return "sin2" }

func (r Sin2) Speed(t float64) float64 {
	s := unit(t, r.DurationS)
	x := math.Sin(math.Pi * s / 2)
	return r.CruiseRadS * x * x
}

func (r Sin2) Angle(t float64) float64 {
	s := unit(t, r.DurationS)
	return r.CruiseRadS * r.DurationS * (s/2 - math.Sin(math.Pi*s)/(2*math.Pi))
}

// MinJerk is the minimum-jerk ramp Omega = Omega_0 (10 s^3 - 15 s^4 + 6 s^5).
type MinJerk struct {
	DurationS  float64
	CruiseRadS float64
}

func (r MinJerk) Duration() float64 { return r.DurationS }
func (r MinJerk) Name() string      { return "minjerk" }

func (r MinJerk) Speed(t float64) float64 {
	s := unit(t, r.DurationS)
	return r.CruiseRadS * s * s * s * (10 + s*(-15+6*s))
}

func (r MinJerk) Angle(t float64) float64 {
	s := unit(t, r.DurationS)
	s4 := s * s * s * s
	return r.CruiseRadS * r.DurationS * s4 * (2.5 + s*(-3+s))
}

// Inverse is the inverse-engineered transport ramp (a shortcut to
// adiabaticity): the packet's angular velocity follows
//
//	v(s) = Omega_0 (35 s^4 - 84 s^5 + 70 s^6 - 20 s^7),  s = t / t_r,
//
// which has v, v', v” and v”' fixed at both ends, and the lattice is driven
// at
//
//	Omega = v + v'' / omega^2,
//
// where omega = 2 pi nu is the harmonic trap frequency at the design depth and
// v” the second time derivative. The packet then ends at rest in the moving
// trap for any t_r in a harmonic trap; short ramps overshoot and may reverse.
//
// References:
//
//	E. Torrontegui, S. Ibanez, X. Chen, A. Ruschhaupt, D. Guery-Odelin and
//	J. G. Muga, "Fast atomic transport without vibrational heating",
//	Phys. Rev. A 83, 013415 (2011).
type Inverse struct {
	DurationS   float64
	CruiseRadS  float64
	TrapRadS    float64 // omega at the design depth, rad/s
	DesignDepth float64 // V0/h in Hz the trap frequency was taken at, for labels (NewInverse sets it)
}

// NewInverse returns the inverse-engineered ramp designed for the harmonic
// trap of ring r at a depth V0/h of designDepthHz.
func NewInverse(r Ring, durationS, cruiseRadS, designDepthHz float64) (Inverse, error) {
	if err := checkRamp(durationS, cruiseRadS); err != nil {
		return Inverse{}, err
	}
	if !(designDepthHz > 0) || math.IsInf(designDepthHz, 0) {
		return Inverse{}, fmt.Errorf("inverse ramp design depth %g Hz is not a positive finite depth", designDepthHz)
	}
	return Inverse{DurationS: durationS, CruiseRadS: cruiseRadS, TrapRadS: 2 * math.Pi * r.TrapHz(designDepthHz), DesignDepth: designDepthHz}, nil
}

func (r Inverse) Duration() float64 { return r.DurationS }
func (r Inverse) Name() string      { return "inverse" }

func (r Inverse) Speed(t float64) float64 {
	s := unit(t, r.DurationS)
	s2 := s * s
	v := s2 * s2 * (35 + s*(-84+s*(70-20*s)))
	vpp := s2 * (420 + s*(-1680+s*(2100-840*s)))
	tw := r.DurationS * r.TrapRadS
	return r.CruiseRadS * (v + vpp/(tw*tw))
}

func (r Inverse) Angle(t float64) float64 {
	s := unit(t, r.DurationS)
	s2 := s * s
	q := s2 * s2 * s * (7 + s*(-14+s*(10-2.5*s)))
	qp := s2 * s * (140 + s*(-420+s*(420-140*s)))
	return r.CruiseRadS * (r.DurationS*q + qp/(r.DurationS*r.TrapRadS*r.TrapRadS))
}

// unit maps t in [0, d] to s in [0, 1], clamping outside.
func unit(t, d float64) float64 {
	switch {
	case t <= 0:
		return 0
	case t >= d:
		return 1
	}
	return t / d
}

// PeakSpeed returns the largest |Omega| of a ramp, sampled finely, and
// whether the speed ever reverses sign (goes below zero by more than 1e-9 of
// the cruise speed).
func PeakSpeed(r Ramp) (peak float64, reverses bool) {
	const samples = 4000
	cruise := Cruise(r)
	c, sign := math.Abs(cruise), math.Copysign(1, cruise)
	for i := 0; i <= samples; i++ {
		w := r.Speed(r.Duration() * float64(i) / samples)
		peak = math.Max(peak, math.Abs(w))
		if w*sign < -1e-9*c {
			reverses = true
		}
	}
	return peak, reverses
}

// checkRamp validates the parameters common to the analytic shapes.
func checkRamp(durationS, cruise float64) error {
	if !(durationS > 0) || math.IsInf(durationS, 0) {
		return fmt.Errorf("ramp duration %g s is not a positive finite time", durationS)
	}
	if cruise == 0 || math.IsNaN(cruise) || math.IsInf(cruise, 0) {
		return fmt.Errorf("cruise speed %g rad/s is not a non-zero finite speed", cruise)
	}
	return nil
}

// NewShape returns the analytic ramp of the given name, one of Shapes. The
// inverse ramp is given its trap frequency trapRadS directly (the other
// shapes ignore it); Shape.New designs it for a depth instead.
func NewShape(name string, durationS, cruiseRadS, trapRadS float64) (Ramp, error) {
	if err := checkRamp(durationS, cruiseRadS); err != nil {
		return nil, err
	}
	if name == "inverse" {
		if !(trapRadS > 0) || math.IsInf(trapRadS, 0) {
			return nil, fmt.Errorf("inverse ramp needs a positive trap frequency, got %g rad/s", trapRadS)
		}
		return Inverse{DurationS: durationS, CruiseRadS: cruiseRadS, TrapRadS: trapRadS}, nil
	}
	shape, err := LookupShape(name)
	if err != nil {
		return nil, err
	}
	return shape.New(Ring{}, durationS, cruiseRadS, 0)
}
