"""Entropy benchmarks (adsorb.entropy_benchmarks): the Campbell-Sellers comparison and the n-alkane prefactors.

Sources of the checks:
* Campbell and Sellers, J. Am. Chem. Soc. 2012, 134, 18109 (the correlation and its qualitative finding);
  the methanol check value of the project's reference notes (S°gas from Savara, J. Phys. Chem. C 2016,
  120, 20478);
* NIST-JANAF 4th ed. (Chase 1998) and Gurvich et al. via NIST CCCBDB for the gas entropies (as transcribed
  in the project's gas-reference compilation, tier-2 tolerances from there);
* Tait, Dohnálek, Campbell, Kay, J. Chem. Phys. 2005, 122, 164708 (prefactors rise with chain length,
  10^13.1 s^-1 for CH4, E_d = 6.5 + 7.1 N kJ/mol, 0.6 K/s) and the peak temperatures the reference notes
  computed from those numbers;
* ase.build.molecule (G2 geometries) for the zig-zag builder;
* statistical-mechanics identities (U = kT^2 d ln q/dT) and limits, with constants from scipy.constants.
Invented site parameters are those of the module, labelled invented there.
"""

from __future__ import annotations

import re
from pathlib import Path

import numpy as np
import pytest
import scipy.constants as sc
from ase.build import molecule

from adsorb import entropy_benchmarks as eb
from adsorb import tpd
from adsorb.adsorbate import Adsorbate
from adsorb.errors import InputError
from adsorb.geometry import principal_moments
from adsorb.model_choice import campbell_sellers_entropy
from adsorb.partition import periodic
from adsorb.partition.rotation import free_rotor, nonlinear_rotor
from adsorb.partition.translation import translation_2d
from adsorb.partition.vibration import harmonic
from adsorb.thermo import assemble

# invented test species keep soft modes at high T on purpose; the domain warning of the
# harmonic model is checked in tests/test_adsorbate.py::test_harmonic_domain_warnings
pytestmark = pytest.mark.filterwarnings("ignore:.*softest harmonic mode:adsorb.errors.ModelWarning")

J_MOL_K = sc.e * sc.N_A          # eV/K per molecule -> J/(mol K), CODATA via scipy
K_EV = sc.k / sc.e               # eV/K
R = sc.R
DOC = Path(__file__).resolve().parents[1] / "docs" / "entropy-benchmarks.md"


@pytest.fixture(scope="module")
def correlation_rows():
    return eb.correlation_benchmark()


@pytest.fixture(scope="module")
def alkane_rows():
    return eb.alkane_benchmark()


# ---------------------------------------------------------------------------
# (a) the correlation and the gas data
# ---------------------------------------------------------------------------
def test_campbell_sellers_methanol_check_value():
    # reference notes, check values B: methanol S°gas = 239.81 J/(mol K) (Savara 2016) -> 140.43 J/(mol K)
    s = campbell_sellers_entropy(239.81 / J_MOL_K) * J_MOL_K
    assert s == pytest.approx(140.43, abs=0.01)


def test_rows_use_the_published_correlation(correlation_rows):
    # Campbell and Sellers 2012: S°ad = 0.70 S°gas - 3.3 R, SD 2R; deviations are in units of 2R
    for r in correlation_rows:
        assert r.correlation_entropy == pytest.approx(0.70 * r.gas_entropy - 3.3 * R, abs=1e-9)
        for model, s in r.entropies.items():
            assert r.deviations[model] == pytest.approx((s - r.correlation_entropy) / (2 * R), abs=1e-12)


# S°(298.15 K, 1 bar) in J/(mol K) and the tier-2 tolerance of the reference compilation
GAS_TABLE = {
    "Ar": (154.845, 0.005),   # NIST-JANAF Ar-001
    "N2": (191.609, 0.05),    # NIST-JANAF N-023
    "CO": (197.653, 0.05),    # NIST-JANAF C-093
    "CO2": (213.795, 0.05),   # NIST-JANAF C-095
    "H2O": (188.834, 0.2),    # NIST-JANAF H-064
    "NH3": (192.774, 0.5),    # NIST-JANAF H-083
    "CH4": (186.251, 0.1),    # NIST-JANAF C-067
    "C2H6": (229.16, 0.15),   # Gurvich et al. 1989-91 via NIST CCCBDB; torsion as hindered rotor (tests/test_torsion.py)
}


