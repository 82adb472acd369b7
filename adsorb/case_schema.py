"""Key tables and section readers of the case-file schema (see :mod:`adsorb.case`, docs/case-file.md).

:class:`Reader` wraps one TOML table with its key path and a shared list of
problems: every accessor checks type, range and unit and records a one-line
problem (``FILE: KEY.PATH: what; expected ...``) instead of raising, so that a
whole case is checked in one pass.
"""

from __future__ import annotations

import difflib
import math
import re
from dataclasses import dataclass
from pathlib import Path
from types import MappingProxyType

from adsorb import constants as C

CASE_KEYS = ("study", "conditions", "gases", "surfaces", "adsorbates", "pathways", "outputs")
_STRUCTURE = ("structure", "structure_index", "structure_format", "energy_eV", "source")
_FREQ = ("frequencies_cm", "frequencies_file", "frequencies_format", "vibrations_file")
GAS_KEYS = _STRUCTURE + _FREQ + (
    "symbols", "positions_A", "formula", "multiplicity", "symmetry_number", "rotational_constants_cm",
    "electronic_levels", "critical_temperature_K", "critical_pressure_<p>", "acentric_factor", "gibbs_anchor",
    "rotor", "centrifugal_cm", "imaginary_modes")
SURFACE_KEYS = _STRUCTURE + ("site_area_A2",)
#: case key -> (Adsorbate keyword, models that use it (empty: all), kind or choices)
MODEL_PARAMETERS = {
    "imaginary_modes": ("imaginary_modes", (), ("raise", "drop", "invert")),
    "low_frequency": ("low_frequency", (), ("none", "floor", "qrrho")),
    "frequency_floor_cm": ("frequency_floor", (), "positive"),
    "mass_amu": ("mass", ("hindered", "2d-gas"), "positive"),
    "translation_barrier_eV": ("translation_barrier", ("hindered", "harmonic", "lattice-gas"), "nonneg"),
    "site_spacing_A": ("site_spacing", ("hindered", "2d-gas"), "positive"),
    "site_area_A2": ("site_area", ("hindered", "2d-gas"), "positive"),
    "rotation_barrier_eV": ("rotation_barrier", ("hindered",), "nonneg"),
    "rotation_minima": ("rotation_minima", ("hindered",), "count"),
    "rotor_symmetry_number": ("symmetry_number", ("hindered",), "count"),
    "inertia_amu_A2": ("inertia", ("hindered",), "positive"),
    "solver": ("solver", ("hindered",), ("closed-form", "exact")),
}
ADSORBATE_KEYS = _STRUCTURE + _FREQ + tuple(MODEL_PARAMETERS) + (
    "surface", "gas", "dissociative", "formula", "model", "sites", "interactions_eV", "standard_state", "in_coverages")
FUGACITIES = ("ideal", "peng-robinson")
#: pressure unit suffix -> factor to Pa
PRESSURE_UNITS = {"Pa": 1.0, "kPa": 1e3, "MPa": 1e6, "bar": C.bar, "atm": C.atm, "torr": C.torr}
#: the characters str.splitlines() breaks on -> their escapes (problems are one line each)
_LINE_BREAKS = {ord(c): repr(c)[1:-1] for c in "\n\r\x0b\x0c\x1c\x1d\x1e\x85\u2028\u2029"}


