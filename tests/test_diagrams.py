"""Free-energy diagrams and the computational hydrogen electrode (adsorb.diagrams).

The species Gibbs energies below are invented numbers (eV), chosen so that
the overall reaction O2 + 2 H2 -> 2 H2O has dG = -4.92 eV, the experimental
value used by Nørskov et al., J. Phys. Chem. B 2004, 108, 17886 (from memory).
Every expected dG is computed by hand in the test from those numbers.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
import scipy.constants as sc

from adsorb.adsorbate import Adsorbate
from adsorb.diagrams import (
    Pathway,
    PathwayState,
    PathwayStep,
    electrochemical_summary,
    equilibrium_potential,
    limiting_potential,
    nernst_slope_V,
    overpotential,
    pathway_from_states,
    pathway_from_steps,
    plot_pathways,
    rhe_potential,
    species_gibbs,
    state_energies,
    step_energies,
    thermal_summary,
)
from adsorb.errors import InputError

# invented Gibbs energies, eV (not from any calculation)
G_H2 = -6.80
G_H2O = -14.22
G_O2 = 2 * G_H2O - 2 * G_H2 + 4.92      # fixes 2 H2O -> O2 + 2 H2 at +4.92 eV (Nørskov 2004, from memory)
G_SLAB = -300.00
G_OOH = -313.50
G_O = -305.20
G_OH = -309.90
GIBBS = {"H2": G_H2, "H2O": G_H2O, "O2": G_O2, "*": G_SLAB, "OOH*": G_OOH, "O*": G_O, "OH*": G_OH}

ORR_STATES = [
    PathwayState("O2 + *", {"O2": 1, "*": 1}, pairs=4),
    PathwayState("OOH*", {"OOH*": 1}, pairs=3),
    PathwayState("O* + H2O", {"O*": 1, "H2O": 1}, pairs=2),
    PathwayState("OH* + H2O", {"OH*": 1, "H2O": 1}, pairs=1),
    PathwayState("* + 2 H2O", {"*": 1, "H2O": 2}, pairs=0),
]


def hand_orr_steps():
    """dG of the four ORR steps at U = 0 V vs RHE, by hand: mu(H+ + e-) = 1/2 G(H2)."""
    half_h2 = 0.5 * G_H2
    return np.array([
        G_OOH - (G_O2 + G_SLAB + half_h2),           # O2 + * + (H+ + e-) -> OOH*
        (G_O + G_H2O) - (G_OOH + half_h2),           # OOH* + (H+ + e-) -> O* + H2O
        G_OH - (G_O + half_h2),                      # O* + (H+ + e-) -> OH*
        (G_SLAB + G_H2O) - (G_OH + half_h2),         # OH* + (H+ + e-) -> * + H2O
    ])


@pytest.fixture
def orr():
    return pathway_from_states(ORR_STATES, GIBBS, name="invented surface", temperature=298.15)


def test_orr_step_energies_match_hand_values(orr):
    np.testing.assert_allclose(orr.step_gibbs, hand_orr_steps(), rtol=0, atol=1e-12)
    assert orr.pairs_consumed == (1, 1, 1, 1)
    # overall: O2 + 4(H+ + e-) -> 2 H2O, dG = -4.92 eV by construction (Nørskov 2004, from memory)
    assert orr.gibbs[-1] == pytest.approx(-4.92, abs=1e-12)


def test_limiting_potential_and_determining_step_exact(orr):
    hand = hand_orr_steps()
    expected_ul = min(-hand)                      # reduction: U_L = min_i(-dG_i/e)
    expected_step = int(np.argmin(-hand)) + 1     # 1-based
    lim = limiting_potential(orr)
    assert lim.direction == "reduction"
    assert lim.potential == pytest.approx(expected_ul, abs=1e-12)
    assert lim.step == expected_step == 1
    assert lim.step_label == "O2 + * -> OOH*"
    # invented numbers: U_L = 0.18 V, from -(-313.5 - (-9.92 - 300 - 3.4))
    assert lim.potential == pytest.approx(0.18, abs=1e-12)


def test_at_limiting_potential_every_electrochemical_step_is_downhill(orr):
    # physical limit: at U_L the determining step is exactly thermoneutral, all others downhill
    lim = limiting_potential(orr)
    dg = step_energies(orr, lim.potential)
    assert dg[lim.step - 1] == pytest.approx(0.0, abs=1e-12)
    assert np.all(dg <= 1e-12)
    assert step_energies(orr, lim.potential + 1e-3)[lim.step - 1] > 0


def test_potential_shift_is_exactly_n_e_u(orr):
    # dG_i(U) = dG_i(0) + n_i e U (Nørskov 2004): per step and per state
    u = np.array([-0.4, 0.0, 0.37, 1.23])
    shift = step_energies(orr, u) - step_energies(orr, 0.0)
    np.testing.assert_allclose(shift, np.outer(u, [1, 1, 1, 1]), rtol=0, atol=1e-12)
    states = state_energies(orr, u) - state_energies(orr, 0.0)
    np.testing.assert_allclose(states, np.outer(u, [0, 1, 2, 3, 4]), rtol=0, atol=1e-12)
    assert state_energies(orr, u).shape == (4, 5)


def test_equilibrium_potential_and_overpotential(orr):
    # 4.92 eV / 4 = 1.23 V for O2/H2O (Nørskov 2004, from memory)
    assert equilibrium_potential(orr) == pytest.approx(4.92 / 4, abs=1e-12)
    assert equilibrium_potential(orr) == pytest.approx(1.23, abs=1e-12)
    assert overpotential(orr, 1.23) == pytest.approx(1.23 - 0.18, abs=1e-12)
    assert overpotential(orr) == pytest.approx(1.23 - 0.18, abs=1e-12)
    summary = electrochemical_summary(orr, equilibrium_potential_V=1.23)
    assert summary.overpotential == pytest.approx(1.05, abs=1e-12)
    assert summary.chemical_step_max is None
    assert summary.as_dict()["potential_determining_step"] == 1


def test_rhe_versus_she_ph_shift(orr):
    # U_RHE = U_SHE + kT ln(10) pH / e; 0.0591 V per pH at 298.15 K (common practice)
    slope = sc.k * 298.15 * math.log(10) / sc.e       # from scipy's CODATA constants
    assert float(nernst_slope_V(298.15)) == pytest.approx(slope, rel=1e-12)
    assert float(nernst_slope_V(298.15)) == pytest.approx(0.0591, abs=1e-4)
    for ph in (0.0, 7.0, 13.0):
        u_she = 0.3
        she = state_energies(orr, u_she, scale="SHE", ph=ph)
        rhe = state_energies(orr, u_she + slope * ph)
        np.testing.assert_allclose(she, rhe, rtol=0, atol=1e-12)
    # the limiting potential vs SHE at pH 7 is U_L(RHE) - 7 x 0.0591 V
    lim = limiting_potential(orr).potential
    u_she = lim - 7 * slope
    assert float(rhe_potential(u_she, scale="SHE", ph=7, temperature=298.15)) == pytest.approx(lim, abs=1e-12)
    assert step_energies(orr, u_she, scale="SHE", ph=7)[0] == pytest.approx(0.0, abs=1e-12)


def test_she_needs_temperature_and_known_scale():
    p = pathway_from_steps([PathwayStep("A*", delta_gibbs=-0.2, pairs_consumed=1)])
    with pytest.raises(InputError, match="temperature"):
        state_energies(p, 0.1, scale="SHE", ph=7)
    with pytest.raises(InputError, match="scale 'NHE'"):
        state_energies(p, 0.1, scale="NHE")


def test_steps_and_states_give_the_same_pathway(orr):
    # two routes to the same numbers: stoichiometric steps vs states
    steps = [
        PathwayStep("OOH*", {"OOH*": 1, "O2": -1, "*": -1}, pairs_consumed=1),
        PathwayStep("O* + H2O", {"O*": 1, "H2O": 1, "OOH*": -1}, pairs_consumed=1),
        PathwayStep("OH* + H2O", {"OH*": 1, "O*": -1}, pairs_consumed=1),
        PathwayStep("* + 2 H2O", {"*": 1, "H2O": 1, "OH*": -1}, pairs_consumed=1),
    ]
    from_steps = pathway_from_steps(steps, GIBBS, start="O2 + *", temperature=298.15)
    np.testing.assert_allclose(from_steps.gibbs, orr.gibbs, rtol=0, atol=1e-12)
    assert from_steps.labels == orr.labels
    # and from the step dG values directly
    direct = pathway_from_steps([PathwayStep(l, delta_gibbs=g, pairs_consumed=1)
                                 for l, g in zip(orr.labels[1:], hand_orr_steps())], start="O2 + *")
    assert limiting_potential(direct).potential == pytest.approx(0.18, abs=1e-12)


def test_oxidation_pathway_limiting_potential():
    # OER: the ORR steps reversed; U_L = max_i dG_i(0)/e (Nørskov 2004)
    hand = -hand_orr_steps()[::-1]
    labels = [s.label for s in ORR_STATES][::-1]
    oer = pathway_from_steps([PathwayStep(l, delta_gibbs=g, pairs_consumed=-1) for l, g in zip(labels[1:], hand)],
                             start=labels[0], name="invented OER")
    lim = limiting_potential(oer)
    assert lim.direction == "oxidation"
    assert lim.potential == pytest.approx(max(hand), abs=1e-12)
    assert lim.step == int(np.argmax(hand)) + 1
    assert equilibrium_potential(oer) == pytest.approx(1.23, abs=1e-12)
    assert overpotential(oer, 1.23) == pytest.approx(max(hand) - 1.23, abs=1e-12)
    # oxidation steps shift by -e U
    np.testing.assert_allclose(step_energies(oer, 0.5) - oer.step_gibbs, -0.5, atol=1e-12)


def test_thermal_pathway_largest_step():
    # invented thermal pathway: dG = +0.3, -0.8, +0.5, +0.2 eV
    steps = [0.3, -0.8, 0.5, 0.2]
    p = pathway_from_steps([PathwayStep(f"S{i + 1}", delta_gibbs=g) for i, g in enumerate(steps)], start="S0")
    s = thermal_summary(p)
    assert s.largest_step == 3 and s.most_endergonic == 3
    assert s.largest_step_gibbs == pytest.approx(0.5, abs=1e-12)
    assert s.endergonic_steps == (1, 3, 4)
    # states 0, 0.3, -0.5, 0.0, 0.2: largest rise from S2 (-0.5) to S4 (0.2)
    assert s.rise_states == (2, 4) and s.largest_rise == pytest.approx(0.7, abs=1e-12)
    assert s.overall_gibbs == pytest.approx(0.2, abs=1e-12)
    downhill = pathway_from_steps([PathwayStep("B", delta_gibbs=-0.1), PathwayStep("C", delta_gibbs=-0.4)])
    d = thermal_summary(downhill)
    assert d.most_endergonic is None and d.largest_step == 1 and d.largest_rise == 0.0
    with pytest.raises(InputError, match="no \\(H\\+ \\+ e-\\) transfer"):
        limiting_potential(p)


def test_mixed_direction_and_bad_input_raise():
    mixed = pathway_from_steps([PathwayStep("B", delta_gibbs=-0.1, pairs_consumed=1),
                                PathwayStep("C", delta_gibbs=0.2, pairs_consumed=-1)])
    with pytest.raises(InputError, match="mixes reduction and oxidation"):
        limiting_potential(mixed)
    with pytest.raises(InputError, match="'OOH\\*'"):
        pathway_from_states(ORR_STATES, {k: v for k, v in GIBBS.items() if k != "OOH*"})
    with pytest.raises(InputError, match="'H2'"):
        pathway_from_states(ORR_STATES, {k: v for k, v in GIBBS.items() if k != "H2"})
    with pytest.raises(InputError, match="integer number"):
        PathwayState("X", {"*": 1}, pairs=0.5)
    with pytest.raises(InputError, match="either changes or delta_gibbs"):
        PathwayStep("X", {"*": 1}, delta_gibbs=0.1)
    with pytest.raises(InputError, match="at least two states"):
        pathway_from_states(ORR_STATES[:1], GIBBS)


def test_thermotables_give_details_and_temperature():
    # invented adsorbates evaluated with the harmonic model; the step breakdown from
    # reaction_terms must add up to the step dG (G = E + ZPE + thermal - T S)
    t = 400.0
    species = {
        "A*": Adsorbate([400.0, 300.0, 200.0], energy=-101.0, name="A*"),     # invented
        "B*": Adsorbate([500.0, 350.0, 250.0], energy=-101.6, name="B*"),     # invented
        "*": -100.0,                                                          # invented slab
    }
    tables = species_gibbs(species, t)
    p = pathway_from_states([PathwayState("A*", {"A*": 1}), PathwayState("B*", {"B*": 1})], tables)
    assert p.temperature == t
    hand = float(tables["B*"].gibbs - tables["A*"].gibbs)
    assert p.step_gibbs[0] == pytest.approx(hand, abs=1e-12)
    d = p.details[0]
    parts = d["delta_energy_eV"] + d["delta_zpe_eV"] + d["delta_thermal_enthalpy_eV"] + d["minus_T_delta_S_eV"]
    assert parts == pytest.approx(d["delta_gibbs_eV"], abs=1e-12)
    assert d["delta_energy_eV"] == pytest.approx(-0.6, abs=1e-12)
    with pytest.raises(InputError, match="takes no pressure"):
        species_gibbs(species, t, pressures={"A*": 1e5})
    with pytest.raises(InputError, match="different temperatures"):
        pathway_from_states([PathwayState("A*", {"A*": 1}), PathwayState("B*", {"B*": 1})],
                            {"A*": tables["A*"], "B*": species["B*"].thermo(500.0)})


def test_plot_files_and_bar_count(orr, tmp_path):
    other = pathway_from_steps([PathwayStep(l, delta_gibbs=g, pairs_consumed=1)
                                for l, g in zip(orr.labels[1:], [-0.9, -1.6, -1.0, -1.42])],
                               start=orr.labels[0], name="second invented surface")
    fig = plot_pathways([orr, other], tmp_path / "orr", potentials=[0.0, 1.23])
    for suffix in (".png", ".svg"):
        f = tmp_path / f"orr{suffix}"
        assert f.exists() and f.stat().st_size > 1000
    assert (tmp_path / "orr.png").read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    ax = fig.axes[0]
    bars = [ln for ln in ax.get_lines() if ln.get_gid() == "state-bar"]
    connectors = [ln for ln in ax.get_lines() if ln.get_gid() == "connector"]
    assert len(bars) == 2 * 2 * 5          # 2 pathways x 2 potentials x 5 states
    assert len(connectors) == 2 * 2 * 4
    assert ax.get_ylabel() == "ΔG (eV)"
    # the bars sit at the state energies of the pathway at that potential
    heights = sorted(round(ln.get_ydata()[0], 9) for ln in bars[5:10])
    assert heights == sorted(round(g, 9) for g in state_energies(orr, 1.23))


def test_thermal_pathway_is_drawn_once(tmp_path):
    p = pathway_from_steps([PathwayStep("B", delta_gibbs=0.2), PathwayStep("C", delta_gibbs=-0.5)], name="thermal")
    fig = plot_pathways(p, tmp_path / "thermal.png", potentials=[0.0, 0.5, 1.0])
    bars = [ln for ln in fig.axes[0].get_lines() if ln.get_gid() == "state-bar"]
    assert len(bars) == 3
    assert (tmp_path / "thermal.svg").stat().st_size > 0


def test_pathway_validation():
    with pytest.raises(InputError, match="2 labels need"):
        Pathway(name="x", labels=("a", "b"), gibbs=(0.0,), pairs_consumed=(0,))
    with pytest.raises(InputError, match="finite"):
        Pathway(name="x", labels=("a", "b"), gibbs=(0.0, float("nan")), pairs_consumed=(0,))
    for bad in ("hot", -5.0, float("inf"), [300.0, 400.0]):
        with pytest.raises(InputError, match="Pathway 'x' temperature"):
            Pathway(name="x", labels=("a", "b"), gibbs=(0.0, 1.0), pairs_consumed=(0,), temperature=bad)
    for bad in (True, 1.5, "two"):
        with pytest.raises(InputError, match="integer number of"):
            Pathway(name="x", labels=("a", "b"), gibbs=(0.0, 1.0), pairs_consumed=(bad,))
    with pytest.raises(InputError, match="coefficient of 'A\\*': expected a finite number"):
        PathwayState("A", {"A*": float("nan")})
    with pytest.raises(InputError, match="delta_gibbs: expected a finite number in eV"):
        PathwayStep("B", delta_gibbs="x")
