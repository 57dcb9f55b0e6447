"""Many systems of one structure evaluated as arrays: Monte Carlo draws of one project, or the projects of a
portfolio that share a shape.

The stage code is arithmetic, so the same ``run_stages`` that builds one project's inventory builds ``count``
of them at once when its parameters (or factors) are arrays. This module solves such an inventory in one
stacked call (``solve_stacked_inventory``) and sums it as a score sums one project: the headline
(``headline_arrays``) and each scheme's value (``scheme_value_arrays``, through ``scoring.scheme_value``).
``analyses.uncertainty.evaluate`` runs it on draws; ``group_figures`` on the projects of one shape
(``shape_of``: the same text, dates, ids and switches, each number only of the same sign), whose rules read
alike, so that a portfolio of thousands is scored in a few dozen array passes.

References
----------
.. [1] Heijungs, R. and Suh, S. (2002). The Computational Structure of Life Cycle Assessment, ch. 2 (the
   inventory s = A^-1 f, g = B s, for each system).
"""

from __future__ import annotations

import copy
from dataclasses import dataclass

import numpy as np

from .engine import Matrices, build_stacked_matrices, solve_stacked_values
from .inputs import NumericInputs
from .inventory import Inventory, limit_checkers
from .results import CheckFigures, Intensity, ResultFigures
from .scoring import (
    LEAKED_HYDROGEN_GWP,
    Prepared,
    basis_of,
    check_figures,
    demands_of,
    factor_rows,
    finite_result,
    intensities,
    result_identity,
    run_stages,
    scheme_characterisation,
    scheme_reading,
    scheme_value,
    stage_and_gas_sums,
)

FREE_TEXT = frozenset({("project", "name"), ("project", "site"), ("project", "note")})  # read by no stage or rule
AGREEMENT = {"rtol": 1e-9, "atol": 1e-12}  # a group's arrays against its first member scored alone
BLOCK_MEMBERS = 2_000  # projects of one shape evaluated per array pass (bounds the stacked matrices' memory)


@dataclass
class StackedSolution:
    """``count`` solved systems of one structure: supply per demand and the biosphere, by system.

    ``supply`` is (count, activities, demands), units of each activity per unit of each demand;
    ``biosphere`` (count, flows, activities), kg of each flow per unit of each activity.
    """

    inventory: Inventory
    matrices: Matrices
    demands: list[str]
    supply: np.ndarray
    biosphere: np.ndarray
    count: int

    def supply_of(self, demand: str) -> np.ndarray:
        """Units of each activity per unit of ``demand``, (count, activities)."""
        return self.supply[:, :, self.demands.index(demand)]

    def contributions(self, demand: str, gwp_vector: np.ndarray) -> np.ndarray:
        """kg CO2e by system, flow and activity per unit of ``demand``, under ``gwp_vector`` (count, flows)."""
        return gwp_vector[:, :, None] * self.biosphere * self.supply_of(demand)[:, None, :]


def solve_stacked_inventory(inventory: Inventory, count: int) -> StackedSolution:
    """An inventory whose amounts are numbers or arrays of ``count`` values, solved for each of its demands.

    Parameters
    ----------
    inventory : Inventory
        Exchange amounts as floats or arrays of ``count`` values (units as ``engine.build_matrices`` takes them).
    count : int
        Number of systems.

    Returns
    -------
    StackedSolution
        The supply and the biosphere of every system.

    References
    ----------
    .. [1] Heijungs, R. and Suh, S. (2002). The Computational Structure of Life Cycle Assessment.
    """
    stacked = build_stacked_matrices(inventory, count)
    demands = demands_of(inventory)
    supply, biosphere = solve_stacked_values(stacked, demands)
    return StackedSolution(inventory, stacked, demands, supply, biosphere, count)


