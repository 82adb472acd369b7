"""Named standard states of adsorbates and the thermochemistry at them.

:meth:`adsorb.adsorbate.Adsorbate.thermo` reports per-site thermochemistry with
no configurational term. The chemical potential of the adsorbate at a
coverage theta (molecules per site) adds that term, and it depends on whether
the model is localized or mobile:

* localized (``harmonic``, ``lattice-gas``; an ideal 2D lattice gas):
  mu = G + kT ln[theta / (1 - theta)]
* mobile (``2d-gas``, ``hindered``, ``surface-pes``; an ideal 2D gas or ideal
  hindered translator, per-site partition function, theta = N A_site / A):
  mu = G + kT ln theta

(Campbell, Sprowl and Árnadóttir, J. Phys. Chem. C 2016, 120, 10283.)

A standard state fixes theta°. The named states:

``"lattice-half"``
    theta° = 1/2, where the lattice configurational term vanishes
    (Savara, J. Phys. Chem. C 2013, 117, 15710).
``"savara-2d"``
    the density-based 2D state of Savara (2013): a surface concentration
    sigma° = (p°/(k T_ref))^(2/3) / N_A = 1.3928e-7 mol m^-2 with
    T_ref = 298.15 K and p° = 1 bar, i.e. the same box length per molecule as
    the 3D ideal gas at p°; theta° = sigma° N_A A_site.
``"campbell-2d"``
    the 2D state of Campbell, Sprowl and Árnadóttir (2016), chosen so that the
    2D translational entropy is exactly 2/3 of the 3D one at p° and the same
    temperature: area per molecule (kT/p°)^(2/3) e^(-1/3), at the working
    temperature.

Entropy and enthalpy conventions (the Gibbs energy mu° is the same either
way): for localized models S° and H° are the partial molar values
(S° = S - k ln[theta°/(1 - theta°)], H° = H); for mobile models they are the
per-molecule values of the 2D ideal gas, whose enthalpy includes the
spreading-pressure term kT like the pV term of a 3D gas
(S° = S + k[1 - ln theta°], H° = H + kT), the convention in which Campbell et
al. state S°_2D,trans = (2/3) S°_3D,trans.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from adsorb import constants as C
from adsorb.errors import InputError
from adsorb.partition.checks import positive_array

__all__ = ["STANDARD_STATES", "StandardThermo", "standard_coverage", "standard_thermo", "describe_state"]

STANDARD_STATES = {
    "lattice-half": "lattice gas at half coverage, theta° = 1/2 (Savara, J. Phys. Chem. C 2013, 117, 15710)",
    "savara-2d": ("2D gas at sigma° = (p°/(k 298.15 K))^(2/3)/N_A = 1.3928e-7 mol/m^2 "
                  "(Savara, J. Phys. Chem. C 2013, 117, 15710)"),
    "campbell-2d": ("2D gas at area per molecule (kT/p°)^(2/3) e^(-1/3), so that S°_2D,trans = 2/3 S°_3D,trans "
                    "(Campbell, Sprowl, Árnadóttir, J. Phys. Chem. C 2016, 120, 10283)"),
}


def describe_state(state: str) -> str:
    """One-line description, with source, of a named standard state."""
    _check_state(state)
    return STANDARD_STATES[state]


def _check_state(state):
    if state not in STANDARD_STATES:
        msg = f"standard state {state!r} is unknown; expected one of {', '.join(STANDARD_STATES)}"
        raise InputError(msg)


def savara_concentration_mol_m2(pressure=C.P_STANDARD, reference_temperature=C.T_STANDARD):
    """Savara's 2D standard concentration (p°/(k T_ref))^(2/3) / N_A in mol m^-2."""
    return (pressure / (C.k_B * reference_temperature)) ** (2.0 / 3.0) / C.N_A


