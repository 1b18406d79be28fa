#!/usr/bin/env bash
# `colchem fit --module-set`: the comparison of candidate sources picks the module set that
# generated the data (issue 14), on one rank and on two.
#
# World: the closed-form linear column (tests/cli/ensemble/linear_loss.yaml) with two
# alternative candidate sources of SO (tests/cli/fit_compare/sources_mechanism.yaml, all
# invented): `uniform_source`, the same production per molecule of air at every altitude,
# and `low_source`, production falling with the air density (scale height 8.2 km). Above
# the 1.4 km boundary layer the mixing ratio is the local source over the loss frequency,
# so the two shapes differ by a factor exp(29/8.2) = 34 between 1 and 30 km, far beyond
# the noise.
#
# Twin experiment: observations made by the model with one module set at known values
# (f0 = 2e-6, kscale = 0.5 and that source's scale 2) at 1-30 km every km, times exp(e),
# e ~ N(0, 0.1^2) (seeded), stated one-sigma 0.1 f_o (INVENTED data, as in
# tests/cli/fit_test.sh). Three sets are fitted with the same nuisance parameters (ln f0,
# ln kscale): base (loss only, k = 2), uniform (plus ln uniform_scale, k = 3) and low (plus
# ln low_scale, k = 3). Both directions are run (low generating, then uniform generating),
# so a comparison that always preferred one shape would fail one of them.
#
# Check: the generating set ranks first by AIC = chi2_min + 2k (Akaike 1974, IEEE Trans.
# Autom. Control 19, 716) and by BIC = chi2_min + k ln N (Schwarz 1978, Ann. Stat. 6, 461)
# in at least 9 of 10 noise realisations for each direction; dAIC, dBIC and Akaike weights
# of every set are printed. Why 9 of 10 and not 10 of 10: the issue's own twin criterion is
# 9 of 10, and a selection rule by AIC is not certain even when the truth is among the
# candidates: a competitor that can mimic the truth (here the uniform set's k is the same,
# and base is nested in both at a vanishing source) wins whenever noise alone lowers its
# chi2_min enough: for two nested sets one parameter apart the drop in chi2_min is chi2_1
# distributed when the smaller set is true (Wilks 1938, Ann. Math. Stat. 9, 60), so AIC
# prefers the unneeded parameter with probability P(chi2_1 > 2) = 0.157 (analytic). With
# the sources resolvable the measured margin is far larger (printed: smallest dAIC of the runner-up), so one miss
# in ten is what the criterion leaves for chance, not slack for a wrong answer: a source of
# the wrong shape, residuals scored wrongly or sets confused with one another fail it. The
# printed AIC, BIC and Akaike weights are recomputed from chi2_min, k and N by the
# definitions above (weight w_i = exp(-dAIC_i/2) / sum_j exp(-dAIC_j/2); Burnham and
# Anderson 2002, Model Selection and Multimodel Inference, 2nd ed., chapter 2, from
# memory), to the printed precision.
#
# MPI: realisation 0 of each direction again under `mpirun -n 2` (the sets distributed over
# the ranks as a sweep's variants): every set's chi2_min and best-fit values equal the
# one-rank run to 1e-12 relative, and rank 1 fitted at least one set.
set -eu
colchem=$1; root=$2; work=$3
mkdir -p "$work"; cd "$work"
export OMPI_ALLOW_RUN_AS_ROOT=1 OMPI_ALLOW_RUN_AS_ROOT_CONFIRM=1
cfg=$root/tests/cli/fit_compare/sources.yaml
for gen in low uniform; do
  "$colchem" --log-level warn run "$cfg" --set "chemistry.modules=[loss, ${gen}_source]" \
    --set species.SO.bottom.mixing_ratio=2e-6 --set chemistry.parameters.kscale=0.5 \
    --set "chemistry.parameters.${gen}_scale=2" -o "truth_$gen.nc"
done
/usr/bin/python3 - "$colchem" "$cfg" <<'PY'
import math, os, re, subprocess, sys
import numpy as np
import netCDF4
colchem, cfg = sys.argv[1:3]
sets = ["base", "uniform", "low"]
fit = [colchem, "--log-level", "info", "fit", cfg,
       "-p", "species.SO.bottom.mixing_ratio:1e-8:1e-4:log",
       "-p", "chemistry.parameters.kscale:0.01:100:log",
       "--module-set", "base=loss", "--module-set", "uniform=loss,uniform_source",
       "--module-set", "low=loss,low_source",
       "--module-param", "uniform=chemistry.parameters.uniform_scale:0.01:100:log",
       "--module-param", "low=chemistry.parameters.low_scale:0.01:100:log"]
