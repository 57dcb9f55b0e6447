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
    """CO2 formed from the carbon of feed and fuel gas, per kg H2."""
    return natural_gas_gj_per_kg_h2 * combustion_co2_kg_per_gj


def process_co2_kg_per_kg_h2(direct_co2, process_co2_share):
    return direct_co2 * process_co2_share


def flue_co2_kg_per_kg_h2(direct_co2, process_co2_share):
    return direct_co2 * (1.0 - process_co2_share)


def fuel_gas_gj_per_kg_h2(natural_gas_gj_per_kg_h2, process_co2_share):
    """Gas burnt as fuel (the flue share); the rest is feed converted in the reformer."""
    return natural_gas_gj_per_kg_h2 * (1.0 - process_co2_share)


def stoichiometric_gas_floor_gj_per_kg_h2(molar_mass_ch4_g_per_mol, molar_mass_h2_g_per_mol, methane_lhv_mj_per_kg):
    """Least natural gas (as methane, LHV) that can yield 1 kg H2: 1 mol CH4 per 4 mol H2 [2]_."""
    return molar_mass_ch4_g_per_mol / (4.0 * molar_mass_h2_g_per_mol) * methane_lhv_mj_per_kg / 1000.0


def energy_in_mj_per_kg_h2(natural_gas_gj_per_kg_h2, electricity_kwh_per_kg_h2):
    """Energy bought per kg H2 (gas LHV plus electricity), MJ: with no imported heat it must at least
    equal the hydrogen's own lower heating value (first law)."""
    return natural_gas_gj_per_kg_h2 * 1000.0 + electricity_kwh_per_kg_h2 * 3.6
