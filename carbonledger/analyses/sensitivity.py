"""Which inputs decide the verdict: Sobol indices (variance-based) and a one-at-a-time tornado.

Sobol first-order and total-order indices are estimated with SALib (Saltelli's sampling on a
scrambled Sobol sequence, Jansen's estimators) over the uncertain inputs of a project, each input
drawn through its own distribution (the uniform sample is mapped through the quantile
functions). The indices assume independent inputs, so rank correlations are not imposed here.
The tornado sets one input at a time to its 10th and its 90th percentile, every other input at
the project's own value, and records the figure (the total, or a scheme's value with its limit).
The swing (``--swing PERCENT``, default 10) needs no distribution: it moves each factor the project
reads and each of its numeric parameters by -x % and +x % of its own value, one at a time, and records
the total and every scheme's value (characterisation factors and physical properties held fixed, as
``factors/uncertainty/grade_defaults.toml`` lists them).

Both evaluate their points with the same stacked draws as the Monte Carlo.

References
----------
.. [1] Sobol', I. M. (2001). Global sensitivity indices for nonlinear mathematical models and
   their Monte Carlo estimates. Mathematics and Computers in Simulation 55, 271-280.
.. [2] Saltelli, A. et al. (2010). Variance based sensitivity analysis of model output. Design
   and estimator for the total sensitivity index. Computer Physics Communications 181, 259-270.
.. [3] Herman, J. and Usher, W. (2017). SALib: An open-source Python library for sensitivity
   analysis. Journal of Open Source Software 2(9), 97.
"""

from __future__ import annotations

import numpy as np
from pydantic import BaseModel

from ..about import CAUTION
from ..core.assessment import Assessment
from ..errors import InputError
from ..model.distributions import Uncertainty, Uniform
from ..model.factors import FactorSet, factors_root
from ..model.pedigree import grade_defaults
from ..model.project import is_share_path, parameter_table
from .uncertainty import (
    DEFAULT_SEED,
    MAX_DRAWS,
    Draws,
    check_seed,
    checked_parameter,
    draws_from_uniform,
    evaluate_in_blocks,
    factors_used,
    limit_breaks,
    make_plan,
    no_usable_draw,
)

TORNADO_PERCENTILES = (0.10, 0.90)
SWING_PERCENT = 10.0  # the default move of each input in the one-at-a-time swing, per cent of its own value


class SobolIndex(BaseModel):
    input: str
    first_order: float
    first_order_confidence: float  # half-width of SALib's 95 % bootstrap interval
    total_order: float
    total_order_confidence: float


class TornadoBar(BaseModel):
    input: str
    low_input: float | str  # the input at its 10th percentile
    high_input: float | str  # at its 90th percentile
    at_low: float  # the figure with the input at its 10th percentile
    at_high: float
    swing: float  # |at_high - at_low|


class SwingFigure(BaseModel):
    figure: str  # "total" or a scheme id
    unit: str
    at_minus: (
        float | None
    )  # the figure with the input at (1 - x) times its value; None: that value breaks a physical limit
    at_plus: float | None
    change_minus: float | None  # at_minus - the project's figure
    change_plus: float | None


class SwingBar(BaseModel):
    input: str  # "parameter PATH" or "factor ID"
    value: float  # the input's own value
    unit: str
    figures: list[SwingFigure]  # the total first, then each scheme


class Swing(BaseModel):
    """Each input moved alone by -x % and +x % of its own value, every other as the project states."""

    percent: float
    base: dict[str, float]  # figure -> its value with every input as stated
    units: dict[str, str]
    bars: list[SwingBar]  # largest change of the total first
    unmoved: list[str]  # inputs whose move changes no figure
    held_fixed: list[str]  # factors read but not moved (characterisation factors, physical properties)


