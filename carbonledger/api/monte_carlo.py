"""Uncertainty, headroom and sensitivity of a project, and their ledger records."""

from __future__ import annotations

from pathlib import Path

from ..analyses.cluster import dask_mapper
from ..analyses.electricity_series import project_series
from ..analyses.headroom import Headroom, headroom_summary
from ..analyses.headroom import headroom as headroom_of
from ..analyses.portfolio import project_files
from ..analyses.sensitivity import SWING_PERCENT, Sensitivity
from ..analyses.sensitivity import sensitivity as sensitivity_of
from ..analyses.uncertainty import DEFAULT_DRAWS, DEFAULT_SEED, UncertaintyResult, factors_used, monte_carlo
from ..core.scoring import DEFAULT_GWP
from ..errors import InputError
from ..io.ledger import LedgerRecord, factor_row
from ..model.distributions import Uncertainty, parse_uncertainty, read_distributions_file
from ..model.factors import DEFAULT_SET, FactorSet
from ..model.project import read_project_file
from ..routes.project import load_project
from .scoring import boundary_overrides, factor_set_of


def load_uncertainty(project_file: str | Path, distributions: str | Path | None = None) -> Uncertainty:
    """The distributions of a run: the project's ``[uncertainty]`` table with a distributions file laid over it."""
    data, _ = read_project_file(project_file)
    table = data.get("uncertainty")
    found = parse_uncertainty(table, str(project_file)) if isinstance(table, dict) else Uncertainty()
    if table is not None and not isinstance(table, dict):
        raise InputError(project_file, "uncertainty", "a table of distributions")
    if distributions is not None:
        found = found.merged(read_distributions_file(distributions))
    return found  # none at all is refused by the analysis (factor rows with pedigree scores may add some)


def uncertainty(
    project_file: str | Path,
    *,
    distributions: str | Path | None = None,
    draws: int = DEFAULT_DRAWS,
    seed: int = DEFAULT_SEED,
    sampling: str | None = None,
    factors: str | Path | FactorSet = DEFAULT_SET,
    gwp: str = DEFAULT_GWP,
    schemes: list[str] | None = None,
    overrides: list[str] | None = None,
    boundary: str | None = None,
    progress=None,
    year: int | None = None,
) -> UncertaintyResult:
    """Monte Carlo of a project: mean, spread and percentiles of every figure, probability of each verdict.

    distributions : a distributions TOML laid over the project's own ``[uncertainty]`` table.
    draws, seed : number of draws and the seed (the same seed gives the same numbers).
    sampling : 'random' or 'latin_hypercube'; default the distributions' own (random).
    progress : optional callable(number of draws done) for a progress bar.
    """
    found = load_uncertainty(project_file, distributions)
    project, sha = load_project(project_file, boundary_overrides(boundary, overrides))
    return monte_carlo(
        project, factor_set_of(factors), found, draws=draws, seed=seed, sampling=sampling, source=str(project_file), gwp=gwp, schemes=schemes,
        progress=progress, project_sha256=sha, series=project_series(project, project_file), year=year,
    )


def headroom(
    project_file: str | Path,
    parameters: list[str],
    scheme: str,
    *,
    tier: str | None = None,
    factors: str | Path | FactorSet = DEFAULT_SET,
    gwp: str = DEFAULT_GWP,
    overrides: list[str] | None = None,
    boundary: str | None = None,
    year: int | None = None,
) -> list[Headroom]:
    """For each parameter path, the value at which the scheme's limit (or ``tier``) is met exactly,
    or None with the reason (root finding within the parameter's physical range, verified by scoring)."""
    if not parameters:
        raise InputError("headroom", "--parameter", "at least one parameter path")
    project, _ = load_project(project_file, boundary_overrides(boundary, overrides))
    factor_set = factor_set_of(factors)
    series = project_series(project, project_file)
    return [headroom_of(project, factor_set, path, scheme, tier, source=str(project_file), gwp=gwp, series=series, year=year) for path in parameters]


