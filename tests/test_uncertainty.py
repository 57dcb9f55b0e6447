"""Monte Carlo of a project: distributions, draws through the stage code, probabilities of verdicts.

Expected values are hand calculations from probability theory, named beside each assertion:
the mean and variance of a product of two independent normal variables (Goodman, L. A. (1960),
On the exact variance of products, JASA 55, 708-713), the standard normal distribution function
(any statistical table: Phi(-0.4) = 0.3446, Phi(-0.5) = 0.3085), and the Monte Carlo standard
error of a mean, sigma / sqrt(n). The projects below are invented test cases.
"""

from __future__ import annotations

import json

import numpy as np
import pytest
from helpers import assessment_with
from scipy.stats import spearmanr

from carbonledger import api
from carbonledger.analyses.uncertainty import draw, make_plan
from carbonledger.model.distributions import parse_uncertainty
from carbonledger.model.factors import load_factor_set
from carbonledger.routes.project import load_project
from tests.helpers import DEMO, assert_one_line_error, run_cli, write

# INVENTED test project: grid electrolysis with nothing but the electrolyser's electricity, so the
# result is electricity (kWh/kg H2) x grid factor (g CO2e/kWh) / 1000, a linear chain.
LINEAR = """
[project]
name = "Linear chain test (invented)"
product = "hydrogen"
construction_start = 2026-03-01   # invented; before 2028-01-01, so 45V's construction rule is met
commissioning = 2028-01-01        # invented; placed in service 1 January 2028: 2028 is in 45V's 10-year credit period (45V(a)(1))
country = "US"                    # produced in the United States (45V(c)(2)(B)(i)(I))

[hydrogen]
route = "electrolysis"

[electrolysis]
technology = "alkaline"
electricity_kwh_per_kg_h2 = 50.0

[electricity.sources.grid]
share = 1.0
factor = "electricity.grid.eu27_2018"
"""


def linear_project(tmp_path, uncertainty: str):
    return write(tmp_path / "linear.toml", LINEAR + uncertainty)


def test_linear_chain_mean_and_variance_match_the_hand_calculation(tmp_path):
    path = linear_project(
        tmp_path,
        """
[uncertainty.parameters."electrolysis.electricity_kwh_per_kg_h2"]
distribution = "normal"
mean = 50.0
sd = 2.0

[uncertainty.factors."electricity.grid.eu27_2018"]
distribution = "normal"
mean = 400.0
sd = 40.0
""",
    )
    result = api.uncertainty(path, draws=200_000, seed=7)
    # Hand calculation (Goodman 1960, independent X ~ N(50, 2^2), F ~ N(400, 40^2), total = X F / 1000):
    # mean = 50 x 400 / 1000 = 20.0 kg CO2e/kg H2
    # variance = (50^2 40^2 + 400^2 2^2 + 2^2 40^2) / 1000^2 = 4.6464, std = 2.15555
    standard_error = np.sqrt(4.6464 / 200_000)
    assert result.total.mean == pytest.approx(20.0, abs=4 * standard_error)
    assert result.total.std**2 == pytest.approx(4.6464, rel=0.02)
    assert result.total.standard_error == pytest.approx(standard_error, rel=0.02)
    assert result.draws_breaking_limits == 0


def test_probability_of_qualifying_matches_the_normal_distribution(tmp_path):
    path = linear_project(
        tmp_path,
        """
[uncertainty.factors."electricity.grid.eu27_2018"]
distribution = "normal"
mean = 84.0
sd = 10.0
""",
    )
    result = api.uncertainty(path, draws=100_000, seed=3, assessment=assessment_with(schemes=["us-45v"]))
    check = result.checks[0]
    # value = 50 kWh x F / 1000 ~ N(4.2, 0.5^2) kg CO2e/kg H2; the loosest 45V tier is 4.0 kg:
    # P(value <= 4.0) = Phi((4.0 - 4.2) / 0.5) = Phi(-0.4) = 0.3446 (standard normal table).
    assert check.probability_qualifies == pytest.approx(0.3446, abs=4 * check.standard_error)
    assert check.standard_error == pytest.approx(np.sqrt(0.3446 * 0.6554 / 100_000), rel=0.02)
    assert check.statuses["fails"].probability == pytest.approx(1 - check.probability_qualifies)
    # P(value <= 2.5) = Phi(-3.4) = 0.000337: the 1.5 to 2.5 kg tier is (almost) never the best met
    assert check.tiers["25 % of the credit (1.5 to 2.5 kg)"].probability < 0.002
    assert sum(item.probability for item in check.tiers.values()) == pytest.approx(1.0)


