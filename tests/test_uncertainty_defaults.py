"""Uncertainty and sensitivity on any project: default distributions from the factor rows' source grades,
and the one-at-a-time swing of every input by +-x %.

The default GSD of each grade is checked against the pedigree formula in its published form (Weidema et
al. 2013, ecoinvent Report 1 (v3); after Weidema and Wesnaes 1996): sigma^2 = ln(basic GSD)^2 + sum of
the variances the five scores add, GSD = exp(sigma), with the variances of factors/uncertainty/pedigree.toml
typed out below (recorded FROM MEMORY of the report's table, as that file says). The grade -> scores
mapping itself is this project's assumption, and the outputs must say so. The swing is worked by hand on
the shipped grid electrolysis demo (invented plant), whose total is linear in the grid factor.
"""

from __future__ import annotations

import csv
import io
import json
import math

import pytest
from helpers import assessment_with

from carbonledger import api
from carbonledger.model.factors import factors_root
from carbonledger.model.pedigree import grade_defaults
from tests.helpers import DEMO, assert_one_line_error, run_cli, write
from tests.test_uncertainty import LINEAR

# variance of ln(value) added by score 1..5 (Weidema et al. 2013, from memory; factors/uncertainty/pedigree.toml)
RELIABILITY = (0.0, 0.0006, 0.002, 0.008, 0.04)
COMPLETENESS_2, TEMPORAL_3, GEOGRAPHICAL_3, TECHNOLOGICAL_3 = 0.0001, 0.002, 0.0001, 0.008
BASIC = math.log(1.05) ** 2  # 0.00238048


@pytest.mark.parametrize(
    "grade, reliability, gsd",
    [
        # sigma^2 = 0.00238048 + 0.0006 + 0.0001 + 0.002 + 0.0001 + 0.008 = 0.01318048; exp(sqrt(.)) = 1.121656
        ("primary text", 2, 1.121656),
        ("verbatim secondary", 2, 1.121656),
        # reliability 3 adds 0.002: sigma^2 = 0.01458048, GSD 1.128342
        ("secondary", 3, 1.128342),
        # reliability 4 adds 0.008: sigma^2 = 0.02058048, GSD 1.154259
        ("not yet verified", 4, 1.154259),
        # reliability 5 adds 0.04: sigma^2 = 0.05258048, GSD 1.257725
        ("invented", 5, 1.257725),
    ],
)
def test_the_default_gsd_of_each_grade_follows_the_pedigree_formula(grade, reliability, gsd, tmp_path):
    mapping = grade_defaults(factors_root())
    assert mapping.scores[grade] == (reliability, 2, 3, 3, 3) and mapping.basic_gsd[grade] == 1.05
    by_hand = math.exp(math.sqrt(BASIC + RELIABILITY[reliability - 1] + COMPLETENESS_2 + TEMPORAL_3 + GEOGRAPHICAL_3 + TECHNOLOGICAL_3))
    assert by_hand == pytest.approx(gsd, abs=1e-6)
    project, override = write_linear_with_grade(grade, tmp_path)
    result = api.uncertainty(project, draws=20, seed=1, assessment=assessment_with(factors=str(override)))
    (item,) = result.inputs
    assert item.distribution["gsd"] == pytest.approx(gsd, abs=1e-6) and grade in item.default
    assert "assumption" in mapping.basis and "not a published" in mapping.basis and mapping.from_memory


def write_linear_with_grade(grade: str, folder):
    """LINEAR (50 kWh/kg H2 of EU-27 2018 grid electricity) with the grid row re-graded in an override CSV."""
    row = f'electricity.grid.eu27_2018,281,g CO2e/kWh,"European Environment Agency, indicator IND-353",Key assessment text,2018,EU-27,copy of the shipped row re-graded for a test,{grade}'
    override = write(folder / "graded.csv", "id,value,unit,source,table,year,region,note,grade\n" + row + "\n")
    return write(folder / "linear.toml", LINEAR), override


def test_a_project_without_distributions_runs_on_the_defaults_and_names_them(monkeypatch):
    """The shipped blue ATR demo has no [uncertainty] table: 500 draws run, and table, JSON and CSV name
    every default (which input, which distribution, from which grade, and that the mapping is an assumption)."""
    project = DEMO / "blue_atr_ammonia.toml"
    as_json = run_cli("uncertainty", project, "--draws", "500", "--format", "json", "--no-ledger")
    assert as_json.exit_code == 0, as_json.output
    data = json.loads(as_json.stdout)
    assert data["draws"] == 500 and data["draws_used"] > 0
    named = {item["input"]: item for item in data["inputs"]}
    assert "factor electricity.grid.eu27_2018" in named and "factor combustion.natural_gas.co2" in named
    assert all(item["default"].startswith("default of the source grade") and item["distribution"]["distribution"] == "pedigree" for item in named.values())
    assert named["factor electricity.grid.eu27_2018"]["distribution"]["scores"] == [2, 2, 3, 3, 3]  # graded primary text
    assert not any(name.startswith(("factor gwp.", "factor heating_value.")) for name in named)  # held fixed
    assert "carbonledger's assumption" in data["default_basis"] and "Weidema" in data["default_basis"]
    monkeypatch.setenv("COLUMNS", "250")  # one line per input in the table
    table = run_cli("uncertainty", project, "--draws", "500", "--no-ledger")
    assert table.exit_code == 0 and "gsd 1.12166 [default of the source grade 'primary text'] †" in table.stdout
    assert "mapping: carbonledger's assumption (common practice), not a published mapping" in table.stdout and "grade_defaults.toml" in table.stdout
    as_csv = run_cli("uncertainty", project, "--draws", "500", "--format", "csv", "--no-ledger")
    rows = [row for row in csv.reader(io.StringIO(as_csv.stdout)) if row and row[0] == "input"]
    assert ["input", "factor electricity.grid.eu27_2018", "scores", "(2,2,3,3,3)", ""] in rows
    assert any(row[1] == "factor electricity.grid.eu27_2018" and row[2] == "default" and "'primary text'" in row[3] for row in rows)


