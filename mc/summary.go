package mc

import (
	"math"
	"math/cmplx"
	"math/rand/v2"
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

// Inside reports whether a record meets the spec. A lost shot (Lost)
// meets no active spec: it has no fringe to read.
func (s Spec) Inside(r Record) bool { return s.inside(r.Contrast, r.BiasRad, r.Lost()) }

// inside reports whether a contrast and a bias meet the spec, lost telling
// a shot without a fringe.
func (s Spec) inside(contrast, biasRad float64, lost bool) bool {
	if lost && s.Active() {
		return false
	}
	if s.MinContrast > 0 && !(contrast >= s.MinContrast) {
		return false
	}
	if s.MaxAbsBiasRad > 0 && !(math.Abs(biasRad) <= s.MaxAbsBiasRad) {
		return false
	}
	return true
}

// Lost reports whether the shot has no fringe at all, z = 0 and contrast
// 0 exactly: its atom scattered a photon from the lattice light
// (sim.Scattering; no other perturbation makes z vanish exactly). Its
// phase, hence its bias, is undefined: statistics count it as lost
// contrast and yield, and leave it out of the bias (docs/model.md,
// Perturbations, photon scattering).
func (r Record) Lost() bool { return r.Z == 0 && r.Contrast == 0 }

// lost is Record.Lost for the columns of realisation i.
func (o *Outcomes) lost(i int) bool { return o.ZRe[i] == 0 && o.ZIm[i] == 0 && o.Contrast[i] == 0 }

// Distribution summarises one output over the realisations, with a
// two-sided interval at the summary's confidence on every entry (CI): the
// bootstrap-t for the mean (stats.MeanBootstrapT), the percentile bootstrap for
// the standard deviation, and exact distribution-free order-statistic
// intervals for the quantiles (stats.QuantileInterval). A quantile interval
// that needs more realisations than there are is absent from CI, and
// NoBoundBelow gives the ensemble size that would have it.
type Distribution struct {
	Mean         float64               `json:"mean"`
	Std          float64               `json:"std"`
	P01          float64               `json:"p01"`
	P05          float64               `json:"p05"`
	P50          float64               `json:"p50"`
	P95          float64               `json:"p95"`
	P99          float64               `json:"p99"`
	CI           map[string][2]float64 `json:"ci"`
	NoBoundBelow map[string]int        `json:"no_bound_below,omitempty"`
}

// CircularBias summarises the bias as the angle it is (stats.CircularStats:
// mean direction, mean resultant length, circular standard deviation) and
// counts the inverted shots, whose fringe cannot be read: |bias| > pi/2 (the
// fringe is upside down) or contrast below ContrastFloor. Both are over
// the shots with a fringe; the lost ones (Record.Lost) are in
// Summary.Lost.
type CircularBias struct {
	stats.Circular
	Inverted      int     `json:"inverted_shots"`
	ContrastFloor float64 `json:"contrast_floor"`
}

// UsableContrastFloor is the contrast below which a shot counts as inverted
// in CircularBias: a fringe of a tenth of full contrast is about the least
// a phase is read from in practice (a choice of ours, not a published
// figure).
const UsableContrastFloor = 0.1

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
	ScaleFactorS float64 `json:"scale_factor_s"`
	// Lost counts the shots without a fringe (Record.Lost: the atom
	// scattered a photon). They are in Contrast (as 0), in the fringe
	// (as z = 0) and outside every yield spec, but not in the bias
	// distributions, whose Samples-less-Lost shots are those with a phase.
	Lost        int          `json:"lost_shots,omitempty"`
	Contrast    Distribution `json:"contrast"`
	BiasRad     Distribution `json:"bias_rad"`
	AbsBiasRad  Distribution `json:"abs_bias_rad"`
	BiasDegPerH Distribution `json:"bias_deg_per_h"`
	// FringeContrast is |mean z|, the contrast of a fringe built from many
	// shots; FringeBiasRad its phase less the Sagnac phase.
	FringeContrast Interval     `json:"fringe_contrast"`
	FringeBiasRad  Interval     `json:"fringe_bias_rad"`
	BiasCircular   CircularBias `json:"bias_circular"`
	Yield          *YieldResult `json:"yield,omitempty"`
	// ScaleFactorErrorPPM and AbsScaleFactorErrorPPM are the distributions
	// of K_shot / K - 1 and of its magnitude, in ppm, when every record
	// has it (Ensemble.ScaleFactor); nil otherwise.
	ScaleFactorErrorPPM    *Distribution `json:"scale_factor_error_ppm,omitempty"`
	AbsScaleFactorErrorPPM *Distribution `json:"abs_scale_factor_error_ppm,omitempty"`
	// Numerics is the estimated numerical error of the nominal shot
	// (sim.EstimateError), from the run's manifest (Manifest.Summarise).
	Numerics *sim.ErrorEstimate `json:"numerics_error,omitempty"`
	// IntervalMethod is AsymptoticMethod when the summary has at least
	// AsymptoticMin realisations, and empty (the bootstraps) below: each
	// distribution of at least AsymptoticMin values, and the fringe, then
	// has closed-form intervals for its mean and standard deviation.
	IntervalMethod string `json:"interval_method,omitempty"`
	// Measured is the signal a read-out measures, with projection and
	// detection noise (Readout.Measure); nil without a read-out. The
	// entries above are the true, simulated signal.
	Measured *Measured `json:"measured,omitempty"`
}

