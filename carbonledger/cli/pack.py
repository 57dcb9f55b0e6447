"""``carbonledger pack`` and ``carbonledger verify``: the evidence pack a verifier re-scores."""

from __future__ import annotations

from pathlib import Path
from typing import Annotated

import typer

from .. import api
from ..about import CAUTION
from ..errors import InputError
from ..io.ledger import ledger_for_run, record_run
from ..io.pack import PackMismatch
from ..io.tables import display_number, plain_table
from .options import (
    FactorsOption,
    ForceOption,
    GwpOption,
    LedgerOption,
    NoLedgerOption,
    RulebookOption,
    SchemeOption,
    YearOption,
    assessment_of,
    fail,
)

PACK_MISMATCH_EXIT = 3
NOT_REPRODUCED_EXIT = 1


def pack(
    project: Annotated[Path, typer.Argument(help="Project TOML file.")],
    output: Annotated[
        Path, typer.Option("-o", "--output", metavar="PACK.zip", help="The evidence pack to write (a zip).")
    ],
    factors: FactorsOption = "default-2026",
    gwp: GwpOption = "ar6",
    scheme: SchemeOption = None,
    rulebook: RulebookOption = None,
    year: YearOption = None,
    ledger: LedgerOption = None,
    no_ledger: NoLedgerOption = False,
    force: ForceOption = False,
) -> None:
    """Write an evidence pack: the project and its files, factor overrides, result JSON, workbook, report, ledger
    records and a manifest of sha256."""
    try:
        where = ledger_for_run(ledger, not no_ledger)
        manifest, result = api.pack(
            project,
            output,
            assessment_of(factors, gwp, scheme, year=year),
            ledger=ledger,
            force=force,
            rulebooks=rulebook,
        )
        if where is not None:
            record_run("pack", [result], ledger=where)
    except InputError as error:
        fail(error)
    typer.echo(
        f"wrote {output}: {len(manifest['files'])} files and their sha256, carbonledger "
        f"{manifest['carbonledger_version']}, assessment year {manifest['assessment_year']}"
    )
    typer.echo(f"Caution: {CAUTION}")


def verify(
    pack_file: Annotated[Path, typer.Argument(help="An evidence pack written by `carbonledger pack`.")],
) -> None:
    """Check a pack against its manifest and re-score it in a fresh folder: is every figure and status reproduced?"""
    try:
        rows = api.verify_pack(pack_file)
    except PackMismatch as mismatch:
        typer.echo(f"error: {mismatch}", err=True)
        raise typer.Exit(PACK_MISMATCH_EXIT) from None
    except InputError as error:
        fail(error)
    differing = [row for row in rows if not row[3]]

    def shown(value) -> str:
        return (
            display_number(value)
            if isinstance(value, (int, float)) and not isinstance(value, bool)
            else str(value if value is not None else "-")
        )

    typer.echo(f"{pack_file}: every file matches its manifest (sha256).")
    if differing:
        typer.echo(
            plain_table(
                ["figure", "packed", "re-scored"],
                [[name, shown(old), shown(new)] for name, old, new, _ in differing],
                {"packed", "re-scored"},
            ),
            nl=False,
        )
        typer.echo(
            f"NOT reproduced: {len(differing)} of {len(rows)} figures and statuses differ from the packed result."
        )
    else:
        typer.echo(
            f"Reproduced: all {len(rows)} figures and statuses (total, intensities, stages, gases, each scheme's "
            "value, limit, status and tier) re-scored in a fresh folder equal the packed result."
        )
    typer.echo(f"Caution: {CAUTION}")
    if differing:
        raise typer.Exit(NOT_REPRODUCED_EXIT)
