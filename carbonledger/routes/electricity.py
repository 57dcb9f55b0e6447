"""Electricity supply: the project's mix of named sources, each with its own emission factor."""

from __future__ import annotations

from typing import Literal, Optional

from pydantic import Field, model_validator

from ..errors import InputError, did_you_mean
from ..model.project import IsoDate, P, Section
from ..stages import electricity
from .base import Activity, Route, electricity_flow


class ElectricitySource(Section):
    share: float = P(unit="fraction", description="Share of the electricity bought", ge=0, le=1)
    factor: str = P(description="Factor id of the source's emission factor")
    procurement: Optional[Literal["direct_line", "ppa", "certificates", "grid"]] = P(
        None,
        description="How the electricity is procured: direct_line | ppa "
        "| certificates | grid (schemes decide what counts)",
    )
    commissioned: IsoDate = P("", "date", "Date the generator came into operation (YYYY-MM-DD; additionality)")
    zone: str = P("", description="Bidding zone or region of the generator (geographic correlation)")
    supported: Optional[bool] = P(None, description="Whether the generator received operating or investment aid")
    matched: Optional[Literal["annual", "monthly", "hourly", "half_hourly"]] = P(
        None, description="Period over which the contracted generation is declared matched with consumption"
    )


class Battery(Section):
    """A battery that stores surplus electricity of one source and delivers it to the plant when that
    source alone would not cover its use, displacing the other sources; its round-trip losses are bought
    from the charging source as extra electricity (``stages.electricity``)."""

    charged_from: str = P(
        description="The source whose electricity the battery stores (a source "
        "of [electricity.sources] with a share above 0)"
    )
    capacity_kwh: float = P(0.0, "kWh", "Usable energy capacity", ge=0)
    full_cycles_per_year: float = P(
        unit="1/year",
        description="Full charge-discharge cycles a year (each delivers the usable capacity once)",
        gt=0,
        le=8760,
    )
    round_trip_efficiency: float = P(
        unit="fraction",
        description="Energy delivered over energy charged (no default: from the battery's data sheet)",
        gt=0,
        le=1,
    )
    electricity_kwh_per_year: float = P(
        unit="kWh/year", description="The plant's electricity use a year (the battery delivers a share of it)", gt=0
    )


class Electricity(Section):
    sources: dict[str, ElectricitySource] = Field(
        min_length=1, max_length=100, description="Named sources of electricity (at most 100)"
    )
    battery: Optional[Battery] = Field(None, description="A battery charged from one source (optional)")
    time_series: str = P(
        "",
        description="CSV of intervals (electricity use, contracted generation, grid intensity, price), relative "
        "to the project file; scheme checks then match hour by hour or as each rule says",
    )

    @model_validator(mode="after")
    def _shares_sum_to_one(self):
        total = sum(source.share for source in self.sources.values())
        if abs(total - 1.0) > 1e-6:
            raise ValueError(f"source shares summing to 1, got {total:g}")
        if self.battery is not None:
            self._battery_fits()
        kinds = {name: electricity.kind_of_source(source.factor) for name, source in self.sources.items()}
        if {"grid", "residual_mix"} <= set(kinds.values()):
            mixed = ", ".join(f"{name} ({kind})" for name, kind in kinds.items() if kind in ("grid", "residual_mix"))
            raise ValueError(
                f"one accounting basis: location-based grid rows (electricity.grid.*) and market-based residual mixes "
                f"(electricity.residual_mix.*) are not mixed in one project, got {mixed}"
            )
        return self

    def _battery_fits(self) -> None:
        battery = self.battery
        if battery.charged_from not in self.sources:
            raise ValueError(
                f"battery.charged_from naming a source of [electricity.sources] ({', '.join(self.sources)}), "
                f"got '{battery.charged_from}'{did_you_mean(battery.charged_from, self.sources)}"
            )
        if self.time_series:
            raise ValueError(
                "a battery without a time_series (the hour-by-hour matching does "
                "not model storage; the series' own load and generation decide)"
            )
        charged = self.sources[battery.charged_from].share
        delivered = electricity.battery_delivered_share(
            battery.capacity_kwh, battery.full_cycles_per_year, battery.electricity_kwh_per_year
        )
        if delivered > 0 and not 0 < charged < 1:
            raise ValueError(
                "battery.charged_from a source with a share above 0 and below 1 (it stores that source's electricity "
                f"for the hours the others would supply), '{battery.charged_from}' has {charged:g}"
            )
        if delivered > 1 - charged + 1e-12:
            raise ValueError(
                f"a battery delivering at most what the other sources supply ({1 - charged:g} of "
                f"the electricity), got capacity x cycles / electricity a year = {delivered:g}"
            )


def mix_amounts(electricity_params: dict) -> dict:
    """kWh bought from each source per kWh the plant uses: the shares, or with a battery the charging
    source's share plus the battery's delivery and losses, and the others displaced in proportion.

    Parameters
    ----------
    electricity_params : dict
        The project's ``electricity`` section (sources with their shares, the optional battery), numbers or draws.

    Returns
    -------
    dict of str to float or ndarray
        Source name -> kWh bought per kWh the plant uses.
    """
    sources, battery = electricity_params["sources"], electricity_params.get("battery")
    if not battery:
        return {name: source["share"] for name, source in sources.items()}
    delivered = electricity.battery_delivered_share(
        battery["capacity_kwh"], battery["full_cycles_per_year"], battery["electricity_kwh_per_year"]
    )
    charged = sources[battery["charged_from"]]["share"]
    return {
        name: electricity.charged_source_kwh_per_kwh(charged, delivered, battery["round_trip_efficiency"])
        if name == battery["charged_from"]
        else electricity.displaced_source_kwh_per_kwh(source["share"], charged, delivered)
        for name, source in sources.items()
    }


