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
from ..model.project import boundary_overrides
from ..routes.project import load_project
from .monte_carlo import load_uncertainty
from .scoring import stating_rebalance


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
    """Score the inputs and factors of an audit workbook; options left None default to its cover.

    Parameters
    ----------
    path : str or Path
        The audit workbook (``.xlsx``), possibly edited by a reviewer.
    factors : str or None
        Factor set name, set folder or override CSV under the workbook's edited factors; default the set
        recorded on its cover.
    gwp : str or None
        GWP100 set (``ar4``, ``ar5``, ``ar6``) of the headline result; default the cover's.
    schemes : list of str or None
        Scheme ids to check; default the cover's, else every scheme that applies.
    overrides : list of str or None
        ``dotted.parameter=value`` strings applied to the workbook's inputs before validation.
    boundary : str or None
        ``cradle-to-gate``, ``well-to-tank`` or ``well-to-wake``; default the inputs' own.
    year : int or None
        The assessment year (calendar year) on whose dates the scheme rules are read.

    Returns
    -------
    ScoreResult
        The result of the workbook's inputs (kg CO2e per functional unit, by stage and gas, with scheme checks),
        stating any rebalanced electricity share.
    """
    project, sha, settings = load_project_from_workbook(path, boundary_overrides(boundary, overrides))
    factor_set = factor_set_from_workbook(path, base_factor_set(settings, factors))
    result = score_project(project, factor_set, gwp=gwp or settings.gwp, schemes=schemes or settings.schemes or None, source=str(path), project_sha256=sha, year=year)
    return stating_rebalance(result, project, overrides)


def load_any_project(path: str | Path, factor_set: FactorSet, overrides: list[str] | None = None):
    """A project TOML file, or the inputs of an audit workbook with its edited factors laid over ``factor_set``.

    Parameters
    ----------
    path : str or Path
        A project TOML file or an audit workbook (told apart by the ``.xlsx`` suffix).
    factor_set : FactorSet
        The loaded factor set of the run (a workbook's edited factor rows are laid over it).
    overrides : list of str or None
        ``dotted.parameter=value`` strings applied before validation.

    Returns
    -------
    tuple of (Project, str, FactorSet)
        The validated project, the sha256 of the file it was read from (hex), and the factor set to score it with.
    """
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


def _workbook_inputs(project_file, from_workbook, factors, overrides: list[str]):
    """(project, sha256, factor set, the earlier workbook's settings or None): from a project file, or
    read back from an earlier workbook with its edited factors over the set its cover names."""
    if from_workbook is None:
        project, sha = load_project(project_file, overrides)
        return project, sha, load_factor_set(factors or DEFAULT_SET), None
    project, sha, settings = load_project_from_workbook(from_workbook, overrides)
    return project, sha, factor_set_from_workbook(from_workbook, base_factor_set(settings, factors)), settings


def _stated_distributions(project_file, from_workbook, distributions) -> Uncertainty:
    """The distributions of a Monte Carlo for the Uncertainty sheet: the project's [uncertainty] table with
    ``distributions`` laid over it, or, read back from a workbook, the distributions file alone."""
    if from_workbook is None:
        return load_uncertainty(project_file, distributions)
    return read_distributions_file(distributions) if distributions is not None else Uncertainty()


def _workbook_options(settings, gwp, schemes, factors, from_workbook, project_file) -> tuple:
    """(GWP set, schemes, factors option, evidence, source): the options given, else an earlier workbook's
    cover settings, else the defaults."""
    if settings is None:
        return gwp or DEFAULT_GWP, schemes, factors or DEFAULT_SET, {}, str(project_file)
    return gwp or settings.gwp, schemes or settings.schemes or None, factors or settings.factors_option, settings.evidence, str(from_workbook)


