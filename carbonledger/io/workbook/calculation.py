"""The Calculation sheet's machinery, shared by the Results and Periods sheets: the project's
inventory run on symbolic cells, and one block of exchanges written as live formulas.

Supply of activity j per functional unit: s_j = f_j + sum over consumers k of a_jk * s_k, where
a_jk is the amount of j one unit of k consumes. The chain is acyclic, so each s_j is a finite
formula of the s_k downstream of it; this is the technosphere system A s = f of the engine
(Heijungs and Suh 2002) written out row by row.

References
----------
.. [1] Heijungs, R. and Suh, S. (2002). The Computational Structure of Life Cycle Assessment.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

from ...core.inventory import Inventory
from ...core.scoring import run_stages, zero_rated
from ...errors import InputError
from ...model.flows import FLOWS
from ...routes import STAGES
from .cells import SymbolicInputs, Term, local, ref, sum_of
from .layout import bold_row, font_bold, put_formula, put_text, set_widths


# the symbolic model -------------------------------------------------------------------------
@dataclass
class SymbolicModel:
    """The project's inventory and figures as Terms, with where each input lives."""

    inventory: Inventory
    inputs: SymbolicInputs
    headline: list  # GWP Term (or 1.0) per flow, in the order of FLOWS
    per_gwp: dict[str, list]
    hydrogen_lhv: Any
    ammonia_lhv: Any
    hydrogen_fraction: Any
    # scheme id -> electricity activities its rules count at zero (from the engine's checks)
    counted_zero: dict = field(default_factory=dict)
    declared_e_td: Any = None  # the Inputs cell of project.declared_e_td_g_co2e_per_mj (None: not declared)
    # scheme id -> {failing electricity activity: grid activity whose intensity it is charged}
    charged_as_grid: dict = field(default_factory=dict)


def basis_product_of(scheme, inventory: Inventory) -> str:
    """The product a scheme's value is expressed per: delivered, at the plant gate, or hydrogen."""
    if scheme.basis == "delivered":
        return inventory.reference_product
    return inventory.product if scheme.basis == "product" else "hydrogen"


def symbolic_model(params_symbolic: dict, factor_set, gwp: str, schemes: list[str]) -> SymbolicModel:
    """Run the engine's own arithmetic (``core.scoring.run_stages``: inventory, characterisation, heating
    values) on cells; ``schemes`` are the ids of the schemes checked."""
    inputs = SymbolicInputs(factor_set)
    staged = run_stages(params_symbolic, inputs, gwp, schemes)
    per_gwp = {name: list(vector) for name, vector in staged.per_gwp.items()}
    return SymbolicModel(
        staged.inventory, inputs, per_gwp[gwp], per_gwp, staged.hydrogen_lhv, staged.ammonia_lhv, staged.fraction
    )


def consumers_of(inventory: Inventory) -> dict[str, list[tuple[str, int]]]:
    """For each activity, the (consumer, exchange index) pairs that consume its product."""
    result: dict[str, list[tuple[str, int]]] = {key: [] for key in inventory.activities}
    for key, activity in inventory.activities.items():
        for index, exchange in enumerate(activity.exchanges):
            if exchange.kind == "technosphere":
                result[exchange.input].append((key, index))
    return result


def check_acyclic(inventory: Inventory, source: str) -> list[str]:
    """Activities in supply order (consumers before suppliers); refuse a loop in the chain."""
    consumers = consumers_of(inventory)
    order: list[str] = []
    state: dict[str, int] = {}

    def visit(key: str, path: tuple[str, ...]) -> None:
        if state.get(key) == 2:
            return
        if state.get(key) == 1:
            loop = " -> ".join(path[path.index(key) :] + (key,))
            raise InputError(source, "inventory", f"a supply chain without loops for the workbook; found {loop}")
        state[key] = 1
        for consumer, _ in consumers[key]:
            visit(consumer, path + (key,))
        state[key] = 2
        order.append(key)

    for key in inventory.activities:
        visit(key, ())
    return order


@dataclass
class CalculationBlock:
    """Where one block of exchanges was written, for the results to reference."""

    sheet: str
    activity_row: dict[str, int] = field(default_factory=dict)
    exchange_rows: list[tuple[int, str, Any]] = field(default_factory=list)  # (row, activity key, exchange)
    headline_column: str = "K"
    scheme_column: dict[str, str] = field(default_factory=dict)
    gate_column: str = "L"
    end_row: int = 0


