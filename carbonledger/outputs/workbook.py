"""The audit workbook: every exchange of the project as a live spreadsheet formula.

A verifier changes an input or a factor and sees every result move. The formulas are not
typed here: the stage code itself runs on symbolic cells (``formula.Term``), through
``inventory.build_inventory``, ``api.characterisation`` and ``api.intensities``, so the
workbook and the engine share one source of arithmetic. The engine (bw2calc) stays the
reference: its figures are written beside the formulas, labelled, for comparison.

Sheets
------
Cover        project, date, version, factor set and its sha256, boundary, GWP set, schemes, caution
Inputs       every project parameter: path, value, unit, description, evidence (empty)
Factors      every factor used: id, value, unit, source, table or article, year, region, note, from memory
Calculation  activities with their supply per functional unit (formulas), then one row per exchange
Results      by stage, by gas, intensities, scheme checks and their thresholds, a bar chart
Periods      (with metered data) one block per month and a summary for the year

Supply of activity j per functional unit: s_j = f_j + sum over consumers k of a_jk * s_k, where
a_jk is the amount of j one unit of k consumes. The chain is acyclic, so each s_j is a finite
formula of the s_k downstream of it; this is the technosphere system A s = f of the engine
(Heijungs and Suh 2002) written out row by row.

References
----------
.. [1] Heijungs, R. and Suh, S. (2002). The Computational Structure of Life Cycle Assessment.
.. [2] ECMA-376 Office Open XML File Formats, Part 1 (SpreadsheetML).
"""

from __future__ import annotations

import datetime as _dt
import re
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from .. import CAUTION, __version__
from ..errors import InputError
from ..formula import SymbolicInputs, Term, local, ref, resolve, sum_of
from ..inventory import FLOWS, STAGES, Inventory, build_inventory

INPUTS, FACTORS, CALCULATION, RESULTS, COVER, PERIODS = "Inputs", "Factors", "Calculation", "Results", "Cover", "Periods"
INPUT_HEADER_ROW = 4
FACTOR_HEADER_ROW = 4
INPUT_COLUMNS = ("parameter", "value", "unit", "description", "evidence (meter, invoice, design document)")
FACTOR_COLUMNS = ("id", "value", "unit", "source", "table or article", "year", "region", "note", "from memory")
FORMAT_MARK = "carbonledger audit workbook, layout 1"
COVER_LABELS = {
    "gwp": "GWP100 set of the headline result",
    "schemes": "Schemes checked",
    "factors_option": "Factor set as requested (--factors)",
    "factor_set": "Factor set",
}
INTENSITY_UNITS = {
    "kg_co2e_per_t_nh3": "kg CO2e/t NH3",
    "kg_co2e_per_kg_nh3": "kg CO2e/kg NH3",
    "kg_co2e_per_kg_h2": "kg CO2e/kg H2",
    "g_co2e_per_mj": "g CO2e/MJ (LHV)",
}
_FORMULA_START = ("=", "+", "-", "@")


# cell helpers -------------------------------------------------------------------------------
def put_text(ws, row: int, column: int, text: Any):
    """Write text that stays text: a leading = + - or @ is never read as a formula."""
    cell = ws.cell(row=row, column=column)
    if text is None or text == "":
        return cell  # left empty rather than an empty string
    cell.value = str(text)
    cell.data_type = "s"
    return cell


def put_value(ws, row: int, column: int, value: Any):
    """Write a number, a truth value or text (text always as text)."""
    if isinstance(value, str) or value is None:
        return put_text(ws, row, column, value)
    cell = ws.cell(row=row, column=column)
    cell.value = value
    return cell


def put_formula(ws, row: int, column: int, term, address: dict[str, str]):
    """Write a Term as a formula (factor placeholders resolved); a plain number as a number."""
    cell = ws.cell(row=row, column=column)
    if isinstance(term, Term):
        cell.value = "=" + resolve(term.text, address)
    else:
        cell.value = float(term)
    return cell


def _bold_row(ws, row: int, columns: int) -> None:
    from openpyxl.styles import Font

    bold = Font(bold=True)
    for column in range(1, columns + 1):
        ws.cell(row=row, column=column).font = bold


