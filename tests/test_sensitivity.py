"""Sensitivity: Sobol indices against the closed form of a linear case, tornado against hand arithmetic.

Closed form (Sobol 2001; Saltelli et al. 2010): for Y = c1 X1 + c2 X2 with independent inputs,
S_i = ST_i = c_i^2 Var(X_i) / (c1^2 Var(X1) + c2^2 Var(X2)); a uniform input on [a, b] has
Var = (b - a)^2 / 12. The project below is an invented test case.
"""

from __future__ import annotations

import json

import pytest

from carbonledger import api
from tests.helpers import assert_one_line_error, run_cli, write

# INVENTED: 50 kWh/kg H2, half grid and half wind, so the total (kg CO2e/kg H2) is
# 50 x (0.5 F_grid + 0.5 F_wind) / 1000: linear in the two factors, with equal coefficients.
LINEAR = """
[project]
name = "Sobol linear test (invented)"
product = "hydrogen"

[hydrogen]
route = "electrolysis"

[electrolysis]
technology = "alkaline"
electricity_kwh_per_kg_h2 = 50.0

[electricity.sources.grid]
share = 0.5
factor = "electricity.grid.eu27_2018"

[electricity.sources.wind]
share = 0.5
factor = "electricity.renewable.wind_onshore"

[uncertainty.factors."electricity.grid.eu27_2018"]
distribution = "uniform"
low = 200.0
high = 360.0

[uncertainty.factors."electricity.renewable.wind_onshore"]
distribution = "uniform"
low = 5.0
high = 85.0
"""


def test_sobol_indices_of_a_linear_case_match_the_closed_form(tmp_path):
    project = write(tmp_path / "linear.toml", LINEAR)
    result = api.sensitivity(project, base_sample=4096, seed=1)
    indices = {item.input: item for item in result.sobol}
    grid, wind = indices["factor electricity.grid.eu27_2018"], indices["factor electricity.renewable.wind_onshore"]
    # Var(grid) = 160^2 / 12 = 2133.3, Var(wind) = 80^2 / 12 = 533.3, equal coefficients:
    # S_grid = 2133.3 / (2133.3 + 533.3) = 0.8, S_wind = 0.2; no interaction, so ST = S.
    assert grid.first_order == pytest.approx(0.8, abs=0.05)
    assert wind.first_order == pytest.approx(0.2, abs=0.05)
    assert grid.total_order == pytest.approx(0.8, abs=0.05)
    assert wind.total_order == pytest.approx(0.2, abs=0.05)


def test_tornado_moves_each_input_to_its_10th_and_90th_percentile(tmp_path):
    project = write(tmp_path / "linear.toml", LINEAR)
    result = api.sensitivity(project, base_sample=64)
    grid = next(bar for bar in result.tornado if bar.input == "factor electricity.grid.eu27_2018")
    # uniform on [200, 360]: 10th percentile 216, 90th 344 (g CO2e/kWh)
    assert grid.low_input == pytest.approx(216.0) and grid.high_input == pytest.approx(344.0)
    # swing = 50 x 0.5 x (344 - 216) / 1000 = 3.2 kg CO2e/kg H2
    assert grid.swing == pytest.approx(3.2, rel=1e-9)
    assert result.tornado[0].input == "factor electricity.grid.eu27_2018"


def test_sensitivity_command_writes_a_chart_with_the_limit(tmp_path):
    project = write(tmp_path / "linear.toml", LINEAR)
    chart = tmp_path / "sensitivity.svg"
    result = run_cli("sensitivity", project, "--scheme", "us-45v", "--base-sample", "64", "--chart", chart, "--format", "json")
    assert result.exit_code == 0, result.output
    data = json.loads(result.stdout)
    assert data["limit"] == 4.0 and data["figure"] == "us-45v"
    assert "us-45v limit" in chart.read_text()
    again = run_cli("sensitivity", project, "--base-sample", "64", "--chart", chart)
    assert_one_line_error(again)
    assert_one_line_error(run_cli("sensitivity", project, "--base-sample", "100"))
