package mc

import (
	"fmt"
	"math"
	"math/rand/v2"

	"rampart/noise"
	"rampart/sim"
)

// Ensemble is a Monte Carlo ensemble of shots of one interferometer
// configuration under a noise budget.
type Ensemble struct {
	Config  sim.Config
	Budget  Budget
	Samples int
	Seed    uint64
	// Sampler is the design of the static parameters: "random" (the
	// default when empty), "lhs" (Latin hypercube) or "sobol" (Owen-scrambled
	// Sobol' points).
	Sampler string
	// NoiseStepS and NoiseDurationS fix the grid of the noise records. If
	// zero, the step is a quarter of the simulation's split step and the duration the
	// longest shot the static draws can make; ensembles compared on common
	// random numbers (several ramps) must share one grid.
	NoiseStepS     float64
	NoiseDurationS float64
	// ScaleFactor measures each realisation's scale-factor error K_shot /
	// K - 1 (Record.ScaleFactorErrorPPM) from two more shots at Omega +- h,
	// as sim.Simulator.Gyro does: three shots per realisation.
	ScaleFactor bool
}

// Samplers lists the accepted values of Ensemble.Sampler.
var Samplers = []string{"random", "lhs", "sobol"}

// Realiser turns realisation indices into shots and runs them. It is safe
// for concurrent use when each goroutine has its own Worker.
type Realiser struct {
	ens       Ensemble
	sim       *sim.Simulator
	rotated   [2]*sim.Simulator // at Omega + h and Omega - h (ScaleFactor)
	gyroStep  float64           // h
	params    []Param
	design    Sampler
	noiseStep float64
	rin       *noise.Synthesizer
	phase     *noise.Synthesizer
	field     *noise.Synthesizer
	rotation  *noise.Synthesizer
	// Streamed records (longer than StreamSamples): rinStream and
	// phaseStream replace rin and phase; noiseN is the records' length.
	rinStream   *noise.StreamSynthesizer
	phaseStream *noise.StreamSynthesizer
	noiseN      int
	// The grid of the waveforms (the mains line): that of the noise
	// records.
	waveStep float64
	waveN    int
}

// NewRealiser validates the ensemble and prepares its simulator, design and
// noise synthesisers. The grid and step of the nominal shot serve every
// realisation, so that realisations differ only by what they perturb; the
// propagated levels cover the start temperature plus four spreads.
func NewRealiser(e Ensemble) (*Realiser, error) {
	if e.Samples < 1 || e.Samples > MaxSamples {
		return nil, fmt.Errorf("samples = %d, need from 1 to %d", e.Samples, MaxSamples)
	}
	if err := e.Budget.Validate(); err != nil {
		return nil, err
	}
	cfg := e.Config
	if e.Budget.TemperatureSpreadK > 0 && cfg.Levels == 0 {
		hot := cfg
		hot.TemperatureK += 4 * e.Budget.TemperatureSpreadK
		cfg.Levels = sim.AutoNumerics(hot).Levels
		if cfg.Grid == 0 {
			cfg.Grid = sim.AutoNumerics(hot).Grid
		}
	}
	s, err := sim.NewSimulator(cfg)
	if err != nil {
		return nil, err
	}
	r := &Realiser{ens: e, sim: s, params: e.Budget.Params()}
	r.ens.Config = s.Config()
	if e.ScaleFactor {
		// The rotated shots share the nominal numerics, so that their
		// discretisation errors largely cancel in the difference.
		k := r.ens.Config.Ring.ScaleFactor(r.ens.Config.Sequence.TotalAngle())
		r.gyroStep = sim.GyroPhaseStep / k
		for i, sign := range [2]float64{1, -1} {
			c := r.ens.Config
			c.RotationRadS += sign * r.gyroStep
			if r.rotated[i], err = sim.NewSimulator(c); err != nil {
				return nil, err
			}
		}
	}
	if d := StaticDim; len(r.params) > 0 {
		switch e.Sampler {
		case "", "random":
			r.design = Normal(NewRandom(d, e.Samples, e.Seed))
		case "lhs":
			r.design = Normal(NewLatinHypercube(d, e.Samples, e.Seed))
		case "sobol":
			if d > SobolMaxDim {
				return nil, fmt.Errorf("sobol sampler supports at most %d parameters, the budget has %d", SobolMaxDim, d)
			}
			r.design = Normal(NewSobol(d, e.Samples, e.Seed, Owen))
		default:
			return nil, fmt.Errorf("unknown sampler %q (want random, lhs or sobol)", e.Sampler)
		}
	}
	if e.Budget.Dynamic() {
		if err := r.prepareNoise(); err != nil {
			return nil, err
		}
	}
	if e.Budget.MainsG > 0 {
		r.waveStep, r.waveN = r.noiseGrid()
	}
	return r, nil
}

