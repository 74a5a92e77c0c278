package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"slices"
	"strings"

	"github.com/spf13/cobra"

	"rampart/cmd/internal/present"
	"rampart/cmd/internal/report"
	"rampart/cmd/internal/spec"
	"rampart/design"
	"rampart/internal/atomicfile"
	"rampart/mc"
	"rampart/scenario"
	"rampart/sim"
)

type robustOptions struct {
	scenario     string
	sets         []string
	samples      int
	seed         uint64
	workers      int
	sampler      string
	confidence   float64
	terms        int
	evals        int
	step         float64
	objective    string
	k            float64
	weight       float64
	spec         string
	freshSamples int
	freshSeed    uint64
	ramps        []string
	write        string
	history      string
	json         bool
	report       string
}

// newRobustCmd returns the command; run is what it runs with the parsed
// options (runRobust outside tests).
func newRobustCmd(e env, run func(e env, stdout, stderr io.Writer, o robustOptions) error) *cobra.Command {
	var o robustOptions
	cmd := &cobra.Command{
		Use:   "robust --scenario FILE --write RAMP.csv",
		Short: "Optimise a correction of the scenario's ramp for robustness under the noise budget",
		Long: `Optimise the scenario's ramp-up (the reference: any shape or a ramp file)
for an objective over an ensemble under the noise budget, then rank the
result against the reference on a fresh ensemble.

The ramp is the reference plus a smooth correction of --terms basis
functions (s^3 (1-s)^3 times sines and cosines over the ramp, each of zero
integral): speed 0 at t = 0, the cruise speed at t_r, the end slopes and the
ramp angle stay the reference's, so the sequence closes with the same cruise
time. The objective (--objective) is the 5th-percentile contrast (p05), the
yield inside --spec's yield limits (yield), the mean contrast less --k
standard deviations (mean-kstd) or the p05 contrast less --weight times the
|bias| p95 in rad (p05-bias), over --samples realisations from --seed, the
same draws at every evaluation (common random numbers). The optimiser is
Nelder-Mead (gonum/optimize), at most --evals evaluations. Ctrl-C stops it
and keeps the best ramp so far.

The best ramp is written to --write as a ramp file (ramp.shape = "file"
reads it). It is then ranked, as read back from that file, against the
reference and any --ramp NAME=SPEC candidates on a fresh ensemble of
--fresh-samples realisations from --fresh-seed (by default --seed + 1, an
independent stream), so that the gain is not an artefact of the draws it
was tuned on.

The optimisation is sequential (each evaluation depends on those before
it) and runs on one node, with --workers set to its cores; on a cluster the
fresh ranking can be redone larger as rampart rank --ramp best=file:RAMP.csv,
which shards as a job array (rampart sbatch).`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			return run(e, cmd.OutOrStdout(), cmd.ErrOrStderr(), o)
		},
	}
	addScenarioFlags(cmd, &o.scenario, &o.sets)
	f := cmd.Flags()
	f.IntVar(&o.samples, "samples", 200, "realisations `N` of the tuning ensemble")
	f.Uint64Var(&o.seed, "seed", 1, "seed `S` of the tuning ensemble")
	f.IntVar(&o.workers, "workers", 0, "worker goroutines `W` (0: one per core)")
	f.StringVar(&o.sampler, "sampler", "random", "design of the static parameters: random, lhs or sobol")
	f.Float64Var(&o.confidence, "confidence", 0.95, "confidence `level` of the fresh ranking, in (0, 1)")
	f.IntVar(&o.terms, "terms", 6, fmt.Sprintf("correction terms `K` (1 to %d)", design.MaxTerms))
	f.IntVar(&o.evals, "evals", 200, "at most `E` objective evaluations")
	f.Float64Var(&o.step, "step", 0.05, "initial simplex size, in units of the cruise speed")
	f.StringVar(&o.objective, "objective", design.ObjectiveP05, "what to maximise: "+strings.Join(design.Objectives, ", "))
	f.Float64Var(&o.k, "k", 2, "`K` of the objective mean-kstd")
	f.Float64Var(&o.weight, "weight", 100, "`W` per rad of |bias| p95 in the objective p05-bias")
	f.StringVar(&o.spec, "spec", "", "spec `file` (TOML) whose yield limits the objective yield counts")
	f.IntVar(&o.freshSamples, "fresh-samples", 400, "realisations `N` per ramp of the fresh ranking")
	f.Uint64Var(&o.freshSeed, "fresh-seed", 0, "seed of the fresh ranking (0: --seed + 1)")
	f.StringArrayVar(&o.ramps, "ramp", nil, "another candidate for the fresh ranking: `NAME=SPEC`, SPEC "+scenario.RampSpecs+"; repeatable")
	f.StringVar(&o.write, "write", "", "write the best ramp to this ramp `file` (CSV)")
	f.StringVar(&o.history, "history", "", "write the optimisation history to this CSV `file` (and a figure beside it)")
	f.BoolVar(&o.json, "json", false, "print the result as one JSON object")
	addReportFlag(cmd, &o.report)
	cmd.MarkFlagRequired("write")
	return cmd
}

