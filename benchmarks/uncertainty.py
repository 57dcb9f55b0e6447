"""Benchmark: Monte Carlo of the full chain of a demo (blue ammonia, ATR with capture).

1. 10,000 draws of the demo's distributions (parameters and factors, with a rank correlation;
   demo_projects/uncertainty/blue_atr_ammonia.toml) through the same stage code, built once with
   arrays and solved stacked, including the physical limits of every draw and the summary.
2. The same model with uncertainty on factors only (distributions bw2calc can hold as entry
   distributions): our stacked draws against bw2calc's own Monte Carlo (stats_arrays sampling of
   the datapackage, ``next(lca)`` per draw), measured in the same run; bw2calc is timed on a
   sample of draws and its time per draw scaled to the same number of draws.
Prints figures only; nothing is asserted.

    python benchmarks/uncertainty.py [DRAWS] [BW2CALC_DRAWS]
"""

from __future__ import annotations

import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

from carbonledger.analyses.uncertainty import (  # noqa: E402
    draw,
    evaluate,
    make_plan,
    monte_carlo,
    monte_carlo_with_bw2calc,
)
from carbonledger.core.assessment import Assessment  # noqa: E402
from carbonledger.model.distributions import parse_uncertainty, read_distributions_file  # noqa: E402
from carbonledger.model.factors import load_factor_set  # noqa: E402
from carbonledger.routes.project import load_project  # noqa: E402

FACTORS_ONLY = {  # invented ranges, as in the demo distributions file
    "factors": {
        "electricity.grid.eu27_2018": {"distribution": "normal", "mean": 281, "sd": 28},
        "natural_gas.upstream_co2": {"distribution": "triangular", "low": 3, "mode": 5, "high": 8},
        "electricity.renewable.wind_offshore": {"distribution": "uniform", "low": 5, "high": 20},
        "gwp.ar6.ch4_fossil": {"distribution": "lognormal", "median": 29.8, "gsd": 1.2},
    }
}


def best_of(runs: int, work) -> float:
    times = []
    for _ in range(runs):
        start = time.perf_counter()
        work()
        times.append(time.perf_counter() - start)
    return min(times)


def main() -> None:
    draws = int(sys.argv[1]) if len(sys.argv) > 1 else 10_000
    bw_draws = int(sys.argv[2]) if len(sys.argv) > 2 else 500
    project, _ = load_project(ROOT / "demo_projects" / "blue_atr_ammonia.toml")
    assessment = Assessment(load_factor_set("default-2026"))  # the run's options: the default set, AR6
    full = read_distributions_file(ROOT / "demo_projects" / "uncertainty" / "blue_atr_ammonia.toml")
    monte_carlo(project, assessment, full, draws=100)  # warm the imports (scipy, chemicals)
    seconds = best_of(3, lambda: monte_carlo(project, assessment, full, draws=draws))
    print(
        f"full chain, {len(full.parameters)} parameters + {len(full.factors)} factors uncertain, one rank correlation:"
    )
    print(
        f"  {draws:,} draws (draws, physical limits, stacked solve, summary and verdict probabilities): {seconds:.3f} "
        f"s ({seconds / draws * 1e6:.1f} us per draw)"
    )

    plan = make_plan(project, assessment, parse_uncertainty(FACTORS_ONLY, "benchmark"))
    ours = best_of(3, lambda: evaluate(plan, draw(plan, draws), draws))
    monte_carlo_with_bw2calc(plan, 5)  # warm bw2calc's import
    start = time.perf_counter()
    monte_carlo_with_bw2calc(plan, bw_draws)
    theirs = (time.perf_counter() - start) / bw_draws * draws
    print("same model, uncertainty on 4 factors only:")
    print(f"  stacked draws:             {draws:,} draws in {ours:.3f} s")
    print(
        f"  bw2calc Monte Carlo:       {bw_draws:,} draws timed, {theirs / draws * 1e3:.2f} ms per draw -> "
        f"{theirs:.1f} s for {draws:,} draws"
    )
    print(f"  speed-up: {theirs / ours:.0f} x")


if __name__ == "__main__":
    main()
