"""Reforming of biomethane: the reformer of natural gas, fed with methane of biological origin.

The carbon of biomethane was taken from the air by the biomass it came from, so the CO2 it forms is
biogenic: counted apart (characterised at zero, reported separately), not in the fossil CO2 of the
result. What does count is the upstream supply of the biomethane (digestion, upgrading, methane slip,
grid injection: a life-cycle factor per MJ), the non-fossil methane and the nitrous oxide of burning
the fuel part, and the electricity. Captured biogenic CO2 is stated apart and never netted against
the total unless a scheme's rulebook says so.

References
----------
.. [1] ISO/TS 19870:2023, Hydrogen technologies - Methodology for determining the greenhouse gas
   emissions associated with the production, conditioning and transport of hydrogen to consumption
   gate (biogenic carbon reported separately; from memory).
.. [2] Directive (EU) 2018/2001, Annex VI, Part B (default greenhouse gas emissions of biomethane;
   the CO2 of burning biomass fuels counted as zero, e_u of CO2 = 0; from memory).
"""


def biogenic_co2_kg_per_gj(molar_mass_co2_g_per_mol, molar_mass_ch4_g_per_mol, methane_lhv_mj_per_kg):
    """kg CO2 formed per GJ (LHV) of methane burnt or reformed: one mole of CO2 per mole of CH4."""
    return molar_mass_co2_g_per_mol / molar_mass_ch4_g_per_mol / methane_lhv_mj_per_kg * 1000.0


def upstream_kg_co2e_per_kg_h2(biomethane_gj_per_kg_h2, upstream_g_co2e_per_mj):
    """kg CO2e per kg H2 of supplying the biomethane: GJ x 1000 MJ/GJ x g/MJ / 1000 g/kg."""
    return biomethane_gj_per_kg_h2 * upstream_g_co2e_per_mj


def stored_kg(captured_kg, transport_storage_loss_fraction):
    """Captured CO2 that reaches permanent storage."""
    return captured_kg * (1.0 - transport_storage_loss_fraction)


def lost_kg(captured_kg, transport_storage_loss_fraction):
    """Captured CO2 lost to the air in transport and storage."""
    return captured_kg * transport_storage_loss_fraction
