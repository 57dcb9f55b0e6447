"""Scheme rulebooks: what each low-carbon scheme limits, on which basis, and the verdict.

A rulebook (``factors/schemes/ID.toml``) states the product(s) it applies to, the quantity
it limits and its unit, the basis (the product, or the hydrogen at the hydrogen plant's gate),
the boundary and stages it leaves out, the GWP100 set, how electricity counts
(``lifecycle``: every source at its factor; ``renewable_at_zero``: renewable sources count
zero), whether construction (capital) emissions count (``counts_construction``, used by
lifetime scoring), and one or more thresholds (tiers) with their legal source.

A scheme decides in steps, and the rulebook states each as data with its source and a
``from_memory`` flag: ``eligibility`` (the routes and energy it covers, dates such as a
construction deadline), ``electricity_rules`` (which generator kinds and ways of procurement
count, additionality, geographic and temporal correlation with the dates each version applies,
what a kWh that does not count is charged), ``boundary_terms`` (the scheme's own formula terms
mapped to carbonledger's stages), the GWP set and the threshold tiers. ``core.verdicts`` reads
them; the official methodology and an accredited verifier decide.
"""

from __future__ import annotations

import datetime as dt
import tomllib
from pathlib import Path
from typing import Literal

from pydantic import BaseModel, ConfigDict, Field, ValidationError

from ..errors import InputError, did_you_mean, match_id
from .factors import factors_root

QUANTITIES = ("kg_co2e_per_kg_h2", "g_co2e_per_mj", "kg_co2e_per_t_nh3", "kg_co2e_per_kg_nh3")


class Threshold(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True, allow_inf_nan=False)
    tier: str
    limit: float
    inclusive: bool = True
    source: str = Field(min_length=1)
    from_memory: bool = False

    def met_by(self, value: float) -> bool:
        return value <= self.limit if self.inclusive else value < self.limit


PROCUREMENT = ("direct_line", "ppa", "certificates", "grid")
PERIODS = ("annual", "monthly", "hourly", "half_hourly")  # coarse to fine


class Eligibility(BaseModel):
    """What the scheme covers: hydrogen routes, energy, and dated conditions on the plant."""

    model_config = ConfigDict(extra="forbid", frozen=True)
    routes: list[str] = Field(min_length=1)
    energy: str = Field(min_length=1)  # the scheme's words on the energy it covers
    requires_counted_electricity: bool = False  # the energy must be electricity that counts under electricity_rules
    excludes_counted_electricity: bool = False  # electrolysis whose every source counts fully renewable is not covered
    source: str = Field(min_length=1)
    from_memory: bool = True
    construction_start_before: dt.date | None = None
    construction_source: str = ""


class TemporalRule(BaseModel):
    """One version of the temporal-correlation rule and the dates it applies (inclusive)."""

    model_config = ConfigDict(extra="forbid", frozen=True)
    period: Literal[PERIODS]
    applies_from: dt.date | None = None
    applies_until: dt.date | None = None
    version: str = Field(min_length=1)
    source: str = Field(min_length=1)
    from_memory: bool = True

    def in_force(self, day: dt.date) -> bool:
        return (self.applies_from is None or day >= self.applies_from) and (self.applies_until is None or day <= self.applies_until)


class ElectricityRules(BaseModel):
    """When a kWh counts as fully renewable (or low-carbon) under the scheme, and what the others are charged."""

    model_config = ConfigDict(extra="forbid", frozen=True)
    counts_at_zero: list[str]  # generator kinds (factor namespace: renewable, low_carbon) that can count zero
    procurement: list[Literal[PROCUREMENT]]  # ways of procurement accepted for counting zero
    source: str = Field(min_length=1)
    from_memory: bool = True
    non_qualifying: str = Field(min_length=1)  # what a kWh that does not count is charged
    additionality_months: int | None = None  # generator in operation no earlier than N months before the plant
    additionality_applies_from: dt.date | None = None
    additionality_transition_until: dt.date | None = None  # plants in operation before applies_from are exempt until then
    generator_without_support: bool = False  # generator received no operating or investment aid
    additionality_source: str = ""
    geographic: str = ""  # '' when the scheme sets no geographic rule
    geographic_source: str = ""
    temporal: list[TemporalRule] = []
    exempt_direct_line: list[Literal["temporal", "geographic"]] = []


class BoundaryTerm(BaseModel):
    """A term of the scheme's formula and the carbonledger stages it counts."""

    model_config = ConfigDict(extra="forbid", frozen=True)
    term: str
    meaning: str
    stages: list[str] = []
    zero_for: list[Literal["hydrogen", "ammonia"]] = []  # products for which the term is zero by nature
    absent_means: Literal["zero", "not_modelled"] = "zero"  # a project without these stages: the term is zero, or not modelled
    source: str = ""


CO_PRODUCT_RULES = ("energy", "mass", "economic", "system_expansion", "none", "not_stated")


