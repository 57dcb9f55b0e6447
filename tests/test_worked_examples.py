"""A worked example per route, with the arithmetic written out.

Published values used (see factors/sets/default-2026/factors.csv for full citations):
- natural gas combustion, 2006 IPCC Guidelines Vol. 2 Ch. 2 Table 2.2: CO2 56,100 kg/TJ = 56.1 kg/GJ,
  CH4 1 kg/TJ, N2O 0.1 kg/TJ (from memory)
- natural gas net calorific value 48.0 TJ/Gg (IPCC 2006 Vol. 2 Ch. 1 Table 1.2); methane mass
  fraction 0.9 (common practice, from memory); upstream CO2 5.0 kg/GJ (from memory)
- GWP100 AR6 (IPCC AR6 WG1 Table 7.15): CH4 fossil 29.8, N2O 273; AR4 (Table 2.14): CH4 25, N2O 298
- EEA: EU-27 grid 2018, 281 g CO2e/kWh; SEAI: Ireland grid 2015, 467.5 g CO2/kWh
- IPCC AR5 WGIII Annex III medians: solar PV utility 48, wind offshore 12 g CO2e/kWh
- hydrogen LHV 119.96 MJ/kg (US DOE HyARC); ammonia LHV 18.6 MJ/kg (IEA AMF)
"""

import pytest

from carbonledger.api import score

CO2_PER_GJ = 56.1
CH4_PER_GJ = 0.001
N2O_PER_GJ = 0.0001
LEAK_PER_GJ_PER_UNIT_LOSS = 1000 / 48.0 * 0.9  # kg CH4 per GJ per unit of loss rate
UPSTREAM_CO2_PER_GJ = 5.0
CH4_AR6, N2O_AR6 = 29.8, 273.0
EU_GRID, IRELAND_GRID = 0.281, 0.4675  # kg per kWh
SOLAR, WIND_OFFSHORE = 0.048, 0.012


def gas_upstream(gj, loss_rate):
    return gj * loss_rate * LEAK_PER_GJ_PER_UNIT_LOSS * CH4_AR6 + gj * UPSTREAM_CO2_PER_GJ


def test_steam_methane_reforming_without_capture(write_project):
    path = write_project(
        """
        [project]
        name = "worked SMR"
        product = "hydrogen"
        [hydrogen]
        route = "steam_methane_reforming"
        [reforming]
        natural_gas_gj_per_kg_h2 = 0.165
        electricity_kwh_per_kg_h2 = 0.3
        process_co2_share = 0.6
        [natural_gas]
        methane_emission_share = 0.01
        methane_emission_basis = "methane_delivered"
        [electricity.sources.grid]
        share = 1.0
        factor = "electricity.grid.eu27_2018"
        """
    )
    result = score(path)
    direct_co2 = 0.165 * CO2_PER_GJ  # 9.2565 kg CO2/kg H2, all carbon of feed and fuel
    fuel_gj = 0.165 * (1 - 0.6)  # the flue share is burnt as fuel
    plant = direct_co2 + fuel_gj * (CH4_PER_GJ * CH4_AR6 + N2O_PER_GJ * N2O_AR6)
    upstream = gas_upstream(0.165, 0.01)  # 0.165 * 0.01 * 18.75 * 29.8 + 0.165 * 5.0 = 1.7469
    electricity = 0.3 * EU_GRID
    assert result.by_stage["hydrogen_production"] == pytest.approx(plant, rel=1e-9)
    assert result.by_stage["natural_gas_supply"] == pytest.approx(upstream, rel=1e-9)
    assert result.by_stage["electricity_supply"] == pytest.approx(electricity, rel=1e-9)
    assert result.total == pytest.approx(plant + upstream + electricity, rel=1e-9)
    assert result.total == pytest.approx(11.09, abs=0.01)  # about 11 kg: the grey hydrogen of the trade
    assert result.intensity.g_co2e_per_mj == pytest.approx(result.total * 1000 / 119.96, rel=1e-9)


