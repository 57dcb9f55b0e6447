"""How sure is the verdict: Monte Carlo over the uncertain inputs of one project.

The draws go through the same route and stage code as a score: the validated parameters hold
numpy arrays of draws where a distribution is given, ``DrawInputs`` gives arrays for uncertain
factors, ``build_inventory`` builds every draw at once, and the systems are solved stacked
(``engine.solve_stacked_values``, one ``numpy.linalg.solve`` call per block of draws). Totals,
stages, gases, intensities and scheme values are summed as ``core.scoring`` sums them.

Physical limits are applied to every draw: a parameter outside its field's range, a factor draw
of the opposite sign to its value, or a draw the route modules' own checks refuse is counted and
reported, and left out of every statistic; no draw is clipped.

References
----------
.. [1] Iman, R. L. and Conover, W. J. (1982). A distribution-free approach to inducing rank
   correlation among input variables. Communications in Statistics B 11(3), 311-334.
.. [2] McKay, M. D., Beckman, R. J. and Conover, W. J. (1979). A comparison of three methods
   for selecting values of input variables in the analysis of output from a computer code.
   Technometrics 21(2), 239-245 (Latin hypercube sampling).
.. [3] Heijungs, R. and Suh, S. (2002). The Computational Structure of Life Cycle Assessment.
"""

from __future__ import annotations

import copy
import warnings
from collections.abc import Callable
from dataclasses import dataclass, field, replace
from typing import Any

import numpy as np
from pydantic import BaseModel, PrivateAttr

from ..about import CAUTION, __version__
from ..core.assessment import Assessment
from ..core.engine import build_matrices, build_stacked_matrices, datapackage, import_bw2calc
from ..core.inputs import DrawInputs, NumericInputs
from ..core.inventory import build_inventory, check_physical_limits, limit_checkers
from ..core.scoring import (
    FUNCTIONAL_UNITS,
    basis_of,
    characterisation,
    charged_source_intensities,
    checked_year,
    co_product_rule,
    intensities,
    read_rules,
    run_stages,
    scheme_characterisation,
)
from ..core.stacked import (
    StackedSolution,
    headline_arrays,
    per_system,
    scheme_value_arrays,
    solve_stacked_inventory,
)
from ..core.verdicts import Period, status_of
from ..errors import InputError
from ..model.distributions import Pedigree, Uncertainty
from ..model.factors import FactorSet, factor_row, factors_root
from ..model.pedigree import grade_defaults
from ..model.project import field_limits, is_share_path, parameter_field, path_key, share_source, split_path
from ..model.shares import negative_shares, rebalanced_shares, rebalancing_problem
from ..model.statuses import Status
from ..model.units import UnitMismatch, conversion_factor
from ..routes.project import validate_project
from .matching import (
    ElectricityModel,
    declared_and_grid_intensity,
    eligible_sources,
    matched_values_of_draws,
    scheme_granularity,
    series_matched_periods,
)

DEFAULT_SEED = 20261202
DEFAULT_DRAWS = 10_000
MAX_DRAWS = 1_000_000  # a standard error of a probability below 0.05 %: beyond what a screening needs, within memory
MAX_SEED = 2**32 - 1  # the seeds numpy and bw2calc both take
MIN_CORRELATED_DRAWS = 10  # Iman-Conover needs the van der Waerden scores' correlation matrix to be positive definite
MEMORY_PER_BLOCK_BYTES = 512 * 1024 * 1024  # the stacked matrices of one block of draws
BLOCK = 20_000  # draws solved per stacked call (bounds memory; progress advances per block)
GRADE_DEFAULT = "default of the source grade"  # how an input with a grade default is named (InputDistribution.default)


# --- sampling -----------------------------------------------------------------------------


def check_draws(count: int, seed: int, option: str = "--draws") -> None:
    """Refuse a draw count or seed no run can use, before any work (one InputError line)."""
    if isinstance(count, bool) or not 2 <= count <= MAX_DRAWS:
        raise InputError(option, str(count), f"a number of draws from 2 to {MAX_DRAWS:,}")
    check_seed(seed)


def check_seed(seed: int) -> None:
    if isinstance(seed, bool) or not 0 <= seed <= MAX_SEED:
        raise InputError("--seed", str(seed), f"a whole number from 0 to {MAX_SEED}")


def no_usable_draw(source: str, count: int, reasons: list[dict]) -> InputError:
    """The refusal of a run whose every draw breaks a physical limit (statistics over no draw mean nothing)."""
    first = (
        max(reasons, key=lambda reason: reason["draws"])
        if reasons
        else {"field": "uncertainty", "expected": "a physical value"}
    )
    return InputError(
        source,
        "uncertainty",
        f"distributions that leave at least one draw within the physical limits; all {count:,} draws break one (most "
        f"often {first['field']}: expected {first['expected']})",
    )


def uniform_draws(count: int, dimensions: int, seed: int, sampling: str) -> np.ndarray:
    """(count, dimensions) uniform draws in (0, 1): independent, or a Latin hypercube (scipy.stats.qmc)."""
    rng = np.random.default_rng(seed)
    if dimensions == 0:
        return np.zeros((count, 0))
    if sampling == "latin_hypercube":
        from scipy.stats import qmc

        u = qmc.LatinHypercube(d=dimensions, seed=rng).random(count)
    else:
        u = rng.random((count, dimensions))
    return np.clip(
        u, 1e-12, 1 - 1e-12
    )  # the quantile functions of unbounded distributions need u strictly inside (0, 1)


def rank_correlated(u: np.ndarray, target: np.ndarray, seed: int) -> np.ndarray:
    """Rearrange each column of ``u`` so that the columns have the target rank correlation.

    Iman and Conover (1982): van der Waerden scores with the target correlation (Cholesky
    factors of the target and of the scores' own correlation) give the ranks each column takes.
    The marginal values are kept as drawn (a Latin hypercube stays one).
    """
    from scipy.special import ndtri
    from scipy.stats import rankdata

    count, dimensions = u.shape
    rng = np.random.default_rng([seed, 1])
    base = ndtri(np.arange(1, count + 1) / (count + 1))
    scores = np.column_stack([rng.permutation(base) for _ in range(dimensions)])
    wanted = np.linalg.cholesky(target)
    actual = np.linalg.cholesky(np.corrcoef(scores, rowvar=False))
    correlated = scores @ np.linalg.inv(actual).T @ wanted.T
    result = np.empty_like(u)
    for column in range(dimensions):
        ranks = rankdata(correlated[:, column], method="ordinal").astype(int) - 1
        result[:, column] = np.sort(u[:, column])[ranks]
    return result


