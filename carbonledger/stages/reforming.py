"""Steam methane reforming and autothermal reforming: direct emissions per kg H2.

All carbon of the natural gas (feed and fuel) leaves the plant as CO2. The concentrated
process CO2 (shift and syngas clean-up) is the share ``process_co2_share``; the rest is dilute
flue CO2 from the fired reformer and boilers. Only the fuel part is burnt, so combustion CH4 and
N2O are applied to the flue share of the gas.

References
----------
.. [1] IPCC (2006). 2006 IPCC Guidelines, Vol. 2, Ch. 2, Table 2.2.
.. [2] Stoichiometry CH4 + 2 H2O -> CO2 + 4 H2: at most 4 mol H2 per mol CH4.
"""


def direct_co2_kg_per_kg_h2(natural_gas_gj_per_kg_h2, combustion_co2_kg_per_gj):
    """CO2 formed from the carbon of feed and fuel gas, per kg H2.

    Parameters
    ----------
    natural_gas_gj_per_kg_h2 : float or ndarray
        Natural gas used (feed and fuel), GJ (LHV) per kg H2.
    combustion_co2_kg_per_gj : float or ndarray
        CO2 of burning natural gas, kg CO2 per GJ (LHV) (56.1 kg/GJ) [1]_.

    Returns
    -------
    float or ndarray
        CO2 formed, kg CO2 per kg H2.

    References
    ----------
    .. [1] IPCC (2006). 2006 IPCC Guidelines, Vol. 2, Ch. 2, Table 2.2.
    """
    return natural_gas_gj_per_kg_h2 * combustion_co2_kg_per_gj


def process_co2_kg_per_kg_h2(direct_co2, process_co2_share):
    """Concentrated process CO2 (shift, syngas clean-up) per kg H2.

    Parameters
    ----------
    direct_co2 : float or ndarray
        CO2 formed, kg CO2 per kg H2.
    process_co2_share : float or ndarray
        Share of the CO2 formed that leaves in the process stream (dimensionless).

    Returns
    -------
    float or ndarray
        Process CO2, kg CO2 per kg H2.
    """
    return direct_co2 * process_co2_share


def flue_co2_kg_per_kg_h2(direct_co2, process_co2_share):
    """Dilute flue CO2 (fired reformer, boilers) per kg H2.

    Parameters
    ----------
    direct_co2 : float or ndarray
        CO2 formed, kg CO2 per kg H2.
    process_co2_share : float or ndarray
        Share of the CO2 formed that leaves in the process stream (dimensionless).

    Returns
    -------
    float or ndarray
        Flue CO2, kg CO2 per kg H2.
    """
    return direct_co2 * (1.0 - process_co2_share)


def fuel_gas_gj_per_kg_h2(natural_gas_gj_per_kg_h2, process_co2_share):
    """Gas burnt as fuel (the flue share); the rest is feed converted in the reformer.

    Parameters
    ----------
    natural_gas_gj_per_kg_h2 : float or ndarray
        Natural gas used (feed and fuel), GJ (LHV) per kg H2.
    process_co2_share : float or ndarray
        Share of the CO2 formed that leaves in the process stream (dimensionless).

    Returns
    -------
    float or ndarray
        Fuel gas, GJ (LHV) per kg H2.
    """
    return natural_gas_gj_per_kg_h2 * (1.0 - process_co2_share)


def stoichiometric_gas_floor_gj_per_kg_h2(molar_mass_ch4_g_per_mol, molar_mass_h2_g_per_mol, methane_lhv_mj_per_kg):
    """Least natural gas (as methane, LHV) that can yield 1 kg H2: 1 mol CH4 per 4 mol H2 [2]_.

    Parameters
    ----------
    molar_mass_ch4_g_per_mol : float or ndarray
        Molar mass of methane, g/mol.
    molar_mass_h2_g_per_mol : float or ndarray
        Molar mass of hydrogen (H2), g/mol.
    methane_lhv_mj_per_kg : float or ndarray
        Lower heating value of methane, MJ/kg.

    Returns
    -------
    float or ndarray
        Methane, GJ (LHV) per kg H2 (about 0.0995).

    References
    ----------
    .. [2] Stoichiometry CH4 + 2 H2O -> CO2 + 4 H2: at most 4 mol H2 per mol CH4.
    """
    return molar_mass_ch4_g_per_mol / (4.0 * molar_mass_h2_g_per_mol) * methane_lhv_mj_per_kg / 1000.0


def energy_in_mj_per_kg_h2(natural_gas_gj_per_kg_h2, electricity_kwh_per_kg_h2):
    """Energy bought per kg H2 (gas LHV plus electricity), MJ: with no imported heat it must at least
    equal the hydrogen's own lower heating value (first law).

    Parameters
    ----------
    natural_gas_gj_per_kg_h2 : float or ndarray
        Natural gas used (feed and fuel), GJ (LHV) per kg H2.
    electricity_kwh_per_kg_h2 : float or ndarray
        Electricity used, kWh per kg H2.

    Returns
    -------
    float or ndarray
        Energy bought, MJ per kg H2 (1 kWh = 3.6 MJ).
    """
    return natural_gas_gj_per_kg_h2 * 1000.0 + electricity_kwh_per_kg_h2 * 3.6
