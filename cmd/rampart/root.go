package main

import (
	"errors"
	"time"

	"github.com/spf13/cobra"
)

// exitError carries a process exit code chosen by a command (qualify uses 1 and 3).
type exitError struct {
	code int
	err  error
}

func (e *exitError) Error() string { return e.err.Error() }
func (e *exitError) Unwrap() error { return e.err }

// exitCode is the process exit code for an error a command returned: 2 (bad
// input) unless the command chose another.
func exitCode(err error) int {
	var ee *exitError
	if errors.As(err, &ee) {
		return ee.code
	}
	return 2
}

// env is what the commands take from the process besides their arguments and
// output streams.
type env struct {
	// now is the clock elapsed times are measured with; tests fix it so
	// that outputs do not depend on the machine's speed.
	now func() time.Time
	// args is the command line, for reports that say how to reproduce them.
	args []string
}

func newRoot(e env) *cobra.Command {
	root := &cobra.Command{
		Use:           "rampart",
		Short:         "Robustness of ramps for guided-atom Sagnac interferometers",
		SilenceUsage:  true,
		SilenceErrors: true,
		// Cobra's suggestions span several lines; errors here are one line.
		DisableSuggestions: true,
		// --version prints the module version and VCS revision of the build.
		Version: versionLine(),
	}
	root.SetVersionTemplate("{{.Version}}")
	root.AddCommand(newShotCmd(e, runShot), newRampCmd(e, runRamp), newRunCmd(e, runRun), newMergeCmd(e, runMerge),
		newRankCmd(e, runRank), newQualifyCmd(e, runQualify), newToleranceCmd(e, runTolerance),
		newSensitivityCmd(e, runSensitivity), newDemoCmd(e), newScanCmd(e, runScan), newEdgeCmd(e, runEdge), newRobustCmd(e, runRobust))
	return root
}
