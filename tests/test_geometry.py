"""Tests of adsorb.geometry: masses, inertia, shape, symmetry numbers, rotational constants."""

import math

import numpy as np
import pytest
from ase import Atoms
from ase.build import molecule
from scipy.spatial.transform import Rotation

from adsorb import constants
from adsorb.errors import InputError
from adsorb.geometry import (
    centre_of_mass,
    masses_amu,
    molecular_shape,
    principal_moments,
    rotational_constants_cm,
    rotational_symmetry_number,
    unwrapped_positions,
)

# isotope masses, amu (AME2020 / CODATA, from memory): 12C, 16O, 1H, 2H
M_12C = 12.0
M_16O = 15.99491461957
M_1H = 1.00782503223
M_2H = 2.01410177812


def _diatomic(symbols, r, masses=None):
    atoms = Atoms(symbols, positions=[[0.0, 0.0, 0.0], [0.0, 0.0, r]])
    if masses is not None:
        atoms.set_masses(masses)
    return atoms


def _sf6(d=1.56):
    # octahedral SF6, S-F about 1.56 Å (from memory); only the symmetry matters here
    pos = [[0, 0, 0], [d, 0, 0], [-d, 0, 0], [0, d, 0], [0, -d, 0], [0, 0, d], [0, 0, -d]]
    return Atoms("SF6", positions=pos)


def _moved(atoms, seed, noise=0.0):
    """A rigidly rotated and translated copy, optionally with random noise (Å)."""
    rng = np.random.default_rng(seed)
    rot = Rotation.random(random_state=seed).as_matrix()
    out = atoms.copy()
    out.positions = atoms.positions @ rot.T + rng.uniform(-5, 5, 3)
    if noise:
        out.positions += rng.normal(0.0, noise, out.positions.shape)
    return out


# ---------------------------------------------------------------------------
# masses and centre of mass
# ---------------------------------------------------------------------------


def test_masses_default_and_custom():
    co = molecule("CO")  # [O, C]
    # IUPAC 2013 conventional atomic weights O 15.999, C 12.011 (Meija et al., Pure Appl. Chem. 88, 265 (2016))
    np.testing.assert_allclose(masses_amu(co), [15.999, 12.011], rtol=0, atol=1e-9)
    co.set_masses([18.0, 13.0])
    np.testing.assert_allclose(masses_amu(co), [18.0, 13.0], rtol=0, atol=0)


def test_masses_returns_copy():
    co = molecule("CO")
    m = masses_amu(co)
    m[:] = 0.0
    assert co.get_masses()[0] > 15.0


def test_centre_of_mass_matches_ase_for_intact_molecule():
    # ASE's own get_center_of_mass is an independent implementation
    for name in ["H2O", "CH3OH", "C6H6"]:
        a = molecule(name)
        np.testing.assert_allclose(centre_of_mass(a), a.get_center_of_mass(), rtol=0, atol=1e-12)


def test_centre_of_mass_of_co_by_hand():
    # lever rule, common practice: x_com = m_O r / (m_C + m_O) with C at 0
    r = 1.128
    co = _diatomic("CO", r)
    m_c, m_o = 12.011, 15.999
    np.testing.assert_allclose(centre_of_mass(co), [0, 0, m_o * r / (m_c + m_o)], rtol=0, atol=1e-12)


# ---------------------------------------------------------------------------
# principal moments
# ---------------------------------------------------------------------------


def test_co_moment_is_mu_r_squared():
    # diatomic moment I = mu r^2 (common practice) with r_e(CO) = 1.128 Å (Huber-Herzberg, from memory)
    r = 1.128
    co = _diatomic("CO", r)
    m_c, m_o = 12.011, 15.999
    mu = m_c * m_o / (m_c + m_o)
    moments, axes = principal_moments(co)
    np.testing.assert_allclose(moments, [0.0, mu * r**2, mu * r**2], rtol=1e-12, atol=1e-12)
    # the zero moment belongs to the bond axis
    np.testing.assert_allclose(abs(axes[0] @ [0, 0, 1]), 1.0, rtol=0, atol=1e-12)


def test_water_moments_by_hand():
    # symmetric bent XY2, closed forms (common practice): about the C2 axis I = 2 m_Y (r sin(t/2))^2;
    # about the in-plane perpendicular I = (2 m_Y m_X / M) (r cos(t/2))^2; the out-of-plane one is their sum
    r, theta = 0.9572, math.radians(104.52)  # H2O equilibrium geometry (from memory)
    s, c = r * math.sin(theta / 2), r * math.cos(theta / 2)
    w = Atoms("OH2", positions=[[0, 0, 0], [s, 0, c], [-s, 0, c]])
    m_o, m_h = w.get_masses()[0], w.get_masses()[1]
    big_m = m_o + 2 * m_h
    i_c2 = 2 * m_h * s**2
    i_perp = 2 * m_h * m_o / big_m * c**2
    expected = np.sort([i_c2, i_perp, i_c2 + i_perp])
    moments, axes = principal_moments(w)
    np.testing.assert_allclose(moments, expected, rtol=1e-12)
    # axes: rows orthonormal and right-handed
    np.testing.assert_allclose(axes @ axes.T, np.eye(3), atol=1e-12)
    assert np.linalg.det(axes) == pytest.approx(1.0, abs=1e-12)
    # each row is an eigenvector of the inertia tensor: largest moment along the plane normal (y)
    np.testing.assert_allclose(abs(axes[2] @ [0, 1, 0]), 1.0, atol=1e-12)


@pytest.mark.parametrize("name", ["H2O", "NH3", "CH4", "C6H6", "CH3OH", "CO2"])
def test_moments_agree_with_ase(name):
    # ASE's get_moments_of_inertia (non-periodic input, so no warning) is an independent implementation
    a = molecule(name)
    ours, _ = principal_moments(a)
    np.testing.assert_allclose(ours, a.get_moments_of_inertia(), rtol=1e-10, atol=1e-10)


def test_moments_honour_custom_masses():
    # D2 vs H2 at one bond length: I scales with the reduced mass (common practice)
    h2 = _diatomic("H2", 0.7414, [M_1H, M_1H])
    d2 = _diatomic("H2", 0.7414, [M_2H, M_2H])
    ratio = principal_moments(d2)[0][2] / principal_moments(h2)[0][2]
    assert ratio == pytest.approx(M_2H / M_1H, rel=1e-12)


