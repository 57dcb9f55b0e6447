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

Every rule names its document, article and paragraph (``source``) and a ``grade``: how surely it
was read: ``primary text`` (the legal text or an exact official copy), ``verbatim secondary`` (a
third party quoting it word for word), ``secondary`` (a summary), or ``not yet verified`` (not
checked against the source document). ``from_memory`` is derived: true for ``not yet verified``.
The temporal-correlation rules live here only; matching reads them from the rulebook.
"""

from __future__ import annotations

import datetime as dt
import functools
import tomllib
from pathlib import Path
from typing import Literal

import numpy as np
from pydantic import BaseModel, ConfigDict, Field, ValidationError

from ..errors import InputError, did_you_mean, match_id
from .factors import factors_root
from .grades import Grade

QUANTITIES = ("kg_co2e_per_kg_h2", "g_co2e_per_mj", "kg_co2e_per_t_nh3", "kg_co2e_per_kg_nh3")
UNVERIFIED = Grade.NOT_YET_VERIFIED
LIMIT_RTOL = 1e-9  # a value this close to a limit (relative) is at the limit: a published limit is not a float


class Graded(BaseModel):
    """A rule with its source and the grade of that source."""

    model_config = ConfigDict(extra="forbid", frozen=True, allow_inf_nan=False)
    grade: Grade = UNVERIFIED  # the grades of model.grades, shared with factor rows

    @property
    def from_memory(self) -> bool:
        return self.grade == UNVERIFIED


@functools.lru_cache(maxsize=4096)
def grade_note(source: str, grade: str) -> str:
    """A source as reasons cite it: the grade is named unless it is the primary text."""
    return source if grade == Grade.PRIMARY_TEXT else f"{source}; {Grade(grade).value}"


def at_or_under(value, limit: float, inclusive: bool):
    """value <= limit (inclusive) or value < limit, a value within LIMIT_RTOL of the limit counting as
    equal to it (numbers, or numpy arrays of draws element by element)."""
    if isinstance(value, (float, int)):  # one number: the same comparison in plain floats (a portfolio makes many)
        equal = abs(value - limit) <= LIMIT_RTOL * max(1.0, abs(limit))
        return bool(equal or value < limit) if inclusive else bool(not equal and value < limit)
    value = np.asarray(value, dtype=float)
    equal = np.abs(value - limit) <= LIMIT_RTOL * max(1.0, abs(limit))
    met = (equal | (value < limit)) if inclusive else (~equal & (value < limit))
    return bool(met) if met.ndim == 0 else met


class Threshold(Graded):
    tier: str
    limit: float
    inclusive: bool = True
    source: str = Field(min_length=1)

    def met_by(self, value: float) -> bool:
        return at_or_under(value, self.limit, self.inclusive)


PROCUREMENT = ("direct_line", "ppa", "certificates", "grid")
PERIODS = ("annual", "monthly", "hourly", "half_hourly")  # coarse to fine


class DatedCondition(Graded):
    """A condition on the plant's dates or declarations that decides eligibility, with its article."""

    source: str = Field(min_length=1)


class Eligibility(Graded):
    """What the scheme covers: hydrogen routes, energy, where and when the plant produces.

    ``grid_renewable_share``: electrolysis none of whose electricity counts fully renewable is still
    covered for the share of its output that the country's average renewable share of grid
    electricity sets (Directive (EU) 2018/2001 Art. 27(6)); the source of that rule, '' when the
    scheme has none. ``excludes_counted_electricity``: electrolysis whose every kWh counts fully
    renewable is not covered (it is a renewable fuel instead).
    """

    routes: list[str] = Field(min_length=1)
    energy: str = Field(min_length=1)  # the scheme's words on the energy it covers
    requires_counted_electricity: bool = False  # the energy must be electricity that counts under electricity_rules
    grid_renewable_share: str = ""
    excludes_counted_electricity: bool = False
    source: str = Field(min_length=1)
    construction_start_before: dt.date | None = None
    construction_source: str = ""
    countries: list[str] = []  # ISO 3166-1 alpha-2 codes where production must take place ([] = anywhere)
    countries_in_words: str = ""
    countries_rule: DatedCondition | None = None
    credit_period_years: int | None = None  # years from the date the plant was placed in service
    credit_period_rule: DatedCondition | None = None
    excludes_capture_credit: DatedCondition | None = None  # no credit where the capture equipment earns another credit (45Q)


class TemporalRule(Graded):
    """One version of the temporal-correlation rule and the dates it applies (inclusive)."""

    period: Literal[PERIODS]
    applies_from: dt.date | None = None
    applies_until: dt.date | None = None
    version: str = Field(min_length=1)
    source: str = Field(min_length=1)

    def in_force(self, day: dt.date) -> bool:
        return (self.applies_from is None or day >= self.applies_from) and (self.applies_until is None or day <= self.applies_until)


