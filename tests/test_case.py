"""Case files: validation before computing, all problems collected, frozen typed result."""

import dataclasses
import hashlib
import re
import shutil
from pathlib import Path

import pytest

from adsorb.case import CaseError, load_case
from adsorb.cli import main
from adsorb.errors import InputError

HERE = Path(__file__).resolve().parent
BAD = HERE / "bad_cases"
BASE = BAD / "base_valid.toml"
CASES = HERE.parent / "cases"
BAD_FILES = sorted(BAD.glob("bad_*.toml"))


def _expected_key(path):
    return re.search(r"^# expect: (.+)$", path.read_text(), re.M).group(1).strip()


def _write(tmp_path, text, name="case.toml"):
    path = tmp_path / name
    path.write_text(text)
    return path


def test_base_case_is_valid_and_frozen():
    """The base of the bad cases loads; the result is frozen and read-only."""
    case = load_case(BASE)
    assert case.title.startswith("minimal CO case")
    assert case.conditions.temperatures_K == (300.0, 400.0)
    assert case.conditions.pressures_Pa["CO"] == pytest.approx(1e5, rel=1e-12)   # 1 bar = 1e5 Pa (common practice)
    with pytest.raises(dataclasses.FrozenInstanceError):
        case.title = "changed"
    with pytest.raises(TypeError):
        case.gases["X"] = None
    assert isinstance(case.adsorbates["CO*"].frequencies_cm, tuple)


def test_at_least_twenty_distinct_bad_cases():
    """Enough broken files, each with a different expected key or content."""
    assert len(BAD_FILES) >= 20
    assert len({p.read_text() for p in BAD_FILES}) == len(BAD_FILES)


@pytest.mark.parametrize("path", BAD_FILES, ids=lambda p: p.stem)
def test_each_bad_case_gives_one_problem_naming_file_and_key(path):
    """Exactly one problem, a single line naming the file and the key path."""
    with pytest.raises(CaseError) as info:
        load_case(path)
    problems = info.value.problems
    assert len(problems) == 1, problems
    line = problems[0]
    assert "\n" not in line
    assert str(path) in line
    assert _expected_key(path) in line
    assert "expected" in line
    assert isinstance(info.value, InputError)


def test_all_problems_are_collected(tmp_path):
    """Three independent mistakes give three lines, found in one pass."""
    text = BASE.read_text().replace('description = "CO', 'descripton = "CO')
    text = text.replace('model = "harmonic"', 'model = "harmonc"').replace("site_area_A2 = 7.0", "site_area_A2 = -1")
    with pytest.raises(CaseError) as info:
        load_case(_write(tmp_path, text))
    joined = "\n".join(info.value.problems)
    assert len(info.value.problems) == 3
    assert "did you mean 'description'" in joined
    assert "did you mean 'harmonic'" in joined
    assert "surfaces.S.site_area_A2" in joined


def test_pressure_units_and_mole_fractions(tmp_path):
    """Units in key names convert to Pa; total pressure x mole fraction gives partial pressures."""
    text = BASE.read_text().replace("partial_pressures_bar = { CO = 1.0 }", "partial_pressures_kPa = { CO = 250.0 }")
    case = load_case(_write(tmp_path, text))
    assert case.conditions.pressures_Pa["CO"] == pytest.approx(2.5e5, rel=1e-12)   # 1 kPa = 1e3 Pa
    text = BASE.read_text().replace("partial_pressures_bar = { CO = 1.0 }",
                                    "total_pressure_atm = 2.0\nmole_fractions = { CO = 1.0 }")
    case = load_case(_write(tmp_path, text))
    assert case.conditions.pressures_Pa["CO"] == pytest.approx(2 * 101325.0, rel=1e-12)   # 1 atm = 101325 Pa


def test_temperature_range_by_step_and_by_count(tmp_path):
    """A range gives the same grid by step or by count, ends included."""
    a = BASE.read_text().replace("temperatures_K = [300.0, 400.0]", "temperature_range_K = { start = 400, stop = 800, step = 100 }")
    b = BASE.read_text().replace("temperatures_K = [300.0, 400.0]", "temperature_range_K = { start = 400, stop = 800, count = 5 }")
    ta = load_case(_write(tmp_path, a, "a.toml")).conditions.temperatures_K
    tb = load_case(_write(tmp_path, b, "b.toml")).conditions.temperatures_K
    assert ta == pytest.approx((400, 500, 600, 700, 800)) and tb == pytest.approx(ta)


