"""Verdicts under a scheme's rules: eligibility, electricity, boundary, dates, then the threshold.

A scheme decides in this order and the verdict says which step decided:

1. eligibility: the hydrogen route and its energy are of the kind the scheme covers, and dated
   conditions on the plant hold (e.g. a construction deadline);
2. electricity: which sources count as fully renewable (or low-carbon) given how they are
   procured, the generator's age against the plant's (additionality), support received, the
   zone (geographic correlation) and the matching period in force on the assessment dates
   (temporal correlation); the others are charged at their factor;
3. boundary: the scheme's formula terms against what the project models;
4. the threshold tiers on the value computed under the scheme's GWP set.

Each rule gives a ``Finding``: met, not met, or unknown (cannot be judged from what the project
declares). Status: ``not_eligible`` when an eligibility rule is not met; ``fails`` when the
value misses the loosest threshold even with every unknown rule read in the project's favour;
``undetermined`` when a rule cannot be judged; ``qualifies`` otherwise. Reasons are short
sentences naming the rule and its source, the deciding one first.

Temporal matching finer than a declaration can show (hourly, half-hourly) needs interval data:
``matching`` (source name -> the finest period a time series has shown the source matched) is
the input a matching module supplies; without it such rules are unknown.

References
----------
.. [1] Commission Delegated Regulation (EU) 2023/1184, Art. 3-7 (fully renewable electricity).
.. [2] Commission Delegated Regulation (EU) 2023/1185, Annex Part A (E = e_i + e_p + e_td + e_u - e_ccs).
.. [3] 26 U.S.C. 45V and the final regulations of January 2025 (three requirements).
"""

from __future__ import annotations

import datetime as dt
from dataclasses import dataclass, field

from ..model.project import as_date
from ..model.rulebooks import PERIODS, Scheme

MET, NOT_MET, UNKNOWN, NOTE = "met", "not met", "cannot be judged", "note"  # a note never decides
STATUSES = ("qualifies", "fails", "not_eligible", "undetermined")
HOURLY_NEEDS_SERIES = "hourly matching needs a time series"


@dataclass(frozen=True)
class Period:
    """The assessment period: the dates on which the scheme's rules are read."""

    start: dt.date
    end: dt.date

    @classmethod
    def year(cls, year: int) -> Period:
        return cls(dt.date(year, 1, 1), dt.date(year, 12, 31))

    def label(self) -> str:
        if self.start.month == 1 and self.start.day == 1 and self.end == dt.date(self.start.year, 12, 31):
            return str(self.start.year)
        return f"{self.start.isoformat()} to {self.end.isoformat()}"


@dataclass(frozen=True)
class Finding:
    step: str  # eligibility, electricity, boundary, threshold, dates
    outcome: str  # MET, NOT_MET, UNKNOWN
    text: str  # a short sentence naming the rule and its source

    def sentence(self) -> str:
        return f"{self.outcome}: {self.text}"


@dataclass
class Reading:
    """Everything the rules say about one project under one scheme, before the threshold."""

    findings: list[Finding] = field(default_factory=list)
    counted_zero: set[str] = field(default_factory=set)  # electricity activity keys that count zero
    basis: str = "product"  # product, hydrogen_production or delivered
    versions: list[str] = field(default_factory=list)


def _source_note(text: str, from_memory: bool) -> str:
    return f"{text}{' (from memory)' if from_memory else ''}"


def eligibility_findings(scheme: Scheme, params: dict) -> list[Finding]:
    """The route the scheme covers and its dated conditions on the plant."""
    rules = scheme.eligibility
    if rules is None:
        return []
    route = params["hydrogen"]["route"]
    source = _source_note(rules.source, rules.from_memory)
    findings = []
    if route in rules.routes:
        findings.append(Finding("eligibility", MET, f"route {route} is covered: {rules.energy} [{source}]"))
    else:
        findings.append(Finding("eligibility", NOT_MET, f"route {route} is not covered: {rules.energy} [{source}]"))
    if rules.construction_start_before is not None:
        deadline = rules.construction_start_before.isoformat()
        where = _source_note(rules.construction_source or rules.source, rules.from_memory)
        started = as_date(params["project"].get("construction_start", ""))
        if started is None:
            findings.append(Finding("eligibility", UNKNOWN, f"construction must begin before {deadline}; project.construction_start is not given [{where}]"))
        elif started < rules.construction_start_before:
            findings.append(Finding("eligibility", MET, f"construction began {started.isoformat()}, before {deadline} [{where}]"))
        else:
            findings.append(Finding("eligibility", NOT_MET, f"construction began {started.isoformat()}, not before {deadline} [{where}]"))
    return findings


