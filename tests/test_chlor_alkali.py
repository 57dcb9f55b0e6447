"""By-product hydrogen of chlor-alkali electrolysis: product proportions against the trade's
figures and the allocation rules written out by hand."""

from __future__ import annotations

import pytest
from helpers import assert_one_line_error, run_cli

from carbonledger.api import score

PROJECT = """
[project]
name = "Chlor-alkali by-product hydrogen (invented)"
product = "hydrogen"
[hydrogen]
route = "chlor_alkali_by_product"
conditioning_kwh_per_kg_h2 = 2.0
[chlor_alkali]
cell_electricity_kwh_per_kg_h2 = 88.0
allocation = "{allocation}"
{prices}
[electricity.sources.grid]
share = 1.0
factor = "electricity.grid.eu27_2018"
"""
PRICES = "hydrogen_price_per_kg = 3.0\nchlorine_price_per_kg = 0.25\nsodium_hydroxide_price_per_kg = 0.40"


def run(write_project, allocation, prices=""):
    return score(write_project(PROJECT.format(allocation=allocation, prices=prices)))


def test_product_proportions_match_the_trade(write_project):
    figures = run(write_project, "none").co_products["kg_per_kg_h2"]
    # common practice (chlor-alkali BREF, 2014): per tonne of chlorine about 1.128 t NaOH and 28 kg H2
    assert figures["sodium_hydroxide"] / figures["chlorine"] == pytest.approx(1.128, rel=2e-3)
    assert 1.0 / figures["chlorine"] == pytest.approx(0.0284, rel=1e-2)


@pytest.mark.parametrize("allocation", ["none", "mass", "economic"])
def test_allocation_by_hand(write_project, allocation):
    whole = run(write_project, "none")
    result = run(write_project, allocation, PRICES if allocation == "economic" else "")
    chlorine, caustic = 70.906 / 2.01588, 2 * 39.99711 / 2.01588  # molar masses (IUPAC): Cl2, NaOH, H2
    share = {"none": 1.0, "mass": 1.0 / (1.0 + chlorine + caustic), "economic": 3.0 / (3.0 + chlorine * 0.25 + caustic * 0.40)}[allocation]
    assert result.co_products["hydrogen_share"] == pytest.approx(share, rel=1e-4)
    grid_kg_per_kwh = whole.total / (88.0 + 2.0)  # one grid source: the total is electricity x factor
    # the cells' electricity is shared, the conditioning electricity is charged to hydrogen whole
    assert result.total == pytest.approx(grid_kg_per_kwh * (88.0 * result.co_products["hydrogen_share"] + 2.0), rel=1e-12)


def test_economic_allocation_needs_prices(write_project):
    assert_one_line_error(run_cli("score", write_project(PROJECT.format(allocation="economic", prices="")), "--no-ledger"))