def correlation_matrix(uncertainty: Uncertainty, names: list[str], source: str) -> np.ndarray | None:
    if not uncertainty.correlations:
        return None
    index = {name.split(" ", 1)[1]: number for number, name in enumerate(names)}
    matrix = np.eye(len(names))
    for number, pair in enumerate(uncertainty.correlations):
        for name in pair.inputs:
            if name not in index:
                raise InputError(
                    source,
                    f"uncertainty.correlations.{number}.inputs",
                    f"inputs that have a distribution, got '{name}'",
                )
        a, b = (index[name] for name in pair.inputs)
        if a == b:
            raise InputError(source, f"uncertainty.correlations.{number}.inputs", "two different inputs")
        matrix[a, b] = matrix[b, a] = pair.rank
    if np.linalg.eigvalsh(matrix).min() <= 0:
        raise InputError(
            source, "uncertainty.correlations", "rank correlations that can hold together (a positive definite matrix)"
        )
    return matrix


# --- the drawn inputs ----------------------------------------------------------------------


@dataclass
class Draws:
    """The uncertain inputs of a run, drawn: numbers per input, and where each goes."""

    names: list[str]  # "parameter PATH" / "factor ID"
    uniform: np.ndarray  # (draws, inputs) in (0, 1)
    parameters: dict[str, np.ndarray]  # path -> draws (numbers)
    factor_choices: dict[
        str, tuple[str, np.ndarray]
    ]  # parameter path of a factor id -> (nominal id, chosen id per draw)
    factors: dict[str, np.ndarray]  # factor id -> draws in the factor's own unit


@dataclass
class Plan:
    """A project ready for draws: validated model, the run's assessment, distributions and their fields."""

    project: Any
    assessment: Assessment  # factor set, GWP set, schemes, boundary and assessment year of the run
    uncertainty: Uncertainty
    source: str = "project"
    fields: dict[str, Any] = field(default_factory=dict)  # parameter path -> (nominal, pydantic field)
    used_rows: list = field(default_factory=list)  # factor rows the project reads, as plain dicts (for the ledger)
    series: Any = None  # the project's electricity time series: scheme values follow its matching
    absorbers: dict[str, str] = field(
        default_factory=dict
    )  # share path -> the source taking up its difference (default: the unmoved, in proportion)


def checked_parameter(project, factor_set: FactorSet, path: str, distribution, source: str) -> tuple:
    """(nominal value, pydantic field) of a parameter with a distribution, refused in one line where the
    distribution cannot apply: a text parameter takes a discrete choice of factor ids only, a number a
    numeric distribution (shares are checked together in ``make_plan``)."""
    where = f"uncertainty.parameters.{path}"
    nominal, info = parameter_field(project, path, source, where)
    if isinstance(nominal, str):
        factor_ids = path.endswith("factor") or nominal in factor_set.factors
        if distribution.distribution != "discrete" or distribution.numeric_values() or not factor_ids:
            raise InputError(
                source,
                where,
                f"a numeric parameter, or a discrete choice of factor ids for a factor parameter; '{path}' is the "
                f"text '{nominal}'",
            )
        for choice in distribution.values:
            factor_set.get(choice, where)
    elif isinstance(nominal, bool) or not isinstance(nominal, (int, float)):
        raise InputError(source, where, f"a numeric parameter, got '{path}' = {nominal!r}")
    elif not distribution.numeric_values():
        raise InputError(source, where, "numbers as the values of a discrete distribution of a numeric parameter")
    return nominal, info


def make_plan(
    project, assessment: Assessment, uncertainty: Uncertainty, *, source: str = "project", series=None
) -> Plan:
    """Check every distribution against the project and the factor set (one InputError line).

    ``series``: the project's electricity time series (``analyses.electricity_series``); with it,
    every scheme value of every draw follows the matching under the scheme's rule, as in ``score``.

    Pedigree distributions take the value they describe as their median, and every factor the
    project uses whose row carries pedigree scores, and that has no distribution of its own,
    gets its pedigree-matrix default (a lognormal around the row's value); a run with no
    distribution at all gets the defaults of the rows' source grades (``with_defaults``).
    """
    factor_set = assessment.factor_set
    used = factors_used(project, assessment, source)
    uncertainty = with_defaults(used, factor_set, uncertainty)
    fields = {
        path: checked_parameter(project, factor_set, path, distribution, source)
        for path, distribution in uncertainty.parameters.items()
    }
    shared = [path for path in uncertainty.parameters if is_share_path(path)]
    problem = rebalancing_problem(
        {name: s.share for name, s in project.electricity.sources.items()}, [share_source(path) for path in shared], {}
    )
    if problem:
        raise InputError(source, f"uncertainty.parameters.{shared[0]}", problem)
    parameters = {
        path: _median_of(distribution, fields[path][0], source, f"uncertainty.parameters.{path}")
        for path, distribution in uncertainty.parameters.items()
    }
    factors = {}
    for factor_id, distribution in uncertainty.factors.items():
        if factor_id in factor_set.factors:
            distribution = _median_of(
                distribution, factor_set.factors[factor_id].value, source, f"uncertainty.factors.{factor_id}"
            )
        factors[factor_id] = distribution
    uncertainty = uncertainty.model_copy(update={"parameters": parameters, "factors": factors})
    for factor_id, distribution in uncertainty.factors.items():
        where = f"uncertainty.factors.{factor_id}"
        if factor_id not in factor_set.factors:
            raise InputError(source, where, f"a factor id known to set '{factor_set.name}', got '{factor_id}'")
        if not distribution.numeric_values():
            raise InputError(source, where, "numbers as the values of a discrete distribution of a factor")
    if not uncertainty.parameters and not uncertainty.factors:
        raise InputError(
            source,
            "uncertainty",
            "at least one distribution (an [uncertainty] table in the project, --distributions FILE, or factor rows "
            "with pedigree scores)",
        )
    plan = Plan(project, assessment, uncertainty, source, fields, series=series)
    plan.used_rows = [factor_row(row) for _, row in sorted(used.items())]
    correlation_matrix(uncertainty, uncertainty.names(), source)
    return plan


def _median_of(distribution, value, source: str, where: str):
    """A pedigree distribution with the value it describes as its median (a lognormal needs a value > 0)."""
    if not isinstance(distribution, Pedigree) or distribution.median is not None:
        return distribution
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not value > 0:
        raise InputError(source, where, f"a value > 0 for a pedigree (lognormal) distribution around it, got {value!r}")
    return distribution.with_median(float(value))


