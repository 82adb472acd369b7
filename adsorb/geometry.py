"""Molecular geometry from an :class:`ase.Atoms`: masses, inertia, shape, symmetry.

This is the geometry layer of adsorb (layer 3 of the design). It turns a
structure into the numbers the rotational and adsorbate models need:

* masses and centre of mass;
* principal moments of inertia and axes (molecules split across a periodic
  cell boundary are unwrapped first);
* the shape class: ``'monatomic'``, ``'linear'`` or ``'nonlinear'``;
* the rotational symmetry number, found by searching the proper rotations
  that map the molecule onto itself;
* rotational constants in cm^-1 from moments of inertia;
* for a torsion (internal rotation of a group about a bond): bonds from
  covalent radii, the rotating group and its axis, the moments of the two
  groups about the axis and the reduced moments of the torsion;
* for an adsorbate on a slab: which atoms are the adsorbate (from the
  constraints), the surface normal, the moment of inertia about the normal,
  and which normal modes are the frustrated in-plane translations and the
  rotation about the normal (mass-weighted overlaps with rigid motions).

The methods, tolerances and limits are described in docs/methods-geometry.md.

Units at the boundary: lengths in Å, masses in amu, moments of inertia in
amu Å^2, rotational constants in cm^-1. Constants come from
:mod:`adsorb.constants` only.

Functions here are pure: they never modify the ``Atoms`` they are given.
"""

from __future__ import annotations

import math
from itertools import combinations

import numpy as np

from adsorb import constants
from adsorb.errors import InputError

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


# ---------------------------------------------------------------------------
# input checks and positions
# ---------------------------------------------------------------------------


def _check_atoms(atoms, name: str = "atoms"):
    """Raise InputError unless ``atoms`` is a non-empty ase.Atoms."""
    from ase import Atoms

    if not isinstance(atoms, Atoms):
        msg = f"{name}: expected an ase.Atoms object, got {type(atoms).__name__}"
        raise InputError(msg)
    if len(atoms) == 0:
        msg = f"{name}: the Atoms object is empty (0 atoms); expected at least one atom"
        raise InputError(msg)


def _check_tolerance(value, name: str) -> float:
    try:
        tol = float(value)
    except (TypeError, ValueError):
        msg = f"{name}: expected a positive number, got {value!r}"
        raise InputError(msg) from None
    if not math.isfinite(tol) or tol <= 0.0:
        msg = f"{name}: expected a positive finite number, got {value!r}"
        raise InputError(msg)
    return tol


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


def _inertia_tensor(masses: np.ndarray, rel: np.ndarray) -> np.ndarray:
    """Inertia tensor (amu Å^2) of point masses at positions ``rel`` (Å, about the origin)."""
    r2 = np.einsum("ij,ij->i", rel, rel)
    return np.eye(3) * np.dot(masses, r2) - np.einsum("i,ij,ik->jk", masses, rel, rel)


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
# rotational symmetry number
# ---------------------------------------------------------------------------


def _equivalence_classes(atoms, masses: np.ndarray) -> np.ndarray:
    """Integer label per atom: same label = same element AND same mass (isotopes differ)."""
    keys = list(zip(atoms.numbers.tolist(), np.round(masses, 6).tolist()))
    lookup: dict = {}
    return np.array([lookup.setdefault(k, len(lookup)) for k in keys], dtype=int)


def _rotation_matrix(axis: np.ndarray, angle: float) -> np.ndarray:
    """Proper rotation by ``angle`` (rad) about unit vector ``axis`` (Rodrigues formula)."""
    x, y, z = axis
    k = np.array([[0.0, -z, y], [z, 0.0, -x], [-y, x, 0.0]])
    return np.eye(3) + math.sin(angle) * k + (1.0 - math.cos(angle)) * (k @ k)


