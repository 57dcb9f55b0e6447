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
import functools
import json
import re
import tomllib
import types
import typing
from pathlib import Path
from typing import Annotated, Any, Literal, Optional

import rtoml
from pydantic import BaseModel, BeforeValidator, ConfigDict, Field, ValidationError, ValidationInfo, field_validator

from ..errors import InputError, did_you_mean, match_id
from .input_files import read_input_bytes
from .shares import rest_of

BOUNDARIES = ("cradle-to-gate", "well-to-tank", "well-to-wake")


def boundary_id(boundary: str, where: str = "--boundary") -> str:
    """A system boundary as spelt in BOUNDARIES (case-insensitive: Well-To-Tank = well-to-tank)."""
    found = match_id(boundary, BOUNDARIES)
    if found is None:
        raise InputError(where, boundary, f"one of {', '.join(BOUNDARIES)}{did_you_mean(boundary, BOUNDARIES)}")
    return found


def boundary_overrides(boundary: str | None, overrides: list[str] | None) -> list[str]:
    """The overrides of a run with the ``--boundary`` option added as ``project.boundary=...``.

    The project model validates the boundary when the overrides are applied.

    Parameters
    ----------
    boundary : str or None
        ``cradle-to-gate``, ``well-to-tank`` or ``well-to-wake`` (spellings ``boundary_id`` accepts); None: the
        project's own.
    overrides : list of str or None
        ``dotted.parameter=value`` strings (``--set``).

    Returns
    -------
    list of str
        The overrides, then ``project.boundary=<id>`` when a boundary is given.
    """
    boundary = boundary_id(boundary) if boundary is not None else None
    return list(overrides or []) + ([f"project.boundary={boundary}"] if boundary else [])


MAX_PROJECT_BYTES = 16 * 1024 * 1024  # a project file is a few kB; its series and meters live in their own files
MAX_DEPTH = 16  # tables and arrays inside one another: a project needs 4


def P(default: Any = ..., unit: str = "", description: str = "", **limits) -> Any:
    """A parameter field with its unit recorded for listings and the workbook."""
    return Field(default, description=description, json_schema_extra={"unit": unit}, **limits)


def _type_arguments(annotation: Any) -> set:
    """The plain types an annotation accepts (``float | None`` -> {float, NoneType})."""
    if typing.get_origin(annotation) in (typing.Union, types.UnionType):
        return set().union(*(_type_arguments(arg) for arg in typing.get_args(annotation)))
    return {annotation}


@functools.cache
def accepted_types(section: type[BaseModel], field_name: str) -> set:
    """The plain types a section's field accepts (``_type_arguments`` of its annotation), worked out once."""
    return _type_arguments(section.model_fields[field_name].annotation)


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
    """A project-file section: unknown keys, infinities, NaN, and truth values or text given
    for a number are refused (TOML allows ``inf`` and ``nan``; ``true`` is not 1)."""

    model_config = ConfigDict(extra="forbid", frozen=True, allow_inf_nan=False)

    @field_validator("*", mode="before")
    @classmethod
    def _numbers_are_numbers(cls, value: Any, info: ValidationInfo) -> Any:
        if not isinstance(value, (bool, str)):  # most values: nothing to look up
            return value
        accepted = accepted_types(cls, info.field_name)
        if accepted & {float, int} and not accepted & {bool, str}:
            kind = "a truth value" if isinstance(value, bool) else "text"
            raise ValueError(f"a number, got {value!r} ({kind})")
        return value


