"""Headroom: the value of one parameter at which a scheme's limit is met exactly.

The largest grid share, methane loss rate or electricity use, or the smallest capture rate, that
still qualifies. The scheme value is scanned over the parameter's physical range (its field's
limits; a parameter without an upper limit is scanned to 100 times its value) with the same
stacked draws as the Monte Carlo, the crossing nearest the project's own value is bracketed and
refined with ``scipy.optimize.brentq``, and the value found is verified by scoring the project at
it with bw2calc (agreement to 1e-6 relative). A share of one electricity source takes its
share from the others in proportion (``model.shares``), so the shares keep summing to one.

References
----------
.. [1] Brent, R. P. (1973). Algorithms for Minimization without Derivatives, ch. 4.
   Prentice-Hall (the root finder behind scipy.optimize.brentq).
"""

from __future__ import annotations

from typing import Any

import numpy as np
from pydantic import BaseModel

from ..about import CAUTION
from ..core.assessment import Assessment
from ..core.scoring import rulebooks
from ..core.verdicts import NOT_MET, UNKNOWN, status_of
from ..errors import InputError
from ..model.distributions import Uncertainty
from ..model.project import field_limits, parameter_field
from ..model.rulebooks import select_schemes
from ..model.statuses import Status
from ..routes.project import validate_project
from .pipeline import assess
from .uncertainty import Draws, evaluate, limit_breaks, make_plan, params_with_draws

SCAN_POINTS = 401
VERIFY_RTOL = 1e-6


class Headroom(BaseModel):
    parameter: str
    unit: str
    scheme: str
    tier: str
    limit: float
    scheme_unit: str
    project_value: float  # the parameter's value in the project
    project_scheme_value: float  # the scheme value at it
    value: float | None  # the parameter value at which the scheme value equals the limit
    reason: str  # why value is None, or which side of it qualifies
    qualifies_when: str  # "below", "above" or "" (the side of value that qualifies)
    range: list[float]  # the physical range searched
    verified_scheme_value: float | None  # scored with bw2calc at value
    relative_difference: float | None
    caution: str = CAUTION


def headroom_summary(results: list[Headroom]) -> dict:
    """The compact figures the run ledger keeps of a headroom search (one or several parameters)."""
    first = results[0]
    found = "; ".join(
        f"{r.parameter} = {r.value:.6g} {r.unit}" if r.value is not None else f"{r.parameter}: none ({r.reason})"
        for r in results
    )
    return {
        "analysis": "headroom",
        "headline": f"headroom under {first.scheme} ({first.tier}, limit {first.limit:g} {first.scheme_unit}): {found}",
        "scheme": first.scheme,
        "tier": first.tier,
        "limit": first.limit,
        "unit": first.scheme_unit,
        "parameters": [
            {
                "parameter": r.parameter,
                "unit": r.unit,
                "project_value": r.project_value,
                "value": r.value,
                "qualifies_when": r.qualifies_when,
                "reason": r.reason,
            }
            for r in results
        ],
    }


class _Probe:
    """The scheme value at many values of one parameter (one stacked solve per call)."""

    def __init__(self, plan, path: str, scheme_id: str):
        self.plan, self.path, self.scheme_id = plan, path, scheme_id

    def draws(self, values: np.ndarray) -> Draws:
        values = np.atleast_1d(np.asarray(values, dtype=float))
        return Draws([f"parameter {self.path}"], np.zeros((len(values), 1)), {self.path: values}, {}, {})

    def __call__(self, values) -> np.ndarray:
        drawn = self.draws(values)
        return np.asarray(evaluate(self.plan, drawn, len(drawn.uniform)).scheme_values[self.scheme_id], dtype=float)

    def findings(self) -> list:
        """The scheme's rules read on the project before the threshold (the same at every value of the parameter)."""
        drawn = self.draws(np.array([0.0]))
        return evaluate(self.plan, drawn, 1).scheme_findings[self.scheme_id]

    def allowed(self, values) -> np.ndarray:
        drawn = self.draws(values)
        broken, _ = limit_breaks(self.plan, drawn, len(drawn.uniform))
        return ~broken


def search_range(nominal: float, info) -> tuple[float, float]:
    """The physical range of a parameter: its field's limits (exclusive limits nudged inside)."""
    lower, lower_in, upper, upper_in = field_limits(info)
    top = upper if upper is not None else max(100.0 * abs(nominal), 1.0)
    bottom = lower if lower is not None else -top
    span = top - bottom
    if lower is not None and not lower_in:
        bottom += 1e-9 * span
    if upper is not None and not upper_in:
        top -= 1e-9 * span
    return bottom, top


