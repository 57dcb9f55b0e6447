"""The ``qualify`` command: the least-cost lever values with which the named schemes qualify."""

from __future__ import annotations

from pathlib import Path
from typing import Annotated, Optional

import typer

from .. import api
from ..analyses.qualify import FRONT_BUDGETS, check_confidence
from ..analyses.uncertainty import DEFAULT_SEED
from ..errors import InputError
from ..io.ledger import ledger_for_run, record_run
from ..io.qualify_output import qualify_csv, qualify_json, qualify_table, write_front_chart
from .draw_options import DistributionsOption, SamplingOption, SeedOption
from .options import (
    FactorsOption,
    ForceOption,
    FormatOption,
    GwpOption,
    LedgerOption,
    NoLedgerOption,
    OutputFormat,
    RebalanceOption,
    RulebookOption,
    SetOption,
    YearOption,
    assessment_of,
    check_chart_path,
    fail,
    render_result,
    with_rebalance,
)


def qualify(
    project: Annotated[Path, typer.Argument(help="Project TOML file.")],
    levers: Annotated[
        Path,
        typer.Option(
            "--levers", help="Levers TOML file: what may change, within which values, at what cost (docs/qualify.md)."
        ),
    ],
    scheme: Annotated[
        Optional[list[str]],
        typer.Option(
            "--scheme", help="Scheme id that must qualify (repeatable); default: the levers file's `schemes`."
        ),
    ] = None,
    rulebook: RulebookOption = None,
    year: YearOption = None,
    confidence: Annotated[
        Optional[float],
        typer.Option(
            "--confidence",
            help="Share of Monte Carlo draws in which every scheme must qualify, strictly between 0 and 1; default: "
            "the central value.",
        ),
    ] = None,
    draws: Annotated[
        int, typer.Option("--draws", help="Monte Carlo draws with --confidence (common to every candidate).")
    ] = 2000,
    seed: SeedOption = DEFAULT_SEED,
    sampling: SamplingOption = None,
    distributions: DistributionsOption = None,
    front: Annotated[int, typer.Option("--front", help="Budgets in the cost/margin front (0: none).")] = FRONT_BUDGETS,
    chart: Annotated[
        Optional[Path], typer.Option("--chart", help="Write the cost/margin front: FILE.png or FILE.svg.")
    ] = None,
    force: ForceOption = False,
    gwp: GwpOption = "ar6",
    factors: FactorsOption = "default-2026",
    set_: SetOption = None,
    rebalance: RebalanceOption = None,
    output_format: FormatOption = OutputFormat.table,
    ledger: LedgerOption = None,
    no_ledger: NoLedgerOption = False,
) -> None:
    """The cheapest lever values with which every named scheme qualifies (at the central value, or with a stated
    probability)."""
    set_ = with_rebalance(set_, rebalance)
    try:
        where = ledger_for_run(ledger, not no_ledger)
        check_chart_path(chart, force)
        check_confidence(confidence)  # before any file is read
        if chart is not None and front < 2:
            raise InputError(chart, "--chart", "a front of at least 2 budgets (--front)")
        assessment = assessment_of(factors, gwp, scheme, set_, year=year)
        result = api.qualify(
            project,
            levers,
            assessment,
            confidence=confidence,
            draws=draws,
            seed=seed,
            sampling=sampling.value if sampling else None,
            distributions=distributions,
            budgets=front,
        )
        text = render_result(output_format, result, qualify_table, qualify_json, qualify_csv)
        if chart is not None:
            write_front_chart(result, chart, force=force)
        if where is not None:
            record = api.analysis_record(
                "qualify", project, result.summary_for_ledger(), assessment.but(schemes=tuple(result.schemes))
            )
            record_run("qualify", [record], ledger=where)
    except InputError as error:
        fail(error)
    typer.echo(text, nl=False)
    if chart is not None:
        typer.echo(f"wrote {chart}", err=True)
