#!/usr/bin/env bash
# A Slurm array job that runs `motebench series` on a long sizer time series in N parts, one per array task,
# each part on its own node or processors; `motebench join` then puts the parts together into the one file a
# single machine would have written (byte for byte).
#
# Submit (from the folder that holds the files; every variable below is read from the environment, and sbatch
# passes the environment to the job):
#
#   export SIZER=network-2019-2024.csv STUDY=station.mote SAMPLE="Coastal haze day" WAVELENGTHS=450,550,700nm
#   export OUTDIR=parts MOTEBENCH="npx motebench"        # or "node /path/to/motebench/bin/motebench.mjs"
#   export SCATTERING=neph.csv ABSORPTION=absorption.csv TRUNCATION=1   # optional: measured instruments beside
#                                                      # the sizer (--scattering, --absorption, --truncation)
#   mkdir -p parts
#   sbatch --array=1-16 resources/batch/series-array.sh  # 16 parts: tasks 1..16 run --shard 1/16 .. 16/16
#
# Join, once every task has ended (the array's job id is what sbatch printed):
#
#   sbatch --dependency=afterok:JOBID --wrap 'npx motebench join parts/part-*.csv --out record.csv'
#   # or by hand: npx motebench join parts/part-*.csv --out record.csv
#
# join refuses a missing part (a task that failed: run it again with sbatch --array=K), a part given twice and
# parts of another run (other inputs or options). Each part counts the sizer file's lines, reads its first lines
# for the table, jumps to its own lines and computes only its own rows; with measured instruments each
# part also reads them, and the sizer's times, whole. The array must be 1..N (the
# task numbers are the shard numbers). merge and uncertainty take --shard K/N the same way (see README).
#
#SBATCH --job-name=motebench-series
#SBATCH --cpus-per-task=2
#SBATCH --output=motebench-series-%A_%a.log
set -euo pipefail
: "${SIZER:?set SIZER to the sizer time series}" "${STUDY:?set STUDY to the study file}" "${SAMPLE:?set SAMPLE to the sample name}"
k=${SLURM_ARRAY_TASK_ID:?run this as an array job: sbatch --array=1-N $0}
n=${SLURM_ARRAY_TASK_COUNT:-$((SLURM_ARRAY_TASK_MAX - SLURM_ARRAY_TASK_MIN + 1))}
outdir=${OUTDIR:-.}
workers=$(( ${SLURM_CPUS_PER_TASK:-2} > 1 ? ${SLURM_CPUS_PER_TASK:-2} - 1 : 1 ))
extra=()
[ -n "${WAVELENGTHS:-}" ] && extra+=(--wavelengths "$WAVELENGTHS")
[ -n "${SCATTERING:-}" ] && extra+=(--scattering "$SCATTERING")
[ -n "${ABSORPTION:-}" ] && extra+=(--absorption "$ABSORPTION")
[ -n "${TRUNCATION:-}" ] && extra+=(--truncation)
# part-K-of-N with K zero-padded, so the shell lists the parts in order (join orders them anyway)
part=$(printf '%s/part-%05d-of-%05d.csv' "$outdir" "$k" "$n")
status=0
${MOTEBENCH:-npx motebench} series "$SIZER" --study "$STUDY" --sample "$SAMPLE" "${extra[@]}" \
  --workers "$workers" --shard "$k/$n" --out "$part" || status=$?
# exit status 1: rows were left out (listed in the task's log); the part is complete, so the task succeeds
[ "$status" -le 1 ] || exit "$status"
