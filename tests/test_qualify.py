"""What it takes to qualify (``carbonledger qualify``): each answer is checked against a method the
command does not use: the root that ``headroom`` finds (Brent's method), a linear program written
out here and solved by HiGHS (scipy.optimize.linprog), brute-force enumeration scored through
``score``, and scoring the answer back through ``score`` and ``uncertainty``. Every price is
invented for the tests."""

from __future__ import annotations

import itertools
import json

import numpy as np
import pytest
from helpers import assessment_with
from scipy.optimize import linprog

from carbonledger import api
from tests.helpers import DEMO, assert_one_line_error, run_cli, write

SMR = DEMO / "blue_smr_hydrogen.toml"
LIMIT_UK = 20.0  # g CO2e/MJ H2 (LHV): the UK Low Carbon Hydrogen Standard threshold as the shipped rulebook states it (recorded from memory there)


def levers_file(tmp_path, body: str, name: str = "levers.toml"):
    return write(tmp_path / name, 'currency = "EUR"\nperiod = "year"\ninvented = true\n' + body)


def uk_value(overrides: list[str]) -> float:
    return next(c.value for c in api.score(SMR, assessment=assessment_with(schemes=["uk-lchs"], overrides=overrides)).checks if c.scheme == "uk-lchs")


def test_one_continuous_lever_is_the_headroom_root(tmp_path):
    # Check: with one lever priced per unit of change, the cheapest qualifying value is where the
    # limit is met exactly, which `headroom` finds by Brent's root finding (an independent method).
    levers = levers_file(tmp_path, '[[levers]]\nparameter = "capture.capture_rate"\nrange = [0.9, 0.999]\ncost = { per_unit = 1_000_000 }\n')
    found = api.qualify(SMR, levers, budgets=0, assessment=assessment_with(schemes=["uk-lchs"]))
    root = api.headroom(SMR, ["capture.capture_rate"], "uk-lchs")[0].value
    assert found.status == "qualifies"
    assert found.levers["capture.capture_rate"] == pytest.approx(root, abs=1e-7)  # the solver's tolerance (SLSQP ftol 1e-10, margin 1e-9 of the limit)
    assert found.total_cost == pytest.approx(1_000_000 * (root - 0.9), rel=1e-6)


def test_two_linear_levers_equal_a_hand_written_linear_program(tmp_path):
    # Check: with no extra gas burnt per tonne of CO2 captured, the UK value is affine in the capture
    # rate and in the upstream methane share (checked below on a corner); with costs linear in the
    # change, the cheapest answer is the optimum of the linear program written out here and solved
    # by HiGHS (scipy.optimize.linprog), an independent solver.
    base = ["capture.extra_natural_gas_gj_per_t_co2=0"]
    x0 = (0.9, 0.008)
    v0 = uk_value(base)
    a1 = (uk_value(base + ["capture.capture_rate=0.95"]) - v0) / 0.05
    a2 = (uk_value(base + ["natural_gas.methane_emission_share=0.002"]) - v0) / -0.006
    corner = uk_value(base + ["capture.capture_rate=0.95", "natural_gas.methane_emission_share=0.002"])
    assert corner == pytest.approx(v0 + a1 * 0.05 + a2 * -0.006, rel=1e-9)  # the premise: affine, no cross term
    c1, c2 = 30_000_000.0, 900_000_000.0  # invented EUR per year per unit of change
    levers = levers_file(
        tmp_path,
        '[[levers]]\nparameter = "capture.capture_rate"\nrange = [0.9, 0.98]\ncost = { per_unit = 30_000_000 }\n'
        '[[levers]]\nparameter = "natural_gas.methane_emission_share"\nrange = [0.001, 0.008]\ncost = { per_unit = 900_000_000 }\n',
    )
    # minimise c1 (x1 - 0.9) + c2 (0.008 - x2)  subject to  v0 + a1 (x1 - 0.9) + a2 (x2 - 0.008) <= 20
    lp = linprog([c1, -c2], A_ub=[[a1, a2]], b_ub=[LIMIT_UK - v0 + a1 * x0[0] + a2 * x0[1]], bounds=[(0.9, 0.98), (0.001, 0.008)], method="highs")
    assert lp.status == 0
    found = api.qualify(SMR, levers, budgets=0, assessment=assessment_with(schemes=["uk-lchs"], overrides=base))
    assert found.status == "qualifies"
    assert found.levers["capture.capture_rate"] == pytest.approx(lp.x[0], abs=1e-6)
    assert found.levers["natural_gas.methane_emission_share"] == pytest.approx(lp.x[1], abs=1e-7)
    assert found.total_cost == pytest.approx(c1 * (lp.x[0] - 0.9) + c2 * (0.008 - lp.x[1]), rel=1e-5)


