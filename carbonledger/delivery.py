"""Delivery beyond the plant gate: the voyage, cracking back to hydrogen, and end use.

``add_delivery`` appends the activities a boundary needs to an inventory's activities and
returns the reference activity of that boundary with its functional unit:

- cradle-to-gate: nothing is added; ammonia (or hydrogen) at the plant gate.
- well-to-tank: ``ammonia_delivered`` (stage ``shipping``, per t NH3 delivered at the
  destination) when the project has a voyage, then ``hydrogen_delivered`` (stage ``cracking``,
  per kg H2) when it has a cracker; without either, the gate product counts as delivered.
- well-to-wake: ``end_use`` (stage ``end_use``), the delivered product burnt (ammonia) or used
  (hydrogen, which emits no greenhouse gas when burnt or used in a fuel cell).

Fuel supply (well-to-tank of marine and pilot fuels) is an activity of its own in the stage that
burns the fuel. Ammonia burnt aboard as fuel is drawn from the project's own plant, so its
upstream is the project's own ammonia chain, not a default factor.
"""

from __future__ import annotations

from typing import Any

from .errors import InputError
from .inventory import Activity, _burn_gas
from .stages import cracking, end_use, shipping

AMMONIA_FUEL = "ammonia"


def marine_fuels(factor_set) -> list[str]:
    """Fuels with a CO2 conversion factor in the set, plus ammonia (drawn from the cargo)."""
    names = sorted(key.split(".")[1] for key in factor_set.ids_with_prefix("marine_fuel.") if key.endswith(".co2"))
    return names + [AMMONIA_FUEL]


def lng_engines(factor_set) -> list[str]:
    return [key.rsplit(".", 1)[1] for key in factor_set.ids_with_prefix("marine_fuel.lng.methane_slip.")]


def _fuel_factors(inputs, fuel: str, engine: str, where: str) -> dict[str, Any]:
    slip = inputs.factor(f"marine_fuel.lng.methane_slip.{engine}", "kg CH4/kg fuel", where) if fuel == "lng" else 0.0
    return {
        "co2": shipping.burnt_emission_kg_per_kg_fuel(inputs.factor(f"marine_fuel.{fuel}.co2", "t CO2/t fuel", where), slip),
        "ch4": shipping.burnt_emission_kg_per_kg_fuel(inputs.factor(f"marine_fuel.{fuel}.ch4", "t CH4/t fuel", where), slip),
        "n2o": shipping.burnt_emission_kg_per_kg_fuel(inputs.factor(f"marine_fuel.{fuel}.n2o", "t N2O/t fuel", where), slip),
        "slip": slip,
        "lhv": inputs.factor(f"marine_fuel.{fuel}.lhv", "MJ/kg", where),
        "well_to_tank": inputs.factor(f"marine_fuel.{fuel}.well_to_tank", "g CO2e/MJ", where),
    }


def _burn_marine_fuel(activity: Activity, stage: str, fuel: str, factors: dict, fuel_kg, label: str, extra: list[Activity]) -> None:
    """Fuel bought (its well-to-tank supply activity) and burnt (CO2, CH4 with slip, N2O)."""
    supplier = f"fuel_supply:{stage}:{fuel}"
    if not any(a.key == supplier for a in extra):
        supply = Activity(supplier, stage, f"{fuel.replace('_', ' ')}, supplied (well-to-tank)", "kg fuel")
        supply.emit("co2e_precharacterised", shipping.well_to_tank_kg_co2e_per_kg_fuel(factors["lhv"], factors["well_to_tank"]), f"well-to-tank of {fuel.replace('_', ' ')}")
        extra.append(supply)
    activity.consume(supplier, fuel_kg, f"{fuel.replace('_', ' ')}, {label}", "kg fuel")
    activity.emit("co2_fossil", fuel_kg * factors["co2"], f"CO2 from burning {fuel.replace('_', ' ')}, {label}")
    activity.emit("ch4_fossil", fuel_kg * (factors["ch4"] + factors["slip"]), f"CH4 from {fuel.replace('_', ' ')} (combustion and slip), {label}")
    activity.emit("n2o", fuel_kg * factors["n2o"], f"N2O from burning {fuel.replace('_', ' ')}, {label}")


def _burn_ammonia(activity: Activity, ammonia_kg, n2o_g_per_kg, slip_g_per_kg, label: str) -> None:
    activity.emit("n2o", ammonia_kg * end_use.per_kg(n2o_g_per_kg), f"N2O from burning ammonia, {label}")
    activity.emit("nh3", ammonia_kg * end_use.per_kg(slip_g_per_kg), f"ammonia slip (not a GHG), {label}")


