"""Verdicts under a scheme's rules: eligibility, electricity, boundary, dates, then the threshold.

A scheme decides in this order and the verdict says which step decided:

1. eligibility: the hydrogen route and its energy are of the kind the scheme covers, and the
   plant's place and dates meet the scheme (construction deadline, credit period, country of
   production, no other credit for the capture equipment);
2. electricity: which sources count as fully renewable (or low-carbon) given how they are
   procured, the generator's age against the plant's (additionality, with its transition), support
   received, the zone (geographic correlation) and the matching period in force in the assessment
   year (temporal correlation). A kWh that fails a rule is charged as the rulebook says: as grid
   electricity of the plant's zone (the project's grid source in that zone gives the intensity),
   never at its generator's own factor where the rulebook charges the grid;
3. boundary: the scheme's formula terms against what the project models;
4. the threshold tiers on the value computed under the scheme's GWP set.

Each rule gives a ``Finding``: met, not met, cannot be judged (the project does not give the fact
that decides it), or a note (never decides). Status: ``not_eligible`` when an eligibility rule is
not met (no threshold judgement, no margin); ``fails`` when the value misses the loosest
threshold; ``undetermined`` when a rule cannot be judged; ``qualifies`` otherwise. Reasons are
sentences naming the rule and its source, the deciding one first.

References
----------
.. [1] Commission Delegated Regulation (EU) 2023/1184, Art. 3-7 and 11 (fully renewable electricity).
.. [2] Commission Delegated Regulation (EU) 2023/1185, Annex Part A (E = e_i + e_p + e_td + e_u - e_ccs).
.. [3] Directive (EU) 2018/2001 Art. 27(6) as amended by Directive (EU) 2023/2413.
.. [4] 26 U.S.C. 45V(a)(1), (b)(2), (c)(2), (c)(3), (d)(2); 26 CFR 1.45V-4 (January 2025).
"""

from __future__ import annotations

import datetime as dt
import sys
from dataclasses import dataclass, field

from ..model.project import as_date
from ..model.rulebooks import PERIODS, Scheme, grade_note
from ..model.statuses import Status

MET, NOT_MET, UNKNOWN, NOTE = "met", "not met", "cannot be judged", "note"  # a note never decides
GRID_KINDS = ("grid", "residual_mix")
ZERO = 1e-9  # a figure this close to zero is shown as 0


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
    outcome: str  # MET, NOT_MET, UNKNOWN, NOTE
    text: str  # a short sentence naming the rule and its source
    charged: bool = False  # an electricity rule whose failure changed what a kWh with a share is charged

    def sentence(self) -> str:
        return f"{self.outcome}: {self.text}"


@dataclass
class Reading:
    """Everything a scheme's rules say about one project before the threshold.

    ``counted_zero``: electricity activity keys counted fully renewable (zero); ``charged_as_grid``:
    failing electricity activity key -> the grid source's activity key whose intensity it is charged.
    """

    findings: list[Finding] = field(default_factory=list)
    counted_zero: set[str] = field(default_factory=set)
    charged_as_grid: dict[str, str] = field(default_factory=dict)
    versions: list[str] = field(default_factory=list)


FIRST_YEAR, LAST_YEAR = 2000, 2100  # assessment years the rulebooks are written for


def assessment_year(commissioning: dt.date | None, year: int | None, today: dt.date | None = None) -> int:
    """The calendar year whose dates the rules are read on.

    ``year`` when given, else the first full calendar year of operation after commissioning, else the current
    year.

    Parameters
    ----------
    commissioning : datetime.date or None
        The date the plant is placed in service (``project.commissioning``), or None when not given.
    year : int or None
        The year asked for (``--year``), or None.
    today : datetime.date or None
        The current date (None: the system's), so that tests can fix it.

    Returns
    -------
    int
        The assessment year.
    """
    if year is not None:
        return year
    if commissioning is None:
        return (today or dt.date.today()).year
    return commissioning.year if (commissioning.month, commissioning.day) == (1, 1) else commissioning.year + 1


def figure(value: float) -> str:
    """A figure for a sentence: 4 significant digits, 0 within 1e-9 of zero.

    Parameters
    ----------
    value : float
        The figure, in whatever unit the sentence states.

    Returns
    -------
    str
        The figure written with 4 significant digits, or '0'.
    """
    return "0" if abs(value) < ZERO else f"{value:.4g}"


def _where(source: str, grade: str) -> str:
    return f"[{grade_note(source, grade)}]"


