"""Command line: a thin typer layer over the library API (``carbonledger.api``).

Every bad input ends in one line on stderr (``error: FILE: FIELD: expected ...``) and exit code 2.
Each command module holds plain functions; this module builds the app and registers them.
"""

from __future__ import annotations

import sys
from typing import Annotated

import typer

from ..about import __version__
from . import compare, factors, pack, plan, project_commands, recalc, report, uncertainty, workbook
from .options import WordsGroup

app = typer.Typer(
    cls=WordsGroup,
    add_completion=False,
    no_args_is_help=True,
    rich_markup_mode=None,
    help="Carbon intensity of hydrogen and ammonia routes, with cited factors and scheme checks. Estimates for screening and reporting support, not a certification.",
)
factors_app = typer.Typer(cls=WordsGroup, no_args_is_help=True, rich_markup_mode=None, help="Browse the factor library.")
app.add_typer(factors_app, name="factors")


def _version(value: bool) -> None:
    if value:
        typer.echo(f"carbonledger {__version__}")
        raise typer.Exit()


@app.callback()
def _main(
    version: Annotated[bool, typer.Option("--version", callback=_version, is_eager=True, help="Print the version and exit.")] = False,
) -> None:
    """Carbon intensity of hydrogen and ammonia routes, with cited factors and scheme checks. Estimates for screening and reporting support, not a certification."""


app.command()(project_commands.score)
app.command()(project_commands.params)
app.command()(compare.compare)
app.command()(workbook.workbook)
app.command()(report.report)
app.command()(recalc.recalc)
app.command()(recalc.history)
app.command()(plan.plan)
app.command()(project_commands.schemes)
app.command()(uncertainty.uncertainty)
app.command()(uncertainty.headroom)
app.command()(uncertainty.sensitivity)
app.command()(project_commands.init)
app.command()(pack.pack)
app.command()(pack.verify)
factors_app.command("list")(factors.factors_list)
factors_app.command("search")(factors.factors_search)
factors_app.command("show")(factors.factors_show)
factors_app.command("sets")(factors.factors_sets)
factors_app.command("diff")(factors.factors_diff)


def main() -> None:
    try:
        app()
    except BrokenPipeError:  # e.g. piped into head
        sys.stderr.close()
        sys.exit(0)
