#!/usr/bin/env python3
"""Checks a Pyrene run file against the published ranges for Venus-like middle atmospheres
(each recalled, "from memory"; Pyrene is fictional, the comparison says only whether the
network behaves like those of published CO2 worlds). Prints a Markdown table with, per
quantity, the factor by which the value lies outside its range (1 inside); exit 0.

    scripts/published_ranges.py out/pyrene.nc [--json]

Quantities, all from the run file alone (altitude, number_density, mole_fraction,
reaction_rate, net_stoichiometry):
  SO/SO2 90-100 km   mean of the cell ratios n_SO/n_SO2 with 90 <= z <= 100 km
  O2 column          sum of n_O2 dz over the whole column (cm-2)
  OCS at 65 km       mole fraction, log-linear interpolation in altitude
  H2SO4 production   column of the gross chemical production of H2SO4 (sum over the
                     reactions that make it, net stoichiometry > 0, of rate x dz; cm-2 s-1);
                     the exchange with the condensed phase is not chemistry and is left out
"""
import argparse
import json
import math

import netCDF4
import numpy as np

# (label, low, high, source) -- every range recalled, not re-read.
RANGES = {
    "so_so2_90_100": (0.1, 0.3, "SO/SO2 ~0.1-0.3 at 90-100 km observed on Venus (from memory)"),
    "o2_column": (0.0, 1.0e18, "O2 column above the clouds below the observed upper limit "
                               "~1e18 cm-2 on Venus (from memory)"),
    "ocs_65km": (1.0e-9, 1.0e-8, "OCS a few ppb (1-10 ppb) near 65 km on Venus (from memory)"),
    "h2so4_column_production": (3.0e11, 3.0e12, "H2SO4 column production ~1e12 cm-2 s-1 in "
                                                "published Venus models, within a factor 3 "
                                                "(from memory)"),
}


def measure(path):
    ds = netCDF4.Dataset(path)
    species = [str(s) for s in ds["species"][:]]
    to_km = {"cm": 1e-5, "m": 1e-3, "km": 1.0}[ds["altitude"].units]
    z = np.asarray(ds["altitude"][:], dtype=float) * to_km
    dz_cm = np.diff(np.asarray(ds["altitude_edge"][:], dtype=float)) * to_km * 1e5
    n = np.asarray(ds["number_density"][:], dtype=float)          # species x altitude
    x = np.asarray(ds["mole_fraction"][:], dtype=float)
    rate = np.asarray(ds["reaction_rate"][:], dtype=float)        # reaction x altitude
    stoich = np.asarray(ds["net_stoichiometry"][:], dtype=float)  # reaction x species
    eqs = [str(e) for e in ds["reaction_equation"][:]]
    k = {s: i for i, s in enumerate(species)}
    band = (z >= 90.0) & (z <= 100.0)
    out = {}
    out["so_so2_90_100"] = float(np.mean(n[k["SO"], band] / n[k["SO2"], band]))
    out["o2_column"] = float(np.sum(n[k["O2"]] * dz_cm))
    out["ocs_65km"] = float(math.exp(np.interp(65.0, z, np.log(x[k["OCS"]]))))
    h = k["H2SO4"]
    makers = [r for r, e in enumerate(eqs)
              if stoich[r, h] > 0 and "(condensed phase)" not in e and "supply)" not in e]
    out["h2so4_column_production"] = float(
        sum(stoich[r, h] * np.sum(rate[r] * dz_cm) for r in makers))
    return out


def factor_outside(v, lo, hi):
    """How far v lies outside [lo, hi], as a factor: "1" inside, else "Nx below" or "Nx above"."""
    if v < lo:
        return f"{lo / v:.2g}x below" if v > 0 else "below (zero)"
    if v > hi:
        return f"{v / hi:.2g}x above"
    return "1"


def main():
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("run_file")
    ap.add_argument("--json", action="store_true", help="print the measured values as JSON")
    a = ap.parse_args()
    m = measure(a.run_file)
    if a.json:
        print(json.dumps(m))
        return
    print("| quantity | Pyrene | published range (from memory) | met | factor outside |")
    print("|---|---|---|---|---|")
    for key, (lo, hi, src) in RANGES.items():
        v = m[key]
        print(f"| {key} | {v:.3g} | {lo:.3g}-{hi:.3g}: {src} | {'yes' if lo <= v <= hi else 'no'} "
              f"| {factor_outside(v, lo, hi)} |")


if __name__ == "__main__":
    main()