class ElectricityRules(Graded):
    """When a kWh counts as fully renewable (or low-carbon) under the scheme, and what the others are charged.

    A kWh that fails a rule is charged as grid electricity of the plant's zone (``charge_failing``
    ``grid``: the project's grid source in that zone gives the intensity) or at the source's own
    factor (``own``). A direct line is judged by ``direct_connection_months`` (generator age only)
    when it is set, else like any other procurement.
    """

    counts_at_zero: list[str]  # generator kinds (factor namespace: renewable, low_carbon) that can count zero
    procurement: list[Literal[PROCUREMENT]]  # ways of procurement accepted for counting zero
    source: str = Field(min_length=1)
    non_qualifying: str = Field(min_length=1)  # what a kWh that does not count is charged, in words with the article
    charge_failing: Literal["grid", "own"] = "grid"
    additionality_months: int | None = None  # generator in operation no earlier than N months before the plant
    additionality_applies_from: dt.date | None = None
    additionality_transition_until: dt.date | None = None  # plants in operation before applies_from are exempt until then (inclusive)
    additionality_transition_source: str = ""
    generator_without_support: bool = False  # generator received no operating or investment aid
    additionality_source: str = ""
    direct_connection_months: int | None = None
    direct_connection_source: str = ""
    geographic: str = ""  # '' when the scheme sets no geographic rule
    geographic_source: str = ""
    other_zone: Literal["not_met", "cannot_be_judged"] = "not_met"  # a generator in another zone
    other_zone_alternatives: str = ""  # the alternatives the text allows for another zone, in words
    temporal: list[TemporalRule] = []
    exempt_direct_line: list[Literal["temporal", "geographic"]] = []
    not_judged: str = ""  # other ways the text lets electricity count, not judged here (named in the reasons)


class BoundaryTerm(Graded):
    """A term of the scheme's formula and the carbonledger stages it counts."""

    term: str
    meaning: str
    stages: list[str] = []
    zero_for: list[Literal["hydrogen", "ammonia"]] = []  # products for which the term is zero by nature
    absent_means: Literal["zero", "not_modelled"] = "zero"  # a project without these stages: the term is zero, or not modelled
    source: str = ""


CO_PRODUCT_RULES = ("energy", "mass", "economic", "system_expansion", "none", "not_stated")


class CoProductRule(Graded):
    """How the scheme shares a production process's burden with its co-products.

    ``rule`` applies to co-products that carry energy (steam, electricity, fuels, carbon with a heating
    value); ``non_energy_rule`` to those without (oxygen, chlorine, sodium hydroxide), '' = as ``rule``;
    ``rigid_rule`` where the ratio of the outputs is fixed by the process (stoichiometry), '' = as the
    others. ``not_stated``: the scheme's text sets no rule found here; the project's own choice is used
    and the result says so.
    """

    rule: Literal[CO_PRODUCT_RULES]
    non_energy_rule: Literal[CO_PRODUCT_RULES + ("",)] = ""
    rigid_rule: Literal[CO_PRODUCT_RULES + ("",)] = ""
    source: str = Field(min_length=1)
    note: str = ""

    def for_co_product(self, carries_energy: bool, rigid: bool) -> str:
        """The rule for one co-product: the rigid rule first, then by whether it carries energy."""
        if rigid and self.rigid_rule:
            return self.rigid_rule
        if not carries_energy and self.non_energy_rule:
            return self.non_energy_rule
        return self.rule


class Scheme(Graded):
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

    def tier_met(self, value: float) -> Threshold | None:
        """The strictest tier the value meets (None when it meets none)."""
        met = [t for t in self.thresholds if t.met_by(value)]
        return min(met, key=lambda t: t.limit) if met else None

    def evaluate(self, value: float) -> dict:
        """Pass/fail against the loosest threshold, margin (limit - value) and best tier met."""
        loosest = self.loosest()
        best = self.tier_met(value)
        return {
            "limit": loosest.limit,
            "passes": loosest.met_by(value),
            "margin": loosest.limit - value,
            "tier": best.tier if best else None,
        }

    def temporal_rule_on(self, day: dt.date) -> TemporalRule | None:
        """The version of the temporal-correlation rule in force on a day (None when the scheme sets none)."""
        rules = self.electricity_rules
        if rules is None:
            return None
        return next((rule for rule in rules.temporal if rule.in_force(day)), None)

    @property
    def rules_unverified(self) -> bool:
        """The rulebook or one of its thresholds is not yet verified against its source document."""
        return self.from_memory or any(t.from_memory for t in self.thresholds)


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
