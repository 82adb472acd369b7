"""Hindered translator and hindered rotor (closed Bessel forms).

Source: L. H. Sprowl, C. T. Campbell, L. Árnadóttir, "Hindered Translator and
Hindered Rotor Models for Adsorbates: Partition Functions and Entropies",
J. Phys. Chem. C 2016, 120, 9719-9731 (DOI 10.1021/acs.jpcc.5b11616).

Both models treat one coordinate s moving on a cosine corrugation

    V(s) = (W/2) [1 - cos(2 pi s / period)]

(one in-plane direction of a frustrated translation with period b = site
spacing; or the rotation angle about the surface normal with period 2 pi / n).
The classical configuration-and-momentum integral over one period is a
modified Bessel function; Sprowl et al. multiply it by the ratio of the quantum
to the classical harmonic-oscillator partition function and by a factor that
sets the effective ground-state energy:

    q = q_cl * [q_HO / q_HO,cl] * exp(1 / ((2 + 16 r) T*)),
    q_cl = sqrt(pi r T*) exp(-z) I0(z),   r = W/(h nu),  T* = kT/(h nu),
    z = W/(2 kT).

Conventions of the returned :class:`Contribution` (per site for the
translator, per molecule for the rotor):

* ``zpe`` = h nu [1/2 - 1/(2 + 16 r)], the model's effective ground-state
  energy above the well bottom (zero for the classical forms);
* ``ln_q`` counted from that level, so that ``zpe - kT ln_q`` is -kT times the
  log of the partition function counted from the well bottom, and
  ``zpe + energy - T entropy`` equals the same number;
* U, S and Cv are the analytic temperature derivatives of the closed form.

All functions are pure and broadcast over temperature and parameters.
Exponentially scaled Bessel functions (``scipy.special.i0e``/``i1e``) and an
asymptotic series of I1/I0 for large arguments keep every value finite with no
warnings from 1 K to 5000 K and for barriers from 0 to many eV.

Known limitation (measured, see docs/methods-adsorbates.md): for
r = W/(h nu) well below 1 and W < kT < h nu the quantum correction factor makes
U negative and Cv < 0 (the entropy falls with T), e.g. a rotor of 0.5 amu Å^2
with 5 minima and W = 0.01 eV at 40-100 K. The accuracy rule flags that regime.

Barrier zero is allowed: it gives the free translator (b sqrt(2 pi m kT)/h per
direction and site) and the classical free rotor exactly. Where the closed
forms are accurate (compared with the exact solver of
:mod:`adsorb.partition.periodic`) is answered by
:func:`translator_closed_form_reliable`, :func:`rotor_closed_form_reliable`
and :func:`closed_form_reliable`.
"""

from __future__ import annotations

import numpy as np
from scipy.special import i0e, i1e

from adsorb import constants as C
from adsorb.errors import InputError
from adsorb.partition.checks import positive_array as _as_float_array
from adsorb.partition.contribution import Contribution

__all__ = [
    "translator_frequency_cm",
    "rotor_frequency_cm",
    "hindered_translator",
    "hindered_rotor",
    "translator_closed_form_reliable",
    "rotor_closed_form_reliable",
    "closed_form_reliable",
]

# ---------------------------------------------------------------------------
# input checks
# ---------------------------------------------------------------------------



def _as_count_array(name, value):
    """Return ``value`` as a float array of positive integers; raise InputError otherwise."""
    arr = _as_float_array(name, value)
    if np.any(arr != np.round(arr)):
        first = arr[arr != np.round(arr)].flat[0] if arr.ndim else float(arr)
        msg = f"{name} must be a positive integer, got {first!r}"
        raise InputError(msg)
    return arr


# ---------------------------------------------------------------------------
# Bessel-function pieces
# ---------------------------------------------------------------------------

_Z_ASYMPTOTIC = 30.0
_N_SERIES = 20


