"""What it takes to qualify: the cheapest set of lever values with which every named scheme qualifies.

The judgement is the product's own and is never written here: each candidate set of lever values
is scored through the Monte Carlo path (``analyses.uncertainty.evaluate``: the route and stage code
on arrays, solved stacked, scheme values matched to a time series where the project has one), and
each point's status under each scheme is ``analyses.uncertainty.statuses`` (the rules read before
the threshold, then the loosest threshold). A set of lever values qualifies when every named
scheme's status is ``qualifies`` at the central value, or, with a confidence, when the share of the
Monte Carlo draws in which every named scheme qualifies is at least the confidence. The answer is
scored back through the scoring path of ``score`` (``analyses.pipeline.assess``) with the same year: its checks'
statuses are the ones reported.

Method
------
- Continuous levers: ``scipy.optimize.minimize`` (SLSQP) on the levers scaled to [0, 1]. Each
  lever's cost is piecewise linear in its value (per unit of change either way from the project's
  value, or a table); a convex cost is written as its epigraph (one linear constraint per piece),
  so the objective is linear; a cost that is not convex is split into convex pieces that are
  enumerated like discrete values. The constraint is the relative margin (limit - value) / |limit|
  of every scheme at the central value, or, with a confidence p, the mean of the smallest relative
  margins (over the schemes) of the draws ranked k to k + w - 1, k = ceil(p x draws used),
  w = ``SMOOTHING`` of the draws: never above the k-th largest, so where it is >= 0 at least k
  draws qualify under every scheme (a chance constraint on common random numbers: the same draws,
  from the seed, for every candidate and combination, so the answer is the same from run to run);
  that search starts from the central answer. Gradients are forward differences, scored together
  in one stacked solve (with draws, on the ranked draws only).
- Discrete levers (and the pieces of non-convex costs): every combination is enumerated, cheapest
  lower bound first; a combination whose lower bound reaches the best cost found is not solved
  (branch and bound).
- A point the optimiser returns that does not qualify by the statuses is moved along the segment
  to the point of largest margin until it does (``scipy.optimize.brentq``).
- When no combination qualifies within the ranges, the largest smallest-margin reached is
  reported with the lever that binds (the one at a bound of its range whose widening would raise
  the margin most per unit of its range).
- The cost/margin front: for each budget of a sweep, the largest smallest margin (or, with a
  confidence, the margin held in that share of the draws, and the probability it gives).

A lever on a parameter that has a distribution moves its draws with it: each draw is multiplied
by (lever value / project value) (shifted by the difference when the project value is 0).

An operation lever (``kind = "operation"``) is not searched here: for each combination of the
discrete levers, ``analyses.operation`` plans the electrolyser's load by the linear program of
``analyses.plan`` (HiGHS) and prices what it gives up; the cheapest is scored back with the plan's
load as the series (``_operation_search``).

References
----------
.. [1] Kraft, D. (1988). A software package for sequential quadratic programming. DFVLR-FB 88-28
   (SLSQP, the method of scipy.optimize.minimize used here).
.. [2] Charnes, A. and Cooper, W. W. (1959). Chance-constrained programming. Management Science
   6(1), 73-79.
.. [3] Luedtke, J. and Ahmed, S. (2008). A sample approximation approach for optimization with
   probabilistic constraints. SIAM Journal on Optimization 19(2), 674-699 (the sample
   approximation of a chance constraint on fixed draws).
.. [4] Land, A. H. and Doig, A. G. (1960). An automatic method of solving discrete programming
   problems. Econometrica 28(3), 497-520 (branch and bound).
"""

from __future__ import annotations

import copy
import itertools
import math
from dataclasses import dataclass, field, replace
from typing import Any

import numpy as np
from pydantic import BaseModel

from ..about import CAUTION, __version__
from ..core.assessment import Assessment
from ..core.scoring import rulebooks
from ..errors import InputError
from ..model.distributions import Uncertainty
from ..model.levers import MAX_COMBINATIONS, Lever, Levers
from ..model.project import apply_overrides, field_limits, is_share_path, parameter_field, path_key, share_source
from ..model.rulebooks import select_schemes
from ..model.shares import negative_shares, rebalanced_shares, rebalancing_problem
from ..model.statuses import Status
from ..routes.project import validate_project
from .operation import operation_summary, plan_operation, planned_series
from .pipeline import assess
from .uncertainty import Draws, Plan, draw, evaluate, limit_breaks, make_plan, params_with_draws, probability, statuses

SOLVER = "SLSQP (scipy.optimize.minimize)"
SOLVER_TOLERANCE = 1e-10  # SLSQP's ftol on the scaled cost
MARGIN_TOLERANCE = 1e-9  # the relative margin asked of a continuous answer (keeps it inside the limit)
STEP = 1e-6  # forward-difference step on levers scaled to [0, 1]
BLOCK_SYSTEMS = 40_000  # systems scored per stacked call
FRONT_BUDGETS = 6
FRONT_ITERATIONS = 40  # SLSQP iterations of a front point with draws (it starts from the central one)
BLOCKED = -1.0  # relative margin given to a point a physical limit refuses
SMOOTHING = 0.005  # share of the draws whose ranked margins are averaged in the chance constraint


# --- levers resolved against a project -------------------------------------------------------


@dataclass
class Piece:
    """A convex piece of a continuous lever's cost: its value range and linear parts (slope, intercept)."""

    low: float
    high: float
    lines: list[tuple[float, float]]

    def cost(self, value: float) -> float:
        return max(slope * value + intercept for slope, intercept in self.lines)


@dataclass
class Resolved:
    """A lever checked against a project: its value there, unit and limits, and its cost function."""

    index: int
    lever: Lever
    project_value: Any
    unit: str
    pieces: list[Piece] = field(default_factory=list)  # continuous levers
    choices: list[Any] = field(default_factory=list)  # discrete levers
    choice_costs: list[float] = field(default_factory=list)

    @property
    def path(self) -> str:
        return self.lever.parameter

    @property
    def continuous(self) -> bool:
        return self.lever.continuous

    def cost(self, value) -> float:
        if not self.continuous:
            return self.choice_costs[self.choices.index(value)]
        return min(piece.cost(value) for piece in self.pieces if piece.low - 1e-12 <= value <= piece.high + 1e-12)


def _where(lever_index: int, name: str) -> str:
    return f"levers.{lever_index}.{name}"


def _breakpoints(
    resolved_lever: Lever, nominal: float, low: float, high: float, source: str, index: int
) -> tuple[np.ndarray, np.ndarray]:
    """The cost of a continuous lever as points (value, cost), linear between them, over [low, high]."""
    cost = resolved_lever.cost
    if cost.per_unit is not None:
        xs = sorted({low, high, *([nominal] if low < nominal < high else [])})
        return np.array(xs), np.array([cost.per_unit * abs(x - nominal) for x in xs])
    pairs = []
    for number, (value, price) in enumerate(cost.table or []):
        if isinstance(value, bool) or not isinstance(value, (int, float)):
            raise InputError(
                source,
                _where(index, f"cost.table.{number}"),
                f"a number as the value of a continuous lever, got {value!r}",
            )
        pairs.append((float(value), float(price)))
    pairs.sort()
    xs = np.array([x for x, _ in pairs])
    cs = np.array([c for _, c in pairs])
    if len(set(xs)) != len(xs):
        raise InputError(source, _where(index, "cost.table"), "each value once")
    if xs[0] > low or xs[-1] < high:
        raise InputError(
            source,
            _where(index, "cost.table"),
            f"values that cover the lever's range [{low:g}, {high:g}], got [{xs[0]:g}, {xs[-1]:g}]",
        )
    inside = xs[(xs > low) & (xs < high)]
    points = np.concatenate([[low], inside, [high]])
    return points, np.interp(points, xs, cs)


