package mc

import (
	"math"
	"slices"

	"rampart/stats"
)

// DecisionResamples is the number of bootstrap resamples behind the
// intervals of a ranking, a qualification and a tolerance search: enough
// that the 5% tails of the replicates, on which their verdicts turn, hold 50
// replicates each.
const DecisionResamples = 1000

// orderStats takes type-7 quantiles of bootstrap resamples of a sample x in
// O(n) time rather than the O(n log n) of sorting each resample. With the
// sample sorted once and rank[i] the position of x[i] in that order, the
// j-th smallest value of a resample x[idx] is sorted[r_(j)], where r_(j) is
// the j-th smallest of the ranks rank[idx[k]]; counting the ranks finds it
// without comparisons. The replicates are those that sorting each resample
// would give, exactly.
type orderStats struct {
	sorted []float64
	rank   []int
	count  []int // scratch, all zero between calls
}

// newOrderStats prepares the order statistics of x, which must be free of
// NaN.
func newOrderStats(x []float64) *orderStats {
	n := len(x)
	perm := make([]int, n)
	for i := range perm {
		perm[i] = i
	}
	slices.SortStableFunc(perm, func(a, b int) int {
		switch {
		case x[a] < x[b]:
			return -1
		case x[a] > x[b]:
			return 1
		}
		return 0
	})
	o := &orderStats{sorted: make([]float64, n), rank: make([]int, n), count: make([]int, n)}
	for r, i := range perm {
		o.sorted[r] = x[i]
		o.rank[i] = r
	}
	return o
}

// quantile returns the type-7 p-quantile of the resample x[idx] (see
// Quantile). It counts the ranks, then walks them from the nearer end to
// the order statistics j = floor(h) and j + 1, h = (m - 1) p.
func (o *orderStats) quantile(idx []int, p float64) float64 {
	m := len(idx)
	for _, i := range idx {
		o.count[o.rank[i]]++
	}
	h := float64(m-1) * p
	j := int(math.Floor(h))
	k := min(j+1, m-1)
	var lo, hi float64
	if p <= 0.5 {
		lo, hi = o.walk(j, k, false)
	} else {
		// From the top, ascending position i is descending position m-1-i.
		hi, lo = o.walk(m-1-k, m-1-j, true)
	}
	clear(o.count)
	return lo + (h-float64(j))*(hi-lo)
}

// walk returns the order statistics at positions a <= b, counted from the
// bottom of the counts or, if down, from the top.
func (o *orderStats) walk(a, b int, down bool) (va, vb float64) {
	seen, found := 0, false
	n := len(o.count)
	for s := range n {
		r := s
		if down {
			r = n - 1 - s
		}
		c := o.count[r]
		if c == 0 {
			continue
		}
		seen += c
		if !found && seen > a {
			va, found = o.sorted[r], true
		}
		if found && seen > b {
			return va, o.sorted[r]
		}
	}
	panic("mc: order statistic beyond the sample")
}

// statistic is one of the statistics a decision rests on, of one output of
// one ensemble, evaluated on the whole sample or on a bootstrap resample.
type statistic struct {
	x  []float64
	os *orderStats // nil for the mean
	p  float64     // the quantile's probability
}

func quantileStatistic(x []float64, p float64) *statistic {
	return &statistic{x: x, os: newOrderStats(x), p: p}
}

func meanStatistic(x []float64) *statistic { return &statistic{x: x} }

// at evaluates the statistic on the resample x[idx].
func (s *statistic) at(idx []int) float64 {
	if s.os != nil {
		return s.os.quantile(idx, s.p)
	}
	var sum float64
	for _, i := range idx {
		sum += s.x[i]
	}
	return sum / float64(len(idx))
}

// value evaluates the statistic on the whole sample.
func (s *statistic) value() float64 {
	if s.os != nil {
		return stats.QuantileSorted(s.os.sorted, s.p)
	}
	return stats.Mean(s.x)
}