def test_asymmetric_interactions_refused(tmp_path):
    """eps_ij must equal eps_ji when both are given (mean-field energy exists only then)."""
    text = BASE.read_text().replace('model = "harmonic"', 'model = "harmonic"\ninteractions_eV = { "CO*" = 0.1, "O*" = 0.2 }')
    text += ('\n[adsorbates."O*"]\nsurface = "S"\nformula = "O"\nenergy_eV = -105.0\nfrequencies_cm = [500.0, 400.0, 390.0]\n'
             'interactions_eV = { "CO*" = 0.3 }\n')
    with pytest.raises(CaseError) as info:
        load_case(_write(tmp_path, text))
    assert any("symmetric" in p and "interactions_eV" in p for p in info.value.problems)


def test_files_resolved_relative_to_case_and_hashed(tmp_path):
    """Structure files are found next to the case wherever it is run from; every input is hashed."""
    shutil.copytree(CASES, tmp_path / "cases")
    case = load_case(tmp_path / "cases" / "ammonia_mx0001.toml")
    paths = [Path(p) for p, _ in case.input_files]
    assert paths[0].name == "ammonia_mx0001.toml"
    assert any(p.name == "nh3_mx_frequencies.txt" for p in paths)
    for p, digest in case.input_files:
        assert digest == hashlib.sha256(Path(p).read_bytes()).hexdigest()


def test_compositions_from_structures_and_balance():
    """NH3* composition is structure minus slab; the hydrogenation steps are checked for balance."""
    case = load_case(CASES / "ammonia_mx0001.toml")
    assert dict(case.adsorbates["NH3*"].composition) == {"N": 1, "H": 3}
    assert dict(case.gases["N2"].composition) == {"N": 2}
    path = case.pathways["hydrogenation"]
    assert path.balance_checked
    # the first state needs 3/2 H2 for the three hydrogenation steps
    assert dict(path.states[0]) == {"N*": 1.0, "H2": 1.5}


def test_unbalanced_atoms_detected_from_structures(tmp_path):
    """With structures known, a step that loses an H atom is refused."""
    shutil.copytree(CASES, tmp_path / "cases")
    path = tmp_path / "cases" / "ammonia_mx0001.toml"
    path.write_text(path.read_text().replace('{ "NH*" = 1, H2 = 0.5 }, products = { "NH2*" = 1 }',
                                             '{ "NH*" = 1, H2 = 1.0 }, products = { "NH2*" = 1 }'))
    with pytest.raises(CaseError) as info:
        load_case(path)
    assert len(info.value.problems) == 1
    assert "pathways.hydrogenation.steps.1.products: unbalanced step" in info.value.problems[0]


def test_electrochemical_balance_counts_proton_electron_pairs():
    """OOH* + (H+ + e-) -> O* + H2O balances only with the pair counted as H."""
    case = load_case(CASES / "orr_fictitious_sites.toml")
    path = case.pathways["orr"]
    assert path.balance_checked and [s.proton_electron_pairs for s in path.steps] == [1, 1, 1, 1]
    assert dict(path.states[0])["(H+ + e-)"] == 4


def test_check_prints_summary(capsys):
    """adsorb check: exit 0 and a summary of what would be computed."""
    assert main(["check", str(CASES / "ammonia_mx0001.toml")]) == 0
    out = capsys.readouterr().out
    assert "case is valid" in out
    assert "coverages vs T on Mx(0001): without and with lateral interactions" in out
    assert "pathway hydrogenation (thermal, 4 steps" in out
    assert "model comparison: NH3*" in out


def test_check_bad_case_exit_two_one_line(capsys):
    """adsorb check on a broken file: exit 2, one line on stderr, nothing on stdout."""
    path = BAD / "bad_unknown_model.toml"
    assert main(["check", str(path)]) == 2
    captured = capsys.readouterr()
    lines = captured.err.strip().splitlines()
    assert len(lines) == 1 and "adsorbates.CO*.model" in lines[0] and str(path) in lines[0]
    assert captured.out == ""


def test_missing_case_file_is_one_line(tmp_path):
    """A case path that does not exist is a CaseError naming it."""
    with pytest.raises(CaseError, match="case file not found"):
        load_case(tmp_path / "nope.toml")


@pytest.mark.parametrize("name, fix", [("bad_potential_scale.toml", ('potential_scale = "NHE"', 'potential_scale = "RHE"')),
                                       ("bad_ph_out_of_range.toml", ("pH = 15", "pH = 14"))])
