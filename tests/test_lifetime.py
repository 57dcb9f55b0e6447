"""Lifetime scoring: output-weighted averages, stack replacement, construction emissions."""

import json
import shutil

import pytest
from helpers import FACTOR_HEADER, PORTFOLIO, ROOT, assert_one_line_error, assessment_with, run_cli, write

from carbonledger.analyses.lifetime import lifetime_score
from carbonledger.errors import InputError
from carbonledger.model.factors import load_factor_set
from carbonledger.routes.project import load_project

PROJECT = """\
# test project (invented numbers)
[project]
name = "Lifetime test"
product = "hydrogen"

[hydrogen]
route = "electrolysis"

[electrolysis]
technology = "alkaline"
electricity_kwh_per_kg_h2 = 50.0

[electricity.sources.grid]
share = 1.0
factor = "electricity.grid.eu27_2018"

[lifetime]
{lifetime}
"""

SHORT_LIFE = """\
operating_years = 3
first_year = 2030
nameplate_output_t_per_year = 1000
capacity_factor = 0.5
efficiency_loss_per_year = 0.1
stack_replacement_years = 2
plant_construction_t_co2e = 1450
grid_trajectory_csv = "grid.csv"
"""


def _trajectory(folder, values):
    rows = "".join(f"grid.{year},{value},g CO2e/kWh,test trajectory (invented),,{year},,,false\n" for year, value in values.items())
    return write(folder / "grid.csv", FACTOR_HEADER + rows)


def _score(tmp_path, lifetime_text, trajectory=None, **options):
    if trajectory is not None:
        _trajectory(tmp_path, trajectory)
    path = write(tmp_path / "project.toml", PROJECT.format(lifetime=lifetime_text))
    project, sha = load_project(path)
    return lifetime_score(project, assessment_with(factors=load_factor_set("default-2026")), project_file=str(path), project_sha256=sha, **options)


def test_lifetime_average_is_the_output_weighted_mean(tmp_path):
    result = _score(tmp_path, SHORT_LIFE, {2030: 300, 2031: 200, 2032: 100})
    # Hand computation. Stack ages 0, 1, 0 (replaced after 2 years); efficiency 1, 0.9, 1 of new.
    # Electricity 50, 50/0.9 = 55.556, 50 kWh/kg; grid 300, 200, 100 g CO2e/kWh, so
    # intensity 15, 11.111, 5 kg CO2e/kg H2. Output 1000 t x 0.5 x efficiency = 500, 450, 500 t.
    yearly = [15.0, 50 / 0.9 * 0.2, 5.0]
    outputs = [500.0, 450.0, 500.0]
    assert [y.total for y in result.years] == pytest.approx(yearly, rel=1e-12)
    assert [y.output_t for y in result.years] == pytest.approx(outputs, rel=1e-12)
    # (15 x 500 + 11.111 x 450 + 5 x 500) / 1450 = 15000 / 1450 = 10.3448 kg CO2e/kg H2
    assert result.average_without_construction == pytest.approx(15000 / 1450, rel=1e-12)
    assert result.lifetime_output_t == pytest.approx(1450.0)
    # Japan hydrogen (3.4 kg CO2e/kg H2, life-cycle electricity): every year is above it.
    japan = next(s for s in result.schemes if s.scheme == "japan-hydrogen")
    assert japan.years_missed == [2030, 2031, 2032]
    assert japan.average_without_construction == pytest.approx(15000 / 1450, rel=1e-12)


