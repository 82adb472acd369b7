"""Tests of the gas-phase partition building blocks: translation, rotation, vibration, electronic.

Each model gets a published value, a physical limit and thermodynamic identities
(A = U - TS = -kT ln q, S = -dA/dT and Cv = dU/dT by central differences).

Equation numbers of McQuarrie, Statistical Mechanics (1976), are quoted from memory.
"""

import warnings

import numpy as np
import pytest
import scipy.constants as sc
from hypothesis import given
from hypothesis import strategies as st

from adsorb import constants as C
from adsorb.errors import InputError, ModelWarning
from adsorb.partition.electronic import electronic
from adsorb.partition.rotation import free_rotor, linear_rotor, linear_rotor_levels, nonlinear_rotor
from adsorb.partition.translation import thermal_wavelength_m, translation_2d, translation_3d
from adsorb.partition.vibration import harmonic
import reference_data as ref

R = sc.R
J_MOL_K = C.EV_PER_K_TO_J_MOL_K

temperatures = st.floats(min_value=1.0, max_value=5000.0)
wavenumbers = st.floats(min_value=1.0, max_value=5000.0)


def helmholtz(c, t):
    """Thermal Helmholtz energy U - TS (eV), zero-point energy excluded."""
    return c.energy - t * c.entropy


def check_identities(block, t, *, translation=False, rtol=1e-6):
    """Partition-function and derivative identities of one building block.

    Fixed-volume blocks: A = U - TS = -kT ln q, S = -dA/dT, Cv = dU/dT.
    3D translation per molecule at fixed pressure (ln q = ln[kT/(p Lambda^3)]):
    G = U + kT - TS = -kT ln q, S = -(dG/dT)_p, Cp = Cv + k = (dH/dT)_p with H = U + kT.
    Derivatives by central differences (common practice: thermodynamic identities).
    """
    t = np.asarray(t, dtype=float)
    pv = (lambda tt: C.kB_eV * tt) if translation else (lambda tt: 0.0)
    c = block(t)
    # A (or G) = -kT ln q from the partition function (McQuarrie 1976, eqs. 2-33 and 5-20)
    np.testing.assert_allclose(helmholtz(c, t) + pv(t), -C.kB_eV * t * c.ln_q,
                               rtol=1e-10, atol=1e-14 * C.kB_eV * t)
    h = 1e-5 * t
    up, dn = block(t + h), block(t - h)
    ds = -((helmholtz(up, t + h) + pv(t + h)) - (helmholtz(dn, t - h) + pv(t - h))) / (2 * h)
    dc = ((up.energy + pv(t + h)) - (dn.energy + pv(t - h))) / (2 * h)
    cap = c.heat_capacity + (C.kB_eV if translation else 0.0)
    np.testing.assert_allclose(c.entropy, ds, rtol=rtol, atol=1e-12 * C.kB_eV)
    np.testing.assert_allclose(cap, dc, rtol=rtol, atol=1e-12 * C.kB_eV)


# ------------------------------------------------------------------ translation
def test_sackur_tetrode_argon_codata():
    row = ref.CODATA_AR_S298
    s = translation_3d(298.15, 39.948, 1e5).entropy * J_MOL_K
    assert abs(s - row.value) < 0.005, row.source


def test_sackur_tetrode_against_scipy_formula():
    # S/R = ln[(2 pi m k T / h^2)^{3/2} kT/p] + 5/2 (Sackur 1911, Tetrode 1912), written with scipy.constants
    m = 4.002602 * sc.atomic_mass
    t, p = 500.0, 2.5e5
    expected = R * (np.log((2 * np.pi * m * sc.k * t / sc.h**2) ** 1.5 * sc.k * t / p) + 2.5)
    np.testing.assert_allclose(translation_3d(t, 4.002602, p).entropy * J_MOL_K, expected, rtol=1e-12)
    # Lambda for He at 500 K from the scipy constants directly
    lam = sc.h / np.sqrt(2 * np.pi * m * sc.k * t)
    np.testing.assert_allclose(thermal_wavelength_m(t, 4.002602), lam, rtol=1e-13)


