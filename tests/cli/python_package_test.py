"""The Python package python/colchem_py on real colchem files: a Pyrene run with the invented
observations, a three-variant Tellin sweep, a box run, a photo run, a sensitivity file, a
four-member ensemble, a three-level resolution study and a one-parameter fit. Checks that
  - unit conversion through pint gives nmol/mol -> 1e-9, ppb -> 1e-9, % -> 1e-2 (SI
    definitions of the prefixes; ppb and % as defined in the UDUNITS-2 database), and an
    observation file in [nmol/mol]/[ppb] reads as the same mole fractions as the shipped one
    in [1] (and scripts/plot_profiles.py accepts it);
  - open_file swaps the names in as coordinates: .sel(species="SO2") equals the file's row
    read with netCDF4 by species_name (exact), reaction/channel/variant likewise;
  - every plot is written as a non-empty PNG, and what it shows is the file's numbers: the
    profile line, the chi2_log in the legend, model/observed in the residual panel, the sweep
    bars, J per channel, the residual history, the budget's transport and net lines and its
    6-decade axis, the background, the ensemble median and the sensitivity bars;
  - the budget's production - loss + transport equals the file's net_tendency (README
    "Budgets": dn/dt = sum_r nu R + T; analytic identity of the model's own terms).
Usage: python_package_test.py COLCHEM SOURCE_DIR WORK_DIR"""
import os
import re
import shutil
import subprocess
import sys

import netCDF4
import numpy as np

colchem, root, work = sys.argv[1], sys.argv[2], sys.argv[3]
sys.path.insert(0, os.path.join(root, "python"))
import colchem_py as cc  # noqa: E402

shutil.rmtree(work, ignore_errors=True)
os.makedirs(work)
os.chdir(work)
env = dict(os.environ, OMPI_ALLOW_RUN_AS_ROOT="1", OMPI_ALLOW_RUN_AS_ROOT_CONFIRM="1")
cfg = os.path.join(root, "configs")
obs_file = os.path.join(root, "profiles", "observed", "pyrene_so2_invented.csv")


def colchem_run(*args):
    r = subprocess.run([colchem, "--log-level", "warn", *args], env=env,
                       stdout=subprocess.PIPE, stderr=subprocess.STDOUT, text=True)
    assert r.returncode == 0, f"colchem {' '.join(args)} exited {r.returncode}:\n{r.stdout[-3000:]}"


colchem_run("run", os.path.join(cfg, "pyrene_full.yaml"), "--set", f"observations={obs_file}",
            "-o", "run.nc")
colchem_run("sweep", os.path.join(root, "tests", "cli", "sweep", "tellin_sweep.yaml"),
            "-o", "sweep.nc", "--set", "modules={base: [base], sulfur: [base, sulfur]}",
            "--set", "parameters={sulfate_removal_scale: [0.5, 2]}")
colchem_run("box", os.path.join(root, "validation", "chem", "box_equilibrium", "box.yaml"),
            "-o", "box.nc")
colchem_run("photo", os.path.join(cfg, "pyrene_full.yaml"), "-o", "photo.nc")
colchem_run("sensitivity", os.path.join(cfg, "pyrene_full.yaml"), "--observations", obs_file,
            "--restart", "run.nc", "-o", "sens.nc")
colchem_run("ensemble", os.path.join(cfg, "pyrene_full.yaml"), "-n", "4", "--seed", "2",
            "--set", f"observations={obs_file}", "--set", "solver.max_iterations=150",
            "-o", "ens.nc")
colchem_run("resolve", os.path.join(cfg, "pyrene_full.yaml"), "--cells", "14", "--levels", "3",
            "-o", "res.nc")
colchem_run("fit", os.path.join(cfg, "pyrene_full.yaml"), "--observations", obs_file,
            "-p", "species.SO2.bottom.mixing_ratio:1e-8:1e-4:log", "-o", "fit.nc")


def raw_names(path, var):
    with netCDF4.Dataset(path) as f:
        return [str(s) for s in f[var][:]]


def raw(path, var):
    with netCDF4.Dataset(path) as f:
        return np.ma.filled(np.ma.asarray(f[var][:], dtype=float), np.nan)


def check_png(path):
    size = os.path.getsize(path)
    with open(path, "rb") as fh:
        assert fh.read(8) == b"\x89PNG\r\n\x1a\n", f"{path} is not a PNG"
    assert size > 5000, f"{path} is too small ({size} bytes)"
    print(f"ok: {path} ({size} bytes)")


