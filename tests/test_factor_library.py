"""The default factor set against the published values it cites, and the loader's rules."""

import pytest

from carbonledger.errors import InputError
from carbonledger.model.factors import DEFAULT_SET, load_factor_set, read_factor_rows
from carbonledger.model.grades import Grade
from carbonledger.model.units import conversion_factor


@pytest.fixture(scope="module")
def default():
    return load_factor_set(DEFAULT_SET)


def value(factor_set, factor_id):
    return factor_set.get(factor_id).value


# Published values as read in a document other than the CSV's own note (factors/CHECKS.md and
# /work/shared/SOURCES.md record where), or checked by physics against reference data. A value
# that was never read anywhere is not "checked" by typing it again: the test only requires that
# the row says so (grade "not yet verified"; model/grades.py). Grades follow the source grades of
# /work/shared/SOURCES.md and the casebook README: primary text, verbatim secondary, secondary.

# Molar masses from IUPAC conventional atomic weights (C 12.011, O 15.999, H 1.008, N 14.007).
M_CO2, M_CH4, M_H2, M_NH3 = 12.011 + 2 * 15.999, 12.011 + 4 * 1.008, 2 * 1.008, 14.007 + 3 * 1.008
# CODATA Key Values for Thermodynamics (Cox, Wagman and Medvedev, 1989), standard enthalpies of
# formation at 298.15 K, kJ/mol: H2O(l) -285.830, H2O(g) -241.826, NH3(g) -45.94.
DFH_WATER_LIQUID, DFH_WATER_GAS, DFH_AMMONIA_GAS = -285.830, -241.826, -45.94


def test_natural_gas_combustion_co2(default):
    # Commission Implementing Regulation (EU) 2018/2066 Annex VI repeats the IPCC 2006 default
    # for natural gas: 56.1 t CO2/TJ (a legal copy of Table 2.2).
    assert value(default, "combustion.natural_gas.co2") == 56_100
    # Physics: pure methane gives M(CO2)/M(CH4) / 50.04 MJ/kg (LHV, CRC Handbook via Fay and
    # Golomb Table 3.1) = 54.8 kg CO2/GJ; natural gas (heavier hydrocarbons, some CO2) a little more.
    methane_kg_per_gj = M_CO2 / M_CH4 / 50.04 * 1000
    assert 1.0 < value(default, "combustion.natural_gas.co2") / 1000 / methane_kg_per_gj < 1.05


def test_combustion_ch4_and_n2o_are_flagged_unverified(default):
    # IPCC 2006 Table 2.2 CH4 1 and N2O 0.1 kg/TJ were not found in any text (factors/CHECKS.md §1).
    assert default.get("combustion.natural_gas.ch4").grade is Grade.NOT_YET_VERIFIED
    assert default.get("combustion.natural_gas.n2o").grade is Grade.NOT_YET_VERIFIED
    assert default.get("combustion.natural_gas.ch4").from_memory  # the flag kept for compatibility follows the grade
    # the CO2 default is repeated by a law (Regulation (EU) 2018/2066 Annex VI): a faithful copy
    assert default.get("combustion.natural_gas.co2").grade is Grade.VERBATIM_SECONDARY


def test_ar4_gwp_as_listed_in_us_and_eu_law(default):
    # 40 CFR Part 98, Table A-1 to Subpart A (AR4-based version, before 89 FR 31894 of 2024):
    # CO2 1, CH4 25, N2O 298; Directive (EU) 2015/652 Annex I part 1 lists the same.
    assert value(default, "gwp.ar4.co2") == 1
    assert value(default, "gwp.ar4.ch4_fossil") == value(default, "gwp.ar4.ch4_non_fossil") == 25
    assert value(default, "gwp.ar4.n2o") == 298
    # read in those laws, which repeat AR4 Table 2.14: a faithful copy, not the report itself
    assert {default.get(f"gwp.ar4.{gas}").grade for gas in ("co2", "ch4_fossil", "ch4_non_fossil", "n2o")} == {Grade.VERBATIM_SECONDARY}


def test_ar5_gwp(default):
    # IPCC AR5 WG1 Table 8.7 without climate-carbon feedback: CH4 28 (read in a review citing the
    # table); N2O 265 was seen only in software constants, so the row must be flagged.
    assert value(default, "gwp.ar5.ch4_fossil") == value(default, "gwp.ar5.ch4_non_fossil") == 28
    assert value(default, "gwp.ar5.n2o") == 265 and default.get("gwp.ar5.n2o").grade is Grade.NOT_YET_VERIFIED
    assert default.get("gwp.ar5.ch4_fossil").grade is Grade.SECONDARY  # a review quoting the number, not a copy of the table


