package stats

import (
	"fmt"
	"math/rand/v2"
	"slices"
)

// Estimate is a point estimate with a two-sided confidence interval.
type Estimate struct {
	Value      float64 // the statistic of the full sample
	Lo, Hi     float64 // the confidence interval
	Confidence float64 // the coverage the interval aims at, such as 0.95
}

// Contains reports whether Lo <= x <= Hi.
func (e Estimate) Contains(x float64) bool { return e.Lo <= x && x <= e.Hi }

// String formats the estimate as "value [lo, hi] (95%)".
func (e Estimate) String() string {
	return fmt.Sprintf("%.6g [%.6g, %.6g] (%g%%)", e.Value, e.Lo, e.Hi, 100*e.Confidence)
}

// Bootstrap estimates stat on the sample x with a bootstrap percentile
// confidence interval. It draws resamples samples of len(x) values from x with
// replacement, using rng, computes stat on each (the replicates T*_b), and
// returns
//
//	Value = stat(x),  [Lo, Hi] = [Q*(alpha/2), Q*(1 - alpha/2)],  alpha = 1 - confidence,
//
// where Q* is the [Quantile] (type 7) of the replicates. stat is called with a
// scratch slice that it may reorder or overwrite; x itself is not modified.
// The interval is reproducible given the state of rng. The percentile interval
// is first-order accurate; it under-covers somewhat for small samples and
// skewed statistics, and several hundred to a few thousand resamples are usual.
//
// Bootstrap panics if x is empty, resamples < 1, confidence is outside (0, 1)
// or rng is nil.
//
// References:
//   - B. Efron and R. J. Tibshirani, An Introduction to the Bootstrap
//     (Chapman & Hall, 1993), ch. 13.
func Bootstrap(x []float64, stat func([]float64) float64, resamples int, confidence float64, rng *rand.Rand) Estimate {
	checkBootstrap(len(x), resamples, confidence, rng)
	buf := slices.Clone(x)
	value := stat(buf)
	reps := BootstrapReplicates(len(x), resamples, rng, func(idx []int) float64 {
		for k, j := range idx {
			buf[k] = x[j]
		}
		return stat(buf)
	})
	lo, hi := PercentileInterval(reps, confidence)
	return Estimate{Value: value, Lo: lo, Hi: hi, Confidence: confidence}
}

// PairedBootstrap estimates the difference stat(x) - stat(y) between two
// samples paired by index, such as one output of two ramps run on the same
// noise draws (common random numbers), with a bootstrap percentile interval.
// Each resample draws indices with replacement and takes the same indices from
// both samples, which keeps the positive correlation that common random
// numbers create and so gives a much narrower interval than resampling the two
// independently. For the mean, the difference is the mean of the paired
// differences x_i - y_i. Otherwise as [Bootstrap]; it panics also if x and y
// differ in length.
func PairedBootstrap(x, y []float64, stat func([]float64) float64, resamples int, confidence float64, rng *rand.Rand) Estimate {
	if len(x) != len(y) {
		panic(fmt.Sprintf("stats: paired samples of lengths %d and %d", len(x), len(y)))
	}
	checkBootstrap(len(x), resamples, confidence, rng)
	bx, by := slices.Clone(x), slices.Clone(y)
	value := stat(bx) - stat(by)
	reps := BootstrapReplicates(len(x), resamples, rng, func(idx []int) float64 {
		for k, j := range idx {
			bx[k], by[k] = x[j], y[j]
		}
		return stat(bx) - stat(by)
	})
	lo, hi := PercentileInterval(reps, confidence)
	return Estimate{Value: value, Lo: lo, Hi: hi, Confidence: confidence}
}

// BootstrapReplicates returns resamples bootstrap replicates of a statistic of
// n observations: for each replicate it draws n indices uniformly from
// {0, ..., n-1} with replacement, using rng, and calls stat with them. The index
// slice is reused between calls. Use it for statistics of several paired
// arrays, such as Sobol' indices or a complex mean.
func BootstrapReplicates(n, resamples int, rng *rand.Rand, stat func(idx []int) float64) []float64 {
	if n < 1 || resamples < 1 || rng == nil {
		panic("stats: bootstrap needs at least one observation, one resample and a random source")
	}
	idx := make([]int, n)
	reps := make([]float64, resamples)
	for b := range reps {
		for k := range idx {
			idx[k] = rng.IntN(n)
		}
		reps[b] = stat(idx)
	}
	return reps
}

// PercentileInterval returns the (1-confidence)/2 and (1+confidence)/2
// quantiles (type 7) of the replicates, the bootstrap percentile interval.
// It returns NaNs if any replicate is NaN.
func PercentileInterval(replicates []float64, confidence float64) (lo, hi float64) {
	checkConfidence(confidence)
	alpha := 1 - confidence
	q := Quantiles(replicates, alpha/2, 1-alpha/2)
	return q[0], q[1]
}

func checkBootstrap(n, resamples int, confidence float64, rng *rand.Rand) {
	if n < 1 {
		panic("stats: bootstrap of an empty sample")
	}
	if resamples < 1 {
		panic(fmt.Sprintf("stats: %d bootstrap resamples, want at least 1", resamples))
	}
	if rng == nil {
		panic("stats: bootstrap needs a random source")
	}
	checkConfidence(confidence)
}

func checkConfidence(c float64) {
	if !(c > 0 && c < 1) {
		panic(fmt.Sprintf("stats: confidence %g outside (0, 1)", c))
	}
}
