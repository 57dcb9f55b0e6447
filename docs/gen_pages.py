"""Write the documentation pages that come from code and data, so they cannot drift from them.

Run before ``mkdocs build --strict`` (``.ci/run`` does; ``docs/hooks.py`` also runs it and sets the
navigation when mkdocs starts): writes docs/generated/ from the scheme rulebooks
(factors/schemes), the factor sets (factors/sets), and

- one methodology page per stage module (carbonledger/stages) and per delivery leg of the route
  registry: the equations the code computes (``equations.py`` runs the stage functions on
  symbols), the parameters with units, the factors the code reads (found in the source and
  recorded while the demo projects are built) and the references (the docstrings, through
  mkdocstrings);
- the API reference: one page per public module, rendered from the docstrings by mkdocstrings.
"""

from __future__ import annotations

import importlib
import inspect
import pkgutil
import re
import sys
from pathlib import Path

from carbonledger import routes, stages
from carbonledger.model.factors import available_sets, load_factor_set
from carbonledger.model.rulebooks import load_schemes

DOCS = Path(__file__).resolve().parent
ROOT = DOCS.parent
OUT = DOCS / "generated"
sys.path.insert(0, str(DOCS))
from equations import equations  # noqa: E402  (beside this script)

# The API reference: the facade and the modules a user or a contributor calls.
PUBLIC_MODULES = (
    "carbonledger.api",
    "carbonledger.api.scoring",
    "carbonledger.api.workbooks",
    "carbonledger.api.comparison",
    "carbonledger.api.portfolios",
    "carbonledger.api.operating_plan",
    "carbonledger.api.monte_carlo",
    "carbonledger.api.levers",
    "carbonledger.api.reports",
    "carbonledger.api.evidence_pack",
    "carbonledger.core.results",
    "carbonledger.core.scoring",
    "carbonledger.core.engine",
    "carbonledger.core.verdicts",
    "carbonledger.model.project",
    "carbonledger.model.factors",
    "carbonledger.model.rulebooks",
    "carbonledger.model.distributions",
    "carbonledger.model.levers",
    "carbonledger.routes",
    "carbonledger.routes.base",
    "carbonledger.analyses.compare",
    "carbonledger.analyses.qualify",
    "carbonledger.analyses.portfolio",
    "carbonledger.analyses.lifetime",
    "carbonledger.analyses.matching",
    "carbonledger.analyses.uncertainty",
    "carbonledger.analyses.headroom",
    "carbonledger.analyses.sensitivity",
    "carbonledger.analyses.plan",
    "carbonledger.io.report",
)


def cell(value) -> str:
    text = "" if value is None else str(value)
    return text.replace("|", "\\|").replace("\n", " ")


def table(headers: list[str], rows: list[list]) -> str:
    lines = ["| " + " | ".join(headers) + " |", "|" + "---|" * len(headers)]
    lines += ["| " + " | ".join(cell(v) for v in row) + " |" for row in rows]
    return "\n".join(lines) + "\n"


def rulebooks_page() -> str:
    parts = [
        "# Scheme rulebooks\n",
        "Generated from `factors/schemes/*.toml`. A rule recorded from memory has not yet been checked against the "
        "legal text.\n",
    ]
    for scheme in load_schemes().values():
        parts.append(f"\n## {scheme.name} (`{scheme.id}`)\n")
        parts.append(
            table(
                ["rule", "value"],
                [
                    ["document", scheme.document],
                    ["year", scheme.year],
                    ["products", ", ".join(scheme.products)],
                    ["quantity", f"{scheme.quantity} [{scheme.unit}]"],
                    ["basis", scheme.basis],
                    ["boundary", scheme.boundary],
                    ["GWP100 set", scheme.gwp.upper()],
                    ["electricity rule", scheme.electricity],
                    ["stages left out", ", ".join(scheme.excluded_stages) or "none"],
                    ["counts construction", scheme.counts_construction],
                    ["recorded from memory", scheme.from_memory],
                ],
            )
        )
        parts.append(
            "\n"
            + table(
                ["tier", "limit", "comparison", "source", "from memory"],
                [
                    [t.tier, t.limit, "value <= limit" if t.inclusive else "value < limit", t.source, t.from_memory]
                    for t in sorted(scheme.thresholds, key=lambda t: -t.limit)
                ],
            )
        )
        if scheme.note:
            parts.append(f"\n{scheme.note}\n")
    return "\n".join(parts)


