#!/usr/bin/env bash
# colchem resolve end to end on the closed-form thin boundary layer
# (tests/analysis/data/boundary_layer.yaml; reference: the analytic steady state, second order):
#  - the uniform family 50/100/200 is flagged asymptotic with orders within 1.8-2.2;
#  - the boundary flux of SO converges at order ~2 to the closed-form flux
#    K n0 f_b |r-|, r- = (1/H - sqrt(1/H^2 + 4k/K))/2 (analytic, the same closed form);
#  - with K = 1 cm2 s-1 the layer (sqrt(K/k) = 1 m) is thinner than every cell: the flux
#    doubles with each refinement (2 K n0 f_b / dz, analytic) and is flagged as growing;
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
# Closed-form bottom flux (analytic): isothermal 250 K, 1 bar, N2 (28 g/mol), g = 9 m s-2.
kB, amu = 1.380649e-23, 1.66053907e-27
n0 = 1e5 / (kB * 250.0) * 1e-6                        # cm-3 at the bottom edge
H = kB * 250.0 / (28.0 * amu * 9.0) * 100.0           # cm
K, k, fb = 1e6, 1e-4, 1e-6
rm = (1 / H - np.sqrt(1 / H**2 + 4 * k / K)) / 2
exact = K * n0 * fb * abs(rm)
names = [str(x) for x in ds["boundary_flux_species"][:]]
ends = [str(x) for x in ds["boundary_flux_end"][:]]
assert names == ["SO"] and ends == ["bottom"], (names, ends)
flux = ds["boundary_flux_value"][:, 0]
order = float(ds["boundary_flux_order"][0])
extrapolated = flux[-1] - float(ds["boundary_flux_error"][0])
assert 1.5 < order < 2.3, order
assert abs(flux[-1] / exact - 1) < 0.015, (flux[-1], exact)      # finest grid: -0.7 %
assert abs(extrapolated / exact - 1) < 0.003, (extrapolated, exact)  # Richardson: 0.1 %
assert int(ds["boundary_flux_grows"][0]) == 0
print("ok: boundary flux", flux[-1], "extrapolated", extrapolated, "closed form", exact)
PY
"$colchem" --log-level warn resolve "$cfg" --cells 50 --set "atmosphere.eddy_diffusion.constant=1 cm2 s-1" \
  -o thin.nc > thin.log
cat thin.log
grep -q "^SO  *bottom .*grows with refinement" thin.log
/usr/bin/python3 - <<'PY'
import netCDF4
ds = netCDF4.Dataset("thin.nc")
flux = ds["boundary_flux_value"][:, 0]
assert int(ds["boundary_flux_grows"][0]) == 1
assert abs(flux[1] / flux[0] - 2) < 1e-3 and abs(flux[2] / flux[1] - 2) < 1e-3, flux  # 1/dz
assert abs(float(ds["boundary_flux_order"][0]) + 1) < 1e-3
print("ok: unresolved layer flagged", flux)
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
