// Command rampart qualifies ramps for guided-atom Sagnac interferometers by
// Monte Carlo simulation of the full quantum dynamics under hardware noise.
package main

import (
	"fmt"
	"io"
	"os"
	"time"
)

func main() {
	os.Exit(run(os.Args[1:], os.Stdout, os.Stderr, env{now: time.Now}))
}

// run executes the command line args and returns the process exit code:
// 0 on success, 2 for bad input, or the code a command chose.
func run(args []string, stdout, stderr io.Writer, e env) int {
	e.args = args
	root := newRoot(e)
	root.SetArgs(args)
	root.SetOut(stdout)
	root.SetErr(stderr)
	defer releaseRunDirs()
	if err := root.Execute(); err != nil {
		err = explain(root, args, err)
		fmt.Fprintln(stderr, "rampart:", err)
		return exitCode(err)
	}
	return 0
}
