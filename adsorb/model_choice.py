"""Choosing an adsorbate model: every applicable model side by side, a rule of thumb, a correlation.

:func:`compare_models` evaluates one adsorbate (its 3N frequencies, energy,
mass or structure, and whatever barriers and site spacing are known) under
each model of :class:`adsorb.adsorbate.Adsorbate` that its inputs allow:

* ``"harmonic"`` and ``"lattice-gas"`` always (the same partition function;
  they differ only in how equilibria treat the adsorbate: localized);
* ``"2d-gas"`` when the mass (or structure) and the site spacing or area are
  given (Campbell, Sprowl and Árnadóttir, J. Phys. Chem. C 2016, 120, 10283);
* ``"hindered"`` when, in addition, the diffusion barrier and (for a
  polyatomic adsorbate) the rotational barrier, the number of minima per turn
  and the moment of inertia (or structure) are given (Sprowl, Campbell and
  Árnadóttir, J. Phys. Chem. C 2016, 120, 9719).

Entropies and Gibbs energies are reported per site (no configurational term)
and at a named standard state (:mod:`adsorb.standard_states`; default
``"lattice-half"``, theta° = 1/2).

The rule of thumb (:func:`recommend_model`) compares the barriers with kT:

    W_x/kT <  1   -> "2d-gas"    (the in-plane motion is nearly free)
    1 <= W_x/kT < 10 -> "hindered"
    W_x/kT >= 10  -> "harmonic"  (localized; the ideal lattice gas in equilibria)

and a rotational barrier with W_r/kT < 10 asks for the hindered model (the
2D-gas and harmonic models keep that rotation harmonic). The thresholds
are a rule of thumb, not a published criterion: the hindered translator of
Sprowl et al. (2016) tends to the 2D ideal gas for W -> 0 and to a harmonic
oscillator of frequency sqrt(W/(2 m b^2)) for W >> kT, and Campbell et al.
(2016) treat the 2D ideal gas and the 2D ideal lattice gas as the two
idealised limits of that hindered translator. Evaluated with this package's
closed forms (m = 28 amu, b = 2.77 Å, 300 K), the entropy of one direction
from the 2D gas exceeds the hindered translator's by 0.06 k at W/kT = 1 and
the harmonic one falls below it by 0.06 k at W/kT = 10; between, neither
limit is within 0.15 k (up to 0.7 k at W/kT = 5).

The Campbell-Sellers correlation (C. T. Campbell, J. R. V. Sellers, "The
Entropies of Adsorbed Molecules", J. Am. Chem. Soc. 2012, 134, 18109-18115)

    S°_ad(T) = 0.70 S°_gas(T) - 3.3 R,   standard deviation 2R,

built from measured entropies of molecular adsorbates at high coverage,
gives an independent estimate from the gas molecule's standard entropy at
1 bar and the same T. A model whose S° lies more than two standard deviations
(4R) from it is flagged.
"""

from __future__ import annotations

import math
import warnings
from dataclasses import dataclass, field

import numpy as np

from adsorb import constants as C
from adsorb.errors import InputError, ModelWarning
from adsorb.thermo import ThermoTable

__all__ = [
    "CORRELATION_SLOPE",
    "CORRELATION_OFFSET_R",
    "CORRELATION_SD_R",
    "RULE_OF_THUMB",
    "campbell_sellers_entropy",
    "recommend_model",
    "ModelResult",
    "ModelComparison",
    "compare_models",
    "plot_model_entropies",
]

#: S°_ad = CORRELATION_SLOPE * S°_gas - CORRELATION_OFFSET_R * R (Campbell and Sellers 2012)
CORRELATION_SLOPE = 0.70
CORRELATION_OFFSET_R = 3.3
#: one standard deviation of the correlation, in units of R (Campbell and Sellers 2012)
CORRELATION_SD_R = 2.0
#: models are flagged beyond this many standard deviations
FLAG_SIGMAS = 2.0

MODEL_ORDER = ("harmonic", "lattice-gas", "hindered", "2d-gas")

