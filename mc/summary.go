package mc

import (
	"math"
	"math/cmplx"
	"slices"

	"rampart/sim"
	"rampart/stats"
)

// Spec is a yield specification: a realisation is inside when its contrast
// is at least MinContrast and its |bias| at most MaxAbsBiasRad. A zero
// limit is not applied.
type Spec struct {
	MinContrast   float64 `json:"contrast_min,omitempty"`
	MaxAbsBiasRad float64 `json:"bias_max_rad,omitempty"`
}

// Active reports whether the spec has a limit.
func (s Spec) Active() bool { return s.MinContrast > 0 || s.MaxAbsBiasRad > 0 }

// Inside reports whether a record meets the spec.
func (s Spec) Inside(r Record) bool {
	if s.MinContrast > 0 && !(r.Contrast >= s.MinContrast) {
		return false
	}
	if s.MaxAbsBiasRad > 0 && !(math.Abs(r.BiasRad) <= s.MaxAbsBiasRad) {
		return false
	}
	return true
}

// Distribution summarises one output over the realisations, with bootstrap
// percentile intervals (CI, at the summary's confidence) on every entry.
type Distribution struct {
	Mean float64               `json:"mean"`
	Std  float64               `json:"std"`
	P01  float64               `json:"p01"`
	P05  float64               `json:"p05"`
	P50  float64               `json:"p50"`
	P95  float64               `json:"p95"`
	P99  float64               `json:"p99"`
	CI   map[string][2]float64 `json:"ci"`
}

// Interval is an estimate with its confidence interval, as JSON.
type Interval struct {
	Value float64 `json:"value"`
	Lo    float64 `json:"lo"`
	Hi    float64 `json:"hi"`
}

// YieldResult is the fraction of realisations inside a spec with its
// Clopper-Pearson interval.
type YieldResult struct {
	Interval
	Inside int  `json:"inside"`
	Spec   Spec `json:"spec"`
}

// Summary is the statistical summary of an ensemble.
type Summary struct {
	Samples    int     `json:"samples"`
	Confidence float64 `json:"confidence"`
	// ScaleFactorS is the Sagnac scale factor K of the nominal sequence.
	ScaleFactorS float64      `json:"scale_factor_s"`
	Contrast     Distribution `json:"contrast"`
	BiasRad      Distribution `json:"bias_rad"`
	AbsBiasRad   Distribution `json:"abs_bias_rad"`
	BiasDegPerH  Distribution `json:"bias_deg_per_h"`
	// FringeContrast is |mean z|, the contrast of a fringe built from many
	// shots; FringeBiasRad its phase less the Sagnac phase.
	FringeContrast Interval     `json:"fringe_contrast"`
	FringeBiasRad  Interval     `json:"fringe_bias_rad"`
	Yield          *YieldResult `json:"yield,omitempty"`
}

// BootstrapResamples is the number of bootstrap resamples of a summary.
const BootstrapResamples = 500

// Summarise computes the summary of records (in any order) of an ensemble
// with the given seed. sagnacRad and scaleFactorS are those of the nominal
// sequence. The bootstrap draws from Substream(seed, 0, "summary"), so a
// summary is reproducible from its records.
func Summarise(recs []Record, seed uint64, sagnacRad, scaleFactorS, confidence float64, spec Spec) Summary {
	n := len(recs)
	if n == 0 {
		panic("mc: Summarise of no records")
	}
	sorted := slices.Clone(recs)
	slices.SortFunc(sorted, func(a, b Record) int { return a.Index - b.Index })
	c := make([]float64, n)
	bias := make([]float64, n)
	abs := make([]float64, n)
	z := make([]complex128, n)
	for i, r := range sorted {
		c[i], bias[i], abs[i], z[i] = r.Contrast, r.BiasRad, math.Abs(r.BiasRad), r.Z
	}
	rng := Substream(seed, 0, "summary")
	s := Summary{Samples: n, Confidence: confidence, ScaleFactorS: scaleFactorS}
	s.Contrast = distribution(c, rng, confidence)
	s.BiasRad = distribution(bias, rng, confidence)
	s.AbsBiasRad = distribution(abs, rng, confidence)
	s.BiasDegPerH = s.BiasRad.scaled(sim.RadPerSToDegPerH(1 / scaleFactorS))

	fringe := func(idx []int) (float64, float64) {
		var m complex128
		for _, i := range idx {
			m += z[i]
		}
		m /= complex(float64(len(idx)), 0)
		return cmplx.Abs(m), sim.Wrap(cmplx.Phase(m) - sagnacRad)
	}
	all := make([]int, n)
	for i := range all {
		all[i] = i
	}
	fc, fb := fringe(all)
	repC := make([]float64, BootstrapResamples)
	repB := make([]float64, BootstrapResamples)
	idx := make([]int, n)
	for b := range BootstrapResamples {
		for i := range idx {
			idx[i] = rng.IntN(n)
		}
		repC[b], repB[b] = fringe(idx)
	}
	lo, hi := stats.PercentileInterval(repC, confidence)
	s.FringeContrast = Interval{fc, lo, hi}
	lo, hi = stats.PercentileInterval(repB, confidence)
	s.FringeBiasRad = Interval{fb, lo, hi}

	if spec.Active() {
		k := 0
		for _, r := range sorted {
			if spec.Inside(r) {
				k++
			}
		}
		e := stats.ClopperPearson(k, n, confidence)
		s.Yield = &YieldResult{Interval: Interval{e.Value, e.Lo, e.Hi}, Inside: k, Spec: spec}
	}
	return s
}

var distributionKeys = []string{"mean", "std", "p01", "p05", "p50", "p95", "p99"}

// distribution computes the entries of a Distribution and their bootstrap
// intervals; one resample serves every entry.
func distribution(x []float64, rng interface{ IntN(int) int }, confidence float64) Distribution {
	entries := func(v []float64) []float64 {
		slices.Sort(v)
		m, sd := meanStd(v)
		return []float64{m, sd,
			stats.QuantileSorted(v, 0.01), stats.QuantileSorted(v, 0.05), stats.QuantileSorted(v, 0.5),
			stats.QuantileSorted(v, 0.95), stats.QuantileSorted(v, 0.99)}
	}
	v := entries(slices.Clone(x))
	d := Distribution{Mean: v[0], Std: v[1], P01: v[2], P05: v[3], P50: v[4], P95: v[5], P99: v[6], CI: map[string][2]float64{}}
	reps := make([][]float64, len(distributionKeys))
	buf := make([]float64, len(x))
	for range BootstrapResamples {
		for i := range buf {
			buf[i] = x[rng.IntN(len(x))]
		}
		for k, s := range entries(buf) {
			reps[k] = append(reps[k], s)
		}
	}
	for k, key := range distributionKeys {
		lo, hi := stats.PercentileInterval(reps[k], confidence)
		d.CI[key] = [2]float64{lo, hi}
	}
	return d
}

// meanStd returns the mean and the sample standard deviation (zero for a
// single value).
func meanStd(x []float64) (float64, float64) {
	m := stats.Mean(x)
	if len(x) < 2 {
		return m, 0
	}
	return m, stats.StdDev(x)
}

// scaled returns the distribution of k x for k > 0.
func (d Distribution) scaled(k float64) Distribution {
	e := Distribution{Mean: k * d.Mean, Std: k * d.Std, P01: k * d.P01, P05: k * d.P05, P50: k * d.P50, P95: k * d.P95, P99: k * d.P99, CI: map[string][2]float64{}}
	for key, v := range d.CI {
		e.CI[key] = [2]float64{k * v[0], k * v[1]}
	}
	return e
}