def test_translation_pressure_one_atm():
    # S(1 atm) = S(1 bar) - R ln(1.01325) = S - 0.1094 J/mol/K (gas-reference-data.md §0, computed there)
    s_bar = translation_3d(298.15, 28.014, C.bar).entropy * J_MOL_K
    s_atm = translation_3d(298.15, 28.014, C.atm).entropy * J_MOL_K
    assert abs((s_bar - s_atm) - 0.1094) < 5e-5


def test_translation_heat_capacity_and_energy():
    # ideal monatomic gas: Cv = 3/2 R, U = 3/2 RT (equipartition, common practice)
    c = translation_3d([10.0, 300.0, 4000.0], 39.948)
    np.testing.assert_allclose(c.heat_capacity * J_MOL_K, 1.5 * R, rtol=1e-12)
    np.testing.assert_allclose(c.energy / C.kB_eV, 1.5 * np.array([10.0, 300.0, 4000.0]), rtol=1e-12)


def test_translation_2d_against_3d():
    # q_3D(V = A L) = q_2D(A) * L / Lambda: the third direction factorises (McQuarrie 1976, ch. 5)
    t, m, area, length = 350.0, 28.0, 9.0, 2.0e-9
    lam = thermal_wavelength_m(t, m)
    p = C.k_B * t / (area * C.angstrom**2 * length)      # pressure with one molecule in V
    q3 = translation_3d(t, m, p).ln_q
    q2 = translation_2d(t, m, area).ln_q
    np.testing.assert_allclose(q3, q2 + np.log(length / lam), rtol=1e-12)
    c2 = translation_2d(t, m, area)
    np.testing.assert_allclose(c2.heat_capacity, C.kB_eV, rtol=1e-14)   # 2 quadratic terms: Cv = k


@given(temperatures, st.floats(1.0, 500.0), st.floats(1.0, 1e8))
def test_translation_identities(t, m, p):
    check_identities(lambda tt: translation_3d(tt, m, p), t, translation=True)
    check_identities(lambda tt: translation_2d(tt, m, 10.0), t)


@given(st.floats(1.0, 1e8), st.floats(1.0, 1e8))
def test_pressure_dependence_exact(p1, p2):
    # S(p) - S(p') = -k ln(p/p') for an ideal gas; U independent of p (common practice)
    a, b = translation_3d(700.0, 30.0, p1), translation_3d(700.0, 30.0, p2)
    np.testing.assert_allclose(a.entropy - b.entropy, -C.kB_eV * np.log(p1 / p2), rtol=1e-9, atol=1e-18)
    assert a.energy == b.energy


def test_translation_broadcasts():
    t = np.array([300.0, 600.0, 900.0])[:, None]
    p = np.array([1e3, 1e5, 1e7, 1e9])
    c = translation_3d(t, 28.0, p)
    assert c.entropy.shape == c.energy.shape == c.heat_capacity.shape == (3, 4)
    np.testing.assert_allclose(c.entropy[2, 1], translation_3d(900.0, 28.0, 1e5).entropy, rtol=1e-14)


# ------------------------------------------------------------------ rotation
def test_linear_rotor_classical_values():
    # classical rotor: q = T/(sigma theta), S = R(ln q + 1), Cp contribution R (gas-reference-data.md §3.1;
    # McQuarrie 1976 eq. 6-40); theta_rot = hcB/k from scipy.constants
    t, b = 298.15, 1.98957
    theta = sc.h * sc.c * 100 * b / sc.k
    c = linear_rotor(t, b, symmetry_number=2)
    np.testing.assert_allclose(c.entropy * J_MOL_K, R * (np.log(t / (2 * theta)) + 1), rtol=1e-12)
    np.testing.assert_allclose(c.heat_capacity * J_MOL_K, R, rtol=1e-12)


