"""Temperature-programmed desorption (TPD): simulated spectra and Redhead analysis.

Rate law (Polanyi–Wigner) with a linear heating ramp T = T0 + β t:

    -dθ/dt = ν(T) θ^n exp(-E_d(θ)/kT),   n = 1 or 2,

θ in monolayers (ML), ν in s^-1 for n = 1 (ML^-1 s^-1 for n = 2), E_d in eV.
With T as the independent variable, dθ/dT = -(ν/β) θ^n exp(-E_d/kT). It is
integrated for y = ln θ,

    dy/dT = -(ν(T)/β) θ^(n-1) exp(-E_d(θ)/kT),

which stays smooth while θ falls by many orders of magnitude (the θ form is
stiff for first order after the peak; the y form is not), with
``scipy.integrate.solve_ivp`` (LSODA, which also switches to a stiff method by
itself, tolerances 1e-10) and its dense output.

Peak analysis (P. A. Redhead, "Thermal Desorption of Gases", Vacuum 1962, 12,
203–211):

* exact first-order peak condition, d ln k/dT = k/β with k = ν(T) e^(-E/kT);
  for a constant ν: E/(k Tp^2) = (ν/β) exp(-E/(k Tp)), solved with brentq;
* Redhead's approximation E ≈ k Tp [ln(ν Tp/β) - 3.64] (quoted accuracy about
  1.5 % for 10^8 < ν/β < 10^13 K^-1);
* apparent prefactor from a peak: ν_app = (β E/(k Tp^2)) exp(E/(k Tp)).

Prefactors from transition-state theory (consistent with the partition
functions of the adsorbate models; reference notes §5.2, C. T. Campbell,
L. H. Sprowl, L. Árnadóttir, J. Phys. Chem. C 2016, 120, 10283 and D. A. Knopf,
M. Ammann, Atmos. Chem. Phys. 2021, 21, 15725):
k_des(T) = (kT/h) (q‡/q_ad) exp(-E_d/kT). See :func:`prefactor_from_entropy`,
:func:`prefactor_from_thermo` and :func:`prefactor_2d_gas_ts`.

Limits: no re-adsorption, no pumping-speed effects (the simulated rate is the
desorption rate itself, i.e. an infinitely fast pump), no lateral diffusion
or islands beyond what E_d(θ) describes, one desorbing species.
"""

from __future__ import annotations

import csv
import io
from dataclasses import dataclass, field

import numpy as np
import scipy.integrate
import scipy.interpolate
import scipy.optimize

from adsorb import constants as C
from adsorb.equilibria import capped_exp
from adsorb.errors import ConvergenceError, InputError
from adsorb.fileout import write_json_atomic, write_text_atomic

__all__ = [
    "TPDResult",
    "simulate_tpd",
    "peak_temperature_first_order",
    "energy_from_peak",
    "redhead_energy",
    "apparent_prefactor",
    "redhead_comparison",
    "prefactor_from_entropy",
    "prefactor_from_thermo",
    "prefactor_2d_gas_ts",
    "plot_tpd",
    "REDHEAD_CONSTANT",
]

#: The constant of Redhead's approximate first-order formula (Redhead, Vacuum 1962, 12, 203).
REDHEAD_CONSTANT = 3.64

KB = C.kB_eV


# ---------------------------------------------------------------------------
# input helpers
# ---------------------------------------------------------------------------
def _positive(name, value, unit):
    try:
        val = float(value)
    except (TypeError, ValueError):
        raise InputError(f"{name} must be a positive number in {unit}; got {value!r}") from None
    if not (np.isfinite(val) and val > 0):
        raise InputError(f"{name} must be finite and > 0 {unit}; got {value!r}")
    return val