@pytest.mark.parametrize("applies_to", ["process", "process_and_flue"])
def test_steam_methane_reforming_with_capture(write_project, applies_to):
    path = write_project(
        f"""
        [project]
        name = "worked blue SMR"
        product = "hydrogen"
        [hydrogen]
        route = "steam_methane_reforming"
        [reforming]
        natural_gas_gj_per_kg_h2 = 0.170
        electricity_kwh_per_kg_h2 = 0.4
        process_co2_share = 0.6
        [capture]
        capture_rate = 0.9
        applies_to = "{applies_to}"
        compression_kwh_per_t_co2 = 120
        extra_natural_gas_gj_per_t_co2 = 1.0
        transport_storage_loss_fraction = 0.01
        [natural_gas]
        methane_emission_share = 0.008
        methane_emission_basis = "methane_delivered"
        [electricity.sources.grid]
        share = 1.0
        factor = "electricity.grid.eu27_2018"
        """
    )
    result = score(path)
    direct = 0.170 * CO2_PER_GJ  # 9.537 kg CO2/kg H2
    process, flue = 0.6 * direct, 0.4 * direct
    flue_rate = 0.9 if applies_to == "process_and_flue" else 0.0
    captured = 0.9 * process + flue_rate * flue
    # Capture: 1.0 GJ gas per t CO2 = 0.001 GJ/kg; its CO2 is captured only with flue capture.
    extra_gj = captured * 0.001
    extra_co2 = extra_gj * CO2_PER_GJ
    stored = captured + extra_co2 * flue_rate
    plant = (direct - captured) + 0.170 * 0.4 * (CH4_PER_GJ * CH4_AR6 + N2O_PER_GJ * N2O_AR6)
    capture_stage = extra_co2 * (1 - flue_rate) + extra_gj * (CH4_PER_GJ * CH4_AR6 + N2O_PER_GJ * N2O_AR6) + 0.01 * stored
    electricity = (0.4 + captured * 0.120) * EU_GRID
    upstream = gas_upstream(0.170 + extra_gj, 0.008)
    assert result.by_stage["hydrogen_production"] == pytest.approx(plant, rel=1e-9)
    assert result.by_stage["co2_capture_and_storage"] == pytest.approx(capture_stage, rel=1e-9)
    assert result.by_stage["electricity_supply"] == pytest.approx(electricity, rel=1e-9)
    assert result.by_stage["natural_gas_supply"] == pytest.approx(upstream, rel=1e-9)
    assert result.total == pytest.approx(plant + capture_stage + electricity + upstream, rel=1e-9)


def test_autothermal_reforming_with_capture_and_scheme_rules(write_project):
    path = write_project(
        """
        [project]
        name = "worked ATR"
        product = "hydrogen"
        [hydrogen]
        route = "autothermal_reforming"
        [reforming]
        natural_gas_gj_per_kg_h2 = 0.158
        electricity_kwh_per_kg_h2 = 1.6
        process_co2_share = 0.96
        [capture]
        capture_rate = 0.95
        applies_to = "process"
        compression_kwh_per_t_co2 = 110
        transport_storage_loss_fraction = 0.02
        [natural_gas]
        methane_emission_share = 0.005
        methane_emission_basis = "methane_delivered"
        [electricity.sources.wind]
        share = 1.0
        factor = "electricity.renewable.wind_offshore"
        """
    )
    result = score(path)
    direct = 0.158 * CO2_PER_GJ  # 8.8638
    captured = 0.95 * 0.96 * direct  # 8.0838
    fuel_gj = 0.158 * 0.04
    plant = direct - captured + fuel_gj * (CH4_PER_GJ * CH4_AR6 + N2O_PER_GJ * N2O_AR6)
    storage = 0.02 * captured
    kwh = 1.6 + captured * 0.110
    upstream = gas_upstream(0.158, 0.005)
    total = plant + storage + kwh * WIND_OFFSHORE + upstream
    assert result.total == pytest.approx(total, rel=1e-9)
    # US 45V rulebook: AR5 (CH4 28, N2O 265) and renewable electricity at zero.
    fuel_ghg_ar5 = fuel_gj * (CH4_PER_GJ * 28 + N2O_PER_GJ * 265)
    upstream_ar5 = 0.158 * 0.005 * LEAK_PER_GJ_PER_UNIT_LOSS * 28 + 0.158 * UPSTREAM_CO2_PER_GJ
    us_45v = direct - captured + fuel_ghg_ar5 + storage + upstream_ar5
    check = {c.scheme: c for c in result.checks}["us-45v"]
    assert check.value == pytest.approx(us_45v, rel=1e-9)
    assert check.margin == pytest.approx(4.0 - us_45v, rel=1e-9)


def test_electrolysis_on_a_solar_and_grid_mix(write_project):
    path = write_project(
        """
        [project]
        name = "worked electrolysis"
        product = "hydrogen"
        [hydrogen]
        route = "electrolysis"
        conditioning_kwh_per_kg_h2 = 1.5
        [electrolysis]
        technology = "alkaline"
        electricity_kwh_per_kg_h2 = 52.0
        water_litres_per_kg_h2 = 15
        water_treatment_kwh_per_m3 = 3.5
        [electricity.sources.solar]
        share = 0.55
        factor = "electricity.renewable.solar_pv_utility"
        [electricity.sources.grid]
        share = 0.45
        factor = "electricity.grid.ireland_2015"
        """
    )
    result = score(path)
    kwh = 52.0 + 1.5 + 15 / 1000 * 3.5  # 53.5525 kWh/kg H2
    total = kwh * (0.55 * SOLAR + 0.45 * IRELAND_GRID)
    assert result.total == pytest.approx(total, rel=1e-9)
    # The Irish factor is direct CO2 (g CO2/kWh), the solar one life-cycle CO2e.
    assert result.by_gas["co2_fossil"] == pytest.approx(kwh * 0.45 * IRELAND_GRID, rel=1e-9)
    assert result.by_gas["co2e_precharacterised"] == pytest.approx(kwh * 0.55 * SOLAR, rel=1e-9)
    # EU RFNBO rulebook: renewable electricity counts zero, grid at its factor; per MJ LHV.
    eu = {c.scheme: c for c in result.checks}["eu-rfnbo"]
    assert eu.value == pytest.approx(kwh * 0.45 * IRELAND_GRID * 1000 / 119.96, rel=1e-9)
    # Japan's hydrogen rulebook counts every source at its life-cycle factor.
    japan = {c.scheme: c for c in result.checks}["japan-hydrogen"]
    assert japan.value == pytest.approx(total, rel=1e-9)