def test_monatomic_moments_are_zero():
    moments, axes = principal_moments(Atoms("Ar", positions=[[1, 2, 3]]))
    np.testing.assert_allclose(moments, 0.0, atol=0)
    np.testing.assert_allclose(axes @ axes.T, np.eye(3), atol=1e-12)


def test_wrapped_co2_is_unwrapped():
    # ase-io.md §5: a molecule split across the boundary gives nonsense unless unwrapped
    ref = molecule("CO2")
    ref_moments, _ = principal_moments(ref)
    a = ref.copy()
    a.set_cell([5.0, 5.0, 5.0])
    a.pbc = True
    a.positions += [0.2, 4.9, 0.3]  # puts one O outside the cell in z and the molecule across y
    a.wrap()
    span = np.ptp(a.positions, axis=0)
    assert span.max() > 3.0  # it really is split
    moments, _ = principal_moments(a)
    np.testing.assert_allclose(moments, ref_moments, rtol=1e-10, atol=1e-9)
    assert molecular_shape(a) == "linear"
    assert rotational_symmetry_number(a) == 2


def test_wrapped_benzene_in_small_triclinic_cell():
    # the molecule (H...H 4.96 Å) is wider than half the cell: minimum image about one atom would fail,
    # the spanning-tree unwrap does not
    ref = molecule("C6H6")
    ref_moments, _ = principal_moments(ref)
    a = ref.copy()
    a.set_cell([[7.5, 0, 0], [3.0, 7.0, 0], [0.5, 0.4, 7.2]])
    a.pbc = [True, True, True]
    a.positions += [6.8, 6.5, 6.9]
    a.wrap()
    moments, _ = principal_moments(a)
    np.testing.assert_allclose(moments, ref_moments, rtol=1e-10)
    assert rotational_symmetry_number(a) == 12
    # distances inside the unwrapped molecule equal the original ones
    u = unwrapped_positions(a)
    d_u = np.linalg.norm(u[:, None] - u[None], axis=2)
    d_r = np.linalg.norm(ref.positions[:, None] - ref.positions[None], axis=2)
    np.testing.assert_allclose(d_u, d_r, atol=1e-10)


def test_unwrap_leaves_non_periodic_directions_alone():
    a = _diatomic("N2", 1.1)
    a.positions += [0, 0, 9.5]
    a.set_cell([10, 10, 10])
    a.pbc = [True, True, False]
    np.testing.assert_allclose(unwrapped_positions(a), a.positions, atol=0)


# ---------------------------------------------------------------------------
# shape
# ---------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("name", "shape"),
    # linear/nonlinear of these molecules: common practice
    [("H2", "linear"), ("CO", "linear"), ("CO2", "linear"), ("C2H2", "linear"), ("HCN", "linear"),
     ("H2O", "nonlinear"), ("NH3", "nonlinear"), ("CH4", "nonlinear"), ("C6H6", "nonlinear"),
     ("NO2", "nonlinear")],
)
def test_shape_of_g2_molecules(name, shape):
    assert molecular_shape(molecule(name)) == shape


def test_shape_monatomic():
    assert molecular_shape(Atoms("He")) == "monatomic"


def test_slightly_bent_co2_is_linear():
    # ase-io.md §5: one O moved 0.002 Å off the axis, angle 179.90 degrees
    a = molecule("CO2")  # [C, O, O] along z
    a.positions[1] += [0.002, 0.0, 0.0]
    angle = a.get_angle(1, 0, 2)
    assert 179.85 < angle < 179.95
    moments, _ = principal_moments(a)
    assert moments[0] > 0.0  # not exactly linear any more
    assert molecular_shape(a) == "linear"
    assert rotational_symmetry_number(a) == 2


def test_clearly_bent_co2_is_nonlinear():
    # a 170 degree "CO2" has I_min/I_max = 2.1e-3 > 1e-3
    d = 1.16
    half = math.radians(85.0)
    a = Atoms("CO2", positions=[[0, 0, 0], [d * math.sin(half), 0, d * math.cos(half)],
                                [-d * math.sin(half), 0, d * math.cos(half)]])
    assert molecular_shape(a) == "nonlinear"
    # a loose tolerance calls it linear
    assert molecular_shape(a, tolerance=0.05) == "linear"


def test_shape_rejects_coincident_atoms():
    with pytest.raises(InputError, match="same point"):
        molecular_shape(Atoms("H2", positions=[[0, 0, 0], [0, 0, 0]]))


# ---------------------------------------------------------------------------
# symmetry numbers
# ---------------------------------------------------------------------------

# rotational symmetry numbers = order of the proper-rotation subgroup of the point group
# (standard point-group orders, common practice; e.g. Herzberg 1945; McQuarrie 1976)
SYMMETRY_NUMBERS = [
    ("H2", 2),  # D∞h
    ("N2", 2),  # D∞h
    ("CO", 1),  # C∞v
    ("CO2", 2),  # D∞h
    ("HCN", 1),  # C∞v
    ("C2H2", 2),  # D∞h
    ("H2O", 2),  # C2v
    ("NO2", 2),  # C2v
    ("H2CO", 2),  # C2v
    ("NH3", 3),  # C3v
    ("CH3Cl", 3),  # C3v
    ("CH3CN", 3),  # C3v
    ("CH4", 12),  # Td
    ("CCl4", 12),  # Td
    ("SiH4", 12),  # Td
    ("C2H4", 4),  # D2h
    ("C3H4_D2d", 4),  # allene, D2d
    ("C2H6", 6),  # D3d (staggered)
    ("BF3", 6),  # D3h
    ("C6H6", 12),  # D6h
    ("CH3OH", 1),  # Cs
    ("CH3CH2OH", 1),  # Cs / C1
]


@pytest.mark.parametrize(("name", "sigma"), SYMMETRY_NUMBERS)
def test_symmetry_number_g2(name, sigma):
    assert rotational_symmetry_number(molecule(name)) == sigma


def test_g2_ethane_is_staggered():
    # H-C-C-H dihedrals of staggered ethane are 60 or 180 degrees (common practice)
    a = molecule("C2H6")
    carbons = [i for i, s in enumerate(a.get_chemical_symbols()) if s == "C"]
    c0, c1 = carbons
    d = a.positions
    h0 = [i for i in range(len(a)) if a[i].symbol == "H" and np.linalg.norm(d[i] - d[c0]) < 1.3]
    h1 = [i for i in range(len(a)) if a[i].symbol == "H" and np.linalg.norm(d[i] - d[c1]) < 1.3]
    dihedral = a.get_dihedral(h0[0], c0, c1, h1[0]) % 120.0
    assert dihedral == pytest.approx(60.0, abs=0.5)


