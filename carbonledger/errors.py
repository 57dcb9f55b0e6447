"""One error type for every bad input: it names the file, the field and what was expected."""

from __future__ import annotations


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
