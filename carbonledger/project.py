"""The project file: a small TOML description of one hydrogen or ammonia project.

Validated here, at the edge, with pydantic; the core receives a plain nested dict of values.
Every parameter name carries its unit; ``parameter_table`` lists them with units for
``carbonledger params``. Unknown parameters, missing required values, shares that do not sum
to one and impossible values are refused with one line naming the file and the field.
"""

from __future__ import annotations

import hashlib
import tomllib
from pathlib import Path
from typing import Any, Literal

from pydantic import BaseModel, ConfigDict, Field, ValidationError, model_validator

from .errors import InputError

ROUTES = ("steam_methane_reforming", "autothermal_reforming", "electrolysis")
BOUNDARIES = ("cradle-to-gate", "well-to-tank", "well-to-wake")


def P(default: Any = ..., unit: str = "", description: str = "", **limits) -> Any:
    """A parameter field with its unit recorded for listings and the workbook."""
    return Field(default, description=description, json_schema_extra={"unit": unit}, **limits)


class _Section(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True)


class ProjectInfo(_Section):
    name: str = P(description="Project name")
    product: Literal["ammonia", "hydrogen"] = P(description="Product leaving the plant gate")
    site: str = P("", description="Site (free text)")
    note: str = P("", description="Free text, e.g. where the numbers come from")
    boundary: Literal[BOUNDARIES] = P("cradle-to-gate", description="System boundary of the headline result (--boundary overrides it)")


class Hydrogen(_Section):
    route: Literal[ROUTES] = P(description="Hydrogen production route")
    conditioning_kwh_per_kg_h2: float = P(0.0, "kWh/kg H2", "Compression and purification to the delivery specification", ge=0)


class Reforming(_Section):
    natural_gas_gj_per_kg_h2: float = P(unit="GJ (LHV)/kg H2", description="Natural gas as feed and fuel", gt=0)
    electricity_kwh_per_kg_h2: float = P(0.0, "kWh/kg H2", "Electricity bought by the hydrogen plant (oxygen plant included for ATR)", ge=0)
    process_co2_share: float = P(unit="fraction", description="Share of the direct CO2 that is concentrated process CO2 (the rest is dilute flue CO2)", ge=0, le=1)


class Capture(_Section):
    capture_rate: float = P(unit="fraction", description="Fraction of the CO2 in the captured streams that is captured", ge=0, le=1)
    applies_to: Literal["process", "process_and_flue"] = P(description="CO2 streams the capture rate applies to")
    compression_kwh_per_t_co2: float = P(unit="kWh/t CO2", description="Electricity to capture, dry and compress the CO2", ge=0)
    extra_natural_gas_gj_per_t_co2: float = P(0.0, "GJ (LHV)/t CO2", "Natural gas burnt for capture (solvent regeneration)", ge=0)
    transport_storage_loss_fraction: float = P(unit="fraction", description="Share of the captured CO2 lost in transport and storage", ge=0, le=1)


class Electrolysis(_Section):
    technology: Literal["alkaline", "pem", "solid_oxide"] = P(description="Electrolyser technology")
    electricity_kwh_per_kg_h2: float = P(unit="kWh/kg H2", description="System electricity, stack and balance of plant", gt=0)
    heat_kwh_per_kg_h2: float = P(0.0, "kWh/kg H2", "Heat (solid oxide: steam raising and stack heat)", ge=0)
    heat_source: Literal["recovered", "natural_gas", "electricity"] = P("recovered", description="Where the heat comes from; recovered heat carries no burden")
    heat_boiler_efficiency: float = P(0.9, "fraction", "Boiler efficiency when heat comes from natural gas", gt=0, le=1)
    water_litres_per_kg_h2: float = P(0.0, "L/kg H2", "Raw water drawn (0: water treatment not counted)", ge=0)
    water_treatment_kwh_per_m3: float = P(0.0, "kWh/m3", "Electricity to treat or desalinate raw water", ge=0)


class NaturalGas(_Section):
    methane_loss_rate: float = P(unit="fraction of gas delivered", description="Methane lost upstream (production, processing, transmission)", ge=0, lt=1)
    upstream_co2_factor: str = P("natural_gas.upstream_co2", description="Factor id of upstream CO2 (non-methane)")


class ElectricitySource(_Section):
    share: float = P(unit="fraction", description="Share of the electricity bought", ge=0, le=1)
    factor: str = P(description="Factor id of the source's emission factor")


