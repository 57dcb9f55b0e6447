"""What every command shares: its options, the one-line error, and the one format dispatcher."""

from __future__ import annotations

from collections.abc import Callable
from enum import StrEnum
from pathlib import Path
from typing import Annotated, Optional, get_args

import typer

from ..errors import InputError
from ..io.chart_files import CHART_FORMATS


class OutputFormat(StrEnum):
    table = "table"
    json = "json"
    csv = "csv"


FactorsOption = Annotated[str, typer.Option("--factors", metavar="SET", help="Factor set name, set folder, or override CSV over the default set.")]
GwpOption = Annotated[str, typer.Option("--gwp", metavar="ar4|ar5|ar6", help="GWP100 set of the headline result: ar4, ar5 or ar6.")]
SchemeOption = Annotated[Optional[list[str]], typer.Option("--scheme", metavar="ID", help="Scheme id to check (repeatable); default: all that apply.")]
SetOption = Annotated[Optional[list[str]], typer.Option("--set", metavar="PATH=VALUE", help="Override a project parameter: dotted.path=value (repeatable).")]
FormatOption = Annotated[OutputFormat, typer.Option("--format", help="table, json or csv.")]
LedgerOption = Annotated[Optional[Path], typer.Option("--ledger", help="Run ledger (SQLite) to record in; default $CARBONLEDGER_LEDGER or the user's data folder.")]
NoLedgerOption = Annotated[bool, typer.Option("--no-ledger", help="Do not record this run in the ledger.")]
BoundaryOption = Annotated[Optional[str], typer.Option("--boundary", metavar="BOUNDARY", help="cradle-to-gate, well-to-tank or well-to-wake; default: the project's own.")]
WorkersOption = Annotated[Optional[int], typer.Option("--workers", help="Run on a local Dask cluster of N worker processes.")]
SchedulerOption = Annotated[Optional[str], typer.Option("--scheduler", metavar="ADDRESS", help="Run on an existing Dask scheduler at this address (tcp://HOST:PORT).")]
YearOption = Annotated[Optional[int], typer.Option("--year", metavar="YEAR", help="Calendar year whose dates the scheme rules are read on (dated rule versions); default: this year.")]
ForceOption = Annotated[bool, typer.Option("--force", help="Overwrite an existing output file.")]


VALUE_WORDS = {"Path": "FILE", "int": "N", "float": "NUMBER", "str": "TEXT"}


def value_word(param) -> str | None:
    """What an option or argument takes, in words for --help: FILE, N, NUMBER, TEXT or its choices
    (None for a flag). Reads typer's description of the parameter, or click's type."""
    described = getattr(param, "type_descriptor", None)
    if described is not None:
        choices = described.choices if described.is_choice else None
        annotation = get_args(described.annotation)[0] if described.is_list else described.annotation
    else:
        choices = getattr(param.type, "choices", None)
        annotation = {"path": Path, "integer": int, "float": float, "boolean": bool}.get(param.type.name, str)
    if choices:
        return "|".join(str(getattr(choice, "value", choice)) for choice in choices)
    if annotation is bool or getattr(param, "is_flag", False):
        return None
    return VALUE_WORDS.get(getattr(annotation, "__name__", ""), "TEXT")


def words_for_types(command) -> None:
    """--help shows words, not Python types (``--scheme TEXT`` rather than ``<list[str]>``): every
    option without a metavar of its own gets ``value_word``; every argument shows its word too."""
    for param in command.params:
        word = value_word(param)
        if word is None:
            continue
        if param.param_type_name == "option":
            if param.metavar is None:
                param.metavar = word
        else:
            shown = word + ("..." if param.nargs != 1 else "")
            param.display_type_rich = lambda ctx, shown=shown: shown  # typer shows an argument's type, not its metavar


def one_line_usage_error(error) -> None:
    """A mistyped option or argument (click's usage errors) reported like every other bad input:
    one line on stderr, ``error: COMMAND: what was wrong``, exit code 2 (``--help`` still helps)."""
    where = error.ctx.command_path if getattr(error, "ctx", None) is not None else "carbonledger"

    def show(file=None) -> None:
        typer.echo(f"error: {where}: {error.format_message()} (see `{where} --help`)", err=True)

    error.show = show


class WordsGroup(typer.core.TyperGroup):
    """The app's command group: each command it hands out shows words, not types, in --help, and a
    usage error is one line."""

    def invoke(self, ctx):
        try:
            return super().invoke(ctx)
        except Exception as error:
            if any(kind.__name__ == "UsageError" for kind in type(error).__mro__):
                one_line_usage_error(error)
            raise

    def get_command(self, ctx, name):
        command = super().get_command(ctx, name)
        if command is not None and not hasattr(command, "commands"):
            words_for_types(command)
        return command


def fail(error: InputError) -> None:
    """Print one line on stderr and exit 2."""
    typer.echo(f"error: {error}", err=True)
    raise typer.Exit(2)


def render(output_format: OutputFormat, *, table: Callable[[], str], json: Callable[[], str], csv: Callable[[], str]) -> str:
    """The output text of a command in the chosen format (every command offers all three)."""
    text = {OutputFormat.table: table, OutputFormat.json: json, OutputFormat.csv: csv}[output_format]()
    return text if text.endswith("\n") else text + "\n"


def explicit(ctx: typer.Context, name: str, value):
    """The option's value if given on the command line, else None (a workbook's own setting)."""
    source = ctx.get_parameter_source(name)  # typer may vendor its own click: compare by name
    return value if source is not None and source.name == "COMMANDLINE" else None


def check_chart_path(chart: Path | None, force: bool) -> None:
    """Refuse a chart path before any work: a suffix other than .png or .svg, or an existing file without --force."""
    if chart is None:
        return
    if chart.suffix.lower().lstrip(".") not in CHART_FORMATS:
        raise InputError(chart, "--chart", f"a file ending in .png or .svg, got '{chart.suffix or 'no suffix'}'")
    if chart.exists() and not force:
        raise InputError(chart, "--chart", "a path that does not exist yet (the file exists; pass --force to overwrite it)")
