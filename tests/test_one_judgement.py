"""One judgement for every command: score, compare, report, workbook, recalc, headroom, plan and the
Monte Carlo give each project the same status under each scheme in the same assessment year.

Projects: every demo (its default assessment year) and every case of the verdict casebook in
../shared/casebook (its own year and options), when the casebook is there. The statuses themselves
are checked against the legal texts by the casebook (`python ../shared/casebook/run.py`, run by
.ci/run); this test checks that no command judges differently.
"""

from __future__ import annotations

import os
import tomllib
from pathlib import Path

import pytest
from helpers import assessment_with

from carbonledger import api
from carbonledger.analyses.electricity_series import project_series
from carbonledger.analyses.pipeline import PortfolioProject
from carbonledger.analyses.portfolio import score_portfolio
from carbonledger.model.factors import load_factor_set
from carbonledger.routes.project import load_project

ROOT = Path(__file__).resolve().parents[1]
CASEBOOK = ROOT.parent / "shared" / "casebook"


def projects() -> list[tuple[str, Path, int | None, str]]:
    """(name, project file, assessment year or None for the default, factor set option)."""
    found = [(path.stem, path, None, "default-2026") for path in sorted((ROOT / "demo_projects").glob("*.toml"))]
    found += [(path.stem, path, None, "default-2026") for path in sorted((ROOT / "demo_projects" / "portfolio").glob("*.toml"))]
    if CASEBOOK.is_dir():
        for folder in sorted(p for p in CASEBOOK.iterdir() if (p / "case.toml").is_file()):
            case = tomllib.loads((folder / "case.toml").read_text(encoding="utf-8"))
            args = case.get("args", [])
            factors = str(folder / args[args.index("--factors") + 1]) if "--factors" in args else "default-2026"
            found.append((folder.name, folder / "project.toml", case["year"], factors))
    elif os.environ.get("CI") == "true":
        raise AssertionError(f"the verdict casebook is missing under CI: {CASEBOOK}")
    return found


PROJECTS = projects()


def statuses(result) -> dict[str, str]:
    return {check.scheme: check.status for check in result.checks}


@pytest.mark.parametrize("name, path, year, factors", PROJECTS, ids=[p[0] for p in PROJECTS])
def test_score_compare_and_report_agree(name, path, year, factors):
    scored = api.score(path, assessment=assessment_with(year=year, factors=factors))
    expected = statuses(scored)
    assert expected, name
    compared = api.compare([path], assessment=assessment_with(year=year, factors=factors))
    assert statuses(compared.projects[0]) == expected
    reported = api.report_items([path], draws=200, assessment=assessment_with(year=year, factors=factors))
    assert statuses(reported[0].result) == expected
    assert reported[0].result.assessment_year == scored.assessment_year


def test_recalc_judges_each_project_as_score_does():
    # the portfolio path (stacked solve, series matched after it) against score, each project in its own year
    factor_set = load_factor_set("default-2026")
    items = [(name, path, year) for name, path, year, factors in PROJECTS if factors == "default-2026"]
    portfolio = []
    for _, path, _ in items:
        project, sha = load_project(path)
        portfolio.append(PortfolioProject(str(path), project, sha, project_series(project, path)))
    results = score_portfolio(portfolio, factor_set, year=[year for _, _, year in items])
    for (name, path, year), result in zip(items, results, strict=True):
        assert statuses(result) == statuses(api.score(path, assessment=assessment_with(year=year))), name


@pytest.mark.parametrize("stem", ["blue_atr_ammonia", "green_ammonia_cracked_hydrogen", "turquoise_pyrolysis_hydrogen"])
def test_the_workbook_records_the_statuses_of_score(stem):
    path = ROOT / "demo_projects" / f"{stem}.toml"
    _, engine, _ = api.audit_workbook(path, assessment=assessment_with(year=2030))
    assert statuses(engine) == statuses(api.score(path, assessment=assessment_with(year=2030)))


def test_headroom_of_a_scheme_the_project_is_not_eligible_for_has_no_value():
    # blue SMR hydrogen is not an RFNBO (Directive (EU) 2018/2001 Art. 2(36)): no capture rate makes it one
    path = ROOT / "demo_projects" / "blue_smr_hydrogen.toml"
    assert {c.scheme: c.status for c in api.score(path).checks}["eu-rfnbo"] == "not_eligible"
    [found] = api.headroom(path, ["capture.capture_rate"], "eu-rfnbo")
    assert found.value is None and found.reason.startswith("not eligible")


def test_the_plan_states_the_status_score_gives_its_value():
    path = ROOT / "demo_projects" / "hybrid_hourly_hydrogen.toml"
    result, _ = api.plan(path, scheme="japan-hydrogen", assessment=assessment_with(year=2029))
    assert result.status in ("qualifies", "fails", "not_eligible", "undetermined")
    expected = {c.scheme: c.status for c in api.score(path, assessment=assessment_with(year=2029)).checks}["japan-hydrogen"]
    # japan-hydrogen reads no electricity rule, so the plan's status is the score's whenever both meet the limit
    assert (result.status == "qualifies") == (expected == "qualifies" and result.qualifies)


def test_monte_carlo_draws_take_the_status_of_the_rules():
    # a draw that meets the limit is undetermined where a rule cannot be judged, as score says (45V: no country)
    path = ROOT / "demo_projects" / "portfolio" / "vennor_hybrid_hydrogen.toml"
    assert {c.scheme: c.status for c in api.score(path).checks}["us-45v"] == "undetermined"
    result = api.uncertainty(path, draws=400, seed=1, assessment=assessment_with(schemes=["us-45v"])) if "uncertainty" in path.read_text() else None
    if result is not None:
        check = result.checks[0]
        assert check.probability_qualifies == 0.0 and check.statuses["undetermined"].probability > 0


def test_history_names_the_assessment_year_when_a_verdict_flips_with_it():
    # 45V(a)(1): the credit runs 10 years from the date placed in service (2027-01-01 for the blue SMR demo, with
    # the country declared): 2029 is inside the period, 2038 after it. Nothing else changes between the two runs.
    from helpers import run_cli

    path = ROOT / "demo_projects" / "blue_smr_hydrogen.toml"
    for year in ("2029", "2038"):
        assert run_cli("score", path, "--year", year, "--set", "project.country=US", "--scheme", "us-45v").exit_code == 0
    text = run_cli("history", path).stdout
    assert "assessment year 2029" in text and "assessment year 2038" in text
    assert "why: assessment year 2029 -> 2038" in text and "not eligible" in text
