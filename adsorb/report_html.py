"""One self-contained HTML page from a results document: inputs, tables, plots, assumptions, cautions.

Images are embedded as base64 PNG data URIs; the page references no external
file, script or style sheet. Sections (docs/report.md): summary, cautions,
inputs (the case file echoed, input files with SHA-256), conditions, species,
equilibria, coverages, isotherms and maps, isobars, isosteric heats, TPD,
NASA polynomials, free-energy diagrams, model comparison, assumptions,
warnings, versions.
"""

from __future__ import annotations

import base64
from html import escape
from pathlib import Path

from adsorb.constants import EV_TO_KJ_MOL
from adsorb.fileout import write_text_atomic

__all__ = ["render_html", "write_html"]

_STYLE = """body{font-family:sans-serif;max-width:70em;margin:2em auto;padding:0 1em;color:#222}
table{border-collapse:collapse;margin:.5em 0 1.5em;font-size:.85em}td,th{border:1px solid #bbb;padding:.2em .5em;
text-align:right}th{background:#eee}td.l,th.l{text-align:left}pre{background:#f6f6f6;padding:.8em;overflow-x:auto;
font-size:.8em}.caution{background:#fff4e0;border-left:4px solid #e69500;padding:.5em 1em}
.warn{background:#fdeaea;border-left:4px solid #c33;padding:.5em 1em}img{max-width:100%}"""


def _fmt(v, digits=4):
    if isinstance(v, bool) or v is None:
        return escape(str(v))
    if isinstance(v, float):
        if abs(v) < 1e-10:   # round-off of an exact zero (e.g. a diagram at its equilibrium potential)
            return "0"
        return f"{v:.{digits}g}" if abs(v) >= 1e-3 else f"{v:.3e}"
    return escape(str(v))


def _table(header, rows, left=1):
    h = "".join(f"<th class='l'>{escape(str(x))}</th>" if i < left else f"<th>{escape(str(x))}</th>"
                for i, x in enumerate(header))
    body = "".join("<tr>" + "".join(f"<td class='l'>{_fmt(x)}</td>" if i < left else f"<td>{_fmt(x)}</td>"
                                    for i, x in enumerate(r)) + "</tr>" for r in rows)
    return f"<table><tr>{h}</tr>{body}</table>"


def _items(values, cls=None):
    if not values:
        return "<p>None.</p>"
    inner = "<ul>" + "".join(f"<li>{escape(str(v))}</li>" for v in values) + "</ul>"
    return f"<div class='{cls}'>{inner}</div>" if cls else inner


def _pick(n, count=9):
    """Indices of at most ``count`` evenly spread rows out of n."""
    if n <= count:
        return list(range(n))
    return sorted({round(i * (n - 1) / (count - 1)) for i in range(count)})


