"""How sure a published value is: the grade of the text it was read in.

The same words grade factor rows (``model.factors.Factor.grade``) and the sources of
``factors/CHECKS.md`` and ``../shared/SOURCES.md``:

- **primary text**: read in the document itself or its official data file (a legal text or an
  exact copy of it, a publisher's data file);
- **verbatim secondary**: read in a faithful copy that reproduces the document or its data file
  word for word or cell for cell (a third party's copy of an agency's CSV, a note quoting the act);
- **secondary**: read only in a summary, a news report, a derived data set or another reproduction
  that is not a faithful copy;
- **not yet verified**: not read in any text (recorded from memory); users read "not yet verified
  against the source document";
- **invented**: made up for a demo or a test case, never a published value.

A factor CSV written before grades existed has a ``from_memory`` column: ``true`` reads as
"not yet verified", ``false`` as "primary text" (the rule then was: false only when read in the
document itself). ``Factor.from_memory`` is kept as a derived flag: true exactly when the grade is
"not yet verified".
"""

from __future__ import annotations

from enum import StrEnum

from ..errors import InputError, did_you_mean, match_id


class Grade(StrEnum):
    PRIMARY_TEXT = "primary text"
    VERBATIM_SECONDARY = "verbatim secondary"
    SECONDARY = "secondary"
    NOT_YET_VERIFIED = "not yet verified"
    INVENTED = "invented"

    @property
    def words(self) -> str:
        """The grade as users read it in tables, the report and the workbook."""
        return GRADE_WORDS[self]


GRADE_WORDS = {
    Grade.PRIMARY_TEXT: "primary text",
    Grade.VERBATIM_SECONDARY: "verbatim secondary",
    Grade.SECONDARY: "secondary",
    Grade.NOT_YET_VERIFIED: "not yet verified against the source document",
    Grade.INVENTED: "invented (demo or test value, not published)",
}

GRADE_MEANING = {
    Grade.PRIMARY_TEXT: "read in the document itself or its official data file",
    Grade.VERBATIM_SECONDARY: "read in a faithful copy of the document or its data file",
    Grade.SECONDARY: "read only in a summary, report or derived data set",
    Grade.NOT_YET_VERIFIED: "not yet verified against the source document",
    Grade.INVENTED: "invented for a demo or test, not a published value",
}
GRADE_BY_WORDS = {words: grade for grade, words in GRADE_WORDS.items()}
_TRUE = {"true", "yes", "1", "y"}
_FALSE = {"false", "no", "0", "n"}


def parse_grade(grade_text: str | None, from_memory_text: str | None, where: str) -> Grade:
    """The grade of a row from its ``grade`` cell and, in files written before grades existed, its
    ``from_memory`` cell (true: not yet verified; false: primary text). Neither given: not yet verified.
    Both given and disagreeing, or an unknown word: one InputError naming ``where``."""
    text = (grade_text or "").strip()
    legacy = (from_memory_text or "").strip().lower()
    if legacy and legacy not in _TRUE | _FALSE:
        raise InputError(where, "from_memory", f"true or false, got '{from_memory_text}'")
    if not text:
        if not legacy:
            return Grade.NOT_YET_VERIFIED
        return Grade.NOT_YET_VERIFIED if legacy in _TRUE else Grade.PRIMARY_TEXT
    words = {grade.value: grade for grade in Grade} | {GRADE_WORDS[grade]: grade for grade in Grade}
    found = match_id(" ".join(text.replace("_", " ").split()), words)
    if found is None:
        raise InputError(
            where,
            "grade",
            f"one of {', '.join(repr(g.value) for g in Grade)}, got "
            f"'{text}'{did_you_mean(text, [g.value for g in Grade])}",
        )
    grade = words[found]
    if legacy and (legacy in _TRUE) != (grade is Grade.NOT_YET_VERIFIED):
        raise InputError(
            where,
            "from_memory",
            f"a from_memory that agrees with grade '{grade}' (true only for 'not "
            f"yet verified'), or an empty from_memory; got '{from_memory_text}'",
        )
    return grade


def grades_of(rows) -> dict[str, list[str]]:
    """The ids of ``rows`` (factor rows, anything with ``id`` and ``grade``) by grade, every grade
    named in the order of ``Grade``, ids in the order given."""
    found: dict[str, list[str]] = {grade.value: [] for grade in Grade}
    for row in rows:
        found[Grade(row.grade).value].append(row.id)
    return found


def grade_kind(factor_id: str) -> str:
    """The kind a factor id belongs to, for counts by kind: ``electricity.grid``, ``gwp``, ``marine_fuel``...
    (electricity by its second segment, every other namespace by its first)."""
    parts = factor_id.split(".")
    return ".".join(parts[:2]) if parts[0] == "electricity" and len(parts) > 2 else parts[0]
