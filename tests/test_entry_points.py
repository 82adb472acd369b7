"""Every public entry point refuses non-physical numbers with one line of the module's own error.

Non-positive or non-finite temperatures, pressures, masses, areas, frequencies, energies and
mismatched shapes must raise :class:`adsorb.errors.InputError` (never a numpy warning, another
exception or a silent NaN). Physical facts used: T > 0 K, p > 0 Pa, m > 0, A > 0 (common practice).
"""

import warnings

import numpy as np
import pytest

from adsorb import Adsorbate, GasMolecule, site_coverages
from adsorb.equilibria import adsorption_equilibrium, reaction_terms
from adsorb.errors import InputError
from adsorb.io import named_molecule
from adsorb.partition import electronic, hindered, lowfreq, periodic, rotation, translation, vibration
from adsorb.standard_states import standard_coverage
from adsorb import tpd

GAS = GasMolecule(named_molecule("CO"), [2143.0])                    # CO fundamental (NIST webbook, from memory)
ADS = Adsorbate([400.0, 420.0, 450.0, 500.0, 520.0, 2000.0])         # invented stiff adsorbate

CALLS = {
    "translation_3d temperature": lambda x: translation.translation_3d(x, 28.0),
    "translation_3d pressure": lambda x: translation.translation_3d(300.0, 28.0, x),
    "translation_3d mass": lambda x: translation.translation_3d(300.0, x),
    "translation_2d area": lambda x: translation.translation_2d(300.0, 28.0, x),
    "linear_rotor temperature": lambda x: rotation.linear_rotor(x, 1.9),
    "linear_rotor constant": lambda x: rotation.linear_rotor(300.0, x),
    "nonlinear_rotor constants": lambda x: rotation.nonlinear_rotor(300.0, [x, 1.0, 1.0]),
    "free_rotor inertia": lambda x: rotation.free_rotor(300.0, x),
    "harmonic temperature": lambda x: vibration.harmonic(x, [1000.0]),
    "harmonic frequency": lambda x: vibration.harmonic(300.0, [x]),
    "electronic temperature": lambda x: electronic.electronic(x, 1),
    "electronic degeneracy": lambda x: electronic.electronic(300.0, x),
    "hindered_translator spacing": lambda x: hindered.hindered_translator(300.0, 28.0, 0.1, x),
    "hindered_rotor temperature": lambda x: hindered.hindered_rotor(x, 8.7, 0.05, 3),
    "lattice_translator temperature": lambda x: periodic.lattice_translator(x, 28.0, 2.77, [0.05]),
    "quasi_rrho temperature": lambda x: lowfreq.quasi_rrho(x, [50.0, 1000.0]),
    "harmonic_with_floor floor": lambda x: lowfreq.harmonic_with_floor(300.0, [50.0], floor_cm=x),
    "GasMolecule.thermo temperature": lambda x: GAS.thermo(x),
    "GasMolecule.thermo pressure": lambda x: GAS.thermo(300.0, x),
    "GasMolecule energy": lambda x: GasMolecule(named_molecule("CO"), [2143.0], energy=x),
    "Adsorbate.thermo temperature": lambda x: ADS.thermo(x),
    "Adsorbate energy": lambda x: Adsorbate([400.0, 500.0, 2000.0], energy=x),
    "Adsorbate site_area": lambda x: Adsorbate([400.0, 500.0, 2000.0], model="2d-gas", mass=28.0, site_area=x),
    "site_coverages pressures": lambda x: site_coverages([1e-5], [x]),
    "site_coverages temperature": lambda x: site_coverages([1e-5], [1e5], interactions=[[0.1]], temperature=x),
    "standard_coverage temperature": lambda x: standard_coverage("savara-2d", x, 9.0),
    "standard_coverage area": lambda x: standard_coverage("savara-2d", 300.0, x),
    "adsorption_equilibrium slab energy": lambda x: adsorption_equilibrium(ADS.thermo(300.0), GAS.thermo(300.0), x),
    "simulate_tpd heating rate": lambda x: tpd.simulate_tpd(0.5, x, prefactor=1e13, energy_eV=1.0,
                                                            temperature_start_K=100.0),
    "simulate_tpd prefactor": lambda x: tpd.simulate_tpd(0.5, 1.0, prefactor=x, energy_eV=1.0,
                                                         temperature_start_K=100.0),
}
# zero is legitimate for a few of them: a zero pressure of one competitor (it is absent) and a
# fixed energy of 0 eV; everything else must be refused for every value below
BAD = {"zero": 0.0, "negative": -5.0, "nan": np.nan, "inf": np.inf, "nan in array": [300.0, np.nan]}
ZERO_OK = {"site_coverages pressures", "GasMolecule energy", "Adsorbate energy", "adsorption_equilibrium slab energy"}
NEGATIVE_OK = {"GasMolecule energy", "Adsorbate energy", "adsorption_equilibrium slab energy"}


def _cases():
    for name in CALLS:
        for label, value in BAD.items():
            if (label == "zero" and name in ZERO_OK) or (label == "negative" and name in NEGATIVE_OK):
                continue
            if label == "nan in array" and ("energy" in name or "degeneracy" in name):
                continue
            yield pytest.param(name, value, id=f"{name}-{label}")


@pytest.mark.parametrize(("name", "value"), list(_cases()))
def test_bad_number_is_refused_in_one_line(name, value):
    with warnings.catch_warnings():
        warnings.simplefilter("error", RuntimeWarning)          # no numpy warning on the way
        with pytest.raises(InputError) as info:
            CALLS[name](value)
    assert "\n" not in str(info.value) and str(info.value)


def test_reaction_terms_refuse_non_finite_coefficients_and_energies():
    table = ADS.thermo(300.0)
    with pytest.raises(InputError, match="stoichiometric coefficient"):
        reaction_terms([(np.nan, table)])
    with pytest.raises(InputError, match="fixed electronic energy in eV"):
        reaction_terms([(1, table), (-1, np.inf)])


def test_coverages_need_a_species():
    with pytest.raises(InputError, match="at least one species"):
        site_coverages([], [1e5])


def test_mismatched_shapes_are_refused():
    with pytest.raises(InputError, match="do not broadcast"):
        GAS.thermo(np.array([300.0, 400.0]), np.array([1e5, 2e5, 3e5]))
    with pytest.raises(InputError, match="species axes"):
        site_coverages([1e-5, 2e-5, 3e-5], [1e5, 1e5])
    with pytest.raises(InputError, match="do not broadcast"):
        site_coverages(np.ones((1, 3)) * 1e-5, np.ones((1, 4)) * 1e5)