def test_stack_replacement_resets_efficiency(tmp_path):
    life = "operating_years = 5\nfirst_year = 2030\nnameplate_output_t_per_year = 100\nefficiency_loss_per_year = 0.02\nstack_replacement_years = 3\n"
    result = _score(tmp_path, life)
    assert [y.stack_age_years for y in result.years] == [0, 1, 2, 0, 1]
    assert [y.efficiency_fraction for y in result.years] == pytest.approx([1.0, 0.98, 0.96, 1.0, 0.98])
    # constant grid (281 g/kWh): year 4 (new stacks) is back to year 1, 50 kWh x 0.281 = 14.05
    assert result.years[3].total == pytest.approx(result.years[0].total, rel=1e-12)
    assert result.years[0].total == pytest.approx(50 * 0.281, rel=1e-12)
    assert result.years[2].total == pytest.approx(50 / 0.96 * 0.281, rel=1e-12)
    never = _score(tmp_path, life.replace("stack_replacement_years = 3\n", ""))
    assert [y.stack_age_years for y in never.years] == [0, 1, 2, 3, 4]
    assert never.years[3].total > result.years[3].total


def test_construction_emissions_are_divided_by_lifetime_output(tmp_path):
    result = _score(tmp_path, SHORT_LIFE, {2030: 300, 2031: 200, 2032: 100})
    # 1450 t CO2e over 1450 t H2 = 1.0 kg CO2e/kg H2
    assert result.construction_kg_co2e_per_unit == pytest.approx(1.0, rel=1e-12)
    assert result.average_with_construction == pytest.approx(15000 / 1450 + 1.0, rel=1e-12)
    us = next(s for s in result.schemes if s.scheme == "us-45v")
    assert us.average_with_construction - us.average_without_construction == pytest.approx(1.0, rel=1e-9)
    # per MJ: 1 kg/kg = 1000 g / 119.96 MJ (hydrogen LHV, US DOE HyARC table) = 8.336 g CO2e/MJ
    eu = next(s for s in result.schemes if s.scheme == "eu-rfnbo")
    assert eu.average_with_construction - eu.average_without_construction == pytest.approx(1000 / 119.96, rel=1e-9)
    # every shipped rulebook leaves construction out (recorded from memory): the verdict uses the average without
    assert not us.counts_construction and us.lifetime_value == us.average_without_construction


def test_a_rulebook_that_counts_construction_uses_the_average_with_it(tmp_path, monkeypatch):
    from carbonledger.core import scoring

    factors = tmp_path / "factors"
    shutil.copytree(ROOT / "factors", factors)
    scheme = factors / "schemes" / "us-45v.toml"
    scheme.write_text(scheme.read_text().replace("counts_construction = false", "counts_construction = true"))
    monkeypatch.setenv("CARBONLEDGER_FACTORS", str(factors))
    scoring.shipped_rulebooks.cache_clear()
    try:
        project_folder = tmp_path / "p"
        result = _score(project_folder, SHORT_LIFE, {2030: 300, 2031: 200, 2032: 100})
    finally:
        scoring.shipped_rulebooks.cache_clear()
    us = next(s for s in result.schemes if s.scheme == "us-45v")
    assert us.counts_construction and us.lifetime_value == pytest.approx(15000 / 1450 + 1.0)


def test_trajectory_from_a_factor_set_with_years():
    path = PORTFOLIO / "vennor_hybrid_hydrogen.toml"
    project, _ = load_project(path, ["lifetime.grid_trajectory_csv=''", "lifetime.grid_trajectory_factors='electricity.grid.vennor_bay'"])
    result = lifetime_score(project, assessment_with(factors=load_factor_set("demo-2027-grid-revision")), project_file=str(path))
    # the invented demo trajectory: 300 g CO2e/kWh in 2027, 80 in 2036
    assert result.years[0].grid_factor == 300 and result.years[-1].grid_factor == 80
    # 2027: 13.78 kWh/kg from the grid x 0.300 kg/kWh = 4.134 kg CO2e/kg H2 under 45V (wind at zero)
    assert result.years[0].scheme_values["us-45v"] == pytest.approx(13.78 * 0.300, rel=1e-12)


