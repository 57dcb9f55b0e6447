"""Benchmark: the run ledger on SQLite and on PostgreSQL, measured in the same run.

Prints, for each backend:
- records per second written one per transaction (``record_run`` with one result: what
  ``score`` does), and in batches of 1,000 (``write_batch``: what recalc's workers do);
- the end-to-end time (best of two, interleaved) of ``api.recalc`` over N invented projects
  (default 10,000) recording every old and new score in the ledger, next to the same recalc without
  a ledger; the target is PostgreSQL at most 1.3 times SQLite.

PostgreSQL: a throwaway server started with initdb/pg_ctl (tests/pg_support.py, as a non-root
user, fsync off like the tests' server), a new database for each timed recalc (a recalc run
again on the same ledger records nothing). Prints figures only; nothing is asserted.

    python benchmarks/ledger.py [N]
"""

from __future__ import annotations

import importlib.util
import os
import random
import sys
import tempfile
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE.parent / "tests"))


def invented_projects(folder: Path, count: int) -> None:
    """The varied, invented projects of benchmarks/recalc.py."""
    spec = importlib.util.spec_from_file_location("recalc_benchmark", HERE / "recalc.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    rng = random.Random(2026)
    for number in range(count):
        (folder / f"project_{number:05d}.toml").write_text(module.project(number, rng), encoding="utf-8")


def sample_record(number: int):
    from carbonledger.io.ledger import LedgerRecord

    checks = [
        {
            "scheme": s,
            "value": 1.0 + number % 9,
            "unit": "kg CO2e/kg H2",
            "limit": 4.0,
            "passes": True,
            "status": "qualifies",
            "tier": None,
        }
        for s in ("us-45v", "eu-rfnbo", "uk-lchs")
    ]
    return LedgerRecord(
        f"/bench/project_{number}.toml",
        f"Benchmark project {number} (invented)",
        f"{number:064x}",
        "default-2026",
        "1" * 64,
        ["us-45v", "eu-rfnbo", "uk-lchs"],
        "cradle-to-gate",
        "ar6",
        {"total": float(number), "unit": "kg CO2e/kg H2", "checks": checks},
        {"electrolysis": {"electricity_kwh_per_kg_h2": 50 + number % 11}},
        [{"id": "electricity.grid.eu27_2018", "value": 281.0, "unit": "g CO2e/kWh"}],
    )


def records_per_second(where, single: int = 300, batched: int = 5000) -> tuple[float, float]:
    from carbonledger.io.ledger import close_run, open_run, record_run, run_target, write_batch

    start = time.perf_counter()
    for number in range(single):
        record_run("benchmark single", [sample_record(number)], ledger=where)
    one = single / (time.perf_counter() - start)
    target = run_target(where, {"benchmark": time.time()}, "benchmark batched", "score")
    open_run(target)
    start = time.perf_counter()
    for first in range(0, batched, 1000):
        write_batch(target, [(f"{n:06d}", sample_record(n)) for n in range(first, first + 1000)])
    many = batched / (time.perf_counter() - start)
    close_run(target)
    return one, many


def timed_recalc(folder: Path, where) -> tuple[float, int]:
    from carbonledger import api
    from carbonledger.io.ledger import close_run

    start = time.perf_counter()
    result = api.recalc(
        [folder], "default-2026", api.Assessment(api.load_factor_set("demo-2027-grid-revision")), ledger=where
    )
    if result.ledger_run is not None:
        close_run(result.ledger_run)
    return time.perf_counter() - start, len(result.old_scores) + len(result.new_scores)


def main(count: int = 10_000) -> None:
    from pg_support import LEDGER_PASSWORD, start_server

    from carbonledger.io.ledger import upgrade_ledger
    from carbonledger.io.ledger_store import locate

    server = start_server()
    if server is None:
        print("PostgreSQL (initdb, pg_ctl) not installed: install the postgresql package")
        return
    os.environ["PGPASSWORD"] = LEDGER_PASSWORD
    try:
        with tempfile.TemporaryDirectory() as folder_text:
            folder = Path(folder_text)
            backends = {"SQLite": locate(str(folder / "ledger.sqlite"))}
            postgres = server.url(server.new_database())
            upgrade_ledger(postgres)
            backends["PostgreSQL"] = locate(postgres)
            for name in backends:
                one, many = records_per_second(backends[name])
                print(
                    f"{name:<10} records/s: {one:8.0f} one per transaction (record_run), {many:8.0f} in batches of "
                    "1,000 (write_batch)"
                )
            projects = folder / "projects"
            projects.mkdir()
            invented_projects(projects, count)
            timed_recalc(
                projects, None
            )  # warms every cache the timed runs share (factor sets, bw2calc, the server's engine)
            baseline_runs, sqlite_runs, postgres_runs = [], [], []
            for repeat in range(2):  # interleaved, best of two each: the machine may be shared
                baseline_runs.append(timed_recalc(projects, None)[0])
                sqlite_runs.append(timed_recalc(projects, locate(str(folder / f"recalc{repeat}.sqlite")))[0])
                postgres = server.url(server.new_database())
                upgrade_ledger(postgres)
                seconds, records = timed_recalc(projects, locate(postgres))
                postgres_runs.append(seconds)
            baseline, sqlite_s, postgres_s = min(baseline_runs), min(sqlite_runs), min(postgres_runs)
            print(
                f"recalc of {count} projects (best of two): without a ledger {baseline:.1f} s; recording {records} "
                f"records: SQLite {sqlite_s:.1f} s, PostgreSQL {postgres_s:.1f} s"
            )
            print(
                f"ledger's share of the recalc: SQLite {sqlite_s - baseline:+.1f} s, PostgreSQL "
                f"{postgres_s - baseline:+.1f} s (differences below a few seconds are the machine's noise)"
            )
            print(f"PostgreSQL / SQLite, end to end: {postgres_s / sqlite_s:.2f} (target: at most 1.3)")
    finally:
        server.stop()


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 10_000)
