"""Cross-references of a case file: pathways (species, atom balance, diagram states) and links between sections.

Used by :func:`adsorb.case.load_case`; problems are recorded on the shared
:class:`adsorb.case_schema.Reader` (one line each: file, key path, expected).
"""

from __future__ import annotations

import math
import warnings
from dataclasses import dataclass

from adsorb.errors import InputError

__all__ = ["StepSpec", "PathwaySpec", "PAIR", "read_pathways", "cross_checks", "coverage_pressures", "try_objects"]


@dataclass(frozen=True)
class StepSpec:
    """One step: reactants and products as (name, count) pairs; pairs of (H+ + e-) consumed."""

    reactants: tuple
    products: tuple
    proton_electron_pairs: float = 0.0
    label: str = ""


@dataclass(frozen=True)
class PathwaySpec:
    """A sequence of steps on one surface, thermal or electrochemical, and the diagram conditions."""

    name: str
    kind: str
    surface: str
    steps: tuple
    states: tuple                 # per state: ((name, count), ...), pairs of (H+ + e-) as '(H+ + e-)'
    temperature_K: float = 298.15
    pressures_Pa: tuple = ()
    potentials_V: tuple = ()          # V vs RHE (converted from potential_scale)
    limiting_potential: bool = False
    equilibrium_potential_V: float | None = None   # V vs RHE
    hydrogen_gas: str | None = None
    balance_checked: bool = True
    description: str = ""
    potential_scale: str = "RHE"      # scale of the potentials as given in the case file
    pH: float | None = None
    potentials_given_V: tuple = ()    # on potential_scale, as given
    equilibrium_potential_given_V: float | None = None   # on potential_scale, as given

    @property
    def rhe_minus_she_V(self):
        """U_RHE - U_SHE = (kT ln 10 / e) pH at the pathway temperature, V; None without a pH."""
        if self.pH is None:
            return None
        from adsorb.diagrams import nernst_slope_V

        return float(nernst_slope_V(self.temperature_K)) * self.pH


PAIR = "(H+ + e-)"


def _species_map(t, key, ctx, surface):
    m = t.number_map(key, required=True, positive=True)
    if m is None:
        return None
    if not m:
        t.problem(key, "empty", "at least one species with a count > 0")
        return None
    known = set(ctx["gases"]) | set(ctx["adsorbates"]) | {"*"}
    ok = True
    for name in m:
        if name not in known:
            t.problem(f"{key}.{name}", f"unknown species {name!r}{t.suggest(name, known)}",
                      "a gas, an adsorbate or '*' (the empty site)")
            ok = False
        elif (name in ctx["adsorbates"] and ctx["adsorbates"][name].surface != surface
              and ctx["adsorbates"][name].surface in ctx["surfaces"]):
            t.problem(f"{key}.{name}", f"adsorbate {name!r} is on surface {ctx['adsorbates'][name].surface!r}",
                      f"adsorbates on the pathway's surface {surface!r}")
            ok = False
    return m if ok else None


def _composition_of(name, ctx):
    if name == "*":
        return {}
    spec = ctx["gases"].get(name) or ctx["adsorbates"].get(name)
    return dict(spec.composition) if spec is not None and spec.composition is not None else None


