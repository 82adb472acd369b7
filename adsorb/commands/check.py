"""``adsorb check CASE.toml``: validate a case file and print what ``adsorb run`` would compute.

Exit status 0 when the case is valid; 2 with one line on stderr per problem
(``FILE: KEY.PATH: what is wrong; expected ...``) otherwise. Nothing is
computed and nothing is written.
"""

from __future__ import annotations

import argparse
import sys


def add_arguments(parser: argparse.ArgumentParser) -> None:
    """Options of ``adsorb check`` (nothing heavy imported here)."""
    parser.add_argument("case", help="TOML case file (see docs/case-file.md)")


def _range(values, unit):
    values = list(values)
    if not values:
        return "none"
    if len(values) == 1:
        return f"{values[0]:g} {unit}"
    return f"{min(values):g}-{max(values):g} {unit} ({len(values)} values)"


def summary(case) -> list:
    """Lines describing what a validated case will compute."""
    c, out = case.conditions, case.outputs
    lines = [f"case: {case.path}", f"title: {case.title}",
             f"temperatures: {_range(c.temperatures_K, 'K')}",
             "pressures: " + (", ".join(f"{g} {p / 1e5:g} bar" for g, p in c.pressures_Pa.items()) or "none"),
             f"fugacity: {c.fugacity}",
             f"gases ({len(case.gases)}): " + ", ".join(
                 f"{n}{' (anchored)' if g.anchor else ''}" for n, g in case.gases.items()),
             f"surfaces ({len(case.surfaces)}): " + ", ".join(case.surfaces)]
    lines.append(f"adsorbates ({len(case.adsorbates)}):")
    for n, a in case.adsorbates.items():
        origin = f"from {a.gas}{' (dissociative)' if a.dissociative else ''}" if a.gas else "no gas precursor"
        lines.append(f"  {n} on {a.surface}: model {a.model}, {len(a.frequencies_cm)} modes, {origin}"
                     + (", in coverages" if a.in_coverages else ""))
    surfaces = sorted({a.surface for a in case.adsorbates.values() if a.in_coverages})
    if out.coverages and surfaces:
        variants = {"off": "without", "on": "with", "both": "without and with"}[out.interactions]
        lines.append(f"coverages vs T on {', '.join(surfaces)}: {variants} lateral interactions, "
                     f"fugacities {', '.join(out.fugacities)}")
    for cv in out.curves:
        lines.append(f"{cv.kind} on {cv.surface}: p({cv.gas}) {_range([p / 1e5 for p in cv.pressures_Pa], 'bar')} "
                     f"at {_range(cv.temperatures_K, 'K')}")
    for iso in out.isobars:
        lines.append(f"isobar on {iso.surface}: p({iso.gas}) {_range([p / 1e5 for p in iso.pressures_Pa], 'bar')} "
                     f"over {_range(iso.temperatures_K, 'K')}, {'with' if iso.interactions else 'without'} interactions")
    for q in out.isosteric_heats:
        lines.append(f"isosteric heat of {q.adsorbate} on {q.surface}: {_range(q.coverages_ML, 'ML')} at "
                     f"{_range(q.temperatures_K, 'K')}, {'with' if q.interactions else 'without'} interactions")
    for d in out.tpd:
        lines.append(f"TPD of {d.adsorbate} on {d.surface}: {d.heating_rate_K_s:g} K/s from "
                     f"{_range(d.initial_coverages_ML, 'ML')}, {d.temperature_start_K:g}-{d.temperature_end_K:g} K")
    if out.nasa is not None:
        lines.append(f"NASA polynomials: {', '.join(out.nasa.species)} over {_range(out.nasa.temperatures_K, 'K')}")
    for p in case.pathways.values():
        extra = ""
        if p.kind == "electrochemical":
            scale = p.potential_scale + (f", pH {p.pH:g}" if p.pH is not None else "")
            extra = f", potentials {', '.join(f'{u:g}' for u in p.potentials_given_V)} V vs {scale}"
        extra += " + limiting potential" if p.limiting_potential else ""
        balance = "balanced" if p.balance_checked else "atom balance not checked (composition unknown)"
        lines.append(f"pathway {p.name} ({p.kind}, {len(p.steps)} steps on {p.surface} at {p.temperature_K:g} K"
                     f"{extra}; {balance})")
    if out.comparison is not None:
        lines.append(f"model comparison: {out.comparison.adsorbate} at {_range(out.comparison.temperatures_K, 'K')}, "
                     f"standard state {out.comparison.standard_state}")
    lines.append(f"input files: {len(case.input_files)} (hashed)")
    return lines


def run(args) -> int:
    from adsorb.case import CaseError, load_case

    try:
        case = load_case(args.case)
    except CaseError as exc:
        for line in exc.problems:
            print(f"adsorb check: error: {line}", file=sys.stderr)
        return 2
    print("\n".join(summary(case)))
    print("case is valid")
    return 0
