package sim

import (
	"errors"
	"fmt"
	"math"
	"sync"
	"time"
)

// Config is one interferometer sequence on the ring.
type Config struct {
	Ring         Ring
	DepthHz      float64 // V0/h
	Sequence     Sequence
	RotationRadS float64 // Omega_bg, the rotation being measured
	TemperatureK float64 // 0: ground state; otherwise a thermal mixture over the site's levels

	// Grid is the number of momentum states in all, a multiple of 2*Sites.
	// If Grid is zero, it is chosen from the trap frequency and the momentum
	// range the sequence reaches (see AutoNumerics).
	Grid int
	// StepS is the split-step time step while the drive changes. If StepS
	// is zero, it is chosen from the trap period and the ramp time.
	StepS float64
	// Levels is how many of the site's levels a thermal start propagates.
	// If Levels is zero, the levels with a Boltzmann weight above
	// LevelCutoff at TemperatureK are used.
	Levels int
}

// Validate checks the physical parameters and the closure of the arms.
func (c Config) Validate() error {
	if err := c.Ring.Validate(); err != nil {
		return err
	}
	if !(c.DepthHz > 0) || math.IsInf(c.DepthHz, 0) {
		return fmt.Errorf("lattice depth %g Hz is not a positive finite depth", c.DepthHz)
	}
	if c.Sequence.Up == nil {
		return errors.New("no ramp")
	}
	if math.IsNaN(c.RotationRadS) || math.IsInf(c.RotationRadS, 0) {
		return fmt.Errorf("rotation %g rad/s is not finite", c.RotationRadS)
	}
	if c.TemperatureK < 0 || math.IsNaN(c.TemperatureK) || math.IsInf(c.TemperatureK, 0) {
		return fmt.Errorf("temperature %g K is not a finite non-negative temperature", c.TemperatureK)
	}
	if c.StepS < 0 || math.IsNaN(c.StepS) {
		return fmt.Errorf("time step %g s is negative", c.StepS)
	}
	if q := c.Sequence; q.Segments < 0 || q.HoldS < 0 || math.IsNaN(q.HoldS) || math.IsInf(q.HoldS, 0) {
		return fmt.Errorf("echo of %d segments with a hold of %g s: need a non-negative count and a finite non-negative hold", q.Segments, q.HoldS)
	}
	// An echo's arms must meet at every swap: each segment closes.
	return CheckClosure(c.Sequence.Segment().TotalAngle()/(2*math.Pi), c.Ring.Sites)
}

// TrapRadS returns the harmonic trap angular frequency omega = 2 pi nu of
// one site at the lattice depth.
func (c Config) TrapRadS() float64 { return 2 * math.Pi * c.Ring.TrapHz(c.DepthHz) }

// Shot is what one realisation perturbs. The zero value is the nominal
// shot. Index 0 is the arm s = +1, index 1 the arm s = -1.
type Shot struct {
	DepthRel     [2]float64 // static relative depth error of each arm's lattice
	ClockRel     float64    // waveform time-base error kappa: the profile plays (1+kappa) faster
	SpeedRel     float64    // drive-frequency scale error k: speeds and angles scale by (1+k)
	SkewS        float64    // the arm s = -1 drive starts SkewS after the arm s = +1 drive (negative: before)
	PulseAreaRel [2]float64 // relative area errors of the two pi/2 pulses
	SwapAreaRel  float64    // relative area error of every swap (pi) pulse of an echo sequence
	// TemperatureOffsetK shifts the start temperature of this shot from
	// Config.TemperatureK (clamped at 0). The levels propagated are those
	// with a weight above LevelCutoff at the shot's temperature, at most
	// Config.Levels.
	TemperatureOffsetK float64
	Jitter             [2]*Series // lattice angle noise delta a_s(t) in rad
	DepthNoise         [2]*Series // relative depth noise eps_s(t)

	// Apparatus perturbations (sim/apparatus.go).
	Field      FieldShift // differential frequency shift of arm s = +1
	Scattering Scattering // photon scattering of each arm
	RadiusRel  float64    // true radius R (1 + r) against the nominal R
	// Potential is a static potential around the ring in the apparatus frame
	// (tilt, depth harmonics), in both arms' Hamiltonians (sim/ringexact.go;
	// at first order in echo sequences, sim/ringpotential.go).
	Potential RingPotential
	// RotationOffsetRadS is the platform's rotation rate in this shot less
	// the nominal Config.RotationRadS: the arms move in a frame turning at
	// Omega_bg + dOmega, while the Sagnac phase a result is compared with is
	// the nominal K Omega_bg, so the bias moves by K dOmega
	// (docs/model.md, Perturbations, platform rotation).
	RotationOffsetRadS float64
	// RotationNoise is the platform's rotation-rate noise delta Omega(t)
	// during the shot, rad/s (nil: none), applied through the arms'
	// enclosed-area rate (RotationNoisePhaseRad).
	RotationNoise *Series
}

