"""Optional outputs of a study: isosteric heats, TPD spectra and NASA polynomial fits.

Called by :func:`adsorb.study.run_study` for the ``[[outputs.isosteric_heats]]``,
``[[outputs.tpd]]`` and ``[outputs.nasa]`` sections of a case (isobars are
coverage curves and are computed with the other curves). Every number comes
from the case's own thermochemistry (:class:`adsorb.gas.GasMolecule`,
:class:`adsorb.adsorbate.Adsorbate` and the equilibrium constants of
:func:`adsorb.equilibria.adsorption_equilibrium`):

* isosteric heats: :func:`adsorb.isotherms.isosteric_heat`, Clausius–Clapeyron at
  constant coverage, q_st = k T² (∂ ln p/∂T)_θ, for one adsorbate alone on its
  surface (R. I. Masel, Principles of Adsorption and Reaction on Solid Surfaces,
  Wiley 1996);
* TPD: :func:`adsorb.tpd.simulate_tpd`, first-order Polanyi–Wigner desorption with
  a transition-state-theory prefactor (below) and Redhead's analysis (P. A. Redhead,
  Vacuum 1962, 12, 203);
* NASA polynomials: :func:`adsorb.nasa.fit_nasa7` (B. J. McBride, S. Gordon,
  M. A. Reno, NASA TM-4513, 1993).

TPD rate constant. The transition state of desorption from a localized adsorbate
is a 2D gas of the desorbing molecule on one site that keeps the gas's internal
modes (C. T. Campbell, L. H. Sprowl, L. Árnadóttir, J. Phys. Chem. C 2016, 120,
10283; the reference notes §5.2):

    k_des(T) = (kT/h) (A_site/Λ²) (q_int,gas / q_ad) exp(-E_d/kT),

q_int,gas and q_ad (per site) counted from their zero-point levels. With this
TS, k_des equals the detailed-balance rate of the case's own site balance with
Hertz–Knudsen adsorption (sticking 1): k_des = A_site / (K(T) √(2π m kT)), K in
Pa^-1. The split into a prefactor and an exponent uses the zero-point-corrected
desorption energy at 0 K,

    E_d = -(ΔE_ads + ΔZPE_ads)      (ΔZPE at temperature_start_K),

so ν(T) = (kT/h)(A_site/Λ²) exp(ln q_int,gas - ln q_ad) with
ln q_int,gas - ln q_ad = (ΔG_ads(T) + E_d)/kT - ln q_trans,3D(T, p°), ΔG_ads with
the gas at p° (:func:`adsorb.tpd.prefactor_2d_gas_ts`). The ratio is evaluated on
a grid of at most 1 K spacing over the ramp and interpolated by a cubic spline.
With mean-field lateral interactions the site balance θ/θ_* = K p exp(-εθ/kT)
gives, by the same detailed balance, E_d(θ) = E_d - εθ with the same ν(T).
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from adsorb import constants as C
from adsorb.errors import ConvergenceError

__all__ = ["IsostericRun", "TPDRun", "NasaRun", "isosteric_run", "tpd_run", "nasa_runs", "CONVENTIONAL_PREFACTOR_S"]

#: The prefactor conventionally assumed in Redhead analyses, 1e13 s^-1 (≈ kT/h; Redhead, Vacuum 1962, 12, 203).
CONVENTIONAL_PREFACTOR_S = 1e13


@dataclass(frozen=True)
class IsostericRun:
    """q_st (eV per gas molecule; per A2 for a dissociative adsorbate) at temperatures x coverages."""

    adsorbate: str
    surface: str
    gas: str
    dissociative: bool
    interactions: bool
    self_interaction_eV: float
    temperature_K: np.ndarray         # (n_T,)
    coverage_ML: np.ndarray           # (n_c,)
    heat_eV: np.ndarray               # (n_T, n_c)
    minus_delta_enthalpy_eV: np.ndarray   # (n_T,), -ΔH_ads per gas molecule (= q_st at θ -> 0 without interactions)
    entry: int = 0                    # index of the case-file entry


def isosteric_run(study, spec) -> IsostericRun:
    """Isosteric heat of one adsorbate alone on its surface (:class:`adsorb.case_outputs.IsostericSpec`)."""
    from adsorb.isotherms import AdsorptionModel, isosteric_heat

    name = spec.adsorbate

    def k_of_t(temperature):
        return np.asarray(study.equilibrium(name, temperature).equilibrium_constant, dtype=float)[None]

    def ln_k_of_t(temperature):       # exact where K itself is capped (strong binding at low T)
        return np.asarray(study.equilibrium(name, temperature).ln_equilibrium_constant, dtype=float)[None]

    model = AdsorptionModel([name], k_of_t, ln_equilibrium_constants=ln_k_of_t,
                            dissociative=[spec.dissociative], sites_per_species=[spec.sites],
                            interactions=[[spec.self_interaction_eV]] if spec.interactions else None)
    temps = np.asarray(spec.temperatures_K, dtype=float)
    theta = np.asarray(spec.coverages_ML, dtype=float)
    grid = np.broadcast_to(theta[None, None, :], (1, temps.size, theta.size))
    heat = isosteric_heat(model, grid, temps[:, None])[0]
    minus_dh = -np.asarray(study.equilibrium(name, temps).terms.delta_enthalpy, dtype=float)
    return IsostericRun(adsorbate=name, surface=spec.surface, gas=spec.gas, dissociative=spec.dissociative,
                        interactions=spec.interactions, self_interaction_eV=spec.self_interaction_eV,
                        temperature_K=temps, coverage_ML=theta, heat_eV=heat, minus_delta_enthalpy_eV=minus_dh,
                        entry=spec.entry)


@dataclass(frozen=True)
class TPDRun:
    """Simulated first-order TPD spectra of one adsorbate and their Redhead analysis."""

    spec: object                      # adsorb.case_outputs.TPDSpec
    desorption_energy_eV: float       # E_d at zero coverage, -(ΔE + ΔZPE)
    energy_coefficients_eV: tuple     # E_d(θ) = c0 + c1 θ
    mass_amu: float
    spectra: tuple                    # adsorb.tpd.TPDResult, one per initial coverage
    redhead: tuple                    # one dict per spectrum
    prefactor: object = field(repr=False, compare=False, default=None)   # ν(T) in s^-1, callable
    prefactor_temperature_K: np.ndarray = field(default_factory=lambda: np.zeros(0))
    prefactor_s: np.ndarray = field(default_factory=lambda: np.zeros(0))


def _ramp_grid(start, end):
    n = int(min(5001, max(201, np.ceil(end - start) + 1)))
    return np.linspace(start, end, n)


def tst_prefactor(study, spec):
    """(ν(T) callable in s^-1, E_d in eV, gas mass in amu) of a :class:`adsorb.case_outputs.TPDSpec`.

    ν(T) = (kT/h)(A_site/Λ²) q_int,gas/q_ad with E_d = -(ΔE + ΔZPE); see the module docstring.
    """
    import scipy.interpolate

    from adsorb import tpd
    from adsorb.partition.translation import translation_3d

    temps = _ramp_grid(spec.temperature_start_K, spec.temperature_end_K)
    terms = study.equilibrium(spec.adsorbate, temps).terms
    e_d = -(float(terms.delta_energy) + float(np.ravel(terms.delta_zpe)[0]))
    mass = float(study.gas_objs[spec.gas].mass_amu)
    kt = C.kB_eV * temps
    ln_ratio = (np.asarray(terms.delta_gibbs, dtype=float) + e_d) / kt - translation_3d(temps, mass, C.P_STANDARD).ln_q
    spline = scipy.interpolate.CubicSpline(temps, ln_ratio)
    return tpd.prefactor_2d_gas_ts(mass, spec.site_area_A2, ln_q_ratio=spline), e_d, mass


def tpd_run(study, spec) -> TPDRun:
    """TPD spectra of a :class:`adsorb.case_outputs.TPDSpec`, one per initial coverage, with Redhead comparisons.

    Raises
    ------
    ConvergenceError
        No desorption peak inside the ramp (the message names the adsorbate and θ0).
    """
    import warnings

    from adsorb import tpd
    from adsorb.errors import ModelWarning

    nu, e_d, mass = tst_prefactor(study, spec)
    coefficients = (e_d, -spec.self_interaction_eV) if spec.interactions else (e_d,)
    spectra, redhead = [], []
    for theta0 in spec.initial_coverages_ML:
        try:
            r = tpd.simulate_tpd(theta0, spec.heating_rate_K_s, prefactor=nu, energy_eV=coefficients, order=1,
                                 temperature_start_K=spec.temperature_start_K,
                                 temperature_end_K=spec.temperature_end_K, n_points=spec.points)
        except ConvergenceError as exc:
            msg = (f"outputs.tpd ({spec.adsorbate}, initial coverage {theta0:g} ML, {spec.temperature_start_K:g}-"
                   f"{spec.temperature_end_K:g} K): {exc}")
            raise ConvergenceError(msg) from None
        if r.desorbed_ML < 0.99 * theta0:
            warnings.warn(f"TPD of {spec.adsorbate} from {theta0:g} ML: only {r.desorbed_ML:.3g} ML desorbed by "
                          f"{spec.temperature_end_K:g} K; raise temperature_end_K to see the whole spectrum",
                          ModelWarning, stacklevel=2)
        tp = r.peak_temperature_K
        comparison = tpd.redhead_comparison(tp, r.prefactor_at_peak_s, spec.heating_rate_K_s)
        conventional = tpd.redhead_energy(tp, CONVENTIONAL_PREFACTOR_S, spec.heating_rate_K_s)
        comparison.update(energy_used_eV=r.energy_at_peak_eV, redhead_energy_1e13_eV=conventional,
                          redhead_1e13_relative_difference=(conventional - r.energy_at_peak_eV) / r.energy_at_peak_eV)
        spectra.append(r)
        redhead.append(comparison)
    t_nu = np.linspace(spec.temperature_start_K, spec.temperature_end_K, 11)
    return TPDRun(spec=spec, desorption_energy_eV=e_d, energy_coefficients_eV=coefficients, mass_amu=mass,
                  spectra=tuple(spectra), redhead=tuple(redhead), prefactor=nu, prefactor_temperature_K=t_nu,
                  prefactor_s=np.asarray(nu(t_nu), dtype=float))


@dataclass(frozen=True)
class NasaRun:
    """A NASA 7-coefficient fit of one species' table (gas at p° = 1 bar, or adsorbate per site)."""

    species: str
    kind: str                         # "gas" | "adsorbate"
    pressure_Pa: float | None
    polynomial: object                # adsorb.nasa.NasaPolynomial


def nasa_runs(study, spec) -> tuple:
    """Fits of every species of a :class:`adsorb.case_outputs.NasaSpec` (:func:`adsorb.nasa.fit_nasa7`)."""
    from adsorb.nasa import fit_nasa7

    temps = np.asarray(spec.temperatures_K, dtype=float)
    out = []
    for name in spec.species:
        gas = study.gas_objs.get(name)
        if gas is not None:
            table, kind, p = gas.thermo(temps, pressure=C.P_STANDARD), "gas", C.P_STANDARD
        else:
            table, kind, p = study.ads_objs[name].thermo(temps), "adsorbate", None
        poly = fit_nasa7(table, t_mid_K=spec.temperature_mid_K, objective=spec.objective, name=name)
        out.append(NasaRun(species=name, kind=kind, pressure_Pa=p, polynomial=poly))
    return tuple(out)
