"""The audit workbook: every exchange of the project as a live spreadsheet formula.

A verifier changes an input or a factor and sees every result move. The formulas are not
typed here: the stage code itself runs on symbolic cells (``formula.Term``), through
``core.scoring.run_stages`` (inventory, characterisation, heating values), so the
workbook and the engine share one source of arithmetic. The engine (bw2calc) stays the
reference: its figures are written beside the formulas, labelled, for comparison.

Sheets
------
Cover        project, date, version, factor set and its sha256, boundary, GWP set, schemes, caution
Inputs       every project parameter: path, value, unit, description, evidence (kept from an earlier workbook)
Factors      every factor used: id, value, unit, source, table or article, year, region, note, from memory
Calculation  activities with their supply per functional unit (formulas), then one row per exchange
Results      by stage, by gas, intensities, scheme checks and their thresholds, a bar chart
Periods      (with metered data) one block per month and a summary for the year
Uncertainty  (with a Monte Carlo result) the distributions and the summary of the draws (uncertainty_sheet.py)
Matching     (with an electricity time series) per scheme and per month: use, matched energy, matched
             share and grid electricity per kg H2, summed over the Intervals sheet
Intervals    (with an electricity time series) one row per interval: use, generation per source, grid
             intensity, and per distinct matching the eligible generation and the matched energy (MIN)

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
import os
import re
import shutil
import zipfile
from pathlib import Path
from typing import Any

from ...about import CAUTION, __version__
from ...core.results import ScoreResult
from ...core.scoring import FUNCTIONAL_UNITS, declared_addition, intensities, rulebooks
from ...model.factors import CITED_FIELDS
from ...model.project import parameter_table
from ...model.statuses import Status
from ..files import atomic_write
from ..labels import (
    INTENSITY_LABELS,
    INTENSITY_UNITS,
    electricity_rule_name,
    gas_name,
    gwp_name,
    lower_words,
    stage_name,
    status_name,
    unit_name,
)
from .calculation import (
    CalculationBlock,
    SymbolicModel,
    basis_product_of,
    cell_of,
    check_acyclic,
    gas_sums,
    stage_sums,
    symbolic_model,
    write_calculation_block,
)
from .cells import Term, local, ref, sum_of
from .intervals_sheet import write_intervals_sheets
from .layout import (
    CALCULATION,
    COVER,
    COVER_LABELS,
    FACTOR_COLUMNS,
    FACTOR_HEADER_ROW,
    FACTORS,
    FORMAT_MARK,
    INPUT_COLUMNS,
    INPUT_HEADER_ROW,
    INPUTS,
    INTERVALS,
    MATCHING,
    PERIODS,
    RESULTS,
    copy_tree,
    font_bold,
    is_number,
    put_formula,
    put_text,
    put_value,
    set_path,
    set_widths,
    verdict_formula,
)
from .periods_sheet import plan_periods, write_periods_sheet
from .style import (
    LEGEND,
    SHARE,
    YEAR,
    fill_missing_formats,
    header_row,
    header_texts,
    input_format,
    number_format,
    page_setup,
    style_cell,
    wrap_columns,
)
from .uncertainty_sheet import UNCERTAINTY, write_uncertainty_sheet


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


# the workbook -------------------------------------------------------------------------------
def _new_workbook():
    """An empty workbook dated for reproducible builds, with its Cover, Inputs, Factors, Calculation and
    Results sheets (returned after it, in that order)."""
    from openpyxl import Workbook

    workbook = Workbook()
    workbook.properties.created = workbook.properties.modified = written_at()
    cover = workbook.active
    cover.title = COVER
    return workbook, cover, *(workbook.create_sheet(name) for name in (INPUTS, FACTORS, CALCULATION, RESULTS))


def build_workbook(
    result: ScoreResult,
    project,
    factor_set,
    *,
    factors_option: str = "",
    meters=None,
    month_results=None,
    meters_source: str = "",
    evidence: dict[str, str] | None = None,
    uncertainty=None,
    draws_csv: str = "",
    series=None,
    matched_checks=None,
):
    """The audit workbook of a scored project, as an openpyxl Workbook (not yet saved).

    ``result`` is the engine's ScoreResult of ``project`` under ``factor_set``: the writer never scores. Its options
    (GWP set, schemes, boundary) decide the formulas, and its figures are written beside them for comparison. With
    ``meters`` (``analyses.periods.read_meters``) the Periods sheet is added, with ``month_results``
    (``analyses.periods.month_results``) beside it. ``evidence`` (parameter path -> text, as read back from an
    earlier workbook) fills the Inputs sheet's evidence column, so a workbook written again keeps it. With
    ``uncertainty`` (an ``analyses.uncertainty.UncertaintyResult`` of the same project) the Uncertainty sheet is
    added; ``draws_csv`` names the CSV of its draws written beside the workbook, if any. With ``series``
    (``analyses.electricity_series.ElectricitySeries``) and ``matched_checks`` (the engine's checks with
    ``electricity_matching``, scored against that series), the Matching and Intervals sheets are added; the other
    sheets keep the declared annual shares.
    """
    books = rulebooks()
    chosen = [books[check.scheme] for check in result.checks]
    gwp, source = result.gwp_basis, result.project_file
    params = copy_tree(result.parameters)

    workbook, cover, inputs_ws, factors_ws, calculation_ws, results_ws = _new_workbook()

    # Inputs: every parameter; numbers become cell references in the symbolic parameters.
    symbolic = copy_tree(params)
    input_cell: dict[str, Term] = {}
    _write_inputs_sheet(inputs_ws, parameter_table(project), symbolic, input_cell, evidence or {})
    symbolic["project"]["boundary"] = result.boundary

    model = _checked_symbolic_model(symbolic, factor_set, result, chosen)
    # the plan reads its factors before the Factors sheet lists the factors used
    period_plan = plan_periods(meters, params, model, factor_set, engine=month_results) if meters is not None else None

    address = _write_factors_sheet(factors_ws, model.inputs.used)
    block = write_calculation_block(
        calculation_ws, model, chosen, address, top=1, title="Calculation: every exchange as a live formula"
    )
    results_cells = _write_results_sheet(results_ws, model, chosen, block, address, result)
    if period_plan is not None:
        write_periods_sheet(
            workbook.create_sheet(PERIODS),
            period_plan,
            params,
            input_cell,
            model,
            block,
            address,
            result.unit,
            chosen,
            results_cells,
        )
    series_source = _write_matching_sheets(workbook, series, matched_checks, block, model)
    _write_cover(
        cover,
        result,
        factor_set,
        gwp=gwp,
        chosen=chosen,
        factors_option=factors_option,
        source=source,
        meters_source=meters_source if meters is not None else "",
        series_source=series_source,
    )
    _style_calculation(calculation_ws, block, result)
    _set_up_pages(workbook)
    if uncertainty is not None:
        write_uncertainty_sheet(workbook.create_sheet(UNCERTAINTY), uncertainty, draws_csv)
    return workbook


def _write_matching_sheets(workbook, series, matched_checks, block: CalculationBlock, model: SymbolicModel) -> str:
    """With a series and checks matched against it, the Matching and Intervals sheets; returns the
    series' file and sha256 for the cover ('' without them)."""
    matched = [check for check in matched_checks or [] if check.electricity_matching is not None]
    if series is None or not matched:
        return ""
    write_intervals_sheets(
        workbook.create_sheet(MATCHING),
        workbook.create_sheet(INTERVALS),
        series,
        matched,
        block,
        model.inventory.hydrogen,
    )
    return f"{series.path} (sha256 {series.sha256})"


