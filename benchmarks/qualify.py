"""Benchmark: what it takes to qualify, on the blue ammonia demo (ATR with capture).

The shipped demo (blue_atr_ammonia_shipped.toml), scored well-to-wake (``--set
project.boundary=well-to-wake``: the EU low-carbon formula counts transport and use, so its check is
judged, and fails), is asked to qualify for the EU low-carbon fuel rules and US 45V with 5 continuous
levers (capture rate, upstream methane, grid share, ship speed, the engine's N2O) and 2 discrete ones
(the grid's factor row, the CO2 transport and storage loss); every price is invented.

1. At the central value (target: under 5 s).
2. With 95 % confidence over 2,000 Monte Carlo draws of the demo's distributions
   (demo_projects/uncertainty/blue_atr_ammonia.toml; target: under 60 s on the 2-core machine).
Each is timed without the cost/margin front (with ``--front`` also with a front of 6 budgets, which
repeats the search per budget). Wall-clock and CPU seconds are printed (the machine may be shared).
Prints figures only; nothing is asserted.

    python benchmarks/qualify.py [DRAWS] [--front]
"""

from __future__ import annotations

import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

from carbonledger import api  # noqa: E402

PROJECT = ROOT / "demo_projects" / "blue_atr_ammonia_shipped.toml"
DISTRIBUTIONS = ROOT / "demo_projects" / "uncertainty" / "blue_atr_ammonia.toml"
# The facts the US rule reads before its threshold (an invented what-if: the plant placed in the US,
# no 45Q credit claimed); without them us-45v is undetermined whatever the levers, and nothing is searched.
START = ["project.boundary=well-to-wake", 'project.country="US"', "capture.claims_45q=false"]
LEVERS = """# INVENTED prices for the benchmark (not a quotation).
currency = "EUR"
period = "year"
invented = true

[[levers]]
parameter = "capture.capture_rate"
range = [0.95, 0.99]
cost = { per_unit = 40_000_000 }

[[levers]]
parameter = "natural_gas.methane_emission_share"
range = [0.001, 0.005]
cost = { per_unit = 600_000_000 }

[[levers]]
parameter = "electricity.sources.grid.share"
range = [0.0, 0.5]
cost = { per_unit = 5_000_000 }

[[levers]]
parameter = "shipping.speed_knots"
range = [10.0, 15.0]
cost = { per_unit = 700_000 }

[[levers]]
parameter = "end_use.n2o_g_per_kg_ammonia"
range = [0.1, 1.0]
cost = { per_unit = 8_000_000 }

[[levers]]
parameter = "electricity.sources.grid.factor"
values = ["electricity.grid.eu27_2018", "electricity.grid.france_2019", "electricity.grid.sweden_2019"]
[levers.cost]
table = [
    ["electricity.grid.eu27_2018", 0],
    ["electricity.grid.france_2019", 3_000_000],
    ["electricity.grid.sweden_2019", 5_000_000],
]

[[levers]]
parameter = "capture.transport_storage_loss_fraction"
values = [0.02, 0.01, 0.005]
cost = { table = [[0.02, 0], [0.01, 400_000], [0.005, 900_000]] }
"""


def timed(work):
    """Wall-clock and CPU seconds of the work (the machine may be shared: both are printed)."""
    start, cpu = time.perf_counter(), time.process_time()
    result = work()
    return (time.perf_counter() - start, time.process_time() - cpu), result


def main() -> None:
    draws = int(sys.argv[1]) if len(sys.argv) > 1 else 2000
    fronts = "--front" in sys.argv
    with tempfile.TemporaryDirectory() as folder:
        levers = Path(folder) / "levers.toml"
        levers.write_text(LEVERS, encoding="utf-8")
        assessment = api.Assessment(
            api.load_factor_set(), schemes=("eu-low-carbon", "us-45v"), overrides=tuple(START), year=2028
        )
        options = {"assessment": assessment}
        api.score(PROJECT, assessment.but(schemes=None, year=None))  # imports bw2calc once, outside the timings
        print(
            "qualify on demo_projects/blue_atr_ammonia_shipped.toml (well-to-wake), 5 continuous + 2 discrete levers, "
            "eu-low-carbon and us-45v, rules of 2028"
        )
        for label, extra in (
            ("central value", {}),
            (f"95 % confidence, {draws:,} draws", {"confidence": 0.95, "draws": draws, "distributions": DISTRIBUTIONS}),
        ):
            target = 5.0 if not extra else 60.0
            (alone, alone_cpu), result = timed(
                lambda extra=extra: api.qualify(PROJECT, levers, budgets=0, **options, **extra)
            )
            print(f"  {label}: {alone:.2f} s wall, {alone_cpu:.2f} s CPU (target < {target:.0f} s)")
            if fronts:
                (with_front, front_cpu), _ = timed(
                    lambda extra=extra: api.qualify(PROJECT, levers, budgets=6, **options, **extra)
                )
                print(f"    with a cost/margin front of 6 budgets: {with_front:.2f} s wall, {front_cpu:.2f} s CPU")
            print(
                f"    status {result.status}, total cost {result.total_cost:,.0f} {result.cost_unit}"
                if result.total_cost is not None
                else f"    status {result.status}: {result.reason}"
            )
            print(
                "    levers: "
                + ", ".join(
                    f"{path}={value:.6g}" if isinstance(value, float) else f"{path}={value}"
                    for path, value in result.levers.items()
                )
            )
            if result.probability is not None:
                print(f"    probability {result.probability:.4f} (standard error {result.standard_error:.4f})")
            solver = result.solver
            print(
                f"    {solver['combinations']} combinations, {solver['solved']} solved, {solver['pruned']} pruned, "
                f"{solver['iterations']} SLSQP iterations, {solver['stacked_solves']} stacked solves"
            )


if __name__ == "__main__":
    main()
