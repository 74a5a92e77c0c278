package main

import (
	"bufio"
	"fmt"
	"io"
	"math"
	"strconv"

	"github.com/spf13/cobra"

	"rampart/cmd/internal/outfile"
	"rampart/cmd/internal/present"
	"rampart/scenario"
	"rampart/sim"
)

// Sampling of the drive profile written by `rampart ramp --out`: the ramps
// change fast and get many points, the cruise is a straight line in phi.
const (
	profileRampPoints   = 2000 // intervals per ramp
	profileCruisePoints = 10   // intervals over the cruise
)

type rampOptions struct {
	scenario string
	sets     []string
	out      string
}

func newRampCmd(e env) *cobra.Command {
	var o rampOptions
	cmd := &cobra.Command{
		Use:   "ramp --scenario FILE",
		Short: "Summarise a scenario's drive and write its profile",
		Long: `Summarise the drive of the scenario: the ramp shape, its peak speed and
whether the speed reverses, the angle of each ramp, the cruise and total
times, the laps and whether the arms close. With --out, write the whole
sequence's speed Omega(t) and angle phi(t) as CSV.`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, _ []string) error {
			return runRamp(cmd.OutOrStdout(), cmd.ErrOrStderr(), o)
		},
	}
	addScenarioFlags(cmd, &o.scenario, &o.sets)
	cmd.Flags().StringVar(&o.out, "out", "", "write t_s, omega_rad_s and phi_rad of the whole sequence to this CSV `file`")
	return cmd
}

func runRamp(stdout, stderr io.Writer, o rampOptions) error {
	sc, cfg, err := scenario.LoadConfig(o.scenario, o.sets)
	if err != nil {
		return err
	}
	if o.out != "" {
		n := 0
		if err := outfile.Write(o.out, func(w io.Writer) (err error) {
			n, err = writeProfile(w, cfg.Sequence)
			return err
		}); err != nil {
			return err
		}
		fmt.Fprintf(stderr, "wrote %d samples of Omega(t) and phi(t) to %s\n", n, o.out)
	}
	return printDrive(stdout, sc, cfg)
}

func printDrive(w io.Writer, sc *scenario.Scenario, cfg sim.Config) error {
	seq := cfg.Sequence
	up := seq.Up
	cruise := seq.CruiseSpeed()
	peak, reverses := sim.PeakSpeed(up)
	trap := cfg.Ring.TrapHz(cfg.DepthHz)
	laps := seq.TotalAngle() / (2 * math.Pi)

	fmt.Fprintf(w, "Scenario %s\n%s\n\n", sc.Name, describe(sc, cfg, cfg.Sequence.Up.Name()+" ramp"))
	t := present.NewTable(w, "Quantity", "Value", "Unit")
	t.Append("Ramp shape", shapeName(up), "")
	t.Append("Ramp-up time t_r (the ramp-down mirrors it)", present.Sig(up.Duration()*1e6, 6), "us")
	t.Append("Cruise speed Omega_0", present.Sig(cruise, 6), "rad/s")
	t.Append("Drive offset at cruise N Omega_0 / 2 pi", present.Sig(float64(cfg.Ring.Sites)*cruise/(2*math.Pi), 6), "Hz")
	t.Append("Peak speed max |Omega|", present.Sig(peak, 6), "rad/s")
	t.Append("Peak speed / cruise speed", present.Fixed(peak/cruise, 4), "")
	t.Append("Speed reverses (throw and catch)", present.YesNo(reverses), "")
	t.Append("Angle of each ramp", present.Sig(up.Angle(up.Duration()), 6), "rad")
	t.Append("Cruise time", present.Sig(seq.CruiseS*1e3, 6), "ms")
	t.Append("Total time T", present.Sig(seq.Duration()*1e3, 6), "ms")
	t.Append("Laps phi(T) / 2 pi", present.Sig(laps, 6), "turns")
	t.Append("Closure", fmt.Sprintf("arms meet (2*laps = %s)", present.Sig(2*laps, 6)), "")
	t.Append("Trap frequency at the lattice depth", present.Sig(trap/1e3, 4), "kHz")
	t.Append("Trap periods in the ramp-up t_r nu", present.Sig(up.Duration()*trap, 3), "")
	return t.Render()
}

// shapeName describes a ramp-up for the summary.
func shapeName(r sim.Ramp) string {
	switch r := r.(type) {
	case sim.Inverse:
		return fmt.Sprintf("inverse-engineered for %s kHz (trap %s kHz)", present.Sig(r.DesignDepth/1e3, 6), present.Sig(r.TrapRadS/(2*math.Pi)/1e3, 4))
	case *sim.Tabulated:
		return fmt.Sprintf("table %s, %d rows, PCHIP between rows", r.Name(), r.Rows())
	}
	return r.Name()
}

// writeProfile writes the whole sequence's Omega(t) and phi(t) and returns
// the number of samples.
func writeProfile(w io.Writer, seq sim.Sequence) (int, error) {
	tr, tc, total := seq.Up.Duration(), seq.CruiseS, seq.Duration()
	times := make([]float64, 0, 2*profileRampPoints+profileCruisePoints+1)
	for i := 0; i <= profileRampPoints; i++ {
		times = append(times, tr*float64(i)/profileRampPoints)
	}
	if tc > 0 {
		for i := 1; i <= profileCruisePoints; i++ {
			times = append(times, tr+tc*float64(i)/profileCruisePoints)
		}
	}
	for i := 1; i < profileRampPoints; i++ {
		times = append(times, tr+tc+tr*float64(i)/profileRampPoints)
	}
	times = append(times, total)

	bw := bufio.NewWriter(w)
	fmt.Fprintln(bw, "t_s,omega_rad_s,phi_rad")
	for _, t := range times {
		fmt.Fprintf(bw, "%s,%s,%s\n", strconv.FormatFloat(t, 'g', -1, 64),
			strconv.FormatFloat(seq.Speed(t), 'g', -1, 64), strconv.FormatFloat(seq.Angle(t), 'g', -1, 64))
	}
	return len(times), bw.Flush()
}
