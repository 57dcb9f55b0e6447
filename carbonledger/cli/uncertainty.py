"""The ``uncertainty``, ``headroom`` and ``sensitivity`` commands: how sure the verdict is."""

from __future__ import annotations

import contextlib
import sys
from enum import Enum
from pathlib import Path
from typing import Annotated, Optional

import typer

from .. import api
from ..analyses.uncertainty import DEFAULT_DRAWS, DEFAULT_SEED
from ..errors import InputError
from ..io.uncertainty_output import (
    headroom_csv,
    headroom_json,
    headroom_table,
    uncertainty_csv,
    uncertainty_table,
)
from .options import (
    BoundaryOption,
    FactorsOption,
    FormatOption,
    GwpOption,
    OutputFormat,
    SchemeOption,
    SetOption,
    fail,
    render,
)


class Sampling(str, Enum):
    random = "random"
    latin_hypercube = "latin_hypercube"


DistributionsOption = Annotated[Optional[Path], typer.Option("--distributions", help="Distributions TOML laid over the project's [uncertainty] table (parameter paths and factor ids).")]
DrawsOption = Annotated[int, typer.Option("--draws", help="Number of Monte Carlo draws.")]
SeedOption = Annotated[int, typer.Option("--seed", help=f"Seed of the random draws (default {DEFAULT_SEED}); the same seed gives the same numbers.")]
SamplingOption = Annotated[Optional[Sampling], typer.Option("--sampling", help="random or latin_hypercube; default: the distributions' own (random).")]


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
    project: Annotated[Path, typer.Argument(help="Project TOML file (its [uncertainty] table gives distributions).")],
    draws: DrawsOption = DEFAULT_DRAWS,
    seed: SeedOption = DEFAULT_SEED,
    sampling: SamplingOption = None,
    distributions: DistributionsOption = None,
    scheme: SchemeOption = None,
    gwp: GwpOption = "ar6",
    factors: FactorsOption = "default-2026",
    set_: SetOption = None,
    boundary: BoundaryOption = None,
    output_format: FormatOption = OutputFormat.table,
) -> None:
    """Monte Carlo over the uncertain inputs: spread of every figure and the probability of each verdict."""
    try:
        with progress_bar(draws, "Monte Carlo draws", output_format) as advance:
            result = api.uncertainty(
                project,
                distributions=distributions,
                draws=draws,
                seed=seed,
                sampling=sampling.value if sampling else None,
                factors=factors,
                gwp=gwp,
                schemes=scheme,
                overrides=set_,
                boundary=boundary,
                progress=advance,
            )
        text = render(output_format, table=lambda: uncertainty_table(result), json=result.to_json, csv=lambda: uncertainty_csv(result))
    except InputError as error:
        fail(error)
    typer.echo(text, nl=False)


def headroom(
    project: Annotated[Path, typer.Argument(help="Project TOML file.")],
    parameter: Annotated[list[str], typer.Option("--parameter", help="Parameter path as `carbonledger params` lists it (repeatable).")],
    scheme: Annotated[str, typer.Option("--scheme", help="Scheme id (see `carbonledger schemes`).")],
    tier: Annotated[Optional[str], typer.Option("--tier", help="Tier name of the scheme; default its loosest threshold.")] = None,
    gwp: GwpOption = "ar6",
    factors: FactorsOption = "default-2026",
    set_: SetOption = None,
    boundary: BoundaryOption = None,
    output_format: FormatOption = OutputFormat.table,
) -> None:
    """The value of each parameter at which a scheme's limit is met exactly (null with a reason when none)."""
    try:
        results = api.headroom(project, parameter, scheme, tier=tier, factors=factors, gwp=gwp, overrides=set_, boundary=boundary)
        text = render(output_format, table=lambda: headroom_table(results), json=lambda: headroom_json(results), csv=lambda: headroom_csv(results))
    except InputError as error:
        fail(error)
    typer.echo(text, nl=False)