def factors_used(project, assessment: Assessment, source: str) -> dict:
    """The factor rows and reference values a score of the project reads (id -> row), found by
    building its inventory once under the assessment's factor set, boundary and GWP set (the rows of
    the schemes' own GWP sets are not among them)."""
    params = copy.deepcopy(project.model_dump())
    if assessment.boundary is not None:
        params["project"]["boundary"] = assessment.boundary
    inputs = NumericInputs(assessment.factor_set, source)
    check_physical_limits(params, inputs, source)
    build_inventory(params, inputs)
    characterisation(inputs, assessment.gwp)
    return dict(inputs.used)


def uncertain_inputs(project, assessment: Assessment, uncertainty: Uncertainty, source: str) -> Uncertainty:
    """The distributions a run of the project would draw: ``uncertainty`` and the defaults of the factor rows it
    reads."""
    return with_defaults(factors_used(project, assessment, source), assessment.factor_set, uncertainty)


def with_defaults(used: dict, factor_set: FactorSet, uncertainty: Uncertainty) -> Uncertainty:
    """``uncertainty`` with the pedigree defaults of the rows that carry scores and, when the run then has
    no distribution at all, the defaults of the rows' source grades (``with_grade_defaults``)."""
    return with_grade_defaults(used, factor_set, with_pedigree_defaults(used, factor_set, uncertainty))


def with_grade_defaults(used: dict, factor_set: FactorSet, uncertainty: Uncertainty) -> Uncertainty:
    """For a run that states no distribution (no [uncertainty] table, no distributions file, no row with
    pedigree scores): a pedigree lognormal around each factor row the project reads, with the scores of
    the row's source grade (``factors/uncertainty/grade_defaults.toml``: this project's assumption, named
    on every such input). GWP values and heating values are held fixed, and so is a value of 0 or below
    (a lognormal has the sign of its median)."""
    if uncertainty.parameters or uncertainty.factors:
        return uncertainty
    mapping = grade_defaults(factors_root())
    added = {}
    for factor_id, row in sorted(used.items()):
        if (
            factor_id in factor_set.factors and mapping.applies_to(factor_id) and row.value > 0
        ):  # reference values are not rows of the set
            grade = str(row.grade)
            basis = f"{GRADE_DEFAULT} '{grade}' (carbonledger's assumption, common practice)"
            added[factor_id] = Pedigree(
                distribution="pedigree",
                scores=mapping.scores[grade],
                basic_gsd=mapping.basic_gsd[grade],
                median=row.value,
                stated_in=row.origin or factor_set.name,
                basis=basis,
            )
    return uncertainty.model_copy(update={"factors": added}) if added else uncertainty


def with_pedigree_defaults(used: dict, factor_set: FactorSet, uncertainty: Uncertainty) -> Uncertainty:
    """``uncertainty`` plus a pedigree distribution for every factor used (``factors_used``) whose
    row carries pedigree scores and which has no distribution of its own (after the stated ones)."""
    added = {}
    for factor_id, row in sorted(used.items()):
        if getattr(row, "pedigree", None) and factor_id not in uncertainty.factors:
            where = f"{row.origin or factor_set.name}: {factor_id}"
            if not row.value > 0:
                raise InputError(
                    where,
                    "pedigree",
                    f"a factor value > 0 for a pedigree (lognormal) distribution around it, got {row.value:g}",
                )
            added[factor_id] = Pedigree(
                distribution="pedigree",
                scores=row.pedigree,
                basic_gsd=row.basic_gsd or 1.0,
                median=row.value,
                stated_in=row.origin or factor_set.name,
                basis="the pedigree scores of the factor row",
            )
    if not added:
        return uncertainty
    return uncertainty.model_copy(update={"factors": {**uncertainty.factors, **added}})


def draw(plan: Plan, count: int, seed: int = DEFAULT_SEED, sampling: str | None = None) -> Draws:
    """Draw every uncertain input ``count`` times (reproducible with ``seed``)."""
    uncertainty = plan.uncertainty
    names = uncertainty.names()
    u = uniform_draws(count, len(names), seed, sampling or uncertainty.sampling)
    target = correlation_matrix(uncertainty, names, plan.source)
    if target is not None and count < max(MIN_CORRELATED_DRAWS, 2 * len(names)):
        raise InputError(
            "--draws",
            str(count),
            f"at least {max(MIN_CORRELATED_DRAWS, 2 * len(names))} draws to impose rank correlations on {len(names)} "
            "inputs",
        )
    if target is not None:
        u = rank_correlated(u, target, seed)
    return draws_from_uniform(plan, u)


def draws_from_uniform(plan: Plan, u: np.ndarray) -> Draws:
    """The input values of given uniform draws (one column per input, in ``Uncertainty.names`` order)."""
    uncertainty = plan.uncertainty
    parameters, choices, factors = {}, {}, {}
    distributions = list(uncertainty.parameters.items()) + list(uncertainty.factors.items())
    for column, (name, distribution) in enumerate(distributions):
        values = u[:, column]
        if column < len(uncertainty.parameters):
            nominal = plan.fields[name][0]
            if isinstance(nominal, str):
                choices[name] = (nominal, np.asarray(distribution.values, dtype=object)[distribution.index(values)])
            else:
                parameters[name] = distribution.quantile(values)
        else:
            factors[name] = distribution.quantile(values)
    return Draws(uncertainty.names(), u, parameters, choices, factors)


# --- evaluating draws ----------------------------------------------------------------------


def _set(params: dict, path: str, value) -> None:
    node = params
    parts = split_path(path)
    for part in parts[:-1]:
        node = node[part]
    node[parts[-1]] = value


def params_with_draws(plan: Plan, parameters: dict[str, np.ndarray]) -> dict:
    """The project's parameters with draws in place; another source's share takes up the rest of a drawn share."""
    params = copy.deepcopy(plan.project.model_dump())
    if plan.assessment.boundary is not None:
        params["project"]["boundary"] = plan.assessment.boundary
    for path, values in parameters.items():
        if not is_share_path(path):
            _set(params, path, values)
    sources = params["electricity"]["sources"]
    for name, share in shares_with_draws(plan, parameters).items():
        sources[name]["share"] = share
    return params