def _checked_symbolic_model(symbolic: dict, factor_set, result: ScoreResult, chosen) -> SymbolicModel:
    """The engine's arithmetic on the Inputs cells, with what the rules read at writing (electricity
    counted zero or charged as grid, a declared e_td), refused when the supply chain has a loop."""
    model = symbolic_model(symbolic, factor_set, result.gwp_basis, [s.id for s in chosen])
    model.counted_zero = {check.scheme: set(check.electricity_counted_zero) for check in result.checks}
    model.charged_as_grid = {check.scheme: dict(check.electricity_charged_as_grid) for check in result.checks}
    model.declared_e_td = symbolic["project"].get("declared_e_td_g_co2e_per_mj")
    check_acyclic(model.inventory, result.project_file)
    return model


def _set_up_pages(workbook) -> None:
    """Every cell formatted (the Intervals sheet formats its own as it writes them) and each sheet's
    print set-up: A4 landscape, header rows or the first column repeated, wide sheets on two pages."""
    for sheet in workbook.worksheets:
        if sheet.title != INTERVALS:
            fill_missing_formats(sheet)
    page_setup(workbook[COVER])
    page_setup(workbook[INPUTS], title_rows=f"{INPUT_HEADER_ROW}:{INPUT_HEADER_ROW}")
    page_setup(workbook[FACTORS], title_rows=f"{FACTOR_HEADER_ROW}:{FACTOR_HEADER_ROW}")
    for name in (CALCULATION, RESULTS, PERIODS):
        if name in workbook.sheetnames:
            page_setup(workbook[name], title_columns="A:A", pages_wide=2)