def per_system(vector: np.ndarray, count: int) -> np.ndarray:
    """A characterisation vector for every system.

    Parameters
    ----------
    vector : ndarray
        kg CO2e per kg of each flow: one for all, (flows,), or drawn, (flows, count).
    count : int
        Number of systems.

    Returns
    -------
    ndarray
        (count, flows), a read-only view where the vector is shared.
    """
    vector = np.asarray(vector, dtype=float)
    return np.broadcast_to(vector.T if vector.ndim == 2 else vector, (count, vector.shape[0]))


def headline_arrays(solved: StackedSolution, headline: np.ndarray, lhv_and_fraction: tuple) -> dict:
    """The headline of every system: kg CO2e per functional unit, its intensities, stages and gases.

    Parameters
    ----------
    solved : StackedSolution
        The solved systems.
    headline : ndarray
        The headline GWP vector per system, (count, flows) (``per_system``).
    lhv_and_fraction : tuple
        (hydrogen LHV in MJ/kg, ammonia LHV in MJ/kg, hydrogen mass fraction in kg H2/kg NH3): numbers or arrays.

    Returns
    -------
    dict
        ``total`` (count,), ``intensity`` (name -> array or None), ``hydrogen_production`` (kg CO2e/kg H2 at the
        hydrogen plant's gate, (count,)), ``by_stage`` and ``by_gas`` (name -> (count,)).
    """
    inventory = solved.inventory
    main = solved.contributions(inventory.reference, headline)
    total = main.sum(axis=(1, 2))
    by_stage, by_gas = stage_and_gas_sums(main, solved.matrices.activity_keys, solved.matrices.flow_keys, inventory)
    return {
        "total": total,
        "intensity": intensities(total, inventory.reference_product, *lhv_and_fraction),
        "hydrogen_production": solved.contributions(inventory.hydrogen, headline).sum(axis=(1, 2)),
        "by_stage": by_stage,
        "by_gas": by_gas,
    }


def scheme_value_arrays(
    solved: StackedSolution, scheme, reading, gwp_vector: np.ndarray, lhv_and_fraction: tuple, params: dict
) -> np.ndarray:
    """A scheme's value in every system, as ``scoring.scheme_value`` gives one project's.

    Parameters
    ----------
    solved : StackedSolution
        The solved systems.
    scheme : Scheme
        The rulebook read.
    reading : Reading
        Its rules read on the systems (``scoring.read_rules``; one reading for all).
    gwp_vector : ndarray
        The scheme's characterisation per system (``scoring.scheme_characterisation`` of ``per_system``).
    lhv_and_fraction : tuple
        (hydrogen LHV in MJ/kg, ammonia LHV in MJ/kg, hydrogen mass fraction in kg H2/kg NH3).
    params : dict
        The parameters the systems were built from (numbers or arrays).

    Returns
    -------
    ndarray
        (count,) values in the scheme's quantity.

    References
    ----------
    .. [1] Commission Delegated Regulation (EU) 2023/1185, Annex Part A: E = e_i + e_p + e_td + e_u - e_ccs.
    """
    inventory = solved.inventory
    basis_demand, basis_product = basis_of(scheme, inventory)
    value = scheme_value(
        scheme,
        inventory,
        solved.matrices.activity_keys,
        solved.matrices.flow_keys,
        reading,
        gwp_vector,
        solved.contributions(basis_demand, gwp_vector),
        solved.supply_of(basis_demand),
        (basis_product, *lhv_and_fraction),
        params,
    )
    return np.broadcast_to(value, (solved.count,))


# --- projects of one shape ------------------------------------------------------------------


def parameter_leaves(params: dict, prefix: tuple = ()):
    """Every leaf of a project's parameters, in the model's order.

    Parameters
    ----------
    params : dict
        The project's parameters (``Project.model_dump``).
    prefix : tuple
        The path of ``params`` itself within the whole.

    Returns
    -------
    iterator of tuple
        (path as a tuple of names, value).
    """
    for name, value in params.items():
        if isinstance(value, dict):
            yield from parameter_leaves(value, (*prefix, name))
        else:
            yield (*prefix, name), value


