"""Peng–Robinson equation of state: compressibility, fugacity coefficients, fugacities.

Used to replace partial pressures by fugacities in the site balances at high
pressure (``K p`` → ``K f``, f_i = φ_i y_i p), and to tell when the ideal-gas
reference is no longer adequate.

Equations (D.-Y. Peng, D. B. Robinson, "A New Two-Constant Equation of State",
Ind. Eng. Chem. Fundam. 1976, 15, 59–64, DOI 10.1021/i160057a011)::

    p = R T/(v - b) - a α(T) / [v (v + b) + b (v - b)]
    a = 0.45724 R² Tc²/Pc,  b = 0.07780 R Tc/Pc,  α = [1 + κ (1 - (T/Tc)^½)]²
    κ = 0.37464 + 1.54226 ω - 0.26992 ω²                         (ω <= 0.49)
    κ = 0.379642 + 1.48503 ω - 0.164423 ω² + 0.016666 ω³          (ω > 0.49; the 1978
        revision: D. B. Robinson, D.-Y. Peng, GPA Research Report RR-28, 1978, from memory)
    A = a α p/(R T)²,  B = b p/(R T)
    Z³ - (1 - B) Z² + (A - 3B² - 2B) Z - (A B - B² - B³) = 0
    ln φ = Z - 1 - ln(Z - B) - A/(2√2 B) ln[(Z + (1+√2) B)/(Z + (1-√2) B)]

Mixtures: van der Waals one-fluid rules a = Σ_ij y_i y_j (a_i a_j)^½ (1 - k_ij),
b = Σ_i y_i b_i, and the component fugacity coefficient
ln φ_i = (b_i/b)(Z - 1) - ln(Z - B)
         - A/(2√2 B) [2 Σ_j y_j a_ij/a - b_i/b] ln[(Z + (1+√2)B)/(Z + (1-√2)B)]
(Peng & Robinson 1976).

Root choice: where the cubic has three real roots above B, the root of lowest
residual Gibbs energy is taken (for a mixture Σ y_i ln φ_i, equivalently the pure
formula with the mixture A and B). The state is called liquid-like when that root
is the smallest of three, or when the only root is dense (Z below the PR critical
compressibility 0.3074) at a subcritical temperature (T < Tc; for a mixture the
pseudo-critical Σ y_i Tc_i of Kay's rule, W. B. Kay, Ind. Eng. Chem. 1936, 28, 1014,
from memory). A liquid-like state means the fluid is condensed at the requested
(T, p): a :class:`~adsorb.errors.ModelWarning` says so, because a gas-phase
reference is then meaningless. No phase split (flash) is computed for mixtures:
the mixture is treated as one phase, so a mixture inside its two-phase envelope is
not detected.
"""

from __future__ import annotations

import re
import warnings
from dataclasses import dataclass

import numpy as np

from adsorb import constants
from adsorb.errors import InputError, ModelWarning

__all__ = [
    "CriticalConstants",
    "CRITICAL_CONSTANTS",
    "critical_constants",
    "PengRobinsonState",
    "peng_robinson_pure",
    "peng_robinson_mixture",
    "fugacities",
    "ideality_warnings",
]

_OMEGA_A = 0.45724
_OMEGA_B = 0.07780
_SQRT2 = np.sqrt(2.0)
_Z_CRIT = 0.3074          # critical compressibility factor of the Peng–Robinson equation

_POLING = ("B. E. Poling, J. M. Prausnitz, J. P. O'Connell, The Properties of Gases and "
           "Liquids, 5th ed., McGraw-Hill, 2001, Appendix A")


@dataclass(frozen=True)
class CriticalConstants:
    """Critical temperature (K), critical pressure (Pa) and acentric factor of a gas."""

    name: str
    critical_temperature: float
    critical_pressure: float
    acentric_factor: float
    source: str = "user supplied"


def _entry(name, tc, pc_bar, omega, note="from memory"):
    return CriticalConstants(name, tc, pc_bar * constants.bar, omega, f"{_POLING} ({note})")


