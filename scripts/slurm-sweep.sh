#!/bin/sh
# slurm-sweep.sh - one holdfast sweep spread over a Slurm job array.
#
# Each array task runs `holdfast sweep --shard K/N` on its own contiguous part
# of the cases and writes $OUT/part-K.csv (K zero-padded to 6 digits, so the
# parts sort in order) with its sidecar $OUT/part-K.csv.shard (the sweep's
# fingerprint, K of N, the first case).  Only part 1 carries the CSV header,
# so the parts concatenated in order are byte for byte the single-machine
# sweep; scripts/merge-shards.sh does that and refuses missing parts and
# parts that belong to another sweep or do not fit together.
#
# Submit (the array must run 1..N; N is taken from the array size):
#
#   export HOLDFAST=$PWD/build/holdfast CASE=cases/barge.yaml OUT=parts
#   export SWEEP_ARGS='--vary site.water_level=-2:2:0.001 --vary lines[bow-port].sections[2].length=280:320:0.5'
#   jid=$(sbatch --parsable --array=1-16 scripts/slurm-sweep.sh)
#   sbatch --dependency=afterok:$jid --wrap "scripts/merge-shards.sh $OUT 16 sweep.csv"
#
# Environment:
#   CASE        case file (required)
#   SWEEP_ARGS  the --vary/--zip/--output options of `holdfast sweep` (required);
#               split on blanks, never glob-expanded (paths contain [ ])
#   OUT         directory for the parts (default: sweep-parts)
#   HOLDFAST    the holdfast binary (default: holdfast on PATH)
#   SHARDS      number of parts N (default: SLURM_ARRAY_TASK_COUNT)
#   JOBS        threads per task (default: SLURM_CPUS_PER_TASK, else 1)
#
# Outside Slurm the same script runs one part when SLURM_ARRAY_TASK_ID (and
# SHARDS or SLURM_ARRAY_TASK_COUNT) are set by hand, e.g. from GNU parallel.
#
#SBATCH --job-name=holdfast-sweep
#SBATCH --cpus-per-task=2
#SBATCH --time=02:00:00
#SBATCH --output=holdfast-sweep-%A_%a.log
set -eu

: "${CASE:?set CASE to the case file}"
: "${SWEEP_ARGS:?set SWEEP_ARGS to the --vary options}"
: "${SLURM_ARRAY_TASK_ID:?not an array task: submit with sbatch --array=1-N}"
OUT=${OUT:-sweep-parts}
HOLDFAST=${HOLDFAST:-holdfast}
N=${SHARDS:-${SLURM_ARRAY_TASK_COUNT:-}}
: "${N:?set SHARDS (no SLURM_ARRAY_TASK_COUNT in this Slurm)}"
K=$SLURM_ARRAY_TASK_ID
JOBS=${JOBS:-${SLURM_CPUS_PER_TASK:-1}}

mkdir -p "$OUT"
part=$(printf '%s/part-%06d.csv' "$OUT" "$K")
set -f  # parameter paths such as lines[bow].sections[2].length must not glob
# shellcheck disable=SC2086  # SWEEP_ARGS is a list of options on purpose
exec "$HOLDFAST" sweep "$CASE" $SWEEP_ARGS --shard "$K/$N" --jobs "$JOBS" --quiet --csv "$part"
