package main

import (
	"context"
	"fmt"
	"io"
	"slices"
	"strings"

	"github.com/spf13/cobra"

	"rampart/cmd/internal/present"
	"rampart/internal/plural"
	"rampart/mc"
	"rampart/scenario"
	"rampart/sim"
)

type rankOptions struct {
	decisionOptions
	ramps       []string
	metric      string
	minContrast float64
	maxBiasRad  float64
	readout     readoutOptions
}

// newRankCmd returns the command; run is what it runs with the parsed
// options (runRank outside tests).
func newRankCmd(e env, run func(e env, stdout, stderr io.Writer, o rankOptions, files []string) error) *cobra.Command {
	var o rankOptions
	cmd := &cobra.Command{
		Use:   "rank --scenario FILE --ramp NAME=SPEC... [SCENARIO...]",
		Short: "Rank ramps by a statistic of their ensembles on common random numbers",
		Long: `Rank ramps by a statistic of their Monte Carlo ensembles under the scenario's
noise budget. Every ramp sees the same noise draws (common random numbers: the
same seed, sampler, sample count and noise grid), so the paired differences
between ramps are much sharper than their separate intervals.

The ramps are given as --ramp NAME=SPEC on the scenario FILE, with SPEC one of
` + scenario.RampSpecs + ` (a shape keeps the scenario's ramp-up time; a ramp file,
relative to the current directory, has its own). Scenario files given after
the flags add their ramps, and then FILE's own ramp takes part too, each named
after its file; they must agree with FILE in everything but [ramp].

The metric (--metric) is p05, the 5th-percentile contrast (the default),
mean (mean contrast), yield (the fraction of realisations inside
--min-contrast and --max-bias-rad) or bias-spread (the 95th percentile of
|bias|, lower is better). The table lists the ramps best first with the
metric and its interval, the paired difference to the best with its interval,
whether each place is resolved (the paired intervals to its neighbours exclude
zero), and for context each ramp's mean contrast and |bias| p95.

--out DIR keeps each ramp's ensemble in DIR/NAME (a run directory, as rampart
run writes) with the ranking and its figure; --resume DIR reuses the complete
runs and continues the others. --shard k/n runs slice k of every ramp into
DIR/NAME and prints how to merge the slices and rank the merged set.`,
		Args: cobra.ArbitraryArgs,
		RunE: func(cmd *cobra.Command, files []string) error {
			return run(e, cmd.OutOrStdout(), cmd.ErrOrStderr(), o, files)
		},
	}
	o.add(cmd, 1000, "the ranking")
	addReadoutFlags(cmd, &o.readout)
	f := cmd.Flags()
	f.StringArrayVar(&o.ramps, "ramp", nil, "a ramp to rank, `NAME=SPEC` with SPEC "+scenario.RampSpecs+"; repeatable")
	f.StringVar(&o.metric, "metric", mc.MetricP05, "ranking `metric`: "+strings.Join(mc.Metrics, ", "))
	f.Float64Var(&o.minContrast, "min-contrast", 0, "yield spec: a realisation is inside when its contrast is at least `X`")
	f.Float64Var(&o.maxBiasRad, "max-bias-rad", 0, "yield spec: a realisation is inside when its |bias| is at most `Y` rad")
	return cmd
}

func runRank(e env, stdout, stderr io.Writer, o rankOptions, files []string) error {
	if err := o.validate(); err != nil {
		return err
	}
	if err := o.ens.checkResumeDir(); err != nil {
		return err
	}
	spec, err := (&runOptions{minContrast: o.minContrast, maxBiasRad: o.maxBiasRad}).spec()
	if err != nil {
		return err
	}
	switch {
	case !slices.Contains(mc.Metrics, o.metric):
		return fmt.Errorf("--metric %q: want one of %s", o.metric, strings.Join(mc.Metrics, ", "))
	case o.metric == mc.MetricYield && !spec.Active():
		return fmt.Errorf("--metric yield needs the spec of a good realisation: give --min-contrast X, --max-bias-rad Y or both")
	}
	sc, cfg, budget, err := o.load(stderr)
	if err != nil {
		return err
	}
	ro, err := o.readout.of(sc)
	if err != nil {
		return err
	}
	cs, err := scenario.Contestants(sc, cfg, o.ramps, files, o.sets)
	if err != nil {
		return err
	}
	ctx, stop := signalContext()
	defer stop()
	rep, recs, work, err := rankContestants(ctx, e, stderr, cs, budget, o.ens, o.metric, spec, ro)
	if err != nil {
		return err
	}
	if o.ens.shard != "" {
		names := make([]string, len(cs))
		for i, c := range cs {
			names[i] = c.Name
		}
		return present.PrintShardNote(stdout, o.ens.shard, o.ens.dir(), names, "rank the merged set")
	}
	if dir := o.ens.dir(); dir != "" {
		if err := present.WriteRanking(dir, rep); err != nil {
			return err
		}
		fmt.Fprintf(stderr, "wrote each ramp's run, %s and the ranking figure to %s\n", present.RankingFile, dir)
	}
	var ramps []string
	for _, r := range rep.Ramps {
		ramps = append(ramps, fmt.Sprintf("%s = %s (%s us)", r.Name, present.RampDefinition(r), present.Sig(r.RampUpS*1e6, 6)))
	}
	rampsLine := "Ramps: " + strings.Join(ramps, ", ")
	workLine := work.Line(fmt.Sprintf("%s x %s on common random numbers", plural.Count(len(cs), "ramp"), plural.Count(o.ens.samples, "realisation")), o.ens.seed, o.ens.sampler, o.ens.shard)
	numLines := present.RampNumericsLines(rep)
	what := plural.Count(len(cs), "ramp")
	if o.report != "" {
		if err := writeRankReport(e, stderr, o, sc, cs, recs, rep, spec, present.SetupText(sc, cfg, what, budget, append([]string{rampsLine, workLine}, numLines...)...)); err != nil {
			return err
		}
	}
	if o.json {
		return present.WriteJSON(stdout, rep)
	}
	present.PrintHeader(stdout, sc, cfg, what, budget, append([]string{rampsLine, workLine}, numLines...)...)
	return present.PrintRanking(stdout, rep)
}

