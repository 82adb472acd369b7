"""Input checks shared by the partition building blocks."""

from __future__ import annotations

import numpy as np

from adsorb import constants as C
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


def finite_number(value, what: str, expected: str) -> float:
    """``float(value)``; InputError ``"{what}: expected {expected}, got {value!r}"`` if not a finite number."""
    try:
        x = float(value)
    except (TypeError, ValueError):
        x = np.nan
    if not np.isfinite(x):
        msg = f"{what}: expected {expected}, got {value!r}"
        raise InputError(msg)
    return x


#: meV and eV expressed in cm^-1, for the unit suggestions below
_CM_PER_MEV = 1e-3 / C.invcm_eV
_CM_PER_EV = 1.0 / C.invcm_eV


def unit_suspicion(frequencies_cm, *, has_hydrogen=False, hydrogen_stretch_cm=1000.0):
    """Why a list of wavenumbers looks like it is in eV or meV rather than cm^-1, or None.

    Two signs, both facts of the trade (common practice):

    * every |ν| below 1 cm^-1 (0.12 meV): no bound molecule or adsorbate has all its
      modes that soft, while vibrational energies *in eV* (0.005-0.5) look exactly so;
    * a species containing hydrogen whose largest |ν| is below ``hydrogen_stretch_cm``:
      an X-H stretch lies above ~1000 cm^-1 in every gas molecule (HI, the softest
      common one, is near 2309 cm^-1, from memory), while the same modes *in meV* lie
      at 190-550.

    Parameters
    ----------
    frequencies_cm : array_like
        The wavenumbers as given (cm^-1 expected; imaginary modes negative).
    has_hydrogen : bool, keyword-only
        The species contains a hydrogen atom.
    hydrogen_stretch_cm : float, keyword-only
        The smallest largest-|ν| accepted for a species with hydrogen (default 1000).

    Returns
    -------
    str or None
        One clause naming the largest |ν| and the conversion to apply.
    """
    a = np.abs(np.asarray(frequencies_cm, dtype=float)).ravel()
    if a.size == 0 or not np.all(np.isfinite(a)) or a.max() == 0.0:
        return None
    top = float(a.max())
    if top < 1.0:
        return (f"every |nu| is below 1 cm^-1 (largest {top:g}); the values look like eV: "
                f"multiply by {_CM_PER_EV:.2f} to get cm^-1")
    if has_hydrogen and top < hydrogen_stretch_cm:
        return (f"the largest |nu| of a species with hydrogen is {top:g} cm^-1, below the "
                f"{hydrogen_stretch_cm:g} cm^-1 of any X-H stretch; the values look like meV: "
                f"multiply by {_CM_PER_MEV:.4f} to get cm^-1")
    return None