// Level is the contribution of one of the site's levels to a thermal start.
type Level struct {
	Band     int
	Weight   float64    // Boltzmann weight p_n
	EnergyHz float64    // band mean energy E/h
	Z        complex128 // overlap of the arms started in this level
}

// Result is the outcome of one shot.
type Result struct {
	Z            complex128 // sum_n p_n <psi_-|psi_+>, times the pulse factor
	Contrast     float64    // |Z|
	PhaseRad     float64    // arg Z
	SagnacRad    float64    // 2 I phi(T) Omega_bg / hbar
	ScaleFactorS float64    // K = 2 I phi(T) / hbar, rad per rad/s
	BiasRad      float64    // wrap(Phase - Sagnac) to (-pi, pi]
	BiasRadS     float64    // BiasRad / K
	BiasDegPerH  float64    // BiasRadS in deg/h
	// GroundAfterRampUp is each arm's ground-band population (of the
	// co-moving lattice) at the end of the ramp-up, for the lowest level.
	GroundAfterRampUp [2]float64
	Levels            []Level
	Grid              int
	StepS             float64
	Elapsed           time.Duration
}

// Simulator runs shots of one configuration.
type Simulator struct {
	cfg   Config
	basis Basis
	step  float64
	lev   int
	// splitOnly makes Run take split steps of splitStep through the
	// constant stretches too (the fine-step reference of the tests).
	splitOnly bool
	splitStep float64
	// work pools the *shotWork that shots reuse (sim/shotwork.go);
	// copies of the simulator share it.
	work *sync.Pool
	// gridCruise makes noisy constant stretches run on the full grid
	// rather than in the cut band basis (sim/reduced.go).
	gridCruise bool
	// noiseDiv, if above 1, divides the noisy stretches' intervals by it
	// (the refined run of the tests' error estimates; same records).
	noiseDiv int
	// ringPieceRad, if positive, cuts the constant stretches of a shot
	// with a ring potential into pieces (ringOp.pieceRad).
	ringPieceRad float64
}

// MaxRampSteps bounds the split steps of a shot's two ramps: at about a
// microsecond of CPU per step and block at the usual grids, 10^6 steps is
// already seconds a shot; a step that needs more comes from a ramp table
// with a near-discontinuity, which the automatic step resolves
// (Tabulated.TimeScaleS) rather than skips.
const MaxRampSteps = 1_000_000

// NewSimulator validates cfg, fixes the numerics and returns a simulator.
func NewSimulator(cfg Config) (*Simulator, error) {
	if err := cfg.Validate(); err != nil {
		return nil, err
	}
	grid, step := cfg.Grid, cfg.StepS
	auto := AutoNumerics(cfg)
	if grid == 0 {
		grid = auto.Grid
	}
	if step == 0 {
		step = auto.StepS
	}
	q := cfg.Sequence
	if n := float64(max(q.Segments, 1)) * (q.Up.Duration() + q.RampDown().Duration()) / step; n > MaxRampSteps {
		why := "numerics.step_us"
		if cfg.StepS == 0 {
			why = "the ramp's steepest stretch (a tabulated ramp: smooth its steepest rows, or set numerics.step_us)"
		}
		return nil, fmt.Errorf("the ramps would take %.3g split steps of %.3g s, more than the %g rampart runs in a shot: the step is set by %s", n, step, float64(MaxRampSteps), why)
	}
	if grid > MaxGrid {
		return nil, fmt.Errorf("the momentum grid would need %d states, more than the %d rampart handles (memory and time grow as grid^2 / sites): lower the cruise speed, the temperature or numerics.grid", grid, MaxGrid)
	}
	b, err := NewBasis(cfg.Ring.Sites, grid)
	if err != nil {
		return nil, err
	}
	lev := cfg.Levels
	if lev == 0 {
		lev = auto.Levels
	}
	if lev > b.Block {
		lev = b.Block
	}
	return &Simulator{cfg: cfg, basis: b, step: step, lev: lev, work: new(sync.Pool)}, nil
}

// Config returns the configuration with the numerics in use filled in.
func (s *Simulator) Config() Config {
	c := s.cfg
	c.Grid, c.StepS, c.Levels = s.basis.Size(), s.step, s.lev
	return c
}