class ProjectInfo(Section):
    name: str = P(description="Project name")
    product: Literal["ammonia", "hydrogen"] = P(description="Product leaving the plant gate")
    site: str = P("", description="Site (free text)")
    note: str = P("", description="Free text, e.g. where the numbers come from")
    boundary: Literal[BOUNDARIES] = P(
        "cradle-to-gate", description="System boundary of the headline result (--boundary overrides it)"
    )
    zone: str = P("", description="Bidding zone or region of the plant (geographic correlation of electricity)")
    country: str = P(
        "",
        description="ISO 3166-1 alpha-2 code of the country or territory where the plant produces (US, GB, PR, ...; "
        "45V asks for production in the United States)",
    )
    construction_start: IsoDate = P("", "date", "Date construction of the plant began (YYYY-MM-DD)")
    commissioning: IsoDate = P(
        "", "date", "Date the plant came into operation, or was originally placed in service (YYYY-MM-DD)"
    )
    declared_e_td_g_co2e_per_mj: Optional[float] = P(
        None,
        "g CO2e/MJ",
        "For a producer who sells at the gate: the buyers' transport and distribution emissions (e_td of the EU "
        "formula) declared, when the project models no delivery",
        ge=0,
        le=1000,
    )
    declared_e_td_evidence: str = P(
        "", description="Where the declared e_td comes from (buyers' statements, contracts, a delivery study)"
    )

    @field_validator("country")
    @classmethod
    def _iso_country(cls, value: str) -> str:
        if value == "":
            return value
        # its country database is read only for a project that names a country (a lean start, issue 18)
        import pycountry

        code = value.strip().upper()
        if len(code) != 2 or pycountry.countries.get(alpha_2=code) is None:
            raise ValueError(f"an ISO 3166-1 alpha-2 country code such as US, GB or PR, got {value!r}")
        return code


class Lifetime(Section):
    """Operating life: yearly output, electrolyser ageing, grid trajectory, construction emissions."""

    # at most 200 years: longer than any plant runs, and it bounds the yearly loop and its output
    operating_years: int = P(unit="years", description="Years of operation (1 to 200)", ge=1, le=200)
    first_year: int = P(unit="calendar year", description="Calendar year of the first operating year", ge=1900, le=2200)
    nameplate_output_t_per_year: float = P(
        unit="t product/year", description="Output at full load with new stacks (t NH3 or t H2)", gt=0
    )
    capacity_factor: float = P(
        1.0, "fraction", "Annual capacity factor (share of the nameplate output produced)", gt=0, le=1
    )
    efficiency_loss_per_year: float = P(
        0.0, "fraction/year", "Electrolysis: drop of stack efficiency per year of stack age", ge=0, lt=1
    )
    stack_replacement_years: int | None = P(
        None,
        "years",
        "Electrolysis: stacks replaced every N years, which resets the efficiency loss (absent: never)",
        ge=1,
        le=200,
    )
    plant_construction_t_co2e: float = P(0.0, "t CO2e", "Construction (capital) emissions of the plant", ge=0)
    renewables_construction_t_co2e: float = P(
        0.0, "t CO2e", "Construction emissions of dedicated renewable generation", ge=0
    )
    renewables_mw: float = P(0.0, "MW", "Dedicated renewable capacity, with renewables_construction_factor", ge=0)
    renewables_construction_factor: str = P(
        "", description="Factor id (t CO2e/MW) for the construction of the dedicated renewables"
    )
    grid_source: str = P("grid", description="Name of the electricity source whose factor follows the trajectory")
    grid_trajectory_csv: str = P(
        "",
        description="Factor CSV of yearly grid factors (year column = calendar year), relative to the project file; "
        "with grid_trajectory_factors it gives the years after the last published one",
    )
    grid_trajectory_factors: str = P(
        "",
        description="Region in the factor set whose rows REGION_YEAR (or REGION.YEAR) give the yearly grid factor, or "
        "'region' for the grid source's own region; later years held at the last published year unless "
        "grid_trajectory_csv gives them",
    )


def _submodel(annotation: Any):
    """The section model an annotation holds (``Optional[Model]``, ``dict[str, Model]``), or None."""
    if isinstance(annotation, type) and issubclass(annotation, BaseModel):
        return annotation
    for arg in typing.get_args(annotation):
        found = _submodel(arg)
        if found is not None:
            return found
    return None


