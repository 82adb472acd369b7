"""The results folder of a study: results.json, CSV tables, plots and one self-contained HTML page.

:func:`results_document` turns a :class:`adsorb.study.StudyResult` into plain
JSON-ready data (every number with its unit in the key name), documented in
``docs/report.md``; :func:`validate_results` checks a document against that
structure. :func:`write_results` writes the whole folder (every file through
:mod:`adsorb.fileout`, atomic).
The HTML page is built by :mod:`adsorb.report_html`; plots by
:mod:`adsorb.report_plots`.
"""

from __future__ import annotations

import csv
import importlib.metadata
import io
import math
import platform
import re
from datetime import datetime, timezone

import numpy as np

from adsorb import constants as C
from adsorb.errors import InputError
from adsorb.fileout import write_json_atomic, write_text_atomic
from adsorb.report_outputs import output_assumptions, output_sections, validate_outputs

__all__ = ["SCHEMA", "ASSUMPTIONS", "CAUTIONS", "results_document", "validate_results", "write_results"]

SCHEMA = "adsorb-results/1"

ASSUMPTIONS = (
    "Gas molecules are ideal gases in the rigid-rotor-harmonic-oscillator model; with fugacity = "
    "'peng-robinson' the partial pressures in the site balances are replaced by Peng-Robinson fugacities "
    "(Peng and Robinson, Ind. Eng. Chem. Fundam. 1976, 15, 59).",
    "Adsorbates: harmonic vibrations, or hindered translator/rotor (Sprowl, Campbell and Arnadottir, "
    "J. Phys. Chem. C 2016, 120, 9719) or 2D ideal gas (Campbell, Sprowl and Arnadottir, J. Phys. Chem. C 2016, "
    "120, 10283) for the soft modes, as named per adsorbate; slab atoms frozen, the clean slab has no thermal part.",
    "Coverages: Langmuir site balances (one adsorbate per site unless 'sites' says otherwise), lateral "
    "interactions in the mean-field (Bragg-Williams / Fowler-Guggenheim) approximation.",
    "Equilibrium constants K are in Pa^-1 for the site balance theta_A/theta_* = K p (molecular) or "
    "(theta_A/theta_*)^2 = K p (dissociative); dG° and K° are reported at the named adsorbate standard state "
    "and p° = 1 bar for gases.",
    "Free-energy diagrams use the computational hydrogen electrode (Norskov et al., J. Phys. Chem. B 2004, 108, "
    "17886): mu(H+ + e-) = 1/2 mu(H2, 1 bar) - eU, U vs RHE, or - eU_SHE - kT ln(10) pH vs SHE, so that "
    "U_RHE = U_SHE + (kT ln 10 / e) pH; no configurational entropy of adsorbates.",
)

CAUTIONS = (
    "These results rest on ideal-gas, harmonic and mean-field approximations and on the electronic energies "
    "supplied; their errors (typically 0.1-0.2 eV in adsorption energies) dominate the uncertainty.",
    "High-temperature and high-pressure process work (reactor design, safety margins, equipment ratings) "
    "defers to local codes and licensed engineering practice; this report is not a design basis.",
    "Numbers labelled invented in the case file are not measurements or calculations of a real system.",
)


def _list(a):
    return np.asarray(a, dtype=float).tolist()


def _thermo(table):
    return {"temperature_K": _list(table.temperature), "gibbs_eV": _list(table.gibbs),
            "enthalpy_eV": _list(table.enthalpy), "entropy_eV_K": _list(table.entropy),
            "entropy_J_mol_K": _list(table.entropy_j_mol_k), "heat_capacity_J_mol_K": _list(table.heat_capacity_j_mol_k),
            "zpe_eV": _list(table.zpe)}


def _versions():
    import scipy

    from adsorb import __version__

    # the installed distribution's version, read without importing ASE (ASE only in geometry and io)
    return {"adsorb": __version__, "numpy": np.__version__, "scipy": scipy.__version__,
            "ase": importlib.metadata.version("ase"), "python": platform.python_version()}


