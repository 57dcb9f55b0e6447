"""Write the documentation pages that come from code and data, so they cannot drift from them.

Run before ``mkdocs build --strict`` (``.ci/run`` does): writes docs/generated/*.md from the
scheme rulebooks (factors/schemes), the factor sets (factors/sets), the stage modules'
docstrings (carbonledger/stages) and the README's deliverables section.
"""

from __future__ import annotations

import importlib
import inspect
import pkgutil
import re
from pathlib import Path

from carbonledger import stages
from carbonledger.model.factors import available_sets, load_factor_set
from carbonledger.model.rulebooks import load_schemes

DOCS = Path(__file__).resolve().parent
ROOT = DOCS.parent
OUT = DOCS / "generated"


def cell(value) -> str:
    text = "" if value is None else str(value)
    return text.replace("|", "\\|").replace("\n", " ")


def table(headers: list[str], rows: list[list]) -> str:
    lines = ["| " + " | ".join(headers) + " |", "|" + "---|" * len(headers)]
    lines += ["| " + " | ".join(cell(v) for v in row) + " |" for row in rows]
    return "\n".join(lines) + "\n"


def rulebooks_page() -> str:
    parts = ["# Scheme rulebooks\n", "Generated from `factors/schemes/*.toml`. A rule recorded from memory has not yet been checked against the legal text.\n"]
    for scheme in load_schemes().values():
        parts.append(f"\n## {scheme.name} (`{scheme.id}`)\n")
        parts.append(table(["rule", "value"], [
            ["document", scheme.document], ["year", scheme.year], ["products", ", ".join(scheme.products)], ["quantity", f"{scheme.quantity} [{scheme.unit}]"],
            ["basis", scheme.basis], ["boundary", scheme.boundary], ["GWP100 set", scheme.gwp.upper()], ["electricity rule", scheme.electricity],
            ["stages left out", ", ".join(scheme.excluded_stages) or "none"], ["counts construction", scheme.counts_construction], ["recorded from memory", scheme.from_memory],
        ]))
        parts.append("\n" + table(["tier", "limit", "comparison", "source", "from memory"], [
            [t.tier, t.limit, "value <= limit" if t.inclusive else "value < limit", t.source, t.from_memory] for t in sorted(scheme.thresholds, key=lambda t: -t.limit)
        ]))
        if scheme.note:
            parts.append(f"\n{scheme.note}\n")
    return "\n".join(parts)


def factors_page() -> str:
    parts = ["# Factor library\n", "Generated from `factors/sets/*/factors.csv`. Every value cites its source; `from memory` marks a value not yet checked against the document.\n"]
    for name in available_sets():
        factor_set = load_factor_set(name)
        parts.append(f"\n## {factor_set.name}\n\n{factor_set.description}\n\nsha256 `{factor_set.sha256}`\n")
        rows = [[f"`{f.id}`", f.value, f.unit, f.source, f.table, f.year, f.region, f.from_memory, f.note] for f in sorted(factor_set.factors.values(), key=lambda f: f.id)]
        parts.append(table(["id", "value", "unit", "source", "table", "year", "region", "from memory", "note"], rows))
    return "\n".join(parts)


def stages_page() -> str:
    parts = ["# Methodology by stage\n", "Generated from the docstrings of `carbonledger/stages`: each stage's functions, with units in their names and the published sources in their References.\n"]
    for info in pkgutil.iter_modules(stages.__path__):
        module = importlib.import_module(f"carbonledger.stages.{info.name}")
        parts.append(f"\n## {info.name.replace('_', ' ').capitalize()}\n")
        parts.append("```text\n" + inspect.cleandoc(module.__doc__ or "(no module docstring)") + "\n```\n")
        for name, function in inspect.getmembers(module, inspect.isfunction):
            if function.__module__ != module.__name__ or name.startswith("_"):
                continue
            parts.append(f"\n### `{name}{inspect.signature(function)}`\n")
            parts.append("```text\n" + inspect.cleandoc(function.__doc__ or "(no docstring)") + "\n```\n")
    return "\n".join(parts)


def deliverables_page() -> str:
    readme = (ROOT / "README.md").read_text(encoding="utf-8")
    match = re.search(r"^## Deliverables.*?(?=^## )", readme, re.M | re.S)
    body = match.group(0) if match else "## Deliverables\n\n(see the README)\n"
    return "# " + body[3:].replace("](docs/", "](../")


def main() -> None:
    OUT.mkdir(exist_ok=True)
    pages = {"rulebooks.md": rulebooks_page(), "factors.md": factors_page(), "stages.md": stages_page(), "deliverables.md": deliverables_page()}
    for name, text in pages.items():
        (OUT / name).write_text(text, encoding="utf-8")
    print(f"wrote {len(pages)} pages to {OUT}")


if __name__ == "__main__":
    main()
