"""Operating plan: the linear program against brute force and a greedy optimum, and the plan scored back."""

from __future__ import annotations

import numpy as np
import pytest

from carbonledger import api
from carbonledger.analyses.electricity_series import ElectricitySeries
from carbonledger.analyses.matching import ElectricityModel
from carbonledger.analyses.plan import parse_part_load, part_load_segments, plan_load
from carbonledger.core.scoring import rulebooks
from carbonledger.errors import InputError
from tests.helpers import assert_one_line_error, run_cli
from tests.test_matching import PROJECT, stamps, write_series

KWH_PER_KG = 50.0
# value = 5.0 + 50 (c - 0.1): a limit of 4.0 caps the counted electricity at c <= 0.08 kg CO2e/kWh
MODEL = ElectricityModel(basis_kwh=KWH_PER_KG, kwh_per_kg_h2=KWH_PER_KG, counted_kg_per_kwh={"solar": 0.0, "wind": 0.0}, declared_kg_per_kwh=0.1, grid_kg_per_kwh=0.3, value_per_total=1.0, eligible=["solar", "wind"])
CAP = 0.08


def series_of(solar, grid_g, start="2026-06-01T00:00"):
    n = len(solar)
    utc = np.datetime64(start, "m") + np.arange(n) * np.timedelta64(60, "m")
    return ElectricitySeries("test", utc, np.zeros(n, dtype=np.int64), 60, np.zeros(n), None, {"solar": np.asarray(solar, float)}, np.asarray(grid_g, float), None)


def solve(series, **options):
    scheme = rulebooks()["us-45v"]  # renewable at zero
    return plan_load(series, MODEL, scheme, value_declared=5.0, limit=4.0, granularity="hour", **options)


def hourly_emissions(load, solar, grid_g):
    """Independent of the plan code: unmatched energy of each hour at its grid intensity (kg)."""
    return (load - np.minimum(load, solar)) @ (np.asarray(grid_g) / 1000.0)


def test_plan_against_brute_force_with_minimum_stable_load():
    solar = np.array([0.0, 40.0, 90.0, 120.0, 10.0])
    grid = np.array([400.0, 250.0, 150.0, 300.0, 90.0])
    rated, least = 100.0, 0.3
    plan = solve(series_of(solar, grid), rated_kw=rated, min_load=least)
    levels = [0.0] + [rated * f for f in np.arange(0.3, 1.0001, 0.05)]
    # every combination of levels at once (16^5 rows): the same unmatched-energy sum as hourly_emissions
    loads = np.stack(np.meshgrid(*[levels] * len(solar), indexing="ij"), axis=-1).reshape(-1, len(solar))
    emissions = (loads - np.minimum(loads, solar)) @ (grid / 1000.0)
    totals = loads.sum(axis=1)
    best = totals[emissions <= CAP * totals + 1e-12].max()
    planned = plan.load_kwh
    # the plan respects the operating range and qualifies, and produces at least the best grid point
    assert all(p == pytest.approx(0.0, abs=1e-7) or least * rated - 1e-7 <= p <= rated + 1e-7 for p in planned)
    assert hourly_emissions(planned, solar, grid) <= CAP * planned.sum() + 1e-7
    assert planned.sum() >= best - 1e-6
    assert plan.hydrogen_kg.sum() == pytest.approx(planned.sum() / KWH_PER_KG)
    assert plan.qualifies and plan.value <= 4.0 + 1e-9


def greedy_day(solar, grid_g, rated):
    """Fractional knapsack, an exact optimum for hourly matching without a minimum load: fill the
    cheapest kWh first (generation at zero, then grid kWh by intensity) while the average stays under the cap."""
    blocks = []
    for g_t, s_t in zip(np.asarray(grid_g) / 1000.0, solar, strict=False):
        matched = min(rated, s_t)
        blocks += [(0.0, matched), (g_t, rated - matched)]
    blocks.sort()
    budget, energy = 0.0, 0.0
    for cost, kwh in blocks:
        slack = CAP - cost
        if slack >= 0:
            budget += slack * kwh
            energy += kwh
    for cost, kwh in blocks:
        slack = CAP - cost
        if slack < 0:
            take = min(kwh, budget / -slack)
            energy += take
            budget -= take * -slack
            if take < kwh:
                break
    return energy


def test_part_load_plan_yields_the_curves_hydrogen():
    solar = np.array([100.0, 100.0, 100.0])
    plan = solve(series_of(solar, [300.0, 300.0, 300.0]), rated_kw=100.0, min_load=0.2, part_load=[(0.2, 60.0), (0.5, 50.0), (1.0, 52.0)])
    # all solar, so full load every hour: 100 kWh / 52 kWh/kg = 1.923 kg an hour
    assert plan.hydrogen_kg == pytest.approx([100 / 52.0] * 3)


