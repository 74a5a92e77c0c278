package sim

import "math"

// Numerics are the discretisation choices of a simulation.
type Numerics struct {
	Grid   int     // momentum states in all
	StepS  float64 // split-step time step
	Levels int     // levels of the site propagated
}

// AutoNumerics returns the grid, time step and level count for c.
//
// The momentum window covers the largest rigid-rotation momentum the
// sequence reaches, l_peak = I (max|Omega| + |Omega_bg|) / hbar, plus the
// extent of the highest propagated level of the site's oscillator,
// (sqrt(2n+1) + GridTail) l_osc with l_osc = sqrt(I omega / hbar).
// The time step resolves the trap period and the ramp.
func AutoNumerics(c Config) Numerics {
	r := c.Ring
	omega := c.TrapRadS()
	inertia := r.Inertia()
	// Levels: bound and Boltzmann-weighted, by the harmonic estimate of the
	// spacing; the exact count follows from the bands in the simulator.
	levels := 1
	if c.TemperatureK > 0 {
		spacing := Hbar * omega
		kt := Boltzmann * c.TemperatureK
		levels = 1 + int(math.Ceil(kt*math.Log(1/LevelCutoff)/spacing))
		bound := int(math.Ceil(Planck * c.DepthHz / spacing))
		levels = max(1, min(levels, bound))
	}
	if c.Levels > 0 {
		levels = c.Levels
	}
	peak := 0.0
	if c.Sequence.Up != nil {
		peak, _ = PeakSpeed(c.Sequence.Up)
	}
	lPeak := inertia * (peak + math.Abs(c.RotationRadS)) / Hbar
	lOsc := math.Sqrt(inertia * omega / Hbar)
	lMax := lPeak + (math.Sqrt(float64(2*levels-1))+GridTail)*lOsc
	n := r.Sites
	k := int(math.Ceil(2 * lMax / float64(n)))
	k += k % 2
	k = max(k, 4)

	period := 2 * math.Pi / omega
	step := period / StepsPerPeriod
	if c.Sequence.Up != nil {
		step = math.Min(step, c.Sequence.Up.Duration()/MinRampSteps)
	}
	return Numerics{Grid: n * k, StepS: step, Levels: levels}
}

// Tuning of AutoNumerics, set by the convergence tests in
// numerics_test.go to hold the contrast error to 1e-4 and the phase error
// to 1e-6 rad.
const (
	GridTail       = 4.0 // oscillator momenta beyond the highest level's turning point
	StepsPerPeriod = 12  // fourth-order (Blanes-Moan) steps per trap period
	MinRampSteps   = 6   // steps per ramp at least
)