EXCHANGE_COLUMNS = (
    "activity",
    "stage",
    "kind",
    "input (activity) or emission (gas)",
    "description",
    "unit, per unit of the activity's product",
    "amount per unit of the activity",
    "supply of the activity per functional unit",
    "amount per functional unit",
    "GWP100 (headline set)",
    "kg CO2e per functional unit",
    "kg CO2e per kg H2 at the hydrogen plant gate (headline set)",
)


ACTIVITY_COLUMNS = (
    "activity",
    "stage",
    "name",
    "unit of product",
    "supply per functional unit",
    "supply per kg H2 at the hydrogen plant gate",
    "supply per unit of product at the plant gate",
)


def write_calculation_block(
    ws, model: SymbolicModel, chosen, address: dict[str, str], *, top: int, title: str, scale_column: dict | None = None
) -> CalculationBlock:
    """Activities with supply formulas, then one row per exchange; returns where things are.

    ``scale_column`` optionally maps a supplier key to a cell (Term) that multiplies every
    exchange consuming it (used by the period blocks to match metered electricity).
    """
    from openpyxl.utils import get_column_letter

    inventory = model.inventory
    block = CalculationBlock(sheet=ws.title)
    row = _write_block_heading(ws, top, title)
    for key in inventory.activities:
        row += 1
        block.activity_row[key] = row
    row += 2  # the exchange header; exchange rows first (their addresses are needed by the supply formulas)
    headers = list(EXCHANGE_COLUMNS) + [
        f"kg CO2e per unit of basis, {scheme.id} ({scheme.gwp.upper()})" for scheme in chosen
    ]
    for column, text in enumerate(headers, start=1):
        put_text(ws, row, column, text)
    bold_row(ws, row, len(headers))
    for position, scheme in enumerate(chosen):
        block.scheme_column[scheme.id] = get_column_letter(len(EXCHANGE_COLUMNS) + 1 + position)
    pairs = [(key, index) for key, activity in inventory.activities.items() for index in range(len(activity.exchanges))]
    exchange_row = {pair: row + 1 + number for number, pair in enumerate(pairs)}
    for key, index in pairs:
        row += 1
        exchange = inventory.activities[key].exchanges[index]
        block.exchange_rows.append((row, key, exchange))
        _write_exchange_row(ws, row, model, block, key, exchange, address, scale_column)
        if exchange.kind == "biosphere":
            _write_scheme_cells(ws, row, model, chosen, block, key, index, address, exchange_row)
    _write_activity_rows(ws, inventory, block, address, exchange_row)
    set_widths(
        ws, {"A": 26, "B": 24, "C": 10, "D": 26, "E": 52, "F": 22, "G": 18, "H": 18, "I": 18, "J": 12, "K": 18, "L": 18}
    )
    for position in range(len(chosen)):
        ws.column_dimensions[get_column_letter(len(EXCHANGE_COLUMNS) + 1 + position)].width = 20
    block.end_row = row
    return block


def _write_block_heading(ws, top: int, title: str) -> int:
    """The block's title, the supply equation in words and the activity header; returns the header's row."""
    put_text(ws, top, 1, title)
    ws.cell(row=top, column=1).font = font_bold()
    put_text(
        ws,
        top + 1,
        1,
        "Supply: units of each activity's product per functional unit = demand + sum over consumers of "
        "(amount consumed per unit of the consumer x supply of the consumer).",
    )
    row = top + 3
    for column, text in enumerate(ACTIVITY_COLUMNS, start=1):
        put_text(ws, row, column, text)
    bold_row(ws, row, len(ACTIVITY_COLUMNS))
    return row


def _write_exchange_row(
    ws, row: int, model: SymbolicModel, block: CalculationBlock, key: str, exchange, address, scale_column: dict | None
) -> None:
    """One exchange: words, its amount (scaled by a metered cell where asked), and for an emission its kg CO2e."""
    activity = model.inventory.activities[key]
    for column, text in enumerate(
        (
            key,
            activity.stage,
            "input" if exchange.kind == "technosphere" else "emission",
            exchange.input,
            exchange.label,
            exchange.unit,
        ),
        start=1,
    ):
        put_text(ws, row, column, text)
    amount = exchange.amount
    if scale_column and exchange.kind == "technosphere" and exchange.input in scale_column:
        amount = Term.of(amount) * scale_column[exchange.input]
    supply = local("E", block.activity_row[key])
    put_formula(ws, row, 7, amount, address)
    put_formula(ws, row, 8, supply, address)
    put_formula(ws, row, 9, local("G", row) * local("H", row), address)
    if exchange.kind != "biosphere":
        return
    put_formula(ws, row, 10, model.headline[FLOW_INDEX[exchange.input]], address)
    put_formula(ws, row, 11, local("I", row) * local("J", row), address)
    put_formula(ws, row, 12, local("G", row) * local("F", block.activity_row[key]) * local("J", row), address)