def convex_pieces(xs: np.ndarray, cs: np.ndarray) -> list[Piece]:
    """Split a piecewise-linear cost into convex pieces (a new piece where the slope falls)."""
    slopes = np.diff(cs) / np.diff(xs)
    pieces, start = [], 0
    for n in range(1, len(slopes) + 1):
        if n == len(slopes) or slopes[n] < slopes[n - 1] - 1e-12 * max(1.0, abs(slopes[n - 1])):
            lines = [(float(slopes[k]), float(cs[k] - slopes[k] * xs[k])) for k in range(start, n)]
            pieces.append(Piece(float(xs[start]), float(xs[n]), lines))
            start = n
    return pieces


def _within(value: float, limits: tuple) -> bool:
    lower, lower_in, upper, upper_in = limits
    if lower is not None and (value < lower if lower_in else value <= lower):
        return False
    return not (upper is not None and (value > upper if upper_in else value >= upper))


def _limits_text(limits: tuple) -> str:
    lower, lower_in, upper, upper_in = limits
    return (
        f"{'[' if lower_in else '('}{'-inf' if lower is None else f'{lower:g}'}, "
        f"{'inf' if upper is None else f'{upper:g}'}{']' if upper_in else ')'}"
    )


def resolve_levers(project, levers: Levers, source: str) -> list[Resolved]:
    """Check every lever against the project (path, physical limits, cost) and price it."""
    resolved = []
    for index, lever in enumerate(levers.levers):
        if lever.kind == "operation":
            continue
        nominal, info = parameter_field(project, lever.parameter, source, _where(index, "parameter"))
        numeric = isinstance(nominal, (int, float)) and not isinstance(nominal, bool)
        limits = field_limits(info)
        unit = (info.json_schema_extra or {}).get("unit", "")
        item = Resolved(index, lever, nominal, unit)
        if lever.continuous:
            if not numeric:
                raise InputError(
                    source,
                    _where(index, "range"),
                    f"values for a numeric parameter; '{lever.parameter}' is {nominal!r} (give it values)",
                )
            low, high = lever.range
            if not (_within(low, limits) and _within(high, limits)):
                raise InputError(
                    source,
                    _where(index, "range"),
                    f"a range within the parameter's physical limits {_limits_text(limits)}, got [{low:g}, {high:g}]",
                )
            if lever.cost.per_step is not None:
                raise InputError(
                    source,
                    _where(index, "cost.per_step"),
                    "a lever with a step (a continuous lever is priced per_unit or by a table)",
                )
            item.pieces = convex_pieces(*_breakpoints(lever, float(nominal), low, high, source, index))
        else:
            choices = lever.choices()
            for value in choices:
                if numeric != (isinstance(value, (int, float)) and not isinstance(value, bool)):
                    raise InputError(
                        source,
                        _where(index, "values"),
                        f"values of the parameter's kind ({'numbers' if numeric else 'text'}), got {value!r}",
                    )
                if numeric and not _within(float(value), limits):
                    raise InputError(
                        source,
                        _where(index, "values"),
                        f"values within the parameter's physical limits {_limits_text(limits)}, got {value!r}",
                    )
            item.choices = [float(v) if numeric else v for v in choices]
            item.choice_costs = [
                _discrete_cost(lever, value, nominal, numeric, source, index) for value in item.choices
            ]
        resolved.append(item)
    _check_shares(project, resolved, source)
    return resolved


def absorbers_of(levers: list[Resolved]) -> dict[str, str]:
    """Share path -> the source that takes up its difference, for the share levers that name one."""
    return {item.path: item.lever.absorbed_by for item in levers if is_share_path(item.path) and item.lever.absorbed_by}


def _check_shares(project, resolved: list[Resolved], source: str) -> None:
    """Share levers that can be rebalanced together: every absorber a source no lever moves, something
    left to take up the rest, and no share below 0 with every share lever at its lowest value."""
    moving = [item for item in resolved if is_share_path(item.path)]
    if not moving:
        return
    shares = {name: s.share for name, s in project.electricity.sources.items()}
    absorbers = {share_source(path): name for path, name in absorbers_of(moving).items()}
    problem = rebalancing_problem(shares, [share_source(item.path) for item in moving], absorbers)
    if problem:
        named = next((item for item in moving if item.lever.absorbed_by), moving[0])
        raise InputError(
            source, _where(named.index, "absorbed_by" if named.lever.absorbed_by else "parameter"), problem
        )
    lowest = {
        share_source(item.path): min(item.lever.range) if item.continuous else min(item.choices) for item in moving
    }
    below = [
        name for name, negative in negative_shares(rebalanced_shares(shares, lowest, absorbers)).items() if negative
    ]
    if below:
        raise InputError(
            source,
            "levers",
            "electricity share levers whose shares can be rebalanced: at their lowest values "
            f"({', '.join(f'{name} {value:g}' for name, value in lowest.items())}) {', '.join(below)} would fall "
            "below 0",
        )


def _discrete_cost(lever: Lever, value, nominal, numeric: bool, source: str, index: int) -> float:
    cost = lever.cost
    if cost.table is not None:
        for table_value, price in cost.table:
            same = (
                math.isclose(float(table_value), value, rel_tol=1e-12, abs_tol=1e-15)
                if numeric and not isinstance(table_value, (str, bool))
                else table_value == value
            )
            if same:
                return float(price)
        raise InputError(
            source, _where(index, "cost.table"), f"a cost for every value of the lever, none for {value!r}"
        )
    if not numeric:
        raise InputError(
            source,
            _where(index, "cost"),
            "a cost table for a lever of text values (per_unit and per_step need numbers)",
        )
    change = abs(value - float(nominal))
    if cost.per_unit is not None:
        return cost.per_unit * change
    return cost.per_step * math.ceil(change / lever.step - 1e-9)


# --- scoring candidates ------------------------------------------------------------------------


@dataclass
class Combination:
    """Fixed values of the discrete levers and one convex piece of each continuous lever."""

    discrete: dict[str, Any]
    pieces: list[Piece]
    discrete_cost: float

    def lower_bound(self) -> float:
        return self.discrete_cost + sum(
            min(piece.cost(piece.low), piece.cost(piece.high), *(piece.cost(x) for x in _kinks(piece)))
            for piece in self.pieces
        )


def _kinks(piece: Piece) -> list[float]:
    xs = []
    for (s1, b1), (s2, b2) in itertools.pairwise(piece.lines):
        if s1 != s2:
            xs.append((b2 - b1) / (s1 - s2))
    return [x for x in xs if piece.low <= x <= piece.high]


def moved(drawn: np.ndarray, value, reference: float) -> np.ndarray:
    """Draws of a parameter that a lever sets to ``value`` (its project value ``reference``):
    each draw times value / reference, or shifted by the difference when the reference is 0."""
    return drawn * (value / reference) if reference != 0 else drawn + (value - reference)


