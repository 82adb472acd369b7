"""Isotherms, isobars, coverage maps and isosteric heats built on :func:`site_coverages`.

An :class:`AdsorptionModel` holds what does not change between scans: the species,
their equilibrium constants as a function of temperature, and the options of the
site balance (dissociative species, mean-field interactions, multi-site species,
site kinds). The scan functions evaluate it on a pressure axis (:func:`isotherm`),
a temperature axis (:func:`isobar`) or a (T, p) grid (:func:`coverage_map`), and
return a :class:`CoverageScan`. :func:`isosteric_heat` applies the
Clausius–Clapeyron relation at constant coverage, and :func:`plot_isosteric_heat`
draws it against coverage. The plot functions write PNG and SVG files and return
the matplotlib Figure.

Sources: I. Langmuir, J. Am. Chem. Soc. 1918, 40, 1361 (isotherm); the isosteric
heat q_st = R T² (∂ ln p/∂T)_θ = -ΔH_ads is the Clausius–Clapeyron relation applied
at constant coverage (e.g. R. I. Masel, Principles of Adsorption and Reaction on
Solid Surfaces, Wiley, 1996, from memory).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Callable

import numpy as np

from adsorb import constants
from adsorb.coverage import CoverageSolution, pressures_for_coverage, site_coverages
from adsorb.equilibria import capped_exp
from adsorb.errors import InputError
from adsorb.fileout import write_figure

__all__ = [
    "AdsorptionModel",
    "CoverageScan",
    "isotherm",
    "isobar",
    "coverage_map",
    "isosteric_heat",
    "plot_isotherm",
    "plot_isobar",
    "plot_coverage_map",
    "plot_isosteric_heat",
]


@dataclass(frozen=True)
class AdsorptionModel:
    """Species of a site balance and their equilibrium constants K(T).

    Parameters
    ----------
    names : sequence of str
        Species labels (used in plots and messages).
    equilibrium_constants : callable
        ``K_of_T(temperature) -> ndarray`` of shape (n_species, *temperature.shape), in
        Pa^-1, with the conventions of :func:`adsorb.coverage.site_coverages`
        (K of A2 + 2* ⇌ 2A* for a dissociative species).
    dissociative, interactions, sites_per_species, site_kind
        Passed to :func:`~adsorb.coverage.site_coverages` (interactions in eV).
    gases : sequence of str or CriticalConstants, optional
        Gas-phase precursor of each species (one distinct gas per species), for the
        Peng–Robinson fugacities (``real_gas=True`` in the scans) and for the
        ideal-gas check (a ModelWarning when |Z - 1| > 1 % while pressures are used).
    ln_equilibrium_constants : callable, optional
        ``ln K_of_T(temperature)``, same shape: the exact ln K, used by
        :func:`isosteric_heat` where K itself is capped at the largest double
        (strong binding at low T; :func:`adsorb.equilibria.capped_exp`). Set by
        :meth:`from_gibbs`; default ln of ``equilibrium_constants``.
    """

    names: tuple
    equilibrium_constants: Callable
    dissociative: tuple | None = None
    interactions: object = None
    sites_per_species: tuple | None = None
    site_kind: tuple | None = None
    gases: tuple | None = None
    ln_equilibrium_constants: Callable | None = None

    def __post_init__(self):
        names = tuple(self.names)
        if not names or not all(isinstance(x, str) for x in names):
            msg = f"names: expected a non-empty sequence of species labels, got {self.names!r}"
            raise InputError(msg)
        object.__setattr__(self, "names", names)
        if not callable(self.equilibrium_constants):
            msg = ("equilibrium_constants: expected a callable K_of_T(temperature) returning "
                   f"Pa^-1 with species on axis 0, got {self.equilibrium_constants!r}")
            raise InputError(msg)
        for field in ("dissociative", "sites_per_species", "site_kind", "gases"):
            value = getattr(self, field)
            if value is not None:
                value = tuple(value)
                if len(value) != len(names):
                    msg = f"{field}: expected {len(names)} entries (one per species), got {len(value)}"
                    raise InputError(msg)
                object.__setattr__(self, field, value)
        if self.gases is not None and len(set(map(str, self.gases))) != len(self.gases):
            msg = f"gases: expected one distinct gas per species, got {self.gases!r}"
            raise InputError(msg)

    @classmethod
    def from_gibbs(cls, names, delta_g, *, p_standard=constants.P_STANDARD, **options):
        """Model whose K_i(T) = exp(-ΔG°_i(T)/kT)/p° (Pa^-1).

        Parameters
        ----------
        names : sequence of str
            Species labels.
        delta_g : sequence of callables
            ``ΔG°_i(temperature)`` in eV: standard Gibbs energy of adsorption of species
            i (of the whole reaction A2 + 2* → 2A* for a dissociative species), gas at
            ``p_standard`` and the lattice-gas standard state in which θ/θ_* = K p
            (θ° = θ_*° = 1/2, A. Savara, J. Phys. Chem. C 2013, 117, 15710).
        p_standard : float, optional (keyword-only)
            Standard pressure in Pa (default 1 bar).
        **options
            The other fields of :class:`AdsorptionModel`.
        """
        funcs = tuple(delta_g)
        if len(funcs) != len(tuple(names)) or not all(callable(f) for f in funcs):
            msg = f"delta_g: expected {len(tuple(names))} callables ΔG°(T) in eV, got {delta_g!r}"
            raise InputError(msg)
        if not (np.isfinite(p_standard) and p_standard > 0):
            msg = f"p_standard: expected a pressure > 0 in Pa, got {p_standard!r}"
            raise InputError(msg)

        def ln_k_of_t(temperature):
            T = np.asarray(temperature, dtype=float)
            dg = np.array([np.broadcast_to(f(T), T.shape) for f in funcs], dtype=float)
            return -dg / (constants.kB_eV * T) - np.log(p_standard)

        def k_of_t(temperature):
            # capped where exp(-dG°/kT) leaves the floating-point range (strong binding at low T)
            return capped_exp(ln_k_of_t(temperature), temperature,
                              "AdsorptionModel.from_gibbs: K = exp(-dG°/kT)/p°")

        return cls(names, k_of_t, ln_equilibrium_constants=ln_k_of_t, **options)

    @property
    def n_species(self):
        """Number of species."""
        return len(self.names)

    def constants_at(self, temperature):
        """K (Pa^-1), shape (n_species, *temperature.shape), checked."""
        T = np.asarray(temperature, dtype=float)
        if not np.all(np.isfinite(T)) or np.any(T <= 0):
            msg = f"temperature: expected finite values > 0 in K, got {temperature!r}"
            raise InputError(msg)
        K = np.asarray(self.equilibrium_constants(T), dtype=float)
        if K.shape != (self.n_species,) + T.shape:
            msg = (f"equilibrium_constants: K_of_T returned shape {K.shape}, expected "
                   f"{(self.n_species,) + T.shape} (species on axis 0)")
            raise InputError(msg)
        if not np.all(np.isfinite(K)) or np.any(K < 0):
            msg = "equilibrium_constants: K_of_T returned non-finite or negative values"
            raise InputError(msg)
        return K

    def solve(self, temperature, partial_pressures, **kwargs):
        """:func:`site_coverages` at these temperatures (K) and partial pressures or fugacities (Pa)."""
        K = self.constants_at(temperature)
        return site_coverages(K, partial_pressures, self.dissociative, self.interactions,
                              temperature, sites_per_species=self.sites_per_species,
                              site_kind=self.site_kind, **kwargs)


@dataclass(frozen=True)
class CoverageScan:
    """Coverages along an isotherm, an isobar or over a (T, p) map.

    Attributes
    ----------
    names : tuple of str
        Species labels.
    kind : str
        "isotherm", "isobar" or "map".
    temperature : ndarray of shape grid
        Temperature in K at every point.
    pressure : ndarray of shape grid
        Total pressure in Pa.
    partial_pressures : ndarray of shape (n_species, *grid)
        y_i p in Pa.
    fugacities : ndarray of shape (n_species, *grid) or None
        Peng–Robinson fugacities in Pa when the scan used them.
    solution : CoverageSolution
        The full result of the site balance.
    """

    names: tuple
    kind: str
    temperature: np.ndarray
    pressure: np.ndarray
    partial_pressures: np.ndarray
    fugacities: np.ndarray | None
    solution: CoverageSolution

    @property
    def coverage(self):
        """Coverages in ML, shape (n_species, *grid)."""
        return self.solution.coverage

    @property
    def empty(self):
        """Empty-site fraction(s) θ_*."""
        return self.solution.empty


def _composition(model, composition):
    n = model.n_species
    if composition is None:
        if n != 1:
            msg = f"composition: required (mole fraction of each of the {n} species' gases), got None"
            raise InputError(msg)
        return np.ones(1)
    y = np.asarray(composition, dtype=float)
    if y.shape != (n,) or not np.all(np.isfinite(y)) or np.any(y < 0) or y.sum() > 1 + 1e-9:
        msg = (f"composition: expected {n} mole fractions >= 0 summing to at most 1 "
               f"(the rest inert), got {composition!r}")
        raise InputError(msg)
    return y


def _scan(model, kind, T, p, composition, real_gas):
    y = _composition(model, composition)
    T, p = np.broadcast_arrays(np.asarray(T, dtype=float), np.asarray(p, dtype=float))
    if not np.all(np.isfinite(p)) or np.any(p <= 0):
        msg = "pressure: expected finite total pressures > 0 in Pa"
        raise InputError(msg)
    partial = y.reshape((-1,) + (1,) * p.ndim) * p
    fug = None
    if model.gases is not None:
        from adsorb import eos

        if real_gas:
            if abs(y.sum() - 1.0) > 1e-9:
                msg = ("composition: real_gas=True needs the full gas composition (mole "
                       f"fractions summing to 1), got {y.tolist()}")
                raise InputError(msg)
            fug = eos.fugacities(model.gases, y, T, p)
        else:
            eos.ideality_warnings(model.gases, T, p, composition=y / y.sum())
    elif real_gas:
        msg = "real_gas: requires AdsorptionModel.gases (the gas of each species), got gases=None"
        raise InputError(msg)
    sol = model.solve(T, partial if fug is None else fug)
    return CoverageScan(model.names, kind, T, p, partial, fug, sol)


def _axis(values, name, unit):
    arr = np.asarray(values, dtype=float)
    if arr.ndim != 1 or arr.size == 0:
        msg = f"{name}: expected a 1D array of values in {unit}, got shape {arr.shape}"
        raise InputError(msg)
    return arr


def _scalar(value, name, unit):
    arr = np.asarray(value, dtype=float)
    if arr.ndim != 0 or not np.isfinite(arr) or arr <= 0:
        msg = f"{name}: expected one positive value in {unit}, got {value!r}"
        raise InputError(msg)
    return float(arr)


def isotherm(model, temperature, pressure, *, composition=None, real_gas=False):
    """Coverages θ(p) at fixed temperature.

    Parameters
    ----------
    model : AdsorptionModel
    temperature : float
        Temperature in K.
    pressure : array_like of shape (n_p,)
        Total pressures in Pa.
    composition : array_like of shape (n_species,), optional (keyword-only)
        Mole fraction of each species' gas (sum <= 1, rest inert); required for
        several species.
    real_gas : bool, optional (keyword-only)
        Use Peng–Robinson fugacities instead of partial pressures (needs
        ``model.gases``). Default False.

    Returns
    -------
    CoverageScan
        kind "isotherm", grid shape (n_p,).
    """
    T = _scalar(temperature, "temperature", "K")
    p = _axis(pressure, "pressure", "Pa")
    return _scan(model, "isotherm", np.full(p.shape, T), p, composition, real_gas)


def isobar(model, pressure, temperature, *, composition=None, real_gas=False):
    """Coverages θ(T) at fixed total pressure (Pa) over temperatures (K), grid (n_T,)."""
    p = _scalar(pressure, "pressure", "Pa")
    T = _axis(temperature, "temperature", "K")
    return _scan(model, "isobar", T, np.full(T.shape, p), composition, real_gas)


def coverage_map(model, temperature, pressure, *, composition=None, real_gas=False):
    """Coverages over a (T, p) grid: temperature (n_T,) in K by pressure (n_p,) in Pa.

    Returns a :class:`CoverageScan` of kind "map" with grid shape (n_T, n_p).
    """
    T = _axis(temperature, "temperature", "K")
    p = _axis(pressure, "pressure", "Pa")
    TT, PP = np.meshgrid(T, p, indexing="ij")
    return _scan(model, "map", TT, PP, composition, real_gas)


def isosteric_heat(model, coverage, temperature, *, relative_step=1e-3):
    """Isosteric heat of adsorption q_st = k T² (∂ ln p_i/∂T)_θ, in eV per gas molecule.

    The pressures in equilibrium with the fixed coverages are found from the
    explicit inverse of the site balance (:func:`~adsorb.coverage.pressures_for_coverage`),
    and ln p_i is differentiated in T by a five-point central difference
    (error O(h⁴)). For ideal Langmuir adsorption q_st = -ΔH_ads; for
    K = K0 T^-γ exp(q0/kT), q_st = q0 + γkT. With mean-field interactions
    q_st,i(θ) = q_st,i(0) - Σ_j ε_ij θ_j (molecular; twice that per A2 for a
    dissociative species, whose q_st is per A2 molecule).

    Parameters
    ----------
    model : AdsorptionModel
    coverage : array_like of shape (n_species, ...)
        Coverages in ML (each > 0, leaving empty sites on every kind).
    temperature : array_like
        Temperature in K, broadcasting against the trailing axes of ``coverage``.
    relative_step : float, optional (keyword-only)
        Step h/T of the finite difference (default 1e-3).

    Returns
    -------
    ndarray of shape (n_species, *grid)
        q_st in eV per molecule of gas adsorbed (multiply by
        :data:`adsorb.constants.EV_TO_KJ_MOL` for kJ/mol).
    """
    if not (np.isfinite(relative_step) and 0 < relative_step < 0.05):
        msg = f"relative_step: expected a small positive fraction (e.g. 1e-3), got {relative_step!r}"
        raise InputError(msg)
    T = np.asarray(temperature, dtype=float)
    theta = np.asarray(coverage, dtype=float)
    if theta.ndim == 0 or theta.shape[0] != model.n_species:
        msg = (f"coverage: expected shape ({model.n_species}, ...) with species on axis 0, "
               f"got {theta.shape}")
        raise InputError(msg)
    grid = np.broadcast_shapes(theta.shape[1:], T.shape)
    T = np.broadcast_to(T, grid)
    if not np.all(np.isfinite(T)) or np.any(T <= 0):
        msg = f"temperature: expected finite values > 0 in K, got {temperature!r}"
        raise InputError(msg)
    h = relative_step * T

    unit_k = np.ones((model.n_species,) + grid)

    def ln_p(TT):
        # K enters the site balance only as K_i p_i, so p_i = p_i(K = 1) / K_i exactly:
        # ln K is differentiated directly (exact where K itself is capped at low T)
        if model.ln_equilibrium_constants is None:
            ln_k = np.log(model.constants_at(TT))
        else:
            ln_k = np.asarray(model.ln_equilibrium_constants(TT), dtype=float)
        return np.log(pressures_for_coverage(
            unit_k, theta, model.dissociative, model.interactions,
            TT if model.interactions is not None else None,
            sites_per_species=model.sites_per_species, site_kind=model.site_kind)) - ln_k

    d = (ln_p(T - 2 * h) - 8 * ln_p(T - h) + 8 * ln_p(T + h) - ln_p(T + 2 * h)) / (12 * h)
    return constants.kB_eV * T**2 * d


# --------------------------------------------------------------------------- plots

_PRESSURE_UNITS = {"Pa": 1.0, "bar": constants.bar}


def _new_figure(ncols=1, width=5.5, height=4.0):
    import matplotlib

    matplotlib.use("Agg")
    from matplotlib.figure import Figure

    fig = Figure(figsize=(width * ncols, height), layout="constrained")
    axes = [fig.add_subplot(1, ncols, i + 1) for i in range(ncols)]
    return fig, axes


def _selected(scan, species):
    if species is None:
        return list(range(len(scan.names)))
    chosen = []
    for s in ([species] if isinstance(species, (str, int)) else species):
        if isinstance(s, str) and s in scan.names:
            chosen.append(scan.names.index(s))
        elif isinstance(s, (int, np.integer)) and 0 <= s < len(scan.names):
            chosen.append(int(s))
        else:
            msg = f"species: expected names from {list(scan.names)} or their indices, got {s!r}"
            raise InputError(msg)
    return chosen


def _check_kind(scan, kind):
    if not isinstance(scan, CoverageScan) or scan.kind != kind:
        got = scan.kind if isinstance(scan, CoverageScan) else type(scan).__name__
        msg = f"scan: expected a CoverageScan of kind {kind!r}, got {got!r}"
        raise InputError(msg)


def _pressure_unit(unit):
    if unit not in _PRESSURE_UNITS:
        msg = f"pressure_unit: expected 'bar' or 'Pa', got {unit!r}"
        raise InputError(msg)
    return _PRESSURE_UNITS[unit]


def _mark_multiple(ax, x, scan):
    multi = np.asarray(scan.solution.multiple_solutions)
    if multi.any():
        ax.fill_between(x, 0, 1, where=multi, color="0.85", step="mid",
                        label="several mean-field solutions (stable one shown)")


def plot_isotherm(scan, path, *, species=None, pressure_unit="bar"):
    """Plot θ(p) of an isotherm scan (log pressure axis); write PNG and SVG; return the Figure.

    Parameters
    ----------
    scan : CoverageScan
        From :func:`isotherm`.
    path : str or Path
        Output path without suffix (``.png`` and ``.svg`` are written).
    species : str, int or sequence, optional (keyword-only)
        Species to draw (default all).
    pressure_unit : {"bar", "Pa"}, optional (keyword-only)
    """
    _check_kind(scan, "isotherm")
    scale = _pressure_unit(pressure_unit)
    fig, (ax,) = _new_figure()
    x = scan.pressure / scale
    _mark_multiple(ax, x, scan)
    for i in _selected(scan, species):
        ax.plot(x, scan.coverage[i], label=scan.names[i])
    ax.set_xscale("log")
    ax.set_xlim(x.min(), x.max())
    ax.set_ylim(0, 1)
    ax.set_xlabel(f"total pressure p / {pressure_unit}")
    ax.set_ylabel("coverage θ / ML")
    ax.set_title(f"isotherm at T = {scan.temperature.flat[0]:.6g} K")
    ax.legend(loc="best", fontsize="small")
    write_figure(fig, path)
    return fig


def plot_isobar(scan, path, *, species=None):
    """Plot θ(T) of an isobar scan; write PNG and SVG; return the Figure."""
    _check_kind(scan, "isobar")
    fig, (ax,) = _new_figure()
    x = scan.temperature
    _mark_multiple(ax, x, scan)
    for i in _selected(scan, species):
        ax.plot(x, scan.coverage[i], label=scan.names[i])
    ax.set_xlim(x.min(), x.max())
    ax.set_ylim(0, 1)
    ax.set_xlabel("temperature T / K")
    ax.set_ylabel("coverage θ / ML")
    ax.set_title(f"isobar at p = {scan.pressure.flat[0] / constants.bar:.6g} bar")
    ax.legend(loc="best", fontsize="small")
    write_figure(fig, path)
    return fig


def plot_coverage_map(scan, path, *, species=None, pressure_unit="bar"):
    """Coverage maps over (p, T), one panel per species; write PNG and SVG; return the Figure."""
    _check_kind(scan, "map")
    scale = _pressure_unit(pressure_unit)
    chosen = _selected(scan, species)
    fig, axes = _new_figure(ncols=len(chosen), width=4.2, height=3.6)
    p = scan.pressure[0] / scale
    T = scan.temperature[:, 0]
    multi = np.asarray(scan.solution.multiple_solutions)
    for ax, i in zip(axes, chosen):
        mesh = ax.pcolormesh(p, T, scan.coverage[i], shading="auto", vmin=0.0, vmax=1.0,
                             cmap="viridis")
        if multi.any() and p.size > 1 and T.size > 1:
            ax.contour(p, T, multi.astype(float), levels=[0.5], colors="w", linewidths=0.8)
        ax.set_xscale("log")
        ax.set_xlabel(f"total pressure p / {pressure_unit}")
        ax.set_ylabel("temperature T / K")
        ax.set_title(scan.names[i])
        fig.colorbar(mesh, ax=ax, label="coverage θ / ML")
    write_figure(fig, path)
    return fig


_HEAT_UNITS = {"kJ/mol": (constants.EV_TO_KJ_MOL, "kJ mol⁻¹"), "eV": (1.0, "eV")}


def plot_isosteric_heat(coverage, heat, path, *, labels=None, unit="kJ/mol", linestyles=None, title=None):
    """Plot isosteric heats q_st against coverage; write PNG and SVG; return the Figure.

    q_st = k T² (∂ ln p/∂T)_θ is the Clausius–Clapeyron relation at constant
    coverage (see :func:`isosteric_heat`); this function only draws it.

    Parameters
    ----------
    coverage : array_like of shape (n_c,) or (n_curves, n_c)
        Coverages in ML (the x values; one row for all curves, or one row per curve).
    heat : array_like of shape (n_c,) or (n_curves, n_c)
        q_st in eV per gas molecule, e.g. a row of :func:`isosteric_heat`.
    path : str or Path
        Output path without suffix (``.png`` and ``.svg`` are written).
    labels : sequence of str, optional (keyword-only)
        One legend entry per curve (default: none).
    unit : {"kJ/mol", "eV"}, optional (keyword-only)
        Unit of the y axis (default kJ/mol).
    linestyles : sequence, optional (keyword-only)
        One matplotlib line style per curve (default solid).
    title : str, optional (keyword-only)

    Returns
    -------
    matplotlib.figure.Figure
        The curves are Line2D objects with gid ``"isosteric-heat"``.

    Raises
    ------
    InputError
        Mismatched shapes, non-finite values, coverages outside [0, 1], an unknown
        unit, or a wrong number of labels or line styles.
    """
    if unit not in _HEAT_UNITS:
        msg = f"unit: expected 'kJ/mol' or 'eV', got {unit!r}"
        raise InputError(msg)
    q = np.asarray(heat, dtype=float)
    q = q[None] if q.ndim == 1 else q
    if q.ndim != 2 or q.size == 0:
        msg = f"heat: expected an array of shape (n_c,) or (n_curves, n_c) in eV, got shape {np.shape(heat)}"
        raise InputError(msg)
    theta = np.asarray(coverage, dtype=float)
    try:
        theta = np.broadcast_to(theta, q.shape)
    except ValueError:
        msg = f"coverage: expected shape ({q.shape[1]},) or {q.shape} to match heat, got {np.shape(coverage)}"
        raise InputError(msg) from None
    if not (np.all(np.isfinite(q)) and np.all(np.isfinite(theta))):
        msg = "heat, coverage: expected finite values (q_st in eV, θ in ML)"
        raise InputError(msg)
    if np.any(theta < 0) or np.any(theta > 1):
        msg = f"coverage: expected coverages in [0, 1] ML, got {theta.min():g} to {theta.max():g}"
        raise InputError(msg)
    for name, values in (("labels", labels), ("linestyles", linestyles)):
        if values is not None and len(values) != q.shape[0]:
            msg = f"{name}: expected {q.shape[0]} entries (one per curve), got {len(values)}"
            raise InputError(msg)
    factor, text = _HEAT_UNITS[unit]
    fig, (ax,) = _new_figure()
    for i in range(q.shape[0]):
        ax.plot(theta[i], q[i] * factor, ls=linestyles[i] if linestyles is not None else "-",
                label=labels[i] if labels is not None else None, gid="isosteric-heat")
    ax.set_xlim(0, 1)
    ax.set_xlabel("coverage θ / ML")
    ax.set_ylabel(f"isosteric heat q_st / {text}")
    ax.set_title(title or "isosteric heat (Clausius–Clapeyron at constant θ)", fontsize=10)
    if labels is not None:
        ax.legend(loc="best", fontsize="small")
    write_figure(fig, path)
    return fig
