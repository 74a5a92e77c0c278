package main

import (
	"fmt"
	"io"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/spf13/cobra"

	"rampart/cmd/internal/outfile"
	"rampart/cmd/internal/scenario"
	"rampart/mc"
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

func newRunCmd(e env) *cobra.Command {
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
			return runRun(e, cmd.OutOrStdout(), cmd.ErrOrStderr(), o)
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
	spec, err := o.spec()
	if err != nil {
		return err
	}
	sc, cfg, budget, err := loadWithBudget(o.scenario, o.sets)
	if err != nil {
		return err
	}
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
	sum := summarise(run.manifest, run.records, o.ens.confidence, spec)
	if dir := o.ens.dir(); dir != "" {
		if err := writeResults(dir, sum, run.records, spec); err != nil {
			return err
		}
		fmt.Fprintf(stderr, "wrote %d realisations, %s and contrast and bias histograms (PNG, SVG) to %s\n", len(run.records), summaryFile, dir)
	}
	if o.report != "" {
		if err := writeRunReport(e, stderr, o, sc, run, budget, sum, spec, ro); err != nil {
			return err
		}
	}
	if o.json {
		return writeJSON(stdout, sum)
	}
	fmt.Fprintf(stdout, "Scenario %s\n%s\n", sc.Name, describe(sc, run.realiser.Config(), run.realiser.Config().Sequence.Up.Name()+" ramp"))
	fmt.Fprintf(stdout, "Noise budget: %s\n", budgetLine(budget))
	fmt.Fprintf(stdout, "%s\n\n", ensembleLine(run, o.ens))
	if err := printSummary(stdout, sum); err != nil {
		return err
	}
	fmt.Fprintln(stdout)
	g := ro.gyro(sum)
	if err := gyroGrid(sum, g).Render(stdout); err != nil {
		return err
	}
	if g == nil {
		fmt.Fprintln(stdout, noReadout)
	}
	return nil
}

// writeRunReport writes the report of an ensemble run.
func writeRunReport(e env, stderr io.Writer, o runOptions, sc *scenario.Scenario, run *ensembleRun, budget mc.Budget, sum mc.Summary, spec mc.Spec, ro readout) error {
	cfg := run.realiser.Config()
	r := newReport(e, "Monte Carlo ensemble of "+cfg.Sequence.Up.Name()+" on "+sc.Name, sc, scenarioText(o.scenario), o.sets, run.manifest.Seed)
	name := cfg.Sequence.Up.Name()
	drive, err := driveSection([]namedConfig{{name, cfg}})
	if err != nil {
		return err
	}
	dyn, err := dynamicsSection(name, cfg)
	if err != nil {
		return err
	}
	ens, err := ensembleSection("Ensemble", "ensemble-", sum, run.records, spec, setupText(sc, cfg, name+" ramp", budget, ensembleLine(run, o.ens)))
	if err != nil {
		return err
	}
	ens.Tables = append(ens.Tables, gyroGrid(sum, ro.gyro(sum)).table())
	r.Sections = append(r.Sections, drive, dyn, ens)
	return writeReport(stderr, r, o.report)
}

// summaryFile is the JSON summary in an output directory.
const summaryFile = "summary.json"

func summarise(m mc.Manifest, recs []mc.Record, confidence float64, spec mc.Spec) mc.Summary {
	return mc.Summarise(recs, m.Seed, m.SagnacRad, m.ScaleFactorS, confidence, spec)
}

// writeResults writes the summary and the histograms of an ensemble to dir.
func writeResults(dir string, sum mc.Summary, recs []mc.Record, spec mc.Spec) error {
	if err := outfile.Write(filepath.Join(dir, summaryFile), func(w io.Writer) error { return writeJSON(w, sum) }); err != nil {
		return err
	}
	return writeHistograms(dir, sum, recs, spec)
}

// ensembleLine says how the ensemble was drawn and how long it took.
func ensembleLine(run *ensembleRun, o ensembleOptions) string {
	m := run.manifest
	s := fmt.Sprintf("Ensemble: %d realisations, seed %d, %s sampler", len(run.records), m.Seed, m.Sampler)
	if m.Shard != nil {
		from, to := m.Range()
		s += fmt.Sprintf(", shard %d/%d (realisations %d to %d of %d; merge the shards for the whole ensemble)", m.Shard.Index, m.Shard.Count, from, to-1, m.Samples)
	}
	if run.fresh > 0 {
		el, unit := duration(run.elapsed)
		s += fmt.Sprintf("; %d simulated in %s %s", run.fresh, el, unit)
		if len(run.records) > run.fresh {
			s += fmt.Sprintf(", %d resumed", len(run.records)-run.fresh)
		}
	}
	return s
}

// budgetLine lists the active noise sources of a budget.
func budgetLine(b mc.Budget) string {
	var parts []string
	add := func(on bool, s string) {
		if on {
			parts = append(parts, s)
		}
	}
	add(b.DepthCommonRel > 0, fmt.Sprintf("depth %s %% common", sig(100*b.DepthCommonRel, 3)))
	add(b.DepthDifferentialRel > 0, fmt.Sprintf("%s %% differential", sig(100*b.DepthDifferentialRel, 3)))
	add(b.RIN != nil, "intensity noise")
	add(b.Phase != nil, fmt.Sprintf("drive phase noise (correlation %s)", sig(b.PhaseCorrelation, 3)))
	add(b.ClockRel > 0, fmt.Sprintf("clock %s ppm", sig(b.ClockRel*1e6, 3)))
	add(b.SpeedRel > 0, fmt.Sprintf("speed %s ppm", sig(b.SpeedRel*1e6, 3)))
	add(b.SkewS > 0, fmt.Sprintf("skew %s ns", sig(b.SkewS*1e9, 3)))
	add(b.TemperatureSpreadK > 0, fmt.Sprintf("temperature spread %s nK", sig(b.TemperatureSpreadK*1e9, 3)))
	add(b.PulseAreaRel > 0, fmt.Sprintf("pulse area %s %%", sig(100*b.PulseAreaRel, 3)))
	if len(parts) == 0 {
		return "none (every realisation is the nominal shot)"
	}
	return strings.Join(parts, ", ") + " (standard deviations)"
}

// interval formats an interval of values formatted by f.
func interval(lo, hi float64, f func(float64) string) string {
	return "[" + f(lo) + ", " + f(hi) + "]"
}

// ciCell formats the interval of a distribution's entry, or says how many
// realisations would give one.
func ciCell(d mc.Distribution, key string, f func(float64) string) string {
	if ci, ok := d.CI[key]; ok {
		return interval(ci[0], ci[1], f)
	}
	return fmt.Sprintf("none below %d", d.NoBoundBelow[key])
}

func printSummary(w io.Writer, s mc.Summary) error {
	for i, g := range summaryGrids(s) {
		if i > 0 {
			fmt.Fprintln(w)
		}
		if err := g.Render(w); err != nil {
			return err
		}
	}
	return nil
}

// summaryGrids returns the tables of an ensemble summary: the
// distributions, then the fringe, bias spread, scale factor and yield.
func summaryGrids(s mc.Summary) []*grid {
	conf := fmt.Sprintf("%s %% interval", sig(100*s.Confidence, 3))
	c5 := func(x float64) string { return fixed(x, 5) }
	b3 := func(x float64) string { return sci(x, 3) }
	t := newGrid("Distributions over the realisations, with intervals: mean bootstrap-t, std percentile bootstrap, quantiles exact order statistics",
		"Statistic", "Contrast", conf, "Bias (rad)", conf, "Bias (deg/h)")
	rows := []struct {
		name, key string
		c, b, d   float64
	}{
		{"mean", "mean", s.Contrast.Mean, s.BiasRad.Mean, s.BiasDegPerH.Mean},
		{"std", "std", s.Contrast.Std, s.BiasRad.Std, s.BiasDegPerH.Std},
		{"p01", "p01", s.Contrast.P01, s.BiasRad.P01, s.BiasDegPerH.P01},
		{"p05", "p05", s.Contrast.P05, s.BiasRad.P05, s.BiasDegPerH.P05},
		{"p50 (median)", "p50", s.Contrast.P50, s.BiasRad.P50, s.BiasDegPerH.P50},
		{"p95", "p95", s.Contrast.P95, s.BiasRad.P95, s.BiasDegPerH.P95},
		{"p99", "p99", s.Contrast.P99, s.BiasRad.P99, s.BiasDegPerH.P99},
	}
	for _, r := range rows {
		t.Append(r.name, c5(r.c), ciCell(s.Contrast, r.key, c5), b3(r.b), ciCell(s.BiasRad, r.key, b3), b3(r.d))
	}
	u := newGrid("The averaged fringe, the bias spread and the yield", "Quantity", "Value", conf, "Unit")
	u.Append("Averaged-fringe contrast |mean z|", c5(s.FringeContrast.Value), interval(s.FringeContrast.Lo, s.FringeContrast.Hi, c5), "")
	u.Append("Averaged-fringe bias arg(mean z) - Sagnac", b3(s.FringeBiasRad.Value), interval(s.FringeBiasRad.Lo, s.FringeBiasRad.Hi, b3), "rad")
	u.Append("|bias| p95", b3(s.AbsBiasRad.P95), ciCell(s.AbsBiasRad, "p95", b3), "rad")
	cb := s.BiasCircular
	u.Append("Bias as an angle: mean direction (circular std)", b3(cb.MeanDirection), "("+b3(cb.StdDev)+")", "rad")
	u.Append("Inverted shots: |bias| > pi/2 or contrast < "+sig(cb.ContrastFloor, 3), strconv.Itoa(cb.Inverted), "", "")
	u.Append("Scale factor K", sig(s.ScaleFactorS, 6), "", "s (rad per rad/s)")
	if y := s.Yield; y != nil {
		var lim []string
		if y.Spec.MinContrast > 0 {
			lim = append(lim, "contrast >= "+sig(y.Spec.MinContrast, 6))
		}
		if y.Spec.MaxAbsBiasRad > 0 {
			lim = append(lim, "|bias| <= "+sig(y.Spec.MaxAbsBiasRad, 6)+" rad")
		}
		u.Append(fmt.Sprintf("Yield (%s): %d of %d", strings.Join(lim, ", "), y.Inside, s.Samples), fixed(y.Value, 4),
			interval(y.Lo, y.Hi, func(x float64) string { return fixed(x, 4) })+" exact", "")
	}
	return []*grid{t, u}
}
