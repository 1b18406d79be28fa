#!/bin/bash
# Example Slurm batch job for a colchem sweep as one MPI job (edit the resources for your
# cluster). Each variant is an independent column solve on one MPI rank; ranks take the next
# variant from a shared counter as soon as they are free, so they stay busy to within one
# variant's time. Size --ntasks with the dry run (it prints the variant count):
#
#   build/src/colchem sweep configs/pyrene_sweep.yaml --dry-run | tail -1
#   sbatch --ntasks=8 scripts/slurm_sweep.sh configs/pyrene_sweep.yaml
#
# On SIGTERM (the time limit) the sweep writes its files with the unfinished variants
# 'interrupted' and exits 7; submit it again with '--resume OUT.nc' to run only those.
# For a job array of pieces instead of one MPI job: scripts/slurm_sweep_array.sh.
#
#SBATCH --job-name=colchem-sweep
#SBATCH --ntasks=32
#SBATCH --cpus-per-task=1
# Memory per rank is small (tens of MB for a 40-species, 120-level column; rank 0 also holds
# every variant's profiles to write them): 500 MB per rank leaves room.
#SBATCH --mem-per-cpu=500M
#SBATCH --time=01:00:00
#SBATCH --output=colchem-sweep-%j.log
set -euo pipefail
sweep=${1:?usage: sbatch scripts/slurm_sweep.sh SWEEP.yaml [--set key=value | --resume OUT.nc ...]}
shift
# One thread per rank: the column solver is serial per variant.
export OMP_NUM_THREADS=1
# --mpi=pmix: Debian's Open MPI is built with PMIx; use the plugin your Slurm offers
# ('srun --mpi=list').
srun --mpi=pmix --cpu-bind=cores ./build/src/colchem sweep "$sweep" "$@"