def test_nonlinear_rotor_values():
    # q = sqrt(pi)/sigma (kT/hc)^{3/2}/sqrt(ABC) (McQuarrie 1976 eq. 8-19), written with scipy.constants
    t, abc = 500.0, np.array([27.877, 14.512, 9.285])
    kt_hc = sc.k * t / (sc.h * sc.c * 100)
    q = np.sqrt(np.pi) / 2 * kt_hc**1.5 / np.sqrt(abc.prod())
    c = nonlinear_rotor(t, abc, symmetry_number=2)
    np.testing.assert_allclose(c.ln_q, np.log(q), rtol=1e-12)
    np.testing.assert_allclose(c.entropy * J_MOL_K, R * (np.log(q) + 1.5), rtol=1e-12)
    np.testing.assert_allclose(c.heat_capacity * J_MOL_K, 1.5 * R, rtol=1e-12)


def test_nonlinear_rotor_spherical_top_equals_linear_product():
    # a prolate/oblate top with A = B = C: ln q = ln sqrt(pi) + 3/2 ln(T/theta) - ln sigma (same formula, limit)
    t, b = 800.0, 5.241
    theta = b * C.invcm_K
    c = nonlinear_rotor(t, [b, b, b], 12)
    np.testing.assert_allclose(c.ln_q, 0.5 * np.log(np.pi) + 1.5 * np.log(t / theta) - np.log(12), rtol=1e-12)


def test_free_rotor_value():
    # q = sqrt(8 pi^3 I k T)/(sigma h) (Pitzer & Gwinn 1942), with scipy.constants; I = 3.2 amu A^2
    t, inertia = 400.0, 3.2
    i_si = inertia * sc.atomic_mass * 1e-20
    q = np.sqrt(8 * np.pi**3 * i_si * sc.k * t) / (3 * sc.h)
    c = free_rotor(t, inertia, 3)
    np.testing.assert_allclose(c.ln_q, np.log(q), rtol=1e-12)
    np.testing.assert_allclose(c.heat_capacity, 0.5 * C.kB_eV, rtol=1e-14)


def test_free_rotor_matches_level_sum_at_high_temperature():
    # 1D rotor levels E_m = hbar^2 m^2/(2I), m = 0, +-1, ... (McQuarrie 1976 problem 8-13): explicit sum
    t, inertia = 2000.0, 1.5
    e_unit = sc.hbar**2 / (2 * inertia * sc.atomic_mass * 1e-20) / sc.k       # K
    m = np.arange(-400, 401)
    q = np.exp(-e_unit * m**2 / t).sum()
    np.testing.assert_allclose(free_rotor(t, inertia).ln_q, np.log(q), rtol=1e-10)


@given(temperatures, st.floats(0.2, 60.0), st.sampled_from([1, 2]))
def test_rotor_identities(t, b, sigma):
    check_identities(lambda tt: linear_rotor(tt, b, sigma), t)
    check_identities(lambda tt: nonlinear_rotor(tt, [b * 2.1, b * 1.3, b], sigma), t)
    check_identities(lambda tt: free_rotor(tt, 16.8576 / b, sigma), t)
    check_identities(lambda tt: linear_rotor_levels(tt, b, symmetry_number=sigma), t)


@given(temperatures, st.sampled_from([0.0, 0.5, 1.0, 1.5]), st.booleans())
def test_level_sum_identities_with_spin(t, spin, even_sym):
    check_identities(lambda tt: linear_rotor_levels(tt, 30.0, symmetry_number=2,
                                                    nuclear_spin=spin, even_j_symmetric=even_sym), t)
    check_identities(lambda tt: linear_rotor_levels(tt, 30.0, d_cm=0.002, symmetry_number=2,
                                                    nuclear_spin=spin, even_j_symmetric=even_sym), t)


