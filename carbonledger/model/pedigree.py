"""Pedigree-matrix default uncertainty of a value with no stated range (ecoinvent version 3).

Five data-quality scores, each 1 (best) to 5 (worst) -- reliability, completeness, temporal
correlation, geographical correlation, further technological correlation -- each add a variance
to ln(value); with the basic uncertainty of the value (its own geometric standard deviation,
1 when none is given) they make a lognormal distribution whose median is the value:

    sigma^2 = ln(basic_gsd)^2 + sum_i variance_i(score_i),    gsd = exp(sigma)

The variances are data (``factors/uncertainty/pedigree.toml``, with their source and from-memory
flag), not code.

References
----------
.. [1] Weidema, B. P., Bauer, C., Hischier, R., Mutel, C., Nemecek, T., Reinhard, J., Vadenbo,
   C. O. and Wernet, G. (2013). Overview and methodology. Data quality guideline for the ecoinvent
   database version 3. Ecoinvent Report 1 (v3). St. Gallen: The ecoinvent Centre.
.. [2] Ciroth, A., Muller, S., Weidema, B. and Lesage, P. (2016). Empirically based uncertainty
   factors for the pedigree matrix in ecoinvent. Int. J. Life Cycle Assess. 21(9), 1338-1348.
.. [3] Weidema, B. P. and Wesnaes, M. S. (1996). Data quality management for life cycle inventories
   - an example of using data quality indicators. J. Cleaner Prod. 4(3-4), 167-174.

A run that states no distribution at all gives each factor row it reads the scores of its source
grade (``factors/uncertainty/grade_defaults.toml``, ``grade_defaults``): that mapping is this
project's assumption (common practice), not a published table, and every output names it.
"""

from __future__ import annotations

import functools
import math
import re
import tomllib
from dataclasses import dataclass
from pathlib import Path

from ..errors import InputError
from .grades import Grade

INDICATORS = (
    "reliability",
    "completeness",
    "temporal_correlation",
    "geographical_correlation",
    "further_technological_correlation",
)
EXPECTED_SCORES = (
    "five pedigree scores, each a whole number 1 to 5 (reliability, completeness, "
    "temporal, geographical, further technological correlation)"
)


@dataclass(frozen=True)
class PedigreeTable:
    """The variance each score adds, per indicator (scores 1..5), with the table's source."""

    variances: dict[str, tuple[float, ...]]
    source: str
    table: str
    year: int
    from_memory: bool

    def citation(self) -> str:
        text = f"{self.source}, {self.table}, {self.year}"
        return text + (" [from memory, not checked against the document]" if self.from_memory else "")


def pedigree_table(library: str | Path) -> PedigreeTable:
    """The variances of ``uncertainty/pedigree.toml`` in a factor library folder (``factors_root()``)."""
    return _read_table(str(Path(library) / "uncertainty" / "pedigree.toml"))


@functools.cache
def _read_table(name: str) -> PedigreeTable:
    path = Path(name)
    try:
        data = tomllib.loads(path.read_text(encoding="utf-8"))
    except OSError as error:
        raise InputError(path, "", f"the pedigree variance table of the factor library ({error.strerror})") from None
    except tomllib.TOMLDecodeError as error:
        raise InputError(path, "", f"valid TOML ({error})") from None
    variances = data.get("variances", {})
    for name in INDICATORS:
        row = variances.get(name)
        if not isinstance(row, list) or len(row) != 5 or not all(isinstance(v, (int, float)) and v >= 0 for v in row):
            raise InputError(path, f"variances.{name}", "five variances >= 0 (scores 1 to 5)")
    return PedigreeTable(
        variances={name: tuple(float(v) for v in variances[name]) for name in INDICATORS},
        source=str(data.get("source", "")),
        table=str(data.get("table", "")),
        year=int(data.get("year", 0)),
        from_memory=bool(data.get("from_memory", True)),
    )


def parse_scores(value, where: str, field: str = "pedigree") -> tuple[int, ...]:
    """Five scores from a list of whole numbers or a text such as ``(2,3,1,2,4)`` or ``2;3;1;2;4``."""
    if isinstance(value, str):
        parts = [part for part in re.split(r"[\s,;]+", value.strip().strip("()[]").strip()) if part]
    elif isinstance(value, (list, tuple)):
        parts = list(value)
    else:
        raise InputError(where, field, f"{EXPECTED_SCORES}, got {value!r}")
    scores = []
    for part in parts:
        if isinstance(part, bool):
            number = None
        elif isinstance(part, int):
            number = part
        elif isinstance(part, float) and part.is_integer():
            number = int(part)
        elif isinstance(part, str) and part.isdigit():
            number = int(part)
        else:
            number = None
        if number is None or not 1 <= number <= 5:
            raise InputError(where, field, f"{EXPECTED_SCORES}, got {part!r}")
        scores.append(number)
    if len(scores) != len(INDICATORS):
        raise InputError(where, field, f"{EXPECTED_SCORES}, got {len(scores)} scores")
    return tuple(scores)


