"""Tests of the hindered translator and hindered rotor closed forms.

Sources: L. H. Sprowl, C. T. Campbell, L. Árnadóttir, J. Phys. Chem. C 2016,
120, 9719 (the closed forms); the exact quantum solution of the same cosine
potentials from adsorb.partition.periodic (itself tested against Mathieu
characteristic values and a finite-difference grid in test_periodic.py);
classical configuration integrals by scipy.integrate.quad; textbook harmonic
oscillator, free translator and free rotor (McQuarrie, Statistical Mechanics,
1976, ch. 5-6); regression values from the maintainers' reference compilation 
adsorbate-models.md, check values B ("computed in the reference notes, not
published").
"""

import numpy as np
import pytest
from hypothesis import given
from hypothesis import strategies as st
from scipy.integrate import quad
from scipy.special import iv

from adsorb import constants as C
from adsorb.errors import InputError
from adsorb.partition import hindered as H
from adsorb.partition import periodic as P
from adsorb.partition.contribution import Contribution
from adsorb.partition.rotation import free_rotor
from adsorb.partition.translation import translation_2d

KB = C.kB_eV
I_METHYL = 5.3264e-47 / C.amu_A2  # 3 x 1.00784 amu x (1.03 Å)^2, as in the reference notes


def ln_q_bottom(c, t):
    """ln q counted from the bottom of the well."""
    return c.ln_q - c.zpe / (KB * t)


# ---------------------------------------------------------------------------
# regression: check values B of the reference notes (computed there, not published)
# ---------------------------------------------------------------------------

# (W eV, nu cm^-1, r, T*, q_HT, S/k): m = 28.0 amu, b = 2.77 Å, T = 300 K
TRANSLATOR_B = [
    (0.005, 11.18, 3.608, 18.655, 13.2426, 3.1748),
    (0.05, 35.34, 11.410, 5.899, 6.8971, 2.9794),
    (0.2, 70.69, 22.820, 2.950, 3.0541, 2.1734),
]
# (W eV, nu cm^-1, r, T*, q_HR, S/k): I = 5.3264e-47 kg m^2, n = sigma = 3, T = 300 K
ROTOR_B = [
    (0.01, 61.77, 1.306, 3.376, 3.1246, 1.8085),
    (0.05, 138.11, 2.920, 1.510, 1.7574, 1.6333),
    (0.2, 276.22, 5.840, 0.755, 0.7402, 0.8758),
]


@pytest.mark.parametrize("w, nu, r, tstar, q, s", TRANSLATOR_B)
def test_translator_check_values(w, nu, r, tstar, q, s):
    # source: adsorbate-models.md check values B (computed in the reference notes, not published)
    freq = H.translator_frequency_cm(28.0, w, 2.77)
    assert freq == pytest.approx(nu, abs=0.006)
    assert w / (freq * C.invcm_eV) == pytest.approx(r, abs=6e-4)
    assert 300.0 / (freq * C.invcm_K) == pytest.approx(tstar, abs=6e-4)
    c = H.hindered_translator(300.0, 28.0, w, 2.77)
    assert np.exp(ln_q_bottom(c, 300.0)) == pytest.approx(q, abs=6e-5)
    assert c.entropy / KB == pytest.approx(s, abs=6e-5)


@pytest.mark.parametrize("w, nu, r, tstar, q, s", ROTOR_B)
def test_rotor_check_values(w, nu, r, tstar, q, s):
    # source: adsorbate-models.md check values B (computed in the reference notes, not published)
    freq = H.rotor_frequency_cm(I_METHYL, w, 3)
    assert freq == pytest.approx(nu, abs=0.006)
    assert w / (freq * C.invcm_eV) == pytest.approx(r, abs=6e-4)
    assert 300.0 / (freq * C.invcm_K) == pytest.approx(tstar, abs=6e-4)
    c = H.hindered_rotor(300.0, I_METHYL, w, 3, 3)
    assert np.exp(ln_q_bottom(c, 300.0)) == pytest.approx(q, abs=6e-5)
    assert c.entropy / KB == pytest.approx(s, abs=6e-5)


