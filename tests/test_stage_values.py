"""One value worked by hand per stage module (carbonledger/stages), from published constants.

Each expected number below was worked out by hand (the arithmetic is written beside it) from the
constant named with its source; none is copied from the code's output. Molar masses are from the IUPAC
standard atomic weights (IUPAC 2021, abridged values: H 1.008, C 12.011, N 14.007, O 15.999,
Na 22.990, Cl 35.45), so H2 2.016, CH4 16.043, CO2 44.009, H2O 18.015, NH3 17.031, N2 28.014,
Cl2 70.90, NaOH 39.997 g/mol. Inputs that are plant figures (a capture rate, a distance) are
invented round numbers, labelled so; they only carry the arithmetic.

``HAND_WORKED`` maps every stage module to its test here, and ``test_every_stage_module_has_a_hand_worked_test``
fails when a module is added to carbonledger/stages without one.
"""

from __future__ import annotations

import ast
from pathlib import Path

import numpy as np
import pytest

from carbonledger.stages import (
    ammonia,
    biomethane,
    capture,
    chlor_alkali,
    cracking,
    electricity,
    electrolysis,
    end_use,
    hydrogen_delivery,
    lifetime,
    natural_gas,
    pyrolysis,
    reforming,
    shipping,
)

ROOT = Path(__file__).resolve().parent.parent

# IUPAC 2021 standard atomic weights (abridged), summed by hand.
H2, CH4, CO2, H2O, NH3, N2, C = 2.016, 16.043, 44.009, 18.015, 17.031, 28.014, 12.011
CL2, NAOH = 70.90, 39.997


# ammonia --------------------------------------------------------------------------------------------

def test_ammonia_stoichiometry_per_tonne():
    # 3 H2 + N2 -> 2 NH3 (stoichiometry, common practice):
    # H2: 1000 x 3 x 2.016 / (2 x 17.031) = 6048 / 34.062 = 177.56 kg/t
    # N2: 1000 x 28.014 / 34.062 = 822.44 kg/t; the two add up to the tonne (conservation of mass)
    assert ammonia.stoichiometric_hydrogen_kg_per_t_nh3(H2, NH3) == pytest.approx(177.56, abs=0.005)
    assert ammonia.stoichiometric_nitrogen_kg_per_t_nh3(N2, NH3) == pytest.approx(822.44, abs=0.005)
    # H in NH3: 3 x 1.008 / 17.031 = 0.17756 kg H2 per kg NH3
    assert ammonia.hydrogen_mass_fraction_of_ammonia(H2, NH3) == pytest.approx(0.17756, abs=5e-6)
    # 2 % lost in storage (invented): 1 / 0.98 = 1.0204 t made per t leaving storage
    assert ammonia.ammonia_produced_per_t_delivered(0.02) == pytest.approx(1.0204, abs=5e-5)
    # 5 % above stoichiometry (invented): 177.56 x 1.05 = 186.44 kg/t; 250 kWh/t N2 = 0.25 kWh/kg
    assert ammonia.with_loss_allowance(177.56, 0.05) == pytest.approx(186.438, abs=5e-4)
    assert ammonia.air_separation_kwh_per_kg_n2(250.0) == pytest.approx(0.25)


# biomethane -----------------------------------------------------------------------------------------

def test_biomethane_biogenic_co2_and_upstream():
    # CH4 + 2 O2 -> CO2 + 2 H2O: 44.009 / 16.043 = 2.7432 kg CO2/kg CH4; methane LHV 50.04 MJ/kg (Fay and
    # Golomb, Energy and the Environment, 2002, Table 3.1, CRC Handbook data; the factor library's row)
    # -> 2.7432 / 50.04 x 1000 = 54.82 kg CO2/GJ (a little below the 56.1 of natural gas, IPCC 2006 Table 2.2)
    assert biomethane.biogenic_co2_kg_per_gj(CO2, CH4, 50.04) == pytest.approx(54.82, abs=0.01)
    # 0.165 GJ per kg H2 at 20 g CO2e/MJ (invented): 165 MJ x 20 g = 3300 g = 3.3 kg CO2e/kg H2
    assert biomethane.upstream_kg_co2e_per_kg_h2(0.165, 20.0) == pytest.approx(3.3)
    # 9.0 kg captured, 2 % lost (invented): 8.82 kg stored, 0.18 kg released
    assert biomethane.stored_kg(9.0, 0.02) == pytest.approx(8.82)
    assert biomethane.lost_kg(9.0, 0.02) == pytest.approx(0.18)