class Electricity(_Section):
    sources: dict[str, ElectricitySource] = Field(min_length=1, description="Named sources of electricity")

    @model_validator(mode="after")
    def _shares_sum_to_one(self):
        total = sum(source.share for source in self.sources.values())
        if abs(total - 1.0) > 1e-6:
            raise ValueError(f"source shares summing to 1, got {total:g}")
        return self


class Ammonia(_Section):
    nitrogen_source: Literal["air_separation", "process_air"] = P(description="Air separation unit, or process air in a secondary reformer")
    air_separation_kwh_per_t_n2: float = P(0.0, "kWh/t N2", "Electricity of the air separation unit", ge=0)
    hydrogen_loss_allowance: float = P(0.0, "fraction", "Hydrogen and nitrogen above stoichiometry (purge and losses)", ge=0, lt=1)
    synthesis_electricity_kwh_per_t_nh3: float = P(unit="kWh/t NH3", description="Synthesis loop electricity (compressors, refrigeration)", ge=0)
    synthesis_natural_gas_gj_per_t_nh3: float = P(0.0, "GJ (LHV)/t NH3", "Natural gas burnt for the synthesis loop (steam, start-up)", ge=0)
    storage_electricity_kwh_per_t_nh3: float = P(0.0, "kWh/t NH3", "Refrigerated storage and loading (reliquefaction of boil-off)", ge=0)
    storage_loss_fraction: float = P(0.0, "fraction", "Ammonia lost in storage and loading", ge=0, lt=1)


class Lifetime(_Section):
    """Operating life: yearly output, electrolyser ageing, grid trajectory, construction emissions."""

    operating_years: int = P(unit="years", description="Years of operation (at least 1)", ge=1)
    first_year: int = P(unit="calendar year", description="Calendar year of the first operating year", ge=1900, le=2200)
    nameplate_output_t_per_year: float = P(unit="t product/year", description="Output at full load with new stacks (t NH3 or t H2)", gt=0)
    capacity_factor: float = P(1.0, "fraction", "Annual capacity factor (share of the nameplate output produced)", gt=0, le=1)
    efficiency_loss_per_year: float = P(0.0, "fraction/year", "Electrolysis: drop of stack efficiency per year of stack age", ge=0, lt=1)
    stack_replacement_years: int | None = P(None, "years", "Electrolysis: stacks replaced every N years, which resets the efficiency loss (absent: never)", ge=1)
    plant_construction_t_co2e: float = P(0.0, "t CO2e", "Construction (capital) emissions of the plant", ge=0)
    renewables_construction_t_co2e: float = P(0.0, "t CO2e", "Construction emissions of dedicated renewable generation", ge=0)
    renewables_mw: float = P(0.0, "MW", "Dedicated renewable capacity, with renewables_construction_factor", ge=0)
    renewables_construction_factor: str = P("", description="Factor id (t CO2e/MW) for the construction of the dedicated renewables")
    grid_source: str = P("grid", description="Name of the electricity source whose factor follows the trajectory")
    grid_trajectory_csv: str = P("", description="Factor CSV of yearly grid factors (year column = calendar year), relative to the project file")
    grid_trajectory_factors: str = P("", description="Factor id prefix in the factor set: rows PREFIX.YEAR give the yearly grid factor")


