"""Bonds and internal rotation (torsions): the rotating group, its axis and its moments of inertia.

Part of the geometry layer (:mod:`adsorb.geometry`): bonds from covalent
radii, the rotating group (top) and its axis, the moments of the two groups
about the axis and the reduced moments of the torsion (two-top and coupled).
See docs/methods-geometry.md §9 and methods-gas.md §7.3.

Units: lengths in Å, masses in amu, moments of inertia in amu Å^2.
"""

from __future__ import annotations

import math

import numpy as np

from adsorb.errors import InputError
from adsorb.geometry._common import (
    _check_atoms,
    _check_tolerance,
    _inertia_tensor,
    _is_index,
    _rotation_matrix,
    atom_indices,
)
from adsorb.geometry.molecule import masses_amu, unwrapped_positions


#: bond criterion: atoms i and j are bonded when d_ij <= BOND_FACTOR (r_cov,i + r_cov,j)
BOND_FACTOR = 1.2
#: a group whose moment about a torsion axis is below this (amu Å^2) lies on the axis
ON_AXIS_MOMENT_AMU_A2 = 1e-6


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
