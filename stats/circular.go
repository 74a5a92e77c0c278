package stats

import "math"

// Circular summarises a sample of angles theta_i (rad) by its mean
// resultant vector,
//
//	C = sum_i cos theta_i / n,  S = sum_i sin theta_i / n,
//	R = sqrt(C^2 + S^2),  mean direction = atan2(S, C),
//
// and the circular standard deviation sqrt(-2 ln R), which tends to the
// ordinary standard deviation for concentrated angles and to infinity as R
// goes to zero. An angle near +-pi is near -+pi: the circular statistics see
// this, a linear mean does not.
//
// References:
//   - N. I. Fisher, Statistical Analysis of Circular Data (Cambridge, 1993),
//     sec. 2.3.
//   - K. V. Mardia and P. E. Jupp, Directional Statistics (Wiley, 2000), sec.
//     2.3.
type Circular struct {
	MeanDirection float64 `json:"mean_direction_rad"` // in (-pi, pi]; NaN if R = 0
	// MeanResultantLength is R in [0, 1]: 1 for identical angles, near 0
	// for angles spread round the circle.
	MeanResultantLength float64 `json:"mean_resultant_length"`
	StdDev              float64 `json:"circular_std_rad"` // sqrt(-2 ln R), rad
}

// CircularStats returns the circular summary of the angles theta (rad). It
// returns NaNs for an empty sample.
func CircularStats(theta []float64) Circular {
	n := float64(len(theta))
	if n == 0 {
		return Circular{math.NaN(), math.NaN(), math.NaN()}
	}
	var c, s float64
	for _, t := range theta {
		st, ct := math.Sincos(t)
		c += ct
		s += st
	}
	c, s = c/n, s/n
	r := min(math.Hypot(c, s), 1)
	dir := math.Atan2(s, c)
	if r == 0 {
		dir = math.NaN()
	}
	return Circular{MeanDirection: dir, MeanResultantLength: r, StdDev: math.Sqrt(-2 * math.Log(r))}
}