def test_free_limits_check_values():
    # source: adsorbate-models.md check values B: free 1D translator over one site
    # q = 14.5418, S/k = 3.1770; free rotor (sigma = 3) q = 3.7215, S/k = 1.8141
    c = H.hindered_translator(300.0, 28.0, 0.0, 2.77)
    assert np.exp(c.ln_q) == pytest.approx(14.5418, abs=6e-5)
    assert c.entropy / KB == pytest.approx(3.1770, abs=6e-5)
    c = H.hindered_rotor(300.0, I_METHYL, 0.0, 3, 3)
    assert np.exp(c.ln_q) == pytest.approx(3.7215, abs=6e-5)
    assert c.entropy / KB == pytest.approx(1.8141, abs=6e-5)


# ---------------------------------------------------------------------------
# the published formulas, evaluated independently
# ---------------------------------------------------------------------------


@pytest.mark.parametrize("m, w, b, t", [(28.0, 0.05, 2.77, 300.0), (12.0, 0.3, 2.5, 80.0),
                                        (1.008, 0.01, 3.0, 20.0), (100.0, 1.0, 2.9, 1500.0)])
def test_classical_form_is_the_configuration_integral(m, w, b, t):
    # q_cl = sqrt(2 pi m k T)/h * int_0^b exp(-V(x)/kT) dx, <V> from the same weights
    # (classical statistical mechanics, textbook), integrated with scipy.integrate.quad
    kt = KB * t

    def boltz(x):
        return np.exp(-0.5 * w * (1 - np.cos(2 * np.pi * x / b)) / kt)

    z, _ = quad(boltz, 0.0, b, epsabs=0, epsrel=1e-13, limit=200)
    vbar, _ = quad(lambda x: 0.5 * w * (1 - np.cos(2 * np.pi * x / b)) * boltz(x), 0.0, b,
                   epsabs=0, epsrel=1e-13, limit=200)
    q_ref = np.sqrt(2 * np.pi * m * C.amu * C.k_B * t) / C.h * z * C.angstrom
    c = H.hindered_translator(t, m, w, b, quantum=False)
    assert c.zpe == 0.0
    assert np.exp(c.ln_q) == pytest.approx(q_ref, rel=1e-10)
    assert c.energy == pytest.approx(0.5 * kt + vbar / z, rel=1e-10)


def test_classical_rotor_is_the_configuration_integral():
    inertia, w, n, sigma, t = 3.2, 0.08, 3, 3, 150.0
    kt = KB * t
    z, _ = quad(lambda p: np.exp(-0.5 * w * (1 - np.cos(n * p)) / kt), 0, 2 * np.pi,
                epsabs=0, epsrel=1e-13, limit=200)
    q_ref = np.sqrt(2 * np.pi * inertia * C.amu_A2 * C.k_B * t) / C.h * z / sigma
    c = H.hindered_rotor(t, inertia, w, n, sigma, quantum=False)
    assert np.exp(c.ln_q) == pytest.approx(q_ref, rel=1e-10)


@pytest.mark.parametrize("m, w, b, t", [(28.0, 0.05, 2.77, 300.0), (12.0, 0.3, 2.5, 80.0),
                                        (1.008, 0.01, 3.0, 20.0), (50.0, 0.8, 2.9, 30.0)])
