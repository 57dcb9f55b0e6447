"""Symbolic values that print as spreadsheet formulas, so the stage code writes the workbook.

The stage functions and ``inventory.build_inventory`` use arithmetic only. Run on ``Term``
values instead of floats, they return the formula of every exchange amount: a ``Term`` holds
formula text (``Inputs!$B$7*Factors!$B$12/1000``) and the precedence of its outermost
operator, and each operator adds only the parentheses the spreadsheet needs.

``SymbolicInputs`` has the interface of ``inventory.NumericInputs`` but returns references to
the factor sheet. References are written as placeholders (``{F:factor.id}``) and resolved to
cell addresses by the workbook writer once it knows which factors were used and where their
rows are (``resolve``).

References
----------
.. [1] ECMA-376 Office Open XML, Part 1, section 18.17 (formulas): operator precedence,
   negation binds tighter than multiplication and division, which bind tighter than + and -.
"""

from __future__ import annotations

import re

from ...core.inputs import NumericInputs
from ...model.units import conversion_factor

ATOM, PRODUCT, SUM = 3, 2, 1
_PLACEHOLDER = re.compile(r"\{F:([^{}]+)\}")


def number_text(value: float) -> str:
    """A float as a formula literal that reads back to the same double (repr is round-trip)."""
    value = float(value)
    if value != value or value in (float("inf"), float("-inf")):
        raise ValueError(f"{value} cannot be written in a formula")
    text = repr(value)
    if text.endswith(".0"):
        text = text[:-2]
    return text.upper()


class Term:
    """Formula text and the precedence of its outermost operation.

    A number written into a formula is a literal (``literal`` holds its value). Arithmetic with
    a literal 0 or 1 leaves the term out (x*1 is x, x*0 is 0, x+0 is x) and two literals are
    combined into one, with the same floating-point operation the engine performs, so no
    formula carries a ``*0*`` or ``*1*`` a reader has to puzzle over.
    """

    __slots__ = ("text", "precedence", "literal", "reciprocal_of")
    __array_priority__ = 1000  # numpy defers to Term's reflected operators

    def __init__(self, text: str, precedence: int = ATOM, literal: float | None = None, reciprocal_of: Term | None = None):
        self.text = text
        self.precedence = precedence
        self.literal = literal
        self.reciprocal_of = reciprocal_of  # 1/x: multiplying by it divides by x

    # helpers -----------------------------------------------------------------------------
    @staticmethod
    def of(value) -> Term:
        if isinstance(value, Term):
            return value
        if isinstance(value, bool):
            raise TypeError("a truth value is not a formula operand")
        number = float(value)
        text = number_text(number)
        return Term(f"({text})" if number < 0 else text, ATOM, number)

    def _wrapped(self, below: int) -> str:
        return f"({self.text})" if self.precedence < below else self.text

    # arithmetic --------------------------------------------------------------------------
    def __add__(self, other):
        other = Term.of(other)
        if self.literal is not None and other.literal is not None:
            return Term.of(self.literal + other.literal)
        if other.literal == 0:
            return self
        if self.literal == 0:
            return other
        return Term(f"{self.text}+{other.text}", SUM)

    def __radd__(self, other):
        return Term.of(other) + self

    def __sub__(self, other):
        other = Term.of(other)
        if self.literal is not None and other.literal is not None:
            return Term.of(self.literal - other.literal)
        if other.literal == 0:
            return self
        if self.literal == 0:
            return -other
        return Term(f"{self.text}-{other._wrapped(PRODUCT)}", SUM)

    def __rsub__(self, other):
        return Term.of(other) - self

    def __mul__(self, other):
        other = Term.of(other)
        if self.literal is not None and other.literal is not None:
            return Term.of(self.literal * other.literal)
        if self.literal == 0 or other.literal == 0:
            return Term.of(0.0)
        if other.literal == 1:
            return self
        if self.literal == 1:
            return other
        if other.reciprocal_of is not None:
            return self / other.reciprocal_of
        if self.reciprocal_of is not None:
            return other / self.reciprocal_of
        return Term(f"{self._wrapped(PRODUCT)}*{other._wrapped(PRODUCT)}", PRODUCT)

    def __rmul__(self, other):
        return Term.of(other) * self

    def __truediv__(self, other):
        other = Term.of(other)
        if self.literal is not None and other.literal is not None and other.literal != 0:
            return Term.of(self.literal / other.literal)
        if other.literal == 1:
            return self
        if self.literal == 0 and other.literal is None:
            return Term.of(0.0)
        return Term(f"{self._wrapped(PRODUCT)}/{other._wrapped(ATOM)}", PRODUCT, reciprocal_of=other if self.literal == 1 else None)

    def __rtruediv__(self, other):
        return Term.of(other) / self

    def __neg__(self):
        if self.literal is not None:
            return Term.of(-self.literal)
        return Term(f"(-{self._wrapped(ATOM)})", ATOM)

    def __pos__(self):
        return self

    def formula(self) -> str:
        return "=" + self.text

    def __repr__(self) -> str:
        return f"Term({self.text!r})"

    def __bool__(self):  # an `if` on a symbolic value is a bug in a stage function
        raise TypeError("a workbook formula has no truth value; stage code must not branch on numbers")


