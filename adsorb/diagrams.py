"""Free-energy diagrams of reaction pathways, thermal and electrochemical.

A pathway is an ordered list of states. Each state is a set of species with
stoichiometric coefficients (adsorbates with the slab included, gas molecules,
the clean slab) and, for electrochemical pathways, a number of proton-electron
pairs (H+ + e-) still present in the state. The diagram gives the Gibbs
energy of every state relative to the first one, at the temperature and
pressures at which the species' Gibbs energies were evaluated.

Proton-electron pairs follow the computational hydrogen electrode (CHE) of
Nørskov, Rossmeisl, Logadottir, Lindqvist, Kitchin, Bligaard and Jónsson,
"Origin of the Overpotential for Oxygen Reduction at a Fuel-Cell Cathode",
J. Phys. Chem. B 2004, 108, 17886-17892:

    mu(H+ + e-) = 1/2 mu(H2, gas, p°) - e U            (U vs RHE)
    mu(H+ + e-) = 1/2 mu(H2, gas, p°) - e U_SHE - kT ln(10) pH   (U vs SHE)

so that U_RHE = U_SHE + (kT ln 10 / e) pH.

Sign convention (used everywhere in this module): step i goes from state i-1
to state i and *consumes* n_i pairs, n_i = pairs(i-1) - pairs(i). A
reduction step (A* + H+ + e- -> AH*) has n_i = +1, an oxidation step
(AH* -> A* + H+ + e-) has n_i = -1, a chemical (thermal) step n_i = 0. Then

    dG_i(U) = dG_i(0) + n_i e U                        (U vs RHE)

and the Gibbs energy of state j relative to state 0 is
G_j(U) = G_j(0) + N_j e U with N_j = n_1 + ... + n_j the pairs consumed so far.

Limiting potential (the potential at which every electrochemical step is
just downhill, Nørskov et al. 2004):

* reduction pathway (all electrochemical n_i > 0): U_L = min_i [-dG_i(0)/(n_i e)]
* oxidation pathway (all electrochemical n_i < 0): U_L = max_i [-dG_i(0)/(n_i e)]
  (= max_i dG_i(0)/(|n_i| e))

The step that attains the extremum is the potential-determining step. The
overpotential is eta = U_eq - U_L for a reduction and eta = U_L - U_eq for an
oxidation; both are positive when the catalyst needs extra driving force.
The pathway's own equilibrium potential is U_eq = -dG_total(0)/(N_total e).

All energies are in eV per reaction as written, potentials in V, temperatures
in K. Functions are pure; the dataclasses are frozen.
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field

import numpy as np

from adsorb import constants as C
from adsorb.diagram_plots import plot_pathways  # re-exported: the plot lives in its own module
from adsorb.errors import InputError
from adsorb.partition.checks import finite_number
from adsorb.thermo import ThermoTable

__all__ = [
    "PathwayState",
    "PathwayStep",
    "Pathway",
    "LimitingPotential",
    "ElectrochemicalSummary",
    "ThermalSummary",
    "species_gibbs",
    "pathway_from_states",
    "pathway_from_steps",
    "nernst_slope_V",
    "rhe_potential",
    "state_energies",
    "step_energies",
    "limiting_potential",
    "equilibrium_potential",
    "overpotential",
    "electrochemical_summary",
    "thermal_summary",
    "plot_pathways",
]

_SCALES = ("RHE", "SHE")


# ---------------------------------------------------------------------------
# inputs
# ---------------------------------------------------------------------------


def _pairs(value, what: str) -> int:
    expected = "an integer number of (H+ + e-) pairs"
    f = math.nan if isinstance(value, bool) else finite_number(value, what, expected)
    if not f.is_integer():
        msg = f"{what}: expected {expected}, got {value!r}"
        raise InputError(msg)
    return int(f)


def _coefficients(mapping, what: str) -> tuple:
    if isinstance(mapping, Mapping):
        items = list(mapping.items())
    else:
        try:
            items = [(k, v) for k, v in mapping]
        except (TypeError, ValueError):
            msg = f"{what}: expected a mapping species name -> coefficient, got {mapping!r}"
            raise InputError(msg) from None
    out = []
    for name, coef in items:
        if not isinstance(name, str) or not name:
            msg = f"{what}: species names must be non-empty strings, got {name!r}"
            raise InputError(msg)
        out.append((name, finite_number(coef, f"{what} coefficient of {name!r}", "a finite number")))
    return tuple(out)


@dataclass(frozen=True)
class PathwayState:
    """One state of a pathway.

    Parameters
    ----------
    label : str
        Label shown in the diagram (e.g. ``"OOH*"``).
    species : mapping of str to float
        Species present and their coefficients, e.g.
        ``{"O2": 1, "*": 1}``; names refer to the Gibbs energies given to
        :func:`pathway_from_states`.
    pairs : int, optional
        Number of (H+ + e-) pairs present (not yet consumed, or already
        released) in this state. The first ORR state O2 + * + 4(H+ + e-) has 4.
    """

    label: str
    species: tuple = ()
    pairs: int = 0

    def __post_init__(self):
        if not isinstance(self.label, str):
            msg = f"PathwayState label: expected a string, got {self.label!r}"
            raise InputError(msg)
        object.__setattr__(self, "species", _coefficients(self.species, f"PathwayState {self.label!r} species"))
        object.__setattr__(self, "pairs", _pairs(self.pairs, f"PathwayState {self.label!r} pairs"))


@dataclass(frozen=True)
class PathwayStep:
    """One step of a pathway, as a stoichiometric change or a given dG.

    Parameters
    ----------
    label : str
        Label of the state the step leads to.
    changes : mapping of str to float, optional
        Species formed (> 0) and consumed (< 0) by the step, e.g.
        ``{"OOH*": 1, "O2": -1, "*": -1}``. Not counting (H+ + e-).
    pairs_consumed : int, optional
        (H+ + e-) pairs consumed by the step: +n for a reduction, -n for an
        oxidation (pairs released), 0 for a chemical step.
    delta_gibbs : float, optional
        dG of the step in eV at U = 0 V vs RHE, given directly instead of
        ``changes`` (for example from a published table).
    """

    label: str
    changes: tuple = ()
    pairs_consumed: int = 0
    delta_gibbs: float | None = None

    def __post_init__(self):
        if not isinstance(self.label, str):
            msg = f"PathwayStep label: expected a string, got {self.label!r}"
            raise InputError(msg)
        object.__setattr__(self, "changes", _coefficients(self.changes, f"PathwayStep {self.label!r} changes"))
        object.__setattr__(self, "pairs_consumed",
                           _pairs(self.pairs_consumed, f"PathwayStep {self.label!r} pairs_consumed"))
        if self.delta_gibbs is not None:
            g = finite_number(self.delta_gibbs, f"PathwayStep {self.label!r} delta_gibbs", "a finite number in eV")
            if self.changes:
                msg = f"PathwayStep {self.label!r}: give either changes or delta_gibbs, not both"
                raise InputError(msg)
            object.__setattr__(self, "delta_gibbs", g)


@dataclass(frozen=True)
class Pathway:
    """A free-energy pathway: state energies relative to the first state.

    Attributes
    ----------
    name : str
        Label of the pathway (e.g. the surface).
    labels : tuple of str
        State labels, in order.
    gibbs : tuple of float
        G of each state minus G of the first, eV, at U = 0 V vs RHE.
    pairs_consumed : tuple of int
        n_i for each step i = 1..n (state i-1 -> state i); > 0 reduction.
    temperature : float or None
        Temperature in K at which the Gibbs energies were evaluated (needed
        for the SHE scale).
    details : tuple of dict
        Per step, when the species were ThermoTables: dE, dZPE, thermal
        enthalpy, -TdS and dG in eV (see :func:`adsorb.equilibria.reaction_terms`).
    """

    name: str
    labels: tuple
    gibbs: tuple
    pairs_consumed: tuple
    temperature: float | None = None
    details: tuple = field(default=())

    def __post_init__(self):
        if len(self.labels) < 2:
            msg = f"Pathway {self.name!r}: expected at least two states, got {len(self.labels)}"
            raise InputError(msg)
        if len(self.gibbs) != len(self.labels) or len(self.pairs_consumed) != len(self.labels) - 1:
            msg = (f"Pathway {self.name!r}: {len(self.labels)} labels need as many energies and "
                   f"{len(self.labels) - 1} pair counts, got {len(self.gibbs)} and {len(self.pairs_consumed)}")
            raise InputError(msg)
        object.__setattr__(self, "labels", tuple(str(x) for x in self.labels))
        object.__setattr__(self, "gibbs", tuple(float(g) for g in self.gibbs))
        if not all(math.isfinite(g) for g in self.gibbs):
            msg = f"Pathway {self.name!r}: state energies must be finite, got {self.gibbs!r}"
            raise InputError(msg)
        object.__setattr__(self, "pairs_consumed",
                           tuple(_pairs(n, f"Pathway {self.name!r} pairs_consumed") for n in self.pairs_consumed))
        if self.temperature is not None:
            object.__setattr__(self, "temperature",
                               _scalar_temperature(self.temperature, f"Pathway {self.name!r} temperature"))

    @property
    def n_states(self) -> int:
        """Number of states."""
        return len(self.labels)

    @property
    def step_gibbs(self) -> np.ndarray:
        """dG_i(0) of each step in eV (U = 0 V vs RHE), shape (n_states - 1,)."""
        return np.diff(np.asarray(self.gibbs))

    @property
    def step_labels(self) -> tuple:
        """``"A -> B"`` for each step."""
        return tuple(f"{a} -> {b}" for a, b in zip(self.labels[:-1], self.labels[1:]))

    @property
    def cumulative_pairs(self) -> np.ndarray:
        """Pairs consumed from the first state up to each state, shape (n_states,)."""
        return np.concatenate([[0], np.cumsum(self.pairs_consumed)]).astype(int)

    @property
    def electrochemical(self) -> bool:
        """True when any step transfers (H+ + e-) pairs."""
        return any(n != 0 for n in self.pairs_consumed)

    def as_dict(self) -> dict:
        """Plain-Python description (eV, K)."""
        return {"name": self.name, "labels": list(self.labels), "gibbs_eV_at_0V_RHE": list(self.gibbs),
                "step_gibbs_eV_at_0V_RHE": self.step_gibbs.tolist(), "pairs_consumed": list(self.pairs_consumed),
                "temperature_K": self.temperature, "details": list(self.details)}


# ---------------------------------------------------------------------------
# building pathways
# ---------------------------------------------------------------------------


def species_gibbs(species: Mapping, temperature, *, pressures: Mapping | None = None) -> dict:
    """Evaluate species at one temperature (and gas pressures) for a diagram.

    Parameters
    ----------
    species : mapping of str to object
        Name -> an object with a ``.thermo(T)`` method (an
        :class:`~adsorb.adsorbate.Adsorbate` or a gas molecule whose
        ``.thermo(T, pressure=p)`` takes a pressure), a ThermoTable, or a
        number (a fixed energy in eV, e.g. the clean slab).
    temperature : float
        Temperature in K.
    pressures : mapping of str to float, optional
        Pressure in Pa for gas species (default: each gas's own default, 1 bar).

    Returns
    -------
    dict
        Name -> ThermoTable (or the number given), ready for
        :func:`pathway_from_states` / :func:`pathway_from_steps`.

    Raises
    ------
    InputError
        Bad temperature, a pressure for an unknown species or for a species
        that takes none.
    """
    t = _scalar_temperature(temperature, "species_gibbs temperature")
    pressures = dict(pressures or {})
    for name in pressures:
        if name not in species:
            msg = f"species_gibbs pressures: species {name!r} is not among {', '.join(map(str, species))}"
            raise InputError(msg)
    out = {}
    for name, obj in species.items():
        if isinstance(obj, ThermoTable) or isinstance(obj, (int, float, np.floating)):
            if name in pressures:
                msg = f"species_gibbs pressures: species {name!r} is already evaluated; a pressure cannot apply"
                raise InputError(msg)
            out[name] = obj
            continue
        if not hasattr(obj, "thermo"):
            msg = f"species_gibbs: species {name!r} must have a .thermo(T) method, be a ThermoTable or a number"
            raise InputError(msg)
        if name in pressures:
            try:
                out[name] = obj.thermo(t, pressure=float(pressures[name]))
            except TypeError:
                msg = f"species_gibbs pressures: species {name!r} takes no pressure (not a gas)"
                raise InputError(msg) from None
        else:
            out[name] = obj.thermo(t)
    return out


def _scalar_temperature(value, what):
    try:
        t = float(np.asarray(value, dtype=float).reshape(()))
    except (TypeError, ValueError):
        msg = f"{what}: expected one temperature in K, got {value!r}"
        raise InputError(msg) from None
    if not math.isfinite(t) or t <= 0:
        msg = f"{what}: expected a temperature > 0 K, got {value!r}"
        raise InputError(msg)
    return t


def _species_value(name, gibbs):
    """(G in eV, ThermoTable or None, temperature or None) of one species."""
    if name not in gibbs:
        msg = f"pathway: no Gibbs energy for species {name!r}; known species: {', '.join(map(str, gibbs)) or 'none'}"
        raise InputError(msg)
    value = gibbs[name]
    if isinstance(value, ThermoTable):
        g = np.asarray(value.gibbs, dtype=float)
        if g.size != 1:
            msg = (f"pathway: species {name!r} was evaluated at {g.size} conditions; a diagram needs one "
                   "temperature and pressure")
            raise InputError(msg)
        return float(g.reshape(())), value, float(np.asarray(value.temperature).reshape(()))
    g = finite_number(value, f"pathway: Gibbs energy of species {name!r}", "a finite number in eV or a ThermoTable")
    return g, None, None


def _common_temperature(temps, given, name):
    temps = [t for t in temps if t is not None]
    if given is not None:
        temps = temps + [_scalar_temperature(given, f"pathway {name!r} temperature")]
    if not temps:
        return None
    if any(abs(t - temps[0]) > 1e-9 * temps[0] for t in temps):
        msg = f"pathway {name!r}: species were evaluated at different temperatures {sorted(set(temps))} K"
        raise InputError(msg)
    return temps[0]


def _step_details(terms_by_state, tables_present):
    """Per-step breakdown through reaction_terms when ThermoTables are involved."""
    if not tables_present:
        return ()
    from adsorb.equilibria import reaction_terms

    details = []
    for before, after in zip(terms_by_state[:-1], terms_by_state[1:]):
        terms = [(c, s) for c, s in after] + [(-c, s) for c, s in before]
        if not any(isinstance(s, ThermoTable) for _, s in terms):
            details.append({})
            continue
        rt = reaction_terms(terms)
        one = lambda a: float(np.asarray(a).reshape(()))  # noqa: E731
        details.append({"delta_energy_eV": float(rt.delta_energy), "delta_zpe_eV": one(rt.delta_zpe),
                        "delta_thermal_enthalpy_eV": one(rt.delta_thermal),
                        "minus_T_delta_S_eV": one(rt.minus_t_delta_s), "delta_gibbs_eV": one(rt.delta_gibbs)})
    return tuple(details)


def pathway_from_states(states: Sequence[PathwayState], gibbs: Mapping, *, hydrogen: str = "H2",
                        name: str = "", temperature=None) -> Pathway:
    """Build a pathway from its states and the species' Gibbs energies.

    G(state) = sum_k c_k G_k + pairs * 1/2 G(H2)  (CHE at U = 0 V vs RHE;
    Nørskov et al., J. Phys. Chem. B 2004, 108, 17886), reported relative to
    the first state.

    Parameters
    ----------
    states : sequence of PathwayState
        The states in order (at least two).
    gibbs : mapping of str to float or ThermoTable
        Gibbs energy of every species in eV (a ThermoTable at one temperature
        and pressure, e.g. from :func:`species_gibbs`, or a number).
    hydrogen : str, optional
        Name of H2 gas (at 1 bar for the CHE) in ``gibbs``; needed only when
        the number of pairs changes along the pathway.
    name : str, optional
        Pathway label.
    temperature : float, optional
        Temperature in K, when the energies are plain numbers (needed for
        potentials vs SHE). Checked against the ThermoTables' temperature.

    Returns
    -------
    Pathway

    Raises
    ------
    InputError
        Fewer than two states, unknown species, missing hydrogen reference,
        ThermoTables on several conditions or temperatures.
    """
    states = list(states)
    if len(states) < 2:
        msg = f"pathway_from_states {name!r}: expected at least two states, got {len(states)}"
        raise InputError(msg)
    for s in states:
        if not isinstance(s, PathwayState):
            msg = f"pathway_from_states {name!r}: states must be PathwayState objects, got {s!r}"
            raise InputError(msg)
    pair_counts = [s.pairs for s in states]
    need_h2 = len(set(pair_counts)) > 1
    h2 = None
    temps = []
    if need_h2:
        g_h2, tab_h2, t_h2 = _species_value(hydrogen, gibbs)
        h2 = tab_h2 if tab_h2 is not None else g_h2
        temps.append(t_h2)
    values, terms_by_state, tables_present = [], [], False
    for s in states:
        g, terms = 0.0, []
        for sp, coef in s.species:
            gv, tab, t = _species_value(sp, gibbs)
            temps.append(t)
            tables_present |= tab is not None
            g += coef * gv
            terms.append((coef, tab if tab is not None else gv))
        if need_h2:
            g += 0.5 * s.pairs * (g_h2)
            terms.append((0.5 * s.pairs, h2))
        values.append(g)
        terms_by_state.append(terms)
    t_common = _common_temperature(temps, temperature, name)
    tables_present |= need_h2 and isinstance(h2, ThermoTable)
    rel = [v - values[0] for v in values]
    n = [a - b for a, b in zip(pair_counts[:-1], pair_counts[1:])]
    return Pathway(name=name, labels=tuple(s.label for s in states), gibbs=tuple(rel), pairs_consumed=tuple(n),
                   temperature=t_common, details=_step_details(terms_by_state, tables_present))


def pathway_from_steps(steps: Sequence[PathwayStep], gibbs: Mapping | None = None, *, start: str = "start",
                       hydrogen: str = "H2", name: str = "", temperature=None) -> Pathway:
    """Build a pathway from its steps (stoichiometric changes or given dG).

    dG_i(0) = sum_k nu_k G_k - n_i * 1/2 G(H2)  for a step consuming n_i
    (H+ + e-) pairs at U = 0 V vs RHE (CHE; Nørskov et al., J. Phys. Chem. B
    2004, 108, 17886); or the step's ``delta_gibbs`` when given.

    Parameters
    ----------
    steps : sequence of PathwayStep
        The steps in order (at least one).
    gibbs : mapping of str to float or ThermoTable, optional
        Gibbs energies in eV of the species named in the steps' ``changes``.
    start : str, optional
        Label of the initial state.
    hydrogen : str, optional
        Name of H2 gas in ``gibbs`` (needed when a step with ``changes``
        transfers pairs).
    name : str, optional
        Pathway label.
    temperature : float, optional
        Temperature in K (for the SHE scale), checked against the tables.

    Returns
    -------
    Pathway
    """
    steps = list(steps)
    if not steps:
        msg = f"pathway_from_steps {name!r}: expected at least one step"
        raise InputError(msg)
    gibbs = dict(gibbs or {})
    temps, details, labels, energies, n = [], [], [str(start)], [0.0], []
    any_table = False
    for st in steps:
        if not isinstance(st, PathwayStep):
            msg = f"pathway_from_steps {name!r}: steps must be PathwayStep objects, got {st!r}"
            raise InputError(msg)
        if st.delta_gibbs is not None:
            dg = st.delta_gibbs
            details.append({})
        else:
            dg, terms = 0.0, []
            for sp, coef in st.changes:
                gv, tab, t = _species_value(sp, gibbs)
                temps.append(t)
                dg += coef * gv
                terms.append((coef, tab if tab is not None else gv))
            if st.pairs_consumed:
                g_h2, tab_h2, t_h2 = _species_value(hydrogen, gibbs)
                temps.append(t_h2)
                dg -= 0.5 * st.pairs_consumed * g_h2
                terms.append((-0.5 * st.pairs_consumed, tab_h2 if tab_h2 is not None else g_h2))
            if any(isinstance(s, ThermoTable) for _, s in terms):
                any_table = True
                details.append(_step_details([[], terms], True)[0])
            else:
                details.append({})
        labels.append(st.label)
        energies.append(energies[-1] + dg)
        n.append(st.pairs_consumed)
    t_common = _common_temperature(temps, temperature, name)
    return Pathway(name=name, labels=tuple(labels), gibbs=tuple(energies), pairs_consumed=tuple(n),
                   temperature=t_common, details=tuple(details) if any_table else ())


# ---------------------------------------------------------------------------
# potentials
# ---------------------------------------------------------------------------


def nernst_slope_V(temperature):
    """kT ln(10) / e in V: the shift of the RHE against the SHE per pH unit.

    0.05916 V at 298.15 K (common practice).

    Parameters
    ----------
    temperature : float or ndarray
        Temperature in K (> 0).
    """
    t = np.asarray(temperature, dtype=float)
    if not np.all(np.isfinite(t)) or np.any(t <= 0):
        msg = f"nernst_slope_V temperature: expected values > 0 K, got {temperature!r}"
        raise InputError(msg)
    return C.kB_eV * t * np.log(10.0)


def rhe_potential(potential, *, scale: str = "RHE", ph=0.0, temperature=None):
    """Potential on the RHE scale, U_RHE = U_SHE + (kT ln 10 / e) pH.

    Parameters
    ----------
    potential : float or ndarray
        Electrode potential in V on ``scale``.
    scale : {"RHE", "SHE"}
        Reference electrode of ``potential``.
    ph : float, optional
        pH of the electrolyte (SHE only).
    temperature : float, optional
        Temperature in K (SHE only).

    Raises
    ------
    InputError
        Unknown scale, or the SHE scale without a temperature.
    """
    u = np.asarray(potential, dtype=float)
    if not np.all(np.isfinite(u)):
        msg = f"potential: expected finite values in V, got {potential!r}"
        raise InputError(msg)
    if scale not in _SCALES:
        msg = f"potential scale {scale!r} is unknown; expected 'RHE' or 'SHE'"
        raise InputError(msg)
    if scale == "RHE":
        return u
    if temperature is None:
        msg = "potential scale 'SHE' needs the temperature in K (give it to the pathway)"
        raise InputError(msg)
    p = np.asarray(ph, dtype=float)
    if not np.all(np.isfinite(p)):
        msg = f"ph: expected a finite number, got {ph!r}"
        raise InputError(msg)
    return u + nernst_slope_V(temperature) * p


def state_energies(pathway: Pathway, potential=0.0, *, scale: str = "RHE", ph=0.0) -> np.ndarray:
    """G_j(U) - G_0(U) of every state in eV: G_j(0) + N_j e U_RHE.

    Parameters
    ----------
    pathway : Pathway
    potential : float or ndarray
        Electrode potential in V on ``scale``; arrays give a leading axis.
    scale : {"RHE", "SHE"}
    ph : float, optional
        pH (SHE scale only; uses the pathway's temperature).

    Returns
    -------
    ndarray
        Shape ``np.shape(potential) + (n_states,)``, eV.
    """
    u = rhe_potential(potential, scale=scale, ph=ph, temperature=pathway.temperature)
    return np.asarray(pathway.gibbs) + np.multiply.outer(u, pathway.cumulative_pairs)


def step_energies(pathway: Pathway, potential=0.0, *, scale: str = "RHE", ph=0.0) -> np.ndarray:
    """dG_i(U) = dG_i(0) + n_i e U_RHE of every step in eV, shape ``np.shape(potential) + (n_steps,)``."""
    u = rhe_potential(potential, scale=scale, ph=ph, temperature=pathway.temperature)
    return pathway.step_gibbs + np.multiply.outer(u, np.asarray(pathway.pairs_consumed, dtype=float))


# ---------------------------------------------------------------------------
# analysis
# ---------------------------------------------------------------------------


@dataclass(frozen=True)
class LimitingPotential:
    """Limiting potential of an electrochemical pathway.

    Attributes
    ----------
    direction : str
        ``"reduction"`` or ``"oxidation"``.
    potential : float
        U_L in V vs RHE.
    step : int
        Index (1-based, step i goes from state i-1 to state i) of the
        potential-determining step.
    step_label : str
        ``"A -> B"`` of that step.
    step_gibbs : float
        Its dG(0) in eV.
    pairs_consumed : int
        Its n_i.
    """

    direction: str
    potential: float
    step: int
    step_label: str
    step_gibbs: float
    pairs_consumed: int


def _direction(pathway: Pathway) -> str:
    n = np.asarray(pathway.pairs_consumed)
    ec = n[n != 0]
    if ec.size == 0:
        msg = f"pathway {pathway.name!r} has no (H+ + e-) transfer; a limiting potential needs electrochemical steps"
        raise InputError(msg)
    if np.all(ec > 0):
        return "reduction"
    if np.all(ec < 0):
        return "oxidation"
    msg = (f"pathway {pathway.name!r} mixes reduction and oxidation steps (pairs_consumed "
           f"{list(pathway.pairs_consumed)}); a limiting potential needs one direction")
    raise InputError(msg)


def limiting_potential(pathway: Pathway) -> LimitingPotential:
    """U_L and the potential-determining step (Nørskov et al., J. Phys. Chem. B 2004, 108, 17886).

    Reduction: U_L = min_i [-dG_i(0)/(n_i e)]; oxidation: U_L = max_i [-dG_i(0)/(n_i e)],
    over the electrochemical steps (n_i != 0), U vs RHE. Chemical steps do not
    shift with U and do not enter (see :func:`electrochemical_summary`).

    Raises
    ------
    InputError
        No electrochemical step, or both reduction and oxidation steps.
    """
    direction = _direction(pathway)
    n = np.asarray(pathway.pairs_consumed, dtype=float)
    dg = pathway.step_gibbs
    idx = np.flatnonzero(n != 0)
    onset = -dg[idx] / n[idx]
    j = int(idx[np.argmin(onset)] if direction == "reduction" else idx[np.argmax(onset)])
    u_l = float(-dg[j] / n[j])
    return LimitingPotential(direction=direction, potential=u_l, step=j + 1, step_label=pathway.step_labels[j],
                             step_gibbs=float(dg[j]), pairs_consumed=int(n[j]))


def equilibrium_potential(pathway: Pathway) -> float:
    """U_eq = -dG_total(0) / (N_total e) in V vs RHE, from the pathway's own overall reaction.

    For O2 + 4(H+ + e-) -> 2 H2O with dG_total = -4.92 eV this is 1.23 V
    (Nørskov et al., J. Phys. Chem. B 2004, 108, 17886).

    Raises
    ------
    InputError
        If the pathway transfers no net pairs.
    """
    total = int(pathway.cumulative_pairs[-1])
    if total == 0:
        msg = f"pathway {pathway.name!r} transfers no net (H+ + e-); it has no equilibrium potential"
        raise InputError(msg)
    return float(-(pathway.gibbs[-1] - pathway.gibbs[0]) / total)


def overpotential(pathway: Pathway, equilibrium_potential_V: float | None = None) -> float:
    """Thermodynamic overpotential in V: U_eq - U_L (reduction) or U_L - U_eq (oxidation).

    Parameters
    ----------
    pathway : Pathway
    equilibrium_potential_V : float, optional
        U_eq in V vs RHE (e.g. 1.23 for O2/H2O); default: the pathway's own
        (:func:`equilibrium_potential`).
    """
    lim = limiting_potential(pathway)
    u_eq = equilibrium_potential(pathway) if equilibrium_potential_V is None else float(equilibrium_potential_V)
    if not math.isfinite(u_eq):
        msg = f"overpotential: equilibrium_potential_V must be finite, got {equilibrium_potential_V!r}"
        raise InputError(msg)
    return u_eq - lim.potential if lim.direction == "reduction" else lim.potential - u_eq


@dataclass(frozen=True)
class ElectrochemicalSummary:
    """Limiting potential, equilibrium potential and overpotential of one pathway (V vs RHE)."""

    pathway: str
    limiting: LimitingPotential
    equilibrium_potential: float
    equilibrium_source: str
    overpotential: float
    chemical_step_max: float | None
    notes: tuple = ()

    def as_dict(self) -> dict:
        """Plain-Python description."""
        lim = self.limiting
        return {"pathway": self.pathway, "direction": lim.direction, "limiting_potential_V_RHE": lim.potential,
                "potential_determining_step": lim.step, "potential_determining_step_label": lim.step_label,
                "potential_determining_step_gibbs_eV": lim.step_gibbs,
                "equilibrium_potential_V_RHE": self.equilibrium_potential,
                "equilibrium_potential_source": self.equilibrium_source,
                "overpotential_V": self.overpotential, "largest_chemical_step_eV": self.chemical_step_max,
                "notes": list(self.notes)}


def electrochemical_summary(pathway: Pathway, *, equilibrium_potential_V: float | None = None
                            ) -> ElectrochemicalSummary:
    """U_L, the potential-determining step, U_eq and eta of an electrochemical pathway.

    Also reports the largest dG of the chemical steps (n_i = 0): when it is
    positive no electrode potential makes the whole pathway downhill.
    """
    lim = limiting_potential(pathway)
    if equilibrium_potential_V is None:
        u_eq, source = equilibrium_potential(pathway), "from the pathway's overall dG"
    else:
        u_eq, source = float(equilibrium_potential_V), "given"
    eta = overpotential(pathway, u_eq)
    n = np.asarray(pathway.pairs_consumed)
    chem = pathway.step_gibbs[n == 0]
    chem_max = float(chem.max()) if chem.size else None
    notes = []
    if chem_max is not None and chem_max > 0:
        notes.append(f"a chemical step is uphill by {chem_max:.3f} eV at every potential")
    return ElectrochemicalSummary(pathway=pathway.name, limiting=lim, equilibrium_potential=u_eq,
                                  equilibrium_source=source, overpotential=eta, chemical_step_max=chem_max,
                                  notes=tuple(notes))


@dataclass(frozen=True)
class ThermalSummary:
    """Largest steps of a pathway at one potential (eV; steps 1-based).

    Attributes
    ----------
    largest_step : int
        The step with the largest dG.
    largest_step_gibbs : float
        Its dG in eV.
    most_endergonic : int or None
        The same step when its dG > 0; None when every step is downhill.
    endergonic_steps : tuple of int
        All steps with dG > 0.
    largest_rise : float
        The largest G_j - G_i over states i <= j (0 when G never rises):
        the climb from a low state to a later higher one, a thermodynamic
        quantity only (it does not use transition states).
    rise_states : tuple of int
        (i, j), 0-based state indices of that rise.
    overall_gibbs : float
        G of the last state minus the first, eV.
    """

    pathway: str
    potential: float
    largest_step: int
    largest_step_label: str
    largest_step_gibbs: float
    most_endergonic: int | None
    endergonic_steps: tuple
    largest_rise: float
    rise_states: tuple
    overall_gibbs: float

    def as_dict(self) -> dict:
        """Plain-Python description."""
        return {"pathway": self.pathway, "potential_V_RHE": self.potential, "largest_step": self.largest_step,
                "largest_step_label": self.largest_step_label, "largest_step_gibbs_eV": self.largest_step_gibbs,
                "most_endergonic_step": self.most_endergonic, "endergonic_steps": list(self.endergonic_steps),
                "largest_rise_eV": self.largest_rise, "largest_rise_states": list(self.rise_states),
                "overall_gibbs_eV": self.overall_gibbs}


def thermal_summary(pathway: Pathway, potential=0.0, *, scale: str = "RHE", ph=0.0) -> ThermalSummary:
    """The largest step, the most endergonic step and the largest rise at one potential.

    For a thermal pathway the potential does not matter.
    """
    u = float(rhe_potential(potential, scale=scale, ph=ph, temperature=pathway.temperature).reshape(()))
    g = state_energies(pathway, u)
    dg = np.diff(g)
    j = int(np.argmax(dg))
    ender = tuple(int(i) + 1 for i in np.flatnonzero(dg > 0))
    best, pair, low = 0.0, (0, 0), 0
    for k in range(1, g.size):
        if g[k] - g[low] > best:
            best, pair = float(g[k] - g[low]), (low, k)
        if g[k] < g[low]:
            low = k
    return ThermalSummary(pathway=pathway.name, potential=u, largest_step=j + 1,
                          largest_step_label=pathway.step_labels[j], largest_step_gibbs=float(dg[j]),
                          most_endergonic=(j + 1) if dg[j] > 0 else None, endergonic_steps=ender,
                          largest_rise=best, rise_states=pair, overall_gibbs=float(g[-1] - g[0]))
