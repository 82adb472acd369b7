"""Tests of adsorb.partition.surface_pes: Fourier fits, symmetry, classical and quantum lateral motion.

Sources of the checks are named beside each test:
* Sprowl, Campbell, Árnadóttir, J. Phys. Chem. C 2016, 120, 9719 (hindered translator, closed form);
* Jørgensen, Grönbeck, J. Phys. Chem. C 2017, 121, 7199 (classical configuration integral);
* textbook statistical mechanics (common practice): harmonic oscillator, Wigner–Kirkwood expansion,
  thermodynamic identities.
"""

import dataclasses

import numpy as np
import pytest
from scipy.special import i0e, i1e

from adsorb import constants as C
from adsorb.errors import InputError
from adsorb.partition import surface_pes as sp

KT = C.kB_eV


# ---------------------------------------------------------------------------
# independent reference formulas (written here from the published equations)
# ---------------------------------------------------------------------------
def bessel_classical_1d(t, m_amu, w_ev, b_a):
    """Classical hindered translator per direction: (2π m kT)^(1/2) b/h e^(-z) I0(z), z = W/2kT
    (Sprowl, Campbell, Árnadóttir 2016, as restated in the reference notes §1.4)."""
    z = w_ev / (2 * KT * t)
    return np.sqrt(2 * np.pi * m_amu * C.amu * C.k_B * t) * b_a * C.angstrom / C.h * i0e(z)


def sprowl_closed_form_1d(t, m_amu, w_ev, b_a):
    """Quantum-corrected hindered translator per direction, from the well bottom (Sprowl et al. 2016, eq.
    restated in reference notes §1.5): q_cl · (q_HO/q_HO,cl) · exp(1/((2 + 16 r) T*))."""
    nu = np.sqrt(w_ev * C.eV / (2 * m_amu * C.amu * (b_a * C.angstrom) ** 2))
    x = C.h * nu / (C.k_B * t)
    r = w_ev * C.eV / (C.h * nu)
    q_ho = np.exp(-x / 2) / -np.expm1(-x)
    return bessel_classical_1d(t, m_amu, w_ev, b_a) * q_ho * x * np.exp(x / (2 + 16 * r))


def exact_cosine_1d(t, m_amu, w_ev, b_a, nk=96, ng=80):
    """Exact q per direction for V = (W/2)(1 - cos 2πx/b), from the well bottom: Bloch bands of the
    Mathieu problem, plane waves (independent 1D route, numpy only)."""
    kin = C.h**2 / (2 * m_amu * C.amu * (b_a * C.angstrom) ** 2) / C.eV
    levels = []
    for k in (np.arange(nk) + 0.5) / nk:
        g = np.arange(-ng, ng + 1)
        h = np.diag(kin * (k + g) ** 2 + w_ev / 2)
        h += np.diag(np.full(2 * ng, -w_ev / 4), 1) + np.diag(np.full(2 * ng, -w_ev / 4), -1)
        levels.append(np.linalg.eigvalsh(h))
    e = np.concatenate(levels)
    t = np.atleast_1d(t)
    return np.array([np.sum(np.exp(-e / (KT * ti))) / nk for ti in t])


def separable_grid(w_ev, n=8):
    """V = (W/2)[2 - cos 2πu - cos 2πv] on an n x n grid (the two-direction hindered-translator surface)."""
    u = np.arange(n) / n
    uu, vv = np.meshgrid(u, u, indexing="ij")
    return 0.5 * w_ev * (2 - np.cos(2 * np.pi * uu) - np.cos(2 * np.pi * vv))


def q_from_bottom(contrib, t):
    """Partition function counted from the PES minimum: exp(ln q - zpe/kT)."""
    return np.exp(contrib.ln_q - contrib.zpe / (KT * np.asarray(t)))


def rotation(deg):
    a = np.radians(deg)
    return np.array([[np.cos(a), -np.sin(a)], [np.sin(a), np.cos(a)]])


E111 = {"top": 0.31, "bridge": 0.12, "fcc": 0.0, "hcp": 0.045}  # invented numbers
E100 = {"top": 0.40, "bridge": 0.15, "hollow": 0.0}  # invented numbers


