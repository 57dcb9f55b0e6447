"""The audit workbook: write it for a project, score it, or read a project back from it."""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

from ..analyses.electricity_series import project_series
from ..analyses.periods import metered_year, month_results, read_meters
from ..analyses.pipeline import assess
from ..analyses.uncertainty import DEFAULT_SEED, UncertaintyResult, monte_carlo
from ..core.assessment import Assessment
from ..core.results import ScoreResult
from ..core.scoring import DEFAULT_GWP, score_project
from ..errors import InputError
from ..io.workbook.reader import (
    base_factor_set,
    factor_set_from_workbook,
    load_project_from_workbook,
    series_from_workbook,
)
from ..io.workbook.writer import build_workbook
from ..model.distributions import Uncertainty, read_distributions_file
from ..model.factors import DEFAULT_SET, FactorSet, load_factor_set
from ..routes.project import load_project
from .monte_carlo import load_uncertainty
from .scoring import boundary_overrides, stating_rebalance


def score_workbook(
    path: str | Path,
    *,
    factors: str | None = None,
    gwp: str | None = None,
    schemes: list[str] | None = None,
    overrides: list[str] | None = None,
    boundary: str | None = None,
    year: int | None = None,
) -> ScoreResult:
    """Score the inputs and factors of an audit workbook; options left None default to its cover."""
    project, sha, settings = load_project_from_workbook(path, boundary_overrides(boundary, overrides))
    factor_set = factor_set_from_workbook(path, base_factor_set(settings, factors))
    result = score_project(project, factor_set, gwp=gwp or settings.gwp, schemes=schemes or settings.schemes or None, source=str(path), project_sha256=sha, year=year)
    return stating_rebalance(result, project, overrides)


def load_any_project(path: str | Path, factor_set: FactorSet, overrides: list[str] | None = None):
    """A project TOML file, or the inputs of an audit workbook (.xlsx) with its edited factors
    layered over ``factor_set``: (project, sha256, factor set)."""
    if str(path).lower().endswith(".xlsx"):
        project, sha, _ = load_project_from_workbook(path, overrides)
        return project, sha, factor_set_from_workbook(path, factor_set)
    project, sha = load_project(path, overrides)
    return project, sha, factor_set


@dataclass
class AuditWorkbook:
    """An audit workbook and what it was written from; unpacks as (book, engine, spread)."""

    book: object  # openpyxl Workbook
    engine: ScoreResult  # the design project, scored by the engine
    spread: UncertaintyResult | None = None  # the Monte Carlo of the Uncertainty sheet
    metered_year: float | None = None  # with meters: every metered month together, output-weighted, in the engine's unit

    def __iter__(self):
        return iter((self.book, self.engine, self.spread))


def audit_workbook(
    project_file: str | Path | None = None,
    *,
    from_workbook: str | Path | None = None,
    factors: str | None = None,
    gwp: str | None = None,
    schemes: list[str] | None = None,
    overrides: list[str] | None = None,
    boundary: str | None = None,
    periods: str | Path | None = None,
    draws: int | None = None,
    seed: int = DEFAULT_SEED,
    distributions: str | Path | None = None,
    keep_draws: bool = False,
    draws_csv: str = "",
    year: int | None = None,
):
    """The audit workbook of a project file, or of the inputs read back from an earlier workbook.

    Options left as None take the defaults (GWP100 AR6, the default factor set, every scheme that
    applies), or, with ``from_workbook``, the settings recorded on that workbook's cover.
    draws : with a number, a Monte Carlo of the project (its ``[uncertainty]`` table, ``distributions``
        laid over it, factor rows with pedigree scores) under the same settings, ``seed``, shown on an
        Uncertainty sheet; ``keep_draws`` keeps every draw on it (for a draws CSV named ``draws_csv``).
    Returns an ``AuditWorkbook``: it unpacks as (openpyxl Workbook, engine ScoreResult, UncertaintyResult or
    None) and, with ``periods``, carries the metered year (the Periods sheet's year figure, from the engine).
    """
    overrides = boundary_overrides(boundary, overrides)
    evidence: dict[str, str] = {}
    if from_workbook is not None:
        project, sha, settings = load_project_from_workbook(from_workbook, overrides)
        factor_set = factor_set_from_workbook(from_workbook, base_factor_set(settings, factors))
        gwp = gwp or settings.gwp
        schemes = schemes or settings.schemes or None
        factors_option = factors or settings.factors_option
        evidence = settings.evidence
        source = str(from_workbook)
    else:
        project, sha = load_project(project_file, overrides)
        factors_option = factors or DEFAULT_SET
        factor_set = load_factor_set(factors_option)
        gwp = gwp or DEFAULT_GWP
        source = str(project_file)
    engine = score_project(project, factor_set, gwp=gwp, schemes=schemes, source=source, project_sha256=sha, year=year)
    meters = months = None
    if periods is not None:
        if project.project.boundary != "cradle-to-gate":
            raise InputError(periods, "--periods", f"a project scored cradle-to-gate (meters describe the plant), got boundary '{project.project.boundary}'; pass --boundary cradle-to-gate")
        meters = read_meters(periods, project)
        months = month_results(meters, project, factor_set, gwp=gwp, design=engine, schemes=schemes)
    spread = None
    if draws is not None:
        found = load_uncertainty(project_file, distributions) if from_workbook is None else (read_distributions_file(distributions) if distributions is not None else Uncertainty())
    matched = None
    series = project_series(project, project_file) if from_workbook is None else series_from_workbook(from_workbook, project)
    if series is not None:  # the series file beside the project file, or the workbook's Intervals sheet
        matched = assess(Assessment(factor_set, gwp, tuple(schemes) if schemes else None, year=year), project, source=source, project_sha256=sha, series=series).checks
    if draws is not None:
        spread = monte_carlo(project, factor_set, found, draws=draws, seed=seed, source=source, gwp=gwp, schemes=schemes, keep_draws=keep_draws, project_sha256=sha, series=series, year=year)
    workbook = build_workbook(
        engine, project, factor_set, factors_option=factors_option, meters=meters, month_results=months, meters_source=str(periods or ""), evidence=evidence,
        uncertainty=spread, draws_csv=draws_csv, series=series, matched_checks=matched,
    )
    return AuditWorkbook(workbook, engine, spread, metered_year(meters, project.project.product, months) if months else None)
