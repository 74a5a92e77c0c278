package design

import (
	"context"
	"fmt"
	"math"
	"slices"

	"gonum.org/v1/gonum/optimize"

	"rampart/internal/plural"
	"rampart/mc"
	"rampart/sim"
	"rampart/stats"
)

// Objectives of a robust optimisation, by name.
const (
	ObjectiveP05      = "p05"       // the 5th-percentile contrast
	ObjectiveYield    = "yield"     // the fraction of realisations inside the spec
	ObjectiveMeanKStd = "mean-kstd" // the mean contrast less K standard deviations
	ObjectiveBias     = "p05-bias"  // the p05 contrast less W times the |bias| p95 in rad
)

// Objectives lists the objective names.
var Objectives = []string{ObjectiveP05, ObjectiveYield, ObjectiveMeanKStd, ObjectiveBias}

// Objective is what a robust optimisation maximises over an ensemble's
// records: the empirical 5th-percentile contrast (as mc.Summarise computes
// it, stats.QuantileSorted), the yield inside Spec, the mean contrast less
// K standard deviations, or the p05 contrast less Weight times the 95th
// percentile of |bias| in rad.
type Objective struct {
	Name   string
	K      float64 // mean-kstd
	Weight float64 // p05-bias, per rad
	Spec   mc.Spec // yield
}

// Validate checks the objective's name and parameters.
func (o Objective) Validate() error {
	switch o.Name {
	case ObjectiveP05, ObjectiveMeanKStd:
		if o.K < 0 || math.IsNaN(o.K) || math.IsInf(o.K, 0) {
			return fmt.Errorf("objective %s: K = %g, want a finite number >= 0", o.Name, o.K)
		}
	case ObjectiveYield:
		if !o.Spec.Active() {
			return fmt.Errorf("objective yield needs a spec with a contrast or bias limit")
		}
	case ObjectiveBias:
		if !(o.Weight > 0) || math.IsInf(o.Weight, 0) {
			return fmt.Errorf("objective %s: weight %g per rad, want a positive finite number", o.Name, o.Weight)
		}
	default:
		return fmt.Errorf("unknown objective %q: want one of p05, yield, mean-kstd, p05-bias", o.Name)
	}
	return nil
}

// Value returns the objective over the records (any order).
func (o Objective) Value(recs []mc.Record) float64 {
	c := make([]float64, len(recs))
	b := make([]float64, 0, len(recs))
	inside := 0
	for i, r := range recs {
		// A lost shot (photon scattering) counts as contrast 0 and has no
		// phase: it stays out of the bias quantile, as in mc.Summarise.
		c[i] = r.Contrast
		if !r.Lost() {
			b = append(b, math.Abs(r.BiasRad))
		}
		if o.Spec.Inside(r) {
			inside++
		}
	}
	switch o.Name {
	case ObjectiveYield:
		return float64(inside) / float64(len(recs))
	case ObjectiveMeanKStd:
		var m, ss float64
		for _, x := range c {
			m += x
		}
		m /= float64(len(c))
		for _, x := range c {
			ss += (x - m) * (x - m)
		}
		return m - o.K*math.Sqrt(ss/float64(max(len(c)-1, 1)))
	}
	slices.Sort(c)
	p05 := stats.QuantileSorted(c, 0.05)
	if o.Name == ObjectiveBias {
		if len(b) == 0 {
			return p05 // every shot lost: no bias to weigh
		}
		slices.Sort(b)
		return p05 - o.Weight*stats.QuantileSorted(b, 0.95)
	}
	return p05
}

// Robust optimises the correction of a ramp (Corrected) for an objective
// over an ensemble under the noise budget. Every evaluation runs the same
// realisations (Ensemble's seed: common random numbers), so the objective
// is a deterministic function of the coefficients and a change in it is
// the ramp's, not the draws'. The optimiser is gonum's Nelder-Mead simplex
// (optimize.NelderMead), started at the reference (all coefficients zero)
// with a simplex of InitialStep.
//
// The objective is measured on the draws it is tuned on, so its optimum is
// biased upwards (the winner's curse); a claim about the result needs a
// fresh ensemble (another seed), as rampart robust makes.
//
// References:
//   - J. A. Nelder and R. Mead, "A simplex method for function
//     minimization", Comput. J. 7, 308 (1965).
//   - C. Chen, D. Dong, R. Long, I. R. Petersen and H. Rabitz,
//     "Sampling-based learning control of inhomogeneous quantum
//     ensembles", Phys. Rev. A 89, 023402 (2014) (optimising over a sample
//     of the ensemble of errors).
type Robust struct {
	// Ensemble is the optimisation ensemble; its Config's ramp-up is the
	// reference, corrected by Terms coefficients.
	Ensemble  mc.Ensemble
	Terms     int
	Objective Objective
	// MaxEvals bounds the objective evaluations (ensembles run).
	MaxEvals int
	// InitialStep is the size of the initial simplex, in units of the
	// cruise speed; 0: 0.05.
	InitialStep float64
	Workers     int
	// Label names the corrected ramp.
	Label string
	// Evaluated, if not nil, is called after each evaluation.
	Evaluated func(Step)
}

// Step is one evaluation of an optimisation.
type Step struct {
	Eval  int       `json:"eval"`
	Value float64   `json:"value"`
	Best  float64   `json:"best"`
	Coef  []float64 `json:"coef"`
}

