"""What every command shares: its options, the one-line error, and the one format dispatcher."""

from __future__ import annotations

import json as json_module
from collections.abc import Callable
from datetime import datetime, timedelta
from enum import StrEnum
from pathlib import Path
from typing import Annotated, Optional

import typer

from .. import api
from ..core.results import strict_json
from ..errors import InputError
from ..io.chart_files import CHART_FORMATS
from ..io.formats import formats, output_text
from ..io.tables import user_rulebook_line
from ..model.project import rebalance_override
from ..model.rulebooks import reset_user_rulebooks, set_user_rulebooks, user_rulebooks
from .words import WordsGroup, words_for_types  # noqa: F401  (re-exported: the commands' groups use them)

OutputFormat = StrEnum("OutputFormat", {name: name for name in formats()})  # io.formats: built-in and registered


FactorsOption = Annotated[
    str,
    typer.Option("--factors", metavar="SET", help="Factor set name, set folder, or override CSV over the default set."),
]
GwpOption = Annotated[
    str, typer.Option("--gwp", metavar="ar4|ar5|ar6", help="GWP100 set of the headline result: ar4, ar5 or ar6.")
]
SchemeOption = Annotated[
    Optional[list[str]],
    typer.Option("--scheme", metavar="ID", help="Scheme id to check (repeatable); default: all that apply."),
]


def use_rulebooks(ctx: typer.Context, paths: list[Path] | None) -> list[Path] | None:
    """--rulebook: read and check the user's rulebooks before any work and put them in use for the
    command (checked beside the shipped schemes); one line and exit 2 for a bad file."""
    if not paths:
        return paths
    try:
        found = api.user_rulebooks(paths)
    except InputError as error:
        fail(error)
    token = set_user_rulebooks(found)
    ctx.call_on_close(lambda: reset_user_rulebooks(token))
    return paths


RulebookOption = Annotated[
    Optional[list[Path]],
    typer.Option(
        "--rulebook",
        metavar="FILE.toml",
        callback=use_rulebooks,
        help="A rulebook of your own (an offtake contract, a corporate target) in the format of the shipped ones: "
        "checked beside the schemes, marked user rulebook (repeatable).",
    ),
]
RebalanceOption = Annotated[
    Optional[str],
    typer.Option(
        "--rebalance",
        metavar="SOURCE",
        help="After the --set overrides, this electricity source's share takes up the difference so the shares sum to "
        "1.",
    ),
]
SetOption = Annotated[
    Optional[list[str]],
    typer.Option("--set", metavar="PATH=VALUE", help="Override a project parameter: dotted.path=value (repeatable)."),
]
FormatOption = Annotated[OutputFormat, typer.Option("--format", help="table, json or csv.")]
LedgerOption = Annotated[
    Optional[str],
    typer.Option(
        "--ledger",
        help="Run ledger: an SQLite file or a postgresql:// URL (password from libpq: PGPASSWORD, ~/.pgpass or a "
        "service file); default $CARBONLEDGER_LEDGER or a file in the user's data folder.",
    ),
]
NoLedgerOption = Annotated[bool, typer.Option("--no-ledger", help="Do not record this run in the ledger.")]
BoundaryOption = Annotated[
    Optional[str],
    typer.Option(
        "--boundary",
        metavar="BOUNDARY",
        help="cradle-to-gate, well-to-tank or well-to-wake; default: the project's own.",
    ),
]
WorkersOption = Annotated[
    Optional[int], typer.Option("--workers", help="Run on a local Dask cluster of N worker processes.")
]
SchedulerOption = Annotated[
    Optional[str],
    typer.Option(
        "--scheduler", metavar="ADDRESS", help="Run on an existing Dask scheduler at this address (tcp://HOST:PORT)."
    ),
]
YearOption = Annotated[
    Optional[int],
    typer.Option(
        "--year",
        metavar="YEAR",
        help="Assessment year: the scheme rules in force that year decide (temporal matching, additionality, credit "
        "period); default the first full calendar year after the project's commissioning date, else this year.",
    ),
]
_TIMES = ["%Y-%m-%d", "%Y-%m-%dT%H:%M", "%Y-%m-%dT%H:%M:%S"]
UserOption = Annotated[
    Optional[str],
    typer.Option(
        "--user", help="Only the records made by this user (as recorded: $CARBONLEDGER_USER or the login name)."
    ),
]
SinceOption = Annotated[
    Optional[datetime],
    typer.Option(
        "--since", formats=_TIMES, help="Only records made at or after this time (UTC): YYYY-MM-DD or YYYY-MM-DDTHH:MM."
    ),
]
UntilOption = Annotated[
    Optional[datetime],
    typer.Option(
        "--until",
        formats=_TIMES,
        help="Only records made before this time (UTC); a date alone includes that whole day.",
    ),
]
ForceOption = Annotated[bool, typer.Option("--force", help="Overwrite an existing output file.")]


