"""Operating plan: the electrolyser load, interval by interval, that maximises hydrogen while the project qualifies.

For one scheme and tier, a scheme's value is affine in the counted intensity c of the project's
electricity (kg CO2e/kWh, see ``matching``), so qualifying is a cap: c <= c_max, with
c_max = c_declared + (limit - value_declared) / k. Over the intervals of each calendar year of
the series this is linear in the load p_t and the matched energy m_P of each matching period P:

    sum_P [ cbar_P m_P + g_P (L_P - m_P) ] <= c_max sum_t p_t,   m_P <= L_P = sum_{t in P} p_t,   0 <= m_P <= G_P

where G_P is the eligible generation of the period, cbar_P its generation-weighted counted
intensity (zero for renewable sources under ``renewable_at_zero``) and g_P the grid intensity
charged on the period's unmatched energy. When a period is one interval, g_P is the interval's
grid intensity and the program is exact. For longer periods the matching charges each interval's
unmatched share at its own intensity, which is bilinear; the plan then fixes g_P at the plan's
own load-weighted intensity and repeats (a few passes), and tightens the cap if the plan scored
back with ``match`` still misses it.

The load is p_t in [min_load x rated, rated] when running and 0 when stopped (an on/off binary per
interval when the minimum stable load is above zero: a mixed-integer program, HiGHS through
``scipy.optimize.milp``). Hydrogen is p_t / (kWh/kg) or, with a part-load curve given as points
(load fraction, kWh/kg), the concave piecewise-linear output h_t <= a_j p_t + b_j on_t of every
segment j. The objective is hydrogen, or margin (hydrogen price x hydrogen - electricity price x
load) when prices are given.

With a part-load curve the plant's electricity per kg H2 is what the curve implies at the planned
loads, e = sum_t p_t / sum_t h_t, not the design value e_d (the project's kWh/kg): the
electricity per basis unit scales by e / e_d, so the scheme value is
value = value_declared + k (c e / e_d - c_declared). Qualifying is then
emissions <= c_max e_d sum_t h_t, still linear (hydrogen h_t replaces p_t / e_d on the right).
The curve's kWh/kg are of the load column (all the project's electricity per kg H2).

References
----------
.. [1] Huangfu, Q. and Hall, J. A. J. (2018). Parallelizing the dual revised simplex method.
   Mathematical Programming Computation 10, 119-142 (HiGHS).
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

import numpy as np

from ..core.assessment import Assessment
from ..core.scoring import assemble, judged, scheme_reading, solve_with_bw2calc
from ..errors import InputError
from ..model.statuses import Status
from ..routes import routes_of
from .electricity_series import ElectricitySeries
from .matching import (
    ElectricityModel,
    counted_intensity,
    electricity_model,
    match,
    period_labels,
    series_matched_periods,
)


@dataclass
class PlanResult:
    scheme: str
    tier: str
    limit: float
    unit: str
    granularity: str
    rated_kwh_per_interval: float
    load_kwh: np.ndarray
    hydrogen_kg: np.ndarray
    value: float  # scheme value of the plan, scored back through the matching
    matched_share: float
    baseline_hydrogen_kg: float  # running at rated power in every interval
    baseline_value: float
    baseline_matched_share: float
    qualifies: bool
    margin: float | None = None
    baseline_margin: float | None = None
    passes: int = 0
    notes: list[str] = field(default_factory=list)

    interval_minutes: int = 60
    design_kwh_per_kg_h2: float = 0.0  # the project's electricity per kg H2 (design)
    score_back: list[str] = field(default_factory=list)  # --set overrides that score the plan back at its own kWh/kg
    status: str = ""  # the verdict of the plan's value by the one judgement (core.scoring.judged), as score gives it
    deciding_reason: str = ""

    @property
    def kwh_per_kg_h2(self) -> float:
        """Electricity per kg H2 the plan implies (the part-load curve at the planned loads; else the design value)."""
        hydrogen = float(self.hydrogen_kg.sum())
        return float(self.load_kwh.sum()) / hydrogen if hydrogen > 0 else self.design_kwh_per_kg_h2

    @property
    def rated_kw(self) -> float:
        return self.rated_kwh_per_interval * 60.0 / self.interval_minutes

    @property
    def full_load_hours(self) -> float:
        """Hours at rated power that give the plan's electricity."""
        return float(self.load_kwh.sum()) / self.rated_kw

    @property
    def baseline_full_load_hours(self) -> float:
        return len(self.load_kwh) * self.interval_minutes / 60.0