def test_level_sum_high_temperature_limit():
    # Mulholland (1928) expansion, McQuarrie 1976 eq. 6-41: q = (T/sigma theta)[1 + theta/3T + theta^2/15T^2 + 4 theta^3/315T^3]
    # so U = kT - k theta/3 - k theta^2/(45 T) + ...; S and Cv approach the classical values as O(theta^2/T^2)
    b, sigma = 2.0, 2
    theta = b * C.invcm_K
    t = np.array([20.0, 100.0, 1000.0]) * theta
    lev = linear_rotor_levels(t, b, symmetry_number=sigma)
    cla = linear_rotor(t, b, sigma)
    y = theta / t
    mulholland = np.log(1 / (sigma * y)) + np.log1p(y / 3 + y**2 / 15 + 4 * y**3 / 315)
    np.testing.assert_allclose(lev.ln_q, mulholland, rtol=0, atol=5e-6)
    u_expected = C.kB_eV * (t - theta / 3 - theta * y / 45)
    np.testing.assert_allclose(lev.energy, u_expected, rtol=0, atol=2e-4 * C.kB_eV * theta)
    assert np.all(np.abs(lev.entropy - cla.entropy) <= 1.1 * y**2 * C.kB_eV)
    assert np.all(np.abs(lev.heat_capacity - cla.heat_capacity) <= y**2 * C.kB_eV)
    # the classical rotor overestimates H by k theta/3 at high T
    np.testing.assert_allclose(cla.energy[-1] - lev.energy[-1], C.kB_eV * theta / 3, rtol=1e-2)


def test_level_sum_low_temperature_limits():
    # e-H2 at low T: only J = 0 (para, weight 1/4 after dividing by (2I+1)^2) -> q = 1/4, U = 0
    # (McQuarrie 1976 sec. 6-5; conventional entropy, JANAF convention)
    c = linear_rotor_levels(2.0, 59.322, symmetry_number=2, nuclear_spin=0.5)
    np.testing.assert_allclose(c.ln_q, np.log(0.25), rtol=1e-12)
    assert c.energy < 1e-30 and c.zpe == 0.0
    # I = 0 nuclei in a Sigma_g- state (16O2): only odd J exist; lowest level J = 1 at 2B
    c = linear_rotor_levels(0.5, 1.43768, symmetry_number=2, nuclear_spin=0.0, even_j_symmetric=False)
    np.testing.assert_allclose(c.zpe, 2 * 1.43768 * C.invcm_eV, rtol=1e-12)
    np.testing.assert_allclose(c.ln_q, np.log(3.0), rtol=1e-6)   # 2J+1 = 3


@pytest.mark.parametrize("spin", [0.5, 1.0, 1.5])
def test_spin_statistics_reach_symmetry_number_two(spin):
    # at T >> theta the ortho/para sum divided by (2I+1)^2 -> T/(2 theta) (McQuarrie 1976 eq. 6-52)
    t = 3000.0
    with_spin = linear_rotor_levels(t, 5.0, symmetry_number=2, nuclear_spin=spin)
    plain = linear_rotor_levels(t, 5.0, symmetry_number=2)
    np.testing.assert_allclose(with_spin.ln_q, plain.ln_q, rtol=0, atol=1e-9)
    np.testing.assert_allclose(with_spin.heat_capacity, plain.heat_capacity, rtol=1e-6)


def test_h2_ortho_para_weights_reproduce_janaf_rotation():
    # translation + level sum (B0 59.322, D0 0.0471, weights 1/4 and 3/4) + harmonic 4161.17 cm^-1
    # against NIST-JANAF H-050 (Chase 1998) within the explicit-J-sum tolerances of gas-reference-data.md §4
    inputs = ref.molecular_inputs("H2")
    for t in (298.15, 500.0, 1000.0):
        total = (translation_3d(t, 2.016)
                 + linear_rotor_levels(t, inputs["rotational_constants"][0], d_cm=inputs["centrifugal_cm"],
                                       symmetry_number=2, nuclear_spin=0.5)
                 + harmonic(t, inputs["frequencies"]))
        s = total.entropy * J_MOL_K
        cp = (total.heat_capacity + C.kB_eV) * J_MOL_K
        for quantity, got in (("S", s), ("Cp", cp)):
            row, tol = ref.value("H2", quantity, t), ref.tolerance("H2", quantity, t)
            assert abs(got - row.value) < tol.tolerance, (row, got, tol.source)


