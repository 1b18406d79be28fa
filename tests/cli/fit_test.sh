#!/usr/bin/env bash
# `colchem fit` on the closed-form linear column (tests/cli/ensemble/linear_loss.yaml: one
# trace gas, first-order loss k, fixed bottom mixing ratio f0; K f'' - (K/H) f' - k f = 0).
# 1. The chi-square gradient of the fit's Jacobian, 2 J^T r (forward sensitivities), against
#    central finite differences of the full nonlinear steady solve, for the two fitted
#    parameters (ln f0, ln kscale) and for a K scaling in a band: 1e-4 relative (common
#    practice, no source; the same as the adjoint's).
#    The same on Pyrene (configs/pyrene_full.yaml, 54 cells; photolysis couples every cell
#    to the absorbers above) for the SO2 bottom mixing ratio and K in one band, 58-72 km
#    (each component costs five solves at a scaled residual of 1e-14, about 1.5 s each). K
#    at 72-90 km, 1/500 of the largest component, was dropped: its finite difference's own
#    error estimate, 6e-4 of it, left the comparison no power beyond the linear column's
#    check of a K band; a third band, K at 90-112 km, added 8 s and no other kind of
#    parameter.
# 2. A twin experiment (issue 14): observations made by the model itself at known values
#    (f0 = 2e-6, kscale = 0.5) at 1-10 km, times exp(e), e ~ N(0, 0.1^2) (seeded), with the
#    stated one-sigma 0.1 f_o: in the log-space chi-square each residual is then exactly
#    (ln f_m - ln f_o)/0.1, Gaussian of unit variance at the truth. Every parameter within 2
#    reported sigma of its true value in >= 9 of the first 10 realisations, and the reported
#    sigma (in ln p) within 30 % of the scatter (sample standard deviation) of the
#    estimates. Issue 14 asked for that over 20 realisations; the sample standard deviation
#    of 20 has a relative standard error of 1/sqrt(2 x 19) = 16 %, so a correct sigma fails
#    a 30 % band by chance about one time in ten (the first seed tried, 20261203, gave 1.325
#    for ln f0 over 20, while 150 realisations of another seed gave 1.09 and 1.08). The
#    assertion is therefore on 60 realisations (standard error 9 %); the ratio over the
#    first 20 is printed beside it. ln f_m is exactly linear in ln f0 (f is proportional to f0), and the
#    Gauss-Newton covariance (J^T J)^-1 is then that of a linear least-squares estimate
#    (Press et al., Numerical Recipes, 3rd ed., section 15.4); for ln kscale to first order.
# The fourth argument picks one part (linear_check, pyrene_check, twin; CTest runs each as its
# own test, in parallel); without it every part runs.
set -eu
colchem=$1; root=$2; work=$3; only=${4:-}
mkdir -p "$work"; cd "$work"
part() { [ -z "$only" ] || [ "$only" = "$1" ]; }
cfg=$root/tests/cli/ensemble/linear_loss.yaml
cp "$root/tests/cli/ensemble/linear_loss_mechanism.yaml" .
f0=species.SO.bottom.mixing_ratio:1e-8:1e-4:log
ks=chemistry.parameters.kscale:0.01:100:log

# 1. Gradient checks.
if part linear_check; then
"$colchem" --log-level warn fit "$cfg" -p "$f0" -p "$ks" -p "atmosphere.eddy_diffusion[0-6]:0.1:10:log" \
  --check --max-iterations 1 -o check.nc > check.log 2>&1 || true
cat check.log
grep -q "worst relative difference" check.log || exit 1
/usr/bin/python3 - <<'PY'
import re
text = open("check.log").read().split("worst relative difference")[0]
rows = [l for l in text.splitlines() if re.match(r"^(species|chemistry|atmosphere)\S*\s+-?[0-9]", l)]
assert len(rows) == 3, rows
for l in rows:
    rel = float(l.split()[3])
    assert rel <= 1e-4, l
print("ok: gradient of chi2 from the forward-sensitivity Jacobian within 1e-4 of finite differences")
PY
fi
if part pyrene_check; then
"$colchem" --log-level warn fit "$root/configs/pyrene_full.yaml" \
  --observations "$root/profiles/observed/pyrene_so2_invented.csv" \
  -p species.SO2.bottom.mixing_ratio:1e-8:1e-4:log -p "atmosphere.eddy_diffusion[58-71.9]:0.1:10:log" \
  --check --max-iterations 0 -o pyrene_check.nc > pyrene_check.log 2>&1 || true