def test_discrete_levers_equal_brute_force_enumeration(tmp_path):
    # Check: with discrete levers only, the answer is the cheapest combination that qualifies when
    # every combination is scored through `score` (brute force, 4 x 3 x 3 = 36 scores).
    methane = {0.008: 0, 0.004: 1_500_000, 0.002: 3_800_000, 0.001: 6_000_000}
    capture = {0.9: 0, 0.95: 2_500_000, 0.99: 7_000_000}
    grid = {"electricity.grid.eu27_2018": 0, "electricity.grid.france_2019": 4_100_000, "electricity.grid.sweden_2019": 5_300_000}

    def table(prices):
        return "[" + ", ".join(f'["{k}", {v}]' if isinstance(k, str) else f"[{k}, {v}]" for k, v in prices.items()) + "]"

    levers = levers_file(
        tmp_path,
        f'[[levers]]\nparameter = "natural_gas.methane_emission_share"\ncost = {{ table = {table(methane)} }}\n'
        f'[[levers]]\nparameter = "capture.capture_rate"\ncost = {{ table = {table(capture)} }}\n'
        f'[[levers]]\nparameter = "electricity.sources.grid.factor"\ncost = {{ table = {table(grid)} }}\n',
    )
    best = None
    for m, c, g in itertools.product(methane, capture, grid):
        result = api.score(SMR, assessment=assessment_with(schemes=["uk-lchs"], overrides=[f"natural_gas.methane_emission_share={m}", f"capture.capture_rate={c}", f'electricity.sources.grid.factor="{g}"']))
        cost = methane[m] + capture[c] + grid[g]
        if result.checks[0].status == "qualifies" and (best is None or cost < best[0]):
            best = (cost, {"natural_gas.methane_emission_share": m, "capture.capture_rate": c, "electricity.sources.grid.factor": g})
    assert best is not None
    found = api.qualify(SMR, levers, budgets=0, assessment=assessment_with(schemes=["uk-lchs"]))
    assert found.status == "qualifies"
    assert found.total_cost == pytest.approx(best[0])
    assert found.levers == best[1]


def test_the_answer_scores_back_as_qualifying(tmp_path):
    # Check: the score-back set, applied with `score --set`, gives the status "qualifies" (the demo levers).
    result = run_cli("qualify", DEMO / "grid_electrolysis_hydrogen.toml", "--levers", DEMO / "levers" / "grid_electrolysis_hydrogen.toml", "--format", "json", "--front", "3")
    assert result.exit_code == 0, result.output
    found = json.loads(result.stdout)
    assert found["status"] == "qualifies" and found["schemes"] == ["japan-hydrogen"]
    assert {"status", "total_cost", "levers", "probability", "standard_error", "score_back_set", "caution", "from_memory", "front", "solver"} <= set(found)
    assert found["probability"] is None and found["standard_error"] is None  # no confidence asked
    assert found["solver"]["continuous"].startswith("SLSQP") and found["solver"]["tolerance"] > 0
    sets = [part for item in found["score_back_set"] for part in ("--set", item)]
    scored = json.loads(run_cli("score", DEMO / "grid_electrolysis_hydrogen.toml", "--scheme", "japan-hydrogen", "--format", "json", "--no-ledger", *sets).stdout)
    assert scored["checks"][0]["status"] == "qualifies"
    assert scored["checks"][0]["value"] <= scored["checks"][0]["limit"]


