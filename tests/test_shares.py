"""Electricity shares moved together (``model.shares``), checked against arithmetic written out by hand,
and the one place both Monte Carlo draws and the levers of ``qualify`` use it (``params_with_draws``)."""

from __future__ import annotations

import numpy as np
import pytest
from helpers import assessment_with

from carbonledger.analyses.uncertainty import Draws, limit_breaks, make_plan, params_with_draws
from carbonledger.core.scoring import DEFAULT_GWP
from carbonledger.model.distributions import parse_uncertainty
from carbonledger.model.factors import load_factor_set
from carbonledger.model.shares import negative_shares, rebalanced_shares, rebalancing_problem
from carbonledger.routes.project import load_project
from tests.helpers import DEMO

SHARES = {"grid": 0.25, "solar": 0.2, "wind": 0.55}  # the hourly demo's declared shares


def test_one_moved_share_is_the_proportional_rule():
    # By hand: grid to 0.45; solar and wind share the remaining 0.55 as 0.2 : 0.55, i.e. 0.2 x 0.55 / 0.75 and 0.55 x 0.55 / 0.75.
    found = rebalanced_shares(SHARES, {"grid": 0.45})
    assert found == pytest.approx({"grid": 0.45, "solar": 0.2 * 0.55 / 0.75, "wind": 0.55 * 0.55 / 0.75})


def test_two_moved_shares_together():
    # By hand: grid 0.35 (+0.10) and solar 0.10 (-0.10): wind, the only unmoved source, takes up -0.10 + 0.10 = 0.
    assert rebalanced_shares(SHARES, {"grid": 0.35, "solar": 0.1}) == pytest.approx({"grid": 0.35, "solar": 0.1, "wind": 0.55})
    # grid 0.45 (+0.20), solar 0.30 (+0.10): wind 0.55 - 0.30 = 0.25.
    assert rebalanced_shares(SHARES, {"grid": 0.45, "solar": 0.3}) == pytest.approx({"grid": 0.45, "solar": 0.3, "wind": 0.25})
    # solar 0.4 (+0.2) taken up by the grid alone: grid 0.05, wind unchanged.
    assert rebalanced_shares(SHARES, {"solar": 0.4}, {"solar": "grid"}) == pytest.approx({"solar": 0.4, "grid": 0.05, "wind": 0.55})


def test_arrays_and_what_cannot_be_rebalanced():
    found = rebalanced_shares(SHARES, {"grid": np.array([0.25, 0.5]), "solar": np.array([0.2, 0.6])})
    assert found["wind"] == pytest.approx([0.55, -0.1])  # 0.55 - (0.25 + 0.4) = -0.1 on the second
    assert negative_shares(found)["wind"].tolist() == [False, True]
    assert "other sources to take up" in rebalancing_problem(SHARES, ["grid", "solar", "wind"], {})
    assert "is moved itself" in rebalancing_problem(SHARES, ["grid", "solar"], {"solar": "grid"})
    assert rebalancing_problem(SHARES, ["grid", "solar"], {}) == ""


def test_draws_of_two_shares_sum_to_one_and_leave_out_what_cannot():
    # The hourly demo with distributions on two shares: each draw's shares sum to 1 (wind takes up
    # both), and a draw whose two shares sum above 1 is left out as breaking a limit.
    project, _ = load_project(DEMO / "hybrid_hourly_hydrogen.toml")
    uncertainty = parse_uncertainty({"parameters": {
        "electricity.sources.grid.share": {"distribution": "uniform", "low": 0.1, "high": 0.6},
        "electricity.sources.solar.share": {"distribution": "uniform", "low": 0.1, "high": 0.6},
    }}, "test")
    plan = make_plan(project, assessment_with(factors=load_factor_set(), gwp=DEFAULT_GWP), uncertainty)
    grid, solar = np.array([0.3, 0.6]), np.array([0.2, 0.5])
    params = params_with_draws(plan, {"electricity.sources.grid.share": grid, "electricity.sources.solar.share": solar})
    sources = params["electricity"]["sources"]
    assert sources["wind"]["share"] == pytest.approx([0.5, -0.1])
    total = sources["grid"]["share"] + sources["solar"]["share"] + sources["wind"]["share"]
    assert total == pytest.approx([1.0, 1.0])
    draws = Draws([], np.zeros((2, 0)), {"electricity.sources.grid.share": grid, "electricity.sources.solar.share": solar}, {}, {})
    broken, reasons = limit_breaks(plan, draws, 2)
    assert broken.tolist() == [False, True]
    assert any(reason["field"] == "electricity.sources.wind.share" for reason in reasons)


@pytest.mark.parametrize(
    ("path", "source"),
    [
        ("electricity.sources.grid.share", "grid"),
        ('electricity.sources."wind PPA no. 2".share', "wind PPA no. 2"),  # a quoted key holds dots (TOML 1.0.0, Keys)
        ("electricity.sources.grid.factor", None),
        ("electricity.sources.grid.extra.share", None),  # five parts: not a source's share
        ("hydrogen.share", None),
    ],
)
def test_the_source_a_share_path_names(path, source):
    from carbonledger.model.project import is_share_path, rest_source, share_source

    assert share_source(path) == source
    assert is_share_path(path) == (source is not None)
    assert rest_source(path, "rest") == source and rest_source(path, 0.5) is None