def add_years(day: dt.date, years: int) -> dt.date:
    """The same calendar day ``years`` later (29 February -> 28 February).

    Parameters
    ----------
    day : datetime.date
        The starting day.
    years : int
        Number of calendar years added.

    Returns
    -------
    datetime.date
        The same day and month ``years`` later; 28 February for 29 February in a common year.

    References
    ----------
    .. [1] 26 U.S.C. 45V(a)(1): the 10-year period beginning on the date the facility was originally placed in
       service (the credit period of rulebook ``us-45v``).
    """
    try:
        return day.replace(year=day.year + years)
    except ValueError:
        return day.replace(year=day.year + years, day=28)


def months_before(day: dt.date, months: int) -> dt.date:
    """The same calendar day ``months`` earlier (the last day of a shorter month).

    Parameters
    ----------
    day : datetime.date
        The starting day (the plant's commissioning).
    months : int
        Number of calendar months counted back.

    Returns
    -------
    datetime.date
        The same day of the month ``months`` earlier, or that month's last day when it is shorter.

    References
    ----------
    .. [1] Commission Delegated Regulation (EU) 2023/1184, Art. 3(b) and Art. 5(a): generator in operation no
       earlier than 36 months before the fuel plant.
    .. [2] 26 CFR 1.45V-4(d)(3)(i): incrementality, generator placed in service no more than 36 months before
       the hydrogen facility (secondary).
    """
    month = day.month - 1 - months
    year = day.year + month // 12
    month = month % 12 + 1
    for last in (day.day, 30, 29, 28):
        try:
            return dt.date(year, month, min(day.day, last))
        except ValueError:
            continue
    raise ValueError(day)


# ---- eligibility -----------------------------------------------------------------------------


def eligibility_findings(scheme: Scheme, params: dict, period: Period) -> list[Finding]:
    """The route the scheme covers, and the plant's place and dates against the scheme.

    Parameters
    ----------
    scheme : Scheme
        The rulebook read (its ``eligibility`` section; none gives no finding).
    params : dict
        The project's parameters (``Project.model_dump``): the route, ``project.construction_start``,
        ``project.country``, ``project.commissioning`` and ``capture.claims_45q``.
    period : Period
        The assessment period (for the credit period).

    Returns
    -------
    list of Finding
        Step ``eligibility``: met, not met, or cannot be judged with the missing field named.

    References
    ----------
    .. [1] Directive (EU) 2018/2001 Art. 2(36) as amended by Directive (EU) 2023/2413 (renewable fuels of
       non-biological origin); Directive (EU) 2024/1788 Art. 2 (low-carbon hydrogen and fuels).
    .. [2] 26 U.S.C. 45V(c)(2) (qualified clean hydrogen) and 45V(c)(2)(B)(i)(I) (produced in the United States
       or a possession).
    .. [3] 26 U.S.C. 45V(c)(3) as amended in 2025: construction begins before 1 January 2028.
    .. [4] 26 U.S.C. 45V(a)(1) (10-year credit period) and 45V(d)(2) (no credit with a 45Q credit for the
       capture equipment).
    """
    rules = scheme.eligibility
    if rules is None:
        return []
    route = params["hydrogen"]["route"]
    where = _where(rules.source, rules.grade)
    project = params["project"]
    findings = [
        Finding(
            "eligibility",
            MET if route in rules.routes else NOT_MET,
            f"route {route} is {'' if route in rules.routes else 'not '}covered: {rules.energy} {where}",
        )
    ]
    if rules.construction_start_before is not None:
        findings.append(_construction_finding(rules, as_date(project.get("construction_start", ""))))
    if rules.countries_rule is not None:
        findings.append(_country_finding(rules, project.get("country", "")))
    if rules.credit_period_rule is not None and rules.credit_period_years:
        findings.append(_credit_period_finding(rules, as_date(project.get("commissioning", "")), period))
    if rules.excludes_capture_credit is not None and params.get("capture") is not None:
        findings.append(_capture_credit_finding(rules, params["capture"].get("claims_45q")))
    return findings


def _construction_finding(rules, started: dt.date | None) -> Finding:
    """Whether construction began before the scheme's deadline (cannot be judged without the date)."""
    deadline = rules.construction_start_before.isoformat()
    cited = _where(
        rules.construction_source or rules.source, rules.grade if not rules.construction_source else "secondary"
    )
    if started is None:
        text = f"construction must begin before {deadline}; project.construction_start is not given {cited}"
        return Finding("eligibility", UNKNOWN, text)
    before = started < rules.construction_start_before
    text = f"construction began {started.isoformat()}, {'' if before else 'not '}before {deadline} {cited}"
    return Finding("eligibility", MET if before else NOT_MET, text)