def test_a_confidence_scores_back_with_its_probability(tmp_path):
    # Check: with a confidence, `uncertainty` on the project scored back (same distributions, seed
    # and draws; levers on parameters without a distribution) finds the same probability of
    # qualifying, within its standard error, and at least the confidence asked.
    distributions = write(
        tmp_path / "distributions.toml",
        '[parameters."reforming.natural_gas_gj_per_kg_h2"]\ndistribution = "triangular"\nlow = 0.160\nmode = 0.170\nhigh = 0.185\n'
        '[factors."electricity.grid.eu27_2018"]\ndistribution = "normal"\nmean = 281.0\nsd = 28.0\n',
    )  # invented ranges for the test
    levers = levers_file(
        tmp_path,
        '[[levers]]\nparameter = "capture.capture_rate"\nrange = [0.9, 0.999]\ncost = { per_unit = 60_000_000 }\n'
        '[[levers]]\nparameter = "natural_gas.methane_emission_share"\nvalues = [0.008, 0.004, 0.002]\ncost = { table = [[0.008, 0], [0.004, 1_500_000], [0.002, 3_800_000]] }\n',
    )
    arguments = ("--distributions", distributions, "--draws", "400", "--seed", "7", "--format", "json", "--no-ledger")
    result = run_cli("qualify", SMR, "--levers", levers, "--scheme", "uk-lchs", "--confidence", "0.9", "--front", "0", *arguments)
    assert result.exit_code == 0, result.output
    found = json.loads(result.stdout)
    assert found["status"] == "qualifies" and found["probability"] >= 0.9
    sets = [part for item in found["score_back_set"] for part in ("--set", item)]
    spread = json.loads(run_cli("uncertainty", SMR, "--scheme", "uk-lchs", *arguments, *sets).stdout)
    check = spread["checks"][0]
    assert abs(check["probability_qualifies"] - found["probability"]) <= max(found["standard_error"], 1e-12)


def test_no_solution_names_the_best_margin_and_the_binding_lever(tmp_path):
    # Check: capture alone cannot bring the SMR demo under 20 g/MJ below a capture rate of 0.95
    # (headroom puts the root above 0.99): the answer says so, with the margin and the lever that binds.
    levers = levers_file(tmp_path, '[[levers]]\nparameter = "capture.capture_rate"\nrange = [0.9, 0.95]\ncost = { per_unit = 1_000_000 }\n')
    found = api.qualify(SMR, levers, budgets=0, assessment=assessment_with(schemes=["uk-lchs"]))
    at_bound = uk_value(["capture.capture_rate=0.95"])
    assert found.status == "no_solution" and found.total_cost is None and found.score_back_set == []
    assert found.binding_lever == "capture.capture_rate"
    assert found.best_margin == pytest.approx((LIMIT_UK - at_bound) / LIMIT_UK, abs=1e-6)


def test_outputs_front_chart_and_ledger(tmp_path):
    chart = tmp_path / "front.png"
    levers = DEMO / "levers" / "blue_smr_hydrogen.toml"
    result = run_cli("qualify", SMR, "--levers", levers, "--format", "csv", "--chart", chart, "--front", "4")
    assert result.exit_code == 0, result.output
    assert result.stdout.splitlines()[0] == "section,key,value,unit"
    assert result.stdout.splitlines()[-1].startswith("caution,")
    assert chart.read_bytes().startswith(b"\x89PNG")
    table = run_cli("qualify", SMR, "--levers", levers, "--front", "0", "--no-ledger")
    assert "Least cost" in table.stdout and "invented" in table.stdout and "Caution" in table.stdout
    history = run_cli("history", SMR)
    assert "qualify for uk-lchs" in history.stdout


