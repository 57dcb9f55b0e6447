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

from ...analyses.periods import CANONICAL, NM3_FACTOR, Meters, scaled_parameters
from ...core.inventory import build_inventory
from ...core.scoring import intensities
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


def _output_quantity(product: str) -> str:
    return "ammonia" if product == "ammonia" else "hydrogen"


def write_periods_sheet(ws, plan: PeriodPlan, params: dict, input_cell: dict, model, design_block, address: dict, unit: str, chosen=(), results_cells: dict | None = None) -> None:
    meters = plan.meters
    inventory = model.inventory
    product = inventory.product
    gas_paths, electricity_paths = scaled_parameters(params)
    output_column = meters.column(_output_quantity(product))
    output_unit = "t NH3" if product == "ammonia" else "kg H2"
    stages = list(stage_sums(design_block, inventory, "K"))

    put_text(ws, 1, 1, f"Metered periods from {meters.path}: one calculation block per month below, the summary here. Output-weighted: year = sum of emissions / sum of output.")
    put_text(ws, 2, 1, "Each month: electricity shares from the meters; gas and electricity parameters = design value x the month's scale factor, so the month's gas and electricity per functional unit equal the metered figures.")
    header_row = 4
    summary_header = ["month", f"output ({output_unit})", f"{unit}", "kg CO2e in the month", "engine at writing"] + [f"{stage} ({unit})" for stage in stages]
    check_column = 6 + len(stages)  # per scheme: value, verdict against the Results sheet's threshold, engine value
    for scheme in chosen:
        summary_header += [f"{scheme.id} [{scheme.unit}]", f"{scheme.id} verdict", f"{scheme.id}, engine at writing"]
    for column, text in enumerate(summary_header, start=1):
        put_text(ws, header_row, column, text)
    bold_row(ws, header_row, len(summary_header))
    first_month_row = header_row + 1
    year_row = first_month_row + len(meters.months)
    top = year_row + 3

    design_supply = {key: ref(CALCULATION, "E", row) for key, row in design_block.activity_row.items()}
    design_amount = {(key, exchange_index(design_block, row)): ref(CALCULATION, "G", row) for row, key, _ in design_block.exchange_rows}

    for number, month in enumerate(meters.months):
        values = meters.values[number]
        row = top
        put_text(ws, row, 1, f"Period {month}")
        ws.cell(row=row, column=1).font = font_bold()
        row += 1
        for column, text in enumerate(("meter", "metered", "unit", "in calculation units", "unit"), start=1):
            put_text(ws, row, column, text)
        bold_row(ws, row, 5)
        converted: dict[tuple[str, str], Term] = {}
        for meter in meters.columns:
            row += 1
            put_text(ws, row, 1, meter.header)
            put_value(ws, row, 2, values[meter.header])
            put_text(ws, row, 3, meter.unit)
            if meter.by_volume:
                put_formula(ws, row, 4, local("B", row) * plan.nm3_factor / 1000.0, address)
            else:
                put_formula(ws, row, 4, local("B", row) * meter.multiplier if meter.multiplier != 1.0 else local("B", row), address)
            put_text(ws, row, 5, CANONICAL[meter.quantity])
            converted[(meter.quantity, meter.source)] = local("D", row)

        def derived(label: str, term, unit_text: str) -> Term:
            nonlocal row
            row += 1
            put_text(ws, row, 1, label)
            put_formula(ws, row, 4, term, address)
            put_text(ws, row, 5, unit_text)
            return local("D", row)

        output = derived("functional units produced", converted[(output_column.quantity, "")] if product == "hydrogen" else converted[("ammonia", "")], output_unit)
        electricity = derived("electricity, total", sum_of(t for (q, _), t in converted.items() if q == "electricity"), "kWh")
        shares = {name: derived(f"share of electricity from {name}", converted[("electricity", name)] / electricity, "fraction") for name in params["electricity"]["sources"]}
        electricity_per_unit = derived("electricity per functional unit, metered", electricity / output, f"kWh/{output_unit}")
        k_gas = None
        if gas_paths and ("natural_gas", "") in converted:
            gas_per_unit = derived("natural gas per functional unit, metered", converted[("natural_gas", "")] / output, f"GJ/{output_unit}")
            design_gas = derived("natural gas per functional unit, design", design_supply["natural_gas_supply"], f"GJ/{output_unit}")
            k_gas = derived("k_gas = metered / design", gas_per_unit / design_gas, "")
        row += 1
        consumers_row = row  # filled in once the block's rows are known
        put_text(ws, row, 1, "electricity per functional unit of the design's consumers at this month's gas use")
        put_text(ws, row, 5, f"kWh/{output_unit}")
        k_electricity = derived("k_electricity = metered / design consumers", electricity_per_unit / local("D", consumers_row), "")
        row += 1
        total_row = row
        put_text(ws, row, 1, "kg CO2e per functional unit, this month")
        put_text(ws, row, 5, unit)
        row += 1
        month_emissions_row = row
        put_text(ws, row, 1, "kg CO2e in the month")
        put_formula(ws, row, 4, local("D", total_row) * output, address)
        put_text(ws, row, 5, "kg CO2e")
        hydrogen_check = ("hydrogen", "") in converted and product == "ammonia"
        if hydrogen_check:
            derived("hydrogen per t NH3, metered (cross-check, not used)", converted[("hydrogen", "")] / output, "kg H2/t NH3")
            hydrogen_row = row

        # the month's parameters: design cells, shares and scale factors
        symbolic = copy_tree(params)
        for path, cell in input_cell.items():
            set_path(symbolic, path, cell)
        for name, share in shares.items():
            symbolic["electricity"]["sources"][name]["share"] = share
        for path in gas_paths:
            if k_gas is not None:
                set_path(symbolic, path, input_cell[path] * k_gas)
        for path in electricity_paths:
            set_path(symbolic, path, input_cell[path] * k_electricity)
        month_model = dataclasses.replace(model, inventory=build_inventory(symbolic, model.inputs))
        block = write_calculation_block(ws, month_model, list(chosen), address, top=row + 2, title=f"Calculation for {month}")

        # electricity of the design's consumers at this month's supplies
        terms = []
        for brow, key, exchange in block.exchange_rows:
            if exchange.kind == "technosphere" and exchange.input == "electricity_mix":
                design = design_amount[(key, exchange_index(block, brow))]
                terms.append(design * local("E", block.activity_row[key]))
        put_formula(ws, consumers_row, 4, sum_of(terms), address)
        biosphere = [r for r, _, e in block.exchange_rows if e.kind == "biosphere"]
        put_formula(ws, total_row, 4, sum_of(local("K", r) for r in biosphere), address)
        if hydrogen_check:
            put_text(ws, hydrogen_row, 6, "model, kg H2/t NH3:")
            put_formula(ws, hydrogen_row, 7, local("E", block.activity_row["hydrogen_production"]), address)

        # summary row
        srow = first_month_row + number
        put_text(ws, srow, 1, month)
        put_formula(ws, srow, 2, output, address)
        put_formula(ws, srow, 3, local("D", total_row), address)
        put_formula(ws, srow, 4, local("D", month_emissions_row), address)
        engine = plan.engine[number]
        put_value(ws, srow, 5, engine.total if engine is not None else None)
        month_stages = stage_sums(block, month_model.inventory, "K")
        for position, stage in enumerate(stages):
            put_formula(ws, srow, 6 + position, month_stages.get(stage, Term("0")), address)
        engine_checks = {check.scheme: check for check in engine.checks} if engine is not None else {}
        for position, scheme in enumerate(chosen):
            column = check_column + 3 * position
            letter = block.scheme_column[scheme.id]
            scheme_total = Term(f"SUM({letter}{biosphere[0]}:{letter}{biosphere[-1]})") if biosphere else Term("0")  # SUM skips zero-rated rows (text)
            basis_product = basis_product_of(scheme, month_model.inventory)
            value = intensities(scheme_total, basis_product, model.hydrogen_lhv, model.ammonia_lhv, model.hydrogen_fraction)[scheme.quantity]
            put_formula(ws, srow, column, value, address)
            _verdict(ws, srow, column, scheme, results_cells, address)
            put_value(ws, srow, column + 2, engine_checks[scheme.id].value if scheme.id in engine_checks else None)
        top = block.end_row + 3

    last = year_row - 1
    put_text(ws, year_row, 1, "all months (output-weighted)")
    ws.cell(row=year_row, column=1).font = font_bold()
    put_formula(ws, year_row, 2, Term(f"SUM(B{first_month_row}:B{last})"), address)
    put_formula(ws, year_row, 4, Term(f"SUM(D{first_month_row}:D{last})"), address)
    put_formula(ws, year_row, 3, Term(f"IF(B{year_row}=0,0,D{year_row}/B{year_row})"), address)
    figures = [engine.total for engine in plan.engine if engine is not None]
    ws.cell(row=year_row, column=3).number_format = number_format(sum(figures) / len(figures) if figures else None)  # the year's figure, never 17 digits
    from openpyxl.utils import get_column_letter

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
    set_widths(ws, {"A": 60, "B": 16, "C": 18, "D": 20, "E": 18})


def _verdict(ws, row: int, value_column: int, scheme, results_cells: dict | None, address: dict) -> None:
    """The status (qualifies, fails, not eligible, undetermined) of the value in ``value_column`` against the scheme's loosest threshold on the Results sheet."""
    from openpyxl.utils import get_column_letter

    loosest = scheme.loosest()
    operator = "<=" if loosest.inclusive else "<"
    value = f"{get_column_letter(value_column)}{row}"
    if results_cells and f"check:{scheme.id}" in results_cells:
        limit = f"{RESULTS}!$K${results_cells[f'check:{scheme.id}']}"
        status = f"{RESULTS}!$Q${results_cells[f'check:{scheme.id}']}"
        formula = verdict_formula(value, operator, limit, status)
    else:
        formula = f'IF({value}{operator}{loosest.limit!r},"qualifies","fails")'
    put_formula(ws, row, value_column + 1, Term(formula), address)


def exchange_index(block, row: int) -> int:
    """Position of the exchange written on ``row`` within its activity's exchanges."""
    key = next(k for r, k, _ in block.exchange_rows if r == row)
    rows = [r for r, k, _ in block.exchange_rows if k == key]
    return rows.index(row)
