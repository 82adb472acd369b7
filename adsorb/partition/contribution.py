"""The value every partition-function building block returns.

A species is the sum of its independent motions, so the thermodynamic
functions of the motions add. Each building block in :mod:`adsorb.partition`
is a pure function of temperature (numpy arrays of any shape) that returns a
:class:`Contribution`.

Conventions (per molecule):

* ``ln_q``: natural log of the partition function, counted from the motion's
  own lowest level (its zero-point level), so ZPE is *not* inside ``ln_q``.
  For 3D translation ``ln_q`` is ln[kT/(p Λ^3)], the per-molecule value at
  pressure p.
* ``energy``: thermal energy U(T) above the lowest level, eV.
* ``entropy``: S(T), eV/K. For translation it includes the indistinguishability
  (ln N!) term, so entropies simply add.
* ``heat_capacity``: Cv(T), eV/K.
* ``zpe``: energy of the lowest level above the potential minimum, eV
  (a scalar or an array broadcastable against T; zero for motions without one).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np


@dataclass(frozen=True)
class Contribution:
    """Thermodynamic functions of one motion (or a sum of motions)."""

    ln_q: np.ndarray
    energy: np.ndarray
    entropy: np.ndarray
    heat_capacity: np.ndarray
    zpe: np.ndarray | float = 0.0

    def __add__(self, other: "Contribution") -> "Contribution":
        if not isinstance(other, Contribution):
            return NotImplemented
        return Contribution(
            ln_q=self.ln_q + other.ln_q,
            energy=self.energy + other.energy,
            entropy=self.entropy + other.entropy,
            heat_capacity=self.heat_capacity + other.heat_capacity,
            zpe=self.zpe + other.zpe,
        )

    def __radd__(self, other):
        # allows sum([...]) starting from 0
        if isinstance(other, (int, float)) and other == 0:
            return self
        return NotImplemented

    @staticmethod
    def zero(temperature) -> "Contribution":
        """A motion with no states other than its ground level (q = 1)."""
        z = np.zeros_like(np.asarray(temperature, dtype=float))
        return Contribution(z, z, z, z, 0.0)

    def free_energy(self, temperature):
        """Helmholtz free energy A = zpe + U - TS in eV.

        Equals zpe - kT ln q for every motion except 3D translation, whose
        ``ln_q`` is the per-molecule ln[kT/(p Λ^3)] and whose entropy includes
        the ln N! term: there A = -kT (ln q + 1).
        """
        t = np.asarray(temperature, dtype=float)
        return self.zpe + self.energy - t * self.entropy
