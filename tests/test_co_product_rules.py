"""Co-products under each scheme's own rule (factors/schemes/*.toml, [co_products]).

The rules recorded (all FROM MEMORY, flagged in the rulebooks): EU RFNBO and low-carbon fuels
(Delegated Regulation (EU) 2023/1185 Annex Part A): energy content, economic value for co-products
without energy content, system expansion for rigid processes; 45V (45VH2-GREET): displacement for
co-products with energy, nothing for the others; UK LCHS v4: energy content, economic value for the
others; Japan: no rule found. ISO/TS 19870:2023 leaves the choice to the methodology. The headline
uses the project's own choice; each check says what it used (``co_products``).
"""

from __future__ import annotations

import json
import shutil

import pytest
from helpers import DEMO, FACTOR_HEADER, ROOT, assessment_with, run_cli, write

from carbonledger.api import score
from carbonledger.model.rulebooks import load_schemes

PYROLYSIS = DEMO / "turquoise_pyrolysis_hydrogen.toml"
CHLOR_ALKALI = DEMO / "chlor_alkali_by_product_hydrogen.toml"


@pytest.fixture()
def covering(tmp_path, monkeypatch):
    """A copy of the factor library whose 45V and UK rulebooks also cover pyrolysis and chlor-alkali
    hydrogen (the shipped ones do not list these routes), so that their co-product rules apply."""
    from carbonledger.core import scoring

    factors = tmp_path / "factors"
    shutil.copytree(ROOT / "factors", factors)
    for name in ("us-45v", "uk-lchs"):
        path = factors / "schemes" / f"{name}.toml"
        path.write_text(path.read_text().replace('"biomethane_reforming"]', '"biomethane_reforming", "methane_pyrolysis", "chlor_alkali_by_product"]'))
    monkeypatch.setenv("CARBONLEDGER_FACTORS", str(factors))
    scoring.shipped_rulebooks.cache_clear()
    yield factors
    scoring.shipped_rulebooks.cache_clear()


def test_every_rulebook_states_its_co_product_rule_with_a_source():
    for scheme in load_schemes().values():
        assert scheme.co_products is not None, scheme.id
        assert scheme.co_products.source and "19870" in scheme.co_products.source, scheme.id
        assert scheme.co_products.from_memory, scheme.id  # none was checked against the scheme's text
    books = load_schemes()
    assert books["eu-rfnbo"].co_products.for_co_product(carries_energy=True, rigid=True) == "system_expansion"
    assert books["eu-rfnbo"].co_products.for_co_product(carries_energy=False, rigid=False) == "economic"
    assert books["us-45v"].co_products.for_co_product(carries_energy=False, rigid=True) == "none"
    assert books["japan-hydrogen"].co_products.rule == "not_stated"


def test_scheme_rule_the_route_cannot_apply_without_data_is_undetermined(covering):
    """45V wants system expansion for the carbon (it carries energy); the demo chose energy allocation and
    names no displaced product: the 45V value keeps energy allocation and the verdict cannot be judged."""
    result = score(PYROLYSIS, assessment=assessment_with(schemes=["us-45v"]))
    check = result.checks[0]
    assert check.co_products["scheme_rule"] == "system_expansion" and check.co_products["applied"] == "energy"
    assert check.status == "undetermined" and "displaced_product_factor" in check.reasons[0]
    assert result.co_products["method"] == "energy"


