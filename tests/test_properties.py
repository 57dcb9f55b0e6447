"""Monotonic relations every practitioner expects (property tests with hypothesis)."""


from helpers import DEMO
from hypothesis import given, settings
from hypothesis import strategies as st

from carbonledger.analyses.pipeline import PortfolioProject
from carbonledger.analyses.portfolio import score_portfolio
from carbonledger.model.factors import DEFAULT_SET, FactorSet, load_factor_set
from carbonledger.routes.project import load_project

BLUE = DEMO / "blue_smr_hydrogen.toml"
GRID = DEMO / "grid_electrolysis_hydrogen.toml"
DEFAULT = load_factor_set(DEFAULT_SET)


def total(path, overrides, factor_set=DEFAULT):
    # the stacked solve (equal to bw2calc's, tests/test_recalc.py::test_fast_path_equals_bw2calc_one_project_at_a_time) keeps hundreds of examples quick
    project, _ = load_project(path, overrides)
    return score_portfolio([PortfolioProject(str(path), project, "")], factor_set, check_with_bw2calc=False)[0].total


fractions = st.floats(min_value=0.0, max_value=1.0, allow_nan=False)


@settings(max_examples=40, deadline=None)
@given(low=st.floats(0.0, 0.1), high=st.floats(0.0, 0.1))
def test_more_methane_loss_never_lowers_the_score(low, high):
    low, high = sorted((low, high))
    assert total(BLUE, [f"natural_gas.methane_emission_share={low!r}"]) <= total(BLUE, [f"natural_gas.methane_emission_share={high!r}"]) + 1e-12


@settings(max_examples=40, deadline=None)
@given(low=fractions, high=fractions, applies_to=st.sampled_from(["process", "process_and_flue"]))
def test_higher_capture_rate_never_raises_the_score(low, high, applies_to):
    low, high = sorted((low, high))
    scope = f'capture.applies_to="{applies_to}"'
    assert total(BLUE, [f"capture.capture_rate={high!r}", scope]) <= total(BLUE, [f"capture.capture_rate={low!r}", scope]) + 1e-12


def with_grid_factor(grams: float) -> FactorSet:
    factors = dict(DEFAULT.factors)
    factors["electricity.grid.eu27_2018"] = factors["electricity.grid.eu27_2018"].model_copy(update={"value": grams})
    return FactorSet(name=f"grid-{grams}", factors=factors)


@settings(max_examples=40, deadline=None)
@given(cleaner=st.floats(0.0, 1000.0), dirtier=st.floats(0.0, 1000.0))
def test_cleaner_grid_never_raises_the_score(cleaner, dirtier):
    cleaner, dirtier = sorted((cleaner, dirtier))
    for path in (GRID, BLUE, DEMO / "blue_atr_ammonia.toml"):
        assert total(path, [], with_grid_factor(cleaner)) <= total(path, [], with_grid_factor(dirtier)) + 1e-12