def factors_page() -> str:
    parts = [
        "# Factor library\n",
        "Generated from `factors/sets/*/factors.csv`. Every value cites its source and carries a source grade: "
        "primary text (read in the document itself or its official data file), verbatim secondary (a faithful copy of "
        "it), secondary (a summary or derived data set), not yet verified against the source document, or invented "
        "(demo values). `carbonledger factors grades` counts them by kind.\n",
    ]
    for name in available_sets():
        factor_set = load_factor_set(name)
        parts.append(f"\n## {factor_set.name}\n\n{factor_set.description}\n\nsha256 `{factor_set.sha256}`\n")
        rows = [
            [f"`{f.id}`", f.value, f.unit, f.source, f.table, f.year, f.region, f.grade.words, f.note]
            for f in sorted(factor_set.factors.values(), key=lambda f: f.id)
        ]
        parts.append(table(["id", "value", "unit", "source", "table", "year", "region", "source grade", "note"], rows))
    return "\n".join(parts)


def stage_modules() -> list[str]:
    return [info.name for info in pkgutil.iter_modules(stages.__path__)]


def stage_functions(module) -> list:
    return [
        f
        for name, f in inspect.getmembers(module, inspect.isfunction)
        if f.__module__ == module.__name__ and not name.startswith("_")
    ]


def route_modules(route) -> list:
    """The module that declares a route and the route-package helpers it imports (marine fuels, ...)."""
    module = sys.modules[route.build.__module__]
    helpers = [
        value
        for value in vars(module).values()
        if inspect.ismodule(value) and value.__name__.startswith("carbonledger.routes.")
    ]
    helpers += [
        sys.modules[value.__module__]
        for value in vars(module).values()
        if inspect.isfunction(value)
        and value.__module__.startswith("carbonledger.routes.")
        and value.__module__ != module.__name__
    ]
    return [module] + [m for m in dict.fromkeys(helpers) if m is not module]


def stage_calls(route) -> dict[str, list[str]]:
    """Stage module -> the stage functions a route's modules call (read from their source)."""
    calls: dict[str, list[str]] = {}
    for module in route_modules(route):
        source = inspect.getsource(module)
        for alias, value in vars(module).items():
            if inspect.ismodule(value) and value.__name__.startswith("carbonledger.stages."):
                for function in re.findall(rf"\b{alias}\.(\w+)\(", source):
                    if inspect.isfunction(getattr(value, function, None)):
                        calls.setdefault(value.__name__.rsplit(".", 1)[1], []).append(function)
    return {name: sorted(set(functions)) for name, functions in calls.items()}


def factor_patterns(route) -> list[str]:
    """Factor ids a route's modules ask for, as written in the source (``{fuel}`` marks a choice)."""
    found = []
    for module in route_modules(route):
        found += re.findall(r"""inputs\.factor\(\s*f?["']([^"']+)["']""", inspect.getsource(module))
        found += [
            f"reference: {name}"
            for name in re.findall(
                r"inputs\.(molar_mass|latent_heat_\w+|formation_enthalpy_\w+)\(", inspect.getsource(module)
            )
        ]
    return sorted(set(found))


def factors_read_in_demos() -> dict[str, dict[str, object]]:
    """Route name -> {factor id: row} of every factor and reference value each route module read
    while the demo projects were built (at well-to-wake, so every leg they carry takes part)."""
    from carbonledger.core.inputs import NumericInputs
    from carbonledger.model.factors import load_factor_set as load
    from carbonledger.routes import routes_of
    from carbonledger.routes.base import Chain
    from carbonledger.routes.project import load_project

    factor_set = load("default-2026")
    read: dict[str, dict[str, object]] = {}

    class Recording(NumericInputs):
        route = ""

        def factor(self, factor_id, unit, where="factor"):
            value = super().factor(factor_id, unit, where)
            read.setdefault(self.route, {})[factor_id] = self.used[factor_id]
            return value

        def _reference(self, value):
            read.setdefault(self.route, {})[value.id] = value
            return super()._reference(value)

    demos = sorted((ROOT / "demo_projects").glob("*.toml")) + sorted(
        (ROOT / "demo_projects" / "portfolio").glob("*.toml")
    )
    for path in demos:
        project, _ = load_project(path)
        params = project.model_dump()
        params["project"]["boundary"] = "well-to-wake"
        inputs = Recording(factor_set, str(path))
        chain = Chain(boundary="well-to-wake", product="hydrogen", reference="hydrogen_production")
        for route in routes_of(params):
            inputs.route = route.name
            route.build(params, inputs, chain)
    return read


def equation_block(function) -> str:
    found = equations(function)
    if not found:
        return "Not a closed-form expression of its arguments (text, or a sum over years): see the docstring below.\n"
    parts = []
    for condition, latex in found:
        if condition:
            parts.append(f"When {condition.replace('_', ' ')}:\n")
        parts.append(f"$$\n{latex}\n$$\n")
    return "\n".join(parts)


def used_by(stage: str) -> list:
    return [route for route in routes.REGISTRY if stage in stage_calls(route)]