def test_scheme_value_uses_the_scheme_rule_and_the_headline_the_project_choice(covering, tmp_path):
    """With a displaced product (an INVENTED factor of 1.5 kg CO2e/kg for the test), 45V's value is the
    system-expansion value: the unallocated value minus the credit 2.85 kg carbon x 1.5 = 4.275 kg CO2e
    per kg H2 (by hand); the headline stays on the project's energy allocation."""
    override = write(tmp_path / "displaced.csv", FACTOR_HEADER + "product.carbon_black_invented,1.5,kg CO2e/kg,INVENTED for a test,,2026,,invented,false\n")
    # grid electricity only, so that 45V (AR5, renewables at zero) equals the AR5 headline of the same method
    named = ["pyrolysis.displaced_product_factor=product.carbon_black_invented", "electricity.sources.grid.share=1.0", "electricity.sources.wind.share=0.0"]
    result = score(PYROLYSIS, assessment=assessment_with(schemes=["us-45v"], factors=str(override), overrides=named))
    unallocated = score(PYROLYSIS, assessment=assessment_with(schemes=["us-45v"], gwp="ar5", factors=str(override), overrides=[*named, 'pyrolysis.carbon_allocation="none"']))
    energy = score(PYROLYSIS, assessment=assessment_with(schemes=["us-45v"], factors=str(override), overrides=named))
    check = result.checks[0]
    assert check.co_products["applied"] == "system_expansion" and check.co_products["project_method"] == "energy"
    assert check.value == pytest.approx(unallocated.total - 2.85 * 1.5, rel=1e-9)
    assert result.total == pytest.approx(energy.total, rel=1e-12)  # the headline: the project's energy allocation
    assert result.co_products["method"] == "energy"


def test_economic_rule_for_chlorine_needs_prices(covering):
    """UK LCHS: chlorine and sodium hydroxide carry no energy, so economic value; the demo shares by mass."""
    result = score(CHLOR_ALKALI, assessment=assessment_with(schemes=["uk-lchs"]))
    check = result.checks[0]
    assert check.co_products["scheme_rule"] == "economic" and check.co_products["applied"] == "mass"
    assert check.status == "undetermined" and "prices" in check.reasons[0]
    prices = ["chlor_alkali.hydrogen_price_per_kg=4.0", "chlor_alkali.chlorine_price_per_kg=0.25", "chlor_alkali.sodium_hydroxide_price_per_kg=0.4"]
    by_mass = score(CHLOR_ALKALI, assessment=assessment_with(schemes=["uk-lchs"], overrides=prices))
    by_value = score(CHLOR_ALKALI, assessment=assessment_with(schemes=["uk-lchs"], overrides=[*prices, 'chlor_alkali.allocation="economic"']))
    unallocated = score(CHLOR_ALKALI, assessment=assessment_with(schemes=["uk-lchs"], overrides=[*prices, 'chlor_alkali.allocation="none"']))
    rescored = by_mass.checks[0]
    assert rescored.co_products["applied"] == "economic"
    assert by_mass.total == pytest.approx(result.total, rel=1e-12)  # the headline keeps mass allocation
    # grid electricity only (a pre-characterised CO2e factor), so the UK value in g/MJ (LHV 119.96 MJ/kg)
    # is the headline of the economic variant in kg/kg
    assert rescored.value * 119.96 / 1000 == pytest.approx(by_value.total, rel=1e-9)
    # by hand (2 NaCl + 2 H2O -> Cl2 + H2 + 2 NaOH: 35.2 kg Cl2 and 39.7 kg NaOH per kg H2): hydrogen's share
    # by value 4.0 / (4.0 + 35.2 x 0.25 + 39.7 x 0.4) = 4.0 / 28.68 = 0.139, by mass 1 / 75.9 = 0.013, so
    # the value-allocated figure lies between the mass-allocated and the unallocated ones
    assert by_mass.total < by_value.total < unallocated.total


def test_not_stated_keeps_the_project_choice_and_says_so(covering):
    result = score(PYROLYSIS, assessment=assessment_with(schemes=["japan-hydrogen"]))
    info = result.checks[0].co_products
    assert info["scheme_rule"] == "not_stated" and info["applied"] == "energy" and "no co-product rule" in info["note"]


def test_json_states_the_rule_on_every_check():
    out = json.loads(run_cli("score", DEMO / "green_electrolysis_ammonia.toml", "--no-ledger", "--format", "json").stdout)
    for check in out["checks"]:
        assert {"scheme_rule", "applied", "source", "from_memory"} <= set(check["co_products"])