PLAIN = frozenset({str, int, bool, type(None)})  # leaves a shape holds as they are (hashable); others by repr


def shape_of(params: dict) -> tuple:
    """What projects scored together must share: every parameter except the free text, the numbers (floats) by
    their sign only.

    Texts, dates, factor ids, switches, whole numbers and lists decide the inventory's structure and how the
    rules read; a number's sign decides whether a source supplies or a stage is there. Projects of one shape
    differ only in the size of their numbers, which the stage code carries as arrays.

    Parameters
    ----------
    params : dict
        The project's parameters (``Project.model_dump``).

    Returns
    -------
    tuple
        A hashable key: nested (name, shape) pairs in the model's order.
    """
    project = {name: value for name, value in params["project"].items() if ("project", name) not in FREE_TEXT}
    return _shape({**params, "project": project})


def _shape(node: dict) -> tuple:
    return tuple(
        (
            name,
            _shape(value)
            if type(value) is dict
            else (value > 0) - (value < 0)
            if type(value) is float
            else (type(value), value)
            if type(value) in PLAIN
            else repr(value),
        )
        for name, value in node.items()
    )


def stacked_parameters(members: list[dict]) -> dict:
    """The parameters of projects of one shape as one set whose numbers are arrays.

    Parameters
    ----------
    members : list of dict
        The projects' parameters, all of one shape (``shape_of``).

    Returns
    -------
    dict
        A copy of the first member's parameters with every float an array over the members, in their order.
    """
    stacked = copy.deepcopy(members[0])
    for path, value in parameter_leaves(members[0]):
        if type(value) is float:
            node = stacked
            for part in path[:-1]:
                node = node[part]
            node[path[-1]] = np.array([_leaf(member, path) for member in members])
    return stacked


def _leaf(params: dict, path: tuple):
    for part in path:
        params = params[part]
    return params


@dataclass(frozen=True)
class Member:
    """One project of a group: its parameters (with the run's boundary), file and the file's sha256."""

    params: dict
    source: str
    sha256: str


def group_figures(template: Prepared, template_figures: ResultFigures, members: list[Member]) -> list | None:
    """The figures of projects of one shape as the first of them, ``template``, is scored alone.

    The first member is prepared and scored alone (``template``, ``template_figures``); the group is built
    once with its numbers as arrays, solved stacked, and judged with the first member's rule readings (rules
    read texts, dates, ids and whether a number is zero: the same across a shape). Each member's physical
    limits are checked on its own numbers. The first member's figures from the arrays must agree with its own
    to 1e-9, as a stacked solve must agree with bw2calc.

    Parameters
    ----------
    template : Prepared
        The first member, prepared alone under the run's assessment.
    template_figures : ResultFigures
        Its figures (``scoring.figures_of``).
    members : list of Member
        Every member, the first included, all of ``template``'s shape.

    Returns
    -------
    list of ResultFigures or None
        In the order of ``members``; None when the stage code does not build the group as one structure
        (a route that branches on a number): the caller scores them one by one.

    Raises
    ------
    InputError
        When a member breaks a physical limit or gives a figure that is NaN or infinite.
    RuntimeError
        When the arrays disagree with the first member scored alone.
    """
    inputs = NumericInputs(template.factor_set, template.source)
    checkers = limit_checkers(template.params)  # the same routes for every member of one shape
    for member in members:
        for route in checkers:
            route.check_limits(member.params, inputs, member.source)
    params = stacked_parameters([member.params for member in members])
    try:
        staged = run_stages(params, inputs, template.gwp, [scheme.id for scheme in template.chosen])
    except (ValueError, TypeError):  # a number decides a branch of the stage code: not one structure
        return None
    if list(staged.inventory.activities) != template.matrices.activity_keys:
        return None
    count = len(members)
    solved = solve_stacked_inventory(staged.inventory, count)
    lhv_and_fraction = (staged.hydrogen_lhv, staged.ammonia_lhv, staged.fraction)
    per_gwp = {gwp: per_system(vector, count) for gwp, vector in staged.per_gwp.items()}
    headline = headline_arrays(solved, per_gwp[template.gwp], lhv_and_fraction)
    values = {
        scheme.id: scheme_value_arrays(
            solved,
            scheme,
            scheme_reading(template, scheme),
            scheme_characterisation(per_gwp[scheme.gwp], scheme),
            lhv_and_fraction,
            params,
        ).tolist()
        for scheme in template.chosen
    }
    figures = member_figures(template, members, headline, values, factor_rows_by_member(solved, inputs))
    agreed(template_figures, figures[0])
    return [template_figures, *figures[1:]]