# capture --------------------------------------------------------------------------------------------

def test_capture_of_process_and_flue_co2():
    # 7.0 kg process CO2 and 2.0 kg flue CO2 per kg H2, 90 % capture (invented):
    # process only: 0.9 x 7.0 = 6.3 kg; process and flue: 0.9 x (7.0 + 2.0) = 8.1 kg
    assert capture.captured_co2_kg_per_kg_h2(7.0, 2.0, 0.9, "process") == pytest.approx(6.3)
    assert capture.captured_co2_kg_per_kg_h2(7.0, 2.0, 0.9, "process_and_flue") == pytest.approx(8.1)
    assert capture.captured_flue_share(0.9, "process") == 0.0
    # 110 kWh/t CO2 = 0.11 kWh/kg; 1.2 GJ/t CO2 = 0.0012 GJ/kg; 1 % leak = 0.01 kg/kg
    assert capture.compression_electricity_kwh_per_kg_co2(110.0) == pytest.approx(0.11)
    assert capture.capture_gas_gj_per_kg_co2(1.2) == pytest.approx(0.0012)
    assert capture.transport_storage_leak_kg_per_kg_co2(0.01) == pytest.approx(0.01)


# chlor-alkali ---------------------------------------------------------------------------------------

def test_chlor_alkali_co_products_and_least_cell_electricity():
    # 2 NaCl + 2 H2O -> Cl2 + H2 + 2 NaOH (EU Chlor-alkali BREF 2014, ch. 2):
    # Cl2: 70.90 / 2.016 = 35.169 kg/kg H2; NaOH: 2 x 39.997 / 2.016 = 39.680 kg/kg H2
    chlorine = chlor_alkali.chlorine_kg_per_kg_h2(CL2, H2)
    caustic = chlor_alkali.sodium_hydroxide_kg_per_kg_h2(NAOH, H2)
    assert chlorine == pytest.approx(35.169, abs=5e-4)
    assert caustic == pytest.approx(39.680, abs=5e-4)
    # by mass (ISO 14044 4.3.4): 1 / (1 + 35.169 + 39.680) = 1 / 75.849 = 0.013184
    assert chlor_alkali.hydrogen_share_by_mass(chlorine, caustic) == pytest.approx(0.013184, abs=5e-7)
    # by value, prices 3.0, 0.2 and 0.4 per kg (invented): 3 / (3 + 7.0338 + 15.872) = 3 / 25.906 = 0.11580
    assert chlor_alkali.hydrogen_share_by_value(chlorine, caustic, 3.0, 0.2, 0.4) == pytest.approx(0.11580, abs=5e-5)
    # n F E / M: Faraday constant 96 485.332 C/mol (SI Brochure 2019), E = 1.358 + 0.828 = 2.186 V (CRC
    # Handbook electrochemical series, recorded from memory): 2 x 96485.33 x 2.186 = 421 834 J/mol;
    # / 2.016 g/mol = 209 243 kJ/kg; / 3600 = 58.12 kWh/kg H2
    assert chlor_alkali.least_cell_electricity_kwh_per_kg_h2(2.186, H2) == pytest.approx(58.12, abs=0.01)


# cracking -------------------------------------------------------------------------------------------