// drives returns the two arms' drives for a shot.
func (s *Simulator) drives(sh Shot) [2]Drive {
	var d [2]Drive
	delay := [2]float64{0, sh.SkewS}
	if sh.SkewS < 0 {
		delay = [2]float64{-sh.SkewS, 0}
	}
	for a, sign := range [2]float64{1, -1} {
		d[a] = Drive{
			Seq:          s.cfg.Sequence,
			Sign:         sign,
			Rate:         1 + sh.ClockRel,
			Scale:        1 + sh.SpeedRel,
			DelayS:       delay[a],
			RotationRadS: s.cfg.RotationRadS + sh.RotationOffsetRadS,
			DepthRel:     sh.DepthRel[a],
			Jitter:       sh.Jitter[a],
			DepthNoise:   sh.DepthNoise[a],
		}
	}
	return d
}

// Run simulates one shot. If obs is not nil it is called with the state of
// each arm along the way (see Observer).
func (s *Simulator) Run(sh Shot, obs Observer) Result {
	if s.cfg.Sequence.echo() {
		return s.runEcho(sh, obs)
	}
	start := time.Now()
	cfg, b := s.cfg, s.basis
	wk := s.shotWork()
	defer s.work.Put(wk)
	st := s.startSet(sh, wk)
	omega, lev, starts := st.omega, st.lev, st.starts

	drives := s.drives(sh)
	end := math.Max(drives[0].times()[3], drives[1].times()[3])
	// Noisy constant stretches are cut into intervals of at most half the
	// split step and a fortieth of the trap period: each splits the noise
	// from the exact commanded motion with an error of relative order
	// (omega tau)^2 / 12 in the noise's effect (0.2 %), and resolves twice
	// the band that NoiseBandHz gives.
	noiseStep := s.noiseStep()

	var res Result
	var fields [2]*field
	pot := sh.Potential.withGradient(sh.Field, cfg.Ring)
	v0 := 2 * math.Pi * cfg.DepthHz
	for a, d := range drives {
		f := newField(b, lev)
		for n, st := range starts {
			f.set(n, st)
		}
		p := wk.props[a]
		p.gridCruise = s.gridCruise
		p.ring = nil
		if !pot.zero() {
			// The ring potential in the propagation (sim/ringexact.go).
			p.ring = wk.ringOp(a, pot.waves(cfg.Ring, v0, d.Sign), d.RotationRadS)
			p.ring.pieceRad = s.ringPieceRad
		}
		tm := d.times()
		var rest *eigensystem // of the lattice at rest, diagonalised if a rest stretch needs it
		stretch := func(w, t0, t1 float64, es *eigensystem) *eigensystem {
			switch {
			case s.splitOnly:
				p.splitSteps(f, d, t0, t1, int(math.Ceil((t1-t0)/s.splitStep)))
				return es
			case es == nil && t1-t0 < shortStretch*s.step:
				// A few split steps cost less than diagonalising (a skew
				// of nanoseconds before or after one arm's motion).
				p.splitSteps(f, d, t0, t1, s.steps(t1-t0))
				return nil
			}
			return p.stretch(f, d, w, t0, t1, noiseStep, es)
		}
		rest = stretch(omega, 0, tm[0], rest)
		p.observe(obs, a, tm[0], f, d, rest)
		p.splitStepsObserved(f, d, tm[0], tm[1], s.steps(tm[1]-tm[0]), obs, a)
		cruise := wk.cruiseSystem(a, p, d.cruiseSpeed(), 1+d.DepthRel)
		res.GroundAfterRampUp[a] = groundPopulation(f, cruise, 0)
		if tm[1] == tm[0] {
			p.observe(obs, a, tm[1], f, d, cruise)
		}
		if s.splitOnly {
			stretch(0, tm[1], tm[2], nil)
		} else {
			p.stretchObserved(f, d, d.cruiseSpeed(), tm[1], tm[2], noiseStep, cruise, obs, a)
		}
		p.splitStepsObserved(f, d, tm[2], tm[3], s.steps(tm[3]-tm[2]), obs, a)
		stretch(omega, tm[3], end, rest)
		if end > tm[3] {
			p.observe(obs, a, end, f, d, rest)
		}
		p.ring = nil
		fields[a] = f
	}

	// Lab frame: psi_l = chi_l exp(-i l a(T)).
	da := drives[0].Angle(end) - drives[1].Angle(end)
	pulse := math.Sin(math.Pi/2*(1+sh.PulseAreaRel[0])) * math.Sin(math.Pi/2*(1+sh.PulseAreaRel[1]))
	for n := range lev {
		z := overlap(b, fields[0].get(n), fields[1].get(n), da)
		res.Levels = append(res.Levels, Level{Band: n, Weight: st.weights[n], EnergyHz: st.means[n] / (2 * math.Pi), Z: z})
		res.Z += complex(st.weights[n]*pulse, 0) * z
	}
	res.Z *= s.apparatus(sh, drives, end)
	return s.finish(res, start)
}

