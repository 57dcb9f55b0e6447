"""Benchmark: recalculate a portfolio of 1,000 (or N, e.g. 10,000) varied projects under a new factor set.

Generates the projects (invented, varied routes and parameters) in a temporary folder, then times
``carbonledger.analyses.portfolio.recalc`` from default-2026 to demo-2027-grid-revision: reading and validating
every file once, scoring under the old set, diffing the sets, rescoring the projects that use a changed factor
(projects of one shape built and solved as arrays, the first of each also scored alone and checked against the
arrays; one bw2calc check per matrix structure). For comparison it also times the naive path
(``analyses.pipeline.assess`` with one bw2calc LCA per project and set) on a sample in the same run, and prints
the ratio, the peak memory and the machine's load. Prints figures only; nothing is asserted.

    python benchmarks/recalc.py [N]
"""

from __future__ import annotations

import os
import random
import resource
import sys
import tempfile
import time
from pathlib import Path

GRIDS = ["electricity.grid.eu27_2018", "electricity.grid.ireland_2015"]
RENEWABLES = [
    "electricity.renewable.wind_onshore",
    "electricity.renewable.solar_pv_utility",
    "electricity.renewable.wind_offshore",
    "electricity.renewable.hydropower",
]


def electricity(rng: random.Random, grid_share: float) -> str:
    text = ""
    if grid_share > 0:
        text += f'[electricity.sources.grid]\nshare = {grid_share}\nfactor = "{rng.choice(GRIDS)}"\n'
    if grid_share < 1:
        text += (
            f"[electricity.sources.renewable]\nshare = {round(1 - grid_share, 6)}\nfactor = "
            f'"{rng.choice(RENEWABLES)}"\n'
        )
    return text


def ammonia(rng: random.Random, process_air: bool) -> str:
    nitrogen = "process_air" if process_air else "air_separation"
    return (
        f'[ammonia]\nnitrogen_source = "{nitrogen}"\nair_separation_kwh_per_t_n2 = '
        f"{0 if process_air else rng.uniform(90, 130):.1f}\n"
        f"hydrogen_loss_allowance = {rng.uniform(0, 0.03):.4f}\nsynthesis_electricity_kwh_per_t_nh3 = "
        f"{rng.uniform(100, 700):.1f}\n"
        f"storage_electricity_kwh_per_t_nh3 = {rng.uniform(10, 40):.1f}\nstorage_loss_fraction = "
        f"{rng.uniform(0, 0.003):.5f}\n"
    )


def project(number: int, rng: random.Random) -> str:
    kind = rng.choice(["green", "hybrid", "grid", "grey", "blue_smr", "blue_atr"])
    product = rng.choice(["ammonia", "hydrogen"])
    head = (
        f'# INVENTED benchmark project\n[project]\nname = "Benchmark project {number} ({kind}, invented)"\nproduct = '
        f'"{product}"\n\n'
    )
    if kind in ("green", "hybrid", "grid"):
        grid_share = {"green": 0.0, "hybrid": round(rng.uniform(0.05, 0.5), 4), "grid": 1.0}[kind]
        body = (
            f'[hydrogen]\nroute = "electrolysis"\nconditioning_kwh_per_kg_h2 = {rng.uniform(0, 2):.3f}\n'
            f'[electrolysis]\ntechnology = "{rng.choice(["alkaline", "pem"])}"\nelectricity_kwh_per_kg_h2 = '
            f"{rng.uniform(48, 58):.3f}\n" + electricity(rng, grid_share)
        )
        if product == "ammonia":
            body += ammonia(rng, False)
        return head + body
    atr = kind == "blue_atr"
    body = (
        f'[hydrogen]\nroute = "{"autothermal_reforming" if atr else "steam_methane_reforming"}"\n'
        f"[reforming]\nnatural_gas_gj_per_kg_h2 = {rng.uniform(0.155, 0.175):.4f}\nelectricity_kwh_per_kg_h2 = "
        f"{rng.uniform(0.2, 2):.3f}\n"
        f"process_co2_share = {0.96 if atr else rng.uniform(0.55, 0.65):.3f}\n"
        f"[natural_gas]\nmethane_emission_share = {rng.uniform(0.002, 0.03):.4f}\nmethane_emission_basis = "
        '"methane_delivered"\n'
    )
    if kind != "grey":
        body += (
            f"[capture]\ncapture_rate = {rng.uniform(0.55, 0.95):.3f}\napplies_to = "
            f'"{"process" if atr else "process_and_flue"}"\n'
            f"compression_kwh_per_t_co2 = {rng.uniform(90, 130):.1f}\ntransport_storage_loss_fraction = "
            f"{rng.uniform(0, 0.03):.4f}\n"
        )
    body += electricity(rng, round(rng.uniform(0.3, 1.0), 4))
    if product == "ammonia":
        body += ammonia(rng, kind == "grey")
    return head + body


