package mc

import (
	"encoding/json"
	"fmt"
	"math"

	"rampart/stats"
)

// Requirements is a qualification spec: the criteria an ensemble must meet
// and the confidence with which it must meet them. A zero limit is not
// applied; at least one must be set.
type Requirements struct {
	// Confidence is the one-sided confidence of every verdict, in (0.5, 1).
	// If zero, 0.95.
	Confidence float64 `json:"confidence"`
	// LossPossible says that shots may be lost to photon scattering even
	// if the ensemble shows none (Manifest.LossPossible): the mean
	// contrast's bound allows for them (stats.ZeroMixture.Possible).
	LossPossible bool `json:"loss_possible,omitempty"`

	ContrastMeanMin      float64 `json:"contrast_mean_min,omitempty"`          // mean contrast at least this
	ContrastP05Min       float64 `json:"contrast_p05_min,omitempty"`           // 5th-percentile contrast at least this
	AbsBiasP95MaxRad     float64 `json:"bias_abs_p95_max_rad,omitempty"`       // 95th percentile of |bias| at most this, rad
	AbsBiasP95MaxDegPerH float64 `json:"bias_abs_p95_max_deg_per_h,omitempty"` // the same as a rotation rate, deg/h
	// AbsScaleFactorP95MaxPPM is the largest 95th percentile of the
	// scale-factor error's magnitude |K_shot / K - 1| in ppm; it needs
	// records with scale-factor errors (Ensemble.ScaleFactor).
	AbsScaleFactorP95MaxPPM float64 `json:"scale_factor_abs_p95_max_ppm,omitempty"`

	// YieldMin is the least fraction of realisations inside Yield.
	YieldMin float64 `json:"yield_min,omitempty"`
	Yield    Spec    `json:"yield_spec"`

	// Look is the number of this verdict in a sequence on one growing
	// ensemble: 1 for the first qualification, 2 after the first top-up,
	// and so on. Each look spends its share of 1 - Confidence
	// (stats.LookAlpha), so the whole sequence keeps the stated
	// confidence. If zero, 1.
	Look int `json:"look,omitempty"`
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
	CriterionScaleFactor  = "scale_factor.abs_p95_max_ppm"
)

// NeedsScaleFactor reports whether the requirements have a scale-factor
// criterion, whose records must carry scale-factor errors.
func (q Requirements) NeedsScaleFactor() bool { return q.AbsScaleFactorP95MaxPPM > 0 }

// confidence returns the confidence with its default.
func (q Requirements) confidence() float64 {
	if q.Confidence == 0 {
		return DefaultConfidence
	}
	return q.Confidence
}

// look returns the look number with its default.
func (q Requirements) look() int { return max(q.Look, 1) }