alt = np.arange(1.0, 30.5, 1.0)
sigma_rel = 0.1

def table(text):
    """The ranking table: label -> (rank, chi2_min, k, N, dAIC, dBIC, weight, status)."""
    rows = {}
    body = text.split("module sets ranked by AIC")[1].splitlines()[2:]
    for line in body:
        f = line.split()
        if len(f) < 11 or f[1] not in sets: continue
        rows[f[1]] = dict(rank=int(f[0]), chi2=float(f[2]), k=int(f[3]), N=int(f[4]),
                          aic=float(f[5]), daic=float(f[6]), bic=float(f[7]), dbic=float(f[8]),
                          w=float(f[9]), status=" ".join(f[10:]))
    assert sorted(rows) == sorted(sets), text
    return rows

def fitted(stem):
    out = {}
    for s in sets:
        d = netCDF4.Dataset(f"{stem}.{s}.nc")
        out[s] = (float(d.getncattr("colchem_fit_chi2")), np.asarray(d["parameter_value"][:], float))
        d.close()
    return out

seed = {"low": 20261204, "uniform": 20261205}
for gen in ("low", "uniform"):
    ds = netCDF4.Dataset(f"truth_{gen}.nc")
    names = [str(s) for s in ds["species_name"][:]]
    z = np.asarray(ds["altitude"][:], dtype=float)
    if ds["altitude"].units == "m": z = z / 1e3
    f = np.asarray(ds["mole_fraction"][names.index("SO"), :], dtype=float)
    ftrue = np.exp(np.interp(alt, z, np.log(f)))  # the model's interpolation (analysis/score.hpp)
    rng = np.random.default_rng(seed[gen])
    wins_aic = wins_bic = 0
    margins = []
    for n in range(10):
        obs = ftrue * np.exp(sigma_rel * rng.standard_normal(alt.size))
        name = f"obs_{gen}{n}.csv"
        with open(name, "w") as out:
            out.write("# INVENTED twin-experiment observations (tests/cli/fit_compare_test.sh)\n")
            out.write("altitude [km], species, value [1], uncertainty [1], upper_limit\n")
            for a, v in zip(alt, obs):
                out.write(f"{a:g}, SO, {v:.17g}, {sigma_rel * v:.17g}, 0\n")
        p = subprocess.run(fit + ["--observations", name, "-o", f"cmp_{gen}{n}.nc"],
                           capture_output=True, text=True)
        if n == 0: print(p.stdout)
        t = table(p.stdout)
        for s in ("uniform", "low"):
            assert t[s]["status"] == "converged", (gen, n, s, p.stdout + p.stderr)
        assert t["base"]["k"] == 2 and t["uniform"]["k"] == 3 and t["low"]["k"] == 3, t
        assert all(r["N"] == alt.size for r in t.values()), t
        # The criteria by their definitions (analytic), to the table's printed precision.
        a = {s: t[s]["chi2"] + 2 * t[s]["k"] for s in sets}
        b = {s: t[s]["chi2"] + t[s]["k"] * math.log(t[s]["N"]) for s in sets}
        wsum = sum(math.exp(-(a[s] - min(a.values())) / 2) for s in sets)
        for s in sets:
            assert math.isclose(t[s]["aic"], a[s], rel_tol=2e-6, abs_tol=2e-3), (s, t[s], a[s])
            assert math.isclose(t[s]["bic"], b[s], rel_tol=2e-6, abs_tol=2e-3), (s, t[s], b[s])
            assert abs(t[s]["daic"] - (a[s] - min(a.values()))) <= 2e-3 * max(1, a[s]), (s, t[s])
            assert abs(t[s]["dbic"] - (b[s] - min(b.values()))) <= 2e-3 * max(1, b[s]), (s, t[s])
            w = math.exp(-(a[s] - min(a.values())) / 2) / wsum
            assert abs(t[s]["w"] - w) <= 1e-4, (s, t[s]["w"], w)
        best_aic = min(t, key=lambda s: t[s]["aic"]); best_bic = min(t, key=lambda s: t[s]["bic"])
        wins_aic += best_aic == gen; wins_bic += best_bic == gen
        runner_up = min(t[s]["daic"] for s in sets if s != gen) if best_aic == gen else -t[gen]["daic"]
        margins.append(runner_up)
        print(f"{gen} generating, realisation {n}: " + "; ".join(
            f"{s} chi2_min {t[s]['chi2']:.2f} dAIC {t[s]['daic']:.2f} dBIC {t[s]['dbic']:.2f} "
            f"weight {t[s]['w']:.3g}" for s in sets))
        if n == 0:
            # The same comparison on two MPI ranks: identical results set by set.
            q = subprocess.run(["mpirun", "-n", "2", "--oversubscribe"] + fit +
                               ["--observations", name, "-o", f"mpi_{gen}.nc"],
                               capture_output=True, text=True)
            assert q.returncode == p.returncode, (q.returncode, p.returncode, q.stdout + q.stderr)
            assert re.search(r"module set \S+ \(\d/3\) on rank 1", q.stdout + q.stderr), \
                "rank 1 fitted no set:\n" + q.stdout + q.stderr
            one, two = fitted(f"cmp_{gen}{n}"), fitted(f"mpi_{gen}")
            worst = 0.0
            for s in sets:
                c1, v1 = one[s]; c2, v2 = two[s]
                worst = max(worst, abs(c1 - c2) / abs(c1), float(np.max(np.abs(v1 - v2) / np.abs(v1))))
            assert worst <= 1e-12, (gen, worst)
            assert table(q.stdout) == t, (table(q.stdout), t)
            print(f"ok: {gen} generating, 1 and 2 ranks agree to {worst:.1e} relative "
                  "(chi2_min and best-fit values of every set)")
    print(f"{gen} generating: first by AIC in {wins_aic}/10, by BIC in {wins_bic}/10; "
          f"smallest dAIC of the runner-up {min(margins):.2f}")
    assert wins_aic >= 9 and wins_bic >= 9, gen
