"""Hydrogen from water electrolysis: alkaline, PEM or solid oxide, any electricity mix."""

from __future__ import annotations

from typing import Literal

from ..errors import InputError
from ..model.project import P, Section
from ..model.reference import water_splitting_gibbs
from ..stages import electrolysis
from .ammonia import starter as ammonia_starter
from .base import Activity, Route, SectionError, burn_natural_gas
from .electricity import starter as electricity_starter


class Electrolysis(Section):
    technology: Literal["alkaline", "pem", "solid_oxide"] = P(description="Electrolyser technology")
    electricity_kwh_per_kg_h2: float = P(
        unit="kWh/kg H2", description="System electricity, stack and balance of plant", gt=0
    )
    heat_kwh_per_kg_h2: float = P(0.0, "kWh/kg H2", "Heat (solid oxide: steam raising and stack heat)", ge=0)
    operating_temperature_c: float = P(
        800.0, "°C", "Solid oxide: stack temperature, sets the Gibbs-energy floor on electricity", ge=500, le=1000
    )
    heat_source: Literal["recovered", "natural_gas", "electricity"] = P(
        "recovered", description="Where the heat comes from; recovered heat carries no burden"
    )
    heat_boiler_efficiency: float = P(0.9, "fraction", "Boiler efficiency when heat comes from natural gas", gt=0, le=1)
    water_litres_per_kg_h2: float = P(0.0, "L/kg H2", "Raw water drawn (0: water treatment not counted)", ge=0)
    water_treatment_kwh_per_m3: float = P(0.0, "kWh/m3", "Electricity to treat or desalinate raw water", ge=0)


def build(params: dict, inputs, chain) -> list[Activity]:
    """Activity of hydrogen from water electrolysis, per kg H2: electricity (stack, heat when electric,
    water treatment, conditioning) and natural gas burnt for heat when the heat comes from a boiler.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``electrolysis.electricity_kwh_per_kg_h2`` in kWh/kg H2).
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.
    chain : Chain
        What the route modules before this one left: the reference activity and its product, the place,
        shared fuel supplies (``extra``) and figures.

    Returns
    -------
    list of Activity
        The activities it adds; their exchanges are amounts per unit of each activity (kg H2).
    """
    e = params["electrolysis"]
    plant = Activity(
        "hydrogen_production",
        "hydrogen_production",
        f"hydrogen, {e['technology'].replace('_', ' ')} electrolysis",
        "kg H2",
    )
    water_kwh = electrolysis.water_treatment_kwh_per_kg_h2(e["water_litres_per_kg_h2"], e["water_treatment_kwh_per_m3"])
    heat_kwh = e["heat_kwh_per_kg_h2"] if e["heat_source"] == "electricity" else 0.0 * e["heat_kwh_per_kg_h2"]
    plant.consume(
        "electricity_mix",
        e["electricity_kwh_per_kg_h2"] + heat_kwh + water_kwh + params["hydrogen"]["conditioning_kwh_per_kg_h2"],
        "electricity, electrolysis, heat, water treatment and conditioning",
        "kWh",
    )
    if e["heat_source"] == "natural_gas":
        burn_natural_gas(
            plant,
            inputs,
            electrolysis.heat_gas_gj_per_kg_h2(e["heat_kwh_per_kg_h2"], e["heat_boiler_efficiency"]),
            "boiler for electrolyser heat",
        )
    return [plant]


def check_limits(params: dict, inputs, source: str) -> None:
    """Electricity plus heat at least the heating value of hydrogen; water at least stoichiometric.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``electrolysis.electricity_kwh_per_kg_h2`` in kWh/kg H2).
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.
    source : str
        The project file's name, for the error message.

    Returns
    -------
    None
        Nothing when the project is inside the limits.

    Raises
    ------
    InputError
        Naming the file, the field and what was expected, for the first limit broken.

    References
    ----------
    .. [1] US DOE HyARC, Lower and Higher Heating Values of Fuels (hydrogen LHV and HHV).
    .. [2] Chase (1998), NIST-JANAF Thermochemical Tables: Gibbs energy of formation of water.
    """
    e = params["electrolysis"]
    floor = electrolysis.energy_floor_kwh_per_kg_h2(
        e["technology"],
        inputs.factor("heating_value.hydrogen.lhv", "MJ/kg"),
        inputs.factor("heating_value.hydrogen.hhv", "MJ/kg"),
    )
    energy = e["electricity_kwh_per_kg_h2"] + e["heat_kwh_per_kg_h2"]
    if energy < floor:
        basis = "lower" if e["technology"] == "solid_oxide" else "higher"
        raise InputError(
            source,
            "electrolysis.electricity_kwh_per_kg_h2",
            f"electricity plus heat of at least {floor:.2f} kWh/kg H2 "
            f"(the {basis} heating value of hydrogen), got {energy:g}",
        )
    steam = e["technology"] == "solid_oxide"
    gibbs = water_splitting_gibbs(e["operating_temperature_c"] + 273.15 if steam else 298.15, steam)
    least_electricity = electrolysis.gibbs_floor_kwh_per_kg_h2(gibbs.value * 1000.0, inputs.molar_mass("H2"))
    if e["electricity_kwh_per_kg_h2"] < least_electricity:
        where = f"steam at {e['operating_temperature_c']:g} °C" if steam else "liquid water at 25 °C"
        raise InputError(
            source,
            "electrolysis.electricity_kwh_per_kg_h2",
            f"at least {least_electricity:.2f} kWh/kg H2 of electricity (Gibbs energy of water splitting, "
            f"{where}; heat can supply only the T dS share), got {e['electricity_kwh_per_kg_h2']:g}",
        )
    water = e["water_litres_per_kg_h2"]
    least_water = electrolysis.stoichiometric_water_kg_per_kg_h2(inputs.molar_mass("H2O"), inputs.molar_mass("H2"))
    if 0 < water < least_water:
        raise InputError(
            source,
            "electrolysis.water_litres_per_kg_h2",
            f"0 (not counted) or at least {least_water:.2f} L/kg H2 (stoichiometric water), got {water:g}",
        )