@pytest.mark.parametrize(
    ("body", "field"),
    [
        ('[[levers]]\nparameter = "capture.nothing"\nrange = [0.9, 0.95]\ncost = { per_unit = 1 }\n', "levers.0.parameter"),
        ('[[levers]]\nparameter = "capture.capture_rate"\nrange = [0.9, 1.2]\ncost = { per_unit = 1 }\n', "levers.0.range"),
        ('[[levers]]\nparameter = "capture.capture_rate"\nrange = [0.9, 0.95]\ncost = { per_unit = "cheap" }\n', "levers.0.cost.per_unit"),
        ("".join(f'[[levers]]\nparameter = "capture.capture_rate{n}"\nrange = [0.9, 0.95]\ncost = {{ per_unit = 1 }}\n' for n in range(21)), "levers"),
    ],
)
def test_bad_levers_are_one_line_naming_file_and_field(tmp_path, body, field):
    levers = levers_file(tmp_path, body)
    result = run_cli("qualify", SMR, "--levers", levers, "--scheme", "uk-lchs")
    assert_one_line_error(result)
    assert str(levers) in result.stderr and f": {field}:" in result.stderr


@pytest.mark.parametrize("confidence", ["0", "1", "1.5", "-0.2"])
def test_a_confidence_outside_zero_one_is_refused(tmp_path, confidence):
    levers = levers_file(tmp_path, '[[levers]]\nparameter = "capture.capture_rate"\nrange = [0.9, 0.95]\ncost = { per_unit = 1 }\n')
    result = run_cli("qualify", SMR, "--levers", levers, "--scheme", "uk-lchs", "--confidence", confidence)
    assert_one_line_error(result)
    assert "--confidence" in result.stderr


def test_the_report_gets_a_section_with_a_levers_file():
    page = api.report([SMR], levers=DEMO / "levers" / "blue_smr_hydrogen.toml", generated="2026-12-02")
    assert '<section class="sheet" id="p1-qualify"' in page and "What it takes to qualify" in page
    assert "invented prices" in page
    assert 'id="p1-qualify"' not in api.report([SMR], generated="2026-12-02")  # no levers file, no section


def test_costs_per_step_and_pieces_of_a_table():
    # Check (arithmetic written out by hand): a range with a step of 0.03 from 0.90 gives 0.90, 0.93,
    # 0.96, 0.99, priced 1,000,000 per step of change from the project's 0.90; a cost table whose
    # slope falls (20 then 4 per unit) is split into two convex pieces at the kink.
    from carbonledger.analyses.qualify import convex_pieces, resolve_levers
    from carbonledger.model.levers import Levers
    from carbonledger.routes.project import load_project

    project, _ = load_project(SMR)
    levers = Levers.model_validate({"currency": "EUR", "period": "year", "levers": [{"parameter": "capture.capture_rate", "range": [0.9, 0.99], "step": 0.03, "cost": {"per_step": 1_000_000}}]})
    (lever,) = resolve_levers(project, levers, "levers.toml")
    assert lever.choices == pytest.approx([0.90, 0.93, 0.96, 0.99])
    assert lever.choice_costs == pytest.approx([0, 1_000_000, 2_000_000, 3_000_000])
    pieces = convex_pieces(np.array([0.0, 0.5, 1.0]), np.array([0.0, 10.0, 12.0]))
    assert [(p.low, p.high) for p in pieces] == [(0.0, 0.5), (0.5, 1.0)]
    assert pieces[1].cost(0.75) == pytest.approx(11.0)
    assert len(convex_pieces(np.array([0.0, 0.5, 1.0]), np.array([10.0, 0.0, 10.0]))) == 1  # |x - 0.5| is convex: one piece


