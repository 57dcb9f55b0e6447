"""The ``uncertainty``, ``headroom`` and ``sensitivity`` commands: how sure the verdict is."""

from __future__ import annotations

import contextlib
import sys
from pathlib import Path
from typing import Annotated, Optional

import typer

from .. import api
from ..analyses.sensitivity import SWING_PERCENT, check_swing
from ..analyses.uncertainty import DEFAULT_DRAWS, DEFAULT_SEED, check_draws
from ..errors import InputError
from ..io.ledger import ledger_for_run, record_run
from ..io.sensitivity_output import sensitivity_csv, sensitivity_table, write_sensitivity_chart
from ..io.uncertainty_output import (
    headroom_csv,
    headroom_json,
    headroom_table,
    portfolio_uncertainty_csv,
    portfolio_uncertainty_json,
    portfolio_uncertainty_table,
    uncertainty_csv,
    uncertainty_table,
    write_uncertainty_chart,
)
from .draw_options import DistributionsOption, DrawsOption, SamplingOption, SeedOption
from .options import (
    BoundaryOption,
    FactorsOption,
    ForceOption,
    FormatOption,
    GwpOption,
    LedgerOption,
    NoLedgerOption,
    OutputFormat,
    RebalanceOption,
    RulebookOption,
    SchedulerOption,
    SchemeOption,
    SetOption,
    WorkersOption,
    YearOption,
    assessment_of,
    check_chart_path,
    fail,
    render,
    render_result,
    with_rebalance,
)


@contextlib.contextmanager
def progress_bar(total: int, label: str, output_format: OutputFormat):
    """A rich progress bar on a terminal for the table format; nothing for JSON, CSV or a pipe."""
    if output_format != OutputFormat.table or not sys.stdout.isatty():
        yield None
        return
    from rich.progress import Progress

    with Progress(transient=True) as bar:
        task = bar.add_task(label, total=total)
        yield lambda done: bar.advance(task, done)


def uncertainty(
    project: Annotated[
        list[Path],
        typer.Argument(
            help="Project TOML file (its [uncertainty] table gives distributions), or several files or folders."
        ),
    ],
    draws: DrawsOption = DEFAULT_DRAWS,
    seed: SeedOption = DEFAULT_SEED,
    sampling: SamplingOption = None,
    distributions: DistributionsOption = None,
    scheme: SchemeOption = None,
    rulebook: RulebookOption = None,
    gwp: GwpOption = "ar6",
    factors: FactorsOption = "default-2026",
    set_: SetOption = None,
    rebalance: RebalanceOption = None,
    boundary: BoundaryOption = None,
    year: YearOption = None,
    workers: WorkersOption = None,
    scheduler: SchedulerOption = None,
    chart: Annotated[
        Optional[Path],
        typer.Option(
            "--chart",
            help="One project: write a histogram of each scheme's value with its thresholds, FILE.png or FILE.svg.",
        ),
    ] = None,
    force: ForceOption = False,
    output_format: FormatOption = OutputFormat.table,
    ledger: LedgerOption = None,
    no_ledger: NoLedgerOption = False,
) -> None:
    """Monte Carlo over the uncertain inputs: spread of every figure and the probability of each verdict."""
    set_ = with_rebalance(set_, rebalance)
    try:
        where = ledger_for_run(ledger, not no_ledger)
        check_chart_path(chart, force)
        check_draws(draws, seed)  # before any project is read, on one process or a cluster
        options = {
            "distributions": distributions,
            "draws": draws,
            "seed": seed,
            "sampling": sampling.value if sampling else None,
            "assessment": assessment_of(factors, gwp, scheme, set_, boundary, year),
        }
        single = len(project) == 1 and project[0].is_file() and workers is None and scheduler is None
        if single:
            with progress_bar(draws, "Monte Carlo draws", output_format) as advance:
                result = api.uncertainty(project[0], progress=advance, **options)
            text = render(
                output_format,
                table=lambda: uncertainty_table(result),
                json=result.to_json,
                csv=lambda: uncertainty_csv(result),
            )
            if chart is not None:
                write_uncertainty_chart(result, chart, force=force)
            results = [result]
        else:
            if chart is not None:
                raise InputError(chart, "--chart", "one project (a chart is drawn for one project's draws)")
            if set_:
                raise InputError("--set", set_[0], "no --set with several projects (set values in each project file)")
            results = api.uncertainty_many(project, workers=workers, scheduler=scheduler, **options)
            text = render_result(
                output_format,
                results,
                portfolio_uncertainty_table,
                portfolio_uncertainty_json,
                portfolio_uncertainty_csv,
            )
        if where is not None:
            record_run("uncertainty", results, ledger=where, kind="uncertainty")
    except InputError as error:
        fail(error)
    typer.echo(text, nl=False)
    if chart is not None:
        typer.echo(f"wrote {chart}", err=True)