def _capture_credit_finding(rules, claims: bool | None) -> Finding:
    """No credit where the capture equipment earns a 45Q credit (cannot be judged when not declared)."""
    cited = _where(rules.excludes_capture_credit.source, rules.excludes_capture_credit.grade)
    if claims is None:
        text = f"no credit where the capture equipment earns a 45Q credit; capture.claims_45q is not given {cited}"
        return Finding("eligibility", UNKNOWN, text)
    text = f"the capture equipment {'earns' if claims else 'earns no'} 45Q credit {cited}"
    return Finding("eligibility", NOT_MET if claims else MET, text)


def _country_finding(rules, country: str) -> Finding:
    cited = _where(rules.countries_rule.source, rules.countries_rule.grade)
    if not country:
        return Finding(
            "eligibility",
            UNKNOWN,
            f"production must take place in {rules.countries_in_words}; project.country is not given {cited}",
        )
    inside = country in rules.countries
    return Finding(
        "eligibility",
        MET if inside else NOT_MET,
        f"production in country {country}, {'' if inside else 'not '}in {rules.countries_in_words} {cited}",
    )


def _credit_period_finding(rules, placed_in_service: dt.date | None, period: Period) -> Finding:
    years = rules.credit_period_years
    cited = _where(rules.credit_period_rule.source, rules.credit_period_rule.grade)
    if placed_in_service is None:
        return Finding(
            "eligibility",
            UNKNOWN,
            f"{years}-year credit period from the date placed in service; project.commissioning is not given {cited}",
        )
    last = add_years(placed_in_service, years) - dt.timedelta(days=1)
    span = (
        f"the {years}-year credit period from the date placed in service ({placed_in_service.isoformat()}) runs to "
        f"{last.isoformat()}"
    )
    if period.start > last:
        return Finding("eligibility", NOT_MET, f"{span}, before {period.label()} {cited}")
    if period.end > last:
        return Finding(
            "eligibility", MET, f"{span}: hydrogen produced after it in {period.label()} earns no credit {cited}"
        )
    return Finding("eligibility", MET, f"{span}: {period.label()} is inside it {cited}")


# ---- electricity -----------------------------------------------------------------------------


def grid_reference(sources: dict[str, str], kinds: dict[str, str], declared: dict, plant_zone: str) -> str | None:
    """The electricity activity whose factor is the grid intensity of the plant's zone.

    A grid source in the plant's zone, else the only grid source, else None.

    Parameters
    ----------
    sources : dict of str to str
        Electricity activity key -> source name.
    kinds : dict of str to str
        Electricity activity key -> generator kind (renewable, low_carbon, grid, residual_mix, fossil).
    declared : dict
        Source name -> the source as the project declares it (``electricity.sources``).
    plant_zone : str
        The plant's bidding zone or region (``project.zone``); '' when not given.

    Returns
    -------
    str or None
        The grid source's activity key, or None when no grid source can stand for the plant's zone.

    References
    ----------
    .. [1] Commission Delegated Regulation (EU) 2023/1185, Annex Part A point 6 and Part C: grid electricity at
       the country or bidding-zone average.
    .. [2] 26 CFR 1.45V-4(a)(2): electricity without qualifying certificates at the regional annual average
       (secondary).
    """
    grid = [
        key
        for key, name in sources.items()
        if kinds.get(key) in GRID_KINDS or declared[name].get("procurement") == "grid"
    ]
    in_zone = [key for key in grid if plant_zone and declared[sources[key]].get("zone", "") == plant_zone]
    if in_zone:
        return in_zone[0]
    return grid[0] if len(grid) == 1 else None


def _direct_connection(rules, source: dict, name: str, plant_commissioning: dt.date | None) -> list[Finding]:
    """2023/1184 Art. 3: the generator's age only (no aid test, no transition)."""
    months = rules.direct_connection_months
    cited = _where(rules.direct_connection_source, rules.grade)
    generator = as_date(source.get("commissioned", ""))
    if generator is None or plant_commissioning is None:
        missing = "commissioned" if generator is None else "project.commissioning"
        return [
            Finding(
                "electricity",
                UNKNOWN,
                f"{name}: direct connection to a generator in operation no earlier than {months} months before the "
                f"plant; {missing} is not given {cited}",
            )
        ]
    ok = generator >= months_before(plant_commissioning, months)
    return [
        Finding(
            "electricity",
            MET if ok else NOT_MET,
            f"{name}: direct connection, generator in operation {generator.isoformat()}, plant "
            f"{plant_commissioning.isoformat()} ({'within' if ok else 'more than'} {months} months earlier) {cited}",
        )
    ]