GRID_H2 = DEMO / "grid_electrolysis_hydrogen.toml"
PPA_SOURCES = (
    '[sources.wind_ppa]\nfactor = "electricity.renewable.wind_onshore"\nprocurement = "ppa"\ncommissioned = 2027-03-01\nzone = "VENNOR-1"\nsupported = false\n'
    '[sources.solar_ppa]\nfactor = "electricity.renewable.solar_pv_utility"\nprocurement = "ppa"\ncommissioned = 2027-03-01\nzone = "VENNOR-1"\nsupported = false\n'
)


def test_two_share_levers_equal_brute_force_enumeration(tmp_path):
    # Check: a wind PPA share and a solar PPA share, the grid taking up both differences, each on a
    # grid of 0, 0.15, ..., 0.9; brute force scores every pair whose shares fit (w + s <= 1, grid
    # 1 - w - s) through `score` and keeps the cheapest that qualifies for Japan's criterion. Cost by
    # hand: 400 million per unit of wind share and 300 million per unit of solar share (invented).
    steps = [round(0.15 * n, 2) for n in range(7)]
    levers = levers_file(
        tmp_path,
        'schemes = ["japan-hydrogen"]\n'
        '[[levers]]\nparameter = "electricity.sources.wind_ppa.share"\nrange = [0.0, 0.9]\nstep = 0.15\nabsorbed_by = "grid"\ncost = { per_unit = 400_000_000 }\n'
        '[[levers]]\nparameter = "electricity.sources.solar_ppa.share"\nrange = [0.0, 0.9]\nstep = 0.15\nabsorbed_by = "grid"\ncost = { per_unit = 300_000_000 }\n' + PPA_SOURCES,
    )
    added = PPA_SOURCES.replace("[sources.wind_ppa]", "[electricity.sources.wind_ppa]\nshare = 0.0").replace("[sources.solar_ppa]", "[electricity.sources.solar_ppa]\nshare = 0.0")
    project = write(tmp_path / "project.toml", GRID_H2.read_text() + "\n" + added)
    best = None
    for wind, solar in itertools.product(steps, steps):
        if wind + solar > 1 + 1e-12:
            continue
        sets = [f"electricity.sources.grid.share={1 - wind - solar!r}", f"electricity.sources.wind_ppa.share={wind}", f"electricity.sources.solar_ppa.share={solar}"]
        check = api.score(project, assessment=assessment_with(schemes=["japan-hydrogen"], overrides=sets)).checks[0]
        cost = 400_000_000 * wind + 300_000_000 * solar
        if check.status == "qualifies" and (best is None or cost < best[0]):
            best = (cost, wind, solar)
    assert best is not None
    found = api.qualify(GRID_H2, levers, budgets=0)
    assert found.status == "qualifies"
    assert found.levers["electricity.sources.wind_ppa.share"] == pytest.approx(best[1], abs=1e-12)
    assert found.levers["electricity.sources.solar_ppa.share"] == pytest.approx(best[2], abs=1e-12)
    assert found.total_cost == pytest.approx(best[0], rel=1e-12)
    grid = next(float(item.split("=")[1]) for item in found.score_back_set if item.startswith("electricity.sources.grid.share="))
    assert grid == pytest.approx(1 - best[1] - best[2], abs=1e-12)  # the grid took up both differences