def test_bad_lifetime_input(tmp_path):
    with pytest.raises(InputError, match="missing 2031"):
        _score(tmp_path, SHORT_LIFE, {2030: 300, 2032: 100})
    result = run_cli("score", tmp_path / "project.toml", "--lifetime")
    assert_one_line_error(result)
    assert "missing 2031" in result.stderr
    short = write(tmp_path / "short.toml", PROJECT.format(lifetime=SHORT_LIFE.replace("operating_years = 3", "operating_years = 0")))
    result = run_cli("score", short, "--lifetime")
    assert_one_line_error(result)
    assert "lifetime.operating_years" in result.stderr
    half = write(tmp_path / "half.toml", PROJECT.format(lifetime=SHORT_LIFE.replace("operating_years = 3", "operating_years = 0.5")))
    assert_one_line_error(run_cli("score", half, "--lifetime"))
    no_section = write(tmp_path / "plain.toml", PROJECT.replace("[lifetime]\n{lifetime}\n", ""))
    assert_one_line_error(run_cli("score", no_section, "--lifetime"))


def test_score_lifetime_command_formats(tmp_path):
    _trajectory(tmp_path, {2030: 300, 2031: 200, 2032: 100})
    path = write(tmp_path / "project.toml", PROJECT.format(lifetime=SHORT_LIFE))
    table = run_cli("score", path, "--lifetime")
    assert table.exit_code == 0, table.output
    assert "missed" in table.stdout and "2031" in table.stdout and "Caution" in table.stdout  # the "years missed" column (its head may wrap)
    data = json.loads(run_cli("score", path, "--lifetime", "--format", "json").stdout)
    assert data["average_without_construction"] == pytest.approx(15000 / 1450)
    assert len(data["years"]) == 3
    csv_text = run_cli("score", path, "--lifetime", "--format", "csv").stdout
    assert csv_text.splitlines()[0].startswith("year,") and "lifetime_with_construction" in csv_text


CHILE = """\
operating_years = 5
first_year = 2022
nameplate_output_t_per_year = 1000
grid_trajectory_factors = "region"
"""


def test_lifetime_follows_the_published_years_of_its_region(tmp_path):
    """A project on the Chilean grid (factor electricity.grid.chile_2024) follows Chile's published years,
    Our World in Data energy data set (Ember), carbon_intensity_elec: 2022 372.80, 2023 303.82,
    2024 259.87 g CO2e/kWh; 2025 and 2026 are held at 2024, the last published year. With 50 kWh/kg H2
    and nothing else emitting, each year's total is 50 kWh x factor / 1000 (kg CO2e/kg H2)."""
    text = PROJECT.format(lifetime=CHILE).replace("electricity.grid.eu27_2018", "electricity.grid.chile_2024")
    path = write(tmp_path / "project.toml", text)
    project, sha = load_project(path)
    result = lifetime_score(project, assessment_with(factors=load_factor_set("default-2026")), project_file=str(path), project_sha256=sha)
    published = {2022: 372.80, 2023: 303.82, 2024: 259.87, 2025: 259.87, 2026: 259.87}
    for year in result.years:
        assert year.grid_factor == pytest.approx(published[year.year], rel=1e-12)
        assert year.total == pytest.approx(50 * published[year.year] / 1000, rel=1e-9)
    assert [y.grid_factor_year for y in result.years] == [2022, 2023, 2024, 2024, 2024]
    assert "2025-2026 held at the last published year 2024" in result.trajectory_source


def test_later_years_from_the_project_trajectory(tmp_path):
    """With a CSV beside the factor-set region, the CSV gives the years after the last published one
    (values INVENTED for the test)."""
    _trajectory(tmp_path, {2025: 200, 2026: 150})
    text = PROJECT.format(lifetime=CHILE + 'grid_trajectory_csv = "grid.csv"\n').replace("electricity.grid.eu27_2018", "electricity.grid.chile_2024")
    path = write(tmp_path / "project.toml", text)
    project, sha = load_project(path)
    result = lifetime_score(project, assessment_with(factors=load_factor_set("default-2026")), project_file=str(path), project_sha256=sha)
    assert [y.grid_factor for y in result.years] == pytest.approx([372.80, 303.82, 259.87, 200, 150])
    _trajectory(tmp_path, {2025: 200})
    with pytest.raises(InputError, match="missing 2026"):
        lifetime_score(project, assessment_with(factors=load_factor_set("default-2026")), project_file=str(path), project_sha256=sha)


