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
    """kg CO2 formed per GJ (LHV) of methane burnt or reformed: one mole of CO2 per mole of CH4.

    Parameters
    ----------
    molar_mass_co2_g_per_mol : float or ndarray
        Molar mass of carbon dioxide, g/mol.
    molar_mass_ch4_g_per_mol : float or ndarray
        Molar mass of methane, g/mol.
    methane_lhv_mj_per_kg : float or ndarray
        Lower heating value of methane, MJ/kg.

    Returns
    -------
    float or ndarray
        Biogenic CO2, kg CO2 per GJ (LHV) of methane (about 54.9 kg/GJ at 50.0 MJ/kg).

    References
    ----------
    .. [1] Stoichiometry of CH4 + 2 O2 -> CO2 + 2 H2O (common practice).
    """
    return molar_mass_co2_g_per_mol / molar_mass_ch4_g_per_mol / methane_lhv_mj_per_kg * 1000.0


def upstream_kg_co2e_per_kg_h2(biomethane_gj_per_kg_h2, upstream_g_co2e_per_mj):
    """kg CO2e per kg H2 of supplying the biomethane: GJ x 1000 MJ/GJ x g/MJ / 1000 g/kg.

    Parameters
    ----------
    biomethane_gj_per_kg_h2 : float or ndarray
        Biomethane used (feed and fuel), GJ (LHV) per kg H2.
    upstream_g_co2e_per_mj : float or ndarray
        Life-cycle emissions of supplying biomethane (digestion, upgrading, slip, injection), g CO2e per MJ (LHV).

    Returns
    -------
    float or ndarray
        Upstream emissions, kg CO2e per kg H2.

    References
    ----------
    .. [1] Directive (EU) 2018/2001, Annex VI, Part B (biomethane supply counted per MJ; from memory).
    """
    return biomethane_gj_per_kg_h2 * upstream_g_co2e_per_mj


def stored_kg(captured_kg, transport_storage_loss_fraction):
    """Captured CO2 that reaches permanent storage.

    Parameters
    ----------
    captured_kg : float or ndarray
        Biogenic CO2 captured, kg (per functional unit, e.g. per kg H2).
    transport_storage_loss_fraction : float or ndarray
        Share of the captured CO2 lost in transport and storage (dimensionless).

    Returns
    -------
    float or ndarray
        CO2 stored, kg (same basis as ``captured_kg``).
    """
    return captured_kg * (1.0 - transport_storage_loss_fraction)


def lost_kg(captured_kg, transport_storage_loss_fraction):
    """Captured CO2 lost to the air in transport and storage.

    Parameters
    ----------
    captured_kg : float or ndarray
        Biogenic CO2 captured, kg (per functional unit, e.g. per kg H2).
    transport_storage_loss_fraction : float or ndarray
        Share of the captured CO2 lost in transport and storage (dimensionless).

    Returns
    -------
    float or ndarray
        CO2 released, kg (same basis as ``captured_kg``).
    """
    return captured_kg * transport_storage_loss_fraction