RULE_OF_THUMB = (
    "rule of thumb on the barrier-to-kT ratios: W_trans/kT < {free:g} -> 2d-gas; "
    "{free:g} <= W_trans/kT < {local:g} -> hindered; W_trans/kT >= {local:g} -> harmonic "
    "(localized; the ideal lattice gas in equilibria); a rotation barrier with W_rot/kT < {local:g} "
    "asks for hindered, since the 2d-gas and harmonic models keep that rotation harmonic. "
    "Rationale: the hindered translator and rotor (Sprowl, Campbell, Árnadóttir, J. Phys. Chem. C 2016, "
    "120, 9719) tend to the free 2D gas / free rotor as W -> 0 and to a harmonic oscillator as W >> kT; "
    "the 2D ideal gas and the ideal lattice gas are its two idealised limits (Campbell, Sprowl, "
    "Árnadóttir, J. Phys. Chem. C 2016, 120, 10283). The thresholds are a rule of thumb, not a published "
    "criterion."
)


def campbell_sellers_entropy(gas_entropy):
    """Campbell-Sellers estimate of an adsorbate's standard entropy, 0.70 S°_gas - 3.3 R.

    Source: C. T. Campbell, J. R. V. Sellers, J. Am. Chem. Soc. 2012, 134,
    18109-18115 (adsorbates at high coverage; standard deviation 2R over a
    range of 50R). Per molecule, R becomes k_B.

    Parameters
    ----------
    gas_entropy : float or ndarray
        Standard entropy of the gas molecule at 1 bar and the same
        temperature, eV/K per molecule.

    Returns
    -------
    ndarray
        S°_ad in eV/K per molecule (same shape).

    Raises
    ------
    InputError
        If a value is not finite and positive.
    """
    s = np.asarray(gas_entropy, dtype=float)
    if s.size == 0 or not np.all(np.isfinite(s)) or np.any(s <= 0):
        msg = f"gas_entropy: expected finite values > 0 in eV/K, got {gas_entropy!r}"
        raise InputError(msg)
    return CORRELATION_SLOPE * s - CORRELATION_OFFSET_R * C.kB_eV


def _ratio_array(name, value):
    if value is None:
        return None
    a = np.asarray(value, dtype=float)
    if a.size == 0 or not np.all(np.isfinite(a)) or np.any(a < 0):
        msg = f"{name}: expected finite values >= 0 (barrier / kT), got {value!r}"
        raise InputError(msg)
    return a


def recommend_model(translation_ratio, rotation_ratio=None, *, free_below: float = 1.0,
                    localized_from: float = 10.0) -> np.ndarray:
    """Model recommended by the rule of thumb (see :data:`RULE_OF_THUMB`).

    Parameters
    ----------
    translation_ratio : float or ndarray
        W_trans / kT (diffusion barrier over kT), >= 0.
    rotation_ratio : float or ndarray, optional
        W_rot / kT for the rotation about the surface normal; None when the
        adsorbate has no such rotation or its barrier is unknown.
    free_below : float, optional
        Below this W_trans/kT the 2D gas is recommended (default 1).
    localized_from : float, optional
        From this ratio on a motion counts as localized (default 10).

    Returns
    -------
    ndarray of str
        ``"2d-gas"``, ``"hindered"`` or ``"harmonic"``, broadcast shape.
    """
    if not (0 <= free_below < localized_from) or not math.isfinite(localized_from):
        msg = (f"recommend_model thresholds: expected 0 <= free_below < localized_from, got "
               f"{free_below!r} and {localized_from!r}")
        raise InputError(msg)
    tr = _ratio_array("translation_ratio", translation_ratio)
    rr = _ratio_array("rotation_ratio", rotation_ratio)
    soft_rotation = np.zeros(tr.shape, dtype=bool) if rr is None else (rr < localized_from)
    tr, soft_rotation = np.broadcast_arrays(tr, soft_rotation)
    out = np.full(tr.shape, "hindered", dtype=object)
    out[(tr >= localized_from) & ~soft_rotation] = "harmonic"
    out[(tr < free_below) & ~soft_rotation] = "2d-gas"
    return out.astype(str)