def lines(fig):
    return {ln.get_gid(): ln for ax in fig.axes for ln in ax.lines if ln.get_gid()}


# Units: SI prefixes (n = 1e-9) and the UDUNITS-2 database's ppb and percent (analytic).
assert cc.factor("nmol/mol", "1") == 1e-9
assert abs(cc.factor("ppb", "1") - 1e-9) <= 1e-24
assert abs(cc.factor("%", "1") - 1e-2) <= 1e-17
assert abs(cc.factor("ppt", "1") - 1e-12) <= 1e-27, "ppt must be parts per trillion, not pico-pint"
assert abs(cc.factor("cm-3", "m**-3") - 1e6) <= 1e-9
print("ok: pint: nmol/mol, ppb -> 1e-9, % -> 1e-2, ppt -> 1e-12, cm-3 -> 1e6 m-3")

# The shipped observation file rewritten in nmol/mol (value) and ppb (uncertainty).
with open(obs_file) as fh:
    text = fh.read().splitlines()
out = []
for line in text:
    if line.startswith("#") or not line.strip():
        out.append(line)
    elif line.startswith("altitude"):
        assert "value [1], uncertainty [1]" in line, line
        out.append(line.replace("value [1], uncertainty [1]",
                                "value [nmol/mol], uncertainty [ppb]"))
    else:
        c = [x.strip() for x in line.split(",")]
        c[2], c[3] = repr(float(c[2]) * 1e9), repr(float(c[3]) * 1e9)
        out.append(", ".join(c))
with open("obs_nmol.csv", "w") as fh:
    fh.write("\n".join(out) + "\n")
shipped, nmol = cc.read_observations(obs_file), cc.read_observations("obs_nmol.csv")
for k in ("value", "uncertainty", "altitude"):
    assert np.allclose(nmol[k].values, shipped[k].values, rtol=1e-12, atol=0), k
stored = raw("run.nc", "observation_value")
assert np.allclose(np.sort(shipped["value"].values), np.sort(stored), rtol=1e-12, atol=0)
print(f"ok: {nmol.sizes['observation']} observations in nmol/mol and ppb read as the shipped [1] "
      "values and as the run file stores them")
pp = subprocess.run(["/usr/bin/python3", os.path.join(root, "scripts", "plot_profiles.py"),
                     "run.nc", "--species", "SO2", "--obs", "obs_nmol.csv", "--outdir", "pp"],
                    check=True, capture_output=True, text=True).stdout.split()
for p in pp:
    check_png(p)

# open_file: names as coordinates, values unchanged (exact).
run = cc.open_file("run.nc")
names = raw_names("run.nc", "species_name")
mf = raw("run.nc", "mole_fraction")
for sp in ("SO2", "SO", "O2"):
    assert np.array_equal(run.mole_fraction.sel(species=sp).values, mf[names.index(sp)]), sp
assert list(run.reaction.values) == raw_names("run.nc", "reaction_id")
assert list(run.channel.values) == raw_names("run.nc", "channel_name")
assert list(run.species_index.values) == list(range(len(names)))
assert cc.kind(run) == "run"
sweep = cc.open_file("sweep.nc")
assert list(sweep.variant.values) == raw_names("sweep.nc", "variant_label")
assert cc.kind(sweep) == "sweep" and sweep.sizes["variant"] == 3
box = cc.open_file("box.nc")
assert np.issubdtype(box.time.dtype, np.datetime64), box.time.dtype
bnames = raw_names("box.nc", "species_name")
assert np.array_equal(box.mole_fraction.sel(species=bnames[0]).values,
                      raw("box.nc", "mole_fraction")[:, 0])
kinds = {f: cc.kind(cc.open_file(f))
         for f in ("box.nc", "photo.nc", "sens.nc", "ens.nc", "res.nc", "fit.nc")}
assert kinds == {"box.nc": "box", "photo.nc": "photo", "sens.nc": "sensitivity",
                 "ens.nc": "ensemble", "res.nc": "resolution", "fit.nc": "fit"}, kinds
res = cc.open_file("res.nc")
rn = raw_names("res.nc", "species_name")
assert np.array_equal(res.log10_mole_fraction.sel(species="SO2").values,
                      raw("res.nc", "log10_mole_fraction")[:, rn.index("SO2"), :])
