"""Figures of the entropy benchmarks (PNG and SVG, matplotlib imported lazily with the Agg backend).

Import the names from :mod:`adsorb.entropy_benchmarks`.
"""

from __future__ import annotations

import numpy as np

from adsorb import constants as C
from adsorb.entropy_benchmarks.alkane_prefactors import AlkaneRow
from adsorb.entropy_benchmarks.correlation import CORRELATION_MODELS, CorrelationRow
from adsorb.errors import InputError


_MODEL_STYLE = {
    "harmonic": ("o", "C0"), "hindered": ("s", "C1"), "2d-gas": ("^", "C2"), "2d-gas+free-rotor": ("D", "C3"),
    "2d-gas+free-3d-rotor": ("v", "C4"),
}


def plot_correlation_benchmark(rows, path, *, title=None):
    """Adsorbate S° of each model against S°_gas, with the Campbell–Sellers line and its ±2R band.

    Writes ``<path>.png`` and ``<path>.svg`` (:func:`adsorb.fileout.write_figure`).

    Parameters
    ----------
    rows : list of CorrelationRow
    path : str or Path
        File stem.
    title : str, optional

    Returns
    -------
    matplotlib.figure.Figure
    """
    if not rows or not all(isinstance(r, CorrelationRow) for r in rows):
        msg = "plot_correlation_benchmark rows: expected the list returned by correlation_benchmark"
        raise InputError(msg)
    import matplotlib

    matplotlib.use("Agg")
    from matplotlib.figure import Figure

    from adsorb.fileout import write_figure
    from adsorb.model_choice import CORRELATION_OFFSET_R, CORRELATION_SLOPE, campbell_sellers_entropy

    fig = Figure(figsize=(7.0, 5.2))
    ax = fig.add_subplot()
    s_gas = np.array([r.gas_entropy for r in rows])
    x = np.linspace(s_gas.min() - 15.0, s_gas.max() + 15.0, 50)
    line = C.to_j_per_mol_k(campbell_sellers_entropy(C.from_j_per_mol_k(x)))
    sd = 2.0 * C.R
    ax.fill_between(x, line - sd, line + sd, color="0.85", lw=0, label="± 2R (one SD)")
    ax.plot(x, line, color="k", lw=1.2,
            label=f"Campbell–Sellers: {CORRELATION_SLOPE:.2f} S°gas − {CORRELATION_OFFSET_R:g}R")
    temperatures = sorted({r.temperature for r in rows})
    fills = {temperatures[0]: "none"} if len(temperatures) > 1 else {}
    for model in CORRELATION_MODELS:
        marker, colour = _MODEL_STYLE[model]
        for temp in temperatures:
            sel = [r for r in rows if r.temperature == temp]
            ax.plot([r.gas_entropy for r in sel], [r.entropies[model] for r in sel], ls="none", marker=marker,
                    mec=colour, mfc=fills.get(temp, colour), ms=6, gid=f"model:{model}:{temp:g}",
                    label=f"{model}, {temp:g} K")
    hottest = [r for r in rows if r.temperature == temperatures[-1]]
    for r in hottest:
        top = max(r.entropies.values())
        ax.annotate(r.molecule, (r.gas_entropy, top), textcoords="offset points", xytext=(0, 7), ha="center",
                    fontsize=7)
    ax.set_xlabel("S°gas(T, 1 bar) / J mol⁻¹ K⁻¹")
    ax.set_ylabel(f"S°ad / J mol⁻¹ K⁻¹ (standard state {rows[0].standard_state})")
    ax.set_title(title or "Model adsorbate entropies on invented sites vs the Campbell–Sellers correlation",
                 fontsize=9)
    ax.legend(fontsize=7, ncol=2, loc="upper left", frameon=True, framealpha=0.9)
    fig.tight_layout()
    write_figure(fig, path)
    return fig


def plot_alkane_prefactors(rows, path, *, title=None):
    """log10 of the desorption prefactor against chain length: Tait et al. (2005) and the models.

    Model curves are the Arrhenius prefactors A(Tp) = ν(Tp) e^γ; the dotted
    curves add the conformer estimate to the harmonic model. Writes
    ``<path>.png`` and ``<path>.svg``.

    Returns
    -------
    matplotlib.figure.Figure
    """
    if not rows or not all(isinstance(r, AlkaneRow) for r in rows):
        msg = "plot_alkane_prefactors rows: expected the list returned by alkane_benchmark"
        raise InputError(msg)
    import matplotlib

    matplotlib.use("Agg")
    from matplotlib.figure import Figure

    from adsorb.fileout import write_figure

    fig = Figure(figsize=(6.8, 4.8))
    ax = fig.add_subplot()
    n = np.array([r.site.n for r in rows])
    for model in rows[0].models:
        marker, colour = _MODEL_STYLE[model]
        ax.plot(n, [r.models[model]["log10_arrhenius"] for r in rows], marker=marker, color=colour, lw=1.2,
                ms=5, gid=f"model:{model}", label=model)
    for k, energy in enumerate(rows[0].conformers):
        ax.plot(n, [r.conformers[energy]["log10_arrhenius"] for r in rows], color="C0", lw=1.0,
                ls=(0, (1, 1.5 + k)), gid=f"conformers:{energy:g}",
                label=f"harmonic + conformer estimate, E_g = {energy:g} kJ/mol")
    pub = [r for r in rows if r.published_log10 is not None]
    ax.errorbar([r.site.n for r in pub], [r.published_log10 for r in pub],
                yerr=[r.published_uncertainty or 0.0 for r in pub], fmt="*", color="k", ms=11, capsize=3,
                gid="published", label="Tait et al. 2005 (published)", zorder=5)
    ax.set_xlabel("carbon atoms N")
    ax.set_ylabel("log10 (prefactor / s⁻¹)")
    ax.set_title(title or "n-alkanes on MgO(100): first-order desorption prefactors", fontsize=9)
    ax.set_xticks(n)
    ax.legend(fontsize=7, loc="upper left", frameon=True, framealpha=0.9)
    fig.tight_layout()
    write_figure(fig, path)
    return fig
