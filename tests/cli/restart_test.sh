#!/usr/bin/env bash
# `colchem run --restart` from a checkpoint continues the run exactly (tests/solve/restart:
# an invented six-cell column with an SO2 injection at 0.5 day):
#  - a transient whose last checkpoint (every 1000 steps) lies after the injection, restarted
#    from it, ends at the state of the uninterrupted run within the rtol of the chemistry's
#    cell integrator (1e-4; the chemistry's first sub-step is the only thing not restored)
#    and keeps the snapshots taken before the checkpoint;
#  - a steady solve restarted from its checkpoint takes the checkpoint's pseudo-time step
#    first and converges to the uninterrupted state within step_tolerance (1e-6);
#  - a run file that is not a checkpoint still only gives an initial state (t = 0).
# Reference: the uninterrupted run (README "Solvers" for the two tolerances).
set -eu
colchem=$1; root=$2; work=$3
mkdir -p "$work"; cd "$work"
cfg=$root/tests/solve/restart/restart_column.yaml
rm -f ./*.nc
"$colchem" run "$cfg" -o whole.nc > whole.log 2>&1 || { cat whole.log; exit 1; }
"$colchem" run "$cfg" --set solver.checkpoint_every=1000 -o part.nc > part.log 2>&1 || { cat part.log; exit 1; }
"$colchem" run "$cfg" --restart part.checkpoint.nc -o cont.nc > cont.log 2>&1 || { cat cont.log; exit 1; }
grep -q "continuing the transient run of part.checkpoint.nc" cont.log || { cat cont.log; exit 1; }
"$colchem" run "$cfg" --restart whole.nc -o fresh.nc > fresh.log 2>&1 || { cat fresh.log; exit 1; }
grep -q "not a checkpoint" fresh.log || { cat fresh.log; exit 1; }
"$colchem" run "$cfg" --set solver.method=steady -o steady.nc > steady.log 2>&1 || { cat steady.log; exit 1; }
"$colchem" run "$cfg" --set solver.method=steady --set solver.checkpoint_every=25 -o spart.nc > spart.log 2>&1 || { cat spart.log; exit 1; }
"$colchem" run "$cfg" --set solver.method=steady --restart spart.checkpoint.nc -o scont.nc > scont.log 2>&1 || { cat scont.log; exit 1; }
/usr/bin/python3 - <<'PY'
import netCDF4, numpy as np
def state(f):
    d = netCDF4.Dataset(f)
    return d, np.asarray(d["number_density"][:])
def rel(a, b, a_s=1.0):
    return float(np.max(np.abs(a - b) / (np.abs(a) + a_s)))
ck = netCDF4.Dataset("part.checkpoint.nc")
t_ck = ck.getncattr("colchem_model_time_s")
assert ck.getncattr("colchem_solver_status") == "checkpoint"
assert 0.5 * 86400 < t_ck < 2 * 86400, t_ck       # after the injection, before the end
w, xw = state("whole.nc"); c, xc = state("cont.nc")
assert c.getncattr("colchem_model_time_s") == 2 * 86400
d = rel(xw, xc)
assert d < 1e-4, d
assert np.allclose(c["snapshot"][:], w["snapshot"][:])
snap_w, snap_c = np.asarray(w["snapshot_number_density"][:]), np.asarray(c["snapshot_number_density"][:])
assert np.array_equal(snap_w[0], snap_c[0])        # taken before the checkpoint: carried over
assert rel(snap_w[1:], snap_c[1:]) < 1e-4
assert c["history_time"][0] > t_ck                   # the first step starts at the checkpoint
f, xf = state("fresh.nc")
assert rel(xw, xf) > 1e-2                          # from t = 0 with a second injection: differs
print(f"ok: transient continued from t = {t_ck:.0f} s, end state within {d:.1e} of the whole run")
s, xs = state("steady.nc"); sc, xsc = state("scont.nc")
sck = netCDF4.Dataset("spart.checkpoint.nc")
assert sc.getncattr("colchem_solver_status") == "converged"
assert sc["history_step"][0] == sck.getncattr("colchem_step_s"), (sc["history_step"][0], sck.getncattr("colchem_step_s"))
ds = rel(xs, xsc)
assert ds < 1e-6, ds
print(f"ok: steady continued from iteration {int(sck.getncattr('colchem_iterations'))}, state within {ds:.1e}")
PY
