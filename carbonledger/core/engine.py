"""Matrix LCA: exchanges -> technosphere and biosphere matrices -> Brightway solve.

Building the matrices (``build_matrices``) is kept apart from solving them (``solve``) so
that one assembled system can be solved for several demands and characterised with several
GWP100 sets without being rebuilt. Solving uses bw2calc on an in-memory bw_processing
datapackage; no Brightway project directory is created.

Notation as in Heijungs and Suh (2002): technosphere matrix A, biosphere matrix B, demand f,
supply s = A^-1 f, inventory g = B s, characterised score h = c^T B s.

References
----------
.. [1] Heijungs, R. and Suh, S. (2002). The Computational Structure of Life Cycle Assessment.
   Kluwer Academic Publishers.
.. [2] Mutel, C. (2017). Brightway: An open source framework for Life Cycle Assessment.
   Journal of Open Source Software, 2(12), 236.
"""

from __future__ import annotations

import warnings
from dataclasses import dataclass

import numpy as np

from ..model.flows import FLOWS

INDICES_DTYPE = np.dtype([("row", np.int32), ("col", np.int32)])  # same layout as bw_processing
FLOW_ID_OFFSET = 10_000


@dataclass
class Matrices:
    """Coordinates and values of A and B, ready for a datapackage."""

    activity_keys: list[str]
    flow_keys: list[str]
    technosphere_indices: np.ndarray
    technosphere_values: np.ndarray
    technosphere_flip: np.ndarray
    biosphere_indices: np.ndarray
    biosphere_values: np.ndarray


@dataclass
class Solution:
    """Supply and inventory of one demand, in the order of ``activity_keys``/``flow_keys``."""

    demand: str
    activity_keys: list[str]
    flow_keys: list[str]
    supply: np.ndarray  # units of each activity's product per unit of demand
    inventory: np.ndarray  # kg of each flow (rows) emitted by each activity (columns)

    def contributions(self, characterisation: np.ndarray, zero_rated: np.ndarray | None = None) -> np.ndarray:
        """kg CO2e by (flow, activity); activities in ``zero_rated`` (bool mask) count zero."""
        result = characterisation[:, None] * self.inventory
        if zero_rated is not None:
            result = result * ~zero_rated[None, :]
        return result


def build_matrices(inventory) -> Matrices:
    """The technosphere and biosphere matrices of an inventory, as bw_processing coordinates and values.

    Each activity makes one unit of its product (a 1 on the diagonal); an input is a flipped (negative)
    technosphere entry, an emission a biosphere entry in kg of its flow.

    Parameters
    ----------
    inventory : Inventory
        The project's activities (``core.inventory.build_inventory``), exchange amounts per unit of each activity.

    Returns
    -------
    Matrices
        Activity and flow keys; technosphere coordinates, values (in the activities' units) and flip flags;
        biosphere coordinates and values (kg of each flow per unit of activity).

    References
    ----------
    .. [1] Heijungs, R. and Suh, S. (2002). The Computational Structure of Life Cycle Assessment.
    """
    activity_keys = list(inventory.activities)
    column = {key: number for number, key in enumerate(activity_keys)}
    flow_keys = list(FLOWS)
    flow_row = {key: FLOW_ID_OFFSET + number for number, key in enumerate(flow_keys)}
    tech_rows, tech_values, tech_flip = [], [], []
    bio_rows, bio_values = [], []
    for key, activity in inventory.activities.items():
        col = column[key]
        tech_rows.append((col, col))
        tech_values.append(1.0)
        tech_flip.append(False)
        for exchange in activity.exchanges:
            if exchange.kind == "technosphere":
                tech_rows.append((column[exchange.input], col))
                tech_values.append(float(exchange.amount))
                tech_flip.append(True)
            else:
                bio_rows.append((flow_row[exchange.input], col))
                bio_values.append(float(exchange.amount))
    return Matrices(
        activity_keys=activity_keys,
        flow_keys=flow_keys,
        technosphere_indices=np.array(tech_rows, dtype=INDICES_DTYPE),
        technosphere_values=np.array(tech_values, dtype=float),
        technosphere_flip=np.array(tech_flip, dtype=bool),
        biosphere_indices=np.array(bio_rows, dtype=INDICES_DTYPE),
        biosphere_values=np.array(bio_values, dtype=float),
    )


