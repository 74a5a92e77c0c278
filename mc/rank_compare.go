package mc

import (
	"math"
	"math/bits"
	"math/rand/v2"
	"slices"

	"rampart/stats"
)

// DecisionResamples is the number of bootstrap resamples behind the
// bootstrap intervals of a ranking, a qualification and a tolerance search:
// enough that the 5% tails of the replicates, on which their verdicts turn,
// hold 50 replicates each.
const DecisionResamples = 1000

// comparison holds each ramp's metric with its interval and the
// simultaneous intervals of the differences between ramps.
type comparison struct {
	value    []float64
	interval [][2]float64
	// none marks the ends of interval that do not exist (a quantile no
	// order statistic bounds at this size: the end of the metric's range
	// stands in); need is then the smallest ensemble with both ends.
	none [][2]bool
	need []int
	diff func(a, b int) PartialInterval
}

// boundsComparison compares ramps by non-overlap of simultaneous
// intervals: the difference a - b lies in [Lo_a - Hi_b, Hi_a - Lo_b], an
// end missing when an end it is made of is (none, nil when every end
// exists).
func boundsComparison(value []float64, interval [][2]float64, none [][2]bool, need []int) comparison {
	c := comparison{value: value, interval: interval, none: none, need: need}
	c.diff = func(a, b int) PartialInterval {
		d := PartialInterval{Interval: Interval{Value: value[a] - value[b], Lo: interval[a][0] - interval[b][1], Hi: interval[a][1] - interval[b][0]}}
		if none != nil {
			d.NoLo, d.NoHi = none[a][0] || none[b][1], none[a][1] || none[b][0]
			if d.NoLo || d.NoHi {
				d.NoBoundBelow = max(need[a], need[b])
			}
		}
		return d
	}
	return c
}

// quantileComparison gives each ramp the exact order-statistic interval of
// its p-quantile at the Bonferroni confidence 1 - (1 - c)/k; a missing end
// is the end of the metric's range.
func quantileComparison(xs [][]float64, p, confidence float64, support [2]float64) comparison {
	k := len(xs)
	c := 1 - (1-confidence)/float64(k)
	value := make([]float64, k)
	interval := make([][2]float64, k)
	none := make([][2]bool, k)
	need := make([]int, k)
	for r, x := range xs {
		s := slices.Sorted(slices.Values(x))
		value[r] = stats.QuantileSorted(s, p)
		lo, hi := stats.QuantileInterval(s, p, c)
		interval[r] = support
		none[r] = [2]bool{!lo.OK, !hi.OK}
		if lo.OK {
			interval[r][0] = lo.Value
		}
		if hi.OK {
			interval[r][1] = hi.Value
		}
		if !lo.OK || !hi.OK {
			need[r] = max(lo.MinSamples, hi.MinSamples)
		}
	}
	return boundsComparison(value, interval, none, need)
}

// yieldComparison gives each ramp the Clopper-Pearson interval of its yield
// (x holds 1 inside, 0 outside) at the Bonferroni confidence.
func yieldComparison(xs [][]float64, confidence float64) comparison {
	k := len(xs)
	c := 1 - (1-confidence)/float64(k)
	value := make([]float64, k)
	interval := make([][2]float64, k)
	for r, x := range xs {
		inside := 0
		for _, v := range x {
			if v == 1 {
				inside++
			}
		}
		e := stats.ClopperPearson(inside, len(x), c)
		value[r], interval[r] = e.Value, [2]float64{e.Lo, e.Hi}
	}
	return boundsComparison(value, interval, nil, nil)
}

// meanComparison compares the means of paired samples with the max-type
// bootstrap described at Rank, and gives each ramp its bootstrap-t interval at the
// confidence, or with lost shots the interval of stats.ZeroMixture. An index is the high word of the 128-bit product of a random
// word and n (Lemire's multiply-shift without rejection; its departure from
// uniform, below n/2^64, no bootstrap can see).
//
// References:
//   - D. Lemire, "Fast random integer generation in an interval", ACM Trans.
//     Model. Comput. Simul. 29, 3 (2019).
func meanComparison(xs [][]float64, confidence float64, rng *rand.Rand) comparison {
	k, n := len(xs), len(xs[0])
	value := make([]float64, k)
	interval := make([][2]float64, k)
	for r, x := range xs {
		value[r] = stats.Mean(x)
		interval[r] = [2]float64{value[r], value[r]}
		if n >= 2 {
			// With lost shots (contrast exactly 0) the mixture bounds of
			// stats.ZeroMixture; without, the bootstrap-t, same draws.
			lo, hi := stats.MeanZeroMixture(x, 1, false, DecisionResamples, rng).Interval(confidence)
			interval[r] = [2]float64{max(lo, 0), min(hi, 1)} // contrast lies in [0, 1]
		}
	}
	// se[a][b] is the standard error of the mean paired difference.
	se := make([][]float64, k)
	for a := range se {
		se[a] = make([]float64, k)
		for b := range a {
			d := make([]float64, n)
			for i := range d {
				d[i] = xs[a][i] - xs[b][i]
			}
			if n >= 2 {
				se[a][b] = stats.StdDev(d) / math.Sqrt(float64(n))
			}
			se[b][a] = se[a][b]
		}
	}
	var q float64
	if k > 1 && n >= 2 {
		tmax := make([]float64, DecisionResamples)
		idx := make([]int, n)
		m := make([]float64, k)
		for bi := range tmax {
			for i := range idx {
				w, _ := bits.Mul64(rng.Uint64(), uint64(n))
				idx[i] = int(w)
			}
			for r, x := range xs {
				var s float64
				for _, i := range idx {
					s += x[i]
				}
				m[r] = s / float64(n)
			}
			for a := range k {
				for b := range a {
					if se[a][b] > 0 {
						t := math.Abs((m[a]-m[b])-(value[a]-value[b])) / se[a][b]
						tmax[bi] = max(tmax[bi], t)
					}
				}
			}
		}
		slices.Sort(tmax)
		q = stats.QuantileSorted(tmax, confidence)
	}
	return comparison{value: value, interval: interval, diff: func(a, b int) PartialInterval {
		d := value[a] - value[b]
		return PartialInterval{Interval: Interval{Value: d, Lo: d - q*se[a][b], Hi: d + q*se[a][b]}}
	}}
}
