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

import numpy as np

from ..errors import InputError
from .electricity_series import ElectricitySeries
from .matching import ElectricityModel, counted_intensity, match, period_labels, scheme_granularity


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


def part_load_segments(points: list[tuple[float, float]], rated_kwh: float, through_origin: bool = False) -> tuple[np.ndarray, np.ndarray, float]:
    """Slopes a_j (kg/kWh) and intercepts b_j (kg) of the hydrogen output through (load fraction, kWh/kg) points.

    Returns (a, b, least fraction). The output must be concave (falling marginal output), as a
    linear program needs; the points must reach full load (1.0). ``through_origin`` adds the
    segment from zero load to the first point (a plant that may run at any load).
    """
    if not all(np.isfinite(number) and number > 0 for point in points for number in point):
        raise InputError("--part-load", str(points), "points FRACTION:KWH_PER_KG of positive finite numbers (no nan or inf)")
    points = sorted(points)
    fractions = np.array([f for f, _ in points])
    if len(points) < 2 or fractions[-1] != 1.0 or fractions[0] <= 0 or (np.diff(fractions) <= 0).any():
        raise InputError("--part-load", str(points), "two or more points FRACTION:KWH_PER_KG with fractions rising to 1.0")
    kwh = fractions * rated_kwh
    kg = kwh / np.array([e for _, e in points])
    slopes = np.diff(kg) / np.diff(kwh)
    intercepts = kg[:-1] - slopes * kwh[:-1]
    if through_origin:
        slopes, intercepts = np.r_[kg[0] / kwh[0], slopes], np.r_[0.0, intercepts]
    if (np.diff(slopes) > 1e-12).any():
        hint = " (from zero load; give --min-load at the first point if the plant cannot run below it)" if through_origin else ""
        raise InputError("--part-load", str(points), f"a concave output curve: marginal hydrogen per kWh falling as load rises{hint}")
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
    return linprog(objective, A_ub=inequalities, b_ub=np.r_[high[above], -low[below]], bounds=np.c_[lower, upper], method="highs-ipm", **equalities)


def _relax_and_fix(objective, constraints, integrality, lower, upper, layout, least_kwh, time_limit_s, mip_gap, linear=None):
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
        best = milp(objective, constraints=constraints, integrality=integrality, bounds=Bounds(lower, upper), options={"time_limit": time_limit_s, "mip_rel_gap": mip_gap})
        if best.x is None:
            return best, ""
    gap = (best.fun - relaxed.fun) / abs(relaxed.fun) if relaxed.fun else 0.0
    return best, f"on/off taken from the linear relaxation ({int(between.sum())} of {n} intervals rounded); within {gap:.3%} of the relaxation's bound"


def check_plan_options(rated_kw: float, min_load: float, hydrogen_price: float | None) -> None:
    """Refuse options no plan can use (infinite or absurd rated power, nan), one InputError line each."""
    if not (np.isfinite(rated_kw) and 0 < rated_kw <= MAX_RATED_KW):
        raise InputError("--rated-kw", str(rated_kw), f"a rated power > 0 and <= {MAX_RATED_KW:g} kW")
    if not 0 <= min_load <= 1:
        raise InputError("--min-load", str(min_load), "a fraction of rated power from 0 to 1")
    if hydrogen_price is not None and not (np.isfinite(hydrogen_price) and 0 <= hydrogen_price <= 1e6):
        raise InputError("--hydrogen-price", str(hydrogen_price), "a price per kg from 0 to 1e+06 (currency of the price column)")