# ---------------------------------------------------------------------------
# Fourier fits: exact interpolation and symmetry
# ---------------------------------------------------------------------------
@pytest.mark.parametrize("lattice, energies", [("111", E111), ("100", E100),
                                                ("111", {"top": -1.2, "bridge": -1.5, "fcc": -1.9, "hcp": -1.7}),
                                                ("100", {"ontop": 0.0, "bridge": 0.2, "hollow": 0.3})])
def test_site_fit_reproduces_site_energies_exactly(lattice, energies):
    # the symmetry-adapted series interpolates the given sites exactly (construction requirement, 1e-12)
    pes = sp.pes_from_sites(lattice, 2.77, energies)
    got = pes.site_energies()
    for name, val in energies.items():
        key = "top" if name == "ontop" else name
        assert got[key] == pytest.approx(val, abs=1e-12)
    assert pes.v_min_eV == pytest.approx(min(energies.values()), abs=1e-9)  # minimum is a site here


def test_site_fit_uses_the_expected_number_of_terms():
    # 111: constant, first-shell cos and sin stars, second-shell cos star -> 1 + 6 + 6 (13 Fourier terms)
    pes = sp.pes_from_sites("111", 2.77, E111)
    assert len(pes.g_indices) == 13
    assert not pes.centrosymmetric  # fcc != hcp needs the sine star: no inversion centre
    pes = sp.pes_from_sites("100", 2.77, E100)
    assert len(pes.g_indices) == 9  # constant + 4 (first shell) + 4 (second shell)
    assert pes.centrosymmetric


@pytest.mark.parametrize("lattice, energies, folds", [("111", E111, 3), ("100", E100, 4)])
def test_site_fit_has_the_lattice_symmetry(lattice, energies, folds):
    # p3m1 / p4m (common practice: wallpaper groups of fcc(111) and fcc(100) about a top atom):
    # invariance under the rotations about a top site, the mirrors, and lattice translations,
    # checked with Cartesian operations built here (not with the module's own group)
    pes = sp.pes_from_sites(lattice, 2.77, energies)
    rng = np.random.default_rng(7)
    pts = rng.uniform(-6, 6, size=(200, 2))
    v0 = pes.energy(pts[:, 0], pts[:, 1])
    ops = [rotation(360.0 / folds * i) for i in range(folds)]
    if lattice == "100":
        mirror = np.diag([1.0, -1.0])
    else:  # mirror line along a1 + a2 (30 degrees), through top, fcc and hcp
        mirror = rotation(30) @ np.diag([1.0, -1.0]) @ rotation(-30)
    ops += [mirror @ r for r in ops]
    for op in ops:
        q = pts @ op.T
        np.testing.assert_allclose(pes.energy(q[:, 0], q[:, 1]), v0, atol=1e-12)
    for a in pes.cell_A:
        q = pts + a
        np.testing.assert_allclose(pes.energy(q[:, 0], q[:, 1]), v0, atol=1e-12)
    assert len(pes.point_group) == 2 * folds  # detected group has the full order (6 or 8)


def test_hexagonal_fit_distinguishes_fcc_and_hcp_and_breaks_inversion():
    pes = sp.pes_from_sites("111", 2.77, E111)
    a1, a2 = pes.cell_A
    fcc = (a1 + a2) / 3
    # inversion through the top site maps fcc onto hcp: V must differ there (p3m1 has no inversion)
    assert pes.energy(*fcc) - pes.energy(*(-fcc)) == pytest.approx(E111["fcc"] - E111["hcp"], abs=1e-12)
    assert pes.min_fractional == pytest.approx((1 / 3, 1 / 3), abs=1e-6)


def test_grid_fit_is_exact_at_grid_points_and_periodic():
    # 2D FFT interpolation passes through every grid value (exact trigonometric interpolation, 1e-12)
    rng = np.random.default_rng(3)
    grid = rng.normal(size=(6, 9)) * 0.1  # invented numbers
    cell = [[3.0, 0.0], [1.0, 2.5]]
    pes = sp.pes_from_grid(cell, grid, sites={"corner": (0, 0)})
    u = np.arange(6)[:, None] / 6
    v = np.arange(9)[None, :] / 9
    np.testing.assert_allclose(pes.energy_fractional(u, v), grid, atol=1e-12)
    np.testing.assert_allclose(pes.energy_grid(6, 9), grid, atol=1e-12)
    np.testing.assert_allclose(pes.energy_fractional(u + 1, v - 2), grid, atol=1e-12)


