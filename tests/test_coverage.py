"""Tests of adsorb.coverage: Langmuir closed forms, invariants, mean-field lattice gas.

Sources of the reference facts used below:
* Langmuir isotherms (molecular, dissociative, competitive): I. Langmuir,
  J. Am. Chem. Soc. 1918, 40, 1361; textbook forms in Chorkendorff &
  Niemantsverdriet, Concepts of Modern Catalysis and Kinetics, Wiley-VCH 2003 (from memory).
* Mean-field (Bragg–Williams / Fowler–Guggenheim) lattice gas with attraction: critical
  point kT_c = -ε/4 at θ = 1/2 (Fowler & Guggenheim, Statistical Thermodynamics, 1939,
  from memory; also derived in the maintainers' reference compilation adsorbate-models.md §6).
* Independent numerical references: scipy.optimize.brentq and scipy.optimize.root.
"""

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from numpy.testing import assert_allclose
from scipy.optimize import brentq, root

import adsorb.coverage_mean_field as mean_field_module
from adsorb.constants import kB_eV
from adsorb.coverage import (
    CoverageSolution,
    mean_field_grand_potential,
    pressures_for_coverage,
    site_coverages,
)
from adsorb.errors import ConvergenceError, InputError, ModelWarning

log_kp = st.floats(min_value=np.log(1e-8), max_value=np.log(1e8))


# --------------------------------------------------------------------------- closed forms

@given(st.lists(log_kp, min_size=1, max_size=30))
def test_single_species_molecular_langmuir(lkp):
    """θ = Kp/(1 + Kp) (Langmuir 1918) to 1e-12 for Kp in [1e-8, 1e8]."""
    kp = np.exp(np.array(lkp))
    K = np.array([2.5e-4])
    p = (kp / K[0])[None]
    res = site_coverages(K[:, None], p)
    theta = kp / (1.0 + kp)
    assert_allclose(res.coverage[0], theta, rtol=1e-12, atol=0)
    assert_allclose(res.empty, 1.0 / (1.0 + kp), rtol=1e-12, atol=0)


@given(st.lists(log_kp, min_size=1, max_size=30))
def test_single_species_dissociative_langmuir(lkp):
    """θ = (Kp)^1/2/(1 + (Kp)^1/2) for A2 + 2* ⇌ 2A* (Langmuir 1918) to 1e-12."""
    kp = np.exp(np.array(lkp))
    res = site_coverages([[1.0]], kp[None], [True])
    x = np.sqrt(kp)
    assert_allclose(res.coverage[0], x / (1.0 + x), rtol=1e-12, atol=0)


@given(st.lists(log_kp, min_size=3, max_size=3), st.lists(log_kp, min_size=3, max_size=3))
def test_competitive_langmuir(lk, lp):
    """θ_i = K_i p_i/(1 + Σ K_j p_j) (competitive Langmuir, textbook) to 1e-12."""
    K = np.exp(np.array(lk)) * 1e-5
    p = np.exp(np.array(lp))
    res = site_coverages(K, p)
    kp = K * p
    assert_allclose(res.coverage, kp / (1.0 + kp.sum()), rtol=1e-12, atol=0)
    assert_allclose(res.empty, 1.0 / (1.0 + kp.sum()), rtol=1e-12, atol=0)


def test_competitive_molecular_and_dissociative():
    """θ_* = 1/(1 + Σ_mol K p + Σ_diss (K p)^1/2) (adsorbate-models.md §6; textbook)."""
    K = np.array([1e-3, 4e-2, 2e-6])
    p = np.array([[1e2, 1e5], [3e1, 1e4], [1e5, 1e3]])
    res = site_coverages(K[:, None], p, [False, True, False])
    c = np.array([K[0] * p[0], np.sqrt(K[1] * p[1]), K[2] * p[2]])
    assert_allclose(res.empty, 1.0 / (1.0 + c.sum(axis=0)), rtol=1e-13)
    assert_allclose(res.coverage, c / (1.0 + c.sum(axis=0)), rtol=1e-13)