def test_symmetry_number_sf6_and_monatomic():
    assert rotational_symmetry_number(_sf6()) == 24  # Oh: rotational subgroup O of order 24
    assert rotational_symmetry_number(Atoms("Ar")) == 1


@pytest.mark.parametrize(("name", "sigma"), SYMMETRY_NUMBERS + [("SF6", 24)])
@pytest.mark.parametrize("seed", [0, 7])
def test_symmetry_number_robust_to_rotation_and_noise(name, sigma, seed):
    a = _sf6() if name == "SF6" else molecule(name)
    b = _moved(a, seed, noise=1e-3)
    assert rotational_symmetry_number(b) == sigma


def test_symmetry_number_breaks_for_real_distortion():
    # one N-H of NH3 stretched by 0.2 Å: only the identity is left
    a = molecule("NH3")
    n = a.positions[0]
    a.positions[1] = n + (a.positions[1] - n) * (1 + 0.2 / np.linalg.norm(a.positions[1] - n))
    assert rotational_symmetry_number(a) == 1
    # ... unless the tolerance is made loose enough to hide the distortion
    assert rotational_symmetry_number(a, tolerance=0.3) == 3


def test_symmetry_tolerance_must_stay_below_half_the_shortest_distance():
    # N-H is about 1.02 Å in NH3, so 0.6 Å would let atoms match ambiguously
    with pytest.raises(InputError, match="shortest interatomic distance"):
        rotational_symmetry_number(molecule("NH3"), tolerance=0.6)


def test_symmetry_operations_that_do_not_form_a_group_are_reported():
    # an invented, strongly distorted CH4: at 0.3 Å some rotations fit but their products do not
    a = Atoms("CH4", positions=[[0.0349, -0.086, 0.1267], [0.5488, 0.6841, 0.5621], [-0.5603, -0.6521, 0.6386],
                                [0.6323, -0.5633, -0.6484], [-0.8066, 0.5837, -0.6181]])
    assert rotational_symmetry_number(a, tolerance=0.05) == 1
    with pytest.raises(InputError, match="do not form a group"):
        rotational_symmetry_number(a, tolerance=0.3)


def test_rotation_group_size_guard():
    # the guard against a runaway closure, exercised with a small limit on CH4 (order 12)
    from adsorb.geometry.molecule import _principal
    from adsorb.geometry.symmetry import _rotation_group

    ch4 = molecule("CH4")
    _, axes, rel = _principal(ch4.get_masses(), ch4.positions)
    labels = np.array([0, 1, 1, 1, 1])
    assert len(_rotation_group(rel, labels, axes, 0.05)) == 12
    with pytest.raises(InputError, match="more than 10 rotations"):
        _rotation_group(rel, labels, axes, 0.05, max_order=10)


def _bent_triatomic(symbols, d1, d2, angle_deg):
    half = math.radians(angle_deg / 2)
    return Atoms(symbols, positions=[[0, 0, 0], [d1 * math.sin(half), 0, d1 * math.cos(half)],
                                     [-d2 * math.sin(half), 0, d2 * math.cos(half)]])


def test_nearly_linear_symmetric_molecule_keeps_its_twofold_axis():
    # a CO2 bent to 176 degrees is linear within the default shape tolerance (I_min/I_max = 3.3e-4);
    # inversion no longer maps it (O off by ~0.08 Å) but the C2 along the bisector does: sigma = 2
    co2 = _bent_triatomic("CO2", 1.16, 1.16, 176.0)
    assert molecular_shape(co2) == "linear"
    assert rotational_symmetry_number(co2) == 2
    # an unsymmetric one (OCS-like bond lengths) has no twofold axis: sigma = 1
    ocs = _bent_triatomic("COS", 1.16, 1.56, 176.0)
    assert molecular_shape(ocs) == "linear"
    assert rotational_symmetry_number(ocs) == 1


def test_symmetry_number_isotopes():
    # isotopic substitution lowers symmetry (common practice): HD 1, CH3D 3, D2 2
    assert rotational_symmetry_number(_diatomic("H2", 0.7414, [M_1H, M_2H])) == 1
    assert rotational_symmetry_number(_diatomic("H2", 0.7414, [M_2H, M_2H])) == 2
    ch4 = molecule("CH4")
    m = ch4.get_masses()
    m[1] = M_2H
    ch4.set_masses(m)
    assert rotational_symmetry_number(ch4) == 3


def test_symmetry_number_c60_if_available():
    pytest.importorskip("ase.build")
    try:
        c60 = molecule("C60")
    except KeyError:
        pytest.skip("ase has no C60 geometry")
    assert rotational_symmetry_number(c60) == 60  # Ih: rotational subgroup I of order 60


# ---------------------------------------------------------------------------
# rotational constants
# ---------------------------------------------------------------------------


def test_rotational_constant_of_co():
    # 12C16O at r_e = 1.12823 Å: B_e = 1.93128 cm^-1 (Huber & Herzberg 1979, from memory)
    co = _diatomic("CO", 1.12823, [M_12C, M_16O])
    moments, _ = principal_moments(co)
    b = rotational_constants_cm(moments)
    assert b[0] == np.inf
    assert b[2] == pytest.approx(1.93128, rel=1e-3)
    # B0 = 1.9225 cm^-1 is lower by alpha_e/2 ~ 0.0087 cm^-1 (vibration-rotation interaction)
    assert abs(b[2] - 1.9225) < 0.012


def test_rotational_constant_h_over_8pi2c():
    # B I = h / (8 pi^2 c) = 16.8576 amu Å^2 cm^-1 (common practice, from memory)
    b = rotational_constants_cm(np.array([[1.0, 2.0], [16.8576, 0.5]]))
    assert b.shape == (2, 2)
    np.testing.assert_allclose(b * np.array([[1.0, 2.0], [16.8576, 0.5]]), 16.8576, rtol=1e-5)


