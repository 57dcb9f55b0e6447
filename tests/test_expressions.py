"""The one expression tree (carbonledger.model.expressions): its simplifications are built once and
both printers keep the meaning of the expression. Expected texts are written by hand from the
operator precedence of each notation (ECMA-376 Part 1, 18.17 for spreadsheet formulas; LaTeX's
usual reading for the documentation)."""

from __future__ import annotations

import pytest

from carbonledger.model.expressions import Expr, excel_text, latex_text


class X(Expr):
    """A bare node for the tests: leaves are single letters, valid in both notations."""

    __slots__ = ()


a, b, c = X("A1"), X("B1"), X("C1")


def excel(node) -> str:
    return excel_text(X.of(node))[0]


def latex(node) -> str:
    return latex_text(X.of(node))[0]


@pytest.mark.parametrize(
    ("node", "expected"),
    [
        (a * 1, "A1"),  # x*1 is x
        (a * 0, "0"),  # x*0 is 0
        (a + 0, "A1"),  # x+0 is x
        (0 - a, "(-A1)"),  # 0-x is -x; negation written in parentheses so ^ cannot bind first
        (a * (1 / b), "A1/B1"),  # x*(1/y) is x/y
        (X.of(2.0) * 3.0, "6"),  # two numbers combined with the engine's own float operation
        (a - (b + c), "A1-(B1+C1)"),  # a sum after a minus keeps its parentheses
        (a - b * c, "A1-B1*C1"),  # a product binds tighter than minus
        ((a + b) * c, "(A1+B1)*C1"),
        (a / (b * c), "A1/(B1*C1)"),  # the divisor is wrapped unless it is a single atom
        (a * -2.5, "A1*(-2.5)"),  # a negative number is written in parentheses
        (a**2, "A1^2"),
    ],
)
def test_excel_printer(node, expected):
    assert excel(node) == expected


@pytest.mark.parametrize(
    ("node", "expected"),
    [
        (a * b, r"A1 \cdot B1"),
        (a / b, r"\frac{A1}{B1}"),
        (a - (b + c), r"A1 - \left(B1 + C1\right)"),
        ((a + b) * c, r"\left(A1 + B1\right) \cdot C1"),
        (a**2, "{A1}^{2}"),
        (a * 1.5e-7, r"A1 \cdot 1.5 \times 10^{-7}"),
    ],
)
def test_latex_printer(node, expected):
    assert latex(node) == expected


def test_the_sum_lists_each_addend_and_drops_zeros():
    assert excel(X.sum([a, 0.0, b, c])) == "A1+B1+C1"
    assert latex(X.sum([a, b])) == "A1 + B1"
    assert excel(X.sum([])) == "0"


def test_the_formula_text_evaluates_to_the_float_arithmetic():
    """The printed formula, evaluated by the `formulas` library (an independent spreadsheet engine),
    equals the same arithmetic in Python floats."""
    formulas = pytest.importorskip("formulas")
    values = {"A1": 3.7, "B1": 0.42, "C1": 12.5}
    node = (a - b * c) / (a + 2.0) - (0 - b) * c**2 + a / (b * c)
    expected = (3.7 - 0.42 * 12.5) / (3.7 + 2.0) - (-0.42) * 12.5**2 + 3.7 / (0.42 * 12.5)
    function = formulas.Parser().ast("=" + excel(node))[1].compile()
    inputs = [values[name.upper()] for name in function.inputs]
    assert float(function(*inputs)) == pytest.approx(expected, rel=1e-12)


def test_a_symbolic_value_has_no_truth_value():
    with pytest.raises(TypeError):
        bool(a + b)
