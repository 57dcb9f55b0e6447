"""`carbonledger compare` and its chart, `score --boundary`, and one-line errors with exit code 2."""

import json
import os
import subprocess
import sys
import xml.etree.ElementTree as ET
from pathlib import Path

import pytest
from helpers import assessment_with
from typer.testing import CliRunner

from carbonledger.api import compare
from carbonledger.cli import app

ROOT = Path(__file__).resolve().parent.parent
DEMO = ROOT / "demo_projects"
SHIPPED = [DEMO / f"{name}.toml" for name in ("grey_smr_ammonia_shipped", "blue_atr_ammonia_shipped", "green_electrolysis_ammonia_shipped")]
CRACKED = DEMO / "green_ammonia_cracked_hydrogen.toml"
runner = CliRunner()


def run(*args):
    return runner.invoke(app, [str(a) for a in args])


def test_compare_same_product_stays_per_tonne_and_stages_sum():
    result = compare(SHIPPED, assessment=assessment_with(boundary="well-to-tank"))
    assert result.basis == "t-nh3" and result.unit == "kg CO2e/t NH3"
    for project in result.projects:
        assert project.value == pytest.approx(project.total)
        assert sum(project.by_stage.values()) == pytest.approx(project.value, rel=1e-9)
        assert sum(project.by_gas.values()) == pytest.approx(project.value, rel=1e-9)
    assert "shipping" in result.stages


def test_mixed_products_are_put_per_mj_of_lhv():
    result = compare(SHIPPED[:1] + [CRACKED], assessment=assessment_with(boundary="well-to-tank"))
    assert result.basis == "mj"
    ammonia, hydrogen = result.projects
    # Per MJ: kg CO2e/t NH3 x 1000 g/kg / (1000 kg x 18.6 MJ/kg), ammonia LHV 18.6 MJ/kg (IEA AMF)
    assert ammonia.value == pytest.approx(ammonia.total * 1000 / 18600, rel=1e-9)
    # kg CO2e/kg H2 x 1000 g/kg / 119.96 MJ/kg, hydrogen LHV (DOE HyARC)
    assert hydrogen.value == pytest.approx(hydrogen.total * 1000 / 119.96, rel=1e-9)
    assert sum(hydrogen.by_stage.values()) == pytest.approx(hydrogen.value, rel=1e-9)


def test_compare_json_and_csv_have_a_column_per_project():
    out = run("compare", *SHIPPED, "--boundary", "well-to-wake", "--format", "json")
    assert out.exit_code == 0, out.output
    data = json.loads(out.stdout)
    assert data["boundary"] == "well-to-wake" and len(data["projects"]) == 3
    assert all("end_use" in p["by_stage"] for p in data["projects"])
    assert all(p["checks"] for p in data["projects"])
    out = run("compare", *SHIPPED, "--format", "csv", "--scheme", "us-45v")
    assert out.exit_code == 0, out.output
    lines = out.stdout.splitlines()
    assert lines[0].split(",")[3:] == [p.stem for p in SHIPPED]
    assert any(line.startswith("check:us-45v,status") for line in lines)
    assert not any(line.startswith("check:eu-rfnbo") for line in lines)


def test_compare_table_names_boundary_schemes_and_caution():
    out = run("compare", *SHIPPED, CRACKED, "--boundary", "well-to-tank")
    assert out.exit_code == 0, out.output
    text = out.stdout
    assert "boundary well-to-tank" in text and "g CO2e/MJ (LHV)" in text
    assert "eu-rfnbo" in text and "Caution" in text
    assert text.count("Caution") == 1


def test_png_chart_is_valid_with_one_bar_per_project(tmp_path):
    import matplotlib.image

    from carbonledger.io.compare_output import comparison_figure

    chart = tmp_path / "c.png"
    out = run("compare", *SHIPPED, "--boundary", "well-to-tank", "--chart", chart)
    assert out.exit_code == 0, out.output
    assert chart.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"  # PNG signature (PNG specification, ISO/IEC 15948)
    assert matplotlib.image.imread(chart).ndim == 3
    figure = comparison_figure(compare(SHIPPED, assessment=assessment_with(boundary="well-to-tank")))
    axes = figure.axes[0]
    assert all(len(container.patches) == len(SHIPPED) for container in axes.containers)
    names = [score.project for score in compare(SHIPPED, assessment=assessment_with(boundary="well-to-tank")).projects]
    assert [t.get_text().replace("\n", " ") for t in axes.get_xticklabels()] == names  # each bar named by its project, in words
    assert "kg CO2e/t NH3" in axes.get_ylabel()


def test_svg_chart_is_valid_xml_with_bars_per_project_and_threshold_lines(tmp_path):
    chart = tmp_path / "c.svg"
    out = run("compare", SHIPPED[0], CRACKED, "--boundary", "well-to-tank", "--chart", chart)
    assert out.exit_code == 0, out.output
    root = ET.parse(chart).getroot()
    assert root.tag.endswith("svg")
    ids = [element.get("id") for element in root.iter() if (element.get("id") or "").startswith("bar-")]
    assert {i.split("-")[1] for i in ids} == {"0", "1"}
    text = chart.read_text()
    assert "eu-rfnbo" in text  # the 28.2 g CO2e/MJ line is drawn and labelled on a per-MJ chart


