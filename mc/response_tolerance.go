package mc

import (
	"context"
	"fmt"
	"math"

	"rampart/sim"
	"rampart/stats"
)

// Tolerance methods, as ToleranceResult.Method gives them.
const (
	MethodSearch  = "monte-carlo" // the search of ToleranceSearch.Source
	MethodKernels = "kernels"     // predicted by the noise transfer functions, confirmed by one ensemble
)

// KernelTolerance is the tolerance of a noise process predicted by the
// noise transfer functions (sim.Kernels), with what the prediction rests on.
type KernelTolerance struct {
	// Amplitude is the predicted tolerance in the result's Unit.
	Amplitude float64 `json:"amplitude"`
	// Binding is the criterion that limits it, Predicted its predicted
	// value there (its limit, unless the search ended above its range).
	Binding   string  `json:"binding"`
	Predicted float64 `json:"predicted"`
	// ContrastLoss and BiasStdRad are the process's own predicted effect
	// at the tolerance (sim.Prediction).
	ContrastLoss float64 `json:"contrast_loss"`
	BiasStdRad   float64 `json:"bias_std_rad"`
	// Unpredicted lists the spec's criteria the kernels do not predict
	// (yield, scale factor): the confirmation alone decides them.
	Unpredicted []string `json:"unpredicted,omitempty"`
	// Warnings say where the linear answer for the binding criterion
	// cannot be trusted at the tolerance (kernelWarnings).
	Warnings []string `json:"warnings,omitempty"`
	// Curve is the binding criterion as the kernels predict it against the
	// amplitude, from a tenth of the tolerance to sqrt(10) times it
	// (CurvePoints points, even in log amplitude, the tolerance at
	// CurveAt): the tolerance curve of a search, without its ensembles.
	Curve []KernelCurvePoint `json:"curve,omitempty"`
	// Confirm is the verdict of the Monte Carlo ensemble at the tolerance,
	// with the whole budget (the result's At holds its criteria); nil when
	// no level is left to the process (no ensemble ran).
	Confirm *Verdict `json:"confirm_verdict,omitempty"`
}

// KernelCurvePoint is one point of KernelTolerance.Curve: an amplitude in
// the result's Unit and the binding criterion's predicted value there.
type KernelCurvePoint struct {
	Amplitude float64 `json:"amplitude"`
	Predicted float64 `json:"predicted"`
}

// The kernel tolerance curve's points: CurvePoints of them, 20 per decade
// of amplitude, the tolerance at index CurveAt.
const (
	CurvePoints = 31
	CurveAt     = 20
)