def render_html(doc, images) -> str:
    """The page as a string; ``images`` maps a plot title to its PNG bytes."""
    c = doc["case"]
    out = [f"<!DOCTYPE html><html lang='en'><head><meta charset='utf-8'><title>{escape(c['title'])}</title>"
           f"<style>{_STYLE}</style></head><body>", f"<h1>{escape(c['title'])}</h1>"]
    if c["description"]:
        out.append(f"<p>{escape(c['description'])}</p>")
    out.append(_items(c["notes"]))
    out.append("<h2>Cautions</h2>" + _items(doc["cautions"], "caution"))
    out.append("<h2>Warnings</h2>" + _items(doc["warnings"] + doc["notes"], "warn" if doc["warnings"] else None))

    out.append("<h2>Inputs</h2>" + _table(["file", "sha256"], [[i["path"], i["sha256"]] for i in doc["inputs"]], 2))
    out.append(f"<details><summary>Case file as run</summary><pre>{escape(doc.get('_case_text', ''))}</pre></details>")
    cond = doc["conditions"]
    t = cond["temperature_K"]
    out.append("<h2>Conditions</h2>" + _table(["quantity", "value"], [
        ["temperatures (K)", f"{min(t):g} to {max(t):g} ({len(t)} values)" if len(t) > 1 else f"{t[0]:g}"],
        ["fugacity model", cond["fugacity"]],
        ["gas standard pressure (Pa)", cond["gas_standard_pressure_Pa"]],
        ["default adsorbate standard state", cond["default_standard_state"] or "by model (lattice-half / savara-2d)"]]
        + [[f"partial pressure {g} (bar)", p / 1e5] for g, p in cond["partial_pressures_Pa"].items()]))

    out.append("<h2>Species</h2>")
    out.append(_table(["gas", "electronic energy (eV)", "frequencies (cm^-1)", "S°(first T) (J/mol/K)", "source"],
                      [[n, g["energy_eV"] if g["energy_eV"] is not None else "anchored",
                        ", ".join(f"{v:g}" for v in g["frequencies_cm"]),
                        g["thermo_1bar"]["entropy_J_mol_K"][0] if g["thermo_1bar"] else "-",
                        g["source"] or (f"G = {g['gibbs_anchor']['species']} + {g['gibbs_anchor']['offset_eV']:g} eV; "
                                        f"{g['gibbs_anchor']['source']}" if g["gibbs_anchor"] else "")]
                       for n, g in doc["gases"].items()]))
    out.append(_table(["surface", "energy (eV)", "site area (Å^2)", "source"],
                      [[n, s["energy_eV"], s["site_area_A2"] or "-", s["source"]] for n, s in doc["surfaces"].items()]))
    out.append(_table(["adsorbate", "surface", "gas", "model", "energy (eV)", "modes", "S(first T) (J/mol/K)"],
                      [[n, a["surface"], a["gas"] or "-", a["model"], a["energy_eV"], len(a["frequencies_cm"]),
                        a["thermo"]["entropy_J_mol_K"][0]] for n, a in doc["adsorbates"].items()]))

    if doc["equilibria"]:
        out.append("<h2>Adsorption equilibria</h2><p>dG per gas molecule (gas at 1 bar, per-site adsorbate "
                   "tables); K in Pa^-1; dG° at the named standard state.</p>")
        for n, e in doc["equilibria"].items():
            rows = [[e["temperature_K"][i], e["delta_energy_eV"], e["delta_zpe_eV"][i], e["minus_T_delta_S_eV"][i],
                     e["delta_gibbs_eV"][i], e["equilibrium_constant_per_Pa"][i], e["delta_gibbs_standard_eV"][i]]
                    for i in _pick(len(e["temperature_K"]))]
            out.append(f"<h3>{escape(n)} from {escape(str(e['gas']))} ({'dissociative' if e['adsorbed_per_gas_molecule'] == 2 else 'molecular'}"
                       f", model {escape(e['model'])}, standard state {escape(e['standard_state'])})</h3>")
            out.append(_table(["T (K)", "dE (eV)", "dZPE (eV)", "-TdS (eV)", "dG (eV)", "K (1/Pa)", "dG° (eV)"], rows))

    def figure(title):
        if title in images:
            data = base64.b64encode(images[title]).decode("ascii")
            out.append(f"<figure><img alt='{escape(title)}' src='data:image/png;base64,{data}'>"
                       f"<figcaption>{escape(title)}</figcaption></figure>")

    if doc["coverages"]:
        out.append("<h2>Coverages vs temperature</h2>")
        for title in [k for k in images if k.startswith("Coverages on")]:
            figure(title)
        for run in doc["coverages"]:
            sp = run["species"]
            out.append(f"<h3>{escape(run['surface'])}: {escape(run['fugacity'])} gas, "
                       f"{'mean-field interactions' if run['interactions'] else 'no lateral interactions'}</h3>")
            rows = [[run["temperature_K"][i]] + [run["coverage_ML"][s][i] for s in sp] + [run["empty_sites_ML"][i]]
                    for i in _pick(len(run["temperature_K"]))]
            out.append(_table(["T (K)"] + [f"θ {s}" for s in sp] + ["θ empty"], rows))
    if doc["isotherms"] or doc["maps"]:
        out.append("<h2>Isotherms and coverage maps</h2>")
        for title in [k for k in images if k.startswith(("Isotherms", "Coverage map"))]:
            figure(title)
    _outputs(doc, out, images, figure)
    if doc["pathways"]:
        out.append("<h2>Free-energy diagrams</h2>")
        for p in doc["pathways"]:
            out.append(f"<h3>{escape(p['name'])} ({escape(p['kind'])}, {p['temperature_K']:g} K)</h3>")
            if p["pressures_Pa"]:
                out.append("<p>Gas pressures in this diagram (others at 1 bar): " + ", ".join(
                    f"{escape(g)} {v / 1e5:g} bar" for g, v in p["pressures_Pa"].items()) + ".</p>")
            if p["hydrogen_electrode"]:
                out.append(f"<p>Computational hydrogen electrode: {escape(p['hydrogen_electrode'])}.</p>")
            scale = p.get("potential_scale")
            if scale:
                out.append(f"<p>Potential scale: <b>{escape(scale)}</b>" + (
                    f", pH {p['pH']:g}: U_RHE = U_SHE + {p['rhe_minus_she_V']:.4f} V "
                    f"(kT ln 10 / e × pH at {p['temperature_K']:g} K)" if p.get("pH") is not None else "")
                    + (f"; limiting potential {p['limiting_potential_V']:.3f} V vs {escape(scale)}"
                       if p.get("limiting_potential_V") is not None else "") + ".</p>")
            figure(f"Free-energy diagram: {p['name']}")
            if scale == "SHE":
                heads = [f"G at {u:.3f} V vs SHE ({r:.3f} V vs RHE) (eV)"
                         for u, r in zip(p["potentials_V"], p["potentials_V_RHE"])]
            else:
                heads = [f"G at {u:.3f} V{' vs RHE' if scale else ''} (eV)" for u in p["potentials_V_RHE"]]
            out.append(_table(["state"] + heads,
                              [[lab] + [g[i] for g in p["state_gibbs_eV"]] for i, lab in enumerate(p["labels"])]))
            out.append(_table(["summary", "value"], [[k, v] for k, v in p["summary"].items()
                                                     if not isinstance(v, (list, dict))]))
    mc = doc["model_comparison"]
    if mc:
        out.append(f"<h2>Model comparison: {escape(mc['name'])}</h2>")
        figure(f"Model comparison: {mc['name']}")
        out.append(f"<p>{escape(mc['recommendation'])}</p><p>{escape(mc['rule'])}</p>")
        tl = mc["temperature_K"]
        out.append(_table(["model", "T (K)", "S° (J/mol/K)", "deviation (SD)"],
                          [[m, tl[i], v["standard_entropy_J_mol_K"][i],
                            v["deviation_from_correlation_sd"][i] if v["deviation_from_correlation_sd"] else "-"]
                           for m, v in mc["models"].items() for i in _pick(len(tl), 5)]))
        if mc["skipped"]:
            out.append(_items([f"{m}: {why}" for m, why in mc["skipped"].items()]))
    out.append("<h2>Assumptions</h2>" + _items(doc["assumptions"]))
    out.append("<h2>Versions and files</h2>" + _table(["package", "version"], list(doc["versions"].items())))
    out.append(_items(doc["files"]["tables"] + doc["files"]["plots"] + ["results.json"]))
    out.append(f"<p><small>Generated {escape(doc['created_utc'])} by adsorb {escape(doc['versions']['adsorb'])}, "
               f"{escape(doc['schema'])}.</small></p></body></html>")
    return "\n".join(out)