class _Matcher:
    """Finds the atom permutation an orthogonal 3x3 operation induces, within a tolerance."""

    def __init__(self, rel: np.ndarray, labels: np.ndarray, tolerance: float):
        self.rel = rel
        self.labels = labels
        self.tol = tolerance
        self.same = labels[:, None] == labels[None, :]
        # probe atoms for a cheap first rejection: the farthest atom of each class
        radii = np.linalg.norm(rel, axis=1)
        probes = []
        for lab in np.unique(labels):
            members = np.flatnonzero(labels == lab)
            probes.append(members[np.argmax(radii[members])])
        self.probes = np.array(probes, dtype=int)

    def permutation(self, op: np.ndarray):
        """``p`` with op(r_i) within tolerance of r_p[i] (same class), or None if there is none."""
        rel, tol = self.rel, self.tol
        # stage 1: the probe atoms must land on an atom of their own class
        moved = rel[self.probes] @ op.T
        d = np.linalg.norm(moved[:, None, :] - rel[None, :, :], axis=2)
        d = np.where(self.same[self.probes], d, np.inf)
        if d.min(axis=1).max() > tol:
            return None
        # stage 2: every atom, as a one-to-one matching within the tolerance
        moved = rel @ op.T
        d = np.linalg.norm(moved[:, None, :] - rel[None, :, :], axis=2)
        d = np.where(self.same, d, np.inf)
        nearest = d.argmin(axis=1)
        if d[np.arange(len(rel)), nearest].max() > tol:
            return None
        if len(np.unique(nearest)) == len(rel):
            return nearest
        # two images closer than the tolerance to one atom: solve the assignment
        from scipy.optimize import linear_sum_assignment

        cost = np.where(np.isfinite(d), d, 1e6)
        rows, cols = linear_sum_assignment(cost)
        if cost[rows, cols].max() > tol:
            return None
        perm = np.empty(len(rel), dtype=int)
        perm[rows] = cols
        return perm

    def fits_proper_rotation(self, perm: np.ndarray) -> bool:
        """True when some proper rotation maps every r_i within tolerance of r_perm[i] (Kabsch fit)."""
        x, y = self.rel, self.rel[perm]
        u, _, vt = np.linalg.svd(x.T @ y)
        d = np.sign(np.linalg.det(vt.T @ u.T)) or 1.0
        rot = vt.T @ np.diag([1.0, 1.0, d]) @ u.T
        return bool(np.linalg.norm(x @ rot.T - y, axis=1).max() <= self.tol)


def _candidate_axes(rel: np.ndarray, labels: np.ndarray, axes: np.ndarray, tol: float) -> np.ndarray:
    """Unit vectors that contain every possible proper rotation axis of the molecule.

    Every rotation axis through the centre of mass either passes through an
    atom (r_i), through the midpoint of two equivalent atoms a C2 swaps
    (r_i + r_j), is normal to the circle of three equivalent atoms an
    n >= 3 axis permutes ((r_j - r_i) x (r_k - r_i), with i fixed per class),
    or is a principal axis (the normal of a planar molecule). Plane normals of
    pairs (r_i x r_j) are added as well.
    """
    small = max(tol, 1e-6)
    radii = np.linalg.norm(rel, axis=1)
    cands = [axes]
    cands.append(rel[radii > small])
    for lab in np.unique(labels):
        members = np.flatnonzero(labels == lab)
        if len(members) < 2:
            continue
        i, j = np.array(list(combinations(members, 2))).T
        cands.append(rel[i] + rel[j])
        cands.append(np.cross(rel[i], rel[j]))
        off = members[radii[members] > small]
        if len(off) >= 3:
            i0 = off[0]
            same_r = off[1:][np.abs(radii[off[1:]] - radii[i0]) <= 2.0 * tol]
            if len(same_r) >= 2:
                j, k = np.array(list(combinations(same_r, 2))).T
                cands.append(np.cross(rel[j] - rel[i0], rel[k] - rel[i0]))
    v = np.concatenate(cands, axis=0)
    norms = np.linalg.norm(v, axis=1)
    v = v[norms > 1e-8] / norms[norms > 1e-8, None]
    # sign convention: largest |component| positive, then drop near-duplicates
    idx = np.argmax(np.abs(v), axis=1)
    v = v * np.sign(v[np.arange(len(v)), idx])[:, None]
    return np.unique(np.round(v, 9), axis=0)


def _axis_orders(axis: np.ndarray, rel: np.ndarray, labels: np.ndarray, tol: float) -> list[int]:
    """Possible orders n >= 2 of a rotation about ``axis``, largest first.

    The off-axis atoms of each class fall into orbits of exactly n atoms, so n
    divides the number of off-axis atoms of every class.
    """
    perp = rel - np.outer(rel @ axis, axis)
    off = np.linalg.norm(perp, axis=1) > tol
    counts = [int(np.count_nonzero(off & (labels == lab))) for lab in np.unique(labels)]
    g = 0
    for c in counts:
        g = math.gcd(g, c)
    if g < 2:
        return []
    return [n for n in range(g, 1, -1) if g % n == 0]


