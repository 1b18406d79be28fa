#!/usr/bin/env bash
# A sweep stopped by SIGTERM or SIGINT (issue 16): on one rank and under mpirun (the ranks
# signalled, as a batch system does) it exits 7, and its files record the variants it did
# not finish as "interrupted" (never "failed") and the sweep as interrupted, never complete.
# mpirun itself signalled: Open MPI's own exit code (1), the files as above.
set -eu
colchem=$1; dir=$2; work=$3
mkdir -p "$work"; cd "$work"
export OMPI_ALLOW_RUN_AS_ROOT=1 OMPI_ALLOW_RUN_AS_ROOT_CONFIRM=1
# 240 cells make each variant take about a second, so that the signal (forwarded by mpirun
# in the last case) arrives while variants remain: at the shipped grid the warm variants
# take 0.1 s and the sweep could finish before it.
slow=(--set 'sweep.set=[solver.method=steady, grid.cells=240]')

# wait_for LOG PATTERN: until the log shows PATTERN (at most 600 s: sanitizer builds under load
# take over a minute for the first variant or step).
wait_for() {
  for _ in $(seq 6000); do grep -q "$2" "$1" 2>/dev/null && return 0; sleep 0.1; done
  echo "FAIL: '$2' never appeared in $1"; cat "$1"; return 1
}
# check NAME WANT_CODE GOT_CODE: the files of run NAME say interrupted.
check() {
  local name=$1 want=$2 got=$3
  [ "$got" -eq "$want" ] || { echo "FAIL: $name exited $got, expected $want"; cat "$name.log"; exit 1; }
  grep -q "interrupted" "$name.csv" || { echo "FAIL: $name.csv has no interrupted variant"; exit 1; }
  ! ls ./*.tmp-* 2>/dev/null || { echo "FAIL: temporary files left"; exit 1; }
  /usr/bin/python3 - "$name" <<'PY'
import csv, sys
import netCDF4
name = sys.argv[1]
rows = list(csv.DictReader(l for l in open(name + ".csv") if not l.startswith("#")))
status = [r["status"] for r in rows]
assert len(rows) == 9, len(rows)
assert not any(s not in ("converged",) and not s.startswith("interrupted") for s in status), status
n_int = sum(s.startswith("interrupted") for s in status)
assert n_int >= 1, status
nc = netCDF4.Dataset(name + ".nc")
text = nc.getncattr("colchem_sweep_status")
assert text.startswith("interrupted: "), text
assert f"{n_int} interrupted" in text and "0 failed" in text, text
flags = nc["variant_converged"][:]
assert int(flags.sum()) == 9 - n_int, (flags, n_int)
print(f"ok: {name}: {n_int} of 9 variants interrupted, files say '{text}'")
PY
}

# One rank: SIGTERM and SIGINT once the first variant has finished (eight remain, about a
# second each), and SIGTERM as the sweep starts, while the base state is solved (at 240 cells
# it takes a few seconds, the signal comes at once): the files still record every variant
# not finished as interrupted, and the exit code is 7 (should the base finish first, the
# signal stops the variants instead: the same assertions hold). The three sweeps are
# independent and run side by side (CTest gives this test two processors).
for name in one_TERM one_INT one_base; do
  "$colchem" sweep "$dir/tellin_sweep.yaml" "${slow[@]}" -o $name.nc --table $name.csv > $name.log 2>&1 &
  eval "pid_$name=$!"
done
wait_for one_base.log "variants on 1 rank"
kill -TERM "$pid_one_base"
for sig in TERM INT; do
  name=one_$sig
  pid=$(eval echo "\$pid_$name")
  wait_for $name.log "variant 1/9"
  kill -$sig $pid
done
# All three are waited for before any is checked: `check` asserts that no temporary file is
# left in this folder, and a sweep still writing its files has one.
for name in one_TERM one_INT one_base; do
  pid=$(eval echo "\$pid_$name")
  code=0; wait $pid || code=$?
  eval "code_$name=$code"
done
for name in one_TERM one_INT one_base; do
  check $name 7 "$(eval echo "\$code_$name")"
  grep -q "sweep interrupted (signal" $name.log
done

# Two ranks under mpirun, the ranks signalled.
name=mpi_ranks
mpirun -n 2 --oversubscribe "$colchem" sweep "$dir/tellin_sweep.yaml" "${slow[@]}" -o $name.nc --table $name.csv > $name.log 2>&1 &
pid=$!
wait_for $name.log "variant [1-9]/9"
kill -TERM $(pgrep -P $pid)
code=0; wait $pid || code=$?
check $name 7 $code

# mpirun itself signalled: its own exit code is Open MPI's. Open MPI 4 does not forward the
# signal at once: it sends the ranks SIGCONT, waits odls_base_sigkill_timeout seconds (default
# 1), sends SIGTERM, waits as long again, then SIGKILL (measured here: with the timeout at 120 s
# the ranks saw SIGTERM 120 s and mpirun exited 240 s after it was signalled). A rank stops at
# the end of its Newton iteration and then writes, so each stage gets ten of this build's
# Newton iterations on 400 cells (measured from the first variant of the first case, scaled by
# the cells, so that a sanitized build, which takes over 10 s for one on a loaded machine,
# gets its own; at least 6 s, common practice, no source: a margin for load that rises after
# the measurement, about 25 iterations of a normal build). mpirun is signalled as the sweep
# starts, on 400 cells, while every rank solves the base state the variants start from
# (grid-sequenced; about 9 s in a normal build), so SIGTERM arrives while every rank has work
# left (at 240 cells the whole sweep took 22 s and SIGTERM sometimes caught only the last
# variants).
grace=$(/usr/bin/python3 - <<'PY'
import re
m = re.search(r"on rank 0: converged \((\d+) iterations, ([0-9.]+) s\)", open("one_TERM.log").read())
per_iteration = float(m.group(2)) / int(m.group(1)) * 400 / 240 if m else 10.0
print(max(6, round(10 * per_iteration)))
PY
)
echo "mpirun kill stages of $grace s"
name=mpi_mpirun
mpirun -n 2 --oversubscribe --mca odls_base_sigkill_timeout "$grace" \
  "$colchem" sweep "$dir/tellin_sweep.yaml" --set 'sweep.set=[solver.method=steady, grid.cells=400]' -o $name.nc --table $name.csv > $name.log 2>&1 &
pid=$!
wait_for $name.log "9 variants on 2 ranks"
kill -TERM $pid
code=0; wait $pid || code=$?
[ "$code" -ne 0 ] || { echo "FAIL: mpirun exited 0 after SIGTERM"; exit 1; }
check $name $code $code
echo "ok: interrupted sweeps exit 7 and say so"
