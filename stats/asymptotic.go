package stats

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

// Moments are the sample moments of a large sample that the closed-form
// (asymptotic) intervals below are built from: the mean, the unbiased
// variance s^2 and the central moments m3 = sum (x - m)^3 / n and
// m4 = sum (x - m)^4 / n.
type Moments struct {
	N        int
	Mean     float64
	Variance float64 // s^2, divisor n - 1
	M3, M4   float64 // divisor n
}

// SampleMoments returns the moments of x in two passes (the second about
// the mean, which keeps them accurate for data far from 0). It panics if x
// has fewer than two values.
func SampleMoments(x []float64) Moments {
	n := len(x)
	if n < 2 {
		panic(fmt.Sprintf("stats: moments of %d values (want at least 2)", n))
	}
	m := Mean(x)
	var s2, s3, s4 float64
	for _, v := range x {
		d := v - m
		d2 := d * d
		s2 += d2
		s3 += d2 * d
		s4 += d2 * d2
	}
	fn := float64(n)
	return Moments{N: n, Mean: m, Variance: s2 / (fn - 1), M3: s3 / fn, M4: s4 / fn}
}

// MeanSkewT returns the two-sided interval at confidence c for the mean from
// the Student-t interval with the Cornish-Fisher correction for skewness.
// The studentized mean T = sqrt(n) (m - mu) / s has the Edgeworth
// expansion
//
//	P(T <= x) = Phi(x) + n^(-1/2) (gamma/6) (2 x^2 + 1) phi(x) + O(1/n)
//
// (gamma the skewness), whose inversion gives the quantile
// t_q = z_q - n^(-1/2) (gamma/6) (2 z_q^2 + 1) + O(1/n). With z the
// (1 + c)/2 quantile (taken from Student's t with n - 1 degrees of
// freedom, which changes only O(1/n) terms) and gamma = m3 / s^3, the
// interval mu in m - t_q s / sqrt(n) is
//
//	lo, hi = m -+ z s / sqrt(n) + gamma s (2 z^2 + 1) / (6 n).
//
// Each one-sided bound then errs by O(1/n), the order of the bootstrap-t
// (Hall 1988); its leading term is the same correction as Johnson's
// modified t (1978).
//
// References:
//   - P. Hall, The Bootstrap and Edgeworth Expansion (Springer, 1992),
//     sec. 2.6 and 3.5 (from memory: q_1(x) = gamma (2x^2 + 1)/6 for the
//     studentized mean).
//   - N. J. Johnson, "Modified t tests and confidence intervals for
//     asymmetrical populations", J. Am. Stat. Assoc. 73, 536 (1978).
func MeanSkewT(mo Moments, c float64) (lo, hi float64) {
	checkConfidence(c)
	n := float64(mo.N)
	s := math.Sqrt(mo.Variance)
	z := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: n - 1}.Quantile((1 + c) / 2)
	shift := 0.0
	if s > 0 {
		gamma := mo.M3 / (s * s * s)
		shift = gamma * s * (2*z*z + 1) / (6 * n)
	}
	half := z * s / math.Sqrt(n)
	return mo.Mean - half + shift, mo.Mean + half + shift
}

// StdDelta returns the two-sided interval at confidence c for the standard
// deviation sigma by the delta method: sqrt(n) (s^2 - sigma^2) tends to a
// normal of variance mu4 - sigma^4, so s has the standard error
//
//	se(s) = sqrt((m4 - s^4) / n) / (2 s)
//
// and the interval is s -+ z se(s), z the normal (1 + c)/2 quantile, the
// lower end held at 0. Its one-sided error is O(n^(-1/2)), that of the
// percentile bootstrap it stands in for.
//
// Reference: R. J. Serfling, Approximation Theorems of Mathematical
// Statistics (Wiley, 1980), sec. 2.2.3 (asymptotic normality of the
// sample central moments; from memory).
func StdDelta(mo Moments, c float64) (lo, hi float64) {
	checkConfidence(c)
	s := math.Sqrt(mo.Variance)
	if s == 0 {
		return 0, 0
	}
	z := normalQuantile((1 + c) / 2)
	se := math.Sqrt(max(mo.M4-mo.Variance*mo.Variance, 0)/float64(mo.N)) / (2 * s)
	return max(s-z*se, 0), s + z*se
}

// ComplexMeanDelta returns the modulus |m| and argument arg m of the mean m
// of z = re + i im with their two-sided intervals at confidence c by the
// delta method on the bivariate mean: with S the sample covariance matrix
// of (re, im) and m = a + i b, R = |m|,
//
//	Var(|m|)   = (a^2 S_aa + 2 a b S_ab + b^2 S_bb) / (n R^2),
//	Var(arg m) = (b^2 S_aa - 2 a b S_ab + a^2 S_bb) / (n R^4),
//
// each interval being value -+ z se, z the normal (1 + c)/2 quantile. The
// argument's interval is not wrapped (it may pass +-pi). A zero mean has
// no direction: its argument interval is [-pi, pi]. It panics if re and im
// differ in length or have fewer than two values.
//
// Reference: the delta method, e.g. Serfling (1980) sec. 3.3 (common
// practice).
func ComplexMeanDelta(re, im []float64, c float64) (mod, arg Estimate) {
	n := len(re)
	if n < 2 || len(im) != n {
		panic(fmt.Sprintf("stats: complex mean of %d and %d parts (want equal, at least 2)", n, len(im)))
	}
	checkConfidence(c)
	a, b := Mean(re), Mean(im)
	var saa, sab, sbb float64
	for i := range re {
		da, db := re[i]-a, im[i]-b
		saa += da * da
		sab += da * db
		sbb += db * db
	}
	fn := float64(n)
	saa, sab, sbb = saa/(fn-1), sab/(fn-1), sbb/(fn-1)
	r2 := a*a + b*b
	r := math.Sqrt(r2)
	th := math.Atan2(b, a)
	z := normalQuantile((1 + c) / 2)
	if r2 == 0 {
		// No direction: the modulus is bounded by the spread alone.
		se := math.Sqrt((saa + sbb) / fn)
		return Estimate{Value: 0, Lo: 0, Hi: z * se, Confidence: c}, Estimate{Value: 0, Lo: -math.Pi, Hi: math.Pi, Confidence: c}
	}
	seR := math.Sqrt(max(a*a*saa+2*a*b*sab+b*b*sbb, 0) / (fn * r2))
	seT := math.Sqrt(max(b*b*saa-2*a*b*sab+a*a*sbb, 0)/fn) / r2
	return Estimate{Value: r, Lo: max(r-z*seR, 0), Hi: r + z*seR, Confidence: c}, Estimate{Value: th, Lo: th - z*seT, Hi: th + z*seT, Confidence: c}
}

// normalQuantile is the standard normal quantile function.
func normalQuantile(p float64) float64 { return distuv.UnitNormal.Quantile(p) }