class Reader:
    """One TOML table, its key path and the shared problem list."""

    def __init__(self, file, data, path="", problems=None, base=None):
        self.file, self.data, self.path = Path(file), data, path
        self.problems = problems if problems is not None else []
        self.base = base if base is not None else self.file.parent

    # ---------------------------------------------------------------- reporting
    def where(self, key):
        return f"{self.path}.{key}" if self.path else str(key)

    def problem(self, key, what, expected):
        # names and values from the file may hold line breaks (a quoted TOML key "a\nb"): keep one line each
        self.problems.append(f"{self.file}: {self.where(key)}: {what}; expected {expected}".translate(_LINE_BREAKS))

    @staticmethod
    def suggest(value, options):
        close = difflib.get_close_matches(str(value), [str(o) for o in options], n=1, cutoff=0.6)
        return f" (did you mean {close[0]!r}?)" if close else ""

    def allow(self, keys):
        allowed = []
        for k in keys:
            allowed += [k.replace("<p>", u) for u in PRESSURE_UNITS] if "<p>" in k else [k]
        for key in self.data:
            if key in allowed:
                continue
            unit_forms = [a for a in allowed if a.startswith(f"{key}_")]
            if unit_forms:
                self.problem(key, f"{key!r} has no unit in its name",
                             f"the unit as a suffix, e.g. {', '.join(unit_forms[:3])}")
            else:
                self.problem(key, f"unknown key {key!r}{self.suggest(key, allowed)}", f"one of {', '.join(allowed)}")

    # ---------------------------------------------------------------- scalars
    def has(self, key):
        return key in self.data

    def _get(self, key, required, expected):
        if key not in self.data:
            if required:
                self.problem(key, "missing", expected)
            return None
        return self.data[key]

    def string(self, key, *, required=False, default=None, choices=None):
        v = self._get(key, required, "a string" if not choices else f"one of {', '.join(choices)}")
        if v is None:
            return default
        if not isinstance(v, str):
            self.problem(key, f"got {type(v).__name__} {v!r}", "a string")
            return default
        if choices and v not in choices:
            self.problem(key, f"unknown value {v!r}{self.suggest(v, choices)}", f"one of {', '.join(choices)}")
            return default
        return v

    def integer(self, key, *, required=False, default=None, minimum=None):
        v = self._get(key, required, "an integer")
        if v is None:
            return default
        # TOML integers are 64-bit; tomllib reads longer ones, which later overflow float arithmetic
        if (isinstance(v, bool) or not isinstance(v, int) or not -(2**63) <= v < 2**63
                or (minimum is not None and v < minimum)):
            self.problem(key, f"got {v!r}", "a 64-bit integer" + (f" >= {minimum}" if minimum is not None else ""))
            return default
        return v

    def boolean(self, key, *, default=None):
        v = self.data.get(key)
        if v is None:
            return default
        if not isinstance(v, bool):
            self.problem(key, f"got {v!r}", "true or false")
            return default
        return v

    def _num(self, key, v, positive=False, minimum=None, unit=""):
        if isinstance(v, bool) or not isinstance(v, (int, float)) or not _finite(v):
            self.problem(key, f"got {v!r}", f"a finite number{unit}")
            return None
        if positive and v <= 0:
            self.problem(key, f"got {v!r}", f"a number > 0{unit}")
            return None
        if minimum is not None and v < minimum:
            self.problem(key, f"got {v!r}", f"a number >= {minimum}{unit}")
            return None
        return float(v)

    def number(self, key, *, required=False, default=None, positive=False, minimum=None, finite=True):
        v = self._get(key, required, "a number")
        return default if v is None else self._num(key, v, positive, minimum, _unit_of(key))

    def numbers(self, key, *, required=False, positive=False, minimum=None, finite=True):
        v = self._get(key, required, "a list of numbers")
        if v is None:
            return None
        if not isinstance(v, list):
            self.problem(key, f"got {type(v).__name__} {v!r}", f"a list of numbers{_unit_of(key)}")
            return None
        out = [self._num(f"{key}.{i}", x, positive, minimum, _unit_of(key)) for i, x in enumerate(v)]
        return None if any(x is None for x in out) else out

    def strings(self, key, *, required=False):
        v = self._get(key, required, "a list of strings")
        if v is None:
            return None
        if not isinstance(v, list) or not all(isinstance(x, str) for x in v):
            self.problem(key, f"got {v!r}", "a list of strings")
            return None
        return v

    def vectors(self, key, *, width=3, required=False):
        v = self._get(key, required, f"a list of [{width} numbers]")
        if v is None:
            return None
        ok = isinstance(v, list) and all(isinstance(r, list) and len(r) == width and all(
            isinstance(x, (int, float)) and not isinstance(x, bool) and _finite(x) for x in r) for r in v)
        if not ok:
            self.problem(key, f"got {v!r}", f"a list of [{width} numbers] rows")
            return None
        return [[float(x) for x in r] for r in v]

    def number_map(self, key, *, required=False, positive=False, scale=1.0):
        t = self.table(key, required=required)
        if t is None:
            return None
        out = {k: t._num(k, x, positive, None, _unit_of(key.split(".")[-1])) for k, x in t.data.items()}
        return None if any(x is None for x in out.values()) else {k: x * scale for k, x in out.items()}

    # ---------------------------------------------------------------- tables
    def table(self, key, *, required=False):
        v = self._get(key, required, "a table")
        if v is None:
            return None
        if not isinstance(v, dict):
            self.problem(key, f"got {type(v).__name__} {v!r}", "a table")
            return None
        return Reader(self.file, v, self.where(key), self.problems, self.base)

    def sub(self, key):
        return Reader(self.file, self.data.get(key, {}), self.where(key), self.problems, self.base)

    def tables(self, key):
        """A table of named tables, as (name, Reader) pairs."""
        t = self.table(key)
        if t is None:
            return []
        out = []
        for name, v in t.data.items():
            if isinstance(v, dict):
                out.append((name, Reader(self.file, v, t.where(name), self.problems, self.base)))
            else:
                t.problem(name, f"got {type(v).__name__} {v!r}", f"a table [{t.where(name)}]")
        return out

    def table_list(self, key):
        """An array of tables (a single table counts as one)."""
        v = self.data.get(key)
        if v is None:
            return []
        items = [v] if isinstance(v, dict) else v
        if not isinstance(items, list) or not all(isinstance(x, dict) for x in items):
            self.problem(key, f"got {v!r}", "an array of tables")
            return []
        return [Reader(self.file, x, self.where(f"{key}.{i}"), self.problems, self.base) for i, x in enumerate(items)]

    # ---------------------------------------------------------------- units
    def unit_key(self, base):
        """The one key ``base_<unit>`` present (and its factor to Pa), or (None, None)."""
        keys = [(f"{base}_{u}", u) for u in PRESSURE_UNITS if f"{base}_{u}" in self.data]
        if len(keys) > 1:
            self.problem(keys[1][0], f"{base} given twice ({keys[0][0]} and {keys[1][0]})", "one unit")
        if not keys:
            return None, None
        return keys[0][0], PRESSURE_UNITS[keys[0][1]]

    def unit_value(self, base, *, positive=True, required=False):
        key, factor = self.unit_key(base)
        if key is None:
            if required:
                self.problem(f"{base}_bar", "missing", f"a pressure with its unit in the key, e.g. {base}_bar or {base}_Pa")
            return None
        v = self.number(key, positive=positive)
        return None if v is None else v * factor

    def unit_map(self, base):
        key, factor = self.unit_key(base)
        return (None, None) if key is None else (self.number_map(key, positive=True, scale=factor), key)


