#!/usr/bin/env bash
# Fixture of the NetCDF cases of the bad-input catalogue (tests/cli/bad_inputs.cmake): a
# run file of the invented six-cell restart column (steady, about a second) and copies of
# it with one defect each (tests/cli/bad/make_bad_netcdf.py).
set -eu
colchem=$1; root=$2; work=$3
rm -rf "$work"; mkdir -p "$work"; cd "$work"
"$colchem" run "$root/tests/solve/restart/restart_column.yaml" --set solver.method=steady \
  -o good.nc > good.log 2>&1 || { cat good.log; exit 1; }
/usr/bin/python3 "$root/tests/cli/bad/make_bad_netcdf.py" good.nc .
ls ./*.nc
