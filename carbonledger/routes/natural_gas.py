"""Natural gas supply: upstream methane loss and upstream CO2 per GJ delivered.

Any route module that burns natural gas draws it from the activity ``natural_gas_supply`` this
module builds; the project then needs a ``[natural_gas]`` section.
"""

from __future__ import annotations

from ..model.project import P, Section
from ..stages import natural_gas
from .base import Activity, Route


class NaturalGas(Section):
    methane_loss_rate: float = P(unit="fraction of gas delivered", description="Methane lost upstream (production, processing, transmission)", ge=0, lt=1)
    upstream_co2_factor: str = P("natural_gas.upstream_co2", description="Factor id of upstream CO2 (non-methane)")


def build(params: dict, inputs, chain) -> list[Activity]:
    gas = params["natural_gas"]
    activity = Activity("natural_gas_supply", "natural_gas_supply", "natural gas, delivered", "GJ")
    leak = natural_gas.methane_leak_kg_ch4_per_gj(
        gas["methane_loss_rate"],
        inputs.factor("natural_gas.net_calorific_value", "TJ/Gg"),
        inputs.factor("natural_gas.methane_mass_fraction", "kg CH4/kg"),
    )
    activity.emit("ch4_fossil", leak, "methane lost upstream")
    activity.emit("co2_fossil", inputs.factor(gas["upstream_co2_factor"], "kg CO2/GJ", "natural_gas.upstream_co2_factor"), "upstream CO2 (processing, compression, flaring)")
    return [activity]


def starter(product: str) -> str:
    return """
[natural_gas]
methane_loss_rate = 0.01             # fraction of the gas delivered that is lost upstream
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
