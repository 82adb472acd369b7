"""results.json entries, CSV/JSON files and validation of the optional outputs (docs/report.md).

Isobars, isosteric heats, TPD spectra and NASA polynomial fits of a
:class:`adsorb.study.StudyResult`. Used by :mod:`adsorb.report`; every file is
written atomically through :mod:`adsorb.fileout`.
"""

from __future__ import annotations

import math

import numpy as np

from adsorb import constants as C

__all__ = ["OUTPUT_KEYS", "output_sections", "output_assumptions", "write_output_files", "validate_outputs"]

#: top-level results.json keys of the optional outputs (absent in documents of earlier versions)
OUTPUT_KEYS = {"isobars": list, "isosteric_heats": list, "tpd": list, "nasa": dict}

TS_TEXT = ("2D gas of the desorbing molecule on one site keeping the gas's internal modes: k_des = (kT/h) "
           "(A_site/Lambda^2) (q_int,gas/q_ad) exp(-E_d/kT) = A_site/(K sqrt(2 pi m kT)) (detailed balance with "
           "the case's K and Hertz-Knudsen adsorption, sticking 1; Campbell, Sprowl and Arnadottir, J. Phys. Chem. C "
           "2016, 120, 10283)")
ED_TEXT = "E_d = -(dE_ads + dZPE_ads) per molecule, the zero-point-corrected desorption energy at 0 K"


def _list(a):
    return np.asarray(a, dtype=float).tolist()


def variant(interactions) -> str:
    """'interacting' or 'ideal_layer' (file names, as for the coverage files)."""
    return "interacting" if interactions else "ideal_layer"


def _isobar(run):
    return {"entry": run.entry, "surface": run.surface, "gas": run.gas, "species": list(run.species),
            "interactions": run.interactions, "fugacity": run.fugacity, "temperature_K": _list(run.temperature_K), "pressure_Pa": _list(run.pressure_Pa),
            "coverage_ML": {s: _list(run.coverage[i]) for i, s in enumerate(run.species)},
            "empty_sites_ML": _list(run.empty)}


def _heat(run):
    return {"entry": run.entry, "adsorbate": run.adsorbate, "surface": run.surface, "gas": run.gas,
            "dissociative": run.dissociative,
            "interactions": run.interactions, "self_interaction_eV": run.self_interaction_eV,
            "per": "gas molecule (per A2 for a dissociative adsorbate)",
            "method": "Clausius-Clapeyron at constant coverage, q_st = k T^2 (d ln p / dT)_theta, adsorbate alone "
                      "on its surface",
            "temperature_K": _list(run.temperature_K), "coverage_ML": _list(run.coverage_ML),
            "isosteric_heat_eV": _list(run.heat_eV), "isosteric_heat_kJ_mol": _list(C.to_kj_per_mol(run.heat_eV)),
            "minus_delta_enthalpy_eV": _list(run.minus_delta_enthalpy_eV)}


def _tpd(run):
    spec = run.spec
    spectra = []
    for r, red in zip(run.spectra, run.redhead):
        spectra.append({"initial_coverage_ML": r.initial_coverage, "peak_temperature_K": r.peak_temperature_K,
                        "peak_temperatures_K": list(r.peak_temperatures_K), "peak_coverage_ML": r.peak_coverage,
                        "peak_rate_ML_per_K": float(np.max(r.rate_per_K)), "energy_at_peak_eV": r.energy_at_peak_eV,
                        "prefactor_at_peak_s": r.prefactor_at_peak_s, "apparent_prefactor_s": r.apparent_prefactor_s,
                        "redhead_energy_eV": r.redhead_energy_eV, "desorbed_ML": r.desorbed_ML,
                        "redhead_comparison": red, "temperature_K": _list(r.temperature),
                        "coverage_ML": _list(r.coverage), "rate_ML_per_K": _list(r.rate_per_K)})
    return {"entry": spec.entry, "adsorbate": spec.adsorbate, "surface": spec.surface, "gas": spec.gas, "order": 1,
            "interactions": spec.interactions, "self_interaction_eV": spec.self_interaction_eV,
            "heating_rate_K_s": spec.heating_rate_K_s, "temperature_start_K": spec.temperature_start_K,
            "temperature_end_K": spec.temperature_end_K, "desorption_energy_eV": run.desorption_energy_eV,
            "desorption_energy_definition": ED_TEXT + (", minus eps theta with the mean-field self-interaction"
                                                       if spec.interactions else ""),
            "energy_coefficients_eV": list(run.energy_coefficients_eV), "site_area_A2": spec.site_area_A2,
            "mass_amu": run.mass_amu, "transition_state": TS_TEXT,
            "prefactor": {"temperature_K": _list(run.prefactor_temperature_K), "prefactor_s": _list(run.prefactor_s)},
            "spectra": spectra}


