"""Property-based tests (hypothesis) across the physics of adsorb, on the public objects.

The module tests check each building block on chosen inputs; this file draws random valid
species and conditions and checks what must hold for all of them:

* thermodynamic identities of GasMolecule and Adsorbate tables (G = H - TS, S = -dG/dT,
  Cp = dH/dT, the ideal-gas pressure dependence), by central differences;
* signs and monotonicity: S >= 0 and Cp >= 0 where physics says so (and only there: see the
  comments for the per-site mobile models, symmetry numbers, quasi-RRHO and the known defect of
  the hindered closed form), S and H non-decreasing in T;
* model limits: hindered translator/rotor -> 2D ideal gas + free rotor as the barriers vanish and
  -> harmonic oscillators as they grow (Sprowl, Campbell and Arnadottir, J. Phys. Chem. C 2016,
  120, 9719), lattice gas = harmonic partition function (Campbell, Sprowl and Arnadottir,
  J. Phys. Chem. C 2016, 120, 10283);
* adsorption equilibria: van 't Hoff d ln K/d(1/T) = -dH/k, K independent of the standard state;
* coverages in [0, 1] with the site balance of every site kind, monotone in the own pressure
  (ideal), isosteric heats of random models;
* Peng-Robinson: d ln(phi)/d ln(p) = Z - 1 at constant T, mixtures of one fluid.

Species and conditions are invented (random); no reference values are hard-coded. Random
molecules are built from heavy atoms only: the unit check of GasMolecule refuses a hydrogen-
bearing molecule whose highest mode is below 1000 cm^-1 (adsorb.partition.checks.unit_suspicion),
which random spectra would trip. The surface-pes model is left out: one evaluation of its
quantum lateral solver takes 1-60 s (tests/test_surface_pes.py covers it).
"""

import math
import warnings
from contextlib import contextmanager

import numpy as np
from ase import Atoms
from hypothesis import assume, given, reject, settings
from hypothesis import strategies as st
from numpy.testing import assert_allclose, assert_array_equal

from adsorb import Adsorbate, GasMolecule
from adsorb import constants as C
from adsorb.coverage import site_coverages
from adsorb.eos import CriticalConstants, peng_robinson_mixture, peng_robinson_pure
from adsorb.equilibria import adsorption_equilibrium
from adsorb.errors import InputError, ModelWarning
from adsorb.isotherms import AdsorptionModel, isosteric_heat
from adsorb.partition.hindered import closed_form_reliable
from adsorb.standard_states import standard_thermo

KB = C.kB_eV
EPS = np.finfo(float).eps
#: relative temperature step of the central differences (see _fd_tolerance)
DELTA = 1e-4


@contextmanager
def _quiet():
    """Silence ModelWarning only (validity notes of the models); any other warning still fails."""
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ModelWarning)
        yield


def _log_uniform(lo, hi):
    return st.floats(math.log(lo), math.log(hi)).map(math.exp)


temperatures = _log_uniform(1.0, 5000.0)            # K
pressures = _log_uniform(1e-3, 1e8)                 # Pa
wavenumbers = _log_uniform(1.0, 5000.0)             # cm^-1
barriers = st.one_of(st.just(0.0), _log_uniform(1e-4, 3.0))   # eV
HEAVY = ("B", "C", "N", "O", "F", "Ne", "Si", "P", "S", "Cl", "Ar", "Br")


def _fd_tolerance(values, h, scale):
    """Tolerance of a central difference (f(T+h) - f(T-h))/2h compared with f'(T).

    Truncation: the error is h^2 f'''/6 = DELTA^2 T^2 f'''/6. For f = G, T^2 |G'''| = T^2 |S''| =
    |T dCv/dT - Cv|, and for f = H it is T^2 |Cv''|: 5/2 k for the translation's ln T terms and at
    most 1.0 and 1.09 k per harmonic mode over all x = hcν/kT (Einstein functions, evaluated for
    this test), so the error stays near 1e-9 k per motion. We allow 1e-6 of ``scale`` (|S| + Cp +
    k per motion), a margin of several hundred. Rounding: each f carries ~eps |f|, so the
    difference quotient carries ~eps max|f| / h; we allow 8 eps max|f| / h.
    """
    return 1e-6 * scale + 8 * EPS * np.max(np.abs(values)) / h


def _three(t):
    """T(1 - δ), T, T(1 + δ): one call of .thermo per difference, so solver bases are shared."""
    return t * np.array([1.0 - DELTA, 1.0, 1.0 + DELTA])


def _thermal_wavelength_A(mass_amu, t):
    """de Broglie wavelength h / sqrt(2π m k T) in Å (McQuarrie 1976, ch. 5)."""
    return C.h / np.sqrt(2 * C.pi * mass_amu * C.amu * C.k_B * t) / C.angstrom


# ------------------------------------------------------------------ strategies: gas molecules

