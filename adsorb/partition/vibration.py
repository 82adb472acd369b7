"""Harmonic vibrations, counted from the zero-point level.

For a mode of wavenumber ν (cm^-1) with x = hcν/kT and e = exp(-x):

* q = 1 / (1 - e)               (levels n hcν above the zero-point level)
* U = hcν e / (1 - e)            (thermal energy above the zero-point level)
* S = k [x e / (1 - e) - ln(1 - e)]
* Cv = k x^2 e / (1 - e)^2
* ZPE = hcν / 2 (kept separate from U, see :class:`Contribution`).

Source: D. A. McQuarrie, *Statistical Mechanics* (Harper & Row, 1976),
eqs. 6-21 to 6-23 (the Einstein functions); A. Einstein, Ann. Phys. 22,
180 (1907) for the heat capacity.
"""

from __future__ import annotations

import numpy as np

from adsorb import constants as C
from adsorb.errors import InputError
from adsorb.partition.checks import positive_array as _positive
from adsorb.partition.contribution import Contribution

__all__ = ["harmonic"]

# Elements per work block: small enough to stay in cache, large enough that the
# per-block Python overhead is negligible.
_BLOCK_ELEMENTS = 1 << 16
# Below this x = hcν/kT the fast path (1 - exp(-x)) would lose more than ~1e-10
# relative accuracy, so the whole call switches to expm1.
_X_SMALL = 1.0e-6



def _einstein_block(x, lnq_out, xr_out, cv_out, small):
    """Sum the dimensionless Einstein functions of one block over its last axis.

    Writes Σ -ln(1 - e) (as Σ ln(1 + r), r = e/(1 - e)), Σ x e/(1 - e) and
    Σ x^2 e/(1 - e)^2 (e = exp(-x)) into the output views. ``x`` is
    overwritten. One exp and one log1p per element.
    """
    e = np.negative(x)
    if small:
        om = np.expm1(e)           # -(1 - e), accurate for tiny x
        np.negative(om, out=om)
        np.exp(e, out=e)
    else:
        np.exp(e, out=e)           # e = exp(-x), underflows quietly to 0
        om = np.subtract(1.0, e)   # 1 - e
    np.divide(e, om, out=e)        # r = e / (1 - e)
    np.log1p(e, out=om)            # ln q = -ln(1 - e) = ln(1 + r), accurate for tiny e too
    np.sum(om, axis=-1, out=lnq_out)
    np.multiply(x, e, out=e)       # x r
    np.sum(e, axis=-1, out=xr_out)
    np.add(x, e, out=x)            # x (1 + r)
    np.multiply(x, e, out=x)       # x^2 r (1 + r) = x^2 e / (1 - e)^2
    np.sum(x, axis=-1, out=cv_out)


def _blocked(thb, tb, lnq, xr, cv, small):
    """Run :func:`_einstein_block` over blocks of the leading axes of ``thb`` / ``tb``.

    Blocks are slabs of the first axis holding about ``_BLOCK_ELEMENTS``
    elements; a single slab larger than that is split along its next axis.
    """
    per_row = int(np.prod(thb.shape[1:], dtype=np.int64))
    if thb.ndim > 2 and per_row > _BLOCK_ELEMENTS:
        for i in range(thb.shape[0]):
            _blocked(thb[i], tb[i], lnq[i], xr[i], cv[i], small)
        return
    step = max(1, _BLOCK_ELEMENTS // max(1, per_row))
    for i in range(0, thb.shape[0], step):
        j = min(i + step, thb.shape[0])
        x = np.divide(thb[i:j], tb[i:j])
        _einstein_block(x, lnq[i:j], xr[i:j], cv[i:j], small)


def harmonic(temperature, frequencies_cm) -> Contribution:
    """Harmonic-oscillator vibrations, energies from the zero-point level.

    Modes lie on the LAST axis of ``frequencies_cm`` and are summed. The
    result has shape ``broadcast(temperature.shape, frequencies_cm.shape[:-1])``;
    for a batch of species use frequencies of shape (n_species, n_modes) and a
    temperature of shape (n_T, 1), giving results of shape (n_T, n_species).

    With x = hcν/kT and e = exp(-x) (evaluated once per mode and temperature):
    ln q = -Σ ln(1 - e); U = kT Σ x e/(1 - e); S = k Σ [x e/(1 - e) - ln(1 - e)];
    Cv = k Σ x^2 e/(1 - e)^2; ZPE = Σ hcν/2. Exponentials underflow quietly to
    zero at large x, so no warnings arise for any positive T and ν.

    Source: D. A. McQuarrie, *Statistical Mechanics* (1976), eqs. 6-21 to 6-23;
    A. Einstein, Ann. Phys. 22, 180 (1907).

    Parameters
    ----------
    temperature : array_like
        Temperature in K (> 0). Must broadcast against the leading axes of
        ``frequencies_cm``.
    frequencies_cm : array_like, shape (..., n_modes)
        Real harmonic wavenumbers in cm^-1 (> 0). A scalar is one mode; an
        empty last axis gives a zero contribution.

    Returns
    -------
    Contribution
        ``ln_q``, ``energy`` (eV), ``entropy`` and ``heat_capacity`` (eV/K) of
        the broadcast shape; ``zpe`` (eV) of shape ``frequencies_cm.shape[:-1]``
        (a float for a 1-D list of modes).

    Raises
    ------
    InputError
        A non-positive or non-finite temperature or frequency (imaginary modes
        must be handled before this call), or shapes that do not broadcast.
    """
    t = _positive("temperature", temperature, "K")
    nu = np.asarray(frequencies_cm, dtype=float)
    if nu.ndim == 0:
        nu = nu.reshape(1)
    if nu.size and not np.all(np.isfinite(nu) & (nu > 0)):
        bad = nu[~(np.isfinite(nu) & (nu > 0))].flat[0]
        raise InputError(
            f"frequencies_cm must be real, finite and > 0 cm^-1 (imaginary modes need a policy "
            f"before the harmonic sum); got {bad!r}")
    try:
        lead = np.broadcast_shapes(t.shape, nu.shape[:-1])
    except ValueError:
        raise InputError(
            f"temperature of shape {t.shape} does not broadcast against the leading axes "
            f"{nu.shape[:-1]} of frequencies_cm (modes on the last axis)") from None
    n_modes = nu.shape[-1]
    zpe_arr = (0.5 * C.invcm_eV) * nu.sum(axis=-1)
    zpe = float(zpe_arr) if zpe_arr.ndim == 0 else zpe_arr
    if n_modes == 0:
        z = np.zeros(lead)
        return Contribution(z, z.copy(), z.copy(), z.copy(), zpe)

    theta = nu * C.invcm_K                                 # vibrational temperatures, K
    small = bool(theta.min() / t.max() < _X_SMALL)
    lnq = np.empty(lead)
    xr = np.empty(lead)
    cv = np.empty(lead)
    if len(lead) == 0:
        _einstein_block(theta / t, lnq, xr, cv, small)
    else:
        # broadcast views of the inputs (no copies), processed in cache-sized blocks
        tb = np.broadcast_to(t, lead)[..., None]
        thb = np.broadcast_to(theta, lead + (n_modes,))
        _blocked(thb, tb, lnq, xr, cv, small)
    energy = (C.kB_eV * t) * xr
    entropy = C.kB_eV * (lnq + xr)
    heat_capacity = C.kB_eV * cv
    return Contribution(lnq, energy, entropy, heat_capacity, zpe)
