"""Command line for factor-set versions, portfolio recalculation and the run ledger.

``factors sets``, ``factors diff``, ``recalc`` and ``history``: thin typer commands over
``factors``, ``portfolio`` and ``ledger``. Bad input: one line ``error: ...``, exit 2.
"""

from __future__ import annotations

import json
from pathlib import Path
from typing import Annotated

import typer

from .cli import FormatOption, GwpOption, LedgerOption, NoLedgerOption, OutputFormat, SchemeOption, _fail, app, factors_app
from .errors import InputError

NEW_FAILURE_EXIT_CODE = 3


@factors_app.command("sets")
def factors_sets(output_format: FormatOption = OutputFormat.table) -> None:
    """List the factor sets in factors/sets: name, date, sha256, base and description."""
    from .factors import set_listing
    from .outputs.portfolio import _csv, sets_table

    try:
        sets = set_listing()
    except InputError as error:
        _fail(error)
    if output_format is OutputFormat.json:
        typer.echo(json.dumps(sets, indent=2))
    elif output_format is OutputFormat.csv:
        keys = ("name", "date", "sha256", "base", "factors", "description")
        typer.echo(_csv(keys, [tuple(s[k] for k in keys) for s in sets]), nl=False)
    else:
        typer.echo(sets_table(sets), nl=False)


@factors_app.command("diff")
def factors_diff(
    old: Annotated[str, typer.Argument(help="Old factor set: name, set folder or override CSV.")],
    new: Annotated[str, typer.Argument(help="New factor set: name, set folder or override CSV.")],
    output_format: FormatOption = OutputFormat.table,
) -> None:
    """Every factor changed, added or removed between two sets, with old and new value and source."""
    from .factors import diff_sets, load_factor_set
    from .outputs.portfolio import _csv, diff_rows, diff_table

    try:
        old_set, new_set = load_factor_set(old), load_factor_set(new)
    except InputError as error:
        _fail(error)
    changes = diff_sets(old_set, new_set)
    if output_format is OutputFormat.json:
        typer.echo(json.dumps({"old": {"name": old_set.name, "sha256": old_set.sha256}, "new": {"name": new_set.name, "sha256": new_set.sha256}, "changes": diff_rows(changes)}, indent=2))
    elif output_format is OutputFormat.csv:
        rows = diff_rows(changes)
        keys = ("kind", "id", "old_value", "new_value", "unit", "old_source", "new_source")
        typer.echo(_csv(keys, [tuple(r[k] for k in keys) for r in rows]), nl=False)
    else:
        typer.echo(diff_table(old_set.name, new_set.name, changes), nl=False)


@app.command()
def recalc(
    projects: Annotated[list[Path], typer.Argument(help="Project TOML files or folders of them.")],
    to_set: Annotated[str, typer.Option("--to", help="The new factor set (name, folder or override CSV).")],
    from_set: Annotated[str, typer.Option("--from", help="Factor set the projects were scored with (name, folder or override CSV).")] = "default-2026",
    scheme: SchemeOption = None,
    gwp: GwpOption = "ar6",
    fail_on_new_failures: Annotated[bool, typer.Option("--fail-on-new-failures", help="Exit with code 3 when any project newly fails a scheme.")] = False,
    ledger: LedgerOption = None,
    no_ledger: NoLedgerOption = False,
    output_format: FormatOption = OutputFormat.table,
) -> None:
    """Rescore projects under a new factor set: old and new value per scheme, newly failing first."""
    from .factors import load_factor_set
    from .ledger import ledger_for_run, record_run
    from .outputs.portfolio import recalc_csv, recalc_json, recalc_table
    from .portfolio import load_portfolio
    from .portfolio import recalc as run

    try:
        where = ledger_for_run(ledger, not no_ledger)
        old_set, new_set = load_factor_set(from_set), load_factor_set(to_set)
        portfolio = load_portfolio(projects)
        result = run(portfolio, old_set, new_set, gwp=gwp, schemes=scheme)
        if where is not None:
            command = f"recalc --from {from_set} --to {to_set}"
            record_run(command, [*result.old_scores, *result.new_scores], ledger=where, kind="recalc")
    except InputError as error:
        _fail(error)
    if output_format is OutputFormat.json:
        typer.echo(recalc_json(result))
    elif output_format is OutputFormat.csv:
        typer.echo(recalc_csv(result), nl=False)
    else:
        typer.echo(recalc_table(result), nl=False)
    if fail_on_new_failures and result.newly_failing:
        raise typer.Exit(NEW_FAILURE_EXIT_CODE)


@app.command()
def history(
    project: Annotated[Path, typer.Argument(help="Project TOML file (matched by its full path).")],
    ledger: LedgerOption = None,
    output_format: FormatOption = OutputFormat.table,
) -> None:
    """How a project's results changed over the recorded runs, and why (inputs, factors)."""
    from .ledger import project_history
    from .outputs.portfolio import _csv, history_table

    try:
        entries = project_history(project, ledger)
    except InputError as error:
        _fail(error)
    if output_format is OutputFormat.json:
        typer.echo(json.dumps(entries, indent=2, default=str))
    elif output_format is OutputFormat.csv:
        rows = [
            (e["record"], e["time"], e["command"], e["kind"], e["factor_set"], e["factor_set_sha256"], e["project_sha256"], c["scheme"], c["value"], c["unit"], c["passes"])
            for e in entries
            for c in e["results"]["checks"]
        ]
        typer.echo(_csv(("record", "time", "command", "kind", "factor_set", "factor_set_sha256", "project_sha256", "scheme", "value", "unit", "passes"), rows), nl=False)
    else:
        typer.echo(history_table(str(project), entries), nl=False)


def score_lifetime(project: Path, *, factors: str, gwp: str, schemes, overrides, ledger, output_format: OutputFormat) -> None:
    """``score --lifetime``: yearly intensities, lifetime averages, years each scheme is missed."""
    from .factors import load_factor_set
    from .ledger import record_run
    from .lifetime import lifetime_score
    from .outputs.portfolio import lifetime_csv, lifetime_json, lifetime_table
    from .project import load_project

    model, sha = load_project(project, overrides)
    result = lifetime_score(model, load_factor_set(factors), project_file=str(project), project_sha256=sha, gwp=gwp, schemes=schemes)
    if ledger is not None:
        record_run("score --lifetime", [result], ledger=ledger, kind="lifetime")
    if output_format is OutputFormat.json:
        typer.echo(lifetime_json(result))
    elif output_format is OutputFormat.csv:
        typer.echo(lifetime_csv(result), nl=False)
    else:
        typer.echo(lifetime_table(result), nl=False)
