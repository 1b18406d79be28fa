#!/usr/bin/python3
"""Compares the end of a condensed_exchange run with the closed form.

Usage: colchem run column.yaml && /usr/bin/python3 check.py condensed_exchange.nc
With no chemistry and negligible transport each cell evolves alone:
  dn/dt = -k (n - n_sat)  where n > n_sat, or where droplets are present (below 20 km),
  dn/dt = 0               otherwise (subsaturated, no droplets),
so n(t) = n_sat + (n0 - n_sat) exp(-k t) on the active branch and n(t) = n0 elsewhere
(analytic; a supersaturated cell never reaches n_sat in finite time, so it stays on its
branch). n_sat = p_sat / (k_B T), ln(p_sat/Pa) = 15.12 - 7500/T (column.yaml, invented);
k = 1/(1e4 s); n0 = x0 n_air with x0 interpolated log-linearly from initial.csv.
"""
import math
import sys

import numpy as np
import xarray as xr

ds = xr.open_dataset(sys.argv[1] if len(sys.argv) > 1 else "condensed_exchange.nc")
names = [str(s) for s in ds["species_name"].values]
s = names.index("H2SO4")
z = ds["altitude"].values  # km
T = ds["temperature"].values
air = ds["air_number_density"].values
n = ds["number_density"].values[s]
t = float(ds.attrs["colchem_model_time_s"])
k_B = 1.380649e-16
tab = np.loadtxt("initial.csv" if len(sys.argv) < 3 else sys.argv[2], delimiter=",", comments="#",
                 skiprows=3)
x0 = np.exp(np.interp(z, tab[:, 0], np.log(tab[:, 1])))
n0 = x0 * air
k = 1.0 / 1.0e4
worst = 0.0
kinds = {"condensing": 0, "evaporating": 0, "untouched": 0}
for j in range(len(z)):
    n_sat = math.exp(15.12 - 7500.0 / T[j]) * 10.0 / (k_B * T[j])  # Pa -> dyn cm-2
    droplets = z[j] < 20.0
    if n0[j] > n_sat or droplets:
        ref = n_sat + (n0[j] - n_sat) * math.exp(-k * t)
        kinds["condensing" if n0[j] > n_sat else "evaporating"] += 1
    else:
        ref = n0[j]
        kinds["untouched"] += 1
    err = abs(n[j] / ref - 1.0)
    worst = max(worst, err)
    print(f"{z[j]:5.1f} km  n0 {n0[j]:.4e}  n_sat {n_sat:.4e}  model {n[j]:.6e}  "
          f"closed form {ref:.6e}  rel. error {err:.2e}")
print(f"t = {t:g} s; cells condensing {kinds['condensing']}, evaporating {kinds['evaporating']}, "
      f"untouched {kinds['untouched']}; largest relative error {worst:.2e}")
sys.exit(0 if worst < 1e-3 and min(kinds.values()) > 0 else 1)