def _widths(ws, widths: dict[str, float]) -> None:
    for letter, width in widths.items():
        ws.column_dimensions[letter].width = width


def _set_path(tree: dict, path: str, value: Any) -> None:
    parts = path.split(".")
    node = tree
    for part in parts[:-1]:
        node = node[part]
    node[parts[-1]] = value


def _name_cell(workbook, prefix: str, key: str, sheet: str, row: int) -> Term:
    """A defined name for an input or factor cell (``p_reforming_natural_gas_gj_per_kg_h2``,
    ``f_gwp_ar6_ch4_fossil``), so formulas read as words; the plain cell reference when the
    name would be ambiguous or too long."""
    from openpyxl.workbook.defined_name import DefinedName

    name = prefix + re.sub(r"[^A-Za-z0-9_]", "_", key)
    taken = {existing.lower() for existing in workbook.defined_names}
    if len(name) > 200 or name.lower() in taken:
        return ref(sheet, "B", row)
    workbook.defined_names[name] = DefinedName(name, attr_text=f"{sheet}!$B${row}")
    return Term(name)


def is_number(value: Any) -> bool:
    return isinstance(value, (int, float)) and not isinstance(value, bool)


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


def symbolic_model(params_symbolic: dict, factor_set, gwp: str, scheme_gwps: list[str]) -> SymbolicModel:
    """Run the engine's own arithmetic (inventory, characterisation, heating values) on cells."""
    from ..api import characterisation
    from ..stages.ammonia import hydrogen_mass_fraction_of_ammonia

    inputs = SymbolicInputs(factor_set)
    inventory = build_inventory(params_symbolic, inputs)
    headline = list(characterisation(inputs, gwp))
    per_gwp = {gwp: headline}
    for other in scheme_gwps:
        if other not in per_gwp:
            per_gwp[other] = list(characterisation(inputs, other))
    hydrogen_lhv = inputs.factor("heating_value.hydrogen.lhv", "MJ/kg")
    ammonia = inventory.product == "ammonia"
    ammonia_lhv = inputs.factor("heating_value.ammonia.lhv", "MJ/kg") if ammonia else 0.0
    fraction = hydrogen_mass_fraction_of_ammonia(inputs.molar_mass("H2"), inputs.molar_mass("NH3")) if ammonia else 1.0
    return SymbolicModel(inventory, inputs, headline, per_gwp, hydrogen_lhv, ammonia_lhv, fraction)


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
            loop = " -> ".join(path[path.index(key):] + (key,))
            raise InputError(source, "inventory", f"a supply chain without loops for the workbook; found {loop}")
        state[key] = 1
        for consumer, _ in consumers[key]:
            visit(consumer, path + (key,))
        state[key] = 2
        order.append(key)

    for key in inventory.activities:
        visit(key, ())
    return order


# the workbook -------------------------------------------------------------------------------
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