def _additionality(
    rules, source: dict, name: str, plant_commissioning: dt.date | None, period: Period
) -> list[Finding]:
    """Generator age against the plant's, and support, with the scheme's transition dates."""
    if rules.additionality_months is None:
        return []
    cited = _where(rules.additionality_source or rules.source, rules.grade)
    months = rules.additionality_months
    start, transition = rules.additionality_applies_from, rules.additionality_transition_until
    if start is not None:
        if transition is not None:
            exempt = _where(rules.additionality_transition_source or rules.additionality_source, rules.grade)
            if plant_commissioning is None:
                return [
                    Finding(
                        "electricity",
                        UNKNOWN,
                        f"{name}: additionality (36 months, no aid) unless the plant was in operation before "
                        f"{start.isoformat()} and the period ends by {transition.isoformat()}; project.commissioning "
                        f"is not given {exempt}",
                    )
                ]
            if plant_commissioning < start and period.end <= transition:
                return [
                    Finding(
                        "electricity",
                        MET,
                        f"{name}: plant in operation before {start.isoformat()}, exempt from additionality until "
                        f"{(transition + dt.timedelta(days=1)).isoformat()} {exempt}",
                    )
                ]
            if plant_commissioning < start:
                cited = (
                    f"{cited[:-1]}; the exemption for plants in operation before {start.isoformat()} ended "
                    f"{(transition + dt.timedelta(days=1)).isoformat()}]"
                )
    findings = []
    generator = as_date(source.get("commissioned", ""))
    if generator is None or plant_commissioning is None:
        missing = "commissioned" if generator is None else "project.commissioning"
        findings.append(
            Finding(
                "electricity",
                UNKNOWN,
                f"{name}: additionality, generator in operation no earlier than {months} months before the plant; "
                f"{missing} is not given {cited}",
            )
        )
    else:
        ok = generator >= months_before(plant_commissioning, months)
        findings.append(
            Finding(
                "electricity",
                MET if ok else NOT_MET,
                f"{name}: additionality, generator in operation {generator.isoformat()}, plant "
                f"{plant_commissioning.isoformat()} ({'within' if ok else 'more than'} {months} months earlier) "
                f"{cited}",
            )
        )
    if rules.generator_without_support:
        supported = source.get("supported")
        if supported is None:
            findings.append(
                Finding(
                    "electricity",
                    UNKNOWN,
                    f"{name}: additionality, generator without operating or investment aid; supported is not given "
                    f"{cited}",
                )
            )
        else:
            findings.append(
                Finding(
                    "electricity",
                    NOT_MET if supported else MET,
                    f"{name}: additionality, generator {'received' if supported else 'received no'} operating or "
                    f"investment aid {cited}",
                )
            )
    return findings


def _geographic(rules, source: dict, name: str, plant_zone: str) -> Finding:
    cited = _where(rules.geographic_source or rules.source, rules.grade)
    zone = source.get("zone", "")
    if not zone or not plant_zone:
        return Finding(
            "electricity",
            UNKNOWN,
            f"{name}: geographic correlation, {rules.geographic}; zone of the {'generator' if not zone else 'plant'} "
            f"is not given {cited}",
        )
    if zone == plant_zone:
        return Finding(
            "electricity",
            MET,
            f"{name}: geographic correlation, {rules.geographic} (generator and plant in {zone}) {cited}",
        )
    if rules.other_zone == "cannot_be_judged":
        return Finding(
            "electricity",
            UNKNOWN,
            f"{name}: geographic correlation, generator in bidding zone {zone}, plant in {plant_zone}: allowed only "
            f"under {rules.other_zone_alternatives} {cited}",
        )
    return Finding(
        "electricity",
        NOT_MET,
        f"{name}: geographic correlation, {rules.geographic}: generator in {zone}, plant in {plant_zone} {cited}",
    )


def _temporal(rule, name: str, source: dict, series_period: str | None, period: Period) -> Finding:
    if rule is None:
        return Finding(
            "electricity",
            UNKNOWN,
            f"{name}: no temporal-correlation rule of this rulebook is in force in {period.label()}",
        )
    cited = _where(f"{rule.source}, {rule.version}", rule.grade)
    required = rule.period.replace("_", "-")
    if series_period is not None:
        return Finding(
            "electricity",
            NOTE,
            f"{name}: temporal correlation, {required} in {period.label()}: judged interval by interval against the "
            f"time series (see the matched share) {cited}",
        )
    declared = source.get("matched")
    if declared is None:
        return Finding(
            "electricity",
            UNKNOWN,
            f"{name}: temporal correlation, {required} matching required in {period.label()}; "
            f"electricity.sources.{name}.matched is not declared (or give a time series) {cited}",
        )
    ok = PERIODS.index(declared) >= PERIODS.index(rule.period)
    return Finding(
        "electricity",
        MET if ok else NOT_MET,
        f"{name}: temporal correlation, {required} matching required in {period.label()}, {declared.replace('_', '-')} "
        f"declared {cited}",
    )


