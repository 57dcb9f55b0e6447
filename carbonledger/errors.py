"""One error type for every bad input: it names the file, the field and what was expected."""

from __future__ import annotations

import difflib


class InputError(Exception):
    """Bad input found at the edge (project file, factor set, option, CSV).

    The message is one line: ``FILE: FIELD: what was expected``. The command line prints it
    and exits with code 2; nothing is written.
    """

    def __init__(self, source: str, field: str, expected: str):
        self.source = str(source)
        self.field = field
        self.expected = expected
        super().__init__(f"{self.source}: {field}: {expected}" if field else f"{self.source}: {expected}")


def did_you_mean(word: str, choices) -> str:
    """'; did you mean 'x'?' for the closest known name (case ignored), or '' when none is close."""
    by_lower = {str(choice).lower(): str(choice) for choice in choices}
    close = difflib.get_close_matches(str(word).lower(), list(by_lower), n=1, cutoff=0.6)
    return f"; did you mean '{by_lower[close[0]]}'?" if close else ""


def match_id(word: str, choices) -> str | None:
    """The known id equal to ``word`` ignoring case (ids are case-insensitive), else None."""
    if word in choices:
        return word
    return next((choice for choice in choices if str(choice).lower() == str(word).lower()), None)