class _Prefactor:
    """ν(T) from a constant or a callable, with d ln ν/dT."""

    def __init__(self, prefactor, name="prefactor"):
        self.name = name
        if callable(prefactor):
            self.func = prefactor
            self.const = None
        else:
            self.const = _positive(name, prefactor, "s^-1")
            self.func = None

    def __call__(self, t):
        if self.const is not None:
            return np.full(np.shape(t), self.const)
        val = np.asarray(self.func(np.asarray(t, dtype=float)), dtype=float)
        if val.shape != np.shape(t):
            val = np.broadcast_to(val, np.shape(t)).astype(float)
        if not np.all(np.isfinite(val) & (val > 0)):
            bad = np.asarray(t)[~(np.isfinite(val) & (val > 0))]
            raise InputError(f"{self.name}(T) must be finite and > 0 s^-1; got a bad value at T = "
                             f"{np.ravel(bad)[0]:g} K")
        return val

    def dlog(self, t):
        """d ln ν / dT by central differences (exact 0 for a constant)."""
        t = np.asarray(t, dtype=float)
        if self.const is not None:
            return np.zeros_like(t)
        h = 1e-4 * t
        return (np.log(self(t + h)) - np.log(self(t - h))) / (2 * h)


class _Energy:
    """E_d(θ) in eV from a constant, polynomial coefficients (E0, E1, ...) in θ (ML), or a callable."""

    def __init__(self, energy):
        if callable(energy):
            self.func = energy
            self.coef = None
        else:
            try:
                coef = np.atleast_1d(np.asarray(energy, dtype=float))
            except (TypeError, ValueError):
                raise InputError(f"energy_eV must be a number, polynomial coefficients (E0, E1, ...) in eV "
                                 f"or a callable of coverage; got {energy!r}") from None
            if coef.ndim != 1 or coef.size == 0 or not np.all(np.isfinite(coef)):
                raise InputError(f"energy_eV coefficients must be a finite 1D sequence; got {energy!r}")
            self.coef = coef
            self.func = None

    def __call__(self, theta):
        theta = np.asarray(theta, dtype=float)
        if self.coef is not None:
            return np.polynomial.polynomial.polyval(theta, self.coef)
        val = np.asarray(self.func(theta), dtype=float)
        if not np.all(np.isfinite(val)):
            raise InputError("energy_eV(θ) returned a non-finite value")
        return np.broadcast_to(val, theta.shape).astype(float) if val.shape != theta.shape else val

    def derivative(self, theta):
        theta = np.asarray(theta, dtype=float)
        if self.coef is not None:
            return np.polynomial.polynomial.polyval(theta, np.polynomial.polynomial.polyder(self.coef)) \
                if self.coef.size > 1 else np.zeros_like(theta)
        h = 1e-6 * np.maximum(theta, 1e-3)
        return (self(theta + h) - self(np.maximum(theta - h, 0.0))) / (theta + h - np.maximum(theta - h, 0.0))


# ---------------------------------------------------------------------------
# Redhead analysis
# ---------------------------------------------------------------------------
def peak_temperature_first_order(energy_eV, prefactor, heating_rate_K_s):
    """Exact first-order TPD peak temperature (K) for a coverage-independent E_d.

    Solves d ln k/dT = k/β with k(T) = ν(T) exp(-E/kT); for a constant ν this is
    E/(k Tp^2) = (ν/β) exp(-E/(k Tp)) (Redhead, Vacuum 1962, 12, 203). Solved
    with brentq in ln T.

    Parameters
    ----------
    energy_eV : float
        Desorption energy, eV.
    prefactor : float or callable
        ν in s^-1, or ν(T) (vectorised callable of T in K, returning s^-1).
    heating_rate_K_s : float
        β in K/s.

    Returns
    -------
    float
        Tp in K.
    """
    e = _positive("energy_eV", energy_eV, "eV")
    beta = _positive("heating_rate_K_s", heating_rate_K_s, "K/s")
    nu = _Prefactor(prefactor)

    def g(lnt):
        t = np.exp(lnt)
        dlnk = e / (KB * t * t) + nu.dlog(t)
        if dlnk <= 0:
            return -np.inf
        return float(np.log(dlnk) - (np.log(nu(t)) - e / (KB * t) - np.log(beta)))

    lo, hi = np.log(1e-2), np.log(1e6)
    if not (g(lo) > 0 > g(hi)):
        raise ConvergenceError(f"no first-order peak between 0.01 K and 1e6 K for E = {e:g} eV, β = {beta:g} K/s")
    return float(np.exp(scipy.optimize.brentq(g, lo, hi, xtol=1e-15, rtol=1e-15, maxiter=500)))