def _ratio_series_coefficients(n_terms):
    """Coefficients c_n of the large-z series I1(z)/I0(z) = sum_n c_n z^-n.

    The ratio rho = I1/I0 obeys the Riccati equation rho' = 1 - rho/z - rho^2
    (from the Bessel recurrences I0' = I1, I1' = I0 - I1/z); inserting the
    series gives c_0 = 1 and c_n = [(n - 2) c_{n-1} - sum_{i=1}^{n-1} c_i c_{n-i}] / 2
    (c_1 = -1/2, c_2 = -1/8, c_3 = -1/8, ... the known asymptotic expansion).
    """
    c = [1.0]
    for n in range(1, n_terms + 1):
        s = sum(c[i] * c[n - i] for i in range(1, n))
        c.append(((n - 2) * c[n - 1] - s) / 2.0)
    return np.array(c)


_C_RATIO = _ratio_series_coefficients(_N_SERIES)


def _bessel_terms(z):
    """Return (ln[exp(-z) I0(z)], z [1 - I1/I0], z^2 d(I1/I0)/dz) for z >= 0.

    The second is the mean potential energy of the classical cosine well in
    units of kT; the third is its (negative) temperature derivative term in the
    heat capacity: z^2 rho' = z^2 (1 - rho^2) - z rho. Both tend to 1/2 for
    large z; there an asymptotic series avoids the cancellation.
    """
    z = np.asarray(z, dtype=float)
    big = z >= _Z_ASYMPTOTIC
    zs = np.where(big, 1.0, z)           # safe argument for the direct branch
    zb = np.where(big, z, _Z_ASYMPTOTIC)  # safe argument for the series branch

    ln_i0e = np.log(i0e(z))

    # direct branch
    i0 = i0e(zs)
    rho = i1e(zs) / i0
    one_minus_rho = (i0 - i1e(zs)) / i0
    pot_direct = zs * one_minus_rho
    cv_direct = zs * zs * one_minus_rho * (1.0 + rho) - zs * rho

    # series branch: 1 - rho = -sum_{n>=1} c_n z^-n, z^2 rho' = -sum n c_n z^(1-n)
    n = np.arange(1, _N_SERIES + 1)
    inv = 1.0 / zb[..., None]
    powers = inv ** (n - 1)              # z^(1-n)
    pot_series = -np.sum(_C_RATIO[1:] * powers, axis=-1)
    cv_series = -np.sum(n * _C_RATIO[1:] * powers, axis=-1)

    pot = np.where(big, pot_series, pot_direct)
    cv = np.where(big, cv_series, cv_direct)
    return ln_i0e, pot, cv


def _quantum_ho_terms(x):
    """Harmonic-oscillator correction pieces for x = h nu / kT >= 0.

    Returns (ln[x / (1 - e^-x)], x/(e^x - 1), x^2 e^x/(e^x - 1)^2), i.e. ln of
    q_HO/q_HO,cl counted from the HO ground level, the thermal energy of the
    quantum HO in units of kT, and its heat capacity in units of k. x = 0 (free
    limit) gives (0, 1, 1).
    """
    xs = np.maximum(np.asarray(x, dtype=float), 1e-300)
    em = np.exp(-xs)
    one_minus = -np.expm1(-xs)
    ln_ratio = np.log(xs) - np.log(one_minus)
    u = xs * em / one_minus
    cv = (xs / one_minus) ** 2 * em
    return ln_ratio, u, cv