#: Critical constants (Tc in K, Pc in Pa, ω) with their sources. Values recalled
#: from Poling et al. (marked "from memory"), not re-read from the book.
CRITICAL_CONSTANTS = {
    c.name: c for c in (
        _entry("H2", 33.19, 13.13, -0.216,
               "from memory; quantum gas: the standard α(T) is poor for H2"),
        _entry("N2", 126.20, 33.98, 0.037,
               "from memory; the same values are used in R. Smith, Chemical Process Design "
               "and Integration, Wiley, 2005, Example 4.1"),
        _entry("O2", 154.58, 50.43, 0.022),
        _entry("CO", 132.85, 34.94, 0.045),
        _entry("CO2", 304.12, 73.74, 0.225),
        _entry("H2O", 647.14, 220.64, 0.344),
        _entry("NH3", 405.40, 113.53, 0.257),
        _entry("CH4", 190.56, 45.99, 0.011),
        _entry("Ar", 150.86, 48.98, -0.002),
        _entry("He", 5.19, 2.27, -0.390,
               "from memory; quantum gas: the standard α(T) is poor for He"),
        _entry("C2H6", 305.32, 48.72, 0.099),
        _entry("C2H4", 282.34, 50.41, 0.087),
    )
}


def _composition(name):
    """Element counts of a table name such as 'C2H6' (Hill-like formulas of the table)."""
    counts = {}
    for symbol, n in re.findall(r"([A-Z][a-z]?)(\d*)", name):
        counts[symbol] = counts.get(symbol, 0) + (int(n) if n else 1)
    return counts


def constants_for_composition(counts):
    """The :data:`CRITICAL_CONSTANTS` entry of a molecule with these element counts, or None.

    Parameters
    ----------
    counts : mapping of str to int
        Element symbol -> number of atoms (e.g. ``{"N": 1, "H": 3}`` for NH3).
    """
    wanted = {str(k): int(v) for k, v in dict(counts).items() if int(v)}
    for entry in CRITICAL_CONSTANTS.values():
        if _composition(entry.name) == wanted:
            return entry
    return None


def critical_constants(species):
    """Look up :class:`CriticalConstants` by name, or pass one through unchanged.

    Parameters
    ----------
    species : str or CriticalConstants
        A key of :data:`CRITICAL_CONSTANTS` (e.g. ``"CO2"``) or a user-made entry.

    Raises
    ------
    InputError
        Unknown name, or non-physical constants.
    """
    if isinstance(species, CriticalConstants):
        c = species
    else:
        try:
            c = CRITICAL_CONSTANTS[species]
        except (KeyError, TypeError):
            msg = (f"species: unknown gas {species!r}; expected one of "
                   f"{sorted(CRITICAL_CONSTANTS)} or a CriticalConstants entry")
            raise InputError(msg) from None
    vals = (c.critical_temperature, c.critical_pressure, c.acentric_factor)
    if not all(np.isfinite(vals)) or c.critical_temperature <= 0 or c.critical_pressure <= 0:
        msg = (f"critical constants of {c.name!r}: expected Tc > 0 K, Pc > 0 Pa and a finite "
               f"acentric factor, got {vals}")
        raise InputError(msg)
    return c


@dataclass(frozen=True)
class PengRobinsonState:
    """Peng–Robinson state of a gas (pure or mixture) on a (T, p) grid.

    Attributes
    ----------
    z : ndarray of shape grid
        Compressibility factor Z = p v/(R T) of the chosen root.
    ln_phi : ndarray
        ln of the fugacity coefficient: shape grid for a pure gas, (n_components, *grid)
        for a mixture.
    three_roots : ndarray of bool, shape grid
        True where the cubic has three real roots above B (near or below saturation).
    liquid_like : ndarray of bool, shape grid
        True where the chosen (lowest Gibbs energy) root is the liquid-like one.
    """

    z: np.ndarray
    ln_phi: np.ndarray
    three_roots: np.ndarray
    liquid_like: np.ndarray

    @property
    def phi(self):
        """Fugacity coefficient(s) φ = exp(ln φ)."""
        return np.exp(self.ln_phi)


# --------------------------------------------------------------------------- internals

