package mc

import (
	"encoding/json"
	"fmt"
	"math"
	"slices"
	"strings"

	"rampart/internal/plural"
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
	// Value is the ramp's metric and [Lo, Hi] its two-sided interval: for
	// a quantile or a yield the exact interval at the simultaneous
	// confidence 1 - (1 - c)/k of k ramps, on which the places are decided;
	// for a mean the bootstrap-t interval at c (with lost shots that of
	// stats.ZeroMixture).
	Value float64 `json:"value"`
	Lo    float64 `json:"lo"`
	Hi    float64 `json:"hi"`
	// NoLo and NoHi mark an end of [Lo, Hi] that does not exist: no order
	// statistic bounds the quantile at the simultaneous confidence from so
	// few realisations, and the end of the metric's range (0 or 1, 0 or pi
	// rad) stands in, a bound that always holds and says nothing (the JSON
	// writes null). NoBoundBelow is then the smallest ensemble with both
	// ends.
	NoLo         bool `json:"-"`
	NoHi         bool `json:"-"`
	NoBoundBelow int  `json:"no_bound_below,omitempty"`
	// DiffToBest is this ramp's metric less the best ramp's, with its
	// simultaneous interval (zero for the best itself). It is negative for
	// a worse ramp when higher is better, positive when lower is better.
	DiffToBest PartialInterval `json:"diff_to_best"`
	// DiffToNext is this ramp's metric less that of the ramp in the next
	// place, with its simultaneous interval; nil for the last place.
	DiffToNext *PartialInterval `json:"diff_to_next,omitempty"`
	// Resolved reports whether the place is settled: the simultaneous
	// intervals of the differences to every other ramp exclude zero, so
	// no ramp placed above could be below it nor any placed below above it.
	Resolved bool `json:"resolved"`
}

// MarshalJSON writes a missing end of the place's interval as null.
func (p Place) MarshalJSON() ([]byte, error) {
	type plain Place
	return json.Marshal(struct {
		plain
		Lo *float64 `json:"lo"`
		Hi *float64 `json:"hi"`
	}{plain(p), end(p.Lo, p.NoLo), end(p.Hi, p.NoHi)})
}

// PartialInterval is an Interval an end of which may not exist (NoLo,
// NoHi): an end made from a quantile bound that no order statistic gives
// at this ensemble size, which holds the end of the statistic's range in
// its stead; NoBoundBelow is then the smallest ensemble with both ends.
// The JSON writes a missing end as null.
type PartialInterval struct {
	Interval
	NoLo         bool `json:"-"`
	NoHi         bool `json:"-"`
	NoBoundBelow int  `json:"no_bound_below,omitempty"`
}

// MarshalJSON writes a missing end as null.
func (p PartialInterval) MarshalJSON() ([]byte, error) {
	return json.Marshal(struct {
		Value        float64  `json:"value"`
		Lo           *float64 `json:"lo"`
		Hi           *float64 `json:"hi"`
		NoBoundBelow int      `json:"no_bound_below,omitempty"`
	}{p.Value, end(p.Lo, p.NoLo), end(p.Hi, p.NoHi), p.NoBoundBelow})
}

// end returns a pointer to v, or nil for an end that does not exist.
func end(v float64, none bool) *float64 {
	if none {
		return nil
	}
	return &v
}