def test_plan_for_a_day_equals_the_greedy_optimum():
    rng = np.random.default_rng(7)
    hour = np.arange(24)
    solar = np.clip(np.sin(np.pi * (hour - 6) / 12), 0, None) * 140 * rng.uniform(0.5, 1, 24)
    grid = 250 + 120 * np.cos(np.pi * hour / 12) + rng.normal(0, 20, 24)
    plan = solve(series_of(solar, grid), rated_kw=100.0)
    # the plan keeps a hair (1e-6) inside the cap against solver tolerances
    assert plan.load_kwh.sum() == pytest.approx(greedy_day(solar, grid, 100.0), rel=1e-5)
    assert plan.load_kwh.sum() <= greedy_day(solar, grid, 100.0) * (1 + 1e-9)


def test_part_load_curve_must_be_concave():
    # output through (0.2, 60 kWh/kg), (0.5, 50), (1.0, 52) kWh/kg: 0.333 kg, 1.0 kg, 1.923 kg at 20, 50, 100 kWh;
    # marginal 0.0222 then 0.0185 kg/kWh: falling, concave above the minimum load
    slopes, intercepts, least = part_load_segments([(0.2, 60.0), (0.5, 50.0), (1.0, 52.0)], 100.0)
    assert least == 0.2 and slopes == pytest.approx([(1.0 - 20 / 60) / 30, (100 / 52 - 1.0) / 50])
    with pytest.raises(InputError):  # from zero load: 1/60 kg/kWh, then 0.0222: rising, not concave
        part_load_segments([(0.2, 60.0), (0.5, 50.0), (1.0, 52.0)], 100.0, through_origin=True)
    assert parse_part_load("0.2:60,1:52") == [(0.2, 60.0), (1.0, 52.0)]


def test_the_plan_scored_back_qualifies(tmp_path):
    rng = np.random.default_rng(3)
    count = 72
    rows = []
    for number, stamp in enumerate(stamps("2026-05-01T00:00", count)):
        hour = number % 24
        solar = max(0.0, np.sin(np.pi * (hour - 6) / 12)) * 160 * rng.uniform(0.3, 1)
        rows.append([stamp, 100, round(solar, 3), round(rng.uniform(0, 40), 3), round(200 + 80 * np.cos(np.pi * hour / 12), 3)])
    (tmp_path / "p.toml").write_text(PROJECT, encoding="utf-8")
    write_series(tmp_path, rows, "timestamp,electrolyser [kWh],generation.solar [kWh],generation.wind [kWh],grid_intensity [g CO2e/kWh]")
    before = {c.scheme: c for c in api.score(tmp_path / "p.toml", matching="hour").checks}
    assert not before["eu-rfnbo"].passes  # running flat out fails hourly, so the plan has work to do
    result = run_cli("plan", tmp_path / "p.toml", "--scheme", "eu-rfnbo", "--matching", "hour", "--min-load", "0.2", "-o", tmp_path / "plan.csv")
    assert result.exit_code == 0, result.output
    after = api.score(tmp_path / "p.toml", overrides=[f"electricity.time_series={tmp_path / 'plan.csv'}"], matching="hour", schemes=["eu-rfnbo"]).checks[0]
    # under the limit hour by hour (this bare project declares no procurement, so the verdict waits on those rules)
    assert after.value <= after.limit and after.status != "fails" and after.electricity_matching.load_kwh > 0
    again = run_cli("plan", tmp_path / "p.toml", "--scheme", "eu-rfnbo", "-o", tmp_path / "plan.csv")
    assert_one_line_error(again)  # an existing plan is not overwritten without --force
    # monthly matching with the grid's hourly intensity: the bilinear case, solved by repeated passes
    monthly = run_cli("plan", tmp_path / "p.toml", "--scheme", "us-45v", "--tier", "0.45", "--matching", "month", "-o", tmp_path / "month.csv")
    assert monthly.exit_code == 0, monthly.output
    check = api.score(tmp_path / "p.toml", overrides=[f"electricity.time_series={tmp_path / 'month.csv'}"], matching="month", schemes=["us-45v"]).checks[0]
    # under the 100 % tier's limit, less than 0.45 kg CO2e/kg H2 (26 U.S.C. 45V(b)(2)(D)); the tier is
    # named only when the verdict qualifies, and this bare project declares no construction date
    assert check.value < 0.45 and check.status != "fails"