def output_sections(result, files=None) -> dict:
    """The results.json entries of the optional outputs (keys of :data:`OUTPUT_KEYS`)."""
    files = files or {}
    nasa = {}
    for n in result.nasa:
        d = n.polynomial.to_dict()
        d.update(kind=n.kind, pressure_Pa=n.pressure_Pa, files=files.get(n.species, []))
        nasa[n.species] = d
    return {"isobars": [_isobar(c) for c in result.isobars],
            "isosteric_heats": [_heat(h) for h in result.isosteric_heats],
            "tpd": [_tpd(t) for t in result.tpd], "nasa": nasa}


def output_assumptions(result) -> list:
    """Assumption lines for the optional outputs the study computed."""
    out = []
    if result.isosteric_heats:
        out.append("Isosteric heats: Clausius-Clapeyron at constant coverage, q_st = k T^2 (d ln p/dT)_theta = "
                   "-dH_ads (R. I. Masel, Principles of Adsorption and Reaction on Solid Surfaces, Wiley 1996), "
                   "for one adsorbate alone on its surface, ideal-gas pressures, mean-field interactions.")
    if result.tpd:
        out.append("TPD: first-order Polanyi-Wigner desorption with a linear ramp, no re-adsorption, infinitely fast "
                   "pumping (Redhead, Vacuum 1962, 12, 203); prefactor from transition-state theory with a "
                   "2D-gas transition state; " + ED_TEXT + ".")
    if result.nasa:
        out.append("NASA polynomials: two-range 7-coefficient fits of the model tables with Cp, dCp/dT, H, S "
                   "continuous at T_mid (McBride, Gordon, Reno, NASA TM-4513, 1993); H keeps the table's zero "
                   "(electronic energy + ZPE), not a formation enthalpy.")
    return out


def write_output_files(result, folder, *, tables=True) -> tuple:
    """CSV tables of isobars, isosteric heats and TPD spectra (if ``tables``); the NASA JSON + CSV files and
    ``nasa_fit_errors.csv`` (always, when fits were asked for).

    Returns (list of table names, {species: [json name, csv name]}).
    """
    from adsorb.report import _write_csv, slug

    out = []
    if tables:
        for c in result.isobars:
            rows = [[float(t), float(p)] + [float(c.coverage[i, a, b]) for i in range(len(c.species))]
                    + [float(c.empty[a, b])] for a, t in enumerate(c.temperature_K) for b, p in enumerate(c.pressure_Pa)]
            out.append(_write_csv(folder / f"isobar_{c.entry}_{slug(c.gas)}_{variant(c.interactions)}.csv",
                                  ["temperature_K", f"pressure_{c.gas}_Pa"] + [f"theta_{s}" for s in c.species]
                                  + ["theta_empty"], rows))
        for h in result.isosteric_heats:
            rows = [[float(t), float(th), float(h.heat_eV[a, b]), float(C.to_kj_per_mol(h.heat_eV[a, b]))]
                    for a, t in enumerate(h.temperature_K) for b, th in enumerate(h.coverage_ML)]
            out.append(_write_csv(folder / f"isosteric_heat_{h.entry}_{slug(h.adsorbate)}_{variant(h.interactions)}.csv",
                                  ["temperature_K", "coverage_ML", "isosteric_heat_eV", "isosteric_heat_kJ_mol"], rows))
        for run in result.tpd:
            rows = [[float(r.initial_coverage), float(t), float(th), float(k), float(k * r.heating_rate_K_s)]
                    for r in run.spectra for t, th, k in zip(r.temperature, r.coverage, r.rate_per_K)]
            out.append(_write_csv(folder / f"tpd_{run.spec.entry}_{slug(run.spec.adsorbate)}_{variant(run.spec.interactions)}.csv",
                                  ["initial_coverage_ML", "temperature_K", "coverage_ML", "rate_ML_per_K",
                                   "rate_ML_per_s"], rows))
    nasa = {}
    for n in result.nasa:
        stem = f"nasa_{slug(n.species)}"
        n.polynomial.to_json(folder / f"{stem}.json")
        n.polynomial.to_csv(folder / f"{stem}.csv")
        nasa[n.species] = [f"{stem}.json", f"{stem}.csv"]
    if result.nasa:
        keys = ("t_min_K", "t_max_K", "n_points", "cp_max_abs_J_mol_K", "cp_max_rel", "h_max_abs_kJ_mol",
                "h_max_rel_to_increment", "s_max_abs_J_mol_K", "s_max_rel")
        rows = [[n.species, n.polynomial.t_mid_K, rng] + [n.polynomial.fit_errors[rng][k] for k in keys]
                for n in result.nasa for rng in ("low", "high")]
        out.append(_write_csv(folder / "nasa_fit_errors.csv", ["species", "t_mid_K", "range"] + list(keys), rows))
    return out, nasa


def _numbers(x):
    if isinstance(x, list):
        return all(_numbers(v) for v in x)
    return isinstance(x, (int, float)) and not isinstance(x, bool) and math.isfinite(x)