def build_workbook(
    project,
    factor_set,
    *,
    gwp: str,
    schemes: list[str] | None,
    source: str,
    project_sha256: str = "",
    factors_option: str = "",
    meters=None,
    meters_source: str = "",
    engine_result=None,
):
    """The audit workbook of a validated project, as an openpyxl Workbook (not yet saved).

    ``engine_result`` is the engine's ScoreResult for the same inputs, written beside the
    formulas for comparison (computed here when not given).
    """
    from openpyxl import Workbook

    from ..api import _schemes, score_project
    from ..project import parameter_table
    from ..schemes import select_schemes

    if engine_result is None:
        engine_result = score_project(project, factor_set, gwp=gwp, schemes=schemes, source=source, project_sha256=project_sha256)
    params = project.model_dump()
    product = params["project"]["product"]
    chosen = select_schemes(_schemes(), schemes, product)

    workbook = Workbook()
    cover = workbook.active
    cover.title = COVER
    inputs_ws = workbook.create_sheet(INPUTS)
    factors_ws = workbook.create_sheet(FACTORS)
    calculation_ws = workbook.create_sheet(CALCULATION)
    results_ws = workbook.create_sheet(RESULTS)

    # Inputs: every parameter; numbers become cell references in the symbolic parameters.
    symbolic = _copy_tree(params)
    input_cell: dict[str, Term] = {}
    _write_inputs_sheet(inputs_ws, parameter_table(project), symbolic, input_cell)

    model = symbolic_model(symbolic, factor_set, gwp, [s.gwp for s in chosen])
    check_acyclic(model.inventory, source)
    period_plan = None
    if meters is not None:
        from ..periods import month_results
        from .periods_sheet import plan_periods

        engine_months = month_results(meters, project, factor_set, gwp=gwp, design=engine_result, schemes=schemes)
        period_plan = plan_periods(meters, params, model, factor_set, engine=engine_months)

    address = _write_factors_sheet(factors_ws, model.inputs.used)
    block = write_calculation_block(calculation_ws, model, chosen, address, top=1, title="Calculation: every exchange as a live formula")
    results_cells = _write_results_sheet(results_ws, model, chosen, block, address, engine_result)
    if period_plan is not None:
        from .periods_sheet import write_periods_sheet

        write_periods_sheet(workbook.create_sheet(PERIODS), period_plan, params, input_cell, model, block, address, engine_result.unit, chosen, results_cells)
    _write_cover(
        cover,
        engine_result,
        factor_set,
        gwp=gwp,
        chosen=chosen,
        factors_option=factors_option,
        source=source,
        meters_source=meters_source if meters is not None else "",
    )
    for sheet in workbook.worksheets:
        _print_layout(sheet)
    return workbook


def _print_layout(ws) -> None:
    """Landscape, one page wide, header rows repeated: a verifier can print every sheet."""
    ws.page_setup.orientation = "landscape"
    ws.page_setup.paperSize = ws.PAPERSIZE_A4
    ws.sheet_properties.pageSetUpPr.fitToPage = True
    ws.page_setup.fitToWidth = 1
    ws.page_setup.fitToHeight = 0


def _copy_tree(value):
    if isinstance(value, dict):
        return {key: _copy_tree(child) for key, child in value.items()}
    return value


def _write_inputs_sheet(ws, rows, symbolic: dict, input_cell: dict[str, Term]) -> None:
    put_text(ws, 1, 1, "Inputs: every project parameter. Edit a value here and every formula follows; "
             "`carbonledger score --from-workbook` reads this sheet back.")
    put_text(ws, 2, 1, "Record in the evidence column the meter, invoice or design document behind each value. Numbers are named cells (p_<parameter path>). "
             "Text options (route, technology, sources, factor ids) fix the structure of the calculation: after changing one, write a new workbook with "
             "`carbonledger workbook --from-workbook`.")
    for column, title in enumerate(INPUT_COLUMNS, start=1):
        put_text(ws, INPUT_HEADER_ROW, column, title)
    _bold_row(ws, INPUT_HEADER_ROW, len(INPUT_COLUMNS))
    row = INPUT_HEADER_ROW
    for path, value, unit, description in rows:
        row += 1
        put_text(ws, row, 1, path)
        put_value(ws, row, 2, value)
        put_text(ws, row, 3, unit)
        put_text(ws, row, 4, description)
        if is_number(value):
            cell = _name_cell(ws.parent, "p_", path, INPUTS, row)
            input_cell[path] = cell
            _set_path(symbolic, path, cell)
    _widths(ws, {"A": 46, "B": 36, "C": 18, "D": 70, "E": 40})
    ws.freeze_panes = ws.cell(row=INPUT_HEADER_ROW + 1, column=1)