class CoProductRule(BaseModel):
    """How the scheme shares a production process's burden with its co-products.

    ``rule`` applies to co-products that carry energy (steam, electricity, fuels, carbon with a heating
    value); ``non_energy_rule`` to those without (oxygen, chlorine, sodium hydroxide), '' = as ``rule``;
    ``rigid_rule`` where the ratio of the outputs is fixed by the process (stoichiometry), '' = as the
    others. ``not_stated``: the scheme's text sets no rule found here; the project's own choice is used
    and the result says so.
    """

    model_config = ConfigDict(extra="forbid", frozen=True)
    rule: Literal[CO_PRODUCT_RULES]
    non_energy_rule: Literal[CO_PRODUCT_RULES + ("",)] = ""
    rigid_rule: Literal[CO_PRODUCT_RULES + ("",)] = ""
    source: str = Field(min_length=1)
    from_memory: bool = True
    note: str = ""

    def for_co_product(self, carries_energy: bool, rigid: bool) -> str:
        """The rule for one co-product: the rigid rule first, then by whether it carries energy."""
        if rigid and self.rigid_rule:
            return self.rigid_rule
        if not carries_energy and self.non_energy_rule:
            return self.non_energy_rule
        return self.rule


class Scheme(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True)
    id: str
    name: str
    document: str = Field(min_length=1)
    year: int
    products: list[Literal["hydrogen", "ammonia"]]
    basis: Literal["product", "hydrogen_production", "delivered"]
    quantity: Literal[QUANTITIES]
    unit: str
    boundary: str
    gwp: str
    electricity: Literal["lifecycle", "renewable_at_zero"]
    excluded_stages: list[str] = []
    counts_construction: bool = False  # construction (capital) emissions added over the life
    construction_note: str = ""
    from_memory: bool = False
    note: str = ""
    thresholds: list[Threshold] = Field(min_length=1)
    version: str = ""  # the version of the scheme's text this rulebook reads
    applies_from: dt.date | None = None
    applies_until: dt.date | None = None
    eligibility: Eligibility | None = None
    electricity_rules: ElectricityRules | None = None
    boundary_terms: list[BoundaryTerm] = []
    co_products: CoProductRule | None = None  # None: no rule recorded (treated as not_stated)
    nets_stored_biogenic_co2: bool = False  # captured and stored biogenic CO2 subtracted from the scheme value
    biogenic_co2_source: str = ""  # where the rulebook's treatment of stored biogenic CO2 is read

    def loosest(self) -> Threshold:
        return max(self.thresholds, key=lambda t: t.limit)

    def evaluate(self, value: float) -> dict:
        """Pass/fail against the loosest threshold, margin (limit - value) and best tier met."""
        loosest = self.loosest()
        met = [t for t in self.thresholds if t.met_by(value)]
        best = min(met, key=lambda t: t.limit) if met else None
        return {
            "limit": loosest.limit,
            "passes": loosest.met_by(value),
            "margin": loosest.limit - value,
            "tier": best.tier if best else None,
        }


def schemes_folder() -> Path:
    return factors_root() / "schemes"


def load_schemes(folder: Path | None = None) -> dict[str, Scheme]:
    folder = folder or schemes_folder()
    if not folder.is_dir() or not any(folder.glob("*.toml")):
        raise InputError(folder, "", "a folder of scheme rulebooks (*.toml); none found (set CARBONLEDGER_FACTORS to a factor library with schemes/, or reinstall carbonledger)")
    schemes: dict[str, Scheme] = {}
    for path in sorted(folder.glob("*.toml")):
        try:
            data = tomllib.loads(path.read_text(encoding="utf-8"))
            scheme = Scheme.model_validate(data)
        except tomllib.TOMLDecodeError as error:
            raise InputError(path, "", f"valid TOML ({error})") from None
        except ValidationError as error:
            first = error.errors()[0]
            raise InputError(path, ".".join(str(p) for p in first["loc"]), first["msg"].lower()) from None
        schemes[scheme.id] = scheme
    return schemes


def scheme_ids(requested: list[str] | None, all_schemes: dict[str, Scheme]) -> list[str]:
    """The requested scheme ids as the rulebooks spell them (ids are case-insensitive); an
    unknown id is refused with the closest known one."""
    found = []
    for scheme_id in requested or []:
        known = match_id(scheme_id, all_schemes)
        if known is None:
            raise InputError("--scheme", scheme_id, f"one of {', '.join(all_schemes)}{did_you_mean(scheme_id, all_schemes)}")
        found.append(known)
    return found


def select_schemes(all_schemes: dict[str, Scheme], requested: list[str] | None, product: str) -> list[Scheme]:
    """The schemes to check: those requested (each must exist and fit the product), else all that apply."""
    if not requested:
        return [s for s in all_schemes.values() if product in s.products]
    chosen = []
    for requested_id, scheme_id in zip(requested, scheme_ids(requested, all_schemes), strict=True):
        scheme = all_schemes[scheme_id]
        if product not in scheme.products:
            raise InputError("--scheme", requested_id, f"a scheme for product '{product}' (it covers {', '.join(scheme.products)})")
        chosen.append(scheme)
    return chosen
