#!/usr/bin/env bash
# A regression run split over a Slurm job array: each array task runs one shard of the
# realisations as an independent process; a second job, started when every task has finished,
# joins the shards into exactly what a single run writes.
#
#   sbatch docs/hpc/regress-slurm.sh                          # the shards (array of 16 tasks)
#   sbatch --dependency=afterok:<array job id> docs/hpc/regress-slurm.sh merge
#
# Adjust the scenario, the number of realisations and shards, and the resources to your cluster.
#SBATCH --job-name=umbra-regress
#SBATCH --array=1-16
#SBATCH --cpus-per-task=2
#SBATCH --mem=8G
#SBATCH --time=02:00:00
#SBATCH --output=runs/logs/%x-%A_%a.out
set -euo pipefail

SCENARIO=${SCENARIO:-fixtures/scenarios/wide-shallow-survey.json}
REALISATIONS=${REALISATIONS:-200}
SHARDS=${SHARDS:-16}
OUT=${OUT:-runs/wide}

if [ "${1:-}" = "merge" ]; then
  npm run --silent umbra -- merge --out "$OUT/all" "$OUT"/shard-*
  exit 0
fi

i=${SLURM_ARRAY_TASK_ID:?run this as an array job (or set SLURM_ARRAY_TASK_ID)}
# --resume: a task that was preempted and requeued skips the realisations it already wrote.
npm run --silent umbra -- regress --scenario "$SCENARIO" --realisations "$REALISATIONS" \
  --shard "$i/$SHARDS" --workers "${SLURM_CPUS_PER_TASK:-1}" --resume --out "$OUT/shard-$i"