def sensitivity(
    project_file: str | Path,
    *,
    distributions: str | Path | None = None,
    scheme: str | None = None,
    base_sample: int = 1024,
    seed: int = DEFAULT_SEED,
    factors: str | Path | FactorSet = DEFAULT_SET,
    gwp: str = DEFAULT_GWP,
    overrides: list[str] | None = None,
    boundary: str | None = None,
    year: int | None = None,
    swing: float = SWING_PERCENT,
) -> Sensitivity:
    """Sobol first- and total-order indices (SALib) and a 10th/90th percentile tornado of the total,
    or of ``scheme``'s value, over the project's uncertain inputs (stated, or the defaults of the factor
    rows), and the one-at-a-time move of every factor and numeric parameter by -``swing`` % and +``swing`` %."""
    found = load_uncertainty(project_file, distributions)
    project, _ = load_project(project_file, boundary_overrides(boundary, overrides))
    return sensitivity_of(
        project, factor_set_of(factors), found, scheme=scheme, base_sample=base_sample, seed=seed, source=str(project_file), gwp=gwp, series=project_series(project, project_file), year=year,
        swing_percent=swing,
    )


def analysis_record(
    kind: str,
    project_file: str | Path,
    summary: dict,
    *,
    factors: str | Path | FactorSet = DEFAULT_SET,
    gwp: str = DEFAULT_GWP,
    schemes: list[str] | None = None,
    overrides: list[str] | None = None,
    boundary: str | None = None,
) -> LedgerRecord:
    """The run-ledger record of an analysis of one project (``kind`` 'sensitivity', 'headroom'):
    the project as read (its sha256 and parameters), the factor set and the rows the project
    reads, and the analysis's own ``summary`` (``Sensitivity.summary_for_ledger()``, ``headroom_summary``)."""
    project, sha = load_project(project_file, boundary_overrides(boundary, overrides))
    factor_set = factor_set_of(factors)
    used = factors_used(project, factor_set, str(project_file), gwp)
    return LedgerRecord(
        project_path=str(Path(project_file).resolve()),
        project_name=project.project.name,
        project_sha256=sha,
        factor_set=factor_set.name,
        factor_set_sha256=factor_set.sha256,
        schemes=list(schemes or []),
        boundary=project.project.boundary,
        gwp=gwp,
        results=summary,
        parameters=project.model_dump(),
        factors_used=[factor_row(row) for _, row in sorted(used.items())],
        kind=kind,
    )


def headroom_record(results: list[Headroom], project_file: str | Path, **options) -> LedgerRecord:
    """The run-ledger record of a headroom search (``options`` as given to ``headroom``)."""
    return analysis_record("headroom", project_file, headroom_summary(results), schemes=[results[0].scheme], **options)


def uncertainty_one(task: tuple) -> UncertaintyResult:
    """One project's Monte Carlo from plain arguments (what a Dask worker runs)."""
    path, options = task
    return uncertainty(path, **options)


def uncertainty_many(
    paths: list[str | Path],
    *,
    distributions: str | Path | None = None,
    draws: int = DEFAULT_DRAWS,
    seed: int = DEFAULT_SEED,
    sampling: str | None = None,
    factors: str | Path | FactorSet = DEFAULT_SET,
    gwp: str = DEFAULT_GWP,
    schemes: list[str] | None = None,
    boundary: str | None = None,
    workers: int | None = None,
    scheduler: str | None = None,
) -> list[UncertaintyResult]:
    """Monte Carlo of every project of a portfolio (files or folders), each with its own
    ``[uncertainty]`` table (and ``distributions`` laid over it) and the same seed; on a Dask
    cluster with ``workers`` or ``scheduler``, with the same numbers as in one process."""
    files = project_files(paths)
    options = {"distributions": distributions, "draws": draws, "seed": seed, "sampling": sampling, "factors": factors, "gwp": gwp, "schemes": schemes, "boundary": boundary}
    for path in files:  # every bad input is found before any work starts
        load_uncertainty(path, distributions)
    tasks = [(str(path), options) for path in files]
    with dask_mapper(workers, scheduler) as (mapper, _):
        return list((mapper or map)(uncertainty_one, tasks))
