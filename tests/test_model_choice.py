"""Model comparison, the rule of thumb and the Campbell-Sellers correlation (adsorb.model_choice).

Adsorbate inputs below are invented numbers (labelled so); constants come from
scipy.constants (CODATA) where a check must not reuse the package's own.
"""

from __future__ import annotations

import json

import numpy as np
import pytest
import scipy.constants as sc

from adsorb import constants as C
from adsorb.errors import InputError
from adsorb.model_choice import (
    campbell_sellers_entropy,
    compare_models,
    plot_model_entropies,
    recommend_model,
)
from adsorb.partition.hindered import translator_frequency_cm
from adsorb.partition.rotation import nonlinear_rotor
from adsorb.partition.translation import translation_3d
from adsorb.partition.vibration import harmonic
from adsorb.thermo import assemble

R = sc.R                       # J/(mol K), CODATA via scipy
K_EV = sc.k / sc.e             # eV/K, CODATA via scipy

# invented soft polyatomic adsorbate (9 modes: a triatomic-like species)
SOFT = dict(frequencies=[1000.0, 400.0, 300.0, 90.0, 70.0, 60.0, 50.0, 45.0, 40.0], mass=32.0,
            site_spacing=2.77, translation_barrier=0.1, rotation_barrier=0.05, rotation_minima=3, inertia=5.0)


def atom_inputs(barrier_eV, mass=16.0, spacing=2.77):
    """Invented adsorbed atom whose in-plane frequencies are those the barrier implies.

    The mode normal to the surface is put well above them so that the models
    replace the two in-plane modes (they pick the lowest frequencies).
    """
    nu = float(translator_frequency_cm(mass, barrier_eV, spacing)) if barrier_eV > 0 else 30.0
    return dict(frequencies=[max(400.0, 3 * nu), nu, nu], mass=mass, site_spacing=spacing,
                translation_barrier=barrier_eV)


# --------------------------------------------------------------------------- correlation


def test_campbell_sellers_methanol_check_value():
    # methanol S°gas = 239.81 J/(mol K) (Savara, J. Phys. Chem. C 2016, 120, 20478, comment);
    # 0.70 x 239.81 - 3.3 R = 140.43 J/(mol K) (check value of the project's reference notes)
    s_gas = C.from_j_per_mol_k(239.81)
    s_ad = C.to_j_per_mol_k(campbell_sellers_entropy(s_gas))
    assert float(s_ad) == pytest.approx(140.43, abs=0.005)
    # the same with scipy's R (Campbell and Sellers, J. Am. Chem. Soc. 2012, 134, 18109)
    assert float(s_ad) == pytest.approx(0.70 * 239.81 - 3.3 * R, rel=1e-12)


def test_campbell_sellers_rejects_bad_entropy():
    with pytest.raises(InputError, match="gas_entropy"):
        campbell_sellers_entropy([-1.0])
    with pytest.raises(InputError, match="gas_entropy"):
        campbell_sellers_entropy(np.nan)


def test_flagging_beyond_two_standard_deviations():
    t = np.array([300.0, 500.0])
    base = compare_models(temperature=t, **SOFT)
    harm = base["harmonic"].entropy
    # choose S°gas so that the correlation sits 3.99R (inside) and 4.01R (outside) above the harmonic S°
    for offset_r, expect in ((3.99, False), (4.01, True), (-4.01, True), (0.0, False)):
        target = harm + offset_r * K_EV                       # S°_CS wanted, eV/K
        s_gas = (target + 3.3 * K_EV) / 0.70                  # invert 0.70 S - 3.3 R
        c = compare_models(temperature=t, gas_entropy=s_gas, **SOFT)
        assert np.all(c["harmonic"].flagged == expect), offset_r
        np.testing.assert_allclose(c["harmonic"].deviation, -offset_r / 2.0, rtol=1e-9, atol=1e-9)
        # every model: flagged exactly when |S° - S°_CS| > 4R
        for r in c.results:
            np.testing.assert_array_equal(r.flagged, np.abs(r.entropy - c.correlation_entropy) > 4 * K_EV)
    c = compare_models(temperature=t, gas_entropy=(harm + 20 * K_EV + 3.3 * K_EV) / 0.70, **SOFT)
    assert "Outside 2 standard deviations" in c.recommendation and "harmonic" in c.recommendation