def test_grid_fit_of_a_cosine_is_the_cosine_everywhere():
    # a band-limited surface sampled above Nyquist is recovered exactly between grid points
    pes = sp.pes_from_grid([[2.77, 0], [0, 2.77]], separable_grid(0.2, n=8))
    rng = np.random.default_rng(1)
    u, v = rng.uniform(0, 1, (2, 50))
    expected = 0.1 * (2 - np.cos(2 * np.pi * u) - np.cos(2 * np.pi * v))
    np.testing.assert_allclose(pes.energy_fractional(u, v), expected, atol=1e-12)
    assert pes.v_max_eV == pytest.approx(0.4, abs=1e-10)
    assert len(pes.point_group) == 8  # p4m symmetry detected from the data


# ---------------------------------------------------------------------------
# classical phase-space integral
# ---------------------------------------------------------------------------
@pytest.mark.parametrize("t", [20.0, 150.0, 300.0, 1000.0, 5000.0])
def test_classical_separable_cosine_equals_product_of_bessel_forms(t):
    # Sprowl et al. 2016 classical hindered translator (two directions): exactly the product of the
    # 1D forms (2π m kT)^(1/2) b/h e^(-z) I0(z) for V = W/2[2 - cos(2πx/b) - cos(2πy/b)]
    b, w, m = 2.77, 0.12, 28.0
    pes = sp.pes_from_grid([[b, 0], [0, b]], separable_grid(w))
    got = sp.lateral_classical(t, pes, m)
    q1 = bessel_classical_1d(t, m, w, b)
    assert np.exp(got.ln_q) == pytest.approx(q1**2, rel=1e-10)
    # U = kT + <V>: the mean of the cosine in the Boltzmann weight is I1/I0 (same source)
    z = w / (2 * KT * t)
    u_exact = KT * t + 2 * (w / 2) * (1 - i1e(z) / i0e(z))
    assert got.energy == pytest.approx(u_exact, rel=1e-9)
    assert got.zpe == 0.0


def test_classical_flat_surface_is_the_2d_ideal_gas():
    # W -> 0: q = A/Λ^2 per cell, S = k(ln q + 1), U = kT (2D ideal gas; reference notes §0)
    pes = sp.pes_from_sites("111", 2.77, {"top": 0.0, "bridge": 0.0, "fcc": 0.0, "hcp": 0.0})
    t = np.array([10.0, 300.0, 2000.0])
    got = sp.lateral_classical(t, pes, 16.0)
    lam = C.h / np.sqrt(2 * np.pi * 16.0 * C.amu * C.k_B * t) / C.angstrom
    np.testing.assert_allclose(np.exp(got.ln_q), pes.cell_area_A2 / lam**2, rtol=1e-12)
    np.testing.assert_allclose(got.entropy, KT * (got.ln_q + 1), rtol=1e-12)
    np.testing.assert_allclose(got.heat_capacity, KT, rtol=1e-9)


def test_classical_deep_well_tends_to_classical_harmonic_oscillators():
    # kT << barrier: q_cl -> (kT/hν1)(kT/hν2) (classical HO limit, reference notes §1.8)
    pes = sp.pes_from_sites("100", 2.6, {"top": 1.5, "bridge": 0.8, "hollow": 0.0})
    m = 16.0
    t = 5.0
    nu = pes.harmonic_frequencies_cm(m)
    got = sp.lateral_classical(t, pes, m)
    x = nu * C.invcm_K / t
    assert np.exp(got.ln_q) == pytest.approx(1 / (x[0] * x[1]), rel=2e-3)
    assert got.heat_capacity == pytest.approx(2 * KT, rel=2e-3)  # equipartition, 2 quadratic terms x 2


def test_classical_n_sites_divides_q():
    pes1 = sp.pes_from_sites("111", 2.77, E111)
    pes3 = sp.pes_from_sites("111", 2.77, E111, n_sites=3)
    a = sp.lateral_classical(300.0, pes1, 28.0)
    b = sp.lateral_classical(300.0, pes3, 28.0)
    assert a.ln_q - b.ln_q == pytest.approx(np.log(3), rel=1e-12)