def _known_names(model: type[BaseModel], loc: tuple) -> list[str]:
    """The parameter names of the section at ``loc`` (a dict key such as a source name is skipped)."""
    current: Any = model
    for part in loc:
        fields = getattr(current, "model_fields", {})
        if part in fields:
            current = _submodel(fields[part].annotation)
        # else: a key of a dict section (an electricity source's name): same model below it
        if current is None:
            return []
    return list(getattr(current, "model_fields", {}))


def _describe(error: dict, model: type[BaseModel] | None = None) -> tuple[str, str]:
    field = ".".join(str(part) for part in error["loc"])
    kind = error["type"]
    context = error.get("ctx") or {}
    if kind == "extra_forbidden":
        known = _known_names(model, error["loc"][:-1]) if model is not None else []
        what = "section or key" if len(error["loc"]) == 1 else "parameter"
        hint = did_you_mean(str(error["loc"][-1]), known)
        return field, f"unknown {what}{hint} (see `carbonledger params` or `carbonledger init` for the known ones)"
    if kind == "missing":
        return field, "a value is required"
    if kind in ("greater_than_equal", "greater_than", "less_than_equal", "less_than"):
        words = {"greater_than_equal": ">=", "greater_than": ">", "less_than_equal": "<=", "less_than": "<"}[kind]
        limit = next(iter(context.values()), "")
        return field, f"a number {words} {limit}, got {error.get('input')!r}"
    if kind == "literal_error":
        known = [part.strip().strip("'") for part in str(context.get("expected", "")).replace(" or ", ", ").split(",")]
        return (
            field,
            f"{context.get('expected', 'a listed value')}, got "
            f"{error.get('input')!r}{did_you_mean(str(error.get('input')), known)}",
        )
    if kind in ("float_parsing", "float_type"):
        return field, f"a number, got {error.get('input')!r}"
    if kind == "finite_number":
        return field, f"a finite number, got {error.get('input')!r}"
    if kind in ("int_parsing", "int_type", "int_from_float"):
        return field, f"a whole number, got {error.get('input')!r}"
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
    except RecursionError:
        raise InputError("--set", path, f"a value nested at most {MAX_DEPTH} levels deep") from None
    if _depth(value) + path.count(".") > MAX_DEPTH:
        raise InputError(
            "--set",
            path[:60] + ("..." if len(path) > 60 else ""),
            f"a parameter path and value nested at most {MAX_DEPTH} levels deep",
        )
    return path, value


def _depth(value: Any) -> int:
    """How deeply tables and arrays nest inside ``value`` (a scalar: 0), level by level without recursion,
    stopping once past ``MAX_DEPTH``."""
    deepest, level = 0, [value] if isinstance(value, (dict, list)) else []
    while level and deepest <= MAX_DEPTH:
        deepest += 1
        level = [
            child
            for node in level
            for child in (node.values() if isinstance(node, dict) else node)
            if isinstance(child, (dict, list))
        ]
    return deepest + (1 if level else 0)


def loads_toml(text: str, source: str | Path) -> dict:
    """Parse TOML text (a leading byte-order mark ignored); bad or too deeply nested TOML is one InputError.

    ``rtoml`` (a compiled TOML 1.0 parser) reads it, about seven times faster than the standard
    library's ``tomllib``, which counts at portfolio scale; text it refuses is read again by
    ``tomllib``, whose message (line and column) the error line gives, and which also reads what
    ``rtoml`` cannot hold (integers beyond 64 bits)."""
    text = text.removeprefix("\ufeff")
    try:
        data = rtoml.loads(text)
    except (rtoml.TomlParsingError, RecursionError, ValueError, OverflowError):
        data = _loads_tomllib(text, source)
    if _depth(data) > MAX_DEPTH:
        raise InputError(source, "", f"TOML nested at most {MAX_DEPTH} levels deep")
    return data


