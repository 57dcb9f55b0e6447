"""Report speed: a whole `carbonledger report` process for one demo project, without --pdf
(target < 2 s), and rendering the HTML after scoring, in process; then, for information, the
hourly demo (time series matched under every scheme, 10,000 Monte Carlo draws).

The CPU time (user + system) of the child processes is printed beside the wall-clock time: on a
machine shared with other work it is the steadier figure.

Run: python benchmarks/report.py   (in a worktree: PYTHONPATH=$PWD CARBONLEDGER_FACTORS=$PWD/factors)
"""

from __future__ import annotations

import resource
import shutil
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
GREEN = ROOT / "demo_projects" / "green_electrolysis_ammonia.toml"
HOURLY = ROOT / "demo_projects" / "hybrid_hourly_hydrogen.toml"


def whole_process(repeats: int = 7, project: Path = GREEN) -> tuple[list[float], float]:
    """Wall-clock seconds per run, and the mean CPU seconds (user + system) of the child processes
    (less sensitive than wall-clock time to other work on a shared machine)."""
    command = shutil.which("carbonledger")
    args = [command] if command else [sys.executable, "-m", "carbonledger"]
    times = []
    before = resource.getrusage(resource.RUSAGE_CHILDREN)
    with tempfile.TemporaryDirectory() as folder:
        out = Path(folder) / "report.html"
        for _ in range(repeats):
            start = time.perf_counter()
            subprocess.run(
                [*args, "report", str(project), "-o", str(out), "--force"], check=True, capture_output=True, cwd=ROOT
            )
            times.append(time.perf_counter() - start)
    after = resource.getrusage(resource.RUSAGE_CHILDREN)
    cpu = (after.ru_utime - before.ru_utime + after.ru_stime - before.ru_stime) / repeats
    return times, cpu


def render_only(repeats: int = 50) -> list[float]:
    from carbonledger.about import CAUTION
    from carbonledger.api import report_items
    from carbonledger.io.report import render_report

    items = report_items([GREEN])
    times = []
    for _ in range(repeats):
        start = time.perf_counter()
        render_report(items, generated="2026-12-01", caution=CAUTION)
        times.append(time.perf_counter() - start)
    return times


if __name__ == "__main__":
    rendered = render_only()
    print(
        f"render the HTML of one scored project: median {statistics.median(rendered) * 1000:.1f} ms, best "
        f"{min(rendered) * 1000:.1f} ms"
    )
    runs, cpu = whole_process()
    print(
        f"whole process `carbonledger report {GREEN.name} -o report.html`: median {statistics.median(runs):.2f} s, "
        f"best {min(runs):.2f} s, CPU {cpu:.2f} s per run (target < 2 s)"
    )
    runs, cpu = whole_process(3, HOURLY)
    print(
        f"whole process `carbonledger report {HOURLY.name} -o report.html` (matching, 10,000 draws): median "
        f"{statistics.median(runs):.2f} s, best {min(runs):.2f} s, CPU {cpu:.2f} s per run"
    )
