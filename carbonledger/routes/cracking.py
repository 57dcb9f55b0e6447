"""Delivery leg: ammonia cracked back to hydrogen at the destination (2 NH3 -> N2 + 3 H2).

Builds ``hydrogen_delivered`` (stage ``cracking``, per kg H2 delivered): ammonia cracked and
burnt for heat (or hydrogen or natural gas burnt), recovery losses, the cracker's electricity.
"""

from __future__ import annotations

from typing import Any, Literal

from ..errors import InputError
from ..model.project import P, Section
from ..stages import cracking
from .base import Activity, Route, SectionError, burn_natural_gas, electricity_flow
from .marine_fuels import burn_ammonia


class Cracking(Section):
    hydrogen_recovery_fraction: float = P(
        unit="fraction",
        description="Hydrogen recovered as product per hydrogen cracked (purification losses)",
        gt=0,
        le=1,
    )
    heat_source: Literal["ammonia", "hydrogen", "natural_gas"] = P(description="Fuel burnt for the cracker's heat")
    heat_to_reactor_efficiency: float = P(
        unit="fraction",
        description="Share of the fuel heat (LHV) that reaches the reaction and the feed vaporiser",
        gt=0,
        le=1,
    )
    burner_n2o_g_per_kg_ammonia: float = P(0.0, "g N2O/kg NH3 burnt", "N2O from burning ammonia for heat", ge=0)
    electricity_kwh_per_kg_h2: float = P(
        0.0, "kWh/kg H2", "Electricity of the cracker (pumps, purification, compression)", ge=0
    )
    electricity_factor: str = P(
        "", description="Factor id of the electricity at the destination (needed when electricity_kwh_per_kg_h2 > 0)"
    )


def cracking_figures(c: dict, inputs) -> dict[str, Any]:
    """The cracker's figures per kg H2 cracked: ammonia feed, reaction enthalpy, heat, hydrogen burnt.

    Parameters
    ----------
    c : dict
        The ``[cracking]`` section (fractions dimensionless, N2O in g/kg NH3, electricity in kWh/kg H2).
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.

    Returns
    -------
    dict of str to float or str
        ``ammonia_kg_per_kg_h2_cracked`` (kg NH3/kg H2), ``reaction_enthalpy_mj_per_kg_h2`` and
        ``heat_mj_per_kg_h2_cracked`` (MJ/kg H2), ``hydrogen_burnt_per_kg_h2_cracked`` (kg/kg), the heat source and
        the recovery fraction.

    References
    ----------
    .. [1] Stoichiometry of 2 NH3 -> N2 + 3 H2 and the enthalpy of formation of NH3(g); see
       ``carbonledger.stages.cracking``.
    """
    m_nh3, m_h2 = inputs.molar_mass("NH3"), inputs.molar_mass("H2")
    feed = cracking.ammonia_kg_per_kg_h2_cracked(m_nh3, m_h2)
    enthalpy = cracking.reaction_enthalpy_mj_per_kg_h2(inputs.formation_enthalpy_ammonia(), m_h2)
    heat = cracking.heat_mj_per_kg_h2_cracked(
        enthalpy, feed, inputs.latent_heat_ammonia(), c["heat_to_reactor_efficiency"]
    )
    burnt = cracking.hydrogen_burnt_share(heat, inputs.factor("heating_value.hydrogen.lhv", "MJ/kg"), c["heat_source"])
    return {
        "ammonia_kg_per_kg_h2_cracked": feed,
        "reaction_enthalpy_mj_per_kg_h2": enthalpy,
        "heat_mj_per_kg_h2_cracked": heat,
        "hydrogen_burnt_per_kg_h2_cracked": burnt,
        "heat_source": c["heat_source"],
        "hydrogen_recovery_fraction": c["hydrogen_recovery_fraction"],
    }


