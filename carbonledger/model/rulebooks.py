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
from collections.abc import Iterator, Sequence
from contextlib import contextmanager
from contextvars import ContextVar
from pathlib import Path
from typing import Literal

import numpy as np
from pydantic import BaseModel, ConfigDict, Field, PrivateAttr, ValidationError, field_validator

from ..errors import InputError, did_you_mean, match_id
from .factors import factors_root
from .grades import Grade
from .input_files import read_input_bytes

QUANTITIES = ("kg_co2e_per_kg_h2", "g_co2e_per_mj", "kg_co2e_per_t_nh3", "kg_co2e_per_kg_nh3")
# the unit a quantity's limits may be written in (spaces and case ignored): the quantity's own unit, nothing converted
QUANTITY_UNITS = {
    "kg_co2e_per_kg_h2": ("kg CO2e/kg H2",),
    "g_co2e_per_mj": ("g CO2e/MJ", "g CO2e/MJ H2", "g CO2e/MJ (LHV)", "g CO2e/MJ H2 (LHV)"),
    "kg_co2e_per_t_nh3": ("kg CO2e/t NH3",),
    "kg_co2e_per_kg_nh3": ("kg CO2e/kg NH3",),
}
USER_RULEBOOK = "user rulebook"  # the words that mark a rulebook the user gave (--rulebook) in every output
MAX_RULEBOOK_BYTES = 1_000_000
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
    # no credit where the capture equipment earns another credit (45Q)
    excludes_capture_credit: DatedCondition | None = None


class TemporalRule(Graded):
    """One version of the temporal-correlation rule and the dates it applies (inclusive)."""

    period: Literal[PERIODS]
    applies_from: dt.date | None = None
    applies_until: dt.date | None = None
    version: str = Field(min_length=1)
    source: str = Field(min_length=1)

    def in_force(self, day: dt.date) -> bool:
        return (self.applies_from is None or day >= self.applies_from) and (
            self.applies_until is None or day <= self.applies_until
        )

    def in_words(self) -> str:
        """The period and the dates the rule is in force: 'monthly until 2029-12-31', 'hourly from 2030-01-01'."""
        words = [self.period.replace("_", "-")]
        if self.applies_from is not None:
            words.append(f"from {self.applies_from.isoformat()}")
        if self.applies_until is not None:
            words.append(f"until {self.applies_until.isoformat()}")
        return " ".join(words)


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
    # plants in operation before applies_from are exempt until then (inclusive)
    additionality_transition_until: dt.date | None = None
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
    # a project without these stages: the term is zero, or not modelled
    absent_means: Literal["zero", "not_modelled"] = "zero"
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

    _user_file: str = PrivateAttr("")  # the file of a user rulebook (--rulebook); "" for a shipped one

    @field_validator("unit")
    @classmethod
    def _unit_fits_quantity(cls, unit: str, info):
        quantity = info.data.get("quantity")
        accepted = QUANTITY_UNITS.get(quantity, ())
        if accepted and _unit_key(unit) not in {_unit_key(text) for text in accepted}:
            raise ValueError(f"{unit_expected(quantity)}, got {unit!r} (limits are not converted)")
        return unit

    @property
    def user_file(self) -> str:
        """The file of a user rulebook given with --rulebook; "" for a shipped rulebook."""
        return self._user_file

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


def unit_expected(quantity: str) -> str:
    """What a rulebook's ``unit`` must be for its ``quantity``, in words."""
    accepted = " or ".join(repr(text) for text in QUANTITY_UNITS.get(quantity, ()))
    return (
        f"the unit of the thresholds' limits, that of quantity '{quantity}': {accepted}"
        if accepted
        else "the unit of the thresholds' limits"
    )


def _unit_key(unit: str) -> str:
    return "".join(unit.split()).lower()


def schemes_folder() -> Path:
    return factors_root() / "schemes"


def load_schemes(folder: Path | None = None) -> dict[str, Scheme]:
    folder = folder or schemes_folder()
    if not folder.is_dir() or not any(folder.glob("*.toml")):
        raise InputError(
            folder,
            "",
            "a folder of scheme rulebooks (*.toml); none found (set CARBONLEDGER_FACTORS to a factor library with "
            "schemes/, or reinstall carbonledger)",
        )
    schemes: dict[str, Scheme] = {}
    for path in sorted(folder.glob("*.toml")):
        scheme = read_rulebook(path, path.read_text(encoding="utf-8"))
        schemes[scheme.id] = scheme
    return schemes


