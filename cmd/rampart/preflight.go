package main

import (
	"fmt"
	"io"
	"reflect"
	"sync"

	"rampart/sim"
)

// checked holds the numerics estimates this process has made, so that a
// command running several ensembles of one configuration (tolerance: one
// per amplitude tried) checks it once. Configurations are compared in
// full (reflect.DeepEqual follows the ramps), so a hit is always the same
// nominal shot.
var checked []checkedNumerics

type checkedNumerics struct {
	cfg sim.Config
	est sim.ErrorEstimate
}

// preflight checks the numerics of the nominal shot of cfg before an
// ensemble of it runs: sim.EstimateError compares the shot with the same
// shot on twice the grid and half the step (docs/model.md, Numerics). It
// refuses, with the estimate's remedy (exit 2), when the error misses
// sim.ContrastTarget or sim.PhaseTargetRad; what names the configuration in
// that message (a ramp of a ranking, or the scenario).
func preflight(what string, cfg sim.Config) (sim.ErrorEstimate, error) {
	s, err := sim.NewSimulator(cfg)
	if err != nil {
		return sim.ErrorEstimate{}, fmt.Errorf("%s: %w", what, err)
	}
	cfg = s.Config() // with the numerics in use
	for _, c := range checked {
		if reflect.DeepEqual(c.cfg, cfg) {
			return c.est, numericsRefusal(what, c.est)
		}
	}
	est, err := sim.EstimateError(cfg)
	if err != nil {
		return est, fmt.Errorf("%s: %w", what, err)
	}
	checked = append(checked, checkedNumerics{cfg, est})
	return est, numericsRefusal(what, est)
}

// numericsRefusal is the error of an estimate that misses its targets (nil if it
// meets them).
func numericsRefusal(what string, est sim.ErrorEstimate) error {
	if est.Met {
		return nil
	}
	return fmt.Errorf("%s: refused to run the ensemble: %s", what, est.Remedy)
}

// warnValidity writes the inputs of cfg outside the model's validity
// (sim.Config.Warnings) to stderr, one line each.
func warnValidity(stderr io.Writer, cfg sim.Config) {
	for _, w := range cfg.Warnings() {
		fmt.Fprintf(stderr, "rampart: warning: %s\n", w)
	}
}

// warned holds the ring-potential notes this process has written, so
// that a command running many ensembles of one configuration says it once.
var warned = map[string]bool{}

// warnRingModel writes a note, and returns the model error, when the ring
// potential of base leaves a model error above the phase target in the
// bias (ringModelError).
func warnRingModel(stderr io.Writer, what string, cfg sim.Config, base sim.Shot) float64 {
	e, firstOrder, ground := ringModelError(cfg, base)
	if e <= sim.PhaseTargetRad || warned[what] {
		return e
	}
	warned[what] = true
	if firstOrder {
		fmt.Fprintf(stderr, "rampart: warning: %s: the ring's tilt is applied at first order along the adiabatic path in an echo sequence; with %.2g of the atoms left outside the ground band after the ramp-up, that leaves out a bias of order %.1g rad (above the %g rad phase target), so the bias figures carry this model error; a gentler ramp reduces it (docs/model.md, Perturbations)\n",
			what, 1-ground, e, sim.PhaseTargetRad)
		return e
	}
	fmt.Fprintf(stderr, "rampart: warning: %s: the ring potential's first Magnus term over the cruise leaves an estimated %.1g rad out of the bias (above the %g rad phase target), so the bias figures carry this model error; a smaller tilt or depth harmonic, or a gentler ramp, reduces it (docs/model.md, Perturbations)\n",
		what, e, sim.PhaseTargetRad)
	return e
}

// ringModelError returns the model error of the ring potential of base in
// the bias: for an echo sequence, which applies it at first order, the
// scale of the excited-packet bias that leaves out
// (sim.RingPotential.ExcitedBiasRad at the nominal shot's ground-band
// population, which it returns too, with firstOrder set); otherwise the
// estimate of what the first Magnus term over the cruise leaves out
// (sim.Simulator.RingErrorRad). Zero without a potential. The commands
// carry it beside the numerical error (sim.ErrorEstimate.ModelBiasRad).
func ringModelError(cfg sim.Config, base sim.Shot) (bias float64, firstOrder bool, ground float64) {
	// A command runs many ensembles of one configuration and apparatus
	// (the tolerance searches: tens of them), and the estimate costs a
	// refined shot: it is computed once per configuration.
	key := fmt.Sprintf("%+v|%+v|%+v", cfg, base.Potential, base.Field)
	ringModelMu.Lock()
	defer ringModelMu.Unlock()
	if v, ok := ringModelCache[key]; ok {
		return v.bias, v.firstOrder, v.ground
	}
	bias, firstOrder, ground = ringModelErrorOf(cfg, base)
	ringModelCache[key] = ringModel{bias, firstOrder, ground}
	return bias, firstOrder, ground
}

type ringModel struct {
	bias       float64
	firstOrder bool
	ground     float64
}

var (
	ringModelMu    sync.Mutex
	ringModelCache = map[string]ringModel{}
)

// ringModelErrorOf is ringModelError without the cache.
func ringModelErrorOf(cfg sim.Config, base sim.Shot) (bias float64, firstOrder bool, ground float64) {
	s, err := sim.NewSimulator(cfg)
	if err != nil {
		return 0, false, 1 // the run itself reports it
	}
	if !cfg.Sequence.Echo() {
		return s.RingErrorRad(base), false, 1
	}
	pot := base.Potential
	if pot.TiltRad == 0 {
		return 0, true, 1
	}
	r := s.Run(sim.Shot{}, nil)
	ground = min(r.GroundAfterRampUp[0], r.GroundAfterRampUp[1])
	return pot.ExcitedBiasRad(cfg.Ring, cfg.TrapRadS(), ground), true, ground
}
