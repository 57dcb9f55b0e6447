"""Delivery leg: ammonia shipped from the loading port to the destination.

Builds ``ammonia_delivered`` (stage ``shipping``, per t NH3 delivered): cargo loaded (boil-off
lost included), main and pilot fuel burnt with their well-to-tank supply, boil-off reliquefied
with generator fuel or burnt. Ammonia burnt aboard as fuel is drawn from the project's own plant.
"""

from __future__ import annotations

from typing import Any, Literal

from ..errors import InputError
from ..model.project import P, Section
from ..stages import shipping
from .base import Activity, Route, SectionError
from .marine_fuels import (
    AMMONIA_FUEL,
    burn_ammonia,
    burn_marine_fuel,
    fuel_factors,
    lng_engines,
    marine_fuels,
)


class Shipping(Section):
    destination: str = P("destination port", description="Port where the ammonia is delivered (free text)")
    distance_nautical_miles: float = P(
        unit="nautical miles", description="Laden leg, loading port to destination", gt=0
    )
    cargo_t_per_voyage: float = P(unit="t NH3", description="Ammonia loaded per voyage", gt=0)
    speed_knots: float = P(unit="knots", description="Service speed at sea", gt=0)
    fuel: str = P(
        description="Main fuel: a marine fuel of the factor set (heavy_fuel_oil, "
        "very_low_sulphur_fuel_oil, marine_gas_oil, lng) or ammonia"
    )
    engine: str = P(
        "",
        description="LNG only: engine type, for its methane slip (otto_dual_fuel_medium_speed, "
        "otto_dual_fuel_slow_speed, diesel_dual_fuel_slow_speed, lean_burn_spark_ignited)",
    )
    fuel_t_per_day_at_sea: float = P(
        0.0, "t fuel/day", "Main fuel per day at sea, laden (give this or fuel_g_per_tonne_nautical_mile)", ge=0
    )
    fuel_g_per_tonne_nautical_mile: float = P(
        0.0, "g fuel/(t cargo x nautical mile)", "Main fuel per tonne of cargo per nautical mile, laden leg", ge=0
    )
    ballast_return_fuel_ratio: float = P(
        unit="fraction of the laden leg's fuel",
        description="Fuel of the ballast return leg (0: the ship returns with other cargo)",
        ge=0,
    )
    port_days: float = P(0.0, "days", "Days in port per voyage (loading and unloading)", ge=0)
    port_fuel_t_per_day: float = P(0.0, "t fuel/day", "Main fuel per day in port", ge=0)
    pilot_fuel: str = P(
        "", description="Pilot fuel of an ammonia or dual-fuel engine (a marine fuel of the factor set); empty for none"
    )
    pilot_fuel_energy_share: float = P(
        0.0, "fraction of fuel energy", "Share of the engine's fuel energy from the pilot fuel", ge=0, lt=1
    )
    ammonia_n2o_g_per_kg: float = P(
        0.0, "g N2O/kg NH3 burnt", "N2O from ammonia burnt aboard (ammonia fuel, burnt boil-off)", ge=0
    )
    ammonia_slip_g_per_kg: float = P(
        0.0, "g NH3/kg NH3 burnt", "Ammonia passing the engine unburnt (reported, not a GHG)", ge=0
    )
    tank_heat_ingress_kw: float = P(0.0, "kW", "Heat leaking into the refrigerated cargo tanks while laden", ge=0)
    boil_off_handling: Literal["reliquefaction", "burnt"] = P(
        "reliquefaction", description="Boil-off reliquefied on board (generator fuel) or burnt (cargo lost)"
    )
    reliquefaction_kwh_per_kg_boil_off: float = P(0.0, "kWh/kg NH3", "Electricity to reliquefy boil-off", ge=0)
    generator_fuel_g_per_kwh: float = P(
        0.0, "g fuel/kWh", "Specific fuel consumption of the generators (main fuel)", ge=0
    )