// rankContestants runs the ensemble of every contestant under budget on
// common random numbers (the same seed, sampler and samples, and one noise
// grid that serves them all), storing each in its subdirectory of the
// options' directory if there is one, and ranks them by metric (not for a
// shard, which ranks nothing). recs[i] holds contestant i's records.
func rankContestants(ctx context.Context, e env, stderr io.Writer, cs []scenario.Contestant, budget mc.Budget, o ensembleOptions, metric string, spec mc.Spec, ro mc.Readout) (present.RankReport, [][]mc.Record, present.Work, error) {
	var work present.Work
	cfgs := make([]sim.Config, len(cs))
	for i, c := range cs {
		cfgs[i] = c.Config
	}
	grid, err := mc.SharedGrid(cfgs, budget)
	if err != nil {
		return present.RankReport{}, nil, work, err
	}
	names := make([]string, len(cs))
	recs := make([][]mc.Record, len(cs))
	seeds := make([]uint64, len(cs))
	rep := present.RankReport{Ramps: make([]present.RampReport, len(cs))}
	// Every contestant's numerics are checked before any ensemble runs, so
	// that a refusal leaves no run directory behind.
	enss := make([]mc.Ensemble, len(cs))
	for i, c := range cs {
		enss[i] = mc.Ensemble{Config: c.Config, Budget: budget, Samples: o.samples, Seed: o.seed, Sampler: o.sampler, ScaleFactor: o.scaleFactor}
		r, err := mc.NewRealiser(enss[i])
		if err != nil {
			return present.RankReport{}, nil, work, fmt.Errorf("ramp %s: %w", c.Name, err)
		}
		if _, err := preflight(fmt.Sprintf("ramp %s", c.Name), r.Config()); err != nil {
			return present.RankReport{}, nil, work, err
		}
	}
	for i, c := range cs {
		ens := enss[i]
		tag := grid.Apply(&ens)
		run, dir, err := runPart(ctx, e, stderr, c.Scenario, ens, tag, o, c.Name, "rank "+c.Name)
		if err != nil {
			return present.RankReport{}, nil, work, err
		}
		work.Add(run.fresh, len(run.records), run.elapsed)
		sum := run.summarise(o.confidence, spec)
		// The measured signal (docs/model.md, Gyroscope figures); nil
		// without a read-out.
		sum.Measured = ro.Measure(mc.OutcomesOf(run.records), run.manifest.Seed, o.confidence, spec)
		if dir != "" {
			if err := present.WriteResults(dir, sum, run.records, spec); err != nil {
				return present.RankReport{}, nil, work, err
			}
		}
		names[i], recs[i], seeds[i] = c.Name, run.records, run.manifest.Seed
		rep.Ramps[i] = present.RampReport{
			Name: c.Name, Spec: c.Spec, RampUpS: c.Config.Sequence.Up.Duration(), Dir: dir,
			ContrastMean: sum.Contrast.Mean, AbsBiasP95Rad: sum.AbsBiasRad.P95, AbsBiasP95DegPerH: present.AbsBiasP95DegPerH(sum),
			Summary: sum, Gyro: ro.Gyro(sum),
		}
	}
	if o.shard != "" {
		return rep, recs, work, nil
	}
	if rep.Ranking, err = mc.Rank(names, recs, metric, spec, o.confidence, o.seed); err != nil {
		return rep, recs, work, err
	}
	// With a read-out, a metric of the bias is ranked on the measured
	// signal too (the contrast metrics read the same in both). Every ramp
	// shares the seed, so the read-out draws are common random numbers too.
	if ro.Atoms > 0 && (metric == mc.MetricBiasSpread || (metric == mc.MetricYield && spec.MaxAbsBiasRad > 0)) {
		measured := make([][]mc.Record, len(recs))
		for i := range recs {
			measured[i] = ro.MeasuredRecords(recs[i], seeds[i])
		}
		m, err := mc.Rank(names, measured, metric, spec, o.confidence, o.seed)
		if err != nil {
			return rep, recs, work, err
		}
		rep.MeasuredSignal = &m
	}
	return rep, recs, work, nil
}

// writeRankReport writes the report of a ranking: every ramp's drive, the
// co-moving dynamics of the best, the ranking and each ramp's ensemble.
func writeRankReport(e env, stderr io.Writer, o rankOptions, sc *scenario.Scenario, cs []scenario.Contestant, recs [][]mc.Record, rep present.RankReport, spec mc.Spec, setup string) error {
	cfgs := make([]present.NamedConfig, len(cs))
	byName := map[string][]mc.Record{}
	for i, c := range cs {
		cfgs[i] = present.NamedConfig{Name: c.Name, Config: c.Config}
		byName[c.Name] = recs[i]
	}
	secs, err := present.RankSections(rep, cfgs, byName, spec)
	if err != nil {
		return err
	}
	return writeDecisionReport(e, stderr, o.decisionOptions, fmt.Sprintf("Ranking of %s on %s", plural.Count(len(cs), "ramp"), sc.Name), sc, cfgs, rep.Ranking.Ranking[0].Name, setup, secs...)
}
