"""Natural gas supply: upstream methane loss and upstream CO2, per GJ (LHV) delivered.

References
----------
.. [1] IPCC (2006). 2006 IPCC Guidelines for National Greenhouse Gas Inventories, Vol. 2
   Energy, Ch. 1, Table 1.2 (net calorific values) and Ch. 2, Table 2.2 (stationary combustion).
"""


def gas_mass_kg_per_gj(net_calorific_value_tj_per_gg):
    """Mass of natural gas in one GJ (LHV). TJ/Gg equals MJ/kg, so kg/GJ = 1000 / NCV."""
    return 1000.0 / net_calorific_value_tj_per_gg


def methane_leak_kg_ch4_per_gj(methane_loss_rate, net_calorific_value_tj_per_gg, methane_mass_fraction):
    """Methane lost upstream per GJ of gas delivered.

    Parameters
    ----------
    methane_loss_rate : fraction of the gas delivered (by mass) that is lost upstream.
        Some studies quote the loss as a fraction of gas produced; convert with
        rate_delivered = rate_produced / (1 - rate_produced).
    net_calorific_value_tj_per_gg : net calorific value of the gas, TJ/Gg (= MJ/kg) [1]_.
    methane_mass_fraction : kg CH4 per kg of gas.
    """
    return methane_loss_rate * gas_mass_kg_per_gj(net_calorific_value_tj_per_gg) * methane_mass_fraction


def combustion_kg_per_gj(emission_factor_kg_per_tj):
    """Emission of one gas per GJ of natural gas burnt, from a factor in kg/TJ [1]_."""
    return emission_factor_kg_per_tj / 1000.0
