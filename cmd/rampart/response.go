package main

import (
	"errors"
	"fmt"
	"io"
	"math"
	"os"

	"github.com/spf13/cobra"

	"rampart/cmd/internal/present"
	"rampart/mc"
	"rampart/noise"
	"rampart/scenario"
	"rampart/sim"
	"rampart/stats"
)

type responseOptions struct {
	scenario  string
	sets      []string
	json      bool
	out       string
	report    string
	maxHz     float64
	memoryMiB int
	confirm   int
	seed      uint64
	workers   int
	spec      string
	bands     string
	shares    []float64
	spectra   []string
}

// defaultKernelMemoryMiB is the cap on the kernels' memory: twice the
// estimate (sim.KernelsBytes; the Go collector may let the heap reach
// twice the live data) must fit. 3 GiB is an eighth of this project's
// machine, fits about five laps of the benchmark ring (566 MiB at one
// lap) and the demo's one-lap sequence, whose table's steep stretch sets a
// finer step (about 1.1 GiB live, 2.2 GiB with the headroom).
const defaultKernelMemoryMiB = 3072

// newResponseCmd returns the command; run is what it runs with the parsed
// options (runResponse outside tests).
func newResponseCmd(e env, run func(e env, stdout, stderr io.Writer, o responseOptions) error) *cobra.Command {
	var o responseOptions
	cmd := &cobra.Command{
		Use:   "response --scenario FILE",
		Short: "Noise transfer functions of a ramp, the prediction for its noise budget, and noise masks",
		Long: `Compute the noise transfer functions (kernels) of the scenario's nominal
shot for every noise channel: intensity noise common to both spin states,
differential and on one arm; drive phase noise common, differential and on
each arm; a differential energy shift; the platform's rotation rate (rad/s,
through the arms' enclosed-area rate). For a one-sided PSD S(f) of a channel's
signal the bias variance is int S |G_phi|^2 df and the mean contrast loss
int S K_C df (linear response; docs/model.md, "Noise transfer functions").

Prints where each kernel peaks and its value at the trap frequency nu and at
2 nu, and the prediction for the scenario's own noise processes (its RIN,
drive phase noise with the arms' correlation, and field noise through the
spin pair's Zeeman slope at the static offset, a pure differential shift,
and the platform's rotation-rate noise):
the mean contrast loss
and the bias standard deviation per channel and in total, with warnings where
the linear answer cannot be trusted.

--spectrum PROCESS=SPEC replaces (or adds) a process's spectrum for the
prediction, the masks' growth factor and --confirm: a sum of white levels,
power laws h f^alpha (the IEEE Std 1139 forms) and tables, in the signal's
unit^2/Hz (intensity 1/Hz, each arm's drive phase rad^2/Hz, field G^2/Hz,
rotation (rad/s)^2/Hz).

--confirm N runs a Monte Carlo ensemble of N shots under the same noise
processes (nothing static) and prints it beside the prediction.
--spec FILE adds the noise masks: for each process of the budget and each
channel, the largest white level, and the largest level per band, that keeps
the spec's mean-contrast and |bias| p95 criteria with the rest of the budget
as it is, and the factor by which the budget's spectrum may grow.

The kernels' memory grows with the sequence's duration; a sequence whose
estimate is above --memory-mib is refused before anything is computed.`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			return run(e, cmd.OutOrStdout(), cmd.ErrOrStderr(), o)
		},
	}
	addScenarioFlags(cmd, &o.scenario, &o.sets)
	f := cmd.Flags()
	f.BoolVar(&o.json, "json", false, "print one JSON object (with the kernels) instead of tables")
	f.StringVar(&o.out, "out", "", "write the kernels (and masks) as CSV, and their figures, to `DIR`")
	addReportFlag(cmd, &o.report)
	f.Float64Var(&o.maxHz, "max-hz", 0, "highest kernel frequency `F` in Hz (0: the Monte Carlo's noise band)")
	f.IntVar(&o.memoryMiB, "memory-mib", defaultKernelMemoryMiB, "refuse a sequence whose kernels would need more than `M` MiB (twice the estimate)")
	f.IntVar(&o.confirm, "confirm", 0, "confirm the prediction with a Monte Carlo ensemble of `N` shots (0: none)")
	f.Uint64Var(&o.seed, "seed", 1, "seed `S` of the --confirm ensemble")
	f.IntVar(&o.workers, "workers", 0, "worker goroutines `W` of the --confirm ensemble (0: one per core)")
	f.StringVar(&o.spec, "spec", "", "spec `file` (TOML) whose criteria the noise masks keep")
	f.StringVar(&o.bands, "bands", "decade", "mask bands: `decade` or octave")
	f.StringArrayVar(&o.spectra, "spectrum", nil, "replace a process's spectrum (repeatable): "+spectrumHelp)
	f.Float64SliceVar(&o.shares, "band-share", nil, "shares of the error budget per band, low to high, comma separated, summing to at most 1 (default equal)")
	return cmd
}

