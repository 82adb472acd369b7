"""Constants and unit conversions against CODATA values as published by scipy.constants."""

import numpy as np
import scipy.constants as sc

from adsorb import constants as C


def test_boltzmann_in_ev_matches_codata():
    # CODATA 2018/2022 exact values: k = 1.380649e-23 J/K, e = 1.602176634e-19 C
    assert C.kB_eV == sc.k / sc.e
    np.testing.assert_allclose(C.kB_eV, 1.380649e-23 / 1.602176634e-19, rtol=1e-15)


def test_wavenumber_energy():
    # 1 cm^-1 = 1.239841984e-4 eV (CODATA 2018 derived value, exact h, c, e)
    np.testing.assert_allclose(C.invcm_eV, 1.239841984e-4, rtol=1e-9)
    # 1 cm^-1 = 1.438776877 K (second radiation constant c2 = 1.438776877e-2 m K, CODATA 2018)
    np.testing.assert_allclose(C.invcm_K, 1.438776877, rtol=1e-9)


def test_molar_conversions_round_trip():
    # 1 eV per molecule = 96.485332 kJ/mol (Faraday constant F = 96485.332 C/mol, CODATA 2018)
    np.testing.assert_allclose(C.to_kj_per_mol(1.0), 96.48533212, rtol=1e-9)
    np.testing.assert_allclose(C.from_kj_per_mol(C.to_kj_per_mol(0.37)), 0.37, rtol=1e-14)
    # R = k N_A = 8.314462618 J/(mol K)
    np.testing.assert_allclose(C.to_j_per_mol_k(C.kB_eV), 8.314462618, rtol=1e-9)
    np.testing.assert_allclose(C.from_j_per_mol_k(C.to_j_per_mol_k(2.5e-4)), 2.5e-4, rtol=1e-14)


def test_standard_pressure_is_one_bar():
    # IUPAC standard pressure (common practice): 1 bar = 1e5 Pa
    assert C.P_STANDARD == sc.bar == 1e5
