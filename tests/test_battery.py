"""A battery in the electricity section (``[electricity.battery]``): its delivery displaces the other
sources and its round-trip losses are bought from the charging source. Checked against arithmetic
written out by hand, the factor rows as published (IPCC AR5 WGIII Annex III median for onshore wind,
11 g CO2e/kWh; EEA indicator for the EU-27 2018 grid, 281 g CO2e/kWh), and a hand-written linear program.
Every battery figure is invented for the tests."""

from __future__ import annotations

import pytest
from helpers import assessment_with
from scipy.optimize import linprog

from carbonledger import api
from tests.helpers import DEMO, assert_one_line_error, run_cli, write

WIND_G, GRID_G = 11.0, 281.0  # g CO2e/kWh: the two factor rows' published values (see the module text)
KWH_PER_KG = 52.0 + 1.5  # the test project's electrolysis and conditioning, kWh/kg H2

PROJECT = """[project]
name = "Battery test (invented)"
product = "hydrogen"

[hydrogen]
route = "electrolysis"
conditioning_kwh_per_kg_h2 = 1.5

[electrolysis]
technology = "alkaline"
electricity_kwh_per_kg_h2 = 52.0

[electricity.sources.grid]
share = 0.6
factor = "electricity.grid.eu27_2018"
procurement = "grid"

[electricity.sources.wind]
share = 0.4
factor = "electricity.renewable.wind_onshore"
procurement = "ppa"
"""
BATTERY = """
[electricity.battery]
charged_from = "wind"
capacity_kwh = 40000
full_cycles_per_year = 300
round_trip_efficiency = 0.8
electricity_kwh_per_year = 60000000
"""


def test_a_battery_worked_by_hand(tmp_path):
    # By hand: the battery delivers 40,000 kWh x 300 cycles = 12 GWh of the plant's 60 GWh, a share of 0.2.
    # Wind is bought 0.4 + 0.2 / 0.8 = 0.65 kWh per kWh used (0.05 of it round-trip losses); the grid
    # supplies 0.6 x (1 - 0.4 - 0.2) / 0.6 = 0.4. Electricity bought: 1.05 kWh per kWh used.
    # Electricity per kg H2: 53.5 x (0.65 x 11 + 0.4 x 281) / 1000 = 6.395925 kg CO2e/kg H2.
    project = write(tmp_path / "battery.toml", PROJECT + BATTERY)
    with_battery = api.score(project)
    assert with_battery.total == pytest.approx(KWH_PER_KG * (0.65 * WIND_G + 0.4 * GRID_G) / 1000, rel=1e-12)
    assert with_battery.total == pytest.approx(6.395925, rel=1e-12)
    without = api.score(write(tmp_path / "plain.toml", PROJECT))
    assert without.total == pytest.approx(KWH_PER_KG * (0.4 * WIND_G + 0.6 * GRID_G) / 1000, rel=1e-12)
    # a battery of efficiency 1 delivering the same share is the wind share moved to 0.6 (no losses)
    lossless = api.score(project, assessment=assessment_with(overrides=["electricity.battery.round_trip_efficiency=1"]))
    moved = api.score(write(tmp_path / "moved.toml", PROJECT.replace("share = 0.6", "share = 0.4").replace("share = 0.4\nfactor = \"electricity.renewable", "share = 0.6\nfactor = \"electricity.renewable")))
    assert lossless.total == pytest.approx(moved.total, rel=1e-12)
    # losses raise the electricity bought: a lower efficiency never lowers the total
    worse = api.score(project, assessment=assessment_with(overrides=["electricity.battery.round_trip_efficiency=0.5"]))
    assert worse.total > with_battery.total


