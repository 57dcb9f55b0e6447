"""Portfolio recalculation: which projects move, by how much, and the exit codes."""

import csv
import importlib.util
import io
import json
import random

import pytest
from helpers import DEMO, FACTOR_HEADER, PORTFOLIO, ROOT, assert_one_line_error, assessment_with, run_cli, write

from carbonledger.analyses import portfolio
from carbonledger.analyses.pipeline import assess
from carbonledger.analyses.portfolio import load_portfolio, recalc
from carbonledger.analyses.portfolio import score_portfolio as score_many
from carbonledger.core.assessment import Assessment
from carbonledger.model.factors import load_factor_set

# EEA indicator IND-353: EU-27 2018 average 281 g CO2e/kWh (the value in default-2026).
EU27_2018_G_PER_KWH = 281.0
NEW_GRID_G_PER_KWH = 318.0


@pytest.fixture
def grid_update(tmp_path):
    """An override CSV that changes only the EU-27 grid factor, 281 -> 318 g CO2e/kWh."""
    return write(
        tmp_path / "grid_update.csv",
        FACTOR_HEADER + f"electricity.grid.eu27_2018,{NEW_GRID_G_PER_KWH},g CO2e/kWh,test update (invented),,2018,EU-27,,false\n",
    )


def _rows(result, project_stem):
    return {row.scheme: row for row in result.rows if row.project_file.endswith(project_stem + ".toml")}


def test_grid_change_moves_only_grid_projects_by_the_hand_computed_amount(grid_update):
    projects = load_portfolio([DEMO, PORTFOLIO])
    result = recalc(projects, load_factor_set("default-2026"), load_factor_set(str(grid_update)), year=2028)  # scheme rules of 2028 (45V annual matching)
    delta_g = NEW_GRID_G_PER_KWH - EU27_2018_G_PER_KWH  # 37 g CO2e/kWh

    # Grid-connected hydrogen: 52 kWh/kg electrolysis + 1.5 kWh/kg conditioning, all from the grid
    # (demo file). Change = 53.5 kWh/kg x 37 g/kWh = 1979.5 g = 1.9795 kg CO2e/kg H2, whatever the
    # GWP set (the grid factor is already in CO2e).
    grid = _rows(result, "grid_electrolysis_hydrogen")
    assert grid["japan-hydrogen"].change == pytest.approx(53.5 * delta_g / 1000, rel=1e-12)
    assert grid["us-45v"].change == pytest.approx(1.9795, rel=1e-12)
    # per MJ: 1979.5 g / 119.96 MJ/kg (hydrogen LHV, US DOE HyARC table) = 16.5013 g CO2e/MJ
    assert grid["eu-rfnbo"].change == pytest.approx(1979.5 / 119.96, rel=1e-12)

    # Hybrid: (52 + 1.0) kWh/kg x 26 % grid = 13.78 kWh/kg from the grid; under 45V wind counts
    # zero, so 45V moves 13.78 x 37 / 1000 = 0.50986 kg CO2e/kg H2, from 3.87218 (13.78 x 0.281)
    # under the 4 kg limit to 4.38204 above it.
    hybrid = _rows(result, "vennor_hybrid_hydrogen")
    assert hybrid["us-45v"].old_value == pytest.approx(13.78 * 0.281, rel=1e-12)
    assert hybrid["us-45v"].change == pytest.approx(0.50986, rel=1e-12)
    assert hybrid["us-45v"].status == "now fails"

    # Projects without grid electricity do not move and are not even rescored.
    for stem in ("green_electrolysis_ammonia", "skelmar_green_hydrogen"):
        for row in _rows(result, stem).values():
            assert row.change == 0.0 and not row.rescored and row.status.startswith("still")
    # The cracked green ammonia draws 2.0 kWh/kg H2 of grid electricity at the destination's
    # cracker (demo file). The EU rulebooks count that delivery (e_td, Delegated Regulation (EU)
    # 2023/1185 Annex Part A): 2.0 x 37 g / 119.96 MJ/kg = 0.61687 g CO2e/MJ; gate-based ones do not move.
    cracked = _rows(result, "green_ammonia_cracked_hydrogen")
    assert cracked["eu-rfnbo"].change == pytest.approx(2.0 * delta_g / 119.96, rel=1e-9)
    assert cracked["us-45v"].change == 0.0 and cracked["japan-ammonia"].change == 0.0
    moved = {row.project_file for row in result.rows if row.change != 0.0}
    assert all("green" not in name or "cracked" in name for name in moved)
    assert result.changed_factors == ["electricity.grid.eu27_2018"]


