"""Electricity time series and temporal matching: hand-worked example, rule dates, properties, bad series."""

from __future__ import annotations

import datetime as dt

import numpy as np
import pytest
from helpers import assessment_with
from hypothesis import given, settings
from hypothesis import strategies as st

from carbonledger import api
from carbonledger.analyses.matching import ElectricityModel, counted_intensity, match, scheme_granularity
from carbonledger.core.scoring import rulebooks
from carbonledger.core.verdicts import Period
from carbonledger.routes.project import load_project
from tests.helpers import DEMO, assert_one_line_error, run_cli

PROJECT = """
[project]
name = "Test hybrid (invented)"
product = "hydrogen"

[hydrogen]
route = "electrolysis"

[electrolysis]
technology = "pem"
electricity_kwh_per_kg_h2 = 50.0

[electricity]
time_series = "series.csv"

[electricity.sources.grid]
share = 0.25
factor = "electricity.grid.eu27_2018"

[electricity.sources.solar]
share = 0.2
factor = "electricity.renewable.solar_pv_utility"

[electricity.sources.wind]
share = 0.55
factor = "electricity.renewable.wind_onshore"
"""


def hours(start: str, count: int, step_minutes: int = 60) -> np.ndarray:
    return np.datetime64(start, "m") + np.arange(count) * np.timedelta64(step_minutes, "m")


def stamps(start_utc: str, count: int, offset_hours: int = 1, step_minutes: int = 60) -> list[str]:
    local = hours(start_utc, count, step_minutes) + np.timedelta64(offset_hours * 60, "m")
    return [f"{str(t)[:16]}+{offset_hours:02d}:00" for t in local]


def write_series(folder, rows: list[list], header: str = "timestamp,electrolyser [kWh],generation.solar [kWh],generation.wind [kWh]"):
    path = folder / "series.csv"
    path.write_text(header + "\n" + "\n".join(",".join(str(v) for v in row) for row in rows) + "\n", encoding="utf-8")
    return path


def day_rows(load=100.0, solar=20.0, wind=55.0, count=48, start="2026-03-01T00:00"):
    return [[s, load, solar, wind] for s in stamps(start, count)]


# ---- a 24-interval example with the arithmetic written out by hand -------------------------

LOAD = np.full(24, 10.0)  # 10 kWh every hour: 240 kWh
SOLAR = np.where((np.arange(24) >= 8) & (np.arange(24) <= 15), 20.0, 0.0)  # hours 8-15: 20 kWh -> 160 kWh
WIND = np.where(np.arange(24) <= 3, 5.0, 0.0)  # hours 0-3: 5 kWh -> 20 kWh
GRID = np.where(np.arange(24) < 12, 300.0, 100.0)  # g CO2e/kWh: 300 before noon, 100 after
ZERO_RATED = ElectricityModel(1.0, 50.0, {"solar": 0.0, "wind": 0.0, "grid": 0.281}, 0.0, 0.281, 1.0, ["solar", "wind"])


def test_24_hours_matched_by_hand():
    utc = hours("2026-06-01T00:00", 24)
    supply = {"solar": SOLAR, "wind": WIND}
    hourly = match(LOAD, supply, ["solar", "wind"], "hour", utc)
    # hours 0-3: min(10, 5) = 5 each -> 20 kWh from wind; hours 8-15: min(10, 20) = 10 each -> 80 kWh from solar
    assert hourly.matched_kwh == pytest.approx(100.0)
    assert hourly.matched_by_source_kwh == pytest.approx({"solar": 80.0, "wind": 20.0})
    assert hourly.matched_share == pytest.approx(100.0 / 240.0)
    # unmatched, at the hour's grid intensity: hours 0-3 5 kWh x 300 = 6,000 g; hours 4-7 10 x 300 x 4 = 12,000 g;
    # hours 16-23 10 x 100 x 8 = 8,000 g; total 26,000 g over 240 kWh = 108.33 g/kWh
    load, matched, unmatched, kg_per_kwh = counted_intensity(hourly, LOAD, ZERO_RATED, GRID)
    assert (load, matched, unmatched) == pytest.approx((240.0, 100.0, 140.0))
    assert kg_per_kwh * 1000 == pytest.approx(26000.0 / 240.0)
    monthly = match(LOAD, supply, ["solar", "wind"], "month", utc)
    # one period: min(240, 180) = 180 kWh; solar 160, wind 20; unmatched 60 kWh, 2.5 kWh in every hour:
    # 2.5 x (12 x 300 + 12 x 100) = 12,000 g over 240 kWh = 50 g/kWh
    assert monthly.matched_kwh == pytest.approx(180.0)
    assert monthly.matched_by_source_kwh == pytest.approx({"solar": 160.0, "wind": 20.0})
    assert counted_intensity(monthly, LOAD, ZERO_RATED, GRID)[3] * 1000 == pytest.approx(50.0)
    # only wind eligible, hourly: 20 kWh
    assert match(LOAD, supply, ["wind"], "hour", utc).matched_kwh == pytest.approx(20.0)


