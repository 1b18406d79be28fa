#!/usr/bin/env bash
# Outputs the ecosystem reads without help (issue 17): the run, sweep, box and photo files are
# read by ncdump -h (netcdf-bin), ncks -m (nco), cdo sinfon/showname (cdo) and xarray
# (python3-xarray on Debian's /usr/bin/python3). A missing tool is a failure, not a skip
# (scripts/lib/setup.sh installs them). Checks:
#   - CDO lists the species fields (mole_fraction, number_density, flux) and J: CDO skips a
#     variable whose horizontal coordinate is text ("Unsupported x-coordinate type"), so
#     this fails if a species dimension gets a string coordinate again;
#   - the header (ncdump -h) is under 20 KB (common practice, no source: a header a person
#     can read; the input files live in the provenance_* variables, not in attributes);
#   - xarray gives every dimension except the CF bounds dimension nv a coordinate, decodes
#     CF time (snapshot, box time) to datetimes and finds the species names.
set -eu
colchem=$1; src=$2; work=$3
for tool in ncdump ncks cdo /usr/bin/python3; do
  command -v "$tool" >/dev/null || { echo "FAIL: $tool is not installed (apt-get install cdo nco netcdf-bin)"; exit 1; }
done
rm -rf "$work"; mkdir -p "$work"; cd "$work"

# A transient run with snapshots: Tellin, cut to two hours with two outputs, on 20 cells,
# first step 0.5 s (the layout, not the numbers, is under test).
"$colchem" run "$src/configs/tellin.yaml" -o run.nc \
  --set 'solver.transient.end=2 hour' --set 'solver.transient.outputs=[1 hour, 2 hour]' \
  --set grid.cells=20 --set 'solver.transient.step=0.5 s' \
  > run.log 2>&1 || { tail -20 run.log; exit 1; }
# The test sweep cut to three variants (base; sulfur at two removal scales).
"$colchem" sweep "$src/tests/cli/sweep/tellin_sweep.yaml" -o sweep.nc \
  --set 'modules={base: [base], sulfur: [base, sulfur]}' \
  --set 'parameters={sulfate_removal_scale: [0.5, 2]}' > sweep.log 2>&1 \
  || { tail -20 sweep.log; exit 1; }
"$colchem" box "$src/validation/chem/box_equilibrium/box.yaml" -o box.nc > box.log 2>&1 \
  || { tail -20 box.log; exit 1; }
"$colchem" photo "$src/configs/tellin.yaml" -o photo.nc > photo.log 2>&1 \
  || { tail -20 photo.log; exit 1; }

check_fields() {  # FILE FIELD...
  local f=$1; shift
  ncks -m "$f" > "$f.ncks" || { echo "FAIL: ncks -m $f"; exit 1; }
  ncdump -h "$f" > "$f.cdl"
  local size
  size=$(wc -c < "$f.cdl")
  [ "$size" -lt 20000 ] || { echo "FAIL: ncdump -h $f is $size bytes (>= 20000)"; exit 1; }
  cdo -s sinfon "$f" > "$f.sinfo" 2> "$f.cdo_err" || { cat "$f.cdo_err"; echo "FAIL: cdo sinfon $f"; exit 1; }
  cdo -s showname "$f" > "$f.names" 2>> "$f.cdo_err" || { cat "$f.cdo_err"; exit 1; }
  local v
  for v in "$@"; do
    grep -qw -- "$v" "$f.names" || { cat "$f.cdo_err" "$f.names"; echo "FAIL: cdo does not list $v in $f"; exit 1; }
    grep -qw -- "$v" "$f.sinfo" || { echo "FAIL: cdo sinfon does not list $v in $f"; exit 1; }
  done
  echo "ok: $f: header $size bytes; cdo lists $*"
}
check_fields run.nc mole_fraction number_density flux molecular_flux chemical_tendency J snapshot_number_density
check_fields sweep.nc mole_fraction
check_fields box.nc mole_fraction number_density
check_fields photo.nc J

/usr/bin/python3 - <<'PY'
import numpy as np
import xarray as xr

for name in ("run.nc", "sweep.nc", "box.nc", "photo.nc"):
    ds = xr.open_dataset(name)
    missing = [d for d in ds.dims if d != "nv" and d not in ds.coords]
    assert not missing, f"{name}: dimensions without a coordinate: {missing}"
    print(f"xarray: {name}: {len(ds.dims)} dimensions, each with a coordinate")

run = xr.open_dataset("run.nc")
t = run["snapshot"]
assert np.issubdtype(t.dtype, np.datetime64), t.dtype
# The stated origin plus the model times asked for (1 and 2 hours; analytic).
hours = (t.values - np.datetime64("2000-01-01T00:00:00")) / np.timedelta64(1, "h")
assert np.allclose(hours, [1, 2], rtol=0, atol=1e-9), hours
names = [str(s) for s in run["species_name"].values]
assert "SO2" in names, names
assert "species_name" in run["mole_fraction"].coords
assert run["held_fixed"].dtype.kind == "i" and list(run["held_fixed"].attrs["flag_values"]) == [0, 1]
J = run["J"]
assert J.dims == ("channel", "altitude"), J.dims
for c, ch in enumerate(run["channel_name"].values):
    assert np.array_equal(J.values[c], run[f"J_{ch}"].values), ch
assert "grid:" in run["provenance_scenario"].item()
# CF standard names where CF has one (CF Standard Name Table): each named gas once more as its
# own profile, equal to its row of mole_fraction; O3 -> O2 + O(1D) as the CF photolysis rate.
so2 = run["mole_fraction_SO2"]
assert so2.attrs["standard_name"] == "mole_fraction_of_sulfur_dioxide_in_air", so2.attrs
assert np.array_equal(so2.values, run["mole_fraction"].values[names.index("SO2")])
assert run["mole_fraction_O3"].attrs["standard_name"] == "mole_fraction_of_ozone_in_air"
assert "mole_fraction_N2" not in run  # CF names no N2 mole fraction in air
assert run["J_O3_O2_O1D"].attrs["standard_name"] == "photolysis_rate_of_ozone_to_1D_oxygen_atom"
assert "standard_name" not in run["J_SO2_SO_O"].attrs
box = xr.open_dataset("box.nc")
assert np.issubdtype(box["time"].dtype, np.datetime64), box["time"].dtype
sweep = xr.open_dataset("sweep.nc")
assert sweep["variant_converged"].dtype.kind == "i"
print("ok: xarray decodes CF time, species names, J(channel, altitude), flags as integers")
PY
