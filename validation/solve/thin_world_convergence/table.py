#!/usr/bin/env python3
"""Mole fractions at one altitude from colchem run files on successively doubled grids, with
the observed order p = log2(|u_N - u_2N| / |u_2N - u_4N|) of every grid triple and the
Richardson estimate of the remaining error of the finest grid, (u_2N - u_4N)/(2^p - 1)
(Roache 1998, Verification and Validation in Computational Science and Engineering).

    table.py [--altitude KM] [--species SO2 S S2 H2SO4 H2] RUN_N.nc RUN_2N.nc RUN_4N.nc ...

Values between cell centres are interpolated linearly in altitude and log mole fraction.
"""
import argparse
import math

import numpy as np
import xarray as xr


def value_at(path, species, z_km):
    with xr.open_dataset(path) as ds:
        names = [str(s) for s in ds["species_name"].values]
        z = ds["altitude"].values
        x = ds["mole_fraction"].values[names.index(species), :]
        cells = len(z)
    return cells, float(np.exp(np.interp(z_km, z, np.log(np.maximum(x, 1e-300)))))


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("files", nargs="+")
    ap.add_argument("--altitude", type=float, default=8.0, help="km (default 8)")
    ap.add_argument("--species", nargs="+", default=["SO2", "S", "S2", "H2SO4", "H2"])
    a = ap.parse_args()
    for sp in a.species:
        rows = [value_at(f, sp, a.altitude) for f in a.files]
        print(f"{sp} at {a.altitude:g} km")
        print(f"{'cells':>6} {'mole fraction':>14} {'change':>11} {'order p':>8}")
        p = float("nan")
        for i, (n, u) in enumerate(rows):
            change = u - rows[i - 1][1] if i > 0 else float("nan")
            if i >= 2:
                d1 = rows[i - 1][1] - rows[i - 2][1]
                p = math.log2(abs(d1 / change)) if change != 0 and d1 != 0 else float("nan")
            print(f"{n:6d} {u:14.6e} {change:11.3e} {p:8.2f}")
        if len(rows) >= 3 and math.isfinite(p) and p > 0:
            est = (rows[-1][1] - rows[-2][1]) / (2.0**p - 1.0)
            print(f"  Richardson error estimate of the finest grid: {est:.2e} "
                  f"({abs(est / rows[-1][1]):.1e} relative)")
        print()


if __name__ == "__main__":
    main()
