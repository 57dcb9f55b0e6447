"""The architecture as a test: layers import one way, no private names cross modules, and
package-internal imports sit at module level (imports inside functions are for heavy optional
libraries only). See DEVELOPERS.md, "Architecture"."""

from __future__ import annotations

import ast
import functools
from pathlib import Path

import carbonledger

PACKAGE = Path(carbonledger.__file__).resolve().parent

# Top to bottom: a module may import from its own layer and the layers above it, never below.
LAYERS = (
    ("carbonledger.about", "carbonledger.errors"),
    ("carbonledger.model",),
    ("carbonledger.stages",),
    ("carbonledger.routes",),
    ("carbonledger.core",),
    ("carbonledger.analyses",),
    ("carbonledger.io",),
    ("carbonledger.api",),
    ("carbonledger.cli", "carbonledger.__main__"),
)


def modules() -> dict[str, Path]:
    found = {}
    for path in PACKAGE.rglob("*.py"):
        parts = ("carbonledger",) + path.relative_to(PACKAGE).with_suffix("").parts
        name = ".".join(parts[:-1] if parts[-1] == "__init__" else parts)
        found[name] = path
    return found


def layer_of(module: str) -> int | None:
    """Layer index of a module; None for the package's own __init__ (a lazy facade)."""
    for index, prefixes in enumerate(LAYERS):
        if any(module == prefix or module.startswith(prefix + ".") for prefix in prefixes):
            return index
    return None


@functools.cache
def imports(name: str, path: Path) -> list:
    """(imported module, imported names, inside a function) for every package-internal import."""
    return list(_imports(name, path))


def _imports(name: str, path: Path):
    tree = ast.parse(path.read_text(encoding="utf-8"))
    is_package = path.name == "__init__.py"
    base = name.split(".") if is_package else name.split(".")[:-1]
    functions = [node for node in ast.walk(tree) if isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef))]
    inside = {id(child) for function in functions for child in ast.walk(function) if child is not function}
    for node in ast.walk(tree):
        if isinstance(node, ast.ImportFrom):
            if node.level:
                target = ".".join(base[: len(base) - (node.level - 1)] + ([node.module] if node.module else []))
            else:
                target = node.module or ""
            if target.split(".")[0] == "carbonledger":
                yield target, [alias.name for alias in node.names], id(node) in inside
        elif isinstance(node, ast.Import):
            for alias in node.names:
                if alias.name.split(".")[0] == "carbonledger":
                    yield alias.name, [], id(node) in inside


def test_every_module_has_a_layer():
    assert [name for name in modules() if name != "carbonledger" and layer_of(name) is None] == []


def test_layers_import_one_way():
    wrong = []
    for name, path in modules().items():
        own = layer_of(name)
        if own is None:
            continue
        for target, names, _ in imports(name, path):
            candidates = [target] + [f"{target}.{n}" for n in names]
            for candidate in candidates:
                other = layer_of(candidate)
                if other is not None and other > own:
                    wrong.append(f"{name} imports {candidate}")
    assert wrong == []


def test_no_private_name_crosses_a_module():
    crossing = [f"{name}: {target}.{n}" for name, path in modules().items() for target, names, _ in imports(name, path) for n in names if n.startswith("_") and n != "__version__"]
    assert crossing == []


def test_package_imports_are_at_module_level():
    """Imports inside functions are kept for heavy optional libraries; package modules are imported at the top.

    The one exception is the package's own lazy facade (``carbonledger.__getattr__``), which keeps
    ``import carbonledger`` cheap for the command line."""
    inside = [f"{name}: {target}" for name, path in modules().items() if name != "carbonledger" for target, _, nested in imports(name, path) if nested]
    assert inside == []


def test_the_layer_test_sees_a_wrong_import(tmp_path):
    """The checks above can fail: a core module importing the command line is caught."""
    bad = tmp_path / "bad.py"
    bad.write_text("from ..cli import app\n\ndef f():\n    from ..io import ledger\n", encoding="utf-8")
    found = list(imports("carbonledger.core.bad", bad))
    assert ("carbonledger.cli", ["app"], False) in found and ("carbonledger.io", ["ledger"], True) in found
    assert layer_of("carbonledger.cli") > layer_of("carbonledger.core.bad")
