"""One expression tree for the stage arithmetic run on symbols, with two printers.

The stage functions use arithmetic only, so run on ``Expr`` values instead of floats they return
their own formula as a tree. The audit workbook prints it as a spreadsheet formula
(``excel_text``: ``Inputs!$B$7*Factors!$B$12/1000``) and the documentation as LaTeX
(``latex_text``: ``\\mathrm{a} \\cdot \\frac{b}{1000}``). The simplifications are written once, here,
where the tree is built: two numbers are combined with the same floating-point operation the engine
performs, and a 0 or a 1 is left out (x*1 is x, x*0 is 0, x+0 is x, 0-x is -x, x*(1/y) is x/y), so
no formula carries a ``*0*`` or ``*1*`` a reader has to puzzle over. Each printer adds only the
parentheses its notation needs for the precedence of the operators.

References
----------
.. [1] ECMA-376 Office Open XML, Part 1, section 18.17 (formulas): operator precedence; negation
   binds tighter than ^, which binds tighter than multiplication and division, then + and -.
.. [2] Lamport, L. (1994). LaTeX: A Document Preparation System, 2nd ed., chapter 3 (mathematical formulas).
"""

from __future__ import annotations

import numbers

ATOM, POWER, PRODUCT, SUM = 4, 3, 2, 1


class Expr:
    """A node: a number (``literal``), a leaf (text already in the printer's notation, with its
    precedence), or an operation (``op`` in add, sub, mul, div, pow, neg, sum) on child nodes.

    Arithmetic on a node builds a node of the same class, so a subclass (the workbook's ``Term``,
    the documentation's ``Sym``) keeps its own printer and checks.
    """

    __slots__ = ("op", "args", "literal", "leaf", "leaf_precedence", "_printed")
    __array_priority__ = 1000  # numpy defers to the reflected operators

    def __init__(
        self,
        leaf: str = "",
        precedence: int = ATOM,
        *,
        op: str = "leaf",
        args: tuple = (),
        literal: float | None = None,
    ):
        self.op, self.args, self.literal = op, args, literal
        self.leaf, self.leaf_precedence = leaf, precedence
        self._printed = None

    # building -------------------------------------------------------------------------------
    @classmethod
    def of(cls, value) -> Expr:
        """A node for ``value``: the node itself, or a number."""
        if isinstance(value, Expr):
            return value
        if isinstance(value, bool) or not isinstance(value, numbers.Real):
            raise TypeError(f"not arithmetic: {value!r}")
        return cls(op="num", literal=float(value))

    def _node(self, op: str, *args: Expr) -> Expr:
        return type(self)(op=op, args=args)

    def _is_reciprocal(self) -> bool:
        return self.op == "div" and self.args[0].literal == 1

    def __add__(self, other):
        other = self.of(other)
        if self.literal is not None and other.literal is not None:
            return self.of(self.literal + other.literal)
        if other.literal == 0:
            return self
        if self.literal == 0:
            return other
        return self._node("add", self, other)

    def __radd__(self, other):
        return self.of(other) + self

    def __sub__(self, other):
        other = self.of(other)
        if self.literal is not None and other.literal is not None:
            return self.of(self.literal - other.literal)
        if other.literal == 0:
            return self
        if self.literal == 0:
            return -other
        return self._node("sub", self, other)

    def __rsub__(self, other):
        return self.of(other) - self

    def __mul__(self, other):
        other = self.of(other)
        if self.literal is not None and other.literal is not None:
            return self.of(self.literal * other.literal)
        if self.literal == 0 or other.literal == 0:
            return self.of(0.0)
        if other.literal == 1:
            return self
        if self.literal == 1:
            return other
        if other._is_reciprocal():
            return self / other.args[1]
        if self._is_reciprocal():
            return other / self.args[1]
        return self._node("mul", self, other)

    def __rmul__(self, other):
        return self.of(other) * self

    def __truediv__(self, other):
        other = self.of(other)
        if self.literal is not None and other.literal is not None and other.literal != 0:
            return self.of(self.literal / other.literal)
        if other.literal == 1:
            return self
        if self.literal == 0 and other.literal is None:
            return self.of(0.0)
        return self._node("div", self, other)

    def __rtruediv__(self, other):
        return self.of(other) / self

    def __pow__(self, other):
        other = self.of(other)
        if self.literal is not None and other.literal is not None:
            return self.of(self.literal**other.literal)
        if other.literal == 1:
            return self
        return self._node("pow", self, other)

    def __rpow__(self, other):
        return self.of(other) ** self

    def __neg__(self):
        if self.literal is not None:
            return self.of(-self.literal)
        return self._node("neg", self)

    def __pos__(self):
        return self

    def __bool__(self):  # an `if` on a symbolic value is a bug in a stage function
        raise TypeError("a symbolic value has no truth value; stage code must not branch on numbers")

    @classmethod
    def sum(cls, values) -> Expr:
        """A sum written out addend by addend (each visible to the reader), 0 when empty."""
        terms = [term for term in (cls.of(value) for value in values) if term.literal != 0]
        if not terms:
            return cls.of(0.0)
        if len(terms) == 1:
            return terms[0]
        return cls(op="sum", args=tuple(terms))