def test_the_same_seed_gives_the_same_numbers_and_another_seed_other_numbers(tmp_path):
    arguments = ("uncertainty", DEMO / "blue_atr_ammonia.toml", "--distributions", DEMO / "uncertainty" / "blue_atr_ammonia.toml", "--draws", "2000", "--format", "json")
    first = run_cli(*arguments, "--seed", "11")
    again = run_cli(*arguments, "--seed", "11")
    other = run_cli(*arguments, "--seed", "12")
    assert first.exit_code == 0, first.output
    assert first.stdout == again.stdout
    assert json.loads(first.stdout)["total"] != json.loads(other.stdout)["total"]
    data = json.loads(first.stdout)
    assert data["draws"] == 2000 and data["seed"] == 11
    assert {"mean", "std", "p5", "p50", "p95"} <= set(data["total"])
    assert {"scheme", "probability_qualifies", "standard_error"} <= set(data["checks"][0])


def test_default_seed_is_stated_and_csv_has_the_statistics():
    result = run_cli("uncertainty", DEMO / "blue_atr_ammonia.toml", "--distributions", DEMO / "uncertainty" / "blue_atr_ammonia.toml", "--draws", "500", "--format", "csv")
    assert result.exit_code == 0, result.output
    assert "run,seed,,20261202," in result.stdout
    assert "total,total,p95," in result.stdout
    table = run_cli("uncertainty", DEMO / "blue_atr_ammonia.toml", "--distributions", DEMO / "uncertainty" / "blue_atr_ammonia.toml", "--draws", "500")
    assert "seed 20261202" in table.stdout and "Probability of each verdict" in table.stdout


def test_draws_beyond_a_physical_limit_are_counted_not_clipped(tmp_path):
    project = write(
        tmp_path / "blue.toml",
        (DEMO / "blue_atr_ammonia.toml").read_text()
        + """
[uncertainty.parameters."capture.capture_rate"]
distribution = "normal"
mean = 0.99
sd = 0.02
""",
    )
    result = api.uncertainty(project, draws=40_000, seed=5)
    # P(rate > 1) = 1 - Phi((1 - 0.99) / 0.02) = 1 - Phi(0.5) = 0.3085 (standard normal table)
    share = result.draws_breaking_limits / result.draws
    assert share == pytest.approx(0.3085, abs=4 * np.sqrt(0.3085 * 0.6915 / 40_000))
    assert result.limit_breaks[0].field == "capture.capture_rate" and result.limit_breaks[0].draws == result.draws_breaking_limits
    assert result.draws_used == result.draws - result.draws_breaking_limits