def _positive_grid(value, name, unit):
    arr = np.asarray(value, dtype=float)
    if not np.all(np.isfinite(arr)) or np.any(arr <= 0):
        bad = arr[~(np.isfinite(arr) & (arr > 0))].flat[0]
        msg = f"{name}: expected finite values > 0 in {unit}, got {bad!r}"
        raise InputError(msg)
    return arr


def _kappa(omega):
    omega = np.asarray(omega, dtype=float)
    k76 = 0.37464 + 1.54226 * omega - 0.26992 * omega**2
    k78 = 0.379642 + 1.48503 * omega - 0.164423 * omega**2 + 0.016666 * omega**3
    return np.where(omega > 0.49, k78, k76)


def _reduced_ab(consts, T):
    """Per-component a α p⁻¹ (R T)² → A_i/p and B_i/p factors: returns (a_t, b_t) with
    A_i = a_t[i] p / T², B_i = b_t[i] p / T (R cancels)."""
    tc = np.array([c.critical_temperature for c in consts])
    pc = np.array([c.critical_pressure for c in consts])
    kap = _kappa([c.acentric_factor for c in consts])
    shape = (-1,) + (1,) * np.ndim(T)
    tc, pc, kap = tc.reshape(shape), pc.reshape(shape), kap.reshape(shape)
    alpha = (1.0 + kap * (1.0 - np.sqrt(T / tc))) ** 2
    return _OMEGA_A * alpha * tc**2 / pc, _OMEGA_B * tc / pc


def _cubic_real_roots(a2, a1, a0):
    """Largest and smallest real roots of Z³ + a2 Z² + a1 Z + a0 and a three-real-roots mask."""
    shift = a2 / 3.0
    p = a1 - a2 * shift
    q = 2.0 * shift**3 - shift * a1 + a0
    disc = (q / 2.0) ** 2 + (p / 3.0) ** 3
    three = disc < 0
    # one real root (Cardano, cancellation-free form)
    s = np.sqrt(np.where(three, 0.0, disc))
    w = -q / 2.0 - np.copysign(s, q)
    u = np.cbrt(w)
    u_safe = np.where(u == 0, 1.0, u)
    t1 = np.where(u == 0, 0.0, u - p / (3.0 * u_safe))
    # three real roots (trigonometric form)
    r = np.sqrt(np.where(three, -p / 3.0, 1.0))
    cos_arg = np.clip(np.where(three, (-q / 2.0) / r**3, 0.0), -1.0, 1.0)
    ang = np.arccos(cos_arg) / 3.0
    t_hi = 2.0 * r * np.cos(ang)
    t_lo = 2.0 * r * np.cos(ang + 2.0 * np.pi / 3.0)

    def polish(z):
        for _ in range(3):
            f = ((z + a2) * z + a1) * z + a0
            d = (3.0 * z + 2.0 * a2) * z + a1
            z = z - np.where(d != 0, f / np.where(d != 0, d, 1.0), 0.0)
        return z

    z_hi = polish(np.where(three, t_hi, t1) - shift)
    # With three roots the smallest comes from the quadratic left after dividing out the largest
    # (Vieta: z_mid + z_lo = -a2 - z_hi, z_mid z_lo = -a0/z_hi), as its root c/q, free of
    # cancellation (Press et al., Numerical Recipes, 2nd ed., §5.6, from memory). The
    # trigonometric form gives it as a difference of numbers of order one, which loses its digits
    # when the root is far below one (tiny B: liquid roots at low reduced pressure, off by 4 %).
    deflate = three & (z_hi != 0)
    bq = a2 + z_hi
    cq = -a0 / np.where(deflate, z_hi, 1.0)
    qq = -0.5 * (bq + np.copysign(np.sqrt(np.maximum(bq * bq - 4.0 * cq, 0.0)), bq))
    small = np.where(qq != 0, np.minimum(qq, cq / np.where(qq != 0, qq, 1.0)), 0.0)
    z_lo = polish(np.where(deflate, small, np.where(three, t_lo, t1) - shift))
    # a near-double pair that rounding made real (disc < 0 by a hair) has no root there: Newton
    # wanders off, so only a small root that satisfies the cubic counts as a third root
    f_lo = ((z_lo + a2) * z_lo + a1) * z_lo + a0
    size = np.abs(z_lo) ** 3 + np.abs(a2) * z_lo**2 + np.abs(a1 * z_lo) + np.abs(a0)
    three = three & (np.abs(f_lo) <= 1e-10 * size)
    return z_hi, z_lo, three


