"""The project file: what every project states, and how a project file is read and validated.

The sections every project has (``[project]``, ``[lifetime]``) live here; the sections of each
route and delivery leg live in that route's module, and ``carbonledger.routes.project``
assembles the whole model from the registry. Validated at the edge with pydantic; the core
receives a plain nested dict of values.
Every parameter name carries its unit; ``parameter_table`` lists them with units for
``carbonledger params``. Unknown parameters, missing required values, shares that do not sum
to one and impossible values are refused with one line naming the file and the field.
"""

from __future__ import annotations

import datetime as dt
import tomllib
from pathlib import Path
from typing import Annotated, Any, Literal

from pydantic import BaseModel, BeforeValidator, ConfigDict, Field, ValidationError

from ..errors import InputError

BOUNDARIES = ("cradle-to-gate", "well-to-tank", "well-to-wake")


def P(default: Any = ..., unit: str = "", description: str = "", **limits) -> Any:
    """A parameter field with its unit recorded for listings and the workbook."""
    return Field(default, description=description, json_schema_extra={"unit": unit}, **limits)


def _iso_date(value: Any) -> str:
    """A calendar date as YYYY-MM-DD text (a TOML date or a string); '' when absent."""
    if value in (None, ""):
        return ""
    if isinstance(value, dt.datetime):
        value = value.date()
    if isinstance(value, dt.date):
        return value.isoformat()
    try:
        return dt.date.fromisoformat(str(value).strip()).isoformat()
    except ValueError:
        raise ValueError(f"a date YYYY-MM-DD, got {value!r}") from None


IsoDate = Annotated[str, BeforeValidator(_iso_date)]


def as_date(text: str) -> dt.date | None:
    """The date of an ``IsoDate`` field, or None when it was not given."""
    return dt.date.fromisoformat(text) if text else None


class Section(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True)


class ProjectInfo(Section):
    name: str = P(description="Project name")
    product: Literal["ammonia", "hydrogen"] = P(description="Product leaving the plant gate")
    site: str = P("", description="Site (free text)")
    note: str = P("", description="Free text, e.g. where the numbers come from")
    boundary: Literal[BOUNDARIES] = P("cradle-to-gate", description="System boundary of the headline result (--boundary overrides it)")
    zone: str = P("", description="Bidding zone or region of the plant (geographic correlation of electricity)")
    construction_start: IsoDate = P("", "date", "Date construction of the plant began (YYYY-MM-DD)")
    commissioning: IsoDate = P("", "date", "Date the plant came into operation (YYYY-MM-DD)")


class Lifetime(Section):
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
        if hasattr(inner, "field") and hasattr(inner, "expected"):
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


def validate_with(model: type[BaseModel], data: dict, source: str):
    """Validate a raw project dict with a model; the first error as one InputError line."""
    try:
        return model.model_validate(data)
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


def parameter_table(project: BaseModel) -> list[tuple[str, Any, str, str]]:
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
