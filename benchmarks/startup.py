"""Start-up of the command line, printed (nothing is asserted): `carbonledger --help` against a bare
`python -c pass`, in fresh processes, alternating the two (target: --help answers in under 0.3 s).
Elapsed and CPU time (user + system of the child) are both printed: the CPU time is steadier on a
shared machine. tests/test_startup.py lists the modules each command loads.

Run: python benchmarks/startup.py [repeats]   (default 9)
"""

from __future__ import annotations

import resource
import shutil
import statistics
import subprocess
import sys
import time


def run(args: list[str]) -> tuple[float, float]:
    before = resource.getrusage(resource.RUSAGE_CHILDREN)
    start = time.perf_counter()
    subprocess.run(args, check=True, capture_output=True)
    elapsed = time.perf_counter() - start
    after = resource.getrusage(resource.RUSAGE_CHILDREN)
    return elapsed, after.ru_utime - before.ru_utime + after.ru_stime - before.ru_stime


def main(repeats: int = 9) -> None:
    command = shutil.which("carbonledger")
    help_args = [command, "--help"] if command else [sys.executable, "-m", "carbonledger", "--help"]
    bare, helps = [], []
    run(help_args)  # warm the file cache
    for _ in range(repeats):
        bare.append(run([sys.executable, "-c", "pass"]))
        helps.append(run(help_args))
    for label, runs, target in (("python -c pass", bare, ""), ("carbonledger --help", helps, " (target < 0.3 s)")):
        print(
            f"{label}: elapsed median {statistics.median(r[0] for r in runs):.3f} s{target}, CPU median "
            f"{statistics.median(r[1] for r in runs):.3f} s ({repeats} runs)"
        )


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 9)
