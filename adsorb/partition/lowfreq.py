"""Treatments of low-frequency vibrations: a frequency floor and quasi-RRHO.

Two published ways to stop soft modes from dominating vibrational entropies:

* **Frequency floor** (R. F. Ribeiro, A. V. Marenich, C. J. Cramer,
  D. G. Truhlar, J. Phys. Chem. B 2011, 115, 14556-14562): every real
  frequency below a floor (100 cm^-1 in that paper) is raised to the floor
  before the harmonic sums. Applied only when the caller chooses it.
* **Quasi-rigid-rotor-harmonic-oscillator (quasi-RRHO) entropy**
  (S. Grimme, Chem. Eur. J. 2012, 18, 9955-9964): each mode's entropy is
  interpolated between the harmonic value and that of a free rotor whose
  moment of inertia corresponds to the mode frequency,

      S = w S_HO + (1 - w) S_FR,   w = 1 / (1 + (nu0/nu)^alpha)

  with the damping function of J.-D. Chai and M. Head-Gordon (Phys. Chem.
  Chem. Phys. 2008, 10, 6615-6620), nu0 = 100 cm^-1, alpha = 4, and

      S_FR = k [1/2 + ln sqrt(8 pi^3 mu' k T / h^2)],
      mu = h / (8 pi^2 nu),   mu' = mu B_av / (mu + B_av),   B_av = 1e-44 kg m^2.

  Optional enthalpy interpolation (Y.-P. Li, J. Gomes, S. M. Sharada,
  A. T. Bell, M. Head-Gordon, J. Phys. Chem. C 2015, 119, 1840-1850; the form
  is from memory, not checked against the paper): each mode's U + ZPE is
  w (U_HO + ZPE_HO) + (1 - w) kT/2.

Thermodynamic consistency, stated plainly. Every result satisfies
G = H - TS by construction: ``ln_q`` is defined as S/k - U/(kT), so
``zpe - kT ln_q = zpe + U - T S``.

* ``enthalpy='interpolated'``: the free energy is w A_HO + (1 - w) A_FR with
  temperature-independent weights, a mixture of two proper free energies, so
  S = -dA/dT and Cv = dU/dT hold exactly.
* ``enthalpy='harmonic'`` (Grimme's original: only S is interpolated): Cv =
  dU/dT holds, but S is **not** -dA/dT: the entropy is an interpolation, not
  the derivative of a partition function. The difference is largest for modes
  near nu0.
"""

from __future__ import annotations

import numpy as np

from adsorb import constants as C
from adsorb.errors import InputError
from adsorb.partition.contribution import Contribution
from adsorb.partition.vibration import harmonic

__all__ = [
    "apply_floor",
    "harmonic_with_floor",
    "damping_weight",
    "free_rotor_entropy",
    "quasi_rrho",
]

_ENTHALPY_CHOICES = ("harmonic", "interpolated")


def _frequencies(value):
    """Frequencies as a float array (scalar -> one mode); InputError unless real, finite and > 0."""
    if np.iscomplexobj(value):
        msg = ("frequencies_cm must be real numbers in cm^-1; imaginary modes need an explicit "
               "policy before the low-frequency treatment")
        raise InputError(msg)
    try:
        nu = np.asarray(value, dtype=float)
    except (TypeError, ValueError):
        msg = f"frequencies_cm must be real numbers in cm^-1, got {value!r}"
        raise InputError(msg) from None
    if nu.ndim == 0:
        nu = nu.reshape(1)
    bad = ~(np.isfinite(nu) & (nu > 0.0))
    if np.any(bad):
        msg = (f"frequencies_cm must be finite and > 0 cm^-1 (imaginary modes, often given as "
               f"negative numbers, need an explicit policy first); got {nu[bad].flat[0]!r}")
        raise InputError(msg)
    return nu


def _positive_scalar(name, value, unit):
    try:
        v = float(value)
    except (TypeError, ValueError):
        msg = f"{name} must be a number in {unit}, got {value!r}"
        raise InputError(msg) from None
    if not (np.isfinite(v) and v > 0.0):
        msg = f"{name} must be finite and > 0 {unit}, got {value!r}"
        raise InputError(msg)
    return v


def apply_floor(frequencies_cm, floor_cm=100.0):
    """Raise every frequency below ``floor_cm`` to ``floor_cm``.

    Ribeiro, Marenich, Cramer, Truhlar, J. Phys. Chem. B 2011, 115, 14556.

    Parameters
    ----------
    frequencies_cm : array_like
        Real frequencies in cm^-1 (> 0).
    floor_cm : float, optional
        Floor in cm^-1 (default 100).

    Returns
    -------
    ndarray
        The floored frequencies (same shape; a scalar becomes shape (1,)).

    Raises
    ------
    InputError
        If a frequency is not real, finite and positive, or the floor is not positive.
    """
    nu = _frequencies(frequencies_cm)
    floor = _positive_scalar("floor_cm", floor_cm, "cm^-1")
    return np.maximum(nu, floor)


