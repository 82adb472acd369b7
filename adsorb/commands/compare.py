"""``adsorb compare-models``: one adsorbate under every applicable model, with a recommendation.

Inputs come from options or a small TOML file (options override the file)::

    name = "CO on an invented surface"
    standard_state = "lattice-half"        # see adsorb.standard_states

    [temperature]
    values_K = [300, 400, 500]             # or start_K, stop_K, step_K (stop included)

    [adsorbate]
    frequencies_cm = [2050, 400, 350, 300, 60, 55]   # or frequencies_file = "ads.txt"
    energy_eV = -120.5
    structure = "ads.traj"                 # optional: mass and inertia from it
    indices = [36, 37]                     # optional: the adsorbate atoms in it
    mass_amu = 28.01
    translation_barrier_eV = 0.08
    site_spacing_A = 2.77                  # or site_area_A2
    rotation_barrier_eV = 0.02
    rotation_minima = 6
    rotor_symmetry_number = 1
    inertia_amu_A2 = 8.7
    low_frequency = "none"                 # or "floor", "qrrho"
    frequency_floor_cm = 100

    [gas]                                  # the matching gas molecule, for the correlation
    structure = "co.xyz"
    frequencies_cm = [2143]
    symmetry_number = 1                    # optional
    multiplicity = 1                       # optional
    # or instead: entropy_J_mol_K = [...]  (S° at 1 bar in J/(mol K), one per temperature)

Relative paths in the file are relative to the file. Nothing heavy is imported
at module level.
"""

from __future__ import annotations

import argparse
import difflib
import json
from pathlib import Path

TOP_KEYS = ("name", "standard_state", "temperature", "adsorbate", "gas")
TEMPERATURE_KEYS = ("values_K", "start_K", "stop_K", "step_K")
#: TOML key -> compare_models / Adsorbate keyword
ADSORBATE_MAP = {
    "mass_amu": "mass",
    "translation_barrier_eV": "translation_barrier",
    "site_spacing_A": "site_spacing",
    "site_area_A2": "site_area",
    "rotation_barrier_eV": "rotation_barrier",
    "rotation_minima": "rotation_minima",
    "rotor_symmetry_number": "symmetry_number",
    "inertia_amu_A2": "inertia",
    "low_frequency": "low_frequency",
    "frequency_floor_cm": "frequency_floor",
    "imaginary_modes": "imaginary_modes",
    "solver": "solver",
    "indices": "indices",
}
ADSORBATE_KEYS = ("frequencies_cm", "frequencies_file", "energy_eV", "structure") + tuple(ADSORBATE_MAP)
GAS_KEYS = ("structure", "frequencies_cm", "frequencies_file", "symmetry_number", "multiplicity", "entropy_J_mol_K")


def add_arguments(parser: argparse.ArgumentParser) -> None:
    """Options of ``adsorb compare-models``."""
    parser.add_argument("input", nargs="?", help="TOML file with [adsorbate], [gas] and [temperature] tables")
    parser.add_argument("--name", help="label of the adsorbate")
    a = parser.add_argument_group("adsorbate")
    a.add_argument("--frequencies", type=float, nargs="+", metavar="CM", help="the 3N wavenumbers in cm^-1")
    a.add_argument("--frequencies-file", metavar="PATH", help="file with the wavenumbers (text, ASE JSON, OUTCAR)")
    a.add_argument("--energy", type=float, metavar="EV", help="electronic energy in eV (slab included)")
    a.add_argument("--structure", metavar="PATH", help="structure file (mass and inertia about the normal)")
    a.add_argument("--mass", type=float, metavar="AMU", help="adsorbate mass in amu")
    a.add_argument("--translation-barrier", type=float, metavar="EV", help="diffusion barrier in eV")
    a.add_argument("--site-spacing", type=float, metavar="A", help="distance between sites in Å")
    a.add_argument("--site-area", type=float, metavar="A2", help="area per site in Å^2")
    a.add_argument("--rotation-barrier", type=float, metavar="EV", help="barrier to rotation about the normal, eV")
    a.add_argument("--rotation-minima", type=int, metavar="N", help="minima per full turn")
    a.add_argument("--rotor-symmetry-number", type=int, metavar="N", help="symmetry number about the normal")
    a.add_argument("--inertia", type=float, metavar="AMU_A2", help="moment about the normal in amu Å^2")
    g = parser.add_argument_group("gas molecule (for the Campbell-Sellers correlation)")
    g.add_argument("--gas-structure", metavar="PATH", help="structure file of the gas molecule")
    g.add_argument("--gas-frequencies", type=float, nargs="+", metavar="CM", help="gas wavenumbers in cm^-1")
    g.add_argument("--gas-frequencies-file", metavar="PATH", help="file with the gas wavenumbers")
    g.add_argument("--gas-symmetry-number", type=int, metavar="N", help="rotational symmetry number")
    g.add_argument("--gas-multiplicity", type=int, metavar="N", help="spin multiplicity")
    g.add_argument("--gas-entropy", type=float, nargs="+", metavar="J_MOL_K",
                   help="instead of a structure: S° of the gas at 1 bar, J/(mol K), one per temperature")
    c = parser.add_argument_group("conditions and output")
    c.add_argument("--temperatures", type=float, nargs="+", metavar="K", help="temperatures in K")
    c.add_argument("--temperature-range", type=float, nargs=3, metavar=("START", "STOP", "STEP"),
                   help="temperatures START..STOP (included) by STEP, in K")
    c.add_argument("--standard-state", help="named standard state (default lattice-half)")
    c.add_argument("--json", action="store_true", help="print the comparison as JSON")
    c.add_argument("--plot", metavar="DIR", help="write model-entropies.png and .svg into DIR")


