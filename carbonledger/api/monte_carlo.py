"""Uncertainty, headroom and sensitivity of a project, and their ledger records."""

from __future__ import annotations

from pathlib import Path

from ..analyses.cluster import dask_mapper
from ..analyses.electricity_series import project_series
from ..analyses.headroom import Headroom, headroom_summary
from ..analyses.headroom import headroom as headroom_of
from ..analyses.portfolio import project_files
from ..analyses.sensitivity import SWING_PERCENT, Sensitivity
from ..analyses.sensitivity import sensitivity as sensitivity_of
from ..analyses.uncertainty import DEFAULT_DRAWS, DEFAULT_SEED, UncertaintyResult, factors_used, monte_carlo
from ..core.assessment import Assessment
from ..errors import InputError
from ..io.ledger import LedgerRecord, factor_row
from ..model.distributions import Uncertainty, parse_uncertainty, read_distributions_file
from ..model.project import read_project_file
from ..routes.project import load_project
from .scoring import assessment_or_default


def load_uncertainty(project_file: str | Path, distributions: str | Path | None = None) -> Uncertainty:
    """The distributions of a run: the project's ``[uncertainty]`` table with a distributions file laid over it.

    Parameters
    ----------
    project_file : str or Path
        The project TOML file.
    distributions : str, Path or None
        A distributions TOML whose entries replace or add to the project's own.

    Returns
    -------
    Uncertainty
        The distributions by parameter path or factor id (empty when neither gives any; factor rows with
        pedigree scores may add some in the analysis).

    Raises
    ------
    InputError
        When the project's ``uncertainty`` is not a table.
    """
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
    assessment: Assessment | None = None,
    progress=None,
) -> UncertaintyResult:
    """Monte Carlo of a project: mean, spread and percentiles of every figure, probability of each verdict.

    Parameters
    ----------
    project_file : str or Path
        The project TOML file.
    distributions : str, Path or None
        A distributions TOML laid over the project's own ``[uncertainty]`` table.
    draws : int
        Number of draws.
    seed : int
        Seed of the random numbers (the same seed gives the same numbers).
    sampling : str or None
        ``random`` or ``latin_hypercube``; default the distributions' own (random).
    assessment : Assessment or None
        The run's options (factor set, GWP100 set, schemes (whose probability of qualifying is estimated), overrides,
        boundary, assessment year); None: the
        defaults (``api.scoring.assessment_or_default``).
    progress : callable or None
        Called with the number of draws done (for a progress bar).

    Returns
    -------
    UncertaintyResult
        Mean, standard deviation and percentiles of the total, every intensity, stage and scheme value (in
        their own units: kg CO2e per functional unit, g CO2e/MJ), each scheme's probability of qualifying, and
        the draws left out for breaking a physical limit.

    References
    ----------
    .. [1] McKay, M. D., Beckman, R. J. and Conover, W. J. (1979). A comparison of three methods
       for selecting values of input variables in the analysis of output from a computer code.
       Technometrics 21(2), 239-245 (Latin hypercube sampling).
    .. [2] Iman, R. L. and Conover, W. J. (1982). A distribution-free approach to inducing rank
       correlation among input variables. Communications in Statistics B 11(3), 311-334.
    """
    assessment = assessment_or_default(assessment)
    found = load_uncertainty(project_file, distributions)
    project, sha = load_project(project_file, assessment.project_overrides)
    return monte_carlo(
        project,
        assessment,
        found,
        draws=draws,
        seed=seed,
        sampling=sampling,
        source=str(project_file),
        progress=progress,
        project_sha256=sha,
        series=project_series(project, project_file),
    )


