"""Tests of the frequency floor and the quasi-RRHO treatment of soft modes.

Sources: S. Grimme, Chem. Eur. J. 2012, 18, 9955 (quasi-RRHO entropy; the
parameters nu0 = 100 cm^-1, alpha = 4, B_av = 1e-44 kg m^2 are from memory in
the reference notes); J.-D. Chai, M. Head-Gordon, PCCP 2008, 10, 6615 (damping
function); Y.-P. Li et al., J. Phys. Chem. C 2015, 119, 1840 (enthalpy
interpolation, from memory); R. F. Ribeiro et al., J. Phys. Chem. B 2011, 115,
14556 (floor, from memory); regression table from the maintainers' reference compilation 
adsorbate-models.md, check values B ("computed in the reference notes, not
published"); textbook harmonic oscillator and free rotor (McQuarrie,
Statistical Mechanics, 1976).
"""

import numpy as np
import pytest
from hypothesis import given
from hypothesis import strategies as st

from adsorb import constants as C
from adsorb.errors import InputError
from adsorb.partition import lowfreq as L
from adsorb.partition.rotation import free_rotor
from adsorb.partition.vibration import harmonic

KB = C.kB_eV
J = C.EV_PER_K_TO_J_MOL_K

# (nu cm^-1, S_HO, S_FR, S_qRRHO, S_HO with 100 cm^-1 floor) in J/(mol K) at 298.15 K,
# nu0 = 100 cm^-1, alpha = 4, B_av = 1e-44 kg m^2.
# Source: adsorbate-models.md, check values B -- computed in the reference notes, not published.
QRRHO_TABLE = [
    (10, 33.518, 21.506, 21.507, 14.453),
    (50, 20.156, 14.824, 15.138, 14.453),
    (100, 14.453, 11.944, 13.198, 14.453),
    (200, 8.925, 9.063, 8.933, 8.925),
    (500, 2.754, 5.254, 2.758, 2.754),
]


@pytest.mark.parametrize("nu, s_ho, s_fr, s_q, s_floor", QRRHO_TABLE)
def test_qrrho_check_values(nu, s_ho, s_fr, s_q, s_floor):
    t = 298.15
    assert harmonic(t, [nu]).entropy * J == pytest.approx(s_ho, abs=6e-4)
    assert float(L.free_rotor_entropy(t, nu)[0]) * J == pytest.approx(s_fr, abs=6e-4)
    assert L.quasi_rrho(t, [nu]).entropy * J == pytest.approx(s_q, abs=6e-4)
    assert L.harmonic_with_floor(t, [nu]).entropy * J == pytest.approx(s_floor, abs=6e-4)


# ---------------------------------------------------------------------------
# limits and definitions
# ---------------------------------------------------------------------------


def test_damping_weight_is_one_half_at_the_cutoff_and_tends_to_0_and_1():
    # w(nu0) = 1/2, w -> 1 for nu >> nu0, -> 0 for nu << nu0 (Chai & Head-Gordon 2008 form)
    w = L.damping_weight([100.0, 1.0, 1e4], cutoff_cm=100.0, alpha=4)
    np.testing.assert_allclose(w, [0.5, 1e-8 / (1 + 1e-8), 1e8 / (1 + 1e8)], rtol=1e-12)
    assert float(L.damping_weight(50.0, cutoff_cm=50.0, alpha=2)[0]) == pytest.approx(0.5)


def test_free_rotor_entropy_without_the_average_inertia_cap_is_the_textbook_free_rotor():
    # B_av -> infinity: mu' = mu = h/(8 pi^2 nu), S = k [ln q + 1/2], q = sqrt(8 pi^3 mu k T)/h
    t = np.array([50.0, 298.15, 2000.0])
    nu = 30.0
    mu = C.h / (8 * np.pi**2 * nu * 100 * C.c)
    s = L.free_rotor_entropy(t, nu, average_inertia_kg_m2=1e10)
    np.testing.assert_allclose(s, free_rotor(t, mu / C.amu_A2).entropy, rtol=1e-12)