def _write_factors_sheet(ws, used: dict) -> dict[str, str]:
    from ..reference import ReferenceValue

    put_text(ws, 1, 1, "Factors: every factor the calculation uses, with its source. 'from memory' = not yet checked against the document.")
    put_text(ws, 2, 1, "Values are named cells (f_<factor id>). Edited values are read back by --from-workbook; molar masses (reference.*) come from the chemicals library and are not.")
    for column, title in enumerate(FACTOR_COLUMNS, start=1):
        put_text(ws, FACTOR_HEADER_ROW, column, title)
    _bold_row(ws, FACTOR_HEADER_ROW, len(FACTOR_COLUMNS))
    address: dict[str, str] = {}
    row = FACTOR_HEADER_ROW
    for key in sorted(used):
        item = used[key]
        row += 1
        address[key] = _name_cell(ws.parent, "f_", key, FACTORS, row).text
        put_text(ws, row, 1, key)
        put_value(ws, row, 2, float(item.value))
        put_text(ws, row, 3, item.unit)
        put_text(ws, row, 4, item.source)
        if isinstance(item, ReferenceValue):
            put_text(ws, row, 5, "chemicals.elements.molecular_weight")
            put_text(ws, row, 9, "no")
            continue
        put_text(ws, row, 5, item.table)
        put_value(ws, row, 6, item.year)
        put_text(ws, row, 7, item.region)
        put_text(ws, row, 8, item.note)
        put_text(ws, row, 9, "yes" if item.from_memory else "no")
    _widths(ws, {"A": 40, "B": 12, "C": 16, "D": 60, "E": 24, "F": 8, "G": 10, "H": 60, "I": 12})
    ws.freeze_panes = ws.cell(row=FACTOR_HEADER_ROW + 1, column=1)
    return address


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


def zero_rated(scheme, inventory: Inventory, activity_key: str) -> str:
    """Why a scheme counts an activity's emissions as zero ('' if it counts them)."""
    activity = inventory.activities[activity_key]
    if scheme.electricity == "renewable_at_zero" and inventory.electricity_kinds.get(activity_key) == "renewable":
        return "renewable electricity: zero under this scheme"
    if activity.stage in scheme.excluded_stages:
        return "stage outside this scheme's boundary"
    return ""


