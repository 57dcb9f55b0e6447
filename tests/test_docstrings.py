"""Every public function of the stages, the route modules, the core modules and the library API (``api/``) has a
numpy-style docstring (numpydoc's section format, which mkdocstrings renders on the manual's pages): a summary line,
a ``Parameters`` section naming each argument of the signature (when it has any), a ``Returns`` section, and a
``Raises`` section naming ``InputError`` where the function raises it itself.

An AST check of the source files (nothing is imported), listing every offender.
"""

from __future__ import annotations

import ast
import re
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
PACKAGE = ROOT / "carbonledger"
COVERED = sorted(path for folder in ("stages", "routes", "core", "api") for path in (PACKAGE / folder).glob("*.py"))


def public_functions(path: Path) -> list[ast.FunctionDef]:
    tree = ast.parse(path.read_text(encoding="utf-8"))
    return [node for node in tree.body if isinstance(node, ast.FunctionDef) and not node.name.startswith("_")]


def arguments(node: ast.FunctionDef) -> list[str]:
    args = node.args
    names = [a.arg for a in args.posonlyargs + args.args + args.kwonlyargs]
    names += [a.arg for a in (args.vararg, args.kwarg) if a is not None]
    return [name for name in names if name not in ("self", "cls")]


def section(doc: str, title: str) -> str | None:
    """The text of a numpy section (title, a line of dashes, then up to the next section), or None."""
    match = re.search(rf"^{title}\n-{{3,}}\n(.*?)(?=^\w[\w ]*\n-{{3,}}\n|\Z)", doc, re.S | re.M)
    return match.group(1) if match else None


def documented_parameters(text: str) -> list[str]:
    """Names of the entries of a Parameters section: unindented lines ``name : type`` (or ``name``)."""
    return [m.group(1) for m in re.finditer(r"^(\*{0,2}\w+)(?:\s*:.*)?$", text, re.M)]


def raises_input_error(node: ast.FunctionDef) -> bool:
    """Whether the function's own body raises ``InputError`` (not what the functions it calls raise)."""
    raised = [n.exc for n in ast.walk(node) if isinstance(n, ast.Raise) and n.exc is not None]
    return any("InputError" in ast.unparse(exc) for exc in raised)


def problems(path: Path, root: Path = ROOT) -> list[str]:
    found = []
    where = path.relative_to(root)
    for node in public_functions(path):
        doc = ast.get_docstring(node)
        name = f"{where}:{node.lineno} {node.name}"
        if not doc or not doc.strip():
            found.append(f"{name}: no docstring")
            continue
        if not doc.splitlines()[0].strip():
            found.append(f"{name}: no summary line")
        expected = arguments(node)
        params = section(doc, "Parameters")
        if expected and params is None:
            found.append(f"{name}: no Parameters section")
        elif expected:
            listed = [n.lstrip("*") for n in documented_parameters(params)]
            missing = [n for n in expected if n not in listed]
            unknown = [n for n in listed if n not in expected]
            if missing or unknown:
                found.append(f"{name}: Parameters missing {missing}, not in the signature {unknown}")
        if section(doc, "Returns") is None:
            found.append(f"{name}: no Returns section")
        if raises_input_error(node) and "InputError" not in (section(doc, "Raises") or ""):
            found.append(f"{name}: raises InputError, no Raises section naming it")
    return found


def test_covered_modules_are_found():
    assert len(COVERED) >= 40 and all(path.exists() for path in COVERED)
    assert {"scoring.py", "verdicts.py", "engine.py"} <= {path.name for path in COVERED}
    assert {"evidence_pack.py", "monte_carlo.py", "workbooks.py"} <= {path.name for path in COVERED}


def test_every_public_function_has_parameters_and_returns():
    offenders = [problem for path in COVERED for problem in problems(path)]
    assert not offenders, "numpy docstrings needed:\n" + "\n".join(offenders)


@pytest.mark.parametrize(
    "source, expected",
    [
        ('def f(a):\n    """Sum."""\n', ["no Parameters section", "no Returns section"]),
        ('def f(a, b):\n    """S.\n\n    Parameters\n    ----------\n    a : float\n        A, kg.\n\n'
         '    Returns\n    -------\n    float\n        kg.\n    """\n', ["missing ['b']"]),
        ('def f():\n    pass\n', ["no docstring"]),
        ('def f():\n    """S.\n\n    Returns\n    -------\n    None\n    """\n    raise InputError("a", "b", "c")\n',
         ["raises InputError, no Raises section"]),
        ('def f(a):\n    """S.\n\n    Parameters\n    ----------\n    a : float\n        A, kg.\n\n'
         '    Returns\n    -------\n    float\n        kg.\n    """\n', []),
    ],
)
def test_the_check_finds_what_is_missing(tmp_path, source, expected):
    # the check itself can fail: a docstring without its sections or with an argument left out is reported
    path = tmp_path / "probe.py"
    path.write_text(source, encoding="utf-8")
    found = " | ".join(problems(path, tmp_path))
    for text in expected:
        assert text in found
    if not expected:
        assert found == ""

