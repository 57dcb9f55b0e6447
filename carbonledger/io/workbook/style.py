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

from .layout import put_text

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


def header_texts(ws, row: int, texts) -> None:
    """One header row of a table: ``texts`` from column 1 (as text), in the header style."""
    for column, text in enumerate(texts, start=1):
        put_text(ws, row, column, text)
    header_row(ws, row, len(texts))


def wrap_columns(ws, letters: str, first_row: int) -> None:
    """Long text (descriptions, sources, notes) wraps inside its column instead of being cut;
    each row is made tall enough for its longest wrapped cell (spreadsheet programs do not
    always re-measure rows of a file they open)."""
    from openpyxl.styles import Alignment

    lines: dict[int, int] = {}
    for letter in letters:
        width = ws.column_dimensions[letter].width or 10
        for cell in ws[letter][first_row - 1 :]:
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
            elif isinstance(value, str) and value.startswith("=") and not value.startswith("=IF(") and '"' not in value:
                cell.number_format = "#,##0.000"


def page_setup(
    ws, *, title_rows: str | None = None, title_columns: str | None = None, pages_wide: int = 1, align: bool = True
) -> None:
    """A4 landscape, margins for binding and a footer that prints whole, header rows repeated on
    every page, the used range and every chart in the print area, ``pages_wide`` pages across and
    as many down as needed. ``align``: every cell on the top of its row (a label and its value read
    as one line) and a text right of a number indented (a unit does not run into its number);
    left out on the interval sheets (a year of hours: styling each cell costs seconds)."""
    from openpyxl.utils import get_column_letter
    from openpyxl.worksheet.properties import PageSetupProperties

    ws.page_setup.orientation = "landscape"
    ws.page_setup.paperSize = ws.PAPERSIZE_A4
    ws.sheet_properties.pageSetUpPr = PageSetupProperties(fitToPage=True)
    ws.page_setup.fitToWidth = pages_wide
    ws.page_setup.fitToHeight = 0
    ws.page_margins.left = ws.page_margins.right = 0.5
    ws.page_margins.top = 0.6
    ws.page_margins.bottom = 0.8  # inches: room for the footer, which sits 0.3 in from the edge
    ws.page_margins.header = ws.page_margins.footer = 0.3
    ws.print_options.gridLines = False
    ws.oddFooter.center.text = "&A, page &P of &N"
    ws.oddFooter.center.size = 8
    ws.oddFooter.left.text = "Screening estimate, not a certification"
    ws.oddFooter.left.size = 8
    if title_rows:
        ws.print_title_rows = title_rows
    if title_columns:
        ws.print_title_cols = title_columns
    if align:
        align_cells(ws)
    last_row, last_column = ws.max_row, ws.max_column
    for chart in getattr(ws, "_charts", []):  # a chart below the cells prints too
        anchor = chart.anchor if isinstance(chart.anchor, str) else f"A{chart.anchor._from.row + 1}"
        row = int("".join(ch for ch in anchor if ch.isdigit()))
        last_row = max(last_row, row + math.ceil(chart.height / 0.5) + 1)  # cm of chart over cm per default row
    ws.print_area = f"A1:{get_column_letter(last_column)}{last_row}"


def align_cells(ws) -> None:
    from openpyxl.styles import Alignment

    for row in ws.iter_rows():
        previous = None
        for cell in row:
            current = cell.alignment
            after_number = (
                isinstance(cell.value, str)
                and not cell.value.startswith("=")
                and (
                    isinstance(previous, (int, float))
                    and not isinstance(previous, bool)
                    or (isinstance(previous, str) and previous.startswith("="))
                )
            )
            cell.alignment = Alignment(
                horizontal=current.horizontal,
                vertical="top",
                wrap_text=current.wrap_text,
                indent=max(current.indent or 0, 1 if after_number else 0),
            )
            previous = cell.value