def _style_calculation(ws, block: CalculationBlock, result: ScoreResult) -> None:
    """Headers in the header style; amounts, supplies and kg CO2e with formats for their size."""
    first_activity = min(block.activity_row.values())
    first_exchange = min(row for row, _, _ in block.exchange_rows)
    header_row(ws, first_activity - 1, 7)
    header_row(ws, first_exchange - 1, ws.max_column)
    ws.row_dimensions[first_exchange - 1].height = 45
    style_cell(ws.cell(row=1, column=1), "title")
    amounts = {(row.activity, row.kind, row.input, row.label): row for row in result.exchanges}
    supply = {row.activity: row.activity_supply for row in result.exchanges}
    carbon = "#,##0.000" if abs(result.total) >= 1 else "0.00000"
    for key, row in block.activity_row.items():
        for column in (5, 6, 7):
            style_cell(ws.cell(row=row, column=column), "formula", number_format(supply.get(key)))
    for row, key, exchange in block.exchange_rows:
        engine = amounts.get((key, exchange.kind, exchange.input, exchange.label))
        amount = engine.amount if engine else None
        style_cell(ws.cell(row=row, column=7), "formula", number_format(amount))
        style_cell(ws.cell(row=row, column=8), "formula", number_format(supply.get(key)))
        style_cell(
            ws.cell(row=row, column=9),
            "formula",
            number_format(amount * supply.get(key, 1.0) if amount is not None else None),
        )
        if exchange.kind == "biosphere":
            style_cell(ws.cell(row=row, column=10), "formula", "#,##0.0")
            for column in range(11, ws.max_column + 1):
                style_cell(ws.cell(row=row, column=column), "formula", carbon)
    ws.column_dimensions["E"].width = 40
    wrap_columns(ws, "E", first_exchange)
    ws.freeze_panes = ws.cell(row=first_activity, column=2)


def _write_inputs_sheet(ws, rows, symbolic: dict, input_cell: dict[str, Term], evidence: dict[str, str]) -> None:
    put_text(
        ws,
        1,
        1,
        "Inputs: every project parameter. Edit a value here and every formula follows; "
        "`carbonledger score --from-workbook` reads this sheet back.",
    )
    put_text(
        ws,
        2,
        1,
        "Record in the evidence column the meter, invoice or design document "
        "behind each value. Numbers are named cells (p_<parameter path>). "
        "Text options (route, technology, sources, factor ids) fix the structure "
        "of the calculation: after changing one, write a new workbook with "
        "`carbonledger workbook --from-workbook`.",
    )
    header_texts(ws, INPUT_HEADER_ROW, INPUT_COLUMNS)
    row = INPUT_HEADER_ROW
    for path, value, unit, description in rows:
        row += 1
        put_text(ws, row, 1, path, f"parameter path {path[:80]}")
        put_value(ws, row, 2, value, path)
        put_text(ws, row, 3, unit)
        put_text(ws, row, 4, description)
        put_text(ws, row, len(INPUT_COLUMNS), evidence.get(path))
        if is_number(value):
            cell = _name_cell(ws.parent, "p_", path, INPUTS, row)
            input_cell[path] = cell
            set_path(symbolic, path, cell)
        style_cell(ws.cell(row=row, column=2), "input", input_format(value, unit))
    set_widths(ws, {"A": 46, "B": 30, "C": 16, "D": 60, "E": 34})
    wrap_columns(ws, "BCDE", INPUT_HEADER_ROW + 1)
    ws.freeze_panes = ws.cell(row=INPUT_HEADER_ROW + 1, column=1)


