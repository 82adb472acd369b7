"""Adsorption free energies and equilibrium constants with explicit standard states.

A reaction is a list of (coefficient, species) pairs, products positive and
reactants negative; a species is a :class:`~adsorb.thermo.ThermoTable` or a
plain number (an electronic energy in eV with no thermal part, such as the
clean slab, whose atoms are frozen: common practice). Adsorbate energies
include the slab, as practitioners hold them, so molecular adsorption
A(g) + * -> A* is ``[(1, A_star), (-1, slab_energy), (-1, A_gas)]``.

For adsorption the equilibrium constant is defined by the site balance that
:func:`adsorb.coverage.site_coverages` solves (coverages per site):

* molecular  A(g) + * <=> A*:       theta_A / theta_* = K p_A
* dissociative A2(g) + 2* <=> 2A*:  (theta_A / theta_*)^2 = K p_A2

with K = exp(-dG / kT) / p° in Pa^-1, where dG is the reaction Gibbs energy
per gas molecule built from the gas at p° and the adsorbates' per-site
tables (no configurational term). This K does not depend on the choice of
standard state. The standard reaction Gibbs energy dG° and K° = exp(-dG°/kT)
do, and are reported together with the named state (see
:mod:`adsorb.standard_states`; Campbell, Sprowl and Árnadóttir, J. Phys. Chem.
C 2016, 120, 10283; Savara, J. Phys. Chem. C 2013, 117, 15710).
"""

from __future__ import annotations

import warnings
from dataclasses import dataclass, field

import numpy as np

from adsorb import constants as C
from adsorb.errors import InputError, ModelWarning
from adsorb.partition.checks import finite_number
from adsorb.standard_states import describe_state, standard_coverage
from adsorb.thermo import ThermoTable

__all__ = ["ReactionTerms", "reaction_terms", "AdsorptionEquilibrium", "adsorption_equilibrium",
           "capped_exp"]

#: ln of the largest finite double; exp() of a larger number overflows
LN_FLOAT_MAX = float(np.log(np.finfo(float).max))


def capped_exp(ln_value, temperature, what, exact=""):
    """exp(ln_value), capped at the largest finite double, with a ModelWarning where capped.

    An equilibrium constant exp(-dG/kT) leaves the floating-point range at low
    temperature for strong binding (dG = -0.5 eV at 1 K gives ln K = 5800).
    Where ln_value > ln(1.8e308) the value is capped at 1.8e308: the coverages
    built on it are saturated (theta = 1 to double precision) but theta_* is then
    only an upper bound; the exact logarithm is ``ln_value`` itself. Below
    ln(5e-324) the value underflows quietly to 0 (the species does not adsorb).

    Parameters
    ----------
    ln_value : array_like
        Natural logarithm of the value.
    temperature : array_like
        Temperature in K, broadcast against ``ln_value`` (named in the warning).
    what : str
        What the value is, for the warning.
    exact : str, optional
        Where the caller keeps the exact logarithm, named in the warning.
    """
    ln_value = np.asarray(ln_value, dtype=float)
    over = ln_value > LN_FLOAT_MAX
    if np.any(over):
        t = np.broadcast_to(np.asarray(temperature, dtype=float), ln_value.shape)
        warnings.warn(
            f"{what} exceeds the floating-point range (ln = {float(ln_value.max()):.6g} > "
            f"{LN_FLOAT_MAX:.6g}) at {int(over.sum())} of {over.size} points, T from "
            f"{float(t[over].min()):.6g} to {float(t[over].max()):.6g} K; capped at "
            f"{np.finfo(float).max:.3g} there (coverage saturated, empty-site fraction only an "
            f"upper bound){'; exact logarithm: ' + exact if exact else ''}", ModelWarning, stacklevel=3)
    with np.errstate(under="ignore"):
        return np.exp(np.minimum(ln_value, LN_FLOAT_MAX))