def test_newly_failing_rows_come_first(grid_update):
    result = recalc(load_portfolio([DEMO, PORTFOLIO]), load_factor_set("default-2026"), load_factor_set(str(grid_update)), year=2028)
    statuses = [row.status for row in result.rows]
    count = statuses.count("now fails")
    # hybrid hydrogen under 45V. Blue ammonia is not eligible under eu-rfnbo (Directive (EU) 2018/2001
    # Art. 2); the hourly hybrid demo crosses the 45V line on its declared shares ((54 + 1.5) kWh/kg x 25 %
    # grid = 13.875 kWh/kg, x 0.281 = 3.899 kg CO2e/kg H2, x 0.318 = 4.412) but was undetermined before
    # (no construction start declared), never qualifying, so it does not newly fail.
    assert count == 1
    assert statuses[:count] == ["now fails"] * count


def test_fast_path_equals_bw2calc_one_project_at_a_time():
    """The stacked numpy solve against bw2calc (one LCA per project), to 1e-9 relative."""
    projects = load_portfolio([DEMO, PORTFOLIO])
    for name in ("default-2026", "demo-2027-grid-revision"):
        factor_set = load_factor_set(name)
        for item, quick in zip(projects, score_many(projects, factor_set, check_with_bw2calc=False), strict=True):
            # a project with a time series: bw2calc, then its checks matched against the series, as `score` does
            reference = assess(Assessment(factor_set), item.project, series=item.series)
            assert quick.total == pytest.approx(reference.total, rel=1e-9, abs=1e-12)
            for stage, value in reference.by_stage.items():
                assert quick.by_stage[stage] == pytest.approx(value, rel=1e-9, abs=1e-9)
            assert [c.scheme for c in quick.checks] == [c.scheme for c in reference.checks]
            for fast, slow in zip(quick.checks, reference.checks, strict=True):
                assert fast.value == pytest.approx(slow.value, rel=1e-9, abs=1e-12)
                assert fast.passes == slow.passes


def generated_portfolio(folder, count: int) -> list:
    """``count`` invented projects from the generator of benchmarks/recalc.py (every route and option it varies)."""
    spec = importlib.util.spec_from_file_location("recalc_benchmark", ROOT / "benchmarks" / "recalc.py")
    generator = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(generator)
    rng = random.Random(18)
    for number in range(count):
        write(folder / f"project_{number:03d}.toml", generator.project(number, rng))
    return load_portfolio([folder])


def test_recalc_fast_path_equals_one_project_at_a_time_on_a_generated_portfolio(tmp_path, monkeypatch):
    """The fast path (projects scored a chunk at a time, stacked solves, a rescored project taking
    its scheme readings from its first scoring) against bw2calc, one LCA per project and set
    (``pipeline.assess``): every figure to 1e-9 relative, every status, tier and verdict the same."""
    monkeypatch.setattr(portfolio, "CHUNK_PROJECTS", 7)  # several chunks, a structure met again in a later one
    projects = generated_portfolio(tmp_path, 40)
    old_set, new_set = load_factor_set("default-2026"), load_factor_set("demo-2027-grid-revision")
    result = recalc(projects, old_set, new_set)
    assert 0 < result.rescored < len(projects)  # both kinds: rescored, and kept (no grid electricity)
    for item, old, new in zip(projects, result.old_scores, result.new_scores, strict=True):
        for fast, factor_set in ((old, old_set), (new, new_set)):
            slow = assess(Assessment(factor_set), item.project, source=item.path, project_sha256=item.sha256)
            assert fast.total == pytest.approx(slow.total, rel=1e-9, abs=1e-12)
            assert fast.by_stage.keys() == slow.by_stage.keys() and fast.by_gas.keys() == slow.by_gas.keys()
            for figures, reference in ((fast.by_stage, slow.by_stage), (fast.by_gas, slow.by_gas), (fast.intensity.model_dump(), slow.intensity.model_dump())):
                for key, value in reference.items():
                    assert figures[key] == pytest.approx(value, rel=1e-9, abs=1e-12), key
            assert [c.scheme for c in fast.checks] == [c.scheme for c in slow.checks]
            for quick, check in zip(fast.checks, slow.checks, strict=True):
                assert quick.value == pytest.approx(check.value, rel=1e-9, abs=1e-12)
                assert (quick.status, quick.tier, quick.passes, quick.limit) == (check.status, check.tier, check.passes, check.limit)
            assert fast.factor_set.sha256 == factor_set.sha256


