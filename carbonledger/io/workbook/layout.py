"""The audit workbook's layout, shared by the writer and the reader: sheet names, header rows,
columns, cover labels, and the cell helpers that keep text as text.

Change the layout here and both sides follow; the reader finds the Inputs and Factors headers
on ``INPUT_HEADER_ROW`` / ``FACTOR_HEADER_ROW`` and the cover settings by their labels.
"""

from __future__ import annotations

from typing import Any

from .cells import Term, resolve

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


def is_number(value: Any) -> bool:
    return isinstance(value, (int, float)) and not isinstance(value, bool)


def copy_tree(value):
    if isinstance(value, dict):
        return {key: copy_tree(child) for key, child in value.items()}
    return value


def font_bold():
    from openpyxl.styles import Font

    return Font(bold=True)


def put_formula(ws, row: int, column: int, term, address: dict[str, str]):
    """Write a Term as a formula (factor placeholders resolved); a plain number as a number."""
    cell = ws.cell(row=row, column=column)
    if isinstance(term, Term) and term.literal is None:
        cell.value = "=" + resolve(term.text, address)
    else:
        cell.value = float(term.literal if isinstance(term, Term) else term)
    return cell


def bold_row(ws, row: int, columns: int) -> None:
    from openpyxl.styles import Font

    bold = Font(bold=True)
    for column in range(1, columns + 1):
        ws.cell(row=row, column=column).font = bold


def set_widths(ws, widths: dict[str, float]) -> None:
    for letter, width in widths.items():
        ws.column_dimensions[letter].width = width


def set_path(tree: dict, path: str, value: Any) -> None:
    parts = path.split(".")
    node = tree
    for part in parts[:-1]:
        node = node[part]
    node[parts[-1]] = value


