"""Identifiers in words, for every output a person reads (report, charts, workbook labels)."""

from __future__ import annotations

from ..model.grades import GRADE_WORDS, Grade

GAS_NAMES = {
    "co2_fossil": "CO2, fossil",
    "ch4_fossil": "Methane (CH4), fossil",
    "ch4_non_fossil": "Methane (CH4), non-fossil",
    "n2o": "Nitrous oxide (N2O)",
    "co2e_precharacterised": "Life-cycle CO2e of electricity (already characterised)",
}
WORDS = {"co2": "CO2", "h2": "H2", "nh3": "NH3", "n2": "N2", "ch4": "CH4", "n2o": "N2O", "lhv": "LHV", "gj": "GJ", "kwh": "kWh", "mw": "MW", "pem": "PEM", "atr": "ATR", "smr": "SMR"}
INTENSITY_LABELS = {
    "kg_co2e_per_t_nh3": "Carbon intensity per t NH3",
    "kg_co2e_per_kg_nh3": "Carbon intensity per kg NH3",
    "kg_co2e_per_kg_h2": "Carbon intensity per kg H2",
    "g_co2e_per_mj": "Carbon intensity per MJ (LHV)",
}


def words(identifier: str) -> str:
    """A snake_case identifier in words: ``co2_capture_and_storage`` -> ``CO2 capture and storage``."""
    parts = [WORDS.get(part, part) for part in identifier.replace(":", " ").replace("-", " ").split("_")]
    text = " ".join(parts)
    return text[:1].upper() + text[1:]


def stage_name(stage: str) -> str:
    return words(stage)


def gas_name(gas: str) -> str:
    return GAS_NAMES.get(gas, words(gas))


def factor_grades_sentence(grades: dict[str, list[str]], total: int) -> str:
    """``grades`` (grade -> ids, as ``model.grades.grades_of`` gives them) in one sentence, the
    ids named for the rows not yet verified: what every readable output prints under its factors."""
    counts = ", ".join(f"{len(ids)} {GRADE_WORDS[Grade(grade)]}" for grade, ids in grades.items() if ids)
    unverified = grades.get(Grade.NOT_YET_VERIFIED.value, [])
    named = f" Not yet verified against the source document: {', '.join(unverified)}." if unverified else ""
    return f"Source grades of the {total} factors used: {counts or 'none'}.{named}"
