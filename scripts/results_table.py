#!/usr/bin/env python3
"""Prints the README's "Results on Pyrene" table from a sweep file written by the demo:
SO2 mole fraction (log-linear interpolation) at given altitudes and chi2_log per scored
species, one row per variant, as Markdown.

    scripts/results_table.py out/pyrene_demo.nc [--altitudes 70 80 90 100 110]
    scripts/results_table.py out/pyrene_demo.nc --check-readme README.md   # exit 1 on drift
    scripts/results_table.py out/pyrene_demo.nc --write-readme README.md   # rewrite the block

The README holds the table between the markers <!-- results-pyrene --> and
<!-- /results-pyrene -->; the test cli.readme_results runs the demo's sweep and
--check-readme, so the README cannot drift from the code.
"""
import argparse
import difflib
import os
import re
import sys

import netCDF4
import numpy as np

MARK = re.compile(r"(<!-- results-pyrene -->\n)(.*?)(<!-- /results-pyrene -->)", re.S)


def table(path, species_name, altitudes):
    ds = netCDF4.Dataset(path)
    species = [str(s) for s in ds["species_name"][:]]
    k = species.index(species_name)
    z = np.asarray(ds["altitude"][:], dtype=float)
    labels = [str(s) for s in ds["variant_label"][:]]
    scored = [str(s) for s in ds["score_species"][:]]
    chi2 = np.ma.filled(ds["chi2_log"][:], np.nan)
    mf = np.ma.filled(ds["mole_fraction"][:], np.nan)
    out = [f"Grid: {len(z)} cells, {z[0] - (z[1] - z[0]) / 2:g}-{z[-1] + (z[1] - z[0]) / 2:g} km.", ""]
    head = [f"{x:g} km" for x in altitudes] + [f"chi2_log {s}" for s in scored]
    out.append("| variant | " + " | ".join(head) + " |")
    out.append("|---" * (len(head) + 1) + "|")
    for v, label in enumerate(labels):
        prof = np.exp(np.interp(altitudes, z, np.log(mf[v, k])))
        cells = [f"{x:.2g}" for x in prof] + [f"{c:.1f}" for c in chi2[v]]
        out.append(f"| {label} | " + " | ".join(cells) + " |")
    return "\n".join(out) + "\n"


def main():
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("sweep_file")
    ap.add_argument("--species", default="SO2")
    ap.add_argument("--altitudes", type=float, nargs="+", default=[70, 80, 90, 100, 110])
    ap.add_argument("--check-readme", metavar="README", help="exit 1 if README's block differs")
    ap.add_argument("--write-readme", metavar="README", help="rewrite README's block")
    a = ap.parse_args()
    text = table(a.sweep_file, a.species, a.altitudes)
    readme = a.check_readme or a.write_readme
    if not readme:
        sys.stdout.write(text)
        return 0
    doc = open(readme).read()
    m = MARK.search(doc)
    if not m:
        print(f"{readme}: no <!-- results-pyrene --> ... <!-- /results-pyrene --> block")
        return 2
    if a.write_readme:
        new = doc[: m.start(2)] + text + doc[m.end(2):]
        open(readme + ".tmp", "w").write(new)
        os.replace(readme + ".tmp", readme)
        print(f"{readme}: results table rewritten")
        return 0
    if m.group(2) == text:
        print(f"ok: {readme}'s results table matches {a.sweep_file}")
        return 0
    sys.stdout.writelines(difflib.unified_diff(m.group(2).splitlines(True), text.splitlines(True),
                                               "README (stale)", "from the current code"))
    print(f"FAIL: {readme}'s results table drifted; rerun the demo and "
          f"scripts/results_table.py {a.sweep_file} --write-readme {readme}")
    return 1


if __name__ == "__main__":
    sys.exit(main())
