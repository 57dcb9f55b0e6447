"""Hydrogen from natural gas: steam methane reforming (with or without capture) and
autothermal reforming with capture.

Both routes share the ``[reforming]`` section and the optional ``[capture]`` section; autothermal
reforming is modelled with capture only.
"""

from __future__ import annotations

from typing import Literal, Optional

from ..errors import InputError
from ..model.project import P, Section
from ..stages import capture, reforming
from .ammonia import starter as ammonia_starter
from .base import Activity, Route, SectionError, combustion_kg_per_gj
from .electricity import starter as electricity_starter
from .natural_gas import starter as natural_gas_starter


class Reforming(Section):
    natural_gas_gj_per_kg_h2: float = P(unit="GJ (LHV)/kg H2", description="Natural gas as feed and fuel", gt=0)
    electricity_kwh_per_kg_h2: float = P(
        0.0, "kWh/kg H2", "Electricity bought by the hydrogen plant (oxygen plant included for ATR)", ge=0
    )
    process_co2_share: float = P(
        unit="fraction",
        description="Share of the direct CO2 that is concentrated process CO2 (the rest is dilute flue CO2)",
        ge=0,
        le=1,
    )


class Capture(Section):
    capture_rate: float = P(
        unit="fraction", description="Fraction of the CO2 in the captured streams that is captured", ge=0, le=1
    )
    applies_to: Literal["process", "process_and_flue"] = P(description="CO2 streams the capture rate applies to")
    compression_kwh_per_t_co2: float = P(
        unit="kWh/t CO2", description="Electricity to capture, dry and compress the CO2", ge=0
    )
    extra_natural_gas_gj_per_t_co2: float = P(
        0.0, "GJ (LHV)/t CO2", "Natural gas burnt for capture (solvent regeneration)", ge=0
    )
    transport_storage_loss_fraction: float = P(
        unit="fraction", description="Share of the captured CO2 lost in transport and storage", ge=0, le=1
    )
    claims_45q: Optional[bool] = P(
        None,
        description="Whether a 26 U.S.C. 45Q credit is allowed for this capture equipment "
        "for the year or an earlier year (45V(d)(2) then denies 45V)",
    )


