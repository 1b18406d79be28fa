#!/usr/bin/env python3
"""Prints the README's "Results on Pyrene" table from a sweep file written by the demo:
SO2 mole fraction (log-linear interpolation) at given altitudes and chi2_log per scored
species, one row per variant, as Markdown.

    scripts/results_table.py out/pyrene_demo.nc [--altitudes 70 80 90 100 110]
"""
import argparse

import netCDF4
import numpy as np


def main():
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("sweep_file")
    ap.add_argument("--species", default="SO2")
    ap.add_argument("--altitudes", type=float, nargs="+", default=[70, 80, 90, 100, 110])
    a = ap.parse_args()
    ds = netCDF4.Dataset(a.sweep_file)
    species = [str(s) for s in ds["species_name"][:]]
    k = species.index(a.species)
    z = np.asarray(ds["altitude"][:], dtype=float)
    labels = [str(s) for s in ds["variant_label"][:]]
    scored = [str(s) for s in ds["score_species"][:]]
    chi2 = np.ma.filled(ds["chi2_log"][:], np.nan)
    mf = np.ma.filled(ds["mole_fraction"][:], np.nan)
    print(f"Grid: {len(z)} cells, {z[0] - (z[1] - z[0]) / 2:g}-{z[-1] + (z[1] - z[0]) / 2:g} km.\n")
    head = [f"{x:g} km" for x in a.altitudes] + [f"chi2_log {s}" for s in scored]
    print("| variant | " + " | ".join(head) + " |")
    print("|---" * (len(head) + 1) + "|")
    for v, label in enumerate(labels):
        prof = np.exp(np.interp(a.altitudes, z, np.log(mf[v, k])))
        cells = [f"{x:.2g}" for x in prof] + [f"{c:.1f}" for c in chi2[v]]
        print(f"| {label} | " + " | ".join(cells) + " |")


if __name__ == "__main__":
    main()
