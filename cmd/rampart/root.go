package main

import (
	"errors"

	"github.com/spf13/cobra"
)

// exitError carries a process exit code chosen by a command (qualify uses 1 and 3).
type exitError struct {
	code int
	err  error
}

func (e *exitError) Error() string { return e.err.Error() }
func (e *exitError) Unwrap() error { return e.err }

func exitCode(err error) int {
	var ee *exitError
	if errors.As(err, &ee) {
		return ee.code
	}
	return 2
}

func newRootCmd() *cobra.Command {
	root := &cobra.Command{
		Use:           "rampart",
		Short:         "Robustness of ramps for guided-atom Sagnac interferometers",
		SilenceUsage:  true,
		SilenceErrors: true,
	}
	return root
}
