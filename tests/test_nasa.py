"""Tests of adsorb.nasa: two-range NASA 7-coefficient fits with exact continuity constraints.

Sources: McBride, Gordon, Reno, NASA TM-4513 (1993) for the polynomial form; molecular constants and
JANAF values from the maintainers' reference compilation gas-reference-data.md (NIST-JANAF 4th ed., Chase 1998;
CCCBDB; Huber & Herzberg and Shimanouchi, several from memory as marked there); RRHO building blocks of
adsorb.partition (another module's job; here only their output is fitted).
"""

import json
import warnings

import numpy as np
import pytest

from adsorb import constants as C
from adsorb import nasa, thermo
from adsorb.errors import InputError, ModelWarning
from adsorb.partition.rotation import linear_rotor, nonlinear_rotor
from adsorb.partition.translation import translation_3d
from adsorb.partition.vibration import harmonic

# gas-reference-data.md §2a/2b: molar mass (g/mol), rotor, rotational constants (cm^-1), σ, fundamentals (cm^-1)
GASES = {
    "N2": (28.014, "linear", 1.98957, 2, [2329.91]),
    "CO2": (44.009, "linear", 0.39021, 2, [1333, 667, 667, 2349]),
    "CH4": (16.043, "nonlinear", (5.241, 5.241, 5.241), 12, [2917, 1534, 1534, 3019, 3019, 3019, 1306, 1306, 1306]),
    "H2O": (18.015, "nonlinear", (27.877, 14.512, 9.285), 2, [3657, 1595, 3756]),
}
# NIST-JANAF (gas-reference-data.md Table 1a): S°298.15 J/(mol K), H°1000 - H°298.15 kJ/mol, and the
# tier-2 RRHO tolerances of §4 (S°298) / the observed RRHO deviation of §3.3 rounded up (enthalpy)
JANAF = {
    "N2": (191.609, 0.05, 21.463, 0.05),
    "CO2": (213.795, 0.05, 33.397, 0.05),
    "CH4": (186.251, 0.1, 38.179, 0.05),
    "H2O": (188.834, 0.2, 26.000, 0.15),
}


def gas_table(name, temperature, energy=-7.0):
    m, kind, rot, sigma, nu = GASES[name]
    t = np.asarray(temperature, float)
    rotor = linear_rotor(t, rot, sigma) if kind == "linear" else nonlinear_rotor(t, rot, sigma)
    contrib = translation_3d(t, m, C.P_STANDARD) + rotor + harmonic(t, np.array(nu, float))
    return thermo.assemble(t, contrib, energy=energy, pressure=C.P_STANDARD, gas=True, name=name)


def fit_grid():
    return np.unique(np.concatenate([np.geomspace(250.0, 3000.0, 200), [298.15]]))


@pytest.fixture(scope="module")
def fits():
    return {name: nasa.fit_nasa7(gas_table(name, fit_grid()), t_mid_K="auto", objective="minimax")
            for name in GASES}


# independent evaluation of the NASA 7 form (McBride, Gordon, Reno 1993), written out here
def cp_r(a, t):
    return a[0] + a[1] * t + a[2] * t**2 + a[3] * t**3 + a[4] * t**4


def dcp_r(a, t):
    return a[1] + 2 * a[2] * t + 3 * a[3] * t**2 + 4 * a[4] * t**3


def h_rt(a, t):
    return a[0] + a[1] * t / 2 + a[2] * t**2 / 3 + a[3] * t**3 / 4 + a[4] * t**4 / 5 + a[5] / t


def s_r(a, t):
    return a[0] * np.log(t) + a[1] * t + a[2] * t**2 / 2 + a[3] * t**3 / 3 + a[4] * t**4 / 4 + a[6]