def test_gas_table_route_and_checks():
    # an invented bent triatomic gas built from the partition building blocks at 1 bar
    t = np.array([300.0, 600.0])
    motion = (translation_3d(t, 32.0, 1e5) + nonlinear_rotor(t, (8.0, 1.2, 1.0), 1)
              + harmonic(t, np.array([1500.0, 1000.0, 600.0])))
    gas = assemble(t, motion, pressure=1e5, gas=True, name="invented gas")
    c = compare_models(temperature=t, gas=gas, **SOFT)
    np.testing.assert_allclose(c.correlation_entropy, 0.70 * gas.entropy - 3.3 * K_EV, rtol=1e-12)
    wrong_p = assemble(t, translation_3d(t, 32.0, 2e5), pressure=2e5, gas=True, name="at 2 bar")
    with pytest.raises(InputError, match="p° = 100000 Pa"):
        compare_models(temperature=t, gas=wrong_p, **SOFT)
    with pytest.raises(InputError, match="one S° per temperature"):
        compare_models(temperature=t, gas_entropy=C.from_j_per_mol_k(200.0), **SOFT)
    with pytest.raises(InputError, match="not both"):
        compare_models(temperature=t, gas=gas, gas_entropy=gas.entropy, **SOFT)


# --------------------------------------------------------------------------- rule of thumb


def test_rule_boundaries():
    ratios = np.array([0.0, 0.999, 1.0, 5.0, 9.999, 10.0, 50.0])
    np.testing.assert_array_equal(recommend_model(ratios),
                                  ["2d-gas", "2d-gas", "hindered", "hindered", "hindered", "harmonic", "harmonic"])
    # a soft rotation (W_rot/kT < 10) asks for the hindered model at every translation ratio
    np.testing.assert_array_equal(recommend_model(ratios, 9.999), ["hindered"] * ratios.size)
    np.testing.assert_array_equal(recommend_model(ratios, 10.0), recommend_model(ratios))
    # thresholds can be changed, and bad ones are refused
    np.testing.assert_array_equal(recommend_model([2.0, 3.0], free_below=3.0, localized_from=4.0),
                                  ["2d-gas", "hindered"])
    with pytest.raises(InputError, match="thresholds"):
        recommend_model(1.0, free_below=5.0, localized_from=2.0)
    with pytest.raises(InputError, match="translation_ratio"):
        recommend_model(-1.0)


def test_recommendation_follows_temperature():
    # invented atom with W = 0.2 eV: W/kT = 10 at T = W/(10 k), = 1 at T = W/k
    w = 0.2
    t_10, t_1 = w / (10 * K_EV), w / K_EV
    t = np.array([0.9 * t_10, 1.1 * t_10, 0.9 * t_1, 1.1 * t_1])
    c = compare_models(temperature=t, **atom_inputs(w))
    np.testing.assert_allclose(c.translation_ratio, w / (K_EV * t), rtol=1e-9)
    np.testing.assert_array_equal(c.recommended, ["harmonic", "hindered", "hindered", "2d-gas"])
    assert c.rotation_ratio is None
    assert "harmonic for" in c.recommendation and "2d-gas for" in c.recommendation
    assert "rule of thumb" in c.rule and "Sprowl" in c.rule


def test_applicability_and_skipped_models():
    t = np.array([300.0])
    c = compare_models(SOFT["frequencies"], t)
    assert c.models == ("harmonic", "lattice-gas")
    skipped = dict(c.skipped)
    assert "site_spacing or site_area" in skipped["2d-gas"] and "translation_barrier" in skipped["hindered"]
    assert c.recommended is None and "cannot be applied" in c.recommendation
    # 2d-gas only: mass and spacing, no barriers
    c = compare_models(SOFT["frequencies"], t, mass=32.0, site_area=7.7)
    assert c.models == ("harmonic", "lattice-gas", "2d-gas")
    # a polyatomic with a diffusion barrier but no rotational data: hindered skipped, and said so
    c = compare_models(SOFT["frequencies"], t, mass=32.0, site_spacing=2.77, translation_barrier=0.1)
    assert "rotation_barrier" in dict(c.skipped)["hindered"]
    assert c.recommended[0] == "hindered" and "not evaluated here: hindered" in c.recommendation
    with pytest.raises(InputError, match="site_spcing"):
        compare_models(SOFT["frequencies"], t, site_spcing=2.77)


# --------------------------------------------------------------------------- physics


def test_entropy_ordering_for_a_soft_adsorbate_at_high_temperature():
    # physical limit: in the classical regime (kT several times h nu) with the particle still mostly
    # in its well (W/kT > 1), S(harmonic) <= S(hindered) <= S(2D gas): the cosine well is softer than
    # its harmonic expansion, and a flat site confines least (Sprowl, Campbell, Árnadóttir 2016)
    w = 0.1
    inputs = atom_inputs(w)
    t = np.array([400.0, 600.0, 900.0])
    assert np.all(w / (K_EV * t) > 1) and np.all(K_EV * t / (inputs["frequencies"][1] * C.invcm_eV) > 4)
    c = compare_models(temperature=t, **inputs)
    for attr in ("site_entropy", "entropy"):
        h, ht, g2 = (getattr(c[m], attr) for m in ("harmonic", "hindered", "2d-gas"))
        assert np.all(h < ht) and np.all(ht < g2), attr
    np.testing.assert_array_equal(c["lattice-gas"].entropy, c["harmonic"].entropy)


