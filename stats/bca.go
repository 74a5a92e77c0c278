package stats

import (
	"fmt"
	"math"
	"math/bits"
	"math/rand/v2"
	"slices"

	"gonum.org/v1/gonum/mathext"
)

// BCa is the bias-corrected and accelerated (BCa) bootstrap of a sample's
// mean. Its one-sided bounds are second-order accurate: their coverage error
// is O(1/n), against the O(1/sqrt(n)) of the percentile bootstrap, which is
// what lets a "mean at least L" verdict hold its level on skewed outputs
// such as a contrast near 1.
//
// With theta the sample mean, theta*_b (b = 1..B) the means of B resamples
// and G their empirical distribution function, the bias correction and the
// acceleration are
//
//	z0 = Phi^-1( (#{theta*_b < theta} + #{theta*_b = theta}/2) / B ),
//	a  = sum_i d_i^3 / (6 (sum_i d_i^2)^(3/2)),   d_i = x_i - mean,
//
// a being the jackknife skewness of the mean (the leave-one-out means are
// theta - d_i/(n-1)). The bound at level q (q = 1 - c for a lower bound at
// confidence c, q = c for an upper one) is the type-7 quantile of the
// replicates at
//
//	q' = Phi( z0 + (z0 + z_q) / (1 - a (z0 + z_q)) ),  z_q = Phi^-1(q).
//
// References:
//   - B. Efron, "Better bootstrap confidence intervals", J. Am. Stat. Assoc.
//     82, 171 (1987).
//   - T. J. DiCiccio and B. Efron, "Bootstrap confidence intervals", Stat.
//     Sci. 11, 189 (1996).
type BCa struct {
	Value        float64 // the sample mean
	Z0           float64 // the bias correction
	Acceleration float64 // a
	replicates   []float64
}

// MeanBCa draws resamples bootstrap resamples of x with rng and prepares the
// BCa bounds of its mean. An index is the high word of the 128-bit product
// of a random word and n (Lemire's multiply-shift without rejection), whose
// departure from uniform, below n/2^64, no bootstrap can see. MeanBCa panics
// if x has fewer than two values or a NaN, resamples < 1 or rng is nil.
//
// References:
//   - D. Lemire, "Fast random integer generation in an interval", ACM Trans.
//     Model. Comput. Simul. 29, 3 (2019).
func MeanBCa(x []float64, resamples int, rng *rand.Rand) *BCa {
	n := len(x)
	if n < 2 || slices.ContainsFunc(x, math.IsNaN) {
		panic(fmt.Sprintf("stats: BCa of %d values (NaN-free, want at least 2)", n))
	}
	if resamples < 1 || rng == nil {
		panic("stats: BCa needs at least one resample and a random source")
	}
	m := Mean(x)
	var s2, s3 float64
	for _, v := range x {
		d := v - m
		s2 += d * d
		s3 += d * d * d
	}
	b := &BCa{Value: m, replicates: make([]float64, resamples)}
	if s2 > 0 {
		b.Acceleration = s3 / (6 * math.Pow(s2, 1.5))
	}
	below, equal := 0, 0
	for k := range b.replicates {
		var s float64
		for range n {
			w, _ := bits.Mul64(rng.Uint64(), uint64(n))
			s += x[w]
		}
		r := s / float64(n)
		b.replicates[k] = r
		switch {
		case r < m:
			below++
		case r == m:
			equal++
		}
	}
	slices.Sort(b.replicates)
	f := (float64(below) + float64(equal)/2) / float64(resamples)
	f = min(max(f, 0.5/float64(resamples)), 1-0.5/float64(resamples))
	b.Z0 = mathext.NormalQuantile(f)
	return b
}

// at returns the BCa bound at level q in (0, 1).
func (b *BCa) at(q float64) float64 {
	z := b.Z0 + mathext.NormalQuantile(q)
	den := 1 - b.Acceleration*z
	var adj float64
	switch {
	case den > 0:
		adj = 0.5 * math.Erfc(-(b.Z0+z/den)/math.Sqrt2)
	case z > 0:
		// Past the pole of the BCa map the level saturates at the end
		// it approaches.
		adj = 1
	}
	return QuantileSorted(b.replicates, min(max(adj, 0), 1))
}

// Lower returns the one-sided lower confidence bound on the mean at the
// given confidence.
func (b *BCa) Lower(confidence float64) float64 {
	checkConfidence(confidence)
	return b.at(1 - confidence)
}

// Upper returns the one-sided upper confidence bound on the mean at the
// given confidence.
func (b *BCa) Upper(confidence float64) float64 {
	checkConfidence(confidence)
	return b.at(confidence)
}

// Interval returns the two-sided equal-tailed BCa interval at the given
// confidence, its ends the one-sided bounds at (1 + confidence)/2.
func (b *BCa) Interval(confidence float64) (lo, hi float64) {
	checkConfidence(confidence)
	c := (1 + confidence) / 2
	return b.at(1 - c), b.at(c)
}

// AtLeast tests "the mean is at least limit": pass is the smallest alpha at
// which Lower(1 - alpha) >= limit, fail the smallest at which
// Upper(1 - alpha) < limit (each 1 if none in (0, 1/2]), so that a test at
// level alpha rejects exactly when its bound clears the limit. The p-values
// are found by bisection on alpha to 1e-9.
func (b *BCa) AtLeast(limit float64) (pass, fail float64) {
	return b.pValue(func(a float64) bool { return b.at(a) >= limit }),
		b.pValue(func(a float64) bool { return b.at(1-a) < limit })
}

// AtMost tests "the mean is at most limit", as [BCa.AtLeast] mirrored: pass
// when Upper(1 - alpha) <= limit, fail when Lower(1 - alpha) > limit.
func (b *BCa) AtMost(limit float64) (pass, fail float64) {
	return b.pValue(func(a float64) bool { return b.at(1-a) <= limit }),
		b.pValue(func(a float64) bool { return b.at(a) > limit })
}

// pValue returns the smallest alpha in (0, 1/2] for which reject(alpha)
// holds, reject being monotone (false below, true above), or 1 if it does
// not hold at 1/2.
func (b *BCa) pValue(reject func(alpha float64) bool) float64 {
	lo, hi := 0.0, 0.5
	if !reject(hi) {
		return 1
	}
	for hi-lo > 1e-9 {
		mid := (lo + hi) / 2
		if mid > 0 && reject(mid) {
			hi = mid
		} else {
			lo = mid
		}
	}
	return hi
}