@st.composite
def gas_molecules(draw):
    """A random valid GasMolecule: an atom, a linear or a non-linear molecule of 1-4 heavy atoms."""
    shape = draw(st.sampled_from(["monatomic", "linear", "nonlinear"]))
    n = {"monatomic": 1, "linear": draw(st.integers(2, 4)), "nonlinear": draw(st.integers(3, 4))}[shape]
    symbols = draw(st.lists(st.sampled_from(HEAVY), min_size=n, max_size=n))
    bond = st.floats(0.9, 2.5)                      # Å
    if shape == "monatomic":
        positions = [[0.0, 0.0, 0.0]]
    elif shape == "linear":
        z = np.cumsum([0.0] + draw(st.lists(bond, min_size=n - 1, max_size=n - 1)))
        positions = [[0.0, 0.0, float(v)] for v in z]
    else:
        # internal coordinates: a bent first three atoms (angle 60-150°) make it non-linear
        d1, d2 = draw(bond), draw(bond)
        angle = math.radians(draw(st.floats(60.0, 150.0)))
        p1 = np.array([d1, 0.0, 0.0])
        positions = [np.zeros(3), p1, p1 + d2 * np.array([-math.cos(angle), math.sin(angle), 0.0])]
        if n == 4:
            polar, azim = draw(st.floats(0.3, 2.8)), draw(st.floats(0.0, 2 * math.pi))
            u = np.array([math.sin(polar) * math.cos(azim), math.sin(polar) * math.sin(azim), math.cos(polar)])
            positions.append(positions[2] + draw(bond) * u)
    positions = np.array(positions, dtype=float)
    gaps = np.linalg.norm(positions[:, None] - positions[None], axis=-1)[np.triu_indices(n, 1)]
    assume(n == 1 or gaps.min() >= 0.8)           # the fourth atom may land on the first two
    atoms = Atoms(symbols, positions=positions)
    n_modes = {"monatomic": 0, "linear": 3 * n - 5, "nonlinear": 3 * n - 6}[shape]
    kwargs = dict(energy=draw(st.floats(-10.0, 10.0)), multiplicity=draw(st.integers(1, 3)))
    if draw(st.booleans()):
        kwargs["electronic_levels"] = draw(st.lists(st.tuples(st.integers(1, 4), _log_uniform(10.0, 2e4)),
                                                    min_size=1, max_size=2))
    if shape == "linear" and draw(st.booleans()):
        # given B; above 5 cm^-1 the 'auto' rotor sums the rotational levels explicitly
        kwargs["rotational_constants"] = draw(_log_uniform(0.05, 60.0))
    freqs = draw(st.lists(wavenumbers, min_size=n_modes, max_size=n_modes))
    try:
        return GasMolecule(atoms, freqs, **kwargs)
    except InputError as err:
        # a near-symmetric geometry (e.g. a homonuclear triangle with sides 2.26, 2.22, 2.17 Å) whose
        # rotations at the default 0.05 Å tolerance do not close into a group is refused on purpose
        # (docs/methods-geometry.md, "Closure"): not a species of this strategy
        if "do not form a group" not in str(err):
            raise
        reject()


# ------------------------------------------------------------------ strategies: adsorbates

@st.composite
def adsorbates(draw, models=("harmonic", "lattice-gas", "2d-gas", "hindered")):
    """A random valid Adsorbate of 1-4 atoms; mass and inertia given or from an ase.Atoms structure."""
    model = draw(st.sampled_from(models))
    n = draw(st.integers(1, 4))
    freqs = draw(st.lists(wavenumbers, min_size=3 * n, max_size=3 * n))
    p = {}
    if model in ("harmonic", "lattice-gas"):
        p["low_frequency"] = draw(st.sampled_from(["none", "floor", "qrrho"]))
        if p["low_frequency"] != "none":
            p["frequency_floor"] = draw(_log_uniform(10.0, 300.0))
        return Adsorbate(freqs, draw(st.floats(-10.0, 10.0)), model, **p)
    exact = model == "hindered" and draw(st.integers(0, 3)) == 0     # the exact solver in 1 of 4
    # the exact solver's basis grows with m T_max and the barrier: keep its cost near 0.1 s
    top_mass, top_barrier = (60.0, 1.0) if exact else (300.0, 3.0)
    atoms = None
    if draw(st.booleans()):
        symbols = draw(st.lists(st.sampled_from(HEAVY), min_size=n, max_size=n))
        xy = draw(st.lists(st.tuples(st.floats(-2.0, 2.0), st.floats(-2.0, 2.0), st.floats(1.0, 3.0)),
                           min_size=n, max_size=n, unique=True))
        # the adsorbate alone in a slab-like cell (normal along a3, vacuum above)
        atoms = Atoms(symbols, positions=xy, cell=[12.0, 12.0, 20.0], pbc=[True, True, False])
        assume(atoms.get_masses().sum() <= top_mass)
        p["indices"] = list(range(n))
    else:
        p["mass"] = draw(_log_uniform(1.0, top_mass))
    if draw(st.booleans()):
        p["site_spacing"] = draw(st.floats(1.5, 5.0))
    else:
        p["site_area"] = draw(st.floats(1.5**2, 5.0**2))
    if model == "hindered":
        p["solver"] = "exact" if exact else "closed-form"
        p["translation_barrier"] = min(draw(barriers), top_barrier)
        if n > 1:
            p.update(rotation_barrier=min(draw(barriers), top_barrier), rotation_minima=draw(st.integers(1, 6)),
                     symmetry_number=draw(st.integers(1, 3)))
            if atoms is None:
                p["inertia"] = draw(_log_uniform(0.5, 200.0))
            else:
                from adsorb.geometry import inertia_about_normal

                assume(inertia_about_normal(atoms, p["indices"]) > 0.5)
    return Adsorbate(freqs, draw(st.floats(-10.0, 10.0)), model, atoms=atoms, **p)


def _hindered_reliable(ads, t):
    """The closed-form accuracy rule of the hindered model (True for every other model or solver)."""
    c = ads.choices()
    if ads.model != "hindered" or c["solver"] == "exact":
        return np.ones(np.shape(t), dtype=bool)
    rotor = {}
    if "rotation_barrier_eV" in c:
        rotor = dict(inertia_amu_A2=c["inertia_amu_A2"], rotation_barrier_eV=c["rotation_barrier_eV"],
                     n_minima=c["rotation_minima"])
    return closed_form_reliable(t, mass_amu=c["mass_amu"], barrier_eV=c["translation_barrier_eV"],
                                spacing_A=c["site_spacing_A"], **rotor)


# ============================================================================ gas molecules

@settings(max_examples=80)
@given(gas=gas_molecules(), t=temperatures, p=pressures)
def test_gas_identities(gas, t, p):
    # thermodynamic identities at fixed p: S = -(dG/dT)_p, Cp = (dH/dT)_p, G = H - TS
    tt = _three(t)
    with _quiet():
        tab = gas.thermo(tt, p)
    h = DELTA * t
    scale = abs(tab.entropy[1]) + tab.heat_capacity[1] + KB
    assert abs(tab.gibbs[1] - (tab.enthalpy[1] - t * tab.entropy[1])) <= 4 * EPS * (
        abs(tab.enthalpy[1]) + abs(t * tab.entropy[1]))
    s_fd = -(tab.gibbs[2] - tab.gibbs[0]) / (2 * h)
    cp_fd = (tab.enthalpy[2] - tab.enthalpy[0]) / (2 * h)
    assert abs(s_fd - tab.entropy[1]) <= _fd_tolerance(tab.gibbs, h, scale)
    assert abs(cp_fd - tab.heat_capacity[1]) <= _fd_tolerance(tab.enthalpy, h, scale)
    # G = E + ZPE - kT ln Q with Q the product of the motions' q (McQuarrie 1976, eq. 5-20, q/N in q_trans)
    ln_q = sum(c.ln_q for _, c in gas.motions(tt, p))
    g_q = gas.energy + gas.zpe - KB * tt * ln_q
    assert_allclose(tab.gibbs, g_q, rtol=0, atol=64 * EPS * (abs(gas.energy) + gas.zpe + np.max(np.abs(KB * tt * ln_q))))


