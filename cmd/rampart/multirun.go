package main

import (
	"context"
	"fmt"
	"io"
	"os"
	"path/filepath"

	"rampart/mc"
	"rampart/scenario"
)

// Commands that run several ensembles (rank: one per ramp; tolerance: one
// per amplitude tried) keep each in a subdirectory of --out DIR, and
// --resume DIR continues all of them.

// within returns the options of the run kept in dir, a subdirectory of the
// options' directory: with --resume a run there is continued (a complete
// one is reused as it is) and a missing one started, as an interrupted
// command leaves them; with --out a new run is started there.
func (o ensembleOptions) within(dir string) ensembleOptions {
	switch {
	case o.resume == "":
		o.out = dir
	case hasRun(dir):
		o.out, o.resume = "", dir
	default:
		o.out, o.resume = dir, ""
	}
	return o
}

// checkResumeDir refuses --resume DIR of a command that keeps several runs
// in DIR when there is no DIR: nothing was started there.
func (o ensembleOptions) checkResumeDir() error {
	if o.resume == "" {
		return nil
	}
	if fi, err := os.Stat(o.resume); err != nil || !fi.IsDir() {
		return fmt.Errorf("--resume %s: no such directory, so nothing to resume; give --out %s to start", o.resume, o.resume)
	}
	return nil
}

// hasRun reports whether dir holds a run (its manifest).
func hasRun(dir string) bool {
	_, err := os.Stat(filepath.Join(dir, mc.ManifestFile))
	return err == nil
}

// runPart runs the ensemble ens, one of several a command runs, in the
// subdirectory sub of the options' directory (none without one). tag sets
// its records apart from those of the others (see ensembleJob).
func runPart(ctx context.Context, e env, stderr io.Writer, sc *scenario.Scenario, ens mc.Ensemble, tag any, o ensembleOptions, sub, label string) (*ensembleRun, string, error) {
	r, err := mc.NewRealiser(ens)
	if err != nil {
		return nil, "", fmt.Errorf("scenario %q: %w", sc.Name, err)
	}
	dir, po := "", o
	if top := o.dir(); top != "" {
		dir = filepath.Join(top, sub)
		po = o.within(dir)
	}
	job := ensembleJob{realiser: r, runner: r, records: ens.Samples, tag: tag, resume: o.dir()}
	run, err := runJob(ctx, e, stderr, sc, job, po, dir, label)
	return run, dir, err
}
