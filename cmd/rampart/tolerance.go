package main

import (
	"context"
	"fmt"
	"io"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/spf13/cobra"

	"rampart/cmd/internal/present"
	"rampart/internal/plural"
	"rampart/mc"
	"rampart/scenario"
	"rampart/sim"
)

type toleranceOptions struct {
	decisionOptions
	spec      string
	sources   string
	joint     bool
	precision float64
	readout   readoutOptions
	kernels   bool
}

// newToleranceCmd returns the command; run is what it runs with the parsed
// options (runTolerance outside tests).
func newToleranceCmd(e env, run func(e env, stdout, stderr io.Writer, o toleranceOptions, confidenceGiven bool) error) *cobra.Command {
	var o toleranceOptions
	cmd := &cobra.Command{
		Use:   "tolerance --scenario FILE --spec SPEC.toml",
		Short: "Find how large each noise source may grow before the spec fails",
		Long: `For each noise source, find the largest amplitude at which an ensemble of the
scenario still meets the spec (as rampart qualify decides it: an undecided
amplitude counts as failing), with every other source at its value in the
scenario's budget. The search brackets by factors of 4 from the budget's
amplitude, then bisects in log amplitude to the relative --precision; every
amplitude runs the same realisations (common random numbers), so the metric
moves smoothly with it.

The sources searched are those the budget switches on, or those listed by
--sources (names as in the table, comma-separated, or all); a source the
budget switches off starts from a reference amplitude typical of a good
apparatus. --joint adds the factor by which the whole budget may be scaled.
With a read-out (the scenario's [readout] or --atoms and --cycle-s) the
sources include ` + mc.SourceDetection + `, the detection noise in atoms rms:
the largest at which the measured signal (each bias with the projection
noise of the read-out's atoms and the detection noise) still meets the spec;
it runs the ensemble once and reads it out at each amplitude.

The table gives each source's unit, its value in the budget, the tolerance,
how the search ended (found; above-range: the spec holds up to the largest
amplitude searched, a lower bound; below-range; fails-without-source;
undecided-without-source: more samples would decide the source off;
predicted: a noise process's tolerance from its kernels that the confirming
ensemble did not show to hold), the
binding criterion and its value at the tolerance with its one-sided bounds.

The noise processes during the shot (intensity, drive phase, field and
rotation noise) are not searched but predicted: the noise transfer functions of the nominal
shot (rampart response; docs/model.md, "Noise transfer functions") give the
level at which each predicted criterion (mean and 5th-percentile contrast,
|bias| p95) meets its limit, with the rest of the budget taken from one
ensemble with the process off; one ensemble at that level, with the whole
budget, confirms it and gives the row's values and verdict. Two ensembles
instead of a search; the level is where the estimate meets the limit, not
where a confidence bound does. --kernels=false searches them as the others.

--out DIR writes the tolerance curves (tolerance-curves.csv and a figure per
source) and keeps each ensemble in DIR/SOURCE/AMPLITUDE; --resume DIR reuses
them. --shard is refused: each step of the search needs the whole ensemble of
the step before. On a cluster, run the search on one node with --workers set
to its cores; the confirmation of a tolerance found, a qualification at that
amplitude (rampart qualify with --set on the source's scenario key), shards
as a job array (rampart sbatch).`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			return run(e, cmd.OutOrStdout(), cmd.ErrOrStderr(), o, cmd.Flags().Changed("confidence"))
		},
	}
	o.add(cmd, 200, "the tolerances and their curves")
	confidenceFromSpec(cmd)
	f := cmd.Flags()
	f.StringVar(&o.spec, "spec", "", "spec `file` (TOML) of the criteria to meet")
	f.StringVar(&o.sources, "sources", "", "noise sources to search, comma-separated from "+strings.Join(mc.SourceKeys(), ", ")+", "+mc.SourceDetection+" (with a read-out), or all (default: those the budget switches on, and the detection noise with a read-out)")
	addReadoutFlags(cmd, &o.readout)
	f.BoolVar(&o.joint, "joint", false, "also search the factor by which the whole budget may be scaled")
	f.Float64Var(&o.precision, "precision", 0.05, "relative precision `P` of each tolerance, in [0.001, 1]")
	f.BoolVar(&o.kernels, "kernels", true, "find the noise processes' tolerances from the noise transfer functions, confirmed by one ensemble (false: search them by Monte Carlo)")
	cmd.MarkFlagRequired("spec")
	return cmd
}

