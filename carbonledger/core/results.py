"""The result of scoring a project: everything an output needs, so outputs never recompute.

Pydantic models at the output edge; ``ScoreResult.model_dump(mode="json")`` is the stable
JSON documented in the README.
"""

from __future__ import annotations

from typing import Any

from pydantic import BaseModel


class FactorSetRef(BaseModel):
    name: str
    sha256: str


class Intensity(BaseModel):
    kg_co2e_per_t_nh3: float | None
    kg_co2e_per_kg_h2: float
    g_co2e_per_mj: float


class FactorUsed(BaseModel):
    id: str
    value: float
    unit: str
    source: str
    table: str = ""
    year: int | None = None
    region: str = ""
    note: str = ""
    from_memory: bool = False


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
    margin: float
    tier: str | None
    from_memory: bool
    note: str = ""
    status: str = ""  # qualifies | fails | not_eligible | undetermined; passes is true only for qualifies
    reasons: list[str] = []  # short sentences naming each rule and its source, the deciding one first
    assessment_period: str = ""  # the dates the rules were read on (a calendar year)
    rule_versions: list[str] = []  # the version of each dated rule used
    electricity_counted_zero: list[str] = []  # electricity activities the scheme counts at zero


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
    by_stage: dict[str, float]
    by_gas: dict[str, float]
    non_ghg_kg: dict[str, float] = {}  # kg per functional unit of flows that are not greenhouse gases (ammonia slip)
    by_activity: dict[str, float]
    heating_values_mj_per_kg: dict[str, float]
    factors_used: list[FactorUsed]
    checks: list[Check]
    exchanges: list[ExchangeRow]
    parameters: dict[str, Any]
    delivery: dict[str, Any] = {}  # voyage and cracking figures (well-to-tank and well-to-wake)

    def to_json(self) -> str:
        return self.model_dump_json(indent=2)

    def summary(self) -> dict:
        """The compact figures stored in the run ledger."""
        return {
            "total": self.total,
            "unit": self.unit,
            "intensity": self.intensity.model_dump(),
            "by_stage": dict(self.by_stage),
            "checks": [{"scheme": c.scheme, "value": c.value, "unit": c.unit, "limit": c.limit, "passes": c.passes, "status": c.status, "tier": c.tier} for c in self.checks],
        }

    def ledger_entry(self, kind: str = "score") -> dict:
        """What the run ledger stores of this result (plain values; the ledger imports no result type)."""
        return {
            "project_path": self.project_file,
            "project_name": self.project,
            "project_sha256": self.project_sha256,
            "factor_set": self.factor_set.name,
            "factor_set_sha256": self.factor_set.sha256,
            "schemes": [check.scheme for check in self.checks],
            "boundary": self.boundary,
            "gwp": self.gwp_basis,
            "results": self.summary(),
            "parameters": self.parameters,
            "factors_used": [factor.model_dump() for factor in self.factors_used],
            "kind": kind,
        }