def test_chart_is_not_overwritten_without_force(tmp_path):
    chart = tmp_path / "c.png"
    chart.write_bytes(b"keep")
    out = run("compare", *SHIPPED, "--chart", chart)
    assert out.exit_code == 2 and "--force" in out.output
    assert chart.read_bytes() == b"keep"
    out = run("compare", *SHIPPED, "--chart", chart, "--force")
    assert out.exit_code == 0 and chart.read_bytes()[:4] == b"\x89PNG"


def test_score_boundary_option_and_json_keys():
    out = run("score", CRACKED, "--boundary", "well-to-wake", "--format", "json")
    assert out.exit_code == 0, out.output
    data = json.loads(out.stdout)
    for key in ("boundary", "functional_unit", "unit", "total", "by_stage", "by_gas", "checks", "non_ghg_kg", "reference_product"):
        assert key in data
    assert data["boundary"] == "well-to-wake" and data["reference_product"] == "hydrogen"
    assert data["functional_unit"].startswith("1 kg H2 delivered")
    assert sum(data["by_stage"].values()) == pytest.approx(data["total"])


def one_line_error(out, field):
    assert out.exit_code == 2, out.output
    lines = out.output.strip().splitlines()
    assert len(lines) == 1 and lines[0].startswith("error: ") and field in lines[0], out.output
    assert "Traceback" not in out.output


@pytest.mark.parametrize(
    ("setting", "field"),
    [
        ("shipping.cargo_t_per_voyage=0", "shipping.cargo_t_per_voyage"),
        ("shipping.distance_nautical_miles=-10", "shipping.distance_nautical_miles"),
        ('shipping.fuel="coal_slurry"', "shipping.fuel"),
        ('shipping.engine="steam_turbine"', "shipping.engine"),
        ("cracking.hydrogen_recovery_fraction=0", "cracking.hydrogen_recovery_fraction"),
    ],
)
def test_bad_voyage_or_cracker_is_one_line_and_exit_2(setting, field):
    project = CRACKED if setting.startswith("cracking") else DEMO / "blue_atr_ammonia_shipped.toml"
    one_line_error(run("score", project, "--set", setting), field)


def test_projects_that_cannot_share_a_basis_are_refused():
    # A hydrogen functional unit has no per-tonne-of-ammonia figure.
    one_line_error(run("compare", SHIPPED[0], CRACKED, "--boundary", "well-to-tank", "--basis", "t-nh3"), "--basis")
    # Projects left on their own, different boundaries are not compared.
    one_line_error(run("compare", DEMO / "grey_smr_ammonia.toml", SHIPPED[0]), "boundary")


def test_bad_chart_name_and_boundary_are_refused(tmp_path):
    one_line_error(run("compare", *SHIPPED, "--chart", tmp_path / "c.pdf"), "--chart")
    one_line_error(run("score", SHIPPED[0], "--boundary", "cradle-to-grave"), "cradle-to-grave")


def test_exit_code_2_from_the_installed_entry_point(tmp_path):
    out = subprocess.run(
        [sys.executable, "-m", "carbonledger", "compare", str(SHIPPED[0]), str(CRACKED), "--basis", "t-nh3", "--boundary", "well-to-tank"],
        capture_output=True, text=True, cwd=tmp_path, env=dict(os.environ),  # cwd outside the source tree: the installed package runs
    )
    assert out.returncode == 2 and out.stderr.startswith("error: ") and len(out.stderr.strip().splitlines()) == 1


_IMPORT_PROBE = """
import sys
from carbonledger.cli import main

paths = sys.argv[1:]

def run(*args):
    sys.argv = ["carbonledger", *args]
    try:
        main()
    except SystemExit as stop:
        assert not stop.code, (args, stop.code)

def loaded(*names):
    return [name for name in names if name in sys.modules]

run("--help")
print("help", loaded("bw2calc", "CoolProp", "matplotlib"), file=sys.stderr)
run("score", paths[0], "--format", "json")
print("plant gate", loaded("CoolProp", "matplotlib", "openpyxl", "formulas"), file=sys.stderr)
for path in paths[1:]:
    run("score", path, "--format", "json")
print("delivered", loaded("CoolProp", "matplotlib", "openpyxl", "formulas"), file=sys.stderr)
"""