def test_rank_correlation_is_imposed_and_latin_hypercube_keeps_the_marginals():
    project, _ = load_project(DEMO / "blue_atr_ammonia.toml")
    uncertainty = parse_uncertainty(
        {
            "sampling": "latin_hypercube",
            "parameters": {
                "reforming.natural_gas_gj_per_kg_h2": {"distribution": "uniform", "low": 0.15, "high": 0.17},
                "reforming.electricity_kwh_per_kg_h2": {"distribution": "uniform", "low": 1.0, "high": 2.0},
            },
            "correlations": [{"inputs": ["reforming.natural_gas_gj_per_kg_h2", "reforming.electricity_kwh_per_kg_h2"], "rank": 0.7}],
        },
        "test",
    )
    plan = make_plan(project, assessment_with(factors=load_factor_set("default-2026")), uncertainty)
    drawn = draw(plan, 5000, seed=1, sampling="latin_hypercube")
    gas = drawn.parameters["reforming.natural_gas_gj_per_kg_h2"]
    power = drawn.parameters["reforming.electricity_kwh_per_kg_h2"]
    # Iman and Conover (1982): the Spearman rank correlation of the draws is the one asked for
    assert spearmanr(gas, power).statistic == pytest.approx(0.7, abs=0.03)
    # Latin hypercube (McKay et al. 1979): exactly one draw in each of the n equal strata
    strata = np.floor((power - 1.0) / 1.0 * 5000).astype(int)
    assert sorted(strata) == list(range(5000))


@pytest.mark.parametrize(
    ("table", "field", "words"),
    [
        ('[uncertainty.parameters."capture.capture_rate"]\ndistribution = "normal"\nmean = 0.9\nsd = -0.1\n', "sd", ">= 0"),
        ('[uncertainty.parameters."capture.capture_rate"]\ndistribution = "triangular"\nlow = 0.8\nmode = 0.99\nhigh = 0.95\n', "capture.capture_rate", "a mode between"),
        ('[uncertainty.parameters."capture.no_such_rate"]\ndistribution = "uniform"\nlow = 0.8\nhigh = 0.9\n', "capture.no_such_rate", "a parameter path that `carbonledger params` lists"),
        ('[uncertainty.factors."electricity.grid.nowhere"]\ndistribution = "uniform"\nlow = 1\nhigh = 2\n', "electricity.grid.nowhere", "a factor id known"),
        ('[uncertainty.parameters."capture.capture_rate"]\ndistribution = "gamma"\nmean = 1\n', "capture.capture_rate", "normal, lognormal, triangular, uniform, discrete"),
        ('[uncertainty.parameters."natural_gas.methane_emission_share"]\ndistribution = "lognormal"\nmedian = 0.005\ngsd = 0.5\n', "gsd", ">= 1"),
    ],
)
def test_bad_distributions_give_one_line(tmp_path, table, field, words):
    project = write(tmp_path / "blue.toml", (DEMO / "blue_atr_ammonia.toml").read_text() + "\n" + table)
    result = run_cli("uncertainty", project, "--draws", "100")
    assert_one_line_error(result)
    assert field in result.stderr and words in result.stderr, result.stderr


def test_a_project_with_an_uncertainty_table_still_scores(tmp_path):
    project = write(tmp_path / "blue.toml", (DEMO / "blue_atr_ammonia.toml").read_text() + '\n[uncertainty.parameters."capture.capture_rate"]\ndistribution = "uniform"\nlow = 0.9\nhigh = 0.96\n')
    with_table = api.score(project)
    without = api.score(DEMO / "blue_atr_ammonia.toml")
    assert with_table.total == without.total


def test_no_distribution_is_one_line(tmp_path):
    """A distribution on a factor the set does not know is refused in one line. (A project with no
    distribution at all now runs on the defaults of its factor rows: tests/test_uncertainty_defaults.py.)"""
    project = write(tmp_path / "p.toml", (DEMO / "blue_atr_ammonia.toml").read_text(encoding="utf-8") + '\n[uncertainty.factors."no.such.factor"]\ndistribution = "normal"\nmean = 1.0\nsd = 0.1\n')
    assert_one_line_error(run_cli("uncertainty", project, "--draws", "100", "--no-ledger"))