// BootstrapResamples is the number of bootstrap resamples of a summary.
const BootstrapResamples = 500

// AsymptoticMin is the number of values from which a summary replaces its
// resampling intervals (the mean's bootstrap-t, the standard deviation's
// and the averaged fringe's percentile bootstraps, 500 passes over the
// column each) by closed forms of the same order of accuracy, one pass
// each: stats.MeanSkewT, stats.StdDelta and stats.ComplexMeanDelta
// (docs/model.md, Statistics). At 20000 values the terms these drop are
// small against the bootstrap's own resampling noise: the mean's
// O(1/n) one-sided error is below 1e-4 for skewness and kurtosis of
// order one, and the Monte Carlo spread of a 500-resample percentile end
// (about 5 % of the half-width) is larger than the closed forms' n^(-1/2)
// skewness term (gamma/sqrt(n), under 1 % for |gamma| < 1); the coverage
// simulations in mc/summary_asymptotic_test.go check both sides of it.
const AsymptoticMin = 20000

// AsymptoticMethod is Summary.IntervalMethod when the summary has at least
// AsymptoticMin realisations.
const AsymptoticMethod = "asymptotic: mean skewness-corrected t, std delta method, fringe delta method (n >= 20000)"

// Summarise computes the summary of records (in any order) of an ensemble
// with the given seed (SummariseOutcomes of their outputs).
func Summarise(recs []Record, seed uint64, sagnacRad, scaleFactorS, confidence float64, spec Spec) Summary {
	return SummariseOutcomes(OutcomesOf(recs), seed, sagnacRad, scaleFactorS, confidence, spec)
}

