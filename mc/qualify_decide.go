package mc

import (
	"fmt"
	"math"
	"slices"

	"rampart/sim"
	"rampart/stats"
)

// Qualify checks the records of an ensemble against the requirements.
// scaleFactorS is the Sagnac scale factor K of the nominal sequence, which
// turns a bias b in rad into the rotation-rate error b / K (needed only for
// AbsBiasP95MaxDegPerH); seed seeds the bootstrap of the mean.
//
// Level. With c the requirements' confidence and k their look, every test
// is made at alpha_k = stats.LookAlpha(1 - c, k) = (1 - c) 6/(pi^2 k^2): a
// sequence of looks at one ensemble as it is topped up wrongly passes (or
// wrongly fails) with probability at most sum_k alpha_k = 1 - c.
//
// Tests. Each criterion has two one-sided tests against its limit: "pass"
// against the limit being missed and "fail" against it being met, with
// p-values PPass and PFail and the one-sided bounds Lo and Hi at 1 - alpha_k
// that they are dual to:
//   - quantiles (contrast p05, |bias| p95, |scale-factor error| p95): exact distribution-free
//     order-statistic bounds and binomial tests (stats.QuantileAtLeast,
//     stats.QuantileAtMost; Hahn & Meeker 2017 ch. 5). If no order
//     statistic bounds the quantile at this n (below 69 realisations for
//     the 5th percentile at look 1 and 95 %), the criterion cannot pass and
//     NoBoundBelow gives the size that would bound it.
//   - the mean contrast: the bootstrap-t (stats.MeanBootstrapT, Hall 1988),
//     whose one-sided error is O(1/n), with DecisionResamples resamples
//     drawn from Substream(seed, 0, "qualify/contrast.mean"). With lost
//     shots (Record.Lost, contrast exactly 0) the contrast is a mixture and
//     the bound is stats.ZeroMixture's: Clopper-Pearson on the lost
//     fraction and the bootstrap-t on the shots with a fringe, each at
//     alpha_k/2, multiplied (docs/model.md, Statistics); a resample without
//     a lost shot would otherwise make t* huge and the bound collapse.
//   - the yield: exact binomial (Clopper-Pearson) tests.
//
// Verdicts. A criterion passes when PPass <= alpha_k. The overall verdict
// passes only when every criterion passes, an intersection-union test whose
// false-pass rate is at most alpha_k. The fail side is corrected for the
// number of criteria with Holm's step-down procedure (stats.Holm) on the
// PFail at alpha_k, so that an overall fail, and each criterion named as
// failing, holds at the look's level. Anything else is undecided; Extra
// estimates the realisations that would decide it at the next look's level
// alpha_(k+1), so that following the advice stays inside the plan.
//
// Records in any order give the same result. Qualify panics if recs is
// empty, the requirements do not Validate, a record's contrast or bias is
// NaN, or a deg/h limit is given with a scale factor that is not positive.
//
// References:
//   - P. Hall, Ann. Stat. 16, 927 (1988) (bootstrap-t).
//   - G. J. Hahn, W. Q. Meeker and L. A. Escobar, Statistical Intervals, 2nd
//     ed. (Wiley, 2017), ch. 5 (order-statistic bounds).
//   - C. J. Clopper and E. S. Pearson, Biometrika 26, 404 (1934).
//   - S. Holm, Scand. J. Stat. 6, 65 (1979).
//   - K. K. G. Lan and D. L. DeMets, Biometrika 70, 659 (1983).
//   - R. L. Berger, "Multiparameter hypothesis testing and acceptance
//     sampling", Technometrics 24, 295 (1982) (intersection-union tests).
func Qualify(recs []Record, req Requirements, scaleFactorS float64, seed uint64) Qualification {
	if len(recs) == 0 {
		panic("mc: Qualify of no records")
	}
	if err := req.Validate(); err != nil {
		panic("mc: Qualify: " + err.Error())
	}
	if req.AbsBiasP95MaxDegPerH > 0 && !(scaleFactorS > 0) {
		panic(fmt.Sprintf("mc: Qualify: a deg/h limit needs a positive scale factor, got %g", scaleFactorS))
	}
	if _, ok := ScaleFactorErrors(recs); req.NeedsScaleFactor() && !ok {
		panic("mc: Qualify: a scale-factor criterion needs records with scale-factor errors (Ensemble.ScaleFactor)")
	}
	ordered := slices.Clone(recs)
	slices.SortFunc(ordered, func(a, b Record) int { return a.Index - b.Index })
	n := len(ordered)
	contrast, abs := make([]float64, n), make([]float64, 0, n)
	for i, r := range ordered {
		if math.IsNaN(r.Contrast) || math.IsNaN(r.BiasRad) {
			panic(fmt.Sprintf("mc: Qualify: realisation %d has a NaN output", r.Index))
		}
		contrast[i] = r.Contrast
		// A lost shot (its atom scattered) has no bias: it counts in the
		// contrast and the yield, and the |bias| quantile is over the
		// shots with a fringe (docs/model.md, Perturbations).
		if !r.Lost() {
			abs = append(abs, math.Abs(r.BiasRad))
		}
	}
	if len(abs) == 0 {
		abs = []float64{math.Pi} // no fringe at all: the worst bias stands in
	}
	alpha := 1 - req.confidence()
	look := req.look()
	t := qualifyTests{n: n, alpha: stats.LookAlpha(alpha, look), next: stats.LookAlpha(alpha, look+1)}
	tb := t // the bias criteria, over the shots with a fringe
	tb.n = len(abs)
	q := Qualification{Samples: n, Confidence: req.confidence(), Look: look, LookConfidence: 1 - t.alpha}

	var sortedContrast, sortedAbs []float64
	if req.ContrastP05Min > 0 {
		sortedContrast = slices.Sorted(slices.Values(contrast))
	}
	if req.AbsBiasP95MaxRad > 0 || req.AbsBiasP95MaxDegPerH > 0 {
		sortedAbs = slices.Sorted(slices.Values(abs))
	}
	if l := req.ContrastMeanMin; l > 0 {
		var b *stats.ZeroMixture
		if n >= 2 {
			b = stats.MeanZeroMixture(contrast, 1, req.LossPossible, DecisionResamples, Substream(seed, 0, "qualify/contrast.mean"))
		}
		q.Criteria = append(q.Criteria, t.mean(Criterion{Name: CriterionContrastMean, AtLeast: true, Limit: l}, contrast, b))
	}
	if l := req.ContrastP05Min; l > 0 {
		q.Criteria = append(q.Criteria, t.quantile(Criterion{Name: CriterionContrastP05, AtLeast: true, Limit: l}, sortedContrast, 0.05, [2]float64{0, 1}, 1))
	}
	if l := req.AbsBiasP95MaxRad; l > 0 {
		q.Criteria = append(q.Criteria, tb.quantile(Criterion{Name: CriterionBiasRad, Unit: "rad", Limit: l}, sortedAbs, 0.95, [2]float64{0, math.Pi}, 1))
	}
	if l := req.AbsBiasP95MaxDegPerH; l > 0 {
		k := sim.RadPerSToDegPerH(1 / scaleFactorS)
		q.Criteria = append(q.Criteria, tb.quantile(Criterion{Name: CriterionBiasDegPerH, Unit: "deg/h", Limit: l}, sortedAbs, 0.95, [2]float64{0, math.Pi}, k))
	}
	if l := req.AbsScaleFactorP95MaxPPM; l > 0 {
		sf, _ := ScaleFactorErrors(ordered)
		for i := range sf {
			sf[i] = math.Abs(sf[i])
		}
		slices.Sort(sf)
		q.Criteria = append(q.Criteria, t.quantile(Criterion{Name: CriterionScaleFactor, Unit: "ppm", Limit: l}, sf, 0.95, [2]float64{0, math.MaxFloat64}, 1))
	}
	if l := req.YieldMin; l > 0 {
		inside := 0
		for _, r := range ordered {
			if req.Yield.Inside(r) {
				inside++
			}
		}
		q.Criteria = append(q.Criteria, t.yield(Criterion{Name: CriterionYield, AtLeast: true, Limit: l}, inside))
	}

	pFail := make([]float64, len(q.Criteria))
	for i, cr := range q.Criteria {
		pFail[i] = cr.PFail
	}
	failed := stats.Holm(pFail, t.alpha)
	q.Verdict = Pass
	for i := range q.Criteria {
		cr := &q.Criteria[i]
		switch {
		case cr.PPass <= t.alpha:
			cr.Verdict = Pass
		case failed[i]:
			cr.Verdict = Fail
		default:
			cr.Verdict = Undecided
		}
		if cr.Verdict != Undecided {
			cr.Extra, cr.OutOfReach = 0, false
		}
		switch {
		case cr.Verdict == Fail:
			q.Verdict = Fail
		case cr.Verdict == Undecided && q.Verdict == Pass:
			q.Verdict = Undecided
		}
	}
	return q
}

