"""Headroom: the parameter value at which a scheme's limit is met exactly, against hand calculations.

The scheme limits are those of the rulebooks in factors/schemes (US 26 U.S.C. 45V tiers of
4.0 and 0.45 kg CO2e/kg H2; Japan's hydrogen criterion 3.4 kg CO2e/kg H2). The grid factor
value is read from the factor set (an input, not a result); the arithmetic is written out.
"""

from __future__ import annotations

import json

import pytest

from carbonledger import api
from carbonledger.model.factors import load_factor_set
from tests.helpers import DEMO, assert_one_line_error, run_cli, write

# INVENTED test project: 50 kWh/kg H2 of electricity, half grid and half solar, nothing else.
MIX = """
[project]
name = "Headroom test (invented)"
product = "hydrogen"

[hydrogen]
route = "electrolysis"

[electrolysis]
technology = "alkaline"
electricity_kwh_per_kg_h2 = 50.0

[electricity.sources.grid]
share = 0.5
factor = "electricity.grid.eu27_2018"

[electricity.sources.solar]
share = 0.5
factor = "electricity.renewable.solar_pv_utility"
"""


def factor(factor_id: str) -> float:
    return load_factor_set("default-2026").get(factor_id).value


def test_grid_share_headroom_equals_the_hand_calculation(tmp_path):
    project = write(tmp_path / "mix.toml", MIX)
    grid = factor("electricity.grid.eu27_2018")  # g CO2e/kWh
    result = run_cli("headroom", project, "--parameter", "electricity.sources.grid.share", "--scheme", "us-45v", "--format", "json")
    assert result.exit_code == 0, result.output
    data = json.loads(result.stdout)
    # 45V counts renewable electricity at zero, so value = 50 kWh x s x grid / 1000 (kg CO2e/kg H2);
    # the loosest tier is 4.0 kg: s = 4.0 x 1000 / (50 x grid)
    assert data["value"] == pytest.approx(4.0 * 1000 / (50 * grid), rel=1e-9)
    assert data["qualifies_when"] == "below"
    assert data["relative_difference"] <= 1e-6
    # the 100 % tier, 0.45 kg: s = 0.45 x 1000 / (50 x grid)
    tight = api.headroom(project, ["electricity.sources.grid.share"], "us-45v", tier="100 % of the credit (below 0.45 kg)")[0]
    assert tight.value == pytest.approx(0.45 * 1000 / (50 * grid), rel=1e-9)


def test_lifecycle_scheme_counts_the_other_source_as_the_share_moves(tmp_path):
    project = write(tmp_path / "mix.toml", MIX)
    grid, solar = factor("electricity.grid.eu27_2018"), factor("electricity.renewable.solar_pv_utility")
    found = api.headroom(project, ["electricity.sources.grid.share"], "japan-hydrogen")[0]
    # Japan counts every source at its life-cycle factor: 50 (s grid + (1 - s) solar) / 1000 = 3.4
    # -> s = (3.4 x 1000 / 50 - solar) / (grid - solar)
    assert found.value == pytest.approx((3.4 * 1000 / 50 - solar) / (grid - solar), rel=1e-9)


def test_no_value_in_range_gives_null_and_a_reason():
    result = run_cli("headroom", DEMO / "grey_smr_ammonia.toml", "--parameter", "natural_gas.methane_emission_share", "--scheme", "japan-ammonia", "--format", "json")
    data = json.loads(result.stdout)
    assert data["value"] is None and "no value in the physical range" in data["reason"]


def test_several_parameters_make_a_table_and_bad_ones_one_line():
    arguments = ("headroom", DEMO / "blue_atr_ammonia.toml", "--scheme", "eu-rfnbo", "--parameter", "capture.capture_rate", "--parameter", "natural_gas.methane_emission_share")
    table = run_cli(*arguments)
    assert table.exit_code == 0 and "capture.capture_rate" in table.stdout and "natural_gas.methane_emission_share" in table.stdout
    assert_one_line_error(run_cli("headroom", DEMO / "blue_atr_ammonia.toml", "--scheme", "eu-rfnbo", "--parameter", "capture.nothing"))
    assert_one_line_error(run_cli("headroom", DEMO / "blue_atr_ammonia.toml", "--scheme", "eu-rfnbo", "--parameter", "capture.applies_to"))
    assert_one_line_error(run_cli("headroom", DEMO / "blue_atr_ammonia.toml", "--scheme", "us-45v", "--tier", "no such tier", "--parameter", "capture.capture_rate"))
