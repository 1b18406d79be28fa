"""Compares colchem's hydrostatic pressures at the cell edges with the U.S. Standard
Atmosphere 1976 table. Usage: compare.py RUN.nc reference.csv [tolerance]. Exits 1 if any
level deviates by more than the tolerance (default 0.005 = 0.5 %)."""
import csv
import sys

import xarray as xr

run, ref_file = sys.argv[1], sys.argv[2]
tol = float(sys.argv[3]) if len(sys.argv) > 3 else 0.005
ds = xr.open_dataset(run)
edges = ds["altitude_edge"].values
p_edge = ds["edge_pressure"].values
assert ds["edge_pressure"].attrs["units"] == "Pa"
rows = [r for r in csv.reader(l for l in open(ref_file) if not l.startswith("#"))][1:]
worst = 0.0
print(f"{'z [km]':>7} {'USSA76 [Pa]':>12} {'colchem [Pa]':>13} {'rel. diff':>10}")
for z, p_ref in ((float(a), float(b)) for a, b in rows):
    i = abs(edges - z).argmin()
    if abs(edges[i] - z) > 1e-6:
        continue
    d = p_edge[i] / p_ref - 1.0
    worst = max(worst, abs(d))
    print(f"{z:7.1f} {p_ref:12.5g} {p_edge[i]:13.5g} {d:+10.2e}")
print(f"largest relative difference {worst:.2e} (tolerance {tol})")
sys.exit(0 if worst <= tol else 1)