def _clean(value):
    """JSON-safe copy: numpy to Python, non-finite floats to None."""
    if isinstance(value, dict):
        return {str(k): _clean(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [_clean(v) for v in value]
    if isinstance(value, np.ndarray):
        return _clean(value.tolist())
    if isinstance(value, (np.bool_, bool)):
        return bool(value)
    if isinstance(value, (np.integer, int)):
        return int(value)
    if isinstance(value, (np.floating, float)):
        return float(value) if math.isfinite(value) else None
    return value


def _curve(run):
    return {"surface": run.surface, "gas": run.gas, "species": list(run.species), "interactions": run.interactions,
            "fugacity": run.fugacity, "temperature_K": _list(run.temperature_K), "pressure_Pa": _list(run.pressure_Pa),
            "coverage_ML": {s: _list(run.coverage[i]) for i, s in enumerate(run.species)},
            "empty_sites_ML": _list(run.empty)}


def _electrode_text(spec, run):
    """The computational hydrogen electrode relation used by an electrochemical pathway (None if thermal)."""
    if run.kind != "electrochemical":
        return None
    text = f"mu(H+ + e-) = 1/2 mu({spec.hydrogen_gas}, 1 bar) - eU, U vs RHE"
    if run.rhe_minus_she_V is not None:
        text += (f"; vs SHE: - eU_SHE - kT ln(10) pH at pH {run.pH:g}, so U_RHE = U_SHE + "
                 f"{run.rhe_minus_she_V:.4f} V at {spec.temperature_K:g} K")
    if run.potential_scale == "SHE":
        text += "; potentials given vs SHE"
    return text


def results_document(result, *, files=None) -> dict:
    """The results.json content of a :class:`~adsorb.study.StudyResult` (structure: docs/report.md)."""
    case = result.case
    cond = case.conditions
    gases = {}
    for n, g in case.gases.items():
        gases[n] = {"energy_eV": g.energy_eV if g.anchor is None else None, "frequencies_cm": list(g.frequencies_cm),
                    "source": g.source, "choices": result.gas_tables[n].choices if n in result.gas_tables else {},
                    "critical_constants": None if g.critical is None else {
                        "critical_temperature_K": g.critical[0], "critical_pressure_Pa": g.critical[1],
                        "acentric_factor": g.critical[2], "source": g.critical[3]},
                    "gibbs_anchor": None if g.anchor is None else {
                        "species": dict(g.anchor.species), "offset_eV": g.anchor.offset_eV, "source": g.anchor.source},
                    "thermo_1bar": _thermo(result.gas_tables[n]) if n in result.gas_tables else None}
    adsorbates = {}
    for n, a in case.adsorbates.items():
        table = result.adsorbate_tables[n]
        adsorbates[n] = {"surface": a.surface, "gas": a.gas, "dissociative": a.dissociative, "sites": a.sites,
                         "model": a.model, "energy_eV": a.energy_eV, "frequencies_cm": list(a.frequencies_cm),
                         "interactions_eV": dict(a.interactions_eV), "source": a.source, "choices": table.choices,
                         "thermo": _thermo(table)}
    equilibria = {}
    for n, eq in result.equilibria.items():
        d = eq.as_dict()
        d.update(adsorbate=n, gas=case.adsorbates[n].gas, surface=case.adsorbates[n].surface,
                 model=case.adsorbates[n].model)
        equilibria[n] = d
    coverages = [{"surface": r.surface, "species": list(r.species), "gases": list(r.gases),
                  "interactions": r.interactions, "fugacity": r.fugacity, "temperature_K": _list(r.temperature_K),
                  "partial_pressures_Pa": {s: float(p) for s, p in zip(r.species, r.pressures_Pa)},
                  "fugacities_Pa": {s: _list(r.fugacities_Pa[i]) for i, s in enumerate(r.species)},
                  "coverage_ML": {s: _list(r.coverage[i]) for i, s in enumerate(r.species)},
                  "empty_sites_ML": _list(r.empty), "multiple_solutions": np.asarray(r.multiple_solutions).tolist()}
                 for r in result.coverages]
    pathways = []
    for run in result.pathways:
        spec = case.pathways[run.name]
        p = run.pathway
        pathways.append({"name": run.name, "kind": run.kind, "surface": spec.surface, "description": spec.description,
                         "temperature_K": spec.temperature_K, "pressures_Pa": dict(spec.pressures_Pa),
                         "labels": list(p.labels), "pairs_consumed": list(p.pairs_consumed),
                         "potentials_V_RHE": list(run.potentials_V),
                         "state_gibbs_eV": [list(g) for g in run.state_gibbs_eV],
                         "step_gibbs_eV_at_0V_RHE": _list(p.step_gibbs), "step_details": list(p.details),
                         "hydrogen_electrode": _electrode_text(spec, run),
                         "summary": run.summary,
                         "potential_scale": run.potential_scale if run.kind == "electrochemical" else None,
                         "pH": run.pH, "rhe_minus_she_V": run.rhe_minus_she_V,
                         "potentials_V": list(run.potentials_on_scale_V),
                         "limiting_potential_V": run.summary.get("limiting_potential_V"),
                         "equilibrium_potential_V": run.summary.get("equilibrium_potential_V")})
    doc = {
        "schema": SCHEMA,
        "created_utc": datetime.now(timezone.utc).isoformat(timespec="seconds"),
        "case": {"file": str(case.path), "title": case.title, "description": case.description.strip(),
                 "notes": list(case.notes)},
        "inputs": [{"path": p, "sha256": h} for p, h in case.input_files],
        "versions": _versions(),
        "units": {"energy": "eV per molecule (kJ/mol where the key says so)", "temperature": "K", "pressure": "Pa",
                  "entropy": "eV/K per molecule (J/(mol K) where the key says so)", "frequency": "cm^-1",
                  "coverage": "ML: adsorbed molecules (atoms, for dissociative species) per site",
                  "equilibrium_constant": "Pa^-1 (K), dimensionless (K°)",
                  "potential": "V vs RHE (keys ending _V_RHE); potentials_V on each pathway's potential_scale"},
        "conditions": {"temperature_K": _list(result.temperatures_K),
                       "partial_pressures_Pa": dict(cond.pressures_Pa), "fugacity": cond.fugacity,
                       "default_standard_state": cond.standard_state, "gas_standard_pressure_Pa": C.P_STANDARD},
        "gases": gases,
        "surfaces": {n: {"energy_eV": s.energy_eV, "site_area_A2": s.site_area_A2, "source": s.source}
                     for n, s in case.surfaces.items()},
        "adsorbates": adsorbates,
        "equilibria": equilibria,
        "coverages": coverages,
        "isotherms": [_curve(c) for c in result.curves if c.kind == "isotherm"],
        "maps": [_curve(c) for c in result.curves if c.kind == "map"],
        "pathways": pathways,
        "model_comparison": None if result.comparison is None else result.comparison.as_dict(),
        **output_sections(result, (files or {}).get("nasa")),
        "assumptions": list(ASSUMPTIONS) + output_assumptions(result),
        "cautions": list(CAUTIONS),
        "warnings": list(result.warnings),
        "notes": list(result.notes),
        "files": files or {"tables": [], "plots": [], "report": "report.html"},
    }
    return _clean(doc)


# ------------------------------------------------------------------ validation
_TOP = {"schema": str, "created_utc": str, "case": dict, "inputs": list, "versions": dict, "units": dict,
        "conditions": dict, "gases": dict, "surfaces": dict, "adsorbates": dict, "equilibria": dict,
        "coverages": list, "isotherms": list, "maps": list, "pathways": list, "model_comparison": (dict, type(None)),
        "assumptions": list, "cautions": list, "warnings": list, "notes": list, "files": dict}


def _numbers(x):
    if isinstance(x, list):
        return all(_numbers(v) for v in x)
    return isinstance(x, (int, float)) and not isinstance(x, bool) and math.isfinite(x)


def validate_results(data) -> None:
    """Check a results.json document against the documented structure (docs/report.md).

    Raises
    ------
    InputError
        Listing every problem found (missing or mistyped keys, non-numeric
        arrays, arrays whose length does not match their temperatures, bad
        hashes, missing versions).
    """
    bad = []
    if not isinstance(data, dict):
        raise InputError(f"results: expected a JSON object, got {type(data).__name__}")
    for key, kind in _TOP.items():
        if key not in data:
            bad.append(f"missing key {key!r}")
        elif not isinstance(data[key], kind):
            bad.append(f"{key}: expected {kind}, got {type(data[key]).__name__}")
    if bad:
        raise InputError("results: " + "; ".join(bad))
    if data["schema"] != SCHEMA:
        bad.append(f"schema: expected {SCHEMA!r}, got {data['schema']!r}")
    for k in ("adsorb", "numpy", "scipy", "ase"):
        if not isinstance(data["versions"].get(k), str):
            bad.append(f"versions.{k}: expected a version string")
    if not data["inputs"] or not all(isinstance(i, dict) and re.fullmatch(r"[0-9a-f]{64}", str(i.get("sha256")))
                                     and isinstance(i.get("path"), str) for i in data["inputs"]):
        bad.append("inputs: expected [{path, sha256 (64 hex digits)}, ...] starting with the case file")
    temps = data["conditions"].get("temperature_K")
    if not (isinstance(temps, list) and temps and _numbers(temps)):
        bad.append("conditions.temperature_K: expected a non-empty list of numbers")
    for section, key in (("gases", "thermo_1bar"), ("adsorbates", "thermo")):
        for name, entry in data[section].items():
            th = entry.get(key)
            if th is None and section == "gases" and entry.get("gibbs_anchor") is not None:
                continue
            if not isinstance(th, dict) or not all(_numbers(th.get(c)) and len(th[c]) == len(th["temperature_K"])
                                                   for c in ("temperature_K", "gibbs_eV", "entropy_J_mol_K")):
                bad.append(f"{section}.{name}.{key}: expected equal-length number lists temperature_K, gibbs_eV, ...")
    for name, eq in data["equilibria"].items():
        for c in ("delta_gibbs_eV", "equilibrium_constant_per_Pa", "delta_gibbs_standard_eV"):
            if not _numbers(eq.get(c)):
                bad.append(f"equilibria.{name}.{c}: expected a list of numbers")
        if not isinstance(eq.get("standard_state"), str):
            bad.append(f"equilibria.{name}.standard_state: expected the name of the standard state")
    for i, run in enumerate(data["coverages"]):
        n = len(run.get("temperature_K", []))
        cov = run.get("coverage_ML", {})
        if not cov or not all(_numbers(v) and len(v) == n and all(-1e-12 <= x <= 1 + 1e-12 for x in v)
                              for v in cov.values()):
            bad.append(f"coverages.{i}.coverage_ML: expected per species {n} coverages in [0, 1]")
        if run.get("fugacity") not in ("ideal", "peng-robinson") or not isinstance(run.get("interactions"), bool):
            bad.append(f"coverages.{i}: expected fugacity 'ideal'|'peng-robinson' and interactions true|false")
    for section in ("isotherms", "maps"):
        for i, run in enumerate(data[section]):
            shape = (len(run.get("temperature_K", [])), len(run.get("pressure_Pa", [])))
            for s, v in run.get("coverage_ML", {}).items():
                if not (_numbers(v) and np.shape(v) == shape):
                    bad.append(f"{section}.{i}.coverage_ML.{s}: expected a {shape[0]} x {shape[1]} array")
    for i, p in enumerate(data["pathways"]):
        n = len(p.get("labels", []))
        g = p.get("state_gibbs_eV", [])
        if n < 2 or len(g) != len(p.get("potentials_V_RHE", [])) or not all(_numbers(r) and len(r) == n for r in g):
            bad.append(f"pathways.{i}: expected one list of {n} state energies (eV) per potential")
        if p.get("kind") not in ("thermal", "electrochemical"):
            bad.append(f"pathways.{i}.kind: expected 'thermal' or 'electrochemical'")
        bad += _check_scale(i, p)
    if not data["assumptions"] or not data["cautions"]:
        bad.append("assumptions and cautions: expected non-empty lists")
    bad += validate_outputs(data)
    if bad:
        raise InputError("results: " + "; ".join(bad))


def _check_scale(i, p):
    """Potential scale, pH and the RHE/SHE relation of one pathway entry (keys absent in older documents)."""
    bad = []
    if "potential_scale" not in p:
        return bad
    electro = p.get("kind") == "electrochemical"
    if p["potential_scale"] not in (("RHE", "SHE") if electro else (None,)):
        bad.append(f"pathways.{i}.potential_scale: expected 'RHE' or 'SHE' (electrochemical) or null (thermal)")
    ph, shift = p.get("pH"), p.get("rhe_minus_she_V")
    if ph is not None and not (_numbers(ph) and 0 <= ph <= 14):
        bad.append(f"pathways.{i}.pH: expected null or a number in [0, 14]")
    if p["potential_scale"] == "SHE" and (ph is None or not _numbers(shift)):
        bad.append(f"pathways.{i}: the SHE scale needs pH and rhe_minus_she_V")
    u, u_rhe = p.get("potentials_V", []), p.get("potentials_V_RHE", [])
    if not (_numbers(u) and len(u) == len(u_rhe)):
        bad.append(f"pathways.{i}.potentials_V: expected {len(u_rhe)} potentials (V) on the pathway's scale")
    elif p["potential_scale"] == "SHE" and _numbers(shift) and not all(
            abs(a + shift - b) <= 1e-9 for a, b in zip(u, u_rhe)):
        bad.append(f"pathways.{i}.potentials_V: expected potentials_V_RHE - rhe_minus_she_V (U_RHE = U_SHE + "
                   "kT ln(10) pH / e)")
    return bad


# ------------------------------------------------------------------ files
def slug(text) -> str:
    """A file-name-safe version of a species or surface name ('Mx(0001)' -> 'Mx_0001')."""
    s = re.sub(r"[^A-Za-z0-9]+", "_", str(text).replace("*", "_ads")).strip("_")
    return s or "x"


def _write_csv(path, header, rows):
    buffer = io.StringIO()
    w = csv.writer(buffer, lineterminator="\n")
    w.writerow(header)
    for row in rows:
        w.writerow([f"{v:.10g}" if isinstance(v, float) else v for v in row])
    write_text_atomic(path, buffer.getvalue())
    return path.name


def write_tables(result, folder) -> list:
    """CSV tables (columns: docs/report.md); returns the file names."""
    out = []
    case = result.case
    for kind, tables in (("gases", result.gas_tables), ("adsorbates", result.adsorbate_tables)):
        if tables:
            rows = [[n] + list(r.values()) for n, t in tables.items() for r in t.rows()]
            header = ["species"] + list(next(iter(tables.values())).rows()[0])
            out.append(_write_csv(folder / f"thermo_{kind}.csv", header, rows))
    if result.equilibria:
        keys = ("delta_energy_eV", "delta_zpe_eV", "delta_thermal_enthalpy_eV", "minus_T_delta_S_eV", "delta_gibbs_eV",
                "equilibrium_constant_per_Pa", "delta_gibbs_standard_eV", "standard_equilibrium_constant")
        rows = []
        for n, eq in result.equilibria.items():
            d = eq.as_dict()
            cols = [np.broadcast_to(np.asarray(d[k], dtype=float), np.shape(d["temperature_K"])) for k in keys]
            rows += [[n, case.adsorbates[n].gas, eq.standard_state, t] + [float(c[i]) for c in cols]
                     for i, t in enumerate(d["temperature_K"])]
        out.append(_write_csv(folder / "equilibria.csv", ["adsorbate", "gas", "standard_state", "temperature_K"]
                              + list(keys), rows))
    for r in result.coverages:
        name = f"coverages_{slug(r.surface)}_{slug(r.fugacity)}_{'interacting' if r.interactions else 'ideal_layer'}.csv"
        rows = [[float(t)] + [float(r.coverage[i, k]) for i in range(len(r.species))] + [float(r.empty[k])]
                for k, t in enumerate(r.temperature_K)]
        out.append(_write_csv(folder / name, ["temperature_K"] + [f"theta_{s}" for s in r.species] + ["theta_empty"],
                              rows))
    for j, c in enumerate(result.curves):
        rows = [[float(t), float(p)] + [float(c.coverage[i, a, b]) for i in range(len(c.species))]
                for a, t in enumerate(c.temperature_K) for b, p in enumerate(c.pressure_Pa)]
        out.append(_write_csv(folder / f"{c.kind}_{j}_{slug(c.gas)}.csv",
                              ["temperature_K", f"pressure_{c.gas}_Pa"] + [f"theta_{s}" for s in c.species], rows))
    for run in result.pathways:
        header = ["state", "label", "pairs_consumed_so_far"] + [f"gibbs_eV_at_{u:.3f}_V_RHE" for u in run.potentials_V]
        extra = run.potential_scale == "SHE"
        if extra:   # the same energies again, headed by the potentials on the case's own scale
            header += [f"gibbs_eV_at_{u:.3f}_V_SHE_pH_{run.pH:g}" for u in run.potentials_on_scale_V]
        pairs = run.pathway.cumulative_pairs
        rows = [[i, lab, int(pairs[i])] + [g[i] for g in run.state_gibbs_eV] * (2 if extra else 1)
                for i, lab in enumerate(run.pathway.labels)]
        out.append(_write_csv(folder / f"pathway_{slug(run.name)}.csv", header, rows))
    if result.comparison is not None:
        cmp = result.comparison
        rows = [[r.model, float(t), float(C.to_j_per_mol_k(r.entropy[k])), float(r.gibbs[k]),
                 float(C.to_j_per_mol_k(r.site_entropy[k])),
                 "" if r.deviation is None else float(r.deviation[k])]
                for r in cmp.results for k, t in enumerate(np.ravel(cmp.temperature))]
        out.append(_write_csv(folder / "model_comparison.csv", ["model", "temperature_K", "standard_entropy_J_mol_K",
                                                                "standard_gibbs_eV", "site_entropy_J_mol_K",
                                                                "deviation_from_correlation_sd"], rows))
    return out


def write_results(result, folder) -> dict:
    """Write results.json, the CSV tables, the plots (PNG + SVG) and report.html into ``folder``.

    Returns the results document (already validated).
    """
    from pathlib import Path

    from adsorb.report_html import write_html
    from adsorb.report_plots import write_plots

    folder = Path(folder)
    folder.mkdir(parents=True, exist_ok=True)
    from adsorb.report_outputs import write_output_files

    tables = write_tables(result, folder) if result.case.outputs.thermo_tables else []
    extra, nasa = write_output_files(result, folder, tables=result.case.outputs.thermo_tables)
    plots = write_plots(result, folder) if result.case.outputs.plots else []
    doc = results_document(result, files={"tables": tables + extra, "plots": [p for _, _, p in plots],
                                          "report": "report.html", "results": "results.json", "nasa": nasa})
    validate_results(doc)
    write_json_atomic(folder / "results.json", doc)
    write_html(doc, plots, folder / "report.html", case_text=result.case.path.read_text(encoding="utf-8"))
    return doc