def write_calculation_block(ws, model: SymbolicModel, chosen, address: dict[str, str], *, top: int, title: str, scale_column: dict | None = None) -> CalculationBlock:
    """Activities with supply formulas, then one row per exchange; returns where things are.

    ``scale_column`` optionally maps a supplier key to a cell (Term) that multiplies every
    exchange consuming it (used by the period blocks to match metered electricity).
    """
    from openpyxl.utils import get_column_letter

    inventory = model.inventory
    block = CalculationBlock(sheet=ws.title)
    row = top
    put_text(ws, row, 1, title)
    ws.cell(row=row, column=1).font = _font_bold()
    row += 1
    put_text(ws, row, 1, "Supply: units of each activity's product per functional unit = demand + sum over consumers of (amount consumed per unit of the consumer x supply of the consumer).")
    row += 2
    activity_header = (
        "activity",
        "stage",
        "name",
        "unit of product",
        "supply per functional unit",
        "supply per kg H2 at the hydrogen plant gate",
        "supply per unit of product at the plant gate",
    )
    for column, text in enumerate(activity_header, start=1):
        put_text(ws, row, column, text)
    _bold_row(ws, row, len(activity_header))
    for key in inventory.activities:
        row += 1
        block.activity_row[key] = row
    exchange_header_row = row + 2
    # exchange rows first (their addresses are needed by the supply formulas)
    row = exchange_header_row
    headers = list(EXCHANGE_COLUMNS) + [f"kg CO2e per unit of basis, {scheme.id} ({scheme.gwp.upper()})" for scheme in chosen]
    for column, text in enumerate(headers, start=1):
        put_text(ws, row, column, text)
    _bold_row(ws, row, len(headers))
    for position, scheme in enumerate(chosen):
        block.scheme_column[scheme.id] = get_column_letter(len(EXCHANGE_COLUMNS) + 1 + position)
    exchange_row: dict[tuple[str, int], int] = {}
    flow_index = {flow: number for number, flow in enumerate(FLOWS)}
    for key, activity in inventory.activities.items():
        supply = local("E", block.activity_row[key])
        hydrogen_gate_supply = local("F", block.activity_row[key])
        product_gate_supply = local("G", block.activity_row[key])
        for index, exchange in enumerate(activity.exchanges):
            row += 1
            exchange_row[(key, index)] = row
            block.exchange_rows.append((row, key, exchange))
            put_text(ws, row, 1, key)
            put_text(ws, row, 2, activity.stage)
            put_text(ws, row, 3, "input" if exchange.kind == "technosphere" else "emission")
            put_text(ws, row, 4, exchange.input)
            put_text(ws, row, 5, exchange.label)
            put_text(ws, row, 6, exchange.unit)
            amount = exchange.amount
            if scale_column and exchange.kind == "technosphere" and exchange.input in scale_column:
                amount = Term.of(amount) * scale_column[exchange.input]
            put_formula(ws, row, 7, amount, address)
            put_formula(ws, row, 8, supply, address)
            put_formula(ws, row, 9, local("G", row) * local("H", row), address)
            if exchange.kind != "biosphere":
                continue
            number = flow_index[exchange.input]
            put_formula(ws, row, 10, model.headline[number], address)
            put_formula(ws, row, 11, local("I", row) * local("J", row), address)
            put_formula(ws, row, 12, local("G", row) * hydrogen_gate_supply * local("J", row), address)
            for scheme in chosen:
                column = len(EXCHANGE_COLUMNS) + 1 + list(block.scheme_column).index(scheme.id)
                reason = zero_rated(scheme, inventory, key)
                if reason:
                    put_text(ws, row, column, reason)
                    continue
                basis_supply = product_gate_supply if scheme.basis == "product" else hydrogen_gate_supply
                put_formula(ws, row, column, local("G", row) * basis_supply * model.per_gwp[scheme.gwp][number], address)
    # activities with supply formulas
    consumers = consumers_of(inventory)
    for key, activity in inventory.activities.items():
        arow = block.activity_row[key]
        put_text(ws, arow, 1, key)
        put_text(ws, arow, 2, activity.stage)
        put_text(ws, arow, 3, activity.name)
        put_text(ws, arow, 4, activity.unit)
        for column, letter, demand in ((5, "E", inventory.reference), (6, "F", inventory.hydrogen), (7, "G", inventory.gate)):
            terms = [Term("1")] if key == demand else []
            terms += [local("G", exchange_row[(consumer, index)]) * local(letter, block.activity_row[consumer]) for consumer, index in consumers[key]]
            put_formula(ws, arow, column, sum_of(terms), address)
    _widths(ws, {"A": 26, "B": 24, "C": 10, "D": 26, "E": 52, "F": 22, "G": 18, "H": 18, "I": 18, "J": 12, "K": 18, "L": 18})
    for position in range(len(chosen)):
        ws.column_dimensions[get_column_letter(len(EXCHANGE_COLUMNS) + 1 + position)].width = 20
    block.end_row = row
    return block


def _font_bold():
    from openpyxl.styles import Font

    return Font(bold=True)


def cell_of(block: CalculationBlock, column: str, row: int) -> Term:
    return ref(block.sheet, column, row)


def stage_sums(block: CalculationBlock, inventory: Inventory, column: str) -> dict[str, Term]:
    present = {activity.stage for activity in inventory.activities.values()}
    return {
        stage: sum_of(cell_of(block, column, row) for row, key, exchange in block.exchange_rows if exchange.kind == "biosphere" and inventory.activities[key].stage == stage)
        for stage in STAGES
        if stage in present
    }


def gas_sums(block: CalculationBlock, column: str) -> dict[str, Term]:
    return {
        flow: sum_of(cell_of(block, column, row) for row, _, exchange in block.exchange_rows if exchange.kind == "biosphere" and exchange.input == flow)
        for flow in FLOWS
    }


