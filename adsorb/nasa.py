"""NASA 7-coefficient polynomials fitted to thermochemistry tables.

Form (B. J. McBride, S. Gordon, M. A. Reno, "Coefficients for Calculating
Thermodynamic and Transport Properties of Individual Species", NASA TM-4513,
1993), on each of two temperature ranges that meet at a common temperature T_m:

    Cp/R  = a1 + a2 T + a3 T^2 + a4 T^3 + a5 T^4
    H/RT  = a1 + a2 T/2 + a3 T^2/3 + a4 T^3/4 + a5 T^4/5 + a6/T
    S/R   = a1 ln T + a2 T + a3 T^2/2 + a4 T^3/3 + a5 T^4/4 + a7

The coefficients are dimensionless, so the same numbers serve per mole (R)
and per molecule (k_B, the package's working unit). H keeps the zero of the
input table (for adsorb's tables: electronic energy + ZPE + thermal
enthalpy, i.e. a DFT reference, not a formation enthalpy), recorded as the
``enthalpy_reference`` of the result.

Fit: least squares of Cp/R, H/RT and S/R over both ranges at once, subject
to four equality constraints at T_m — Cp, dCp/dT, H and S equal from both
sides. The KKT (Lagrange) conditions of this equality-constrained least-squares
problem are solved by the null-space method (QR factorisation of the
constraint matrix, then an SVD least-squares solve in the constraint null
space), so the constraints hold to rounding with no penalty term; T is scaled
by 1000 K and the columns equilibrated first. ``objective='minimax'`` instead
minimises the largest relative residual (Lawson's iteratively reweighted
least squares, C. L. Lawson, PhD thesis, UCLA 1961), which lowers the
worst-case Cp error at the range ends.

Caution: the polynomials are interpolants of the fitted range; values
outside [T_low, T_high] are extrapolations and raise a ModelWarning.
"""

from __future__ import annotations

import csv
import io
import json
import warnings
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from adsorb import constants as C
from adsorb.errors import InputError, ModelWarning
from adsorb.fileout import write_json_atomic, write_text_atomic

__all__ = ["NasaPolynomial", "fit_nasa7", "nasa_from_dict", "read_nasa_json", "read_nasa_csv"]

_T_SCALE = 1000.0
KB = C.kB_eV
_CSV_FIELDS = ["species", "range", "t_min_K", "t_max_K", "a1", "a2", "a3", "a4", "a5", "a6", "a7",
               "units", "enthalpy_reference"]
_UNITS = "dimensionless: Cp/R, H/RT, S/R with T in K (R = k_B per molecule); evaluated in eV, eV/K per molecule"


# ---------------------------------------------------------------------------
# basis rows
# ---------------------------------------------------------------------------
def _rows_cp(t):
    return np.stack([np.ones_like(t), t, t**2, t**3, t**4, np.zeros_like(t), np.zeros_like(t)], axis=-1)


def _rows_dcp(t):
    return np.stack([np.zeros_like(t), np.ones_like(t), 2 * t, 3 * t**2, 4 * t**3,
                     np.zeros_like(t), np.zeros_like(t)], axis=-1)


def _rows_h(t):
    return np.stack([np.ones_like(t), t / 2, t**2 / 3, t**3 / 4, t**4 / 5, 1 / t, np.zeros_like(t)], axis=-1)


def _rows_s(t):
    return np.stack([np.log(t), t, t**2 / 2, t**3 / 3, t**4 / 4, np.zeros_like(t), np.ones_like(t)], axis=-1)


def _unscale(b):
    """Coefficients for τ = T/T_s -> coefficients for T (exact algebra)."""
    a = np.empty(7)
    for j in range(5):
        a[j] = b[j] / _T_SCALE**j
    a[5] = b[5] * _T_SCALE
    a[6] = b[6] - b[0] * np.log(_T_SCALE)
    return a


