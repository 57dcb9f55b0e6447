"""Matching and planning speed (targets: one year hourly, 3 sources, 6 schemes < 50 ms after import;
30 years hourly, 262,800 intervals < 1 s; the operating plan for one year hourly < 10 s).

Run: python benchmarks/matching.py
"""

from __future__ import annotations

import statistics
import time
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parent.parent
DEMO = ROOT / "demo_projects" / "hybrid_hourly_hydrogen.toml"
SCHEMES = ("eu-rfnbo", "us-45v", "uk-lchs", "japan-hydrogen")


def synthetic(years: int, seed: int = 1):
    """Invented hourly data: load, three sources, grid intensity (random, for timing only)."""
    rng = np.random.default_rng(seed)
    n = 8760 * years
    utc = np.datetime64("2026-01-01T00:00", "m") + np.arange(n) * np.timedelta64(60, "m")
    load = rng.uniform(0, 20000, n)
    supply = {name: rng.uniform(0, scale, n) for name, scale in (("solar", 15000), ("wind", 20000), ("hydro", 5000))}
    grid = rng.uniform(50, 500, n)
    return utc, utc + np.timedelta64(60, "m"), load, supply, grid


def time_matching(years: int, repeats: int) -> list[float]:
    from carbonledger.analyses.matching import (
        ElectricityModel,
        counted_intensity,
        match,
        monthly_intensities,
        scheme_granularity,
    )

    utc, local, load, supply, grid = synthetic(years)
    model = ElectricityModel(
        1.0, 55.0, {"solar": 0.0, "wind": 0.0, "hydro": 0.0}, 0.0, 0.3, 1.0, ["solar", "wind", "hydro"]
    )
    rules = [scheme_granularity(s, local) for s in SCHEMES] + ["month", "quarter"]  # six schemes' rules
    months = local.astype("datetime64[M]")
    starts = np.flatnonzero(np.r_[True, months[1:] != months[:-1]])
    times = []
    for _ in range(repeats):
        start = time.perf_counter()
        for rule in rules:
            result = match(load, supply, list(supply), rule, utc, local)
            counted_intensity(result, load, model, grid)
            monthly_intensities(result, load, model, grid, starts)
        times.append(time.perf_counter() - start)
    return times


def time_score_demo(repeats: int) -> list[float]:
    from carbonledger.api import score

    score(DEMO)
    times = []
    for _ in range(repeats):
        start = time.perf_counter()
        score(DEMO)
        times.append(time.perf_counter() - start)
    return times


def time_plan(repeats: int, min_load: float, part_load=None) -> list[float]:
    from carbonledger.api import plan

    times = []
    for _ in range(repeats):
        start = time.perf_counter()
        result, _ = plan(DEMO, scheme="eu-rfnbo", matching="hour", min_load=min_load, part_load=part_load)
        times.append(time.perf_counter() - start)
    assert result.qualifies
    return times


if __name__ == "__main__":
    time_matching(1, 1)  # warm imports
    one = time_matching(1, 20)
    print(
        "matching, 1 year hourly (8,760 intervals), 3 sources, 6 schemes' rules with monthly breakdown: median "
        f"{statistics.median(one) * 1000:.1f} ms (target < 50 ms)"
    )
    thirty = time_matching(30, 3)
    print(
        "matching, 30 years hourly (262,800 intervals), 3 sources, 6 schemes' rules with monthly breakdown: median "
        f"{statistics.median(thirty) * 1000:.0f} ms (target < 1 s)"
    )
    demo = time_score_demo(5)
    print(
        "score of the hourly demo (read 8,760-row CSV, bw2calc solve, 4 schemes matched): median "
        f"{statistics.median(demo) * 1000:.0f} ms"
    )
    linear = time_plan(2, 0.0)
    print(
        f"plan, 1 year hourly, eu-rfnbo hourly, any load (linear program): median {statistics.median(linear):.2f} s "
        "(target < 10 s)"
    )
    mixed = time_plan(1, 0.2)
    print(
        "plan, 1 year hourly, eu-rfnbo hourly, minimum stable load 20 % (mixed-integer): "
        f"{statistics.median(mixed):.2f} s"
    )
    curve = time_plan(1, 0.2, [(0.2, 60.0), (0.5, 52.0), (1.0, 54.0)])
    print(
        "plan, 1 year hourly, eu-rfnbo hourly, minimum stable load 20 %, part-load curve (valued at the curve's "
        f"kWh/kg): {statistics.median(curve):.2f} s"
    )
