package sim

import (
	"fmt"
	"math"
)

// ErrorEstimate is the estimated numerical error of a nominal shot,
// measured against a shot on a refined grid and step (see EstimateError).
type ErrorEstimate struct {
	Grid  int     `json:"grid"`   // momentum states of the shot
	StepS float64 `json:"step_s"` // split step of the shot
	// RefinedGrid and RefinedStepS are the numerics of the comparison
	// shot: twice the grid and half the step (Refine).
	RefinedGrid  int     `json:"refined_grid"`
	RefinedStepS float64 `json:"refined_step_s"`
	// ContrastChange and PhaseChangeRad are the refined shot's contrast
	// and phase minus the shot's (the phase wrapped to (-pi, pi]).
	ContrastChange float64 `json:"contrast_change"`
	PhaseChangeRad float64 `json:"phase_change_rad"`
	// ContrastError and PhaseErrorRad bound the shot's own errors:
	// |change| (1 + 1/15), see EstimateError.
	ContrastError float64 `json:"contrast_error"`
	PhaseErrorRad float64 `json:"phase_error_rad"`
	// ContrastTarget and PhaseTargetRad are the targets the estimate is
	// held to, and Met reports whether both errors are within them.
	ContrastTarget float64 `json:"contrast_target"`
	PhaseTargetRad float64 `json:"phase_target_rad"`
	Met            bool    `json:"met"`
	// Remedy says what to change when Met is false; empty otherwise.
	Remedy string `json:"remedy,omitempty"`
	// ModelBiasRad is the model error of the ring potential's treatment in
	// the bias (docs/model.md, Perturbations): the estimate of what the
	// first Magnus term over the cruise leaves out (Simulator.RingErrorRad),
	// or in an echo sequence, which applies the potential at first order,
	// the scale of the excited packets' bias that leaves out
	// (RingPotential.ExcitedBiasRad). Not part of PhaseErrorRad or Met,
	// carried beside them by the commands; zero without a potential.
	ModelBiasRad float64 `json:"first_order_model_bias_rad,omitempty"`
}

// Refine returns c with twice its grid and half its step. c must carry the
// numerics in use (Simulator.Config fills them in).
func Refine(c Config) Config {
	c.Grid, c.StepS = 2*c.Grid, c.StepS/2
	return c
}

// CompareNumerics returns the error estimate of the shot base from the
// same shot refined on the numerics of Refine.
//
// The split step is of fourth order, so halving it leaves 1/16 of the step
// error, and the change is 15/16 of it; doubling the grid at least doubles
// the window's reach beyond the packet (x -> 2x + l_peak/l_osc) and
// removes the truncation error (of order exp(-0.7 x^2), see CruiseTail)
// entirely. The shot's error is therefore the change times at most 16/15,
// which the estimate reports (docs/model.md, Numerics).
func CompareNumerics(base, refined Result) ErrorEstimate {
	dc := refined.Contrast - base.Contrast
	dp := Wrap(refined.PhaseRad - base.PhaseRad)
	e := ErrorEstimate{
		Grid:           base.Grid,
		StepS:          base.StepS,
		RefinedGrid:    refined.Grid,
		RefinedStepS:   refined.StepS,
		ContrastChange: dc,
		PhaseChangeRad: dp,
		ContrastError:  math.Abs(dc) * 16 / 15,
		PhaseErrorRad:  math.Abs(dp) * 16 / 15,
		ContrastTarget: ContrastTarget,
		PhaseTargetRad: PhaseTargetRad,
	}
	e.Met = e.ContrastError <= ContrastTarget && e.PhaseErrorRad <= PhaseTargetRad
	if !e.Met {
		e.Remedy = fmt.Sprintf("the numerics miss the targets (contrast error %.2g, target %g; phase error %.2g rad, target %g rad): "+
			"set numerics.grid = %d and numerics.step_us = %.4g (the refined numerics that measured the error), or 0 for the automatic choice if they were set by hand",
			e.ContrastError, ContrastTarget, e.PhaseErrorRad, PhaseTargetRad, refined.Grid, refined.StepS*1e6)
	}
	return e
}

// EstimateError runs the nominal shot of cfg and the same shot refined
// (Refine) and returns the estimate of the shot's numerical error. It costs
// one shot and one refined shot (about four to eight shots: the refined
// blocks are twice as large and the ramps take twice the steps).
func EstimateError(cfg Config) (ErrorEstimate, error) {
	s, err := NewSimulator(cfg)
	if err != nil {
		return ErrorEstimate{}, err
	}
	base := s.Run(Shot{}, nil)
	f, err := NewSimulator(Refine(s.Config()))
	if err != nil {
		return ErrorEstimate{}, fmt.Errorf("cannot refine the numerics to estimate their error: %w", err)
	}
	return CompareNumerics(base, f.Run(Shot{}, nil)), nil
}
