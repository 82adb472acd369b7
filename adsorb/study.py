"""Running a validated case: species objects, thermo tables, equilibria, coverages, diagrams, model comparison.

:func:`run_study` takes the :class:`adsorb.case.Case` returned by
:func:`adsorb.case.load_case` and returns a :class:`StudyResult`, a plain
structure of numbers (numpy arrays, eV, K, Pa) and the library's own result
objects. Every number comes from the library: :class:`adsorb.gas.GasMolecule`
and :class:`adsorb.adsorbate.Adsorbate` for thermochemistry,
:func:`adsorb.equilibria.adsorption_equilibrium` for K(T),
:func:`adsorb.coverage.site_coverages` for coverages,
:mod:`adsorb.diagrams` for free-energy diagrams (computational hydrogen
electrode of Nørskov et al., J. Phys. Chem. B 2004, 108, 17886) and
:func:`adsorb.model_choice.compare_models` for the model comparison; isosteric heats, TPD spectra
and NASA fits come from :mod:`adsorb.study_outputs`. Nothing
is printed; warnings raised by the library are collected in
:attr:`StudyResult.warnings`.
"""

from __future__ import annotations

import warnings
from dataclasses import dataclass, field

import numpy as np

from adsorb import constants as C
from adsorb.errors import InputError

__all__ = ["StudyResult", "CoverageRun", "CurveRun", "PathwayRun", "run_study", "build_gas", "build_adsorbate",
           "inline_atoms"]

#: |Z - 1| above which the ideal-gas reference earns a warning (adsorbate-models.md §10)
Z_TOLERANCE = 0.01


def inline_atoms(symbols, positions_A, where=""):
    """An ``ase.Atoms`` from symbols and Cartesian positions in Å, or an error string.

    The case reader's form of :func:`adsorb.io.atoms_from_symbols`: the message of its
    InputError is returned instead of raised, so that it joins the case's list of problems.
    """
    from adsorb.io import atoms_from_symbols

    try:
        return atoms_from_symbols(list(symbols), positions_A)
    except InputError as exc:
        return str(exc)


def build_gas(spec):
    """The :class:`adsorb.gas.GasMolecule` of a :class:`adsorb.case.GasSpec` (None for an anchored gas)."""
    if spec.anchor is not None:
        return None
    from adsorb.gas import GasMolecule

    return GasMolecule(spec.atoms, list(spec.frequencies_cm), energy=spec.energy_eV, multiplicity=spec.multiplicity,
                       symmetry_number=spec.symmetry_number,
                       electronic_levels=list(spec.electronic_levels) if spec.electronic_levels else None,
                       rotational_constants=list(spec.rotational_constants_cm) if spec.rotational_constants_cm else None,
                       name=spec.name, **dict(spec.options))


def adsorbate_parameters(spec, surfaces, overrides=()):
    """Keyword arguments of :class:`Adsorbate` for a spec: its own, overrides, the surface's site area, modes."""
    from adsorb.adsorbate import MOBILE_MODELS

    params = dict(spec.parameters)
    params.update(dict(overrides))
    surface = surfaces.get(spec.surface)
    if (spec.model in MOBILE_MODELS and "site_spacing" not in params and "site_area" not in params
            and surface is not None and surface.site_area_A2):
        params["site_area"] = surface.site_area_A2
    if spec.mode_vectors is not None:
        params["mode_vectors"] = spec.mode_vectors
        params["indices"] = [int(i) for i in spec.mode_indices]
    return params


def build_adsorbate(spec, surfaces):
    """The :class:`adsorb.adsorbate.Adsorbate` of a :class:`adsorb.case.AdsorbateSpec`."""
    from adsorb.adsorbate import Adsorbate

    return Adsorbate(list(spec.frequencies_cm), spec.energy_eV, model=spec.model, atoms=spec.atoms, name=spec.name,
                     **adsorbate_parameters(spec, surfaces))