# ---------------------------------------------------------------------------
# quantum Bloch levels
# ---------------------------------------------------------------------------
def test_quantum_separable_cosine_matches_exact_1d_and_sprowl_closed_form():
    # two directions of a separable cosine = square of the 1D exact solution (independent route),
    # and within the closed form's stated accuracy (1% in q for m >= 12 amu; reference notes header)
    b, w, m = 2.6, 0.1, 12.0
    t = np.array([100.0, 300.0])
    pes = sp.pes_from_sites("100", b, {"top": 0.0, "bridge": w, "hollow": 2 * w})
    got = q_from_bottom(sp.lateral_quantum(t, pes, m), t)
    exact = exact_cosine_1d(t, m, w, b) ** 2
    np.testing.assert_allclose(got, exact, rtol=1e-5)
    closed = sprowl_closed_form_1d(t, m, w, b) ** 2
    np.testing.assert_allclose(got, closed, rtol=0.01)


def test_quantum_reference_table_value_co_like():
    # reference notes, check values B (computed in the reference notes, not published): exact Bloch-band
    # q per direction from the well bottom for m = 28 amu, b = 2.77 Å, W = 0.05 eV, 300 K: 6.8955
    pes = sp.pes_from_sites("100", 2.77, {"top": 0.0, "bridge": 0.05, "hollow": 0.1})
    got = q_from_bottom(sp.lateral_quantum(300.0, pes, 28.0), 300.0)
    assert np.sqrt(got) == pytest.approx(6.8955, abs=1.5e-4)


def test_quantum_tends_to_classical_at_high_temperature():
    # Wigner–Kirkwood (common practice): q_qm/q_cl = 1 - (ħ^2/(24 m (kT)^2)) <∇²V>_cl + O(ħ^4)
    b, w, m = 2.77, 0.1, 16.0
    pes = sp.pes_from_sites("100", b, {"top": 0.0, "bridge": w, "hollow": 2 * w})
    t = np.array([600.0, 2000.0])
    ratio = q_from_bottom(sp.lateral_quantum(t, pes, m), t) / np.exp(sp.lateral_classical(t, pes, m).ln_q)
    z = w / (2 * KT * t)
    kk = (2 * np.pi / (b * C.angstrom)) ** 2
    lap = w * C.eV * kk * i1e(z) / i0e(z)  # <∇²V> for the separable cosine, J/m^2
    wk = 1 - C.hbar**2 * lap / (24 * m * C.amu * (C.k_B * t) ** 2)
    np.testing.assert_allclose(ratio, wk, atol=0.05 * np.max(1 - wk))
    assert abs(ratio[1] - 1) < 1e-3


def test_quantum_deep_well_at_low_temperature_is_two_harmonic_oscillators():
    # deep well, kT << hν: levels of two harmonic oscillators with the Hessian frequencies (common
    # practice). The anharmonic ZPE shift is ~ -(hν)^2/(16 W) per mode (reference notes §1.5), so the
    # deviation from the harmonic result must shrink roughly like 1/sqrt(W) as the well deepens.
    m = 16.0
    dev = []
    for scale in (1.0, 2.0):
        pes = sp.pes_from_sites("111", 2.77, {"top": 2.4 * scale, "bridge": 1.0 * scale, "fcc": 0.0,
                                              "hcp": 0.3 * scale})
        nu = pes.harmonic_frequencies_cm(m)
        t = 0.3 * nu[0] * C.invcm_K
        got = sp.lateral_quantum(t, pes, m, rtol=1e-4)  # 1e-4 is plenty for a 1 % comparison
        zpe_ho = 0.5 * np.sum(nu) * C.invcm_eV
        x = nu * C.invcm_K / t
        s_ho = KT * np.sum(x / np.expm1(x) - np.log(-np.expm1(-x)))
        assert got.zpe == pytest.approx(zpe_ho, rel=0.01)
        assert got.entropy == pytest.approx(s_ho, rel=0.04)
        dev.append((abs(got.zpe / zpe_ho - 1), abs(got.entropy / s_ho - 1)))
    assert dev[1][0] < 0.8 * dev[0][0] and dev[1][1] < 0.8 * dev[0][1]


def test_quantum_symmetry_blocking_does_not_change_levels():
    # the same surface solved with its point group (blocked, reduced k-mesh) and without (identity only)
    pes = sp.pes_from_sites("111", 2.77, E111)
    plain = dataclasses.replace(pes, point_group=(np.eye(2, dtype=int),))
    t = np.array([60.0, 300.0])
    a = sp.lateral_quantum(t, pes, 1.008)
    b = sp.lateral_quantum(t, plain, 1.008)
    np.testing.assert_allclose(a.ln_q, b.ln_q, rtol=1e-6)
    np.testing.assert_allclose(a.energy, b.energy, rtol=1e-6)
    assert a.zpe == pytest.approx(b.zpe, rel=1e-9)


