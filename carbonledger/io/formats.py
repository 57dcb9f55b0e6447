"""The output formats every command offers, written once.

Table, JSON and CSV are written per kind of result (``io/tables.py``, ``io/*_output.py``): a table for a
person, JSON with stable keys for a program, CSV for a spreadsheet (formula-escaped, ending with the
caution). Any further format is one function of the JSON document, registered here with
``register_format``: every command offers it under ``--format`` at once, because every command already
writes the JSON (with its caution, source grades and from-memory flags), so nothing else changes.
"""

from __future__ import annotations

import json
from collections.abc import Callable
from typing import Any

BUILT_IN = ("table", "json", "csv")
FROM_JSON: dict[str, Callable[[Any], str]] = {}  # format name -> text of the parsed JSON document


def register_format(name: str, renderer: Callable[[Any], str]) -> None:
    """Offer ``name`` under ``--format`` on every command: ``renderer`` turns the command's JSON document
    (parsed) into the text written. Register before the command line is built (at import)."""
    if name in BUILT_IN:
        raise ValueError(f"'{name}' is a built-in format")
    FROM_JSON[name] = renderer


def formats() -> tuple[str, ...]:
    """Every output format: the built-in ones, then the registered ones."""
    return BUILT_IN + tuple(FROM_JSON)


def output_text(
    output_format: str, *, table: Callable[[], str], json_text: Callable[[], str], csv: Callable[[], str]
) -> str:
    """The output of a command in ``output_format``, ending with a new line: a built-in format from its own
    writer, a registered one from the JSON document."""
    output_format = str(output_format)
    if output_format in FROM_JSON:
        text = FROM_JSON[output_format](json.loads(json_text()))
    else:
        text = {"table": table, "json": json_text, "csv": csv}[output_format]()
    return text if text.endswith("\n") else text + "\n"
