"""Compares two sweep files variable by variable (issue 17: a resumed sweep, and pieces
merged, give the file of one uninterrupted run).

Every variable of either file must be in both with the same dimensions. Strings and
flags, counts and coordinates must be equal; the scores (chi2_*, model_at_observation) and
the mole fractions agree to 1e-10 relative (issue 17's acceptance): a variant solved again
from another start (cold after a resume, or warm from another neighbour in another piece)
is converged by Newton's method far below that (measured: 3e-13 for the mole fractions).
Excepted, as provenance or timing of the solve rather than results: variant_wall_time,
variant_rank_of_process, variant_warm_started, variant_iterations, variant_residual (the
last two follow the start each variant had). Global attributes compared:
colchem_sweep_status and colchem_sweep_definition_hash.

usage: compare_sweep_files.py A.nc B.nc
"""
import sys

import netCDF4
import numpy as np

EXCEPT = {"variant_wall_time", "variant_rank_of_process", "variant_warm_started",
          "variant_iterations", "variant_residual"}
SCORES = {"chi2_log", "chi2_linear", "reduced_chi2_log", "reduced_chi2_linear",
          "model_at_observation"}


def main():
    a_path, b_path = sys.argv[1], sys.argv[2]
    a, b = netCDF4.Dataset(a_path), netCDF4.Dataset(b_path)
    for att in ("colchem_sweep_status", "colchem_sweep_definition_hash"):
        assert a.getncattr(att) == b.getncattr(att), (att, a.getncattr(att), b.getncattr(att))
    assert set(a.variables) == set(b.variables), set(a.variables) ^ set(b.variables)
    worst = {}
    for name in sorted(a.variables):
        if name in EXCEPT:
            continue
        va, vb = a[name], b[name]
        assert va.dimensions == vb.dimensions, (name, va.dimensions, vb.dimensions)
        if va.dtype == str or vb.dtype == str:
            sa, sb = list(va[:]), list(vb[:])
            assert sa == sb, (name, [x for x in zip(sa, sb) if x[0] != x[1]][:3])
            continue
        xa = np.ma.filled(va[:].astype(float), np.nan)
        xb = np.ma.filled(vb[:].astype(float), np.nan)
        assert xa.shape == xb.shape, (name, xa.shape, xb.shape)
        assert np.array_equal(np.isnan(xa), np.isnan(xb)), (name, "NaN in different places")
        ok = ~np.isnan(xa)
        if name == "variant_ranking":
            # The ranking sorts the scores; variants whose scores tie to 1e-10 may come in
            # either order. Each file's ranking must sort the other file's scores too.
            key = np.ma.filled(a["chi2_log"][:], np.nan).sum(axis=1) if "chi2_log" in a.variables else None
            if key is not None:
                for rank in (xa, xb):
                    order = np.argsort(rank)
                    k = key[order]
                    k = k[~np.isnan(k)]
                    assert np.all(np.diff(k) >= -1e-10 * np.abs(k[1:])), (name, k)
            else:
                assert np.array_equal(xa, xb), name
            continue
        if name in SCORES or name == "mole_fraction":
            rtol = 1e-10
            scale = np.abs(xa[ok])
            rel = np.abs(xa[ok] - xb[ok]) / np.where(scale > 0, scale, 1.0)
            worst[name] = float(rel.max()) if rel.size else 0.0
            assert worst[name] <= rtol, (name, worst[name], rtol)
        else:
            assert np.array_equal(xa[ok], xb[ok]), (name, xa[ok][xa[ok] != xb[ok]][:3])
    print(f"ok: {a_path} and {b_path} agree in every variable; largest relative differences: "
          + ", ".join(f"{k} {v:.1e}" for k, v in sorted(worst.items())))


main()
