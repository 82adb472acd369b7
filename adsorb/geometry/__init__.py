"""Molecular geometry from an :class:`ase.Atoms`: masses, inertia, shape, symmetry.

This is the geometry layer of adsorb (layer 3 of the design). It turns a
structure into the numbers the rotational and adsorbate models need. One
module per subject, every public name re-exported here:

* :mod:`~adsorb.geometry.molecule`: masses and centre of mass; principal
  moments of inertia and axes (molecules split across a periodic cell
  boundary are unwrapped first); the shape class (``'monatomic'``,
  ``'linear'`` or ``'nonlinear'``); rotational constants in cm^-1 from
  moments of inertia;
* :mod:`~adsorb.geometry.symmetry`: the rotational symmetry number, found by
  searching the proper rotations that map the molecule onto itself;
* :mod:`~adsorb.geometry.torsion`: for a torsion (internal rotation of a
  group about a bond), bonds from covalent radii, the rotating group and its
  axis, the moments of the two groups about the axis and the reduced moments
  of the torsion;
* :mod:`~adsorb.geometry.surface`: for an adsorbate on a slab, which atoms
  are the adsorbate (from the constraints), the surface normal, the moment
  of inertia about the normal, and the mass-weighted overlaps of normal
  modes with rigid in-plane translations and the rotation about the normal;
* :mod:`~adsorb.geometry.soft_modes`: which normal modes are the frustrated
  in-plane translations and the rotation about the normal;
* ``_common``: input checks and vector helpers shared by the above, and
  :func:`atom_indices`.

The methods, tolerances and limits are described in docs/methods-geometry.md.

Units at the boundary: lengths in Å, masses in amu, moments of inertia in
amu Å^2, rotational constants in cm^-1. Constants come from
:mod:`adsorb.constants` only. ASE is imported only in this package and in
:mod:`adsorb.io`.

Functions here are pure: they never modify the ``Atoms`` they are given.
"""

from adsorb.geometry._common import atom_indices
from adsorb.geometry.molecule import (
    centre_of_mass,
    masses_amu,
    molecular_shape,
    principal_moments,
    rotational_constants_cm,
    unwrapped_positions,
)
from adsorb.geometry.soft_modes import assign_soft_modes, lowest_modes
from adsorb.geometry.surface import (
    adsorbate_indices,
    inertia_about_normal,
    rigid_motion_overlaps,
    surface_normal,
)
from adsorb.geometry.symmetry import rotational_symmetry_number
from adsorb.geometry.torsion import (
    BOND_FACTOR,
    ON_AXIS_MOMENT_AMU_A2,
    bond_matrix,
    torsion_axis,
    torsion_moments,
)

__all__ = [
    "masses_amu",
    "centre_of_mass",
    "unwrapped_positions",
    "principal_moments",
    "molecular_shape",
    "rotational_symmetry_number",
    "rotational_constants_cm",
    "BOND_FACTOR",
    "ON_AXIS_MOMENT_AMU_A2",
    "atom_indices",
    "bond_matrix",
    "torsion_axis",
    "torsion_moments",
    "adsorbate_indices",
    "surface_normal",
    "inertia_about_normal",
    "rigid_motion_overlaps",
    "assign_soft_modes",
    "lowest_modes",
]