def _bessel_model(temperature, eff_inertia, barrier_j, ln_multiplicity, quantum):
    """Closed form for a coordinate on (W/2)[1 - cos(2 pi s/period)].

    ``eff_inertia`` (kg m^2) is m b^2 for a translator (mass times the period
    squared) or I (2 pi/n)^2 for a rotor; ``barrier_j`` is W in J;
    ``ln_multiplicity`` is ln(n/sigma) for the rotor (periods per turn over the
    symmetry number) and 0 for the translator (one site).
    """
    t = temperature
    kt = C.k_B * t
    nu = np.sqrt(barrier_j / (2.0 * eff_inertia))            # Hz
    hnu = C.h * nu
    r = np.sqrt(2.0 * eff_inertia * barrier_j) / C.h          # W/(h nu), finite at W = 0
    z = barrier_j / (2.0 * kt)

    ln_i0e, pot, cv_pot = _bessel_terms(z)
    # classical part: ln[sqrt(pi r T*) e^-z I0(z)], sqrt(pi r T*) = sqrt(2 pi I_eff kT)/h
    ln_q = 0.5 * np.log(2.0 * C.pi * eff_inertia * kt / C.h**2) + ln_i0e + ln_multiplicity
    u_kt = 0.5 + pot
    cv_k = 0.5 + cv_pot
    zpe_j = np.zeros_like(hnu)
    if quantum:
        x = hnu / kt
        ln_ratio, u_ho, cv_ho = _quantum_ho_terms(x)
        ln_q = ln_q + ln_ratio
        u_kt = u_kt - 1.0 + u_ho
        cv_k = cv_k - 1.0 + cv_ho
        zpe_j = hnu * (0.5 - 1.0 / (2.0 + 16.0 * r))
    k_ev = C.kB_eV
    energy = u_kt * k_ev * t
    entropy = k_ev * (ln_q + u_kt)
    heat_capacity = k_ev * cv_k
    zpe = zpe_j / C.eV
    zpe = float(zpe) if np.ndim(zpe) == 0 else zpe
    return Contribution(ln_q=ln_q, energy=energy, entropy=entropy,
                        heat_capacity=heat_capacity, zpe=zpe)


# ---------------------------------------------------------------------------
# public functions
# ---------------------------------------------------------------------------


def translator_frequency_cm(mass_amu, barrier_eV, spacing_A):
    """Harmonic frequency of a hindered translator, nu = sqrt(W / (2 m b^2)).

    Second-order expansion of (W/2)[1 - cos(2 pi x/b)] (Sprowl, Campbell,
    Árnadóttir, J. Phys. Chem. C 2016, 120, 9719).

    Parameters
    ----------
    mass_amu : float or ndarray
        Adsorbate mass in amu.
    barrier_eV : float or ndarray
        Diffusion barrier W in eV (>= 0).
    spacing_A : float or ndarray
        Distance b between neighbouring minima in Å.

    Returns
    -------
    ndarray
        Frequency in cm^-1 (broadcast shape of the inputs).

    Raises
    ------
    InputError
        If an input is not finite and positive (barrier: non-negative).
    """
    m = _as_float_array("mass_amu", mass_amu) * C.amu
    w = _as_float_array("barrier_eV", barrier_eV, allow_zero=True) * C.eV
    b = _as_float_array("spacing_A", spacing_A) * C.angstrom
    return C.h * np.sqrt(w / (2.0 * m * b**2)) / C.invcm


def rotor_frequency_cm(inertia_amu_A2, barrier_eV, n_minima):
    """Harmonic frequency of a hindered rotor, nu = (n / 2 pi) sqrt(W / (2 I)).

    Second-order expansion of (W/2)[1 - cos(n phi)] (Sprowl, Campbell,
    Árnadóttir, J. Phys. Chem. C 2016, 120, 9719).

    Parameters
    ----------
    inertia_amu_A2 : float or ndarray
        Moment of inertia about the rotation axis in amu Å^2.
    barrier_eV : float or ndarray
        Rotational barrier W in eV (>= 0).
    n_minima : int or ndarray of int
        Number of equivalent minima in one full turn.

    Returns
    -------
    ndarray
        Frequency in cm^-1.

    Raises
    ------
    InputError
        If an input is not finite and positive, or ``n_minima`` is not an integer.
    """
    inertia = _as_float_array("inertia_amu_A2", inertia_amu_A2) * C.amu_A2
    w = _as_float_array("barrier_eV", barrier_eV, allow_zero=True) * C.eV
    n = _as_count_array("n_minima", n_minima)
    return C.h * (n / (2.0 * C.pi)) * np.sqrt(w / (2.0 * inertia)) / C.invcm


