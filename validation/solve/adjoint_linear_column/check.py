#!/usr/bin/python3
"""The linear column's adjoint sensitivities against its closed-form steady state.

  d/dz (K n_a df/dz) = k n_a f,  n_a = n0 exp(-z/H),  f(0) = f_b,  f'(L) = 0
  f = A e^{m1 z} + B e^{m2 z},  m = (1/H +- sqrt(1/H^2 + 4 k/K)) / 2,  G = int_0^L n_a f dz

(analytic; derivatives of the closed form by complex step, Squire and Trapp 1998, SIAM
Rev. 40, 110). The model's background file gives H, n0, K and L; k is the mechanism's
1e-6 s-1 and f_b the boundary value 1e-9 (tests/solve/adjoint/).
"""
import sys

import netCDF4
import numpy as np

ds = netCDF4.Dataset(sys.argv[1])
z_edge = np.asarray(ds["altitude_edge"][:]) * 1e5  # km -> cm
z = np.asarray(ds["altitude"][:]) * 1e5
n_air = np.asarray(ds["air_number_density"][:])
H = float(ds["scale_height"][0]) * 1e5  # km -> cm
assert abs(float(ds["scale_height"][-1]) * 1e5 / H - 1) < 1e-6  # uniform: isothermal, uniform g
n0 = float(n_air[0] * np.exp((z[0] - z_edge[0]) / H))
L = float(z_edge[-1] - z_edge[0])
k, K, fb = 1e-6, 1e5, 1e-9


def column(k, K):
    root = np.sqrt(1 / H**2 + 4 * k / K)
    m1, m2 = (1 / H + root) / 2, (1 / H - root) / 2
    e1, e2 = np.exp(m1 * L), np.exp(m2 * L)
    A = fb * m2 * e2 / (m2 * e2 - m1 * e1)
    B = fb - A
    part = lambda C, m: C * (np.exp((m - 1 / H) * L) - 1) / (m - 1 / H)
    return n0 * (part(A, m1) + part(B, m2))


G = column(k, K)
dlnk = (column(k + 1e-20j * k, K).imag / 1e-20) / G
dlnK = (column(k, K + 1e-20j * K).imag / 1e-20) / G
Gm = float(ds.getncattr("colchem_objective_value"))
ids = [str(s) for s in ds["reaction_id"][:]]
names = [str(s) for s in ds["parameter_name"][:]]
sk = float(ds["log_sensitivity"][ids.index("so2_loss")])
sK = float(ds["parameter_log_sensitivity"][names.index("K (whole profile)")])
sb = float(ds["parameter_log_sensitivity"][names.index("SO2 bottom mixing_ratio")])
print(f"column:          model {Gm:.6e}  closed form {G:.6e}  rel. diff. {abs(Gm / G - 1):.2e}")
print(f"d ln G / d ln k: adjoint {sk:.6f}  closed form {dlnk:.6f}  rel. diff. {abs(sk / dlnk - 1):.2e}")
print(f"d ln G / d ln K: adjoint {sK:.6f}  closed form {dlnK:.6f}  rel. diff. {abs(sK / dlnK - 1):.2e}")
print(f"d ln G / d ln f_b: adjoint {sb:.12f}  closed form 1")
# 400 cells, second-order finite volumes: the discrete column is within ~1e-5 of the
# continuum; 1e-4 fails for a first-order boundary flux (README "Validation").
assert abs(Gm / G - 1) < 1e-4
assert abs(sk / dlnk - 1) < 1e-4 and abs(sK / dlnK - 1) < 1e-4
assert abs(sb - 1) < 1e-8
print("ok")