def _finite(x):
    """math.isfinite, False for an integer too large for a float (tomllib's integers are unbounded)."""
    try:
        return math.isfinite(x)
    except OverflowError:
        return False


def parse_parameters(t, model=None):
    """Adsorbate keyword arguments from the model keys of ``t``; with ``model``, keys it does not use are refused."""
    params = {}
    for case_key, (arg, models, kind) in MODEL_PARAMETERS.items():
        if not t.has(case_key):
            continue
        if model is not None and models and model not in models:
            t.problem(case_key, f"not used by model {model!r}", f"only with model(s) {', '.join(models)}")
            continue
        if kind == "positive":
            value = t.number(case_key, positive=True)
        elif kind == "nonneg":
            value = t.number(case_key, minimum=0.0)
        elif kind == "count":
            value = t.integer(case_key, minimum=1)
        else:
            value = t.string(case_key, choices=kind)
        if value is not None:
            params[arg] = value
    return params


def _unit_of(key):
    base = str(key).split(".")[0]
    for unit in PRESSURE_UNITS:
        if base.endswith(f"_{unit}"):
            return f" in {unit}"
    for suffix, text in (("_K_s", " in K/s"), ("_ML", " in ML"), ("_K", " in K"), ("_eV", " in eV"),
                         ("_cm", " in cm^-1"), ("_amu_A2", " in amu Å^2"), ("_A2", " in Å^2"),
                         ("_A", " in Å"), ("_V", " in V"), ("_amu", " in amu")):
        if base.endswith(suffix):
            return text
    return ""


