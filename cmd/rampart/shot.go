package main

import (
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"rampart/cmd/internal/present"
	"rampart/internal/atomicfile"
	"rampart/internal/plural"
	"rampart/scenario"
	"rampart/sim"
)

type shotOptions struct {
	scenario string
	sets     []string
	json     bool
	trace    string
	check    bool
	readout  readoutOptions
}

// newShotCmd returns the command; run is what it runs with the parsed
// options (runShot outside tests).
func newShotCmd(e env, run func(e env, stdout, stderr io.Writer, o shotOptions) error) *cobra.Command {
	var o shotOptions
	cmd := &cobra.Command{
		Use:   "shot --scenario FILE",
		Short: "Simulate one noise-free shot of a scenario",
		Long: `Simulate one noise-free shot of the scenario: both arms on the whole ring
through ramp-up, cruise and ramp-down, then their overlap z. Prints the
contrast |z|, the interferometer and Sagnac phases, the bias as a phase and as
a rotation rate, the scale factor, each arm's ground-band population after the
ramp-up, the per-level breakdown of a thermal start, and the numerics used.
The bias is the bias at zero rotation, phase - K_shot Omega, with K_shot the
shot's own scale factor from two more shots at Omega +- h; the scale-factor
error K_shot/K - 1 is given in ppm. A bias below the estimated phase error (the
change on twice the grid and half the step) is noted as unresolved. --check
prints that comparison and exits with code 3 when the numerics miss their
targets (contrast 1e-4, phase 1e-6 rad).`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			return run(e, cmd.OutOrStdout(), cmd.ErrOrStderr(), o)
		},
	}
	addScenarioFlags(cmd, &o.scenario, &o.sets)
	f := cmd.Flags()
	f.BoolVar(&o.json, "json", false, "print one JSON object instead of tables")
	f.StringVar(&o.trace, "trace", "", "write each arm's co-moving diagnostics over time to this CSV `file`")
	f.BoolVar(&o.check, "check", false, "rerun with a doubled grid and a halved time step and report the changes")
	addReadoutFlags(cmd, &o.readout)
	return cmd
}

// addScenarioFlags adds --scenario (required) and --set.
func addScenarioFlags(cmd *cobra.Command, path *string, sets *[]string) {
	f := cmd.Flags()
	f.StringVar(path, "scenario", "", "scenario `file` (TOML)")
	f.StringArrayVar(sets, "set", nil, "override a scenario key: `table.key=value`, the value in TOML (strings may be bare); repeatable")
	cmd.MarkFlagRequired("scenario")
}

func runShot(e env, stdout, stderr io.Writer, o shotOptions) error {
	if err := checkOutputPaths(outFile("--trace", o.trace)); err != nil {
		return err
	}
	sc, cfg, err := scenario.LoadConfig(o.scenario, o.sets)
	if err != nil {
		return err
	}
	warnValidity(stderr, cfg)
	if err := checkNotInput("--trace", o.trace, sc.Inputs()); err != nil {
		return err
	}
	ro, err := o.readout.of(sc)
	if err != nil {
		return err
	}
	run, err := simulate(e, sc, cfg, nil)
	if err != nil {
		return err
	}
	// The trace comes from a second, observed shot (which samples the ramps
	// more finely), so that the table is that of an unobserved shot.
	var trace []sim.Diagnostics
	if o.trace != "" {
		obs := func(d sim.Diagnostics) { trace = append(trace, d) }
		if _, err := simulate(e, sc, cfg, obs); err != nil {
			return err
		}
	}
	rep := present.NewShotReport(sc, run, ro)
	// The table and the JSON separate the zero-rate bias from the
	// scale-factor error (IEEE Std 952-1997 terms), from two more shots at
	// Omega +- h (sim.Simulator.Gyro).
	g, base, err := zeroRateGyro(sc, run.Config)
	if err != nil {
		return err
	}
	rep.SetGyro(g)
	model := warnRingModel(stderr, fmt.Sprintf("scenario %q", sc.Name), run.Config, base)
	// The shot on the refined numerics tells how far the bias is resolved
	// (and, with --check, whether the numerics meet their targets).
	f, err := simulate(e, sc, sim.Refine(run.Config), nil)
	if err != nil {
		return err
	}
	est := sim.CompareNumerics(run.Result, f.Result)
	est.ModelBiasRad = model
	rep.SetNumerics(est)
	if o.check {
		rep.Check = present.NewCheckReport(est)
	}
	if o.trace != "" {
		if err := atomicfile.Write(o.trace, func(w io.Writer) error { return present.WriteTrace(w, trace) }); err != nil {
			return err
		}
		fmt.Fprintf(stderr, "wrote %s of diagnostics to %s\n", plural.Count(len(trace), "row"), o.trace)
	}
	if o.json {
		err = present.WriteJSON(stdout, rep)
	} else {
		err = rep.Print(stdout, sc, run.Config)
	}
	// A shot whose own error estimate misses the targets is printed (its
	// tables may be what the user is studying) but never passes as a
	// result: exit 3 with the remedy, with or without --check.
	if err == nil && !est.Met {
		if o.check {
			return &exitError{code: ExitCheckFailed, err: fmt.Errorf("--check: %s", est.Remedy)}
		}
		return &exitError{code: ExitCheckFailed, err: fmt.Errorf("the numbers above are not to be trusted: %s (--check prints the comparison)", est.Remedy)}
	}
	return err
}

// ExitCheckFailed is the exit code of `shot` (with or without --check) when the shot's
// numerics miss their targets (the tables are printed all the same).
const ExitCheckFailed = 3

func simulate(e env, sc *scenario.Scenario, cfg sim.Config, obs sim.Observer) (present.ShotRun, error) {
	s, err := sim.NewSimulator(cfg)
	if err != nil {
		return present.ShotRun{}, fmt.Errorf("scenario %q: %w", sc.Name, err)
	}
	base, err := sc.Apparatus()
	if err != nil {
		return present.ShotRun{}, err
	}
	start := e.now()
	r := s.Run(base, obs)
	return present.ShotRun{Config: s.Config(), Result: r, Elapsed: e.now().Sub(start)}, nil
}

// zeroRateGyro returns the zero-rate bias and scale factor of the
// scenario's apparatus shot under cfg, from two more shots at Omega +- h
// (sim.Simulator.Gyro), and that apparatus shot.
func zeroRateGyro(sc *scenario.Scenario, cfg sim.Config) (sim.Gyro, sim.Shot, error) {
	s, err := sim.NewSimulator(cfg)
	if err != nil {
		return sim.Gyro{}, sim.Shot{}, err
	}
	base, err := sc.Apparatus()
	if err != nil {
		return sim.Gyro{}, sim.Shot{}, err
	}
	_, g, err := s.Gyro(base)
	return g, base, err
}
