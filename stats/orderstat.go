package stats

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mathext"
)

// OrderBound is a distribution-free confidence bound on a quantile: an order
// statistic X(Rank) of the sample, or, when the sample is too small for any
// order statistic to be a bound at the confidence, the smallest sample that
// would give one.
type OrderBound struct {
	Value float64 `json:"value"` // X(Rank); NaN if !OK
	Rank  int     `json:"rank"`  // 1-based rank of the order statistic; 0 if !OK
	OK    bool    `json:"ok"`
	// MinSamples is the smallest sample size at which a bound of this kind
	// (same p, confidence and side) exists, set whether or not OK.
	MinSamples int `json:"min_samples"`
}

// LowerRank returns the rank r of the exact distribution-free one-sided
// lower confidence bound X(r) on the p-quantile xi_p of n observations at
// the given confidence c: the largest r in 1..n with
//
//	P(X(r) <= xi_p) = P(Bin(n, p) >= r) >= c,
//
// since X(r) <= xi_p exactly when at least r observations lie at or below
// xi_p, and each does with probability F(xi_p) >= p. The coverage is at
// least c for every distribution, continuous or not, and equals
// P(Bin(n, p) >= r) for a continuous one. ok is false if even X(1) is not a
// bound, (1 - p)^n > 1 - c.
//
// References:
//   - G. J. Hahn, W. Q. Meeker and L. A. Escobar, Statistical Intervals, 2nd
//     ed. (Wiley, 2017), ch. 5.
//   - H. A. David and H. N. Nagaraja, Order Statistics, 3rd ed. (Wiley, 2003),
//     sec. 7.1.
func LowerRank(n int, p, confidence float64) (r int, ok bool) {
	checkOrder(n, p, confidence)
	alpha := 1 - confidence
	// BinomialCDF(r-1) rises with r: find the last r with it <= alpha.
	if BinomialCDF(0, n, p) > alpha {
		return 0, false
	}
	lo, hi := 1, n+1 // lo is a bound, hi is not (or beyond n)
	for hi-lo > 1 {
		mid := lo + (hi-lo)/2
		if BinomialCDF(mid-1, n, p) <= alpha {
			lo = mid
		} else {
			hi = mid
		}
	}
	return lo, true
}

// UpperRank returns the rank s of the exact distribution-free one-sided
// upper confidence bound X(s) on the p-quantile of n observations at the
// given confidence c: the smallest s in 1..n with
//
//	P(X(s) >= xi_p) = P(Bin(n, p) <= s - 1) >= c,
//
// since X(s) >= xi_p exactly when fewer than s observations lie below xi_p,
// each with probability F(xi_p-) <= p. ok is false if even X(n) is not a
// bound, 1 - p^n < c. References as [LowerRank].
func UpperRank(n int, p, confidence float64) (s int, ok bool) {
	checkOrder(n, p, confidence)
	if BinomialCDF(n-1, n, p) < confidence {
		return 0, false
	}
	lo, hi := 0, n // lo is not a bound (or below 1), hi is
	for hi-lo > 1 {
		mid := lo + (hi-lo)/2
		if BinomialCDF(mid-1, n, p) >= confidence {
			hi = mid
		} else {
			lo = mid
		}
	}
	return hi, true
}

// MinSamplesLower returns the smallest n for which the r-th smallest
// observation X(r) is a one-sided lower confidence bound on the p-quantile
// at the given confidence, P(Bin(n, p) <= r - 1) <= 1 - c. For r = 1 it is
// ceil(ln(1 - c) / ln(1 - p)): 59 for the 5th percentile at 95 %, 299 for the
// 1st; for r = 2 and the 5th percentile at 95 %, 93 (Wilks 1941).
//
// References:
//   - S. S. Wilks, "Determination of sample sizes for setting tolerance
//     limits", Ann. Math. Stat. 12, 91 (1941).
func MinSamplesLower(r int, p, confidence float64) int {
	if r < 1 {
		panic(fmt.Sprintf("stats: order statistic rank %d, want at least 1", r))
	}
	checkOrder(r, p, confidence)
	good := func(n int) bool { return BinomialCDF(r-1, n, p) <= 1-confidence }
	lo, hi := r-1, r // lo fails (or is below r), hi is tried
	for !good(hi) {
		if hi > maxSamples {
			panic(fmt.Sprintf("stats: no sample of fewer than 2^40 bounds the %g-quantile at %g with rank %d", p, confidence, r))
		}
		lo, hi = hi, 2*hi
	}
	for hi-lo > 1 {
		mid := lo + (hi-lo)/2
		if good(mid) {
			hi = mid
		} else {
			lo = mid
		}
	}
	return hi
}

// MinSamplesUpper returns the smallest n for which the r-th largest
// observation X(n+1-r) is a one-sided upper confidence bound on the
// p-quantile at the given confidence; by symmetry it is
// MinSamplesLower(r, 1-p, confidence): 59 for the 95th percentile at 95 %.
func MinSamplesUpper(r int, p, confidence float64) int {
	return MinSamplesLower(r, 1-p, confidence)
}

