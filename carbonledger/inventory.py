"""Assemble the stages of a project into activities and their exchanges.

An activity produces one unit of one product (GJ of gas, kWh of electricity, kg of hydrogen,
t of ammonia, ...). Its exchanges are technosphere inputs (amounts of other activities'
products) and biosphere outputs (kg of a greenhouse gas), per unit of its product. The engine
turns the result into matrices; the workbook writes the same exchanges as formulas.

Amounts come from the stage functions, which use arithmetic only, so ``build_inventory`` runs
unchanged on floats, numpy arrays of draws, or symbolic workbook cells: the ``inputs`` object
decides what a factor value is.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

from .errors import InputError
from .factors import FactorSet
from .reference import molar_mass
from .stages import ammonia, capture, electricity, electrolysis, natural_gas, reforming

FLOWS = {
    "co2_fossil": "CO2, fossil",
    "ch4_fossil": "CH4, fossil",
    "ch4_non_fossil": "CH4, non-fossil",
    "n2o": "N2O",
    "co2e_precharacterised": "CO2e given by a life-cycle factor (not split by gas)",
    "nh3": "NH3 (ammonia slip; not a greenhouse gas, reported separately)",
}
NON_GHG_FLOWS = ("nh3",)  # in the inventory, characterised at zero, left out of by_gas

STAGES = (
    "natural_gas_supply",
    "electricity_supply",
    "hydrogen_production",
    "co2_capture_and_storage",
    "nitrogen_supply",
    "ammonia_synthesis",
    "ammonia_storage",
    "shipping",
    "cracking",
    "end_use",
)


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


class NumericInputs:
    """Factor and reference values as numbers, recording every one that is used."""

    def __init__(self, factor_set: FactorSet, source: str = "project"):
        from .units import UnitMismatch, conversion_factor

        self.factor_set = factor_set
        self.source = source  # the project file, named when one of its factor ids is unknown
        self.used: dict[str, Any] = {}
        self._convert = conversion_factor
        self._mismatch = UnitMismatch

    def _row(self, factor_id: str, where: str):
        if where != "factor" and factor_id not in self.factor_set.factors:
            raise InputError(self.source, where, f"a factor id known to set '{self.factor_set.name}', got '{factor_id}'")
        return self.factor_set.get(factor_id, where)

    def factor(self, factor_id: str, unit: str, where: str = "factor"):
        row = self._row(factor_id, where)
        self.used[factor_id] = row
        try:
            return row.value * self._convert(row.unit, unit)
        except self._mismatch as error:
            raise InputError(row.origin or self.factor_set.name, factor_id, f"a value in {unit}: {error}") from None

    def factor_unit(self, factor_id: str, where: str = "factor") -> str:
        return self._row(factor_id, where).unit

    def molar_mass(self, formula: str):
        value = molar_mass(formula)
        self.used[value.id] = value
        return value.value

    def latent_heat_ammonia(self):
        """kJ/kg at 1 atm, from CoolProp (imported only when a project needs it)."""
        from .reference import ammonia_latent_heat

        value = ammonia_latent_heat()
        self.used[value.id] = value
        return value.value

    def formation_enthalpy_ammonia(self):
        """kJ/mol, NH3(g) at 298.15 K, from the chemicals library."""
        from .reference import ammonia_formation_enthalpy

        value = ammonia_formation_enthalpy()
        self.used[value.id] = value
        return value.value


def _combustion(inputs, gas: str) -> Any:
    return natural_gas.combustion_kg_per_gj(inputs.factor(f"combustion.natural_gas.{gas}", f"kg {gas.upper()}/TJ"))


def _burn_gas(activity: Activity, inputs, gas_gj, label: str) -> None:
    """Natural gas bought and burnt on site: supply input plus its combustion emissions."""
    activity.consume("natural_gas_supply", gas_gj, f"natural gas, {label}", "GJ")
    activity.emit("co2_fossil", gas_gj * _combustion(inputs, "co2"), f"CO2 from burning natural gas, {label}")
    activity.emit("ch4_fossil", gas_gj * _combustion(inputs, "ch4"), f"CH4 from burning natural gas, {label}")
    activity.emit("n2o", gas_gj * _combustion(inputs, "n2o"), f"N2O from burning natural gas, {label}")


def _natural_gas_supply(p: dict, inputs) -> Activity:
    gas = p["natural_gas"]
    activity = Activity("natural_gas_supply", "natural_gas_supply", "natural gas, delivered", "GJ")
    leak = natural_gas.methane_leak_kg_ch4_per_gj(
        gas["methane_loss_rate"],
        inputs.factor("natural_gas.net_calorific_value", "TJ/Gg"),
        inputs.factor("natural_gas.methane_mass_fraction", "kg CH4/kg"),
    )
    activity.emit("ch4_fossil", leak, "methane lost upstream")
    activity.emit("co2_fossil", inputs.factor(gas["upstream_co2_factor"], "kg CO2/GJ", "natural_gas.upstream_co2_factor"), "upstream CO2 (processing, compression, flaring)")
    return activity


def _electricity_supply(p: dict, inputs) -> tuple[list[Activity], dict[str, str]]:
    mix = Activity("electricity_mix", "electricity_supply", "electricity, project mix", "kWh")
    activities, kinds = [mix], {}
    for name, source in p["electricity"]["sources"].items():
        key = f"electricity:{name}"
        where = f"electricity.sources.{name}.factor"
        unit = inputs.factor_unit(source["factor"], where)
        flow = "co2_fossil" if unit.replace(" ", "").startswith("gCO2/") else "co2e_precharacterised"
        target_unit = "g CO2/kWh" if flow == "co2_fossil" else "g CO2e/kWh"
        supply = Activity(key, "electricity_supply", f"electricity, {name}", "kWh")
        supply.emit(flow, electricity.source_emission_kg_per_kwh(inputs.factor(source["factor"], target_unit, where)), f"generation of electricity, {name}")
        mix.consume(key, source["share"], f"share of {name}", "kWh")
        activities.append(supply)
        kinds[key] = electricity.kind_of_source(source["factor"])
    return activities, kinds


def _hydrogen_by_reforming(p: dict, inputs) -> list[Activity]:
    route_name = p["hydrogen"]["route"].replace("_", " ")
    ref = p["reforming"]
    plant = Activity("hydrogen_production", "hydrogen_production", f"hydrogen, {route_name}", "kg H2")
    gas_gj = ref["natural_gas_gj_per_kg_h2"]
    plant.consume("natural_gas_supply", gas_gj, "natural gas, feed and fuel", "GJ")
    fuel_gj = reforming.fuel_gas_gj_per_kg_h2(gas_gj, ref["process_co2_share"])
    plant.emit("ch4_fossil", fuel_gj * _combustion(inputs, "ch4"), "CH4 from burning the fuel gas")
    plant.emit("n2o", fuel_gj * _combustion(inputs, "n2o"), "N2O from burning the fuel gas")
    plant.consume("electricity_mix", ref["electricity_kwh_per_kg_h2"] + p["hydrogen"]["conditioning_kwh_per_kg_h2"], "electricity, plant and conditioning", "kWh")
    direct = reforming.direct_co2_kg_per_kg_h2(gas_gj, _combustion(inputs, "co2"))
    process = reforming.process_co2_kg_per_kg_h2(direct, ref["process_co2_share"])
    flue = reforming.flue_co2_kg_per_kg_h2(direct, ref["process_co2_share"])
    activities = [plant]
    cap = p.get("capture")
    if cap is None:
        plant.emit("co2_fossil", direct, "CO2 from feed and fuel, released")
        return activities
    captured = capture.captured_co2_kg_per_kg_h2(process, flue, cap["capture_rate"], cap["applies_to"])
    plant.emit("co2_fossil", direct - captured, "CO2 from feed and fuel, not captured")
    plant.consume("co2_capture", captured, "CO2 captured", "kg CO2")

    unit = Activity("co2_capture", "co2_capture_and_storage", "CO2 capture and compression", "kg CO2")
    unit.consume("electricity_mix", capture.compression_electricity_kwh_per_kg_co2(cap["compression_kwh_per_t_co2"]), "electricity, capture and compression", "kWh")
    extra_gj = capture.capture_gas_gj_per_kg_co2(cap["extra_natural_gas_gj_per_t_co2"])
    extra_co2 = extra_gj * _combustion(inputs, "co2")
    extra_captured = extra_co2 * capture.captured_flue_share(cap["capture_rate"], cap["applies_to"])
    unit.consume("natural_gas_supply", extra_gj, "natural gas, capture", "GJ")
    unit.emit("co2_fossil", extra_co2 - extra_captured, "CO2 from burning natural gas for capture, not captured")
    unit.emit("ch4_fossil", extra_gj * _combustion(inputs, "ch4"), "CH4 from burning natural gas for capture")
    unit.emit("n2o", extra_gj * _combustion(inputs, "n2o"), "N2O from burning natural gas for capture")
    unit.consume("co2_transport_storage", 1.0 + extra_captured, "CO2 sent to transport and storage", "kg CO2")

    storage = Activity("co2_transport_storage", "co2_capture_and_storage", "CO2 transport and storage", "kg CO2")
    storage.emit("co2_fossil", capture.transport_storage_leak_kg_per_kg_co2(cap["transport_storage_loss_fraction"]), "CO2 lost in transport and storage")
    return activities + [unit, storage]


def _hydrogen_by_electrolysis(p: dict, inputs) -> list[Activity]:
    e = p["electrolysis"]
    plant = Activity("hydrogen_production", "hydrogen_production", f"hydrogen, {e['technology'].replace('_', ' ')} electrolysis", "kg H2")
    water_kwh = electrolysis.water_treatment_kwh_per_kg_h2(e["water_litres_per_kg_h2"], e["water_treatment_kwh_per_m3"])
    heat_kwh = e["heat_kwh_per_kg_h2"] if e["heat_source"] == "electricity" else 0.0 * e["heat_kwh_per_kg_h2"]
    plant.consume(
        "electricity_mix",
        e["electricity_kwh_per_kg_h2"] + heat_kwh + water_kwh + p["hydrogen"]["conditioning_kwh_per_kg_h2"],
        "electricity, electrolysis, heat, water treatment and conditioning",
        "kWh",
    )
    if e["heat_source"] == "natural_gas":
        _burn_gas(plant, inputs, electrolysis.heat_gas_gj_per_kg_h2(e["heat_kwh_per_kg_h2"], e["heat_boiler_efficiency"]), "boiler for electrolyser heat")
    return [plant]


def _ammonia_plant(p: dict, inputs) -> list[Activity]:
    a = p["ammonia"]
    m_h2, m_n2, m_nh3 = inputs.molar_mass("H2"), inputs.molar_mass("N2"), inputs.molar_mass("NH3")
    synthesis = Activity("ammonia_synthesis", "ammonia_synthesis", "ammonia, synthesis loop", "t NH3")
    hydrogen_kg = ammonia.with_loss_allowance(ammonia.stoichiometric_hydrogen_kg_per_t_nh3(m_h2, m_nh3), a["hydrogen_loss_allowance"])
    synthesis.consume("hydrogen_production", hydrogen_kg, "hydrogen, stoichiometric plus loss allowance", "kg H2")
    activities = [synthesis]
    if a["nitrogen_source"] == "air_separation":
        nitrogen_kg = ammonia.with_loss_allowance(ammonia.stoichiometric_nitrogen_kg_per_t_nh3(m_n2, m_nh3), a["hydrogen_loss_allowance"])
        synthesis.consume("air_separation", nitrogen_kg, "nitrogen, stoichiometric plus loss allowance", "kg N2")
        asu = Activity("air_separation", "nitrogen_supply", "nitrogen, air separation", "kg N2")
        asu.consume("electricity_mix", ammonia.air_separation_kwh_per_kg_n2(a["air_separation_kwh_per_t_n2"]), "electricity, air separation", "kWh")
        activities.append(asu)
    synthesis.consume("electricity_mix", a["synthesis_electricity_kwh_per_t_nh3"], "electricity, synthesis loop", "kWh")
    if p["natural_gas"] is not None:
        _burn_gas(synthesis, inputs, a["synthesis_natural_gas_gj_per_t_nh3"], "synthesis loop")
    store = Activity("ammonia_storage", "ammonia_storage", "ammonia, refrigerated storage and loading", "t NH3")
    store.consume("ammonia_synthesis", ammonia.ammonia_produced_per_t_delivered(a["storage_loss_fraction"]), "ammonia into storage (losses included)", "t NH3")
    store.consume("electricity_mix", a["storage_electricity_kwh_per_t_nh3"], "electricity, refrigeration and loading", "kWh")
    activities.append(store)
    return activities


def build_inventory(params: dict, inputs) -> Inventory:
    """All activities of a project, from its validated parameters (a plain nested dict)."""
    activities: list[Activity] = []
    if params.get("natural_gas") is not None:
        activities.append(_natural_gas_supply(params, inputs))
    supply, kinds = _electricity_supply(params, inputs)
    activities += supply
    if params["hydrogen"]["route"] == "electrolysis":
        activities += _hydrogen_by_electrolysis(params, inputs)
    else:
        activities += _hydrogen_by_reforming(params, inputs)
    product = params["project"]["product"]
    if product == "ammonia":
        activities += _ammonia_plant(params, inputs)
    gate = "ammonia_storage" if product == "ammonia" else "hydrogen_production"
    from .delivery import add_delivery

    delivered, reference, reference_product, functional_unit, figures = add_delivery(params, inputs, gate, product)
    activities += delivered
    return Inventory({a.key: a for a in activities}, reference, "hydrogen_production", product, kinds, gate, reference_product, functional_unit, figures)


def check_physical_limits(params: dict, inputs: NumericInputs, source: str) -> None:
    """Refuse values below what physics allows (numbers only; run before building)."""
    from .delivery import check_delivery

    check_delivery(params, inputs, source)
    route = params["hydrogen"]["route"]
    if route == "electrolysis":
        e = params["electrolysis"]
        floor = electrolysis.energy_floor_kwh_per_kg_h2(
            e["technology"],
            inputs.factor("heating_value.hydrogen.lhv", "MJ/kg"),
            inputs.factor("heating_value.hydrogen.hhv", "MJ/kg"),
        )
        energy = e["electricity_kwh_per_kg_h2"] + e["heat_kwh_per_kg_h2"]
        if energy < floor:
            basis = "lower" if e["technology"] == "solid_oxide" else "higher"
            raise InputError(
                source,
                "electrolysis.electricity_kwh_per_kg_h2",
                f"electricity plus heat of at least {floor:.2f} kWh/kg H2 (the {basis} heating value of hydrogen), got {energy:g}",
            )
        water = e["water_litres_per_kg_h2"]
        least_water = electrolysis.stoichiometric_water_kg_per_kg_h2(inputs.molar_mass("H2O"), inputs.molar_mass("H2"))
        if 0 < water < least_water:
            raise InputError(source, "electrolysis.water_litres_per_kg_h2", f"0 (not counted) or at least {least_water:.2f} L/kg H2 (stoichiometric water), got {water:g}")
    else:
        floor = reforming.stoichiometric_gas_floor_gj_per_kg_h2(
            inputs.molar_mass("CH4"), inputs.molar_mass("H2"), inputs.factor("heating_value.methane.lhv", "MJ/kg")
        )
        gas = params["reforming"]["natural_gas_gj_per_kg_h2"]
        if gas < floor:
            raise InputError(source, "reforming.natural_gas_gj_per_kg_h2", f"at least {floor:.4f} GJ/kg H2 (1 mol CH4 per 4 mol H2), got {gas:g}")
