"""The inventory of a project: every activity with its exchanges, built by the route registry.

``build_inventory(params, inputs)`` asks each route module that takes part in the project (in
chain order: supplies, the hydrogen route, conversion to ammonia, delivery legs) for its
activities. It names no route itself. ``check_physical_limits`` asks the same modules to refuse
values that physics forbids, before anything is built.
"""

from __future__ import annotations

from dataclasses import dataclass, field

from ..routes import REGISTRY, routes_of
from ..routes.base import Activity, Chain

UNIT_OF_PRODUCT = {"ammonia": "t NH3", "hydrogen": "kg H2"}


@dataclass
class Inventory:
    activities: dict[str, Activity]
    reference: str  # the activity whose product is the functional unit
    hydrogen: str  # the hydrogen production activity (gate of the hydrogen plant)
    product: str
    electricity_kinds: dict[str, str]  # electricity activity key -> grid / renewable / ...
    gate: str = ""  # the product at the plant gate (ammonia storage, or the hydrogen plant)
    reference_product: str = ""  # product of the reference activity: ammonia or hydrogen
    functional_unit: str = ""
    delivery: dict = field(default_factory=dict)  # voyage and cracking figures
    co_products: dict = field(default_factory=dict)  # co-product, amount and how the burden was shared
    electricity_sources: dict = field(default_factory=dict)  # electricity activity key -> source name


def build_inventory(params: dict, inputs) -> Inventory:
    """All activities of a project, from its validated parameters (a plain nested dict).

    Each route module of the registry that applies builds its activities in chain order; the last
    one's reference activity is the functional unit.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its field states;
        numbers may be arrays of Monte Carlo draws.
    inputs : NumericInputs
        Factor values and reference values, each recorded as it is used.

    Returns
    -------
    Inventory
        The activities by key (exchanges per unit of each activity), the reference (functional unit) and gate
        activities, the functional unit in words, the electricity kinds and sources, the delivery figures and
        the co-products.
    """
    product = params["project"]["product"]
    chain = Chain(boundary=params["project"]["boundary"], product="hydrogen", reference="hydrogen_production")
    activities: list[Activity] = []
    gate = ""
    for route in routes_of(params):
        if route.kind == "delivery_leg" and not gate:
            gate = chain.reference
        activities += route.build(params, inputs, chain)
    gate = gate or chain.reference
    activities += chain.extra
    functional_unit = f"1 {UNIT_OF_PRODUCT[chain.product]} " + (
        "at the plant gate" if chain.boundary == "cradle-to-gate" else f"delivered {chain.place}"
    )
    if chain.boundary != "cradle-to-gate":
        if chain.product != product:
            functional_unit += ", cracked from ammonia"
        if chain.boundary == "well-to-wake":
            functional_unit += ", burnt" if chain.product == "ammonia" else ", used (hydrogen use emits no CO2)"
    return Inventory(
        {a.key: a for a in activities},
        reference=chain.reference,
        hydrogen="hydrogen_production",
        product=product,
        electricity_kinds=chain.electricity_kinds,
        gate=gate,
        reference_product=chain.product,
        functional_unit=functional_unit,
        delivery={key: value for key, value in chain.figures.items() if key != "co_products"},
        co_products=chain.figures.get("co_products", {}),
        electricity_sources=chain.electricity_sources,
    )


def check_physical_limits(params: dict, inputs, source: str) -> None:
    """Refuse values that physics or the factor set forbid (numbers only; run before building).

    Every module whose section the project has is asked, whatever the boundary (fuel names are
    checked at the plant gate too); a module checks balances beyond the gate itself.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its field states.
    inputs : NumericInputs
        Factor values and reference values, each recorded as it is used.
    source : str
        The project file's name, for the error message.

    Returns
    -------
    None
        Nothing when every limit holds.

    Raises
    ------
    InputError
        Naming the file, the field and what was expected, for the first limit broken.
    """
    for route in limit_checkers(params):
        route.check_limits(params, inputs, source)


def limit_checkers(params: dict) -> list:
    """The route modules that check a project's limits: those that apply to it or whose section it has.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``).

    Returns
    -------
    list of Route
        In registry order (the same for every project of one shape, ``core.stacked.shape_of``).
    """
    return [
        route
        for route in REGISTRY
        if route.applies(params) or any(params.get(name) is not None for name in route.section_names)
    ]
