"""Command line of the audit workbook: ``carbonledger workbook`` and ``--from-workbook`` scoring."""

from __future__ import annotations

from pathlib import Path
from typing import Annotated, Optional

import typer

from .cli import BoundaryOption, FactorsOption, GwpOption, LedgerOption, NoLedgerOption, SchemeOption, SetOption, _fail, app
from .errors import InputError


def explicit(ctx: typer.Context, name: str, value):
    """The option's value if given on the command line, else None (the workbook's own setting)."""
    source = ctx.get_parameter_source(name)  # typer may vendor its own click: compare by name
    return value if source is not None and source.name == "COMMANDLINE" else None


def boundary_overrides(boundary: str | None, overrides: list[str] | None) -> list[str]:
    """``--boundary X`` is ``--set project.boundary=X``: the project model validates it."""
    return list(overrides or []) + ([f"project.boundary={boundary}"] if boundary else [])


def score_from_workbook(ctx: typer.Context, workbook: Path, factors, gwp, scheme, set_):
    """What ``score --from-workbook`` runs: options default to the workbook's cover."""
    from .workbook_inputs import score_workbook

    return score_workbook(workbook, factors=explicit(ctx, "factors", factors), gwp=explicit(ctx, "gwp", gwp), schemes=scheme, overrides=set_)


@app.command()
def workbook(
    ctx: typer.Context,
    project: Annotated[Optional[Path], typer.Argument(help="Project TOML file (or use --from-workbook).")] = None,
    output: Annotated[Path, typer.Option("-o", "--output", help="Workbook to write (.xlsx).")] = ...,
    scheme: SchemeOption = None,
    gwp: GwpOption = "ar6",
    factors: FactorsOption = "default-2026",
    set_: SetOption = None,
    boundary: BoundaryOption = None,
    periods: Annotated[Optional[Path], typer.Option("--periods", help="CSV of metered monthly data: one calculation block per month and a yearly summary.")] = None,
    from_workbook: Annotated[Optional[Path], typer.Option("--from-workbook", help="Read inputs and edited factors from an earlier audit workbook.")] = None,
    force: Annotated[bool, typer.Option("--force", help="Overwrite an existing output file.")] = False,
    ledger: LedgerOption = None,
    no_ledger: NoLedgerOption = False,
) -> None:
    """Write an audit workbook: inputs, cited factors, every exchange as a live formula, results, checks, chart."""
    from .outputs.workbook import audit_workbook, write_workbook_file
    from .ledger import ledger_for_run, record_run
    from .project import BOUNDARIES

    try:
        where = ledger_for_run(ledger, not no_ledger)
        if (project is None) == (from_workbook is None):
            raise InputError("workbook", "PROJECT", "either a project TOML file or --from-workbook WORKBOOK (one of them)")
        if boundary is not None and boundary not in BOUNDARIES:
            raise InputError("--boundary", boundary, f"one of {', '.join(BOUNDARIES)}")
        if output.exists() and not force:
            raise InputError(output, "", "a path that does not exist yet (the file exists; pass --force to overwrite it)")
        book, result = audit_workbook(
            project,
            from_workbook=from_workbook,
            factors=explicit(ctx, "factors", factors),
            gwp=explicit(ctx, "gwp", gwp),
            schemes=scheme,
            overrides=boundary_overrides(boundary, set_),
            periods=periods,
        )
        write_workbook_file(output, book, force=force)
        if where is not None:
            record_run("workbook", [result], ledger=where)
    except InputError as error:
        _fail(error)
    typer.echo(f"wrote {output}: {result.total:,.4g} {result.unit} ({result.gwp_basis.upper()}, factor set {result.factor_set.name}); {result.caution}")
