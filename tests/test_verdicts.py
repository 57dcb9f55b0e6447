"""Verdicts under each scheme's rules: eligibility, electricity procurement, boundary, dates.

Each case names the article it follows and the grade of the text it was read in (SOURCES.md and
../shared/casebook/README.md): "primary text", "verbatim secondary", "secondary" or "not yet verified".
The casebook in ../shared/casebook (run by .ci/run) holds the fuller cases written from the legal
texts; these tests pin the arithmetic and the wording of each rule on small invented projects.
"""

from __future__ import annotations

import csv
import datetime as dt
import io
import json
from pathlib import Path

import pytest
from helpers import assessment_with, run_cli

from carbonledger.api import score
from carbonledger.core.scoring import rulebooks
from carbonledger.core.verdicts import add_years, assessment_year, months_before
from carbonledger.errors import InputError

DEMO = Path(__file__).resolve().parents[1] / "demo_projects"
CRACKED = DEMO / "green_ammonia_cracked_hydrogen.toml"
BLUE = DEMO / "blue_smr_hydrogen.toml"
OFFSHORE = DEMO / "portfolio" / "skelmar_green_hydrogen.toml"
EU_GRID_KG_PER_KWH = 0.281  # electricity.grid.eu27_2018: 281 g CO2e/kWh (EEA indicator IND-353, 2018; pre-characterised CO2e)
WIND_KG_PER_KWH = 0.011  # electricity.renewable.wind_onshore: 11 g CO2e/kWh (IPCC AR5 WG3 Annex III median)
H2_LHV = 119.96  # MJ/kg, heating_value.hydrogen.lhv of the factor set (US DOE HyARC table)


def check(result, scheme):
    return next(c for c in result.checks if c.scheme == scheme)


def project(tmp_path, *, wind_commissioned="2028-06-01", procurement="ppa", zone="VENNOR-1", supported="false",
            matched="monthly", commissioning="2029-03-01", country='"US"', grid_share=0.0, extra="") -> Path:
    """An invented electrolysis plant: 50 kWh/kg H2 from a wind source, with a grid source of the plant's zone
    that gives the grid intensity (share 0 unless given); delivered by a 10 km pipeline that uses no energy and
    loses nothing, so that the EU formula's e_td is modelled (and zero) and the arithmetic stays 50 kWh x factor."""
    wind_share = 1.0 - grid_share
    text = f"""
[project]
name = "Verdict test plant (invented)"
product = "hydrogen"
boundary = "well-to-tank"
zone = "VENNOR-1"
country = {country}
construction_start = 2027-01-01
commissioning = {commissioning}
{extra}
[hydrogen]
route = "electrolysis"
conditioning_kwh_per_kg_h2 = 0.0

[electrolysis]
technology = "alkaline"
electricity_kwh_per_kg_h2 = 50.0

[electricity.sources.wind]
share = {wind_share}
factor = "electricity.renewable.wind_onshore"
procurement = "{procurement}"
commissioned = {wind_commissioned}
zone = "{zone}"
supported = {supported}
matched = "{matched}"

[electricity.sources.grid]
share = {grid_share}
factor = "electricity.grid.eu27_2018"
procurement = "grid"
zone = "VENNOR-1"

[hydrogen_pipeline]
destination = "Brannock Haven (invented)"
length_km = 10.0
compression_kwh_per_kg_h2 = 0.0
leakage_share_per_100_km = 0.0
"""
    path = tmp_path / "plant.toml"
    path.write_text(text, encoding="utf-8")
    return path