// validate checks the options that need no file.
func (o responseOptions) validate() error {
	switch {
	case o.maxHz < 0 || math.IsNaN(o.maxHz) || math.IsInf(o.maxHz, 0):
		return fmt.Errorf("--max-hz %g: need a finite frequency >= 0 (0: the noise band)", o.maxHz)
	case o.memoryMiB < 1:
		return fmt.Errorf("--memory-mib %d: need at least 1", o.memoryMiB)
	case o.confirm < 0 || o.confirm == 1 || o.confirm > mc.MaxSamples:
		return fmt.Errorf("--confirm %d: need 0 (none) or from 2 to %d shots", o.confirm, mc.MaxSamples)
	case o.workers < 0:
		return fmt.Errorf("--workers %d: need 0 (one per core) or more", o.workers)
	case o.bands != "decade" && o.bands != "octave":
		return fmt.Errorf("--bands %q: want decade or octave", o.bands)
	case o.shares != nil && o.spec == "":
		return errors.New("--band-share needs --spec (the shares split the spec's room)")
	}
	out := outDir("--out", o.out, present.ResponseKernelsFile, present.ResponseMaskFile, "*.png", "*.svg")
	out.want = "a directory for the kernels and their figures"
	if err := checkOutputPaths(out); err != nil {
		return err
	}
	return checkReportDir(o.report)
}

func runResponse(e env, stdout, stderr io.Writer, o responseOptions) error {
	if err := o.validate(); err != nil {
		return err
	}
	sc, cfg, budget, err := scenario.LoadBudget(o.scenario, o.sets)
	if err != nil {
		return err
	}
	if budget, err = applySpectra(budget, o.spectra); err != nil {
		return err
	}
	var req *mc.Requirements
	if o.spec != "" {
		r, err := readRequirements(o.spec, 0, false)
		if err != nil {
			return err
		}
		req = &r
	}
	rep, cfg, nominal, err := computeResponse(stderr, sc, cfg, budget, req, o)
	if err != nil {
		return err
	}
	if o.confirm > 0 {
		if rep.Confirm, err = confirmResponse(cfg, budget, nominal, o); err != nil {
			return err
		}
		if rep.Confirm == nil {
			fmt.Fprintln(stderr, "--confirm: the budget has no noise during the shot; nothing to confirm")
		}
	}
	for _, out := range []struct{ flag, dir string }{{"--out", o.out}, {"--report", o.report}} {
		if out.dir != "" {
			if err := os.MkdirAll(out.dir, 0o755); err != nil {
				return fmt.Errorf("%s %s: %w", out.flag, out.dir, pathErr(err))
			}
		}
	}
	if o.out != "" {
		if err := present.WriteResponse(o.out, rep); err != nil {
			return err
		}
		fmt.Fprintf(stderr, "wrote %s and the figures to %s\n", present.ResponseKernelsFile, o.out)
	}
	ramp := cfg.Sequence.Up.Name() + " ramp"
	if o.report != "" {
		sec, err := present.ResponseSection(rep)
		if err != nil {
			return err
		}
		r := newReport(e, "Noise transfer functions of "+ramp+" on "+sc.Name, sc, scenarioText(o.scenario), o.sets, o.seed)
		lead, err := present.DriveAndDynamics(present.OneRamp(cfg))
		if err != nil {
			return err
		}
		sec.Text = present.SetupText(sc, cfg, ramp, budget) + "\n\n" + sec.Text
		r.Sections = append(lead, sec)
		if err := writeReport(stderr, r, o.report); err != nil {
			return err
		}
	}
	if o.json {
		return present.WriteJSON(stdout, rep)
	}
	present.PrintHeader(stdout, sc, cfg, ramp, budget)
	return present.PrintResponse(stdout, rep)
}