def _source_rules(
    rules, scheme: Scheme, name: str, source: dict, kind: str, project: dict, period: Period, series_period: str | None
) -> list[Finding]:
    """Every electricity rule of the scheme read on one contracted source."""
    where = _where(rules.source, rules.grade)
    procurement = source.get("procurement")
    if kind not in rules.counts_at_zero:
        return [
            Finding(
                "electricity",
                NOT_MET,
                f"{name}: a {kind.replace('_', '-')} source does not count fully renewable under this scheme {where}",
            )
        ]
    if procurement is None:
        return [
            Finding(
                "electricity",
                UNKNOWN,
                f"{name}: how it is procured is not declared (electricity.sources.{name}.procurement); it counts only "
                f"by {', '.join(rules.procurement)} {where}",
            )
        ]
    if procurement not in rules.procurement:
        return [
            Finding(
                "electricity",
                NOT_MET,
                f"{name}: {procurement.replace('_', ' ')} is not accepted (only "
                f"{', '.join(p.replace('_', ' ') for p in rules.procurement)}) {where}",
            )
        ]
    plant_commissioning = as_date(project.get("commissioning", ""))
    direct = procurement == "direct_line"
    own = [Finding("electricity", MET, f"{name}: {kind} generation by {procurement.replace('_', ' ')} {where}")]
    if direct and rules.direct_connection_months is not None:
        own += _direct_connection(rules, source, name, plant_commissioning)
    else:
        own += _additionality(rules, source, name, plant_commissioning, period)
    if rules.geographic and not (direct and "geographic" in rules.exempt_direct_line):
        own.append(_geographic(rules, source, name, project.get("zone", "")))
    if not (direct and "temporal" in rules.exempt_direct_line):
        rules_in_force = dict.fromkeys(scheme.temporal_rule_on(day) for day in (period.start, period.end))
        own += [_temporal(rule, name, source, series_period, period) for rule in rules_in_force]
    return own


def electricity_reading(
    scheme: Scheme,
    params: dict,
    sources: dict[str, str],
    kinds: dict[str, str],
    period: Period,
    series_periods: dict[str, str] | None,
) -> Reading:
    """Which electricity counts zero or is charged as grid electricity, the findings per source, the rules read.

    A source with no share and no generation in a series supplies nothing and is not judged. A source a rule
    cannot judge is counted in its favour for the value (the verdict is undetermined).

    Parameters
    ----------
    scheme : Scheme
        The rulebook read (its ``electricity_rules``; read only when it counts renewable electricity at zero).
    params : dict
        The project's parameters (``Project.model_dump``): ``electricity.sources`` and ``project``.
    sources : dict of str to str
        Electricity activity key -> source name.
    kinds : dict of str to str
        Key -> generator kind, from the factor's namespace: renewable, low_carbon, grid, residual_mix, fossil.
    period : Period
        The assessment period whose dates choose the temporal rule in force.
    series_periods : dict of str to str or None
        Source name -> the interval of a time series that shows its generation (None without one).

    Returns
    -------
    Reading
        The activities counted zero, those charged as grid (with the grid source's key), the findings
        (step ``electricity``) and the versions of the temporal rules read.

    References
    ----------
    .. [1] Commission Delegated Regulation (EU) 2023/1184, Art. 3 (direct connection), Art. 4(2) to (3)
       (power purchase agreements), Art. 5(a) and (b) (additionality), Art. 6 (temporal correlation: same
       calendar month until 31 December 2029, same hour from 1 January 2030), Art. 7 (geographic correlation),
       Art. 11 (transition to 1 January 2038).
    .. [2] Commission Delegated Regulation (EU) 2023/1185, Annex Part A point 6 (electricity that does not count
       fully renewable is charged as grid electricity).
    .. [3] 26 CFR 1.45V-4(d)(3)(i) to (iii): incrementality, deliverability, temporal matching (secondary).
    .. [4] UK Low Carbon Hydrogen Standard, version 4: 30-minute matching units (secondary).
    """
    reading = Reading()
    rules = scheme.electricity_rules
    if rules is None or scheme.electricity != "renewable_at_zero":
        return reading
    declared = params["electricity"]["sources"]
    project = params["project"]
    series_periods = series_periods or {}
    reading.versions += temporal_rule_versions(scheme, period)
    grid = grid_reference(sources, kinds, declared, project.get("zone", ""))
    for key, name in sources.items():
        source, kind = declared[name], kinds.get(key, "other")
        supplies = source["share"] > 0 or name in series_periods
        if kind in GRID_KINDS or source.get("procurement") == "grid":
            if supplies:
                text = f"{name}: grid electricity ({source['share']:.0%} of the supply), charged at its factor, the "
                reading.findings.append(Finding("electricity", NOTE, text + "grid intensity of its zone"))
            continue
        if not supplies:
            continue
        own = _source_rules(rules, scheme, name, source, kind, project, period, series_periods.get(name))
        if not any(f.outcome == NOT_MET for f in own):
            reading.counted_zero.add(key)
            reading.findings += own
            continue
        charged_at = grid if rules.charge_failing == "grid" and grid is not None and grid != key else None
        if charged_at is not None:
            reading.charged_as_grid[key] = charged_at
        summary = _failing_source_finding(rules, name, None if charged_at is None else sources[charged_at])
        reading.findings += [Finding(f.step, f.outcome, f.text, charged=f.outcome == NOT_MET) for f in own] + [summary]
    if rules.not_judged and reading.findings:
        reading.findings.append(
            Finding("electricity", NOTE, f"not judged here: {rules.not_judged} {_where(rules.source, rules.grade)}")
        )
    return reading


