package stats

import (
	"fmt"

	"math/rand/v2"
)

// MeanBound is a source of one-sided confidence bounds on a mean, such as
// a *BootstrapT or a SkewT.
type MeanBound interface {
	Lower(confidence float64) float64
	Upper(confidence float64) float64
}

// SkewT is the skewness-corrected t of MeanSkewT as one-sided bounds: its
// lower (upper) bound at confidence c is the lower (upper) end of the
// two-sided interval at 2c - 1.
type SkewT struct{ Moments }

// Lower returns the one-sided lower bound at confidence c.
func (s SkewT) Lower(c float64) float64 { lo, _ := MeanSkewT(s.Moments, 2*c-1); return lo }

// Upper returns the one-sided upper bound at confidence c.
func (s SkewT) Upper(c float64) float64 { _, hi := MeanSkewT(s.Moments, 2*c-1); return hi }

// ZeroMixture bounds the mean of a non-negative quantity with a point mass
// at exactly 0, such as a contrast with lost shots. With q the probability
// of a zero and m the mean of the non-zero values, the mean is
//
//	mu = (1 - q) m,
//
// both factors non-negative. With K zeros in n values, the one-sided bounds
// at confidence 1 - alpha are (Bonferroni: each factor at alpha/2)
//
//	lower = (1 - qU) max(mL, 0),   upper = (1 - qL) min(mU, Max),
//
// qL, qU the exact Clopper-Pearson bounds on q at 1 - alpha/2 and mL, mU
// the bounds of Rest on m at 1 - alpha/2. Since mu is increasing in 1 - q
// and in m, the bound misses only if one of the two factors' bounds does,
// which happens with probability at most alpha/2 + alpha/2 (the
// conditional bound on m holds given the count of non-zero values, so also
// unconditionally). With no zero (K = 0) the bounds are exactly Rest's at
// 1 - alpha unless Possible says that zeros can occur: a sample without a
// zero cannot show a point mass of probability q with n q of order one
// (P(K = 0) = (1 - q)^n, 0.22 for q = 1.5 % at n = 100), so a caller that
// knows the output may vanish sets Possible, and the Clopper-Pearson bound
// at K = 0, 1 - (alpha/2)^(1/n), then enters the lower bound.
//
// Why not the bootstrap-t of all values: a resample that happens to draw
// no zero has a tiny standard error, so its t* is huge (about 50 for a
// 1.5 % point mass under a Beta(50, 1) at n = 200), and the bound collapses
// towards 0 — the studentized bootstrap is not second-order accurate on a
// lattice-plus-continuous mixture (Hall 1992, sec. 2.8, on the Edgeworth
// expansion needing a non-lattice distribution).
//
// References:
//   - C. J. Clopper and E. S. Pearson, Biometrika 26, 404 (1934).
//   - P. Hall, "Theoretical comparison of bootstrap confidence intervals",
//     Ann. Stat. 16, 927 (1988).
//   - P. Hall, The Bootstrap and Edgeworth Expansion (Springer, 1992),
//     sec. 2.8 (from memory).
//   - J. Aitchison, "On the distribution of a positive random variable
//     having a discrete probability mass at the origin", J. Am. Stat. Assoc.
//     50, 901 (1955) (the delta-mixture model; from memory).
type ZeroMixture struct {
	Value float64   // the sample mean (1 - K/n) times the non-zero values' mean
	N     int       // number of values
	Zeros int       // K, the values exactly 0
	Rest  MeanBound // bounds on the non-zero values' mean; nil if fewer than two
	Max   float64   // the largest a value can be: m's upper bound where Rest has none
	// Possible says that the values may be 0 even if none is: the mixture
	// bounds then apply at K = 0 too.
	Possible bool
}

// MeanZeroMixture prepares the bounds of ZeroMixture on the mean of x
// (values >= 0, at most max), with the bootstrap-t (MeanBootstrapT, its
// resamples drawn from rng) on the non-zero values; possible is
// ZeroMixture.Possible. With no zero in x it draws exactly what
// MeanBootstrapT(x, resamples, rng) draws, and without possible its bounds
// are that bootstrap-t's. It panics if
// x has fewer than two values, a NaN or a value outside [0, max].
func MeanZeroMixture(x []float64, max float64, possible bool, resamples int, rng *rand.Rand) *ZeroMixture {
	if len(x) < 2 {
		panic(fmt.Sprintf("stats: mean of a zero mixture of %d values (want at least 2)", len(x)))
	}
	rest := make([]float64, 0, len(x))
	for _, v := range x {
		if !(v >= 0 && v <= max) {
			panic(fmt.Sprintf("stats: zero mixture value %g outside [0, %g]", v, max))
		}
		if v != 0 {
			rest = append(rest, v)
		}
	}
	z := &ZeroMixture{Value: Mean(x), N: len(x), Zeros: len(x) - len(rest), Max: max, Possible: possible}
	if len(rest) >= 2 {
		z.Rest = MeanBootstrapT(rest, resamples, rng)
	}
	return z
}

// NewZeroMixture returns the bounds of K = zeros zeros in n values whose
// non-zero values have the mean restMean, bounded by rest (nil if there
// are fewer than two) and at most max; the mean is (1 - K/n) restMean.
func NewZeroMixture(n, zeros int, restMean float64, rest MeanBound, max float64, possible bool) *ZeroMixture {
	checkTrials(zeros, n)
	return &ZeroMixture{Value: float64(n-zeros) / float64(n) * restMean, N: n, Zeros: zeros, Rest: rest, Max: max, Possible: possible}
}

// Lower returns the one-sided lower bound on the mean at the confidence.
func (z *ZeroMixture) Lower(confidence float64) float64 {
	checkConfidence(confidence)
	if z.Zeros == 0 && !z.Possible && z.Rest != nil {
		return z.Rest.Lower(confidence)
	}
	if z.Rest == nil {
		return 0
	}
	c := 1 - (1-confidence)/2
	qU := ClopperPearsonUpper(z.Zeros, z.N, c)
	return (1 - qU) * max(z.Rest.Lower(c), 0)
}

// Upper returns the one-sided upper bound on the mean at the confidence.
func (z *ZeroMixture) Upper(confidence float64) float64 {
	checkConfidence(confidence)
	if z.Zeros == 0 && !z.Possible && z.Rest != nil {
		return z.Rest.Upper(confidence)
	}
	c := 1 - (1-confidence)/2
	qL := ClopperPearsonLower(z.Zeros, z.N, c)
	m := z.Max
	if z.Rest != nil {
		m = min(z.Rest.Upper(c), z.Max)
	}
	if z.Zeros == z.N {
		m = z.Max
	}
	return (1 - qL) * max(m, 0)
}

// Interval returns the two-sided equal-tailed interval, its ends the
// one-sided bounds at (1 + confidence)/2.
func (z *ZeroMixture) Interval(confidence float64) (lo, hi float64) {
	checkConfidence(confidence)
	c := (1 + confidence) / 2
	return z.Lower(c), z.Upper(c)
}

// AtLeast tests "the mean is at least limit" as BootstrapT.AtLeast does.
func (z *ZeroMixture) AtLeast(limit float64) (pass, fail float64) {
	return smallestAlpha(func(a float64) bool { return z.Lower(1-a) >= limit }),
		smallestAlpha(func(a float64) bool { return z.Upper(1-a) < limit })
}