def headroom(
    project_file: str | Path,
    parameters: list[str],
    scheme: str,
    *,
    tier: str | None = None,
    assessment: Assessment | None = None,
) -> list[Headroom]:
    """For each parameter path, the value at which the scheme's limit (or ``tier``) is met exactly.

    Root finding within the parameter's physical range, verified by scoring; None with the reason where the
    limit is not met within it.

    Parameters
    ----------
    project_file : str or Path
        The project TOML file.
    parameters : list of str
        Parameter paths (as ``carbonledger params`` lists them, e.g. ``capture.capture_rate``).
    scheme : str
        The scheme id whose limit is sought.
    tier : str or None
        A tier of the scheme; default its loosest threshold.
    assessment : Assessment or None
        The run's options (factor set, GWP100 set, overrides, boundary, assessment year); None: the
        defaults (``api.scoring.assessment_or_default``).
        Its schemes are not read: ``scheme`` is the one searched.

    Returns
    -------
    list of Headroom
        One per parameter: the value (in the parameter's own unit) at which the scheme value equals the limit
        (in the scheme's unit), or None with the reason, and the side of it that qualifies.

    Raises
    ------
    InputError
        When no parameter path is given.

    References
    ----------
    .. [1] Brent, R. P. (1973). Algorithms for Minimization without Derivatives, ch. 4.
       Prentice-Hall (the root finder behind scipy.optimize.brentq).
    """
    if not parameters:
        raise InputError("headroom", "--parameter", "at least one parameter path")
    assessment = assessment_or_default(assessment)
    project, _ = load_project(project_file, assessment.project_overrides)
    series = project_series(project, project_file)
    return [
        headroom_of(project, assessment, path, scheme, tier, source=str(project_file), series=series)
        for path in parameters
    ]


def sensitivity(
    project_file: str | Path,
    *,
    distributions: str | Path | None = None,
    scheme: str | None = None,
    base_sample: int = 1024,
    seed: int = DEFAULT_SEED,
    assessment: Assessment | None = None,
    swing: float = SWING_PERCENT,
) -> Sensitivity:
    """Which inputs decide the result: Sobol indices, a percentile tornado and a one-at-a-time swing.

    Sobol first- and total-order indices (SALib) and a 10th/90th percentile tornado of the total, or of
    ``scheme``'s value, over the project's uncertain inputs (stated, or the defaults of the factor rows), and
    the one-at-a-time move of every factor and numeric parameter by -``swing`` % and +``swing`` %.

    Parameters
    ----------
    project_file : str or Path
        The project TOML file.
    distributions : str, Path or None
        A distributions TOML laid over the project's own ``[uncertainty]`` table.
    scheme : str or None
        The scheme id whose value is analysed; None: the total (kg CO2e per functional unit).
    base_sample : int
        N of the Sobol sample, a power of 2 (evaluations: N x (inputs + 2)).
    seed : int
        Seed of the scrambled Sobol sample and of the indices' bootstrap (the same seed gives the same indices).
    assessment : Assessment or None
        The run's options (factor set, GWP100 set, schemes (replaced by ``scheme`` when it is given), overrides,
        boundary, assessment year); None: the
        defaults (``api.scoring.assessment_or_default``).
    swing : float
        The one-at-a-time move of each input, per cent of its own value.

    Returns
    -------
    Sensitivity
        The Sobol indices (dimensionless), the tornado bars and the swings (in the figure's unit).

    References
    ----------
    .. [1] Sobol', I. M. (2001). Global sensitivity indices for nonlinear mathematical models and
       their Monte Carlo estimates. Mathematics and Computers in Simulation 55, 271-280.
    .. [2] Saltelli, A. et al. (2010). Variance based sensitivity analysis of model output. Design
       and estimator for the total sensitivity index. Computer Physics Communications 181, 259-270.
    .. [3] Herman, J. and Usher, W. (2017). SALib: An open-source Python library for sensitivity
       analysis. Journal of Open Source Software 2(9), 97.
    """
    assessment = assessment_or_default(assessment)
    found = load_uncertainty(project_file, distributions)
    project, _ = load_project(project_file, assessment.project_overrides)
    return sensitivity_of(
        project,
        assessment,
        found,
        scheme=scheme,
        base_sample=base_sample,
        seed=seed,
        source=str(project_file),
        series=project_series(project, project_file),
        swing_percent=swing,
    )