def test_rotational_constant_zero_gives_inf_without_warning():
    # filterwarnings=error would turn a divide-by-zero RuntimeWarning into a failure
    b = rotational_constants_cm([0.0, 1.0])
    assert b[0] == np.inf and np.isfinite(b[1])
    assert rotational_constants_cm(0.0).shape == ()


def test_rotational_constants_match_constants_module():
    i = 3.3
    expected = constants.h / (8 * constants.pi**2 * constants.c * 100 * i * constants.amu * constants.angstrom**2)
    assert float(rotational_constants_cm(i)) == pytest.approx(expected, rel=1e-14)


# ---------------------------------------------------------------------------
# bad input
# ---------------------------------------------------------------------------


@pytest.mark.parametrize(
    "func",
    [masses_amu, centre_of_mass, principal_moments, molecular_shape, rotational_symmetry_number,
     unwrapped_positions],
)
@pytest.mark.parametrize("bad", [Atoms(), [("H", 0, 0, 0)], "H2O", None])
def test_bad_atoms(func, bad):
    with pytest.raises(InputError, match="atoms"):
        func(bad)


@pytest.mark.parametrize("tol", [0.0, -1.0, float("nan"), "x"])
def test_bad_tolerances(tol):
    with pytest.raises(InputError, match="tolerance"):
        molecular_shape(molecule("H2O"), tolerance=tol)
    with pytest.raises(InputError, match="tolerance"):
        rotational_symmetry_number(molecule("H2O"), tolerance=tol)


@pytest.mark.parametrize("bad", [-1.0, [1.0, float("nan")], [np.inf], "abc"])
def test_bad_moments(bad):
    with pytest.raises(InputError, match="moments_amu_A2"):
        rotational_constants_cm(bad)


def test_bad_mass():
    a = molecule("CO")
    a.set_masses([0.0, 12.0])
    with pytest.raises(InputError, match="mass of atom 0"):
        masses_amu(a)


# ---------------------------------------------------------------------------
# adsorbates: indices, normal, inertia about the normal
# ---------------------------------------------------------------------------

from ase.build import add_adsorbate, fcc100, fcc111  # noqa: E402
from ase.constraints import FixAtoms, FixBondLength, FixCartesian, FixScaled  # noqa: E402

from adsorb.geometry import (  # noqa: E402
    adsorbate_indices,
    assign_soft_modes,
    inertia_about_normal,
    lowest_modes,
    rigid_motion_overlaps,
    surface_normal,
)


def _co_on_pt(frozen="all"):
    slab = fcc111("Pt", size=(2, 2, 3), vacuum=8.0)
    add_adsorbate(slab, molecule("CO"), 1.85, "ontop", mol_index=1)  # indices 12 (O), 13 (C)
    if frozen == "all":
        slab.set_constraint(FixAtoms(mask=slab.get_tags() > 0))
    return slab


def test_adsorbate_indices_from_fixatoms():
    assert adsorbate_indices(_co_on_pt()).tolist() == [12, 13]


def test_adsorbate_indices_explicit():
    slab = _co_on_pt(frozen=None)
    assert adsorbate_indices(slab, [13, 12]).tolist() == [12, 13]
    assert adsorbate_indices(slab, np.array([3])).tolist() == [3]


def test_adsorbate_indices_partial_masks_do_not_freeze():
    # ase-io.md §7: only FixAtoms or an all-True FixCartesian/FixScaled mask freezes an atom
    slab = _co_on_pt(frozen=None)
    slab.set_constraint([
        FixAtoms(indices=range(0, 8)),
        FixCartesian([8, 9], (True, True, True)),
        FixScaled(10, (True, True, True)),
        FixCartesian(11, (True, True, False)),  # partial: stays free
        FixScaled(12, (False, False, True)),  # partial: stays free
        FixBondLength(12, 13),  # not a freezing constraint
    ])
    assert adsorbate_indices(slab).tolist() == [11, 12, 13]


def test_adsorbate_indices_after_extxyz_round_trip(tmp_path):
    # ase-io.md §7: any FixCartesian turns extxyz constraints into one FixCartesian per atom
    import ase.io

    slab = _co_on_pt(frozen=None)
    slab.set_constraint([FixAtoms(mask=slab.get_tags() > 0), FixCartesian(13, (False, False, True))])
    path = tmp_path / "slab.xyz"
    ase.io.write(path, slab)
    back = ase.io.read(path)
    assert all(isinstance(c, FixCartesian) for c in back.constraints)
    assert adsorbate_indices(back).tolist() == [12, 13]


@pytest.mark.parametrize(
    ("indices", "match"),
    [([], "indices"), ([0, 0], "repeated"), ([14], "between 0 and 13"), ([-1], "between"),
     ([0.5], "indices"), ([True, False], "indices"), ([[1, 2]], "indices")],
)
def test_adsorbate_indices_bad(indices, match):
    with pytest.raises(InputError, match=match):
        adsorbate_indices(_co_on_pt(), indices)


def test_adsorbate_indices_none_or_all_frozen():
    with pytest.raises(InputError, match="no atom is frozen"):
        adsorbate_indices(_co_on_pt(frozen=None))
    slab = _co_on_pt(frozen=None)
    slab.set_constraint(FixAtoms(indices=range(len(slab))))
    with pytest.raises(InputError, match="all 14 atoms are frozen"):
        adsorbate_indices(slab)


def test_surface_normal_of_built_slabs():
    np.testing.assert_allclose(surface_normal(_co_on_pt()), [0, 0, 1], atol=1e-12)
    np.testing.assert_allclose(surface_normal(fcc100("Cu", (2, 2, 3), vacuum=8)), [0, 0, 1], atol=1e-12)
    np.testing.assert_allclose(surface_normal(molecule("CO")), [0, 0, 1], atol=0)  # no cell


def test_surface_normal_skewed_and_other_planes():
    a = Atoms("Cu", cell=[[3, 0, 0], [1.5, 2.6, 0], [1.0, 1.0, 20.0]], pbc=[True, True, False])
    # normal to a1 and a2, not along the tilted third vector
    np.testing.assert_allclose(surface_normal(a), [0, 0, 1], atol=1e-12)
    a.cell[2] = [0.5, 0.0, -20.0]
    np.testing.assert_allclose(surface_normal(a), [0, 0, -1], atol=1e-12)  # points along a3
    b = Atoms("Cu", cell=[[3, 0, 0], [0, 25, 0], [0, 0, 4]], pbc=[True, False, True])
    np.testing.assert_allclose(surface_normal(b), [0, 1, 0], atol=1e-12)  # vacuum along b
    c = Atoms("Cu", cell=[[3, 0, 0], [6, 0, 0], [0, 0, 4]], pbc=[True, True, False])
    with pytest.raises(InputError, match="parallel"):
        surface_normal(c)