def _rotation_group(rel: np.ndarray, labels: np.ndarray, axes: np.ndarray, tol: float, max_order: int = 240):
    """Distinct proper rotations of a nonlinear molecule, as atom permutations (identity included).

    A proper rotation of a nonlinear molecule is fixed by the permutation of
    atoms it induces, so operations are collected (and deduplicated exactly)
    as permutations. Rotations found on candidate axes generate the group;
    the closure under composition is formed and every composed permutation is
    checked to be realised by a proper rotation within the tolerance.
    """
    matcher = _Matcher(rel, labels, tol)
    n_atoms = len(rel)
    generators: dict = {}
    for axis in _candidate_axes(rel, labels, axes, tol):
        for n in _axis_orders(axis, rel, labels, tol):
            perm = matcher.permutation(_rotation_matrix(axis, 2.0 * math.pi / n))
            if perm is not None:
                # the rotations about one axis form a cyclic group: the largest
                # working n generates them all
                generators.setdefault(tuple(perm.tolist()), perm)
                break
    identity = np.arange(n_atoms)
    group = {tuple(identity.tolist()): identity}
    queue = [identity]
    while queue:
        x = queue.pop()
        for g in generators.values():
            y = g[x]
            key = tuple(y.tolist())
            if key in group:
                continue
            if not matcher.fits_proper_rotation(y):
                msg = (
                    f"tolerance: the rotations found at tolerance {tol} Å do not form a group "
                    "(a product of two of them does not fit); expected a tighter tolerance "
                    "or a less distorted geometry"
                )
                raise InputError(msg)
            group[key] = y
            queue.append(y)
            if len(group) > max_order:
                msg = (
                    f"tolerance: more than {max_order} rotations map the molecule onto itself "
                    f"at tolerance {tol} Å; expected a smaller tolerance"
                )
                raise InputError(msg)
    return list(group.values())


def rotational_symmetry_number(atoms, *, tolerance: float = 0.05, shape_tolerance: float = 1e-3) -> int:
    """Rotational symmetry number: the number of proper rotations that leave the molecule unchanged.

    The symmetry number sigma is the order of the rotational subgroup of the
    molecule's point group (common practice; e.g. Herzberg, *Infrared and
    Raman Spectra*, 1945, and McQuarrie, *Statistical Mechanics*, 1976). An
    operation counts when it moves every atom within ``tolerance`` (Å) of an
    atom of the same element and the same mass (so an isotopically
    substituted atom, set with ``atoms.set_masses``, breaks the symmetry).

    * one atom: 1;
    * linear (see :func:`molecular_shape` with ``shape_tolerance``): 2 when
      inversion through the centre of mass maps the molecule onto itself
      (then a C2 perpendicular to the axis exists), or, for a molecule that
      is linear only within the shape tolerance, when a C2 perpendicular to
      its axis does; else 1;
    * nonlinear: the positions are taken about the centre of mass (after
      :func:`unwrapped_positions`); candidate axes are the principal axes, the
      atom position vectors, the midpoints of pairs of equivalent atoms, the
      normals of planes through the centre and pairs of equivalent atoms, and
      the normals of triangles of equivalent atoms at equal distance from the
      centre. For each axis the orders n compatible with the atom counts
      (n divides the number of off-axis atoms of every class) are tried from
      the largest down; the first rotation by 2 pi / n that maps the molecule
      onto itself gives all n - 1 rotations about that axis. Each operation
      is recorded as the permutation of atoms it induces (for a nonlinear
      molecule this fixes the rotation, so duplicates found from slightly
      different noisy axes are merged exactly); the permutations are closed
      under composition, each product being checked to be a proper rotation
      within ``tolerance`` (Kabsch fit), and the size of the group is
      returned. See docs/methods-geometry.md.

    Parameters
    ----------
    atoms : ase.Atoms
        The molecule (at least one atom).
    tolerance : float, optional
        Largest allowed displacement, in Å, between an atom's image and the
        atom it is matched with, default 0.05 Å. Must be less than half the
        shortest interatomic distance.
    shape_tolerance : float, optional
        Relative tolerance passed to :func:`molecular_shape`, default 1e-3.

    Returns
    -------
    int
        The rotational symmetry number (1 or more).

    Raises
    ------
    InputError
        If ``atoms`` is not a non-empty ``ase.Atoms``, a tolerance is not a
        positive number, ``tolerance`` is not below half the shortest
        interatomic distance, or the tolerance is so loose that the operations
        found do not form a group of at most 240 rotations.
    """
    tol = _check_tolerance(tolerance, "tolerance")
    shape_tol = _check_tolerance(shape_tolerance, "shape_tolerance")
    m = masses_amu(atoms)
    pos = unwrapped_positions(atoms)
    moments, axes, rel = _principal(m, pos)
    shape = _shape_from_moments(len(atoms), moments, shape_tol)
    labels = _equivalence_classes(atoms, m)
    if shape == "monatomic":
        return 1
    dist = np.linalg.norm(rel[:, None, :] - rel[None, :, :], axis=2)
    shortest = float(dist[np.triu_indices(len(rel), 1)].min())
    if tol >= 0.5 * shortest:
        msg = (
            f"tolerance: got {tol} Å, but the shortest interatomic distance is {shortest:.4g} Å; "
            f"expected less than half of it ({0.5 * shortest:.4g} Å) so that atoms match unambiguously"
        )
        raise InputError(msg)
    matcher = _Matcher(rel, labels, tol)
    if shape == "linear":
        return 2 if _has_perpendicular_twofold(rel, labels, axes, matcher) else 1
    return len(_rotation_group(rel, labels, axes, tol))


