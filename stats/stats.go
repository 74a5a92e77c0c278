package stats

import (
	"math"
	"slices"
)

// Mean returns the arithmetic mean of x, NaN if x is empty.
func Mean(x []float64) float64 {
	if len(x) == 0 {
		return math.NaN()
	}
	var s float64
	for _, v := range x {
		s += v
	}
	m := s / float64(len(x))
	if math.IsInf(m, 0) || math.IsNaN(m) {
		return m
	}
	// One correction pass removes most of the rounding error of the sum.
	var c float64
	for _, v := range x {
		c += v - m
	}
	return m + c/float64(len(x))
}

// Variance returns the unbiased sample variance of x,
//
//	s^2 = sum_i (x_i - mean)^2 / (n - 1),
//
// computed in two passes; NaN if x has fewer than two values.
func Variance(x []float64) float64 {
	n := len(x)
	if n < 2 {
		return math.NaN()
	}
	m := Mean(x)
	var ss, c float64
	for _, v := range x {
		d := v - m
		ss += d * d
		c += d
	}
	// The compensation term is the corrected two-pass algorithm of Chan,
	// Golub and LeVeque, Am. Stat. 37, 242 (1983).
	return (ss - c*c/float64(n)) / float64(n-1)
}

// StdDev returns the sample standard deviation sqrt(Variance(x)), as
// numpy.std(x, ddof=1).
func StdDev(x []float64) float64 {
	return math.Sqrt(Variance(x))
}

// MeanComplex returns the mean of z. For overlaps z_i of an ensemble, its
// modulus is the averaged-fringe contrast and its argument the fringe phase.
func MeanComplex(z []complex128) complex128 {
	if len(z) == 0 {
		return complex(math.NaN(), math.NaN())
	}
	var s complex128
	for _, v := range z {
		s += v
	}
	return s / complex(float64(len(z)), 0)
}

// Quantile returns the p-quantile of x by linear interpolation between order
// statistics, Hyndman and Fan's definition 7 (the default of NumPy's
// numpy.quantile, method "linear", and of R's quantile): with x sorted
// ascending as x_(0) <= ... <= x_(n-1),
//
//	h = (n - 1) p,  Q(p) = x_(floor h) + (h - floor h) (x_(floor h + 1) - x_(floor h)).
//
// Quantile does not modify x. It returns NaN if x is empty or holds a NaN, and
// panics if p is outside [0, 1].
//
// References:
//   - R. J. Hyndman and Y. Fan, "Sample quantiles in statistical packages",
//     Am. Stat. 50, 361 (1996).
func Quantile(x []float64, p float64) float64 {
	checkProbability(p)
	if len(x) == 0 || slices.ContainsFunc(x, math.IsNaN) {
		return math.NaN()
	}
	s := slices.Clone(x)
	slices.Sort(s)
	return QuantileSorted(s, p)
}

// Quantiles returns Quantile(x, p) for each p in ps, sorting x once.
func Quantiles(x []float64, ps ...float64) []float64 {
	q := make([]float64, len(ps))
	if len(x) == 0 || slices.ContainsFunc(x, math.IsNaN) {
		for k, p := range ps {
			checkProbability(p)
			q[k] = math.NaN()
		}
		return q
	}
	s := slices.Clone(x)
	slices.Sort(s)
	for k, p := range ps {
		q[k] = QuantileSorted(s, p)
	}
	return q
}

// QuantileSorted is [Quantile] for a sample already sorted ascending and free
// of NaN, without copying it.
func QuantileSorted(sorted []float64, p float64) float64 {
	checkProbability(p)
	n := len(sorted)
	if n == 0 {
		return math.NaN()
	}
	h := float64(n-1) * p
	lo := int(h)
	if lo >= n-1 {
		return sorted[n-1]
	}
	return sorted[lo] + (h-float64(lo))*(sorted[lo+1]-sorted[lo])
}

func checkProbability(p float64) {
	if !(p >= 0 && p <= 1) {
		panic("stats: quantile level outside [0, 1]")
	}
}
