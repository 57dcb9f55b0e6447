"""The library API: what the command line calls, and what a notebook user calls directly.

Each function takes file paths and options, loads and validates them at the edge, and calls
the core and the analyses; none of them prints. ``score`` returns a ``ScoreResult``; ``compare``
a ``ComparisonResult``; ``audit_workbook`` an openpyxl workbook and the engine's result.
"""

from __future__ import annotations

import functools
import json
import os
import tempfile
from dataclasses import dataclass
from datetime import UTC, datetime
from pathlib import Path

from .about import CAUTION
from .analyses.cluster import dask_mapper
from .analyses.compare import ComparisonResult
from .analyses.compare import compare as compare_results
from .analyses.electricity_series import ElectricitySeries, project_series
from .analyses.headroom import Headroom, headroom_summary
from .analyses.headroom import headroom as headroom_of
from .analyses.lifetime import LifetimeResult, lifetime_score
from .analyses.matching import electricity_model, match, matched_checks, matching_views, score_with_series, series_matched_periods
from .analyses.periods import metered_year, month_results, read_meters
from .analyses.plan import PlanResult, plan_project
from .analyses.portfolio import Recalc, RecalcPiece, load_portfolio, project_files, recalc_piece
from .analyses.portfolio import recalc as recalc_portfolio
from .analyses.qualify import FRONT_BUDGETS, QualifyResult
from .analyses.qualify import qualify as qualify_with
from .analyses.sensitivity import SWING_PERCENT, Sensitivity
from .analyses.sensitivity import sensitivity as sensitivity_of
from .analyses.uncertainty import DEFAULT_DRAWS, DEFAULT_SEED, UncertaintyResult, factors_used, monte_carlo, uncertain_inputs
from .core.results import ScoreResult
from .core.scoring import DEFAULT_GWP, assemble, prepare, score_project, shipped_rulebooks, solve_stacked, solve_with_bw2calc
from .errors import InputError
from .io.ledger import LedgerRecord, RunTarget, factor_row, open_run, project_history, run_target, write_batch
from .io.ledger_store import Location
from .io.matching_chart import write_matching_chart
from .io.pack import manifest_of, read_pack, unpack, workbook_bytes, write_pack
from .io.report import ProjectReport, render_report
from .io.workbook.reader import (
    base_factor_set,
    factor_set_from_workbook,
    load_project_from_workbook,
    series_from_workbook,
)
from .io.workbook.writer import build_workbook
from .model.distributions import Uncertainty, parse_uncertainty, read_distributions_file
from .model.factors import DEFAULT_SET, FactorSet, load_factor_set
from .model.levers import read_levers
from .model.project import boundary_id, parameter_table, read_project_file, rebalanced_sources
from .model.rulebooks import load_user_rulebooks, using_rulebooks
from .routes.project import load_project

__all__ = [
    "score",
    "score_project",
    "score_workbook",
    "compare",
    "audit_workbook",
    "recalc",
    "lifetime",
    "plan",
    "report",
    "report_items",
    "load_project",
    "load_factor_set",
    "load_any_project",
    "uncertainty",
    "load_uncertainty",
    "headroom",
    "qualify",
    "sensitivity",
    "uncertainty_many",
    "user_rulebooks",
    "using_rulebooks",
]


def user_rulebooks(paths: list[str | Path]):
    """The user's own rulebooks (TOML files in the format of ``factors/schemes``), validated: id -> Scheme.
    Use them with ``using_rulebooks``::

        with api.using_rulebooks(api.user_rulebooks(["offtake_contract.toml"])):
            result = api.score("project.toml")  # the contract's check beside the shipped schemes
    """
    return load_user_rulebooks(paths, shipped_rulebooks())


def _factor_set(factors: str | Path | FactorSet) -> FactorSet:
    return factors if isinstance(factors, FactorSet) else load_factor_set(factors)


def _boundary_overrides(boundary: str | None, overrides: list[str] | None) -> list[str]:
    """``boundary`` is ``project.boundary=...``: the project model validates it."""
    boundary = boundary_id(boundary) if boundary is not None else None
    return list(overrides or []) + ([f"project.boundary={boundary}"] if boundary else [])


