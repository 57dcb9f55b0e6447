"""Projects of one shape scored as arrays (``core.stacked``, used by ``portfolio.figures_many`` and recalc).

The array path must give each project what it gets scored alone: the reference is ``pipeline.assess``, one
project at a time through bw2calc. Its one assumption, that the scheme rules read a project's numbers only
by their sign (a source supplies or not), is checked here on every demo and on a generated portfolio, so a
rule that starts reading a magnitude makes these tests fail instead of giving a group a wrong verdict.
"""

import copy
import math

import pytest
from helpers import DEMO, PORTFOLIO
from test_recalc import generated_portfolio

from carbonledger.analyses import portfolio
from carbonledger.analyses.pipeline import PortfolioProject, assess
from carbonledger.analyses.portfolio import figures_many, load_portfolio
from carbonledger.core import stacked
from carbonledger.core.assessment import Assessment
from carbonledger.core.scoring import project_params, scheme_reading
from carbonledger.errors import InputError
from carbonledger.model.factors import load_factor_set
from carbonledger.routes.project import validate_project

SETS = ("default-2026", "demo-2027-grid-revision")


def assert_same_figures(fast, slow) -> None:
    """Every figure to 1e-9 relative; names, statuses, tiers, limits and factor rows exactly."""
    assert (fast.project, fast.project_file, fast.project_sha256) == (slow.project, slow.project_file, slow.project_sha256)
    assert (fast.product, fast.boundary, fast.unit, fast.gwp_basis, fast.assessment_year) == (slow.product, slow.boundary, slow.unit, slow.gwp_basis, slow.assessment_year)
    assert fast.total == pytest.approx(slow.total, rel=1e-9, abs=1e-12)
    assert fast.hydrogen_production_kg_co2e_per_kg_h2 == pytest.approx(slow.hydrogen_production_kg_co2e_per_kg_h2, rel=1e-9, abs=1e-12)
    assert list(fast.by_stage) == list(slow.by_stage) and list(fast.by_gas) == list(slow.by_gas)
    for mine, theirs in ((fast.by_stage, slow.by_stage), (fast.by_gas, slow.by_gas), (fast.intensity.model_dump(), slow.intensity.model_dump())):
        for key, value in theirs.items():
            assert (mine[key] is None) == (value is None), key
            if value is not None:
                assert mine[key] == pytest.approx(value, rel=1e-9, abs=1e-12), key
    assert [c.scheme for c in fast.checks] == [c.scheme for c in slow.checks]
    for quick, check in zip(fast.checks, slow.checks, strict=True):
        assert quick.value == pytest.approx(check.value, rel=1e-9, abs=1e-12), check.scheme
        assert (quick.status, quick.tier, quick.passes, quick.limit, quick.from_memory) == (check.status, check.tier, check.passes, check.limit, check.from_memory), check.scheme
    assert [f.id for f in fast.factors_used] == [f.id for f in slow.factors_used]
    assert fast.parameters == slow.parameters


def varied(item: PortfolioProject, scale: float, number: int) -> PortfolioProject:
    """The project with every number but the shares multiplied by ``scale`` (the same shape, other sizes)."""
    data = item.project.model_dump()

    def scaled(node, key=""):
        if isinstance(node, dict):
            return {k: scaled(v, k) for k, v in node.items()}
        return node * scale if type(node) is float and "share" not in key and node > 0 else node

    data = scaled(data)
    data["project"]["name"] = f"{data['project']['name']} (variant {number}, invented)"
    return PortfolioProject(f"{item.path}#{number}", validate_project(data, item.path), f"sha{number}")


def demo_groups() -> list[list[PortfolioProject]]:
    """Each demo without a time series, with two variants of it (numbers 0.5 % and 1 % smaller)."""
    groups = []
    for item in load_portfolio([DEMO, PORTFOLIO]):
        if item.series is None:
            groups.append([item, varied(item, 0.995, 1), varied(item, 0.99, 2)])
    return groups


def spy_on_groups(monkeypatch) -> list:
    """Record how many projects each array pass scored."""
    sizes = []
    real = portfolio.group_figures

    def counting(template, first, members):
        result = real(template, first, members)
        sizes.append(len(members) if result is not None else 0)
        return result

    monkeypatch.setattr(portfolio, "group_figures", counting)
    return sizes


@pytest.mark.parametrize("set_name", SETS)
def test_every_demo_route_scores_as_arrays_as_alone(set_name, monkeypatch):
    """Each demo route with two variants goes through the arrays (none falls back) and each project's
    figures equal its own score through bw2calc (``pipeline.assess``)."""
    sizes = spy_on_groups(monkeypatch)
    assessment = Assessment(load_factor_set(set_name), "ar6")
    groups = demo_groups()
    assert len(groups) >= 12  # every demo route but the one with a time series
    projects = [item for group in groups for item in group]
    fast = figures_many(assessment, projects)
    co_product_differs = len(groups) - len(sizes)  # a scheme's co-product rule that differs is scored alone
    assert co_product_differs <= 2 and sizes.count(3) == len(sizes), sizes
    for item, figures in zip(projects, fast, strict=True):
        slow = assess(assessment, item.project, source=item.path, project_sha256=item.sha256)
        assert_same_figures(figures, portfolio.ResultFigures.of(slow))


