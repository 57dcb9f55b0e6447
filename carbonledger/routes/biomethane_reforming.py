"""Hydrogen from biomethane by steam reforming, with or without capture of its (biogenic) CO2.

The reformer is modelled as for natural gas (feed and fuel in GJ LHV, a concentrated process CO2
stream and a dilute flue stream), fed with biomethane bought through a supply activity that carries
the biomethane's upstream life-cycle factor (``biomethane.upstream.*``, g CO2e/MJ). The CO2 of the
biomethane's carbon is biogenic (flow ``co2_biogenic``: characterised at zero, reported under
``biogenic_co2_kg``); methane and nitrous oxide from burning the fuel part are non-fossil CH4 and N2O
(IPCC 2006 Vol. 2 Table 2.2 gives biogas the natural-gas values, 1 kg CH4 and 0.1 kg N2O per TJ: from
memory; the natural-gas rows of the set are used). Captured CO2 that reaches storage is
``co2_biogenic_stored``: stated apart, never netted against the total; a scheme nets it only if its
rulebook says so (``nets_stored_biogenic_co2``).
"""

from __future__ import annotations

from typing import Literal

from ..model.project import P, Section
from ..stages import biomethane, capture, reforming
from .base import Activity, Route, combustion_kg_per_gj
from .electricity import starter as electricity_starter
from .reforming import methane_feed_draw_limits, refuse_below_the_energy_balance, refuse_below_the_methane_floor


class BiomethaneReforming(Section):
    biomethane_gj_per_kg_h2: float = P(unit="GJ (LHV)/kg H2", description="Biomethane as feed and fuel", gt=0)
    electricity_kwh_per_kg_h2: float = P(0.0, "kWh/kg H2", "Electricity bought by the hydrogen plant", ge=0)
    process_co2_share: float = P(
        unit="fraction",
        description="Share of the CO2 in the concentrated process stream (the rest is dilute flue CO2)",
        ge=0,
        le=1,
    )
    upstream_factor: str = P(
        description="Factor id (g CO2e/MJ) of supplying the biomethane, e.g. "
        "biomethane.upstream.biowaste_closed_digestate_offgas_combustion"
    )
    capture_rate: float = P(
        0.0, "fraction", "Fraction of the CO2 in the captured streams that is captured (0: no capture)", ge=0, le=1
    )
    capture_applies_to: Literal["process", "process_and_flue"] = P(
        "process", description="CO2 streams the capture rate applies to"
    )
    compression_kwh_per_t_co2: float = P(0.0, "kWh/t CO2", "Electricity to capture, dry and compress the CO2", ge=0)
    transport_storage_loss_fraction: float = P(
        0.0, "fraction", "Share of the captured CO2 lost in transport and storage", ge=0, le=1
    )


def build(params: dict, inputs, chain) -> list[Activity]:
    """Activities of hydrogen from reformed biomethane, per kg H2: biomethane supply with its upstream
    factor, biogenic CO2 released or captured, non-fossil CH4 and N2O of the fuel part, electricity.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``biomethane_reforming.biomethane_gj_per_kg_h2`` in GJ (LHV)/kg H2).
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.
    chain : Chain
        What the route modules before this one left: the reference activity and its product, the place,
        shared fuel supplies (``extra``) and figures.

    Returns
    -------
    list of Activity
        The activities it adds; their exchanges are amounts per unit of each activity (kg H2, GJ, kg CO2).

    References
    ----------
    .. [1] Stoichiometry CH4 + 2 H2O -> CO2 + 4 H2: at most 4 mol H2 per mol CH4 (common practice).
    .. [2] ISO/TS 19870:2023 (biogenic carbon reported separately; from memory).
    """
    b = params["biomethane_reforming"]
    gas_gj = b["biomethane_gj_per_kg_h2"]
    upstream = inputs.factor(b["upstream_factor"], "g CO2e/MJ", "biomethane_reforming.upstream_factor")
    supply = Activity("biomethane_supply", "biomethane_supply", "biomethane, produced, upgraded and delivered", "GJ")
    supply.emit(
        "co2e_precharacterised",
        biomethane.upstream_kg_co2e_per_kg_h2(1.0, upstream),
        "life-cycle CO2e of supplying the biomethane",
    )

    plant = Activity("hydrogen_production", "hydrogen_production", "hydrogen, biomethane reforming", "kg H2")
    plant.consume("biomethane_supply", gas_gj, "biomethane, feed and fuel", "GJ")
    fuel_gj = reforming.fuel_gas_gj_per_kg_h2(gas_gj, b["process_co2_share"])
    plant.emit(
        "ch4_non_fossil", fuel_gj * combustion_kg_per_gj(inputs, "ch4"), "CH4 from burning the fuel gas (non-fossil)"
    )
    plant.emit("n2o", fuel_gj * combustion_kg_per_gj(inputs, "n2o"), "N2O from burning the fuel gas")
    plant.consume(
        "electricity_mix",
        b["electricity_kwh_per_kg_h2"] + params["hydrogen"]["conditioning_kwh_per_kg_h2"],
        "electricity, plant and conditioning",
        "kWh",
    )
    per_gj = biomethane.biogenic_co2_kg_per_gj(
        inputs.molar_mass("CO2"), inputs.molar_mass("CH4"), inputs.factor("heating_value.methane.lhv", "MJ/kg")
    )
    direct = reforming.direct_co2_kg_per_kg_h2(gas_gj, per_gj)
    process = reforming.process_co2_kg_per_kg_h2(direct, b["process_co2_share"])
    flue = reforming.flue_co2_kg_per_kg_h2(direct, b["process_co2_share"])
    captured = capture.captured_co2_kg_per_kg_h2(process, flue, b["capture_rate"], b["capture_applies_to"])
    plant.emit("co2_biogenic", direct - captured, "biogenic CO2 from feed and fuel, released (counted apart)")
    # the capture activity is always built (with nothing captured at a capture rate of 0), so that the
    # structure never depends on a number (the workbook runs this on formula cells)
    plant.consume("biogenic_co2_capture", captured, "biogenic CO2 captured", "kg CO2")
    unit = Activity(
        "biogenic_co2_capture",
        "co2_capture_and_storage",
        "biogenic CO2 capture, compression, transport and storage",
        "kg CO2",
    )
    unit.consume(
        "electricity_mix",
        capture.compression_electricity_kwh_per_kg_co2(b["compression_kwh_per_t_co2"]),
        "electricity, capture and compression",
        "kWh",
    )
    loss = b["transport_storage_loss_fraction"]
    unit.emit(
        "co2_biogenic", biomethane.lost_kg(1.0, loss), "biogenic CO2 lost in transport and storage (counted apart)"
    )
    unit.emit("co2_biogenic_stored", biomethane.stored_kg(1.0, loss), "biogenic CO2 stored (stated apart; not netted)")
    return [supply, plant, unit]