def _write_results_sheet(ws, model: SymbolicModel, chosen, block: CalculationBlock, address, engine) -> dict:
    """By stage, by gas, intensities, checks, thresholds and the chart; returns key cells."""
    from openpyxl.chart import BarChart, Reference

    from ..api import FUNCTIONAL_UNITS, intensities

    inventory = model.inventory
    product = inventory.product
    functional_unit, unit = FUNCTIONAL_UNITS[product]
    cells: dict[str, Any] = {}
    put_text(ws, 1, 1, f"Results per functional unit ({functional_unit}), GWP100 {engine.gwp_basis.upper()}: live formulas over the Calculation sheet.")
    put_text(ws, 2, 1, CAUTION)
    put_text(ws, 3, 1, "The last column holds the figure carbonledger's engine (bw2calc) computed when the workbook was written, for comparison only.")

    row = 5
    for column, text in enumerate(("stage", unit, "share of total", "engine at writing"), start=1):
        put_text(ws, row, column, text)
    _bold_row(ws, row, 4)
    stages = stage_sums(block, inventory, block.headline_column)
    first_stage = row + 1
    total_row = first_stage + len(stages)
    for stage, term in stages.items():
        row += 1
        put_text(ws, row, 1, stage)
        put_formula(ws, row, 2, term, address)
        put_formula(ws, row, 3, Term(f"IF($B${total_row}=0,0,B{row}/$B${total_row})"), address)
        put_value(ws, row, 4, engine.by_stage.get(stage))
        cells[f"stage:{stage}"] = f"B{row}"
    last_stage = row
    row += 1
    put_text(ws, row, 1, "total")
    put_formula(ws, row, 2, sum_of(local("B", r) for r in range(first_stage, last_stage + 1)), address)
    put_value(ws, row, 4, engine.total)
    ws.cell(row=row, column=1).font = _font_bold()
    cells["total"] = f"B{row}"
    total = local("B", row)

    row += 2
    for column, text in enumerate(("gas", unit, "", "engine at writing"), start=1):
        put_text(ws, row, column, text)
    _bold_row(ws, row, 4)
    for flow, term in gas_sums(block, block.headline_column).items():
        row += 1
        put_text(ws, row, 1, FLOWS[flow])
        put_formula(ws, row, 2, term, address)
        put_value(ws, row, 4, engine.by_gas.get(flow))
        cells[f"gas:{flow}"] = f"B{row}"

    row += 2
    for column, text in enumerate(("intensity", "value", "unit", "engine at writing"), start=1):
        put_text(ws, row, column, text)
    _bold_row(ws, row, 4)
    figures = intensities(total, model.inventory.reference_product, model.hydrogen_lhv, model.ammonia_lhv, model.hydrogen_fraction)
    engine_figures = engine.intensity.model_dump()
    for key, term in figures.items():
        if term is None:
            continue
        row += 1
        put_text(ws, row, 1, key)
        put_formula(ws, row, 2, term, address)
        put_text(ws, row, 3, INTENSITY_UNITS[key])
        put_value(ws, row, 4, engine_figures.get(key))
        cells[f"intensity:{key}"] = f"B{row}"
    row += 1
    put_text(ws, row, 1, "hydrogen_production_kg_co2e_per_kg_h2")
    put_formula(ws, row, 2, sum_of(cell_of(block, block.gate_column, r) for r, _, e in block.exchange_rows if e.kind == "biosphere"), address)
    put_text(ws, row, 3, "kg CO2e/kg H2 at the hydrogen plant gate")
    put_value(ws, row, 4, engine.hydrogen_production_kg_co2e_per_kg_h2)
    cells["hydrogen_gate"] = f"B{row}"

    # thresholds table first in address order (checks reference it)
    checks_header = row + 2
    thresholds_header = checks_header + len(chosen) + 3
    threshold_rows: dict[str, list[tuple[int, Any]]] = {}
    trow = thresholds_header
    for column, text in enumerate(("scheme", "tier", "limit", "comparison", "unit", "legal source", "from memory"), start=1):
        put_text(ws, trow, column, text)
    put_text(ws, trow - 1, 1, "Thresholds (edit a limit and the checks above follow)")
    _bold_row(ws, trow, 7)
    for scheme in chosen:
        for threshold in sorted(scheme.thresholds, key=lambda t: t.limit):
            trow += 1
            put_text(ws, trow, 1, scheme.id)
            put_text(ws, trow, 2, threshold.tier)
            put_value(ws, trow, 3, threshold.limit)
            put_text(ws, trow, 4, "value <= limit" if threshold.inclusive else "value < limit")
            put_text(ws, trow, 5, scheme.unit)
            put_text(ws, trow, 6, threshold.source)
            put_text(ws, trow, 7, "yes" if threshold.from_memory else "no")
            threshold_rows.setdefault(scheme.id, []).append((trow, threshold))

    row = checks_header
    check_columns = (
        "scheme", "name", "basis", "GWP100 set", "electricity rule", "stages left out", "quantity", "unit",
        "kg CO2e per unit of basis", "value", "threshold (loosest tier)", "pass or fail", "margin (threshold - value)",
        "best tier met", "from memory", "engine value at writing",
    )
    for column, text in enumerate(check_columns, start=1):
        put_text(ws, row, column, text)
    _bold_row(ws, row, len(check_columns))
    engine_checks = {check.scheme: check for check in engine.checks}
    for scheme in chosen:
        row += 1
        column = block.scheme_column[scheme.id]
        rows = [r for r, _, e in block.exchange_rows if e.kind == "biosphere"]
        scheme_total = Term(f"SUM({block.sheet}!${column}${rows[0]}:${column}${rows[-1]})") if rows else Term("0")
        basis_product = product if scheme.basis == "product" else "hydrogen"
        value = intensities(local("I", row), basis_product, model.hydrogen_lhv, model.ammonia_lhv, model.hydrogen_fraction)[scheme.quantity]
        loosest_row = max(threshold_rows[scheme.id], key=lambda item: item[1].limit)[0]
        for number, text in enumerate(
            (scheme.id, scheme.name, scheme.basis, scheme.gwp, scheme.electricity, ", ".join(scheme.excluded_stages) or "none", scheme.quantity, scheme.unit),
            start=1,
        ):
            put_text(ws, row, number, text)
        put_formula(ws, row, 9, scheme_total, address)
        put_formula(ws, row, 10, value, address)
        put_formula(ws, row, 11, local("C", loosest_row), address)
        loosest = max(scheme.thresholds, key=lambda t: t.limit)
        operator = "<=" if loosest.inclusive else "<"
        put_formula(ws, row, 12, Term(f'IF($J${row}{operator}$K${row},"pass","fail")'), address)
        put_formula(ws, row, 13, local("K", row) - local("J", row), address)
        tier = '"none"'
        for trow_, threshold in reversed(threshold_rows[scheme.id]):  # loosest outermost, strictest innermost
            comparison = "<=" if threshold.inclusive else "<"
            tier = f"IF($J${row}{comparison}$C${trow_},$B${trow_},{tier})"
        put_formula(ws, row, 14, Term(tier), address)
        put_text(ws, row, 15, "yes" if (scheme.from_memory or any(t.from_memory for t in scheme.thresholds)) else "no")
        engine_check = engine_checks.get(scheme.id)
        put_value(ws, row, 16, engine_check.value if engine_check else None)
        cells[f"check:{scheme.id}"] = row
    _widths(ws, {"A": 40, "B": 22, "C": 16, "D": 18, "E": 18, "F": 22, "G": 18, "H": 18, "I": 18, "J": 16, "K": 16, "L": 12, "M": 16, "N": 30, "O": 12, "P": 18})

    chart = BarChart()
    chart.type = "bar"
    chart.title = "Contributions by stage (estimate, not a certification)"
    chart.y_axis.title = unit
    chart.x_axis.title = "stage"
    chart.legend = None
    chart.add_data(Reference(ws, min_col=2, min_row=first_stage - 1, max_row=last_stage), titles_from_data=True)
    chart.set_categories(Reference(ws, min_col=1, min_row=first_stage, max_row=last_stage))
    chart.width, chart.height = 20, 9
    ws.add_chart(chart, f"R{5}")
    cells["stage_rows"] = (first_stage, last_stage)
    return cells


