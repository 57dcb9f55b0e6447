"""Pedigree-matrix default uncertainty (ecoinvent version 3) for factors with no stated range.

The variances per score are those of factors/uncertainty/pedigree.toml, written from memory of
the table of Weidema et al. (2013), Overview and methodology. Data quality guideline for the
ecoinvent database version 3, Ecoinvent Report 1 (v3) -- FROM MEMORY, not checked against the
report (the table was not reachable). The hand calculations below use these variances and the
formula of the same report: sigma^2 = ln(basic GSD)^2 + sum of the variances, GSD = exp(sigma);
the median of the lognormal is the value itself (ecoinvent FAQ "How to interpret the uncertainty
fields in ecoinvent?": "the deterministic value ... is taken as equal to mu*").
The projects are invented test cases.
"""

from __future__ import annotations

import json
import math

import numpy as np
import pytest
from helpers import assessment_with

from carbonledger import api
from carbonledger.model.factors import factors_root, load_factor_set
from carbonledger.model.pedigree import parse_scores, pedigree_gsd, pedigree_table
from tests.helpers import FACTOR_HEADER, assert_one_line_error, run_cli, write
from tests.test_uncertainty import LINEAR

GRID_ROW = 'electricity.grid.eu27_2018,281,g CO2e/kWh,"European Environment Agency, indicator IND-353",Key assessment text,2018,EU-27,copy of the shipped row with invented pedigree scores for a test,false'


def test_gsd_from_the_scores_matches_the_hand_calculation():
    table = pedigree_table(factors_root())
    assert table.from_memory  # the variance table is recorded from memory until checked against the report
    # Scores (2, 3, 1, 2, 4), basic GSD 1.05, variances from memory of Weidema et al. (2013):
    # reliability 2: 0.0006; completeness 3: 0.0006; temporal 1: 0; geographical 2: 0.000025;
    # further technological 4: 0.04 -> sum 0.041225; ln(1.05)^2 = 0.0023805
    # sigma = sqrt(0.0436055) = 0.208819; GSD = exp(0.208819) = 1.23222
    assert pedigree_gsd((2, 3, 1, 2, 4), table, basic_gsd=1.05) == pytest.approx(1.23222, abs=1e-5)
    # Worst scores (5, 5, 5, 5, 5), no basic uncertainty: 0.04 + 0.008 + 0.04 + 0.002 + 0.12 = 0.21
    # GSD = exp(sqrt(0.21)) = exp(0.458258) = 1.58131
    assert pedigree_gsd((5, 5, 5, 5, 5), table) == pytest.approx(1.58131, abs=1e-5)
    # Best scores and no basic uncertainty: no spread at all (GSD 1)
    assert pedigree_gsd((1, 1, 1, 1, 1), table) == 1.0


@pytest.mark.parametrize("text, expected", [("(2,3,1,2,4)", (2, 3, 1, 2, 4)), ("2;3;1;2;4", (2, 3, 1, 2, 4)), ("5 5 5 5 5", (5, 5, 5, 5, 5)), ([1, 2, 3, 4, 5], (1, 2, 3, 4, 5))])
def test_scores_are_read_in_the_usual_notations(text, expected):
    assert parse_scores(text, "test") == expected


def test_a_factor_row_with_pedigree_scores_gives_a_lognormal_in_the_monte_carlo(tmp_path):
    override = write(tmp_path / "scored.csv", FACTOR_HEADER.strip() + ",pedigree,basic_gsd\n" + GRID_ROW + ',"(2,3,1,2,4)",1.05\n')
    project = write(tmp_path / "linear.toml", LINEAR)  # no [uncertainty] table: the row's scores are the only uncertainty
    result = api.uncertainty(project, draws=100_000, seed=5, assessment=assessment_with(factors=str(override)))
    # total = 50 kWh/kg x F / 1000 with F lognormal (median 281 g/kWh, GSD 1.23222 by hand above):
    # median 50 x 281 / 1000 = 14.05 kg CO2e/kg H2; 95th percentile 14.05 x 1.23222^1.644854 = 19.8158
    gsd = 1.23222
    assert result.total.p50 == pytest.approx(14.05, rel=0.005)
    assert result.total.p95 == pytest.approx(14.05 * gsd**1.644854, rel=0.01)
    # lognormal mean = median x exp(sigma^2 / 2) = 14.05 x exp(0.0436055 / 2) = 14.3597
    assert result.total.mean == pytest.approx(14.05 * math.exp(math.log(gsd) ** 2 / 2), abs=4 * result.total.standard_error)
    (item,) = result.inputs
    assert item.input == "factor electricity.grid.eu27_2018"
    assert item.distribution["distribution"] == "pedigree" and item.distribution["scores"] == (2, 3, 1, 2, 4)
    assert item.stated_in.endswith("scored.csv") and item.from_memory


