"""Symbolic values that print as spreadsheet formulas, so the stage code writes the workbook.

The stage functions and ``inventory.build_inventory`` use arithmetic only. Run on ``Term``
values instead of floats, they return the formula of every exchange amount: a ``Term`` holds
formula text (``Inputs!$B$7*Factors!$B$12/1000``) and the precedence of its outermost
operator, and each operator adds only the parentheses the spreadsheet needs.

``SymbolicInputs`` has the interface of ``inventory.NumericInputs`` but returns references to
the factor sheet. References are written as placeholders (``{F:factor.id}``) and resolved to
cell addresses by the workbook writer once it knows which factors were used and where their
rows are (``resolve``).

The tree, its simplifications and the formula printer are ``model.expressions``, shared with
the documentation's LaTeX equations.
"""

from __future__ import annotations

import re

from ...core.inputs import NumericInputs
from ...model.expressions import Expr, excel_text
from ...model.units import conversion_factor

_PLACEHOLDER = re.compile(r"\{F:([^{}]+)\}")


class Term(Expr):
    """A node of the one expression tree (``model.expressions``) printed as a spreadsheet formula.

    ``Term(text)`` is formula text taken as it is (a cell reference, ``SUM(...)``, ``IF(...)``);
    arithmetic on terms builds the tree, and ``text`` prints it with the parentheses the
    spreadsheet needs.
    """

    __slots__ = ()

    @property
    def text(self) -> str:
        return excel_text(self)[0]

    @property
    def precedence(self) -> int:
        return excel_text(self)[1]

    def formula(self) -> str:
        return "=" + self.text

    def __repr__(self) -> str:
        return f"Term({self.text!r})"


def ref(sheet: str, column: str, row: int) -> Term:
    """Absolute reference to one cell, e.g. ``Inputs!$B$7``."""
    return Term(f"{sheet}!${column}${row}")


def local(column: str, row: int) -> Term:
    """Reference to a cell on the same sheet, e.g. ``$G$12``."""
    return Term(f"${column}${row}")


def sum_of(terms) -> Term:
    """Sum written out term by term (each addend visible to the reader); 0 when empty."""
    return Term.sum(terms)


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
