"""Hydrogen from methane pyrolysis (CH4 -> C + 2 H2), with solid carbon as a co-product.

Natural gas is bought as feed and fuel; electricity heats the reactor (plasma or resistive) where
the project says so. The carbon of the gas leaves as solid carbon or as CO2 (carbon balance, see
``stages.pyrolysis``). The burden of the hydrogen production activity is shared with the carbon
by the project's choice: ``none`` (the carbon is stored or given away: all on hydrogen), ``mass``
or ``energy`` allocation (every exchange of the activity scaled by hydrogen's share), or
``system_expansion`` (a credit for the product the carbon displaces, from a factor of the set).
The result states what was done under ``co_products``.
"""

from __future__ import annotations

from typing import Literal

from ..errors import InputError
from ..model.project import P, Section
from ..stages import pyrolysis, reforming
from .base import Activity, CoProduct, Route, SectionError, combustion_kg_per_gj
from .electricity import starter as electricity_starter
from .natural_gas import starter as natural_gas_starter


class Pyrolysis(Section):
    natural_gas_gj_per_kg_h2: float = P(unit="GJ (LHV)/kg H2", description="Natural gas as feed and fuel", gt=0)
    electricity_kwh_per_kg_h2: float = P(
        0.0, "kWh/kg H2", "Electricity of the reactor (plasma or resistive heating) and the plant", ge=0
    )
    carbon_kg_per_kg_h2: float = P(
        unit="kg C/kg H2", description="Solid carbon leaving the plant per kg of hydrogen", ge=0
    )
    carbon_allocation: Literal["none", "mass", "energy", "system_expansion"] = P(
        "none", description="How the burden is shared with the carbon co-product"
    )
    displaced_product_factor: str = P(
        "",
        description="Factor id (kg CO2e/kg) of the product the carbon displaces: used "
        "by system_expansion, and by a scheme whose rulebook requires it",
    )


def hydrogen_share(params: dict, inputs):
    """Share of the hydrogen production activity's exchanges charged to hydrogen.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``pyrolysis.carbon_kg_per_kg_h2`` in kg C/kg H2).
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.

    Returns
    -------
    float or ndarray
        Hydrogen's share (dimensionless, between 0 and 1; 1 for ``none`` and system expansion).

    References
    ----------
    .. [1] ISO 14044:2006, 4.3.4 (allocation; system expansion).
    """
    p = params["pyrolysis"]
    carbon = p["carbon_kg_per_kg_h2"]
    if p["carbon_allocation"] == "mass":
        return pyrolysis.hydrogen_share_by_mass(carbon)
    if p["carbon_allocation"] == "energy":
        carbon_lhv = pyrolysis.carbon_lhv_mj_per_kg(inputs.formation_enthalpy_co2(), inputs.molar_mass("C"))
        return pyrolysis.hydrogen_share_by_energy(
            carbon, inputs.factor("heating_value.hydrogen.lhv", "MJ/kg"), carbon_lhv
        )
    return 1.0


def build(params: dict, inputs, chain) -> list[Activity]:
    """Activities of hydrogen from methane pyrolysis, per kg H2: natural gas and electricity (hydrogen's
    share), the CO2 of the carbon not kept solid, and a credit for the displaced product under system expansion.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``pyrolysis.natural_gas_gj_per_kg_h2`` in GJ (LHV)/kg H2).
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.
    chain : Chain
        What the route modules before this one left: the reference activity and its product, the place,
        shared fuel supplies (``extra``) and figures.

    Returns
    -------
    list of Activity
        The activities it adds; their exchanges are amounts per unit of each activity (kg H2).

    References
    ----------
    .. [1] Stoichiometry of CH4 -> C + 2 H2 (common practice).
    .. [2] ISO 14044:2006, 4.3.4 (allocation; system expansion).
    """
    p = params["pyrolysis"]
    share = hydrogen_share(params, inputs)
    gas_gj = p["natural_gas_gj_per_kg_h2"]
    plant = Activity("hydrogen_production", "hydrogen_production", "hydrogen, methane pyrolysis", "kg H2")
    plant.consume("natural_gas_supply", gas_gj * share, "natural gas, feed and fuel", "GJ")
    # the reactor's electricity is shared with the carbon; conditioning (purifying and compressing the hydrogen
    # after the split) is the hydrogen's own, as for chlor-alkali by-product hydrogen
    plant.consume(
        "electricity_mix",
        p["electricity_kwh_per_kg_h2"] * share + params["hydrogen"]["conditioning_kwh_per_kg_h2"],
        "electricity, reactor and plant (hydrogen's share) and conditioning",
        "kWh",
    )
    direct = pyrolysis.direct_co2_kg_per_kg_h2(
        gas_gj * combustion_kg_per_gj(inputs, "co2"),
        p["carbon_kg_per_kg_h2"],
        inputs.molar_mass("CO2"),
        inputs.molar_mass("C"),
    )
    plant.emit("co2_fossil", direct * share, "CO2 from the gas carbon not kept as solid carbon")
    plant.emit("ch4_fossil", gas_gj * combustion_kg_per_gj(inputs, "ch4") * share, "CH4 from burning gas and off-gas")
    plant.emit("n2o", gas_gj * combustion_kg_per_gj(inputs, "n2o") * share, "N2O from burning gas and off-gas")
    if p["carbon_allocation"] == "system_expansion":
        credit = p["carbon_kg_per_kg_h2"] * inputs.factor(
            p["displaced_product_factor"], "kg CO2e/kg", "pyrolysis.displaced_product_factor"
        )
        plant.emit("co2e_precharacterised", -credit, "credit for the product the carbon displaces (system expansion)")
    chain.figures["co_products"] = {
        "co_product": "solid carbon",
        "kg_per_kg_h2": p["carbon_kg_per_kg_h2"],
        "method": p["carbon_allocation"],
        "hydrogen_share": share,
    }
    return [plant]


