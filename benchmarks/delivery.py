"""Print the time of plant-gate and delivered scoring, and of a four-project comparison.

Run from the repository root: ``python benchmarks/delivery.py``. Figures only; nothing is asserted.
"""

import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
DEMO = ROOT / "demo_projects"
SHIPPED = [
    DEMO / f"{n}.toml"
    for n in (
        "grey_smr_ammonia_shipped",
        "blue_atr_ammonia_shipped",
        "green_electrolysis_ammonia_shipped",
        "green_ammonia_cracked_hydrogen",
    )
]


def wall(args):
    start = time.perf_counter()
    subprocess.run(
        [sys.executable, "-m", "carbonledger", *map(str, args), "--no-ledger"],
        cwd=ROOT,
        check=True,
        capture_output=True,
    )  # a benchmark records nothing
    return time.perf_counter() - start


def main():
    from carbonledger.api import compare, score

    score(DEMO / "green_electrolysis_ammonia_shipped.toml")  # warm imports (bw2calc)
    for boundary in ("cradle-to-gate", "well-to-tank", "well-to-wake"):
        start = time.perf_counter()
        for _ in range(20):
            score(DEMO / "green_electrolysis_ammonia_shipped.toml", boundary=boundary)
        print(f"score after import, {boundary:>14}: {(time.perf_counter() - start) / 20 * 1000:7.1f} ms")
    start = time.perf_counter()
    compare(SHIPPED, boundary="well-to-wake")
    print(f"compare four projects after import: {(time.perf_counter() - start) * 1000:7.1f} ms")
    print(
        "process: score plant gate (json)      "
        f"{wall(['score', DEMO / 'green_electrolysis_ammonia.toml', '--format', 'json']):5.2f} s"
    )
    print(f"process: score delivered (json)       {wall(['score', SHIPPED[2], '--format', 'json']):5.2f} s")
    print(
        "process: compare four, well-to-wake   "
        f"{wall(['compare', *SHIPPED, '--boundary', 'well-to-wake', '--format', 'json']):5.2f} s"
    )


if __name__ == "__main__":
    main()