// Validate checks that the requirements set at least one criterion, that
// every limit is finite and in range, and that a yield comes with the limits
// that define it.
func (q Requirements) Validate() error {
	if c := q.Confidence; c != 0 && !(c > 0.5 && c < 1) {
		return fmt.Errorf("confidence %g is outside (0.5, 1)", c)
	}
	if q.Look < 0 {
		return fmt.Errorf("look %d: want 1 for a first qualification, 2, 3, ... after each top-up", q.Look)
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
		{CriterionScaleFactor, q.AbsScaleFactorP95MaxPPM, math.MaxFloat64},
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
	if q.ContrastMeanMin == 0 && q.ContrastP05Min == 0 && q.AbsBiasP95MaxRad == 0 && q.AbsBiasP95MaxDegPerH == 0 && q.YieldMin == 0 && q.AbsScaleFactorP95MaxPPM == 0 {
		return fmt.Errorf("no criterion: give at least one of %s, %s, %s, %s, %s, %s",
			CriterionContrastMean, CriterionContrastP05, CriterionBiasRad, CriterionBiasDegPerH, CriterionYield, CriterionScaleFactor)
	}
	return nil
}

// Verdict is the outcome of comparing an estimate with a limit.
type Verdict int

const (
	Pass      Verdict = iota // the limit is met with the confidence
	Fail                     // the limit is missed with the confidence
	Undecided                // neither is shown at the confidence
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
	// upper confidence bounds at the look's confidence
	// (Qualification.LookConfidence). A quantile bound that does not exist
	// at this ensemble size is the end of the statistic's range (0 or 1
	// for contrast, 0 or pi rad for |bias|), a bound that always holds,
	// marked by NoLo or NoHi.
	Value float64 `json:"value"`
	Lo    float64 `json:"lo"`
	Hi    float64 `json:"hi"`
	// Method names how the bounds and the tests were made: "order
	// statistic" (exact, distribution-free), "bootstrap-t" or
	// "Clopper-Pearson" (exact).
	Method string `json:"method"`
	// PPass is the p-value of the test against the limit being missed
	// (small when the criterion is met), PFail that against it being met.
	PPass float64 `json:"p_pass"`
	PFail float64 `json:"p_fail"`
	// Margin is how far Value lies on the good side of Limit (negative on
	// the bad side), in Unit.
	Margin  float64 `json:"margin"`
	Verdict Verdict `json:"verdict"`
	// NoBoundBelow is set for a quantile criterion that cannot pass
	// because no order statistic bounds its quantile at the look's
	// confidence from so few realisations: the smallest ensemble that has
	// such a bound (59 for a 5th percentile at 95 %, Wilks 1941).
	NoBoundBelow int `json:"no_bound_below,omitempty"`
	// NoLo and NoHi, when not 0, mark a quantile bound that does not exist
	// at this ensemble size (Lo or Hi then holds the end of the
	// statistic's range, which bounds nothing; the JSON writes null): the
	// smallest ensemble that has it.
	NoLo int `json:"-"`
	NoHi int `json:"-"`
	// Extra is, for an undecided verdict, the estimated number of
	// realisations beyond those measured that would decide it at the next
	// look's confidence; OutOfReach reports that none would under that
	// estimate (the value sits on the limit).
	Extra      int  `json:"extra_realisations,omitempty"`
	OutOfReach bool `json:"out_of_reach,omitempty"`
}

// MarshalJSON writes a bound that does not exist (NoLo, NoHi) as null.
func (c Criterion) MarshalJSON() ([]byte, error) {
	type plain Criterion
	return json.Marshal(struct {
		plain
		Lo *float64 `json:"lo"`
		Hi *float64 `json:"hi"`
	}{plain(c), end(c.Lo, c.NoLo > 0), end(c.Hi, c.NoHi > 0)})
}

// Qualification is the verdict of an ensemble against Requirements.
type Qualification struct {
	Samples    int     `json:"samples"`
	Confidence float64 `json:"confidence"`
	// Look is the look number and LookConfidence = 1 - stats.LookAlpha(1 -
	// Confidence, Look) the one-sided confidence every criterion is tested
	// at on it.
	Look           int         `json:"look"`
	LookConfidence float64     `json:"look_confidence"`
	Criteria       []Criterion `json:"criteria"`
	// Verdict is Fail if any criterion fails, otherwise Undecided if any is
	// undecided, otherwise Pass.
	Verdict Verdict `json:"verdict"`
}

// ExitCode is the exit status of the overall verdict (see Verdict.ExitCode).
func (q Qualification) ExitCode() int { return q.Verdict.ExitCode() }

// MinSamples returns the smallest ensemble with which every criterion of
// the requirements could pass at their look, even if every realisation
// were far on the good side: a quantile needs an order statistic that
// bounds it at the look's confidence 1 - alpha_k (stats.MinSamplesLower and
// stats.MinSamplesUpper: 69 for a 5th or 95th percentile at 95 %, look 1),
// a yield of at least Y needs alpha_k^(1/n) >= Y (n of n inside, the exact
// Clopper-Pearson bound), and a mean needs two for a spread (how many more
// its bootstrap needs depends on the data, so the mean does not raise the
// count further).
// Below it a qualification can only fail or be undecided.
func (q Requirements) MinSamples() int {
	c := 1 - stats.LookAlpha(1-q.confidence(), q.look())
	n := 1
	if q.ContrastMeanMin > 0 {
		n = 2
	}
	if q.ContrastP05Min > 0 {
		n = max(n, stats.MinSamplesLower(1, 0.05, c))
	}
	if q.AbsBiasP95MaxRad > 0 || q.AbsBiasP95MaxDegPerH > 0 || q.AbsScaleFactorP95MaxPPM > 0 {
		n = max(n, stats.MinSamplesUpper(1, 0.95, c))
	}
	if y := q.YieldMin; y > 0 && y < 1 {
		// The smallest n with Y^n <= 1 - c: by symmetry the size at which
		// the largest of n bounds a Y-quantile from above.
		n = max(n, stats.MinSamplesUpper(1, y, c))
	}
	return n
}