def _check_balance(t, react, prod, pairs, ctx):
    """Atoms and surface cells conserved; returns False when a composition is unknown."""
    cells = lambda m: sum(v for k, v in m.items() if k == "*" or k in ctx["adsorbates"])  # noqa: E731
    if abs(cells(react) - cells(prod)) > 1e-9:
        t.problem("products", f"surface cells not conserved ({cells(react):g} before, {cells(prod):g} after)",
                  "as many adsorbates + '*' after the step as before (each adsorbate energy includes one slab)")
    totals = []
    for m, extra in ((react, pairs), (prod, 0.0)):
        tot = {"H": extra} if extra else {}
        for name, n in m.items():
            comp = _composition_of(name, ctx)
            if comp is None:
                return False
            for el, k in comp.items():
                tot[el] = tot.get(el, 0.0) + n * k
        totals.append({k: v for k, v in tot.items() if abs(v) > 1e-9})
    bad = {el for el in set(totals[0]) | set(totals[1]) if abs(totals[0].get(el, 0) - totals[1].get(el, 0)) > 1e-9}
    if bad:
        show = lambda d: " ".join(f"{k}{v:g}" for k, v in sorted(d.items())) or "nothing"  # noqa: E731
        t.problem("products", f"unbalanced step: reactants {show(totals[0])}"
                  f"{' (with the H+ + e- pairs)' if pairs else ''}, products {show(totals[1])}",
                  "the same atoms on both sides")
    return True


def _states(steps, start):
    """States of the diagram: start, then each step applied; the minimal start that makes every step possible."""
    def apply(state, s):
        out = dict(state)
        for k, v in s.reactants:
            out[k] = out.get(k, 0.0) - v
        if s.proton_electron_pairs:
            out[PAIR] = out.get(PAIR, 0.0) - s.proton_electron_pairs
        for k, v in s.products:
            out[k] = out.get(k, 0.0) + v
        return out

    if start is None:
        start, net = {}, {}
        for s in steps:
            need = dict(s.reactants)
            if s.proton_electron_pairs:
                need[PAIR] = need.get(PAIR, 0.0) + s.proton_electron_pairs
            for k, v in need.items():
                start[k] = max(start.get(k, 0.0), v - net.get(k, 0.0))
            net = apply(net, s)
    states = [dict(start)]
    for s in steps:
        states.append(apply(states[-1], s))
    return states