def energy_from_peak(peak_temperature_K, prefactor_s, heating_rate_K_s):
    """Desorption energy (eV) from a first-order peak temperature, exact peak condition.

    Solves E/(k Tp^2) = (ν/β) exp(-E/(k Tp)) for E with brentq (in x = E/kTp:
    ln x + x = ln(ν Tp/β)), for a constant prefactor ν (s^-1).
    """
    tp = _positive("peak_temperature_K", peak_temperature_K, "K")
    nu = _positive("prefactor_s", prefactor_s, "s^-1")
    beta = _positive("heating_rate_K_s", heating_rate_K_s, "K/s")
    target = np.log(nu * tp / beta)

    def f(x):
        return np.log(x) + x - target

    hi = max(2.0 * abs(target), 10.0)
    if f(1e-12) > 0:
        raise InputError(f"ν Tp/β = {np.exp(target):.3g} is too small for a first-order peak")
    x = scipy.optimize.brentq(f, 1e-12, hi, xtol=1e-14, rtol=1e-15, maxiter=500)
    return float(x * KB * tp)


def redhead_energy(peak_temperature_K, prefactor_s, heating_rate_K_s):
    """Redhead's approximate first-order desorption energy, eV: E ≈ k Tp [ln(ν Tp/β) - 3.64].

    Redhead, Vacuum 1962, 12, 203; quoted accuracy about 1.5 % for
    10^8 < ν/β < 10^13 K^-1.
    """
    tp = _positive("peak_temperature_K", peak_temperature_K, "K")
    nu = _positive("prefactor_s", prefactor_s, "s^-1")
    beta = _positive("heating_rate_K_s", heating_rate_K_s, "K/s")
    return float(KB * tp * (np.log(nu * tp / beta) - REDHEAD_CONSTANT))


def apparent_prefactor(peak_temperature_K, energy_eV, heating_rate_K_s):
    """First-order prefactor (s^-1) that puts the peak at Tp for the energy E: ν = (β E/(k Tp^2)) e^(E/k Tp)."""
    tp = _positive("peak_temperature_K", peak_temperature_K, "K")
    e = _positive("energy_eV", energy_eV, "eV")
    beta = _positive("heating_rate_K_s", heating_rate_K_s, "K/s")
    ln_nu = np.log(beta * e / (KB * tp * tp)) + e / (KB * tp)
    if ln_nu > 700:
        raise InputError(f"apparent prefactor exp({ln_nu:.1f}) s^-1 overflows; check E = {e:g} eV and Tp = {tp:g} K")
    return float(np.exp(ln_nu))


def redhead_comparison(peak_temperature_K, prefactor_s, heating_rate_K_s) -> dict:
    """Exact and Redhead first-order energies from one peak, and their relative difference."""
    exact = energy_from_peak(peak_temperature_K, prefactor_s, heating_rate_K_s)
    approx = redhead_energy(peak_temperature_K, prefactor_s, heating_rate_K_s)
    return {"peak_temperature_K": float(peak_temperature_K), "prefactor_s": float(prefactor_s),
            "heating_rate_K_s": float(heating_rate_K_s), "nu_over_beta_per_K": float(prefactor_s / heating_rate_K_s),
            "energy_exact_eV": exact, "energy_redhead_eV": approx,
            "relative_difference": (approx - exact) / exact}