def temporal_rule_in_force(scheme: Scheme, day: dt.date):
    """The version of the temporal-correlation rule in force on a day (None when the scheme sets none)."""
    rules = scheme.electricity_rules
    if rules is None:
        return None
    return next((rule for rule in rules.temporal if rule.in_force(day)), None)


def _finer_or_equal(shown: str | None, required: str) -> bool:
    return shown is not None and PERIODS.index(shown) >= PERIODS.index(required)


def _additionality(rules, source: dict, name: str, plant_commissioning: dt.date | None, period: Period) -> list[Finding]:
    """Generator age against the plant's, and support, with the scheme's transition dates."""
    if rules.additionality_months is None:
        return []
    where = _source_note(rules.additionality_source or rules.source, rules.from_memory)
    months = rules.additionality_months
    start, transition = rules.additionality_applies_from, rules.additionality_transition_until
    if start is not None and source.get("procurement") != "direct_line":
        if period.end < start:
            return [Finding("electricity", MET, f"{name}: additionality applies from {start.isoformat()}, after the assessment period [{where}]")]
        if transition is not None and period.end <= transition:
            if plant_commissioning is None:
                return [Finding("electricity", UNKNOWN, f"{name}: additionality applies unless the plant was in operation before {start.isoformat()}; project.commissioning is not given [{where}]")]
            if plant_commissioning < start:
                return [Finding("electricity", MET, f"{name}: plant in operation before {start.isoformat()}, exempt from additionality until {transition.isoformat()} [{where}]")]
    findings = []
    generator = as_date(source.get("commissioned", ""))
    if generator is None or plant_commissioning is None:
        missing = "commissioned" if generator is None else "project.commissioning"
        findings.append(Finding("electricity", UNKNOWN, f"{name}: generator in operation no earlier than {months} months before the plant; {missing} is not given [{where}]"))
    else:
        earliest = _months_before(plant_commissioning, months)
        outcome = MET if generator >= earliest else NOT_MET
        findings.append(Finding("electricity", outcome, f"{name}: generator in operation {generator.isoformat()}, plant {plant_commissioning.isoformat()} (at most {months} months earlier allowed) [{where}]"))
    if rules.generator_without_support:
        supported = source.get("supported")
        if supported is None:
            findings.append(Finding("electricity", UNKNOWN, f"{name}: generator without operating or investment aid; supported is not given [{where}]"))
        else:
            findings.append(Finding("electricity", NOT_MET if supported else MET, f"{name}: generator {'received' if supported else 'received no'} operating or investment aid [{where}]"))
    return findings


def _months_before(day: dt.date, months: int) -> dt.date:
    month = day.month - 1 - months
    year = day.year + month // 12
    month = month % 12 + 1
    return dt.date(year, month, min(day.day, 28))


def electricity_findings(scheme: Scheme, params: dict, sources: dict[str, str], kinds: dict[str, str], period: Period, matching: dict[str, str] | None) -> tuple[set[str], list[Finding], list[str]]:
    """Which electricity activities count zero, the findings per source, and the rule versions read.

    ``sources``: electricity activity key -> source name; ``kinds``: key -> generator kind (from
    the factor's namespace: renewable, low_carbon, grid, fossil). A source counts zero when its
    kind and procurement are accepted and no rule is broken; unknown rules are read in its
    favour for the value and make the verdict undetermined.
    """
    rules = scheme.electricity_rules
    if rules is None or scheme.electricity != "renewable_at_zero":
        return set(), [], []
    where = _source_note(rules.source, rules.from_memory)
    declared = params["electricity"]["sources"]
    plant_commissioning = as_date(params["project"].get("commissioning", ""))
    plant_zone = params["project"].get("zone", "")
    counted, findings, versions = set(), [], []
    in_force = {day: temporal_rule_in_force(scheme, day) for day in (period.start, period.end)}
    for rule in dict.fromkeys(r for r in in_force.values() if r is not None):
        versions.append(f"temporal correlation {rule.period.replace('_', '-')} ({rule.version})")
    for key, name in sources.items():
        source = declared[name]
        kind, procurement = kinds.get(key, "other"), source.get("procurement")
        if kind not in rules.counts_at_zero:
            findings.append(Finding("electricity", NOT_MET, f"{name}: a {kind} source does not count zero; {rules.non_qualifying} [{where}]"))
            continue
        if procurement is None:
            findings.append(Finding("electricity", UNKNOWN, f"{name}: how it is procured is not declared (electricity.sources.{name}.procurement); counted zero only if {', '.join(rules.procurement)} [{where}]"))
            counted.add(key)
            continue
        if procurement not in rules.procurement:
            findings.append(Finding("electricity", NOT_MET, f"{name}: {procurement} is not accepted (only {', '.join(rules.procurement)}); {rules.non_qualifying} [{where}]"))
            continue
        own = [Finding("electricity", MET, f"{name}: {kind} generation by {procurement.replace('_', ' ')} [{where}]")]
        own += _additionality(rules, source, name, plant_commissioning, period)
        direct = procurement == "direct_line"
        if rules.geographic and not (direct and "geographic" in rules.exempt_direct_line):
            geo = _source_note(rules.geographic_source or rules.source, rules.from_memory)
            zone = source.get("zone", "")
            if not zone or not plant_zone:
                own.append(Finding("electricity", UNKNOWN, f"{name}: {rules.geographic}; zone of the {'generator' if not zone else 'plant'} is not given [{geo}]"))
            else:
                own.append(Finding("electricity", MET if zone == plant_zone else NOT_MET, f"{name}: {rules.geographic} (generator {zone}, plant {plant_zone}) [{geo}]"))
        if not (direct and "temporal" in rules.exempt_direct_line):
            for rule in dict.fromkeys(r for r in in_force.values()):
                own.append(_temporal(rule, name, source, matching, period))
        broken = any(f.outcome == NOT_MET for f in own)
        if broken:
            own.append(Finding("electricity", NOT_MET, f"{name}: does not count as fully renewable; {rules.non_qualifying} [{where}]"))
        else:
            counted.add(key)
        findings += own
    return counted, findings, versions


