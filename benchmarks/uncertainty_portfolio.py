"""Benchmark: Monte Carlo of a generated portfolio, in one process and on a local Dask cluster.

Generates N invented projects (the generator of benchmarks/recalc.py) with one distributions file
for all of them (the grid factor and the upstream CO2 of natural gas; invented ranges), then runs
``api.uncertainty_many`` with D draws each, serially and on a local cluster of W worker
processes, and prints the time, the peak memory (this process; the workers, once they have
ended) and whether the two runs agree. Prints figures only; nothing is asserted.

    python benchmarks/uncertainty_portfolio.py [N=1000] [DRAWS=1000] [WORKERS=2]
"""

from __future__ import annotations

import random
import resource
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))
sys.path.insert(0, str(ROOT / "benchmarks"))

from recalc import project  # noqa: E402

from carbonledger import api  # noqa: E402

DISTRIBUTIONS = """# INVENTED ranges for the benchmark
[factors."electricity.grid.eu27_2018"]
distribution = "normal"
mean = 281
sd = 28

[factors."natural_gas.upstream_co2"]
distribution = "triangular"
low = 3
mode = 5
high = 8
"""


def peak_mb(who) -> float:
    return resource.getrusage(who).ru_maxrss / 1024  # kilobytes on Linux


def main(count: int, draws: int, workers: int) -> None:
    rng = random.Random(2026)
    with tempfile.TemporaryDirectory() as folder:
        for number in range(count):
            (Path(folder) / f"project_{number:04d}.toml").write_text(project(number, rng), encoding="utf-8")
        spec = Path(folder) / "distributions.toml.txt"
        spec.write_text(DISTRIBUTIONS, encoding="utf-8")
        api.uncertainty_many([Path(folder) / "project_0000.toml"], distributions=spec, draws=100)  # warm the imports
        start = time.perf_counter()
        serial = api.uncertainty_many([folder], distributions=spec, draws=draws)
        serial_seconds = time.perf_counter() - start
        print(f"{count} projects x {draws} draws, one process: {serial_seconds:.1f} s ({serial_seconds / count * 1000:.1f} ms per project); peak memory {peak_mb(resource.RUSAGE_SELF):.0f} MB")
        start = time.perf_counter()
        spread = api.uncertainty_many([folder], distributions=spec, draws=draws, workers=workers)
        spread_seconds = time.perf_counter() - start
        same = [r.model_dump() for r in spread] == [r.model_dump() for r in serial]
        print(
            f"same on a local Dask cluster of {workers} worker processes (start-up included): {spread_seconds:.1f} s; "
            f"peak memory of a worker {peak_mb(resource.RUSAGE_CHILDREN):.0f} MB; results identical to the serial run: {same}"
        )


if __name__ == "__main__":
    arguments = [int(a) for a in sys.argv[1:]]
    main(*(arguments + [1000, 1000, 2][len(arguments) :]))