def headroom(
    project: Annotated[Path, typer.Argument(help="Project TOML file.")],
    parameter: Annotated[
        list[str], typer.Option("--parameter", help="Parameter path as `carbonledger params` lists it (repeatable).")
    ],
    scheme: Annotated[str, typer.Option("--scheme", help="Scheme id (see `carbonledger schemes`).")],
    rulebook: RulebookOption = None,
    tier: Annotated[
        Optional[str], typer.Option("--tier", help="Tier name of the scheme; default its loosest threshold.")
    ] = None,
    gwp: GwpOption = "ar6",
    factors: FactorsOption = "default-2026",
    set_: SetOption = None,
    rebalance: RebalanceOption = None,
    boundary: BoundaryOption = None,
    year: YearOption = None,
    output_format: FormatOption = OutputFormat.table,
    ledger: LedgerOption = None,
    no_ledger: NoLedgerOption = False,
) -> None:
    """The value of each parameter at which a scheme's limit is met exactly (null with a reason when none)."""
    set_ = with_rebalance(set_, rebalance)
    try:
        where = ledger_for_run(ledger, not no_ledger)
        assessment = assessment_of(factors, gwp, None, set_, boundary, year)
        results = api.headroom(project, parameter, scheme, tier=tier, assessment=assessment)
        text = render(
            output_format,
            table=lambda: headroom_table(results),
            json=lambda: headroom_json(results),
            csv=lambda: headroom_csv(results),
        )
        if where is not None:
            record_run("headroom", [api.headroom_record(results, project, assessment)], ledger=where)
    except InputError as error:
        fail(error)
    typer.echo(text, nl=False)


def sensitivity(
    project: Annotated[Path, typer.Argument(help="Project TOML file (its [uncertainty] table gives distributions).")],
    scheme: Annotated[
        Optional[str],
        typer.Option("--scheme", help="Scheme id: analyse its value (limit marked on the chart); default the total."),
    ] = None,
    rulebook: RulebookOption = None,
    base_sample: Annotated[
        int, typer.Option("--base-sample", help="N of the Sobol sample, a power of 2 (evaluations: N x (inputs + 2)).")
    ] = 1024,
    seed: SeedOption = DEFAULT_SEED,
    distributions: DistributionsOption = None,
    chart: Annotated[
        Optional[Path], typer.Option("--chart", help="Write the tornado and Sobol chart: FILE.png or FILE.svg.")
    ] = None,
    force: ForceOption = False,
    gwp: GwpOption = "ar6",
    factors: FactorsOption = "default-2026",
    set_: SetOption = None,
    rebalance: RebalanceOption = None,
    boundary: BoundaryOption = None,
    year: YearOption = None,
    swing: Annotated[
        float,
        typer.Option(
            "--swing",
            help="Also move each factor and numeric parameter alone by -PERCENT and +PERCENT of its own value: the "
            "change of the total and of every scheme's value.",
        ),
    ] = SWING_PERCENT,
    output_format: FormatOption = OutputFormat.table,
    ledger: LedgerOption = None,
    no_ledger: NoLedgerOption = False,
) -> None:
    """Which inputs decide the result: Sobol indices (SALib), a 10th/90th percentile tornado and a +-x % swing."""
    set_ = with_rebalance(set_, rebalance)
    try:
        where = ledger_for_run(ledger, not no_ledger)
        check_chart_path(chart, force)
        check_swing(swing)
        assessment = assessment_of(factors, gwp, [scheme] if scheme else None, set_, boundary, year)
        result = api.sensitivity(
            project,
            distributions=distributions,
            scheme=scheme,
            base_sample=base_sample,
            seed=seed,
            assessment=assessment,
            swing=swing,
        )
        text = render(
            output_format,
            table=lambda: sensitivity_table(result),
            json=lambda: result.model_dump_json(indent=2),
            csv=lambda: sensitivity_csv(result),
        )
        if chart is not None:
            write_sensitivity_chart(result, chart, force=force)
        if where is not None:
            record = api.analysis_record("sensitivity", project, result.summary_for_ledger(), assessment)
            record_run("sensitivity", [record], ledger=where)
    except InputError as error:
        fail(error)
    typer.echo(text, nl=False)
    if chart is not None:
        typer.echo(f"wrote {chart}", err=True)