def test_quantum_form_matches_the_published_product_formula(m, w, b, t):
    # Sprowl et al. 2016 (adsorbate-models.md 1.5/1.6):
    # q = (pi r/T*)^1/2 e^-z I0(z) e^(-1/(2T*)) / (1 - e^(-1/T*)) e^(1/((2 + 16 r) T*))
    # S/k = -1/2 + 1/2 ln(pi r/T*) + ln I0 - z I1/I0 + x/(e^x - 1) - ln(1 - e^-x)
    # U/kT (from the well bottom) = -1/2 + z (1 - I1/I0) + x/2 + x/(e^x - 1) - x/(2 + 16 r)
    hnu = H.translator_frequency_cm(m, w, b) * C.invcm_eV
    r, ts, z = w / hnu, KB * t / hnu, w / (2 * KB * t)
    x = 1 / ts
    q_ref = (np.sqrt(np.pi * r / ts) * np.exp(-z) * iv(0, z) * np.exp(-x / 2) / (1 - np.exp(-x))
             * np.exp(x / (2 + 16 * r)))
    rho = iv(1, z) / iv(0, z)
    s_ref = (-0.5 + 0.5 * np.log(np.pi * r / ts) + np.log(iv(0, z)) - z * rho
             + x / np.expm1(x) - np.log(1 - np.exp(-x)))
    u_ref = KB * t * (-0.5 + z * (1 - rho) + x / 2 + x / np.expm1(x) - x / (2 + 16 * r))
    c = H.hindered_translator(t, m, w, b)
    assert np.exp(ln_q_bottom(c, t)) == pytest.approx(q_ref, rel=1e-10)
    assert c.entropy / KB == pytest.approx(s_ref, rel=1e-10)
    assert c.zpe + c.energy == pytest.approx(u_ref, rel=1e-10)
    assert c.zpe == pytest.approx(hnu * (0.5 - 1 / (2 + 16 * r)), rel=1e-12)


def test_zero_point_convention_is_self_consistent():
    # zpe + U - T S must equal -kT ln(q from the well bottom) (definition of A)
    t = np.geomspace(1.0, 5000.0, 40)
    for c in (H.hindered_translator(t, 28.0, 0.1, 2.77), H.hindered_rotor(t, 3.2, 0.05, 3, 3),
              H.hindered_translator(t, 1.008, 0.5, 2.5)):
        np.testing.assert_allclose(c.zpe + c.energy - t * c.entropy, -KB * t * ln_q_bottom(c, t),
                                   rtol=1e-11, atol=1e-14)


# ---------------------------------------------------------------------------
# limits
# ---------------------------------------------------------------------------


def test_zero_barrier_is_the_free_translator_and_the_2d_gas():
    # per direction and site: q = b sqrt(2 pi m k T)/h, U = kT/2, S = k (ln q + 1/2),
    # Cv = k/2 (textbook 1D ideal gas over a length b); two directions = 2D gas on b^2
    t = np.array([1.0, 10.0, 300.0, 5000.0])
    m, b = 28.0, 2.77
    c = H.hindered_translator(t, m, 0.0, b)
    q = b * C.angstrom * np.sqrt(2 * np.pi * m * C.amu * C.k_B * t) / C.h
    np.testing.assert_allclose(c.ln_q, np.log(q), rtol=1e-13)
    np.testing.assert_allclose(c.energy, 0.5 * KB * t, rtol=1e-13)
    np.testing.assert_allclose(c.entropy, KB * (np.log(q) + 0.5), rtol=1e-13)
    np.testing.assert_allclose(c.heat_capacity, 0.5 * KB, rtol=1e-13)
    assert c.zpe == 0.0
    gas = translation_2d(t, m, b * b)
    both = c + c
    np.testing.assert_allclose(both.ln_q, gas.ln_q, rtol=1e-12)
    np.testing.assert_allclose(both.entropy, gas.entropy, rtol=1e-12)
    # continuity: a tiny barrier is the free limit
    # (the closed form approaches it as sqrt(W): at 1 K and 1e-13 eV the offset is ~4e-5)
    tiny = H.hindered_translator(t, m, 1e-13, b)
    np.testing.assert_allclose(ln_q_bottom(tiny, t), np.log(q), atol=1e-4)


