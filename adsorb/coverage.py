"""Equilibrium site coverages: Langmuir-type site balances with mean-field interactions.

The low-level solver :func:`site_coverages` is a stable contract: its signature
``site_coverages(K, pressures, dissociative=None, interactions=None, temperature=None)``
and the meaning of its arguments do not change.

Model (every species i adsorbs on sites of one kind k(i); coverages are per site
of that kind, in monolayers, ML)
-------------------------------------------------------------------------------
* molecular species, A(g) + n* ⇌ A(n*):        θ_i = K_i p_i θ_*^n_i g_i
* dissociative species, A2(g) + 2n* ⇌ 2A(n*):  θ_i = (K_i p_i)^(1/2) θ_*^n_i g_i
  (θ_i counts adsorbed *atoms* A per site; K_i belongs to the whole reaction)
* site balance of each kind k:                 θ_*,k + Σ_{i in k} n_i θ_i = 1
* mean-field (Fowler–Guggenheim / Frumkin, Bragg–Williams) lateral interactions:
  the adsorption energy of one i (one atom, for a dissociative species) is
  E_i(θ) = E_i(0) + Σ_j ε_ij θ_j, so that g_i = exp(-Σ_j ε_ij θ_j / kT).
  ε_ij > 0 is repulsive (it weakens binding), ε_ij < 0 attractive.  The matrix
  must be symmetric: only then do the equations derive from one free energy.
  For a dissociative species the interaction enters the per-atom energy, so the
  equilibrium constant of the whole reaction A2 + 2* ⇌ 2A* is multiplied by
  exp(-2 Σ_j ε_Aj θ_j / kT).

Sources: I. Langmuir, J. Am. Chem. Soc. 1918, 40, 1361 (site balance);
R. H. Fowler, E. A. Guggenheim, *Statistical Thermodynamics*, Cambridge, 1939 and
A. N. Frumkin, Z. Phys. Chem. 1925, 116, 466 (mean-field interacting isotherm).

Grand potential (mean field, per site, eV) whose stationary points are exactly
the equations above (c_i = K_i p_i, or (K_i p_i)^(1/2) for dissociative species)::

    Ω = Σ_i θ_i (-kT ln c_i) + ½ Σ_ij ε_ij θ_i θ_j
        + kT [Σ_i θ_i ln θ_i + Σ_k θ_*,k ln θ_*,k + Σ_i (n_i - 1) θ_i]

With one single-site species it reduces to
Ω(θ) = kT[θ ln θ + (1-θ) ln(1-θ)] - θ kT ln(Kp) + εθ²/2.  ∂Ω/∂θ_i = 0 (with
∂θ_*,k/∂θ_i = -n_i) gives kT ln θ_i - n_i kT ln θ_* - kT ln c_i + Σ_j ε_ij θ_j = 0,
the equilibrium equation.  Where several self-consistent solutions exist the
returned one has the lowest Ω (the stable phase); see :func:`site_coverages`.

Layout: this module holds :class:`CoverageSolution` and :func:`site_coverages`, and
re-exports every public name; the work is done in :mod:`adsorb.coverage_langmuir`
(input checks, the ideal solution, the site-balance residual),
:mod:`adsorb.coverage_mean_field` (the interacting Newton solver),
:mod:`adsorb.coverage_convexity` (local minima, convexified steps, uniqueness) and
:mod:`adsorb.coverage_inverse` (:func:`pressures_for_coverage`,
:func:`mean_field_grand_potential`).
"""

from __future__ import annotations

import warnings
from dataclasses import dataclass

import numpy as np

from adsorb import constants
from adsorb.coverage_inverse import mean_field_grand_potential, pressures_for_coverage
from adsorb.coverage_langmuir import _ideal_ln_empty, _prepare, _site_balance_residual, _Spec
from adsorb.coverage_mean_field import _solve_interacting
from adsorb.errors import ConvergenceError, ModelWarning

__all__ = [
    "CoverageSolution",
    "site_coverages",
    "pressures_for_coverage",
    "mean_field_grand_potential",
]

_SITE_BALANCE_TOL = 1.0e-12


