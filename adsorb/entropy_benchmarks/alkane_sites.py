"""The n-alkanes of benchmark (b) and their sites on the model MgO(100) surface.

Structures: the G2 set of ``ase.build.molecule`` for n <= 4, a zig-zag
all-trans chain built here (:func:`zigzag_alkane`) beyond. :func:`alkane_site`
adds the mass, the symmetry numbers and the moment about the normal
(:mod:`adsorb.geometry`), the desorption energy E_d(N) of S. L. Tait,
Z. Dohnálek, C. T. Campbell, B. D. Kay, J. Chem. Phys. 2005, 122, 164708, and
the **invented** barriers and modes of :data:`ALKANE_SURFACE`, with the
barrier-implied frequencies of L. H. Sprowl, C. T. Campbell, L. Árnadóttir,
J. Phys. Chem. C 2016, 120, 9719.

The functions that build structures (:func:`zigzag_alkane`,
:func:`alkane_atoms`) do so through :mod:`adsorb.io` (ASE is imported only
there and in :mod:`adsorb.geometry`). Import the names from
:mod:`adsorb.entropy_benchmarks`.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from adsorb import constants as C
from adsorb.entropy_benchmarks.data import ALKANE_SURFACE, TAIT_2005
from adsorb.errors import InputError
from adsorb.partition.hindered import rotor_frequency_cm, translator_frequency_cm


_G2_ALKANES = {1: "CH4", 2: "C2H6", 3: "C3H8", 4: "trans-butane"}


def _chain_length(n):
    if isinstance(n, bool) or not isinstance(n, (int, np.integer)) or int(n) < 1:
        msg = f"chain length n: expected an integer >= 1 (carbon atoms), got {n!r}"
        raise InputError(msg)
    return int(n)


def zigzag_alkane(n: int, *, cc_A: float = 1.53, ch_A: float = 1.09, ccc_deg: float = 112.0,
                  hch_deg: float = 107.0, hcc_deg: float = 110.9):
    """An all-trans (zig-zag) n-alkane C_nH_(2n+2) built from bond lengths and angles, n >= 3.

    The carbon backbone lies in the xy plane along x; each CH2 has its two H
    in the plane through the C perpendicular to the backbone, symmetric about
    the bisector of the C-C-C angle; each terminal CH3 is staggered, with one H
    in the backbone plane anti to the next-but-one carbon. The default bond
    lengths and angles are typical alkane values (common practice; from
    memory), and reproduce the principal moments of the G2 propane and
    trans-butane of ``ase.build.molecule`` to better than 1 %.

    Parameters
    ----------
    n : int
        Number of carbon atoms (>= 3).
    cc_A, ch_A : float, optional
        C-C and C-H bond lengths in Å.
    ccc_deg, hch_deg, hcc_deg : float, optional
        C-C-C, H-C-H (methylene) and H-C-C (methyl) angles in degrees.

    Returns
    -------
    ase.Atoms
        Carbons first (along the chain), then the hydrogens.

    Raises
    ------
    InputError
        n < 3 or non-positive lengths/angles.
    """
    n = _chain_length(n)
    if n < 3:
        msg = f"zigzag_alkane n: expected >= 3 carbon atoms (use ase.build.molecule for CH4 and C2H6), got {n}"
        raise InputError(msg)
    for label, value in (("cc_A", cc_A), ("ch_A", ch_A), ("ccc_deg", ccc_deg), ("hch_deg", hch_deg),
                         ("hcc_deg", hcc_deg)):
        if not (np.isfinite(value) and value > 0):
            msg = f"zigzag_alkane {label}: expected a finite number > 0, got {value!r}"
            raise InputError(msg)
    from adsorb.io import atoms_from_symbols

    half = np.radians(ccc_deg) / 2.0
    carbons = np.array([[i * cc_A * np.sin(half), (i % 2) * cc_A * np.cos(half), 0.0] for i in range(n)])
    up = np.array([0.0, 0.0, 1.0])
    hydrogens = []
    a = np.radians(hch_deg) / 2.0
    for i in range(1, n - 1):
        bisector = -((carbons[i - 1] - carbons[i]) + (carbons[i + 1] - carbons[i])) / cc_A
        bisector /= np.linalg.norm(bisector)
        for sign in (1.0, -1.0):
            hydrogens.append(carbons[i] + ch_A * (np.cos(a) * bisector + sign * np.sin(a) * up))
    g = np.radians(hcc_deg)
    for end, neighbour, beyond in ((0, 1, 2), (n - 1, n - 2, n - 3)):
        v = carbons[neighbour] - carbons[end]
        v /= np.linalg.norm(v)
        w = carbons[beyond] - carbons[neighbour]
        w -= (w @ v) * v
        e1 = -w / np.linalg.norm(w)          # anti to the next-but-one carbon
        e2 = np.cross(v, e1)
        for phi in (0.0, 2.0 * np.pi / 3.0, -2.0 * np.pi / 3.0):
            hydrogens.append(carbons[end] + ch_A * (np.cos(g) * v + np.sin(g) * (np.cos(phi) * e1 + np.sin(phi) * e2)))
    return atoms_from_symbols(f"C{n}H{2 * n + 2}", np.vstack([carbons, np.array(hydrogens)]))


def alkane_atoms(n: int):
    """Structure of the n-alkane: the G2 geometry of ``ase.build.molecule`` for n <= 4, else :func:`zigzag_alkane`.

    Returns
    -------
    (ase.Atoms, str)
        The structure and where it comes from.
    """
    n = _chain_length(n)
    if n in _G2_ALKANES:
        from adsorb.io import named_molecule

        return named_molecule(_G2_ALKANES[n]), f"ase.build.molecule({_G2_ALKANES[n]!r}) (G2 set)"
    return zigzag_alkane(n), "zig-zag all-trans chain built here"


@dataclass(frozen=True)
class AlkaneSite:
    """The n-alkane on the model MgO(100) surface (eV, Å, amu, amu Å^2, cm^-1).

    Attributes
    ----------
    n : int
    formula, geometry_source : str
    mass_amu : float
    external_symmetry_number : int
        Rotational symmetry number of the gas molecule (detected from the geometry).
    rotational_constants_cm : ndarray
        (A, B, C) of the geometry.
    normal_symmetry_number : int
        Indistinguishable orientations per turn about the surface normal:
        2 for CH4 (a C2 axis along the normal), C2H6 (one of its C2 axes) and
        the even chains (C2h, the C2 axis perpendicular to the carbon plane,
        which lies flat); 1 for the odd chains (C2v, the C2 axis lies in the
        carbon plane).
    inertia_normal_amu_A2 : float
        Moment about the normal: the largest principal moment (the axis
        perpendicular to the carbon plane of a flat-lying chain).
    desorption_energy_eV : float
        E_d(N) of Tait et al. (2005).
    translation_barrier_eV, rotation_barrier_eV : float
        Invented fractions of E_d (:data:`ALKANE_SURFACE`).
    site_spacing_A : float
    rotation_minima : int
        Minima per turn of the rotation about the normal.
    frequencies_cm : tuple
        External modes by slot: two translations and the rotation about the
        normal at their barrier-implied frequencies, then the two invented
        tilts and the surface stretch.
    """

    n: int
    formula: str
    geometry_source: str
    mass_amu: float
    external_symmetry_number: int
    rotational_constants_cm: np.ndarray
    normal_symmetry_number: int
    inertia_normal_amu_A2: float
    desorption_energy_eV: float
    translation_barrier_eV: float
    rotation_barrier_eV: float
    site_spacing_A: float
    rotation_minima: int
    frequencies_cm: tuple


def alkane_site(n: int, *, surface=None) -> AlkaneSite:
    """The n-alkane on the model MgO(100) surface (geometry, symmetry, invented barriers and modes).

    Parameters
    ----------
    n : int
        Carbon atoms (>= 1).
    surface : mapping, optional
        Values replacing entries of :data:`ALKANE_SURFACE` (same keys), e.g.
        for a sensitivity study.

    Raises
    ------
    InputError
        n not an integer >= 1, or an unknown or non-positive ``surface`` entry.
    """
    from adsorb import geometry

    n = _chain_length(n)
    surf = dict(ALKANE_SURFACE)
    for key, value in dict(surface or {}).items():
        if key not in ALKANE_SURFACE:
            msg = f"alkane_site surface key {key!r} is unknown; expected one of {', '.join(ALKANE_SURFACE)}"
            raise InputError(msg)
        values = np.atleast_1d(np.asarray(value, dtype=float))
        if values.shape != np.atleast_1d(ALKANE_SURFACE[key]).shape or not np.all(np.isfinite(values) & (values > 0)):
            msg = f"alkane_site surface[{key!r}]: expected positive value(s) like {ALKANE_SURFACE[key]!r}, got {value!r}"
            raise InputError(msg)
        if key == "rotation_minima" and not float(values[0]).is_integer():
            msg = f"alkane_site surface['rotation_minima']: expected a positive integer, got {value!r}"
            raise InputError(msg)
        surf[key] = tuple(float(v) for v in values) if isinstance(ALKANE_SURFACE[key], tuple) else float(values[0])
    atoms, source = alkane_atoms(n)
    moments, _ = geometry.principal_moments(atoms)
    mass = float(geometry.masses_amu(atoms).sum())
    sigma = int(geometry.rotational_symmetry_number(atoms))
    energy = C.from_kj_per_mol(TAIT_2005["energy_intercept_kJ_mol"] + TAIT_2005["energy_per_carbon_kJ_mol"] * n)
    b = float(surf["site_spacing_A"])
    w_t = surf["translation_barrier_fraction"] * energy
    w_r = surf["rotation_barrier_fraction"] * energy
    inertia = float(moments[2])
    nu_t = float(translator_frequency_cm(mass, w_t, b))
    nu_r = float(rotor_frequency_cm(inertia, w_r, surf["rotation_minima"]))
    others = tuple(surf["tilt_modes_cm"]) + (surf["surface_stretch_cm"],)
    return AlkaneSite(
        n=n, formula=str(atoms.get_chemical_formula(mode="hill")), geometry_source=source, mass_amu=mass,
        external_symmetry_number=sigma,
        rotational_constants_cm=np.asarray(geometry.rotational_constants_cm(moments), dtype=float),
        normal_symmetry_number=2 if (n <= 2 or n % 2 == 0) else 1, inertia_normal_amu_A2=inertia,
        desorption_energy_eV=float(energy), translation_barrier_eV=float(w_t), rotation_barrier_eV=float(w_r),
        site_spacing_A=b, rotation_minima=int(round(surf["rotation_minima"])),
        frequencies_cm=(nu_t, nu_t, nu_r) + others)