@given(log_kp)
def test_two_site_species_quadratic_balance(lkp):
    """A + 2* ⇌ A(2*): θ = Kp θ_*², θ_* + 2θ = 1, so θ_* = 2/(1 + sqrt(1 + 8Kp)) (common practice)."""
    kp = float(np.exp(lkp))
    res = site_coverages([1.0], [kp], sites_per_species=[2])
    empty = 2.0 / (1.0 + np.sqrt(1.0 + 8.0 * kp))
    assert_allclose(res.empty, empty, rtol=1e-12)
    assert_allclose(res.coverage[0], kp * empty**2, rtol=1e-12)
    assert res.residual < 1e-12


def test_site_kinds_are_independent_balances():
    """Species on different site kinds do not compete: each kind is its own Langmuir balance."""
    K = np.array([1e-3, 2e-4, 5e-2])
    p = np.array([1e4, 3e4, 10.0])
    res = site_coverages(K, p, site_kind=["top", "hollow", "top"])
    top = site_coverages(K[[0, 2]], p[[0, 2]])
    hollow = site_coverages(K[[1]], p[[1]])
    assert res.site_kinds == ("top", "hollow")
    assert_allclose(res.coverage[[0, 2]], top.coverage, rtol=1e-14)
    assert_allclose(res.coverage[1], hollow.coverage[0], rtol=1e-14)
    assert_allclose(res.empty, [top.empty, hollow.empty], rtol=1e-14)
    assert res.empty.shape == (2,)


def test_broadcasting_species_axis_first():
    """K (n,) broadcasts over a pressure grid (n, a, b); temperature broadcasts on the grid."""
    K = np.array([1e-4, 1e-3])
    p = np.ones((2, 3, 4)) * np.logspace(2, 5, 4)
    res = site_coverages(K, p)
    assert isinstance(res, CoverageSolution)
    assert res.coverage.shape == (2, 3, 4)
    assert res.empty.shape == (3, 4)
    kp = K[:, None, None] * p
    assert_allclose(res.coverage, kp / (1 + kp.sum(axis=0)), rtol=1e-13)
    res_t = site_coverages(K, p, interactions=np.zeros((2, 2)), temperature=np.full((3, 1), 300.0))
    assert_allclose(res_t.coverage, res.coverage, rtol=1e-13)


# --------------------------------------------------------------------------- invariants

@settings(max_examples=40)
@given(st.lists(st.tuples(log_kp, st.booleans()), min_size=1, max_size=4),
       st.floats(min_value=-0.05, max_value=0.3), st.floats(min_value=200.0, max_value=1500.0))
def test_invariants(species, eps_scale, temperature):
    """θ in [0, 1], Σθ <= 1, site-balance residual < 1e-10, with and without interactions."""
    lkp = np.array([s[0] for s in species])
    diss = [s[1] for s in species]
    n = len(species)
    K = np.exp(lkp) * 1e-5
    p = np.full(n, 1e5)
    eps = eps_scale * (np.eye(n) + 0.3 * (np.ones((n, n)) - np.eye(n)))
    for kwargs in ({}, {"interactions": eps, "temperature": temperature}):
        res = site_coverages(K, p, diss, warn_multiple=False, **kwargs)
        assert np.all(res.coverage >= 0) and np.all(res.coverage <= 1)
        assert res.coverage.sum() <= 1.0 + 1e-14
        assert res.residual < 1e-10
        assert_allclose(res.coverage.sum() + res.empty, 1.0, rtol=0, atol=1e-13)


@given(st.lists(log_kp, min_size=2, max_size=4), st.integers(min_value=0, max_value=3),
       st.booleans())
def test_coverage_increases_with_own_pressure(lkp, which, repulsive):
    """∂θ_i/∂p_i > 0 (ideal Langmuir, and with repulsive interactions: stable solutions)."""
    n = len(lkp)
    which = which % n
    K = np.exp(np.array(lkp)) * 1e-5
    p = np.full((n, 2), 1e5)
    p[which, 1] *= 1.5
    kwargs = {}
    if repulsive:
        kwargs = {"interactions": 0.1 * np.eye(n) + 0.02, "temperature": 500.0}
    res = site_coverages(K, p, **kwargs)
    assert res.coverage[which, 1] > res.coverage[which, 0]
    others = [i for i in range(n) if i != which]
    assert np.all(res.coverage[others, 1] <= res.coverage[others, 0])


