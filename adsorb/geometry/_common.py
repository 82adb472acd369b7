"""Input checks and small vector helpers shared by the modules of :mod:`adsorb.geometry`.

Kept in one place so that every geometry module refuses bad input with the
same messages: the ``ase.Atoms`` check, positive tolerances, atom index lists
(:func:`atom_indices`, public through :mod:`adsorb.geometry`), the inertia
tensor of point masses and the Rodrigues rotation matrix.
"""

from __future__ import annotations

import math

import numpy as np

from adsorb.errors import InputError


#: the largest |coordinate| accepted, Å (1 m: beyond any structure; the inertia tensor overflows near 1e150 Å)
MAX_COORDINATE_A = 1e10


def _check_atoms(atoms, name: str = "atoms"):
    """Raise InputError unless ``atoms`` is a non-empty ase.Atoms with finite positions of sensible size."""
    from ase import Atoms

    if not isinstance(atoms, Atoms):
        msg = f"{name}: expected an ase.Atoms object, got {type(atoms).__name__}"
        raise InputError(msg)
    if len(atoms) == 0:
        msg = f"{name}: the Atoms object is empty (0 atoms); expected at least one atom"
        raise InputError(msg)
    extent = np.max(np.abs(atoms.positions))
    if not extent <= MAX_COORDINATE_A:  # NaN fails too
        msg = f"{name}: a position coordinate is {float(extent)!r} Å; expected finite positions within ±{MAX_COORDINATE_A:g} Å"
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


def _inertia_tensor(masses: np.ndarray, rel: np.ndarray) -> np.ndarray:
    """Inertia tensor (amu Å^2) of point masses at positions ``rel`` (Å, about the origin)."""
    r2 = np.einsum("ij,ij->i", rel, rel)
    return np.eye(3) * np.dot(masses, r2) - np.einsum("i,ij,ik->jk", masses, rel, rel)


def _rotation_matrix(axis: np.ndarray, angle: float) -> np.ndarray:
    """Proper rotation by ``angle`` (rad) about unit vector ``axis`` (Rodrigues formula)."""
    x, y, z = axis
    k = np.array([[0.0, -z, y], [z, 0.0, -x], [-y, x, 0.0]])
    return np.eye(3) + math.sin(angle) * k + (1.0 - math.cos(angle)) * (k @ k)
