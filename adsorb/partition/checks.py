"""Input checks shared by the partition building blocks."""

from __future__ import annotations

import numpy as np

from adsorb.errors import InputError


def positive_array(name, value, unit="", *, allow_zero=False):
    """``value`` as a float array; InputError unless it is non-empty and every element finite and > 0.

    Parameters
    ----------
    name : str
        Parameter name used in the message.
    value : array_like
        The value to check.
    unit : str, optional
        Unit named in the message (e.g. "K").
    allow_zero : bool, optional
        Accept zeros (>= 0) instead of requiring > 0.
    """
    try:
        arr = np.asarray(value, dtype=float)
    except (TypeError, ValueError):
        msg = f"{name} must be a real number or an array of real numbers, got {value!r}"
        raise InputError(msg) from None
    if arr.size == 0:
        msg = f"{name} must not be empty, got {value!r}"
        raise InputError(msg)
    bad = ~np.isfinite(arr) | (arr < 0.0 if allow_zero else arr <= 0.0)
    if np.any(bad):
        first = arr[bad].flat[0] if arr.ndim else float(arr)
        need = ">= 0" if allow_zero else "> 0"
        msg = f"{name} must be finite and {need}{' ' + unit if unit else ''}; got {first!r}"
        raise InputError(msg)
    return arr
