"""Operating plan: the linear program against brute force and a greedy optimum, and the plan scored back."""

from __future__ import annotations

import numpy as np
import pytest
from helpers import assessment_with

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
    before = {c.scheme: c for c in api.score(tmp_path / "p.toml", assessment=assessment_with(matching="hour")).checks}
    assert not before["eu-rfnbo"].passes  # running flat out fails hourly, so the plan has work to do
    result = run_cli("plan", tmp_path / "p.toml", "--scheme", "eu-rfnbo", "--matching", "hour", "--min-load", "0.2", "-o", tmp_path / "plan.csv")
    assert result.exit_code == 0, result.output
    after = api.score(tmp_path / "p.toml", assessment=assessment_with(overrides=[f"electricity.time_series={tmp_path / 'plan.csv'}"], matching="hour", schemes=["eu-rfnbo"])).checks[0]
    # under the limit hour by hour (this bare project declares no procurement, so the verdict waits on those rules)
    assert after.value <= after.limit and after.status != "fails" and after.electricity_matching.load_kwh > 0
    again = run_cli("plan", tmp_path / "p.toml", "--scheme", "eu-rfnbo", "-o", tmp_path / "plan.csv")
    assert_one_line_error(again)  # an existing plan is not overwritten without --force
    # monthly matching with the grid's hourly intensity: the bilinear case, solved by repeated passes
    monthly = run_cli("plan", tmp_path / "p.toml", "--scheme", "us-45v", "--tier", "0.45", "--matching", "month", "-o", tmp_path / "month.csv")
    assert monthly.exit_code == 0, monthly.output
    check = api.score(tmp_path / "p.toml", assessment=assessment_with(overrides=[f"electricity.time_series={tmp_path / 'month.csv'}"], matching="month", schemes=["us-45v"])).checks[0]
    # under the 100 % tier's limit, less than 0.45 kg CO2e/kg H2 (26 U.S.C. 45V(b)(2)(D)); the tier is
    # named only when the verdict qualifies, and this bare project declares no construction date
    assert check.value < 0.45 and check.status != "fails"



def test_part_load_plan_values_the_curves_own_kwh_per_kg():
    """A two-hour case worked by hand. Hour 1: 100 kWh of solar; hour 2: grid only at 300 g/kWh.
    Curve (0.5, 50 kWh/kg), (1.0, 55 kWh/kg) of a 100 kW plant with a 0.5 minimum load: 1 kg at
    50 kWh, 20/11 kg at 100 kWh, so h = 9/550 p + 2/11 between. MODEL counts nothing but
    electricity (value_declared 5 = 50 kWh/kg x 0.1 kg/kWh), so the scheme value of a plan is its
    emissions over its hydrogen, E / H, at the kWh/kg the curve gives (not the design 50).
    With a limit of 6: 0.3 p2 <= 6 (20/11 + 9/550 p2 + 2/11), so p2 = 12 / (0.3 - 54/550) = 59.459 kWh."""
    series = series_of([100.0, 0.0], [300.0, 300.0])
    plan = plan_load(series, MODEL, rulebooks()["us-45v"], value_declared=5.0, limit=6.0, granularity="hour", rated_kw=100.0, min_load=0.5, part_load=[(0.5, 50.0), (1.0, 55.0)])
    p2 = 12.0 / (0.3 - 54.0 / 550.0)
    assert plan.load_kwh == pytest.approx([100.0, p2], rel=1e-5)
    hydrogen = 20.0 / 11.0 + 9.0 / 550.0 * p2 + 2.0 / 11.0
    assert plan.hydrogen_kg.sum() == pytest.approx(hydrogen, rel=1e-5)
    assert plan.value == pytest.approx(0.3 * p2 / hydrogen, rel=1e-5) and plan.value == pytest.approx(6.0, rel=1e-5)
    assert plan.qualifies and plan.kwh_per_kg_h2 == pytest.approx((100.0 + p2) / hydrogen, rel=1e-5)
    # at the design 50 kWh/kg the same loads would be valued 5 + 50 (0.3 p2 / (100 + p2) - 0.1) = 5.59: not what the plant does
    assert abs(plan.value - (5.0 + 50.0 * (0.3 * p2 / (100.0 + p2) - 0.1))) > 0.3


def test_part_load_plan_scored_back_at_its_own_kwh_per_kg_qualifies(tmp_path):
    import json

    rng = np.random.default_rng(5)
    rows = []
    for number, stamp in enumerate(stamps("2026-05-01T00:00", 48)):
        hour = number % 24
        solar = max(0.0, np.sin(np.pi * (hour - 6) / 12)) * 160 * rng.uniform(0.3, 1)
        rows.append([stamp, 100, round(solar, 3), round(rng.uniform(0, 40), 3), round(200 + 80 * np.cos(np.pi * hour / 12), 3)])
    (tmp_path / "p.toml").write_text(PROJECT, encoding="utf-8")
    write_series(tmp_path, rows, "timestamp,electrolyser [kWh],generation.solar [kWh],generation.wind [kWh],grid_intensity [g CO2e/kWh]")
    result = run_cli("plan", tmp_path / "p.toml", "--scheme", "eu-rfnbo", "--matching", "hour", "--min-load", "0.3", "--part-load", "0.3:47,0.6:48,1:52", "-o", tmp_path / "plan.csv", "--format", "json")
    assert result.exit_code == 0, result.output
    figures = json.loads(result.output)
    assert figures["value"] <= figures["limit"] and figures["kwh_per_kg_h2"] != pytest.approx(figures["design_kwh_per_kg_h2"])
    # the plan meets the threshold, but the bare project declares no procurement: the one judgement says undetermined,
    # as score does (not "qualifies")
    assert figures["status"] == "undetermined" and not figures["qualifies"] and "procure" in figures["deciding_reason"]
    # the project has no conditioning electricity, so the electrolysis parameter is the plan's own kWh/kg
    assert figures["score_back_set"] == [f"electrolysis.electricity_kwh_per_kg_h2={figures['kwh_per_kg_h2']:.12g}"]
    overrides = [f"electricity.time_series={tmp_path / 'plan.csv'}", *figures["score_back_set"]]
    after = api.score(tmp_path / "p.toml", assessment=assessment_with(overrides=overrides, matching="hour", schemes=["eu-rfnbo"])).checks[0]
    assert after.margin >= 0 and after.status != "fails"  # threshold met; the bare project declares no procurement
    assert after.value == pytest.approx(figures["value"], rel=1e-6)  # score reads the plan back to the plan's own value
