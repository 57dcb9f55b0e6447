"""The four statuses of a scheme check, written once.

A scheme decides eligibility, then the electricity and boundary rules, then the threshold; the status
says where it landed (``core.verdicts``). ``Status`` is a ``StrEnum``: its members equal the words
stored in results, JSON and the ledger ("qualifies", "fails", "not_eligible", "undetermined").
"""

from __future__ import annotations

from enum import StrEnum


class Status(StrEnum):
    QUALIFIES = "qualifies"  # every rule met and the value meets the limit
    FAILS = "fails"  # covered, but the value misses the limit
    NOT_ELIGIBLE = "not_eligible"  # not of the kind the scheme covers, whatever the value
    UNDETERMINED = "undetermined"  # the value meets the limit but a rule turns on facts the project does not give

    @property
    def words(self) -> str:
        """The status as a reader reads it ("not eligible")."""
        return self.value.replace("_", " ")