def pedigree_variance(scores: tuple[int, ...], table: PedigreeTable) -> float:
    """Sum of the variances (of ln value) the five scores add."""
    return sum(table.variances[name][score - 1] for name, score in zip(INDICATORS, scores, strict=True))


def pedigree_gsd(scores: tuple[int, ...], table: PedigreeTable, basic_gsd: float = 1.0) -> float:
    """Geometric standard deviation of a value with these pedigree scores and basic uncertainty.

    Parameters
    ----------
    scores : five scores 1..5 (reliability, completeness, temporal, geographical, further technological).
    table : the variances per score (``pedigree_table(factors_root())``).
    basic_gsd : geometric standard deviation of the value itself (>= 1; 1: no basic uncertainty).

    Returns
    -------
    exp(sqrt(ln(basic_gsd)^2 + sum of the pedigree variances)), dimensionless, >= 1.
    """
    return math.exp(math.sqrt(math.log(basic_gsd) ** 2 + pedigree_variance(scores, table)))


@dataclass(frozen=True)
class GradeDefaults:
    """Default pedigree scores and basic uncertainty per source grade (this project's assumption)."""

    scores: dict[str, tuple[int, ...]]  # grade -> five scores
    basic_gsd: dict[str, float]  # grade -> basic uncertainty (GSD >= 1)
    # factor ids, or their start before a dot, never drawn (characterisation factors, physical properties)
    held_fixed: tuple[str, ...]
    basis: str  # what the mapping is and rests on (named in every output)
    from_memory: bool

    def applies_to(self, factor_id: str) -> bool:
        return not any(factor_id == held or factor_id.startswith(held + ".") for held in self.held_fixed)


def grade_defaults(library: str | Path) -> GradeDefaults:
    """The grade -> pedigree mapping of ``uncertainty/grade_defaults.toml`` in a factor library folder."""
    return _read_grade_defaults(str(Path(library) / "uncertainty" / "grade_defaults.toml"))


def _grade_entry(path: Path, grades: dict, grade: Grade) -> tuple[tuple[int, ...], float]:
    entry = grades.get(grade.value)
    if not isinstance(entry, dict):
        raise InputError(path, f"grades.{grade.value}", "a table with the five pedigree scores of the grade")
    scores = parse_scores(entry.get("scores"), str(path), f"grades.{grade.value}.scores")
    basic = entry.get("basic_gsd", 1.0)
    if isinstance(basic, bool) or not isinstance(basic, (int, float)) or not (math.isfinite(basic) and basic >= 1):
        raise InputError(path, f"grades.{grade.value}.basic_gsd", f"a geometric standard deviation >= 1, got {basic!r}")
    return scores, float(basic)


@functools.cache
def _read_grade_defaults(name: str) -> GradeDefaults:
    path = Path(name)
    try:
        data = tomllib.loads(path.read_text(encoding="utf-8"))
    except OSError as error:
        raise InputError(path, "", f"the grade defaults of the factor library ({error.strerror})") from None
    except tomllib.TOMLDecodeError as error:
        raise InputError(path, "", f"valid TOML ({error})") from None
    entries = {grade.value: _grade_entry(path, data.get("grades", {}), grade) for grade in Grade}
    held = data.get("held_fixed", [])
    if not isinstance(held, list) or not all(isinstance(item, str) for item in held):
        raise InputError(path, "held_fixed", 'a list of factor ids or their starts, e.g. ["gwp"]')
    return GradeDefaults(
        scores={grade: entry[0] for grade, entry in entries.items()},
        basic_gsd={grade: entry[1] for grade, entry in entries.items()},
        held_fixed=tuple(held),
        basis=str(data.get("basis", "")),
        from_memory=bool(data.get("from_memory", True)),
    )


__all__ = [
    "INDICATORS",
    "PedigreeTable",
    "pedigree_table",
    "parse_scores",
    "pedigree_variance",
    "pedigree_gsd",
    "GradeDefaults",
    "grade_defaults",
]