@dataclass(frozen=True)
class CoverageRun:
    """Coverages of the adsorbates of one surface vs temperature at the case's pressures."""

    surface: str
    species: tuple
    gases: tuple
    interactions: bool
    fugacity: str
    temperature_K: np.ndarray
    pressures_Pa: np.ndarray          # (n_species,)
    fugacities_Pa: np.ndarray         # (n_species, n_T)
    coverage: np.ndarray              # (n_species, n_T), ML
    empty: np.ndarray                 # (n_T,)
    multiple_solutions: np.ndarray    # (n_T,) bool


@dataclass(frozen=True)
class CurveRun:
    """An isotherm set or coverage map: coverage (n_species, n_T, n_p) vs T and the pressure of one gas."""

    kind: str
    surface: str
    gas: str
    species: tuple
    interactions: bool
    fugacity: str
    temperature_K: np.ndarray
    pressure_Pa: np.ndarray
    coverage: np.ndarray
    empty: np.ndarray
    entry: int = 0                    # index of the case-file entry of its kind


@dataclass(frozen=True)
class PathwayRun:
    """A free-energy diagram: the :class:`adsorb.diagrams.Pathway`, state energies at potentials, summary.

    ``potentials_V`` are on the RHE scale; ``potentials_on_scale_V`` are the same potentials on
    ``potential_scale`` (the scale of the case file), related by U_RHE = U_SHE + ``rhe_minus_she_V``.
    """

    name: str
    kind: str
    pathway: object
    potentials_V: tuple
    state_gibbs_eV: tuple             # one tuple of state energies per potential
    summary: dict
    potential_scale: str = "RHE"
    pH: float | None = None
    rhe_minus_she_V: float | None = None
    potentials_on_scale_V: tuple = ()


@dataclass(frozen=True)
class StudyResult:
    """Everything a study computed (eV, eV/K, K, Pa; coverages in ML)."""

    case: object
    temperatures_K: np.ndarray
    gas_tables: dict
    adsorbate_tables: dict
    equilibria: dict
    coverages: tuple
    curves: tuple
    pathways: tuple
    comparison: object
    warnings: tuple = ()
    notes: tuple = field(default=())
    isobars: tuple = ()               # CurveRun of kind "isobar"
    isosteric_heats: tuple = ()       # adsorb.study_outputs.IsostericRun
    tpd: tuple = ()                   # adsorb.study_outputs.TPDRun
    nasa: tuple = ()                  # adsorb.study_outputs.NasaRun


