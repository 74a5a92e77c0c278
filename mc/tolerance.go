package mc

import (
	"cmp"
	"context"
	"encoding/json"
	"fmt"
	"math"
	"slices"
)

// Evaluator runs the ensemble of a tolerance search under budget b and
// returns its records. For the search to compare amplitudes on common
// random numbers, every call must use the same configuration, seed, sampler
// and number of samples, and the same noise grid (Ensemble.NoiseStepS and
// NoiseDurationS, sized for ToleranceSearch.Widest); only the budget
// changes. The evaluator may run the ensemble on as many workers as it likes.
type Evaluator func(ctx context.Context, b Budget) ([]Record, error)

// ToleranceOptions tune a tolerance search. Zero fields take the defaults.
type ToleranceOptions struct {
	// Precision is the relative precision of the tolerance: the search stops
	// when the amplitudes known to hold and to fail are within a factor
	// 1 + Precision (0.42 dB for a noise level at 0.05). Default 0.05.
	Precision float64
	// Factor is the step of the bracketing search. Default 4.
	Factor float64
	// Range bounds the search to [ref / Range, ref * Range] about the
	// starting amplitude ref, and below each source's largest sensible
	// amplitude. Default 1e3.
	Range float64
}

func (o ToleranceOptions) withDefaults() ToleranceOptions {
	if o.Precision == 0 {
		o.Precision = 0.05
	}
	if o.Factor == 0 {
		o.Factor = 4
	}
	if o.Range == 0 {
		o.Range = 1e3
	}
	return o
}

// ToleranceStatus says how a tolerance search ended.
type ToleranceStatus string

const (
	// ToleranceFound: the tolerance lies within the precision between an
	// amplitude that holds and one that fails.
	ToleranceFound ToleranceStatus = "found"
	// ToleranceAboveRange: the spec holds up to the largest amplitude
	// searched, which is then the tolerance reported (a lower bound).
	ToleranceAboveRange ToleranceStatus = "above-range"
	// ToleranceBelowRange: the spec holds with the source off but fails at
	// the smallest amplitude searched; no tolerance is reported.
	ToleranceBelowRange ToleranceStatus = "below-range"
	// ToleranceNone: the spec fails even with the source off (the other
	// sources or the nominal sequence already break it).
	ToleranceNone ToleranceStatus = "fails-without-source"
	// ToleranceUndecided: the spec fails at the starting amplitude and is
	// undecided with the source off: the ensemble is too small to show
	// that it holds even then (Off says how many more realisations would
	// decide it).
	ToleranceUndecided ToleranceStatus = "undecided-without-source"
	// TolerancePredicted: a noise process's tolerance from the noise
	// transfer functions, where the binding criterion's estimate meets its
	// limit, that the confirming ensemble did not show to hold (it did not
	// pass there): an estimate, not a demonstrated tolerance.
	TolerancePredicted ToleranceStatus = "predicted"
)

// TolerancePoint is one evaluation of a tolerance search.
type TolerancePoint struct {
	Amplitude float64 `json:"amplitude"` // in the result's Unit
	// Value, Lo and Hi are the binding criterion's estimate and confidence
	// bounds (see Criterion), Envelope their monotone envelope over the
	// points at or below this amplitude.
	Value    float64  `json:"value"`
	Lo       float64  `json:"lo"`
	Hi       float64  `json:"hi"`
	Envelope Interval `json:"envelope"`
	// Holds reports whether every criterion passes.
	Holds    bool        `json:"holds"`
	Criteria []Criterion `json:"criteria"`
	// NoLo and NoHi mark a bound of the point that does not exist at this
	// ensemble size (Criterion.NoLo, NoHi: Lo or Hi then holds the end of
	// the statistic's range), EnvNoLo and EnvNoHi one of the envelope
	// that rests on such a bound. The JSON writes them null, the curves'
	// CSV leaves them empty.
	NoLo, NoHi       bool `json:"-"`
	EnvNoLo, EnvNoHi bool `json:"-"`
}

// MarshalJSON writes the point with its missing bounds as null.
func (p TolerancePoint) MarshalJSON() ([]byte, error) {
	type plain TolerancePoint
	type interval struct {
		Value float64  `json:"value"`
		Lo    *float64 `json:"lo"`
		Hi    *float64 `json:"hi"`
	}
	return json.Marshal(struct {
		plain
		Lo       *float64 `json:"lo"`
		Hi       *float64 `json:"hi"`
		Envelope interval `json:"envelope"`
	}{plain(p), end(p.Lo, p.NoLo), end(p.Hi, p.NoHi), interval{p.Envelope.Value, end(p.Envelope.Lo, p.EnvNoLo), end(p.Envelope.Hi, p.EnvNoHi)}})
}