def test_cracking_ammonia_enthalpy_and_heat():
    # 2 NH3 -> N2 + 3 H2 (stoichiometry): 2 x 17.031 / (3 x 2.016) = 34.062 / 6.048 = 5.6319 kg NH3/kg H2
    feed = cracking.ammonia_kg_per_kg_h2_cracked(NH3, H2)
    assert feed == pytest.approx(5.6319, abs=5e-5)
    # dfH NH3(g) = -45.9 kJ/mol (CRC Handbook): +91.8 kJ per 3 mol H2 = 91.8 / 6.048 = 15.179 MJ/kg H2
    enthalpy = cracking.reaction_enthalpy_mj_per_kg_h2(-45.9, H2)
    assert enthalpy == pytest.approx(15.179, abs=5e-4)
    # with the latent heat of ammonia at 1 atm, 1370 kJ/kg (CRC Handbook, 23.33 kJ/mol / 17.031 g/mol),
    # and 80 % of the heat reaching the reactor (invented): (15.179 + 5.6319 x 1.370) / 0.8
    # = (15.179 + 7.7157) / 0.8 = 28.618 MJ/kg H2
    heat = cracking.heat_mj_per_kg_h2_cracked(enthalpy, feed, 1370.0, 0.8)
    assert heat == pytest.approx(28.618, abs=5e-3)
    # heat from hydrogen, LHV 120 MJ/kg (US DOE HyARC 119.96, rounded): 24 / 120 = 0.2 kg burnt per kg cracked;
    # with 95 % recovery (invented) 1 / (0.95 - 0.2) = 1.3333 kg cracked per kg delivered
    burnt = cracking.hydrogen_burnt_share(24.0, 120.0, "hydrogen")
    assert burnt == pytest.approx(0.2)
    assert cracking.hydrogen_burnt_share(24.0, 120.0, "ammonia") == 0.0
    assert cracking.hydrogen_cracked_kg_per_kg_delivered(0.95, burnt) == pytest.approx(1.3333, abs=5e-5)
    # heat from ammonia: 20 MJ/kg cracked x 1.25 kg cracked per kg delivered = 25 MJ, none from gas
    assert cracking.fuel_heat_mj_per_kg_delivered(20.0, 1.25, "ammonia", "ammonia") == pytest.approx(25.0)
    assert cracking.fuel_heat_mj_per_kg_delivered(20.0, 1.25, "ammonia", "natural_gas") == 0.0


# electricity ----------------------------------------------------------------------------------------

def test_electricity_source_factor_and_kind():
    # 450 g CO2e/kWh (invented grid) = 0.45 kg CO2e/kWh
    assert electricity.source_emission_kg_per_kwh(450.0) == pytest.approx(0.45)
    assert electricity.kind_of_source("electricity.grid.vennor_bay_2024") == "grid"
    assert electricity.kind_of_source("combustion.natural_gas.co2") == "other"
    # GHG Protocol Scope 2 Guidance (2015): residual mixes are the market-based method
    assert "market-based" in electricity.accounting_basis("electricity.residual_mix.xx_2023")
    assert "location-based" in electricity.accounting_basis("electricity.grid.xx_2023")
    assert electricity.accounting_basis("electricity.renewable.wind") == ""


# electrolysis ---------------------------------------------------------------------------------------

def test_electrolysis_floors_water_and_heat():
    # HHV 141.88 MJ/kg / 3.6 = 39.41 kWh/kg; LHV 119.96 / 3.6 = 33.32 kWh/kg (US DOE HyARC)
    assert electrolysis.energy_floor_kwh_per_kg_h2("pem", 119.96, 141.88) == pytest.approx(39.41, abs=0.005)
    assert electrolysis.energy_floor_kwh_per_kg_h2("solid_oxide", 119.96, 141.88) == pytest.approx(33.32, abs=0.005)
    # Gibbs energy of formation of liquid water -237.14 kJ/mol (NIST-JANAF, 298.15 K):
    # 237 140 J/mol / 2.016 g/mol = 117 629 kJ/kg; / 3600 = 32.675 kWh/kg
    assert electrolysis.gibbs_floor_kwh_per_kg_h2(237140.0, H2) == pytest.approx(32.675, abs=5e-4)
    # H2O -> H2 + 1/2 O2: 18.015 / 2.016 = 8.936 kg water per kg H2
    assert electrolysis.stoichiometric_water_kg_per_kg_h2(H2O, H2) == pytest.approx(8.936, abs=5e-4)
    # 10 L/kg at 3 kWh/m3 (invented): 0.010 m3 x 3 = 0.03 kWh/kg
    assert electrolysis.water_treatment_kwh_per_kg_h2(10.0, 3.0) == pytest.approx(0.03)
    # 10 kWh of heat at 90 % boiler efficiency (invented): 36 MJ / 0.9 = 40 MJ = 0.040 GJ of gas
    assert electrolysis.heat_gas_gj_per_kg_h2(10.0, 0.9) == pytest.approx(0.040)


