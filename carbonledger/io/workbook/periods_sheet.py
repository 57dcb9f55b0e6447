"""The Periods sheet: one calculation block per metered month and a summary for the year.

Each month's block is the project's calculation with that month's parameters (see
``carbonledger.periods``): the same ``build_inventory`` on symbolic cells, whose electricity
shares come from the month's meters and whose gas and electricity parameters are the design
cells times the month's scale factors. The summary weights the months by output: the year's
intensity is the sum of the months' emissions over the sum of their output.
"""

from __future__ import annotations

import dataclasses
from dataclasses import dataclass
from typing import Any

from ...analyses.periods import CANONICAL, NM3_FACTOR, Meters, metered_year, output_quantity, scaled_parameters
from ...core.inventory import build_inventory
from ...core.scoring import intensities
from ...model.statuses import Status
from .calculation import basis_product_of, stage_sums, write_calculation_block
from .cells import Term, local, ref, sum_of
from .layout import (
    CALCULATION,
    RESULTS,
    bold_row,
    copy_tree,
    font_bold,
    put_formula,
    put_text,
    put_value,
    set_path,
    set_widths,
    verdict_formula,
)
from .style import number_format

SUMMARY_TOP = 1


@dataclass
class PeriodPlan:
    meters: Meters
    nm3_factor: Any  # Term for the volumetric calorific value, or None
    engine: list  # engine ScoreResult per month (or None)


def plan_periods(meters: Meters, params: dict, model, factor_set, engine: list | None = None) -> PeriodPlan:
    """Register the factors the blocks need (before the Factors sheet is written)."""
    nm3 = None
    if any(column.by_volume for column in meters.columns):
        nm3 = model.inputs.factor(NM3_FACTOR, "MJ/m3", "--periods natural_gas [Nm3]")
    return PeriodPlan(meters, nm3, engine or [None] * len(meters.months))


@dataclass
class _MonthFigures:
    """Where a month's figures sit on its block (row numbers) and their cells (terms)."""

    output: Term
    shares: dict[str, Term]
    k_gas: Term | None
    k_electricity: Term
    consumers_row: int
    total_row: int
    emissions_row: int
    hydrogen_row: int | None
    last_row: int


class _Writer:
    """Rows written one after another on the Periods sheet."""

    def __init__(self, ws, address: dict, row: int):
        self.ws, self.address, self.row = ws, address, row

    def line(self, label: str, term=None, unit_text: str = "") -> Term:
        """A labelled row: the term in column D (if any), its unit in column E; returns the D cell."""
        self.row += 1
        put_text(self.ws, self.row, 1, label)
        if term is not None:
            put_formula(self.ws, self.row, 4, term, self.address)
        put_text(self.ws, self.row, 5, unit_text)
        return local("D", self.row)


def _write_meters(writer: _Writer, plan: PeriodPlan, values: dict) -> dict[tuple[str, str], Term]:
    """The month's meter readings and each in calculation units; returns (quantity, source) -> cell."""
    ws, address = writer.ws, writer.address
    for column, text in enumerate(("meter", "metered", "unit", "in calculation units", "unit"), start=1):
        put_text(ws, writer.row, column, text)
    bold_row(ws, writer.row, 5)
    converted: dict[tuple[str, str], Term] = {}
    for meter in plan.meters.columns:
        writer.row += 1
        row = writer.row
        put_text(ws, row, 1, meter.header)
        put_value(ws, row, 2, values[meter.header])
        put_text(ws, row, 3, meter.unit)
        if meter.by_volume:
            put_formula(ws, row, 4, local("B", row) * plan.nm3_factor / 1000.0, address)
        else:
            put_formula(
                ws, row, 4, local("B", row) * meter.multiplier if meter.multiplier != 1.0 else local("B", row), address
            )
        put_text(ws, row, 5, CANONICAL[meter.quantity])
        converted[(meter.quantity, meter.source)] = local("D", row)
    return converted


