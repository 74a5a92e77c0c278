package mc

import (
	"fmt"
	"math"
	"slices"

	"rampart/sim"
	"rampart/stats"
)

// Requirements is a qualification spec: the criteria an ensemble must meet
// and the confidence with which it must meet them. A zero limit is not
// applied; at least one must be set.
type Requirements struct {
	// Confidence is the one-sided confidence of every verdict, in (0.5, 1).
	// If zero, 0.95.
	Confidence float64 `json:"confidence"`

	ContrastMeanMin      float64 `json:"contrast_mean_min,omitempty"`          // mean contrast at least this
	ContrastP05Min       float64 `json:"contrast_p05_min,omitempty"`           // 5th-percentile contrast at least this
	AbsBiasP95MaxRad     float64 `json:"bias_abs_p95_max_rad,omitempty"`       // 95th percentile of |bias| at most this, rad
	AbsBiasP95MaxDegPerH float64 `json:"bias_abs_p95_max_deg_per_h,omitempty"` // the same as a rotation rate, deg/h

	// YieldMin is the least fraction of realisations inside Yield.
	YieldMin float64 `json:"yield_min,omitempty"`
	Yield    Spec    `json:"yield_spec"`
}

// DefaultConfidence is the confidence of Requirements that give none.
const DefaultConfidence = 0.95

// Criterion names, as the keys of a spec file.
const (
	CriterionContrastMean = "contrast.mean_min"
	CriterionContrastP05  = "contrast.p05_min"
	CriterionBiasRad      = "bias.abs_p95_max_rad"
	CriterionBiasDegPerH  = "bias.abs_p95_max_deg_per_h"
	CriterionYield        = "yield.min"
)

// confidence returns the confidence with its default.
func (q Requirements) confidence() float64 {
	if q.Confidence == 0 {
		return DefaultConfidence
	}
	return q.Confidence
}

// Validate checks that the requirements set at least one criterion, that
// every limit is finite and in range, and that a yield comes with the limits
// that define it.
func (q Requirements) Validate() error {
	if c := q.Confidence; c != 0 && !(c > 0.5 && c < 1) {
		return fmt.Errorf("confidence %g is outside (0.5, 1)", c)
	}
	for _, l := range []struct {
		name  string
		v, hi float64
	}{
		{CriterionContrastMean, q.ContrastMeanMin, 1},
		{CriterionContrastP05, q.ContrastP05Min, 1},
		{CriterionBiasRad, q.AbsBiasP95MaxRad, math.Pi},
		{CriterionBiasDegPerH, q.AbsBiasP95MaxDegPerH, math.Inf(1)},
		{CriterionYield, q.YieldMin, 1},
		{"yield.contrast_min", q.Yield.MinContrast, 1},
		{"yield.bias_max_rad", q.Yield.MaxAbsBiasRad, math.Pi},
	} {
		if !(l.v >= 0 && l.v <= l.hi) {
			return fmt.Errorf("%s = %g is outside [0, %g]", l.name, l.v, l.hi)
		}
	}
	if q.YieldMin >= 1 {
		return fmt.Errorf("%s = %g: a yield of 1 can never be shown with confidence; want less than 1", CriterionYield, q.YieldMin)
	}
	if q.YieldMin > 0 && !q.Yield.Active() {
		return fmt.Errorf("%s needs yield.contrast_min or yield.bias_max_rad, the limits a realisation must meet", CriterionYield)
	}
	if q.YieldMin == 0 && q.Yield.Active() {
		return fmt.Errorf("yield limits are given without %s, the least fraction of realisations inside them", CriterionYield)
	}
	if q.ContrastMeanMin == 0 && q.ContrastP05Min == 0 && q.AbsBiasP95MaxRad == 0 && q.AbsBiasP95MaxDegPerH == 0 && q.YieldMin == 0 {
		return fmt.Errorf("no criterion: give at least one of %s, %s, %s, %s, %s",
			CriterionContrastMean, CriterionContrastP05, CriterionBiasRad, CriterionBiasDegPerH, CriterionYield)
	}
	return nil
}

// Verdict is the outcome of comparing an estimate with a limit.
type Verdict int

const (
	Pass      Verdict = iota // the limit is met with the confidence
	Fail                     // the limit is missed with the confidence
	Undecided                // the interval straddles the limit
)

