"""Tests of GasMolecule and the ``adsorb gas`` command.

Published values: NIST-JANAF (Chase 1998) S°, Cp° and H°(298.15)-H°(0) within the
recommended tolerances of gas-reference-data.md §4, CODATA Ar entropy; limits and
identities (G = H - TS = E + ZPE - kT ln Q, S = -dG/dT, Cp = dH/dT, pressure dependence).

Equation numbers of McQuarrie, Statistical Mechanics (1976), are quoted from memory.
"""

import json
import warnings

import numpy as np
import pytest
import scipy.constants as sc
from ase import Atoms
from ase.build import molecule
from hypothesis import given
from hypothesis import strategies as st

import reference_data as ref
from adsorb import constants as C
from adsorb.cli import main
from adsorb.errors import InputError, ModelWarning
from adsorb.gas import GasMolecule
from adsorb.thermo import ThermoTable

TEMPS = (298.15, 500.0, 1000.0)


def build(species, **options):
    """GasMolecule with ase.build atoms and the molecular constants of the reference table."""
    inputs = ref.molecular_inputs(species)
    atoms = Atoms(species) if species in ("Ar", "He") else molecule(species)
    kwargs = dict(multiplicity=inputs["multiplicity"], rotational_constants=inputs.get("rotational_constants"),
                  electronic_levels=inputs.get("electronic_levels"))
    if "centrifugal_cm" in inputs and options.get("rotor") != "classical":
        kwargs["centrifugal_cm"] = inputs["centrifugal_cm"]
    kwargs.update(options)
    return GasMolecule(atoms, inputs.get("frequencies", []), **kwargs)


def computed(gas, quantity, t):
    table = gas.thermo(t)
    return float({"S": table.entropy_j_mol_k, "Cp": table.heat_capacity_j_mol_k,
                  "H-H0": table.thermal_enthalpy_kj_mol}[quantity])


JANAF_CASES = [(row.species, row.quantity, row.temperature) for row in ref.TABLES]


@pytest.mark.parametrize("species, quantity, t", JANAF_CASES)
def test_against_janaf(species, quantity, t):
    # NIST-JANAF 4th ed. (Chase 1998); tolerance: gas-reference-data.md §4 Tier 2 (source on each row)
    row, tol = ref.value(species, quantity, t), ref.tolerance(species, quantity, t)
    got = computed(build(species), quantity, t)
    assert abs(got - row.value) <= tol.tolerance, f"{got:.4f} vs {row.value} ({row.source}); tol {tol.tolerance} ({tol.source})"


@pytest.mark.parametrize("row", ref.RRHO, ids=lambda r: f"{r.species}-{r.quantity}-{r.temperature:g}")
def test_against_reference_rrho_columns(row):
    # secondary regression: the compilation's own RRHO numbers with the same inputs (§3, Tier 1 of §4)
    species = "H2" if row.species == "H2-classical" else row.species
    options = {"rotor": "classical"} if row.species == "H2-classical" else {}
    got = computed(build(species, **options), row.quantity, row.temperature)
    assert abs(got - row.value) <= ref.RRHO_TOLERANCE[row.quantity], (got, row)


@pytest.mark.parametrize("tol", ref.H2_CLASSICAL_TOLERANCES, ids=lambda r: f"{r.quantity}-{r.temperature:g}")
def test_h2_classical_rotor_is_worse_than_level_sum(tol):
    # JANAF H-050 (Chase 1998): the classical rotor is within the looser §4 tolerances, the level sum closer
    row = ref.value("H2", tol.quantity, tol.temperature)
    classical = computed(build("H2", rotor="classical"), tol.quantity, tol.temperature)
    levels = computed(build("H2"), tol.quantity, tol.temperature)
    assert abs(classical - row.value) <= tol.tolerance
    assert abs(levels - row.value) < abs(classical - row.value)


def test_h2_without_centrifugal_term():
    # gas-reference-data.md §3.3 (computed there): the J-sum without D0 gives S°298 = 130.596, Cp°298 = 28.748
    gas = build("H2", centrifugal_cm=0.0)
    assert gas.rotor == "levels" and gas.nuclear_spin == 0.5
    assert abs(computed(gas, "S", 298.15) - 130.596) < 0.005
    assert abs(computed(gas, "Cp", 298.15) - 28.748) < 0.005