@settings(max_examples=50)
@given(gas=gas_molecules(), t=temperatures, p=pressures, p0=pressures)
def test_gas_pressure_dependence(gas, t, p, p0):
    # ideal gas (common practice): S(p) - S(p0) = -k ln(p/p0), G(p) - G(p0) = kT ln(p/p0); H and Cp do not depend on p
    with _quiet():
        a, b = gas.thermo(t, p), gas.thermo(t, p0)
    ln_ratio = math.log(p / p0)
    assert_allclose(a.entropy - b.entropy, -KB * ln_ratio, rtol=1e-12, atol=16 * EPS * abs(b.entropy))
    assert_allclose(a.gibbs - b.gibbs, KB * t * ln_ratio, rtol=1e-12, atol=16 * EPS * (abs(b.gibbs) + abs(a.gibbs)))
    assert_array_equal(a.enthalpy, b.enthalpy)
    assert_array_equal(a.heat_capacity, b.heat_capacity)


@settings(max_examples=100)
@given(gas=gas_molecules(), t1=temperatures, ratio=_log_uniform(1.001, 100.0), p=pressures)
def test_gas_signs_and_monotonicity(gas, t1, ratio, p):
    t = np.array([t1, t1 * ratio])
    with _quiet():
        tab = gas.thermo(t, p)
    # Cp = Cv + k >= 5/2 k: 3/2 k of translation, k of pV; rotations, vibrations and electronic
    # levels add Cv >= 0 (a variance of the energy, or a classical constant) (McQuarrie 1976, ch. 5-8)
    assert np.all(tab.heat_capacity >= 2.5 * KB * (1 - 1e-12))
    # so S and H rise at least as fast as for the 3D translation + pV alone: dS = Cp dT/T, dH = Cp dT
    tol = 16 * EPS * np.max(np.abs(tab.entropy))
    assert tab.entropy[1] - tab.entropy[0] >= 2.5 * KB * math.log(ratio) * (1 - 1e-9) - tol
    assert tab.enthalpy[1] - tab.enthalpy[0] >= 2.5 * KB * (t[1] - t[0]) * (1 - 1e-9) - 16 * EPS * np.max(np.abs(tab.enthalpy))
    # S >= 0 only where the gas is classical (common practice): the Sackur-Tetrode and the classical-rotor
    # entropies turn negative when kT/(p Λ^3) < e^-5/2 or T well below σθ_rot. Where q_trans = kT/(p Λ^3)
    # >= 1 and T >= σ θ_rot,max (so q_rot >= 1), every motion has S >= 0 and the translation
    # S_trans = k (ln q_trans + 5/2) >= 5/2 k (Sackur-Tetrode, McQuarrie 1976 eq. 5-20; computed here)
    lam = _thermal_wavelength_A(gas.mass_amu, t) * C.angstrom
    ln_q_trans = np.log(C.k_B * t / (p * lam**3))
    classical = ln_q_trans >= 0.0
    if gas.rotational_constants_cm.size:
        classical &= t >= gas.symmetry_number * gas.rotational_constants_cm.max() * C.invcm_K
    s_trans = KB * (ln_q_trans + 2.5)
    assert np.all(tab.entropy[classical] >= s_trans[classical] - 1e-12 * KB - tol)


# ============================================================================ adsorbates

@settings(max_examples=100)
@given(ads=adsorbates(), t=temperatures)
def test_adsorbate_identities(ads, t):
    # thermodynamic identities of every model: G = H - TS, Cp = dH/dT, S = -dG/dT. Not S = -dG/dT for
    # quasi-RRHO (low_frequency='qrrho'): its entropy interpolates and is not the derivative of its G
    # (Grimme 2012; documented in docs/methods-adsorbates.md, "Consistency, honestly").
    with _quiet():
        tab = ads.thermo(_three(t))
    h = DELTA * t
    n_motions = ads.frequencies.size
    scale = abs(tab.entropy[1]) + tab.heat_capacity[1] + n_motions * KB
    assert abs(tab.gibbs[1] - (tab.enthalpy[1] - t * tab.entropy[1])) <= 4 * EPS * (
        abs(tab.enthalpy[1]) + abs(t * tab.entropy[1]))
    cp_fd = (tab.enthalpy[2] - tab.enthalpy[0]) / (2 * h)
    assert abs(cp_fd - tab.heat_capacity[1]) <= _fd_tolerance(tab.enthalpy, h, scale)
    if ads.low_frequency != "qrrho":
        s_fd = -(tab.gibbs[2] - tab.gibbs[0]) / (2 * h)
        assert abs(s_fd - tab.entropy[1]) <= _fd_tolerance(tab.gibbs, h, scale)