// prepareNoise sets up the noise grid: the split step of the simulation
// (which resolves the trap motion) over the longest shot the static draws
// can make, six standard deviations out.
func (r *Realiser) prepareNoise() error {
	b := r.ens.Budget
	// Four samples per split step: the propagator interpolates the records
	// linearly, which filters their PSD by sinc^4(pi f dt); at a quarter
	// step that costs 0.3 % at twice the trap frequency.
	var n int
	r.noiseStep, n = r.noiseGrid()
	// The default band is what the simulation's split step resolves; the
	// records are sampled finer only to keep interpolation from filtering it.
	top := r.sim.NoiseBandHz()
	rinBand := b.RINBand
	if rinBand.HighHz == 0 {
		rinBand.HighHz = top
	}
	var err error
	r.noiseN = n
	if n > streamAbove {
		if b.RIN != nil {
			if r.rinStream, err = noise.NewStreamSynthesizer(b.RIN, r.noiseStep, streamBand(rinBand, r.noiseStep)); err != nil {
				return fmt.Errorf("intensity noise: %w", err)
			}
		}
		if b.Phase != nil {
			if r.phaseStream, err = noise.NewStreamSynthesizer(b.Phase, r.noiseStep, streamBand(noise.Band{HighHz: top}, r.noiseStep)); err != nil {
				return fmt.Errorf("drive phase noise: %w", err)
			}
		}
	} else if b.RIN != nil {
		if r.rin, err = noise.NewSynthesizer(b.RIN, n, r.noiseStep, rinBand); err != nil {
			return fmt.Errorf("intensity noise: %w", err)
		}
	}
	if b.Phase != nil && r.phaseStream == nil {
		if r.phase, err = noise.NewSynthesizer(b.Phase, n, r.noiseStep, noise.Band{HighHz: top}); err != nil {
			return fmt.Errorf("drive phase noise: %w", err)
		}
	}
	if b.FieldNoise != nil {
		if r.field, err = noise.NewSynthesizer(b.FieldNoise, n, r.noiseStep, noise.Band{HighHz: top}); err != nil {
			return fmt.Errorf("field noise: %w", err)
		}
	}
	if b.RotationNoise != nil {
		if r.rotation, err = noise.NewSynthesizer(b.RotationNoise, n, r.noiseStep, noise.Band{HighHz: top}); err != nil {
			return fmt.Errorf("rotation noise: %w", err)
		}
	}
	return nil
}

// noiseGrid returns the step and length of the noise records.
func (r *Realiser) noiseGrid() (float64, int) {
	cfg, b := r.ens.Config, r.ens.Budget
	step := cfg.StepS / NoiseSamplesPerStep
	if r.ens.NoiseStepS > 0 {
		step = r.ens.NoiseStepS
	}
	long := NoiseDuration(cfg, b)
	if r.ens.NoiseDurationS > 0 {
		long = r.ens.NoiseDurationS
	}
	return step, int(math.Ceil(long/step)) + 2
}

// NoiseDuration returns the length of the noise records an ensemble of cfg
// under b needs: the longest shot its static draws can make, six standard
// deviations out in the clock-rate error and the skew. Ensembles that share
// random numbers across budgets (a tolerance search) size one grid with the
// widest budget they use.
func NoiseDuration(cfg sim.Config, b Budget) float64 {
	return cfg.Sequence.Duration()*(1+6*b.ClockRel) + 6*b.SkewS
}

// NoiseSamplesPerStep is the number of noise samples per split step.
const NoiseSamplesPerStep = 4

// Config returns the nominal configuration with its numerics filled in.
func (r *Realiser) Config() sim.Config { return r.ens.Config }

// Ensemble returns the ensemble.
func (r *Realiser) Ensemble() Ensemble { return r.ens }

// Params returns the active static parameters.
func (r *Realiser) Params() []Param { return r.params }

// NoiseStepS returns the time step of the synthesised noise records (0
// without noise during the shot).
func (r *Realiser) NoiseStepS() float64 { return r.noiseStep }

// Worker holds one goroutine's scratch space.
type Worker struct {
	r      *Realiser
	point  []float64
	rin    *noise.Synthesizer
	phase  *noise.Synthesizer
	bufRIN []float64
	bufA   []float64
	bufB   []float64
	field  *noise.Synthesizer
	rot    *noise.Synthesizer
	// Streams of the streamed records: intensity, and the drive phase x1
	// of arm s = +1, its replica for arm s = -1 and the independent part y.
	rinS    *noise.Stream
	phaseS  [3]*noise.Stream
	scratch []float64
}