def factor_table(rows: dict[str, object]) -> str:
    if not rows:
        return "None read in the demo projects.\n"
    lines = []
    for factor_id, row in sorted(rows.items()):
        lines.append(
            [
                f"`{factor_id}`",
                getattr(row, "value", ""),
                getattr(row, "unit", ""),
                getattr(row, "source", ""),
                row.grade.words,
            ]
        )
    return table(["id", "value", "unit", "source", "source grade"], lines)


def stage_page(name: str, read: dict) -> str:
    module = importlib.import_module(f"carbonledger.stages.{name}")
    title = name.replace("_", " ").capitalize()
    users = used_by(name)
    parts = [
        f"# Stage: {title}\n",
        f"Module `carbonledger.stages.{name}`. Generated from the code: the equations are the stage functions run on "
        "symbols.\n",
    ]
    parts.append("## Equations\n")
    for function in stage_functions(module):
        parts.append(f"### `{function.__name__}`\n")
        parts.append(equation_block(function))
    parts.append("\n## Where it is used\n")
    parts.append(
        ", ".join(f"`{route.name}` ({route.kind.replace('_', ' ')})" for route in users) + "\n"
        if users
        else "Not called by a route module (used by analyses).\n"
    )
    parts.append("\n## Factors read by the routes that use it\n")
    merged: dict[str, object] = {}
    for route in users:
        merged.update(read.get(route.name, {}))
    parts.append(factor_table(merged))
    parts.append("\n## Functions, units and references\n")
    parts.append(
        f"::: carbonledger.stages.{name}\n    options:\n      show_root_heading: false\n      heading_level: 3\n"
    )
    return "\n".join(parts)


def leg_page(route, read: dict) -> str:
    module = sys.modules[route.build.__module__]
    parts = [
        f"# Delivery leg: {route.name.replace('_', ' ')}\n",
        f"{route.description}.\n",
        f"Module `{module.__name__}`; stages {', '.join(f'`{s}`' for s in route.stages)}.\n",
    ]
    parts.append("```text\n" + inspect.cleandoc(module.__doc__ or "") + "\n```\n")
    parts.append("## Parameters\n")
    rows = []
    for section, model in {**route.sections, **route.optional_sections}.items():
        for field_name, info in model.model_fields.items():
            extra = info.json_schema_extra or {}
            unit = extra.get("unit", "") if isinstance(extra, dict) else ""
            default = "" if info.is_required() else info.default
            rows.append([f"`{section}.{field_name}`", unit, default, info.description or ""])
    parts.append(table(["parameter", "unit", "default", "meaning"], rows))
    parts.append("\n## Equations\n")
    for stage, functions in stage_calls(route).items():
        stage_module = importlib.import_module(f"carbonledger.stages.{stage}")
        parts.append(f"From [stage {stage.replace('_', ' ')}](../stages/{stage}.md):\n")
        for function_name in functions:
            parts.append(f"### `{stage}.{function_name}`\n")
            parts.append(equation_block(getattr(stage_module, function_name)))
    parts.append("\n## Factors it reads\n")
    patterns = factor_patterns(route)
    parts.append(
        "As asked for in the code (`{...}` is the project's choice):\n\n"
        + (
            "".join(f"- `{pattern}`\n" for pattern in patterns)
            if patterns
            else "None: the leg reads no factor of its own (its electricity comes from the project's mix).\n"
        )
    )
    parts.append("\nAs read while the demo projects were built:\n\n" + factor_table(read.get(route.name, {})))
    parts.append("\n## References\n")
    for stage in stage_calls(route):
        doc = inspect.getdoc(importlib.import_module(f"carbonledger.stages.{stage}")) or ""
        match = re.search(r"References\n-+\n(.*)", doc, re.S)
        if match:
            parts.append(f"From `carbonledger.stages.{stage}`:\n\n```text\n{match.group(1).strip()}\n```\n")
    return "\n".join(parts)


def reference_page(module: str) -> str:
    return f"# `{module}`\n\n::: {module}\n    options:\n      show_root_heading: false\n      heading_level: 2\n"


def methodology_index() -> str:
    lines = [
        "# Methodology\n",
        "One page per stage module and per delivery leg of the route registry, generated from the code.\n",
        "## Stages\n",
    ]
    lines += [f"- [{name.replace('_', ' ').capitalize()}](stages/{name}.md)" for name in stage_modules()]
    lines += ["", "## Delivery legs\n"]
    lines += [
        f"- [{route.name.replace('_', ' ').capitalize()}](legs/{route.name}.md): {route.description}"
        for route in routes.DELIVERY_LEGS
    ]
    return "\n".join(lines) + "\n"