# ---------------------------------------------------------------------------
# input
# ---------------------------------------------------------------------------


def _fail(msg):
    from adsorb.errors import InputError

    raise InputError(msg)


def _check_keys(file, table, allowed, where):
    if not isinstance(table, dict):
        _fail(f"{file}: {where}: expected a table, got {table!r}")
    for key in table:
        if key not in allowed:
            close = difflib.get_close_matches(key, allowed, n=1, cutoff=0.6)
            hint = f" (did you mean {close[0]!r}?)" if close else ""
            _fail(f"{file}: {where}{'.' if where else ''}{key}: unknown key{hint}; expected one of {', '.join(allowed)}")


def _read_toml(path):
    import tomllib

    p = Path(path)
    try:
        data = tomllib.loads(p.read_text(encoding="utf-8"))
    except FileNotFoundError:
        _fail(f"{p}: input file not found")
    except (OSError, UnicodeDecodeError) as exc:
        _fail(f"{p}: cannot read the input file ({exc.__class__.__name__}: {exc})")
    except tomllib.TOMLDecodeError as exc:
        _fail(f"{p}: not valid TOML ({exc})")
    _check_keys(p, data, TOP_KEYS, "")
    for key, allowed in (("temperature", TEMPERATURE_KEYS), ("adsorbate", ADSORBATE_KEYS), ("gas", GAS_KEYS)):
        if key in data:
            _check_keys(p, data[key], allowed, key)
    return p, data


def _temperatures(file, table, args):
    import numpy as np

    if args.temperatures:
        return np.asarray(args.temperatures, dtype=float)
    if args.temperature_range:
        start, stop, step = args.temperature_range
        where = "--temperature-range"
    elif "values_K" in table:
        return np.asarray(_numbers(file, "temperature.values_K", table["values_K"]), dtype=float)
    elif table:
        missing = [k for k in ("start_K", "stop_K", "step_K") if k not in table]
        if missing:
            _fail(f"{file}: temperature: missing {', '.join(missing)}; expected values_K or start_K, stop_K, step_K")
        start, stop, step = (_number(file, f"temperature.{k}", table[k]) for k in ("start_K", "stop_K", "step_K"))
        where = f"{file}: temperature"
    else:
        return np.array([298.15])
    if not step > 0 or not stop >= start:
        _fail(f"{where}: expected STOP >= START and STEP > 0, got {start:g}, {stop:g}, {step:g}")
    return np.arange(start, stop + 0.5 * step, step)


def _number(file, key, value):
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        _fail(f"{file}: {key}: expected a number, got {value!r}")
    return float(value)


def _numbers(file, key, value):
    if not isinstance(value, list) or not value:
        _fail(f"{file}: {key}: expected a non-empty list of numbers, got {value!r}")
    return [_number(file, key, v) for v in value]


