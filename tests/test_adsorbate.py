"""The Adsorbate object: model assembly, limits between models, identities, standard states.

Sources are named beside each check. The building blocks themselves are
validated in test_hindered.py, test_periodic.py and test_partition_gas.py;
here we check that the species assembles them correctly.
"""

import warnings

import numpy as np
import pytest
from hypothesis import given
from hypothesis import strategies as st

from adsorb import constants as C
from adsorb.adsorbate import Adsorbate
from adsorb.errors import InputError, ModelWarning
from adsorb.partition.translation import translation_2d
from adsorb.standard_states import savara_concentration_mol_m2, standard_coverage, standard_thermo

# invented test species keep soft modes at high T on purpose; the domain warning of the
# harmonic model is checked in test_harmonic_domain_warnings
pytestmark = pytest.mark.filterwarnings("ignore:.*softest harmonic mode:adsorb.errors.ModelWarning")

# invented example: a CO-like adsorbate on an invented metal site
FREQS = [45.0, 52.0, 70.0, 310.0, 330.0, 2010.0]
CO_MASS = 28.0101  # amu, IUPAC atomic weights C 12.011 + O 15.999 (from memory)
HINDERED = dict(mass=CO_MASS, site_spacing=2.77, translation_barrier=0.08,
                rotation_barrier=0.04, rotation_minima=3, inertia=8.7)


def _models():
    return [
        ("harmonic", {}),
        ("lattice-gas", {}),
        ("2d-gas", dict(mass=CO_MASS, site_area=2.77**2)),
        ("hindered", HINDERED),
    ]


@pytest.mark.parametrize(("model", "params"), _models())
def test_identities_g_h_s(model, params):
    # S = -dG/dT and Cp = dH/dT (thermodynamic identities, central differences; G = H - TS holds by construction)
    ads = Adsorbate(FREQS, -51.3, model, **params)
    t = np.linspace(150.0, 1200.0, 8)
    th = ads.thermo(t)
    h = 1e-3 * t
    up, dn = ads.thermo(t + h), ads.thermo(t - h)
    np.testing.assert_allclose(-(up.gibbs - dn.gibbs) / (2 * h), th.entropy, rtol=1e-6)
    np.testing.assert_allclose((up.enthalpy - dn.enthalpy) / (2 * h), th.heat_capacity, rtol=1e-6)
    # H(0 K) = E + ZPE: the thermal part vanishes at low T (definition of the energy zero)
    with warnings.catch_warnings():
        # at 1 K the hindered closed form is outside its validated range and says so (ModelWarning)
        warnings.simplefilter("ignore", ModelWarning)
        cold = ads.thermo(np.array([1.0]))
    assert abs(cold.enthalpy[0] - (ads.energy + cold.zpe[0])) < 2e-3


@pytest.mark.parametrize(("model", "params"), _models())
@given(t1=st.floats(20.0, 2500.0), dt=st.floats(1.0, 500.0))
def test_entropy_increases_with_temperature(model, params, t1, dt):
    # second law / positive heat capacity: S(T) strictly increasing (physical limit)
    ads = Adsorbate(FREQS, 0.0, model, **params)
    s = ads.thermo(np.array([t1, t1 + dt])).entropy
    assert s[1] > s[0]


def test_lattice_gas_equals_harmonic_thermo():
    # the ideal lattice gas localizes every mode (Campbell, Sprowl, Árnadóttir 2016): same q as harmonic
    t = np.array([300.0, 700.0])
    a = Adsorbate(FREQS, 0.0, "harmonic").thermo(t)
    b = Adsorbate(FREQS, 0.0, "lattice-gas").thermo(t)
    np.testing.assert_array_equal(a.entropy, b.entropy)
    assert a.choices["mobile"] is False and b.choices["mobile"] is False


