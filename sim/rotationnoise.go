package sim

import "math"

// RotationNoisePhaseRad returns the Sagnac phase of a rotation-rate record
// delta Omega(t) (rad/s; nil: none) during a shot whose arms follow drives
// to time end, with true radius R (1 + radiusRel) (docs/model.md,
// Perturbations, platform rotation):
//
//	Phi = integral_0^end w(t) delta Omega(t) dt,  w(t) = I (a_+'(t) - a_-'(t)) / hbar,
//
// I = m R^2 (1 + r)^2 the true moment of inertia and a_s' each arm's
// commanded angular velocity: w is the rate at which the arms' enclosed
// area grows, times 2 m / hbar, so that a constant rate Omega gives
// integral w dt Omega = 2 I phi(T) Omega / hbar = K Omega, the Sagnac
// phase. The phase is that of packets that follow their lattices (the
// semiclassical phase of the L_z Omega(t) term, first order in delta
// Omega, exact for a rate constant over the shot, which the propagator
// treats in the rotating frame; Shot.RotationOffsetRadS). Its effect on a
// noise PSD S_Omega(f) is the filter |W(f)|^2 of w: for white noise of
// one-sided level S_0 over all frequencies, Var Phi = (S_0 / 2)
// integral w(t)^2 dt.
//
// Where w is constant (both arms cruising, or both at rest, w = 0) the
// integral is that of the piecewise-linear record, exactly; elsewhere (the
// ramps) it is by 3-point Gauss-Legendre quadrature on each record
// interval (w is smooth on the record's step, a quarter of the split
// step).
func RotationNoisePhaseRad(r Ring, radiusRel float64, drives [2]Drive, end float64, rec *Series) float64 {
	if rec == nil || len(rec.Values) == 0 || end <= 0 {
		return 0
	}
	k := r.Inertia() * (1 + radiusRel) * (1 + radiusRel) / Hbar
	w := func(t float64) float64 { return k * (drives[0].Speed(t) - drives[1].Speed(t)) }
	// Gauss-Legendre 3-point nodes and weights on [-1, 1] (Abramowitz &
	// Stegun, table 25.4).
	x3 := [3]float64{-0.7745966692414834, 0, 0.7745966692414834}
	w3 := [3]float64{5.0 / 9, 8.0 / 9, 5.0 / 9}
	var sum float64
	piece := func(a, b float64) {
		h := (b - a) / 2
		for j, x := range x3 {
			t := a + h*(1+x)
			sum += h * w3[j] * w(t) * rec.At(t)
		}
	}
	quad := func(t0, t1 float64) {
		t1 = math.Min(t1, end)
		if t1 <= t0 {
			return
		}
		a := t0
		for i := int(math.Floor(t0/rec.StepS)) + 1; ; i++ {
			ti := float64(i) * rec.StepS
			if ti >= t1 {
				break
			}
			piece(a, ti)
			a = ti
		}
		piece(a, t1)
	}
	p, m := drives[0].times(), drives[1].times()
	start, up := math.Min(p[0], m[0]), math.Max(p[1], m[1])
	down, stop := math.Min(p[2], m[2]), math.Max(p[3], m[3])
	if down > up {
		// Both cruise on [up, down]: w is constant there.
		quad(start, up)
		lin, _ := seriesIntegrals(rec, up, math.Min(down, end))
		sum += w((up+down)/2) * lin
		quad(down, stop)
	} else {
		quad(start, stop)
	}
	return sum
}