class Evaluator:
    """Relative margins and statuses of many candidate lever values, scored stacked.

    ``plan``: the project (with a combination's discrete values) ready for draws; ``paths``: the
    continuous levers, ``nominal`` their values in that project; ``drawn``: the Monte Carlo draws
    of the project as written (common to every candidate and combination), or None for the central
    value; ``confidence``: the share of draws that must qualify. A drawn parameter that a lever
    moves is multiplied by (lever value / ``reference``, its value in the project as written);
    ``fixed``: the numeric discrete lever values of the combination.
    """

    def __init__(
        self,
        plan: Plan,
        schemes: list,
        paths: list[str],
        nominal: dict[str, float],
        drawn: Draws | None,
        confidence: float | None,
        reference=None,
        fixed=None,
    ):
        self.plan, self.schemes, self.paths, self.nominal = plan, schemes, paths, nominal
        self.drawn, self.confidence = drawn, confidence
        self.reference, self.fixed = reference or {}, fixed or {}
        self.shares = {
            path: value for path, value in self.fixed.items() if is_share_path(path)
        }  # set with the continuous levers, rebalanced together
        self.size = 1 if drawn is None else len(drawn.uniform)
        self.calls = 0
        self.blocked = self._blocked()

    def central(self) -> Evaluator:
        """The same candidates at the central value (no draws)."""
        return Evaluator(self.plan, self.schemes, self.paths, self.nominal, None, None, self.reference, self.fixed)

    def _blocked(self) -> dict[str, str]:
        """Schemes whose rules (read before the threshold) keep them from qualifying at any value: id -> status."""
        outcome = evaluate(
            self.plan,
            self._draws(np.array([[self.nominal[p] for p in self.paths]]).reshape(1, len(self.paths)), central=True),
            1,
        )
        found = {}
        for scheme in self.schemes:
            at_any_value = statuses(scheme, np.array([-1e300]), outcome.scheme_findings.get(scheme.id))
            if not at_any_value["qualifies"][0]:
                found[scheme.id] = next(name for name, hits in at_any_value.items() if hits[0])
        return found

    def _draws(self, points: np.ndarray, central: bool = False, rows: np.ndarray | None = None) -> Draws:
        """The inputs of every candidate point: the lever values, and (with draws) every draw, or the draws in
        ``rows``."""
        count = len(points)
        if central or self.drawn is None:
            fixed_shares = {path: np.full(count, value) for path, value in self.shares.items()}
            return Draws(
                [],
                np.zeros((count, 0)),
                {**fixed_shares, **{path: points[:, n].astype(float) for n, path in enumerate(self.paths)}},
                {},
                {},
            )
        pick = slice(None) if rows is None else rows
        size = self.size if rows is None else len(rows)
        drawn = self.drawn
        parameters = {path: np.tile(values[pick], count) for path, values in drawn.parameters.items()}
        for path, value in self.fixed.items():
            if path in parameters:
                parameters[path] = moved(parameters[path], value, self.reference[path])
            elif path in self.shares:
                parameters[path] = np.full(count * size, value)
        for n, path in enumerate(self.paths):
            chosen = np.repeat(points[:, n].astype(float), size)
            parameters[path] = moved(parameters[path], chosen, self.reference[path]) if path in parameters else chosen
        choices = {
            path: (nominal, np.tile(chosen[pick], count)) for path, (nominal, chosen) in drawn.factor_choices.items()
        }
        factors = {factor_id: np.tile(values[pick], count) for factor_id, values in drawn.factors.items()}
        return Draws(drawn.names, np.zeros((count * size, 0)), parameters, choices, factors)

    def score(self, points: np.ndarray, rows: np.ndarray | None = None) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """(relative margins (points, size, schemes), qualifies (points, size, schemes), used (points, size)).

        A draw qualifies under a scheme when its status (``statuses``) is qualifies and it is within
        every physical limit (``limit_breaks``: draws outside them are left out, as in ``uncertainty``).
        ``rows``: score only these draws."""
        points = np.atleast_2d(np.asarray(points, dtype=float))
        size = self.size if rows is None else len(rows)
        per_block = max(1, BLOCK_SYSTEMS // size)
        margins, qualifies, used = [], [], []
        for start in range(0, len(points), per_block):
            block = points[start : start + per_block]
            count = len(block) * size
            drawn = self._draws(block, rows=rows)
            outcome = evaluate(self.plan, drawn, count)
            broken, _ = limit_breaks(self.plan, drawn, count)
            self.calls += 1
            rel, ok = [], []
            for scheme in self.schemes:
                values = np.asarray(outcome.scheme_values[scheme.id], dtype=float)
                limit = scheme.loosest().limit
                rel.append(
                    np.nan_to_num((limit - values) / abs(limit), nan=BLOCKED)
                )  # a value that is not a number never qualifies
                ok.append(statuses(scheme, values, outcome.scheme_findings.get(scheme.id))["qualifies"] & ~broken)
            shape = (len(block), size, len(self.schemes))
            margins.append(np.stack(rel, axis=-1).reshape(shape))
            qualifies.append(np.stack(ok, axis=-1).reshape(shape))
            used.append((~broken).reshape(shape[:2]))
        return np.concatenate(margins), np.concatenate(qualifies), np.concatenate(used)

    def constraint(self, points: np.ndarray) -> np.ndarray:
        """The margins the optimiser keeps >= 0: per scheme at the central value (points, schemes);
        with a confidence, the k-th largest smallest margin over the draws used (points, 1)."""
        return self._constraint(points)[0]

    def _constraint(self, points: np.ndarray) -> tuple[np.ndarray, list[np.ndarray]]:
        """The constraint values and, with draws, the draws that decide each point's value.

        With draws, the value is the mean of the smallest margins of the draws ranked k to
        k + w - 1 (largest first; k = ceil(confidence x draws used), w = ``SMOOTHING`` of the draws
        used, at least 1): never above the k-th largest, so a point where it is >= 0 has at least k
        qualifying draws, and smoother than the k-th alone (fewer kinks for SLSQP)."""
        margins, _, used = self.score(points)
        if self.drawn is None:
            return np.where(used[:, 0, None], margins[:, 0, :], np.minimum(margins[:, 0, :], BLOCKED)), []
        worst = margins.min(axis=2)
        out, deciding = np.empty((len(worst), 1)), []
        for n in range(len(worst)):
            kept = np.flatnonzero(used[n])
            if len(kept) == 0:
                out[n, 0] = BLOCKED
                deciding.append(np.zeros(0, dtype=int))
                continue
            k = max(1, math.ceil(self.confidence * len(kept) - 1e-9))
            window = max(1, int(SMOOTHING * len(kept)))
            order = kept[np.argsort(-worst[n][kept], kind="stable")]
            rows = order[k - 1 : k - 1 + window]
            deciding.append(rows)
            out[n, 0] = worst[n][rows].mean()
        return out, deciding

    def constraint_gradient(
        self, point: np.ndarray, steps: np.ndarray, known: tuple | None = None
    ) -> tuple[np.ndarray, np.ndarray]:
        """The constraint at ``point`` and its forward differences along each lever (``steps`` in lever units).

        With draws, the ranked margins move with the draws that hold them for a small enough step,
        so the differences are taken on those draws only (n + 1 points times the window instead of
        times every draw). ``known``: the constraint value and deciding draws at ``point``."""
        n = len(point)
        shifted = point + np.diag(steps)
        if self.drawn is None:
            values = self.constraint(np.vstack([point, shifted]))
            return values[0], ((values[1:] - values[0]) / steps[:, None]).T
        value, deciding = known if known is not None else self.constraint_and_deciding(point)
        if len(deciding) == 0 or n == 0:
            return value, np.zeros((1, n))
        margins, _, _ = self.score(np.vstack([point, shifted]), rows=deciding)
        worst = margins.min(axis=2).mean(axis=1)
        return value, ((worst[1:] - worst[0]) / steps)[None, :]

    def constraint_and_deciding(self, point: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        values, deciding = self._constraint(np.asarray(point, dtype=float).reshape(1, -1))
        return values[0], deciding[0] if deciding else np.zeros(0, dtype=int)

    def qualifies(self, point: np.ndarray) -> tuple[bool, float | None, float | None]:
        """Whether the point qualifies under every scheme by the statuses (with a confidence: in at
        least that share of the draws used), and that share with its standard error."""
        _, qualifies, used = self.score(np.asarray(point, dtype=float).reshape(1, -1))
        every = qualifies[0].all(axis=1)
        if self.drawn is None:
            return bool(every[0]), None, None
        found = probability(every[used[0]])
        return found.probability >= self.confidence, found.probability, found.standard_error

    def scheme_probabilities(self, point: np.ndarray) -> list:
        """Each scheme's probability of qualifying at the point (``uncertainty.probability``), over the draws used."""
        _, qualifies, used = self.score(np.asarray(point, dtype=float).reshape(1, -1))
        return [probability(qualifies[0][used[0], column]) for column in range(len(self.schemes))]


# --- the optimiser -----------------------------------------------------------------------------


@dataclass
class Found:
    values: dict[str, Any]
    cost: float
    qualifies: bool
    margin: float  # smallest relative margin (or the margin held in the confidence's share of draws)
    probability: float | None = None
    standard_error: float | None = None
    iterations: int = 0
    note: str = ""


class Continuous:
    """The continuous part of one combination: levers scaled to [0, 1], costs as epigraphs."""

    def __init__(
        self,
        evaluator: Evaluator,
        levers: list[Resolved],
        pieces: list[Piece],
        shares: tuple[np.ndarray, np.ndarray] | None = None,
    ):
        self.evaluator, self.levers, self.pieces = evaluator, levers, pieces
        self.low = np.array([piece.low for piece in pieces])
        self.width = np.array([piece.high - piece.low for piece in pieces])
        self.shares = shares  # (A, b): the rebalanced shares A x + b, kept >= 0
        self.scale = max(1.0, sum(max(abs(piece.cost(piece.low)), abs(piece.cost(piece.high))) for piece in pieces))
        self.cache: dict[tuple, np.ndarray] = {}
        self.n = len(pieces)

    def x(self, z: np.ndarray) -> np.ndarray:
        return self.low + np.clip(z, 0.0, 1.0) * self.width

    def z_of(self, x: np.ndarray) -> np.ndarray:
        return np.clip((np.asarray(x, dtype=float) - self.low) / np.where(self.width > 0, self.width, 1.0), 0.0, 1.0)

    def _known(self, z: np.ndarray) -> tuple[np.ndarray, int]:
        key = tuple(np.round(z, 15))
        if key not in self.cache:
            self.cache[key] = self.evaluator.constraint_and_deciding(self.x(z))
        return self.cache[key]

    def g(self, z: np.ndarray) -> np.ndarray:
        return self._known(z)[0]

    def g_jacobian(self, z: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        z = np.clip(z, 0.0, 1.0)
        steps = np.where(z + STEP <= 1.0, STEP, -STEP)
        known = self._known(z) if self.evaluator.drawn is not None else None
        value, jacobian = self.evaluator.constraint_gradient(self.x(z), steps * self.width, known)
        return value, jacobian * self.width[None, :]

    def cost(self, z: np.ndarray) -> float:
        x = self.x(z)
        return float(sum(piece.cost(value) for piece, value in zip(self.pieces, x, strict=True)))

    def _epigraph(self):
        """Linear constraints t_j >= (slope x_j + intercept) / scale for every line of every piece."""
        rows, offsets = [], []
        for j, piece in enumerate(self.pieces):
            for slope, intercept in piece.lines:
                row = np.zeros(2 * self.n)
                row[j] = -slope * self.width[j] / self.scale
                row[self.n + j] = 1.0
                rows.append(row)
                offsets.append(-(slope * self.low[j] + intercept) / self.scale)
        matrix, offset = np.array(rows), np.array(offsets)
        return matrix, offset

    def share_constraints(self, size: int) -> list[dict]:
        """Every rebalanced share >= 0, linear in the scaled levers (the first n of ``size`` variables)."""
        if self.shares is None:
            return []
        matrix, offset = self.shares
        scaled = np.hstack([matrix * self.width[None, :], np.zeros((len(matrix), size - self.n))])
        shift = matrix @ self.low + offset
        return [{"type": "ineq", "fun": lambda v: scaled @ v + shift, "jac": lambda v: scaled}]

    def least_cost(self, start: np.ndarray, margin: float = MARGIN_TOLERANCE):
        """Minimise the cost subject to every margin >= ``margin``; returns (z, scipy result)."""
        from scipy.optimize import minimize

        matrix, offset = self._epigraph()
        n = self.n
        t0 = np.array([piece.cost(value) for piece, value in zip(self.pieces, self.x(start), strict=True)]) / self.scale
        span = [
            (
                min(piece.cost(piece.low), piece.cost(piece.high), *(piece.cost(x) for x in _kinks(piece))) / self.scale
                - 1.0,
                max(piece.cost(piece.low), piece.cost(piece.high)) / self.scale + 1.0,
            )
            for piece in self.pieces
        ]
        constraints = [
            {"type": "ineq", "fun": lambda v: matrix @ v + offset, "jac": lambda v: matrix},
            {
                "type": "ineq",
                "fun": lambda v: self.g(v[:n]) - margin,
                "jac": lambda v: np.hstack([self.g_jacobian(v[:n])[1], np.zeros((len(self.g(v[:n])), n))]),
            },
            *self.share_constraints(2 * n),
        ]
        result = minimize(
            lambda v: float(v[n:].sum()),
            np.concatenate([start, t0]),
            jac=lambda v: np.concatenate([np.zeros(n), np.ones(n)]),
            method="SLSQP",
            bounds=[(0.0, 1.0)] * n + span,
            constraints=constraints,
            options={"ftol": SOLVER_TOLERANCE, "maxiter": 200},
        )
        return np.clip(result.x[:n], 0.0, 1.0), result

    def best_margin(self, start: np.ndarray, budget: float | None = None, iterations: int = 200):
        """Maximise the smallest margin (within ``budget`` of continuous cost when given); returns (z, margin,
        result)."""
        from scipy.optimize import minimize

        matrix, offset = self._epigraph()
        n = self.n
        t0 = np.array([piece.cost(value) for piece, value in zip(self.pieces, self.x(start), strict=True)]) / self.scale
        m0 = float(np.min(self.g(start)))
        constraints = [
            {
                "type": "ineq",
                "fun": lambda v: matrix @ v[: 2 * n] + offset,
                "jac": lambda v: np.hstack([matrix, np.zeros((len(matrix), 1))]),
            },
            {
                "type": "ineq",
                "fun": lambda v: self.g(v[:n]) - v[-1],
                "jac": lambda v: np.hstack(
                    [self.g_jacobian(v[:n])[1], np.zeros((len(self.g(v[:n])), n)), -np.ones((len(self.g(v[:n])), 1))]
                ),
            },
        ]
        constraints += self.share_constraints(2 * n + 1)
        if budget is not None:
            constraints.append(
                {
                    "type": "ineq",
                    "fun": lambda v: budget / self.scale - v[n : 2 * n].sum(),
                    "jac": lambda v: np.concatenate([np.zeros(n), -np.ones(n), [0.0]]),
                }
            )
        span = [(-1e6, 1e6)] * n
        result = minimize(
            lambda v: -v[-1],
            np.concatenate([start, t0, [m0]]),
            jac=lambda v: np.concatenate([np.zeros(2 * n), [-1.0]]),
            method="SLSQP",
            bounds=[(0.0, 1.0)] * n + span + [(-10.0, 10.0)],
            constraints=constraints,
            options={"ftol": SOLVER_TOLERANCE, "maxiter": iterations},
        )
        z = np.clip(result.x[:n], 0.0, 1.0)
        if budget is not None and self.cost(z) > budget + 1e-9 * self.scale:
            z = start if self.cost(start) <= budget else z
        return z, float(np.min(self.g(z))), result

    def repair(self, z: np.ndarray, feasible: np.ndarray) -> np.ndarray | None:
        """Move ``z`` toward a qualifying point until it qualifies by the statuses (brentq on the segment)."""
        from scipy.optimize import brentq

        def gap(step: float) -> float:
            return float(np.min(self.g(z + step * (feasible - z)))) - MARGIN_TOLERANCE

        if gap(1.0) < 0:
            return None
        if gap(0.0) >= 0:
            return z
        step = brentq(gap, 0.0, 1.0, xtol=1e-9)
        for extra in (0.0, 1e-9, 1e-6, 1e-3, 1.0):
            candidate = z + min(1.0, step + extra) * (feasible - z)
            if self.evaluator.qualifies(self.x(candidate))[0]:
                return candidate
        return None


@dataclass
class Search:
    """Everything one run of qualify needs: levers, combinations, evaluators."""

    project: Any
    assessment: Assessment  # factor set, GWP set, boundary, year; its schemes are the ones to qualify for
    levers: list[Resolved]
    schemes: list
    source: str
    levers_source: str
    confidence: float | None
    draws: int
    seed: int
    sampling: str | None
    uncertainty: Uncertainty | None
    series: Any
    solved: int = 0
    pruned: int = 0
    iterations: int = 0
    blocked: dict = field(default_factory=dict)  # combination label -> {scheme: status}
    evaluators: dict = field(default_factory=dict)  # combination label -> Evaluator
    drawn: tuple | None = None  # the draws of the project as written and its uncertain parameter paths
    largest: dict = field(default_factory=dict)  # combination -> its largest margin within the ranges

    @property
    def continuous(self) -> list[Resolved]:
        return [lever for lever in self.levers if lever.continuous]

    @property
    def discrete(self) -> list[Resolved]:
        return [lever for lever in self.levers if not lever.continuous]

    def combinations(self) -> list[Combination]:
        discrete, continuous = self.discrete, self.continuous
        count = math.prod(len(lever.choices) for lever in discrete) * math.prod(
            len(lever.pieces) for lever in continuous
        )
        if count > MAX_COMBINATIONS:
            raise InputError(
                self.levers_source,
                "levers",
                f"at most {MAX_COMBINATIONS} combinations of discrete values (and pieces of non-convex costs), got "
                f"{count}",
            )
        found = []
        for values in itertools.product(*(range(len(lever.choices)) for lever in discrete)):
            chosen = {lever.path: lever.choices[n] for lever, n in zip(discrete, values, strict=True)}
            cost = sum(lever.choice_costs[n] for lever, n in zip(discrete, values, strict=True))
            for pieces in itertools.product(*(lever.pieces for lever in continuous)):
                found.append(Combination(chosen, list(pieces), cost))
        return sorted(found, key=Combination.lower_bound)

    def lever_plan(self, project) -> Plan:
        """A plan of the project for the continuous levers and the share levers (their fields), holding the
        year, series, schemes and the sources that take up the shares' differences."""
        fields = {
            lever.path: parameter_field(project, lever.path, self.source)
            for lever in self.levers
            if lever.continuous or is_share_path(lever.path)
        }
        plan = Plan(project, self.assessment, Uncertainty(), self.source, fields, series=self.series)
        plan.absorbers = absorbers_of(self.levers)
        return plan

    def with_values(self, values: dict[str, Any]):
        """The validated project with lever values set (the share levers rebalanced together, ``model.shares``)."""
        base = self.project
        plan = self.lever_plan(base)
        plan.fields = {path: parameter_field(base, path, self.source) for path in values}
        params = params_with_draws(
            plan, {path: (np.float64(value) if isinstance(value, float) else value) for path, value in values.items()}
        )
        try:
            return validate_project(_plain(params), self.source)
        except InputError as error:
            where = ", ".join(f"{path}={value!r}" for path, value in values.items())
            raise InputError(
                self.levers_source,
                "levers",
                f"lever values the project accepts ({where}): {error.field}: {error.expected}",
            ) from None

    def evaluator(self, combination: Combination) -> Evaluator:
        """The evaluator of a combination's discrete values (kept: its checks of the rules run once)."""
        key = _label(combination.discrete)
        if key not in self.evaluators:
            self.evaluators[key] = self._evaluator(combination)
        return self.evaluators[key]

    def _evaluator(self, combination: Combination) -> Evaluator:
        """Discrete values set in the project, but shares: those are set with the continuous levers' on every
        candidate, so that all share levers are rebalanced together against the project as written."""
        settled = {path: value for path, value in combination.discrete.items() if not is_share_path(path)}
        project = self.with_values(settled) if settled else self.project
        plan = self.lever_plan(project)
        drawn = None
        if self.confidence is not None:
            drawn, uncertain = self.draws_of_project()
            plan.fields.update({path: parameter_field(project, path, self.source) for path in uncertain})
        nominal = {lever.path: float(parameter_field(project, lever.path, self.source)[0]) for lever in self.continuous}
        reference = {
            lever.path: float(lever.project_value)
            for lever in self.levers
            if isinstance(lever.project_value, (int, float)) and not isinstance(lever.project_value, bool)
        }
        fixed = {path: float(value) for path, value in combination.discrete.items() if path in reference}
        return Evaluator(
            plan,
            self.schemes,
            [lever.path for lever in self.continuous],
            nominal,
            drawn,
            self.confidence,
            reference,
            fixed,
        )

    def draws_of_project(self) -> tuple[Draws, list[str]]:
        """The Monte Carlo draws of the project as written (its distributions, the seed), drawn once."""
        if self.drawn is None:
            plan = make_plan(
                self.project, self.assessment, self.uncertainty or Uncertainty(), source=self.source, series=self.series
            )
            self.drawn = (draw(plan, self.draws, self.seed, self.sampling), list(plan.uncertainty.parameters))
        return self.drawn

    def share_rows(self, combination: Combination) -> tuple[np.ndarray, np.ndarray] | None:
        """(A, b): every source's rebalanced share as A x + b in the continuous levers' values x, with the
        combination's discrete shares set (affine: read at x = 0 and at each unit vector)."""
        paths = [lever.path for lever in self.continuous]
        if not any(is_share_path(path) for path in paths):
            return None
        shares = {name: s.share for name, s in self.project.electricity.sources.items()}
        fixed = {
            share_source(path): float(value) for path, value in combination.discrete.items() if is_share_path(path)
        }
        absorbers = {share_source(path): name for path, name in absorbers_of(self.levers).items()}

        def at(x: np.ndarray) -> np.ndarray:
            moved = {**fixed, **{share_source(path): x[j] for j, path in enumerate(paths) if is_share_path(path)}}
            return np.array(list(rebalanced_shares(shares, moved, absorbers).values()), dtype=float)

        offset = at(np.zeros(len(paths)))
        matrix = np.column_stack([at(row) - offset for row in np.eye(len(paths))])
        low, high = (
            np.array([piece.low for piece in combination.pieces]),
            np.array([piece.high for piece in combination.pieces]),
        )
        if (offset + np.minimum(matrix * low, matrix * high).sum(axis=1) >= 0).all():
            return None  # no share can fall below 0 anywhere in the ranges: no constraint needed
        return matrix, offset

    def start(self, problem: Continuous) -> np.ndarray:
        """The project's own values of the continuous levers, scaled (clipped into each piece)."""
        return problem.z_of([float(lever.project_value) for lever in self.continuous])

    def least_cost(self, combination: Combination) -> Found | None:
        """The cheapest qualifying values of the continuous levers with this combination, or None."""
        evaluator = self.evaluator(combination)
        label = _label(combination.discrete)
        if evaluator.blocked:
            self.blocked[label] = evaluator.blocked
            return None
        self.solved += 1
        if not self.continuous:
            ok, p, se = evaluator.qualifies(np.zeros(0))
            margin = float(np.min(evaluator.constraint(np.zeros((1, 0)))[0]))
            return Found(dict(combination.discrete), combination.discrete_cost, ok, margin, p, se) if ok else None
        problem = Continuous(evaluator, self.continuous, combination.pieces, self.share_rows(combination))
        start = self.start(problem)
        iterations = 0
        central = None
        if evaluator.drawn is not None:  # start the draws' search from the answer at the central value
            central = Continuous(evaluator.central(), self.continuous, combination.pieces, problem.shares)
            guess, result = central.least_cost(start)
            iterations += int(result.nit)
            start = guess if np.min(central.g(guess)) >= 0 else start
        z, result = problem.least_cost(start)
        iterations += int(result.nit)
        if not evaluator.qualifies(problem.x(z))[0]:
            if central is not None:  # the draws' largest margin is searched from the central one
                start, _, result = central.best_margin(start)
                iterations += int(result.nit)
            best, margin, extra = problem.best_margin(start)
            iterations += int(extra.nit)
            if margin < 0:
                self.iterations += iterations
                return None
            z2, result2 = problem.least_cost(best)
            iterations += int(result2.nit)
            z = problem.repair(z2, best)
        self.iterations += iterations
        if z is None:
            return None
        ok, p, se = evaluator.qualifies(problem.x(z))
        if not ok:
            return None
        values = {
            **combination.discrete,
            **{lever.path: float(v) for lever, v in zip(self.continuous, problem.x(z), strict=True)},
        }
        margin = float(np.min(problem.g(z)))
        return Found(values, combination.discrete_cost + problem.cost(z), True, margin, p, se, iterations)

    def best_margin(self, combination: Combination, budget: float | None = None) -> Found | None:
        """The largest smallest margin with this combination (within a total budget when given)."""
        evaluator = self.evaluator(combination)
        if evaluator.blocked:
            return None
        if budget is not None and combination.discrete_cost > budget + 1e-9 * max(1.0, abs(budget)):
            return None
        if not self.continuous:
            margin = float(np.min(evaluator.constraint(np.zeros((1, 0)))[0]))
            ok, p, se = evaluator.qualifies(np.zeros(0))
            return Found(dict(combination.discrete), combination.discrete_cost, ok, margin, p, se)
        problem = Continuous(evaluator, self.continuous, combination.pieces, self.share_rows(combination))
        start = self.start(problem)
        if (
            budget is not None
        ):  # start from the cheapest point of each piece, which any budget that admits the piece affords
            start = problem.z_of(
                [min((piece.low, piece.high, *_kinks(piece)), key=piece.cost) for piece in combination.pieces]
            )
            if combination.discrete_cost + problem.cost(start) > budget + 1e-9 * max(1.0, abs(budget)):
                return None
        allowed = None if budget is None else budget - combination.discrete_cost
        iterations = 200
        if evaluator.drawn is not None:  # start from the central answer; a front point with draws gets FRONT_ITERATIONS
            central = Continuous(evaluator.central(), self.continuous, combination.pieces, problem.shares)
            start, _, result = central.best_margin(start, allowed)
            self.iterations += int(result.nit)
            iterations = FRONT_ITERATIONS if budget is not None else iterations
        z, margin, result = problem.best_margin(start, allowed, iterations)
        self.iterations += int(result.nit)
        ok, p, se = evaluator.qualifies(problem.x(z))
        values = {
            **combination.discrete,
            **{lever.path: float(v) for lever, v in zip(self.continuous, problem.x(z), strict=True)},
        }
        found = Found(values, combination.discrete_cost + problem.cost(z), ok, margin, p, se)
        found.note = self.binding(problem, z)
        return found

    def largest_margin(self, combination: Combination) -> Found | None:
        """The largest smallest margin of a combination within the ranges, whatever the cost (kept)."""
        key = (_label(combination.discrete), tuple((piece.low, piece.high) for piece in combination.pieces))
        if key not in self.largest:
            self.largest[key] = self.best_margin(combination)
        return self.largest[key]

    def binding(self, problem: Continuous, z: np.ndarray) -> str:
        """The continuous lever at a bound of its range whose widening raises the margin most (per unit of its
        range)."""
        values, jacobian = problem.g_jacobian(z)
        gain = jacobian[int(np.argmin(values))]
        best, lever_found = 0.0, ""
        for j, lever in enumerate(self.continuous):
            at_low, at_high = z[j] <= 1e-6, z[j] >= 1 - 1e-6
            outward = -gain[j] if at_low else gain[j] if at_high else 0.0
            if (at_low or at_high) and outward > best:
                best, lever_found = outward, lever.path
        return lever_found


def _label(values: dict) -> str:
    return ", ".join(f"{path}={value}" for path, value in values.items()) or "the continuous levers"


def _plain(value):
    if isinstance(value, dict):
        return {key: _plain(item) for key, item in value.items() if item is not None}
    if isinstance(value, np.generic):
        return value.item()
    if isinstance(value, np.ndarray) and value.ndim == 0:
        return value.item()
    return value


def _flat(value, prefix: str = "") -> dict[str, Any]:
    if isinstance(value, dict):
        found = {}
        for key, item in value.items():
            found.update(_flat(item, f"{prefix}{path_key(str(key))}."))
        return found
    return {prefix[:-1]: value}


def set_text(path: str, value) -> str:
    """A ``--set`` string that gives the parameter exactly this value."""
    if isinstance(value, bool):
        return f"{path}={'true' if value else 'false'}"
    if isinstance(value, (int, float)):
        return f"{path}={float(value)!r}" if isinstance(value, float) else f"{path}={value}"
    if hasattr(value, "isoformat"):
        return f"{path}={value.isoformat()}"
    return f'{path}="{value}"' if '"' not in str(value) else f"{path}={value}"


def score_back_set(original, final) -> list[str]:
    """The ``--set`` strings that turn the project as written into the project with the levers' values."""
    before, after = _flat(_plain(original.model_dump())), _flat(_plain(final.model_dump()))
    return [set_text(path, value) for path, value in after.items() if path not in before or before[path] != value]


# --- the result -------------------------------------------------------------------------------


class LeverChange(BaseModel):
    parameter: str
    unit: str
    project_value: Any
    value: Any
    cost: float
    kind: str  # continuous | discrete
    range: list[Any]


class CheckAtAnswer(BaseModel):
    scheme: str
    status: str
    value: float
    limit: float
    unit: str
    margin: float
    probability: float | None = None
    standard_error: float | None = None


class FrontPoint(BaseModel):
    budget: float
    total_cost: float
    margin: float  # smallest relative margin (limit - value) / |limit| over the schemes
    qualifies: bool
    probability: float | None = None
    levers: dict[str, Any]


class QualifyResult(BaseModel):
    carbonledger_version: str
    caution: str
    from_memory: bool
    project: str
    project_file: str
    levers_file: str
    schemes: list[str]
    year: int | None
    confidence: float | None
    draws: int | None
    seed: int | None
    status: str  # qualifies | no_solution
    total_cost: float | None
    currency: str
    cost_unit: str
    prices_invented: bool
    levers: dict[str, Any]
    changes: list[LeverChange]
    checks: list[CheckAtAnswer]
    probability: float | None = None
    standard_error: float | None = None
    score_back_set: list[str]
    best_margin: float | None = None
    binding_lever: str | None = None
    reason: str = ""
    solver: dict[str, Any]
    front: list[FrontPoint]
    notes: list[str]
    operation: dict[str, Any] | None = None  # the operation lever: the plan's figures, objective, solver and tolerance

    def summary_for_ledger(self) -> dict:
        """The compact figures the run ledger keeps of a qualify search."""
        what = (
            f"at {self.confidence:.0%} confidence over {self.draws:,} draws"
            if self.confidence is not None
            else "at the central value"
        )
        if self.status == "qualifies":
            changed = (
                "; ".join(f"{c.parameter} = {c.value}" for c in self.changes if c.value != c.project_value)
                or "no change"
            )
            headline = (
                f"qualify for {', '.join(self.schemes)} {what}: {self.total_cost:,.6g} {self.cost_unit} ({changed})"
            )
        else:
            reached = f"best margin {self.best_margin:.4g}" if self.best_margin is not None else "no margin reached"
            headline = (
                f"qualify for {', '.join(self.schemes)} {what}: no solution within the levers' ranges ({reached}, "
                f"binding {self.binding_lever or 'none'})"
            )
        return {
            "analysis": "qualify",
            "headline": headline,
            "status": self.status,
            "schemes": self.schemes,
            "total_cost": self.total_cost,
            "cost_unit": self.cost_unit,
            "levers": self.levers,
            "probability": self.probability,
            "score_back_set": self.score_back_set,
        }


def _search(search, combinations) -> tuple:
    """(least-cost answer or None, largest-margin answer when none qualifies, its project, its checks, notes):
    combinations cheapest lower bound first, pruned by the best cost found (branch and bound), every answer
    scored back by the one judgement."""
    best: Found | None = None
    for combination in combinations:
        if best is not None and combination.lower_bound() >= best.cost - 1e-12 * max(1.0, abs(best.cost)):
            search.pruned += 1
            continue
        found = search.least_cost(combination)
        if found is not None and (best is None or found.cost < best.cost):
            best = found
    notes: list[str] = []
    checks: list[CheckAtAnswer] = []
    final = reached = None
    if best is not None:
        final = search.with_values(best.values)
        checks, ok = _checks(search, final, best)
        if not ok:
            notes.append(
                "the least-cost answer on the draws' path did not qualify when scored back ("
                + "; ".join(f"{c.scheme}: {c.status.replace('_', ' ')}" for c in checks)
                + "); it is not reported"
            )
            best = None
    if best is None:
        for combination in combinations:
            found = search.largest_margin(combination)
            if found is not None and (reached is None or found.margin > reached.margin):
                reached = found
        if reached is not None:
            final = search.with_values(reached.values)
            checks, _ = _checks(search, final, reached)
    for label, blocked in search.blocked.items():
        notes.append(
            f"{label}: "
            + "; ".join(
                f"{scheme} is {status.replace('_', ' ')} whatever the value (its rules, read before the threshold, "
                "decide)"
                for scheme, status in blocked.items()
            )
        )
    return best, reached, final, checks, notes


def _changes(search, values: dict) -> list:
    """Each lever's value and cost at the answer (the project's value where the answer leaves it)."""
    return [
        LeverChange(
            parameter=lever.path,
            unit=lever.unit,
            project_value=lever.project_value,
            value=values.get(lever.path, lever.project_value),
            cost=lever.cost(values[lever.path]) if lever.path in values else 0.0,
            kind="continuous" if lever.continuous else "discrete",
            range=list(lever.lever.range) if lever.continuous else list(lever.choices),
        )
        for lever in search.levers
    ]


def _no_solution_reason(best, reached) -> str:
    if best is not None:
        return ""
    if reached is None:
        return "no combination of lever values can qualify: every one is blocked by a rule read before the threshold"
    return f"no lever values within the ranges qualify; the best smallest margin reached is {reached.margin:.4g}" + (
        f", with {reached.note} at a bound of its range" if reached.note else ""
    )


def check_confidence(confidence: float | None) -> None:
    """A confidence is a probability strictly between 0 and 1 (None: the central value)."""
    if confidence is not None and not 0 < confidence < 1:
        raise InputError("--confidence", str(confidence), "a probability strictly between 0 and 1")


def _solver(search, combinations, confidence, seed) -> dict:
    """How the answer was found: the solvers, their tolerances and the work done."""
    return {
        "continuous": SOLVER if search.continuous else "none",
        "tolerance": SOLVER_TOLERANCE,
        "margin_tolerance": MARGIN_TOLERANCE,
        "discrete": "enumeration, cheapest lower bound first, with branch and bound"
        if search.discrete or len(combinations) > 1
        else "none",
        "combinations": len(combinations),
        "solved": search.solved,
        "pruned": search.pruned,
        "iterations": search.iterations,
        "stacked_solves": sum(evaluator.calls for evaluator in search.evaluators.values()),
        "constraint": "every scheme's status is qualifies at the central value"
        if confidence is None
        else f"every scheme qualifies in at least {confidence:.6g} of the draws (common random numbers, seed {seed})",
    }


def qualify(
    project,
    assessment: Assessment,
    levers: Levers,
    *,
    source: str = "project",
    levers_source: str = "levers",
    confidence: float | None = None,
    draws: int = 2000,
    seed: int = 0,
    sampling: str | None = None,
    uncertainty: Uncertainty | None = None,
    series=None,
    budgets: int = FRONT_BUDGETS,
    original=None,
) -> QualifyResult:
    """The least-cost lever values with which every scheme of the assessment qualifies (on its factor set,
    GWP set, boundary and year).

    project : the validated project (``original``: the project as written, for the score-back set;
        default ``project``). The levers file's ``[sources]`` are added here at share 0.
    confidence : None for the central value; else the share of Monte Carlo draws (``draws``,
        ``seed``, ``sampling``; ``uncertainty``: the distributions) in which every scheme must qualify.
    budgets : points of the cost/margin front (0: none).
    """
    check_confidence(confidence)
    if confidence is not None and draws < 2:
        raise InputError("--draws", str(draws), "at least 2 draws")
    schemes = assessment.scheme_list
    if not schemes:
        raise InputError("--scheme", "", "at least one scheme id (or `schemes` in the levers file)")
    original = original or project
    project = with_sources(project, levers, levers_source)
    chosen = select_schemes(rulebooks(), schemes, project.project.product)
    assessment = assessment.but(schemes=tuple(s.id for s in chosen))
    search = Search(
        project,
        assessment,
        resolve_levers(project, levers, levers_source),
        chosen,
        source,
        levers_source,
        confidence,
        draws,
        seed,
        sampling,
        uncertainty,
        series,
    )
    combinations = search.combinations()
    if levers.operation is not None:
        check_operation(search, levers, combinations)
        *found, operation = _operation_search(search, combinations, *levers.operation)
        front: list[FrontPoint] = []
    else:
        found, operation = _search(search, combinations), None
        front = _front(search, combinations, found[0], budgets)
    return _result(search, levers, combinations, original, tuple(found), front, operation)


def _result(
    search: Search,
    levers: Levers,
    combinations: list[Combination],
    original,
    found: tuple,
    front: list[FrontPoint],
    operation: dict | None,
) -> QualifyResult:
    """The result of a search: ``found`` is (least-cost answer, largest-margin answer, its project, its checks,
    notes)."""
    best, reached, final, checks, notes = found
    confidence, chosen, uncertainty = search.confidence, search.schemes, search.uncertainty
    if levers.invented:
        notes.append(f"every price in {search.levers_source} is invented for the demonstration")
    if confidence is not None and any(
        lever.path in (uncertainty.parameters if uncertainty else {}) for lever in search.levers
    ):
        notes.append(
            "a lever on a parameter with a distribution moves its draws with it (each draw times lever value / project "
            "value)"
        )
    answer = best or reached
    values = answer.values if answer else {}
    solver = _solver(search, combinations, confidence, search.seed)
    if operation is not None:
        solver["operation"] = (
            f"{operation['solver']}; primal feasibility tolerance {operation['primal_feasibility_tolerance']:g}, "
            f"emissions cap {operation['cap_inside_limit']:g} (relative) inside the limit"
        )
    return QualifyResult(
        carbonledger_version=__version__,
        caution=CAUTION,
        from_memory=any(s.from_memory or any(t.from_memory for t in s.thresholds) for s in chosen),
        project=search.project.project.name,
        project_file=search.source,
        levers_file=search.levers_source,
        schemes=[s.id for s in chosen],
        year=search.assessment.year,
        confidence=confidence,
        draws=search.draws if confidence is not None else None,
        seed=search.seed if confidence is not None else None,
        status="qualifies" if best is not None else "no_solution",
        total_cost=best.cost if best is not None else None,
        currency=levers.currency,
        cost_unit=levers.cost_unit,
        prices_invented=levers.invented,
        levers=values if best is not None else {},
        changes=_changes(search, values) + ([_operation_change(operation, levers)] if operation is not None else []),
        checks=checks,
        probability=answer.probability if answer else None,
        standard_error=answer.standard_error if answer else None,
        score_back_set=score_back_set(original, final) if best is not None and final is not None else [],
        best_margin=answer.margin if answer else None,
        binding_lever=(reached.note or None) if best is None and reached is not None else None,
        reason=_no_solution_reason(best, reached)
        if levers.operation is None or best is not None
        else "no combination of the levers has an operation that qualifies: the plan's linear program finds none",
        solver=solver,
        front=front,
        notes=notes,
        operation=operation,
    )


MAX_OPERATION_COMBINATIONS = 64  # each combination is one plan: a linear program over every interval of the series


def check_operation(search: Search, levers: Levers, combinations: list[Combination]) -> None:
    """An operation lever needs a time series, one scheme, the central value and discrete other levers."""
    index, _ = levers.operation
    where = _where(index, "kind")
    if search.series is None:
        raise InputError(
            search.levers_source,
            where,
            "an operation lever on a project with an electricity time series (electricity.time_series in the project "
            "file): the plan's linear program decides the load in each interval of it",
        )
    if len(search.schemes) != 1:
        raise InputError(
            search.levers_source,
            where,
            "one scheme with an operation lever (the plan keeps one scheme's check qualifying), got "
            f"{', '.join(s.id for s in search.schemes)}",
        )
    if search.confidence is not None:
        raise InputError(
            "--confidence",
            str(search.confidence),
            "no confidence with an operation lever (the plan's linear program works at the central value)",
        )
    for lever in search.continuous:
        raise InputError(
            search.levers_source,
            _where(lever.index, "range"),
            "a step with an operation lever (the other levers are enumerated, and each combination's operation "
            "planned)",
        )
    if len(combinations) > MAX_OPERATION_COMBINATIONS:
        raise InputError(
            search.levers_source,
            "levers",
            f"at most {MAX_OPERATION_COMBINATIONS} combinations of discrete values with an operation lever (each is a "
            f"linear program over the series), got {len(combinations)}",
        )


def _operation_search(search: Search, combinations: list[Combination], index: int, lever: Lever) -> tuple:
    """Every combination of the discrete levers with its least-cost operation (``analyses.operation``); the
    cheapest that qualifies, scored back with the plan's load as the series. Returns the tuple of ``_search``
    and the operation's summary."""
    best = None
    for combination in combinations:
        project = search.with_values(combination.discrete) if combination.discrete else search.project
        found = plan_operation(
            project,
            search.assessment.factor_set,
            search.series,
            search.schemes[0].id,
            lever,
            source=search.source,
            gwp=search.assessment.gwp,
            year=search.assessment.year,
            where=(search.levers_source, _where(index, "kind")),
        )
        search.solved += 1
        if found is not None and (best is None or combination.discrete_cost + found.cost < best[2]):
            best = (combination, found, combination.discrete_cost + found.cost)
    if best is None:
        return (
            None,
            None,
            None,
            [],
            [
                f"no operation of any combination of the levers qualifies for {search.schemes[0].id}: the plan's "
                "linear program finds none"
            ],
            None,
        )
    combination, operation, cost = best
    final = search.with_values(combination.discrete) if combination.discrete else search.project
    checks, ok = _checks(
        replace(search, series=planned_series(search.series, operation.plan)), final, Found({}, cost, True, 0.0)
    )
    margin = min((c.limit - c.value) / abs(c.limit) for c in checks)
    summary = operation_summary(operation, lever, search.series)
    if not ok:
        notes = [
            "the least-cost operation did not qualify when scored back with the plan's load ("
            + "; ".join(f"{c.scheme}: {c.status.replace('_', ' ')}" for c in checks)
            + "); it is not reported"
        ]
        return None, Found(dict(combination.discrete), cost, False, margin), final, checks, notes, summary
    notes = [
        f"the operation was planned by the linear program of `carbonledger plan` (HiGHS) for {summary['scheme']}: "
        f"{summary['hydrogen_kg']:,.0f} kg H2 against {summary['baseline_hydrogen_kg']:,.0f} at rated power in every "
        "interval; score it back with that plan's series (`carbonledger plan ... --output`)"
    ]
    return Found(dict(combination.discrete), cost, True, margin), None, final, checks, notes, summary


def _operation_change(operation: dict, levers: Levers) -> LeverChange:
    """The operation lever as a change: hydrogen made under the plan, against rated power in every interval."""
    return LeverChange(
        parameter="operation",
        unit="kg H2",
        project_value=operation["baseline_hydrogen_kg"],
        value=operation["hydrogen_kg"],
        cost=operation["cost"],
        kind="operation",
        range=[0.0, operation["baseline_hydrogen_kg"]],
    )


def with_sources(project, levers: Levers, levers_source: str):
    """The project with the levers file's new electricity sources at share 0, and its battery (capacity 0 unless
    given)."""
    if not levers.sources and not levers.battery:
        return project
    data = _plain(project.model_dump())
    for name, fields in levers.sources.items():
        if name in data["electricity"]["sources"]:
            raise InputError(levers_source, f"sources.{name}", f"a new source name (the project already has '{name}')")
        data = apply_overrides(
            data, [(f"electricity.sources.{path_key(name)}", {**copy.deepcopy(fields), "share": 0.0})], levers_source
        )
    if levers.battery:
        if data["electricity"].get("battery"):
            raise InputError(
                levers_source,
                "battery",
                "no battery table when the project has one (put a lever on electricity.battery.capacity_kwh)",
            )
        data["electricity"]["battery"] = {"capacity_kwh": 0.0, **copy.deepcopy(levers.battery)}
    try:
        return validate_project(data, levers_source)
    except InputError as error:
        raise InputError(
            levers_source,
            error.field.replace("electricity.sources.", "sources.", 1).replace("electricity.battery", "battery", 1),
            error.expected,
        ) from None


def _checks(search: Search, final, found: Found) -> tuple[list[CheckAtAnswer], bool]:
    """The named schemes' checks of the project at the answer, scored as ``score`` scores it, and
    whether it qualifies: every status ``qualifies`` at the central value; with a confidence, every
    scheme qualifying together in at least that share of the draws (``found`` takes that
    probability), and no scheme kept from qualifying by its rules at the answer."""
    result = assess(search.assessment, final, source=search.source, series=search.series)
    checks = [
        CheckAtAnswer(scheme=c.scheme, status=c.status, value=c.value, limit=c.limit, unit=c.unit, margin=c.margin)
        for c in result.checks
    ]
    if search.confidence is None:
        return checks, all(check.status == Status.QUALIFIES for check in checks)
    discrete = {lever.path for lever in search.discrete}
    evaluator = search.evaluator(
        Combination({path: value for path, value in found.values.items() if path in discrete}, [], 0.0)
    )
    point = np.array([found.values[path] for path in evaluator.paths], dtype=float)
    for item, hits in zip(checks, evaluator.scheme_probabilities(point), strict=True):
        item.probability, item.standard_error = hits.probability, hits.standard_error
    ok, found.probability, found.standard_error = evaluator.qualifies(point)
    return checks, ok and not any(check.status in (Status.NOT_ELIGIBLE, Status.UNDETERMINED) for check in checks)


def _front(search: Search, combinations: list[Combination], best: Found | None, budgets: int) -> list[FrontPoint]:
    """The best margin (and probability) reached for a sweep of budgets."""
    if budgets <= 0:
        return []
    if best is not None and best.cost > 0:
        top = 1.5 * best.cost
    else:
        top = sum(
            max(max(piece.cost(piece.low), piece.cost(piece.high)) for piece in lever.pieces)
            for lever in search.continuous
        )
        top = max(0.0, top + sum(max(lever.choice_costs) for lever in search.discrete))
    sweep = sorted(set(np.linspace(0.0, top, budgets).tolist() + ([best.cost] if best is not None else [])))
    unbounded = [(combination, search.largest_margin(combination)) for combination in combinations]
    unbounded = sorted([(c, found) for c, found in unbounded if found is not None], key=lambda item: -item[1].margin)
    points = []
    for budget in sweep:
        reached = None
        for combination, largest in unbounded:  # the largest margin without a budget bounds the margin within one
            if reached is not None and largest.margin <= reached.margin:
                break
            if combination.discrete_cost > budget + 1e-9 * max(1.0, abs(budget)):
                continue
            found = largest if largest.cost <= budget else search.best_margin(combination, budget)
            if found is not None and (reached is None or found.margin > reached.margin):
                reached = found
        if reached is not None:
            points.append(
                FrontPoint(
                    budget=budget,
                    total_cost=reached.cost,
                    margin=reached.margin,
                    qualifies=reached.qualifies,
                    probability=reached.probability,
                    levers=reached.values,
                )
            )
    return points