@given(st.floats(min_value=-2.0, max_value=-0.05), st.floats(min_value=1.0, max_value=1e7))
def test_coverage_decreases_with_temperature_for_exothermic_adsorption(dh, pressure):
    """K = K0 exp(-ΔH/kT) with ΔH < 0 falls with T, so θ falls with T (van 't Hoff; common practice)."""
    T = np.linspace(200.0, 1200.0, 30)
    K = (1e-9 * np.exp(-dh / (kB_eV * T)))[None]
    res = site_coverages(K, np.array([[pressure]]))
    theta = res.coverage[0]
    assert np.all(np.diff(theta) <= 0)
    assert theta[0] > theta[-1]


def test_envelope_identity_dOmega_dlnp():
    """At the stable solution ∂Ω/∂ln p_i = -kT θ_i (molecular), -kT θ_i/2 (dissociative)
    (thermodynamic identity of the grand potential, derived; checked by central differences)."""
    T = 450.0
    K = np.array([3e-4, 1e-5, 2e-3])
    p = np.array([2e3, 5e4, 1e2])
    diss = [False, True, False]
    eps = np.array([[0.15, 0.05, 0.0], [0.05, 0.2, 0.04], [0.0, 0.04, -0.05]])

    def omega_at(pp):
        res = site_coverages(K, pp, diss, eps, T)
        return mean_field_grand_potential(res.coverage, K, pp, T, diss, eps), res

    _, res0 = omega_at(p)
    for i in range(3):
        h = 1e-4
        up, dn = p.copy(), p.copy()
        up[i] *= np.exp(h)
        dn[i] *= np.exp(-h)
        d = (omega_at(up)[0] - omega_at(dn)[0]) / (2 * h)
        factor = 0.5 if diss[i] else 1.0
        assert_allclose(d, -kB_eV * T * factor * res0.coverage[i], rtol=1e-7)


def test_ideal_grand_potential_is_kT_ln_empty():
    """At an ideal single-site solution Ω = kT ln θ_* (Langmuir grand potential, derived)."""
    K = np.array([1e-3, 2e-5])
    p = np.array([1e3, 1e5])
    res = site_coverages(K, p)
    om = mean_field_grand_potential(res.coverage, K, p, 300.0)
    assert_allclose(om, kB_eV * 300.0 * np.log(res.empty), rtol=1e-13)


# --------------------------------------------------------------------------- interactions

def _fg_roots(lnkp, eps, T):
    """All roots of ln θ - ln(1-θ) - ln(Kp) + εθ/kT = 0 on (0, 1) by brentq (scipy)."""
    kT = kB_eV * T

    def f(t):
        return np.log(t) - np.log1p(-t) - lnkp + eps * t / kT

    grid = np.linspace(1e-12, 1 - 1e-12, 20001)
    vals = f(grid)
    roots = []
    for a, b, fa, fb in zip(grid[:-1], grid[1:], vals[:-1], vals[1:]):
        if fa == 0:
            roots.append(a)
        elif fa * fb < 0:
            roots.append(brentq(f, a, b, xtol=1e-15, rtol=1e-15))
    return np.array(roots)


def test_fowler_guggenheim_single_root_above_tc_repulsive():
    """Repulsive FG: θ solves Kp = θ/(1-θ) exp(εθ/kT) (adsorbate-models.md §6); compare with brentq."""
    eps, T = 0.25, 400.0
    kp = np.logspace(-6, 6, 13)
    res = site_coverages([[1.0]], kp[None], interactions=[[eps]], temperature=T)
    expected = np.array([_fg_roots(np.log(x), eps, T)[0] for x in kp])
    assert_allclose(res.coverage[0], expected, rtol=1e-11, atol=1e-14)
    assert not res.multiple_solutions.any()


def test_mean_field_critical_point():
    """kT_c = -ε/4 (Bragg–Williams; Fowler & Guggenheim 1939): at the symmetric pressure
    Kp = exp(ε/2kT) three roots (two stable) below T_c, one root above."""
    eps = -0.12
    Tc = -eps / (4 * kB_eV)
    for T, expect_multiple in ((0.9 * Tc, True), (0.97 * Tc, True), (1.03 * Tc, False),
                               (1.3 * Tc, False)):
        lnkp = eps / (2 * kB_eV * T)
        roots = _fg_roots(lnkp, eps, T)
        assert len(roots) == (3 if expect_multiple else 1)
        if expect_multiple:
            with pytest.warns(ModelWarning, match="several stable"):
                res = site_coverages([1.0], [np.exp(lnkp)], interactions=[[eps]], temperature=T)
            # symmetric point: the two stable roots are θ and 1-θ; either has the same Ω
            assert np.min(np.abs(roots[[0, 2]] - res.coverage[0])) < 1e-10
        else:
            res = site_coverages([1.0], [np.exp(lnkp)], interactions=[[eps]], temperature=T)
            assert_allclose(res.coverage[0], 0.5, atol=1e-12)
        assert bool(res.multiple_solutions) is expect_multiple