@dataclass(frozen=True)
class ModelResult:
    """One model of the comparison (eV, eV/K per molecule).

    Attributes
    ----------
    model : str
    mobile : bool
    entropy, gibbs, enthalpy : ndarray
        S°, G° and H° at the comparison's standard state (G° = H° - T S°).
    site_entropy, site_gibbs : ndarray
        Per-site S and G, no configurational term (:meth:`Adsorbate.thermo`).
    deviation : ndarray or None
        (S° - S°_correlation) in standard deviations of the correlation (2R).
    flagged : ndarray of bool or None
        |deviation| > 2.
    choices : dict
        Modelling choices of the Adsorbate (replaced modes, parameters).
    warnings : tuple of str
    """

    model: str
    mobile: bool
    entropy: np.ndarray
    gibbs: np.ndarray
    enthalpy: np.ndarray
    site_entropy: np.ndarray
    site_gibbs: np.ndarray
    deviation: np.ndarray | None
    flagged: np.ndarray | None
    choices: dict = field(default_factory=dict)
    warnings: tuple = ()


@dataclass(frozen=True)
class ModelComparison:
    """The result of :func:`compare_models`.

    Attributes
    ----------
    name : str
    temperature : ndarray
        Temperatures in K.
    standard_state, standard_state_description : str
        The named state at which S° and G° are compared.
    results : tuple of ModelResult
        In the order harmonic, lattice-gas, hindered, 2d-gas (those applicable).
    skipped : tuple of (str, str)
        Models not evaluated and why.
    translation_ratio, rotation_ratio : ndarray or None
        W/kT of the diffusion barrier and the rotational barrier.
    gas_entropy, correlation_entropy : ndarray or None
        S°(gas, 1 bar) and the Campbell-Sellers S°_ad, eV/K.
    recommended : ndarray of str or None
        Model recommended at each temperature by the rule of thumb.
    recommendation : str
        One-paragraph summary of the recommendation.
    rule : str
        The rule used, with its rationale.
    """

    name: str
    temperature: np.ndarray
    standard_state: str
    standard_state_description: str
    results: tuple
    skipped: tuple
    translation_ratio: np.ndarray | None
    rotation_ratio: np.ndarray | None
    gas_entropy: np.ndarray | None
    correlation_entropy: np.ndarray | None
    recommended: np.ndarray | None
    recommendation: str
    rule: str

    def __getitem__(self, model: str) -> ModelResult:
        for r in self.results:
            if r.model == model:
                return r
        msg = f"model {model!r} is not in this comparison; evaluated: {', '.join(r.model for r in self.results)}"
        raise KeyError(msg)

    @property
    def models(self) -> tuple:
        """Names of the evaluated models."""
        return tuple(r.model for r in self.results)

    def as_dict(self) -> dict:
        """Plain-Python description, entropies in J/(mol K) and eV/K, energies in eV."""
        f = lambda a: None if a is None else np.asarray(a, dtype=float).tolist()  # noqa: E731
        out = {
            "name": self.name,
            "temperature_K": f(self.temperature),
            "standard_state": self.standard_state,
            "standard_state_description": self.standard_state_description,
            "translation_barrier_over_kT": f(self.translation_ratio),
            "rotation_barrier_over_kT": f(self.rotation_ratio),
            "gas_standard_entropy_J_mol_K": f(None if self.gas_entropy is None
                                              else C.to_j_per_mol_k(self.gas_entropy)),
            "correlation": {
                "source": "Campbell and Sellers, J. Am. Chem. Soc. 2012, 134, 18109",
                "equation": "S°_ad = 0.70 S°_gas(T, 1 bar) - 3.3 R; standard deviation 2R",
                "entropy_J_mol_K": f(None if self.correlation_entropy is None
                                     else C.to_j_per_mol_k(self.correlation_entropy)),
                "flag_beyond_standard_deviations": FLAG_SIGMAS,
            },
            "models": {},
            "skipped": {m: why for m, why in self.skipped},
            "recommended": None if self.recommended is None else np.asarray(self.recommended).tolist(),
            "recommendation": self.recommendation,
            "rule": self.rule,
        }
        for r in self.results:
            out["models"][r.model] = {
                "mobile": r.mobile,
                "standard_entropy_J_mol_K": f(C.to_j_per_mol_k(r.entropy)),
                "standard_entropy_eV_K": f(r.entropy),
                "standard_gibbs_eV": f(r.gibbs),
                "standard_enthalpy_eV": f(r.enthalpy),
                "site_entropy_J_mol_K": f(C.to_j_per_mol_k(r.site_entropy)),
                "site_gibbs_eV": f(r.site_gibbs),
                "deviation_from_correlation_sd": f(r.deviation),
                "flagged": None if r.flagged is None else np.asarray(r.flagged).tolist(),
                "choices": r.choices,
                "warnings": list(r.warnings),
            }
        return out