def _put_factor_field(ws, row: int, column: int, name: str, item) -> None:
    """One field of a factor row (``model.factors.Factor``) in its cell of the Factors sheet."""
    value = getattr(item, name)
    if name == "value":
        put_value(ws, row, column, float(value))
        style_cell(ws.cell(row=row, column=column), "factor", number_format(float(value)))
    elif name == "year":
        put_value(ws, row, column, value)
        ws.cell(row=row, column=column).number_format = YEAR
    elif name == "grade":
        put_text(ws, row, column, value.words)
    else:
        put_text(ws, row, column, value, f"factor {item.id}: {name}")


def _write_factors_sheet(ws, used: dict) -> dict[str, str]:
    put_text(
        ws,
        1,
        1,
        "Factors: every factor the calculation uses, with its source and source grade (primary text, "
        "verbatim secondary, secondary, not yet verified against the source document, invented).",
    )
    put_text(
        ws,
        2,
        1,
        "Values are named cells (f_<factor id>). Edited values are read back by --from-workbook; "
        "molar masses (reference.*) come from the chemicals library and are not.",
    )
    header_texts(ws, FACTOR_HEADER_ROW, FACTOR_COLUMNS)
    address: dict[str, str] = {}
    row = FACTOR_HEADER_ROW
    for key in sorted(used):
        item = used[key]
        row += 1
        address[key] = _name_cell(ws.parent, "f_", key, FACTORS, row).text
        for column, name in enumerate(CITED_FIELDS, start=1):
            _put_factor_field(ws, row, column, name, item)
    set_widths(ws, {"A": 40, "B": 12, "C": 16, "D": 46, "E": 22, "F": 7, "G": 10, "H": 46, "I": 22})
    wrap_columns(ws, "ADEHI", FACTOR_HEADER_ROW + 1)
    ws.freeze_panes = ws.cell(row=FACTOR_HEADER_ROW + 1, column=1)
    return address


def _write_results_sheet(ws, model: SymbolicModel, chosen, block: CalculationBlock, address, engine) -> dict:
    """By stage, by gas, intensities, checks, thresholds and the chart; returns key cells."""
    _, unit = FUNCTIONAL_UNITS[model.inventory.product]
    _write_results_heading(ws, model, engine)
    cells: dict[str, Any] = {}
    total_row = _write_stage_table(ws, block, model.inventory, address, engine, unit, cells)
    row = _write_gas_table(ws, total_row + 2, block, address, engine, unit, cells)
    row = _write_intensity_table(ws, row + 2, model, block, address, engine, local("B", total_row), cells)
    checks_header = row + 2
    thresholds_header = checks_header + len(chosen) + 3
    threshold_rows, last_threshold_row = _write_thresholds_table(ws, thresholds_header, chosen)
    _write_checks_table(ws, checks_header, model, chosen, block, address, engine, threshold_rows, cells)
    longest_name = max((len(scheme.name) for scheme in chosen), default=20)
    set_widths(
        ws,
        {
            "A": 40,
            "B": min(max(24, longest_name + 2), 64),
            "C": 18,
            "D": 18,
            "E": 18,
            "F": 20,
            "G": 18,
            "H": 16,
            "I": 14,
            "J": 13,
            "K": 13,
            "L": 10,
            "M": 14,
            "N": 28,
            "O": 10,
            "P": 14,
            "Q": 16,
            "R": 90,
        },
    )
    ws.row_dimensions[checks_header].height = 45
    ws.freeze_panes = ws.cell(row=5, column=2)
    style_cell(ws.cell(row=1, column=1), "title")
    _add_stage_chart(ws, cells["stage_rows"], unit, f"A{last_threshold_row + 3}")
    return cells


def _write_results_heading(ws, model: SymbolicModel, engine) -> None:
    """The title, the caution and what the last column holds."""
    functional_unit, _ = FUNCTIONAL_UNITS[model.inventory.product]
    put_text(
        ws,
        1,
        1,
        f"Results per functional unit ({functional_unit}), GWP100 {engine.gwp_basis.upper()}: "
        "live formulas over the Calculation sheet.",
    )
    put_text(ws, 2, 1, CAUTION)
    put_text(
        ws,
        3,
        1,
        "The last column holds the figure carbonledger's engine (bw2calc) computed when the workbook "
        "was written, for comparison only.",
    )


