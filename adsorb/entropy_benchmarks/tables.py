"""Markdown tables of the entropy benchmarks, as pasted into docs/entropy-benchmarks.md.

Import the names from :mod:`adsorb.entropy_benchmarks`.
"""

from __future__ import annotations

from adsorb import constants as C
from adsorb.entropy_benchmarks.correlation import CORRELATION_MODELS, benchmark_adsorbate
from adsorb.entropy_benchmarks.data import INVENTED_SITES


def _md(header, rows):
    lines = ["| " + " | ".join(header) + " |", "| " + " | ".join("---" for _ in header) + " |"]
    lines += ["| " + " | ".join(r) + " |" for r in rows]
    return "\n".join(lines)


def _signed(value, digits):
    value = 0.0 if round(value, digits) == 0 else value
    text = f"{value:.{digits}f}"
    return text.replace("-", "−")


def markdown_site_table() -> str:
    """The invented sites of the correlation benchmark, with the barrier-implied frequencies."""
    rows = []
    for name, site in INVENTED_SITES.items():
        inputs = benchmark_adsorbate(name)
        p = inputs["parameters"]
        nu_t, nu_r = inputs["implied_cm"]
        rows.append([
            name, site.orientation, f"{site.site_spacing_A:g}", f"{site.translation_barrier_eV:g}",
            "—" if site.rotation_barrier_eV is None else f"{site.rotation_barrier_eV:g}",
            "—" if site.rotation_minima is None else str(site.rotation_minima),
            "—" if site.rotor_symmetry_number is None else str(site.rotor_symmetry_number),
            "—" if "inertia" not in p else f"{p['inertia']:.2f}",
            f"{nu_t:.1f}", "—" if nu_r is None else f"{nu_r:.1f}",
            ", ".join(f"{v:g}" for v in site.other_modes_cm)])
    return _md(["molecule", "orientation (invented)", "b / Å", "W_trans / eV", "W_rot / eV", "minima", "σ_normal",
                "I_normal / amu Å²", "ν_trans (implied) / cm⁻¹", "ν_rot (implied) / cm⁻¹",
                "tilts, stretch / cm⁻¹ (invented)"], rows)


def markdown_correlation_table(rows) -> str:
    """S° per model (deviation from the correlation in units of its SD, 2R, in parentheses)."""
    out = []
    for r in rows:
        cells = [r.molecule, f"{r.temperature:g}", f"{r.gas_entropy:.1f}", f"{r.correlation_entropy:.1f}"]
        cells += [f"{r.entropies[m]:.1f} ({_signed(r.deviations[m], 1)})" for m in CORRELATION_MODELS]
        cells.append(r.recommended)
        out.append(cells)
    return _md(["molecule", "T / K", "S°gas", "S°ad Campbell–Sellers"] + [f"{m}" for m in CORRELATION_MODELS]
               + ["rule of thumb"], out)


def markdown_standard_state_table(rows) -> str:
    """S° of one model at the three named standard states beside the correlation."""
    from adsorb.standard_states import STANDARD_STATES

    out = [[r["molecule"], f"{r['correlation']:.1f}"] + [f"{r[s]:.1f}" for s in STANDARD_STATES] for r in rows]
    return _md(["molecule", "Campbell–Sellers"] + list(STANDARD_STATES), out)


def markdown_alkane_site_table(rows) -> str:
    """Geometry, symmetry and the invented barriers/modes of each chain length."""
    out = []
    for r in rows:
        s = r.site
        out.append([str(s.n), s.formula, s.geometry_source, f"{s.mass_amu:.2f}", str(s.external_symmetry_number),
                    str(s.normal_symmetry_number), f"{s.inertia_normal_amu_A2:.1f}",
                    f"{C.to_kj_per_mol(s.desorption_energy_eV):.1f}", f"{s.translation_barrier_eV:.4f}",
                    f"{s.rotation_barrier_eV:.4f}", f"{s.frequencies_cm[0]:.1f}", f"{s.frequencies_cm[2]:.1f}"])
    return _md(["N", "formula", "geometry", "m / amu", "σ_ext", "σ_normal", "I_normal / amu Å²", "E_d / kJ mol⁻¹",
                "W_trans / eV", "W_rot / eV", "ν_trans / cm⁻¹", "ν_rot / cm⁻¹"], out)


def markdown_alkane_table(rows) -> str:
    """log10 of the Arrhenius prefactor A(Tp) of each model beside the published value."""
    models = list(rows[0].models)
    energies = list(rows[0].conformers)
    out = []
    for r in rows:
        pub = "—" if r.published_log10 is None else f"{r.published_log10:.1f}"
        if r.published_uncertainty is not None:
            pub += f" ± {r.published_uncertainty:.1f}"
        cells = [str(r.site.n), pub] + [f"{r.models[m]['log10_arrhenius']:.2f}" for m in models]
        cells += [f"{r.conformers[e]['log10_arrhenius']:.2f}" for e in energies]
        out.append(cells)
    header = ["N", "Tait et al. 2005"] + models + [f"harmonic + conformers (E_g = {e:g} kJ/mol)" for e in energies]
    return _md(header, out)


def markdown_peak_table(rows) -> str:
    """Peak temperature, log10 ν_TST(Tp) and γ of each model; published Tp where a prefactor is published."""
    models = list(rows[0].models)
    out = []
    for r in rows:
        cells = [str(r.site.n), "—" if r.published_peak_K is None else f"{r.published_peak_K:.1f}"]
        for m in models:
            v = r.models[m]
            cells.append(f"{v['peak_temperature_K']:.1f} / {v['log10_tst']:.2f} / {_signed(v['gamma'], 2)}")
        out.append(cells)
    return _md(["N", "Tp (published ν, E_d) / K"] + [f"{m}: Tp / log10 ν / γ" for m in models], out)


def markdown_sensitivity_table(rows) -> str:
    """Δlog10 A for each scaled input (columns: chain length and model)."""
    keys = [k for k in rows[0] if k not in ("parameter", "factor")]
    out = [[r["parameter"], f"× {r['factor']:g}"] + [_signed(r[k], 2) for k in keys] for r in rows]
    header = ["input scaled", "factor"] + [f"N = {k.split(':')[0]}, {k.split(':')[1]}" for k in keys]
    return _md(header, out)
