"""Ammonia: air separation, the Haber-Bosch synthesis loop and refrigerated storage.

3 H2 + N2 -> 2 NH3, so per tonne of ammonia 3 M(H2) / (2 M(NH3)) t of hydrogen and
M(N2) / (2 M(NH3)) t of nitrogen, with molar masses from a reference library.

References
----------
.. [1] Stoichiometry of ammonia synthesis; molar masses from the ``chemicals`` library.
"""


def stoichiometric_hydrogen_kg_per_t_nh3(molar_mass_h2_g_per_mol, molar_mass_nh3_g_per_mol):
    return 1000.0 * 3.0 * molar_mass_h2_g_per_mol / (2.0 * molar_mass_nh3_g_per_mol)


def stoichiometric_nitrogen_kg_per_t_nh3(molar_mass_n2_g_per_mol, molar_mass_nh3_g_per_mol):
    return 1000.0 * molar_mass_n2_g_per_mol / (2.0 * molar_mass_nh3_g_per_mol)


def with_loss_allowance(stoichiometric_amount, loss_allowance):
    """Feed above stoichiometry: purge gas and losses."""
    return stoichiometric_amount * (1.0 + loss_allowance)


def air_separation_kwh_per_kg_n2(air_separation_kwh_per_t_n2):
    return air_separation_kwh_per_t_n2 / 1000.0


def ammonia_produced_per_t_delivered(storage_loss_fraction):
    """Tonnes of ammonia made per tonne leaving storage."""
    return 1.0 / (1.0 - storage_loss_fraction)


def hydrogen_mass_fraction_of_ammonia(molar_mass_h2_g_per_mol, molar_mass_nh3_g_per_mol):
    """kg of hydrogen contained per kg NH3 (3 H atoms per molecule)."""
    return 1.5 * molar_mass_h2_g_per_mol / molar_mass_nh3_g_per_mol
