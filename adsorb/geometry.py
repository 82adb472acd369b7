"""Molecular geometry from an :class:`ase.Atoms`: masses, inertia, shape, symmetry.

This is the geometry layer of adsorb (layer 3 of the design). It turns a
structure into the numbers the rotational and adsorbate models need:

* masses and centre of mass;
* principal moments of inertia and axes (molecules split across a periodic
  cell boundary are unwrapped first);
* the shape class: ``'monatomic'``, ``'linear'`` or ``'nonlinear'``;
* the rotational symmetry number, found by searching the proper rotations
  that map the molecule onto itself;
* rotational constants in cm^-1 from moments of inertia.

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
    degrees) gives about 2e-7, a 176 degree CO2 about 1e-3, and H2O about 0.35.
    So the default 1e-3 calls anything straighter than about 176 degrees
    (for CO2) linear.

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
      (then a C2 perpendicular to the axis exists), else 1;
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
        atom it is matched with, default 0.05 Å.
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
        positive number, or the tolerance is so loose that the operations
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
    if shape == "linear":
        inversion = _Matcher(rel, labels, tol).permutation(-np.eye(3))
        return 2 if inversion is not None else 1
    return len(_rotation_group(rel, labels, axes, tol))


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