def headroom(
    project,
    assessment: Assessment,
    path: str,
    scheme_id: str,
    tier: str | None = None,
    *,
    source: str = "project",
    series=None,
) -> Headroom:
    """The value of ``path`` at which ``scheme_id`` (its loosest tier, or ``tier``) is met exactly, under the
    assessment's factor set, GWP set, boundary and year (its schemes are replaced by ``scheme_id``).

    ``series``: the project's electricity time series; the scheme value then follows its matching."""
    nominal, info = parameter_field(project, path, source, "--parameter")
    if isinstance(nominal, (bool, str)) or not isinstance(nominal, (int, float)):
        raise InputError("--parameter", path, f"a numeric parameter, got {nominal!r}")
    scheme = select_schemes(rulebooks(), [scheme_id], project.project.product)[0]
    threshold = threshold_of(scheme, tier)
    plan = make_plan(
        project,
        assessment.but(schemes=(scheme.id,)),
        Uncertainty(parameters={path: {"distribution": "uniform", "low": 0, "high": 1}}),
        source=source,
        series=series,
    )
    probe = _Probe(plan, path, scheme.id)
    findings = probe.findings()
    rules_say = status_of(findings, True)  # the verdict of a value that meets the limit, by the one judgement
    low, high = search_range(float(nominal), info)
    grid = np.unique(np.concatenate([np.linspace(low, high, SCAN_POINTS), [float(nominal)]]))
    allowed = probe.allowed(grid)
    values = probe(grid) - threshold.limit
    at_project = float(probe(np.array([float(nominal)]))[0])
    unit = (info.json_schema_extra or {}).get("unit", "")
    base = {
        "parameter": path,
        "unit": unit,
        "scheme": scheme.id,
        "tier": threshold.tier,
        "limit": threshold.limit,
        "scheme_unit": scheme.unit,
        "project_value": float(nominal),
        "project_scheme_value": at_project,
        "range": [low, high],
    }
    if rules_say == Status.NOT_ELIGIBLE:
        first = next(f.text for f in findings if f.step == "eligibility" and f.outcome == NOT_MET)
        return no_value(base, f"not eligible whatever the value: {first}")
    roots = limit_crossings(probe, grid, values, allowed, threshold.limit)
    if not roots:
        return no_value(base, no_crossing_reason(values[allowed] <= 0, low, high, unit))
    value = min(roots, key=lambda x: abs(x - float(nominal)))
    step = 1e-6 * max(abs(high - low), 1e-12)
    below, above = probe(np.array([max(value - step, low), min(value + step, high)])) - threshold.limit
    qualifies_when = "below" if below < above else "above"
    verified = verify(plan, path, value, scheme.id, source)
    difference = abs(verified - threshold.limit) / abs(threshold.limit)
    if difference > VERIFY_RTOL:
        raise RuntimeError(
            f"headroom of {path} under {scheme.id} failed its check: scored {verified} at {value}, limit "
            f"{threshold.limit}"
        )
    extent = "largest" if qualifies_when == "below" else "smallest"
    reason = f"the {extent} value that meets the limit" + (
        f" ({len(roots)} crossings in range; the one nearest the project's value)" if len(roots) > 1 else ""
    )
    if rules_say == Status.UNDETERMINED:
        reason += f"; the check stays undetermined there: {next(f.text for f in findings if f.outcome == UNKNOWN)}"
    return Headroom(
        **base,
        value=value,
        reason=reason,
        qualifies_when=qualifies_when,
        verified_scheme_value=verified,
        relative_difference=difference,
    )


def no_value(base: dict, reason: str) -> Headroom:
    """A headroom without a value (not eligible, or no value of the range meets the limit exactly), and why."""
    return Headroom(
        **base, value=None, reason=reason, qualifies_when="", verified_scheme_value=None, relative_difference=None
    )


def threshold_of(scheme, tier: str | None):
    """The scheme's tier named ``tier`` (its loosest when None), or one InputError line naming the tiers."""
    if tier is None:
        return scheme.loosest()
    found = [t for t in scheme.thresholds if t.tier == tier]
    if not found:
        raise InputError("--tier", tier, f"a tier of {scheme.id}: {'; '.join(t.tier for t in scheme.thresholds)}")
    return found[0]


def limit_crossings(probe, grid: np.ndarray, values: np.ndarray, allowed: np.ndarray, limit: float) -> list[float]:
    """The parameter values where the scheme value meets the limit: the scan's points at the limit, and a
    root (Brent's method) in every interval of the scan where value - limit changes sign, both ends allowed."""
    from scipy.optimize import brentq

    roots = [float(grid[n]) for n in range(len(grid)) if allowed[n] and values[n] == 0]
    for n in range(len(grid) - 1):
        if allowed[n] and allowed[n + 1] and np.sign(values[n]) != np.sign(values[n + 1]):
            roots.append(
                brentq(
                    lambda x: float(probe(np.array([x]))[0]) - limit,
                    grid[n],
                    grid[n + 1],
                    xtol=1e-15,
                    rtol=4 * np.finfo(float).eps,
                    maxiter=200,
                )
            )
    return roots


def no_crossing_reason(qualifies: np.ndarray, low: float, high: float, unit: str) -> str:
    """Why no value of the range meets the limit exactly: all meet it, none does, or only across a physical limit."""
    if qualifies.all():
        return f"every value in the physical range [{low:g}, {high:g}] {unit} meets the limit"
    if not qualifies.any():
        return f"no value in the physical range [{low:g}, {high:g}] {unit} meets the limit"
    return "the limit is met only across a physical limit of the route"


def verify(plan, path: str, value: float, scheme_id: str, source: str) -> float:
    """The scheme value from a full score (validated project, bw2calc solve, matched series) at the value found."""
    params = params_with_draws(plan, {path: np.float64(value)})
    data: dict[str, Any] = _plain(params)
    project = validate_project(data, source)
    result = assess(plan.assessment, project, source=source, series=plan.series)
    return next(check.value for check in result.checks if check.scheme == scheme_id)


def _plain(value):
    if isinstance(value, dict):
        return {key: _plain(item) for key, item in value.items() if item is not None}
    if isinstance(value, np.generic):
        return value.item()
    return value
