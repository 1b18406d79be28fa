#!/usr/bin/python3
"""Plots a colchem ensemble file (colchem ensemble): envelope profiles of chosen species (the
members' median, 16-84 % and 2.5-97.5 % bands, the base state) with the observations stored
in the file, and, where the file holds an attribution (--attribution / --attribute), a bar
chart of the reactions that contribute most to the first-order variance of ln(mole fraction)
at each target.

    scripts/plot_ensemble.py ENSEMBLE.nc --species SO2 SO [--outdir DIR] [--top 10]

Needs Debian's python3-matplotlib and python3-netcdf4 (run with /usr/bin/python3).
Writes DIR/envelope_<species>.png and DIR/contributors_<species>_<altitude>km.png.
Every number drawn is read from the file; nothing is recomputed.
"""
import argparse
import os
import sys

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402
import netCDF4  # noqa: E402
import numpy as np  # noqa: E402


def text_values(var):
    return [str(v) for v in var[:]]


def values(var):
    """A variable as floats, fill values as NaN."""
    return np.ma.filled(np.ma.asarray(var[:], dtype=float), np.nan)


def percentile_index(ds, q):
    pct = list(values(ds["percentile"]))
    for i, p in enumerate(pct):
        if abs(p - q) < 1e-9:
            return i
    raise SystemExit(f"error: {ds.filepath()}: no {q} % percentile in `percentile` {pct}")


def species_index(ds, name):
    names = text_values(ds["species_name"])
    if name not in names:
        raise SystemExit(f"error: {ds.filepath()}: species {name!r} not in the file "
                         f"(expected one of {', '.join(names)})")
    return names.index(name)


def envelope_figure(ds, species):
    """Median, 16-84 and 2.5-97.5 % bands and the base state of one species against
    altitude, with the file's observations of it (errors bars from observation_uncertainty
    where stored; upper limits as left-pointing triangles)."""
    s = species_index(ds, species)
    z = values(ds["altitude"])
    pct = values(ds["mole_fraction_percentile"])[:, s, :]
    lo95, lo68 = pct[percentile_index(ds, 2.5)], pct[percentile_index(ds, 16.0)]
    med = pct[percentile_index(ds, 50.0)]
    hi68, hi95 = pct[percentile_index(ds, 84.0)], pct[percentile_index(ds, 97.5)]
    fig, ax = plt.subplots(figsize=(5.5, 6.5))
    ax.fill_betweenx(z, lo95, hi95, color="tab:blue", alpha=0.18, lw=0, label="2.5-97.5 %")
    ax.fill_betweenx(z, lo68, hi68, color="tab:blue", alpha=0.38, lw=0, label="16-84 %")
    ax.plot(med, z, color="tab:blue", lw=1.8, label="median", gid="median")
    ax.plot(values(ds["base_mole_fraction"])[s], z, color="k", lw=1.0, ls="--",
            label="base state", gid="base")
    if "observation_species" in ds.variables:
        sp = text_values(ds["observation_species"])
        keep = np.array([x == species for x in sp])
        if keep.any():
            oz = values(ds["observation_altitude"])[keep]
            ov = values(ds["observation_value"])[keep]
            lim = values(ds["observation_upper_limit"])[keep] > 0.5
            err = (values(ds["observation_uncertainty"])[keep]
                   if "observation_uncertainty" in ds.variables else np.zeros_like(ov))
            if (~lim).any():
                ax.errorbar(ov[~lim], oz[~lim], xerr=err[~lim], fmt="none", ecolor="tab:red",
                            capsize=2)
                ax.plot(ov[~lim], oz[~lim], "o", color="tab:red", ms=5, label="observed",
                        gid="observed")
            if lim.any():
                ax.plot(ov[lim], oz[lim], "<", color="tab:red", ms=7, label="upper limit",
                        gid="upper_limit")
    ax.set_xscale("log")
    ax.set_xlabel(f"{species} mole fraction")
    ax.set_ylabel("altitude (km)")
    ok = int(ds.getncattr("ensemble_converged"))
    n = int(ds.getncattr("ensemble_members"))
    ax.set_title(f"{species}: {ok} of {n} members converged", fontsize=10)
    ax.legend(fontsize=8, loc="best")
    fig.tight_layout()
    return fig


def attribution_targets(ds, species=None):
    """Indices of the attribution targets (of one species, if given)."""
    if "attribution_species" not in ds.variables:
        return []
    sp = text_values(ds["attribution_species"])
    return [i for i, x in enumerate(sp) if species is None or x == species]


def contributors_figure(ds, target, top=10):
    """Horizontal bars: the `top` reactions' shares (%) of the first-order variance of
    ln(mole fraction) at one target, with the first-order and the ensemble's variance."""
    share = values(ds["attribution_share"])[target]
    scaled = values(ds["attribution_scaled_sensitivity"])[target]
    eqs = text_values(ds["reaction_equation"])
    order = [r for r in np.argsort(-share, kind="stable") if share[r] > 0][:top]
    sp = text_values(ds["attribution_species"])[target]
    z = float(values(ds["attribution_altitude"])[target])
    v1 = float(values(ds["attribution_first_order_variance"])[target])
    ve = float(values(ds["attribution_ensemble_variance"])[target])
    agree = int(values(ds["attribution_agree"])[target]) == 1
    fig, ax = plt.subplots(figsize=(7.5, 0.45 * max(len(order), 2) + 1.6))
    y = np.arange(len(order))[::-1]
    colors = ["tab:red" if scaled[r] > 0 else "tab:blue" for r in order]
    ax.barh(y, [100.0 * share[r] for r in order], color=colors, gid="shares")
    ax.set_yticks(y)
    ax.set_yticklabels([eqs[r] for r in order], fontsize=8)
    ax.set_xlabel("share of the first-order variance of ln x (%)  "
                  "(red: x rises with k, blue: falls)")
    verdict = "agree within 20 %" if agree else "DIFFER (see the summary)"
    ax.set_title(f"{sp} at {z:g} km: first order {v1:.3g}, ensemble {ve:.3g}: {verdict}",
                 fontsize=9)
    fig.tight_layout()
    return fig


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("ensemble", help="a file written by colchem ensemble")
    ap.add_argument("--species", nargs="+", required=True, help="species to draw")
    ap.add_argument("--outdir", default=".", help="where the PNGs go (default: .)")
    ap.add_argument("--top", type=int, default=10, help="reactions in a bar chart")
    a = ap.parse_args(argv)
    if not os.path.isfile(a.ensemble):
        sys.exit(f"error: {a.ensemble}: no such file")
    os.makedirs(a.outdir, exist_ok=True)
    written = []
    with netCDF4.Dataset(a.ensemble) as ds:
        if "mole_fraction_percentile" not in ds.variables:
            sys.exit(f"error: {a.ensemble}: expected an ensemble file "
                     "(mole_fraction_percentile), found none")
        for sp in a.species:
            out = os.path.join(a.outdir, f"envelope_{sp}.png")
            fig = envelope_figure(ds, sp)
            fig.savefig(out + ".tmp.png", dpi=110)
            os.replace(out + ".tmp.png", out)
            plt.close(fig)
            written.append(out)
            for t in attribution_targets(ds, sp):
                z = float(values(ds["attribution_altitude"])[t])
                out = os.path.join(a.outdir, f"contributors_{sp}_{z:g}km.png")
                fig = contributors_figure(ds, t, a.top)
                fig.savefig(out + ".tmp.png", dpi=110)
                os.replace(out + ".tmp.png", out)
                plt.close(fig)
                written.append(out)
    for w in written:
        print(f"wrote {w}")


if __name__ == "__main__":
    main()
