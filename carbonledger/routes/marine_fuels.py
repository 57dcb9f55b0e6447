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
    """Fuels with a CO2 conversion factor in the set, plus ammonia (drawn from the cargo).

    Parameters
    ----------
    factor_set : FactorSet
        The factor set the project is scored with.

    Returns
    -------
    list of str
        Fuel names, ammonia last.
    """
    names = sorted(key.split(".")[1] for key in factor_set.ids_with_prefix("marine_fuel.") if key.endswith(".co2"))
    return names + [AMMONIA_FUEL]


def lng_engines(factor_set) -> list[str]:
    """The LNG engine types with a methane slip factor in the set.

    Parameters
    ----------
    factor_set : FactorSet
        The factor set the project is scored with.

    Returns
    -------
    list of str
        Engine names (the last part of ``marine_fuel.lng.methane_slip.<engine>``).
    """
    return [key.rsplit(".", 1)[1] for key in factor_set.ids_with_prefix("marine_fuel.lng.methane_slip.")]


def fuel_factors(inputs, fuel: str, engine: str, where: str) -> dict[str, Any]:
    """Emissions of burning one kg of a marine fuel, with its slip, heating value and well-to-tank factor.

    Parameters
    ----------
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.
    fuel : str
        The fuel's name in the factor ids (e.g. ``heavy_fuel_oil``).
    engine : str
        The LNG engine type (its methane slip); ignored for other fuels.
    where : str
        The project field that named the fuel, for an error message.

    Returns
    -------
    dict of str to float or ndarray
        ``co2``, ``ch4``, ``n2o`` (kg per kg fuel), ``slip`` (kg CH4 per kg fuel), ``lhv`` (MJ/kg)
        and ``well_to_tank`` (g CO2e/MJ).

    References
    ----------
    .. [1] IMO resolution MEPC.364(79) (2022), 2.2.1: CO2 conversion factors Cf.
    .. [2] Regulation (EU) 2023/1805 (FuelEU Maritime), Annex II: well-to-tank, CH4, N2O and methane slip.
    """
    slip = inputs.factor(f"marine_fuel.lng.methane_slip.{engine}", "kg CH4/kg fuel", where) if fuel == "lng" else 0.0
    return {
        "co2": shipping.burnt_emission_kg_per_kg_fuel(
            inputs.factor(f"marine_fuel.{fuel}.co2", "t CO2/t fuel", where), slip
        ),
        "ch4": shipping.burnt_emission_kg_per_kg_fuel(
            inputs.factor(f"marine_fuel.{fuel}.ch4", "t CH4/t fuel", where), slip
        ),
        "n2o": shipping.burnt_emission_kg_per_kg_fuel(
            inputs.factor(f"marine_fuel.{fuel}.n2o", "t N2O/t fuel", where), slip
        ),
        "slip": slip,
        "lhv": inputs.factor(f"marine_fuel.{fuel}.lhv", "MJ/kg", where),
        "well_to_tank": inputs.factor(f"marine_fuel.{fuel}.well_to_tank", "g CO2e/MJ", where),
    }


