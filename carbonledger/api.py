"""The library API: what the command line calls, and what a notebook user calls directly.

Each function takes file paths and options, loads and validates them at the edge, and calls
the core and the analyses; none of them prints. ``score`` returns a ``ScoreResult``; ``compare``
a ``ComparisonResult``; ``audit_workbook`` an openpyxl workbook and the engine's result.
"""

from __future__ import annotations

from pathlib import Path

from .analyses.compare import ComparisonResult
from .analyses.compare import compare as compare_results
from .analyses.lifetime import LifetimeResult, lifetime_score
from .analyses.periods import month_results, read_meters
from .analyses.portfolio import Recalc, load_portfolio
from .analyses.portfolio import recalc as recalc_portfolio
from .core.results import ScoreResult
from .core.scoring import DEFAULT_GWP, score_project
from .errors import InputError
from .io.workbook.reader import (
    base_factor_set,
    factor_set_from_workbook,
    load_project_from_workbook,
)
from .io.workbook.writer import build_workbook
from .model.factors import DEFAULT_SET, FactorSet, load_factor_set
from .model.project import BOUNDARIES
from .routes.project import load_project

__all__ = [
    "score",
    "score_project",
    "score_workbook",
    "compare",
    "audit_workbook",
    "recalc",
    "lifetime",
    "load_project",
    "load_factor_set",
    "load_any_project",
]


def _factor_set(factors: str | Path | FactorSet) -> FactorSet:
    return factors if isinstance(factors, FactorSet) else load_factor_set(factors)


def _boundary_overrides(boundary: str | None, overrides: list[str] | None) -> list[str]:
    """``boundary`` is ``project.boundary=...``: the project model validates it."""
    if boundary is not None and boundary not in BOUNDARIES:
        raise InputError("--boundary", boundary, f"one of {', '.join(BOUNDARIES)}")
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
    matching: dict | None = None,
) -> ScoreResult:
    """Score a project file: carbon intensity, by stage and gas, with scheme checks.

    Parameters
    ----------
    project_file : path of the project TOML.
    factors : factor set name, set folder, override CSV, or a loaded FactorSet.
    gwp : GWP100 set of the headline result ('ar4', 'ar5', 'ar6'); each scheme check uses its own.
    schemes : scheme ids to check; default all that apply to the product.
    overrides : 'dotted.parameter=value' strings applied to the project before validation.
    boundary : 'cradle-to-gate', 'well-to-tank' or 'well-to-wake'; default the project's own.
    year : calendar year whose dates the scheme rules are read on; default this year.
    matching : electricity source name -> finest period a time series shows it matched
        ('hourly', 'half_hourly'); without it hourly rules are undetermined.
    """
    project, sha = load_project(project_file, _boundary_overrides(boundary, overrides))
    return score_project(project, _factor_set(factors), gwp=gwp, schemes=schemes, source=str(project_file), project_sha256=sha, year=year, matching=matching)


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
    return score_project(project, factor_set, gwp=gwp or settings.gwp, schemes=schemes or settings.schemes or None, source=str(path), project_sha256=sha, year=year)


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
) -> ComparisonResult:
    """Score several project files (or audit workbooks) with the same options and put them on one basis.

    basis : 'auto', 't-nh3', 'kg-h2' or 'mj' (LHV of the delivered product).
    """
    if not project_files:
        raise InputError("compare", "PROJECTS", "at least one project file")
    factor_set = _factor_set(factors)
    results = []
    for path in project_files:
        project, sha, project_set = load_any_project(path, factor_set, _boundary_overrides(boundary, None))
        results.append(score_project(project, project_set, gwp=gwp, source=str(path), project_sha256=sha))
    return compare_results(results, basis=basis, schemes=schemes)


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
):
    """The audit workbook of a project file, or of the inputs read back from an earlier workbook.

    Options left as None take the defaults (GWP100 AR6, the default factor set, every scheme that
    applies), or, with ``from_workbook``, the settings recorded on that workbook's cover.
    Returns (openpyxl Workbook, engine ScoreResult).
    """
    overrides = _boundary_overrides(boundary, overrides)
    if from_workbook is not None:
        project, sha, settings = load_project_from_workbook(from_workbook, overrides)
        factor_set = factor_set_from_workbook(from_workbook, base_factor_set(settings, factors))
        gwp = gwp or settings.gwp
        schemes = schemes or settings.schemes or None
        factors_option = factors or settings.factors_option
        source = str(from_workbook)
    else:
        project, sha = load_project(project_file, overrides)
        factors_option = factors or DEFAULT_SET
        factor_set = load_factor_set(factors_option)
        gwp = gwp or DEFAULT_GWP
        source = str(project_file)
    engine = score_project(project, factor_set, gwp=gwp, schemes=schemes, source=source, project_sha256=sha)
    meters = months = None
    if periods is not None:
        if project.project.boundary != "cradle-to-gate":
            raise InputError(periods, "--periods", f"a project scored cradle-to-gate (meters describe the plant), got boundary '{project.project.boundary}'; pass --boundary cradle-to-gate")
        meters = read_meters(periods, project)
        months = month_results(meters, project, factor_set, gwp=gwp, design=engine, schemes=schemes)
    workbook = build_workbook(engine, project, factor_set, factors_option=factors_option, meters=meters, month_results=months, meters_source=str(periods or ""))
    return workbook, engine


def recalc(paths: list[str | Path], old_factors: str | Path | FactorSet, new_factors: str | Path | FactorSet, *, gwp: str = DEFAULT_GWP, schemes: list[str] | None = None, year: int | None = None) -> Recalc:
    """Rescore a portfolio (files or folders of project files) under a new factor set; scheme rules read on ``year``'s dates."""
    return recalc_portfolio(load_portfolio(paths), _factor_set(old_factors), _factor_set(new_factors), gwp=gwp, schemes=schemes, year=year)


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