@settings(max_examples=150)
@given(ads=adsorbates(), data=st.data(), ratio=_log_uniform(1.001, 100.0))
def test_adsorbate_signs_and_monotonicity(ads, data, ratio):
    # half of the draws start where the softest harmonic mode is frozen (T < hcν_min/5k), the third-law
    # end where S -> 0 and a wrong constant in ln q shows
    frozen = max(1.0, 0.2 * float(np.min(ads.frequencies)) * C.invcm_K)
    t1 = data.draw(st.one_of(temperatures, _log_uniform(1.0, max(frozen, 1.0 + 1e-9))), label="t1")
    grid = t1 * np.geomspace(1.0, ratio, 24)
    with _quiet():
        tab = ads.thermo(grid)
    s, cp, hh = tab.entropy, tab.heat_capacity, tab.enthalpy
    tol = 1e-12 * KB + 16 * EPS * np.max(np.abs(s))
    # Cv >= 0 (energy variance; stability), hence S and H non-decreasing in T. Not for the hindered
    # closed form outside its accuracy rule: there it can give Cv < 0 (known defect, docs/methods-adsorbates.md)
    ok = _hindered_reliable(ads, grid)
    assert np.all(cp[ok] >= -tol)
    if np.all(ok):
        assert np.all(np.diff(s) >= -tol)
        assert np.all(np.diff(hh) >= -16 * EPS * np.max(np.abs(hh)))
    if ads.model == "2d-gas":
        assert np.all(cp >= KB * (1 - 1e-12))          # the 2D translation alone gives Cv = k
    # S >= 0:
    # * localized models: a sum of quantum harmonic oscillators, S >= 0 at every T; not with quasi-RRHO,
    #   whose free-rotor entropy can be slightly negative for stiff modes at low T (docs/methods-adsorbates.md);
    # * mobile models: the entropy is per site (no configurational term) and is >= 0 only where the
    #   particle is classical on the scale of a site (thermal wavelength Λ <= b; below, q per site < 1),
    #   and for a rotor only with σ = 1 (the conventional 1/σ makes S -> k ln(1/σ) as T -> 0).
    if ads.model in ("harmonic", "lattice-gas"):
        if ads.low_frequency != "qrrho":
            assert np.all(s >= -tol)
        return
    c = ads.choices()
    spacing = c["site_spacing_A"] if "site_spacing_A" in c else math.sqrt(c["site_area_A2"])
    classical = _thermal_wavelength_A(c["mass_amu"], grid) <= spacing
    if ads.model == "2d-gas":
        # S >= S_2D = k [ln(b^2/Λ^2) + 1] >= k where Λ <= b (McQuarrie 1976, ch. 5, 2D analogue; computed
        # here), the other modes being harmonic (S >= 0)
        s_2d = KB * (np.log(spacing**2 / _thermal_wavelength_A(c["mass_amu"], grid) ** 2) + 1.0)
        assert np.all(s[classical] >= s_2d[classical] - tol)
        return
    if c.get("symmetry_number", 1) > 1:
        return
    assert np.all(s[classical & ok] >= -tol)


@st.composite
def hindered_inputs(draw):
    """Random parameters of a hindered adsorbate with a rotor (closed form), and its modes."""
    n = draw(st.integers(2, 4))
    return dict(freqs=draw(st.lists(wavenumbers, min_size=3 * n, max_size=3 * n)),
                mass=draw(_log_uniform(1.0, 300.0)), b=draw(st.floats(1.5, 5.0)),
                inertia=draw(_log_uniform(0.5, 200.0)), n_min=draw(st.integers(1, 6)),
                sigma=draw(st.integers(1, 3)))


def _translator_x(mass_amu, barrier_eV, b_A, t):
    """hν/kT of the frustrated translation, ν = sqrt(W/(2 m b^2)) (curvature of the cosine well)."""
    nu = math.sqrt(barrier_eV * C.eV / (2 * mass_amu * C.amu * (b_A * C.angstrom) ** 2))
    return C.h * nu / (C.k_B * t)


def _rotor_x(inertia_amu_A2, barrier_eV, n_min, t):
    """hν/kT of the rotation about the normal, ν = (n/2π) sqrt(W/(2I))."""
    nu = n_min / (2 * C.pi) * math.sqrt(barrier_eV * C.eV / (2 * inertia_amu_A2 * C.amu_A2))
    return C.h * nu / (C.k_B * t)


@settings(max_examples=80)
@given(inp=hindered_inputs(), t=temperatures, f_t=st.floats(0.0, 1.0), f_r=st.floats(0.0, 1.0))
def test_hindered_tends_to_2d_gas_and_free_rotor(inp, t, f_t, f_r):
    # Sprowl, Campbell, Arnadottir 2016: as W -> 0 the hindered translator becomes the 2D ideal gas per
    # site (area b^2) and the hindered rotor the free rotor. Barriers are drawn so that z = W/2kT <= 0.2
    # and x = hν/kT <= 0.3, where the approach is, per motion,
    #   S - S_free = x^2/24 - x^4/960 - z^2/4 + 3 z^4/64 + ...
    # (x terms: the quantum/classical oscillator ratio, Bernoulli series of x/(e^x - 1), A&S 23.1.1;
    # z terms: e^-z I0(z) and I1/I0 from the ascending series, A&S 9.6.10); we allow x^4 + z^4 for the rest.
    kt = KB * t
    cap_t = min(0.4 * kt, (0.3 / _translator_x(inp["mass"], 1.0, inp["b"], t)) ** 2)
    cap_r = min(0.4 * kt, (0.3 / _rotor_x(inp["inertia"], 1.0, inp["n_min"], t)) ** 2)
    w_t, w_r = f_t * cap_t, f_r * cap_r
    freqs = sorted(inp["freqs"])
    common = dict(mass=inp["mass"], site_spacing=inp["b"])
    with _quiet():
        hind = Adsorbate(freqs, 0.0, "hindered", translation_barrier=w_t, rotation_barrier=w_r,
                         rotation_minima=inp["n_min"], inertia=inp["inertia"], symmetry_number=inp["sigma"],
                         soft_modes=[0, 1, 2], **common).thermo(t)
        # the same adsorbate as a 2D gas: the two translations replaced, the rotation (mode 2) left out
        gas2d = Adsorbate(freqs[:2] + freqs[3:], 0.0, "2d-gas", soft_modes=[0, 1], **common).thermo(t)
    # classical free rotor, q = sqrt(8π^3 I kT)/(σ h), S = k(ln q + 1/2) (Pitzer & Gwinn 1942)
    q_fr = math.sqrt(8 * C.pi**3 * inp["inertia"] * C.amu_A2 * C.k_B * t) / (inp["sigma"] * C.h)
    s_ref = gas2d.entropy + KB * (math.log(q_fr) + 0.5)
    x_t, z_t = _translator_x(inp["mass"], w_t, inp["b"], t), w_t / (2 * kt)
    x_r, z_r = _rotor_x(inp["inertia"], w_r, inp["n_min"], t), w_r / (2 * kt)
    lead = 2 * (x_t**2 / 24 - z_t**2 / 4) + (x_r**2 / 24 - z_r**2 / 4)
    rest = 2 * (x_t**4 + z_t**4) + x_r**4 + z_r**4
    # rounding of S/k: its terms (ln q, U/kT of each motion) are below ~100 in size
    rounding = 1e-12 + 64 * EPS * abs(s_ref) / KB
    assert abs((hind.entropy - s_ref) / KB - lead) <= rest + rounding
    if w_t == 0 and w_r == 0:
        # exact at zero barriers, every function (docs/methods-adsorbates.md, "Barrier zero")
        h_ref = gas2d.enthalpy + 0.5 * kt
        assert_allclose(hind.enthalpy, h_ref, rtol=0, atol=64 * EPS * abs(h_ref))
        assert_allclose(hind.heat_capacity, gas2d.heat_capacity + 0.5 * KB, rtol=1e-13)


