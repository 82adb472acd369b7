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
    # a 170 degree "CO2" has I_min/I_max ~ 6e-3 > 1e-3
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
    # ... unless the tolerance is made absurdly loose
    assert rotational_symmetry_number(a, tolerance=0.5) == 3


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
