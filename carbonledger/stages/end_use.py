"""End use of delivered ammonia as a fuel (engine or turbine), and ammonia burnt aboard ships.

Ammonia holds no carbon, so burning it emits no CO2; nitrous oxide formed in combustion is a
greenhouse gas, ammonia that passes unburnt (slip) is not one but is reported separately, and
the pilot fuel that ignites it burns with its own CO2 conversion factor.

References
----------
.. [1] Regulation (EU) 2023/1805 (FuelEU Maritime), Annex II: default tank-to-wake factors of
   the pilot fuel (formerly cited to IMO MEPC.376(80), revoked and replaced by MEPC.391(81)).
"""


def per_kg(grams_per_kg):
    """kg emitted per kg of ammonia burnt, from a figure in g/kg.

    Parameters
    ----------
    grams_per_kg : float or ndarray
        Emission (N2O, slipped ammonia, ...), g per kg NH3 burnt.

    Returns
    -------
    float or ndarray
        Emission, kg per kg NH3 burnt.
    """
    return grams_per_kg / 1000.0


def pilot_fuel_kg_per_kg_ammonia(ammonia_lhv_mj_per_kg, pilot_fuel_lhv_mj_per_kg, pilot_fuel_energy_share):
    """Pilot fuel per kg of ammonia burnt, for a pilot share of the fuel energy.

    Parameters
    ----------
    ammonia_lhv_mj_per_kg : float or ndarray
        Lower heating value of ammonia, MJ/kg.
    pilot_fuel_lhv_mj_per_kg : float or ndarray
        Lower heating value of the pilot fuel, MJ/kg.
    pilot_fuel_energy_share : float or ndarray
        Share of the engine's fuel energy supplied by the pilot fuel (dimensionless, below 1).

    Returns
    -------
    float or ndarray
        Pilot fuel, kg per kg NH3 burnt.

    References
    ----------
    .. [1] Regulation (EU) 2023/1805 (FuelEU Maritime), Annex II: lower calorific value of the pilot fuel.
    """
    return (
        ammonia_lhv_mj_per_kg * pilot_fuel_energy_share / ((1.0 - pilot_fuel_energy_share) * pilot_fuel_lhv_mj_per_kg)
    )