// QuantileLower returns the exact distribution-free one-sided lower
// confidence bound X(r) on the p-quantile (r from [LowerRank]) of a sample
// sorted ascending, or OK = false with the sample size that would give one.
func QuantileLower(sorted []float64, p, confidence float64) OrderBound {
	n := len(sorted)
	b := OrderBound{Value: math.NaN(), MinSamples: MinSamplesLower(1, p, confidence)}
	if r, ok := LowerRank(n, p, confidence); ok {
		b.Value, b.Rank, b.OK = sorted[r-1], r, true
	}
	return b
}

// QuantileUpper returns the exact distribution-free one-sided upper
// confidence bound X(s) on the p-quantile (s from [UpperRank]) of a sample
// sorted ascending, or OK = false with the sample size that would give one.
func QuantileUpper(sorted []float64, p, confidence float64) OrderBound {
	n := len(sorted)
	b := OrderBound{Value: math.NaN(), MinSamples: MinSamplesUpper(1, p, confidence)}
	if s, ok := UpperRank(n, p, confidence); ok {
		b.Value, b.Rank, b.OK = sorted[s-1], s, true
	}
	return b
}

// QuantileInterval returns the exact distribution-free two-sided confidence
// interval [X(r), X(s)] on the p-quantile of a sample sorted ascending at the
// given confidence c, with equal tails: each end is the one-sided bound at
// (1 + c)/2, so the coverage is at least c by the union bound,
//
//	P(X(r) <= xi_p <= X(s)) >= 1 - 2 (1 - (1 + c)/2) = c.
//
// An end that does not exist at this n has OK = false. References as
// [LowerRank].
func QuantileInterval(sorted []float64, p, confidence float64) (lo, hi OrderBound) {
	checkConfidence(confidence)
	c := (1 + confidence) / 2
	return QuantileLower(sorted, p, c), QuantileUpper(sorted, p, c)
}

// QuantileAtLeast tests "the p-quantile is at least limit" on a sample
// sorted ascending. With k the number of observations below limit, it
// returns the exact p-values
//
//	pass = P(Bin(n, p) <= k)   against xi_p < limit,
//	fail = P(Bin(n, p) >= k)   against xi_p >= limit.
//
// pass <= 1 - c exactly when QuantileLower(sorted, p, c) is OK and at least
// limit, and fail <= 1 - c exactly when QuantileUpper(sorted, p, c) is OK and
// below limit: the tests are the duals of the bounds. Both hold their levels
// for every distribution.
func QuantileAtLeast(sorted []float64, p, limit float64) (pass, fail float64) {
	n := len(sorted)
	k := countBelow(sorted, limit, false)
	return BinomialCDF(k, n, p), BinomialSurvival(k, n, p)
}

// QuantileAtMost tests "the p-quantile is at most limit" on a sample sorted
// ascending. With k the number of observations at or below limit, it returns
// the exact p-values
//
//	pass = P(Bin(n, p) >= k)   against xi_p > limit,
//	fail = P(Bin(n, p) <= k)   against xi_p <= limit,
//
// the duals of QuantileUpper (pass: at most limit) and QuantileLower (fail:
// above limit).
func QuantileAtMost(sorted []float64, p, limit float64) (pass, fail float64) {
	n := len(sorted)
	k := countBelow(sorted, limit, true)
	return BinomialSurvival(k, n, p), BinomialCDF(k, n, p)
}

// countBelow returns the number of sorted values below x, or at or below x
// if orEqual.
func countBelow(sorted []float64, x float64, orEqual bool) int {
	lo, hi := 0, len(sorted)
	for lo < hi {
		mid := lo + (hi-lo)/2
		if sorted[mid] < x || (orEqual && sorted[mid] == x) {
			lo = mid + 1
		} else {
			hi = mid
		}
	}
	return lo
}

// BinomialCDF returns P(Bin(n, p) <= k) = I_{1-p}(n - k, k + 1), with I the
// regularised incomplete beta function (0 for k < 0, 1 for k >= n).
func BinomialCDF(k, n int, p float64) float64 {
	switch {
	case k < 0:
		return 0
	case k >= n:
		return 1
	}
	return mathext.RegIncBeta(float64(n-k), float64(k+1), 1-p)
}

// BinomialSurvival returns P(Bin(n, p) >= k) = I_p(k, n - k + 1) (1 for
// k <= 0, 0 for k > n), computed directly so that a small tail keeps its
// relative accuracy.
func BinomialSurvival(k, n int, p float64) float64 {
	switch {
	case k <= 0:
		return 1
	case k > n:
		return 0
	}
	return mathext.RegIncBeta(float64(k), float64(n-k+1), p)
}

func checkOrder(n int, p, confidence float64) {
	if n < 1 {
		panic(fmt.Sprintf("stats: order-statistic bound of %d observations", n))
	}
	if !(p > 0 && p < 1) {
		panic(fmt.Sprintf("stats: quantile level %g outside (0, 1)", p))
	}
	checkConfidence(confidence)
}
