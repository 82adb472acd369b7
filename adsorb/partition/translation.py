"""Ideal-gas translation in three and two dimensions.

The translational partition function of a particle of mass m in a volume V
(or on an area A) is the classical integral over momenta with the thermal de
Broglie wavelength Λ = h / sqrt(2 π m k T):

* 3D: q = V / Λ^3; per molecule of an ideal gas at pressure p, V/N = kT/p.
* 2D: q = A / Λ^2.

Sources: Sackur (Ann. Phys. 36, 958, 1911) and Tetrode (Ann. Phys. 38, 434,
1912) for the entropy of the ideal gas; D. A. McQuarrie, *Statistical
Mechanics* (Harper & Row, 1976), ch. 5 (3D) and the 2D analogue there.
"""

from __future__ import annotations

import numpy as np

from adsorb import constants as C
from adsorb.partition.checks import positive_array as _positive
from adsorb.partition.contribution import Contribution

__all__ = ["translation_3d", "translation_2d", "thermal_wavelength_m"]



def thermal_wavelength_m(temperature, mass_amu):
    """Thermal de Broglie wavelength Λ = h / sqrt(2 π m k T), in m.

    Parameters
    ----------
    temperature : array_like
        Temperature in K (> 0).
    mass_amu : array_like
        Particle mass in amu (> 0).

    Returns
    -------
    ndarray
        Λ in m, broadcast over the inputs.
    """
    t = _positive("temperature", temperature, "K")
    m = _positive("mass_amu", mass_amu, "amu") * C.amu
    return C.h / np.sqrt(2.0 * C.pi * m * C.k_B * t)


def translation_3d(temperature, mass_amu, pressure=C.P_STANDARD) -> Contribution:
    """Three-dimensional ideal-gas translation per molecule at pressure p.

    ln q = ln[kT / (p Λ^3)] (the volume per molecule over Λ^3);
    U = 3/2 kT; Cv = 3/2 k; S = k (ln q + 5/2), the Sackur–Tetrode entropy,
    which includes the indistinguishability (ln N!) term. The pV = kT term of
    the enthalpy and k of Cp are added by ``adsorb.thermo.assemble(gas=True)``;
    with it, G = -kT ln q.

    Sources: O. Sackur, Ann. Phys. 36, 958 (1911); H. Tetrode, Ann. Phys. 38,
    434 (1912); D. A. McQuarrie, *Statistical Mechanics* (1976), eq. 5-20.

    Parameters
    ----------
    temperature : array_like
        Temperature in K (> 0), any shape.
    mass_amu : float or array_like
        Molecular mass in amu (> 0).
    pressure : float or array_like, optional
        Pressure in Pa (> 0), broadcast against ``temperature``. Default 1 bar.

    Returns
    -------
    Contribution
        Fields with the broadcast shape of the inputs; ``zpe`` = 0.

    Raises
    ------
    InputError
        A temperature, mass or pressure that is not finite and positive.
    """
    t = _positive("temperature", temperature, "K")
    m = _positive("mass_amu", mass_amu, "amu")
    p = _positive("pressure", pressure, "Pa")
    kt = C.k_B * t
    # ln(kT/p) - 3 ln Λ, with ln Λ^2 = ln[h^2 / (2 π m k T)]
    ln_q = np.log(kt / p) - 1.5 * np.log(C.h**2 / (2.0 * C.pi * m * C.amu * kt))
    shape = np.shape(ln_q)
    energy = np.broadcast_to(1.5 * C.kB_eV * t, shape).copy()
    entropy = C.kB_eV * (ln_q + 2.5)
    heat_capacity = np.full(shape, 1.5 * C.kB_eV)
    return Contribution(ln_q, energy, entropy, heat_capacity, 0.0)


def translation_2d(temperature, mass_amu, area_A2) -> Contribution:
    """Two-dimensional ideal-gas translation of one molecule on an area A.

    q = A / Λ^2; U = kT; Cv = k; S = k (ln q + 1). No configurational or
    indistinguishability term is included: standard-state functions add it.

    Source: D. A. McQuarrie, *Statistical Mechanics* (1976), ch. 5 (the 2D
    analogue of eq. 5-20); C. T. Campbell, L. H. Sprowl, L. Árnadóttir,
    J. Phys. Chem. C 120, 10283 (2016) for its use for adsorbates.

    Parameters
    ----------
    temperature : array_like
        Temperature in K (> 0), any shape.
    mass_amu : float or array_like
        Mass in amu (> 0).
    area_A2 : float or array_like
        Area available to the molecule in Å^2 (> 0).

    Returns
    -------
    Contribution
        Fields with the broadcast shape of the inputs; ``zpe`` = 0.

    Raises
    ------
    InputError
        A temperature, mass or area that is not finite and positive.
    """
    t = _positive("temperature", temperature, "K")
    m = _positive("mass_amu", mass_amu, "amu")
    a = _positive("area_A2", area_A2, "Å^2") * C.angstrom**2
    ln_q = np.log(a) - np.log(C.h**2 / (2.0 * C.pi * m * C.amu * C.k_B * t))
    shape = np.shape(ln_q)
    energy = np.broadcast_to(C.kB_eV * t, shape).copy()
    entropy = C.kB_eV * (ln_q + 1.0)
    heat_capacity = np.full(shape, C.kB_eV)
    return Contribution(ln_q, energy, entropy, heat_capacity, 0.0)
