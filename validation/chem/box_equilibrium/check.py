#!/usr/bin/python3
"""Compares the end of a box_equilibrium run with the analytic equilibrium.

Usage: colchem box box.yaml && /usr/bin/python3 check.py box_equilibrium.nc
2 ClO <=> Cl2O2 with [Cl2O2] = K [ClO]^2 and chlorine conserved, [ClO] + 2 [Cl2O2] = a0:
[ClO] = (-1 + sqrt(1 + 8 K a0)) / (4 K)  (analytic), K = 2.16e-27 exp(8537/T) cm3
(JPL Publication 19-5, Burkholder et al. 2019; from memory).
"""
import math
import sys

import xarray as xr

ds = xr.open_dataset(sys.argv[1] if len(sys.argv) > 1 else "box_equilibrium.nc")
T = float(ds.attrs["temperature_K"])
names = [str(s) for s in ds["species_name"].values]
n = ds["number_density"].values
clo, dimer = names.index("ClO"), names.index("Cl2O2")
a0 = n[0, clo] + 2 * n[0, dimer]
K = 2.16e-27 * math.exp(8537.0 / T)
a = (-1.0 + math.sqrt(1.0 + 8.0 * K * a0)) / (4.0 * K)
x = (a0 - a) / 2.0
err_a = abs(n[-1, clo] / a - 1.0)
err_x = abs(n[-1, dimer] / x - 1.0)
print(f"K({T:.1f} K) = {K:.6e} cm3")
print(f"ClO   model {n[-1, clo]:.6e}  analytic {a:.6e}  rel. error {err_a:.2e}")
print(f"Cl2O2 model {n[-1, dimer]:.6e}  analytic {x:.6e}  rel. error {err_x:.2e}")
sys.exit(0 if max(err_a, err_x) < 1e-4 else 1)