def test_a_generated_portfolio_scores_as_arrays_as_alone(tmp_path, monkeypatch):
    """120 generated projects (every kind the recalc benchmark makes): a third or more go through arrays
    (the shapes are many at this size), and every project's figures equal its own score through bw2calc."""
    sizes = spy_on_groups(monkeypatch)
    monkeypatch.setattr(stacked, "BLOCK_MEMBERS", 4)  # a shape met in several array passes
    monkeypatch.setattr(portfolio, "BLOCK_MEMBERS", 4)
    projects = generated_portfolio(tmp_path, 120)
    assessment = Assessment(load_factor_set("default-2026"), "ar6")
    fast = figures_many(assessment, projects)
    assert sum(sizes) >= 30 and max(sizes) == 4, sizes
    for item, figures in zip(projects, fast, strict=True):
        slow = assess(assessment, item.project, source=item.path, project_sha256=item.sha256)
        assert_same_figures(figures, portfolio.ResultFigures.of(slow))


def reading_of(assessment: Assessment, item: PortfolioProject) -> list:
    """What the verdicts take from each scheme's reading: the electricity counted zero and charged as grid,
    each finding's step, outcome and charge, the rule versions."""
    ready = assessment.prepare(item.project, source=item.path)
    return [
        (
            scheme.id,
            sorted(reading.counted_zero),
            sorted(reading.charged_as_grid.items()),
            [(f.step, f.outcome, f.charged) for f in reading.findings],
            list(reading.versions),
        )
        for scheme in ready.chosen
        for reading in [scheme_reading(ready, scheme)]
    ]


def test_rules_read_projects_of_one_shape_alike(tmp_path):
    """The array path reads the rules once per shape. Every project of a shape must read them as the first
    does: on the demos with their variants, and on a generated portfolio, in each project's default year and
    in 2035 (hourly matching in the EU from 1 January 2030, Delegated Regulation (EU) 2023/1184 Art. 6)."""
    generated = generated_portfolio(tmp_path, 80)
    shapes: dict = {}
    for item in generated:
        shapes.setdefault(stacked.shape_of(project_params(item.project)), []).append(item)
    groups = [group for group in shapes.values() if len(group) > 1] + demo_groups()
    assert len(groups) >= 20
    for year in (None, 2035):
        assessment = Assessment(load_factor_set("default-2026"), "ar6", year=year)
        for group in groups:
            first = reading_of(assessment, group[0])
            for item in group[1:]:
                assert reading_of(assessment, item) == first, item.path


def test_a_shape_keeps_texts_and_signs_and_drops_sizes_and_names():
    """Two projects differing only in a number's size and the free text share a shape; a factor id, a
    zero where a number was, or a date set them apart."""
    item = load_portfolio([DEMO / "green_electrolysis_ammonia.toml"])[0]
    params = project_params(item.project)
    shape = stacked.shape_of(params)
    bigger = project_params(varied(item, 0.9, 1).project)
    assert bigger != params and stacked.shape_of(bigger) == shape
    for path, value in (
        (("project", "commissioning"), "2031-01-01"),
        (("electrolysis", "technology"), "solid_oxide"),
        (("electrolysis", "heat_kwh_per_kg_h2"), 0.0 if params["electrolysis"]["heat_kwh_per_kg_h2"] else 1.0),
    ):
        other = project_params(item.project)
        node = other
        for part in path[:-1]:
            node = node[part]
        node[path[-1]] = value
        assert stacked.shape_of(other) != shape, path


def test_an_infinite_number_in_a_group_is_refused_naming_its_project():
    """A member with an infinite number is refused in one line naming its own file (a physical limit or a
    figure that is not finite), as when it is scored alone; the others of its group are not named."""
    group = demo_groups()[0]
    assessment = Assessment(load_factor_set("default-2026"), "ar6")
    ready = assessment.prepare(group[0].project, source=group[0].path)
    first = figures_many(assessment, group[:1])[0]
    members = [stacked.Member(project_params(item.project), item.path, item.sha256) for item in group]
    broken = copy.deepcopy(members[2].params)
    path = next(p for p, v in stacked.parameter_leaves(broken) if type(v) is float and v > 0 and "share" not in p[-1])
    node = broken
    for part in path[:-1]:
        node = node[part]
    node[path[-1]] = math.inf
    members[2] = stacked.Member(broken, members[2].source, members[2].sha256)
    with pytest.raises(InputError) as refused:
        stacked.group_figures(ready, first, members)
    assert str(refused.value).startswith(members[2].source), str(refused.value)
