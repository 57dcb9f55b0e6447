"""Commented starter project files for ``carbonledger init``, one per hydrogen route (and variant)."""

from __future__ import annotations

import json
import re

from . import HYDROGEN_ROUTES
from .ammonia import starter as ammonia_starter

PLACEHOLDER = "# placeholder"
_NUMBER_LINE = re.compile(r"^(?P<assign>\s*[A-Za-z_][\w.]*\s*=\s*-?[\d.]+(?:[eE][-+]?\d+)?)(?P<rest>\s*(?:#.*)?)$")

_HEADER = """\
# carbonledger project file. Every number below is a placeholder to replace with the
# project's own data, marked "# placeholder": replace it, then delete the mark (`score` warns
# while any mark remains). Units are in the parameter names. `carbonledger params FILE` lists them.
[project]
name = {name}
product = "{product}"            # ammonia | hydrogen
site = ""
note = "Where the numbers come from (design documents, meters, invoices)"
# Dates and place that scheme rules depend on (leave out what is not known; the verdict says
# which rules it could not judge):
# zone = ""                      # bidding zone or region of the plant
# country = ""                   # ISO 3166-1 alpha-2 code where the plant produces (US, GB, PR, ...; 45V asks)
# construction_start = 2026-06-01
# commissioning = 2027-06-01     # first day of operation, or placed in service; the default assessment
#                                # year (--year) is the first full calendar year after it

[hydrogen]
route = "{route}"
conditioning_kwh_per_kg_h2 = 0.0   # compression and purification to the delivery specification
"""


def starter_choices() -> dict[str, tuple[str, object]]:
    """``init --route`` choice -> (route name, starter text function), from the registry.

    Returns
    -------
    dict of str to tuple
        Choice -> (route name, function of the product returning TOML text).
    """
    choices: dict[str, tuple[str, object]] = {}
    for route in HYDROGEN_ROUTES.values():
        choices[route.name] = (route.name, route.starter)
        for variant, text in route.starter_variants.items():
            choices[variant] = (route.name, text)
    return choices


def normalise_choice(text: str) -> str:
    """Route names are accepted with hyphens or underscores, in any case.

    Parameters
    ----------
    text : str
        The choice as typed.

    Returns
    -------
    str
        Lower case, hyphens as underscores, no surrounding spaces.
    """
    return text.strip().lower().replace("-", "_")


def starter_project(choice: str, product: str, name: str = "New project") -> str:
    """The text of a starter project file for ``carbonledger init``, its numbers marked as placeholders.

    Parameters
    ----------
    choice : str
        A route or variant from ``starter_choices`` (hyphens or underscores, any case).
    product : str
        The project's product, ``hydrogen`` or ``ammonia``.
    name : str
        The project's name.

    Returns
    -------
    str
        TOML text of the whole project file.
    """
    route, text = starter_choices()[normalise_choice(choice)]
    quoted = json.dumps(name, ensure_ascii=False)  # a JSON string is a valid TOML basic string
    body = text(product)
    if product == "ammonia" and "[ammonia]" not in body:  # routes that do not write their own ammonia block
        body += ammonia_starter(product)
    return mark_placeholders(_HEADER.format(name=quoted, product=product, route=route) + body)


def mark_placeholders(text: str) -> str:
    """Every number the starter sets is marked "# placeholder" (before any comment of its own).

    Parameters
    ----------
    text : str
        TOML text.

    Returns
    -------
    str
        The same text, number lines marked.
    """
    lines = []
    for line in text.splitlines():
        match = _NUMBER_LINE.match(line)
        if match:
            rest = match.group("rest").strip()
            line = f"{match.group('assign')}   {PLACEHOLDER}" + (f"; {rest.lstrip('#').strip()}" if rest else "")
        lines.append(line)
    return "\n".join(lines) + "\n"


def placeholders_left(text: str) -> list[int]:
    """The line numbers (from 1) of a project file whose number still carries init's placeholder mark.

    Parameters
    ----------
    text : str
        A project file's text.

    Returns
    -------
    list of int
        Line numbers, from 1.
    """
    return [
        number
        for number, line in enumerate(text.splitlines(), 1)
        if _NUMBER_LINE.match(line) and PLACEHOLDER in line.split("=", 1)[1]
    ]