def _write_stage_table(ws, block: CalculationBlock, inventory, address, engine, unit: str, cells: dict) -> int:
    """Stage sums, their shares and the total (from row 5); returns the total's row."""
    row = 5
    header_texts(ws, row, ("stage", unit, "share of total", "engine at writing"))
    stages = stage_sums(block, inventory, block.headline_column)
    first_stage = row + 1
    total_row = first_stage + len(stages)
    for stage, term in stages.items():
        row += 1
        put_text(ws, row, 1, stage_name(stage))
        _figure(ws, row, term, address, engine.by_stage.get(stage))
        put_formula(ws, row, 3, Term(f"IF($B${total_row}=0,0,B{row}/$B${total_row})"), address)
        ws.cell(row=row, column=3).number_format = SHARE
        cells[f"stage:{stage}"] = f"B{row}"
    cells["stage_rows"] = (first_stage, row)
    row += 1
    put_text(ws, row, 1, "Total")
    _figure(ws, row, sum_of(local("B", r) for r in range(first_stage, row)), address, engine.total)
    ws.cell(row=row, column=1).font = font_bold()
    cells["total"] = f"B{row}"
    return row


def _write_gas_table(ws, row: int, block: CalculationBlock, address, engine, unit: str, cells: dict) -> int:
    """Sums by gas from ``row``; returns the last row written."""
    header_texts(ws, row, ("gas", unit, "", "engine at writing"))
    for flow, term in gas_sums(block, block.headline_column).items():
        row += 1
        put_text(ws, row, 1, gas_name(flow))
        _figure(ws, row, term, address, engine.by_gas.get(flow))
        cells[f"gas:{flow}"] = f"B{row}"
    return row


def _write_intensity_table(
    ws, row: int, model: SymbolicModel, block: CalculationBlock, address, engine, total, cells: dict
) -> int:
    """The intensities of the ``total`` cell and the hydrogen plant gate figure from ``row``; returns the last row."""
    header_texts(ws, row, ("intensity", "value", "unit", "engine at writing"))
    figures = intensities(
        total, model.inventory.reference_product, model.hydrogen_lhv, model.ammonia_lhv, model.hydrogen_fraction
    )
    engine_figures = engine.intensity.model_dump()
    for key, term in figures.items():
        if term is None:
            continue
        row += 1
        put_text(ws, row, 1, INTENSITY_LABELS[key])
        _figure(ws, row, term, address, engine_figures.get(key))
        put_text(ws, row, 3, INTENSITY_UNITS[key])
        cells[f"intensity:{key}"] = f"B{row}"
    row += 1
    put_text(ws, row, 1, "Hydrogen at the hydrogen plant gate")
    gate = sum_of(cell_of(block, block.gate_column, r) for r, _, e in block.exchange_rows if e.kind == "biosphere")
    _figure(ws, row, gate, address, engine.hydrogen_production_kg_co2e_per_kg_h2)
    put_text(ws, row, 3, "kg CO2e/kg H2 at the hydrogen plant gate")
    cells["hydrogen_gate"] = f"B{row}"
    return row


def _write_thresholds_table(ws, header: int, chosen) -> tuple[dict[str, list[tuple[int, Any]]], int]:
    """Every tier of every scheme from ``header`` (the checks above refer to these cells).

    Returns each scheme's (row, threshold) pairs and the last row written."""
    threshold_rows: dict[str, list[tuple[int, Any]]] = {}
    row = header
    put_text(ws, row - 1, 1, "Thresholds (edit a limit and the checks above follow)")
    header_texts(ws, row, ("scheme", "tier", "limit", "comparison", "unit", "legal source", "from memory"))
    for scheme in chosen:
        for threshold in sorted(scheme.thresholds, key=lambda t: t.limit):
            row += 1
            put_text(ws, row, 1, scheme.id)
            put_text(ws, row, 2, threshold.tier)
            put_value(ws, row, 3, threshold.limit)
            style_cell(ws.cell(row=row, column=3), "input", number_format(threshold.limit))
            put_text(ws, row, 4, "value <= limit" if threshold.inclusive else "value < limit")
            put_text(ws, row, 5, scheme.unit)
            put_text(ws, row, 6, threshold.source)
            put_text(ws, row, 7, "yes" if threshold.from_memory else "no")
            threshold_rows.setdefault(scheme.id, []).append((row, threshold))
    return threshold_rows, row