def build(params: dict, inputs, chain) -> list[Activity]:
    """Activity of hydrogen cracked from the delivered ammonia, per kg H2 delivered: ammonia cracked and
    burnt for heat (or hydrogen or natural gas burnt), the cracker's electricity at the destination.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``cracking.electricity_kwh_per_kg_h2`` in kWh/kg H2).
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.
    chain : Chain
        What the route modules before this one left: the reference activity and its product, the place,
        shared fuel supplies (``extra``) and figures.

    Returns
    -------
    list of Activity
        The activities it adds; their exchanges are amounts per unit of each activity (kg H2, t NH3, kWh).

    References
    ----------
    .. [1] Stoichiometry of 2 NH3 -> N2 + 3 H2 and the enthalpy of formation of NH3(g); see
       ``carbonledger.stages.cracking``.
    """
    c = params["cracking"]
    figures = cracking_figures(c, inputs)
    cracked = cracking.hydrogen_cracked_kg_per_kg_delivered(
        c["hydrogen_recovery_fraction"], figures["hydrogen_burnt_per_kg_h2_cracked"]
    )
    heat = figures["heat_mj_per_kg_h2_cracked"]
    ammonia_burnt_kg = cracking.fuel_heat_mj_per_kg_delivered(
        heat, cracked, c["heat_source"], "ammonia"
    ) / inputs.factor("heating_value.ammonia.lhv", "MJ/kg")
    gas_gj = cracking.fuel_heat_mj_per_kg_delivered(heat, cracked, c["heat_source"], "natural_gas") / 1000.0
    ammonia_kg = cracked * figures["ammonia_kg_per_kg_h2_cracked"] + ammonia_burnt_kg
    figures.update(
        hydrogen_cracked_kg_per_kg_delivered=cracked,
        ammonia_kg_per_kg_h2_delivered=ammonia_kg,
        ammonia_burnt_for_heat_kg_per_kg_h2=ammonia_burnt_kg,
    )
    plant = Activity("hydrogen_delivered", "cracking", f"hydrogen, cracked from ammonia {chain.place}", "kg H2")
    plant.consume(chain.reference, ammonia_kg / 1000.0, "ammonia cracked and burnt for heat", "t NH3")
    burn_ammonia(plant, ammonia_burnt_kg, c["burner_n2o_g_per_kg_ammonia"], 0.0, "cracker burner")
    if c["heat_source"] == "natural_gas":
        burn_natural_gas(plant, inputs, gas_gj, "cracker heat")
    activities = [plant]
    if c["electricity_factor"]:  # the destination's electricity, for the cracker and the hydrogen legs after it
        flow, kg_per_kwh = electricity_flow(inputs, c["electricity_factor"], "cracking.electricity_factor")
        destination = Activity("electricity_at_destination", "cracking", f"electricity {chain.place}", "kWh")
        destination.emit(flow, kg_per_kwh, "generation of the destination's electricity")
        plant.consume(destination.key, c["electricity_kwh_per_kg_h2"], "electricity, cracker", "kWh")
        chain.electricity = destination.key
        activities.append(destination)
    chain.reference, chain.product = plant.key, "hydrogen"
    chain.figures["cracking"] = figures
    return activities


def check_limits(params: dict, inputs, source: str) -> None:
    """The hydrogen recovered must exceed the hydrogen burnt for the cracker's heat.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``cracking.hydrogen_recovery_fraction``, a fraction).
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
    .. [1] Stoichiometry of 2 NH3 -> N2 + 3 H2 and the enthalpy of formation of NH3(g); see
       ``carbonledger.stages.cracking``.
    """
    c = params["cracking"]
    if params["project"]["boundary"] == "cradle-to-gate":
        return
    figures = cracking_figures(c, inputs)
    if not c["hydrogen_recovery_fraction"] > figures["hydrogen_burnt_per_kg_h2_cracked"]:
        raise InputError(
            source,
            "cracking.hydrogen_recovery_fraction",
            f"a recovery above the hydrogen burnt for heat ({figures['hydrogen_burnt_per_kg_h2_cracked']:.3f} "
            f"kg per kg cracked), got {c['hydrogen_recovery_fraction']:g}",
        )


def draw_limits(params: dict, inputs) -> list:
    """The heat balance of ``check_limits`` on numbers or arrays of draws.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``cracking.heat_to_reactor_efficiency``, a fraction).
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
    c = params["cracking"]
    if params["project"]["boundary"] == "cradle-to-gate":
        return []
    burnt = cracking_figures(c, inputs)["hydrogen_burnt_per_kg_h2_cracked"]
    return [
        (
            "cracking.hydrogen_recovery_fraction",
            "a recovery above the hydrogen burnt for heat",
            c["hydrogen_recovery_fraction"] > burnt,
        )
    ]


def validate(project) -> None:
    """A ``[cracking]`` section only for ammonia delivered, with an electricity factor when it or a
    hydrogen leg after it uses electricity.

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
    crack = project.cracking
    if crack is None:
        return
    if project.project.product != "ammonia":
        raise SectionError(
            "cracking", "no [cracking] section for product 'hydrogen' (delivery is modelled for ammonia)"
        )
    if crack.electricity_kwh_per_kg_h2 > 0 and not crack.electricity_factor:
        raise SectionError("cracking.electricity_factor", "a factor id for the cracker's electricity")
    after = [
        f"{name}.{field}"
        for name, field in (
            ("hydrogen_pipeline", "compression_kwh_per_kg_h2"),
            ("hydrogen_truck", "compression_kwh_per_kg_h2"),
            ("liquid_hydrogen", "liquefaction_kwh_per_kg_h2"),
        )
        if getattr(project, name, None) is not None and getattr(getattr(project, name), field) > 0
    ]
    if after and not crack.electricity_factor:
        raise SectionError(
            "cracking.electricity_factor",
            f"a factor id for the electricity at the destination, which {', '.join(after)} after the cracker use",
        )


def uses_natural_gas(project) -> bool:
    """Whether the cracker's heat comes from natural gas.

    Parameters
    ----------
    project : Project
        The validated project (its sections as pydantic models).

    Returns
    -------
    bool
        True when the route burns or converts natural gas (a ``[natural_gas]`` section is then needed).
    """
    return project.cracking is not None and project.cracking.heat_source == "natural_gas"


ROUTE = Route(
    name="cracking",
    kind="delivery_leg",
    stages=("cracking",),
    applies=lambda params: params.get("cracking") is not None and params["project"]["boundary"] != "cradle-to-gate",
    build=build,
    optional_sections={"cracking": Cracking},
    validate=validate,
    check_limits=check_limits,
    draw_limits=draw_limits,
    uses_natural_gas=uses_natural_gas,
    description="Ammonia cracked back to hydrogen at the destination",
)