def hindered_translator(temperature, mass_amu, barrier_eV, spacing_A, *, quantum=True):
    """Hindered translator for ONE in-plane direction, per site.

    Sprowl, Campbell, Árnadóttir, J. Phys. Chem. C 2016, 120, 9719: the
    partition function of a particle of mass m on (W/2)[1 - cos(2 pi x/b)],
    over one site (length b),

        q_cl = b sqrt(2 pi m kT)/h * exp(-z) I0(z),   z = W/(2kT)
        q    = q_cl * [q_HO/q_HO,cl](nu) * exp(1/((2 + 16 r) T*))   (quantum=True)

    with nu from :func:`translator_frequency_cm`, r = W/(h nu), T* = kT/(h nu).
    Two directions: add two contributions (the model is separable). W = 0 gives
    the free 1D translator over one site, b sqrt(2 pi m kT)/h, exactly.

    Parameters
    ----------
    temperature : float or ndarray
        Temperature in K (> 0).
    mass_amu : float or ndarray
        Adsorbate mass in amu.
    barrier_eV : float or ndarray
        Diffusion barrier W in eV (>= 0).
    spacing_A : float or ndarray
        Site spacing b in Å (for the W -> 0 limit to be the 2D ideal gas, b^2
        must be the area per site).
    quantum : bool, optional
        True (default): the quantum-corrected form of Sprowl et al.; False: the
        classical Bessel form (zpe 0, energies from the well bottom).

    Returns
    -------
    Contribution
        ln_q from the model's ground level, U, S, Cv (analytic), and
        zpe = h nu [1/2 - 1/(2 + 16 r)] in eV (0 when ``quantum=False``).

    Raises
    ------
    InputError
        If an input is not finite and positive (barrier: non-negative).
    """
    t = _as_float_array("temperature", temperature)
    m = _as_float_array("mass_amu", mass_amu) * C.amu
    w = _as_float_array("barrier_eV", barrier_eV, allow_zero=True) * C.eV
    b = _as_float_array("spacing_A", spacing_A) * C.angstrom
    return _bessel_model(t, m * b**2, w, 0.0, quantum)


def hindered_rotor(temperature, inertia_amu_A2, barrier_eV, n_minima,
                   symmetry_number=1, *, quantum=True):
    """Hindered rotor about the surface normal.

    Sprowl, Campbell, Árnadóttir, J. Phys. Chem. C 2016, 120, 9719: rotation
    with moment I on (W/2)[1 - cos(n phi)],

        q_cl = (1/sigma) sqrt(8 pi^3 I kT)/h * exp(-z) I0(z),   z = W/(2kT)
        q    = q_cl * [q_HO/q_HO,cl](nu) * exp(1/((2 + 16 r) T*))   (quantum=True)

    with nu from :func:`rotor_frequency_cm`, r = W/(h nu), T* = kT/(h nu)
    (equivalently q_cl = (n/sigma) sqrt(pi r T*) e^-z I0(z)). W = 0 gives the
    classical 1D free rotor (1/sigma) sqrt(8 pi^3 I kT)/h exactly.

    Parameters
    ----------
    temperature : float or ndarray
        Temperature in K (> 0).
    inertia_amu_A2 : float or ndarray
        Moment of inertia about the rotation axis in amu Å^2.
    barrier_eV : float or ndarray
        Rotational barrier W in eV (>= 0).
    n_minima : int or ndarray of int
        Number of equivalent minima per full turn (set by the surface).
    symmetry_number : int or ndarray of int, optional
        Rotational symmetry number sigma of the adsorbate about the axis
        (indistinguishable orientations per turn); divides q. Default 1.
    quantum : bool, optional
        True (default): quantum-corrected form; False: classical Bessel form.

    Returns
    -------
    Contribution
        ln_q from the model's ground level (includes ln(n/sigma)), U, S, Cv,
        zpe = h nu [1/2 - 1/(2 + 16 r)] in eV (0 when ``quantum=False``).

    Raises
    ------
    InputError
        If an input is not finite and positive (barrier: non-negative), or a
        count is not an integer.
    """
    t = _as_float_array("temperature", temperature)
    inertia = _as_float_array("inertia_amu_A2", inertia_amu_A2) * C.amu_A2
    w = _as_float_array("barrier_eV", barrier_eV, allow_zero=True) * C.eV
    n = _as_count_array("n_minima", n_minima)
    sigma = _as_count_array("symmetry_number", symmetry_number)
    eff = inertia * (2.0 * C.pi / n) ** 2
    return _bessel_model(t, eff, w, np.log(n / sigma), quantum)


