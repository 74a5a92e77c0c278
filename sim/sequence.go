package sim

import (
	"fmt"
	"math"
)

// Sequence is the drive profile of one arm: ramp up on [0, t_r], cruise at
// Omega_0 for CruiseS, ramp down on [T - t_d, T]. With Segments >= 2 it is
// an echo sequence (sim/echo.go): that profile played Segments times, the
// lattices resting for HoldS between segments while a swap pulse exchanges
// the spin states, and the Speed and Angle of the sequence are those of
// the packet that starts in the arm s = +1 (docs/model.md, Interferometer
// and signs, Echo sequences).
type Sequence struct {
	Up      Ramp
	CruiseS float64
	// Down is the ramp-down, given as a ramp-up played backwards in time:
	// Omega(t) = Down.Speed(T - t). If Down is nil, the ramp-down is the
	// time mirror of Up.
	Down Ramp
	// Segments is the number of echo segments; 0 and 1 mean none (one
	// ramp-up, cruise and ramp-down).
	Segments int
	// HoldS is the rest between echo segments, with the swap pulse at
	// its middle, in s.
	HoldS float64
}

// NewSequence returns the sequence whose arm turns by laps turns in all,
// phi(T) = 2 pi laps, the cruise lasting exactly as long as that requires,
// and whose ramp-down mirrors the ramp-up.
// It is an error if the two ramps alone turn the arm further than that.
func NewSequence(up Ramp, laps float64) (Sequence, error) {
	return NewSequenceDown(up, nil, laps)
}

// NewSequenceDown is NewSequence with the ramp-down down (nil: the mirror
// of up), which must end at the same cruise speed as up.
func NewSequenceDown(up, down Ramp, laps float64) (Sequence, error) {
	if !(laps > 0) || math.IsInf(laps, 0) {
		return Sequence{}, fmt.Errorf("laps = %g is not a positive finite number of turns", laps)
	}
	w := Cruise(up)
	if w <= 0 {
		return Sequence{}, fmt.Errorf("cruise speed %g rad/s must be positive (the arms run in opposite directions by construction)", w)
	}
	q := Sequence{Up: up, Down: down}
	if down != nil {
		if wd := Cruise(down); math.Abs(wd-w) > CruiseTolerance*w {
			return Sequence{}, fmt.Errorf("the ramp-down ends at %g rad/s, the ramp-up at %g rad/s: both must reach the same cruise speed", wd, w)
		}
	}
	ramps := up.Angle(up.Duration()) + q.down().Angle(q.down().Duration())
	rest := 2*math.Pi*laps - ramps
	if rest < -1e-12*ramps {
		return Sequence{}, fmt.Errorf("the two ramps alone turn each arm by %.6g turns, more than laps = %g: raise laps, lower the cruise speed or shorten the ramp (a ramp's angle grows with its cruise speed and its duration: a sin2 ramp to Omega0 over t_r turns Omega0 t_r / 2)", ramps/(2*math.Pi), laps)
	}
	q.CruiseS = math.Max(rest, 0) / w
	return q, nil
}

// down returns the ramp-down as a ramp-up.
func (q Sequence) down() Ramp {
	if q.Down == nil {
		return q.Up
	}
	return q.Down
}

// RampDown returns the ramp-down as a ramp-up played backwards in time
// (Up itself for a mirrored sequence).
func (q Sequence) RampDown() Ramp { return q.down() }

// Duration returns the total time T = t_r + t_cruise + t_d in s (of all
// segments and holds for an echo sequence).
func (q Sequence) Duration() float64 {
	if q.echo() {
		return float64(q.Segments)*q.segmentS() + float64(q.Segments-1)*q.HoldS
	}
	return q.segmentS()
}

// segmentS returns the duration of one ramp-up, cruise and ramp-down.
// (The ramps are added first: for a mirrored sequence this is 2 t_r + t_c
// to the last bit, as it was before a ramp-down of its own existed.)
func (q Sequence) segmentS() float64 { return q.Up.Duration() + q.down().Duration() + q.CruiseS }

// CruiseSpeed returns Omega_0 in rad/s.
func (q Sequence) CruiseSpeed() float64 { return Cruise(q.Up) }

// Speed returns Omega(t) in rad/s; zero outside [0, T].
func (q Sequence) Speed(t float64) float64 {
	if q.echo() {
		_, tau, in := q.locate(t)
		if !in {
			return 0
		}
		return q.Segment().Speed(tau)
	}
	tr, t1 := q.Up.Duration(), q.Up.Duration()+q.CruiseS
	switch {
	case t <= 0:
		return 0
	case t < tr:
		return q.Up.Speed(t)
	case t <= t1:
		return q.CruiseSpeed()
	case t < q.Duration():
		return q.down().Speed(q.Duration() - t)
	}
	return 0
}

// Angle returns phi(t), the integral of Omega from 0 to t, in rad.
func (q Sequence) Angle(t float64) float64 {
	if q.echo() {
		j, tau, _ := q.locate(t)
		seg := q.Segment()
		return float64(j)*seg.TotalAngle() + seg.Angle(tau)
	}
	tr := q.Up.Duration()
	switch {
	case t <= 0:
		return 0
	case t < tr:
		return q.Up.Angle(t)
	case t <= tr+q.CruiseS:
		return q.Up.Angle(tr) + q.CruiseSpeed()*(t-tr)
	case t < q.Duration():
		return q.TotalAngle() - q.down().Angle(q.Duration()-t)
	}
	return q.TotalAngle()
}

// TotalAngle returns phi(T) in rad: for an echo sequence the angle its
// packets turn in all, Segments times that of one segment.
func (q Sequence) TotalAngle() float64 {
	// The ramps first, as in segmentS.
	one := q.Up.Angle(q.Up.Duration()) + q.down().Angle(q.down().Duration()) + q.CruiseSpeed()*q.CruiseS
	if q.echo() {
		return float64(q.Segments) * one
	}
	return one
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