def _has_perpendicular_twofold(rel, labels, axes, matcher) -> bool:
    """For a (nearly) linear molecule: does inversion or a C2 perpendicular to its axis map it onto itself?

    For an exactly linear molecule the two are equivalent. For one that is
    linear only within the shape tolerance (slightly bent), the C2 lies along
    the bisector: a principal axis perpendicular to the line, or the
    perpendicular part of the midpoint of two equivalent atoms.
    """
    if matcher.permutation(-np.eye(3)) is not None:
        return True
    line = axes[0]
    cands = [axes[1], axes[2]]
    for lab in np.unique(labels):
        members = np.flatnonzero(labels == lab)
        for i, j in combinations(members, 2):
            v = rel[i] + rel[j]
            cands.append(v - (v @ line) * line)
    for v in cands:
        size = np.linalg.norm(v)
        if size > 1e-8 and matcher.permutation(_rotation_matrix(v / size, math.pi)) is not None:
            return True
    return False


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


# ---------------------------------------------------------------------------
# atom indices, bonds and internal rotation (torsions)
# ---------------------------------------------------------------------------

#: bond criterion: atoms i and j are bonded when d_ij <= BOND_FACTOR (r_cov,i + r_cov,j)
BOND_FACTOR = 1.2
#: a group whose moment about a torsion axis is below this (amu Å^2) lies on the axis
ON_AXIS_MOMENT_AMU_A2 = 1e-6


def _is_index(value) -> bool:
    return isinstance(value, (int, np.integer)) and not isinstance(value, (bool, np.bool_))


def atom_indices(value, *, n_atoms: int | None = None, length: int | None = None, name: str = "indices") -> tuple:
    """Validated atom indices: a non-empty sequence of distinct non-negative integers.

    Parameters
    ----------
    value : sequence of int
        The indices (a list, tuple or integer array; booleans are refused).
    n_atoms : int, optional
        Number of atoms of the structure; every index must then lie in
        0 .. n_atoms - 1.
    length : int, optional
        Required number of indices (2 for an axis).
    name : str, optional
        Name of the parameter in error messages.

    Returns
    -------
    tuple of int
        The indices in the order given.

    Raises
    ------
    InputError
        If ``value`` is not a sequence, is empty, holds a non-integer or a
        negative index, an index out of range, a repeat, or has the wrong
        length.
    """
    try:
        items = tuple(value)
    except TypeError:
        msg = f"{name}: expected a sequence of atom indices (integers), got {value!r}"
        raise InputError(msg) from None
    if not items or not all(_is_index(i) for i in items):
        msg = f"{name}: expected a non-empty 1-D sequence of atom indices (integers), got {value!r}"
        raise InputError(msg)
    out = tuple(int(i) for i in items)
    if n_atoms is not None and (min(out) < 0 or max(out) >= n_atoms):
        msg = f"{name}: got {list(out)}, expected atom indices between 0 and {n_atoms - 1}"
        raise InputError(msg)
    if min(out) < 0:
        msg = f"{name}: got {list(out)}, expected non-negative atom indices"
        raise InputError(msg)
    if len(set(out)) != len(out):
        msg = f"{name}: got {list(out)} with repeated atoms; expected each atom once"
        raise InputError(msg)
    if length is not None and len(out) != length:
        msg = f"{name}: expected {length} atom indices, got {len(out)} ({list(out)})"
        raise InputError(msg)
    return out


