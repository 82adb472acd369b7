"""Rigid rotation: classical linear and non-linear rotors, an exact level sum
for linear molecules (with centrifugal distortion and nuclear-spin
statistics), and the one-dimensional free rotor.

Energies are measured from the lowest allowed rotational level; for the
classical rotors that is the classical zero (energy 0).

Sources: D. A. McQuarrie, *Statistical Mechanics* (Harper & Row, 1976),
ch. 6 (linear rotor, level sum, ortho/para hydrogen) and ch. 8 (non-linear
rotor); G. Herzberg, *Molecular Spectra and Molecular Structure I. Spectra of
Diatomic Molecules*, 2nd ed. (Van Nostrand, 1950), ch. III and V (the term
values F(J) = B J(J+1) - D J^2(J+1)^2 and nuclear-spin weights).
"""

from __future__ import annotations

import warnings

import numpy as np

from adsorb import constants as C
from adsorb.errors import InputError, ModelWarning
from adsorb.partition.checks import positive_array as _positive
from adsorb.partition.contribution import Contribution

__all__ = ["linear_rotor", "linear_rotor_levels", "nonlinear_rotor", "free_rotor"]

# Levels are summed until (E_J - E_0)/kT exceeds this value at the highest
# temperature of the call: the neglected tail is below exp(-60) ~ 1e-26 of q.
_X_CUT = 60.0
# Work-array size (temperatures x levels) per chunk of the level sum.
_CHUNK_ELEMENTS = 1 << 20
# Relative weight of the last summed level above which a truncated (centrifugal
# turnover) sum is reported as not converged.
_TAIL_WARN = 1.0e-6



def _symmetry(symmetry_number):
    """The rotational symmetry number as an int >= 1, else InputError."""
    try:
        sigma = int(symmetry_number)
        ok = sigma >= 1 and float(symmetry_number) == sigma
    except (TypeError, ValueError, OverflowError):
        ok = False
    if not ok:
        raise InputError(f"symmetry_number must be a positive integer; got {symmetry_number!r}")
    return sigma


def _classical(t, ln_q, half_degrees):
    """Contribution of a classical rotor with ``2*half_degrees`` quadratic terms."""
    shape = np.shape(ln_q)
    energy = np.broadcast_to(half_degrees * C.kB_eV * t, shape).copy()
    entropy = C.kB_eV * (ln_q + half_degrees)
    heat_capacity = np.full(shape, half_degrees * C.kB_eV)
    return Contribution(ln_q, energy, entropy, heat_capacity, 0.0)


def linear_rotor(temperature, b_cm, symmetry_number=1) -> Contribution:
    """Classical (high-temperature) rigid linear rotor.

    q = kT / (σ h c B) = T / (σ θ_rot) with θ_rot = hcB/k; U = kT; Cv = k;
    S = k (ln q + 1). Accurate when T >> θ_rot; the exact level sum gives
    U = kT - k θ_rot/3 + ... (Mulholland 1928), see :func:`linear_rotor_levels`.

    Source: D. A. McQuarrie, *Statistical Mechanics* (1976), eq. 6-40.

    Parameters
    ----------
    temperature : array_like
        Temperature in K (> 0), any shape.
    b_cm : float or array_like
        Rotational constant B in cm^-1 (> 0).
    symmetry_number : int, optional
        Rotational symmetry number σ (1 heteronuclear, 2 homonuclear/centrosymmetric).

    Returns
    -------
    Contribution
        ``zpe`` = 0.

    Raises
    ------
    InputError
        Non-positive temperature or B, or a symmetry number that is not a
        positive integer.
    """
    t = _positive("temperature", temperature, "K")
    theta = _positive("b_cm", b_cm, "cm^-1") * C.invcm_K
    sigma = _symmetry(symmetry_number)
    ln_q = np.log(t / (sigma * theta))
    return _classical(t, ln_q, 1.0)


def nonlinear_rotor(temperature, abc_cm, symmetry_number=1) -> Contribution:
    """Classical rigid rotor of a non-linear molecule.

    q = (sqrt(π)/σ) (kT/hc)^{3/2} / sqrt(A B C) = (sqrt(π)/σ) T^{3/2} /
    sqrt(θ_A θ_B θ_C); U = 3/2 kT; Cv = 3/2 k; S = k (ln q + 3/2).

    Source: D. A. McQuarrie, *Statistical Mechanics* (1976), eq. 8-19.

    Parameters
    ----------
    temperature : array_like
        Temperature in K (> 0), any shape.
    abc_cm : array_like, shape (..., 3)
        Rotational constants A, B, C in cm^-1 (> 0), on the last axis.
    symmetry_number : int, optional
        Rotational symmetry number σ (e.g. 2 for H2O, 3 for NH3, 12 for CH4).

    Returns
    -------
    Contribution
        ``zpe`` = 0.

    Raises
    ------
    InputError
        Non-positive temperature or constants, a last axis that is not of
        length 3, or a bad symmetry number.
    """
    t = _positive("temperature", temperature, "K")
    try:
        abc = np.asarray(abc_cm, dtype=float)
    except (TypeError, ValueError):
        raise InputError(f"abc_cm must be numbers (A, B, C) in cm^-1, got {abc_cm!r}") from None
    if abc.ndim == 0 or abc.shape[-1] != 3:
        raise InputError(
            f"abc_cm must hold three rotational constants (A, B, C) in cm^-1 on its last axis; "
            f"got shape {abc.shape}")
    abc = _positive("abc_cm", abc, "cm^-1")
    sigma = _symmetry(symmetry_number)
    ln_theta = np.log(abc * C.invcm_K).sum(axis=-1)
    ln_q = 0.5 * np.log(C.pi) - np.log(sigma) + 1.5 * np.log(t) - 0.5 * ln_theta
    return _classical(t, ln_q, 1.5)


