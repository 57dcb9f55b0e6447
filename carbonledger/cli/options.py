"""What every command shares: its options, the one-line error, and the one format dispatcher."""

from __future__ import annotations

from collections.abc import Callable
from datetime import datetime, timedelta
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
LedgerOption = Annotated[Optional[str], typer.Option("--ledger", help="Run ledger: an SQLite file or a postgresql:// URL (password from libpq: PGPASSWORD, ~/.pgpass or a service file); default $CARBONLEDGER_LEDGER or a file in the user's data folder.")]
NoLedgerOption = Annotated[bool, typer.Option("--no-ledger", help="Do not record this run in the ledger.")]
BoundaryOption = Annotated[Optional[str], typer.Option("--boundary", metavar="BOUNDARY", help="cradle-to-gate, well-to-tank or well-to-wake; default: the project's own.")]
WorkersOption = Annotated[Optional[int], typer.Option("--workers", help="Run on a local Dask cluster of N worker processes.")]
SchedulerOption = Annotated[Optional[str], typer.Option("--scheduler", metavar="ADDRESS", help="Run on an existing Dask scheduler at this address (tcp://HOST:PORT).")]
YearOption = Annotated[Optional[int], typer.Option("--year", metavar="YEAR", help="Assessment year: the scheme rules in force that year decide (temporal matching, additionality, credit period); default the first full calendar year after the project's commissioning date, else this year.")]
_TIMES = ["%Y-%m-%d", "%Y-%m-%dT%H:%M", "%Y-%m-%dT%H:%M:%S"]
UserOption = Annotated[Optional[str], typer.Option("--user", help="Only the records made by this user (as recorded: $CARBONLEDGER_USER or the login name).")]
SinceOption = Annotated[Optional[datetime], typer.Option("--since", formats=_TIMES, help="Only records made at or after this time (UTC): YYYY-MM-DD or YYYY-MM-DDTHH:MM.")]
UntilOption = Annotated[Optional[datetime], typer.Option("--until", formats=_TIMES, help="Only records made before this time (UTC); a date alone includes that whole day.")]
ForceOption = Annotated[bool, typer.Option("--force", help="Overwrite an existing output file.")]


def end_of(until: datetime | None) -> datetime | None:
    """The exclusive end of an --until time: a date alone (midnight) means the end of that day."""
    if until is None or (until.hour, until.minute, until.second, until.microsecond) != (0, 0, 0, 0):
        return until
    return until + timedelta(days=1)


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
    check_output_path(chart, force, "--chart")


def check_output_path(path: Path, force: bool, option: str) -> None:
    """Refuse, before any work, an output path that ``atomic_write`` would refuse after it: a folder, an
    existing file without --force, a missing folder. A command checks every output first, then writes."""
    if path.is_dir():
        raise InputError(path, option, "a file path, not a folder (a folder is never overwritten, even with --force)")
    if path.exists() and not force:
        raise InputError(path, option, "a path that does not exist yet (the file exists; pass --force to overwrite it)")
    folder = path.parent if str(path.parent) else Path(".")
    if not folder.is_dir():
        raise InputError(path, option, f"a path in an existing folder ('{folder}' does not exist)")
