"""Runs scripts/plot_profiles.py on small files in colchem's documented layouts (a sweep
with a variant dimension and stored observations; a run with reaction rates) and checks that
it writes non-empty PNGs."""
import os
import subprocess
import sys

import netCDF4
import numpy as np

root, work = sys.argv[1], sys.argv[2]
os.makedirs(work, exist_ok=True)
alt = np.linspace(60, 110, 26)
edges = np.linspace(59, 111, 27)


def base(ds, species):
    ds.createDimension("altitude", alt.size)
    ds.createDimension("altitude_edge", edges.size)
    ds.createDimension("species", len(species))
    ds.createVariable("altitude", "f8", ("altitude",))[:] = alt
    ds.createVariable("altitude_edge", "f8", ("altitude_edge",))[:] = edges
    ds.createVariable("species", "i4", ("species",))[:] = np.arange(len(species))
    v = ds.createVariable("species_name", str, ("species",))
    for i, s in enumerate(species):
        v[i] = s


sweep = os.path.join(work, "plot_sweep.nc")
with netCDF4.Dataset(sweep, "w") as ds:
    base(ds, ["SO2", "SO"])
    ds.createDimension("variant", 3)
    mf = ds.createVariable("mole_fraction", "f8", ("variant", "species", "altitude"))
    for v in range(3):
        mf[v, 0, :] = 1e-7 * np.exp(-(alt - 60) / 10) * (1 + v) + 1e-10
        mf[v, 1, :] = 1e-9
    lab = ds.createVariable("variant_label", str, ("variant",))
    for v, l in enumerate(["base", "base+overtone", "base+reservoir"]):
        lab[v] = l
    ds.createVariable("variant_converged", "i4", ("variant",))[:] = [1, 1, 0]
    ds.createDimension("observation", 3)
    sp = ds.createVariable("observation_species", str, ("observation",))
    for i in range(3):
        sp[i] = "SO2"
    ds.createVariable("observation_altitude", "f8", ("observation",))[:] = [65, 80, 95]
    ds.createVariable("observation_value", "f8", ("observation",))[:] = [5e-8, 3e-9, 1e-8]
    ds.createVariable("observation_uncertainty", "f8", ("observation",))[:] = [1e-8, 1e-9, 0]
    ds.createVariable("observation_upper_limit", "i4", ("observation",))[:] = [0, 0, 1]

run = os.path.join(work, "plot_run.nc")
with netCDF4.Dataset(run, "w") as ds:
    base(ds, ["SO2", "O"])
    ds.createDimension("reaction", 2)
    ds.createVariable("mole_fraction", "f8", ("species", "altitude"))[:] = 1e-7
    eq = ds.createVariable("reaction_equation", str, ("reaction",))
    eq[0], eq[1] = "SO + O + M -> SO2 + M", "SO2 + hv -> SO + O"
    ds.createVariable("reaction_rate", "f8", ("reaction", "altitude"))[:] = 1e4
    ds.createVariable("net_stoichiometry", "f8", ("reaction", "species"))[:] = [[1, -1], [-1, 1]]

script = os.path.join(root, "scripts", "plot_profiles.py")
for f, sub in ((sweep, "sweep"), (run, "run")):
    outdir = os.path.join(work, sub)
    out = subprocess.run([sys.executable, script, f, "--species", "SO2", "--outdir", outdir],
                         check=True, capture_output=True, text=True).stdout.split()
    assert out, "no figure written"
    for png in out:
        size = os.path.getsize(png)
        assert size > 5000, f"{png} is too small ({size} bytes)"
        with open(png, "rb") as fh:
            assert fh.read(8) == b"\x89PNG\r\n\x1a\n", f"{png} is not a PNG"
        print(f"ok: {png} ({size} bytes)")
assert os.path.exists(os.path.join(work, "run", "budget_SO2.png"))