def test_a_portfolios_figures_equal_those_of_the_full_result(tmp_path):
    """A recalc makes each project's figures without its exchanges and sentences (``figures_of``): they must
    equal, field by field, the figures of the full result of the same prepared and solved project (the
    generated portfolio, the demos and the portfolio folder, which hold a time series and co-product rules)."""
    from carbonledger.analyses.pipeline import figures_prepared, judged_result
    from carbonledger.core.results import ResultFigures
    from carbonledger.core.scoring import figures_of, solve_stacked

    projects = generated_portfolio(tmp_path, 30) + load_portfolio([DEMO, PORTFOLIO])
    for name in ("default-2026", "demo-2027-grid-revision"):
        factor_set = load_factor_set(name)
        prepared = portfolio.prepare_projects(projects, [Assessment(factor_set, "ar6")] * len(projects), None)
        full = [ResultFigures.of(judged_result(item, ready, solutions)) for item, ready, solutions in zip(projects, prepared, solve_stacked(prepared, False), strict=True)]
        prepared = portfolio.prepare_projects(projects, [Assessment(factor_set, "ar6")] * len(projects), None)  # afresh: what the full result read is not shared
        assert figures_prepared(projects, prepared, False) == full
    lean = [figures_of(ready, solutions) for ready, solutions in zip(prepared, solve_stacked(prepared, False), strict=True)]
    assert sum(figures is not None for figures in lean) >= 30  # most projects take the lean path
    assert any(figures is None for figures in lean)  # and a co-product rule that differs takes the full one


def test_recalc_exit_codes_and_formats(tmp_path):
    args = ["recalc", DEMO, PORTFOLIO, "--from", "default-2026", "--to", "demo-2027-grid-revision", "--year", "2028"]
    plain = run_cli(*args)
    assert plain.exit_code == 0, plain.output
    assert "now fails" in plain.stdout
    failing = run_cli(*args, "--fail-on-new-failures", "--format", "json")
    assert failing.exit_code == 3
    data = json.loads(failing.stdout)
    assert data["newly_failing"] == 1 and data["rows"][0]["status"] == "now fails"  # as in test_newly_failing_rows_come_first
    # the other way round, projects only newly pass: exit 0 even with the flag
    back = run_cli("recalc", DEMO, PORTFOLIO, "--from", "demo-2027-grid-revision", "--to", "default-2026", "--year", "2028", "--fail-on-new-failures", "--format", "csv")
    assert back.exit_code == 0, back.output
    rows = list(csv.DictReader(io.StringIO(back.stdout)))
    assert not [r for r in rows if r["status"] == "now fails"]
    # the hybrid's 45V value is back under 4 kg (3.87218, test_grid_change_moves_only_grid_projects_by_the_hand_computed_amount),
    # but the portfolio file gives no country of production (45V(c)(2)(B)(i)(I)): it cannot qualify yet, so "now undetermined"
    hybrid = [r for r in rows if r["scheme"] == "us-45v" and "vennor_hybrid" in r["project_file"]]
    assert [r["status"] for r in hybrid] == ["now undetermined"]
    assert_one_line_error(run_cli("recalc", tmp_path / "missing", "--to", "demo-2027-grid-revision"))
    assert_one_line_error(run_cli("recalc", DEMO, "--to", "no-such-set"))


def test_recalc_scheme_filter_keeps_schemes_that_apply():
    result = recalc(load_portfolio([DEMO]), load_factor_set("default-2026"), load_factor_set("demo-2027-grid-revision"), schemes=["japan-ammonia"])
    assert {row.scheme for row in result.rows} == {"japan-ammonia"}
    ammonia_projects = {path.name for path in DEMO.glob("*.toml") if 'product = "ammonia"' in path.read_text()}
    assert len(ammonia_projects) >= 3
    assert {row.project_file.split("/")[-1] for row in result.rows} == ammonia_projects