def read_rulebook(path: Path, text: str) -> Scheme:
    """A rulebook's TOML text validated by ``Scheme``; the first problem as one InputError line."""
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as error:
        raise InputError(path, "", f"valid TOML ({error})") from None
    try:
        return Scheme.model_validate(data)
    except ValidationError as error:
        errors = error.errors()
        # a misspelt key shows up twice: as unknown, and as the right key missing; name the unknown one
        first = next((e for e in errors if e["type"] == "extra_forbidden"), errors[0])
        field = ".".join(str(p) for p in first["loc"])
        if first["type"] == "missing" and field == "unit":
            raise InputError(path, field, unit_expected(str(data.get("quantity", "")))) from None
        if first["type"] == "extra_forbidden":
            key = str(first["loc"][-1])
            raise InputError(
                path,
                field,
                f"no such key in a rulebook{did_you_mean(key, rulebook_keys())} (the keys: see factors/schemes/*.toml)",
            ) from None
        expected = first["msg"].removeprefix("Value error, ")
        raise InputError(path, field, expected[:1].lower() + expected[1:]) from None


def rulebook_keys(model: type[BaseModel] | None = None) -> set[str]:
    """Every key a rulebook may hold, at any level (for "did you mean")."""
    keys: set[str] = set()
    for name, info in (model or Scheme).model_fields.items():
        keys.add(name)
        for inner in (info.annotation, *getattr(info.annotation, "__args__", ())):
            for nested in (inner, *getattr(inner, "__args__", ())):
                if isinstance(nested, type) and issubclass(nested, BaseModel):
                    keys |= rulebook_keys(nested)
    return keys


def load_user_rulebooks(paths: Sequence[str | Path], shipped: dict[str, Scheme]) -> dict[str, Scheme]:
    """The user's own rulebooks (--rulebook FILE.toml), validated as the shipped ones are, each marked
    with its file and named as a user rulebook; an id that a shipped or another user rulebook has is refused."""
    found: dict[str, Scheme] = {}
    for path in dict.fromkeys(Path(given) for given in paths):  # a file given twice is read once
        try:
            scheme = read_rulebook(path, read_input_bytes(path, "rulebook", MAX_RULEBOOK_BYTES).decode("utf-8-sig"))
        except InputError as error:  # the whole file: named by the option that gave it
            raise InputError(path, error.field or "--rulebook", error.expected) from None
        except UnicodeDecodeError:
            raise InputError(path, "--rulebook", "a UTF-8 TOML rulebook (save it as UTF-8)") from None
        taken = match_id(scheme.id, shipped) or match_id(scheme.id, found)
        if taken is not None:
            kind = "a shipped rulebook" if taken in shipped else f"the user rulebook {found[taken].user_file}"
            raise InputError(path, "id", f"an id of its own; '{scheme.id}' is the id of {kind}")
        scheme = scheme.model_copy(update={"name": f"{scheme.name} ({USER_RULEBOOK})"})
        scheme._user_file = str(path)
        found[scheme.id] = scheme
    return found


_USER_RULEBOOKS: ContextVar[dict[str, Scheme]] = ContextVar("user_rulebooks", default={})  # noqa: B039 (never mutated)


def user_rulebooks() -> dict[str, Scheme]:
    """The user rulebooks in use (``using_rulebooks``): id -> Scheme."""
    return _USER_RULEBOOKS.get()


def set_user_rulebooks(schemes: dict[str, Scheme]):
    """Put user rulebooks in use; returns the token that ``reset_user_rulebooks`` takes."""
    return _USER_RULEBOOKS.set(dict(schemes))


def reset_user_rulebooks(token) -> None:
    _USER_RULEBOOKS.reset(token)


@contextmanager
def using_rulebooks(schemes: dict[str, Scheme]) -> Iterator[dict[str, Scheme]]:
    """Check the user rulebooks ``schemes`` beside the shipped ones inside the block."""
    token = set_user_rulebooks(schemes)
    try:
        yield schemes
    finally:
        reset_user_rulebooks(token)


def scheme_ids(requested: list[str] | None, all_schemes: dict[str, Scheme]) -> list[str]:
    """The requested scheme ids as the rulebooks spell them (ids are case-insensitive); an
    unknown id is refused with the closest known one."""
    found = []
    for scheme_id in requested or []:
        known = match_id(scheme_id, all_schemes)
        if known is None:
            raise InputError(
                "--scheme", scheme_id, f"one of {', '.join(all_schemes)}{did_you_mean(scheme_id, all_schemes)}"
            )
        found.append(known)
    return found


def select_schemes(all_schemes: dict[str, Scheme], requested: list[str] | None, product: str) -> list[Scheme]:
    """The schemes to check: those requested (each must exist and fit the product), else all that apply."""
    if not requested:
        return [s for s in all_schemes.values() if product in s.products]
    chosen: list[Scheme] = []
    for requested_id, scheme_id in zip(requested, scheme_ids(requested, all_schemes), strict=True):
        scheme = all_schemes[scheme_id]
        if product not in scheme.products:
            raise InputError(
                "--scheme", requested_id, f"a scheme for product '{product}' (it covers {', '.join(scheme.products)})"
            )
        chosen.append(scheme)
    added = [
        s for s in all_schemes.values() if s.user_file and product in s.products and s.id not in {c.id for c in chosen}
    ]
    return chosen + added  # a user rulebook is checked beside the schemes asked for
