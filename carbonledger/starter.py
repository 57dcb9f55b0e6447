"""Commented starter project files for ``carbonledger init``, one per route."""

from __future__ import annotations

ROUTE_CHOICES = {
    "steam-methane-reforming": ("steam_methane_reforming", None),
    "steam-methane-reforming-with-capture": ("steam_methane_reforming", "process_and_flue"),
    "autothermal-reforming-with-capture": ("autothermal_reforming", "process"),
    "electrolysis": ("electrolysis", None),
}

_HEADER = """\
# carbonledger project file. Every number below is a placeholder to replace with the
# project's own data; units are in the parameter names. `carbonledger params FILE` lists them.
[project]
name = "{name}"
product = "{product}"            # ammonia | hydrogen
site = ""
note = "Where the numbers come from (design documents, meters, invoices)"

[hydrogen]
route = "{route}"
conditioning_kwh_per_kg_h2 = 0.0   # compression and purification to the delivery specification
"""

_REFORMING = """
[reforming]
natural_gas_gj_per_kg_h2 = {gas}   # feed and fuel, lower heating value
electricity_kwh_per_kg_h2 = {power}
process_co2_share = {process}            # share of direct CO2 in the concentrated process stream
"""

_CAPTURE = """
[capture]
capture_rate = {rate}                  # of the CO2 in the streams named by applies_to
applies_to = "{applies_to}"     # process | process_and_flue
compression_kwh_per_t_co2 = 110
extra_natural_gas_gj_per_t_co2 = {extra}   # gas burnt for solvent regeneration, if any
transport_storage_loss_fraction = 0.02
"""

_NATURAL_GAS = """
[natural_gas]
methane_loss_rate = 0.01             # fraction of the gas delivered that is lost upstream
upstream_co2_factor = "natural_gas.upstream_co2"
"""

_ELECTROLYSIS = """
[electrolysis]
technology = "pem"                   # alkaline | pem | solid_oxide
electricity_kwh_per_kg_h2 = 54.0     # system electricity; at least the physical floor
heat_kwh_per_kg_h2 = 0.0
heat_source = "recovered"            # recovered | natural_gas | electricity
water_litres_per_kg_h2 = 0.0         # 0: water treatment not counted
water_treatment_kwh_per_m3 = 0.0
"""

_ELECTRICITY_RENEWABLE = """
# One block per source; shares sum to 1. Factor ids: `carbonledger factors list`.
[electricity.sources.solar]
share = 0.5
factor = "electricity.renewable.solar_pv_utility"

[electricity.sources.wind]
share = 0.5
factor = "electricity.renewable.wind_onshore"
"""

_ELECTRICITY_GRID = """
# One block per source; shares sum to 1. Factor ids: `carbonledger factors list`.
[electricity.sources.grid]
share = 1.0
factor = "electricity.grid.eu27_2018"
"""

_AMMONIA = """
[ammonia]
nitrogen_source = "{nitrogen}"     # air_separation | process_air (secondary reformer)
air_separation_kwh_per_t_n2 = {asu}
hydrogen_loss_allowance = 0.01       # feed above stoichiometry (purge, losses)
synthesis_electricity_kwh_per_t_nh3 = {synthesis}
synthesis_natural_gas_gj_per_t_nh3 = 0.0
storage_electricity_kwh_per_t_nh3 = 25
storage_loss_fraction = 0.001
"""


def starter_project(route_choice: str, product: str, name: str = "New project") -> str:
    route, applies_to = ROUTE_CHOICES[route_choice]
    text = _HEADER.format(name=name, product=product, route=route)
    if route == "electrolysis":
        text += _ELECTROLYSIS + _ELECTRICITY_RENEWABLE
    else:
        atr = route == "autothermal_reforming"
        text += _REFORMING.format(gas=0.158 if atr else 0.165, power=1.6 if atr else 0.3, process=0.96 if atr else 0.6)
        if applies_to:
            text += _CAPTURE.format(rate=0.95 if atr else 0.9, applies_to=applies_to, extra=0.0 if atr else 1.0)
        text += _NATURAL_GAS + _ELECTRICITY_GRID
    if product == "ammonia":
        air = route != "electrolysis" and applies_to is None
        text += _AMMONIA.format(nitrogen="process_air" if air else "air_separation", asu=0 if air else 110, synthesis=120 if air else 500)
    return text
