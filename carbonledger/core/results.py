"""The result of scoring a project: everything an output needs, so outputs never recompute.

Pydantic models at the output edge; ``ScoreResult.model_dump(mode="json")`` is the stable
JSON documented in the manual (docs/formats/outputs.md).
"""

from __future__ import annotations

import json
from dataclasses import dataclass, replace
from typing import Any

from pydantic import BaseModel, computed_field

from ..errors import InputError
from ..model.factors import Factor
from ..model.grades import grades_of


def _plain_number(value: Any) -> Any:
    """numpy scalars as Python numbers; anything else JSON cannot hold as text."""
    return value.item() if hasattr(value, "item") else str(value)


def strict_json(data: Any, where: str = "result") -> str:
    """JSON text that any JSON parser reads: NaN and infinities are refused, never written.

    (Python's ``json`` writes ``NaN``/``Infinity`` by default, which is not JSON (RFC 8259, section 6);
    pydantic's own JSON turns them into ``null``, which would hide a broken result.)

    Parameters
    ----------
    data : Any
        Plain data (dicts, lists, numbers, text); numpy numbers are written as plain numbers.
    where : str
        What is being written, named in the error.

    Returns
    -------
    str
        The JSON text, indented by 2.

    Raises
    ------
    InputError
        When a figure is NaN or infinite (nothing is written).

    References
    ----------
    .. [1] RFC 8259 (2017), The JavaScript Object Notation (JSON) Data Interchange Format, section 6.
    """
    try:
        return json.dumps(data, indent=2, allow_nan=False, default=_plain_number)
    except ValueError:
        raise InputError(
            where, "result", "finite numbers only (a figure is NaN or infinite; nothing was written or recorded)"
        ) from None


def constructed(model: type[BaseModel], values: dict[str, Any], fields_set: set[str]) -> BaseModel:
    """An instance of ``model`` holding ``values`` as they are: no validation and no defaults filled in.

    For the many exchange rows and checks a portfolio makes from plain text, floats and lists made by the
    scoring itself: ``values`` must hold every field of the model, in the model's field order, already of the
    field's type (what pydantic's ``model_construct`` sets, without its pass over every field).

    Parameters
    ----------
    model : type of BaseModel
        The model (without extra fields, private attributes or a post-init hook).
    values : dict
        Field name -> value, every field of ``model``.
    fields_set : set of str
        The fields counted as set (shared by the instances made alike).

    Returns
    -------
    BaseModel
        The instance.
    """
    instance = model.__new__(model)
    object.__setattr__(instance, "__dict__", values)
    object.__setattr__(instance, "__pydantic_fields_set__", fields_set)
    object.__setattr__(instance, "__pydantic_extra__", None)
    object.__setattr__(instance, "__pydantic_private__", None)
    return instance


class FactorSetRef(BaseModel):
    name: str
    sha256: str


class Intensity(BaseModel):
    kg_co2e_per_t_nh3: float | None
    kg_co2e_per_kg_h2: float
    g_co2e_per_mj: float


class MonthOfMatching(BaseModel):
    month: str  # YYYY-MM, local calendar as written in the series
    load_kwh: float
    matched_kwh: float
    unmatched_kwh: float
    matched_share: float
    electricity_g_co2e_per_kwh: float  # counted intensity of the month's electricity under the scheme
    value: float  # the scheme's quantity for the month's production


class ElectricityMatching(BaseModel):
    """How a scheme matched the project's electricity use with its contracted generation, interval by interval."""

    granularity: str  # interval, hour, month, quarter, year (or the dated rule when it changes inside the series)
    rule: str  # the scheme's dated rule, e.g. "month until 2029-12-31, hour from 2030-01-01"
    rule_sources: list[str]
    matched_share: float  # 0 to 1 of the electricity use
    load_kwh: float
    matched_kwh: float
    unmatched_kwh: float
    matched_by_source_kwh: dict[str, float]
    eligible_sources: list[str]
    grid_kwh_per_kg_h2: float
    electricity_g_co2e_per_kwh: float  # counted intensity of the electricity with matching
    declared_electricity_g_co2e_per_kwh: float  # with the declared annual shares
    value_with_declared_shares: float
    grid_intensity: str  # "series" or "grid source factor"
    series_file: str
    series_sha256: str = ""
    first_interval: str
    intervals: int
    interval_minutes: int
    periods: int
    monthly: list[MonthOfMatching]