def test_the_default_of_one_factor_gives_the_lognormal_by_hand(tmp_path):
    """LINEAR alone: total = 50 kWh/kg x F / 1000 with F lognormal, median 281 g CO2e/kWh (the row's value),
    GSD 1.121656 (primary text, above): median 14.05 kg CO2e/kg H2, 95th percentile 14.05 x 1.121656^1.644854 = 16.89."""
    result = api.uncertainty(write(tmp_path / "linear.toml", LINEAR), draws=40_000, seed=3)
    assert [item.input for item in result.inputs] == ["factor electricity.grid.eu27_2018"]
    assert result.total.p50 == pytest.approx(14.05, rel=0.005)
    assert result.total.p95 == pytest.approx(14.05 * 1.121656**1.644854, rel=0.01)


def test_stated_distributions_get_no_grade_defaults(tmp_path):
    """Once a run states a distribution, only it (and rows with pedigree scores) is drawn."""
    stated = LINEAR + '\n[uncertainty.parameters."electrolysis.electricity_kwh_per_kg_h2"]\ndistribution = "uniform"\nlow = 45.0\nhigh = 55.0\n'
    result = api.uncertainty(write(tmp_path / "stated.toml", stated), draws=50)
    assert [item.input for item in result.inputs] == ["parameter electrolysis.electricity_kwh_per_kg_h2"] and result.default_basis == ""


def test_the_swing_of_a_linear_dependence_by_hand():
    """Grid electrolysis demo: total = (52 + 1.5) kWh/kg H2 x 281 g CO2e/kWh / 1000 = 15.0335 kg CO2e/kg H2
    (electrolyser and conditioning, all grid; EU-27 2018 factor, EEA IND-353). The total is linear in the
    factor, so +10 % on it moves the total by exactly 0.1 x 53.5 x 0.281 = 1.50335 kg CO2e/kg H2, and -10 %
    by -1.50335; +10 % on the electrolyser's 52 kWh/kg moves it by 0.1 x 52 x 0.281 = 1.4612, on the
    conditioning's 1.5 kWh/kg by 0.04215. A scheme in g CO2e/MJ divides by the LHV of hydrogen,
    119.96 MJ/kg: 1.50335 / 119.96 x 1000 = 12.5321 g CO2e/MJ."""
    result = api.sensitivity(DEMO / "grid_electrolysis_hydrogen.toml", base_sample=16, swing=10.0)
    swing = result.swing
    assert swing.percent == 10.0 and swing.base["total"] == pytest.approx(53.5 * 0.281, rel=1e-12)
    bars = {bar.input: bar for bar in swing.bars}
    grid = bars["factor electricity.grid.eu27_2018"].figures
    total = next(f for f in grid if f.figure == "total")
    assert total.change_plus == pytest.approx(0.1 * 53.5 * 0.281, rel=1e-9) and total.change_minus == pytest.approx(-0.1 * 53.5 * 0.281, rel=1e-9)
    rfnbo = next(f for f in grid if f.figure == "eu-rfnbo")
    assert rfnbo.unit == "g CO2e/MJ" and rfnbo.change_plus == pytest.approx(0.1 * 53.5 * 0.281 / 119.96 * 1000, rel=1e-9)
    electrolyser = next(f for f in bars["parameter electrolysis.electricity_kwh_per_kg_h2"].figures if f.figure == "total")
    assert electrolyser.change_plus == pytest.approx(0.1 * 52 * 0.281, rel=1e-9)
    conditioning = next(f for f in bars["parameter hydrogen.conditioning_kwh_per_kg_h2"].figures if f.figure == "total")
    assert conditioning.change_plus == pytest.approx(0.1 * 1.5 * 0.281, rel=1e-9)
    assert swing.bars[0].input == "factor electricity.grid.eu27_2018"  # the largest change first
    assert "parameter electrolysis.operating_temperature_c" in swing.unmoved  # an alkaline cell ignores it
    assert "gwp.ar6.co2" in swing.held_fixed and "parameter electricity.sources.grid.share" not in bars  # a sole source's share cannot move


def test_a_swing_past_a_physical_limit_gives_no_figure_and_bad_percentages_are_one_line(tmp_path):
    """Blue ATR demo: capture rate 0.95 x 1.1 = 1.045 is above 1 (a fraction): no figure at +10 %; at -10 %
    (0.855) the total rises. --swing must be above 0 and below 100 per cent."""
    result = run_cli("sensitivity", DEMO / "blue_atr_ammonia.toml", "--base-sample", "8", "--scheme", "us-45v", "--format", "json", "--no-ledger")
    assert result.exit_code == 0, result.output
    bars = {bar["input"]: bar for bar in json.loads(result.stdout)["swing"]["bars"]}
    capture = bars["parameter capture.capture_rate"]["figures"][0]
    assert capture["at_plus"] is None and capture["change_plus"] is None and capture["change_minus"] > 0
    for bad in ("0", "100", "-5"):
        assert_one_line_error(run_cli("sensitivity", DEMO / "grid_electrolysis_hydrogen.toml", "--swing", bad, "--no-ledger"))