def test_quarter_hours_aggregate_exactly_to_the_hour():
    utc = hours("2026-06-01T00:00", 8, 15)
    load = np.full(8, 2.5)  # 10 kWh per hour
    solar = np.array([0.0, 0.0, 10.0, 0.0, 1.0, 1.0, 1.0, 1.0])  # hour 1: 10 kWh, hour 2: 4 kWh
    assert match(load, {"solar": solar}, ["solar"], "hour", utc).matched_kwh == pytest.approx(10.0 + 4.0)
    # at the quarter hour: min(2.5, 0) x 2 + min(2.5, 10) + 0 + 1 x 4 = 6.5 kWh
    assert match(load, {"solar": solar}, ["solar"], "interval", utc).matched_kwh == pytest.approx(6.5)


# ---- rule dates --------------------------------------------------------------------------


def test_rule_dates_come_from_the_rulebooks_in_the_assessment_year():
    books = rulebooks()
    # Delegated Regulation (EU) 2023/1184 Art. 6: same calendar month until 31 December 2029, same hour from 1 January 2030
    assert scheme_granularity(books["eu-rfnbo"], Period.year(2029)) == "month"
    assert scheme_granularity(books["eu-rfnbo"], Period.year(2030)) == "hour"
    # the low-carbon methodology applies the same correlation rules (Delegated Regulation (EU) 2025/2359)
    assert scheme_granularity(books["eu-low-carbon"], Period.year(2030)) == "hour"
    # 45V final regulations (January 2025): annual matching through 2029, hourly from 2030
    assert scheme_granularity(books["us-45v"], Period.year(2029)) == "year"
    assert scheme_granularity(books["us-45v"], Period.year(2030)) == "hour"
    # a period that spans a change of rule is matched under the finer rule
    assert scheme_granularity(books["eu-rfnbo"], Period(dt.date(2029, 7, 1), dt.date(2030, 6, 30))) == "hour"
    # Japan's criteria set no temporal rule: one annual period
    assert scheme_granularity(books["japan-hydrogen"], Period.year(2030)) == "year"


def test_a_series_is_a_profile_matched_under_the_rule_of_the_assessment_year():
    # a 2026 series assessed in 2031 is matched hour by hour (2023/1184 Art. 6, second subparagraph): its own dates
    # do not choose the rule. Two hours of one month: all of the use in hour 1, all generation in hour 2.
    utc = hours("2026-03-01T00:00", 2)
    load, solar = np.array([10.0, 0.0]), np.array([0.0, 10.0])
    hourly = match(load, {"solar": solar}, ["solar"], scheme_granularity(rulebooks()["eu-rfnbo"], Period.year(2031)), utc)
    monthly = match(load, {"solar": solar}, ["solar"], scheme_granularity(rulebooks()["eu-rfnbo"], Period.year(2029)), utc)
    assert hourly.matched_kwh == 0.0 and monthly.matched_kwh == 10.0


# ---- properties ----------------------------------------------------------------------------

ORDER = ("interval", "hour", "month", "quarter", "year")
energies = st.lists(st.floats(min_value=0, max_value=1e4, allow_nan=False), min_size=1, max_size=1)


@settings(max_examples=60, deadline=None)
@given(st.integers(min_value=8, max_value=400), st.integers(min_value=0, max_value=2**31), st.sampled_from([15, 30, 60]), st.floats(min_value=0.0, max_value=3.0))
def test_proportional_load_and_supply_match_the_same_at_every_granularity(count, seed, step, ratio):
    rng = np.random.default_rng(seed)
    utc = hours("2026-12-30T00:00", count, step)
    load = rng.uniform(0, 100, count)
    split = rng.uniform(0, 1)
    supply = {"solar": load * ratio * split, "wind": load * ratio * (1 - split)}
    shares = [match(load, supply, ["solar", "wind"], g, utc).matched_kwh for g in ORDER]
    assert shares == pytest.approx([min(1.0, ratio) * load.sum()] * len(ORDER), rel=1e-9, abs=1e-9)