def shares_with_draws(plan: Plan, parameters: dict[str, np.ndarray]) -> dict[str, Any]:
    """Every source's share with the drawn (or set) shares in place, rebalanced together (``model.shares``;
    ``plan.absorbers``: share path -> the source that takes up its difference). Empty when no share moves."""
    moved = {share_source(path): values for path, values in parameters.items() if is_share_path(path)}
    if not moved:
        return {}
    shares = {name: source.share for name, source in plan.project.electricity.sources.items()}
    absorbers = {share_source(path): name for path, name in plan.absorbers.items()}
    return rebalanced_shares(shares, moved, absorbers)


def _factor_draws(plan: Plan, draws: Draws) -> dict[str, np.ndarray]:
    """Factor draws in each factor's own unit, with the chosen factor ids of factor parameters resolved."""
    factors = dict(draws.factors)
    for path, (nominal_id, chosen) in draws.factor_choices.items():
        nominal = plan.assessment.factor_set.get(nominal_id)
        values = np.empty(len(chosen))
        for choice in set(chosen):
            row = plan.assessment.factor_set.get(choice)
            try:
                scale = conversion_factor(row.unit, nominal.unit)
            except UnitMismatch:
                raise InputError(
                    plan.source,
                    f"uncertainty.parameters.{path}",
                    f"factor ids in units convertible to {nominal.unit}, got '{choice}' in {row.unit}",
                ) from None
            own = factors.get(choice)
            values[chosen == choice] = (own[chosen == choice] if own is not None else row.value) * scale
        factors[nominal_id] = values
    return factors


def limit_breaks(plan: Plan, draws: Draws, count: int) -> tuple[np.ndarray, list[dict]]:
    """Which draws break a physical limit (bool mask) and, per reason, how many.

    Field limits (a fraction above 1, a negative amount) and the sign of factors are checked on
    arrays; the route modules' own checks (stoichiometric floors, energy balances) run per draw
    on plain numbers, as they run for a score.
    """
    broken = np.zeros(count, dtype=bool)
    reasons: list[dict] = []

    def record(mask: np.ndarray, where: str, expected: str) -> None:
        nonlocal broken
        if mask.any():
            reasons.append({"field": where, "expected": expected, "draws": int(mask.sum())})
            broken = broken | mask

    for path, values in draws.parameters.items():
        lower, lower_in, upper, upper_in = field_limits(plan.fields[path][1])
        if lower is not None:
            record(values < lower if lower_in else values <= lower, path, f"{'>=' if lower_in else '>'} {lower:g}")
        if upper is not None:
            record(values > upper if upper_in else values >= upper, path, f"{'<=' if upper_in else '<'} {upper:g}")
    for name, mask in negative_shares(shares_with_draws(plan, draws.parameters)).items():
        record(
            np.asarray(mask, dtype=bool),
            f"electricity.sources.{path_key(name)}.share",
            ">= 0 after the moved shares are taken up",
        )
    for factor_id, values in draws.factors.items():
        nominal = plan.assessment.factor_set.get(factor_id).value
        record(np.sign(values) * np.sign(nominal) < 0, factor_id, f"the sign of the factor's value ({nominal:g})")
    if draws.parameters or draws.factors or draws.factor_choices:
        route_broken = _route_checks(plan, draws, count, ~broken)
        for expected, mask in route_broken.items():
            field_name, text = expected
            record(mask, field_name, text)
    return broken, reasons


def _route_checks(plan: Plan, draws: Draws, count: int, candidates: np.ndarray) -> dict:
    """The route modules' numeric limits (``Route.draw_limits``) on the arrays of draws.

    Their text checks (fuel names, sections) do not change between draws and run once, on the
    project's own values, before the draws are built.
    """
    params = params_with_draws(plan, draws.parameters)
    inputs = DrawInputs(plan.assessment.factor_set, _factor_draws(plan, draws), plan.source)
    found: dict[tuple, np.ndarray] = {}
    for route in limit_checkers(params):
        if route.draw_limits is None:
            continue
        for where, expected, ok in route.draw_limits(params, inputs):
            broken = ~np.broadcast_to(np.asarray(ok, dtype=bool), (count,)) & candidates
            if broken.any():
                found[(where, expected)] = found.get((where, expected), np.zeros(count, dtype=bool)) | broken
    return found


@dataclass
class Outcome:
    """Every figure of every draw (arrays over the draws)."""

    total: np.ndarray
    intensity: dict[str, np.ndarray | None]
    by_stage: dict[str, np.ndarray]
    by_gas: dict[str, np.ndarray]
    scheme_values: dict[str, np.ndarray]
    scheme_findings: dict[
        str, list
    ]  # the rules read before the threshold (eligibility, electricity, boundary): the same for every draw
    schemes: list
    unit: str
    functional_unit: str
    boundary: str
    product: str
    co_product_open: dict = field(
        default_factory=dict
    )  # scheme id -> draws left undetermined by a co-product rule the route cannot apply


def co_product_values(
    plan: Plan, draws: Draws, count: int, scheme, values: np.ndarray, findings: list, nominal: dict
) -> tuple[np.ndarray, np.ndarray]:
    """A scheme's draws under its co-product rule, decided as ``core.scoring.co_product_checks`` decides a
    score (``co_product_rule``): (values, draws left undetermined). A draw that qualifies with the project
    giving the co-product no burden keeps its value (an upper bound); otherwise the draws are rescored with
    the scheme's method (the same draws through a variant of the project), or left undetermined where the
    route cannot apply it."""
    rule = co_product_rule(scheme, nominal)
    open_draws = np.zeros(count, dtype=bool)
    if rule is None or not rule.differs or status_of(findings, True) == Status.NOT_ELIGIBLE:
        return values, open_draws
    keep = (
        np.asarray(scheme.loosest().met_by(values), dtype=bool) & (status_of(findings, True) == Status.QUALIFIES)
        if rule.upper_bound
        else open_draws
    )
    if rule.rescore:
        data = plan.project.model_dump()
        section, name = rule.parameter.split(".")
        data[section][name] = rule.required
        variant = replace(
            plan, project=validate_project(data, plan.source), assessment=plan.assessment.but(schemes=(scheme.id,))
        )
        return np.where(keep, values, evaluate(variant, draws, count).scheme_values[scheme.id]), open_draws
    return values, ~keep


