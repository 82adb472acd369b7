"""Masses, unwrapped positions, centre of mass, principal moments, shape and rotational constants.

The rigid-molecule part of the geometry layer (:mod:`adsorb.geometry`):

* masses and centre of mass;
* principal moments of inertia and axes (molecules split across a periodic
  cell boundary are unwrapped first);
* the shape class: ``'monatomic'``, ``'linear'`` or ``'nonlinear'``;
* rotational constants in cm^-1 from moments of inertia.

The rotational symmetry number is in :mod:`adsorb.geometry.symmetry`. The
methods, tolerances and limits are described in docs/methods-geometry.md
§1-4 and §6.

Units at the boundary: lengths in Å, masses in amu, moments of inertia in
amu Å^2, rotational constants in cm^-1. Constants come from
:mod:`adsorb.constants` only. Functions here never modify the ``Atoms`` they
are given.
"""

from __future__ import annotations

import numpy as np

from adsorb import constants
from adsorb.errors import InputError
from adsorb.geometry._common import _check_atoms, _check_tolerance, _inertia_tensor


def masses_amu(atoms) -> np.ndarray:
    """Atomic masses of ``atoms`` in amu.

    Custom masses set with ``atoms.set_masses`` are honoured; otherwise these
    are ASE's default masses (IUPAC conventional atomic weights, see
    ``ase.data.atomic_masses``).

    Parameters
    ----------
    atoms : ase.Atoms
        The structure (at least one atom).

    Returns
    -------
    ndarray of shape (n_atoms,)
        Masses in amu (a new array; changing it does not change ``atoms``).

    Raises
    ------
    InputError
        If ``atoms`` is not a non-empty ``ase.Atoms`` or a mass is not
        positive and finite.
    """
    _check_atoms(atoms)
    m = np.array(atoms.get_masses(), dtype=float)
    bad = ~np.isfinite(m) | (m <= 0.0)
    if bad.any():
        i = int(np.flatnonzero(bad)[0])
        msg = f"atoms: mass of atom {i} ({atoms[i].symbol}) is {m[i]!r} amu; expected a positive finite mass"
        raise InputError(msg)
    return m


def _periodic_directions(atoms) -> np.ndarray:
    """Boolean mask of cell directions that are periodic AND have a real cell vector."""
    cell = np.asarray(atoms.cell[:], dtype=float)
    lengths = np.linalg.norm(cell, axis=1)
    return np.asarray(atoms.pbc, dtype=bool) & (lengths > 1e-8)


def unwrapped_positions(atoms) -> np.ndarray:
    """Cartesian positions (Å) with a molecule split by periodic wrapping made whole.

    If no cell direction is periodic (``atoms.pbc`` all False, or the periodic
    directions have zero-length cell vectors) the positions are returned as
    they are. Otherwise the atoms are joined into one piece: the minimum-image
    distances between all pairs are computed (``ase.geometry.find_mic``), a
    minimum spanning tree over those distances is built starting from atom 0,
    and each atom is placed at the minimum image of the bond vector from its
    parent in the tree. Atom 0 keeps its position. This is correct as long as
    every bond of the spanning tree is shorter than half the cell width in the
    periodic directions, which holds for any molecule in a sensibly sized cell,
    including molecules larger than half the cell.

    An intact molecule comes back unchanged (up to rounding).

    Parameters
    ----------
    atoms : ase.Atoms
        The structure (at least one atom).

    Returns
    -------
    ndarray of shape (n_atoms, 3)
        Positions in Å (a new array).

    Raises
    ------
    InputError
        If ``atoms`` is not a non-empty ``ase.Atoms``.
    """
    _check_atoms(atoms)
    pos = np.array(atoms.positions, dtype=float)
    periodic = _periodic_directions(atoms)
    n = len(pos)
    if n == 1 or not periodic.any():
        return pos

    from ase.geometry import find_mic
    from scipy.sparse.csgraph import breadth_first_order, minimum_spanning_tree

    cell = np.asarray(atoms.cell[:], dtype=float)
    diff = (pos[None, :, :] - pos[:, None, :]).reshape(-1, 3)  # r_j - r_i
    mic_vec, mic_len = find_mic(diff, cell, periodic)
    mic_vec = mic_vec.reshape(n, n, 3)
    dist = mic_len.reshape(n, n)
    # coincident atoms would give a zero edge weight, which csgraph treats as
    # "no edge"; shift all weights by a constant that does not change the tree
    weights = dist + 1.0
    np.fill_diagonal(weights, 0.0)
    tree = minimum_spanning_tree(weights)
    tree = tree + tree.T
    order, parent = breadth_first_order(tree, 0, directed=False, return_predecessors=True)
    out = pos.copy()
    for j in order[1:]:
        p = parent[j]
        out[j] = out[p] + mic_vec[p, j]
    return out


def centre_of_mass(atoms) -> np.ndarray:
    """Centre of mass in Å, of the molecule made whole if it was wrapped.

    Parameters
    ----------
    atoms : ase.Atoms
        The structure (at least one atom). Custom masses are honoured.

    Returns
    -------
    ndarray of shape (3,)
        Mass-weighted mean of :func:`unwrapped_positions`, in Å. For an intact
        (or non-periodic) structure this equals ``atoms.get_center_of_mass()``.

    Raises
    ------
    InputError
        If ``atoms`` is not a non-empty ``ase.Atoms``.
    """
    m = masses_amu(atoms)
    pos = unwrapped_positions(atoms)
    return m @ pos / m.sum()