@pytest.mark.parametrize("name", sorted(GAS_TABLE))
def test_benchmark_gas_entropy_against_tables(name):
    value, tol = GAS_TABLE[name]
    s = float(eb.benchmark_gas(name).thermo(298.15).entropy) * J_MOL_K
    assert abs(s - value) <= tol


def test_every_benchmark_gas_has_an_invented_site():
    assert set(eb.GAS_DATA) == set(eb.INVENTED_SITES) == set(GAS_TABLE)
    for site in eb.INVENTED_SITES.values():
        assert "invented" in site.orientation      # the labelling rule of the project
        assert 2.5 <= site.site_spacing_A <= 3.0     # the range chosen for the invented sites


@pytest.mark.parametrize("name", sorted(GAS_TABLE))
def test_adsorbate_inputs_are_3n_and_the_models_replace_the_soft_modes(name):
    inputs = eb.benchmark_adsorbate(name)
    gas = eb.benchmark_gas(name)
    assert len(inputs["frequencies"]) == 3 * gas.n_atoms
    ads = Adsorbate(inputs["frequencies"], model="hindered", **inputs["parameters"])
    n_replaced = 2 if gas.n_atoms == 1 else 3
    assert sorted(m["index"] for m in ads.replaced_modes) == list(range(n_replaced))
    # the barrier-implied frequency sqrt(W/(2 m b^2)) (Sprowl et al. 2016), from scipy constants
    site = eb.INVENTED_SITES[name]
    w = site.translation_barrier_eV * sc.e
    nu = np.sqrt(w / (2 * gas.mass_amu * sc.atomic_mass * (site.site_spacing_A * 1e-10) ** 2)) / (100 * sc.c)
    assert inputs["frequencies"][0] == pytest.approx(nu, rel=1e-10)


def _co_by_hand(t):
    """S° of CO on its invented site at θ° = 1/2 from the building blocks, each model (J/(mol K))."""
    site = eb.INVENTED_SITES["CO"]
    mass = float(molecule("CO").get_masses().sum())
    b = site.site_spacing_A
    inertia = sc.h / (8 * np.pi**2 * sc.c * 100 * 1.92253) / (sc.atomic_mass * 1e-20)   # I = h/(8π² c B)
    w_t, w_r, n = site.translation_barrier_eV, site.rotation_barrier_eV, site.rotation_minima
    nu_t = np.sqrt(w_t * sc.e / (2 * mass * sc.atomic_mass * (b * 1e-10) ** 2)) / (100 * sc.c)
    nu_r = n / (2 * np.pi) * np.sqrt(w_r * sc.e / (2 * inertia * sc.atomic_mass * 1e-20)) / (100 * sc.c)
    rest = list(site.other_modes_cm) + [2143.27]
    # mobile models at θ° = 1/2: S° = S(per site) + k (1 - ln θ°) (reference notes §1.7, 2D ideal gas)
    mobile = K_EV * (1 + np.log(2.0))
    s = {
        "harmonic": harmonic(t, [nu_t, nu_t, nu_r] + rest).entropy,
        "2d-gas": translation_2d(t, mass, b * b).entropy + harmonic(t, [nu_r] + rest).entropy + mobile,
        "hindered": (2 * periodic.lattice_translator(t, mass, b, periodic.cosine_terms(w_t)).entropy
                     + periodic.ring_rotor(t, inertia, periodic.cosine_terms(w_r, n), symmetry_number=1).entropy
                     + harmonic(t, rest).entropy + mobile),
        "2d-gas+free-rotor": (translation_2d(t, mass, b * b).entropy + free_rotor(t, inertia, 1).entropy
                              + harmonic(t, rest).entropy + mobile),
    }
    return {m: v * J_MOL_K for m, v in s.items()}


def test_co_entry_recomputed_from_building_blocks(correlation_rows):
    rows = [r for r in correlation_rows if r.molecule == "CO"]
    t = np.array([r.temperature for r in rows])
    by_hand = _co_by_hand(t)
    for i, r in enumerate(rows):
        for model in eb.CORRELATION_MODELS:
            assert r.entropies[model] == pytest.approx(float(by_hand[model][i]), abs=1e-6)


def test_localized_harmonic_model_falls_below_the_correlation(correlation_rows):
    # Campbell and Sellers 2012 [abstract]: measured adsorbate entropies are much larger than most
    # theoretical (localized) predictions. On these sites at 150 K every harmonic S° lies below the line,
    # and the mobile models lie closer to it on average.
    cold = [r for r in correlation_rows if r.temperature == 150.0]
    assert all(r.deviations["harmonic"] < 0 for r in cold)
    mean = {m: np.mean([abs(r.deviations[m]) for r in cold]) for m in eb.CORRELATION_MODELS}
    assert mean["2d-gas"] < mean["harmonic"] and mean["2d-gas+free-rotor"] < mean["harmonic"]


