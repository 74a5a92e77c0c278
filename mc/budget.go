package mc

import (
	"fmt"
	"math"

	"rampart/noise"
)

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

// Dynamic reports whether any noise source changes during a shot: whether
// b switches on a Process row of Sources.
func (b Budget) Dynamic() bool {
	for _, s := range Sources {
		if s.Kind == Process && s.On(b) {
			return true
		}
	}
	return false
}

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
	return b.validApparatus()
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

// LossPossible reports whether a shot of the budget can be lost
// (Record.Lost): photon scattering is on and drawn shot by shot, not as a
// cloud's mean factor.
func (b Budget) LossPossible() bool {
	sc := b.Apparatus.Scattering
	return !sc.Cloud && (sc.RateS[0] > 0 || sc.RateS[1] > 0)
}
