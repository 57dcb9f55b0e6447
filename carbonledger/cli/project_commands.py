"""Commands on one project: ``score``, ``params``, ``init``; and ``schemes``."""

from __future__ import annotations

import json
from pathlib import Path
from typing import Annotated, Optional

import typer

from .. import api
from ..errors import InputError
from ..io.files import atomic_write
from ..io.ledger import ledger_for_run, record_run
from ..io.portfolio_output import lifetime_csv, lifetime_json, lifetime_table
from ..io.tables import csv_rows, to_csv
from ..io.tables import render as render_score
from ..model.project import parameter_table
from ..model.rulebooks import load_schemes
from ..routes.project import load_project
from ..routes.starter import normalise_choice, starter_choices, starter_project
from .options import (
    BoundaryOption,
    FactorsOption,
    FormatOption,
    GwpOption,
    LedgerOption,
    NoLedgerOption,
    OutputFormat,
    SchemeOption,
    SetOption,
    YearOption,
    explicit,
    fail,
    render,
)


def score(
    ctx: typer.Context,
    project: Annotated[Optional[Path], typer.Argument(help="Project TOML file (or use --from-workbook).")] = None,
    scheme: SchemeOption = None,
    gwp: GwpOption = "ar6",
    factors: FactorsOption = "default-2026",
    set_: SetOption = None,
    lifetime: Annotated[bool, typer.Option("--lifetime", help="Score every operating year of the project's [lifetime] and the lifetime average.")] = False,
    ledger: LedgerOption = None,
    no_ledger: NoLedgerOption = False,
    output_format: FormatOption = OutputFormat.table,
    boundary: BoundaryOption = None,
    year: YearOption = None,
    from_workbook: Annotated[Optional[Path], typer.Option("--from-workbook", help="Score the inputs and factors of an audit workbook (options default to its cover).")] = None,
) -> None:
    """Score a project: total, intensities, by stage, by gas, scheme checks."""
    try:
        where = ledger_for_run(ledger, not no_ledger)
        if (project is None) == (from_workbook is None):
            raise InputError("score", "PROJECT", "either a project TOML file or --from-workbook WORKBOOK (one of them)")
        if lifetime:
            if from_workbook is not None:
                raise InputError("--lifetime", "--from-workbook", "a project TOML file (lifetime scoring reads the project's [lifetime] section)")
            result = api.lifetime(project, factors=factors, gwp=gwp, schemes=scheme, overrides=set_, boundary=boundary)
            text = render(output_format, table=lambda: lifetime_table(result), json=lambda: lifetime_json(result), csv=lambda: lifetime_csv(result))
            command, kind = "score --lifetime", "lifetime"
        else:
            if from_workbook is not None:
                result = api.score_workbook(from_workbook, factors=explicit(ctx, "factors", factors), gwp=explicit(ctx, "gwp", gwp), schemes=scheme, overrides=set_, boundary=boundary, year=year)
            else:
                result = api.score(project, factors=factors, gwp=gwp, schemes=scheme, overrides=set_, boundary=boundary, year=year)
            text = render(output_format, table=lambda: render_score(result), json=result.to_json, csv=lambda: to_csv(csv_rows(result)))
            command, kind = "score", "score"
        if where is not None:
            record_run(command, [result], ledger=where, kind=kind)
    except InputError as error:
        fail(error)
    typer.echo(text, nl=False)


def params(
    project: Annotated[Path, typer.Argument(help="Project TOML file.")],
    set_: SetOption = None,
    output_format: FormatOption = OutputFormat.table,
) -> None:
    """List every parameter path of a project with its value and unit."""
    try:
        model, _ = load_project(project, set_)
    except InputError as error:
        fail(error)
    rows = parameter_table(model)

    def table() -> str:
        width = max(len(p) for p, *_ in rows)
        return "\n".join(f"{path:<{width}}  {value!s:<40} {unit}".rstrip() for path, value, unit, _ in rows)

    typer.echo(
        render(
            output_format,
            table=table,
            json=lambda: json.dumps([{"path": p, "value": v, "unit": u, "description": d} for p, v, u, d in rows], indent=2),
            csv=lambda: to_csv([("parameter", p, v, u) for p, v, u, _ in rows]),
        ),
        nl=False,
    )


