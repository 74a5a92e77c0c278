package main

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"

	"github.com/spf13/cobra"

	"rampart/cmd/internal/present"
	"rampart/internal/plural"
	"rampart/mc"
)

type mergeOptions struct {
	out         string
	confidence  float64
	minContrast float64
	maxBiasRad  float64
	json        bool
	// specGiven and confidenceGiven: the flags replace what the shards'
	// manifests recorded.
	specGiven, confidenceGiven bool
}

// newMergeCmd returns the command; run is what it runs with the parsed
// options (runMerge outside tests).
func newMergeCmd(e env, run func(e env, stdout, stderr io.Writer, dirs []string, o mergeOptions) error) *cobra.Command {
	var o mergeOptions
	cmd := &cobra.Command{
		Use:   "merge DIR... [--out DIR]",
		Short: "Combine the shards of an ensemble into the result of one run",
		Long: `Combine the output directories of the shards of one ensemble (rampart run
--shard k/n --out DIR, for example from the tasks of a cluster job array) into
the result one unsharded run would have given: the same realisations file,
summary and histograms. Every realisation must be present exactly once, every
row must verify against its checksum and every shard against the digest in its
manifest, and the shards must share the build, scenario, numerics, seed, sample
count and sampler. The yield spec and confidence the shards were run with are
taken from their manifests; --min-contrast, --max-bias-rad and --confidence
replace them.`,
		Args: func(_ *cobra.Command, dirs []string) error {
			if len(dirs) == 0 {
				return fmt.Errorf("merge: no shard directories given: name them, as in rampart merge --out all shard-1 shard-2")
			}
			return nil
		},
		RunE: func(cmd *cobra.Command, dirs []string) error {
			f := cmd.Flags()
			o.specGiven = f.Changed("min-contrast") || f.Changed("max-bias-rad")
			o.confidenceGiven = f.Changed("confidence")
			return run(e, cmd.OutOrStdout(), cmd.ErrOrStderr(), dirs, o)
		},
	}
	f := cmd.Flags()
	f.StringVar(&o.out, "out", "", "write the merged ensemble to `DIR` (it must not hold a run)")
	f.Float64Var(&o.confidence, "confidence", 0, "confidence `level` of the intervals, in (0, 1) (default: the shards', else 0.95)")
	f.Float64Var(&o.minContrast, "min-contrast", 0, "yield spec: contrast at least `X` (default: the shards' spec)")
	f.Float64Var(&o.maxBiasRad, "max-bias-rad", 0, "yield spec: |bias| at most `Y` rad (default: the shards' spec)")
	f.BoolVar(&o.json, "json", false, "print the summary as one JSON object (the same object as run --json)")
	return cmd
}

func runMerge(_ env, stdout, stderr io.Writer, dirs []string, o mergeOptions) error {
	if !o.confidenceGiven {
		o.confidence = 0.95 // unless the shards recorded one, below
	}
	if !(o.confidence > 0 && o.confidence < 1) {
		return fmt.Errorf("--confidence %g: want a level in (0, 1), such as 0.95", o.confidence)
	}
	spec, err := (&runOptions{minContrast: o.minContrast, maxBiasRad: o.maxBiasRad}).spec()
	if err != nil {
		return err
	}
	for _, d := range dirs {
		if fi, err := os.Stat(d); errors.Is(err, fs.ErrNotExist) {
			return fmt.Errorf("merge: %s does not exist: give the run directories of the shards", d)
		} else if err != nil {
			return fmt.Errorf("merge: %s: %v", d, pathErr(err))
		} else if !fi.IsDir() {
			return fmt.Errorf("merge: %s is not a directory: give the run directories of the shards", d)
		}
	}
	out := outDir("--out", o.out, runFiles...)
	out.want = "a new or empty directory"
	if err := checkOutputPaths(out); err != nil {
		return err
	}
	open := mc.OpenShards
	if o.specGiven && o.confidenceGiven {
		open = mc.OpenShardsResummarised // the summary is made anew
	}
	g, err := open(dirs)
	if err != nil {
		return err
	}
	m := &g.Manifest
	if !o.specGiven && m.YieldSpec != nil {
		spec = *m.YieldSpec
	}
	if !o.confidenceGiven && m.Confidence > 0 && m.Confidence < 1 {
		o.confidence = m.Confidence
	}
	m.Confidence = o.confidence
	m.YieldSpec = nil
	if spec.Active() {
		m.YieldSpec = &spec
	}
	// The rows stream from the shards (to --out, verified on the way);
	// only the output columns of the summary are kept.
	outcomes := mc.NewOutcomes(m.Samples)
	if o.out != "" {
		_, statErr := os.Lstat(o.out)
		made := errors.Is(statErr, fs.ErrNotExist)
		unlock, err := mc.LockDir(o.out) // held for the records, summary and figures
		if err != nil {
			return err
		}
		defer unlock()
		if err := g.WriteRun(o.out, outcomes.Add); err != nil {
			// Nothing of the run was written (WriteRun writes whole
			// files or none): leave no lock, nor a directory made here.
			// The lock file goes while still held, so that no other
			// process can hold it when it is unlinked.
			os.Remove(filepath.Join(o.out, mc.LockFile))
			unlock()
			if made {
				os.Remove(o.out) // only if empty
			}
			return err
		}
	} else if err := g.Scan(func(r mc.Record, _ string) error { outcomes.Add(r); return nil }); err != nil {
		return err
	}
	sum := m.SummariseOutcomes(outcomes, o.confidence, spec)
	if o.out != "" {
		if err := present.WriteOutcomeResults(o.out, sum, outcomes, spec); err != nil {
			return err
		}
		fmt.Fprintf(stderr, "merged %s, %s, into %s\n", plural.Count(len(dirs), "shard"), plural.Count(outcomes.Len(), "realisation"), o.out)
	}
	if o.json {
		return present.WriteJSON(stdout, sum)
	}
	fmt.Fprintf(stdout, "Merged %s: %s, seed %d, %s sampler\n\n", plural.Count(len(dirs), "shard"), plural.Count(outcomes.Len(), "realisation"), m.Seed, m.Sampler)
	return present.PrintSummary(stdout, sum)
}
