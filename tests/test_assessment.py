"""The thin orchestrator: one Assessment holds a run's options, checked once, and one pipeline
(read, prepare, solve, judge, match) scores every project under it. Every api function takes
that one value; checked against api.score with the same options and against the verdict casebook's rule on the assessment year
(2023/1184 Art. 11: the transition to hourly matching on 1 January 2030, a dated rule read on the
assessment year)."""

from __future__ import annotations

import dataclasses

import pytest
from helpers import DEMO, assessment_with

from carbonledger import api
from carbonledger.analyses.pipeline import assess, read
from carbonledger.analyses.uncertainty import Plan, make_plan
from carbonledger.core.assessment import Assessment
from carbonledger.errors import InputError
from carbonledger.model.distributions import Uncertainty
from carbonledger.model.factors import load_factor_set
from carbonledger.routes.project import load_project

FACTORS = load_factor_set("default-2026")
BLUE = DEMO / "blue_atr_ammonia_shipped.toml"
HOURLY = DEMO / "hybrid_hourly_hydrogen.toml"


@pytest.mark.parametrize(
    ("options", "field"),
    [
        ({"gwp": "ar7"}, "--gwp"),
        ({"schemes": ("eu-rfnbo-typo",)}, "--scheme"),
        ({"boundary": "gate-to-grave"}, "--boundary"),
        ({"year": 1999}, "--year"),
        ({"year": 2101}, "--year"),
    ],
)
def test_options_are_checked_once_when_the_assessment_is_built(options, field):
    with pytest.raises(InputError) as error:
        Assessment(FACTORS, **options)
    assert str(error.value).startswith(f"{field}: ")  # one line naming the option


def test_options_are_normalised_as_the_command_line_spells_them():
    assessment = Assessment(FACTORS, gwp="AR5", schemes=("EU-RFNBO",), boundary="Well-To-Tank", year=2030)
    assert (assessment.gwp, assessment.schemes, assessment.boundary) == ("ar5", ("eu-rfnbo",), "well-to-tank")
    assert assessment.project_overrides == ["project.boundary=well-to-tank"]


def test_the_pipeline_gives_what_score_gives():
    """One Assessment through the pipeline equals api.score with the same options, figure for figure."""
    assessment = Assessment(FACTORS, gwp="ar5", boundary="well-to-wake", year=2031)
    project, sha, series = read(assessment, BLUE)
    through_pipeline = assess(assessment, project, source=str(BLUE), project_sha256=sha, series=series)
    through_api = api.score(BLUE, assessment_with(factors="default-2026", gwp="ar5", boundary="well-to-wake", year=2031))
    assert through_pipeline.total == through_api.total
    assert [(c.scheme, c.status, c.value) for c in through_pipeline.checks] == [(c.scheme, c.status, c.value) for c in through_api.checks]
    assert through_pipeline.boundary == "well-to-wake" and through_pipeline.assessment_year == 2031


def test_one_assessment_moved_to_another_year_reads_the_rules_of_that_year():
    """The hourly demo's series matched under 2023/1184 Art. 11: monthly matching until the end of 2029,
    hourly from 1 January 2030, so the same project is matched monthly in 2029 and hourly in 2031."""
    assessment = Assessment(FACTORS, schemes=("eu-rfnbo",), year=2029)
    granularity = {}
    for year in (2029, 2031):
        result = api.score(HOURLY, assessment.but(year=year))
        granularity[year] = result.checks[0].electricity_matching.granularity
    assert granularity == {2029: "month", 2031: "hour"}


def test_a_matching_what_if_on_a_project_without_a_series_is_one_line():
    with pytest.raises(InputError) as error:
        read(Assessment(FACTORS, matching="hour"), BLUE)
    assert "--matching" in str(error.value)


YEAR_AND_GWP = Assessment(FACTORS, gwp="ar5", year=2030)
PLAIN_BLUE = DEMO / "blue_atr_ammonia.toml"


def _figures(result) -> tuple:
    """Total and each check's value (to 1e-9: the report solves with the stacked numpy solver, score with
    bw2calc), GWP set, assessment year, and each check's scheme and status (exactly)."""
    return [result.total, *(c.value for c in result.checks)], result.gwp_basis, result.assessment_year, [(c.scheme, str(c.status)) for c in result.checks]


def _agree(result, scored) -> bool:
    (values, *rest), (expected, *expected_rest) = _figures(result), _figures(scored)
    return values == pytest.approx(expected, rel=1e-9) and rest == expected_rest


@pytest.mark.parametrize("path", [PLAIN_BLUE, HOURLY])
def test_every_command_given_one_assessment_scores_as_score_does(path):
    """A consistency check across commands, not a check against the outside (each command's own tests hold
    its figures against hand-worked values): compare, the report, the audit workbook and headroom, each given
    one Assessment with year 2030 and AR5, give the figures api.score gives with that Assessment."""
    scored = api.score(path, YEAR_AND_GWP)
    assert (scored.gwp_basis, scored.assessment_year) == ("ar5", 2030)  # the options reached the result
    assert not _agree(scored, api.score(path))  # and they change it (the demos' own year is not 2030)
    compared = api.compare([path], YEAR_AND_GWP)
    assert compared.gwp_basis == "ar5" and _agree(compared.scores[0], scored)
    assert [(c.scheme, str(c.status)) for c in compared.projects[0].checks] == _figures(scored)[3]
    assert _agree(api.report_items([path], YEAR_AND_GWP, draws=20)[0].result, scored)
    _, engine, _ = api.audit_workbook(path, YEAR_AND_GWP)  # the workbook's engine scores the declared shares
    assert _agree(engine, api.score(path, YEAR_AND_GWP.but(matching="declared")))


def test_headroom_given_one_assessment_starts_from_the_value_score_gives():
    """Consistency: the scheme value headroom finds at the project's own capture rate (the arrays of the
    Monte Carlo path) is the value score gives under the same Assessment (bw2calc), to 1e-9."""
    expected = {c.scheme: c.value for c in api.score(PLAIN_BLUE, YEAR_AND_GWP).checks}["japan-ammonia"]
    [found] = api.headroom(PLAIN_BLUE, ["capture.capture_rate"], "japan-ammonia", assessment=YEAR_AND_GWP)
    assert found.project_scheme_value == pytest.approx(expected, rel=1e-9)


def test_a_plan_holds_the_assessment_and_no_option_of_its_own():
    """Plan carries the one Assessment; factor set, GWP set, schemes, boundary and year are not fields of its own."""
    names = {field.name for field in dataclasses.fields(Plan)}
    assert "assessment" in names
    assert not names & {"factor_set", "gwp", "schemes", "boundary", "year"}
    project, _ = load_project(PLAIN_BLUE)
    uncertainty = Uncertainty.model_validate({"parameters": {"capture.capture_rate": {"distribution": "uniform", "low": 0.9, "high": 0.95}}})
    plan = make_plan(project, YEAR_AND_GWP, uncertainty, source=str(PLAIN_BLUE))
    assert plan.assessment is YEAR_AND_GWP