// Kernel finds the tolerance of the noise process name (a Process row of
// Sources) from the noise transfer functions k of the nominal shot, and
// confirms it with one ensemble at the tolerance found.
//
// The rest of the budget is an ensemble with the process off (eval at
// amplitude 0): its contrasts C_i and biases b_i. The process at search
// amplitude a (PSD a^2 S) adds, to the linear order of the kernels, a mean
// contrast loss a^2 L and an independent Gaussian bias of variance a^2 V
// (L and V are k's prediction for S, sim.Kernels.PredictProcesses), so
// the criteria become
//
//	mean contrast:  mean(C_i) - a^2 L               >= limit
//	contrast p05:   p05(C_i) - a^2 L                >= limit  (the loss's own spread neglected)
//	|bias| p95:     P(|b_i + N(0, a^2 V)|) <= limit >= 0.95   (the mixture over i)
//
// with point estimates throughout; the tolerance is the largest a that
// keeps each, found in one pass (bisection of the mixture). Yield and
// scale-factor criteria are not predicted (Unpredicted). The ensemble at
// the tolerance, with the whole budget, gives At and the confirmation's
// verdict: at the predicted tolerance the binding criterion's estimate
// sits on its limit, so an undecided verdict is the expected outcome and
// agreement is the estimate's bounds straddling the limit. Unlike the
// search (Source), the tolerance is where the estimate meets the limit,
// not where a confidence bound does: it is above the demonstrated one by
// about the ensemble's standard error.
//
// If the kernels predict none of the spec's criteria, or the process has
// no channel on them (Budget.Process), Kernel runs the search (Source)
// instead; the result's Method says which it did.
func (s ToleranceSearch) Kernel(ctx context.Context, eval Evaluator, k *sim.Kernels, name string) (ToleranceResult, error) {
	row, ok := LookupSource(name)
	if !ok || row.Kind != Process {
		return ToleranceResult{}, fmt.Errorf("kernel tolerance of %q: not a noise process (want %s, %s, %s or %s)", name, SourceRIN, SourcePhase, SourceFieldNoise, SourceRotationPSD)
	}
	if err := s.Requirements.Validate(); err != nil {
		return ToleranceResult{}, fmt.Errorf("tolerance of %s: %w", name, err)
	}
	o := s.Options.withDefaults()
	src, err := newSource(s.Budget, name)
	if err != nil {
		return ToleranceResult{}, err
	}
	crits, unpredicted := s.kernelCriteria()
	unit, mapped := src.set(1).Process(name, k.DurationS)
	if len(crits) == 0 || !mapped {
		return s.Source(ctx, eval, name)
	}
	pr := k.PredictProcesses([]sim.Process{unit})
	loss, variance := pr.ContrastLoss, pr.BiasStdRad*pr.BiasStdRad

	res := ToleranceResult{Source: name, Unit: src.unit, Precision: o.Precision, Method: MethodKernels, Monotone: true}
	if src.nominal > 0 {
		v := round12(src.display(src.nominal))
		res.Nominal = &v
	}
	qualify := func(a float64) (TolerancePoint, Verdict, []Record, error) {
		if err := ctx.Err(); err != nil {
			return TolerancePoint{}, 0, nil, err
		}
		recs, err := eval(ctx, src.set(a))
		if err == nil && len(recs) == 0 {
			err = fmt.Errorf("the evaluator returned no records")
		}
		if err != nil {
			return TolerancePoint{}, 0, nil, fmt.Errorf("tolerance of %s at %g %s: %w", name, src.display(a), src.unit, err)
		}
		q := Qualify(recs, s.Requirements, s.ScaleFactorS, s.Seed)
		return TolerancePoint{Amplitude: a, Holds: q.Verdict == Pass, Criteria: q.Criteria}, q.Verdict, recs, nil
	}
	off, offVerdict, rest, err := qualify(0)
	if err != nil {
		return res, err
	}
	res.Off = &off

	// The largest a^2 each predicted criterion allows.
	x, binding := math.Inf(1), crits[0]
	for _, c := range crits {
		if xc := c.allows(rest, loss, variance); xc < x {
			x, binding = xc, c
		}
	}
	kt := &KernelTolerance{Binding: binding.name, Unpredicted: unpredicted}
	res.Kernel, res.Metric = kt, binding.name
	if x <= 0 {
		res.Status = ToleranceNone
		if offVerdict == Undecided {
			res.Status = ToleranceUndecided
		}
		res.pick(binding.name)
		return res, nil
	}
	a := math.Sqrt(x)
	res.Status = ToleranceFound
	if top := src.highest(o); !(a <= top) {
		a, res.Status = top, ToleranceAboveRange
	}
	at, v, _, err := qualify(a)
	if err != nil {
		return res, err
	}
	if res.Status == ToleranceFound && v != Pass {
		// The estimate meets the limit at a; a confidence bound does so
		// below it, so the confirmation is expected to stop short of a
		// pass: report what it is, not a demonstrated tolerance.
		res.Status = TolerancePredicted
	}
	scaled, _ := src.set(a).Process(name, k.DurationS)
	p := k.PredictProcesses([]sim.Process{scaled})
	kt.Amplitude, kt.Confirm = src.display(a), &v
	kt.ContrastLoss, kt.BiasStdRad, kt.Warnings = p.ContrastLoss, p.BiasStdRad, kernelWarnings(p, binding.kind == kernelBias)
	kt.Predicted = binding.value(rest, a*a*loss, a*a*variance)
	for i := range CurvePoints {
		ai := a * math.Pow(10, float64(i-CurveAt)/20)
		kt.Curve = append(kt.Curve, KernelCurvePoint{Amplitude: src.display(ai), Predicted: binding.value(rest, ai*ai*loss, ai*ai*variance)})
	}
	at.Amplitude = src.display(a)
	res.At = &at
	res.Points = []TolerancePoint{at}
	res.pick(binding.name)
	return res, nil
}

