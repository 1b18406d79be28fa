#!/usr/bin/env python3
"""`colchem rates` against published rate constants and the rate-law formulas.

    rates_test.py COLCHEM SOURCE_DIR

1. k(298 K) of seven bimolecular reactions (tests/cli/rates/jpl_checks.yaml) against the
   values the JPL evaluation tabulates beside A and E/R: Publication 19-5 (Burkholder et
   al. 2019), Table 1, from memory. The tabulated k(298) has two significant digits; the
   window is half a unit of its last digit.
2. A "+ M" law that does not fold [M] in is reported termolecular (cm6 s-1) without [M]:
   O + O2 + M, k0 = 6.1e-34 (T/300)^-2.4 (JPL 19-5 Table 2, from memory) at 200 and 298 K,
   1e-4 relative.
3. The JPL fall-off form (JPL 19-5, Section 2, eq. for termolecular reactions; recomputed
   here from the published formula) for OH + NO2 + M at 200 and 298 K, 1 atm and 10 mbar;
   [M] from p = n k T (CODATA 2018 k_B); 1e-4 relative.
4. A scenario's column: O + O3 along configs/pyrene_full.yaml at the cells the CSV names,
   k = 8.0e-12 exp(-2060/T) at the cell's own temperature, 1e-4 relative.
5. Refusals: a pressure without a known pressure unit, and a --reaction that matches
   nothing, exit 2 and name the option.
"""
import csv
import io
import math
import subprocess
import sys

exe, src = sys.argv[1], sys.argv[2]
K_B = 1.380649e-16  # erg K-1 (CODATA 2018, exact)
failures = []


def rows(args):
    out = subprocess.run([exe, "--log-level", "warn", "rates", *args, "--csv", "-"],
                         check=True, capture_output=True, text=True).stdout
    return list(csv.DictReader(io.StringIO(out)))


def near(what, got, want, rel):
    ok = abs(got - want) <= rel * abs(want)
    print(f"{'ok  ' if ok else 'FAIL'} {what}: {got:.5e} vs {want:.5e} (window {rel:.1e})")
    if not ok:
        failures.append(what)


mech = f"{src}/tests/cli/rates/jpl_checks.yaml"
# 1. Published k(298 K), two digits.
k298 = {"O + O3 -> 2 O2": 8.0e-15, "H + O3 -> OH + O2": 2.9e-11,
        "OH + O3 -> HO2 + O2": 7.3e-14, "HO2 + O3 -> OH + 2 O2": 1.9e-15,
        "OH + HO2 -> H2O + O2": 1.1e-10, "Cl + O3 -> ClO + O2": 1.2e-11,
        "OH + H2 -> H2O + H": 6.7e-15}
got = {r["equation"]: r for r in rows(["--mechanism", mech, "-T", "298"])}
for eq, k in k298.items():
    last_digit = 10 ** (math.floor(math.log10(k)) - 1)
    near(f"k(298 K) {eq}", float(got[eq]["k"]), k, 0.5 * last_digit / k)
    if got[eq]["units"] != "cm3 s-1":
        failures.append(f"units of {eq}: {got[eq]['units']}")

# 2 and 3. Termolecular and fall-off laws at two temperatures and two pressures.
table = rows(["--mechanism", mech, "-T", "200", "298", "-p", "1 atm", "10 mbar"])
for r in table:
    T, p_pa = float(r["temperature_K"]), float(r["pressure_Pa"])
    M = p_pa * 10.0 / (K_B * T)
    near(f"[M] at {T} K, {p_pa:g} Pa", float(r["air_density_cm3"]), M, 1e-5)
    if r["equation"] == "O + O2 + M -> O3 + M":
        near(f"k0 O + O2 + M at {T} K", float(r["k"]), 6.1e-34 * (T / 300) ** -2.4, 1e-4)
        if r["units"] != "cm6 s-1":
            failures.append(f"units of O + O2 + M: {r['units']}")
    if r["equation"] == "OH + NO2 + M -> HNO3 + M":
        k0 = 1.8e-30 * (T / 300) ** -3.0
        kinf = 2.8e-11
        x = k0 * M / kinf
        k = k0 * M / (1 + x) * 0.6 ** (1 / (1 + math.log10(x) ** 2))
        near(f"fall-off OH + NO2 + M at {T} K, {p_pa:g} Pa", float(r["k"]), k, 1e-4)

# 4. A scenario's column.
col = rows([f"{src}/configs/pyrene_full.yaml", "--reaction", "O + O3 -> 2 O2", "--all-cells"])
if len(col) < 10:
    failures.append(f"column rows: {len(col)}")
for r in col[:: max(1, len(col) // 6)]:
    T = float(r["temperature_K"])
    near(f"O + O3 at {r['altitude_km']} km ({T} K)", float(r["k"]), 8.0e-12 * math.exp(-2060 / T),
         1e-4)

# 5. Refusals.
for args, code, text in [
    (["--mechanism", mech, "-T", "298", "-p", "1 furlong"], 2, "'--pressure'"),
    (["--mechanism", mech, "-T", "298", "--reaction", "XYZ"], 2, "'--reaction'"),
]:
    p = subprocess.run([exe, "rates", *args], capture_output=True, text=True)
    ok = p.returncode == code and text in p.stderr
    print(f"{'ok  ' if ok else 'FAIL'} refusal {args[-1]}: exit {p.returncode}, {p.stderr.strip()}")
    if not ok:
        failures.append(f"refusal {args}")

if failures:
    print(f"{len(failures)} failed: {failures}")
    sys.exit(1)
print("all rate checks passed")