def build(params: dict, inputs, chain) -> list[Activity]:
    """Activities of hydrogen from steam methane or autothermal reforming, per kg H2: gas and electricity,
    CO2 released, and with ``[capture]`` the capture unit and CO2 transport and storage.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``reforming.natural_gas_gj_per_kg_h2`` in GJ (LHV)/kg H2).
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.
    chain : Chain
        What the route modules before this one left: the reference activity and its product, the place,
        shared fuel supplies (``extra``) and figures.

    Returns
    -------
    list of Activity
        The activities it adds; their exchanges are amounts per unit of each activity (kg H2, kg CO2).

    References
    ----------
    .. [1] IPCC (2006). 2006 IPCC Guidelines, Vol. 2, Ch. 2, Table 2.2 (combustion factors).
    """
    route_name = params["hydrogen"]["route"].replace("_", " ")
    ref = params["reforming"]
    plant = Activity("hydrogen_production", "hydrogen_production", f"hydrogen, {route_name}", "kg H2")
    gas_gj = ref["natural_gas_gj_per_kg_h2"]
    plant.consume("natural_gas_supply", gas_gj, "natural gas, feed and fuel", "GJ")
    fuel_gj = reforming.fuel_gas_gj_per_kg_h2(gas_gj, ref["process_co2_share"])
    plant.emit("ch4_fossil", fuel_gj * combustion_kg_per_gj(inputs, "ch4"), "CH4 from burning the fuel gas")
    plant.emit("n2o", fuel_gj * combustion_kg_per_gj(inputs, "n2o"), "N2O from burning the fuel gas")
    plant.consume(
        "electricity_mix",
        ref["electricity_kwh_per_kg_h2"] + params["hydrogen"]["conditioning_kwh_per_kg_h2"],
        "electricity, plant and conditioning",
        "kWh",
    )
    direct = reforming.direct_co2_kg_per_kg_h2(gas_gj, combustion_kg_per_gj(inputs, "co2"))
    process = reforming.process_co2_kg_per_kg_h2(direct, ref["process_co2_share"])
    flue = reforming.flue_co2_kg_per_kg_h2(direct, ref["process_co2_share"])
    cap = params.get("capture")
    if cap is None:
        plant.emit("co2_fossil", direct, "CO2 from feed and fuel, released")
        return [plant]
    captured = capture.captured_co2_kg_per_kg_h2(process, flue, cap["capture_rate"], cap["applies_to"])
    plant.emit("co2_fossil", direct - captured, "CO2 from feed and fuel, not captured")
    plant.consume("co2_capture", captured, "CO2 captured", "kg CO2")

    unit = Activity("co2_capture", "co2_capture_and_storage", "CO2 capture and compression", "kg CO2")
    unit.consume(
        "electricity_mix",
        capture.compression_electricity_kwh_per_kg_co2(cap["compression_kwh_per_t_co2"]),
        "electricity, capture and compression",
        "kWh",
    )
    extra_gj = capture.capture_gas_gj_per_kg_co2(cap["extra_natural_gas_gj_per_t_co2"])
    extra_co2 = extra_gj * combustion_kg_per_gj(inputs, "co2")
    extra_captured = extra_co2 * capture.captured_flue_share(cap["capture_rate"], cap["applies_to"])
    unit.consume("natural_gas_supply", extra_gj, "natural gas, capture", "GJ")
    unit.emit("co2_fossil", extra_co2 - extra_captured, "CO2 from burning natural gas for capture, not captured")
    unit.emit("ch4_fossil", extra_gj * combustion_kg_per_gj(inputs, "ch4"), "CH4 from burning natural gas for capture")
    unit.emit("n2o", extra_gj * combustion_kg_per_gj(inputs, "n2o"), "N2O from burning natural gas for capture")
    unit.consume("co2_transport_storage", 1.0 + extra_captured, "CO2 sent to transport and storage", "kg CO2")

    storage = Activity("co2_transport_storage", "co2_capture_and_storage", "CO2 transport and storage", "kg CO2")
    storage.emit(
        "co2_fossil",
        capture.transport_storage_leak_kg_per_kg_co2(cap["transport_storage_loss_fraction"]),
        "CO2 lost in transport and storage",
    )
    return [plant, unit, storage]


def refuse_below_the_methane_floor(gas_gj_per_kg_h2: float, inputs, source: str, field: str) -> None:
    """At least one mole of methane per four moles of hydrogen (CH4 + 2 H2O -> CO2 + 4 H2), for any methane feed.

    Parameters
    ----------
    gas_gj_per_kg_h2 : float or ndarray
        Methane feed and fuel, GJ (LHV) per kg H2.
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.
    source : str
        The project file's name, for the error message.
    field : str
        The parameter path named in the error.

    Returns
    -------
    None
        Nothing when the feed is at least the floor.

    Raises
    ------
    InputError
        When the feed is below the floor.

    References
    ----------
    .. [1] Stoichiometry CH4 + 2 H2O -> CO2 + 4 H2: at most 4 mol H2 per mol CH4 (common practice).
    """
    floor = reforming.stoichiometric_gas_floor_gj_per_kg_h2(
        inputs.molar_mass("CH4"), inputs.molar_mass("H2"), inputs.factor("heating_value.methane.lhv", "MJ/kg")
    )
    if gas_gj_per_kg_h2 < floor:
        raise InputError(
            source, field, f"at least {floor:.4f} GJ/kg H2 (1 mol CH4 per 4 mol H2), got {gas_gj_per_kg_h2:g}"
        )