# ---------------------------------------------------------------------------
# the result
# ---------------------------------------------------------------------------
@dataclass(frozen=True)
class NasaPolynomial:
    """Two-range NASA 7-coefficient polynomial of one species.

    Attributes
    ----------
    name : str
    t_low_K, t_mid_K, t_high_K : float
        Range limits and the common temperature.
    low, high : tuple of 7 floats
        a1..a7 for [t_low, t_mid] and [t_mid, t_high].
    enthalpy_reference : str
        What H = 0 means for this species (the zero of the input table).
    fit_errors : dict
        Per range ('low', 'high'): maximum absolute and relative deviations of the
        polynomial from the fitted data in Cp (eV/K), H (eV) and S (eV/K), also in
        J/(mol K) and kJ/mol. Relative H errors are relative to the enthalpy
        increment over that range.
    """

    name: str
    t_low_K: float
    t_mid_K: float
    t_high_K: float
    low: tuple
    high: tuple
    enthalpy_reference: str = "as supplied"
    fit_errors: dict = field(default_factory=dict)

    # ---- evaluation -----------------------------------------------------
    def _select(self, temperature):
        t = np.asarray(temperature, dtype=float)
        if not np.all(np.isfinite(t) & (t > 0)):
            raise InputError(f"temperature must be finite and > 0 K; got {temperature!r}")
        outside = (t < self.t_low_K * (1 - 1e-12)) | (t > self.t_high_K * (1 + 1e-12))
        if np.any(outside):
            warnings.warn(f"NASA polynomial of {self.name or 'species'} evaluated at {t[outside].flat[0]:g} K, "
                          f"outside its fitted range {self.t_low_K:g}-{self.t_high_K:g} K (extrapolation)",
                          ModelWarning, stacklevel=3)
        coef = np.where((t <= self.t_mid_K)[..., None], np.asarray(self.low), np.asarray(self.high))
        return t, coef

    def heat_capacity(self, temperature):
        """Cp in eV/K per molecule."""
        t, a = self._select(temperature)
        return KB * np.sum(a * _rows_cp(t), axis=-1)

    def enthalpy(self, temperature):
        """H in eV per molecule (zero as in ``enthalpy_reference``)."""
        t, a = self._select(temperature)
        return KB * t * np.sum(a * _rows_h(t), axis=-1)

    def entropy(self, temperature):
        """S in eV/K per molecule (at the pressure of the fitted table)."""
        t, a = self._select(temperature)
        return KB * np.sum(a * _rows_s(t), axis=-1)

    def gibbs(self, temperature):
        """G = H - TS in eV per molecule."""
        t = np.asarray(temperature, dtype=float)
        with warnings.catch_warnings():
            warnings.simplefilter("ignore", ModelWarning)
            h = self.enthalpy(t)
        return h - t * self.entropy(t)

    # ---- files --------------------------------------------------------------
    def to_dict(self) -> dict:
        """Plain description (coefficients with full precision, units, reference, fit errors)."""
        return {
            "species": self.name,
            "format": "NASA 7-coefficient polynomial, two ranges (McBride, Gordon, Reno, NASA TM-4513, 1993)",
            "units": _UNITS,
            "enthalpy_reference": self.enthalpy_reference,
            "t_low_K": self.t_low_K, "t_mid_K": self.t_mid_K, "t_high_K": self.t_high_K,
            "low": [float(x) for x in self.low],
            "high": [float(x) for x in self.high],
            "fit_errors": self.fit_errors,
        }

    def to_json(self, path=None) -> dict:
        """Return :meth:`to_dict`; write it atomically as JSON when ``path`` is given."""
        data = self.to_dict()
        if path is not None:
            write_json_atomic(path, data)
        return data

    def to_csv(self, path=None) -> str:
        """Two rows (low, high range) with a1..a7 at full precision; written atomically when ``path`` is given."""
        buf = io.StringIO()
        writer = csv.DictWriter(buf, fieldnames=_CSV_FIELDS, lineterminator="\n")
        writer.writeheader()
        for label, lo, hi, coef in (("low", self.t_low_K, self.t_mid_K, self.low),
                                    ("high", self.t_mid_K, self.t_high_K, self.high)):
            row = {"species": self.name, "range": label, "t_min_K": repr(float(lo)), "t_max_K": repr(float(hi)),
                   "units": _UNITS, "enthalpy_reference": self.enthalpy_reference}
            row.update({f"a{i + 1}": repr(float(c)) for i, c in enumerate(coef)})
            writer.writerow(row)
        text = buf.getvalue()
        if path is not None:
            write_text_atomic(path, text)
        return text