# end use --------------------------------------------------------------------------------------------

def test_end_use_pilot_fuel_and_grams():
    # LHV ammonia 18.6 MJ/kg (IEA AMF TCP, Fuel information: Ammonia, Table 1) and marine gas oil 42.7 MJ/kg
    # (Regulation (EU) 2023/1805, Annex II), both rows of the factor library,
    # pilot 5 % of the energy (invented): 18.6 x 0.05 / (0.95 x 42.7) = 0.93 / 40.565 = 0.022926 kg/kg
    assert end_use.pilot_fuel_kg_per_kg_ammonia(18.6, 42.7, 0.05) == pytest.approx(0.022926, abs=5e-7)
    # 0.35 g N2O per kg NH3 (invented) = 0.00035 kg/kg
    assert end_use.per_kg(0.35) == pytest.approx(0.00035)


# hydrogen delivery ----------------------------------------------------------------------------------

def test_hydrogen_delivery_losses_truck_and_liquefaction():
    # 0.1 % per 100 km over 500 km (invented): 0.005 leaked; intake 1 / 0.995 = 1.005025, lost 0.005025
    share = hydrogen_delivery.pipeline_loss_share(0.001, 500.0)
    assert share == pytest.approx(0.005)
    assert hydrogen_delivery.intake_per_unit_delivered(share) == pytest.approx(1.005025, abs=5e-7)
    assert hydrogen_delivery.lost_per_unit_delivered(share) == pytest.approx(0.005025, abs=5e-7)
    # 300 km, 0.3 kg fuel/km, return 80 %, 1000 kg payload (invented): 300 x 0.3 x 1.8 / 1000 = 0.162 kg/kg
    assert hydrogen_delivery.truck_fuel_kg_per_kg_h2(300.0, 0.3, 0.8, 1000.0) == pytest.approx(0.162)
    # 1 kW into a 4000 kg tank for a day; latent heat of normal hydrogen 446 kJ/kg at 1 atm (NIST WebBook,
    # recorded from memory): 86 400 kJ / 446 / 4000 = 0.04843
    assert hydrogen_delivery.boil_off_share(1.0, 24.0, 446.0, 4000.0) == pytest.approx(0.04843, abs=5e-6)
    # w = (h_l - h_0) - T_0 (s_l - s_0), with the liquid at 1 atm as the zero of h and s (CoolProp's
    # hydrogen reference state), gas at 25 degC and 1 atm h_0 = 3931.8 kJ/kg, s_0 = 53.376 kJ/(kg K)
    # (CoolProp, Leachman et al. 2009): -3931.8 + 298.15 x 53.376 = 11 982 kJ/kg = 3.3284 kWh/kg,
    # within 0.5 % of Barron (Cryogenic Systems, 2nd ed., 1985, ch. 3), 12 019 kJ/kg from 300 K (from memory)
    work = hydrogen_delivery.ideal_liquefaction_work_kwh_per_kg(0.0, 0.0, 3931.8, 53.376, 298.15)
    assert work == pytest.approx(3.3284, abs=5e-4)
    assert work == pytest.approx(12019.0 / 3600.0, rel=0.005)


# lifetime -------------------------------------------------------------------------------------------