def test_qrrho_limits_are_harmonic_for_stiff_and_free_rotor_for_soft_modes():
    t = np.array([10.0, 298.15, 3000.0])
    # w(3000 cm^-1) = 1 - 1.2e-6: the free-rotor share is below 1e-5 k (the free-rotor
    # entropy itself is negative here at 10 K, a known feature of the classical formula)
    stiff = L.quasi_rrho(t, [3000.0])
    np.testing.assert_allclose(stiff.entropy, harmonic(t, [3000.0]).entropy, rtol=0, atol=1e-5 * KB)
    soft = L.quasi_rrho(t, [0.5], enthalpy="interpolated")
    np.testing.assert_allclose(soft.entropy, L.free_rotor_entropy(t, 0.5), rtol=1e-8)
    # Li et al. enthalpy: a very soft mode contributes kT/2 and no zero-point energy
    np.testing.assert_allclose(soft.energy, 0.5 * KB * t, rtol=1e-8)
    assert soft.zpe == pytest.approx(0.0, abs=1e-12)
    # Grimme's original keeps the harmonic energy
    np.testing.assert_allclose(L.quasi_rrho(t, [0.5]).energy, harmonic(t, [0.5]).energy, rtol=1e-12)


def test_floor_applies_only_below_and_only_when_chosen():
    nu = np.array([15.0, 60.0, 99.9, 100.0, 450.0])
    np.testing.assert_array_equal(L.apply_floor(nu), [100.0, 100.0, 100.0, 100.0, 450.0])
    t = np.array([100.0, 500.0])
    floored = L.harmonic_with_floor(t, nu)
    np.testing.assert_allclose(floored.entropy, harmonic(t, [100.0] * 4 + [450.0]).entropy, rtol=1e-13)
    # a floor below every mode changes nothing
    np.testing.assert_allclose(L.harmonic_with_floor(t, nu, floor_cm=1.0).entropy, harmonic(t, nu).entropy,
                               rtol=1e-13)
    assert L.harmonic_with_floor(t, nu).zpe == pytest.approx(0.5 * C.invcm_eV * 850.0)


# ---------------------------------------------------------------------------
# thermodynamic identities: what holds and what does not
# ---------------------------------------------------------------------------

MODES = [25.0, 80.0, 100.0, 140.0, 900.0]


def _diffs(f, t):
    dt = 1e-4 * t
    up, dn = f(t + dt), f(t - dt)
    s_fd = -(up.free_energy(t + dt) - dn.free_energy(t - dt)) / (2 * dt)
    cv_fd = (up.energy - dn.energy) / (2 * dt)
    return s_fd, cv_fd


@pytest.mark.parametrize("enthalpy", ["harmonic", "interpolated"])
def test_g_equals_h_minus_ts_by_construction(enthalpy):
    t = np.geomspace(1.0, 5000.0, 20)
    c = L.quasi_rrho(t, MODES, enthalpy=enthalpy)
    np.testing.assert_allclose(c.zpe - KB * t * c.ln_q, c.zpe + c.energy - t * c.entropy, rtol=1e-12)


def test_interpolated_enthalpy_is_a_proper_free_energy():
    # weights do not depend on T, so A = sum w A_HO + (1 - w) A_FR and S = -dA/dT, Cv = dU/dT
    t = np.array([5.0, 50.0, 298.15, 2000.0])
    c = L.quasi_rrho(t, MODES, enthalpy="interpolated")
    s_fd, cv_fd = _diffs(lambda x: L.quasi_rrho(x, MODES, enthalpy="interpolated"), t)
    np.testing.assert_allclose(c.entropy, s_fd, rtol=1e-6)
    np.testing.assert_allclose(c.heat_capacity, cv_fd, rtol=1e-6)