def factor_rows_by_member(solved: StackedSolution, inputs: NumericInputs) -> list[tuple]:
    """Each member's factor rows: those the group read, with the GWP of leaked hydrogen where the member leaks
    hydrogen (``scoring.flows_counted_apart`` reads it only there).

    Parameters
    ----------
    solved : StackedSolution
        The group's solved systems.
    inputs : NumericInputs
        What the group read (``inputs.used``).

    Returns
    -------
    list of tuple of Factor
        In the order of the members.
    """
    flows = solved.matrices.flow_keys
    leaking = np.zeros(solved.count, dtype=bool)
    if "h2" in flows:
        kg = (solved.biosphere[:, flows.index("h2"), :] * solved.supply_of(solved.inventory.reference)).sum(axis=1)
        leaking = kg > 0
    tight = tuple(factor_rows(inputs.used))
    if not leaking.any():
        return [tight] * solved.count
    inputs.factor(LEAKED_HYDROGEN_GWP, "kg CO2e/kg H2")
    leaky = tuple(factor_rows(inputs.used))
    return [leaky if one else tight for one in leaking.tolist()]


def member_figures(template: Prepared, members: list[Member], headline: dict, values: dict, factors: list) -> list:
    """Each member's figures from the group's arrays (``group_figures``).

    Parameters
    ----------
    template : Prepared
        The first member, prepared alone (its identity, schemes and rule readings).
    members : list of Member
        Every member, the first included.
    headline : dict
        ``headline_arrays`` of the group.
    values : dict
        Scheme id -> each member's value in the scheme's unit.
    factors : list of tuple of Factor
        Each member's factor rows (``factor_rows_by_member``).

    Returns
    -------
    list of ResultFigures
        In the order of ``members``.

    Raises
    ------
    InputError
        Naming a member's first figure that is NaN or infinite (``scoring.finite_result``).
    """
    identity = {
        name: value for name, value in result_identity(template).items() if name in ResultFigures.__dataclass_fields__
    }
    plain = {
        "total": headline["total"].tolist(),
        "hydrogen_production": headline["hydrogen_production"].tolist(),
        "intensity": {
            k: None if v is None else np.broadcast_to(v, (len(members),)).tolist()
            for k, v in headline["intensity"].items()
        },
        "by_stage": {k: v.tolist() for k, v in headline["by_stage"].items()},
        "by_gas": {k: v.tolist() for k, v in headline["by_gas"].items()},
    }
    by_scheme = [
        checks_of_values(scheme, values[scheme.id], scheme_reading(template, scheme)) for scheme in template.chosen
    ]
    finite = np.all([np.isfinite(column) for column in figure_columns(headline, values)], axis=0)
    figures = []
    for n, member in enumerate(members):
        checks = tuple(column[n] for column in by_scheme)
        figures.append(
            ResultFigures(
                **{
                    **identity,
                    "project": member.params["project"]["name"],
                    "project_file": member.source,
                    "project_sha256": member.sha256,
                },
                total=plain["total"][n],
                intensity=Intensity.model_construct(
                    **{k: None if v is None else v[n] for k, v in plain["intensity"].items()}
                ),
                hydrogen_production_kg_co2e_per_kg_h2=plain["hydrogen_production"][n],
                by_stage={k: v[n] for k, v in plain["by_stage"].items()},
                by_gas={k: v[n] for k, v in plain["by_gas"].items()},
                checks=checks,
                parameters=member.params,
                factors_used=factors[n],
            )
        )
        if not finite[n]:
            finite_result(figures[-1])  # names the figure that is NaN or infinite
    return figures


