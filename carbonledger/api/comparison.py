"""Comparing projects on one basis (with optional Monte Carlo bands)."""

from __future__ import annotations

from pathlib import Path

from ..analyses.compare import ComparisonResult
from ..analyses.compare import compare as compare_results
from ..analyses.electricity_series import project_series
from ..analyses.pipeline import assess
from ..analyses.uncertainty import DEFAULT_SEED, monte_carlo, uncertain_inputs
from ..core.assessment import Assessment
from ..errors import InputError
from ..model.distributions import Uncertainty, read_distributions_file
from .monte_carlo import load_uncertainty
from .scoring import assessment_or_default
from .workbooks import load_any_project


def compare(
    project_files: list[str | Path],
    assessment: Assessment | None = None,
    *,
    basis: str = "auto",
    draws: int | None = None,
    seed: int = DEFAULT_SEED,
    distributions: str | Path | None = None,
) -> ComparisonResult:
    """Score several project files (or audit workbooks) with the same options and put them on one basis.

    Parameters
    ----------
    project_files : list of str or Path
        Project TOML files or audit workbooks (``.xlsx``, scored from their inputs and edited factors).
    assessment : Assessment or None
        The run's options (factor set, GWP100 set, schemes, overrides, boundary, assessment year); None: the
        defaults (``api.scoring.assessment_or_default``). Without a boundary the projects must share one.
    basis : str
        ``auto`` (the products' own unit when all projects make the same product, else ``mj``), ``t-nh3``
        (kg CO2e/t NH3), ``kg-h2`` (kg CO2e/kg H2) or ``mj`` (g CO2e/MJ, LHV of the delivered product).
    draws : int or None
        With a number, a Monte Carlo of each project of this many draws (its ``[uncertainty]`` table and factor
        rows with pedigree scores) gives its 5th-95th percentile band; a project without any distribution shows
        none, and says so. None: no bands.
    seed : int
        Seed of the random numbers, the same for every project (the same seed gives the same bands).
    distributions : str, Path or None
        A distributions file laid over every project's own table (a pedigree distribution of a parameter takes
        each project's own value as its median).

    Returns
    -------
    ComparisonResult
        The projects' figures on the common basis, their scheme checks and threshold lines, and with ``draws``
        each project's band (or the reason it has none).

    Raises
    ------
    InputError
        When no project file is given.
    """
    if not project_files:
        raise InputError("compare", "PROJECTS", "at least one project file")
    assessment = assessment_or_default(assessment)
    results, spreads = [], []
    for path in project_files:
        project, sha, project_set = load_any_project(path, assessment.factor_set, assessment.project_overrides)
        series = None if str(path).lower().endswith(".xlsx") else project_series(project, path)
        own = assessment.but(factor_set=project_set)  # an audit workbook's edited factors laid over the set
        # every scheme's check (kept or left out by compare_results), matched under each scheme's rule where
        # the project gives a series, as score gives them
        results.append(assess(own.but(schemes=None), project, source=str(path), project_sha256=sha, series=series))
        if draws is not None:
            if str(path).lower().endswith(".xlsx"):
                found = read_distributions_file(distributions) if distributions is not None else Uncertainty()
            else:
                found = load_uncertainty(path, distributions)
            if not uncertain_inputs(project, own, found, str(path)).names():
                spreads.append(
                    "no distributions (no [uncertainty] table, no factor rows with pedigree scores, no factor row a "
                    "default applies to)"
                )
                continue
            spreads.append(
                monte_carlo(
                    project, own, found, draws=draws, seed=seed, source=str(path), project_sha256=sha, series=series
                )
            )
    return compare_results(
        results, basis=basis, schemes=assessment.scheme_list, spreads=spreads if draws is not None else None
    )
