"""Command line: a thin typer layer over the library API.

Every bad input ends in one line on stderr (``error: FILE: FIELD: expected ...``) and exit code 2.
"""

from __future__ import annotations

import json
import sys
from enum import Enum
from pathlib import Path
from typing import Annotated, Optional

import typer

from .errors import InputError

app = typer.Typer(add_completion=False, no_args_is_help=True, help="Carbon intensity of hydrogen and ammonia routes, with cited factors and scheme checks. Estimates for screening and reporting support, not a certification.")
factors_app = typer.Typer(no_args_is_help=True, help="Browse the factor library.")
app.add_typer(factors_app, name="factors")


class OutputFormat(str, Enum):
    table = "table"
    json = "json"
    csv = "csv"


FactorsOption = Annotated[str, typer.Option("--factors", help="Factor set name, set folder, or override CSV over the default set.")]
GwpOption = Annotated[str, typer.Option("--gwp", help="GWP100 set of the headline result: ar4, ar5 or ar6.")]
SchemeOption = Annotated[Optional[list[str]], typer.Option("--scheme", help="Scheme id to check (repeatable); default: all that apply.")]
SetOption = Annotated[Optional[list[str]], typer.Option("--set", help="Override a project parameter: dotted.path=value (repeatable).")]
FormatOption = Annotated[OutputFormat, typer.Option("--format", help="table, json or csv.")]
LedgerOption = Annotated[Optional[Path], typer.Option("--ledger", help="Run ledger (SQLite) to record in; default $CARBONLEDGER_LEDGER or the user's data folder.")]
NoLedgerOption = Annotated[bool, typer.Option("--no-ledger", help="Do not record this run in the ledger.")]
BoundaryOption = Annotated[Optional[str], typer.Option("--boundary", help="cradle-to-gate, well-to-tank or well-to-wake; default: the project's own.")]


def _fail(error: InputError) -> None:
    typer.echo(f"error: {error}", err=True)
    raise typer.Exit(2)


@app.command()
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
    from_workbook: Annotated[Optional[Path], typer.Option("--from-workbook", help="Score the inputs and factors of an audit workbook (options default to its cover).")] = None,
) -> None:
    """Score a project: total, intensities, by stage, by gas, scheme checks."""
    from .api import score as run
    from .ledger import ledger_for_run, record_run

    try:
        where = ledger_for_run(ledger, not no_ledger)
        if (project is None) == (from_workbook is None):
            raise InputError("score", "PROJECT", "either a project TOML file or --from-workbook WORKBOOK (one of them)")
        if lifetime:
            if from_workbook is not None:
                raise InputError("--lifetime", "--from-workbook", "a project TOML file (lifetime scoring reads the project's [lifetime] section)")
            from .cli_recalc import score_lifetime

            overrides = list(set_ or []) + ([f'project.boundary="{boundary}"'] if boundary else [])
            score_lifetime(project, factors=factors, gwp=gwp, schemes=scheme, overrides=overrides, ledger=where, output_format=output_format)
            return
        if from_workbook is not None:
            from .cli_workbook import boundary_overrides, score_from_workbook

            result = score_from_workbook(ctx, from_workbook, factors, gwp, scheme, boundary_overrides(boundary, set_))
        else:
            result = run(project, factors=factors, gwp=gwp, schemes=scheme, overrides=set_, boundary=boundary)
        if where is not None:
            record_run("score", [result], ledger=where)
    except InputError as error:
        _fail(error)
    if output_format is OutputFormat.json:
        typer.echo(result.to_json())
    elif output_format is OutputFormat.csv:
        from .outputs.text import csv_rows, to_csv

        typer.echo(to_csv(csv_rows(result)), nl=False)
    else:
        from .outputs.text import render

        typer.echo(render(result), nl=False)


@app.command()
def params(
    project: Annotated[Path, typer.Argument(help="Project TOML file.")],
    set_: SetOption = None,
    output_format: FormatOption = OutputFormat.table,
) -> None:
    """List every parameter path of a project with its value and unit."""
    from .project import load_project, parameter_table

    try:
        model, _ = load_project(project, set_)
    except InputError as error:
        _fail(error)
    rows = parameter_table(model)
    if output_format is OutputFormat.json:
        typer.echo(json.dumps([{"path": p, "value": v, "unit": u, "description": d} for p, v, u, d in rows], indent=2))
    elif output_format is OutputFormat.csv:
        from .outputs.text import to_csv

        typer.echo(to_csv([("parameter", p, v, u) for p, v, u, _ in rows]), nl=False)
    else:
        width = max(len(p) for p, *_ in rows)
        for path, value, unit, _ in rows:
            typer.echo(f"{path:<{width}}  {value!s:<40} {unit}".rstrip())