def test_sackur_tetrode_argon():
    # CODATA Key Values (Cox, Wagman & Medvedev 1989): S°(Ar, 298.15 K, 1 bar) = 154.846 J/mol/K
    row = ref.CODATA_AR_S298
    gas = GasMolecule(Atoms("Ar"), [])
    assert gas.geometry == "monatomic" and gas.rotor == "none"
    assert abs(float(gas.thermo(298.15, 1e5).entropy_j_mol_k) - row.value) < 0.005, row.source
    # Cp = 5/2 R exactly for a monatomic ideal gas (common practice)
    np.testing.assert_allclose(gas.thermo(777.0).heat_capacity_j_mol_k, 2.5 * sc.R, rtol=1e-12)


# ------------------------------------------------------------------ geometry-derived inputs
@pytest.mark.parametrize("species", ["H2", "N2", "O2", "CO", "CO2", "H2O", "NH3", "CH4"])
def test_symmetry_number_and_shape_detected(species):
    # external symmetry numbers of gas-reference-data.md §2a
    inputs = ref.molecular_inputs(species)
    gas = GasMolecule(molecule(species), inputs["frequencies"], multiplicity=inputs["multiplicity"])
    assert gas.symmetry_number == inputs["symmetry_number"]
    assert gas.geometry == ("linear" if len(inputs["rotational_constants"]) == 1 else "nonlinear")
    assert gas.choices["symmetry_number_source"] == "detected from geometry"
    assert gas.choices["rotational_constants_source"] == "principal moments of the geometry"


def test_geometry_rotational_constant_close_to_spectroscopic():
    # ASE's CO geometry gives B within 5 % of B0 = 1.92253 cm^-1 (Huber & Herzberg 1979, from memory);
    # S differs by R ln(B ratio) only
    from_geometry = GasMolecule(molecule("CO"), [2143.27])
    given_b = build("CO")
    b = from_geometry.rotational_constants_cm[0]
    assert abs(b / 1.92253 - 1) < 0.05
    ds = computed(from_geometry, "S", 298.15) - computed(given_b, "S", 298.15)
    np.testing.assert_allclose(ds, -sc.R * np.log(b / 1.92253), rtol=1e-9)


def test_rotor_rule_and_choices():
    h2 = GasMolecule(molecule("H2"), [4161.17])
    n2 = GasMolecule(molecule("N2"), [2329.91])
    assert h2.rotor == "levels" and n2.rotor == "classical"
    assert h2.choices["nuclear_spin"] == 0.5 and "table" in h2.choices["nuclear_spin_source"]
    assert n2.choices["nuclear_spin"] is None
    # N2 by level sum, no spin given: sum divided by sigma, close to classical - k theta/3 in H (Mulholland 1928)
    n2_levels = GasMolecule(molecule("N2"), [2329.91], rotor="levels")
    theta = n2.rotational_constants_cm[0] * C.invcm_K
    dh = n2.thermo(298.15).enthalpy - n2_levels.thermo(298.15).enthalpy
    np.testing.assert_allclose(dh, C.kB_eV * theta / 3, rtol=2e-2)
    # N2 with 14N spin I = 1 statistics: same as sigma division at 298 K (theta = 2.9 K), common practice
    n2_spin = GasMolecule(molecule("N2"), [2329.91], rotor="levels", nuclear_spin=1.0)
    np.testing.assert_allclose(n2_spin.thermo(298.15).entropy, n2_levels.thermo(298.15).entropy, rtol=1e-9)
    # auto + centrifugal constant switches to the level sum
    assert GasMolecule(molecule("N2"), [2329.91], centrifugal_cm=5.7e-6).rotor == "levels"
    json.dumps(h2.thermo([300.0, 400.0]).to_dict())          # choices are JSON-ready


def test_o2_level_sum_sigma_g_minus():
    # 16O2 (I = 0, X 3Sigma_g-): only odd J exist (Herzberg 1950); the sum -> classical sigma = 2 at 298 K
    o2 = build("O2")
    odd = build("O2", rotor="levels", nuclear_spin=0.0, even_j_symmetric=False)
    row, tol = ref.value("O2", "S", 298.15), ref.tolerance("O2", "S", 298.15)
    assert abs(computed(odd, "S", 298.15) - row.value) <= tol.tolerance
    assert abs(computed(odd, "S", 298.15) - computed(o2, "S", 298.15)) < 0.01
    np.testing.assert_allclose(odd.zpe - o2.zpe, 2 * 1.43768 * C.invcm_eV, rtol=1e-9)