def part_load_segments(
    points: list[tuple[float, float]], rated_kwh: float, through_origin: bool = False
) -> tuple[np.ndarray, np.ndarray, float]:
    """Slopes a_j (kg/kWh) and intercepts b_j (kg) of the hydrogen output through (load fraction, kWh/kg) points.

    Returns (a, b, least fraction). The output must be concave (falling marginal output), as a
    linear program needs; the points must reach full load (1.0). ``through_origin`` adds the
    segment from zero load to the first point (a plant that may run at any load).
    """
    if not all(np.isfinite(number) and number > 0 for point in points for number in point):
        raise InputError(
            "--part-load", str(points), "points FRACTION:KWH_PER_KG of positive finite numbers (no nan or inf)"
        )
    points = sorted(points)
    fractions = np.array([f for f, _ in points])
    if len(points) < 2 or fractions[-1] != 1.0 or fractions[0] <= 0 or (np.diff(fractions) <= 0).any():
        raise InputError(
            "--part-load", str(points), "two or more points FRACTION:KWH_PER_KG with fractions rising to 1.0"
        )
    kwh = fractions * rated_kwh
    kg = kwh / np.array([e for _, e in points])
    slopes = np.diff(kg) / np.diff(kwh)
    intercepts = kg[:-1] - slopes * kwh[:-1]
    if through_origin:
        slopes, intercepts = np.r_[kg[0] / kwh[0], slopes], np.r_[0.0, intercepts]
    if (np.diff(slopes) > 1e-12).any():
        hint = (
            " (from zero load; give --min-load at the first point if the plant cannot run below it)"
            if through_origin
            else ""
        )
        raise InputError(
            "--part-load", str(points), f"a concave output curve: marginal hydrogen per kWh falling as load rises{hint}"
        )
    return slopes, intercepts, float(fractions[0])


MAX_RATED_KW = 1e8  # 100 GW: above the electrolyser capacity of any country; a larger figure is a typing error

FULL_MIXED_INTEGER_UP_TO = 2000  # intervals; above, on/off is fixed from the linear relaxation first


def interior_point_lp(objective, constraints, lower, upper):
    """A linear program through HiGHS's interior-point method with crossover (a vertex optimum, as the
    simplex gives). With a part-load curve the hydrogen variables enter the yearly emissions cap and the
    dual simplex takes about five times longer on a year of hours."""
    from scipy import sparse
    from scipy.optimize import linprog

    matrix = sparse.csr_array(constraints.A)
    low, high = np.broadcast_to(constraints.lb, matrix.shape[:1]), np.broadcast_to(constraints.ub, matrix.shape[:1])
    equal = low == high
    above, below = np.isfinite(high) & ~equal, np.isfinite(low) & ~equal
    inequalities = sparse.vstack([matrix[above], -matrix[below]]).tocsr()
    equalities = {"A_eq": matrix[equal], "b_eq": low[equal]} if equal.any() else {}
    return linprog(
        objective,
        A_ub=inequalities,
        b_ub=np.r_[high[above], -low[below]],
        bounds=np.c_[lower, upper],
        method="highs-ipm",
        **equalities,
    )


