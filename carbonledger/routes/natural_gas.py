"""Natural gas supply: upstream methane loss and upstream CO2 per GJ delivered.

Any route module that burns natural gas draws it from the activity ``natural_gas_supply`` this
module builds; the project then needs a ``[natural_gas]`` section.
"""

from __future__ import annotations

from typing import Literal

from ..model.project import P, Section
from ..stages import natural_gas
from .base import Activity, Route


class NaturalGas(Section):
    methane_emission_share: float = P(
        unit="fraction",
        description="Methane emitted upstream (production, processing, transmission), "
        "as a share on the basis of methane_emission_basis",
        ge=0,
        lt=1,
    )
    methane_emission_basis: Literal[natural_gas.METHANE_EMISSION_BASES] = P(
        description="What the share is of: methane_delivered | methane_produced (a published "
        "methane intensity of production) | gas_delivered_by_mass"
    )
    upstream_co2_factor: str = P("natural_gas.upstream_co2", description="Factor id of upstream CO2 (non-methane)")


def build(params: dict, inputs, chain) -> list[Activity]:
    """Activity of natural gas delivered, per GJ (LHV): upstream methane emitted (on the project's basis)
    and upstream CO2.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``natural_gas.methane_emission_share``, a fraction).
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.
    chain : Chain
        What the route modules before this one left: the reference activity and its product, the place,
        shared fuel supplies (``extra``) and figures.

    Returns
    -------
    list of Activity
        The activities it adds; their exchanges are amounts per unit of each activity (GJ).

    References
    ----------
    .. [1] IPCC (2006). 2006 IPCC Guidelines, Vol. 2, Ch. 1, Table 1.2 (net calorific values).
    .. [2] Alvarez, R. A. et al. (2018). Science 361, 186-188 (methane intensity of production).
    """
    gas = params["natural_gas"]
    activity = Activity("natural_gas_supply", "natural_gas_supply", "natural gas, delivered", "GJ")
    leak = natural_gas.methane_emitted_kg_ch4_per_gj(
        gas["methane_emission_share"],
        gas["methane_emission_basis"],
        inputs.factor("natural_gas.net_calorific_value", "TJ/Gg"),
        inputs.factor("natural_gas.methane_mass_fraction", "kg CH4/kg"),
    )
    activity.emit("ch4_fossil", leak, "methane lost upstream")
    activity.emit(
        "co2_fossil",
        inputs.factor(gas["upstream_co2_factor"], "kg CO2/GJ", "natural_gas.upstream_co2_factor"),
        "upstream CO2 (processing, compression, flaring)",
    )
    return [activity]


def starter(product: str) -> str:
    """The ``[natural_gas]`` section of a starter project file.

    Parameters
    ----------
    product : str
        The project's product, ``hydrogen`` or ``ammonia``.

    Returns
    -------
    str
        TOML text of the sections, with example numbers for ``carbonledger init`` to mark as placeholders.
    """
    return """
[natural_gas]
methane_emission_share = 0.01        # methane emitted upstream, as a share of ...
methane_emission_basis = "methane_delivered"   # methane_delivered | methane_produced | gas_delivered_by_mass
upstream_co2_factor = "natural_gas.upstream_co2"
"""


ROUTE = Route(
    name="natural_gas",
    kind="supply",
    stages=("natural_gas_supply",),
    applies=lambda params: params.get("natural_gas") is not None,
    build=build,
    optional_sections={"natural_gas": NaturalGas},
    starter=starter,
    description="Natural gas delivered to the project, with its upstream methane and CO2",
)
