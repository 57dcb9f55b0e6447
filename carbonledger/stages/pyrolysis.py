"""Methane pyrolysis: CH4 -> C(s) + 2 H2, hydrogen with solid carbon as a co-product.

The carbon balance decides the direct CO2: the carbon of all the gas bought leaves either as
solid carbon or, burnt for heat or as off-gas, as CO2. The co-product share of the burden is a
project choice (the scheme may require its own): none (all on hydrogen, the carbon is stored or
given away), mass or energy allocation, or system expansion (a credit for the product the carbon
displaces).

References
----------
.. [1] ISO 14044:2006, 4.3.4 (allocation: subdivision or system expansion first, then physical
   relationships, then other relationships such as economic value).
.. [2] ISO/TS 19870:2023, Hydrogen technologies - Methodology for determining the greenhouse gas
   emissions associated with the production, conditioning and transport of hydrogen to consumption gate.
"""


def energy_out_mj_per_kg_h2(hydrogen_lhv_mj_per_kg, carbon_kg_per_kg_h2, carbon_lhv_mj_per_kg):
    """Heating value leaving the plant per kg H2 (LHV): the hydrogen and its solid carbon. With no
    imported heat the gas and electricity bought must at least equal it (first law): CH4 -> C + 2 H2
    takes in the reaction enthalpy, about 37 kJ per mol H2, so the products hold more heating value
    than the methane that made them.

    Parameters
    ----------
    hydrogen_lhv_mj_per_kg : float or ndarray
        Lower heating value of hydrogen, MJ/kg.
    carbon_kg_per_kg_h2 : float or ndarray
        Solid carbon made, kg C per kg H2.
    carbon_lhv_mj_per_kg : float or ndarray
        Heat of combustion of solid carbon, MJ/kg (about 32.8).

    Returns
    -------
    float or ndarray
        Heating value of the products, MJ per kg H2.
    """
    return hydrogen_lhv_mj_per_kg + carbon_kg_per_kg_h2 * carbon_lhv_mj_per_kg


def stoichiometric_methane_kg_per_kg_h2(molar_mass_ch4_g_per_mol, molar_mass_h2_g_per_mol):
    """kg CH4 per kg H2: one mole of methane gives two moles of hydrogen.

    Parameters
    ----------
    molar_mass_ch4_g_per_mol : float or ndarray
        Molar mass of methane, g/mol.
    molar_mass_h2_g_per_mol : float or ndarray
        Molar mass of hydrogen (H2), g/mol.

    Returns
    -------
    float or ndarray
        Methane, kg CH4 per kg H2 (about 3.98).

    References
    ----------
    .. [1] Stoichiometry of CH4 -> C + 2 H2 (common practice).
    """
    return molar_mass_ch4_g_per_mol / (2.0 * molar_mass_h2_g_per_mol)


def stoichiometric_carbon_kg_per_kg_h2(molar_mass_c_g_per_mol, molar_mass_h2_g_per_mol):
    """kg of solid carbon per kg H2 when all of the methane is split.

    Parameters
    ----------
    molar_mass_c_g_per_mol : float or ndarray
        Molar mass of carbon, g/mol.
    molar_mass_h2_g_per_mol : float or ndarray
        Molar mass of hydrogen (H2), g/mol.

    Returns
    -------
    float or ndarray
        Solid carbon, kg C per kg H2 (about 2.98).

    References
    ----------
    .. [1] Stoichiometry of CH4 -> C + 2 H2 (common practice).
    """
    return molar_mass_c_g_per_mol / (2.0 * molar_mass_h2_g_per_mol)


def co2_from_carbon_kg(carbon_kg, molar_mass_co2_g_per_mol, molar_mass_c_g_per_mol):
    """CO2 formed when ``carbon_kg`` of carbon is burnt.

    Parameters
    ----------
    carbon_kg : float or ndarray
        Carbon burnt, kg (per functional unit).
    molar_mass_co2_g_per_mol : float or ndarray
        Molar mass of carbon dioxide, g/mol.
    molar_mass_c_g_per_mol : float or ndarray
        Molar mass of carbon, g/mol.

    Returns
    -------
    float or ndarray
        CO2, kg (same basis as ``carbon_kg``; 44.01 / 12.011 = 3.664 kg per kg C).

    References
    ----------
    .. [1] Stoichiometry of C + O2 -> CO2 (common practice).
    """
    return carbon_kg * molar_mass_co2_g_per_mol / molar_mass_c_g_per_mol