def _relax_and_fix(
    objective, constraints, integrality, lower, upper, layout, least_kwh, time_limit_s, mip_gap, linear=None
):
    """Solve the linear relaxation, keep on/off where it runs at or above the minimum load (on) or not at
    all (off), and round the intervals it runs below the minimum load: all off, or all on at least at the
    minimum load, each repaired by a linear program; the better feasible one wins. The relaxation bounds
    the optimum, so the gap stated is an honest upper bound of what the rounding loses."""
    from scipy.optimize import Bounds, milp

    p0, on0, n = layout
    continuous = np.zeros_like(integrality)

    def solve_linear(low, high):
        if linear is not None:
            return linear(objective, constraints, low, high)
        return milp(objective, constraints=constraints, integrality=continuous, bounds=Bounds(low, high))

    relaxed = solve_linear(lower, upper)
    if relaxed.x is None:
        return relaxed, ""
    load = relaxed.x[p0 : p0 + n]
    on = load >= least_kwh * (1 - 1e-9)
    off = load <= 1e-9 * max(least_kwh, 1.0)
    between = ~(on | off)
    best = None
    for run_between in (False, True):
        low, high = lower.copy(), upper.copy()
        status = on | (between & run_between)
        low[on0 : on0 + n] = status.astype(float)
        high[on0 : on0 + n] = status.astype(float)
        trial = solve_linear(low, high)
        if trial.x is not None and (best is None or trial.fun < best.fun):
            best = trial
    if best is None:
        best = milp(
            objective,
            constraints=constraints,
            integrality=integrality,
            bounds=Bounds(lower, upper),
            options={"time_limit": time_limit_s, "mip_rel_gap": mip_gap},
        )
        if best.x is None:
            return best, ""
    gap = (best.fun - relaxed.fun) / abs(relaxed.fun) if relaxed.fun else 0.0
    return (
        best,
        f"on/off taken from the linear relaxation ({int(between.sum())} of {n} intervals rounded); within {gap:.3%} "
        "of the relaxation's bound",
    )


def check_plan_options(rated_kw: float, min_load: float, hydrogen_price: float | None) -> None:
    """Refuse options no plan can use (infinite or absurd rated power, nan), one InputError line each."""
    if not (np.isfinite(rated_kw) and 0 < rated_kw <= MAX_RATED_KW):
        raise InputError("--rated-kw", str(rated_kw), f"a rated power > 0 and <= {MAX_RATED_KW:g} kW")
    if not 0 <= min_load <= 1:
        raise InputError("--min-load", str(min_load), "a fraction of rated power from 0 to 1")
    if hydrogen_price is not None and not (np.isfinite(hydrogen_price) and 0 <= hydrogen_price <= 1e6):
        raise InputError(
            "--hydrogen-price", str(hydrogen_price), "a price per kg from 0 to 1e+06 (currency of the price column)"
        )


def _period_data(series: ElectricitySeries, supply: np.ndarray, labels: np.ndarray, counted: np.ndarray):
    starts = np.flatnonzero(np.r_[True, labels[1:] != labels[:-1]])
    supply_p = np.add.reduceat(supply, starts, axis=1) if supply.shape[0] else np.zeros((0, len(starts)))
    generation = supply_p.sum(axis=0)
    cbar = np.divide(counted @ supply_p, generation, out=np.zeros_like(generation), where=generation > 0)
    return starts, generation, cbar


@dataclass(frozen=True)
class Blocks:
    """Where each block of variables sits in the program's vector: the load p_t, the hydrogen h_t
    (with a part-load curve), the on/off binaries (with a minimum stable load) and the matched energy
    m_P of each period. An empty block has no columns."""

    load: slice
    hydrogen: slice
    on: slice
    matched: slice
    size: int

    @classmethod
    def of(cls, intervals: int, periods: int, curve: bool, binary: bool) -> Blocks:
        sizes = {
            "load": intervals,
            "hydrogen": intervals if curve else 0,
            "on": intervals if binary else 0,
            "matched": periods,
        }
        start, found = 0, {}
        for name, count in sizes.items():
            found[name] = slice(start, start + count)
            start += count
        return cls(**found, size=start)

    @staticmethod
    def columns(block: slice) -> np.ndarray:
        return np.arange(block.start, block.stop)


def _rows(terms: list[tuple[np.ndarray, np.ndarray]], rows: np.ndarray, size: int, count: int):
    """A sparse block of ``count`` rows: each term is (values, columns) along ``rows``."""
    from scipy import sparse

    values = np.concatenate([np.broadcast_to(v, c.shape) for v, c in terms])
    return sparse.csr_array(
        (values, (np.tile(rows, len(terms)), np.concatenate([c for _, c in terms]))), shape=(count, size)
    )


