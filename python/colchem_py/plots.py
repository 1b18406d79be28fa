"""The plots a chemist expects from colchem files (matplotlib, Agg backend). Each function
takes a Dataset from `open_file` and returns a matplotlib Figure; every number drawn is read
from the file (artists carry a `gid` naming what they show, so tests can compare them).
Legends sit outside the axes; up to 20 variants or channels get distinct colours (tab20),
more cycle line styles as well."""
import os

import matplotlib

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402
import numpy as np  # noqa: E402

from .files import file_observations  # noqa: E402

# Budget and J axes show this many decades below the largest value (common practice, no
# source: wider ranges are dominated by terms that do not matter).
BUDGET_DECADES = 6
J_DECADES = 10


def _styles(n):
    """(colour, line style) for n lines: tab20's 20 colours, then the next line style."""
    cmap = plt.get_cmap("tab20" if n > 10 else "tab10")
    k = cmap.N
    return [(cmap(i % k), ("-", "--", ":", "-.")[(i // k) % 4]) for i in range(n)]


def _legend_outside(ax, fontsize=7, **kw):
    return ax.legend(loc="upper left", bbox_to_anchor=(1.02, 1.0), borderaxespad=0.0,
                     fontsize=fontsize, **kw)


def _label(da):
    name = da.name
    u = da.attrs.get("units")
    return f"{name} [{u}]" if u else str(name)


def save(fig, path, dpi=110):
    """Writes the figure to a temporary next to path, renames it, and closes the figure."""
    root, ext = os.path.splitext(path)
    tmp = f"{root}.tmp-{os.getpid()}{ext or '.png'}"
    fig.savefig(tmp, dpi=dpi, bbox_inches="tight")
    os.replace(tmp, path)
    plt.close(fig)
    return path


def _variants(ds):
    """(labels, converged flags) of a sweep, or one entry for a run."""
    if "variant" in ds.dims:
        labels = [str(v) for v in ds["variant"].values]
        if "variant_converged" in ds:
            ok = [bool(c) for c in ds["variant_converged"].values]
        else:
            ok = [True] * len(labels)
        return labels, ok
    return [ds.attrs.get("title", "model")], [True]


def _chi2(ds, species, variant=None):
    if "chi2_log" not in ds or "scored_species" not in ds.dims:
        return None
    if species not in [str(s) for s in ds["scored_species"].values]:
        return None
    c = ds["chi2_log"].sel(scored_species=species)
    if variant is not None:
        c = c.isel(variant=variant)
    return float(c)


def plot_profiles(ds, species, obs=None):
    """Mole fraction of `species` against altitude (one line per converged variant), the
    observations (error bars; upper limits as left-pointing triangles) and chi2_log of each
    line in the legend; a right panel shows model/observed at the observed points (the
    file's model_at_observation, or observation_model of a fit file) where the file holds
    them. `obs` (from read_observations) replaces the file's observations; then the right
    panel is left out (the file holds the model at its own points only)."""
    if species not in [str(s) for s in ds["species"].values]:
        raise KeyError(f"species {species!r} is not in the file (has: "
                       f"{', '.join(str(s) for s in ds['species'].values)})")
    stored = file_observations(ds)
    obs = stored if obs is None else obs
    # The model at the observed points: model_at_observation (run, sweep) or
    # observation_model (fit file).
    at_obs = next((v for v in ("model_at_observation", "observation_model") if v in ds), None)
    has_ratio = obs is stored and stored is not None and at_obs is not None
    fig, axes = plt.subplots(1, 2 if has_ratio else 1, figsize=(9.5 if has_ratio else 7, 5.5),
                             sharey=True, squeeze=False,
                             gridspec_kw={"width_ratios": [3, 1.3] if has_ratio else [1]})
    ax = axes[0, 0]
    z = ds["altitude"].values
    mf = ds["mole_fraction"].sel(species=species)
    labels, ok = _variants(ds)
    styles = _styles(len(labels))
    for v, (lab, good) in enumerate(zip(labels, ok)):
        if not good:
            continue
        x = mf.isel(variant=v).values if "variant" in mf.dims else mf.values
        chi = _chi2(ds, species, v if "variant" in mf.dims else None)
        text = lab if chi is None else f"{lab} (chi2_log {chi:.6g})"
        ax.plot(x, z, color=styles[v][0], ls=styles[v][1], lw=1.4, label=text, gid=f"model:{lab}")
    if obs is not None:
        keep = np.array([str(s) == species for s in obs["species"].values])
        lim = obs["upper_limit"].values.astype(bool)
        det, up = keep & ~lim, keep & lim
        oz, ov, ou = (obs[k].values for k in ("altitude", "value", "uncertainty"))
        if det.any():
            ax.errorbar(ov[det], oz[det], xerr=ou[det], fmt="none", ecolor="k", capsize=2)
            ax.plot(ov[det], oz[det], "ko", ms=4, label="observed", gid="observed")
        if up.any():
            ax.plot(ov[up], oz[up], "k<", ms=6, label="upper limit", gid="upper_limit")
        if has_ratio:
            rx = axes[0, 1]
            model = ds[at_obs]
            for v, (lab, good) in enumerate(zip(labels, ok)):
                if not good:
                    continue
                m = model.isel(variant=v).values if "variant" in model.dims else model.values
                ratio = m[keep] / ov[keep]
                rx.plot(ratio, oz[keep], "o", color=styles[v][0], ms=4, gid=f"ratio:{lab}")
            rx.axvline(1.0, color="k", lw=0.8)
            rx.set_xscale("log")
            rx.set_xlabel("model / observed")
            rx.grid(alpha=0.3)
    ax.set_xscale("log")
    ax.set_xlabel(f"{species} mole fraction [{ds['mole_fraction'].attrs.get('units', '1')}]")
    ax.set_ylabel(_label(ds["altitude"]))
    ax.grid(alpha=0.3)
    handles, texts = ax.get_legend_handles_labels()
    axes[0, -1].legend(handles, texts, loc="upper left", bbox_to_anchor=(1.04, 1.0),
                       borderaxespad=0.0, fontsize=7)
    fig.suptitle(f"{species}: {ds.attrs.get('title', '')}", fontsize=9)
    return fig


def plot_sweep_ranking(ds):
    """Horizontal bars: each converged variant's chi2_log summed over the scored species, in
    the file's ranking (variant_ranking, 1 = best, at the top); failed variants listed below
    without a bar."""
    if "variant_ranking" not in ds or "chi2_log" not in ds:
        raise ValueError("expected a sweep file with variant_ranking and chi2_log, found none")
    labels, ok = _variants(ds)
    rank = ds["variant_ranking"].values
    total = ds["chi2_log"].sum("scored_species", skipna=False).values
    order = sorted(range(len(labels)), key=lambda v: (not ok[v], rank[v]))
    fig, ax = plt.subplots(figsize=(8, 0.35 * len(order) + 1.5))
    y = np.arange(len(order))[::-1]
    widths = [total[v] if ok[v] else 0.0 for v in order]
    ax.barh(y, widths, color=[_styles(len(labels))[v][0] for v in order], gid="chi2")
    ax.set_yticks(y)
    ax.set_yticklabels([labels[v] + ("" if ok[v] else "  (failed)") for v in order], fontsize=7)
    ax.set_xlabel("chi2_log summed over " + ", ".join(str(s) for s in ds["scored_species"].values))
    good = [w for w, v in zip(widths, order) if ok[v] and w > 0]
    if good and max(good) / min(good) > 100:
        ax.set_xscale("log")
    ax.set_title("sweep ranking (best at the top)", fontsize=9)
    return fig


def plot_jvalues(ds):
    """Photolysis rate of every channel against altitude (run or photo file)."""
    J = ds["J"]
    z = ds["altitude"].values
    chans = [str(c) for c in J["channel"].values]
    fig, ax = plt.subplots(figsize=(8.5, 6))
    for c, (ch, (col, ls)) in enumerate(zip(chans, _styles(len(chans)))):
        ax.plot(J.isel(channel=c).values, z, color=col, ls=ls, lw=1.2, label=ch, gid=f"J:{ch}")
    ax.set_xscale("log")
    top = float(np.nanmax(J.values))
    if top > 0:
        ax.set_xlim(top * 10.0 ** -J_DECADES, top * 2)
    ax.set_xlabel(f"J [{J.attrs.get('units', '')}]")
    ax.set_ylabel(_label(ds["altitude"]))
    ax.grid(alpha=0.3)
    _legend_outside(ax, fontsize=6, ncol=1 if len(chans) <= 30 else 2)
    return fig


def plot_convergence(ds):
    """The steady solver's history: scaled residual norm and pseudo-time step per
    iteration (history_* variables of a run file)."""
    if "history_residual_norm" not in ds:
        raise ValueError("expected history_residual_norm (a steady run file), found none")
    it = np.arange(ds.sizes["iteration"])
    fig, ax = plt.subplots(figsize=(7, 4.5))
    ax.semilogy(it, ds["history_residual_norm"].values, "o-", color="tab:blue", ms=3,
                label="scaled residual norm", gid="residual")
    ax.set_xlabel("iteration")
    ax.set_ylabel("scaled residual norm")
    handles = ax.get_legend_handles_labels()
    if "history_step" in ds:
        ax2 = ax.twinx()
        step = ds["history_step"].values
        # A step of 0 (no step taken, e.g. the last iteration) has no place on a log axis.
        ax2.semilogy(it, np.where(step > 0, step, np.nan), "s--", color="tab:orange", ms=3,
                     label=f"pseudo-time step [{ds['history_step'].attrs.get('units', '')}]",
                     gid="step")
        ax2.set_ylabel(f"pseudo-time step [{ds['history_step'].attrs.get('units', '')}]")
        h2 = ax2.get_legend_handles_labels()
        handles = (handles[0] + h2[0], handles[1] + h2[1])
    ax.legend(*handles, loc="upper left", bbox_to_anchor=(1.15, 1.0), fontsize=7)
    ax.grid(alpha=0.3)
    ax.set_title(ds.attrs.get("colchem_solver_reason", ""), fontsize=8)
    return fig


def budget_terms(ds, species):
    """Per cell: chemical production and loss of `species` (the positive and negative parts
    of nu_rs R_r summed over reactions, README "Budgets"), transport_tendency and
    net_tendency, all from the run file (cm-3 s-1)."""
    nu = ds["net_stoichiometry"].sel(species=species)
    contrib = nu * ds["reaction_rate"]                 # (reaction, altitude)
    prod = contrib.where(contrib > 0, 0.0).sum("reaction")
    loss = (-contrib).where(contrib < 0, 0.0).sum("reaction")
    return {"production": prod.values, "loss": loss.values,
            "transport": ds["transport_tendency"].sel(species=species).values,
            "net": ds["net_tendency"].sel(species=species).values}


def plot_budget(ds, species):
    """Production, loss, transport and net tendency of `species` against altitude on a log
    axis of BUDGET_DECADES decades below the largest term; transport and net are drawn as
    magnitudes, solid where they add to the species and dashed where they remove it."""
    terms = budget_terms(ds, species)
    z = ds["altitude"].values
    fig, ax = plt.subplots(figsize=(7.5, 5.5))
    colours = {"production": "tab:green", "loss": "tab:red", "transport": "tab:blue",
               "net": "k"}
    for name, val in terms.items():
        if name in ("production", "loss"):
            ax.plot(val, z, color=colours[name], lw=1.6, label=name, gid=name)
            continue
        pos = np.where(val > 0, val, np.nan)
        neg = np.where(val < 0, -val, np.nan)
        ax.plot(pos, z, color=colours[name], lw=1.2, label=f"{name} (gain)", gid=f"{name}:gain")
        ax.plot(neg, z, color=colours[name], lw=1.2, ls="--", label=f"{name} (removal)",
                gid=f"{name}:removal")
    top = max(float(np.nanmax(np.abs(v))) for v in terms.values())
    ax.set_xscale("log")
    if top > 0:
        ax.set_xlim(top * 10.0 ** -BUDGET_DECADES, top * 2)
    ax.set_xlabel(f"{species} rate [{ds['reaction_rate'].attrs.get('units', 'cm-3 s-1')}]")
    ax.set_ylabel(_label(ds["altitude"]))
    ax.grid(alpha=0.3)
    ax.set_title(f"{species} budget", fontsize=9)
    _legend_outside(ax)
    return fig


def plot_background(ds):
    """The background column: temperature, pressure and eddy diffusion against altitude."""
    fig, axes = plt.subplots(1, 3, figsize=(11, 5), sharey=True)
    z = ds["altitude"].values
    for ax, name, log in zip(axes, ("temperature", "pressure", "eddy_diffusion"),
                             (False, True, True)):
        ax.plot(ds[name].values, z, lw=1.5, gid=name)
        if log:
            ax.set_xscale("log")
        ax.set_xlabel(_label(ds[name]))
        ax.grid(alpha=0.3)
    axes[0].set_ylabel(_label(ds["altitude"]))
    fig.suptitle(ds.attrs.get("title", ""), fontsize=9)
    return fig


def plot_envelope(ds, species):
    """Ensemble envelope of `species`: median, 16-84 % and 2.5-97.5 % bands of the members,
    the base state, and the file's observations."""
    pct = ds["mole_fraction_percentile"].sel(species=species)
    z = ds["altitude"].values

    def at(q):
        return pct.sel(percentile=q, method="nearest", tolerance=1e-9).values

    fig, ax = plt.subplots(figsize=(7, 6.5))
    ax.fill_betweenx(z, at(2.5), at(97.5), color="tab:blue", alpha=0.18, lw=0,
                     label="2.5-97.5 %", gid="band95")
    ax.fill_betweenx(z, at(16.0), at(84.0), color="tab:blue", alpha=0.38, lw=0,
                     label="16-84 %", gid="band68")
    ax.plot(at(50.0), z, color="tab:blue", lw=1.8, label="median", gid="median")
    ax.plot(ds["base_mole_fraction"].sel(species=species).values, z, "k--", lw=1.0,
            label="base state", gid="base")
    obs = file_observations(ds)
    if obs is not None:
        keep = np.array([str(s) == species for s in obs["species"].values])
        lim = obs["upper_limit"].values.astype(bool)
        if (keep & ~lim).any():
            m = keep & ~lim
            ax.errorbar(obs["value"].values[m], obs["altitude"].values[m],
                        xerr=obs["uncertainty"].values[m], fmt="ro", ms=4, capsize=2,
                        label="observed", gid="observed")
        if (keep & lim).any():
            m = keep & lim
            ax.plot(obs["value"].values[m], obs["altitude"].values[m], "r<", ms=6,
                    label="upper limit", gid="upper_limit")
    ax.set_xscale("log")
    ax.set_xlabel(f"{species} mole fraction")
    ax.set_ylabel(_label(ds["altitude"]))
    ax.grid(alpha=0.3)
    n_ok, n = ds.attrs.get("ensemble_converged"), ds.attrs.get("ensemble_members")
    if n is not None:
        ax.set_title(f"{species}: {int(n_ok)} of {int(n)} members converged", fontsize=9)
    _legend_outside(ax)
    return fig


def plot_sensitivity(ds, top=10):
    """Horizontal bars of d ln G / d ln k (log_sensitivity) for the `top` reactions with
    the largest share of a sensitivity file; red where G rises with k, blue where it falls."""
    if "log_sensitivity" not in ds:
        raise ValueError("expected a sensitivity file (log_sensitivity), found none")
    share = ds["share"].values
    sens = ds["log_sensitivity"].values
    order = [r for r in np.argsort(-share, kind="stable") if share[r] > 0][:top]
    eqs = ([str(e) for e in ds["reaction_equation"].values] if "reaction_equation" in ds
           else [str(r) for r in ds["reaction"].values])
    fig, ax = plt.subplots(figsize=(8, 0.4 * max(len(order), 2) + 1.6))
    y = np.arange(len(order))[::-1]
    ax.barh(y, [sens[r] for r in order],
            color=["tab:red" if sens[r] > 0 else "tab:blue" for r in order], gid="bars")
    ax.set_yticks(y)
    ax.set_yticklabels([eqs[r] for r in order], fontsize=7)
    ax.axvline(0, color="k", lw=0.8)
    ax.set_xlabel("d ln G / d ln k")
    ax.set_title(f"G = {ds.attrs.get('colchem_objective', '')}", fontsize=9)
    return fig


