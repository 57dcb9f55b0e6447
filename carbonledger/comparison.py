"""Compare projects side by side on one boundary and one basis.

``compare`` scores each project file with ``api.score_project`` (same boundary, GWP set,
factor set and schemes for all) and puts the results on a common basis: per t NH3 when every
functional unit is ammonia, per kg H2 when every one is hydrogen, else per MJ (LHV) of the
delivered product. A basis that a project cannot be put on (per t NH3 for a hydrogen project),
or projects left on different boundaries, are refused with one line saying why.
"""

from __future__ import annotations

from pathlib import Path
from typing import Any

from pydantic import BaseModel, PrivateAttr

from . import CAUTION
from .errors import InputError
from .results import Check

BASES = {
    "t-nh3": ("kg_co2e_per_t_nh3", "kg CO2e/t NH3"),
    "kg-h2": ("kg_co2e_per_kg_h2", "kg CO2e/kg H2"),
    "mj": ("g_co2e_per_mj", "g CO2e/MJ (LHV)"),
}
_BASIS_OF_PRODUCT = {"ammonia": "t-nh3", "hydrogen": "kg-h2"}


class ComparedProject(BaseModel):
    project: str
    project_file: str
    product: str
    reference_product: str
    functional_unit: str
    total: float  # kg CO2e per the project's own functional unit
    unit: str  # unit of total
    value: float  # on the common basis
    by_stage: dict[str, float]  # on the common basis; sums to value
    by_gas: dict[str, float]  # on the common basis; sums to value
    non_ghg_kg: dict[str, float]  # kg per the project's own functional unit
    intensity: dict[str, float | None]
    checks: list[Check]


class ComparisonResult(BaseModel):
    caution: str
    boundary: str
    gwp_basis: str
    factor_set: str
    factor_set_sha256: str
    basis: str  # t-nh3, kg-h2 or mj
    quantity: str  # intensity key of the basis
    unit: str
    stages: list[str]  # every stage met, in chain order
    projects: list[ComparedProject]
    _scores: list = PrivateAttr(default_factory=list)  # the full ScoreResult of each project (for the run ledger)

    @property
    def scores(self) -> list:
        return self._scores

    def to_json(self) -> str:
        return self.model_dump_json(indent=2)


def common_basis(reference_products: list[str], requested: str = "auto") -> str:
    """The basis all projects share: 'auto' picks the product's own unit when all agree, else MJ."""
    if requested == "auto":
        kinds = set(reference_products)
        return _BASIS_OF_PRODUCT[kinds.pop()] if len(kinds) == 1 else "mj"
    if requested not in BASES:
        raise InputError("--basis", requested, f"one of auto, {', '.join(BASES)}")
    return requested


def compare(
    project_files: list[str | Path],
    *,
    boundary: str | None = None,
    gwp: str = "ar6",
    factors: Any = "default-2026",
    schemes: list[str] | None = None,
    basis: str = "auto",
) -> ComparisonResult:
    """Score several projects with the same options and put them on one basis.

    Parameters
    ----------
    project_files : two or more project TOML paths or audit workbooks (.xlsx) (one is allowed).
    boundary : applied to every project; default each project's own (they must then agree).
    gwp, factors, schemes : as for ``score``.
    basis : 'auto', 't-nh3', 'kg-h2' or 'mj' (LHV of the delivered product).
    """
    from .api import score_project
    from .factors import FactorSet, load_factor_set
    from .inventory import STAGES

    if not project_files:
        raise InputError("compare", "PROJECTS", "at least one project file")
    factor_set = factors if isinstance(factors, FactorSet) else load_factor_set(factors)
    results = []
    for path in project_files:
        project, sha, project_set = _load(path, factor_set)
        result = score_project(project, project_set, gwp=gwp, source=str(path), project_sha256=sha, boundary=boundary)
        result.checks = [c for c in result.checks if not schemes or c.scheme in _known_schemes(schemes)]
        results.append(result)
    boundaries = {r.boundary for r in results}
    if len(boundaries) > 1:
        listed = ", ".join(f"{r.project_file}: {r.boundary}" for r in results)
        raise InputError("compare", "boundary", f"one boundary for all projects, got {listed}; pass --boundary")
    chosen = common_basis([r.reference_product for r in results], basis)
    quantity, unit = BASES[chosen]
    compared = []
    for r in results:
        scale = _scale(r, quantity)
        if scale is None:
            raise InputError(r.project_file, "--basis", f"a basis its functional unit ({r.functional_unit}) can be put on; {chosen} does not apply to {r.reference_product} (use mj or kg-h2)")
        compared.append(
            ComparedProject(
                project=r.project,
                project_file=r.project_file,
                product=r.product,
                reference_product=r.reference_product,
                functional_unit=r.functional_unit,
                total=r.total,
                unit=r.unit,
                value=r.total * scale,
                by_stage={k: v * scale for k, v in r.by_stage.items()},
                by_gas={k: v * scale for k, v in r.by_gas.items()},
                non_ghg_kg=r.non_ghg_kg,
                intensity=r.intensity.model_dump(),
                checks=r.checks,
            )
        )
    met = {stage for r in results for stage in r.by_stage}
    comparison = ComparisonResult(
        caution=CAUTION,
        boundary=results[0].boundary,
        gwp_basis=gwp,
        factor_set=factor_set.name,
        factor_set_sha256=factor_set.sha256,
        basis=chosen,
        quantity=quantity,
        unit=unit,
        stages=[stage for stage in STAGES if stage in met],
        projects=compared,
    )
    comparison._scores = results
    return comparison


def _load(path, factor_set):
    """A project file, or the inputs of an audit workbook (.xlsx) with its edited factors layered on."""
    from .project import load_project

    if str(path).lower().endswith(".xlsx"):
        from .workbook_inputs import factor_set_from_workbook, load_project_from_workbook

        project, sha, _ = load_project_from_workbook(path)
        return project, sha, factor_set_from_workbook(path, factor_set)
    project, sha = load_project(path)
    return project, sha, factor_set


def _known_schemes(requested: list[str]) -> list[str]:
    """Requested scheme ids, each checked to exist; a scheme that does not fit a project's
    product reads 'n/a' for that project."""
    from .api import _schemes

    known = _schemes()
    for scheme_id in requested:
        if scheme_id not in known:
            raise InputError("--scheme", scheme_id, f"one of {', '.join(known)}")
    return requested


def _scale(result, quantity: str) -> float | None:
    """Factor from the project's functional unit to the basis (the intensities are linear)."""
    from .api import intensities
    from .reference import molar_mass
    from .stages.ammonia import hydrogen_mass_fraction_of_ammonia

    lhv = result.heating_values_mj_per_kg
    fraction = hydrogen_mass_fraction_of_ammonia(molar_mass("H2").value, molar_mass("NH3").value)
    return intensities(1.0, result.reference_product, lhv["hydrogen_lhv"], lhv.get("ammonia_lhv", float("nan")), fraction)[quantity]
