"""Readers of the optional output sections of a case file: isobars, isosteric heats, TPD, NASA fits.

Called by :func:`adsorb.case_schema.read_outputs`; problems are recorded on the
shared :class:`adsorb.case_schema.Reader` (one line each: file, key path,
expected). Keys are documented in ``docs/case-file.md``:

* ``[[outputs.isobars]]``: coverages vs temperature at fixed pressures of one gas
  (:class:`adsorb.case_schema.CurveSpec` of kind ``"isobar"``);
* ``[[outputs.isosteric_heats]]``: q_st(θ) of one adsorbate alone on its surface
  (Clausius–Clapeyron at constant coverage, :func:`adsorb.isotherms.isosteric_heat`);
* ``[[outputs.tpd]]``: first-order TPD spectra of one molecular adsorbate
  (:func:`adsorb.tpd.simulate_tpd`, prefactor from transition-state theory);
* ``[outputs.nasa]``: NASA 7-coefficient fits (:func:`adsorb.nasa.fit_nasa7`).
"""

from __future__ import annotations

from dataclasses import dataclass

from adsorb.case_schema import CurveSpec, _coverage_surface, _temperatures, read_grid

__all__ = ["IsostericSpec", "TPDSpec", "NasaSpec", "read_isobars", "read_isosteric_heats", "read_tpd", "read_nasa"]

#: ``interactions`` values of the new outputs -> variants computed (without, with)
_VARIANTS = {"off": (False,), "on": (True,), "both": (False, True)}
#: the validated temperature range of the package, K
T_MAX = 5000.0


@dataclass(frozen=True)
class IsostericSpec:
    """Isosteric heat of one adsorbate alone on its surface, at fixed temperatures over a coverage grid."""

    adsorbate: str
    surface: str
    gas: str
    dissociative: bool
    sites: int
    temperatures_K: tuple
    coverages_ML: tuple
    interactions: bool
    self_interaction_eV: float = 0.0
    entry: int = 0                   # index of the case-file entry (its interaction variants share it)


@dataclass(frozen=True)
class TPDSpec:
    """First-order TPD of one molecular adsorbate, one spectrum per initial coverage."""

    adsorbate: str
    surface: str
    gas: str
    heating_rate_K_s: float
    initial_coverages_ML: tuple
    temperature_start_K: float
    temperature_end_K: float
    points: int
    interactions: bool
    site_area_A2: float
    self_interaction_eV: float = 0.0
    entry: int = 0


@dataclass(frozen=True)
class NasaSpec:
    """NASA 7-coefficient fits of species' tables on a temperature grid."""

    species: tuple
    temperatures_K: tuple
    temperature_mid_K: object        # float in K, or "auto"
    objective: str = "least_squares"


def _variants(t, available, why):
    """Interaction variants: ``interactions`` = 'off' | 'on' | 'both' or false | true; default both if available."""
    v = t.data.get("interactions")
    if v is None:
        return (False, True) if available else (False,)
    if isinstance(v, bool):
        out = (v,)
    elif isinstance(v, str) and v in _VARIANTS:
        out = _VARIANTS[v]
    else:
        t.problem("interactions", f"got {v!r}", "'off', 'on' or 'both' (or false / true)")
        return (False,)
    if True in out and not available:
        t.problem("interactions", f"{v!r} but {why}", "'off' (or false), or the interactions_eV it needs")
        return (False,)
    return out


def _self_interaction(a):
    return float(dict(a.interactions_eV).get(a.name, 0.0))


def _adsorbate_with_gas(t, ctx):
    """The adsorbate named by ``adsorbate`` if it has a gas precursor with its own energy; else None."""
    name = t.string("adsorbate", required=True)
    if name is None:
        return None
    a = ctx["adsorbates"].get(name)
    if a is None:
        t.problem("adsorbate", f"unknown adsorbate {name!r}{t.suggest(name, ctx['adsorbates'])}", "a name from [adsorbates]")
        return None
    gas = ctx["gases"].get(a.gas) if a.gas else None
    if gas is None:
        t.problem("adsorbate", f"{name!r} has no gas precursor", "an adsorbate with gas = NAME of the gas it adsorbs from")
        return None
    if gas.anchor is not None:
        t.problem("adsorbate", f"the gas {a.gas!r} of {name!r} has a gibbs_anchor (pathway use only)",
                  "an adsorbate whose gas has its own electronic energy")
        return None
    return a