def _log_ratio(Z, B):
    """ln[(Z + (1+√2)B)/(Z + (1-√2)B)] without cancellation at small B."""
    return np.log1p(2.0 * _SQRT2 * B / (Z + (1.0 - _SQRT2) * B))


def _g_residual(Z, A, B):
    """Residual Gibbs energy over RT (= ln φ of a pure fluid) for root Z."""
    return Z - 1.0 - np.log(Z - B) - A / (2.0 * _SQRT2 * B) * _log_ratio(Z, B)


def _choose_root(A, B, root, subcritical):
    """Chosen Z, three-root mask and liquid-like mask.

    Liquid-like: the chosen root is the smaller of three, or it is the only root,
    the fluid is subcritical and Z is below the critical compressibility of the
    Peng–Robinson equation, Z_c = 0.3074 (a dense, condensed state).
    """
    z_hi, z_lo, three = _cubic_real_roots(-(1.0 - B), A - 3.0 * B**2 - 2.0 * B,
                                          -(A * B - B**2 - B**3))
    three = three & (z_lo > B) & (z_hi - z_lo > 1e-10 * z_hi)
    z_lo = np.where(three, z_lo, z_hi)
    dense_single = ~three & subcritical & (z_hi < _Z_CRIT)
    if root == "vapour":
        return z_hi, three, dense_single
    if root == "liquid":
        return z_lo, three, three | dense_single
    g_hi = _g_residual(z_hi, A, B)
    g_lo = _g_residual(z_lo, A, B)
    liquid = three & (g_lo < g_hi)
    return np.where(liquid, z_lo, z_hi), three, liquid | dense_single


def _warn_liquid(liquid, T, p, what):
    if np.any(liquid):
        i = np.flatnonzero(liquid.ravel())[0]
        Tb = np.broadcast_to(T, liquid.shape).ravel()[i]
        pb = np.broadcast_to(p, liquid.shape).ravel()[i]
        msg = (f"Peng–Robinson: {what} is condensed (liquid-like stable root) at "
               f"{int(liquid.sum())} of {liquid.size} conditions, e.g. T = {Tb:.6g} K, "
               f"p = {pb:.6g} Pa; a gas-phase reference is meaningless there")
        warnings.warn(msg, ModelWarning, stacklevel=3)


def _check_root(root):
    if root not in ("stable", "vapour", "liquid"):
        msg = f"root: expected 'stable', 'vapour' or 'liquid', got {root!r}"
        raise InputError(msg)


# --------------------------------------------------------------------------- public

def peng_robinson_pure(species, temperature, pressure, *, root="stable", warn=True):
    """Compressibility factor and fugacity coefficient of a pure gas (Peng & Robinson 1976).

    Parameters
    ----------
    species : str or CriticalConstants
        Gas name in :data:`CRITICAL_CONSTANTS` or explicit critical constants.
    temperature : array_like
        Temperature in K (> 0).
    pressure : array_like
        Pressure in Pa (> 0); broadcasts against ``temperature``.
    root : {"stable", "vapour", "liquid"}, optional (keyword-only)
        Which root to use where three real roots exist; "stable" (default) takes the
        one of lowest Gibbs energy.
    warn : bool, optional (keyword-only)
        Emit a ModelWarning where the stable root is liquid-like. Default True.

    Returns
    -------
    PengRobinsonState
        ``.z`` and ``.ln_phi`` of shape broadcast(temperature, pressure).

    Raises
    ------
    InputError
        Unknown species, non-positive temperature or pressure, unknown ``root``.
    """
    _check_root(root)
    c = critical_constants(species)
    T = _positive_grid(temperature, "temperature", "K")
    p = _positive_grid(pressure, "pressure", "Pa")
    T, p = np.broadcast_arrays(T, p)
    a_t, b_t = _reduced_ab([c], T)
    A = a_t[0] * p / T**2
    B = b_t[0] * p / T
    Z, three, liquid = _choose_root(A, B, root, T < c.critical_temperature)
    if warn and root == "stable":
        _warn_liquid(liquid, T, p, c.name)
    return PengRobinsonState(z=Z, ln_phi=_g_residual(Z, A, B), three_roots=three,
                             liquid_like=liquid)