# ---------------------------------------------------------------------------
# where the closed forms are accurate
# ---------------------------------------------------------------------------


def _reliable_dimensionless(kt, eff_inertia, barrier_j):
    """The measured accuracy rule in terms of r = W/(h nu) and T* = kT/(h nu).

    ``eff_inertia`` is m b^2 (translator) or I (2 pi/n)^2 (rotor) in SI, so
    that h nu = h sqrt(W/(2 eff)) and r = sqrt(2 eff W)/h for both models.

    True where |q_closed/q_exact - 1| <= 1 % and |S_closed - S_exact| <= 0.02 k
    for the cosine potential (measured against :mod:`adsorb.partition.periodic`
    on a grid r = 0.001-30, T* = 0.003-300, translator and rotors with 1, 2,
    3 and 6 minima: worst in-rule deviation 0.80 % in q and 0.017 k in S; see
    docs/methods-adsorbates.md):

        (r >= 3 and T* >= 2/r^2)  or  (r >= 2 and T* >= 0.3)  or  T* >= min(6/r, 75)

    The first branch is the deep-well regime (the closed form's zero-point
    energy is slightly off, which shows up in q only at very low T*); the
    others the shallow-well regime, where the harmonic quantum correction is
    wrong until kT is many quanta.
    """
    hnu = C.h * np.sqrt(barrier_j / (2.0 * eff_inertia))
    r = np.sqrt(2.0 * eff_inertia * barrier_j) / C.h
    t_star = np.where(hnu > 0.0, kt / np.where(hnu > 0.0, hnu, 1.0), np.inf)
    r_safe = np.where(r > 0.0, r, 1.0)
    deep = (r >= 3.0) & (t_star >= 2.0 / r_safe**2)
    mid = (r >= 2.0) & (t_star >= 0.3)
    shallow = t_star >= np.minimum(np.where(r > 0.0, 6.0 / r_safe, np.inf), 75.0)
    return deep | mid | shallow


def translator_closed_form_reliable(temperature, mass_amu, barrier_eV, spacing_A):
    """Whether :func:`hindered_translator` is within 1 % in q and 0.02 k in S.

    The closed form of Sprowl, Campbell, Árnadóttir (J. Phys. Chem. C 2016,
    120, 9719) is compared here with the exact Bloch solution of the same
    cosine potential (:func:`adsorb.partition.periodic.lattice_translator`).
    The deviation depends only on r = W/(h nu) and T* = kT/(h nu); the rule
    (see ``_reliable_dimensionless``) was measured on a grid and is checked in
    the tests. Typical outcome: adsorbates of 12 amu and more at 10-2000 K with
    0.01-1 eV barriers pass; a hydrogen atom with a small barrier below about
    100 K does not. W = 0 (free translator) is exact and passes.

    Parameters
    ----------
    temperature : float or ndarray
        Temperature in K.
    mass_amu, barrier_eV, spacing_A : float or ndarray
        As in :func:`hindered_translator`.

    Returns
    -------
    ndarray of bool
        True where the closed form is within the stated accuracy.

    Raises
    ------
    InputError
        On invalid input.
    """
    t = _as_float_array("temperature", temperature)
    m = _as_float_array("mass_amu", mass_amu) * C.amu
    w = _as_float_array("barrier_eV", barrier_eV, allow_zero=True) * C.eV
    b = _as_float_array("spacing_A", spacing_A) * C.angstrom
    return _reliable_dimensionless(C.k_B * t, m * b**2, w)


