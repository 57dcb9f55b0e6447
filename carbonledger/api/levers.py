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
    """The least-cost values of the levers with which every scheme qualifies, and the cost/margin front.

    The levers of ``levers_file`` are set so that every scheme in ``schemes`` qualifies on ``year``'s rules:
    at the central value, or, with ``confidence``, in at least that share of ``draws`` Monte Carlo draws.
    See docs/qualify.md.

    Parameters
    ----------
    project_file : str or Path
        The project TOML file.
    levers_file : str or Path
        The levers file: the parameters that may move, their ranges and costs, and its ``schemes``.
    schemes : list of str or None
        Scheme ids that must qualify; default the levers file's ``schemes``.
    year : int or None
        The assessment year (calendar year) on whose dates the scheme rules are read.
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
    factors : str, Path or FactorSet
        Factor set name, set folder, override CSV, or a loaded ``FactorSet``.
    gwp : str
        GWP100 set (``ar4``, ``ar5``, ``ar6``).
    overrides : list of str or None
        ``dotted.parameter=value`` strings applied before validation.

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
    levers = read_levers(levers_file)
    project, _ = load_project(project_file, overrides)
    found = load_uncertainty(project_file, distributions) if confidence is not None else None
    return qualify_with(
        project, factor_set_of(factors), levers, list(schemes or levers.schemes), source=str(project_file), levers_source=str(levers_file), gwp=gwp, year=year,
        confidence=confidence, draws=draws, seed=seed, sampling=sampling, uncertainty=found, series=project_series(project, project_file), budgets=budgets,
    )