fit = cc.open_file("fit.nc")
assert list(fit.parameter.values) == raw_names("fit.nc", "parameter_path")
print("ok: open_file: species/reaction/channel/variant by name, values equal the file's")

os.makedirs("png", exist_ok=True)

# Profiles: the line is the file's SO2, the legend's chi2_log is the file's, the residual
# panel is model_at_observation / observation_value of the SO2 points.
fig = cc.plot_profiles(run, "SO2")
ln = lines(fig)
model = [g for g in ln if g.startswith("model:")]
assert len(model) == 1, model
assert np.array_equal(ln[model[0]].get_xdata(), mf[names.index("SO2")])
chi2 = raw("run.nc", "chi2_log")[raw_names("run.nc", "score_species").index("SO2")]
m = re.search(r"chi2_log ([0-9.eE+-]+)\)", ln[model[0]].get_label())
assert m and abs(float(m.group(1)) - chi2) <= 1e-5 * chi2, (ln[model[0]].get_label(), chi2)
osp = raw_names("run.nc", "observation_species")
keep = np.array([s == "SO2" for s in osp])
ratio = raw("run.nc", "model_at_observation")[keep] / raw("run.nc", "observation_value")[keep]
ratio_line = [v for g, v in ln.items() if g.startswith("ratio:")][0]
assert np.array_equal(ratio_line.get_xdata(), ratio)
assert fig.legends == [] and all(ax.get_legend() is None or
                                  ax.get_legend().get_bbox_to_anchor().x0 > ax.bbox.x1 - 1
                                  for ax in fig.axes), "legend not outside the axes"
check_png(cc.save(fig, "png/profiles_SO2.png"))
print(f"ok: profile, chi2_log {chi2:.6g} in the legend, {keep.sum()} model/observed ratios")

# A fit file: its model/observed panel is observation_model / observation_value.
fig = cc.plot_profiles(fit, "SO2")
fk = np.array([x == "SO2" for x in raw_names("fit.nc", "observation_species")])
ratio_line = [v for g, v in lines(fig).items() if g.startswith("ratio:")][0]
assert np.array_equal(ratio_line.get_xdata(), raw("fit.nc", "observation_model")[fk]
                      / raw("fit.nc", "observation_value")[fk])
check_png(cc.save(fig, "png/fit_SO2.png"))
print("ok: resolution and fit files open by name; the fit's model/observed from the file")

# Sweep profiles and ranking: bars are chi2_log summed over scored species, best first.
fig = cc.plot_profiles(sweep, "SO2")
ln = lines(fig)
schi = raw("sweep.nc", "chi2_log")[:, raw_names("sweep.nc", "score_species").index("SO2")]
smf = raw("sweep.nc", "mole_fraction")[:, raw_names("sweep.nc", "species_name").index("SO2")]
for v, lab in enumerate(raw_names("sweep.nc", "variant_label")):
    line = ln[f"model:{lab}"]
    assert np.array_equal(line.get_xdata(), smf[v]), lab
    m = re.search(r"chi2_log ([0-9.eE+-]+)\)", line.get_label())
    assert m and abs(float(m.group(1)) - schi[v]) <= 1e-5 * schi[v], (line.get_label(), schi[v])
check_png(cc.save(fig, "png/sweep_SO2.png"))
fig = cc.plot_sweep_ranking(sweep)
ax = fig.axes[0]
widths = [b.get_width() for b in ax.patches]
rank = raw("sweep.nc", "variant_ranking")
conv = raw("sweep.nc", "variant_converged") > 0.5
total = raw("sweep.nc", "chi2_log").sum(axis=1)
order = sorted(range(len(rank)), key=lambda v: (not conv[v], rank[v]))
want = [total[v] if conv[v] else 0.0 for v in order]
assert np.allclose(widths, want, rtol=1e-15, atol=0), (widths, want)
good = [w for w, v in zip(widths, order) if conv[v]]
assert good == sorted(good), f"ranking not best first: {good}"
check_png(cc.save(fig, "png/sweep_ranking.png"))
print(f"ok: sweep ranking: {len(widths)} bars equal the summed chi2_log in variant_ranking order")

