"""Benchmark (b): transition-state-theory desorption prefactors of n-alkanes on MgO(100) against Tait et al.

The TST prefactor ν(T) = (kT/h) q‡/q_ad (C. T. Campbell, L. H. Sprowl,
L. Árnadóttir, J. Phys. Chem. C 2016, 120, 10283) with a 2D-gas transition
state that keeps the gas molecule's free 3D rotation, for adsorbates treated
as harmonic, hindered (Sprowl, Campbell, Árnadóttir, J. Phys. Chem. C 2016,
120, 9719), 2D gas, 2D gas with a free rotor about the normal, and a gas-like
2D gas with free 3D rotation; the Arrhenius prefactor at the TPD peak
(Redhead, Vacuum 1962, 12, 203) is compared with S. L. Tait, Z. Dohnálek,
C. T. Campbell, B. D. Kay, J. Chem. Phys. 2005, 122, 164708. The
simplifications are listed in :mod:`adsorb.entropy_benchmarks` and
docs/entropy-benchmarks.md.

Import the names from :mod:`adsorb.entropy_benchmarks`.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from adsorb import constants as C
from adsorb.entropy_benchmarks.alkane_sites import AlkaneSite, _chain_length, alkane_site
from adsorb.entropy_benchmarks.data import ALKANE_CHAIN_LENGTHS, ALKANE_SURFACE, TAIT_2005
from adsorb.errors import ConvergenceError, InputError
from adsorb.partition.contribution import Contribution
from adsorb.partition.rotation import nonlinear_rotor
from adsorb.partition.translation import translation_2d
from adsorb.partition.vibration import harmonic


#: Adsorbate models of the alkane benchmark, in table order.
ALKANE_MODELS = ("harmonic", "hindered", "2d-gas", "2d-gas+free-rotor", "2d-gas+free-3d-rotor")


def transition_state(site: AlkaneSite, temperature) -> Contribution:
    """External motions of the desorption transition state: a 2D gas on one site with free 3D rotation.

    q‡ = (b²/Λ²) · q_rot(A, B, C, σ) (reference notes §5.2: the TS keeps the
    gas molecule's rotations and moves freely over one site; the motion normal
    to the surface is the reaction coordinate). Internal vibrations omitted
    (they cancel against the adsorbate's).
    """
    t = np.asarray(temperature, dtype=float)
    return (translation_2d(t, site.mass_amu, site.site_spacing_A**2)
            + nonlinear_rotor(t, site.rotational_constants_cm, site.external_symmetry_number))


def adsorbate_contribution(site: AlkaneSite, model: str, temperature) -> Contribution:
    """External motions of the adsorbed alkane under one model (internal modes omitted: they cancel).

    Built from the partition building blocks (eV, eV/K per molecule; the 2D
    translations per site of area b²):

    ``"harmonic"``
        all six external modes harmonic (:func:`adsorb.partition.vibration.harmonic`),
        the translations and the rotation about the normal at their
        barrier-implied frequencies — the localized (lattice-gas) adsorbate;
    ``"hindered"``
        two hindered translators and a hindered rotor about the normal, solved
        exactly on the same cosine potentials (:mod:`adsorb.partition.periodic`;
        the model of Sprowl, Campbell, Árnadóttir, J. Phys. Chem. C 2016, 120,
        9719), tilts and surface stretch harmonic;
    ``"2d-gas"``
        free 2D translation over b² (:func:`adsorb.partition.translation.translation_2d`),
        the three rotations and the stretch harmonic;
    ``"2d-gas+free-rotor"``
        the same with a free rotor about the normal
        (:func:`adsorb.partition.rotation.free_rotor`, σ = ``normal_symmetry_number``);
    ``"2d-gas+free-3d-rotor"``
        a gas-like adsorbate: the transition state's motions plus the harmonic
        stretch against the surface (the 2D-ideal-gas limit of reference notes
        §5.2, where k_des tends to the stretch frequency).

    These are the partition functions of :class:`adsorb.adsorbate.Adsorbate`
    for the same inputs (tests/test_entropy_benchmarks.py compares them). The
    Adsorbate itself is not used here because, without normal-mode vectors, it
    replaces the lowest frequencies, and for the longer chains the barrier-
    implied rotation about the normal is softer than the translations, so its
    ``"2d-gas"`` model would replace the rotation instead of a translation.
    """
    from adsorb.partition import periodic
    from adsorb.partition.rotation import free_rotor

    if model not in ALKANE_MODELS:
        msg = f"adsorbate_contribution model {model!r}: expected one of {', '.join(ALKANE_MODELS)}"
        raise InputError(msg)
    t = np.asarray(temperature, dtype=float)
    nu = site.frequencies_cm
    area = site.site_spacing_A**2
    if model == "harmonic":
        return harmonic(t, nu)
    if model == "hindered":
        one = periodic.lattice_translator(t, site.mass_amu, site.site_spacing_A,
                                          periodic.cosine_terms(site.translation_barrier_eV))
        rotor = periodic.ring_rotor(t, site.inertia_normal_amu_A2,
                                    periodic.cosine_terms(site.rotation_barrier_eV, site.rotation_minima),
                                    symmetry_number=site.normal_symmetry_number)
        return one + one + rotor + harmonic(t, nu[3:])
    if model == "2d-gas":
        return translation_2d(t, site.mass_amu, area) + harmonic(t, nu[2:])
    if model == "2d-gas+free-rotor":
        return (translation_2d(t, site.mass_amu, area)
                + free_rotor(t, site.inertia_normal_amu_A2, site.normal_symmetry_number) + harmonic(t, nu[3:]))
    return transition_state(site, t) + harmonic(t, [nu[5]])


def desorption_prefactor(site: AlkaneSite, model: str, temperature, *, extra_ln_q=None):
    """TST desorption prefactor ν(T) = (kT/h) q‡/q_ad and γ = d ln ν / d ln T.

    Both partition functions are counted from their zero-point levels, so the
    matching Polanyi–Wigner exponent is the 0 K barrier E0 (ZPE included).
    γ = 1 + (U‡ − U_ad)/kT exactly (U the thermal energies, d ln q/d ln T = U/kT).

    Parameters
    ----------
    site : AlkaneSite
    model : str
        One of :data:`ALKANE_MODELS`.
    temperature : array_like
        K.
    extra_ln_q : callable, optional
        T -> (ln q, d ln q / d ln T) of an extra factor of the TS (e.g.
        :func:`conformer_ln_q`); default none.

    Returns
    -------
    (ndarray, ndarray)
        ν in s^-1 and γ, shape of ``temperature``.
    """
    if model not in ALKANE_MODELS:
        msg = f"desorption_prefactor model {model!r}: expected one of {', '.join(ALKANE_MODELS)}"
        raise InputError(msg)
    t = np.asarray(temperature, dtype=float)
    if t.size == 0 or not np.all(np.isfinite(t) & (t > 0)):
        msg = f"desorption_prefactor temperature: expected finite values > 0 K, got {temperature!r}"
        raise InputError(msg)
    ts = transition_state(site, t)
    ad = adsorbate_contribution(site, model, t)
    kt = C.kB_eV * t
    ln_ratio = ts.ln_q - ad.ln_q
    gamma = 1.0 + (ts.energy - ad.energy) / kt
    if extra_ln_q is not None:
        extra, dextra = extra_ln_q(t)
        ln_ratio = ln_ratio + extra
        gamma = gamma + dextra
    nu = C.k_B * t / C.h * np.exp(ln_ratio)
    return np.broadcast_to(nu, t.shape).copy(), np.broadcast_to(gamma, t.shape).copy()


def arrhenius_peak(site: AlkaneSite, model: str, *, energy_eV=None, heating_rate_K_s=None, extra_ln_q=None,
                   max_iterations: int = 60) -> dict:
    """Peak temperature and Arrhenius prefactor of first-order TPD with the model's TST rate.

    The published E_d is read as the Arrhenius activation energy. With
    A(T) = ν(T) e^γ, the first-order peak condition of Redhead (Vacuum 1962,
    12, 203), E_d/(k Tp²) = (A(Tp)/β) exp(−E_d/k Tp), is solved by fixed-point
    iteration over :func:`adsorb.tpd.peak_temperature_first_order` at constant
    A. (This Tp is also the exact peak of k(T) = ν(T) exp(−E0/kT) with
    E0 = E_d − γ(Tp) k Tp.)

    Returns
    -------
    dict
        ``peak_temperature_K``, ``log10_tst`` (log10 ν(Tp)), ``gamma``,
        ``log10_arrhenius`` (log10 A(Tp)), ``e0_eV``.

    Raises
    ------
    ConvergenceError
        If the iteration does not settle to 1e-9 K.
    """
    from adsorb.tpd import peak_temperature_first_order

    energy = site.desorption_energy_eV if energy_eV is None else float(energy_eV)
    beta = TAIT_2005["heating_rate_K_s"] if heating_rate_K_s is None else float(heating_rate_K_s)
    tp = peak_temperature_first_order(energy, 1e13, beta)
    for _ in range(max_iterations):
        nu, gamma = desorption_prefactor(site, model, tp, extra_ln_q=extra_ln_q)
        new = peak_temperature_first_order(energy, float(nu * np.exp(gamma)), beta)
        if abs(new - tp) < 1e-9:
            tp = new
            break
        tp = new
    else:
        msg = f"arrhenius_peak: the peak temperature of C{site.n} ({model}) did not settle (last {tp:.6g} K)"
        raise ConvergenceError(msg)
    nu, gamma = desorption_prefactor(site, model, tp, extra_ln_q=extra_ln_q)
    nu, gamma = float(nu), float(gamma)
    return {"peak_temperature_K": tp, "log10_tst": np.log10(nu), "gamma": gamma,
            "log10_arrhenius": np.log10(nu) + gamma / np.log(10.0), "e0_eV": energy - gamma * C.kB_eV * tp}


def published_peak_temperature(n: int):
    """Tp (K) of the first-order peak from the published prefactor and E_d(N) of Tait et al., or None."""
    from adsorb.tpd import peak_temperature_first_order

    n = _chain_length(n)
    log_nu = TAIT_2005["log10_prefactor"].get(n)
    if log_nu is None:
        return None
    energy = C.from_kj_per_mol(TAIT_2005["energy_intercept_kJ_mol"] + TAIT_2005["energy_per_carbon_kJ_mol"] * n)
    return peak_temperature_first_order(energy, 10.0**log_nu, TAIT_2005["heating_rate_K_s"])


def conformer_ln_q(n: int, *, gauche_energy_kJ_mol: float):
    """Independent-bond rotational-isomeric estimate of the conformer partition function of an n-alkane.

    Each of the n − 3 internal C–C bonds is trans (energy 0) or gauche±
    (energy E_g each), independently (the rotational isomeric state picture
    of P. J. Flory, *Statistical Mechanics of Chain Molecules*, 1969, from
    memory, without the g+g− exclusion): q = (1 + 2 e^(−E_g/RT))^(n−3).
    It estimates the conformational entropy that a flexible TS (or gas)
    has and a flat, all-trans adsorbate has not; it is an estimate for
    the discussion, not part of any model here.

    Parameters
    ----------
    n : int
        Carbon atoms.
    gauche_energy_kJ_mol : float
        E_g in kJ/mol (> 0).

    Returns
    -------
    callable
        T -> (ln q, d ln q / d ln T), arrays of the shape of T.
    """
    n = _chain_length(n)
    if not (np.isfinite(gauche_energy_kJ_mol) and gauche_energy_kJ_mol > 0):
        msg = f"conformer_ln_q gauche_energy_kJ_mol: expected a finite number > 0, got {gauche_energy_kJ_mol!r}"
        raise InputError(msg)
    bonds = max(n - 3, 0)
    e_g = C.from_kj_per_mol(gauche_energy_kJ_mol)

    def ln_q(temperature):
        t = np.asarray(temperature, dtype=float)
        x = e_g / (C.kB_eV * t)
        w = 2.0 * np.exp(-x)
        return bonds * np.log1p(w), bonds * x * w / (1.0 + w)

    return ln_q


@dataclass(frozen=True)
class AlkaneRow:
    """One chain length of the alkane benchmark.

    Attributes
    ----------
    site : AlkaneSite
    published_log10 : float or None
        log10 of the published first-order prefactor (s^-1).
    published_uncertainty : float or None
    published_peak_K : float or None
        Tp from the published prefactor and E_d.
    models : dict
        Model name -> :func:`arrhenius_peak` result.
    conformers : dict
        E_g (kJ/mol) -> :func:`arrhenius_peak` of the harmonic model with the
        conformer estimate in the TS.
    """

    site: AlkaneSite
    published_log10: float | None
    published_uncertainty: float | None
    published_peak_K: float | None
    models: dict
    conformers: dict = field(default_factory=dict)


def alkane_benchmark(chain_lengths=ALKANE_CHAIN_LENGTHS, *, models=ALKANE_MODELS,
                     gauche_energies_kJ_mol=(2.5, 3.8)) -> list[AlkaneRow]:
    """TST prefactors of every model for each chain length, beside Tait et al. (2005).

    Parameters
    ----------
    chain_lengths : sequence of int, optional
        Default the published set (1-4, 6, 8, 10).
    models : sequence of str, optional
        Subset of :data:`ALKANE_MODELS`.
    gauche_energies_kJ_mol : sequence of float, optional
        E_g values for the conformer estimate on the harmonic model (default
        2.5 and 3.8 kJ/mol, the range of gas-phase n-butane values, from
        memory); empty for none.

    Returns
    -------
    list of AlkaneRow
    """
    for m in models:
        if m not in ALKANE_MODELS:
            msg = f"alkane_benchmark models: {m!r} is unknown; expected among {', '.join(ALKANE_MODELS)}"
            raise InputError(msg)
    rows = []
    for n in chain_lengths:
        site = alkane_site(n)
        results = {m: arrhenius_peak(site, m) for m in models}
        conformers = {float(e): arrhenius_peak(site, "harmonic", extra_ln_q=conformer_ln_q(n, gauche_energy_kJ_mol=e))
                      for e in gauche_energies_kJ_mol}
        rows.append(AlkaneRow(site=site, published_log10=TAIT_2005["log10_prefactor"].get(site.n),
                              published_uncertainty=TAIT_2005["log10_prefactor_uncertainty"].get(site.n),
                              published_peak_K=published_peak_temperature(site.n), models=results,
                              conformers=conformers))
    return rows


#: Invented inputs varied by :func:`alkane_sensitivity`.
SENSITIVITY_KEYS = ("translation_barrier_fraction", "rotation_barrier_fraction", "tilt_modes_cm",
                    "surface_stretch_cm", "site_spacing_A")


def alkane_sensitivity(chain_lengths=(1, 10), *, models=("harmonic", "hindered"), factors=(0.5, 2.0)) -> list[dict]:
    """Change of log10 A(Tp) when one input of :data:`ALKANE_SURFACE` is scaled.

    Parameters
    ----------
    chain_lengths : sequence of int, optional
    models : sequence of str, optional
        Subset of :data:`ALKANE_MODELS`.
    factors : sequence of float, optional
        Multipliers applied to one entry at a time (default 0.5 and 2).

    Returns
    -------
    list of dict
        ``parameter``, ``factor`` and, for each (n, model), the key
        ``f"{n}:{model}"`` with log10 A(scaled) − log10 A(default).
    """
    for m in models:
        if m not in ALKANE_MODELS:
            msg = f"alkane_sensitivity models: {m!r} is unknown; expected among {', '.join(ALKANE_MODELS)}"
            raise InputError(msg)
    base = {(n, m): arrhenius_peak(alkane_site(n), m)["log10_arrhenius"] for n in chain_lengths for m in models}
    rows = []
    for key in SENSITIVITY_KEYS:
        for factor in factors:
            value = ALKANE_SURFACE[key]
            scaled = tuple(factor * v for v in value) if isinstance(value, tuple) else factor * value
            row = {"parameter": key, "factor": float(factor)}
            for n in chain_lengths:
                site = alkane_site(n, surface={key: scaled})
                for m in models:
                    row[f"{n}:{m}"] = arrhenius_peak(site, m)["log10_arrhenius"] - base[(n, m)]
            rows.append(row)
    return rows
