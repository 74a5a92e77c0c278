package main

import (
	"context"
	"fmt"
	"io"
	"path/filepath"
	"slices"
	"strings"

	"github.com/spf13/cobra"

	"rampart/cmd/internal/present"
	"rampart/design"
	"rampart/internal/atomicfile"
	"rampart/mc"
	"rampart/scenario"
)

// edgeFile holds the search's result in its output directory.
const edgeFile = "edge.json"

type edgeOptions struct {
	scenario string
	sets     []string
	key      string
	span     string
	steps    int
	largest  bool
	spec     string
	ens      ensembleOptions
	json     bool
	report   string
}

// newEdgeCmd returns the command; run is what it runs with the parsed
// options (runEdge outside tests).
func newEdgeCmd(e env, run func(e env, stdout, stderr io.Writer, o edgeOptions, confidenceGiven bool) error) *cobra.Command {
	var o edgeOptions
	cmd := &cobra.Command{
		Use:   "edge --scenario FILE --spec SPEC.toml --key KEY --range FROM:TO",
		Short: "Find the smallest (or largest) value of a key that meets the spec under the budget",
		Long: `Search a scenario key's range for the edge of the spec: the smallest value
that meets it (the shortest ramp: --key ramp.duration_us) or, with
--largest, the largest (the most laps, the largest error). At each value
tried it runs the ensemble under the noise budget and qualifies it as
rampart qualify does. It tries the good end of the range first (the top
for the smallest value), then the other end, then bisects --steps times
between the best passing value and the nearest value not passing; fail and
undecided both count as not passing. Each point is qualified at level
alpha/m, m = steps + 2 the most points the search can try (Bonferroni), so
that the reported value wrongly meets the spec with probability at most
alpha = 1 - confidence for the search as a whole. The key is assumed to
cross the spec once in the range.

Every point's ensemble starts from the same --seed (common random numbers).
--out DIR keeps each point's run in DIR/KEY=VALUE and the result in
edge.json; --resume DIR continues an interrupted search. Exit code 0 when a
value is found, 1 when none in the range meets the spec, 2 bad input. The
search is sequential (each value tried depends on the verdicts before it), so
--shard is refused: run it on one node with --workers set to its cores; a
confirmation at the value found, rampart qualify --set KEY=VALUE, shards as a
job array (rampart sbatch).`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			return run(e, cmd.OutOrStdout(), cmd.ErrOrStderr(), o, cmd.Flags().Changed("confidence"))
		},
	}
	addScenarioFlags(cmd, &o.scenario, &o.sets)
	addEnsembleFlags(cmd, &o.ens, 400)
	confidenceFromSpec(cmd)
	f := cmd.Flags()
	f.StringVar(&o.key, "key", "", "the scenario `KEY` to search, such as ramp.duration_us")
	f.StringVar(&o.span, "range", "", "the range `FROM:TO` of the key, in its file unit")
	f.IntVar(&o.steps, "steps", 6, "bisection `steps` after the two ends (the bracket ends (TO-FROM)/2^steps wide)")
	f.BoolVar(&o.largest, "largest", false, "find the largest value that meets the spec, not the smallest")
	f.StringVar(&o.spec, "spec", "", "spec `file` (TOML) of the criteria to meet")
	f.BoolVar(&o.json, "json", false, "print the result as one JSON object")
	addReportFlag(cmd, &o.report)
	cmd.MarkFlagRequired("spec")
	cmd.MarkFlagRequired("key")
	cmd.MarkFlagRequired("range")
	return cmd
}