def voyage_figures(ship: dict, inputs) -> dict[str, Any]:
    """The voyage in tonnes: main and pilot fuel, boil-off, cargo lost and delivered."""
    days = shipping.days_at_sea(ship["distance_nautical_miles"], ship["speed_knots"])
    laden = shipping.laden_leg_fuel_t(ship["fuel_t_per_day_at_sea"], days, ship["fuel_g_per_tonne_nautical_mile"], ship["cargo_t_per_voyage"], ship["distance_nautical_miles"])
    main = shipping.voyage_fuel_t(laden, ship["ballast_return_fuel_ratio"], ship["port_days"], ship["port_fuel_t_per_day"])
    figures: dict[str, Any] = {"destination": ship["destination"], "days_at_sea_laden": days, "fuel": ship["fuel"]}
    latent = inputs.latent_heat_ammonia()
    boil_off = shipping.boil_off_t(ship["tank_heat_ingress_kw"], shipping.HOURS_PER_DAY * (days + ship["port_days"]), latent)
    figures["latent_heat_kj_per_kg"] = latent
    reliquefied = ship["boil_off_handling"] == "reliquefaction"
    relique_fuel = shipping.reliquefaction_fuel_t(boil_off, ship["reliquefaction_kwh_per_kg_boil_off"], ship["generator_fuel_g_per_kwh"])
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


def _voyage(p: dict, inputs, extra: list[Activity]) -> tuple[Activity, dict]:
    ship = p["shipping"]
    figures = voyage_figures(ship, inputs)
    delivered = figures["cargo_delivered_t_per_voyage"]
    per_t = lambda amount: shipping.per_tonne_delivered(amount, delivered)  # noqa: E731
    voyage = Activity("ammonia_delivered", "shipping", f"ammonia, shipped to {ship['destination']}", "t NH3")
    voyage.consume("ammonia_storage", per_t(ship["cargo_t_per_voyage"]), "ammonia loaded as cargo (boil-off lost included)", "t NH3")
    main_t = figures["main_fuel_t_per_voyage"]
    if ship["fuel"] == AMMONIA_FUEL:
        main_lhv = inputs.factor("heating_value.ammonia.lhv", "MJ/kg")
        voyage.consume("ammonia_storage", per_t(main_t), "ammonia bunkered as fuel (from the project's plant)", "t NH3")
        _burn_ammonia(voyage, per_t(main_t) * 1000.0, ship["ammonia_n2o_g_per_kg"], ship["ammonia_slip_g_per_kg"], "ship's engines")
    else:
        factors = _fuel_factors(inputs, ship["fuel"], ship["engine"], "shipping.fuel")
        main_lhv = factors["lhv"]
        _burn_marine_fuel(voyage, "shipping", ship["fuel"], factors, per_t(main_t) * 1000.0, "ship's engines", extra)
    if ship["pilot_fuel"]:
        pilot = _fuel_factors(inputs, ship["pilot_fuel"], "", "shipping.pilot_fuel")
        pilot_t = shipping.pilot_fuel_t(main_t, main_lhv, pilot["lhv"], ship["pilot_fuel_energy_share"])
        figures["pilot_fuel_t_per_voyage"] = pilot_t
        _burn_marine_fuel(voyage, "shipping", ship["pilot_fuel"], pilot, per_t(pilot_t) * 1000.0, "pilot fuel", extra)
    if ship["boil_off_handling"] == "burnt":
        _burn_ammonia(voyage, per_t(figures["boil_off_t_per_voyage"]) * 1000.0, ship["ammonia_n2o_g_per_kg"], ship["ammonia_slip_g_per_kg"], "boil-off burnt")
    return voyage, figures


def cracking_figures(c: dict, inputs) -> dict[str, Any]:
    m_nh3, m_h2 = inputs.molar_mass("NH3"), inputs.molar_mass("H2")
    feed = cracking.ammonia_kg_per_kg_h2_cracked(m_nh3, m_h2)
    enthalpy = cracking.reaction_enthalpy_mj_per_kg_h2(inputs.formation_enthalpy_ammonia(), m_h2)
    heat = cracking.heat_mj_per_kg_h2_cracked(enthalpy, feed, inputs.latent_heat_ammonia(), c["heat_to_reactor_efficiency"])
    burnt = cracking.hydrogen_burnt_share(heat, inputs.factor("heating_value.hydrogen.lhv", "MJ/kg"), c["heat_source"])
    return {
        "ammonia_kg_per_kg_h2_cracked": feed,
        "reaction_enthalpy_mj_per_kg_h2": enthalpy,
        "heat_mj_per_kg_h2_cracked": heat,
        "hydrogen_burnt_per_kg_h2_cracked": burnt,
        "heat_source": c["heat_source"],
        "hydrogen_recovery_fraction": c["hydrogen_recovery_fraction"],
    }


