"""The operating plan of a project with an electricity time series, and its matching chart."""

from __future__ import annotations

from pathlib import Path

from ..analyses.electricity_series import ElectricitySeries, project_series
from ..analyses.matching import electricity_model, match, series_matched_periods
from ..analyses.plan import PlanResult, plan_project
from ..core.scoring import DEFAULT_GWP, prepare, solve_with_bw2calc
from ..errors import InputError
from ..io.matching_chart import write_matching_chart
from ..model.factors import DEFAULT_SET, FactorSet
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
    result = plan_project(
        project, factor_set_of(factors), series, scheme, source=str(project_file), project_sha256=sha, tier=tier, rated_kw=rated_kw, min_load=min_load,
        part_load=part_load, hydrogen_price=hydrogen_price, matching=matching, gwp=gwp, year=year,
    )
    return result, series




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
