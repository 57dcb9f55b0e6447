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
    """Days to sail a leg: nautical miles / knots = hours.

    Parameters
    ----------
    distance_nautical_miles : float or ndarray
        Length of the leg, nautical miles.
    speed_knots : float or ndarray
        Service speed, knots (nautical miles per hour).

    Returns
    -------
    float or ndarray
        Time at sea, days.
    """
    return distance_nautical_miles / speed_knots / HOURS_PER_DAY


def laden_leg_fuel_t(
    fuel_t_per_day_at_sea, days_laden, fuel_g_per_tonne_nautical_mile, cargo_t, distance_nautical_miles
):
    """Fuel burnt on the laden leg, t: per-day use times days, plus per tonne-nautical-mile use.

    Parameters
    ----------
    fuel_t_per_day_at_sea : float or ndarray
        Fuel burnt per day at sea, t/day (zero when given per tonne-nautical-mile).
    days_laden : float or ndarray
        Days at sea on the laden leg.
    fuel_g_per_tonne_nautical_mile : float or ndarray
        Fuel per tonne of cargo per nautical mile, g/(t nmi) (zero when given per day).
    cargo_t : float or ndarray
        Cargo loaded, t.
    distance_nautical_miles : float or ndarray
        Length of the laden leg, nautical miles.

    Returns
    -------
    float or ndarray
        Fuel, t.
    """
    return fuel_t_per_day_at_sea * days_laden + fuel_g_per_tonne_nautical_mile * cargo_t * distance_nautical_miles / 1e6


def voyage_fuel_t(laden_leg_fuel, ballast_return_fuel_ratio, port_days, port_fuel_t_per_day):
    """Main fuel of one round voyage, t: laden leg, ballast leg (a ratio of the laden leg's fuel), port.

    Parameters
    ----------
    laden_leg_fuel : float or ndarray
        Fuel of the laden leg, t.
    ballast_return_fuel_ratio : float or ndarray
        Fuel of the ballast return leg as a share of the laden leg's (dimensionless; zero for one way).
    port_days : float or ndarray
        Days in port, days.
    port_fuel_t_per_day : float or ndarray
        Fuel burnt per day in port, t/day.

    Returns
    -------
    float or ndarray
        Fuel of the voyage, t.
    """
    return laden_leg_fuel * (1.0 + ballast_return_fuel_ratio) + port_days * port_fuel_t_per_day


def pilot_fuel_t(main_fuel_t, main_fuel_lhv_mj_per_kg, pilot_fuel_lhv_mj_per_kg, pilot_fuel_energy_share):
    """Pilot fuel that supplies ``pilot_fuel_energy_share`` of the engine's fuel energy, t.

    Parameters
    ----------
    main_fuel_t : float or ndarray
        Main fuel burnt, t.
    main_fuel_lhv_mj_per_kg : float or ndarray
        Lower heating value of the main fuel, MJ/kg [2]_.
    pilot_fuel_lhv_mj_per_kg : float or ndarray
        Lower heating value of the pilot fuel, MJ/kg [2]_.
    pilot_fuel_energy_share : float or ndarray
        Share of the engine's fuel energy supplied by the pilot fuel (dimensionless, below 1).

    Returns
    -------
    float or ndarray
        Pilot fuel, t.

    References
    ----------
    .. [2] Regulation (EU) 2023/1805 (FuelEU Maritime), Annex II: lower calorific values.
    """
    return (
        main_fuel_t
        * main_fuel_lhv_mj_per_kg
        * pilot_fuel_energy_share
        / ((1.0 - pilot_fuel_energy_share) * pilot_fuel_lhv_mj_per_kg)
    )


def boil_off_t(tank_heat_ingress_kw, hours_with_cargo, latent_heat_kj_per_kg):
    """Cargo vaporised by heat leaking into the tanks, t: kW x s = kJ, divided by kJ/kg [3]_.

    Parameters
    ----------
    tank_heat_ingress_kw : float or ndarray
        Heat leaking into the cargo tanks, kW.
    hours_with_cargo : float or ndarray
        Time the tanks hold the cargo, h.
    latent_heat_kj_per_kg : float or ndarray
        Latent heat of vaporisation of ammonia at 1 atm, kJ/kg (about 1370 kJ/kg).

    Returns
    -------
    float or ndarray
        Ammonia vaporised, t.

    References
    ----------
    .. [3] CRC Handbook of Chemistry and Physics (95th ed., 2014) through the ``chemicals`` library.
    """
    return tank_heat_ingress_kw * hours_with_cargo * SECONDS_PER_HOUR / latent_heat_kj_per_kg / 1000.0