def test_vanishing_barriers_give_2d_gas_and_free_rotor():
    # Sprowl et al. 2016: W -> 0 reproduces the 2D ideal gas per site (area b^2) and the 1D free rotor
    from adsorb.partition.rotation import free_rotor

    t = np.array([200.0, 600.0, 1500.0])
    free = dict(HINDERED, translation_barrier=0.0, rotation_barrier=0.0)
    hind = Adsorbate(FREQS, 0.0, "hindered", **free).thermo(t)
    gas2d = Adsorbate(FREQS[:2] + FREQS[3:], 0.0, "2d-gas", mass=CO_MASS, site_area=2.77**2).thermo(t)
    rotor = free_rotor(t, 8.7, 1)
    np.testing.assert_allclose(hind.entropy, gas2d.entropy + rotor.entropy, rtol=1e-10)
    np.testing.assert_allclose(hind.heat_capacity, gas2d.heat_capacity + rotor.heat_capacity, rtol=1e-10)


def test_deep_wells_give_harmonic_at_implied_frequencies():
    # Sprowl et al. 2016: W >> kT reproduces harmonic oscillators at nu = sqrt(W/(2 m b^2)) (translation)
    # and nu = (n/2 pi) sqrt(W/(2 I)) (rotation, n = sigma so that the n/sigma factor is 1)
    deep = dict(HINDERED, translation_barrier=3.0, rotation_barrier=3.0, rotation_minima=1)
    ads = Adsorbate(FREQS, 0.0, "hindered", **deep)
    implied = [m["implied_frequency_cm"] for m in ads.replaced_modes]
    t = np.array([100.0, 300.0])
    harm = Adsorbate(implied + FREQS[3:], 0.0, "harmonic").thermo(t)
    hind = ads.thermo(t)
    # anharmonic (quartic) softening is of order kT/W; at 300 K and W = 3 eV the entropies agree to < 1%
    np.testing.assert_allclose(hind.entropy, harm.entropy, rtol=1e-2)


def test_lowest_modes_replaced_and_reported():
    # design rule (docs/methods-species-equilibria.md): without mode vectors the two lowest modes are the
    # translations and the next the rotation, as in Sprowl et al. 2016's mode bookkeeping
    ads = Adsorbate([300.0, 45.0, 2010.0, 70.0, 52.0, 330.0], 0.0, "hindered", **HINDERED)
    roles = {m["index"]: m["role"] for m in ads.replaced_modes}
    assert roles == {1: "frustrated translation", 4: "frustrated translation", 3: "rotation about the normal"}
    assert all(m["assigned_by"] == "lowest frequencies" for m in ads.replaced_modes)
    np.testing.assert_array_equal(np.sort(ads.harmonic_frequencies), [300.0, 330.0, 2010.0])
    # implied translation frequency from nu = sqrt(W / (2 m b^2)) (Sprowl et al. 2016)
    w, m, b = 0.08 * C.eV, CO_MASS * C.amu, 2.77 * C.angstrom
    nu_cm = np.sqrt(w / (2 * m * b**2)) / (100 * C.c)
    assert ads.replaced_modes[0]["implied_frequency_cm"] == pytest.approx(nu_cm, rel=1e-10)


def test_2d_gas_replaces_two_modes():
    ads = Adsorbate(FREQS, 0.0, "2d-gas", mass=CO_MASS, site_spacing=2.77)
    assert sorted(m["index"] for m in ads.replaced_modes) == [0, 1]
    t = np.array([400.0])
    # the 2D translation is exactly translation_2d over the site area (Campbell et al. 2016, 2D ideal gas)
    expected = translation_2d(t, CO_MASS, 2.77**2).entropy
    rest = Adsorbate(FREQS[2:], 0.0, "harmonic").thermo(t).entropy
    np.testing.assert_allclose(ads.thermo(t).entropy, expected + rest, rtol=1e-12)


def test_single_atom_hindered_has_no_rotor():
    # a single adsorbed atom has no rotation about the normal: only the two translations are replaced
    ads = Adsorbate([150.0, 160.0, 420.0], 0.0, "hindered", mass=15.999, site_spacing=2.7,
                    translation_barrier=0.3)
    assert len(ads.replaced_modes) == 2


