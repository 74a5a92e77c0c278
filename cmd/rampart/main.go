// Command rampart qualifies ramps for guided-atom Sagnac interferometers by
// Monte Carlo simulation of the full quantum dynamics under hardware noise.
package main

import (
	"fmt"
	"os"
)

func main() {
	if err := newRootCmd().Execute(); err != nil {
		fmt.Fprintln(os.Stderr, "rampart:", err)
		os.Exit(exitCode(err))
	}
}
