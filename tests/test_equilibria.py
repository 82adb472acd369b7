"""Adsorption free energies and equilibrium constants: definitions, identities and limits.

Invented adsorbate energies and frequencies (labelled so); gas data from
the reference table (tests/reference_data.py sources).
"""

import numpy as np
import pytest
from ase.build import molecule

from adsorb import constants as C
from adsorb.adsorbate import Adsorbate
from adsorb.coverage import site_coverages
from adsorb.equilibria import adsorption_equilibrium, reaction_terms
from adsorb.errors import InputError
from adsorb.gas import GasMolecule

# invented test species keep soft modes at high T on purpose; the domain warning of the
# harmonic model is checked in tests/test_adsorbate.py::test_harmonic_domain_warnings
pytestmark = pytest.mark.filterwarnings("ignore:.*softest harmonic mode:adsorb.errors.ModelWarning")

T = np.linspace(300.0, 900.0, 7)
SLAB = -250.0  # invented clean-slab energy, eV

# CO: B0 = 1.92253 cm^-1, nu = 2143.27 cm^-1 (Huber & Herzberg 1979, from memory, via gas-reference-data.md)
CO = GasMolecule(molecule("CO"), [2143.27], energy=-14.8, rotational_constants=[1.92253])
# H2: B0 = 59.322 cm^-1, nu = 4161.17 cm^-1 (Huber & Herzberg 1979, from memory, via gas-reference-data.md)
H2 = GasMolecule(molecule("H2"), [4161.17], energy=-6.77, rotational_constants=[59.322])
# invented adsorbates
CO_STAR = Adsorbate([60.0, 70.0, 130.0, 350.0, 380.0, 2020.0], SLAB - 14.8 - 1.45)
H_STAR = Adsorbate([650.0, 700.0, 1050.0], SLAB - 3.385 - 0.45)


def test_molecular_constant_from_gibbs_energies():
    # definition (Campbell, Sprowl, Árnadóttir 2016; common practice): K = exp(-dG/kT)/p°
    ads, gas = CO_STAR.thermo(T), CO.thermo(T)
    eq = adsorption_equilibrium(ads, gas, SLAB)
    dg = ads.gibbs - SLAB - gas.gibbs
    np.testing.assert_allclose(eq.terms.delta_gibbs, dg, rtol=1e-13)
    np.testing.assert_allclose(eq.equilibrium_constant, np.exp(-dg / (C.kB_eV * T)) / 1e5, rtol=1e-12)
    # parts add up: dG = dE + dZPE + thermal - T dS
    parts = eq.terms.delta_energy + eq.terms.delta_zpe + eq.terms.delta_thermal + eq.terms.minus_t_delta_s
    np.testing.assert_allclose(parts, eq.terms.delta_gibbs, rtol=1e-12)
    assert eq.terms.delta_energy == pytest.approx(-1.45, abs=1e-12)


def test_dissociative_constant_and_site_balance():
    # H2 + 2* -> 2H*: dE = 2 E(H*) - 2 E(slab) - E(H2); (theta_H/theta_*)^2 = K p (Langmuir, common practice)
    ads, gas = H_STAR.thermo(T), H2.thermo(T)
    eq = adsorption_equilibrium(ads, gas, SLAB, dissociative=True)
    assert eq.terms.delta_energy == pytest.approx(2 * (-3.385 - 0.45) + 6.77, abs=1e-12)
    p = 2.0e4
    sol = site_coverages(eq.equilibrium_constant[None, :], np.full((1, T.size), p), dissociative=[True])
    np.testing.assert_allclose((sol.coverage[0] / sol.empty) ** 2, eq.equilibrium_constant * p, rtol=1e-10)


def test_van_t_hoff_identity():
    # thermodynamic identity: d ln K / d(1/T) = -dH/k with dH the adsorption enthalpy (van 't Hoff)
    h = 1e-3
    t = np.array([350.0, 600.0])
    k = lambda tt: adsorption_equilibrium(CO_STAR.thermo(tt), CO.thermo(tt), SLAB).equilibrium_constant  # noqa: E731
    dlnk = (np.log(k(t * (1 + h))) - np.log(k(t * (1 - h)))) / (1 / (t * (1 + h)) - 1 / (t * (1 - h)))
    dh = adsorption_equilibrium(CO_STAR.thermo(t), CO.thermo(t), SLAB).terms.delta_enthalpy
    np.testing.assert_allclose(-C.kB_eV * dlnk, dh, rtol=1e-5)


def test_frozen_atom_limit():
    # reference notes §6 (derived): an atom whose adsorbed vibrations are frozen has
    # K ∝ T^(-5/2) exp(-dE/kT), so dH = dE - (5/2) kT (loss of the 3D translation + pV)
    ar = GasMolecule(_argon(), [], energy=0.0)
    stiff = Adsorbate([4000.0, 4100.0, 4200.0], SLAB - 0.3)
    t = np.array([100.0, 200.0])
    eq = adsorption_equilibrium(stiff.thermo(t), ar.thermo(t), SLAB)
    zpe = stiff.thermo(t).zpe
    np.testing.assert_allclose(eq.terms.delta_enthalpy, -0.3 + zpe - 2.5 * C.kB_eV * t, rtol=0, atol=1e-9)


def _argon():
    from ase import Atoms

    return Atoms("Ar")


def test_constant_independent_of_standard_state_but_dg0_is_not():
    ads = Adsorbate([60.0, 70.0, 130.0, 350.0, 380.0, 2020.0], SLAB - 16.0, "2d-gas", mass=28.0101,
                    site_area=7.67)
    a, g = ads.thermo(T), CO.thermo(T)
    sav = adsorption_equilibrium(a, g, SLAB, standard_state="savara-2d")
    cam = adsorption_equilibrium(a, g, SLAB, standard_state="campbell-2d")
    np.testing.assert_array_equal(sav.equilibrium_constant, cam.equilibrium_constant)
    # mobile model: dG° = dG + kT ln theta° (ideal 2D gas, Campbell et al. 2016)
    np.testing.assert_allclose(sav.delta_gibbs_standard,
                               sav.terms.delta_gibbs + C.kB_eV * T * np.log(sav.standard_coverage), rtol=1e-12)
    assert not np.allclose(sav.delta_gibbs_standard, cam.delta_gibbs_standard)
    assert sav.standard_state == "savara-2d" and "Savara" in sav.standard_state_description
    # localized default: lattice-half, where dG° = dG (Savara 2013)
    loc = adsorption_equilibrium(CO_STAR.thermo(T), g, SLAB)
    assert loc.standard_state == "lattice-half"
    np.testing.assert_allclose(loc.delta_gibbs_standard, loc.terms.delta_gibbs, rtol=1e-14)
    np.testing.assert_allclose(loc.standard_constant, loc.equilibrium_constant * 1e5, rtol=1e-12)


def test_gas_must_be_at_standard_pressure():
    with pytest.raises(InputError, match="p°"):
        adsorption_equilibrium(CO_STAR.thermo(T), CO.thermo(T, pressure=2e5), SLAB)


def test_reaction_terms_rejects_mismatched_temperatures():
    with pytest.raises(InputError, match="different temperatures"):
        reaction_terms([(1, CO_STAR.thermo(T)), (-1, CO.thermo(T + 1.0))])
