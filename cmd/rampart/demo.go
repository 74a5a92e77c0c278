package main

import (
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"rampart"
	"rampart/cmd/internal/present"
	"rampart/mc"
	"rampart/scenario"
	"rampart/sim"
)

// demoScenario is the demo's scenario inside rampart.Demo.
const demoScenario = "testdata/demo/demo.toml"

// demoRamps are the ramps the demo compares on the demo scenario: its
// smooth ramp, the inverse-engineered ramp and the optimiser's table.
var demoRamps = []struct {
	name string
	ramp scenario.Ramp // DurationUS zero: the scenario's
}{
	{"sin2", scenario.Ramp{Shape: "sin2"}},
	{"inverse", scenario.Ramp{Shape: "inverse"}},
	{"optimal", scenario.Ramp{Shape: "file", File: "testdata/demo/optimal.csv"}},
}

// demoSpec is the demo's qualification spec inside rampart.Demo.
const demoSpec = "testdata/demo/spec.toml"

// demoOptions size the demo's ensembles.
type demoOptions struct {
	samples          int    // realisations per ramp in the ranking
	toleranceSamples int    // realisations per amplitude in the tolerance search
	seed             uint64 // of every ensemble
	workers          int
	report           string // directory of the report
}

func newDemoCmd(e env) *cobra.Command {
	var o demoOptions
	cmd := &cobra.Command{
		Use:   "demo",
		Short: "Run the built-in demo: compare, rank and qualify ramps, derive tolerances, write a report",
		Long: `Run the built-in demo scenario (` + demoScenario + `, embedded in the
binary; its comments tell the invented lab story) as a whole job: a noise-free
shot of the smooth sin2 ramp, the inverse-engineered ramp and the table of an
optimiser (optimal.csv) side by side; the three ranked under the scenario's
noise budget on common random numbers; the winner qualified against the demo
spec (` + demoSpec + `) on its ranking ensemble; the tolerance of every source
of the budget for the winner; the winner's noise transfer functions and the
intensity and drive phase noise masks of the spec; the shortest sin2 ramp
that meets the spec (the search of rampart edge); and one HTML report of
it all, whose path it prints.`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			d, err := newDemo(e, cmd.OutOrStdout())
			if err != nil {
				return err
			}
			d.stderr, d.opts = cmd.ErrOrStderr(), o
			return d.run()
		},
	}
	f := cmd.Flags()
	f.IntVar(&o.samples, "samples", 200, "realisations `N` per ramp in the ranking")
	f.IntVar(&o.toleranceSamples, "tolerance-samples", 80, "realisations `N` per amplitude in the tolerance search")
	f.Uint64Var(&o.seed, "seed", 1, "seed `S` of every ensemble")
	f.IntVar(&o.workers, "workers", 0, "worker goroutines `W` (0: one per core)")
	f.StringVar(&o.report, "report", "rampart-demo", "write the report to `DIR`/report.html")
	return cmd
}

// demo is the state the stages of `rampart demo` share.
type demo struct {
	env    env
	out    io.Writer
	stderr io.Writer
	opts   demoOptions
	base   *scenario.Scenario

	// filled in by the stages
	cs       []scenario.Contestant
	ranking  present.RankReport
	recs     [][]mc.Record
	winner   int
	qualify  present.QualifyReport
	tol      present.ToleranceReport
	response *present.ResponseReport
	design   present.EdgeReport
}

func newDemo(e env, out io.Writer) (*demo, error) {
	sc, err := scenario.LoadFS(rampart.Demo, demoScenario, nil)
	if err != nil {
		return nil, err
	}
	return &demo{env: e, out: out, stderr: io.Discard, base: sc,
		opts: demoOptions{samples: 200, toleranceSamples: 80, seed: 1, report: "rampart-demo"}}, nil
}

// stages are the demo's steps in order.
func (d *demo) stages() []func() error {
	return []func() error{d.compareRamps, d.rank, d.qualifyWinner, d.tolerances, d.responseStage, d.designStage, d.writeReport}
}

// check refuses demo options that could not give an answer, before any
// stage runs.
func (d *demo) check() error {
	o := d.opts
	switch {
	case o.samples < 2:
		return fmt.Errorf("--samples %d: the ranking needs at least 2 realisations per ramp", o.samples)
	case o.workers < 0:
		return fmt.Errorf("--workers %d: need 0 (one per core) or more", o.workers)
	}
	if err := checkReportDir(o.report); err != nil {
		return err
	}
	req, err := d.requirements()
	if err != nil {
		return err
	}
	if n := req.MinSamples(); o.toleranceSamples < n {
		return fmt.Errorf("--tolerance-samples %d: the demo spec at %g %% confidence needs at least %d realisations per amplitude to bound its quantiles and yield", o.toleranceSamples, 100*req.Confidence, n)
	}
	search, err := d.designSearch()
	if err != nil {
		return err
	}
	if n := search.PointRequirements().MinSamples(); o.samples < n {
		return fmt.Errorf("--samples %d: the design stage qualifies each of up to %d ramps at %s %% and needs at least %d realisations per ramp to pass", o.samples, search.Evaluations(), present.Sig(100*search.PointRequirements().Confidence, 5), n)
	}
	return nil
}

func (d *demo) run() error {
	if err := d.check(); err != nil {
		return err
	}
	for i, stage := range d.stages() {
		if i > 0 {
			fmt.Fprintln(d.out)
		}
		if err := stage(); err != nil {
			return err
		}
	}
	return nil
}

// variant returns the demo scenario with the ramp of demoRamps[i].
func (d *demo) variant(i int) (*scenario.Scenario, sim.Config, error) {
	sc := *d.base
	r := demoRamps[i].ramp
	if r.DurationUS == 0 {
		r.DurationUS = d.base.Ramp.DurationUS
	}
	sc.Ramp = r
	cfg, err := sc.Config()
	return &sc, cfg, err
}

// compareRamps runs one noise-free shot with each of demoShapes.
func (d *demo) compareRamps() error {
	var runs []present.ShotRun
	var cfg sim.Config
	var names []string
	for i, dr := range demoRamps {
		sc, c, err := d.variant(i)
		if err != nil {
			return err
		}
		run, err := simulate(d.env, sc, c, nil)
		if err != nil {
			return err
		}
		// The bias at zero rotation, as rampart shot reports it (two more
		// shots at Omega +- h, sim.Simulator.Gyro).
		g, _, err := zeroRateGyro(sc, run.Config)
		if err != nil {
			return err
		}
		run.Gyro = &g
		runs, cfg = append(runs, run), c
		names = append(names, dr.name)
		d.cs = append(d.cs, scenario.Contestant{Name: dr.name, Spec: "demo ramp " + dr.name, Scenario: sc, Config: c})
	}
	return present.PrintRampComparison(d.out, d.base, cfg, names, runs)
}