def score(
    project_file: str | Path,
    *,
    factors: str | Path | FactorSet = DEFAULT_SET,
    gwp: str = DEFAULT_GWP,
    schemes: list[str] | None = None,
    overrides: list[str] | None = None,
    boundary: str | None = None,
    year: int | None = None,
    matching: str | None = None,
    matched_periods: dict | None = None,
) -> ScoreResult:
    """Score a project file: carbon intensity, by stage and gas, with scheme checks.

    Parameters
    ----------
    project_file : path of the project TOML.
    factors : factor set name, set folder, override CSV, or a loaded FactorSet.
    gwp : GWP100 set of the headline result ('ar4', 'ar5', 'ar6'); each scheme check uses its own.
    schemes : scheme ids to check; default all that apply to the product.
    overrides : 'dotted.parameter=value' strings applied to the project before validation;
        'electricity.sources.NAME.share=rest' (``--rebalance NAME``) gives that source 1 less the
        other sources' shares after the others are set (refused when that is not from 0 to 1).
    boundary : 'cradle-to-gate', 'well-to-tank' or 'well-to-wake'; default the project's own.
    matching : with an electricity time series, a granularity (interval, hour, month, quarter,
        year) that replaces every scheme's temporal rule (a what-if); 'declared': ignore the series
        and score the declared annual shares (what the audit workbook holds); None: each scheme's rule.
    year : the assessment year, whose dates the scheme rules are read on; default the first full
        calendar year of operation after the project's commissioning date, else this year.
    matched_periods : electricity source name -> finest period a time series shows it matched
        ('hourly', 'half_hourly'), for projects without a series in the file; without it (and
        without a series) hourly rules are undetermined.
    """
    project, sha = load_project(project_file, _boundary_overrides(boundary, overrides))
    series = None if matching == "declared" else project_series(project, project_file)
    if series is None:
        if matching not in (None, "declared"):
            raise InputError("--matching", matching, f"a project with an electricity time series ([electricity] time_series in {project_file})")
        result = score_project(project, _factor_set(factors), gwp=gwp, schemes=schemes, source=str(project_file), project_sha256=sha, year=year, matching=matched_periods)
    else:
        result = score_with_series(project, _factor_set(factors), series, gwp=gwp, schemes=schemes, source=str(project_file), project_sha256=sha, matching=matching, year=year)
    return stating_rebalance(result, project, overrides)


def stating_rebalance(result: ScoreResult, project, overrides: list[str] | None) -> ScoreResult:
    """The result stating each electricity share that took up the difference to 1 (--rebalance)."""
    names = rebalanced_sources(overrides)
    if not names:
        return result
    return result.model_copy(update={"rebalanced_shares": {name: project.electricity.sources[name].share for name in names}})


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
    project, sha, settings = load_project_from_workbook(path, _boundary_overrides(boundary, overrides))
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