def nasa_from_dict(data) -> NasaPolynomial:
    """Rebuild a :class:`NasaPolynomial` from :meth:`NasaPolynomial.to_dict` output."""
    try:
        low = tuple(float(x) for x in data["low"])
        high = tuple(float(x) for x in data["high"])
        poly = NasaPolynomial(name=str(data.get("species", "")), t_low_K=float(data["t_low_K"]),
                              t_mid_K=float(data["t_mid_K"]), t_high_K=float(data["t_high_K"]), low=low, high=high,
                              enthalpy_reference=str(data.get("enthalpy_reference", "as supplied")),
                              fit_errors=dict(data.get("fit_errors", {})))
    except (KeyError, TypeError, ValueError) as exc:
        raise InputError(f"NASA polynomial data is missing or has a bad field: {exc}") from None
    if len(low) != 7 or len(high) != 7:
        raise InputError(f"NASA polynomial needs 7 coefficients per range; got {len(low)} and {len(high)}")
    return poly


def read_nasa_json(path) -> NasaPolynomial:
    """Read a polynomial written by :meth:`NasaPolynomial.to_json`."""
    path = Path(path)
    try:
        data = json.loads(path.read_text(encoding="utf-8"))
    except (OSError, json.JSONDecodeError) as exc:
        raise InputError(f"cannot read NASA polynomial JSON {path}: {exc}") from None
    return nasa_from_dict(data)


def read_nasa_csv(path) -> NasaPolynomial:
    """Read a polynomial written by :meth:`NasaPolynomial.to_csv` (one species, rows 'low' and 'high')."""
    path = Path(path)
    try:
        rows = list(csv.DictReader(io.StringIO(path.read_text(encoding="utf-8"))))
    except OSError as exc:
        raise InputError(f"cannot read NASA polynomial CSV {path}: {exc}") from None
    by_range = {r.get("range"): r for r in rows}
    if set(by_range) != {"low", "high"}:
        raise InputError(f"{path}: expected rows with range 'low' and 'high'; got {sorted(map(str, by_range))}")
    lo, hi = by_range["low"], by_range["high"]
    try:
        return NasaPolynomial(name=lo["species"], t_low_K=float(lo["t_min_K"]), t_mid_K=float(lo["t_max_K"]),
                              t_high_K=float(hi["t_max_K"]),
                              low=tuple(float(lo[f"a{i}"]) for i in range(1, 8)),
                              high=tuple(float(hi[f"a{i}"]) for i in range(1, 8)),
                              enthalpy_reference=lo.get("enthalpy_reference", "as supplied"))
    except (KeyError, TypeError, ValueError) as exc:
        raise InputError(f"{path}: bad NASA polynomial row: {exc}") from None