def test_stacked_draws_agree_with_bw2calcs_own_monte_carlo():
    """The same factor distributions written into the bw_processing datapackage (stats_arrays
    types) and sampled by bw2calc (``use_distributions=True``, ``next(lca)``) give the same
    distribution of the total: means within three standard errors, and a two-sample
    Kolmogorov-Smirnov test (scipy.stats.ks_2samp) that does not reject at 1 %."""
    from scipy.stats import ks_2samp

    from carbonledger.analyses.uncertainty import evaluate, monte_carlo_with_bw2calc

    project, _ = load_project(DEMO / "blue_atr_ammonia.toml")
    uncertainty = parse_uncertainty(
        {
            "factors": {
                "electricity.grid.eu27_2018": {"distribution": "normal", "mean": 281, "sd": 40},
                "natural_gas.upstream_co2": {"distribution": "triangular", "low": 3, "mode": 5, "high": 8},
                "electricity.renewable.wind_offshore": {"distribution": "uniform", "low": 5, "high": 20},
                "gwp.ar6.ch4_fossil": {"distribution": "lognormal", "median": 29.8, "gsd": 1.2},
            }
        },
        "test",
    )
    plan = make_plan(project, assessment_with(factors=load_factor_set("default-2026")), uncertainty)
    count = 800
    theirs = monte_carlo_with_bw2calc(plan, count, seed=1)
    ours = evaluate(plan, draw(plan, count, seed=2), count).total
    standard_error = np.sqrt(theirs.var(ddof=1) / count + ours.var(ddof=1) / count)
    assert abs(theirs.mean() - ours.mean()) < 3 * standard_error
    assert ks_2samp(theirs, ours).pvalue > 0.01
    assert theirs.std() > 10  # the draws do vary in bw2calc too (the test can fail)


def test_a_factor_in_several_entries_is_refused_for_the_bw2calc_cross_check():
    from carbonledger.analyses.uncertainty import bw2calc_entries

    project, _ = load_project(DEMO / "blue_atr_ammonia.toml")
    uncertainty = parse_uncertainty({"factors": {"combustion.natural_gas.co2": {"distribution": "uniform", "low": 55000, "high": 57500}}}, "test")
    with pytest.raises(Exception, match="drives one matrix entry"):
        bw2calc_entries(make_plan(project, assessment_with(factors=load_factor_set("default-2026")), uncertainty))


def test_route_limits_on_draws_agree_with_the_checks_a_score_runs():
    """Each draw flagged by Route.draw_limits is one the route's own check_limits refuses, and no other."""
    from carbonledger.analyses.uncertainty import limit_breaks, params_with_draws
    from carbonledger.core.inputs import NumericInputs
    from carbonledger.core.inventory import check_physical_limits
    from carbonledger.errors import InputError

    project, _ = load_project(DEMO / "green_ammonia_cracked_hydrogen.toml", ['cracking.heat_source="hydrogen"'])
    uncertainty = parse_uncertainty(
        {
            "parameters": {
                "cracking.hydrogen_recovery_fraction": {"distribution": "uniform", "low": 0.01, "high": 0.6},
                "cracking.heat_to_reactor_efficiency": {"distribution": "uniform", "low": 0.05, "high": 1.0},
                "shipping.tank_heat_ingress_kw": {"distribution": "uniform", "low": 100, "high": 40_000},
            }
        },
        "test",
    )
    factor_set = load_factor_set("default-2026")
    plan = make_plan(project, assessment_with(factors=factor_set), uncertainty)
    drawn = draw(plan, 300, seed=4)
    broken, reasons = limit_breaks(plan, drawn, 300)
    assert 0 < broken.sum() < 300 and {r["field"] for r in reasons} == {"cracking.hydrogen_recovery_fraction", "shipping.tank_heat_ingress_kw"}
    for number in range(300):
        params = params_with_draws(plan, {path: values[number] for path, values in drawn.parameters.items()})
        try:
            check_physical_limits(params, NumericInputs(factor_set), "test")
            refused = False
        except InputError:
            refused = True
        assert refused == broken[number], number


