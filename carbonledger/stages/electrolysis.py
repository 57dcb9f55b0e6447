"""Water electrolysis: electricity, heat and water per kg H2, with the physical floor.

The floor: splitting liquid water needs at least the higher heating value of hydrogen as
energy (electricity plus heat), 141.88 MJ/kg = 39.41 kWh/kg; a solid oxide electrolyser fed
with steam raised outside the stack needs at least the lower heating value, 119.96 MJ/kg =
33.32 kWh/kg. Heat can supply at most the T dS share: the electricity alone is at least the
Gibbs energy of water splitting, about 237.1 kJ/mol (32.7 kWh/kg H2) for liquid water at 25 °C
and less for steam at a solid oxide stack's temperature (about 192.6 kJ/mol at 1000 K).
Water is at least 1 mol H2O per mol H2.

References
----------
.. [1] US DOE Hydrogen Program, Hydrogen Analysis Resource Center, Lower and Higher Heating
   Values of Fuels (hydrogen LHV 119.96 MJ/kg, HHV 141.88 MJ/kg).
.. [2] Chase, M. W. (1998). NIST-JANAF Thermochemical Tables, 4th ed.: water, Gibbs energy of
   formation -237.14 kJ/mol (liquid, 298.15 K), -192.59 kJ/mol (gas, 1000 K).
"""

MJ_PER_KWH = 3.6


def energy_floor_kwh_per_kg_h2(technology: str, hydrogen_lhv_mj_per_kg, hydrogen_hhv_mj_per_kg):
    """Least electricity plus heat per kg H2: HHV for liquid water, LHV for steam [1]_.

    Parameters
    ----------
    technology : str
        Electrolyser technology: ``alkaline``, ``pem`` (liquid water) or ``solid_oxide`` (steam).
    hydrogen_lhv_mj_per_kg : float or ndarray
        Lower heating value of hydrogen, MJ/kg (119.96).
    hydrogen_hhv_mj_per_kg : float or ndarray
        Higher heating value of hydrogen, MJ/kg (141.88).

    Returns
    -------
    float or ndarray
        Energy floor, kWh per kg H2 (39.41 for liquid water, 33.32 for steam).

    References
    ----------
    .. [1] US DOE Hydrogen Program, Hydrogen Analysis Resource Center, Lower and Higher Heating Values of Fuels.
    """
    heating_value = hydrogen_lhv_mj_per_kg if technology == "solid_oxide" else hydrogen_hhv_mj_per_kg
    return heating_value / MJ_PER_KWH


def gibbs_floor_kwh_per_kg_h2(gibbs_j_per_mol_h2, molar_mass_h2_g_per_mol):
    """Least electricity per kg H2: the Gibbs energy of water splitting [2]_ (J/mol / g/mol = kJ/kg).

    Parameters
    ----------
    gibbs_j_per_mol_h2 : float or ndarray
        Gibbs energy of splitting water, J per mol H2 (237 140 J/mol for liquid water at 298.15 K).
    molar_mass_h2_g_per_mol : float or ndarray
        Molar mass of hydrogen (H2), g/mol.

    Returns
    -------
    float or ndarray
        Electricity floor, kWh per kg H2 (about 32.7 for liquid water at 25 °C).

    References
    ----------
    .. [2] Chase, M. W. (1998). NIST-JANAF Thermochemical Tables, 4th ed.: water, Gibbs energy of formation.
    """
    return gibbs_j_per_mol_h2 / molar_mass_h2_g_per_mol / 3600.0


def stoichiometric_water_kg_per_kg_h2(molar_mass_h2o_g_per_mol, molar_mass_h2_g_per_mol):
    """Least water per kg H2: one mole of H2O per mole of H2.

    Parameters
    ----------
    molar_mass_h2o_g_per_mol : float or ndarray
        Molar mass of water, g/mol.
    molar_mass_h2_g_per_mol : float or ndarray
        Molar mass of hydrogen (H2), g/mol.

    Returns
    -------
    float or ndarray
        Water, kg H2O per kg H2 (about 8.94).

    References
    ----------
    .. [1] Stoichiometry of 2 H2O -> 2 H2 + O2 (common practice).
    """
    return molar_mass_h2o_g_per_mol / molar_mass_h2_g_per_mol


def water_treatment_kwh_per_kg_h2(water_litres_per_kg_h2, water_treatment_kwh_per_m3):
    """Electricity to treat (purify) the feed water, per kg H2.

    Parameters
    ----------
    water_litres_per_kg_h2 : float or ndarray
        Water taken in, litres per kg H2.
    water_treatment_kwh_per_m3 : float or ndarray
        Electricity of water treatment, kWh per m3 of water.

    Returns
    -------
    float or ndarray
        Electricity, kWh per kg H2.
    """
    return water_litres_per_kg_h2 / 1000.0 * water_treatment_kwh_per_m3


def heat_gas_gj_per_kg_h2(heat_kwh_per_kg_h2, heat_boiler_efficiency):
    """Natural gas burnt in a boiler to supply the heat.

    Parameters
    ----------
    heat_kwh_per_kg_h2 : float or ndarray
        Heat the electrolyser takes in, kWh per kg H2.
    heat_boiler_efficiency : float or ndarray
        Share of the gas's heating value (LHV) that becomes useful heat (dimensionless).

    Returns
    -------
    float or ndarray
        Natural gas, GJ (LHV) per kg H2.
    """
    return heat_kwh_per_kg_h2 * MJ_PER_KWH / 1000.0 / heat_boiler_efficiency
