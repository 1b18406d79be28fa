#!/usr/bin/env bash
# Job arrays (issue 17): a sweep run in pieces (--variants A:B, as array tasks would) and the
# pieces joined with --merge gives the file of one 2-rank mpirun (every variable; scores and
# mole fractions to 1e-10 relative, compare_sweep_files.py). The merge refuses (exit 4) an
# incomplete set of pieces or a variant in two pieces, and (exit 3) a piece of another
# sweep definition, naming what is missing or differs. The stages of
# scripts/slurm_sweep_array.sh, run by hand, give the same file.
set -eu
colchem=$1; dir=$2; work=$3
here=$(cd "$(dirname "$0")" && pwd)
rm -rf "$work"; mkdir -p "$work"; cd "$work"
export OMPI_ALLOW_RUN_AS_ROOT=1 OMPI_ALLOW_RUN_AS_ROOT_CONFIRM=1
sweep=$dir/tellin_sweep.yaml

mpirun -n 2 --oversubscribe "$colchem" sweep "$sweep" -o mpi.nc --table mpi.csv > mpi.log 2>&1 || { cat mpi.log; exit 1; }
"$colchem" sweep "$sweep" --variants 0:4 -o p0.nc --table p0.csv > p0.log 2>&1 || { cat p0.log; exit 1; }
# Without -o the piece's files are named after its range.
"$colchem" sweep "$sweep" --variants 4: > p1.log 2>&1 || { cat p1.log; exit 1; }
[ -f tellin_sweep.variants-4-9.nc ] && [ -f tellin_sweep.variants-4-9.csv ] || { ls; exit 1; }
grep -q "this piece: variants 4:9 (5 of 9)" p1.log || { cat p1.log; exit 1; }
/usr/bin/python3 - <<'PY'
import netCDF4
p = netCDF4.Dataset("p0.nc")
assert p.getncattr("colchem_sweep_piece") == "0:4"
assert list(p["variant_state"][:]) == [1] * 4 + [0] * 5, p["variant_state"][:]
assert p.getncattr("colchem_sweep_status").endswith("5 not run (piece 0:4)"), p.getncattr("colchem_sweep_status")
print("ok: piece 0:4 holds variants 0-3, the others 'not run'")
PY
"$colchem" sweep "$sweep" --merge p0.nc tellin_sweep.variants-4-9.nc -o merged.nc --table merged.csv > merge.log 2>&1 \
  || { cat merge.log; exit 1; }
grep -q "merging 2 pieces: all 9 variants finished" merge.log || { cat merge.log; exit 1; }
! grep -q "info variant [0-9]" merge.log || { echo "FAIL: the merge solved"; cat merge.log; exit 1; }
/usr/bin/python3 "$here/compare_sweep_files.py" mpi.nc merged.nc

expect() {  # expect CODE LOG PATTERN
  local code=0
  "${@:4}" > "$2" 2>&1 || code=$?
  [ "$code" -eq "$1" ] || { echo "FAIL: exit $code, expected $1: ${*:4}"; cat "$2"; exit 1; }
  grep -q -- "$3" "$2" || { echo "FAIL: '$3' not in $2"; cat "$2"; exit 1; }
}
expect 4 missing.log "p0.nc: '--merge': expected pieces that together finish all 9 variants, found no finished result for variants 4, 5, 6, 7, 8" \
  "$colchem" sweep "$sweep" --merge p0.nc -o bad.nc --table bad.csv
expect 4 twice.log "p0.nc: '--merge': expected pieces that each hold a variant at most once, found variant 0 also in p0.nc" \
  "$colchem" sweep "$sweep" --merge p0.nc p0.nc -o bad.nc --table bad.csv
"$colchem" sweep "$sweep" --set 'sweep.set=[solver.method=steady, grid.cells=40]' --variants 4:9 -o other.nc --table other.csv > other.log 2>&1 \
  || { cat other.log; exit 1; }
expect 3 other_def.log "other.nc: '--merge': expected a sweep file of the same sweep definition .* found another definition: variant 0: file has 'grid.cells=40', sweep has nothing" \
  "$colchem" sweep "$sweep" --merge p0.nc other.nc -o bad.nc --table bad.csv
[ ! -e bad.nc ] || { echo "FAIL: a refused merge wrote bad.nc"; exit 1; }
echo "ok: pieces merged equal one 2-rank mpirun; incomplete, doubled and foreign pieces refused"

# The job-array example's stages run by hand, as its header describes (no Slurm here): two
# array tasks, then the merge; the result is again the 2-rank file.
mkdir -p array/pieces; cd array
count=$("$colchem" sweep "$sweep" --dry-run 2>/dev/null | tail -1 | cut -d' ' -f1)
for i in 0 1; do
  COLCHEM=$colchem COLCHEM_SWEEP_STAGE=piece SLURM_ARRAY_TASK_ID=$i SLURM_ARRAY_TASK_COUNT=2 \
    COLCHEM_SWEEP_COUNT=$count "$here/../../scripts/slurm_sweep_array.sh" "$sweep" > task$i.log 2>&1 || { cat task$i.log; exit 1; }
done
COLCHEM=$colchem COLCHEM_SWEEP_STAGE=merge "$here/../../scripts/slurm_sweep_array.sh" "$sweep" > merge.log 2>&1 || { cat merge.log; exit 1; }
/usr/bin/python3 "$here/compare_sweep_files.py" ../mpi.nc tellin_sweep.nc
echo "ok: scripts/slurm_sweep_array.sh stages give the 2-rank file"
