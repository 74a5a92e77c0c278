package main

import (
	"context"
	"fmt"
	"io"
	"path/filepath"
	"slices"
	"strings"

	"github.com/spf13/cobra"

	"rampart/cmd/internal/outfile"
	"rampart/cmd/internal/plots"
	"rampart/cmd/internal/report"
	"rampart/cmd/internal/scenario"
	"rampart/mc"
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

// rankingFile is the ranking in the output directory of rank.
const rankingFile = "ranking.json"

func newRankCmd(e env) *cobra.Command {
	var o rankOptions
	cmd := &cobra.Command{
		Use:   "rank --scenario FILE --ramp NAME=SPEC... [SCENARIO...]",
		Short: "Rank ramps by a statistic of their ensembles on common random numbers",
		Long: `Rank ramps by a statistic of their Monte Carlo ensembles under the scenario's
noise budget. Every ramp sees the same noise draws (common random numbers: the
same seed, sampler, sample count and noise grid), so the paired differences
between ramps are much sharper than their separate intervals.

The ramps are given as --ramp NAME=SPEC on the scenario FILE, with SPEC one of
` + rampSpecs + ` (a shape keeps the scenario's ramp-up time; a ramp file,
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
			return runRank(e, cmd.OutOrStdout(), cmd.ErrOrStderr(), o, files)
		},
	}
	o.add(cmd, 1000, "the ranking")
	addReadoutFlags(cmd, &o.readout)
	f := cmd.Flags()
	f.StringArrayVar(&o.ramps, "ramp", nil, "a ramp to rank, `NAME=SPEC` with SPEC "+rampSpecs+"; repeatable")
	f.StringVar(&o.metric, "metric", mc.MetricP05, "ranking `metric`: "+strings.Join(mc.Metrics, ", "))
	f.Float64Var(&o.minContrast, "min-contrast", 0, "yield spec: a realisation is inside when its contrast is at least `X`")
	f.Float64Var(&o.maxBiasRad, "max-bias-rad", 0, "yield spec: a realisation is inside when its |bias| is at most `Y` rad")
	return cmd
}

// rankReport is what rank --json prints: the ranking and, for context,
// each ramp's ensemble.
type rankReport struct {
	mc.Ranking
	Ramps []rampReport `json:"ramps"`
}

// rampReport is one ramp's ensemble in a ranking.
type rampReport struct {
	Name              string     `json:"name"`
	Spec              string     `json:"spec"`
	RampUpS           float64    `json:"ramp_up_s"`
	Dir               string     `json:"dir,omitempty"`
	ContrastMean      float64    `json:"contrast_mean"`
	AbsBiasP95Rad     float64    `json:"abs_bias_p95_rad"`
	AbsBiasP95DegPerH float64    `json:"abs_bias_p95_deg_per_h"`
	Summary           mc.Summary `json:"summary"`
	Gyro              *mc.Gyro   `json:"gyro,omitempty"`
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
	sc, cfg, budget, err := o.load()
	if err != nil {
		return err
	}
	ro, err := o.readout.of(sc)
	if err != nil {
		return err
	}
	cs, err := contestants(sc, cfg, o.ramps, files, o.sets)
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
			names[i] = c.name
		}
		return printShardNote(stdout, o.ens, names, "rank the merged set")
	}
	if dir := o.ens.dir(); dir != "" {
		if err := writeRanking(dir, rep); err != nil {
			return err
		}
		fmt.Fprintf(stderr, "wrote each ramp's run, %s and the ranking figure to %s\n", rankingFile, dir)
	}
	var ramps []string
	for _, r := range rep.Ramps {
		ramps = append(ramps, fmt.Sprintf("%s = %s (%s us)", r.Name, rampDefinition(r), sig(r.RampUpS*1e6, 6)))
	}
	rampsLine := "Ramps: " + strings.Join(ramps, ", ")
	workLine := work.line(fmt.Sprintf("%d ramps x %d realisations on common random numbers", len(cs), o.ens.samples), o.ens)
	what := fmt.Sprintf("%d ramps", len(cs))
	if o.report != "" {
		if err := writeRankReport(e, stderr, o, sc, cs, recs, rep, spec, setupText(sc, cfg, what, budget, rampsLine, workLine)); err != nil {
			return err
		}
	}
	if o.json {
		return writeJSON(stdout, rep)
	}
	printHeader(stdout, sc, cfg, what, budget, rampsLine, workLine)
	return rankingGrid(rep).RenderNoted(stdout, rankingNotes(rep))
}

// rankContestants runs the ensemble of every contestant under budget on
// common random numbers (the same seed, sampler and samples, and one noise
// grid that serves them all), storing each in its subdirectory of the
// options' directory if there is one, and ranks them by metric (not for a
// shard, which ranks nothing). recs[i] holds contestant i's records.
func rankContestants(ctx context.Context, e env, stderr io.Writer, cs []contestant, budget mc.Budget, o ensembleOptions, metric string, spec mc.Spec, ro readout) (rankReport, [][]mc.Record, ensembleWork, error) {
	var work ensembleWork
	cfgs := make([]sim.Config, len(cs))
	for i, c := range cs {
		cfgs[i] = c.cfg
	}
	grid, err := sharedGrid(cfgs, budget)
	if err != nil {
		return rankReport{}, nil, work, err
	}
	names := make([]string, len(cs))
	recs := make([][]mc.Record, len(cs))
	rep := rankReport{Ramps: make([]rampReport, len(cs))}
	for i, c := range cs {
		ens := mc.Ensemble{Config: c.cfg, Budget: budget, Samples: o.samples, Seed: o.seed, Sampler: o.sampler}
		tag := grid.apply(&ens)
		run, dir, err := runPart(ctx, e, stderr, c.sc, ens, tag, o, c.name, "rank "+c.name)
		if err != nil {
			return rankReport{}, nil, work, err
		}
		work.add(run)
		sum := summarise(run.manifest, run.records, o.confidence, spec)
		if dir != "" {
			if err := writeResults(dir, sum, run.records, spec); err != nil {
				return rankReport{}, nil, work, err
			}
		}
		names[i], recs[i] = c.name, run.records
		rep.Ramps[i] = rampReport{
			Name: c.name, Spec: c.spec, RampUpS: c.cfg.Sequence.Up.Duration(), Dir: dir,
			ContrastMean: sum.Contrast.Mean, AbsBiasP95Rad: sum.AbsBiasRad.P95, AbsBiasP95DegPerH: absBiasP95DegPerH(sum),
			Summary: sum, Gyro: ro.gyro(sum),
		}
	}
	if o.shard != "" {
		return rep, recs, work, nil
	}
	rep.Ranking, err = mc.Rank(names, recs, metric, spec, o.confidence, o.seed)
	return rep, recs, work, err
}

// metricLabels name the ranking metrics in tables and figures.
var metricLabels = map[string]string{
	mc.MetricP05:        "Contrast p05",
	mc.MetricMean:       "Mean contrast",
	mc.MetricYield:      "Yield",
	mc.MetricBiasSpread: "|bias| p95 (rad)",
}

// metricFormat formats a value of a ranking metric.
func metricFormat(metric string) func(float64) string {
	switch metric {
	case mc.MetricYield:
		return func(x float64) string { return fixed(x, 4) }
	case mc.MetricBiasSpread:
		return func(x float64) string { return sci(x, 3) }
	}
	return func(x float64) string { return fixed(x, 5) }
}

// rankingGrid returns the ranking table: the places best first, with the
// metric and the paired differences, and each ramp's ensemble for context.
func rankingGrid(rep rankReport) *grid {
	r := rep.Ranking
	conf := fmt.Sprintf("%s %% interval", sig(100*r.Confidence, 3))
	f := metricFormat(r.Metric)
	byName := map[string]rampReport{}
	withGyro := false
	for _, rr := range rep.Ramps {
		byName[rr.Name] = rr
		withGyro = withGyro || rr.Gyro != nil
	}
	header := []string{"Place and ramp", metricLabels[r.Metric], conf, "Diff to best", conf, "Diff to next", "Resolved", "Mean contrast", "|bias| p95 (rad)", "|bias| p95 (deg/h)"}
	if withGyro {
		header = append(header, "ARW (deg/sqrt(h))")
	}
	t := newGrid(fmt.Sprintf("Ramps ranked by %s, best first", strings.ToLower(metricLabels[r.Metric])), header...)
	for _, p := range r.Ranking {
		rr := byName[p.Name]
		next := ""
		if p.DiffToNext != nil {
			next = sci(p.DiffToNext.Value, 2)
		}
		row := []string{fmt.Sprintf("%d. %s", p.Place, p.Name), f(p.Value), interval(p.Lo, p.Hi, f),
			f(p.DiffToBest.Value), interval(p.DiffToBest.Lo, p.DiffToBest.Hi, f), next, yesNo(p.Resolved),
			fixed(rr.ContrastMean, 5), sci(rr.AbsBiasP95Rad, 3), sci(rr.AbsBiasP95DegPerH, 3)}
		if withGyro {
			arw := ""
			if rr.Gyro != nil {
				arw = sci(rr.Gyro.AngleRandomWalkDegPerSqrtH, 3)
			}
			row = append(row, arw)
		}
		t.Append(row...)
	}
	return t
}

// rankingNotes explain the ranking table: the order, the intervals and, with
// a read-out, the angle random walk.
func rankingNotes(rep rankReport) []string {
	r := rep.Ranking
	better := "higher"
	if !r.HigherBetter {
		better = "lower"
	}
	out := []string{fmt.Sprintf("Best first by %s (%s is better), over %d realisations per ramp. Every statement holds simultaneously at %s %%: quantile and yield intervals are exact (order statistics, Clopper-Pearson) at 1 - (1 - c)/k for k ramps, and two ramps differ when their intervals do not overlap; mean differences are paired over the same noise draws with a max-type bootstrap over all pairs. A place is resolved when it is separated from every other ramp.",
		strings.ToLower(metricLabels[r.Metric]), better, r.Samples, sig(100*r.Confidence, 3))}
	if g := rep.Ramps[0].Gyro; g != nil {
		out = append(out, fmt.Sprintf("ARW: the angle random walk at each ramp's mean contrast, %s atoms per shot, one shot per %s s.", sig(g.Atoms, 6), sig(g.CycleS, 6)))
	}
	return out
}

// rampDefinition is what defined a ramp: its --ramp SPEC or its scenario
// file.
func rampDefinition(r rampReport) string {
	return strings.TrimPrefix(r.Spec, "--ramp "+r.Name+"=")
}

// writeRanking writes the ranking and its figure to dir.
func writeRanking(dir string, rep rankReport) error {
	if err := outfile.Write(filepath.Join(dir, rankingFile), func(w io.Writer) error { return writeJSON(w, rep) }); err != nil {
		return err
	}
	nfs, err := rankingFigure(rep)
	if err != nil {
		return err
	}
	return writeFigures(dir, nfs)
}

// rankingFigure plots each ramp's metric with its interval, best first: one
// figure, named ranking.
func rankingFigure(rep rankReport) ([]namedFigure, error) {
	items := make([]plots.Estimate, len(rep.Ranking.Ranking))
	for i, p := range rep.Ranking.Ranking {
		items[i] = plots.Estimate{Name: p.Name, Value: p.Value, Lo: p.Lo, Hi: p.Hi}
	}
	fig, err := plots.Ranking(items, plots.RankingOptions{
		Title:      fmt.Sprintf("Ramps ranked by %s, %d realisations each", strings.ToLower(metricLabels[rep.Metric]), rep.Samples),
		ValueLabel: metricLabels[rep.Metric],
	})
	if err != nil {
		return nil, err
	}
	caption := fmt.Sprintf("Each ramp's %s with its %s %% interval, best first.", strings.ToLower(metricLabels[rep.Metric]), sig(100*rep.Confidence, 3))
	return []namedFigure{{name: "ranking", caption: caption, fig: fig}}, nil
}

// rankSections takes the ranking (rank --json's object), each ramp's
// configuration, its records by name and the yield spec, and shows the
// ranking table and figure, then each ramp's ensemble, best first, its
// figures' ids prefixed "rank-NAME-" (a '.' in NAME as '_', and the place
// added should that make two prefixes the same).
func rankSections(rep rankReport, cfgs []namedConfig, recs map[string][]mc.Record, spec mc.Spec) ([]report.Section, error) {
	figs, err := figures(rankingFigure(rep))
	if err != nil {
		return nil, err
	}
	out := []report.Section{{
		Heading: "Ranking",
		Text:    strings.Join(rankingNotes(rep), "\n\n"),
		Tables:  []report.Table{rankingGrid(rep).table()},
		Figures: figs,
	}}
	byName := map[string]rampReport{}
	for _, rr := range rep.Ramps {
		byName[rr.Name] = rr
	}
	prefixes := map[string]bool{}
	for _, p := range rep.Ranking.Ranking {
		i := slices.IndexFunc(cfgs, func(c namedConfig) bool { return c.name == p.Name })
		rr, ok := byName[p.Name]
		if i < 0 || !ok || recs[p.Name] == nil {
			return nil, fmt.Errorf("ranking report: ramp %q lacks its configuration, summary or records", p.Name)
		}
		// A ramp's name may hold a '.', which an id may not.
		prefix := "rank-" + strings.ReplaceAll(p.Name, ".", "_") + "-"
		if prefixes[prefix] {
			prefix += fmt.Sprint(p.Place) + "-"
		}
		prefixes[prefix] = true
		up := cfgs[i].cfg.Sequence.Up
		peak, _ := sim.PeakSpeed(up)
		text := fmt.Sprintf("Place %d: %s = %s, ramp-up %s of %s us with a peak speed of %s rad/s, on the noise draws that every ramp shares.",
			p.Place, p.Name, rampDefinition(rr), up.Name(), sig(up.Duration()*1e6, 6), sig(peak, 5))
		sec, err := ensembleSection("Ensemble of "+p.Name, prefix, rr.Summary, recs[p.Name], spec, text)
		if err != nil {
			return nil, err
		}
		out = append(out, sec)
	}
	return out, nil
}

// writeRankReport writes the report of a ranking: every ramp's drive, the
// co-moving dynamics of the best, the ranking and each ramp's ensemble.
func writeRankReport(e env, stderr io.Writer, o rankOptions, sc *scenario.Scenario, cs []contestant, recs [][]mc.Record, rep rankReport, spec mc.Spec, setup string) error {
	cfgs := make([]namedConfig, len(cs))
	byName := map[string][]mc.Record{}
	for i, c := range cs {
		cfgs[i] = namedConfig{c.name, c.cfg}
		byName[c.name] = recs[i]
	}
	secs, err := rankSections(rep, cfgs, byName, spec)
	if err != nil {
		return err
	}
	return writeDecisionReport(e, stderr, o.decisionOptions, fmt.Sprintf("Ranking of %d ramps on %s", len(cs), sc.Name), sc, cfgs, rep.Ranking.Ranking[0].Name, setup, secs...)
}
