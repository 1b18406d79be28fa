#!/usr/bin/env bash
# species.default.molecular_diffusion: false switches molecular diffusion off for every species.
# The closed-form column tests/cli/ensemble/linear_loss.yaml switches it off for its one species
# by binary_diffusion A = 0 (its profile is checked against the analytic solution in
# tests/analysis/test_resolution.cpp); the same column with the whole-run switch instead must
# give the same profile to round-off, and with the switch on a different one (molecular
# diffusion of SO in N2 changes it by about 2e-4 at the top; the window 1e-5 is common
# practice, no source).
# Usage: molecular_switch_test.sh COLCHEM SOURCE_DIR WORK_DIR
set -euo pipefail
colchem=$1; src=$2; work=$3
rm -rf "$work"; mkdir -p "$work"
cp "$src"/tests/cli/ensemble/linear_loss_mechanism.yaml "$src"/tests/cli/ensemble/linear_loss_observed.csv "$work"/
sed -e '/binary_diffusion: {A: 0 cm-1 s-1}/d' \
    -e 's/^species:$/species:\n  default: {molecular_diffusion: false}/' \
    "$src"/tests/cli/ensemble/linear_loss.yaml > "$work"/switch.yaml
grep -q "molecular_diffusion: false" "$work"/switch.yaml
! grep -q "binary_diffusion" "$work"/switch.yaml
"$colchem" --log-level warn run "$src"/tests/cli/ensemble/linear_loss.yaml -o "$work"/per_species.nc >/dev/null
"$colchem" --log-level warn run "$work"/switch.yaml -o "$work"/switch_off.nc >/dev/null
"$colchem" --log-level warn run "$work"/switch.yaml --set species.default.molecular_diffusion=true \
  -o "$work"/switch_on.nc >/dev/null
/usr/bin/python3 - "$work" <<'PY'
import sys
import netCDF4
import numpy as np
w = sys.argv[1]
x = {k: np.asarray(netCDF4.Dataset(f"{w}/{k}.nc")["mole_fraction"][:])
     for k in ("per_species", "switch_off", "switch_on")}
off = np.max(np.abs(x["switch_off"] - x["per_species"]) / x["per_species"])
on = np.max(np.abs(x["switch_on"] - x["per_species"]) / x["per_species"])
print(f"switch off vs per-species A = 0: {off:.2e} (window 1e-12); switch on: {on:.2e} (> 1e-5)")
sys.exit(0 if off <= 1e-12 and on > 1e-5 else 1)
PY