def _output_segments(
    part_load, rated: float, min_load: float, kwh_per_kg_h2: float
) -> tuple[np.ndarray, np.ndarray, bool]:
    """Slopes and intercepts of hydrogen per interval, and whether a part-load curve gives them."""
    if not part_load:
        return np.array([1.0 / kwh_per_kg_h2]), np.array([0.0]), False
    slopes, intercepts, least = part_load_segments(part_load, rated, through_origin=min_load == 0)
    if min_load > 0 and least > min_load + 1e-12:
        raise InputError(
            "--part-load", str(part_load), f"a first point at or below the minimum stable load {min_load:g}"
        )
    return slopes, intercepts, True


def _fixed_constraints(
    blocks: Blocks, labels: np.ndarray, periods: int, slopes, intercepts, curve: bool, rated: float, min_load: float
):
    """The rows that do not change between passes: hydrogen under each curve segment, the load within
    its on/off bounds, and the matched energy within the period's load. Returns (matrix, lower, upper)."""
    from scipy import sparse

    n = blocks.load.stop - blocks.load.start
    index = np.arange(n)
    load, hydrogen, on = blocks.columns(blocks.load), blocks.columns(blocks.hydrogen), blocks.columns(blocks.on)
    binary = len(on) > 0
    matrices, lower, upper = [], [], []

    def add(matrix, low, high):
        matrices.append(matrix)
        lower.append(np.broadcast_to(low, matrix.shape[:1]))
        upper.append(np.broadcast_to(high, matrix.shape[:1]))

    for a, b in zip(slopes, intercepts, strict=False) if curve else ():
        # h_t - a_j p_t - b_j on_t <= 0 (on_t = 1 without binaries: the constant moves to the bound)
        if binary:
            add(_rows([(1.0, hydrogen), (-a, load), (-b, on)], index, blocks.size, n), -np.inf, 0.0)
        else:
            add(_rows([(1.0, hydrogen), (-a, load)], index, blocks.size, n), -np.inf, b)
    if binary:  # min_load rated on_t <= p_t <= rated on_t
        add(_rows([(1.0, load), (-rated, on)], index, blocks.size, n), -np.inf, 0.0)
        add(_rows([(1.0, load), (-min_load * rated, on)], index, blocks.size, n), 0.0, np.inf)
    # matched within the period's load: m_P - sum_{t in P} p_t <= 0
    matched_rows = sparse.csr_array(
        (
            np.r_[np.ones(periods), -np.ones(n)],
            (np.r_[np.arange(periods), labels], np.r_[blocks.columns(blocks.matched), load]),
        ),
        shape=(periods, blocks.size),
    )
    add(matched_rows, -np.inf, 0.0)
    return sparse.vstack(matrices).tocsr(), np.concatenate(lower), np.concatenate(upper)


def _objective(
    blocks: Blocks, series: ElectricitySeries, hydrogen_price: float | None, slopes, curve: bool
) -> np.ndarray:
    """Minimised: minus hydrogen, or minus margin (hydrogen price x hydrogen - electricity price x load)."""
    objective = np.zeros(blocks.size)
    if hydrogen_price is not None:
        if series.price_per_mwh is None:
            raise InputError(
                "--hydrogen-price",
                str(hydrogen_price),
                "a series with a 'price [<currency>/MWh]' column to weigh margin",
            )
        objective[blocks.load] = series.price_per_mwh / 1000.0
        if curve:
            objective[blocks.hydrogen] = -hydrogen_price
        else:
            objective[blocks.load] -= hydrogen_price * slopes[0]
    elif curve:
        objective[blocks.hydrogen] = -1.0
    else:
        objective[blocks.load] = -slopes[0]
    return objective