@pytest.mark.parametrize(
    ("change", "field"),
    [
        ("round_trip_efficiency = 0.8", "electricity.battery.round_trip_efficiency"),  # removed: no default
        ("round_trip_efficiency = 0", "electricity.battery.round_trip_efficiency"),
        ("round_trip_efficiency = 1.2", "electricity.battery.round_trip_efficiency"),
        ("capacity_kwh = -1", "electricity.battery.capacity_kwh"),
        ('charged_from = "wnd"', "electricity"),
        ("capacity_kwh = 200000", "electricity"),  # delivers 1.0 > the grid's 0.6
    ],
)
def test_bad_batteries_are_one_line(tmp_path, change, field):
    key = change.split(" = ")[0]
    lines = [line for line in BATTERY.splitlines() if not line.startswith(key + " ")]
    text = "\n".join(lines) + ("\n" if change == "round_trip_efficiency = 0.8" else f"\n{change}\n")
    project = write(tmp_path / "battery.toml", PROJECT + text)
    result = run_cli("score", project, "--no-ledger")
    assert_one_line_error(result)
    assert str(project) in result.stderr and f": {field}" in result.stderr


def test_a_battery_with_a_time_series_is_refused(tmp_path):
    text = (DEMO / "hybrid_hourly_hydrogen.toml").read_text().split("# Invented ranges")[0]
    project = write(tmp_path / "hourly.toml", text.replace('time_series = "hybrid_hourly_hydrogen_2026.csv"', f'time_series = "{DEMO / "hybrid_hourly_hydrogen_2026.csv"}"') + BATTERY)
    result = run_cli("score", project, "--no-ledger")
    assert_one_line_error(result)
    assert "time_series" in result.stderr


LEVERS = """currency = "JPY"
period = "year"
schemes = ["japan-hydrogen"]
invented = true

[[levers]]
parameter = "electricity.sources.wind_ppa.share"
range = [0.0, 0.95]
cost = { per_unit = 400_000_000 }

[[levers]]
parameter = "electricity.battery.capacity_kwh"
range = [0.0, 80_000]
cost = { per_unit = 1_000 }

[battery]
charged_from = "wind_ppa"
full_cycles_per_year = 300
round_trip_efficiency = 0.85
electricity_kwh_per_year = 80_000_000

[sources.wind_ppa]
factor = "electricity.renewable.wind_onshore"
procurement = "ppa"
commissioned = 2027-03-01
zone = "VENNOR-1"
supported = false
"""


def test_a_battery_lever_equals_a_hand_written_linear_program(tmp_path):
    # Check: on the grid electrolysis demo (52 + 1.5 kWh/kg H2 from the EU-27 grid), a wind PPA share w
    # and a battery of capacity C charged from it (300 cycles a year, efficiency 0.85, 80 GWh a year:
    # delivered share d = 300 C / 8e7) give, by hand, Japan's value
    #   53.5 x [11 (w + d / 0.85) + 281 (1 - w - d)] / 1000  kg CO2e/kg H2
    # (wind bought w + d / 0.85, grid 1 - w - d <= 1 - w). Costs (invented): 400 million JPY per unit of
    # w, 1,000 JPY per kWh of capacity a year. The cheapest answer is the optimum of this linear program
    # (limit 3.4 kg CO2e/kg H2 as the shipped rulebook states it), solved by HiGHS.
    levers = write(tmp_path / "levers.toml", LEVERS)
    found = api.qualify(DEMO / "grid_electrolysis_hydrogen.toml", levers, budgets=0)
    k = 300 / 8e7
    a_w = KWH_PER_KG * (WIND_G - GRID_G) / 1000
    a_c = KWH_PER_KG * k * (WIND_G / 0.85 - GRID_G) / 1000
    lp = linprog([4e8, 1_000], A_ub=[[a_w, a_c], [1.0, k]], b_ub=[3.4 - KWH_PER_KG * GRID_G / 1000, 1.0], bounds=[(0, 0.95), (0, 80_000)], method="highs")
    assert lp.status == 0 and lp.x[1] > 0  # the battery is worth buying at these invented prices
    assert found.status == "qualifies"
    assert found.levers["electricity.sources.wind_ppa.share"] == pytest.approx(lp.x[0], abs=1e-6)
    assert found.levers["electricity.battery.capacity_kwh"] == pytest.approx(lp.x[1], abs=1e-2)
    assert found.total_cost == pytest.approx(lp.fun, rel=1e-6)
    assert "electricity.battery.capacity_kwh=80000.0" in found.score_back_set