def _grid_intensity(model: SymbolicModel, grid_key: str, gwp: str, exchange_row: dict):
    """kg CO2e per kWh of the grid source under a GWP set: its emission amounts (column G) x GWP."""
    emissions = [
        (index, e) for index, e in enumerate(model.inventory.activities[grid_key].exchanges) if e.kind == "biosphere"
    ]
    return sum_of(
        local("G", exchange_row[(grid_key, index)]) * model.per_gwp[gwp][FLOW_INDEX[e.input]] for index, e in emissions
    )


def _write_scheme_cells(
    ws,
    row: int,
    model: SymbolicModel,
    chosen,
    block: CalculationBlock,
    key: str,
    index: int,
    address,
    exchange_row: dict,
) -> None:
    """An emission's kg CO2e per unit of each scheme's basis: zero-rated (with the reason), charged at the grid, or
    counted."""
    inventory = model.inventory
    activity = inventory.activities[key]
    exchange = activity.exchanges[index]
    first_emission = next(i for i, e in enumerate(activity.exchanges) if e.kind == "biosphere")
    arow = block.activity_row[key]
    for position, scheme in enumerate(chosen):
        column = len(EXCHANGE_COLUMNS) + 1 + position
        charged = model.charged_as_grid.get(scheme.id, {})
        basis_supply = {"product": local("G", arow), "delivered": local("E", arow)}.get(scheme.basis, local("F", arow))
        if key in charged and index == first_emission:  # a failing source: its kWh at the grid source's intensity
            put_formula(
                ws, row, column, basis_supply * _grid_intensity(model, charged[key], scheme.gwp, exchange_row), address
            )
            continue
        reason = zero_rated(scheme, inventory, key, model.counted_zero.get(scheme.id, ()), charged)
        if reason:
            put_text(ws, row, column, reason)
            continue
        put_formula(
            ws,
            row,
            column,
            local("G", row) * basis_supply * model.per_gwp[scheme.gwp][FLOW_INDEX[exchange.input]],
            address,
        )


def _write_activity_rows(ws, inventory: Inventory, block: CalculationBlock, address, exchange_row: dict) -> None:
    """Each activity's supply per functional unit, per kg H2 at the plant gate and per unit of product at the gate."""
    consumers = consumers_of(inventory)
    for key, activity in inventory.activities.items():
        arow = block.activity_row[key]
        for column, text in enumerate((key, activity.stage, activity.name, activity.unit), start=1):
            put_text(ws, arow, column, text)
        for column, letter, demand in (
            (5, "E", inventory.reference),
            (6, "F", inventory.hydrogen),
            (7, "G", inventory.gate),
        ):
            terms = [Term("1")] if key == demand else []
            terms += [
                local("G", exchange_row[(consumer, index)]) * local(letter, block.activity_row[consumer])
                for consumer, index in consumers[key]
            ]
            put_formula(ws, arow, column, sum_of(terms), address)


FLOW_INDEX = {flow: number for number, flow in enumerate(FLOWS)}


def cell_of(block: CalculationBlock, column: str, row: int) -> Term:
    return ref(block.sheet, column, row)


def stage_sums(block: CalculationBlock, inventory: Inventory, column: str) -> dict[str, Term]:
    present = {activity.stage for activity in inventory.activities.values()}
    return {
        stage: sum_of(
            cell_of(block, column, row)
            for row, key, exchange in block.exchange_rows
            if exchange.kind == "biosphere" and inventory.activities[key].stage == stage
        )
        for stage in STAGES
        if stage in present
    }


def gas_sums(block: CalculationBlock, column: str) -> dict[str, Term]:
    return {
        flow: sum_of(
            cell_of(block, column, row)
            for row, _, exchange in block.exchange_rows
            if exchange.kind == "biosphere" and exchange.input == flow
        )
        for flow in FLOWS
    }
