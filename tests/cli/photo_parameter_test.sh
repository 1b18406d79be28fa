#!/usr/bin/env bash
# A named parameter on photolysis data, end to end on both Pyrene scenarios (pyrene_full.yaml
# and the demo's pyrene_extended.yaml, each with its own mechanism and photolysis data):
#  - `colchem photo --set chemistry.parameters.overtone_threshold_kcal=40` gives the
#    H2SO4_OVERTONE J of a copy of the data whose threshold reads `40 kcal/mol` (the
#    parameter removed from the mechanism), within round-off (analytic: the same numbers);
#  - and a J different from the default 35 kcal/mol (the threshold moves across the v = 4
#    band at 742 nm: the J must fall by more than a factor 2; analytic, band positions in
#    configs/photolysis/pyrene_photo.yaml).
set -eu
colchem=$1; root=$2; work=$3
rm -rf "$work"; mkdir -p "$work"; cd "$work"
cp -r "$root/profiles" .
check() {  # SCENARIO MECHANISM PHOTOLYSIS_DATA
  scen=$1; mech=$2; data=$3
  rm -rf configs; cp -r "$root/configs" .
  "$colchem" photo "$root/configs/$scen" -o default.nc > default.log 2>&1 || { cat default.log; exit 1; }
  "$colchem" photo "$root/configs/$scen" -o set40.nc \
    --set chemistry.parameters.overtone_threshold_kcal=40 > set40.log 2>&1 || { cat set40.log; exit 1; }
  # The edited copy: the threshold written as 40 kcal/mol, the parameter gone.
  sed -i 's|threshold: {parameter: overtone_threshold_kcal, unit: kcal/mol}|threshold: 40 kcal/mol|' \
    "configs/photolysis/$data"
  grep -q "threshold: 40 kcal/mol" "configs/photolysis/$data"
  sed -i '/- name: overtone_threshold_kcal/,/water-catalysed/d' "configs/mechanisms/$mech"
  sed -i '/overtone_threshold_kcal:/d' "configs/$scen"
  ! grep -q overtone_threshold_kcal "configs/mechanisms/$mech" "configs/$scen"
  "$colchem" photo "configs/$scen" -o edited.nc > edited.log 2>&1 || { cat edited.log; exit 1; }
  SCEN=$scen /usr/bin/python3 -c '
import os
import netCDF4, numpy as np
scen = os.environ["SCEN"]
J = {k: np.array(netCDF4.Dataset(k + ".nc")["J_H2SO4_OVERTONE"][:], dtype=float)
     for k in ("default", "set40", "edited")}
rel = np.max(np.abs(J["set40"] - J["edited"])) / np.max(np.abs(J["edited"]))
assert rel <= 1e-13, rel
ratio = np.max(J["default"]) / np.max(J["set40"])
assert ratio > 2.0, ratio
print(f"ok {scen}: --set equals the edited data to {rel:.1e} relative; J(35)/J(40) = {ratio:.2f}")
'
}
check pyrene_full.yaml pyrene.yaml pyrene_photo.yaml
check pyrene_extended.yaml pyrene_extended.yaml pyrene_extended_photo.yaml