def peak_mb() -> float:
    """Peak resident memory of this process so far (MB; imports included)."""
    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024


def main(count: int = 1000) -> None:
    t0 = time.perf_counter()
    from carbonledger.analyses.pipeline import assess
    from carbonledger.analyses.portfolio import load_portfolio, recalc
    from carbonledger.core.assessment import Assessment
    from carbonledger.core.engine import import_bw2calc
    from carbonledger.model.factors import load_factor_set

    import_bw2calc()  # import cost reported apart
    print(
        f"imports (bw2calc included): {time.perf_counter() - t0:.2f} s; peak memory after imports: {peak_mb():.0f} MB"
    )
    print(f"machine load (1-minute load average, 2 cores) at the start: {os.getloadavg()[0]:.1f}")
    rng = random.Random(2026)
    with tempfile.TemporaryDirectory() as folder:
        for number in range(count):
            (Path(folder) / f"project_{number:04d}.toml").write_text(project(number, rng), encoding="utf-8")
        start, cpu_start = time.perf_counter(), time.process_time()
        old_set, new_set = load_factor_set("default-2026"), load_factor_set("demo-2027-grid-revision")
        loaded = time.perf_counter()
        portfolio = load_portfolio([folder])
        parsed = time.perf_counter()
        result = recalc(portfolio, old_set, new_set)
        done, cpu_done = time.perf_counter(), time.process_time()
        total, fast_peak = done - start, peak_mb()
        print(
            f"projects: {count}; structures: {len({(s.product, tuple(s.by_stage)) for s in result.old_scores})} (by "
            "product and stages)"
        )
        print(f"factor sets loaded: {loaded - start:.3f} s; projects read and validated once: {parsed - loaded:.3f} s")
        print(
            f"recalc (score under old set, diff, rescore {result.rescored} projects that use a changed factor): "
            f"{done - parsed:.3f} s"
        )
        print(
            f"fast path total: {total:.2f} s elapsed ({cpu_done - cpu_start:.2f} s CPU) for {count} projects = "
            f"{total / count * 1000:.2f} ms per project (target for 10,000: under 8 s)"
        )
        print(
            f"fast path peak memory (whole process, imports included): {fast_peak:.0f} MB (target for 10,000: under "
            "600 MB)"
        )
        print(f"newly failing project-scheme pairs: {len(result.newly_failing)}")
        from carbonledger.io.ledger import record_run

        ledger_start = time.perf_counter()
        record_run(
            "recalc (benchmark)",
            [*result.old_scores, *result.new_scores],
            ledger=Path(folder) / "ledger.sqlite",
            kind="recalc",
        )
        print(
            f"recording the run in a new ledger ({2 * count} records, one transaction): "
            f"{time.perf_counter() - ledger_start:.2f} s"
        )
        sample = portfolio[:100]
        naive_start = time.perf_counter()
        for item in sample:
            assess(Assessment(old_set), item.project)
            assess(Assessment(new_set), item.project)
        naive = (time.perf_counter() - naive_start) / len(sample)
        print(
            f"naive path, same run (one bw2calc LCA per project and set, 100 projects): {naive * 1000:.2f} ms per "
            f"project, {naive * count:.1f} s for {count}"
        )
        print(f"ratio naive / fast (whole fast path, reading included): {naive * count / total:.1f}")
        phases(portfolio, old_set)
        print(f"machine load at the end: {os.getloadavg()[0]:.1f}")


def phases(projects: list, factor_set) -> None:
    """Where one scoring of the portfolio goes (``portfolio.figures_many`` under one set): how many shapes,
    how many projects went through arrays and how many were scored alone, and the time of each part."""
    from carbonledger.analyses import portfolio as module
    from carbonledger.core.assessment import Assessment

    spent = {"arrays": 0.0, "arrays_projects": 0, "passes": 0}
    real = module.group_figures

    def timed(template, first, members):
        began = time.perf_counter()
        result = real(template, first, members)
        spent["arrays"] += time.perf_counter() - began
        spent["passes"] += 1
        spent["arrays_projects"] += len(members) if result is not None else 0
        return result

    module.group_figures = timed
    try:
        with module.collector_paused():
            began = time.perf_counter()
            module.figures_many(Assessment(factor_set, "ar6"), projects)
            whole = time.perf_counter() - began
    finally:
        module.group_figures = real
    alone = len(projects) - spent["arrays_projects"]
    print(
        f"one scoring of the {len(projects)} projects: {whole:.2f} s; {spent['passes']} array passes scored "
        f"{spent['arrays_projects']} projects in {spent['arrays']:.2f} s; the first of each shape "
        f"also alone; {alone} only alone (a shape of fewer than {module.MIN_GROUP}, a time series or a differing "
        "co-product rule)"
    )


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 1000)