def _metered(periods, project, factor_set, gwp: str, engine: ScoreResult, schemes):
    """(meters, month results) of a metered year; only a project scored cradle-to-gate (meters describe the plant)."""
    if project.project.boundary != "cradle-to-gate":
        raise InputError(periods, "--periods", f"a project scored cradle-to-gate (meters describe the plant), got boundary '{project.project.boundary}'; pass --boundary cradle-to-gate")
    meters = read_meters(periods, project)
    return meters, month_results(meters, project, factor_set, gwp=gwp, design=engine, schemes=schemes)


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

    Parameters
    ----------
    project_file : str, Path or None
        The project TOML file; None with ``from_workbook``.
    from_workbook : str, Path or None
        An earlier audit workbook whose inputs, edited factors and cover settings are read back.
    factors : str or None
        Factor set name, set folder or override CSV; default ``default-2026``, or the cover's.
    gwp : str or None
        GWP100 set (``ar4``, ``ar5``, ``ar6``); default ``ar6``, or the cover's.
    schemes : list of str or None
        Scheme ids to check; default every scheme that applies, or the cover's.
    overrides : list of str or None
        ``dotted.parameter=value`` strings applied before validation.
    boundary : str or None
        ``cradle-to-gate``, ``well-to-tank`` or ``well-to-wake``; default the project's own.
    periods : str, Path or None
        A meters CSV of operating months, shown on a Periods sheet beside the design (cradle-to-gate only).
    draws : int or None
        With a number, a Monte Carlo of the project of this many draws (its ``[uncertainty]`` table,
        ``distributions`` laid over it, factor rows with pedigree scores) under the same settings, shown on an
        Uncertainty sheet. None: no Uncertainty sheet.
    seed : int
        Seed of the Monte Carlo's random numbers (the same seed gives the same numbers).
    distributions : str, Path or None
        A distributions TOML laid over the project's own ``[uncertainty]`` table.
    keep_draws : bool
        Keep every draw on the Uncertainty sheet (for a draws CSV).
    draws_csv : str
        Name of the CSV of the draws written beside the workbook, named on the sheet; empty: none.
    year : int or None
        The assessment year (calendar year) on whose dates the scheme rules are read.

    Returns
    -------
    AuditWorkbook
        Unpacks as (openpyxl Workbook, engine ScoreResult, UncertaintyResult or None); with ``periods`` it carries
        the metered year (the Periods sheet's year figure, from the engine, in the engine's unit).

    Raises
    ------
    InputError
        When ``periods`` is given for a project not scored cradle-to-gate (meters describe the plant).
    """
    project, sha, factor_set, settings = _workbook_inputs(project_file, from_workbook, factors, boundary_overrides(boundary, overrides))
    gwp, schemes, factors_option, evidence, source = _workbook_options(settings, gwp, schemes, factors, from_workbook, project_file)
    engine = score_project(project, factor_set, gwp=gwp, schemes=schemes, source=source, project_sha256=sha, year=year)
    meters, months = _metered(periods, project, factor_set, gwp, engine, schemes) if periods is not None else (None, None)
    series = project_series(project, project_file) if from_workbook is None else series_from_workbook(from_workbook, project)
    matched = None if series is None else assess(
        Assessment(factor_set, gwp, tuple(schemes) if schemes else None, year=year), project, source=source, project_sha256=sha, series=series).checks
    spread = None if draws is None else monte_carlo(
        project, factor_set, _stated_distributions(project_file, from_workbook, distributions), draws=draws, seed=seed, source=source, gwp=gwp,
        schemes=schemes, keep_draws=keep_draws, project_sha256=sha, series=series, year=year)
    workbook = build_workbook(engine, project, factor_set, factors_option=factors_option, meters=meters, month_results=months, meters_source=str(periods or ""),
                              evidence=evidence, uncertainty=spread, draws_csv=draws_csv, series=series, matched_checks=matched)
    return AuditWorkbook(workbook, engine, spread, metered_year(meters, project.project.product, months) if months else None)