def voyage_figures(ship: dict, inputs) -> dict[str, Any]:
    """The voyage in tonnes: main and pilot fuel, boil-off, cargo lost and delivered.

    Parameters
    ----------
    ship : dict
        The ``[shipping]`` section (distances in nautical miles, fuel in t/day or g/(t nmi), heat in kW).
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.

    Returns
    -------
    dict of str to float or str
        Days at sea, main and pilot fuel (t per voyage), boil-off, cargo lost and delivered (t per voyage).

    References
    ----------
    .. [1] Latent heat of ammonia at 1 atm: CRC Handbook through the ``chemicals`` library.
    """
    days = shipping.days_at_sea(ship["distance_nautical_miles"], ship["speed_knots"])
    laden = shipping.laden_leg_fuel_t(
        ship["fuel_t_per_day_at_sea"],
        days,
        ship["fuel_g_per_tonne_nautical_mile"],
        ship["cargo_t_per_voyage"],
        ship["distance_nautical_miles"],
    )
    main = shipping.voyage_fuel_t(
        laden, ship["ballast_return_fuel_ratio"], ship["port_days"], ship["port_fuel_t_per_day"]
    )
    figures: dict[str, Any] = {"destination": ship["destination"], "days_at_sea_laden": days, "fuel": ship["fuel"]}
    latent = inputs.latent_heat_ammonia()
    boil_off = shipping.boil_off_t(
        ship["tank_heat_ingress_kw"], shipping.HOURS_PER_DAY * (days + ship["port_days"]), latent
    )
    figures["latent_heat_kj_per_kg"] = latent
    reliquefied = ship["boil_off_handling"] == "reliquefaction"
    relique_fuel = shipping.reliquefaction_fuel_t(
        boil_off, ship["reliquefaction_kwh_per_kg_boil_off"], ship["generator_fuel_g_per_kwh"]
    )
    main = main + (relique_fuel if reliquefied else 0.0 * relique_fuel)
    lost = 0.0 * boil_off if reliquefied else boil_off
    figures.update(
        main_fuel_t_per_voyage=main,
        boil_off_t_per_voyage=boil_off,
        cargo_lost_t_per_voyage=lost,
        cargo_loaded_t_per_voyage=ship["cargo_t_per_voyage"],
        cargo_delivered_t_per_voyage=shipping.cargo_delivered_t(ship["cargo_t_per_voyage"], lost),
    )
    return figures


def build(params: dict, inputs, chain) -> list[Activity]:
    """Activity of ammonia shipped, per t NH3 delivered: cargo loaded (losses included), voyage and pilot
    fuel burnt with their well-to-tank supply, boil-off burnt when the project says so.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``shipping.distance_nautical_miles`` in nautical miles).
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.
    chain : Chain
        What the route modules before this one left: the reference activity and its product, the place,
        shared fuel supplies (``extra``) and figures.

    Returns
    -------
    list of Activity
        The activities it adds; their exchanges are amounts per unit of each activity (t NH3, kg fuel).

    References
    ----------
    .. [1] IMO resolution MEPC.364(79) (2022), 2.2.1: CO2 conversion factors Cf.
    .. [2] Regulation (EU) 2023/1805 (FuelEU Maritime), Annex II: well-to-tank, CH4, N2O and methane slip.
    """
    ship = params["shipping"]
    figures = voyage_figures(ship, inputs)
    delivered = figures["cargo_delivered_t_per_voyage"]

    def per_t(amount):
        return shipping.per_tonne_delivered(amount, delivered)

    voyage = Activity("ammonia_delivered", "shipping", f"ammonia, shipped to {ship['destination']}", "t NH3")
    voyage.consume(
        chain.reference, per_t(ship["cargo_t_per_voyage"]), "ammonia loaded as cargo (boil-off lost included)", "t NH3"
    )
    main_t = figures["main_fuel_t_per_voyage"]
    if ship["fuel"] == AMMONIA_FUEL:
        main_lhv = inputs.factor("heating_value.ammonia.lhv", "MJ/kg")
        voyage.consume(chain.reference, per_t(main_t), "ammonia bunkered as fuel (from the project's plant)", "t NH3")
        burn_ammonia(
            voyage,
            per_t(main_t) * 1000.0,
            ship["ammonia_n2o_g_per_kg"],
            ship["ammonia_slip_g_per_kg"],
            "ship's engines",
        )
    else:
        factors = fuel_factors(inputs, ship["fuel"], ship["engine"], "shipping.fuel")
        main_lhv = factors["lhv"]
        burn_marine_fuel(
            voyage, "shipping", ship["fuel"], factors, per_t(main_t) * 1000.0, "ship's engines", chain.extra
        )
    if ship["pilot_fuel"]:
        pilot = fuel_factors(inputs, ship["pilot_fuel"], "", "shipping.pilot_fuel")
        pilot_t = shipping.pilot_fuel_t(main_t, main_lhv, pilot["lhv"], ship["pilot_fuel_energy_share"])
        figures["pilot_fuel_t_per_voyage"] = pilot_t
        burn_marine_fuel(
            voyage, "shipping", ship["pilot_fuel"], pilot, per_t(pilot_t) * 1000.0, "pilot fuel", chain.extra
        )
    if ship["boil_off_handling"] == "burnt":
        burn_ammonia(
            voyage,
            per_t(figures["boil_off_t_per_voyage"]) * 1000.0,
            ship["ammonia_n2o_g_per_kg"],
            ship["ammonia_slip_g_per_kg"],
            "boil-off burnt",
        )
    chain.reference, chain.place = voyage.key, f"at {ship['destination']}"
    chain.figures["voyage"] = figures
    return [voyage]


