"""``carbonledger compare``: several projects side by side."""

from __future__ import annotations

from pathlib import Path
from typing import Annotated, Optional

import typer

from .. import api
from ..analyses.uncertainty import DEFAULT_SEED, check_draws
from ..errors import InputError
from ..io.compare_output import (
    comparison_csv,
    render_comparison,
    write_chart,
)
from ..io.ledger import ledger_for_run, record_run
from .draw_options import SeedOption
from .options import (
    BoundaryOption,
    FactorsOption,
    ForceOption,
    FormatOption,
    GwpOption,
    LedgerOption,
    NoLedgerOption,
    OutputFormat,
    RulebookOption,
    SchemeOption,
    YearOption,
    assessment_of,
    check_chart_path,
    fail,
    render,
)


def compare(
    projects: Annotated[
        Optional[list[Path]], typer.Argument(help="Project TOML files or audit workbooks (.xlsx).")
    ] = None,
    boundary: BoundaryOption = None,
    scheme: SchemeOption = None,
    rulebook: RulebookOption = None,
    gwp: GwpOption = "ar6",
    factors: FactorsOption = "default-2026",
    output_format: FormatOption = OutputFormat.table,
    basis: Annotated[
        str,
        typer.Option(
            "--basis", help="auto, t-nh3, kg-h2 or mj (LHV); auto: the products' own unit when all agree, else MJ."
        ),
    ] = "auto",
    chart: Annotated[
        Optional[Path], typer.Option("--chart", help="Write a stacked bar chart by stage: FILE.png or FILE.svg.")
    ] = None,
    force: ForceOption = False,
    from_workbook: Annotated[
        Optional[list[Path]],
        typer.Option(
            "--from-workbook",
            help="An audit workbook to compare, its inputs and edited factors read back (repeatable).",
        ),
    ] = None,
    draws: Annotated[
        Optional[int],
        typer.Option(
            "--draws",
            help="Monte Carlo of each project with N draws (its [uncertainty] table): 5th-95th percentile band, "
            "probability of qualifying; error bars on --chart.",
        ),
    ] = None,
    seed: SeedOption = DEFAULT_SEED,
    distributions: Annotated[
        Optional[Path],
        typer.Option(
            "--distributions", help="With --draws: distributions TOML laid over every project's [uncertainty] table."
        ),
    ] = None,
    year: YearOption = None,
    ledger: LedgerOption = None,
    no_ledger: NoLedgerOption = False,
) -> None:
    """Compare projects side by side: total, intensity, by stage, by gas, scheme verdicts."""
    try:
        where = ledger_for_run(ledger, not no_ledger)
        check_chart_path(chart, force)
        _check_draws_options(draws, seed, distributions)
        result = api.compare(
            list(projects or []) + list(from_workbook or []),
            assessment_of(factors, gwp, scheme, None, boundary, year),
            basis=basis,
            draws=draws,
            seed=seed,
            distributions=distributions,
        )
        text = render(
            output_format,
            table=lambda: render_comparison(result),
            json=result.to_json,
            csv=lambda: comparison_csv(result),
        )
        if chart is not None:
            write_chart(result, chart, force=force)
        if where is not None:
            record_run("compare", result.scores, ledger=where)
    except InputError as error:
        fail(error)
    typer.echo(text, nl=False)
    if chart is not None:
        typer.echo(f"wrote {chart}", err=True)


def _check_draws_options(draws: int | None, seed: int, distributions: Path | None) -> None:
    """The uncertainty band's options: a valid number of draws and seed, and no distributions without draws."""
    if draws is not None:
        check_draws(draws, seed)
    if draws is None and distributions is not None:
        raise InputError(
            "compare", "--distributions", "--draws N as well (the distributions are drawn for the uncertainty band)"
        )
