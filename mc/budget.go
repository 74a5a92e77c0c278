package mc

import (
	"fmt"
	"math"

	"rampart/noise"
)

// Budget is the hardware noise a Monte Carlo ensemble draws from, in SI
// units. A zero field switches its source off.
type Budget struct {
	// Static, shot-to-shot errors (standard deviations of normal draws).
	DepthCommonRel       float64 // relative depth error common to both spin states
	DepthDifferentialRel float64 // relative depth difference eps_+ - eps_- between the spin states
	ClockRel             float64 // waveform time-base error kappa: the profile plays (1+kappa) faster
	SpeedRel             float64 // drive-frequency scale error: speeds and angles scale by (1+k)
	SkewS                float64 // delay of the s = -1 arm's drive after the s = +1 arm's
	TemperatureSpreadK   float64 // shot-to-shot spread of the start temperature (clamped at 0 K)
	PulseAreaRel         float64 // relative area error of each pi/2 pulse, independent

	// Noise during the shot.
	// RIN is the one-sided PSD of the relative intensity noise eps(t) in
	// 1/Hz, common to both spin states (one laser); nil: none.
	RIN     noise.PSD
	RINBand noise.Band
	// Phase is the one-sided PSD S_alpha(f) in rad^2/Hz of each arm's drive
	// phase; the lattice angle moves by alpha/N. nil: none.
	Phase noise.PSD
	// PhaseCorrelation is the correlation coefficient of the two arms'
	// drive phase noise, in [-1, 1].
	PhaseCorrelation float64
}

// Param is one static parameter drawn per realisation: value = Sigma * x,
// x standard normal.
type Param struct {
	Name  string
	Sigma float64
}

// allParams returns every static parameter of b, active or not, in the
// fixed order of the sampler's coordinates (the drawn inputs of the static
// rows of Sources): coordinate k always drives parameter k, so that
// switching a source off or rescaling it leaves the draws of the others,
// and its own normal variates, unchanged (common random numbers across
// budgets).
func (b Budget) allParams() []Param {
	out := make([]Param, 0, StaticDim)
	for _, s := range Sources {
		if s.Kind != Static {
			continue
		}
		for _, name := range s.Inputs {
			out = append(out, Param{name, *s.Sigma(&b)})
		}
	}
	return out
}

// Params returns the active static parameters of b in sampler order.
func (b Budget) Params() []Param {
	var out []Param
	for _, p := range b.allParams() {
		if p.Sigma != 0 {
			out = append(out, p)
		}
	}
	return out
}

// Dynamic reports whether any noise source changes during a shot.
func (b Budget) Dynamic() bool { return b.RIN != nil || b.Phase != nil }

// Validate checks that every amplitude is finite and non-negative.
func (b Budget) Validate() error {
	for _, p := range b.allParams() {
		if p.Sigma < 0 || math.IsNaN(p.Sigma) || math.IsInf(p.Sigma, 0) {
			return fmt.Errorf("noise amplitude %s = %g is not a finite non-negative number", p.Name, p.Sigma)
		}
	}
	if !(b.PhaseCorrelation >= -1 && b.PhaseCorrelation <= 1) {
		return fmt.Errorf("drive phase correlation %g is outside [-1, 1]", b.PhaseCorrelation)
	}
	return nil
}

// Scaled returns the budget with every source's amplitude multiplied by k
// (standard deviations by k, PSDs by k^2): the budget's tolerance axis.
func (b Budget) Scaled(k float64) Budget {
	c := b
	for _, s := range Sources {
		if s.Kind == Static {
			*s.Sigma(&c) *= k
		} else {
			*s.PSD(&c) = scalePSD(*s.PSD(&b), k*k)
		}
	}
	return c
}

// scalePSD returns s multiplied by k: white stays white, and a PSD with a
// closed-form band integral keeps it.
func scalePSD(s noise.PSD, k float64) noise.PSD {
	switch p := s.(type) {
	case nil:
		return nil
	case noise.White:
		return noise.White{Level: k * p.Level}
	case noise.Integrable:
		return scaledIntegrable{scaledPSD{p, k}}
	}
	return scaledPSD{s, k}
}

// scaledPSD is a PSD multiplied by a constant.
type scaledPSD struct {
	s noise.PSD
	k float64
}

func (s scaledPSD) Density(f float64) float64 { return s.k * s.s.Density(f) }

// scaledIntegrable is a scaled PSD that has a closed-form band integral.
type scaledIntegrable struct{ scaledPSD }

func (s scaledIntegrable) Integral(lo, hi float64) float64 {
	return s.k * s.s.(noise.Integrable).Integral(lo, hi)
}
