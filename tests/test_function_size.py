"""Functions a reader can hold: in the files listed, no function above complexity 15 (ruff's C901,
McCabe's cyclomatic complexity) or 80 lines. Not yet enforced for the whole package: the list grows as
files are split (issue 18, "Readable functions")."""

from __future__ import annotations

import ast
import subprocess
import sys
from pathlib import Path

import pytest

PACKAGE = Path(__file__).resolve().parent.parent / "carbonledger"
FILES = (
    "analyses/plan.py", "analyses/lifetime.py", "io/workbook/intervals_sheet.py", "io/workbook/periods_sheet.py",
    "analyses/sensitivity.py", "io/sensitivity_output.py", "io/uncertainty_output.py", "model/pedigree.py",
)
MAX_LINES = 80
MAX_COMPLEXITY = 15


@pytest.mark.parametrize("name", FILES)
def test_no_function_above_80_lines(name):
    tree = ast.parse((PACKAGE / name).read_text(encoding="utf-8"))
    long = [(node.name, node.end_lineno - node.lineno + 1) for node in ast.walk(tree) if isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef)) and node.end_lineno - node.lineno + 1 > MAX_LINES]
    assert long == []


def test_no_function_above_complexity_15():
    out = subprocess.run(
        [sys.executable, "-m", "ruff", "check", "--no-cache", "--select", "C901", "--config", f"lint.mccabe.max-complexity={MAX_COMPLEXITY}", "--output-format", "concise", *(str(PACKAGE / name) for name in FILES)],
        capture_output=True, text=True,
    )
    assert out.returncode == 0, out.stdout + out.stderr
