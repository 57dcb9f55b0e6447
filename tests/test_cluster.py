"""Portfolios on a Dask cluster: a local cluster of two worker processes gives the same results
as one process (the reference is the serial run of the same code, bit for bit)."""

from __future__ import annotations

import pytest

from carbonledger import api
from carbonledger.analyses.cluster import dask_mapper
from carbonledger.analyses.portfolio import load_portfolio, recalc
from carbonledger.model.factors import load_factor_set
from tests.helpers import DEMO, assert_one_line_error, run_cli, write

pytest.importorskip("distributed")


def test_recalc_and_monte_carlo_on_two_worker_processes_match_the_serial_run(tmp_path):
    projects = load_portfolio([DEMO])
    old, new = load_factor_set("default-2026"), load_factor_set("demo-2027-grid-revision")
    serial = recalc(projects, old, new)
    spec = write(tmp_path / "d.toml", '[factors."electricity.grid.eu27_2018"]\ndistribution = "normal"\nmean = 281\nsd = 28\n')
    tasks = [(str(path), {"distributions": spec, "draws": 500, "seed": 9}) for path in sorted(DEMO.glob("*.toml"))[:4]]
    serial_draws = [api.uncertainty_one(task) for task in tasks]
    with dask_mapper(workers=2) as (mapper, chunks):
        assert chunks >= 2
        spread = recalc(projects, old, new, mapper=mapper, chunks=chunks)
        spread_draws = mapper(api.uncertainty_one, tasks)
    assert spread.new_scores == serial.new_scores and spread.old_scores == serial.old_scores
    assert spread.rows == serial.rows and spread.rescored == serial.rescored > 0
    assert [r.model_dump() for r in spread_draws] == [r.model_dump() for r in serial_draws]


def test_workers_and_scheduler_together_is_one_line():
    assert_one_line_error(run_cli("recalc", DEMO, "--to", "demo-2027-grid-revision", "--workers", "2", "--scheduler", "tcp://127.0.0.1:1", "--no-ledger"))
    assert_one_line_error(run_cli("recalc", DEMO, "--to", "demo-2027-grid-revision", "--workers", "0", "--no-ledger"))