def test_inertia_about_normal_flat_and_upright_co():
    # a flat CO rotating about the normal: I = mu r^2 (common practice); upright CO: 0
    r = 1.15
    slab = fcc100("Cu", (2, 2, 3), vacuum=8)
    n_slab = len(slab)
    top = slab.positions[:, 2].max()
    flat = slab + Atoms("CO", positions=[[1.0, 1.2, top + 2.0], [1.0 + r, 1.2, top + 2.0]])
    flat.set_constraint(FixAtoms(indices=range(n_slab)))
    m_c, m_o = 12.011, 15.999
    assert inertia_about_normal(flat, None) == pytest.approx(m_c * m_o / (m_c + m_o) * r**2, rel=1e-12)
    upright = slab + Atoms("CO", positions=[[1.0, 1.2, top + 2.0], [1.0, 1.2, top + 2.0 + r]])
    assert inertia_about_normal(upright, [n_slab, n_slab + 1]) == pytest.approx(0.0, abs=1e-12)
    # about a horizontal axis instead, the upright molecule has mu r^2 again
    assert inertia_about_normal(upright, [n_slab, n_slab + 1], normal=[2.0, 0, 0]) == pytest.approx(
        m_c * m_o / (m_c + m_o) * r**2, rel=1e-12)


def test_inertia_about_normal_matches_principal_moment_of_nh3():
    # NH3 from ase.build has its C3 axis along z; about z its moment is the unique principal moment
    nh3 = molecule("NH3")
    moments, axes = principal_moments(nh3)
    unique = moments[2] if abs(moments[2] - moments[1]) > abs(moments[1] - moments[0]) else moments[0]
    assert inertia_about_normal(nh3, [0, 1, 2, 3]) == pytest.approx(unique, rel=1e-10)
    # rotate everything: about the rotated normal it is unchanged
    rot = Rotation.random(random_state=4).as_matrix()
    turned = nh3.copy()
    turned.positions = nh3.positions @ rot.T
    assert inertia_about_normal(turned, [0, 1, 2, 3], normal=rot @ [0, 0, 1]) == pytest.approx(unique, rel=1e-10)


def test_inertia_about_normal_adsorbate_split_by_the_cell():
    slab = fcc100("Cu", (2, 2, 3), vacuum=8)
    n_slab = len(slab)
    top = slab.positions[:, 2].max()
    width = slab.cell[0, 0]
    # flat CO straddling the x boundary of the cell, then wrapped
    ads = slab + Atoms("CO", positions=[[width - 0.4, 1.0, top + 2.0], [width + 0.75, 1.0, top + 2.0]])
    ads.wrap()
    assert np.ptp(ads.positions[n_slab:, 0]) > 2.0  # really split
    m_c, m_o = 12.011, 15.999
    assert inertia_about_normal(ads, [n_slab, n_slab + 1]) == pytest.approx(
        m_c * m_o / (m_c + m_o) * 1.15**2, rel=1e-10)


@pytest.mark.parametrize("normal", [[0, 0, 0], [1, 2], [np.nan, 0, 1], "z"])
def test_inertia_bad_normal(normal):
    with pytest.raises(InputError, match="normal"):
        inertia_about_normal(_co_on_pt(), None, normal=normal)


# ---------------------------------------------------------------------------
# normal-mode overlaps and assignment
# ---------------------------------------------------------------------------


def _modes_from_hessian(masses, hessian):
    """Frequencies (cm^-1, imaginary as negative) and Cartesian displacement modes of a Hessian in eV/Å^2,
    the way ASE's VibrationsData defines them (mass-weighted unit eigenvectors / sqrt(m))."""
    w = np.repeat(1.0 / np.sqrt(masses), 3)
    evals, evecs = np.linalg.eigh(hessian * np.outer(w, w))
    # omega = sqrt(k/m): eV/Å^2/amu -> s^-2 -> cm^-1
    omega = np.sqrt(np.abs(evals) * constants.eV / constants.angstrom**2 / constants.amu)
    freq = np.sign(evals) * omega / (2 * np.pi * constants.c * 100)
    modes = (evecs.T * w).reshape(len(evals), len(masses), 3)
    return freq, modes


def _toy_adsorbate():
    """Invented planar triatomic adsorbate (OCH-like masses) with a made-up harmonic potential:
    stiff bonds, weak mass-proportional in-plane tethers, a torsion about the normal, stiffer z tethers."""
    atoms = Atoms("OCH", positions=[[0.0, 0.0, 10.0], [1.2, 0.0, 10.0], [1.7, 0.95, 10.0]],
                  cell=[[5.0 * math.cos(0.4), 5.0 * math.sin(0.4), 0], [-5.0 * math.sin(0.4), 5.0 * math.cos(0.4), 0],
                        [0, 0, 20]], pbc=[True, True, False])
    m = atoms.get_masses()
    pos = atoms.positions
    n = len(atoms)
    hess = np.zeros((3 * n, 3 * n))
    for i, j in [(0, 1), (1, 2), (0, 2)]:  # bond springs, 20 eV/Å^2 (invented)
        u = pos[j] - pos[i]
        u /= np.linalg.norm(u)
        block = 20.0 * np.outer(u, u)
        for a, b, s in [(i, i, 1), (j, j, 1), (i, j, -1), (j, i, -1)]:
            hess[3 * a:3 * a + 3, 3 * b:3 * b + 3] += s * block
    for i in range(n):  # tethers proportional to mass: rigid translations stay exact eigenvectors
        hess[3 * i:3 * i + 3, 3 * i:3 * i + 3] += np.diag([0.01, 0.01, 0.2]) * m[i]
    com = m @ pos / m.sum()
    g = (m[:, None] * np.cross([0, 0, 1.0], pos - com)).ravel()
    inertia = float(np.sum(m * np.sum((pos - com)[:, :2] ** 2, axis=1)))
    # torsion about the normal: V = kappa theta^2 / 2 with theta = g . d / I, kappa = 0.5 I eV (invented)
    hess += 0.5 * inertia * np.outer(g, g) / inertia**2
    return atoms, m, hess