def direct_co2_kg_per_kg_h2(
    gas_co2_kg_per_kg_h2, carbon_kg_per_kg_h2, molar_mass_co2_g_per_mol, molar_mass_c_g_per_mol
):
    """CO2 released per kg H2: the CO2 the gas would give if burnt, less the carbon kept solid.

    Parameters
    ----------
    gas_co2_kg_per_kg_h2 : float or ndarray
        CO2 of burning all the gas bought (feed and fuel), kg CO2 per kg H2.
    carbon_kg_per_kg_h2 : float or ndarray
        Solid carbon made, kg C per kg H2.
    molar_mass_co2_g_per_mol : float or ndarray
        Molar mass of carbon dioxide, g/mol.
    molar_mass_c_g_per_mol : float or ndarray
        Molar mass of carbon, g/mol.

    Returns
    -------
    float or ndarray
        CO2 released, kg CO2 per kg H2.
    """
    return gas_co2_kg_per_kg_h2 - co2_from_carbon_kg(
        carbon_kg_per_kg_h2, molar_mass_co2_g_per_mol, molar_mass_c_g_per_mol
    )


def hydrogen_share_by_mass(carbon_kg_per_kg_h2):
    """Share of the burden on hydrogen when it is split by mass of the products [1]_.

    Parameters
    ----------
    carbon_kg_per_kg_h2 : float or ndarray
        Solid carbon made, kg C per kg H2.

    Returns
    -------
    float or ndarray
        Hydrogen's share of the burden (dimensionless, between 0 and 1).

    References
    ----------
    .. [1] ISO 14044:2006, 4.3.4 (allocation by physical relationships).
    """
    return 1.0 / (1.0 + carbon_kg_per_kg_h2)


def hydrogen_share_by_energy(carbon_kg_per_kg_h2, hydrogen_lhv_mj_per_kg, carbon_lhv_mj_per_kg):
    """Share of the burden on hydrogen when it is split by the products' lower heating values [1]_.

    Parameters
    ----------
    carbon_kg_per_kg_h2 : float or ndarray
        Solid carbon made, kg C per kg H2.
    hydrogen_lhv_mj_per_kg : float or ndarray
        Lower heating value of hydrogen, MJ/kg.
    carbon_lhv_mj_per_kg : float or ndarray
        Heat of combustion of solid carbon, MJ/kg.

    Returns
    -------
    float or ndarray
        Hydrogen's share of the burden (dimensionless, between 0 and 1).

    References
    ----------
    .. [1] ISO 14044:2006, 4.3.4 (allocation by physical relationships).
    """
    return hydrogen_lhv_mj_per_kg / (hydrogen_lhv_mj_per_kg + carbon_kg_per_kg_h2 * carbon_lhv_mj_per_kg)


def carbon_lhv_mj_per_kg(formation_enthalpy_co2_kj_per_mol, molar_mass_c_g_per_mol):
    """Heat of combustion of solid carbon (graphite, C + O2 -> CO2), MJ/kg: -dHf(CO2) / M(C).

    Parameters
    ----------
    formation_enthalpy_co2_kj_per_mol : float or ndarray
        Standard enthalpy of formation of CO2 gas, kJ/mol (negative, about -393.5 kJ/mol).
    molar_mass_c_g_per_mol : float or ndarray
        Molar mass of carbon, g/mol.

    Returns
    -------
    float or ndarray
        Heat of combustion, MJ per kg C (kJ/mol / g/mol = MJ/kg; about 32.8).
    """
    return -formation_enthalpy_co2_kj_per_mol / molar_mass_c_g_per_mol