@dataclass(frozen=True)
class CoverageSolution:
    """Result of :func:`site_coverages`.

    Attributes
    ----------
    coverage : ndarray of shape (n_species, *grid)
        Equilibrium coverage of each species in ML (molecules, or atoms for a
        dissociative species, per site of its kind).
    empty : ndarray
        Fraction of empty sites θ_*: shape ``grid`` with one site kind,
        ``(n_kinds, *grid)`` with several (same as ``empty_by_kind``).
    empty_by_kind : ndarray of shape (n_kinds, *grid)
        θ_* of every site kind, in the order of ``site_kinds``.
    residual : ndarray of shape grid
        Largest site-balance residual over the kinds,
        |1 - θ_*,k - Σ_i n_i c_i θ_*,k^n_i exp(-Σ_j ε_ij θ_j/kT)|, evaluated with the
        returned coverages (dimensionless).
    multiple_solutions : ndarray of bool, shape grid
        True where more than one locally stable self-consistent solution was
        found (attractive interactions: 2D condensation / hysteresis region).
        The returned coverage is the one with the lowest mean-field grand potential.
    iterations : int
        Largest number of Newton iterations used at any point (0 for a closed form).
    site_kinds : tuple
        Labels of the site kinds, in order of first appearance.
    """

    coverage: np.ndarray
    empty: np.ndarray
    empty_by_kind: np.ndarray
    residual: np.ndarray
    multiple_solutions: np.ndarray
    iterations: int
    site_kinds: tuple

    @property
    def phase_separation(self) -> bool:
        """True if any point has several stable mean-field solutions."""
        return bool(np.any(self.multiple_solutions))



