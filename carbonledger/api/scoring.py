"""Scoring one project file: what `carbonledger score` calls (kept small, so the command starts fast)."""

from __future__ import annotations

from pathlib import Path

from ..analyses.pipeline import assess, read
from ..core.assessment import Assessment
from ..core.results import ScoreResult
from ..core.scoring import DEFAULT_GWP, shipped_rulebooks
from ..model.factors import DEFAULT_SET, FactorSet, load_factor_set
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
    project_file : str or Path
        Path of the project TOML.
    factors : str, Path or FactorSet
        Factor set name, set folder, override CSV, or a loaded ``FactorSet``.
    gwp : str
        GWP100 set of the headline result (``ar4``, ``ar5``, ``ar6``); each scheme check uses its own.
    schemes : list of str or None
        Scheme ids to check; default all that apply to the product.
    overrides : list of str or None
        ``dotted.parameter=value`` strings applied to the project before validation;
        ``electricity.sources.NAME.share=rest`` (``--rebalance NAME``) gives that source 1 less the
        other sources' shares after the others are set (refused when that is not from 0 to 1).
    boundary : str or None
        ``cradle-to-gate``, ``well-to-tank`` or ``well-to-wake``; default the project's own.
    year : int or None
        The assessment year (calendar year), on whose dates the scheme rules are read; default the first full
        calendar year of operation after the project's commissioning date, else this year.
    matching : str or None
        With an electricity time series, a granularity (``interval``, ``hour``, ``month``, ``quarter``, ``year``)
        that replaces every scheme's temporal rule (a what-if); ``declared``: ignore the series and score the
        declared annual shares (what the audit workbook holds); None: each scheme's rule.
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
    assessment = Assessment(factor_set_of(factors), gwp, tuple(schemes) if schemes else None, tuple(overrides or ()), boundary, year, matching)
    return assess_file(assessment, project_file, matched_periods)


def assess_file(assessment: Assessment, project_file: str | Path, matched_periods: dict | None = None) -> ScoreResult:
    """Score a project file under an assessment's options (``analyses.pipeline``: read, prepare, solve,
    judge, match its series), stating any share that took up the difference to 1 (``--rebalance``).

    Parameters
    ----------
    assessment : Assessment
        The run's options, built once (``Assessment(load_factor_set("default-2026"), gwp="ar6", year=2030)``).
    project_file : str or Path
        The project TOML file.
    matched_periods : dict or None
        Without a series in the file: electricity source name -> the finest period it is shown matched.

    Returns
    -------
    ScoreResult
        The result with its scheme checks.
    """
    project, sha, series = read(assessment, project_file)
    result = assess(assessment, project, source=str(project_file), project_sha256=sha, series=series, matched_periods=matched_periods)
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
    return result.model_copy(update={"rebalanced_shares": {name: project.electricity.sources[name].share for name in names}})


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