def test_missing_parameters_are_all_named():
    with pytest.raises(InputError, match="translation_barrier.*rotation_barrier.*rotation_minima"):
        Adsorbate(FREQS, 0.0, "hindered", mass=CO_MASS, site_spacing=2.77, inertia=8.0)
    with pytest.raises(InputError, match="site_spacing or site_area"):
        Adsorbate(FREQS, 0.0, "2d-gas", mass=CO_MASS)


def test_unknown_names_suggest_closest():
    with pytest.raises(InputError, match="did you mean 'hindered'"):
        Adsorbate(FREQS, 0.0, "hindred")
    with pytest.raises(InputError, match="did you mean 'site_area'"):
        Adsorbate(FREQS, 0.0, "2d-gas", mass=CO_MASS, site_aera=7.0)


def test_imaginary_modes_need_a_policy():
    bad = [-35.0] + FREQS[1:]
    with pytest.raises(InputError, match="imaginary"):
        Adsorbate(bad, 0.0)
    dropped = Adsorbate(bad, 0.0, imaginary_modes="drop")
    assert dropped.frequencies.size == 5
    assert dropped.thermo(300.0).choices["imaginary_mode_policy"]["modes_cm"] == [-35.0]
    inverted = Adsorbate(bad, 0.0, imaginary_modes="invert")
    assert inverted.frequencies[0] == 35.0


def test_low_frequency_choice_recorded():
    th = Adsorbate(FREQS, 0.0, low_frequency="floor", frequency_floor=100.0).thermo(300.0)
    assert th.choices["low_frequency_treatment"] == "floor at 100 cm^-1"
    # a floor at 100 cm^-1 lowers the entropy of modes below it (S_HO decreases with frequency)
    plain = Adsorbate(FREQS, 0.0).thermo(300.0)
    assert th.entropy < plain.entropy


# ---------------------------------------------------------------- standard states

def test_savara_standard_concentration():
    # Savara, J. Phys. Chem. C 2013: sigma° = 1.39e-7 mol m^-2 (published, 3 digits);
    # (p°/k 298.15 K)^(2/3)/N_A = 1.3928e-7 (computed in the reference notes)
    assert savara_concentration_mol_m2() == pytest.approx(1.39e-7, rel=3e-3)
    assert savara_concentration_mol_m2() == pytest.approx(1.3928e-7, rel=1e-4)


@pytest.mark.parametrize(("state", "expected"), [("savara-2d", 103.050), ("campbell-2d", 100.279)])
def test_2d_translational_standard_entropy_of_co(state, expected):
    # reference notes (adsorbate-models.md, computed values): CO at 298.15 K, S°_2D,trans =
    # 103.050 (Savara state) and 100.279 J/mol/K (Campbell state, = 2/3 of S°_3D,trans = 150.418)
    t = np.array([298.15])
    ads = Adsorbate([40.0, 50.0], 0.0, "2d-gas", mass=28.0101, site_area=6.5)
    std = standard_thermo(ads.thermo(t), state)
    assert std.entropy_j_mol_k[0] == pytest.approx(expected, abs=2e-3)


def test_campbell_state_is_two_thirds_of_3d_translation():
    # Campbell, Sprowl, Árnadóttir 2016 define their 2D state so that S°_2D,trans = (2/3) S°_3D,trans
    from adsorb.partition.translation import translation_3d

    t = np.array([200.0, 450.0, 900.0])
    ads = Adsorbate([40.0, 50.0], 0.0, "2d-gas", mass=17.031, site_area=9.1)
    s2 = standard_thermo(ads.thermo(t), "campbell-2d").entropy
    s3 = translation_3d(t, 17.031, C.P_STANDARD).entropy
    np.testing.assert_allclose(s2, 2.0 / 3.0 * s3, rtol=1e-12)


def test_lattice_half_leaves_gibbs_unchanged():
    # Savara 2013: at theta° = 1/2 the configurational term ln[theta/(1-theta)] vanishes
    th = Adsorbate(FREQS, -3.0).thermo(np.array([300.0, 600.0]))
    std = standard_thermo(th, "lattice-half")
    np.testing.assert_allclose(std.gibbs, th.gibbs, rtol=0, atol=1e-15)
    np.testing.assert_allclose(standard_coverage("lattice-half", [300.0]), [0.5])


