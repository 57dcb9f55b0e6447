"""The command line end to end, in-process through typer's CliRunner (the real-process tests of the
entry point are in test_compare.py and test_ledger.py): outputs and every bad input."""

import json

import pytest
from helpers import DEMO, run_cli

GREEN = DEMO / "green_electrolysis_ammonia.toml"
GRID = DEMO / "grid_electrolysis_hydrogen.toml"


def run(*args):
    result = run_cli(*args)
    # CliRunner catches exceptions; an unexpected one is a failure, never a one-line error.
    assert result.exception is None or isinstance(result.exception, SystemExit), result.exc_info
    return result


def assert_one_line_error(process, *words):
    assert process.exit_code == 2, process.stderr
    lines = [line for line in process.stderr.splitlines() if line.strip()]
    assert len(lines) == 1, process.stderr
    assert lines[0].startswith("error: ")
    for word in words:
        assert word in lines[0], (word, lines[0])


def test_score_json_has_the_documented_keys():
    process = run("score", GREEN, "--format", "json")
    assert process.exit_code == 0, process.stderr
    data = json.loads(process.stdout)
    for key in ("project", "product", "boundary", "functional_unit", "gwp_basis", "factor_set", "total", "intensity", "by_stage", "by_gas", "factors_used", "checks"):
        assert key in data
    assert set(data["factor_set"]) == {"name", "sha256"}
    assert set(data["intensity"]) == {"kg_co2e_per_t_nh3", "kg_co2e_per_kg_h2", "g_co2e_per_mj"}
    assert sum(data["by_stage"].values()) == pytest.approx(data["total"], rel=1e-9)
    assert sum(data["by_gas"].values()) == pytest.approx(data["total"], rel=1e-9)
    for check in data["checks"]:
        assert {"scheme", "quantity", "limit", "unit", "value", "passes", "margin", "tier"} <= set(check)
    for factor in data["factors_used"]:
        assert factor["source"]
    hydrogen = json.loads(run("score", GRID, "--format", "json").stdout)
    assert hydrogen["intensity"]["kg_co2e_per_t_nh3"] is None


def test_score_options_change_the_result():
    base = json.loads(run("score", GRID, "--format", "json").stdout)
    ar4 = json.loads(run("score", GRID, "--format", "json", "--gwp", "ar4", "--scheme", "us-45v", "--set", "electrolysis.electricity_kwh_per_kg_h2=48").stdout)
    assert ar4["gwp_basis"] == "ar4"
    assert [c["scheme"] for c in ar4["checks"]] == ["us-45v"]
    # grid-only electricity: the total scales with the kWh per kg (48 + 1.5 vs 52 + 1.5)
    assert ar4["total"] / base["total"] == pytest.approx((48 + 1.5) / (52 + 1.5), rel=1e-9)


def test_score_table_and_csv():
    table = run("score", GREEN)
    assert table.exit_code == 0
    assert "kg CO2e/t NH3" in table.stdout and "Caution" in table.stdout
    csv_out = run("score", GREEN, "--format", "csv")
    assert csv_out.stdout.splitlines()[0] == "section,key,value,unit,from_memory,grade"
    assert any(line.startswith("total,total,") for line in csv_out.stdout.splitlines())


def test_params_lists_every_parameter_with_units():
    process = run("params", GREEN)
    assert process.exit_code == 0
    assert "electrolysis.electricity_kwh_per_kg_h2" in process.stdout and "kWh/kg H2" in process.stdout
    assert "electricity.sources.solar.share" in process.stdout