def check_limits(params: dict, inputs, source: str) -> None:
    """The methane floor, and gas plus electricity at least the hydrogen's lower heating value.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``reforming.natural_gas_gj_per_kg_h2`` in GJ (LHV)/kg H2).
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
    .. [1] Stoichiometry CH4 + 2 H2O -> CO2 + 4 H2: at most 4 mol H2 per mol CH4 (common practice).
    .. [2] US DOE HyARC, Lower and Higher Heating Values of Fuels (hydrogen LHV).
    """
    gas = params["reforming"]["natural_gas_gj_per_kg_h2"]
    refuse_below_the_methane_floor(gas, inputs, source, "reforming.natural_gas_gj_per_kg_h2")
    refuse_below_the_energy_balance(
        gas, params["reforming"]["electricity_kwh_per_kg_h2"], inputs, source, "reforming.natural_gas_gj_per_kg_h2"
    )


def draw_limits(params: dict, inputs) -> list:
    """The stoichiometric floor and the energy balance of ``check_limits`` on numbers or arrays of draws.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``reforming.natural_gas_gj_per_kg_h2`` in GJ (LHV)/kg H2).
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
    ref = params["reforming"]
    return methane_feed_draw_limits(
        "reforming", ref["natural_gas_gj_per_kg_h2"], ref["electricity_kwh_per_kg_h2"], inputs
    )


def methane_feed_draw_limits(section: str, gas_gj_per_kg_h2, electricity_kwh_per_kg_h2, inputs) -> list:
    """(field, expected, ok) of a methane reformer: 1 mol CH4 per 4 mol H2, and gas plus electricity at least
    the hydrogen's lower heating value; arithmetic only, so ``ok`` is an array over draws.

    Parameters
    ----------
    section : str
        The section of the feed (``reforming`` or ``biomethane_reforming``).
    gas_gj_per_kg_h2 : float or ndarray
        Methane feed and fuel, GJ (LHV) per kg H2.
    electricity_kwh_per_kg_h2 : float or ndarray
        Electricity bought, kWh per kg H2.
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.

    Returns
    -------
    list of tuple
        ``(field, expected, ok)`` for the floor and the energy balance.

    References
    ----------
    .. [1] Stoichiometry CH4 + 2 H2O -> CO2 + 4 H2: at most 4 mol H2 per mol CH4 (common practice).
    .. [2] US DOE HyARC, Lower and Higher Heating Values of Fuels (hydrogen LHV).
    """
    floor = reforming.stoichiometric_gas_floor_gj_per_kg_h2(
        inputs.molar_mass("CH4"), inputs.molar_mass("H2"), inputs.factor("heating_value.methane.lhv", "MJ/kg")
    )
    energy_in = reforming.energy_in_mj_per_kg_h2(gas_gj_per_kg_h2, electricity_kwh_per_kg_h2)
    field = f"{section}.{'biomethane' if section == 'biomethane_reforming' else 'natural_gas'}_gj_per_kg_h2"
    return [
        (field, "at least the stoichiometric floor (1 mol CH4 per 4 mol H2)", gas_gj_per_kg_h2 >= floor),
        (
            field,
            "gas plus electricity of at least the hydrogen's lower heating value (energy balance)",
            energy_in >= inputs.factor("heating_value.hydrogen.lhv", "MJ/kg"),
        ),
    ]


def refuse_below_the_energy_balance(
    gas_gj_per_kg_h2: float, electricity_kwh_per_kg_h2: float, inputs, source: str, field: str
) -> None:
    """Gas plus electricity bought at least the hydrogen's lower heating value (first law, no imported heat).

    Parameters
    ----------
    gas_gj_per_kg_h2 : float or ndarray
        Methane feed and fuel, GJ (LHV) per kg H2.
    electricity_kwh_per_kg_h2 : float or ndarray
        Electricity bought, kWh per kg H2.
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.
    source : str
        The project file's name, for the error message.
    field : str
        The parameter path named in the error.

    Returns
    -------
    None
        Nothing when the energy bought is at least the hydrogen's LHV.

    Raises
    ------
    InputError
        Stating the least gas with this electricity.

    References
    ----------
    .. [1] US DOE HyARC, Lower and Higher Heating Values of Fuels (hydrogen LHV).
    """
    hydrogen_lhv = inputs.factor("heating_value.hydrogen.lhv", "MJ/kg")
    energy_in = reforming.energy_in_mj_per_kg_h2(gas_gj_per_kg_h2, electricity_kwh_per_kg_h2)
    if energy_in < hydrogen_lhv:
        least = (hydrogen_lhv - energy_in) / 1000.0 + gas_gj_per_kg_h2
        raise InputError(
            source,
            field,
            f"gas plus electricity of at least the hydrogen's lower heating value, {hydrogen_lhv:g} MJ/kg (energy "
            f"balance, no imported heat): at least {least:.4f} GJ/kg "
            f"H2 with this electricity, got {gas_gj_per_kg_h2:g}",
        )


def metered(params: dict) -> dict[str, list[str]]:
    """Parameter paths of the reformer (and capture) scaled by metered gas and electricity.

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
    paths = {
        "natural_gas": ["reforming.natural_gas_gj_per_kg_h2"],
        "electricity": ["reforming.electricity_kwh_per_kg_h2"],
    }
    if params.get("capture") is not None:
        paths["electricity"].append("capture.compression_kwh_per_t_co2")
    return paths