# --- what a kWh that fails a rule is charged ---------------------------------------------------------
def test_electricity_failing_a_rule_is_charged_at_the_grid_not_at_its_own_factor(tmp_path):
    # 26 CFR 1.45V-4 (electricity without qualifying certificates at the regional grid's intensity; secondary) and
    # 2023/1185 Annex Part A point 6 with Part C (the country or bidding-zone average; verbatim secondary).
    # A 2015 wind farm for a 2029 plant is not incremental / additional (36 months): its 50 kWh/kg H2 are charged
    # at the zone's grid, 50 x 0.281 = 14.05 kg CO2e/kg H2, not at the wind factor, 50 x 0.011 = 0.55.
    path = project(tmp_path, wind_commissioned="2015-06-01")
    result = score(path, assessment=assessment_with(year=2029))
    us = check(result, "us-45v")
    assert us.value == pytest.approx(50 * EU_GRID_KG_PER_KWH, rel=1e-9)
    assert us.status == "fails" and us.margin == pytest.approx(4.0 - 14.05, rel=1e-9)
    assert "additionality" in us.reasons[0] and "2015-06-01" in us.reasons[0]  # the failed rule decides, first
    assert us.electricity_charged_as_grid == {"electricity:wind": "electricity:grid"}
    rfnbo = check(result, "eu-rfnbo")  # per MJ: 14050 g / 119.96 MJ
    assert rfnbo.value == pytest.approx(50 * EU_GRID_KG_PER_KWH * 1000 / H2_LHV, rel=1e-9)
    # a new wind farm (in operation 9 months before the plant) counts zero under both
    fresh = score(path.parent / project(tmp_path, wind_commissioned="2028-06-01").name, assessment=assessment_with(year=2029))
    assert check(fresh, "us-45v").value == pytest.approx(0.0, abs=1e-12) and check(fresh, "us-45v").tier.startswith("100 %")
    # Japan's criterion counts every source at its life-cycle factor whatever its procurement (secondary)
    assert check(fresh, "japan-hydrogen").value == pytest.approx(50 * WIND_KG_PER_KWH, rel=1e-9)


def test_rfnbo_grid_electricity_share_under_art_27_6(tmp_path):
    # Directive (EU) 2018/2001 Art. 27(6) first subparagraph (verbatim secondary): grid electricity counts at the
    # country's average renewable share, so a plant none of whose electricity counts fully renewable is still
    # covered for that share, at the intensity of the whole output (2023/1185 Annex Part A point 1): judged on the
    # value, here 117.1 g CO2e/MJ > 28.2: fails (not "not eligible").
    c = check(score(project(tmp_path, wind_commissioned="2015-06-01"), assessment=assessment_with(year=2029, schemes=["eu-rfnbo"])), "eu-rfnbo")
    assert c.status == "fails"
    assert any("Art. 27(6)" in r for r in c.reasons)
    # a direct line that fails Art. 3 is not grid electricity: nothing is an RFNBO
    direct = check(score(project(tmp_path, wind_commissioned="2025-01-01", procurement="direct_line"), assessment=assessment_with(year=2029, schemes=["eu-rfnbo"])), "eu-rfnbo")
    assert direct.status == "not_eligible" and "36 months" in direct.reasons[0] and "Art. 3" in direct.reasons[0]
    assert direct.margin is None and direct.tier is None and not any(r.startswith(("met: value", "not met: value")) for r in direct.reasons)


# --- EU additionality, direct connection, zones, dates ------------------------------------------------
def test_art_11_exempts_plants_in_operation_before_2028_until_1_january_2038(tmp_path):
    # 2023/1184 Art. 11 (verbatim secondary): Art. 5(a) and (b) do not apply until 1 January 2038 to installations
    # that come into operation before 1 January 2028. An old, supported wind farm for a 2027 plant counts in 2037
    # and is charged at the grid in 2038.
    path = project(tmp_path, wind_commissioned="1999-01-01", supported="true", commissioning="2027-06-01", matched="hourly")
    in_2037 = check(score(path, assessment=assessment_with(year=2037, schemes=["eu-rfnbo"])), "eu-rfnbo")
    in_2038 = check(score(path, assessment=assessment_with(year=2038, schemes=["eu-rfnbo"])), "eu-rfnbo")
    assert in_2037.status == "qualifies" and any("exempt from additionality until 2038-01-01" in r and "Art. 11" in r for r in in_2037.reasons)
    assert in_2038.status == "fails" and "additionality" in in_2038.reasons[0]


def test_direct_connection_judges_the_generator_age_only_and_counts_calendar_days(tmp_path):
    # 2023/1184 Art. 3(b) (verbatim secondary): in operation no earlier than 36 months before the plant; no aid test
    # (Commission Q&A Q9). "Not earlier than 36 months" by calendar day: 2026-03-01 for a 2029-03-01 plant is allowed,
    # 2026-02-28 is not.
    aided = check(score(project(tmp_path, procurement="direct_line", supported="true", wind_commissioned="2026-03-01"), assessment=assessment_with(year=2029, schemes=["eu-rfnbo"])), "eu-rfnbo")
    assert aided.status == "qualifies"
    early = check(score(project(tmp_path, procurement="direct_line", wind_commissioned="2026-02-28"), assessment=assessment_with(year=2029, schemes=["eu-rfnbo"])), "eu-rfnbo")
    assert early.status == "not_eligible"
    assert months_before(dt.date(2029, 3, 1), 36) == dt.date(2026, 3, 1)
    assert months_before(dt.date(2029, 5, 31), 3) == dt.date(2029, 2, 28)