class _Study:
    def __init__(self, case):
        self.case = case
        self.notes = []
        self.gas_objs = {n: build_gas(g) for n, g in case.gases.items()}
        self.ads_objs = {n: build_adsorbate(a, case.surfaces) for n, a in case.adsorbates.items()}

    # ---------------------------------------------------------------- equilibria
    def state_of(self, spec):
        return spec.standard_state or self.case.conditions.standard_state

    def equilibrium(self, name, temps):
        from adsorb.equilibria import adsorption_equilibrium

        spec = self.case.adsorbates[name]
        surface = self.case.surfaces[spec.surface]
        gas = self.gas_objs[spec.gas].thermo(temps, pressure=C.P_STANDARD)
        return adsorption_equilibrium(self.ads_objs[name].thermo(temps), gas, surface.energy_eV,
                                      dissociative=spec.dissociative, standard_state=self.state_of(spec),
                                      site_area_A2=surface.site_area_A2)

    def species_on(self, surface):
        return tuple(n for n, a in self.case.adsorbates.items() if a.surface == surface and a.in_coverages)

    def interaction_matrix(self, names):
        eps = np.zeros((len(names), len(names)))
        for i, a in enumerate(names):
            for other, value in self.case.adsorbates[a].interactions_eV:
                if other in names:
                    j = names.index(other)
                    eps[i, j] = eps[j, i] = value
        return eps

    # ---------------------------------------------------------------- fugacities
    def critical(self, gas):
        from adsorb.eos import CriticalConstants

        tc, pc, omega, source = self.case.gases[gas].critical
        return CriticalConstants(gas, tc, pc, omega, source)

    def fugacities(self, gas_names, temps, pressures, model):
        """Fugacities in Pa, shape (n_gases, *grid): partial pressures, or Peng–Robinson for the mixture."""
        p = np.stack(np.broadcast_arrays(*[np.asarray(x, dtype=float) for x in pressures]))
        if model == "ideal":
            return p
        from adsorb.eos import fugacities

        total = p.sum(axis=0)
        return fugacities([self.critical(g) for g in gas_names], p / total, temps, total)

    def compressibility_check(self, temps):
        """Messages where the ideal-gas reference is used but |Z - 1| > 1 % (Peng–Robinson estimate)."""
        pressures = dict(self.case.conditions.pressures_Pa)
        if not pressures:
            return []
        missing = [g for g in pressures if self.case.gases[g].critical is None]
        if missing:
            self.notes.append("real-gas check (Peng-Robinson Z) skipped: no critical constants for "
                              + ", ".join(missing))
            return []
        from adsorb.eos import ideality_warnings

        p = np.array(list(pressures.values()))
        return ideality_warnings([self.critical(g) for g in pressures], temps, p.sum(),
                                 composition=p / p.sum(), tolerance=Z_TOLERANCE, emit=False)

    # ---------------------------------------------------------------- coverages
    def coverage_inputs(self, names, temps):
        K = np.stack([np.asarray(self.equilibrium(n, temps).equilibrium_constant, dtype=float) for n in names])
        spec = [self.case.adsorbates[n] for n in names]
        return K, spec

    def coverages(self, surface, temps, fugacity, interactions):
        from adsorb.coverage import site_coverages

        names = self.species_on(surface)
        K, spec = self.coverage_inputs(names, temps)
        gases = [s.gas for s in spec]
        pressures = dict(self.case.conditions.pressures_Pa)
        mix = list(pressures)
        f_all = self.fugacities(mix, temps, [np.full(np.shape(temps), pressures[g]) for g in mix], fugacity)
        f = np.stack([f_all[mix.index(g)] for g in gases])
        sol = site_coverages(K, f, dissociative=[s.dissociative for s in spec],
                             interactions=self.interaction_matrix(names) if interactions else None,
                             temperature=temps, sites_per_species=np.array([s.sites for s in spec]))
        return CoverageRun(surface=surface, species=names, gases=tuple(gases), interactions=interactions,
                           fugacity=fugacity, temperature_K=np.asarray(temps), pressures_Pa=np.array(
                               [pressures[g] for g in gases]), fugacities_Pa=f, coverage=sol.coverage,
                           empty=np.asarray(sol.empty), multiple_solutions=np.asarray(sol.multiple_solutions))

    def curve(self, cs):
        from adsorb.coverage import site_coverages

        names = self.species_on(cs.surface)
        temps = np.asarray(cs.temperatures_K, dtype=float)
        grid = np.asarray(cs.pressures_Pa, dtype=float)
        K, spec = self.coverage_inputs(names, temps)
        pressures = dict(self.case.conditions.pressures_Pa)
        mix = list(dict.fromkeys(list(pressures) + [cs.gas]))
        shape = (temps.size, grid.size)
        p_mix = [np.broadcast_to(grid, shape) if g == cs.gas else np.full(shape, pressures.get(g, 0.0)) for g in mix]
        fug = self.case.conditions.fugacity
        f_all = self.fugacities(mix, temps[:, None], p_mix, fug)
        f = np.stack([f_all[mix.index(s.gas)] for s in spec])
        sol = site_coverages(K[:, :, None], f, dissociative=[s.dissociative for s in spec],
                             interactions=self.interaction_matrix(names) if cs.interactions else None,
                             temperature=temps[:, None], sites_per_species=np.array([s.sites for s in spec]))
        return CurveRun(kind=cs.kind, surface=cs.surface, gas=cs.gas, species=names, interactions=cs.interactions,
                        fugacity=fug, temperature_K=temps, pressure_Pa=grid, coverage=sol.coverage,
                        empty=np.asarray(sol.empty), entry=cs.entry)

    # ---------------------------------------------------------------- pathways
    def pathway(self, ps):
        from adsorb import diagrams

        t = float(ps.temperature_K)
        pressures = dict(ps.pressures_Pa)
        names = {k for state in ps.states for k, _ in state if k != "(H+ + e-)"}
        gibbs, gas_tables = {}, {}

        def gas_g(g):
            if g not in gas_tables:
                gas_tables[g] = self.gas_objs[g].thermo(t, pressure=pressures.get(g, C.P_STANDARD))
            return gas_tables[g]

        for n in sorted(names):
            if n == "*":
                gibbs[n] = self.case.surfaces[ps.surface].energy_eV
            elif n in self.case.adsorbates:
                gibbs[n] = self.ads_objs[n].thermo(t)
            elif self.case.gases[n].anchor is not None:
                anchor = self.case.gases[n].anchor
                value = sum(c * float(np.ravel(gas_g(g).gibbs)[0]) for g, c in anchor.species) + anchor.offset_eV
                gibbs[n] = value + C.kB_eV * t * np.log(pressures.get(n, C.P_STANDARD) / C.P_STANDARD)
            else:
                gibbs[n] = gas_g(n)
        hydrogen = None
        if ps.kind == "electrochemical":
            hydrogen = f"{ps.hydrogen_gas} (1 bar, hydrogen electrode)"
            gibbs[hydrogen] = self.gas_objs[ps.hydrogen_gas].thermo(t, pressure=C.P_STANDARD)
        states = [diagrams.PathwayState(label=_state_label(s), species={k: v for k, v in s if k != "(H+ + e-)"},
                                        pairs=int(round(dict(s).get("(H+ + e-)", 0)))) for s in ps.states]
        path = diagrams.pathway_from_states(states, gibbs, hydrogen=hydrogen or "H2", name=ps.name, temperature=t)
        potentials = list(ps.potentials_V) if ps.kind == "electrochemical" else [0.0]
        shift = ps.rhe_minus_she_V if ps.kind == "electrochemical" else None
        on_scale = 0.0 if ps.potential_scale == "RHE" else (shift or 0.0)   # U_RHE - U_scale
        summary = {}
        if ps.kind == "electrochemical" and path.electrochemical:
            es = diagrams.electrochemical_summary(path, equilibrium_potential_V=ps.equilibrium_potential_V)
            summary = es.as_dict()
            u_l, u_eq = es.limiting.potential, es.equilibrium_potential
            summary.update(potential_scale=ps.potential_scale, pH=ps.pH, limiting_potential_V=u_l - on_scale,
                           equilibrium_potential_V=u_eq - on_scale)
            if shift is not None:
                summary.update(limiting_potential_V_SHE=u_l - shift, equilibrium_potential_V_SHE=u_eq - shift)
            if ps.limiting_potential:
                potentials.append(u_l)
        else:
            summary = diagrams.thermal_summary(path).as_dict()
        energies = tuple(tuple(float(x) for x in diagrams.state_energies(path, u)) for u in potentials)
        electro = ps.kind == "electrochemical"
        return PathwayRun(name=ps.name, kind=ps.kind, pathway=path, potentials_V=tuple(potentials),
                          state_gibbs_eV=energies, summary=summary,
                          potential_scale=ps.potential_scale if electro else "RHE", pH=ps.pH if electro else None,
                          rhe_minus_she_V=shift, potentials_on_scale_V=tuple(u - on_scale for u in potentials))

    # ---------------------------------------------------------------- comparison
    def comparison(self, cs):
        from adsorb.model_choice import compare_models

        spec = self.case.adsorbates[cs.adsorbate]
        params = dict(cs.parameters)
        if spec.mode_vectors is not None:
            params.update(mode_vectors=spec.mode_vectors, indices=[int(i) for i in spec.mode_indices])
        gas = self.gas_objs.get(spec.gas) if spec.gas else None
        return compare_models(list(spec.frequencies_cm), np.asarray(cs.temperatures_K, dtype=float),
                              energy=spec.energy_eV, atoms=spec.atoms, gas=gas, standard_state=cs.standard_state,
                              name=cs.adsorbate, **params)