class Shipping(_Section):
    destination: str = P("destination port", description="Port where the ammonia is delivered (free text)")
    distance_nautical_miles: float = P(unit="nautical miles", description="Laden leg, loading port to destination", gt=0)
    cargo_t_per_voyage: float = P(unit="t NH3", description="Ammonia loaded per voyage", gt=0)
    speed_knots: float = P(unit="knots", description="Service speed at sea", gt=0)
    fuel: str = P(description="Main fuel: a marine fuel of the factor set (heavy_fuel_oil, very_low_sulphur_fuel_oil, marine_gas_oil, lng) or ammonia")
    engine: str = P("", description="LNG only: engine type, for its methane slip (otto_dual_fuel_medium_speed, otto_dual_fuel_slow_speed, diesel_dual_fuel_slow_speed, lean_burn_spark_ignited)")
    fuel_t_per_day_at_sea: float = P(0.0, "t fuel/day", "Main fuel per day at sea, laden (give this or fuel_g_per_tonne_nautical_mile)", ge=0)
    fuel_g_per_tonne_nautical_mile: float = P(0.0, "g fuel/(t cargo x nautical mile)", "Main fuel per tonne of cargo per nautical mile, laden leg", ge=0)
    ballast_return_fuel_ratio: float = P(unit="fraction of the laden leg's fuel", description="Fuel of the ballast return leg (0: the ship returns with other cargo)", ge=0)
    port_days: float = P(0.0, "days", "Days in port per voyage (loading and unloading)", ge=0)
    port_fuel_t_per_day: float = P(0.0, "t fuel/day", "Main fuel per day in port", ge=0)
    pilot_fuel: str = P("", description="Pilot fuel of an ammonia or dual-fuel engine (a marine fuel of the factor set); empty for none")
    pilot_fuel_energy_share: float = P(0.0, "fraction of fuel energy", "Share of the engine's fuel energy from the pilot fuel", ge=0, lt=1)
    ammonia_n2o_g_per_kg: float = P(0.0, "g N2O/kg NH3 burnt", "N2O from ammonia burnt aboard (ammonia fuel, burnt boil-off)", ge=0)
    ammonia_slip_g_per_kg: float = P(0.0, "g NH3/kg NH3 burnt", "Ammonia passing the engine unburnt (reported, not a GHG)", ge=0)
    tank_heat_ingress_kw: float = P(0.0, "kW", "Heat leaking into the refrigerated cargo tanks while laden", ge=0)
    boil_off_handling: Literal["reliquefaction", "burnt"] = P("reliquefaction", description="Boil-off reliquefied on board (generator fuel) or burnt (cargo lost)")
    reliquefaction_kwh_per_kg_boil_off: float = P(0.0, "kWh/kg NH3", "Electricity to reliquefy boil-off", ge=0)
    generator_fuel_g_per_kwh: float = P(0.0, "g fuel/kWh", "Specific fuel consumption of the generators (main fuel)", ge=0)


class Cracking(_Section):
    hydrogen_recovery_fraction: float = P(unit="fraction", description="Hydrogen recovered as product per hydrogen cracked (purification losses)", gt=0, le=1)
    heat_source: Literal["ammonia", "hydrogen", "natural_gas"] = P(description="Fuel burnt for the cracker's heat")
    heat_to_reactor_efficiency: float = P(unit="fraction", description="Share of the fuel heat (LHV) that reaches the reaction and the feed vaporiser", gt=0, le=1)
    burner_n2o_g_per_kg_ammonia: float = P(0.0, "g N2O/kg NH3 burnt", "N2O from burning ammonia for heat", ge=0)
    electricity_kwh_per_kg_h2: float = P(0.0, "kWh/kg H2", "Electricity of the cracker (pumps, purification, compression)", ge=0)
    electricity_factor: str = P("", description="Factor id of the electricity at the destination (needed when electricity_kwh_per_kg_h2 > 0)")


class EndUse(_Section):
    converter: Literal["engine", "turbine"] = P(description="Where the delivered ammonia is burnt")
    n2o_g_per_kg_ammonia: float = P(unit="g N2O/kg NH3", description="N2O formed in combustion (engine or turbine data)", ge=0)
    ammonia_slip_g_per_kg_ammonia: float = P(unit="g NH3/kg NH3", description="Ammonia passing unburnt (reported, not a GHG)", ge=0)
    pilot_fuel: str = P("", description="Pilot fuel (a marine fuel of the factor set); empty for none")
    pilot_fuel_energy_share: float = P(0.0, "fraction of fuel energy", "Share of the fuel energy from the pilot fuel", ge=0, lt=1)