def test_harmonic_enthalpy_entropy_is_not_the_derivative_of_g():
    # Grimme's original: Cv = dU/dT holds, but S = -dG/dT does NOT (S is an interpolation)
    t = np.array([50.0, 298.15, 1000.0])
    c = L.quasi_rrho(t, MODES)
    s_fd, cv_fd = _diffs(lambda x: L.quasi_rrho(x, MODES), t)
    np.testing.assert_allclose(c.heat_capacity, cv_fd, rtol=1e-6)
    assert np.all(np.abs(c.entropy / s_fd - 1.0) > 1e-3)


def test_floor_satisfies_every_identity():
    t = np.array([5.0, 298.15, 3000.0])
    c = L.harmonic_with_floor(t, MODES)
    s_fd, cv_fd = _diffs(lambda x: L.harmonic_with_floor(x, MODES), t)
    np.testing.assert_allclose(c.entropy, s_fd, rtol=1e-6, atol=1e-13)
    np.testing.assert_allclose(c.heat_capacity, cv_fd, rtol=1e-6, atol=1e-13)


@given(nus=st.lists(st.floats(1.0, 5000.0), min_size=1, max_size=8),
       enthalpy=st.sampled_from(["harmonic", "interpolated"]))
def test_entropy_increases_with_temperature(nus, enthalpy):
    t = np.geomspace(1.0, 5000.0, 60)
    for s in (L.quasi_rrho(t, nus, enthalpy=enthalpy).entropy, L.harmonic_with_floor(t, nus).entropy):
        assert np.all(np.diff(s) >= 0) and s[-1] > s[0]


def test_no_warnings_and_finite_from_1_to_5000_K_and_1_to_5000_cm():
    t = np.geomspace(1.0, 5000.0, 40)[:, None]
    nu = np.geomspace(1.0, 5000.0, 30)[None, :, None]  # 30 species of one mode
    for c in (L.quasi_rrho(t, nu), L.quasi_rrho(t, nu, enthalpy="interpolated"), L.harmonic_with_floor(t, nu)):
        for v in (c.ln_q, c.energy, c.entropy, c.heat_capacity):
            assert v.shape == (40, 30) and np.all(np.isfinite(v))


def test_shapes_follow_the_harmonic_convention():
    t = np.array([100.0, 300.0, 1000.0])[:, None]
    nu = np.array([[20.0, 300.0], [50.0, 700.0]])  # 2 species x 2 modes
    c = L.quasi_rrho(t, nu)
    assert c.entropy.shape == (3, 2) and np.shape(c.zpe) == (2,)
    for k in range(2):
        one = L.quasi_rrho(t[:, 0], nu[k])
        np.testing.assert_allclose(c.entropy[:, k], one.entropy, rtol=1e-13)
    assert isinstance(L.quasi_rrho(300.0, [50.0, 60.0]).zpe, float)


@pytest.mark.parametrize("call, match", [
    (lambda: L.quasi_rrho(300.0, [-50.0, 100.0]), "frequencies_cm"),
    (lambda: L.quasi_rrho(300.0, np.array([50.0 + 0j, 20j])), "imaginary"),
    (lambda: L.quasi_rrho(300.0, [50.0], enthalpy="quasi"), "enthalpy"),
    (lambda: L.quasi_rrho(300.0, [50.0], cutoff_cm=0.0), "cutoff_cm"),
    (lambda: L.quasi_rrho(-1.0, [50.0]), "temperature"),
    (lambda: L.quasi_rrho(np.ones(3), np.ones((2, 4))), "broadcast"),
    (lambda: L.harmonic_with_floor(300.0, [50.0], floor_cm=-1.0), "floor_cm"),
    (lambda: L.free_rotor_entropy(300.0, 50.0, average_inertia_kg_m2=0.0), "average_inertia"),
])
def test_bad_input_raises_input_error(call, match):
    with pytest.raises(InputError, match=match):
        call()
