"""``carbonledger recalc`` and ``history``: portfolios under a new factor set, and what changed."""

from __future__ import annotations

from pathlib import Path
from typing import Annotated, Optional

import typer

from .. import api
from ..about import CAUTION
from ..core.results import strict_json
from ..errors import InputError
from ..io.csv_text import csv_text
from ..io.ledger import close_run, ledger_for_run, read_records, record_filter
from ..io.portfolio_output import (
    flagged_factors,
    history_table,
    recalc_csv,
    recalc_json,
    recalc_table,
)
from ..model.factors import load_factor_set
from .options import (
    FormatOption,
    GwpOption,
    LedgerOption,
    NoLedgerOption,
    OutputFormat,
    RulebookOption,
    SchedulerOption,
    SchemeOption,
    SinceOption,
    UntilOption,
    UserOption,
    WorkersOption,
    YearOption,
    assessment_of,
    end_of,
    fail,
    render,
    render_result,
)

NEW_FAILURE_EXIT_CODE = 3


def recalc(
    projects: Annotated[list[Path], typer.Argument(help="Project TOML files or folders of them.")],
    to_set: Annotated[str, typer.Option("--to", help="The new factor set (name, folder or override CSV).")],
    from_set: Annotated[
        str, typer.Option("--from", help="Factor set the projects were scored with (name, folder or override CSV).")
    ] = "default-2026",
    scheme: SchemeOption = None,
    rulebook: RulebookOption = None,
    gwp: GwpOption = "ar6",
    fail_on_new_failures: Annotated[
        bool, typer.Option("--fail-on-new-failures", help="Exit with code 3 when any project newly fails a scheme.")
    ] = False,
    ledger: LedgerOption = None,
    no_ledger: NoLedgerOption = False,
    output_format: FormatOption = OutputFormat.table,
    workers: WorkersOption = None,
    scheduler: SchedulerOption = None,
    year: YearOption = None,
) -> None:
    """Rescore projects under a new factor set: old and new value per scheme, newly failing first."""
    try:
        where = ledger_for_run(ledger, not no_ledger)
        command = f"recalc --from {from_set} --to {to_set}"
        old_set = _named(from_set, "--from")
        assessment = assessment_of(_named(to_set, "--to"), gwp, scheme, year=year)  # the new set is the assessment's
        result = api.recalc(
            projects, old_set, assessment, workers=workers, scheduler=scheduler, ledger=where, command=command
        )
        text = render_result(output_format, result, recalc_table, recalc_json, recalc_csv)
        if result.ledger_run is not None:
            close_run(result.ledger_run)  # the workers wrote the records; the run is visible from now on
    except InputError as error:
        fail(error)
    typer.echo(text, nl=False)
    if fail_on_new_failures and result.newly_failing:
        raise typer.Exit(NEW_FAILURE_EXIT_CODE)


def _named(option_value: str, option: str):
    """Load a factor set, naming the option it came from in the error."""
    try:
        return load_factor_set(option_value)
    except InputError as error:
        raise InputError(option, option_value, error.expected) from None


def history(
    project: Annotated[
        Optional[Path],
        typer.Argument(help="Project TOML file (matched by its full path); default: every project in the ledger."),
    ] = None,
    user: UserOption = None,
    since: SinceOption = None,
    until: UntilOption = None,
    ledger: LedgerOption = None,
    output_format: FormatOption = OutputFormat.table,
) -> None:
    """How a project's results changed over the recorded runs, and why (inputs, factors), and who ran them."""
    try:
        entries = read_records(ledger, record_filter([project] if project else [], user, since, end_of(until)))
    except InputError as error:
        fail(error)
    header = (
        "record",
        "time",
        "command",
        "kind",
        "factor_set",
        "factor_set_sha256",
        "project_sha256",
        "scheme",
        "value",
        "unit",
        "passes",
        "status",
        "factors_not_yet_verified",
        "project",
        "user",
        "host",
        "carbonledger_version",
        "assessment_year",
    )
    rows = [
        (
            e["record"],
            e["time"],
            e["command"],
            e["kind"],
            e["factor_set"],
            e["factor_set_sha256"],
            e["project_sha256"],
            c["scheme"],
            c["value"],
            c["unit"],
            c.get("passes", ""),
            c.get("status", ""),
            "; ".join(flagged_factors(e)),
            e["project"],
            e["user"],
            e["host"],
            e["carbonledger_version"],
            e["assessment_year"],
        )  # fmt: skip
        for e in entries
        for c in e["results"].get(
            "checks", []
        )  # an uncertainty record gives each scheme's mean value; sensitivity and headroom records have no checks
    ]
    shown = str(project) if project else ""
    typer.echo(
        render(
            output_format,
            table=lambda: history_table(shown, entries),
            json=lambda: strict_json(
                {"caution": CAUTION, "project_file": shown or None, "records": entries}, shown or "history"
            ),
            csv=lambda: csv_text(header, rows, caution=CAUTION),
        ),
        nl=False,
    )
