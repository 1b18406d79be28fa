#!/usr/bin/env python3
"""Compares a transport validation CSV (numerical, analytic column pairs) and prints the
maximum relative difference per quantity. Usage: compare.py FILE.csv"""
import csv
import sys


def main(path):
    with open(path) as f:
        rows = [r for r in csv.reader(f) if r and not r[0].startswith("#")]
    header = [h.strip() for h in rows[0]]
    data = [[float(x) for x in r] for r in rows[1:]]
    for i in range(1, len(header), 2):
        num = [r[i] for r in data]
        ref = [r[i + 1] for r in data]
        scale = max(abs(x) for x in ref)
        worst = max(abs(a - b) for a, b in zip(num, ref)) / scale
        pointwise = max(abs(a - b) / abs(b) for a, b in zip(num, ref) if b != 0.0)
        print(f"{header[i]}: {len(num)} cells, max |num - analytic| / max|analytic| = {worst:.3e},"
              f" max pointwise relative = {pointwise:.3e}")


if __name__ == "__main__":
    main(sys.argv[1])