def test_scale_and_ph_cases_are_valid_once_fixed(tmp_path, name, fix):
    """The two electrochemical broken files differ from a valid case by the one bad value only."""
    case = load_case(_write(tmp_path, (BAD / name).read_text().replace(*fix)))
    assert case.pathways["hydrogen_deposition"].kind == "electrochemical"


def test_she_potentials_converted_to_rhe():
    """U_RHE = U_SHE + (kT ln 10 / e) pH (Nørskov et al., J. Phys. Chem. B 2004, 108, 17886); the Nernst
    slope at 298.15 K is 0.05916 V per pH unit (common practice)."""
    case = load_case(CASES / "orr_fictitious_sites.toml")
    she, rhe = case.pathways["orr_pH13_SHE"], case.pathways["orr"]
    assert (she.potential_scale, she.pH, rhe.potential_scale, rhe.pH) == ("SHE", 13.0, "RHE", None)
    assert she.rhe_minus_she_V == pytest.approx(13 * 0.05916, abs=2e-4)
    assert she.potentials_given_V == (0.0, 0.461)
    assert she.potentials_V == pytest.approx((she.rhe_minus_she_V, 0.461 + she.rhe_minus_she_V), rel=1e-12)
    assert rhe.potentials_V == rhe.potentials_given_V == (0.0, 1.23)


@pytest.mark.parametrize("edit, key, words", [
    (('potential_scale = "RHE"\npH = 7', 'potential_scale = "SHE"'), "pathways.hydrogen_deposition.pH",
     "missing for potential_scale = 'SHE'"),
    (("pH = 7", "pH = -1"), "pathways.hydrogen_deposition.pH", "between 0 and 14"),
    (("potentials_V = [0.0]", "potentials_V = [0.0, 6.0]"), "pathways.hydrogen_deposition.potentials_V.1",
     "between -5 and 5 V vs RHE"),
])
def test_scale_problems_are_one_line(tmp_path, edit, key, words):
    """SHE without a pH, a negative pH, a potential out of range: one line naming the key."""
    text = (BAD / "bad_potential_scale.toml").read_text().replace('potential_scale = "NHE"', 'potential_scale = "RHE"')
    with pytest.raises(CaseError) as info:
        load_case(_write(tmp_path, text.replace(*edit)))
    assert len(info.value.problems) == 1, info.value.problems
    assert key in info.value.problems[0] and words in info.value.problems[0]


def test_scale_refused_on_thermal_pathway(tmp_path):
    """potential_scale and pH belong to electrochemical pathways only."""
    text = BASE.read_text().replace('temperature_K = 400.0', 'temperature_K = 400.0\npotential_scale = "SHE"\npH = 7')
    with pytest.raises(CaseError) as info:
        load_case(_write(tmp_path, text))
    joined = "\n".join(info.value.problems)
    assert len(info.value.problems) == 2
    assert "pathways.desorption.potential_scale: potential_scale on a thermal pathway" in joined
    assert "pathways.desorption.pH: pH on a thermal pathway" in joined


def test_optional_outputs_of_the_ammonia_demo():
    """Isobars (one per interaction variant), isosteric heats, TPD and NASA sections are read into specs."""
    out = load_case(CASES / "ammonia_mx0001.toml").outputs
    assert [(c.kind, c.gas, c.interactions, c.entry) for c in out.isobars] == [("isobar", "H2", False, 0),
                                                                              ("isobar", "H2", True, 0)]
    assert out.isobars[1].pressures_Pa == pytest.approx((1e5, 75e5), rel=1e-12)      # 1 bar = 1e5 Pa
    assert [(h.adsorbate, h.interactions) for h in out.isosteric_heats] == [("H*", False), ("H*", True), ("NH3*", False)]
    assert out.isosteric_heats[1].self_interaction_eV == 0.10 and out.isosteric_heats[1].dissociative
    assert len(out.isosteric_heats[2].coverages_ML) == 49 and max(out.isosteric_heats[2].coverages_ML) < 1
    (tpd,) = out.tpd
    assert (tpd.adsorbate, tpd.gas, tpd.heating_rate_K_s, tpd.initial_coverages_ML) == ("NH3*", "NH3", 2.0,
                                                                                       (0.25, 0.5, 1.0))
    assert tpd.site_area_A2 == 6.31 and not tpd.interactions
    assert out.nasa.species == ("H2", "N2", "NH3") and out.nasa.temperature_mid_K == 1000.0
    assert out.nasa.temperatures_K[0] == 300.0 and out.nasa.temperatures_K[-1] == 3000.0


