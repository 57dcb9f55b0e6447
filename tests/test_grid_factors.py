"""Regional grid electricity factors (factors/sets/default-2026/grid-electricity.csv).

Each sampled row is checked against the value stated here with the document it comes from.
Each row carries the grade of the text it was read in (factors/CHECKS.md sections 14 and 16):
primary text (the publisher's document or data file), verbatim secondary (a faithful copy of the
data file, named in the row's note) or secondary (a report or summary); the sample states it.
"""

from __future__ import annotations

import csv

import pytest
from helpers import DEMO, FACTOR_HEADER, assert_one_line_error, assessment_with, run_cli, write

from carbonledger.api import score
from carbonledger.core.inputs import NumericInputs
from carbonledger.errors import InputError
from carbonledger.model.factors import factors_root, load_factor_set
from carbonledger.model.grades import Grade
from carbonledger.model.units import conversion_factor
from carbonledger.routes.base import electricity_flow
from carbonledger.stages.electricity import kind_of_source

GRID_CSV = factors_root() / "sets" / "default-2026" / "grid-electricity.csv"

# (factor id, value, unit, source grade, where the value is published)
P, V, S = Grade.PRIMARY_TEXT, Grade.VERBATIM_SECONDARY, Grade.SECONDARY
SAMPLE = [
    # North America
    ("electricity.grid.us_erct_2022", 771.083, "lb CO2/MWh", P,
     "US EPA eGRID2022, ERCT SRCO2RTA, EPA data file in USEPA/ggcapdthemes"),
    ("electricity.grid.us_akgd_2022", 1052.114, "lb CO2/MWh", P,
     "US EPA eGRID2022, AKGD SRCO2RTA, same EPA data file"),
    ("electricity.grid.canada_ontario_2018", 30, "g CO2e/kWh", P,
     "Canada NIR 1990-2018 Part 3, Table A13-7, consumption intensity 2018"),
    ("electricity.grid.canada_alberta_2017", 790, "g CO2e/kWh", P,
     "Canada NIR 1990-2018 Part 3, Table A13-10, consumption intensity 2017"),
    # Europe (a faithful copy of the EEA data files: verbatim secondary)
    ("electricity.grid.germany_2019", 338, "g CO2e/kWh", V, "EEA co2-emission-intensity-6, Germany 2019"),
    ("electricity.grid.france_2016", 58.5, "g CO2/kWh", V, "EEA co2-emission-intensity-5, France 2016"),
    # Oceania (secondary copy of NGA Factors 2024)
    ("electricity.grid.australia_vic_2024", 0.77, "kg CO2e/kWh", S, "NGA Factors 2024, Victoria scope 2"),
    # Asia (secondary reports of the official releases)
    ("electricity.grid.china_2022", 0.5366, "kg CO2/kWh", S, "MEE/NBS 2022 national average factor"),
    ("electricity.grid.india_fy2023_24", 0.727, "t CO2/MWh", S, "CEA CO2 Baseline Database v20, weighted average 2023-24"),
    ("electricity.grid.japan_default_2006", 0.000555, "t CO2/kWh", P,
     "METI/MoE calculation ordinance default, read in the MoE press release of 19 Dec 2008"),
    # South America and Africa
    ("electricity.grid.brazil_2023", 0.0385, "t CO2/MWh", S, "MCTI SIRENE annual average factor 2023 (news report)"),
    ("electricity.grid.south_africa_eskom_fy2013_14", 1.07, "kg CO2/kWh", P,
     "Eskom Integrated Report 2014, environmental implications table, factor 1"),
    # Export-project countries: Our World in Data energy data set (CC BY 4.0, data from Ember), column
    # carbon_intensity_elec, read in owid-energy-data.csv of owid/energy-data at commit e7897aed
    ("electricity.grid.chile_2024", 259.87, "g CO2e/kWh", P, "OWID energy data, carbon_intensity_elec, Chile 2024"),
    ("electricity.grid.chile_2019", 456.54, "g CO2e/kWh", P, "OWID energy data, carbon_intensity_elec, Chile 2019"),
    ("electricity.grid.egypt_2023", 571.29, "g CO2e/kWh", P, "OWID energy data, carbon_intensity_elec, Egypt 2023"),
    ("electricity.grid.morocco_2022", 662.64, "g CO2e/kWh", P, "OWID energy data, carbon_intensity_elec, Morocco 2022"),
    ("electricity.grid.oman_2024", 542.77, "g CO2e/kWh", P, "OWID energy data, carbon_intensity_elec, Oman 2024"),
    ("electricity.grid.namibia_2023", 47.62, "g CO2e/kWh", P, "OWID energy data, carbon_intensity_elec, Namibia 2023"),
    ("electricity.grid.united_arab_emirates_2023", 483.79, "g CO2e/kWh", P, "OWID energy data, carbon_intensity_elec, UAE 2023"),
    # OWID chart CSV (Ember 2025) read in a faithful third-party copy (pluginsGLPI/carbon): verbatim secondary
    ("electricity.grid.germany_2023", 371.311, "g CO2e/kWh", V, "OWID chart (copy), Germany 2023"),
    ("electricity.grid.poland_2024", 614.982, "g CO2e/kWh", V, "OWID chart (copy), Poland 2024"),
]


