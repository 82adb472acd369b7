"""adsorb batch: ase.db screening round trip, vectorised thermo against the per-row library path."""

import csv

import numpy as np
import pytest

from adsorb.cli import main

# invented test species keep soft modes at high T on purpose; the domain warning of the
# harmonic model is checked in tests/test_adsorbate.py::test_harmonic_domain_warnings
pytestmark = pytest.mark.filterwarnings("ignore:.*softest harmonic mode:adsorb.errors.ModelWarning")

ase = pytest.importorskip("ase")

T = [300.0, 500.0, 700.0]
# invented energies and adsorbate frequencies; gas data from gas-reference-data.md tables 2a/2b
GASES = {"H2": (-6.77, [4161.17], [59.322]), "CO": (-14.80, [2143.27], [1.92253])}
SLABS = {"S1": -100.0, "S2": -150.0}
ADS = [  # (label, surface, gas, dissociative, energy, frequencies)
    ("CO*", "S1", "CO", False, -116.30, [2050.0, 400.0, 350.0, 340.0, 120.0, 110.0]),
    ("CO*", "S2", "CO", False, -165.10, [2010.0, 380.0, 330.0, 300.0, 140.0, 95.0]),
    ("H*", "S1", "H2", True, -103.90, [1100.0, 750.0, 740.0]),
    ("H*", "S2", "H2", True, -153.20, [1000.0, 700.0, 690.0]),
]


def _with_energy(atoms, energy):
    from ase.calculators.singlepoint import SinglePointCalculator

    atoms.calc = SinglePointCalculator(atoms, energy=energy)
    return atoms


@pytest.fixture()
def database(tmp_path):
    import ase.db
    from ase import Atoms
    from ase.build import molecule

    path = tmp_path / "screen.db"
    db = ase.db.connect(str(path))
    with db:
        for name, (energy, freqs, rot) in GASES.items():
            db.write(_with_energy(molecule(name), energy), role="gas", gas=name,
                     data={"frequencies": freqs, "rotational_constants": rot})
        for name, energy in SLABS.items():
            slab = Atoms("Cu", positions=[[0, 0, 0]], cell=[3, 3, 10], pbc=[1, 1, 0])
            db.write(_with_energy(slab, energy), role="slab", surface=name)
        for label, surface, gas, diss, energy, freqs in ADS:
            symbols = "CuCO" if gas == "CO" else "CuH"
            atoms = Atoms(symbols, positions=[[0, 0, 2.0 * i] for i in range(len(Atoms(symbols)))],
                          cell=[3, 3, 10], pbc=[1, 1, 0])
            db.write(_with_energy(atoms, energy), role="adsorbate", adsorbate=label, surface=surface, gas=gas,
                     dissociative=diss, data={"frequencies": freqs})
    return path


def _reference_dg(gas, label_freqs, energy, slab, dissociative):
    """The per-row library path: Adsorbate + GasMolecule + adsorption_equilibrium."""
    from ase.build import molecule

    from adsorb.adsorbate import Adsorbate
    from adsorb.equilibria import adsorption_equilibrium
    from adsorb.gas import GasMolecule

    e, freqs, rot = GASES[gas]
    g = GasMolecule(molecule(gas), freqs, energy=e, rotational_constants=rot).thermo(np.array(T))
    a = Adsorbate(label_freqs, energy, model="harmonic").thermo(np.array(T))
    eq = adsorption_equilibrium(a, g, slab, dissociative=dissociative)
    return eq.terms.delta_gibbs, eq.equilibrium_constant