def test_harmonic_overshoots_when_kt_exceeds_the_barrier():
    # limit: for kT >> W the harmonic oscillator (unbounded phase space, S ~ k ln T per mode) passes
    # the free translator over one site (S ~ k/2 ln T per direction); the hindered translator
    # stays below the 2D gas at every temperature
    t = np.array([300.0, 1000.0, 3000.0])
    c = compare_models(temperature=t, **atom_inputs(0.005))
    assert np.all(c["harmonic"].site_entropy > c["2d-gas"].site_entropy)
    assert np.all(c["hindered"].site_entropy < c["2d-gas"].site_entropy)
    np.testing.assert_array_equal(c.recommended, ["2d-gas"] * 3)


def test_zero_barrier_is_the_2d_gas_and_large_barrier_the_harmonic_limit():
    t = np.array([300.0, 800.0])
    free = compare_models(temperature=t, **atom_inputs(0.0))
    np.testing.assert_allclose(free["hindered"].site_entropy, free["2d-gas"].site_entropy, rtol=1e-10)
    np.testing.assert_allclose(free["hindered"].gibbs, free["2d-gas"].gibbs, rtol=0, atol=1e-10)
    # W/kT >= 60: hindered translator -> harmonic oscillator at the implied frequency (within 0.02 k)
    deep = compare_models(temperature=t, **atom_inputs(4.0))
    diff = (deep["hindered"].site_entropy - deep["harmonic"].site_entropy) / K_EV
    assert np.all(np.abs(diff) < 0.02)


def test_standard_state_identities():
    t = np.array([400.0])
    dt = 1e-3
    c = compare_models(temperature=t, **SOFT)
    lo = compare_models(temperature=t - dt, **SOFT)
    hi = compare_models(temperature=t + dt, **SOFT)
    for r in c.results:
        # G° = H° - T S°
        np.testing.assert_allclose(r.gibbs, r.enthalpy - t * r.entropy, rtol=0, atol=1e-12)
        # -dG°/dT at fixed theta°: S° for localized models; S° - k for mobile ones, whose S° is the
        # absolute entropy of the 2D gas with the spreading-pressure term kT in H° (adsorb.standard_states)
        slope = -(hi[r.model].gibbs - lo[r.model].gibbs) / (2 * dt)
        expected = r.entropy - (K_EV if r.mobile else 0.0)
        np.testing.assert_allclose(slope, expected, rtol=1e-6)
    # named state: the localized S° at theta° = 1/2 equals the per-site S (ln[theta/(1-theta)] = 0)
    np.testing.assert_allclose(c["harmonic"].entropy, c["harmonic"].site_entropy, rtol=1e-14)
    # mobile at theta° = 1/2: S° = S + k(1 + ln 2) (Campbell, Sprowl, Árnadóttir 2016 form)
    np.testing.assert_allclose(c["2d-gas"].entropy, c["2d-gas"].site_entropy + K_EV * (1 + np.log(2)), rtol=1e-12)
    assert "theta° = 1/2" in c.standard_state_description


# --------------------------------------------------------------------------- plot and command line


def test_plot_files(tmp_path):
    t = np.linspace(300.0, 800.0, 6)
    s_gas = C.from_j_per_mol_k(239.81 + 0.08 * (t - 298.15))   # invented smooth S°gas(T)
    c = compare_models(temperature=t, gas_entropy=s_gas, **SOFT)
    fig = plot_model_entropies(c, tmp_path / "plots" / "entropies")
    for suffix in (".png", ".svg"):
        f = tmp_path / "plots" / f"entropies{suffix}"
        assert f.exists() and f.stat().st_size > 1000
    gids = {ln.get_gid() for ln in fig.axes[0].get_lines()}
    assert gids == {"correlation", "model:harmonic", "model:lattice-gas", "model:hindered", "model:2d-gas"}
    assert len(fig.axes[0].collections) == 2        # the ±2R and ±4R bands


SOFT_ARGS = ["--frequencies", "1000", "400", "300", "90", "70", "60", "50", "45", "40", "--mass", "32",
             "--site-spacing", "2.77", "--translation-barrier", "0.1", "--rotation-barrier", "0.05",
             "--rotation-minima", "3", "--inertia", "5"]