def draw_limits(params: dict, inputs) -> list:
    """The energy and water floors of ``check_limits`` on numbers or arrays of draws.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``electrolysis.electricity_kwh_per_kg_h2`` in kWh/kg H2).
        Numbers may be arrays of Monte Carlo draws.
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.

    Returns
    -------
    list of tuple
        ``(field, expected, ok)``: the parameter path, what was expected in words, and a bool or a
        bool array over the draws.
    """
    e = params["electrolysis"]
    floor = electrolysis.energy_floor_kwh_per_kg_h2(
        e["technology"],
        inputs.factor("heating_value.hydrogen.lhv", "MJ/kg"),
        inputs.factor("heating_value.hydrogen.hhv", "MJ/kg"),
    )
    least_water = electrolysis.stoichiometric_water_kg_per_kg_h2(inputs.molar_mass("H2O"), inputs.molar_mass("H2"))
    water = e["water_litres_per_kg_h2"]
    return [
        (
            "electrolysis.electricity_kwh_per_kg_h2",
            "electricity plus heat of at least the heating value of hydrogen",
            e["electricity_kwh_per_kg_h2"] + e["heat_kwh_per_kg_h2"] >= floor,
        ),
        (
            "electrolysis.water_litres_per_kg_h2",
            "0 (not counted) or at least stoichiometric water",
            (water == 0) | (water >= least_water),
        ),
    ]


def metered(params: dict) -> dict[str, list[str]]:
    """Parameter paths of the electrolyser scaled by metered electricity (and gas for boiler heat).

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``); the choice of paths depends
        on text options and sections only, not on numbers.

    Returns
    -------
    dict of str to list of str
        ``natural_gas`` and ``electricity`` -> the parameter paths (``section.field``) that metered
        operation in a period scales.
    """
    e = params["electrolysis"]
    paths = {
        "natural_gas": [],
        "electricity": ["electrolysis.electricity_kwh_per_kg_h2", "electrolysis.water_treatment_kwh_per_m3"],
    }
    if e["heat_source"] in ("natural_gas", "electricity"):
        paths[e["heat_source"]].append("electrolysis.heat_kwh_per_kg_h2")
    return paths


def validate(project) -> None:
    """No ``[capture]`` section: electrolysis has no process CO2 to capture.

    Parameters
    ----------
    project : Project
        The validated project (its sections as pydantic models).

    Returns
    -------
    None
        Nothing when the sections agree.

    Raises
    ------
    SectionError
        Naming the field and what was expected.
    """
    if project.capture is not None:
        raise SectionError("capture", "no [capture] section for route 'electrolysis' (no process CO2 to capture)")


def uses_natural_gas(project) -> bool:
    """Whether the electrolyser's heat comes from a natural gas boiler.

    Parameters
    ----------
    project : Project
        The validated project (its sections as pydantic models).

    Returns
    -------
    bool
        True when the route burns or converts natural gas (a ``[natural_gas]`` section is then needed).
    """
    e = project.electrolysis
    return e.heat_source == "natural_gas" and e.heat_kwh_per_kg_h2 > 0


def starter(product: str) -> str:
    """The ``[electrolysis]`` and ``[electricity]`` sections (and ``[ammonia]``) of a starter project file.

    Parameters
    ----------
    product : str
        The project's product, ``hydrogen`` or ``ammonia``.

    Returns
    -------
    str
        TOML text of the sections, with example numbers for ``carbonledger init`` to mark as placeholders.
    """
    return (
        """
[electrolysis]
technology = "pem"                   # alkaline | pem | solid_oxide
electricity_kwh_per_kg_h2 = 54.0     # system electricity; at least the physical floor
heat_kwh_per_kg_h2 = 0.0
# operating_temperature_c = 800.0    # solid oxide only: sets the Gibbs-energy floor on electricity
heat_source = "recovered"            # recovered | natural_gas | electricity
water_litres_per_kg_h2 = 0.0         # 0: water treatment not counted
water_treatment_kwh_per_m3 = 0.0
"""
        + electricity_starter(product)
        + (ammonia_starter(product) if product == "ammonia" else "")
    )


ROUTE = Route(
    name="electrolysis",
    kind="hydrogen_route",
    stages=("hydrogen_production",),
    applies=lambda params: params["hydrogen"]["route"] == "electrolysis",
    build=build,
    sections={"electrolysis": Electrolysis},
    validate=validate,
    check_limits=check_limits,
    draw_limits=draw_limits,
    uses_natural_gas=uses_natural_gas,
    metered=metered,
    ageing="electrolysis.electricity_kwh_per_kg_h2",
    starter=starter,
    description="Water electrolysis (green with renewable electricity, or grid-connected)",
)