func (o robustOptions) validate() error {
	switch {
	case o.samples < 20 || o.samples > mc.MaxSamples:
		return fmt.Errorf("--samples %d: want 20 to %d realisations (a 5th percentile needs at least 20)", o.samples, mc.MaxSamples)
	case o.freshSamples < 20 || o.freshSamples > mc.MaxSamples:
		return fmt.Errorf("--fresh-samples %d: want 20 to %d realisations", o.freshSamples, mc.MaxSamples)
	case o.workers < 0:
		return fmt.Errorf("--workers %d: need 0 (one per core) or more", o.workers)
	case !(o.confidence > 0 && o.confidence < 1):
		return fmt.Errorf("--confidence %g: want a level in (0, 1), such as 0.95", o.confidence)
	case !slices.Contains(mc.Samplers, o.sampler):
		return fmt.Errorf("--sampler %q: want random, lhs or sobol", o.sampler)
	case o.freshSeed != 0 && o.freshSeed == o.seed:
		return fmt.Errorf("--fresh-seed %d is the tuning --seed: the fresh ranking needs independent draws", o.freshSeed)
	case o.objective == design.ObjectiveYield && o.spec == "":
		return fmt.Errorf("--objective yield needs --spec FILE with yield limits")
	}
	history := outFile("--history", o.history)
	if o.history != "" {
		// The figure is written beside the history (RobustHistoryFigure).
		base := strings.TrimSuffix(o.history, filepath.Ext(o.history))
		history.beside = []string{base + ".svg", base + ".png"}
	}
	if err := checkOutputPaths(outFile("--write", o.write), history); err != nil {
		return err
	}
	return checkReportDir(o.report)
}

