"""Scoring one project file: what `carbonledger score` calls (kept small, so the command starts fast)."""

from __future__ import annotations

from pathlib import Path

from ..analyses.pipeline import assess, read
from ..core.assessment import Assessment
from ..core.results import ScoreResult
from ..core.scoring import shipped_rulebooks
from ..model.factors import DEFAULT_SET, FactorSet, factors_root, load_factor_set
from ..model.project import rebalanced_sources
from ..model.rulebooks import load_user_rulebooks


def factor_set_of(factors: str | Path | FactorSet) -> FactorSet:
    """A loaded factor set as it is, else the set a name, folder or override CSV gives.

    Parameters
    ----------
    factors : str, Path or FactorSet
        Factor set name (``default-2026``), set folder, override CSV, or a loaded ``FactorSet``.

    Returns
    -------
    FactorSet
        The factor set, loaded and validated (``model.factors.load_factor_set``).
    """
    return factors if isinstance(factors, FactorSet) else load_factor_set(factors)


def requested_as(factor_set: FactorSet) -> str:
    """The ``--factors`` a loaded set answers to: its last layer when that lies outside the factor library
    (an override CSV or a set folder of the user's, as given), else the set's name.

    Parameters
    ----------
    factor_set : FactorSet
        A loaded factor set (``FactorSet.layers`` lists the folders and CSV files it was read from).

    Returns
    -------
    str
        The path of the user's layer, or the name of a shipped set.
    """
    last = Path(factor_set.layers[-1]) if factor_set.layers else None
    if last is None or factors_root().resolve() in last.resolve().parents:
        return factor_set.name
    return str(last)


def assessment_or_default(assessment: Assessment | None) -> Assessment:
    """The assessment given, else the default one: the default factor set, GWP100 of AR6, every scheme
    that applies, each project's own boundary and assessment year.

    Parameters
    ----------
    assessment : Assessment or None
        The run's options, built once; None for the defaults.

    Returns
    -------
    Assessment
        The options every api function reads (``core.assessment.Assessment``).
    """
    return assessment if assessment is not None else Assessment(load_factor_set(DEFAULT_SET))


def score(
    project_file: str | Path, assessment: Assessment | None = None, *, matched_periods: dict | None = None
) -> ScoreResult:
    """Score a project file under an assessment's options: carbon intensity, by stage and gas, with scheme checks
    (``analyses.pipeline``: read, prepare, solve, judge, match its series), stating any share that took up
    the difference to 1 (``--rebalance``).

    Build the options once and pass them to every call::

        assessment = api.Assessment(api.load_factor_set("default-2026"), gwp="ar5", year=2030)
        result = api.score("project.toml", assessment)

    Parameters
    ----------
    project_file : str or Path
        Path of the project TOML.
    assessment : Assessment or None
        The run's options (factor set, GWP100 set of the headline result, schemes, ``dotted.parameter=value``
        overrides, boundary, assessment year, matching); None: the default factor set, AR6, every scheme that
        applies, the project's own boundary and year, each scheme's temporal rule. An override
        ``electricity.sources.NAME.share=rest`` (``--rebalance NAME``) gives that source 1 less the other
        sources' shares after the others are set (refused when that is not from 0 to 1).
    matched_periods : dict or None
        Electricity source name -> finest period a time series shows it matched (``hourly``, ``half_hourly``),
        for projects without a series in the file; without it (and without a series) hourly rules are
        undetermined.

    Returns
    -------
    ScoreResult
        Total per functional unit (kg CO2e/t NH3 or kg CO2e/kg H2), intensities (kg CO2e/t NH3, kg CO2e/kg H2,
        g CO2e/MJ LHV), by stage and by gas, with one check per scheme; a screening estimate, not a certification.
    """
    assessment = assessment_or_default(assessment)
    project, sha, series = read(assessment, project_file)
    result = assess(
        assessment,
        project,
        source=str(project_file),
        project_sha256=sha,
        series=series,
        matched_periods=matched_periods,
    )
    return stating_rebalance(result, project, list(assessment.overrides))


def stating_rebalance(result: ScoreResult, project, overrides: list[str] | None) -> ScoreResult:
    """The result stating each electricity share that took up the difference to 1 (``--rebalance``).

    Parameters
    ----------
    result : ScoreResult
        The scored result.
    project : Project
        The validated project it was scored from (the rebalanced shares are read from it).
    overrides : list of str or None
        The run's overrides; ``electricity.sources.NAME.share=rest`` names a rebalanced source.

    Returns
    -------
    ScoreResult
        The result as it is when no share was rebalanced, else a copy with ``rebalanced_shares``
        (source name -> share, a fraction of the electricity from 0 to 1).
    """
    names = rebalanced_sources(overrides)
    if not names:
        return result
    return result.model_copy(
        update={"rebalanced_shares": {name: project.electricity.sources[name].share for name in names}}
    )


def user_rulebooks(paths: list[str | Path]):
    """The user's own rulebooks (TOML files in the format of ``factors/schemes``), validated.

    Use them with ``using_rulebooks``::

        with api.using_rulebooks(api.user_rulebooks(["offtake_contract.toml"])):
            result = api.score("project.toml")  # the contract's check beside the shipped schemes

    Parameters
    ----------
    paths : list of str or Path
        The rulebook TOML files.

    Returns
    -------
    dict of str to Scheme
        The validated rulebooks, by scheme id (an id of a shipped rulebook is refused).
    """
    return load_user_rulebooks(paths, shipped_rulebooks())