def import_bw2calc():
    """bw2calc and bw_processing, imported on first use with their import-time warnings silenced.

    Returns
    -------
    tuple of (module, module)
        The ``bw2calc`` and ``bw_processing`` modules.
    """
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        import bw2calc
        import bw_processing

    return bw2calc, bw_processing


def datapackage(matrices: Matrices, characterisation: np.ndarray, distributions: dict | None = None):
    """An in-memory bw_processing datapackage of A, B and a diagonal characterisation matrix.

    ``distributions`` (optional) gives, for "technosphere", "biosphere" and "characterization",
    a bw_processing ``UNCERTAINTY_DTYPE`` array (stats_arrays uncertainty types) per entry, which
    bw2calc samples with ``use_distributions=True``.

    Parameters
    ----------
    matrices : Matrices
        The system, as ``build_matrices`` gives it.
    characterisation : ndarray
        Characterisation factor of each flow, kg CO2e per kg of the flow (e.g. GWP100), in ``flow_keys`` order.
    distributions : dict, optional
        Uncertainty arrays by matrix name, as above.

    Returns
    -------
    bw_processing.Datapackage
        The datapackage bw2calc reads.
    """
    _, bwp = import_bw2calc()
    package = bwp.create_datapackage()
    distributions = distributions or {}
    package.add_persistent_vector(
        matrix="technosphere_matrix",
        name="technosphere",
        indices_array=matrices.technosphere_indices,
        data_array=matrices.technosphere_values,
        flip_array=matrices.technosphere_flip,
        distributions_array=distributions.get("technosphere"),
    )
    package.add_persistent_vector(
        matrix="biosphere_matrix",
        name="biosphere",
        indices_array=matrices.biosphere_indices,
        data_array=matrices.biosphere_values,
        distributions_array=distributions.get("biosphere"),
    )
    flow_ids = [FLOW_ID_OFFSET + number for number in range(len(matrices.flow_keys))]
    package.add_persistent_vector(
        matrix="characterization_matrix",
        name="characterization",
        indices_array=np.array([(i, i) for i in flow_ids], dtype=INDICES_DTYPE),
        data_array=np.asarray(characterisation, dtype=float),
        distributions_array=distributions.get("characterization"),
    )
    return package


def solve(matrices: Matrices, demands: list[str], characterisation: np.ndarray) -> tuple[dict[str, Solution], float]:
    """Solve A s = f for each demand (one unit of an activity's product) with bw2calc.

    Returns the solutions by demand and bw2calc's characterised score of the first demand, which
    callers use as the reference the numpy characterisation is checked against.

    Parameters
    ----------
    matrices : Matrices
        The system, as ``build_matrices`` gives it.
    demands : list of str
        Activity keys whose one unit of product is demanded, in turn (e.g. the functional unit and the gate).
    characterisation : ndarray
        Characterisation factor of each flow, kg CO2e per kg of the flow, in ``flow_keys`` order.

    Returns
    -------
    tuple of (dict of str to Solution, float)
        Per demand: the supply s (units of each activity per unit demanded) and the inventory
        g = B diag(s) (kg of each flow by activity); and the first demand's score, kg CO2e per unit.

    References
    ----------
    .. [1] Heijungs, R. and Suh, S. (2002). The Computational Structure of Life Cycle Assessment.
    """
    bw2calc, _ = import_bw2calc()
    column = {key: number for number, key in enumerate(matrices.activity_keys)}
    flow_ids = [FLOW_ID_OFFSET + number for number in range(len(matrices.flow_keys))]
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        lca = bw2calc.LCA({column[demands[0]]: 1.0}, data_objs=[datapackage(matrices, characterisation)])
        lca.lci()
        lca.lcia()
        first_score = float(lca.score)
    activity_order = [lca.dicts.activity[column[key]] for key in matrices.activity_keys]
    flow_order = [lca.dicts.biosphere[i] if i in lca.dicts.biosphere else None for i in flow_ids]
    solutions: dict[str, Solution] = {}
    for number, demand in enumerate(demands):
        if number:
            with warnings.catch_warnings():
                warnings.simplefilter("ignore")
                lca.lci(demand={column[demand]: 1.0})
        dense = lca.inventory.toarray()
        inventory = np.zeros((len(flow_ids), len(activity_order)))
        for row, position in enumerate(flow_order):
            if position is not None:
                inventory[row, :] = dense[position, activity_order]
        solutions[demand] = Solution(
            demand, matrices.activity_keys, matrices.flow_keys, np.asarray(lca.supply_array)[activity_order], inventory
        )
    return solutions, first_score


