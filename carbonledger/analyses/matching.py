"""Temporal matching of electricity use with contracted generation, and its effect on scheme checks.

The arithmetic is pure numpy on arrays of intervals:

1. ``period_labels``: every interval gets the matching period it falls in (its own interval,
   its UTC hour, or its local calendar month, quarter or year); a scheme whose rule changes on a
   date (EU: monthly, then hourly) gets each interval's period under the rule of its date.
2. ``match``: in each period P, matched energy M_P = min(L_P, G_P), where L_P is the load and
   G_P the eligible generation summed over the period. Generation beyond the load in one period
   does not carry to another. Within a period every interval's load is matched in the same
   proportion M_P / L_P, and the matched energy is split among the sources in proportion to
   their generation in the period.
3. The unmatched energy of each interval, L_t (1 - M_P / L_P), is charged at the grid's
   intensity of that interval where the series gives it, else at the grid source's factor.

``matched_checks`` applies this to the scheme checks of a scored project: a scheme's value is
affine in the counted intensity c of the project's electricity (kg CO2e/kWh), so the value with
matching is the engine's value plus X (c_matched - c_declared), X being the project electricity
per unit of the scheme's basis (from the solved inventory) and c_declared the intensity of the
declared shares that the engine used.

References
----------
.. [1] Commission Delegated Regulation (EU) 2023/1184, Art. 6 (temporal correlation).
.. [2] Final regulations under 26 U.S.C. 45V (January 2025), 26 CFR 1.45V-4 (energy attribute
   certificates: annual, then hourly matching).
"""

from __future__ import annotations

from dataclasses import dataclass, field, replace

import numpy as np

from ..core.results import Check, ElectricityMatching, MonthOfMatching, ScoreResult
from ..core.scoring import Prepared, charged_source_intensities, intensities, judged, scheme_reading
from ..core.verdicts import MET, NOT_MET, Finding, Period, fully_renewable_finding
from ..errors import InputError
from ..model.rulebooks import PERIODS, grade_note
from ..model.statuses import Status
from .electricity_series import ElectricitySeries

GRANULARITIES = ("interval", "hour", "month", "quarter", "year")  # fine to coarse
_CODE = {name: number for number, name in enumerate(GRANULARITIES)}
# a rulebook's temporal-correlation period -> the matching granularity (half-hourly: the series' own 30-minute
# intervals)
RULE_GRANULARITY = {"annual": "year", "monthly": "month", "hourly": "hour", "half_hourly": "interval"}


def temporal_rules_in_force(scheme, period: Period) -> list:
    """The rulebook's temporal-correlation rules in force on the assessment period's first and last day."""
    return [
        rule
        for rule in dict.fromkeys(scheme.temporal_rule_on(day) for day in (period.start, period.end))
        if rule is not None
    ]


def scheme_granularity(scheme, period: Period) -> str:
    """The matching granularity a scheme's rulebook sets for the assessment period (the finer where a
    rule changes inside it; ``year`` for a scheme without a temporal rule). The series is a profile:
    its own dates never choose the rule."""
    rules = temporal_rules_in_force(scheme, period)
    if not rules:
        return "year"
    return RULE_GRANULARITY[max((rule.period for rule in rules), key=PERIODS.index)]


def describe(scheme) -> str:
    """One line: the rulebook's temporal rules and their dates, e.g. 'month until 2029-12-31, hour from 2030-01-01'."""
    rules = scheme.electricity_rules.temporal if scheme.electricity_rules is not None else []
    if not rules:
        return "year (no temporal rule in the rulebook)"
    parts = []
    for rule in rules:
        name = RULE_GRANULARITY[rule.period]
        if rule.applies_from is None and rule.applies_until is None:
            parts.append(name)
        elif rule.applies_from is None:
            parts.append(f"{name} until {rule.applies_until.isoformat()}")
        else:
            parts.append(f"{name} from {rule.applies_from.isoformat()}")
    return ", ".join(parts)