def test_two_continuous_share_levers_equal_a_hand_written_linear_program(tmp_path):
    # Check: the scheme value is affine in the shares (premise checked on a corner); with costs linear
    # in the shares and the grid taking up the rest (w + s <= 1), the cheapest answer is the optimum of
    # the linear program written out here and solved by HiGHS (scipy.optimize.linprog).
    levers = levers_file(
        tmp_path,
        'schemes = ["japan-hydrogen"]\n'
        '[[levers]]\nparameter = "electricity.sources.wind_ppa.share"\nrange = [0.0, 0.9]\ncost = { per_unit = 400_000_000 }\n'
        '[[levers]]\nparameter = "electricity.sources.solar_ppa.share"\nrange = [0.0, 0.9]\ncost = { per_unit = 300_000_000 }\n' + PPA_SOURCES,
    )
    found = api.qualify(GRID_H2, levers, budgets=0)
    sets = found.score_back_set

    def value(wind: float, solar: float) -> float:
        shares = [f"electricity.sources.grid.share={1 - wind - solar!r}", f"electricity.sources.wind_ppa.share={wind!r}", f"electricity.sources.solar_ppa.share={solar!r}"]
        others = [item for item in sets if ".share=" not in item]
        return api.score(GRID_H2, assessment=assessment_with(schemes=["japan-hydrogen"], overrides=others + shares)).checks[0].value

    v0, vw, vs = value(0.0, 0.0), value(0.5, 0.0), value(0.0, 0.5)
    assert value(0.3, 0.4) == pytest.approx(v0 + 0.6 * (vw - v0) + 0.8 * (vs - v0), rel=1e-9)  # the premise: affine
    a_w, a_s = (vw - v0) / 0.5, (vs - v0) / 0.5
    lp = linprog([4e8, 3e8], A_ub=[[a_w, a_s], [1.0, 1.0]], b_ub=[3.4 - v0, 1.0], bounds=[(0, 0.9), (0, 0.9)], method="highs")  # 3.4 kg CO2e/kg H2: the limit the shipped rulebook states
    assert lp.status == 0
    assert found.levers["electricity.sources.wind_ppa.share"] == pytest.approx(lp.x[0], abs=1e-6)
    assert found.levers["electricity.sources.solar_ppa.share"] == pytest.approx(lp.x[1], abs=1e-6)
    assert found.total_cost == pytest.approx(lp.fun, rel=1e-6)


@pytest.mark.parametrize(
    ("body", "field", "words"),
    [
        ('[[levers]]\nparameter = "electricity.sources.wind_ppa.share"\nvalues = [0.6, 0.8]\ncost = { per_unit = 1 }\n'
         '[[levers]]\nparameter = "electricity.sources.solar_ppa.share"\nvalues = [0.5, 0.7]\ncost = { per_unit = 1 }\n', "levers", "below 0"),
        ('[[levers]]\nparameter = "electricity.sources.wind_ppa.share"\nrange = [0, 0.5]\nabsorbed_by = "battery"\ncost = { per_unit = 1 }\n', "levers.0.absorbed_by", "not a source"),
        ('[[levers]]\nparameter = "electricity.sources.wind_ppa.share"\nrange = [0, 0.5]\ncost = { per_unit = 1 }\n'
         '[[levers]]\nparameter = "electricity.sources.solar_ppa.share"\nrange = [0, 0.5]\ncost = { per_unit = 1 }\n'
         '[[levers]]\nparameter = "electricity.sources.grid.share"\nrange = [0, 1]\ncost = { per_unit = 1 }\n', "levers.0.parameter", "other sources to take up"),
    ],
)
def test_share_levers_that_cannot_be_rebalanced_are_refused(tmp_path, body, field, words):
    levers = levers_file(tmp_path, body + PPA_SOURCES)
    result = run_cli("qualify", GRID_H2, "--levers", levers, "--scheme", "japan-hydrogen")
    assert_one_line_error(result)
    assert str(levers) in result.stderr and f": {field}:" in result.stderr and words in result.stderr


HOURLY = DEMO / "hybrid_hourly_hydrogen.toml"