def test_a_pedigree_distribution_in_the_uncertainty_table_takes_the_factor_value_as_median(tmp_path):
    project = write(
        tmp_path / "linear.toml",
        LINEAR + '\n[uncertainty.factors."electricity.grid.eu27_2018"]\ndistribution = "pedigree"\nscores = [5, 5, 5, 5, 5]\n',
    )
    result = api.uncertainty(project, draws=50_000, seed=9)
    # median 14.05 (shipped row 281 g/kWh x 50 / 1000); GSD exp(sqrt(0.21)) = 1.58131 (hand calculation above)
    # so p5 = 14.05 / 1.58131^1.644854 = 6.1958 kg CO2e/kg H2
    assert result.total.p50 == pytest.approx(14.05, rel=0.01)
    assert result.total.p5 == pytest.approx(14.05 / 1.58131**1.644854, rel=0.015)
    data = json.loads(result.to_json())
    assert data["inputs"][0]["distribution"]["gsd"] == pytest.approx(1.58131, abs=1e-5)
    assert data["inputs"][0]["from_memory"] is True


def test_rows_without_the_uncertainty_columns_keep_the_set_hash(tmp_path):
    folder = tmp_path / "sets" / "copy"
    shipped = load_factor_set("default-2026")
    for path in (factors_root() / "sets" / "default-2026").iterdir():
        text = path.read_text(encoding="utf-8")
        if path.suffix == ".csv":  # the same rows with two empty uncertainty columns
            lines = [line if line.startswith("#") or not line.strip() else line + ("," * 2 if not line.startswith("id,") else ",pedigree,basic_gsd") for line in text.splitlines()]
            text = "\n".join(lines) + "\n"
        write(folder / path.name, text)
    assert load_factor_set(str(folder)).sha256 == shipped.sha256


@pytest.mark.parametrize("scores", ['"(0,1,1,1,1)"', '"(1,6,1,1,1)"', '"(1,a,1,1,1)"', '"(1,1,1,1)"', '"1.5;1;1;1;1"'])
def test_bad_scores_in_a_factor_row_are_one_line_errors(tmp_path, scores):
    override = write(tmp_path / "bad.csv", FACTOR_HEADER.strip() + ",pedigree,basic_gsd\n" + GRID_ROW + f",{scores},\n")
    project = write(tmp_path / "linear.toml", LINEAR)
    result = run_cli("uncertainty", project, "--factors", override, "--draws", "100")
    assert_one_line_error(result)
    assert "bad.csv:2: pedigree: five pedigree scores, each a whole number 1 to 5" in result.stderr


@pytest.mark.parametrize("scores, shown", [("[0, 1, 1, 1, 1]", "got 0"), ("[1, 1, 6, 1, 1]", "got 6"), ('"high"', "got 'high'"), ('["a", 1, 1, 1, 1]', "got 'a'")])
def test_bad_scores_in_the_uncertainty_table_are_one_line_errors(tmp_path, scores, shown):
    project = write(tmp_path / "linear.toml", LINEAR + f'\n[uncertainty.factors."electricity.grid.eu27_2018"]\ndistribution = "pedigree"\nscores = {scores}\n')
    result = run_cli("uncertainty", project, "--draws", "100")
    assert_one_line_error(result)
    assert "uncertainty.factors.electricity.grid.eu27_2018.scores: five pedigree scores" in result.stderr and shown in result.stderr


def test_a_basic_uncertainty_below_one_is_refused(tmp_path):
    override = write(tmp_path / "bad.csv", FACTOR_HEADER.strip() + ",pedigree,basic_gsd\n" + GRID_ROW + ',"(1,1,1,1,1)",0.9\n')
    result = run_cli("factors", "list", "--factors", override)
    assert_one_line_error(result)
    assert "basic_gsd: a geometric standard deviation >= 1" in result.stderr


def test_pedigree_draws_agree_with_bw2calc(tmp_path):
    """The same pedigree lognormal in bw2calc's own Monte Carlo (stats_arrays type 2) gives the same distribution."""
    from scipy.stats import ks_2samp

    from carbonledger.analyses.uncertainty import (
        DEFAULT_SEED,
        draw,
        evaluate_in_blocks,
        make_plan,
        monte_carlo_with_bw2calc,
    )
    from carbonledger.model.distributions import Uncertainty
    from carbonledger.routes.project import load_project

    override = write(tmp_path / "scored.csv", FACTOR_HEADER.strip() + ",pedigree,basic_gsd\n" + GRID_ROW + ',"(3,3,3,3,3)",\n')
    project, _ = load_project(write(tmp_path / "linear.toml", LINEAR))
    plan = make_plan(project, assessment_with(factors=load_factor_set(override)), Uncertainty(), source="linear")
    ours = evaluate_in_blocks(plan, draw(plan, 2000, DEFAULT_SEED)).total
    theirs = monte_carlo_with_bw2calc(plan, 500, seed=DEFAULT_SEED)
    # means within three standard errors, two-sample Kolmogorov-Smirnov not rejected at 1 %
    se = np.sqrt(ours.var(ddof=1) / len(ours) + theirs.var(ddof=1) / len(theirs))
    assert abs(ours.mean() - theirs.mean()) < 3 * se
    assert ks_2samp(ours, theirs).pvalue > 0.01
