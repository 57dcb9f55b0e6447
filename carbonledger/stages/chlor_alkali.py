"""By-product hydrogen of chlor-alkali electrolysis: 2 NaCl + 2 H2O -> Cl2 + H2 + 2 NaOH.

Per kg of hydrogen the cells also make chlorine and sodium hydroxide in fixed proportions (the
molar masses of the reaction). The cell's burden is shared among the three products by the
rule the project chooses; work done on the hydrogen alone (purification, compression) is
charged to it whole.

References
----------
.. [1] ISO 14044:2006, 4.3.4 (allocation by physical relationships, then by economic value).
.. [2] European Commission, Best Available Techniques Reference Document for the Production of
   Chlor-alkali (2014), ch. 2: the cell reaction and the co-production of chlorine, sodium
   hydroxide and hydrogen.
.. [3] Haynes, W. M. (ed.), CRC Handbook of Chemistry and Physics, "Electrochemical Series":
   standard potentials Cl2 + 2 e- -> 2 Cl- 1.358 V, 2 H2O + 2 e- -> H2 + 2 OH- -0.828 V (recorded
   from memory, not yet checked against the handbook).
.. [4] BIPM (2019), The International System of Units, 9th ed.: the Faraday constant is exact,
   e x N_A = 96 485.332 12 C/mol.
"""

FARADAY_C_PER_MOL = 96485.33212
STANDARD_CELL_POTENTIAL_V = 1.358 - (-0.828)  # [3]_, recorded from memory: the reversible decomposition voltage


def least_cell_electricity_kwh_per_kg_h2(cell_potential_v, molar_mass_h2_g_per_mol):
    """Least cell electricity per kg H2: two electrons per H2 at the reversible cell voltage [3]_ [4]_,
    n F E per mole (J/mol / g/mol = kJ/kg; / 3600 kJ/kWh).

    Parameters
    ----------
    cell_potential_v : float or ndarray
        Reversible cell voltage, V (``STANDARD_CELL_POTENTIAL_V``, 2.186 V, at standard conditions).
    molar_mass_h2_g_per_mol : float or ndarray
        Molar mass of hydrogen (H2), g/mol.

    Returns
    -------
    float or ndarray
        Electricity, kWh per kg H2 (about 58 kWh/kg at 2.186 V).

    References
    ----------
    .. [3] CRC Handbook of Chemistry and Physics, "Electrochemical Series" (standard potentials; from memory).
    .. [4] BIPM (2019), The International System of Units, 9th ed.: the Faraday constant 96 485.332 12 C/mol.
    """
    return 2.0 * FARADAY_C_PER_MOL * cell_potential_v / molar_mass_h2_g_per_mol / 3600.0


def chlorine_kg_per_kg_h2(molar_mass_cl2_g_per_mol, molar_mass_h2_g_per_mol):
    """Chlorine made per kg of hydrogen: one mole of Cl2 per mole of H2 [2]_.

    Parameters
    ----------
    molar_mass_cl2_g_per_mol : float or ndarray
        Molar mass of chlorine (Cl2), g/mol.
    molar_mass_h2_g_per_mol : float or ndarray
        Molar mass of hydrogen (H2), g/mol.

    Returns
    -------
    float or ndarray
        Chlorine, kg Cl2 per kg H2 (about 35.2).

    References
    ----------
    .. [2] European Commission, Chlor-alkali BREF (2014), ch. 2: 2 NaCl + 2 H2O -> Cl2 + H2 + 2 NaOH.
    """
    return molar_mass_cl2_g_per_mol / molar_mass_h2_g_per_mol


def sodium_hydroxide_kg_per_kg_h2(molar_mass_naoh_g_per_mol, molar_mass_h2_g_per_mol):
    """Sodium hydroxide made per kg of hydrogen: two moles of NaOH per mole of H2 [2]_.

    Parameters
    ----------
    molar_mass_naoh_g_per_mol : float or ndarray
        Molar mass of sodium hydroxide (NaOH), g/mol.
    molar_mass_h2_g_per_mol : float or ndarray
        Molar mass of hydrogen (H2), g/mol.

    Returns
    -------
    float or ndarray
        Sodium hydroxide, kg NaOH per kg H2 (about 39.7).

    References
    ----------
    .. [2] European Commission, Chlor-alkali BREF (2014), ch. 2: 2 NaCl + 2 H2O -> Cl2 + H2 + 2 NaOH.
    """
    return 2.0 * molar_mass_naoh_g_per_mol / molar_mass_h2_g_per_mol


def hydrogen_share_by_mass(chlorine_kg, sodium_hydroxide_kg):
    """Share of the cell's burden on 1 kg of hydrogen when split by product mass [1]_.

    Parameters
    ----------
    chlorine_kg : float or ndarray
        Chlorine made, kg per kg H2.
    sodium_hydroxide_kg : float or ndarray
        Sodium hydroxide made, kg per kg H2.

    Returns
    -------
    float or ndarray
        Hydrogen's share of the burden (dimensionless, between 0 and 1).

    References
    ----------
    .. [1] ISO 14044:2006, 4.3.4 (allocation by physical relationships).
    """
    return 1.0 / (1.0 + chlorine_kg + sodium_hydroxide_kg)


def hydrogen_share_by_value(chlorine_kg, sodium_hydroxide_kg, hydrogen_price, chlorine_price, sodium_hydroxide_price):
    """Share on 1 kg of hydrogen when split by the products' value (prices per kg, one currency) [1]_.

    Parameters
    ----------
    chlorine_kg : float or ndarray
        Chlorine made, kg per kg H2.
    sodium_hydroxide_kg : float or ndarray
        Sodium hydroxide made, kg per kg H2.
    hydrogen_price : float or ndarray
        Price of hydrogen, currency per kg.
    chlorine_price : float or ndarray
        Price of chlorine, the same currency per kg.
    sodium_hydroxide_price : float or ndarray
        Price of sodium hydroxide, the same currency per kg.

    Returns
    -------
    float or ndarray
        Hydrogen's share of the burden (dimensionless, between 0 and 1).

    References
    ----------
    .. [1] ISO 14044:2006, 4.3.4 (allocation by economic value when physical relationships do not apply).
    """
    return hydrogen_price / (
        hydrogen_price + chlorine_kg * chlorine_price + sodium_hydroxide_kg * sodium_hydroxide_price
    )
