"""Marine and pilot fuels as data: a fuel is known when the factor set holds its rows.

A fuel needs ``marine_fuel.<fuel>.co2``, ``.ch4``, ``.n2o``, ``.lhv`` and ``.well_to_tank``; LNG also
``marine_fuel.lng.methane_slip.<engine>``. Ammonia is the one fuel handled in code: it is drawn
from the project's own plant.
"""

from __future__ import annotations

from typing import Any

from ..stages import end_use, shipping
from .base import Activity

AMMONIA_FUEL = "ammonia"


def marine_fuels(factor_set) -> list[str]:
    """Fuels with a CO2 conversion factor in the set, plus ammonia (drawn from the cargo)."""
    names = sorted(key.split(".")[1] for key in factor_set.ids_with_prefix("marine_fuel.") if key.endswith(".co2"))
    return names + [AMMONIA_FUEL]


def lng_engines(factor_set) -> list[str]:
    return [key.rsplit(".", 1)[1] for key in factor_set.ids_with_prefix("marine_fuel.lng.methane_slip.")]


def fuel_factors(inputs, fuel: str, engine: str, where: str) -> dict[str, Any]:
    slip = inputs.factor(f"marine_fuel.lng.methane_slip.{engine}", "kg CH4/kg fuel", where) if fuel == "lng" else 0.0
    return {
        "co2": shipping.burnt_emission_kg_per_kg_fuel(inputs.factor(f"marine_fuel.{fuel}.co2", "t CO2/t fuel", where), slip),
        "ch4": shipping.burnt_emission_kg_per_kg_fuel(inputs.factor(f"marine_fuel.{fuel}.ch4", "t CH4/t fuel", where), slip),
        "n2o": shipping.burnt_emission_kg_per_kg_fuel(inputs.factor(f"marine_fuel.{fuel}.n2o", "t N2O/t fuel", where), slip),
        "slip": slip,
        "lhv": inputs.factor(f"marine_fuel.{fuel}.lhv", "MJ/kg", where),
        "well_to_tank": inputs.factor(f"marine_fuel.{fuel}.well_to_tank", "g CO2e/MJ", where),
    }


def buy_fuel(activity: Activity, stage: str, fuel: str, factors: dict, fuel_kg, label: str, extra: list[Activity]) -> None:
    """Fuel bought: its well-to-tank supply activity (one per stage and fuel, shared in ``extra``) and the input."""
    supplier = f"fuel_supply:{stage}:{fuel}"
    name = fuel.replace("_", " ")
    if not any(a.key == supplier for a in extra):
        supply = Activity(supplier, stage, f"{name}, supplied (well-to-tank)", "kg fuel")
        supply.emit("co2e_precharacterised", shipping.well_to_tank_kg_co2e_per_kg_fuel(factors["lhv"], factors["well_to_tank"]), f"well-to-tank of {name}")
        extra.append(supply)
    activity.consume(supplier, fuel_kg, f"{name}, {label}", "kg fuel")


def burn_marine_fuel(activity: Activity, stage: str, fuel: str, factors: dict, fuel_kg, label: str, extra: list[Activity]) -> None:
    """Fuel bought (``buy_fuel``) and burnt (CO2, CH4 with slip, N2O)."""
    name = fuel.replace("_", " ")
    buy_fuel(activity, stage, fuel, factors, fuel_kg, label, extra)
    activity.emit("co2_fossil", fuel_kg * factors["co2"], f"CO2 from burning {name}, {label}")
    activity.emit("ch4_fossil", fuel_kg * (factors["ch4"] + factors["slip"]), f"CH4 from {name} (combustion and slip), {label}")
    activity.emit("n2o", fuel_kg * factors["n2o"], f"N2O from burning {name}, {label}")


def burn_ammonia(activity: Activity, ammonia_kg, n2o_g_per_kg, slip_g_per_kg, label: str) -> None:
    activity.emit("n2o", ammonia_kg * end_use.per_kg(n2o_g_per_kg), f"N2O from burning ammonia, {label}")
    activity.emit("nh3", ammonia_kg * end_use.per_kg(slip_g_per_kg), f"ammonia slip (not a GHG), {label}")
