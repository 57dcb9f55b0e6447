"""``carbonledger workbook``: write the audit workbook of a project (or of an earlier workbook)."""

from __future__ import annotations

from pathlib import Path
from typing import Annotated, Optional

import typer

from .. import api
from ..errors import InputError
from ..io.ledger import ledger_for_run, record_run
from ..io.workbook.writer import write_workbook_file
from .options import (
    BoundaryOption,
    FactorsOption,
    ForceOption,
    GwpOption,
    LedgerOption,
    NoLedgerOption,
    SchemeOption,
    SetOption,
    explicit,
    fail,
)


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
    force: ForceOption = False,
    ledger: LedgerOption = None,
    no_ledger: NoLedgerOption = False,
) -> None:
    """Write an audit workbook: inputs, cited factors, every exchange as a live formula, results, checks, chart."""
    try:
        where = ledger_for_run(ledger, not no_ledger)
        if (project is None) == (from_workbook is None):
            raise InputError("workbook", "PROJECT", "either a project TOML file or --from-workbook WORKBOOK (one of them)")
        if output.suffix.lower() != ".xlsx":
            raise InputError(output, "--output", f"a file ending in .xlsx (an Excel workbook), got '{output.suffix or 'no suffix'}'")
        if output.is_dir():
            raise InputError(output, "--output", "a file path, not a folder")
        if output.exists() and not force:
            raise InputError(output, "", "a path that does not exist yet (the file exists; pass --force to overwrite it)")
        book, result = api.audit_workbook(
            project,
            from_workbook=from_workbook,
            factors=explicit(ctx, "factors", factors),
            gwp=explicit(ctx, "gwp", gwp),
            schemes=scheme,
            overrides=set_,
            boundary=boundary,
            periods=periods,
        )
        write_workbook_file(output, book, force=force)
        if where is not None:
            record_run("workbook", [result], ledger=where)
    except InputError as error:
        fail(error)
    typer.echo(f"wrote {output}: {result.total:,.4g} {result.unit} ({result.gwp_basis.upper()}, factor set {result.factor_set.name}); {result.caution}")
