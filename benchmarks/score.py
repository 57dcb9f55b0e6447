"""Scoring speed, printed (nothing is asserted):

1. one project after import (target < 20 ms);
2. the whole process of `carbonledger score` on a shipped demo project against the time of
   `python -c "import bw2calc"`, measured in the same run, alternating the two, in fresh
   processes (target: ratio of the medians at most 1.15), as elapsed time and as CPU time (user +
   system of the child process: steadier on a shared machine);
3. the whole process of `carbonledger score` on a plant-gate demo project (target < 1.5 s).

Both sides run from compiled bytecode: bw2calc's ``.pyc`` files were written when pip installed
it, and a pip install of carbonledger writes them too, but an editable checkout run with
``PYTHONDONTWRITEBYTECODE=1`` (set on the shared machine) would recompile carbonledger's 80 modules
in every process (about 0.1 s of CPU); the benchmark compiles them first (``compileall``) and says so.

Run: python benchmarks/score.py [repeats]   (default 7 repeats of each process)
"""

from __future__ import annotations

import compileall
import os
import resource
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
GREEN = ROOT / "demo_projects" / "green_electrolysis_ammonia.toml"
SHIPPED = ROOT / "demo_projects" / "grey_smr_ammonia_shipped.toml"


def in_process(repeats: int = 50) -> list[float]:
    from carbonledger.api import score

    score(GREEN)  # warm: imports, factor set parse, rulebooks
    times = []
    for _ in range(repeats):
        start = time.perf_counter()
        score(GREEN)
        times.append(time.perf_counter() - start)
    return times


def carbonledger_command() -> list[str]:
    """The command of the environment running this benchmark (its console script beside this
    interpreter), never another `carbonledger` found on the PATH (a shim, another checkout)."""
    script = Path(sys.executable).parent / "carbonledger"
    return [str(script)] if script.is_file() else [sys.executable, "-m", "carbonledger"]


CPU: dict[str, list[float]] = {}  # command label -> CPU seconds of each run


def seconds(args: list[str], cwd: Path, label: str = "") -> float:
    """Elapsed seconds of one fresh process; its CPU seconds (user + system) are kept under ``label``."""
    before = resource.getrusage(resource.RUSAGE_CHILDREN)
    start = time.perf_counter()
    subprocess.run(args, check=True, capture_output=True, cwd=cwd)
    elapsed = time.perf_counter() - start
    after = resource.getrusage(resource.RUSAGE_CHILDREN)
    CPU.setdefault(label, []).append(after.ru_utime - before.ru_utime + after.ru_stime - before.ru_stime)
    return elapsed


def shipped_against_bw2calc(repeats: int, cwd: Path) -> tuple[list[float], list[float]]:
    """Alternate `import bw2calc` and `carbonledger score SHIPPED`, so both see the same load."""
    import_only = [sys.executable, "-c", "import bw2calc"]
    score_shipped = [*carbonledger_command(), "score", str(SHIPPED), "--format", "json", "--no-ledger"]
    seconds(import_only, cwd)  # warm the file cache for both
    seconds(score_shipped, cwd)
    imports, scores = [], []
    for _ in range(repeats):
        imports.append(seconds(import_only, cwd, "bw2calc"))
        scores.append(seconds(score_shipped, cwd, "shipped"))
    return imports, scores


def compile_package() -> None:
    """Write carbonledger's bytecode, as a pip install does (see the module docstring)."""
    compileall.compile_dir(ROOT / "carbonledger", quiet=1)
    if os.environ.get("PYTHONDONTWRITEBYTECODE"):
        print("PYTHONDONTWRITEBYTECODE is set: carbonledger's bytecode was compiled first, as a pip install does")


def main(repeats: int = 7) -> None:
    compile_package()
    scores = in_process()
    print(
        f"score one project after import: median {statistics.median(scores) * 1000:.1f} ms, best "
        f"{min(scores) * 1000:.1f} ms (target < 20 ms)"
    )
    with tempfile.TemporaryDirectory() as folder:  # run outside the source tree, like a user
        cwd = Path(folder)
        imports, shipped = shipped_against_bw2calc(repeats, cwd)
        bw2calc_median, shipped_median = statistics.median(imports), statistics.median(shipped)
        print(
            f'`python -c "import bw2calc"`: median {bw2calc_median:.2f} s, best {min(imports):.2f} s ({repeats} runs)'
        )
        print(
            f"whole process `carbonledger score {SHIPPED.name} --format json`: median {shipped_median:.2f} s, best "
            f"{min(shipped):.2f} s ({repeats} runs)"
        )
        print(
            f"ratio of the medians (shipped score / bw2calc import): {shipped_median / bw2calc_median:.2f} (target <= "
            "1.15)"
        )
        cpu_bw2calc, cpu_shipped = statistics.median(CPU["bw2calc"]), statistics.median(CPU["shipped"])
        print(
            f"CPU time (user + system), medians: bw2calc import {cpu_bw2calc:.2f} s, shipped score {cpu_shipped:.2f} "
            f"s, ratio {cpu_shipped / cpu_bw2calc:.2f} (target <= 1.15)"
        )
        green = [
            seconds([*carbonledger_command(), "score", str(GREEN), "--format", "json", "--no-ledger"], cwd)
            for _ in range(repeats)
        ]
        print(
            f"whole process `carbonledger score {GREEN.name} --format json`: median {statistics.median(green):.2f} s, "
            f"best {min(green):.2f} s (target < 1.5 s)"
        )


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 7)