def _path(base, value):
    p = Path(value)
    return p if p.is_absolute() or base is None else base / p


def _frequencies(file, base, table, cli_values, cli_file, what):
    from adsorb.io import read_frequencies

    if cli_values:
        return read_frequencies(cli_values)
    if cli_file:
        return read_frequencies(Path(cli_file))
    if "frequencies_cm" in table:
        return read_frequencies(_numbers(file, f"{what}.frequencies_cm", table["frequencies_cm"]))
    if "frequencies_file" in table:
        return read_frequencies(_path(base, table["frequencies_file"]))
    return None


def _inputs(args):
    """Everything compare_models needs, from the file and the options."""
    import numpy as np

    file, data, base = "command line", {}, None
    if args.input:
        file, data = _read_toml(args.input)
        base = file.parent
    ads_t, gas_t, temp_t = data.get("adsorbate", {}), data.get("gas", {}), data.get("temperature", {})
    temperature = _temperatures(file, temp_t, args)

    freqs = _frequencies(file, base, ads_t, args.frequencies, args.frequencies_file, "adsorbate")
    if freqs is None:
        _fail("compare-models: the adsorbate frequencies are missing; give --frequencies, --frequencies-file "
              "or [adsorbate] frequencies_cm in the input file")
    params = {}
    for key, kw in ADSORBATE_MAP.items():
        if key in ads_t:
            params[kw] = ads_t[key]
    for opt, kw in (("mass", "mass"), ("translation_barrier", "translation_barrier"),
                    ("site_spacing", "site_spacing"), ("site_area", "site_area"),
                    ("rotation_barrier", "rotation_barrier"), ("rotation_minima", "rotation_minima"),
                    ("rotor_symmetry_number", "symmetry_number"), ("inertia", "inertia")):
        value = getattr(args, opt)
        if value is not None:
            params[kw] = value
    if args.site_spacing is not None:
        params.pop("site_area", None)
    if args.site_area is not None:
        params.pop("site_spacing", None)
    atoms, file_energy = None, None
    structure = args.structure or (str(_path(base, ads_t["structure"])) if "structure" in ads_t else None)
    if structure:
        from adsorb.io import read_structure

        atoms, file_energy = read_structure(structure)
    if args.energy is not None:
        energy = args.energy
    elif "energy_eV" in ads_t:
        energy = _number(file, "adsorbate.energy_eV", ads_t["energy_eV"])
    else:
        energy = 0.0 if file_energy is None else file_energy

    gas = gas_entropy = None
    entropy_values = args.gas_entropy or gas_t.get("entropy_J_mol_K")
    gas_structure = args.gas_structure or (str(_path(base, gas_t["structure"])) if "structure" in gas_t else None)
    if entropy_values is not None and gas_structure:
        _fail(f"{file}: gas: give a structure with frequencies or entropy_J_mol_K, not both")
    if entropy_values is not None:
        from adsorb import constants as C

        values = entropy_values if isinstance(entropy_values, list) else [entropy_values]
        gas_entropy = C.from_j_per_mol_k(np.asarray(_numbers(file, "gas.entropy_J_mol_K", list(values)),
                                                     dtype=float))
        if gas_entropy.size != temperature.size:
            _fail(f"{file}: gas.entropy_J_mol_K: expected one S° per temperature ({temperature.size}; "
                  f"S° depends on T), got {gas_entropy.size}")
    elif gas_structure:
        from adsorb.gas import GasMolecule
        from adsorb.io import read_structure

        gas_atoms, _ = read_structure(gas_structure)
        gas_freqs = _frequencies(file, base, gas_t, args.gas_frequencies, args.gas_frequencies_file, "gas")
        if gas_freqs is None:
            _fail(f"{file}: gas: the gas frequencies are missing; give --gas-frequencies or gas.frequencies_cm")
        kwargs = {}
        sym = args.gas_symmetry_number if args.gas_symmetry_number is not None else gas_t.get("symmetry_number")
        mult = args.gas_multiplicity if args.gas_multiplicity is not None else gas_t.get("multiplicity")
        if sym is not None:
            kwargs["symmetry_number"] = sym
        if mult is not None:
            kwargs["multiplicity"] = mult
        gas = GasMolecule(gas_atoms, gas_freqs, **kwargs)
    name = args.name or data.get("name") or "adsorbate"
    state = args.standard_state or data.get("standard_state") or "lattice-half"
    return dict(frequencies=freqs, temperature=temperature, energy=float(energy), atoms=atoms, gas=gas,
                gas_entropy=gas_entropy, standard_state=str(state), name=str(name), **params)


