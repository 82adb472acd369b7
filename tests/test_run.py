"""adsorb run: the demo cases end to end, results.json structure, report.html, atomic output folder."""

import json
import math
from html.parser import HTMLParser
from pathlib import Path

import numpy as np
import pytest

from adsorb import constants as C
from adsorb.cli import main
from adsorb.errors import InputError
from adsorb.report import validate_results

HERE = Path(__file__).resolve().parent
CASES = HERE.parent / "cases"
BAD_FILES = sorted((HERE / "bad_cases").glob("bad_*.toml"))
DEMOS = ["ammonia_mx0001.toml", "orr_fictitious_sites.toml"]


@pytest.fixture(scope="module")
def runs(tmp_path_factory):
    """Run every demo case once through the command line."""
    out = {}
    for name in DEMOS:
        folder = tmp_path_factory.mktemp("run") / "out"
        assert main(["run", str(CASES / name), "--out", str(folder)]) == 0
        out[name] = (folder, json.loads((folder / "results.json").read_text()))
    return out


class _Page(HTMLParser):
    def __init__(self):
        super().__init__()
        self.images, self.links, self.tags = [], [], []

    def handle_starttag(self, tag, attrs):
        a = dict(attrs)
        self.tags.append(tag)
        if tag == "img":
            self.images.append(a.get("src", ""))
        for key in ("href", "src"):
            if key in a and tag != "img":
                self.links.append(a[key])


@pytest.mark.parametrize("name", DEMOS)
def test_demo_runs_and_results_validate(runs, name):
    """Every demo case writes a results.json that validates, with the files it lists."""
    folder, doc = runs[name]
    validate_results(doc)
    assert doc["inputs"][0]["path"].endswith(name)
    assert set(doc["versions"]) >= {"adsorb", "numpy", "scipy", "ase"}
    for f in doc["files"]["tables"] + [p for pair in doc["files"]["plots"] for p in pair]:
        assert (folder / f).is_file()
    assert not any(p.name.startswith(".") for p in folder.parent.iterdir())   # no temporary folder left


@pytest.mark.parametrize("name", DEMOS)
def test_report_is_self_contained_html(runs, name):
    """report.html parses, embeds every plot as a base64 PNG and references no external file."""
    folder, doc = runs[name]
    page = _Page()
    page.feed((folder / "report.html").read_text(encoding="utf-8"))
    page.close()
    assert "html" in page.tags and "table" in page.tags
    assert len(page.images) == len(doc["files"]["plots"]) > 0
    assert all(src.startswith("data:image/png;base64,") for src in page.images)
    assert page.links == []
    text = (folder / "report.html").read_text(encoding="utf-8")
    assert "licensed engineering practice" in text and "mean-field" in text


def test_validator_refuses_broken_documents(runs):
    """validate_results finds a missing key, a coverage above 1 and a bad hash."""
    _, doc = runs["ammonia_mx0001.toml"]
    broken = json.loads(json.dumps(doc))
    del broken["versions"]
    with pytest.raises(InputError, match="versions"):
        validate_results(broken)
    broken = json.loads(json.dumps(doc))
    broken["coverages"][0]["coverage_ML"]["H*"][0] = 1.5
    with pytest.raises(InputError, match="coverage_ML"):
        validate_results(broken)
    broken = json.loads(json.dumps(doc))
    broken["inputs"][0]["sha256"] = "abc"
    with pytest.raises(InputError, match="sha256"):
        validate_results(broken)


def test_ideal_coverages_match_competitive_langmuir(runs):
    """Without interactions, coverages follow the competitive Langmuir closed form (Langmuir 1918;
    adsorbate-models.md §6) with the reported K: dissociative sqrt(K p), molecular K p."""
    _, doc = runs["ammonia_mx0001.toml"]
    run = next(r for r in doc["coverages"] if r["fugacity"] == "ideal" and not r["interactions"])
    eq = doc["equilibria"]
    p = doc["conditions"]["partial_pressures_Pa"]
    c = {"H*": np.sqrt(np.array(eq["H*"]["equilibrium_constant_per_Pa"]) * p["H2"]),
         "N*": np.sqrt(np.array(eq["N*"]["equilibrium_constant_per_Pa"]) * p["N2"]),
         "NH3*": np.array(eq["NH3*"]["equilibrium_constant_per_Pa"]) * p["NH3"]}
    denominator = 1 + sum(c.values())
    for s, v in c.items():
        np.testing.assert_allclose(run["coverage_ML"][s], v / denominator, rtol=1e-9)
    np.testing.assert_allclose(run["empty_sites_ML"], 1 / denominator, rtol=1e-9)


