"""`compare --draws`: each project's Monte Carlo band (5th to 95th percentile) and probability of
qualifying, in the table, JSON, CSV and as error bars on the chart.

Expected values are hand calculations: total = electricity kWh/kg x grid factor g/kWh / 1000 with
the grid factor normal, so the total is normal with mean and standard deviation scaled by
kWh/1000; its percentiles are mean +- 1.644854 sd (standard normal table, z(0.95) = 1.644854), and
P(total <= 4.0) = Phi((4.0 - 4.2) / 0.5) = Phi(-0.4) = 0.3446. The projects are invented test cases.
"""

from __future__ import annotations

import csv
import io
import json

import pytest

from tests.helpers import assert_one_line_error, run_cli, write
from tests.test_uncertainty import LINEAR

GRID = '\n[uncertainty.factors."electricity.grid.eu27_2018"]\ndistribution = "normal"\nmean = {mean}\nsd = {sd}\n'


def projects(tmp_path):
    first = write(tmp_path / "fifty.toml", LINEAR + GRID.format(mean=400.0, sd=40.0))
    second = write(tmp_path / "forty.toml", LINEAR.replace("electricity_kwh_per_kg_h2 = 50.0", "electricity_kwh_per_kg_h2 = 40.0") + GRID.format(mean=105.0, sd=12.5))
    plain = write(tmp_path / "plain.toml", LINEAR)
    return first, second, plain


def test_bands_match_the_normal_percentiles_and_a_project_without_distributions_gets_the_defaults(tmp_path):
    first, second, plain = projects(tmp_path)
    result = run_cli("compare", first, second, plain, "--draws", "40000", "--scheme", "us-45v", "--format", "json", "--no-ledger")
    assert result.exit_code == 0, result.output
    data = json.loads(result.stdout)
    a, b, c = (p["uncertainty"] for p in data["projects"])
    # fifty: 50 x N(400, 40) / 1000 = N(20, 2): p5 = 20 - 1.644854 x 2 = 16.7103, p95 = 23.2897
    assert a["p5"] == pytest.approx(16.7103, rel=0.01) and a["p95"] == pytest.approx(23.2897, rel=0.01)
    assert a["p50"] == pytest.approx(20.0, rel=0.005) and a["draws"] == 40000 and a["seed"] == 20261202
    # forty: 40 x N(105, 12.5) / 1000 = N(4.2, 0.5); P(<= 4.0 kg, the loosest 45V tier) = Phi(-0.4) = 0.3446
    assert b["p5"] == pytest.approx(4.2 - 1.644854 * 0.5, rel=0.01) and b["p95"] == pytest.approx(4.2 + 1.644854 * 0.5, rel=0.01)
    assert b["probability_qualifies"]["us-45v"] == pytest.approx(0.3446, abs=4 * b["standard_error"]["us-45v"])
    assert a["probability_qualifies"]["us-45v"] == 0.0  # N(20, 2) is never under 4 (z = -8)
    # plain states no distribution: its one factor row (EU-27 2018 grid, graded primary text) gets the default of
    # its grade, pedigree (2,2,3,3,3) with basic GSD 1.05, GSD 1.12166 (tests/test_uncertainty_defaults.py by hand),
    # and the note names it: median 50 x 281 / 1000 = 14.05 kg CO2e/kg H2
    assert c["inputs"] == ["factor electricity.grid.eu27_2018"] and c["p50"] == pytest.approx(14.05, rel=0.005)
    assert c["p95"] == pytest.approx(14.05 * 1.12166**1.644854, rel=0.01)
    assert "source grades" in data["projects"][2]["uncertainty_note"] and "electricity.grid.eu27_2018" in data["projects"][2]["uncertainty_note"]


def test_table_and_csv_show_the_band(tmp_path):
    first, second, _ = projects(tmp_path)
    table = run_cli("compare", first, second, "--draws", "2000", "--scheme", "us-45v", "--no-ledger")
    assert table.exit_code == 0, table.output
    assert "5th percentile" in table.stdout and "95th percentile" in table.stdout and "us-45v qualifies" in table.stdout
    as_csv = run_cli("compare", first, second, "--draws", "2000", "--scheme", "us-45v", "--format", "csv", "--no-ledger")
    rows = {(r["section"], r["key"]): r for r in csv.DictReader(io.StringIO(as_csv.stdout))}
    low, high = float(rows[("uncertainty", "p5")]["forty"]), float(rows[("uncertainty", "p95")]["forty"])
    assert low == pytest.approx(3.3776, rel=0.03) and high == pytest.approx(5.0224, rel=0.03)  # 4.2 -+ 1.644854 x 0.5
    assert ("check:us-45v", "probability_qualifies") in rows


def test_the_chart_draws_error_bars(tmp_path):
    first, second, _ = projects(tmp_path)
    chart = tmp_path / "bands.svg"
    result = run_cli("compare", first, second, "--draws", "1000", "--chart", chart, "--no-ledger")
    assert result.exit_code == 0, result.output
    text = chart.read_text(encoding="utf-8")
    assert 'id="uncertainty-bands"' in text and "5th to 95th percentile" in text


def test_without_draws_there_is_no_band_and_distributions_alone_are_refused(tmp_path):
    first, second, _ = projects(tmp_path)
    plain = run_cli("compare", first, second, "--format", "json", "--no-ledger")
    assert all(p["uncertainty"] is None for p in json.loads(plain.stdout)["projects"])
    refused = run_cli("compare", first, second, "--distributions", first, "--no-ledger")
    assert_one_line_error(refused)
