"""What every route and delivery leg is made of: activities with exchanges, and the Route record.

A route module (a production route, a supply, a conversion or a delivery leg) declares one
``Route``: the project-file sections it owns (pydantic models), the stages it builds, the
activities and exchanges it adds to the inventory (stage functions on plain values), its
physical limits, the parameters metered operation scales, and its starter text for
``carbonledger init``. The registry (``carbonledger.routes``) lists them; the inventory,
validation, periods, ``init`` and lifetime loop over it.
"""

from __future__ import annotations

import functools
from collections.abc import Callable
from dataclasses import dataclass, field
from typing import Any

from ..model.units import split_substance
from ..stages import electricity, natural_gas


@dataclass
class Exchange:
    input: str  # activity key (technosphere) or flow key (biosphere)
    amount: Any
    kind: str  # "technosphere" or "biosphere"
    label: str
    unit: str


@dataclass
class Activity:
    key: str
    stage: str
    name: str
    unit: str
    exchanges: list[Exchange] = field(default_factory=list)

    def consume(self, supplier: str, amount, label: str, unit: str) -> None:
        self.exchanges.append(Exchange(supplier, amount, "technosphere", label, unit))

    def emit(self, flow: str, amount, label: str) -> None:
        self.exchanges.append(Exchange(flow, amount, "biosphere", label, f"kg {flow}"))


class SectionError(ValueError):
    """A rule across sections was broken: names the field and what was expected."""

    def __init__(self, field: str, expected: str):
        self.field, self.expected = field, expected
        super().__init__(expected)


def _nothing(*_args, **_kwargs) -> None:
    return None


def _never(_project) -> bool:
    return False


@dataclass
class Chain:
    """What the inventory builder carries from one route module to the next.

    ``reference`` is the activity whose product is the functional unit so far (the gate product,
    then each delivery leg's), ``product`` its product (ammonia or hydrogen), ``place`` where it
    is (text for the functional unit), ``extra`` activities shared by legs (fuel supplies),
    ``figures`` the legs' own figures (voyage, cracking), ``electricity_kinds`` the kind of each
    electricity source activity (grid, renewable).
    """

    boundary: str
    product: str
    reference: str = ""
    place: str = "at the plant gate (no voyage in the project)"
    extra: list = field(default_factory=list)
    figures: dict = field(default_factory=dict)
    electricity_kinds: dict = field(default_factory=dict)
    electricity_sources: dict = field(default_factory=dict)  # electricity activity key -> source name
    # the activity a leg draws electricity from where it is (after cracking: the destination's)
    electricity: str = "electricity_mix"


@dataclass(frozen=True)
class CoProduct:
    """A route's co-product and how its burden-sharing method is chosen in the project file.

    ``parameter``: the project path of the method (``section.field``); ``methods``: the co-product
    rules (energy, mass, economic, system_expansion, none) the route can apply; ``carries_energy``:
    the co-product has a heating value; ``rigid``: the ratio of outputs is fixed by the process;
    ``missing``: (params, method) -> what the project must add to apply the method ('' if nothing).
    """

    name: str
    parameter: str
    methods: tuple[str, ...]
    carries_energy: bool
    rigid: bool
    missing: Callable[[dict, str], str] = lambda params, method: ""


