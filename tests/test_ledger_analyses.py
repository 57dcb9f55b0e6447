"""The run ledger records uncertainty, headroom, sensitivity and plan runs (and the workbook's Monte Carlo).

What is checked: each run leaves one record of its kind with the project's sha256, the factor
rows it read (the shipped EU-27 2018 grid row, 281 g CO2e/kWh, EEA indicator IND-353) and a
compact summary; `history` shows them in every format. The project is an invented test case.
"""

from __future__ import annotations

import csv
import io
import json

from carbonledger.io.ledger import project_history
from tests.helpers import run_cli, write
from tests.test_matching import PROJECT, day_rows, write_series
from tests.test_uncertainty import LINEAR

UNCERTAIN = """
[uncertainty.factors."electricity.grid.eu27_2018"]
distribution = "normal"
mean = 281.0
sd = 20.0
"""


def test_uncertainty_headroom_and_sensitivity_runs_are_recorded(tmp_path, _ledger_in_tmp):
    project = write(tmp_path / "linear.toml", LINEAR + UNCERTAIN)
    assert run_cli("uncertainty", project, "--draws", "300", "--seed", "8", "--format", "json").exit_code == 0
    assert run_cli("headroom", project, "--parameter", "hydrogen.conditioning_kwh_per_kg_h2", "--parameter", "electrolysis.electricity_kwh_per_kg_h2", "--scheme", "us-45v", "--format", "json").exit_code == 0
    assert run_cli("sensitivity", project, "--base-sample", "8", "--format", "json").exit_code == 0
    assert run_cli("uncertainty", project, "--draws", "300", "--no-ledger").exit_code == 0  # not recorded
    runs = project_history(project, _ledger_in_tmp)
    assert [entry["kind"] for entry in runs] == ["uncertainty", "headroom", "sensitivity"]
    assert [entry["command"] for entry in runs] == ["uncertainty", "headroom", "sensitivity"]
    mc, room, sobol = (entry["results"] for entry in runs)
    assert mc["draws"] == 300 and mc["seed"] == 8 and mc["inputs"] == ["factor electricity.grid.eu27_2018"]
    assert {"scheme", "probability_qualifies", "standard_error", "p5", "p95"} <= set(mc["checks"][0])
    assert room["scheme"] == "us-45v" and [p["parameter"] for p in room["parameters"]] == ["hydrogen.conditioning_kwh_per_kg_h2", "electrolysis.electricity_kwh_per_kg_h2"]
    assert sobol["figure"] == "total" and sobol["sobol"][0]["input"] == "factor electricity.grid.eu27_2018"
    for entry in runs:
        assert entry["project_sha256"] and entry["factor_set"] == "default-2026"
        grid = next(row for row in entry["factors_used"] if row["id"] == "electricity.grid.eu27_2018")
        assert grid["value"] == 281.0  # EEA IND-353, EU-27 2018
        assert entry["parameters"]["electrolysis"]["electricity_kwh_per_kg_h2"] == 50.0


def test_history_shows_analysis_records_in_every_format(tmp_path, _ledger_in_tmp):
    project = write(tmp_path / "linear.toml", LINEAR + UNCERTAIN)
    assert run_cli("score", project).exit_code == 0
    assert run_cli("uncertainty", project, "--draws", "200").exit_code == 0
    assert run_cli("headroom", project, "--parameter", "electrolysis.electricity_kwh_per_kg_h2", "--scheme", "us-45v").exit_code == 0
    table = run_cli("history", project)
    assert table.exit_code == 0, table.output
    assert "Monte Carlo, 200 draws, seed 20261202" in table.stdout and "headroom under us-45v" in table.stdout
    as_json = run_cli("history", project, "--format", "json")
    assert [r["kind"] for r in json.loads(as_json.stdout)["records"]] == ["score", "uncertainty", "headroom"]
    as_csv = run_cli("history", project, "--format", "csv")
    assert as_csv.exit_code == 0, as_csv.output
    kinds = {row["kind"] for row in csv.DictReader(io.StringIO(as_csv.stdout)) if row["record"] != "caution"}
    assert kinds == {"score", "uncertainty"}  # a headroom record has no scheme checks to list


def test_the_workbook_records_its_monte_carlo(tmp_path, _ledger_in_tmp):
    project = write(tmp_path / "linear.toml", LINEAR + UNCERTAIN)
    assert run_cli("workbook", project, "-o", tmp_path / "w.xlsx", "--draws", "200").exit_code == 0
    assert [(e["command"], e["kind"]) for e in project_history(project, _ledger_in_tmp)] == [("workbook", "score"), ("workbook", "uncertainty")]


def test_plan_is_recorded_and_history_lists_it(tmp_path, _ledger_in_tmp):
    """Issue 19 point 6: plan is recorded in the ledger (CARBONLEDGER_LEDGER, set by the fixture) like report and pack."""
    project = write(tmp_path / "p.toml", PROJECT)
    write_series(tmp_path, day_rows())
    result = run_cli("plan", project, "--scheme", "eu-rfnbo", "--matching", "hour", "-o", tmp_path / "plan.csv")
    assert result.exit_code == 0, result.output
    assert run_cli("plan", project, "--scheme", "eu-rfnbo", "-o", tmp_path / "other.csv", "--no-ledger").exit_code == 0  # not recorded
    runs = project_history(project, _ledger_in_tmp)
    assert [(entry["command"], entry["kind"]) for entry in runs] == [("plan", "plan")]
    figures = runs[0]["results"]
    assert figures["scheme"] == "eu-rfnbo" and figures["matching"] == "hour" and figures["output"] == str(tmp_path / "plan.csv")
    assert runs[0]["parameters"]["electrolysis"]["electricity_kwh_per_kg_h2"] == 50.0  # the project as read
    history = run_cli("history", project)
    assert history.exit_code == 0, history.output
    assert "  plan  [plan]" in history.stdout and "operating plan for eu-rfnbo" in history.stdout