func runRobust(e env, stdout, stderr io.Writer, o robustOptions) error {
	if err := o.validate(); err != nil {
		return err
	}
	sc, cfg, budget, err := scenario.LoadBudget(o.scenario, o.sets)
	if err != nil {
		return err
	}
	for _, out := range []struct{ flag, path string }{{"--write", o.write}, {"--history", o.history}} {
		if err := checkNotInput(out.flag, out.path, sc.Inputs()); err != nil {
			return err
		}
	}
	obj := design.Objective{Name: o.objective, K: o.k, Weight: o.weight}
	if o.spec != "" {
		req, err := spec.Read(o.spec)
		if err != nil {
			return err
		}
		obj.Spec = req.Yield
	}
	label := strings.TrimSuffix(filepath.Base(o.write), filepath.Ext(o.write))
	r := design.Robust{Ensemble: mc.Ensemble{Config: cfg, Budget: budget, Samples: o.samples, Seed: o.seed, Sampler: o.sampler},
		Terms: o.terms, Objective: obj, MaxEvals: o.evals, InitialStep: o.step, Workers: o.workers, Label: label}
	if err := r.Validate(); err != nil {
		return fmt.Errorf("--terms %d --evals %d --objective %s: %w", o.terms, o.evals, o.objective, err)
	}
	// The candidates are checked before the optimisation runs.
	cands := make([]scenario.Contestant, len(o.ramps))
	for i, rs := range o.ramps {
		name, specText, ok := strings.Cut(rs, "=")
		if !ok || name == "" || name == "reference" || name == label {
			return fmt.Errorf("--ramp %q: want NAME=SPEC with a NAME other than reference and %s", rs, label)
		}
		csc, ccfg, err := scenario.RampVariant(sc, cfg, specText)
		if err != nil {
			return fmt.Errorf("--ramp %s: %w", rs, err)
		}
		cands[i] = scenario.Contestant{Name: name, Spec: "--ramp " + rs, Scenario: csc, Config: ccfg}
	}
	ctx, stop := signalContext()
	defer stop()
	bar := newProgress(stderr, o.evals, 0, "robust")
	r.Evaluated = func(design.Step) { bar.Add(1) }
	res, err := r.Optimise(ctx)
	bar.Finish()
	if err != nil {
		return fmt.Errorf("scenario %q: %w", sc.Name, err)
	}
	rep := present.RobustReport{Scenario: sc.Name, Objective: o.objective, Terms: o.terms, Samples: o.samples, Seed: o.seed,
		RampFile: o.write, Result: res, FreshShots: o.freshSamples, FreshSeed: o.freshSeed}
	if rep.FreshSeed == 0 {
		rep.FreshSeed = o.seed + 1
	}
	if err := atomicfile.Write(o.write, func(w io.Writer) error { return design.WriteRamp(w, res.Ramp, design.RampRows) }); err != nil {
		return err
	}
	fmt.Fprintf(stderr, "wrote the best ramp (objective %s, reference %s) to %s\n", present.Sig(res.Value, 5), present.Sig(res.Reference, 5), o.write)
	if note := robustShapeNote(res.Ramp, o.write); note != "" {
		fmt.Fprintln(stderr, note)
	}
	if o.history != "" {
		if err := atomicfile.Write(o.history, func(w io.Writer) error { return present.WriteRobustHistory(w, res) }); err != nil {
			return err
		}
		if err := present.RobustHistoryFigure(strings.TrimSuffix(o.history, filepath.Ext(o.history)), rep); err != nil {
			return err
		}
	}
	if res.Interrupted {
		if err := writeRobustReport(e, stderr, o, sc, rep, nil); err != nil {
			return err
		}
		if err := printRobust(stdout, o, rep); err != nil {
			return err
		}
		return &exitError{code: 130, err: errors.New("interrupted: the best ramp so far is in " + o.write)}
	}
	fresh, cfgs, err := freshRanking(ctx, sc, cfg, budget, o, rep.FreshSeed, label, cands)
	if err != nil {
		if ctx.Err() != nil {
			return &exitError{code: 130, err: errors.New("interrupted during the fresh ranking; the best ramp is in " + o.write)}
		}
		return err
	}
	rep.Fresh = fresh
	if err := writeRobustReport(e, stderr, o, sc, rep, cfgs); err != nil {
		return err
	}
	return printRobust(stdout, o, rep)
}

// writeRobustReport writes --report: the drives of the ranked ramps (none
// when interrupted), the optimisation and the fresh ranking.
func writeRobustReport(e env, stderr io.Writer, o robustOptions, sc *scenario.Scenario, rep present.RobustReport, cfgs []present.NamedConfig) error {
	if o.report == "" {
		return nil
	}
	secs, err := present.RobustSections(rep)
	if err != nil {
		return err
	}
	r := newReport(e, "Robust optimisation of the ramp on "+sc.Name, sc, scenarioText(o.scenario), o.sets, o.seed)
	if len(cfgs) > 0 {
		drive, err := present.DriveSection(cfgs)
		if err != nil {
			return err
		}
		secs = append([]report.Section{drive}, secs...)
	}
	r.Sections = secs
	return writeReport(stderr, r, o.report)
}

func printRobust(w io.Writer, o robustOptions, rep present.RobustReport) error {
	if o.json {
		return present.WriteJSON(w, rep)
	}
	return present.PrintRobust(w, rep)
}

// rankMetric is the ranking metric closest to an objective: the mean for
// mean-kstd (a ranking has no mean less k std), p05 for p05-bias.
func rankMetric(objective string) string {
	switch objective {
	case design.ObjectiveYield:
		return mc.MetricYield
	case design.ObjectiveMeanKStd:
		return mc.MetricMean
	}
	return mc.MetricP05
}

