"""The operating plan of a project with an electricity time series, and its matching chart."""

from __future__ import annotations

from pathlib import Path

from ..analyses.electricity_series import ElectricitySeries, project_series
from ..analyses.matching import electricity_model, match, series_matched_periods
from ..analyses.plan import PlanResult, plan_project
from ..core.assessment import Assessment
from ..core.scoring import solve_with_bw2calc
from ..errors import InputError
from ..io.matching_chart import write_matching_chart
from ..routes.project import load_project
from .scoring import assessment_or_default


def plan(
    project_file: str | Path,
    *,
    scheme: str,
    tier: str | None = None,
    rated_kw: float | None = None,
    min_load: float = 0.0,
    part_load: list[tuple[float, float]] | None = None,
    hydrogen_price: float | None = None,
    assessment: Assessment | None = None,
) -> tuple[PlanResult, ElectricitySeries]:
    """The operating plan of a project with an electricity time series.

    The load in every interval that maximises hydrogen (or margin, with ``hydrogen_price`` and a price
    column) while the project qualifies for ``scheme`` at ``tier`` (default: the loosest threshold).

    Parameters
    ----------
    project_file : str or Path
        The project TOML file, whose ``[electricity] time_series`` names the series CSV.
    scheme : str
        The scheme id to qualify for.
    tier : str or None
        A tier of the scheme (text contained in its name, or its limit in the scheme's unit); default the
        loosest threshold.
    rated_kw : float or None
        Electrolyser rated power, kW; default the largest load in the series.
    min_load : float
        Minimum stable load, fraction of rated power (0 to 1; 0: can run at any load).
    part_load : list of (float, float) or None
        Points (load fraction of rated power, kWh/kg H2) of a concave part-load efficiency curve; None: the
        project's design electricity per kg H2 at every load.
    hydrogen_price : float or None
        Hydrogen price per kg H2, in the currency of the series' price column (currency/MWh): maximise margin
        instead of hydrogen.
    assessment : Assessment or None
        The run's options (factor set, GWP100 set, overrides, boundary, assessment year, and ``matching``: a
        granularity, ``interval``, ``hour``, ``month``, ``quarter`` or ``year``, replacing the scheme's temporal
        rule as a what-if, None or ``rule`` for the scheme's dated rule); its schemes are not read (``scheme``
        is planned for). None: the defaults (``api.scoring.assessment_or_default``).

    Returns
    -------
    tuple of (PlanResult, ElectricitySeries)
        The plan (load, kWh, and hydrogen, kg H2, in every interval; the scheme value scored back, in the
        scheme's unit; the matched share) and the series it was planned against.

    Raises
    ------
    InputError
        When the project names no electricity time series.

    References
    ----------
    .. [1] Huangfu, Q. and Hall, J. A. J. (2018). Parallelizing the dual revised simplex method.
       Mathematical Programming Computation 10, 119-142 (HiGHS).
    """
    assessment = assessment_or_default(assessment)
    project, sha = load_project(project_file, assessment.project_overrides)
    series = project_series(project, project_file)
    if series is None:
        raise InputError(project_file, "electricity.time_series", "a time series CSV to plan against")
    result = plan_project(
        project,
        assessment,
        series,
        scheme,
        source=str(project_file),
        project_sha256=sha,
        tier=tier,
        rated_kw=rated_kw,
        min_load=min_load,
        part_load=part_load,
        hydrogen_price=hydrogen_price,
    )
    return result, series


def matching_chart(
    project_file: str | Path,
    path: str | Path,
    *,
    scheme: str | None = None,
    assessment: Assessment | None = None,
    force: bool = False,
) -> Path:
    """Chart one project's matching under a scheme (default the first that applies).

    Monthly matched and unmatched use, and the unmatched share by hour of day and month.

    Parameters
    ----------
    project_file : str or Path
        The project TOML file, whose ``[electricity] time_series`` names the series CSV.
    path : str or Path
        The chart file to write, PNG or SVG by its suffix (written atomically).
    scheme : str or None
        The scheme id whose rule is charted; default the first that applies.
    assessment : Assessment or None
        The run's options (factor set, GWP100 set, overrides, boundary, assessment year, and ``matching``: a
        granularity replacing the scheme's temporal rule, None or ``rule`` for its dated rule); its schemes
        are not read. None: the defaults (``api.scoring.assessment_or_default``).
    force : bool
        Overwrite an existing chart file.

    Returns
    -------
    Path
        The chart file written.

    Raises
    ------
    InputError
        When the project names no electricity time series.

    References
    ----------
    .. [1] Commission Delegated Regulation (EU) 2023/1184, Art. 6 (temporal correlation).
    .. [2] Final regulations under 26 U.S.C. 45V (January 2025), 26 CFR 1.45V-4 (energy attribute
       certificates: annual, then hourly matching).
    """
    assessment = assessment_or_default(assessment)
    matching = assessment.matching
    project, sha = load_project(project_file, assessment.project_overrides)
    series = project_series(project, project_file)
    if series is None:
        raise InputError(project_file, "electricity.time_series", "a time series CSV to chart the matching of")
    prepared = assessment.but(schemes=(scheme,) if scheme else None).prepare(
        project, source=str(project_file), project_sha256=sha, matched_periods=series_matched_periods(series)
    )
    solutions = solve_with_bw2calc(prepared)
    rulebook = prepared.chosen[0]
    model = electricity_model(prepared, solutions, rulebook, list(series.generation_kwh))
    load = series.load(model.kwh_per_kg_h2)
    granularity = model.granularity if matching in (None, "rule") else matching
    result = match(load, series.generation_kwh, model.eligible, granularity, series.utc, series.local)
    label = granularity if isinstance(granularity, str) else "dated rule"
    title = f"{project.project.name}: {rulebook.id}, matching by {label}, {result.matched_share:.1%} matched"
    return write_matching_chart(series.local, load, result.matched_interval_kwh, title, path, force=force)