def _matched_draws(
    plan: Plan,
    scheme,
    reading,
    solved: StackedSolution,
    gwp_vector,
    lhv_and_fraction: tuple,
    params,
    period,
    values,
) -> np.ndarray:
    """A scheme's draws with the project's time series matched under the rule of the assessment year, as score
    matches them."""
    count, inventory = len(values), solved.inventory
    keys, flow_keys = solved.matrices.activity_keys, solved.matrices.flow_keys
    basis_demand, basis_product = basis_of(scheme, inventory)
    hydrogen_lhv, ammonia_lhv, fraction = lhv_and_fraction
    mix, gate = keys.index("electricity_mix"), solved.supply_of(inventory.gate)
    sources = params["electricity"]["sources"]
    counted_kg = charged_source_intensities(scheme, inventory, flow_keys, gwp_vector, reading)
    declared, grid_mix_kg = declared_and_grid_intensity(
        counted_kg, {name: source["share"] for name, source in sources.items()}, plan.series.generation_kwh
    )
    model = ElectricityModel(
        basis_kwh=solved.supply_of(basis_demand)[:, mix],
        kwh_per_kg_h2=gate[:, mix] / gate[:, keys.index(inventory.hydrogen)],
        counted_kg_per_kwh=counted_kg,
        declared_kg_per_kwh=declared,
        grid_kg_per_kwh=grid_mix_kg,
        value_per_total=intensities(np.ones(count), basis_product, hydrogen_lhv, ammonia_lhv, fraction)[
            scheme.quantity
        ],
        eligible=eligible_sources(scheme, reading.counted_zero, list(plan.series.generation_kwh)),
        granularity=scheme_granularity(scheme, period),
    )
    return matched_values_of_draws(scheme, plan.series, model, values)


def evaluate(plan: Plan, draws: Draws, count: int) -> Outcome:
    """Build the inventory once with arrays of draws and solve every draw stacked (``core.stacked``)."""
    params = params_with_draws(plan, draws.parameters)
    inputs = DrawInputs(plan.assessment.factor_set, _factor_draws(plan, draws), plan.source)
    check_physical_limits(
        params_with_draws(plan, {}), NumericInputs(plan.assessment.factor_set, plan.source), plan.source
    )
    staged = run_stages(params, inputs, plan.assessment.gwp, plan.assessment.scheme_list)
    inventory, chosen = staged.inventory, staged.chosen
    per_gwp = {gwp: per_system(vector, count) for gwp, vector in staged.per_gwp.items()}
    solved = solve_stacked_inventory(inventory, count)
    lhv_and_fraction = (
        np.asarray(staged.hydrogen_lhv, dtype=float),
        np.asarray(staged.ammonia_lhv, dtype=float),
        staged.fraction,
    )
    headline = headline_arrays(solved, per_gwp[plan.assessment.gwp], lhv_and_fraction)
    scheme_values, scheme_findings, co_product_open = _scheme_draws(
        plan, draws, count, chosen, params, solved, per_gwp, lhv_and_fraction
    )
    return Outcome(
        total=headline["total"],
        intensity={
            key: (None if value is None else np.broadcast_to(value, (count,)))
            for key, value in headline["intensity"].items()
        },
        by_stage=headline["by_stage"],
        by_gas=headline["by_gas"],
        scheme_values=scheme_values,
        scheme_findings=scheme_findings,
        schemes=chosen,
        unit=FUNCTIONAL_UNITS[inventory.reference_product][1],
        functional_unit=inventory.functional_unit,
        boundary=params["project"]["boundary"],
        product=inventory.product,
        co_product_open=co_product_open,
    )


def _scheme_draws(
    plan: Plan,
    draws: Draws,
    count: int,
    chosen: list,
    params: dict,
    solved: StackedSolution,
    per_gwp: dict,
    lhv_and_fraction: tuple,
) -> tuple[dict, dict, dict]:
    """Each chosen scheme's value in every draw, as ``score`` gives it: the rules read on the project's own
    values, the series matched under the rule of the assessment year, the co-product rule applied.

    ``solved`` holds the draws' solved systems; ``per_gwp`` the GWP vectors by set and draw;
    ``lhv_and_fraction`` the hydrogen and ammonia LHV (MJ/kg) and the hydrogen mass fraction. Returns (values,
    findings, draws left undetermined by a co-product rule) by scheme id."""
    inventory = solved.inventory
    scheme_values, scheme_findings, co_product_open = {}, {}, {}
    nominal = params_with_draws(plan, {})
    period = Period.year(checked_year(nominal, plan.assessment.year, plan.source))
    matched_periods = series_matched_periods(plan.series) if plan.series is not None else None
    for scheme in chosen:
        reading = read_rules(scheme, inventory, nominal, period, matched_periods)
        scheme_findings[scheme.id] = reading.findings
        gwp_vector = scheme_characterisation(per_gwp[scheme.gwp], scheme)
        values = scheme_value_arrays(solved, scheme, reading, gwp_vector, lhv_and_fraction, nominal)
        if plan.series is not None:
            values = _matched_draws(plan, scheme, reading, solved, gwp_vector, lhv_and_fraction, params, period, values)
        scheme_values[scheme.id], co_product_open[scheme.id] = co_product_values(
            plan, draws, count, scheme, values, reading.findings, nominal
        )
    return scheme_values, scheme_findings, co_product_open


def _take(draws: Draws, rows: slice) -> Draws:
    return Draws(
        draws.names,
        draws.uniform[rows],
        {k: v[rows] for k, v in draws.parameters.items()},
        {k: (nominal, chosen[rows]) for k, (nominal, chosen) in draws.factor_choices.items()},
        {k: v[rows] for k, v in draws.factors.items()},
    )


def _join(outcomes: list[Outcome]) -> Outcome:
    first = outcomes[0]
    if len(outcomes) == 1:
        return first

    def cat(key):
        return {
            k: (None if v is None else np.concatenate([getattr(o, key)[k] for o in outcomes]))
            for k, v in getattr(first, key).items()
        }

    return Outcome(
        np.concatenate([o.total for o in outcomes]),
        cat("intensity"),
        cat("by_stage"),
        cat("by_gas"),
        cat("scheme_values"),
        first.scheme_findings,
        first.schemes,
        first.unit,
        first.functional_unit,
        first.boundary,
        first.product,
        cat("co_product_open"),
    )