def test_screen_matches_per_row_library(database):
    """Vectorised dG(T) and K(T) equal the one-row-at-a-time library results."""
    from adsorb.batch import screen_database

    res = screen_database(database, None, T)
    assert res.row_id.size == len(ADS)
    for i, (label, surface, gas, diss, energy, freqs) in enumerate(ADS):
        dg, k = _reference_dg(gas, freqs, energy, SLABS[surface], diss)
        np.testing.assert_allclose(res.delta_gibbs_eV[i], dg, rtol=0, atol=1e-10)
        np.testing.assert_allclose(res.equilibrium_constant_per_Pa[i], k, rtol=1e-9)
        n = 2 if diss else 1
        assert res.delta_energy_eV[i] == pytest.approx(n * (energy - SLABS[surface]) - GASES[gas][0], abs=1e-12)


def test_batch_cli_round_trip(database, tmp_path, capsys):
    """CSV per row with dG, K and Langmuir coverages; selection by key-value pairs; no progress bar off a TTY."""
    out = tmp_path / "dG.csv"
    assert main(["batch", str(database), "--out", str(out), "--temperatures", "300 500 700",
                 "--pressure-bar", "1"]) == 0
    captured = capsys.readouterr()
    assert captured.err == ""                       # stderr is not a terminal here: no bar
    rows = list(csv.DictReader(out.read_text().splitlines()))
    assert len(rows) == len(ADS)
    for row, (label, surface, gas, diss, energy, freqs) in zip(rows, ADS):
        assert (row["adsorbate"], row["surface"], row["gas"]) == (label, surface, gas)
        dg, k = _reference_dg(gas, freqs, energy, SLABS[surface], diss)
        for j, t in enumerate(T):
            assert float(row[f"delta_gibbs_eV_{t:g}K"]) == pytest.approx(dg[j], abs=2e-6)
            kp = k[j] * 1e5
            # Langmuir: theta = Kp/(1+Kp) molecular, sqrt(Kp)/(1+sqrt(Kp)) dissociative (adsorbate-models.md §6)
            c = np.sqrt(kp) if diss else kp
            assert float(row[f"theta_{t:g}K_100000Pa"]) == pytest.approx(c / (1 + c), rel=1e-5)
    sel = tmp_path / "sel.csv"
    assert main(["batch", str(database), "--out", str(sel), "--select", "surface=S2", "--quiet"]) == 0
    rows = list(csv.DictReader(sel.read_text().splitlines()))
    assert [r["surface"] for r in rows] == ["S2", "S2"]


def test_batch_refuses_overwrite_and_bad_rows(database, tmp_path, capsys):
    """Existing output needs --force; a row without frequencies is named in a one-line error."""
    import ase.db
    from ase import Atoms

    out = tmp_path / "x.csv"
    out.write_text("old")
    assert main(["batch", str(database), "--out", str(out)]) == 2
    assert "--force" in capsys.readouterr().err
    db = ase.db.connect(str(database))
    bad_id = db.write(Atoms("CuO", positions=[[0, 0, 0], [0, 0, 2]]), role="adsorbate", surface="S1", gas="CO")
    assert main(["batch", str(database), "--out", str(tmp_path / "y.csv")]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and f"row id={bad_id}" in err[0]
    assert not (tmp_path / "y.csv").exists()


def test_strong_binding_at_low_temperature_caps_k_with_a_warning(database):
    """At 3 K, K = exp(-dG/kT)/p° of a bound row exceeds the largest double: capped with a ModelWarning, no inf."""
    from adsorb.batch import screen_database
    from adsorb.errors import ModelWarning

    with pytest.warns(ModelWarning, match="exceeds the floating-point range"):
        res = screen_database(database, None, [3.0, 300.0], pressure_Pa=1e5)
    k = res.equilibrium_constant_per_Pa
    assert np.all(np.isfinite(k)) and np.all(np.isfinite(res.coverage))
    bound = res.delta_gibbs_eV[:, 0] < -0.2      # ln K = 770 and more at 3 K: beyond ln(1.8e308) = 709.8
    assert np.any(bound) and np.all(k[bound, 0] > 0.99 * np.finfo(float).max)
    np.testing.assert_allclose(res.coverage[bound, 0], 1.0, rtol=0, atol=1e-15)
