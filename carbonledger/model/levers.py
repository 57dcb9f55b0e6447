"""A levers file: the changes a project may make to qualify, each with its allowed values and its cost.

What the user writes (TOML), validated at the edge like a project file; every bad entry is one
``InputError`` line naming the file and the field. ``analyses.qualify`` finds the cheapest set of
lever values with which the named schemes' checks qualify. See docs/qualify.md.

A lever moves one parameter path (any path ``carbonledger params`` lists):

- continuous: ``range = [low, high]``;
- discrete: ``values = [...]`` (numbers or text, such as factor ids), or ``range`` with ``step``;
  a discrete lever may also take its values from its cost table.

Its cost, in the file's ``currency`` per ``period`` (e.g. EUR per year), is one of

- ``per_unit``: the price of each unit of change from the project's value (either direction);
- ``per_step``: the price of each ``step`` of change from the project's value (whole steps, rounded up);
- ``table``: ``[[value, cost], ...]``; between the values of a continuous lever the cost is
  interpolated linearly, and the table covers the lever's range.

Electricity share levers move together: each difference from a source's share is taken up by the
sources no lever moves, in proportion to their shares, or by the one source a lever names in
``absorbed_by`` (``model.shares``).

A ``[battery]`` table adds an ``[electricity.battery]`` to the project (same fields; ``capacity_kwh``
0 unless given), so that a lever on ``electricity.battery.capacity_kwh`` can size it.

``[sources.NAME]`` tables add electricity sources the levers may bring in; they join the project
at share 0 (a lever on ``electricity.sources.NAME.share`` then moves them), with the same fields as
a project's ``[electricity.sources.NAME]``.

An operation lever (``kind = "operation"``, at most one) has no parameter: on a project with an
electricity time series, the electrolyser's load in every interval is planned by the linear program
of ``carbonledger plan`` (``analyses.plan``) for each combination of the other (discrete) levers;
its cost is ``cost.per_unit`` times the plan's objective lost against running at rated power in every
interval: kg H2 not made, or, with ``hydrogen_price``, margin lost in the series' price currency.
"""

from __future__ import annotations

import math
from pathlib import Path
from typing import Any, Literal

from pydantic import BaseModel, ConfigDict, Field, field_validator, model_validator

from ..errors import InputError
from .project import is_share_path, loads_toml, validate_with

MAX_LEVERS = 20
MAX_COMBINATIONS = 4096  # discrete values (and cost pieces) multiplied out
Value = float | str | bool


def _number(value: Any) -> Any:
    """A cost is a finite number: text, truth values, inf and nan are refused."""
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        raise ValueError(f"a number, got {value!r}")
    if not math.isfinite(value):
        raise ValueError(f"a finite number, got {value!r}")
    return float(value)


class Cost(BaseModel):
    """The cost of a lever as a function of its value (one of per_unit, per_step, table)."""

    model_config = ConfigDict(extra="forbid")
    per_unit: float | None = None
    per_step: float | None = None
    table: list[tuple[Value, float]] | None = None

    @field_validator("per_unit", "per_step", mode="before")
    @classmethod
    def _finite(cls, value: Any) -> Any:
        return _number(value)

    @field_validator("table", mode="before")
    @classmethod
    def _table(cls, value: Any) -> Any:
        if not isinstance(value, list) or not value:
            raise ValueError("a list of [value, cost] pairs")
        for number, pair in enumerate(value):
            if not isinstance(pair, (list, tuple)) or len(pair) != 2:
                raise ValueError(f"a [value, cost] pair at entry {number}, got {pair!r}")
            try:
                _number(pair[1])
            except ValueError as error:
                raise ValueError(f"entry {number}: cost {error}") from None
        return value

    @model_validator(mode="after")
    def _one(self):
        given = [name for name in ("per_unit", "per_step", "table") if getattr(self, name) is not None]
        if len(given) != 1:
            raise ValueError(f"exactly one of per_unit, per_step, table, got {', '.join(given) or 'none'}")
        return self


OPERATION_FIELDS = ("rated_kw", "min_load", "hydrogen_price")


