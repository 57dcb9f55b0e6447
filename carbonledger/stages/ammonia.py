"""Ammonia: air separation, the Haber-Bosch synthesis loop and refrigerated storage.

3 H2 + N2 -> 2 NH3, so per tonne of ammonia 3 M(H2) / (2 M(NH3)) t of hydrogen and
M(N2) / (2 M(NH3)) t of nitrogen, with molar masses from a reference library.

References
----------
.. [1] Stoichiometry of ammonia synthesis; molar masses from the ``chemicals`` library.
"""


def stoichiometric_hydrogen_kg_per_t_nh3(molar_mass_h2_g_per_mol, molar_mass_nh3_g_per_mol):
    """Hydrogen bound in one tonne of ammonia: 3 mol H2 per 2 mol NH3 [1]_.

    Parameters
    ----------
    molar_mass_h2_g_per_mol : float or ndarray
        Molar mass of hydrogen (H2), g/mol.
    molar_mass_nh3_g_per_mol : float or ndarray
        Molar mass of ammonia (NH3), g/mol.

    Returns
    -------
    float or ndarray
        Hydrogen, kg per t NH3 (about 177.6 kg/t).

    References
    ----------
    .. [1] Stoichiometry of 3 H2 + N2 -> 2 NH3 (common practice).
    """
    return 1000.0 * 3.0 * molar_mass_h2_g_per_mol / (2.0 * molar_mass_nh3_g_per_mol)


def stoichiometric_nitrogen_kg_per_t_nh3(molar_mass_n2_g_per_mol, molar_mass_nh3_g_per_mol):
    """Nitrogen bound in one tonne of ammonia: 1 mol N2 per 2 mol NH3 [1]_.

    Parameters
    ----------
    molar_mass_n2_g_per_mol : float or ndarray
        Molar mass of nitrogen (N2), g/mol.
    molar_mass_nh3_g_per_mol : float or ndarray
        Molar mass of ammonia (NH3), g/mol.

    Returns
    -------
    float or ndarray
        Nitrogen, kg per t NH3 (about 822.4 kg/t).

    References
    ----------
    .. [1] Stoichiometry of 3 H2 + N2 -> 2 NH3 (common practice).
    """
    return 1000.0 * molar_mass_n2_g_per_mol / (2.0 * molar_mass_nh3_g_per_mol)


def with_loss_allowance(stoichiometric_amount, loss_allowance):
    """Feed above stoichiometry: purge gas and losses.

    Parameters
    ----------
    stoichiometric_amount : float or ndarray
        Feed the reaction alone needs, in any unit (e.g. kg H2 per t NH3).
    loss_allowance : float or ndarray
        Extra feed lost to purge gas and leaks, as a fraction of the stoichiometric amount (dimensionless).

    Returns
    -------
    float or ndarray
        Feed with the allowance, in the unit of ``stoichiometric_amount``.
    """
    return stoichiometric_amount * (1.0 + loss_allowance)


def air_separation_kwh_per_kg_n2(air_separation_kwh_per_t_n2):
    """Electricity of the air separation unit per kg of nitrogen.

    Parameters
    ----------
    air_separation_kwh_per_t_n2 : float or ndarray
        Electricity of air separation, kWh per t N2.

    Returns
    -------
    float or ndarray
        Electricity, kWh per kg N2.
    """
    return air_separation_kwh_per_t_n2 / 1000.0


def ammonia_produced_per_t_delivered(storage_loss_fraction):
    """Tonnes of ammonia made per tonne leaving storage.

    Parameters
    ----------
    storage_loss_fraction : float or ndarray
        Share of the ammonia put into storage that is lost there (dimensionless, below 1).

    Returns
    -------
    float or ndarray
        Ammonia made, t per t NH3 leaving storage.
    """
    return 1.0 / (1.0 - storage_loss_fraction)


def hydrogen_mass_fraction_of_ammonia(molar_mass_h2_g_per_mol, molar_mass_nh3_g_per_mol):
    """kg of hydrogen contained per kg NH3 (3 H atoms per molecule).

    Parameters
    ----------
    molar_mass_h2_g_per_mol : float or ndarray
        Molar mass of hydrogen (H2), g/mol.
    molar_mass_nh3_g_per_mol : float or ndarray
        Molar mass of ammonia (NH3), g/mol.

    Returns
    -------
    float or ndarray
        Hydrogen, kg H2 per kg NH3 (about 0.1776).

    References
    ----------
    .. [1] Stoichiometry: 1.5 mol H2 per mol NH3 (common practice).
    """
    return 1.5 * molar_mass_h2_g_per_mol / molar_mass_nh3_g_per_mol