def test_level_sum_centrifugal_turnover_warns():
    # with D > 0 the term values peak at J^2 ~ B/2D (Herzberg 1950): H2 at 5000 K is outside the expansion
    with pytest.warns(ModelWarning, match="not converged"):
        linear_rotor_levels(5000.0, 59.322, d_cm=0.0471, symmetry_number=2, nuclear_spin=0.5)
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        linear_rotor_levels(1000.0, 59.322, d_cm=0.0471, symmetry_number=2, nuclear_spin=0.5)


def test_level_sum_vectorised_matches_scalar():
    t = np.array([[5.0, 50.0], [500.0, 5000.0]])
    c = linear_rotor_levels(t, 10.0, symmetry_number=2, nuclear_spin=0.5)
    assert c.entropy.shape == (2, 2)
    for idx in np.ndindex(t.shape):
        one = linear_rotor_levels(t[idx], 10.0, symmetry_number=2, nuclear_spin=0.5)
        np.testing.assert_allclose(c.entropy[idx], one.entropy, rtol=1e-13)
        np.testing.assert_allclose(c.heat_capacity[idx], one.heat_capacity, rtol=1e-12)


# ------------------------------------------------------------------ vibration
def test_harmonic_against_explicit_level_sum():
    # q = sum_n exp(-n x): the closed forms must equal the explicit sum (McQuarrie 1976 eq. 6-21)
    t, nu = 700.0, 900.0
    x = nu * C.invcm_K / t
    n = np.arange(400)
    w = np.exp(-n * x)
    q = w.sum()
    u = (n * x * w).sum() / q
    var = ((n * x - u) ** 2 * w).sum() / q
    c = harmonic(t, nu)
    np.testing.assert_allclose(c.ln_q, np.log(q), rtol=1e-13)
    np.testing.assert_allclose(c.energy, C.kB_eV * t * u, rtol=1e-12)
    np.testing.assert_allclose(c.heat_capacity, C.kB_eV * var, rtol=1e-11)
    np.testing.assert_allclose(c.zpe, 0.5 * nu * sc.h * sc.c * 100 / sc.e, rtol=1e-12)


def test_harmonic_einstein_function_sinh_form():
    # Cv/k = [(x/2)/sinh(x/2)]^2 (Einstein 1907, equivalent closed form)
    t = np.array([10.0, 300.0, 3000.0])
    nu = 1000.0
    x = nu * C.invcm_K / t
    expected = ((x / 2) / np.sinh(x / 2)) ** 2
    np.testing.assert_allclose(harmonic(t, nu).heat_capacity / C.kB_eV, expected, rtol=1e-12)


def test_harmonic_classical_limit():
    # T >> theta_v: U -> kT - hc nu/2 + kT x^2/12, S -> k(1 - ln x), Cv -> k(1 - x^2/12) (common practice, series)
    nu = np.array([1.0, 5.0, 20.0])
    t = 5000.0
    x = nu * C.invcm_K / t
    c = harmonic(t, nu[:, None])
    np.testing.assert_allclose(c.energy, C.kB_eV * t * (1 - x / 2 + x**2 / 12), rtol=1e-9)
    np.testing.assert_allclose(c.entropy, C.kB_eV * (1 - np.log(x) + x**2 / 24), rtol=1e-9)
    np.testing.assert_allclose(c.heat_capacity, C.kB_eV * (1 - x**2 / 12), rtol=1e-9)


def test_harmonic_tiny_x_path():
    # x < 1e-6 uses expm1; the classical limit must still hold to high accuracy
    c = harmonic(4000.0, [1e-3, 2e-3])
    x = np.array([1e-3, 2e-3]) * C.invcm_K / 4000.0
    np.testing.assert_allclose(c.entropy, C.kB_eV * np.sum(1 - np.log(x)), rtol=1e-12)