@pytest.mark.parametrize("shift", [0.97, 1.04])
def test_stable_branch_has_lowest_grand_potential(shift):
    """Below T_c off the symmetric pressure the returned root is the one of lower Ω
    (Ω(θ) = kT[θ lnθ + (1-θ)ln(1-θ)] - θ kT ln Kp + εθ²/2, evaluated here independently)."""
    eps, T = -0.12, 250.0
    kT = kB_eV * T
    assert T < -eps / (4 * kB_eV)
    lnkp = eps / (2 * kT) + np.log(shift)
    roots = _fg_roots(lnkp, eps, T)
    assert len(roots) == 3
    omega = kT * (roots * np.log(roots) + (1 - roots) * np.log1p(-roots)) - roots * kT * lnkp \
        + eps * roots**2 / 2
    stable = roots[np.argmin(omega)]
    assert stable == (roots[2] if shift > 1 else roots[0])
    with pytest.warns(ModelWarning):
        res = site_coverages([1.0], [np.exp(lnkp)], interactions=[[eps]], temperature=T)
    assert_allclose(res.coverage[0], stable, rtol=1e-11)
    om_lib = mean_field_grand_potential([roots], [1.0], [np.exp(lnkp)], T, None, [[eps]])
    assert_allclose(om_lib, omega, rtol=1e-12, atol=1e-15)


def test_multiple_flag_quiet_option_and_grid():
    """The flag marks exactly the hysteresis window of the isotherm below T_c (brentq count)."""
    eps, T = -0.12, 250.0
    kp = np.exp(eps / (2 * kB_eV * T)) * np.linspace(0.5, 1.5, 41)
    res = site_coverages([[1.0]], kp[None], interactions=[[eps]], temperature=T,
                         warn_multiple=False)
    expected = np.array([len(_fg_roots(np.log(x), eps, T)) == 3 for x in kp])
    assert expected.any() and not expected.all()
    assert np.array_equal(res.multiple_solutions, expected)
    theta = res.coverage[0]
    assert np.all(np.diff(theta) > 0)          # the stable isotherm rises, with one jump


def test_dissociative_interaction_enters_per_atom_energy():
    """θ_A = (Kp)^1/2 θ_* exp(-Σ ε_Aj θ_j/kT): the documented per-atom convention."""
    T = 600.0
    K = np.array([1e-4, 3e-5])
    p = np.array([1e4, 2e4])
    eps = np.array([[0.2, 0.07], [0.07, 0.1]])
    res = site_coverages(K, p, [True, False], eps, T)
    th = res.coverage
    kT = kB_eV * T
    emp = 1 - th.sum()
    assert_allclose(th[0], np.sqrt(K[0] * p[0]) * emp * np.exp(-(eps[0] @ th) / kT), rtol=1e-12)
    assert_allclose(th[1], K[1] * p[1] * emp * np.exp(-(eps[1] @ th) / kT), rtol=1e-12)


def test_agrees_with_scipy_root_pointwise():
    """Repulsive 4-species mixture (one dissociative): same answers as scipy.optimize.root to 1e-10."""
    rng = np.random.default_rng(7)
    T = rng.uniform(300, 900, 12)
    K = np.exp(rng.uniform(-14, -2, (4, 12)))
    p = np.exp(rng.uniform(0, 15, (4, 12)))
    diss = np.array([False, True, False, False])
    eps = np.array([[0.20, 0.10, 0.05, 0.02], [0.10, 0.15, 0.05, 0.02],
                    [0.05, 0.05, 0.25, 0.03], [0.02, 0.02, 0.03, 0.10]])
    res = site_coverages(K, p, diss, eps, T)
    for m in range(12):
        c = K[:, m] * p[:, m]
        c = np.where(diss, np.sqrt(c), c)
        kT = kB_eV * T[m]

        def fun(x, c=c, kT=kT):
            return x - c * (1 - x.sum()) * np.exp(-(eps @ x) / kT)

        sol = root(fun, c / (1 + c.sum()), tol=1e-13)
        assert np.max(np.abs(fun(sol.x))) < 1e-12      # scipy's answer is a genuine root
        assert_allclose(res.coverage[:, m], sol.x, rtol=0, atol=1e-10)