def test_standard_state_moves_mobile_entropies_by_the_configurational_term():
    # mobile models: S° = S + k(1 - ln θ°) (reference notes §1.7), so two states differ by k ln(θ°1/θ°2)
    from adsorb.standard_states import standard_coverage

    rows = eb.standard_state_sensitivity(300.0, molecules=["CO"])
    area = eb.INVENTED_SITES["CO"].site_spacing_A ** 2
    theta = float(standard_coverage("campbell-2d", 300.0, area))
    assert rows[0]["campbell-2d"] - rows[0]["lattice-half"] == pytest.approx(R * np.log(0.5 / theta), abs=1e-6)


# ---------------------------------------------------------------------------
# (b) geometry
# ---------------------------------------------------------------------------
@pytest.mark.parametrize("n, g2", [(3, "C3H8"), (4, "trans-butane")])
def test_zigzag_builder_matches_the_g2_geometry(n, g2):
    built, ref = eb.zigzag_alkane(n), molecule(g2)
    assert built.get_chemical_formula() == ref.get_chemical_formula()
    np.testing.assert_allclose(principal_moments(built)[0], principal_moments(ref)[0], rtol=0.01)
    d = built.get_all_distances()
    assert np.allclose(np.sort(d[:n, n:].min(axis=0)), 1.09)      # every H bonded at the C-H length asked for
    assert np.allclose(d[np.arange(n - 1), np.arange(1, n)], 1.53)  # consecutive carbons at the C-C length


def _maps_onto_itself(atoms, axis, angle, tol=0.05):
    pos = atoms.positions - atoms.get_center_of_mass()
    axis = np.asarray(axis, float) / np.linalg.norm(axis)
    k = np.array([[0, -axis[2], axis[1]], [axis[2], 0, -axis[0]], [-axis[1], axis[0], 0]])
    rot = np.eye(3) + np.sin(angle) * k + (1 - np.cos(angle)) * k @ k          # Rodrigues (common practice)
    new = pos @ rot.T
    sym = np.array(atoms.get_chemical_symbols())
    for s in set(sym):
        a, b = pos[sym == s], new[sym == s]
        if np.max(np.min(np.linalg.norm(a[:, None] - b[None], axis=-1), axis=1)) > tol:
            return False
    return True


@pytest.mark.parametrize("n", [3, 4, 6, 8, 10])
def test_normal_symmetry_number_of_the_flat_chains(n):
    site = eb.alkane_site(n)
    atoms, _ = eb.alkane_atoms(n)
    moments, axes = principal_moments(atoms)
    normal = axes[2]
    assert site.inertia_normal_amu_A2 == pytest.approx(moments[2])
    # σ_normal counts the turns about the normal that map the molecule onto itself
    assert _maps_onto_itself(atoms, normal, np.pi) == (site.normal_symmetry_number == 2)


def test_small_molecules_have_a_twofold_axis_as_assumed():
    # CH4 (G2): C2 along z; C2H6 (G2, C-C along z): some axis in the xy plane is a C2 axis
    assert eb.alkane_site(1).normal_symmetry_number == 2 and eb.alkane_site(2).normal_symmetry_number == 2
    assert _maps_onto_itself(molecule("CH4"), [0, 0, 1], np.pi)
    ethane = molecule("C2H6")
    assert any(_maps_onto_itself(ethane, [np.cos(a), np.sin(a), 0], np.pi) for a in np.radians(np.arange(0, 180, 1)))


# ---------------------------------------------------------------------------
# (b) prefactors against Tait et al. 2005
# ---------------------------------------------------------------------------
def test_published_peak_temperatures():
    # reference notes, check values B: Tp from the published ν and E_d at 0.6 K/s (exact peak condition)
    assert eb.published_peak_temperature(1) == pytest.approx(52.44, abs=0.01)
    assert eb.published_peak_temperature(4) == pytest.approx(111.22, abs=0.01)
    assert eb.published_peak_temperature(10) == pytest.approx(202.75, abs=0.01)
    assert eb.published_peak_temperature(6) is None


RISING = ("harmonic", "hindered", "2d-gas", "2d-gas+free-rotor")