// pick fills in the binding criterion's values of the result's points.
func (res *ToleranceResult) pick(name string) {
	set := func(p *TolerancePoint) {
		for _, c := range p.Criteria {
			if c.Name == name {
				p.Value, p.Lo, p.Hi = c.Value, c.Lo, c.Hi
				p.Envelope = Interval{Value: c.Value, Lo: c.Lo, Hi: c.Hi}
			}
		}
	}
	for i := range res.Points {
		set(&res.Points[i])
	}
	if res.At != nil {
		res.At = &res.Points[0]
	}
	if res.Off != nil {
		set(res.Off)
	}
}

// kernelCriterion is a spec criterion as the kernels predict it.
type kernelCriterion struct {
	name  string
	limit float64 // in rad for the bias, whatever the spec's unit
	scale float64 // the spec's unit per rad (bias), 1 otherwise
	kind  int
}

const (
	kernelContrastMean = iota
	kernelContrastP05
	kernelBias
)

// kernelCriteria returns the criteria the kernels predict, and the names
// of those they do not.
func (s ToleranceSearch) kernelCriteria() ([]kernelCriterion, []string) {
	r := s.Requirements
	var out []kernelCriterion
	var not []string
	if r.ContrastMeanMin > 0 {
		out = append(out, kernelCriterion{CriterionContrastMean, r.ContrastMeanMin, 1, kernelContrastMean})
	}
	if r.ContrastP05Min > 0 {
		out = append(out, kernelCriterion{CriterionContrastP05, r.ContrastP05Min, 1, kernelContrastP05})
	}
	if r.AbsBiasP95MaxRad > 0 {
		out = append(out, kernelCriterion{CriterionBiasRad, r.AbsBiasP95MaxRad, 1, kernelBias})
	}
	if r.AbsBiasP95MaxDegPerH > 0 && s.ScaleFactorS > 0 {
		k := sim.RadPerSToDegPerH(1 / s.ScaleFactorS)
		out = append(out, kernelCriterion{CriterionBiasDegPerH, r.AbsBiasP95MaxDegPerH / k, k, kernelBias})
	}
	if r.YieldMin > 0 {
		not = append(not, CriterionYield)
	}
	if r.AbsScaleFactorP95MaxPPM > 0 {
		not = append(not, CriterionScaleFactor)
	}
	return out, not
}

// value returns the criterion's predicted value (in the spec's unit) for
// the rest's records with a contrast loss and an added bias variance.
func (c kernelCriterion) value(rest []Record, loss, variance float64) float64 {
	switch c.kind {
	case kernelContrastMean:
		return stats.Mean(contrasts(rest)) - loss
	case kernelContrastP05:
		return stats.Quantile(contrasts(rest), 0.05) - loss
	}
	return c.scale * mixtureP95(fringeBiases(rest), math.Sqrt(math.Max(variance, 0)))
}

// allows returns the largest x = a^2 that keeps the criterion for a
// process costing loss and variance per unit x: +Inf when the process
// does not reach it, zero or below when the rest alone misses it.
func (c kernelCriterion) allows(rest []Record, loss, variance float64) float64 {
	if c.kind != kernelBias {
		room := c.value(rest, 0, 0) - c.limit
		switch {
		case room <= 0:
			return room
		case !(loss > 0):
			return math.Inf(1)
		}
		return room / loss
	}
	b := fringeBiases(rest)
	if mixtureP95(b, 0) > c.limit {
		return -1
	}
	if !(variance > 0) {
		return math.Inf(1)
	}
	// The mixture's p95 grows with the added standard deviation sigma;
	// the largest sigma that keeps it is bracketed by doubling from the
	// Gaussian answer limit / 1.96 and bisected.
	lo, hi := 0.0, c.limit/1.959963984540054
	for mixtureP95(b, hi) <= c.limit {
		lo, hi = hi, 2*hi
	}
	for range 100 {
		m := (lo + hi) / 2
		if mixtureP95(b, m) <= c.limit {
			lo = m
		} else {
			hi = m
		}
	}
	return lo * lo / variance
}

