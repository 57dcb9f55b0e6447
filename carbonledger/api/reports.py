"""The project report (self-contained HTML)."""

from __future__ import annotations

import os
from datetime import UTC, datetime
from pathlib import Path

from ..about import CAUTION
from ..analyses.lifetime import lifetime_score
from ..analyses.matching import matching_views
from ..analyses.pipeline import assess_solved, read
from ..analyses.portfolio import project_files
from ..analyses.uncertainty import DEFAULT_DRAWS, DEFAULT_SEED, monte_carlo
from ..core.assessment import Assessment
from ..errors import InputError
from ..io.report import ProjectReport, render_report
from ..model.project import parameter_table, read_project_file
from .levers import qualify
from .monte_carlo import load_uncertainty
from .scoring import assessment_or_default


def report_items(
    paths: list[str | Path],
    assessment: Assessment | None = None,
    *,
    draws: int = DEFAULT_DRAWS,
    seed: int = DEFAULT_SEED,
    levers: str | Path | None = None,
) -> list[ProjectReport]:
    """What a report shows of each project (files, or folders of project files).

    Its score, its parameters with units and, where the project gives them, its operating years
    (``[lifetime]``), the matching of its electricity time series (``[electricity] time_series``) and a
    Monte Carlo of ``draws`` draws with ``seed`` (``[uncertainty]``); with ``levers`` (a levers file), what
    it takes to qualify for the assessment's schemes (default the levers file's) at the central value.

    The one project is solved by the stacked numpy solver (``solve_stacked``, the solver of
    ``recalc``, equal to bw2calc to 1e-9 on every demo: tests/test_recalc.py and
    tests/test_report.py), so that a report does not pay bw2calc's import (about 1.9 s of CPU).

    Parameters
    ----------
    paths : list of str or Path
        Project TOML files, or folders of them.
    assessment : Assessment or None
        The run's options (factor set, GWP100 set, schemes, overrides, boundary, assessment year); None: the
        defaults (``api.scoring.assessment_or_default``).
    draws : int
        Number of Monte Carlo draws of a project with an ``[uncertainty]`` table.
    seed : int
        Seed of the Monte Carlo's random numbers (printed on the report).
    levers : str, Path or None
        A levers file: each project gets what it takes to qualify.

    Returns
    -------
    list of ProjectReport
        One per project: its score (kg CO2e per functional unit), its parameter table, and its lifetime,
        matching views, Monte Carlo and qualify answer where it has them.
    """
    assessment = assessment_or_default(assessment)
    items = []
    for path in project_files(list(paths)):
        project, sha, series = read(assessment, path)
        prepared, solutions, result = assess_solved(
            assessment, project, source=str(path), project_sha256=sha, series=series, solver="numpy"
        )
        views = matching_views(prepared, solutions, result, series) if series is not None else []
        life = None
        if project.lifetime is not None:
            life = lifetime_score(project, assessment, project_file=str(path), project_sha256=sha)
        spread = None
        if "uncertainty" in read_project_file(path)[0]:
            spread = monte_carlo(
                project, assessment, load_uncertainty(path), draws=draws, seed=seed, source=str(path), series=series
            )
        found = qualify(path, levers, assessment, budgets=0) if levers is not None else None
        items.append(ProjectReport(result, parameter_table(project), life, views, spread, found))
    return items


def report(
    paths: list[str | Path],
    assessment: Assessment | None = None,
    *,
    generated: str | None = None,
    paper: str | None = None,
    draws: int = DEFAULT_DRAWS,
    seed: int = DEFAULT_SEED,
    levers: str | Path | None = None,
) -> str:
    """The project report of one or several projects as one self-contained HTML text.

    Parameters
    ----------
    paths : list of str or Path
        Project TOML files, or folders of them.
    assessment : Assessment or None
        The run's options (factor set, GWP100 set, schemes, overrides, boundary, assessment year); None: the
        defaults (``api.scoring.assessment_or_default``).
    generated : str or None
        The date printed on the report (ISO 8601, YYYY-MM-DD); default today (UTC), or ``$SOURCE_DATE_EPOCH``.
    paper : str or None
        ``a4`` or ``letter`` to fix the printed page size (for a PDF); default the printer's.
    draws : int
        Number of Monte Carlo draws of a project with an ``[uncertainty]`` table.
    seed : int
        Seed of the Monte Carlo's random numbers (printed on the report).
    levers : str, Path or None
        A levers file: each project gets a section on what it takes to qualify.

    Returns
    -------
    str
        The HTML text (no outside request), with the caution that results are screening estimates.

    Raises
    ------
    InputError
        When no project file or folder is given.
    """
    if not paths:
        raise InputError("report", "PROJECT", "at least one project file or folder")
    items = report_items(paths, assessment, draws=draws, seed=seed, levers=levers)
    return render_report(items, generated=generated or report_date(), caution=CAUTION, paper=paper)


def report_date() -> str:
    """Today's date (UTC), or the date of ``$SOURCE_DATE_EPOCH`` for reproducible reports.

    Returns
    -------
    str
        The date, ISO 8601 (YYYY-MM-DD).

    References
    ----------
    .. [1] Reproducible Builds, "SOURCE_DATE_EPOCH specification",
       https://reproducible-builds.org/specs/source-date-epoch/
    """
    epoch = os.environ.get("SOURCE_DATE_EPOCH", "")
    moment = datetime.fromtimestamp(int(epoch), UTC) if epoch.isdigit() else datetime.now(UTC)
    return moment.date().isoformat()