def _loads_tomllib(text: str, source: str | Path) -> dict:
    """``tomllib``'s reading of text ``rtoml`` refused: its result, or its error as one InputError."""
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as error:
        raise InputError(source, "", f"valid TOML ({error})") from None
    except RecursionError:
        raise InputError(source, "", f"TOML nested at most {MAX_DEPTH} levels deep") from None
    return data


_BARE_KEY = re.compile(r"[A-Za-z0-9_-]+")


def path_key(key: str) -> str:
    """A name as one part of a dotted parameter path, written as TOML writes a key: bare when it
    is letters, digits, ``_`` and ``-``, else a quoted string (``electricity.sources."wind PPA no. 2".share``)."""
    if _BARE_KEY.fullmatch(key):
        return key
    return json.dumps(key, ensure_ascii=False).replace(
        "\x7f", "\\u007f"
    )  # a JSON string is a TOML basic string (DEL escaped)


def split_path(path: str, source: str = "parameter path") -> list[str]:
    """The parts of a dotted parameter path; quoted parts as in TOML (see ``path_key``)."""
    if '"' not in path and "'" not in path:
        return path.split(".")
    try:
        node = tomllib.loads(f"{path} = 0")
        parts = []
        while isinstance(node, dict):
            ((key, node),) = node.items()
            parts.append(key)
        return parts
    except (tomllib.TOMLDecodeError, ValueError):
        raise InputError(
            source,
            path,
            'a dotted parameter path, a name with a dot or a space in double quotes (electricity.sources."wind PPA no. '
            '2".share)',
        ) from None


REST = "rest"  # the value of a share override that takes up the difference to 1 (--rebalance SOURCE)


def rebalance_override(name: str) -> str:
    """The override that gives electricity source ``name`` 1 less the other sources' shares (--rebalance)."""
    return f"electricity.sources.{path_key(name)}.share={REST}"


def share_source(path: str) -> str | None:
    """The electricity source whose share a parameter path names (``electricity.sources.NAME.share``, NAME
    quoted as ``path_key`` writes it), else None."""
    if not (path.startswith("electricity.sources.") and path.endswith(".share")):
        return None
    parts = split_path(path)
    return parts[2] if len(parts) == 4 and parts[:2] == ["electricity", "sources"] and parts[3] == "share" else None


def is_share_path(path: str) -> bool:
    """Whether a parameter path is an electricity source's share (``share_source``)."""
    return share_source(path) is not None


def rest_source(path: str, value: Any) -> str | None:
    """The electricity source of an override ``electricity.sources.NAME.share=rest``, else None."""
    return share_source(path) if value == REST else None


def rebalanced_sources(overrides: list[str] | None) -> list[str]:
    """The electricity sources whose share takes up the rest (--rebalance), in the order given."""
    parsed = [parse_override(text) for text in overrides or []]
    return [name for path, value in parsed if (name := rest_source(path, value)) is not None]


def _take_up_rest(data: dict, name: str, source: str) -> None:
    """Set electricity source ``name``'s share to 1 less the others' (after every other override), or
    refuse in one line when that is not a share from 0 to 1."""
    sources = data.get("electricity", {}).get("sources") if isinstance(data.get("electricity"), dict) else None
    field = f"electricity.sources.{path_key(name)}.share"
    if not isinstance(sources, dict) or not isinstance(sources.get(name), dict):
        known = list(sources) if isinstance(sources, dict) else []
        raise InputError(
            source,
            f"--rebalance {name}",
            "the name of an electricity source of the project "
            f"({', '.join(known) or 'none'}){did_you_mean(name, known)}",
        )
    shares = {key: item.get("share") for key, item in sources.items() if isinstance(item, dict)}
    if any(
        isinstance(share, bool) or not isinstance(share, (int, float)) for key, share in shares.items() if key != name
    ):
        return  # a share that is not a number: the model refuses it, naming it
    rest = rest_of(shares, name)
    if not -1e-12 <= rest <= 1 + 1e-12:
        others = 1 - rest
        raise InputError(
            source,
            field,
            f"a share from 0 to 1 after --rebalance {name} took up the difference: the other sources' shares add up to "
            f"{others:g}, leaving {rest:g}",
        )
    sources[name]["share"] = min(max(rest, 0.0), 1.0)