def read_pathways(root, ctx):
    out = {}
    for name, t in root.tables("pathways"):
        t.allow(("kind", "surface", "description", "temperature_K", "pressures_<p>", "potentials_V",
                 "potential_scale", "pH", "limiting_potential", "equilibrium_potential_V", "hydrogen_gas", "start",
                 "steps"))
        kind = t.string("kind", required=True, choices=("thermal", "electrochemical"))
        surface = t.string("surface", required=True)
        if surface is not None and surface not in ctx["surfaces"]:
            t.problem("surface", f"unknown surface {surface!r}{t.suggest(surface, ctx['surfaces'])}", "a name from [surfaces]")
        electro = kind == "electrochemical"
        temperature = t.number("temperature_K", default=298.15, positive=True)
        scale, ph = _scale_and_ph(t, electro)
        pot = t.numbers("potentials_V")
        if pot is not None and not electro:
            t.problem("potentials_V", "potentials on a thermal pathway", "kind = 'electrochemical' for potentials")
        for i, u in enumerate(pot or []):
            if abs(u) > 5:
                t.problem(f"potentials_V.{i}", f"{u:g} V", f"electrode potentials between -5 and 5 V vs {scale}")
        u_eq = t.number("equilibrium_potential_V")
        if u_eq is not None and not electro:
            t.problem("equilibrium_potential_V", "an equilibrium potential on a thermal pathway",
                      "kind = 'electrochemical' for potentials")
        h2 = t.string("hydrogen_gas", default="H2" if electro else None)
        if electro and h2 not in ctx["gases"]:
            t.problem("hydrogen_gas", f"gas {h2!r} not defined", "the [gases] name of H2 (for the hydrogen electrode)")
        pmap, pkey = t.unit_map("pressures")
        for g in pmap or {}:
            if g not in ctx["gases"]:
                t.problem(f"{pkey}.{g}", f"unknown gas {g!r}{t.suggest(g, ctx['gases'])}", "a name from [gases]")
        steps, checked = [], True
        items = t.table_list("steps")
        if not items:
            t.problem("steps", "no steps", "an array of {reactants = {...}, products = {...}} tables")
        for st in items:
            st.allow(("reactants", "products", "proton_electron_pairs", "label"))
            react, prod = _species_map(st, "reactants", ctx, surface), _species_map(st, "products", ctx, surface)
            pairs = st.integer("proton_electron_pairs", default=0)
            if pairs and not electro:
                st.problem("proton_electron_pairs", "proton-electron pairs on a thermal step",
                           "kind = 'electrochemical' on the pathway, or no pairs")
            if react is None or prod is None:
                continue
            checked &= _check_balance(st, react, prod, (pairs or 0) if electro else 0, ctx)
            steps.append(StepSpec(tuple(react.items()), tuple(prod.items()), pairs or 0.0, st.string("label") or ""))
        start = t.number_map("start", positive=True) if t.has("start") else None
        if start is not None:
            for k in start:
                if k not in set(ctx["gases"]) | set(ctx["adsorbates"]) | {"*", PAIR}:
                    t.problem(f"start.{k}", f"unknown species {k!r}", f"a species name, '*' or '{PAIR}'")
        states = _states(steps, start) if len(steps) == len(items) else []
        for i, s in enumerate(states):
            neg = [k for k, v in s.items() if v < -1e-9]
            if neg:
                t.problem(f"steps.{i - 1}", f"uses {', '.join(neg)} not present in the state before it", "steps that follow on")
        states = tuple(tuple((k, v) for k, v in s.items() if abs(v) > 1e-9) for s in states)
        given = tuple(pot if pot is not None else ([0.0] if electro else []))
        # potentials are kept on the RHE scale for the diagram: U_RHE = U_SHE + (kT ln 10 / e) pH
        # (computational hydrogen electrode, Norskov et al., J. Phys. Chem. B 2004, 108, 17886)
        shift = 0.0
        if scale == "SHE" and ph is not None and temperature is not None:
            from adsorb.diagrams import nernst_slope_V

            shift = float(nernst_slope_V(temperature)) * ph
        out[name] = PathwaySpec(
            name=name, kind=kind or "thermal", surface=surface or "", steps=tuple(steps), states=states,
            temperature_K=temperature if temperature is not None else 298.15,
            pressures_Pa=tuple((pmap or {}).items()), potentials_V=tuple(u + shift for u in given),
            limiting_potential=t.boolean("limiting_potential", default=electro),
            equilibrium_potential_V=None if u_eq is None else u_eq + shift, hydrogen_gas=h2 if electro else None,
            balance_checked=checked, description=t.string("description") or "", potential_scale=scale,
            pH=ph, potentials_given_V=given, equilibrium_potential_given_V=u_eq)
    return out


SCALES = ("RHE", "SHE")


def _scale_and_ph(t, electro):
    """``potential_scale`` and ``pH`` of a pathway (electrochemical only; SHE needs a pH in [0, 14])."""
    for key in ("potential_scale", "pH"):
        if t.has(key) and not electro:
            t.problem(key, f"{key} on a thermal pathway", "kind = 'electrochemical' for potentials")
    scale = t.string("potential_scale", default="RHE", choices=SCALES) or "RHE"
    ph = t.number("pH")
    if ph is not None and not 0.0 <= ph <= 14.0:
        t.problem("pH", f"got {ph:g}", "a pH between 0 and 14")
        ph = None
    elif ph is None and scale == "SHE" and electro and not t.has("pH"):
        t.problem("pH", "missing for potential_scale = 'SHE'",
                  "the pH of the electrolyte (0 to 14), which places the SHE against the RHE")
    return scale, ph


