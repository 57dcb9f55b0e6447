"""Delivering hydrogen: pipelines, compressed gas by truck, liquefaction and liquid carriage.

Every function gives an amount per kg of hydrogen delivered at the end of the leg. Hydrogen lost
on the way (leaks, boil-off vented) must be produced too, so the hydrogen taken in per kg
delivered is 1 / (1 - loss share); the lost part is reported as hydrogen leakage, a gas with an
indirect warming effect that is kept out of every scheme value unless its rulebook counts it.

References
----------
.. [1] Ideal (reversible) work of liquefaction: w_min = (h_liquid - h_0) - T_0 (s_liquid - s_0),
   the exergy of the liquid relative to the gas at ambient conditions (e.g. Barron, Cryogenic
   Systems, 2nd ed., Oxford University Press, 1985, ch. 3).
.. [2] Latent heat of vaporisation of hydrogen at 1 atm and the state functions of hydrogen from
   CoolProp (Bell et al., Ind. Eng. Chem. Res. 53 (2014) 2498-2508; Leachman et al., J. Phys.
   Chem. Ref. Data 38 (2009) 721-748 for the hydrogen equations of state).
"""

SECONDS_PER_HOUR = 3600.0
KJ_PER_KWH = 3600.0


def intake_per_unit_delivered(loss_share):
    """Product taken into a leg per unit delivered when ``loss_share`` of the intake is lost (any product).

    Parameters
    ----------
    loss_share : float or ndarray
        Share of the intake lost on the leg (dimensionless, below 1).

    Returns
    -------
    float or ndarray
        Intake, kg per kg delivered (or any unit per the same unit).
    """
    return 1.0 / (1.0 - loss_share)


def lost_per_unit_delivered(loss_share):
    """Product lost (leaked, vented, spilled) per unit delivered.

    Parameters
    ----------
    loss_share : float or ndarray
        Share of the intake lost on the leg (dimensionless, below 1).

    Returns
    -------
    float or ndarray
        Loss, kg per kg delivered (or any unit per the same unit).
    """
    return loss_share / (1.0 - loss_share)


def pipeline_loss_share(leakage_share_per_100_km, length_km):
    """Share of the hydrogen fed into a pipeline that leaks on the way (linear in length).

    Parameters
    ----------
    leakage_share_per_100_km : float or ndarray
        Share of the hydrogen fed that leaks per 100 km of pipeline (dimensionless per 100 km).
    length_km : float or ndarray
        Length of the pipeline, km.

    Returns
    -------
    float or ndarray
        Share of the intake leaked (dimensionless).
    """
    return leakage_share_per_100_km * length_km / 100.0


def truck_fuel_kg_per_kg_h2(distance_km, fuel_kg_per_km, return_fuel_ratio, payload_kg_h2):
    """Truck fuel per kg of hydrogen delivered: laden trip plus return trip, over the payload.

    Parameters
    ----------
    distance_km : float or ndarray
        One-way distance, km.
    fuel_kg_per_km : float or ndarray
        Fuel of the laden truck, kg per km.
    return_fuel_ratio : float or ndarray
        Fuel of the return trip as a share of the laden trip's (dimensionless).
    payload_kg_h2 : float or ndarray
        Hydrogen delivered per trip, kg.

    Returns
    -------
    float or ndarray
        Truck fuel, kg per kg H2 delivered.
    """
    return distance_km * fuel_kg_per_km * (1.0 + return_fuel_ratio) / payload_kg_h2


def boil_off_share(tank_heat_ingress_kw, hours_with_cargo, latent_heat_kj_per_kg, cargo_kg):
    """Share of a liquid hydrogen cargo vaporised by heat leaking into the tank [2]_.

    Parameters
    ----------
    tank_heat_ingress_kw : float or ndarray
        Heat leaking into the tank, kW.
    hours_with_cargo : float or ndarray
        Time the tank holds the cargo, h.
    latent_heat_kj_per_kg : float or ndarray
        Latent heat of vaporisation of hydrogen at 1 atm, kJ/kg (about 446 kJ/kg).
    cargo_kg : float or ndarray
        Liquid hydrogen loaded, kg.

    Returns
    -------
    float or ndarray
        Share of the cargo vaporised (dimensionless).

    References
    ----------
    .. [2] Latent heat of hydrogen at 1 atm from CoolProp (Leachman et al., J. Phys. Chem. Ref. Data 38 (2009)
       721-748).
    """
    return tank_heat_ingress_kw * hours_with_cargo * SECONDS_PER_HOUR / latent_heat_kj_per_kg / cargo_kg


def ideal_liquefaction_work_kwh_per_kg(
    h_liquid_kj_per_kg, s_liquid_kj_per_kg_k, h_ambient_kj_per_kg, s_ambient_kj_per_kg_k, ambient_temperature_k
):
    """Least work to liquefy 1 kg of hydrogen from ambient conditions, kWh/kg [1]_.

    Parameters
    ----------
    h_liquid_kj_per_kg : float or ndarray
        Specific enthalpy of the saturated liquid at 1 atm, kJ/kg.
    s_liquid_kj_per_kg_k : float or ndarray
        Specific entropy of the saturated liquid at 1 atm, kJ/(kg K).
    h_ambient_kj_per_kg : float or ndarray
        Specific enthalpy of the gas at ambient conditions, kJ/kg.
    s_ambient_kj_per_kg_k : float or ndarray
        Specific entropy of the gas at ambient conditions, kJ/(kg K).
    ambient_temperature_k : float or ndarray
        Ambient temperature, K.

    Returns
    -------
    float or ndarray
        Ideal work, kWh per kg H2 liquefied.

    References
    ----------
    .. [1] w_min = (h_liquid - h_0) - T_0 (s_liquid - s_0): Barron, Cryogenic Systems, 2nd ed., Oxford University
       Press, 1985, ch. 3.
    """
    return (
        (h_liquid_kj_per_kg - h_ambient_kj_per_kg)
        - ambient_temperature_k * (s_liquid_kj_per_kg_k - s_ambient_kj_per_kg_k)
    ) / KJ_PER_KWH