def draws_per_block(plan: Plan) -> int:
    """How many draws one stacked solve takes: ``BLOCK``, fewer when the system is large, so that the
    stacked matrices (draws x activities x activities, 8 bytes each, a few copies) stay within
    ``MEMORY_PER_BLOCK_BYTES`` whatever the number of electricity sources."""
    activities = len(
        build_inventory(params_with_draws(plan, {}), NumericInputs(plan.assessment.factor_set, plan.source)).activities
    )
    return int(max(1, min(BLOCK, MEMORY_PER_BLOCK_BYTES // (4 * 8 * activities**2))))


def evaluate_in_blocks(plan: Plan, draws: Draws, progress: Callable[[int], None] | None = None) -> Outcome:
    """``evaluate`` over blocks of at most ``BLOCK`` draws (the same numbers, bounded memory)."""
    count = len(draws.uniform)
    outcomes = []
    block = draws_per_block(plan)
    for start in range(0, count, block):
        rows = slice(start, min(start + block, count))
        outcomes.append(evaluate(plan, _take(draws, rows), rows.stop - rows.start))
        if progress is not None:
            progress(rows.stop - rows.start)
    return _join(outcomes)


# --- summary -------------------------------------------------------------------------------


class Summary(BaseModel):
    mean: float
    std: float
    p5: float
    p50: float
    p95: float
    standard_error: float  # Monte Carlo standard error of the mean, std / sqrt(draws)


class Probability(BaseModel):
    probability: float
    standard_error: float  # sqrt(p (1 - p) / draws)


class CheckProbability(BaseModel):
    scheme: str
    name: str
    quantity: str
    unit: str
    limit: float
    value: Summary
    probability_qualifies: float
    standard_error: float
    statuses: dict[str, Probability]
    tiers: dict[str, Probability]  # best tier met; "none" when no tier is met
    from_memory: bool


class InputDistribution(BaseModel):
    input: str
    distribution: dict[str, Any]
    stated_in: str = ""  # where a default distribution came from (a factor row's file); empty: the run's distributions
    # why the input got a default distribution (its row's pedigree scores, or its source grade); empty: stated by
    # the run
    default: str = ""
    from_memory: bool = False  # the distribution rests on values recorded from memory (the pedigree variance table)


class LimitBreak(BaseModel):
    field: str
    expected: str
    draws: int


class UncertaintyResult(BaseModel):
    carbonledger_version: str
    caution: str
    project: str
    project_file: str
    boundary: str
    functional_unit: str
    unit: str
    gwp_basis: str
    factor_set: dict[str, str]
    draws: int
    seed: int
    sampling: str
    draws_used: int  # draws within every physical limit: the statistics are over these
    draws_breaking_limits: int
    limit_breaks: list[LimitBreak]
    inputs: list[InputDistribution]
    correlations: list[dict[str, Any]]
    total: Summary
    intensity: dict[str, Summary | None]
    by_stage: dict[str, Summary]
    by_gas: dict[str, Summary]
    checks: list[CheckProbability]
    default_basis: str = ""  # with defaults from source grades: what the grade -> pedigree mapping is and rests on
    project_sha256: str = ""
    _scheme_draws: dict = PrivateAttr(
        default_factory=dict
    )  # scheme id -> (values of the draws used, [(tier, limit)]); for charts, not in JSON
    _draws: dict | None = PrivateAttr(
        default=None
    )  # every draw (inputs, total, scheme values), kept on request (keep_draws)
    _parameters: dict = PrivateAttr(default_factory=dict)  # the project's validated parameters (for the ledger)
    _factors_used: list = PrivateAttr(default_factory=list)  # factor rows the project reads (for the ledger)

    def to_json(self) -> str:
        return self.model_dump_json(indent=2)

    def scheme_draws(self) -> dict:
        """Each scheme's value in every draw used, and its thresholds: scheme id -> (array, [(tier, limit)])."""
        return self._scheme_draws

    def draw_columns(self) -> dict | None:
        """Every draw, column by column (draw, used, each input, total, each scheme's value), when
        the run kept them (``keep_draws``); None otherwise."""
        return self._draws

    def summary_for_ledger(self) -> dict:
        """The compact figures the run ledger keeps of a Monte Carlo run."""
        probabilities = "; ".join(
            f"{c.scheme} qualifies {c.probability_qualifies:.1%} (± {c.standard_error:.1%})" for c in self.checks
        )
        return {
            "analysis": "uncertainty",
            "headline": f"Monte Carlo, {self.draws:,} draws, seed {self.seed}: total mean {self.total.mean:.6g} (p5 "
            f"{self.total.p5:.6g}, p95 {self.total.p95:.6g}) {self.unit}"
            + (f"; {probabilities}" if probabilities else ""),
            "draws": self.draws,
            "seed": self.seed,
            "sampling": self.sampling,
            "draws_used": self.draws_used,
            "unit": self.unit,
            "total": self.total.mean,
            "total_spread": self.total.model_dump(),
            "inputs": [item.input for item in self.inputs],
            "checks": [
                {
                    "scheme": c.scheme,
                    "unit": c.unit,
                    "limit": c.limit,
                    "value": c.value.mean,
                    "p5": c.value.p5,
                    "p95": c.value.p95,
                    "probability_qualifies": c.probability_qualifies,
                    "standard_error": c.standard_error,
                }
                for c in self.checks
            ],
        }

    def ledger_entry(self, kind: str = "uncertainty") -> dict:
        """What the run ledger stores of this run (plain values; the ledger imports no result type)."""
        return {
            "project_path": self.project_file,
            "project_name": self.project,
            "project_sha256": self.project_sha256,
            "factor_set": self.factor_set["name"],
            "factor_set_sha256": self.factor_set["sha256"],
            "schemes": [check.scheme for check in self.checks],
            "boundary": self.boundary,
            "gwp": self.gwp_basis,
            "results": self.summary_for_ledger(),
            "parameters": self._parameters,
            "factors_used": self._factors_used,
            "kind": kind,
        }


def input_distribution(name: str, distribution) -> InputDistribution:
    spec = distribution.model_dump()
    return InputDistribution(
        input=name,
        distribution=spec,
        stated_in=getattr(distribution, "stated_in", ""),
        default=getattr(distribution, "basis", ""),
        from_memory=bool(spec.get("from_memory", False)),
    )


def summary(values: np.ndarray) -> Summary:
    values = np.asarray(values, dtype=float)
    count = len(values)
    if count == 0:
        nan = float("nan")
        return Summary(mean=nan, std=nan, p5=nan, p50=nan, p95=nan, standard_error=nan)
    p5, p50, p95 = np.percentile(values, [5, 50, 95])
    std = float(values.std(ddof=1)) if count > 1 else 0.0
    return Summary(
        mean=float(values.mean()),
        std=std,
        p5=float(p5),
        p50=float(p50),
        p95=float(p95),
        standard_error=std / np.sqrt(count),
    )


def probability(hits: np.ndarray) -> Probability:
    count = len(hits)
    p = float(hits.mean()) if count else float("nan")
    return Probability(probability=p, standard_error=float(np.sqrt(p * (1 - p) / count)) if count else float("nan"))


def statuses(
    scheme, values: np.ndarray, findings: list | None = None, co_product_open: np.ndarray | None = None
) -> dict[str, np.ndarray]:
    """Each draw's status under a scheme: the rules read before the threshold are the same for
    every draw (``findings``: a scheme the project is not eligible for is so whatever the value;
    an open rule leaves a draw that meets the threshold undetermined), then the loosest threshold;
    ``co_product_open`` marks draws a co-product rule the route cannot apply leaves undetermined."""
    met = np.asarray(scheme.loosest().met_by(values), dtype=bool)
    findings = findings or []
    none = np.zeros_like(met)
    if status_of(findings, True) == Status.NOT_ELIGIBLE:
        return {Status.QUALIFIES: none, Status.FAILS: none, Status.NOT_ELIGIBLE: ~none, Status.UNDETERMINED: none}
    open_rule = status_of(findings, True) == Status.UNDETERMINED
    forced = none if co_product_open is None else np.asarray(co_product_open, dtype=bool)
    return {
        Status.QUALIFIES: met & ~open_rule & ~forced,
        Status.FAILS: ~met & ~forced,
        Status.NOT_ELIGIBLE: none,
        Status.UNDETERMINED: (met & open_rule) | forced,
    }


def best_tiers(scheme, values: np.ndarray) -> np.ndarray:
    """The tightest threshold each draw meets ('none' when it meets none)."""
    tiers = np.full(len(values), "none", dtype=object)
    for threshold in sorted(scheme.thresholds, key=lambda t: -t.limit):
        tiers[threshold.met_by(values)] = threshold.tier
    return tiers


def draw_columns(plan: Plan, draws: Draws, outcome: Outcome, used: np.ndarray) -> dict:
    """Every draw as columns: number, used (within every physical limit), each input's value
    (a chosen factor id for a choice of factors), the total and each scheme's value."""
    columns: dict = {"draw": np.arange(1, len(used) + 1), "used": used}
    for path, values in draws.parameters.items():
        columns[f"parameter {path}"] = values
    for path, (_, chosen) in draws.factor_choices.items():
        columns[f"parameter {path}"] = chosen
    for factor_id, values in draws.factors.items():
        columns[f"factor {factor_id}"] = values
    columns[f"total ({outcome.unit})"] = outcome.total
    for scheme in outcome.schemes:
        columns[f"{scheme.id} ({scheme.unit})"] = outcome.scheme_values[scheme.id]
    return columns


def summarise(
    plan: Plan, draws: Draws, outcome: Outcome, seed: int, sampling: str, keep_draws: bool = False
) -> UncertaintyResult:
    count = len(draws.uniform)
    broken, reasons = limit_breaks(plan, draws, count)
    if broken.all():
        raise no_usable_draw(plan.source, count, reasons)
    used = ~broken
    checks = []
    for scheme in outcome.schemes:
        values = outcome.scheme_values[scheme.id][used]
        by_status = statuses(
            scheme,
            values,
            outcome.scheme_findings.get(scheme.id),
            outcome.co_product_open.get(scheme.id, np.zeros(len(used), dtype=bool))[used],
        )
        status = {name: probability(hits) for name, hits in by_status.items()}
        tiers = np.where(by_status[Status.QUALIFIES], best_tiers(scheme, values), "none")
        tier_names = [t.tier for t in sorted(scheme.thresholds, key=lambda t: t.limit)] + ["none"]
        checks.append(
            CheckProbability(
                scheme=scheme.id,
                name=scheme.name,
                quantity=scheme.quantity,
                unit=scheme.unit,
                limit=scheme.loosest().limit,
                value=summary(values),
                probability_qualifies=status[Status.QUALIFIES].probability,
                standard_error=status[Status.QUALIFIES].standard_error,
                statuses=status,
                tiers={name: probability(tiers == name) for name in tier_names},
                from_memory=scheme.from_memory or any(t.from_memory for t in scheme.thresholds),
            )
        )
    uncertainty = plan.uncertainty
    inputs = [input_distribution(f"parameter {p}", d) for p, d in uncertainty.parameters.items()]
    inputs += [input_distribution(f"factor {f}", d) for f, d in uncertainty.factors.items()]
    params = plan.project.model_dump()
    result = UncertaintyResult(
        carbonledger_version=__version__,
        caution=CAUTION,
        project=params["project"]["name"],
        project_file=plan.source,
        boundary=outcome.boundary,
        functional_unit=outcome.functional_unit,
        unit=outcome.unit,
        gwp_basis=plan.assessment.gwp,
        factor_set={"name": plan.assessment.factor_set.name, "sha256": plan.assessment.factor_set.sha256},
        draws=count,
        seed=seed,
        sampling=sampling,
        draws_used=int(used.sum()),
        draws_breaking_limits=int(broken.sum()),
        limit_breaks=[LimitBreak(**reason) for reason in reasons],
        inputs=inputs,
        correlations=[c.model_dump() for c in uncertainty.correlations],
        total=summary(outcome.total[used]),
        intensity={key: (None if value is None else summary(value[used])) for key, value in outcome.intensity.items()},
        by_stage={key: summary(value[used]) for key, value in outcome.by_stage.items()},
        by_gas={key: summary(value[used]) for key, value in outcome.by_gas.items()},
        checks=checks,
        default_basis=grade_defaults(factors_root()).basis
        if any(item.default.startswith(GRADE_DEFAULT) for item in inputs)
        else "",
    )
    result._scheme_draws = {
        scheme.id: (
            np.asarray(outcome.scheme_values[scheme.id][used], dtype=float),
            [(t.tier, t.limit) for t in scheme.thresholds],
        )
        for scheme in outcome.schemes
    }
    result._parameters = params
    result._factors_used = plan.used_rows
    if keep_draws:
        result._draws = draw_columns(plan, draws, outcome, used)
    return result


def monte_carlo(
    project,
    assessment: Assessment,
    uncertainty: Uncertainty,
    *,
    draws: int = DEFAULT_DRAWS,
    seed: int = DEFAULT_SEED,
    sampling: str | None = None,
    source: str = "project",
    progress: Callable[[int], None] | None = None,
    keep_draws: bool = False,
    project_sha256: str = "",
    series=None,
) -> UncertaintyResult:
    """Monte Carlo of one project: ``draws`` draws of its uncertain inputs through the whole chain,
    under the assessment's factor set, GWP set, schemes, boundary and year.

    keep_draws : keep every draw on the result (``draw_columns()``, for a draws CSV).
    series : the project's electricity time series; every scheme value of every draw is then
        matched under the scheme's rule, as ``score`` does.
    """
    check_draws(draws, seed)
    plan = make_plan(project, assessment, uncertainty, source=source, series=series)
    chosen_sampling = sampling or uncertainty.sampling
    drawn = draw(plan, draws, seed, chosen_sampling)
    outcome = evaluate_in_blocks(plan, drawn, progress)
    result = summarise(plan, drawn, outcome, seed, chosen_sampling, keep_draws)
    result.project_sha256 = project_sha256
    return result


# --- the same Monte Carlo in bw2calc -------------------------------------------------------

STATS_ARRAYS_TYPES = {
    "lognormal": 2,
    "pedigree": 2,
    "normal": 3,
    "uniform": 4,
    "triangular": 5,
}  # stats_arrays uncertainty type ids


def _uncertainty_row(distribution, scale: float, value: float) -> tuple:
    """One stats_arrays row (type, loc, scale, shape, minimum, maximum, negative) for an entry
    that is ``scale`` x the factor (scale > 0)."""
    nan = float("nan")
    kind = distribution.distribution
    if kind == "normal":
        return (3, scale * distribution.mean, scale * distribution.sd, nan, nan, nan, False)
    if kind in ("lognormal", "pedigree"):
        return (2, np.log(scale * distribution.median), np.log(distribution.gsd), nan, nan, nan, False)
    if kind == "uniform":
        return (4, value, nan, nan, scale * distribution.low, scale * distribution.high, False)
    return (5, scale * distribution.mode, nan, nan, scale * distribution.low, scale * distribution.high, False)


def bw2calc_entries(plan: Plan):
    """The nominal matrices of a plan and, per matrix, the stats_arrays distributions of the
    entries that uncertain factors drive (each entry in proportion to one factor).

    Found by building the inventory with each uncertain factor at its value and at twice it:
    an entry that doubles is proportional to that factor. A factor that enters an entry in any
    other way, or two factors in one entry, cannot be written as an entry distribution.
    """
    if plan.uncertainty.parameters or plan.uncertainty.correlations:
        raise InputError(
            plan.source,
            "uncertainty",
            "distributions on factors only, without correlations, for the bw2calc cross-check",
        )
    params = params_with_draws(plan, {})
    inputs = NumericInputs(plan.assessment.factor_set, plan.source)
    check_physical_limits(params, inputs, plan.source)
    inventory = build_inventory(params, inputs)
    matrices = build_matrices(inventory)
    headline = characterisation(inputs, plan.assessment.gwp)
    _, bwp = import_bw2calc()
    rows = {
        "technosphere": [
            (0, v, nan, nan, nan, nan, False) for v in matrices.technosphere_values for nan in [float("nan")]
        ],
        "biosphere": [(0, v, nan, nan, nan, nan, False) for v in matrices.biosphere_values for nan in [float("nan")]],
        "characterization": [(0, v, nan, nan, nan, nan, False) for v in headline for nan in [float("nan")]],
    }
    taken: set = set()
    for factor_id, distribution in plan.uncertainty.factors.items():
        if distribution.distribution not in STATS_ARRAYS_TYPES:
            raise InputError(
                plan.source,
                f"uncertainty.factors.{factor_id}",
                "normal, lognormal, pedigree, uniform or triangular for the bw2calc cross-check",
            )
        value = plan.assessment.factor_set.get(factor_id).value
        doubled = DrawInputs(plan.assessment.factor_set, {factor_id: np.array([value, 2 * value])}, plan.source)
        stacked = build_stacked_matrices(build_inventory(params_with_draws(plan, {}), doubled), 2)
        gwp_values = characterisation(doubled, plan.assessment.gwp)
        changed = {
            "technosphere": stacked.technosphere_values,
            "biosphere": stacked.biosphere_values,
            "characterization": gwp_values.T if gwp_values.ndim == 2 else np.vstack([gwp_values, gwp_values]),
        }
        entries = [
            (matrix, entry)
            for matrix, values in changed.items()
            for entry in np.flatnonzero(~np.isclose(values[0], values[1], rtol=1e-12, atol=0))
        ]
        if len(entries) != 1:
            # bw2calc samples every entry on its own: a factor in several entries would not be the same model
            raise InputError(
                plan.source,
                f"uncertainty.factors.{factor_id}",
                f"a factor that drives one matrix entry for the bw2calc cross-check, it drives {len(entries)}",
            )
        matrix, entry = entries[0]
        values = changed[matrix]
        if (
            (matrix, entry) in taken
            or not np.isclose(values[1][entry], 2 * values[0][entry], rtol=1e-9)
            or not values[0][entry] > 0
        ):
            raise InputError(
                plan.source,
                f"uncertainty.factors.{factor_id}",
                "a factor that enters its matrix entry in proportion, alone, for the bw2calc cross-check",
            )
        taken.add((matrix, entry))
        rows[matrix][entry] = _uncertainty_row(distribution, values[0][entry] / value, values[0][entry])
    distributions = {matrix: np.array(items, dtype=bwp.UNCERTAINTY_DTYPE) for matrix, items in rows.items()}
    return inventory, matrices, headline, distributions


def monte_carlo_with_bw2calc(plan: Plan, draws: int, seed: int = DEFAULT_SEED) -> np.ndarray:
    """The total of ``draws`` draws from bw2calc's own Monte Carlo (stats_arrays sampling of the
    datapackage's distributions, ``next(lca)`` per draw): the reference for the stacked draws."""
    inventory, matrices, headline, distributions = bw2calc_entries(plan)
    bw2calc, _ = import_bw2calc()
    column = {key: number for number, key in enumerate(matrices.activity_keys)}
    totals = np.empty(draws)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        lca = bw2calc.LCA(
            {column[inventory.reference]: 1.0},
            data_objs=[datapackage(matrices, headline, distributions)],
            use_distributions=True,
            seed_override=seed,
        )
        lca.lci()
        lca.lcia()
        totals[0] = lca.score
        for number in range(1, draws):
            next(lca)
            totals[number] = lca.score
    return totals
