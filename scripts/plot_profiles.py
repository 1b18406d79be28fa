#!/usr/bin/python3
"""Plots a colchem run or sweep: mole-fraction profiles of chosen species for every variant
against the observation (error bars; upper limits as left-pointing arrows), and, for a run
that holds reaction rates, the production and loss breakdown of each species.

    scripts/plot_profiles.py OUT.nc --species SO2 SO [--obs OBS.csv] [--outdir DIR] [--top 6]

Needs Debian's python3-matplotlib, python3-netcdf4, python3-xarray and python3-pint (run with
/usr/bin/python3). For more plots use the package in python/colchem_py (README "Python").
Writes DIR/profiles_<species>.png and, where rates exist, DIR/budget_<species>.png.
"""
import argparse
import os
import sys

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402
import netCDF4  # noqa: E402
import numpy as np  # noqa: E402

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "python"))
import colchem_py  # noqa: E402


def text_values(var):
    return [str(v) for v in var[:]]


def read_obs_csv(path):
    """The observation format of README "Observation files", units from the header converted
    by pint (python/colchem_py: `value [nmol/mol]`, `[ppb]`, `[%]`)."""
    obs = colchem_py.read_observations(path)
    return [dict(z=float(z), species=str(s), value=float(v), sigma=float(u), limit=bool(l))
            for z, s, v, u, l in zip(obs["altitude"].values, obs["species"].values,
                                     obs["value"].values, obs["uncertainty"].values,
                                     obs["upper_limit"].values)]


def obs_from_file(ds):
    if "observation_value" not in ds.variables:
        return []
    sp = text_values(ds["observation_species"])
    return [dict(z=float(z), species=s, value=float(v), sigma=float(u), limit=bool(l))
            for z, s, v, u, l in zip(ds["observation_altitude"][:], sp, ds["observation_value"][:],
                                     ds["observation_uncertainty"][:],
                                     ds["observation_upper_limit"][:])]


def plot_profiles(ds, species, obs, outdir):
    alt = ds["altitude"][:]
    names = text_values(ds["species_name"])
    mf = np.ma.filled(ds["mole_fraction"][:], np.nan)
    if mf.ndim == 2:
        mf = mf[np.newaxis]
        labels = [ds.getncattr("title") if "title" in ds.ncattrs() else "run"]
        failed = [False]
    else:
        labels = text_values(ds["variant_label"])
        failed = [c == 0 for c in ds["variant_converged"][:]]
    written = []
    for sp in species:
        if sp not in names:
            sys.exit(f"plot_profiles: species {sp} is not in the file (has: {', '.join(names)})")
        s = names.index(sp)
        fig, ax = plt.subplots(figsize=(6.5, 5.5))
        for v in range(mf.shape[0]):
            if failed[v]:
                continue
            ax.plot(mf[v, s, :], alt, lw=1.4, label=labels[v])
        pts = [o for o in obs if o["species"] == sp]
        det = [o for o in pts if not o["limit"]]
        lim = [o for o in pts if o["limit"]]
        if det:
            ax.errorbar([o["value"] for o in det], [o["z"] for o in det],
                        xerr=[o["sigma"] for o in det], fmt="ko", ms=4, capsize=2,
                        label="observed")
        if lim:
            x = np.array([o["value"] for o in lim])
            ax.errorbar(x, [o["z"] for o in lim], xerr=0.4 * x, xuplims=True, fmt="kv", ms=5,
                        label="upper limit")
        ax.set_xscale("log")
        ax.set_xlabel(f"{sp} mole fraction")
        ax.set_ylabel("altitude [km]")
        ax.grid(alpha=0.3)
        ax.legend(fontsize=7, loc="best")
        fig.tight_layout()
        path = os.path.join(outdir, f"profiles_{sp}.png")
        fig.savefig(path, dpi=110)
        plt.close(fig)
        written.append(path)
    return written


def plot_budgets(ds, species, outdir, top):
    if "reaction_rate" not in ds.variables or "net_stoichiometry" not in ds.variables:
        return []
    alt = ds["altitude"][:]
    names = text_values(ds["species_name"])
    eqs = text_values(ds["reaction_equation"])
    rate = np.ma.filled(ds["reaction_rate"][:], 0.0)        # (reaction, altitude)
    nu = np.ma.filled(ds["net_stoichiometry"][:], 0.0)       # (reaction, species)
    written = []
    for sp in species:
        s = names.index(sp)
        contrib = nu[:, s][:, np.newaxis] * rate
        dz = np.diff(ds["altitude_edge"][:])
        column = (contrib * dz).sum(axis=1)
        fig, axes = plt.subplots(1, 2, figsize=(11, 5.5), sharey=True)
        for ax, sign, title in ((axes[0], 1, "production"), (axes[1], -1, "loss")):
            idx = [r for r in np.argsort(-sign * column) if sign * column[r] > 0][:top]
            for r in idx:
                ax.plot(sign * contrib[r], alt, lw=1.3, label=eqs[r])
            ax.set_xscale("log")
            ax.set_title(f"{sp} {title}")
            ax.set_xlabel("rate [cm-3 s-1]")
            ax.grid(alpha=0.3)
            if idx:
                ax.legend(fontsize=7)
        axes[0].set_ylabel("altitude [km]")
        fig.tight_layout()
        path = os.path.join(outdir, f"budget_{sp}.png")
        fig.savefig(path, dpi=110)
        plt.close(fig)
        written.append(path)
    return written


def main():
    p = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    p.add_argument("file", help="run or sweep NetCDF written by colchem")
    p.add_argument("--species", nargs="+", default=["SO2"])
    p.add_argument("--obs", help="observation CSV (default: the observations stored in the file)")
    p.add_argument("--outdir", default=".")
    p.add_argument("--top", type=int, default=6, help="reactions per panel in the budget plot")
    a = p.parse_args()
    os.makedirs(a.outdir, exist_ok=True)
    ds = netCDF4.Dataset(a.file)
    obs = read_obs_csv(a.obs) if a.obs else obs_from_file(ds)
    for path in plot_profiles(ds, a.species, obs, a.outdir) + plot_budgets(ds, a.species, a.outdir, a.top):
        print(path)


if __name__ == "__main__":
    main()
