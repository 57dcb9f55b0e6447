"""Unit conversion of factor values, with pint doing the arithmetic.

Factor units in the library read like ``kg CO2/TJ`` or ``g CO2e/kWh``: a unit expression with
one substance tag (CO2, CO2e, CH4, N2O, NH3, H2, N2) on the numerator. Conversion keeps the
substance and converts the rest with pint; pint is imported only when two units differ.
"""

from __future__ import annotations

import functools
import re

SUBSTANCES = ("CO2e", "CO2", "CH4", "N2O", "NH3", "H2O", "H2", "N2", "fuel", "LNG", "gas")
_TAG = re.compile(r"(?<![A-Za-z0-9_])(" + "|".join(SUBSTANCES) + r")(?![A-Za-z0-9_])")


class UnitMismatch(ValueError):
    pass


def split_substance(unit: str) -> tuple[str, tuple[str, ...]]:
    """Return the unit expression without substance tags, and the tags in order."""
    tags = tuple(_TAG.findall(unit))
    bare = _TAG.sub("", unit)
    bare = re.sub(r"\s+", " ", bare).replace(" /", "/").replace("/ ", "/").strip()
    return bare, tags


_GLUED = re.compile(r"(?<![A-Za-z])(mg|g|kg|t|Mg|Gg|lb)(" + "|".join(SUBSTANCES) + r")(?![A-Za-z0-9_])", re.I)


def spelling_hint(unit: str) -> str:
    """How to write a unit typed with the substance glued to its mass unit: ``gCO2/kWh`` ->
    "; write it 'g CO2/kWh' (a space between the unit and the substance)", else ''."""
    by_lower = {s.lower(): s for s in SUBSTANCES}
    fixed = _GLUED.sub(lambda m: f"{m.group(1)} {by_lower.get(m.group(2).lower(), m.group(2))}", unit)
    return f"; write it '{fixed}' (a space between the unit and the substance)" if fixed != unit else ""


@functools.cache
def _registry():
    import pint

    registry = pint.UnitRegistry()
    registry.define("tonne_nautical_mile = tonne * nautical_mile")
    return registry


@functools.cache
def conversion_factor(from_unit: str, to_unit: str) -> float:
    """Multiplier that turns a value in ``from_unit`` into ``to_unit``.

    Raises UnitMismatch when substances differ or dimensions do not agree.
    """
    if from_unit == to_unit:
        return 1.0
    bare_from, tags_from = split_substance(from_unit)
    bare_to, tags_to = split_substance(to_unit)
    if tags_from != tags_to:
        raise UnitMismatch(f"'{from_unit}' is not convertible to '{to_unit}' (different substance)")
    registry = _registry()
    try:
        quantity = registry.Quantity(1.0, bare_from or "dimensionless")
        return float(quantity.to(bare_to or "dimensionless").magnitude)
    except Exception as error:  # pint raises several types; all mean "not convertible"
        raise UnitMismatch(f"'{from_unit}' is not convertible to '{to_unit}' ({error})") from None