def _write_month_figures(
    writer: _Writer,
    converted: dict,
    params: dict,
    product: str,
    output_column,
    gas_paths,
    design_supply: dict,
    unit: str,
) -> _MonthFigures:
    """Output, electricity shares, metered use per functional unit and the scale factors of one month."""
    output_unit = "t NH3" if product == "ammonia" else "kg H2"
    output = writer.line(
        "functional units produced",
        converted[(output_column.quantity, "")] if product == "hydrogen" else converted[("ammonia", "")],
        output_unit,
    )
    electricity = writer.line(
        "electricity, total", sum_of(t for (q, _), t in converted.items() if q == "electricity"), "kWh"
    )
    shares = {
        name: writer.line(
            f"share of electricity from {name}", converted[("electricity", name)] / electricity, "fraction"
        )
        for name in params["electricity"]["sources"]
    }
    electricity_per_unit = writer.line(
        "electricity per functional unit, metered", electricity / output, f"kWh/{output_unit}"
    )
    k_gas = None
    if gas_paths and ("natural_gas", "") in converted:
        gas_per_unit = writer.line(
            "natural gas per functional unit, metered", converted[("natural_gas", "")] / output, f"GJ/{output_unit}"
        )
        design_gas = writer.line(
            "natural gas per functional unit, design", design_supply["natural_gas_supply"], f"GJ/{output_unit}"
        )
        k_gas = writer.line("k_gas = metered / design", gas_per_unit / design_gas, "")
    writer.line(
        "electricity per functional unit of the design's consumers at this month's gas use", None, f"kWh/{output_unit}"
    )
    consumers_row = writer.row  # filled in once the block's rows are known
    k_electricity = writer.line(
        "k_electricity = metered / design consumers", electricity_per_unit / local("D", consumers_row), ""
    )
    writer.line("kg CO2e per functional unit, this month", None, unit)
    total_row = writer.row
    writer.line("kg CO2e in the month", local("D", total_row) * output, "kg CO2e")
    emissions_row = writer.row
    hydrogen_row = None
    if ("hydrogen", "") in converted and product == "ammonia":
        writer.line(
            "hydrogen per t NH3, metered (cross-check, not used)", converted[("hydrogen", "")] / output, "kg H2/t NH3"
        )
        hydrogen_row = writer.row
    return _MonthFigures(
        output, shares, k_gas, k_electricity, consumers_row, total_row, emissions_row, hydrogen_row, writer.row
    )


def _month_parameters(params: dict, input_cell: dict, figures: _MonthFigures, gas_paths, electricity_paths) -> dict:
    """The month's parameters: design cells, the month's shares, gas and electricity scaled by k."""
    symbolic = copy_tree(params)
    for path, cell in input_cell.items():
        set_path(symbolic, path, cell)
    for name, share in figures.shares.items():
        symbolic["electricity"]["sources"][name]["share"] = share
    for path in gas_paths:
        if figures.k_gas is not None:
            set_path(symbolic, path, input_cell[path] * figures.k_gas)
    for path in electricity_paths:
        set_path(symbolic, path, input_cell[path] * figures.k_electricity)
    return symbolic


def _fill_from_block(ws, block, figures: _MonthFigures, design_amount: dict, address: dict) -> list[int]:
    """The cells that need the month's block: the design consumers' electricity, the total, the hydrogen
    cross-check. Returns the block's biosphere rows."""
    terms = []
    for brow, key, exchange in block.exchange_rows:
        if exchange.kind == "technosphere" and exchange.input == "electricity_mix":
            design = design_amount[(key, exchange_index(block, brow))]
            terms.append(design * local("E", block.activity_row[key]))
    put_formula(ws, figures.consumers_row, 4, sum_of(terms), address)
    biosphere = [r for r, _, e in block.exchange_rows if e.kind == "biosphere"]
    put_formula(ws, figures.total_row, 4, sum_of(local("K", r) for r in biosphere), address)
    if figures.hydrogen_row is not None:
        put_text(ws, figures.hydrogen_row, 6, "model, kg H2/t NH3:")
        put_formula(ws, figures.hydrogen_row, 7, local("E", block.activity_row["hydrogen_production"]), address)
    return biosphere