@settings(max_examples=80, deadline=None)
@given(st.integers(min_value=2, max_value=600), st.integers(min_value=0, max_value=2**31), st.sampled_from([15, 30, 60]))
def test_a_finer_granularity_never_matches_more(count, seed, step):
    # min(a + b, c + d) >= min(a, c) + min(b, d): periods nest (interval in hour in month in quarter in year)
    rng = np.random.default_rng(seed)
    utc = hours("2026-03-31T20:00", count, step)
    load = rng.uniform(0, 100, count) * (rng.uniform(size=count) > 0.2)
    supply = {"solar": rng.uniform(0, 150, count) * (rng.uniform(size=count) > 0.5), "wind": rng.uniform(0, 60, count)}
    matched = [match(load, supply, ["solar", "wind"], g, utc).matched_kwh for g in ORDER]
    assert all(fine <= coarse + 1e-9 for fine, coarse in zip(matched, matched[1:], strict=False))
    assert matched[-1] <= load.sum() + 1e-9


# ---- through the project file --------------------------------------------------------------


def test_a_project_without_series_scores_exactly_as_before():
    path = DEMO / "grid_electrolysis_hydrogen.toml"
    project, sha = load_project(path)
    from carbonledger.analyses.pipeline import assess
    from carbonledger.core.assessment import Assessment
    from carbonledger.model.factors import load_factor_set

    before = assess(Assessment(load_factor_set("default-2026")), project, source=str(path), project_sha256=sha)
    after = api.score(path)
    assert after.model_dump() == before.model_dump()
    assert all(check.electricity_matching is None for check in after.checks)


def test_a_series_at_the_declared_shares_in_every_hour_gives_the_declared_values(tmp_path):
    # load 100, solar 20, wind 55 every hour = the declared shares 0.2 and 0.55; no grid intensity column,
    # so unmatched energy counts at the grid factor: every granularity must reproduce the annual-average check
    (tmp_path / "p.toml").write_text(PROJECT, encoding="utf-8")
    write_series(tmp_path, day_rows())
    result = api.score(tmp_path / "p.toml")
    for check in result.checks:
        matching = check.electricity_matching
        assert matching.matched_share == pytest.approx(0.75)
        assert check.value == pytest.approx(matching.value_with_declared_shares, rel=1e-12)


def test_hydrogen_kg_is_turned_into_electricity_with_the_projects_kwh_per_kg(tmp_path):
    (tmp_path / "p.toml").write_text(PROJECT, encoding="utf-8")
    rows = [[s, 2.0, 20.0, 55.0] for s in stamps("2026-03-01T00:00", 24)]
    write_series(tmp_path, rows, "timestamp,hydrogen [kg],generation.solar [kWh],generation.wind [kWh]")
    check = api.score(tmp_path / "p.toml").checks[0]
    # 2 kg x 50 kWh/kg = 100 kWh an hour (electrolysis.electricity_kwh_per_kg_h2 = 50, no conditioning)
    assert check.electricity_matching.load_kwh == pytest.approx(24 * 100.0)


def test_demo_hourly_project_fails_hourly_and_passes_monthly():
    monthly = {c.scheme: c for c in api.score(DEMO / "hybrid_hourly_hydrogen.toml").checks}
    assert monthly["eu-rfnbo"].electricity_matching.granularity == "month"  # 2026: monthly rule
    # under the limit with monthly matching (the verdict may still wait on a rule the value cannot show) ...
    assert monthly["eu-rfnbo"].value <= monthly["eu-rfnbo"].limit and monthly["eu-rfnbo"].status != "fails"
    hourly = {c.scheme: c for c in api.score(DEMO / "hybrid_hourly_hydrogen.toml", assessment=assessment_with(matching="hour")).checks}
    assert hourly["eu-rfnbo"].electricity_matching.matched_share < monthly["eu-rfnbo"].electricity_matching.matched_share
    # ... over it hour by hour, and so it fails
    assert hourly["eu-rfnbo"].value > hourly["eu-rfnbo"].limit and hourly["eu-rfnbo"].status == "fails"


# ---- bad series: one line naming file, row and column ---------------------------------------


def bad(tmp_path, rows, header="timestamp,electrolyser [kWh],generation.solar [kWh],generation.wind [kWh]"):
    (tmp_path / "p.toml").write_text(PROJECT, encoding="utf-8")
    write_series(tmp_path, rows, header)
    result = run_cli("score", tmp_path / "p.toml", "--no-ledger")
    assert_one_line_error(result)
    return result.stderr