# ---------------------------------------------------------------------------
# prefactors from transition-state theory
# ---------------------------------------------------------------------------
def _temperature_function(name, value, unit):
    if callable(value):
        return value
    try:
        val = float(value)
    except (TypeError, ValueError):
        raise InputError(f"{name} must be a number in {unit} or a callable of T; got {value!r}") from None
    if not np.isfinite(val):
        raise InputError(f"{name} must be finite; got {value!r}")
    return lambda t: np.full(np.shape(t), val)


def prefactor_from_entropy(activation_entropy_eV_K):
    """ν(T) = (kT/h) exp(ΔS‡/k) (transition-state theory with ΔH‡ = E_d).

    Parameters
    ----------
    activation_entropy_eV_K : float or callable
        ΔS‡ = S(TS) - S(adsorbate), eV/K per molecule, or a callable of T (K).

    Returns
    -------
    callable
        ν(T) in s^-1, vectorised over T in K.

    Notes
    -----
    Common TS choices (reference notes §5.2): for desorption from a localized
    (lattice-gas) adsorbate the TS is a 2D gas of the desorbing molecule on one
    site area that keeps the gas's internal modes (rotations, vibrations); for
    a 2D-ideal-gas adsorbate the 2D translations cancel and only the
    vibration against the surface is lost; a hindered translator replaces the
    site area by b^2 and q_ad's in-plane part by q_x q_y.
    """
    ds = _temperature_function("activation_entropy_eV_K", activation_entropy_eV_K, "eV/K")

    def nu(t):
        t = np.asarray(t, dtype=float)
        return C.k_B * t / C.h * np.exp(np.asarray(ds(t), dtype=float) / KB)

    return nu


def _gibbs_function(name, obj):
    """G(T) in eV from a ThermoTable-like object (arrays temperature, gibbs), or a callable returning one."""
    if callable(obj) and not hasattr(obj, "gibbs"):
        def g(t):
            res = obj(np.asarray(t, dtype=float))
            return np.asarray(res.gibbs if hasattr(res, "gibbs") else res, dtype=float)
        return g
    if hasattr(obj, "thermo") and callable(obj.thermo):
        return _gibbs_function(name, obj.thermo)
    if not (hasattr(obj, "temperature") and hasattr(obj, "gibbs")):
        raise InputError(f"{name} must have arrays 'temperature' and 'gibbs' (a ThermoTable) or be a callable of T")
    t = np.ravel(np.asarray(obj.temperature, dtype=float))
    g = np.ravel(np.asarray(obj.gibbs, dtype=float))
    if t.size != g.size or t.size < 4:
        raise InputError(f"{name} needs at least 4 (temperature, gibbs) points on one temperature axis; got "
                         f"{t.size} temperatures and {g.size} values")
    order = np.argsort(t)
    t, g = t[order], g[order]
    if np.any(np.diff(t) <= 0):
        raise InputError(f"{name}.temperature has repeated values; give one pressure")
    spline = scipy.interpolate.CubicSpline(t, g)
    lo, hi = t[0], t[-1]

    def gt(x):
        x = np.asarray(x, dtype=float)
        if np.any((x < lo * (1 - 1e-9)) | (x > hi * (1 + 1e-9))):
            raise InputError(f"{name} covers {lo:g}-{hi:g} K; asked for T = {np.ravel(x)[0]:g} K outside it")
        return spline(x)

    return gt