def check_limits(params: dict, inputs, source: str) -> None:
    """Carbon balance and stoichiometry: no more carbon than the gas brings; at least the methane that 2 H2 need.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``pyrolysis.carbon_kg_per_kg_h2`` in kg C/kg H2).
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.
    source : str
        The project file's name, for the error message.

    Returns
    -------
    None
        Nothing when the project is inside the limits.

    Raises
    ------
    InputError
        Naming the file, the field and what was expected, for the first limit broken.

    References
    ----------
    .. [1] Stoichiometry of CH4 -> C + 2 H2 (common practice).
    """
    p = params["pyrolysis"]
    m_ch4, m_h2, m_c, m_co2 = (inputs.molar_mass(f) for f in ("CH4", "H2", "C", "CO2"))
    least_gas = (
        pyrolysis.stoichiometric_methane_kg_per_kg_h2(m_ch4, m_h2)
        * inputs.factor("heating_value.methane.lhv", "MJ/kg")
        / 1000.0
    )
    if p["natural_gas_gj_per_kg_h2"] < least_gas:
        raise InputError(
            source,
            "pyrolysis.natural_gas_gj_per_kg_h2",
            f"at least {least_gas:.4f} GJ/kg H2 (1 mol CH4 per 2 mol H2), got {p['natural_gas_gj_per_kg_h2']:g}",
        )
    most_carbon = pyrolysis.stoichiometric_carbon_kg_per_kg_h2(m_c, m_h2)
    carbon_in_gas = p["natural_gas_gj_per_kg_h2"] * combustion_kg_per_gj(inputs, "co2") * m_c / m_co2
    limit = min(most_carbon, carbon_in_gas)
    if p["carbon_kg_per_kg_h2"] > limit:
        raise InputError(
            source,
            "pyrolysis.carbon_kg_per_kg_h2",
            f"at most {limit:.3f} kg C/kg H2 (the carbon the gas brings, and the "
            f"stoichiometric {most_carbon:.3f}), got {p['carbon_kg_per_kg_h2']:g}",
        )
    energy_in, energy_out = _energy_balance(p, inputs)
    if energy_in < energy_out:
        raise InputError(
            source,
            "pyrolysis.natural_gas_gj_per_kg_h2",
            f"gas plus electricity of at least the heating value of the hydrogen and its carbon, {energy_out:.1f} "
            f"MJ/kg H2 (energy balance, no imported heat), got {energy_in:.1f} MJ",
        )


def _energy_balance(p: dict, inputs):
    """(energy bought, heating value of the products), MJ (LHV) per kg H2."""
    energy_in = reforming.energy_in_mj_per_kg_h2(p["natural_gas_gj_per_kg_h2"], p["electricity_kwh_per_kg_h2"])
    carbon_lhv = pyrolysis.carbon_lhv_mj_per_kg(inputs.formation_enthalpy_co2(), inputs.molar_mass("C"))
    return energy_in, pyrolysis.energy_out_mj_per_kg_h2(
        inputs.factor("heating_value.hydrogen.lhv", "MJ/kg"), p["carbon_kg_per_kg_h2"], carbon_lhv
    )