def read_isobars(t, ctx, conditions):
    """CurveSpecs of kind 'isobar', one per (entry, interaction variant)."""
    out = []
    main_fug = conditions.fugacity if conditions is not None else "ideal"
    for entry, c in enumerate(t.table_list("isobars")):
        c.allow(("surface", "gas", "pressures_<p>", "temperatures_K", "temperature_range_K", "interactions"))
        surface = _coverage_surface(c, ctx, c.string("surface"))
        gas = c.string("gas", required=True)
        if gas is not None and surface is not None:
            precursors = {a.gas for a in ctx["adsorbates"].values() if a.surface == surface and a.in_coverages}
            if gas not in precursors:
                c.problem("gas", f"{gas!r} is not a precursor on {surface!r}", f"one of {', '.join(sorted(precursors))}")
                gas = None
            elif main_fug == "peng-robinson" and ctx["gases"][gas].critical is None:
                c.problem("gas", f"peng-robinson needs critical constants of {gas!r}",
                          f"gases.{gas}.critical_temperature_K, critical_pressure_<unit>, acentric_factor")
        temps = _temperatures(c)
        key, factor = c.unit_key("pressures")
        pressures = None
        if key is None:
            if not c.has("pressures"):      # 'pressures' without a unit is reported by allow()
                c.problem("pressures_bar", "missing",
                          "pressures_<unit> = [p1, ...] with the unit in the key (one isobar each)")
        else:
            pressures = c.numbers(key, positive=True)
            if pressures is not None and not pressures:
                c.problem(key, "empty list", "at least one pressure")
                pressures = None
        inter = any(a.interactions_eV for a in ctx["adsorbates"].values() if a.surface == surface and a.in_coverages)
        variants = _variants(c, inter, f"no adsorbate on {surface!r} has interactions_eV")
        if None not in (surface, gas, temps, pressures):
            out += [CurveSpec("isobar", surface, gas, temps, tuple(p * factor for p in pressures), v, entry)
                    for v in variants]
    return tuple(out)


def read_isosteric_heats(t, ctx):
    """IsostericSpecs, one per (entry, interaction variant)."""
    out = []
    for entry, c in enumerate(t.table_list("isosteric_heats")):
        c.allow(("adsorbate", "temperatures_K", "temperature_range_K", "coverage_range_ML", "interactions"))
        a = _adsorbate_with_gas(c, ctx)
        temps = _temperatures(c)
        sites = a.sites if a is not None else 1
        if c.has("coverage_range_ML"):
            grid = read_grid(c, "coverage_range_ML")
            if grid is not None and max(grid) >= 1.0 / sites:
                c.problem("coverage_range_ML.stop", f"{max(grid):g} ML",
                          f"coverages below {1.0 / sites:g} ML (empty sites must remain)")
                grid = None
        else:
            grid = [0.02 / sites + k * (0.96 / sites) / 48 for k in range(49)]
        eps = _self_interaction(a) if a is not None else 0.0
        name = a.name if a is not None else "the adsorbate"
        variants = _variants(c, eps != 0.0, f"{name} has no interaction with itself (interactions_eV.{name})")
        if None not in (a, temps, grid):
            out += [IsostericSpec(a.name, a.surface, a.gas, a.dissociative, a.sites, temps, tuple(grid), v, eps, entry)
                    for v in variants]
    return tuple(out)


def _site_area(a, ctx):
    """Area per site in Å^2 of the 2D-gas transition state (the adsorbate's own for mobile models)."""
    from adsorb.adsorbate import MOBILE_MODELS

    p = dict(a.parameters)
    if a.model in MOBILE_MODELS:
        if "site_spacing" in p:
            return p["site_spacing"] ** 2
        if "site_area" in p:
            return p["site_area"]
    surface = ctx["surfaces"].get(a.surface)
    return surface.site_area_A2 if surface is not None else None