def prefactor_from_thermo(transition_state, initial_state, *, barrier_eV):
    """ν(T) such that ν(T) exp(-E_d/kT) = (kT/h) exp(-ΔG‡(T)/kT), from two thermochemistry tables.

    ν(T) = (kT/h) exp(-[G‡(T) - G_ad(T) - E_d]/kT), with E_d = ``barrier_eV``
    the electronic barrier used in the Polanyi–Wigner exponent (TST, Eyring;
    consistent with the partition functions behind G, reference notes §5.2).

    Parameters
    ----------
    transition_state, initial_state : ThermoTable-like or callable
        Objects with arrays ``temperature`` (K) and ``gibbs`` (eV), a species
        with a ``thermo(T)`` method, or callables T -> such an object or -> G in eV.
        Tables are interpolated with a cubic spline inside their range.
    barrier_eV : float
        E_d = E0(TS) - E0(adsorbate), eV.

    Returns
    -------
    callable
        ν(T) in s^-1.
    """
    gts = _gibbs_function("transition_state", transition_state)
    gad = _gibbs_function("initial_state", initial_state)
    try:
        ed = float(barrier_eV)
    except (TypeError, ValueError):
        raise InputError(f"barrier_eV must be a number in eV; got {barrier_eV!r}") from None

    def nu(t):
        t = np.asarray(t, dtype=float)
        dg = gts(t) - gad(t) - ed
        return capped_exp(np.log(C.k_B * t / C.h) - dg / (KB * t), t, "TPD prefactor (kT/h) exp(-(dG - E_d)/kT)")

    return nu


def prefactor_2d_gas_ts(mass_amu, site_area_A2, *, ln_q_ratio=0.0):
    """Desorption prefactor for a localized adsorbate with a 2D-gas transition state (reference notes §5.2).

    k_des = (kT/h) (A_site/Λ^2) (q_int,‡/q_ad) exp(-E_d/kT), so
    ν(T) = (kT/h) (A_site/Λ^2) exp(ln_q_ratio), Λ = h/sqrt(2π m kT).

    Parameters
    ----------
    mass_amu : float
        Mass of the desorbing molecule, amu.
    site_area_A2 : float
        Area per adsorption site, Å^2.
    ln_q_ratio : float or callable, optional
        ln q_int,‡ - ln q_ad (internal modes of the TS minus all modes of the
        adsorbate, each counted from its zero-point level), or a callable of T.
        Default 0 (a TS that keeps nothing but the 2D translation, an adsorbate
        with all modes frozen).

    Returns
    -------
    callable
        ν(T) in s^-1 (∝ T^2 for a constant ratio).
    """
    m = _positive("mass_amu", mass_amu, "amu") * C.amu
    area = _positive("site_area_A2", site_area_A2, "Å^2") * C.angstrom**2
    ratio = _temperature_function("ln_q_ratio", ln_q_ratio, "")

    def nu(t):
        t = np.asarray(t, dtype=float)
        lam2 = C.h**2 / (2 * np.pi * m * C.k_B * t)
        return C.k_B * t / C.h * area / lam2 * np.exp(np.asarray(ratio(t), dtype=float))

    return nu