class Check(BaseModel):
    scheme: str
    name: str
    quantity: str
    basis: str
    boundary: str
    gwp_basis: str
    electricity_rule: str
    limit: float
    unit: str
    value: float
    passes: bool
    margin: float | None  # limit - value; None for a check that is not eligible
    tier: str | None
    from_memory: bool
    note: str = ""
    electricity_matching: ElectricityMatching | None = None  # with an electricity time series
    status: str = ""  # qualifies | fails | not_eligible | undetermined; passes is true only for qualifies
    reasons: list[str] = []  # short sentences naming each rule and its source, the deciding one first
    assessment_period: str = ""  # the dates the rules were read on (a calendar year)
    rule_versions: list[str] = []  # the version of each dated rule used
    electricity_counted_zero: list[str] = []  # electricity activities the scheme counts at zero
    # failing electricity activity -> grid activity whose intensity it is charged
    electricity_charged_as_grid: dict[str, str] = {}
    grade: str = ""  # the rulebook's grade: primary text, verbatim secondary, secondary, not yet verified
    user_rulebook: bool = False  # the rulebook is the user's own (--rulebook), not a shipped one
    rulebook_file: str = ""  # the file of a user rulebook
    # the co-product rule the rulebook requires, the project's own method and what the value used
    co_products: dict[str, Any] = {}


class ExchangeRow(BaseModel):
    activity: str
    stage: str
    kind: str
    input: str
    label: str
    amount: float
    unit: str
    activity_supply: float  # units of the activity per functional unit


class ScoreResult(BaseModel):
    carbonledger_version: str
    caution: str
    project: str
    project_file: str
    project_sha256: str
    assessment_year: int | None = None  # the calendar year whose dates the scheme rules were read on
    product: str
    boundary: str
    functional_unit: str
    reference_product: str = ""  # product of the functional unit: ammonia, or hydrogen (at the gate or cracked)
    unit: str
    gwp_basis: str
    factor_set: FactorSetRef
    total: float
    intensity: Intensity
    hydrogen_production_kg_co2e_per_kg_h2: float
    hydrogen_kg_per_unit: float = 1.0  # kg H2 produced at the hydrogen plant per functional unit
    gate_product_per_unit: float = 1.0  # t NH3 or kg H2 leaving the plant gate per functional unit
    hydrogen_mass_fraction: float = 1.0  # kg H2 contained per kg of the plant's product (1 for hydrogen)
    by_stage: dict[str, float]
    by_gas: dict[str, float]
    hydrogen_leakage_kg: float = 0.0  # kg H2 leaked or vented per functional unit (in non_ghg_kg too)
    # its indirect effect with the GWP100 of hydrogen (factor gwp_indirect.h2): not in total, by_gas or any scheme value
    hydrogen_leakage_kg_co2e: float = 0.0
    non_ghg_kg: dict[str, float] = {}  # kg per functional unit of flows that are not greenhouse gases (ammonia slip)
    # kg CO2 of biomass carbon per functional unit: released, and captured and stored; counted apart (characterised
    # at zero, not in by_gas or total) and never netted against the total or a scheme value unless its rulebook says so
    biogenic_co2_kg: dict[str, float] = {"released": 0.0, "captured_and_stored": 0.0}
    by_activity: dict[str, float]
    heating_values_mj_per_kg: dict[str, float]
    factors_used: list[Factor]  # the rows as the factor set holds them (model.factors.Factor)
    checks: list[Check]
    exchanges: list[ExchangeRow]
    parameters: dict[str, Any]
    delivery: dict[str, Any] = {}  # voyage and cracking figures (well-to-tank and well-to-wake)
    # a co-product of the hydrogen route, its amount and how the burden was shared (project's choice)
    co_products: dict[str, Any] = {}
    # electricity source -> its share, 1 less the others' after the --set overrides (--rebalance)
    rebalanced_shares: dict[str, float] = {}

    @computed_field
    @property
    def factor_grades(self) -> dict[str, list[str]]:
        """Ids of the factors used by source grade (primary text, verbatim secondary, secondary, not yet verified,
        invented)."""
        return grades_of(self.factors_used)

    @computed_field
    @property
    def from_memory(self) -> dict[str, list[str]]:
        """Ids of the factors used that are not yet verified against their source document (grade
        "not yet verified"; kept for compatibility, ``factor_grades`` has every grade) and of the
        rulebooks checked that were recorded from memory."""
        return from_memory_of(self)

    def to_json(self) -> str:
        return strict_json(self.model_dump(mode="json"), self.project_file)

    def summary(self) -> dict:
        """The compact figures stored in the run ledger."""
        return summary_of(self)

    def ledger_entry(self, kind: str = "score") -> dict:
        """What the run ledger stores of this result (plain values; the ledger imports no result type)."""
        return ledger_entry_of(self, kind)