def structure_key(matrices: Matrices, demands: list[str]) -> tuple:
    """What two systems must share to be solved together: activities, coordinates, demands.

    Parameters
    ----------
    matrices : Matrices
        The system, as ``build_matrices`` gives it.
    demands : list of str
        The activity keys demanded.

    Returns
    -------
    tuple
        A hashable key; systems with equal keys differ only in their values.
    """
    return (
        tuple(matrices.activity_keys),
        matrices.technosphere_indices.tobytes(),
        matrices.technosphere_flip.tobytes(),
        matrices.biosphere_indices.tobytes(),
        tuple(demands),
    )


def build_stacked_matrices(inventory, count: int) -> Matrices:
    """Matrices of ``count`` systems of one structure whose exchange amounts are arrays of draws.

    Every exchange amount (a float, or a numpy array of ``count`` draws built by the same stage
    code) is broadcast to ``count`` values; ``technosphere_values`` and ``biosphere_values`` are
    then (count, exchanges) arrays with the coordinates of ``build_matrices``.

    Parameters
    ----------
    inventory : Inventory
        The project's activities, exchange amounts as floats or arrays of ``count`` draws (units as in
        ``build_matrices``).
    count : int
        Number of systems (draws).

    Returns
    -------
    Matrices
        The coordinates of ``build_matrices`` with (count, exchanges) value arrays.
    """
    activity_keys = list(inventory.activities)
    column = {key: number for number, key in enumerate(activity_keys)}
    flow_keys = list(FLOWS)
    flow_row = {key: FLOW_ID_OFFSET + number for number, key in enumerate(flow_keys)}
    tech_rows, tech_values, tech_flip, bio_rows, bio_values = [], [], [], [], []
    ones = np.ones(count)
    for key, activity in inventory.activities.items():
        col = column[key]
        tech_rows.append((col, col))
        tech_values.append(ones)
        tech_flip.append(False)
        for exchange in activity.exchanges:
            amount = np.broadcast_to(np.asarray(exchange.amount, dtype=float), (count,))
            if exchange.kind == "technosphere":
                tech_rows.append((column[exchange.input], col))
                tech_values.append(amount)
                tech_flip.append(True)
            else:
                bio_rows.append((flow_row[exchange.input], col))
                bio_values.append(amount)
    return Matrices(
        activity_keys=activity_keys,
        flow_keys=flow_keys,
        technosphere_indices=np.array(tech_rows, dtype=INDICES_DTYPE),
        technosphere_values=np.stack(tech_values, axis=1),
        technosphere_flip=np.array(tech_flip, dtype=bool),
        biosphere_indices=np.array(bio_rows, dtype=INDICES_DTYPE),
        biosphere_values=np.stack(bio_values, axis=1) if bio_values else np.zeros((count, 0)),
    )