def test_delivered_boundary_draws_include_the_voyage(tmp_path):
    nominal = api.score(DEMO / "blue_atr_ammonia_shipped.toml")
    distance = nominal.parameters["shipping"]["distance_nautical_miles"]
    spec = write(tmp_path / "d.toml", f'[parameters."shipping.distance_nautical_miles"]\ndistribution = "uniform"\nlow = {distance * 0.9}\nhigh = {distance * 1.1}\n')
    result = api.uncertainty(DEMO / "blue_atr_ammonia_shipped.toml", distributions=spec, draws=4000, seed=2)
    assert result.boundary == nominal.boundary != "cradle-to-gate"
    assert result.by_stage["shipping"].std > 0
    # every other stage per tonne delivered moves only through the cargo lost on the way (tiny)
    assert result.by_stage["hydrogen_production"].std < 1e-3 * result.by_stage["hydrogen_production"].mean
    # the voyage's fuel is in proportion to the distance: a symmetric +-10 % range leaves the
    # mean of the shipping stage at the project's value (to the draws' standard error)
    assert result.by_stage["shipping"].mean == pytest.approx(nominal.by_stage["shipping"], abs=4 * result.by_stage["shipping"].standard_error + 1e-3 * nominal.by_stage["shipping"])


def test_a_discrete_choice_of_grid_factor_ids(tmp_path):
    override = write(tmp_path / "override.csv", "id,value,unit,source,table,year,region,note,from_memory\nelectricity.grid.test_high,600,g CO2e/kWh,Invented test value,,2026,,test only,true\n")
    path = linear_project(
        tmp_path,
        """
[uncertainty.parameters."electricity.sources.grid.factor"]
distribution = "discrete"
values = ["electricity.grid.eu27_2018", "electricity.grid.test_high"]
weights = [0.7, 0.3]
""",
    )
    result = api.uncertainty(path, draws=20_000, seed=1, assessment=assessment_with(factors=override))
    low = 50 * load_factor_set("default-2026").get("electricity.grid.eu27_2018").value / 1000
    # two outcomes: 50 kWh x 281 or x 600 g/kWh; mean = 0.7 low + 0.3 x 30.0 kg CO2e/kg H2
    standard_error = np.sqrt(0.21 / 20_000) * (30.0 - low)
    assert result.total.mean == pytest.approx(0.7 * low + 0.3 * 30.0, abs=4 * standard_error)
    assert result.total.p5 == pytest.approx(low) and result.total.p95 == pytest.approx(30.0)
    # a factor id in a unit that cannot stand in for the project's own is one line
    bad = write(tmp_path / "bad.toml", '[parameters."electricity.sources.grid.factor"]\ndistribution = "discrete"\nvalues = ["electricity.grid.eu27_2018", "electricity.grid.ireland_2015"]\n')
    assert_one_line_error(run_cli("uncertainty", path, "--distributions", bad, "--draws", "100"))


def test_chart_of_the_draws_marks_every_threshold(tmp_path):
    chart = tmp_path / "draws.svg"
    arguments = ("uncertainty", DEMO / "blue_atr_ammonia.toml", "--distributions", DEMO / "uncertainty" / "blue_atr_ammonia.toml", "--draws", "500", "--format", "json")
    result = run_cli(*arguments, "--chart", chart)
    assert result.exit_code == 0, result.output
    text = chart.read_text()
    assert "28.200" in text and "0.45" in text  # the EU limit and the tightest 45V tier (factors/schemes)
    assert_one_line_error(run_cli(*arguments, "--chart", chart))  # exists: not overwritten without --force
    assert_one_line_error(run_cli(*arguments, "--chart", tmp_path / "draws.pdf"))


