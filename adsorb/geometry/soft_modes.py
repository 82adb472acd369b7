"""Which normal modes of an adsorbate are its frustrated in-plane translations and its rotation about the normal.

Part of the geometry layer (:mod:`adsorb.geometry`). From the overlaps of
:func:`adsorb.geometry.rigid_motion_overlaps` an optimal assignment picks the
modes; without mode vectors, :func:`lowest_modes` gives the fallback rule
(the lowest frequencies). See docs/methods-geometry.md §8.

Frequencies are in cm^-1 (real, or complex with imaginary modes as ASE gives
them).
"""

from __future__ import annotations

import numpy as np

from adsorb.errors import InputError


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