def _write_month_summary_row(
    ws,
    srow: int,
    month: str,
    figures: _MonthFigures,
    engine,
    block,
    month_model,
    model,
    stages,
    chosen,
    check_column: int,
    results_cells,
    address: dict,
    biosphere: list[int],
) -> None:
    """The month's row of the summary: output, intensity, emissions, stages and each scheme's value and verdict."""
    put_text(ws, srow, 1, month)
    put_formula(ws, srow, 2, figures.output, address)
    put_formula(ws, srow, 3, local("D", figures.total_row), address)
    put_formula(ws, srow, 4, local("D", figures.emissions_row), address)
    put_value(ws, srow, 5, engine.total if engine is not None else None)
    month_stages = stage_sums(block, month_model.inventory, "K")
    for position, stage in enumerate(stages):
        put_formula(ws, srow, 6 + position, month_stages.get(stage, Term("0")), address)
    engine_checks = {check.scheme: check for check in engine.checks} if engine is not None else {}
    for position, scheme in enumerate(chosen):
        column = check_column + 3 * position
        letter = block.scheme_column[scheme.id]
        # SUM skips zero-rated rows (text)
        scheme_total = Term(f"SUM({letter}{biosphere[0]}:{letter}{biosphere[-1]})") if biosphere else Term("0")
        basis_product = basis_product_of(scheme, month_model.inventory)
        value = intensities(
            scheme_total, basis_product, model.hydrogen_lhv, model.ammonia_lhv, model.hydrogen_fraction
        )[scheme.quantity]
        put_formula(ws, srow, column, value, address)
        _verdict(ws, srow, column, scheme, results_cells, address)
        put_value(ws, srow, column + 2, engine_checks[scheme.id].value if scheme.id in engine_checks else None)


def _write_year_row(
    ws,
    year_row: int,
    first_month_row: int,
    stages,
    chosen,
    check_column: int,
    results_cells,
    address: dict,
    engine_year: float | None = None,
) -> None:
    """All months, output-weighted: sums of output and emissions, and the weighted stages and scheme values;
    the engine's metered year beside the year's figure, both formatted as numbers."""
    from openpyxl.utils import get_column_letter

    last = year_row - 1
    put_text(ws, year_row, 1, "all months (output-weighted)")
    ws.cell(row=year_row, column=1).font = font_bold()
    put_formula(ws, year_row, 2, Term(f"SUM(B{first_month_row}:B{last})"), address)
    put_formula(ws, year_row, 4, Term(f"SUM(D{first_month_row}:D{last})"), address)
    put_formula(ws, year_row, 3, Term(f"IF(B{year_row}=0,0,D{year_row}/B{year_row})"), address)
    put_value(ws, year_row, 5, engine_year)
    for column in (3, 5):
        # the year's figure, never 17 digits
        ws.cell(row=year_row, column=column).number_format = number_format(engine_year)
    for position in range(len(stages)):
        letter = get_column_letter(6 + position)
        weighted = sum_of(local(letter, r) * local("B", r) for r in range(first_month_row, last + 1))
        put_formula(ws, year_row, 6 + position, weighted / local("B", year_row), address)
    for position, scheme in enumerate(chosen):
        column = check_column + 3 * position
        letter = get_column_letter(column)
        weighted = sum_of(local(letter, r) * local("B", r) for r in range(first_month_row, last + 1))
        put_formula(ws, year_row, column, weighted / local("B", year_row), address)
        _verdict(ws, year_row, column, scheme, results_cells, address)


def _write_summary_header(ws, meters_path, header_row: int, output_unit: str, unit: str, stages: list, chosen) -> int:
    """The sheet's two lines of explanation and the header of the month summary; returns the first
    column of the scheme checks."""
    put_text(
        ws,
        1,
        1,
        f"Metered periods from {meters_path}: one calculation block per month below, "
        "the summary here. Output-weighted: year = sum of emissions / sum of output.",
    )
    put_text(
        ws,
        2,
        1,
        "Each month: electricity shares from the meters; gas and electricity parameters = design value x the month's "
        "scale factor, so the month's gas and electricity per functional unit equal the metered figures.",
    )
    summary_header = ["month", f"output ({output_unit})", f"{unit}", "kg CO2e in the month", "engine at writing"] + [
        f"{stage} ({unit})" for stage in stages
    ]
    check_column = 6 + len(stages)  # per scheme: value, verdict against the Results sheet's threshold, engine value
    for scheme in chosen:
        summary_header += [f"{scheme.id} [{scheme.unit}]", f"{scheme.id} verdict", f"{scheme.id}, engine at writing"]
    for column, text in enumerate(summary_header, start=1):
        put_text(ws, header_row, column, text)
    bold_row(ws, header_row, len(summary_header))
    return check_column


