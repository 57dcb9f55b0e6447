"""``carbonledger ledger``: create or upgrade a ledger's schema, export its records, copy it elsewhere."""

from __future__ import annotations

from enum import StrEnum
from pathlib import Path
from typing import Annotated, Optional

import typer

from ..about import CAUTION
from ..analyses.portfolio import project_files
from ..core.results import strict_json
from ..errors import InputError
from ..io.csv_text import csv_text
from ..io.files import atomic_write
from ..io.ledger import copy_ledger, read_records, record_filter, upgrade_ledger
from ..io.ledger_store import locate
from ..io.portfolio_output import EXPORT_HEADER, export_rows
from .options import ForceOption, LedgerOption, SinceOption, UntilOption, UserOption, WordsGroup, end_of, fail

LedgerArgument = Annotated[
    Optional[str],
    typer.Argument(
        help="An SQLite file or a postgresql:// URL; default $CARBONLEDGER_LEDGER or the file in the user's data "
        "folder."
    ),
]


class ExportFormat(StrEnum):
    csv = "csv"
    json = "json"


def upgrade(ledger: LedgerArgument = None) -> None:
    """Create the ledger's tables, or run the migrations it lacks (a PostgreSQL ledger needs this once)."""
    try:
        where = locate(ledger)
        before, after = upgrade_ledger(where)
    except InputError as error:
        fail(error)
    done = (
        "already at schema"
        if before == after
        else "created with schema"
        if before == 0
        else f"upgraded from schema {before} to"
    )
    typer.echo(f"ledger {where}: {done} {after}")


def export(
    project: Annotated[
        Optional[list[Path]],
        typer.Option("--project", help="Only these project files, or the projects in these folders (repeatable)."),
    ] = None,
    user: UserOption = None,
    since: SinceOption = None,
    until: UntilOption = None,
    output_format: Annotated[
        ExportFormat,
        typer.Option("--format", help="csv (one row per record and scheme check) or json (one object per record)."),
    ] = ExportFormat.csv,
    output: Annotated[
        Optional[Path],
        typer.Option("--output", "-o", help="Write to this file (atomically) instead of standard output."),
    ] = None,
    force: ForceOption = False,
    ledger: LedgerOption = None,
) -> None:
    """The records of complete runs, for a BI tool: who, when, which files and factor sets, the results."""
    try:
        paths = project_files(project) if project else []
        entries = read_records(ledger, record_filter(paths, user, since, end_of(until)), content=False)
        if output_format is ExportFormat.json:
            text = strict_json({"caution": CAUTION, "ledger": str(locate(ledger)), "records": entries}, "export")
        else:
            text = csv_text(EXPORT_HEADER, export_rows(entries), caution=CAUTION)
        if output is not None:
            atomic_write(output, lambda path: path.write_text(text, encoding="utf-8"), force=force)
    except InputError as error:
        fail(error)
    if output is None:
        typer.echo(text, nl=not text.endswith("\n"))
    else:
        typer.echo(f"{len(entries)} records written to {output}", err=True)


def copy(
    source: Annotated[str, typer.Argument(help="The ledger to copy from (SQLite file or postgresql:// URL).")],
    target: Annotated[
        str,
        typer.Argument(
            help="The ledger to copy into (a new SQLite file is created; a PostgreSQL ledger must exist: `ledger "
            "upgrade URL`)."
        ),
    ],
) -> None:
    """Copy every complete run and record to another ledger, checked by count and sha256 on both sides."""
    try:
        report = copy_ledger(source, target)
    except InputError as error:
        fail(error)
    typer.echo(
        f"copied {report.runs_copied} runs ({report.records_copied} records) from {report.source} to {report.target}"
    )
    typer.echo(
        f"checked: {report.target} holds all {report.records} records of the {report.runs} runs of {report.source}, "
        "each matching its sha256"
    )
    typer.echo(f"sha256 of their sorted record hashes, on both sides: {report.sha256}")


def ledger() -> None:
    """The run ledger: create or upgrade it, export its records, copy it to another ledger."""


app = typer.Typer(cls=WordsGroup, no_args_is_help=True, rich_markup_mode=None, add_completion=False)
app.callback()(ledger)
app.command("upgrade")(upgrade)
app.command("export")(export)
app.command("copy")(copy)