def test_zpe_and_energy_zero():
    # ZPE = sum h c nu / 2 (common practice), from scipy.constants
    gas = build("CH4", energy=-24.0)
    nu = np.array(ref.molecular_inputs("CH4")["frequencies"])
    np.testing.assert_allclose(gas.zpe, 0.5 * sc.h * sc.c * 100 * nu.sum() / sc.e, rtol=1e-12)
    zero = build("CH4")
    a, b = gas.thermo(TEMPS), zero.thermo(TEMPS)
    np.testing.assert_allclose(a.gibbs - b.gibbs, -24.0, rtol=1e-12)
    np.testing.assert_allclose(a.entropy, b.entropy, rtol=1e-15)
    # H(T) -> energy + ZPE as T -> 0 apart from the classical translation/rotation terms (4 kT for a
    # nonlinear molecule: 3/2 + 3/2 + 1 for pV), McQuarrie 1976
    with pytest.warns(ModelWarning, match="classical rotor is used below"):   # CH4: theta_rot = 7.5 K
        cold = gas.thermo(2.0)
    np.testing.assert_allclose(cold.enthalpy - (-24.0 + gas.zpe), 4 * C.kB_eV * 2.0, rtol=1e-9)


def test_electronic_levels_no():
    # NO: ground 2Pi1/2 g = 2, 2Pi3/2 g = 2 at 121 cm^-1 (from memory); electronic S in closed form
    # (McQuarrie 1976 sec. 5-4) on top of the same molecule without the excited level
    atoms = molecule("NO")
    plain = GasMolecule(atoms, [1904.0], multiplicity=2)
    excited = GasMolecule(atoms, [1904.0], multiplicity=2, electronic_levels=[(2, 121.0)])
    t = np.array([100.0, 298.15, 1000.0])
    x = 121.0 * C.invcm_K / t
    q = 2 + 2 * np.exp(-x)
    s_el = sc.R * (np.log(q) + 2 * x * np.exp(-x) / q)
    ds = excited.thermo(t).entropy_j_mol_k - plain.thermo(t).entropy_j_mol_k
    np.testing.assert_allclose(ds, s_el - sc.R * np.log(2), rtol=1e-10)


# ------------------------------------------------------------------ identities
def _ln_q_total(gas, t, p=C.P_STANDARD):
    return sum(c.ln_q for _, c in gas.motions(t, p))


MOLECULES = {name: build(name) for name in ("Ar", "H2", "O2", "CO2", "NH3")}


@given(st.sampled_from(sorted(MOLECULES)), st.floats(5.0, 5000.0), st.floats(1e2, 1e8))
def test_molecule_identities(name, t, p):
    gas = MOLECULES[name]
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ModelWarning)    # H2 with D0 above ~1700 K (tested separately)
        table = gas.thermo(t, p)
        # G = E + ZPE - kT ln Q per molecule at pressure p (McQuarrie 1976, eq. 5-20 with q/N)
        np.testing.assert_allclose(table.gibbs, gas.energy + gas.zpe - C.kB_eV * t * _ln_q_total(gas, t, p),
                                   rtol=1e-10, atol=1e-12)
        h = 1e-5 * t
        up, dn = gas.thermo(t + h, p), gas.thermo(t - h, p)
    # S = -(dG/dT)_p and Cp = (dH/dT)_p by central differences (thermodynamic identities)
    # (atol: the ideal-gas entropy passes through zero at low T and high p, where rtol alone is meaningless)
    np.testing.assert_allclose(table.entropy, -(up.gibbs - dn.gibbs) / (2 * h), rtol=1e-6, atol=1e-6 * C.kB_eV)
    np.testing.assert_allclose(table.heat_capacity, (up.enthalpy - dn.enthalpy) / (2 * h), rtol=1e-6,
                               atol=1e-6 * C.kB_eV)