def test_lifetime_stack_ageing_and_construction():
    # year 7 with replacements every 5 years: the stacks are 2 years old; 1 %/yr loss -> 0.98 of new
    assert lifetime.stack_age_years(7, 5) == 2
    fraction = lifetime.efficiency_fraction_of_new(0.01, 2)
    assert fraction == pytest.approx(0.98)
    # 50 kWh/kg new (invented): 50 / 0.98 = 51.020 kWh/kg; 1000 t/yr at 50 % load: 1000 x 0.5 x 0.98 = 490 t
    assert lifetime.electricity_kwh_per_kg_h2_aged(50.0, fraction) == pytest.approx(51.020, abs=5e-4)
    assert lifetime.annual_output_t(1000.0, 0.5, fraction) == pytest.approx(490.0)
    # output-weighted mean (ISO 14067 6.3; common practice): (10 x 1 + 20 x 3) / (1 + 3) = 70 / 4 = 17.5
    assert lifetime.output_weighted_mean(np.array([10.0, 20.0]), np.array([1.0, 3.0])) == pytest.approx(17.5)
    # 100 MW x 500 t/MW = 50 000 t CO2e over 1e9 kg of output: 5e7 kg / 1e9 kg = 0.05 kg CO2e/kg
    built = lifetime.construction_t_co2e_from_capacity(100.0, 500.0)
    assert built == pytest.approx(50_000.0)
    assert lifetime.construction_kg_co2e_per_unit(built, 1e9) == pytest.approx(0.05)


# natural gas ----------------------------------------------------------------------------------------

def test_natural_gas_mass_methane_and_combustion():
    # NCV of natural gas 48.0 TJ/Gg (IPCC 2006 Vol. 2 Ch. 1 Table 1.2): 1000 / 48.0 = 20.833 kg/GJ
    assert natural_gas.gas_mass_kg_per_gj(48.0) == pytest.approx(20.833, abs=5e-4)
    # CO2 56 100 kg/TJ (IPCC 2006 Vol. 2 Ch. 2 Table 2.2) = 56.1 kg/GJ
    assert natural_gas.combustion_kg_per_gj(56100.0) == pytest.approx(56.1)
    # 2.3 % of production (Alvarez et al. 2018), 90 % methane by mass (invented):
    # 0.023 / 0.977 x 20.833 x 0.9 = 0.023541 x 18.750 = 0.44140 kg CH4/GJ
    emitted = natural_gas.methane_emitted_kg_ch4_per_gj(0.023, "methane_produced", 48.0, 0.9)
    assert emitted == pytest.approx(0.44140, abs=5e-5)


# pyrolysis ------------------------------------------------------------------------------------------

def test_pyrolysis_carbon_balance_and_allocation():
    # CH4 -> C + 2 H2 (stoichiometry): 16.043 / 4.032 = 3.9789 kg CH4 and 12.011 / 4.032 = 2.9789 kg C per kg H2
    carbon = pyrolysis.stoichiometric_carbon_kg_per_kg_h2(C, H2)
    assert pyrolysis.stoichiometric_methane_kg_per_kg_h2(CH4, H2) == pytest.approx(3.9789, abs=5e-5)
    assert carbon == pytest.approx(2.9789, abs=5e-5)
    # C + O2 -> CO2: 44.009 / 12.011 = 3.6641 kg CO2 per kg C
    assert pyrolysis.co2_from_carbon_kg(1.0, CO2, C) == pytest.approx(3.6641, abs=5e-5)
    # all the carbon of the methane kept solid: the gas would give 3.9789 x 44.009 / 16.043 = 10.915 kg CO2,
    # the solid carbon holds 2.9789 x 3.6641 = 10.915 kg: none released
    assert pyrolysis.direct_co2_kg_per_kg_h2(10.915, carbon, CO2, C) == pytest.approx(0.0, abs=1e-3)
    # dfH CO2(g) = -393.51 kJ/mol (CODATA Key Values for Thermodynamics, 1989; recorded from memory, the CRC
    # Handbook's -393.5 kJ/mol is checked in test_reference_values): 393.51 / 12.011 = 32.762 MJ/kg C
    carbon_lhv = pyrolysis.carbon_lhv_mj_per_kg(-393.51, C)
    assert carbon_lhv == pytest.approx(32.762, abs=5e-4)
    # by mass (ISO 14044 4.3.4): 1 / (1 + 2.9789) = 0.25132
    assert pyrolysis.hydrogen_share_by_mass(carbon) == pytest.approx(0.25132, abs=5e-6)
    # by energy, hydrogen LHV 120 MJ/kg (US DOE HyARC 119.96, rounded): 2.9789 x 32.762 = 97.597 MJ;
    # 120 / (120 + 97.597) = 120 / 217.597 = 0.55148; the energy out is 217.60 MJ/kg H2
    assert pyrolysis.hydrogen_share_by_energy(carbon, 120.0, carbon_lhv) == pytest.approx(0.55148, abs=5e-5)
    assert pyrolysis.energy_out_mj_per_kg_h2(120.0, carbon, carbon_lhv) == pytest.approx(217.60, abs=0.01)


