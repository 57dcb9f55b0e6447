"""Portfolios and operating years: recalc under a new factor set (recorded piece by piece), lifetime scoring."""

from __future__ import annotations

import functools
from pathlib import Path

from ..analyses.cluster import dask_mapper
from ..analyses.lifetime import LifetimeResult, lifetime_score
from ..analyses.portfolio import Recalc, RecalcPiece, load_portfolio, recalc_piece
from ..analyses.portfolio import recalc as recalc_portfolio
from ..core.scoring import DEFAULT_GWP
from ..io.ledger import RunTarget, open_run, run_target, write_batch
from ..io.ledger_store import Location
from ..model.factors import DEFAULT_SET, FactorSet
from ..routes.project import load_project
from .scoring import boundary_overrides, factor_set_of


def recalc(
    paths: list[str | Path],
    old_factors: str | Path | FactorSet,
    new_factors: str | Path | FactorSet,
    *,
    gwp: str = DEFAULT_GWP,
    schemes: list[str] | None = None,
    year: int | None = None,
    workers: int | None = None,
    scheduler: str | None = None,
    ledger: Location | None = None,
    command: str = "recalc",
) -> Recalc:
    """Rescore a portfolio (files or folders of project files) under a new factor set.

    workers : score on a local Dask cluster of this many worker processes.
    scheduler : score on an existing Dask scheduler at this address instead.
    ledger : record the run there: each worker writes its piece's records (old and new score of
        each project) in one transaction as soon as it is scored. The run's key is derived from its
        inputs (factor sets, projects and their sha256, options), so running the same recalc again
        records nothing new. The run stays invisible until ``close_run(result.ledger_run)``, which
        the command line calls once its output is written.
    The results are the same as in one process. Scheme rules are read on ``year``'s dates.
    """
    projects = load_portfolio(paths)
    old_set, new_set = factor_set_of(old_factors), factor_set_of(new_factors)
    target = None
    if ledger is not None:
        inputs = {
            "command": command,
            "factor_sets": [old_set.sha256, new_set.sha256],
            "gwp": gwp,
            "schemes": sorted(schemes or []),
            "year": year,
            "projects": [[str(Path(p.path).resolve()), p.sha256, getattr(p.series, "sha256", "")] for p in projects],
        }
        target = run_target(ledger, inputs, command, "recalc")
    writing = target if target is not None and not open_run(target) else None
    with dask_mapper(workers, scheduler) as (mapper, chunks):
        result = recalc_portfolio(projects, old_set, new_set, gwp=gwp, schemes=schemes, year=year, mapper=mapper, chunks=chunks, run_piece=functools.partial(recalc_and_record, writing))
    result.ledger_run = target
    return result


def recalc_and_record(target: RunTarget | None, piece: tuple) -> RecalcPiece:
    """One piece of a recalc (what a worker runs), its records written in one batch when ``target``
    is given: each project's old and new score, keyed by role and project path within the run."""
    part = recalc_piece(piece)
    if target is not None:
        items = [(f"old {Path(s.project_file).resolve()}", s) for s in part.old_scores] + [(f"new {Path(s.project_file).resolve()}", s) for s in part.new_scores]
        write_batch(target, items)
    return part


def lifetime(
    project_file: str | Path,
    *,
    factors: str | Path | FactorSet = DEFAULT_SET,
    gwp: str = DEFAULT_GWP,
    schemes: list[str] | None = None,
    overrides: list[str] | None = None,
    boundary: str | None = None,
) -> LifetimeResult:
    """Score every operating year of a project's [lifetime] and the lifetime average."""
    project, sha = load_project(project_file, boundary_overrides(boundary, overrides))
    return lifetime_score(project, factor_set_of(factors), project_file=str(project_file), project_sha256=sha, gwp=gwp, schemes=schemes)