def test_standard_state_gibbs_equals_h_minus_ts():
    th = Adsorbate(FREQS, 0.0, "hindered", **HINDERED).thermo(np.array([250.0, 800.0]))
    for state in ("savara-2d", "campbell-2d", "lattice-half"):
        std = standard_thermo(th, state)
        np.testing.assert_allclose(std.gibbs, std.enthalpy - th.temperature * std.entropy, rtol=1e-12)


def test_unknown_state_rejected():
    th = Adsorbate(FREQS, 0.0).thermo(300.0)
    with pytest.raises(InputError, match="unknown"):
        standard_thermo(th, "half-lattice")


def test_exact_solver_option_agrees_with_closed_form_for_heavy_adsorbate():
    # Sprowl et al. 2016 closed forms vs the exact plane-wave solution of the same cosine potentials:
    # measured here (tests/test_hindered.py: <= 0.0136 k per translation for m >= 12 amu, <= 0.033 k for
    # rotors with I >= 3 amu Å^2, n <= 3 above 20 K); for this CO-like case the difference is ~0.002 k
    t = np.array([150.0, 400.0, 900.0])
    closed = Adsorbate(FREQS, 0.0, "hindered", **HINDERED).thermo(t)
    exact = Adsorbate(FREQS, 0.0, "hindered", solver="exact", **HINDERED).thermo(t)
    np.testing.assert_allclose(exact.entropy, closed.entropy, rtol=0, atol=0.005 * C.kB_eV)
    assert exact.choices["solver"] == "exact"


@pytest.fixture(scope="module")
def o_on_cu100(tmp_path_factory):
    # normal modes computed here with ASE's EMT calculator (a toy potential: the numbers are not physical)
    from ase.build import add_adsorbate, fcc100
    from ase.calculators.emt import EMT
    from ase.constraints import FixAtoms
    from ase.optimize import BFGS
    from ase.vibrations import Vibrations

    slab = fcc100("Cu", size=(2, 2, 2), vacuum=6.0)
    add_adsorbate(slab, "O", 1.0, "hollow")
    slab.set_constraint(FixAtoms(mask=[s != "O" for s in slab.get_chemical_symbols()]))
    slab.calc = EMT()
    BFGS(slab, logfile=None).run(fmax=0.01)
    vib = Vibrations(slab, name=str(tmp_path_factory.mktemp("vib") / "vib"))
    vib.run()
    data = vib.get_vibrations()
    freqs = data.get_frequencies()
    return slab, freqs, data.get_modes(all_atoms=False)


def test_mode_assignment_by_projection_on_emt_modes(o_on_cu100):
    # with normal-mode vectors the frustrated translations are the modes that project onto rigid in-plane
    # translations (mass-weighted metric; design rule, docs/methods-species-equilibria.md)
    slab, freqs, modes = o_on_cu100
    assert np.all(np.abs(freqs.imag) < 1e-6) and np.all(freqs.real > 0)
    nu = freqs.real
    ads = Adsorbate(nu, 0.0, "hindered", atoms=slab, mode_vectors=modes, site_spacing=2.55,
                    translation_barrier=0.4)
    chosen = sorted(m["index"] for m in ads.replaced_modes)
    assert all(m["assigned_by"] == "normal-mode projection" for m in ads.replaced_modes)
    # the chosen modes are the two whose displacement lies in the surface plane (z component ~ 0)
    in_plane = sorted(int(i) for i in np.argsort(np.abs(modes[:, 0, 2]))[:2])
    assert chosen == in_plane
    assert ads.mass == pytest.approx(slab.get_masses()[-1])
    assert ads.n_atoms == 1  # adsorbate atoms found from FixAtoms


