"""Functions a reader can hold: no function of the package above complexity 15 (McCabe's cyclomatic
complexity, ruff's C901, also selected in pyproject.toml so `ruff check .` reports it) or 80 lines
(issue 18, "Readable functions"), and no line of the package above 120 characters (issue 18, "line
length 120")."""

from __future__ import annotations

import ast
import subprocess
import sys
from pathlib import Path

PACKAGE = Path(__file__).resolve().parent.parent / "carbonledger"
MAX_LINES = 80
MAX_COMPLEXITY = 15
MAX_LINE = 120

def long_functions(source: str) -> list[tuple[str, int]]:
    """(name, lines) of every function of ``source`` longer than MAX_LINES, decorators left out."""
    tree = ast.parse(source)
    return [
        (node.name, node.end_lineno - node.lineno + 1)
        for node in ast.walk(tree)
        if isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef)) and node.end_lineno - node.lineno + 1 > MAX_LINES
    ]


def test_no_function_above_80_lines():
    long = {str(path.relative_to(PACKAGE)): found for path in sorted(PACKAGE.rglob("*.py")) if (found := long_functions(path.read_text(encoding="utf-8")))}
    assert long == {}


def test_the_line_count_can_fail():
    body = "\n".join(f"    x{n} = {n}" for n in range(MAX_LINES))
    assert long_functions(f"def f():\n{body}\n") == [("f", MAX_LINES + 1)]
    assert long_functions(f"def g():\n{body[: body.rindex(chr(10))]}\n") == []


def test_no_function_above_complexity_15():
    out = subprocess.run(
        [sys.executable, "-m", "ruff", "check", "--no-cache", "--select", "C901", "--config", f"lint.mccabe.max-complexity={MAX_COMPLEXITY}",
         "--output-format", "concise", str(PACKAGE)],
        capture_output=True, text=True,
    )
    assert out.returncode == 0, out.stdout + out.stderr


def long_lines(source: str) -> list[int]:
    """The numbers of the lines of ``source`` longer than MAX_LINE characters."""
    return [number for number, line in enumerate(source.splitlines(), start=1) if len(line) > MAX_LINE]


def test_no_line_above_120_characters():
    found = {
        path.relative_to(PACKAGE).as_posix(): lines
        for path in sorted(PACKAGE.rglob("*.py"))
        if (lines := long_lines(path.read_text(encoding="utf-8")))
    }
    assert found == {}, f"lines above {MAX_LINE} characters: {found}"


def test_the_line_length_can_fail():
    assert long_lines("x = 1\n" + "y = '" + "a" * (MAX_LINE - 5) + "'\n") == [2]
    assert long_lines("y = '" + "a" * (MAX_LINE - 6) + "'\n") == []