def _period_data(series: ElectricitySeries, supply: np.ndarray, labels: np.ndarray, counted: np.ndarray):
    starts = np.flatnonzero(np.r_[True, labels[1:] != labels[:-1]])
    supply_p = np.add.reduceat(supply, starts, axis=1) if supply.shape[0] else np.zeros((0, len(starts)))
    generation = supply_p.sum(axis=0)
    cbar = np.divide(counted @ supply_p, generation, out=np.zeros_like(generation), where=generation > 0)
    return starts, generation, cbar


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
    from scipy import sparse
    from scipy.optimize import Bounds, LinearConstraint, milp

    check_plan_options(rated_kw, min_load, hydrogen_price)
    n = series.intervals
    hours = series.interval_minutes / 60.0
    rated = rated_kw * hours  # kWh per interval at rated power
    local = series.local
    rule = scheme_granularity(scheme.id, local) if granularity is None else granularity
    labels = period_labels(series.utc, local, rule)
    eligible = [name for name in model.eligible if name in series.generation_kwh]
    supply = np.array([series.generation_kwh[s] for s in eligible]).reshape(len(eligible), n)
    counted = np.array([model.counted_kg_per_kwh[s] for s in eligible])
    starts, generation, cbar = _period_data(series, supply, labels, counted)
    periods = len(starts)
    grid = series.grid_g_co2e_per_kwh / 1000.0 if series.grid_g_co2e_per_kwh is not None else np.full(n, model.grid_kg_per_kwh)
    slope = model.value_per_total * model.basis_kwh
    if slope <= 0:
        raise InputError("--scheme", scheme.id, "a scheme whose value depends on the project's electricity")
    cap_at_limit = model.declared_kg_per_kwh + (limit - value_declared) / slope
    cap = cap_at_limit - 1e-6 * max(abs(cap_at_limit), 0.1)  # a hair inside the limit: HiGHS meets constraints to about 1e-7
    if part_load:
        slopes, intercepts, least = part_load_segments(part_load, rated, through_origin=min_load == 0)
        if min_load > 0 and least > min_load + 1e-12:
            raise InputError("--part-load", str(part_load), f"a first point at or below the minimum stable load {min_load:g}")
    else:
        slopes, intercepts = np.array([1.0 / model.kwh_per_kg_h2]), np.array([0.0])
    binary = min_load > 0
    years = local.astype("datetime64[Y]").astype(np.int64)
    year_values, year_of = np.unique(years, return_inverse=True)
    # variables: p (n), h (n, with a part-load curve; else h_t = p_t / kWh per kg), on (n if binary), m (periods)
    curve = part_load is not None and len(part_load) > 0
    p0, h0 = 0, n
    on0 = h0 + (n if curve else 0)
    m0 = on0 + (n if binary else 0)
    size = m0 + periods
    lower, upper = [], []
    index = np.arange(n)
    block_rows = []
    # hydrogen: h_t - a_j p_t - b_j on_t <= 0 (on_t = 1 without binaries: constant moves to the bound)
    for a, b in zip(slopes, intercepts, strict=False) if curve else ():
        r = np.arange(n)
        c1, v1 = h0 + index, np.ones(n)
        c2, v2 = p0 + index, np.full(n, -a)
        if binary:
            c3, v3 = on0 + index, np.full(n, -b)
            block_rows.append(sparse.csr_array((np.r_[v1, v2, v3], (np.r_[r, r, r], np.r_[c1, c2, c3])), shape=(n, size)))
            lower.extend([-np.inf] * n)
            upper.extend([0.0] * n)
        else:
            block_rows.append(sparse.csr_array((np.r_[v1, v2], (np.r_[r, r], np.r_[c1, c2])), shape=(n, size)))
            lower.extend([-np.inf] * n)
            upper.extend([b] * n)
    if binary:  # min_load rated on_t <= p_t <= rated on_t
        r = np.arange(n)
        block_rows.append(sparse.csr_array((np.r_[np.ones(n), np.full(n, -rated)], (np.r_[r, r], np.r_[p0 + index, on0 + index])), shape=(n, size)))
        lower.extend([-np.inf] * n)
        upper.extend([0.0] * n)
        block_rows.append(sparse.csr_array((np.r_[np.ones(n), np.full(n, -min_load * rated)], (np.r_[r, r], np.r_[p0 + index, on0 + index])), shape=(n, size)))
        lower.extend([0.0] * n)
        upper.extend([np.inf] * n)
    # matched within the period's load: m_P - sum_{t in P} p_t <= 0
    block_rows.append(sparse.csr_array((np.r_[np.ones(periods), -np.ones(n)], (np.r_[np.arange(periods), labels], np.r_[m0 + np.arange(periods), p0 + index])), shape=(periods, size)))
    lower.extend([-np.inf] * periods)
    upper.extend([0.0] * periods)
    fixed = sparse.vstack(block_rows).tocsr()
    fixed_lower, fixed_upper = np.array(lower), np.array(upper)

    bounds_lo = np.zeros(size)
    bounds_hi = np.r_[np.full(n, rated), np.full(n if curve else 0, np.inf), np.ones(n) if binary else np.zeros(0), generation]
    integrality = np.zeros(size)
    if binary:
        integrality[on0 : on0 + n] = 1
    objective = np.zeros(size)
    if hydrogen_price is not None:
        if series.price_per_mwh is None:
            raise InputError("--hydrogen-price", str(hydrogen_price), "a series with a 'price [<currency>/MWh]' column to weigh margin")
        objective[p0 : p0 + n] = series.price_per_mwh / 1000.0
        if curve:
            objective[h0 : h0 + n] = -hydrogen_price
        else:
            objective[p0 : p0 + n] -= hydrogen_price * slopes[0]
    elif curve:
        objective[h0 : h0 + n] = -1.0
    else:
        objective[p0 : p0 + n] = -slopes[0]

    design = model.kwh_per_kg_h2

    def output(load: np.ndarray) -> np.ndarray:
        """Hydrogen (kg) per interval at these loads: the curve (on from any load above zero), or load / design kWh/kg."""
        return np.clip(np.minimum.reduce([a * load + b * (load > 0) for a, b in zip(slopes, intercepts, strict=False)]), 0, None)

    def scale(load: np.ndarray, hydrogen: np.ndarray) -> float:
        """e / e_d: the kWh/kg the loads imply over the design kWh/kg (1 without a curve)."""
        made = float(hydrogen.sum())
        return float(load.sum()) / made / design if curve and made > 0 else 1.0

    period_grid = np.add.reduceat(grid, starts) / np.diff(np.r_[starts, n])  # first guess: plain mean per period
    single = np.diff(np.r_[starts, n]) == 1
    tightening = 0.0
    result_load = None
    notes: list[str] = []
    passes = 0
    for passes in range(1, 9):
        # emissions of each year: sum_P (cbar_P - g_P) m_P + sum_t g_P(t) p_t - cap p_t <= 0
        charge = np.where(single, grid[starts], period_grid)
        if curve:  # emissions <= cap e_d sum h (the curve's own kWh/kg, see the module text)
            entries = np.r_[charge[labels], -(cap - tightening) * design * np.ones(n), cbar - charge]
            rows_at, columns_at = np.r_[year_of, year_of, year_of[starts]], np.r_[p0 + index, h0 + index, m0 + np.arange(periods)]
        else:
            entries = np.r_[charge[labels] - (cap - tightening), cbar - charge]
            rows_at, columns_at = np.r_[year_of, year_of[starts]], np.r_[p0 + index, m0 + np.arange(periods)]
        year_rows = sparse.csr_array((entries, (rows_at, columns_at)), shape=(len(year_values), size))
        constraints = LinearConstraint(sparse.vstack([fixed, year_rows]).tocsr(), np.r_[fixed_lower, np.full(len(year_values), -np.inf)], np.r_[fixed_upper, np.zeros(len(year_values))])
        if binary and n > FULL_MIXED_INTEGER_UP_TO:
            solved, gap_note = _relax_and_fix(objective, constraints, integrality, bounds_lo, bounds_hi, (p0, on0, n), min_load * rated, time_limit_s, mip_gap, interior_point_lp if curve else None)
        elif curve and not binary:
            solved, gap_note = interior_point_lp(objective, constraints, bounds_lo, bounds_hi), ""
        else:
            limits = {"time_limit": time_limit_s, "mip_rel_gap": mip_gap} if binary else {}
            solved = milp(objective, constraints=constraints, integrality=integrality, bounds=Bounds(bounds_lo, bounds_hi), options=limits)
            gap_note = ""
        if solved.x is None:
            raise InputError("plan", scheme.id, f"a feasible plan ({solved.message}); the limit may be out of reach even at minimum stable load")
        result_load = np.clip(solved.x[p0 : p0 + n], 0, rated)
        scored = match(result_load, series.generation_kwh, eligible, rule, series.utc, local)
        years_ok = True
        worst = 0.0
        for year in range(len(year_values)):
            mask = year_of == year
            if result_load[mask].sum() <= 0:
                continue
            intensity = counted_intensity(scored, result_load, model, series.grid_g_co2e_per_kwh, mask)[3] * scale(result_load[mask], output(result_load)[mask])
            if intensity > cap_at_limit:
                years_ok = False
                worst = max(worst, intensity - cap)
        if years_ok:
            break
        with np.errstate(invalid="ignore", divide="ignore"):
            load_p = np.add.reduceat(result_load, starts)
            weighted = np.add.reduceat(result_load * grid, starts)
            period_grid = np.where(load_p > 0, weighted / np.where(load_p > 0, load_p, 1), period_grid)
        if passes >= 3:
            tightening += worst * 1.05
    else:
        notes.append("the plan scored back still misses the cap after 8 passes")
    if not result_load.sum() > 0:
        reason = "no interval runs at a positive margin under the limit" if hydrogen_price is not None else "the limit is out of reach at any load"
        raise InputError("plan", scheme.id, f"a plan that makes hydrogen and qualifies; the best plan runs no interval ({reason})")
    if gap_note:
        notes.append(gap_note)
    hydrogen = output(result_load)

    def scheme_value(load):
        scored = match(load, series.generation_kwh, eligible, rule, series.utc, local)
        c = counted_intensity(scored, load, model, series.grid_g_co2e_per_kwh)[3]
        return value_declared + slope * (c * scale(load, output(load)) - model.declared_kg_per_kwh), scored.matched_share

    value, share = scheme_value(result_load)
    full = np.full(n, rated)
    base_value, base_share = scheme_value(full)
    base_h2 = float(output(full).sum())
    margin = base_margin = None
    if hydrogen_price is not None:
        margin = float(hydrogen_price * hydrogen.sum() - series.price_per_mwh @ result_load / 1000.0)
        base_margin = float(hydrogen_price * base_h2 - series.price_per_mwh @ full / 1000.0)
    qualifies = value <= limit + 1e-9 * max(1.0, abs(limit)) if inclusive else value < limit
    name = granularity or (rule if isinstance(rule, str) else "dated rule")
    return PlanResult(
        scheme.id, "", limit, scheme.unit, name, rated, result_load, hydrogen, float(value), float(share), base_h2, float(base_value), float(base_share),
        bool(qualifies), margin, base_margin, passes, notes, series.interval_minutes, design,
    )


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
    raise InputError("--tier", tier, "one of " + "; ".join(f"'{t.tier}' (limit {t.limit:g})" for t in scheme.thresholds))