def period_values(utc: np.ndarray, local: np.ndarray, granularity: str) -> np.ndarray:
    """An integer per interval that is equal for intervals of the same period (and increases with time).

    ``utc`` and ``local`` are interval starts as datetime64[m]. Hours are UTC hours; months,
    quarters and years are local calendar periods as written in the series.
    """
    if granularity == "interval":
        return np.arange(len(utc), dtype=np.int64)
    if granularity == "hour":
        return utc.astype("datetime64[h]").astype(np.int64)
    months = local.astype("datetime64[M]").astype(np.int64)
    if granularity == "month":
        return months
    if granularity == "quarter":
        return months // 3
    if granularity == "year":
        return months // 12
    raise ValueError(f"granularity one of {', '.join(GRANULARITIES)}, got {granularity!r}")


def period_labels(utc: np.ndarray, local: np.ndarray, granularity: str | np.ndarray) -> np.ndarray:
    """Dense period numbers 0, 1, 2... of time-ordered intervals, under one granularity or one per interval."""
    if isinstance(granularity, str):
        values = period_values(utc, local, granularity)
        change = values[1:] != values[:-1]
    else:
        codes = np.asarray(granularity, dtype=np.int64)
        values = np.zeros(len(utc), dtype=np.int64)
        for name, code in _CODE.items():
            where = codes == code
            if where.any():
                values[where] = period_values(utc[where], local[where], name)
        change = (values[1:] != values[:-1]) | (codes[1:] != codes[:-1])
    labels = np.empty(len(utc), dtype=np.int64)
    labels[0] = 0
    np.cumsum(change, out=labels[1:])
    return labels


@dataclass
class MatchResult:
    """Energy matched period by period (kWh). Per interval arrays have the series' length."""

    granularity: str
    load_kwh: float
    matched_kwh: float
    matched_by_source_kwh: dict[str, float]
    matched_interval_kwh: np.ndarray
    periods: int
    extra: dict = field(default_factory=dict)

    @property
    def unmatched_kwh(self) -> float:
        return self.load_kwh - self.matched_kwh

    @property
    def matched_share(self) -> float:
        return self.matched_kwh / self.load_kwh if self.load_kwh > 0 else 0.0