def bond_matrix(atoms, *, factor: float = BOND_FACTOR) -> np.ndarray:
    """Which atoms of a molecule are bonded: d_ij <= factor (r_i + r_j).

    r_i are the covalent radii of ``ase.data.covalent_radii`` (B. Cordero et
    al., *Dalton Trans.* 2008, 2832, from memory); the factor 1.2 is common
    practice for connectivity from a geometry. Distances are taken between
    :func:`unwrapped_positions`, so a molecule split by periodic wrapping is
    joined first.

    Parameters
    ----------
    atoms : ase.Atoms
        The molecule (at least one atom).
    factor : float, optional
        Multiple of the sum of covalent radii below which two atoms are
        bonded (dimensionless, > 0); default 1.2.

    Returns
    -------
    ndarray of bool, shape (n_atoms, n_atoms)
        Symmetric, False on the diagonal.

    Raises
    ------
    InputError
        If ``atoms`` is not a non-empty ``ase.Atoms`` or ``factor`` is not a
        positive number.
    """
    from ase.data import covalent_radii

    scale = _check_tolerance(factor, "factor")
    pos = unwrapped_positions(atoms)
    radii = np.asarray(covalent_radii)[np.asarray(atoms.numbers)]
    d = np.linalg.norm(pos[:, None, :] - pos[None, :, :], axis=-1)
    bonded = d <= scale * (radii[:, None] + radii[None, :])
    np.fill_diagonal(bonded, False)
    return bonded


def _connected(adjacency: np.ndarray) -> bool:
    """True when the graph of a square boolean adjacency matrix is one piece."""
    seen, stack = {0}, [0]
    while stack:
        i = stack.pop()
        for j in np.flatnonzero(adjacency[i]):
            if int(j) not in seen:
                seen.add(int(j))
                stack.append(int(j))
    return len(seen) == adjacency.shape[0]


def torsion_axis(atoms, top, axis=None, *, label: str = "torsion"):
    """The rotating group (top), the rest of the molecule, and the axis atoms of a torsion.

    The top must be one bonded group (:func:`bond_matrix`) and must not hold
    every atom. Without ``axis`` the axis is the single bond joining the top
    to the rest; with ``axis`` the pair must have one atom in the top and one
    in the rest.

    Parameters
    ----------
    atoms : ase.Atoms
        The molecule.
    top : sequence of int
        Atoms of the rotating group, including its atom on the axis.
    axis : (int, int), optional
        One atom of the top and one of the rest, in either order.
    label : str, optional
        Prefix of error messages (e.g. ``"GasMolecule torsions[0]"``).

    Returns
    -------
    top : list of int
        The top's atoms, in the order given.
    rest : list of int
        The other atoms, ascending.
    axis_atoms : (int, int)
        (a, b): a in the top, b in the rest.

    Raises
    ------
    InputError
        Bad or out-of-range indices, a top that holds every atom or is not
        one bonded group, a top joined to the rest by other than exactly one
        bond (when ``axis`` is not given), or an axis not joining the top to
        the rest.
    """
    _check_atoms(atoms)
    n_atoms = len(atoms)
    top = list(atom_indices(top, n_atoms=n_atoms, name=f"{label} top"))
    if len(top) >= n_atoms:
        msg = f"{label} top: the top {top} holds every atom; the rest of the molecule must not be empty"
        raise InputError(msg)
    in_top = np.zeros(n_atoms, dtype=bool)
    in_top[top] = True
    rest = [int(i) for i in np.flatnonzero(~in_top)]
    bonds = bond_matrix(atoms)
    if not _connected(bonds[np.ix_(top, top)]):
        msg = (f"{label} top: atoms {top} do not form one bonded group (bond: d <= {BOND_FACTOR:g} "
               "x sum of covalent radii)")
        raise InputError(msg)
    if axis is None:
        joins = [(top[i], rest[j]) for i, j in np.argwhere(bonds[np.ix_(top, rest)])]
        if len(joins) != 1:
            msg = (f"{label} top: atoms {top} are joined to the rest of the molecule by {len(joins)} bonds "
                   f"{[list(p) for p in joins]}; a rotating group is joined by exactly one bond (or give axis=(i, j))")
            raise InputError(msg)
        return top, rest, (int(joins[0][0]), int(joins[0][1]))
    pair = atom_indices(axis, n_atoms=n_atoms, length=2, name=f"{label} axis")
    if in_top[pair[0]] == in_top[pair[1]]:
        msg = f"{label} axis: expected one atom of the top {top} and one of the rest, got {list(pair)}"
        raise InputError(msg)
    return top, rest, (pair if in_top[pair[0]] else pair[::-1])


def _check_symmetry_number(value, name: str) -> int:
    ok = _is_index(value) or (isinstance(value, float) and value.is_integer())
    if not ok or int(value) < 1:
        msg = f"{name}: expected a positive integer, got {value!r}"
        raise InputError(msg)
    return int(value)