# ---------------------------------------------------------------------------
@pytest.mark.parametrize("name", list(GASES))
def test_fit_reproduces_cp_and_s_within_0p1_percent(fits, name):
    # on a denser grid than the fitted points (997 temperatures over 250-3000 K)
    p = fits[name]
    t = np.geomspace(250.0, 3000.0, 997)
    ref = gas_table(name, t)
    assert np.max(np.abs(p.heat_capacity(t) / ref.heat_capacity - 1)) < 1e-3
    assert np.max(np.abs(p.entropy(t) / ref.entropy - 1)) < 1e-3
    # enthalpy shape: H(T) - H(298.15) within 0.02 kJ/mol (increments reach ~150 kJ/mol at 3000 K)
    dh = (p.enthalpy(t) - p.enthalpy(298.15)) - (ref.enthalpy - gas_table(name, [298.15]).enthalpy[0])
    assert np.max(np.abs(C.to_kj_per_mol(dh))) < 0.02
    assert p.fit_errors["low"]["cp_max_rel"] < 1e-3 and p.fit_errors["high"]["s_max_rel"] < 1e-3


@pytest.mark.parametrize("name", list(GASES))
def test_fitted_polynomial_against_janaf(fits, name):
    # NIST-JANAF S°298.15 and H°1000 - H°298.15 within the RRHO tolerances of the reference data
    s298, s_tol, dh, dh_tol = JANAF[name]
    p = fits[name]
    assert C.to_j_per_mol_k(p.entropy(298.15)) == pytest.approx(s298, abs=s_tol)
    assert C.to_kj_per_mol(p.enthalpy(1000.0) - p.enthalpy(298.15)) == pytest.approx(dh, abs=dh_tol)


@pytest.mark.parametrize("name", list(GASES))
def test_continuity_at_the_common_temperature(fits, name):
    # the four constraints: Cp, dCp/dT, H and S equal from both sides (1e-10 relative)
    p = fits[name]
    tm = p.t_mid_K
    lo, hi = np.array(p.low), np.array(p.high)
    for f in (cp_r, dcp_r, h_rt, s_r):
        a, b = f(lo, tm), f(hi, tm)
        assert abs(a - b) <= 1e-10 * max(abs(a), abs(b))
    # and the module's own evaluation matches the formulas written here
    assert p.heat_capacity(tm + 1.0) == pytest.approx(C.kB_eV * cp_r(hi, tm + 1.0), rel=1e-13)
    assert p.enthalpy(tm - 1.0) == pytest.approx(C.kB_eV * (tm - 1.0) * h_rt(lo, tm - 1.0), rel=1e-13)


def test_polynomial_identities():
    # dH/dT = Cp and dS/dT = Cp/T hold exactly for the NASA form (central differences); G = H - TS
    p = nasa.fit_nasa7(gas_table("CO2", fit_grid()))
    for t in (300.0, 999.0, 2500.0):
        h = 1e-3
        assert (p.enthalpy(t + h) - p.enthalpy(t - h)) / (2 * h) == pytest.approx(p.heat_capacity(t), rel=1e-6)
        assert (p.entropy(t + h) - p.entropy(t - h)) / (2 * h) == pytest.approx(p.heat_capacity(t) / t, rel=1e-6)
        assert p.gibbs(t) == pytest.approx(p.enthalpy(t) - t * p.entropy(t), rel=1e-14)


def test_least_squares_fit_is_optimal_among_continuous_polynomials():
    # KKT optimality (independent check): no small change of the 14 coefficients that keeps the four
    # continuity conditions can lower the documented objective (sum of squared relative residuals)
    table = gas_table("CH4", fit_grid())
    p = nasa.fit_nasa7(table)
    t = table.temperature
    kb = C.kB_eV

    def objective(lo, hi):
        total = 0.0
        for a, m in ((lo, t <= p.t_mid_K + 1e-9), (hi, t >= p.t_mid_K - 1e-9)):
            tt = t[m]
            cp = table.heat_capacity[m] / kb
            hh = table.enthalpy[m] / (kb * tt)
            ss = table.entropy[m] / kb
            total += np.sum(((cp_r(a, tt) - cp) / cp) ** 2)
            total += np.sum(((h_rt(a, tt) - hh) / np.maximum(np.abs(hh), 1)) ** 2)
            total += np.sum(((s_r(a, tt) - ss) / np.maximum(np.abs(ss), 1)) ** 2)
        return total

    lo, hi = np.array(p.low), np.array(p.high)
    tm = p.t_mid_K
    cons = np.array([[f(np.eye(7)[j], tm) for j in range(7)] for f in (cp_r, dcp_r, h_rt, s_r)])
    cmat = np.hstack([cons, -cons])
    _, _, vt = np.linalg.svd(cmat)
    null = vt[4:].T  # feasible directions
    scale = np.abs(np.concatenate([lo, hi])) + 1e-30
    base = objective(lo, hi)
    rng = np.random.default_rng(5)
    for _ in range(20):
        d = null @ rng.normal(size=null.shape[1])
        d = d / np.max(np.abs(d) / scale) * 1e-6
        assert objective(lo + d[:7], hi + d[7:]) >= base * (1 - 1e-12)
        assert np.max(np.abs(cmat @ d)) < 1e-9 * np.max(np.abs(cmat)) * np.max(np.abs(d))