def temporal_rule_versions(scheme: Scheme, period: Period) -> list[str]:
    """The temporal-correlation rules in force on the first and the last day of the period, each named once.

    Parameters
    ----------
    scheme : Scheme
        The rulebook read (its dated temporal rules).
    period : Period
        The assessment period.

    Returns
    -------
    list of str
        ``temporal correlation PERIOD (VERSION)`` for each rule in force, in date order.

    References
    ----------
    .. [1] Commission Delegated Regulation (EU) 2023/1184, Art. 6 (monthly until 31 December 2029, hourly
       from 1 January 2030).
    """
    versions: list[str] = []
    for day in (period.start, period.end):
        rule = scheme.temporal_rule_on(day)
        if rule is not None:
            name = f"temporal correlation {rule.period.replace('_', '-')} ({rule.version})"
            if name not in versions:
                versions.append(name)
    return versions


def _failing_source_finding(rules, name: str, grid_name: str | None) -> Finding:
    """What a source that does not count fully renewable is charged: the grid source's factor (``grid_name``),
    its own factor when the rule charges the grid but no grid source is declared (undetermined), or as the
    rulebook says."""
    charge = _where(rules.source, rules.grade)
    if grid_name is not None:
        return Finding(
            "electricity",
            NOT_MET,
            f"{name}: does not count fully renewable; {rules.non_qualifying}: charged at the factor of "
            f"{grid_name} {charge}",
        )
    if rules.charge_failing == "grid":
        return Finding(
            "electricity",
            UNKNOWN,
            f"{name}: does not count fully renewable and is {rules.non_qualifying}, but no grid source of the "
            f"plant's zone is declared (add one with share 0): the value charges it at its own factor {charge}",
        )
    return Finding("electricity", NOT_MET, f"{name}: does not count fully renewable; {rules.non_qualifying} {charge}")