def test_equilibrium_constant_from_free_energy(runs):
    """K = exp(-dG/kT)/p° in Pa^-1 (common practice; adsorbate-models.md §3.2)."""
    _, doc = runs["ammonia_mx0001.toml"]
    e = doc["equilibria"]["NH3*"]
    t = np.array(e["temperature_K"])
    expected = np.exp(-np.array(e["delta_gibbs_eV"]) / (C.kB_eV * t)) / 1e5
    np.testing.assert_allclose(e["equilibrium_constant_per_Pa"], expected, rtol=1e-10)


def test_interactions_and_fugacity_change_coverages(runs):
    """Repulsive interactions lower the N* coverage; PR fugacities differ from partial pressures at ~100 bar."""
    _, doc = runs["ammonia_mx0001.toml"]
    pick = {(r["fugacity"], r["interactions"]): r for r in doc["coverages"]}
    assert len(pick) == 4
    n_free = np.array(pick[("ideal", False)]["coverage_ML"]["N*"])
    n_int = np.array(pick[("ideal", True)]["coverage_ML"]["N*"])
    assert np.all(n_int < n_free)
    f = np.array(pick[("peng-robinson", False)]["fugacities_Pa"]["H*"])
    assert np.all(np.abs(f / 7.5e6 - 1) > 0.005)          # H2 at 75 bar: phi ~ 1.02-1.03 (PR; gas-reference-data.md 5c)
    for r in doc["coverages"]:
        total = sum(np.array(v) for v in r["coverage_ML"].values()) + np.array(r["empty_sites_ML"])
        np.testing.assert_allclose(total, 1.0, rtol=1e-9)


def test_ideal_reference_warning_at_high_pressure(runs):
    """At 105 bar total the ideal-gas reference earns the |Z - 1| > 1 % warning."""
    _, doc = runs["ammonia_mx0001.toml"]
    assert any("ideal-gas reference" in w and "|Z - 1|" in w for w in doc["warnings"])


def test_orr_diagram_che(runs):
    """CHE diagram: overall -4.92 eV by the O2 anchor (Nørskov et al. 2004), shifts of N e U, and U_L."""
    _, doc = runs["orr_fictitious_sites.toml"]
    p = doc["pathways"][0]
    g0 = np.array(p["state_gibbs_eV"][0])
    assert p["potentials_V_RHE"][:2] == [0.0, 1.23]
    assert g0[-1] == pytest.approx(-4.92, abs=1e-9)     # 2 H2O -> O2 + 2 H2 is +4.92 eV, reversed
    # at 1.23 V the overall reaction is at equilibrium (4 x 1.23 = 4.92)
    assert p["state_gibbs_eV"][1][-1] == pytest.approx(0.0, abs=1e-9)
    # U_L = min over steps of -dG_i(0) (one pair per step), and every step is downhill there
    u_l = p["summary"]["limiting_potential_V_RHE"]
    assert u_l == pytest.approx(min(-np.diff(g0)), rel=1e-12)
    assert p["potentials_V_RHE"][2] == pytest.approx(u_l)
    assert np.all(np.diff(p["state_gibbs_eV"][2]) <= 1e-12)
    assert p["summary"]["overpotential_V"] == pytest.approx(1.23 - u_l, rel=1e-12)


def test_orr_water_at_0035_bar(runs):
    """The last step uses H2O at 0.035 bar: dG4 = G(*) + G(H2O, 1 bar) + kT ln 0.035 - G(OH*) - 1/2 G(H2)
    (ideal-gas pressure dependence, common practice; Nørskov et al. 2004 for the 0.035 bar)."""
    _, doc = runs["orr_fictitious_sites.toml"]
    t = 298.15
    g_h2o = doc["gases"]["H2O"]["thermo_1bar"]["gibbs_eV"][0] + C.kB_eV * t * math.log(0.035)
    g_h2 = doc["gases"]["H2"]["thermo_1bar"]["gibbs_eV"][0]
    g_oh = doc["adsorbates"]["OH*"]["thermo"]["gibbs_eV"][0]
    expected = doc["surfaces"]["Sx"]["energy_eV"] + g_h2o - g_oh - 0.5 * g_h2
    assert doc["pathways"][0]["step_gibbs_eV_at_0V_RHE"][3] == pytest.approx(expected, abs=1e-9)