// RobustResult is the outcome: the best coefficients found and their ramp,
// the objective there and at the reference, the history, and whether the
// search was cut short (by ctx; the best so far is kept).
type RobustResult struct {
	Coef        []float64  `json:"coef"`
	Value       float64    `json:"value"`
	Reference   float64    `json:"reference_value"`
	History     []Step     `json:"history"`
	Interrupted bool       `json:"interrupted,omitempty"`
	Ramp        *Corrected `json:"-"`
}

// Evaluate returns the objective for the coefficients coef, and the ramp.
func (r Robust) Evaluate(ctx context.Context, coef []float64) (float64, *Corrected, error) {
	cfg := r.Ensemble.Config
	ramp, err := NewCorrected(cfg.Sequence.Up, coef, r.Label)
	if err != nil {
		return 0, nil, err
	}
	recs, err := RunRamp(ctx, r.Ensemble, ramp, r.Workers)
	if err != nil {
		return 0, nil, err
	}
	return r.Objective.Value(recs), ramp, nil
}

// RunRamp runs the ensemble ens with its ramp-up replaced by ramp (the
// sequence keeping its laps) and returns the records in index order.
func RunRamp(ctx context.Context, ens mc.Ensemble, ramp sim.Ramp, workers int) ([]mc.Record, error) {
	seq, err := ens.Config.Sequence.WithUp(ramp)
	if err != nil {
		return nil, err
	}
	ens.Config.Sequence = seq
	rz, err := mc.NewRealiser(ens)
	if err != nil {
		return nil, err
	}
	recs := make([]mc.Record, 0, ens.Samples)
	_, err = rz.Run(ctx, 0, ens.Samples, workers, func(rec mc.Record) error { recs = append(recs, rec); return nil })
	return recs, err
}

// Validate checks the optimisation's settings.
func (r Robust) Validate() error {
	switch {
	case r.Terms < 1 || r.Terms > MaxTerms:
		return fmt.Errorf("%s: want 1 to %d", plural.Count(r.Terms, "correction term"), MaxTerms)
	case r.MaxEvals < r.Terms+2:
		return fmt.Errorf("%s for %s: want at least %d (the first simplex)", plural.Count(r.MaxEvals, "evaluation"), plural.Count(r.Terms, "term"), r.Terms+2)
	case r.InitialStep < 0 || math.IsNaN(r.InitialStep) || math.IsInf(r.InitialStep, 0):
		return fmt.Errorf("initial step %g: want a finite number >= 0", r.InitialStep)
	}
	return r.Objective.Validate()
}

// Optimise runs the optimisation. On the cancellation of ctx it stops and
// returns the best found so far with Interrupted set; any other error of
// an evaluation is returned.
func (r Robust) Optimise(ctx context.Context) (RobustResult, error) {
	if err := r.Validate(); err != nil {
		return RobustResult{}, err
	}
	ref, refRamp, err := r.Evaluate(ctx, make([]float64, r.Terms))
	if err != nil {
		return RobustResult{}, err
	}
	res := RobustResult{Coef: make([]float64, r.Terms), Value: ref, Reference: ref, Ramp: refRamp}
	res.History = append(res.History, Step{Eval: 1, Value: ref, Best: ref, Coef: res.Coef})
	if r.Evaluated != nil {
		r.Evaluated(res.History[0])
	}
	var evalErr error
	f := func(x []float64) float64 {
		if evalErr != nil || ctx.Err() != nil {
			return math.Inf(1)
		}
		v, ramp, err := r.Evaluate(ctx, x)
		if err != nil {
			if ctx.Err() == nil {
				evalErr = err
			}
			return math.Inf(1)
		}
		if v > res.Value {
			res.Value, res.Coef, res.Ramp = v, slices.Clone(x), ramp
		}
		st := Step{Eval: len(res.History) + 1, Value: v, Best: res.Value, Coef: slices.Clone(x)}
		res.History = append(res.History, st)
		if r.Evaluated != nil {
			r.Evaluated(st)
		}
		return -v
	}
	step := r.InitialStep
	if step == 0 {
		step = 0.05
	}
	settings := &optimize.Settings{
		FuncEvaluations: r.MaxEvals - 1, // the reference was the first
		Converger:       stopOn{ctx: ctx, err: &evalErr, inner: &optimize.FunctionConverge{Absolute: 1e-7, Iterations: 4 * r.Terms}},
	}
	_, err = optimize.Minimize(optimize.Problem{Func: f}, make([]float64, r.Terms), settings, &optimize.NelderMead{SimplexSize: step})
	switch {
	case evalErr != nil:
		return res, evalErr
	case ctx.Err() != nil:
		res.Interrupted = true
		return res, nil
	case err != nil:
		return res, err
	}
	return res, nil
}

// stopOn ends a minimisation when ctx is cancelled or an evaluation failed,
// and otherwise defers to inner.
type stopOn struct {
	ctx   context.Context
	err   *error
	inner optimize.Converger
}

func (s stopOn) Init(dim int) { s.inner.Init(dim) }

func (s stopOn) Converged(loc *optimize.Location) optimize.Status {
	if s.ctx.Err() != nil || *s.err != nil {
		return optimize.MethodConverge
	}
	return s.inner.Converged(loc)
}
