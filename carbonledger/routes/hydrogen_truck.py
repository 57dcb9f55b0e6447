"""Delivery leg: compressed hydrogen carried by road in tube trailers.

Builds ``hydrogen_trucked`` (stage ``hydrogen_trucking``, per kg H2 delivered): hydrogen loaded
(losses included), compression electricity to the trailer's pressure where the hydrogen is (the project's mix, or the
destination's after cracking),
truck fuel for the laden trip and the return trip with its well-to-tank supply, hydrogen vented
or leaked (reported as hydrogen leakage, in no scheme value).
"""

from __future__ import annotations

from ..errors import InputError
from ..model.project import P, Section
from ..stages import hydrogen_delivery
from .base import Activity, Route, SectionError
from .road_fuels import burn_road_fuel, road_fuel_factors, road_fuels


class HydrogenTruck(Section):
    destination: str = P("truck destination", description="Where the trucks deliver the hydrogen (free text)")
    distance_km: float = P(unit="km", description="Road distance, one way", gt=0, le=20000)
    payload_kg_h2: float = P(unit="kg H2 per trip", description="Hydrogen delivered per trailer load", gt=0)
    fuel: str = P("diesel", description="Truck fuel: a road fuel of the factor set")
    fuel_kg_per_km: float = P(unit="kg fuel/km", description="Fuel of the laden truck per km", ge=0)
    return_fuel_ratio: float = P(
        1.0,
        "fraction of the laden trip's fuel",
        "Fuel of the return trip (1: returns empty the same way; 0: returns with other freight)",
        ge=0,
    )
    compression_kwh_per_kg_h2: float = P(
        0.0, "kWh/kg H2", "Electricity to compress the hydrogen into the trailer, from the project's mix", ge=0
    )
    loss_share: float = P(
        0.0,
        "fraction",
        "Share of the hydrogen loaded that is vented or leaks (filling, transit, unloading)",
        ge=0,
        lt=1,
    )


def build(params: dict, inputs, chain) -> list[Activity]:
    """Activity of compressed hydrogen carried by truck, per kg H2 delivered: hydrogen loaded (losses
    included), compression electricity, truck fuel for both trips with its well-to-tank supply, hydrogen lost.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``hydrogen_truck.distance_km`` in km).
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
    leg = params["hydrogen_truck"]
    truck = Activity("hydrogen_trucked", "hydrogen_trucking", f"hydrogen, trucked to {leg['destination']}", "kg H2")
    truck.consume(
        chain.reference,
        hydrogen_delivery.intake_per_unit_delivered(leg["loss_share"]),
        "hydrogen loaded (losses included)",
        "kg H2",
    )
    truck.consume(
        chain.electricity, leg["compression_kwh_per_kg_h2"], "electricity, compression into the trailer", "kWh"
    )
    fuel_kg = hydrogen_delivery.truck_fuel_kg_per_kg_h2(
        leg["distance_km"], leg["fuel_kg_per_km"], leg["return_fuel_ratio"], leg["payload_kg_h2"]
    )
    burn_road_fuel(
        truck,
        "hydrogen_trucking",
        leg["fuel"],
        road_fuel_factors(inputs, leg["fuel"], "hydrogen_truck.fuel"),
        fuel_kg,
        "truck, laden and return trips",
        chain.extra,
    )
    truck.emit(
        "h2", hydrogen_delivery.lost_per_unit_delivered(leg["loss_share"]), "hydrogen vented or leaked from the trailer"
    )
    chain.reference, chain.place = truck.key, f"at {leg['destination']}"
    chain.figures["hydrogen_truck"] = {"fuel_kg_per_kg_h2": fuel_kg}
    return [truck]


def check_limits(params: dict, inputs, source: str) -> None:
    """The truck's fuel must have factors in the factor set.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``hydrogen_truck.fuel``, a fuel name).
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
    """
    fuels = road_fuels(inputs.factor_set)
    if params["hydrogen_truck"]["fuel"] not in fuels:
        raise InputError(
            source,
            "hydrogen_truck.fuel",
            f"a road fuel with factors in set '{inputs.factor_set.name}' ({', '.join(fuels) or 'none'}), "
            f"got '{params['hydrogen_truck']['fuel']}'",
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
    if project.hydrogen_truck is not None and project.project.product == "ammonia" and project.cracking is None:
        raise SectionError(
            "hydrogen_truck", "hydrogen to carry: product 'hydrogen', or ammonia cracked back to hydrogen ([cracking])"
        )


ROUTE = Route(
    name="hydrogen_truck",
    kind="delivery_leg",
    stages=("hydrogen_trucking",),
    applies=lambda params: (
        params.get("hydrogen_truck") is not None and params["project"]["boundary"] != "cradle-to-gate"
    ),
    build=build,
    optional_sections={"hydrogen_truck": HydrogenTruck},
    validate=validate,
    check_limits=check_limits,
    description="Compressed hydrogen carried by road in tube trailers",
)