@pytest.fixture(scope="module")
def default_set():
    return load_factor_set("default-2026")


@pytest.mark.parametrize("factor_id, value, unit, grade, where", SAMPLE, ids=[row[0] for row in SAMPLE])
def test_sampled_rows_match_their_publication(default_set, factor_id, value, unit, grade, where):
    row = default_set.factors[factor_id]
    assert row.value == pytest.approx(value, rel=1e-12), where
    assert row.unit == unit, where
    assert row.grade is grade, f"{factor_id}: grade should be {grade} ({where})"
    assert not row.from_memory  # every sampled row was read in a text
    assert row.source and row.table and row.year and row.region


def test_sample_spans_continents():
    """At least 8 rows from at least five continents (North America, Europe, Oceania, Asia, South America, Africa)."""
    assert len(SAMPLE) >= 8
    prefixes = {"us_": "North America", "canada_": "North America", "germany": "Europe", "france": "Europe",
                "australia": "Oceania", "china": "Asia", "india": "Asia", "japan": "Asia", "brazil": "South America",
                "south_africa": "Africa"}
    continents = {c for factor_id, *_ in SAMPLE for p, c in prefixes.items() if factor_id.split(".")[2].startswith(p)}
    assert len(continents) >= 5


def test_us_pounds_per_megawatt_hour_convert_by_hand(default_set):
    """1 lb = 0.45359237 kg exactly (international yard and pound, 1959), so
    1 lb/MWh = 453.59237 g / 1000 kWh = 0.45359237 g/kWh. ERCOT (eGRID2022, 771.083 lb CO2/MWh)
    is therefore 771 x 0.45359237 + 0.083 x 0.45359237 = 349.71972 + 0.03765 = 349.7574 g CO2/kWh."""
    by_hand_g_per_kwh = 771.083 * 453.59237 / 1000.0
    assert by_hand_g_per_kwh == pytest.approx(349.7574, abs=5e-5)
    assert conversion_factor("lb CO2/MWh", "g CO2/kWh") == pytest.approx(0.45359237, rel=1e-12)
    inputs = NumericInputs(default_set)
    assert inputs.factor("electricity.grid.us_erct_2022", "g CO2/kWh") == pytest.approx(by_hand_g_per_kwh, rel=1e-12)
    flow, kg_per_kwh = electricity_flow(inputs, "electricity.grid.us_erct_2022", "electricity.sources.grid.factor")
    assert flow == "co2_fossil"  # a CO2-only rate is counted as fossil CO2, not as pre-characterised CO2e
    assert kg_per_kwh == pytest.approx(by_hand_g_per_kwh / 1000.0, rel=1e-12)


