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
    than the methane that made them."""
    return hydrogen_lhv_mj_per_kg + carbon_kg_per_kg_h2 * carbon_lhv_mj_per_kg


def stoichiometric_methane_kg_per_kg_h2(molar_mass_ch4_g_per_mol, molar_mass_h2_g_per_mol):
    """kg CH4 per kg H2: one mole of methane gives two moles of hydrogen."""
    return molar_mass_ch4_g_per_mol / (2.0 * molar_mass_h2_g_per_mol)


def stoichiometric_carbon_kg_per_kg_h2(molar_mass_c_g_per_mol, molar_mass_h2_g_per_mol):
    """kg of solid carbon per kg H2 when all of the methane is split."""
    return molar_mass_c_g_per_mol / (2.0 * molar_mass_h2_g_per_mol)


def co2_from_carbon_kg(carbon_kg, molar_mass_co2_g_per_mol, molar_mass_c_g_per_mol):
    """CO2 formed when ``carbon_kg`` of carbon is burnt."""
    return carbon_kg * molar_mass_co2_g_per_mol / molar_mass_c_g_per_mol


def direct_co2_kg_per_kg_h2(gas_co2_kg_per_kg_h2, carbon_kg_per_kg_h2, molar_mass_co2_g_per_mol, molar_mass_c_g_per_mol):
    """CO2 released per kg H2: the CO2 the gas would give if burnt, less the carbon kept solid."""
    return gas_co2_kg_per_kg_h2 - co2_from_carbon_kg(carbon_kg_per_kg_h2, molar_mass_co2_g_per_mol, molar_mass_c_g_per_mol)


def hydrogen_share_by_mass(carbon_kg_per_kg_h2):
    """Share of the burden on hydrogen when it is split by mass of the products [1]_."""
    return 1.0 / (1.0 + carbon_kg_per_kg_h2)


def hydrogen_share_by_energy(carbon_kg_per_kg_h2, hydrogen_lhv_mj_per_kg, carbon_lhv_mj_per_kg):
    """Share of the burden on hydrogen when it is split by the products' lower heating values [1]_."""
    return hydrogen_lhv_mj_per_kg / (hydrogen_lhv_mj_per_kg + carbon_kg_per_kg_h2 * carbon_lhv_mj_per_kg)


def carbon_lhv_mj_per_kg(formation_enthalpy_co2_kj_per_mol, molar_mass_c_g_per_mol):
    """Heat of combustion of solid carbon (graphite, C + O2 -> CO2), MJ/kg: -dHf(CO2) / M(C)."""
    return -formation_enthalpy_co2_kj_per_mol / molar_mass_c_g_per_mol