// computeResponse computes the kernels of the scenario's nominal shot
// (after checking their memory against the cap), the prediction for its
// budget's noise processes and, with req, the masks.
func computeResponse(stderr io.Writer, sc *scenario.Scenario, cfg sim.Config, budget mc.Budget, req *mc.Requirements, o responseOptions) (present.ResponseReport, sim.Config, sim.Result, error) {
	s, err := sim.NewSimulator(cfg)
	if err != nil {
		return present.ResponseReport{}, cfg, sim.Result{}, fmt.Errorf("scenario %q: %w", sc.Name, err)
	}
	cfg = s.Config()
	est := s.KernelsBytes(o.maxHz)
	if need := 2 * est; need > int64(o.memoryMiB)<<20 {
		return present.ResponseReport{}, cfg, sim.Result{}, kernelsTooLarge(sc, cfg, need, o.memoryMiB)
	}
	nominal := s.Run(sim.Shot{}, nil)
	// A bar on a terminal (the kernels of a long sequence take minutes),
	// made at the first report, when the total is known.
	var bar progress
	last := 0
	k, err := s.KernelsProgress(o.maxHz, func(done, total int) {
		if stderr == nil {
			return
		}
		if bar == nil {
			bar = newProgressOf(stderr, total, 0, "kernels", "evaluations")
		}
		bar.Add(done - last)
		last = done
	})
	if bar != nil {
		bar.Finish()
	}
	if err != nil {
		return present.ResponseReport{}, cfg, sim.Result{}, err
	}
	procs := budget.Processes(k.DurationS)
	rep := present.NewResponseReport(sc.Name, k, nominal, procs, k.PredictProcesses(procs), est)
	if req != nil {
		if rep.Masks, err = responseMasks(k, nominal, budget, procs, *req, o); err != nil {
			return present.ResponseReport{}, cfg, sim.Result{}, err
		}
	}
	return rep, cfg, nominal, nil
}

// kernelsTooLarge is the refusal of a sequence whose kernels would not fit
// the memory cap, with the laps that would.
func kernelsTooLarge(sc *scenario.Scenario, cfg sim.Config, need int64, capMiB int) error {
	laps := sc.Motion.Laps
	fit := math.Floor(2*laps*float64(capMiB<<20)/float64(need)) / 2
	remedy := "even half a lap would not fit: raise --memory-mib if the machine has the memory"
	if fit >= 0.5 {
		remedy = fmt.Sprintf("shorten the sequence (--set motion.laps=%g should fit; the kernels' memory grows with the duration) or raise --memory-mib if the machine has the memory", fit)
	}
	unit := "laps"
	if laps == 1 {
		unit = "lap"
	}
	return fmt.Errorf("scenario %q: the kernels of this %.3g s sequence (%g %s) would need about %d MiB (twice the estimate, for the collector's headroom), more than --memory-mib %d: %s",
		sc.Name, cfg.Sequence.Duration(), laps, unit, need>>20, capMiB, remedy)
}

// confirmResponse runs the Monte Carlo of the budget's noise processes
// alone; nil when the budget has none.
func confirmResponse(cfg sim.Config, b mc.Budget, nominal sim.Result, o responseOptions) (*present.ResponseConfirm, error) {
	dyn := mc.Budget{RIN: b.RIN, RINBand: b.RINBand, Phase: b.Phase, PhaseCorrelation: b.PhaseCorrelation, FieldNoise: b.FieldNoise}
	dyn.Apparatus.Field = b.Apparatus.Field
	dyn.MainsG, dyn.Mains = b.MainsG, b.Mains
	if len(dyn.Processes(cfg.Sequence.Duration())) == 0 {
		return nil, nil
	}
	r, err := mc.NewRealiser(mc.Ensemble{Config: cfg, Budget: dyn, Samples: o.confirm, Seed: o.seed})
	if err != nil {
		return nil, err
	}
	ctx, stop := signalContext()
	defer stop()
	var contrast, bias []float64
	if _, err := r.Run(ctx, 0, o.confirm, o.workers, func(rec mc.Record) error {
		contrast = append(contrast, rec.Contrast)
		bias = append(bias, sim.Wrap(rec.BiasRad-nominal.BiasRad))
		return nil
	}); err != nil {
		return nil, err
	}
	n := float64(len(contrast))
	std := stats.StdDev(bias)
	return &present.ResponseConfirm{Samples: o.confirm, Seed: o.seed,
		ContrastLoss: nominal.Contrast - stats.Mean(contrast), ContrastLossSE: stats.StdDev(contrast) / math.Sqrt(n),
		BiasStdRad: std, BiasStdSE: std / math.Sqrt(2*(n-1))}, nil
}