def ref(sheet: str, column: str, row: int) -> Term:
    """Absolute reference to one cell, e.g. ``Inputs!$B$7``."""
    return Term(f"{sheet}!${column}${row}")


def local(column: str, row: int) -> Term:
    """Reference to a cell on the same sheet, e.g. ``$G$12``."""
    return Term(f"${column}${row}")


def sum_of(terms) -> Term:
    """Sum written out term by term (each addend visible to the reader); 0 when empty."""
    terms = [term for term in (Term.of(t) for t in terms) if term.literal != 0]
    if not terms:
        return Term.of(0.0)
    text = "+".join(t.text for t in terms)
    return Term(text, SUM if len(terms) > 1 else terms[0].precedence)


class SymbolicInputs:
    """Factor and reference values as placeholders for cells on the factor sheet.

    Same interface as ``inventory.NumericInputs``: ``factor``, ``factor_unit``, ``molar_mass``
    and ``used`` (the factor rows and reference values used, by id). A unit conversion is a
    literal multiplier in the formula, from ``units.conversion_factor``.
    """

    def __init__(self, factor_set):
        self._numeric = NumericInputs(factor_set)
        self.factor_set = factor_set
        self.used = self._numeric.used

    def factor(self, factor_id: str, unit: str, where: str = "factor"):
        self._numeric.factor(factor_id, unit, where)  # records the row and raises on a unit mismatch
        row = self.factor_set.get(factor_id, where)
        cell = Term("{F:" + factor_id + "}")
        multiplier = conversion_factor(row.unit, unit)
        return cell if multiplier == 1.0 else cell * multiplier

    def factor_unit(self, factor_id: str, where: str = "factor") -> str:
        return self._numeric.factor_unit(factor_id, where)

    def molar_mass(self, formula: str):
        self._numeric.molar_mass(formula)
        return Term("{F:" + f"reference.molar_mass.{formula.lower()}" + "}")

    def latent_heat_ammonia(self):
        self._numeric.latent_heat_ammonia()
        return Term("{F:reference.latent_heat.ammonia}")

    def formation_enthalpy_co2(self):
        self._numeric.formation_enthalpy_co2()
        return Term("{F:reference.formation_enthalpy.co2_gas}")

    def latent_heat_hydrogen(self):
        self._numeric.latent_heat_hydrogen()
        return Term("{F:reference.latent_heat.hydrogen}")

    def formation_enthalpy_ammonia(self):
        self._numeric.formation_enthalpy_ammonia()
        return Term("{F:reference.formation_enthalpy.ammonia_gas}")


def resolve(text: str, address: dict[str, str]) -> str:
    """Replace ``{F:id}`` placeholders by the cell address of each factor row."""
    return _PLACEHOLDER.sub(lambda match: address[match.group(1)], text)