// searchTolerances searches the tolerance of each named source of budget
// (mc.SourceBudget for the whole budget scaled) against req, every
// amplitude an ensemble of the options' size on common random numbers (one
// noise grid sized for the widest search), kept in a subdirectory
// SOURCE/AMPLITUDE of the options' directory if there is one.
//
// With kernels, the noise processes' tolerances come from the noise
// transfer functions (searchSource).
func searchTolerances(ctx context.Context, e env, stderr io.Writer, sc *scenario.Scenario, cfg sim.Config, budget mc.Budget, req mc.Requirements, names []string, o ensembleOptions, precision float64, ro mc.Readout, kernels bool) (present.ToleranceReport, present.Work, error) {
	var work present.Work
	if n := req.MinSamples(); o.samples < n {
		return present.ToleranceReport{}, work, fmt.Errorf("%s per amplitude cannot pass the spec at %g %% confidence even if every one is far inside its limits (no exact bound on its quantiles or yield from so few); give at least %d",
			plural.Count(o.samples, "realisation"), 100*req.Confidence, n)
	}
	search := mc.ToleranceSearch{
		Budget: budget, Requirements: req, Seed: o.seed,
		ScaleFactorS: cfg.Ring.ScaleFactor(cfg.Sequence.TotalAngle()),
		Options:      mc.ToleranceOptions{Precision: precision},
		// The spread stays at most the start temperature, as the scenario's.
		StartTemperatureK: cfg.TemperatureK,
		// The detection axis reads the ensemble out with its own seed.
		Readout: ro,
	}
	// The nominal shot's numerics are checked before the search starts.
	nominal, err := mc.NewRealiser(mc.Ensemble{Config: cfg, Budget: budget, Samples: o.samples, Seed: o.seed, Sampler: o.sampler})
	if err != nil {
		return present.ToleranceReport{}, work, fmt.Errorf("scenario %q: %w", sc.Name, err)
	}
	est, err := preflight(fmt.Sprintf("scenario %q, %s ramp", sc.Name, cfg.Sequence.Up.Name()), nominal.Config())
	if err != nil {
		return present.ToleranceReport{}, work, err
	}
	grid, err := mc.SharedGrid([]sim.Config{cfg}, search.Widest())
	if err != nil {
		return present.ToleranceReport{}, work, fmt.Errorf("scenario %q: %w", sc.Name, err)
	}
	evaluator := func(name string) mc.Evaluator {
		return func(ctx context.Context, b mc.Budget) ([]mc.Record, error) {
			key := amplitudeKey(name, budget, b)
			if name == mc.SourceDetection {
				key = "nominal" // the one ensemble the detection axis reads out
			}
			ens := mc.Ensemble{Config: cfg, Budget: b, Samples: o.samples, Seed: o.seed, Sampler: o.sampler, ScaleFactor: o.scaleFactor || req.NeedsScaleFactor()}
			tag := toleranceTag{Source: name, Amplitude: key, Grid: grid.Apply(&ens)}
			run, _, err := runPart(ctx, e, stderr, sc, ens, tag, o, filepath.Join(name, key), "tolerance "+name+" "+key)
			if err != nil {
				return nil, err
			}
			work.Add(run.fresh, len(run.records), run.elapsed)
			return run.records, mc.CheckDecidable(run.records)
		}
	}
	rep := present.ToleranceReport{Requirements: req, Samples: o.samples, Seed: o.seed, Sampler: o.sampler, ScaleFactorS: search.ScaleFactorS, Numerics: &est}
	var tk *toleranceKernels
	if kernels {
		tk = &toleranceKernels{cfg: nominal.Config(), capMiB: defaultKernelMemoryMiB}
	}
	for _, name := range names {
		res, err := searchSource(ctx, search, evaluator(name), name, tk)
		if err != nil {
			return present.ToleranceReport{}, work, err
		}
		rep.Results = append(rep.Results, res)
	}
	if tk != nil {
		rep.KernelsSkipped = tk.Skipped
	}
	return rep, work, nil
}

// toleranceTag sets an ensemble of a tolerance search apart from the others
// of the same scenario (see ensembleJob).
type toleranceTag struct {
	Source    string `json:"tolerance_source"`
	Amplitude string `json:"amplitude"`
	Grid      any    `json:"grid,omitempty"`
}