def test_spectrum_reports_convergence_and_refuses_hotter_temperatures():
    pes = sp.pes_from_sites("111", 2.77, E111)
    spec = sp.lateral_spectrum(pes, 1.008, [50.0, 200.0])
    assert spec.info["kmesh"] >= 2 and spec.info["basis_size_gamma"] > 0
    with pytest.raises(InputError, match="above the 200 K"):
        spec.contribution(400.0)


# ---------------------------------------------------------------------------
# thermodynamic identities (common practice): G = H - TS, S = -dA/dT, Cv = dU/dT
# ---------------------------------------------------------------------------
def _check_identities(func, t, h=1e-3):
    c = func(np.array([t - h, t, t + h]))
    a = c.free_energy(np.array([t - h, t, t + h]))
    # A = zpe + U - TS = zpe - kT ln q
    np.testing.assert_allclose(a, c.zpe - KT * np.array([t - h, t, t + h]) * c.ln_q, rtol=1e-12, atol=1e-14)
    s_fd = -(a[2] - a[0]) / (2 * h)
    cv_fd = (c.energy[2] - c.energy[0]) / (2 * h)
    assert c.entropy[1] == pytest.approx(s_fd, rel=1e-6)
    assert c.heat_capacity[1] == pytest.approx(cv_fd, rel=1e-5)


def test_identities_classical():
    pes = sp.pes_from_sites("111", 2.77, E111)
    for t in (50.0, 300.0, 1500.0):
        _check_identities(lambda tt: sp.lateral_classical(tt, pes, 28.0), t)


def test_identities_quantum():
    pes = sp.pes_from_sites("111", 2.77, E111)
    spec = sp.lateral_spectrum(pes, 12.0, [80.0, 400.0])
    for t in (80.0, 250.0, 399.0):
        _check_identities(spec.contribution, t)


# ---------------------------------------------------------------------------
# input errors, broadcasting, plot
# ---------------------------------------------------------------------------
@pytest.mark.parametrize("call, match", [
    (lambda: sp.pes_from_sites("110", 2.77, E100), "lattice must be"),
    (lambda: sp.pes_from_sites("100", -1.0, E100), "lattice_constant_A"),
    (lambda: sp.pes_from_sites("111", 2.77, E100), "needs exactly the sites"),
    (lambda: sp.pes_from_sites("100", 2.77, {"top": 0, "bridge": float("nan"), "hollow": 0}), "finite"),
    (lambda: sp.pes_from_grid([[1, 0], [2, 0]], np.zeros((4, 4))), "parallel"),
    (lambda: sp.pes_from_grid([[1, 0], [0, 1]], np.zeros(5)), "2D grid"),
    (lambda: sp.pes_from_sites("100", 2.77, E100, n_sites=0), "n_sites"),
    (lambda: sp.lateral_classical(-5.0, sp.pes_from_sites("100", 2.77, E100), 12.0), "temperature"),
    (lambda: sp.lateral_classical(300.0, sp.pes_from_sites("100", 2.77, E100), 0.0), "mass_amu"),
    (lambda: sp.lateral_quantum(300.0, "not a pes", 12.0), "SurfacePES"),
])
def test_bad_input_raises_input_error(call, match):
    with pytest.raises(InputError, match=match):
        call()


def test_results_keep_the_temperature_shape():
    pes = sp.pes_from_sites("100", 2.77, E100)
    t = np.array([[100.0, 200.0], [300.0, 400.0]])
    for c in (sp.lateral_classical(t, pes, 28.0), sp.lateral_quantum(t, pes, 12.0)):
        assert c.ln_q.shape == t.shape and c.entropy.shape == t.shape
        assert np.all(np.diff(c.entropy.ravel()) > 0)  # entropy increases with T


def test_plot_writes_png_and_svg(tmp_path):
    pes = sp.pes_from_sites("111", 2.77, E111)
    fig = sp.plot_surface(pes, tmp_path / "pes.png", n_cells=2, resolution=24)
    assert (tmp_path / "pes.png").stat().st_size > 1000
    assert (tmp_path / "pes.svg").read_text().lstrip().startswith("<?xml")
    assert fig.axes[0].get_xlabel() == "x (Å)"