def end_of(until: datetime | None) -> datetime | None:
    """The exclusive end of an --until time: a date alone (midnight) means the end of that day."""
    if until is None or (until.hour, until.minute, until.second, until.microsecond) != (0, 0, 0, 0):
        return until
    return until + timedelta(days=1)


def with_rebalance(overrides: list[str] | None, source: str | None) -> list[str] | None:
    """The --set overrides with --rebalance SOURCE last: that source's share is 1 less the others'."""
    return overrides if source is None else [*(overrides or []), rebalance_override(source)]


def assessment_of(
    factors,
    gwp: str | None,
    schemes: list[str] | None = None,
    overrides: list[str] | None = None,
    boundary: str | None = None,
    year: int | None = None,
    matching: str | None = None,
    *,
    cover: Path | None = None,
):
    """The command's common options as one ``Assessment``, built (and checked) once and passed to the api.
    ``factors``: a set name, folder or override CSV, or a loaded set. ``cover``: an audit workbook whose cover settings
    stand for a factor set, GWP set or schemes not given
    (``factors``/``gwp`` None: not given on the command line; without a cover, the defaults)."""
    if cover is not None:
        found = api.cover_assessment(cover, factors, gwp, schemes)
        return found.but(overrides=tuple(overrides or ()), boundary=boundary, year=year, matching=matching)
    chosen = api.factor_set_of(factors) if factors is not None else api.load_factor_set()
    return api.Assessment(
        chosen,
        schemes=tuple(schemes) if schemes else None,
        overrides=tuple(overrides or ()),
        boundary=boundary,
        year=year,
        matching=matching,
        **({"gwp": gwp} if gwp is not None else {}),
    )


def workbook_assessment(ctx: typer.Context, factors, gwp, schemes, overrides, boundary, year, cover: Path):
    """``assessment_of`` for a command reading an audit workbook (``--from-workbook``): a factor set or GWP set
    not given on the command line is the cover's."""
    return assessment_of(
        explicit(ctx, "factors", factors), explicit(ctx, "gwp", gwp), schemes, overrides, boundary, year, cover=cover
    )


def fail(error: InputError) -> None:
    """Print one line on stderr and exit 2."""
    typer.echo(f"error: {error}", err=True)
    raise typer.Exit(2)


def render(
    output_format: OutputFormat, *, table: Callable[[], str], json: Callable[[], str], csv: Callable[[], str]
) -> str:
    """The output text of a command in the chosen format (``io.formats``: every command offers every format)."""
    text = output_text(output_format, table=table, json_text=lambda: json_naming_user_rulebooks(json()), csv=csv)
    if (
        output_format == OutputFormat.table
    ):  # every table names the user rulebooks in use (a score's names them already)
        text += "".join(line + "\n" for line in map(user_rulebook_line, user_rulebooks().values()) if line not in text)
    return text


def render_result(output_format: OutputFormat, result, table: Callable, json: Callable, csv: Callable) -> str:
    """``render`` of one result by three functions of it (its table, JSON and CSV)."""
    return render(output_format, table=lambda: table(result), json=lambda: json(result), csv=lambda: csv(result))


def json_naming_user_rulebooks(text: str) -> str:
    """A JSON object with ``user_rulebooks`` (id and file of each in use) at its top level; as it was without any."""
    if not user_rulebooks():
        return text
    data = json_module.loads(text)
    if not isinstance(data, dict):
        return text
    data["user_rulebooks"] = [{"id": scheme.id, "file": scheme.user_file} for scheme in user_rulebooks().values()]
    return strict_json(data, "--rulebook") + "\n"


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
        raise InputError(
            chart, "--chart", "a path that does not exist yet (the file exists; pass --force to overwrite it)"
        )
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