def test_harmonic_quantum_limit():
    # T << theta_v: Cv -> k x^2 e^{-x}, U -> hc nu e^{-x} (common practice)
    t, nu = 50.0, 2000.0
    x = nu * C.invcm_K / t
    c = harmonic(t, nu)
    np.testing.assert_allclose(c.heat_capacity, C.kB_eV * x**2 * np.exp(-x), rtol=1e-10)
    np.testing.assert_allclose(c.energy, C.kB_eV * t * x * np.exp(-x), rtol=1e-10)


@given(temperatures, st.lists(wavenumbers, min_size=1, max_size=6))
def test_harmonic_identities(t, nus):
    check_identities(lambda tt: harmonic(tt, nus), t)


def test_harmonic_range_sweep_no_warnings():
    t = np.geomspace(1.0, 5000.0, 200)[:, None]
    nu = np.geomspace(1.0, 5000.0, 300)[:, None]
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        with np.errstate(over="raise", divide="raise", invalid="raise"):
            c = harmonic(t, nu)
    for field in (c.ln_q, c.energy, c.entropy, c.heat_capacity):
        assert field.shape == (200, 300)
        assert np.all(np.isfinite(field)) and np.all(field >= 0)
    assert np.all(np.diff(c.entropy, axis=0) >= 0)          # S rises with T (common practice)


def test_range_sweep_other_blocks_no_warnings():
    t = np.geomspace(1.0, 5000.0, 400)
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        with np.errstate(over="raise", divide="raise", invalid="raise"):
            out = [translation_3d(t, 2.0), translation_2d(t, 2.0, 9.0), linear_rotor(t, 60.0, 2),
                   nonlinear_rotor(t, [30.0, 10.0, 5.0], 2), free_rotor(t, 0.3),
                   linear_rotor_levels(t, 60.0, symmetry_number=2, nuclear_spin=0.5),
                   linear_rotor_levels(t, 0.1),
                   electronic(t, 2, [(2, 1.0), (4, 5000.0)])]
    for c in out:
        for field in (c.ln_q, c.energy, c.entropy, c.heat_capacity):
            assert np.all(np.isfinite(field))


def test_harmonic_batch_broadcasting():
    rng = np.random.default_rng(7)
    nu = rng.uniform(50.0, 4000.0, (5, 4))           # 5 species x 4 modes
    t = np.array([100.0, 500.0, 2000.0])[:, None]    # 3 temperatures
    c = harmonic(t, nu)
    assert c.entropy.shape == (3, 5)
    np.testing.assert_allclose(c.zpe, 0.5 * C.invcm_eV * nu.sum(axis=1), rtol=1e-14)
    for i in range(3):
        for j in range(5):
            one = harmonic(t[i, 0], nu[j])
            np.testing.assert_allclose(c.entropy[i, j], one.entropy, rtol=1e-13)
            np.testing.assert_allclose(c.heat_capacity[i, j], one.heat_capacity, rtol=1e-13)
            np.testing.assert_allclose(c.energy[i, j], one.energy, rtol=1e-13)
    # a 1-D mode list against a temperature array: shape of T
    assert harmonic(np.ones((2, 3)) * 300.0, [1000.0, 2000.0]).entropy.shape == (2, 3)
    # no modes: a zero contribution of the temperature's shape
    empty = harmonic(np.array([300.0, 400.0]), [])
    assert empty.entropy.shape == (2,) and not np.any(empty.entropy) and empty.zpe == 0.0


def test_harmonic_blocking_matches_single_block(monkeypatch):
    import adsorb.partition.vibration as vib

    rng = np.random.default_rng(3)
    nu = rng.uniform(10.0, 4000.0, (7, 11))
    t = np.linspace(50.0, 3000.0, 13)[:, None]
    full = harmonic(t, nu)
    monkeypatch.setattr(vib, "_BLOCK_ELEMENTS", 1)
    small = harmonic(t, nu)
    np.testing.assert_array_equal(full.entropy, small.entropy)