CHECK_COLUMNS = (
    "scheme",
    "name",
    "basis",
    "GWP100 set",
    "electricity rule",
    "stages left out",
    "quantity",
    "unit",
    "kg CO2e per unit of basis",
    "value",
    "threshold (loosest tier)",
    "status (live)",
    "margin (threshold - value)",
    "best tier met",
    "from memory",
    "engine value at writing",
    "status (rules read at writing)",
    "reasons (rule and source)",
)


def _write_checks_table(
    ws, header: int, model: SymbolicModel, chosen, block, address, engine, threshold_rows, cells: dict
) -> None:
    """One row per scheme: its live value, status, margin and tier beside the engine's at writing."""
    header_texts(ws, header, CHECK_COLUMNS)
    engine_checks = {check.scheme: check for check in engine.checks}
    for row, scheme in enumerate(chosen, start=header + 1):
        _write_check_row(
            ws, row, model, scheme, block, address, engine, engine_checks.get(scheme.id), threshold_rows[scheme.id]
        )
        cells[f"check:{scheme.id}"] = row


def _scheme_value_term(row: int, model: SymbolicModel, scheme, block: CalculationBlock, engine) -> tuple[Term, Term]:
    """The scheme's kg CO2e per unit of basis (a sum over its Calculation column) and its value in the scheme's
    quantity."""
    rows = [r for r, _, e in block.exchange_rows if e.kind == "biosphere"]
    column = block.scheme_column[scheme.id]
    scheme_total = Term(f"SUM({block.sheet}!${column}${rows[0]}:${column}${rows[-1]})") if rows else Term("0")
    basis_product = basis_product_of(scheme, model.inventory)
    value = intensities(local("I", row), basis_product, model.hydrogen_lhv, model.ammonia_lhv, model.hydrogen_fraction)[
        scheme.quantity
    ]
    # a producer's declared e_td (g CO2e/MJ), an input cell
    if declared_addition(scheme, model.inventory, engine.parameters):
        value = value + Term.of(model.declared_e_td)
    return scheme_total, value


def _live_status(ws, row: int, scheme, engine_check, co_product_note: str, address) -> None:
    """Column L: the live verdict formula, or the fixed words when the scheme's co-product rule decides."""
    if co_product_note.startswith("cannot be judged"):
        # the scheme's co-product rule cannot be applied: undetermined whatever the value
        put_text(ws, row, 12, Status.UNDETERMINED.words)
    elif co_product_note.startswith("scheme value rescored"):
        # the scheme's co-product rule differs from the project's: the live value keeps the project's method, the
        # engine value (column P) and status (Q) are the scheme's; the reasons say so
        put_text(ws, row, 12, f"{status_name(engine_check.status)} (scheme's co-product rule, column P)")
    else:
        operator = "<=" if scheme.loosest().inclusive else "<"
        put_formula(ws, row, 12, Term(verdict_formula(f"$J${row}", operator, f"$K${row}", f"$Q${row}")), address)


def _tier_formula(row: int, tiers: list[tuple[int, Any]]) -> Term:
    """Column N: the strictest tier met, none when the check is not eligible or undetermined."""
    tier = '"none"'
    for threshold_row, threshold in reversed(tiers):  # loosest outermost, strictest innermost
        comparison = "<=" if threshold.inclusive else "<"
        tier = f"IF($J${row}{comparison}$C${threshold_row},$B${threshold_row},{tier})"
    return Term(f'IF(OR($Q${row}="{Status.NOT_ELIGIBLE.words}",$Q${row}="{Status.UNDETERMINED.words}"),"none",{tier})')