def renewable_energy_findings(
    scheme: Scheme, params: dict, reading: Reading, sources: dict[str, str], series_periods: dict | None
) -> list[Finding]:
    """Eligibility that turns on whether the electricity counts fully renewable (electrolysis only).

    A scheme for renewable fuels covers electrolysis whose electricity counts fully renewable and,
    where its rulebook says so, the share of grid electricity's average renewable share (a failing
    PPA or grid supply is grid electricity; a failing direct line is not). A low-carbon scheme does
    not cover electrolysis whose every kWh counts fully renewable. With a time series the matched
    share decides instead (``analyses.matching``).

    Parameters
    ----------
    scheme : Scheme
        The rulebook read (its ``eligibility`` section).
    params : dict
        The project's parameters (``Project.model_dump``): the route and ``electricity.sources``.
    reading : Reading
        The scheme's electricity rules read on the project (``electricity_reading``).
    sources : dict of str to str
        Electricity activity key -> source name.
    series_periods : dict or None
        Source name -> the interval of a time series that shows its generation (None without one).

    Returns
    -------
    list of Finding
        At most one finding, step ``eligibility``: not met, or a note on the share of output covered.

    References
    ----------
    .. [1] Directive (EU) 2018/2001 Art. 2(36) and Art. 27(6), first subparagraph, as amended by Directive (EU)
       2023/2413 (grid electricity at the country's average renewable share).
    .. [2] Directive (EU) 2024/1788 Art. 2 (low-carbon: energy from non-renewable sources); Commission Q&A on the
       hydrogen delegated acts, Q24.
    .. [3] Commission Delegated Regulation (EU) 2023/1185, Annex Part A point 1 (one intensity for the whole
       output).
    """
    rules = scheme.eligibility
    if rules is None or params["hydrogen"]["route"] != "electrolysis" or "electrolysis" not in rules.routes:
        return []
    declared = params["electricity"]["sources"]
    supplying = [key for key, name in sources.items() if declared[name]["share"] > 0 or name in (series_periods or {})]
    counted = [key for key in supplying if key in reading.counted_zero]
    where = _where(rules.source, rules.grade)
    if rules.requires_counted_electricity and not counted:
        grid_electricity = [key for key in supplying if declared[sources[key]].get("procurement") != "direct_line"]
        if rules.grid_renewable_share and grid_electricity:
            return [
                Finding(
                    "eligibility",
                    NOTE,
                    "no electricity counts fully renewable: only the share of output set by the country's average "
                    "renewable share of grid electricity is of the kind covered, at the intensity of the whole output "
                    f"{_where(rules.grid_renewable_share, rules.grade)}",
                )
            ]
        failed = [f.text for f in reading.findings if f.charged]
        because = f"{'; '.join(failed)}; so " if failed else ""
        return [
            Finding(
                "eligibility",
                NOT_MET,
                f"{because}no electricity counts fully renewable and none is grid electricity: not of the kind "
                f"covered: {rules.energy} {where}",
            )
        ]
    if rules.requires_counted_electricity and len(counted) < len(supplying):
        return [
            Finding(
                "eligibility",
                NOTE,
                "only the share of output made with the electricity counted fully renewable is of the kind covered; "
                f"the rest is charged as stated {where}",
            )
        ]
    if rules.excludes_counted_electricity and supplying and len(counted) == len(supplying) and not series_periods:
        return [fully_renewable_finding(scheme)]
    return []


def fully_renewable_finding(scheme: Scheme) -> Finding:
    """Electrolysis whose every kWh counts fully renewable: not of the kind a low-carbon scheme covers.

    Parameters
    ----------
    scheme : Scheme
        The rulebook read (its ``eligibility`` section: the energy it covers, source and grade).

    Returns
    -------
    Finding
        Step ``eligibility``, not met.

    References
    ----------
    .. [1] Directive (EU) 2024/1788 Art. 2, definitions of low-carbon hydrogen and low-carbon fuels (energy
       content derived from non-renewable sources); Commission Q&A on the hydrogen delegated acts, Q24.
    """
    rules = scheme.eligibility
    return Finding(
        "eligibility",
        NOT_MET,
        f"every kWh counts fully renewable, so the energy is renewable, not of the kind covered: {rules.energy} "
        f"{_where(rules.source, rules.grade)}",
    )


# ---- boundary and status ---------------------------------------------------------------------


# the EU formula's transport and distribution, which a producer selling at the gate may declare
DECLARABLE_TERM = "e_td"


def declared_e_td(scheme: Scheme, present_stages: set[str], project: dict) -> float | None:
    """The e_td a producer selling at the gate declares, where it counts.

    It counts for a scheme whose value is per MJ of delivered fuel and whose e_td term the project does not
    model.

    Parameters
    ----------
    scheme : Scheme
        The rulebook read (basis, quantity and boundary terms).
    present_stages : set of str
        The stages the project models.
    project : dict
        The project's ``project`` section (``declared_e_td_g_co2e_per_mj``).

    Returns
    -------
    float or None
        g CO2e/MJ, or None where no declared e_td counts.

    References
    ----------
    .. [1] Commission Delegated Regulation (EU) 2023/1185, Annex Part A, term e_td of
       E = e_i + e_p + e_td + e_u - e_ccs (point 16: storage and distribution of the finished fuel).
    """
    declared = project.get("declared_e_td_g_co2e_per_mj")
    if declared is None or scheme.basis != "delivered" or scheme.quantity != "g_co2e_per_mj":
        return None
    term = next((t for t in scheme.boundary_terms if t.term == DECLARABLE_TERM), None)
    return declared if term is not None and not present_stages & set(term.stages) else None