def formula_counts(formula, t, key):
    """Element counts of a plain formula such as 'NH3' or 'OOH' (no brackets)."""
    if formula is None:
        return None
    parts = re.findall(r"([A-Z][a-z]?)(\d*)", formula)
    if not parts or "".join(a + b for a, b in parts) != formula:
        t.problem(key, f"cannot read formula {formula!r}", "element symbols with counts, e.g. 'NH3' or 'OOH'")
        return None
    if any(len(n) > 18 for _, n in parts):  # a 400-digit count overflowed the atom balance
        t.problem(key, f"formula {formula!r} has a count of more than 18 digits", "counts below 10^18")
        return None
    counts = {}
    for el, n in parts:
        counts[el] = counts.get(el, 0) + (int(n) if n else 1)
    return counts


# ============================================================== conditions
@dataclass(frozen=True)
class Conditions:
    """Temperatures (K), gas pressures (Pa), fugacity model and default standard state."""

    temperatures_K: tuple
    pressures_Pa: MappingProxyType
    fugacity: str = "ideal"
    standard_state: str | None = None


#: the most points a {start, stop, step | count} grid of a case file may have
MAX_GRID_POINTS = 100_000


def read_grid(t, key, *, log_default=False):
    """``{start, stop, step}`` or ``{start, stop, count, spacing}`` -> list of values (or None)."""
    g = t.table(key, required=True)
    if g is None:
        return None
    g.allow(("start", "stop", "step", "count", "spacing"))
    start, stop = g.number("start", required=True, positive=True), g.number("stop", required=True, positive=True)
    step, count = g.number("step", positive=True), g.integer("count", minimum=1)
    spacing = g.string("spacing", default="log" if log_default else "linear", choices=("linear", "log"))
    if start is None or stop is None:
        return None
    if stop < start:
        g.problem("stop", f"{stop:g} is below start {start:g}", "stop >= start")
        return None
    if (step is None) == (count is None):
        g.problem("step", "give exactly one of step and count", "step (a number > 0) or count (an integer >= 1)")
        return None
    points = count if step is None else (stop + 0.5 * step - start) / step + 0.5  # inf if stop + step/2 overflows
    if points > MAX_GRID_POINTS:  # a typo, and a memory error in numpy
        g.problem("count" if step is None else "step", f"{points:.6g} grid points", f"at most {MAX_GRID_POINTS}")
        return None
    import numpy as np

    if step is not None:
        return [float(x) for x in np.arange(start, stop + 0.5 * step, step)]
    if spacing == "log":
        return [float(x) for x in np.geomspace(start, stop, count)]
    return [float(x) for x in np.linspace(start, stop, count)]


def _temperatures(t, list_key="temperatures_K", range_key="temperature_range_K", required=True):
    if list_key is None:
        temps = read_grid(t, range_key)
    elif t.has(list_key) and t.has(range_key):
        t.problem(range_key, f"both {list_key} and {range_key}", "one of them")
        return None
    elif t.has(range_key):
        temps = read_grid(t, range_key)
    else:
        temps = t.numbers(list_key, required=required, positive=True)
        if temps is not None and not temps:
            t.problem(list_key, "empty list", "at least one temperature in K")
            return None
    if temps and max(temps) > 5000:
        t.problem(range_key if list_key is None or t.has(range_key) else list_key, f"{max(temps):g} K",
                  "temperatures between 1 and 5000 K (the validated range)")
        return None
    return tuple(temps) if temps else None


