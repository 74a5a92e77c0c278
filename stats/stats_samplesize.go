package stats

import "math"

// maxSamples caps the sample-size estimates: beyond it a verdict is treated
// as out of reach.
const maxSamples = 1 << 40

// AdditionalSamples estimates how many samples beyond the n already drawn
// would bring the interval of e clear of threshold, for an undecided verdict.
// It assumes the estimate stays where it is and the interval shrinks about it
// as 1/sqrt(n), as a mean's does: with d the distance from e.Value to the end
// of the interval on the threshold's side and g = |e.Value - threshold|, the
// interval clears the threshold once
//
//	d sqrt(n / N) < g,  that is N > n (d / g)^2.
//
// It returns 0 if the interval is already clear of threshold (the threshold
// is outside [Lo, Hi]), and ok = false if no number of samples would do under
// this model (the estimate equals the threshold) or more than 2^40 in all
// would be needed. The estimate is a guide for planning: the next batch moves
// the estimate too, so check the verdict again after it.
func AdditionalSamples(n int, e Estimate, threshold float64) (extra int, ok bool) {
	if n < 1 {
		panic("stats: sample-size estimate needs at least one sample")
	}
	if threshold < e.Lo || threshold > e.Hi {
		return 0, true
	}
	g := math.Abs(e.Value - threshold)
	if !(g > 0) {
		return 0, false
	}
	d := e.Hi - e.Value
	if threshold < e.Value {
		d = e.Value - e.Lo
	}
	r := float64(n) * (d / g) * (d / g)
	if !(r < maxSamples) {
		return 0, false
	}
	return int(math.Floor(r)) + 1 - n, true
}
