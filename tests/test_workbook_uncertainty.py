"""The audit workbook's Uncertainty sheet and the draws CSV beside it (`workbook --draws`).

Expected values are hand calculations named beside each assertion (the linear chain of
tests/test_uncertainty.py: total = electricity kWh/kg x grid factor g/kWh / 1000; the mean and
variance of a product of independent normal variables, Goodman (1960), JASA 55, 708-713; the
standard normal distribution function, Phi(-0.4) = 0.3446 from any statistical table).
The project is an invented test case.
"""

from __future__ import annotations

import csv

import numpy as np
import openpyxl
import pytest

from tests.helpers import assert_one_line_error, run_cli, write
from tests.test_uncertainty import LINEAR

UNCERTAIN = """
[uncertainty.parameters."electrolysis.electricity_kwh_per_kg_h2"]
distribution = "normal"
mean = 50.0
sd = 2.0

[uncertainty.factors."electricity.grid.eu27_2018"]
distribution = "normal"
mean = 84.0
sd = 10.0
"""


def labelled(ws) -> dict:
    return {row[0].value: row[1:] for row in ws.iter_rows() if isinstance(row[0].value, str)}


def test_the_uncertainty_sheet_holds_the_distributions_and_the_summary(tmp_path):
    project = write(tmp_path / "linear.toml", LINEAR + UNCERTAIN)
    out = tmp_path / "linear.xlsx"
    result = run_cli("workbook", project, "-o", out, "--draws", "40000", "--seed", "4", "--scheme", "us-45v", "--no-ledger")
    assert result.exit_code == 0, result.output
    assert not (tmp_path / "linear.draws.csv").exists()  # draws only on request
    ws = openpyxl.load_workbook(out)["Uncertainty"]
    rows = labelled(ws)
    assert rows["Draws"][0].value == 40000 and rows["Seed (the same seed gives the same numbers)"][0].value == 4
    assert rows["parameter electrolysis.electricity_kwh_per_kg_h2"][0].value == "normal"
    assert rows["factor electricity.grid.eu27_2018"][1].value == "mean 84; sd 10"
    mean, std, p5, p50, p95, standard_error = (cell.value for cell in rows["Total per functional unit"][:6])
    # Goodman (1960): mean 50 x 84 / 1000 = 4.2; variance (50^2 10^2 + 84^2 2^2 + 2^2 10^2) / 1000^2 = 0.278624
    assert mean == pytest.approx(4.2, abs=4 * np.sqrt(0.278624 / 40000))
    assert std**2 == pytest.approx(0.278624, rel=0.03)
    assert p5 < p50 < p95 and standard_error == pytest.approx(np.sqrt(0.278624 / 40000), rel=0.03)
    check = next(row for label, row in rows.items() if label.startswith("us-45v"))
    limit, unit, probability, error = check[0].value, check[1].value, check[5].value, check[6].value
    assert (limit, unit) == (4, "kg CO2e/kg H2")
    # value ~ N(4.2, 0.5279^2) approximately; P(value <= 4.0) = Phi(-0.2 / 0.52785) = Phi(-0.3789) = 0.3524
    assert probability == pytest.approx(0.3524, abs=0.01)
    assert error == pytest.approx(np.sqrt(0.3524 * 0.6476 / 40000), rel=0.05)


def test_the_draws_csv_holds_every_draw_and_each_total_is_the_hand_product(tmp_path):
    project = write(tmp_path / "linear.toml", LINEAR + UNCERTAIN)
    out = tmp_path / "linear.xlsx"
    result = run_cli("workbook", project, "-o", out, "--draws", "500", "--draws-csv", "--no-ledger")
    assert result.exit_code == 0, result.output
    rows = list(csv.reader((tmp_path / "linear.draws.csv").open(encoding="utf-8")))
    header, body, last = rows[0], rows[1:-1], rows[-1]
    assert last[0] == "caution"
    assert len(body) == 500 and [int(row[0]) for row in body] == list(range(1, 501))
    kwh, factor, total = (header.index(name) for name in ("parameter electrolysis.electricity_kwh_per_kg_h2", "factor electricity.grid.eu27_2018", "total (kg CO2e/kg H2)"))
    for row in body:
        # linear chain: total = kWh/kg x g/kWh / 1000 (kg CO2e/kg H2)
        assert float(row[total]) == pytest.approx(float(row[kwh]) * float(row[factor]) / 1000, rel=1e-9)
    assert openpyxl.load_workbook(out)["Uncertainty"]["B12"].value == "linear.draws.csv"


def test_an_existing_draws_csv_is_left_untouched_without_force(tmp_path):
    project = write(tmp_path / "linear.toml", LINEAR + UNCERTAIN)
    out = tmp_path / "linear.xlsx"
    kept = write(tmp_path / "linear.draws.csv", "someone's own file\n")
    result = run_cli("workbook", project, "-o", out, "--draws", "100", "--draws-csv", "--no-ledger")
    assert_one_line_error(result)
    assert "the draws CSV exists; pass --force" in result.stderr
    assert kept.read_text(encoding="utf-8") == "someone's own file\n" and not out.exists()
    again = run_cli("workbook", project, "-o", out, "--draws", "100", "--draws-csv", "--force", "--no-ledger")
    assert again.exit_code == 0, again.output
    assert kept.read_text(encoding="utf-8").startswith("draw,used,")


def test_draws_csv_without_draws_is_refused(tmp_path):
    project = write(tmp_path / "linear.toml", LINEAR + UNCERTAIN)
    result = run_cli("workbook", project, "-o", tmp_path / "x.xlsx", "--draws-csv", "--no-ledger")
    assert_one_line_error(result)
    assert "--draws" in result.stderr and not (tmp_path / "x.xlsx").exists()


def test_a_workbook_without_draws_has_no_uncertainty_sheet(tmp_path):
    project = write(tmp_path / "linear.toml", LINEAR + UNCERTAIN)
    out = tmp_path / "plain.xlsx"
    assert run_cli("workbook", project, "-o", out, "--no-ledger").exit_code == 0
    assert "Uncertainty" not in openpyxl.load_workbook(out).sheetnames
