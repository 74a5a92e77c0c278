package main

import (
	"fmt"
	"io"
	"strings"

	"github.com/spf13/cobra"

	"rampart"
	"rampart/cmd/internal/scenario"
	"rampart/mc"
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
of the budget for the winner; and one HTML report of it all, whose path it
prints.`,
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
	f.IntVar(&o.toleranceSamples, "tolerance-samples", 64, "realisations `N` per amplitude in the tolerance search")
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
	cs      []contestant
	ranking rankReport
	recs    [][]mc.Record
	winner  int
	qualify qualifyReport
	tol     toleranceReport
}

func newDemo(e env, out io.Writer) (*demo, error) {
	sc, err := scenario.LoadFS(rampart.Demo, demoScenario, nil)
	if err != nil {
		return nil, err
	}
	return &demo{env: e, out: out, stderr: io.Discard, base: sc,
		opts: demoOptions{samples: 200, toleranceSamples: 64, seed: 1, report: "rampart-demo"}}, nil
}

// stages are the demo's steps in order.
func (d *demo) stages() []func() error {
	return []func() error{d.compareRamps, d.rank, d.qualifyWinner, d.tolerances, d.writeReport}
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
	req, err := d.requirements()
	if err != nil {
		return err
	}
	if n := req.MinSamples(); o.toleranceSamples < n {
		return fmt.Errorf("--tolerance-samples %d: the demo spec at %g %% confidence needs at least %d realisations per amplitude to bound its quantiles and yield", o.toleranceSamples, 100*req.Confidence, n)
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
	var runs []shotRun
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
		runs, cfg = append(runs, run), c
		names = append(names, dr.name)
		d.cs = append(d.cs, contestant{name: dr.name, spec: "demo ramp " + dr.name, sc: sc, cfg: c})
	}
	w := d.out
	fmt.Fprintf(w, "rampart demo: the built-in scenario %s\n%s\n\n", d.base.Name, describe(d.base, cfg, strings.Join(names, ", ")+" ramps"))
	if story := d.story(); story != "" {
		fmt.Fprintf(w, "%s\n\n", story)
	}

	fmt.Fprintln(w, "1. One noise-free shot of each ramp")
	header := append([]string{"Quantity"}, names...)
	t := newTable(w, append(header, "Unit")...)
	row := func(label, unit string, value func(r shotRun) string) {
		cells := []string{label}
		for _, r := range runs {
			cells = append(cells, value(r))
		}
		t.Append(append(cells, unit))
	}
	row("Contrast C = |z|", "", func(r shotRun) string { return fixed(r.result.Contrast, 5) })
	row("Ground band after ramp-up, arm s = +1", "", func(r shotRun) string { return fixed(r.result.GroundAfterRampUp[0], 5) })
	row("Ground band after ramp-up, arm s = -1", "", func(r shotRun) string { return fixed(r.result.GroundAfterRampUp[1], 5) })
	row("Interferometer phase arg z", "rad", func(r shotRun) string { return sci(r.result.PhaseRad, 7) })
	row("Sagnac phase", "rad", func(r shotRun) string { return sci(r.result.SagnacRad, 7) })
	row("Bias b = phase - Sagnac phase", "rad", func(r shotRun) string { return sci(r.result.BiasRad, 3) })
	row("Bias as a rotation rate b / K", "deg/h", func(r shotRun) string { return sci(r.result.BiasDegPerH, 3) })
	row("Peak speed max |Omega|", "rad/s", func(r shotRun) string {
		peak, _ := sim.PeakSpeed(r.cfg.Sequence.Up)
		return sig(peak, 5)
	})
	row("Speed reverses (throw and catch)", "", func(r shotRun) string {
		_, rev := sim.PeakSpeed(r.cfg.Sequence.Up)
		return yesNo(rev)
	})
	row("Elapsed (one shot)", "ms", func(r shotRun) string { return sig(r.elapsed.Seconds()*1e3, 3) })
	if err := t.Render(); err != nil {
		return err
	}

	up := runs[0].cfg.Sequence.Up
	var outside []string
	for _, r := range runs {
		outside = append(outside, fmt.Sprintf("%s %s %%", names[len(outside)], sig(100*(1-r.result.GroundAfterRampUp[0]), 2)))
	}
	fmt.Fprintf(w, "\nA ramp-up of %s us is %s trap periods. Left outside the moving ground band after it: %s.\n",
		sig(up.Duration()*1e6, 6), sig(up.Duration()*cfg.Ring.TrapHz(cfg.DepthHz), 2), strings.Join(outside, ", "))
	return nil
}

// story returns the leading comment of the demo scenario, which tells the
// demo's invented lab story.
func (d *demo) story() string {
	data, err := d.base.ReadFile(d.base.Name)
	if err != nil {
		return ""
	}
	var lines []string
	for _, line := range strings.Split(string(data), "\n") {
		text, ok := strings.CutPrefix(line, "#")
		if !ok {
			break
		}
		lines = append(lines, strings.TrimPrefix(text, " "))
	}
	return strings.TrimSpace(strings.Join(lines, "\n"))
}