# ---------------------------------------------------------------------------
# simulation
# ---------------------------------------------------------------------------
@dataclass(frozen=True)
class TPDResult:
    """A simulated TPD spectrum and its peak analysis.

    Attributes
    ----------
    temperature : ndarray
        K.
    coverage : ndarray
        θ in ML.
    rate_per_K : ndarray
        -dθ/dT in ML/K.
    rate_per_s : ndarray
        -dθ/dt = β (-dθ/dT) in ML/s.
    peak_temperatures_K : tuple of float
        All local maxima of the rate (refined), ascending.
    peak_temperature_K : float
        The highest-rate peak.
    peak_coverage : float
        θ at that peak, ML.
    energy_at_peak_eV : float
        E_d(θ_peak).
    prefactor_at_peak_s : float
        ν(Tp).
    apparent_prefactor_s : float
        ν_app from Tp and E_d(θ_peak) through the exact first-order peak condition.
    redhead_energy_eV : float
        Redhead's formula with Tp and ν(Tp).
    desorbed_ML : float
        θ0 - θ(T_end).
    initial_coverage, heating_rate_K_s, order : float, float, int
    parameters : dict
        Plain description of the inputs.
    """

    temperature: np.ndarray
    coverage: np.ndarray
    rate_per_K: np.ndarray
    rate_per_s: np.ndarray
    peak_temperatures_K: tuple
    peak_temperature_K: float
    peak_coverage: float
    energy_at_peak_eV: float
    prefactor_at_peak_s: float
    apparent_prefactor_s: float
    redhead_energy_eV: float
    desorbed_ML: float
    initial_coverage: float
    heating_rate_K_s: float
    order: int
    parameters: dict = field(default_factory=dict)

    def summary(self) -> dict:
        """Peak analysis as plain values."""
        return {
            "initial_coverage_ML": self.initial_coverage,
            "heating_rate_K_s": self.heating_rate_K_s,
            "order": self.order,
            "peak_temperatures_K": list(self.peak_temperatures_K),
            "peak_temperature_K": self.peak_temperature_K,
            "peak_coverage_ML": self.peak_coverage,
            "peak_rate_ML_per_K": float(np.max(self.rate_per_K)),
            "energy_at_peak_eV": self.energy_at_peak_eV,
            "prefactor_at_peak_s": self.prefactor_at_peak_s,
            "apparent_prefactor_s": self.apparent_prefactor_s,
            "redhead_energy_eV": self.redhead_energy_eV,
            "desorbed_ML": self.desorbed_ML,
            "parameters": self.parameters,
            "assumptions": "Polanyi-Wigner rate law, linear ramp, no re-adsorption, no pumping-speed effects",
        }

    def to_csv(self, path=None) -> str:
        """Spectrum as CSV text (temperature_K, coverage_ML, rate_ML_per_K, rate_ML_per_s); written atomically if path."""
        buf = io.StringIO()
        writer = csv.writer(buf, lineterminator="\n")
        writer.writerow(["temperature_K", "coverage_ML", "rate_ML_per_K", "rate_ML_per_s"])
        for row in zip(self.temperature, self.coverage, self.rate_per_K, self.rate_per_s):
            writer.writerow([f"{v:.10g}" for v in row])
        text = buf.getvalue()
        if path is not None:
            write_text_atomic(path, text)
        return text

    def to_json(self, path=None) -> dict:
        """Summary plus the spectrum as a dict; written atomically as JSON if path."""
        data = self.summary()
        data["spectrum"] = {"temperature_K": self.temperature.tolist(), "coverage_ML": self.coverage.tolist(),
                            "rate_ML_per_K": self.rate_per_K.tolist()}
        if path is not None:
            write_json_atomic(path, data)
        return data