@dataclass(frozen=True)
class ReactionTerms:
    """Reaction thermochemistry split into its parts (eV and eV/K, per reaction as written).

    ``delta_gibbs = delta_energy + delta_zpe + delta_thermal - T delta_entropy``
    where ``delta_thermal`` is the thermal enthalpy change above 0 K.
    """

    temperature: np.ndarray
    delta_energy: float
    delta_zpe: np.ndarray
    delta_thermal: np.ndarray
    delta_enthalpy: np.ndarray
    delta_entropy: np.ndarray
    delta_gibbs: np.ndarray

    @property
    def minus_t_delta_s(self):
        """-T dS in eV."""
        return -self.temperature * self.delta_entropy

    def as_dict(self) -> dict:
        """Plain lists, eV and eV/K."""
        f = lambda a: np.asarray(a, dtype=float).tolist()  # noqa: E731
        return {"temperature_K": f(self.temperature), "delta_energy_eV": float(self.delta_energy),
                "delta_zpe_eV": f(self.delta_zpe), "delta_thermal_enthalpy_eV": f(self.delta_thermal),
                "minus_T_delta_S_eV": f(self.minus_t_delta_s), "delta_enthalpy_eV": f(self.delta_enthalpy),
                "delta_entropy_eV_K": f(self.delta_entropy), "delta_gibbs_eV": f(self.delta_gibbs)}


def reaction_terms(terms) -> ReactionTerms:
    """Sum (coefficient, species) pairs into :class:`ReactionTerms`.

    Parameters
    ----------
    terms : sequence of (float, ThermoTable or float)
        Stoichiometric coefficient (products > 0, reactants < 0) and species:
        a ThermoTable, or a number meaning a fixed electronic energy in eV.
        All tables must share a broadcastable temperature grid.
    """
    terms = list(terms)
    if not terms:
        msg = "reaction_terms: expected at least one (coefficient, species) pair"
        raise InputError(msg)
    tables = [s for _, s in terms if isinstance(s, ThermoTable)]
    if not tables:
        msg = "reaction_terms: at least one species must be a ThermoTable (to fix the temperatures)"
        raise InputError(msg)
    t = np.broadcast_arrays(*[tb.temperature for tb in tables])[0]
    for tb in tables:
        if not np.allclose(np.broadcast_to(tb.temperature, t.shape), t, rtol=1e-12, atol=0):
            msg = f"reaction_terms: species {tb.name!r} was evaluated on different temperatures"
            raise InputError(msg)
    de = 0.0
    dz = dth = dh = ds = dg = 0.0
    for coef, s in terms:
        coef = finite_number(coef, "reaction_terms: stoichiometric coefficient", "a finite number")
        if isinstance(s, ThermoTable):
            de = de + coef * s.energy
            dz = dz + coef * s.zpe
            dth = dth + coef * (s.enthalpy - s.energy - s.zpe)
            dh = dh + coef * s.enthalpy
            ds = ds + coef * s.entropy
            dg = dg + coef * s.gibbs
        else:
            e = finite_number(s, "reaction_terms: species", "a ThermoTable or a fixed electronic energy in eV")
            de, dh, dg = de + coef * e, dh + coef * e, dg + coef * e
    b = lambda a: np.broadcast_to(np.asarray(a, dtype=float), np.shape(dg)).copy()  # noqa: E731
    return ReactionTerms(temperature=b(t), delta_energy=float(de), delta_zpe=b(dz), delta_thermal=b(dth),
                         delta_enthalpy=b(dh), delta_entropy=b(ds), delta_gibbs=b(dg))


@dataclass(frozen=True)
class AdsorptionEquilibrium:
    """Adsorption thermochemistry per gas molecule, K and K° with the standard state named."""

    terms: ReactionTerms
    n_adsorbed: int
    equilibrium_constant: np.ndarray     # Pa^-1, per the site balance above
    standard_state: str
    standard_state_description: str
    standard_coverage: np.ndarray
    delta_gibbs_standard: np.ndarray     # eV, dG° at the named state and p°
    standard_constant: np.ndarray        # dimensionless K° = exp(-dG°/kT)
    mobile: bool
    notes: tuple = field(default=())

    @property
    def ln_equilibrium_constant(self):
        """ln(K / Pa^-1) = -dG/kT - ln p°, exact where K itself is capped (see :func:`capped_exp`)."""
        kt = C.kB_eV * self.terms.temperature
        return -self.terms.delta_gibbs / kt - np.log(C.P_STANDARD)

    @property
    def ln_standard_constant(self):
        """ln K° = -dG°/kT, exact where K° itself is capped."""
        return -self.delta_gibbs_standard / (C.kB_eV * self.terms.temperature)

    @property
    def dissociative(self) -> bool:
        """True when one gas molecule gives two adsorbed fragments."""
        return self.n_adsorbed == 2

    def as_dict(self) -> dict:
        """Plain lists with units in the keys."""
        d = self.terms.as_dict()
        d.update({
            "adsorbed_per_gas_molecule": self.n_adsorbed,
            "equilibrium_constant_per_Pa": np.asarray(self.equilibrium_constant).tolist(),
            "standard_state": self.standard_state,
            "standard_state_description": self.standard_state_description,
            "standard_coverage": np.asarray(self.standard_coverage).tolist(),
            "delta_gibbs_standard_eV": np.asarray(self.delta_gibbs_standard).tolist(),
            "standard_equilibrium_constant": np.asarray(self.standard_constant).tolist(),
            "gas_standard_pressure_Pa": C.P_STANDARD,
            "notes": list(self.notes),
        })
        return d