# ---------------------------------------------------------------------------
# compare_models
# ---------------------------------------------------------------------------


def _number_of_adsorbate_atoms(atoms, params, n_modes):
    if atoms is not None:
        from adsorb.geometry import adsorbate_indices

        return len(adsorbate_indices(atoms, indices=params.get("indices")))
    return n_modes // 3 if n_modes % 3 == 0 else None


def _missing(model, params, atoms, n_modes):
    """Inputs missing for a model (empty list: the model applies)."""
    if model in ("harmonic", "lattice-gas"):
        return []
    missing = []
    if params.get("mass") is None and atoms is None:
        missing.append("mass (or atoms)")
    if params.get("site_spacing") is None and params.get("site_area") is None:
        missing.append("site_spacing or site_area")
    if model == "hindered":
        if params.get("translation_barrier") is None:
            missing.append("translation_barrier")
        if _number_of_adsorbate_atoms(atoms, params, n_modes) != 1:
            for key in ("rotation_barrier", "rotation_minima"):
                if params.get(key) is None:
                    missing.append(key)
            if params.get("inertia") is None and atoms is None:
                missing.append("inertia (or atoms)")
    return missing


def _gas_entropy(gas, gas_entropy, t):
    if gas is not None and gas_entropy is not None:
        msg = "compare_models: give gas or gas_entropy, not both"
        raise InputError(msg)
    if gas is None and gas_entropy is None:
        return None
    if gas_entropy is not None:
        s = np.asarray(gas_entropy, dtype=float)
        if s.shape != t.shape and not (s.size == 1 and t.size == 1):
            msg = (f"compare_models gas_entropy: expected one S° per temperature (shape {t.shape}; S° depends "
                   f"on T), got shape {s.shape}")
            raise InputError(msg)
        return s.reshape(t.shape).copy()
    if isinstance(gas, ThermoTable):
        table = gas
    elif hasattr(gas, "thermo"):
        table = gas.thermo(t, pressure=C.P_STANDARD)
    else:
        msg = f"compare_models gas: expected a gas molecule (with .thermo) or a ThermoTable, got {gas!r}"
        raise InputError(msg)
    if table.pressure is None or not np.allclose(table.pressure, C.P_STANDARD, rtol=1e-12):
        msg = f"compare_models gas: the gas table {table.name!r} must be at p° = {C.P_STANDARD:g} Pa"
        raise InputError(msg)
    if table.temperature.shape != t.shape or not np.allclose(table.temperature, t, rtol=1e-12, atol=0):
        msg = f"compare_models gas: the gas table {table.name!r} was evaluated on other temperatures"
        raise InputError(msg)
    return np.asarray(table.entropy, dtype=float)


def _ranges(temperature, labels):
    """'label for T1-T2 K' pieces for runs of equal labels in temperature order."""
    t = np.ravel(temperature)
    lab = np.ravel(labels)
    order = np.argsort(t, kind="stable")
    t, lab = t[order], lab[order]
    pieces, start = [], 0
    for i in range(1, t.size + 1):
        if i == t.size or lab[i] != lab[start]:
            span = f"{t[start]:g} K" if i - 1 == start else f"{t[start]:g}-{t[i - 1]:g} K"
            pieces.append((lab[start], span))
            start = i
    return pieces