print("ok: the comparison picks the generating module set")
PY

# A held profile's multiplier (`fit -p species.NAME.hold`): SO held at 1e-7 between 20 and
# 30 km (relaxation time 1e3 s against the loss's 1e4 s); observations made by the model
# with the held mixing ratio doubled, without noise (stated sigma 0.1 f_o). The gradient of
# the fit's Jacobian (exact dF/du) agrees with central finite differences of the full steady
# solve (--check, 1e-4 relative plus twice the finite difference's error estimate: the
# command's own rule, exit 1 otherwise), and the fit recovers the multiplier 2: with
# noise-free data chi2 is 0 at the truth (analytic), found to 1e-6 relative.
hold="species.SO.hold={mixing_ratio: 1.0e-7, from: 20 km, to: 30 km, timescale: 1.0e3 s}"
hold2="species.SO.hold={mixing_ratio: 2.0e-7, from: 20 km, to: 30 km, timescale: 1.0e3 s}"
"$colchem" --log-level warn run "$cfg" --set "$hold2" -o truth_held.nc
/usr/bin/python3 - <<'PY'
import numpy as np, netCDF4
ds = netCDF4.Dataset("truth_held.nc")
names = [str(s) for s in ds["species_name"][:]]
z = np.asarray(ds["altitude"][:], dtype=float)
if ds["altitude"].units == "m": z = z / 1e3
f = np.asarray(ds["mole_fraction"][names.index("SO"), :], dtype=float)
alt = np.arange(12.0, 38.5, 2.0)
obs = np.exp(np.interp(alt, z, np.log(f)))
with open("obs_held.csv", "w") as out:
    out.write("# INVENTED noise-free twin observations (tests/cli/fit_compare_test.sh)\n")
    out.write("altitude [km], species, value [1], uncertainty [1], upper_limit\n")
    for a, v in zip(alt, obs):
        out.write(f"{a:g}, SO, {v:.17g}, {0.1 * v:.17g}, 0\n")
PY
"$colchem" --log-level warn fit "$cfg" --set "$hold" -p "species.SO.hold:0.1:10:log" \
  -p species.SO.bottom.mixing_ratio:1e-8:1e-4:log --observations obs_held.csv --check \
  -o held.nc > held.log 2>&1 || { cat held.log; exit 1; }
cat held.log
/usr/bin/python3 - <<'PY'
import netCDF4, numpy as np
ds = netCDF4.Dataset("held.nc")
v = np.asarray(ds["parameter_value"][:], float)
assert abs(v[0] / 2.0 - 1) <= 1e-6, v
assert abs(v[1] / 1e-6 - 1) <= 1e-6, v
print(f"ok: held-profile multiplier recovered: {v[0]:.9g} (truth 2), bottom value {v[1]:.9g} (truth 1e-6)")
PY