def simulate_tpd(initial_coverage, heating_rate_K_s, *, prefactor, energy_eV, order=1,
                 temperature_start_K, temperature_end_K=None, n_points=2001,
                 rtol=1e-10, atol=1e-12, method="LSODA") -> TPDResult:
    """Simulate a TPD spectrum with the Polanyi–Wigner rate law and a linear ramp.

    -dθ/dt = ν(T) θ^n exp(-E_d(θ)/kT), T = T0 + β t, integrated in T for
    y = ln θ with ``scipy.integrate.solve_ivp`` and dense output. Peaks are
    located as sign changes of the rate on the output grid and refined with
    brentq on d ln(rate)/dT evaluated from the dense solution.

    Parameters
    ----------
    initial_coverage : float
        θ0 in ML (> 0).
    heating_rate_K_s : float
        β in K/s.
    prefactor : float or callable
        ν in s^-1 (first order) or ML^-1 s^-1 (second order), or ν(T)
        (vectorised callable of T in K), e.g. from :func:`prefactor_from_thermo`.
    energy_eV : float, sequence or callable
        E_d in eV: a constant, polynomial coefficients (E0, E1, ...) so that
        E_d = E0 + E1 θ + ..., or a vectorised callable E_d(θ).
    order : {1, 2}
        Reaction order n.
    temperature_start_K : float
        T0 in K.
    temperature_end_K : float, optional
        End of the ramp. Default: where θ has fallen below 1e-10 θ0.
    n_points : int, optional
        Points of the output grid (default 2001).
    rtol, atol : float, optional
        solve_ivp tolerances on y = ln θ.
    method : str, optional
        solve_ivp method (default 'LSODA'; 'Radau' and 'BDF' are stiff alternatives).

    Returns
    -------
    TPDResult

    Raises
    ------
    InputError
        Bad parameters.
    ConvergenceError
        The integrator failed, or no desorption happened before 1e5 K.
    """
    theta0 = _positive("initial_coverage", initial_coverage, "ML")
    beta = _positive("heating_rate_K_s", heating_rate_K_s, "K/s")
    t0 = _positive("temperature_start_K", temperature_start_K, "K")
    if order not in (1, 2) or isinstance(order, bool):
        raise InputError(f"order must be 1 or 2; got {order!r}")
    if not isinstance(n_points, (int, np.integer)) or n_points < 11:
        raise InputError(f"n_points must be an integer >= 11; got {n_points!r}")
    nu = _Prefactor(prefactor)
    ed = _Energy(energy_eV)
    ed(np.array([theta0, 0.5 * theta0]))  # validate early
    y0 = np.log(theta0)
    y_stop = y0 + np.log(1e-10)

    def log_rate_per_k(t, y):
        """ln(-dθ/dT) (ML/K) at temperature t, state y = ln θ."""
        theta = np.exp(y)
        return np.log(nu(t)) - np.log(beta) + order * y - ed(theta) / (KB * t)

    def rhs(t, y):
        lr = log_rate_per_k(t, y[0]) - y[0]
        return [-np.exp(min(lr, 700.0))]

    def stop(t, y):
        return y[0] - y_stop

    stop.terminal = True
    stop.direction = -1
    if temperature_end_K is None:
        t_end = 1e5
    else:
        t_end = _positive("temperature_end_K", temperature_end_K, "K")
        if t_end <= t0:
            raise InputError(f"temperature_end_K must exceed temperature_start_K = {t0:g} K; got {t_end:g}")
    # a bounded step keeps the solver from stepping over a narrow peak (first-order peaks are
    # ~2.5 k Tp^2/E wide, a few K at 50 K)
    sol = scipy.integrate.solve_ivp(rhs, (t0, t_end), [y0], method=method, dense_output=True,
                                    events=stop, rtol=rtol, atol=atol, max_step=0.5)
    if not sol.success:
        raise ConvergenceError(f"TPD integration failed near T = {sol.t[-1]:g} K: {sol.message}")
    if temperature_end_K is None:
        if sol.status != 1:
            raise ConvergenceError(f"coverage still above 1e-10 θ0 at 1e5 K (E_d = {ed(theta0):g} eV); no desorption")
        t_last = float(sol.t_events[0][0])
    else:
        t_last = float(t_end)
    t_stop = float(sol.t[-1])
    temp = np.linspace(t0, t_last, int(n_points))
    inside = temp <= t_stop
    y = np.full(temp.shape, -np.inf)
    y[inside] = sol.sol(temp[inside])[0]
    cov = np.exp(y)
    rate = np.zeros_like(temp)
    rate[inside] = np.exp(log_rate_per_k(temp[inside], y[inside]))

    def dlog_rate(t):
        yy = float(sol.sol(t)[0])
        theta = np.exp(yy)
        r = float(np.exp(log_rate_per_k(t, yy)))
        dy = -r / theta
        return float(nu.dlog(t) + order * dy - ed.derivative(theta) * theta * dy / (KB * t)
                     + ed(theta) / (KB * t * t))

    peaks = []
    idx = np.nonzero((rate[1:-1] >= rate[:-2]) & (rate[1:-1] > rate[2:]) & inside[2:])[0] + 1
    for i in idx:
        lo, hi = temp[i - 1], temp[i + 1]
        try:
            glo, ghi = dlog_rate(lo), dlog_rate(hi)
            tp = scipy.optimize.brentq(dlog_rate, lo, hi, xtol=1e-12, rtol=1e-14) if glo > 0 > ghi else temp[i]
        except ValueError:
            tp = temp[i]
        peaks.append(float(tp))
    if not peaks:
        raise ConvergenceError(f"no desorption peak between {t0:g} and {t_last:g} K; widen the temperature range")
    rates = [float(np.exp(log_rate_per_k(p, float(sol.sol(p)[0])))) for p in peaks]
    main = peaks[int(np.argmax(rates))]
    theta_p = float(np.exp(sol.sol(main)[0]))
    e_p = float(ed(theta_p))
    nu_p = float(nu(np.array(main)))
    try:
        nu_app = apparent_prefactor(main, e_p, beta) if e_p > 0 else float("nan")
    except InputError:
        nu_app = float("inf")
    rh = float(KB * main * (np.log(nu_p * main / beta) - REDHEAD_CONSTANT))
    theta_end = float(cov[-1])
    params = {"prefactor": (nu.const if nu.const is not None else "callable"),
              "energy_eV": (ed.coef.tolist() if ed.coef is not None else "callable"),
              "temperature_start_K": t0, "temperature_end_K": t_last, "method": method,
              "rtol": rtol, "atol": atol}
    return TPDResult(temperature=temp, coverage=cov, rate_per_K=rate, rate_per_s=rate * beta,
                     peak_temperatures_K=tuple(sorted(peaks)), peak_temperature_K=float(main),
                     peak_coverage=theta_p, energy_at_peak_eV=e_p, prefactor_at_peak_s=nu_p,
                     apparent_prefactor_s=nu_app, redhead_energy_eV=rh, desorbed_ML=theta0 - theta_end,
                     initial_coverage=theta0, heating_rate_K_s=beta, order=int(order), parameters=params)