class Sensitivity(BaseModel):
    project: str
    project_file: str
    figure: str  # "total" or the scheme id
    unit: str
    limit: float | None  # the scheme's limit, when the figure is a scheme value
    base: float  # the figure with every input at the project's own value
    base_sample: int  # N of the Sobol sample (evaluations: N x (inputs + 2))
    seed: int
    evaluations: int
    evaluations_breaking_limits: int  # kept in the indices (the estimator needs every point), reported here
    sobol: list[SobolIndex]
    tornado: list[TornadoBar]  # largest swing first
    swing: Swing | None = None  # the one-at-a-time move of every factor and numeric parameter by +-percent
    caution: str = CAUTION

    def summary_for_ledger(self) -> dict:
        """The compact figures the run ledger keeps of a sensitivity run."""
        top = max(self.sobol, key=lambda index: index.total_order) if self.sobol else None
        headline = (
            f"Sobol indices of {self.figure} ({self.unit}) over {len(self.sobol)} inputs, N = {self.base_sample}, seed "
            f"{self.seed}"
        )
        if top is not None:
            headline += f": largest total-order index {top.total_order:.3f} ({top.input})"
        return {
            "analysis": "sensitivity",
            "headline": headline,
            "figure": self.figure,
            "unit": self.unit,
            "limit": self.limit,
            "base": self.base,
            "base_sample": self.base_sample,
            "seed": self.seed,
            "sobol": [index.model_dump() for index in self.sobol],
            "tornado": [{"input": bar.input, "swing": bar.swing} for bar in self.tornado],
            "swing_percent": self.swing.percent if self.swing else None,
            "swing": [
                {
                    "input": bar.input,
                    "change_minus": bar.figures[0].change_minus,
                    "change_plus": bar.figures[0].change_plus,
                }
                for bar in self.swing.bars
            ]
            if self.swing
            else [],
        }


def _figure(outcome, scheme: str | None) -> np.ndarray:
    return np.asarray(outcome.total if scheme is None else outcome.scheme_values[scheme], dtype=float)


def _draws_at(plan, u: np.ndarray) -> Draws:
    """Draws from uniform values; a NaN column entry keeps the project's (or factor set's) own value."""
    filled = np.where(np.isnan(u), 0.5, u)
    drawn = draws_from_uniform(plan, filled)
    names = list(plan.uncertainty.parameters) + list(plan.uncertainty.factors)
    for column, name in enumerate(names):
        keep = np.isnan(u[:, column])
        if not keep.any():
            continue
        if column < len(plan.uncertainty.parameters):
            nominal = plan.fields[name][0]
            if name in drawn.factor_choices:
                nominal_id, chosen = drawn.factor_choices[name]
                chosen[keep] = nominal_id
            else:
                drawn.parameters[name][keep] = nominal
        else:
            drawn.factors[name][keep] = plan.assessment.factor_set.get(name).value
    return drawn


def _tornado(plan, names: list[str], scheme: str | None) -> tuple[float, list]:
    """(the figure at every input's median, one bar per input from its 10th to its 90th percentile, widest first)."""
    count = len(names)
    grid = np.full((1 + 2 * count, count), np.nan)  # row 0 is the base; then each input at its 10th and 90th percentile
    for n in range(count):
        grid[1 + 2 * n, n], grid[2 + 2 * n, n] = TORNADO_PERCENTILES
    tornado_draws = _draws_at(plan, grid)
    tornado_values = _figure(evaluate_in_blocks(plan, tornado_draws), scheme)
    bars = []
    for n, name in enumerate(names):
        key = name.split(" ", 1)[1]
        if name.startswith("parameter") and key in tornado_draws.factor_choices:
            low_input, high_input = (str(tornado_draws.factor_choices[key][1][row]) for row in (1 + 2 * n, 2 + 2 * n))
        else:
            column = (
                tornado_draws.parameters.get(key) if name.startswith("parameter") else tornado_draws.factors.get(key)
            )
            low_input, high_input = float(column[1 + 2 * n]), float(column[2 + 2 * n])
        at_low, at_high = float(tornado_values[1 + 2 * n]), float(tornado_values[2 + 2 * n])
        bars.append(
            TornadoBar(
                input=name,
                low_input=low_input,
                high_input=high_input,
                at_low=at_low,
                at_high=at_high,
                swing=abs(at_high - at_low),
            )
        )
    bars.sort(key=lambda bar: -bar.swing)
    return float(tornado_values[0]), bars


def check_swing(percent: float) -> None:
    if isinstance(percent, bool) or not 0 < percent < 100:
        raise InputError("--swing", str(percent), "a percentage above 0 and below 100")