def _top_symmetry_deviation(atoms, masses, rel, d2, top, e, sigma, tol, label) -> float:
    """Largest distance an atom of the top moves to its nearest like atom after a turn of 2 pi / sigma."""
    # hard check: the off-axis atoms of each kind (element, mass) come in sets of sigma
    off = [i for i in top if math.sqrt(d2[i]) > tol]
    kinds: dict = {}
    for i in off:
        key = (atoms[i].symbol, round(float(masses[i]), 3))
        kinds[key] = kinds.get(key, 0) + 1
    odd = {f"{sym} ({m:g} amu)": n for (sym, m), n in kinds.items() if n % sigma}
    if not off or odd:
        msg = (f"{label} symmetry_number: sigma_int = {sigma} needs the off-axis atoms of the top {top} in sets "
               f"of {sigma} equivalent atoms, got {odd or 'no off-axis atoms'}")
        raise InputError(msg)
    # soft measure: how far the top is from mapping onto itself
    turned = rel[top] @ _rotation_matrix(e, 2.0 * math.pi / sigma).T
    numbers = np.asarray(atoms.numbers)[top]
    d = np.linalg.norm(turned[:, None, :] - rel[top][None, :, :], axis=-1)
    d[numbers[:, None] != numbers[None, :]] = np.inf
    return float(d.min(axis=1).max())


def _coupled_moment(masses, pos, rel, in_top, e, i_top) -> float:
    """I_top - |P|^2/M - L.I^-1.L for a unit turn of the top (Schur complement of the rigid-body motions)."""
    w = np.where(in_top[:, None], np.cross(e, rel), 0.0)   # velocities of a unit turn about e through atom a
    total = float(masses.sum())
    r = pos - masses @ pos / total
    momentum = masses @ w
    angular = np.einsum("i,ij->j", masses, np.cross(r, w))
    tensor = _inertia_tensor(masses, r)
    return i_top - float(momentum @ momentum) / total - float(angular @ np.linalg.solve(tensor, angular))


def torsion_moments(atoms, top, axis=None, *, symmetry_number=1, symmetry_tolerance=0.05,
                    label: str = "torsion") -> dict:
    """Moments of inertia of a rotating group about its bond axis, and the reduced moments of the torsion.

    The axis is the line through the top's atom ``a`` and the rest's atom
    ``b`` (:func:`torsion_axis`). With r_perp,i the distance of atom i from
    that line (common practice):

    * I_top  = sum_{i in top} m_i r_perp,i^2,  I_rest = sum_{i not in top} m_i r_perp,i^2;
    * two-top reduced moment: I_red = I_top I_rest / (I_top + I_rest), the
      relative rotation of two rigid groups about their common axis with zero
      total angular momentum about it (Pitzer & Gwinn, J. Chem. Phys. 10,
      428 (1942); Pitzer, J. Chem. Phys. 14, 239 (1946), from memory).
    * coupled reduced moment: the top turning at unit rate moves its atoms
      with w_i = e x (r_i - r_a); with P = sum m_i w_i, L = sum m_i
      (r_i - R_cm) x w_i and the inertia tensor I of the whole molecule about
      its centre of mass, I_coupled = I_top - |P|^2/M - L·I^-1·L, the Schur
      complement of the overall translation and rotation in the classical
      kinetic-energy matrix (the moment that multiplies det I in the classical
      phase integral; Pitzer 1946's reduced moment for a rigid top, from
      memory). It equals the two-top value when e is a principal axis of the
      molecule through its centre of mass and of the top, and the top's
      centre of mass lies on e (ethane).

    Parameters
    ----------
    atoms : ase.Atoms
        The molecule (a molecule split by periodic wrapping is joined first).
    top : sequence of int
        Atoms of the rotating group, including its atom on the axis.
    axis : (int, int), optional
        One atom in the top, one not; default the single bond joining them
        (:func:`bond_matrix`).
    symmetry_number : int, optional
        σ_int. When > 1, the atoms of the top farther than
        ``symmetry_tolerance`` from the axis must come in sets of σ_int atoms
        of the same element and mass (else InputError); how far the top is
        from mapping onto itself after a turn of 2π/σ_int about the axis is
        returned as ``symmetry_deviation_A`` (a real methyl group is often
        tilted by a few degrees from the bond: 0.12 Å in ASE's methanol).
    symmetry_tolerance : float, optional
        Å; default 0.05.
    label : str, optional
        Prefix of error messages.

    Returns
    -------
    dict
        ``top``, ``rest`` (index lists), ``axis_atoms`` [a, b],
        ``inertia_top_amu_A2``, ``inertia_rest_amu_A2``,
        ``two_top_amu_A2``, ``coupled_amu_A2`` (amu Å^2) and
        ``symmetry_deviation_A`` (Å; 0 when σ_int = 1).

    Raises
    ------
    InputError
        The errors of :func:`torsion_axis`, a group lying on the axis (moment
        below :data:`ON_AXIS_MOMENT_AMU_A2`), a bad symmetry number or
        tolerance, or off-axis atoms that do not come in sets of σ_int.
    """
    top, rest, (a, b) = torsion_axis(atoms, top, axis, label=label)
    sigma = _check_symmetry_number(symmetry_number, f"{label} symmetry_number")
    tol = _check_tolerance(symmetry_tolerance, f"{label} symmetry_tolerance")
    masses = masses_amu(atoms)
    pos = unwrapped_positions(atoms)
    bond = pos[b] - pos[a]
    length = float(np.linalg.norm(bond))
    if length < 1e-8:
        msg = f"{label} axis: atoms {a} and {b} coincide; no axis"
        raise InputError(msg)
    e = bond / length
    rel = pos - pos[a]
    perp = rel - np.outer(rel @ e, e)
    d2 = np.einsum("ij,ij->i", perp, perp)
    in_top = np.zeros(len(atoms), dtype=bool)
    in_top[top] = True
    i_top, i_rest = float(masses[in_top] @ d2[in_top]), float(masses[~in_top] @ d2[~in_top])
    for what, value, group in (("top", i_top, top), ("rest", i_rest, rest)):
        if value < ON_AXIS_MOMENT_AMU_A2:
            msg = (f"{label} top: the {what} (atoms {group}) lies on the axis {a}-{b} "
                   f"(moment {value:.3g} amu Å^2); nothing rotates")
            raise InputError(msg)
    deviation = 0.0
    if sigma > 1:
        deviation = _top_symmetry_deviation(atoms, masses, rel, d2, top, e, sigma, tol, label)
    return {"top": top, "rest": rest, "axis_atoms": [int(a), int(b)],
            "inertia_top_amu_A2": i_top, "inertia_rest_amu_A2": i_rest,
            "two_top_amu_A2": i_top * i_rest / (i_top + i_rest),
            "coupled_amu_A2": _coupled_moment(masses, pos, rel, in_top, e, i_top),
            "symmetry_deviation_A": deviation}