def _mixture_inputs(species, composition, temperature, pressure, kij):
    consts = [critical_constants(s) for s in species]
    n = len(consts)
    if n == 0:
        msg = "species: expected at least one gas, got an empty sequence"
        raise InputError(msg)
    y = np.asarray(composition, dtype=float)
    if y.ndim == 0 or y.shape[0] != n:
        msg = f"composition: expected {n} mole fractions on axis 0, got shape {y.shape}"
        raise InputError(msg)
    if not np.all(np.isfinite(y)) or np.any(y < 0) or np.any(np.abs(y.sum(axis=0) - 1.0) > 1e-9):
        msg = f"composition: expected mole fractions >= 0 summing to 1, got {composition!r}"
        raise InputError(msg)
    T = _positive_grid(temperature, "temperature", "K")
    p = _positive_grid(pressure, "pressure", "Pa")
    try:
        grid = np.broadcast_shapes(T.shape, p.shape, y.shape[1:])
    except ValueError:
        msg = (f"temperature, pressure, composition: shapes {T.shape}, {p.shape} and "
               f"{y.shape[1:]} (after the component axis) do not broadcast")
        raise InputError(msg) from None
    T = np.broadcast_to(T, grid)
    p = np.broadcast_to(p, grid)
    y = np.broadcast_to(y.reshape(y.shape[:1] + (1,) * (len(grid) - y.ndim + 1) + y.shape[1:]),
                        (n,) + grid)
    if kij is None:
        k = np.zeros((n, n))
    else:
        k = np.asarray(kij, dtype=float)
        if (k.shape != (n, n) or not np.all(np.isfinite(k)) or np.any(np.abs(k - k.T) > 1e-12)
                or np.any(np.diag(k) != 0)):
            msg = (f"kij: expected a symmetric ({n}, {n}) matrix of binary interaction "
                   f"parameters with zero diagonal, got {kij!r}")
            raise InputError(msg)
    return consts, y, T, p, k


def peng_robinson_mixture(species, composition, temperature, pressure, *, kij=None,
                          root="stable", warn=True):
    """Compressibility and component fugacity coefficients of a gas mixture (Peng & Robinson 1976).

    van der Waals one-fluid mixing rules with binary parameters k_ij (default 0).

    Parameters
    ----------
    species : sequence of str or CriticalConstants
        The components.
    composition : array_like of shape (n_components, ...)
        Mole fractions y_i (>= 0, summing to 1 along axis 0); the remaining axes
        broadcast with temperature and pressure.
    temperature : array_like
        Temperature in K.
    pressure : array_like
        Total pressure in Pa.
    kij : array_like of shape (n_components, n_components), optional (keyword-only)
        Symmetric binary interaction parameters, zero diagonal. Default all 0.
    root : {"stable", "vapour", "liquid"}, optional (keyword-only)
        Root choice where three real roots exist (default: lowest Gibbs energy).
    warn : bool, optional (keyword-only)
        Emit a ModelWarning where the stable root is liquid-like. Default True.

    Returns
    -------
    PengRobinsonState
        ``.z`` of shape grid and ``.ln_phi`` of shape (n_components, *grid).

    Raises
    ------
    InputError
        Unknown species, bad composition, temperature, pressure or kij.
    """
    _check_root(root)
    consts, y, T, p, k = _mixture_inputs(species, composition, temperature, pressure, kij)
    a_t, b_t = _reduced_ab(consts, T)                  # (n, *grid)
    sq = np.sqrt(a_t)
    a_ij = sq[:, None] * sq[None, :] * (1.0 - k).reshape(k.shape + (1,) * T.ndim)
    sum_j = np.einsum("j...,ij...->i...", y, a_ij)     # Σ_j y_j a_ij
    a_mix = np.einsum("i...,i...->...", y, sum_j)
    b_mix = np.einsum("i...,i...->...", y, b_t)
    A = a_mix * p / T**2
    B = b_mix * p / T
    tc_pseudo = sum(yi * c.critical_temperature for yi, c in zip(y, consts))   # Kay's rule
    Z, three, liquid = _choose_root(A, B, root, T < tc_pseudo)
    if warn and root == "stable":
        _warn_liquid(liquid, T, p, "the mixture")
    ratio = b_t / b_mix
    ln_phi = (ratio * (Z - 1.0) - np.log(Z - B)
              - A / (2.0 * _SQRT2 * B) * (2.0 * sum_j / a_mix - ratio) * _log_ratio(Z, B))
    return PengRobinsonState(z=Z, ln_phi=ln_phi, three_roots=three, liquid_like=liquid)