# ---------------------------------------------------------------------------
# the fit
# ---------------------------------------------------------------------------
def _table_arrays(source, t_low, t_high, n_samples):
    """(T, Cp, H, S) 1D arrays from a table-like object, a species with thermo(T), or a callable."""
    obj = source
    if not all(hasattr(obj, a) for a in ("temperature", "heat_capacity", "enthalpy", "entropy")):
        func = obj.thermo if hasattr(obj, "thermo") and callable(obj.thermo) else obj if callable(obj) else None
        if func is None:
            raise InputError("source must have arrays temperature, heat_capacity, enthalpy, entropy "
                             "(e.g. a ThermoTable), a thermo(T) method, or be a callable of T")
        if t_low is None or t_high is None:
            raise InputError("t_low_K and t_high_K are needed when the source is a callable")
        grid = np.unique(np.concatenate([np.geomspace(t_low, t_high, n_samples)]))
        obj = func(grid)
        if not all(hasattr(obj, a) for a in ("temperature", "heat_capacity", "enthalpy", "entropy")):
            raise InputError("the thermo callable must return an object with temperature, heat_capacity, "
                             "enthalpy and entropy arrays")
    arrays = []
    for name in ("temperature", "heat_capacity", "enthalpy", "entropy"):
        arr = np.asarray(getattr(obj, name), dtype=float)
        arr = np.squeeze(arr)
        if arr.ndim != 1:
            raise InputError(f"source.{name} must be one-dimensional (one pressure); got shape {arr.shape}")
        arrays.append(arr)
    t, cp, h, s = arrays
    if not (t.size == cp.size == h.size == s.size):
        raise InputError(f"source arrays differ in length: T {t.size}, Cp {cp.size}, H {h.size}, S {s.size}")
    good = np.isfinite(t) & np.isfinite(cp) & np.isfinite(h) & np.isfinite(s)
    if not np.all(good):
        raise InputError(f"source has non-finite values at T = {t[~good][0]!r} K")
    if np.any(t <= 0):
        raise InputError("source.temperature must be > 0 K")
    order = np.argsort(t)
    return t[order], cp[order], h[order], s[order]


@dataclass(frozen=True)
class _Arrays:
    temperature: np.ndarray
    heat_capacity: np.ndarray
    enthalpy: np.ndarray
    entropy: np.ndarray