def test_a_project_with_a_time_series_is_rescored_with_its_matching_as_score_does():
    """recalc gives the values and verdicts `score` gives: each check matched against the series
    under the scheme's rule (EU monthly in 2026, Delegated Regulation (EU) 2023/1184 Art. 6), not the
    declared annual shares (which read 32.5 g CO2e/MJ for eu-rfnbo, over its 28.2 limit)."""
    from carbonledger import api

    path = DEMO / "hybrid_hourly_hydrogen.toml"
    projects = load_portfolio([path])
    old, new = load_factor_set("default-2026"), load_factor_set("demo-2027-grid-revision")
    rows = {row.scheme: row for row in recalc(projects, old, new).rows}
    before = {c.scheme: c for c in api.score(path).checks}
    after = {c.scheme: c for c in api.score(path, assessment=assessment_with(factors="demo-2027-grid-revision")).checks}
    declared = {c.scheme: c for c in api.score(path, assessment=assessment_with(matching="declared")).checks}
    for scheme, row in rows.items():
        assert row.old_value == pytest.approx(before[scheme].value, rel=1e-9, abs=1e-12)
        assert row.new_value == pytest.approx(after[scheme].value, rel=1e-9, abs=1e-12)
        assert (row.old_status, row.new_status) == (before[scheme].status, after[scheme].status)
    assert abs(rows["eu-rfnbo"].old_value - declared["eu-rfnbo"].value) > 1.0


def test_results_made_without_validation_hold_what_validation_gives(tmp_path):
    """Checks and exchange rows are made without pydantic's validation (``core.results.constructed``): each
    must equal, field by field and type by type, the model pydantic validates from the same data."""
    from carbonledger.core.results import Check, ExchangeRow

    projects = generated_portfolio(tmp_path, 12)
    results = score_many(projects, load_factor_set("default-2026")) + score_many(projects, load_factor_set("demo-2027-grid-revision"))
    made = [(Check, check) for score in results for check in score.checks]
    made += [(ExchangeRow, row) for score in results for row in score.exchanges]
    assert {model for model, _ in made} == {Check, ExchangeRow}
    for model, item in made:
        validated = model.model_validate(item.model_dump())
        assert list(item.__dict__) == list(validated.__dict__)  # every field, in the model's order
        for name, value in validated.__dict__.items():
            assert item.__dict__[name] == value and type(item.__dict__[name]) is type(value), (model.__name__, name)


def test_a_large_recalc_table_lists_the_moves_and_counts_the_rest(monkeypatch):
    """A portfolio of thousands gives tens of thousands of rows: the table lists every row whose status moved
    and counts the unchanged ones by status and scheme (their number equals the CSV's rows of that status);
    the closing line names the pairs that now fail only when they are few."""
    from carbonledger.io import portfolio_output

    result = recalc(load_portfolio([DEMO, PORTFOLIO]), load_factor_set("default-2026"), load_factor_set("demo-2027-grid-revision"), year=2028)
    rows = list(csv.DictReader(io.StringIO(portfolio_output.recalc_csv(result))))[:-1]  # the caution row last
    monkeypatch.setattr(portfolio_output, "UNCHANGED_ROWS_SHOWN", 5)
    text = portfolio_output.recalc_table(result)
    for status in {row["status"] for row in rows if row["status"].startswith("still")}:
        count = sum(row["status"] == status for row in rows)
        assert f"{status} ({count:,})\n" in text
        block = text.split(f"{status} ({count:,})\n")[1].split("\n\n")[0]
        assert sum(int(line.split(": ")[1].split(" ")[0].replace(",", "")) for line in block.splitlines()) == count
    moved = [row for row in rows if row["status"].startswith("now")]
    assert moved and all(row["project"].split(",")[0] in text for row in moved)
    assert "--format csv or json lists every row" in text
    assert "1 project-scheme pairs now fail: Vennor Bay hybrid hydrogen" in text  # one pair, named (as in the manual's walk-through)
    monkeypatch.setattr(portfolio_output, "NEWLY_FAILING_NAMED", 0)
    assert "1 project-scheme pairs now fail\n" in portfolio_output.recalc_table(result)