def _write_check_row(ws, row: int, model: SymbolicModel, scheme, block, address, engine, engine_check, tiers) -> None:
    """One scheme's check: words, live formulas, and the engine's value, status and reasons at writing."""
    words = (
        scheme.id,
        scheme.name,
        lower_words(scheme.basis),
        gwp_name(scheme.gwp),
        electricity_rule_name(scheme.electricity),
        ", ".join(stage_name(s) for s in scheme.excluded_stages) or "none",
        unit_name(scheme.quantity),
        scheme.unit,
    )
    for number, text in enumerate(words, start=1):
        put_text(ws, row, number, text)
    scheme_total, value = _scheme_value_term(row, model, scheme, block, engine)
    put_formula(ws, row, 9, scheme_total, address)
    put_formula(ws, row, 10, value, address)
    loosest_row = max(tiers, key=lambda item: item[1].limit)[0]
    put_formula(ws, row, 11, local("C", loosest_row), address)
    co_product_note = str((engine_check.co_products or {}).get("note", "")) if engine_check is not None else ""
    _live_status(ws, row, scheme, engine_check, co_product_note, address)
    put_formula(ws, row, 13, Term(f'IF($Q${row}="{Status.NOT_ELIGIBLE.words}","",$K${row}-$J${row})'), address)
    put_formula(ws, row, 14, _tier_formula(row, tiers), address)
    put_text(ws, row, 15, "yes" if (scheme.from_memory or any(t.from_memory for t in scheme.thresholds)) else "no")
    engine_value = engine_check.value if engine_check else None
    put_value(ws, row, 16, engine_value)
    shown = number_format(engine_value)
    for column in (9, 10, 11, 13):
        style_cell(ws.cell(row=row, column=column), "formula", shown)
    style_cell(ws.cell(row=row, column=16), "engine", shown)
    if engine_check is None:
        put_text(ws, row, 17, "")
        put_text(ws, row, 18, "")
        return
    put_text(ws, row, 17, status_name(engine_check.status))
    rescored = [co_product_note] if co_product_note.startswith("scheme value rescored") else []
    put_text(ws, row, 18, " | ".join(engine_check.reasons + rescored))


def _add_stage_chart(ws, stage_rows: tuple[int, int], unit: str, anchor: str) -> None:
    """The bar chart of contributions by stage, inside the print area."""
    from openpyxl.chart import BarChart, Reference

    first_stage, last_stage = stage_rows
    chart = BarChart()
    chart.type = "bar"
    chart.title = "Contributions by stage (estimate, not a certification)"
    chart.y_axis.title = unit
    chart.x_axis.title = "Stage"
    chart.legend = None
    chart.add_data(Reference(ws, min_col=2, min_row=first_stage - 1, max_row=last_stage), titles_from_data=True)
    chart.set_categories(Reference(ws, min_col=1, min_row=first_stage, max_row=last_stage))
    chart.width, chart.height = 20, 9
    ws.add_chart(chart, anchor)


def _figure(ws, row: int, term, address, engine_value) -> None:
    """A result formula in column B and the engine's figure in D, both shown for their size."""
    put_formula(ws, row, 2, term, address)
    put_value(ws, row, 4, engine_value)
    shown = number_format(engine_value)
    style_cell(ws.cell(row=row, column=2), "formula", shown)
    style_cell(ws.cell(row=row, column=4), "engine", shown)


