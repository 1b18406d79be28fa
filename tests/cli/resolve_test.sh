#!/usr/bin/env bash
# colchem resolve end to end on the closed-form thin boundary layer
# (tests/analysis/data/boundary_layer.yaml; reference: the analytic steady state, second order):
#  - the uniform family 50/100/200 is flagged asymptotic with orders within 1.8-2.2;
#  - the NetCDF opens in python3-netCDF4 with the documented variables and ranks;
#  - --equidistribute writes a grid: section that a scenario takes back unchanged
#    (`colchem check` on the scenario with that section reports the same 50 cells).
set -eu
colchem=$1; root=$2; work=$3
mkdir -p "$work"; cd "$work"
cfg=$root/tests/analysis/data/boundary_layer.yaml
"$colchem" --log-level warn resolve "$cfg" --cells 50 -o uniform.nc > uniform.log
cat uniform.log
grep -Eq "^SO +[0-9.e-]+ +[0-9.e-]+ +(1\.(8|9)[0-9]*|2\.(0|1)[0-9]*) +(1\.(8|9)[0-9]*|2\.(0|1)[0-9]*) .* asymptotic$" uniform.log
/usr/bin/python3 - <<'PY'
import netCDF4, numpy as np
ds = netCDF4.Dataset("uniform.nc")
assert list(ds["level_cells"][:]) == [50, 100, 200]
assert ds["log10_mole_fraction"].dimensions == ("level", "species", "altitude")
p = float(ds["observed_order_rms"][0, 0])
assert 1.8 < p < 2.2, p  # analytic: second-order scheme
assert int(ds["resolution_status"][0]) == 0
assert ds.getncattr("refinement_ratio") == 2
print("ok: order", p)
PY
"$colchem" --log-level warn resolve "$cfg" --cells 50 --equidistribute 50 -o adapted.nc \
  --grid-out adapted.grid.yaml > adapted.log
grep -q "^grid:" adapted.grid.yaml
# The scenario with its grid section replaced by the written one (its mechanism copied along).
sed '/^grid:/,/^$/d' "$cfg" > adapted_scenario.yaml
cp "$(dirname "$cfg")/boundary_layer_mechanism.yaml" .
cat adapted.grid.yaml >> adapted_scenario.yaml
"$colchem" check adapted_scenario.yaml > check.log
grep -Eq "grid +50 cells" check.log || { cat check.log; exit 1; }
echo "ok: adapted grid reloaded"