def test_multi_site_and_kinds_with_interactions():
    """Multi-site species and two site kinds with cross-kind interactions satisfy their equations."""
    T = 500.0
    kT = kB_eV * T
    K = np.array([2e-3, 5e-4, 1e-3])
    p = np.array([1e4, 1e4, 1e3])
    n_sites = np.array([2, 1, 1])
    kinds = ["a", "a", "b"]
    eps = np.array([[0.1, 0.05, 0.03], [0.05, 0.2, 0.0], [0.03, 0.0, 0.15]])
    res = site_coverages(K, p, None, eps, T, sites_per_species=n_sites, site_kind=kinds)
    th = res.coverage
    emp_a = 1 - 2 * th[0] - th[1]
    emp_b = 1 - th[2]
    assert_allclose(res.empty, [emp_a, emp_b], rtol=1e-12)
    g = np.exp(-(eps @ th) / kT)
    assert_allclose(th, K * p * np.array([emp_a**2, emp_a, emp_b]) * g, rtol=1e-11)


def test_pressures_for_coverage_round_trip():
    """pressures_for_coverage is the inverse of site_coverages (identity)."""
    T = np.array([400.0, 700.0])
    K = np.array([[1e-3, 1e-4], [1e-5, 1e-6], [3e-4, 3e-4]])
    theta = np.array([[0.2, 0.1], [0.3, 0.05], [0.1, 0.6]])
    diss = [False, True, False]
    eps = np.array([[0.1, 0.0, 0.02], [0.0, 0.05, 0.01], [0.02, 0.01, 0.2]])
    p = pressures_for_coverage(K, theta, diss, eps, T)
    back = site_coverages(K, p, diss, eps, T)
    assert_allclose(back.coverage, theta, rtol=1e-11)


def test_large_map_runs():
    """A 200 x 200 map of 4 species (one dissociative) with interactions runs (no timing assertion)."""
    T = np.linspace(300, 900, 200)[:, None]
    p = np.logspace(0, 7, 200)[None, :]
    dg = np.array([-1.2, -0.9, -1.5, -0.6])[:, None, None]       # invented
    K = np.exp(-dg / (kB_eV * T)) * 1e-13
    P = np.array([0.3, 0.3, 0.2, 0.2])[:, None, None] * p
    eps = np.array([[0.20, 0.10, 0.05, 0.02], [0.10, 0.15, 0.05, 0.02],
                    [0.05, 0.05, 0.25, 0.03], [0.02, 0.02, 0.03, 0.10]])
    res = site_coverages(K, P, [False, False, True, False], eps, T)
    assert res.coverage.shape == (4, 200, 200)
    assert res.residual.max() < 1e-12
    assert not res.multiple_solutions.any()


# --------------------------------------------------------------------------- errors

def test_convergence_error_names_the_point(monkeypatch):
    """A solve cut short raises ConvergenceError naming the grid index, T and pressures."""
    monkeypatch.setattr(mean_field_module, "_MAX_ITER", 1)
    K = np.array([1e-3, 1e-3])
    p = np.array([[1e5, 1e5], [1e5, 2e5]])
    with pytest.raises(ConvergenceError, match=r"grid index \(0,\).*temperature = 300 K.*pressures"):
        site_coverages(K[:, None], p, None, [[0.3, 0.1], [0.1, 0.3]], 300.0)


@pytest.mark.parametrize("kwargs, match", [
    ({"interactions": [[0.1, 0.0], [0.0, 0.1]]}, "temperature: required"),
    ({"interactions": [[0.1, 0.2], [0.0, 0.1]], "temperature": 300}, "symmetric"),
    ({"interactions": [[0.1]], "temperature": 300}, r"\(2, 2\)"),
    ({"interactions": np.zeros((2, 2)), "temperature": -5.0}, "temperature"),
    ({"dissociative": [True]}, "dissociative"),
    ({"dissociative": ["yes", "no"]}, "dissociative"),
    ({"sites_per_species": [1, 0]}, "sites_per_species"),
    ({"sites_per_species": [1.5, 1]}, "sites_per_species"),
    ({"site_kind": ["a"]}, "site_kind"),
])
def test_bad_arguments(kwargs, match):
    """Bad arguments raise InputError naming the parameter."""
    with pytest.raises(InputError, match=match):
        site_coverages([1e-3, 1e-4], [1e3, 1e3], **kwargs)


