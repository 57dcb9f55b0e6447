"""Modelling choices made consistent across routes and legs, each with its arithmetic worked by hand.

1. Conditioning electricity (purifying and compressing the hydrogen after it is produced) is the
   hydrogen's own: a co-product route shares its reactor or cell electricity with the co-product,
   never the conditioning (methane pyrolysis now as chlor-alkali by-product hydrogen).
2. A hydrogen leg after cracking draws the destination's electricity (cracking.electricity_factor),
   not the origin plant's mix.
The projects are invented test cases.
"""

from __future__ import annotations

from pathlib import Path

import pytest
from helpers import assessment_with

from carbonledger.api import score
from carbonledger.errors import InputError

DEMO = Path(__file__).resolve().parents[1] / "demo_projects"


def exchange(result, activity: str, supplier: str):
    return next(e for e in result.exchanges if e.activity == activity and e.input == supplier)


def test_pyrolysis_conditioning_is_not_shared_with_the_carbon():
    # Mass allocation (ISO 14044 4.3.4.2, physical relationship): hydrogen's share = 1 kg / (1 + 2.9 kg carbon) = 0.25641.
    # Electricity of the plant: 12 kWh x 0.25641 (reactor, shared) + 1.0 kWh (conditioning, the hydrogen's own) = 4.07692 kWh/kg H2.
    overrides = ["pyrolysis.carbon_allocation=mass", "pyrolysis.electricity_kwh_per_kg_h2=12", "pyrolysis.carbon_kg_per_kg_h2=2.9", "hydrogen.conditioning_kwh_per_kg_h2=1.0"]
    result = score(DEMO / "turquoise_pyrolysis_hydrogen.toml", assessment=assessment_with(overrides=overrides))
    assert exchange(result, "hydrogen_production", "electricity_mix").amount == pytest.approx(12 / 3.9 + 1.0, rel=1e-12)
    # the chlor-alkali route does the same: 88 kWh of cells x its share + 3.0 kWh of conditioning
    chlor = score(DEMO / "chlor_alkali_by_product_hydrogen.toml")
    share = chlor.co_products["hydrogen_share"]
    assert exchange(chlor, "hydrogen_production", "electricity_mix").amount == pytest.approx(88.0 * share + 3.0, rel=1e-12)


TRUCK = """
[hydrogen_truck]
destination = "Dunlow depot (invented)"
distance_km = 80.0
payload_kg_h2 = 900.0
fuel = "diesel"
fuel_kg_per_km = 0.30
return_fuel_ratio = 0.8
compression_kwh_per_kg_h2 = 2.0
loss_share = 0.005
"""


def trucked(tmp_path, keep_factor: bool = True) -> Path:
    """The cracked-ammonia demo with its hydrogen trucked on after the cracker (an invented 80 km leg)."""
    text = (DEMO / "green_ammonia_cracked_hydrogen.toml").read_text(encoding="utf-8") + TRUCK
    if not keep_factor:
        text = "\n".join(line for line in text.splitlines() if not line.startswith("electricity_factor")).replace("electricity_kwh_per_kg_h2 = 2.0\n", "electricity_kwh_per_kg_h2 = 0.0\n")
    path = tmp_path / "trucked.toml"
    path.write_text(text, encoding="utf-8")
    return path


def test_a_hydrogen_leg_after_cracking_draws_the_destinations_electricity(tmp_path):
    # Trucked on with 2.0 kWh/kg H2 of compression after the cracker: the destination's electricity,
    # electricity.grid.eu27_2018 (281 g CO2e/kWh, EEA IND-353): 2.0 x 0.281 = 0.562 kg CO2e per kg H2 trucked,
    # not the origin's counted wind and solar.
    result = score(trucked(tmp_path), assessment=assessment_with(year=2029))
    truck = exchange(result, "hydrogen_trucked", "electricity_at_destination")
    assert truck.amount == pytest.approx(2.0, rel=1e-12)
    assert not [e for e in result.exchanges if e.activity == "hydrogen_trucked" and e.input == "electricity_mix"]
    grid = next(e for e in result.exchanges if e.activity == "electricity_at_destination" and e.kind == "biosphere")
    assert grid.amount == pytest.approx(0.281, rel=1e-12)
    # the cracker's own 2.0 kWh/kg H2 come from the same destination supply
    assert exchange(result, "hydrogen_delivered", "electricity_at_destination").amount == pytest.approx(2.0, rel=1e-12)


def test_a_hydrogen_leg_after_cracking_needs_the_destinations_electricity_factor(tmp_path):
    with pytest.raises(InputError) as error:
        score(trucked(tmp_path, keep_factor=False), assessment=assessment_with(year=2029))
    assert "cracking.electricity_factor" in str(error.value) and "hydrogen_truck.compression_kwh_per_kg_h2" in str(error.value)