@pytest.mark.filterwarnings("ignore:ideal-gas reference:adsorb.errors.ModelWarning")   # the identity is ideal
@given(st.floats(1.0, 1e9))
def test_pressure_dependence(p):
    # ideal gas: S(p) - S(p°) = -k ln(p/p°), H independent of p (common practice)
    gas = MOLECULES["CO2"]
    a, b = gas.thermo(TEMPS, p), gas.thermo(TEMPS, C.P_STANDARD)
    np.testing.assert_allclose(a.entropy - b.entropy, -C.kB_eV * np.log(p / C.P_STANDARD), rtol=1e-9, atol=1e-17)
    np.testing.assert_array_equal(a.enthalpy, b.enthalpy)
    np.testing.assert_array_equal(a.heat_capacity, b.heat_capacity)


@pytest.mark.filterwarnings("ignore:ideal-gas reference:adsorb.errors.ModelWarning")
def test_broadcasting_over_temperature_and_pressure():
    gas = MOLECULES["NH3"]
    t = np.array([300.0, 600.0, 900.0])[:, None]
    p = np.array([1e3, 1e5, 1e7, 1e9])
    table = gas.thermo(t, p)
    assert isinstance(table, ThermoTable)
    for field in (table.gibbs, table.enthalpy, table.entropy, table.heat_capacity, table.zpe,
                  table.temperature, table.pressure):
        assert field.shape == (3, 4)
    one = gas.thermo(600.0, 1e7)
    np.testing.assert_allclose(table.gibbs[1, 2], one.gibbs, rtol=1e-14)
    assert gas.thermo(np.full((2, 2, 2), 400.0)).entropy.shape == (2, 2, 2)


def test_range_sweep_no_warnings():
    """No warning from 1 to 5000 K except the classical rotor's below its rotational temperature."""
    t = np.geomspace(1.0, 5000.0, 60)
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        warnings.filterwarnings("ignore", ".*classical rotor is used below", ModelWarning)
        for name in ("Ar", "O2", "CO2", "NH3"):
            table = MOLECULES[name].thermo(t)
            assert np.all(np.isfinite(table.gibbs)) and np.all(np.isfinite(table.heat_capacity))
        # H2 without D: level sum converges at every T
        table = GasMolecule(molecule("H2"), [4161.17]).thermo(t)
        assert np.all(np.isfinite(table.entropy))


def test_centrifugal_truncation_warning_recorded():
    # H2 with D0 at 5000 K: the two-term J expansion turns over (Herzberg 1950); warned and recorded
    with pytest.warns(ModelWarning, match="not converged"):
        table = MOLECULES["H2"].thermo([1000.0, 5000.0])
    assert any("not converged" in w for w in table.warnings)


# ------------------------------------------------------------------ frequency handling
def test_surplus_near_zero_modes_dropped_and_recorded():
    # a full 3N list from a calculation: 5 rigid-body modes near zero (two of them imaginary)
    atoms = molecule("CO")
    full = [0.3, -12.0, 4.0, 30.0, -2.5, 2143.27]
    gas = GasMolecule(atoms, full, rotational_constants=1.92253)
    np.testing.assert_array_equal(gas.frequencies, [2143.27])
    assert sorted(gas.choices["dropped_near_zero_modes_cm"]) == sorted([0.3, -12.0, 4.0, 30.0, -2.5])
    np.testing.assert_allclose(gas.thermo(298.15).entropy, build("CO").thermo(298.15).entropy, rtol=1e-14)
    # ASE's complex convention (imaginary = 0 + x j)
    complex_modes = np.array([0.3j, 12.0j, 4.0, 30.0, 2.5j, 2143.27])
    assert GasMolecule(atoms, complex_modes).choices["dropped_near_zero_modes_cm"][1] == -12.0


def test_surplus_modes_not_near_zero_refused():
    with pytest.raises(InputError, match="surplus"):
        GasMolecule(molecule("CO"), [60.0, 70.0, 80.0, 90.0, 100.0, 2143.0])
    # a wider threshold, chosen by the caller, accepts them
    gas = GasMolecule(molecule("CO"), [60.0, 70.0, 80.0, 90.0, 100.0, 2143.0], near_zero_cm=150.0)
    assert gas.choices["near_zero_threshold_cm"] == 150.0


