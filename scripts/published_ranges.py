#!/usr/bin/env python3
"""Checks a Pyrene run file against the published ranges for Venus-like middle atmospheres
(each recalled, "from memory"; Pyrene is fictional, the comparison says only whether the
network behaves like those of published CO2 worlds). Prints a Markdown table with, per
quantity, the factor by which the value lies outside its range (1 inside); exit 0.

    scripts/published_ranges.py out/pyrene.nc [--json] [--explain]

Quantities, all from the run file alone (altitude, number_density, mole_fraction,
reaction_rate, net_stoichiometry):
  SO/SO2 90-100 km   mean of the cell ratios n_SO/n_SO2 with 90 <= z <= 100 km
  O2 column          sum of n_O2 dz over the whole column (cm-2)
  OCS at 65 km       mole fraction, log-linear interpolation in altitude
  H2SO4 production   column of the gross chemical production of H2SO4 (sum over the
                     reactions that make it, net stoichiometry > 0, of rate x dz; cm-2 s-1);
                     the exchange with the condensed phase is not chemistry and is left out

--explain prints, from the same file, the numbers each miss rests on: production and loss of
the species concerned by reaction (rate x net stoichiometry, shares in %), the SO/SO2
photochemical-equilibrium ratio J_SO2 / (k[O][M]), the O2 null cycle through ClOO, the OCS
e-folding length above the cloud tops, and the H2SO4 production against the column input of
H and S through the boundaries (element_boundary_in). With --json the explanation is
included under "explain" (shares as fractions; tests/cli/published_ranges_test.sh checks it).
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
    species = [str(s) for s in ds["species_name"][:]]
    to_km = {"cm": 1e-5, "m": 1e-3, "km": 1.0}[ds["altitude"].units]
    z = np.asarray(ds["altitude"][:], dtype=float) * to_km
    dz_cm = np.diff(np.asarray(ds["altitude_edge"][:], dtype=float)) * to_km * 1e5
    n = np.asarray(ds["number_density"][:], dtype=float)          # species x altitude
    x = np.asarray(ds["mole_fraction"][:], dtype=float)
    rate = np.asarray(ds["reaction_rate"][:], dtype=float)        # reaction x altitude
    stoich = np.asarray(ds["net_stoichiometry"][:], dtype=float)  # reaction x species
    eqs = [str(e) for e in ds["reaction_equation"][:]]
    k = {s: i for i, s in enumerate(species)}
    ds.close()
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


def _load(path):
    ds = netCDF4.Dataset(path)
    to_km = {"cm": 1e-5, "m": 1e-3, "km": 1.0}[ds["altitude"].units]
    d = {
        "species": [str(s) for s in ds["species_name"][:]],
        "z": np.asarray(ds["altitude"][:], dtype=float) * to_km,
        "dz": np.diff(np.asarray(ds["altitude_edge"][:], dtype=float)) * to_km * 1e5,
        "n": np.asarray(ds["number_density"][:], dtype=float),
        "x": np.asarray(ds["mole_fraction"][:], dtype=float),
        "M": np.asarray(ds["air_number_density"][:], dtype=float),
        "rate": np.asarray(ds["reaction_rate"][:], dtype=float),
        "stoich": np.asarray(ds["net_stoichiometry"][:], dtype=float),
        "eqs": [str(e) for e in ds["reaction_equation"][:]],
        "chem": np.asarray(ds["chemical_tendency"][:], dtype=float),
        "transport": np.asarray(ds["transport_tendency"][:], dtype=float),
        "elements": [str(e) for e in ds["element_name"][:]],
        "element_in": np.asarray(ds["element_boundary_in"][:], dtype=float),
        "element_condensed": np.asarray(ds["element_condensed"][:], dtype=float),
        "J_SO2": np.asarray(ds["J_SO2_SO_O"][:], dtype=float),
        "bottom_flux": np.asarray(ds["bottom_flux"][:], dtype=float),
    }
    ds.close()  # closed here, not at interpreter exit (a crash there with two files open)
    d["k"] = {s: i for i, s in enumerate(d["species"])}
    return d


def budget(d, sp, weights):
    """Production and loss of species sp by reaction, summed over cells with the given weights
    (dz for a column in cm-2 s-1, a 0/1 mask for cm-3 s-1 at a cell). Returns (production,
    loss) dicts equation -> rate (both positive) and the matching sum of chemical_tendency."""
    i = d["k"][sp]
    per = d["stoich"][:, i][:, None] * d["rate"]              # reaction x altitude
    col = per @ weights
    prod = {d["eqs"][r]: float(v) for r, v in enumerate(col) if v > 0}
    loss = {d["eqs"][r]: float(-v) for r, v in enumerate(col) if v < 0}
    return prod, loss, float(d["chem"][i] @ weights)


def shares(terms):
    tot = sum(terms.values())
    return {e: v / tot for e, v in sorted(terms.items(), key=lambda t: -t[1])}, tot


def explain(path):
    d = _load(path)
    z, n, x, k = d["z"], d["n"], d["x"], d["k"]
    ex = {}
    # SO/SO2 at 90-100 km: the cell nearest 95 km, and the equilibrium ratio in the band.
    j = int(np.argmin(abs(z - 95.0)))
    cell = np.zeros_like(z)
    cell[j] = 1.0
    p, l, tend = budget(d, "SO2", cell)
    ps, pt = shares(p)
    ls, lt = shares(l)
    r_so_o = d["eqs"].index("SO + O + M -> SO2 + M")
    band = (z >= 90.0) & (z <= 100.0)
    k_o_m = d["rate"][r_so_o] / n[k["SO"]]                    # k[O][M], s-1
    eq_ratio = float(np.mean(d["J_SO2"][band] / k_o_m[band]))
    model = float(np.mean(n[k["SO"], band] / n[k["SO2"], band]))
    ex["so_so2"] = {
        "z_km": float(z[j]), "production": ps, "production_total": pt, "loss": ls,
        "loss_total": lt, "chemical_tendency": tend,
        "transport_tendency": float(d["transport"][k["SO2"], j]),
        "J_SO2": float(d["J_SO2"][j]), "k_O_M": float(k_o_m[j]),
        "equilibrium_ratio_90_100": eq_ratio, "model_ratio_90_100": model,
        "factor_to_0.3": model / 0.3, "factor_to_0.1": model / 0.1}
    # O2 column.
    p, l, tend = budget(d, "O2", d["dz"])
    ps, pt = shares(p)
    ls, lt = shares(l)
    jm = int(np.argmax(x[k["O2"]]))
    fwd, back = "Cl + O2 + M -> ClOO + M", "ClOO + M -> Cl + O2 + M"
    ex["o2"] = {"production": ps, "production_total": pt, "loss": ls, "loss_total": lt,
                "chemical_tendency": tend, "peak_mole_fraction": float(x[k["O2"], jm]),
                "peak_z_km": float(z[jm]),
                "mole_fraction_70_km": float(math.exp(np.interp(70.0, z, np.log(x[k["O2"]])))),
                "null_cycle_production_share": ps.get(back, 0.0),
                "null_cycle_loss_share": ls.get(fwd, 0.0),
                "net_production_without_null_cycle":
                    (pt - p.get(back, 0.0)) - (lt - l.get(fwd, 0.0))}
    # OCS at 60-66 km.
    w = d["dz"] * ((z >= 60.0) & (z <= 66.0))
    p, l, tend = budget(d, "OCS", w)
    ps, pt = shares(p)
    ls, lt = shares(l)
    lnx = np.log(x[k["OCS"]])
    at = {f"{h:g}": float(math.exp(np.interp(h, z, lnx)))
          for h in (60.0, 62.0, 64.0, 65.0, 66.0, 68.0)}
    def efold(a, b):
        return float(-(b - a) / (np.interp(b, z, lnx) - np.interp(a, z, lnx)))
    under = z <= 65.0
    ex["ocs"] = {"production": ps, "production_total": pt, "loss": ls, "loss_total": lt,
                 "chemical_tendency": tend, "bottom_cell": float(x[k["OCS"], 0]),
                 "bottom_z_km": float(z[0]), "mole_fraction_at_km": at,
                 "efolding_62_64_km": efold(62.0, 64.0), "efolding_64_66_km": efold(64.0, 66.0),
                 "ClCO_S_share": ps.get("ClCO + S -> OCS + Cl", 0.0),
                 "ClCO_max_below_65": float(np.max(x[k["ClCO"], under]))}
    # H2SO4 production against the column inputs through the boundaries.
    el = {e: i for i, e in enumerate(d["elements"])}
    p, l, tend = budget(d, "H2SO4", d["dz"])
    prod = sum(v for e, v in p.items() if "(condensed phase)" not in e and "supply)" not in e)
    ex["h2so4"] = {"production": prod,
                   "H_in": float(d["element_in"][el["H"]]),
                   "S_in": float(d["element_in"][el["S"]]),
                   "H_condensed": float(d["element_condensed"][el["H"]]),
                   "S_condensed": float(d["element_condensed"][el["S"]]),
                   "H2O_bottom_flux": float(d["bottom_flux"][k["H2O"]]),
                   "SO2_bottom_flux": float(d["bottom_flux"][k["SO2"]]),
                   "H2SO4_limit_from_H": float(d["element_in"][el["H"]]) / 2.0}
    return ex


def _top(sh, tot, m=3, unit="cm-3 s-1"):
    return "; ".join(f"{e} {100 * f:.1f} % ({f * tot:.2g} {unit})" for e, f in list(sh.items())[:m])


def print_explain(ex):
    s = ex["so_so2"]
    print(f"SO/SO2 at {s['z_km']:.1f} km: SO2 production {s['production_total']:.3g} cm-3 s-1: "
          f"{_top(s['production'], s['production_total'])}")
    print(f"  SO2 loss {s['loss_total']:.3g} cm-3 s-1: {_top(s['loss'], s['loss_total'])}; "
          f"transport {s['transport_tendency']:.2g} cm-3 s-1")
    print(f"  J_SO2 {s['J_SO2']:.3g} s-1, k[O][M] (SO + O + M) {s['k_O_M']:.3g} s-1; "
          f"90-100 km mean "
          f"J_SO2/(k[O][M]) {s['equilibrium_ratio_90_100']:.3g} against the model's SO/SO2 "
          f"{s['model_ratio_90_100']:.3g}; 0.1-0.3 needs k[O][M] {s['factor_to_0.3']:.2g}-"
          f"{s['factor_to_0.1']:.2g}x larger or J_SO2 as much smaller")
    o = ex["o2"]
    print(f"O2 column production {o['production_total']:.3g} cm-2 s-1: "
          f"{_top(o['production'], o['production_total'], unit='cm-2 s-1')}")
    print(f"  O2 column loss {o['loss_total']:.3g} cm-2 s-1: "
          f"{_top(o['loss'], o['loss_total'], unit='cm-2 s-1')}")
    print(f"  O2 mole fraction {o['mole_fraction_70_km']:.2g} at 70 km, at most "
          f"{o['peak_mole_fraction']:.3g} (at {o['peak_z_km']:.1f} km); "
          f"null cycle Cl + O2 + M <-> ClOO: {100 * o['null_cycle_production_share']:.1f} % of "
          f"production, {100 * o['null_cycle_loss_share']:.1f} % of loss")
    c = ex["ocs"]
    at = ", ".join(f"{v:.2g} at {h} km" for h, v in c["mole_fraction_at_km"].items())
    print(f"OCS: {c['bottom_cell']:.2g} in the first cell ({c['bottom_z_km']:.1f} km); {at}; "
          f"e-folding length {c['efolding_62_64_km']:.2g} km at 62-64 km, "
          f"{c['efolding_64_66_km']:.2g} km at 64-66 km")
    print(f"  production 60-66 km {c['production_total']:.3g} cm-2 s-1: "
          f"{_top(c['production'], c['production_total'], unit='cm-2 s-1')}")
    print(f"  loss 60-66 km {c['loss_total']:.3g} cm-2 s-1: "
          f"{_top(c['loss'], c['loss_total'], unit='cm-2 s-1')}")
    print(f"  ClCO + S -> OCS + Cl {100 * c['ClCO_S_share']:.2g} % of production; ClCO at most "
          f"{c['ClCO_max_below_65']:.2g} below 65 km")
    h = ex["h2so4"]
    print(f"H2SO4 column production {h['production']:.3g} cm-2 s-1; H input through the boundaries "
          f"{h['H_in']:.3g} cm-2 s-1 (H2O bottom flux {h['H2O_bottom_flux']:.3g}), at most "
          f"{h['H2SO4_limit_from_H']:.3g} H2SO4 cm-2 s-1 if all of it went to H2SO4 "
          f"({100 * h['production'] / h['H2SO4_limit_from_H']:.0f} % used); S input "
          f"{h['S_in']:.3g} cm-2 s-1 (SO2 bottom flux {h['SO2_bottom_flux']:.3g})")


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
    ap.add_argument("--explain", action="store_true",
                    help="also print the budgets each miss rests on (with --json: under 'explain')")
    a = ap.parse_args()
    m = measure(a.run_file)
    if a.json:
        if a.explain:
            m["explain"] = explain(a.run_file)
        print(json.dumps(m))
        return
    print("| quantity | Pyrene | published range (from memory) | met | factor outside |")
    print("|---|---|---|---|---|")
    for key, (lo, hi, src) in RANGES.items():
        v = m[key]
        print(f"| {key} | {v:.3g} | {lo:.3g}-{hi:.3g}: {src} | {'yes' if lo <= v <= hi else 'no'} "
              f"| {factor_outside(v, lo, hi)} |")
    if a.explain:
        print()
        print_explain(explain(a.run_file))


if __name__ == "__main__":
    main()
