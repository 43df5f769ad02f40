#!/bin/bash
# One coilfront sweep split over a Slurm job array of 8 tasks, one shard each.
# Submit from the folder holding spec.yaml, after `mkdir -p runs`:   sbatch slurm-array.sh
# Each task finds its shard (k of 8) in SLURM_ARRAY_TASK_ID and SLURM_ARRAY_TASK_MIN/MAX, which Slurm
# sets for every array task, so no --shard flag is needed. Keep --array an evenly spaced range.
#SBATCH --job-name=coilfront-night
#SBATCH --array=1-8
#SBATCH --cpus-per-task=8
#SBATCH --time=10:00:00
#SBATCH --signal=B:TERM@300
#SBATCH --output=runs/night-shard-%a.log

# --signal above sends SIGTERM to this script 5 minutes before the job's time limit; `exec` makes
# coilfront this script's process, so it receives it, finishes its batches and writes a checkpoint.
# --time-limit stops it cleanly even earlier. Submitting the same array again continues each shard.
out="runs/night-shard-$SLURM_ARRAY_TASK_ID"
if [ -e "$out/run.json" ]; then
  exec coilfront sweep --resume "$out" --workers "$SLURM_CPUS_PER_TASK" --time-limit 9h30m
fi
exec coilfront sweep spec.yaml --out "$out" --workers "$SLURM_CPUS_PER_TASK" --time-limit 9h30m

# When all 8 tasks have finished (for example in a job submitted with --dependency=afterok:JOBID):
#   coilfront merge runs/night-shard-{1..8} --out runs/night