def test_ar6_gwp(default):
    # IPCC AR6 WG1 Table 7.15 (as reproduced): CH4 fossil 29.8, non-fossil 27.0, N2O 273.
    assert value(default, "gwp.ar6.ch4_fossil") == 29.8
    assert value(default, "gwp.ar6.ch4_non_fossil") == 27.0
    assert value(default, "gwp.ar6.n2o") == 273
    # Physics: fossil methane's GWP adds the CO2 its oxidation forms, M(CO2)/M(CH4) = 2.74 kg.
    difference = value(default, "gwp.ar6.ch4_fossil") - value(default, "gwp.ar6.ch4_non_fossil")
    assert difference == pytest.approx(M_CO2 / M_CH4, abs=0.1)


def test_heating_values_from_enthalpies_of_formation(default):
    # H2 + 1/2 O2 -> H2O: HHV = 285.830 / 2.016 = 141.78 MJ/kg, LHV = 241.826 / 2.016 = 119.95
    # (US DOE HyARC tabulates 141.88 and 119.96, the values of the CSV).
    assert value(default, "heating_value.hydrogen.hhv") == pytest.approx(-DFH_WATER_LIQUID / M_H2, rel=1e-3)
    assert value(default, "heating_value.hydrogen.lhv") == pytest.approx(-DFH_WATER_GAS / M_H2, rel=1e-3)
    # NH3 + 3/4 O2 -> 1/2 N2 + 3/2 H2O(g): (1.5 x 241.826 - 45.94) / 17.031 = 18.60 MJ/kg
    # (IEA AMF tabulates 18.6 for liquefied ammonia).
    ammonia_lhv = (1.5 * -DFH_WATER_GAS + DFH_AMMONIA_GAS) / M_NH3
    assert value(default, "heating_value.ammonia.lhv") == pytest.approx(ammonia_lhv, rel=2e-3)


def test_life_cycle_electricity_medians(default):
    # IPCC AR5 WG3 Annex III Table A.III.2 medians, g CO2e/kWh, as read in secondary copies that
    # agree (the report itself not checked, factors/CHECKS.md §9): every row is graded secondary.
    expected = {"renewable.solar_pv_utility": 48, "renewable.solar_pv_rooftop": 41, "renewable.concentrated_solar": 27, "renewable.wind_onshore": 11,
                "renewable.wind_offshore": 12, "renewable.hydropower": 24, "renewable.geothermal": 38, "low_carbon.nuclear": 12,
                "fossil.gas_combined_cycle": 490, "fossil.coal": 820}
    for technology, grams in expected.items():
        assert value(default, f"electricity.{technology}") == grams, technology
        assert default.get(f"electricity.{technology}").grade is Grade.SECONDARY, technology


def test_example_grid_factor(default):
    # EEA indicator IND-353 assessment (8 Dec 2020): EU-27 2018, 281 g CO2e/kWh (read in the text).
    assert value(default, "electricity.grid.eu27_2018") == 281
    assert default.get("electricity.grid.eu27_2018").grade is Grade.PRIMARY_TEXT
    assert not default.get("electricity.grid.eu27_2018").from_memory


def test_loader_refuses_a_row_without_a_unit(tmp_path):
    path = tmp_path / "rows.csv"
    path.write_text("id,value,unit,source\nx.y,1.0,,somewhere\n", encoding="utf-8")
    with pytest.raises(InputError) as error:
        read_factor_rows(path)
    assert "unit" in str(error.value) and "x.y" in str(error.value)


def test_loader_refuses_a_row_without_a_source(tmp_path):
    path = tmp_path / "rows.csv"
    path.write_text("id,value,unit,source\nx.y,1.0,kg CO2/GJ,\n", encoding="utf-8")
    with pytest.raises(InputError) as error:
        read_factor_rows(path)
    assert "source" in str(error.value) and "x.y" in str(error.value) and str(path) in str(error.value)


def test_loader_refuses_a_non_numeric_value(tmp_path):
    path = tmp_path / "rows.csv"
    path.write_text("id,value,unit,source\nx.y,lots,kg CO2/GJ,somewhere\n", encoding="utf-8")
    with pytest.raises(InputError, match="value"):
        read_factor_rows(path)


def test_sha256_identifies_content(tmp_path, default):
    override = tmp_path / "override.csv"
    override.write_text(
        "id,value,unit,source,from_memory\nelectricity.grid.eu27_2018,200,g CO2e/kWh,test override,true\n", encoding="utf-8"
    )
    changed = load_factor_set(override)
    assert changed.get("electricity.grid.eu27_2018").value == 200
    assert changed.sha256 != default.sha256
    assert load_factor_set(DEFAULT_SET).sha256 == default.sha256
    assert len(default.sha256) == 64


def test_unknown_set_is_refused():
    with pytest.raises(InputError, match="--factors"):
        load_factor_set("no-such-set")


def test_unit_conversion_with_pint():
    # 1 kg/TJ = 0.001 kg/GJ; 1 g/kWh = 1 kg/MWh; substances must match.
    assert conversion_factor("kg CO2/TJ", "kg CO2/GJ") == pytest.approx(1e-3)
    assert conversion_factor("g CO2e/kWh", "kg CO2e/MWh") == pytest.approx(1.0)
    with pytest.raises(ValueError):
        conversion_factor("kg CO2/TJ", "kg CH4/TJ")