def check_limits(params: dict, inputs, source: str) -> None:
    """At least one mole of methane per four moles of hydrogen (CH4 + 2 H2O -> CO2 + 4 H2), and biomethane
    plus electricity at least the hydrogen's lower heating value (energy balance, as for natural gas).

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``biomethane_reforming.biomethane_gj_per_kg_h2`` in GJ (LHV)/kg H2).
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
    """
    b = params["biomethane_reforming"]
    field = "biomethane_reforming.biomethane_gj_per_kg_h2"
    refuse_below_the_methane_floor(b["biomethane_gj_per_kg_h2"], inputs, source, field)
    refuse_below_the_energy_balance(b["biomethane_gj_per_kg_h2"], b["electricity_kwh_per_kg_h2"], inputs, source, field)


def draw_limits(params: dict, inputs) -> list:
    """The limits of ``check_limits`` on numbers or arrays of draws.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``biomethane_reforming.biomethane_gj_per_kg_h2`` in GJ (LHV)/kg H2).
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
    b = params["biomethane_reforming"]
    return methane_feed_draw_limits(
        "biomethane_reforming", b["biomethane_gj_per_kg_h2"], b["electricity_kwh_per_kg_h2"], inputs
    )


def metered(params: dict) -> dict[str, list[str]]:
    """Parameter paths of the biomethane reformer scaled by metered gas and electricity.

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
    return {"electricity": ["biomethane_reforming.electricity_kwh_per_kg_h2"]}


def starter(product: str) -> str:
    """The ``[biomethane_reforming]`` section and the supply sections of a starter project file.

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
[biomethane_reforming]
biomethane_gj_per_kg_h2 = 0.165          # feed and fuel, lower heating value (at least 0.1 GJ: 1 mol CH4 per 4 mol H2)
electricity_kwh_per_kg_h2 = 0.5
process_co2_share = 0.6                  # share of the CO2 in the concentrated process stream
upstream_factor = "biomethane.upstream.biowaste_closed_digestate_offgas_combustion"   \
# `carbonledger factors list --prefix biomethane.`
capture_rate = 0.0                       \
# of the CO2 in the streams named by capture_applies_to (biogenic CO2, stated apart)
capture_applies_to = "process"           # process | process_and_flue
compression_kwh_per_t_co2 = 110
transport_storage_loss_fraction = 0.02
""" + electricity_starter(product, grid=True)


ROUTE = Route(
    name="biomethane_reforming",
    kind="hydrogen_route",
    stages=("biomethane_supply", "hydrogen_production", "co2_capture_and_storage"),
    applies=lambda params: params["hydrogen"]["route"] == "biomethane_reforming",
    build=build,
    sections={"biomethane_reforming": BiomethaneReforming},
    check_limits=check_limits,
    draw_limits=draw_limits,
    metered=metered,
    starter=starter,
    description="Steam reforming of biomethane (biogenic CO2 counted apart; captured biogenic CO2 stated, not netted)",
)
