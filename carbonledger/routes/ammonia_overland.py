"""Delivery legs: ammonia carried overland by pipeline or by rail, before or instead of a voyage.

``AMMONIA_PIPELINE`` builds ``ammonia_piped`` (stage ``ammonia_pipeline``, per t NH3 delivered):
ammonia fed in (losses included), pumping electricity from the project's mix, ammonia lost
(reported, not a greenhouse gas). ``AMMONIA_RAIL`` builds ``ammonia_railed`` (stage
``ammonia_rail``): ammonia loaded (losses included), locomotive fuel for the laden and return
trips with its well-to-tank supply.
"""

from __future__ import annotations

from ..errors import InputError
from ..model.project import P, Section
from ..stages import hydrogen_delivery
from .base import Activity, Route, SectionError
from .road_fuels import burn_road_fuel, road_fuel_factors, road_fuels


class AmmoniaPipeline(Section):
    destination: str = P("pipeline end", description="Where the pipeline delivers the ammonia (free text)")
    length_km: float = P(unit="km", description="Pipeline length", gt=0, le=20000)
    pumping_kwh_per_t_km: float = P(
        0.0, "kWh/(t NH3 x km)", "Pumping electricity per tonne and km, from the project's mix", ge=0
    )
    loss_share: float = P(0.0, "fraction", "Share of the ammonia fed in that is lost on the way", ge=0, lt=1)


class AmmoniaRail(Section):
    destination: str = P("rail terminal", description="Where the trains deliver the ammonia (free text)")
    distance_km: float = P(unit="km", description="Rail distance, one way", gt=0, le=20000)
    fuel: str = P("diesel", description="Locomotive fuel: a rail fuel of the factor set")
    fuel_g_per_t_km: float = P(
        unit="g fuel/(t NH3 x km)", description="Locomotive fuel per tonne of ammonia and km, laden", ge=0
    )
    return_fuel_ratio: float = P(
        1.0, "fraction of the laden trip's fuel", "Fuel of the return trip with empty tank wagons", ge=0
    )
    loss_share: float = P(
        0.0, "fraction", "Share of the ammonia loaded that is lost (loading, transit, unloading)", ge=0, lt=1
    )


def _needs_ammonia(section: str):
    def validate(project) -> None:
        if getattr(project, section) is not None and project.project.product != "ammonia":
            raise SectionError(section, f"no [{section}] section for product 'hydrogen' (it carries ammonia)")

    return validate


def build_pipeline(params: dict, inputs, chain) -> list[Activity]:
    """Activity of ammonia carried by pipeline, per t NH3 delivered: ammonia fed in (losses
    included), pumping electricity, ammonia lost.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``ammonia_pipeline.pumping_kwh_per_t_km`` in kWh/(t km)).
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.
    chain : Chain
        What the route modules before this one left: the reference activity and its product, the place,
        shared fuel supplies (``extra``) and figures.

    Returns
    -------
    list of Activity
        The activities it adds; their exchanges are amounts per unit of each activity (t NH3).
    """
    leg = params["ammonia_pipeline"]
    pipe = Activity("ammonia_piped", "ammonia_pipeline", f"ammonia, piped to {leg['destination']}", "t NH3")
    into = hydrogen_delivery.intake_per_unit_delivered(leg["loss_share"])
    pipe.consume(chain.reference, into, "ammonia fed into the pipeline (losses included)", "t NH3")
    pipe.consume(
        "electricity_mix", leg["pumping_kwh_per_t_km"] * leg["length_km"] * into, "electricity, pumping", "kWh"
    )
    pipe.emit(
        "nh3",
        1000.0 * hydrogen_delivery.lost_per_unit_delivered(leg["loss_share"]),
        "ammonia lost from the pipeline (not a GHG)",
    )
    chain.reference, chain.place = pipe.key, f"at {leg['destination']}"
    return [pipe]


def build_rail(params: dict, inputs, chain) -> list[Activity]:
    """Activity of ammonia carried by rail, per t NH3 delivered: ammonia loaded (losses included),
    locomotive fuel for the laden and return trips with its well-to-tank supply, ammonia lost.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``ammonia_rail.fuel_g_per_t_km`` in g/(t km)).
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.
    chain : Chain
        What the route modules before this one left: the reference activity and its product, the place,
        shared fuel supplies (``extra``) and figures.

    Returns
    -------
    list of Activity
        The activities it adds; their exchanges are amounts per unit of each activity (t NH3).
    """
    leg = params["ammonia_rail"]
    train = Activity("ammonia_railed", "ammonia_rail", f"ammonia, carried by rail to {leg['destination']}", "t NH3")
    into = hydrogen_delivery.intake_per_unit_delivered(leg["loss_share"])
    train.consume(chain.reference, into, "ammonia loaded (losses included)", "t NH3")
    fuel_kg = leg["fuel_g_per_t_km"] * leg["distance_km"] * into * (1.0 + leg["return_fuel_ratio"]) / 1000.0
    burn_road_fuel(
        train,
        "ammonia_rail",
        leg["fuel"],
        road_fuel_factors(inputs, leg["fuel"], "ammonia_rail.fuel", "rail_fuel"),
        fuel_kg,
        "locomotive, laden and return trips",
        chain.extra,
    )
    train.emit(
        "nh3",
        1000.0 * hydrogen_delivery.lost_per_unit_delivered(leg["loss_share"]),
        "ammonia lost in rail carriage (not a GHG)",
    )
    chain.reference, chain.place = train.key, f"at {leg['destination']}"
    chain.figures["ammonia_rail"] = {"fuel_kg_per_t_nh3": fuel_kg}
    return [train]


def check_rail(params: dict, inputs, source: str) -> None:
    """The rail fuel must have factors in the factor set.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``ammonia_rail.fuel``, a fuel name).
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
    fuels = road_fuels(inputs.factor_set, "rail_fuel")
    if params["ammonia_rail"]["fuel"] not in fuels:
        raise InputError(
            source,
            "ammonia_rail.fuel",
            f"a rail fuel with factors in set '{inputs.factor_set.name}' ({', '.join(fuels) or 'none'}), "
            f"got '{params['ammonia_rail']['fuel']}'",
        )


AMMONIA_PIPELINE = Route(
    name="ammonia_pipeline",
    kind="delivery_leg",
    stages=("ammonia_pipeline",),
    applies=lambda params: (
        params.get("ammonia_pipeline") is not None and params["project"]["boundary"] != "cradle-to-gate"
    ),
    build=build_pipeline,
    optional_sections={"ammonia_pipeline": AmmoniaPipeline},
    validate=_needs_ammonia("ammonia_pipeline"),
    description="Ammonia carried by pipeline from the plant (before any voyage)",
)

AMMONIA_RAIL = Route(
    name="ammonia_rail",
    kind="delivery_leg",
    stages=("ammonia_rail",),
    applies=lambda params: params.get("ammonia_rail") is not None and params["project"]["boundary"] != "cradle-to-gate",
    build=build_rail,
    optional_sections={"ammonia_rail": AmmoniaRail},
    validate=_needs_ammonia("ammonia_rail"),
    check_limits=check_rail,
    description="Ammonia carried by rail in tank wagons (before any voyage)",
)
