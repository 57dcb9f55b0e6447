"""Citations of the marine fuel defaults and of the RFNBO saving rule.

The marine defaults (well-to-tank, CH4, N2O, methane slip, lower calorific values) are those of
Regulation (EU) 2023/1805 (FuelEU Maritime) Annex II; the IMO resolution MEPC.376(80) they were
cited to has been revoked and replaced by MEPC.391(81). A well-to-tank factor in g CO2e/MJ must be
turned into g per kg of fuel with the heating value of the same table: FuelEU Annex II gives
0.0405 (HFO), 0.041 (LFO), 0.0427 (MGO) and 0.0491 (LNG) MJ/g (SOURCES.md; the oil rows read in
the Annex, the LNG row in a secondary copy).
"""

from __future__ import annotations

import pytest

from carbonledger.core.scoring import rulebooks
from carbonledger.model.factors import load_factor_set

FUELS = ("heavy_fuel_oil", "very_low_sulphur_fuel_oil", "marine_gas_oil", "lng")
FUELEU_LCV_MJ_PER_KG = {"heavy_fuel_oil": 40.5, "very_low_sulphur_fuel_oil": 41.0, "marine_gas_oil": 42.7, "lng": 49.1}


@pytest.fixture(scope="module")
def factors():
    return load_factor_set("default-2026")


def test_marine_rows_cite_fueleu_annex_ii_not_a_revoked_resolution(factors):
    rows = [factors.get(key) for key in factors.ids_with_prefix("marine_fuel.") if not key.endswith(".co2")]
    assert len(rows) >= 20
    for row in rows:
        assert "2023/1805" in row.source and "Annex II" in row.table, row.id
        assert "MEPC.376(80)" not in row.source, row.id


@pytest.mark.parametrize("fuel", FUELS)
def test_heating_value_comes_from_the_table_of_its_well_to_tank_factor(factors, fuel):
    heating, upstream = factors.get(f"marine_fuel.{fuel}.lhv"), factors.get(f"marine_fuel.{fuel}.well_to_tank")
    assert (heating.source, heating.table.split("(")[0]) == (upstream.source, upstream.table.split("(")[0])
    assert heating.value == pytest.approx(FUELEU_LCV_MJ_PER_KG[fuel])


def test_rfnbo_saving_rule_cites_article_29a():
    # Directive (EU) 2018/2001 Art. 29a(1) as amended by Directive (EU) 2023/2413 holds the 70 %
    # saving for RFNBOs; Art. 25(2) does not.
    scheme = rulebooks()["eu-rfnbo"]
    assert "Art. 29a(1)" in scheme.document and "2023/2413" in scheme.document
    assert all("Art. 25(2)" not in t.source for t in scheme.thresholds)
    assert "Art. 25(2)" not in scheme.document
