package stats

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

// ClopperPearson returns the yield k/n with the exact (Clopper-Pearson)
// two-sided binomial confidence interval for the success probability after k
// successes in n trials,
//
//	Lo = B^-1(alpha/2; k, n-k+1)       (0 if k = 0),
//	Hi = B^-1(1-alpha/2; k+1, n-k)     (1 if k = n),   alpha = 1 - confidence,
//
// where B^-1(p; a, b) is the p-quantile of the Beta(a, b) distribution. Its
// coverage is at least the confidence for every true probability. For example
// at 95%, 0 of 10 gives [0, 0.30850] and 5 of 10 gives [0.18709, 0.81291].
// ClopperPearson panics unless 0 <= k <= n, n >= 1 and 0 < confidence < 1.
//
// References:
//   - C. J. Clopper and E. S. Pearson, "The use of confidence or fiducial limits
//     illustrated in the case of the binomial", Biometrika 26, 404 (1934).
func ClopperPearson(k, n int, confidence float64) Estimate {
	checkTrials(k, n)
	checkConfidence(confidence)
	lo, hi := clopperPearson(float64(k), float64(n), confidence)
	return Estimate{Value: float64(k) / float64(n), Lo: lo, Hi: hi, Confidence: confidence}
}

// clopperPearson is ClopperPearson for a real number of successes k in [0, n],
// as the sample-size search needs.
func clopperPearson(k, n, confidence float64) (lo, hi float64) {
	alpha := 1 - confidence
	lo, hi = 0, 1
	if k > 0 {
		lo = distuv.Beta{Alpha: k, Beta: n - k + 1}.Quantile(alpha / 2)
	}
	if k < n {
		hi = distuv.Beta{Alpha: k + 1, Beta: n - k}.Quantile(1 - alpha/2)
	}
	return lo, hi
}

// ClopperPearsonUpper returns the exact one-sided upper confidence bound on the
// success probability after k successes in n trials, B^-1(confidence; k+1, n-k)
// (1 if k = n): the true probability is below it with at least the given
// confidence.
func ClopperPearsonUpper(k, n int, confidence float64) float64 {
	checkTrials(k, n)
	checkConfidence(confidence)
	if k == n {
		return 1
	}
	return distuv.Beta{Alpha: float64(k + 1), Beta: float64(n - k)}.Quantile(confidence)
}

// ClopperPearsonLower returns the exact one-sided lower confidence bound on the
// success probability after k successes in n trials, B^-1(1-confidence; k, n-k+1)
// (0 if k = 0), such as a qualified yield.
func ClopperPearsonLower(k, n int, confidence float64) float64 {
	checkTrials(k, n)
	checkConfidence(confidence)
	if k == 0 {
		return 0
	}
	return distuv.Beta{Alpha: float64(k), Beta: float64(n - k + 1)}.Quantile(1 - confidence)
}

// ZeroFailureUpper returns the exact one-sided upper confidence bound on a
// failure probability after no failures in n trials,
//
//	p_u = 1 - (1 - confidence)^(1/n),
//
// the value of ClopperPearsonUpper(0, n, confidence). At 95% it is the exact
// form of the rule of three, [RuleOfThree].
func ZeroFailureUpper(n int, confidence float64) float64 {
	checkTrials(0, n)
	checkConfidence(confidence)
	return -math.Expm1(math.Log1p(-confidence) / float64(n))
}

// RuleOfThree returns 3/n, the approximate one-sided 95% upper confidence bound
// on a failure probability after no failures in n trials. It is the large-n
// form of ZeroFailureUpper(n, 0.95) = 1 - 0.05^(1/n), since -ln 0.05 = 2.996,
// and always lies above it. It is a one-sided bound: the two-sided 95% interval
// for 0 of n reaches higher (0.30850 for n = 10, against 3/10 and 0.25887).
//
// References:
//   - J. A. Hanley and A. Lippman-Hand, "If nothing goes wrong, is everything
//     all right? Interpreting zero numerators", JAMA 249, 1743 (1983).
func RuleOfThree(n int) float64 {
	checkTrials(0, n)
	return 3 / float64(n)
}

func checkTrials(k, n int) {
	if n < 1 || k < 0 || k > n {
		panic(fmt.Sprintf("stats: %d successes in %d trials", k, n))
	}
}