@factors_app.command("list")
def factors_list(
    factors: FactorsOption = "default-2026",
    prefix: Annotated[str, typer.Option("--prefix", help="Only ids starting with this text.")] = "",
    output_format: FormatOption = OutputFormat.table,
) -> None:
    """List the factors of a set: id, value, unit, source; '*' marks values from memory."""
    from .factors import load_factor_set

    try:
        factor_set = load_factor_set(factors)
    except InputError as error:
        _fail(error)
    rows = [f for key, f in sorted(factor_set.factors.items()) if key.startswith(prefix)]
    if output_format is OutputFormat.json:
        from dataclasses import asdict

        typer.echo(json.dumps([asdict(f) for f in rows], indent=2))
        return
    if output_format is OutputFormat.csv:
        from .outputs.text import to_csv

        typer.echo(to_csv([("factor", f.id, f.value, f.unit) for f in rows]), nl=False)
        return
    typer.echo(f"factor set {factor_set.name} (sha256 {factor_set.sha256}); * = from memory, not checked against the document")
    width = max((len(f.id) for f in rows), default=10)
    for f in rows:
        typer.echo(f"{'*' if f.from_memory else ' '} {f.id:<{width}}  {f.value:>10g} {f.unit:<16} {f.source[:60]}")


@factors_app.command("show")
def factors_show(
    factor_id: Annotated[str, typer.Argument(help="Factor id, e.g. combustion.natural_gas.co2")],
    factors: FactorsOption = "default-2026",
) -> None:
    """Show one factor with its full source."""
    from .factors import load_factor_set

    try:
        factor = load_factor_set(factors).get(factor_id, "FACTOR_ID")
    except InputError as error:
        _fail(error)
    for label, value in (
        ("id", factor.id),
        ("value", f"{factor.value:g} {factor.unit}"),
        ("source", factor.source),
        ("table or article", factor.table or "-"),
        ("year", factor.year or "-"),
        ("region", factor.region or "-"),
        ("note", factor.note or "-"),
        ("checked against document", "no (from memory)" if factor.from_memory else "yes"),
        ("file", factor.origin),
    ):
        typer.echo(f"{label:>26}: {value}")


@app.command()
def schemes(output_format: FormatOption = OutputFormat.table) -> None:
    """List the scheme rulebooks: quantity, basis, GWP set, electricity rule and thresholds."""
    from .schemes import load_schemes

    try:
        rulebooks = load_schemes()
    except InputError as error:
        _fail(error)
    if output_format is OutputFormat.json:
        typer.echo(json.dumps([s.model_dump() for s in rulebooks.values()], indent=2))
        return
    for s in rulebooks.values():
        tiers = "; ".join(f"{'<=' if t.inclusive else '<'} {t.limit:g}: {t.tier}" for t in sorted(s.thresholds, key=lambda t: -t.limit))
        typer.echo(f"{s.id}{' *' if s.from_memory else ''}: {s.name}")
        typer.echo(f"    products {', '.join(s.products)}; limits {s.quantity} [{s.unit}] on {s.basis.replace('_', ' ')}; boundary {s.boundary}")
        typer.echo(f"    GWP100 {s.gwp.upper()}; electricity {s.electricity.replace('_', ' ')}; thresholds {tiers}")
        typer.echo(f"    source: {s.document}")
    typer.echo("* recorded from memory, not yet checked against the legal text")


@app.command()
def init(
    path: Annotated[Path, typer.Argument(help="Where to write the starter project file.")],
    route: Annotated[str, typer.Option("--route", help="steam-methane-reforming, steam-methane-reforming-with-capture, autothermal-reforming-with-capture or electrolysis.")],
    product: Annotated[str, typer.Option("--product", help="ammonia or hydrogen.")] = "ammonia",
    force: Annotated[bool, typer.Option("--force", help="Overwrite an existing file.")] = False,
) -> None:
    """Write a commented starter project file for a route."""
    from .outputs.files import atomic_write
    from .starter import ROUTE_CHOICES, starter_project

    try:
        if route not in ROUTE_CHOICES:
            raise InputError("--route", route, f"one of {', '.join(ROUTE_CHOICES)}")
        if product not in ("ammonia", "hydrogen"):
            raise InputError("--product", product, "ammonia or hydrogen")
        text = starter_project(route, product, name=path.stem.replace("_", " "))
        atomic_write(path, lambda tmp: tmp.write_text(text, encoding="utf-8"), force=force)
    except InputError as error:
        _fail(error)
    typer.echo(f"wrote {path}")


def main() -> None:
    try:
        app()
    except BrokenPipeError:  # e.g. piped into head
        sys.stderr.close()
        sys.exit(0)


from . import cli_compare, cli_recalc, cli_workbook  # noqa: E402,F401