// SummariseOutcomes computes the summary of the outputs o of an ensemble
// with the given seed. sagnacRad and scaleFactorS are those of the nominal
// sequence. The bootstrap draws from Substream(seed, 0, "summary"), so a
// summary is reproducible from its records. The quantile intervals are
// computed on each output sorted once; they need no random draws.
//
// It works on the columns alone: besides them it holds a scratch column
// (a sorted copy, then each bootstrap resample) and the bias, |bias| and
// contrast of the shots with a fringe (32 bytes a realisation, allocated
// once), so its memory is bounded by the columns' (see
// Outcomes). Its time is that of the bootstraps: BootstrapResamples draws
// of every realisation for each interval that is not an order statistic
// or Clopper-Pearson (seven of them), below AsymptoticMin realisations;
// from there those intervals are closed forms, a pass over the column
// each, and the time is that of sorting the columns for the quantiles
// (Summary.IntervalMethod says so). A new distribution takes its column
// from Outcomes and the shared scratch column, after the others, so that
// their draws stay as they are.
func SummariseOutcomes(o *Outcomes, seed uint64, sagnacRad, scaleFactorS, confidence float64, spec Spec) Summary {
	n := o.Len()
	if n == 0 {
		panic("mc: Summarise of no records")
	}
	c := o.Contrast
	// Over the shots with a fringe; sized for all of them at once, so that
	// growing them leaves no garbage.
	bias, abs, cFringe := make([]float64, 0, n), make([]float64, 0, n), make([]float64, 0, n)
	lost := 0
	for i := range c {
		if o.lost(i) {
			lost++
			continue
		}
		bias, abs, cFringe = append(bias, o.BiasRad[i]), append(abs, math.Abs(o.BiasRad[i])), append(cFringe, c[i])
	}
	rng := Substream(seed, 0, "summary")
	s := Summary{Samples: n, Confidence: confidence, ScaleFactorS: scaleFactorS, Lost: lost}
	if n >= AsymptoticMin {
		s.IntervalMethod = AsymptoticMethod
	}
	buf := make([]float64, n) // scratch of every distribution
	s.Contrast = distribution(c, buf, rng, confidence, [2]float64{0, 1})
	if (lost > 0 || o.LossPossible) && n >= 2 {
		s.Contrast.CI["mean"] = contrastMeanMixture(cFringe, n, seed, confidence, o.LossPossible)
	}
	s.BiasCircular = CircularBias{ContrastFloor: UsableContrastFloor}
	if len(bias) > 0 {
		// With no fringe at all the bias distributions stay zero: Lost
		// equals Samples.
		s.BiasRad = distribution(bias, buf, rng, confidence, [2]float64{-math.Pi, math.Pi})
		s.AbsBiasRad = distribution(abs, buf, rng, confidence, [2]float64{0, math.Pi})
		s.BiasDegPerH = s.BiasRad.scaled(sim.RadPerSToDegPerH(1 / scaleFactorS))
		s.BiasCircular.Circular = stats.CircularStats(bias)
	}
	for i := range bias {
		if math.Abs(bias[i]) > math.Pi/2 || cFringe[i] < UsableContrastFloor {
			s.BiasCircular.Inverted++
		}
	}
	s.FringeContrast, s.FringeBiasRad = fringeIntervals(o.ZRe, o.ZIm, sagnacRad, rng, confidence)
	if spec.Active() {
		k := 0
		for i := range c {
			if spec.inside(c[i], o.BiasRad[i], o.lost(i)) {
				k++
			}
		}
		e := stats.ClopperPearson(k, n, confidence)
		s.Yield = &YieldResult{Interval: Interval{e.Value, e.Lo, e.Hi}, Inside: k, Spec: spec}
	}
	if sf := o.ScaleFactorPPM; sf != nil && len(sf) == n {
		// Its own stream, so that the other entries do not depend on it.
		rng := Substream(seed, 0, "summary/scale_factor")
		abs := make([]float64, n)
		for i, x := range sf {
			abs[i] = math.Abs(x)
		}
		d := distribution(sf, buf, rng, confidence, [2]float64{-math.MaxFloat64, math.MaxFloat64})
		a := distribution(abs, buf, rng, confidence, [2]float64{0, math.MaxFloat64})
		s.ScaleFactorErrorPPM, s.AbsScaleFactorErrorPPM = &d, &a
	}
	return s
}

