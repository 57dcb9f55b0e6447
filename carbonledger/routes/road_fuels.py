"""Road and rail fuels as data, like marine fuels: a fuel is known when the factor set holds
``<namespace>.<fuel>.co2``, ``.ch4``, ``.n2o`` (kg per TJ burnt), ``.lhv`` and ``.well_to_tank``,
with namespace ``road_fuel`` (road engines) or ``rail_fuel`` (locomotives: the IPCC defaults
for CH4 and N2O differ by engine type)."""

from __future__ import annotations

from typing import Any

from .base import Activity
from .marine_fuels import buy_fuel


def road_fuels(factor_set, namespace: str = "road_fuel") -> list[str]:
    """Road (or rail) fuels with a CO2 factor in the set.

    Parameters
    ----------
    factor_set : FactorSet
        The factor set the project is scored with.
    namespace : str
        The factor namespace: ``road_fuel`` (trucks) or ``rail_fuel`` (locomotives).

    Returns
    -------
    list of str
        Fuel names, sorted.
    """
    return sorted(key.split(".")[1] for key in factor_set.ids_with_prefix(f"{namespace}.") if key.endswith(".co2"))


def road_fuel_factors(inputs, fuel: str, where: str, namespace: str = "road_fuel") -> dict[str, Any]:
    """kg of each gas per kg of fuel burnt, the heating value and the well-to-tank factor.

    Parameters
    ----------
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.
    fuel : str
        The fuel's name in the factor ids (e.g. ``heavy_fuel_oil``).
    where : str
        The project field that named the fuel, for an error message.
    namespace : str
        The factor namespace: ``road_fuel`` (trucks) or ``rail_fuel`` (locomotives).

    Returns
    -------
    dict of str to float or ndarray
        ``co2``, ``ch4``, ``n2o`` (kg per kg fuel: LHV in MJ/kg times kg/MJ), ``lhv`` (MJ/kg)
        and ``well_to_tank`` (g CO2e/MJ).
    """
    lhv = inputs.factor(f"{namespace}.{fuel}.lhv", "MJ/kg", where)
    return {
        gas: lhv * inputs.factor(f"{namespace}.{fuel}.{gas}", f"kg {gas.upper()}/MJ", where)
        for gas in ("co2", "ch4", "n2o")
    } | {"lhv": lhv, "well_to_tank": inputs.factor(f"{namespace}.{fuel}.well_to_tank", "g CO2e/MJ", where)}


def burn_road_fuel(
    activity: Activity, stage: str, fuel: str, factors: dict, fuel_kg, label: str, extra: list[Activity]
) -> None:
    """Fuel bought (its well-to-tank supply activity, shared in ``extra``) and burnt in an engine.

    Parameters
    ----------
    activity : Activity
        The activity that buys and burns the fuel (exchanges added to it).
    stage : str
        The stage of the leg (the supply activity is one per stage and fuel).
    fuel : str
        The fuel's name in the factor ids (e.g. ``heavy_fuel_oil``).
    factors : dict
        The fuel's factors from ``road_fuel_factors``: kg per kg fuel, LHV in MJ/kg, well-to-tank in g CO2e/MJ.
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
    """
    name = fuel.replace("_", " ")
    buy_fuel(activity, stage, fuel, factors, fuel_kg, label, extra)
    activity.emit("co2_fossil", fuel_kg * factors["co2"], f"CO2 from burning {name}, {label}")
    activity.emit("ch4_fossil", fuel_kg * factors["ch4"], f"CH4 from burning {name}, {label}")
    activity.emit("n2o", fuel_kg * factors["n2o"], f"N2O from burning {name}, {label}")