def fugacities(species, composition, temperature, pressure, *, kij=None):
    """Component fugacities f_i = φ_i y_i p (Pa) from the Peng–Robinson mixture.

    Parameters are those of :func:`peng_robinson_mixture`.

    Returns
    -------
    ndarray of shape (n_components, *grid)
        Fugacities in Pa.
    """
    state = peng_robinson_mixture(species, composition, temperature, pressure, kij=kij)
    consts, y, T, p, _ = _mixture_inputs(species, composition, temperature, pressure, kij)
    return state.phi * y * p


def ideality_warnings(species, temperature, pressure, *, composition=None, tolerance=0.01,
                      emit=True):
    """Check whether the ideal-gas reference is adequate: |Z - 1| <= tolerance.

    Parameters
    ----------
    species : str, CriticalConstants or sequence of them
        The gas or the components of the gas mixture.
    temperature : array_like
        Temperature in K.
    pressure : array_like
        Total pressure in Pa.
    composition : array_like, optional (keyword-only)
        Mole fractions (required for more than one component).
    tolerance : float, optional (keyword-only)
        Largest acceptable |Z - 1| (default 0.01, i.e. 1 %).
    emit : bool, optional (keyword-only)
        Also issue each message as a :class:`~adsorb.errors.ModelWarning` (default True).

    Returns
    -------
    list of str
        Empty if the ideal gas is adequate everywhere; otherwise one message naming
        the number of offending conditions, the worst one and the remedy (fugacities).
    """
    if isinstance(species, (str, CriticalConstants)):
        species = [species]
    species = list(species)
    if composition is None:
        if len(species) != 1:
            msg = (f"composition: required for a mixture of {len(species)} components, "
                   "got None")
            raise InputError(msg)
        composition = [1.0]
    if not (np.isfinite(tolerance) and tolerance > 0):
        msg = f"tolerance: expected a positive fraction such as 0.01, got {tolerance!r}"
        raise InputError(msg)
    state = peng_robinson_mixture(species, composition, temperature, pressure, warn=False)
    dev = np.abs(state.z - 1.0)
    bad = dev > tolerance
    messages = []
    if np.any(bad) or np.any(state.liquid_like):
        T = np.broadcast_to(np.asarray(temperature, dtype=float), dev.shape).ravel()
        p = np.broadcast_to(np.asarray(pressure, dtype=float), dev.shape).ravel()
        worst = int(np.argmax(dev.ravel()))
        names = "+".join(critical_constants(s).name for s in species)
        text = (f"ideal-gas reference for {names}: |Z - 1| exceeds {tolerance:.3g} at "
                f"{int(bad.sum())} of {dev.size} conditions (worst Z = {state.z.ravel()[worst]:.5f} "
                f"at T = {T[worst]:.6g} K, p = {p[worst]:.6g} Pa; Peng–Robinson); use fugacities "
                "(adsorb.eos.fugacities) instead of pressures")
        if np.any(state.liquid_like):
            text += "; the fluid is condensed at some conditions"
        messages.append(text)
    if emit:
        for text in messages:
            warnings.warn(text, ModelWarning, stacklevel=2)
    return messages