// contrastMeanMixture is the interval of the mean contrast with lost
// shots, whose contrast is exactly 0: the mean is (1 - q) m, q the lost
// fraction and m the mean over the shots with a fringe (fringe, of n
// shots), and the bounds are those of stats.ZeroMixture, Clopper-Pearson on
// q and the bootstrap-t on m (BootstrapResamples resamples from its own
// stream Substream(seed, 0, "summary/contrast.mean"), so that the other
// intervals draw as they do without lost shots) or from AsymptoticMin
// realisations the skewness-corrected t (stats.SkewT), each at half the
// tail (docs/model.md, Statistics). The bootstrap-t of all contrasts would
// collapse: a resample without a lost shot has a tiny standard error and a
// huge t*.
func contrastMeanMixture(fringe []float64, n int, seed uint64, confidence float64, possible bool) [2]float64 {
	var z *stats.ZeroMixture
	switch {
	case len(fringe) < 2:
		z = stats.NewZeroMixture(n, n-len(fringe), 0, nil, 1, possible) // Value unused
	case n >= AsymptoticMin:
		z = stats.NewZeroMixture(n, n-len(fringe), stats.Mean(fringe), stats.SkewT{Moments: stats.SampleMoments(fringe)}, 1, possible)
	default:
		z = stats.NewZeroMixture(n, n-len(fringe), stats.Mean(fringe),
			stats.MeanBootstrapT(fringe, BootstrapResamples, Substream(seed, 0, "summary/contrast.mean")), 1, possible)
	}
	lo, hi := z.Interval(confidence)
	return [2]float64{max(lo, 0), min(hi, 1)}
}

// fringeIntervals returns the contrast |mean z| and the bias arg(mean z) -
// sagnacRad of the averaged fringe, with percentile-bootstrap intervals, or
// from AsymptoticMin realisations on the delta method
// (stats.ComplexMeanDelta), which draws nothing from rng.
func fringeIntervals(re, im []float64, sagnacRad float64, rng *rand.Rand, confidence float64) (contrast, bias Interval) {
	n := len(re)
	if n >= AsymptoticMin {
		return fringeDelta(re, im, sagnacRad, confidence)
	}
	return fringeBootstrap(re, im, sagnacRad, rng, confidence)
}

// fringeBootstrap is fringeIntervals by the percentile bootstrap, at any n.
func fringeBootstrap(re, im []float64, sagnacRad float64, rng *rand.Rand, confidence float64) (contrast, bias Interval) {
	n := len(re)
	// fringe averages z over the realisations in order (draw nil) or over
	// n drawn with draw, summing as it draws.
	fringe := func(draw func(int) int) (float64, float64) {
		var m complex128
		for k := range n {
			i := k
			if draw != nil {
				i = draw(n)
			}
			m += complex(re[i], im[i])
		}
		m /= complex(float64(n), 0)
		return cmplx.Abs(m), sim.Wrap(cmplx.Phase(m) - sagnacRad)
	}
	fc, fb := fringe(nil)
	repC := make([]float64, BootstrapResamples)
	repB := make([]float64, BootstrapResamples)
	for b := range BootstrapResamples {
		repC[b], repB[b] = fringe(rng.IntN)
	}
	lo, hi := stats.PercentileInterval(repC, confidence)
	contrast = Interval{fc, lo, hi}
	lo, hi = stats.PercentileInterval(repB, confidence)
	bias = Interval{fb, lo, hi}
	return contrast, bias
}

// fringeDelta is fringeIntervals by the delta method: the values are
// summed in order as the bootstrap's are, the intervals' half-widths are
// those of stats.ComplexMeanDelta.
func fringeDelta(re, im []float64, sagnacRad, confidence float64) (contrast, bias Interval) {
	var m complex128
	for i := range re {
		m += complex(re[i], im[i])
	}
	m /= complex(float64(len(re)), 0)
	mod, arg := stats.ComplexMeanDelta(re, im, confidence)
	fc, fb := cmplx.Abs(m), sim.Wrap(cmplx.Phase(m)-sagnacRad)
	contrast = Interval{fc, fc - (mod.Value - mod.Lo), fc + (mod.Hi - mod.Value)}
	bias = Interval{fb, fb - (arg.Value - arg.Lo), fb + (arg.Hi - arg.Value)}
	return contrast, bias
}

// quantileKeys are the quantiles of a Distribution, by CI key.
var quantileKeys = []struct {
	key string
	p   float64
}{{"p01", 0.01}, {"p05", 0.05}, {"p50", 0.5}, {"p95", 0.95}, {"p99", 0.99}}

