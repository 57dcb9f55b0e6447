"""Compare projects side by side on one boundary and one basis.

``compare`` takes the results of projects scored with the same options (the library API
``carbonledger.api.compare`` scores the files) and puts them on a common basis: per t NH3 when every
functional unit is ammonia, per kg H2 when every one is hydrogen, else per MJ (LHV) of the
delivered product. A basis that a project cannot be put on (per t NH3 for a hydrogen project),
or projects left on different boundaries, are refused with one line saying why.
"""

from __future__ import annotations

from pydantic import BaseModel, PrivateAttr, computed_field

from ..about import CAUTION
from ..core.results import Check, ScoreResult, strict_json
from ..core.scoring import intensities, rulebooks
from ..errors import InputError
from ..model.rulebooks import scheme_ids
from ..routes import STAGES

BASES = {
    "t-nh3": ("kg_co2e_per_t_nh3", "kg CO2e/t NH3"),
    "kg-h2": ("kg_co2e_per_kg_h2", "kg CO2e/kg H2"),
    "mj": ("g_co2e_per_mj", "g CO2e/MJ (LHV)"),
}
_BASIS_OF_PRODUCT = {"ammonia": "t-nh3", "hydrogen": "kg-h2"}


class ThresholdLine(BaseModel):
    """A scheme limit stated in the comparison's unit, for the chart."""

    scheme: str
    tier: str
    limit: float
    label: str


class UncertaintyBand(BaseModel):
    """A project's Monte Carlo on the comparison's basis: the spread of its value and the
    probability of qualifying under each scheme checked (``compare --draws``)."""

    draws: int
    seed: int
    draws_used: int  # draws within every physical limit
    mean: float
    std: float
    p5: float
    p50: float
    p95: float
    inputs: list[str]  # the uncertain inputs drawn
    probability_qualifies: dict[str, float]  # scheme id -> probability
    standard_error: dict[str, float]  # scheme id -> Monte Carlo standard error of that probability


def default_note(spread) -> str:
    """What a band drawn from default distributions rests on (empty for stated distributions)."""
    if spread is None or not spread.default_basis:
        return ""
    named = [item.input for item in spread.inputs if item.default]
    return (
        f"default distributions from the source grades of {len(named)} "
        f"factor rows ({', '.join(named)}): {spread.default_basis}"
    )


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
    factors_from_memory: list[str] = []  # ids of the factors used graded "not yet verified" against their document
    factor_grades: dict[str, list[str]] = {}  # ids of the factors used by source grade (model.grades.grades_of)
    # with --draws: the Monte Carlo band (None: no distributions, see uncertainty_note)
    uncertainty: UncertaintyBand | None = None
    uncertainty_note: str = ""


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
    thresholds: list[ThresholdLine] = []  # scheme limits stated in this comparison's unit
    _scores: list = PrivateAttr(default_factory=list)  # the full ScoreResult of each project (for the run ledger)

    @property
    def scores(self) -> list:
        return self._scores

    @computed_field
    @property
    def from_memory(self) -> dict[str, list[str]]:
        """Ids of the factors used (by any project) not yet verified against their document, and of the rulebooks
        checked recorded from memory."""
        return {
            "factors": sorted({key for project in self.projects for key in project.factors_from_memory}),
            "rulebooks": sorted(
                {check.scheme for project in self.projects for check in project.checks if check.from_memory}
            ),
        }

    def to_json(self) -> str:
        return strict_json(self.model_dump(mode="json"), "compare")


def common_basis(reference_products: list[str], requested: str = "auto") -> str:
    """The basis all projects share: 'auto' picks the product's own unit when all agree, else MJ."""
    if requested == "auto":
        kinds = set(reference_products)
        return _BASIS_OF_PRODUCT[kinds.pop()] if len(kinds) == 1 else "mj"
    if requested not in BASES:
        raise InputError("--basis", requested, f"one of auto, {', '.join(BASES)}")
    return requested