def schemes(output_format: FormatOption = OutputFormat.table) -> None:
    """List the scheme rulebooks: quantity, basis, GWP set, electricity rule and thresholds."""
    try:
        books = load_schemes()
    except InputError as error:
        fail(error)

    def table() -> str:
        lines = []
        for s in books.values():
            tiers = "; ".join(f"{'<=' if t.inclusive else '<'} {t.limit:g}: {t.tier}" for t in sorted(s.thresholds, key=lambda t: -t.limit))
            lines += [
                f"{s.id}{' *' if s.from_memory else ''}: {s.name}",
                f"    products {', '.join(s.products)}; limits {s.quantity} [{s.unit}] on {s.basis.replace('_', ' ')}; boundary {s.boundary}",
                f"    GWP100 {s.gwp.upper()}; electricity {s.electricity.replace('_', ' ')}; thresholds {tiers}",
                f"    source: {s.document}",
            ]
            if s.version:
                lines.append(f"    version read: {s.version}")
            if s.eligibility is not None:
                lines.append(f"    eligible routes: {', '.join(s.eligibility.routes)}" + (f"; construction before {s.eligibility.construction_start_before.isoformat()}" if s.eligibility.construction_start_before else ""))
            if s.electricity_rules is not None and s.electricity == "renewable_at_zero":
                rules = s.electricity_rules
                matching = "; ".join(f"{t.period.replace('_', '-')} {('from ' + t.applies_from.isoformat()) if t.applies_from else ''}{(' until ' + t.applies_until.isoformat()) if t.applies_until else ''}".strip() for t in rules.temporal)
                lines.append(f"    counts zero: {', '.join(rules.counts_at_zero)} by {', '.join(rules.procurement)}; matching: {matching or 'none stated'}")
            if s.boundary_terms:
                lines.append(f"    formula terms: {', '.join(t.term for t in s.boundary_terms)}")
        return "\n".join(lines + ["* recorded from memory, not yet checked against the legal text"])

    def csv() -> str:
        rows = [("scheme", "name", "tier", "limit", "inclusive", "unit", "quantity", "basis", "gwp", "electricity", "from_memory", "source")]
        for s in books.values():
            for t in s.thresholds:
                rows.append((s.id, s.name, t.tier, t.limit, t.inclusive, s.unit, s.quantity, s.basis, s.gwp, s.electricity, s.from_memory or t.from_memory, t.source))
        return to_csv(rows)

    typer.echo(render(output_format, table=table, json=lambda: json.dumps([s.model_dump(mode="json") for s in books.values()], indent=2), csv=csv), nl=False)


def init(
    path: Annotated[Path, typer.Argument(help="Where to write the starter project file.")],
    route: Annotated[str, typer.Option("--route", help="A hydrogen route (hyphens or underscores): " + ", ".join(starter_choices()) + ".")],
    product: Annotated[str, typer.Option("--product", help="ammonia or hydrogen.")] = "ammonia",
    force: Annotated[bool, typer.Option("--force", help="Overwrite an existing file.")] = False,
) -> None:
    """Write a commented starter project file for a route."""
    try:
        choices = starter_choices()
        if normalise_choice(route) not in choices:
            raise InputError("--route", route, f"one of {', '.join(choices)}")
        if product.lower() not in ("ammonia", "hydrogen"):
            raise InputError("--product", product, "ammonia or hydrogen")
        text = starter_project(route, product.lower(), name=path.stem.replace("_", " "))
        atomic_write(path, lambda tmp: tmp.write_text(text, encoding="utf-8"), force=force)
    except InputError as error:
        fail(error)
    typer.echo(f"wrote {path}")