def test_help_and_score_load_only_what_they_need_and_create_no_brightway_folder(tmp_path, _ledger_in_tmp):
    # `--help` needs neither the solver nor the chart library; no demo score needs CoolProp (the
    # latent heat of ammonia comes from chemicals' CRC table; only liquid-hydrogen legs need it),
    # nor matplotlib without a chart, nor the workbook libraries (openpyxl; formulas is test-only).
    # One real process (sys.modules of a fresh interpreter), recording in the temporary ledger,
    # with a temporary home: bw2calc solves in memory, so nothing Brightway-related may appear there.
    paths = [DEMO / "green_electrolysis_ammonia.toml", *SHIPPED, CRACKED, DEMO / "green_hydrogen_piped_and_trucked.toml"]
    home = tmp_path / "home"
    env = dict(os.environ, HOME=str(home), XDG_DATA_HOME=str(home / "data"), XDG_CACHE_HOME=str(home / "cache"))
    env.pop("BRIGHTWAY2_DIR", None)
    out = subprocess.run([sys.executable, "-c", _IMPORT_PROBE, *map(str, paths)], capture_output=True, text=True, cwd=tmp_path, env=env)
    assert out.returncode == 0, out.stderr
    lines = out.stderr.strip().splitlines()[-3:]
    assert lines == ["help []", "plant gate []", "delivered []"], out.stderr
    assert _ledger_in_tmp.exists()  # the runs went to the temporary ledger, not the user's
    assert [p for p in tmp_path.rglob("*") if "brightway" in p.name.lower()] == []


def test_compare_reads_audit_workbooks(tmp_path):
    # A workbook's inputs (here an edited methane loss rate) flow into compare, as into score.
    import openpyxl

    from carbonledger.api import score

    book_path = tmp_path / "grey.xlsx"
    assert run("workbook", DEMO / "grey_smr_ammonia.toml", "-o", book_path).exit_code == 0
    book = openpyxl.load_workbook(book_path)
    inputs = book["Inputs"]
    for row in inputs.iter_rows():
        if row[0].value == "natural_gas.methane_emission_share":
            row[1].value = 0.02
    book.save(book_path)
    result = compare([DEMO / "blue_atr_ammonia.toml", book_path])
    expected = score(DEMO / "grey_smr_ammonia.toml", assessment_with(overrides=["natural_gas.methane_emission_share=0.02"]))
    assert result.projects[1].total == pytest.approx(expected.total, rel=1e-12)
    assert run("compare", DEMO / "blue_atr_ammonia.toml", "--from-workbook", book_path).exit_code == 0


def test_compare_chart_shows_monthly_matched_and_unmatched_energy_of_projects_with_a_series(tmp_path):
    """Hand calculation. Four hours across a month end (local time +01:00), load 100 kWh each,
    solar 150, 0 (31 January), 60, 0 kWh (1 February), no wind. Matched hour by hour (the UK
    standard's 30-minute units; an hourly series is matched per interval): January 100 of 200 kWh,
    February 60 of 200 kWh, 160 of 400 in all. Matched by month (EU RFNBO until 2029,
    Delegated Regulation (EU) 2023/1184 Art. 6): January min(200, 150) = 150, February 60, 210 of 400.
    The chart shows the strictest matching in the comparison: the hourly one."""
    from carbonledger.io.compare_output import monthly_matching
    from tests.test_matching import PROJECT

    (tmp_path / "p.toml").write_text(PROJECT, encoding="utf-8")
    stamps = ["2026-01-31T22:00+01:00", "2026-01-31T23:00+01:00", "2026-02-01T00:00+01:00", "2026-02-01T01:00+01:00"]
    rows = "".join(f"{stamp},100,{solar},0\n" for stamp, solar in zip(stamps, (150, 0, 60, 0), strict=True))
    (tmp_path / "series.csv").write_text("timestamp,electrolyser [kWh],generation.solar [kWh],generation.wind [kWh]\n" + rows, encoding="utf-8")
    result = compare([tmp_path / "p.toml", DEMO / "grid_electrolysis_hydrogen.toml"])
    scheme, months, by_project = monthly_matching(result)
    assert scheme == "uk-lchs" and months == ["2026-01", "2026-02"]
    assert by_project == {"p": ([100.0, 60.0], [100.0, 140.0])}  # the grid project has no series: not in the panel
    rfnbo = next(c for c in result.projects[0].checks if c.scheme == "eu-rfnbo").electricity_matching
    assert [m.matched_kwh for m in rfnbo.monthly] == [150.0, 60.0]
    chart = tmp_path / "c.svg"
    out = run("compare", tmp_path / "p.toml", DEMO / "grid_electrolysis_hydrogen.toml", "--chart", chart, "--format", "csv")
    assert out.exit_code == 0, out.output
    ids = {element.get("id") for element in ET.parse(chart).getroot().iter()}
    assert {"matched-0-2026-01", "unmatched-0-2026-02"} <= ids
    assert "check:uk-lchs,matched_share,fraction,0.4," in out.output  # 160 / 400


def test_the_verdict_row_gives_each_checks_status_not_a_bare_pass_or_fail():
    # Natural gas reforming is not a renewable fuel of non-biological origin (Directive (EU) 2018/2001
    # Art. 2 as amended by 2023/2413): the blue demo's eu-rfnbo verdict is "not eligible", never "FAIL".
    out = run("compare", DEMO / "blue_atr_ammonia.toml", DEMO / "green_electrolysis_ammonia.toml", "--format", "csv", "--scheme", "eu-rfnbo")
    assert out.exit_code == 0, out.output
    row = next(line for line in out.stdout.splitlines() if line.startswith("check:eu-rfnbo,status"))
    blue, green = row.split(",")[3:5]
    assert blue == "not eligible"
    assert green in ("qualifies", "fails", "undetermined")