def test_another_bidding_zone_is_undetermined_under_the_eu_rules_and_fails_45v_deliverability(tmp_path):
    # 2023/1184 Art. 7(b) and (c) (verbatim secondary) allow an interconnected offshore zone or a neighbouring zone
    # with an equal or higher day-ahead price: not declared, so undetermined, the reason naming the rule.
    # 45V deliverability (26 CFR 1.45V-4(d)(3)(ii); secondary): another region is not met, charged at the grid.
    result = score(project(tmp_path, zone="VENNOR-2"), assessment=assessment_with(year=2029))
    eu = check(result, "eu-rfnbo")
    assert eu.status == "undetermined" and "bidding zone VENNOR-2" in eu.reasons[0] and "Art. 7" in eu.reasons[0]
    us = check(result, "us-45v")
    assert us.status == "fails" and us.value == pytest.approx(50 * EU_GRID_KG_PER_KWH, rel=1e-9)


def test_a_declared_period_coarser_than_the_rule_in_force_is_not_met(tmp_path):
    # 2023/1184 Art. 6: same calendar month until 31 December 2029, same one-hour period from 1 January 2030
    # (verbatim secondary). Declared monthly: met in 2029, not met in 2030 (charged at the grid).
    path = project(tmp_path, commissioning="2029-01-01", matched="monthly")
    assert check(score(path, assessment=assessment_with(year=2029, schemes=["eu-rfnbo"])), "eu-rfnbo").status == "qualifies"
    later = check(score(path, assessment=assessment_with(year=2030, schemes=["eu-rfnbo"])), "eu-rfnbo")
    assert later.status == "fails" and "hourly matching required in 2030, monthly declared" in later.reasons[0]
    assert any("same one-hour period from 1 January 2030" in v for v in later.rule_versions)


# --- US 45V -------------------------------------------------------------------------------------------
def test_45v_credit_period_country_and_45q(tmp_path):
    # 26 U.S.C. 45V(a)(1): the 10-year period beginning on the date placed in service (2029-03-01 to 2039-02-28);
    # (c)(2)(B)(i)(I): produced in the United States or a possession; (d)(2): no 45V where the capture equipment
    # earns 45Q (read in copies of the US Code: verbatim secondary).
    path = project(tmp_path, matched="hourly")  # hourly matching from 2030 (1.45V-4(d)(3)(iii); secondary)
    assert check(score(path, assessment=assessment_with(year=2039, schemes=["us-45v"])), "us-45v").status == "qualifies"  # 2039-01-01 to -02-28 in the period
    over = check(score(path, assessment=assessment_with(year=2040, schemes=["us-45v"])), "us-45v")
    assert over.status == "not_eligible" and "10-year credit period" in over.reasons[0] and "2039-02-28" in over.reasons[0]
    assert add_years(dt.date(2028, 2, 29), 10) == dt.date(2038, 2, 28)
    abroad = check(score(project(tmp_path, country='"GB"', matched="hourly"), assessment=assessment_with(year=2030, schemes=["us-45v"])), "us-45v")
    assert abroad.status == "not_eligible" and "country GB" in abroad.reasons[0]
    territory = check(score(project(tmp_path, country='"PR"', matched="hourly"), assessment=assessment_with(year=2030, schemes=["us-45v"])), "us-45v")
    assert territory.status == "qualifies"  # Puerto Rico is a possession of the United States
    unknown = check(score(project(tmp_path, country='""', matched="hourly"), assessment=assessment_with(year=2030, schemes=["us-45v"])), "us-45v")
    assert unknown.status == "undetermined" and "project.country is not given" in unknown.reasons[0]
    blue = BLUE.read_text(encoding="utf-8").replace("[capture]", "[capture]\nclaims_45q = true", 1).replace("[project]", '[project]\ncountry = "US"', 1)
    (tmp_path / "blue.toml").write_text(blue, encoding="utf-8")
    claimed = check(score(tmp_path / "blue.toml", assessment=assessment_with(year=2029, schemes=["us-45v"])), "us-45v")
    assert claimed.status == "not_eligible" and "45Q" in claimed.reasons[0]