def test_region_needs_a_yearly_grid_id(tmp_path):
    path = write(tmp_path / "project.toml", PROJECT.format(lifetime=CHILE).replace("electricity.grid.eu27_2018", "electricity.renewable.wind_onshore"))
    project, sha = load_project(path)
    with pytest.raises(InputError, match="ending in _YEAR"):
        lifetime_score(project, assessment_with(factors=load_factor_set("default-2026")), project_file=str(path), project_sha256=sha)


SERIES_PROJECT = """\
# test project (invented numbers)
[project]
name = "Lifetime with a time series (invented)"
product = "hydrogen"

[hydrogen]
route = "electrolysis"

[electrolysis]
technology = "alkaline"
electricity_kwh_per_kg_h2 = 50.0

[electricity]
time_series = "series.csv"

[electricity.sources.grid]
share = 0.5
factor = "electricity.grid.eu27_2018"

[electricity.sources.solar]
share = 0.5
factor = "electricity.renewable.solar_pv_utility"

[lifetime]
operating_years = 2
first_year = 2029
nameplate_output_t_per_year = 100
grid_trajectory_csv = "grid.csv"
"""
SERIES_HEADER = "timestamp,electrolyser [kWh],generation.solar [kWh],grid_intensity [g CO2e/kWh]\n"


def _series_rows(year, solar=(150, 0, 150, 0), grid=(200, 400, 200, 400)):
    return "".join(f"{year}-01-01T0{hour}:00+00:00,100,{s},{g}\n" for hour, s, g in zip(range(4), solar, grid, strict=True))


def _series_score(tmp_path, rows, trajectory=(300, 150)):
    write(tmp_path / "series.csv", SERIES_HEADER + rows)
    _trajectory(tmp_path, dict(zip((2029, 2030), trajectory, strict=True)))
    path = write(tmp_path / "project.toml", SERIES_PROJECT)
    project, sha = load_project(path)
    return lifetime_score(project, assessment_with(factors=load_factor_set("default-2026")), project_file=str(path), project_sha256=sha)


def test_lifetime_repeats_a_one_year_series_under_each_years_rule_and_scales_the_grid_profile(tmp_path):
    """Hand calculation. Four hours of 2029: load 100 kWh each, solar 150, 0, 150, 0 kWh, grid
    200, 400, 200, 400 g CO2e/kWh; 50 kWh/kg H2 and nothing else emits. Trajectory 300 g (2029),
    150 g (2030): the 2030 profile is the 2029 one x 150/300 = 100, 200, 100, 200 g.
    45V (final regulations, 26 CFR 1.45V-4): annual matching through 2029, hourly from 2030.
      2029, annual: matched min(400, 300) = 300 kWh, every hour 25 kWh unmatched:
            25 x (200 + 400 + 200 + 400) g = 30 kg over 400 kWh = 0.075 kg/kWh x 50 = 3.75 kg/kg H2.
      2030, hourly: hours 1 and 3 matched (100 of 150), hours 2 and 4 at 200 g: 40 kg / 400 kWh
            = 0.1 kg/kWh x 50 = 5.0 kg/kg H2 (matched share 0.5).
    Japan (no temporal rule, annual; life-cycle factors, solar 48 g/kWh from IPCC AR5 WGIII Annex III):
      2029: (300 x 0.048 + 30) / 400 x 50 = 5.55; 2030: (14.4 + 15) / 400 x 50 = 3.675 kg/kg H2."""
    result = _series_score(tmp_path, _series_rows(2029))
    first, second = result.years
    assert (first.series_year, second.series_year) == (2029, 2029)  # the one-year series repeated
    assert (first.grid_profile_scale, second.grid_profile_scale) == pytest.approx((1.0, 0.5))
    assert first.scheme_values["us-45v"] == pytest.approx(3.75, rel=1e-12)
    assert second.scheme_values["us-45v"] == pytest.approx(5.0, rel=1e-12)
    assert (first.matched_share["us-45v"], second.matched_share["us-45v"]) == pytest.approx((0.75, 0.5))
    assert first.scheme_values["japan-hydrogen"] == pytest.approx(5.55, rel=1e-12)
    assert second.scheme_values["japan-hydrogen"] == pytest.approx(3.675, rel=1e-12)
    # 45V tiers: 4 kg/kg the loosest; 2029 meets it, 2030 under the hourly rule does not
    # (this bare project declares no procurement or construction start: under the threshold the year
    # is undetermined, never a pass; over it, it fails)
    assert first.statuses["us-45v"] == "undetermined" and not first.passes["us-45v"]
    assert second.statuses["us-45v"] == "fails" and not second.passes["us-45v"]
    assert "repeated" in result.time_series
    # the headline total keeps the declared shares at the year's trajectory factor: 50 x (0.5 x 300 + 0.5 x 48) g
    assert first.total == pytest.approx(50 * (0.5 * 0.300 + 0.5 * 0.048), rel=1e-12)