@settings(max_examples=80)
@given(inp=hindered_inputs(), t=temperatures, ratio_t=_log_uniform(25.0, 1e4), ratio_r=_log_uniform(25.0, 1e4))
def test_hindered_tends_to_harmonic_for_deep_wells(inp, t, ratio_t, ratio_r):
    # Sprowl, Campbell, Arnadottir 2016: for W >> kT each hindered motion becomes a harmonic oscillator at
    # ν = sqrt(W/2mb^2) (translation) or (n/2π) sqrt(W/2I) (rotation), the rotor with n wells per turn
    # (+ k ln(n/σ)). The closed form is q_cl times the quantum/classical oscillator ratio, so its excess
    # over the oscillator is the classical cosine-well excess, from e^-z I0(z) sqrt(2πz) = 1 + 1/8z + 9/128z^2
    # and I1/I0 = 1 - 1/2z - 1/8z^2 - ... (A&S 9.7.1): per motion S - S_HO = k [1/(4z) + 3/(16z^2) + O(z^-3)].
    kt = KB * t
    w_t, w_r = ratio_t * kt, ratio_r * kt
    assume(max(w_t, w_r) <= 10.0)                   # barriers up to 10 eV
    freqs = sorted(inp["freqs"])
    with _quiet():
        hind = Adsorbate(freqs, 0.0, "hindered", mass=inp["mass"], site_spacing=inp["b"], translation_barrier=w_t,
                         rotation_barrier=w_r, rotation_minima=inp["n_min"], inertia=inp["inertia"],
                         symmetry_number=inp["sigma"], soft_modes=[0, 1, 2]).thermo(t)
    to_cm = C.k_B * t / (C.h * C.c * 100.0)         # hν/kT -> ν in cm^-1
    nu_t = _translator_x(inp["mass"], w_t, inp["b"], t) * to_cm
    nu_r = _rotor_x(inp["inertia"], w_r, inp["n_min"], t) * to_cm
    with _quiet():
        ho = Adsorbate([nu_t, nu_t, nu_r] + freqs[3:], 0.0, "harmonic").thermo(t)
    z_t, z_r = ratio_t / 2, ratio_r / 2
    lead = 2 * (1 / (4 * z_t) + 3 / (16 * z_t**2)) + 1 / (4 * z_r) + 3 / (16 * z_r**2)
    excess = (hind.entropy - ho.entropy) / KB - math.log(inp["n_min"] / inp["sigma"])
    rounding = 1e-12 + 64 * EPS * abs(ho.entropy) / KB     # as in the test above
    assert abs(excess - lead) <= 2 / z_t**3 + 1 / z_r**3 + rounding


@settings(max_examples=40)
@given(freqs=st.lists(wavenumbers, min_size=3, max_size=12), low=st.sampled_from(["none", "floor", "qrrho"]),
       t=st.lists(temperatures, min_size=1, max_size=4), gas=gas_molecules(), de=st.floats(-3.0, 1.0),
       area=st.floats(2.0, 25.0))
def test_lattice_gas_is_the_harmonic_partition_function(freqs, low, t, gas, de, area):
    # the ideal lattice gas localizes every mode: the partition function of the harmonic model
    # (Campbell, Sprowl, Arnadottir 2016); both are localized, so equilibria and standard states agree too
    t = np.array(t)
    slab = -100.0
    energy = slab + gas.energy + de
    with _quiet():
        a = Adsorbate(freqs, energy, "harmonic", low_frequency=low).thermo(t)
        b = Adsorbate(freqs, energy, "lattice-gas", low_frequency=low).thermo(t)
        g = gas.thermo(t)
    for field in ("gibbs", "enthalpy", "entropy", "heat_capacity", "zpe"):
        assert_array_equal(getattr(a, field), getattr(b, field))
    assert a.choices["mobile"] is False and b.choices["mobile"] is False
    with _quiet():                                  # K is capped (ModelWarning) at low T for strong binding
        ea, eb = adsorption_equilibrium(a, g, slab), adsorption_equilibrium(b, g, slab)
    assert_array_equal(ea.delta_gibbs_standard, eb.delta_gibbs_standard)
    assert_array_equal(ea.ln_equilibrium_constant, eb.ln_equilibrium_constant)
    # the chemical potential at coverage θ: localized G + kT ln[θ/(1-θ)], mobile G + kT ln θ
    # (Campbell, Sprowl, Arnadottir 2016). At θ° = 1/2 (Savara 2013) the localized G° is the per-site G;
    # at the 2D state of Savara the two conventions differ by -kT ln(1 - θ°), which vanishes as θ° -> 0
    half = standard_thermo(b, "lattice-half")
    assert_array_equal(half.gibbs, b.gibbs)
    loc = standard_thermo(b, "savara-2d", site_area_A2=area)
    mob = standard_thermo(b, "savara-2d", mobile=True, site_area_A2=area)
    theta0 = loc.coverage
    assert np.all((0 < theta0) & (theta0 < 1))
    assert_allclose(loc.gibbs - mob.gibbs, -KB * t * np.log1p(-theta0), rtol=1e-9,
                    atol=64 * EPS * np.max(np.abs(b.gibbs)))


