#!/usr/bin/python3
"""Example analysis of colchem output with the Python package python/colchem_py; copy it and
change the file names. Run from the repository root with Debian's interpreter:

    ./build/src/colchem run configs/pyrene_full.yaml -o out/pyrene.nc \
        --set observations=profiles/observed/pyrene_so2_invented.csv
    /usr/bin/python3 scripts/example_analysis.py out/pyrene.nc --outdir out/plots

Each step below is one notebook cell: open the file, look at it, convert units, draw.
"""
import argparse
import os
import sys

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "python"))
import colchem_py as cc  # noqa: E402

ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
ap.add_argument("run", help="a run file written by colchem run")
ap.add_argument("--species", default="SO2")
ap.add_argument("--obs", help="an observation file (any units in its header, e.g. [nmol/mol])")
ap.add_argument("--outdir", default=".")
a = ap.parse_args()
os.makedirs(a.outdir, exist_ok=True)

# --- Cell 1: open the file. Species, reactions and channels are selected by name.
ds = cc.open_file(a.run)
print(f"{a.run}: a {cc.kind(ds)} file; names: {ds.attrs['colchem_named_by']}")
so2 = ds.mole_fraction.sel(species=a.species)
print(f"{a.species} at the lowest and highest cell: {float(so2[0]):.3g}, {float(so2[-1]):.3g}")

# --- Cell 2: units through pint, from the files' `units` attributes.
n = cc.quantity(ds.number_density.sel(species=a.species))
print(f"{a.species} number density at the lowest cell: {n[0].to('m**-3'):.3e}")
ppb = cc.convert(so2, "ppb")
print(f"{a.species} at the lowest cell: {float(ppb[0]):.4g} ppb")

# --- Cell 3: observations from a file in any dimensionless unit, or those stored in the run.
obs = cc.read_observations(a.obs) if a.obs else cc.file_observations(ds)
if obs is not None:
    print(f"{obs.sizes['observation']} observations; scored chi2_log per species:")
    if "chi2_log" in ds:
        for s in ds.scored_species.values:
            print(f"  {s}: {float(ds.chi2_log.sel(scored_species=s)):.4g}")

# --- Cell 4: the plots (each returns a matplotlib Figure; cc.save writes and closes it).
written = [
    cc.save(cc.plot_profiles(ds, a.species, obs), os.path.join(a.outdir, "profiles.png")),
    cc.save(cc.plot_budget(ds, a.species), os.path.join(a.outdir, "budget.png")),
    cc.save(cc.plot_jvalues(ds), os.path.join(a.outdir, "jvalues.png")),
    cc.save(cc.plot_background(ds), os.path.join(a.outdir, "background.png")),
]
if "history_residual_norm" in ds:
    written.append(cc.save(cc.plot_convergence(ds), os.path.join(a.outdir, "convergence.png")))
# Other files: cc.plot_sweep_ranking(sweep), cc.plot_envelope(ensemble, "SO2"),
# cc.plot_sensitivity(sensitivity_file).
for w in written:
    print(f"wrote {w}")
