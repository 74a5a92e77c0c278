package main

import (
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"rampart/cmd/internal/present"
	"rampart/internal/atomicfile"
	"rampart/internal/plural"
	"rampart/scenario"
)

type rampOptions struct {
	scenario string
	sets     []string
	out      string
}

// newRampCmd returns the command; run is what it runs with the parsed
// options (runRamp outside tests).
func newRampCmd(e env, run func(stdout, stderr io.Writer, o rampOptions) error) *cobra.Command {
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
			return run(cmd.OutOrStdout(), cmd.ErrOrStderr(), o)
		},
	}
	addScenarioFlags(cmd, &o.scenario, &o.sets)
	cmd.Flags().StringVar(&o.out, "out", "", "write t_s, omega_rad_s and phi_rad of the whole sequence to this CSV `file`")
	return cmd
}

func runRamp(stdout, stderr io.Writer, o rampOptions) error {
	if err := checkOutputPaths(outFile("--out", o.out)); err != nil {
		return err
	}
	sc, cfg, err := scenario.LoadConfig(o.scenario, o.sets)
	if err != nil {
		return err
	}
	warnValidity(stderr, cfg)
	if err := checkNotInput("--out", o.out, sc.Inputs()); err != nil {
		return err
	}
	if o.out != "" {
		n := 0
		if err := atomicfile.Write(o.out, func(w io.Writer) (err error) {
			n, err = present.WriteProfile(w, cfg.Sequence)
			return err
		}); err != nil {
			return err
		}
		fmt.Fprintf(stderr, "wrote %s of Omega(t) and phi(t) to %s\n", plural.Count(n, "sample"), o.out)
	}
	return present.PrintDrive(stdout, sc, cfg)
}