DEMO = ROOT / "demo_projects"
SHIPPED = (
    "grey_smr_ammonia_shipped",
    "blue_atr_ammonia_shipped",
    "green_electrolysis_ammonia_shipped",
    "green_ammonia_cracked_hydrogen",
)


def demo_pictures() -> None:
    """The manual's pictures, drawn from the demo projects at every build, so they cannot go stale:
    the comparison of the four delivered pathways and the chart of one project."""
    from carbonledger import api
    from carbonledger.io.compare_output import write_chart
    from carbonledger.io.score_chart import write_score_chart

    OUT.mkdir(parents=True, exist_ok=True)
    well_to_tank = api.Assessment(api.load_factor_set(), boundary="well-to-tank")
    comparison = api.compare([DEMO / f"{name}.toml" for name in SHIPPED], well_to_tank, basis="mj")
    write_chart(comparison, OUT / "compare_demo.svg", force=True)
    write_score_chart(api.score(DEMO / "blue_atr_ammonia.toml"), OUT / "score_demo.svg", force=True)


def pages() -> dict[str, str]:
    """Every generated page: path under docs/ -> Markdown."""
    read = factors_read_in_demos()
    out = {
        "generated/rulebooks.md": rulebooks_page(),
        "generated/factors.md": factors_page(),
        "generated/methodology/index.md": methodology_index(),
    }
    out.update({f"generated/methodology/stages/{name}.md": stage_page(name, read) for name in stage_modules()})
    out.update({f"generated/methodology/legs/{route.name}.md": leg_page(route, read) for route in routes.DELIVERY_LEGS})
    out.update({f"generated/reference/{module}.md": reference_page(module) for module in PUBLIC_MODULES})
    return out


def nav() -> list:
    """The site's navigation, with every generated page."""
    return [
        {"Home": "index.md"},
        {
            "Getting started": [
                {"Quick start": "getting-started/index.md"},
                {"Install and check": "getting-started/install.md"},
            ]
        },
        {"Your own site": "own-site.md"},
        {"Reading a verdict": "verdicts.md"},
        {
            "Deliverables": [
                {"The project report": "deliverables/report.md"},
                {"The audit workbook": "deliverables/workbook.md"},
                {"Charts": "deliverables/charts.md"},
                {"The evidence pack": "deliverables/pack.md"},
            ]
        },
        {
            "What-ifs": [
                {"Comparing pathways": "what-ifs/compare.md"},
                {"Hour by hour and the operating plan": "what-ifs/matching-and-plan.md"},
                {"A revised factor set, recalc and history": "what-ifs/factor-revisions.md"},
                {"Over the operating life": "what-ifs/lifetime.md"},
                {"How sure: uncertainty": "what-ifs/uncertainty.md"},
                {"Headroom": "what-ifs/headroom.md"},
                {"Sensitivity": "what-ifs/sensitivity.md"},
                {"Portfolios on a cluster": "what-ifs/portfolios.md"},
            ]
        },
        {
            "File formats": [
                {"The project file": "formats/project-file.md"},
                {"Outputs: JSON and CSV": "formats/outputs.md"},
                {"Bad input": "formats/bad-input.md"},
            ]
        },
        {"What it takes to qualify": "qualify.md"},
        {"A team's ledger": "ledger.md"},
        {
            "Methodology": [
                {"Routes and how results are computed": "methodology/routes.md"},
                {"Delivery beyond the gate": "methodology/delivery.md"},
                {"Stages and legs: overview": "generated/methodology/index.md"},
                {
                    "Stages": [
                        {name.replace("_", " ").capitalize(): f"generated/methodology/stages/{name}.md"}
                        for name in stage_modules()
                    ]
                },
                {
                    "Delivery legs": [
                        {route.name.replace("_", " ").capitalize(): f"generated/methodology/legs/{route.name}.md"}
                        for route in routes.DELIVERY_LEGS
                    ]
                },
            ]
        },
        {"Scheme rulebooks": "generated/rulebooks.md"},
        {"Factor library": "generated/factors.md"},
        {
            "API reference": [
                {
                    module.removeprefix("carbonledger.")
                    if module != "carbonledger.routes"
                    else "routes (registry)": f"generated/reference/{module}.md"
                }
                for module in PUBLIC_MODULES
            ]
        },
    ]


def main() -> None:
    demo_pictures()
    written = 0
    for name, text in pages().items():
        path = DOCS / name
        path.parent.mkdir(parents=True, exist_ok=True)
        if (
            not path.exists() or path.read_text(encoding="utf-8") != text
        ):  # unchanged pages are left alone (mkdocs serve)
            path.write_text(text, encoding="utf-8")
            written += 1
    print(f"{written} pages written to {OUT}", file=sys.stderr)


if __name__ == "__main__":
    main()