def _write_cover(ws, engine, factor_set, *, gwp, chosen, factors_option, source, meters_source) -> None:
    put_text(ws, 1, 1, "carbonledger audit workbook")
    ws.cell(row=1, column=1).font = _font_bold()
    put_text(ws, 2, 1, f"Caution: {CAUTION}")
    ws.cell(row=2, column=1).font = _font_bold()
    rows = [
        ("Project", engine.project),
        ("Project file", source),
        ("Project file sha256", engine.project_sha256),
        ("Product", engine.product),
        ("Functional unit", engine.functional_unit),
        ("Boundary", engine.boundary),
        ("Written (UTC)", _dt.datetime.now(_dt.timezone.utc).strftime("%Y-%m-%d %H:%M")),
        ("carbonledger version", __version__),
        (COVER_LABELS["factor_set"], factor_set.name),
        ("Factor set sha256", factor_set.sha256),
        (COVER_LABELS["factors_option"], factors_option or factor_set.name),
        (COVER_LABELS["gwp"], gwp),
        (COVER_LABELS["schemes"], ", ".join(scheme.id for scheme in chosen)),
    ]
    if meters_source:
        rows.append(("Metered periods file", meters_source))
    rows.append(("Layout", FORMAT_MARK))
    row = 3
    for label, value in rows:
        row += 1
        put_text(ws, row, 1, label)
        put_text(ws, row, 2, value)
    row += 2
    guide = (
        "How to read this workbook:",
        "Inputs: the project parameters. Factors: every factor used, with its source.",
        "Calculation: the supply of each activity per functional unit and one row per exchange, all live formulas.",
        "Results: totals by stage and gas, intensities, each scheme's check under its own GWP set and electricity rule, and a chart.",
        "Change an input or a factor and every figure follows. The engine's own figures are shown beside the formulas for comparison.",
        "Scheme checks use each scheme's rulebook as carbonledger reads it; the scheme's official methodology and an accredited verifier decide.",
    )
    for text in guide:
        put_text(ws, row, 1, text)
        row += 1
    _widths(ws, {"A": 40, "B": 90})