func runEdge(e env, stdout, stderr io.Writer, o edgeOptions, confidenceGiven bool) error {
	if err := o.ens.validate(); err != nil {
		return err
	}
	if o.ens.shard != "" {
		return fmt.Errorf("--shard %s: a search decides where to go next from each point, so it is not sharded", o.ens.shard)
	}
	if err := o.ens.checkResumeDir(); err != nil {
		return err
	}
	if err := checkReportDir(o.report); err != nil {
		return err
	}
	req, err := readRequirements(o.spec, o.ens.confidence, confidenceGiven)
	if err != nil {
		return err
	}
	o.ens.confidence = req.Confidence
	if req.Yield.Active() {
		o.ens.yield = &req.Yield
	}
	ax, err := design.ParseAxis(o.key + "=" + o.span + ":2")
	if err != nil || strings.Count(o.span, ":") != 1 {
		return fmt.Errorf("--range %q: want FROM:TO, two finite numbers in the key's file unit", o.span)
	}
	lo, hi := min(ax.Values[0], ax.Values[1]), max(ax.Values[0], ax.Values[1])
	search := design.Edge{Lo: lo, Hi: hi, Steps: o.steps, Largest: o.largest, Requirements: req}
	if err := search.Validate(); err != nil {
		return fmt.Errorf("--range %s --steps %d: %w", o.span, o.steps, err)
	}
	if n := search.PointRequirements().MinSamples(); o.ens.samples < n {
		return fmt.Errorf("--samples %d cannot pass spec %q at a point's confidence %s %% (%s %% shared by up to %d points) even if every realisation were far inside its limits; give at least %d",
			o.ens.samples, o.spec, present.Sig(100*(1-(1-req.Confidence)/float64(search.Evaluations())), 5), present.Sig(100*req.Confidence, 4), search.Evaluations(), n)
	}
	// Both ends are loaded first, so that a bad key or value is reported
	// before anything runs.
	load := func(x float64) (*scenario.Scenario, mc.Ensemble, error) {
		set := design.Set(o.key, x)
		sc, cfg, budget, err := scenario.LoadBudget(o.scenario, append(slices.Clone(o.sets), set))
		if err != nil {
			return nil, mc.Ensemble{}, fmt.Errorf("--key %s at %s: %w", o.key, set, err)
		}
		return sc, mc.Ensemble{Config: cfg, Budget: budget, Samples: o.ens.samples, Seed: o.ens.seed, Sampler: o.ens.sampler}, nil
	}
	var first *scenario.Scenario
	for _, x := range []float64{lo, hi} {
		sc, _, err := load(x)
		if err != nil {
			return err
		}
		first = sc
	}
	name := first.Name
	ctx, stop := signalContext()
	defer stop()
	search.Sample = func(ctx context.Context, x float64) (design.Sample, error) {
		sc, ens, err := load(x)
		if err != nil {
			return design.Sample{}, err
		}
		set := design.Set(o.key, x)
		run, _, err := runPart(ctx, e, stderr, sc, ens, nil, o.ens, set, "edge "+set)
		if err != nil {
			return design.Sample{}, err
		}
		if err := mc.CheckDecidable(run.records); err != nil {
			return design.Sample{}, fmt.Errorf("%s: %w", set, err)
		}
		return design.Sample{Records: run.records, ScaleFactorS: run.manifest.ScaleFactorS, Seed: run.manifest.Seed, LossPossible: run.manifest.LossPossible}, nil
	}
	search.Evaluated = func(ev design.Evaluation) {
		fmt.Fprintf(stderr, "%s = %s: %s\n", o.key, present.Sig(ev.Value, 6), ev.Qualification.Verdict)
	}
	res, err := search.Find(ctx)
	if err != nil {
		return err
	}
	rep := present.EdgeReport{Scenario: name, Key: o.key, Spec: o.spec, Samples: o.ens.samples, Seed: o.ens.seed, EdgeResult: res}
	if dir := o.ens.dir(); dir != "" {
		if err := atomicfile.Write(filepath.Join(dir, edgeFile), func(w io.Writer) error { return present.WriteJSON(w, rep) }); err != nil {
			return err
		}
		fmt.Fprintf(stderr, "wrote %s to %s\n", edgeFile, dir)
	}
	if o.report != "" {
		r := newReport(e, "Edge of "+o.key+" on "+name, first, scenarioText(o.scenario), o.sets, o.ens.seed)
		r.Sections = present.EdgeSections(rep)
		if err := writeReport(stderr, r, o.report); err != nil {
			return err
		}
	}
	if o.json {
		err = present.WriteJSON(stdout, rep)
	} else {
		err = present.PrintEdge(stdout, rep)
	}
	if err != nil {
		return err
	}
	if !res.Found {
		return &exitError{code: 1, err: fmt.Errorf("no value of %s in [%s, %s] meets spec %q", o.key, present.Sig(lo, 6), present.Sig(hi, 6), o.spec)}
	}
	return nil
}
