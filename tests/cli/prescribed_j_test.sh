#!/usr/bin/env bash
# photolysis.prescribed on configs/frigid_thin.yaml (a steady column, direct beam):
#  - the computed J profiles of SO2_SO_O and CO2_CO_O, taken from a first run's file and
#    prescribed as tables at the cell centres, give the same steady state (the converged
#    state of the first run is a fixed point of the second system: analytic), within the
#    solver's tolerance (window 1e-6 relative; common practice, no source; measured 1.2e-12)
#    for every entry above 1e-15 mole fraction. The chlorine species, which have no source
#    in this scenario, sit near 1e-19 with a family total set by the path of the solve, not
#    by J (measured: every one 1.4 % apart in both runs), and are left out;
#  - a channel held at a value shows exactly that value in the run file's J output;
#  - progress lines of the steady solve show the iteration ceiling (it k/400);
#  - `compare` warns about an unknown observation column, naming the file, the column and
#    the known columns (observations invented).
# Usage: prescribed_j_test.sh COLCHEM SOURCE_DIR WORK_DIR
set -euo pipefail
colchem=$1; src=$2; work=$3
rm -rf "$work"; mkdir -p "$work"
"$colchem" --log-level warn run "$src"/configs/frigid_thin.yaml -o "$work"/computed.nc >/dev/null
/usr/bin/python3 - "$work" <<'PY'
import sys
import netCDF4
import numpy as np
w = sys.argv[1]
d = netCDF4.Dataset(f"{w}/computed.nc")
z = np.asarray(d["altitude"][:])
assert d["altitude"].units == "km", d["altitude"].units
for ch in ("SO2_SO_O", "CO2_CO_O"):
    J = np.asarray(d["J_" + ch][:])
    with open(f"{w}/{ch}.csv", "w") as f:
        f.write("# J computed by colchem itself (frigid_thin.yaml), as a prescribed profile\n")
        f.write("altitude [km], J [s-1]\n")
        for a, b in zip(z, J):
            f.write(f"{a!r}, {b!r}\n")
PY
prescribed="photolysis.prescribed=[{channel: SO2_SO_O, table: $work/SO2_SO_O.csv}, {channel: CO2_CO_O, table: $work/CO2_CO_O.csv}]"
"$colchem" run "$src"/configs/frigid_thin.yaml --set "$prescribed" --progress-every 0 \
  -o "$work"/prescribed.nc >"$work"/prescribed.log 2>&1 || { cat "$work"/prescribed.log; exit 1; }
grep -Eq "steady it [0-9]+/400 " "$work"/prescribed.log || { echo "no progress line 'steady it k/400'"; exit 1; }
printf '# invented\naltitude [km], species, value [ppm], uncertainty [ppm], upper_limit, instrument\n40, SO2, 0.1, 0.05, 0, A\n' \
  > "$work"/obs_extra_column.csv
"$colchem" compare "$work"/computed.nc "$work"/obs_extra_column.csv -o "$work"/score.nc \
  >"$work"/compare.log 2>&1 || { cat "$work"/compare.log; exit 1; }
grep -q "obs_extra_column.csv: unknown column 'instrument' is ignored; known columns: altitude, species, value, uncertainty, upper_limit, altitude_uncertainty, kernel" \
  "$work"/compare.log || { cat "$work"/compare.log; echo "no unknown-column warning"; exit 1; }
"$colchem" --log-level warn run "$src"/configs/frigid_thin.yaml \
  --set "photolysis.prescribed=[{channel: SO2_SO_O, value: 3.25e-6 s-1}]" -o "$work"/held.nc >/dev/null
/usr/bin/python3 - "$work" <<'PY'
import sys
import netCDF4
import numpy as np
w = sys.argv[1]
x = {k: np.asarray(netCDF4.Dataset(f"{w}/{k}.nc")["mole_fraction"][:])
     for k in ("computed", "prescribed")}
mask = x["computed"] > 1e-15
dev = np.max(np.abs(x["prescribed"] - x["computed"])[mask] / x["computed"][mask])
held = np.asarray(netCDF4.Dataset(f"{w}/held.nc")["J_SO2_SO_O"][:])
print(f"prescribed = computed J: max relative state difference {dev:.2e} (window 1e-6); "
      f"held J: {held.min()!r} .. {held.max()!r} (expected 3.25e-06 exactly)")
ok = dev <= 1e-6 and np.all(held == 3.25e-6)
sys.exit(0 if ok else 1)
PY