def buy_fuel(
    activity: Activity, stage: str, fuel: str, factors: dict, fuel_kg, label: str, extra: list[Activity]
) -> None:
    """Fuel bought: its well-to-tank supply activity (one per stage and fuel, shared in ``extra``) and the input.

    Parameters
    ----------
    activity : Activity
        The activity that buys and burns the fuel (exchanges added to it).
    stage : str
        The stage of the leg (the supply activity is one per stage and fuel).
    fuel : str
        The fuel's name in the factor ids (e.g. ``heavy_fuel_oil``).
    factors : dict
        The fuel's factors from ``fuel_factors``: kg per kg fuel, LHV in MJ/kg, well-to-tank in g CO2e/MJ.
    fuel_kg : float or ndarray
        Fuel burnt, kg per unit of the activity.
    label : str
        What the fuel is burnt for, in the exchanges' labels.
    extra : list of Activity
        The shared supply activities (``chain.extra``); a new one is appended.

    Returns
    -------
    None
        The input is added to ``activity``.

    References
    ----------
    .. [1] Regulation (EU) 2023/1805 (FuelEU Maritime), Annex II: well-to-tank, CH4, N2O and methane slip.
    """
    supplier = f"fuel_supply:{stage}:{fuel}"
    name = fuel.replace("_", " ")
    if not any(a.key == supplier for a in extra):
        supply = Activity(supplier, stage, f"{name}, supplied (well-to-tank)", "kg fuel")
        supply.emit(
            "co2e_precharacterised",
            shipping.well_to_tank_kg_co2e_per_kg_fuel(factors["lhv"], factors["well_to_tank"]),
            f"well-to-tank of {name}",
        )
        extra.append(supply)
    activity.consume(supplier, fuel_kg, f"{name}, {label}", "kg fuel")


def burn_marine_fuel(
    activity: Activity, stage: str, fuel: str, factors: dict, fuel_kg, label: str, extra: list[Activity]
) -> None:
    """Fuel bought (``buy_fuel``) and burnt (CO2, CH4 with slip, N2O).

    Parameters
    ----------
    activity : Activity
        The activity that buys and burns the fuel (exchanges added to it).
    stage : str
        The stage of the leg (the supply activity is one per stage and fuel).
    fuel : str
        The fuel's name in the factor ids (e.g. ``heavy_fuel_oil``).
    factors : dict
        The fuel's factors from ``fuel_factors``: kg per kg fuel, LHV in MJ/kg, well-to-tank in g CO2e/MJ.
    fuel_kg : float or ndarray
        Fuel burnt, kg per unit of the activity.
    label : str
        What the fuel is burnt for, in the exchanges' labels.
    extra : list of Activity
        The shared supply activities (``chain.extra``); a new one is appended.

    Returns
    -------
    None
        The exchanges are added to ``activity``.

    References
    ----------
    .. [1] IMO resolution MEPC.364(79) (2022), 2.2.1: CO2 conversion factors Cf.
    .. [2] Regulation (EU) 2023/1805 (FuelEU Maritime), Annex II: well-to-tank, CH4, N2O and methane slip.
    """
    name = fuel.replace("_", " ")
    buy_fuel(activity, stage, fuel, factors, fuel_kg, label, extra)
    activity.emit("co2_fossil", fuel_kg * factors["co2"], f"CO2 from burning {name}, {label}")
    activity.emit(
        "ch4_fossil", fuel_kg * (factors["ch4"] + factors["slip"]), f"CH4 from {name} (combustion and slip), {label}"
    )
    activity.emit("n2o", fuel_kg * factors["n2o"], f"N2O from burning {name}, {label}")


def burn_ammonia(activity: Activity, ammonia_kg, n2o_g_per_kg, slip_g_per_kg, label: str) -> None:
    """Ammonia burnt as a fuel: its N2O and its slip (reported, not a greenhouse gas); no CO2.

    Parameters
    ----------
    activity : Activity
        The activity that burns the ammonia (exchanges added to it).
    ammonia_kg : float or ndarray
        Ammonia burnt, kg per unit of the activity.
    n2o_g_per_kg : float or ndarray
        N2O formed, g per kg NH3 burnt.
    slip_g_per_kg : float or ndarray
        Ammonia leaving unburnt, g per kg NH3 burnt.
    label : str
        What the fuel is burnt for, in the exchanges' labels.

    Returns
    -------
    None
        The exchanges are added to ``activity``.
    """
    activity.emit("n2o", ammonia_kg * end_use.per_kg(n2o_g_per_kg), f"N2O from burning ammonia, {label}")
    activity.emit("nh3", ammonia_kg * end_use.per_kg(slip_g_per_kg), f"ammonia slip (not a GHG), {label}")