def test_ammonia_from_grid_electrolysis(write_project):
    path = write_project(
        """
        [project]
        name = "worked ammonia"
        product = "ammonia"
        [hydrogen]
        route = "electrolysis"
        [electrolysis]
        technology = "pem"
        electricity_kwh_per_kg_h2 = 54.0
        [electricity.sources.grid]
        share = 1.0
        factor = "electricity.grid.eu27_2018"
        [ammonia]
        nitrogen_source = "air_separation"
        air_separation_kwh_per_t_n2 = 110
        hydrogen_loss_allowance = 0.01
        synthesis_electricity_kwh_per_t_nh3 = 600
        storage_electricity_kwh_per_t_nh3 = 25
        storage_loss_fraction = 0.001
        """
    )
    result = score(path)
    # Molar masses (IUPAC): H2 2.01588, N2 28.0134, NH3 17.03052 g/mol.
    hydrogen_kg = 1000 * 3 * 2.01588 / (2 * 17.03052) * 1.01  # 179.33 kg per t NH3 synthesised
    nitrogen_kg = 1000 * 28.0134 / (2 * 17.03052) * 1.01  # 830.67 kg
    synthesised = 1 / (1 - 0.001)  # t made per t leaving storage
    kwh = synthesised * (hydrogen_kg * 54.0 + nitrogen_kg * 0.110 + 600) + 25
    total = kwh * EU_GRID
    assert result.total == pytest.approx(total, rel=1e-6)
    assert result.intensity.kg_co2e_per_t_nh3 == pytest.approx(total, rel=1e-6)
    assert result.intensity.g_co2e_per_mj == pytest.approx(total / 18.6, rel=1e-6)
    hydrogen_fraction = 3 * 2.01588 / 2 / 17.03052
    assert result.intensity.kg_co2e_per_kg_h2 == pytest.approx(total / 1000 / hydrogen_fraction, rel=1e-6)
    assert result.hydrogen_production_kg_co2e_per_kg_h2 == pytest.approx(54.0 * EU_GRID, rel=1e-9)
    assert result.total > 2_600  # worse than grey ammonia, about 2.0 to 2.6 t CO2e/t (common practice)
    japan = {c.scheme: c for c in result.checks}["japan-ammonia"]
    assert japan.value == pytest.approx(total / 1000, rel=1e-6)
    assert not japan.passes


def test_methane_emission_share_is_converted_by_its_basis(tmp_path):
    # Natural gas 48.0 MJ/kg (IPCC 2006 Vol. 2 Ch. 1 Table 1.2) holds 20.83 kg of gas per GJ, of
    # which 0.9 is methane by mass (factor set). A share of 1 % emitted:
    #   of methane delivered:      0.01 x 20.83 x 0.9          = 0.1875 kg CH4/GJ
    #   of methane produced:       0.01 / 0.99 x 20.83 x 0.9   = 0.1894 kg CH4/GJ (s / (1 - s))
    #   of gas delivered by mass:  0.01 x 20.83                = 0.2083 kg CH4/GJ (10 % more)
    from carbonledger.stages.natural_gas import methane_emitted_kg_ch4_per_gj

    assert methane_emitted_kg_ch4_per_gj(0.01, "methane_delivered", 48.0, 0.9) == pytest.approx(1000 / 48.0 * 0.9 * 0.01, rel=1e-12)
    assert methane_emitted_kg_ch4_per_gj(0.01, "methane_produced", 48.0, 0.9) == pytest.approx(1000 / 48.0 * 0.9 * 0.01 / 0.99, rel=1e-12)
    by_mass = methane_emitted_kg_ch4_per_gj(0.01, "gas_delivered_by_mass", 48.0, 0.9)
    assert by_mass == pytest.approx(0.2083, abs=1e-4)
    assert by_mass / methane_emitted_kg_ch4_per_gj(0.01, "methane_delivered", 48.0, 0.9) == pytest.approx(1 / 0.9)
