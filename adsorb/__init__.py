"""adsorb: surface adsorption and catalysis thermochemistry.

Gas references from full 3D partition functions, adsorbate thermochemistry
under the harmonic, hindered, 2D-gas and lattice-gas models, adsorption free
energies and equilibrium constants with explicit standard states, coverages,
isotherms and free-energy diagrams.

Public names are imported lazily so that ``import adsorb`` (and the command
line's start-up) stays cheap.
"""

from __future__ import annotations

import importlib

__version__ = "0.1.0"

# public name -> module that defines it
_EXPORTS = {
    "GasMolecule": "adsorb.gas",
    "Adsorbate": "adsorb.adsorbate",
    "site_coverages": "adsorb.coverage",
    "ThermoTable": "adsorb.thermo",
    "AdsorbError": "adsorb.errors",
    "InputError": "adsorb.errors",
    "ConvergenceError": "adsorb.errors",
    "ModelWarning": "adsorb.errors",
}

__all__ = sorted(_EXPORTS) + ["__version__"]


def __getattr__(name):
    try:
        module = _EXPORTS[name]
    except KeyError:
        raise AttributeError(f"module 'adsorb' has no attribute {name!r}") from None
    value = getattr(importlib.import_module(module), name)
    globals()[name] = value
    return value


def __dir__():
    return __all__