def test_eskom_factor_is_the_published_quotient(default_set):
    """Eskom's own footnote: 233.3 Mt CO2 / 217 903 GWh sold = 1.07 t/MWh."""
    assert 233.3e6 / 217_903e3 == pytest.approx(default_set.factors["electricity.grid.south_africa_eskom_fy2013_14"].value, abs=0.005)


def test_every_grid_row_states_its_basis_and_gas_matches_unit():
    with GRID_CSV.open(encoding="utf-8") as handle:
        rows = list(csv.DictReader(line for line in handle if not line.startswith("#")))
    assert len(rows) >= 100
    for row in rows:
        assert row["id"].startswith("electricity.grid."), row["id"]
        assert row["source"] and row["table"] and row["year"] and row["region"], row["id"]
        note = row["note"]
        assert note.startswith("Basis: CO2"), row["id"]
        assert ("generation" in note) or ("consumption" in note), row["id"]
        is_co2e = "CO2e" in row["unit"]
        assert note.startswith("Basis: CO2e") == is_co2e, f"{row['id']}: note basis and unit {row['unit']} disagree"
        assert row["grade"] in ("primary text", "verbatim secondary", "secondary"), row["id"]
        if row["grade"] != "primary text":
            assert "secondary" in note.lower() or "seen only" in note.lower() or "copy" in note.lower(), row["id"]


def test_export_project_countries_have_several_years(default_set):
    """Chile, Morocco, Egypt, Namibia, Oman and the UAE (the export hydrogen countries of the issue) each have
    at least five published years, and every EU member state has rows for 2020 to 2024."""
    for region in ("chile", "morocco", "egypt", "namibia", "oman", "united_arab_emirates"):
        years = [key for key in default_set.factors if key.startswith(f"electricity.grid.{region}_")]
        assert len(years) >= 5, region
    for region in ("austria", "germany", "italy", "denmark", "spain", "sweden", "poland", "norway"):
        for year in range(2020, 2025):
            assert f"electricity.grid.{region}_{year}" in default_set.factors


def test_german_ember_figure_is_near_the_federal_environment_agency(default_set):
    """A plausibility check against another official publication (different basis, so only within 10 %):
    Umweltbundesamt, Climate Change 13/2025, p. 21: 386 g CO2/kWh for 2023 (preliminary, CO2 per kWh
    consumed); read only in a secondary quotation of that page (from memory). The OWID/Ember 2023 row is
    CO2e per kWh generated."""
    uba_2023_g_co2_per_kwh = 386
    ember = default_set.factors["electricity.grid.germany_2023"].value
    assert abs(ember - uba_2023_g_co2_per_kwh) / uba_2023_g_co2_per_kwh < 0.10


def test_existing_grid_rows_are_unchanged(default_set):
    """Published values already in the set (EEA IND-353 text; SEAI portal) keep their values."""
    assert default_set.factors["electricity.grid.eu27_2018"].value == 281
    assert default_set.factors["electricity.grid.ireland_2015"].value == 467.5


def test_unknown_region_or_year_suggests_close_ids(default_set):
    inputs = NumericInputs(default_set, source="project.toml")
    with pytest.raises(InputError) as caught:
        inputs.factor("electricity.grid.germany_2025", "g CO2e/kWh", "electricity.sources.grid.factor")
    message = str(caught.value)
    assert "did you mean" in message and "'electricity.grid.germany_2024'" in message
    with pytest.raises(InputError) as caught:
        inputs.factor("electricity.grid.ontario_2018", "g CO2e/kWh", "electricity.sources.grid.factor")
    assert "'electricity.grid.canada_ontario_2018'" in str(caught.value)