# ------------------------------------------------------------------ electronic
def test_electronic_two_level_closed_form():
    # Schottky two-level system: q = g0 + g1 e^{-x}, Cv = k x^2 g0 g1 e^{-x}/(g0 + g1 e^{-x})^2
    # (McQuarrie 1976 sec. 5-4; NO ground 2Pi1/2 g=2, 2Pi3/2 g=2 at 121 cm^-1, from memory)
    t = np.array([10.0, 100.0, 174.0, 1000.0])
    g0, g1, eps = 2.0, 2.0, 121.0
    x = eps * C.invcm_K / t
    q = g0 + g1 * np.exp(-x)
    c = electronic(t, g0, [(g1, eps)])
    np.testing.assert_allclose(c.ln_q, np.log(q), rtol=1e-13)
    np.testing.assert_allclose(c.energy, C.kB_eV * t * x * g1 * np.exp(-x) / q, rtol=1e-12)
    np.testing.assert_allclose(c.heat_capacity, C.kB_eV * x**2 * g0 * g1 * np.exp(-x) / q**2, rtol=1e-11)
    # high-T limit: S -> k ln(g0 + g1) = k ln 4
    hot = electronic(1e6, g0, [(g1, eps)])
    np.testing.assert_allclose(hot.entropy, C.kB_eV * np.log(4.0), rtol=1e-4)


def test_electronic_ground_only():
    # O2 triplet: S = R ln 3 = 9.134 J/mol/K (gas-reference-data.md §4, O2 remark)
    c = electronic(np.array([300.0, 1000.0]), 3)
    np.testing.assert_allclose(c.entropy * J_MOL_K, 9.134, atol=5e-4)
    assert not np.any(c.heat_capacity)


@given(temperatures, st.floats(0.5, 5.0), st.floats(0.0, 5000.0), st.floats(1.0, 6.0))
def test_electronic_identities(t, g0, eps, g1):
    check_identities(lambda tt: electronic(tt, g0, [(g1, eps), (1.0, 2 * eps + 3.0)]), t)


# ------------------------------------------------------------------ bad input
@pytest.mark.parametrize("call, match", [
    (lambda: translation_3d(0.0, 28.0), "temperature"),
    (lambda: translation_3d(np.array([300.0, np.nan]), 28.0), "temperature"),
    (lambda: translation_3d(300.0, 28.0, -1.0), "pressure"),
    (lambda: translation_3d(300.0, 0.0), "mass_amu"),
    (lambda: translation_2d(300.0, 28.0, 0.0), "area_A2"),
    (lambda: harmonic(300.0, [1000.0, -50.0]), "frequencies_cm"),
    (lambda: harmonic(300.0, [0.0]), "frequencies_cm"),
    (lambda: harmonic(-5.0, [100.0]), "temperature"),
    (lambda: harmonic(np.ones(3) * 300, np.ones((4, 2)) * 100), "broadcast"),
    (lambda: linear_rotor(300.0, 0.0), "b_cm"),
    (lambda: linear_rotor(300.0, 2.0, 0), "symmetry_number"),
    (lambda: linear_rotor(300.0, 2.0, 1.5), "symmetry_number"),
    (lambda: nonlinear_rotor(300.0, [1.0, 2.0]), "abc_cm"),
    (lambda: nonlinear_rotor(300.0, [1.0, 2.0, -3.0]), "abc_cm"),
    (lambda: free_rotor(300.0, -1.0), "inertia_amu_A2"),
    (lambda: linear_rotor_levels(300.0, 2.0, d_cm=-1e-4), "d_cm"),
    (lambda: linear_rotor_levels(300.0, 2.0, nuclear_spin=0.5), "symmetry_number=2"),
    (lambda: linear_rotor_levels(300.0, 2.0, symmetry_number=2, nuclear_spin=0.3), "nuclear_spin"),
    (lambda: electronic(300.0, 0), "degeneracy"),
    (lambda: electronic(300.0, 1, [(1, -10.0)]), "levels"),
    (lambda: electronic(300.0, 1, [(1, 2, 3)]), "levels"),
])
def test_bad_input(call, match):
    with pytest.raises(InputError, match=match):
        call()