def test_mode_count_checked_against_atoms(o_on_cu100):
    slab, freqs, _ = o_on_cu100
    with pytest.raises(InputError, match="3N = 3 modes"):
        Adsorbate(list(freqs.real) + [100.0], 0.0, atoms=slab)


def test_closed_form_warns_outside_validated_range():
    # the closed form is off by up to 30% in q for a light adsorbate at low T (tests/test_hindered.py, measured
    # against the exact solver): the module warns and offers the exact solver
    light = dict(mass=1.008, site_spacing=2.6, translation_barrier=0.02)
    with pytest.warns(ModelWarning, match="solver='exact'"):
        th = Adsorbate([300.0, 320.0, 900.0], 0.0, "hindered", **light).thermo(np.array([30.0]))
    assert th.warnings
    exact = Adsorbate([300.0, 320.0, 900.0], 0.0, "hindered", solver="exact", **light).thermo(np.array([30.0]))
    assert not exact.warnings


def test_surface_pes_model_replaces_the_two_translations():
    # model "surface-pes" uses the lateral surface in place of the two frustrated translations
    # (the idea of complete potential-energy sampling: Jørgensen and Grönbeck, J. Phys. Chem. C 2017, 121, 7199)
    from adsorb.partition import surface_pes

    # invented site energies (eV) of a CO-like adsorbate on a square (100) lattice, a = 2.55 Å
    pes = surface_pes.pes_from_sites("100", 2.55, {"top": 0.0, "bridge": 0.05, "hollow": 0.12})
    t = np.array([300.0, 600.0])
    ads = Adsorbate(FREQS, 0.0, "surface-pes", mass=CO_MASS, pes=pes)
    assert sorted(m["index"] for m in ads.replaced_modes) == [0, 1]
    expected = surface_pes.lateral_quantum(t, pes, CO_MASS).entropy + Adsorbate(FREQS[2:], 0.0).thermo(t).entropy
    np.testing.assert_allclose(ads.thermo(t).entropy, expected, rtol=1e-12)
    assert ads.thermo(t).choices["mobile"] is True
    with pytest.raises(InputError, match="pes"):
        Adsorbate(FREQS, 0.0, "surface-pes", mass=CO_MASS)


def test_soft_modes_given_explicitly():
    # when the mode normal to the surface is the softest, the user names the in-plane modes (design rule)
    freqs = [30.0, 60.0, 65.0, 90.0, 400.0, 2000.0]
    ads = Adsorbate(freqs, 0.0, "hindered", soft_modes=[1, 2, 3], **HINDERED)
    assert [m["index"] for m in ads.replaced_modes] == [1, 2, 3]
    assert ads.replaced_modes[0]["assigned_by"] == "given by the user"
    np.testing.assert_array_equal(ads.harmonic_frequencies, [30.0, 400.0, 2000.0])
    for bad in ([1, 2], [1, 1, 2], [1, 2, 9]):
        with pytest.raises(InputError, match="soft_modes"):
            Adsorbate(freqs, 0.0, "hindered", soft_modes=bad, **HINDERED)


# ---------------------------------------------------------------- domain warnings and units
def _domain_messages(ads, t):
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        table = ads.thermo(t)
    got = [str(w.message) for w in caught if issubclass(w.category, ModelWarning)]
    assert all(m in table.warnings for m in got)          # recorded with the result too
    return got