def _cracker(p: dict, inputs, ammonia_source: str, destination: str) -> tuple[Activity, dict]:
    c = p["cracking"]
    figures = cracking_figures(c, inputs)
    cracked = cracking.hydrogen_cracked_kg_per_kg_delivered(c["hydrogen_recovery_fraction"], figures["hydrogen_burnt_per_kg_h2_cracked"])
    heat = figures["heat_mj_per_kg_h2_cracked"]
    ammonia_burnt_kg = cracking.fuel_heat_mj_per_kg_delivered(heat, cracked, c["heat_source"], "ammonia") / inputs.factor("heating_value.ammonia.lhv", "MJ/kg")
    gas_gj = cracking.fuel_heat_mj_per_kg_delivered(heat, cracked, c["heat_source"], "natural_gas") / 1000.0
    ammonia_kg = cracked * figures["ammonia_kg_per_kg_h2_cracked"] + ammonia_burnt_kg
    figures.update(hydrogen_cracked_kg_per_kg_delivered=cracked, ammonia_kg_per_kg_h2_delivered=ammonia_kg, ammonia_burnt_for_heat_kg_per_kg_h2=ammonia_burnt_kg)
    plant = Activity("hydrogen_delivered", "cracking", f"hydrogen, cracked from ammonia at {destination}", "kg H2")
    plant.consume(ammonia_source, ammonia_kg / 1000.0, "ammonia cracked and burnt for heat", "t NH3")
    _burn_ammonia(plant, ammonia_burnt_kg, c["burner_n2o_g_per_kg_ammonia"], 0.0, "cracker burner")
    if c["heat_source"] == "natural_gas":
        _burn_gas(plant, inputs, gas_gj, "cracker heat")
    if c["electricity_factor"]:
        _emit_electricity(plant, inputs, c["electricity_kwh_per_kg_h2"], c["electricity_factor"], "cracking.electricity_factor", "cracker")
    return plant, figures


def _emit_electricity(activity: Activity, inputs, kwh, factor_id: str, where: str, label: str) -> None:
    unit = inputs.factor_unit(factor_id, where)
    direct = unit.replace(" ", "").startswith("gCO2/")
    flow = "co2_fossil" if direct else "co2e_precharacterised"
    factor = inputs.factor(factor_id, "g CO2/kWh" if direct else "g CO2e/kWh", where)
    activity.emit(flow, kwh * factor / 1000.0, f"electricity, {label}")


def _end_use(p: dict, inputs, source: str, product: str, extra: list[Activity], where_delivered: str) -> Activity:
    if product == "hydrogen":
        use = Activity("end_use", "end_use", f"hydrogen {where_delivered}, used", "kg H2")
        use.consume(source, 1.0, "hydrogen used (no CO2; hydrogen leakage not counted)", "kg H2")
        return use
    u = p["end_use"]
    use = Activity("end_use", "end_use", f"ammonia {where_delivered}, burnt in an {u['converter']}", "t NH3")
    use.consume(source, 1.0, "ammonia burnt", "t NH3")
    _burn_ammonia(use, 1000.0, u["n2o_g_per_kg_ammonia"], u["ammonia_slip_g_per_kg_ammonia"], u["converter"])
    if u["pilot_fuel"]:
        pilot = _fuel_factors(inputs, u["pilot_fuel"], "", "end_use.pilot_fuel")
        pilot_kg = 1000.0 * end_use.pilot_fuel_kg_per_kg_ammonia(inputs.factor("heating_value.ammonia.lhv", "MJ/kg"), pilot["lhv"], u["pilot_fuel_energy_share"])
        _burn_marine_fuel(use, "end_use", u["pilot_fuel"], pilot, pilot_kg, "pilot fuel", extra)
    return use


