"""colchem_py: open colchem's NetCDF and observation files as xarray, with units from pint,
and draw the plots a chemist expects (profiles against observations, sweep ranking, J
values, convergence, budgets, background column, ensemble envelopes, sensitivities).

    import sys; sys.path.insert(0, "python")       # or PYTHONPATH=python
    import colchem_py as cc
    ds = cc.open_file("out/pyrene_base.nc")
    ds.mole_fraction.sel(species="SO2")
    cc.save(cc.plot_profiles(ds, "SO2"), "so2.png")

Needs Debian's python3-xarray, python3-netcdf4, python3-matplotlib and python3-pint
(run with /usr/bin/python3). Every number drawn is read from the file.
"""
from .files import file_observations, kind, open_file, read_observations
from .plots import (plot_background, plot_budget, plot_convergence, plot_envelope,
                    plot_jvalues, plot_profiles, plot_sensitivity, plot_sweep_ranking, save)
from .units import convert, factor, quantity, registry, unit

__all__ = [
    "open_file", "read_observations", "file_observations", "kind",
    "unit", "factor", "quantity", "convert", "registry",
    "plot_profiles", "plot_sweep_ranking", "plot_jvalues", "plot_convergence", "plot_budget",
    "plot_background", "plot_envelope", "plot_sensitivity", "save",
]
