"""Water electrolysis: electricity, heat and water per kg H2, with the physical floor.

The floor: splitting liquid water needs at least the higher heating value of hydrogen as
energy (electricity plus heat), 141.88 MJ/kg = 39.41 kWh/kg; a solid oxide electrolyser fed
with steam raised outside the stack needs at least the lower heating value, 119.96 MJ/kg =
33.32 kWh/kg. Water is at least 1 mol H2O per mol H2.

References
----------
.. [1] US DOE Hydrogen Program, Hydrogen Analysis Resource Center, Lower and Higher Heating
   Values of Fuels (hydrogen LHV 119.96 MJ/kg, HHV 141.88 MJ/kg).
"""

MJ_PER_KWH = 3.6


def energy_floor_kwh_per_kg_h2(technology: str, hydrogen_lhv_mj_per_kg, hydrogen_hhv_mj_per_kg):
    """Least electricity plus heat per kg H2: HHV for liquid water, LHV for steam [1]_."""
    heating_value = hydrogen_lhv_mj_per_kg if technology == "solid_oxide" else hydrogen_hhv_mj_per_kg
    return heating_value / MJ_PER_KWH


def stoichiometric_water_kg_per_kg_h2(molar_mass_h2o_g_per_mol, molar_mass_h2_g_per_mol):
    return molar_mass_h2o_g_per_mol / molar_mass_h2_g_per_mol


def water_treatment_kwh_per_kg_h2(water_litres_per_kg_h2, water_treatment_kwh_per_m3):
    return water_litres_per_kg_h2 / 1000.0 * water_treatment_kwh_per_m3


def heat_gas_gj_per_kg_h2(heat_kwh_per_kg_h2, heat_boiler_efficiency):
    """Natural gas burnt in a boiler to supply the heat."""
    return heat_kwh_per_kg_h2 * MJ_PER_KWH / 1000.0 / heat_boiler_efficiency