def check_limits(params: dict, inputs, source: str) -> None:
    """A battery delivers at most what the other sources supply, from a source with a share above 0 (as drawn).

    Parameters
    ----------
    params : dict
        The project's parameters.
    inputs : NumericInputs
        Factor and reference values (not read here).
    source : str
        The project's file, named in the error.

    Returns
    -------
    None

    Raises
    ------
    InputError
        When a battery limit is broken.
    """
    for field, expected, ok in draw_limits(params, inputs):
        if not ok:
            raise InputError(source, field, expected)


def draw_limits(params: dict, inputs) -> list:
    """The battery's limits of ``Electricity`` on numbers or arrays of draws (shares and capacity may be
    levers or drawn).

    Parameters
    ----------
    params : dict
        The project's parameters, numbers or arrays of draws.
    inputs : NumericInputs or DrawInputs
        Factor and reference values (not read here).

    Returns
    -------
    list of tuple
        (field, what was expected, truth value or mask of draws that keep the limit).
    """
    battery = params["electricity"].get("battery")
    if not battery:
        return []
    delivered = electricity.battery_delivered_share(
        battery["capacity_kwh"], battery["full_cycles_per_year"], battery["electricity_kwh_per_year"]
    )
    charged = params["electricity"]["sources"][battery["charged_from"]]["share"]
    return [
        (
            "electricity.battery.capacity_kwh",
            "a battery delivering at most what the other sources supply (capacity "
            "x cycles / electricity a year <= 1 - the charging source's share)",
            delivered <= 1 - charged + 1e-12,
        ),
        (
            "electricity.battery.charged_from",
            "a charging source with a share above 0 and below 1 when the battery delivers",
            (delivered == 0) | ((charged > 0) & (charged < 1)),
        ),
    ]


def build(params: dict, inputs, chain) -> list[Activity]:
    """Activities of the electricity mix, per kWh: one activity per named source with its emission factor,
    and the mix drawing each source by its share.

    Parameters
    ----------
    params : dict
        The project's parameters by section (``Project.model_dump()``), each number in the unit its
        field states (e.g. ``electricity.sources.<name>.share``, a fraction).
    inputs : NumericInputs
        Factor values (``inputs.factor``) and reference values (``inputs.molar_mass``), each recorded
        as it is used.
    chain : Chain
        What the route modules before this one left: the reference activity and its product, the place,
        shared fuel supplies (``extra``) and figures.

    Returns
    -------
    list of Activity
        The activities it adds; their exchanges are amounts per unit of each activity (kWh).

    References
    ----------
    .. [1] GHG Protocol Scope 2 Guidance (2015), ch. 4 and 6 (location- and market-based factors; from memory).
    """
    mix = Activity("electricity_mix", "electricity_supply", "electricity, project mix", "kWh")
    activities = [mix]
    amounts = mix_amounts(params["electricity"])
    for name, source in params["electricity"]["sources"].items():
        key = f"electricity:{name}"
        flow, kg_per_kwh = electricity_flow(inputs, source["factor"], f"electricity.sources.{name}.factor")
        supply = Activity(key, "electricity_supply", f"electricity, {name}", "kWh")
        supply.emit(flow, kg_per_kwh, f"generation of electricity, {name}")
        mix.consume(
            key,
            amounts[name],
            f"share of {name}" + (" (with the battery)" if params["electricity"].get("battery") else ""),
            "kWh",
        )
        activities.append(supply)
        chain.electricity_kinds[key] = electricity.kind_of_source(source["factor"])
        chain.electricity_sources[key] = name
    return activities


def starter(product: str, grid: bool = False) -> str:
    """The ``[electricity]`` section of a starter project file.

    Parameters
    ----------
    product : str
        The project's product, ``hydrogen`` or ``ammonia``.
    grid : bool
        A grid mix (for the fossil routes) instead of a renewable supply.

    Returns
    -------
    str
        TOML text of the sections, with example numbers for ``carbonledger init`` to mark as placeholders.
    """
    if grid:
        return """
# One block per source; shares sum to 1. Factor ids: `carbonledger factors list`.
# Your region's grid: `carbonledger factors list --prefix electricity.grid.` (e.g. electricity.grid.us_erct_2022).
[electricity.sources.grid]
share = 1.0
factor = "electricity.grid.eu27_2018"
procurement = "grid"             # direct_line | ppa | certificates | grid: schemes decide what counts
# zone = ""                      # bidding zone or region of the supply
"""
    return """
# One block per source; shares sum to 1. Factor ids: `carbonledger factors list`.
# How each source is procured decides whether a scheme counts it as renewable (the factor id's
# name does not): procurement = direct_line | ppa | certificates | grid; commissioned = the
# generator's first day of operation (additionality); zone = its bidding zone or region
# (geographic correlation); supported = whether it received operating or investment aid;
# matched = annual | monthly | hourly | half_hourly, the period over which generation is
# declared matched with consumption (hourly rules need a time series to be judged).
[electricity.sources.solar]
share = 0.5
factor = "electricity.renewable.solar_pv_utility"
# procurement = "ppa"
# commissioned = 2027-01-01
# zone = ""
# supported = false
# matched = "monthly"

[electricity.sources.wind]
share = 0.5
factor = "electricity.renewable.wind_onshore"
# procurement = "ppa"
# commissioned = 2027-01-01
# zone = ""
# supported = false
# matched = "monthly"
"""


ROUTE = Route(
    name="electricity",
    kind="supply",
    stages=("electricity_supply",),
    applies=lambda params: True,
    build=build,
    check_limits=check_limits,
    draw_limits=draw_limits,
    sections={"electricity": Electricity},
    starter=starter,
    description="The project's electricity mix of named sources",
)