def from_memory_of(result) -> dict[str, list[str]]:
    """Ids of a result's factors not yet verified and of its rulebooks recorded from memory.

    Parameters
    ----------
    result : ScoreResult or ResultFigures
        The result (its ``factors_used`` and ``checks``).

    Returns
    -------
    dict
        ``factors`` and ``rulebooks`` -> lists of ids.
    """
    return {
        "factors": [factor.id for factor in result.factors_used if factor.from_memory],
        "rulebooks": [check.scheme for check in result.checks if check.from_memory],
    }


def summary_of(result) -> dict:
    """The compact figures the run ledger stores of a result.

    Parameters
    ----------
    result : ScoreResult or ResultFigures
        The result.

    Returns
    -------
    dict
        Assessment year, total (kg CO2e per functional unit) and unit, intensities, stages and each check's
        value, unit, limit, passes, status and tier.
    """
    return {
        "assessment_year": result.assessment_year,
        "total": result.total,
        "unit": result.unit,
        "intensity": result.intensity.model_dump(),
        "by_stage": dict(result.by_stage),
        "checks": [
            {
                "scheme": c.scheme,
                "value": c.value,
                "unit": c.unit,
                "limit": c.limit,
                "passes": c.passes,
                "status": c.status,
                "tier": c.tier,
            }
            for c in result.checks
        ],
    }


def ledger_entry_of(result, kind: str) -> dict:
    """What the run ledger stores of a result: plain values (the ledger imports no result type).

    Parameters
    ----------
    result : ScoreResult or ResultFigures
        The result.
    kind : str
        The kind of run recorded (score, recalc, ...).

    Returns
    -------
    dict
        Project path, name and sha256, factor set and its sha256, schemes, boundary, GWP set, the
        ``summary_of`` figures, parameters, factor rows and kind.
    """
    return {
        "project_path": result.project_file,
        "project_name": result.project,
        "project_sha256": result.project_sha256,
        "factor_set": result.factor_set.name,
        "factor_set_sha256": result.factor_set.sha256,
        "schemes": [check.scheme for check in result.checks],
        "boundary": result.boundary,
        "gwp": result.gwp_basis,
        "results": summary_of(result),
        "parameters": result.parameters,
        "factors_used": list(result.factors_used),  # model.factors.Factor rows: the ledger stores their plain values
        "kind": kind,
    }


@dataclass(frozen=True)
class CheckFigures:
    """A scheme check's figures and verdict, without its sentences (what a portfolio's rows and the run
    ledger read of a ``Check``)."""

    scheme: str
    value: float
    unit: str
    limit: float
    passes: bool
    status: str
    tier: str | None
    from_memory: bool


@dataclass(frozen=True)
class ResultFigures:
    """The figures of a scored project a portfolio needs (``analyses.portfolio.recalc``): the headline, the
    intensities, stages and gases, the checks' values and verdicts, the parameters and factor rows; what the
    run ledger stores of a ``ScoreResult``, without its exchanges, activities or sentences."""

    project: str
    project_file: str
    project_sha256: str
    assessment_year: int | None
    product: str
    boundary: str
    unit: str
    gwp_basis: str
    factor_set: FactorSetRef
    total: float
    intensity: Intensity
    hydrogen_production_kg_co2e_per_kg_h2: float
    by_stage: dict[str, float]
    by_gas: dict[str, float]
    checks: tuple[CheckFigures, ...]
    parameters: dict[str, Any]
    factors_used: tuple[Factor, ...]

    @classmethod
    def of(cls, result: ScoreResult) -> ResultFigures:
        """The figures of a full result."""
        checks = tuple(
            CheckFigures(c.scheme, c.value, c.unit, c.limit, c.passes, c.status, c.tier, c.from_memory)
            for c in result.checks
        )
        names = [name for name in cls.__dataclass_fields__ if name not in ("checks", "factors_used")]
        return cls(
            **{name: getattr(result, name) for name in names}, checks=checks, factors_used=tuple(result.factors_used)
        )

    @property
    def from_memory(self) -> dict[str, list[str]]:
        return from_memory_of(self)

    def summary(self) -> dict:
        """The compact figures stored in the run ledger."""
        return summary_of(self)

    def ledger_entry(self, kind: str = "score") -> dict:
        """What the run ledger stores of this result."""
        return ledger_entry_of(self, kind)

    def under(self, factor_set: FactorSetRef) -> ResultFigures:
        """The same figures under another factor set's name (a project no changed factor reaches)."""
        return replace(self, factor_set=factor_set)