def free_rotor(temperature, inertia_amu_A2, symmetry_number=1) -> Contribution:
    """Classical one-dimensional free rotor about a fixed axis.

    Levels ħ^2 m^2 / (2I), m integer; classical q = sqrt(8 π^3 I k T) / (σ h);
    U = kT/2; Cv = k/2; S = k (ln q + 1/2).

    Source: D. A. McQuarrie, *Statistical Mechanics* (1976), problem 8-13 and
    K. S. Pitzer, W. D. Gwinn, J. Chem. Phys. 10, 428 (1942) (free internal rotor).

    Parameters
    ----------
    temperature : array_like
        Temperature in K (> 0), any shape.
    inertia_amu_A2 : float or array_like
        Moment of inertia about the rotation axis in amu Å^2 (> 0).
    symmetry_number : int, optional
        Number of indistinguishable orientations per turn.

    Returns
    -------
    Contribution
        ``zpe`` = 0.

    Raises
    ------
    InputError
        Non-positive temperature or inertia, or a bad symmetry number.
    """
    t = _positive("temperature", temperature, "K")
    inertia = _positive("inertia_amu_A2", inertia_amu_A2, "amu Å^2") * C.amu_A2
    sigma = _symmetry(symmetry_number)
    ln_q = 0.5 * np.log(8.0 * C.pi**3 * inertia * C.k_B * t / C.h**2) - np.log(sigma)
    return _classical(t, ln_q, 0.5)


def _spin_weights(j, nuclear_spin, even_j_symmetric):
    """Nuclear-spin statistical weight of each J divided by (2I+1)^2."""
    two_i = 2.0 * nuclear_spin
    if two_i < 0 or abs(two_i - round(two_i)) > 1e-9:
        raise InputError(
            f"nuclear_spin must be a non-negative multiple of 1/2; got {nuclear_spin!r}")
    spin = round(two_i) / 2.0
    n = 2.0 * spin + 1.0
    symmetric_spin = (spin + 1.0) * n      # spin states symmetric under exchange
    antisymmetric_spin = spin * n
    fermion = round(two_i) % 2 == 1
    rot_symmetric = (j % 2 == 0) == bool(even_j_symmetric)
    # bosons: symmetric rotational levels pair with symmetric spin states;
    # fermions: with antisymmetric ones.
    if fermion:
        w = np.where(rot_symmetric, antisymmetric_spin, symmetric_spin)
    else:
        w = np.where(rot_symmetric, symmetric_spin, antisymmetric_spin)
    return w / n**2


