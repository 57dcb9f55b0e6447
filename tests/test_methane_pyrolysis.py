"""Methane pyrolysis (CH4 -> C + 2 H2): carbon balance, stoichiometric limits and the co-product
rule, each with the arithmetic written out."""

from __future__ import annotations

import pytest
from helpers import FACTOR_HEADER, assert_one_line_error, assessment_with, run_cli, write

from carbonledger.api import score
from carbonledger.model.factors import load_factor_set
from carbonledger.model.reference import co2_formation_enthalpy, molar_mass_g_per_mol

PROJECT = """
[project]
name = "Pyrolysis test (invented)"
product = "hydrogen"
[hydrogen]
route = "methane_pyrolysis"
[pyrolysis]
natural_gas_gj_per_kg_h2 = {gas}
electricity_kwh_per_kg_h2 = 10.0
carbon_kg_per_kg_h2 = {carbon}
carbon_allocation = "{allocation}"
{extra}
[natural_gas]
methane_emission_share = 0.01
methane_emission_basis = "methane_delivered"
[electricity.sources.grid]
share = 1.0
factor = "electricity.grid.eu27_2018"
"""
FACTORS = load_factor_set("default-2026").factors


def project(write_project, gas=0.23, carbon=2.9, allocation="none", extra=""):
    return write_project(PROJECT.format(gas=gas, carbon=carbon, allocation=allocation, extra=extra))


def test_carbon_balance_gives_the_direct_co2(write_project):
    result = score(project(write_project))
    # 0.23 GJ x 56.1 kg CO2/GJ (IPCC 2006 Vol. 2 Table 2.2, 56,100 kg/TJ) = 12.903 kg CO2 if all the gas carbon burnt;
    # 2.9 kg of it stays solid: 2.9 x 44.009 / 12.011 = 10.626 kg CO2 not formed
    gas_co2 = 0.23 * FACTORS["combustion.natural_gas.co2"].value / 1000.0
    kept = 2.9 * molar_mass_g_per_mol("CO2") / molar_mass_g_per_mol("C")
    direct = next(e.amount for e in result.exchanges if e.activity == "hydrogen_production" and e.input == "co2_fossil")
    assert direct == pytest.approx(gas_co2 - kept, rel=1e-12)
    assert gas_co2 - kept == pytest.approx(12.903 - 10.626, abs=2e-3)
    assert result.co_products == {"co_product": "solid carbon", "kg_per_kg_h2": 2.9, "method": "none", "hydrogen_share": 1.0}


def test_carbon_heating_value_against_a_handbook():
    # heat of combustion of graphite 393.5 kJ/mol (CRC Handbook / NIST: dHf of CO2(g) -393.51 kJ/mol), over 12.011 g/mol
    assert -co2_formation_enthalpy().value == pytest.approx(393.5, abs=0.2)


@pytest.mark.parametrize("allocation", ["mass", "energy"])
def test_allocation_scales_the_hydrogen_production_burden(write_project, allocation):
    whole = score(project(write_project))
    shared = score(project(write_project, allocation=allocation))
    if allocation == "mass":
        share = 1.0 / (1.0 + 2.9)  # 1 kg H2 and 2.9 kg C
    else:
        hydrogen_lhv = FACTORS["heating_value.hydrogen.lhv"].value  # 119.96 MJ/kg (US DOE HyARC table)
        carbon_lhv = 393.474 / 12.011  # chemicals' dHf(CO2) over the molar mass of carbon, MJ/kg
        share = hydrogen_lhv / (hydrogen_lhv + 2.9 * carbon_lhv)
    assert shared.co_products["hydrogen_share"] == pytest.approx(share, rel=1e-4)
    assert shared.total == pytest.approx(whole.total * shared.co_products["hydrogen_share"], rel=1e-12)


def test_system_expansion_credits_the_displaced_product(write_project, tmp_path):
    override = write(tmp_path / "displaced.csv", FACTOR_HEADER + "carbon_black.invented,1.5,kg CO2e/kg,Invented for this test,,,,invented value,false\n")
    expanded = score(project(write_project, allocation="system_expansion", extra='displaced_product_factor = "carbon_black.invented"'), assessment=assessment_with(factors=override))
    whole = score(project(write_project), assessment=assessment_with(factors=override))
    assert expanded.total == pytest.approx(whole.total - 2.9 * 1.5, rel=1e-12)


@pytest.mark.parametrize(
    "gas, carbon, allocation, extra",
    [
        (0.15, 2.0, "none", ""),  # below 3.979 kg CH4 x 50.04 MJ/kg = 0.199 GJ per kg H2
        (0.23, 3.1, "none", ""),  # more carbon than 12.011 / (2 x 2.016) = 2.979 kg per kg H2
        (0.23, 2.9, "system_expansion", ""),  # no displaced product named
        # a displaced product named with mass allocation is allowed: a scheme whose rulebook requires
        # system expansion uses it (tests/test_co_product_rules.py)
    ],
)
def test_impossible_pyrolysis_is_one_line(write_project, gas, carbon, allocation, extra):
    assert_one_line_error(run_cli("score", project(write_project, gas, carbon, allocation, extra), "--no-ledger"))