def threshold_lines(results: list[ScoreResult], quantity: str) -> list[ThresholdLine]:
    """Limits of the checked schemes that are stated in the comparison's unit (each tier once)."""
    per_tonne = {"kg_co2e_per_kg_nh3": ("kg_co2e_per_t_nh3", 1000.0)}
    books = rulebooks()
    lines: dict[tuple[str, str], ThresholdLine] = {}
    for result in results:
        for check in result.checks:
            scheme = books[check.scheme]
            scheme_quantity, factor = per_tonne.get(scheme.quantity, (scheme.quantity, 1.0))
            if scheme_quantity != quantity:
                continue
            for threshold in scheme.thresholds:
                limit = threshold.limit * factor
                label = f"{scheme.id}: {threshold.tier} ({'<=' if threshold.inclusive else '<'} {limit:g})"
                lines[(scheme.id, threshold.tier)] = ThresholdLine(
                    scheme=scheme.id, tier=threshold.tier, limit=limit, label=label
                )
    return sorted(lines.values(), key=lambda line: (line.limit, line.label))


def band_of(spread, quantity: str, schemes: list[str] | None) -> UncertaintyBand:
    """The band of a Monte Carlo result (``analyses.uncertainty.UncertaintyResult``) on the basis ``quantity``."""
    summary = spread.intensity.get(quantity)
    checks = [c for c in spread.checks if not schemes or c.scheme in schemes]
    return UncertaintyBand(
        draws=spread.draws,
        seed=spread.seed,
        draws_used=spread.draws_used,
        mean=summary.mean,
        std=summary.std,
        p5=summary.p5,
        p50=summary.p50,
        p95=summary.p95,
        inputs=[item.input for item in spread.inputs],
        probability_qualifies={c.scheme: c.probability_qualifies for c in checks},
        standard_error={c.scheme: c.standard_error for c in checks},
    )


def compare(
    results: list[ScoreResult], *, basis: str = "auto", schemes: list[str] | None = None, spreads: list | None = None
) -> ComparisonResult:
    """Put scored projects (same boundary, GWP set and factor set) on one basis.

    Parameters
    ----------
    results : the ScoreResult of each project, scored with the same options.
    basis : 'auto', 't-nh3', 'kg-h2' or 'mj' (LHV of the delivered product).
    schemes : keep only these scheme ids' checks (each must exist; a scheme that does not fit a
        project's product reads 'n/a' for that project).
    spreads : with a Monte Carlo of each project (``UncertaintyResult``, or a text saying why there
        is none), each project gets its band on the common basis.
    """
    if not results:
        raise InputError("compare", "PROJECTS", "at least one project file")
    known = rulebooks()
    schemes = scheme_ids(schemes, known) or None
    if schemes:
        results = [
            r.model_copy(update={"checks": [c for c in r.checks if c.scheme in schemes or c.user_rulebook]})
            for r in results
        ]
    boundaries = {r.boundary for r in results}
    if len(boundaries) > 1:
        listed = ", ".join(f"{r.project_file}: {r.boundary}" for r in results)
        raise InputError("compare", "boundary", f"one boundary for all projects, got {listed}; pass --boundary")
    chosen = common_basis([r.reference_product for r in results], basis)
    quantity, unit = BASES[chosen]
    compared = []
    for number, r in enumerate(results):
        spread = spreads[number] if spreads is not None else None
        scale = _scale(r, quantity)
        if scale is None:
            raise InputError(
                r.project_file,
                "--basis",
                f"a basis its functional unit ({r.functional_unit}) can be put on; {chosen} "
                f"does not apply to {r.reference_product} (use mj or kg-h2)",
            )
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
                factors_from_memory=sorted(f.id for f in r.factors_used if f.from_memory),
                factor_grades=r.factor_grades,
                uncertainty=None if spread is None or isinstance(spread, str) else band_of(spread, quantity, schemes),
                uncertainty_note=spread if isinstance(spread, str) else default_note(spread),
            )
        )
    met = {stage for r in results for stage in r.by_stage}
    comparison = ComparisonResult(
        caution=CAUTION,
        boundary=results[0].boundary,
        gwp_basis=results[0].gwp_basis,
        factor_set=results[0].factor_set.name,
        factor_set_sha256=results[0].factor_set.sha256,
        basis=chosen,
        quantity=quantity,
        unit=unit,
        stages=[stage for stage in STAGES if stage in met],
        projects=compared,
        thresholds=threshold_lines(results, quantity),
    )
    comparison._scores = list(results)
    return comparison


def _scale(result: ScoreResult, quantity: str) -> float | None:
    """Factor from the project's functional unit to the basis (the intensities are linear)."""
    lhv = result.heating_values_mj_per_kg
    fraction = result.hydrogen_mass_fraction if result.product == "ammonia" else 1.0
    return intensities(
        1.0, result.reference_product, lhv["hydrogen_lhv"], lhv.get("ammonia_lhv", float("nan")), fraction
    )[quantity]
