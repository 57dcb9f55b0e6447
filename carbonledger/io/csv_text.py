"""The one CSV writer of every command: safe to open in a spreadsheet, and honest to the end.

Text cells that a spreadsheet would read as a formula are escaped as the OWASP guidance on CSV
injection says: a cell starting with ``=``, ``+``, ``-``, ``@``, a tab or a carriage return gets
a leading single quote [1]_. Numbers are written as numbers (a negative number stays a number);
only text is escaped. A cell holding a carriage return or a line feed is quoted (RFC 4180 [2]_).
Every CSV ends with a ``caution`` row: the screening caution travels with the figures.

References
----------
.. [1] OWASP Foundation, "CSV Injection", https://owasp.org/www-community/attacks/CSV_Injection
.. [2] Shafranovich, Y. (2005). RFC 4180: Common Format and MIME Type for Comma-Separated Values.
"""

from __future__ import annotations

import csv
import io
from collections.abc import Iterable

FORMULA_START = ("=", "+", "-", "@", "\t", "\r")


def spreadsheet_safe(value: object) -> object:
    """A text cell with a leading single quote when it starts like a formula; other cells as they are."""
    if isinstance(value, str) and value.startswith(FORMULA_START):
        return "'" + value
    return value


def csv_text(header: Iterable, rows: Iterable[Iterable], *, caution: str | None = None) -> str:
    """CSV text: the header, the rows, and (given ``caution``) a last row ``caution,<text>``.

    Lines end in ``\\n``; a cell holding ``\\r`` or ``\\n`` is quoted (the csv module quotes what
    contains its line terminator, so each row is written with ``\\r\\n`` and that ending swapped).
    """
    header = list(header)
    lines = []
    all_rows = [header, *(list(row) for row in rows)]
    if caution is not None:
        all_rows.append(["caution", caution] + [""] * max(0, len(header) - 2))
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\r\n")
    for row in all_rows:
        writer.writerow([spreadsheet_safe(value) for value in row])
        lines.append(buffer.getvalue()[:-2] + "\n")
        buffer.seek(0)
        buffer.truncate()
    return "".join(lines)
