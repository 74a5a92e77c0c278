package main

import (
	"fmt"
	"io"
	"strings"

	"github.com/spf13/cobra"

	"rampart"
	"rampart/cmd/internal/scenario"
	"rampart/sim"
)

// demoScenario is the demo's scenario inside rampart.Demo.
const demoScenario = "testdata/demo/demo.toml"

// demoShapes are the ramps the demo compares on the demo scenario.
var demoShapes = []string{"sin2", "inverse"}

func newDemoCmd(e env) *cobra.Command {
	return &cobra.Command{
		Use:   "demo",
		Short: "Run the built-in demo: a smooth and an inverse-engineered ramp side by side",
		Long: `Run the built-in demo scenario (` + demoScenario + `, embedded in the
binary; its comments tell the invented lab story). It simulates the scenario's
smooth sin2 ramp and the inverse-engineered ramp and prints them side by side.`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			d, err := newDemo(e, cmd.OutOrStdout())
			if err != nil {
				return err
			}
			return d.run()
		},
	}
}

// demo is the state the stages of `rampart demo` share.
type demo struct {
	env  env
	out  io.Writer
	base *scenario.Scenario
}

func newDemo(e env, out io.Writer) (*demo, error) {
	sc, err := scenario.LoadFS(rampart.Demo, demoScenario, nil)
	if err != nil {
		return nil, err
	}
	return &demo{env: e, out: out, base: sc}, nil
}

// stages are the demo's steps in order. Issues 3 and 4 add the ensembles,
// the ranking, the qualification, the tolerances and the report.
func (d *demo) stages() []func() error {
	return []func() error{d.compareRamps}
}

func (d *demo) run() error {
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

// variant returns the demo scenario with another ramp shape.
func (d *demo) variant(shape string) (*scenario.Scenario, sim.Config, error) {
	sc := *d.base
	sc.Ramp.Shape = shape
	cfg, err := sc.Config()
	return &sc, cfg, err
}

// compareRamps runs one noise-free shot with each of demoShapes.
func (d *demo) compareRamps() error {
	var runs []shotRun
	var cfg sim.Config
	for _, shape := range demoShapes {
		sc, c, err := d.variant(shape)
		if err != nil {
			return err
		}
		run, err := simulate(d.env, sc, c, nil)
		if err != nil {
			return err
		}
		runs, cfg = append(runs, run), c
	}
	w := d.out
	fmt.Fprintf(w, "rampart demo: the built-in scenario %s\n%s\n\n", d.base.Name, describe(d.base, cfg, strings.Join(demoShapes, " and ")+" ramps"))
	if story := d.story(); story != "" {
		fmt.Fprintf(w, "%s\n\n", story)
	}

	header := []string{"Quantity"}
	for _, r := range runs {
		header = append(header, r.cfg.Sequence.Up.Name())
	}
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
		outside = append(outside, fmt.Sprintf("%s %s %%", r.cfg.Sequence.Up.Name(), sig(100*(1-r.result.GroundAfterRampUp[0]), 2)))
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