def read_conditions(root, gases):
    t = root.table("conditions", required=True)
    if t is None:
        return None
    t.allow(("temperatures_K", "temperature_range_K", "partial_pressures_<p>", "total_pressure_<p>",
             "mole_fractions", "fugacity", "standard_state"))
    temps = _temperatures(t)
    partial, pkey = t.unit_map("partial_pressures")
    total = t.unit_value("total_pressure")
    fractions = t.number_map("mole_fractions", positive=True)
    pressures = {}
    if partial is not None and (total is not None or fractions is not None):
        t.problem("mole_fractions", "both partial pressures and total pressure/mole fractions", "one way of giving pressures")
    elif partial is not None:
        pressures, where = partial, pkey
    elif total is not None or fractions is not None:
        if total is None or fractions is None:
            t.problem("total_pressure_bar" if total is None else "mole_fractions", "missing",
                      "total_pressure_<unit> together with mole_fractions")
        elif abs(sum(fractions.values()) - 1.0) > 1e-6:
            t.problem("mole_fractions", f"they sum to {sum(fractions.values()):g}", "mole fractions summing to 1")
        else:
            pressures, where = {k: total * x for k, x in fractions.items()}, "mole_fractions"
    for g in pressures:
        if g not in gases:
            t.problem(f"{where}.{g}", f"unknown gas {g!r}{t.suggest(g, gases)}", "a name from [gases]")
    fug = t.string("fugacity", default="ideal", choices=FUGACITIES)
    if fug == "peng-robinson":
        for g in pressures:
            if g in gases and gases[g].critical is None:
                t.problem("fugacity", f"peng-robinson needs critical constants of {g!r}",
                          f"gases.{g}.critical_temperature_K, critical_pressure_<unit>, acentric_factor")
    return Conditions(temps or (), MappingProxyType(pressures), fug or "ideal", t.string("standard_state"))


# ============================================================== outputs
@dataclass(frozen=True)
class CurveSpec:
    """An isotherm set (coverages vs the pressure of one gas at fixed T) or a (T, p) coverage map."""

    kind: str                     # "isotherm" | "map"
    surface: str
    gas: str
    temperatures_K: tuple
    pressures_Pa: tuple
    interactions: bool = False
    entry: int = 0                # index of the case-file entry (isobars: its variants share it)


@dataclass(frozen=True)
class ComparisonSpec:
    """Model comparison of one adsorbate (:func:`adsorb.model_choice.compare_models`)."""

    adsorbate: str
    parameters: tuple             # (Adsorbate keyword, value) pairs, all models
    temperatures_K: tuple
    standard_state: str = "lattice-half"


@dataclass(frozen=True)
class OutputSpec:
    """What to produce."""

    coverages: bool = True
    interactions: str = "off"     # "off" | "on" | "both"
    fugacities: tuple = ("ideal",)
    curves: tuple = ()
    comparison: ComparisonSpec | None = None
    thermo_tables: bool = True
    plots: bool = True
    isobars: tuple = ()           # CurveSpec of kind "isobar", one per interaction variant
    isosteric_heats: tuple = ()   # adsorb.case_outputs.IsostericSpec
    tpd: tuple = ()               # adsorb.case_outputs.TPDSpec
    nasa: object = None           # adsorb.case_outputs.NasaSpec or None


def _coverage_surface(t, ctx, surface):
    surfaces = sorted({a.surface for a in ctx["adsorbates"].values() if a.in_coverages})
    if surface is None:
        if len(surfaces) != 1:
            t.problem("surface", "missing" if surfaces else "no adsorbate with a gas precursor",
                      f"one of {', '.join(surfaces) or 'the surfaces (add gas = ... to an adsorbate)'}")
            return None
        return surfaces[0]
    if surface not in surfaces:
        t.problem("surface", f"{surface!r} has no adsorbate with a gas precursor", f"one of {', '.join(surfaces)}")
        return None
    return surface


