#!/usr/bin/env bash
# Resuming a sweep (issue 17): a sweep stopped by SIGTERM and resumed with --resume gives the
# file of an uninterrupted sweep (every variable; scores and mole fractions to 1e-10
# relative, compare_sweep_files.py); the resume runs only the unfinished variants; a failed
# variant stays failed unless --retry-failed; a sweep file of another definition is refused
# (exit 3) naming what differs.
set -eu
colchem=$1; dir=$2; work=$3
here=$(cd "$(dirname "$0")" && pwd)
rm -rf "$work"; mkdir -p "$work"; cd "$work"
# 120 cells: the cold first variant takes several seconds and the warm ones about one, so
# SIGTERM after the second variant arrives while seven remain.
mid=(--set 'sweep.set=[solver.method=steady, grid.cells=120]')
wait_for() {
  for _ in $(seq 6000); do grep -q "$2" "$1" 2>/dev/null && return 0; sleep 0.1; done
  echo "FAIL: '$2' never appeared in $1"; cat "$1"; return 1
}

"$colchem" sweep "$dir/tellin_sweep.yaml" "${mid[@]}" -o ref.nc --table ref.csv > ref.log 2>&1 || { cat ref.log; exit 1; }

"$colchem" sweep "$dir/tellin_sweep.yaml" "${mid[@]}" -o cut.nc --table cut.csv > cut.log 2>&1 &
pid=$!
wait_for cut.log "variant 2/9"
kill -TERM $pid
code=0; wait $pid || code=$?
[ "$code" -eq 7 ] || { echo "FAIL: interrupted sweep exited $code"; cat cut.log; exit 1; }
grep -q "continue with --resume cut.nc" cut.log || { cat cut.log; exit 1; }

"$colchem" sweep "$dir/tellin_sweep.yaml" "${mid[@]}" --resume cut.nc -o resumed.nc --table resumed.csv > resumed.log 2>&1 \
  || { cat resumed.log; exit 1; }
/usr/bin/python3 - <<'PY'
import re
import netCDF4
cut = netCDF4.Dataset("cut.nc")
state = list(cut["variant_state"][:])
finished = sum(s == 1 for s in state)
assert 2 <= finished < 9 and all(s in (1, 3) for s in state), state
log = open("resumed.log").read()
m = re.search(r"resuming: (\d+) finished variants? kept from cut.nc, (\d+) to run", log)
assert m and int(m.group(1)) == finished and int(m.group(2)) == 9 - finished, (m and m.groups(), state)
ran = re.findall(r"info variant (\d+)/9", log)
want = [str(i + 1) for i, s in enumerate(state) if s != 1]
assert sorted(ran, key=int) == want, (ran, want)
print(f"ok: resume kept {finished} finished variants and ran {ran}")
PY
/usr/bin/python3 "$here/compare_sweep_files.py" ref.nc resumed.nc

# Another definition: refused, naming what differs.
code=0
"$colchem" sweep "$dir/tellin_sweep.yaml" --resume cut.nc -o other.nc --table other.csv > other.log 2>&1 || code=$?
[ "$code" -eq 3 ] || { echo "FAIL: resume of another definition exited $code"; cat other.log; exit 1; }
grep -q "cut.nc: '--resume': expected a sweep file of the same sweep definition" other.log || { cat other.log; exit 1; }
grep -q "found another definition: variant 0: file has 'grid.cells=120', sweep has nothing" other.log \
  || { cat other.log; exit 1; }
[ ! -e other.nc ] || { echo "FAIL: other.nc written"; exit 1; }
code=0
"$colchem" sweep "$dir/tellin_sweep.yaml" "${mid[@]}" --set sweep.rank_by=chi2_linear --resume cut.nc -o other.nc --table other.csv > other2.log 2>&1 || code=$?
[ "$code" -eq 3 ] || { echo "FAIL: resume with another rank_by exited $code"; cat other2.log; exit 1; }
grep -q "found another definition: 'rank_by' differs (file chi2_log, sweep chi2_linear)" other2.log || { cat other2.log; exit 1; }
echo "ok: a sweep file of another definition refused, naming the overrides or the setting that differ"

# Failed variants stay failed on resume, and run again with --retry-failed.
"$colchem" sweep "$dir/tellin_sweep_failing.yaml" -o failing.nc --table failing.csv > failing.log 2>&1 || { cat failing.log; exit 1; }
"$colchem" sweep "$dir/tellin_sweep_failing.yaml" --resume failing.nc -o again.nc --table again.csv > again.log 2>&1 || { cat again.log; exit 1; }
grep -q "resuming: 3 finished variants kept from failing.nc, 0 to run" again.log || { cat again.log; exit 1; }
"$colchem" sweep "$dir/tellin_sweep_failing.yaml" --resume failing.nc --retry-failed -o retry.nc --table retry.csv > retry.log 2>&1 || { cat retry.log; exit 1; }
grep -q "resuming: 2 finished variants kept from failing.nc, 1 to run" retry.log || { cat retry.log; exit 1; }
grep -q "variant 2/3 .*FAILED" retry.log || { cat retry.log; exit 1; }
/usr/bin/python3 "$here/compare_sweep_files.py" failing.nc again.nc
/usr/bin/python3 "$here/compare_sweep_files.py" failing.nc retry.nc
echo "ok: failed variants kept unless --retry-failed"
