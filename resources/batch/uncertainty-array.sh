#!/usr/bin/env bash
# A Slurm array job that makes the draws of `motebench uncertainty` (a Monte Carlo run of a sample's uncertain
# inputs) in N parts, one per array task; `motebench join` puts the parts' draws together into the one draws file
# a single machine would have written (byte for byte), and `--from-draws` reports from it exactly as that single
# run reports.
#
# Submit (from the folder that holds the study; every variable below is read from the environment, and sbatch
# passes the environment to the job):
#
#   export STUDY=station.mote SAMPLE="Winter wood smoke" DRAWS=100000 SEED=7
#   export OUTDIR=draws MOTEBENCH="npx motebench"       # or "node /path/to/motebench/bin/motebench.mjs"
#   export LHS=1                                        # optional: Latin hypercube sampling instead of plain draws
#   mkdir -p draws
#   sbatch --array=1-16 resources/batch/uncertainty-array.sh  # 16 parts: tasks 1..16 run --shard 1/16 .. 16/16
#
# Join and report, once every task has ended (the array's job id is what sbatch printed):
#
#   sbatch --dependency=afterok:JOBID --wrap 'npx motebench join draws/part-*.csv --out draws.csv'
#   npx motebench uncertainty station.mote --sample "Winter wood smoke" --draws 100000 --seed 7 --precision 0 \
#     --from-draws draws.csv                             # the same options as the parts (with LHS=1: --lhs)
#
# The parts run every draw to the end (--precision 0, or --lhs): an early stop judges the draws in order, which
# parts apart cannot do. join refuses a missing part (a task that failed: run it again with sbatch --array=K), a
# part given twice and parts of another run (other study, sample, seed, draws or options); --from-draws refuses
# draws of another run. The array must be 1..N (the task numbers are the shard numbers).
#
#SBATCH --job-name=motebench-uncertainty
#SBATCH --cpus-per-task=2
#SBATCH --output=motebench-uncertainty-%A_%a.log
set -euo pipefail
: "${STUDY:?set STUDY to the study file}" "${SAMPLE:?set SAMPLE to the sample name}" "${DRAWS:?set DRAWS to the number of draws}"
k=${SLURM_ARRAY_TASK_ID:?run this as an array job: sbatch --array=1-N $0}
n=${SLURM_ARRAY_TASK_COUNT:-$((SLURM_ARRAY_TASK_MAX - SLURM_ARRAY_TASK_MIN + 1))}
outdir=${OUTDIR:-.}
workers=$(( ${SLURM_CPUS_PER_TASK:-2} > 1 ? ${SLURM_CPUS_PER_TASK:-2} - 1 : 0 ))
extra=()
[ -n "${SEED:-}" ] && extra+=(--seed "$SEED")
if [ -n "${LHS:-}" ]; then extra+=(--lhs); else extra+=(--precision 0); fi
# part-K-of-N with K zero-padded, so the shell lists the parts in order (join orders them anyway)
part=$(printf '%s/part-%05d-of-%05d.csv' "$outdir" "$k" "$n")
${MOTEBENCH:-npx motebench} uncertainty "$STUDY" --sample "$SAMPLE" --draws "$DRAWS" "${extra[@]}" \
  --workers "$workers" --shard "$k/$n" --out "$part"
