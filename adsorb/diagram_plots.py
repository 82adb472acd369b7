"""Plots of free-energy diagrams: the step diagram of :mod:`adsorb.diagrams` pathways.

The pathway objects, the computational-hydrogen-electrode shift with the
electrode potential and the summaries live in :mod:`adsorb.diagrams`; this
module only draws them. :mod:`adsorb.diagrams` re-exports
:func:`plot_pathways`, so this module imports it inside the function only.
matplotlib is imported there too, with the Agg backend, and the figure is
written as PNG and SVG through :func:`adsorb.fileout.write_figure`. See
docs/methods-diagrams.md.
"""

from __future__ import annotations

import numpy as np

from adsorb.errors import InputError
from adsorb.fileout import write_figure

__all__ = ["plot_pathways"]


def plot_pathways(pathways, path, *, potentials=(0.0,), scale: str = "RHE", ph=0.0, annotate: bool = True,
                  title: str | None = None, bar_width: float = 0.6):
    """Step diagram of one or several pathways, at one or several potentials.

    Each state is a horizontal bar at its G relative to the first state;
    consecutive bars are joined by dashed lines. Every (pathway, potential)
    pair is one series in its own colour and line style. Writes
    ``<path>.png`` and ``<path>.svg``.

    Parameters
    ----------
    pathways : Pathway or sequence of Pathway
        Pathways to overlay (e.g. the same mechanism on several surfaces).
    path : str or Path
        Output file stem.
    potentials : sequence of float, optional
        Electrode potentials in V on ``scale`` (ignored for thermal pathways,
        which are drawn once).
    scale : {"RHE", "SHE"}
    ph : float, optional
        pH for the SHE scale.
    annotate : bool, optional
        Write dG of each state above its bar.
    title : str, optional
    bar_width : float, optional
        Width of a state bar in units of the state spacing (0 < w < 1).

    Returns
    -------
    matplotlib.figure.Figure
        The bars are Line2D objects with gid ``"state-bar"``, the connectors
        gid ``"connector"``.
    """
    from adsorb.diagrams import Pathway, state_energies

    if isinstance(pathways, Pathway):
        pathways = [pathways]
    pathways = list(pathways)
    if not pathways or not all(isinstance(p, Pathway) for p in pathways):
        msg = "plot_pathways: expected one or more Pathway objects"
        raise InputError(msg)
    if not (0 < float(bar_width) < 1):
        msg = f"plot_pathways bar_width: expected a number between 0 and 1, got {bar_width!r}"
        raise InputError(msg)
    potentials = [float(u) for u in np.atleast_1d(np.asarray(potentials, dtype=float))]
    if not potentials:
        msg = "plot_pathways potentials: expected at least one potential"
        raise InputError(msg)

    import matplotlib

    matplotlib.use("Agg")
    from matplotlib.figure import Figure

    series = []
    for p in pathways:
        for k, u in enumerate(potentials if p.electrochemical else potentials[:1]):
            g = state_energies(p, u, scale=scale, ph=ph)
            label = p.name or "pathway"
            if p.electrochemical:
                label += f", U = {round(u, 3):g} V vs {scale}" + (f" (pH {float(ph):g})" if scale == "SHE" else "")
            series.append((p, k, g, label))

    width = max(6.0, 1.2 * max(p.n_states for p in pathways) + 2.0)
    fig = Figure(figsize=(width, 4.8))
    ax = fig.add_subplot()
    colours = matplotlib.rcParams["axes.prop_cycle"].by_key().get("color", ["C0"])
    styles = ["--", ":", "-.", (0, (5, 1))]
    half = float(bar_width) / 2
    same_labels = all(p.labels == pathways[0].labels for p in pathways)
    for s, (p, k, g, label) in enumerate(series):
        colour = colours[s % len(colours)]
        for i, gi in enumerate(g):
            ax.plot([i - half, i + half], [gi, gi], color=colour, lw=2.5, solid_capstyle="butt",
                    label=label if i == 0 else None, gid="state-bar")
            if annotate:
                ax.annotate(f"{gi:.2f}", (i, gi), textcoords="offset points", xytext=(0, 3), ha="center",
                            va="bottom", fontsize=7, color=colour)
            if not same_labels:
                ax.annotate(p.labels[i], (i, gi), textcoords="offset points", xytext=(0, -3), ha="center",
                            va="top", fontsize=7, color=colour)
            if i + 1 < g.size:
                ax.plot([i + half, i + 1 - half], [gi, g[i + 1]], color=colour, lw=1.0,
                        ls=styles[k % len(styles)], gid="connector")
    n_max = max(p.n_states for p in pathways)
    if same_labels:
        ax.set_xticks(range(n_max), pathways[0].labels, rotation=20, ha="right")
    else:
        ax.set_xticks(range(n_max), [str(i) for i in range(n_max)])
        ax.set_xlabel("state (labels beside the bars)")
    ax.axhline(0.0, color="0.7", lw=0.5, zorder=0)
    ax.set_ylabel("ΔG (eV)")
    if title:
        ax.set_title(title)
    ax.legend(fontsize=8, frameon=False)
    fig.tight_layout()
    write_figure(fig, path)
    return fig