def match_periods(load_kwh: np.ndarray, supply_kwh: np.ndarray, labels: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Matched energy per interval, and per source in total, for dense time-ordered period labels.

    ``load_kwh``: (n,); ``supply_kwh``: (k, n) eligible generation of k sources; ``labels``: (n,)
    from ``period_labels``. In each period M_P = min(L_P, G_P); interval t of period P is matched
    M_P / L_P of its load; source s gets M_P G_sP / G_P.
    """
    if labels[-1] + 1 == len(labels):  # every interval its own period
        load_p, supply_p = load_kwh, supply_kwh
    else:
        starts = np.flatnonzero(np.r_[True, labels[1:] != labels[:-1]])
        load_p = np.add.reduceat(load_kwh, starts)
        supply_p = np.add.reduceat(supply_kwh, starts, axis=1) if supply_kwh.shape[0] else np.zeros((0, len(starts)))
    generation_p = supply_p.sum(axis=0)
    matched_p = np.minimum(load_p, generation_p)
    fraction = np.divide(matched_p, load_p, out=np.zeros_like(load_p), where=load_p > 0)
    per_interval = load_kwh * (fraction if len(fraction) == len(labels) else fraction[labels])
    to_source = np.divide(matched_p, generation_p, out=np.zeros_like(generation_p), where=generation_p > 0)
    by_source = supply_p @ to_source if supply_kwh.shape[0] else np.zeros(0)
    return per_interval, by_source


def match(
    load_kwh: np.ndarray,
    supply_kwh_by_source: dict[str, np.ndarray],
    eligible_sources: list[str],
    granularity: str | np.ndarray,
    utc: np.ndarray,
    local: np.ndarray | None = None,
) -> MatchResult:
    """Match electricity use against the eligible sources' generation over the periods of a granularity.

    ``granularity`` is one of ``interval``, ``hour``, ``month``, ``quarter``, ``year``, or an array
    of granularity codes per interval (dated rules). ``utc``/``local`` are interval starts
    (datetime64[m]); ``local`` defaults to ``utc``.
    """
    local = utc if local is None else local
    load_kwh = np.asarray(load_kwh, dtype=float)
    names = [name for name in eligible_sources if name in supply_kwh_by_source]
    supply = np.array([supply_kwh_by_source[name] for name in names], dtype=float).reshape(len(names), len(load_kwh))
    labels = period_labels(utc, local, granularity)
    per_interval, by_source = match_periods(load_kwh, supply, labels)
    name = granularity if isinstance(granularity, str) else "mixed"
    return MatchResult(
        name,
        float(load_kwh.sum()),
        float(per_interval.sum()),
        dict(zip(names, by_source.tolist(), strict=False)),
        per_interval,
        int(labels[-1]) + 1,
    )


def eligible_sources(scheme, counted_zero: set[str], with_generation: list[str]) -> list[str]:
    """The contracted sources whose generation a scheme matches against the load.

    Under ``renewable_at_zero`` only the sources the scheme's electricity rules count at zero
    (procurement, additionality, zone: ``core.scoring.read_rules``; activity keys
    ``electricity:NAME``); under ``lifecycle`` every contracted source (each at its own factor).
    """
    if scheme.electricity == "renewable_at_zero":
        return [name for name in with_generation if f"electricity:{name}" in counted_zero]
    return list(with_generation)


# ---- the hook into scoring -------------------------------------------------------------------


@dataclass
class ElectricityModel:
    """What the matching needs from a scored project, for one scheme: numbers for one score, arrays
    over the draws in a Monte Carlo (``matched_values_of_draws``)."""

    basis_kwh: float  # project electricity per unit of the scheme's basis (kWh)
    kwh_per_kg_h2: float  # project electricity per kg H2 (turns a hydrogen series into kWh)
    counted_kg_per_kwh: dict[str, float]  # each source's counted intensity under the scheme
    declared_kg_per_kwh: float  # the declared shares' counted intensity (what the engine used)
    grid_kg_per_kwh: float  # sources without a generation column, at their declared proportions
    value_per_total: float  # scheme quantity per kg CO2e of scheme total per basis unit
    eligible: list[str]  # sources with generation whose generation the scheme matches (its electricity rules)
    granularity: str = "year"  # the rulebook's matching granularity in the assessment year


def declared_and_grid_intensity(counted: dict, shares: dict, with_generation) -> tuple:
    """(declared, grid) kg CO2e/kWh: the declared shares' intensity, and that of the sources without
    a generation column at their declared proportions (the first of them where their shares are 0;
    NaN without any). Numbers or arrays over draws."""
    declared = sum(shares[name] * counted[name] for name in counted)
    grid = [name for name in counted if name not in with_generation]
    if not grid:
        return declared, float("nan")
    grid_share = sum(shares[name] for name in grid)
    weighted = sum(shares[name] * counted[name] for name in grid)
    return declared, np.where(grid_share > 0, weighted / np.where(grid_share > 0, grid_share, 1.0), counted[grid[0]])


def electricity_model(prepared: Prepared, solutions: dict, scheme, with_generation: list[str]) -> ElectricityModel:
    """The scheme's view of the project's electricity: per-source counted intensities and kWh per basis unit."""
    inventory, matrices = prepared.inventory, prepared.matrices
    keys = matrices.activity_keys
    sources = prepared.params["electricity"]["sources"]
    reading = scheme_reading(prepared, scheme)
    counted = {
        name: float(value)
        for name, value in charged_source_intensities(
            scheme, inventory, matrices.flow_keys, prepared.per_gwp[scheme.gwp], reading
        ).items()
    }
    declared, grid_kg = declared_and_grid_intensity(
        counted, {name: source["share"] for name, source in sources.items()}, with_generation
    )
    mix = keys.index("electricity_mix")
    basis_demand = inventory.gate if scheme.basis == "product" else inventory.hydrogen
    basis_product = inventory.product if scheme.basis == "product" else "hydrogen"
    basis_kwh = float(solutions[basis_demand].supply[mix])
    gate = solutions[inventory.gate]
    kwh_per_kg = float(gate.supply[mix]) / float(gate.supply[keys.index(inventory.hydrogen)])
    per_total = intensities(1.0, basis_product, prepared.hydrogen_lhv, prepared.ammonia_lhv, prepared.fraction)[
        scheme.quantity
    ]
    return ElectricityModel(
        basis_kwh,
        kwh_per_kg,
        counted,
        float(declared),
        float(grid_kg),
        float(per_total),
        eligible_sources(scheme, reading.counted_zero, with_generation),
        scheme_granularity(scheme, prepared.period),
    )


def counted_intensity(
    result: MatchResult,
    load_kwh: np.ndarray,
    model: ElectricityModel,
    grid_g_per_kwh: np.ndarray | None,
    mask: np.ndarray | slice = slice(None),
) -> tuple[float, float, float, float]:
    """(load, matched, unmatched kWh, counted kg CO2e/kWh) over the intervals in ``mask``.

    Matched energy from each source at the source's counted intensity (split in proportion to the
    sources' matched totals), unmatched energy at the interval's grid intensity or the grid factor.
    """
    load = float(load_kwh[mask].sum())
    matched = float(result.matched_interval_kwh[mask].sum())
    unmatched_t = load_kwh[mask] - result.matched_interval_kwh[mask]
    grid_kg = (
        float(unmatched_t @ grid_g_per_kwh[mask]) / 1000.0
        if grid_g_per_kwh is not None
        else float(unmatched_t.sum()) * model.grid_kg_per_kwh
    )
    total_matched = sum(result.matched_by_source_kwh.values())
    source_kg_per_kwh = (
        sum(kwh * model.counted_kg_per_kwh[name] for name, kwh in result.matched_by_source_kwh.items()) / total_matched
        if total_matched > 0
        else 0.0
    )
    kg = matched * source_kg_per_kwh + grid_kg
    return load, matched, load - matched, (kg / load if load > 0 else 0.0)


def monthly_intensities(
    result: MatchResult,
    load_kwh: np.ndarray,
    model: ElectricityModel,
    grid_g_per_kwh: np.ndarray | None,
    starts: np.ndarray,
) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """``counted_intensity`` for consecutive blocks of intervals starting at ``starts`` (months), at once:
    (load kWh, matched kWh, counted kg CO2e/kWh) per block."""
    unmatched_t = load_kwh - result.matched_interval_kwh
    load = np.add.reduceat(load_kwh, starts)
    matched = np.add.reduceat(result.matched_interval_kwh, starts)
    grid_kg = (
        np.add.reduceat(unmatched_t * grid_g_per_kwh, starts) / 1000.0
        if grid_g_per_kwh is not None
        else (load - matched) * model.grid_kg_per_kwh
    )
    total_matched = sum(result.matched_by_source_kwh.values())
    source_kg_per_kwh = (
        sum(kwh * model.counted_kg_per_kwh[name] for name, kwh in result.matched_by_source_kwh.items()) / total_matched
        if total_matched > 0
        else 0.0
    )
    kg = matched * source_kg_per_kwh + grid_kg
    return load, matched, np.divide(kg, load, out=np.zeros_like(kg), where=load > 0)


def matched_check(
    check: Check,
    scheme,
    series: ElectricitySeries,
    model: ElectricityModel,
    granularity: str | None = None,
    findings: list | None = None,
) -> Check:
    """One scheme check redone with the series matched under the scheme's rule (or a granularity given for a what-if).

    With ``findings`` (the scheme's rules read on the project, ``core.scoring.scheme_reading``) the
    status, reasons and tier follow the matched value as the engine's checks do (a co-product rule
    the project cannot follow keeps the check undetermined); without them only the threshold is read."""
    load = series.load(model.kwh_per_kg_h2)
    local = series.local
    rule = (
        describe(scheme)
        if granularity is None
        else f"{granularity} (chosen for this run instead of the scheme's rule: {describe(scheme)})"
    )
    granularity = model.granularity if granularity is None else granularity
    result = match(load, series.generation_kwh, model.eligible, granularity, series.utc, local)
    total_load, matched, unmatched, intensity = counted_intensity(result, load, model, series.grid_g_co2e_per_kwh)

    def value_at(kg_per_kwh: float) -> float:
        return check.value + model.value_per_total * model.basis_kwh * (kg_per_kwh - model.declared_kg_per_kwh)

    value = value_at(intensity)
    months = local.astype("datetime64[M]")
    starts = np.flatnonzero(np.r_[True, months[1:] != months[:-1]])
    m_load, m_matched, m_intensity = monthly_intensities(result, load, model, series.grid_g_co2e_per_kwh, starts)
    monthly = [
        MonthOfMatching(
            month=str(months[start]),
            load_kwh=float(a),
            matched_kwh=float(b),
            unmatched_kwh=float(a - b),
            matched_share=float(b / a) if a > 0 else 0.0,
            electricity_g_co2e_per_kwh=float(c) * 1000.0,
            value=value_at(float(c)),
        )
        for start, a, b, c in zip(starts, m_load, m_matched, m_intensity, strict=False)
    ]
    matching = ElectricityMatching(
        granularity=result.granularity if result.granularity != "mixed" else describe(scheme),
        rule=rule,
        rule_sources=[
            rule.source for rule in (scheme.electricity_rules.temporal if scheme.electricity_rules is not None else [])
        ],
        matched_share=result.matched_share,
        load_kwh=total_load,
        matched_kwh=matched,
        unmatched_kwh=unmatched,
        matched_by_source_kwh=result.matched_by_source_kwh,
        eligible_sources=model.eligible,
        grid_kwh_per_kg_h2=(unmatched / total_load if total_load > 0 else 0.0) * model.kwh_per_kg_h2,
        electricity_g_co2e_per_kwh=intensity * 1000.0,
        declared_electricity_g_co2e_per_kwh=model.declared_kg_per_kwh * 1000.0,
        value_with_declared_shares=check.value,
        grid_intensity="series" if series.grid_g_co2e_per_kwh is not None else "grid source factor",
        series_file=series.path,
        series_sha256=series.sha256,
        first_interval=f"{str(local[0])[:16]}{'+' if series.offset_minutes[0] >= 0 else '-'}"
        f"{abs(int(series.offset_minutes[0])) // 60:02d}:{abs(int(series.offset_minutes[0])) % 60:02d}",
        intervals=series.intervals,
        interval_minutes=series.interval_minutes,
        periods=result.periods,
        monthly=monthly,
    )
    if findings is None:
        verdict = scheme.evaluate(value)
    else:  # as core.scoring.scheme_checks: the verdict of the matched value
        verdict = judged(scheme, value, findings + matching_findings(scheme, model, result, rule))
        note = (check.co_products or {}).get("note", "")
        if note.startswith("cannot be judged"):
            verdict.update(status=Status.UNDETERMINED, passes=False, tier=None, reasons=[note, *verdict["reasons"]])
    return check.model_copy(update={"value": value, **verdict, "electricity_matching": matching})


def matching_findings(scheme, model: ElectricityModel, result: MatchResult, rule: str) -> list[Finding]:
    """What the matching decides under a scheme that counts renewable electricity at zero: the share
    of the electricity matched in time with eligible generation (the rest is charged as grid
    electricity), and, for a scheme that does not cover fully renewable production, whether every
    kWh was matched."""
    rules = scheme.electricity_rules
    if rules is None or scheme.electricity != "renewable_at_zero":
        return []
    cited = "; ".join(dict.fromkeys(grade_note(r.source, r.grade) for r in rules.temporal)) or grade_note(
        rules.source, rules.grade
    )
    share = result.matched_share
    matched = share >= 1.0 - 1e-9
    text = (
        f"temporal correlation, {model.granularity} matching ({rule}): {share:.1%} "
        "of the electricity matched with eligible generation "
        f"({', '.join(model.eligible) or 'none eligible'}) in the same period; "
        f"{'' if matched else f'the unmatched {1 - share:.1%} is {rules.non_qualifying}'} [{cited}]"
    )
    findings = [
        Finding(
            "electricity",
            MET if matched else NOT_MET,
            text.replace("; [", " [") if matched else text,
            charged=not matched,
        )
    ]
    if (
        matched
        and scheme.eligibility is not None
        and scheme.eligibility.excludes_counted_electricity
        and model.eligible
    ):
        findings.insert(0, fully_renewable_finding(scheme))
    return findings


def matched_checks(
    prepared: Prepared, solutions: dict, result: ScoreResult, series: ElectricitySeries, granularity: str | None = None
) -> ScoreResult:
    """The scored result with every scheme check matched against the series under the scheme's rule.

    The headline total keeps the declared shares; each check's value, verdict and margin follow
    the matched electricity, and the check carries ``electricity_matching``. ``granularity``
    (interval, hour, month, quarter, year) replaces every scheme's rule, for a what-if.
    """
    if granularity is not None and granularity not in GRANULARITIES:
        raise InputError("--matching", granularity, f"one of rule, declared, {', '.join(GRANULARITIES)}")
    with_generation = list(series.generation_kwh)
    schemes = {scheme.id: scheme for scheme in prepared.chosen}
    checks = []
    for check in result.checks:
        scheme = schemes[check.scheme]
        model = electricity_model(prepared, solutions, scheme, with_generation)
        checks.append(
            matched_check(check, scheme, series, model, granularity, scheme_reading(prepared, scheme).findings)
        )
    return result.model_copy(update={"checks": checks})


def unmatched_share_by_hour_and_month(
    local: np.ndarray, load_kwh: np.ndarray, matched_kwh: np.ndarray
) -> tuple[list[str], np.ndarray]:
    """(months, 24 x months array): unmatched / use in each local hour of day and calendar month (NaN without use)."""
    months = local.astype("datetime64[M]")
    names, column = np.unique(months, return_inverse=True)
    hour = (local - local.astype("datetime64[D]")).astype("timedelta64[h]").astype(np.int64)
    use = np.zeros((24, len(names)))
    unmatched = np.zeros((24, len(names)))
    np.add.at(use, (hour, column), load_kwh)
    np.add.at(unmatched, (hour, column), load_kwh - matched_kwh)
    with np.errstate(invalid="ignore", divide="ignore"):
        share = np.where(use > 0, unmatched / use, np.nan)
    return [str(m) for m in names], share


@dataclass
class MatchingView:
    """What a report shows of one matching: the schemes that share it (same rule and sources, so the
    same matched energy in every interval), use and matched use by month, and the unmatched share
    by local hour of day and month."""

    schemes: list[str]
    granularity: str  # the period matched in the assessment year: interval, hour, month, quarter, year
    matched_share: float
    months: list[str]
    monthly_load_kwh: np.ndarray
    monthly_matched_kwh: np.ndarray
    unmatched_share: np.ndarray  # 24 x months, NaN where there is no use
    eligible: list[str]
    rule: str = ""  # the rulebook's dated rule in words (e.g. 'month until 2029-12-31, hour from 2030-01-01')


def matching_views(
    prepared: Prepared, solutions: dict, result: ScoreResult, series: ElectricitySeries
) -> list[MatchingView]:
    """The matching of every scheme check of a scored project under its own temporal rule, schemes
    with identical matched energy in every interval grouped into one view (for the report)."""
    with_generation = list(series.generation_kwh)
    schemes = {scheme.id: scheme for scheme in prepared.chosen}
    found: list[tuple[MatchingView, np.ndarray, np.ndarray]] = []
    for check in result.checks:
        scheme = schemes[check.scheme]
        model = electricity_model(prepared, solutions, scheme, with_generation)
        load = series.load(model.kwh_per_kg_h2)
        outcome = match(load, series.generation_kwh, model.eligible, model.granularity, series.utc, series.local)
        same = next(
            (
                view
                for view, a, b in found
                if np.array_equal(a, load) and np.array_equal(b, outcome.matched_interval_kwh)
            ),
            None,
        )
        if same is not None:
            same.schemes.append(scheme.id)
            continue
        months, share = unmatched_share_by_hour_and_month(series.local, load, outcome.matched_interval_kwh)
        _, column = np.unique(series.local.astype("datetime64[M]"), return_inverse=True)
        view = MatchingView(
            schemes=[scheme.id],
            granularity=model.granularity,
            rule=describe(scheme),
            matched_share=outcome.matched_share,
            months=months,
            monthly_load_kwh=np.bincount(column, load, minlength=len(months)),
            monthly_matched_kwh=np.bincount(column, outcome.matched_interval_kwh, minlength=len(months)),
            unmatched_share=share,
            eligible=list(model.eligible),
        )
        found.append((view, load, outcome.matched_interval_kwh))
    return [view for view, _, _ in found]


def series_matched_periods(series: ElectricitySeries) -> dict | None:
    """What the verdict rules learn from a series: every source with a generation column is matched
    interval by interval (half-hourly or finer, or hourly); None for coarser series."""
    period = "half_hourly" if series.interval_minutes <= 30 else "hourly" if series.interval_minutes <= 60 else None
    return {name: period for name in series.generation_kwh} if period else None


def matched_values_of_draws(
    scheme, series: ElectricitySeries, model: ElectricityModel, declared_values: np.ndarray
) -> np.ndarray:
    """Each draw's scheme value with the series matched under the scheme's rule: ``matched_check``'s
    arithmetic (``counted_intensity``) with a ``model`` whose figures are arrays over the draws.

    value = declared value + (value per kg CO2e) x (basis kWh) x (matched - declared kg CO2e/kWh),
    where the matched intensity puts each source's matched kWh at its counted intensity of the draw
    and the unmatched kWh at the series' grid intensity (or the draw's grid-source intensity). A
    series of electricity use is matched once; a series of hydrogen output once per distinct
    electricity use per kg among the draws (its load is kg x kWh/kg).
    """
    count = len(declared_values)

    def per_draw(value) -> np.ndarray:
        return np.broadcast_to(np.asarray(value, dtype=float), (count,))

    counted = {name: per_draw(value) for name, value in model.counted_kg_per_kwh.items()}
    grid_kg = per_draw(model.grid_kg_per_kwh)
    granularity = model.granularity
    if series.load_kwh is not None:
        loads, which = [series.load_kwh], np.zeros(count, dtype=int)
    else:
        distinct, which = np.unique(per_draw(model.kwh_per_kg_h2), return_inverse=True)
        loads = [series.hydrogen_kg * value for value in distinct]
    intensity = np.empty(count)
    for number, load in enumerate(loads):
        rows = which == number
        result = match(load, series.generation_kwh, model.eligible, granularity, series.utc, series.local)
        these = replace(
            model,
            counted_kg_per_kwh={name: value[rows] for name, value in counted.items()},
            grid_kg_per_kwh=grid_kg[rows],
        )
        intensity[rows] = counted_intensity(result, load, these, series.grid_g_co2e_per_kwh)[3]
    return declared_values + model.value_per_total * model.basis_kwh * (intensity - model.declared_kg_per_kwh)