def test_missing_interval(tmp_path):
    rows = day_rows()
    del rows[5]
    message = bad(tmp_path, rows)
    assert "series.csv: row 7, column 'timestamp'" in message and "1 interval(s) missing" in message


def test_duplicated_interval(tmp_path):
    rows = day_rows()
    rows.insert(5, list(rows[5]))
    assert "row 8, column 'timestamp'" in bad(tmp_path, rows) and "duplicated" in bad(tmp_path, rows)


def test_local_time_without_offset(tmp_path):
    rows = day_rows()
    rows[3][0] = rows[3][0][:16]
    message = bad(tmp_path, rows)
    assert "row 5, column 'timestamp'" in message and "UTC offset" in message


def test_daylight_saving_change_written_as_local_time(tmp_path):
    # 29 March 2026, clocks go forward at 01:00 UTC; the offset changes but the wall clock was written without the jump
    rows = [[s, 100, 20, 55] for s in stamps("2026-03-28T22:00", 3)]
    rows += [[s.replace("+01:00", "+02:00"), 100, 20, 55] for s in stamps("2026-03-29T01:00", 3)]  # 02:00+02:00 = 00:00 UTC: a repeat
    message = bad(tmp_path, rows)
    assert "row 5, column 'timestamp'" in message and "daylight-saving" in message


def test_negative_energy(tmp_path):
    rows = day_rows()
    rows[10][2] = -3
    assert "row 12, column 'generation.solar [kWh]'" in bad(tmp_path, rows)


def test_text_in_numbers(tmp_path):
    rows = day_rows()
    rows[2][1] = "n/a"
    message = bad(tmp_path, rows)
    assert "row 4, column 'electrolyser [kWh]'" in message and "'n/a'" in message


def test_a_year_missing(tmp_path):
    rows = day_rows(count=3, start="2026-12-31T20:00") + day_rows(count=3, start="2028-01-01T00:00")
    message = bad(tmp_path, rows)
    assert "row 5" in message and "a year or more of data missing" in message


def test_a_source_the_project_does_not_declare(tmp_path):
    message = bad(tmp_path, [[s, 100, 20, 55] for s in stamps("2026-03-01T00:00", 4)], "timestamp,electrolyser [kWh],generation.solar [kWh],generation.tidal [kWh]")
    assert "row 1, column 'generation.tidal [kWh]'" in message and "declares" in message


def test_a_generation_column_for_the_grid(tmp_path):
    message = bad(tmp_path, [[s, 100, 20, 55] for s in stamps("2026-03-01T00:00", 4)], "timestamp,electrolyser [kWh],generation.solar [kWh],generation.grid [kWh]")
    assert "not the grid source" in message


def test_json_checks_carry_electricity_matching(tmp_path):
    import json

    (tmp_path / "p.toml").write_text(PROJECT, encoding="utf-8")
    # 30-minute data in MWh: 0.05 MWh = 50 kWh each half hour; solar 0.04 MWh in the first half hour of each hour only
    rows = [[s, 0.05, 0.04 if number % 2 == 0 else 0.0, 0.0] for number, s in enumerate(stamps("2026-03-01T00:00", 8, step_minutes=30))]
    write_series(tmp_path, rows, "timestamp,electrolyser [MWh],generation.solar [MWh],generation.wind [MWh]")
    result = run_cli("score", tmp_path / "p.toml", "--no-ledger", "--format", "json")
    assert result.exit_code == 0, result.output
    checks = {c["scheme"]: c for c in json.loads(result.stdout)["checks"]}
    uk, eu = checks["uk-lchs"]["electricity_matching"], checks["eu-rfnbo"]["electricity_matching"]
    # by half hour (UK): 40 of 50 kWh in half of the half hours -> 4 x 40 / 400 = 0.4; by month (EU): min(400, 160) / 400 = 0.4 too,
    # since generation never exceeds the load; by the hour the same, 40 kWh of solar against 100 kWh of use
    assert uk["granularity"] == "interval" and uk["matched_share"] == pytest.approx(0.4)
    assert eu["granularity"] == "month" and eu["matched_share"] == pytest.approx(0.4)
    assert uk["interval_minutes"] == 30 and uk["load_kwh"] == pytest.approx(400.0)
    assert eu["monthly"][0]["month"] == "2026-03"
    import hashlib

    assert eu["series_sha256"] == hashlib.sha256((tmp_path / "series.csv").read_bytes()).hexdigest()


def test_a_series_without_any_use(tmp_path):
    message = bad(tmp_path, [[s, 0, 20, 55] for s in stamps("2026-03-01T00:00", 4)])
    assert "column 'electrolyser [kWh]'" in message and "some electricity use" in message


