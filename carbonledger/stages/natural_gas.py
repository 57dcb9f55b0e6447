"""Natural gas supply: upstream methane loss and upstream CO2, per GJ (LHV) delivered.

References
----------
.. [1] IPCC (2006). 2006 IPCC Guidelines for National Greenhouse Gas Inventories, Vol. 2
   Energy, Ch. 1, Table 1.2 (net calorific values) and Ch. 2, Table 2.2 (stationary combustion).
.. [2] Alvarez, R. A. et al. (2018). Assessment of methane emissions from the U.S. oil and gas
   supply chain. Science 361, 186-188 (2.3 % of gross US gas production).
"""


def gas_mass_kg_per_gj(net_calorific_value_tj_per_gg):
    """Mass of natural gas in one GJ (LHV). TJ/Gg equals MJ/kg, so kg/GJ = 1000 / NCV.

    Parameters
    ----------
    net_calorific_value_tj_per_gg : float or ndarray
        Net calorific value (LHV) of the gas, TJ/Gg (= MJ/kg; 48.0 for natural gas) [1]_.

    Returns
    -------
    float or ndarray
        Gas, kg per GJ (LHV).

    References
    ----------
    .. [1] IPCC (2006). 2006 IPCC Guidelines, Vol. 2, Ch. 1, Table 1.2 (net calorific values).
    """
    return 1000.0 / net_calorific_value_tj_per_gg


METHANE_EMISSION_BASES = ("methane_delivered", "methane_produced", "gas_delivered_by_mass")


def methane_emitted_kg_ch4_per_gj(
    methane_emission_share, methane_emission_basis, net_calorific_value_tj_per_gg, methane_mass_fraction
):
    """Methane emitted upstream per GJ (LHV) of gas delivered, from a share on a named basis.

    Parameters
    ----------
    methane_emission_share : float or ndarray
        The share emitted, on the basis below (dimensionless, below 1).
    methane_emission_basis : str
        What the share is of:
        ``methane_delivered``: kg CH4 emitted per kg CH4 delivered (by mass or by volume of
        methane, the same); times the methane in the gas, m_gas x w_CH4.
        ``methane_produced``: per kg CH4 produced (the published "methane intensity" of
        production, e.g. 2.3 % of gross production, Alvarez et al. 2018); converted to the
        delivered basis with s / (1 - s).
        ``gas_delivered_by_mass``: kg CH4 emitted per kg of gas delivered; no composition needed.
    net_calorific_value_tj_per_gg : float or ndarray
        Net calorific value of the gas, TJ/Gg (= MJ/kg) [1]_.
    methane_mass_fraction : float or ndarray
        Methane in the gas, kg CH4 per kg of gas (the gas composition).

    Returns
    -------
    float or ndarray
        Methane emitted, kg CH4 per GJ (LHV) of gas delivered.

    References
    ----------
    .. [1] IPCC (2006). 2006 IPCC Guidelines, Vol. 2, Ch. 1, Table 1.2 (net calorific values).
    .. [2] Alvarez, R. A. et al. (2018). Science 361, 186-188 (2.3 % of gross US gas production).
    """
    gas_kg = gas_mass_kg_per_gj(net_calorific_value_tj_per_gg)
    if methane_emission_basis == "gas_delivered_by_mass":
        return methane_emission_share * gas_kg
    per_methane_delivered = (
        methane_emission_share / (1.0 - methane_emission_share)
        if methane_emission_basis == "methane_produced"
        else methane_emission_share
    )
    return per_methane_delivered * gas_kg * methane_mass_fraction


def combustion_kg_per_gj(emission_factor_kg_per_tj):
    """Emission of one gas per GJ of natural gas burnt, from a factor in kg/TJ [1]_.

    Parameters
    ----------
    emission_factor_kg_per_tj : float or ndarray
        Emission factor of CO2, CH4 or N2O for stationary combustion, kg per TJ (LHV; CO2 56 100 kg/TJ).

    Returns
    -------
    float or ndarray
        Emission, kg per GJ (LHV) of gas burnt.

    References
    ----------
    .. [1] IPCC (2006). 2006 IPCC Guidelines, Vol. 2, Ch. 2, Table 2.2 (stationary combustion).
    """
    return emission_factor_kg_per_tj / 1000.0
