"""An adsorbate on a slab: its atoms, the surface normal, its inertia about the normal, overlaps with rigid motions.

Part of the geometry layer (:mod:`adsorb.geometry`): which atoms are the
adsorbate (from the constraints), the surface normal, the moment of inertia
about the normal, and the mass-weighted overlaps of normal modes with the
rigid in-plane translations and the rotation about the normal. The choice of
modes from those overlaps is in :mod:`adsorb.geometry.soft_modes`. See
docs/methods-geometry.md §7-8.

Units: lengths in Å, masses in amu, moments of inertia in amu Å^2.
"""

from __future__ import annotations

import math

import numpy as np

from adsorb.errors import InputError
from adsorb.geometry._common import _check_atoms, atom_indices
from adsorb.geometry.molecule import masses_amu, unwrapped_positions


def _frozen_mask(atoms) -> np.ndarray:
    """True for atoms frozen by a FixAtoms, or by a FixCartesian/FixScaled whose mask is all True."""
    from ase.constraints import FixAtoms, FixCartesian, FixScaled

    frozen = np.zeros(len(atoms), dtype=bool)
    for c in atoms.constraints:
        if isinstance(c, FixAtoms):
            frozen[np.asarray(c.get_indices(), dtype=int)] = True
        elif isinstance(c, (FixCartesian, FixScaled)):
            index = np.atleast_1d(np.asarray(getattr(c, "index", getattr(c, "a", [])), dtype=int))
            mask = np.asarray(c.mask, dtype=bool)
            if mask.ndim == 1:
                if mask.all():
                    frozen[index] = True
            else:  # one row of flags per atom
                frozen[index[mask.all(axis=1)]] = True
    return frozen


def adsorbate_indices(atoms, indices=None) -> np.ndarray:
    """Indices of the adsorbate atoms in a slab + adsorbate structure.

    With ``indices`` given, those are checked and returned (sorted). Without,
    the adsorbate is every atom that is not frozen: an atom is frozen when a
    ``FixAtoms`` covers it, or when it is in a ``FixCartesian`` or
    ``FixScaled`` whose mask fixes all three directions. Partial masks, bond
    constraints and other constraints do not freeze an atom. (ASE's
    ``Vibrations`` and ``VibrationsData`` each use a different rule; see
    the maintainers' reference compilation ase-io.md §7.)

    Parameters
    ----------
    atoms : ase.Atoms
        The slab with its adsorbate (at least one atom).
    indices : sequence of int, optional
        Explicit adsorbate atom indices, each in 0 .. len(atoms) - 1, no
        repeats.

    Returns
    -------
    ndarray of int, shape (n_adsorbate,)
        Sorted atom indices.

    Raises
    ------
    InputError
        If ``atoms`` is not a non-empty ``ase.Atoms``, ``indices`` is empty,
        not integer, out of range or repeated, or (without ``indices``) the
        constraints leave no free atom or no frozen atom.
    """
    _check_atoms(atoms)
    n = len(atoms)
    if indices is not None:
        return np.sort(np.array(atom_indices(indices, n_atoms=n), dtype=int))
    frozen = _frozen_mask(atoms)
    if frozen.all():
        msg = f"atoms: all {n} atoms are frozen by constraints, so no adsorbate is left; pass indices= explicitly"
        raise InputError(msg)
    if not frozen.any():
        msg = "atoms: no atom is frozen (no FixAtoms), so the adsorbate cannot be told from the slab; pass indices= explicitly"
        raise InputError(msg)
    return np.flatnonzero(~frozen)


def surface_normal(atoms) -> np.ndarray:
    """Unit vector normal to the surface of a slab.

    The surface plane is spanned by the two periodic cell vectors: when
    exactly two of ``atoms.pbc`` are True (``ase.build`` slabs with vacuum
    give ``[True, True, False]``) the normal is the cross product of those two
    cell vectors; otherwise it is a1 x a2 (the usual convention that the
    vacuum lies along the third vector). It is **not** the third cell vector
    itself, which need not be perpendicular to the surface in a skewed cell.
    The sign is chosen so that the normal points along the remaining cell
    vector (towards the vacuum in the usual set-up). With no cell at all (all
    cell vectors zero) the normal is (0, 0, 1).

    Parameters
    ----------
    atoms : ase.Atoms
        The slab (at least one atom).

    Returns
    -------
    ndarray of shape (3,)
        Unit vector.

    Raises
    ------
    InputError
        If ``atoms`` is not a non-empty ``ase.Atoms``, or the two in-plane
        cell vectors are zero or parallel.
    """
    _check_atoms(atoms)
    cell = np.asarray(atoms.cell[:], dtype=float)
    if not np.any(np.linalg.norm(cell, axis=1) > 0.0):
        return np.array([0.0, 0.0, 1.0])
    pbc = np.asarray(atoms.pbc, dtype=bool)
    if pbc.sum() == 2:
        i, j = np.flatnonzero(pbc)
        k = int(np.flatnonzero(~pbc)[0])
    else:
        i, j, k = 0, 1, 2
    normal = np.cross(cell[i], cell[j])
    size = np.linalg.norm(normal)
    scale = np.linalg.norm(cell[i]) * np.linalg.norm(cell[j])
    if scale == 0.0 or size <= 1e-8 * scale:
        msg = f"atoms: cell vectors a{i + 1} and a{j + 1} are zero or parallel; expected two in-plane cell vectors to define the surface normal"
        raise InputError(msg)
    normal = normal / size
    if normal @ cell[k] < 0.0:
        normal = -normal
    return normal