# ============================================================================ equilibria

@st.composite
def equilibria_inputs(draw):
    """A random gas, an adsorbate made of it (molecular) or of one of its atoms (dissociative X2)."""
    dissociative = draw(st.booleans())
    if dissociative:
        x = draw(st.sampled_from(HEAVY))
        gas = GasMolecule(Atoms([x, x], positions=[[0, 0, 0], [0, 0, draw(st.floats(0.9, 2.5))]]),
                          [draw(wavenumbers)], energy=draw(st.floats(-10.0, 10.0)))
        n_atoms, mass = 1, float(Atoms(x).get_masses().sum())
    else:
        gas = draw(gas_molecules())
        n_atoms, mass = gas.n_atoms, gas.mass_amu
    model = draw(st.sampled_from(["harmonic", "lattice-gas", "2d-gas", "hindered"]))
    freqs = draw(st.lists(wavenumbers, min_size=3 * n_atoms, max_size=3 * n_atoms))
    p = {}
    if model != "harmonic" and model != "lattice-gas":
        p.update(mass=mass, site_spacing=draw(st.floats(1.5, 5.0)))
    if model == "hindered":
        p["translation_barrier"] = draw(barriers)
        if n_atoms > 1:
            p.update(rotation_barrier=draw(barriers), rotation_minima=draw(st.integers(1, 6)),
                     inertia=draw(_log_uniform(0.5, 200.0)))
    slab = draw(st.floats(-300.0, -50.0))
    n = 2 if dissociative else 1
    # E(A*) per fragment: slab + share of the gas energy + invented binding energy dE/n
    energy = slab + gas.energy / n + draw(st.floats(-3.0, 1.0)) / n
    return gas, Adsorbate(freqs, energy, model, **p), slab, dissociative


@settings(max_examples=80)
@given(inp=equilibria_inputs(), t=temperatures)
def test_van_t_hoff_and_standard_states(inp, t):
    gas, ads, slab, diss = inp
    n = 2 if diss else 1
    # symmetric steps in u = 1/T: T/(1 + δ), T, T/(1 - δ)
    tt = t / np.array([1.0 + DELTA, 1.0, 1.0 - DELTA])
    with _quiet():                                  # K itself is capped (ModelWarning) where ln K > 709
        a, g = ads.thermo(tt), gas.thermo(tt)
        eq = adsorption_equilibrium(a, g, slab, dissociative=diss)
    # van 't Hoff (thermodynamic identity): d ln K / d(1/T) = -dH/k
    ln_k = eq.ln_equilibrium_constant
    u = 1.0 / tt
    dh = eq.terms.delta_enthalpy[1]
    fd = -KB * (ln_k[2] - ln_k[0]) / (u[2] - u[0])
    sizes = abs(slab) + abs(gas.energy) + np.max(np.abs(g.gibbs)) + np.max(np.abs(a.gibbs))
    # truncation as in _fd_tolerance (scale: |dH| + kT per motion); rounding: eps * sizes / kT in ln K,
    # divided by du = 2δ/T and multiplied by k
    n_motions = ads.frequencies.size + gas.frequencies.size + 6      # + 3D translation and rotation
    tol = 1e-6 * (abs(dh) + n_motions * KB * t) + 8 * EPS * sizes / (2 * DELTA)
    assert abs(fd - dh) <= tol
    # K is exp(ln K) wherever it is a normal float
    normal = (ln_k < 700) & (ln_k > -700)
    assert_allclose(np.log(eq.equilibrium_constant[normal]), ln_k[normal], rtol=0,
                    atol=8 * EPS * (1 + np.max(np.abs(ln_k))))
    # the parts add up: dG = dE + dZPE + thermal - T dS (definitions)
    parts = eq.terms.delta_energy + eq.terms.delta_zpe + eq.terms.delta_thermal + eq.terms.minus_t_delta_s
    assert_allclose(parts, eq.terms.delta_gibbs, rtol=0, atol=64 * EPS * sizes)
    # K does not depend on the standard state; ln K° = -dG°/kT with dG° = dG + n kT ln[θ°/(1-θ°)]
    # (localized) or dG + n kT ln θ° (mobile) (Campbell, Sprowl, Arnadottir 2016; Savara 2013)
    states = ["lattice-half"] if not eq.mobile else ["savara-2d", "campbell-2d"]
    for state in states:
        with _quiet():
            other = adsorption_equilibrium(a, g, slab, dissociative=diss, standard_state=state)
        assert_array_equal(other.ln_equilibrium_constant, eq.ln_equilibrium_constant)
        th0 = other.standard_coverage
        ln_term = np.log(th0) if eq.mobile else np.log(th0) - np.log1p(-th0)
        assert_allclose(other.ln_standard_constant, ln_k + math.log(C.P_STANDARD) - n * ln_term,
                        rtol=1e-12, atol=64 * EPS * sizes / (KB * t))


# ============================================================================ coverages

@st.composite
def site_sets(draw, interacting):
    """Random competitive sets: 1-5 species, molecular or dissociative, 1 or 2 sites each, 1-2 site kinds.

    K_i(T) = exp(-(dH_i - T dS_i)/kT)/p° with invented dH_i (scaled so that |ln K| stays below
    ~600: K must be a finite float) and dS_i; pressures 1e-3-1e8 Pa; for the mean-field sets a
    random symmetric ε with |ε_ij| <= min(0.3 eV, 50 kT) (the documented solver range is |ε|/kT < ~100).
    """
    n = draw(st.integers(1, 5))
    t = draw(temperatures)
    kt = KB * t
    lst = lambda s: draw(st.lists(s, min_size=n, max_size=n))  # noqa: E731
    dh = np.array(lst(st.floats(-1.0, 0.25))) * min(2.0, 500 * kt)
    ds = np.array(lst(st.floats(-3e-3, 0.0)))
    K = np.exp(-(dh - t * ds) / kt) / C.P_STANDARD
    out = dict(K=K, p=np.array(lst(pressures)), t=t, dh=dh, ds=ds, diss=lst(st.booleans()),
               sites=np.array(lst(st.integers(1, 2))), kinds=lst(st.sampled_from(["a", "b"])), eps=None)
    if interacting:
        u = np.array(draw(st.lists(st.floats(-0.5, 1.0), min_size=n * n, max_size=n * n))).reshape(n, n)
        out["eps"] = (u + u.T) / 2 * min(0.3, 50 * kt)
    return out


