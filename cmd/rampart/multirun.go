package main

import (
	"context"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
	"time"

	"rampart/cmd/internal/present"
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

// printShardNote tells how to combine the shards of the runs a command
// keeps in the subdirectories subs of its directory ("" for the directory
// itself), and what to run on the merged set.
func printShardNote(w io.Writer, o ensembleOptions, subs []string, then string) error {
	sh, err := mc.ParseShard(o.shard)
	if err != nil {
		return err
	}
	fmt.Fprintf(w, "Ran shard %d/%d into %s. When every shard has run, each with its own --out (D1 to D%d below), merge them:\n", sh.Index, sh.Count, o.dir(), sh.Count)
	for _, s := range subs {
		var dirs []string
		for k := 1; k <= sh.Count; k++ {
			if sh.Count > 4 && k == 3 {
				dirs = append(dirs, "...")
				k = sh.Count
			}
			dirs = append(dirs, filepath.Join(fmt.Sprintf("D%d", k), s))
		}
		fmt.Fprintf(w, "  rampart merge --out %s %s\n", filepath.Join("ALL", s), strings.Join(dirs, " "))
	}
	fmt.Fprintf(w, "then %s: run this command again without --shard, with --resume ALL in place of --out.\n", then)
	return nil
}

// ensembleWork adds up the realisations a command simulated and resumed
// over its ensembles, and the time it took.
type ensembleWork struct {
	fresh, resumed int
	elapsed        time.Duration
}

func (w *ensembleWork) add(run *ensembleRun) {
	w.fresh += run.fresh
	w.resumed += len(run.records) - run.fresh
	w.elapsed += run.elapsed
}

// line says what was run (what) and how: seed, sampler, shard and work.
func (w ensembleWork) line(what string, o ensembleOptions) string {
	s := fmt.Sprintf("Ensembles: %s, seed %d, %s sampler", what, o.seed, o.sampler)
	if o.shard != "" {
		s += ", shard " + o.shard
	}
	if w.fresh > 0 {
		el, unit := present.Duration(w.elapsed)
		s += fmt.Sprintf("; %d simulated in %s %s", w.fresh, el, unit)
	}
	if w.resumed > 0 {
		s += fmt.Sprintf("; %d resumed", w.resumed)
	}
	return s
}