def linear_rotor_levels(temperature, b_cm, *, d_cm=0.0, symmetry_number=1,
                        nuclear_spin=None, even_j_symmetric=True) -> Contribution:
    """Linear rotor by explicit summation over rotational levels.

    q = (1/σ') Σ_J w_J (2J+1) exp[-(E_J - E_min)/kT] with term values
    E_J = hc [B J(J+1) - D J^2 (J+1)^2] (Herzberg 1950, ch. III).
    Without nuclear spin w_J = 1 and σ' = σ (the usual high-temperature
    correction for a homonuclear molecule). With ``nuclear_spin`` = I the
    molecule is a homonuclear diatomic in equilibrium between its ortho and
    para forms: w_J is the number of nuclear-spin states allowed for J, divided
    by (2I+1)^2 (the conventional entropy, which omits the nuclear-spin
    entropy), and σ' = 1 because the spin weights already account for the
    symmetry (at high T q -> T/(2 θ_rot)). For H2 (I = 1/2, ¹Σg⁺) the weights are
    1/4 (even J, para) and 3/4 (odd J, ortho), as in the NIST-JANAF H2 table
    (Chase 1998, table H-050).

    U = <E - E_min>, S = k ln q + U/T, Cv = (<E^2> - <E>^2)/(kT^2), evaluated
    with a two-pass variance; the number of levels is chosen so that the
    neglected tail is below exp(-60) of q at the highest temperature. With
    D > 0 the term values turn over at J^2 ~ B/(2D); the sum stops there and a
    :class:`~adsorb.errors.ModelWarning` is issued where that truncation is not
    converged (the two-term expansion is no longer valid).

    Sources: D. A. McQuarrie, *Statistical Mechanics* (1976), sec. 6-5;
    G. Herzberg, *Spectra of Diatomic Molecules* (1950), ch. III and V.

    Parameters
    ----------
    temperature : array_like
        Temperature in K (> 0), any shape.
    b_cm : float
        Rotational constant B in cm^-1 (> 0), e.g. B0 of the ground vibrational level.
    d_cm : float, optional
        Centrifugal distortion constant D in cm^-1 (>= 0). Default 0.
    symmetry_number : int, optional
        σ; must be 2 when ``nuclear_spin`` is given.
    nuclear_spin : float or None, optional
        Spin I of each of the two identical nuclei (0.5 for 1H, 1 for 2H and 14N).
    even_j_symmetric : bool, optional
        True (default) when even-J levels are symmetric under exchange of the
        nuclei, as in Σg⁺ (and Σu⁻) electronic states; False for Σg⁻ / Σu⁺
        states such as ground-state O2 (³Σg⁻). Used only with ``nuclear_spin``.

    Returns
    -------
    Contribution
        Energies from the lowest allowed level; ``zpe`` is that level's
        rotational energy hc(B J(J+1) - ...) in eV (0 unless J = 0 is forbidden).

    Raises
    ------
    InputError
        Non-positive temperature or B, negative D, a nuclear spin that is not
        a multiple of 1/2, or ``nuclear_spin`` with σ != 2.
    """
    t = _positive("temperature", temperature, "K")
    b = float(_positive("b_cm", b_cm, "cm^-1"))
    d = float(np.asarray(d_cm, dtype=float))
    if not (np.isfinite(d) and d >= 0):
        raise InputError(f"d_cm must be finite and >= 0 cm^-1; got {d_cm!r}")
    sigma = _symmetry(symmetry_number)
    if nuclear_spin is not None and sigma != 2:
        raise InputError(
            f"nuclear_spin applies to homonuclear diatomics, which need symmetry_number=2; "
            f"got symmetry_number={symmetry_number!r}")
    theta, delta = b * C.invcm_K, d * C.invcm_K
    t_max = float(t.max()) if t.size else 1.0

    # levels needed: smallest x = J(J+1) with theta x - delta x^2 >= X_CUT t_max
    need = _X_CUT * t_max
    j_turn = None
    if delta > 0:
        j_turn = int(np.floor(np.sqrt(theta / (2.0 * delta))))
        disc = theta * theta - 4.0 * delta * need
        x_need = 2.0 * need / (theta + np.sqrt(disc)) if disc > 0 else np.inf
    else:
        x_need = need / theta
    j_max = int(np.ceil(0.5 * (np.sqrt(1.0 + 4.0 * min(x_need, 1e12)) - 1.0))) + 2
    truncated = j_turn is not None and j_max > j_turn
    if truncated:
        j_max = j_turn
    j = np.arange(j_max + 1, dtype=float)
    jj = j * (j + 1.0)
    level_k = theta * jj - delta * jj * jj          # E_J / k, in K
    weight = 2.0 * j + 1.0
    if nuclear_spin is not None:
        weight = weight * _spin_weights(j, nuclear_spin, even_j_symmetric)
        ln_sigma = 0.0
    else:
        ln_sigma = np.log(sigma)
    allowed = weight > 0
    j, level_k, weight = j[allowed], level_k[allowed], weight[allowed]
    e_min = level_k[0]
    level_k = level_k - e_min

    flat = t.reshape(-1)
    ln_q = np.empty(flat.shape)
    mean = np.empty(flat.shape)
    var = np.empty(flat.shape)
    last = np.empty(flat.shape)
    step = max(1, _CHUNK_ELEMENTS // level_k.size)
    for i in range(0, flat.size, step):
        tc = flat[i:i + step, None]
        a = level_k / tc                             # (E_J - E_min)/kT, >= 0
        w = weight * np.exp(-a)
        rest = w[:, 1:].sum(axis=1)                  # levels above the lowest one
        q = weight[0] + rest
        m = (w * a).sum(axis=1) / q
        dev = a - m[:, None]
        var[i:i + step] = (w * dev * dev).sum(axis=1) / q
        mean[i:i + step] = m
        # ln q = ln w_0 + ln(1 + rest/w_0): keeps full precision when q -> w_0 at low T
        ln_q[i:i + step] = np.log(weight[0]) + np.log1p(rest / weight[0])
        last[i:i + step] = w[:, -1] / q
    if truncated and np.any(last > _TAIL_WARN):
        hot = flat[last > _TAIL_WARN]
        warnings.warn(
            f"linear_rotor_levels: with d_cm={d!r} the term values stop rising at J={j_turn}; "
            f"the level sum is not converged there for T >= {hot.min():.6g} K "
            f"(last-level weight {last.max():.2g}); the centrifugal expansion is not valid so hot",
            ModelWarning, stacklevel=2)
    ln_q = ln_q.reshape(t.shape) - ln_sigma
    mean = mean.reshape(t.shape)
    energy = C.kB_eV * t * mean
    entropy = C.kB_eV * (ln_q + mean)
    heat_capacity = C.kB_eV * var.reshape(t.shape)
    zpe = float(e_min * C.kB_eV)
    return Contribution(ln_q, energy, entropy, heat_capacity, zpe)