def test_zero_barrier_is_the_free_rotor():
    # q = (1/sigma) sqrt(8 pi^3 I k T)/h, S = k (ln q + 1/2) (textbook 1D free rotor)
    t = np.array([5.0, 300.0, 3000.0])
    c = H.hindered_rotor(t, 3.2, 0.0, 3, 3)
    q = np.sqrt(8 * np.pi**3 * 3.2 * C.amu_A2 * C.k_B * t) / (3 * C.h)
    np.testing.assert_allclose(c.ln_q, np.log(q), rtol=1e-13)
    np.testing.assert_allclose(c.entropy, KB * (np.log(q) + 0.5), rtol=1e-13)
    other = free_rotor(t, 3.2, symmetry_number=3)  # the gas-phase building block
    np.testing.assert_allclose(c.entropy, other.entropy, rtol=1e-12)
    np.testing.assert_allclose(c.energy, other.energy, rtol=1e-12)


@pytest.mark.parametrize("model", ["translator", "rotor"])
def test_large_barrier_is_the_harmonic_oscillator(model):
    # W >> kT: q -> q_HO(nu) = 1/(1 - e^-x) from the ground level (textbook); here
    # ln(q/q_HO) = ln[sqrt(2 pi z) e^-z I0(z)] = 1/(8z) + O(z^-2) (Abramowitz & Stegun
    # 9.7.1) and S - S_HO = k/(4z) + O(z^-2); the zero-point energy -> h nu/2 up to 1/(8 r)
    t, w = np.array([100.0, 300.0, 1000.0]), 50.0
    if model == "translator":
        c = H.hindered_translator(t, 28.0, w, 2.77)
        hnu = H.translator_frequency_cm(28.0, w, 2.77) * C.invcm_eV
    else:
        c = H.hindered_rotor(t, 3.2, w, 3)
        hnu = H.rotor_frequency_cm(3.2, w, 3) * C.invcm_eV
        c = _per_well(c, 3)  # q counts 3 equivalent wells
    x = hnu / (KB * t)
    ln_q_ho = -np.log(-np.expm1(-x))
    s_ho = KB * (x / np.expm1(x) - np.log(-np.expm1(-x)))
    z = w / (2 * KB * t)
    np.testing.assert_allclose(c.ln_q - ln_q_ho, 1 / (8 * z), rtol=0.01)
    np.testing.assert_allclose(c.entropy - s_ho, KB / (4 * z), rtol=0.01)
    r = w / hnu
    assert c.zpe == pytest.approx(hnu / 2, rel=1.01 / (8 * r))
    assert c.zpe != pytest.approx(hnu / 2, rel=0.99 / (8 * r))


def _per_well(c, n):
    """The same contribution with q divided by the number of wells n."""
    return Contribution(c.ln_q - np.log(n), c.energy, c.entropy - KB * np.log(n), c.heat_capacity, c.zpe)


# ---------------------------------------------------------------------------
# thermodynamic identities
# ---------------------------------------------------------------------------


CASES = [
    ("translator", (28.0, 0.1, 2.77), True),
    ("translator", (1.008, 0.02, 2.5), True),
    ("translator", (12.0, 1.0, 2.5), False),
    ("rotor", (3.2, 0.05, 3, 3), True),
    ("rotor", (20.0, 0.5, 2, 1), False),
    ("rotor", (0.5, 0.01, 6, 1), True),
]


def _block(kind, params, quantum):
    f = H.hindered_translator if kind == "translator" else H.hindered_rotor
    return lambda t: f(t, *params, quantum=quantum)


