"""Project lifetime: electrolyser stack ageing, yearly output and construction emissions.

Stack efficiency falls by a fixed fraction of its new value per year of stack age, and a stack
replacement resets the age to zero: efficiency(age) = efficiency_new x (1 - loss x age). At a
fixed electricity input (the plant's rating and capacity factor), hydrogen output falls in the
same proportion and the electricity per kg of hydrogen rises by 1 / (1 - loss x age).
Construction (capital) emissions are spread evenly over the lifetime output; intensities over
the life are weighted by each year's output.

Arithmetic only (``%`` is arithmetic), so these run on floats and numpy arrays alike.

References
----------
.. [1] ISO 14067:2018, Greenhouse gases: Carbon footprint of products, 6.3 (capital goods may
   be included in the product system; the study states whether they are).
.. [2] Common practice: output-weighted average of yearly intensities,
   sum(output_y x intensity_y) / sum(output_y).
"""


def stack_age_years(operating_year_index, stack_replacement_years):
    """Age of the stacks in operating year ``index`` (0 for the first year); replacements reset it.

    Parameters
    ----------
    operating_year_index : int or ndarray
        Operating year, counted from 0 for the first year.
    stack_replacement_years : int or ndarray
        Years between stack replacements.

    Returns
    -------
    int or ndarray
        Age of the stacks at the start of that year, years.
    """
    return operating_year_index % stack_replacement_years


def efficiency_fraction_of_new(efficiency_loss_per_year, stack_age_years):
    """Stack efficiency as a fraction of the new stack's efficiency.

    Parameters
    ----------
    efficiency_loss_per_year : float or ndarray
        Efficiency lost per year of stack age, as a fraction of the new stack's efficiency (per year).
    stack_age_years : float or ndarray
        Age of the stacks, years.

    Returns
    -------
    float or ndarray
        Efficiency as a fraction of new (dimensionless).
    """
    return 1.0 - efficiency_loss_per_year * stack_age_years


def electricity_kwh_per_kg_h2_aged(electricity_kwh_per_kg_h2_new, efficiency_fraction):
    """Electricity per kg H2 of aged stacks: the new stack's figure over the efficiency fraction.

    Parameters
    ----------
    electricity_kwh_per_kg_h2_new : float or ndarray
        Electricity of new stacks, kWh per kg H2.
    efficiency_fraction : float or ndarray
        Efficiency as a fraction of new (dimensionless).

    Returns
    -------
    float or ndarray
        Electricity, kWh per kg H2.
    """
    return electricity_kwh_per_kg_h2_new / efficiency_fraction


def annual_output_t(nameplate_output_t_per_year, capacity_factor, efficiency_fraction):
    """Output of one year at a fixed electricity input: it falls with the stack efficiency.

    Parameters
    ----------
    nameplate_output_t_per_year : float or ndarray
        Output of new stacks running all year, t per year.
    capacity_factor : float or ndarray
        Share of the year at full load (dimensionless).
    efficiency_fraction : float or ndarray
        Efficiency as a fraction of new (dimensionless).

    Returns
    -------
    float or ndarray
        Output of the year, t.
    """
    return nameplate_output_t_per_year * capacity_factor * efficiency_fraction


def output_weighted_mean(yearly_values, yearly_outputs):
    """sum(value x output) / sum(output) over the years [2]_ (numpy arrays of equal length).

    Parameters
    ----------
    yearly_values : ndarray
        Value of each year, e.g. kg CO2e per kg H2.
    yearly_outputs : ndarray
        Output of each year, t (any unit: it cancels).

    Returns
    -------
    float or ndarray
        Output-weighted mean, in the unit of ``yearly_values``.

    References
    ----------
    .. [2] Common practice: output-weighted average of yearly intensities.
    """
    return (yearly_values * yearly_outputs).sum() / yearly_outputs.sum()


def construction_t_co2e_from_capacity(capacity_mw, construction_t_co2e_per_mw):
    """Construction (capital) emissions of a plant from its capacity [1]_.

    Parameters
    ----------
    capacity_mw : float or ndarray
        Capacity of the plant, MW.
    construction_t_co2e_per_mw : float or ndarray
        Construction emissions, t CO2e per MW of capacity.

    Returns
    -------
    float or ndarray
        Construction emissions, t CO2e.

    References
    ----------
    .. [1] ISO 14067:2018, 6.3 (capital goods may be included in the product system).
    """
    return capacity_mw * construction_t_co2e_per_mw


def construction_kg_co2e_per_unit(construction_t_co2e, lifetime_output_units):
    """Construction emissions spread over the lifetime output, kg CO2e per functional unit.

    Parameters
    ----------
    construction_t_co2e : float or ndarray
        Construction emissions, t CO2e.
    lifetime_output_units : float or ndarray
        Output over the life, in functional units (e.g. kg H2 or t NH3).

    Returns
    -------
    float or ndarray
        Construction emissions, kg CO2e per functional unit.
    """
    return construction_t_co2e * 1000.0 / lifetime_output_units