def fit_nasa7(source, *, t_low_K=None, t_mid_K=1000.0, t_high_K=None, name=None,
              weights=(1.0, 1.0, 1.0), objective="least_squares", lawson_iterations=80,
              n_samples=150, enthalpy_reference=None, enthalpy_offset_eV=0.0) -> NasaPolynomial:
    """Fit a two-range NASA 7-coefficient polynomial with Cp, dCp/dT, H and S continuous at T_mid.

    Parameters
    ----------
    source : ThermoTable-like, species or callable
        Anything with 1D arrays ``temperature`` (K), ``heat_capacity`` (eV/K),
        ``enthalpy`` (eV) and ``entropy`` (eV/K) per molecule (e.g.
        :class:`adsorb.thermo.ThermoTable` at one pressure); or an object with a
        ``thermo(T)`` method returning one; or a callable T -> one. Callables are
        sampled at ``n_samples`` log-spaced temperatures.
    t_low_K, t_high_K : float, optional
        Range to fit (default: the table's extent).
    t_mid_K : float or 'auto', optional
        Common temperature (default 1000 K, the usual NASA choice). 'auto' tries
        31 temperatures inside the range and keeps the fit with the smallest
        worst relative Cp error.
    name : str, optional
        Species label (default: ``source.name`` if present).
    weights : 3 floats, optional
        Weights of the relative Cp, H/RT and S residuals (default equal).
    objective : {'least_squares', 'minimax'}, optional
        Least squares of the relative residuals (default), or their largest
        value minimised by Lawson's reweighting (``lawson_iterations`` steps).
    lawson_iterations : int, optional
        Reweighting steps of the minimax objective (default 80).
    n_samples : int, optional
        Samples of a callable source.
    enthalpy_reference : str, optional
        Text recorded with the coefficients saying what H = 0 is
        (default: the electronic-energy + ZPE reference of adsorb's tables).
    enthalpy_offset_eV : float, optional
        Added to every H before the fit (e.g. to put H on a formation-enthalpy scale).

    Returns
    -------
    NasaPolynomial

    Raises
    ------
    InputError
        Bad ranges, fewer than 8 data points in a range, malformed source.
    """
    t_low_in = None if t_low_K is None else float(t_low_K)
    t_high_in = None if t_high_K is None else float(t_high_K)
    if not isinstance(n_samples, (int, np.integer)) or n_samples < 20:
        raise InputError(f"n_samples must be an integer >= 20; got {n_samples!r}")
    t, cp, h, s = _table_arrays(source, t_low_in, t_high_in, int(n_samples))
    t_low = float(t[0]) if t_low_in is None else t_low_in
    t_high = float(t[-1]) if t_high_in is None else t_high_in
    if isinstance(t_mid_K, str):
        if t_mid_K != "auto":
            raise InputError(f"t_mid_K must be a temperature in K or 'auto'; got {t_mid_K!r}")
        inner = t[(t > t_low) & (t < t_high)]
        if inner.size < 20:
            raise InputError(f"t_mid_K='auto' needs at least 20 data points inside {t_low:g}-{t_high:g} K")
        candidates = np.unique(np.round(np.geomspace(inner[8], inner[-9], 31) / 10.0) * 10.0)
        best = None
        for cand in candidates:
            try:
                trial = fit_nasa7(_Arrays(t, cp, h, s), t_low_K=t_low, t_mid_K=float(cand), t_high_K=t_high,
                                  name=name if name is not None else str(getattr(source, "name", "") or ""),
                                  weights=weights, objective=objective, lawson_iterations=lawson_iterations,
                                  enthalpy_reference=enthalpy_reference, enthalpy_offset_eV=enthalpy_offset_eV)
            except InputError:
                continue
            worst = max(err["cp_max_rel"] for err in trial.fit_errors.values())
            if best is None or worst < best[0]:
                best = (worst, trial)
        return best[1]
    t_mid = float(t_mid_K)
    if not (0 < t_low < t_mid < t_high):
        raise InputError(f"need 0 < t_low_K < t_mid_K < t_high_K; got {t_low:g}, {t_mid:g}, {t_high:g} K")
    w = np.asarray(weights, dtype=float)
    if w.shape != (3,) or not np.all(np.isfinite(w) & (w > 0)):
        raise InputError(f"weights must be three positive numbers (Cp, H, S); got {weights!r}")
    h = h + float(enthalpy_offset_eV)
    tol = 1e-9 * t_high
    masks = {"low": (t >= t_low - tol) & (t <= t_mid + tol), "high": (t >= t_mid - tol) & (t <= t_high + tol)}
    for label, mask in masks.items():
        if mask.sum() < 8:
            raise InputError(f"only {int(mask.sum())} data points in the {label} range "
                             f"({t_low:g}-{t_mid:g}-{t_high:g} K); need at least 8")
    tau = t / _T_SCALE
    blocks_a, blocks_b = [], []
    for col, mask in enumerate((masks["low"], masks["high"])):
        tm = tau[mask]
        # rows in relative form: residuals of Cp/R, H/RT, S/R divided by the data's own size
        # (Cp/R, max(|H/RT|, 1), S/R), times the user's weights
        ncp = np.abs(cp[mask]) / KB
        nh = np.maximum(np.abs(h[mask]) / (KB * t[mask]), 1.0)
        ns = np.maximum(np.abs(s[mask]) / KB, 1.0)
        rows = np.vstack([w[0] * _rows_cp(tm) / ncp[:, None], w[1] * _rows_h(tm) / nh[:, None],
                          w[2] * _rows_s(tm) / ns[:, None]])
        full = np.zeros((rows.shape[0], 14))
        full[:, 7 * col:7 * col + 7] = rows
        blocks_a.append(full)
        blocks_b.append(np.concatenate([w[0] * cp[mask] / KB / ncp, w[1] * h[mask] / (KB * t[mask]) / nh,
                                        w[2] * s[mask] / KB / ns]))
    a_mat = np.vstack(blocks_a)
    b_vec = np.concatenate(blocks_b)
    taum = np.array([t_mid / _T_SCALE])
    cons = np.vstack([f(taum) for f in (_rows_cp, _rows_dcp, _rows_h, _rows_s)])
    c_mat = np.hstack([cons, -cons])
    # column equilibration (the same scaling on A and C keeps the constraints exact)
    scale = np.sqrt(np.sum(a_mat**2, axis=0))
    scale[scale == 0] = 1.0
    a_s = a_mat / scale
    c_s = c_mat / scale

    # KKT conditions of min ||W(Ax - b)|| subject to Cx = 0, solved by the null-space method: with
    # C^T = Q R, every feasible x is Q2 z (Q2 = last 10 columns of Q), and z solves an unconstrained
    # least-squares problem (SVD). The constraints then hold to rounding, with no penalty parameter.
    q_full, _ = np.linalg.qr(c_s.T, mode="complete")
    null = q_full[:, c_s.shape[0]:]
    a_null = a_s @ null

    def kkt_solve(row_weight):
        z = np.linalg.lstsq(a_null * row_weight[:, None], b_vec * row_weight, rcond=None)[0]
        return null @ z

    row_w = np.ones(len(b_vec))
    y = kkt_solve(row_w)
    if objective == "minimax":
        # Lawson's algorithm: iteratively reweighted least squares whose weights grow where the residual is
        # large; converges to the constrained best uniform (L-infinity) fit of the relative residuals
        u = np.full(len(b_vec), 1.0 / len(b_vec))
        best = (np.max(np.abs(a_s @ y - b_vec)), y)
        for _ in range(lawson_iterations):
            r = np.abs(a_s @ y - b_vec)
            u = u * r
            total = u.sum()
            if not np.isfinite(total) or total <= 0:
                break
            u /= total
            u = np.maximum(u, 1e-7 * u.max())  # a floor keeps the weighted normal matrix regular
            u /= u.sum()
            y = kkt_solve(np.sqrt(u))
            err = np.max(np.abs(a_s @ y - b_vec))
            if err < best[0]:
                best = (err, y)
        y = best[1]
    elif objective != "least_squares":
        raise InputError(f"objective must be 'least_squares' or 'minimax'; got {objective!r}")
    x = y / scale
    low = tuple(float(v) for v in _unscale(x[:7]))
    high = tuple(float(v) for v in _unscale(x[7:]))
    label = name if name is not None else str(getattr(source, "name", "") or "")
    ref = enthalpy_reference or ("H as in the input table: electronic energy + zero-point energy + thermal "
                                 "enthalpy (adsorb convention; not a formation enthalpy)"
                                 + (f", shifted by {enthalpy_offset_eV:g} eV" if enthalpy_offset_eV else ""))
    poly = NasaPolynomial(name=label, t_low_K=t_low, t_mid_K=t_mid, t_high_K=t_high, low=low, high=high,
                          enthalpy_reference=ref)
    errors = {}
    for rng, mask in masks.items():
        tt = t[mask]
        dcp = poly.heat_capacity(tt) - cp[mask]
        dh = poly.enthalpy(tt) - h[mask]
        ds = poly.entropy(tt) - s[mask]
        span = max(float(np.ptp(h[mask])), KB * float(tt.max()))
        errors[rng] = {
            "t_min_K": float(tt.min()), "t_max_K": float(tt.max()), "n_points": int(mask.sum()),
            "cp_max_abs_eV_K": float(np.max(np.abs(dcp))),
            "cp_max_abs_J_mol_K": float(C.to_j_per_mol_k(np.max(np.abs(dcp)))),
            "cp_max_rel": float(np.max(np.abs(dcp) / np.maximum(np.abs(cp[mask]), 1e-300))),
            "h_max_abs_eV": float(np.max(np.abs(dh))),
            "h_max_abs_kJ_mol": float(C.to_kj_per_mol(np.max(np.abs(dh)))),
            "h_max_rel_to_increment": float(np.max(np.abs(dh)) / span),
            "s_max_abs_eV_K": float(np.max(np.abs(ds))),
            "s_max_abs_J_mol_K": float(C.to_j_per_mol_k(np.max(np.abs(ds)))),
            "s_max_rel": float(np.max(np.abs(ds) / np.maximum(np.abs(s[mask]), 1e-300))),
        }
    return NasaPolynomial(name=label, t_low_K=t_low, t_mid_K=t_mid, t_high_K=t_high, low=low, high=high,
                          enthalpy_reference=ref, fit_errors=errors)
