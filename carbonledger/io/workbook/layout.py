"""The audit workbook's layout, shared by the writer and the reader: sheet names, header rows,
columns, cover labels, and the cell helpers that keep text as text.

Change the layout here and both sides follow; the reader finds the Inputs and Factors headers
on ``INPUT_HEADER_ROW`` / ``FACTOR_HEADER_ROW`` and the cover settings by their labels.
"""

from __future__ import annotations

import re
from typing import Any

from ...errors import InputError
from ...model.factors import CITED_FIELDS
from ...model.project import split_path
from ...model.statuses import Status
from .cells import Term, resolve

INPUTS, FACTORS, CALCULATION, RESULTS, COVER, PERIODS = (
    "Inputs",
    "Factors",
    "Calculation",
    "Results",
    "Cover",
    "Periods",
)
MATCHING, INTERVALS = "Matching", "Intervals"  # with an electricity time series
INPUT_HEADER_ROW = 4
FACTOR_HEADER_ROW = 4
INPUT_COLUMNS = ("parameter", "value", "unit", "description", "evidence (meter, invoice, design document)")
FACTOR_TITLES = {"table": "table or article", "grade": "source grade"}  # column titles of the Factors sheet, by field
LEGACY_GRADE_TITLE = "from memory"  # the grade column's title (yes/no) in workbooks written before grades
FACTOR_COLUMNS = tuple(FACTOR_TITLES.get(name, name) for name in CITED_FIELDS)  # the fields of model.factors.Factor
FORMAT_MARK = "carbonledger audit workbook, layout 1"
COVER_LABELS = {
    "gwp": "GWP100 set of the headline result",
    "schemes": "Schemes checked",
    "factors_option": "Factor set as requested (--factors)",
    "factor_set": "Factor set",
}


EXCEL_CELL_CHARACTERS = 32767  # Excel specifications and limits: total characters a cell can contain
# control characters an .xlsx cell cannot hold (XML 1.0 section 2.2; openpyxl ILLEGAL_CHARACTERS_RE),
# written as their Unicode control pictures (U+2400 + code) and turned back on reading
_CONTROL = re.compile(r"[\x00-\x08\x0b\x0c\x0e-\x1f]")
_CONTROL_PICTURE = re.compile(r"[\u2400-\u2408\u240b\u240c\u240e-\u241f]")


def cell_text(text: Any, where: str = "") -> str:
    """Text as a cell holds it: control characters as control pictures; longer than a cell can
    hold is refused (one line naming ``where``), never cut."""
    text = _CONTROL.sub(lambda match: chr(0x2400 + ord(match.group())), str(text))
    if len(text) > EXCEL_CELL_CHARACTERS:
        raise InputError(
            "workbook",
            where or "text",
            f"text of at most {EXCEL_CELL_CHARACTERS:,} characters (the most "
            f"a spreadsheet cell holds), got {len(text):,}; shorten it",
        )
    return text


def text_from_cell(value: Any) -> Any:
    """A cell's text with control pictures turned back into the control characters written."""
    if not isinstance(value, str):
        return value
    return _CONTROL_PICTURE.sub(lambda match: chr(ord(match.group()) - 0x2400), value)


# cell helpers -------------------------------------------------------------------------------
def put_text(ws, row: int, column: int, text: Any, where: str = ""):
    """Write text that stays text: a leading = + - or @ is never read as a formula.

    ``where`` names the field in the error for text too long for a cell (default: sheet and cell).
    """
    cell = ws.cell(row=row, column=column)
    if text is None or text == "":
        return cell  # left empty rather than an empty string
    cell.value = cell_text(text, where or f"sheet {ws.title}, cell {cell.coordinate}")
    cell.data_type = "s"
    return cell


def put_value(ws, row: int, column: int, value: Any, where: str = ""):
    """Write a number, a truth value or text (text always as text)."""
    if isinstance(value, str) or value is None:
        return put_text(ws, row, column, value, where)
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
    parts = split_path(path)
    node = tree
    for part in parts[:-1]:
        node = node[part]
    node[parts[-1]] = value


def verdict_formula(value: str, operator: str, limit: str, status: str) -> str:
    """The live verdict: the threshold on the live value, within the rules read at writing
    (``status``: not eligible stays so whatever the value; undetermined stays undetermined), in
    the words of every output: qualifies, fails, not eligible, undetermined."""
    ok, no, off, open_ = (
        f'"{s.words}"' for s in (Status.QUALIFIES, Status.FAILS, Status.NOT_ELIGIBLE, Status.UNDETERMINED)
    )
    return f"IF({status}={off},{off},IF({value}{operator}{limit},IF({status}={open_},{open_},{ok}),{no}))"
