package sim

import (
	"fmt"
	"math"
)

// Sequence is the drive profile of one arm: ramp up on [0, t_r], cruise at
// Omega_0 for CruiseS, ramp down as the time mirror of the ramp-up.
type Sequence struct {
	Up      Ramp
	CruiseS float64
}

// NewSequence returns the sequence whose arm turns by laps turns in all,
// phi(T) = 2 pi laps, the cruise lasting exactly as long as that requires.
// It is an error if the two ramps alone turn the arm further than that.
func NewSequence(up Ramp, laps float64) (Sequence, error) {
	if !(laps > 0) || math.IsInf(laps, 0) {
		return Sequence{}, fmt.Errorf("laps = %g is not a positive finite number of turns", laps)
	}
	w := Cruise(up)
	if w <= 0 {
		return Sequence{}, fmt.Errorf("cruise speed %g rad/s must be positive (the arms run in opposite directions by construction)", w)
	}
	ramps := 2 * up.Angle(up.Duration())
	rest := 2*math.Pi*laps - ramps
	if rest < -1e-12*ramps {
		return Sequence{}, fmt.Errorf("the two ramps alone turn each arm by %.6g turns, more than laps = %g: raise laps or the cruise speed, or shorten the ramp", ramps/(2*math.Pi), laps)
	}
	return Sequence{Up: up, CruiseS: math.Max(rest, 0) / w}, nil
}

// Duration returns the total time T = 2 t_r + t_cruise in s.
func (q Sequence) Duration() float64 { return 2*q.Up.Duration() + q.CruiseS }

// CruiseSpeed returns Omega_0 in rad/s.
func (q Sequence) CruiseSpeed() float64 { return Cruise(q.Up) }

// Speed returns Omega(t) in rad/s; zero outside [0, T].
func (q Sequence) Speed(t float64) float64 {
	tr := q.Up.Duration()
	switch {
	case t <= 0:
		return 0
	case t < tr:
		return q.Up.Speed(t)
	case t <= tr+q.CruiseS:
		return q.CruiseSpeed()
	case t < q.Duration():
		return q.Up.Speed(q.Duration() - t)
	}
	return 0
}

// Angle returns phi(t), the integral of Omega from 0 to t, in rad.
func (q Sequence) Angle(t float64) float64 {
	tr := q.Up.Duration()
	ramp := q.Up.Angle(tr)
	switch {
	case t <= 0:
		return 0
	case t < tr:
		return q.Up.Angle(t)
	case t <= tr+q.CruiseS:
		return ramp + q.CruiseSpeed()*(t-tr)
	case t < q.Duration():
		return q.TotalAngle() - q.Up.Angle(q.Duration()-t)
	}
	return q.TotalAngle()
}

// TotalAngle returns phi(T) in rad.
func (q Sequence) TotalAngle() float64 {
	return 2*q.Up.Angle(q.Up.Duration()) + q.CruiseSpeed()*q.CruiseS
}

// ClosureError reports a sequence whose two arms do not end in the same
// site: the arms end 2 phi(T) apart, which must be a multiple of 2 pi.
type ClosureError struct {
	Laps       float64 // each arm's one-way angle in turns
	Sites      int
	SitesApart float64 // separation of the arms' final sites, in site spacings (mod Sites)
	Lower      float64 // nearest closing laps below, or 0.5 (the smallest that closes) for laps < 0.5
	Upper      float64 // nearest closing laps above Lower
}

func (e *ClosureError) Error() string {
	return fmt.Sprintf("the arms do not recombine: with laps = %g they end %.4g sites apart on the %d-site ring (2*laps must be a whole number); laps = %g or %g would close",
		e.Laps, e.SitesApart, e.Sites, e.Lower, e.Upper)
}

// CheckClosure returns a *ClosureError unless 2 laps is a whole number (to a
// relative 1e-9), the condition for both arms to end in the same site.
func CheckClosure(laps float64, sites int) error {
	x := 2 * laps
	if math.Abs(x-math.Round(x)) <= 1e-9*math.Max(1, x) {
		return nil
	}
	apart := math.Mod(x*float64(sites), float64(sites))
	if apart > float64(sites)/2 {
		apart = float64(sites) - apart
	}
	lo := math.Floor(x) / 2
	if lo <= 0 {
		lo = 0.5
	}
	up := math.Ceil(x) / 2
	if up == lo {
		up = lo + 0.5
	}
	return &ClosureError{Laps: laps, Sites: sites, SitesApart: apart, Lower: lo, Upper: up}
}
