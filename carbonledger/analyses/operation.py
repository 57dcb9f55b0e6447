"""The operation lever of ``qualify``: the electrolyser's load planned by the linear program of ``plan``.

For one project (a combination of the other levers' values set) and one scheme, ``analyses.plan``
finds the load in every interval of the project's time series that makes the most hydrogen (or,
with a hydrogen price, the most margin) while the scheme's value stays within its limit, solved by
HiGHS. The lever's cost is ``cost.per_unit`` times what that plan gives up against running at rated
power in every interval (the plan's own baseline): kg H2 not made, or margin lost in the series'
price currency. A combination for which no plan qualifies is infeasible. The plan's load becomes the
series' load, so the answer is scored back through ``analyses.pipeline.assess`` as ``score`` scores it.
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from typing import Any

from ..core.assessment import Assessment
from ..errors import InputError
from ..model.levers import Lever
from .electricity_series import ElectricitySeries
from .plan import PlanResult, plan_project

SOLVER = "HiGHS through scipy.optimize.milp, the linear program of `carbonledger plan`"
PRIMAL_TOLERANCE = 1e-7  # HiGHS's default primal feasibility tolerance (the plan keeps its cap 1e-6 inside the limit)
CAP_INSIDE = 1e-6  # relative: the plan's emissions cap sits this far inside the limit (analyses.plan._plan_passes)
MIP_GAP = 1e-3  # relative gap of the on/off decisions with a minimum stable load


@dataclass
class Operation:
    """The plan of one combination and what it costs."""

    plan: PlanResult
    lost: float  # kg H2 not made, or margin lost (series' currency), against rated power in every interval
    cost: float  # lost x cost.per_unit, in the levers' currency


def plan_operation(
    project,
    factor_set,
    series: ElectricitySeries,
    scheme: str,
    lever: Lever,
    *,
    source: str,
    gwp: str,
    year: int | None,
    where: tuple[str, str],
) -> Operation | None:
    """The least-cost operation that keeps ``scheme`` qualifying, or None when no plan qualifies.
    ``where``: the levers file and the lever's field, named when an option of the lever cannot plan."""
    try:
        plan = plan_project(
            project,
            Assessment(factor_set, gwp, year=year),
            series,
            scheme,
            source=source,
            rated_kw=lever.rated_kw,
            min_load=lever.min_load,
            hydrogen_price=lever.hydrogen_price,
        )
    except InputError as error:
        if error.source == "plan":  # the program has no plan that makes hydrogen and qualifies
            return None
        if error.source.startswith("--"):  # an option of the lever the plan cannot use
            raise InputError(
                where[0],
                where[1],
                f"{error.expected} ({error.source.removeprefix('--').replace('-', '_')} {error.field})",
            ) from None
        raise
    if not plan.qualifies:
        return None
    if lever.hydrogen_price is not None:
        lost = float(plan.baseline_margin - plan.margin)
    else:
        lost = float(plan.baseline_hydrogen_kg - plan.hydrogen_kg.sum())
    return Operation(plan, lost, lost * float(lever.cost.per_unit))


def planned_series(series: ElectricitySeries, plan: PlanResult) -> ElectricitySeries:
    """The series with the plan's load as the electrolyser's use (what ``plan --output`` writes)."""
    return replace(series, load_kwh=plan.load_kwh.copy(), hydrogen_kg=None)


def operation_summary(found: Operation, lever: Lever, series: ElectricitySeries) -> dict[str, Any]:
    """What the output states of the operation lever: the plan, its objective and the solver."""
    plan = found.plan
    return {
        "solved_by": "the operating plan's linear program (analyses.plan, as `carbonledger plan`)",
        "solver": SOLVER,
        "primal_feasibility_tolerance": PRIMAL_TOLERANCE,
        "cap_inside_limit": CAP_INSIDE,
        "mip_rel_gap": MIP_GAP if lever.min_load > 0 else None,
        "scheme": plan.scheme,
        "tier": plan.tier,
        "objective": "margin (hydrogen price x hydrogen - electricity price x load)"
        if lever.hydrogen_price is not None
        else "hydrogen",
        "lost": found.lost,
        "lost_unit": f"{series.price_unit.split('/')[0].strip()} of margin"
        if lever.hydrogen_price is not None
        else "kg H2",
        "cost": found.cost,
        "rated_kw": plan.rated_kw,
        "min_load": lever.min_load,
        "hydrogen_price": lever.hydrogen_price,
        "intervals": int(len(plan.load_kwh)),
        "interval_minutes": plan.interval_minutes,
        "hydrogen_kg": float(plan.hydrogen_kg.sum()),
        "baseline_hydrogen_kg": plan.baseline_hydrogen_kg,
        "full_load_hours": plan.full_load_hours,
        "value": plan.value,
        "matched_share": plan.matched_share,
        "status": plan.status,
        "passes": plan.passes,
        "notes": plan.notes,
    }