def test_harmonic_domain_warnings():
    """kT above the diffusion barrier, and a soft mode below kT/5, are flagged for the harmonic picture."""
    stiff = [400.0, 420.0, 450.0, 500.0, 520.0, 2000.0]                # invented, all stiff
    w = 0.05                                                           # eV, invented barrier
    t_w = w / C.kB_eV                                                  # kT = W at 580.2 K (CODATA k via scipy)
    ads = Adsorbate(stiff, model="harmonic", translation_barrier=w)
    assert _domain_messages(ads, [0.98 * t_w]) == []
    msgs = _domain_messages(ads, [300.0, 1.02 * t_w])
    assert len(msgs) == 1 and "diffusion barrier" in msgs[0] and f"{t_w:.4g} K" in msgs[0]
    # the soft-mode rule: kT > 5 h c nu_min, i.e. T > 5 * 50 cm^-1 * 1.438777 K/cm^-1 = 359.7 K
    # (second radiation constant c2 = hc/k = 1.438777 cm K, CODATA 2018)
    soft = [50.0] + stiff[1:]
    assert _domain_messages(Adsorbate(soft, model="lattice-gas"), [355.0]) == []
    msgs = _domain_messages(Adsorbate(soft, model="lattice-gas"), [365.0])
    assert len(msgs) == 1 and "softest harmonic mode (50 cm^-1)" in msgs[0]
    # a treatment of low modes, or a model that replaces the soft modes, removes the warning
    assert _domain_messages(Adsorbate(soft, model="harmonic", low_frequency="qrrho"), [900.0]) == []
    assert _domain_messages(Adsorbate(FREQS, model="hindered", **HINDERED), [300.0]) == []


def test_barrier_of_the_harmonic_model_is_validated():
    with pytest.raises(InputError, match="'translation_barrier': expected a finite number >= 0"):
        Adsorbate(FREQS, model="harmonic", translation_barrier=-0.1)


def test_frequencies_in_ev_are_refused_with_the_conversion():
    """A list whose every |nu| is below 1 cm^-1 is refused, naming the eV -> cm^-1 factor 8065.54."""
    ev = [f * 1.239842e-4 for f in FREQS]                # cm^-1 -> eV, CODATA hc/e = 1.239842e-6 eV m
    with pytest.raises(InputError, match=r"look like eV: multiply by 8065\.54"):
        Adsorbate(ev)


def test_hydrogen_adsorbate_in_mev_is_flagged():
    """An adsorbate with H whose largest |nu| is below 400 cm^-1 gets a ModelWarning naming meV."""
    from ase import Atoms

    h = Atoms("H", positions=[[0, 0, 1.0]])                  # invented H* in a hollow site
    mev = [70.0, 75.0, 130.0]                                 # its modes written in meV (invented)
    with pytest.warns(ModelWarning, match=r"look like meV: multiply by 8\.0655"):
        ads = Adsorbate(mev, atoms=h, indices=[0])
    assert any("meV" in w for w in ads._warnings)
    cm = [m * 8.065544 for m in mev]                           # 1 meV = 8.065544 cm^-1 (CODATA 2018)
    with warnings.catch_warnings():
        warnings.simplefilter("error", ModelWarning)
        Adsorbate(cm, atoms=h, indices=[0])


def test_surface_model_needs_a_normal_from_the_cell():
    """Without a cell the normal is unknown: the hindered rotor's moment about it is refused, not guessed."""
    from ase import Atoms

    co = Atoms("CO", positions=[[0, 0, 0], [0.3, 0, 1.15]])   # invented tilted CO*, no cell
    params = {k: v for k, v in HINDERED.items() if k not in ("inertia", "mass")}
    with pytest.raises(InputError, match="no cell, so the surface normal is unknown"):
        Adsorbate(FREQS, model="hindered", atoms=co, indices=[0, 1], **params)
    co.cell = [8.0, 8.0, 20.0]
    co.pbc = [True, True, False]
    assert Adsorbate(FREQS, model="hindered", atoms=co, indices=[0, 1], **params).inertia > 0
    # an explicit inertia needs no normal
    Adsorbate(FREQS, model="hindered", atoms=Atoms("CO", positions=co.positions), indices=[0, 1],
              inertia=8.7, **params)


@pytest.mark.parametrize(("key", "value"), [("mass", 1e-320), ("site_area", 1e-300), ("inertia", 1e-200)])
def test_vanishing_parameters_are_refused_before_they_underflow(key, value):
    """Positive but absurdly small values would become 0 in SI units (a divide-by-zero downstream)."""
    params = dict(HINDERED)
    params.pop("site_spacing")
    params["site_area"] = 7.67
    params[key] = value
    with pytest.raises(InputError, match=rf"'{key}': expected at least"):
        Adsorbate(FREQS, model="hindered", **params)