def test_refuses_non_empty_folder_without_force(tmp_path, capsys):
    """A non-empty DIR is refused (exit 2, one line); --force replaces it as a whole."""
    out = tmp_path / "out"
    out.mkdir()
    (out / "keep.txt").write_text("old")
    case = str(CASES / "orr_fictitious_sites.toml")
    assert main(["run", case, "--out", str(out)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "not empty" in err[0] and "--force" in err[0]
    assert (out / "keep.txt").read_text() == "old"
    assert main(["run", case, "--out", str(out), "--force"]) == 0
    assert not (out / "keep.txt").exists() and (out / "results.json").is_file()
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out"]


@pytest.mark.parametrize("path", BAD_FILES, ids=lambda p: p.stem)
def test_bad_case_run_exit_two_and_no_folder(path, tmp_path, capsys):
    """Every broken case: exit 2, one stderr line naming file and key, no output folder, no traceback."""
    out = tmp_path / "out"
    assert main(["run", str(path), "--out", str(out)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    key = next(line for line in path.read_text().splitlines() if line.startswith("# expect:")).split(":", 1)[1].strip()
    assert len(err) == 1 and str(path) in err[0] and key in err[0]
    assert "Traceback" not in err[0]
    assert list(tmp_path.iterdir()) == []


def test_failure_while_writing_leaves_nothing(tmp_path, monkeypatch):
    """An error in the middle of writing the results removes the partial folder (no DIR at all)."""
    import adsorb.report as report

    def half_written(result, folder):
        (Path(folder) / "results.json").write_text("{}")
        raise InputError("simulated failure while writing")

    monkeypatch.setattr(report, "write_results", half_written)
    out = tmp_path / "new" / "deeper" / "out"
    assert main(["run", str(CASES / "orr_fictitious_sites.toml"), "--out", str(out)]) == 2
    assert list(tmp_path.iterdir()) == []          # not even the parent folders made for DIR


def test_debug_shows_the_exception(tmp_path):
    """With --debug the error propagates (a traceback) instead of the one-line message."""
    out = tmp_path / "out"
    out.mkdir()
    (out / "x").write_text("x")
    with pytest.raises(InputError, match="not empty"):
        main(["--debug", "run", str(CASES / "orr_fictitious_sites.toml"), "--out", str(out)])


def test_orr_at_ph13_on_the_she_scale(runs):
    """vs SHE: mu(H+ + e-) = 1/2 mu(H2) - eU_SHE - kT ln(10) pH (Nørskov et al. 2004), so the pH 13 diagram at
    U_SHE equals the RHE diagram at U_SHE + kT ln(10) 13 / e; the slope is 0.05916 V per pH at 298.15 K
    (common practice). The limiting potential keeps its value vs RHE and moves by that shift vs SHE."""
    folder, doc = runs["orr_fictitious_sites.toml"]
    rhe, she = (next(p for p in doc["pathways"] if p["name"] == n) for n in ("orr", "orr_pH13_SHE"))
    assert (she["potential_scale"], she["pH"], rhe["potential_scale"], rhe["pH"]) == ("SHE", 13.0, "RHE", None)
    shift = she["rhe_minus_she_V"]
    assert shift == pytest.approx(13 * 0.05916, abs=2e-4)
    g0 = np.array(rhe["state_gibbs_eV"][0])
    n = np.concatenate([[0], np.cumsum(rhe["pairs_consumed"])])
    for u, g in zip(she["potentials_V"], she["state_gibbs_eV"]):
        np.testing.assert_allclose(g, g0 + n * (u + shift), rtol=0, atol=1e-12)
    u_l = rhe["summary"]["limiting_potential_V_RHE"]
    assert she["summary"]["limiting_potential_V_RHE"] == pytest.approx(u_l, rel=1e-12)
    assert she["limiting_potential_V"] == pytest.approx(u_l - shift, rel=1e-12)
    assert she["summary"]["limiting_potential_V_SHE"] == pytest.approx(u_l - shift, rel=1e-12)
    assert she["equilibrium_potential_V"] == pytest.approx(1.23 - shift, abs=1e-9)   # 4.92 eV / 4 (Nørskov 2004)
    assert she["summary"]["overpotential_V"] == pytest.approx(rhe["summary"]["overpotential_V"], abs=1e-9)
    assert rhe["limiting_potential_V"] == pytest.approx(u_l, rel=1e-12)
    text = (folder / "report.html").read_text(encoding="utf-8")
    assert "Potential scale: <b>SHE</b>, pH 13" in text and "V vs SHE" in text
    header = (folder / "pathway_orr_pH13_SHE.csv").read_text().splitlines()[0]
    assert "gibbs_eV_at_0.000_V_SHE_pH_13" in header and "gibbs_eV_at_0.769_V_RHE" in header


def test_validator_checks_the_potential_scale(runs):
    """An SHE pathway whose potentials do not match U_RHE - (kT ln 10/e) pH, or a pH of 15, is refused."""
    _, doc = runs["orr_fictitious_sites.toml"]
    i = next(k for k, p in enumerate(doc["pathways"]) if p["potential_scale"] == "SHE")
    broken = json.loads(json.dumps(doc))
    broken["pathways"][i]["potentials_V"][0] += 0.1
    with pytest.raises(InputError, match=f"pathways.{i}.potentials_V"):
        validate_results(broken)
    broken = json.loads(json.dumps(doc))
    broken["pathways"][i]["pH"] = 15
    with pytest.raises(InputError, match=f"pathways.{i}.pH"):
        validate_results(broken)
    broken = json.loads(json.dumps(doc))
    broken["pathways"][i]["potential_scale"] = "NHE"
    with pytest.raises(InputError, match="potential_scale"):
        validate_results(broken)


def test_isosteric_heats_clausius_clapeyron(runs):
    """Without interactions q_st(θ) = -ΔH_ads at every coverage (Clausius–Clapeyron = van 't Hoff for a Langmuir
    layer, adsorbate-models.md §6), and -ΔH_ads equals the equilibria entry at the same temperature; with the
    mean-field H*-H* repulsion ε, q_st = -ΔH_ads - 2εθ per H2 (Fowler–Guggenheim, dissociative)."""
    _, doc = runs["ammonia_mx0001.toml"]
    heats = {(h["adsorbate"], h["interactions"]): h for h in doc["isosteric_heats"]}
    assert set(heats) == {("H*", False), ("H*", True), ("NH3*", False)}
    eq = doc["equilibria"]["H*"]
    for (name, inter), h in heats.items():
        q = np.array(h["isosteric_heat_eV"])
        theta = np.array(h["coverage_ML"])
        mdh = np.array(h["minus_delta_enthalpy_eV"])[:, None]
        expected = mdh - ((2 if h["dissociative"] else 1) * h["self_interaction_eV"] * theta if inter else 0.0 * theta)
        np.testing.assert_allclose(q, expected, rtol=1e-6, atol=0)
        np.testing.assert_allclose(h["isosteric_heat_kJ_mol"], q * C.EV_TO_KJ_MOL, rtol=1e-12)
    for k, t in enumerate(heats[("H*", False)]["temperature_K"]):
        i = eq["temperature_K"].index(t)
        assert heats[("H*", False)]["minus_delta_enthalpy_eV"][k] == pytest.approx(-eq["delta_enthalpy_eV"][i], rel=1e-12)
    assert heats[("H*", True)]["self_interaction_eV"] == 0.10


def test_isobars_match_the_coverages_and_langmuir(runs):
    """At p(H2) = 75 bar (the case's own pressure) the isobar equals the coverage-vs-T run; at 1 bar it follows the
    competitive Langmuir closed form with the reported K (Langmuir 1918)."""
    _, doc = runs["ammonia_mx0001.toml"]
    iso = {r["interactions"]: r for r in doc["isobars"]}
    assert set(iso) == {False, True} and iso[False]["pressure_Pa"] == [1e5, 75e5]
    cov = {(r["fugacity"], r["interactions"]): r for r in doc["coverages"]}
    eq, p = doc["equilibria"], doc["conditions"]["partial_pressures_Pa"]
    for inter in (False, True):
        ref = cov[("ideal", inter)]
        for k, t in enumerate(ref["temperature_K"]):
            if t not in iso[inter]["temperature_K"]:
                continue
            a = iso[inter]["temperature_K"].index(t)
            for s in ref["species"]:
                assert iso[inter]["coverage_ML"][s][a][1] == pytest.approx(ref["coverage_ML"][s][k], rel=1e-8, abs=1e-14)
            if not inter:
                c = {"H*": math.sqrt(eq["H*"]["equilibrium_constant_per_Pa"][k] * 1e5),
                     "N*": math.sqrt(eq["N*"]["equilibrium_constant_per_Pa"][k] * p["N2"]),
                     "NH3*": eq["NH3*"]["equilibrium_constant_per_Pa"][k] * p["NH3"]}
                for s, v in c.items():
                    assert iso[False]["coverage_ML"][s][a][0] == pytest.approx(v / (1 + sum(c.values())), rel=1e-9)


def test_tpd_of_nh3(runs):
    """First order, constant E_d: Tp does not depend on θ0 (Redhead 1962); the peak obeys the exact first-order
    condition d ln k/dT = k/β with k = ν(T) exp(-E_d/kT); ν_app = (βE/kTp²) exp(E/kTp); Redhead's formula with
    the conventional 1e13 s^-1 is E = kTp[ln(1e13 Tp/β) - 3.64] and underestimates E_d for a gas-like TS."""
    folder, doc = runs["ammonia_mx0001.toml"]
    (run,) = doc["tpd"]
    assert run["order"] == 1 and run["adsorbate"] == "NH3*" and run["energy_coefficients_eV"] == [run["desorption_energy_eV"]]
    e = run["desorption_energy_eV"]
    eq = doc["equilibria"]["NH3*"]
    assert e == pytest.approx(-(eq["delta_energy_eV"] + eq["delta_zpe_eV"][0]), rel=1e-12)   # E_d = -(ΔE + ΔZPE)
    beta = run["heating_rate_K_s"]
    tps = [sp["peak_temperature_K"] for sp in run["spectra"]]
    assert max(tps) - min(tps) < 1e-6
    for sp in run["spectra"]:
        tp, nu = sp["peak_temperature_K"], sp["prefactor_at_peak_s"]
        assert sp["apparent_prefactor_s"] == pytest.approx(beta * e / (C.kB_eV * tp**2) * math.exp(e / (C.kB_eV * tp)),
                                                           rel=1e-9)
        assert sp["redhead_comparison"]["redhead_energy_1e13_eV"] == pytest.approx(
            C.kB_eV * tp * (math.log(1e13 * tp / beta) - 3.64), rel=1e-12)
        assert sp["redhead_comparison"]["redhead_energy_1e13_eV"] < e < 2 * e
        assert sp["desorbed_ML"] == pytest.approx(sp["initial_coverage_ML"], rel=1e-6)
        assert 1e14 < nu < 1e17          # gas-like TS of a small molecule: 1e15-1e19 s^-1 range (Tait et al. 2005)
    # ν(T) of the transition state is T-dependent, so the apparent constant prefactor differs from ν(Tp)
    assert run["spectra"][0]["apparent_prefactor_s"] != pytest.approx(run["spectra"][0]["prefactor_at_peak_s"], rel=1e-3)
    rows = (folder / "tpd_0_NH3_ads_ideal_layer.csv").read_text().splitlines()
    assert rows[0] == "initial_coverage_ML,temperature_K,coverage_ML,rate_ML_per_K,rate_ML_per_s"
    assert len(rows) == 1 + 3 * len(run["spectra"][0]["temperature_K"])


def test_tpd_prefactor_is_detailed_balance_with_k():
    """The 2D-gas TS rate equals the detailed-balance rate of the site balance with Hertz–Knudsen adsorption,
    sticking 1 (adsorbate-models.md §5.2): ν(T) e^(-E_d/kT) = A_site p° e^(ΔG/kT) / sqrt(2π m kT)."""
    from adsorb.case import load_case
    from adsorb.study import _Study
    from adsorb.study_outputs import tst_prefactor

    case = load_case(CASES / "ammonia_mx0001.toml")
    s = _Study(case)
    spec = case.outputs.tpd[0]
    nu, e_d, mass = tst_prefactor(s, spec)
    t = np.array([110.0, 187.3, 264.9, 349.0])        # off the spline knots
    dg = s.equilibrium("NH3*", t).terms.delta_gibbs
    flux = spec.site_area_A2 * C.angstrom**2 * C.P_STANDARD / np.sqrt(2 * np.pi * mass * C.amu * C.k_B * t)
    np.testing.assert_allclose(nu(t) * np.exp(-e_d / (C.kB_eV * t)), flux * np.exp(dg / (C.kB_eV * t)), rtol=1e-7)


def test_tpd_with_repulsion_moves_the_peak_down(tmp_path):
    """With a mean-field repulsion E_d(θ) = E_d - εθ the first-order peak moves to lower T as θ0 rises (Redhead 1962:
    coverage-dependent energies shift Tp), and with ε = 0 it would not."""
    import shutil

    from adsorb.case import load_case
    from adsorb.study import run_study

    shutil.copytree(CASES, tmp_path / "cases")
    path = tmp_path / "cases" / "ammonia_mx0001.toml"
    text = path.read_text().replace('model = "harmonic"\n', 'model = "harmonic"\ninteractions_eV = { "NH3*" = 0.1 }\n', 1)
    text = text.replace("temperature_end_K = 350.0", 'temperature_end_K = 350.0\ninteractions = "both"')
    path.write_text(text)
    result = run_study(load_case(path))
    by = {r.spec.interactions: r for r in result.tpd}
    assert by[True].energy_coefficients_eV == (by[False].desorption_energy_eV, -0.1)
    tp = [r.peak_temperature_K for r in by[True].spectra]
    assert tp[0] > tp[1] > tp[2] and tp[0] < by[False].spectra[0].peak_temperature_K
    for r in by[True].spectra:           # E_d at the peak follows the coverage there
        assert r.energy_at_peak_eV == pytest.approx(by[False].desorption_energy_eV - 0.1 * r.peak_coverage, rel=1e-12)


def test_nasa_fits_of_the_gases(runs):
    """NASA-7 fits of the RRHO tables: JSON and CSV per gas that read back exactly; the N2 polynomial gives JANAF
    S°(500 K) = 206.739 and S°(1000 K) = 228.170 J/mol/K (NIST-JANAF N-023) within the RRHO tolerance plus the fit
    (0.1 and 0.15 J/mol/K); the fit errors are reported for both ranges."""
    from adsorb.nasa import read_nasa_csv, read_nasa_json

    folder, doc = runs["ammonia_mx0001.toml"]
    assert set(doc["nasa"]) == {"H2", "N2", "NH3"}
    for name, d in doc["nasa"].items():
        assert d["kind"] == "gas" and d["pressure_Pa"] == 1e5 and (d["t_low_K"], d["t_mid_K"], d["t_high_K"]) == (
            300.0, 1000.0, 3000.0)
        assert d["files"] == [f"nasa_{name}.json", f"nasa_{name}.csv"] == doc["files"]["nasa"][name]
        assert set(d["fit_errors"]) == {"low", "high"} and d["fit_errors"]["low"]["cp_max_rel"] < 0.01
        poly = read_nasa_json(folder / d["files"][0])
        assert list(poly.low) == d["low"] and list(read_nasa_csv(folder / d["files"][1]).high) == d["high"]
        th = doc["gases"][name]["thermo_1bar"]
        t = np.array(th["temperature_K"])
        worst = max(d["fit_errors"][r]["s_max_abs_J_mol_K"] for r in ("low", "high"))
        np.testing.assert_allclose(C.to_j_per_mol_k(poly.entropy(t)), th["entropy_J_mol_K"], rtol=0, atol=worst + 1e-9)
    rows = (folder / "nasa_fit_errors.csv").read_text().splitlines()
    assert "nasa_fit_errors.csv" in doc["files"]["tables"] and len(rows) == 1 + 2 * 3
    assert rows[0].startswith("species,t_mid_K,range,t_min_K,t_max_K,n_points,cp_max_abs_J_mol_K")
    n2 = read_nasa_json(folder / "nasa_N2.json")
    assert C.to_j_per_mol_k(n2.entropy(500.0)) == pytest.approx(206.739, abs=0.1)
    assert C.to_j_per_mol_k(n2.entropy(1000.0)) == pytest.approx(228.170, abs=0.15)


def test_report_has_the_new_sections(runs):
    """report.html has the isobar, isosteric-heat, TPD and NASA sections with their plots embedded."""
    folder, doc = runs["ammonia_mx0001.toml"]
    text = (folder / "report.html").read_text(encoding="utf-8")
    for head in ("<h2>Isobars</h2>", "<h2>Isosteric heats</h2>", "<h2>Temperature-programmed desorption</h2>",
                 "<h2>NASA polynomials</h2>"):
        assert head in text
    for stem in ("isobars_0_H2", "isosteric_heat_0_H_ads", "isosteric_heat_1_NH3_ads", "tpd_0_NH3_ads"):
        assert [f"{stem}.png", f"{stem}.svg"] in doc["files"]["plots"]
    titles = ["Isobars 0 on Mx(0001), fixed p(H2)", "Isosteric heat 0: H*", "Isosteric heat 1: NH3*", "TPD 0: NH3*"]
    for title in titles:
        assert f"<figcaption>{title}</figcaption>" in text.replace("&#x27;", "'")
    assert any("Clausius-Clapeyron" in a for a in doc["assumptions"]) and any("TPD" in a for a in doc["assumptions"])


def test_validator_checks_the_new_sections(runs):
    """validate_results refuses a wrong-shaped isosteric heat, a TPD coverage above θ0, a NASA fit with 6
    coefficients and an isobar coverage above 1; documents of earlier versions without these keys still pass."""
    _, doc = runs["ammonia_mx0001.toml"]
    for change, match in [(lambda d: d["isosteric_heats"][0]["isosteric_heat_eV"].pop(), "isosteric_heats.0"),
                          (lambda d: d["tpd"][0]["spectra"][1]["coverage_ML"].__setitem__(0, 0.9), "tpd.0.spectra.1"),
                          (lambda d: d["nasa"]["N2"]["low"].pop(), "nasa.N2"),
                          (lambda d: d["isobars"][0]["coverage_ML"]["H*"][0].__setitem__(0, 1.2), "isobars.0"),
                          (lambda d: d.__setitem__("tpd", {}), "tpd: expected list")]:
        broken = json.loads(json.dumps(doc))
        change(broken)
        with pytest.raises(InputError, match=match):
            validate_results(broken)
    older = json.loads(json.dumps(doc))
    for key in ("isobars", "isosteric_heats", "tpd", "nasa"):
        del older[key]
    validate_results(older)


def test_rhe_scale_with_a_ph_also_reports_she(tmp_path):
    """On the RHE scale a pH is optional; with it the limiting potential is also given vs SHE,
    U_SHE = U_RHE - (kT ln 10 / e) pH (Nørskov et al. 2004), 0.05916 V per pH at 298.15 K (common practice)."""
    from adsorb.case import load_case
    from adsorb.study import run_study

    path = tmp_path / "case.toml"
    path.write_text((HERE / "bad_cases" / "bad_potential_scale.toml").read_text().replace(
        'potential_scale = "NHE"', 'potential_scale = "RHE"'))
    run = next(r for r in run_study(load_case(path)).pathways if r.name == "hydrogen_deposition")
    s = run.summary
    assert (run.potential_scale, run.pH) == ("RHE", 7.0)
    assert run.potentials_on_scale_V == run.potentials_V
    assert s["limiting_potential_V"] == s["limiting_potential_V_RHE"]
    assert s["limiting_potential_V_SHE"] == pytest.approx(s["limiting_potential_V_RHE"] - 7 * 0.05916, abs=2e-4)
    # one step * + (H+ + e-) -> H*: U_L = -dG(0)/e
    assert s["limiting_potential_V_RHE"] == pytest.approx(-run.pathway.step_gibbs[0], rel=1e-12)