@pytest.mark.parametrize("kind, params, quantum", CASES)
def test_identities_by_central_differences(kind, params, quantum):
    f = _block(kind, params, quantum)
    t = np.array([1.0, 5.0, 20.0, 96.7, 300.0, 1000.0, 5000.0])
    c = f(t)
    dt = 1e-4 * t
    up, dn = f(t + dt), f(t - dt)
    # S = -dA/dT with A = zpe + U - TS = zpe - kT ln q; Cv = dU/dT; U = kT^2 dln q/dT
    np.testing.assert_allclose(c.entropy, -(up.free_energy(t + dt) - dn.free_energy(t - dt)) / (2 * dt),
                               rtol=1e-6, atol=1e-14)
    np.testing.assert_allclose(c.heat_capacity, (up.energy - dn.energy) / (2 * dt), rtol=1e-6, atol=1e-14)
    np.testing.assert_allclose(c.energy, KB * t**2 * (up.ln_q - dn.ln_q) / (2 * dt), rtol=1e-6, atol=1e-14)
    # G = H - TS for the block (A = zpe - kT ln q = zpe + U - TS)
    np.testing.assert_allclose(c.zpe - KB * t * c.ln_q, c.zpe + c.energy - t * c.entropy,
                               rtol=1e-12, atol=1e-15)


def test_large_argument_series_joins_the_direct_bessel_ratio():
    # z = W/(2kT) crosses the switch at z = 30: U and Cv must be continuous (to rounding)
    w = 0.5
    t_switch = w / (2 * 30.0 * KB)
    t = t_switch * np.array([1 - 1e-9, 1 + 1e-9])
    c = H.hindered_translator(t, 28.0, w, 2.77)
    assert c.energy[0] == pytest.approx(c.energy[1], rel=1e-8)
    assert c.heat_capacity[0] == pytest.approx(c.heat_capacity[1], rel=1e-8)


# ---------------------------------------------------------------------------
# accuracy of the closed forms against the exact solution of the same potential
# ---------------------------------------------------------------------------


def _deviation(closed, exact, t):
    dq = np.expm1(ln_q_bottom(closed, t) - ln_q_bottom(exact, t))
    ds = (closed.entropy - exact.entropy) / KB
    return np.abs(dq).max(), np.abs(ds).max()


def test_translator_accuracy_for_12_amu_and_heavier():
    # measured: q within 0.74 %, S within 0.0136 k (worst: 12 amu, b = 2.5 Å, W = 0.02 eV,
    # 10 K); within 0.01 k for >= 16 amu at b >= 2.77 Å
    t = np.geomspace(10.0, 2000.0, 25)
    worst_q = worst_s = worst_s_16 = 0.0
    for m in (12.0, 16.0, 28.0, 100.0):
        for b in (2.5, 2.77, 3.0):
            for w in (0.01, 0.02, 0.05, 0.3, 1.0):
                dq, ds = _deviation(H.hindered_translator(t, m, w, b),
                                    P.lattice_translator(t, m, b, P.cosine_terms(w)), t)
                worst_q, worst_s = max(worst_q, dq), max(worst_s, ds)
                if m >= 16 and b >= 2.77:
                    worst_s_16 = max(worst_s_16, ds)
    assert worst_q < 0.01
    assert worst_s < 0.015
    assert worst_s_16 < 0.01


def test_translator_accuracy_for_a_hydrogen_atom_is_worse():
    # measured at b = 2.77 Å, W = 0.01-0.05 eV, 10-100 K: up to 25 % in q, 0.12 k in S
    t = np.geomspace(10.0, 100.0, 12)
    worst_q = worst_s = 0.0
    for w in (0.01, 0.02, 0.05):
        dq, ds = _deviation(H.hindered_translator(t, 1.008, w, 2.77),
                            P.lattice_translator(t, 1.008, 2.77, P.cosine_terms(w)), t)
        worst_q, worst_s = max(worst_q, dq), max(worst_s, ds)
    assert 0.05 < worst_q < 0.30
    assert 0.01 < worst_s < 0.16