def test_toy_adsorbate_assignment():
    atoms, m, hess = _toy_adsorbate()
    freq, modes = _modes_from_hessian(m, hess)
    ov = rigid_motion_overlaps(atoms, [0, 1, 2], modes)
    assert ov.shape == (9, 3)
    assert np.all((ov >= 0) & (ov <= 1))
    # completeness of a full set of 3n orthonormal modes: each rigid motion is spread over them with total 1
    np.testing.assert_allclose(ov.sum(axis=0), 1.0, rtol=1e-10)
    result = assign_soft_modes(ov, freq)
    # by construction two degenerate in-plane translations (eigh mixes them arbitrarily) and one torsion
    t = result["translations"]
    r = result["rotations"]
    assert len(t) == 2 and len(r) == 1
    np.testing.assert_allclose(result["translation_scores"], 1.0, atol=1e-8)
    np.testing.assert_allclose(result["rotation_scores"], 1.0, atol=1e-8)
    np.testing.assert_allclose(freq[t[0]], freq[t[1]], rtol=1e-8)
    assert sorted(t.tolist() + r.tolist() + result["others"].tolist()) == list(range(9))
    # scrambling order, sign and normalisation of the modes does not change the choice
    perm = np.random.default_rng(3).permutation(9)
    scaled = modes[perm] * np.linspace(-3, 2.5, 9)[:, None, None]
    again = assign_soft_modes(rigid_motion_overlaps(atoms, [0, 1, 2], scaled), freq[perm])
    assert sorted(perm[again["translations"]].tolist()) == sorted(t.tolist())
    assert perm[again["rotations"]].tolist() == r.tolist()


def test_overlaps_use_the_mass_weighted_metric():
    # a CO stretch that keeps the centre of mass fixed has zero translation overlap in the
    # mass-weighted metric (Wilson, Decius and Cross 1955); an unweighted overlap would not be zero
    co = Atoms("CO", positions=[[0, 0, 10], [1.15, 0, 10]])
    m_c, m_o = co.get_masses()
    stretch = np.array([[[-m_o, 0, 0], [m_c, 0, 0]]])
    ov = rigid_motion_overlaps(co, [0, 1], stretch, normal=[0, 0, 1])
    np.testing.assert_allclose(ov, 0.0, atol=1e-14)
    # a rigid x translation: overlap 1 with e1 (x, as there is no cell)
    shift = np.array([[[0.3, 0, 0], [0.3, 0, 0]]])
    np.testing.assert_allclose(rigid_motion_overlaps(co, [0, 1], shift, normal=[0, 0, 1]), [[1, 0, 0]], atol=1e-14)
    # a rigid rotation about the normal through the COM, given as small Cartesian displacements
    com = co.get_center_of_mass()
    turn = np.cross([0, 0, 1], co.positions - com)[None] * 1e-3
    np.testing.assert_allclose(rigid_motion_overlaps(co, [0, 1], turn, normal=[0, 0, 1]), [[0, 0, 1]], atol=1e-12)


def test_overlap_shapes_accepted():
    atoms, m, hess = _toy_adsorbate()
    slab = fcc100("Cu", (2, 2, 2), vacuum=6) + atoms
    idx = list(range(len(slab) - 3, len(slab)))
    freq, modes = _modes_from_hessian(m, hess)
    ref = rigid_motion_overlaps(slab, idx, modes)
    full = np.zeros((9, len(slab), 3))
    full[:, idx] = modes  # like get_modes(all_atoms=True)
    np.testing.assert_allclose(rigid_motion_overlaps(slab, idx, full), ref, atol=1e-14)
    np.testing.assert_allclose(rigid_motion_overlaps(slab, idx, modes.reshape(9, 9)), ref, atol=1e-14)
    np.testing.assert_allclose(rigid_motion_overlaps(slab, idx, modes.astype(complex)), ref, atol=1e-14)


@pytest.mark.parametrize(
    ("modes", "match"),
    [(np.zeros((2, 3, 3)), "zero"), (np.ones((2, 2, 3)), "shape"), (np.full((1, 3, 3), np.nan), "NaN"),
     (np.ones((1, 3, 3)) * 1j, "imaginary"), ("abc", "mode_vectors"), (np.ones((0, 3, 3)), "shape")],
)
def test_overlaps_bad_modes(modes, match):
    atoms, _, _ = _toy_adsorbate()
    with pytest.raises(InputError, match=match):
        rigid_motion_overlaps(atoms, [0, 1, 2], modes)


def _emt_modes(adsorbate, height, mol_index, name, tmp_path):
    """Relax an adsorbate at the hollow of a small Cu(100) slab with EMT (a toy potential) and vibrate it."""
    from ase.calculators.emt import EMT
    from ase.optimize import BFGS
    from ase.vibrations import Vibrations

    slab = fcc100("Cu", (2, 2, 3), vacuum=8.0)
    add_adsorbate(slab, adsorbate, height, "hollow", mol_index=mol_index)
    slab.set_constraint(FixAtoms(mask=slab.get_tags() > 0))
    slab.calc = EMT()
    BFGS(slab, logfile=None).run(fmax=0.01)
    vib = Vibrations(slab, name=str(tmp_path / name))
    vib.run()
    data = vib.get_vibrations()
    return slab, data.get_frequencies(), data.get_modes()


def test_emt_oxygen_on_cu100_hollow(tmp_path):
    slab, freq, modes = _emt_modes("O", 1.0, 0, "vib_o", tmp_path)
    idx = adsorbate_indices(slab)
    assert idx.tolist() == [12]
    ov = rigid_motion_overlaps(slab, idx, modes)
    with pytest.raises(InputError, match="n_rotations"):
        assign_soft_modes(ov, freq)  # a single atom has no rotation about the normal
    result = assign_soft_modes(ov, freq, n_rotations=0)
    # the mode with the largest z motion is the perpendicular one (common practice for an atom in a hollow)
    perpendicular = int(np.argmax(np.abs(modes[:, 0, 2])))
    assert result["others"].tolist() == [perpendicular]
    assert sorted(result["translations"].tolist()) == sorted(set(range(3)) - {perpendicular})
    np.testing.assert_allclose(result["translation_scores"], 1.0, atol=1e-6)  # purely in-plane by symmetry
    # the fourfold hollow makes the two in-plane modes degenerate; here the fallback rule agrees
    assert sorted(lowest_modes(freq, 2).tolist()) == sorted(result["translations"].tolist())