@dataclass
class _Program:
    """The operating plan's program: everything but the yearly emission rows, which each pass redoes."""

    blocks: Blocks
    fixed: Any
    fixed_lower: np.ndarray
    fixed_upper: np.ndarray
    objective: np.ndarray
    lower: np.ndarray
    upper: np.ndarray
    integrality: np.ndarray
    labels: np.ndarray
    starts: np.ndarray
    cbar: np.ndarray
    year_of: np.ndarray
    years: int
    curve: bool
    binary: bool
    design: float
    least_kwh: float

    def year_rows(self, charge: np.ndarray, cap: float):
        """Emissions of each year: sum_P (cbar_P - g_P) m_P + sum_t (g_P(t) - cap) p_t <= 0; with a curve the
        cap applies to hydrogen: sum_t g_P(t) p_t - cap e_d sum_t h_t (see the module text)."""
        from scipy import sparse

        blocks, n = self.blocks, len(self.labels)
        matched = blocks.columns(blocks.matched)
        if self.curve:
            entries = np.r_[charge[self.labels], -cap * self.design * np.ones(n), self.cbar - charge]
            rows, columns = (
                np.r_[self.year_of, self.year_of, self.year_of[self.starts]],
                np.r_[blocks.columns(blocks.load), blocks.columns(blocks.hydrogen), matched],
            )
        else:
            entries = np.r_[charge[self.labels] - cap, self.cbar - charge]
            rows, columns = np.r_[self.year_of, self.year_of[self.starts]], np.r_[blocks.columns(blocks.load), matched]
        return sparse.csr_array((entries, (rows, columns)), shape=(self.years, blocks.size))

    def solve(self, charge: np.ndarray, cap: float, time_limit_s: float, mip_gap: float):
        """One pass: (solution, note on how on/off was decided)."""
        from scipy import sparse
        from scipy.optimize import Bounds, LinearConstraint, milp

        matrix = sparse.vstack([self.fixed, self.year_rows(charge, cap)]).tocsr()
        constraints = LinearConstraint(
            matrix, np.r_[self.fixed_lower, np.full(self.years, -np.inf)], np.r_[self.fixed_upper, np.zeros(self.years)]
        )
        n = len(self.labels)
        if self.binary and n > FULL_MIXED_INTEGER_UP_TO:
            layout = (self.blocks.load.start, self.blocks.on.start, n)
            return _relax_and_fix(
                self.objective,
                constraints,
                self.integrality,
                self.lower,
                self.upper,
                layout,
                self.least_kwh,
                time_limit_s,
                mip_gap,
                interior_point_lp if self.curve else None,
            )
        if self.curve and not self.binary:
            return interior_point_lp(self.objective, constraints, self.lower, self.upper), ""
        limits = {"time_limit": time_limit_s, "mip_rel_gap": mip_gap} if self.binary else {}
        return milp(
            self.objective,
            constraints=constraints,
            integrality=self.integrality,
            bounds=Bounds(self.lower, self.upper),
            options=limits,
        ), ""


def _program(
    series: ElectricitySeries,
    model: ElectricityModel,
    rule,
    labels,
    eligible,
    rated: float,
    min_load: float,
    part_load,
    hydrogen_price,
) -> tuple[_Program, np.ndarray, np.ndarray]:
    """The program of a plan, with the output segments (slopes, intercepts) it uses."""
    n = series.intervals
    supply = np.array([series.generation_kwh[s] for s in eligible]).reshape(len(eligible), n)
    counted = np.array([model.counted_kg_per_kwh[s] for s in eligible])
    starts, generation, cbar = _period_data(series, supply, labels, counted)
    slopes, intercepts, curve = _output_segments(part_load, rated, min_load, model.kwh_per_kg_h2)
    binary = min_load > 0
    blocks = Blocks.of(n, len(starts), curve, binary)
    fixed, fixed_lower, fixed_upper = _fixed_constraints(
        blocks, labels, len(starts), slopes, intercepts, curve, rated, min_load
    )
    upper = np.zeros(blocks.size)
    upper[blocks.load], upper[blocks.hydrogen], upper[blocks.on], upper[blocks.matched] = rated, np.inf, 1.0, generation
    integrality = np.zeros(blocks.size)
    integrality[blocks.on] = 1
    years = series.local.astype("datetime64[Y]").astype(np.int64)
    year_values, year_of = np.unique(years, return_inverse=True)
    program = _Program(
        blocks,
        fixed,
        fixed_lower,
        fixed_upper,
        _objective(blocks, series, hydrogen_price, slopes, curve),
        np.zeros(blocks.size),
        upper,
        integrality,
        labels,
        starts,
        cbar,
        year_of,
        len(year_values),
        curve,
        binary,
        model.kwh_per_kg_h2,
        min_load * rated,
    )
    return program, slopes, intercepts


def _hydrogen_output(slopes, intercepts):
    """Hydrogen (kg) per interval at given loads: the curve (on from any load above zero), or load / design kWh/kg."""

    def output(load: np.ndarray) -> np.ndarray:
        return np.clip(
            np.minimum.reduce([a * load + b * (load > 0) for a, b in zip(slopes, intercepts, strict=False)]), 0, None
        )

    return output