cat pyrene_check.log
/usr/bin/python3 - <<'PY'
import re
# The check's table comes first; the fit's table (max-iterations 0) follows it.
text = open("pyrene_check.log").read().split("worst relative difference")[0]
rows = [l for l in text.splitlines() if re.match(r"^(species|atmosphere)\S*\s+-?[0-9]", l)]
assert len(rows) == 2, rows
# Each component within 1e-4 of finite differences plus twice the finite difference's own
# error estimate (Richardson truncation |fd(h) - fd(2h)|/3 plus the steady solves' noise / h,
# printed as "fd error"; the command's own rule). The estimate must be small enough for the
# comparison to mean something: below 1e-5 for both components (measured 1-3e-6).
# --check re-solves to a scaled residual of 1e-14, where the solves' noise is below the
# truncation term.
g = [float(l.split()[1]) for l in rows]
fd = [float(l.split()[2]) for l in rows]
err = [float(l.split()[4]) for l in rows]
for l, a, b, e in zip(rows, g, fd, err):
    mag = max(abs(a), abs(b))
    assert e <= 1e-5, l
    assert abs(a - b) <= 1e-4 * mag + 2.0 * e * mag, l
print("ok: Pyrene gradient of chi2 within 1e-4 of finite differences plus their error estimates")
PY
fi

# 2. The twin experiment.
part twin || exit 0
"$colchem" --log-level warn run "$cfg" --set species.SO.bottom.mixing_ratio=2e-6 \
  --set chemistry.parameters.kscale=0.5 -o truth.nc
/usr/bin/python3 - "$colchem" "$cfg" "$f0" "$ks" <<'PY'
import subprocess, sys
import numpy as np
import netCDF4
colchem, cfg, f0spec, ksspec = sys.argv[1:5]
ds = netCDF4.Dataset("truth.nc")
names = [str(s) for s in ds["species_name"][:]]
z = np.asarray(ds["altitude"][:], dtype=float)
if ds["altitude"].units == "m": z = z / 1e3
f = np.asarray(ds["mole_fraction"][names.index("SO"), :], dtype=float)
alt = np.arange(1.0, 10.5, 1.0)
# The model's own interpolation: linear in altitude and ln f (analysis/score.hpp).
ftrue = np.exp(np.interp(alt, z, np.log(f)))
rng = np.random.default_rng(20261203)
sigma_rel = 0.1
truth = {"f0": np.log(2e-6), "kscale": np.log(0.5)}
est = {"f0": [], "kscale": []}
sig = {"f0": [], "kscale": []}
for n in range(60):
    obs = ftrue * np.exp(sigma_rel * rng.standard_normal(alt.size))
    with open(f"obs{n}.csv", "w") as out:
        out.write("# INVENTED twin-experiment observations (tests/cli/fit_test.sh)\n")
        out.write("altitude [km], species, value [1], uncertainty [1], upper_limit\n")
        for a, v in zip(alt, obs):
            out.write(f"{a:g}, SO, {v:.17g}, {sigma_rel * v:.17g}, 0\n")
    p = subprocess.run([colchem, "--log-level", "warn", "fit", cfg, "-p", f0spec, "-p", ksspec,
                        "--observations", f"obs{n}.csv", "-o", f"fit{n}.nc"],
                       capture_output=True, text=True)
    assert p.returncode == 0, p.stdout + p.stderr
    r = netCDF4.Dataset(f"fit{n}.nc")
    val = np.asarray(r["parameter_value"][:]); su = np.asarray(r["parameter_sigma_fitted"][:])
    assert not np.any(np.asarray(r["parameter_at_bound"][:])), "a bound binds"
    for k, key in enumerate(("f0", "kscale")):
        est[key].append(np.log(val[k])); sig[key].append(su[k])
for key in ("f0", "kscale"):
    e, s = np.array(est[key]), np.array(sig[key])
    inside = int(np.sum(np.abs(e[:10] - truth[key]) <= 2 * s[:10]))
    scatter = e.std(ddof=1)
    ratio = s.mean() / scatter
    ratio20 = s[:20].mean() / e[:20].std(ddof=1)
    print(f"{key}: within 2 sigma in {inside}/10; reported sigma(ln p) {s.mean():.4f}, "
          f"scatter of 60 estimates {scatter:.4f}, ratio {ratio:.3f} (first 20: {ratio20:.3f})")
    assert inside >= 9, key
    assert abs(ratio - 1) <= 0.3, key
print("ok: twin experiment")
PY
