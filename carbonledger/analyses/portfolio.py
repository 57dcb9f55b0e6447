"""Portfolios: score many projects at once, and recalculate them when the factors change.

``recalc`` is a pure function of (projects, old factor set, new factor set, options). It reuses
what does not change between the two runs:

- each project file is read and validated once, for both sets;
- parsed factor sets are cached by ``factors.load_factor_set``;
- a project none of whose factors changed (``factors.diff_sets``) keeps its old result, since
  every factor value that reaches its inventory, its characterisation and its physical checks
  is recorded in ``inputs.used``;
- the projects that must be rescored are grouped by matrix structure and each group is solved
  in one stacked call (``engine.solve_many``); one member of every group is also solved with
  bw2calc, the reference, and the two must agree to 1e-9.

References
----------
.. [1] Heijungs, R. and Suh, S. (2002). The Computational Structure of Life Cycle Assessment.
"""

from __future__ import annotations

import contextlib
import gc
import os
from dataclasses import dataclass, field
from pathlib import Path

from ..core.assessment import Assessment
from ..core.results import FactorSetRef, ResultFigures, ScoreResult
from ..core.scoring import DEFAULT_GWP, Prepared, co_product_rule, project_params, rulebooks
from ..core.stacked import BLOCK_MEMBERS, Member, group_figures, shape_of
from ..errors import InputError
from ..model.factors import FactorSet, diff_sets
from ..model.rulebooks import scheme_ids
from ..model.statuses import Status
from ..routes.project import load_project
from .electricity_series import project_series
from .pipeline import PortfolioProject, assess_prepared, figures_prepared, prepare_many

STATUSES = (
    "now fails",
    "now qualifies",
    "now undetermined",
    "now not eligible",
    "still fails",
    "still qualifies",
    "still not eligible",
    "still undetermined",
)  # how a check moved


def project_files(paths: list[str | Path]) -> list[Path]:
    """Project TOML files named directly, or found (``*.toml``, not recursive) in folders; a file
    named twice (directly, through its folder or through a link) is read once."""
    unique: dict[str, Path] = {}
    for item in paths:
        path = Path(item)
        if path.is_dir():
            files = folder_projects(path)
            if not files:
                raise InputError(path, "", "a folder holding project .toml files (none found)")
            for real, found in files:
                unique.setdefault(real, found)
        elif path.is_file():
            unique.setdefault(os.path.realpath(path), path)
        else:
            raise InputError(path, "", "a project .toml file or a folder of them (not found)")
    return list(unique.values())


def folder_projects(folder: Path) -> list[tuple[str, Path]]:
    """(real path, path) of the ``*.toml`` regular files of a folder, sorted by name: one directory
    scan, the folder's real path found once and a link's only for a link."""
    real_folder = os.path.realpath(folder)
    with os.scandir(folder) as entries:
        found = sorted(
            (entry.name, entry.is_symlink()) for entry in entries if entry.name.endswith(".toml") and entry.is_file()
        )
    return [
        (os.path.realpath(folder / name) if link else os.path.join(real_folder, name), folder / name)
        for name, link in found
    ]


def load_portfolio(paths: list[str | Path]) -> list[PortfolioProject]:
    """Read and validate every project once (the cyclic collector paused: reading makes many small objects)."""
    projects = []
    with collector_paused():
        for path in project_files(paths):
            project, sha = load_project(path)
            series = project_series(project, path)
            projects.append(PortfolioProject(str(path), project, sha, series))
    return projects


CHUNK_PROJECTS = 500  # projects prepared, solved and assembled at a time: what is held besides the results


@contextlib.contextmanager
def collector_paused():
    """Pause Python's cyclic garbage collector while a portfolio is scored: scoring allocates many
    small acyclic objects (freed by reference counting), and the collector's full passes over the
    growing list of results cost a quarter of the time. It runs again (and collects) afterwards."""
    was_enabled = gc.isenabled()
    gc.disable()
    try:
        yield
    finally:
        if was_enabled:
            gc.enable()


def prepare_projects(
    projects: list[PortfolioProject], assessments: list[Assessment], schemes: list[str] | None
) -> list[Prepared]:
    """Each project made ready to solve under its own assessment (its factor set and year), its checks
    limited to ``schemes`` (validated ids; each project keeps those that apply to its product)."""
    prepared = prepare_many(assessments, projects)
    if schemes:
        for ready in prepared:
            ready.chosen = [s for s in ready.chosen if s.id in schemes]
    return prepared