def test_45v_tier_at_each_published_edge():
    # 26 U.S.C. 45V(b)(2)(A)-(D) (verbatim secondary): 4 kg is in the 20 % tier ("not greater than 4"),
    # 2.5 kg too ("not less than 2.5"), 1.5 kg in the 25 % tier, 0.45 kg in the 33.4 % tier; a value one
    # floating-point step from a published limit counts as the limit.
    scheme = rulebooks()["us-45v"]
    for value, tier in ((4.0, "20 %"), (2.5, "20 %"), (2.4999, "25 %"), (1.5, "25 %"), (0.45, "33.4 %"), (0.45 * (1 - 1e-15), "33.4 %"), (0.4499, "100 %")):
        assert scheme.tier_met(value).tier.startswith(tier), value
    assert scheme.tier_met(4.0 * (1 + 1e-15)) is not None and scheme.tier_met(4.001) is None


# --- EU low-carbon, Japan ---------------------------------------------------------------------------
def test_low_carbon_fuels_use_the_ar5_values_of_2020_1044_and_nuclear_under_a_ppa_pays_the_grid(tmp_path):
    # Delegated Regulation (EU) 2025/2359 takes its GWPs from Delegated Regulation (EU) 2020/1044 (verbatim
    # secondary; AR5 CH4 28, N2O 265) and leaves other recognition of nuclear electricity to a later act
    # (recital 7): a nuclear PPA is charged at the zone's grid, 50 x 0.281 x 1000 / 119.96 g CO2e/MJ.
    assert rulebooks()["eu-low-carbon"].gwp == "ar5" and rulebooks()["eu-rfnbo"].gwp == "ar4"
    nuclear = project(tmp_path).read_text(encoding="utf-8").replace("electricity.renewable.wind_onshore", "electricity.low_carbon.nuclear")
    (tmp_path / "nuclear.toml").write_text(nuclear, encoding="utf-8")
    c = check(score(tmp_path / "nuclear.toml", assessment=assessment_with(year=2029, schemes=["eu-low-carbon"])), "eu-low-carbon")
    assert c.value == pytest.approx(50 * EU_GRID_KG_PER_KWH * 1000 / H2_LHV, rel=1e-9) and c.status == "fails"
    # Directive (EU) 2024/1788: low-carbon hydrogen takes its energy from non-renewable sources; fully renewable
    # electrolysis is an RFNBO instead
    renewable = check(score(project(tmp_path), assessment=assessment_with(year=2029, schemes=["eu-low-carbon"])), "eu-low-carbon")
    assert renewable.status == "not_eligible" and "fully renewable" in renewable.reasons[0]


def test_japan_ammonia_counts_the_upstream_gas_chain():
    # The 2024 criteria under the Hydrogen Society Promotion Act are reported to count upstream emissions
    # (secondary): a higher methane loss raises the ammonia value.
    low = check(score(DEMO / "blue_atr_ammonia.toml", assessment=assessment_with(schemes=["japan-ammonia"], year=2029)), "japan-ammonia")
    high = check(score(DEMO / "blue_atr_ammonia.toml", assessment=assessment_with(schemes=["japan-ammonia"], year=2029, overrides=["natural_gas.methane_emission_share=0.03"])), "japan-ammonia")
    assert high.value > low.value


# --- the assessment year ------------------------------------------------------------------------------
def test_the_default_assessment_year_is_the_first_full_year_of_operation():
    assert assessment_year(dt.date(2028, 3, 1), None) == 2029
    assert assessment_year(dt.date(2028, 1, 1), None) == 2028
    assert assessment_year(None, None, today=dt.date(2026, 12, 2)) == 2026
    assert assessment_year(dt.date(2028, 3, 1), 2031) == 2031
    result = score(CRACKED)  # commissioning 2028-03-01
    assert result.assessment_year == 2029 and all(c.assessment_period == "2029" for c in result.checks)


@pytest.mark.parametrize(
    "options, field, expected",
    [
        ({"year": 1999}, "--year", "an assessment year from 2000 to 2100"),
        ({"year": 2101}, "--year", "an assessment year from 2000 to 2100"),
        ({"year": 2027}, "project.commissioning", "a date in or before the assessment year 2027"),
        ({"overrides": ["project.country=USA"]}, "project.country", "ISO 3166-1 alpha-2"),
        ({"overrides": ["electricity.sources.wind.procurement=contract"]}, "electricity.sources.wind.procurement", "'direct_line'"),
        ({"overrides": ["electricity.sources.wind.commissioned=2027-13-01"]}, "electricity.sources.wind.commissioned", "a date YYYY-MM-DD"),
    ],
)
def test_bad_declarations_are_one_line_errors(options, field, expected):
    with pytest.raises(InputError) as error:
        score(CRACKED, assessment_with(**options))
    assert field in str(error.value) and expected in str(error.value)


