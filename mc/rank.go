package mc

import (
	"fmt"
	"math"
	"math/bits"
	"math/rand/v2"
	"slices"
	"strings"

	"rampart/stats"
)

// Ranking metrics: the statistic of an ensemble by which Rank orders ramps.
const (
	MetricP05        = "p05"         // 5th-percentile contrast, higher is better (the default)
	MetricMean       = "mean"        // mean contrast, higher is better
	MetricYield      = "yield"       // fraction of realisations inside a Spec, higher is better
	MetricBiasSpread = "bias-spread" // 95th percentile of |bias| in rad, lower is better
)

// Metrics lists the accepted metrics of Rank, the default first.
var Metrics = []string{MetricP05, MetricMean, MetricYield, MetricBiasSpread}

// Ranking is the order of several ramps by one metric, best first, from
// ensembles run on common random numbers.
type Ranking struct {
	Metric       string  `json:"metric"`
	HigherBetter bool    `json:"higher_is_better"`
	Confidence   float64 `json:"confidence"`
	Samples      int     `json:"samples"`
	Ranking      []Place `json:"ranking"`
}

// Place is one ramp's place in a Ranking.
type Place struct {
	Place int    `json:"place"` // 1 for the best
	Name  string `json:"name"`
	// Value is the ramp's metric and [Lo, Hi] its two-sided interval at the
	// ranking's confidence: bootstrap percentile, or Clopper-Pearson for a
	// yield.
	Value float64 `json:"value"`
	Lo    float64 `json:"lo"`
	Hi    float64 `json:"hi"`
	// DiffToBest is this ramp's metric less the best ramp's, with a paired
	// bootstrap interval (zero for the best itself). It is negative for a
	// worse ramp when higher is better, positive when lower is better.
	DiffToBest Interval `json:"diff_to_best"`
	// DiffToNext is this ramp's metric less that of the ramp in the next
	// place, with a paired bootstrap interval; nil for the last place.
	DiffToNext *Interval `json:"diff_to_next,omitempty"`
	// Resolved reports whether the place is statistically settled: the
	// paired-difference intervals to the places above and below (where
	// there are any) exclude zero.
	Resolved bool `json:"resolved"`
}

// Rank orders ramps by a metric of their ensembles. recs[r] holds the
// records of the ramp names[r]; the ensembles must have been run on common
// random numbers (the same seed, sampler, samples and noise grid) so that
// records of equal Index saw the same noise draws, and they must hold the
// same realisations. metric is one of Metrics ("" for MetricP05); spec is
// used by MetricYield only. seed seeds the bootstrap.
//
// Each ramp's value gets a two-sided interval at the confidence (bootstrap
// percentile with DecisionResamples resamples, Clopper-Pearson for a
// yield), and each pair of neighbouring places and each ramp with the best
// a paired bootstrap interval of the difference d = m_a - m_b, resampling
// realisation indices jointly,
//
//	d*_b = m(a[idx_b]) - m(b[idx_b]),  [Lo, Hi] = percentile interval of the d*_b,
//
// which keeps the correlation that common random numbers create. Every
// interval is drawn from a fresh Substream(seed, 0, "rank"), so all of them
// use the same resamples and the ranking does not depend on the order of the
// ramps given. A place is resolved when the intervals of its differences to
// both neighbours exclude zero. Each comparison is made at the confidence on
// its own, with no correction for the number of comparisons.
//
// Rank returns an error for input a caller can get wrong: unequal numbers of
// names and record sets, empty or repeated names, an unknown metric, a yield
// without an active spec, a confidence outside (0, 1), record sets of
// different realisations, and NaN outputs.
//
// References:
//   - B. Efron and R. J. Tibshirani, An Introduction to the Bootstrap
//     (Chapman & Hall, 1993), ch. 13 (percentile intervals).
//   - C. J. Clopper and E. S. Pearson, Biometrika 26, 404 (1934).
func Rank(names []string, recs [][]Record, metric string, spec Spec, confidence float64, seed uint64) (Ranking, error) {
	if metric == "" {
		metric = MetricP05
	}
	if !slices.Contains(Metrics, metric) {
		return Ranking{}, fmt.Errorf("unknown ranking metric %q: want one of %s", metric, strings.Join(Metrics, ", "))
	}
	if metric == MetricYield && !spec.Active() {
		return Ranking{}, fmt.Errorf("ranking by yield needs a spec with a contrast or bias limit")
	}
	if !(confidence > 0 && confidence < 1) {
		return Ranking{}, fmt.Errorf("confidence %g is outside (0, 1)", confidence)
	}
	if len(names) != len(recs) || len(names) == 0 {
		return Ranking{}, fmt.Errorf("%d ramp names for %d record sets: want one name per set, at least one", len(names), len(recs))
	}
	sorted, err := pairRecords(names, recs)
	if err != nil {
		return Ranking{}, err
	}
	n := len(sorted[0])
	stat := make([]*statistic, len(names))
	inside := make([]int, len(names))
	for r, rs := range sorted {
		x := make([]float64, n)
		for i, rec := range rs {
			switch metric {
			case MetricP05, MetricMean:
				x[i] = rec.Contrast
			case MetricBiasSpread:
				x[i] = math.Abs(rec.BiasRad)
			case MetricYield:
				if spec.Inside(rec) {
					x[i] = 1
					inside[r]++
				}
			}
		}
		switch metric {
		case MetricP05:
			stat[r] = quantileStatistic(x, 0.05)
		case MetricBiasSpread:
			stat[r] = quantileStatistic(x, 0.95)
		default:
			stat[r] = meanStatistic(x)
		}
	}
	higher := metric != MetricBiasSpread
	rng := func() *rand.Rand { return Substream(seed, 0, "rank") }

	places := make([]Place, len(names))
	for r, s := range stat {
		p := Place{Name: names[r], Value: s.value()}
		if metric == MetricYield {
			e := stats.ClopperPearson(inside[r], n, confidence)
			p.Lo, p.Hi = e.Lo, e.Hi
		} else {
			p.Lo, p.Hi = percentileOf(n, rng(), confidence, s.at)
		}
		places[r] = p
	}
	order := make([]int, len(names))
	for i := range order {
		order[i] = i
	}
	slices.SortStableFunc(order, func(a, b int) int {
		va, vb := places[a].Value, places[b].Value
		if !higher {
			va, vb = vb, va
		}
		switch {
		case va > vb:
			return -1
		case va < vb:
			return 1
		}
		return strings.Compare(names[a], names[b])
	})
	diff := func(a, b int) Interval {
		sa, sb := stat[a], stat[b]
		lo, hi := percentileOf(n, rng(), confidence, func(idx []int) float64 { return sa.at(idx) - sb.at(idx) })
		return Interval{Value: sa.value() - sb.value(), Lo: lo, Hi: hi}
	}
	excludesZero := func(d Interval) bool { return d.Lo > 0 || d.Hi < 0 }
	out := Ranking{Metric: metric, HigherBetter: higher, Confidence: confidence, Samples: n, Ranking: make([]Place, len(order))}
	best := order[0]
	for k, r := range order {
		p := places[r]
		p.Place = k + 1
		if k > 0 {
			p.DiffToBest = diff(r, best)
		}
		if k+1 < len(order) {
			d := diff(r, order[k+1])
			p.DiffToNext = &d
		}
		out.Ranking[k] = p
	}
	for k := range out.Ranking {
		p := &out.Ranking[k]
		p.Resolved = (k == 0 || excludesZero(*out.Ranking[k-1].DiffToNext)) &&
			(p.DiffToNext == nil || excludesZero(*p.DiffToNext))
	}
	return out, nil
}

