"""Cracking ammonia back to hydrogen at the destination: 2 NH3 -> N2 + 3 H2, endothermic.

Heat per kg of hydrogen cracked = reaction enthalpy plus the latent heat of vaporising the
liquid ammonia feed, divided by the heat-to-reactor efficiency. The heat comes from burning
part of the ammonia, part of the hydrogen produced, or natural gas. When hydrogen is burnt, the
cracker must crack more: per kg delivered it cracks 1 / (recovery - heat / LHV(H2)) kg.

References
----------
.. [1] Reaction enthalpy from the standard enthalpy of formation of NH3(g) in the ``chemicals``
   library (Active Thermochemical Tables, -45.56 kJ/mol; CRC Handbook -45.9 kJ/mol):
   dH = -2 dfH(NH3) per 3 mol H2, since N2 and H2 are elements in their standard state.
.. [2] Latent heat of vaporisation of ammonia at 1 atm: CRC Handbook through the ``chemicals``
   library (see ``model.reference.ammonia_latent_heat``).
"""


def ammonia_kg_per_kg_h2_cracked(molar_mass_nh3_g_per_mol, molar_mass_h2_g_per_mol):
    """Stoichiometric ammonia per kg of hydrogen: 2 mol NH3 per 3 mol H2.

    Parameters
    ----------
    molar_mass_nh3_g_per_mol : float or ndarray
        Molar mass of ammonia (NH3), g/mol.
    molar_mass_h2_g_per_mol : float or ndarray
        Molar mass of hydrogen (H2), g/mol.

    Returns
    -------
    float or ndarray
        Ammonia, kg NH3 per kg H2 cracked (about 5.63).

    References
    ----------
    .. [1] Stoichiometry of 2 NH3 -> N2 + 3 H2 (common practice).
    """
    return 2.0 * molar_mass_nh3_g_per_mol / (3.0 * molar_mass_h2_g_per_mol)


def reaction_enthalpy_mj_per_kg_h2(formation_enthalpy_nh3_kj_per_mol, molar_mass_h2_g_per_mol):
    """Enthalpy of 2 NH3 -> N2 + 3 H2 per kg H2 (positive: the reaction absorbs heat) [1]_.

    Parameters
    ----------
    formation_enthalpy_nh3_kj_per_mol : float or ndarray
        Standard enthalpy of formation of gaseous ammonia, kJ/mol (negative, about -45.9 kJ/mol).
    molar_mass_h2_g_per_mol : float or ndarray
        Molar mass of hydrogen (H2), g/mol.

    Returns
    -------
    float or ndarray
        Reaction enthalpy, MJ per kg H2 (kJ/mol / g/mol = MJ/kg; about 15.2 MJ/kg).

    References
    ----------
    .. [1] Standard enthalpy of formation of NH3(g): Active Thermochemical Tables through the ``chemicals``
       library, -45.56 kJ/mol; CRC Handbook -45.9 kJ/mol.
    """
    return -2.0 * formation_enthalpy_nh3_kj_per_mol / (3.0 * molar_mass_h2_g_per_mol)


def heat_mj_per_kg_h2_cracked(
    reaction_enthalpy, ammonia_kg_per_kg_h2, latent_heat_kj_per_kg, heat_to_reactor_efficiency
):
    """Fuel heat per kg H2 cracked: reaction plus vaporisation of the liquid feed [2]_, over efficiency.

    Parameters
    ----------
    reaction_enthalpy : float or ndarray
        Enthalpy of the cracking reaction, MJ per kg H2.
    ammonia_kg_per_kg_h2 : float or ndarray
        Ammonia fed, kg NH3 per kg H2 cracked.
    latent_heat_kj_per_kg : float or ndarray
        Latent heat of vaporisation of ammonia at 1 atm, kJ/kg.
    heat_to_reactor_efficiency : float or ndarray
        Share of the fuel heat that reaches the reactor (dimensionless).

    Returns
    -------
    float or ndarray
        Fuel heat, MJ per kg H2 cracked.

    References
    ----------
    .. [2] Latent heat of vaporisation of ammonia at 1 atm: CRC Handbook through the ``chemicals`` library.
    """
    return (reaction_enthalpy + ammonia_kg_per_kg_h2 * latent_heat_kj_per_kg / 1000.0) / heat_to_reactor_efficiency


def hydrogen_burnt_share(heat_mj_per_kg_h2, hydrogen_lhv_mj_per_kg, heat_source: str):
    """kg H2 burnt per kg H2 cracked (zero unless the heat comes from hydrogen).

    Parameters
    ----------
    heat_mj_per_kg_h2 : float or ndarray
        Fuel heat, MJ per kg H2 cracked.
    hydrogen_lhv_mj_per_kg : float or ndarray
        Lower heating value of hydrogen, MJ/kg.
    heat_source : str
        Fuel burnt for the heat: ``ammonia``, ``hydrogen`` or ``natural_gas``.

    Returns
    -------
    float or ndarray
        Hydrogen burnt, kg per kg H2 cracked.
    """
    share = heat_mj_per_kg_h2 / hydrogen_lhv_mj_per_kg
    return share if heat_source == "hydrogen" else 0.0 * share


def hydrogen_cracked_kg_per_kg_delivered(hydrogen_recovery_fraction, burnt_share):
    """kg H2 cracked per kg delivered: recovered hydrogen less the hydrogen burnt for heat.

    Parameters
    ----------
    hydrogen_recovery_fraction : float or ndarray
        Share of the hydrogen cracked that the purification recovers (dimensionless).
    burnt_share : float or ndarray
        Hydrogen burnt for heat, kg per kg H2 cracked.

    Returns
    -------
    float or ndarray
        Hydrogen cracked, kg per kg H2 delivered.
    """
    return 1.0 / (hydrogen_recovery_fraction - burnt_share)


def fuel_heat_mj_per_kg_delivered(heat_mj_per_kg_h2, hydrogen_cracked, heat_source: str, burnt_source: str):
    """Heat to be bought as ``burnt_source`` fuel (ammonia or natural gas) per kg H2 delivered.

    Parameters
    ----------
    heat_mj_per_kg_h2 : float or ndarray
        Fuel heat, MJ per kg H2 cracked.
    hydrogen_cracked : float or ndarray
        Hydrogen cracked, kg per kg H2 delivered.
    heat_source : str
        Fuel the project burns for the heat: ``ammonia``, ``hydrogen`` or ``natural_gas``.
    burnt_source : str
        Fuel asked about; the heat is charged to it only when it is the heat source.

    Returns
    -------
    float or ndarray
        Heat from ``burnt_source``, MJ per kg H2 delivered (zero for another fuel).
    """
    heat = heat_mj_per_kg_h2 * hydrogen_cracked
    return heat if heat_source == burnt_source else 0.0 * heat