var verdictNames = []string{"pass", "fail", "undecided"}

// String returns "pass", "fail" or "undecided".
func (v Verdict) String() string {
	if v < 0 || int(v) >= len(verdictNames) {
		return fmt.Sprintf("Verdict(%d)", int(v))
	}
	return verdictNames[v]
}

// MarshalText encodes the verdict as its name.
func (v Verdict) MarshalText() ([]byte, error) { return []byte(v.String()), nil }

// ExitCode maps a verdict to the exit status of a command that gates lab
// automation: 0 pass, 1 fail, 3 undecided (2 is left for bad input).
func (v Verdict) ExitCode() int {
	switch v {
	case Pass:
		return 0
	case Fail:
		return 1
	}
	return 3
}

// Criterion is one requirement checked against an ensemble.
type Criterion struct {
	Name    string  `json:"name"`     // the spec key, such as "contrast.p05_min"
	Unit    string  `json:"unit"`     // of Limit, Value, Lo and Hi: "", "rad" or "deg/h"
	AtLeast bool    `json:"at_least"` // the value must be at least Limit; otherwise at most
	Limit   float64 `json:"limit"`
	// Value is the measured statistic, Lo and Hi its one-sided lower and
	// upper confidence bounds at the requirements' confidence (together a
	// two-sided interval at 2 confidence - 1).
	Value float64 `json:"value"`
	Lo    float64 `json:"lo"`
	Hi    float64 `json:"hi"`
	// Margin is how far Value lies on the good side of Limit (negative on
	// the bad side), in Unit.
	Margin  float64 `json:"margin"`
	Verdict Verdict `json:"verdict"`
	// Extra is, for an undecided verdict, the estimated number of
	// realisations beyond those measured that would decide it
	// (AdditionalSamples, AdditionalTrials for the yield); OutOfReach
	// reports that none would under that estimate (the value sits on the
	// limit).
	Extra      int  `json:"extra_realisations,omitempty"`
	OutOfReach bool `json:"out_of_reach,omitempty"`
}

// Qualification is the verdict of an ensemble against Requirements.
type Qualification struct {
	Samples    int         `json:"samples"`
	Confidence float64     `json:"confidence"`
	Criteria   []Criterion `json:"criteria"`
	// Verdict is Fail if any criterion fails, otherwise Undecided if any is
	// undecided, otherwise Pass.
	Verdict Verdict `json:"verdict"`
}

// ExitCode is the exit status of the overall verdict (see Verdict.ExitCode).
func (q Qualification) ExitCode() int { return q.Verdict.ExitCode() }