# reforming ------------------------------------------------------------------------------------------

def test_reforming_streams_and_energy():
    # 0.16 GJ of gas per kg H2 (invented) at 56.1 kg CO2/GJ (IPCC 2006 Vol. 2 Table 2.2): 8.976 kg CO2
    direct = reforming.direct_co2_kg_per_kg_h2(0.16, 56.1)
    assert direct == pytest.approx(8.976)
    # 60 % in the process stream (invented): 5.3856 kg process, 3.5904 kg flue; fuel gas 0.16 x 0.4 = 0.064 GJ
    assert reforming.process_co2_kg_per_kg_h2(direct, 0.6) == pytest.approx(5.3856)
    assert reforming.flue_co2_kg_per_kg_h2(direct, 0.6) == pytest.approx(3.5904)
    assert reforming.fuel_gas_gj_per_kg_h2(0.16, 0.6) == pytest.approx(0.064)
    # CH4 + 2 H2O -> CO2 + 4 H2: 16.043 / 8.064 = 1.9895 kg CH4 per kg H2; methane LHV 50.04 MJ/kg (Fay and
    # Golomb 2002, Table 3.1): 1.9895 x 50.04 = 99.55 MJ = 0.09955 GJ per kg H2
    assert reforming.stoichiometric_gas_floor_gj_per_kg_h2(CH4, H2, 50.04) == pytest.approx(0.09955, abs=5e-6)
    # 160 MJ of gas + 0.5 kWh x 3.6 MJ/kWh = 161.8 MJ per kg H2
    assert reforming.energy_in_mj_per_kg_h2(0.16, 0.5) == pytest.approx(161.8)


# shipping -------------------------------------------------------------------------------------------

