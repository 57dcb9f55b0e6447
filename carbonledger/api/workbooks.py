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
from ..errors import InputError
from ..io.workbook.reader import (
    base_factor_set,
    factor_set_from_workbook,
    load_project_from_workbook,
    series_from_workbook,
)
from ..io.workbook.writer import build_workbook
from ..model.distributions import Uncertainty, read_distributions_file
from ..model.factors import FactorSet
from ..routes.project import load_project
from .monte_carlo import load_uncertainty
from .scoring import assessment_or_default, requested_as, stating_rebalance


def cover_assessment(
    path: str | Path, factors: str | None = None, gwp: str | None = None, schemes: list[str] | None = None
) -> Assessment:
    """The assessment recorded on an audit workbook's cover (factor set as requested, GWP100 set, schemes),
    any of them replaced by the one given: what ``score --from-workbook`` and ``workbook --from-workbook``
    assess unless told otherwise.

    Parameters
    ----------
    path : str or Path
        The audit workbook (``.xlsx``).
    factors : str or None
        Factor set name, set folder or override CSV; default the set recorded on the cover (the default set
        when that cannot be found here).
    gwp : str or None
        GWP100 set (``ar4``, ``ar5``, ``ar6``); default the cover's.
    schemes : list of str or None
        Scheme ids to check; default the cover's, else every scheme that applies.

    Returns
    -------
    Assessment
        The options (its factor set is the base set: the workbook's edited factors are laid over it when
        the workbook is scored).
    """
    _, _, settings = load_project_from_workbook(path)
    return Assessment(
        base_factor_set(settings, factors), gwp or settings.gwp, tuple(schemes or settings.schemes or ()) or None
    )


def score_workbook(path: str | Path, assessment: Assessment | None = None) -> ScoreResult:
    """Score the inputs and factors of an audit workbook under an assessment (default: its cover's).

    Parameters
    ----------
    path : str or Path
        The audit workbook (``.xlsx``), possibly edited by a reviewer.
    assessment : Assessment or None
        The run's options; its factor set is the base under the workbook's edited factors, its overrides
        apply to the workbook's inputs. None: ``cover_assessment(path)``, the settings on its cover.

    Returns
    -------
    ScoreResult
        The result of the workbook's inputs (kg CO2e per functional unit, by stage and gas, with scheme checks),
        stating any rebalanced electricity share.
    """
    assessment = assessment or cover_assessment(path)
    project, sha, _ = load_project_from_workbook(path, assessment.project_overrides)
    factor_set = factor_set_from_workbook(path, assessment.factor_set)
    result = assess(assessment.but(factor_set=factor_set), project, source=str(path), project_sha256=sha)
    return stating_rebalance(result, project, list(assessment.overrides))


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
    # with meters: every metered month together, output-weighted, in the engine's unit
    metered_year: float | None = None

    def __iter__(self):
        return iter((self.book, self.engine, self.spread))


def _workbook_inputs(project_file, from_workbook, assessment: Assessment):
    """(project, sha256, factor set, evidence, source): from a project file, or read back from an earlier
    workbook with its edited factors over the assessment's set (and the evidence its cover records)."""
    if from_workbook is None:
        project, sha = load_project(project_file, assessment.project_overrides)
        return project, sha, assessment.factor_set, {}, str(project_file)
    project, sha, settings = load_project_from_workbook(from_workbook, assessment.project_overrides)
    return (
        project,
        sha,
        factor_set_from_workbook(from_workbook, assessment.factor_set),
        settings.evidence,
        str(from_workbook),
    )


def _stated_distributions(project_file, from_workbook, distributions) -> Uncertainty:
    """The distributions of a Monte Carlo for the Uncertainty sheet: the project's [uncertainty] table with
    ``distributions`` laid over it, or, read back from a workbook, the distributions file alone."""
    if from_workbook is None:
        return load_uncertainty(project_file, distributions)
    return read_distributions_file(distributions) if distributions is not None else Uncertainty()


def _series_and_matched(project, project_file, from_workbook, assessment: Assessment, source: str, sha: str):
    """The project's electricity time series (from its file, or read back from the workbook's Intervals sheet)
    and its checks matched against it, as ``score`` matches them; (None, None) without a series."""
    if from_workbook is None:
        series = project_series(project, project_file)
    else:
        series = series_from_workbook(from_workbook, project)
    if series is None:
        return None, None
    return series, assess(assessment, project, source=source, project_sha256=sha, series=series).checks


def _metered(periods, project, assessment: Assessment, engine: ScoreResult):
    """(meters, month results) of a metered year; only a project scored cradle-to-gate (meters describe the plant)."""
    if project.project.boundary != "cradle-to-gate":
        raise InputError(
            periods,
            "--periods",
            f"a project scored cradle-to-gate (meters describe the plant), got boundary '{project.project.boundary}'; "
            "pass --boundary cradle-to-gate",
        )
    meters = read_meters(periods, project)
    return meters, month_results(meters, project, assessment, design=engine)


def audit_workbook(
    project_file: str | Path | None = None,
    assessment: Assessment | None = None,
    *,
    from_workbook: str | Path | None = None,
    periods: str | Path | None = None,
    draws: int | None = None,
    seed: int = DEFAULT_SEED,
    distributions: str | Path | None = None,
    keep_draws: bool = False,
    draws_csv: str = "",
):
    """The audit workbook of a project file, or of the inputs read back from an earlier workbook.

    Parameters
    ----------
    project_file : str, Path or None
        The project TOML file; None with ``from_workbook``.
    assessment : Assessment or None
        The run's options (factor set, GWP100 set, schemes, overrides, boundary, assessment year); None: the
        defaults (AR6, the default set, every scheme that applies) or, with ``from_workbook``, its cover's.
    from_workbook : str, Path or None
        An earlier audit workbook whose inputs, edited factors and cover settings are read back.
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
    if assessment is None:
        assessment = cover_assessment(from_workbook) if from_workbook is not None else assessment_or_default(None)
    project, sha, factor_set, evidence, source = _workbook_inputs(project_file, from_workbook, assessment)
    scored = assessment.but(factor_set=factor_set, overrides=(), boundary=None, matching=None)  # the project as read
    engine = assess(scored, project, source=source, project_sha256=sha)  # the declared shares, as the sheets hold them
    meters, months = _metered(periods, project, scored, engine) if periods is not None else (None, None)
    series, matched = _series_and_matched(project, project_file, from_workbook, scored, source, sha)
    spread = None
    if draws is not None:
        stated = _stated_distributions(project_file, from_workbook, distributions)
        options = {"draws": draws, "seed": seed, "source": source, "keep_draws": keep_draws}
        spread = monte_carlo(project, scored, stated, project_sha256=sha, series=series, **options)
    workbook = build_workbook(
        engine,
        project,
        factor_set,
        factors_option=requested_as(assessment.factor_set),
        meters=meters,
        month_results=months,
        meters_source=str(periods or ""),
        evidence=evidence,
        uncertainty=spread,
        draws_csv=draws_csv,
        series=series,
        matched_checks=matched,
    )
    return AuditWorkbook(
        workbook, engine, spread, metered_year(meters, project.project.product, months) if months else None
    )
