"""Benchmark (a): model adsorbate entropies on invented sites against the Campbell–Sellers correlation.

C. T. Campbell, J. R. V. Sellers, "The Entropies of Adsorbed Molecules",
J. Am. Chem. Soc. 2012, 134, 18109–18115: S°_ad(T) = 0.70 S°_gas(T) − 3.3 R,
standard deviation 2R. The gas molecules of :data:`GAS_DATA` sit on the
**invented** sites of :data:`INVENTED_SITES`; each adsorbate is evaluated
with :func:`adsorb.model_choice.compare_models` (harmonic, hindered, 2D gas)
plus a 2D gas with a free rotor about the normal, at a named standard state.
:func:`benchmark_gas` builds the structures through :mod:`adsorb.io`
(ASE is imported only there and in :mod:`adsorb.geometry`).

Import the names from :mod:`adsorb.entropy_benchmarks`.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from adsorb import constants as C
from adsorb.entropy_benchmarks.data import GAS_DATA, INVENTED_SITES
from adsorb.errors import AdsorbError, InputError
from adsorb.partition.hindered import rotor_frequency_cm, translator_frequency_cm


#: I [amu Å^2] = _INERTIA_FACTOR / B [cm^-1], from B = h / (8 π^2 c I) (Herzberg's definition)
_INERTIA_FACTOR = C.h / (8.0 * C.pi**2 * C.c * 100.0 * C.amu_A2)


def _inertia_from_constant(b_cm: float) -> float:
    """Moment of inertia in amu Å^2 of a rotational constant B in cm^-1."""
    return _INERTIA_FACTOR / float(b_cm)


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
    from adsorb.gas import GasMolecule, Torsion
    from adsorb.io import atoms_from_symbols, named_molecule

    data = GAS_DATA[name]
    atoms = atoms_from_symbols(data.structure) if not data.rotational_constants_cm else named_molecule(data.structure)
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
