"""Comparing projects on one basis (with optional Monte Carlo bands)."""

from __future__ import annotations

from pathlib import Path

from ..analyses.compare import ComparisonResult
from ..analyses.compare import compare as compare_results
from ..analyses.electricity_series import project_series
from ..analyses.pipeline import assess
from ..analyses.uncertainty import DEFAULT_SEED, monte_carlo, uncertain_inputs
from ..core.assessment import Assessment
from ..core.scoring import DEFAULT_GWP
from ..errors import InputError
from ..model.distributions import Uncertainty, read_distributions_file
from ..model.factors import DEFAULT_SET, FactorSet
from ..model.project import boundary_overrides
from .monte_carlo import load_uncertainty
from .scoring import factor_set_of
from .workbooks import load_any_project


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

    Parameters
    ----------
    project_files : list of str or Path
        Project TOML files or audit workbooks (``.xlsx``, scored from their inputs and edited factors).
    boundary : str or None
        ``cradle-to-gate``, ``well-to-tank`` or ``well-to-wake`` for every project; default each project's own
        (the projects must then share one).
    gwp : str
        GWP100 set (``ar4``, ``ar5``, ``ar6``) of the headline results.
    factors : str, Path or FactorSet
        Factor set name, set folder, override CSV, or a loaded ``FactorSet``.
    schemes : list of str or None
        Scheme ids whose checks are compared; default every scheme that applies.
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
    year : int or None
        The assessment year (calendar year) on whose dates the scheme rules are read; default each project's.

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
    factor_set = factor_set_of(factors)
    results, spreads = [], []
    for path in project_files:
        project, sha, project_set = load_any_project(path, factor_set, boundary_overrides(boundary, None))
        series = None if str(path).lower().endswith(".xlsx") else project_series(project, path)
        # checks matched under each scheme's rule where the project gives a series, as score gives them
        results.append(assess(Assessment(project_set, gwp, year=year), project, source=str(path), project_sha256=sha, series=series))
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