// distribution computes the entries of a Distribution and their intervals.
// support is the range of the output, to which the mean's interval is
// clamped where a tied resample made the bootstrap-t infinite (or a
// closed form passes it). From AsymptoticMin values the mean and std
// intervals are closed forms (stats.MeanSkewT, stats.StdDelta) and draw
// nothing from rng. buf, of
// len(x), is scratch: it holds the sorted copy of x for the quantiles, then
// each resample of the standard deviation's bootstrap.
func distribution(x, buf []float64, rng *rand.Rand, confidence float64, support [2]float64) Distribution {
	sorted := buf[:len(x)]
	copy(sorted, x)
	slices.Sort(sorted)
	m, sd := meanStd(x)
	d := Distribution{Mean: m, Std: sd, CI: map[string][2]float64{}}
	for _, q := range quantileKeys {
		v := stats.QuantileSorted(sorted, q.p)
		switch q.key {
		case "p01":
			d.P01 = v
		case "p05":
			d.P05 = v
		case "p50":
			d.P50 = v
		case "p95":
			d.P95 = v
		case "p99":
			d.P99 = v
		}
		lo, hi := stats.QuantileInterval(sorted, q.p, confidence)
		if lo.OK && hi.OK {
			d.CI[q.key] = [2]float64{lo.Value, hi.Value}
			continue
		}
		if d.NoBoundBelow == nil {
			d.NoBoundBelow = map[string]int{}
		}
		d.NoBoundBelow[q.key] = max(lo.MinSamples, hi.MinSamples)
	}
	if len(x) < 2 {
		d.CI["mean"], d.CI["std"] = [2]float64{m, m}, [2]float64{0, 0}
		return d
	}
	if len(x) >= AsymptoticMin {
		// Closed forms, no draws (AsymptoticMin).
		mo := stats.SampleMoments(x)
		lo, hi := stats.MeanSkewT(mo, confidence)
		d.CI["mean"] = [2]float64{max(lo, support[0]), min(hi, support[1])}
		lo, hi = stats.StdDelta(mo, confidence)
		d.CI["std"] = [2]float64{lo, hi}
		return d
	}
	lo, hi := stats.MeanBootstrapT(x, BootstrapResamples, rng).Interval(confidence)
	d.CI["mean"] = [2]float64{max(lo, support[0]), min(hi, support[1])}
	lo, hi = stats.PercentileInterval(stdReplicates(x, buf, rng), confidence)
	d.CI["std"] = [2]float64{lo, hi}
	return d
}

// stdReplicates returns BootstrapResamples percentile-bootstrap replicates
// of the sample standard deviation of x: each draws len(x) indices with
// rng.IntN, in the order stats.BootstrapReplicates draws them (so the
// replicates are the same), gathering the values into buf, which keeps the
// two passes over a resample sequential in memory.
func stdReplicates(x, buf []float64, rng *rand.Rand) []float64 {
	n := len(x)
	res := buf[:n]
	reps := make([]float64, BootstrapResamples)
	for b := range reps {
		for k := range res {
			res[k] = x[rng.IntN(n)]
		}
		var s, s2 float64
		for _, v := range res {
			s += v
		}
		mean := s / float64(n)
		for _, v := range res {
			s2 += (v - mean) * (v - mean)
		}
		reps[b] = math.Sqrt(s2 / float64(n-1))
	}
	return reps
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
	e := Distribution{Mean: k * d.Mean, Std: k * d.Std, P01: k * d.P01, P05: k * d.P05, P50: k * d.P50, P95: k * d.P95, P99: k * d.P99,
		CI: map[string][2]float64{}, NoBoundBelow: d.NoBoundBelow}
	for key, v := range d.CI {
		e.CI[key] = [2]float64{k * v[0], k * v[1]}
	}
	return e
}

// ScaleFactorErrors returns the records' scale-factor errors in ppm, in
// their order, and whether every record has one.
func ScaleFactorErrors(recs []Record) ([]float64, bool) {
	x := make([]float64, len(recs))
	for i, r := range recs {
		if !r.HasScaleFactor {
			return nil, false
		}
		x[i] = r.ScaleFactorErrorPPM
	}
	return x, len(recs) > 0
}
