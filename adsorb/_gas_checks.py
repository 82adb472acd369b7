"""Scalar input checks shared by :mod:`adsorb.gas` and :mod:`adsorb.torsion` (one-line InputError messages)."""

from __future__ import annotations

import numpy as np

from adsorb.errors import InputError


def _number(name, value, *, positive=True, allow_zero=False, owner="GasMolecule"):
    """A finite float, else InputError naming ``name`` (prefixed by ``owner``)."""
    label = f"{owner} {name}" if owner else name
    try:
        x = float(value)
    except (TypeError, ValueError):
        raise InputError(f"{label}: expected a number, got {value!r}") from None
    ok = np.isfinite(x) and (not positive or x > 0 or (allow_zero and x == 0))
    if not ok:
        need = ">= 0" if allow_zero else "> 0" if positive else "finite"
        raise InputError(f"{label}: expected a finite number {need}, got {value!r}")
    return x


def _positive_int(name, value, *, owner="GasMolecule"):
    if isinstance(value, bool):
        ok = False
    else:
        try:
            ok = float(value).is_integer() and int(value) >= 1
        except (TypeError, ValueError, OverflowError):
            ok = False
    if not ok:
        label = f"{owner} {name}" if owner else name
        raise InputError(f"{label}: expected a positive integer, got {value!r}")
    return int(value)


def _fmt(values):
    return ", ".join(f"{v:g}" for v in values)