def _moved(value: float, fraction: float) -> Uniform:
    """The range an input is moved over: from (1 - x) to (1 + x) times its value, in order."""
    low, high = sorted((value * (1 - fraction), value * (1 + fraction)))
    return Uniform(distribution="uniform", low=low, high=high)


def swing_inputs(
    project, factor_set: FactorSet, used: dict, fraction: float, source: str
) -> tuple[Uncertainty, dict, list[str]]:
    """(the inputs to move, each as a uniform range of +-x %; their units; the factors held fixed).

    Every numeric parameter with a unit and a value other than 0 that a distribution could move, and every
    factor row the project reads with a value other than 0, but characterisation factors and physical
    properties (``grade_defaults().held_fixed``). Electricity shares are left out: they sum to 1, so moving
    one alone moves another, which a one-at-a-time swing cannot say (a distribution or ``--set`` with
    ``--rebalance`` can)."""
    parameters, units = {}, {}
    for path, value, unit, _ in parameter_table(project):
        if (
            isinstance(value, bool)
            or not isinstance(value, (int, float))
            or value == 0
            or unit in ("", "date")
            or is_share_path(path)
        ):
            continue
        try:
            checked_parameter(project, factor_set, path, _moved(value, fraction), source)
        except InputError:
            continue
        parameters[path], units[f"parameter {path}"] = _moved(value, fraction), unit
    mapping = grade_defaults(factors_root())
    factors, held = {}, []
    for factor_id, row in sorted(used.items()):
        if factor_id not in factor_set.factors or row.value == 0:
            continue
        if not mapping.applies_to(factor_id):
            held.append(factor_id)
            continue
        factors[factor_id], units[f"factor {factor_id}"] = _moved(row.value, fraction), row.unit
    return Uncertainty(parameters=parameters, factors=factors), units, held


def _swing_draws(plan, names: list[str], fraction: float) -> Draws:
    """Row 0 every input as stated; rows 1 + 2k and 2 + 2k input k at (1 - x) and (1 + x) times its value."""
    drawn = _draws_at(plan, np.full((1 + 2 * len(names), len(plan.uncertainty.names())), np.nan))
    for k, name in enumerate(names):
        kind, key = name.split(" ", 1)
        column = drawn.parameters[key] if kind == "parameter" else drawn.factors[key]
        value = plan.fields[key][0] if kind == "parameter" else plan.assessment.factor_set.get(key).value
        column[1 + 2 * k], column[2 + 2 * k] = value * (1 - fraction), value * (1 + fraction)
    return drawn


def _swing_figures(
    values: dict[str, np.ndarray], units: dict[str, str], k: int, broken: np.ndarray
) -> list[SwingFigure]:
    figures = []
    for figure, column in values.items():
        minus, plus = (None if broken[row] else float(column[row]) for row in (1 + 2 * k, 2 + 2 * k))
        base = float(column[0])
        figures.append(
            SwingFigure(
                figure=figure,
                unit=units[figure],
                at_minus=minus,
                at_plus=plus,
                change_minus=None if minus is None else minus - base,
                change_plus=None if plus is None else plus - base,
            )
        )
    return figures


def _moves_nothing(bar: SwingBar, base: dict[str, float]) -> bool:
    return all(
        abs(change) <= 1e-12 * max(1.0, abs(base[f.figure]))
        for f in bar.figures
        for change in (f.change_minus, f.change_plus)
        if change is not None
    )


