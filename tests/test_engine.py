"""The Brightway solution against a closed-form hand calculation of a small chain."""

import numpy as np
import pytest

from carbonledger.core.engine import build_matrices, solve
from carbonledger.core.inventory import Inventory
from carbonledger.model.flows import FLOWS
from carbonledger.routes.base import Activity


def small_chain() -> Inventory:
    electricity = Activity("electricity", "electricity_supply", "electricity", "kWh")
    electricity.consume("electricity", 0.05, "own use of the power plant", "kWh")  # a loop: needs a real solve
    electricity.emit("co2e_precharacterised", 0.5, "generation")
    hydrogen = Activity("hydrogen", "hydrogen_production", "hydrogen", "kg H2")
    hydrogen.consume("electricity", 50.0, "electrolysis", "kWh")
    hydrogen.emit("co2_fossil", 2.0, "process")
    product = Activity("ammonia", "ammonia_synthesis", "ammonia", "t NH3")
    product.consume("hydrogen", 180.0, "hydrogen", "kg H2")
    product.consume("electricity", 500.0, "loop", "kWh")
    product.emit("n2o", 0.01, "process")
    product.emit("ch4_fossil", 0.1, "venting")
    activities = {a.key: a for a in (electricity, hydrogen, product)}
    return Inventory(activities, reference="ammonia", hydrogen="hydrogen", product="ammonia", electricity_kinds={})


def test_brightway_solution_equals_closed_form():
    # Hand calculation. Supply per t NH3: ammonia 1; hydrogen 180 kg; electricity demanded
    # 180 * 50 + 500 = 9,500 kWh, and the plant's own use of 5 % means it must generate
    # 9,500 / (1 - 0.05) = 10,000 kWh.
    # Inventory: CO2e 10,000 * 0.5 = 5,000 kg; CO2 180 * 2 = 360 kg; N2O 0.01 kg; CH4 0.1 kg.
    # With GWP100 CO2 1, CH4 29.8, N2O 273: 5,000 + 360 + 2.98 + 2.73 = 5,365.71 kg CO2e.
    gwp = {"co2_fossil": 1.0, "ch4_fossil": 29.8, "ch4_non_fossil": 27.0, "n2o": 273.0, "co2e_precharacterised": 1.0, "nh3": 0.0, "h2": 0.0,
           "co2_biogenic": 0.0, "co2_biogenic_stored": 0.0}  # biogenic CO2: counted apart (zero in the headline)
    characterisation = np.array([gwp[f] for f in FLOWS])
    matrices = build_matrices(small_chain())
    solutions, bw_score = solve(matrices, ["ammonia", "hydrogen"], characterisation)
    main = solutions["ammonia"]
    supply = dict(zip(main.activity_keys, main.supply, strict=True))
    assert supply["ammonia"] == pytest.approx(1.0)
    assert supply["hydrogen"] == pytest.approx(180.0)
    assert supply["electricity"] == pytest.approx(10_000.0)
    assert bw_score == pytest.approx(5_365.71, rel=1e-12)
    contributions = main.contributions(characterisation)
    by_activity = dict(zip(main.activity_keys, contributions.sum(axis=0), strict=True))
    assert by_activity["electricity"] == pytest.approx(5_000.0)
    assert by_activity["hydrogen"] == pytest.approx(360.0)
    assert by_activity["ammonia"] == pytest.approx(2.98 + 2.73)
    # Second demand on the same matrices: 1 kg H2 needs 50 / 0.95 kWh.
    hydrogen = solutions["hydrogen"].contributions(characterisation).sum()
    assert hydrogen == pytest.approx(50 / 0.95 * 0.5 + 2.0, rel=1e-12)
    # Zero-rating the electricity activity removes exactly its contribution.
    mask = np.array([key == "electricity" for key in main.activity_keys])
    assert main.contributions(characterisation, mask).sum() == pytest.approx(365.71)