def test_rotor_accuracy_for_3_amu_A2_and_up_to_3_minima():
    # measured: within 2.5 % in q and 0.033 k in S (worst: I = 3 amu Å^2, n = 3, W = 0.01 eV, 20 K)
    t = np.geomspace(20.0, 2000.0, 20)
    worst_q = worst_s = 0.0
    for inertia in (3.0, 5.3, 10.0, 30.0):
        for n in (1, 2, 3):
            for w in (0.01, 0.02, 0.05, 0.3, 1.0):
                dq, ds = _deviation(H.hindered_rotor(t, inertia, w, n),
                                    P.ring_rotor(t, inertia, P.cosine_terms(w, n)), t)
                worst_q, worst_s = max(worst_q, dq), max(worst_s, ds)
    assert worst_q < 0.03
    assert worst_s < 0.035


def test_light_rotor_with_six_minima_at_low_temperature_is_much_worse():
    t = np.geomspace(10.0, 50.0, 8)
    dq, ds = _deviation(H.hindered_rotor(t, 1.0, 0.02, 6), P.ring_rotor(t, 1.0, P.cosine_terms(0.02, 6)), t)
    assert dq > 0.1 and ds > 0.1


# deterministic sample of (kind, mass or inertia, W, b or n, T) spanning both regimes
_RNG = np.random.default_rng(20160719)
RULE_SAMPLE = [
    (kind, float(np.exp(_RNG.uniform(np.log(lo), np.log(hi)))), float(np.exp(_RNG.uniform(np.log(1e-3), np.log(2.0)))),
     float(_RNG.uniform(2.3, 3.2)) if kind == "translator" else int(_RNG.integers(1, 7)))
    for kind, lo, hi in [("translator", 1.0, 200.0), ("rotor", 0.5, 50.0)] * 12
]


@pytest.mark.parametrize("kind, mass, w, shape", RULE_SAMPLE)
def test_reliability_rule_holds_where_it_says_so(kind, mass, w, shape):
    # where the rule says reliable: within 1 % in q and 0.02 k in S of the exact solution
    t = np.geomspace(2.0, 3000.0, 30)
    if kind == "translator":
        ok = H.translator_closed_form_reliable(t, mass, w, shape)
        closed, exact = H.hindered_translator(t, mass, w, shape), P.lattice_translator(t, mass, shape, P.cosine_terms(w))
    else:
        ok = H.rotor_closed_form_reliable(t, mass, w, shape)
        closed, exact = H.hindered_rotor(t, mass, w, shape), P.ring_rotor(t, mass, P.cosine_terms(w, shape))
    dq = np.abs(np.expm1(ln_q_bottom(closed, t) - ln_q_bottom(exact, t)))
    ds = np.abs(closed.entropy - exact.entropy) / KB
    assert np.all(dq[ok] <= 0.01)
    assert np.all(ds[ok] <= 0.02)


def test_reliability_rule_flags_the_known_bad_cases():
    t = np.array([20.0, 50.0, 300.0])
    assert not np.any(H.translator_closed_form_reliable(t[:2], 1.008, 0.01, 2.77))
    assert np.all(H.translator_closed_form_reliable(t, 28.0, 0.1, 2.77))
    assert np.all(H.translator_closed_form_reliable(t, 1.008, 0.0, 2.77))  # free translator is exact
    assert not np.any(H.rotor_closed_form_reliable(t[:2], 1.0, 0.02, 6))
    assert np.all(H.rotor_closed_form_reliable(t, 10.0, 0.3, 3))
    ok = H.closed_form_reliable(t, mass_amu=28.0, barrier_eV=0.1, spacing_A=2.77,
                                inertia_amu_A2=1.0, rotation_barrier_eV=0.02, n_minima=6)
    assert not np.any(ok[:2])
    with pytest.raises(InputError, match="translator needs all"):
        H.closed_form_reliable(t, mass_amu=28.0)
    with pytest.raises(InputError, match="give the translator"):
        H.closed_form_reliable(t)


# ---------------------------------------------------------------------------
# monotonicity, range, shapes, bad input
# ---------------------------------------------------------------------------


