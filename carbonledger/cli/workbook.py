"""``carbonledger workbook``: write the audit workbook of a project (or of an earlier workbook)."""

from __future__ import annotations

from pathlib import Path
from typing import Annotated, Optional

import typer

from .. import api
from ..analyses.uncertainty import DEFAULT_SEED, check_draws
from ..errors import InputError
from ..io.ledger import ledger_for_run, record_run
from ..io.workbook.uncertainty_sheet import draws_csv_path, write_draws_csv
from ..io.workbook.writer import write_workbook_file
from .draw_options import SeedOption
from .options import (
    BoundaryOption,
    FactorsOption,
    ForceOption,
    GwpOption,
    LedgerOption,
    NoLedgerOption,
    RebalanceOption,
    RulebookOption,
    SchemeOption,
    SetOption,
    YearOption,
    assessment_of,
    check_output_path,
    fail,
    with_rebalance,
    workbook_assessment,
)


def headline_figure(result, metered: float | None, periods: Path | None) -> str:
    """The figure the command prints: with meters the metered year (the Periods sheet's year row), the design figure
    beside it."""
    if metered is None:
        return f"{result.total:,.4g} {result.unit}"
    return f"metered year {metered:,.4g} {result.unit} ({periods.name}, output-weighted; design {result.total:,.4g})"


def workbook(
    ctx: typer.Context,
    project: Annotated[Optional[Path], typer.Argument(help="Project TOML file (or use --from-workbook).")] = None,
    output: Annotated[Path, typer.Option("-o", "--output", help="Workbook to write (.xlsx).")] = ...,
    scheme: SchemeOption = None,
    rulebook: RulebookOption = None,
    gwp: GwpOption = "ar6",
    factors: FactorsOption = "default-2026",
    set_: SetOption = None,
    rebalance: RebalanceOption = None,
    boundary: BoundaryOption = None,
    periods: Annotated[
        Optional[Path],
        typer.Option(
            "--periods", help="CSV of metered monthly data: one calculation block per month and a yearly summary."
        ),
    ] = None,
    from_workbook: Annotated[
        Optional[Path],
        typer.Option("--from-workbook", help="Read inputs and edited factors from an earlier audit workbook."),
    ] = None,
    draws: Annotated[
        Optional[int],
        typer.Option(
            "--draws",
            help="Add an Uncertainty sheet: a Monte Carlo of N draws over the project's [uncertainty] table (and "
            "--distributions).",
        ),
    ] = None,
    seed: SeedOption = DEFAULT_SEED,
    distributions: Annotated[
        Optional[Path],
        typer.Option(
            "--distributions", help="Distributions TOML laid over the project's [uncertainty] table (with --draws)."
        ),
    ] = None,
    year: YearOption = None,
    draws_csv: Annotated[
        bool,
        typer.Option(
            "--draws-csv", help="With --draws: also write every draw to OUTPUT.draws.csv beside the workbook."
        ),
    ] = False,
    force: ForceOption = False,
    ledger: LedgerOption = None,
    no_ledger: NoLedgerOption = False,
) -> None:
    """Write an audit workbook: inputs, cited factors, every exchange as a live formula, results, checks, chart."""
    set_ = with_rebalance(set_, rebalance)
    try:
        where = ledger_for_run(ledger, not no_ledger)
        csv_path = _checked_paths(project, from_workbook, output, draws, seed, draws_csv, distributions, force)
        if from_workbook is not None:
            assessment = workbook_assessment(ctx, factors, gwp, scheme, set_, boundary, year, from_workbook)
        else:
            assessment = assessment_of(factors, gwp, scheme, set_, boundary, year)
        audited = api.audit_workbook(
            project,
            assessment,
            from_workbook=from_workbook,
            periods=periods,
            draws=draws,
            seed=seed,
            distributions=distributions,
            keep_draws=csv_path is not None,
            draws_csv=csv_path.name if csv_path is not None else "",
        )
        book, result, spread = audited
        _write_and_record(output, book, csv_path, result, spread, where, force)
    except InputError as error:
        fail(error)
    _say_written(output, result, audited.metered_year, periods, spread, csv_path)


def _say_written(output: Path, result, metered_year, periods, spread, csv_path) -> None:
    """What was written: the workbook with its headline figure, the Uncertainty sheet's spread, the draws CSV."""
    typer.echo(
        f"wrote {output}: {headline_figure(result, metered_year, periods)} ({result.gwp_basis.upper()}, factor "
        f"set {result.factor_set.name}); {result.caution}"
    )
    if spread is not None:
        typer.echo(
            f"Uncertainty sheet: {spread.draws:,} draws, seed {spread.seed}: mean {spread.total.mean:,.4g}, p5 "
            f"{spread.total.p5:,.4g}, p95 {spread.total.p95:,.4g} {spread.unit}"
        )
    if csv_path is not None:
        typer.echo(f"wrote {csv_path}")


def _checked_paths(project, from_workbook, output: Path, draws, seed: int, draws_csv: bool, distributions, force: bool):
    """Every option of ``workbook`` that names a file, checked before anything is read or written: one project
    source, an .xlsx output that is not a folder and is not overwritten without --force, the draws options
    together. Returns the path of the draws CSV (None without --draws-csv)."""
    if draws is None and (draws_csv or distributions is not None):
        raise InputError(
            "workbook",
            "--draws",
            "a number of draws with --draws-csv or --distributions (they belong to the Uncertainty sheet)",
        )
    if draws is not None:
        check_draws(draws, seed)
    csv_path = draws_csv_path(output) if draws_csv else None
    if csv_path is not None and csv_path.exists() and not force:
        raise InputError(
            csv_path, "", "a path that does not exist yet (the draws CSV exists; pass --force to overwrite it)"
        )
    if csv_path is not None:
        check_output_path(csv_path, force, "--draws-csv")
    if (project is None) == (from_workbook is None):
        raise InputError("workbook", "PROJECT", "either a project TOML file or --from-workbook WORKBOOK (one of them)")
    if output.suffix.lower() != ".xlsx":
        raise InputError(
            output, "--output", f"a file ending in .xlsx (an Excel workbook), got '{output.suffix or 'no suffix'}'"
        )
    check_output_path(output, force, "--output")
    return csv_path


def _write_and_record(output: Path, book, csv_path, result, spread, where, force: bool) -> None:
    """Write the workbook (and the draws CSV), then record the score (and the Monte Carlo) in the ledger."""
    write_workbook_file(output, book, force=force)
    if csv_path is not None:
        write_draws_csv(csv_path, spread, force=force)
    if where is not None:
        record_run("workbook", [result], ledger=where)
        if spread is not None:
            record_run("workbook", [spread], ledger=where, kind="uncertainty")