class Project(_Section):
    project: ProjectInfo
    hydrogen: Hydrogen
    electricity: Electricity
    reforming: Reforming | None = None
    capture: Capture | None = None
    electrolysis: Electrolysis | None = None
    natural_gas: NaturalGas | None = None
    ammonia: Ammonia | None = None
    lifetime: Lifetime | None = None
    shipping: Shipping | None = None
    cracking: Cracking | None = None
    end_use: EndUse | None = None

    @model_validator(mode="after")
    def _sections_fit_the_route(self):
        route = self.hydrogen.route
        reforming = route in ("steam_methane_reforming", "autothermal_reforming")
        if reforming and self.reforming is None:
            raise _SectionError("reforming", f"a [reforming] section for route '{route}'")
        if not reforming and self.reforming is not None:
            raise _SectionError("reforming", f"no [reforming] section for route '{route}'")
        if route == "electrolysis" and self.electrolysis is None:
            raise _SectionError("electrolysis", "an [electrolysis] section for route 'electrolysis'")
        if route != "electrolysis" and self.electrolysis is not None:
            raise _SectionError("electrolysis", f"no [electrolysis] section for route '{route}'")
        if route == "electrolysis" and self.capture is not None:
            raise _SectionError("capture", "no [capture] section for route 'electrolysis' (no process CO2 to capture)")
        if route == "autothermal_reforming" and self.capture is None:
            raise _SectionError("capture", "a [capture] section: autothermal reforming is modelled with capture")
        if self.project.product == "ammonia" and self.ammonia is None:
            raise _SectionError("ammonia", "an [ammonia] section for product 'ammonia'")
        if self.project.product == "hydrogen" and self.ammonia is not None:
            raise _SectionError("ammonia", "no [ammonia] section for product 'hydrogen'")
        if self.ammonia is not None and self.ammonia.nitrogen_source == "process_air" and not reforming:
            raise _SectionError("ammonia.nitrogen_source", "'air_separation' (process air needs a reformer)")
        if self.lifetime is not None:
            life = self.lifetime
            if life.grid_trajectory_csv and life.grid_trajectory_factors:
                raise _SectionError("lifetime.grid_trajectory_csv", "either grid_trajectory_csv or grid_trajectory_factors, not both")
            if (life.grid_trajectory_csv or life.grid_trajectory_factors) and life.grid_source not in self.electricity.sources:
                raise _SectionError("lifetime.grid_source", f"the name of an electricity source ({', '.join(self.electricity.sources)}), got '{life.grid_source}'")
            if bool(life.renewables_mw) != bool(life.renewables_construction_factor):
                raise _SectionError("lifetime.renewables_mw", "renewables_mw and renewables_construction_factor given together")
            oldest = (life.stack_replacement_years or life.operating_years) - 1
            if life.efficiency_loss_per_year * oldest >= 1:
                raise _SectionError("lifetime.efficiency_loss_per_year", f"a loss that leaves some efficiency at a stack age of {oldest} years")
        self._delivery_fits()
        if self.uses_natural_gas() and self.natural_gas is None:
            raise _SectionError("natural_gas", "a [natural_gas] section with methane_loss_rate, since the project burns natural gas")
        return self

    def _delivery_fits(self) -> None:
        for name in ("shipping", "cracking", "end_use"):
            if getattr(self, name) is not None and self.project.product != "ammonia":
                raise _SectionError(name, f"no [{name}] section for product 'hydrogen' (delivery is modelled for ammonia)")
        ship = self.shipping
        if ship is not None:
            if (ship.fuel_t_per_day_at_sea > 0) == (ship.fuel_g_per_tonne_nautical_mile > 0):
                raise _SectionError("shipping.fuel_t_per_day_at_sea", "either fuel_t_per_day_at_sea or fuel_g_per_tonne_nautical_mile above 0, not both")
            if ship.fuel == "lng" and not ship.engine:
                raise _SectionError("shipping.engine", "an engine type for fuel 'lng' (its methane slip depends on it)")
            if bool(ship.pilot_fuel) != (ship.pilot_fuel_energy_share > 0):
                raise _SectionError("shipping.pilot_fuel_energy_share", "a share above 0 together with a pilot_fuel, or neither")
            if ship.tank_heat_ingress_kw > 0 and ship.boil_off_handling == "reliquefaction" and not (ship.reliquefaction_kwh_per_kg_boil_off > 0 and ship.generator_fuel_g_per_kwh > 0):
                raise _SectionError("shipping.reliquefaction_kwh_per_kg_boil_off", "reliquefaction_kwh_per_kg_boil_off and generator_fuel_g_per_kwh above 0 to reliquefy the boil-off")
        crack = self.cracking
        if crack is not None and crack.electricity_kwh_per_kg_h2 > 0 and not crack.electricity_factor:
            raise _SectionError("cracking.electricity_factor", "a factor id for the cracker's electricity")
        use = self.end_use
        if use is not None and bool(use.pilot_fuel) != (use.pilot_fuel_energy_share > 0):
            raise _SectionError("end_use.pilot_fuel_energy_share", "a share above 0 together with a pilot_fuel, or neither")

    def uses_natural_gas(self) -> bool:
        return bool(
            self.reforming is not None
            or (self.electrolysis is not None and self.electrolysis.heat_source == "natural_gas" and self.electrolysis.heat_kwh_per_kg_h2 > 0)
            or (self.capture is not None and self.capture.extra_natural_gas_gj_per_t_co2 > 0)
            or (self.ammonia is not None and self.ammonia.synthesis_natural_gas_gj_per_t_nh3 > 0)
            or (self.cracking is not None and self.cracking.heat_source == "natural_gas")
        )


