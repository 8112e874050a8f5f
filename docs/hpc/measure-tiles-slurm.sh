#!/usr/bin/env bash
# Tiled forced photometry of a large survey map split over a Slurm job array: each array task
# measures one shard of the sky tiles as an independent process, writing one file per tile into a
# shared tile folder; a second job, started when every task has finished, joins the tiles into
# exactly what a single tiled run writes.
#
#   sbatch docs/hpc/measure-tiles-slurm.sh                          # the shards (array of 8 tasks)
#   sbatch --dependency=afterok:<array job id> docs/hpc/measure-tiles-slurm.sh merge
#
# Adjust the manifest, catalogue, tile size, shards and resources to your survey. For a blind search,
# use `umbra search` with the same tile options and no --catalog.
#SBATCH --job-name=umbra-measure-tiles
#SBATCH --array=1-8
#SBATCH --cpus-per-task=2
#SBATCH --mem=16G
#SBATCH --time=04:00:00
#SBATCH --output=runs/logs/%x-%A_%a.out
set -euo pipefail

BANDS=${BANDS:-survey/bands.json}
CATALOG=${CATALOG:-survey/clusters.csv}
TILE_DEG=${TILE_DEG:-5}
SHARDS=${SHARDS:-8}
OUT=${OUT:-runs/survey/results.csv}

if [ "${1:-}" = "merge" ]; then
  npm run --silent umbra -- merge --json --out "$OUT" "${OUT%.csv}.tiles"
  exit 0
fi

i=${SLURM_ARRAY_TASK_ID:?run this as an array job (or set SLURM_ARRAY_TASK_ID)}
# --resume: a task that was preempted and requeued skips the tiles it already wrote.
npm run --silent umbra -- measure --bands "$BANDS" --catalog "$CATALOG" --tile "$TILE_DEG" \
  --shard "$i/$SHARDS" --workers "${SLURM_CPUS_PER_TASK:-1}" --resume --out "$OUT"