def test_emt_upright_co_on_cu100_hollow(tmp_path):
    slab, freq, modes = _emt_modes(molecule("CO"), 1.5, 1, "vib_co", tmp_path)
    idx = adsorbate_indices(slab)
    assert inertia_about_normal(slab, idx) == pytest.approx(0.0, abs=1e-8)  # stays upright on the C4 axis
    ov = rigid_motion_overlaps(slab, idx, modes)
    np.testing.assert_allclose(ov.sum(axis=0)[:2], 1.0, rtol=1e-6)  # completeness over the 6 modes
    np.testing.assert_allclose(ov[:, 2], 0.0, atol=1e-12)  # upright: no rotation about the normal
    result = assign_soft_modes(ov, freq, n_rotations=0)
    t = result["translations"]
    # the frustrated translations are a degenerate in-plane pair carrying most of the in-plane COM motion
    np.testing.assert_allclose(freq[t[0]].real, freq[t[1]].real, rtol=1e-4)
    s_t = ov[:, 0] + ov[:, 1]
    assert np.all(result["translation_scores"] > 0.5)
    assert np.all(s_t[result["others"]] < result["translation_scores"].min())
    # the C-O stretch (highest) and the COM-metal stretch have no in-plane character
    assert int(np.argmax(freq.real)) in result["others"]


def test_lowest_modes():
    freq = np.array([300.0 + 0j, 50j, 12.0, 0.0, -80.0])
    # ASE-style imaginary 50j counts as -50; a negative real as itself
    assert lowest_modes(freq, 3).tolist() == [4, 1, 3]
    assert lowest_modes([5.0, 1.0, 1.0], 2).tolist() == [1, 2]  # ties keep input order
    assert lowest_modes([5.0], 0).tolist() == []
    with pytest.raises(InputError, match="only 1 modes"):
        lowest_modes([5.0], 2)
    with pytest.raises(InputError, match="frequencies"):
        lowest_modes([], 0)
    with pytest.raises(InputError, match="non-negative integer"):
        lowest_modes([1.0, 2.0], 1.5)


def test_assign_soft_modes_tie_break_and_errors():
    ov = np.array([[0.5, 0.5, 0.0], [0.5, 0.5, 0.0], [0.5, 0.5, 0.0], [0.0, 0.0, 1.0]])
    res = assign_soft_modes(ov, [30.0, 10.0, 20.0, 40.0])
    assert res["translations"].tolist() == [1, 2]  # equal scores: lower frequency wins
    assert res["rotations"].tolist() == [3]
    assert res["others"].tolist() == [0]
    with pytest.raises(InputError, match="frequencies"):
        assign_soft_modes(ov, [1.0, 2.0])
    with pytest.raises(InputError, match="overlaps"):
        assign_soft_modes(ov[:, :2], [1.0, 2.0, 3.0, 4.0])
    with pytest.raises(InputError, match="overlaps"):
        assign_soft_modes(ov * 2.0, [1.0, 2.0, 3.0, 4.0])
    with pytest.raises(InputError, match="n_translations"):
        assign_soft_modes(ov, [1.0, 2.0, 3.0, 4.0], n_translations=4)
    with pytest.raises(InputError, match="n_rotations"):
        assign_soft_modes(ov, [1.0, 2.0, 3.0, 4.0], n_rotations=-1)
    none = assign_soft_modes(ov, [1.0, 2.0, 3.0, 4.0], n_translations=0, n_rotations=0)
    assert none["others"].tolist() == [0, 1, 2, 3]


from hypothesis import given  # noqa: E402
from hypothesis import strategies as st  # noqa: E402


@given(seed=st.integers(0, 2**32 - 1), n_atoms=st.integers(1, 5))
def test_overlaps_are_bounded_for_any_modes(seed, n_atoms):
    # invariant: each squared overlap in [0, 1]; the three rigid vectors are orthonormal, so a row sums to <= 1;
    # for a complete orthonormal (mass-weighted) set of 3n modes each column sums to 1 (completeness)
    rng = np.random.default_rng(seed)
    symbols = rng.choice(["H", "C", "O", "Pt"], n_atoms)
    atoms = Atoms(list(symbols), positions=rng.uniform(-2, 2, (n_atoms, 3)))
    m = atoms.get_masses()
    q, _ = np.linalg.qr(rng.normal(size=(3 * n_atoms, 3 * n_atoms)))
    modes = (q.T / np.repeat(np.sqrt(m), 3)).reshape(3 * n_atoms, n_atoms, 3)
    normal = rng.normal(size=3)
    ov = rigid_motion_overlaps(atoms, list(range(n_atoms)), modes, normal=normal)
    assert np.all((ov >= 0) & (ov <= 1))
    assert np.all(ov.sum(axis=1) <= 1 + 1e-10)
    np.testing.assert_allclose(ov[:, :2].sum(axis=0), 1.0, rtol=1e-9)
    rot_total = ov[:, 2].sum()
    if inertia_about_normal(atoms, list(range(n_atoms)), normal=normal) > 1e-6:
        assert rot_total == pytest.approx(1.0, rel=1e-8)
    else:
        assert rot_total == 0.0


# ---------------------------------------------------------------------------
# atom indices, bonds and torsions
# ---------------------------------------------------------------------------

from adsorb.geometry import atom_indices, bond_matrix, torsion_axis, torsion_moments  # noqa: E402


def test_atom_indices_accepts_sequences_and_arrays():
    assert atom_indices([3, 1, 2]) == (3, 1, 2)
    assert atom_indices(np.array([0, 5]), n_atoms=6, length=2) == (0, 5)


@pytest.mark.parametrize(("value", "options", "match"), [
    (5, {}, "expected a sequence"),
    ([], {}, "non-empty"),
    ([1.0], {}, "integers"),
    ([True], {}, "integers"),
    ([-1], {}, "non-negative"),
    ([0, 6], {"n_atoms": 6}, "between 0 and 5"),
    ([1, 1], {}, "repeated"),
    ([1, 2, 3], {"length": 2}, "expected 2 atom indices"),
])
def test_atom_indices_bad(value, options, match):
    with pytest.raises(InputError, match=match) as info:
        atom_indices(value, name="top", **options)
    assert str(info.value).startswith("top:") and "\n" not in str(info.value)


