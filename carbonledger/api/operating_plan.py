"""The operating plan of a project with an electricity time series, and its matching chart."""

from __future__ import annotations

from pathlib import Path

from ..analyses.electricity_series import ElectricitySeries, project_series
from ..analyses.matching import electricity_model, match, series_matched_periods
from ..analyses.plan import PlanResult, choose_threshold, plan_load
from ..core.scoring import DEFAULT_GWP, assemble, judged, prepare, scheme_reading, solve_with_bw2calc
from ..errors import InputError
from ..io.matching_chart import write_matching_chart
from ..model.factors import DEFAULT_SET, FactorSet
from ..model.statuses import Status
from ..routes import routes_of
from ..routes.project import load_project
from .scoring import factor_set_of


def plan(
    project_file: str | Path,
    *,
    scheme: str,
    tier: str | None = None,
    rated_kw: float | None = None,
    min_load: float = 0.0,
    part_load: list[tuple[float, float]] | None = None,
    hydrogen_price: float | None = None,
    matching: str | None = None,
    factors: str | Path | FactorSet = DEFAULT_SET,
    gwp: str = DEFAULT_GWP,
    overrides: list[str] | None = None,
    year: int | None = None,
) -> tuple[PlanResult, ElectricitySeries]:
    """The operating plan of a project with an electricity time series: the load in every interval
    that maximises hydrogen (or margin, with ``hydrogen_price`` and a price column) while the
    project qualifies for ``scheme`` at ``tier`` (default: the loosest threshold).

    rated_kw : electrolyser rated power (kW); default the largest load in the series.
    min_load : minimum stable load as a fraction of rated power (0: can run at any load).
    part_load : (load fraction, kWh/kg) points of a concave part-load efficiency curve.
    matching : a granularity replacing the scheme's temporal rule (what-if); None: the rule.
    """
    project, sha = load_project(project_file, overrides)
    series = project_series(project, project_file)
    if series is None:
        raise InputError(project_file, "electricity.time_series", "a time series CSV to plan against")
    prepared = prepare(project, factor_set_of(factors), gwp=gwp, schemes=[scheme], source=str(project_file), project_sha256=sha, year=year, matching=series_matched_periods(series))
    solutions = solve_with_bw2calc(prepared)
    check = assemble(prepared, solutions).checks[0]
    rulebook = prepared.chosen[0]
    model = electricity_model(prepared, solutions, rulebook, list(series.generation_kwh))
    threshold = choose_threshold(rulebook, tier)
    if rated_kw is None:
        rated_kw = float(series.load(model.kwh_per_kg_h2).max()) * 60.0 / series.interval_minutes
    if not rated_kw > 0:
        raise InputError("--rated-kw", str(rated_kw), "a rated power > 0 kW (the series has no load to take it from)")
    if matching not in (None, "rule") and matching not in ("interval", "hour", "month", "quarter", "year"):
        raise InputError("--matching", matching, "one of rule, interval, hour, month, quarter, year")
    result = plan_load(
        series, model, rulebook,
        value_declared=check.value, limit=threshold.limit, inclusive=threshold.inclusive, rated_kw=rated_kw, min_load=min_load,
        part_load=part_load, hydrogen_price=hydrogen_price, granularity=None if matching in (None, "rule") else matching,
    )
    result.tier = threshold.tier
    verdict = judged(rulebook, result.value, scheme_reading(prepared, rulebook).findings)
    result.status, result.deciding_reason = verdict["status"], verdict["reasons"][0]
    result.qualifies = result.qualifies and result.status == Status.QUALIFIES
    if part_load:
        result.score_back = _score_back_overrides(project, model.kwh_per_kg_h2, result.kwh_per_kg_h2)
    return result, series


def _score_back_overrides(project, design_kwh_per_kg: float, planned_kwh_per_kg: float) -> list[str]:
    """The --set that scores a part-load plan back at the kWh/kg its curve implies: the hydrogen route's
    electricity parameter moved by the difference from the design (the rest of the electricity per kg stays)."""
    path = next((route.ageing for route in routes_of(project.model_dump()) if route.ageing), "")
    if not path:
        return []
    section, name = path.split(".")
    current = float(getattr(getattr(project, section), name))
    return [f"{path}={current + planned_kwh_per_kg - design_kwh_per_kg:.12g}"]


def matching_chart(
    project_file: str | Path,
    path: str | Path,
    *,
    scheme: str | None = None,
    matching: str | None = None,
    factors: str | Path | FactorSet = DEFAULT_SET,
    gwp: str = DEFAULT_GWP,
    overrides: list[str] | None = None,
    force: bool = False,
    year: int | None = None,
) -> Path:
    """Chart one project's matching under a scheme (default the first that applies): monthly matched and
    unmatched use, and the unmatched share by hour of day and month."""
    project, sha = load_project(project_file, overrides)
    series = project_series(project, project_file)
    if series is None:
        raise InputError(project_file, "electricity.time_series", "a time series CSV to chart the matching of")
    prepared = prepare(project, factor_set_of(factors), gwp=gwp, schemes=[scheme] if scheme else None, source=str(project_file), project_sha256=sha, year=year, matching=series_matched_periods(series))
    solutions = solve_with_bw2calc(prepared)
    rulebook = prepared.chosen[0]
    model = electricity_model(prepared, solutions, rulebook, list(series.generation_kwh))
    load = series.load(model.kwh_per_kg_h2)
    granularity = model.granularity if matching in (None, "rule") else matching
    result = match(load, series.generation_kwh, model.eligible, granularity, series.utc, series.local)
    label = granularity if isinstance(granularity, str) else "dated rule"
    title = f"{project.project.name}: {rulebook.id}, matching by {label}, {result.matched_share:.1%} matched"
    return write_matching_chart(series.local, load, result.matched_interval_kwh, title, path, force=force)