// Rank orders ramps by a metric of their ensembles. recs[r] holds the
// records of the ramp names[r]; the ensembles must have been run on common
// random numbers (the same seed, sampler, samples and noise grid) so that
// records of equal Index saw the same noise draws, and they must hold the
// same realisations. metric is one of Metrics ("" for MetricP05); spec is
// used by MetricYield only. seed seeds the bootstrap.
//
// Every statement of a ranking holds simultaneously at the confidence c:
// with probability at least c (asymptotically, for the mean) no settled
// place is wrong, however many ramps are compared and whichever are equal.
//
//   - Quantiles (p05, bias-spread) and yields: each of the k ramps gets the
//     exact two-sided interval at 1 - (1 - c)/k (order statistics,
//     stats.QuantileInterval; Clopper-Pearson for a yield), so that all k
//     cover together with probability at least c (Bonferroni), whatever
//     the dependence between ramps. Two ramps are separated when their
//     intervals do not overlap; the interval of a difference a - b is
//     [Lo_a - Hi_b, Hi_a - Lo_b]. This holds its level exactly for equal
//     ramps, which the paired percentile bootstrap of a quantile
//     difference did not (11 % false separations at n = 100); the price is
//     that the common random numbers do not narrow a quantile comparison.
//     Where no order statistic bounds a quantile, the interval runs to the
//     end of the metric's range (0 or 1 for contrast, 0 or pi rad).
//
//   - Means: a max-type paired bootstrap over all pairs (Romano and Wolf
//     2005, single step). With d_ab the difference of the means, s_ab the
//     standard error of the paired differences and B = DecisionResamples
//     resamples of the realisations drawn from Substream(seed, 0, "rank"),
//
//     T*_b = max_{a<b} |d*_ab - d_ab| / s_ab,  q = the c-quantile of T*,
//
//     and the simultaneous interval of d_ab is d_ab +- q s_ab (Hsu 1996,
//     ch. 4, for the same construction with a normal model). Each ramp's
//     own interval is its bootstrap-t, or with lost shots (Record.Lost,
//     contrast 0) the mixture bound of stats.ZeroMixture (docs/model.md,
//     Statistics). The differences need no such change: s_ab is the full
//     sample's, not a resample's, so a resample without a lost shot does
//     not inflate T*.
//
// A place is resolved when it is separated from every other ramp.
//
// Rank returns an error for input a caller can get wrong: unequal numbers of
// names and record sets, empty or repeated names, an unknown metric, a yield
// without an active spec, a confidence outside (0, 1), record sets of
// different realisations, and NaN outputs.
//
// References:
//   - J. C. Hsu, Multiple Comparisons: Theory and Methods (Chapman & Hall,
//     1996), ch. 4.
//   - J. P. Romano and M. Wolf, "Stepwise multiple testing as formalized
//     data snooping", Econometrica 73, 1237 (2005).
//   - G. J. Hahn, W. Q. Meeker and L. A. Escobar, Statistical Intervals, 2nd
//     ed. (Wiley, 2017), ch. 5.
//   - C. J. Clopper and E. S. Pearson, Biometrika 26, 404 (1934).
//   - P. Hall, Ann. Stat. 16, 927 (1988) (bootstrap-t).
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
	n, k := len(sorted[0]), len(names)
	xs := make([][]float64, k)
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
				}
			}
		}
		xs[r] = x
	}
	if metric == MetricBiasSpread {
		// A lost shot (its atom scattered) has no bias: the |bias| spread
		// is over the realisations with a fringe in every ramp, so that
		// the ramps stay paired (docs/model.md, Perturbations).
		if xs = withFringe(sorted, xs); len(xs[0]) == 0 {
			return Ranking{}, fmt.Errorf("no realisation has a fringe in every ramp (every atom scattered a photon in some ramp): the bias spread is undefined; rank by contrast or yield")
		}
	}
	higher := metric != MetricBiasSpread
	var cmp comparison
	switch metric {
	case MetricMean:
		cmp = meanComparison(xs, confidence, Substream(seed, 0, "rank"))
	case MetricYield:
		cmp = yieldComparison(xs, confidence)
	case MetricP05:
		cmp = quantileComparison(xs, 0.05, confidence, [2]float64{0, 1})
	case MetricBiasSpread:
		cmp = quantileComparison(xs, 0.95, confidence, [2]float64{0, math.Pi})
	}

	order := make([]int, k)
	for i := range order {
		order[i] = i
	}
	slices.SortStableFunc(order, func(a, b int) int {
		va, vb := cmp.value[a], cmp.value[b]
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
	excludesZero := func(d PartialInterval) bool { return d.Lo > 0 || d.Hi < 0 }
	out := Ranking{Metric: metric, HigherBetter: higher, Confidence: confidence, Samples: n, Ranking: make([]Place, k)}
	best := order[0]
	for pl, r := range order {
		p := Place{Place: pl + 1, Name: names[r], Value: cmp.value[r], Lo: cmp.interval[r][0], Hi: cmp.interval[r][1], Resolved: true}
		if cmp.none != nil {
			p.NoLo, p.NoHi = cmp.none[r][0], cmp.none[r][1]
			if p.NoLo || p.NoHi {
				p.NoBoundBelow = cmp.need[r]
			}
		}
		if pl > 0 {
			p.DiffToBest = cmp.diff(r, best)
		}
		if pl+1 < k {
			d := cmp.diff(r, order[pl+1])
			p.DiffToNext = &d
		}
		for other := range k {
			if other != r && !excludesZero(cmp.diff(r, other)) {
				p.Resolved = false
			}
		}
		out.Ranking[pl] = p
	}
	return out, nil
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
			return nil, fmt.Errorf("ramp %q has %s and ramp %q %d: ramps are compared on the same realisations", names[0], plural.Count(len(a), "realisation"), names[r], len(b))
		}
		for i := range a {
			if a[i].Index != b[i].Index {
				return nil, fmt.Errorf("ramp %q has realisation %d where ramp %q has %d: ramps are compared on the same realisations", names[r], b[i].Index, names[0], a[i].Index)
			}
		}
	}
	return out, nil
}

// withFringe returns xs without the realisations that are lost
// (Record.Lost) in any ramp.
func withFringe(sorted [][]Record, xs [][]float64) [][]float64 {
	out := make([][]float64, len(xs))
	for i := range sorted[0] {
		lost := false
		for _, rs := range sorted {
			lost = lost || rs[i].Lost()
		}
		if lost {
			continue
		}
		for r := range xs {
			out[r] = append(out[r], xs[r][i])
		}
	}
	return out
}
