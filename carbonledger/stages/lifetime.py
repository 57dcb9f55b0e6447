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
    """Age of the stacks in operating year ``index`` (0 for the first year); replacements reset it."""
    return operating_year_index % stack_replacement_years


def efficiency_fraction_of_new(efficiency_loss_per_year, stack_age_years):
    """Stack efficiency as a fraction of the new stack's efficiency."""
    return 1.0 - efficiency_loss_per_year * stack_age_years


def electricity_kwh_per_kg_h2_aged(electricity_kwh_per_kg_h2_new, efficiency_fraction):
    return electricity_kwh_per_kg_h2_new / efficiency_fraction


def annual_output_t(nameplate_output_t_per_year, capacity_factor, efficiency_fraction):
    """Output of one year at a fixed electricity input: it falls with the stack efficiency."""
    return nameplate_output_t_per_year * capacity_factor * efficiency_fraction


def output_weighted_mean(yearly_values, yearly_outputs):
    """sum(value x output) / sum(output) over the years [2]_ (numpy arrays of equal length)."""
    return (yearly_values * yearly_outputs).sum() / yearly_outputs.sum()


def construction_t_co2e_from_capacity(capacity_mw, construction_t_co2e_per_mw):
    return capacity_mw * construction_t_co2e_per_mw


def construction_kg_co2e_per_unit(construction_t_co2e, lifetime_output_units):
    """Construction emissions spread over the lifetime output, kg CO2e per functional unit."""
    return construction_t_co2e * 1000.0 / lifetime_output_units
