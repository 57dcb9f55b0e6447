"""One pipeline every command runs on a project: read, prepare, solve, judge, and match its series.

The options come from one ``core.assessment.Assessment``. A project file is read with its overrides
(``read``), made ready to solve (``Assessment.prepare``: inventory, matrices, characterisations, the
schemes' rules read on the assessment year), solved by bw2calc, summed and judged once
(``core.scoring.assemble``), and, when it gives an electricity time series, each check is matched
against the series under the scheme's rule (``analyses.matching.matched_checks``). The analyses
(compare, headroom, qualify, the workbook, the report) start from ``assess`` instead of writing the
steps out again.
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

from ..core.assessment import Assessment
from ..core.results import ResultFigures, ScoreResult
from ..core.scoring import Prepared, assemble, figures_of, solve_stacked, solve_with_bw2calc
from ..errors import InputError
from ..routes.project import load_project
from .electricity_series import ElectricitySeries, project_series
from .matching import matched_checks, series_matched_periods


@dataclass(frozen=True)
class PortfolioProject:
    """One validated project file of a portfolio."""

    path: str
    project: object  # the validated project model
    sha256: str
    series: object = None  # its electricity time series, if it gives one: checks are matched as `score` matches them


def read(assessment: Assessment, project_file: str | Path) -> tuple[object, str, ElectricitySeries | None]:
    """A project file read with the assessment's overrides: (validated project, its sha256, its
    electricity time series or None; None also when the assessment scores the declared shares).

    Parameters
    ----------
    assessment : Assessment
        The run's options (overrides, boundary, matching).
    project_file : str or Path
        The project TOML file.

    Returns
    -------
    tuple
        (Project, sha256 of the file's bytes, ElectricitySeries or None).

    Raises
    ------
    InputError
        When the file, an override or the series is refused, or a matching what-if is asked of a
        project without a series.
    """
    project, sha = load_project(project_file, assessment.project_overrides)
    series = None if assessment.matching == "declared" else project_series(project, project_file)
    if series is None and assessment.matching not in (None, "declared", "rule"):
        raise InputError(
            "--matching",
            assessment.matching,
            f"a project with an electricity time series ([electricity] time_series in {project_file})",
        )
    return project, sha, series


def assess(
    assessment: Assessment,
    project,
    *,
    source: str = "project",
    project_sha256: str = "",
    series: ElectricitySeries | None = None,
    matched_periods: dict | None = None,
) -> ScoreResult:
    """A validated project through the pipeline: prepare, solve with bw2calc, judge, match the series.

    Parameters
    ----------
    assessment : Assessment
        The run's options.
    project : Project
        The validated project.
    source : str
        The project's file, named in the result and in error lines.
    project_sha256 : str
        The sha256 of the project file.
    series : ElectricitySeries or None
        The project's electricity time series: each check is matched against it under the scheme's rule
        (or the assessment's matching what-if); the headline keeps the declared shares.
    matched_periods : dict or None
        Without a series: electricity source name -> the finest period it is shown matched.

    Returns
    -------
    ScoreResult
        The result with its scheme checks.
    """
    return assess_solved(
        assessment,
        project,
        source=source,
        project_sha256=project_sha256,
        series=series,
        matched_periods=matched_periods,
    )[2]


def assess_solved(
    assessment: Assessment,
    project,
    *,
    source: str = "project",
    project_sha256: str = "",
    series: ElectricitySeries | None = None,
    matched_periods: dict | None = None,
    solver: str = "bw2calc",
) -> tuple[Prepared, dict, ScoreResult]:
    """``assess``, returning also what the project was prepared and solved as, for an analysis that reads
    them (the report's matching views).

    Parameters
    ----------
    assessment, project, source, project_sha256, series, matched_periods
        As ``assess`` takes them.
    solver : str
        ``bw2calc`` (the reference, as ``score`` solves) or ``numpy`` (the stacked solver alone, without
        importing bw2calc: the report, which many projects share).

    Returns
    -------
    tuple
        (Prepared, the solved inventories by demand, ScoreResult).
    """
    periods = series_matched_periods(series) if series is not None else matched_periods
    prepared = assessment.prepare(project, source=source, project_sha256=project_sha256, matched_periods=periods)
    solutions = (
        solve_with_bw2calc(prepared) if solver == "bw2calc" else solve_stacked([prepared], check_with_bw2calc=False)[0]
    )
    result = assemble(prepared, solutions)
    if series is not None:
        granularity = None if assessment.matching in (None, "rule") else assessment.matching
        result = matched_checks(prepared, solutions, result, series, granularity)
    return prepared, solutions, result


def prepare_many(assessments: list[Assessment], projects: list[PortfolioProject]) -> list[Prepared]:
    """Each project made ready to solve under its own assessment (a portfolio: one per project, e.g. per
    operating year), matched periods taken from its series as ``assess`` takes them."""
    return [
        assessment.prepare(
            item.project,
            source=item.path,
            project_sha256=item.sha256,
            matched_periods=series_matched_periods(item.series) if item.series is not None else None,
        )
        for assessment, item in zip(assessments, projects, strict=True)
    ]


def assess_prepared(
    projects: list[PortfolioProject],
    prepared: list[Prepared],
    check_with_bw2calc: bool = True,
    checked: set | None = None,
) -> list[ScoreResult]:
    """Many prepared projects through the rest of the pipeline: solved together by matrix structure
    (``core.scoring.solve_stacked``; each structure not in ``checked`` also checked against bw2calc once),
    judged, and matched against their series.

    Parameters
    ----------
    projects : list of PortfolioProject
        The projects, with their series.
    prepared : list of Prepared
        The same projects prepared (``prepare_many``).
    check_with_bw2calc : bool
        Check one member of every structure against bw2calc.
    checked : set or None
        Structure keys already checked (a portfolio solved a chunk at a time).

    Returns
    -------
    list of ScoreResult
        In the order of ``projects``.
    """
    solved = solve_stacked(prepared, check_with_bw2calc, checked)
    return [
        judged_result(item, ready, solutions) for item, ready, solutions in zip(projects, prepared, solved, strict=True)
    ]


def judged_result(item: PortfolioProject, ready: Prepared, solutions: dict) -> ScoreResult:
    """One solved project's result: assembled, its checks matched against its series if it has one."""
    result = assemble(ready, solutions)
    return result if item.series is None else matched_checks(ready, solutions, result, item.series)


def figures_prepared(
    projects: list[PortfolioProject],
    prepared: list[Prepared],
    check_with_bw2calc: bool = True,
    checked: set | None = None,
) -> list[ResultFigures]:
    """``assess_prepared`` for what a portfolio needs of each result (``ResultFigures``): made without the
    exchanges, activities and sentences (``core.scoring.figures_of``), or taken from the full result where
    only it decides (a time series to match, a co-product rule that differs from the project's method).

    Parameters
    ----------
    projects, prepared, check_with_bw2calc, checked
        As ``assess_prepared`` takes them.

    Returns
    -------
    list of ResultFigures
        In the order of ``projects``; each equal to ``ResultFigures.of`` the project's full result.
    """
    solved = solve_stacked(prepared, check_with_bw2calc, checked)
    return [
        (figures_of(ready, solutions) if item.series is None else None)
        or ResultFigures.of(judged_result(item, ready, solutions))
        for item, ready, solutions in zip(projects, prepared, solved, strict=True)
    ]