def test_imaginary_mode_policies():
    nu = [3657.0, -1595.0, 3756.0]
    with pytest.raises(InputError, match="imaginary_modes"):
        GasMolecule(molecule("H2O"), nu)
    dropped = GasMolecule(molecule("H2O"), nu, imaginary_modes="drop")
    inverted = GasMolecule(molecule("H2O"), nu, imaginary_modes="invert")
    np.testing.assert_array_equal(dropped.frequencies, [3657.0, 3756.0])
    np.testing.assert_array_equal(inverted.frequencies, [3657.0, 1595.0, 3756.0])
    for gas in (dropped, inverted):
        assert gas.choices["imaginary_modes_handled_cm"] == [-1595.0]
        assert any("imaginary" in w for w in gas.thermo(300.0).warnings)


@pytest.mark.parametrize("call, match", [
    (lambda: GasMolecule(molecule("H2O"), [3657.0, 1595.0]), "3N-6 = 3"),
    (lambda: GasMolecule(molecule("CO2"), [1333.0, 667.0, 2349.0]), "3N-5 = 4"),
    (lambda: GasMolecule(molecule("CO"), [1.0] * 7), "more than 3N"),
    (lambda: GasMolecule(molecule("CO"), ["abc"]), "frequencies"),
    (lambda: GasMolecule(molecule("CO"), [2143.0], rotational_constants=[1.9, 1.9, 1.0]), "one value B"),
    (lambda: GasMolecule(molecule("H2O"), [3657.0, 1595.0, 3756.0], rotational_constants=[27.9, 14.5]),
     "three values"),
    (lambda: GasMolecule(molecule("H2O"), [3657.0, 1595.0, 3756.0], rotational_constants=[27.9, 14.5, -9.3]),
     "rotational_constants"),
    (lambda: GasMolecule(Atoms("Ar"), [], rotational_constants=1.0), "single atom"),
    (lambda: GasMolecule(molecule("CO"), [2143.0], multiplicity=0), "multiplicity"),
    (lambda: GasMolecule(molecule("CO"), [2143.0], multiplicity=1.5), "multiplicity"),
    (lambda: GasMolecule(molecule("CO"), [2143.0], symmetry_number=0), "symmetry_number"),
    (lambda: GasMolecule(molecule("CO"), [2143.0], energy=float("nan")), "energy"),
    (lambda: GasMolecule(molecule("CO"), [2143.0], rotor="quantum"), "rotor"),
    (lambda: GasMolecule(molecule("H2O"), [3657.0, 1595.0, 3756.0], rotor="levels"), "linear molecules"),
    (lambda: GasMolecule(molecule("CO"), [2143.0], rotor="classical", centrifugal_cm=1e-6), "centrifugal_cm"),
    (lambda: GasMolecule(molecule("CO"), [2143.0], rotor="levels", nuclear_spin=0.5), "homonuclear"),
    (lambda: GasMolecule(molecule("CO"), [2143.0], imaginary_modes="ignore"), "imaginary_modes"),
    (lambda: GasMolecule(molecule("CO"), [2143.0], electronic_levels=[(1, -5.0)]), "levels"),
    (lambda: GasMolecule("CO", [2143.0]), "atoms"),
    (lambda: MOLECULES["CO2"].thermo(0.0), "temperature"),
    (lambda: MOLECULES["CO2"].thermo([300.0, -1.0]), "temperature"),
    (lambda: MOLECULES["CO2"].thermo(300.0, 0.0), "pressure"),
    (lambda: MOLECULES["CO2"].thermo(300.0, np.nan), "pressure"),
    (lambda: MOLECULES["CO2"].thermo(np.ones(3) * 300, np.ones(2) * 1e5), "broadcast"),
])
def test_bad_input(call, match):
    with pytest.raises(InputError, match=match):
        call()


# ------------------------------------------------------------------ command line
@pytest.fixture
def co_file(tmp_path):
    path = tmp_path / "co.xyz"
    path.write_text("2\nenergy=-14.2\nC 0.0 0.0 0.0\nO 0.0 0.0 1.128\n")
    return path


def test_cli_table(co_file, capsys):
    code = main(["gas", str(co_file), "--frequencies", "2143.27", "--rotational-constants", "1.92253",
                 "--temperatures", "298.15 500 1000"])
    out = capsys.readouterr().out
    assert code == 0
    assert "G (kJ/mol)" in out and "H-H(0) (kJ/mol)" in out and "Cp (J/mol/K)" in out
    rows = [line.split() for line in out.splitlines() if line and not line.startswith("#")][1:]
    assert len(rows) == 3
    # NIST-JANAF C-093 (Chase 1998): S°(298.15) = 197.653, H°298-H°0 = 8.671 (§4 tolerances 0.05 / 0.01)
    assert abs(float(rows[0][4]) - 197.653) < 0.05
    assert abs(float(rows[0][3]) - 8.671) < 0.01
    # G includes the file's energy: -14.2 eV = -1370.1 kJ/mol plus ZPE and thermal terms
    assert "from" in out and float(rows[0][1]) < -1300