def test_unmatched_share_by_hour_and_month_by_hand(tmp_path):
    from carbonledger.analyses.matching import unmatched_share_by_hour_and_month

    # two days of hourly data: use 10 kWh every hour; matched 10 at 12:00 both days, 5 at 13:00 on day one only
    local = hours("2026-06-01T00:00", 48)
    load = np.full(48, 10.0)
    matched = np.zeros(48)
    matched[[12, 36]] = 10.0
    matched[13] = 5.0
    months, share = unmatched_share_by_hour_and_month(local, load, matched)
    assert months == ["2026-06"]
    # 12:00: (0 + 0) / 20 = 0; 13:00: (5 + 10) / 20 = 0.75; every other hour 20 / 20 = 1
    assert share[12, 0] == 0.0 and share[13, 0] == pytest.approx(0.75) and share[3, 0] == 1.0


def test_score_writes_a_matching_chart(tmp_path):
    (tmp_path / "p.toml").write_text(PROJECT, encoding="utf-8")
    write_series(tmp_path, day_rows(solar=50.0, wind=0.0))
    result = run_cli("score", tmp_path / "p.toml", "--no-ledger", "--matching-chart", tmp_path / "m.svg", "--format", "json")
    assert result.exit_code == 0, result.output
    assert (tmp_path / "m.svg").read_text(encoding="utf-8").lstrip().startswith("<?xml")
    again = run_cli("score", tmp_path / "p.toml", "--no-ledger", "--matching-chart", tmp_path / "m.svg")
    assert_one_line_error(again)  # an existing chart is not overwritten


def test_the_assessment_year_not_the_series_dates_chooses_the_eu_rule_through_score(tmp_path):
    # Delegated Regulation (EU) 2023/1184 Art. 6: same calendar month until 31 December 2029, same one-hour period
    # from 1 January 2030. Eight hours, 20:00 to 23:00 on 31 Dec 2029 and 00:00 to 03:00 on 1 Jan 2030 (local),
    # 100 kWh of use each; solar 150, 150, 150, 0 in December and 0, 0, 0, 200 in January. Worked by hand:
    # assessed in 2029 (monthly): December min(400, 450) = 400, January min(400, 200) = 200: 600 / 800 = 0.75 in 2 periods;
    # assessed in 2030 (hourly): 3 x min(100, 150) + min(100, 200) = 400 of 800 = 0.5 in 8 periods.
    (tmp_path / "p.toml").write_text(PROJECT, encoding="utf-8")
    solar = [150, 150, 150, 0, 0, 0, 0, 200]
    rows = [[s, 100, solar[number], 0] for number, s in enumerate(stamps("2029-12-31T19:00", 8))]
    write_series(tmp_path, rows)
    monthly = next(c for c in api.score(tmp_path / "p.toml", assessment=assessment_with(year=2029)).checks if c.scheme == "eu-rfnbo").electricity_matching
    hourly = next(c for c in api.score(tmp_path / "p.toml", assessment=assessment_with(year=2030)).checks if c.scheme == "eu-rfnbo").electricity_matching
    assert monthly.granularity == "month" and monthly.periods == 2 and monthly.matched_share == pytest.approx(0.75)
    assert hourly.granularity == "hour" and hourly.periods == 8 and hourly.matched_share == pytest.approx(0.5)
    assert monthly.rule == hourly.rule == "month until 2029-12-31, hour from 2030-01-01"
    assert [m.month for m in hourly.monthly] == ["2029-12", "2030-01"]


def test_a_matched_check_is_judged_at_its_matched_value():
    # The verdict follows the value the matching gives, not the declared-share value: a matched
    # value under the limit with no open rule qualifies; the threshold sentence quotes the matched
    # value; a check that does not qualify has no pass and no tier (as every other check).
    result = api.score(DEMO / "hybrid_hourly_hydrogen.toml")
    declared = {c.scheme: c for c in api.score(DEMO / "hybrid_hourly_hydrogen.toml", assessment=assessment_with(matching="declared")).checks}
    moved = 0
    for check in result.checks:
        assert check.passes == (check.status == "qualifies"), check.scheme
        assert check.tier is None or check.status == "qualifies", check.scheme
        assert any(f"value {check.value:.4g} " in reason for reason in check.reasons), (check.scheme, check.reasons)
        if (check.value <= check.limit) != (declared[check.scheme].value <= check.limit):
            moved += 1
    assert moved >= 1  # the demo has a scheme whose side of the limit the matching changes (the test can fail)