def test_json_and_csv_round_trip(tmp_path, fits):
    p = fits["H2O"]
    p.to_json(tmp_path / "h2o.json")
    p.to_csv(tmp_path / "h2o.csv")
    back_json = nasa.read_nasa_json(tmp_path / "h2o.json")
    back_csv = nasa.read_nasa_csv(tmp_path / "h2o.csv")
    for back in (back_json, back_csv):
        assert back.low == p.low and back.high == p.high  # exact, full precision
        assert (back.t_low_K, back.t_mid_K, back.t_high_K) == (p.t_low_K, p.t_mid_K, p.t_high_K)
        assert back.name == "H2O" and back.enthalpy_reference == p.enthalpy_reference
        np.testing.assert_array_equal(back.entropy([300.0, 2000.0]), p.entropy([300.0, 2000.0]))
    data = json.loads((tmp_path / "h2o.json").read_text())
    assert "NASA TM-4513" in data["format"] and data["fit_errors"]["low"]["cp_max_rel"] < 1e-3
    assert (tmp_path / "h2o.csv").read_text().splitlines()[0].startswith("species,range,t_min_K,t_max_K,a1")


def test_callable_and_species_sources_agree_with_the_table():
    class Species:  # anything with thermo(T) -> ThermoTable-like
        name = "N2"

        def thermo(self, t):
            return gas_table("N2", t)

    a = nasa.fit_nasa7(Species(), t_low_K=300.0, t_high_K=3000.0, n_samples=120)
    b = nasa.fit_nasa7(lambda t: gas_table("N2", t), t_low_K=300.0, t_high_K=3000.0, n_samples=120)
    c = nasa.fit_nasa7(gas_table("N2", np.geomspace(300.0, 3000.0, 120)))
    assert a.name == "N2" and a.low == b.low == c.low


def test_default_least_squares_fit_of_a_diatomic_at_1000K():
    # the classic layout (T_mid = 1000 K, plain least squares) is already within 0.1 % in Cp for N2
    p = nasa.fit_nasa7(gas_table("N2", np.geomspace(300.0, 3000.0, 200)))
    assert p.t_mid_K == 1000.0
    assert max(e["cp_max_rel"] for e in p.fit_errors.values()) < 1e-3


def test_extrapolation_warns():
    p = nasa.fit_nasa7(gas_table("N2", np.geomspace(300.0, 3000.0, 100)))
    with pytest.warns(ModelWarning, match="outside its fitted range"):
        p.heat_capacity(4000.0)
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        p.heat_capacity([300.0, 3000.0])  # the range ends themselves do not warn


@pytest.mark.parametrize("kwargs, match", [
    ({"t_mid_K": 5000.0}, "t_low_K < t_mid_K < t_high_K"),
    ({"t_mid_K": "middle"}, "t_mid_K must be"),
    ({"weights": (1, -1, 1)}, "weights"),
    ({"objective": "l1"}, "objective"),
])
def test_bad_input(kwargs, match):
    with pytest.raises(InputError, match=match):
        nasa.fit_nasa7(gas_table("N2", np.geomspace(300.0, 3000.0, 100)), **kwargs)


def test_bad_sources():
    with pytest.raises(InputError, match="source must have arrays"):
        nasa.fit_nasa7(42)
    with pytest.raises(InputError, match="only 3 data points"):
        nasa.fit_nasa7(gas_table("N2", [300.0, 400.0, 500.0, 1500, 1600, 1700, 1800, 1900, 2000, 2100, 2200]))