def test_cli_json_and_frequency_file(co_file, tmp_path, capsys):
    freq = tmp_path / "freqs.txt"
    freq.write_text("# CO modes from a calculation\n0.2, -3.0 1.0\n4.0 2.0, 2143.27\n")
    code = main(["gas", str(co_file), "--frequency-file", str(freq), "--t-min", "300", "--t-max", "500",
                 "--t-step", "100", "--pressure-bar", "10", "--energy-ev", "0", "--json"])
    assert code == 0
    data = json.loads(capsys.readouterr().out)
    assert [r["temperature_K"] for r in data["rows"]] == [300.0, 400.0, 500.0]
    assert all(r["pressure_Pa"] == 1e6 for r in data["rows"])
    assert data["electronic_energy_source"] == "--energy-ev" and data["electronic_energy_eV"] == 0.0
    assert len(data["choices"]["dropped_near_zero_modes_cm"]) == 5
    # 10 bar lowers S by R ln 10 against 1 bar (ideal gas, common practice)
    import ase.io

    one_bar = GasMolecule(ase.io.read(co_file), [2143.27]).thermo(300.0)
    np.testing.assert_allclose(data["rows"][0]["entropy_J_mol_K"],
                               float(one_bar.entropy_j_mol_k) - sc.R * np.log(10), rtol=1e-9)
    assert data["rows"][0]["enthalpy_minus_h0_kJ_mol"] > 0


@pytest.mark.parametrize("argv, match", [
    (["--frequencies", "-2143"], "imaginary"),
    (["--frequencies", "21x43"], "--frequencies"),
    (["--frequencies", "2143", "--t-step", "0"], "--t-step"),
    (["--frequencies", "2143", "--t-min", "500", "--t-max", "300"], "--t-max"),
    (["--frequencies", "2143", "--pressure-bar", "-1"], "--pressure-bar"),
    (["--frequencies", "2143", "--temperatures", "300 -5"], "temperatures"),
    (["--frequencies", "2143", "--rotational-constants", "1.9 1.9"], "rotational_constants"),
    (["--frequency-file", "missing.txt"], "missing.txt"),
])
def test_cli_bad_input(co_file, capsys, argv, match):
    assert main(["gas", str(co_file), *argv]) == 2
    err = capsys.readouterr().err
    assert match in err and len(err.strip().splitlines()) == 1


def test_cli_missing_structure(tmp_path, capsys):
    missing = tmp_path / "nothing.xyz"
    assert main(["gas", str(missing), "--frequencies", "2143"]) == 2
    assert "nothing.xyz" in capsys.readouterr().err


def test_cli_structure_without_energy(tmp_path, capsys):
    # a structure-only format (POSCAR-like plain xyz) gives energy 0, said so in the header
    path = tmp_path / "ar.xyz"
    path.write_text("1\n\nAr 0 0 0\n")
    assert main(["gas", str(path), "--temperatures", "298.15"]) == 0
    out = capsys.readouterr().out
    assert "0 used" in out
    row = [line.split() for line in out.splitlines() if line and not line.startswith("#")][1]
    assert abs(float(row[4]) - 154.846) < 0.005            # CODATA Ar (Cox et al. 1989)


# ethane: rotational constants and the 18 fundamentals of gas-reference-data.md §2a/§2b (A, B = C from memory in
# the compilation; fundamentals NIST CCCBDB, Shimanouchi); the torsion is the fourth, 289 cm^-1
ETHANE_ABC = "2.68 0.6630 0.6630"
ETHANE_NU = "2954 1388 995 289 2896 1379 2969 2969 1468 1468 1190 1190 2985 2985 1469 1469 822 822"
ETHANE_TORSION = "top=0,2,3,4 v3=1024 sigma=3 mode=3"     # V3: Gurvich via NIST CCCBDB (§1b); C0 and its H


@pytest.fixture
def ethane_file(tmp_path):
    import ase.io

    path = tmp_path / "ethane.xyz"
    ase.io.write(path, molecule("C2H6"))
    return path