def read_outputs(root, ctx, conditions):
    t = root.table("outputs")
    if t is None:
        t = Reader(root.file, {}, "outputs", root.problems, root.base)
    t.allow(("coverages", "isotherms", "maps", "model_comparison", "thermo_tables", "plots", "isobars",
             "isosteric_heats", "tpd", "nasa"))
    has_inter = any(a.interactions_eV for a in ctx["adsorbates"].values())
    main_fug = conditions.fugacity if conditions is not None else "ideal"
    inter, fugs, cov = ("both" if has_inter else "off"), (main_fug,), True
    if isinstance(t.data.get("coverages"), bool):
        cov = t.boolean("coverages")
    elif t.has("coverages"):
        c = t.table("coverages")
        if c is not None:
            c.allow(("interactions", "fugacities"))
            inter = c.string("interactions", default=inter, choices=("off", "on", "both"))
            fl = c.strings("fugacities")
            for i, f in enumerate(fl or []):
                if f not in FUGACITIES:
                    c.problem(f"fugacities.{i}", f"unknown value {f!r}{c.suggest(f, FUGACITIES)}", f"one of {', '.join(FUGACITIES)}")
            fugs = tuple(dict.fromkeys(fl)) if fl else fugs
    if inter != "off" and not has_inter:
        t.problem("coverages.interactions", f"{inter!r} but no adsorbate has interactions_eV", "'off', or interactions_eV")
    needs_pr = "peng-robinson" in fugs
    curves = []
    for kind, key in (("isotherm", "isotherms"), ("map", "maps")):
        for c in t.table_list(key):
            c.allow(("surface", "gas", "interactions") + (("temperatures_K", "pressure_range_<p>") if kind == "isotherm"
                                                           else ("temperature_range_K", "pressure_range_<p>")))
            surface = _coverage_surface(c, ctx, c.string("surface"))
            gas = c.string("gas", required=True)
            if gas is not None and surface is not None:
                precursors = {a.gas for a in ctx["adsorbates"].values() if a.surface == surface and a.in_coverages}
                if gas not in precursors:
                    c.problem("gas", f"{gas!r} is not a precursor on {surface!r}", f"one of {', '.join(sorted(precursors))}")
            temps = _temperatures(c, "temperatures_K" if kind == "isotherm" else None, "temperature_range_K")
            pk, factor = c.unit_key("pressure_range")
            if pk is None:
                c.problem("pressure_range_bar", "missing", "pressure_range_<unit> = {start, stop, count} (log spacing by default)")
                continue
            grid = read_grid(c, pk, log_default=True)
            inter_c = c.boolean("interactions", default=False)
            if inter_c and not has_inter:
                c.problem("interactions", "true but no adsorbate has interactions_eV", "false")
            if None not in (surface, gas, temps, grid):
                curves.append(CurveSpec(kind, surface, gas, temps, tuple(p * factor for p in grid), inter_c))
        needs_pr |= bool(curves) and main_fug == "peng-robinson"
    if needs_pr and main_fug != "peng-robinson":  # read_conditions reported the main choice already
        for g in (conditions.pressures_Pa if conditions is not None else {}):
            if g in ctx["gases"] and ctx["gases"][g].critical is None:
                t.problem("coverages.fugacities", f"peng-robinson needs critical constants of {g!r}",
                          f"gases.{g}.critical_temperature_K, critical_pressure_<unit>, acentric_factor")
    comparison = None
    mc = t.table("model_comparison")
    if mc is not None:
        mc.allow(("adsorbate", "temperatures_K", "standard_state") + tuple(MODEL_PARAMETERS))
        name = mc.string("adsorbate", required=True)
        base = ctx["adsorbates"].get(name)
        if name is not None and base is None:
            mc.problem("adsorbate", f"unknown adsorbate {name!r}{mc.suggest(name, ctx['adsorbates'])}", "a name from [adsorbates]")
        params = dict(base.parameters) if base is not None else {}
        surf = ctx["surfaces"].get(base.surface) if base is not None else None
        if surf is not None and surf.site_area_A2 and "site_spacing" not in params:
            params.setdefault("site_area", surf.site_area_A2)
        params.update(parse_parameters(mc))
        if "site_spacing" in params and "site_area" in params and mc.has("site_spacing_A"):
            params.pop("site_area")
        state = mc.string("standard_state", default="lattice-half")
        temps = _temperatures(mc, required=False) or (conditions.temperatures_K if conditions else ())
        if base is not None and temps:
            comparison = ComparisonSpec(name, tuple(sorted(params.items())), tuple(temps), state)
    from adsorb.case_outputs import read_isobars, read_isosteric_heats, read_nasa, read_tpd

    return OutputSpec(coverages=cov if cov is not None else True, interactions=inter or "off", fugacities=fugs,
                      curves=tuple(curves), comparison=comparison, thermo_tables=t.boolean("thermo_tables", default=True),
                      plots=t.boolean("plots", default=True), isobars=read_isobars(t, ctx, conditions),
                      isosteric_heats=read_isosteric_heats(t, ctx), tpd=read_tpd(t, ctx), nasa=read_nasa(t, ctx))