def figure_columns(headline: dict, values: dict) -> list[np.ndarray]:
    """Every figure of a group that must be finite (``scoring.finite_result``).

    Parameters
    ----------
    headline : dict
        ``headline_arrays`` of the group.
    values : dict
        Scheme id -> each member's value.

    Returns
    -------
    list of ndarray
        Arrays over the members.
    """
    columns = [headline["total"], headline["hydrogen_production"], *headline["by_stage"].values()]
    columns += [*headline["by_gas"].values(), *(v for v in headline["intensity"].values() if v is not None)]
    return [np.broadcast_to(np.asarray(column, dtype=float), headline["total"].shape) for column in columns] + [
        np.asarray(column, dtype=float) for column in values.values()
    ]


def checks_of_values(scheme, values: list[float], reading) -> list:
    """Each value's check figures, as ``scoring.check_figures`` makes them, judged once per set of tiers met.

    The verdict depends on the value only through which thresholds it meets (the findings are the group's).

    Parameters
    ----------
    scheme : Scheme
        The rulebook read.
    values : list of float
        Each member's value, in the scheme's unit.
    reading : Reading
        The scheme's rules read on the group (``scoring.read_rules``).

    Returns
    -------
    list of CheckFigures
        In the order of ``values``.
    """
    array = np.asarray(values, dtype=float)
    met = np.stack([np.asarray(t.met_by(array), dtype=bool).reshape(-1) for t in scheme.thresholds], axis=1)
    _, first, which = np.unique(met, axis=0, return_index=True, return_inverse=True)
    judged = [check_figures(scheme, values[n], reading) for n in first]
    return [
        CheckFigures(one.scheme, value, one.unit, one.limit, one.passes, one.status, one.tier, one.from_memory)
        for one, value in zip([judged[k] for k in which.reshape(-1).tolist()], values, strict=True)
    ]


def agreed(alone: ResultFigures, stacked: ResultFigures) -> None:
    """The first member's figures from the arrays against its own, to ``AGREEMENT``.

    Parameters
    ----------
    alone : ResultFigures
        The member scored alone.
    stacked : ResultFigures
        The same member from the group's arrays.

    Returns
    -------
    None

    Raises
    ------
    RuntimeError
        When a figure, a status, the stages, the gases or the factor rows differ.
    """
    pairs = [
        (alone.total, stacked.total),
        (alone.hydrogen_production_kg_co2e_per_kg_h2, stacked.hydrogen_production_kg_co2e_per_kg_h2),
    ]
    for mine, theirs in ((alone.by_stage, stacked.by_stage), (alone.by_gas, stacked.by_gas)):
        pairs += [(value, theirs.get(key, np.nan)) for key, value in mine.items()]
    intensity = stacked.intensity.model_dump()
    pairs += [(value, intensity[key]) for key, value in alone.intensity.model_dump().items() if value is not None]
    pairs += [(a.value, b.value) for a, b in zip(alone.checks, stacked.checks, strict=True)]
    same = (
        all(np.isclose(a, b, **AGREEMENT) for a, b in pairs)
        and [c.status for c in alone.checks] == [c.status for c in stacked.checks]
        and alone.factors_used == stacked.factors_used
        and list(alone.by_gas) == list(stacked.by_gas)
    )
    if not same:
        raise RuntimeError(f"the projects of one shape as arrays disagree with {alone.project_file} scored alone")
