"""Rotational symmetry number of a molecule, from a search of the proper rotations that map it onto itself.

Part of the geometry layer (:mod:`adsorb.geometry`). Atoms count as
equivalent when they have the same element and the same mass, so isotopic
substitution breaks the symmetry. The search, its tolerances and its limits
are described in docs/methods-geometry.md §5.
"""

from __future__ import annotations

import math
from itertools import combinations

import numpy as np

from adsorb.errors import InputError
from adsorb.geometry._common import _check_tolerance, _rotation_matrix
from adsorb.geometry.molecule import _principal, _shape_from_moments, masses_amu, unwrapped_positions


def _equivalence_classes(atoms, masses: np.ndarray) -> np.ndarray:
    """Integer label per atom: same label = same element AND same mass (isotopes differ)."""
    keys = list(zip(atoms.numbers.tolist(), np.round(masses, 6).tolist()))
    lookup: dict = {}
    return np.array([lookup.setdefault(k, len(lookup)) for k in keys], dtype=int)


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