def test_basis_limit_raises_convergence_error():
    from adsorb.errors import ConvergenceError
    pes = sp.pes_from_sites("111", 2.77, E111)
    with pytest.raises(ConvergenceError, match="plane waves"):
        sp.lateral_spectrum(pes, 28.0, [300.0], max_basis=50)


def test_low_and_high_temperature_ends_are_finite():
    # 1 K and 5000 K: finite values, no warnings (pytest turns warnings into errors)
    pes = sp.pes_from_sites("111", 2.77, {k: 0.01 * v for k, v in E111.items()})
    c = sp.lateral_classical(np.array([1.0, 5000.0]), pes, 16.0)
    assert np.all(np.isfinite(c.entropy)) and np.all(c.heat_capacity > 0)
    q = sp.lateral_quantum(np.array([1.0, 10.0]), pes, 16.0)
    assert np.all(np.isfinite(q.entropy)) and q.zpe >= 0


# ---------------------------------------------------------------------------
# property-based checks (hypothesis)
# ---------------------------------------------------------------------------
from hypothesis import given, settings  # noqa: E402
from hypothesis import strategies as st  # noqa: E402

_energy = st.floats(min_value=-2.0, max_value=2.0, allow_nan=False)


@settings(max_examples=25)
@given(top=_energy, bridge=_energy, fcc=_energy, hcp=_energy, a=st.floats(min_value=2.0, max_value=4.0))
def test_property_hexagonal_site_fit_is_exact_and_symmetric(top, bridge, fcc, hcp, a):
    energies = {"top": top, "bridge": bridge, "fcc": fcc, "hcp": hcp}
    pes = sp.pes_from_sites("111", a, energies)
    got = pes.site_energies()
    for key, val in energies.items():
        assert got[key] == pytest.approx(val, abs=1e-11)
    pts = np.random.default_rng(0).uniform(-5, 5, size=(20, 2))
    v0 = pes.energy(pts[:, 0], pts[:, 1])
    q = pts @ rotation(120).T
    np.testing.assert_allclose(pes.energy(q[:, 0], q[:, 1]), v0, atol=1e-11)
    assert pes.v_min_eV <= min(energies.values()) + 1e-12 and pes.v_max_eV >= max(energies.values()) - 1e-12


@settings(max_examples=20)
@given(w=st.floats(min_value=0.0, max_value=1.0), t=st.floats(min_value=5.0, max_value=3000.0))
def test_property_classical_entropy_grows_with_temperature_and_falls_with_corrugation(w, t):
    flat = sp.pes_from_sites("100", 2.77, {"top": 0.0, "bridge": 0.0, "hollow": 0.0})
    pes = sp.pes_from_sites("100", 2.77, {"top": 0.0, "bridge": w, "hollow": 2 * w})
    c = sp.lateral_classical(np.array([t, 1.05 * t]), pes, 20.0)
    assert c.entropy[1] > c.entropy[0]
    assert c.entropy[0] <= sp.lateral_classical(t, flat, 20.0).entropy * (1 + 1e-12)  # 2D gas is the upper limit


def test_symmetry_found_about_a_shifted_origin_and_levels_unchanged():
    # the same surface sampled on a grid whose origin is off every symmetry point: the point group is
    # found about the minimum or maximum, and the quantum levels equal those of the site-based surface
    ref = sp.pes_from_sites("111", 2.77, E111)
    u = (np.arange(12) + 0.123) / 12
    grid = sp.pes_from_grid(ref.cell_A, ref.energy_fractional(u[:, None], u[None, :] + 0.05))
    assert len(grid.point_group) == 6
    o = np.array(grid.symmetry_origin)
    rng = np.random.default_rng(2)
    r = rng.uniform(0, 1, size=(30, 2))
    for op in grid.point_group:
        rr = o + r @ np.asarray(op).T
        np.testing.assert_allclose(grid.energy_fractional(rr[:, 0], rr[:, 1]),
                                   grid.energy_fractional(o[0] + r[:, 0], o[1] + r[:, 1]), atol=1e-11)
    t = np.array([100.0, 300.0])
    a, b = sp.lateral_quantum(t, grid, 16.0), sp.lateral_quantum(t, ref, 16.0)
    np.testing.assert_allclose(a.ln_q, b.ln_q, rtol=1e-7)
    assert a.zpe == pytest.approx(b.zpe, rel=1e-8)