// ToleranceResult is the tolerance of one noise source (or of the whole
// budget): a row of the tolerance table and the curve behind it.
type ToleranceResult struct {
	Source string `json:"source"`
	Unit   string `json:"unit"`
	// Nominal is the budget's amplitude in Unit, nil if the budget switches
	// the source off.
	Nominal *float64        `json:"nominal,omitempty"`
	Status  ToleranceStatus `json:"status"`
	// Metric is the binding criterion: the one that fails first (the
	// furthest on the bad side, relative to its limit, at the smallest
	// failing amplitude).
	Metric string `json:"metric"`
	// At is the point at the tolerance, the largest amplitude shown to
	// hold; nil when none held.
	At *TolerancePoint `json:"at,omitempty"`
	// Points are the evaluations at positive amplitude, in increasing
	// amplitude, for the tolerance curve.
	Points []TolerancePoint `json:"points"`
	// Off is the evaluation with the source off, when the search made one
	// (the starting amplitude failed): its criteria say why the status is
	// below-range, fails-without-source or undecided-without-source.
	Off *TolerancePoint `json:"off,omitempty"`
	// Monotone reports whether the binding criterion's value was monotone
	// in the amplitude over the points (otherwise the envelope differs from
	// it).
	Monotone  bool    `json:"monotone"`
	Precision float64 `json:"precision"`
	// Method says how the tolerance was found: MethodSearch (the search
	// described at ToleranceSearch) or MethodKernels (ToleranceSearch.Kernel,
	// whose prediction Kernel holds; At is then the confirming ensemble
	// at the predicted tolerance, whatever its verdict).
	Method string           `json:"method"`
	Kernel *KernelTolerance `json:"kernel,omitempty"`
}

// Tolerance returns the tolerance in Unit, and whether there is one.
func (t ToleranceResult) Tolerance() (float64, bool) {
	if t.At == nil {
		return 0, false
	}
	return t.At.Amplitude, true
}

// ToleranceSearch finds, for each noise source, the largest amplitude at
// which an ensemble still meets its requirements.
//
// The source's amplitude is varied with every other source held at its
// value in Budget: the tolerance of one source answers "how good must this
// part be, given the rest of the apparatus as it is", and a part whose
// tolerance is reached alone leaves no room for the others to grow. Use
// Joint for the scale of the whole budget. A source switched off in the
// budget starts from its reference amplitude (RefDepthRel and the others).
//
// "Meets" is the verdict of Qualify at the requirements' confidence: an
// undecided amplitude counts as failing, so the tolerance is one the
// ensemble demonstrates. The search evaluates the starting amplitude, then
// brackets by Factor up (while it holds) or down (while it fails, after
// checking the source off), then bisects in log amplitude until the holding
// and failing amplitudes are within 1 + Precision. Every qualification
// draws its bootstrap from Seed, and the evaluator's ensembles share their
// random numbers, so the metric and its bounds move smoothly with the
// amplitude.
// Bisection probes only between the amplitudes known to hold and to fail,
// so its verdicts are monotone by construction; the values need not be,
// with a finite ensemble, and the points carry a monotone envelope (the
// running worst value from the lowest amplitude up) for the tolerance curve
// and the metric at the tolerance.
type ToleranceSearch struct {
	Budget       Budget
	Requirements Requirements
	// ScaleFactorS is the Sagnac scale factor of the nominal sequence, for
	// deg/h limits.
	ScaleFactorS float64
	// Seed seeds the bootstrap of every qualification.
	Seed    uint64
	Options ToleranceOptions
	// StartTemperatureK is the ensemble's start temperature. The search
	// takes the temperature spread (alone or with the budget) no further
	// than it: beyond, more than one draw in six would lie below 0 K and be
	// clamped there, and a scenario refuses such a spread. Zero (a
	// ground-state start): no cap but the source's Max.
	StartTemperatureK float64
	// Readout is the read-out of the detection axis (SourceDetection),
	// whose measured signal draws from Seed as the ensemble's own
	// (Readout.MeasuredBias): Seed must then be the ensemble's seed.
	Readout Readout
}

// capTemperature lowers the largest amplitude of src, the axis of the
// named source, so that the temperature spread stays at most the start
// temperature.
func (s ToleranceSearch) capTemperature(src source, name string) source {
	t := s.StartTemperatureK
	switch {
	case !(t > 0):
	case name == SourceTemperature:
		src.max = math.Min(src.max, t)
	case name == SourceBudget && s.Budget.TemperatureSpreadK > 0:
		src.max = math.Min(src.max, t/s.Budget.TemperatureSpreadK)
	}
	return src
}