@given(m=st.floats(1.0, 300.0), w=st.floats(0.0, 5.0), b=st.floats(2.0, 4.0))
def test_translator_entropy_increases_where_reliable(m, w, b):
    t = np.geomspace(1.0, 5000.0, 80)
    c = H.hindered_translator(t, m, w, b)
    ok = H.translator_closed_form_reliable(t, m, w, b)
    both = ok[1:] & ok[:-1]
    assert np.all(np.diff(c.entropy)[both] > 0)


@given(inertia=st.floats(0.5, 100.0), w=st.floats(0.0, 5.0), n=st.integers(1, 6))
def test_rotor_entropy_increases_where_reliable(inertia, w, n):
    t = np.geomspace(1.0, 5000.0, 80)
    c = H.hindered_rotor(t, inertia, w, n)
    ok = H.rotor_closed_form_reliable(t, inertia, w, n)
    both = ok[1:] & ok[:-1]
    assert np.all(np.diff(c.entropy)[both] > 0)


def test_known_failure_negative_heat_capacity_outside_the_rule():
    # the closed form's harmonic correction misbehaves for r = W/(h nu) << 1 and
    # W < kT < h nu: Cv < 0 (S falling with T). The rule must flag it.
    t = np.array([40.0, 67.0, 100.0])
    c = H.hindered_rotor(t, 0.5, 0.01, 5)
    assert np.any(c.heat_capacity < 0)
    assert not np.any(H.rotor_closed_form_reliable(t, 0.5, 0.01, 5))


def test_no_warnings_and_finite_values_from_1_to_5000_K():
    t = np.geomspace(1.0, 5000.0, 60)[:, None]
    w = np.array([0.0, 1e-6, 0.01, 0.3, 10.0])
    for c in (H.hindered_translator(t, 1.008, w, 2.5), H.hindered_translator(t, 500.0, w, 4.0),
              H.hindered_rotor(t, 0.3, w, 6, 2), H.hindered_rotor(t, 300.0, w, 1),
              H.hindered_translator(t, 28.0, w, 2.77, quantum=False)):
        for v in (c.ln_q, c.energy, c.entropy, c.heat_capacity, c.zpe):
            assert np.all(np.isfinite(v))


def test_shapes_broadcast():
    t = np.array([100.0, 300.0, 1000.0])[:, None]
    w = np.array([0.01, 0.1, 0.2, 0.5])
    c = H.hindered_translator(t, 28.0, w, 2.77)
    assert c.ln_q.shape == (3, 4) and c.heat_capacity.shape == (3, 4)
    assert np.shape(c.zpe) == (4,)
    assert H.translator_frequency_cm(28.0, w, 2.77).shape == (4,)
    assert isinstance(H.hindered_rotor(300.0, 3.0, 0.1, 3).zpe, float)


@pytest.mark.parametrize("call, match", [
    (lambda: H.hindered_translator(0.0, 28.0, 0.1, 2.77), "temperature"),
    (lambda: H.hindered_translator(300.0, -1.0, 0.1, 2.77), "mass_amu"),
    (lambda: H.hindered_translator(300.0, 28.0, -0.1, 2.77), "barrier_eV"),
    (lambda: H.hindered_translator(300.0, 28.0, 0.1, np.inf), "spacing_A"),
    (lambda: H.hindered_translator(300.0, 28.0, "x", 2.77), "barrier_eV"),
    (lambda: H.hindered_rotor(300.0, 3.0, 0.1, 2.5), "n_minima"),
    (lambda: H.hindered_rotor(300.0, 3.0, 0.1, 3, 0), "symmetry_number"),
    (lambda: H.rotor_frequency_cm(0.0, 0.1, 3), "inertia_amu_A2"),
])
def test_bad_input_raises_input_error(call, match):
    with pytest.raises(InputError, match=match):
        call()