def _solve(s, p=None):
    with _quiet():
        return site_coverages(s["K"], s["p"] if p is None else p, s["diss"], s["eps"],
                              s["t"] if s["eps"] is not None else None,
                              sites_per_species=s["sites"], site_kind=s["kinds"], warn_multiple=False)


@settings(max_examples=150)
@given(s=st.one_of(site_sets(False), site_sets(True)))
def test_coverages_bounded_and_site_balance(s):
    # every coverage in [0, 1]; per site kind θ_* + Σ n_i θ_i = 1 (Langmuir 1918 site balance), so Σ θ_i <= 1
    res = _solve(s)
    th = res.coverage
    assert np.all((th >= 0) & (th <= 1))
    kinds = list(res.site_kinds)
    for k, label in enumerate(kinds):
        members = [i for i, lab in enumerate(s["kinds"]) if lab == label]
        occupied = float(np.sum(s["sites"][members] * th[members]))
        assert th[members].sum() <= occupied <= 1.0 + 1e-12
        empty = res.empty_by_kind[k]
        assert 0.0 <= empty <= 1.0
        assert abs(empty + occupied - 1.0) <= 1e-12
    assert res.residual <= 1e-12


@settings(max_examples=100)
@given(s=site_sets(False), which=st.integers(0, 4), factor=_log_uniform(1.01, 1e3))
def test_ideal_coverage_monotone_in_own_pressure(s, which, factor):
    # ideal (non-interacting) site balance: raising p_j raises θ_j, lowers the competitors on its site
    # kind and leaves the other kinds unchanged (Langmuir 1918)
    j = which % len(s["K"])
    p2 = s["p"].copy()
    p2[j] *= factor
    a, b = _solve(s).coverage, _solve(s, p2).coverage
    same = [i for i, lab in enumerate(s["kinds"]) if lab == s["kinds"][j]]
    other = [i for i in range(len(s["K"])) if i not in same]
    # up to the solver's accuracy: coverages to 1e-12 (its site-balance target; near saturation
    # θ = c θ_*^n carries the rounding of ln θ_*, e.g. 0.5 ± 6e-15 for a two-site species)
    assert b[j] >= a[j] - 1e-12
    empty = 1.0 - np.sum(s["sites"][same] * a[same])
    if a[j] > 1e-200 and empty > 1e-6:             # away from underflow and saturation: strictly
        assert b[j] > a[j]
    assert all(b[i] <= a[i] + 1e-12 for i in same if i != j)
    assert_array_equal(b[other], a[other])


@settings(max_examples=80)
@given(s=st.one_of(site_sets(False), site_sets(True)), fill=st.lists(st.floats(0.05, 1.0), min_size=5, max_size=5),
       free=st.floats(0.05, 0.9))
def test_isosteric_heat_of_random_models(s, fill, free):
    # Clausius-Clapeyron at constant coverage (Masel 1996, from memory): for K = exp(-(dH - T dS)/kT)/p°,
    # q_st,i = -dH_i - m_i Σ_j ε_ij θ_j, m_i = 1 (molecular) or 2 (per A2, dissociative), for any
    # number of sites per species (ln p_i = m_i[ln θ_i - n_i ln θ_* + Σ ε θ/kT] - ln K_i)
    n = len(s["K"])
    theta = np.zeros(n)
    for label in set(s["kinds"]):                 # coverages leaving a fraction `free` of each kind empty
        members = [i for i in range(n) if s["kinds"][i] == label]
        w = np.array([fill[i] for i in members])
        theta[members] = (1 - free) * w / w.sum() / s["sites"][members]
    dh, ds, t = s["dh"], s["ds"], s["t"]
    model = AdsorptionModel.from_gibbs([f"s{i}" for i in range(n)],
                                       [lambda T, h=h, d=d: h - T * d for h, d in zip(dh, ds)],
                                       dissociative=s["diss"], interactions=s["eps"],
                                       sites_per_species=tuple(int(v) for v in s["sites"]), site_kind=s["kinds"])
    q = isosteric_heat(model, theta, t)
    m = np.where(s["diss"], 2.0, 1.0)
    field = np.zeros(n) if s["eps"] is None else s["eps"] @ theta
    expected = -dh - m * field
    # five-point difference, step 1e-3 T: truncation O(h^4) ~ 1e-12; rounding ~ eps |ln p| / (h/T) in
    # q / kT, |ln p| <= |ln K| + |ln θ terms| + |ε|/kT
    ln_scale = np.abs(np.log(s["K"])) + 50 + (0 if s["eps"] is None else np.abs(s["eps"]).sum(axis=1) / (KB * t))
    assert np.all(np.abs(q - expected) <= 1e-7 * np.abs(expected) + 1e4 * EPS * ln_scale * KB * t + 1e-12)


# ============================================================================ Peng-Robinson

@st.composite
def pr_fluids(draw):
    """Invented critical constants: Tc 5-700 K, Pc 10-300 bar, ω from -0.4 to 0.7."""
    return CriticalConstants("X", draw(_log_uniform(5.0, 700.0)), draw(_log_uniform(1e6, 3e7)),
                             draw(st.floats(-0.4, 0.7)), "invented")