def analysis_record(
    kind: str,
    project_file: str | Path,
    summary: dict,
    assessment: Assessment | None = None,
) -> LedgerRecord:
    """The run-ledger record of an analysis of one project.

    The project as read (its sha256 and parameters), the factor set and the rows the project reads, and
    the analysis's own ``summary``.

    Parameters
    ----------
    kind : str
        The analysis: ``sensitivity`` or ``headroom``.
    project_file : str or Path
        The project TOML file analysed.
    summary : dict
        The analysis's summary for the ledger (``Sensitivity.summary_for_ledger()``, ``headroom_summary``).
    assessment : Assessment or None
        The run's options (factor set, GWP100 set, schemes the analysis looked at, overrides, boundary, assessment
        year); None: the
        defaults (``api.scoring.assessment_or_default``).

    Returns
    -------
    LedgerRecord
        The record, not yet written.
    """
    assessment = assessment_or_default(assessment)
    factor_set = assessment.factor_set
    project, sha = load_project(project_file, assessment.project_overrides)
    used = factors_used(project, assessment, str(project_file))
    return LedgerRecord(
        project_path=str(Path(project_file).resolve()),
        project_name=project.project.name,
        project_sha256=sha,
        factor_set=factor_set.name,
        factor_set_sha256=factor_set.sha256,
        schemes=list(assessment.schemes or []),
        boundary=project.project.boundary,
        gwp=assessment.gwp,
        results=summary,
        parameters=project.model_dump(),
        factors_used=[factor_row(row) for _, row in sorted(used.items())],
        kind=kind,
    )


def headroom_record(
    results: list[Headroom], project_file: str | Path, assessment: Assessment | None = None
) -> LedgerRecord:
    """The run-ledger record of a headroom search.

    Parameters
    ----------
    results : list of Headroom
        What ``headroom`` returned (one scheme; at least one parameter).
    project_file : str or Path
        The project TOML file searched.
    assessment : Assessment or None
        The assessment given to ``headroom`` (its schemes are replaced by the one searched).

    Returns
    -------
    LedgerRecord
        The record of kind ``headroom``, not yet written.
    """
    return analysis_record(
        "headroom",
        project_file,
        headroom_summary(results),
        assessment_or_default(assessment).but(schemes=(results[0].scheme,)),
    )


def uncertainty_one(task: tuple) -> UncertaintyResult:
    """One project's Monte Carlo from plain arguments (what a Dask worker runs).

    Parameters
    ----------
    task : tuple
        (project file path, dict of the keyword arguments of ``uncertainty``).

    Returns
    -------
    UncertaintyResult
        The project's Monte Carlo, as ``uncertainty`` gives it.
    """
    path, options = task
    return uncertainty(path, **options)


def uncertainty_many(
    paths: list[str | Path],
    *,
    distributions: str | Path | None = None,
    draws: int = DEFAULT_DRAWS,
    seed: int = DEFAULT_SEED,
    sampling: str | None = None,
    assessment: Assessment | None = None,
    workers: int | None = None,
    scheduler: str | None = None,
) -> list[UncertaintyResult]:
    """Monte Carlo of every project of a portfolio (files or folders), each with its own ``[uncertainty]`` table.

    Every project gets ``distributions`` laid over its own table and the same seed; on a Dask cluster with
    ``workers`` or ``scheduler``, with the same numbers as in one process. Every bad input is found before
    any work starts.

    Parameters
    ----------
    paths : list of str or Path
        Project TOML files, or folders of them.
    distributions : str, Path or None
        A distributions TOML laid over every project's own ``[uncertainty]`` table.
    draws : int
        Number of draws of each project.
    seed : int
        Seed of the random numbers, the same for every project.
    sampling : str or None
        ``random`` or ``latin_hypercube``; default the distributions' own (random).
    assessment : Assessment or None
        The run's options (factor set, GWP100 set, schemes (whose probability of qualifying is estimated), overrides,
        boundary, assessment year); None: the
        defaults (``api.scoring.assessment_or_default``).
    workers : int or None
        Run on a local Dask cluster of this many worker processes.
    scheduler : str or None
        Run on an existing Dask scheduler at this address instead.

    Returns
    -------
    list of UncertaintyResult
        One per project file, in the order of the files found.

    References
    ----------
    .. [1] McKay, M. D., Beckman, R. J. and Conover, W. J. (1979). A comparison of three methods
       for selecting values of input variables in the analysis of output from a computer code.
       Technometrics 21(2), 239-245 (Latin hypercube sampling).
    .. [2] Iman, R. L. and Conover, W. J. (1982). A distribution-free approach to inducing rank
       correlation among input variables. Communications in Statistics B 11(3), 311-334.
    """
    files = project_files(paths)
    options = {
        "distributions": distributions,
        "draws": draws,
        "seed": seed,
        "sampling": sampling,
        "assessment": assessment_or_default(assessment),
    }
    for path in files:  # every bad input is found before any work starts
        load_uncertainty(path, distributions)
    tasks = [(str(path), options) for path in files]
    with dask_mapper(workers, scheduler) as (mapper, _):
        return list((mapper or map)(uncertainty_one, tasks))