def reliquefaction_fuel_t(boil_off, reliquefaction_kwh_per_kg_boil_off, generator_fuel_g_per_kwh):
    """Fuel the ship's generators burn to reliquefy the boil-off, t.

    Parameters
    ----------
    boil_off : float or ndarray
        Ammonia vaporised, t.
    reliquefaction_kwh_per_kg_boil_off : float or ndarray
        Electricity of reliquefaction, kWh per kg of boil-off.
    generator_fuel_g_per_kwh : float or ndarray
        Specific fuel consumption of the generators, g/kWh.

    Returns
    -------
    float or ndarray
        Generator fuel, t.
    """
    return boil_off * 1000.0 * reliquefaction_kwh_per_kg_boil_off * generator_fuel_g_per_kwh / 1e6


def cargo_delivered_t(cargo_t, cargo_lost_t):
    """Cargo unloaded at the destination: the cargo loaded less what was lost.

    Parameters
    ----------
    cargo_t : float or ndarray
        Cargo loaded, t.
    cargo_lost_t : float or ndarray
        Cargo lost on the voyage (boil-off not reliquefied), t.

    Returns
    -------
    float or ndarray
        Cargo delivered, t.
    """
    return cargo_t - cargo_lost_t


def burnt_emission_kg_per_kg_fuel(conversion_factor_t_per_t_fuel, methane_slip_fraction):
    """CO2, CH4 or N2O per kg of fuel taken on board: only the share not slipped burns [2]_.

    Parameters
    ----------
    conversion_factor_t_per_t_fuel : float or ndarray
        Conversion factor of the gas for the fuel, t per t fuel (e.g. Cf of CO2: 3.114 for heavy fuel oil) [1]_.
    methane_slip_fraction : float or ndarray
        Share of the fuel that leaves unburnt (Cslip, for LNG; zero for liquid fuels) (dimensionless).

    Returns
    -------
    float or ndarray
        Emission, kg per kg fuel.

    References
    ----------
    .. [1] IMO resolution MEPC.364(79) (2022), EEDI guidelines, 2.2.1: CO2 conversion factors Cf.
    .. [2] Regulation (EU) 2023/1805 (FuelEU Maritime), Annex II: tank-to-wake factors and methane slip.
    """
    return conversion_factor_t_per_t_fuel * (1.0 - methane_slip_fraction)


def well_to_tank_kg_co2e_per_kg_fuel(lower_heating_value_mj_per_kg, well_to_tank_g_co2e_per_mj):
    """Upstream emissions of one kg of fuel (extraction, refining, transport, bunkering) [2]_.

    Parameters
    ----------
    lower_heating_value_mj_per_kg : float or ndarray
        Lower heating value of the fuel, MJ/kg.
    well_to_tank_g_co2e_per_mj : float or ndarray
        Well-to-tank emission factor of the fuel, g CO2e/MJ.

    Returns
    -------
    float or ndarray
        Upstream emissions, kg CO2e per kg fuel.

    References
    ----------
    .. [2] Regulation (EU) 2023/1805 (FuelEU Maritime), Annex II: well-to-tank factors and lower calorific values.
    """
    return lower_heating_value_mj_per_kg * well_to_tank_g_co2e_per_mj / 1000.0


def per_tonne_delivered(amount_per_voyage, cargo_delivered):
    """An amount of one voyage per tonne of cargo delivered.

    Parameters
    ----------
    amount_per_voyage : float or ndarray
        Amount of the voyage (fuel in t, emissions in kg, ...).
    cargo_delivered : float or ndarray
        Cargo delivered, t.

    Returns
    -------
    float or ndarray
        The amount per t delivered, in its own unit per t.
    """
    return amount_per_voyage / cargo_delivered
