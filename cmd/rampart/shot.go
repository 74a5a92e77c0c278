package main

import (
	"fmt"
	"io"
	"math"
	"strconv"
	"time"

	"github.com/spf13/cobra"

	"rampart/cmd/internal/outfile"
	"rampart/cmd/internal/present"
	"rampart/mc"
	"rampart/scenario"
	"rampart/sim"
)

// Tolerances of --check, the accuracy the automatic numerics aim at.
const (
	contrastTolerance = 1e-4
	phaseToleranceRad = 1e-6
)

type shotOptions struct {
	scenario string
	sets     []string
	json     bool
	trace    string
	check    bool
	readout  readoutOptions
}

func newShotCmd(e env) *cobra.Command {
	var o shotOptions
	cmd := &cobra.Command{
		Use:   "shot --scenario FILE",
		Short: "Simulate one noise-free shot of a scenario",
		Long: `Simulate one noise-free shot of the scenario: both arms on the whole ring
through ramp-up, cruise and ramp-down, then their overlap z. Prints the
contrast |z|, the interferometer and Sagnac phases, the bias as a phase and as
a rotation rate, the scale factor, each arm's ground-band population after the
ramp-up, the per-level breakdown of a thermal start, and the numerics used.`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			return runShot(e, cmd.OutOrStdout(), cmd.ErrOrStderr(), o)
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
	sc, cfg, err := scenario.LoadConfig(o.scenario, o.sets)
	if err != nil {
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
	rep := newShotReport(sc, run, ro)
	if o.check {
		fine := run.cfg
		fine.Grid, fine.StepS = 2*run.cfg.Grid, run.cfg.StepS/2
		f, err := simulate(e, sc, fine, nil)
		if err != nil {
			return err
		}
		rep.Check = newCheckReport(run, f)
	}
	if o.trace != "" {
		if err := outfile.Write(o.trace, func(w io.Writer) error { return present.WriteTrace(w, trace) }); err != nil {
			return err
		}
		fmt.Fprintf(stderr, "wrote %d rows of diagnostics to %s\n", len(trace), o.trace)
	}
	if o.json {
		return present.WriteJSON(stdout, rep)
	}
	return rep.print(stdout, sc, run.cfg)
}

// shotRun is one simulated shot.
type shotRun struct {
	cfg     sim.Config // with the numerics in use filled in
	result  sim.Result
	elapsed time.Duration
}

func simulate(e env, sc *scenario.Scenario, cfg sim.Config, obs sim.Observer) (shotRun, error) {
	s, err := sim.NewSimulator(cfg)
	if err != nil {
		return shotRun{}, fmt.Errorf("scenario %q: %w", sc.Name, err)
	}
	start := e.now()
	r := s.Run(sim.Shot{}, obs)
	return shotRun{cfg: s.Config(), result: r, elapsed: e.now().Sub(start)}, nil
}

// shotReport is the output of `rampart shot`, the object --json prints.
type shotReport struct {
	Scenario     string         `json:"scenario"`
	Ramp         string         `json:"ramp"`
	Contrast     float64        `json:"contrast"`
	PhaseRad     float64        `json:"phase_rad"`
	SagnacRad    float64        `json:"sagnac_rad"`
	BiasRad      float64        `json:"bias_rad"`
	BiasRadS     float64        `json:"bias_rad_s"`
	BiasDegPerH  float64        `json:"bias_deg_per_h"`
	ScaleFactorS float64        `json:"scale_factor_s"`
	GroundBand   [2]float64     `json:"ground_band_after_rampup"`
	Grid         int            `json:"grid"`
	StepS        float64        `json:"step_s"`
	TemperatureK float64        `json:"temperature_k"`
	Levels       []levelReport  `json:"levels"`
	ElapsedS     float64        `json:"elapsed_s"`
	Readout      *readoutReport `json:"readout,omitempty"`
	Check        *checkReport   `json:"check,omitempty"`
}

// levelReport is one of the site's levels of a thermal start.
type levelReport struct {
	Band         int     `json:"band"`
	Weight       float64 `json:"weight"`        // Boltzmann weight p_n
	EnergyHz     float64 `json:"energy_hz"`     // band mean energy E_n/h, including the lattice's -V0/2
	ExcitationHz float64 `json:"excitation_hz"` // (E_n - E_0)/h
	AbsZ         float64 `json:"abs_z"`         // |z_n|, the contrast of this level alone
	ArgZRad      float64 `json:"arg_z_rad"`     // arg z_n
}

// readoutReport holds the gyroscope figures of the [readout] table.
type readoutReport struct {
	Atoms             float64 `json:"atoms"`
	CycleS            float64 `json:"cycle_s"`
	ProjectionRadS    float64 `json:"projection_noise_rad_s"`
	ProjectionDegPerH float64 `json:"projection_noise_deg_per_h"`
	ARWDegPerSqrtH    float64 `json:"angle_random_walk_deg_per_sqrt_h"`
}

// checkReport compares a shot with one on a doubled grid and a halved step.
type checkReport struct {
	Grid              int     `json:"grid"`
	StepS             float64 `json:"step_s"`
	ContrastChange    float64 `json:"contrast_change"`
	PhaseChangeRad    float64 `json:"phase_change_rad"`
	ContrastTolerance float64 `json:"contrast_tolerance"`
	PhaseToleranceRad float64 `json:"phase_tolerance_rad"`
	Converged         bool    `json:"converged"`
}

func newShotReport(sc *scenario.Scenario, run shotRun, ro readout) *shotReport {
	r := run.result
	rep := &shotReport{
		Scenario:     sc.Name,
		Ramp:         run.cfg.Sequence.Up.Name(),
		Contrast:     r.Contrast,
		PhaseRad:     r.PhaseRad,
		SagnacRad:    r.SagnacRad,
		BiasRad:      r.BiasRad,
		BiasRadS:     r.BiasRadS,
		BiasDegPerH:  r.BiasDegPerH,
		ScaleFactorS: r.ScaleFactorS,
		GroundBand:   r.GroundAfterRampUp,
		Grid:         r.Grid,
		StepS:        r.StepS,
		TemperatureK: run.cfg.TemperatureK,
		ElapsedS:     run.elapsed.Seconds(),
	}
	for _, l := range r.Levels {
		rep.Levels = append(rep.Levels, levelReport{
			Band:         l.Band,
			Weight:       l.Weight,
			EnergyHz:     l.EnergyHz,
			ExcitationHz: l.EnergyHz - r.Levels[0].EnergyHz,
			AbsZ:         math.Hypot(real(l.Z), imag(l.Z)),
			ArgZRad:      math.Atan2(imag(l.Z), real(l.Z)),
		})
	}
	if ro.atoms > 0 && r.Contrast > 0 && r.ScaleFactorS > 0 {
		g := mc.GyroFigures(r.ScaleFactorS, r.Contrast, ro.atoms, ro.cycleS)
		rep.Readout = &readoutReport{
			Atoms:             g.Atoms,
			CycleS:            g.CycleS,
			ProjectionRadS:    g.ShotNoiseRadS,
			ProjectionDegPerH: g.ShotNoiseDegPerH,
			ARWDegPerSqrtH:    g.AngleRandomWalkDegPerSqrtH,
		}
	}
	return rep
}

func newCheckReport(base, fine shotRun) *checkReport {
	dc := fine.result.Contrast - base.result.Contrast
	dp := sim.Wrap(fine.result.PhaseRad - base.result.PhaseRad)
	return &checkReport{
		Grid:              fine.result.Grid,
		StepS:             fine.result.StepS,
		ContrastChange:    dc,
		PhaseChangeRad:    dp,
		ContrastTolerance: contrastTolerance,
		PhaseToleranceRad: phaseToleranceRad,
		Converged:         math.Abs(dc) <= contrastTolerance && math.Abs(dp) <= phaseToleranceRad,
	}
}

func (rep *shotReport) print(w io.Writer, sc *scenario.Scenario, cfg sim.Config) error {
	fmt.Fprintf(w, "Scenario %s\n%s\n\n", sc.Name, present.Describe(sc, cfg, cfg.Sequence.Up.Name()+" ramp"))
	t := present.NewTable(w, "Quantity", "Value", "Unit")
	t.Append("Contrast C = |z|", present.Fixed(rep.Contrast, 5), "")
	t.Append("Interferometer phase arg z", present.Sci(rep.PhaseRad, 7), "rad")
	t.Append("Sagnac phase 2 I phi(T) Omega_bg / hbar", present.Sci(rep.SagnacRad, 7), "rad")
	t.Append("Bias b = phase - Sagnac phase", present.Sci(rep.BiasRad, 3), "rad")
	t.Append("Bias as a rotation rate b / K", present.Sci(rep.BiasRadS, 3), "rad/s")
	t.Append("Bias as a rotation rate b / K", present.Sci(rep.BiasDegPerH, 3), "deg/h")
	t.Append("Scale factor K = 2 I phi(T) / hbar", present.Sig(rep.ScaleFactorS, 6), "s (rad per rad/s)")
	t.Append("Ground band after ramp-up, arm s = +1", present.Fixed(rep.GroundBand[0], 5), "")
	t.Append("Ground band after ramp-up, arm s = -1", present.Fixed(rep.GroundBand[1], 5), "")
	if ro := rep.Readout; ro != nil {
		t.Append(fmt.Sprintf("Projection noise per shot, %s atoms", present.Sig(ro.Atoms, 6)), present.Sci(ro.ProjectionRadS, 3), "rad/s")
		t.Append(fmt.Sprintf("Projection noise per shot, %s atoms", present.Sig(ro.Atoms, 6)), present.Sci(ro.ProjectionDegPerH, 3), "deg/h")
		t.Append(fmt.Sprintf("Angle random walk, one shot per %s s", present.Sig(ro.CycleS, 6)), present.Sci(ro.ARWDegPerSqrtH, 3), "deg/sqrt(h)")
	}
	t.Append("Momentum grid", strconv.Itoa(rep.Grid), "states")
	t.Append("Time step while the drive changes", present.Sig(rep.StepS*1e6, 4), "us")
	if len(rep.Levels) > 1 {
		t.Append("Levels of the site propagated", strconv.Itoa(len(rep.Levels)), "")
	}
	el, unit := present.Duration(time.Duration(rep.ElapsedS * float64(time.Second)))
	t.Append("Elapsed (one shot)", el, unit)
	if err := t.Render(); err != nil {
		return err
	}
	if sc.Noise != (scenario.Noise{}) {
		fmt.Fprintln(w, "\nNote: the scenario's [noise.*] tables describe an ensemble; this shot is noise-free.")
	}
	if sc.Thermal() {
		fmt.Fprintf(w, "\nThermal start at %s nK: the levels of the site\n", present.Sig(sc.Start.TemperatureNK, 6))
		lt := present.NewTable(w, "Band n", "Weight p_n", "(E_n - E_0)/h (kHz)", "|z_n|", "arg z_n (rad)")
		for _, l := range rep.Levels {
			lt.Append(strconv.Itoa(l.Band), present.Sci(l.Weight, 4), present.Fixed(l.ExcitationHz/1e3, 3), present.Fixed(l.AbsZ, 5), present.Sci(l.ArgZRad, 7))
		}
		if err := lt.Render(); err != nil {
			return err
		}
	}
	if c := rep.Check; c != nil {
		fmt.Fprintf(w, "\nNumerics check: grid %d and step %s us against grid %d and step %s us\n",
			c.Grid, present.Sig(c.StepS*1e6, 4), rep.Grid, present.Sig(rep.StepS*1e6, 4))
		ct := present.NewTable(w, "Change", "Value", "Tolerance", "Within")
		ct.Append("Contrast", present.Sci(c.ContrastChange, 2), present.Sci(c.ContrastTolerance, 1), present.YesNo(math.Abs(c.ContrastChange) <= c.ContrastTolerance))
		ct.Append("Phase (rad)", present.Sci(c.PhaseChangeRad, 2), present.Sci(c.PhaseToleranceRad, 1), present.YesNo(math.Abs(c.PhaseChangeRad) <= c.PhaseToleranceRad))
		if err := ct.Render(); err != nil {
			return err
		}
	}
	return nil
}