def _validate_isobars(data, bad):
    for i, run in enumerate(data.get("isobars", [])):
        shape = (len(run.get("temperature_K", [])), len(run.get("pressure_Pa", [])))
        cov = run.get("coverage_ML", {})
        if not cov or not isinstance(run.get("interactions"), bool):
            bad.append(f"isobars.{i}: expected coverage_ML per species and interactions true|false")
        for s, v in cov.items():
            if not (_numbers(v) and np.shape(v) == shape and np.all((np.asarray(v) >= -1e-12) & (np.asarray(v) <= 1 + 1e-12))):
                bad.append(f"isobars.{i}.coverage_ML.{s}: expected a {shape[0]} x {shape[1]} array of coverages in [0, 1]")


def _validate_heats(data, bad):
    for i, h in enumerate(data.get("isosteric_heats", [])):
        theta, temps = h.get("coverage_ML", []), h.get("temperature_K", [])
        shape = (len(temps), len(theta))
        if not (_numbers(theta) and theta and all(0 < x < 1 for x in theta) and _numbers(temps) and temps):
            bad.append(f"isosteric_heats.{i}: expected temperature_K and coverage_ML (each in (0, 1)) lists")
        for key in ("isosteric_heat_eV", "isosteric_heat_kJ_mol"):
            if not (_numbers(h.get(key)) and np.shape(h.get(key)) == shape):
                bad.append(f"isosteric_heats.{i}.{key}: expected a {shape[0]} x {shape[1]} array of numbers")
        if not (_numbers(h.get("minus_delta_enthalpy_eV")) and len(h.get("minus_delta_enthalpy_eV")) == len(temps)):
            bad.append(f"isosteric_heats.{i}.minus_delta_enthalpy_eV: expected one number per temperature")
        if not isinstance(h.get("interactions"), bool):
            bad.append(f"isosteric_heats.{i}.interactions: expected true or false")


def _validate_tpd(data, bad):
    for i, run in enumerate(data.get("tpd", [])):
        lo, hi = run.get("temperature_start_K"), run.get("temperature_end_K")
        if not (_numbers([lo, hi]) and lo < hi and _numbers(run.get("heating_rate_K_s")) and run["heating_rate_K_s"] > 0):
            bad.append(f"tpd.{i}: expected temperature_start_K < temperature_end_K and heating_rate_K_s > 0")
            continue
        if not run.get("spectra"):
            bad.append(f"tpd.{i}.spectra: expected one spectrum per initial coverage")
        for k, sp in enumerate(run.get("spectra", [])):
            n = len(sp.get("temperature_K", []))
            theta0 = sp.get("initial_coverage_ML")
            arrays = [sp.get(c) for c in ("temperature_K", "coverage_ML", "rate_ML_per_K")]
            if not (n > 10 and all(_numbers(a) and len(a) == n for a in arrays) and _numbers(theta0)):
                bad.append(f"tpd.{i}.spectra.{k}: expected equal-length number lists temperature_K, coverage_ML, "
                           "rate_ML_per_K")
                continue
            if min(arrays[2]) < 0 or min(arrays[1]) < 0 or max(arrays[1]) > theta0 * (1 + 1e-9):
                bad.append(f"tpd.{i}.spectra.{k}: expected rates >= 0 and coverages in [0, initial_coverage_ML]")
            tp = sp.get("peak_temperature_K")
            if not (_numbers(tp) and lo <= tp <= hi):
                bad.append(f"tpd.{i}.spectra.{k}.peak_temperature_K: expected a temperature inside the ramp")
            if not isinstance(sp.get("redhead_comparison"), dict):
                bad.append(f"tpd.{i}.spectra.{k}.redhead_comparison: expected an object")


def _validate_nasa(data, bad):
    for name, d in data.get("nasa", {}).items():
        t = [d.get(k) for k in ("t_low_K", "t_mid_K", "t_high_K")]
        if not (_numbers(t) and t[0] < t[1] < t[2]):
            bad.append(f"nasa.{name}: expected t_low_K < t_mid_K < t_high_K")
        if not all(_numbers(d.get(r)) and len(d.get(r)) == 7 for r in ("low", "high")):
            bad.append(f"nasa.{name}: expected 7 coefficients in each of low and high")
        errors = d.get("fit_errors")
        if not (isinstance(errors, dict) and set(errors) == {"low", "high"}
                and all(_numbers(e.get("cp_max_rel")) for e in errors.values())):
            bad.append(f"nasa.{name}.fit_errors: expected low and high ranges with cp_max_rel, ...")


def validate_outputs(data) -> list:
    """Problems with the optional-output keys of a results document (none when they are absent)."""
    bad = []
    for key, kind in OUTPUT_KEYS.items():
        if key in data and not isinstance(data[key], kind):
            bad.append(f"{key}: expected {kind.__name__}, got {type(data[key]).__name__}")
    if bad:
        return bad
    _validate_isobars(data, bad)
    _validate_heats(data, bad)
    _validate_tpd(data, bad)
    _validate_nasa(data, bad)
    return bad
