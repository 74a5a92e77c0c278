package main

import (
	"fmt"
	"io"
	"math"
	"os"
	"strings"
	"time"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"rampart/internal/atomicfile"
	"rampart/internal/plural"
	"rampart/internal/version"
	"rampart/mc"
)

// sbatchOptions are the generator's own flags.
type sbatchOptions struct {
	shards    int
	script    string
	rate      float64
	probe     int
	mergeTime string
	partition string
	rampart   string
}

// shardable names the commands whose work is a set of ensembles that
// shard (--shard k/n) and merge, with the flag that sets their size in
// the units of the rate: realisations per ensemble, or the base rows of a
// sensitivity design.
var shardable = map[string]string{
	"run": "samples", "rank": "samples", "qualify": "samples", "scan": "samples", "sensitivity": "base",
}

// sequential says, for the searches that do not shard, which of their
// stages does and how.
var sequential = map[string]string{
	"tolerance": "a tolerance search is sequential (each amplitude tried depends on the verdicts before it): run it on one node with --workers set to its cores; its confirmation at a found amplitude A is rampart qualify --set KEY=A, which shards",
	"edge":      "an edge search is sequential (each value tried depends on the verdicts before it): run it on one node with --workers set to its cores; its confirmation at the found value V is rampart qualify --set KEY=V, which shards",
	"robust":    "an optimisation is sequential (each evaluation depends on those before it): run it on one node with --workers set to its cores; its fresh ranking is rampart rank --ramp best=file:RAMP.csv, which shards",
}

// newSbatchCmd returns the job-array script generator.
func newSbatchCmd(e env) *cobra.Command {
	var o sbatchOptions
	cmd := &cobra.Command{
		Use:   "sbatch [--shards N] [--rate R] -- COMMAND FLAGS... --out DIR",
		Short: "Write a Slurm job-array script that runs a command in shards and merges them",
		Long: `Write a ready Slurm batch script for a command line of run, rank, qualify,
sensitivity or scan --ensemble (given after --, with --out DIR for the
result). Submitted with sbatch, the script is a job array of --shards tasks:
task K runs the command with --shard K/N into DIR.shards/K, on
--cpus-per-task = the command's --workers (1 when it has none: 0 would claim
every core of the node). Task 0, submitted as a dependent job once every
shard has succeeded, merges the shards' run directories into DIR (rampart
merge, one per ramp or scan point) and runs the command again with --resume
DIR, which gives the files of one unsharded run, byte for byte. The two
submission lines are printed and written at the head of the script; submit
from the directory the command line's paths are relative to. A task that
stopped (pre-empted, out of time) continues its shard when resubmitted.

The time limit of a task is twice the estimated time of its shard plus 10
minutes. The estimate comes from a rate in realisations (the unit of
--samples, or base rows for sensitivity) per core-second: --rate R, or
measured here by running the command line twice on one worker, with --probe
M and 4M realisations, as (4M - M) / (t(4M) - t(M)), which leaves out the
fixed cost of a run (preflight, noise grid); M grows fourfold until the
larger run takes a second (or 16M would pass the command's size). For rank and scan a realisation
is one of every ramp or point. tolerance, edge and robust are sequential
searches and are refused, naming the stage of each that shards.`,
		Args: func(_ *cobra.Command, args []string) error {
			if len(args) == 0 {
				return fmt.Errorf("sbatch: no command line given: give it after --, as in rampart sbatch --shards 16 -- run --scenario lab.toml --samples 100000 --out all")
			}
			return nil
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			return runSbatch(e, cmd.OutOrStdout(), cmd.ErrOrStderr(), args, o)
		},
	}
	f := cmd.Flags()
	f.IntVar(&o.shards, "shards", 16, "tasks `N` of the job array, each one shard")
	f.StringVar(&o.script, "script", "", "write the script to `FILE` (default: DIR.sbatch for the command's --out DIR)")
	f.Float64Var(&o.rate, "rate", 0, "realisations `R` per core-second, for the time limit (default: measured with --probe)")
	f.IntVar(&o.probe, "probe", 8, "measure the rate with `M` and 4M realisations on one worker (a power of two for sensitivity's Sobol' design)")
	f.StringVar(&o.mergeTime, "merge-time", "01:00:00", "time limit `HH:MM:SS` of the merge task")
	f.StringVar(&o.partition, "partition", "", "Slurm partition `P` (default: the cluster's)")
	f.StringVar(&o.rampart, "rampart", "rampart", "the rampart binary the tasks run, as a `PATH` or a name on the nodes' PATH (the variable RAMPART, if set at submission, overrides it)")
	return cmd
}

// sbatchPlan is what a script is written from.
type sbatchPlan struct {
	Command   string   // run, rank, ...
	Line      []string // the command line as given
	ShardArgs []string // the flags of a shard, without --out, --resume, --shard, --workers, --report, --json
	FinalArgs []string // the flags of the final step, without --out, --resume, --shard, --workers
	Out       string
	Script    string
	Shards    int
	CPUs      int
	Units     int     // the command's size in realisations (or base rows)
	Rate      float64 // realisations per core-second
	RateFrom  string  // how the rate was found
	Time      time.Duration
	MergeTime string
	Partition string
	Rampart   string
	Version   string
}

