#!/bin/bash
# Example Slurm job array for a colchem sweep: the variants split into TASKS pieces, one
# array task each (no MPI), then one job merging the pieces (colchem sweep --merge checks they
# come from this sweep definition and that every variant finished). Edit the resources for
# your cluster. On the login node:
#
#   scripts/slurm_sweep_array.sh configs/pyrene_sweep.yaml 8 [--set key=value ...]
#
# submits the array (8 tasks) and the merge (after every task succeeded). Pieces go to
# pieces/, the merged files where the sweep file says (sweep.output, sweep.table). A task
# stopped by its time limit (SIGTERM: exit 7, its piece written with the unfinished variants
# 'interrupted') resumes its piece when run again: 'scontrol requeue JOBID_TASK', or submit
# the same command again (finished pieces then run nothing).
#
# Run by hand (no Slurm), the stages are: COLCHEM_SWEEP_STAGE=piece with SLURM_ARRAY_TASK_ID,
# SLURM_ARRAY_TASK_COUNT and COLCHEM_SWEEP_COUNT set; COLCHEM_SWEEP_STAGE=merge.
#
#SBATCH --job-name=colchem-piece
#SBATCH --ntasks=1
#SBATCH --cpus-per-task=1
# One column solve at a time: tens of MB for a 40-species, 120-level column.
#SBATCH --mem=1G
#SBATCH --time=01:00:00
#SBATCH --output=colchem-piece-%A_%a.log
set -euo pipefail
colchem=${COLCHEM:-./build/src/colchem}
export OMP_NUM_THREADS=1
stage=${COLCHEM_SWEEP_STAGE:-submit}
sweep=${1:?usage: scripts/slurm_sweep_array.sh SWEEP.yaml TASKS [--set key=value ...]}
shift
case $stage in
  submit)
    tasks=${1:?usage: scripts/slurm_sweep_array.sh SWEEP.yaml TASKS [--set key=value ...]}
    shift
    # The dry run's last line is "N variants".
    count=$("$colchem" sweep "$sweep" "$@" --dry-run 2>/dev/null | tail -1 | cut -d' ' -f1)
    [ "$tasks" -le "$count" ] || tasks=$count
    mkdir -p pieces
    jid=$(sbatch --parsable --array="0-$((tasks - 1))" \
      --export=ALL,COLCHEM_SWEEP_STAGE=piece,COLCHEM_SWEEP_COUNT="$count" "$0" "$sweep" "$@")
    sbatch --dependency="afterok:${jid%%;*}" --job-name=colchem-merge --output=colchem-merge-%j.log \
      --export=ALL,COLCHEM_SWEEP_STAGE=merge "$0" "$sweep" "$@"
    echo "submitted $count variants in $tasks pieces (array job $jid) and their merge"
    ;;
  piece)
    i=$SLURM_ARRAY_TASK_ID n=$SLURM_ARRAY_TASK_COUNT v=$COLCHEM_SWEEP_COUNT
    a=$((i * v / n)) b=$(((i + 1) * v / n))
    out=pieces/piece-$a-$b.nc
    resume=()
    [ -f "$out" ] && resume=(--resume "$out")
    "$colchem" sweep "$sweep" "$@" --variants "$a:$b" -o "$out" --table "pieces/piece-$a-$b.csv" "${resume[@]}"
    ;;
  merge)
    "$colchem" sweep "$sweep" "$@" --merge pieces/piece-*.nc
    ;;
  *)
    echo "COLCHEM_SWEEP_STAGE: expected submit, piece or merge, found '$stage'" >&2
    exit 2
    ;;
esac