def _ethane_rows(capsys, path, *extra):
    code = main(["gas", str(path), "--frequencies", ETHANE_NU, "--rotational-constants", ETHANE_ABC,
                 "--temperatures", "298.15", *extra])
    out = capsys.readouterr().out
    assert code == 0
    return out, [line.split() for line in out.splitlines() if line and not line.startswith("#")][1:]


def test_cli_torsion_hindered_rotor(ethane_file, capsys):
    out, rows = _ethane_rows(capsys, ethane_file, "--torsion", ETHANE_TORSION)
    s_hindered = float(rows[0][4])
    # Gurvich (1989-91) via NIST CCCBDB: S°(298.15 K, 1 bar) = 229.16 +- 0.10 J/mol/K
    assert abs(s_hindered - 229.16) < 0.15
    assert "# torsion[0]: hindered rotor (exact) replacing the mode at 289 cm^-1 (index 3)" in out
    assert "V3 = 1024 cm^-1, sigma_int 3" in out and "harmonic modes: 17" in out
    # the harmonic torsion is 0.75 low (gas-reference-data.md §3.2, computed there: 228.404)
    _, harmonic_rows = _ethane_rows(capsys, ethane_file)
    assert abs(float(harmonic_rows[0][4]) - 228.404) < 0.005
    # the same rotor chosen by its wavenumber, or as the lowest mode, with the default two-top moment
    for spec in ("top=0,2,3,4 V3=1024 sigma=3 mode-cm=289", "top=0,2,3,4 v3=1024 sigma=3",
                 "top=0,2,3,4 v3=1024 sigma=3 moment=two-top solver=exact axis=1,0"):
        _, same = _ethane_rows(capsys, ethane_file, "--torsion", spec)
        assert same[0][4] == rows[0][4]


def test_cli_torsion_json_choices(ethane_file, capsys):
    code = main(["gas", str(ethane_file), "--frequencies", ETHANE_NU, "--rotational-constants", ETHANE_ABC,
                 "--temperatures", "298.15", "--json", "--torsion", "inertia=1.5699 v3=1024 sigma=3 solver=closed-form"])
    assert code == 0
    data = json.loads(capsys.readouterr().out)
    (entry,) = data["choices"]["torsions"]
    assert entry["solver"] == "closed-form" and entry["reduced_moment_source"] == "given"
    assert entry["barrier_terms_cm"] == {"V3": 1024.0} and entry["replaced_mode_cm"] == 289.0
    # the closed form of Sprowl, Campbell, Arnadottir (J. Phys. Chem. C 2016, 120, 9719) with the ethane
    # moment is within 0.1 J/mol/K of Gurvich's 229.16 (via NIST CCCBDB) too
    assert abs(data["rows"][0]["entropy_J_mol_K"] - 229.16) < 0.1


@pytest.mark.parametrize("spec, match", [
    ("top=0,2,3,4 colour=red v3=1", "--torsion 'top=0,2,3,4 colour=red v3=1': unknown key 'colour'"),
    ("top=0,2,3,4 sigma=3", "expected at least one barrier term"),
    ("top=0,2,3,4 v3", "expected KEY=VALUE"),
    ("top=0,2,3,4 v3=high", "v3: expected numbers"),
    ("top=0,2,3,4 v3=1 v3=2", "key 'v3' given twice"),
    ("top=a,b v3=1", "top: expected comma-separated atom indices"),
    ("top=0,2,3,4 v3=1024 sigma=three", "sigma: expected a positive integer"),
    ("top=0,2,3,4 v3=1024 mode=-3", "mode: expected an index >= 0 or 'lowest'"),
    ("top=0,2,3,4 v3=1024 mode=3 mode-cm=289", "give mode or mode-cm, not both"),
    ("top=0,2,3,4 v3=1024 sigma=2", "sigma: sigma_int = 2 needs a potential"),
    ("top=0,2,3,4 v3=1024 solver=fast", "solver: expected one of"),
    ("v3=1024", "top / inertia: expected"),
    ("top=0,5 v3=1024", "top: atoms [0, 5] do not form one bonded group"),
    ("top=0,2,3,4 v3=1024 mode=18", "mode: index 18 out of range"),
    ("top=0,2,3,4 v3=1024 mode-cm=450", "mode: no free mode within 1 cm^-1 of 450"),
])
def test_cli_torsion_bad_input(ethane_file, capsys, spec, match):
    assert main(["gas", str(ethane_file), "--frequencies", ETHANE_NU, "--torsion", spec]) == 2
    err = capsys.readouterr().err
    assert match in err and f"--torsion {spec!r}" in err and len(err.strip().splitlines()) == 1