def plan_load(
    series: ElectricitySeries,
    model: ElectricityModel,
    scheme,
    *,
    value_declared: float,
    limit: float,
    inclusive: bool = True,
    rated_kw: float,
    min_load: float = 0.0,
    part_load: list[tuple[float, float]] | None = None,
    hydrogen_price: float | None = None,
    granularity: str | None = None,
    time_limit_s: float = 8.0,
    mip_gap: float = 1e-3,
) -> PlanResult:
    """Solve the operating plan (see the module text); returns loads, hydrogen and the scored-back value."""
    check_plan_options(rated_kw, min_load, hydrogen_price)
    rated = rated_kw * series.interval_minutes / 60.0  # kWh per interval at rated power
    rule = model.granularity if granularity is None else granularity
    labels = period_labels(series.utc, series.local, rule)
    eligible = [name for name in model.eligible if name in series.generation_kwh]
    slope = model.value_per_total * model.basis_kwh
    if slope <= 0:
        raise InputError("--scheme", scheme.id, "a scheme whose value depends on the project's electricity")
    cap_at_limit = model.declared_kg_per_kwh + (limit - value_declared) / slope
    program, slopes, intercepts = _program(
        series, model, rule, labels, eligible, rated, min_load, part_load, hydrogen_price
    )
    output = _hydrogen_output(slopes, intercepts)
    scorer = _Scorer(series, model, eligible, rule, output, program.curve)
    load, passes, notes = _plan_passes(program, scorer, series, scheme.id, cap_at_limit, time_limit_s, mip_gap)
    if not load.sum() > 0:
        reason = (
            "no interval runs at a positive margin under the limit"
            if hydrogen_price is not None
            else "the limit is out of reach at any load"
        )
        raise InputError(
            "plan", scheme.id, f"a plan that makes hydrogen and qualifies; the best plan runs no interval ({reason})"
        )
    hydrogen = output(load)

    def scheme_value(loads):
        intensity, share = scorer.intensity(loads)
        return value_declared + slope * (intensity - model.declared_kg_per_kwh), share

    value, share = scheme_value(load)
    full = np.full(series.intervals, rated)
    base_value, base_share = scheme_value(full)
    base_h2 = float(output(full).sum())
    margin = base_margin = None
    if hydrogen_price is not None:
        margin = float(hydrogen_price * hydrogen.sum() - series.price_per_mwh @ load / 1000.0)
        base_margin = float(hydrogen_price * base_h2 - series.price_per_mwh @ full / 1000.0)
    qualifies = value <= limit + 1e-9 * max(1.0, abs(limit)) if inclusive else value < limit
    name = granularity or (rule if isinstance(rule, str) else "dated rule")
    return PlanResult(
        scheme.id,
        "",
        limit,
        scheme.unit,
        name,
        rated,
        load,
        hydrogen,
        float(value),
        float(share),
        base_h2,
        float(base_value),
        float(base_share),
        bool(qualifies),
        margin,
        base_margin,
        passes,
        notes,
        series.interval_minutes,
        model.kwh_per_kg_h2,
    )


@dataclass
class _Scorer:
    """A plan's loads scored back through the matching, as ``score`` would."""

    series: ElectricitySeries
    model: ElectricityModel
    eligible: list[str]
    rule: Any
    output: Any
    curve: bool

    def scale(self, load: np.ndarray, hydrogen: np.ndarray) -> float:
        """e / e_d: the kWh/kg the loads imply over the design kWh/kg (1 without a curve)."""
        made = float(hydrogen.sum())
        return float(load.sum()) / made / self.model.kwh_per_kg_h2 if self.curve and made > 0 else 1.0

    def intensity(self, load: np.ndarray, mask: np.ndarray | slice = slice(None)) -> tuple[float, float]:
        """Counted intensity of the plan's electricity over ``mask`` (kg CO2e/kWh, scaled by e / e_d) and the matched
        share."""
        scored = match(load, self.series.generation_kwh, self.eligible, self.rule, self.series.utc, self.series.local)
        counted = counted_intensity(scored, load, self.model, self.series.grid_g_co2e_per_kwh, mask)[3]
        return counted * self.scale(load[mask], self.output(load)[mask]), scored.matched_share