def assessments_of(sets: list[FactorSet], years: list, gwp: str) -> list[Assessment]:
    """One assessment per project from its factor set and year, made once per set and year (its options are
    checked once)."""
    made: dict[tuple, Assessment] = {}
    for one_set, one_year in zip(sets, years, strict=True):
        if (id(one_set), one_year) not in made:
            made[(id(one_set), one_year)] = Assessment(one_set, gwp, year=one_year)
    return [made[(id(one_set), one_year)] for one_set, one_year in zip(sets, years, strict=True)]


def score_portfolio(
    projects: list[PortfolioProject],
    factor_set: FactorSet | list[FactorSet],
    *,
    gwp: str = DEFAULT_GWP,
    schemes: list[str] | None = None,
    check_with_bw2calc: bool = True,
    year: int | list[int] | None = None,
    mapper=None,
    chunks: int = 1,
) -> list[ScoreResult]:
    """Score many validated projects under one factor set, solving shared structures together.

    ``mapper`` (a ``map``-like callable, e.g. ``analyses.cluster.dask_mapper``'s) spreads the
    portfolio over workers in ``chunks`` pieces, each scored as here; the results come back in
    project order and are the same numbers (each system is solved on its own in the stacked solve).

    ``factor_set`` may also be a list with one set per project (e.g. one per operating year).
    ``schemes`` limits the checks to those ids (each project keeps the ones that apply to its
    product); an unknown id is refused. Projects are prepared and solved ``CHUNK_PROJECTS`` at a
    time; each matrix structure is checked against bw2calc once.
    """
    known = rulebooks()
    schemes = scheme_ids(schemes, known) or None
    sets = factor_set if isinstance(factor_set, list) else [factor_set] * len(projects)
    years = year if isinstance(year, list) else [year] * len(projects)  # scheme rules read on each year's dates
    if mapper is not None and len(projects) > 1:
        size = -(-len(projects) // chunks)
        pieces = [
            (projects[n : n + size], sets[n : n + size], gwp, schemes, check_with_bw2calc, years[n : n + size])
            for n in range(0, len(projects), size)
        ]
        return [result for part in mapper(score_chunk, pieces) for result in part]
    results: list[ScoreResult] = []
    checked: set = set()
    with collector_paused():
        for n in range(0, len(projects), CHUNK_PROJECTS):
            part = slice(n, n + CHUNK_PROJECTS)
            prepared = prepare_projects(projects[part], assessments_of(sets[part], years[part], gwp), schemes)
            results += assess_prepared(projects[part], prepared, check_with_bw2calc, checked)
    return results


def score_chunk(piece: tuple) -> list[ScoreResult]:
    """One worker's share of ``score_portfolio``: (projects, factor sets, gwp, schemes, check, years)."""
    projects, sets, gwp, schemes, check, years = piece
    return score_portfolio(projects, list(sets), gwp=gwp, schemes=schemes, check_with_bw2calc=check, year=list(years))


@dataclass
class RecalcRow:
    """One project and scheme: the value under the old and the new set, and what changed."""

    project_file: str
    project: str
    scheme: str
    unit: str
    limit: float
    old_value: float
    new_value: float
    change: float
    old_passes: bool
    new_passes: bool
    status: str  # one of STATUSES
    rescored: bool  # False when none of the project's factors changed and the old result was reused
    rulebook_from_memory: bool = False  # the scheme's rulebook or a threshold was recorded from memory
    factors_from_memory: list[str] = field(default_factory=list)  # ids of the new result's factors recorded from memory
    old_status: str = ""  # the check's verdict status before and after (qualifies, fails, not_eligible, undetermined)
    new_status: str = ""


@dataclass
class Recalc:
    old_set: str
    old_sha256: str
    new_set: str
    new_sha256: str
    changed_factors: list[str]
    rows: list[RecalcRow]
    old_scores: list[ResultFigures]
    new_scores: list[ResultFigures]
    rescored: int = 0  # projects that use a changed factor (the others kept their old result)
    # where the run is being recorded (io.ledger.RunTarget), closed once the output is written
    ledger_run: object = None

    @property
    def from_memory(self) -> dict[str, list[str]]:
        """Ids of the factors and rulebooks behind the new results that were recorded from memory."""
        return {
            "factors": sorted({key for score in self.new_scores for key in score.from_memory["factors"]}),
            "rulebooks": sorted({key for score in self.new_scores for key in score.from_memory["rulebooks"]}),
        }

    @property
    def newly_failing(self) -> list[RecalcRow]:
        return [row for row in self.rows if row.status == "now fails"]


def status_of(old_status: str, new_status: str) -> str:
    """How a check moved: a check whose value met the limit before (qualifies or undetermined) and now
    fails 'now fails'; one that now qualifies 'now qualifies'; another change 'now ...'; no change 'still ...'."""
    if old_status == new_status:
        return f"still {Status(new_status).words}"
    if new_status == Status.FAILS and old_status in (Status.QUALIFIES, Status.UNDETERMINED):
        return "now fails"
    if new_status == Status.FAILS:
        return "still fails"
    return f"now {Status(new_status).words}"


@dataclass
class RecalcPiece:
    """The scores of one piece of a portfolio under the old and the new set (what a worker returns)."""

    old_scores: list[ResultFigures]
    new_scores: list[ResultFigures]
    rescored: list[int]  # positions in the piece of the projects that use a changed factor


def recalc_piece(piece: tuple) -> RecalcPiece:
    """Score a piece (projects, old set, new set, changed factor ids, gwp, schemes, year) under the
    old set, and rescore under the new set only the projects that use a changed factor; the others
    keep their old figures, under the new set's name (``figures_many`` scores each set)."""
    projects, old_set, new_set, changed_ids, gwp, schemes, year = piece
    schemes = scheme_ids(schemes, rulebooks()) or None
    new_ref = FactorSetRef(name=new_set.name, sha256=new_set.sha256)
    checked: set = set()
    with collector_paused():
        shaped = shaped_projects(projects, None)
        old_scores = figures_many(Assessment(old_set, gwp, year=year), projects, schemes, checked, shaped)
        moving = [n for n, score in enumerate(old_scores) if changed_ids.intersection(f.id for f in score.factors_used)]
        new_scores = figures_many(
            Assessment(new_set, gwp, year=year),
            [projects[n] for n in moving],
            schemes,
            checked,
            [shaped[n] for n in moving],
        )
        rescored = dict(zip(moving, new_scores, strict=True))
    new_scores = [rescored.get(n) or score.under(new_ref) for n, score in enumerate(old_scores)]
    return RecalcPiece(old_scores, new_scores, moving)


def shaped_projects(projects: list[PortfolioProject], boundary: str | None) -> list[tuple[dict, tuple] | None]:
    """Each project's parameters under ``boundary`` and its shape (``core.stacked.shape_of``); None for a
    project with a time series (scored alone: its checks follow the series)."""
    shaped: list[tuple[dict, tuple] | None] = []
    for item in projects:
        params = None if item.series is not None else project_params(item.project, boundary)
        shaped.append(None if params is None else (params, shape_of(params)))
    return shaped


MIN_GROUP = 3  # projects of one shape scored as arrays; fewer are scored one by one


def figures_many(
    assessment: Assessment,
    projects: list[PortfolioProject],
    schemes: list[str] | None = None,
    checked: set | None = None,
    shaped: list[tuple[dict, tuple] | None] | None = None,
) -> list[ResultFigures]:
    """The figures of many projects under one assessment, each equal to the project's own score's.

    Projects of one shape (``core.stacked.shape_of``: the same texts, ids and switches, numbers of the same
    sign) are scored as arrays, ``core.stacked.BLOCK_MEMBERS`` at a time: the first alone, the rest with it
    (``core.stacked.group_figures``). A project with a time series, in a group smaller than ``MIN_GROUP``, whose
    scheme's co-product rule differs from its method, or of a route the arrays cannot build, is prepared and
    solved with others of its matrix structure (``pipeline.figures_prepared``), ``CHUNK_PROJECTS`` at a time.

    Parameters
    ----------
    assessment : Assessment
        The factor set, GWP set and year (the schemes are limited by ``schemes``).
    projects : list of PortfolioProject
        The validated projects.
    schemes : list of str or None
        Scheme ids to check (each project keeps those that apply to its product); None for all.
    checked : set or None
        Matrix structures already checked against bw2calc (one member of every new structure is).
    shaped : list or None
        Each project's parameters and shape (``shaped_projects`` under the assessment's boundary), when the
        caller has them (a recalc scores the same projects under two sets).

    Returns
    -------
    list of ResultFigures
        In the order of ``projects``.
    """
    checked = set() if checked is None else checked
    shaped = shaped_projects(projects, assessment.boundary) if shaped is None else shaped
    figures: list = [None] * len(projects)
    shapes: dict[tuple, list[int]] = {}
    for number, one in enumerate(shaped):
        if one is not None:
            shapes.setdefault(one[1], []).append(number)
    for members in (members for members in shapes.values() if len(members) >= MIN_GROUP):
        for start in range(0, len(members), BLOCK_MEMBERS):
            part = members[start : start + BLOCK_MEMBERS]
            ready = prepare_projects([projects[part[0]]], [assessment], schemes)[0]
            figures[part[0]] = figures_prepared([projects[part[0]]], [ready], True, checked)[0]
            if any((rule := co_product_rule(s, ready.params)) is not None and rule.differs for s in ready.chosen):
                break  # only the full result decides such a check: the others of the shape are scored alone
            group = [Member(shaped[n][0], projects[n].path, projects[n].sha256) for n in part]
            grouped = group_figures(ready, figures[part[0]], group)
            if grouped is not None:
                for number, one in zip(part, grouped, strict=True):
                    figures[number] = one
    alone = [number for number, one in enumerate(figures) if one is None]
    for start in range(0, len(alone), CHUNK_PROJECTS):
        part = [projects[n] for n in alone[start : start + CHUNK_PROJECTS]]
        for number, one in zip(
            alone[start : start + CHUNK_PROJECTS],
            figures_prepared(part, prepare_projects(part, [assessment] * len(part), schemes), True, checked),
            strict=True,
        ):
            figures[number] = one
    return figures


def recalc_rows(
    old_scores: list[ResultFigures], new_scores: list[ResultFigures], rescored: set[int]
) -> list[RecalcRow]:
    """One row per project and scheme, in project order: the old and new value and status."""
    rows = []
    for number, (old, new) in enumerate(zip(old_scores, new_scores, strict=True)):
        new_checks = {check.scheme: check for check in new.checks}
        factors_from_memory = new.from_memory["factors"]
        for check in old.checks:
            after = new_checks[check.scheme]
            rows.append(
                RecalcRow(
                    project_file=old.project_file,
                    project=old.project,
                    scheme=check.scheme,
                    unit=check.unit,
                    limit=check.limit,
                    old_value=check.value,
                    new_value=after.value,
                    change=after.value - check.value,
                    old_passes=check.passes,
                    new_passes=after.passes,
                    status=status_of(check.status, after.status),
                    rescored=number in rescored,
                    rulebook_from_memory=after.from_memory,
                    factors_from_memory=list(factors_from_memory),
                    old_status=check.status,
                    new_status=after.status,
                )
            )
    return rows


def recalc(
    projects: list[PortfolioProject],
    old_set: FactorSet,
    new_set: FactorSet,
    *,
    gwp: str = DEFAULT_GWP,
    schemes: list[str] | None = None,
    year: int | None = None,
    mapper=None,
    chunks: int = 1,
    run_piece=recalc_piece,
) -> Recalc:
    """Rescore a portfolio under a new factor set; one row per project and scheme.

    Rows come "now fails" first, then "now qualifies", then the rest in project order.
    ``mapper`` and ``chunks`` spread the pieces over workers (see ``score_portfolio``);
    ``run_piece`` is what each worker runs on its piece (``recalc_piece``, or a function that
    also records the piece's results, see ``api.recalc``).
    """
    changed = sorted({change.id for change in diff_sets(old_set, new_set)})
    size = max(1, -(-len(projects) // max(1, chunks)))
    pieces = [
        (projects[n : n + size], old_set, new_set, frozenset(changed), gwp, schemes, year)
        for n in range(0, len(projects), size)
    ]
    with collector_paused():
        parts = (
            mapper(run_piece, pieces)
            if mapper is not None and len(pieces) > 1
            else [run_piece(piece) for piece in pieces]
        )
        old_scores = [score for part in parts for score in part.old_scores]
        new_scores = [score for part in parts for score in part.new_scores]
        to_rescore = [
            start + n for start, part in zip(range(0, len(projects), size), parts, strict=True) for n in part.rescored
        ]
        rows = recalc_rows(old_scores, new_scores, set(to_rescore))
    order = {"now fails": 0, "now qualifies": 1}
    rows.sort(key=lambda row: order.get(row.status, 2))  # stable: project order kept within each group
    return Recalc(
        old_set.name,
        old_set.sha256,
        new_set.name,
        new_set.sha256,
        changed,
        rows,
        old_scores,
        new_scores,
        len(to_rescore),
    )
