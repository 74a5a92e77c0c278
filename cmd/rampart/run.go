package main

import (
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"rampart/cmd/internal/present"
	"rampart/internal/plural"
	"rampart/mc"
	"rampart/scenario"
)

type runOptions struct {
	scenario    string
	sets        []string
	ens         ensembleOptions
	minContrast float64
	maxBiasRad  float64
	json        bool
	report      string
	readout     readoutOptions
}

// newRunCmd returns the command; run is what it runs with the parsed
// options (runRun outside tests).
func newRunCmd(e env, run func(e env, stdout, stderr io.Writer, o runOptions) error) *cobra.Command {
	var o runOptions
	cmd := &cobra.Command{
		Use:   "run --scenario FILE",
		Short: "Run a Monte Carlo ensemble of the scenario under its noise budget",
		Long: `Run a Monte Carlo ensemble of shots of the scenario, each perturbed by the
scenario's [noise.*] budget: static depth, timing, temperature and pulse errors
drawn per realisation, and intensity and drive phase noise during the shot.
Prints the distributions of contrast and bias (mean, spread and quantiles with
bootstrap intervals), the contrast of a fringe averaged over the shots, and
with --min-contrast or --max-bias-rad the yield with its Clopper-Pearson
interval. With --out DIR the realisations are streamed to DIR as they
complete, with a JSON summary and contrast and bias histograms (PNG and SVG);
Ctrl-C stops cleanly and --resume DIR continues. --shard k/n runs one slice of
the ensemble for a cluster job array; rampart merge combines the slices.
--report DIR writes a self-contained HTML report of the run.`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			return run(e, cmd.OutOrStdout(), cmd.ErrOrStderr(), o)
		},
	}
	addScenarioFlags(cmd, &o.scenario, &o.sets)
	addEnsembleFlags(cmd, &o.ens, 1000)
	f := cmd.Flags()
	f.Float64Var(&o.minContrast, "min-contrast", 0, "yield spec: a realisation is inside when its contrast is at least `X`")
	f.Float64Var(&o.maxBiasRad, "max-bias-rad", 0, "yield spec: a realisation is inside when its |bias| is at most `Y` rad")
	f.BoolVar(&o.json, "json", false, "print the summary as one JSON object")
	addReportFlag(cmd, &o.report)
	addReadoutFlags(cmd, &o.readout)
	return cmd
}

func (o *runOptions) spec() (mc.Spec, error) {
	switch {
	case o.minContrast < 0 || o.minContrast > 1:
		return mc.Spec{}, fmt.Errorf("--min-contrast %g: want a contrast in [0, 1]", o.minContrast)
	case o.maxBiasRad < 0:
		return mc.Spec{}, fmt.Errorf("--max-bias-rad %g: want a non-negative bias", o.maxBiasRad)
	}
	return mc.Spec{MinContrast: o.minContrast, MaxAbsBiasRad: o.maxBiasRad}, nil
}

func runRun(e env, stdout, stderr io.Writer, o runOptions) error {
	if err := o.ens.validate(); err != nil {
		return err
	}
	if err := o.ens.checkResumeRun(); err != nil {
		return err
	}
	if err := checkReportDir(o.report); err != nil {
		return err
	}
	spec, err := o.spec()
	if err != nil {
		return err
	}
	if spec.Active() {
		o.ens.yield = &spec
	}
	sc, cfg, budget, err := scenario.LoadBudget(o.scenario, o.sets)
	if err != nil {
		return err
	}
	warnValidity(stderr, cfg)
	ro, err := o.readout.of(sc)
	if err != nil {
		return err
	}
	ctx, stop := signalContext()
	defer stop()
	run, err := runEnsemble(ctx, e, stderr, sc, cfg, budget, o.ens, "run")
	if err != nil {
		return err
	}
	sum := run.summarise(o.ens.confidence, spec)
	// The measured signal, with the read-out's projection and detection
	// noise (docs/model.md, Gyroscope figures); nil without a read-out.
	sum.Measured = ro.Measure(mc.OutcomesOf(run.records), run.manifest.Seed, o.ens.confidence, spec)
	if dir := o.ens.dir(); dir != "" {
		if err := present.WriteResults(dir, sum, run.records, spec); err != nil {
			return err
		}
		fmt.Fprintf(stderr, "wrote %s, %s and contrast and bias histograms (PNG, SVG) to %s\n", plural.Count(len(run.records), "realisation"), present.SummaryFile, dir)
	}
	if o.report != "" {
		if err := writeRunReport(e, stderr, o, sc, run, budget, sum, spec, ro); err != nil {
			return err
		}
	}
	if o.json {
		return present.WriteJSON(stdout, sum)
	}
	fmt.Fprintf(stdout, "Scenario %s\n%s\n", sc.Name, present.Describe(sc, run.realiser.Config(), run.realiser.Config().Sequence.Up.Name()+" ramp"))
	fmt.Fprintf(stdout, "Noise budget: %s\n", present.BudgetLine(budget))
	if note := present.ClampNote(run.realiser.Config(), budget); note != "" {
		fmt.Fprintln(stdout, note)
	}
	fmt.Fprintf(stdout, "%s\n", present.EnsembleLine(run.manifest, len(run.records), run.fresh, run.elapsed))
	fmt.Fprintf(stdout, "%s\n\n", present.NumericsLine(&run.numerics))
	if err := present.PrintSummary(stdout, sum); err != nil {
		return err
	}
	fmt.Fprintln(stdout)
	g := ro.Gyro(sum)
	if err := present.GyroGrid(sum, g).Render(stdout); err != nil {
		return err
	}
	if g == nil {
		fmt.Fprintln(stdout, present.NoReadout)
	}
	return nil
}

// writeRunReport writes the report of an ensemble run.
func writeRunReport(e env, stderr io.Writer, o runOptions, sc *scenario.Scenario, run *ensembleRun, budget mc.Budget, sum mc.Summary, spec mc.Spec, ro mc.Readout) error {
	cfg := run.realiser.Config()
	r := newReport(e, "Monte Carlo ensemble of "+cfg.Sequence.Up.Name()+" on "+sc.Name, sc, scenarioText(o.scenario), o.sets, run.manifest.Seed)
	name := cfg.Sequence.Up.Name()
	drive, err := present.DriveSection([]present.NamedConfig{{Name: name, Config: cfg}})
	if err != nil {
		return err
	}
	dyn, err := present.DynamicsSection(name, cfg)
	if err != nil {
		return err
	}
	ens, err := present.EnsembleSection("Ensemble", "ensemble-", sum, run.records, spec, present.SetupText(sc, cfg, name+" ramp", budget, present.EnsembleLine(run.manifest, len(run.records), run.fresh, run.elapsed), present.NumericsLine(&run.numerics)))
	if err != nil {
		return err
	}
	ens.Tables = append(ens.Tables, present.GyroGrid(sum, ro.Gyro(sum)).Table())
	r.Sections = append(r.Sections, drive, dyn, ens)
	return writeReport(stderr, r, o.report)
}
