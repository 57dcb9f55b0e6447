"""Shipping refrigerated ammonia: voyage fuel, its combustion and upstream, boil-off.

One voyage is a laden leg (distance at service speed), an optional ballast return leg, and the
days in port. Fuel is given per day at sea or per tonne of cargo per nautical mile; the two
terms are added, so the one left at zero drops out without a branch. Combustion follows the
IMO tank-to-wake form: the slipped share of the fuel (LNG) leaves unburnt as methane, the rest
burns with the fuel's CO2, CH4 and N2O conversion factors. Boil-off is the heat that leaks into
the cargo tanks divided by ammonia's latent heat of vaporisation.

References
----------
.. [1] IMO resolution MEPC.364(79) (2022), Guidelines on the method of calculation of the
   attained EEDI, §2.2.1: CO2 conversion factors Cf of marine fuels (t CO2/t fuel).
.. [2] Regulation (EU) 2023/1805 (FuelEU Maritime), Annex II: well-to-tank factors, lower
   calorific values (used with them, from the same table), tank-to-wake CH4 and N2O factors and
   methane slip (Cslip). Formerly cited to IMO MEPC.376(80), revoked and replaced by MEPC.391(81).
.. [3] Latent heat of vaporisation of ammonia at its normal boiling point (1 atm): CRC Handbook
   of Chemistry and Physics (95th ed., 2014) through the ``chemicals`` library; checked in the
   tests against CoolProp's equation of state for ammonia (Bell et al., Ind. Eng. Chem. Res. 53
   (2014) 2498-2508).
"""

HOURS_PER_DAY = 24.0
SECONDS_PER_HOUR = 3600.0


def days_at_sea(distance_nautical_miles, speed_knots):
    """Days to sail a leg: nautical miles / knots = hours."""
    return distance_nautical_miles / speed_knots / HOURS_PER_DAY


def laden_leg_fuel_t(fuel_t_per_day_at_sea, days_laden, fuel_g_per_tonne_nautical_mile, cargo_t, distance_nautical_miles):
    """Fuel burnt on the laden leg, t: per-day use times days, plus per tonne-nautical-mile use."""
    return fuel_t_per_day_at_sea * days_laden + fuel_g_per_tonne_nautical_mile * cargo_t * distance_nautical_miles / 1e6


def voyage_fuel_t(laden_leg_fuel, ballast_return_fuel_ratio, port_days, port_fuel_t_per_day):
    """Main fuel of one round voyage, t: laden leg, ballast leg (a ratio of the laden leg's fuel), port."""
    return laden_leg_fuel * (1.0 + ballast_return_fuel_ratio) + port_days * port_fuel_t_per_day


def pilot_fuel_t(main_fuel_t, main_fuel_lhv_mj_per_kg, pilot_fuel_lhv_mj_per_kg, pilot_fuel_energy_share):
    """Pilot fuel that supplies ``pilot_fuel_energy_share`` of the engine's fuel energy, t."""
    return main_fuel_t * main_fuel_lhv_mj_per_kg * pilot_fuel_energy_share / ((1.0 - pilot_fuel_energy_share) * pilot_fuel_lhv_mj_per_kg)


def boil_off_t(tank_heat_ingress_kw, hours_with_cargo, latent_heat_kj_per_kg):
    """Cargo vaporised by heat leaking into the tanks, t: kW x s = kJ, divided by kJ/kg [3]_."""
    return tank_heat_ingress_kw * hours_with_cargo * SECONDS_PER_HOUR / latent_heat_kj_per_kg / 1000.0


def reliquefaction_fuel_t(boil_off, reliquefaction_kwh_per_kg_boil_off, generator_fuel_g_per_kwh):
    """Fuel the ship's generators burn to reliquefy the boil-off, t."""
    return boil_off * 1000.0 * reliquefaction_kwh_per_kg_boil_off * generator_fuel_g_per_kwh / 1e6


def cargo_delivered_t(cargo_t, cargo_lost_t):
    return cargo_t - cargo_lost_t


def burnt_emission_kg_per_kg_fuel(conversion_factor_t_per_t_fuel, methane_slip_fraction):
    """CO2, CH4 or N2O per kg of fuel taken on board: only the share not slipped burns [2]_."""
    return conversion_factor_t_per_t_fuel * (1.0 - methane_slip_fraction)


def well_to_tank_kg_co2e_per_kg_fuel(lower_heating_value_mj_per_kg, well_to_tank_g_co2e_per_mj):
    """Upstream emissions of one kg of fuel (extraction, refining, transport, bunkering) [2]_."""
    return lower_heating_value_mj_per_kg * well_to_tank_g_co2e_per_mj / 1000.0


def per_tonne_delivered(amount_per_voyage, cargo_delivered):
    return amount_per_voyage / cargo_delivered
