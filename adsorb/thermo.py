"""Thermochemistry tables: the result object of every species.

:class:`ThermoTable` holds G, H, U, S, Cp and ZPE of one species over arrays of
temperature (and pressure, for gases), per molecule in eV and eV/K, together
with the modelling choices that produced them. It converts to molar units and
writes itself as CSV or JSON.
"""

from __future__ import annotations

import csv
import io
from dataclasses import dataclass, field

import numpy as np

from adsorb import constants as C
from adsorb.fileout import write_json_atomic, write_text_atomic
from adsorb.partition.contribution import Contribution


@dataclass(frozen=True)
class ThermoTable:
    """Thermochemistry of one species.

    All arrays broadcast against each other (the broadcast of temperature and
    pressure). Energies in eV per molecule, entropy and heat capacity in eV/K
    per molecule.

    Attributes
    ----------
    temperature : ndarray
        Temperature in K.
    pressure : ndarray or None
        Pressure in Pa (gases); ``None`` for adsorbates.
    energy : float
        Electronic energy in eV (the input reference).
    zpe : ndarray
        Zero-point energy in eV.
    internal_energy : ndarray
        U = energy + ZPE + thermal energy, eV.
    enthalpy : ndarray
        H = U + kT for a gas (pV term), H = U for an adsorbate, eV.
    entropy : ndarray
        S in eV/K.
    heat_capacity : ndarray
        Cp in eV/K (Cv + k for a gas; Cv for an adsorbate).
    gibbs : ndarray
        G = H - T S, eV.
    name : str
        Species label.
    choices : dict
        Modelling choices recorded with the result (model, treated modes,
        low-frequency treatment, standard state, ...).
    warnings : tuple of str
        Warnings raised while building the result.
    """

    temperature: np.ndarray
    pressure: np.ndarray | None
    energy: float
    zpe: np.ndarray
    internal_energy: np.ndarray
    enthalpy: np.ndarray
    entropy: np.ndarray
    heat_capacity: np.ndarray
    gibbs: np.ndarray
    name: str = ""
    choices: dict = field(default_factory=dict)
    warnings: tuple = ()

    # ---- molar views -------------------------------------------------
    @property
    def gibbs_kj_mol(self):
        """G in kJ/mol."""
        return C.to_kj_per_mol(self.gibbs)

    @property
    def enthalpy_kj_mol(self):
        """H in kJ/mol."""
        return C.to_kj_per_mol(self.enthalpy)

    @property
    def internal_energy_kj_mol(self):
        """U in kJ/mol."""
        return C.to_kj_per_mol(self.internal_energy)

    @property
    def entropy_j_mol_k(self):
        """S in J/(mol K)."""
        return C.to_j_per_mol_k(self.entropy)

    @property
    def heat_capacity_j_mol_k(self):
        """Cp in J/(mol K)."""
        return C.to_j_per_mol_k(self.heat_capacity)

    @property
    def thermal_enthalpy_kj_mol(self):
        """H(T) - H(0 K) = H - energy - ZPE, in kJ/mol."""
        return C.to_kj_per_mol(self.enthalpy - self.energy - self.zpe)

    # ---- tables -------------------------------------------------------
    def rows(self) -> list[dict]:
        """One dict per (T, p) point, flattened in C order, molar and per-molecule units."""
        arrays = {
            "temperature_K": self.temperature,
            "pressure_Pa": self.pressure if self.pressure is not None else np.nan,
            "gibbs_eV": self.gibbs,
            "enthalpy_eV": self.enthalpy,
            "entropy_eV_K": self.entropy,
            "heat_capacity_eV_K": self.heat_capacity,
            "zpe_eV": self.zpe,
            "gibbs_kJ_mol": self.gibbs_kj_mol,
            "enthalpy_kJ_mol": self.enthalpy_kj_mol,
            "entropy_J_mol_K": self.entropy_j_mol_k,
            "heat_capacity_J_mol_K": self.heat_capacity_j_mol_k,
        }
        if self.pressure is None:
            del arrays["pressure_Pa"]
        names = list(arrays)
        flat = [np.ravel(a) for a in np.broadcast_arrays(*[np.asarray(arrays[n], float) for n in names])]
        return [{n: float(col[i]) for n, col in zip(names, flat)} for i in range(flat[0].size)]

    def to_csv(self, path=None) -> str:
        """Return the table as CSV text; also write it atomically when ``path`` is given."""
        rows = self.rows()
        buffer = io.StringIO()
        writer = csv.DictWriter(buffer, fieldnames=list(rows[0]), lineterminator="\n")
        writer.writeheader()
        for row in rows:
            writer.writerow({k: f"{v:.10g}" for k, v in row.items()})
        text = buffer.getvalue()
        if path is not None:
            write_text_atomic(path, text)
        return text

    def to_dict(self) -> dict:
        """Plain-Python description: units, choices, warnings and the rows."""
        return {
            "name": self.name,
            "electronic_energy_eV": float(self.energy),
            "units": {
                "energy": "eV per molecule (and kJ/mol)",
                "entropy": "eV/K per molecule (and J/(mol K))",
                "temperature": "K",
                "pressure": "Pa",
            },
            "choices": self.choices,
            "warnings": list(self.warnings),
            "rows": self.rows(),
        }

    def to_json(self, path=None) -> dict:
        """Return :meth:`to_dict`; also write it atomically as JSON when ``path`` is given."""
        data = self.to_dict()
        if path is not None:
            write_json_atomic(path, data)
        return data


def assemble(temperature, contribution: Contribution, *, energy: float = 0.0,
             pressure=None, gas: bool, name: str = "", choices: dict | None = None,
             warnings=()) -> ThermoTable:
    """Turn a summed :class:`Contribution` into a :class:`ThermoTable`.

    Parameters
    ----------
    temperature : array_like
        Temperature in K.
    contribution : Contribution
        Sum of the species' motions (translation included for a gas).
    energy : float
        Electronic energy in eV.
    pressure : array_like or None
        Pressure in Pa (gases only; the translation term already used it).
    gas : bool
        True adds the pV = kT term to H and k to Cp.
    """
    t = np.asarray(temperature, dtype=float)
    zpe = np.asarray(contribution.zpe, dtype=float)
    u = energy + zpe + contribution.energy
    pv = C.kB_eV * t if gas else 0.0
    h = u + pv
    cp = contribution.heat_capacity + (C.kB_eV if gas else 0.0)
    s = contribution.entropy
    g = h - t * s
    shape = np.broadcast_shapes(np.shape(g), np.shape(t),
                                np.shape(pressure) if pressure is not None else ())
    b = lambda a: np.broadcast_to(np.asarray(a, dtype=float), shape).copy()  # noqa: E731
    return ThermoTable(
        temperature=b(t),
        pressure=None if pressure is None else b(pressure),
        energy=float(energy),
        zpe=b(zpe),
        internal_energy=b(u),
        enthalpy=b(h),
        entropy=b(s),
        heat_capacity=b(cp),
        gibbs=b(g),
        name=name,
        choices=dict(choices or {}),
        warnings=tuple(warnings),
    )
