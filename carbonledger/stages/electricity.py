"""Electricity supply: a mix of named sources, each with its own emission factor.

A source factor is either life-cycle CO2e (e.g. IPCC AR5 WGIII Annex III medians) or direct
CO2 of generation (some grid averages); the unit of the factor row decides which.
"""


def source_emission_kg_per_kwh(emission_factor_g_per_kwh):
    """kg of CO2 or CO2e per kWh delivered by one source, from a factor in g/kWh.

    Parameters
    ----------
    emission_factor_g_per_kwh : float or ndarray
        Emission factor of the source, g CO2 or g CO2e per kWh (the factor row's unit decides which).

    Returns
    -------
    float or ndarray
        Emissions, kg CO2 or kg CO2e per kWh.
    """
    return emission_factor_g_per_kwh / 1000.0


def kind_of_source(factor_id: str) -> str:
    """'grid', 'renewable', 'fossil', 'low_carbon' or 'other', read from the factor id's namespace.

    Parameters
    ----------
    factor_id : str
        Id of an electricity factor, e.g. ``electricity.grid.<region>_<year>``.

    Returns
    -------
    str
        The second part of an ``electricity.*`` id, or ``other`` for any other id.
    """
    parts = factor_id.split(".")
    if len(parts) >= 3 and parts[0] == "electricity":
        return parts[1]
    return "other"


ACCOUNTING_BASIS = {
    "grid": "location-based (average of the region's generation or consumption)",
    "residual_mix": "market-based (residual mix: what is left after cancelled certificates)",
}


def accounting_basis(factor_id: str) -> str:
    """How a grid-like electricity factor accounts for electricity: location-based grid averages
    (``electricity.grid.*``) or market-based residual mixes (``electricity.residual_mix.*``); '' for others.

    Parameters
    ----------
    factor_id : str
        Id of an electricity factor.

    Returns
    -------
    str
        The accounting basis in words, or an empty text for renewable, fossil and other sources.

    References
    ----------
    .. [1] GHG Protocol Scope 2 Guidance (2015), ch. 4 and 6: location-based and market-based methods
       are reported apart, never blended (from memory).
    """
    return ACCOUNTING_BASIS.get(kind_of_source(factor_id), "")
