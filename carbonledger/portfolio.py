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

from dataclasses import dataclass, field, replace
from pathlib import Path

import numpy as np

from .errors import InputError
from .factors import FactorSet, diff_sets
from .project import Project, load_project

STATUSES = ("newly fails", "newly passes", "still fails", "still passes")


@dataclass(frozen=True)
class PortfolioProject:
    """One validated project file of a portfolio."""

    path: str
    project: Project
    sha256: str


@dataclass
class QuickScore:
    """The figures a portfolio run needs for one project under one factor set."""

    project_file: str
    project_name: str
    project_sha256: str
    product: str
    boundary: str
    gwp: str
    factor_set_name: str
    factor_set_sha256: str
    unit: str
    total: float
    intensity: dict
    by_stage: dict
    checks: list  # results.Check
    factors_used: tuple[str, ...]
    parameters: dict = field(repr=False, default_factory=dict)
    hydrogen_kg_per_unit: float = 1.0  # kg H2 produced per functional unit
    used: dict = field(repr=False, default_factory=dict)  # factor id -> Factor or ReferenceValue

    def summary(self) -> dict:
        """The compact result stored in the run ledger (same shape as for ``score``)."""
        return results_summary(self.total, self.unit, self.intensity, self.by_stage, self.checks)


def results_summary(total, unit, intensity, by_stage, checks) -> dict:
    return {
        "total": total,
        "unit": unit,
        "intensity": dict(intensity),
        "by_stage": dict(by_stage),
        "checks": [
            {"scheme": c.scheme, "value": c.value, "unit": c.unit, "limit": c.limit, "passes": c.passes, "tier": c.tier}
            for c in checks
        ],
    }


def project_files(paths: list[str | Path]) -> list[Path]:
    """Project TOML files named directly, or found (``*.toml``, not recursive) in folders."""
    found: list[Path] = []
    for item in paths:
        path = Path(item)
        if path.is_dir():
            files = sorted(p for p in path.glob("*.toml") if p.is_file())
            if not files:
                raise InputError(path, "", "a folder holding project .toml files (none found)")
            found += files
        elif path.is_file():
            found.append(path)
        else:
            raise InputError(path, "", "a project .toml file or a folder of them (not found)")
    unique: dict[Path, Path] = {}
    for path in found:
        unique.setdefault(path.resolve(), path)
    return list(unique.values())


def load_portfolio(paths: list[str | Path]) -> list[PortfolioProject]:
    """Read and validate every project once."""
    projects = []
    for path in project_files(paths):
        project, sha = load_project(path)
        projects.append(PortfolioProject(str(path), project, sha))
    return projects


def _check_schemes(requested: list[str] | None) -> None:
    from .api import _schemes

    known = _schemes()
    for scheme_id in requested or []:
        if scheme_id not in known:
            raise InputError("--scheme", scheme_id, f"one of {', '.join(known)}")


