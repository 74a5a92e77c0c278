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

// checkResumeDir refuses --resume DIR of a command that keeps several runs
// in DIR when there is no DIR, or when DIR holds files but neither it nor
// its subdirectories (to resumeDepth levels) hold a run: a mistyped DIR
// must not start the whole job afresh among the user's files. An empty
// DIR is accepted (nothingStarted).
func (o ensembleOptions) checkResumeDir() error {
	if err := o.checkResumeExists(); err != nil || o.resume == "" {
		return err
	}
	if !hasRunBelow(o.resume, resumeDepth) && !nothingStarted(o.resume) {
		return fmt.Errorf("--resume %s: neither it nor its subdirectories hold a run (no %s): give the directory of an interrupted job, or --out DIR with a new or empty directory to start one", o.resume, mc.ManifestFile)
	}
	return nil
}

// checkResumeExists refuses --resume DIR when there is no directory DIR.
func (o ensembleOptions) checkResumeExists() error {
	if o.resume == "" {
		return nil
	}
	if fi, err := os.Stat(o.resume); err != nil || !fi.IsDir() {
		return fmt.Errorf("--resume %s: no such directory, so nothing to resume; give --out %s to start", o.resume, o.resume)
	}
	return nil
}

// nothingStarted reports whether dir is empty but for a run lock: a job
// stopped after making its directory and before its first run (a cluster
// task pre-empted then, resubmitted with --resume as rampart sbatch's
// script does) starts there afresh, as there is nothing to mix with.
func nothingStarted(dir string) bool {
	entries, err := os.ReadDir(dir)
	if err != nil {
		return false
	}
	for _, e := range entries {
		if e.Name() != mc.LockFile {
			return false
		}
	}
	return true
}

// resumeDepth is how deep the runs of a command's job lie below its
// directory: rank keeps DIR/RAMP, tolerance DIR/SOURCE/AMPLITUDE.
const resumeDepth = 3

// hasRunBelow reports whether dir or a directory at most depth levels below
// it holds a run. Symbolic links are not followed, and at most
// resumeScanMax directories are read, so a mistaken --resume of a large
// tree costs little (it is then refused).
func hasRunBelow(dir string, depth int) bool {
	budget := resumeScanMax
	var walk func(string, int) bool
	walk = func(d string, left int) bool {
		if mc.HasRun(d) {
			return true
		}
		if left == 0 || budget == 0 {
			return false
		}
		budget--
		entries, err := os.ReadDir(d)
		if err != nil {
			return false
		}
		for _, e := range entries {
			if e.IsDir() && walk(filepath.Join(d, e.Name()), left-1) {
				return true
			}
		}
		return false
	}
	return walk(dir, depth)
}

// resumeScanMax bounds the directories hasRunBelow reads.
const resumeScanMax = 4096

// checkResumeRun refuses --resume DIR of a command that keeps one run in
// DIR (run, qualify, sensitivity) when DIR holds no run (and is not empty,
// nothingStarted), before anything
// is written there: resuming takes the directory's lock, and a directory
// that is not a run must not be left with a lock file in it.
func (o ensembleOptions) checkResumeRun() error {
	if err := o.checkResumeExists(); err != nil || o.resume == "" || mc.HasRun(o.resume) || nothingStarted(o.resume) {
		return err
	}
	return fmt.Errorf("--resume %s: it holds no run (no %s): give the directory of an interrupted run, or --out DIR with a new or empty directory to start one", o.resume, mc.ManifestFile)
}

// runPart runs the ensemble ens, one of several a command runs, in the
// subdirectory sub of the options' directory (none without one). tag sets
// its records apart from those of the others (see ensembleJob).
func runPart(ctx context.Context, e env, stderr io.Writer, sc *scenario.Scenario, ens mc.Ensemble, tag any, o ensembleOptions, sub, label string) (*ensembleRun, string, error) {
	r, err := mc.NewRealiser(ens)
	if err != nil {
		return nil, "", fmt.Errorf("scenario %q: %w", sc.Name, err)
	}
	var place mc.Job
	if top := o.dir(); top != "" {
		place = mc.Job{Dir: top, Resume: o.resume != ""}.Within(sub)
	}
	job := ensembleJob{realiser: r, runner: r, records: ens.Samples, tag: tag, resume: o.dir()}
	run, err := runJob(ctx, e, stderr, sc, job, o, place.Dir, place.Resume, label)
	return run, place.Dir, err
}