// setTime sets the time limit of a task: twice the estimate plus 10
// minutes, rounded up to the minute.
func (p *sbatchPlan) setTime() {
	p.Time = (2*p.Estimate() + 10*time.Minute + time.Minute - 1).Truncate(time.Minute)
}

// shardsDir is the directory of the shards and the tasks' logs.
func (p sbatchPlan) shardsDir() string { return strings.TrimRight(p.Out, "/") + ".shards" }

// Estimate returns the estimated wall time of one shard.
func (p sbatchPlan) Estimate() time.Duration {
	perShard := math.Ceil(float64(p.Units) / float64(p.Shards))
	return time.Duration(perShard / (p.Rate * float64(p.CPUs)) * float64(time.Second))
}

func runSbatch(e env, stdout, stderr io.Writer, line []string, o sbatchOptions) error {
	p, fs, err := planSbatch(line, o)
	if err != nil {
		return err
	}
	if _, err := os.Lstat(p.Script); err == nil {
		return fmt.Errorf("--script %s: the file exists; remove it or name another", p.Script)
	}
	if err := checkOutputPaths(outFile("--script", p.Script)); err != nil {
		return err
	}
	if p.Rate == 0 {
		if o.probe < 1 {
			return fmt.Errorf("--probe %d: want at least 1 realisation", o.probe)
		}
		if p.Rate, p.RateFrom, err = probeRate(e, p, fs, o.probe); err != nil {
			return err
		}
		fmt.Fprintf(stderr, "rate %.4g realisations per core-second, %s\n", p.Rate, p.RateFrom)
	}
	p.setTime()
	est := p.Estimate()
	// The tasks' logs go to DIR.shards, which Slurm needs to exist.
	if err := os.MkdirAll(p.shardsDir(), 0o755); err != nil {
		return err
	}
	if err := atomicfile.Write(p.Script, func(w io.Writer) error { return writeSbatch(w, p) }); err != nil {
		return err
	}
	fmt.Fprintf(stdout, "Wrote %s: %s of %s, time limit %s each (a shard of %s estimated at %s).\nSubmit both stages from this directory:\n  %s\n  %s\n",
		p.Script, plural.Count(p.Shards, "task"), cpusText(p.CPUs), slurmTime(p.Time), plural.Count(int(math.Ceil(float64(p.Units)/float64(p.Shards))), "realisation"), roundEstimate(est), submitLine(p), mergeLine(p))
	return nil
}

// planSbatch checks the command line and the options and returns the plan
// (its rate from --rate, or zero to be measured) and the command's parsed
// flags.
func planSbatch(line []string, o sbatchOptions) (sbatchPlan, *pflag.FlagSet, error) {
	name := line[0]
	if why, ok := sequential[name]; ok {
		return sbatchPlan{}, nil, fmt.Errorf("sbatch %s: %s", name, why)
	}
	sizeFlag, ok := shardable[name]
	if !ok {
		return sbatchPlan{}, nil, fmt.Errorf("sbatch %s: want a command that runs ensembles: run, rank, qualify, sensitivity or scan --ensemble", excerptArg(name))
	}
	var sub *cobra.Command
	for _, c := range newRoot(env{now: time.Now}).Commands() {
		if c.Name() == name {
			sub = c
		}
	}
	fs := sub.Flags()
	if err := fs.Parse(line[1:]); err != nil {
		return sbatchPlan{}, nil, fmt.Errorf("sbatch: the command line: %w", flagError(err))
	}
	get := func(n string) string { return fs.Lookup(n).Value.String() }
	switch {
	case len(fs.Args()) > 0 && name != "rank":
		return sbatchPlan{}, nil, fmt.Errorf("sbatch: the command line: %s takes no argument %q", name, fs.Args()[0])
	case fs.Changed("shard"):
		return sbatchPlan{}, nil, fmt.Errorf("sbatch: the command line has --shard %s: leave it out, each task of the array gets its own", get("shard"))
	case fs.Changed("resume"):
		return sbatchPlan{}, nil, fmt.Errorf("sbatch: the command line has --resume %s: give --out DIR for the merged result; the shards start in DIR.shards", get("resume"))
	case !fs.Changed("out") || get("out") == "":
		return sbatchPlan{}, nil, fmt.Errorf("sbatch: the command line has no --out DIR: give the directory the merged result goes to")
	case name == "scan" && get("ensemble") != "true":
		return sbatchPlan{}, nil, fmt.Errorf("sbatch: a noise-free scan has no ensemble to shard: give scan --ensemble")
	case o.shards < 1:
		return sbatchPlan{}, nil, fmt.Errorf("--shards %d: want at least 1 task", o.shards)
	case o.rate < 0 || math.IsNaN(o.rate) || math.IsInf(o.rate, 0):
		return sbatchPlan{}, nil, fmt.Errorf("--rate %g: want a positive rate in realisations per core-second", o.rate)
	}
	if _, err := parseSlurmTime(o.mergeTime); err != nil {
		return sbatchPlan{}, nil, fmt.Errorf("--merge-time %s: %w", o.mergeTime, err)
	}
	var units, cpus int
	fmt.Sscan(get(sizeFlag), &units)
	fmt.Sscan(get("workers"), &cpus)
	if perShard := (units + o.shards - 1) / o.shards; sizeFlag == "samples" && perShard > mc.MaxInProcess {
		return sbatchPlan{}, nil, fmt.Errorf("--shards %d: shards of %s, more than the %d one process holds; give --shards %d or more", o.shards, plural.Count(perShard, "realisation"), mc.MaxInProcess, (units+mc.MaxInProcess-1)/mc.MaxInProcess)
	}
	if o.shards > units {
		return sbatchPlan{}, nil, fmt.Errorf("--shards %d: more tasks than the %d %s of the command line", o.shards, units, map[string]string{"samples": "realisations", "base": "base rows"}[sizeFlag])
	}
	if cpus < 1 {
		cpus = 1
	}
	out := get("out")
	script := o.script
	if script == "" {
		script = strings.TrimRight(out, "/") + ".sbatch"
	}
	return sbatchPlan{
		Command: name, Line: line,
		ShardArgs: dropFlags(fs, line[1:], "out", "resume", "shard", "workers", "report", "json"),
		FinalArgs: dropFlags(fs, line[1:], "out", "resume", "shard", "workers"),
		Out:       out, Script: script, Shards: o.shards, CPUs: cpus, Units: units,
		Rate: o.rate, RateFrom: fmt.Sprintf("--rate %g", o.rate), MergeTime: o.mergeTime,
		Partition: o.partition, Rampart: o.rampart, Version: version.Get().String(),
	}, fs, nil
}

