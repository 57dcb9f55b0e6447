"""Portfolios and operating years: recalc under a new factor set (recorded piece by piece), lifetime scoring."""

from __future__ import annotations

import functools
from pathlib import Path

from ..analyses.cluster import dask_mapper
from ..analyses.lifetime import LifetimeResult, lifetime_score
from ..analyses.portfolio import Recalc, RecalcPiece, load_portfolio, recalc_piece
from ..analyses.portfolio import recalc as recalc_portfolio
from ..core.assessment import Assessment
from ..io.ledger import RunTarget, open_run, project_key, run_target, write_batch
from ..io.ledger_store import Location
from ..model.factors import FactorSet
from ..routes.project import load_project
from .scoring import assessment_or_default, factor_set_of


def recalc(
    paths: list[str | Path],
    old_factors: str | Path | FactorSet,
    assessment: Assessment | None = None,
    *,
    workers: int | None = None,
    scheduler: str | None = None,
    ledger: Location | None = None,
    command: str = "recalc",
) -> Recalc:
    """Rescore a portfolio (files or folders of project files) under a new factor set: the assessment's.

    The results are the same as in one process.

    Parameters
    ----------
    paths : list of str or Path
        Project TOML files, or folders of them.
    old_factors : str, Path or FactorSet
        The factor set the portfolio was scored with (name, set folder, override CSV or loaded set).
    assessment : Assessment or None
        The run's options: its factor set is the new set the portfolio is rescored with; its GWP100 set,
        schemes and assessment year apply to the old and the new scores alike. Each project is read as
        written (the assessment's overrides, boundary and matching are not applied). None: the defaults
        (``api.scoring.assessment_or_default``: the default set is the new set).
    workers : int or None
        Score on a local Dask cluster of this many worker processes.
    scheduler : str or None
        Score on an existing Dask scheduler at this address instead.
    ledger : Location or None
        Record the run there: each worker writes its piece's records (old and new score of each project) in
        one transaction as soon as it is scored. The run's key is derived from its inputs (factor sets,
        projects and their sha256, options), so running the same recalc again records nothing new. The run
        stays invisible until ``close_run(result.ledger_run)``, which the command line calls once its output
        is written.
    command : str
        The command recorded with the run in the ledger (and part of its key).

    Returns
    -------
    Recalc
        The old and new figures of every project (``core.results.ResultFigures``: kg CO2e per functional
        unit, stages, gases, each check's value and verdict), one row per project and scheme, the changed
        factors, the number rescored, and ``ledger_run``, where the run is recorded (None without ``ledger``).
    """
    assessment = assessment_or_default(assessment)
    gwp, schemes, year = assessment.gwp, assessment.scheme_list, assessment.year
    projects = load_portfolio(paths)
    old_set, new_set = factor_set_of(old_factors), assessment.factor_set
    target = None
    if ledger is not None:
        inputs = {
            "command": command,
            "factor_sets": [old_set.sha256, new_set.sha256],
            "gwp": gwp,
            "schemes": sorted(schemes or []),
            "year": year,
            "projects": [[project_key(p.path), p.sha256, getattr(p.series, "sha256", "")] for p in projects],
        }
        target = run_target(ledger, inputs, command, "recalc")
    writing = target if target is not None and not open_run(target) else None
    with dask_mapper(workers, scheduler) as (mapper, chunks):
        result = recalc_portfolio(
            projects,
            old_set,
            new_set,
            gwp=gwp,
            schemes=schemes,
            year=year,
            mapper=mapper,
            chunks=chunks,
            run_piece=functools.partial(recalc_and_record, writing),
        )
    result.ledger_run = target
    return result


def recalc_and_record(target: RunTarget | None, piece: tuple) -> RecalcPiece:
    """One piece of a recalc (what a worker runs), its records written in one batch when ``target`` is given.

    Each project's old and new score is recorded, keyed by role and project path within the run.

    Parameters
    ----------
    target : RunTarget or None
        The run being recorded (ledger, run key, command); None: nothing is written.
    piece : tuple
        One piece of the portfolio as ``analyses.portfolio.recalc_piece`` takes it: (projects, old set, new set,
        changed factor ids, gwp, schemes, year).

    Returns
    -------
    RecalcPiece
        The old and new figures (``ResultFigures``) of the piece's projects.
    """
    part = recalc_piece(piece)
    if target is not None:
        items = [(f"old {project_key(s.project_file)}", s) for s in part.old_scores] + [
            (f"new {project_key(s.project_file)}", s) for s in part.new_scores
        ]
        write_batch(target, items)
    return part


def lifetime(
    project_file: str | Path,
    assessment: Assessment | None = None,
) -> LifetimeResult:
    """Score every operating year of a project's ``[lifetime]`` and the lifetime average.

    Parameters
    ----------
    project_file : str or Path
        The project TOML file, with a ``[lifetime]`` table.
    assessment : Assessment or None
        The run's options (factor set, GWP100 set, the schemes checked each year, overrides, boundary); each
        operating year is judged on its own calendar year's rules (the assessment's year is not read).
        None: the defaults (``api.scoring.assessment_or_default``).

    Returns
    -------
    LifetimeResult
        The score of each operating year and the lifetime average weighted by each year's output (kg CO2e per
        functional unit), with and without the construction emissions spread over the lifetime output.

    References
    ----------
    .. [1] ISO 14067:2018, 6.3 (capital goods).
    """
    assessment = assessment_or_default(assessment)
    project, sha = load_project(project_file, assessment.project_overrides)
    return lifetime_score(project, assessment, project_file=str(project_file), project_sha256=sha)