def test_draws_of_a_project_with_a_time_series_follow_the_matching_as_score_does():
    """Each draw's scheme values equal `score` (bw2calc, then the series matched under each
    scheme's rule) of the project with that draw's inputs put in by hand, to 1e-9; without the
    series the draws would carry the declared annual shares (a different value under hourly or
    monthly matching, so the test can fail)."""

    from carbonledger.analyses.uncertainty import evaluate
    from carbonledger.model.factors import FactorSet

    path = DEMO / "hybrid_hourly_hydrogen.toml"
    project, _ = load_project(path)
    factor_set = load_factor_set("default-2026")
    uncertainty = parse_uncertainty(
        {
            "parameters": {"electrolysis.electricity_kwh_per_kg_h2": {"distribution": "triangular", "low": 52, "mode": 54, "high": 58}},
            "factors": {"electricity.grid.eu27_2018": {"distribution": "normal", "mean": 281, "sd": 40}},
        },
        "test",
    )
    plan = make_plan(project, assessment_with(factors=factor_set), uncertainty, source=str(path), series=api.project_series(project, path))
    drawn = draw(plan, 3, seed=4)
    outcome = evaluate(plan, drawn, 3)
    declared = evaluate(make_plan(project, assessment_with(factors=factor_set), uncertainty, source=str(path)), drawn, 3)
    differs = 0
    for number in range(3):
        kwh = float(drawn.parameters["electrolysis.electricity_kwh_per_kg_h2"][number])
        grid = float(drawn.factors["electricity.grid.eu27_2018"][number])
        factors = dict(factor_set.factors)
        factors["electricity.grid.eu27_2018"] = factors["electricity.grid.eu27_2018"].model_copy(update={"value": grid})
        by_hand = api.score(path, assessment=assessment_with(factors=FactorSet(name="drawn", factors=factors), overrides=[f"electrolysis.electricity_kwh_per_kg_h2={kwh!r}"]))
        for check in by_hand.checks:
            assert outcome.scheme_values[check.scheme][number] == pytest.approx(check.value, rel=1e-9, abs=1e-9), check.scheme
            differs += abs(declared.scheme_values[check.scheme][number] - check.value) > 1e-6
    assert differs > 0


@pytest.mark.parametrize(
    "stem, path, low, high",
    [
        ("turquoise_pyrolysis_hydrogen", "pyrolysis.electricity_kwh_per_kg_h2", 8.0, 16.0),
        ("chlor_alkali_by_product_hydrogen", "chlor_alkali.cell_electricity_kwh_per_kg_h2", 70.0, 100.0),
        ("biomethane_reforming_hydrogen", "hydrogen.conditioning_kwh_per_kg_h2", 0.5, 2.0),
    ],
)
def test_each_draw_of_a_co_product_or_biogenic_route_equals_score_with_its_inputs(stem, path, low, high):
    """One evaluation core: each draw's scheme values equal `score` (bw2calc, every rule: the scheme's co-product
    rule rescored or left open, netting of stored biogenic CO2 where a rulebook nets it, electricity charged as
    the rulebook says) of the project with that draw's input put in by hand, to 1e-9, and each draw's status is
    score's status. Ranges invented, inside the routes' physical limits."""
    from carbonledger.analyses.uncertainty import evaluate, statuses

    project_file = DEMO / f"{stem}.toml"
    project, _ = load_project(project_file)
    factor_set = load_factor_set("default-2026")
    uncertainty = parse_uncertainty({"parameters": {path: {"distribution": "uniform", "low": low, "high": high}}}, "test")
    plan = make_plan(project, assessment_with(factors=factor_set, year=2030), uncertainty, source=str(project_file))
    drawn = draw(plan, 3, seed=11)
    outcome = evaluate(plan, drawn, 3)
    for number in range(3):
        value = float(drawn.parameters[path][number])
        by_hand = api.score(project_file, assessment=assessment_with(overrides=[f"{path}={value!r}"], year=2030))
        for check in by_hand.checks:
            assert outcome.scheme_values[check.scheme][number] == pytest.approx(check.value, rel=1e-9, abs=1e-9), check.scheme
            scheme = next(s for s in outcome.schemes if s.id == check.scheme)
            status = statuses(scheme, outcome.scheme_values[check.scheme][number : number + 1], outcome.scheme_findings[check.scheme], outcome.co_product_open[check.scheme][number : number + 1])
            assert [name for name, hit in status.items() if hit[0]] == [check.status], (check.scheme, number)