def test_cli_names_the_close_ids_in_one_line():
    result = run_cli("score", DEMO / "grid_electrolysis_hydrogen.toml", "--no-ledger",
                     "--set", "electricity.sources.grid.factor=electricity.grid.us_erct_2021")
    assert_one_line_error(result)
    assert "did you mean 'electricity.grid.us_erct_2022'" in result.stderr


def test_factors_list_json_shows_grid_rows_with_sources():
    result = run_cli("factors", "list", "--prefix", "electricity.grid.", "--format", "json")
    assert result.exit_code == 0, result.output
    import json

    rows = json.loads(result.stdout)["factors"]
    by_id = {row["id"]: row for row in rows}
    assert len(rows) >= 100
    assert by_id["electricity.grid.us_erct_2022"]["unit"] == "lb CO2/MWh"
    assert all(row["source"] for row in rows)


def test_residual_mix_is_not_zero_rated_as_renewable(tmp_path):
    """Market-based residual-mix factors live under electricity.residual_mix.*: a scheme that counts renewable
    electricity at zero must still charge them. The residual-mix value below is INVENTED for this test."""
    assert kind_of_source("electricity.residual_mix.testland_2023") == "residual_mix"
    override = write(tmp_path / "residual.csv", FACTOR_HEADER
                     + "electricity.residual_mix.testland_2023,400,g CO2/kWh,INVENTED for a test,,2023,Testland (invented),invented,false\n")
    project = DEMO / "grid_electrolysis_hydrogen.toml"
    # the same declaration for both: a direct line to a generator commissioned in 2025 (the EU rule's
    # Art. 3 and 5, Delegated Regulation (EU) 2023/1184); only a renewable generator is then counted at zero
    declared = ['electricity.sources.grid.procurement="direct_line"', "electricity.sources.grid.commissioned=2025-06-01"]
    residual = score(project, assessment=assessment_with(factors=override, schemes=["eu-rfnbo"], overrides=["electricity.sources.grid.factor=electricity.residual_mix.testland_2023", *declared]))
    wind = score(project, assessment=assessment_with(factors=override, schemes=["eu-rfnbo"], overrides=["electricity.sources.grid.factor=electricity.renewable.wind_onshore", *declared]))
    assert residual.checks[0].value > 0
    assert wind.checks[0].value == pytest.approx(0.0, abs=1e-12)


def test_factors_list_states_the_accounting_basis():
    """Location-based grid averages and market-based residual mixes are two methods that are reported apart
    (GHG Protocol Scope 2 Guidance, 2015: dual reporting; from memory): the listing says which is which."""
    import json

    result = run_cli("factors", "list", "--prefix", "electricity.grid.chile", "--format", "json")
    assert result.exit_code == 0, result.output
    listing = json.loads(result.stdout)
    assert all(row["accounting_basis"].startswith("location-based") for row in listing["factors"])
    assert listing["accounting_bases"]["electricity.residual_mix."].startswith("market-based")
    table = run_cli("factors", "list", "--prefix", "electricity.")
    assert "electricity.residual_mix.* rows are market-based" in table.stdout


def test_a_project_cannot_mix_location_and_market_based_grid_factors(tmp_path):
    """The residual-mix value below is INVENTED for this test; mixing it with a grid average is refused in one line."""
    override = write(tmp_path / "residual.csv", FACTOR_HEADER
                     + "electricity.residual_mix.testland_2023,400,g CO2/kWh,INVENTED for a test,,2023,Testland (invented),invented,false\n")
    result = run_cli("score", DEMO / "grid_electrolysis_hydrogen.toml", "--no-ledger", "--factors", str(override),
                     "--set", "electricity.sources.grid.share=0.5",
                     "--set", "electricity.sources.rest.share=0.5",
                     "--set", "electricity.sources.rest.factor=electricity.residual_mix.testland_2023")
    assert_one_line_error(result)
    assert "one accounting basis" in result.stderr