def test_an_operation_lever_alone_is_the_plan(tmp_path):
    # Check: with the operation as the only lever, qualify's answer is the operating plan that
    # `carbonledger plan` gives for the same scheme (same status, same hydrogen to the solver's
    # tolerance), and its cost is, by hand, the price per kg times the hydrogen the plan gives up
    # against running at rated power in every interval (8,760 h at 20 MW / 55.5 kWh/kg, invented demo).
    levers = levers_file(tmp_path, 'schemes = ["uk-lchs"]\n[[levers]]\nkind = "operation"\ncost = { per_unit = 5.0 }\n')
    found = api.qualify(HOURLY, levers, budgets=0)
    planned, _ = api.plan(HOURLY, scheme="uk-lchs")
    assert planned.status == "qualifies" and found.status == "qualifies"
    assert found.checks[0].status == planned.status
    assert found.operation["hydrogen_kg"] == pytest.approx(planned.hydrogen_kg.sum(), rel=1e-7)  # HiGHS primal feasibility tolerance 1e-7
    assert found.operation["baseline_hydrogen_kg"] == pytest.approx(8760 * 20_000 / 55.5, rel=1e-12)
    assert found.total_cost == pytest.approx(5.0 * (8760 * 20_000 / 55.5 - planned.hydrogen_kg.sum()), rel=1e-7)
    assert found.checks[0].value == pytest.approx(planned.value, rel=1e-9)  # scored back with the plan's load as the series
    assert "HiGHS" in found.solver["operation"] and found.operation["primal_feasibility_tolerance"] == 1e-7


def test_an_operation_lever_needs_a_time_series(tmp_path):
    levers = levers_file(tmp_path, 'schemes = ["japan-hydrogen"]\n[[levers]]\nkind = "operation"\ncost = { per_unit = 5.0 }\n')
    result = run_cli("qualify", GRID_H2, "--levers", levers)
    assert_one_line_error(result)
    assert str(levers) in result.stderr and ": levers.0.kind:" in result.stderr and "time series" in result.stderr


@pytest.mark.parametrize(
    ("body", "field"),
    [
        ('[[levers]]\nkind = "operation"\nrange = [0, 1]\ncost = { per_unit = 5.0 }\n', "levers.0"),
        ('[[levers]]\nkind = "operation"\ncost = { table = [[0, 1]] }\n', "levers.0"),
        ('[[levers]]\nkind = "operation"\nmin_load = 1.5\ncost = { per_unit = 5.0 }\n', "levers.0.min_load"),
        ('[[levers]]\nparameter = "electrolysis.electricity_kwh_per_kg_h2"\nrated_kw = 100\nrange = [50, 54]\ncost = { per_unit = 5.0 }\n', "levers.0"),
        ('[[levers]]\nkind = "operation"\ncost = { per_unit = 5.0 }\n[[levers]]\nparameter = "electrolysis.electricity_kwh_per_kg_h2"\nrange = [50, 54]\ncost = { per_unit = 5.0 }\n', "levers.1.range"),
    ],
)
def test_bad_operation_levers_are_one_line(tmp_path, body, field):
    levers = levers_file(tmp_path, 'schemes = ["uk-lchs"]\n' + body)
    result = run_cli("qualify", HOURLY, "--levers", levers)
    assert_one_line_error(result)
    assert str(levers) in result.stderr and f": {field}" in result.stderr


def test_an_operation_lever_with_a_discrete_lever_equals_brute_force():
    # Check: the shipped demo levers (an operation priced by the margin it gives up at an invented
    # EUR 6/kg H2, and a stack of 51 kWh/kg for an invented EUR 400,000 a year): brute force runs
    # `carbonledger plan` on each stack with --set and adds the stack's price to the margin given up.
    levers = DEMO / "levers" / "hybrid_hourly_hydrogen.toml"
    brute = []
    for kwh, price in ((54.0, 0.0), (51.0, 400_000.0)):
        planned, _ = api.plan(HOURLY, scheme="uk-lchs", hydrogen_price=6.0, assessment=assessment_with(overrides=[f"electrolysis.electricity_kwh_per_kg_h2={kwh}"]))
        brute.append((price + planned.baseline_margin - planned.margin, kwh, planned))
    cost, kwh, planned = min(brute, key=lambda item: item[0])
    found = api.qualify(HOURLY, levers, budgets=0)
    assert found.status == "qualifies"
    assert found.levers["electrolysis.electricity_kwh_per_kg_h2"] == kwh
    assert found.total_cost == pytest.approx(cost, rel=1e-7)
    assert found.operation["hydrogen_kg"] == pytest.approx(planned.hydrogen_kg.sum(), rel=1e-7)
    assert found.operation["objective"].startswith("margin")
