"""Benchmark: Monte Carlo of a generated portfolio, in one process and on a local Dask cluster.

Generates N invented projects (the generator of benchmarks/recalc.py) with one distributions file
for all of them (the grid factor and the upstream CO2 of natural gas; invented ranges), then runs
the Monte Carlo of every project with D draws each, serially (``api.uncertainty_many``) and on a
local Dask cluster of W worker processes (the same per-project function, ``api.uncertainty_one``,
mapped by ``analyses.cluster.dask_mapper``), and prints the time (cluster start-up apart), the
peak memory of this process and of each worker (asked of the workers before the cluster closes)
and whether the two runs agree. Prints figures only; nothing is asserted.

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
from carbonledger.analyses.cluster import dask_mapper  # noqa: E402
from carbonledger.analyses.portfolio import project_files  # noqa: E402

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


def peak_mb(who=resource.RUSAGE_SELF) -> float:
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
        print(
            f"{count} projects x {draws} draws, one process: {serial_seconds:.1f} s "
            f"({serial_seconds / count * 1000:.1f} ms per project); peak memory {peak_mb(resource.RUSAGE_SELF):.0f} MB"
        )
        options = {
            "distributions": spec,
            "draws": draws,
            "seed": api.DEFAULT_SEED,
            "sampling": None,
            "assessment": api.Assessment(api.load_factor_set()),
        }
        tasks = [(str(path), options) for path in project_files([folder])]
        start = time.perf_counter()
        with dask_mapper(workers, None) as (mapper, _):
            from distributed import default_client

            started = time.perf_counter()
            spread = list(mapper(api.uncertainty_one, tasks))
            done = time.perf_counter()
            worker_peaks = sorted(default_client().run(peak_mb).values())
        same = [r.model_dump_json() for r in spread] == [r.model_dump_json() for r in serial]
        print(
            f"same on a local Dask cluster of {workers} worker processes: {done - started:.1f} s "
            f"({(done - started) / count * 1000:.1f} ms per project; "
            f"cluster start-up {started - start:.1f} s more); peak memory per worker "
            f"{', '.join(f'{mb:.0f}' for mb in worker_peaks)} MB; "
            f"this process {peak_mb():.0f} MB; results identical to the serial run: {same}"
        )


if __name__ == "__main__":
    arguments = [int(a) for a in sys.argv[1:]]
    main(*(arguments + [1000, 1000, 2][len(arguments) :]))