def harmonic_with_floor(temperature, frequencies_cm, floor_cm=100.0):
    """Harmonic vibrations after raising soft modes to a floor.

    Ribeiro, Marenich, Cramer, Truhlar, J. Phys. Chem. B 2011, 115, 14556:
    frequencies below ``floor_cm`` are replaced by ``floor_cm``, then
    :func:`adsorb.partition.vibration.harmonic` sums the modes (last axis).

    Parameters
    ----------
    temperature : array_like
        Temperature in K (> 0), broadcasting against the leading axes of
        ``frequencies_cm``.
    frequencies_cm : array_like, shape (..., n_modes)
        Real frequencies in cm^-1 (> 0).
    floor_cm : float, optional
        Floor in cm^-1 (default 100).

    Returns
    -------
    Contribution
        As :func:`~adsorb.partition.vibration.harmonic` (ZPE of the floored modes).

    Raises
    ------
    InputError
        On invalid frequencies, floor or temperature.
    """
    return harmonic(temperature, apply_floor(frequencies_cm, floor_cm))


def damping_weight(frequencies_cm, *, cutoff_cm=100.0, alpha=4.0):
    """Chai-Head-Gordon damping weight w = 1 / (1 + (nu0/nu)^alpha) of the harmonic part.

    J.-D. Chai, M. Head-Gordon, Phys. Chem. Chem. Phys. 2008, 10, 6615, as
    used by Grimme, Chem. Eur. J. 2012, 18, 9955 (nu0 = 100 cm^-1, alpha = 4).

    Parameters
    ----------
    frequencies_cm : array_like
        Real frequencies in cm^-1 (> 0).
    cutoff_cm : float, optional
        nu0 in cm^-1 (default 100).
    alpha : float, optional
        Exponent (default 4).

    Returns
    -------
    ndarray
        w in (0, 1), same shape as the frequencies (a scalar becomes shape (1,)).

    Raises
    ------
    InputError
        On invalid frequencies or parameters.
    """
    nu = _frequencies(frequencies_cm)
    nu0 = _positive_scalar("cutoff_cm", cutoff_cm, "cm^-1")
    a = _positive_scalar("alpha", alpha, "(dimensionless)")
    # written with r = nu/nu0 so that very soft modes underflow quietly to w = 0
    ra = (nu / nu0) ** a
    return ra / (1.0 + ra)


def free_rotor_entropy(temperature, frequencies_cm, *, average_inertia_kg_m2=1e-44):
    """Entropy of Grimme's free rotor for each mode, elementwise (not summed).

    S_FR = k [1/2 + ln sqrt(8 pi^3 mu' k T / h^2)], mu = h/(8 pi^2 nu),
    mu' = mu B_av/(mu + B_av) (Grimme, Chem. Eur. J. 2012, 18, 9955).

    Parameters
    ----------
    temperature : array_like
        Temperature in K (> 0); broadcasts elementwise against the frequencies.
    frequencies_cm : array_like
        Real frequencies in cm^-1 (> 0).
    average_inertia_kg_m2 : float, optional
        B_av in kg m^2 (default 1e-44).

    Returns
    -------
    ndarray
        S_FR in eV/K, shape broadcast(temperature, frequencies).

    Raises
    ------
    InputError
        On invalid input.
    """
    t = _temperature(temperature)
    nu = _frequencies(frequencies_cm)
    b_av = _positive_scalar("average_inertia_kg_m2", average_inertia_kg_m2, "kg m^2")
    return _s_free_rotor(t, nu, b_av)


def _temperature(value):
    try:
        t = np.asarray(value, dtype=float)
    except (TypeError, ValueError):
        msg = f"temperature must be a real number or array in K, got {value!r}"
        raise InputError(msg) from None
    if t.size == 0 or not np.all(np.isfinite(t) & (t > 0.0)):
        bad = t[~(np.isfinite(t) & (t > 0.0))].flat[0] if t.size else value
        msg = f"temperature must be finite and > 0 K, got {bad!r}"
        raise InputError(msg)
    return t


def _s_free_rotor(t, nu, b_av):
    nu_hz = nu * (100.0 * C.c)
    mu = C.h / (8.0 * C.pi**2 * nu_hz)
    mu_eff = mu * b_av / (mu + b_av)
    return C.kB_eV * (0.5 + 0.5 * np.log(8.0 * C.pi**3 * mu_eff * C.k_B * t / C.h**2))