# ---------------------------------------------------------------------------
# plot
# ---------------------------------------------------------------------------
def _save_figure(fig, path):
    from adsorb.fileout import write_figure

    write_figure(fig, path, tight=True)


def plot_tpd(results, path, *, labels=None, title=None, mark_peaks=True):
    """Plot TPD spectra (desorption rate in ML/K against T in K); write PNG and SVG; return the Figure.

    Parameters
    ----------
    results : TPDResult or sequence of TPDResult
    path : str or Path
        Output path; the suffix is replaced by .png and .svg (each written atomically).
    labels : sequence of str, optional
        Legend entries (default: initial coverage).
    """
    import matplotlib

    matplotlib.use("Agg")
    from matplotlib.figure import Figure

    runs = [results] if isinstance(results, TPDResult) else list(results)
    if not runs or not all(isinstance(r, TPDResult) for r in runs):
        raise InputError("results must be a TPDResult or a sequence of TPDResult")
    if labels is not None and len(labels) != len(runs):
        raise InputError(f"labels has {len(labels)} entries for {len(runs)} spectra")
    fig = Figure(figsize=(6.4, 4.2), layout="tight")
    ax = fig.add_subplot()
    for i, r in enumerate(runs):
        lab = labels[i] if labels is not None else f"θ0 = {r.initial_coverage:g} ML"
        line, = ax.plot(r.temperature, r.rate_per_K, label=lab)
        if mark_peaks:
            ax.axvline(r.peak_temperature_K, color=line.get_color(), lw=0.6, ls=":")
    ax.set_xlabel("Temperature (K)")
    ax.set_ylabel("Desorption rate -dθ/dT (ML/K)")
    ax.set_title(title or "Simulated TPD")
    ax.legend(fontsize=8)
    ax.set_ylim(bottom=0)
    # show where something happens: rate above 1e-3 of the largest peak
    top = max(float(np.max(r.rate_per_K)) for r in runs)
    lo = min(float(r.temperature[np.argmax(r.rate_per_K > 1e-3 * top)]) for r in runs)
    hi = max(float(r.temperature[len(r.rate_per_K) - 1 - np.argmax(r.rate_per_K[::-1] > 1e-3 * top)])
             for r in runs)
    pad = 0.08 * (hi - lo) + 1.0
    ax.set_xlim(lo - pad, hi + pad)
    _save_figure(fig, path)
    return fig