def add_delivery(params: dict, inputs, gate: str, product: str, source: str = "project") -> tuple[list[Activity], str, str, str, dict]:
    """Activities beyond the gate for ``params['project']['boundary']``.

    Returns (activities, reference activity, reference product, functional unit, figures).
    """
    boundary = params["project"]["boundary"]
    unit_name = {"ammonia": "t NH3", "hydrogen": "kg H2"}
    if boundary == "cradle-to-gate":
        return [], gate, product, f"1 {unit_name[product]} at the plant gate", {}
    activities: list[Activity] = []
    extra: list[Activity] = []
    figures: dict[str, Any] = {}
    reference, reference_product = gate, product
    ship = params.get("shipping")
    place = f"at {ship['destination']}" if ship else "at the plant gate (no voyage in the project)"
    if ship:
        voyage, figures["voyage"] = _voyage(params, inputs, extra)
        activities.append(voyage)
        reference = voyage.key
    if params.get("cracking"):
        plant, figures["cracking"] = _cracker(params, inputs, reference, place)
        activities.append(plant)
        reference, reference_product = plant.key, "hydrogen"
    functional_unit = f"1 {unit_name[reference_product]} delivered {place}" + (", cracked from ammonia" if reference_product != product else "")
    if boundary == "well-to-wake":
        if reference_product == "ammonia" and not params.get("end_use"):
            raise InputError(source, "end_use", "an [end_use] section (converter, N2O and ammonia slip) for boundary 'well-to-wake'")
        use = _end_use(params, inputs, reference, reference_product, extra, f"delivered {place}")
        activities.append(use)
        reference = use.key
        functional_unit += ", burnt" if reference_product == "ammonia" else ", used (hydrogen use emits no CO2)"
    return activities + extra, reference, reference_product, functional_unit, figures


def check_delivery(params: dict, inputs, source: str) -> None:
    """Refuse delivery inputs that no factor covers or that physics forbids (numbers only).

    Fuel and engine names are checked whatever the boundary; the voyage and cracker balances
    (which need CoolProp) only when the boundary reaches beyond the gate.
    """
    beyond_gate = params["project"]["boundary"] != "cradle-to-gate"
    if params["project"]["boundary"] == "well-to-wake" and params.get("end_use") is None and params["project"]["product"] == "ammonia" and not params.get("cracking"):
        raise InputError(source, "end_use", "an [end_use] section (converter, N2O and ammonia slip) for boundary 'well-to-wake'")
    factor_set = inputs.factor_set
    fuels = marine_fuels(factor_set)
    ship = params.get("shipping")
    if ship:
        if ship["fuel"] not in fuels:
            raise InputError(source, "shipping.fuel", f"a fuel with factors in set '{factor_set.name}' ({', '.join(fuels)}), got '{ship['fuel']}'")
        if ship["fuel"] == "lng" and ship["engine"] not in lng_engines(factor_set):
            raise InputError(source, "shipping.engine", f"an LNG engine type with a methane slip factor ({', '.join(lng_engines(factor_set))}), got '{ship['engine']}'")
        if ship["fuel"] != "lng" and ship["engine"]:
            raise InputError(source, "shipping.engine", f"no engine type for fuel '{ship['fuel']}' (it only selects the methane slip of LNG)")
        if ship["pilot_fuel"] and ship["pilot_fuel"] not in fuels[:-1]:
            raise InputError(source, "shipping.pilot_fuel", f"a marine fuel of set '{factor_set.name}' ({', '.join(fuels[:-1])}), got '{ship['pilot_fuel']}'")
        figures = voyage_figures(ship, inputs) if beyond_gate else {}
        if figures and not figures["cargo_delivered_t_per_voyage"] > 0:
            raise InputError(source, "shipping.tank_heat_ingress_kw", f"a heat ingress that leaves cargo to deliver (boil-off {figures['boil_off_t_per_voyage']:.0f} t of {ship['cargo_t_per_voyage']:g} t loaded)")
    use = params.get("end_use")
    if use and use["pilot_fuel"] and use["pilot_fuel"] not in fuels[:-1]:
        raise InputError(source, "end_use.pilot_fuel", f"a marine fuel of set '{factor_set.name}' ({', '.join(fuels[:-1])}), got '{use['pilot_fuel']}'")
    c = params.get("cracking")
    if c and beyond_gate:
        figures = cracking_figures(c, inputs)
        if not c["hydrogen_recovery_fraction"] > figures["hydrogen_burnt_per_kg_h2_cracked"]:
            raise InputError(
                source,
                "cracking.hydrogen_recovery_fraction",
                f"a recovery above the hydrogen burnt for heat ({figures['hydrogen_burnt_per_kg_h2_cracked']:.3f} kg per kg cracked), got {c['hydrogen_recovery_fraction']:g}",
            )
