#!/usr/bin/env bash
# A Slurm array job that runs `motebench merge` (several sizers as one size distribution on one time base) in N
# parts of the time steps, one per array task; `motebench join` then puts the parts together into the one merged
# file a single machine would have written (byte for byte).
#
# Submit (from the folder that holds the files; every variable below is read from the environment, and sbatch
# passes the environment to the job):
#
#   export MOBILITY=mobility-2024.csv AERODYNAMIC=aerodynamic-2024.csv DENSITY=1.8   # OPTICAL=counter.csv too
#   export MERGE_OPTIONS="--shape-factor 1.1 --every 10min"   # optional: any other merge options, space-separated
#   export OUTDIR=merged MOTEBENCH="npx motebench"            # or "node /path/to/motebench/bin/motebench.mjs"
#   mkdir -p merged
#   sbatch --array=1-8 resources/batch/merge-array.sh        # 8 parts: tasks 1..8 run --shard 1/8 .. 8/8
#
# Join, once every task has ended (the array's job id is what sbatch printed):
#
#   sbatch --dependency=afterok:JOBID --wrap 'npx motebench join merged/part-*.csv --out merged.csv'
#
# Every part reads the input files whole (the time base needs every stamp) and writes only its own time steps, so
# the parts share the merging, not the reading. join refuses a missing part (a task that failed: run it again with
# sbatch --array=K), a part given twice and parts of another run (other inputs or options). The array must be 1..N
# (the task numbers are the shard numbers).
#
#SBATCH --job-name=motebench-merge
#SBATCH --cpus-per-task=1
#SBATCH --output=motebench-merge-%A_%a.log
set -euo pipefail
k=${SLURM_ARRAY_TASK_ID:?run this as an array job: sbatch --array=1-N $0}
n=${SLURM_ARRAY_TASK_COUNT:-$((SLURM_ARRAY_TASK_MAX - SLURM_ARRAY_TASK_MIN + 1))}
outdir=${OUTDIR:-.}
args=()
[ -n "${MOBILITY:-}" ] && args+=(--mobility "$MOBILITY")
[ -n "${AERODYNAMIC:-}" ] && args+=(--aerodynamic "$AERODYNAMIC")
[ -n "${OPTICAL:-}" ] && args+=(--optical "$OPTICAL")
[ -n "${DENSITY:-}" ] && args+=(--density "$DENSITY")
[ ${#args[@]} -gt 0 ] || { echo "set MOBILITY, AERODYNAMIC and/or OPTICAL to the sizer files" >&2; exit 2; }
read -r -a more <<< "${MERGE_OPTIONS:-}"
# part-K-of-N with K zero-padded, so the shell lists the parts in order (join orders them anyway)
part=$(printf '%s/part-%05d-of-%05d.csv' "$outdir" "$k" "$n")
status=0
${MOTEBENCH:-npx motebench} merge "${args[@]}" "${more[@]}" --shard "$k/$n" --out "$part" || status=$?
# exit status 1: rows of an input were left out (listed in the task's log); the part is complete, so the task succeeds
[ "$status" -le 1 ] || exit "$status"