def rotor_closed_form_reliable(temperature, inertia_amu_A2, barrier_eV, n_minima):
    """Whether :func:`hindered_rotor` is within 1 % in q and 0.02 k in S.

    Same rule as :func:`translator_closed_form_reliable` (measured against
    :func:`adsorb.partition.periodic.ring_rotor` for rotors with 1, 2, 3 and 6
    minima), plus T >= hbar^2/(2 I k), the rotational temperature: below it
    even the free rotor is far from classical (the classical free-rotor q is
    exact up to 2 exp(-pi^2 T/Theta) above it, by Poisson summation).
    Typical outcome: with up to 3 minima, rotors of I >= 5 amu Å^2 pass from
    10-30 K for barriers of 0.02-0.3 eV; at I = 3 amu Å^2 and 3 minima the
    closed form is off by 1-3 % in q at low T unless W >= 0.1 eV; light rotors
    with 6 minima fail up to several hundred K.

    Parameters
    ----------
    temperature : float or ndarray
        Temperature in K.
    inertia_amu_A2, barrier_eV, n_minima : float or ndarray
        As in :func:`hindered_rotor` (the symmetry number does not matter).

    Returns
    -------
    ndarray of bool
        True where the closed form is within the stated accuracy.

    Raises
    ------
    InputError
        On invalid input.
    """
    t = _as_float_array("temperature", temperature)
    inertia = _as_float_array("inertia_amu_A2", inertia_amu_A2) * C.amu_A2
    w = _as_float_array("barrier_eV", barrier_eV, allow_zero=True) * C.eV
    n = _as_count_array("n_minima", n_minima)
    theta = C.hbar**2 / (2.0 * inertia * C.k_B)
    return _reliable_dimensionless(C.k_B * t, inertia * (2.0 * C.pi / n) ** 2, w) & (t >= theta)


def closed_form_reliable(temperature, *, mass_amu=None, barrier_eV=None, spacing_A=None,
                         inertia_amu_A2=None, rotation_barrier_eV=None, n_minima=None):
    """Combined check for an adsorbate with a hindered translator and/or rotor.

    True where every part that is given passes
    :func:`translator_closed_form_reliable` (``mass_amu``, ``barrier_eV``,
    ``spacing_A``) and :func:`rotor_closed_form_reliable` (``inertia_amu_A2``,
    ``rotation_barrier_eV``, ``n_minima``).

    Parameters
    ----------
    temperature : float or ndarray
        Temperature in K.
    mass_amu, barrier_eV, spacing_A : float, optional
        Translator parameters (all three or none).
    inertia_amu_A2, rotation_barrier_eV, n_minima : float, optional
        Rotor parameters (all three or none).

    Returns
    -------
    ndarray of bool
        Shape of the broadcast inputs.

    Raises
    ------
    InputError
        If a group of parameters is incomplete, neither group is given, or a
        value is invalid.
    """
    groups = {"translator": (mass_amu, barrier_eV, spacing_A),
              "rotor": (inertia_amu_A2, rotation_barrier_eV, n_minima)}
    t = _as_float_array("temperature", temperature)
    ok = np.ones(t.shape, dtype=bool)
    used = False
    for name, values in groups.items():
        given = [v is not None for v in values]
        if any(given) and not all(given):
            keys = ("mass_amu, barrier_eV, spacing_A" if name == "translator"
                    else "inertia_amu_A2, rotation_barrier_eV, n_minima")
            msg = f"closed_form_reliable: the {name} needs all of ({keys}), got {values!r}"
            raise InputError(msg)
        if all(given):
            used = True
            check = translator_closed_form_reliable if name == "translator" else rotor_closed_form_reliable
            ok = ok & check(t, *values)
    if not used:
        msg = "closed_form_reliable: give the translator and/or the rotor parameters"
        raise InputError(msg)
    return ok