// Source searches the tolerance of the named source, one of Sources.
func (s ToleranceSearch) Source(ctx context.Context, eval Evaluator, name string) (ToleranceResult, error) {
	if name == SourceBudget {
		return s.Joint(ctx, eval)
	}
	if name == SourceDetection {
		src, err := detectionSource(s.Budget, s.Readout)
		if err != nil {
			return ToleranceResult{}, err
		}
		return s.search(ctx, once(eval), src)
	}
	src, err := newSource(s.Budget, name)
	if err != nil {
		return ToleranceResult{}, err
	}
	return s.search(ctx, eval, s.capTemperature(src, name))
}

// Joint searches the largest factor k by which the whole budget can be
// scaled (standard deviations by k, PSDs by k^2, as Budget.Scaled) and still
// meet the requirements.
func (s ToleranceSearch) Joint(ctx context.Context, eval Evaluator) (ToleranceResult, error) {
	src, err := budgetSource(s.Budget)
	if err != nil {
		return ToleranceResult{}, err
	}
	return s.search(ctx, eval, s.capTemperature(src, SourceBudget))
}

// All searches the tolerance of each of the named sources in turn.
func (s ToleranceSearch) All(ctx context.Context, eval Evaluator, names []string) ([]ToleranceResult, error) {
	out := make([]ToleranceResult, 0, len(names))
	for _, name := range names {
		r, err := s.Source(ctx, eval, name)
		if err != nil {
			return out, err
		}
		out = append(out, r)
	}
	return out, nil
}

// Widest returns the budget with the clock-rate error and the skew at the
// largest amplitudes a search of them (alone or jointly) may try, the other
// sources at their values. Size the evaluator's shared noise grid from it:
// its longest shot is the longest of the search.
func (s ToleranceSearch) Widest() Budget {
	o := s.Options.withDefaults()
	w := s.Budget
	clock, _ := newSource(s.Budget, ParamClock)
	skew, _ := newSource(s.Budget, ParamSkew)
	w.ClockRel, w.SkewS = clock.highest(o), skew.highest(o)
	if j, err := budgetSource(s.Budget); err == nil {
		k := j.highest(o)
		w.ClockRel = math.Max(w.ClockRel, k*s.Budget.ClockRel)
		w.SkewS = math.Max(w.SkewS, k*s.Budget.SkewS)
	}
	return w
}

func (s ToleranceSearch) search(ctx context.Context, eval Evaluator, src source) (ToleranceResult, error) {
	if err := s.Requirements.Validate(); err != nil {
		return ToleranceResult{}, fmt.Errorf("tolerance of %s: %w", src.name, err)
	}
	o := s.Options.withDefaults()
	if !(o.Precision > 0) || !(o.Factor > 1) || !(o.Range > 1) {
		return ToleranceResult{}, fmt.Errorf("tolerance options %+v: want Precision > 0, Factor > 1 and Range > 1", o)
	}
	res := ToleranceResult{Source: src.name, Unit: src.unit, Precision: o.Precision, Method: MethodSearch}
	if src.nominal > 0 {
		v := round12(src.display(src.nominal))
		res.Nominal = &v
	}
	var points []TolerancePoint
	var offVerdict Verdict
	evaluate := func(a float64) (bool, error) {
		if err := ctx.Err(); err != nil {
			return false, err
		}
		recs, err := eval(ctx, src.set(a))
		if err != nil {
			return false, fmt.Errorf("tolerance of %s at %g %s: %w", src.name, src.display(a), src.unit, err)
		}
		if len(recs) == 0 {
			return false, fmt.Errorf("tolerance of %s at %g %s: the evaluator returned no records", src.name, src.display(a), src.unit)
		}
		if src.measure != nil {
			recs = src.measure(a, recs, s.Seed)
		}
		q := Qualify(recs, s.Requirements, s.ScaleFactorS, s.Seed)
		p := TolerancePoint{Amplitude: a, Holds: q.Verdict == Pass, Criteria: q.Criteria}
		if a > 0 {
			points = append(points, p)
		} else {
			offVerdict, res.Off = q.Verdict, &p
		}
		return q.Verdict == Pass, nil
	}

	lowest, highest := src.ref/o.Range, src.highest(o)
	lo, hi := 0.0, 0.0 // amplitudes known to hold and to fail; 0: none yet
	a := src.ref
	holds, err := evaluate(a)
	if err != nil {
		return res, err
	}
	// probe evaluates amplitude a and moves the bracket end it belongs to.
	probe := func(a float64) error {
		h, err := evaluate(a)
		if err == nil && h {
			lo = a
		} else if err == nil {
			hi = a
		}
		return err
	}
	switch {
	case holds:
		for lo = a; hi == 0; {
			if lo >= highest {
				res.Status = ToleranceAboveRange
				break
			}
			if err := probe(math.Min(lo*o.Factor, highest)); err != nil {
				return res, err
			}
		}
	default:
		off, err := evaluate(0)
		if err != nil {
			return res, err
		}
		if !off {
			res.Status = ToleranceNone
			if offVerdict == Undecided {
				res.Status = ToleranceUndecided
			}
			break
		}
		for hi = a; lo == 0; {
			if hi <= lowest {
				res.Status = ToleranceBelowRange
				break
			}
			if err := probe(math.Max(hi/o.Factor, lowest)); err != nil {
				return res, err
			}
		}
	}
	for lo > 0 && hi > 0 && hi > lo*(1+o.Precision) {
		if err := probe(math.Sqrt(lo * hi)); err != nil {
			return res, err
		}
	}
	if res.Status == "" {
		res.Status = ToleranceFound
	}
	res.finish(points, lo, src.display)
	return res, nil
}