# ---------------------------------------------------------------------------
# adsorbates on a surface
# ---------------------------------------------------------------------------


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


def _signed_frequencies(frequencies, name: str = "frequencies") -> np.ndarray:
    """Real 1-D array: real frequencies as they are, imaginary ones (x j) as -x."""
    try:
        f = np.asarray(frequencies)
    except (TypeError, ValueError):
        f = None
    if f is None or f.ndim != 1 or f.size == 0 or not np.issubdtype(f.dtype, np.number):
        msg = f"{name}: expected a non-empty 1-D array of frequencies in cm^-1, got {frequencies!r}"
        raise InputError(msg)
    if np.iscomplexobj(f):
        f = np.where(np.abs(f.imag) > np.abs(f.real), -np.abs(f.imag), f.real)
    f = f.astype(float)
    if not np.all(np.isfinite(f)):
        msg = f"{name}: got NaN or infinite values {f.tolist()!r}; expected finite frequencies in cm^-1"
        raise InputError(msg)
    return f


def _check_count(value, name: str, limit: int) -> int:
    if isinstance(value, bool) or not isinstance(value, (int, np.integer)) or value < 0:
        msg = f"{name}: expected a non-negative integer, got {value!r}"
        raise InputError(msg)
    if value > limit:
        msg = f"{name}: got {value}, but only {limit} modes are available"
        raise InputError(msg)
    return int(value)


def lowest_modes(frequencies, n) -> np.ndarray:
    """Indices of the ``n`` lowest frequencies, lowest first (the fallback rule when no mode vectors are given).

    Imaginary frequencies count as the lowest: a complex value with a larger
    imaginary than real part (ASE's ``0+xj``) is ranked as -x, and a negative
    real value (the common way of writing an imaginary mode) as itself. Ties
    keep the input order.

    Parameters
    ----------
    frequencies : array_like of shape (n_modes,)
        Frequencies in cm^-1, real or complex.
    n : int
        How many indices to return, 0 .. n_modes.

    Returns
    -------
    ndarray of int, shape (n,)

    Raises
    ------
    InputError
        If ``frequencies`` is not a non-empty 1-D numeric array of finite
        values or ``n`` is not an integer in 0 .. n_modes.
    """
    f = _signed_frequencies(frequencies)
    count = _check_count(n, "n", len(f))
    return np.argsort(f, kind="stable")[:count]


