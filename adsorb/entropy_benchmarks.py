"""Entropy benchmarks: the adsorbate models against two published measures of adsorbate entropy.

Two comparisons, every number computed here from the models (nothing stored
but inputs):

(a) **Campbell–Sellers correlation.** C. T. Campbell, J. R. V. Sellers, "The
    Entropies of Adsorbed Molecules", J. Am. Chem. Soc. 2012, 134, 18109–18115:
    S°_ad(T) = 0.70 S°_gas(T) − 3.3 R, standard deviation 2R, for molecular
    adsorbates at high coverage. Eight small gas molecules (Ar, N2, CO, CO2,
    H2O, NH3, CH4, C2H6) with *real* gas-phase data (rotational constants,
    fundamentals, symmetry numbers from the project's reference compilation,
    each row naming the original source) sit on **invented** sites whose
    spacing, barriers, orientation and extra frustrated-mode frequencies are
    made up and labelled so (:data:`INVENTED_SITES`). Each adsorbate is
    evaluated with :func:`adsorb.model_choice.compare_models` (harmonic,
    hindered, 2D gas) plus a 2D gas with a free rotor about the normal, at a
    named standard state (default θ° = 1/2; the adsorbate standard state of
    the 2012 data set is not verified in the project's notes).

(b) **n-alkanes on MgO(100).** S. L. Tait, Z. Dohnálek, C. T. Campbell,
    B. D. Kay, J. Chem. Phys. 2005, 122, 164708 (and, for n-butane, the same
    authors, J. Chem. Phys. 2005, DOI 10.1063/1.1883629): first-order
    desorption prefactors rising from about 10^13.1 s^-1 (CH4) to 10^19.1 s^-1
    (n-decane), E_d(N) = 6.5 + 7.1 N kJ/mol, heating rate 0.6 K/s; n-butane
    10^(15.7 ± 1.6) s^-1 (:data:`TAIT_2005`). The transition-state-theory
    prefactor ν(T) = (kT/h) q‡/q_ad (reference notes §5.2; C. T. Campbell,
    L. H. Sprowl, L. Árnadóttir, J. Phys. Chem. C 2016, 120, 10283) is computed
    with a **2D-gas transition state that keeps the gas molecule's free 3D
    rotation**, moving over the area of one site b², for adsorbates treated as
    harmonic (localized), hindered (Sprowl, Campbell, Árnadóttir, J. Phys.
    Chem. C 2016, 120, 9719), 2D gas, 2D gas with a free rotor about the normal,
    and a gas-like 2D gas with free 3D rotation (the limit ν → ν_z of §5.2).

Simplifications of (b), stated once here and in docs/entropy-benchmarks.md:

* the molecule's internal vibrations are taken as unchanged on adsorption, so
  they cancel in q‡/q_ad and only the external modes (two in-plane
  translations, three rotations, the stretch against the surface) matter; no
  gas-phase vibrations of the long alkanes are needed (none are sourced);
* every molecule is rigid and all-trans: conformational entropy is not
  modelled (:func:`conformer_ln_q` gives an independent-bond estimate of what
  it could add, for the discussion only);
* the TS moves over one site area b² with b the cation–cation distance of
  MgO(100); a TS spread over the molecule's whole footprint would raise
  log10 ν by log10(footprint/b²);
* a constant-prefactor analysis of a TPD peak produced by
  k(T) = ν(T) exp(−E0/kT) returns the *Arrhenius* pair E_a = E0 + γ kT and
  A = ν(T) e^γ, γ = d ln ν/d ln T; A is what is compared with the published
  prefactors, at the peak temperature where A(Tp) and the published E_d put
  the peak (Redhead's first-order peak condition, :mod:`adsorb.tpd`).

Geometry: ``ase.build.molecule`` (the G2 set) for CH4, C2H6, C3H8 and
trans-butane; a zig-zag all-trans chain built here (:func:`zigzag_alkane`)
for hexane, octane and decane. ASE is imported only inside the functions that
build structures (:func:`benchmark_gas`, :func:`zigzag_alkane`,
:func:`alkane_atoms`).
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from adsorb import constants as C
from adsorb.errors import AdsorbError, ConvergenceError, InputError
from adsorb.partition.contribution import Contribution
from adsorb.partition.hindered import rotor_frequency_cm, translator_frequency_cm
from adsorb.partition.rotation import nonlinear_rotor
from adsorb.partition.translation import translation_2d
from adsorb.partition.vibration import harmonic

__all__ = [
    "GasData",
    "InventedSite",
    "GAS_DATA",
    "INVENTED_SITES",
    "CORRELATION_MODELS",
    "CorrelationRow",
    "benchmark_gas",
    "benchmark_adsorbate",
    "correlation_benchmark",
    "standard_state_sensitivity",
    "TAIT_2005",
    "ALKANE_SURFACE",
    "ALKANE_CHAIN_LENGTHS",
    "ALKANE_MODELS",
    "AlkaneSite",
    "AlkaneRow",
    "zigzag_alkane",
    "alkane_atoms",
    "alkane_site",
    "adsorbate_contribution",
    "transition_state",
    "desorption_prefactor",
    "arrhenius_peak",
    "published_peak_temperature",
    "alkane_benchmark",
    "alkane_sensitivity",
    "SENSITIVITY_KEYS",
    "conformer_ln_q",
    "markdown_site_table",
    "markdown_correlation_table",
    "markdown_standard_state_table",
    "markdown_alkane_site_table",
    "markdown_alkane_table",
    "markdown_peak_table",
    "markdown_sensitivity_table",
    "plot_correlation_benchmark",
    "plot_alkane_prefactors",
]

_COMPILATION = "gas-reference-data compilation of this project"
#: I [amu Å^2] = _INERTIA_FACTOR / B [cm^-1], from B = h / (8 π^2 c I) (Herzberg's definition)
_INERTIA_FACTOR = C.h / (8.0 * C.pi**2 * C.c * 100.0 * C.amu_A2)


def _inertia_from_constant(b_cm: float) -> float:
    """Moment of inertia in amu Å^2 of a rotational constant B in cm^-1."""
    return _INERTIA_FACTOR / float(b_cm)


# ===========================================================================
# (a) Campbell–Sellers: real gas data, invented sites
# ===========================================================================
@dataclass(frozen=True)
class GasData:
    """Sourced gas-phase data of one benchmark molecule (cm^-1; sources named).

    Attributes
    ----------
    structure : str
        Name for ``ase.build.molecule`` (or a chemical symbol for an atom).
    frequencies_cm : tuple of float
        The 3N-5 / 3N-6 fundamentals (degenerate modes repeated).
    rotational_constants_cm : tuple of float
        B (linear) or (A, B, C) (non-linear); empty for an atom.
    symmetry_number : int
        External rotational symmetry number.
    sources : str
        Where the numbers come from (original sources, as cited by the
        project's reference compilation).
    torsion : dict or None
        Keyword arguments of :class:`adsorb.gas.Torsion` for a hindered
        internal rotation of the gas (ethane), else None.
    """

    structure: str
    frequencies_cm: tuple
    rotational_constants_cm: tuple
    symmetry_number: int
    sources: str
    torsion: dict | None = None


#: The benchmark gases. Values as transcribed in the project's reference compilation
#: (gas-reference-data.md §2a, §2b) with the original sources it names.
GAS_DATA = {
    "Ar": GasData("Ar", (), (), 1, "atom; mass from ASE (IUPAC atomic weight)"),
    "N2": GasData("N2", (2329.91,), (1.98957,), 2,
                  "B0 and ΔG1/2: Huber & Herzberg, Constants of Diatomic Molecules (1979), as quoted from memory in the "
                  + _COMPILATION),
    "CO": GasData("CO", (2143.27,), (1.92253,), 1,
                  "B0 and ΔG1/2: Huber & Herzberg (1979), as quoted from memory in the " + _COMPILATION),
    "CO2": GasData("CO2", (1333.0, 667.0, 667.0, 2349.0), (0.39021,), 2,
                   "B: NIST CCCBDB (Herzberg 1966); fundamentals: NIST CCCBDB (Herzberg 1945)"),
    "H2O": GasData("H2O", (3657.0, 1595.0, 3756.0), (27.877, 14.512, 9.285), 2,
                   "A, B, C: NIST CCCBDB experimental geometry page; fundamentals: Shimanouchi, NSRDS-NBS 39 (1972), "
                   "from memory in the " + _COMPILATION),
    "NH3": GasData("NH3", (3337.0, 950.0, 3444.0, 3444.0, 1627.0, 1627.0), (9.4443, 9.4443, 6.196), 3,
                   "A, B, C: NIST CCCBDB (Herzberg 1966); fundamentals: NIST CCCBDB (Shimanouchi)"),
    "CH4": GasData("CH4", (2917.0, 1534.0, 1534.0, 3019.0, 3019.0, 3019.0, 1306.0, 1306.0, 1306.0),
                   (5.241, 5.241, 5.241), 12,
                   "B0 from memory in the " + _COMPILATION + "; fundamentals: Shimanouchi (1972), from memory there"),
    "C2H6": GasData("C2H6", (2954.0, 1388.0, 995.0, 289.0, 2896.0, 1379.0, 2969.0, 2969.0, 1468.0, 1468.0,
                             1190.0, 1190.0, 2985.0, 2985.0, 1469.0, 1469.0, 822.0, 822.0),
                    (2.68, 0.6630, 0.6630), 6,
                    "A, B from memory in the " + _COMPILATION + "; fundamentals: NIST CCCBDB (Shimanouchi); torsion "
                    "V3 = 1024 cm^-1: Gurvich et al. (1989-91) via NIST CCCBDB",
                    torsion={"top": (0, 2, 3, 4), "barriers_cm": {3: 1024.0}, "symmetry_number": 3, "mode": 3}),
}


@dataclass(frozen=True)
class InventedSite:
    """An INVENTED adsorption site for one benchmark molecule (all numbers made up, labelled so).

    Attributes
    ----------
    orientation : str
        How the molecule sits (invented).
    site_spacing_A : float
        Distance b between neighbouring sites, Å (invented, 2.5-3 Å).
    translation_barrier_eV : float
        Diffusion barrier W_x, eV (invented).
    rotation_barrier_eV : float or None
        Barrier to rotation about the surface normal, eV (invented; None for an atom).
    rotation_minima : int or None
        Minima per turn of that rotation (invented).
    rotor_symmetry_number : int or None
        Indistinguishable orientations per turn about the normal (follows from the orientation).
    normal_constant : int or None
        Index into the gas molecule's rotational constants (descending, as in
        :class:`adsorb.gas.GasMolecule`) of the constant whose axis is the
        surface normal; the moment about the normal is h/(8π² c B) of it.
    other_modes_cm : tuple of float
        Invented frequencies of the remaining external modes: the frustrated
        rotations about in-plane axes (tilts) and the stretch against the
        surface, cm^-1. Each must exceed the barrier-implied frequencies.
    """

    orientation: str
    site_spacing_A: float
    translation_barrier_eV: float
    rotation_barrier_eV: float | None
    rotation_minima: int | None
    rotor_symmetry_number: int | None
    normal_constant: int | None
    other_modes_cm: tuple


#: INVENTED sites (invented numbers; only the gas data above are real).
INVENTED_SITES = {
    "Ar": InventedSite("atom on a hollow of an invented square lattice", 3.0, 0.02, None, None, None, None,
                       (40.0,)),
    "N2": InventedSite("lying flat, axis along a lattice row (invented)", 2.8, 0.04, 0.02, 4, 2, 0, (80.0, 90.0)),
    "CO": InventedSite("lying flat (invented)", 2.8, 0.05, 0.03, 4, 1, 0, (90.0, 100.0)),
    "CO2": InventedSite("lying flat (invented)", 3.0, 0.06, 0.04, 4, 2, 0, (70.0, 90.0)),
    "H2O": InventedSite("molecular plane parallel to the surface, O over a cation (invented)", 2.8, 0.15, 0.08, 4,
                        1, 2, (350.0, 450.0, 400.0)),
    "NH3": InventedSite("C3 axis along the normal, N down (invented)", 2.8, 0.15, 0.03, 6, 3, 2,
                        (300.0, 300.0, 350.0)),
    "CH4": InventedSite("C3 axis along the normal, three H down (invented)", 2.8, 0.03, 0.01, 3, 3, 0,
                        (80.0, 80.0, 100.0)),
    "C2H6": InventedSite("C-C axis parallel to the surface, a C2 axis along the normal (invented)", 2.8, 0.05,
                         0.03, 4, 2, 1, (60.0, 80.0, 100.0)),
}

#: Models of the correlation benchmark, in table order. The last is the hindered model with both
#: barriers set to zero: a 2D ideal gas with a free 1D rotor about the normal.
CORRELATION_MODELS = ("harmonic", "hindered", "2d-gas", "2d-gas+free-rotor")


def _check_name(name, table, what):
    if name not in table:
        msg = f"{what} {name!r} is unknown; expected one of {', '.join(table)}"
        raise InputError(msg)


def benchmark_gas(name: str):
    """The :class:`adsorb.gas.GasMolecule` of a benchmark molecule, from :data:`GAS_DATA`.

    Parameters
    ----------
    name : str
        A key of :data:`GAS_DATA`.

    Returns
    -------
    adsorb.gas.GasMolecule

    Raises
    ------
    InputError
        Unknown name.
    """
    _check_name(name, GAS_DATA, "benchmark molecule")
    from ase import Atoms
    from ase.build import molecule

    from adsorb.gas import GasMolecule, Torsion

    data = GAS_DATA[name]
    atoms = Atoms(data.structure) if not data.rotational_constants_cm else molecule(data.structure)
    keywords = {"name": name}
    if data.rotational_constants_cm:
        keywords.update(rotational_constants=data.rotational_constants_cm, symmetry_number=data.symmetry_number)
    if data.torsion is not None:
        keywords["torsions"] = [Torsion(**data.torsion)]
    return GasMolecule(atoms, list(data.frequencies_cm), **keywords)


def benchmark_adsorbate(name: str) -> dict:
    """Inputs of the adsorbate of a benchmark molecule on its invented site.

    The 3N frequencies are, in this order: the two frustrated translations at
    the barrier-implied frequency sqrt(W/(2 m b²)), the rotation about the
    normal at its barrier-implied frequency (n/2π) sqrt(W_r/(2 I)) (Sprowl,
    Campbell, Árnadóttir, J. Phys. Chem. C 2016, 120, 9719), the invented
    tilts and surface stretch, and the gas molecule's fundamentals (taken as
    unchanged on adsorption). The models replace the lowest frequencies, so
    the invented modes must lie above the barrier-implied ones (checked).

    Parameters
    ----------
    name : str
        A key of :data:`GAS_DATA`.

    Returns
    -------
    dict
        ``frequencies`` (cm^-1), ``parameters`` (keywords of
        :class:`adsorb.adsorbate.Adsorbate`: mass in amu, site_spacing in Å,
        barriers in eV, rotation_minima, symmetry_number, inertia in amu Å^2),
        ``implied_cm`` (translation, rotation) and ``site`` (the
        :class:`InventedSite`).

    Raises
    ------
    InputError
        Unknown name.
    AdsorbError
        If the invented site is inconsistent with the molecule (wrong number
        of external modes, an invented mode below a barrier-implied one).
    """
    gas = benchmark_gas(name)
    site = INVENTED_SITES[name]
    data = GAS_DATA[name]
    n_external = {"monatomic": 3, "linear": 5, "nonlinear": 6}[gas.geometry]
    mass = gas.mass_amu
    nu_t = float(translator_frequency_cm(mass, site.translation_barrier_eV, site.site_spacing_A))
    replaced = [nu_t, nu_t]
    parameters = {"mass": mass, "site_spacing": site.site_spacing_A,
                  "translation_barrier": site.translation_barrier_eV}
    nu_r = None
    if site.rotation_barrier_eV is not None:
        inertia = _inertia_from_constant(gas.rotational_constants_cm[site.normal_constant])
        nu_r = float(rotor_frequency_cm(inertia, site.rotation_barrier_eV, site.rotation_minima))
        replaced.append(nu_r)
        parameters.update(rotation_barrier=site.rotation_barrier_eV, rotation_minima=site.rotation_minima,
                          symmetry_number=site.rotor_symmetry_number, inertia=inertia)
    if len(replaced) + len(site.other_modes_cm) != n_external:
        msg = (f"invented site of {name}: {len(replaced)} replaced + {len(site.other_modes_cm)} other external modes, "
               f"expected {n_external} for a {gas.geometry} molecule")
        raise AdsorbError(msg)
    if min(site.other_modes_cm) <= max(replaced):
        msg = (f"invented site of {name}: the invented modes {site.other_modes_cm} cm^-1 must exceed the "
               f"barrier-implied frequencies {[round(v, 2) for v in replaced]} cm^-1")
        raise AdsorbError(msg)
    frequencies = replaced + list(site.other_modes_cm) + list(data.frequencies_cm)
    return {"frequencies": frequencies, "parameters": parameters, "implied_cm": (nu_t, nu_r), "site": site}


@dataclass(frozen=True)
class CorrelationRow:
    """One molecule at one temperature in the correlation benchmark (J/(mol K)).

    Attributes
    ----------
    molecule : str
    temperature : float
        K.
    gas_entropy : float
        S°(gas, 1 bar, T).
    correlation_entropy : float
        0.70 S°_gas − 3.3 R (Campbell and Sellers 2012).
    entropies : dict
        Model name -> S° of the adsorbate at the standard state.
    deviations : dict
        Model name -> (S° − S°_correlation) / 2R.
    recommended : str
        Model recommended by :func:`adsorb.model_choice.recommend_model`.
    standard_state : str
    """

    molecule: str
    temperature: float
    gas_entropy: float
    correlation_entropy: float
    entropies: dict
    deviations: dict
    recommended: str
    standard_state: str


def _check_temperatures(temperatures):
    t = np.atleast_1d(np.asarray(temperatures, dtype=float)).ravel()
    if t.size == 0 or not np.all(np.isfinite(t) & (t > 0)):
        msg = f"temperatures: expected finite values > 0 K, got {temperatures!r}"
        raise InputError(msg)
    return t


def _free_rotor_model(inputs, name, t, state):
    """S° of the hindered model with both barriers zero (2D gas + free rotor about the normal)."""
    from adsorb.adsorbate import Adsorbate
    from adsorb.standard_states import standard_thermo

    params = dict(inputs["parameters"])
    params["translation_barrier"] = 0.0
    if "rotation_barrier" in params:
        params["rotation_barrier"] = 0.0
    ads = Adsorbate(inputs["frequencies"], model="hindered", solver="exact", name=f"{name} (free)", **params)
    _check_replaced(ads, name)
    return standard_thermo(ads.thermo(t), state).entropy


def _check_replaced(adsorbate, name):
    """The models must replace the first modes of the list (the barrier-implied ones)."""
    indices = sorted(m["index"] for m in adsorbate.replaced_modes)
    if indices != list(range(len(indices))):
        msg = f"{name}: model {adsorbate.model!r} replaced modes {indices}, expected the first {len(indices)}"
        raise AdsorbError(msg)


def correlation_benchmark(temperatures=(150.0, 300.0), *, standard_state: str = "lattice-half",
                          molecules=None) -> list[CorrelationRow]:
    """Adsorbate S° of every benchmark molecule under each model, with the Campbell–Sellers correlation.

    Uses :func:`adsorb.model_choice.compare_models` (the hindered model with
    the exact plane-wave solver, :mod:`adsorb.partition.periodic`) and adds
    the 2D gas with a free rotor about the normal.

    Parameters
    ----------
    temperatures : sequence of float, optional
        Temperatures in K (default 150 and 300 K).
    standard_state : str, optional
        Named adsorbate standard state (:data:`adsorb.standard_states.STANDARD_STATES`);
        default ``"lattice-half"``, θ° = 1/2. The state behind the 2012 data
        set is not verified in the project's notes.
    molecules : sequence of str, optional
        Keys of :data:`GAS_DATA` (default all).

    Returns
    -------
    list of CorrelationRow
        Molecule-major, temperatures ascending.

    Raises
    ------
    InputError
        Bad temperatures, an unknown molecule or standard state.
    """
    from adsorb.adsorbate import Adsorbate
    from adsorb.model_choice import compare_models

    t = np.sort(_check_temperatures(temperatures))
    names = list(GAS_DATA) if molecules is None else list(molecules)
    rows = []
    for name in names:
        _check_name(name, GAS_DATA, "benchmark molecule")
        inputs = benchmark_adsorbate(name)
        for model in ("hindered", "2d-gas"):
            _check_replaced(Adsorbate(inputs["frequencies"], model=model, **inputs["parameters"]), name)
        gas = benchmark_gas(name)
        comparison = compare_models(inputs["frequencies"], t, gas=gas, standard_state=standard_state, name=name,
                                    solver="exact", **inputs["parameters"])
        s_corr = C.to_j_per_mol_k(comparison.correlation_entropy)
        s_gas = C.to_j_per_mol_k(comparison.gas_entropy)
        per_model = {m: C.to_j_per_mol_k(comparison[m].entropy) for m in CORRELATION_MODELS[:3]}
        per_model[CORRELATION_MODELS[3]] = C.to_j_per_mol_k(_free_rotor_model(inputs, name, t, standard_state))
        sd = 2.0 * C.R
        for i, temp in enumerate(t):
            entropies = {m: float(v[i]) for m, v in per_model.items()}
            rows.append(CorrelationRow(
                molecule=name, temperature=float(temp), gas_entropy=float(s_gas[i]),
                correlation_entropy=float(s_corr[i]), entropies=entropies,
                deviations={m: (s - float(s_corr[i])) / sd for m, s in entropies.items()},
                recommended=str(np.ravel(comparison.recommended)[i]), standard_state=standard_state))
    return rows


def standard_state_sensitivity(temperature: float = 300.0, *, model: str = "2d-gas", molecules=None) -> list[dict]:
    """S° of one model at each named standard state, beside the correlation (J/(mol K)).

    Parameters
    ----------
    temperature : float, optional
        K (default 300 K).
    model : str, optional
        ``"harmonic"``, ``"hindered"`` or ``"2d-gas"`` (default).
    molecules : sequence of str, optional
        Keys of :data:`GAS_DATA` (default all).

    Returns
    -------
    list of dict
        ``molecule``, ``correlation`` and one entry per state of
        :data:`adsorb.standard_states.STANDARD_STATES`.
    """
    from adsorb.adsorbate import Adsorbate
    from adsorb.model_choice import campbell_sellers_entropy
    from adsorb.standard_states import STANDARD_STATES, standard_thermo

    if model not in CORRELATION_MODELS[:3]:
        msg = f"standard_state_sensitivity model {model!r}: expected one of {', '.join(CORRELATION_MODELS[:3])}"
        raise InputError(msg)
    t = _check_temperatures(temperature)[:1]
    out = []
    for name in (list(GAS_DATA) if molecules is None else list(molecules)):
        _check_name(name, GAS_DATA, "benchmark molecule")
        inputs = benchmark_adsorbate(name)
        table = Adsorbate(inputs["frequencies"], model=model, solver="exact", **inputs["parameters"]).thermo(t)
        s_gas = benchmark_gas(name).thermo(t).entropy
        row = {"molecule": name, "temperature": float(t[0]),
               "correlation": float(C.to_j_per_mol_k(campbell_sellers_entropy(s_gas))[0])}
        area = inputs["parameters"]["site_spacing"] ** 2
        for state in STANDARD_STATES:
            row[state] = float(C.to_j_per_mol_k(standard_thermo(table, state, site_area_A2=area).entropy)[0])
        out.append(row)
    return out


# ===========================================================================
# (b) n-alkanes on MgO(100)
# ===========================================================================
#: Published data (Tait, Dohnálek, Campbell, Kay, J. Chem. Phys. 2005, 122, 164708, and for n-butane
#: J. Chem. Phys. 2005, DOI 10.1063/1.1883629; abstracts read for the project's reference notes, check
#: values rows 5-7).
TAIT_2005 = {
    "source": ("S. L. Tait, Z. Dohnálek, C. T. Campbell, B. D. Kay, J. Chem. Phys. 2005, 122, 164708 "
               "(chain-length dependence); n-butane: J. Chem. Phys. 2005, DOI 10.1063/1.1883629"),
    "energy_intercept_kJ_mol": 6.5,        # E_d(N) = 6.5 + 7.1 N kJ/mol
    "energy_per_carbon_kJ_mol": 7.1,       # ± 0.2 per CH2
    "heating_rate_K_s": 0.6,
    "chain_lengths": (1, 2, 3, 4, 6, 8, 10),
    "log10_prefactor": {1: 13.1, 4: 15.7, 10: 19.1},   # s^-1; N = 1 and 10 "from about ... to"
    "log10_prefactor_uncertainty": {4: 1.6},
}

#: Chain lengths studied by Tait et al. (2005).
ALKANE_CHAIN_LENGTHS = TAIT_2005["chain_lengths"]

#: The MgO(100) model surface of the alkane benchmark. The site spacing is the Mg-Mg distance a/sqrt(2) of
#: rock-salt MgO with a = 4.21 Å (from memory); everything else is INVENTED.
ALKANE_SURFACE = {
    "site_spacing_A": 4.21 / np.sqrt(2.0),            # from memory (MgO lattice constant 4.21 Å)
    "translation_barrier_fraction": 0.10,             # invented: W_x = 0.10 E_d(N)
    "rotation_barrier_fraction": 0.05,                # invented: W_r = 0.05 E_d(N)
    "rotation_minima": 4,                             # square cation lattice (follows from the invented picture)
    "tilt_modes_cm": (80.0, 80.0),                    # invented: frustrated rotations about in-plane axes
    "surface_stretch_cm": 100.0,                      # invented: vibration against the surface
}

#: Adsorbate models of the alkane benchmark, in table order.
ALKANE_MODELS = ("harmonic", "hindered", "2d-gas", "2d-gas+free-rotor", "2d-gas+free-3d-rotor")

_G2_ALKANES = {1: "CH4", 2: "C2H6", 3: "C3H8", 4: "trans-butane"}


def _chain_length(n):
    if isinstance(n, bool) or not isinstance(n, (int, np.integer)) or int(n) < 1:
        msg = f"chain length n: expected an integer >= 1 (carbon atoms), got {n!r}"
        raise InputError(msg)
    return int(n)


def zigzag_alkane(n: int, *, cc_A: float = 1.53, ch_A: float = 1.09, ccc_deg: float = 112.0,
                  hch_deg: float = 107.0, hcc_deg: float = 110.9):
    """An all-trans (zig-zag) n-alkane C_nH_(2n+2) built from bond lengths and angles, n >= 3.

    The carbon backbone lies in the xy plane along x; each CH2 has its two H
    in the plane through the C perpendicular to the backbone, symmetric about
    the bisector of the C-C-C angle; each terminal CH3 is staggered, with one H
    in the backbone plane anti to the next-but-one carbon. The default bond
    lengths and angles are typical alkane values (common practice; from
    memory), and reproduce the principal moments of the G2 propane and
    trans-butane of ``ase.build.molecule`` to better than 1 %.

    Parameters
    ----------
    n : int
        Number of carbon atoms (>= 3).
    cc_A, ch_A : float, optional
        C-C and C-H bond lengths in Å.
    ccc_deg, hch_deg, hcc_deg : float, optional
        C-C-C, H-C-H (methylene) and H-C-C (methyl) angles in degrees.

    Returns
    -------
    ase.Atoms
        Carbons first (along the chain), then the hydrogens.

    Raises
    ------
    InputError
        n < 3 or non-positive lengths/angles.
    """
    n = _chain_length(n)
    if n < 3:
        msg = f"zigzag_alkane n: expected >= 3 carbon atoms (use ase.build.molecule for CH4 and C2H6), got {n}"
        raise InputError(msg)
    for label, value in (("cc_A", cc_A), ("ch_A", ch_A), ("ccc_deg", ccc_deg), ("hch_deg", hch_deg),
                         ("hcc_deg", hcc_deg)):
        if not (np.isfinite(value) and value > 0):
            msg = f"zigzag_alkane {label}: expected a finite number > 0, got {value!r}"
            raise InputError(msg)
    from ase import Atoms

    half = np.radians(ccc_deg) / 2.0
    carbons = np.array([[i * cc_A * np.sin(half), (i % 2) * cc_A * np.cos(half), 0.0] for i in range(n)])
    up = np.array([0.0, 0.0, 1.0])
    hydrogens = []
    a = np.radians(hch_deg) / 2.0
    for i in range(1, n - 1):
        bisector = -((carbons[i - 1] - carbons[i]) + (carbons[i + 1] - carbons[i])) / cc_A
        bisector /= np.linalg.norm(bisector)
        for sign in (1.0, -1.0):
            hydrogens.append(carbons[i] + ch_A * (np.cos(a) * bisector + sign * np.sin(a) * up))
    g = np.radians(hcc_deg)
    for end, neighbour, beyond in ((0, 1, 2), (n - 1, n - 2, n - 3)):
        v = carbons[neighbour] - carbons[end]
        v /= np.linalg.norm(v)
        w = carbons[beyond] - carbons[neighbour]
        w -= (w @ v) * v
        e1 = -w / np.linalg.norm(w)          # anti to the next-but-one carbon
        e2 = np.cross(v, e1)
        for phi in (0.0, 2.0 * np.pi / 3.0, -2.0 * np.pi / 3.0):
            hydrogens.append(carbons[end] + ch_A * (np.cos(g) * v + np.sin(g) * (np.cos(phi) * e1 + np.sin(phi) * e2)))
    return Atoms(f"C{n}H{2 * n + 2}", positions=np.vstack([carbons, np.array(hydrogens)]))


def alkane_atoms(n: int):
    """Structure of the n-alkane: the G2 geometry of ``ase.build.molecule`` for n <= 4, else :func:`zigzag_alkane`.

    Returns
    -------
    (ase.Atoms, str)
        The structure and where it comes from.
    """
    n = _chain_length(n)
    if n in _G2_ALKANES:
        from ase.build import molecule

        return molecule(_G2_ALKANES[n]), f"ase.build.molecule({_G2_ALKANES[n]!r}) (G2 set)"
    return zigzag_alkane(n), "zig-zag all-trans chain built here"


@dataclass(frozen=True)
class AlkaneSite:
    """The n-alkane on the model MgO(100) surface (eV, Å, amu, amu Å^2, cm^-1).

    Attributes
    ----------
    n : int
    formula, geometry_source : str
    mass_amu : float
    external_symmetry_number : int
        Rotational symmetry number of the gas molecule (detected from the geometry).
    rotational_constants_cm : ndarray
        (A, B, C) of the geometry.
    normal_symmetry_number : int
        Indistinguishable orientations per turn about the surface normal:
        2 for CH4 (a C2 axis along the normal), C2H6 (one of its C2 axes) and
        the even chains (C2h, the C2 axis perpendicular to the carbon plane,
        which lies flat); 1 for the odd chains (C2v, the C2 axis lies in the
        carbon plane).
    inertia_normal_amu_A2 : float
        Moment about the normal: the largest principal moment (the axis
        perpendicular to the carbon plane of a flat-lying chain).
    desorption_energy_eV : float
        E_d(N) of Tait et al. (2005).
    translation_barrier_eV, rotation_barrier_eV : float
        Invented fractions of E_d (:data:`ALKANE_SURFACE`).
    site_spacing_A : float
    rotation_minima : int
        Minima per turn of the rotation about the normal.
    frequencies_cm : tuple
        External modes by slot: two translations and the rotation about the
        normal at their barrier-implied frequencies, then the two invented
        tilts and the surface stretch.
    """

    n: int
    formula: str
    geometry_source: str
    mass_amu: float
    external_symmetry_number: int
    rotational_constants_cm: np.ndarray
    normal_symmetry_number: int
    inertia_normal_amu_A2: float
    desorption_energy_eV: float
    translation_barrier_eV: float
    rotation_barrier_eV: float
    site_spacing_A: float
    rotation_minima: int
    frequencies_cm: tuple


def alkane_site(n: int, *, surface=None) -> AlkaneSite:
    """The n-alkane on the model MgO(100) surface (geometry, symmetry, invented barriers and modes).

    Parameters
    ----------
    n : int
        Carbon atoms (>= 1).
    surface : mapping, optional
        Values replacing entries of :data:`ALKANE_SURFACE` (same keys), e.g.
        for a sensitivity study.

    Raises
    ------
    InputError
        n not an integer >= 1, or an unknown or non-positive ``surface`` entry.
    """
    from adsorb import geometry

    n = _chain_length(n)
    surf = dict(ALKANE_SURFACE)
    for key, value in dict(surface or {}).items():
        if key not in ALKANE_SURFACE:
            msg = f"alkane_site surface key {key!r} is unknown; expected one of {', '.join(ALKANE_SURFACE)}"
            raise InputError(msg)
        values = np.atleast_1d(np.asarray(value, dtype=float))
        if values.shape != np.atleast_1d(ALKANE_SURFACE[key]).shape or not np.all(np.isfinite(values) & (values > 0)):
            msg = f"alkane_site surface[{key!r}]: expected positive value(s) like {ALKANE_SURFACE[key]!r}, got {value!r}"
            raise InputError(msg)
        if key == "rotation_minima" and not float(values[0]).is_integer():
            msg = f"alkane_site surface['rotation_minima']: expected a positive integer, got {value!r}"
            raise InputError(msg)
        surf[key] = tuple(float(v) for v in values) if isinstance(ALKANE_SURFACE[key], tuple) else float(values[0])
    atoms, source = alkane_atoms(n)
    moments, _ = geometry.principal_moments(atoms)
    mass = float(geometry.masses_amu(atoms).sum())
    sigma = int(geometry.rotational_symmetry_number(atoms))
    energy = C.from_kj_per_mol(TAIT_2005["energy_intercept_kJ_mol"] + TAIT_2005["energy_per_carbon_kJ_mol"] * n)
    b = float(surf["site_spacing_A"])
    w_t = surf["translation_barrier_fraction"] * energy
    w_r = surf["rotation_barrier_fraction"] * energy
    inertia = float(moments[2])
    nu_t = float(translator_frequency_cm(mass, w_t, b))
    nu_r = float(rotor_frequency_cm(inertia, w_r, surf["rotation_minima"]))
    others = tuple(surf["tilt_modes_cm"]) + (surf["surface_stretch_cm"],)
    return AlkaneSite(
        n=n, formula=str(atoms.get_chemical_formula(mode="hill")), geometry_source=source, mass_amu=mass,
        external_symmetry_number=sigma,
        rotational_constants_cm=np.asarray(geometry.rotational_constants_cm(moments), dtype=float),
        normal_symmetry_number=2 if (n <= 2 or n % 2 == 0) else 1, inertia_normal_amu_A2=inertia,
        desorption_energy_eV=float(energy), translation_barrier_eV=float(w_t), rotation_barrier_eV=float(w_r),
        site_spacing_A=b, rotation_minima=int(round(surf["rotation_minima"])),
        frequencies_cm=(nu_t, nu_t, nu_r) + others)


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


# ===========================================================================
# tables (Markdown) and figures
# ===========================================================================
def _md(header, rows):
    lines = ["| " + " | ".join(header) + " |", "| " + " | ".join("---" for _ in header) + " |"]
    lines += ["| " + " | ".join(r) + " |" for r in rows]
    return "\n".join(lines)


def _signed(value, digits):
    value = 0.0 if round(value, digits) == 0 else value
    text = f"{value:.{digits}f}"
    return text.replace("-", "−")


def markdown_site_table() -> str:
    """The invented sites of the correlation benchmark, with the barrier-implied frequencies."""
    rows = []
    for name, site in INVENTED_SITES.items():
        inputs = benchmark_adsorbate(name)
        p = inputs["parameters"]
        nu_t, nu_r = inputs["implied_cm"]
        rows.append([
            name, site.orientation, f"{site.site_spacing_A:g}", f"{site.translation_barrier_eV:g}",
            "—" if site.rotation_barrier_eV is None else f"{site.rotation_barrier_eV:g}",
            "—" if site.rotation_minima is None else str(site.rotation_minima),
            "—" if site.rotor_symmetry_number is None else str(site.rotor_symmetry_number),
            "—" if "inertia" not in p else f"{p['inertia']:.2f}",
            f"{nu_t:.1f}", "—" if nu_r is None else f"{nu_r:.1f}",
            ", ".join(f"{v:g}" for v in site.other_modes_cm)])
    return _md(["molecule", "orientation (invented)", "b / Å", "W_trans / eV", "W_rot / eV", "minima", "σ_normal",
                "I_normal / amu Å²", "ν_trans (implied) / cm⁻¹", "ν_rot (implied) / cm⁻¹",
                "tilts, stretch / cm⁻¹ (invented)"], rows)


def markdown_correlation_table(rows) -> str:
    """S° per model (deviation from the correlation in units of its SD, 2R, in parentheses)."""
    out = []
    for r in rows:
        cells = [r.molecule, f"{r.temperature:g}", f"{r.gas_entropy:.1f}", f"{r.correlation_entropy:.1f}"]
        cells += [f"{r.entropies[m]:.1f} ({_signed(r.deviations[m], 1)})" for m in CORRELATION_MODELS]
        cells.append(r.recommended)
        out.append(cells)
    return _md(["molecule", "T / K", "S°gas", "S°ad Campbell–Sellers"] + [f"{m}" for m in CORRELATION_MODELS]
               + ["rule of thumb"], out)


def markdown_standard_state_table(rows) -> str:
    """S° of one model at the three named standard states beside the correlation."""
    from adsorb.standard_states import STANDARD_STATES

    out = [[r["molecule"], f"{r['correlation']:.1f}"] + [f"{r[s]:.1f}" for s in STANDARD_STATES] for r in rows]
    return _md(["molecule", "Campbell–Sellers"] + list(STANDARD_STATES), out)


def markdown_alkane_site_table(rows) -> str:
    """Geometry, symmetry and the invented barriers/modes of each chain length."""
    out = []
    for r in rows:
        s = r.site
        out.append([str(s.n), s.formula, s.geometry_source, f"{s.mass_amu:.2f}", str(s.external_symmetry_number),
                    str(s.normal_symmetry_number), f"{s.inertia_normal_amu_A2:.1f}",
                    f"{C.to_kj_per_mol(s.desorption_energy_eV):.1f}", f"{s.translation_barrier_eV:.4f}",
                    f"{s.rotation_barrier_eV:.4f}", f"{s.frequencies_cm[0]:.1f}", f"{s.frequencies_cm[2]:.1f}"])
    return _md(["N", "formula", "geometry", "m / amu", "σ_ext", "σ_normal", "I_normal / amu Å²", "E_d / kJ mol⁻¹",
                "W_trans / eV", "W_rot / eV", "ν_trans / cm⁻¹", "ν_rot / cm⁻¹"], out)


def markdown_alkane_table(rows) -> str:
    """log10 of the Arrhenius prefactor A(Tp) of each model beside the published value."""
    models = list(rows[0].models)
    energies = list(rows[0].conformers)
    out = []
    for r in rows:
        pub = "—" if r.published_log10 is None else f"{r.published_log10:.1f}"
        if r.published_uncertainty is not None:
            pub += f" ± {r.published_uncertainty:.1f}"
        cells = [str(r.site.n), pub] + [f"{r.models[m]['log10_arrhenius']:.2f}" for m in models]
        cells += [f"{r.conformers[e]['log10_arrhenius']:.2f}" for e in energies]
        out.append(cells)
    header = ["N", "Tait et al. 2005"] + models + [f"harmonic + conformers (E_g = {e:g} kJ/mol)" for e in energies]
    return _md(header, out)


def markdown_peak_table(rows) -> str:
    """Peak temperature, log10 ν_TST(Tp) and γ of each model; published Tp where a prefactor is published."""
    models = list(rows[0].models)
    out = []
    for r in rows:
        cells = [str(r.site.n), "—" if r.published_peak_K is None else f"{r.published_peak_K:.1f}"]
        for m in models:
            v = r.models[m]
            cells.append(f"{v['peak_temperature_K']:.1f} / {v['log10_tst']:.2f} / {_signed(v['gamma'], 2)}")
        out.append(cells)
    return _md(["N", "Tp (published ν, E_d) / K"] + [f"{m}: Tp / log10 ν / γ" for m in models], out)


def markdown_sensitivity_table(rows) -> str:
    """Δlog10 A for each scaled input (columns: chain length and model)."""
    keys = [k for k in rows[0] if k not in ("parameter", "factor")]
    out = [[r["parameter"], f"× {r['factor']:g}"] + [_signed(r[k], 2) for k in keys] for r in rows]
    header = ["input scaled", "factor"] + [f"N = {k.split(':')[0]}, {k.split(':')[1]}" for k in keys]
    return _md(header, out)


_MODEL_STYLE = {
    "harmonic": ("o", "C0"), "hindered": ("s", "C1"), "2d-gas": ("^", "C2"), "2d-gas+free-rotor": ("D", "C3"),
    "2d-gas+free-3d-rotor": ("v", "C4"),
}


def plot_correlation_benchmark(rows, path, *, title=None):
    """Adsorbate S° of each model against S°_gas, with the Campbell–Sellers line and its ±2R band.

    Writes ``<path>.png`` and ``<path>.svg`` (:func:`adsorb.fileout.write_figure`).

    Parameters
    ----------
    rows : list of CorrelationRow
    path : str or Path
        File stem.
    title : str, optional

    Returns
    -------
    matplotlib.figure.Figure
    """
    if not rows or not all(isinstance(r, CorrelationRow) for r in rows):
        msg = "plot_correlation_benchmark rows: expected the list returned by correlation_benchmark"
        raise InputError(msg)
    import matplotlib

    matplotlib.use("Agg")
    from matplotlib.figure import Figure

    from adsorb.fileout import write_figure
    from adsorb.model_choice import CORRELATION_OFFSET_R, CORRELATION_SLOPE, campbell_sellers_entropy

    fig = Figure(figsize=(7.0, 5.2))
    ax = fig.add_subplot()
    s_gas = np.array([r.gas_entropy for r in rows])
    x = np.linspace(s_gas.min() - 15.0, s_gas.max() + 15.0, 50)
    line = C.to_j_per_mol_k(campbell_sellers_entropy(C.from_j_per_mol_k(x)))
    sd = 2.0 * C.R
    ax.fill_between(x, line - sd, line + sd, color="0.85", lw=0, label="± 2R (one SD)")
    ax.plot(x, line, color="k", lw=1.2,
            label=f"Campbell–Sellers: {CORRELATION_SLOPE:.2f} S°gas − {CORRELATION_OFFSET_R:g}R")
    temperatures = sorted({r.temperature for r in rows})
    fills = {temperatures[0]: "none"} if len(temperatures) > 1 else {}
    for model in CORRELATION_MODELS:
        marker, colour = _MODEL_STYLE[model]
        for temp in temperatures:
            sel = [r for r in rows if r.temperature == temp]
            ax.plot([r.gas_entropy for r in sel], [r.entropies[model] for r in sel], ls="none", marker=marker,
                    mec=colour, mfc=fills.get(temp, colour), ms=6, gid=f"model:{model}:{temp:g}",
                    label=f"{model}, {temp:g} K")
    hottest = [r for r in rows if r.temperature == temperatures[-1]]
    for r in hottest:
        top = max(r.entropies.values())
        ax.annotate(r.molecule, (r.gas_entropy, top), textcoords="offset points", xytext=(0, 7), ha="center",
                    fontsize=7)
    ax.set_xlabel("S°gas(T, 1 bar) / J mol⁻¹ K⁻¹")
    ax.set_ylabel(f"S°ad / J mol⁻¹ K⁻¹ (standard state {rows[0].standard_state})")
    ax.set_title(title or "Model adsorbate entropies on invented sites vs the Campbell–Sellers correlation",
                 fontsize=9)
    ax.legend(fontsize=7, ncol=2, loc="upper left", frameon=True, framealpha=0.9)
    fig.tight_layout()
    write_figure(fig, path)
    return fig


def plot_alkane_prefactors(rows, path, *, title=None):
    """log10 of the desorption prefactor against chain length: Tait et al. (2005) and the models.

    Model curves are the Arrhenius prefactors A(Tp) = ν(Tp) e^γ; the dotted
    curves add the conformer estimate to the harmonic model. Writes
    ``<path>.png`` and ``<path>.svg``.

    Returns
    -------
    matplotlib.figure.Figure
    """
    if not rows or not all(isinstance(r, AlkaneRow) for r in rows):
        msg = "plot_alkane_prefactors rows: expected the list returned by alkane_benchmark"
        raise InputError(msg)
    import matplotlib

    matplotlib.use("Agg")
    from matplotlib.figure import Figure

    from adsorb.fileout import write_figure

    fig = Figure(figsize=(6.8, 4.8))
    ax = fig.add_subplot()
    n = np.array([r.site.n for r in rows])
    for model in rows[0].models:
        marker, colour = _MODEL_STYLE[model]
        ax.plot(n, [r.models[model]["log10_arrhenius"] for r in rows], marker=marker, color=colour, lw=1.2,
                ms=5, gid=f"model:{model}", label=model)
    for k, energy in enumerate(rows[0].conformers):
        ax.plot(n, [r.conformers[energy]["log10_arrhenius"] for r in rows], color="C0", lw=1.0,
                ls=(0, (1, 1.5 + k)), gid=f"conformers:{energy:g}",
                label=f"harmonic + conformer estimate, E_g = {energy:g} kJ/mol")
    pub = [r for r in rows if r.published_log10 is not None]
    ax.errorbar([r.site.n for r in pub], [r.published_log10 for r in pub],
                yerr=[r.published_uncertainty or 0.0 for r in pub], fmt="*", color="k", ms=11, capsize=3,
                gid="published", label="Tait et al. 2005 (published)", zorder=5)
    ax.set_xlabel("carbon atoms N")
    ax.set_ylabel("log10 (prefactor / s⁻¹)")
    ax.set_title(title or "n-alkanes on MgO(100): first-order desorption prefactors", fontsize=9)
    ax.set_xticks(n)
    ax.legend(fontsize=7, loc="upper left", frameon=True, framealpha=0.9)
    fig.tight_layout()
    write_figure(fig, path)
    return fig
