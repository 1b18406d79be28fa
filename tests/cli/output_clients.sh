#!/usr/bin/env bash
# Runs a scenario and opens its NetCDF with real clients: ncdump (netcdf-bin) must show the
# CF conventions and units, and xarray (python3-xarray on Debian's /usr/bin/python3) must
# decode the altitude coordinate, its units and the variables' units.
set -eu
colchem=$1; config=$2
out=clients_out.nc
rm -f "$out"
"$colchem" run "$config" -o "$out"
header=$(ncdump -h "$out")
for needle in ':Conventions = "CF-1.10"' 'altitude:units = "km"' 'altitude:positive = "up"' \
              'pressure:standard_name = "air_pressure"' 'temperature:units = "K"' \
              'string provenance_scenario ;'; do
  printf '%s\n' "$header" | grep -F -q -- "$needle" || { echo "ncdump lacks: $needle"; exit 1; }
done
/usr/bin/python3 "$(dirname "$0")/check_output.py" "$out"
echo "ok: ncdump and xarray read $out"