class Lever(BaseModel):
    model_config = ConfigDict(extra="forbid")
    kind: Literal["parameter", "operation"] = "parameter"
    parameter: str | None = Field(None, min_length=1)
    range: tuple[float, float] | None = None
    step: float | None = Field(None, gt=0)
    values: list[Value] | None = Field(None, min_length=1)
    cost: Cost
    # an electricity share: the sources no lever moves take up the rest in proportion
    rebalance: Literal["proportional"] = "proportional"
    # an electricity share: the one source that takes up the difference instead
    absorbed_by: str | None = Field(None, min_length=1)
    note: str = ""
    # an operation lever (kind = "operation"): the electrolyser's load, interval by interval, planned by
    # the linear program of `carbonledger plan` (analyses.plan) against the project's time series
    rated_kw: float | None = Field(None, gt=0, le=1e8)  # default: the largest load in the series
    min_load: float = Field(0.0, ge=0, le=1)  # minimum stable load, a fraction of rated power
    # per kg H2 in the series' price currency: the plan maximises margin
    hydrogen_price: float | None = Field(None, ge=0, le=1e6)

    @field_validator("rated_kw", "min_load", "hydrogen_price", mode="before")
    @classmethod
    def _finite_option(cls, value: Any) -> Any:
        return None if value is None else _number(value)

    @field_validator("range", mode="before")
    @classmethod
    def _range(cls, value: Any) -> Any:
        if not isinstance(value, list) or len(value) != 2:
            raise ValueError("[low, high]")
        low, high = (_number(item) for item in value)
        if not low < high:
            raise ValueError(f"[low, high] with low < high, got {value!r}")
        return value

    @model_validator(mode="after")
    def _shape(self):
        if self.kind == "operation":
            return self._operation()
        if self.parameter is None:
            raise ValueError('a parameter path (or kind = "operation")')
        given = [name for name in OPERATION_FIELDS if name in self.model_fields_set]
        if given:
            raise ValueError(f'{", ".join(given)} only on an operation lever (kind = "operation")')
        if self.values is not None and self.range is not None:
            raise ValueError("range or values, not both")
        if self.values is None and self.range is None and self.cost.table is None:
            raise ValueError("a range, values, or a cost table whose values are the lever's")
        if self.step is not None and self.range is None:
            raise ValueError("a step with a range")
        if self.cost.per_step is not None and self.step is None:
            raise ValueError("a step (cost.per_step prices each step of the range)")
        if self.values is not None and len(set(map(str, self.values))) != len(self.values):
            raise ValueError("values without repeats")
        return self

    def _operation(self):
        """An operation lever: no parameter, no values; priced per unit of the plan's objective lost."""
        given = [
            name for name in ("parameter", "range", "step", "values", "absorbed_by") if getattr(self, name) is not None
        ]
        if given:
            raise ValueError(
                f"an operation lever without {', '.join(given)} (the plan's linear program decides the load)"
            )
        if self.cost.per_unit is None:
            raise ValueError(
                "cost.per_unit on an operation lever: the price of each kg H2 not made (or, "
                "with hydrogen_price, of each unit of the series' currency of margin lost)"
            )
        self.parameter = "operation"
        return self

    @property
    def continuous(self) -> bool:
        return self.range is not None and self.step is None

    def choices(self) -> list[Value]:
        """The values of a discrete lever (its own, its range by step, or its cost table's)."""
        if self.values is not None:
            return list(self.values)
        if self.range is not None and self.step is not None:
            low, high = self.range
            count = int(math.floor((high - low) / self.step + 1e-9))
            return [low + n * self.step for n in range(count + 1)]
        return [value for value, _ in self.cost.table or []]


class Levers(BaseModel):
    """A levers file."""

    model_config = ConfigDict(extra="forbid")
    currency: str = Field(min_length=1)
    period: str = Field(min_length=1, description="what a cost is per: year, kg H2, t NH3, ...")
    schemes: list[str] = []  # the schemes to qualify for when the command names none
    note: str = ""
    invented: bool = False  # every price is invented (demo files): shown with the result
    sources: dict[str, dict[str, Any]] = {}
    battery: dict[str, Any] = {}  # an [electricity.battery] the levers may size (capacity_kwh default 0)
    levers: list[Lever] = Field(min_length=1)

    @field_validator("levers", mode="before")
    @classmethod
    def _at_most(cls, value: Any) -> Any:
        if isinstance(value, list) and len(value) > MAX_LEVERS:
            raise ValueError(f"at most {MAX_LEVERS} levers, got {len(value)}")
        return value

    @model_validator(mode="after")
    def _distinct(self):
        seen = set()
        for lever in self.levers:
            if lever.parameter in seen:
                raise ValueError(f"one lever per parameter, '{lever.parameter}' has two")
            seen.add(lever.parameter)
        for lever in self.levers:
            if lever.absorbed_by is not None and not is_share_path(lever.parameter):
                raise ValueError(f"absorbed_by only on an electricity share lever, got it on '{lever.parameter}'")
        return self

    @property
    def cost_unit(self) -> str:
        return f"{self.currency} per {self.period}"

    @property
    def operation(self) -> tuple[int, Lever] | None:
        """The operation lever and its index, if the file has one."""
        return next(((index, lever) for index, lever in enumerate(self.levers) if lever.kind == "operation"), None)

    @property
    def parameter_levers(self) -> list[Lever]:
        return [lever for lever in self.levers if lever.kind == "parameter"]


def read_levers(path: str | Path) -> Levers:
    """Read and validate a levers file (one InputError line naming the file and the field)."""
    path = Path(path)
    try:
        raw = path.read_bytes()
    except OSError as error:
        raise InputError(path, "", f"a readable levers file ({error.strerror})") from None
    try:
        text = raw.decode("utf-8-sig")
    except UnicodeDecodeError:
        raise InputError(path, "", "a UTF-8 TOML levers file") from None
    return validate_with(Levers, loads_toml(text, path), str(path))