// Qualify checks the records of an ensemble against the requirements.
// scaleFactorS is the Sagnac scale factor K of the nominal sequence, which
// turns a bias b in rad into the rotation-rate error b / K (needed only for
// AbsBiasP95MaxDegPerH); seed seeds the bootstrap.
//
// With c the requirements' confidence, each statistic gets its one-sided
// lower and upper confidence bounds at c: bootstrap percentiles (1 - c) and
// c of DecisionResamples replicates for the means and quantiles,
// Clopper-Pearson bounds (ClopperPearsonLower, ClopperPearsonUpper) for the
// yield. A limit of the form "at least L" passes when the lower bound is at
// least L, so that "yield at least 0.99 with 95% confidence" means that the
// one-sided 95% lower bound clears 0.99; it fails when the upper bound is
// below L, and is undecided otherwise ("at most L" likewise, mirrored). Each
// verdict is thus a one-sided test at level 1 - c in its direction.
//
// Each statistic draws its bootstrap from its own Substream(seed, 0,
// "qualify/"+statistic), so adding a criterion does not move the others, the
// two bias limits (rad and deg/h) see the same resamples, and records in any
// order give the same result.
//
// Qualify panics if recs is empty, the requirements do not Validate, a
// record's contrast or bias is NaN, or a deg/h limit is given with a
// scale factor that is not positive.
//
// References:
//   - B. Efron and R. J. Tibshirani, An Introduction to the Bootstrap
//     (Chapman & Hall, 1993), ch. 13 (percentile intervals).
//   - C. J. Clopper and E. S. Pearson, Biometrika 26, 404 (1934).
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
	sorted := slices.Clone(recs)
	slices.SortFunc(sorted, func(a, b Record) int { return a.Index - b.Index })
	n := len(sorted)
	c := req.confidence()
	contrast, abs := make([]float64, n), make([]float64, n)
	for i, r := range sorted {
		if math.IsNaN(r.Contrast) || math.IsNaN(r.BiasRad) {
			panic(fmt.Sprintf("mc: Qualify: realisation %d has a NaN output", r.Index))
		}
		contrast[i], abs[i] = r.Contrast, math.Abs(r.BiasRad)
	}
	q := Qualification{Samples: n, Confidence: c}
	// The two-sided percentile interval at 2c - 1 has the one-sided bounds
	// at c as its ends.
	bootstrapped := func(name, stream, unit string, atLeast bool, limit float64, s *statistic, k float64) {
		lo, hi := percentileOf(n, Substream(seed, 0, "qualify/"+stream), 2*c-1, s.at)
		e := stats.Estimate{Value: k * s.value(), Lo: k * lo, Hi: k * hi, Confidence: 2*c - 1}
		cr := decide(Criterion{Name: name, Unit: unit, AtLeast: atLeast, Limit: limit}, e)
		if cr.Verdict == Undecided {
			cr.Extra, cr.OutOfReach = extraRealisations(stats.AdditionalSamples(n, e, limit))
		}
		q.Criteria = append(q.Criteria, cr)
	}
	if l := req.ContrastMeanMin; l > 0 {
		bootstrapped(CriterionContrastMean, "contrast.mean", "", true, l, meanStatistic(contrast), 1)
	}
	if l := req.ContrastP05Min; l > 0 {
		bootstrapped(CriterionContrastP05, "contrast.p05", "", true, l, quantileStatistic(contrast, 0.05), 1)
	}
	var p95 *statistic
	if req.AbsBiasP95MaxRad > 0 || req.AbsBiasP95MaxDegPerH > 0 {
		p95 = quantileStatistic(abs, 0.95)
	}
	if l := req.AbsBiasP95MaxRad; l > 0 {
		bootstrapped(CriterionBiasRad, "bias.abs_p95", "rad", false, l, p95, 1)
	}
	if l := req.AbsBiasP95MaxDegPerH; l > 0 {
		bootstrapped(CriterionBiasDegPerH, "bias.abs_p95", "deg/h", false, l, p95, sim.RadPerSToDegPerH(1/scaleFactorS))
	}
	if l := req.YieldMin; l > 0 {
		k := 0
		for _, r := range sorted {
			if req.Yield.Inside(r) {
				k++
			}
		}
		e := stats.Estimate{Value: float64(k) / float64(n), Lo: stats.ClopperPearsonLower(k, n, c), Hi: stats.ClopperPearsonUpper(k, n, c), Confidence: 2*c - 1}
		cr := decide(Criterion{Name: CriterionYield, AtLeast: true, Limit: l}, e)
		if cr.Verdict == Undecided {
			cr.Extra, cr.OutOfReach = extraRealisations(stats.AdditionalTrials(k, n, 2*c-1, l))
		}
		q.Criteria = append(q.Criteria, cr)
	}
	q.Verdict = Pass
	for _, cr := range q.Criteria {
		switch {
		case cr.Verdict == Fail:
			q.Verdict = Fail
		case cr.Verdict == Undecided && q.Verdict == Pass:
			q.Verdict = Undecided
		}
	}
	return q
}

// decide fills in the estimate, margin and verdict of a criterion.
func decide(cr Criterion, e stats.Estimate) Criterion {
	cr.Value, cr.Lo, cr.Hi = e.Value, e.Lo, e.Hi
	good, bad := e.Lo >= cr.Limit, e.Hi < cr.Limit
	cr.Margin = e.Value - cr.Limit
	if !cr.AtLeast {
		good, bad = e.Hi <= cr.Limit, e.Lo > cr.Limit
		cr.Margin = cr.Limit - e.Value
	}
	switch {
	case good:
		cr.Verdict = Pass
	case bad:
		cr.Verdict = Fail
	default:
		cr.Verdict = Undecided
	}
	return cr
}

// extraRealisations turns a sample-size estimate into Criterion's Extra and
// OutOfReach.
func extraRealisations(extra int, ok bool) (int, bool) {
	if !ok {
		return 0, true
	}
	return extra, false
}
