"""Write the small structure files of the demo cases (run from anywhere: python cases/make_structures.py).

Geometries come from ase.build (molecule() for the gases, hcp0001() for the
slab). The metal "Mx" is FICTITIOUS: its atoms are Ru-type placeholders for
the geometry only, and every energy written here is INVENTED, labelled as
such in the files (extxyz comment key ``note``) and in the case files. The
energies are attached with a SinglePointCalculator so that
``adsorb.io.read_structure`` finds them.

Invented electronic energies (eV), chosen to be of the size a plane-wave code
gives and so that the gas-phase reaction N2 + 3 H2 -> 2 NH3 has a 0 K reaction
enthalpy (electronic + zero-point) near the experimental -0.8 eV (from memory):

    H2 -6.770   N2 -16.640   NH3 -19.300   clean Mx(0001) slab -100.000
    H* -103.885  N* -108.920  NH* -112.105  NH2* -115.190  NH3* -120.000
"""

from __future__ import annotations

from pathlib import Path

from ase.build import add_adsorbate, hcp0001, molecule
from ase.calculators.singlepoint import SinglePointCalculator
from ase.constraints import FixAtoms
from ase.io import write

HERE = Path(__file__).resolve().parent / "structures"
NOTE = "INVENTED energy for a demo case of adsorb (fictitious metal Mx; Ru atoms are geometry placeholders)"

GAS_ENERGIES = {"H2": -6.770, "N2": -16.640, "NH3": -19.300}
SLAB_ENERGY = -100.000
# name -> (molecule or atom, site, height in Å above the top layer, invented energy in eV, flip N down)
ADSORBATES = {
    "H_Mx": ("H", "fcc", 1.0, -103.885, False),
    "N_Mx": ("N", "hcp", 1.1, -108.920, False),
    "NH_Mx": ("NH", "hcp", 1.2, -112.105, True),
    "NH2_Mx": ("NH2", "bridge", 1.6, -115.190, True),
    "NH3_Mx": ("NH3", "ontop", 2.2, -120.000, True),
}


def _with_energy(atoms, energy):
    atoms.info.pop("adsorbate_info", None)  # a dict extxyz cannot store
    atoms.calc = SinglePointCalculator(atoms, energy=energy)
    atoms.info["note"] = NOTE
    return atoms


def slab():
    """A 2x2x3 hcp(0001) slab, bottom two layers frozen (6 Å of vacuum each side)."""
    s = hcp0001("Ru", size=(2, 2, 3), vacuum=6.0)
    s.set_constraint(FixAtoms(indices=list(range(len(s)))))
    return s


def adsorbate(species, site, height, flip):
    s = slab()
    if len(species) == 1:
        add_adsorbate(s, species, height, site)
    else:
        m = molecule(species)
        if flip:  # N towards the surface
            m.rotate(180, "x")
        n_index = [a.index for a in m if a.symbol == "N"][0]
        add_adsorbate(s, m, height, site, mol_index=n_index)
    # the slab stays frozen, the adsorbate atoms are free
    s.set_constraint(FixAtoms(indices=[a.index for a in s if a.symbol == "Ru"]))
    return s


def main():
    HERE.mkdir(exist_ok=True)
    for name, energy in GAS_ENERGIES.items():
        m = molecule(name)
        m.center(vacuum=5.0)
        write(HERE / f"{name.lower()}_gas.xyz", _with_energy(m, energy), format="extxyz")
    write(HERE / "mx0001_slab.xyz", _with_energy(slab(), SLAB_ENERGY), format="extxyz")
    for name, (species, site, height, energy, flip) in ADSORBATES.items():
        write(HERE / f"{name.lower()}.xyz", _with_energy(adsorbate(species, site, height, flip), energy),
              format="extxyz")


if __name__ == "__main__":
    main()