@settings(max_examples=200)
@given(fluid=pr_fluids(), t=temperatures, p=pressures)
def test_peng_robinson_fugacity_identity(fluid, t, p):
    # ln φ = ∫0^p (Z - 1) dp'/p' at constant T (thermodynamic identity), so d ln φ/d ln p = Z - 1 on a
    # branch; steps ±1e-5 in ln p, skipped where the stable root changes branch between them and near
    # the critical point, where the cubic's triple root makes Z itself uncertain by ~eps^(1/3)
    tr, pr = t / fluid.critical_temperature, p / fluid.critical_pressure
    assume(not (0.9 < tr < 1.1 and 0.3 < pr < 3.0))
    d = 1e-5
    pp = p * np.exp(np.array([-d, 0.0, d]))
    st_ = peng_robinson_pure(fluid, t, pp, warn=False)
    assume(np.all(st_.liquid_like == st_.liquid_like[0]) and np.all(st_.three_roots == st_.three_roots[0]))
    z = st_.z
    # Z is a root of the cubic above B (Peng & Robinson 1976; coefficients written out here): backward
    # error |f(Z)| against the size of its terms, which does not depend on the conditioning of the root
    kappa = 0.37464 + 1.54226 * fluid.acentric_factor - 0.26992 * fluid.acentric_factor**2
    if fluid.acentric_factor > 0.49:
        kappa = 0.379642 + 1.48503 * fluid.acentric_factor - 0.164423 * fluid.acentric_factor**2 \
            + 0.016666 * fluid.acentric_factor**3
    a = 0.45724 * (1 + kappa * (1 - math.sqrt(tr))) ** 2 * (pp / fluid.critical_pressure) / tr**2
    b = 0.07780 * (pp / fluid.critical_pressure) / tr
    terms = np.array([z**3, -(1 - b) * z**2, (a - 3 * b**2 - 2 * b) * z, -(a * b - b**2 - b**3)])
    assert np.all(np.abs(terms.sum(axis=0)) <= 64 * EPS * np.abs(terms).sum(axis=0))
    assert np.all(np.isfinite(z)) and np.all(z > b)
    fd = (st_.ln_phi[2] - st_.ln_phi[0]) / (2 * d)
    assert abs(fd - (z[1] - 1.0)) <= 1e-6 * (1 + abs(z[1] - 1)) + 8 * EPS * np.max(np.abs(st_.ln_phi)) / d
    # a mixture of the same fluid under two names, at any composition, is the pure fluid (one-fluid rules)
    y = 0.3
    mix = peng_robinson_mixture([fluid, CriticalConstants("Y", fluid.critical_temperature, fluid.critical_pressure,
                                                          fluid.acentric_factor)], [y, 1 - y], t, p, warn=False)
    assert_allclose(mix.z, z[1], rtol=1e-10)
    assert_allclose(mix.ln_phi, [st_.ln_phi[1]] * 2, rtol=1e-9, atol=1e-12)


def _pr_real_roots(fluid, t, p):
    """Real roots of the Peng-Robinson cubic in Z (Peng & Robinson 1976), independently of adsorb's
    solver: numpy.roots (LAPACK eigenvalues of the companion matrix), polished by Newton steps."""
    tc, pc = fluid.critical_temperature, fluid.critical_pressure
    kappa = 0.37464 + 1.54226 * fluid.acentric_factor - 0.26992 * fluid.acentric_factor**2
    alpha = (1 + kappa * (1 - math.sqrt(t / tc))) ** 2
    a = 0.45724 * alpha * (p / pc) / (t / tc) ** 2
    b = 0.07780 * (p / pc) / (t / tc)
    coef = [1.0, -(1 - b), a - 3 * b**2 - 2 * b, -(a * b - b**2 - b**3)]
    roots = np.roots(coef)
    out = []
    for z in np.sort(roots[np.abs(roots.imag) <= 1e-6 * np.abs(roots)].real):
        for _ in range(20):
            z -= np.polyval(coef, z) / np.polyval(np.polyder(coef), z)
        out.append(z)
    return np.array(out), b


def test_peng_robinson_small_liquid_root_regression():
    # regressions found by test_peng_robinson_fugacity_identity: with three roots the smallest came from
    # the trigonometric form as a difference of numbers of order one, so at tiny B (low reduced pressure)
    # the liquid root lost its digits (4.5e-7 and 2.7e-4 relative below, up to 4 % elsewhere) and a
    # complex pair could be reported as two real roots. Invented fluids, ω <= 0.49 (1976 κ).
    for fluid, t, p in [(CriticalConstants("X", 5.0, 1e6, 0.125), 1.0, math.exp(-6.703135)),
                        (CriticalConstants("X", 300.0, 5e6, 0.2), 40.0, 1e-3)]:
        state = peng_robinson_pure(fluid, t, p, warn=False)
        roots, b = _pr_real_roots(fluid, t, p)
        assert roots.size == 3 and bool(state.three_roots) and bool(state.liquid_like)
        assert abs(float(state.z) / roots[roots > b][0] - 1) < 1e-13
    # one real root only (the two small ones are a complex pair, 17 % imaginary): not three_roots
    fluid = CriticalConstants("X", 300.0, 5e6, 0.08247375562180762)
    t, p = 0.9150719624000103 * 300.0, 7.257083246579395e-08 * 5e6
    roots, _ = _pr_real_roots(fluid, t, p)
    state = peng_robinson_pure(fluid, t, p, warn=False)
    assert roots.size == 1 and not bool(state.three_roots)
    assert abs(float(state.z) / roots[0] - 1) < 1e-13


def test_mean_field_first_newton_step_is_not_a_rounding_floor_regression():
    # regression found by test_coverages_bounded_and_site_balance (invented set): a two-site dissociative
    # species near saturation beside a nearly empty one that it repels. The first Newton step moved the
    # largest weighted error θ|R| from the empty species to the full one and raised it; the solver took
    # that for its rounding floor and raised ConvergenceError (site-balance residual 1.5e-12 > 1e-12)
    K, p, t = np.array([1.32066664e32, 1.15538065e-12]), np.array([1.0, 1.0]), 123.0390625
    eps = np.array([[0.0, 0.225], [0.225, 0.0]])
    res = site_coverages(K, p, [True, True], eps, t, sites_per_species=[2, 1])
    th, empty = res.coverage, res.empty
    # the equations of the model (docs/methods-coverages.md §2), written out: θ_i = (K_i p_i)^1/2 θ_*^n_i
    # exp(-Σ_j ε_ij θ_j / kT) and θ_* + 2 θ_1 + θ_2 = 1
    expected = np.sqrt(K * p) * empty ** np.array([2, 1]) * np.exp(-(eps @ th) / (KB * t))
    assert_allclose(th, expected, rtol=1e-12)
    assert abs(empty + 2 * th[0] + th[1] - 1) <= 1e-14