// NewWorker returns scratch space for one goroutine.
func (r *Realiser) NewWorker() *Worker {
	w := &Worker{r: r, point: make([]float64, StaticDim)}
	if r.rin != nil {
		w.rin = r.rin.Clone()
		w.bufRIN = make([]float64, r.rin.Len())
	}
	if r.phase != nil {
		w.phase = r.phase.Clone()
		w.bufA = make([]float64, r.phase.Len())
		w.bufB = make([]float64, r.phase.Len())
	}
	if r.field != nil {
		w.field = r.field.Clone()
	}
	if r.rotation != nil {
		w.rot = r.rotation.Clone()
	}
	none := func() *rand.Rand { return rand.New(rand.NewPCG(0, 0)) }
	if r.rinStream != nil {
		w.rinS = r.rinStream.NewStream(none)
	}
	if r.phaseStream != nil {
		// Uncorrelated arms need no replica of x1.
		k := 3
		if r.ens.Budget.PhaseCorrelation == 0 {
			k = 2
		}
		copy(w.phaseS[:], r.phaseStream.NewStreams(k, none))
	}
	if w.rinS != nil || w.phaseS[0] != nil {
		w.scratch = make([]float64, 4096)
	}
	return w
}

// Shot returns the perturbation of realisation i and the drawn static
// inputs, in the order of Params.
func (w *Worker) Shot(i int) (sim.Shot, Record) {
	if w.r.design != nil {
		w.r.design.Point(i, w.point)
	}
	return w.ShotAt(i, w.point, [4]int{i, i, i, i})
}

// ShotAt returns the perturbation of a shot whose static parameters are
// the standard normal variates z (length StaticDim, coordinate k for the
// k-th parameter of the budget whether active or not) and whose intensity
// and drive phase noise records are those of realisations noise[0] and
// noise[1], the field noise record that of noise[2] and the rotation
// noise record that of noise[3]. Designs that recombine inputs (Sobol'
// indices) use it; Shot(i) is ShotAt(i, point i of the design,
// {i, i, i, i}). Streamed records (longer than StreamSamples) read the
// worker's streams: a shot's records are valid until the worker's next
// Shot or ShotAt.
func (w *Worker) ShotAt(index int, z []float64, noise [4]int) (sim.Shot, Record) {
	r := w.r
	if len(z) != StaticDim {
		panic("mc: ShotAt needs StaticDim normal variates")
	}
	rec := Record{Index: index, Inputs: make([]float64, len(r.params))}
	sh := r.ens.Budget.Apparatus
	if sh.Scattering.RateS != [2]float64{} {
		// Each realisation is one atom: it scatters or not (docs/model.md,
		// Perturbations, photon scattering), from its own stream.
		sh.Scattering.Cloud = false
		sh.Scattering.Uniform = Substream(r.ens.Seed, index, "scattering").Float64()
	}
	type wave struct {
		src Source
		z   float64
	}
	var waves []wave
	k, active := 0, 0
	for _, src := range Sources {
		if src.Kind != Static {
			continue
		}
		sigma := *src.Sigma(&r.ens.Budget)
		for i := range src.Inputs {
			if sigma != 0 {
				v := sigma * z[k]
				rec.Inputs[active] = v
				active++
				if src.Waveform != nil {
					waves = append(waves, wave{src, z[k]})
				} else {
					src.Apply(&sh, i, v)
				}
			}
			k++
		}
	}
	if w.rin != nil {
		x := w.rin.Synthesize(w.bufRIN, Substream(r.ens.Seed, noise[0], "noise/rin"))
		s := &sim.Series{StepS: r.noiseStep, Values: x}
		rinRow.ApplyNoise(&sh, [2]*sim.Series{s, s})
		rec.RINRms = rms(x)
	}
	if w.phase != nil {
		w.phase.SynthesizePair(w.bufA, w.bufB, r.ens.Budget.PhaseCorrelation, Substream(r.ens.Seed, noise[1], "noise/phase"))
		n := float64(r.ens.Config.Ring.Sites)
		a, b := make([]float64, len(w.bufA)), make([]float64, len(w.bufB))
		for j := range a {
			a[j], b[j] = w.bufA[j]/n, w.bufB[j]/n
		}
		phaseRow.ApplyNoise(&sh, [2]*sim.Series{{StepS: r.noiseStep, Values: a}, {StepS: r.noiseStep, Values: b}})
		rec.PhaseRms = [2]float64{rms(w.bufA), rms(w.bufB)}
	}
	if w.rinS != nil {
		w.rinS.Restart(substream(r.ens.Seed, noise[0], "noise/rin"))
		s := &sim.Series{StepS: r.noiseStep, Stream: w.rinS, N: r.noiseN}
		rinRow.ApplyNoise(&sh, [2]*sim.Series{s, s})
		rec.RINRms = streamRMS(w.rinS, r.noiseN, w.scratch)
	}
	if w.phaseS[0] != nil {
		// x1 for arm s = +1 and rho x1 + sqrt(1 - rho^2) y for arm s = -1,
		// as Synthesizer.SynthesizePair, from two substreams.
		n, rho := float64(r.ens.Config.Ring.Sites), r.ens.Budget.PhaseCorrelation
		x1 := substream(r.ens.Seed, noise[1], "noise/phase")
		y := substream(r.ens.Seed, noise[1], "noise/phase/independent")
		w.phaseS[0].Restart(x1)
		w.phaseS[1].Restart(y)
		a := &mixStream{a: w.phaseS[0], ca: 1 / n}
		b := &mixStream{a: w.phaseS[1], ca: math.Sqrt(1-rho*rho) / n}
		if w.phaseS[2] != nil {
			w.phaseS[2].Restart(x1)
			b.b, b.cb = w.phaseS[2], rho/n
		}
		rec.PhaseRms = [2]float64{n * streamRMS(a, r.noiseN, w.scratch), n * streamRMS(b, r.noiseN, w.scratch)}
		phaseRow.ApplyNoise(&sh, [2]*sim.Series{{StepS: r.noiseStep, Stream: a, N: r.noiseN}, {StepS: r.noiseStep, Stream: b, N: r.noiseN}})
	}
	if w.field != nil {
		// One record of the field, in G; its rms is not a column of the
		// records.
		x := w.field.Synthesize(make([]float64, w.field.Len()), Substream(r.ens.Seed, noise[2], "noise/field"))
		fieldRow.ApplyNoise(&sh, [2]*sim.Series{{StepS: r.noiseStep, Values: x}})
	}
	if w.rot != nil {
		// One record of the platform's rotation rate, rad/s.
		x := w.rot.Synthesize(make([]float64, w.rot.Len()), Substream(r.ens.Seed, noise[3], "noise/rotation"))
		rotationRow.ApplyNoise(&sh, [2]*sim.Series{{StepS: r.noiseStep, Values: x}})
	}
	for _, wv := range waves {
		wv.src.Waveform(&sh, &r.ens.Budget, wv.z, r.waveStep, r.waveN)
	}
	return sh, rec
}