@pytest.mark.parametrize("K, p, match", [
    ([1e-3, -1.0], [1e3, 1e3], "K: expected values >= 0"),
    ([1e-3, 1e-3], [1e3, np.nan], "pressures: expected finite"),
    ([1e-3, 1e-3], [1e3, 1e3, 1e3], "species axes"),
    (1e-3, 1e3, "species on axis 0"),
])
def test_bad_arrays(K, p, match):
    """Negative, non-finite or mis-shaped K and pressures raise InputError."""
    with pytest.raises(InputError, match=match):
        site_coverages(K, p)


def test_absent_species_has_zero_coverage():
    """K = 0 or p = 0: the species does not adsorb and the others follow Langmuir exactly."""
    res = site_coverages([1e-3, 0.0, 1e-2], [1e3, 1e3, 0.0], interactions=np.full((3, 3), 0.05),
                         temperature=300.0)
    assert res.coverage[1] == 0 and res.coverage[2] == 0
    single = site_coverages([1e-3], [1e3], interactions=[[0.05]], temperature=300.0)
    assert_allclose(res.coverage[0], single.coverage[0], rtol=1e-13)


def test_stable_pick_is_global_minimum_in_attractive_mixtures():
    """The returned state has the lowest Ω among all self-consistent roots that
    scipy.optimize.root finds from many random starts (log-formulated equations)."""
    from scipy.special import logsumexp

    rng = np.random.default_rng(11)
    found_multiple = 0
    for _ in range(12):
        n = int(rng.integers(2, 4))
        T = rng.uniform(100, 600)
        kT = kB_eV * T
        A = rng.normal(-0.08, 0.12, (n, n))
        eps = (A + A.T) / 2
        lnc = rng.uniform(-3, 5, n) + rng.uniform(-1, 1) * (-np.diag(eps) / (2 * kT))
        K, p = np.exp(lnc) * 1e-5, np.full(n, 1e5)
        res = site_coverages(K, p, None, eps, T, warn_multiple=False)
        found_multiple += bool(res.multiple_solutions)
        om = float(mean_field_grand_potential(res.coverage, K, p, T, None, eps))

        def eqs(u, lnc=lnc, eps=eps, kT=kT, n=n):
            return np.r_[u[:n] - lnc - u[n] + (eps @ np.exp(u[:n])) / kT,
                         logsumexp(u)]

        best = np.inf
        for _ in range(25):
            sol = root(eqs, np.log(rng.dirichlet(np.ones(n + 1))), tol=1e-14)
            if np.abs(eqs(sol.x)).max() < 1e-9:
                best = min(best, float(mean_field_grand_potential(
                    np.exp(sol.x[:n]), K, p, T, None, eps)))
        assert om <= best + 1e-10 * abs(best) + 1e-13
    assert found_multiple > 0


def test_public_names_and_stable_signature():
    """site_coverages is a stable contract (DEVELOPERS.md): same object from adsorb, same signature."""
    import inspect

    import adsorb
    import adsorb.coverage as coverage

    assert adsorb.site_coverages is coverage.site_coverages
    for name in coverage.__all__:
        assert getattr(coverage, name).__module__.startswith("adsorb.coverage")
    params = inspect.signature(coverage.site_coverages).parameters
    assert [(p.name, p.kind.name, p.default) for p in params.values()] == [
        ("K", "POSITIONAL_OR_KEYWORD", inspect.Parameter.empty),
        ("pressures", "POSITIONAL_OR_KEYWORD", inspect.Parameter.empty),
        ("dissociative", "POSITIONAL_OR_KEYWORD", None),
        ("interactions", "POSITIONAL_OR_KEYWORD", None),
        ("temperature", "POSITIONAL_OR_KEYWORD", None),
        ("sites_per_species", "KEYWORD_ONLY", None),
        ("site_kind", "KEYWORD_ONLY", None),
        ("warn_multiple", "KEYWORD_ONLY", True),
    ]
