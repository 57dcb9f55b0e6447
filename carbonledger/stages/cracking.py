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
    """Stoichiometric ammonia per kg of hydrogen: 2 mol NH3 per 3 mol H2."""
    return 2.0 * molar_mass_nh3_g_per_mol / (3.0 * molar_mass_h2_g_per_mol)


def reaction_enthalpy_mj_per_kg_h2(formation_enthalpy_nh3_kj_per_mol, molar_mass_h2_g_per_mol):
    """Enthalpy of 2 NH3 -> N2 + 3 H2 per kg H2 (positive: the reaction absorbs heat) [1]_."""
    return -2.0 * formation_enthalpy_nh3_kj_per_mol / (3.0 * molar_mass_h2_g_per_mol)


def heat_mj_per_kg_h2_cracked(reaction_enthalpy, ammonia_kg_per_kg_h2, latent_heat_kj_per_kg, heat_to_reactor_efficiency):
    """Fuel heat per kg H2 cracked: reaction plus vaporisation of the liquid feed [2]_, over efficiency."""
    return (reaction_enthalpy + ammonia_kg_per_kg_h2 * latent_heat_kj_per_kg / 1000.0) / heat_to_reactor_efficiency


def hydrogen_burnt_share(heat_mj_per_kg_h2, hydrogen_lhv_mj_per_kg, heat_source: str):
    """kg H2 burnt per kg H2 cracked (zero unless the heat comes from hydrogen)."""
    share = heat_mj_per_kg_h2 / hydrogen_lhv_mj_per_kg
    return share if heat_source == "hydrogen" else 0.0 * share


def hydrogen_cracked_kg_per_kg_delivered(hydrogen_recovery_fraction, burnt_share):
    """kg H2 cracked per kg delivered: recovered hydrogen less the hydrogen burnt for heat."""
    return 1.0 / (hydrogen_recovery_fraction - burnt_share)


def fuel_heat_mj_per_kg_delivered(heat_mj_per_kg_h2, hydrogen_cracked, heat_source: str, burnt_source: str):
    """Heat to be bought as ``burnt_source`` fuel (ammonia or natural gas) per kg H2 delivered."""
    heat = heat_mj_per_kg_h2 * hydrogen_cracked
    return heat if heat_source == burnt_source else 0.0 * heat