# J values of the photo file per channel.
photo = cc.open_file("photo.nc")
J = raw("photo.nc", "J")
fig = cc.plot_jvalues(photo)
ln = lines(fig)
for c, ch in enumerate(raw_names("photo.nc", "channel_name")):
    assert np.array_equal(ln[f"J:{ch}"].get_xdata(), J[c]), ch
colours = [ln[f"J:{ch}"].get_color() for ch in raw_names("photo.nc", "channel_name")[:20]]
assert len(set(map(tuple, colours))) == len(colours), "first 20 channels share a colour"
check_png(cc.save(fig, "png/jvalues.png"))
print(f"ok: J: {J.shape[0]} channels drawn as in the file, the first 20 in distinct colours")

# Convergence history.
fig = cc.plot_convergence(run)
assert np.array_equal(lines(fig)["residual"].get_ydata(), raw("run.nc", "history_residual_norm"))
step = raw("run.nc", "history_step")
drawn = lines(fig)["step"].get_ydata()
assert np.array_equal(drawn[step > 0], step[step > 0]) and np.isnan(drawn[step <= 0]).all()
check_png(cc.save(fig, "png/convergence.png"))
print(f"ok: convergence: {run.sizes['iteration']} residual norms from the file")

# Budget: transport and net lines give back the file's tendencies; 6 decades; closure.
s = names.index("SO2")
fig = cc.plot_budget(run, "SO2")
ln = lines(fig)
for term, var in (("transport", "transport_tendency"), ("net", "net_tendency")):
    drawn = np.nan_to_num(ln[f"{term}:gain"].get_xdata()) - np.nan_to_num(
        ln[f"{term}:removal"].get_xdata())
    assert np.array_equal(drawn, raw("run.nc", var)[s]), term
lo, hi = fig.axes[0].get_xlim()
assert abs(np.log10(hi / lo) - (cc.plots.BUDGET_DECADES + np.log10(2))) < 1e-9, (lo, hi)
t = cc.plots.budget_terms(run, "SO2")
gross = np.maximum(t["production"], t["loss"])
closure = np.abs(t["production"] - t["loss"] + t["transport"] - t["net"]) / gross
assert closure.max() < 1e-9, f"budget does not close: {closure.max():.3g}"
check_png(cc.save(fig, "png/budget_SO2.png"))
print(f"ok: budget: transport and net from the file, axis 6 decades, closure {closure.max():.1e}")

# Background column.
fig = cc.plot_background(run)
ln = lines(fig)
for v in ("temperature", "pressure", "eddy_diffusion"):
    assert np.array_equal(ln[v].get_xdata(), raw("run.nc", v)), v
check_png(cc.save(fig, "png/background.png"))
print("ok: background T, p, K from the file")

# Ensemble envelope and sensitivity bars.
ens = cc.open_file("ens.nc")
fig = cc.plot_envelope(ens, "SO2")
pct = list(raw("ens.nc", "percentile"))
en = raw_names("ens.nc", "species_name").index("SO2")
assert np.array_equal(lines(fig)["median"].get_xdata(),
                      raw("ens.nc", "mole_fraction_percentile")[pct.index(50.0), en])
assert np.array_equal(lines(fig)["base"].get_xdata(), raw("ens.nc", "base_mole_fraction")[en])
check_png(cc.save(fig, "png/envelope_SO2.png"))
sens = cc.open_file("sens.nc")
fig = cc.plot_sensitivity(sens, top=8)
share, ls = raw("sens.nc", "share"), raw("sens.nc", "log_sensitivity")
top = np.argsort(-share, kind="stable")[:8]
assert np.array_equal([b.get_width() for b in fig.axes[0].patches], ls[top])
eqs = raw_names("sens.nc", "reaction_equation")
assert [x.get_text() for x in fig.axes[0].get_yticklabels()] == [eqs[r] for r in top]
check_png(cc.save(fig, "png/sensitivity.png"))
print("ok: ensemble median/base and the 8 largest d ln G/d ln k from the files")

# The example script runs on the same run file with the nmol/mol observations.
ex = subprocess.run(["/usr/bin/python3", os.path.join(root, "scripts", "example_analysis.py"),
                     "run.nc", "--obs", "obs_nmol.csv", "--outdir", "example"],
                    check=True, capture_output=True, text=True).stdout
for p in re.findall(r"wrote (\S+)", ex):
    check_png(p)
print("ok: scripts/example_analysis.py")