def draw_limits(params: dict, inputs) -> list:
    """The limits of ``check_limits`` on numbers or arrays of draws (arithmetic only).

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``pyrolysis.carbon_kg_per_kg_h2`` in kg C/kg H2).
        Numbers may be arrays of Monte Carlo draws.
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.

    Returns
    -------
    list of tuple
        ``(field, expected, ok)``: the parameter path, what was expected in words, and a bool or a
        bool array over the draws.
    """
    p = params["pyrolysis"]
    m_ch4, m_h2, m_c, m_co2 = (inputs.molar_mass(f) for f in ("CH4", "H2", "C", "CO2"))
    least_gas = (
        pyrolysis.stoichiometric_methane_kg_per_kg_h2(m_ch4, m_h2)
        * inputs.factor("heating_value.methane.lhv", "MJ/kg")
        / 1000.0
    )
    carbon_in_gas = p["natural_gas_gj_per_kg_h2"] * combustion_kg_per_gj(inputs, "co2") * m_c / m_co2
    carbon = p["carbon_kg_per_kg_h2"]
    energy_in, energy_out = _energy_balance(p, inputs)
    return [
        (
            "pyrolysis.natural_gas_gj_per_kg_h2",
            "at least the stoichiometric floor (1 mol CH4 per 2 mol H2)",
            p["natural_gas_gj_per_kg_h2"] >= least_gas,
        ),
        (
            "pyrolysis.carbon_kg_per_kg_h2",
            "at most the carbon the gas brings and the stoichiometric carbon",
            (carbon <= pyrolysis.stoichiometric_carbon_kg_per_kg_h2(m_c, m_h2)) & (carbon <= carbon_in_gas),
        ),
        (
            "pyrolysis.natural_gas_gj_per_kg_h2",
            "gas plus electricity of at least the heating value of the hydrogen and its carbon (energy balance)",
            energy_in >= energy_out,
        ),
    ]


def validate(project) -> None:
    """A displaced product factor when the carbon is credited by system expansion.

    Parameters
    ----------
    project : Project
        The validated project (its sections as pydantic models).

    Returns
    -------
    None
        Nothing when the sections agree.

    Raises
    ------
    SectionError
        Naming the field and what was expected.
    """
    p = project.pyrolysis
    if p.carbon_allocation == "system_expansion" and not p.displaced_product_factor:
        raise SectionError(
            "pyrolysis.displaced_product_factor",
            "a factor id (kg CO2e/kg) of the product the carbon displaces, for carbon_allocation 'system_expansion'",
        )


def metered(params: dict) -> dict[str, list[str]]:
    """Parameter paths of the pyrolysis plant scaled by metered gas and electricity.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``); the choice of paths depends
        on text options and sections only, not on numbers.

    Returns
    -------
    dict of str to list of str
        ``natural_gas`` and ``electricity`` -> the parameter paths (``section.field``) that metered
        operation in a period scales.
    """
    return {
        "natural_gas": ["pyrolysis.natural_gas_gj_per_kg_h2"],
        "electricity": ["pyrolysis.electricity_kwh_per_kg_h2"],
    }


def starter(product: str) -> str:
    """The ``[pyrolysis]`` and supply sections of a starter project file.

    Parameters
    ----------
    product : str
        The project's product, ``hydrogen`` or ``ammonia``.

    Returns
    -------
    str
        TOML text of the sections, with example numbers for ``carbonledger init`` to mark as placeholders.
    """
    text = """
[pyrolysis]
natural_gas_gj_per_kg_h2 = 0.23      # feed and fuel, lower heating value (at least 0.199: 1 mol CH4 per 2 mol H2)
electricity_kwh_per_kg_h2 = 10.0     # reactor heating and plant
carbon_kg_per_kg_h2 = 2.9            # solid carbon leaving the plant (at most 2.98, stoichiometric)
carbon_allocation = "none"           # none | mass | energy | system_expansion (then displaced_product_factor)
"""
    return text + natural_gas_starter(product) + electricity_starter(product, grid=True)


ROUTE = Route(
    name="methane_pyrolysis",
    kind="hydrogen_route",
    stages=("hydrogen_production",),
    applies=lambda params: params["hydrogen"]["route"] == "methane_pyrolysis",
    build=build,
    sections={"pyrolysis": Pyrolysis},
    validate=validate,
    check_limits=check_limits,
    draw_limits=draw_limits,
    uses_natural_gas=lambda project: True,
    metered=metered,
    starter=starter,
    description="Methane pyrolysis: hydrogen with solid carbon as a co-product",
    co_product=CoProduct(
        name="solid carbon",
        parameter="pyrolysis.carbon_allocation",
        methods=("none", "mass", "energy", "system_expansion"),
        carries_energy=True,  # carbon has a heating value (graphite burnt to CO2)
        rigid=True,  # CH4 -> C + 2 H2: the carbon per kg H2 follows the methane split
        missing=lambda params, method: (
            "pyrolysis.displaced_product_factor (the product the carbon displaces)"
            if method == "system_expansion" and not params["pyrolysis"]["displaced_product_factor"]
            else ""
        ),
    ),
)