@pytest.mark.parametrize(("name", "n_bonds"), [("C2H6", 7), ("CH3CH2OH", 8), ("C6H6", 12), ("H2O2", 3)])
def test_bond_matrix_counts_the_bonds_of_the_structural_formula(name, n_bonds):
    # bond counts of the structural formulas (common practice)
    bonds = bond_matrix(molecule(name))
    assert bonds.shape == (len(molecule(name)),) * 2
    assert np.array_equal(bonds, bonds.T) and not bonds.diagonal().any()
    assert int(bonds.sum()) // 2 == n_bonds
    assert not bond_matrix(molecule(name), factor=0.5).any()


def test_bond_matrix_of_a_wrapped_molecule():
    atoms = molecule("CH3CH2OH")
    wrapped = atoms.copy()
    wrapped.set_cell([8.0, 8.0, 8.0])
    wrapped.pbc = True
    wrapped.wrap()
    assert wrapped.get_distance(0, 1) > 5.0          # the C-C bond is split by the cell boundary
    assert np.array_equal(bond_matrix(wrapped), bond_matrix(atoms))


def test_torsion_axis_of_ethanol():
    atoms = molecule("CH3CH2OH")            # C0 (methyl), C1, O2, H3 (hydroxyl), H4 H5 on C1, H6-H8 on C0
    assert torsion_axis(atoms, [2, 3]) == ([2, 3], [0, 1, 4, 5, 6, 7, 8], (2, 1))
    assert torsion_axis(atoms, [0, 6, 7, 8])[2] == (0, 1)
    # a given axis is returned with the top's atom first
    assert torsion_axis(atoms, [2, 3], axis=(1, 2))[2] == (2, 1)


@pytest.mark.parametrize(("top", "axis", "match"), [
    ([0, 3], None, "do not form one bonded group"),
    ([1, 4, 5], None, "joined to the rest of the molecule by 2 bonds"),
    ([2, 9], None, "between 0 and 8"),
    (list(range(9)), None, "holds every atom"),
    ([2, 3], (3, 2), "expected one atom of the top"),
    ([2, 3], (2, 2), "repeated"),
])
def test_torsion_axis_bad(top, axis, match):
    with pytest.raises(InputError, match=match) as info:
        torsion_axis(molecule("CH3CH2OH"), top, axis, label="torsions[0]")
    assert str(info.value).startswith("torsions[0] ") and "\n" not in str(info.value)


def test_torsion_moments_of_h2o2_by_hand():
    atoms = molecule("H2O2")                # O0, O1, H2 on O0, H3 on O1
    m_h = atoms.get_masses()[2]
    # each OH about the O-O axis: m_H (r_OH sin angle(HOO))^2 (the O lie on the axis; common practice)
    i_oh = m_h * (atoms.get_distance(0, 2) * np.sin(np.radians(atoms.get_angle(2, 0, 1)))) ** 2
    out = torsion_moments(atoms, [0, 2])
    assert out["axis_atoms"] == [0, 1] and out["rest"] == [1, 3]
    np.testing.assert_allclose([out["inertia_top_amu_A2"], out["inertia_rest_amu_A2"]], [i_oh, i_oh], rtol=1e-12)
    # two equal tops: I_red = I_top / 2 (Pitzer & Gwinn 1942)
    np.testing.assert_allclose(out["two_top_amu_A2"], i_oh / 2, rtol=1e-12)
    assert out["symmetry_deviation_A"] == 0.0


def test_torsion_moments_do_not_depend_on_placement_or_wrapping():
    atoms = molecule("CH3CH2OH")
    ref_out = torsion_moments(atoms, [2, 3])
    moved = _moved(atoms, seed=3)
    moved.set_cell([8.0, 8.0, 8.0])
    moved.pbc = True
    moved.wrap()
    out = torsion_moments(moved, [2, 3])
    for key in ("inertia_top_amu_A2", "inertia_rest_amu_A2", "two_top_amu_A2", "coupled_amu_A2"):
        np.testing.assert_allclose(out[key], ref_out[key], rtol=1e-9)


def test_heavy_frame_limit():
    # a top on an infinitely heavy frame turns about a fixed axis: both reduced moments -> I_top (common practice)
    atoms = molecule("CH3CH2OH")
    masses = atoms.get_masses()
    rest = [0, 1, 4, 5, 6, 7, 8]
    masses[rest] *= 1e7
    atoms.set_masses(masses)
    out = torsion_moments(atoms, [2, 3])
    np.testing.assert_allclose(out["two_top_amu_A2"], out["inertia_top_amu_A2"], rtol=1e-6)
    np.testing.assert_allclose(out["coupled_amu_A2"], out["inertia_top_amu_A2"], rtol=1e-6)


@pytest.mark.parametrize(("name", "top", "sigma"), [
    ("CH3CH2OH", [2, 3], 1), ("CH3CH2OH", [0, 6, 7, 8], 3), ("CH3OH", [1, 3], 1), ("H2O2", [0, 2], 1),
    ("C2H6", [0, 2, 3, 4], 3),
])
def test_coupled_moment_never_exceeds_two_top(name, top, sigma):
    # variational bound: the coupled moment minimises the kinetic moment over all rigid-body motions, and the
    # two-top moment over rotations about the torsion axis only, one of them (Pitzer 1946, from memory)
    out = torsion_moments(molecule(name), top, symmetry_number=sigma)
    assert 0 < out["coupled_amu_A2"] <= out["two_top_amu_A2"] * (1 + 1e-12)
    assert out["two_top_amu_A2"] < min(out["inertia_top_amu_A2"], out["inertia_rest_amu_A2"])


@pytest.mark.parametrize(("options", "match"), [
    ({"symmetry_number": 0}, "symmetry_number: expected a positive integer"),
    ({"symmetry_number": 2.5}, "symmetry_number: expected a positive integer"),
    ({"symmetry_number": 2}, "sets of 2 equivalent atoms"),
    ({"symmetry_tolerance": -0.1}, "symmetry_tolerance"),
])
def test_torsion_moments_bad(options, match):
    with pytest.raises(InputError, match=match):
        torsion_moments(molecule("C2H6"), [0, 2, 3, 4], **options)
    with pytest.raises(InputError, match="lies on the axis"):
        torsion_moments(molecule("CH3OH"), [3], axis=(3, 1))
