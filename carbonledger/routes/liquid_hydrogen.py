"""Delivery leg: hydrogen liquefied and carried as a liquid by ship or truck.

Builds ``hydrogen_liquefied`` (stage ``liquefaction``: electricity where the hydrogen is, the project's mix or the
destination's after cracking) and
``liquid_hydrogen_delivered`` (stage ``liquid_hydrogen_carriage``, per kg H2 delivered): cargo
loaded (boil-off included), the carrier's fuel with its well-to-tank supply, boil-off vented
(reported as hydrogen leakage, in no scheme value). Boil-off is the heat leaking into the tank
over the transit divided by hydrogen's latent heat of vaporisation from CoolProp. Liquefaction
electricity below the ideal (reversible) work of liquefaction, computed from CoolProp's hydrogen
states, is refused.
"""

from __future__ import annotations

from typing import Literal

from ..errors import InputError
from ..model.project import P, Section
from ..model.reference import hydrogen_liquefaction_states
from ..stages import hydrogen_delivery
from .base import Activity, Route, SectionError
from .marine_fuels import burn_marine_fuel, fuel_factors, marine_fuels
from .road_fuels import burn_road_fuel, road_fuel_factors, road_fuels


class LiquidHydrogen(Section):
    destination: str = P("liquid hydrogen terminal", description="Where the liquid hydrogen is delivered (free text)")
    liquefaction_kwh_per_kg_h2: float = P(
        unit="kWh/kg H2",
        description="Electricity of the liquefier (cooling, ortho-para conversion), from the project's mix",
        gt=0,
    )
    carrier: Literal["truck", "ship"] = P(description="Liquid hydrogen carried by road tanker or by ship")
    cargo_kg_h2: float = P(unit="kg H2 per trip", description="Liquid hydrogen loaded per trip", gt=0)
    transit_hours: float = P(unit="h", description="Hours the cargo spends in the tank, loading to unloading", gt=0)
    tank_heat_ingress_kw: float = P(0.0, "kW", "Heat leaking into the cargo tank", ge=0)
    fuel: str = P(description="Carrier fuel: a road fuel (truck) or marine fuel (ship) of the factor set")
    fuel_kg_per_trip: float = P(unit="kg fuel per trip", description="Fuel of one trip with its return", ge=0)


def boil_off(leg: dict, inputs):
    """Share of the liquid hydrogen cargo that boils off in transit.

    Parameters
    ----------
    leg : dict
        The ``[liquid_hydrogen]`` section (heat ingress in kW, transit in h, cargo in kg).
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.

    Returns
    -------
    float or ndarray
        Share of the cargo vaporised (dimensionless).

    References
    ----------
    .. [1] Hydrogen states from CoolProp (Leachman et al., J. Phys. Chem. Ref. Data 38 (2009) 721-748).
    """
    return hydrogen_delivery.boil_off_share(
        leg["tank_heat_ingress_kw"], leg["transit_hours"], inputs.latent_heat_hydrogen(), leg["cargo_kg_h2"]
    )