def _check_normal(normal, atoms) -> np.ndarray:
    if normal is None:
        return surface_normal(atoms)
    try:
        n = np.asarray(normal, dtype=float)
    except (TypeError, ValueError):
        n = None
    if n is None or n.shape != (3,) or not np.all(np.isfinite(n)) or np.linalg.norm(n) == 0.0:
        msg = f"normal: expected a non-zero 3-vector, got {normal!r}"
        raise InputError(msg)
    return n / np.linalg.norm(n)


def _adsorbate_frame(atoms, indices, normal):
    """Masses, positions relative to the adsorbate COM, and the unit normal."""
    idx = adsorbate_indices(atoms, indices)
    n = _check_normal(normal, atoms)
    sub = atoms[idx]
    m = masses_amu(sub)
    pos = unwrapped_positions(sub)
    rel = pos - m @ pos / m.sum()
    return idx, m, rel, n


def inertia_about_normal(atoms, indices=None, normal=None) -> float:
    """Moment of inertia (amu Å^2) of the adsorbate about the surface normal through its centre of mass.

    I = sum_i m_i |r_i - (r_i . n) n|^2 with r_i measured from the centre of
    mass of the adsorbate atoms alone (common practice; this is the moment
    the hindered rotor of Sprowl, Campbell and Árnadóttir, J. Phys. Chem. C
    120, 9719 (2016) uses). An adsorbate split across a periodic boundary of
    the slab is joined first (:func:`unwrapped_positions`).

    Parameters
    ----------
    atoms : ase.Atoms
        Slab with adsorbate (or the adsorbate alone with ``indices``).
    indices : sequence of int, optional
        Adsorbate atoms; default: the atoms :func:`adsorbate_indices` picks
        from the constraints.
    normal : array_like of shape (3,), optional
        Surface normal (need not be normalised); default :func:`surface_normal`.

    Returns
    -------
    float
        Moment of inertia in amu Å^2 (0 for one atom or atoms on one line
        along the normal).

    Raises
    ------
    InputError
        For bad ``atoms``, ``indices`` or ``normal``.
    """
    _, m, rel, n = _adsorbate_frame(atoms, indices, normal)
    perp = rel - np.outer(rel @ n, n)
    return float(np.dot(m, np.einsum("ij,ij->i", perp, perp)))


#: atoms closer than this to the rotation axis (Å) count as lying on it, so
#: a single atom or an upright linear adsorbate has no rotation about the normal
_ON_AXIS_A = 1e-6


def _in_plane_directions(atoms, n: np.ndarray):
    """Two orthonormal in-plane unit vectors: e1 along the projection of a1 (or x), e2 = n x e1."""
    cell = np.asarray(atoms.cell[:], dtype=float)
    for trial in (cell[0], np.array([1.0, 0.0, 0.0]), np.array([0.0, 1.0, 0.0])):
        v = trial - (trial @ n) * n
        if np.linalg.norm(v) > 1e-6 * max(np.linalg.norm(trial), 1e-300):
            e1 = v / np.linalg.norm(v)
            return e1, np.cross(n, e1)
    raise AssertionError("unreachable: x and y cannot both be parallel to a unit normal")


