#!/usr/bin/env bash
# Sweep tools (issue 17): the dry run lists the variants and their count without solving;
# a parameter of a switched-off module does not multiply the variants (and indeed has no
# effect: two runs of that module set with different values give the same file); every
# variant's overrides are stored in the sweep file and 'run --from-sweep FILE --variant N'
# gives the variant's state (to 1e-10 relative: both converged by Newton's method to the
# coupled tolerance, the sweep's from a warm start); budget and compare refuse a sweep file
# (exit 2) saying how to get a run file of a variant.
set -eu
colchem=$1; dir=$2; cfg=$3; work=$4
rm -rf "$work"; mkdir -p "$work"; cd "$work"

"$colchem" sweep "$dir/tellin_sweep.yaml" --dry-run -o dry.nc --table dry.csv > dry.out 2> dry.log || { cat dry.out dry.log; exit 1; }
[ ! -e dry.nc ] && [ ! -e dry.csv ] || { echo "FAIL: the dry run wrote files"; exit 1; }
! grep -q "variant 1/9" dry.log || { echo "FAIL: the dry run solved"; exit 1; }
grep -q "merged 7 duplicate variants of 16 .*base: sulfate_condensation_scale, base: sulfate_removal_scale" dry.log \
  || { cat dry.log; exit 1; }
tail -1 dry.out | grep -qx "9 variants" || { cat dry.out; exit 1; }

"$colchem" sweep "$dir/tellin_sweep.yaml" -o sweep.nc --table sweep.csv > sweep.log 2>&1 || { cat sweep.log; exit 1; }
/usr/bin/python3 - <<'PY'
import netCDF4
# The 2 module sets x 4 x 2 values of the sweep file, by hand: base once, sulfur 8 times.
lines = [l.rstrip("\n").split("\t") for l in open("dry.out")][2:-1]
assert len(lines) == 9, lines
assert [int(l[0]) for l in lines] == list(range(9))
assert lines[0][1] == "base" and lines[0][2] == "-", lines[0]
pairs = {l[2] for l in lines[1:]}
want = {f"sulfate_condensation_scale={c} sulfate_removal_scale={r}"
        for c in ("0.5", "1", "2", "4") for r in ("0.5", "2")}  # six significant digits
assert any("sulfate_condensation_scale=1.9999999999999998" in l[3] for l in lines), lines  # exact
assert pairs == want, pairs ^ want
nc = netCDF4.Dataset("sweep.nc")
stored = [s.split("\n") for s in nc["variant_overrides"][:]]
assert [" | ".join(s) for s in stored] == [l[3] for l in lines], (stored, lines)
assert stored[0] == ["solver.method=steady", "chemistry.modules=[base]"], stored[0]
print("ok: dry run lists 9 variants; the sweep file stores the same overrides")
PY

# The merged combinations are the same model: module set base with the two parameters at
# either end of their ranges gives identical files (every variable).
for v in 0.5 4; do
  "$colchem" run "$cfg/tellin.yaml" --set solver.method=steady --set 'chemistry.modules=[base]' \
    --set chemistry.parameters.sulfate_condensation_scale=$v --set chemistry.parameters.sulfate_removal_scale=$v \
    -o base_$v.nc > base_$v.log 2>&1 || { cat base_$v.log; exit 1; }
done
/usr/bin/python3 - <<'PY'
import netCDF4, numpy as np
a, b = netCDF4.Dataset("base_0.5.nc"), netCDF4.Dataset("base_4.nc")
for name in ("mole_fraction", "number_density"):
    assert np.array_equal(a[name][:], b[name][:]), name
print("ok: with module sulfur off the swept parameters change nothing")
PY

# One variant from the sweep file: the same state as in the sweep.
"$colchem" run --from-sweep sweep.nc --variant 5 -o v5.nc > v5.log 2>&1 || { cat v5.log; exit 1; }
/usr/bin/python3 - <<'PY'
import netCDF4, numpy as np
s, r = netCDF4.Dataset("sweep.nc"), netCDF4.Dataset("v5.nc")
assert list(s["species_name"][:]) == list(r["species_name"][:])
x, y = np.asarray(s["mole_fraction"][5]), np.asarray(r["mole_fraction"][:])
rel = np.max(np.abs(x - y) / np.abs(x))
assert rel <= 1e-10, rel
ov = r["provenance_overrides"].getValue().split("\n")
assert "chemistry.parameters.sulfate_condensation_scale=1.9999999999999998" in ov, ov
print(f"ok: run --from-sweep variant 5 matches the sweep to {rel:.1e} relative")
PY
"$colchem" budget v5.nc -s SO2 > budget.out 2>&1 || { cat budget.out; exit 1; }
for cmd in budget compare; do
  code=0
  if [ $cmd = budget ]; then "$colchem" budget sweep.nc -s SO2 > $cmd.log 2>&1 || code=$?
  else "$colchem" compare sweep.nc "$dir/tellin_so2_invented.csv" --no-write > $cmd.log 2>&1 || code=$?; fi
  [ "$code" -eq 2 ] || { echo "FAIL: $cmd of a sweep file exited $code"; cat $cmd.log; exit 1; }
  grep -q "sweep.nc is a sweep file (9 variants), not a run file; write a run file of one variant with 'colchem run --from-sweep sweep.nc --variant N -o variant.nc'" $cmd.log \
    || { cat $cmd.log; exit 1; }
done
echo "ok: budget and compare say a sweep file is one and how to get a run file"
