"""What it takes to qualify: the least-cost levers."""

from __future__ import annotations

from pathlib import Path

from ..analyses.electricity_series import project_series
from ..analyses.qualify import FRONT_BUDGETS, QualifyResult
from ..analyses.qualify import qualify as qualify_with
from ..analyses.uncertainty import DEFAULT_SEED
from ..core.scoring import DEFAULT_GWP
from ..model.factors import DEFAULT_SET, FactorSet
from ..model.levers import read_levers
from ..routes.project import load_project
from .monte_carlo import load_uncertainty
from .scoring import factor_set_of


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
        project, factor_set_of(factors), levers, list(schemes or levers.schemes), source=str(project_file), levers_source=str(levers_file), gwp=gwp, year=year,
        confidence=confidence, draws=draws, seed=seed, sampling=sampling, uncertainty=found, series=project_series(project, project_file), budgets=budgets,
    )
