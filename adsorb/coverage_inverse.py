"""Inverse functions of the site balance: pressures for given coverages, and the grand potential.

:func:`pressures_for_coverage` solves the equilibrium equations of
:func:`adsorb.coverage.site_coverages` explicitly for the pressures;
:func:`mean_field_grand_potential` evaluates Ω (module docstring of :mod:`adsorb.coverage`)
at given coverages. Import both from :mod:`adsorb.coverage`.
"""

from __future__ import annotations

import numpy as np
from scipy.special import xlogy

from adsorb.coverage_langmuir import _as_float_array, _prepare, _species_first
from adsorb.errors import InputError

__all__ = ["pressures_for_coverage", "mean_field_grand_potential"]


def _coverage_setup(K, coverage, dissociative, interactions, temperature,
                    sites_per_species, site_kind):
    theta = _as_float_array(coverage, "coverage")
    Kc = _as_float_array(K, "K")
    if theta.ndim == 0 or Kc.ndim == 0:
        msg = f"K and coverage: expected the species on axis 0, got shapes {Kc.shape} and {theta.shape}"
        raise InputError(msg)
    spec, _, kT, grid, _ = _prepare(
        Kc, np.ones_like(theta), temperature,
        (dissociative, interactions, sites_per_species, site_kind),
        need_temperature=interactions is not None)
    n = spec.n_species
    theta = np.broadcast_to(_species_first(theta, len(grid)), (n,) + grid)
    Kb = np.broadcast_to(_species_first(Kc, len(grid)), (n,) + grid)
    if not np.all(np.isfinite(theta)) or np.any(theta < 0):
        msg = f"coverage: expected finite values >= 0 in ML, got {coverage!r}"
        raise InputError(msg)
    empty = []
    for idx in spec.members:
        e = 1.0 - (spec.sites[idx].reshape((-1,) + (1,) * len(grid)) * theta[idx]).sum(axis=0)
        empty.append(e)
    empty = np.array(empty)
    if np.any(empty < -1e-12):
        msg = "coverage: occupied site fraction Σ n_i θ_i exceeds 1 on some site kind"
        raise InputError(msg)
    return spec, theta, Kb, kT, grid, np.clip(empty, 0.0, None)


def pressures_for_coverage(K, coverage, dissociative=None, interactions=None, temperature=None,
                           *, sites_per_species=None, site_kind=None):
    """Partial pressures (Pa) at which the given coverages are in equilibrium.

    The explicit inverse of the equations solved by :func:`site_coverages`:
    ln p_i = m_i [ln θ_i - n_i ln θ_* + Σ_j ε_ij θ_j / kT] - ln K_i, with m_i = 1
    (molecular) or 2 (dissociative). Same conventions and arguments as
    :func:`site_coverages`, with ``coverage`` (n_species, ...) in ML in place of the
    pressures.

    Returns
    -------
    ndarray of shape (n_species, *grid)
        Pressures (or fugacities) in Pa.

    Raises
    ------
    InputError
        A coverage <= 0, a full site kind (θ_* = 0), K <= 0, or the arguments of
        :func:`site_coverages` are invalid.
    """
    spec, theta, Kb, kT, grid, empty = _coverage_setup(
        K, coverage, dissociative, interactions, temperature, sites_per_species, site_kind)
    if np.any(theta <= 0) or np.any(empty[spec.kind_of] <= 0) or np.any(Kb <= 0):
        msg = ("pressures_for_coverage: expected every coverage > 0, an empty-site fraction "
               "> 0 on every kind and K > 0")
        raise InputError(msg)
    nd = len(grid)
    col = (-1,) + (1,) * nd
    ln_rhs = np.log(theta) - spec.sites.reshape(col) * np.log(empty[spec.kind_of])
    if spec.eps is not None:
        ln_rhs = ln_rhs + np.tensordot(spec.eps, theta, axes=(1, 0)) / kT
    mult = np.where(spec.dissociative, 2.0, 1.0).reshape(col)
    return np.exp(mult * ln_rhs - np.log(Kb))


def mean_field_grand_potential(coverage, K, pressures, temperature, dissociative=None,
                               interactions=None, *, sites_per_species=None, site_kind=None):
    """Mean-field grand potential per site Ω (eV) at given coverages.

    Ω = Σ_i θ_i(-kT ln c_i) + ½ Σ_ij ε_ij θ_i θ_j + kT[Σ_i θ_i ln θ_i
    + Σ_k θ_*,k ln θ_*,k + Σ_i (n_i - 1) θ_i], with c_i = K_i p_i (molecular) or
    (K_i p_i)^(1/2) (dissociative) and θ_*,k = 1 - Σ_{i in k} n_i θ_i. Its stationary
    points are the solutions of :func:`site_coverages`; the stable one minimises it.
    At an ideal single-site solution Ω = kT Σ_k ln θ_*,k.

    Parameters
    ----------
    coverage : array_like of shape (n_species, ...)
        Coverages in ML.
    K, pressures, temperature, dissociative, interactions, sites_per_species, site_kind
        As in :func:`site_coverages`; temperature (K) is required.

    Returns
    -------
    ndarray of shape grid
        Ω in eV per site.
    """
    if temperature is None:
        msg = "temperature: required (in K) for the grand potential, got None"
        raise InputError(msg)
    spec, theta, Kb, kT, grid, empty = _coverage_setup(
        K, coverage, dissociative, interactions, temperature, sites_per_species, site_kind)
    _, ln_c, _, grid2, _ = _prepare(
        K, pressures, temperature, (dissociative, interactions, sites_per_species, site_kind),
        need_temperature=False)
    grid = np.broadcast_shapes(grid, grid2)
    nd = len(grid)
    theta = np.broadcast_to(_species_first(theta, nd), (spec.n_species,) + grid)
    ln_c = np.broadcast_to(_species_first(ln_c, nd), theta.shape)
    kT = np.broadcast_to(kT, grid)
    empty = np.broadcast_to(_species_first(empty, nd), (len(spec.kinds),) + grid)
    col = (-1,) + (1,) * nd
    val = (xlogy(theta, theta) - theta * ln_c + (spec.sites - 1.0).reshape(col) * theta).sum(axis=0)
    val = val + xlogy(empty, empty).sum(axis=0)
    out = kT * val
    if spec.eps is not None:
        out = out + 0.5 * np.einsum("i...,ij,j...->...", theta, spec.eps, theta)
    return out
