"""Inputs of the entropy benchmarks: sourced gas data, invented sites, the published alkane data.

* :data:`GAS_DATA` – real gas-phase data (rotational constants, fundamentals,
  symmetry numbers) of the eight molecules of the Campbell–Sellers comparison,
  each row naming its original source;
* :data:`INVENTED_SITES` – the **invented** adsorption sites they sit on;
* :data:`TAIT_2005` – the published desorption data of n-alkanes on MgO(100)
  (S. L. Tait, Z. Dohnálek, C. T. Campbell, B. D. Kay, J. Chem. Phys. 2005,
  122, 164708);
* :data:`ALKANE_SURFACE` – the model MgO(100) surface (site spacing from the
  lattice constant, everything else **invented**).

Only inputs live here; nothing is computed from the models. Import the names
from :mod:`adsorb.entropy_benchmarks`.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np


_COMPILATION = "gas-reference-data compilation of this project"


# ---------------------------------------------------------------------------
# (a) Campbell–Sellers: real gas data, invented sites
# ---------------------------------------------------------------------------
@dataclass(frozen=True)
class GasData:
    """Sourced gas-phase data of one benchmark molecule (cm^-1; sources named).

    Attributes
    ----------
    structure : str
        Name for ``ase.build.molecule`` (or a chemical symbol for an atom).
    frequencies_cm : tuple of float
        The 3N-5 / 3N-6 fundamentals (degenerate modes repeated).
    rotational_constants_cm : tuple of float
        B (linear) or (A, B, C) (non-linear); empty for an atom.
    symmetry_number : int
        External rotational symmetry number.
    sources : str
        Where the numbers come from (original sources, as cited by the
        project's reference compilation).
    torsion : dict or None
        Keyword arguments of :class:`adsorb.gas.Torsion` for a hindered
        internal rotation of the gas (ethane), else None.
    """

    structure: str
    frequencies_cm: tuple
    rotational_constants_cm: tuple
    symmetry_number: int
    sources: str
    torsion: dict | None = None


#: The benchmark gases. Values as transcribed in the project's reference compilation
#: (gas-reference-data.md §2a, §2b) with the original sources it names.
GAS_DATA = {
    "Ar": GasData("Ar", (), (), 1, "atom; mass from ASE (IUPAC atomic weight)"),
    "N2": GasData("N2", (2329.91,), (1.98957,), 2,
                  "B0 and ΔG1/2: Huber & Herzberg, Constants of Diatomic Molecules (1979), as quoted from memory in the "
                  + _COMPILATION),
    "CO": GasData("CO", (2143.27,), (1.92253,), 1,
                  "B0 and ΔG1/2: Huber & Herzberg (1979), as quoted from memory in the " + _COMPILATION),
    "CO2": GasData("CO2", (1333.0, 667.0, 667.0, 2349.0), (0.39021,), 2,
                   "B: NIST CCCBDB (Herzberg 1966); fundamentals: NIST CCCBDB (Herzberg 1945)"),
    "H2O": GasData("H2O", (3657.0, 1595.0, 3756.0), (27.877, 14.512, 9.285), 2,
                   "A, B, C: NIST CCCBDB experimental geometry page; fundamentals: Shimanouchi, NSRDS-NBS 39 (1972), "
                   "from memory in the " + _COMPILATION),
    "NH3": GasData("NH3", (3337.0, 950.0, 3444.0, 3444.0, 1627.0, 1627.0), (9.4443, 9.4443, 6.196), 3,
                   "A, B, C: NIST CCCBDB (Herzberg 1966); fundamentals: NIST CCCBDB (Shimanouchi)"),
    "CH4": GasData("CH4", (2917.0, 1534.0, 1534.0, 3019.0, 3019.0, 3019.0, 1306.0, 1306.0, 1306.0),
                   (5.241, 5.241, 5.241), 12,
                   "B0 from memory in the " + _COMPILATION + "; fundamentals: Shimanouchi (1972), from memory there"),
    "C2H6": GasData("C2H6", (2954.0, 1388.0, 995.0, 289.0, 2896.0, 1379.0, 2969.0, 2969.0, 1468.0, 1468.0,
                             1190.0, 1190.0, 2985.0, 2985.0, 1469.0, 1469.0, 822.0, 822.0),
                    (2.68, 0.6630, 0.6630), 6,
                    "A, B from memory in the " + _COMPILATION + "; fundamentals: NIST CCCBDB (Shimanouchi); torsion "
                    "V3 = 1024 cm^-1: Gurvich et al. (1989-91) via NIST CCCBDB",
                    torsion={"top": (0, 2, 3, 4), "barriers_cm": {3: 1024.0}, "symmetry_number": 3, "mode": 3}),
}


@dataclass(frozen=True)
class InventedSite:
    """An INVENTED adsorption site for one benchmark molecule (all numbers made up, labelled so).

    Attributes
    ----------
    orientation : str
        How the molecule sits (invented).
    site_spacing_A : float
        Distance b between neighbouring sites, Å (invented, 2.5-3 Å).
    translation_barrier_eV : float
        Diffusion barrier W_x, eV (invented).
    rotation_barrier_eV : float or None
        Barrier to rotation about the surface normal, eV (invented; None for an atom).
    rotation_minima : int or None
        Minima per turn of that rotation (invented).
    rotor_symmetry_number : int or None
        Indistinguishable orientations per turn about the normal (follows from the orientation).
    normal_constant : int or None
        Index into the gas molecule's rotational constants (descending, as in
        :class:`adsorb.gas.GasMolecule`) of the constant whose axis is the
        surface normal; the moment about the normal is h/(8π² c B) of it.
    other_modes_cm : tuple of float
        Invented frequencies of the remaining external modes: the frustrated
        rotations about in-plane axes (tilts) and the stretch against the
        surface, cm^-1. Each must exceed the barrier-implied frequencies.
    """

    orientation: str
    site_spacing_A: float
    translation_barrier_eV: float
    rotation_barrier_eV: float | None
    rotation_minima: int | None
    rotor_symmetry_number: int | None
    normal_constant: int | None
    other_modes_cm: tuple


#: INVENTED sites (invented numbers; only the gas data above are real).
INVENTED_SITES = {
    "Ar": InventedSite("atom on a hollow of an invented square lattice", 3.0, 0.02, None, None, None, None,
                       (40.0,)),
    "N2": InventedSite("lying flat, axis along a lattice row (invented)", 2.8, 0.04, 0.02, 4, 2, 0, (80.0, 90.0)),
    "CO": InventedSite("lying flat (invented)", 2.8, 0.05, 0.03, 4, 1, 0, (90.0, 100.0)),
    "CO2": InventedSite("lying flat (invented)", 3.0, 0.06, 0.04, 4, 2, 0, (70.0, 90.0)),
    "H2O": InventedSite("molecular plane parallel to the surface, O over a cation (invented)", 2.8, 0.15, 0.08, 4,
                        1, 2, (350.0, 450.0, 400.0)),
    "NH3": InventedSite("C3 axis along the normal, N down (invented)", 2.8, 0.15, 0.03, 6, 3, 2,
                        (300.0, 300.0, 350.0)),
    "CH4": InventedSite("C3 axis along the normal, three H down (invented)", 2.8, 0.03, 0.01, 3, 3, 0,
                        (80.0, 80.0, 100.0)),
    "C2H6": InventedSite("C-C axis parallel to the surface, a C2 axis along the normal (invented)", 2.8, 0.05,
                         0.03, 4, 2, 1, (60.0, 80.0, 100.0)),
}


# ---------------------------------------------------------------------------
# (b) n-alkanes on MgO(100): published data and the invented surface
# ---------------------------------------------------------------------------
# ===========================================================================
# (b) n-alkanes on MgO(100)
# ===========================================================================
#: Published data (Tait, Dohnálek, Campbell, Kay, J. Chem. Phys. 2005, 122, 164708, and for n-butane
#: J. Chem. Phys. 2005, DOI 10.1063/1.1883629; abstracts read for the project's reference notes, check
#: values rows 5-7).
TAIT_2005 = {
    "source": ("S. L. Tait, Z. Dohnálek, C. T. Campbell, B. D. Kay, J. Chem. Phys. 2005, 122, 164708 "
               "(chain-length dependence); n-butane: J. Chem. Phys. 2005, DOI 10.1063/1.1883629"),
    "energy_intercept_kJ_mol": 6.5,        # E_d(N) = 6.5 + 7.1 N kJ/mol
    "energy_per_carbon_kJ_mol": 7.1,       # ± 0.2 per CH2
    "heating_rate_K_s": 0.6,
    "chain_lengths": (1, 2, 3, 4, 6, 8, 10),
    "log10_prefactor": {1: 13.1, 4: 15.7, 10: 19.1},   # s^-1; N = 1 and 10 "from about ... to"
    "log10_prefactor_uncertainty": {4: 1.6},
}


#: Chain lengths studied by Tait et al. (2005).
ALKANE_CHAIN_LENGTHS = TAIT_2005["chain_lengths"]


#: The MgO(100) model surface of the alkane benchmark. The site spacing is the Mg-Mg distance a/sqrt(2) of
#: rock-salt MgO with a = 4.21 Å (from memory); everything else is INVENTED.
ALKANE_SURFACE = {
    "site_spacing_A": 4.21 / np.sqrt(2.0),            # from memory (MgO lattice constant 4.21 Å)
    "translation_barrier_fraction": 0.10,             # invented: W_x = 0.10 E_d(N)
    "rotation_barrier_fraction": 0.05,                # invented: W_r = 0.05 E_d(N)
    "rotation_minima": 4,                             # square cation lattice (follows from the invented picture)
    "tilt_modes_cm": (80.0, 80.0),                    # invented: frustrated rotations about in-plane axes
    "surface_stretch_cm": 100.0,                      # invented: vibration against the surface
}
