"""By-product hydrogen from chlor-alkali electrolysis, the cell's burden shared with chlorine and
sodium hydroxide by the project's rule (``none``: all on hydrogen; ``mass``; ``economic`` with the
products' prices). Purification and compression of the hydrogen (``conditioning``) are charged
to hydrogen whole. The result states what was done under ``co_products``.
"""

from __future__ import annotations

from typing import Literal

from ..errors import InputError
from ..model.project import P, Section
from ..stages import chlor_alkali
from .base import Activity, CoProduct, Route, SectionError
from .electricity import starter as electricity_starter


class ChlorAlkali(Section):
    cell_electricity_kwh_per_kg_h2: float = P(
        unit="kWh/kg H2",
        description="Electricity of the cells and their plant per kg of hydrogen "
        "made (membrane cells: about 2,500 kWh per t Cl2)",
        gt=0,
    )
    allocation: Literal["none", "mass", "economic"] = P(
        "none", description="How the cell's burden is shared with chlorine and sodium hydroxide"
    )
    hydrogen_price_per_kg: float = P(0.0, "currency/kg", "economic: price of the hydrogen", ge=0)
    chlorine_price_per_kg: float = P(0.0, "currency/kg", "economic: price of the chlorine", ge=0)
    sodium_hydroxide_price_per_kg: float = P(
        0.0, "currency/kg", "economic: price of the sodium hydroxide (as 100 % NaOH)", ge=0
    )


def build(params: dict, inputs, chain) -> list[Activity]:
    """Activity of by-product hydrogen from chlor-alkali cells, per kg H2: the hydrogen's share of the
    cell electricity (by the project's allocation) and the conditioning electricity; the co-products
    go in ``chain.figures['co_products']``.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``chlor_alkali.cell_electricity_kwh_per_kg_h2`` in kWh/kg H2).
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
    .. [1] European Commission, Chlor-alkali BREF (2014), ch. 2: the cell reaction.
    .. [2] ISO 14044:2006, 4.3.4 (allocation by physical relationships, then by economic value).
    """
    c = params["chlor_alkali"]
    m_h2 = inputs.molar_mass("H2")
    chlorine = chlor_alkali.chlorine_kg_per_kg_h2(inputs.molar_mass("Cl2"), m_h2)
    caustic = chlor_alkali.sodium_hydroxide_kg_per_kg_h2(inputs.molar_mass("NaOH"), m_h2)
    if c["allocation"] == "mass":
        share = chlor_alkali.hydrogen_share_by_mass(chlorine, caustic)
    elif c["allocation"] == "economic":
        share = chlor_alkali.hydrogen_share_by_value(
            chlorine,
            caustic,
            c["hydrogen_price_per_kg"],
            c["chlorine_price_per_kg"],
            c["sodium_hydroxide_price_per_kg"],
        )
    else:
        share = 1.0
    plant = Activity(
        "hydrogen_production", "hydrogen_production", "hydrogen, by-product of chlor-alkali electrolysis", "kg H2"
    )
    plant.consume(
        "electricity_mix",
        c["cell_electricity_kwh_per_kg_h2"] * share + params["hydrogen"]["conditioning_kwh_per_kg_h2"],
        "electricity, cells (hydrogen's share) and conditioning",
        "kWh",
    )
    chain.figures["co_products"] = {
        "co_product": "chlorine and sodium hydroxide",
        "kg_per_kg_h2": {"chlorine": chlorine, "sodium_hydroxide": caustic},
        "method": c["allocation"],
        "hydrogen_share": share,
    }
    return [plant]