@pytest.mark.parametrize("model", RISING)
def test_model_prefactor_rises_with_chain_length(alkane_rows, model):
    # Tait et al. 2005: the prefactor rises with chain length (TS rotational entropy grows with N)
    log_a = [r.models[model]["log10_arrhenius"] for r in alkane_rows]
    assert np.all(np.diff(log_a) > 0)


@pytest.mark.parametrize("model", RISING)
def test_methane_prefactor_within_one_and_a_half_orders_of_the_published(alkane_rows, model):
    # Tait et al. 2005: 10^13.1 s^-1 for CH4; the 2D-gas TS with free rotation gives the right magnitude
    r = alkane_rows[0]
    assert r.site.n == 1 and r.published_log10 == 13.1
    assert abs(r.models[model]["log10_arrhenius"] - 13.1) < 1.5


def test_localized_adsorbate_gives_the_largest_prefactor_for_the_same_ts(alkane_rows):
    # The Arrhenius prefactor is A = ν e^γ = e (kT/h) exp[(S‡ - S_ad)/k] (Eyring form of TST, common
    # practice; S/k = ln q + U/kT), so for the same TS at the same T a lower adsorbate entropy gives a larger A.
    # The localized (harmonic) adsorbate has the lowest entropy of the models at the harmonic Tp, where the
    # diffusion barrier is several kT (W/kT > 1: the harmonic translator is not yet above the 2D gas).
    for r in alkane_rows:
        t = r.models["harmonic"]["peak_temperature_K"]
        assert r.site.translation_barrier_eV / (K_EV * t) > 1.0
        s_ts = float(eb.transition_state(r.site, t).entropy)
        log_a, s_ad = {}, {}
        for m in eb.ALKANE_MODELS:
            nu, gamma = eb.desorption_prefactor(r.site, m, t)
            log_a[m] = float(np.log(nu) + gamma)
            s_ad[m] = float(eb.adsorbate_contribution(r.site, m, t).entropy)
            assert log_a[m] == pytest.approx(1 + np.log(sc.k * t / sc.h) + (s_ts - s_ad[m]) / K_EV, abs=1e-9)
        for m in ("hindered", "2d-gas", "2d-gas+free-rotor", "2d-gas+free-3d-rotor"):
            assert s_ad["harmonic"] < s_ad[m] and log_a["harmonic"] > log_a[m]


def test_gas_like_adsorbate_desorbs_at_the_surface_stretch_frequency():
    # reference notes §5.2: a 2D-gas adsorbate that keeps the TS's motions desorbs with (kT/h)/q_z,
    # q_z = 1/(1 - exp(-hcν/kT)) from the zero-point level; classical limit c ν_z
    site = eb.alkane_site(4)
    nu_z = eb.ALKANE_SURFACE["surface_stretch_cm"]
    t = np.array([50.0, 300.0, 5000.0])
    nu, _ = eb.desorption_prefactor(site, "2d-gas+free-3d-rotor", t)
    x = sc.h * sc.c * 100 * nu_z / (sc.k * t)
    np.testing.assert_allclose(nu, sc.k * t / sc.h * -np.expm1(-x), rtol=1e-10)
    # kT/h (1 - e^-x) = c ν (1 - x/2 + ...): 1.4 % below c ν at 5000 K, approached from below
    assert 0.98 < nu[-1] / (sc.c * 100 * nu_z) < 1.0


@pytest.mark.parametrize("model", eb.ALKANE_MODELS)
def test_gamma_is_the_log_derivative_of_the_prefactor(model):
    # d ln q/d ln T = U/kT (statistical-mechanics identity) -> γ = d ln ν / d ln T, by central differences
    site = eb.alkane_site(4)
    t, h = 110.0, 1e-4
    nu_p, _ = eb.desorption_prefactor(site, model, t * (1 + h))
    nu_m, _ = eb.desorption_prefactor(site, model, t * (1 - h))
    _, gamma = eb.desorption_prefactor(site, model, t)
    assert float(gamma) == pytest.approx(float(np.log(nu_p / nu_m) / (np.log1p(h) - np.log1p(-h))), abs=1e-5)