def test_gas_molecule_stable_signature():
    """GasMolecule is a stable contract (DEVELOPERS.md): same class from adsorb, same signature."""
    import inspect

    import adsorb

    assert adsorb.GasMolecule is GasMolecule
    params = inspect.signature(GasMolecule).parameters
    positional = [(p.name, p.default) for p in params.values() if p.kind is p.POSITIONAL_OR_KEYWORD]
    assert positional == [("atoms", inspect.Parameter.empty), ("frequencies", inspect.Parameter.empty),
                          ("energy", 0.0), ("multiplicity", 1), ("symmetry_number", None),
                          ("electronic_levels", None), ("rotational_constants", None)]
    keyword = {p.name: p.default for p in params.values() if p.kind is p.KEYWORD_ONLY}
    assert keyword == {"rotor": "auto", "level_sum_above_cm": 5.0, "centrifugal_cm": 0.0, "nuclear_spin": None,
                       "even_j_symmetric": True, "imaginary_modes": "raise", "near_zero_cm": 50.0,
                       "shape_tolerance": 1e-3, "symmetry_tolerance": 0.05, "name": None, "torsions": ()}


@pytest.mark.parametrize(("species", "factor", "unit", "conversion"), [
    ("NH3", 1.239842e-1, "meV", r"8\.0655"),     # cm^-1 -> meV: hc/e = 1.239842e-6 eV m (CODATA 2018)
    ("CO2", 1.239842e-4, "eV", r"8065\.54"),     # cm^-1 -> eV
])
def test_frequencies_in_the_wrong_unit_are_refused(species, factor, unit, conversion):
    """NH3 in meV (largest 3444 cm^-1 = 427 meV: no X-H stretch) and CO2 in eV are refused with the factor."""
    inputs = ref.molecular_inputs(species)
    wrong = [f * factor for f in inputs["frequencies"]]
    with pytest.raises(InputError, match=rf"look like {unit}: multiply by {conversion}"):
        GasMolecule(molecule(species), wrong, multiplicity=inputs["multiplicity"])


def test_ideal_gas_above_standard_pressure_is_checked():
    """|Z - 1| > 1 % (Peng-Robinson) above p° gives a ModelWarning; p° itself (an ideal standard state) never."""
    co2 = MOLECULES["CO2"]
    with warnings.catch_warnings():
        warnings.simplefilter("error", ModelWarning)
        co2.thermo(300.0, C.P_STANDARD)                       # standard state: ideal by definition
        co2.thermo(1000.0, 2e5)                               # Z within 1 % (hot, low pressure)
    # CO2 at 300 K and 50 bar, just below its vapour pressure (~67 bar at 300 K, from memory): far from ideal
    with pytest.warns(ModelWarning, match="ideal-gas reference for CO2: .Z - 1. exceeds 0.01"):
        table = co2.thermo([300.0, 300.0], [C.P_STANDARD, 50e5])
    assert any("CO2" in w for w in table.warnings)
    # a gas without tabulated critical constants is flagged as unchecked above 10 bar
    o3 = GasMolecule(molecule("O3"), [1103.0, 701.0, 1042.0])   # O3 fundamentals (from memory)
    with pytest.warns(ModelWarning, match="not checked"):
        o3.thermo(300.0, 2e6)


@pytest.mark.parametrize(("species", "theta"), [("CO", 2.77), ("H2O", 40.1)])
def test_classical_rotor_below_its_rotational_temperature_warns(species, theta):
    """theta_rot = hcA/k: CO (B = 1.9313 cm^-1 -> 2.78 K), H2O (A = 27.88 cm^-1 -> 40.1 K), NIST CCCBDB, from memory."""
    gas = build(species)
    assert gas.rotor == "classical"
    with warnings.catch_warnings():
        warnings.simplefilter("error", ModelWarning)
        gas.thermo(1.05 * theta)
    with pytest.warns(ModelWarning, match="classical rotor is used below its rotational temperature"):
        gas.thermo([0.9 * theta, 300.0])