_TPD = ('[[outputs.tpd]]\nadsorbate = "{ads}"\nheating_rate_K_s = {beta}\ninitial_coverages_ML = [{theta}]\n'
        'temperature_start_K = {t0}\ntemperature_end_K = {t1}\n{extra}\n')


@pytest.mark.parametrize("snippet, key, words", [
    (_TPD.format(ads="H*", beta=2, theta=0.5, t0=100, t1=400, extra=""), "outputs.tpd.1.adsorbate", "dissociative"),
    (_TPD.format(ads="NH2*", beta=2, theta=0.5, t0=100, t1=400, extra=""), "outputs.tpd.1.adsorbate",
     "no gas precursor"),
    (_TPD.format(ads="NH3*", beta=-2, theta=0.5, t0=100, t1=400, extra=""), "outputs.tpd.1.heating_rate_K_s",
     "> 0 in K/s"),
    (_TPD.format(ads="NH3*", beta=2, theta=1.5, t0=100, t1=400, extra=""), "outputs.tpd.1.initial_coverages_ML.0",
     "(0, 1] ML"),
    (_TPD.format(ads="NH3*", beta=2, theta=0.5, t0=400, t1=300, extra=""), "outputs.tpd.1.temperature_end_K",
     "end > start"),
    (_TPD.format(ads="NH3*", beta=2, theta=0.5, t0=100, t1=400, extra='interactions = "on"'),
     "outputs.tpd.1.interactions", "no interaction with itself"),
    ('[[outputs.isosteric_heats]]\nadsorbate = "NH3"\ntemperatures_K = [300.0]\n', "outputs.isosteric_heats.2.adsorbate",
     "did you mean 'NH3*'"),
    ('[[outputs.isosteric_heats]]\nadsorbate = "N*"\ntemperatures_K = [300.0]\n'
     'coverage_range_ML = { start = 0.1, stop = 1.0, count = 5 }\n', "outputs.isosteric_heats.2.coverage_range_ML.stop",
     "below 1 ML"),
    ('[[outputs.isosteric_heats]]\nadsorbate = "N*"\ntemperatures_K = [300.0]\ninteractions = "sometimes"\n',
     "outputs.isosteric_heats.2.interactions", "'off', 'on' or 'both'"),
    ('[[outputs.isobars]]\ngas = "H2"\npressures = [1.0]\ntemperatures_K = [500.0]\n', "outputs.isobars.1.pressures",
     "no unit"),
    ('[[outputs.isobars]]\ngas = "NH2"\npressures_bar = [1.0]\ntemperatures_K = [500.0]\n', "outputs.isobars.1.gas",
     "not a precursor"),
])
def test_optional_output_problems_are_one_line(tmp_path, snippet, key, words):
    """Each mistake in a new output section gives one line naming the file and the key path."""
    shutil.copytree(CASES, tmp_path / "cases")
    path = tmp_path / "cases" / "ammonia_mx0001.toml"
    text = path.read_text()
    path.write_text(text.replace("# NASA 7-coefficient", snippet + "\n# NASA 7-coefficient"))
    with pytest.raises(CaseError) as info:
        load_case(path)
    assert len(info.value.problems) == 1, info.value.problems
    line = info.value.problems[0]
    assert str(path) in line and key in line and words in line and "expected" in line


@pytest.mark.parametrize("edit, key, words", [
    (('species = ["H2", "N2", "NH3"]', 'species = ["H2", "N2", "CH4"]'), "outputs.nasa.species.2", "unknown species"),
    (("temperature_mid_K = 1000.0", "temperature_mid_K = 3500.0"), "outputs.nasa.temperature_mid_K",
     "at least 8 temperatures on each side"),
    (("temperature_mid_K = 1000.0", 'temperature_mid_K = 1000.0\nobjective = "minmax"'), "outputs.nasa.objective",
     "did you mean 'minimax'"),
    (("temperature_mid_K = 1000.0", 'temperature_mid_K = "middle"'), "outputs.nasa.temperature_mid_K",
     "a finite number in K"),
])
def test_nasa_section_problems(tmp_path, edit, key, words):
    """[outputs.nasa]: unknown species, a common temperature outside the grid, a misspelt objective."""
    shutil.copytree(CASES, tmp_path / "cases")
    path = tmp_path / "cases" / "ammonia_mx0001.toml"
    path.write_text(path.read_text().replace(*edit))
    with pytest.raises(CaseError) as info:
        load_case(path)
    assert len(info.value.problems) == 1, info.value.problems
    assert key in info.value.problems[0] and words in info.value.problems[0]
