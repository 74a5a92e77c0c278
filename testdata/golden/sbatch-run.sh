#!/bin/bash
# Slurm job array written by rampart sbatch (rampart v1.2.3 (revision abc123)) for
#   rampart run --scenario testdata/scenarios/ensemble.toml --samples 400 --seed 7 --min-contrast 0.5 --max-bias-rad 2e-3 --workers 4 --out run7 --json
#
# Submit both stages from the directory the command line's paths are relative to:
#   jid=$(sbatch --parsable run7.sbatch)
#   sbatch --dependency=afterok:${jid%%;*} --array=0 --cpus-per-task=1 --time=01:00:00 run7.sbatch
# Tasks 1 to 16 each run one shard into run7.shards/K; task 0, submitted by the
# second line, runs once every shard has succeeded: it merges the shards'
# run directories into run7 and runs the command on the merged set, which gives
# the files of one unsharded run. A task that stopped continues when resubmitted.
#
# Time limit: a shard of 25 realisations on 4 CPUs at 50 realisations per
# core-second (--rate 50) takes about 130ms;
# the limit is twice that plus 10 minutes.
#SBATCH --job-name=rampart-run
#SBATCH --array=1-16
#SBATCH --cpus-per-task=4
#SBATCH --output=run7.shards/slurm-%A_%a.out
#SBATCH --time=00:11:00
set -euo pipefail
rampart=${RAMPART:-rampart}
out=run7
shards=run7.shards
n=16
k=${SLURM_ARRAY_TASK_ID:?"submit this script with sbatch, as its head says"}
workers=${SLURM_CPUS_PER_TASK:-1}

if ((k > 0)); then
	# Shard k of n, continued if an earlier attempt left its directory.
	place=(--out "$shards/$k")
	[[ -d $shards/$k ]] && place=(--resume "$shards/$k")
	exec "$rampart" run --scenario testdata/scenarios/ensemble.toml --samples 400 --seed 7 --min-contrast 0.5 --max-bias-rad 2e-3 \
		--shard "$k/$n" --workers "$workers" "${place[@]}"
fi

# Task 0: merge every run directory of the shards (one per ramp for rank,
# per point for scan), then finish the command on the merged set.
(cd "$shards/1" && find . -name manifest.json | sort) | while IFS= read -r m; do
	sub=${m#./}
	sub=${sub%manifest.json} # "" for the top directory, NAME/ below it
	[[ -e $out/${sub}manifest.json ]] && continue # merged by an earlier attempt
	parts=()
	for ((i = 1; i <= n; i++)); do parts+=("$shards/$i/$sub"); done
	"$rampart" merge --out "$out/$sub" "${parts[@]}" >/dev/null
done
exec "$rampart" run --scenario testdata/scenarios/ensemble.toml --samples 400 --seed 7 --min-contrast 0.5 --max-bias-rad 2e-3 --json \
	--workers "$workers" --resume "$out"