def compare_models(frequencies, temperature, *, energy: float = 0.0, atoms=None, gas=None, gas_entropy=None,
                   standard_state: str = "lattice-half", name: str = "adsorbate", free_below: float = 1.0,
                   localized_from: float = 10.0, **adsorbate_parameters) -> ModelComparison:
    """Entropy and Gibbs energy of one adsorbate under every applicable model.

    Parameters
    ----------
    frequencies : sequence of float
        The adsorbate's 3N wavenumbers in cm^-1 (as for :class:`Adsorbate`).
    temperature : float or ndarray
        Temperatures in K.
    energy : float, optional
        Electronic energy in eV (slab included).
    atoms : ase.Atoms, optional
        Structure (gives mass and inertia about the normal).
    gas : gas molecule or ThermoTable, optional
        The matching gas molecule (an object whose ``.thermo(T, pressure=p)``
        returns a ThermoTable, e.g. :class:`adsorb.gas.GasMolecule`) or its
        table at 1 bar on the same temperatures; enables the Campbell-Sellers
        comparison.
    gas_entropy : float or ndarray, optional
        Instead of ``gas``: S°(gas, 1 bar) in eV/K per molecule, one value
        per temperature (same shape as ``temperature``).
    standard_state : str, optional
        Named standard state for S° and G° (see
        :data:`adsorb.standard_states.STANDARD_STATES`); default
        ``"lattice-half"`` (theta° = 1/2).
    name : str, optional
        Label.
    free_below, localized_from : float, optional
        Thresholds of the rule of thumb (see :func:`recommend_model`).
    **adsorbate_parameters
        Keywords of :class:`Adsorbate` (mass, translation_barrier,
        site_spacing or site_area, rotation_barrier, rotation_minima,
        symmetry_number, inertia, indices, low_frequency, ...), in eV, Å,
        Å^2, amu, amu Å^2.

    Returns
    -------
    ModelComparison

    Raises
    ------
    InputError
        Bad temperatures, unknown parameters, inconsistent gas input, a
        standard state that needs a site area that was not given.
    """
    from adsorb.adsorbate import Adsorbate
    from adsorb.standard_states import describe_state, standard_thermo

    t = np.asarray(temperature, dtype=float)
    if t.size == 0 or not np.all(np.isfinite(t)) or np.any(t <= 0):
        msg = f"compare_models temperature: expected finite values > 0 K, got {temperature!r}"
        raise InputError(msg)
    params = {k: v for k, v in adsorbate_parameters.items() if v is not None}
    if "name" in params:
        msg = "compare_models: pass the label as name=..., it is not a model parameter here"
        raise InputError(msg)
    description = describe_state(standard_state)
    n_modes = int(np.size(frequencies))
    site_area = None
    if params.get("site_area") is not None:
        site_area = float(params["site_area"])
    elif params.get("site_spacing") is not None:
        site_area = float(params["site_spacing"]) ** 2

    s_gas = _gas_entropy(gas, gas_entropy, t)
    s_corr = None if s_gas is None else campbell_sellers_entropy(s_gas)
    sd = CORRELATION_SD_R * C.kB_eV

    results, skipped = [], []
    for model in MODEL_ORDER:
        missing = _missing(model, params, atoms, n_modes)
        if missing:
            skipped.append((model, f"needs {', '.join(missing)}"))
            continue
        ads = Adsorbate(frequencies, energy, model=model, atoms=atoms, name=f"{name} ({model})", **params)
        with warnings.catch_warnings():
            # every model is evaluated on purpose, also outside its domain: the table records
            # its ModelWarnings and the comparison reports them per model
            warnings.simplefilter("ignore", ModelWarning)
            table = ads.thermo(t)
        st = standard_thermo(table, standard_state, site_area_A2=site_area)
        dev = None if s_corr is None else (st.entropy - s_corr) / sd
        results.append(ModelResult(model=model, mobile=bool(table.choices["mobile"]), entropy=st.entropy,
                                   gibbs=st.gibbs, enthalpy=st.enthalpy, site_entropy=table.entropy,
                                   site_gibbs=table.gibbs,
                                   deviation=dev, flagged=None if dev is None else np.abs(dev) > FLAG_SIGMAS,
                                   choices=table.choices, warnings=table.warnings))

    kt = C.kB_eV * t
    tr = None if params.get("translation_barrier") is None else float(params["translation_barrier"]) / kt
    rr = None if params.get("rotation_barrier") is None else float(params["rotation_barrier"]) / kt
    if tr is not None and (not np.all(np.isfinite(tr)) or np.any(tr < 0)):
        msg = f"compare_models translation_barrier: expected a number >= 0 in eV, got {params['translation_barrier']!r}"
        raise InputError(msg)
    if rr is not None and (not np.all(np.isfinite(rr)) or np.any(rr < 0)):
        msg = f"compare_models rotation_barrier: expected a number >= 0 in eV, got {params['rotation_barrier']!r}"
        raise InputError(msg)
    rule = RULE_OF_THUMB.format(free=free_below, local=localized_from)
    evaluated = {r.model for r in results}
    if tr is None:
        recommended = None
        text = ("no translation_barrier given: the rule of thumb cannot be applied; compare the models "
                "with the correlation instead")
    else:
        recommended = recommend_model(tr, rr, free_below=free_below, localized_from=localized_from)
        text = "; ".join(f"{m} for {span}" for m, span in _ranges(t, recommended))
        not_done = sorted(set(np.ravel(recommended)) - evaluated)
        if not_done:
            reasons = dict(skipped)
            text += "; not evaluated here: " + "; ".join(f"{m} ({reasons.get(m, 'not applicable')})"
                                                         for m in not_done)
    if s_corr is not None:
        flagged = [r.model for r in results if np.any(r.flagged)]
        if flagged:
            text += (f". Outside {FLAG_SIGMAS:g} standard deviations ({FLAG_SIGMAS * CORRELATION_SD_R:g}R) "
                     f"of the Campbell-Sellers correlation at some temperatures: {', '.join(flagged)}")
        else:
            text += f". Every model lies within {FLAG_SIGMAS:g} standard deviations of the Campbell-Sellers correlation"
    return ModelComparison(name=name, temperature=t, standard_state=standard_state,
                           standard_state_description=description, results=tuple(results),
                           skipped=tuple(skipped), translation_ratio=tr, rotation_ratio=rr, gas_entropy=s_gas,
                           correlation_entropy=s_corr, recommended=recommended, recommendation=text, rule=rule)


