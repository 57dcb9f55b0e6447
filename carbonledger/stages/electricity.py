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


def battery_delivered_share(capacity_kwh, full_cycles_per_year, electricity_kwh_per_year):
    """Share of the plant's electricity delivered from a battery: capacity x full cycles a year over the
    plant's electricity use a year (a full cycle delivers the usable capacity once).

    Parameters
    ----------
    capacity_kwh : float or ndarray
        Usable capacity of the battery, kWh.
    full_cycles_per_year : float
        Full charge and discharge cycles a year, 1/year.
    electricity_kwh_per_year : float
        The plant's electricity use, kWh/year.

    Returns
    -------
    float or ndarray
        Delivered share, kWh from the battery per kWh the plant uses.

    References
    ----------
    .. [1] Common practice: energy delivered a year = usable capacity x equivalent full cycles.
    """
    return capacity_kwh * full_cycles_per_year / electricity_kwh_per_year


def charged_source_kwh_per_kwh(share, delivered_share, round_trip_efficiency):
    """kWh bought from the source that charges a battery, per kWh the plant uses: its own share, plus
    the battery's delivery divided by the round-trip efficiency (energy delivered / energy charged),
    so the round-trip losses, delivered x (1 / efficiency - 1), are bought as extra electricity.

    Parameters
    ----------
    share : float or ndarray
        The charging source's own share of the plant's electricity, kWh/kWh.
    delivered_share : float or ndarray
        Share delivered from the battery (``battery_delivered_share``), kWh/kWh.
    round_trip_efficiency : float
        Energy delivered over energy charged, in (0, 1].

    Returns
    -------
    float or ndarray
        kWh bought from the charging source per kWh the plant uses.

    References
    ----------
    .. [1] Common practice: round-trip efficiency = energy discharged / energy charged.
    """
    return share + delivered_share / round_trip_efficiency


def displaced_source_kwh_per_kwh(share, charged_share, delivered_share):
    """kWh bought from each other source per kWh the plant uses: the battery's delivery displaces the
    other sources in proportion to their shares (they supply 1 - charged share - delivered share together).

    Parameters
    ----------
    share : float or ndarray
        This source's declared share, kWh/kWh.
    charged_share : float or ndarray
        The charging source's declared share, kWh/kWh (below 1).
    delivered_share : float or ndarray
        Share delivered from the battery, kWh/kWh.

    Returns
    -------
    float or ndarray
        kWh bought from this source per kWh the plant uses.
    """
    return share * (1 - charged_share - delivered_share) / (1 - charged_share)