def _scatter(values: np.ndarray, rows: np.ndarray, cols: np.ndarray, height: int, width: int) -> np.ndarray:
    """(n, height, width) dense matrices from (n, entries) values at (row, col); repeated coordinates add up."""
    count = values.shape[0]
    if values.shape[1] == 0:
        return np.zeros((count, height, width))
    flat = (
        np.arange(count)[:, None] * (height * width)
        + (np.asarray(rows, dtype=np.int64) * width + np.asarray(cols, dtype=np.int64))[None, :]
    ).ravel()
    return np.bincount(flat, weights=values.ravel(), minlength=count * height * width).reshape(count, height, width)


def solve_stacked_values(stacked: Matrices, demands: list[str]) -> tuple[np.ndarray, np.ndarray]:
    """Solve stacked systems (values (n, exchanges), as ``build_stacked_matrices`` gives).

    A is assembled as an (n, k, k) array and ``numpy.linalg.solve`` factorises every system in
    one call. Returns the supply s = A^-1 f, (n, k, demands), and B, (n, flows, k); the
    inventory of demand d is B * s[:, None, :, d].

    Parameters
    ----------
    stacked : Matrices
        The systems, values of shape (n, exchanges).
    demands : list of str
        Activity keys whose one unit of product is demanded.

    Returns
    -------
    tuple of (ndarray, ndarray)
        The supply, units of each activity per unit demanded, shape (n, k, demands); and B, kg of each
        flow per unit of each activity, shape (n, flows, k).

    References
    ----------
    .. [1] Heijungs, R. and Suh, S. (2002). The Computational Structure of Life Cycle Assessment.
    """
    values = stacked.technosphere_values
    count, size = values.shape[0], len(stacked.activity_keys)
    column = {key: number for number, key in enumerate(stacked.activity_keys)}
    signs = np.where(stacked.technosphere_flip, -1.0, 1.0)
    technosphere = _scatter(
        values * signs, stacked.technosphere_indices["row"], stacked.technosphere_indices["col"], size, size
    )
    rows = stacked.biosphere_indices["row"].astype(np.int64) - FLOW_ID_OFFSET
    biosphere = _scatter(stacked.biosphere_values, rows, stacked.biosphere_indices["col"], len(stacked.flow_keys), size)
    demand_vectors = np.zeros((count, size, len(demands)))
    for number, demand in enumerate(demands):
        demand_vectors[:, column[demand], number] = 1.0
    return np.linalg.solve(technosphere, demand_vectors), biosphere


def solve_many(systems: list[Matrices], demands: list[str]) -> list[dict[str, Solution]]:
    """Solve many systems of one structure (same ``structure_key``) at once.

    The coordinates are taken from the first system and the values of all systems are stacked
    (``solve_stacked_values``); the supply s = A^-1 f and inventory g = B diag(s) are as in
    ``solve``. bw2calc stays the reference: ``solve`` on any one system gives the same numbers,
    which the callers check on one member of every group and the tests check on all of them.

    Parameters
    ----------
    systems : list of Matrices
        Systems with one ``structure_key``, as ``build_matrices`` gives them.
    demands : list of str
        Activity keys whose one unit of product is demanded.

    Returns
    -------
    list of dict of str to Solution
        For each system, per demand: the supply (units per unit demanded) and the inventory (kg of each flow
        by activity).

    References
    ----------
    .. [1] Heijungs, R. and Suh, S. (2002). The Computational Structure of Life Cycle Assessment.
    """
    first = systems[0]
    stacked = Matrices(
        first.activity_keys,
        first.flow_keys,
        first.technosphere_indices,
        np.stack([system.technosphere_values for system in systems]),
        first.technosphere_flip,
        first.biosphere_indices,
        np.stack([system.biosphere_values for system in systems])
        if len(first.biosphere_indices)
        else np.zeros((len(systems), 0)),
    )
    supply, biosphere = solve_stacked_values(stacked, demands)
    results = []
    for index in range(len(systems)):
        results.append(
            {
                demand: Solution(
                    demand,
                    first.activity_keys,
                    first.flow_keys,
                    supply[index, :, number],
                    biosphere[index] * supply[index, None, :, number],
                )
                for number, demand in enumerate(demands)
            }
        )
    return results