def score_many(
    projects: list[PortfolioProject],
    factor_set: FactorSet | list[FactorSet],
    *,
    gwp: str = "ar6",
    schemes: list[str] | None = None,
    check_with_bw2calc: bool = True,
) -> list[QuickScore]:
    """Score many validated projects under one factor set, solving shared structures together.

    ``factor_set`` may also be a list with one set per project (e.g. one per operating year).

    ``schemes`` limits the checks to those ids (each project keeps the ones that apply to its
    product). With ``check_with_bw2calc`` one project of every structure group is also solved
    with bw2calc and must agree to 1e-9 (relative).
    """
    from .api import FUNCTIONAL_UNITS, intensities, prepare, scheme_checks
    from .engine import solve, solve_many, structure_key
    from .inventory import STAGES

    _check_schemes(schemes)
    sets = factor_set if isinstance(factor_set, list) else [factor_set] * len(projects)
    prepared = []
    for item, one_set in zip(projects, sets):
        ready = prepare(item.project, one_set, gwp=gwp, source=item.path)
        if schemes:
            ready.chosen = [s for s in ready.chosen if s.id in schemes]
        prepared.append(ready)
    groups: dict[tuple, list[int]] = {}
    for number, ready in enumerate(prepared):
        groups.setdefault(structure_key(ready.matrices, ready.demands), []).append(number)
    solutions: list[dict | None] = [None] * len(prepared)
    for members in groups.values():
        solved = solve_many([prepared[n].matrices for n in members], prepared[members[0]].demands)
        for number, solution in zip(members, solved):
            solutions[number] = solution
        if check_with_bw2calc:
            reference = prepared[members[0]]
            _, bw_score = solve(reference.matrices, reference.demands, reference.headline)
            fast = float(solutions[members[0]][reference.inventory.reference].contributions(reference.headline).sum())
            if not np.isclose(fast, bw_score, rtol=1e-9, atol=1e-12):
                raise RuntimeError(f"stacked solve disagrees with bw2calc for {projects[members[0]].path}: {fast} vs {bw_score}")

    scores = []
    for item, ready, solution, one_set in zip(projects, prepared, solutions, sets):
        inventory = ready.inventory
        contributions = solution[inventory.reference].contributions(ready.headline)
        total = float(contributions.sum())
        by_stage = {stage: 0.0 for stage in STAGES if any(a.stage == stage for a in inventory.activities.values())}
        for key, value in zip(ready.matrices.activity_keys, contributions.sum(axis=0)):
            by_stage[inventory.activities[key].stage] += float(value)
        every = intensities(total, inventory.reference_product, ready.hydrogen_lhv, ready.ammonia_lhv, ready.fraction)
        scores.append(
            QuickScore(
                project_file=item.path,
                project_name=item.project.project.name,
                project_sha256=item.sha256,
                product=inventory.product,
                boundary=ready.params["project"]["boundary"],
                gwp=gwp,
                factor_set_name=one_set.name,
                factor_set_sha256=one_set.sha256,
                unit=FUNCTIONAL_UNITS[inventory.reference_product][1],
                total=total,
                intensity={k: every[k] for k in ("kg_co2e_per_t_nh3", "kg_co2e_per_kg_h2", "g_co2e_per_mj")},
                by_stage=by_stage,
                checks=scheme_checks(ready, solution),
                factors_used=tuple(sorted(ready.inputs.used)),
                used=ready.inputs.used,
                parameters=ready.params,
                hydrogen_kg_per_unit=float(solution[inventory.reference].supply[ready.matrices.activity_keys.index(inventory.hydrogen)]),
            )
        )
    return scores


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


@dataclass
class Recalc:
    old_set: str
    old_sha256: str
    new_set: str
    new_sha256: str
    changed_factors: list[str]
    rows: list[RecalcRow]
    old_scores: list[QuickScore]
    new_scores: list[QuickScore]
    rescored: int = 0  # projects that use a changed factor (the others kept their old result)

    @property
    def newly_failing(self) -> list[RecalcRow]:
        return [row for row in self.rows if row.status == "newly fails"]


def status_of(old_passes: bool, new_passes: bool) -> str:
    if old_passes and not new_passes:
        return "newly fails"
    if new_passes and not old_passes:
        return "newly passes"
    return "still passes" if new_passes else "still fails"


def recalc(
    projects: list[PortfolioProject],
    old_set: FactorSet,
    new_set: FactorSet,
    *,
    gwp: str = "ar6",
    schemes: list[str] | None = None,
) -> Recalc:
    """Rescore a portfolio under a new factor set; one row per project and scheme.

    Rows come newly failing first, then newly passing, then the rest in project order.
    """
    old_scores = score_many(projects, old_set, gwp=gwp, schemes=schemes)
    changed = sorted({change.id for change in diff_sets(old_set, new_set)})
    changed_ids = set(changed)
    to_rescore = [n for n, score in enumerate(old_scores) if changed_ids.intersection(score.factors_used)]
    rescored = score_many([projects[n] for n in to_rescore], new_set, gwp=gwp, schemes=schemes) if to_rescore else []
    new_scores = [replace(score, factor_set_name=new_set.name, factor_set_sha256=new_set.sha256) for score in old_scores]
    for number, score in zip(to_rescore, rescored):
        new_scores[number] = score
    rescored_numbers = set(to_rescore)
    rows = []
    for number, (old, new) in enumerate(zip(old_scores, new_scores)):
        new_checks = {check.scheme: check for check in new.checks}
        for check in old.checks:
            after = new_checks[check.scheme]
            rows.append(
                RecalcRow(
                    project_file=old.project_file,
                    project=old.project_name,
                    scheme=check.scheme,
                    unit=check.unit,
                    limit=check.limit,
                    old_value=check.value,
                    new_value=after.value,
                    change=after.value - check.value,
                    old_passes=check.passes,
                    new_passes=after.passes,
                    status=status_of(check.passes, after.passes),
                    rescored=number in rescored_numbers,
                )
            )
    order = {"newly fails": 0, "newly passes": 1}
    rows.sort(key=lambda row: order.get(row.status, 2))  # stable: project order kept within each group
    return Recalc(old_set.name, old_set.sha256, new_set.name, new_set.sha256, changed, rows, old_scores, new_scores, len(to_rescore))