// Realise runs realisation i.
func (w *Worker) Realise(i int) Record {
	sh, rec := w.Shot(i)
	return w.RunShot(sh, rec)
}

// RunShot runs a shot from Shot or ShotAt and fills in its outcome.
func (w *Worker) RunShot(sh sim.Shot, rec Record) Record {
	res := w.r.sim.Run(sh, nil)
	rec.Contrast, rec.PhaseRad, rec.BiasRad = res.Contrast, res.PhaseRad, res.BiasRad
	rec.Z = res.Z
	if rec.Lost() {
		// A lost shot has no phase: its phase and bias are held as 0, which
		// no statistic reads (Record.Lost), and written as empty fields.
		rec.PhaseRad, rec.BiasRad = 0, 0
	}
	rec.Ground = res.GroundAfterRampUp
	if r := w.r; r.ens.ScaleFactor {
		// K_shot from the central difference, as sim.Simulator.Gyro.
		plus, minus := r.rotated[0].Run(sh, nil).PhaseRad, r.rotated[1].Run(sh, nil).PhaseRad
		ks := sim.Wrap(plus-minus) / (2 * r.gyroStep)
		rec.ScaleFactorErrorPPM = (ks/res.ScaleFactorS - 1) * 1e6
		rec.HasScaleFactor = true
	}
	return rec
}

// The noise processes' rows, whose records a Worker synthesises.
var rinRow, phaseRow, fieldRow, rotationRow = mustSource(SourceRIN), mustSource(SourcePhase), mustSource(SourceFieldNoise), mustSource(SourceRotationPSD)

func mustSource(key string) Source {
	s, ok := LookupSource(key)
	if !ok {
		panic("mc: no source " + key)
	}
	return s
}

func rms(x []float64) float64 {
	var s float64
	for _, v := range x {
		s += v * v
	}
	return math.Sqrt(s / float64(len(x)))
}