def test_lifetime_reads_a_series_of_several_years_year_by_year(tmp_path):
    """Four hours across the new year. 2029 (two hours): load 100 kWh each, solar 150 and 0 kWh, grid
    200 and 400 g: annual, matched 150 of 200 kWh, 25 kWh of each hour unmatched, 25 x 600 g = 15 kg
    over 200 kWh = 0.075 kg/kWh x 50 = 3.75 kg/kg H2. 2030 has its own hours (solar 100 each, grid 500 g),
    used as written (no scaling): hourly, each hour matched in full, so 45V counts 0 kg/kg H2."""
    rows = "".join(
        f"{stamp}+00:00,100,{solar},{grid}\n"
        for stamp, solar, grid in zip(("2029-12-31T22:00", "2029-12-31T23:00", "2030-01-01T00:00", "2030-01-01T01:00"), (150, 0, 100, 100), (200, 400, 500, 500), strict=True)
    )
    result = _series_score(tmp_path, rows)
    first, second = result.years
    assert (first.series_year, second.series_year) == (2029, 2030)
    assert second.grid_profile_scale is None
    assert first.scheme_values["us-45v"] == pytest.approx(3.75, rel=1e-12)
    assert second.scheme_values["us-45v"] == pytest.approx(0.0, abs=1e-12)
    assert second.matched_share["us-45v"] == pytest.approx(1.0)


def test_lifetime_refuses_a_series_of_several_years_that_misses_an_operating_year(tmp_path):
    rows = "2028-12-31T23:00+00:00,100,0,300\n" + "".join(f"2029-01-01T0{h}:00+00:00,100,0,300\n" for h in range(4))
    with pytest.raises(InputError, match="missing 2030"):
        _series_score(tmp_path, rows)


def test_a_year_and_the_lifetime_are_judged_with_every_rule_not_the_threshold_alone():
    from carbonledger.analyses.lifetime import lifetime_status, year_status

    # a year: not eligible stays so; a missed threshold fails; a rule broken fails even under the threshold;
    # an open rule under the threshold is undetermined, never a pass
    assert year_status("not_eligible", True) == "not_eligible"
    assert year_status("qualifies", False) == "fails"
    assert year_status("fails", True) == "fails"
    assert year_status("undetermined", True) == "undetermined"
    assert year_status("qualifies", True) == "qualifies"
    # the lifetime: the rulebook's value is the lifetime average, so one year over the threshold is listed, not failed
    assert lifetime_status(["qualifies", "fails", "qualifies"], True, years_missed=1) == "qualifies"
    assert lifetime_status(["qualifies", "fails"], True, years_missed=0) == "fails"  # a rule broken that year
    assert lifetime_status(["qualifies", "undetermined"], True, years_missed=0) == "undetermined"
    assert lifetime_status(["qualifies", "qualifies"], False, years_missed=0) == "fails"
    assert lifetime_status(["not_eligible", "not_eligible"], True, years_missed=0) == "not_eligible"
