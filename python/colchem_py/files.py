"""Opening colchem NetCDF files and observation files.

Every colchem file gives each dimension of named entries (species, reaction, channel,
variant, ...) an integer index coordinate and keeps the names in a string variable along it
(README "Outputs"). `open_file` swaps the names in as the coordinate, so
`ds.mole_fraction.sel(species="SO2")` works; the index stays as `<dim>_index`.
"""
import csv
import os

import numpy as np
import xarray as xr

from . import units

# Per dimension, the string variables that may name its entries, in order of preference
# (the first whose values are all different is used).
_NAME_CANDIDATES = ("{d}_name", "{d}_id", "{d}_label", "{d}_path", "{d}_equation", "score_{d}")
_SPECIAL = {"scored_species": ("score_species",)}


def _names_for(ds, dim):
    cands = _SPECIAL.get(dim, ()) + tuple(c.format(d=dim) for c in _NAME_CANDIDATES)
    for c in cands:
        if c in ds.variables and ds[c].dims == (dim,) and ds[c].dtype.kind in "OUS":
            vals = [str(v) for v in ds[c].values]
            if all(vals) and len(set(vals)) == len(vals):
                return c, vals
    return None, None


def open_file(path):
    """A colchem NetCDF file (run, sweep, box, photo, sensitivity, fit, ensemble, resolution)
    as an xarray Dataset, loaded into memory (the file is closed again), CF time decoded, and
    the entry names as coordinates of their dimensions. `ds.attrs["colchem_named_by"]` says
    which variable named each dimension (e.g. `species=species_name`)."""
    if not os.path.isfile(path):
        raise FileNotFoundError(f"{path}: no such file")
    with xr.open_dataset(path) as raw:
        ds = raw.load()
    named = []
    for dim in list(ds.dims):
        if dim not in ds.variables or ds[dim].dtype.kind not in "iu":
            continue
        var, vals = _names_for(ds, dim)
        if var is None:
            continue
        ds = ds.assign_coords({f"{dim}_index": (dim, ds[dim].values)})
        ds = ds.assign_coords({dim: (dim, np.array(vals, dtype=object), ds[var].attrs)})
        named.append(f"{dim}={var}")
    ds.attrs["colchem_named_by"] = " ".join(named)
    ds.encoding["source"] = path
    return ds


def kind(ds):
    """Which command wrote the file, from its variables (README "Outputs")."""
    v = ds.variables
    if "mole_fraction_percentile" in v:
        return "ensemble"
    if "log10_mole_fraction" in v:
        return "resolution"
    if "dG_dlnk" in v:
        return "sensitivity"
    if "parameter_correlation" in v:
        return "fit"
    if "variant" in ds.dims:
        return "sweep"
    if "time" in ds.dims and "altitude" not in ds.dims:
        return "box"
    if "mole_fraction" not in v and "J" in v:
        return "photo"
    return "run"


def read_observations(path):
    """An observation file (README "Observation files") as a Dataset along `observation`:
    altitude (km), species, value and uncertainty (mole fractions, unit 1), upper_limit (bool),
    each converted with pint from the header's unit (`value [nmol/mol]`, `[ppb]`, `[%]`)."""
    with open(path, newline="") as fh:
        rows = [(i + 1, line) for i, line in enumerate(fh)
                if line.strip() and not line.lstrip().startswith("#")]
    if not rows:
        raise ValueError(f"{path}: expected a header line, found an empty file")
    head_line, head = rows[0]
    names, unit_of = [], {}
    for h in next(csv.reader([head])):
        name, _, u = h.strip().partition("[")
        names.append(name.strip())
        unit_of[name.strip()] = u.rstrip("]").strip() if u else ""
    for need in ("altitude", "species", "value", "uncertainty", "upper_limit"):
        if need not in names:
            raise ValueError(f"{path}:{head_line}: expected a column `{need}`, found {names}")
    target = {"altitude": "km", "value": "1", "uncertainty": "1", "altitude_uncertainty": "km"}
    scale = {k: units.factor(unit_of[k] or t, t, f"{path}:{head_line}: column `{k}`")
             for k, t in target.items() if k in names}
    cols = {n: [] for n in names}
    for line_no, line in rows[1:]:
        cells = [c.split("#")[0].strip() for c in next(csv.reader([line]))]
        if len(cells) < len(names):
            raise ValueError(f"{path}:{line_no}: expected {len(names)} columns, found {len(cells)}")
        for n, c in zip(names, cells):
            cols[n].append(c)
    data = {}
    for k, f in scale.items():
        try:
            vals = np.array([float(x) for x in cols[k]]) * f
        except ValueError as e:
            raise ValueError(f"{path}: column `{k}`: expected numbers, found {e}")
        data[k] = ("observation", vals, {"units": target[k]})
    data["species"] = ("observation", np.array(cols["species"], dtype=object))
    data["upper_limit"] = ("observation", np.array([float(x) > 0.5 for x in cols["upper_limit"]]))
    out = xr.Dataset(data)
    out.attrs["source"] = path
    return out


def file_observations(ds):
    """The observations stored in a run, sweep, ensemble or fit file, in read_observations'
    layout (None if the file holds none)."""
    if "observation_value" not in ds.variables:
        return None
    sigma = "observation_uncertainty" if "observation_uncertainty" in ds else "observation_sigma"
    out = xr.Dataset({
        "altitude": ds["observation_altitude"],
        "species": ("observation", np.array([str(s) for s in ds["observation_species"].values],
                                            dtype=object)),
        "value": ds["observation_value"],
        "uncertainty": ds[sigma] if sigma in ds else xr.zeros_like(ds["observation_value"]),
        "upper_limit": ds["observation_upper_limit"] > 0.5,
    })
    return out.reset_coords(drop=True)