def test_every_rule_names_its_source_and_grade_and_schemes_json_shows_them():
    data = json.loads(run_cli("schemes", "--format", "json").stdout)
    for book in data["schemes"]:
        assert book["grade"] in ("primary text", "verbatim secondary", "secondary", "not yet verified")
        rules = book["electricity_rules"]
        if rules:
            assert rules["grade"] and all(r["grade"] and r["source"] for r in rules["temporal"])
        assert all(t["grade"] and t["source"] for t in book["thresholds"])
    reasons = check(score(CRACKED, assessment=assessment_with(year=2029)), "eu-rfnbo").reasons
    assert any("verbatim secondary" in r for r in reasons) and not any("from memory" in r for r in reasons)


def test_cli_shows_status_year_and_deciding_reason_in_every_format():
    table = run_cli("score", BLUE, "--scheme", "eu-rfnbo", "--year", "2027", "--no-ledger")
    assert table.exit_code == 0, table.output
    assert "eu-rfnbo: not eligible, because not met: route steam_methane_reforming" in table.stdout  # the deciding reason first
    data = json.loads(run_cli("score", BLUE, "--scheme", "eu-rfnbo", "--year", "2027", "--no-ledger", "--format", "json").stdout)
    only = data["checks"][0]
    assert data["assessment_year"] == 2027 and only["assessment_period"] == "2027"
    assert only["status"] == "not_eligible" and only["passes"] is False and only["margin"] is None
    rows = list(csv.DictReader(io.StringIO(run_cli("score", BLUE, "--scheme", "eu-rfnbo", "--year", "2027", "--no-ledger", "--format", "csv").stdout)))
    assert [r["value"] for r in rows if r["section"] == "check:eu-rfnbo" and r["key"] == "status"] == ["not_eligible"]
    assert len([r for r in rows if r["section"] == "check:eu-rfnbo" and r["key"] == "reason"]) == len(only["reasons"])
    listing = run_cli("schemes")
    assert "eu-low-carbon" in listing.stdout and "hourly from 2030-01-01" in listing.stdout


def test_a_producer_selling_at_the_gate_can_declare_its_buyers_e_td(tmp_path):
    # 2023/1185 Annex Part A point 1: E = e_i + e_p + e_td + e_u - e_ccs (verbatim secondary). At the gate e_td is not
    # modelled: undetermined, saying how much room e_td has (28.2 - 50 x 0 / 119.96 = 28.2 g CO2e/MJ for a plant on
    # counted wind). A declared e_td of 2.5 g CO2e/MJ is added to the value and gives a verdict.
    gate = project(tmp_path).read_text(encoding="utf-8").replace('boundary = "well-to-tank"', 'boundary = "cradle-to-gate"')
    (tmp_path / "gate.toml").write_text(gate, encoding="utf-8")
    open_ = check(score(tmp_path / "gate.toml", assessment=assessment_with(year=2029, schemes=["eu-rfnbo"])), "eu-rfnbo")
    assert open_.status == "undetermined" and open_.reasons[0].startswith("cannot be judged: e_td")
    assert "qualifies if what cannot be judged adds at most 28.2 g CO2e/MJ" in open_.reasons[0]
    declared = gate.replace("[hydrogen]", 'declared_e_td_g_co2e_per_mj = 2.5\ndeclared_e_td_evidence = "buyers\' statement (invented)"\n\n[hydrogen]', 1)
    (tmp_path / "declared.toml").write_text(declared, encoding="utf-8")
    c = check(score(tmp_path / "declared.toml", assessment=assessment_with(year=2029, schemes=["eu-rfnbo"])), "eu-rfnbo")
    assert c.status == "qualifies" and c.value == pytest.approx(open_.value + 2.5, rel=1e-12)
    assert any("declared by the producer: 2.5 g CO2e/MJ" in r and "buyers' statement (invented)" in r for r in c.reasons)
    with pytest.raises(InputError) as error:
        score(tmp_path / "declared.toml", assessment=assessment_with(overrides=["project.declared_e_td_g_co2e_per_mj=-1"]))
    assert "project.declared_e_td_g_co2e_per_mj" in str(error.value)