def check_limits(params: dict, inputs, source: str) -> None:
    """At least the reversible cell voltage's electricity per kg H2 (2 NaCl + 2 H2O -> Cl2 + H2 + 2 NaOH).

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``chlor_alkali.cell_electricity_kwh_per_kg_h2`` in kWh/kg H2).
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
    .. [1] Two electrons per H2 at the reversible cell voltage (Faraday's law); see
       ``carbonledger.stages.chlor_alkali`` (cell voltage recorded from memory).
    """
    least = chlor_alkali.least_cell_electricity_kwh_per_kg_h2(
        chlor_alkali.STANDARD_CELL_POTENTIAL_V, inputs.molar_mass("H2")
    )
    got = params["chlor_alkali"]["cell_electricity_kwh_per_kg_h2"]
    if got < least:
        raise InputError(
            source,
            "chlor_alkali.cell_electricity_kwh_per_kg_h2",
            f"at least {least:.1f} kWh/kg H2 (two electrons per H2 at the reversible cell voltage "
            f"{chlor_alkali.STANDARD_CELL_POTENTIAL_V:.3f} V; recorded from memory), got {got:g}",
        )


def draw_limits(params: dict, inputs) -> list:
    """The floor of ``check_limits`` on numbers or arrays of draws.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``chlor_alkali.cell_electricity_kwh_per_kg_h2`` in kWh/kg H2).
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
    least = chlor_alkali.least_cell_electricity_kwh_per_kg_h2(
        chlor_alkali.STANDARD_CELL_POTENTIAL_V, inputs.molar_mass("H2")
    )
    return [
        (
            "chlor_alkali.cell_electricity_kwh_per_kg_h2",
            "at least the electricity of the reversible cell voltage",
            params["chlor_alkali"]["cell_electricity_kwh_per_kg_h2"] >= least,
        )
    ]


def validate(project) -> None:
    """Prices above zero for the three products when the burden is shared by economic value.

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
    c = project.chlor_alkali
    if c.allocation == "economic" and not (
        c.hydrogen_price_per_kg > 0 and c.chlorine_price_per_kg > 0 and c.sodium_hydroxide_price_per_kg > 0
    ):
        raise SectionError(
            "chlor_alkali.hydrogen_price_per_kg",
            "prices above 0 for hydrogen, chlorine and sodium hydroxide, for allocation 'economic'",
        )


def metered(params: dict) -> dict[str, list[str]]:
    """Parameter paths of the chlor-alkali plant scaled by metered electricity.

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
    return {"electricity": ["chlor_alkali.cell_electricity_kwh_per_kg_h2"]}


def starter(product: str) -> str:
    """The ``[chlor_alkali]`` and ``[electricity]`` sections of a starter project file.

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
[chlor_alkali]
cell_electricity_kwh_per_kg_h2 = 88.0   # cells and plant per kg H2 (about 2,500 kWh/t Cl2 x 35.2 kg Cl2/kg H2)
allocation = "mass"                     # none | mass | economic (then the three prices)
"""
    return text + electricity_starter(product, grid=True)


ROUTE = Route(
    name="chlor_alkali_by_product",
    kind="hydrogen_route",
    stages=("hydrogen_production",),
    applies=lambda params: params["hydrogen"]["route"] == "chlor_alkali_by_product",
    build=build,
    sections={"chlor_alkali": ChlorAlkali},
    validate=validate,
    check_limits=check_limits,
    draw_limits=draw_limits,
    metered=metered,
    starter=starter,
    description="By-product hydrogen of chlor-alkali electrolysis, shared with chlorine and sodium hydroxide",
    co_product=CoProduct(
        name="chlorine and sodium hydroxide",
        parameter="chlor_alkali.allocation",
        methods=("none", "mass", "economic"),
        carries_energy=False,  # neither has a heating value
        rigid=True,  # 2 NaCl + 2 H2O -> Cl2 + H2 + 2 NaOH: fixed ratio
        missing=lambda params, method: (
            "chlor_alkali prices of hydrogen, chlorine and sodium hydroxide"
            if method == "economic"
            and not all(
                params["chlor_alkali"][k] > 0
                for k in ("hydrogen_price_per_kg", "chlorine_price_per_kg", "sodium_hydroxide_price_per_kg")
            )
            else ""
        ),
    ),
)