# printers -----------------------------------------------------------------------------------


def excel_number(value: float) -> str:
    """A float as a formula literal that reads back to the same double (repr is round-trip)."""
    value = float(value)
    if value != value or value in (float("inf"), float("-inf")):
        raise ValueError(f"{value} cannot be written in a formula")
    text = repr(value)
    if text.endswith(".0"):
        text = text[:-2]
    return text.upper()


def excel_text(node: Expr) -> tuple[str, int]:
    """The node as spreadsheet formula text (without the leading =) and its outermost precedence."""
    if node._printed is None:
        node._printed = _excel(node)
    return node._printed


def _excel_wrapped(node: Expr, below: int) -> str:
    text, precedence = excel_text(node)
    return f"({text})" if precedence < below else text


def _excel(node: Expr) -> tuple[str, int]:
    op, args = node.op, node.args
    if op == "leaf":
        return node.leaf, node.leaf_precedence
    if op == "num":
        text = excel_number(node.literal)
        return (f"({text})" if node.literal < 0 else text), ATOM
    if op == "add":
        return f"{excel_text(args[0])[0]}+{excel_text(args[1])[0]}", SUM
    if op == "sum":
        return "+".join(excel_text(arg)[0] for arg in args), SUM
    if op == "sub":
        return f"{excel_text(args[0])[0]}-{_excel_wrapped(args[1], PRODUCT)}", SUM
    if op == "mul":
        return f"{_excel_wrapped(args[0], PRODUCT)}*{_excel_wrapped(args[1], PRODUCT)}", PRODUCT
    if op == "div":
        return f"{_excel_wrapped(args[0], PRODUCT)}/{_excel_wrapped(args[1], ATOM)}", PRODUCT
    if op == "pow":
        return f"{_excel_wrapped(args[0], ATOM)}^{_excel_wrapped(args[1], ATOM)}", POWER
    return f"(-{_excel_wrapped(args[0], ATOM)})", ATOM  # neg


def latex_number(value: float) -> str:
    """A float in six significant figures, with a power of ten written out."""
    text = f"{value:.6g}"
    if "e" in text:
        mantissa, exponent = text.split("e")
        return rf"{mantissa} \times 10^{{{int(exponent)}}}"
    return text


def latex_text(node: Expr) -> tuple[str, int]:
    """The node as LaTeX and its outermost precedence."""
    if node._printed is None:
        node._printed = _latex(node)
    return node._printed


def _latex_wrapped(node: Expr, below: int) -> str:
    text, precedence = latex_text(node)
    return rf"\left({text}\right)" if precedence < below else text


def _latex_addend(node: Expr) -> str:
    text = latex_text(node)[0]
    return _latex_wrapped(node, SUM + 1) if text.startswith("-") else text


def _latex(node: Expr) -> tuple[str, int]:
    op, args = node.op, node.args
    if op == "leaf":
        return node.leaf, node.leaf_precedence
    if op == "num":
        return latex_number(node.literal), ATOM
    if op in ("add", "sum"):
        return " + ".join([latex_text(args[0])[0], *(_latex_addend(arg) for arg in args[1:])]), SUM
    if op == "sub":
        return f"{latex_text(args[0])[0]} - {_latex_wrapped(args[1], SUM + 1)}", SUM
    if op == "mul":
        right = args[1]
        negative_product = latex_text(right)[1] == PRODUCT and latex_text(right)[0].startswith("-")
        return (
            rf"{_latex_wrapped(args[0], PRODUCT)} \cdot "
            rf"{_latex_wrapped(right, PRODUCT + 1 if negative_product else PRODUCT)}",
            PRODUCT,
        )
    if op == "div":
        return rf"\frac{{{latex_text(args[0])[0]}}}{{{latex_text(args[1])[0]}}}", ATOM
    if op == "pow":
        return f"{{{_latex_wrapped(args[0], ATOM)}}}^{{{latex_text(args[1])[0]}}}", POWER
    return f"-{_latex_wrapped(args[0], PRODUCT)}", SUM  # neg
