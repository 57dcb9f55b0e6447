"""The options of the commands that draw (uncertainty, headroom, qualify, compare and workbook with --draws),
declared once. It imports the draws' defaults from ``analyses.uncertainty``, which every such command loads."""

from __future__ import annotations

from enum import Enum
from pathlib import Path
from typing import Annotated, Optional

import typer

from ..analyses.uncertainty import DEFAULT_SEED


class Sampling(str, Enum):
    random = "random"
    latin_hypercube = "latin_hypercube"


DistributionsOption = Annotated[
    Optional[Path],
    typer.Option(
        "--distributions",
        help="Distributions TOML laid over the project's [uncertainty] table (parameter paths and factor ids).",
    ),
]
DrawsOption = Annotated[int, typer.Option("--draws", help="Number of Monte Carlo draws.")]
SeedOption = Annotated[
    int,
    typer.Option(
        "--seed", help=f"Seed of the random draws (default {DEFAULT_SEED}); the same seed gives the same numbers."
    ),
]
SamplingOption = Annotated[
    Optional[Sampling],
    typer.Option("--sampling", help="random or latin_hypercube; default: the distributions' own (random)."),
]