def boundary_findings(
    scheme: Scheme,
    present_stages: set[str],
    reference_product: str,
    gate_product: str,
    project_boundary: str,
    project: dict | None = None,
) -> list[Finding]:
    """The scheme's formula terms against the stages the project models at its boundary.

    A declared e_td counts as modelled, with its evidence named.

    Parameters
    ----------
    scheme : Scheme
        The rulebook read (its ``boundary_terms``).
    present_stages : set of str
        The stages the project models.
    reference_product : str
        The product of the functional unit (ammonia or hydrogen), for a scheme on delivered fuel.
    gate_product : str
        The product at the plant gate, for a scheme at the gate.
    project_boundary : str
        The project's boundary (cradle-to-gate, well-to-tank, well-to-wake), named in the sentences.
    project : dict or None
        The project's ``project`` section (declared e_td and its evidence).

    Returns
    -------
    list of Finding
        One finding per term, step ``boundary``: met (counted, zero or declared) or cannot be judged (not
        modelled at the project's boundary).

    References
    ----------
    .. [1] Commission Delegated Regulation (EU) 2023/1185, Annex Part A: E = e_i + e_p + e_td + e_u - e_ccs.
    .. [2] Commission Delegated Regulation (EU) 2025/2359 (formula terms, with e_ccu), secondary.
    .. [3] 26 U.S.C. 45V(c)(1): lifecycle greenhouse gas emissions, well-to-gate.
    .. [4] UK Low Carbon Hydrogen Standard, version 4: up to the point of production.
    """
    findings = []
    declared = declared_e_td(scheme, present_stages, project or {})
    for term in scheme.boundary_terms:
        cited = _where(term.source or scheme.document, term.grade)
        product = reference_product if scheme.basis == "delivered" else gate_product
        if term.term == DECLARABLE_TERM and declared is not None:
            evidence = (project or {}).get(
                "declared_e_td_evidence"
            ) or "no evidence named (project.declared_e_td_evidence)"
            findings.append(
                Finding(
                    "boundary",
                    MET,
                    f"{term.term} ({term.meaning}) declared by the producer: {figure(declared)} g CO2e/MJ added to the "
                    f"value (evidence: {evidence}) {cited}",
                )
            )
        elif product in term.zero_for:
            findings.append(Finding("boundary", MET, f"{term.term} ({term.meaning}) is zero for {product} {cited}"))
        elif present_stages & set(term.stages):
            findings.append(Finding("boundary", MET, f"{term.term} ({term.meaning}) counted {cited}"))
        elif term.absent_means == "zero" or not term.stages:
            findings.append(
                Finding("boundary", MET, f"{term.term} ({term.meaning}) is zero: the project has none {cited}")
            )
        else:
            findings.append(
                Finding(
                    "boundary",
                    UNKNOWN,
                    f"{term.term} ({term.meaning}) is not modelled at the project's {project_boundary} boundary; the "
                    f"value leaves it out {cited}",
                )
            )
    return findings


def status_of(findings: list[Finding], threshold_met: bool) -> str:
    """The status the findings and the threshold give, in the order the module's docstring states.

    Not eligible when an eligibility rule is not met; fails when the value misses the loosest threshold;
    undetermined when a rule cannot be judged; qualifies otherwise.

    Parameters
    ----------
    findings : list of Finding
        The scheme's findings before the threshold.
    threshold_met : bool
        Whether the value meets the loosest threshold.

    Returns
    -------
    Status
        ``Status.NOT_ELIGIBLE``, ``FAILS``, ``UNDETERMINED`` or ``QUALIFIES``.
    """
    if any(f.step == "eligibility" and f.outcome == NOT_MET for f in findings):
        return Status.NOT_ELIGIBLE
    if not threshold_met:
        return Status.FAILS
    if any(f.outcome == UNKNOWN for f in findings):
        return Status.UNDETERMINED
    return Status.QUALIFIES


def ordered_reasons(status: str, findings: list[Finding], threshold: Finding | None) -> list[str]:
    """Reasons as sentences, the deciding ones first.

    A not-eligible check has no threshold sentence and gives only its eligibility findings.
    fails: the electricity rules whose failure changed what a kWh is charged, then the threshold;
    undetermined: what cannot be judged; qualifies: the threshold; not eligible: the eligibility
    rules not met.

    Parameters
    ----------
    status : str
        The check's status (``status_of``).
    findings : list of Finding
        The scheme's findings before the threshold.
    threshold : Finding or None
        The threshold finding (``scoring.threshold_finding``).

    Returns
    -------
    list of str
        One sentence per finding, ``outcome: text``, the deciding ones first.
    """
    if status == Status.NOT_ELIGIBLE:  # the other rules are moot: only the eligibility findings are given
        first = [f for f in findings if f.step == "eligibility" and f.outcome == NOT_MET]
        findings = [f for f in findings if f.step == "eligibility"]
        threshold = None
    elif status == Status.FAILS:
        first = [f for f in findings if f.charged] + [threshold]
    elif status == Status.UNDETERMINED:
        first = [f for f in findings if f.outcome == UNKNOWN]
    else:
        first = [threshold]
    everything = findings + ([threshold] if threshold is not None else [])
    rest = [f for f in everything if f not in first]
    return [sys.intern(f.sentence()) for f in first + rest]  # a sentence many projects share is held once
