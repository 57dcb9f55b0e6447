"""Scoring speed: one project after import (target < 20 ms), and a whole `carbonledger score` process (target < 1.5 s).

Run: python benchmarks/score.py
"""

from __future__ import annotations

import shutil
import statistics
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
GREEN = ROOT / "demo_projects" / "green_electrolysis_ammonia.toml"


def in_process(repeats: int = 50) -> list[float]:
    from carbonledger.api import score

    score(GREEN)  # warm: imports, factor set parse, rulebooks
    times = []
    for _ in range(repeats):
        start = time.perf_counter()
        score(GREEN)
        times.append(time.perf_counter() - start)
    return times


def whole_process(repeats: int = 7) -> list[float]:
    command = shutil.which("carbonledger")
    args = [command] if command else [sys.executable, "-m", "carbonledger"]
    times = []
    for _ in range(repeats):
        start = time.perf_counter()
        subprocess.run([*args, "score", str(GREEN), "--format", "json"], check=True, capture_output=True, cwd=ROOT)
        times.append(time.perf_counter() - start)
    return times


if __name__ == "__main__":
    scores = in_process()
    print(f"score one project after import: median {statistics.median(scores) * 1000:.1f} ms, best {min(scores) * 1000:.1f} ms (target < 20 ms)")
    runs = whole_process()
    print(f"whole process `carbonledger score {GREEN.name} --format json`: median {statistics.median(runs):.2f} s, best {min(runs):.2f} s (target < 1.5 s)")
