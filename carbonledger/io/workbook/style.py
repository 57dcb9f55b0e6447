"""How the audit workbook looks and prints: number formats, the cell styles a verifier reads
(inputs, factors, formulas, the engine's figures), frozen headers and A4 landscape page set-up.

The palette is this project's own (sand for what the user enters, harbour teal for library
factors, ink for formulas, slate for the engine's figures kept for comparison), the same as the
HTML report's. Styles never change a value; the readers ignore them.

References
----------
.. [1] ECMA-376 Office Open XML, Part 1, 18.8.30 (number formats) and 18.3.1.63 (page set-up).
"""

from __future__ import annotations

import math

INK, TEAL, SAND, SLATE = "FF1D2A33", "FF24566B", "FF7A4E0F", "FF5B616C"
INPUT_FILL, FACTOR_FILL, HEADER_FILL = "FFF6ECD9", "FFE4EEF0", "FF24566B"
SHARE = "0.0%"
YEAR = "0"
LEGEND = (
    ("input", "Input: a project parameter; edit it and every formula follows"),
    ("factor", "Factor from the library, with its source on the Factors sheet"),
    ("formula", "Formula: live arithmetic over inputs and factors (do not type over it)"),
    ("engine", "Engine figure when the workbook was written, for comparison only"),
)


def number_format(value: float | None) -> str:
    """Thousands separators and about three significant figures after the point for the value's
    size: 1,814.8; 29.210; 0.320; 0.0313; 0.0000410. The cell keeps every digit."""
    if value is None or not isinstance(value, (int, float)) or value == 0 or not math.isfinite(value):
        return "#,##0.000"
    size = abs(value)
    if size >= 100:
        return "#,##0.0"
    if size >= 1:
        return "#,##0.000"
    decimals = min(10, 2 - math.floor(math.log10(size)))
    return "0." + "0" * decimals


def input_format(value, unit: str) -> str | None:
    """Inputs: shares as percentages, calendar years plain, other numbers by size."""
    if not isinstance(value, (int, float)) or isinstance(value, bool):
        return None
    if unit == "fraction":
        return "0.0##%"
    if "year" in unit and float(value).is_integer():
        return YEAR
    if float(value).is_integer():
        return "#,##0"
    return number_format(value)


def _font(**kwargs):
    from openpyxl.styles import Font

    return Font(**kwargs)


def _fill(colour: str):
    from openpyxl.styles import PatternFill

    return PatternFill("solid", start_color=colour, end_color=colour)


def style_cell(cell, kind: str, number: str | None = None) -> None:
    """kind: 'input', 'factor', 'formula', 'engine', 'header' or 'title'."""
    from openpyxl.styles import Alignment

    if kind == "input":
        cell.fill, cell.font = _fill(INPUT_FILL), _font(color=SAND)
    elif kind == "factor":
        cell.fill, cell.font = _fill(FACTOR_FILL), _font(color=TEAL)
    elif kind == "formula":
        cell.font = _font(color=INK)
    elif kind == "engine":
        cell.font = _font(color=SLATE, italic=True)
    elif kind == "header":
        cell.fill, cell.font = _fill(HEADER_FILL), _font(color="FFFFFFFF", bold=True)
        cell.alignment = Alignment(wrap_text=True, vertical="top")
    elif kind == "title":
        cell.font = _font(color=TEAL, bold=True, size=13)
    if number is not None:
        cell.number_format = number


def header_row(ws, row: int, columns: int) -> None:
    for column in range(1, columns + 1):
        style_cell(ws.cell(row=row, column=column), "header")


def wrap_columns(ws, letters: str, first_row: int) -> None:
    """Long text (descriptions, sources, notes) wraps inside its column instead of being cut;
    each row is made tall enough for its longest wrapped cell (spreadsheet programs do not
    always re-measure rows of a file they open)."""
    from openpyxl.styles import Alignment

    lines: dict[int, int] = {}
    for letter in letters:
        width = ws.column_dimensions[letter].width or 10
        for cell in ws[letter][first_row - 1:]:
            cell.alignment = Alignment(wrap_text=True, vertical="top")
            if isinstance(cell.value, str) and not cell.value.startswith("="):
                needed = math.ceil(len(cell.value) * 1.1 / max(width - 1, 1))
                lines[cell.row] = max(lines.get(cell.row, 1), needed)
    for row, count in lines.items():
        if count > 1:
            ws.row_dimensions[row].height = 15 * count


def fill_missing_formats(ws) -> None:
    """Every number and formula cell gets a number format (General shows 17 digits)."""
    for row in ws.iter_rows():
        for cell in row:
            if cell.number_format != "General":
                continue
            value = cell.value
            if isinstance(value, bool):
                continue
            if isinstance(value, (int, float)):
                cell.number_format = number_format(value)
            elif isinstance(value, str) and value.startswith("=") and not value.startswith('=IF(') and '"' not in value:
                cell.number_format = "#,##0.000"


def page_setup(ws, *, title_rows: str | None = None, title_columns: str | None = None, pages_wide: int = 1) -> None:
    """A4 landscape, margins for binding, header rows repeated on every page, the used range as
    the print area, ``pages_wide`` pages across and as many down as needed."""
    from openpyxl.worksheet.properties import PageSetupProperties

    ws.page_setup.orientation = "landscape"
    ws.page_setup.paperSize = ws.PAPERSIZE_A4
    ws.sheet_properties.pageSetUpPr = PageSetupProperties(fitToPage=True)
    ws.page_setup.fitToWidth = pages_wide
    ws.page_setup.fitToHeight = 0
    ws.page_margins.left = ws.page_margins.right = 0.5
    ws.page_margins.top = ws.page_margins.bottom = 0.6
    ws.print_options.gridLines = False
    ws.oddFooter.center.text = "&A, page &P of &N"
    ws.oddFooter.left.text = "Screening estimate, not a certification"
    if title_rows:
        ws.print_title_rows = title_rows
    if title_columns:
        ws.print_title_cols = title_columns
    ws.print_area = ws.dimensions