func runTolerance(e env, stdout, stderr io.Writer, o toleranceOptions, confidenceGiven bool) error {
	switch {
	case o.ens.shard != "":
		return fmt.Errorf("--shard %s: a tolerance search cannot be sharded, as each step needs the whole ensemble of the step before; run it on one machine with more --workers", o.ens.shard)
	case !(o.precision >= 0.001 && o.precision <= 1):
		return fmt.Errorf("--precision %g: want a relative precision in [0.001, 1], such as 0.05", o.precision)
	}
	if err := o.validate(); err != nil {
		return err
	}
	if err := o.ens.checkResumeDir(); err != nil {
		return err
	}
	req, err := readRequirements(o.spec, o.ens.confidence, confidenceGiven)
	if err != nil {
		return err
	}
	sc, cfg, budget, err := o.load(stderr)
	if err != nil {
		return err
	}
	ro, err := o.readout.of(sc)
	if err != nil {
		return err
	}
	names, err := toleranceSources(budget, o.sources, ro)
	if err != nil {
		return fmt.Errorf("scenario %q: %w", sc.Name, err)
	}
	if o.joint {
		if active, _ := toleranceSources(budget, "", mc.Readout{}); len(active) == 0 {
			return fmt.Errorf("--joint: the budget of scenario %q has no active noise source to scale", sc.Name)
		}
		names = append(names, mc.SourceBudget)
	}
	ctx, stop := signalContext()
	defer stop()
	rep, work, err := searchTolerances(ctx, e, stderr, sc, cfg, budget, req, names, o.ens, o.precision, ro, o.kernels)
	if err != nil {
		return err
	}
	rep.Spec = o.spec
	if dir := o.ens.dir(); dir != "" {
		if err := present.WriteToleranceCurves(dir, rep); err != nil {
			return err
		}
		fmt.Fprintf(stderr, "wrote %s, a figure per source and every ensemble of the search to %s\n", present.ToleranceCurvesFile, dir)
	}
	ramp := cfg.Sequence.Up.Name() + " ramp"
	workLine := work.Line(fmt.Sprintf("%s at each amplitude tried, on common random numbers", plural.Count(o.ens.samples, "realisation")), o.ens.seed, o.ens.sampler, o.ens.shard)
	specLine := fmt.Sprintf("Spec: %s, at %s %% confidence", o.spec, present.Sig(100*req.Confidence, 3))
	if o.report != "" {
		tol, err := present.ToleranceSection(rep)
		if err != nil {
			return err
		}
		cfgs, name := present.OneRamp(cfg)
		if err := writeDecisionReport(e, stderr, o.decisionOptions, "Tolerances of "+name+" on "+sc.Name+" against "+o.spec, sc, cfgs, name,
			present.SetupText(sc, cfg, ramp, budget, workLine, present.NumericsLine(rep.Numerics), specLine), tol); err != nil {
			return err
		}
	}
	if o.json {
		return present.WriteJSON(stdout, rep)
	}
	present.PrintHeader(stdout, sc, cfg, ramp, budget, workLine, present.NumericsLine(rep.Numerics), specLine)
	return present.ToleranceGrid(rep).RenderNoted(stdout, present.ToleranceNotes(rep))
}

// toleranceSources returns the sources to search: those listed
// (comma-separated, or "all"), or the sources b switches on.
func toleranceSources(b mc.Budget, list string, ro mc.Readout) ([]string, error) {
	withDetection := func(names []string) []string {
		if ro.Atoms > 0 {
			names = append(names, mc.SourceDetection)
		}
		return names
	}
	if list == "all" {
		return withDetection(mc.SourceKeys()), nil
	}
	if list != "" {
		var out []string
		for _, name := range strings.Split(list, ",") {
			name = strings.TrimSpace(name)
			if name == mc.SourceDetection {
				if ro.Atoms == 0 {
					return nil, fmt.Errorf("--sources: %s needs a read-out: give the scenario a [readout] table or --atoms N and --cycle-s T", name)
				}
				out = append(out, name)
				continue
			}
			if _, ok := mc.LookupSource(name); !ok {
				hint := ""
				if name == mc.SourceBudget {
					hint = " (--joint searches the whole budget)"
				}
				return nil, fmt.Errorf("--sources: unknown noise source %q%s: want %s, %s (with a read-out), or all", name, hint, strings.Join(mc.SourceKeys(), ", "), mc.SourceDetection)
			}
			out = append(out, name)
		}
		return out, nil
	}
	out := withDetection(mc.ActiveSources(b))
	if len(out) == 0 {
		return nil, fmt.Errorf("the noise budget has no active source: give --sources to search some from their reference amplitudes")
	}
	return out, nil
}

// amplitudeKey names the ensemble of a search of source name at budget b
// (the budget's nominal value of every other source): the source's
// amplitude in the unit of the tolerance table to six digits, or "off".
func amplitudeKey(name string, nominal, b mc.Budget) string {
	a, on := mc.SourceAmplitude(name, nominal, b)
	if !on {
		return "off"
	}
	return amplitudeDir(a)
}

// amplitudeDir names the directory of an amplitude: six digits tell apart
// the amplitudes of a search to a precision of 0.001.
func amplitudeDir(a float64) string { return strconv.FormatFloat(a, 'g', 6, 64) }
