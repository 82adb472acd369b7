"""Physical constants and unit conversions used throughout adsorb.

Every value comes from :mod:`scipy.constants` (CODATA 2022 in SciPy >= 1.15).
No other module defines a literal physical constant.

Internal units follow the boundary convention of the package: energies in eV
per molecule, temperatures in K, pressures in Pa, wavenumbers in cm^-1,
lengths in Å, masses in amu, areas in Å^2; entropies and heat capacities in
eV/K per molecule.
"""

from __future__ import annotations

import scipy.constants as _sc

# --- SI values (underscore-free names are SI unless the name says otherwise) ---
h = _sc.h                      #: Planck constant, J s
hbar = _sc.hbar                #: reduced Planck constant, J s
k_B = _sc.k                    #: Boltzmann constant, J/K
N_A = _sc.N_A                  #: Avogadro constant, 1/mol
R = _sc.R                      #: molar gas constant, J/(mol K)
c = _sc.c                      #: speed of light, m/s
e = _sc.e                      #: elementary charge, C
amu = _sc.atomic_mass          #: atomic mass constant, kg
pi = _sc.pi

# --- boundary units expressed in SI ---
eV = _sc.eV                    #: 1 eV in J
angstrom = _sc.angstrom        #: 1 Å in m
bar = _sc.bar                  #: 1 bar in Pa
atm = _sc.atm                  #: 1 atm in Pa
torr = _sc.torr                #: 1 Torr in Pa
invcm = 100.0 * h * c          #: energy of 1 cm^-1 in J

# --- the same constants in the package's working units ---
kB_eV = k_B / eV               #: Boltzmann constant, eV/K
invcm_eV = invcm / eV          #: energy of 1 cm^-1 in eV
invcm_K = invcm / k_B          #: 1 cm^-1 expressed as a temperature, K
amu_A2 = amu * angstrom**2     #: 1 amu Å^2 in kg m^2

P_STANDARD = 1.0e5             #: IUPAC standard pressure, Pa (1 bar)
T_STANDARD = 298.15            #: conventional reference temperature, K

# --- conversions from per-molecule working units to molar units ---
EV_TO_KJ_MOL = eV * N_A / 1000.0      #: eV per molecule -> kJ/mol
EV_PER_K_TO_J_MOL_K = eV * N_A        #: eV/K per molecule -> J/(mol K)


def to_kj_per_mol(value_ev):
    """Convert an energy in eV per molecule to kJ/mol."""
    return value_ev * EV_TO_KJ_MOL


def to_j_per_mol_k(value_ev_per_k):
    """Convert an entropy or heat capacity in eV/K per molecule to J/(mol K)."""
    return value_ev_per_k * EV_PER_K_TO_J_MOL_K


def from_kj_per_mol(value_kj_mol):
    """Convert an energy in kJ/mol to eV per molecule."""
    return value_kj_mol / EV_TO_KJ_MOL


def from_j_per_mol_k(value_j_mol_k):
    """Convert an entropy in J/(mol K) to eV/K per molecule."""
    return value_j_mol_k / EV_PER_K_TO_J_MOL_K
