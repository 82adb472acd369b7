"""Screening: adsorption free energies (and coverages) for many ase.db rows at once.

A database holds adsorbates on many surfaces, the clean slabs and the gas
references, told apart by key-value pairs (documented in docs/user-guide.md):

* gas rows: ``role="gas"``, ``gas=<name>``, the energy, ``data["frequencies"]``
  (3N-5 or 3N-6 wavenumbers in cm^-1); optional ``symmetry_number``,
  ``multiplicity`` key-value pairs and ``data["rotational_constants"]``;
* slab rows: ``role="slab"``, ``surface=<name>``, the energy;
* adsorbate rows: ``role="adsorbate"``, ``surface=<name>``, ``gas=<name>`` (the
  gas precursor), optional ``dissociative=True`` (A2 + 2* -> 2A*) and
  ``adsorbate=<label>``, the energy (slab included) and ``data["frequencies"]``
  (the 3N adsorbate modes, cm^-1, all real).

Adsorbates are treated in the harmonic (localized, lattice-gas) model. The
thermochemistry is vectorised over rows: rows with the same number of modes,
gas and dissociation flag form one group whose frequencies are one 2D array
for :func:`adsorb.partition.vibration.harmonic` (temperatures on axis 0), and
the reaction sums go through :func:`adsorb.equilibria.reaction_terms`. The
equilibrium constant is that of :mod:`adsorb.equilibria`,
K = exp(-dG/kT)/p° in Pa^-1 with dG per gas molecule (gas at p° = 1 bar).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from adsorb import constants as C
from adsorb.errors import InputError

__all__ = ["BatchResult", "screen_database", "write_batch_csv"]

_CHUNK = 2048


@dataclass(frozen=True)
class BatchResult:
    """Per adsorbate row: ids, labels, dE (eV), dG(T) (eV), K(T) (1/Pa) and optional coverages (ML)."""

    temperature_K: np.ndarray
    row_id: np.ndarray
    label: tuple
    surface: tuple
    gas: tuple
    dissociative: np.ndarray
    delta_energy_eV: np.ndarray           # (n_rows,)
    delta_gibbs_eV: np.ndarray            # (n_rows, n_T)
    equilibrium_constant_per_Pa: np.ndarray
    pressure_Pa: float | None = None
    coverage: np.ndarray | None = None    # (n_rows, n_T)


def _frequencies(rec, key):
    nu = rec.data.get(key)
    if nu is None:
        raise InputError(f"database '{rec.source}', row id={rec.id}: no data['{key}'] (expected wavenumbers in cm^-1)")
    where = f"database '{rec.source}', row id={rec.id}: data['{key}']"
    try:
        nu = np.atleast_1d(np.asarray(nu, dtype=float))
    except (TypeError, ValueError):
        raise InputError(f"{where} is {str(nu)[:60]!r}; expected a list of wavenumbers in cm^-1") from None
    if nu.ndim != 1 or nu.size == 0:
        raise InputError(f"{where} has shape {nu.shape}; expected a non-empty list of wavenumbers in cm^-1")
    bad = np.flatnonzero(~(np.isfinite(nu) & (nu > 0)))
    if bad.size:
        raise InputError(f"{where}[{bad[0]}] is {nu[bad[0]]:g}; expected real wavenumbers > 0 cm^-1 "
                         "(imaginary modes need a policy before screening)")
    return nu


def _key(rec, key, required=True):
    value = rec.key_value_pairs.get(key)
    if value is None and required:
        raise InputError(f"database '{rec.source}', row id={rec.id}: key-value pair '{key}' missing "
                         f"(expected {key}=<name>)")
    return value


def _references(path, frequencies_key):
    from adsorb.gas import GasMolecule
    from adsorb.io import select_rows

    slabs = {}
    for rec in select_rows(path, {"role": "slab"}, include_data=False):
        name = _key(rec, "surface")
        if rec.energy is None:
            raise InputError(f"database '{path}', row id={rec.id}: slab '{name}' has no energy (expected eV)")
        if name in slabs:
            raise InputError(f"database '{path}': two slab rows for surface '{name}' (ids {slabs[name][1]} and {rec.id})")
        slabs[name] = (rec.energy, rec.id)
    gases = {}
    for rec in select_rows(path, {"role": "gas"}):
        name = _key(rec, "gas")
        if name in gases:
            raise InputError(f"database '{path}': two gas rows for '{name}'")
        if rec.energy is None:
            raise InputError(f"database '{path}', row id={rec.id}: gas '{name}' has no energy (expected eV)")
        kv = rec.key_value_pairs
        rot = rec.data.get("rotational_constants")
        nu = _frequencies(rec, frequencies_key)
        try:
            gases[name] = GasMolecule(rec.atoms, nu, energy=rec.energy, multiplicity=kv.get("multiplicity", 1),
                                      symmetry_number=kv.get("symmetry_number"),
                                      rotational_constants=None if rot is None else list(np.ravel(rot)), name=name)
        except InputError as exc:
            raise InputError(f"database '{path}', row id={rec.id} (gas '{name}'): {exc}") from None
    return {k: v[0] for k, v in slabs.items()}, gases


def screen_database(path, selection=None, temperature=298.15, *, pressure_Pa=None, frequencies_key="frequencies",
                    progress=None) -> BatchResult:
    """Adsorption free energies of every selected adsorbate row of an ase.db.

    Parameters
    ----------
    path : str or Path
        The ase.db file (SQLite ``.db`` or ``.json``).
    selection : dict, optional
        Extra key-value pairs the adsorbate rows must match (``role="adsorbate"`` is implied).
    temperature : float or sequence of float
        Temperatures in K.
    pressure_Pa : float, optional (keyword-only)
        Gas pressure in Pa; when given, the Langmuir coverage of each adsorbate
        alone on its surface (:func:`adsorb.coverage.site_coverages`) is added.
    frequencies_key : str, optional
        Name of the ``data`` entry holding the wavenumbers.
    progress : callable, optional
        ``progress(n)`` is called after every n rows processed (e.g. a tqdm ``update``).

    Returns
    -------
    BatchResult

    Raises
    ------
    InputError
        Missing references, keys, energies or frequencies (the message names the row).
    """
    from adsorb.equilibria import capped_exp, reaction_terms
    from adsorb.io import select_rows
    from adsorb.partition.vibration import harmonic
    from adsorb.thermo import assemble

    t = np.atleast_1d(np.asarray(temperature, dtype=float))
    if t.ndim != 1 or not np.all(np.isfinite(t) & (t > 0)):
        raise InputError(f"temperature: expected temperatures > 0 K, got {temperature!r}")
    sel = {"role": "adsorbate", **dict(selection or {})}
    slabs, gases = _references(path, frequencies_key)
    gas_tables = {n: g.thermo(t[:, None], pressure=C.P_STANDARD) for n, g in gases.items()}
    records = select_rows(path, sel)
    n = len(records)
    ids, labels, surfaces, gas_names = np.empty(n, dtype=int), [], [], []
    diss, d_e = np.zeros(n, dtype=bool), np.empty(n)
    dg, k_pa = np.empty((n, t.size)), np.empty((n, t.size))
    groups = {}
    for i, rec in enumerate(records):
        surface, gas = _key(rec, "surface"), _key(rec, "gas")
        if surface not in slabs:
            raise InputError(f"database '{path}', row id={rec.id}: no slab row for surface '{surface}' (role=slab)")
        if gas not in gases:
            raise InputError(f"database '{path}', row id={rec.id}: no gas row for gas '{gas}' (role=gas)")
        if rec.energy is None:
            raise InputError(f"database '{path}', row id={rec.id}: no energy (expected eV, slab included)")
        nu = _frequencies(rec, frequencies_key)
        ids[i], diss[i] = rec.id, bool(rec.key_value_pairs.get("dissociative", False))
        labels.append(str(rec.key_value_pairs.get("adsorbate", rec.key_value_pairs.get("name", ""))))
        surfaces.append(surface)
        gas_names.append(gas)
        m = 2 if diss[i] else 1
        d_e[i] = m * (rec.energy - slabs[surface])
        groups.setdefault((nu.size, gas, m), ([], []))
        groups[(nu.size, gas, m)][0].append(i)
        groups[(nu.size, gas, m)][1].append(nu)
        if progress is not None and (i + 1) % 500 == 0:
            progress(500)
    if progress is not None and n % 500:
        progress(n % 500)
    kt = C.kB_eV * t
    for (_, gas, m), (rows, freqs) in groups.items():
        rows, freqs = np.asarray(rows), np.asarray(freqs)
        for start in range(0, rows.size, _CHUNK):
            sl = slice(start, start + _CHUNK)
            ads = assemble(t[:, None], harmonic(t[:, None], freqs[sl]), energy=0.0, gas=False)
            terms = reaction_terms([(m, ads), (-1, gas_tables[gas])])     # thermal parts; electronic below
            g = terms.delta_gibbs + d_e[rows[sl]][None, :]
            dg[rows[sl]] = g.T
            k_pa[rows[sl]] = capped_exp(-g / kt[:, None] - np.log(C.P_STANDARD), t[:, None],
                                        f"K of database '{path}' rows", "delta_gibbs_eV").T
    d_e -= np.array([gases[g].energy for g in gas_names]) if n else 0.0
    coverage = None
    if pressure_Pa is not None:
        from adsorb.coverage import site_coverages

        if not (np.isfinite(pressure_Pa) and pressure_Pa > 0):
            raise InputError(f"pressure_Pa: expected a pressure > 0 Pa, got {pressure_Pa!r}")
        coverage = np.empty_like(dg)
        for m in (False, True):
            rows = np.flatnonzero(diss == m)
            if rows.size:
                sol = site_coverages(k_pa[rows][None], np.full((1,) + k_pa[rows].shape, float(pressure_Pa)),
                                     dissociative=[bool(m)])
                coverage[rows] = sol.coverage[0]
    return BatchResult(temperature_K=t, row_id=ids, label=tuple(labels), surface=tuple(surfaces), gas=tuple(gas_names),
                       dissociative=diss, delta_energy_eV=d_e, delta_gibbs_eV=dg, equilibrium_constant_per_Pa=k_pa,
                       pressure_Pa=pressure_Pa, coverage=coverage)


def write_batch_csv(result: BatchResult, path) -> None:
    """One line per adsorbate row: id, labels, dE (eV), dG (eV) at every temperature [and theta (ML)].

    K is not repeated in the file: K = exp(-dG/kT)/p° in Pa^-1 with p° = 1e5 Pa.
    """
    from adsorb.fileout import write_text_atomic

    temps = [f"{x:g}" for x in result.temperature_K]
    header = ["row_id", "adsorbate", "surface", "gas", "dissociative", "delta_energy_eV"]
    header += [f"delta_gibbs_eV_{x}K" for x in temps]
    blocks = [result.delta_energy_eV[:, None], result.delta_gibbs_eV]
    fmt = ",".join(["%.6f"] * (1 + len(temps)))
    if result.coverage is not None:
        header += [f"theta_{x}K_{result.pressure_Pa:g}Pa" for x in temps]
        blocks.append(result.coverage)
        fmt += "," + ",".join(["%.5e"] * len(temps))
    numbers = np.hstack(blocks).tolist()
    lines = [",".join(header)]
    for i, row in enumerate(numbers):
        lines.append(f"{result.row_id[i]},{_csv(result.label[i])},{_csv(result.surface[i])},{_csv(result.gas[i])},"
                     f"{'true' if result.dissociative[i] else 'false'}," + fmt % tuple(row))
    write_text_atomic(path, "\n".join(lines) + "\n")


def _csv(text):
    return f'"{text}"' if any(c in text for c in ',"\n') else text