def write_workbook_file(path: str | Path, workbook, force: bool = False) -> Path:
    """Save atomically; an existing file is left untouched unless ``force``."""
    from .files import atomic_write

    return atomic_write(path, lambda tmp: workbook.save(tmp), force=force)



def audit_workbook(
    project_file: str | Path | None = None,
    *,
    from_workbook: str | Path | None = None,
    factors: str | None = None,
    gwp: str | None = None,
    schemes: list[str] | None = None,
    overrides: list[str] | None = None,
    periods: str | Path | None = None,
):
    """The audit workbook of a project file, or of the inputs read back from an earlier workbook.

    Options left as None take the defaults (``--gwp ar6``, the default factor set, every scheme
    that applies), or, with ``from_workbook``, the settings recorded on that workbook's cover.
    Returns (openpyxl Workbook, engine ScoreResult).
    """
    from ..api import DEFAULT_GWP, score_project
    from ..factors import DEFAULT_SET, load_factor_set
    from ..project import load_project

    if from_workbook is not None:
        from ..workbook_inputs import base_factor_set, factor_set_from_workbook, load_project_from_workbook

        project, sha, settings = load_project_from_workbook(from_workbook, overrides)
        factor_set = factor_set_from_workbook(from_workbook, base_factor_set(settings, factors))
        gwp = gwp or settings.gwp
        schemes = schemes or settings.schemes or None
        factors_option = factors or settings.factors_option
        source = str(from_workbook)
    else:
        project, sha = load_project(project_file, overrides)
        factors_option = factors or DEFAULT_SET
        factor_set = load_factor_set(factors_option)
        gwp = gwp or DEFAULT_GWP
        source = str(project_file)
    meters = None
    if periods is not None:
        from ..periods import read_meters

        if project.project.boundary != "cradle-to-gate":
            raise InputError(periods, "--periods", f"a project scored cradle-to-gate (meters describe the plant), got boundary '{project.project.boundary}'; pass --boundary cradle-to-gate")
        meters = read_meters(periods, project)
    engine = score_project(project, factor_set, gwp=gwp, schemes=schemes, source=source, project_sha256=sha)
    workbook = build_workbook(
        project,
        factor_set,
        gwp=gwp,
        schemes=schemes,
        source=source,
        project_sha256=sha,
        factors_option=factors_option,
        meters=meters,
        meters_source=str(periods or ""),
        engine_result=engine,
    )
    return workbook, engine