def test_arrhenius_peak_is_the_exact_peak_of_the_tst_rate(alkane_rows):
    # Redhead's peak condition for k(T) = ν(T) exp(-E0/kT), E0 = E_d - γ k Tp, solved by adsorb.tpd directly
    # with the T-dependent ν, and a simulated Polanyi-Wigner spectrum, both peak at the same Tp
    r = alkane_rows[-1]
    res = r.models["harmonic"]

    def nu(t):
        return eb.desorption_prefactor(r.site, "harmonic", t)[0]

    tp = tpd.peak_temperature_first_order(res["e0_eV"], nu, 0.6)
    assert tp == pytest.approx(res["peak_temperature_K"], abs=1e-4)
    run = tpd.simulate_tpd(0.5, 0.6, prefactor=nu, energy_eV=res["e0_eV"], temperature_start_K=0.8 * tp,
                           temperature_end_K=1.1 * tp, n_points=401)
    assert run.peak_temperature_K == pytest.approx(tp, abs=1e-3)
    # a constant-ν analysis of that peak with the published E_d returns A = ν(Tp) e^γ
    a = tpd.apparent_prefactor(run.peak_temperature_K, r.site.desorption_energy_eV, 0.6)
    assert np.log10(a) == pytest.approx(res["log10_arrhenius"], abs=1e-4)


@pytest.mark.parametrize("n, models", [(2, ("harmonic", "hindered", "2d-gas", "2d-gas+free-rotor")),
                                       (10, ("harmonic", "hindered", "2d-gas+free-rotor"))])
def test_prefactor_agrees_with_adsorbate_and_the_tpd_thermo_route(n, models):
    # independent route: Adsorbate tables and adsorb.tpd.prefactor_from_thermo with a ZPE-inclusive
    # barrier (G = E + ZPE - kT ln q). The Adsorbate replaces its lowest modes, so its 2d-gas model
    # is only comparable while the rotation about the normal is stiffer than the translations (n <= 3).
    site = eb.alkane_site(n)
    t = np.array([0.5, 1.0, 1.5]) * eb.arrhenius_peak(site, "harmonic")["peak_temperature_K"]
    kw = dict(mass=site.mass_amu, site_spacing=site.site_spacing_A)
    hindered = dict(rotation_minima=4, symmetry_number=site.normal_symmetry_number,
                    inertia=site.inertia_normal_amu_A2, solver="exact")
    build = {
        "harmonic": lambda: Adsorbate(site.frequencies_cm, model="harmonic", **kw),
        "2d-gas": lambda: Adsorbate(site.frequencies_cm, model="2d-gas", **kw),
        "hindered": lambda: Adsorbate(site.frequencies_cm, model="hindered", translation_barrier=site.translation_barrier_eV,
                                      rotation_barrier=site.rotation_barrier_eV, **hindered, **kw),
        "2d-gas+free-rotor": lambda: Adsorbate(site.frequencies_cm, model="hindered", translation_barrier=0.0,
                                               rotation_barrier=0.0, **hindered, **kw),
    }

    def ts_table(temperature):
        temperature = np.asarray(temperature, dtype=float)
        return assemble(temperature, translation_2d(temperature, site.mass_amu, site.site_spacing_A**2)
                        + nonlinear_rotor(temperature, site.rotational_constants_cm, site.external_symmetry_number),
                        gas=False)

    for model in models:
        ads = build[model]()
        nu = tpd.prefactor_from_thermo(ts_table, ads, barrier_eV=0.0 - float(ads.thermo(100.0).zpe))
        np.testing.assert_allclose(eb.desorption_prefactor(site, model, t)[0], nu(t), rtol=1e-7)


def test_stiffer_invented_modes_raise_the_prefactor_and_the_spacing_cancels():
    # lower S_ad -> larger A (Eyring form): doubling a barrier or an invented frequency raises log10 A,
    # halving it lowers it. The site spacing enters the TS area b^2 and the adsorbate's in-plane phase space
    # alike (harmonic: ν_trans ∝ 1/b; 2D gas: the same b^2), so it nearly cancels.
    rows = eb.alkane_sensitivity((1, 10), models=("harmonic", "hindered"), factors=(0.5, 2.0))
    for r in rows:
        for key in ("1:harmonic", "1:hindered", "10:harmonic", "10:hindered"):
            if r["parameter"] == "site_spacing_A":
                assert abs(r[key]) < 0.05
            else:
                assert (r[key] > 0) == (r["factor"] > 1)