def read_tpd(t, ctx):
    """TPDSpecs, one per (entry, interaction variant)."""
    out = []
    for entry, c in enumerate(t.table_list("tpd")):
        c.allow(("adsorbate", "heating_rate_K_s", "initial_coverages_ML", "temperature_start_K", "temperature_end_K",
                 "points", "interactions"))
        a = _adsorbate_with_gas(c, ctx)
        if a is not None and a.dissociative:
            c.problem("adsorbate", f"{a.name!r} is dissociative (recombinative desorption is second order)",
                      "a molecular adsorbate (first-order desorption)")
            a = None
        beta = c.number("heating_rate_K_s", required=True, positive=True)
        theta0 = c.numbers("initial_coverages_ML", positive=True)
        if theta0 is None and not c.has("initial_coverages_ML"):
            theta0 = [1.0 / (a.sites if a is not None else 1)]
        elif theta0 is not None and not theta0:
            c.problem("initial_coverages_ML", "empty list", "at least one initial coverage in ML")
            theta0 = None
        for i, th in enumerate(theta0 or []):
            limit = 1.0 / (a.sites if a is not None else 1)
            if th > limit * (1 + 1e-12):
                c.problem(f"initial_coverages_ML.{i}", f"{th:g} ML", f"an initial coverage in (0, {limit:g}] ML")
                theta0 = None
                break
        t0 = c.number("temperature_start_K", required=True, positive=True)
        t1 = c.number("temperature_end_K", required=True, positive=True)
        if t0 is not None and t1 is not None and t1 <= t0:
            c.problem("temperature_end_K", f"{t1:g} K is not above temperature_start_K = {t0:g} K", "end > start")
            t1 = None
        elif t1 is not None and t1 > T_MAX:
            c.problem("temperature_end_K", f"{t1:g} K", f"at most {T_MAX:g} K (the validated range)")
            t1 = None
        points = c.integer("points", default=801, minimum=11)
        area = _site_area(a, ctx) if a is not None else None
        if a is not None and area is None:
            c.problem("adsorbate", f"no area per site for the transition state of {a.name!r}",
                      f"surfaces.{a.surface}.site_area_A2 (the TS is a 2D gas on one site)")
        eps = _self_interaction(a) if a is not None else 0.0
        name = a.name if a is not None else "the adsorbate"
        variants = _variants(c, eps != 0.0, f"{name} has no interaction with itself (interactions_eV.{name})")
        if None not in (a, beta, theta0, t0, t1, points, area):
            out += [TPDSpec(a.name, a.surface, a.gas, beta, tuple(theta0), t0, t1, points, v, float(area), eps, entry)
                    for v in variants]
    return tuple(out)


def read_nasa(t, ctx):
    """The NasaSpec of ``[outputs.nasa]``, or None."""
    n = t.table("nasa")
    if n is None:
        return None
    n.allow(("species", "temperature_range_K", "temperature_mid_K", "objective"))
    species = n.strings("species", required=True)
    ok = species is not None
    if species is not None and not species:
        n.problem("species", "empty list", "names of gases or adsorbates")
        ok = False
    known = set(ctx["gases"]) | set(ctx["adsorbates"])
    for i, name in enumerate(species or []):
        if name not in known:
            n.problem(f"species.{i}", f"unknown species {name!r}{n.suggest(name, known)}", "a gas or adsorbate name")
            ok = False
        elif name in ctx["gases"] and ctx["gases"][name].anchor is not None:
            n.problem(f"species.{i}", f"gas {name!r} has a gibbs_anchor and no thermochemistry table",
                      "a gas with its own electronic energy and frequencies, or an adsorbate")
            ok = False
    if species and len(set(species)) != len(species):
        n.problem("species", "a species is listed twice", "each species once")
        ok = False
    temps = _temperatures(n, None, "temperature_range_K")
    raw = n.data.get("temperature_mid_K", 1000.0)
    if raw == "auto":
        mid = "auto"
        if temps is not None and len(temps) < 40:
            n.problem("temperature_range_K", f"{len(temps)} temperatures", "at least 40 for temperature_mid_K = 'auto'")
            temps = None
    else:
        mid = n.number("temperature_mid_K", positive=True) if "temperature_mid_K" in n.data else 1000.0
        if mid is not None and temps is not None:
            low = sum(1 for x in temps if x <= mid)
            high = sum(1 for x in temps if x >= mid)
            if not temps[0] < mid < temps[-1] or min(low, high) < 8:
                n.problem("temperature_mid_K", f"{mid:g} K with {low} and {high} grid temperatures below and above it",
                          "a common temperature inside temperature_range_K with at least 8 temperatures on each side, "
                          "or 'auto'")
                mid = None
    objective = n.string("objective", default="least_squares", choices=("least_squares", "minimax"))
    if not ok or temps is None or mid is None or objective is None:
        return None
    return NasaSpec(tuple(species), tuple(temps), mid, objective)
