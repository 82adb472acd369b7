"""Plots of a study (PNG + SVG each, written atomically by :func:`adsorb.fileout.write_figure`).

matplotlib is imported inside the functions with the Agg backend. Each
function returns the Figure; :func:`write_plots` returns
``(title, figure stem, [png name, svg name])`` triples for the HTML report.
"""

from __future__ import annotations

import numpy as np

__all__ = ["plot_coverages", "plot_curve", "plot_isobars", "write_plots"]

_STYLES = {("ideal", False): "-", ("ideal", True): "--", ("peng-robinson", False): ":",
           ("peng-robinson", True): "-."}


def _figure(size=(6.4, 4.4), layout=None):
    import matplotlib

    matplotlib.use("Agg")
    from matplotlib.figure import Figure

    return Figure(figsize=size, layout=layout)


def plot_coverages(runs, path, *, title=""):
    """Coverage vs temperature of every species; line style = (fugacity, interactions) variant."""
    from adsorb.fileout import write_figure

    fig = _figure()
    ax = fig.add_subplot()
    colours = {}
    for run in runs:
        style = _STYLES.get((run.fugacity, run.interactions), "-")
        variant = f"{'PR fugacity' if run.fugacity == 'peng-robinson' else 'ideal gas'}, " \
                  f"{'mean-field interactions' if run.interactions else 'no interactions'}"
        for i, s in enumerate(run.species):
            colour = colours.setdefault(s, f"C{len(colours) % 10}")
            ax.plot(run.temperature_K, run.coverage[i], ls=style, color=colour, label=f"{s} ({variant})",
                    gid=f"coverage:{s}")
    ax.set_xlabel("T (K)")
    ax.set_ylabel("coverage θ (ML)")
    ax.set_ylim(-0.02, 1.02)
    ax.set_title(title, fontsize=10)
    ax.legend(fontsize=6, frameon=False, ncol=2)
    fig.tight_layout()
    write_figure(fig, path)
    return fig


def plot_curve(run, path, *, title=""):
    """Isotherms (θ vs p of one gas, one line style per T) or a coverage map (one panel per species)."""
    from adsorb.fileout import write_figure

    p_bar = np.asarray(run.pressure_Pa) / 1e5
    if run.kind == "isotherm":
        fig = _figure()
        ax = fig.add_subplot()
        styles = ["-", "--", ":", "-."]
        for a, t in enumerate(run.temperature_K):
            for i, s in enumerate(run.species):
                ax.plot(p_bar, run.coverage[i, a], color=f"C{i % 10}", ls=styles[a % 4], label=f"{s}, {t:g} K")
        ax.set_xscale("log")
        ax.set_xlabel(f"p({run.gas}) (bar)")
        ax.set_ylabel("coverage θ (ML)")
        ax.set_ylim(-0.02, 1.02)
        ax.legend(fontsize=7, frameon=False)
    else:
        n = len(run.species)
        fig = _figure((3.4 * n + 1.0, 3.8), layout="constrained")
        axes = fig.subplots(1, n, squeeze=False)[0]
        for i, (ax, s) in enumerate(zip(axes, run.species)):
            mesh = ax.pcolormesh(p_bar, run.temperature_K, run.coverage[i], vmin=0.0, vmax=1.0, shading="nearest",
                                 cmap="viridis")
            ax.set_xscale("log")
            ax.set_xlabel(f"p({run.gas}) (bar)")
            ax.set_title(s, fontsize=9)
            if i == 0:
                ax.set_ylabel("T (K)")
        fig.colorbar(mesh, ax=list(axes), label="θ (ML)")
    fig.suptitle(title, fontsize=10)
    if run.kind == "isotherm":
        fig.tight_layout()
    write_figure(fig, path)
    return fig


def plot_isobars(runs, path, *, title=""):
    """Isobars θ(T) at fixed pressures of one gas: one panel per interaction variant, one line style per pressure."""
    from adsorb.fileout import write_figure

    fig = _figure((4.6 * len(runs) + 1.0, 4.2), layout="constrained")
    axes = fig.subplots(1, len(runs), squeeze=False)[0]
    styles = ["-", "--", ":", "-."]
    for ax, run in zip(axes, runs):
        for b, p in enumerate(run.pressure_Pa):
            for i, s in enumerate(run.species):
                ax.plot(run.temperature_K, run.coverage[i, :, b], color=f"C{i % 10}", ls=styles[b % 4],
                        label=f"{s}, p({run.gas}) = {p / 1e5:g} bar", gid=f"isobar:{s}")
        ax.set_xlabel("T (K)")
        ax.set_ylabel("coverage θ (ML)")
        ax.set_ylim(-0.02, 1.02)
        ax.set_title("mean-field interactions" if run.interactions else "no lateral interactions", fontsize=9)
        ax.legend(fontsize=6, frameon=False)
    fig.suptitle(title, fontsize=10)
    write_figure(fig, path)
    return fig


