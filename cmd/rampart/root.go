package main

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"time"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"
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
	root.SetFlagErrorFunc(func(_ *cobra.Command, err error) error { return flagError(err) })
	root.AddCommand(newShotCmd(e, runShot), newRampCmd(e, runRamp), newRunCmd(e, runRun), newMergeCmd(e, runMerge),
		newRankCmd(e, runRank), newQualifyCmd(e, runQualify), newToleranceCmd(e, runTolerance),
		newSensitivityCmd(e, runSensitivity), newResponseCmd(e, runResponse), newScanCmd(e, runScan), newEdgeCmd(e, runEdge),
		newRobustCmd(e, runRobust), newDemoCmd(e), newSbatchCmd(e))
	return root
}

// flagError rewrites a flag value the parser refused in the house style:
// the flag and value, and what would be accepted, rather than the
// parser's strconv error. A whole number written as a float ("1e5") is
// shown as the integer to give.
func flagError(err error) error {
	var ve *pflag.InvalidValueError
	if !errors.As(err, &ve) {
		return err
	}
	f, v := ve.GetFlag(), ve.GetValue()
	typ := f.Value.Type()
	var want string
	switch typ {
	case "int", "int64", "uint", "uint64":
		want = "a whole number"
		min := math.Inf(-1)
		if typ[0] == 'u' {
			want, min = "a non-negative whole number", 0
		}
		if x, err := strconv.ParseFloat(v, 64); err == nil && x == math.Trunc(x) && x >= min && math.Abs(x) < 1<<53 {
			want += fmt.Sprintf(", such as %d", int64(x))
		}
	case "float64", "float32":
		want = "a number, such as 0.95 or 1e-3"
	case "bool":
		want = "true or false"
	default:
		want = "a value of type " + typ
	}
	return fmt.Errorf("--%s %s: want %s", f.Name, v, want)
}