// freshRanking ranks the reference, the written ramp file (read back as
// every command reads it) and the candidates on a fresh ensemble.
func freshRanking(ctx context.Context, sc *scenario.Scenario, cfg sim.Config, budget mc.Budget, o robustOptions, seed uint64, label string, cands []scenario.Contestant) (*present.RankReport, []present.NamedConfig, error) {
	tab, err := scenario.ReadRamp(o.write, cfg.Ring.Sites, sim.Cruise(cfg.Sequence.Up))
	if err != nil {
		return nil, nil, fmt.Errorf("read back %s: %w", o.write, err)
	}
	seq, err := cfg.Sequence.WithUp(tab)
	if err != nil {
		return nil, nil, err
	}
	robustCfg := cfg
	robustCfg.Sequence = seq
	names := []string{"reference", label}
	cfgs := []sim.Config{cfg, robustCfg}
	specs := []string{"the scenario's ramp", o.write}
	for _, c := range cands {
		names, cfgs, specs = append(names, c.Name), append(cfgs, c.Config), append(specs, c.Spec)
	}
	grid, err := mc.SharedGrid(cfgs, budget)
	if err != nil {
		return nil, nil, err
	}
	var yield mc.Spec
	if o.spec != "" {
		req, err := spec.Read(o.spec)
		if err != nil {
			return nil, nil, err
		}
		yield = req.Yield
	}
	rep := &present.RankReport{Ramps: make([]present.RampReport, len(cfgs))}
	recs := make([][]mc.Record, len(cfgs))
	for i, c := range cfgs {
		ens := mc.Ensemble{Config: c, Budget: budget, Samples: o.freshSamples, Seed: seed, Sampler: o.sampler}
		grid.Apply(&ens)
		rz, err := mc.NewRealiser(ens)
		if err != nil {
			return nil, nil, fmt.Errorf("%s: %w", names[i], err)
		}
		if _, err := rz.Run(ctx, 0, o.freshSamples, o.workers, func(rec mc.Record) error { recs[i] = append(recs[i], rec); return nil }); err != nil {
			return nil, nil, err
		}
		k := c.Ring.ScaleFactor(c.Sequence.TotalAngle())
		sum := mc.Summarise(recs[i], seed, k*c.RotationRadS, k, o.confidence, yield)
		rep.Ramps[i] = present.RampReport{Name: names[i], Spec: specs[i], RampUpS: c.Sequence.Up.Duration(),
			ContrastMean: sum.Contrast.Mean, AbsBiasP95Rad: sum.AbsBiasRad.P95, AbsBiasP95DegPerH: present.AbsBiasP95DegPerH(sum), Summary: sum}
	}
	metric := rankMetric(o.objective)
	if metric == mc.MetricYield && !yield.Active() {
		metric = mc.MetricP05
	}
	rep.Ranking, err = mc.Rank(names, recs, metric, yield, o.confidence, seed)
	if err != nil {
		return nil, nil, err
	}
	named := make([]present.NamedConfig, len(cfgs))
	for i, c := range cfgs {
		named[i] = present.NamedConfig{Name: names[i], Config: c}
	}
	return rep, named, nil
}

// robustShapeNote warns when the correction has taken the ramp far from
// the commanded profile: its speed changing sign, or peaking well above
// the cruise speed, is a drive the hardware must be able to follow (the
// objective does not know the drive's limits).
func robustShapeNote(r *design.Corrected, file string) string {
	if r == nil {
		return ""
	}
	peak, rev := sim.PeakSpeed(r)
	cruise := math.Abs(sim.Cruise(r))
	switch {
	case rev:
		return fmt.Sprintf("rampart: note: the best ramp reverses (its speed changes sign) and peaks at |Omega| = %s rad/s, %s times the cruise speed; check that the drive can follow it (rampart ramp with ramp.shape = \"file\" and ramp.file = %s shows it)", present.Sig(peak, 4), present.Sig(peak/cruise, 3), file)
	case peak > 1.2*cruise:
		return fmt.Sprintf("rampart: note: the best ramp peaks at |Omega| = %s rad/s, %s times the cruise speed; check that the drive can follow it (rampart ramp with ramp.shape = \"file\" and ramp.file = %s shows it)", present.Sig(peak, 4), present.Sig(peak/cruise, 3), file)
	}
	return ""
}