// percentileOf returns the bootstrap percentile interval of a statistic of n
// paired observations, with DecisionResamples resamples drawn from rng. An
// index is the high word of the 128-bit product of a random word and n
// (Lemire's multiply-shift without the rejection step): its distribution
// departs from uniform by less than n / 2^64, far below anything a bootstrap
// can see, and it is twice as fast as IntN.
//
// References:
//   - D. Lemire, "Fast random integer generation in an interval", ACM Trans.
//     Model. Comput. Simul. 29, 3 (2019).
func percentileOf(n int, rng *rand.Rand, confidence float64, stat func(idx []int) float64) (lo, hi float64) {
	idx := make([]int, n)
	reps := make([]float64, DecisionResamples)
	for b := range reps {
		for k := range idx {
			w, _ := bits.Mul64(rng.Uint64(), uint64(n))
			idx[k] = int(w)
		}
		reps[b] = stat(idx)
	}
	return stats.PercentileInterval(reps, confidence)
}

// pairRecords returns each ramp's records sorted by index, after checking
// that the names are usable and that every ramp holds the same realisations
// with finite outputs.
func pairRecords(names []string, recs [][]Record) ([][]Record, error) {
	seen := map[string]bool{}
	out := make([][]Record, len(recs))
	for r, rs := range recs {
		name := names[r]
		if name == "" {
			return nil, fmt.Errorf("ramp %d has an empty name", r+1)
		}
		if seen[name] {
			return nil, fmt.Errorf("ramp name %q is given twice", name)
		}
		seen[name] = true
		if len(rs) == 0 {
			return nil, fmt.Errorf("ramp %q has no realisations", name)
		}
		s := slices.Clone(rs)
		slices.SortFunc(s, func(a, b Record) int { return a.Index - b.Index })
		for i, rec := range s {
			if i > 0 && rec.Index == s[i-1].Index {
				return nil, fmt.Errorf("ramp %q has realisation %d twice", name, rec.Index)
			}
			if math.IsNaN(rec.Contrast) || math.IsNaN(rec.BiasRad) {
				return nil, fmt.Errorf("ramp %q realisation %d has a NaN output", name, rec.Index)
			}
		}
		out[r] = s
	}
	for r := 1; r < len(out); r++ {
		a, b := out[0], out[r]
		if len(a) != len(b) {
			return nil, fmt.Errorf("ramp %q has %d realisations and ramp %q %d: ramps are compared on the same realisations", names[0], len(a), names[r], len(b))
		}
		for i := range a {
			if a[i].Index != b[i].Index {
				return nil, fmt.Errorf("ramp %q has realisation %d where ramp %q has %d: ramps are compared on the same realisations", names[r], b[i].Index, names[0], a[i].Index)
			}
		}
	}
	return out, nil
}