# ---------------------------------------------------------------------------
# plot
# ---------------------------------------------------------------------------


def plot_model_entropies(comparison: ModelComparison, path, *, title: str | None = None):
    """S°(T) of every model with the Campbell-Sellers band; writes ``<path>.png`` and ``<path>.svg``.

    The correlation is drawn as a line with its ±1 standard deviation (±2R)
    band shaded, and a lighter ±2 standard deviation (±4R) band, the limit
    beyond which models are flagged.

    Parameters
    ----------
    comparison : ModelComparison
    path : str or Path
        Output file stem.
    title : str, optional

    Returns
    -------
    matplotlib.figure.Figure
        Model curves carry gid ``"model:<name>"``, the correlation line
        ``"correlation"``.
    """
    if not isinstance(comparison, ModelComparison):
        msg = "plot_model_entropies: expected the ModelComparison returned by compare_models"
        raise InputError(msg)
    import matplotlib

    matplotlib.use("Agg")
    from matplotlib.figure import Figure

    from adsorb.fileout import write_figure

    t = np.ravel(comparison.temperature)
    order = np.argsort(t, kind="stable")
    t = t[order]
    marker = "o" if t.size < 12 else None
    fig = Figure(figsize=(6.4, 4.4))
    ax = fig.add_subplot()
    r_j = C.R
    if comparison.correlation_entropy is not None:
        sc = C.to_j_per_mol_k(np.ravel(comparison.correlation_entropy)[order])
        sd = CORRELATION_SD_R * r_j
        ax.fill_between(t, sc - FLAG_SIGMAS * sd, sc + FLAG_SIGMAS * sd, color="0.85", lw=0,
                        label=f"correlation ± {FLAG_SIGMAS * CORRELATION_SD_R:g}R (flag limit)")
        ax.fill_between(t, sc - sd, sc + sd, color="0.7", lw=0, label=f"correlation ± {CORRELATION_SD_R:g}R (1 SD)")
        ax.plot(t, sc, color="k", lw=1.2, ls="--", marker=marker, gid="correlation",
                label="Campbell–Sellers 0.70 S°gas − 3.3R")
    styles = {"harmonic": "-", "lattice-gas": (0, (1, 1)), "hindered": "-", "2d-gas": "-"}
    for r in comparison.results:
        ax.plot(t, C.to_j_per_mol_k(np.ravel(r.entropy)[order]), ls=styles.get(r.model, "-"), marker=marker,
                gid=f"model:{r.model}", label=r.model)
    ax.set_xlabel("T (K)")
    ax.set_ylabel(f"S° (J mol⁻¹ K⁻¹), standard state {comparison.standard_state}")
    ax.set_title(title or comparison.name)
    ax.legend(fontsize=8, loc="best", frameon=True, framealpha=0.9)
    fig.tight_layout()
    write_figure(fig, path)
    return fig