def _outputs(doc, out, images, figure):
    """Sections of the optional outputs: isobars, isosteric heats, TPD, NASA polynomials."""
    if doc.get("isobars"):
        out.append("<h2>Isobars</h2><p>Coverages vs temperature at fixed pressures of one gas; the other gases "
                   "stay at their partial pressures.</p>")
        for title in [k for k in images if k.startswith("Isobars")]:
            figure(title)
    if doc.get("isosteric_heats"):
        out.append("<h2>Isosteric heats</h2><p>q_st = k T² (∂ ln p/∂T)_θ (Clausius–Clapeyron at constant "
                   "coverage), per gas molecule, for each adsorbate alone on its surface. Without interactions "
                   "it equals −ΔH_ads; mean-field interactions ε lower it by εθ (2εθ per molecule for dissociative "
                   "adsorption).</p>")
        for title in [k for k in images if k.startswith("Isosteric heat")]:
            figure(title)
        for h in doc["isosteric_heats"]:
            cols = _pick(len(h["coverage_ML"]), 5)
            out.append(f"<h3>{escape(h['adsorbate'])} from {escape(h['gas'])}, "
                       f"{'mean-field interactions' if h['interactions'] else 'no lateral interactions'}</h3>")
            out.append(_table(["T (K)", "−ΔH_ads (kJ/mol)"] + [f"q_st at θ = {h['coverage_ML'][c]:.3g} ML (kJ/mol)"
                                                              for c in cols],
                              [[t, h["minus_delta_enthalpy_eV"][a] * EV_TO_KJ_MOL] + [h["isosteric_heat_kJ_mol"][a][c] for c in cols]
                               for a, t in enumerate(h["temperature_K"])]))
    if doc.get("tpd"):
        out.append("<h2>Temperature-programmed desorption</h2>")
        first = doc["tpd"][0]
        out.append(f"<p>First-order Polanyi–Wigner desorption, linear ramp, no re-adsorption. Transition state: "
                   f"{escape(first['transition_state'])}. {escape(first['desorption_energy_definition'])}. "
                   "Redhead (Vacuum 1962, 12, 203): exact first-order peak condition and his approximate formula "
                   "with the prefactor ν(Tp) of the simulation, and with the conventional 10^13 s^-1.</p>")
        for run in doc["tpd"]:
            inter = ", mean-field interactions" if run["interactions"] else ""
            out.append(f"<h3>{escape(run['adsorbate'])} → {escape(run['gas'])}: β = {run['heating_rate_K_s']:g} K/s, "
                       f"E_d = {run['desorption_energy_eV']:.4g} eV{escape(inter)}</h3>")
            figure(f"TPD {run['entry']}: {run['adsorbate']}{inter}")
            nu = run["prefactor"]
            out.append(_table(["T (K)", "ν(T) (1/s)"], [[nu["temperature_K"][i], nu["prefactor_s"][i]]
                                                        for i in _pick(len(nu["temperature_K"]), 5)]))
            out.append(_table(["θ0 (ML)", "Tp (K)", "θ at peak (ML)", "E_d at peak (eV)", "ν(Tp) (1/s)",
                               "apparent ν (1/s)", "E exact, ν(Tp) (eV)", "E Redhead, ν(Tp) (eV)",
                               "E Redhead, 1e13 (eV)"],
                              [[sp["initial_coverage_ML"], sp["peak_temperature_K"], sp["peak_coverage_ML"],
                                sp["energy_at_peak_eV"], sp["prefactor_at_peak_s"], sp["apparent_prefactor_s"],
                                sp["redhead_comparison"]["energy_exact_eV"], sp["redhead_comparison"]["energy_redhead_eV"],
                                sp["redhead_comparison"]["redhead_energy_1e13_eV"]] for sp in run["spectra"]], 0))
    if doc.get("nasa"):
        out.append("<h2>NASA polynomials</h2><p>Two-range 7-coefficient fits (McBride, Gordon and Reno, NASA "
                   "TM-4513, 1993) of the model tables, Cp, dCp/dT, H and S continuous at T_mid. Largest "
                   "deviations from the fitted table in each range. H keeps the table's zero (not a formation "
                   "enthalpy).</p>")
        rows = []
        for name, d in doc["nasa"].items():
            for rng in ("low", "high"):
                e = d["fit_errors"][rng]
                rows.append([name, d["kind"], rng, e["t_min_K"], e["t_max_K"], e["cp_max_abs_J_mol_K"],
                             100 * e["cp_max_rel"], e["h_max_abs_kJ_mol"], e["s_max_abs_J_mol_K"],
                             ", ".join(d.get("files", []))])
        out.append(_table(["species", "kind", "range", "T min (K)", "T max (K)", "max |ΔCp| (J/mol/K)",
                           "max |ΔCp|/Cp (%)", "max |ΔH| (kJ/mol)", "max |ΔS| (J/mol/K)", "files"], rows, 3))



def write_html(doc, plots, path, *, case_text=""):
    """Write the report page atomically; ``plots`` are (title, stem, files) triples from write_plots."""
    path = Path(path)
    images = {title: (path.parent / files[0]).read_bytes() for title, _, files in plots}
    page = render_html({**doc, "_case_text": case_text}, images)
    write_text_atomic(path, page)
    return path
