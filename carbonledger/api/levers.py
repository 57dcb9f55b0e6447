"""What it takes to qualify: the least-cost levers."""

from __future__ import annotations

from pathlib import Path

from ..analyses.electricity_series import project_series
from ..analyses.qualify import FRONT_BUDGETS, QualifyResult
from ..analyses.qualify import qualify as qualify_with
from ..analyses.uncertainty import DEFAULT_SEED
from ..core.assessment import Assessment
from ..model.levers import read_levers
from ..routes.project import load_project
from .monte_carlo import load_uncertainty
from .scoring import assessment_or_default


def qualify(
    project_file: str | Path,
    levers_file: str | Path,
    assessment: Assessment | None = None,
    *,
    confidence: float | None = None,
    draws: int = 2000,
    seed: int = DEFAULT_SEED,
    sampling: str | None = None,
    distributions: str | Path | None = None,
    budgets: int = FRONT_BUDGETS,
) -> QualifyResult:
    """The least-cost values of the levers with which every scheme qualifies, and the cost/margin front.

    The levers of ``levers_file`` are set so that every scheme of the assessment qualifies on its year's rules:
    at the central value, or, with ``confidence``, in at least that share of ``draws`` Monte Carlo draws.
    See docs/qualify.md.

    Parameters
    ----------
    project_file : str or Path
        The project TOML file.
    levers_file : str or Path
        The levers file: the parameters that may move, their ranges and costs, and its ``schemes``.
    assessment : Assessment or None
        The run's options (factor set, GWP100 set, the schemes that must qualify, overrides, boundary,
        assessment year); its schemes default to the levers file's ``schemes``; None: the defaults
        (``api.scoring.assessment_or_default``).
    confidence : float or None
        Share of the Monte Carlo draws in which every scheme must qualify, strictly between 0 and 1; None: at
        the central value.
    draws : int
        Monte Carlo draws with ``confidence`` (common to every candidate).
    seed : int
        Seed of the draws' random numbers (the same seed gives the same numbers).
    sampling : str or None
        ``random`` or ``latin_hypercube``; default the distributions' own (random).
    distributions : str, Path or None
        A distributions TOML laid over the project's own ``[uncertainty]`` table (read with ``confidence``).
    budgets : int
        Number of budgets of the cost/margin front (0: no front).

    Returns
    -------
    QualifyResult
        The least-cost lever values (each in its parameter's unit) and their total cost (in the levers file's
        currency per its period), each scheme's check there (scored back through ``score``), and the front.

    References
    ----------
    .. [1] Kraft, D. (1988). A software package for sequential quadratic programming. DFVLR-FB 88-28
       (SLSQP, the method of scipy.optimize.minimize used here).
    .. [2] Charnes, A. and Cooper, W. W. (1959). Chance-constrained programming. Management Science
       6(1), 73-79.
    .. [3] Luedtke, J. and Ahmed, S. (2008). A sample approximation approach for optimization with
       probabilistic constraints. SIAM Journal on Optimization 19(2), 674-699.
    .. [4] Land, A. H. and Doig, A. G. (1960). An automatic method of solving discrete programming
       problems. Econometrica 28(3), 497-520 (branch and bound).
    """
    assessment = assessment_or_default(assessment)
    levers = read_levers(levers_file)
    if not assessment.schemes:
        assessment = assessment.but(schemes=tuple(levers.schemes))
    project, _ = load_project(project_file, assessment.project_overrides)
    found = load_uncertainty(project_file, distributions) if confidence is not None else None
    return qualify_with(
        project,
        assessment,
        levers,
        source=str(project_file),
        levers_source=str(levers_file),
        confidence=confidence,
        draws=draws,
        seed=seed,
        sampling=sampling,
        uncertainty=found,
        series=project_series(project, project_file),
        budgets=budgets,
    )