def adsorption_equilibrium(adsorbate: ThermoTable, gas: ThermoTable, slab_energy: float, *,
                           dissociative: bool = False, standard_state: str | None = None,
                           site_area_A2: float | None = None) -> AdsorptionEquilibrium:
    """Adsorption free energy and equilibrium constants of A(g) + * -> A* (or A2 + 2* -> 2A*).

    Parameters
    ----------
    adsorbate : ThermoTable
        Per-site table of the adsorbed species (from :meth:`Adsorbate.thermo`);
        its energy includes the slab.
    gas : ThermoTable
        Gas reference evaluated at the standard pressure p° = 1e5 Pa on the same
        temperatures (from :meth:`GasMolecule.thermo`).
    slab_energy : float
        Electronic energy of the clean slab in eV.
    dissociative : bool
        True for A2(g) + 2* -> 2A*: two adsorbed fragments per gas molecule.
    standard_state : str, optional
        Named adsorbate standard state; default ``"lattice-half"`` for
        localized models and ``"savara-2d"`` for mobile ones.
    site_area_A2 : float, optional
        Area per site in Å^2 (2D states; default from the adsorbate's choices).

    Returns
    -------
    AdsorptionEquilibrium
        dE, dZPE, thermal, -TdS, dG per gas molecule; K in Pa^-1; dG° and K°.
    """
    if not isinstance(adsorbate, ThermoTable) or not isinstance(gas, ThermoTable):
        msg = "adsorption_equilibrium: adsorbate and gas must be ThermoTable results (call .thermo(T) first)"
        raise InputError(msg)
    if gas.pressure is None:
        msg = f"adsorption_equilibrium: gas {gas.name!r} has no pressure; pass a gas-phase table"
        raise InputError(msg)
    if not np.allclose(gas.pressure, C.P_STANDARD, rtol=1e-12):
        msg = (f"adsorption_equilibrium: gas {gas.name!r} must be evaluated at p° = {C.P_STANDARD:g} Pa "
               f"(pressures enter through the site balance), got {np.ravel(gas.pressure)[0]:g} Pa")
        raise InputError(msg)
    n = 2 if dissociative else 1
    terms = reaction_terms([(n, adsorbate), (-n, slab_energy), (-1, gas)])
    t = terms.temperature
    kt = C.kB_eV * t
    mobile = bool(adsorbate.choices.get("mobile", False))
    if standard_state is None:
        standard_state = "savara-2d" if mobile else "lattice-half"
    if site_area_A2 is None:
        site_area_A2 = adsorbate.choices.get("site_area_A2")
        if site_area_A2 is None and "site_spacing_A" in adsorbate.choices:
            site_area_A2 = adsorbate.choices["site_spacing_A"] ** 2
    theta0 = standard_coverage(standard_state, t, site_area_A2)
    if mobile:
        ln_term = np.log(theta0)
    else:
        if np.any(theta0 >= 1):
            msg = f"standard state {standard_state!r} gives theta° >= 1 for this site area; not valid for a lattice gas"
            raise InputError(msg)
        ln_term = np.log(theta0) - np.log1p(-theta0)
    dg0 = terms.delta_gibbs + n * kt * ln_term
    k_pa = capped_exp(-terms.delta_gibbs / kt - np.log(C.P_STANDARD), t,
                      "adsorption_equilibrium: K = exp(-dG/kT)/p°", "ln_equilibrium_constant")
    k0 = capped_exp(-dg0 / kt, t, "adsorption_equilibrium: K° = exp(-dG°/kT)", "ln_standard_constant")
    notes = []
    if mobile:
        notes.append("mobile adsorbate: K applies to the dilute (Henry) limit of the 2D gas; the Langmuir "
                     "site balance adds site blocking at higher coverage")
    return AdsorptionEquilibrium(terms=terms, n_adsorbed=n, equilibrium_constant=k_pa,
                                 standard_state=standard_state,
                                 standard_state_description=describe_state(standard_state),
                                 standard_coverage=theta0, delta_gibbs_standard=dg0,
                                 standard_constant=k0, mobile=mobile, notes=tuple(notes))
