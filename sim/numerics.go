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
//
//	l_max = l_peak + (sqrt(2n-1) - 1 + x) l_osc,   l_osc = sqrt(I omega / hbar),
//
// with n the number of levels and x the distance, in oscillator momenta,
// from the ground state's packet centre to the window's edge. x is the
// larger of 1 + GridTail (which holds the short ramps' errors, tuned by
// TestAutoNumericsAccuracy) and the cruise requirement CruiseTail(omega T):
// the truncated window shifts the energy of every block eigenstate, and
// that shift accumulates as phase over the whole sequence T (see
// docs/model.md, Numerics). The time step resolves the trap period and the
// ramp: MinRampSteps steps per ramp, and for a tabulated ramp as many per
// pi/2 of its time scale |Omega_0| / max|dOmega/dt| (Tabulated.TimeScaleS),
// so that a table with one steep row is stepped as finely as a sin^2 ramp
// of that steepness.
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
	peak, total := 0.0, 0.0
	if c.Sequence.Up != nil {
		peak, _ = PeakSpeed(c.Sequence.Up)
		if c.Sequence.Down != nil {
			peak = math.Max(peak, first(PeakSpeed(c.Sequence.Down)))
		}
		total = c.Sequence.Duration()
	}
	lPeak := inertia * (peak + math.Abs(c.RotationRadS)) / Hbar
	lOsc := math.Sqrt(inertia * omega / Hbar)
	x := math.Max(1+GridTail, CruiseTail(omega*total))
	lMax := lPeak + (math.Sqrt(float64(2*levels-1))-1+x)*lOsc
	n := r.Sites
	k := int(math.Ceil(2 * lMax / float64(n)))
	k += k % 2
	k = max(k, 4)

	period := 2 * math.Pi / omega
	step := period / StepsPerPeriod
	if c.Sequence.Up != nil {
		for _, r := range []Ramp{c.Sequence.Up, c.Sequence.RampDown()} {
			step = math.Min(step, r.Duration()/MinRampSteps)
			// A table may turn far faster than its duration suggests (one
			// steep row): its steepest stretch gets the steps a sin^2 ramp of
			// the same steepness would, whose duration is pi/2 times its
			// time scale.
			if ts, ok := r.(interface{ TimeScaleS() float64 }); ok {
				step = math.Min(step, math.Pi/2*ts.TimeScaleS()/MinRampSteps)
			}
		}
	}
	return Numerics{Grid: n * k, StepS: step, Levels: levels}
}

// CruiseTail returns the distance x, in oscillator momenta l_osc, from the
// ground state's packet centre to the edge of the momentum window that holds
// the phase accumulated over omegaT = omega T (trap frequency times the whole
// sequence) to PhaseTargetRad.
//
// Derivation (docs/model.md, Numerics): in the harmonic limit the ground
// state's momentum density is exp(-p^2) / sqrt(pi) with p = (l - l0) / l_osc.
// Cutting the basis at p = x removes a weight of order exp(-x^2) from each
// block eigenstate and shifts its energy by that weight times a kinetic
// energy of order hbar omega. The arms' windows sit differently around
// their packets (the arms move in opposite directions and the window is
// symmetric only up to one class), so their shifts do not cancel, and the
// phase error grows linearly with the time spent in the eigenstates:
//
//	dPhi ~ A omega T exp(-a x^2),  x_T = sqrt(ln(A omega T / eps) / a).
//
// The cosine lattice's tails are wider than the harmonic Gaussian (a = 1):
// on the 20-site and 12-site rings of TestCruiseGrid (5 um, 20 kHz, sin2
// to 50 pi rad/s, 10^4 laps) the phase error fell by exp(-a dx^2) with a
// between 0.75 and 0.85 as the block grew, with A = exp(-4.3 .. -4.6).
// CruiseDecay = 0.7 sits below the measured a and CruisePrefactor = 0.1
// ten times above the measured A.
func CruiseTail(omegaT float64) float64 {
	r := CruisePrefactor * omegaT / PhaseTargetRad
	if r <= 1 {
		return 0
	}
	return math.Sqrt(math.Log(r) / CruiseDecay)
}

// The accuracy that AutoNumerics aims at and EstimateError checks: the
// issue's targets for a nominal shot.
const (
	ContrastTarget = 1e-4 // absolute error of the contrast |z|
	PhaseTargetRad = 1e-6 // error of the interferometer phase arg z
)

// Tuning of AutoNumerics, set by the convergence tests in
// numerics_test.go to hold the contrast error to ContrastTarget and the
// phase error to PhaseTargetRad.
const (
	GridTail       = 4.0 // oscillator momenta beyond the highest level's turning point
	StepsPerPeriod = 12  // fourth-order (Blanes-Moan) steps per trap period
	MinRampSteps   = 6   // steps per ramp at least
	// CruiseDecay is the exponent a of the phase error's decay
	// exp(-a x^2) with the window's distance x (see CruiseTail).
	CruiseDecay = 0.7
	// CruisePrefactor bounds the prefactor A of the phase error
	// A omega T exp(-a x^2) (measured: 0.01, see CruiseTail).
	CruisePrefactor = 0.1
)

func first(x float64, _ bool) float64 { return x }