def write_periods_sheet(
    ws,
    plan: PeriodPlan,
    params: dict,
    input_cell: dict,
    model,
    design_block,
    address: dict,
    unit: str,
    chosen=(),
    results_cells: dict | None = None,
) -> None:
    meters = plan.meters
    inventory = model.inventory
    product = inventory.product
    gas_paths, electricity_paths = scaled_parameters(params)
    output_unit = "t NH3" if product == "ammonia" else "kg H2"
    stages = list(stage_sums(design_block, inventory, "K"))

    header_row = 4
    check_column = _write_summary_header(ws, meters.path, header_row, output_unit, unit, stages, chosen)
    first_month_row = header_row + 1
    year_row = first_month_row + len(meters.months)
    top = year_row + 3

    design_supply = {key: ref(CALCULATION, "E", row) for key, row in design_block.activity_row.items()}
    design_amount = {
        (key, exchange_index(design_block, row)): ref(CALCULATION, "G", row)
        for row, key, _ in design_block.exchange_rows
    }
    for number, month in enumerate(meters.months):
        put_text(ws, top, 1, f"Period {month}")
        ws.cell(row=top, column=1).font = font_bold()
        writer = _Writer(ws, address, top + 1)
        converted = _write_meters(writer, plan, meters.values[number])
        figures = _write_month_figures(
            writer, converted, params, product, meters.column(output_quantity(product)), gas_paths, design_supply, unit
        )
        symbolic = _month_parameters(params, input_cell, figures, gas_paths, electricity_paths)
        month_model = dataclasses.replace(model, inventory=build_inventory(symbolic, model.inputs))
        block = write_calculation_block(
            ws, month_model, list(chosen), address, top=figures.last_row + 2, title=f"Calculation for {month}"
        )
        biosphere = _fill_from_block(ws, block, figures, design_amount, address)
        _write_month_summary_row(
            ws,
            first_month_row + number,
            month,
            figures,
            plan.engine[number],
            block,
            month_model,
            model,
            stages,
            chosen,
            check_column,
            results_cells,
            address,
            biosphere,
        )
        top = block.end_row + 3
    engine_year = (
        metered_year(meters, product, plan.engine) if all(engine is not None for engine in plan.engine) else None
    )
    _write_year_row(ws, year_row, first_month_row, stages, chosen, check_column, results_cells, address, engine_year)
    set_widths(ws, {"A": 60, "B": 16, "C": 18, "D": 20, "E": 18})


def _verdict(ws, row: int, value_column: int, scheme, results_cells: dict | None, address: dict) -> None:
    """The status (qualifies, fails, not eligible, undetermined) of the value in ``value_column`` against the scheme's
    loosest threshold on the Results sheet."""
    from openpyxl.utils import get_column_letter

    loosest = scheme.loosest()
    operator = "<=" if loosest.inclusive else "<"
    value = f"{get_column_letter(value_column)}{row}"
    if results_cells and f"check:{scheme.id}" in results_cells:
        limit = f"{RESULTS}!$K${results_cells[f'check:{scheme.id}']}"
        status = f"{RESULTS}!$Q${results_cells[f'check:{scheme.id}']}"
        formula = verdict_formula(value, operator, limit, status)
    else:
        formula = f'IF({value}{operator}{loosest.limit!r},"{Status.QUALIFIES.words}","{Status.FAILS.words}")'
    put_formula(ws, row, value_column + 1, Term(formula), address)


def exchange_index(block, row: int) -> int:
    """Position of the exchange written on ``row`` within its activity's exchanges."""
    key = next(k for r, k, _ in block.exchange_rows if r == row)
    rows = [r for r, k, _ in block.exchange_rows if k == key]
    return rows.index(row)