@dataclass(frozen=True)
class Route:
    """One production route, supply, conversion or delivery leg, as the registry sees it.

    ``sections``: project-file sections it owns (name -> pydantic model), required when the
    route applies. ``optional_sections``: sections it may take. ``applies``: (params) -> whether
    the route is part of this project. ``build``: (params, inputs, chain) -> list of activities;
    a delivery leg also moves ``chain.reference`` to its own activity.
    ``check_limits``: (params, inputs, source) -> None, raises ``InputError``. ``validate``:
    (project) -> None, raises ``SectionError`` for rules across sections. ``draw_limits``:
    (params, inputs) -> [(field, expected, ok)], the numeric limits of ``check_limits`` as
    arithmetic, where ``ok`` is a bool or a bool array over Monte Carlo draws (a route whose
    limits compare numbers declares it, so that draws are checked without a loop). ``metered``: parameter
    paths scaled by metered electricity and natural gas in operating periods (a callable of the
    params, since some depend on text options). ``ageing``: the parameter path that stack ageing
    raises over a lifetime. ``starter``: (product) -> the sections of a starter project file
    after ``[project]`` and ``[hydrogen]`` (for ``carbonledger init``); ``starter_variants``: more
    ``init --route`` choices of the same route (name -> starter). ``co_product``: the route's
    co-product and the parameter that chooses how its burden is shared (``CoProduct``).
    """

    name: str
    kind: str  # "hydrogen_route", "supply", "conversion", "delivery_leg"
    stages: tuple[str, ...]
    applies: Callable[[dict], bool]
    build: Callable[..., Any]
    sections: dict[str, type] = field(default_factory=dict)
    optional_sections: dict[str, type] = field(default_factory=dict)
    validate: Callable[[Any], None] = _nothing
    check_limits: Callable[..., None] = _nothing
    draw_limits: Callable[..., list] | None = None
    uses_natural_gas: Callable[[Any], bool] = _never
    metered: Callable[[dict], dict[str, list[str]]] = lambda params: {}
    ageing: str = ""
    starter: Callable[..., str] = lambda *args: ""
    starter_variants: dict[str, Callable[..., str]] = field(default_factory=dict)
    description: str = ""
    co_product: CoProduct | None = None  # a co-product whose burden share a scheme's rulebook may decide

    @functools.cached_property
    def section_names(self) -> tuple[str, ...]:
        """The sections it owns and takes, named once."""
        return tuple({**self.sections, **self.optional_sections})


def combustion_kg_per_gj(inputs, gas: str) -> Any:
    """kg of a gas per GJ of natural gas burnt, from the factor set's IPCC default (kg/TJ).

    Parameters
    ----------
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.
    gas : str
        ``co2``, ``ch4`` or ``n2o`` (the factor ``combustion.natural_gas.<gas>``).

    Returns
    -------
    float or ndarray
        Emission, kg of the gas per GJ (LHV) of natural gas burnt.

    References
    ----------
    .. [1] IPCC (2006). 2006 IPCC Guidelines, Vol. 2, Ch. 2, Table 2.2 (stationary combustion).
    """
    return natural_gas.combustion_kg_per_gj(inputs.factor(f"combustion.natural_gas.{gas}", f"kg {gas.upper()}/TJ"))


def burn_natural_gas(activity: Activity, inputs, gas_gj, label: str) -> None:
    """Natural gas bought and burnt on site: supply input plus its combustion emissions.

    Parameters
    ----------
    activity : Activity
        The activity that burns the gas (exchanges added to it).
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.
    gas_gj : float or ndarray
        Natural gas burnt, GJ (LHV) per unit of the activity.
    label : str
        What the gas is burnt for, in the exchanges' labels.

    Returns
    -------
    None
        The exchanges are added to ``activity``.

    References
    ----------
    .. [1] IPCC (2006). 2006 IPCC Guidelines, Vol. 2, Ch. 2, Table 2.2 (stationary combustion).
    """
    activity.consume("natural_gas_supply", gas_gj, f"natural gas, {label}", "GJ")
    activity.emit("co2_fossil", gas_gj * combustion_kg_per_gj(inputs, "co2"), f"CO2 from burning natural gas, {label}")
    activity.emit("ch4_fossil", gas_gj * combustion_kg_per_gj(inputs, "ch4"), f"CH4 from burning natural gas, {label}")
    activity.emit("n2o", gas_gj * combustion_kg_per_gj(inputs, "n2o"), f"N2O from burning natural gas, {label}")


def electricity_flow(inputs, factor_id: str, where: str) -> tuple[str, Any]:
    """(flow, kg per kWh) of an electricity factor.

    A factor whose unit names CO2 (``g CO2/kWh``, ``lb CO2/MWh``, ``t CO2/MWh``) counts as fossil
    CO2; one that names CO2e (``g CO2e/kWh``, ``kg CO2e/kWh``) as pre-characterised CO2e. Any
    energy and mass units pint knows are converted to g/kWh.

    Parameters
    ----------
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.
    factor_id : str
        Id of the electricity factor (``electricity.*``).
    where : str
        The project field that named the factor, for an error message.

    Returns
    -------
    tuple of (str, float or ndarray)
        The flow (``co2_fossil`` or ``co2e_precharacterised``) and its amount, kg per kWh.
    """
    unit = inputs.factor_unit(factor_id, where)
    direct = split_substance(unit)[1] == ("CO2",)
    factor = inputs.factor(factor_id, "g CO2/kWh" if direct else "g CO2e/kWh", where)
    return ("co2_fossil" if direct else "co2e_precharacterised"), electricity.source_emission_kg_per_kwh(factor)