// responseMasks computes the masks of the budget's processes (drive phase
// and RIN, present or not) and of every channel against the spec.
func responseMasks(k *sim.Kernels, nominal sim.Result, b mc.Budget, procs []sim.Process, req mc.Requirements, o responseOptions) (*present.ResponseMasks, error) {
	crit := sim.MaskCriteria{ContrastMin: req.ContrastMeanMin, AbsBiasP95MaxRad: req.AbsBiasP95MaxRad}
	out := &present.ResponseMasks{Spec: o.spec}
	from := mc.CriterionContrastMean
	if crit.ContrastMin == 0 && req.ContrastP05Min > 0 {
		crit.ContrastMin, from = req.ContrastP05Min, mc.CriterionContrastP05
	}
	if req.AbsBiasP95MaxDegPerH > 0 {
		rad := req.AbsBiasP95MaxDegPerH / sim.RadPerSToDegPerH(1) * nominal.ScaleFactorS
		if crit.AbsBiasP95MaxRad == 0 || rad < crit.AbsBiasP95MaxRad {
			crit.AbsBiasP95MaxRad = rad
		}
	}
	if crit.ContrastMin == 0 && crit.AbsBiasP95MaxRad == 0 {
		return nil, fmt.Errorf("spec %q: no contrast or bias criterion for the masks to keep (want contrast.mean_min or contrast.p05_min, bias.abs_p95_max_rad or bias.abs_p95_max_deg_per_h)", o.spec)
	}
	if crit.ContrastMin > 0 {
		out.ContrastMin, out.ContrastFrom = &crit.ContrastMin, from
	}
	if crit.AbsBiasP95MaxRad > 0 {
		out.AbsBiasP95MaxRad = &crit.AbsBiasP95MaxRad
	}
	band := noise.Band{LowHz: 1 / k.DurationS, HighHz: k.FrequencyHz[len(k.FrequencyHz)-1]}
	if !(band.HighHz > band.LowHz) {
		return nil, fmt.Errorf("--max-hz %g: the kernels end at %.4g Hz, below 1/T = %.4g Hz, the lowest frequency a shot resolves; raise it for the masks", o.maxHz, band.HighHz, band.LowHz)
	}
	base := 10.0
	if o.bands == "octave" {
		base = 2
	}
	bands := sim.LogBands(band.LowHz, band.HighHz, base)
	if o.shares != nil && len(o.shares) != len(bands) {
		return nil, fmt.Errorf("--band-share: %d shares for the %d %s bands from %.3g to %.3g Hz", len(o.shares), len(bands), o.bands, band.LowHz, band.HighHz)
	}
	given := map[string]sim.Process{}
	for _, p := range procs {
		given[p.Name] = p
	}
	type target struct {
		name, kind, unit string
		load             sim.Load
	}
	targets := []target{{mc.ProcessPhase, "process", "rad", sim.PhaseLoad(b.PhaseCorrelation)}, {mc.ProcessRIN, "process", "1", sim.Load{sim.IntensityCommon: 1}}}
	if fl := b.FieldLoad(); fl[sim.ShiftDifferential] != 0 {
		targets = append(targets, target{mc.ProcessField, "process", "G", fl})
	}
	for _, ck := range k.Channels {
		targets = append(targets, target{ck.Channel.String(), "channel", ck.Channel.Unit(), sim.Load{ck.Channel: 1}})
	}
	for _, t := range targets {
		room := crit.Room(nominal.Contrast, nominal.BiasRad, k.PredictProcesses(sim.Without(procs, t.load)))
		m, err := k.Mask(t.load, room, band, bands, o.shares)
		if err != nil {
			return nil, fmt.Errorf("--band-share: %w", err)
		}
		var psd noise.PSD
		p, ok := given[t.name]
		if ok {
			psd = p.PSD
		}
		rm := present.NewResponseMask(t.name, t.kind, t.unit, room, m, psd, band)
		// The budget's field and rotation-rate noise read in its lab
		// units (mc.Sources: uG, urad/s), as tolerance gives them; the
		// channels stay in SI.
		switch {
		case t.name == mc.ProcessField:
			rm.InLabUnit("uG", 1e6)
		case t.name == mc.ProcessRotation && ok:
			rm.InLabUnit("urad/s", 1e6)
		}
		if ok {
			g, bind := k.Growth(p.Load, p.PSD, p.Band, room)
			rm.Growth, rm.GrowthBinding = finitePtr(g), bind
		}
		out.Targets = append(out.Targets, rm)
	}
	return out, nil
}

// finitePtr returns &x, or nil for an infinite x.
func finitePtr(x float64) *float64 {
	if math.IsInf(x, 0) {
		return nil
	}
	return &x
}
