"""Identifiers in words, for every output a person reads (tables, report, charts, workbook labels).

One vocabulary: units ("t NH3", "kg H2", "MJ"), statuses (qualifies, fails, not eligible,
undetermined; how a check moved between two runs, "now fails", "now qualifies", "still ...", is
analyses.portfolio.STATUSES), GWP sets
("AR6"), electricity rules and quantities, all written here once."""

from __future__ import annotations

from ..model.flows import FLOW_NAMES
from ..model.grades import GRADE_WORDS, Grade
from ..model.statuses import Status

WORDS = {
    "co2": "CO2",
    "co2e": "CO2e",
    "h2": "H2",
    "nh3": "NH3",
    "n2": "N2",
    "ch4": "CH4",
    "n2o": "N2O",
    "lhv": "LHV",
    "gj": "GJ",
    "kwh": "kWh",
    "mwh": "MWh",
    "mw": "MW",
    "mj": "MJ",
    "pem": "PEM",
    "atr": "ATR",
    "smr": "SMR",
    "ar4": "AR4",
    "ar5": "AR5",
    "ar6": "AR6",
}
# The unit of each intensity (and scheme quantity), and what it is per.
INTENSITY_UNITS = {
    "kg_co2e_per_t_nh3": "kg CO2e/t NH3",
    "kg_co2e_per_kg_nh3": "kg CO2e/kg NH3",
    "kg_co2e_per_kg_h2": "kg CO2e/kg H2",
    "g_co2e_per_mj": "g CO2e/MJ (LHV)",
}
PER = {"t_nh3": "t NH3", "kg_nh3": "kg NH3", "kg_h2": "kg H2", "mj": "MJ (LHV)", "t-nh3": "t NH3", "kg-h2": "kg H2"}
INTENSITY_LABELS = {key: f"Carbon intensity per {PER[key.split('_per_')[1]]}" for key in INTENSITY_UNITS}
STATUS_WORDS = {status.value: status.words for status in Status}
ELECTRICITY_RULES = {
    "renewable_at_zero": "renewable electricity counted at zero, the rest at its factor",
    "lifecycle": "every source at its life-cycle factor",
}


def words(identifier: str) -> str:
    """A snake_case identifier in words: ``co2_capture_and_storage`` -> ``CO2 capture and storage``."""
    parts = [WORDS.get(part, part) for part in identifier.replace(":", " ").replace("-", " ").split("_")]
    text = " ".join(parts)
    return text[:1].upper() + text[1:]


def lower_words(identifier: str) -> str:
    """As ``words`` without the capital: for a word inside a sentence or a table cell."""
    text = words(identifier)
    return text if text[:2].isupper() else text[:1].lower() + text[1:]


def stage_name(stage: str) -> str:
    return words(stage)


def gas_name(gas: str) -> str:
    return FLOW_NAMES.get(gas, words(gas))


def factor_grades_sentence(grades: dict[str, list[str]], total: int) -> str:
    """``grades`` (grade -> ids, as ``model.grades.grades_of`` gives them) in one sentence, the
    ids named for the rows not yet verified: what every readable output prints under its factors."""
    counts = ", ".join(f"{len(ids)} {GRADE_WORDS[Grade(grade)]}" for grade, ids in grades.items() if ids)
    unverified = grades.get(Grade.NOT_YET_VERIFIED.value, [])
    named = f" Not yet verified against the source document: {', '.join(unverified)}." if unverified else ""
    return f"Source grades of the {total} factors used: {counts or 'none'}.{named}"


def unit_name(quantity: str) -> str:
    """The unit of an intensity or scheme quantity: ``g_co2e_per_mj`` -> ``g CO2e/MJ (LHV)``."""
    return INTENSITY_UNITS.get(quantity, words(quantity))


def per_name(key: str) -> str:
    """What an intensity is per: ``kg_co2e_per_t_nh3`` or ``t_nh3`` -> ``t NH3``."""
    tail = key.split("_per_")[-1]
    return PER.get(tail, words(tail))


def status_name(status: object) -> str:
    """A verdict's status in words: qualifies, fails, not eligible, undetermined."""
    value = str(getattr(status, "value", status))
    return STATUS_WORDS.get(value, value.replace("_", " "))


def status_of(check) -> str:
    """The verdict's status in words: ``check.status`` when the verdict rules provide it, else pass/fail."""
    status = getattr(check, "status", None)
    if status is None:
        return "qualifies" if check.passes else "fails"
    return status_name(status)


def gwp_name(gwp: str) -> str:
    return gwp.upper()


def electricity_rule_name(rule: str) -> str:
    return ELECTRICITY_RULES.get(rule, lower_words(rule))