def build(params: dict, inputs, chain) -> list[Activity]:
    """Activities of hydrogen liquefied and carried as a liquid, per kg H2 delivered: liquefaction
    electricity, cargo loaded (boil-off included), the carrier's fuel with its supply, boil-off vented.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``liquid_hydrogen.liquefaction_kwh_per_kg_h2`` in kWh/kg H2).
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
    leg = params["liquid_hydrogen"]
    liquefier = Activity("hydrogen_liquefied", "liquefaction", "hydrogen, liquefied", "kg H2")
    liquefier.consume(chain.reference, 1.0, "hydrogen gas liquefied", "kg H2")
    liquefier.consume(chain.electricity, leg["liquefaction_kwh_per_kg_h2"], "electricity, liquefaction", "kWh")
    lost = boil_off(leg, inputs)
    carriage = Activity(
        "liquid_hydrogen_delivered",
        "liquid_hydrogen_carriage",
        f"liquid hydrogen, carried by {leg['carrier']} to {leg['destination']}",
        "kg H2",
    )
    carriage.consume(
        liquefier.key,
        hydrogen_delivery.intake_per_unit_delivered(lost),
        "liquid hydrogen loaded (boil-off included)",
        "kg H2",
    )
    fuel_kg = leg["fuel_kg_per_trip"] / (leg["cargo_kg_h2"] * (1.0 - lost))
    if leg["carrier"] == "truck":
        burn_road_fuel(
            carriage,
            "liquid_hydrogen_carriage",
            leg["fuel"],
            road_fuel_factors(inputs, leg["fuel"], "liquid_hydrogen.fuel"),
            fuel_kg,
            "road tanker",
            chain.extra,
        )
    else:
        burn_marine_fuel(
            carriage,
            "liquid_hydrogen_carriage",
            leg["fuel"],
            fuel_factors(inputs, leg["fuel"], "", "liquid_hydrogen.fuel"),
            fuel_kg,
            "ship",
            chain.extra,
        )
    carriage.emit("h2", hydrogen_delivery.lost_per_unit_delivered(lost), "boil-off vented")
    chain.reference, chain.place = carriage.key, f"at {leg['destination']}"
    chain.figures["liquid_hydrogen"] = {"boil_off_share": lost, "latent_heat_kj_per_kg": inputs.latent_heat_hydrogen()}
    return [liquefier, carriage]


def ideal_liquefaction_work_kwh_per_kg() -> float:
    """The reversible work to liquefy normal hydrogen from 25 degC and 1 atm (CoolProp states).

    Returns
    -------
    float
        Ideal work, kWh per kg H2 (about 3.3).

    References
    ----------
    .. [1] w_min = (h_liquid - h_0) - T_0 (s_liquid - s_0): Barron, Cryogenic Systems, 2nd ed., 1985, ch. 3.
    .. [2] Hydrogen states from CoolProp (Leachman et al., J. Phys. Chem. Ref. Data 38 (2009) 721-748).
    """
    return hydrogen_delivery.ideal_liquefaction_work_kwh_per_kg(**hydrogen_liquefaction_states())


def check_limits(params: dict, inputs, source: str) -> None:
    """A fuel with factors in the set, liquefaction above the ideal work, and a boil-off that leaves
    cargo to deliver.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``liquid_hydrogen.liquefaction_kwh_per_kg_h2`` in kWh/kg H2).
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
    .. [1] w_min = (h_liquid - h_0) - T_0 (s_liquid - s_0): Barron, Cryogenic Systems, 2nd ed., 1985, ch. 3.
    .. [2] Hydrogen states from CoolProp (Leachman et al., J. Phys. Chem. Ref. Data 38 (2009) 721-748).
    """
    leg = params["liquid_hydrogen"]
    known = road_fuels(inputs.factor_set) if leg["carrier"] == "truck" else marine_fuels(inputs.factor_set)[:-1]
    if leg["fuel"] not in known:
        raise InputError(
            source,
            "liquid_hydrogen.fuel",
            f"a {'road' if leg['carrier'] == 'truck' else 'marine'} fuel with factors in "
            f"set '{inputs.factor_set.name}' ({', '.join(known)}), got '{leg['fuel']}'",
        )
    if params["project"]["boundary"] == "cradle-to-gate":
        return
    floor = ideal_liquefaction_work_kwh_per_kg()
    if leg["liquefaction_kwh_per_kg_h2"] < floor:
        raise InputError(
            source,
            "liquid_hydrogen.liquefaction_kwh_per_kg_h2",
            f"at least {floor:.2f} kWh/kg H2 (the ideal work to liquefy hydrogen "
            f"from 25 degC, 1 atm), got {leg['liquefaction_kwh_per_kg_h2']:g}",
        )
    lost = boil_off(leg, inputs)
    if not lost < 1.0:
        raise InputError(
            source,
            "liquid_hydrogen.tank_heat_ingress_kw",
            f"a heat ingress that leaves cargo to deliver (boil-off {lost:.0%} of the cargo)",
        )


def validate(project) -> None:
    """Hydrogen to carry: product hydrogen, or ammonia cracked back to hydrogen.

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
    if project.liquid_hydrogen is not None and project.project.product == "ammonia" and project.cracking is None:
        raise SectionError(
            "liquid_hydrogen", "hydrogen to carry: product 'hydrogen', or ammonia cracked back to hydrogen ([cracking])"
        )


ROUTE = Route(
    name="liquid_hydrogen",
    kind="delivery_leg",
    stages=("liquefaction", "liquid_hydrogen_carriage"),
    applies=lambda params: (
        params.get("liquid_hydrogen") is not None and params["project"]["boundary"] != "cradle-to-gate"
    ),
    build=build,
    optional_sections={"liquid_hydrogen": LiquidHydrogen},
    validate=validate,
    check_limits=check_limits,
    description="Hydrogen liquefied and carried as a liquid by road tanker or ship",
)