def quasi_rrho(temperature, frequencies_cm, *, cutoff_cm=100.0, alpha=4.0,
               average_inertia_kg_m2=1e-44, enthalpy="harmonic"):
    """Grimme's quasi-RRHO treatment of a set of modes (modes on the last axis, summed).

    Entropy per mode S = w S_HO + (1 - w) S_FR (Grimme, Chem. Eur. J. 2012,
    18, 9955; w from :func:`damping_weight`, S_FR from
    :func:`free_rotor_entropy`). Energy:

    * ``enthalpy='harmonic'`` (Grimme's original): U and ZPE harmonic;
    * ``enthalpy='interpolated'`` (Li, Gomes, Sharada, Bell, Head-Gordon,
      J. Phys. Chem. C 2015, 119, 1840; form from memory): per mode
      U = w U_HO + (1 - w) kT/2 and ZPE = w h c nu / 2.

    ``ln_q`` is defined as S/k - U/(kT), so that G = H - TS holds by
    construction. With ``'harmonic'`` the entropy is an interpolation and is
    NOT -dG/dT; with ``'interpolated'`` it is (see the module docstring).

    Parameters
    ----------
    temperature : array_like
        Temperature in K (> 0), broadcasting against the leading axes of
        ``frequencies_cm``.
    frequencies_cm : array_like, shape (..., n_modes)
        Real frequencies in cm^-1 (> 0).
    cutoff_cm : float, optional
        nu0 in cm^-1 (default 100).
    alpha : float, optional
        Damping exponent (default 4).
    average_inertia_kg_m2 : float, optional
        B_av in kg m^2 (default 1e-44).
    enthalpy : {'harmonic', 'interpolated'}, optional
        Energy treatment (default 'harmonic').

    Returns
    -------
    Contribution
        Shape broadcast(temperature.shape, frequencies_cm.shape[:-1]); zpe of
        shape frequencies_cm.shape[:-1] (a float for one list of modes).

    Raises
    ------
    InputError
        On invalid frequencies, temperature or parameters.
    """
    if enthalpy not in _ENTHALPY_CHOICES:
        msg = f"enthalpy must be one of {_ENTHALPY_CHOICES}, got {enthalpy!r}"
        raise InputError(msg)
    t = _temperature(temperature)
    nu = _frequencies(frequencies_cm)
    w = damping_weight(nu, cutoff_cm=cutoff_cm, alpha=alpha)
    b_av = _positive_scalar("average_inertia_kg_m2", average_inertia_kg_m2, "kg m^2")
    try:
        np.broadcast_shapes(t.shape, nu.shape[:-1])
    except ValueError:
        msg = (f"temperature of shape {t.shape} does not broadcast against the leading axes "
               f"{nu.shape[:-1]} of frequencies_cm (modes on the last axis)")
        raise InputError(msg) from None

    # per-mode harmonic values: shape broadcast(t, lead) + (n_modes,)
    t_modes = t[..., None]
    per_mode = harmonic(t_modes, nu[..., None])
    s_fr = _s_free_rotor(t_modes, nu, b_av)
    entropy = np.sum(w * per_mode.entropy + (1.0 - w) * s_fr, axis=-1)
    zpe_modes = 0.5 * C.invcm_eV * nu
    if enthalpy == "harmonic":
        energy = np.sum(per_mode.energy, axis=-1)
        heat_capacity = np.sum(per_mode.heat_capacity, axis=-1)
        zpe = np.sum(zpe_modes, axis=-1)
    else:
        kt = C.kB_eV * t_modes
        energy = np.sum(w * per_mode.energy + (1.0 - w) * 0.5 * kt, axis=-1)
        heat_capacity = np.sum(w * per_mode.heat_capacity + (1.0 - w) * 0.5 * C.kB_eV, axis=-1)
        zpe = np.sum(w * zpe_modes, axis=-1)
    zpe = float(zpe) if np.ndim(zpe) == 0 else zpe
    shape = np.broadcast_shapes(t.shape, nu.shape[:-1])
    entropy = np.broadcast_to(entropy, shape).copy()
    energy = np.broadcast_to(energy, shape).copy()
    heat_capacity = np.broadcast_to(heat_capacity, shape).copy()
    ln_q = entropy / C.kB_eV - energy / (C.kB_eV * t)
    return Contribution(ln_q=ln_q, energy=energy, entropy=entropy,
                        heat_capacity=heat_capacity, zpe=zpe)