def assign_soft_modes(overlaps, frequencies, n_translations: int = 2, n_rotations: int = 1) -> dict:
    """Choose which normal modes are the frustrated in-plane translations and the rotation about the normal.

    Each mode k gets a translation score, the squared length of its
    (mass-weighted, normalised) projection onto the 2-D subspace of rigid
    in-plane translations, s_T = overlaps[k, 0] + overlaps[k, 1]; this does not
    depend on how e1 and e2 are oriented in the plane, so two degenerate modes
    that mix x and y in any way score alike. The rotation score is
    s_R = overlaps[k, 2]. ``n_translations`` translation slots and
    ``n_rotations`` rotation slots are filled by an optimal assignment
    (``scipy.optimize.linear_sum_assignment``) maximising the summed score,
    each mode used at most once; among equal scores the lower frequency wins.

    Parameters
    ----------
    overlaps : array_like of shape (n_modes, 3)
        From :func:`rigid_motion_overlaps`.
    frequencies : array_like of shape (n_modes,)
        Frequencies in cm^-1 of the same modes (real or complex; used to
        break ties and to order the result).
    n_translations : int, optional
        Number of frustrated translations to pick (default 2).
    n_rotations : int, optional
        Number of rotations about the normal to pick (default 1; use 0 for an
        atom or an adsorbate standing along the normal).

    Returns
    -------
    dict
        ``'translations'``, ``'rotations'``: mode indices (ndarray of int,
        ordered by frequency); ``'others'``: the remaining mode indices in
        input order; ``'translation_scores'``, ``'rotation_scores'``: s_T and
        s_R of the chosen modes, in the same order (in [0, 1]; values far
        below 1 mean the rigid motion is spread over several modes).

    Raises
    ------
    InputError
        If the shapes disagree, an overlap is outside [0, 1] (beyond rounding),
        the counts are negative or exceed the number of modes, or rotations
        are asked for but no mode has any rotation overlap (the adsorbate has
        no moment about the normal).
    """
    try:
        ov = np.asarray(overlaps, dtype=float)
    except (TypeError, ValueError):
        ov = None
    if ov is None or ov.ndim != 2 or ov.shape[1] != 3 or len(ov) == 0:
        shape = None if ov is None else ov.shape
        msg = f"overlaps: expected an array of shape (n_modes, 3), got shape {shape}"
        raise InputError(msg)
    if not np.all(np.isfinite(ov)) or ov.min() < -1e-9 or ov.max() > 1.0 + 1e-9:
        msg = "overlaps: expected finite squared overlaps in [0, 1] from rigid_motion_overlaps"
        raise InputError(msg)
    f = _signed_frequencies(frequencies)
    if len(f) != len(ov):
        msg = f"frequencies: got {len(f)} values for {len(ov)} modes in overlaps; expected one per mode"
        raise InputError(msg)
    n_t = _check_count(n_translations, "n_translations", len(ov))
    n_r = _check_count(n_rotations, "n_rotations", len(ov))
    if n_t + n_r > len(ov):
        msg = f"n_translations + n_rotations: got {n_t + n_r}, but only {len(ov)} modes are available"
        raise InputError(msg)
    if n_r > 0 and ov[:, 2].max() <= 1e-12:
        msg = "n_rotations: no mode overlaps rotation about the normal (one atom, or atoms along the normal); expected n_rotations=0"
        raise InputError(msg)
    s_t = ov[:, 0] + ov[:, 1]
    s_r = ov[:, 2]
    # tie-break towards lower frequency without changing any real preference
    rank = np.argsort(np.argsort(f, kind="stable"), kind="stable")
    tie = 1e-9 * rank / len(f)
    score = np.concatenate([np.repeat((s_t - tie)[:, None], n_t, axis=1), np.repeat((s_r - tie)[:, None], n_r, axis=1)], axis=1)
    if score.shape[1] > 0:
        from scipy.optimize import linear_sum_assignment

        rows, cols = linear_sum_assignment(score, maximize=True)
    else:
        rows, cols = np.array([], dtype=int), np.array([], dtype=int)
    trans = rows[cols < n_t]
    rots = rows[cols >= n_t]
    trans = trans[np.argsort(f[trans], kind="stable")]
    rots = rots[np.argsort(f[rots], kind="stable")]
    chosen = set(trans.tolist()) | set(rots.tolist())
    others = np.array([i for i in range(len(ov)) if i not in chosen], dtype=int)
    return {
        "translations": trans.astype(int),
        "rotations": rots.astype(int),
        "others": others,
        "translation_scores": s_t[trans],
        "rotation_scores": s_r[rots],
    }