def _state_label(state):
    """'O2 + * + 4(H+ + e-)' from ((name, count), ...)."""
    parts = []
    order = {"*": 1, "(H+ + e-)": 3}
    for name, n in sorted(state, key=lambda kv: order.get(kv[0], 0 if kv[0].endswith("*") else 2)):
        coef = "" if abs(n - 1) < 1e-12 else f"{n:g}"
        parts.append(f"{coef}{name}" if name in ("*", "(H+ + e-)") else f"{coef} {name}".strip())
    return " + ".join(parts) if parts else "(empty)"


def run_study(case) -> StudyResult:
    """Compute everything a validated case asks for.

    Parameters
    ----------
    case : adsorb.case.Case
        From :func:`adsorb.case.load_case`.

    Returns
    -------
    StudyResult

    Raises
    ------
    InputError
        Inputs the library refuses (these are also tried by ``load_case``).
    ConvergenceError
        A coverage solve that did not converge (the message names the point).
    """
    if not hasattr(case, "adsorbates") or not hasattr(case, "conditions"):
        msg = f"run_study: expected a Case from adsorb.case.load_case, got {type(case).__name__}"
        raise InputError(msg)
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always", category=UserWarning)
        s = _Study(case)
        temps = np.asarray(case.conditions.temperatures_K, dtype=float)
        out = case.outputs
        gas_tables = {n: o.thermo(temps, pressure=C.P_STANDARD) for n, o in s.gas_objs.items() if o is not None}
        ads_tables = {n: o.thermo(temps) for n, o in s.ads_objs.items()}
        equilibria = {n: s.equilibrium(n, temps) for n, a in case.adsorbates.items() if a.gas is not None
                      and case.gases[a.gas].anchor is None}
        extra = []
        coverages = []
        surfaces = sorted({a.surface for a in case.adsorbates.values() if a.in_coverages})
        ideal_used = (out.coverages and surfaces and "ideal" in out.fugacities) or (
            (out.curves or out.isobars) and case.conditions.fugacity == "ideal")
        if ideal_used:
            extra += s.compressibility_check(temps)
        if out.coverages and surfaces:
            flags = {"off": (False,), "on": (True,), "both": (False, True)}[out.interactions]
            for surface in surfaces:
                for fug in out.fugacities:
                    for inter in flags:
                        coverages.append(s.coverages(surface, temps, fug, inter))
        curves = tuple(s.curve(c) for c in out.curves)
        isobars = tuple(s.curve(c) for c in out.isobars)
        pathways = tuple(s.pathway(p) for p in case.pathways.values())
        comparison = s.comparison(out.comparison) if out.comparison is not None else None
        from adsorb.study_outputs import isosteric_run, nasa_runs, tpd_run

        heats = tuple(isosteric_run(s, h) for h in out.isosteric_heats)
        spectra = tuple(tpd_run(s, t) for t in out.tpd)
        nasa = nasa_runs(s, out.nasa) if out.nasa is not None else ()
    messages = [str(w.message) for w in caught]
    for table in list(gas_tables.values()) + list(ads_tables.values()):
        messages += [w for w in table.warnings]
    return StudyResult(case=case, temperatures_K=temps, gas_tables=gas_tables, adsorbate_tables=ads_tables,
                       equilibria=equilibria, coverages=tuple(coverages), curves=curves, pathways=pathways,
                       comparison=comparison, warnings=tuple(dict.fromkeys(messages + extra)),
                       notes=tuple(s.notes), isobars=isobars, isosteric_heats=heats, tpd=spectra, nasa=nasa)
