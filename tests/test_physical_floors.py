"""Physical floors that no project can beat, from thermodynamic data of a reference library.

The Gibbs energies come from the ``chemicals`` library (standard enthalpies of formation and
entropies at 298.15 K, TRC ideal-gas heat capacities) and are compared here with the NIST-JANAF
Thermochemical Tables (Chase 1998): water, Gibbs energy of formation -237.141 kJ/mol as liquid at
298.15 K and -192.590 kJ/mol as gas at 1000 K.
"""

from __future__ import annotations

from pathlib import Path

import pytest
from helpers import assessment_with

from carbonledger.api import score
from carbonledger.errors import InputError
from carbonledger.model.reference import molar_mass_g_per_mol, water_splitting_gibbs_j_per_mol

DEMO = Path(__file__).resolve().parents[1] / "demo_projects"
GRID = DEMO / "grid_electrolysis_hydrogen.toml"
BLUE = DEMO / "blue_smr_hydrogen.toml"


def test_gibbs_energy_of_water_splitting_matches_the_janaf_tables():
    # NIST-JANAF (Chase 1998): liquid water 237.141 kJ/mol at 298.15 K; steam 192.590 kJ/mol at 1000 K.
    assert water_splitting_gibbs_j_per_mol(298.15, False) == pytest.approx(237141, rel=2e-4)
    assert water_splitting_gibbs_j_per_mol(1000.0, True) == pytest.approx(192590, rel=2e-3)
    # 237.14 kJ/mol / 2.016 g/mol = 117.6 MJ/kg = 32.7 kWh/kg H2 (the figure quoted in the trade).
    kwh = water_splitting_gibbs_j_per_mol(298.15, False) / molar_mass_g_per_mol("H2") / 3600
    assert kwh == pytest.approx(32.7, abs=0.05)


@pytest.mark.parametrize("technology", ["alkaline", "pem"])
def test_low_temperature_electrolysis_needs_the_gibbs_energy_as_electricity(technology):
    # 1 kWh/kg electricity plus 40 kWh/kg heat passes the HHV floor (39.41 kWh/kg) but not the
    # Gibbs floor on electricity, 32.7 kWh/kg H2 (JANAF, liquid water at 25 degC).
    with pytest.raises(InputError) as error:
        score(GRID, assessment=assessment_with(overrides=[f"electrolysis.technology={technology}", "electrolysis.electricity_kwh_per_kg_h2=1", "electrolysis.heat_kwh_per_kg_h2=40"]))
    assert "electrolysis.electricity_kwh_per_kg_h2" in str(error.value) and "32.68" in str(error.value)
    score(GRID, assessment=assessment_with(overrides=[f"electrolysis.technology={technology}", "electrolysis.electricity_kwh_per_kg_h2=33", "electrolysis.heat_kwh_per_kg_h2=7"]))


def test_solid_oxide_floor_follows_its_temperature():
    # Steam at 1000 K (726.85 degC): 192.59 kJ/mol (JANAF) / 2.016 g/mol / 3600 = 26.53 kWh/kg H2.
    hotter = ["electrolysis.technology=solid_oxide", "electrolysis.operating_temperature_c=726.85", "electrolysis.heat_kwh_per_kg_h2=10"]
    with pytest.raises(InputError) as error:
        score(GRID, assessment=assessment_with(overrides=hotter + ["electrolysis.electricity_kwh_per_kg_h2=26.3"]))
    assert "26.5" in str(error.value)
    score(GRID, assessment=assessment_with(overrides=hotter + ["electrolysis.electricity_kwh_per_kg_h2=26.8"]))


def test_reforming_cannot_make_more_energy_than_it_buys():
    # First law, no imported heat: 0.0996 GJ gas + 0.4 kWh (1.44 MJ) = 101 MJ < 119.96 MJ/kg, the
    # hydrogen's lower heating value (US DOE HyARC table).
    with pytest.raises(InputError) as error:
        score(BLUE, assessment=assessment_with(overrides=["reforming.natural_gas_gj_per_kg_h2=0.0996"]))
    assert "reforming.natural_gas_gj_per_kg_h2" in str(error.value) and "119.96" in str(error.value)
    score(BLUE, assessment=assessment_with(overrides=["reforming.natural_gas_gj_per_kg_h2=0.120"]))