// finish sorts the points, picks the binding criterion, fills in its values
// and envelope, and sets the point at the tolerance lo (0: none).
func (res *ToleranceResult) finish(points []TolerancePoint, lo float64, display func(float64) float64) {
	slices.SortFunc(points, func(p, q TolerancePoint) int { return cmp.Compare(p.Amplitude, q.Amplitude) })
	if len(points) == 0 {
		return
	}
	// The reference point: the smallest failing amplitude, or the largest
	// amplitude when all hold.
	ref := len(points) - 1
	for i, p := range points {
		if !p.Holds {
			ref = i
			break
		}
	}
	binding, worst := 0, math.Inf(1)
	for k, c := range points[ref].Criteria {
		if m := boundMargin(c); m < worst {
			binding, worst = k, m
		}
	}
	atLeast := points[ref].Criteria[binding].AtLeast
	res.Metric = points[ref].Criteria[binding].Name
	res.Monotone = true
	var env Interval
	var envNoLo, envNoHi bool
	for i := range points {
		p := &points[i]
		c := p.Criteria[binding]
		p.Value, p.Lo, p.Hi = c.Value, c.Lo, c.Hi
		p.NoLo, p.NoHi = c.NoLo > 0, c.NoHi > 0
		cur := Interval{Value: c.Value, Lo: c.Lo, Hi: c.Hi}
		if i == 0 {
			env, envNoLo, envNoHi = cur, p.NoLo, p.NoHi
		} else {
			worse := math.Min
			if !atLeast {
				worse = math.Max
			}
			if worse(env.Value, cur.Value) != cur.Value {
				res.Monotone = false
			}
			next := Interval{Value: worse(env.Value, cur.Value), Lo: worse(env.Lo, cur.Lo), Hi: worse(env.Hi, cur.Hi)}
			// A bound of the envelope is missing when it is taken from a
			// missing one (the range's end, which is the worst value).
			envNoLo = (next.Lo == cur.Lo && p.NoLo) || (next.Lo == env.Lo && envNoLo)
			envNoHi = (next.Hi == cur.Hi && p.NoHi) || (next.Hi == env.Hi && envNoHi)
			env = next
		}
		p.Envelope = env
		p.EnvNoLo, p.EnvNoHi = envNoLo, envNoHi
	}
	at := -1
	for i := range points {
		if points[i].Amplitude == lo {
			at = i
		}
		points[i].Amplitude = display(points[i].Amplitude)
	}
	if at >= 0 {
		p := points[at]
		res.At = &p
	}
	res.Points = points
	if off := res.Off; off != nil {
		c := off.Criteria[binding]
		off.Value, off.Lo, off.Hi = c.Value, c.Lo, c.Hi
		off.Envelope = Interval{Value: c.Value, Lo: c.Lo, Hi: c.Hi}
	}
}

// OffExtra is how many more realisations per ensemble would decide the
// undecided criteria of the evaluation with the source off (the largest
// Criterion.Extra among them), 0 if none says.
func (t ToleranceResult) OffExtra() int {
	if t.Off == nil {
		return 0
	}
	n := 0
	for _, c := range t.Off.Criteria {
		if c.Verdict == Undecided && c.Extra > n {
			n = c.Extra
		}
	}
	return n
}

// boundMargin is how far the confidence bound that decides a criterion
// lies on the good side of its limit, relative to the limit.
func boundMargin(c Criterion) float64 {
	if c.AtLeast {
		return (c.Lo - c.Limit) / c.Limit
	}
	return (c.Limit - c.Hi) / c.Limit
}
