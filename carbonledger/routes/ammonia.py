"""Ammonia from the project's hydrogen: nitrogen supply, the synthesis loop, refrigerated storage."""

from __future__ import annotations

from typing import Literal

from ..model.project import P, Section
from ..stages import ammonia
from .base import Activity, Route, SectionError, burn_natural_gas


class Ammonia(Section):
    nitrogen_source: Literal["air_separation", "process_air"] = P(
        description="Air separation unit, or process air in a secondary reformer"
    )
    air_separation_kwh_per_t_n2: float = P(0.0, "kWh/t N2", "Electricity of the air separation unit", ge=0)
    hydrogen_loss_allowance: float = P(
        0.0, "fraction", "Hydrogen and nitrogen above stoichiometry (purge and losses)", ge=0, lt=1
    )
    synthesis_electricity_kwh_per_t_nh3: float = P(
        unit="kWh/t NH3", description="Synthesis loop electricity (compressors, refrigeration)", ge=0
    )
    synthesis_natural_gas_gj_per_t_nh3: float = P(
        0.0, "GJ (LHV)/t NH3", "Natural gas burnt for the synthesis loop (steam, start-up)", ge=0
    )
    storage_electricity_kwh_per_t_nh3: float = P(
        0.0, "kWh/t NH3", "Refrigerated storage and loading (reliquefaction of boil-off)", ge=0
    )
    storage_loss_fraction: float = P(0.0, "fraction", "Ammonia lost in storage and loading", ge=0, lt=1)


def build(params: dict, inputs, chain) -> list[Activity]:
    """Activities of ammonia synthesis, nitrogen supply and refrigerated storage, per t NH3.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``ammonia.synthesis_electricity_kwh_per_t_nh3`` in kWh/t NH3).
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.
    chain : Chain
        What the route modules before this one left: the reference activity and its product, the place,
        shared fuel supplies (``extra``) and figures.

    Returns
    -------
    list of Activity
        The activities it adds; their exchanges are amounts per unit of each activity (t NH3, kg N2).

    References
    ----------
    .. [1] Stoichiometry of 3 H2 + N2 -> 2 NH3 (common practice); see ``carbonledger.stages.ammonia``.
    """
    a = params["ammonia"]
    m_h2, m_n2, m_nh3 = inputs.molar_mass("H2"), inputs.molar_mass("N2"), inputs.molar_mass("NH3")
    synthesis = Activity("ammonia_synthesis", "ammonia_synthesis", "ammonia, synthesis loop", "t NH3")
    hydrogen_kg = ammonia.with_loss_allowance(
        ammonia.stoichiometric_hydrogen_kg_per_t_nh3(m_h2, m_nh3), a["hydrogen_loss_allowance"]
    )
    synthesis.consume("hydrogen_production", hydrogen_kg, "hydrogen, stoichiometric plus loss allowance", "kg H2")
    activities = [synthesis]
    if a["nitrogen_source"] == "air_separation":
        nitrogen_kg = ammonia.with_loss_allowance(
            ammonia.stoichiometric_nitrogen_kg_per_t_nh3(m_n2, m_nh3), a["hydrogen_loss_allowance"]
        )
        synthesis.consume("air_separation", nitrogen_kg, "nitrogen, stoichiometric plus loss allowance", "kg N2")
        asu = Activity("air_separation", "nitrogen_supply", "nitrogen, air separation", "kg N2")
        asu.consume(
            "electricity_mix",
            ammonia.air_separation_kwh_per_kg_n2(a["air_separation_kwh_per_t_n2"]),
            "electricity, air separation",
            "kWh",
        )
        activities.append(asu)
    synthesis.consume("electricity_mix", a["synthesis_electricity_kwh_per_t_nh3"], "electricity, synthesis loop", "kWh")
    if params.get("natural_gas") is not None:
        burn_natural_gas(synthesis, inputs, a["synthesis_natural_gas_gj_per_t_nh3"], "synthesis loop")
    store = Activity("ammonia_storage", "ammonia_storage", "ammonia, refrigerated storage and loading", "t NH3")
    store.consume(
        "ammonia_synthesis",
        ammonia.ammonia_produced_per_t_delivered(a["storage_loss_fraction"]),
        "ammonia into storage (losses included)",
        "t NH3",
    )
    store.consume(
        "electricity_mix", a["storage_electricity_kwh_per_t_nh3"], "electricity, refrigeration and loading", "kWh"
    )
    activities.append(store)
    chain.reference, chain.product = "ammonia_storage", "ammonia"
    return activities


def metered(params: dict) -> dict[str, list[str]]:
    """Parameter paths of the ammonia plant scaled by metered natural gas and electricity.

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
        "natural_gas": ["ammonia.synthesis_natural_gas_gj_per_t_nh3"],
        "electricity": [
            "ammonia.air_separation_kwh_per_t_n2",
            "ammonia.synthesis_electricity_kwh_per_t_nh3",
            "ammonia.storage_electricity_kwh_per_t_nh3",
        ],
    }


def validate(project) -> None:
    """An ``[ammonia]`` section exactly when the product is ammonia; process air only with a reformer.

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
    if project.project.product == "ammonia" and project.ammonia is None:
        raise SectionError("ammonia", "an [ammonia] section for product 'ammonia'")
    if project.project.product == "hydrogen" and project.ammonia is not None:
        raise SectionError("ammonia", "no [ammonia] section for product 'hydrogen'")
    if project.ammonia is not None and project.ammonia.nitrogen_source == "process_air" and project.reforming is None:
        raise SectionError("ammonia.nitrogen_source", "'air_separation' (process air needs a reformer)")


def uses_natural_gas(project) -> bool:
    """Whether the synthesis loop burns natural gas.

    Parameters
    ----------
    project : Project
        The validated project (its sections as pydantic models).

    Returns
    -------
    bool
        True when the route burns or converts natural gas (a ``[natural_gas]`` section is then needed).
    """
    return project.ammonia is not None and project.ammonia.synthesis_natural_gas_gj_per_t_nh3 > 0


def starter(product: str, process_air: bool = False) -> str:
    """The ``[ammonia]`` section of a starter project file.

    Parameters
    ----------
    product : str
        The project's product, ``hydrogen`` or ``ammonia``.
    process_air : bool
        Nitrogen from process air in a secondary reformer (a reforming route) instead of air separation.

    Returns
    -------
    str
        TOML text of the sections, with example numbers for ``carbonledger init`` to mark as placeholders.
    """
    return f"""
[ammonia]
nitrogen_source = "{"process_air" if process_air else "air_separation"}"     \
# air_separation | process_air (secondary reformer)
air_separation_kwh_per_t_n2 = {0 if process_air else 110}
hydrogen_loss_allowance = 0.01       # feed above stoichiometry (purge, losses)
synthesis_electricity_kwh_per_t_nh3 = {120 if process_air else 500}
synthesis_natural_gas_gj_per_t_nh3 = 0.0
storage_electricity_kwh_per_t_nh3 = 25
storage_loss_fraction = 0.001
"""


ROUTE = Route(
    name="ammonia",
    kind="conversion",
    stages=("nitrogen_supply", "ammonia_synthesis", "ammonia_storage"),
    applies=lambda params: params["project"]["product"] == "ammonia",
    build=build,
    optional_sections={"ammonia": Ammonia},
    validate=validate,
    uses_natural_gas=uses_natural_gas,
    metered=metered,
    starter=starter,
    description="Ammonia synthesis (Haber-Bosch loop) from the project's hydrogen, with nitrogen supply and storage",
)
