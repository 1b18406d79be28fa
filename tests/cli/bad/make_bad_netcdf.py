"""Writes crafted NetCDF inputs for the bad-input catalogue (tests/cli/cli_tests.cmake).

usage: make_bad_netcdf.py GOOD_RUN.nc OUT_DIR

GOOD_RUN.nc is a run file written by `colchem run`; every file written here is a copy of it
with one defect, each of which colchem must refuse with exit code 4 (README "Exit codes"):
  nd_shape.nc       number_density on a dimension one cell shorter than altitude
  zero_altitude.nc  every altitude dimension of length zero
  descending.nc     altitudes (and edges) top to bottom
  nan_density.nc    one number density NaN
  negative.nc       every number density negative
  rate_shape.nc     reaction_rate on a dimension one cell shorter than altitude
  stoich_shape.nc   net_stoichiometry on (reaction, reaction) instead of (reaction, species)
  species_double.nc species_name stored as numbers instead of strings
"""
import sys

import netCDF4
import numpy as np

good, out = sys.argv[1], sys.argv[2]


def copy(name, edit=None, dims=None, skip_dims=()):
    """Copies GOOD into OUT/name; edit(var, data) may change a variable's data,
    dims[var] = (dimension names) its dimensions (new dimensions: extra_<n>)."""
    dims = dims or {}
    src = netCDF4.Dataset(good)
    dst = netCDF4.Dataset(f"{out}/{name}", "w", format="NETCDF4")
    dst.setncatts({k: src.getncattr(k) for k in src.ncattrs()})
    for d, dim in src.dimensions.items():
        dst.createDimension(d, 0 if d in skip_dims else len(dim))
    extra = {}
    for var, vd in dims.items():
        for d in vd:
            if d.startswith("extra_") and d not in extra:
                extra[d] = int(d.split("_")[1])
                dst.createDimension(d, extra[d])
    for v, var in src.variables.items():
        vdims = dims.get(v, var.dimensions)
        if v == "species_name" and name == "species_double.nc":
            nv = dst.createVariable(v, "f8", vdims)
            nv[:] = np.arange(len(src.dimensions[vdims[0]]), dtype=float)
            continue
        nv = dst.createVariable(v, var.datatype, vdims)
        nv.setncatts({k: var.getncattr(k) for k in var.ncattrs()})
        shape = tuple(len(dst.dimensions[d]) for d in vdims)
        if 0 in shape:
            continue
        data = var[:]
        if edit:
            data = edit(v, data)
        if var.datatype == str:
            nv[:] = np.asarray(data, dtype=object)
        else:
            data = np.asarray(data)
            arr = np.zeros(shape, dtype=data.dtype)
            both = tuple(slice(0, min(a, b)) for a, b in zip(shape, data.shape))
            arr[both] = data[both]
            nv[:] = arr
    dst.close()
    src.close()


with netCDF4.Dataset(good) as d:
    N = len(d.dimensions["altitude"])
    S = len(d.dimensions["species"])
    R = len(d.dimensions["reaction"])
    alt_vars = [v for v, var in d.variables.items()
                if any(x in ("altitude", "altitude_edge") for x in var.dimensions)]

copy("nd_shape.nc", dims={"number_density": ("species", f"extra_{N - 1}")})
copy("zero_altitude.nc", skip_dims=("altitude", "altitude_edge"))


def flip(v, data):
    # Reverses every variable along its altitude axes (the column stored top to bottom).
    with netCDF4.Dataset(good) as d:
        dd = d.variables[v].dimensions
    for ax, name in enumerate(dd):
        if name in ("altitude", "altitude_edge"):
            data = np.flip(np.asarray(data), axis=ax)
    return data


copy("descending.nc", edit=flip)


def nan_density(v, data):
    data = np.array(data, dtype=float) if v == "number_density" else data
    if v == "number_density":
        data[0, N // 2] = np.nan
    return data


copy("nan_density.nc", edit=nan_density)
copy("negative.nc", edit=lambda v, data: -np.abs(np.asarray(data)) - 1.0
     if v == "number_density" else data)
copy("rate_shape.nc", dims={"reaction_rate": ("reaction", f"extra_{N - 1}")})
copy("stoich_shape.nc", dims={"net_stoichiometry": ("reaction", f"extra_{R + 3}")})
copy("species_double.nc")