def _plan_passes(
    program: _Program,
    scorer: _Scorer,
    series: ElectricitySeries,
    scheme_id: str,
    cap_at_limit: float,
    time_limit_s: float,
    mip_gap: float,
):
    """Solve, score back each year through the matching, and repeat with the plan's own period grid
    intensities (and, from the third pass, a tighter cap) until every year meets the cap. Returns
    (load, passes, notes)."""
    n = series.intervals
    grid = (
        series.grid_g_co2e_per_kwh / 1000.0
        if series.grid_g_co2e_per_kwh is not None
        else np.full(n, scorer.model.grid_kg_per_kwh)
    )
    starts = program.starts
    cap = cap_at_limit - 1e-6 * max(
        abs(cap_at_limit), 0.1
    )  # a hair inside the limit: HiGHS meets constraints to about 1e-7
    period_grid = np.add.reduceat(grid, starts) / np.diff(np.r_[starts, n])  # first guess: plain mean per period
    single = np.diff(np.r_[starts, n]) == 1
    tightening, notes, gap_note, load, passes = 0.0, [], "", None, 0
    for passes in range(1, 9):
        solved, gap_note = program.solve(
            np.where(single, grid[starts], period_grid), cap - tightening, time_limit_s, mip_gap
        )
        if solved.x is None:
            raise InputError(
                "plan",
                scheme_id,
                f"a feasible plan ({solved.message}); the limit may be out of reach even at minimum stable load",
            )
        load = np.clip(solved.x[program.blocks.load], 0, program.upper[program.blocks.load])
        worst = max(
            (
                scorer.intensity(load, program.year_of == year)[0] - cap
                for year in range(program.years)
                if load[program.year_of == year].sum() > 0
            ),
            default=-np.inf,
        )
        if worst + cap <= cap_at_limit:
            break
        with np.errstate(invalid="ignore", divide="ignore"):
            load_p = np.add.reduceat(load, starts)
            weighted = np.add.reduceat(load * grid, starts)
            period_grid = np.where(load_p > 0, weighted / np.where(load_p > 0, load_p, 1), period_grid)
        if passes >= 3:
            tightening += max(worst, 0.0) * 1.05
    else:
        notes.append("the plan scored back still misses the cap after 8 passes")
    if gap_note:
        notes.append(gap_note)
    return load, passes, notes


def plan_project(
    project,
    assessment: Assessment,
    series: ElectricitySeries,
    scheme: str,
    *,
    source: str = "project",
    project_sha256: str = "",
    tier: str | None = None,
    rated_kw: float | None = None,
    min_load: float = 0.0,
    part_load: list[tuple[float, float]] | None = None,
    hydrogen_price: float | None = None,
) -> PlanResult:
    """The operating plan of a validated project against its series (``plan_load``), scored once with
    bw2calc for the declared value and judged by the one judgement (``core.scoring.judged``), under the
    assessment's factor set, GWP set, boundary, year and matching (a granularity replacing the scheme's
    temporal rule, or None for its dated rule); its schemes are replaced by ``scheme``.
    ``rated_kw`` None: the largest load in the series. Used by ``api.plan`` and by qualify's operation lever."""
    matching = assessment.matching
    prepared = assessment.but(schemes=(scheme,)).prepare(
        project, source=source, project_sha256=project_sha256, matched_periods=series_matched_periods(series)
    )
    solutions = solve_with_bw2calc(prepared)
    check = assemble(prepared, solutions).checks[0]
    rulebook = prepared.chosen[0]
    model = electricity_model(prepared, solutions, rulebook, list(series.generation_kwh))
    threshold = choose_threshold(rulebook, tier)
    if rated_kw is None:
        rated_kw = float(series.load(model.kwh_per_kg_h2).max()) * 60.0 / series.interval_minutes
    if not rated_kw > 0:
        raise InputError("--rated-kw", str(rated_kw), "a rated power > 0 kW (the series has no load to take it from)")
    if matching not in (None, "rule") and matching not in ("interval", "hour", "month", "quarter", "year"):
        raise InputError("--matching", matching, "one of rule, interval, hour, month, quarter, year")
    result = plan_load(
        series,
        model,
        rulebook,
        value_declared=check.value,
        limit=threshold.limit,
        inclusive=threshold.inclusive,
        rated_kw=rated_kw,
        min_load=min_load,
        part_load=part_load,
        hydrogen_price=hydrogen_price,
        granularity=None if matching in (None, "rule") else matching,
    )
    result.tier = threshold.tier
    verdict = judged(rulebook, result.value, scheme_reading(prepared, rulebook).findings)
    result.status, result.deciding_reason = verdict["status"], verdict["reasons"][0]
    result.qualifies = result.qualifies and result.status == Status.QUALIFIES
    if part_load:
        result.score_back = _score_back_overrides(project, model.kwh_per_kg_h2, result.kwh_per_kg_h2)
    return result