def _groups(runs, key):
    """Consecutive runs sharing ``key(run)`` (the interaction variants of one case-file entry)."""
    out = []
    for run in runs:
        if out and key(out[-1][0]) == key(run):
            out[-1].append(run)
        else:
            out.append([run])
    return out


def write_plots(result, folder) -> list:
    """Every plot of a study into ``folder``; returns (title, stem, [png, svg]) triples."""
    from adsorb.report import slug

    out = []

    def add(title, stem):
        out.append((title, stem, [f"{stem}.png", f"{stem}.svg"]))

    for surface in dict.fromkeys(r.surface for r in result.coverages):
        runs = [r for r in result.coverages if r.surface == surface]
        stem = f"coverages_{slug(surface)}"
        plot_coverages(runs, folder / stem, title=f"Coverages on {surface}")
        add(f"Coverages on {surface} vs temperature", stem)
    for j, c in enumerate(result.curves):
        stem = f"{c.kind}_{j}_{slug(c.gas)}"
        what = "Isotherms" if c.kind == "isotherm" else "Coverage map"
        plot_curve(c, folder / stem, title=f"{what}: {c.gas} on {c.surface}")
        add(f"{what} on {c.surface} vs p({c.gas})" + (", mean-field interactions" if c.interactions else ""), stem)
    for runs in _groups(result.isobars, lambda c: c.entry):
        c = runs[0]
        stem = f"isobars_{c.entry}_{slug(c.gas)}"
        plot_isobars(runs, folder / stem, title=f"Isobars: {c.gas} on {c.surface} (other gases at their partial pressures)")
        add(f"Isobars {c.entry} on {c.surface}, fixed p({c.gas})", stem)
    if result.isosteric_heats:
        from adsorb.isotherms import plot_isosteric_heat

        for runs in _groups(result.isosteric_heats, lambda h: h.entry):
            h = runs[0]
            stem = f"isosteric_heat_{h.entry}_{slug(h.adsorbate)}"
            heats = [r.heat_eV[a] for r in runs for a in range(r.temperature_K.size)]
            labels = [f"{t:g} K, {'mean-field interactions' if r.interactions else 'no interactions'}"
                      for r in runs for t in r.temperature_K]
            per = f" (per {h.gas} molecule)" if h.dissociative else ""
            plot_isosteric_heat(h.coverage_ML, np.array(heats), folder / stem, labels=labels,
                                linestyles=["--" if r.interactions else "-" for r in runs for _ in r.temperature_K],
                                title=f"Isosteric heat of {h.adsorbate} from {h.gas}{per}")
            add(f"Isosteric heat {h.entry}: {h.adsorbate}", stem)
    if result.tpd:
        from adsorb.tpd import plot_tpd

        for run in result.tpd:
            stem = f"tpd_{run.spec.entry}_{slug(run.spec.adsorbate)}" + ("_interacting" if run.spec.interactions else "")
            inter = ", mean-field interactions" if run.spec.interactions else ""
            plot_tpd(list(run.spectra), folder / stem,
                     labels=[f"θ0 = {r.initial_coverage:g} ML, Tp = {r.peak_temperature_K:.1f} K"
                             for r in run.spectra],
                     title=f"TPD of {run.spec.adsorbate}, β = {run.spec.heating_rate_K_s:g} K/s{inter}")
            add(f"TPD {run.spec.entry}: {run.spec.adsorbate}{inter}", stem)
    if result.pathways:
        from adsorb.diagrams import plot_pathways

        for run in result.pathways:
            stem = f"pathway_{slug(run.name)}"
            ph = f", pH {run.pH:g}" if run.pH is not None else ""
            plot_pathways(run.pathway, folder / stem, potentials=run.potentials_on_scale_V or run.potentials_V,
                          scale=run.potential_scale, ph=run.pH or 0.0,
                          title=f"{run.name} at {result.case.pathways[run.name].temperature_K:g} K{ph}")
            add(f"Free-energy diagram: {run.name}", stem)
    if result.comparison is not None:
        from adsorb.model_choice import plot_model_entropies

        plot_model_entropies(result.comparison, folder / "model_comparison")
        add(f"Model comparison: {result.comparison.name}", "model_comparison")
    return out
