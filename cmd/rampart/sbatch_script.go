package main

import (
	"errors"
	"fmt"
	"io"
	"math"
	"regexp"
	"strconv"
	"strings"
	"time"

	"rampart/internal/plural"
)

// writeSbatch writes the job-array script of the plan: tasks 1 to N run
// one shard each, task 0 merges them and finishes the command.
func writeSbatch(w io.Writer, p sbatchPlan) error {
	var b strings.Builder
	pr := func(format string, a ...any) { fmt.Fprintf(&b, format+"\n", a...) }
	shards := p.shardsDir()
	perShard := int(math.Ceil(float64(p.Units) / float64(p.Shards)))
	pr("#!/bin/bash")
	pr("# Slurm job array written by rampart sbatch (rampart %s) for", p.Version)
	pr("#   rampart %s", shellJoin(p.Line))
	pr("#")
	pr("# Submit both stages from the directory the command line's paths are relative to:")
	pr("#   %s", submitLine(p))
	pr("#   %s", mergeLine(p))
	pr("# Tasks 1 to %d each run one shard into %s/K; task 0, submitted by the", p.Shards, shards)
	pr("# second line, runs once every shard has succeeded: it merges the shards'")
	pr("# run directories into %s and runs the command on the merged set, which gives", p.Out)
	pr("# the files of one unsharded run. A task that stopped continues when resubmitted.")
	pr("#")
	pr("# Time limit: a shard of %s on %s at %.4g realisations per", plural.Count(perShard, "realisation"), cpusText(p.CPUs), p.Rate)
	pr("# core-second (%s) takes about %s;", p.RateFrom, roundEstimate(p.Estimate()))
	pr("# the limit is twice that plus 10 minutes.")
	pr("#SBATCH --job-name=rampart-%s", p.Command)
	pr("#SBATCH --array=1-%d", p.Shards)
	pr("#SBATCH --cpus-per-task=%d", p.CPUs)
	pr("#SBATCH --output=%s/slurm-%%A_%%a.out", shards)
	pr("#SBATCH --time=%s", slurmTime(p.Time))
	if p.Partition != "" {
		pr("#SBATCH --partition=%s", p.Partition)
	}
	pr("set -euo pipefail")
	pr("rampart=${RAMPART:-%s}", shellQuote(p.Rampart))
	pr("out=%s", shellQuote(p.Out))
	pr("shards=%s", shellQuote(shards))
	pr("n=%d", p.Shards)
	pr(`k=${SLURM_ARRAY_TASK_ID:?"submit this script with sbatch, as its head says"}`)
	pr("workers=${SLURM_CPUS_PER_TASK:-1}")
	pr("")
	pr("if ((k > 0)); then")
	pr("	# Shard k of n, continued if an earlier attempt left its directory.")
	pr(`	place=(--out "$shards/$k")`)
	pr(`	[[ -d $shards/$k ]] && place=(--resume "$shards/$k")`)
	pr(`	exec "$rampart" %s %s \`, p.Command, shellJoin(p.ShardArgs))
	pr(`		--shard "$k/$n" --workers "$workers" "${place[@]}"`)
	pr("fi")
	pr("")
	pr("# Task 0: merge every run directory of the shards (one per ramp for rank,")
	pr("# per point for scan), then finish the command on the merged set.")
	b.WriteString(mergeLoop)
	pr(`exec "$rampart" %s %s \`, p.Command, shellJoin(p.FinalArgs))
	pr(`	--workers "$workers" --resume "$out"`)
	_, err := io.WriteString(w, b.String())
	return err
}

// mergeLoop merges each run directory of the shards (the top directory,
// or one per ramp or point below it) into the same place under $out,
// skipping those an earlier attempt merged.
const mergeLoop = `(cd "$shards/1" && find . -name manifest.json | sort) | while IFS= read -r m; do
	sub=${m#./}
	sub=${sub%manifest.json} # "" for the top directory, NAME/ below it
	[[ -e $out/${sub}manifest.json ]] && continue # merged by an earlier attempt
	parts=()
	for ((i = 1; i <= n; i++)); do parts+=("$shards/$i/$sub"); done
	"$rampart" merge --out "$out/$sub" "${parts[@]}" >/dev/null
done
`

// submitLine is the submission of the shards, mergeLine that of the merge.
func submitLine(p sbatchPlan) string {
	return "jid=$(sbatch --parsable " + shellQuote(p.Script) + ")"
}

func mergeLine(p sbatchPlan) string {
	return fmt.Sprintf("sbatch --dependency=afterok:${jid%%%%;*} --array=0 --cpus-per-task=1 --time=%s %s", p.MergeTime, shellQuote(p.Script))
}

// slurmTime formats d as Slurm's [D-]HH:MM:SS.
func slurmTime(d time.Duration) string {
	s := int64(math.Ceil(d.Seconds()))
	days, s := s/86400, s%86400
	hms := fmt.Sprintf("%02d:%02d:%02d", s/3600, s/60%60, s%60)
	if days > 0 {
		return fmt.Sprintf("%d-%s", days, hms)
	}
	return hms
}

var slurmTimeRE = regexp.MustCompile(`^(?:(\d+)-)?(\d+):([0-5]\d):([0-5]\d)$`)

// parseSlurmTime reads [D-]HH:MM:SS.
func parseSlurmTime(s string) (time.Duration, error) {
	m := slurmTimeRE.FindStringSubmatch(s)
	if m == nil {
		return 0, errors.New("want a time limit [D-]HH:MM:SS, such as 01:00:00")
	}
	var d time.Duration
	for i, unit := range []time.Duration{24 * time.Hour, time.Hour, time.Minute, time.Second} {
		if m[i+1] != "" {
			v, _ := strconv.Atoi(m[i+1])
			d += time.Duration(v) * unit
		}
	}
	return d, nil
}

// shellQuote quotes s for bash where needed.
func shellQuote(s string) string {
	if s != "" && strings.Trim(s, "abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ0123456789_-./=:,+@%") == "" {
		return s
	}
	return "'" + strings.ReplaceAll(s, "'", `'\''`) + "'"
}

func shellJoin(args []string) string {
	q := make([]string, len(args))
	for i, a := range args {
		q[i] = shellQuote(a)
	}
	return strings.Join(q, " ")
}

// cpusText is "1 CPU" or "N CPUs".
func cpusText(n int) string {
	if n == 1 {
		return "1 CPU"
	}
	return fmt.Sprintf("%d CPUs", n)
}