def _write_cover(
    ws, engine, factor_set, *, gwp, chosen, factors_option, source, meters_source, series_source: str = ""
) -> None:
    put_text(ws, 1, 1, "carbonledger audit workbook")
    ws.cell(row=1, column=1).font = font_bold()
    put_text(ws, 2, 1, f"Caution: {CAUTION}")
    ws.cell(row=2, column=1).font = font_bold()
    rows = [
        ("Project", engine.project),
        ("Project file", source),
        ("Project file sha256", engine.project_sha256),
        ("Product", engine.product),
        ("Functional unit", engine.functional_unit),
        ("Boundary", engine.boundary),
        ("Written (UTC)", written_at().strftime("%Y-%m-%d %H:%M")),
        ("carbonledger version", __version__),
        (COVER_LABELS["factor_set"], factor_set.name),
        ("Factor set sha256", factor_set.sha256),
        (COVER_LABELS["factors_option"], factors_option or factor_set.name),
        (COVER_LABELS["gwp"], gwp),
        (COVER_LABELS["schemes"], ", ".join(scheme.id for scheme in chosen)),
    ]
    if meters_source:
        rows.append(("Metered periods file", meters_source))
    if series_source:
        rows.append(("Electricity time series", series_source))
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
        "Results: totals by stage and gas, intensities, each scheme's check "
        "under its own GWP set and electricity rule, and a chart.",
        "Change an input or a factor and every figure follows. The engine's "
        "own figures are shown beside the formulas for comparison.",
        *(
            (
                "Matching and Intervals: the electricity time series, one row per interval, "
                "matched with contracted generation under each scheme's temporal rule (live "
                "formulas); Calculation and Results keep the declared annual shares.",
            )
            if series_source
            else ()
        ),
        "Scheme checks use each scheme's rulebook as carbonledger reads it; the "
        "scheme's official methodology and an accredited verifier decide.",
    )
    for text in guide:
        put_text(ws, row, 1, text)
        row += 1
    row += 1
    put_text(ws, row, 1, "Cell styles")
    ws.cell(row=row, column=1).font = font_bold()
    samples = {"input": 0.95, "factor": 56100.0, "formula": 543.3, "engine": 543.3}
    for kind, meaning in LEGEND:
        row += 1
        style_cell(put_value(ws, row, 1, samples[kind]), kind, number_format(samples[kind]))
        put_text(ws, row, 2, meaning)
    style_cell(ws.cell(row=1, column=1), "title")
    set_widths(ws, {"A": 40, "B": 90})
    from openpyxl.styles import Alignment

    for cell in ws["B"]:
        cell.alignment = Alignment(wrap_text=True, vertical="top")


def written_at() -> _dt.datetime:
    """When the workbook is written (UTC, to the minute, no time zone as the file format stores it):
    ``SOURCE_DATE_EPOCH`` when set, as reproducible builds read it [1]_, else now.

    References
    ----------
    .. [1] Reproducible Builds, "SOURCE_DATE_EPOCH specification",
    https://reproducible-builds.org/specs/source-date-epoch/
    """
    epoch = os.environ.get("SOURCE_DATE_EPOCH", "")
    moment = _dt.datetime.fromtimestamp(int(epoch), _dt.UTC) if epoch.isdigit() else _dt.datetime.now(_dt.UTC)
    return moment.replace(second=0, microsecond=0, tzinfo=None)


ZIP_EPOCH = (1980, 1, 1, 0, 0, 0)  # the earliest time a zip entry can state (PKWARE APPNOTE 4.4.6)


class _FixedTimeZip(zipfile.ZipFile):
    """A zip file whose entries all carry ``ZIP_EPOCH``: the same workbook gives the same bytes on every run."""

    def writestr(self, name, data, compress_type=None, compresslevel=None):
        if not isinstance(name, zipfile.ZipInfo):
            name = zipfile.ZipInfo(name, date_time=ZIP_EPOCH)
            name.compress_type = self.compression
            name.external_attr = 0o600 << 16
        super().writestr(name, data, compress_type, compresslevel)

    def write(self, filename, arcname=None, compress_type=None, compresslevel=None):
        """A file from disk (openpyxl writes each worksheet to a temporary file first), without its mtime."""
        entry = zipfile.ZipInfo(str(arcname or filename), date_time=ZIP_EPOCH)
        entry.compress_type = self.compression if compress_type is None else compress_type
        entry.external_attr = 0o600 << 16
        entry.file_size = os.path.getsize(filename)  # zipfile chooses the zip64 format from it, as write() does
        with open(filename, "rb") as source, self.open(entry, "w") as target:
            shutil.copyfileobj(source, target, 1 << 20)


def save_workbook_bytes(workbook, path: Path) -> None:
    """Save as openpyxl does, but with fixed entry times and the document's own created/modified times
    (openpyxl's ``save`` stamps the second of saving), so two runs write identical files."""
    from openpyxl.writer.excel import ExcelWriter

    ExcelWriter(workbook, _FixedTimeZip(path, "w", zipfile.ZIP_DEFLATED, allowZip64=True)).save()


def write_workbook_file(path: str | Path, workbook, force: bool = False) -> Path:
    """Save atomically; an existing file is left untouched unless ``force``."""
    return atomic_write(path, lambda tmp: save_workbook_bytes(workbook, tmp), force=force)