# ---------------------------------------------------------------------------
# output
# ---------------------------------------------------------------------------


def _table(comparison) -> str:
    import numpy as np

    from adsorb import constants as C
    from adsorb.model_choice import CORRELATION_SD_R, FLAG_SIGMAS

    t = np.ravel(comparison.temperature)
    models = comparison.results
    lines = [f"adsorbate: {comparison.name}",
             f"standard state: {comparison.standard_state} ({comparison.standard_state_description})"]
    has_corr = comparison.correlation_entropy is not None

    def column(values, fmt):
        return ["-" if values is None else fmt.format(v) for v in (values if values is not None else [None] * t.size)]

    def ratio(a):
        return None if a is None else np.ravel(np.broadcast_to(a, comparison.temperature.shape))

    rec = None if comparison.recommended is None else np.ravel(comparison.recommended)
    blocks = []
    for title, pick, fmt in (("S° in J/(mol K) at the standard state", "entropy", "{:.2f}"),
                             ("G° in eV at the standard state", "gibbs", "{:.4f}")):
        cols = [[f"{v:g}" for v in t], column(ratio(comparison.translation_ratio), "{:.2f}"),
                column(ratio(comparison.rotation_ratio), "{:.2f}")]
        for r in models:
            vals = np.ravel(getattr(r, pick))
            if pick == "entropy":
                vals = C.to_j_per_mol_k(vals)
            flags = np.ravel(r.flagged) if (r.flagged is not None and pick == "entropy") else np.zeros(t.size, bool)
            cols.append([fmt.format(v) + ("!" if f else " ") for v, f in zip(vals, flags)])
        head = ["T/K", "Wt/kT", "Wr/kT"] + [r.model for r in models]
        if has_corr and pick == "entropy":
            sc = C.to_j_per_mol_k(np.ravel(comparison.correlation_entropy))
            band = FLAG_SIGMAS * CORRELATION_SD_R * C.R
            cols.append([f"{v:.2f}±{band:.1f}" for v in sc])
            head.append("correlation")
        head.append("recommended")
        cols.append(["-" if rec is None else str(v) for v in (rec if rec is not None else t)])
        widths = [max(len(h), *(len(x) for x in col)) for h, col in zip(head, cols)]
        rows = ["  ".join(h.rjust(w) for h, w in zip(head, widths))]
        for i in range(t.size):
            rows.append("  ".join(col[i].rjust(w) for col, w in zip(cols, widths)))
        blocks.append(f"\n{title}" + (" ('!' = outside 2 standard deviations of the correlation)"
                                      if pick == "entropy" and has_corr else "") + "\n" + "\n".join(rows))
    lines += blocks
    if has_corr:
        lines.append("\ncorrelation: Campbell and Sellers, J. Am. Chem. Soc. 2012, 134, 18109: "
                     "S°_ad = 0.70 S°_gas(T, 1 bar) - 3.3R, standard deviation 2R (band shown: ±4R)")
    for model, why in comparison.skipped:
        lines.append(f"not evaluated: {model} ({why})")
    for r in models:
        for w in r.warnings:
            lines.append(f"warning ({r.model}): {w}")
    lines.append(f"\nrecommendation: {comparison.recommendation}")
    lines.append(f"rule: {comparison.rule}")
    return "\n".join(lines)


def run(args) -> int:
    """Run ``adsorb compare-models``; print the table (or JSON); exit code 0."""
    from adsorb.model_choice import compare_models, plot_model_entropies

    comparison = compare_models(**_inputs(args))
    files = []
    if args.plot:
        stem = Path(args.plot) / "model-entropies"
        plot_model_entropies(comparison, stem)
        files = [str(stem.with_suffix(".png")), str(stem.with_suffix(".svg"))]
    if args.json:
        out = comparison.as_dict()
        if files:
            out["plot_files"] = files
        print(json.dumps(out, indent=2, allow_nan=False, default=str))
    else:
        print(_table(comparison))
        for f in files:
            print(f"wrote {f}")
    return 0