def parse_part_load(text: str | None) -> list[tuple[float, float]] | None:
    """'0.2:58,0.5:52,1:54' -> [(0.2, 58.0), (0.5, 52.0), (1.0, 54.0)] (load fraction : kWh/kg)."""
    if not text:
        return None
    points = []
    for item in text.split(","):
        try:
            fraction, kwh = (float(part) for part in item.split(":"))
        except ValueError:
            raise InputError("--part-load", text, "points FRACTION:KWH_PER_KG separated by commas, e.g. 0.2:58,0.5:52,1:54") from None
        points.append((fraction, kwh))
    return points


def plan_csv(series: ElectricitySeries, plan: PlanResult) -> str:
    """The plan as a time series CSV (the planned load in 'electrolyser [kWh]'), which ``score`` reads back."""
    import io

    import pandas as pd

    local = series.local
    stamps = [f"{str(t)[:16]}{'+' if o >= 0 else '-'}{abs(int(o)) // 60:02d}:{abs(int(o)) % 60:02d}" for t, o in zip(local, series.offset_minutes, strict=False)]
    columns = {"timestamp": stamps, "electrolyser [kWh]": plan.load_kwh.round(6)}
    for name, values in series.generation_kwh.items():
        columns[f"generation.{name} [kWh]"] = values
    if series.grid_g_co2e_per_kwh is not None:
        columns["grid_intensity [g CO2e/kWh]"] = series.grid_g_co2e_per_kwh
    if series.price_per_mwh is not None:
        columns[f"price [{series.price_unit.split('/')[0].strip()}/MWh]"] = series.price_per_mwh
    buffer = io.StringIO()
    buffer.write(f"# operating plan for {plan.scheme} (limit {plan.limit:g} {plan.unit}, matching {plan.granularity}); hydrogen {plan.hydrogen_kg.sum():.1f} kg at {plan.kwh_per_kg_h2:.6g} kWh/kg\n")
    if plan.score_back:
        buffer.write(f"# score it back at the part-load curve's kWh/kg: --set {' --set '.join(plan.score_back)}\n")
    pd.DataFrame(columns).to_csv(buffer, index=False, lineterminator="\n")
    return buffer.getvalue()