def _temporal(rule, name: str, source: dict, matching: dict[str, str] | None, period: Period) -> Finding:
    if rule is None:
        return Finding("electricity", UNKNOWN, f"{name}: no temporal-correlation rule of this rulebook is in force in {period.label()}")
    where = _source_note(f"{rule.source}, {rule.version}", rule.from_memory)
    required = rule.period.replace("_", "-")
    shown = (matching or {}).get(name)
    if PERIODS.index(rule.period) >= PERIODS.index("hourly"):
        if _finer_or_equal(shown, rule.period):
            return Finding("electricity", MET, f"{name}: {required} matching shown by a time series [{where}]")
        return Finding("electricity", UNKNOWN, f"{name}: {HOURLY_NEEDS_SERIES} ({required} rule in force in {period.label()}) [{where}]")
    declared = source.get("matched")
    if _finer_or_equal(shown, rule.period) or _finer_or_equal(declared, rule.period):
        return Finding("electricity", MET, f"{name}: {required} matching {'shown' if shown else 'declared'} [{where}]")
    if declared is None:
        return Finding("electricity", UNKNOWN, f"{name}: {required} matching required; electricity.sources.{name}.matched is not declared [{where}]")
    return Finding("electricity", NOT_MET, f"{name}: {required} matching required, {declared} declared [{where}]")


def boundary_findings(scheme: Scheme, present_stages: set[str], reference_product: str, gate_product: str, project_boundary: str) -> list[Finding]:
    """The scheme's formula terms against the stages the project models at its boundary."""
    findings = []
    for term in scheme.boundary_terms:
        where = term.source or scheme.document
        product = reference_product if scheme.basis == "delivered" else gate_product
        if product in term.zero_for:
            findings.append(Finding("boundary", MET, f"{term.term} ({term.meaning}) is zero for {product} [{where}]"))
        elif not term.stages or present_stages & set(term.stages):
            findings.append(Finding("boundary", MET, f"{term.term} ({term.meaning}) counted [{where}]"))
        elif term.absent_means == "zero":
            findings.append(Finding("boundary", MET, f"{term.term} ({term.meaning}) is zero: the project has none [{where}]"))
        else:
            findings.append(Finding("boundary", UNKNOWN, f"{term.term} ({term.meaning}) is not modelled at the project's {project_boundary} boundary; the value leaves it out [{where}]"))
    return findings


def status_of(findings: list[Finding], threshold_met: bool) -> str:
    if any(f.step == "eligibility" and f.outcome == NOT_MET for f in findings):
        return "not_eligible"
    if not threshold_met:
        return "fails"
    if any(f.outcome == UNKNOWN for f in findings):
        return "undetermined"
    return "qualifies"


def ordered_reasons(status: str, findings: list[Finding], threshold_text: str) -> list[str]:
    """Reasons as sentences, the deciding ones first."""
    threshold = Finding("threshold", MET if status in ("qualifies", "undetermined") else NOT_MET, threshold_text)
    if status == "not_eligible":
        first = [f for f in findings if f.step == "eligibility" and f.outcome == NOT_MET]
    elif status == "fails":
        first = [threshold]
    elif status == "undetermined":
        first = [f for f in findings if f.outcome == UNKNOWN]
    else:
        first = [threshold]
    rest = [f for f in findings + [threshold] if f not in first]
    return [f.sentence() for f in first + rest]