// qualifyTests makes the tests of one look: at level alpha, with the
// advice for undecided criteria at the next look's level.
type qualifyTests struct {
	n           int
	alpha, next float64
}

// quantile fills in a criterion on the p-quantile of a sorted sample: its
// value, exact order-statistic bounds (the ends of support, where no bound
// exists) and binomial p-values, all in units of k times the sample's.
func (t qualifyTests) quantile(cr Criterion, sorted []float64, p float64, support [2]float64, k float64) Criterion {
	c := 1 - t.alpha
	limit := cr.Limit / k
	lo, hi := stats.QuantileLower(sorted, p, c), stats.QuantileUpper(sorted, p, c)
	cr.Method = "order statistic"
	cr.Value = k * stats.QuantileSorted(sorted, p)
	cr.Lo, cr.Hi = k*support[0], k*support[1]
	if lo.OK {
		cr.Lo = k * lo.Value
	} else {
		cr.NoLo = lo.MinSamples
	}
	if hi.OK {
		cr.Hi = k * hi.Value
	} else {
		cr.NoHi = hi.MinSamples
	}
	// count is of the realisations on the bad side of the limit for "at
	// least", on the good side for "at most"; the advice treats it as a
	// binomial count whose fraction stays where it is.
	var count, minN int
	var passSide bool
	if cr.AtLeast {
		cr.PPass, cr.PFail = stats.QuantileAtLeast(sorted, p, limit)
		count = countBelow(sorted, limit, false)
		if !lo.OK {
			cr.NoBoundBelow = lo.MinSamples
		}
		passSide = float64(count) < p*float64(t.n)
		minN = stats.MinSamplesLower(1, p, 1-t.next)
	} else {
		cr.PPass, cr.PFail = stats.QuantileAtMost(sorted, p, limit)
		count = countBelow(sorted, limit, true)
		if !hi.OK {
			cr.NoBoundBelow = hi.MinSamples
		}
		passSide = float64(count) > p*float64(t.n)
		minN = stats.MinSamplesUpper(1, p, 1-t.next)
	}
	cr.Margin = marginOf(cr)
	cr.Extra, cr.OutOfReach = extraRealisations(stats.AdditionalTrials(count, t.n, 1-2*t.next, p))
	if passSide && !cr.OutOfReach {
		cr.Extra = max(cr.Extra, minN-t.n)
	}
	return cr
}