def test_factor_and_scheme_listings():
    listing = run("factors", "list", "--prefix", "gwp.ar6")
    assert listing.exit_code == 0 and "gwp.ar6.n2o" in listing.stdout
    shown = run("factors", "show", "combustion.natural_gas.co2")
    assert "56100" in shown.stdout and "Table 2.2" in shown.stdout and "source grade: verbatim secondary" in shown.stdout
    unverified = run("factors", "show", "combustion.natural_gas.ch4")
    assert "not yet verified against the source document" in unverified.stdout
    schemes = run("schemes")
    for scheme in ("eu-rfnbo", "us-45v", "uk-lchs", "japan-hydrogen", "japan-ammonia"):
        assert scheme in schemes.stdout


@pytest.mark.parametrize("route", ["steam-methane-reforming", "steam-methane-reforming-with-capture", "autothermal-reforming-with-capture", "electrolysis"])
@pytest.mark.parametrize("product", ["ammonia", "hydrogen"])
def test_init_writes_a_project_that_scores(tmp_path, route, product):
    path = tmp_path / "new.toml"
    assert run("init", path, "--route", route, "--product", product).exit_code == 0
    assert run("score", path, "--format", "json").exit_code == 0
    before = path.read_text()
    assert_one_line_error(run("init", path, "--route", route), "--force")
    assert path.read_text() == before
    assert run("init", path, "--route", route, "--force").exit_code == 0


def project_text(**replace):
    text = GRID.read_text()
    for old, new in replace.items():
        text = text.replace(old.replace("__", " "), new)
    return text


BAD_PROJECTS = {
    "malformed TOML": ("[project\nname = 1", ["valid TOML"]),
    "unknown parameter": (project_text(**{"technology__=__\"alkaline\"": 'technology = "alkaline"\nstack_colour = "blue"'}), ["electrolysis.stack_colour", "unknown parameter"]),
    "missing value": (project_text(**{"electricity_kwh_per_kg_h2__=__52.0": ""}), ["electrolysis.electricity_kwh_per_kg_h2", "required"]),
    "shares not summing to 1": (project_text(**{"share__=__1.0": "share = 0.8"}), ["electricity", "summing to 1"]),
    "negative value": (project_text(**{"conditioning_kwh_per_kg_h2__=__1.5": "conditioning_kwh_per_kg_h2 = -1"}), ["hydrogen.conditioning_kwh_per_kg_h2", ">= 0"]),
    "below the physical floor": (project_text(**{"electricity_kwh_per_kg_h2__=__52.0": "electricity_kwh_per_kg_h2 = 35.0"}), ["electrolysis.electricity_kwh_per_kg_h2", "39.41"]),
    "unknown factor": (project_text(**{"electricity.grid.eu27_2018": "electricity.grid.atlantis"}), ["electricity.sources.grid.factor", "electricity.grid.atlantis"]),
    "unknown route": (project_text(**{'"electrolysis"': '"photosynthesis"'}), ["hydrogen.route"]),
}


@pytest.mark.parametrize("case", sorted(BAD_PROJECTS))
def test_bad_project_files(tmp_path, case):
    text, words = BAD_PROJECTS[case]
    path = tmp_path / "bad.toml"
    path.write_text(text)
    assert_one_line_error(run("score", path), str(path), *words)


def test_capture_rate_above_one(tmp_path):
    assert_one_line_error(run("score", DEMO / "blue_atr_ammonia.toml", "--set", "capture.capture_rate=1.2"), "capture.capture_rate", "<= 1")


def test_bad_options():
    assert_one_line_error(run("score", GRID, "--scheme", "moon-hydrogen"), "moon-hydrogen")
    assert_one_line_error(run("score", GRID, "--scheme", "japan-ammonia"), "japan-ammonia", "hydrogen")
    assert_one_line_error(run("score", GRID, "--gwp", "ar9"), "--gwp", "ar6")
    assert_one_line_error(run("score", GRID, "--factors", "no-such-set"), "--factors")
    assert_one_line_error(run("score", GRID, "--set", "nonsense"), "--set")
    assert_one_line_error(run("score", "missing.toml"), "missing.toml")
    assert_one_line_error(run("factors", "show", "no.such.factor"), "no.such.factor")