def standard_coverage(state: str, temperature, site_area_A2=None, *, pressure=C.P_STANDARD):
    """Coverage theta° (molecules per site) of a named standard state.

    Parameters
    ----------
    state : str
        One of :data:`STANDARD_STATES`.
    temperature : array_like
        Temperature in K (used by ``"campbell-2d"``).
    site_area_A2 : float, optional
        Area per site in Å^2; required for the 2D states.
    pressure : float, optional
        Gas standard pressure p° in Pa (default 1 bar).
    """
    _check_state(state)
    t = positive_array("standard_coverage temperature", temperature, "K")
    if state == "lattice-half":
        return np.full(t.shape, 0.5)
    try:
        area_A2 = float(site_area_A2)
    except (TypeError, ValueError):
        area_A2 = np.nan
    if not (np.isfinite(area_A2) and area_A2 > 0):
        msg = f"standard state {state!r} needs the area per site in Å^2 (site_area_A2 > 0), got {site_area_A2!r}"
        raise InputError(msg)
    area = area_A2 * C.angstrom**2
    if state == "savara-2d":
        return np.full(t.shape, savara_concentration_mol_m2(pressure) * C.N_A * area)
    per_molecule = (C.k_B * t / pressure) ** (2.0 / 3.0) * np.exp(-1.0 / 3.0)
    return area / per_molecule


@dataclass(frozen=True)
class StandardThermo:
    """Adsorbate thermochemistry at a named standard state (eV, eV/K per molecule)."""

    state: str
    description: str
    coverage: np.ndarray
    mobile: bool
    gibbs: np.ndarray
    enthalpy: np.ndarray
    entropy: np.ndarray

    @property
    def entropy_j_mol_k(self):
        """S° in J/(mol K)."""
        return C.to_j_per_mol_k(self.entropy)

    @property
    def gibbs_kj_mol(self):
        """G° in kJ/mol."""
        return C.to_kj_per_mol(self.gibbs)


def standard_thermo(table, state: str, *, mobile: bool | None = None, site_area_A2=None,
                    pressure=C.P_STANDARD) -> StandardThermo:
    """Standard-state G°, H°, S° of an adsorbate from its per-site table.

    Parameters
    ----------
    table : ThermoTable
        Result of :meth:`Adsorbate.thermo` (per site, no configurational term).
    state : str
        Named standard state, see :data:`STANDARD_STATES`.
    mobile : bool, optional
        Whether the model is mobile; default taken from ``table.choices["mobile"]``.
    site_area_A2 : float, optional
        Area per site in Å^2 (required for the 2D states; default from the
        table's choices when the model recorded it).
    pressure : float, optional
        Gas standard pressure in Pa used by the 2D states (default 1 bar).
    """
    _check_state(state)
    if mobile is None:
        if "mobile" not in table.choices:
            msg = "standard_thermo: the table does not record whether its model is mobile; pass mobile=True/False"
            raise InputError(msg)
        mobile = bool(table.choices["mobile"])
    if site_area_A2 is None:
        site_area_A2 = table.choices.get("site_area_A2")
        if site_area_A2 is None and "site_spacing_A" in table.choices:
            site_area_A2 = table.choices["site_spacing_A"] ** 2
    t = table.temperature
    theta = standard_coverage(state, t, site_area_A2, pressure=pressure)
    k = C.kB_eV
    if mobile:
        gibbs = table.gibbs + k * t * np.log(theta)
        entropy = table.entropy + k * (1.0 - np.log(theta))
        enthalpy = table.enthalpy + k * t
    else:
        if np.any(theta >= 1):
            msg = f"standard state {state!r} gives theta° >= 1 for this site area; a lattice gas needs theta° < 1"
            raise InputError(msg)
        ln_ratio = np.log(theta) - np.log1p(-theta)
        gibbs = table.gibbs + k * t * ln_ratio
        entropy = table.entropy - k * ln_ratio
        enthalpy = table.enthalpy
    return StandardThermo(state=state, description=STANDARD_STATES[state], coverage=theta, mobile=mobile,
                          gibbs=gibbs, enthalpy=enthalpy, entropy=entropy)