// mixtureP95 returns the 95th percentile of |b + sigma z| with b drawn
// from the values given and z standard normal: the q with
//
//	(1/n) sum_i [Phi((q - b_i)/sigma) - Phi((-q - b_i)/sigma)] = 0.95,
//
// and for sigma = 0 the sample quantile of |b_i| (stats.Quantile).
func mixtureP95(b []float64, sigma float64) float64 {
	abs := make([]float64, len(b))
	for i, x := range b {
		abs[i] = math.Abs(x)
	}
	if sigma == 0 {
		return stats.Quantile(abs, 0.95)
	}
	cdf := func(q float64) float64 {
		var s float64
		for _, x := range b {
			s += 0.5*math.Erfc(-(q-x)/(sigma*math.Sqrt2)) - 0.5*math.Erfc(-(-q-x)/(sigma*math.Sqrt2))
		}
		return s / float64(len(b))
	}
	lo, hi := 0.0, stats.Quantile(abs, 1)+4*sigma
	for range 100 {
		q := (lo + hi) / 2
		if cdf(q) < 0.95 {
			lo = q
		} else {
			hi = q
		}
	}
	return (lo + hi) / 2
}

// contrasts returns the records' contrasts, lost shots included (as
// Qualify counts them).
func contrasts(recs []Record) []float64 {
	out := make([]float64, len(recs))
	for i, r := range recs {
		out[i] = r.Contrast
	}
	return out
}

// fringeBiases returns the biases of the shots with a fringe (as Qualify's
// |bias| quantile); pi if none has one.
func fringeBiases(recs []Record) []float64 {
	var out []float64
	for _, r := range recs {
		if !r.Lost() {
			out = append(out, r.BiasRad)
		}
	}
	if len(out) == 0 {
		out = []float64{math.Pi}
	}
	return out
}

// kernelWarnings returns the validity warnings of a prediction that bear
// on the binding criterion: an unresolved resonance always; for a contrast
// criterion a loss beyond second order (sim.MaxLinearContrastLoss); for a
// bias criterion a bias std beyond the linear phase response
// (sim.MaxLinearPhaseStdRad) or second-order phase fluctuations not small
// against it (sim.SecondOrderPhaseShare), as sim.Kernels.PredictAll.
func kernelWarnings(p sim.Prediction, bias bool) []string {
	var out []string
	for _, c := range p.Channels {
		if c.Unresolved {
			out = append(out, fmt.Sprintf("%v: the kernel has a resonance narrower than its grid where the effect comes from", c.Channel))
		}
	}
	if !bias && p.ContrastLoss > sim.MaxLinearContrastLoss {
		out = append(out, fmt.Sprintf("the predicted contrast loss %.3g is above %g, where second order is no longer enough", p.ContrastLoss, sim.MaxLinearContrastLoss))
	}
	if bias && p.BiasStdRad > sim.MaxLinearPhaseStdRad {
		out = append(out, fmt.Sprintf("the predicted bias std %.3g rad is above %g rad, where the linear phase response is no longer enough", p.BiasStdRad, sim.MaxLinearPhaseStdRad))
	}
	if bias && math.Abs(p.ContrastLoss) > sim.SecondOrderPhaseShare*p.BiasStdRad && math.Abs(p.ContrastLoss) > 1e-3 {
		out = append(out, fmt.Sprintf("second-order phase fluctuations, of the order of the contrast loss %.3g, are not small against the linear bias std %.3g rad: the bias std is underestimated", p.ContrastLoss, p.BiasStdRad))
	}
	return out
}