def compare(
    project_files: list[str | Path],
    *,
    boundary: str | None = None,
    gwp: str = DEFAULT_GWP,
    factors: str | Path | FactorSet = DEFAULT_SET,
    schemes: list[str] | None = None,
    basis: str = "auto",
    draws: int | None = None,
    seed: int = DEFAULT_SEED,
    distributions: str | Path | None = None,
    year: int | None = None,
) -> ComparisonResult:
    """Score several project files (or audit workbooks) with the same options and put them on one basis.

    basis : 'auto', 't-nh3', 'kg-h2' or 'mj' (LHV of the delivered product).
    draws : with a number, a Monte Carlo of each project (its ``[uncertainty]`` table and factor rows
        with pedigree scores; the same ``seed`` for all) gives its 5th-95th percentile band; a project
        without any distribution shows none, and says so. ``distributions`` (a distributions file)
        is laid over every project's own table (a pedigree distribution of a parameter takes each
        project's own value as its median).
    """
    if not project_files:
        raise InputError("compare", "PROJECTS", "at least one project file")
    factor_set = _factor_set(factors)
    results, spreads = [], []
    for path in project_files:
        project, sha, project_set = load_any_project(path, factor_set, _boundary_overrides(boundary, None))
        series = None if str(path).lower().endswith(".xlsx") else project_series(project, path)
        if series is None:
            results.append(score_project(project, project_set, gwp=gwp, source=str(path), project_sha256=sha, year=year))
        else:  # checks matched under each scheme's rule, as score gives them
            results.append(score_with_series(project, project_set, series, gwp=gwp, source=str(path), project_sha256=sha, year=year))
        if draws is not None:
            if str(path).lower().endswith(".xlsx"):
                found = read_distributions_file(distributions) if distributions is not None else Uncertainty()
            else:
                found = load_uncertainty(path, distributions)
            if not uncertain_inputs(project, project_set, found, str(path), gwp).names():
                spreads.append("no distributions (no [uncertainty] table, no factor rows with pedigree scores, no factor row a default applies to)")
                continue
            spreads.append(monte_carlo(project, project_set, found, draws=draws, seed=seed, source=str(path), gwp=gwp, schemes=schemes, project_sha256=sha, series=series, year=year))
    return compare_results(results, basis=basis, schemes=schemes, spreads=spreads if draws is not None else None)


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
    overrides = _boundary_overrides(boundary, overrides)
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
        matched = score_with_series(project, factor_set, series, gwp=gwp, schemes=schemes, source=source, project_sha256=sha, year=year).checks
    if draws is not None:
        spread = monte_carlo(project, factor_set, found, draws=draws, seed=seed, source=source, gwp=gwp, schemes=schemes, keep_draws=keep_draws, project_sha256=sha, series=series, year=year)
    workbook = build_workbook(
        engine, project, factor_set, factors_option=factors_option, meters=meters, month_results=months, meters_source=str(periods or ""), evidence=evidence,
        uncertainty=spread, draws_csv=draws_csv, series=series, matched_checks=matched,
    )
    return AuditWorkbook(workbook, engine, spread, metered_year(meters, project.project.product, months) if months else None)


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
    old_set, new_set = _factor_set(old_factors), _factor_set(new_factors)
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
    project, sha = load_project(project_file, _boundary_overrides(boundary, overrides))
    return lifetime_score(project, _factor_set(factors), project_file=str(project_file), project_sha256=sha, gwp=gwp, schemes=schemes)


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
        project, _factor_set(factors), series, scheme, source=str(project_file), project_sha256=sha, tier=tier, rated_kw=rated_kw, min_load=min_load,
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
    prepared = prepare(project, _factor_set(factors), gwp=gwp, schemes=[scheme] if scheme else None, source=str(project_file), project_sha256=sha, year=year, matching=series_matched_periods(series))
    solutions = solve_with_bw2calc(prepared)
    rulebook = prepared.chosen[0]
    model = electricity_model(prepared, solutions, rulebook, list(series.generation_kwh))
    load = series.load(model.kwh_per_kg_h2)
    granularity = model.granularity if matching in (None, "rule") else matching
    result = match(load, series.generation_kwh, model.eligible, granularity, series.utc, series.local)
    label = granularity if isinstance(granularity, str) else "dated rule"
    title = f"{project.project.name}: {rulebook.id}, matching by {label}, {result.matched_share:.1%} matched"
    return write_matching_chart(series.local, load, result.matched_interval_kwh, title, path, force=force)


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
    project, sha = load_project(project_file, _boundary_overrides(boundary, overrides))
    return monte_carlo(
        project, _factor_set(factors), found, draws=draws, seed=seed, sampling=sampling, source=str(project_file), gwp=gwp, schemes=schemes,
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
    project, _ = load_project(project_file, _boundary_overrides(boundary, overrides))
    factor_set = _factor_set(factors)
    series = project_series(project, project_file)
    return [headroom_of(project, factor_set, path, scheme, tier, source=str(project_file), gwp=gwp, series=series, year=year) for path in parameters]


def qualify(
    project_file: str | Path,
    levers_file: str | Path,
    *,
    schemes: list[str] | None = None,
    year: int | None = None,
    confidence: float | None = None,
    draws: int = 2000,
    seed: int = DEFAULT_SEED,
    sampling: str | None = None,
    distributions: str | Path | None = None,
    budgets: int = FRONT_BUDGETS,
    factors: str | Path | FactorSet = DEFAULT_SET,
    gwp: str = DEFAULT_GWP,
    overrides: list[str] | None = None,
) -> QualifyResult:
    """The least-cost values of the levers in ``levers_file`` with which every scheme in ``schemes``
    (default: the levers file's ``schemes``) qualifies on ``year``'s rules: at the central value, or,
    with ``confidence``, in at least that share of ``draws`` Monte Carlo draws (``seed``; the
    project's ``[uncertainty]`` table with ``distributions`` laid over it). Also the cost/margin
    front over ``budgets`` budgets (0: none). See docs/qualify.md."""
    levers = read_levers(levers_file)
    project, _ = load_project(project_file, overrides)
    found = load_uncertainty(project_file, distributions) if confidence is not None else None
    return qualify_with(
        project, _factor_set(factors), levers, list(schemes or levers.schemes), source=str(project_file), levers_source=str(levers_file), gwp=gwp, year=year,
        confidence=confidence, draws=draws, seed=seed, sampling=sampling, uncertainty=found, series=project_series(project, project_file), budgets=budgets,
    )


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
    project, _ = load_project(project_file, _boundary_overrides(boundary, overrides))
    return sensitivity_of(
        project, _factor_set(factors), found, scheme=scheme, base_sample=base_sample, seed=seed, source=str(project_file), gwp=gwp, series=project_series(project, project_file), year=year,
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
    project, sha = load_project(project_file, _boundary_overrides(boundary, overrides))
    factor_set = _factor_set(factors)
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


def report_items(
    paths: list[str | Path],
    *,
    factors: str | Path | FactorSet = DEFAULT_SET,
    gwp: str = DEFAULT_GWP,
    schemes: list[str] | None = None,
    overrides: list[str] | None = None,
    boundary: str | None = None,
    draws: int = DEFAULT_DRAWS,
    seed: int = DEFAULT_SEED,
    year: int | None = None,
    levers: str | Path | None = None,
) -> list[ProjectReport]:
    """What a report shows of each project (files, or folders of project files): its score, its
    parameters with units and, where the project gives them, its operating years ([lifetime]), the
    matching of its electricity time series ([electricity] time_series) and a Monte Carlo of
    ``draws`` draws with ``seed`` ([uncertainty]); with ``levers`` (a levers file), what it takes
    to qualify for ``schemes`` (default the levers file's) at the central value.

    The one project is solved by the stacked numpy solver (``solve_stacked``, the solver of
    ``recalc``, equal to bw2calc to 1e-9 on every demo: tests/test_recalc.py and
    tests/test_report.py), so that a report does not pay bw2calc's import (about 1.9 s of CPU)."""
    factor_set = _factor_set(factors)
    items = []
    for path in project_files(list(paths)):
        project, sha = load_project(path, _boundary_overrides(boundary, overrides))
        series = project_series(project, path)
        matched = series_matched_periods(series) if series is not None else None
        prepared = prepare(project, factor_set, gwp=gwp, schemes=schemes, source=str(path), project_sha256=sha, matching=matched, year=year)
        solutions = solve_stacked([prepared], check_with_bw2calc=False)[0]
        result = assemble(prepared, solutions)
        views = []
        if series is not None:
            result = matched_checks(prepared, solutions, result, series)
            views = matching_views(prepared, solutions, result, series)
        life = None
        if project.lifetime is not None:
            life = lifetime_score(project, factor_set, project_file=str(path), project_sha256=sha, gwp=gwp, schemes=schemes)
        spread = None
        if "uncertainty" in read_project_file(path)[0]:
            spread = monte_carlo(project, factor_set, load_uncertainty(path), draws=draws, seed=seed, source=str(path), gwp=gwp, schemes=schemes, series=series, year=year)
        found = qualify(path, levers, schemes=schemes, factors=factor_set, gwp=gwp, overrides=_boundary_overrides(boundary, overrides), budgets=0, year=year) if levers is not None else None
        items.append(ProjectReport(result, parameter_table(project), life, views, spread, found))
    return items


def report(
    paths: list[str | Path],
    *,
    factors: str | Path | FactorSet = DEFAULT_SET,
    gwp: str = DEFAULT_GWP,
    schemes: list[str] | None = None,
    overrides: list[str] | None = None,
    boundary: str | None = None,
    generated: str | None = None,
    paper: str | None = None,
    draws: int = DEFAULT_DRAWS,
    seed: int = DEFAULT_SEED,
    year: int | None = None,
    levers: str | Path | None = None,
) -> str:
    """The project report of one or several projects as one self-contained HTML text.

    generated : the date printed on the report (ISO); default today (UTC), or $SOURCE_DATE_EPOCH.
    paper : 'a4' or 'letter' to fix the printed page size (for a PDF); default the printer's.
    draws, seed : the Monte Carlo of a project with an [uncertainty] table (the seed is printed).
    levers : a levers file: each project gets a section on what it takes to qualify.
    """
    if not paths:
        raise InputError("report", "PROJECT", "at least one project file or folder")
    items = report_items(paths, factors=factors, gwp=gwp, schemes=schemes, overrides=overrides, boundary=boundary, draws=draws, seed=seed, year=year, levers=levers)
    return render_report(items, generated=generated or report_date(), caution=CAUTION, paper=paper)


def report_date() -> str:
    """Today's date (UTC), or the date of $SOURCE_DATE_EPOCH for reproducible reports."""
    epoch = os.environ.get("SOURCE_DATE_EPOCH", "")
    moment = datetime.fromtimestamp(int(epoch), UTC) if epoch.isdigit() else datetime.now(UTC)
    return moment.date().isoformat()


# --- the evidence pack ----------------------------------------------------------------------------

PACK_PROJECT_FOLDER = "project"
PACK_RULEBOOK_FOLDER = "rulebooks"  # the user rulebooks (--rulebook) in a pack


def files_read_by(project, project_file: str | Path) -> dict[str, Path]:
    """The files a project reads beside itself (its electricity time series, its grid trajectory
    CSV), by their path relative to the project file; one outside the project's folder is refused."""
    base = Path(project_file).resolve().parent
    named = [("electricity.time_series", project.electricity.time_series)]
    if project.lifetime is not None:
        named.append(("lifetime.grid_trajectory_csv", project.lifetime.grid_trajectory_csv))
    found = {}
    for field, name in named:
        if not name:
            continue
        path = (base / name).resolve()
        if base not in path.parents:
            raise InputError(project_file, field, f"a file in the project's folder or below it, to go in the pack (copy '{name}' beside the project file)")
        found[path.relative_to(base).as_posix()] = path
    return found


def pack(
    project_file: str | Path,
    output: str | Path,
    *,
    factors: str | Path = DEFAULT_SET,
    gwp: str = DEFAULT_GWP,
    schemes: list[str] | None = None,
    year: int | None = None,
    ledger: str | Path | None = None,
    force: bool = False,
    rulebooks: list[str | Path] | None = None,
) -> tuple[dict, ScoreResult]:
    """Write an evidence pack of a project: the project file and every file it reads, the factor
    overrides (a factor CSV or set folder given as ``factors``; a shipped set is named with its
    sha256), the user's own rulebooks (``rulebooks``, checked beside the schemes), the result as
    JSON, the audit workbook, the report, the project's records in the run ledger, and a manifest
    with the sha256 of every file, the version and the assessment year.
    Returns the manifest and the result packed."""
    packed_rulebooks = {}
    for path in dict.fromkeys(Path(given) for given in rulebooks or []):
        name = f"{PACK_RULEBOOK_FOLDER}/{path.name}"
        if name in packed_rulebooks:
            raise InputError(path, "--rulebook", f"a file name of its own in the pack ({packed_rulebooks[name]} has the name {path.name} too)")
        packed_rulebooks[name] = path
    with using_rulebooks(user_rulebooks(list(packed_rulebooks.values()))):
        return _pack(Path(project_file), output, factors, gwp, schemes, year, ledger, force, packed_rulebooks)


def _pack(project_file: Path, output, factors, gwp, schemes, year, ledger, force, packed_rulebooks: dict[str, Path]) -> tuple[dict, ScoreResult]:
    project, _ = load_project(project_file)
    factor_set = load_factor_set(factors)
    result = score(project_file, factors=factor_set, gwp=gwp, schemes=schemes, year=year)
    year = int(getattr(result, "assessment_year", None) or next((c.assessment_period for c in result.checks if c.assessment_period), None) or year or datetime.now(UTC).year)
    files = {f"{PACK_PROJECT_FOLDER}/{project_file.name}": project_file.read_bytes()}
    files.update({f"{PACK_PROJECT_FOLDER}/{name}": path.read_bytes() for name, path in files_read_by(project, project_file).items()})
    files.update({name: path.read_bytes() for name, path in packed_rulebooks.items()})
    factors_in_pack = ""
    overrides = Path(factors)
    if overrides.is_file():
        factors_in_pack = f"factors/{overrides.name}"
        files[factors_in_pack] = overrides.read_bytes()
    elif overrides.is_dir():
        factors_in_pack = f"factors/{overrides.name}"
        files.update({f"{factors_in_pack}/{path.name}": path.read_bytes() for path in sorted(overrides.iterdir()) if path.is_file()})
    files["result.json"] = result.to_json().encode("utf-8")
    book, _, _ = audit_workbook(project_file, factors=str(factors), gwp=gwp, schemes=schemes, year=year)
    files["workbook.xlsx"] = workbook_bytes(book)
    files["report.html"] = report([project_file], factors=factor_set, gwp=gwp, schemes=schemes, year=year).encode("utf-8")
    try:
        records = project_history(project_file, ledger)
    except InputError:  # no ledger yet: the pack says so
        records = []
    files["ledger.json"] = (json.dumps({"project_file": str(project_file.resolve()), "records": records}, indent=2, default=str) + "\n").encode("utf-8")
    manifest = manifest_of(
        files,
        carbonledger_version=result.carbonledger_version,
        assessment_year=year,
        project=f"{PACK_PROJECT_FOLDER}/{project_file.name}",
        options={"factors": factors_in_pack or factor_set.name, "gwp": gwp, "schemes": schemes or [], "year": year, "rulebooks": list(packed_rulebooks)},
        factor_set={"name": factor_set.name, "sha256": factor_set.sha256},
        caution=CAUTION,
    )
    write_pack(output, files, manifest, force=force)
    return manifest, result


def packed_figures(result: dict) -> dict[str, object]:
    """The figures and statuses of a result's JSON that a re-score must reproduce: total, every
    intensity, stage and gas, and each check's value, limit, status and tier."""
    figures: dict[str, object] = {"total": result["total"]}
    figures.update({f"intensity.{k}": v for k, v in result["intensity"].items()})
    figures.update({f"by_stage.{k}": v for k, v in result["by_stage"].items()})
    figures.update({f"by_gas.{k}": v for k, v in result["by_gas"].items()})
    for check in result["checks"]:
        for key in ("value", "limit", "status", "tier"):
            figures[f"{check['scheme']}.{key}"] = check.get(key)
    return figures


def verify_pack(path: str | Path) -> list[tuple[str, object, object, bool]]:
    """Check a pack against its manifest (``io.pack.PackMismatch`` names a file that does not
    match), re-score its project in a fresh folder with the options it was packed with, and
    compare every figure and status: [(figure, packed, re-scored, reproduced)]. Figures are
    reproduced to a relative 1e-9; a shipped factor set must have the sha256 the pack names."""
    packed = read_pack(path)
    manifest, options = packed.manifest, packed.manifest.get("options", {})
    with tempfile.TemporaryDirectory(prefix="carbonledger-verify-") as folder:
        unpack(packed, Path(folder))
        factors = options.get("factors", DEFAULT_SET)
        in_pack = Path(folder) / factors
        factor_set = load_factor_set(in_pack if factors.startswith("factors/") else factors)
        expected_sha = manifest.get("factor_set", {}).get("sha256")
        if not factors.startswith("factors/") and expected_sha and factor_set.sha256 != expected_sha:
            raise InputError(path, "factor_set", f"factor set '{factors}' with sha256 {expected_sha} as packed; this installation's has {factor_set.sha256}")
        with using_rulebooks(user_rulebooks([Path(folder) / name for name in options.get("rulebooks", [])])):
            rescored = score(Path(folder) / manifest["project"], factors=factor_set, gwp=options.get("gwp", DEFAULT_GWP), schemes=options.get("schemes") or None, year=options.get("year"))
    before = packed_figures(json.loads(packed.files["result.json"]))
    after = packed_figures(json.loads(rescored.to_json()))
    rows = []
    for figure in sorted(set(before) | set(after)):
        old, new = before.get(figure), after.get(figure)
        same = old == new or (isinstance(old, (int, float)) and isinstance(new, (int, float)) and abs(old - new) <= 1e-9 * max(abs(old), abs(new), 1e-12))
        rows.append((figure, old, new, same))
    return rows
