"""The thin orchestrator: one Assessment holds a run's options, checked once, and one pipeline
(read, prepare, solve, judge, match) scores every project under it. Checked against the per-option
API a command used before and against the verdict casebook's rule on the assessment year
(2023/1184 Art. 11: the transition to hourly matching on 1 January 2030, a dated rule read on the
assessment year)."""

from __future__ import annotations

import pytest
from helpers import DEMO, assessment_with

from carbonledger import api
from carbonledger.analyses.pipeline import assess, read
from carbonledger.core.assessment import Assessment
from carbonledger.errors import InputError
from carbonledger.model.factors import load_factor_set

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
    through_api = api.score(BLUE, assessment=assessment_with(factors=FACTORS, gwp="ar5", boundary="well-to-wake", year=2031))
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