def rigid_motion_overlaps(atoms, indices, mode_vectors, normal=None) -> np.ndarray:
    """Squared overlaps of normal modes with rigid in-plane translations and rotation about the normal.

    Normal modes are orthonormal in the mass-weighted metric: with Cartesian
    displacements d_i of atom i, the mass-weighted vector is q_i = sqrt(m_i) d_i
    (Wilson, Decius and Cross, *Molecular Vibrations*, 1955). ASE's
    ``VibrationsData.get_modes()`` gives Cartesian displacements (mass-weighted
    unit eigenvectors divided by sqrt(m)), so they are multiplied by sqrt(m)
    here and normalised. The rigid motions of the adsorbate atoms, in the same
    metric and normalised, are

    * translation along e1 and along e2 (in-plane, e1 along the projection of
      the first cell vector, e2 = n x e1): q_i = sqrt(m_i) e / sqrt(M);
    * rotation about the normal through the adsorbate's centre of mass:
      q_i = sqrt(m_i) n x (r_i - R_com) / sqrt(I_n).

    These three vectors are mutually orthogonal. The result for mode k is
    (q_k . t)^2 for each, so each entry is in [0, 1] and each row sums to at
    most 1. If every adsorbate atom lies within 1e-6 Å of the normal through
    the centre of mass (one atom, or an upright linear adsorbate) there is no
    rotation and that column is 0.

    Parameters
    ----------
    atoms : ase.Atoms
        Slab with adsorbate (or the adsorbate alone).
    indices : sequence of int or None
        Adsorbate atoms the modes refer to; None: :func:`adsorbate_indices`.
    mode_vectors : array_like, shape (n_modes, n_indices, 3)
        Cartesian displacement vectors of the adsorbate atoms (any
        normalisation, real). Shape (n_modes, len(atoms), 3) is also accepted
        (the adsorbate rows are taken, as from ``get_modes(all_atoms=True)``),
        and so is (n_modes, 3 * n_indices).
    normal : array_like of shape (3,), optional
        Surface normal; default :func:`surface_normal`.

    Returns
    -------
    ndarray of shape (n_modes, 3)
        Columns: translation along e1, translation along e2, rotation about
        the normal. Dimensionless, in [0, 1].

    Raises
    ------
    InputError
        For bad ``atoms``, ``indices`` or ``normal``, mode vectors of the
        wrong shape, not finite, complex with an imaginary part, or zero.
    """
    idx, m, rel, n = _adsorbate_frame(atoms, indices, normal)
    k = len(idx)
    try:
        modes = np.asarray(mode_vectors)
    except (TypeError, ValueError):
        modes = None
    if modes is None or not (np.issubdtype(modes.dtype, np.number)):
        msg = f"mode_vectors: expected a numeric array of shape (n_modes, {k}, 3), got {type(mode_vectors).__name__}"
        raise InputError(msg)
    if np.iscomplexobj(modes):
        if np.abs(modes.imag).max(initial=0.0) > 1e-12 * max(np.abs(modes.real).max(initial=0.0), 1e-300):
            msg = "mode_vectors: got complex displacements with non-zero imaginary parts; expected real vectors"
            raise InputError(msg)
        modes = modes.real
    modes = modes.astype(float)
    if modes.ndim == 2 and modes.shape[1] == 3 * k:
        modes = modes.reshape(len(modes), k, 3)
    if modes.ndim == 3 and modes.shape[1:] == (len(atoms), 3) and modes.shape[1] != k:
        modes = modes[:, idx, :]
    if modes.ndim != 3 or modes.shape[1:] != (k, 3) or len(modes) == 0:
        msg = f"mode_vectors: got shape {modes.shape}, expected (n_modes, {k}, 3) for {k} adsorbate atoms"
        raise InputError(msg)
    if not np.all(np.isfinite(modes)):
        msg = "mode_vectors: got NaN or infinite displacements; expected finite numbers"
        raise InputError(msg)
    q = (modes * np.sqrt(m)[None, :, None]).reshape(len(modes), 3 * k)
    norms = np.linalg.norm(q, axis=1)
    if np.any(norms == 0.0):
        bad = int(np.flatnonzero(norms == 0.0)[0])
        msg = f"mode_vectors: mode {bad} is zero on every adsorbate atom; expected a displacement"
        raise InputError(msg)
    q = q / norms[:, None]

    e1, e2 = _in_plane_directions(atoms, n)
    sqrt_m = np.sqrt(m)[:, None]
    total = m.sum()
    t1 = (sqrt_m * e1).ravel() / math.sqrt(total)
    t2 = (sqrt_m * e2).ravel() / math.sqrt(total)
    arm = np.cross(n, rel)  # lever arm of each atom about the normal through the COM, Å
    out = np.empty((len(q), 3))
    out[:, 0] = (q @ t1) ** 2
    out[:, 1] = (q @ t2) ** 2
    if np.linalg.norm(arm, axis=1).max() > _ON_AXIS_A:
        rot = (sqrt_m * arm).ravel()
        out[:, 2] = (q @ (rot / np.linalg.norm(rot))) ** 2
    else:  # one atom, or all atoms on the axis: no rotation exists
        out[:, 2] = 0.0
    return np.clip(out, 0.0, 1.0)