def test_shipping_voyage_fuel_boil_off_and_factors():
    # 6000 nmi at 15 kn = 400 h = 16.667 days; 35 t/day (invented): 583.33 t laden;
    # ballast 85 % and 4 port days at 5 t/day (invented): 583.33 x 1.85 + 20 = 1099.17 t
    days = shipping.days_at_sea(6000.0, 15.0)
    assert days == pytest.approx(16.667, abs=5e-4)
    laden = shipping.laden_leg_fuel_t(35.0, days, 0.0, 38000.0, 6000.0)
    assert laden == pytest.approx(583.33, abs=5e-3)
    assert shipping.voyage_fuel_t(laden, 0.85, 4.0, 5.0) == pytest.approx(1099.17, abs=5e-3)
    # per tonne-nautical-mile instead: 2 g/(t nmi) x 38 000 t x 6000 nmi = 456 t
    assert shipping.laden_leg_fuel_t(0.0, days, 2.0, 38000.0, 6000.0) == pytest.approx(456.0)
    # 300 kW into the tanks for a day, latent heat of ammonia 1370 kJ/kg (CRC Handbook):
    # 300 x 86 400 = 25 920 000 kJ / 1370 = 18 920 kg = 18.920 t
    boil_off = shipping.boil_off_t(300.0, 24.0, 1370.0)
    assert boil_off == pytest.approx(18.920, abs=5e-4)
    # reliquefied at 0.5 kWh/kg on generators at 200 g/kWh (invented): 18 920 x 0.5 x 200 g = 1.892 t
    assert shipping.reliquefaction_fuel_t(boil_off, 0.5, 200.0) == pytest.approx(1.892, abs=5e-4)
    # LNG: Cf 2.750 t CO2/t (IMO MEPC.364(79) 2.2.1), slip 3.1 % (FuelEU Annex II, LNG Otto medium speed):
    # 2.750 x 0.969 = 2.66475 kg CO2/kg fuel
    assert shipping.burnt_emission_kg_per_kg_fuel(2.750, 0.031) == pytest.approx(2.66475, abs=5e-6)
    # HFO: LCV 40.5 MJ/kg and WtT 13.5 g CO2e/MJ (FuelEU Annex II): 40.5 x 13.5 / 1000 = 0.54675 kg/kg
    assert shipping.well_to_tank_kg_co2e_per_kg_fuel(40.5, 13.5) == pytest.approx(0.54675, abs=5e-6)
    # MGO pilot for 1 % of the energy of 1000 t LNG, LCV 49.1 and 42.7 MJ/kg (FuelEU Annex II):
    # 1000 x 49.1 x 0.01 / (0.99 x 42.7) = 491 / 42.273 = 11.615 t
    assert shipping.pilot_fuel_t(1000.0, 49.1, 42.7, 0.01) == pytest.approx(11.615, abs=5e-4)
    # 38 000 t loaded less 18.92 t lost = 37 981.08 t; 1099.17 t of fuel over it = 0.028940 t/t
    delivered = shipping.cargo_delivered_t(38000.0, 18.92)
    assert delivered == pytest.approx(37981.08)
    assert shipping.per_tonne_delivered(1099.17, delivered) == pytest.approx(0.028940, abs=5e-7)


# every stage module has one -------------------------------------------------------------------------

HAND_WORKED = {
    "ammonia": test_ammonia_stoichiometry_per_tonne,
    "biomethane": test_biomethane_biogenic_co2_and_upstream,
    "capture": test_capture_of_process_and_flue_co2,
    "chlor_alkali": test_chlor_alkali_co_products_and_least_cell_electricity,
    "cracking": test_cracking_ammonia_enthalpy_and_heat,
    "electricity": test_electricity_source_factor_and_kind,
    "electrolysis": test_electrolysis_floors_water_and_heat,
    "end_use": test_end_use_pilot_fuel_and_grams,
    "hydrogen_delivery": test_hydrogen_delivery_losses_truck_and_liquefaction,
    "lifetime": test_lifetime_stack_ageing_and_construction,
    "natural_gas": test_natural_gas_mass_methane_and_combustion,
    "pyrolysis": test_pyrolysis_carbon_balance_and_allocation,
    "reforming": test_reforming_streams_and_energy,
    "shipping": test_shipping_voyage_fuel_boil_off_and_factors,
}


def test_every_stage_module_has_a_hand_worked_test():
    on_disk = sorted(p.stem for p in (ROOT / "carbonledger" / "stages").glob("*.py") if p.stem != "__init__")
    assert sorted(HAND_WORKED) == on_disk, "add a hand-worked test for each new stage module"
    tree = ast.parse(Path(__file__).read_text(encoding="utf-8"))
    bodies = {node.name: node for node in tree.body if isinstance(node, ast.FunctionDef)}
    for module, test in HAND_WORKED.items():
        # the test calls a function of its module and asserts something
        nodes = list(ast.walk(bodies[test.__name__]))
        calls = {n.value.id for n in nodes if isinstance(n, ast.Attribute) and isinstance(n.value, ast.Name)}
        asserts = [n for n in nodes if isinstance(n, ast.Assert)]
        assert module in calls and asserts, (module, test.__name__)