def swing(
    project, assessment: Assessment, percent: float = SWING_PERCENT, *, source: str = "project", series=None
) -> Swing:
    """Each factor the project reads and each numeric parameter moved alone by -x % and +x % of its own
    value (x = ``percent``), the others as the project states: the change of the total and of every scheme's
    value. A move that breaks a physical limit (a share above 1) gives no figure (None)."""
    check_swing(percent)
    fraction = percent / 100
    used = factors_used(project, assessment, source)
    inputs, input_units, held = swing_inputs(project, assessment.factor_set, used, fraction, source)
    plan = make_plan(project, assessment, inputs, source=source, series=series)
    names = inputs.names()
    drawn = _swing_draws(plan, names, fraction)
    outcome = evaluate_in_blocks(plan, drawn)
    broken, _ = limit_breaks(plan, drawn, len(drawn.uniform))
    values = {"total": np.asarray(outcome.total, dtype=float)} | {
        scheme.id: np.asarray(outcome.scheme_values[scheme.id], dtype=float) for scheme in outcome.schemes
    }
    units = {"total": outcome.unit} | {scheme.id: scheme.unit for scheme in outcome.schemes}
    base = {figure: float(column[0]) for figure, column in values.items()}
    bars = []
    for k, name in enumerate(names):
        value = (
            plan.fields[name.split(" ", 1)[1]][0]
            if name.startswith("parameter")
            else plan.assessment.factor_set.get(name.split(" ", 1)[1]).value
        )
        bars.append(
            SwingBar(input=name, value=value, unit=input_units[name], figures=_swing_figures(values, units, k, broken))
        )
    moved = [bar for bar in bars if not _moves_nothing(bar, base)]
    moved.sort(
        key=lambda bar: -max(abs(change or 0.0) for change in (bar.figures[0].change_minus, bar.figures[0].change_plus))
    )
    return Swing(
        percent=percent,
        base=base,
        units=units,
        bars=moved,
        unmoved=[bar.input for bar in bars if _moves_nothing(bar, base)],
        held_fixed=held,
    )


def sensitivity(
    project,
    assessment: Assessment,
    uncertainty: Uncertainty,
    *,
    scheme: str | None = None,
    base_sample: int = 1024,
    seed: int = DEFAULT_SEED,
    source: str = "project",
    series=None,
    swing_percent: float = SWING_PERCENT,
) -> Sensitivity:
    """Sobol indices and tornado of the total (or of ``scheme``'s value) over the uncertain inputs, and the
    one-at-a-time swing of every factor and numeric parameter by +-``swing_percent`` (``swing``), under the
    assessment's options (its schemes replaced by ``scheme`` when one is given).

    ``series``: the project's electricity time series; scheme values then follow its matching."""
    check_swing(swing_percent)
    from SALib.analyze import sobol as sobol_analysis
    from SALib.sample import sobol as sobol_sample

    if scheme:
        assessment = assessment.but(schemes=(scheme,))
    plan = make_plan(project, assessment, uncertainty, source=source, series=series)
    names = plan.uncertainty.names()
    if not names:
        raise InputError(source, "uncertainty", "at least one distribution")
    if base_sample < 2 or base_sample & (base_sample - 1):
        raise InputError(
            "--base-sample", str(base_sample), "a power of 2 (Sobol sequences keep their balance at powers of 2)"
        )
    check_seed(seed)
    if base_sample * (len(names) + 2) > MAX_DRAWS:
        raise InputError(
            "--base-sample",
            str(base_sample),
            f"a sample of at most {MAX_DRAWS:,} evaluations, N x (inputs + 2) = {base_sample * (len(names) + 2):,} "
            f"with {len(names)} inputs",
        )
    problem = {"num_vars": len(names), "names": names, "bounds": [[0.0, 1.0]] * len(names)}
    u = np.clip(sobol_sample.sample(problem, base_sample, calc_second_order=False, seed=seed), 1e-12, 1 - 1e-12)
    drawn = draws_from_uniform(plan, u)
    outcome = evaluate_in_blocks(plan, drawn)
    values = _figure(outcome, scheme)
    broken, reasons = limit_breaks(plan, drawn, len(u))
    if broken.all():
        raise no_usable_draw(source, len(u), reasons)
    indices = sobol_analysis.analyze(problem, values, calc_second_order=False, seed=seed)
    sobol = [
        SobolIndex(
            input=name,
            first_order=float(indices["S1"][n]),
            first_order_confidence=float(indices["S1_conf"][n]),
            total_order=float(indices["ST"][n]),
            total_order_confidence=float(indices["ST_conf"][n]),
        )
        for n, name in enumerate(names)
    ]
    base, bars = _tornado(plan, names, scheme)
    chosen = outcome.schemes[0] if scheme else None
    return Sensitivity(
        project=project.project.name,
        project_file=source,
        figure=scheme or "total",
        unit=chosen.unit if chosen else outcome.unit,
        limit=chosen.loosest().limit if chosen else None,
        base=base,
        base_sample=base_sample,
        seed=seed,
        evaluations=len(u),
        evaluations_breaking_limits=int(broken.sum()),
        sobol=sobol,
        tornado=bars,
        swing=swing(project, assessment, swing_percent, source=source, series=series),
    )