def site_coverages(K, pressures, dissociative=None, interactions=None, temperature=None, *,
                   sites_per_species=None, site_kind=None, warn_multiple=True):
    """Equilibrium coverages of competing adsorbates from a Langmuir-type site balance.

    Parameters
    ----------
    K : array_like of shape (n_species, ...)
        Equilibrium constants in Pa^-1 (species on axis 0): θ_i = K_i p_i θ_*
        (molecular) or θ_i = (K_i p_i)^(1/2) θ_* (dissociative, K of A2 + 2* ⇌ 2A*).
        Values >= 0; K = 0 means the species does not adsorb.
    pressures : array_like of shape (n_species, ...)
        Gas partial pressures (or fugacities) in Pa, >= 0. Axis 0 is the species axis;
        the remaining axes of K, pressures and temperature broadcast by numpy's rules.
    dissociative : sequence of bool, optional
        True for a species whose gas precursor A2 gives two adsorbed A; its coverage
        counts atoms per site. Default: all molecular.
    interactions : array_like of shape (n_species, n_species), optional
        Symmetric mean-field interaction matrix ε_ij in eV: the adsorption energy of
        one i (per atom for a dissociative species) is E_i(0) + Σ_j ε_ij θ_j, so
        K_i,eff = K_i exp(-Σ_j ε_ij θ_j / kT) (squared for a dissociative species).
        ε > 0 repulsive. Fowler & Guggenheim 1939; Frumkin, Z. Phys. Chem. 1925, 116, 466.
    temperature : array_like, optional
        Temperature in K, broadcasting against the grid axes. Required with interactions.
    sites_per_species : sequence of int, optional (keyword-only)
        Number of sites n_i one adsorbed molecule (atom) occupies; θ_i = c_i θ_*^n_i and
        the site balance is θ_* + Σ n_i θ_i = 1. Default 1 for every species.
    site_kind : sequence of hashable, optional (keyword-only)
        Label of the site kind each species adsorbs on; species compete only within
        their kind and each kind has its own balance. Default: one kind.
    warn_multiple : bool, optional (keyword-only)
        Emit a :class:`~adsorb.errors.ModelWarning` (once per call) when several stable
        solutions are found. Default True.

    Returns
    -------
    CoverageSolution
        ``.coverage`` (n_species, *grid) in ML, ``.empty``, ``.empty_by_kind``,
        ``.residual``, ``.multiple_solutions``, ``.iterations``, ``.site_kinds``.

    Raises
    ------
    InputError
        Bad shapes or values, interactions without temperature, a non-symmetric ε.
    ConvergenceError
        The interacting solve did not reach a site-balance residual of 1e-12; the
        message names the grid index, temperature and pressures.

    Notes
    -----
    Without interactions the solution is closed-form (θ_* = 1/(1 + Σ c_i) with
    single-site species) or, with multi-site species, a monotone Newton iteration on
    ln θ_* that cannot overshoot. With interactions, a damped Newton iteration on the
    equilibrium equations in the log site-fraction ratios w_i = ln(n_i θ_i/θ_*),
    started from the non-interacting solution, with an Armijo line search on the
    mean-field grand potential Ω (module docstring). Where Ω is provably convex
    (λ_min(ε) >= -b kT, b the curvature bound of the entropy term) the solution is
    unique. Elsewhere the solve is repeated from the non-interacting solution in the
    field of a layer saturated by each species in turn; distinct local minima of Ω
    set ``multiple_solutions`` and the lowest Ω is returned.

    Precision: the target residual 1e-12 is met while max|ε|/kT stays below about 100;
    beyond that the rounding of the equations themselves (terms of size |ε|/kT) can
    exceed it and ConvergenceError is raised. See docs/methods-coverages.md.
    """
    spec, ln_c, kT, grid, (Kb, pb) = _prepare(
        K, pressures, temperature,
        (dissociative, interactions, sites_per_species, site_kind),
        need_temperature=interactions is not None)
    n = spec.n_species
    M = int(np.prod(grid, dtype=int))
    ln_c2 = ln_c.reshape(n, M)
    kT2 = None if kT is None else kT.reshape(M)
    multi = np.zeros(M, dtype=bool)
    if spec.eps is None or not np.any(spec.eps):
        ln_empty, it = _ideal_ln_empty(ln_c2, spec)
        theta = np.exp(ln_c2 + spec.sites[:, None] * ln_empty[spec.kind_of])
        ok = np.ones(M, dtype=bool)
        spec_res = spec if spec.eps is None else _Spec(**{**spec.__dict__, "eps": None})
        residual = _site_balance_residual(theta, ln_empty, ln_c2, spec_res, kT2)
    else:
        theta, ln_empty, multi, it, ok = _solve_interacting(spec, ln_c2, kT2)
        residual = _site_balance_residual(theta, ln_empty, ln_c2, spec, kT2)
    bad = ~ok | ~(residual <= _SITE_BALANCE_TOL)
    if np.any(bad):
        m = int(np.flatnonzero(bad)[0])
        idx = np.unravel_index(m, grid) if grid else ()
        t_txt = "" if kT2 is None else f"temperature = {kT2[m] / constants.kB_eV:.6g} K, "
        p_txt = np.array2string(pb.reshape(n, M)[:, m], precision=6)
        k_txt = np.array2string(Kb.reshape(n, M)[:, m], precision=6)
        msg = (f"site_coverages did not converge at grid index {tuple(int(i) for i in idx)}: "
               f"{t_txt}pressures = {p_txt} Pa, K = {k_txt} Pa^-1; site-balance residual "
               f"{residual[m]:.3g} after {it} iterations")
        raise ConvergenceError(msg)
    if warn_multiple and np.any(multi):
        msg = (f"site_coverages: {int(multi.sum())} of {M} points have several stable "
               "mean-field solutions (2D condensation / hysteresis); the one with the lowest "
               "grand potential is returned, see .multiple_solutions")
        warnings.warn(msg, ModelWarning, stacklevel=2)
    empty_by_kind = np.exp(ln_empty).reshape((len(spec.kinds),) + grid)
    return CoverageSolution(
        coverage=theta.reshape((n,) + grid),
        empty=empty_by_kind[0] if len(spec.kinds) == 1 else empty_by_kind,
        empty_by_kind=empty_by_kind,
        residual=residual.reshape(grid),
        multiple_solutions=multi.reshape(grid),
        iterations=int(it),
        site_kinds=spec.kinds,
    )
