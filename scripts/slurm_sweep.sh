#!/bin/bash
# Example Slurm batch job for a colchem sweep (edit the resources for your cluster).
# Each variant is an independent column solve on one MPI rank; ranks take the next variant
# from a shared counter as soon as they are free, so they stay busy to within one variant's
# time. Ask for as many ranks as you have variants or fewer; memory per rank is small
# (tens of MB for a 40-species, 120-level column).
#
#   sbatch scripts/slurm_sweep.sh configs/pyrene_sweep.yaml
#
#SBATCH --job-name=colchem-sweep
#SBATCH --ntasks=32
#SBATCH --cpus-per-task=1
#SBATCH --time=01:00:00
#SBATCH --output=colchem-sweep-%j.log
set -euo pipefail
sweep=${1:?usage: sbatch scripts/slurm_sweep.sh SWEEP.yaml [--set key=value ...]}
shift
# One thread per rank: the column solver is serial per variant.
export OMP_NUM_THREADS=1
srun --cpu-bind=cores ./build/src/colchem sweep "$sweep" "$@"
