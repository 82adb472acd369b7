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
