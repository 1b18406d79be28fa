#!/usr/bin/env bash
# `colchem sensitivity` on the shipped worlds: adjoint gradients against central finite
# differences of the full nonlinear steady solve (--check: ln k +- 1e-3, tight steady
# tolerance; 1e-4 relative, common practice, no source) for the 20 (Tellin's first objective),
# 5 (Pyrene's chi-square and most other cases) or 3 (the Pyrene column) most influential rate
# constants plus the most influential named parameter, boundary value and the whole eddy
# profile, so that every kind of parameter is checked on every objective (each check is two
# warm steady solves at a scaled residual of 1e-12, about 1 s on Pyrene's 54 cells: the
# Pyrene cases check fewer rate constants to keep the default suite short), for three kinds
# of objective: Pyrene (54 cells, its shipped grid) with the
# chi-square against the invented SO2 observation and the column of SO2, Tellin (50 cells,
# steady) with the column of sulfate aerosol, the SO2 mole fraction at 25 km and the
# column rate of O3 photolysis. Then the NetCDF file: the shares sum to 1 and each
# reaction's profile dG/d ln k(z) sums to its total (definitions, README "Sensitivities").
# The fourth argument names one case (CTest runs each as its own test, in parallel); without
# it every case runs.
set -eu
colchem=$1; root=$2; work=$3; only=${4:-}
mkdir -p "$work"; cd "$work"
obs=$root/profiles/observed/pyrene_so2_invented.csv
run() {  # name, then the arguments
  local name=$1; shift
  [ -z "$only" ] || [ "$name" = "$only" ] || return 0
  if ! "$colchem" --log-level warn sensitivity "$@" -o "$name.nc" > "$name.log" 2>&1; then
    cat "$name.log"; echo "FAIL: $name"; exit 1
  fi
  grep -A40 "finite-difference check" "$name.log"
  grep -q "worst relative difference" "$name.log" || { cat "$name.log"; exit 1; }
}
run pyrene_chi2 "$root/configs/pyrene_full.yaml" --objective chi2 --observations "$obs" --check 5
# Two bands of K checked directly as well (log-sensitivities 0.22 and -0.11 of the SO2 column).
run pyrene_column "$root/configs/pyrene_full.yaml" --objective column --species SO2 --check 3 \
  --check-parameter "K band 58-68 km" --check-parameter "K band 69-79 km"
# Named parameters that act on the photolysis data or on a photolysis reaction's scale
# (the overtone and UV modules switched on), on the H2SO4 vapour at 105 km, above the haze,
# where photolysis is its main loss (log-sensitivities -0.34 for h2so4_uv_scale and -0.0093
# for overtone_scale), step 3e-2. The H2SO4 column was the objective before the CO + O + M
# sign fix; since, overtone_scale's log-sensitivity on it is 3e-5, below what the full
# solve resolves: its central differences at steps 3e-2, 0.1, 0.3 scatter around the
# adjoint by +7.9e-4, -3.6e-4, +5.8e-5 (noise ~1/h), so that check could not tell a wrong
# adjoint from a right one.
run pyrene_photo_parameters "$root/configs/pyrene_full.yaml" \
  --set "chemistry.modules=[base, h2so4_overtone, h2so4_uv]" --objective mole_fraction \
  --species H2SO4 --altitude 105 \
  --check 0 --check-parameter overtone_scale --check-parameter h2so4_uv_scale --check-step 3e-2
run tellin_aerosol "$root/configs/tellin.yaml" --set solver.method=steady \
  --objective column --species "H2SO4(aer)" --check 20
# Two bands of the eddy profile checked directly (not only through their sum, the whole
# profile): SO2 at 25 km depends on K below it (log-sensitivities 2.8 and 1.3).
run tellin_so2 "$root/configs/tellin.yaml" --set solver.method=steady \
  --objective mole_fraction --species SO2 --altitude 25 --check 5 \
  --check-parameter "K band 10-19 km" --check-parameter "K band 20-29 km"
run tellin_rate "$root/configs/tellin.yaml" --set solver.method=steady \
  --objective rate --reaction "O3 + hv -> O2 + O(1D)" --check 5
/usr/bin/python3 - "$only" <<'PY'
import sys
import netCDF4
import numpy as np
names = ("pyrene_chi2", "pyrene_column", "pyrene_photo_parameters", "tellin_aerosol", "tellin_so2", "tellin_rate")
if sys.argv[1]:
    assert sys.argv[1] in names, sys.argv[1]
    names = (sys.argv[1],)
for name in names:
    ds = netCDF4.Dataset(name + ".nc")
    assert ds.getncattr("Conventions").startswith("CF-"), name
    share = np.asarray(ds["share"][:])
    assert abs(share.sum() - 1.0) < 1e-12, (name, share.sum())
    prof = np.asarray(ds["sensitivity_profile"][:])
    tot = np.asarray(ds["dG_dlnk"][:])
    assert np.allclose(prof.sum(axis=1), tot, rtol=1e-10, atol=1e-12 * np.abs(tot).max()), name
    G = float(ds.getncattr("colchem_objective_value"))
    assert np.allclose(np.asarray(ds["log_sensitivity"][:]) * G, tot, rtol=1e-12), name
    print(f"ok: {name}: G = {G:.6g}, {len(tot)} reactions, file consistent")
PY