def cross_checks(root, gases, adsorbates, surfaces):
    """Checks between sections: interaction symmetry, anchors, precursors and mobile-model site areas."""
    for name, a in adsorbates.items():
        where = f"adsorbates.{name}"
        for other, eps in a.interactions_eV:
            b = adsorbates.get(other)
            back = dict(b.interactions_eV).get(name) if b else None
            if b is not None and back is not None and not math.isclose(back, eps, rel_tol=1e-9, abs_tol=1e-12):
                root.problem(f"{where}.interactions_eV.{other}", f"{eps} eV but adsorbates.{other}.interactions_eV.{name} "
                             f"is {back} eV", "a symmetric interaction (the same value both ways, or give it once)")
            if b is not None and b.surface != a.surface:
                root.problem(f"{where}.interactions_eV.{other}", f"{other!r} is on surface {b.surface!r}, not {a.surface!r}",
                             "interactions only between adsorbates on the same surface")
        if a.in_coverages and a.gas is None:
            root.problem(f"{where}.in_coverages", "true but no gas precursor", "gas = NAME of the gas it adsorbs from")
        if a.gas in gases and gases[a.gas].anchor is not None and a.in_coverages:
            root.problem(f"{where}.gas", f"gas {a.gas!r} has a gibbs_anchor (pathway use only)",
                         "a gas with its own electronic energy for coverages")
        if a.gas in gases and a.composition is not None and gases[a.gas].composition is not None:
            g, s = dict(gases[a.gas].composition), dict(a.composition)
            n = 2 if a.dissociative else 1
            if {k: n * v for k, v in s.items()} != g:
                root.problem(f"{where}.gas", f"{'2 x ' if n == 2 else ''}{_fmt(s)} is not the composition of {a.gas} ({_fmt(g)})",
                             "the adsorbed fragment(s) of the gas precursor (check dissociative)")
        surf = surfaces.get(a.surface)
        p = dict(a.parameters)
        from adsorb.adsorbate import MOBILE_MODELS

        if a.model in MOBILE_MODELS and "site_spacing" not in p and "site_area" not in p:
            if surf is None or surf.site_area_A2 is None:
                root.problem(f"{where}.site_area_A2", f"model {a.model!r} needs the area per site",
                             f"site_area_A2 or site_spacing_A here, or surfaces.{a.surface}.site_area_A2")
    for name, g in gases.items():
        if g.anchor is not None:
            for other, _ in g.anchor.species:
                if other not in gases or other == name:
                    root.problem(f"gases.{name}.gibbs_anchor.species.{other}", f"unknown gas {other!r}",
                                 "other gas names of this case")
                elif gases[other].anchor is not None:
                    root.problem(f"gases.{name}.gibbs_anchor.species.{other}", "an anchored gas refers to another anchored gas",
                                 "gases with their own energies")


def coverage_pressures(root, conditions, gases, adsorbates, outputs):
    """Every gas that feeds a coverage calculation needs a partial pressure."""
    if not (outputs.coverages or outputs.curves or outputs.isobars):
        return
    for name, a in adsorbates.items():
        if a.in_coverages and a.gas in gases and a.gas not in conditions.pressures_Pa:
            root.problem("conditions.partial_pressures_bar", f"no pressure for gas {a.gas!r} (adsorbates.{name} "
                         "adsorbs from it)", f"a partial pressure of {a.gas}, or in_coverages = false on the adsorbate")


def try_objects(root, gases, adsorbates, surfaces):
    """Build the library objects of entries without problems so far: their own checks become case problems."""
    from adsorb.study import build_adsorbate, build_gas

    for section, specs, build in (("gases", gases, build_gas),
                                  ("adsorbates", adsorbates, lambda a: build_adsorbate(a, surfaces))):
        for name, spec in specs.items():
            where = f"{section}.{name}"
            if any(f": {where}." in p or p.endswith(f": {where}") for p in root.problems):
                continue
            try:
                with warnings.catch_warnings():   # model warnings are collected when the study runs
                    warnings.simplefilter("ignore", UserWarning)
                    build(spec)
            except InputError as exc:
                root.problem(where, str(exc).splitlines()[0], f"inputs that {'GasMolecule' if section == 'gases' else 'Adsorbate'} accepts")


def _fmt(counts):
    return "".join(f"{k}{v if v != 1 else ''}" for k, v in sorted(counts.items())) or "nothing"