// dropFlags returns args without the named long flags and their values.
func dropFlags(fs *pflag.FlagSet, args []string, names ...string) []string {
	drop := map[string]bool{}
	for _, n := range names {
		drop[n] = true
	}
	var kept []string
	for i := 0; i < len(args); i++ {
		a := args[i]
		if a == "--" {
			kept = append(kept, args[i:]...)
			break
		}
		name, _, hasValue := strings.Cut(strings.TrimPrefix(a, "--"), "=")
		fl := fs.Lookup(name)
		if !strings.HasPrefix(a, "--") || fl == nil {
			kept = append(kept, a)
			continue
		}
		takesNext := !hasValue && fl.NoOptDefVal == "" && i+1 < len(args)
		if !drop[name] {
			kept = append(kept, a)
			if takesNext {
				kept = append(kept, args[i+1])
			}
		}
		if takesNext {
			i++
		}
	}
	return kept
}

// probeMin is the time the larger run of the probe should take at least,
// so that the difference of the two runs stands above the timing noise.
const probeMin = time.Second

// probeRate measures the command's rate in realisations per core-second:
// the command line (as a shard runs it, without its directory) run in this
// process on one worker with m and 4m realisations, m growing fourfold
// until the larger run takes probeMin or 16m would pass the command's own
// size. The rate is 3m / (t(4m) - t(m)), which leaves out the fixed cost of
// a run; when the difference is under a quarter of t(4m) (timing noise) it
// is 4m / t(4m), which counts the fixed cost and so errs slow.
func probeRate(e env, p sbatchPlan, fs *pflag.FlagSet, m int) (float64, string, error) {
	size := shardable[p.Command]
	base := append([]string{p.Command}, dropFlags(fs, p.ShardArgs, size)...)
	time1 := func(n int) (time.Duration, error) {
		args := append(append([]string{}, base...), "--workers", "1", "--"+size, fmt.Sprint(n))
		var errs strings.Builder
		t0 := time.Now()
		code := run(args, io.Discard, &errs, env{now: e.now})
		if code != 0 && code != 1 && code != 3 { // 1 and 3: a verdict, not an error
			return 0, fmt.Errorf("sbatch: measuring the rate with %s: %s", plural.Count(n, "realisation"), strings.TrimSpace(errs.String()))
		}
		return time.Since(t0), nil
	}
	for {
		t1, err := time1(m)
		if err != nil {
			return 0, "", err
		}
		t4, err := time1(4 * m)
		if err != nil {
			return 0, "", err
		}
		if t4 < probeMin && 16*m <= p.Units {
			m *= 4
			continue
		}
		if d := t4 - t1; d > t4/4 {
			return float64(3*m) / d.Seconds(), fmt.Sprintf("measured on one worker: %d and %d realisations in %s and %s", m, 4*m, t1.Round(time.Millisecond), t4.Round(time.Millisecond)), nil
		}
		return float64(4*m) / t4.Seconds(), fmt.Sprintf("measured on one worker: %d realisations in %s, fixed cost included", 4*m, t4.Round(time.Millisecond)), nil
	}
}

func excerptArg(s string) string {
	if len(s) > 40 {
		return s[:40] + "..."
	}
	return s
}

// roundEstimate rounds an estimated time for display.
func roundEstimate(d time.Duration) time.Duration {
	if d < 10*time.Second {
		return d.Round(10 * time.Millisecond)
	}
	return d.Round(time.Second)
}