def test_command_table_and_json(capsys, tmp_path):
    from adsorb.cli import main

    code = main(["compare-models", *SOFT_ARGS, "--temperatures", "300", "500",
                 "--gas-entropy", "239.81", "255.0", "--plot", str(tmp_path)])
    out = capsys.readouterr().out
    assert code == 0
    assert "recommendation: hindered for 300-500 K" in out
    assert "standard state: lattice-half" in out and "140.43" in out
    assert (tmp_path / "model-entropies.png").stat().st_size > 0
    code = main(["compare-models", *SOFT_ARGS, "--temperatures", "300", "--json"])
    data = json.loads(capsys.readouterr().out)
    assert code == 0
    assert set(data["models"]) == {"harmonic", "lattice-gas", "hindered", "2d-gas"}
    assert data["recommended"] == ["hindered"]
    assert data["translation_barrier_over_kT"][0] == pytest.approx(0.1 / (K_EV * 300.0), rel=1e-9)


def test_command_toml_input_and_errors(capsys, tmp_path):
    from adsorb.cli import main

    (tmp_path / "ads.txt").write_text("1000 400 300\n90 70 60\n50 45 40\n")
    case = tmp_path / "soft.toml"
    case.write_text(
        'name = "invented soft adsorbate"\n'
        "[temperature]\nstart_K = 300\nstop_K = 500\nstep_K = 100\n"
        '[adsorbate]\nfrequencies_file = "ads.txt"\nmass_amu = 32\nsite_spacing_A = 2.77\n'
        "translation_barrier_eV = 0.1\nrotation_barrier_eV = 0.05\nrotation_minima = 3\ninertia_amu_A2 = 5\n"
        "[gas]\nentropy_J_mol_K = [239.81, 247.0, 254.0]\n", encoding="utf-8")
    code = main(["compare-models", str(case), "--json"])
    data = json.loads(capsys.readouterr().out)
    assert code == 0 and data["name"] == "invented soft adsorbate"
    assert data["temperature_K"] == [300.0, 400.0, 500.0]
    assert data["correlation"]["entropy_J_mol_K"][0] == pytest.approx(140.43, abs=0.005)
    bad = tmp_path / "bad.toml"
    bad.write_text('[adsorbate]\nfrequencies_cm = [100, 200, 300]\nmass_amo = 16\n', encoding="utf-8")
    code = main(["compare-models", str(bad)])
    err = capsys.readouterr().err
    assert code == 2
    assert "adsorbate.mass_amo: unknown key (did you mean 'mass_amu'?)" in err and len(err.strip().splitlines()) == 1
    code = main(["compare-models", "--temperatures", "300"])
    assert code == 2 and "frequencies are missing" in capsys.readouterr().err


def test_command_with_a_gas_structure(capsys, tmp_path):
    # the gas route: a CO molecule from a structure file and its frequency, through adsorb.gas
    import ase
    import ase.io

    from adsorb.cli import main

    # CO bond length 1.12832 Å, Huber & Herzberg 1979 (from memory)
    ase.io.write(tmp_path / "co.xyz", ase.Atoms("CO", positions=[[0, 0, 0], [0, 0, 1.12832]]))
    case = tmp_path / "co.toml"
    case.write_text(
        'name = "CO on an invented surface"\n'
        "[temperature]\nvalues_K = [298.15, 500.0]\n"
        # invented adsorbate frequencies
        "[adsorbate]\nfrequencies_cm = [2050, 400, 350, 300, 60, 55]\nmass_amu = 28.01\nsite_spacing_A = 2.77\n"
        # CO fundamental 2143.27 cm^-1 (ΔG1/2), Huber & Herzberg 1979 (from memory)
        '[gas]\nstructure = "co.xyz"\nfrequencies_cm = [2143.27]\n', encoding="utf-8")
    code = main(["compare-models", str(case), "--json"])
    data = json.loads(capsys.readouterr().out)
    assert code == 0
    # S°(CO, 1 bar): 197.653 and 212.831 J/(mol K), NIST-JANAF 4th ed. (Chase 1998), table C-093;
    # rigid rotor + harmonic oscillator reproduces them to 0.1 J/(mol K)
    np.testing.assert_allclose(data["gas_standard_entropy_J_mol_K"], [197.653, 212.831], atol=0.1)
    np.testing.assert_allclose(data["correlation"]["entropy_J_mol_K"],
                               0.70 * np.array(data["gas_standard_entropy_J_mol_K"]) - 3.3 * R, rtol=1e-12)
    assert set(data["models"]) == {"harmonic", "lattice-gas", "2d-gas"}
    assert "translation_barrier" in data["skipped"]["hindered"]