def apply_overrides(data: dict, overrides: list[tuple[str, Any]], source: str) -> dict:
    """Set dotted paths in a raw project dict (a copy); the model then validates them. A share set to
    ``rest`` (``--rebalance SOURCE``) is set last: 1 less the other sources' shares."""
    import copy

    data = copy.deepcopy(data)
    taking_up = [name for path, value in overrides if (name := rest_source(path, value)) is not None]
    for path, value in overrides:
        if rest_source(path, value) is not None:
            continue
        node = data
        parts = split_path(path, source)
        for part in parts[:-1]:
            child = node.setdefault(part, {})
            if not isinstance(child, dict):
                raise InputError(source, path, f"a parameter path; '{part}' is a value, not a section")
            node = child
        node[parts[-1]] = value
    for name in taking_up:
        _take_up_rest(data, name, source)
    return data


def validate_with(model: type[BaseModel], data: dict, source: str):
    """Validate a raw project dict with a model; the first error as one InputError line."""
    try:
        return model.model_validate(data)
    except ValidationError as error:
        errors = error.errors()
        # a misspelt name shows up twice: as unknown, and as the right name missing; name the unknown one
        first = next((e for e in errors if e["type"] == "extra_forbidden"), errors[0])
        field, expected = _describe(first, model)
        raise InputError(source, field, expected) from None


def read_project_file(path: str | Path) -> tuple[dict, bytes]:
    path = Path(path)
    raw = read_input_bytes(path, "project file", MAX_PROJECT_BYTES)
    if raw.startswith(b"PK\x03\x04") or path.suffix.lower() in (".xlsx", ".xlsm"):
        raise InputError(
            path,
            "",
            "a project TOML file; this is a workbook: read it with `--from-workbook` (e.g. carbonledger score "
            "--from-workbook FILE.xlsx)",
        )
    try:
        text = raw.decode("utf-8-sig")
    except UnicodeDecodeError:
        raise InputError(path, "", "a UTF-8 TOML project file (save it as UTF-8)") from None
    return loads_toml(text, path), raw


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
                    walk(child, f"{path}.{path_key(key)}.")
            elif value is not None or prefix:
                extra = info.json_schema_extra or {}
                rows.append((path, value, extra.get("unit", ""), info.description or ""))

    walk(project, "")
    return rows


def parameter_field(project: BaseModel, path: str, source: str, where: str = "") -> tuple[Any, Any]:
    """The value of one parameter path of a validated project and its pydantic field (limits, unit).

    A path is as ``carbonledger params`` lists it (``electricity.sources.grid.share``); one that
    does not exist, or names a section, is refused with one InputError line.
    """
    node: Any = project
    info = None
    for part in split_path(path, where or source):
        if isinstance(node, BaseModel) and part in type(node).model_fields:
            info = type(node).model_fields[part]
            node = getattr(node, part)
        elif isinstance(node, dict) and part in node:
            node = node[part]
        else:
            node = None
            break
    if node is None or info is None or isinstance(node, (BaseModel, dict)):
        raise InputError(source, where or path, f"a parameter path that `carbonledger params` lists, got '{path}'")
    return node, info


def field_limits(info) -> tuple[float | None, bool, float | None, bool]:
    """(lower, lower included, upper, upper included) of a pydantic number field (None: unbounded)."""
    lower = upper = None
    lower_in = upper_in = True
    for item in getattr(info, "metadata", []):
        if getattr(item, "ge", None) is not None:
            lower, lower_in = float(item.ge), True
        if getattr(item, "gt", None) is not None:
            lower, lower_in = float(item.gt), False
        if getattr(item, "le", None) is not None:
            upper, upper_in = float(item.le), True
        if getattr(item, "lt", None) is not None:
            upper, upper_in = float(item.lt), False
    return lower, lower_in, upper, upper_in