class _SectionError(ValueError):
    def __init__(self, field: str, expected: str):
        self.field, self.expected = field, expected
        super().__init__(expected)


def _describe(error: dict) -> tuple[str, str]:
    field = ".".join(str(part) for part in error["loc"])
    kind = error["type"]
    context = error.get("ctx") or {}
    if kind == "extra_forbidden":
        return field, "unknown parameter (see `carbonledger params` or `carbonledger init` for the known ones)"
    if kind == "missing":
        return field, "a value is required"
    if kind in ("greater_than_equal", "greater_than", "less_than_equal", "less_than"):
        words = {"greater_than_equal": ">=", "greater_than": ">", "less_than_equal": "<=", "less_than": "<"}[kind]
        limit = next(iter(context.values()), "")
        return field, f"a number {words} {limit}, got {error.get('input')!r}"
    if kind == "literal_error":
        return field, f"{context.get('expected', 'a listed value')}, got {error.get('input')!r}"
    if kind in ("float_parsing", "float_type"):
        return field, f"a number, got {error.get('input')!r}"
    if kind == "value_error":
        inner = context.get("error")
        if isinstance(inner, _SectionError):
            return inner.field, inner.expected
        return field, str(inner) if inner else error["msg"]
    return field, error["msg"].lower()


def parse_override(text: str) -> tuple[str, Any]:
    """Parse ``dotted.path=value``; the value is read as a TOML value, else as text."""
    if "=" not in text:
        raise InputError("--set", text, "dotted.parameter=value")
    path, raw = (part.strip() for part in text.split("=", 1))
    if not path:
        raise InputError("--set", text, "dotted.parameter=value")
    try:
        value = tomllib.loads(f"v = {raw}")["v"]
    except tomllib.TOMLDecodeError:
        value = raw
    return path, value


def apply_overrides(data: dict, overrides: list[tuple[str, Any]], source: str) -> dict:
    """Set dotted paths in a raw project dict (a copy); the model then validates them."""
    import copy

    data = copy.deepcopy(data)
    for path, value in overrides:
        node = data
        parts = path.split(".")
        for part in parts[:-1]:
            child = node.setdefault(part, {})
            if not isinstance(child, dict):
                raise InputError(source, path, f"a parameter path; '{part}' is a value, not a section")
            node = child
        node[parts[-1]] = value
    return data


def validate_project(data: dict, source: str) -> Project:
    try:
        return Project.model_validate(data)
    except ValidationError as error:
        first = error.errors()[0]
        field, expected = _describe(first)
        raise InputError(source, field, expected) from None


def read_project_file(path: str | Path) -> tuple[dict, bytes]:
    path = Path(path)
    try:
        raw = path.read_bytes()
    except OSError as error:
        raise InputError(path, "", f"a readable project file ({error.strerror})") from None
    try:
        return tomllib.loads(raw.decode("utf-8")), raw
    except UnicodeDecodeError:
        raise InputError(path, "", "a UTF-8 TOML project file") from None
    except tomllib.TOMLDecodeError as error:
        raise InputError(path, "", f"valid TOML ({error})") from None


def load_project(path: str | Path, overrides: list[str] | None = None) -> tuple[Project, str]:
    """Read, override and validate a project file; return the model and the file's sha256."""
    data, raw = read_project_file(path)
    parsed = [parse_override(text) for text in overrides or []]
    data = apply_overrides(data, parsed, str(path))
    return validate_project(data, str(path)), hashlib.sha256(raw).hexdigest()


def parameter_table(project: Project) -> list[tuple[str, Any, str, str]]:
    """Every parameter path of a validated project with its value, unit and description."""
    rows: list[tuple[str, Any, str, str]] = []

    def walk(model: BaseModel, prefix: str) -> None:
        for name, info in type(model).model_fields.items():
            value = getattr(model, name)
            path = f"{prefix}{name}"
            if isinstance(value, BaseModel):
                walk(value, path + ".")
            elif isinstance(value, dict):
                for key, child in value.items():
                    walk(child, f"{path}.{key}.")
            elif value is not None or prefix:
                extra = info.json_schema_extra or {}
                rows.append((path, value, extra.get("unit", ""), info.description or ""))

    walk(project, "")
    return rows