def _score_back_overrides(project, design_kwh_per_kg: float, planned_kwh_per_kg: float) -> list[str]:
    """The --set that scores a part-load plan back at the kWh/kg its curve implies: the hydrogen route's
    electricity parameter moved by the difference from the design (the rest of the electricity per kg stays)."""
    path = next((route.ageing for route in routes_of(project.model_dump()) if route.ageing), "")
    if not path:
        return []
    section, name = path.split(".")
    current = float(getattr(getattr(project, section), name))
    return [f"{path}={current + planned_kwh_per_kg - design_kwh_per_kg:.12g}"]


def choose_threshold(scheme, tier: str | None):
    """The threshold to plan for: the loosest, or the tier named (text contained in its name) or given by its limit."""
    if not tier:
        return scheme.loosest()
    try:
        by_limit = [t for t in scheme.thresholds if t.limit == float(tier)]
    except ValueError:
        by_limit = []
    named = by_limit or [t for t in scheme.thresholds if tier.lower() in t.tier.lower()]
    if len(named) == 1:
        return named[0]
    raise InputError(
        "--tier", tier, "one of " + "; ".join(f"'{t.tier}' (limit {t.limit:g})" for t in scheme.thresholds)
    )


def parse_part_load(text: str | None) -> list[tuple[float, float]] | None:
    """'0.2:58,0.5:52,1:54' -> [(0.2, 58.0), (0.5, 52.0), (1.0, 54.0)] (load fraction : kWh/kg)."""
    if not text:
        return None
    points = []
    for item in text.split(","):
        try:
            fraction, kwh = (float(part) for part in item.split(":"))
        except ValueError:
            raise InputError(
                "--part-load", text, "points FRACTION:KWH_PER_KG separated by commas, e.g. 0.2:58,0.5:52,1:54"
            ) from None
        points.append((fraction, kwh))
    return points


def plan_csv(series: ElectricitySeries, plan: PlanResult) -> str:
    """The plan as a time series CSV (the planned load in 'electrolyser [kWh]'), which ``score`` reads back."""
    import io

    import pandas as pd

    local = series.local
    stamps = [
        f"{str(t)[:16]}{'+' if o >= 0 else '-'}{abs(int(o)) // 60:02d}:{abs(int(o)) % 60:02d}"
        for t, o in zip(local, series.offset_minutes, strict=False)
    ]
    columns = {"timestamp": stamps, "electrolyser [kWh]": plan.load_kwh.round(6)}
    for name, values in series.generation_kwh.items():
        columns[f"generation.{name} [kWh]"] = values
    if series.grid_g_co2e_per_kwh is not None:
        columns["grid_intensity [g CO2e/kWh]"] = series.grid_g_co2e_per_kwh
    if series.price_per_mwh is not None:
        columns[f"price [{series.price_unit.split('/')[0].strip()}/MWh]"] = series.price_per_mwh
    buffer = io.StringIO()
    buffer.write(
        f"# operating plan for {plan.scheme} (limit {plan.limit:g} {plan.unit}, matching {plan.granularity}); hydrogen "
        f"{plan.hydrogen_kg.sum():.1f} kg at {plan.kwh_per_kg_h2:.6g} kWh/kg\n"
    )
    if plan.score_back:
        buffer.write(f"# score it back at the part-load curve's kWh/kg: --set {' --set '.join(plan.score_back)}\n")
    pd.DataFrame(columns).to_csv(buffer, index=False, lineterminator="\n")
    return buffer.getvalue()