def check_limits(params: dict, inputs, source: str) -> None:
    """Fuels and engines with factors in the set; a boil-off that leaves cargo to deliver.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``shipping.tank_heat_ingress_kw`` in kW).
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
    ship = params["shipping"]
    factor_set = inputs.factor_set
    fuels = marine_fuels(factor_set)
    if ship["fuel"] not in fuels:
        raise InputError(
            source,
            "shipping.fuel",
            f"a fuel with factors in set '{factor_set.name}' ({', '.join(fuels)}), got '{ship['fuel']}'",
        )
    if ship["fuel"] == "lng" and ship["engine"] not in lng_engines(factor_set):
        raise InputError(
            source,
            "shipping.engine",
            f"an LNG engine type with a methane slip factor ({', '.join(lng_engines(factor_set))}), "
            f"got '{ship['engine']}'",
        )
    if ship["fuel"] != "lng" and ship["engine"]:
        raise InputError(
            source,
            "shipping.engine",
            f"no engine type for fuel '{ship['fuel']}' (it only selects the methane slip of LNG)",
        )
    if ship["pilot_fuel"] and ship["pilot_fuel"] not in fuels[:-1]:
        raise InputError(
            source,
            "shipping.pilot_fuel",
            f"a marine fuel of set '{factor_set.name}' ({', '.join(fuels[:-1])}), got '{ship['pilot_fuel']}'",
        )
    if params["project"]["boundary"] == "cradle-to-gate":
        return
    figures = voyage_figures(ship, inputs)
    if not figures["cargo_delivered_t_per_voyage"] > 0:
        raise InputError(
            source,
            "shipping.tank_heat_ingress_kw",
            f"a heat ingress that leaves cargo to deliver (boil-off {figures['boil_off_t_per_voyage']:.0f} "
            f"t of {ship['cargo_t_per_voyage']:g} t loaded)",
        )


def draw_limits(params: dict, inputs) -> list:
    """The cargo balance of ``check_limits`` on numbers or arrays of draws (fuel names are text, checked once).

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``shipping.tank_heat_ingress_kw`` in kW).
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
    if params["project"]["boundary"] == "cradle-to-gate":
        return []
    figures = voyage_figures(params["shipping"], inputs)
    return [
        (
            "shipping.tank_heat_ingress_kw",
            "a heat ingress that leaves cargo to deliver",
            figures["cargo_delivered_t_per_voyage"] > 0,
        )
    ]


def validate(project) -> None:
    """A ``[shipping]`` section only for ammonia, its fuel given either per day or per tonne-nautical-mile,
    with the options each fuel and boil-off handling need.

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
    ship = project.shipping
    if ship is None:
        return
    if project.project.product != "ammonia":
        raise SectionError(
            "shipping", "no [shipping] section for product 'hydrogen' (delivery is modelled for ammonia)"
        )
    if (ship.fuel_t_per_day_at_sea > 0) == (ship.fuel_g_per_tonne_nautical_mile > 0):
        raise SectionError(
            "shipping.fuel_t_per_day_at_sea",
            "either fuel_t_per_day_at_sea or fuel_g_per_tonne_nautical_mile above 0, not both",
        )
    if ship.fuel == "lng" and not ship.engine:
        raise SectionError("shipping.engine", "an engine type for fuel 'lng' (its methane slip depends on it)")
    if bool(ship.pilot_fuel) != (ship.pilot_fuel_energy_share > 0):
        raise SectionError("shipping.pilot_fuel_energy_share", "a share above 0 together with a pilot_fuel, or neither")
    if (
        ship.tank_heat_ingress_kw > 0
        and ship.boil_off_handling == "reliquefaction"
        and not (ship.reliquefaction_kwh_per_kg_boil_off > 0 and ship.generator_fuel_g_per_kwh > 0)
    ):
        raise SectionError(
            "shipping.reliquefaction_kwh_per_kg_boil_off",
            "reliquefaction_kwh_per_kg_boil_off and generator_fuel_g_per_kwh above 0 to reliquefy the boil-off",
        )


ROUTE = Route(
    name="shipping",
    kind="delivery_leg",
    stages=("shipping",),
    applies=lambda params: params.get("shipping") is not None and params["project"]["boundary"] != "cradle-to-gate",
    build=build,
    optional_sections={"shipping": Shipping},
    validate=validate,
    check_limits=check_limits,
    draw_limits=draw_limits,
    description="Ammonia shipped to the destination port (well-to-tank and well-to-wake)",
)