def _principal(masses: np.ndarray, pos: np.ndarray):
    com = masses @ pos / masses.sum()
    rel = pos - com
    tensor = _inertia_tensor(masses, rel)
    evals, evecs = np.linalg.eigh(tensor)
    evals = np.clip(evals, 0.0, None)  # rounding can leave -1e-16 for a zero moment
    axes = evecs.T.copy()
    if np.linalg.det(axes) < 0.0:
        axes[2] = -axes[2]  # right-handed set
    return evals, axes, rel


def principal_moments(atoms):
    """Principal moments of inertia (amu Å^2) and principal axes.

    The inertia tensor is taken about the centre of mass, with the masses of
    :func:`masses_amu`, after :func:`unwrapped_positions` has joined a molecule
    split across a periodic boundary (ASE's own ``get_moments_of_inertia``
    ignores periodicity; a wrapped CO2 gives nonsense there).

    I_jk = sum_i m_i (|r_i|^2 delta_jk - r_ij r_ik) (common practice, e.g.
    Goldstein, *Classical Mechanics*).

    Parameters
    ----------
    atoms : ase.Atoms
        The molecule (at least one atom).

    Returns
    -------
    moments : ndarray of shape (3,)
        Principal moments in amu Å^2, ascending, never negative (rounding below
        zero is clipped to 0).
    axes : ndarray of shape (3, 3)
        Row ``k`` is the unit principal axis belonging to ``moments[k]``; the
        rows form a right-handed orthonormal set. For degenerate moments any
        orthonormal basis of the degenerate subspace is returned.

    Raises
    ------
    InputError
        If ``atoms`` is not a non-empty ``ase.Atoms``.
    """
    m = masses_amu(atoms)
    pos = unwrapped_positions(atoms)
    moments, axes, _ = _principal(m, pos)
    return moments, axes


def _shape_from_moments(n_atoms: int, moments: np.ndarray, tolerance: float) -> str:
    if n_atoms == 1:
        return "monatomic"
    if moments[2] <= 0.0:
        # several atoms all at one point: no meaningful shape
        msg = "atoms: all atoms sit at the same point (largest moment of inertia is 0); expected a real molecule"
        raise InputError(msg)
    if moments[0] / moments[2] < tolerance:
        return "linear"
    return "nonlinear"


def molecular_shape(atoms, *, tolerance: float = 1e-3) -> str:
    """Classify a molecule as ``'monatomic'``, ``'linear'`` or ``'nonlinear'``.

    A molecule of two or more atoms is linear when its smallest principal
    moment is below ``tolerance`` times its largest: I_min / I_max < tolerance.
    Exact-zero tests fail after a real relaxation; the relative test does not.
    For a triatomic like CO2 the ratio grows roughly as the square of the
    deviation from 180 degrees: one O moved 0.002 Å off the axis (179.90
    degrees) gives about 2e-7, a symmetric CO2 bent to 176 degrees 3.3e-4, to
    173 degrees about 1e-3, to 170 degrees 2.1e-3; H2O gives about 0.35.
    So the default 1e-3 calls a CO2 straighter than about 173 degrees
    linear.

    Parameters
    ----------
    atoms : ase.Atoms
        The molecule (at least one atom).
    tolerance : float, optional
        Relative tolerance on I_min / I_max (dimensionless), default 1e-3.

    Returns
    -------
    str
        ``'monatomic'`` for one atom, ``'linear'`` or ``'nonlinear'``.

    Raises
    ------
    InputError
        If ``atoms`` is not a non-empty ``ase.Atoms``, ``tolerance`` is not a
        positive number, or several atoms sit at one point.
    """
    tol = _check_tolerance(tolerance, "tolerance")
    moments, _ = principal_moments(atoms)
    return _shape_from_moments(len(atoms), moments, tol)


# ---------------------------------------------------------------------------
# rotational constants
# ---------------------------------------------------------------------------


def rotational_constants_cm(moments_amu_A2) -> np.ndarray:
    """Rotational constants B = h / (8 pi^2 c I) in cm^-1.

    Standard definition of the rotational constant (Herzberg, *Spectra of
    Diatomic Molecules*, 1950). A moment of exactly zero (the axis of a
    linear molecule, or any axis of an atom) gives ``inf`` without a warning;
    callers choose the moments they need (e.g. the largest one of a linear
    molecule). Tiny but non-zero moments give large finite constants: decide
    the shape with :func:`molecular_shape` first.

    Parameters
    ----------
    moments_amu_A2 : float or array_like
        Moments of inertia in amu Å^2, any shape, each >= 0.

    Returns
    -------
    ndarray
        Rotational constants in cm^-1, same shape as the input.

    Raises
    ------
    InputError
        If a moment is negative, NaN or infinite, or the input is not numeric.
    """
    try:
        moments = np.asarray(moments_amu_A2, dtype=float)
    except (TypeError, ValueError):
        msg = f"moments_amu_A2: expected numbers in amu Å^2, got {moments_amu_A2!r}"
        raise InputError(msg) from None
    if not np.all(np.isfinite(moments)) or np.any(moments < 0.0):
        msg = f"moments_amu_A2: expected finite moments >= 0 amu Å^2, got {moments.tolist()!r}"
        raise InputError(msg)
    # B [cm^-1] = h / (8 pi^2 c[cm/s] I[kg m^2])
    factor = constants.h / (8.0 * constants.pi**2 * constants.c * 100.0 * constants.amu_A2)
    out = np.full(moments.shape, np.inf)
    np.divide(factor, moments, out=out, where=moments > 0.0)
    return out