def uses_natural_gas(project) -> bool:
    """Reforming always uses natural gas.

    Parameters
    ----------
    project : Project
        The validated project (its sections as pydantic models).

    Returns
    -------
    bool
        True when the route burns or converts natural gas (a ``[natural_gas]`` section is then needed).
    """
    return True


def _starter(atr: bool, applies_to: str | None):
    def text(product: str) -> str:
        out = f"""
[reforming]
natural_gas_gj_per_kg_h2 = {0.158 if atr else 0.165}   # feed and fuel, lower heating value
electricity_kwh_per_kg_h2 = {1.6 if atr else 0.3}
process_co2_share = {0.96 if atr else 0.6}            # share of direct CO2 in the concentrated process stream
"""
        if applies_to:
            out += f"""
[capture]
capture_rate = {0.95 if atr else 0.9}                  # of the CO2 in the streams named by applies_to
applies_to = "{applies_to}"     # process | process_and_flue
compression_kwh_per_t_co2 = 110
extra_natural_gas_gj_per_t_co2 = {0.0 if atr else 1.0}   # gas burnt for solvent regeneration, if any
transport_storage_loss_fraction = 0.02
# claims_45q = false             \
# true if a 26 U.S.C. 45Q credit is allowed for this capture equipment (45V then denies its credit)
"""
        out += natural_gas_starter(product) + electricity_starter(product, grid=True)
        if product == "ammonia":
            out += ammonia_starter(product, process_air=applies_to is None)
        return out

    return text


def _needs_capture(project) -> None:
    if project.capture is None:
        raise SectionError("capture", "a [capture] section: autothermal reforming is modelled with capture")


STEAM_METHANE_REFORMING = Route(
    name="steam_methane_reforming",
    kind="hydrogen_route",
    stages=("hydrogen_production", "co2_capture_and_storage"),
    applies=lambda params: params["hydrogen"]["route"] == "steam_methane_reforming",
    build=build,
    sections={"reforming": Reforming},
    optional_sections={"capture": Capture},
    check_limits=check_limits,
    draw_limits=draw_limits,
    uses_natural_gas=uses_natural_gas,
    metered=metered,
    starter=_starter(False, None),
    starter_variants={"steam_methane_reforming_with_capture": _starter(False, "process_and_flue")},
    description="Steam methane reforming of natural gas (grey; blue with [capture])",
)

AUTOTHERMAL_REFORMING = Route(
    name="autothermal_reforming",
    kind="hydrogen_route",
    stages=("hydrogen_production", "co2_capture_and_storage"),
    applies=lambda params: params["hydrogen"]["route"] == "autothermal_reforming",
    build=build,
    sections={"reforming": Reforming, "capture": Capture},
    validate=_needs_capture,
    check_limits=check_limits,
    draw_limits=draw_limits,
    uses_natural_gas=uses_natural_gas,
    metered=metered,
    starter=_starter(True, "process"),
    starter_variants={"autothermal_reforming_with_capture": _starter(True, "process")},
    description="Autothermal reforming of natural gas with CO2 capture (blue)",
)