// startSet is the start of a shot: the levels propagated, their Wannier
// states and Boltzmann weights, and the shot's true rotation.
type startSet struct {
	omega   float64 // Omega_bg + dOmega, rad/s
	lev     int
	means   []float64 // band-mean energies, rad/s
	weights []float64
	starts  []State
}

func (s *Simulator) startSet(sh Shot, wk *shotWork) startSet {
	cfg, b := s.cfg, s.basis
	v0 := 2 * math.Pi * cfg.DepthHz
	rot := cfg.Ring.rotationalRate()
	gStart := 1 + (sh.DepthRel[0]+sh.DepthRel[1])/2
	omega := cfg.RotationRadS + sh.RotationOffsetRadS // the shot's true rotation
	es0 := wk.restBands(b, rot, omega, gStart*v0, s.lev)
	means := bandMeans(*es0)
	temp := math.Max(0, cfg.TemperatureK+sh.TemperatureOffsetK)
	lev := min(s.lev, thermalLevels(means, temp))
	trap := 2 * math.Pi * cfg.Ring.TrapHz(cfg.DepthHz*gStart)
	return startSet{omega: omega, lev: lev, means: means, weights: thermalWeights(means[:lev], temp),
		starts: wk.startStates(b, cfg.Ring, lev, trap)}
}

// overlap returns <psi_-|psi_+> in the laboratory frame for the co-moving
// states plus and minus whose lattices end da = a_+(T) - a_-(T) apart:
// psi_l = chi_l exp(-i l a(T)).
func overlap(b Basis, plus, minus State, da float64) complex128 {
	var z complex128
	for i := range plus.Amp {
		l := float64(b.LMin() + i)
		z += complexConj(minus.Amp[i]) * plus.Amp[i] * cis(-l*da)
	}
	return z
}

// finish fills in the contrast, phase, Sagnac phase and bias of res.
func (s *Simulator) finish(res Result, start time.Time) Result {
	cfg, b := s.cfg, s.basis
	phi := cfg.Sequence.TotalAngle()
	res.Contrast = cmplxAbs(res.Z)
	res.PhaseRad = math.Atan2(imag(res.Z), real(res.Z))
	res.ScaleFactorS = cfg.Ring.ScaleFactor(phi)
	res.SagnacRad = res.ScaleFactorS * cfg.RotationRadS
	res.BiasRad = Wrap(res.PhaseRad - res.SagnacRad)
	res.BiasRadS = res.BiasRad / res.ScaleFactorS
	res.BiasDegPerH = RadPerSToDegPerH(res.BiasRadS)
	res.Grid, res.StepS = b.Size(), s.step
	res.Elapsed = time.Since(start)
	return res
}

// MaxGrid is the largest momentum grid a Simulator accepts.
const MaxGrid = 1 << 14

// shortStretch is the length, in split steps, below which a constant
// stretch is split-stepped rather than diagonalised.
const shortStretch = 4

func (s *Simulator) steps(d float64) int {
	if d <= 0 {
		return 0
	}
	return int(math.Ceil(d/s.step - 1e-9))
}

func diagonaliseFor(p *propagator, w, g float64) *eigensystem {
	e := diagonalise(p.b, p.rot, w, g*p.v0)
	return &e
}

// noiseStep is the longest interval of a noisy constant stretch: half the
// split step and a fortieth of the trap period (divided by noiseDiv).
func (s *Simulator) noiseStep() float64 {
	h := math.Min(s.step/2, 2*math.Pi/s.cfg.TrapRadS()/40)
	if s.noiseDiv > 1 {
		h /= float64(s.noiseDiv)
	}
	return h
}

// NoiseBandHz returns the highest noise frequency the split step resolves,
// 1/(2 StepS): the default upper band edge of noise records for a shot.
func (s *Simulator) NoiseBandHz() float64 { return 1 / (2 * s.step) }

// Wrap returns x wrapped to (-pi, pi].
func Wrap(x float64) float64 {
	y := math.Mod(x+math.Pi, 2*math.Pi)
	if y <= 0 {
		y += 2 * math.Pi
	}
	return y - math.Pi
}

// RadPerSToDegPerH converts a rotation rate from rad/s to deg/h.
func RadPerSToDegPerH(x float64) float64 { return x * 180 / math.Pi * 3600 }

func complexConj(z complex128) complex128 { return complex(real(z), -imag(z)) }

func cmplxAbs(z complex128) float64 { return math.Hypot(real(z), imag(z)) }