// mean fills in the mean-contrast criterion from its bootstrap-t, or with
// lost shots the mixture bounds of stats.ZeroMixture (nil for
// a single realisation, which has no spread and decides nothing: at least
// one more is needed). Bounds are clamped to the
// contrast's range [0, 1], where a tied resample made them infinite.
func (t qualifyTests) mean(cr Criterion, x []float64, b *stats.ZeroMixture) Criterion {
	c := 1 - t.alpha
	cr.Method = "bootstrap-t"
	if b != nil && (b.Zeros > 0 || b.Possible) {
		cr.Method = MethodLostMixture
	}
	clamp := func(v float64) float64 { return min(max(v, 0), 1) }
	if b == nil {
		cr.Value, cr.Lo, cr.Hi, cr.PPass, cr.PFail = x[0], 0, 1, 1, 1
		cr.Margin = marginOf(cr)
		cr.Extra = 1
		return cr
	}
	cr.Value, cr.Lo, cr.Hi = b.Value, clamp(b.Lower(c)), clamp(b.Upper(c))
	cr.PPass, cr.PFail = b.AtLeast(cr.Limit)
	cr.Margin = marginOf(cr)
	next := stats.Estimate{Value: b.Value, Lo: clamp(b.Lower(1 - t.next)), Hi: clamp(b.Upper(1 - t.next))}
	cr.Extra, cr.OutOfReach = extraRealisations(stats.AdditionalSamples(t.n, next, cr.Limit))
	return cr
}

// yield fills in the yield criterion from the number of realisations
// inside the yield spec, with exact binomial tests: pass = P(Bin(n, L) >=
// inside), fail = P(Bin(n, L) <= inside), the duals of the Clopper-Pearson
// bounds.
func (t qualifyTests) yield(cr Criterion, inside int) Criterion {
	c := 1 - t.alpha
	cr.Method = "Clopper-Pearson"
	cr.Value = float64(inside) / float64(t.n)
	cr.Lo, cr.Hi = stats.ClopperPearsonLower(inside, t.n, c), stats.ClopperPearsonUpper(inside, t.n, c)
	cr.PPass = stats.BinomialSurvival(inside, t.n, cr.Limit)
	cr.PFail = stats.BinomialCDF(inside, t.n, cr.Limit)
	cr.Margin = marginOf(cr)
	cr.Extra, cr.OutOfReach = extraRealisations(stats.AdditionalTrials(inside, t.n, 1-2*t.next, cr.Limit))
	return cr
}

// marginOf is how far a criterion's value lies on the good side of its
// limit.
func marginOf(cr Criterion) float64 {
	if cr.AtLeast {
		return cr.Value - cr.Limit
	}
	return cr.Limit - cr.Value
}

// countBelow returns the number of sorted values below x, or at or below x
// if orEqual.
func countBelow(sorted []float64, x float64, orEqual bool) int {
	if orEqual {
		i, found := slices.BinarySearch(sorted, x)
		for found && i < len(sorted) && sorted[i] == x {
			i++
		}
		return i
	}
	i, _ := slices.BinarySearch(sorted, x)
	return i
}

// extraRealisations turns a sample-size estimate into Criterion's Extra and
// OutOfReach.
func extraRealisations(extra int, ok bool) (int, bool) {
	if !ok {
		return 0, true
	}
	return extra, false
}

// MethodLostMixture is the Method of a mean-contrast criterion bounded for
// shots lost to photon scattering (stats.ZeroMixture).
const MethodLostMixture = "lost fraction (Clopper-Pearson) x fringe mean (bootstrap-t)"
