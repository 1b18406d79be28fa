"""Runs a small real ensemble (Pyrene's compact network, 54 cells, 6 members, with the
invented SO2/SO observations and two attribution targets), draws it with
scripts/plot_ensemble.py, and checks that every PNG exists and is non-empty and that the
numbers drawn are the file's: the median line and the base line against
mole_fraction_percentile and base_mole_fraction, the 2.5-97.5 % band's edges, the
observations, and the bars against attribution_share in the file's order."""
import importlib.util
import os
import subprocess
import sys

import netCDF4
import numpy as np

colchem, root, work = sys.argv[1], sys.argv[2], sys.argv[3]
os.makedirs(work, exist_ok=True)
os.chdir(work)
env = dict(os.environ, OMPI_ALLOW_RUN_AS_ROOT="1", OMPI_ALLOW_RUN_AS_ROOT_CONFIRM="1")
obs = os.path.join(root, "profiles", "observed", "pyrene_so2_invented.csv")
subprocess.run([colchem, "--log-level", "warn", "ensemble",
                os.path.join(root, "configs", "pyrene_full.yaml"), "-n", "6", "--seed", "2",
                "--set", f"observations={obs}", "--set", "solver.max_iterations=150",
                "--attribute", "SO2@90", "--attribute", "SO@96", "-o", "small.nc"],
               check=True, env=env, stdout=subprocess.DEVNULL)
script = os.path.join(root, "scripts", "plot_ensemble.py")
out = subprocess.run(["/usr/bin/python3", script, "small.nc", "--species", "SO2", "SO",
                      "--outdir", "png", "--top", "6"], check=True, capture_output=True,
                     text=True).stdout
expect = ["envelope_SO2.png", "envelope_SO.png", "contributors_SO2_90km.png",
          "contributors_SO_96km.png"]
for f in expect:
    p = os.path.join("png", f)
    assert os.path.isfile(p) and os.path.getsize(p) > 1000, p
    assert p in out, (p, out)
print("ok: " + ", ".join(expect) + " written and non-empty")

spec = importlib.util.spec_from_file_location("plot_ensemble", script)
pe = importlib.util.module_from_spec(spec)
spec.loader.exec_module(pe)
ds = netCDF4.Dataset("small.nc")
names = [str(s) for s in ds["species_name"][:]]
pct = list(np.asarray(ds["percentile"][:], dtype=float))
for sp in ("SO2", "SO"):
    s = names.index(sp)
    fig = pe.envelope_figure(ds, sp)
    ax = fig.axes[0]
    lines = {ln.get_gid(): ln for ln in ax.lines}
    med = np.asarray(ds["mole_fraction_percentile"][pct.index(50.0), s, :], dtype=float)
    assert np.array_equal(lines["median"].get_xdata(), med), sp
    assert np.array_equal(lines["base"].get_ydata(), np.asarray(ds["altitude"][:])), sp
    base = np.asarray(ds["base_mole_fraction"][s, :], dtype=float)
    assert np.array_equal(lines["base"].get_xdata(), base), sp
    # The outer band: its polygon's x values are the 2.5 and 97.5 % profiles.
    band = ax.collections[0].get_paths()[0].vertices[:, 0]
    for q in (2.5, 97.5):
        prof = np.asarray(ds["mole_fraction_percentile"][pct.index(q), s, :], dtype=float)
        assert all(np.any(np.isclose(band, v, rtol=1e-15, atol=0)) for v in prof), (sp, q)
    osp = [str(x) for x in ds["observation_species"][:]]
    ov = np.asarray(ds["observation_value"][:], dtype=float)
    lim = np.asarray(ds["observation_upper_limit"][:]) > 0.5
    want = sorted(v for v, o, l in zip(ov, osp, lim) if o == sp and not l)
    got = sorted(lines["observed"].get_xdata()) if "observed" in lines else []
    assert np.allclose(got, want, rtol=0, atol=0), (sp, got, want)
    print(f"ok: {sp} envelope: median, base, 2.5/97.5 % edges and {len(want)} observations "
          "are the file's numbers")
eqs = [str(e) for e in ds["reaction_equation"][:]]
for t, sp in enumerate([str(x) for x in ds["attribution_species"][:]]):
    fig = pe.contributors_figure(ds, t, top=6)
    ax = fig.axes[0]
    widths = [b.get_width() for b in ax.patches]
    labels = [lab.get_text() for lab in ax.get_yticklabels()]
    share = np.asarray(ds["attribution_share"][t, :], dtype=float)
    top = np.argsort(-share, kind="stable")[:6]
    assert np.allclose(widths, 100.0 * share[top], rtol=1e-15, atol=0), (widths, share[top])
    assert labels == [eqs[r] for r in top], labels
    assert widths == sorted(widths, reverse=True)
    print(f"ok: {sp} contributors: {len(widths)} bars equal attribution_share "
          f"(top {labels[0]}: {widths[0]:.1f} %)")
