"""Print the time to write the audit workbook of the largest demo project with 12 metered months,
and of the hourly demo with its year of intervals (Matching and Intervals sheets, 8,760 rows).

Run: python benchmarks/workbook.py   (target: under 2 s for the write, imports excluded)
"""

from __future__ import annotations

import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent


def main() -> None:
    started = time.perf_counter()
    from carbonledger.api import audit_workbook, score
    from carbonledger.io.workbook.writer import write_workbook_file

    demos = [
        path
        for path in sorted((ROOT / "demo_projects").glob("*.toml"))
        if path.with_name(f"{path.stem}_meters_2026.csv").exists()
    ]
    largest = max(demos, key=lambda path: len(score(path).exchanges))  # of the demo projects with 12 metered months
    meters = largest.with_name(f"{largest.stem}_meters_2026.csv")
    imported = time.perf_counter()
    with tempfile.TemporaryDirectory() as folder:
        audit_workbook(largest, periods=meters)  # warm caches (factor set, schemes, pint)
        timings = []
        for _ in range(3):
            begin = time.perf_counter()
            book, result, _ = audit_workbook(largest, periods=meters)
            built = time.perf_counter()
            write_workbook_file(Path(folder) / "w.xlsx", book, force=True)
            timings.append((built - begin, time.perf_counter() - built))
    rows = sum(len(ws["A"]) for ws in book.worksheets)
    print(
        f"project: {largest.relative_to(ROOT)} ({len(result.exchanges)} exchanges), meters: {meters.relative_to(ROOT)} "
        "(12 months)"
    )
    print(f"imports and first scores: {imported - started:.2f} s")
    best = min(timings, key=sum)
    print(
        f"workbook with 12 periods: build {best[0]:.2f} s + save {best[1]:.2f} s = {sum(best):.2f} s (best of 3; "
        f"target < 2 s); {rows} rows"
    )
    hourly = ROOT / "demo_projects" / "hybrid_hourly_hydrogen.toml"
    with tempfile.TemporaryDirectory() as folder:
        timings = []
        for _ in range(3):
            begin = time.perf_counter()
            book, result, _ = audit_workbook(hourly)
            built = time.perf_counter()
            write_workbook_file(Path(folder) / "h.xlsx", book, force=True)
            timings.append((built - begin, time.perf_counter() - built))
    best = min(timings, key=sum)
    intervals = book["Intervals"].max_row - 3
    print(
        f"hourly demo with its time series ({intervals:,} intervals, Matching and Intervals sheets): build "
        f"{best[0]:.2f} s + save {best[1]:.2f} s = {sum(best):.2f} s (best of 3)"
    )
    import subprocess

    with tempfile.TemporaryDirectory() as folder:
        begin = time.perf_counter()
        command = [
            sys.executable,
            "-m",
            "carbonledger",
            "workbook",
            str(largest),
            "--periods",
            str(meters),
            "-o",
            str(Path(folder) / "w.xlsx"),
            "--no-ledger",
        ]
        subprocess.run(command, check=True, capture_output=True)
        print(
            "whole process, `carbonledger workbook ... --periods` from a cold start: "
            f"{time.perf_counter() - begin:.2f} s"
        )


if __name__ == "__main__":
    main()