def test_conformer_estimate_limits():
    # independent trans/gauche bonds (Flory's rotational isomeric states): q = (1 + 2 e^(-Eg/RT))^(n-3)
    t = np.array([100.0, 300.0])
    assert np.all(eb.conformer_ln_q(3, gauche_energy_kJ_mol=2.5)(t)[0] == 0.0)
    ln_q, _ = eb.conformer_ln_q(10, gauche_energy_kJ_mol=1e-9)(t)
    np.testing.assert_allclose(ln_q, 7 * np.log(3.0), rtol=1e-9)                 # E_g -> 0: 3^(n-3)
    ln_q, _ = eb.conformer_ln_q(10, gauche_energy_kJ_mol=500.0)(t)
    assert np.all(ln_q < 1e-80)                                                  # E_g >> RT: all trans
    f = eb.conformer_ln_q(8, gauche_energy_kJ_mol=3.0)
    h = 1e-5
    num = (f(200.0 * (1 + h))[0] - f(200.0 * (1 - h))[0]) / (np.log1p(h) - np.log1p(-h))
    assert float(f(200.0)[1]) == pytest.approx(float(num), rel=1e-6)           # d ln q / d ln T
    assert float(f(200.0)[0]) == pytest.approx(5 * np.log(1 + 2 * np.exp(-3000.0 / (R * 200.0))), rel=1e-12)


# ---------------------------------------------------------------------------
# bad input, figures, docs
# ---------------------------------------------------------------------------
@pytest.mark.parametrize("call, match", [
    (lambda: eb.benchmark_gas("Xe"), "'Xe' is unknown"),
    (lambda: eb.alkane_site(0), "chain length n"),
    (lambda: eb.alkane_site(2.5), "chain length n"),
    (lambda: eb.zigzag_alkane(2), "expected >= 3"),
    (lambda: eb.zigzag_alkane(5, cc_A=-1.0), "cc_A"),
    (lambda: eb.desorption_prefactor(eb.alkane_site(1), "lattice", 100.0), "'lattice'"),
    (lambda: eb.desorption_prefactor(eb.alkane_site(1), "harmonic", -5.0), "temperature"),
    (lambda: eb.correlation_benchmark([-5.0]), "temperatures"),
    (lambda: eb.correlation_benchmark(standard_state="nowhere"), "nowhere"),
    (lambda: eb.standard_state_sensitivity(model="2d-gas+free-rotor"), "model"),
    (lambda: eb.conformer_ln_q(6, gauche_energy_kJ_mol=0.0), "gauche_energy_kJ_mol"),
    (lambda: eb.alkane_benchmark(models=("harmonic", "free")), "'free'"),
    (lambda: eb.plot_alkane_prefactors([], "x"), "rows"),
    (lambda: eb.alkane_site(4, surface={"tilts": (1.0, 2.0)}), "'tilts' is unknown"),
    (lambda: eb.alkane_site(4, surface={"tilt_modes_cm": 80.0}), "tilt_modes_cm"),
    (lambda: eb.alkane_site(4, surface={"rotation_minima": 4.5}), "rotation_minima"),
    (lambda: eb.alkane_site(4, surface={"surface_stretch_cm": -1.0}), "surface_stretch_cm"),
])
def test_bad_input(call, match):
    with pytest.raises(InputError, match=match):
        call()


def test_figures_are_written(tmp_path, correlation_rows, alkane_rows):
    fig = eb.plot_correlation_benchmark(correlation_rows, tmp_path / "corr")
    assert (tmp_path / "corr.png").stat().st_size > 0 and (tmp_path / "corr.svg").stat().st_size > 0
    gids = {line.get_gid() for line in fig.axes[0].lines}
    assert {f"model:{m}:150" for m in eb.CORRELATION_MODELS} <= gids
    fig = eb.plot_alkane_prefactors(alkane_rows, tmp_path / "alk.png")
    assert (tmp_path / "alk.png").exists() and (tmp_path / "alk.svg").exists()
    assert {f"model:{m}" for m in eb.ALKANE_MODELS} <= {line.get_gid() for line in fig.axes[0].lines}


def test_tables_in_the_docs_are_the_computed_ones(correlation_rows, alkane_rows):
    # docs/entropy-benchmarks.md pastes the tables of docs/make_entropy_figures.py; they must be current
    text = DOC.read_text(encoding="utf-8")
    tables = [eb.markdown_site_table(), eb.markdown_correlation_table(correlation_rows),
              eb.markdown_standard_state_table(eb.standard_state_sensitivity()),
              eb.markdown_alkane_site_table(alkane_rows), eb.markdown_alkane_table(alkane_rows),
              eb.markdown_peak_table(alkane_rows), eb.markdown_sensitivity_table(eb.alkane_sensitivity())]
    for table in tables:
        assert table in text, f"stale table in {DOC.name}: {table.splitlines()[0]}"
    assert re.search(r"docs/figures/|figures/entropy_vs_campbell_sellers\.png", text)
