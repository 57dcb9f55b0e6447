"""Bad input on the newer commands (uncertainty, headroom, sensitivity, plan, lifetime, series,
distributions): each test is a real input that used to crash, be accepted silently, or give a
meaningless result with exit 0. Every refusal is one line ``error: FILE: FIELD: expected`` and exit 2.

Outside references checked against (named again beside each check):
- OWASP, "CSV Injection": a text cell starting with = + - @ tab or carriage return gets a leading quote.
- First law of thermodynamics: with no imported heat, the energy bought (fuel LHV plus electricity)
  is at least the heating value of the products. Hydrogen LHV 119.96 MJ/kg (US DOE Hydrogen Analysis
  Resource Center, as in the shipped factor set); the heat of combustion of graphite is the formation
  enthalpy of CO2(g), -393.5 kJ/mol (NIST-JANAF tables, a fact of the trade), so solid carbon holds
  393.5 / 12.011 = 32.76 MJ/kg.
- Chlor-alkali cell: 2 NaCl + 2 H2O -> Cl2 + H2 + 2 NaOH takes two electrons per H2; the reversible
  voltage is E(Cl2/Cl-) - E(H2O/H2) = 1.358 - (-0.828) = 2.186 V (CRC Handbook, electrochemical series;
  recorded from memory, not yet checked against the handbook); the Faraday constant is exact
  (SI 2019: 96 485.332 12 C/mol). An independent route to the same floor: Gibbs energies of formation
  (NBS tables, recorded from memory) NaOH(aq) -419.2, NaCl(aq) -393.1, H2O(l) -237.1 kJ/mol give
  422.0 kJ per mol H2.
- Reproducible builds, SOURCE_DATE_EPOCH specification: the same inputs give the same bytes.
"""

from __future__ import annotations

import csv
import io
import json
import zipfile
from pathlib import Path

import pytest
from helpers import DEMO, FACTOR_HEADER, PORTFOLIO, assert_one_line_error, assessment_with, run_cli, write

from carbonledger import api

GREY = DEMO / "grey_smr_ammonia.toml"
GREEN = DEMO / "green_electrolysis_ammonia.toml"
HOURLY = DEMO / "hybrid_hourly_hydrogen.toml"
CHLOR = DEMO / "chlor_alkali_by_product_hydrogen.toml"
PYROLYSIS = DEMO / "turquoise_pyrolysis_hydrogen.toml"
BIOMETHANE = DEMO / "biomethane_reforming_hydrogen.toml"
GAS_DISTRIBUTIONS = DEMO / "uncertainty" / "gas_routes.toml"
GRID_FACTOR = 'distribution = "normal"\nmean = 281.0\nsd = 28.0\n'


def renamed(tmp_path: Path, source: Path, name: str) -> Path:
    """A copy of a demo project with another [project] name (its relative files copied beside it)."""
    lines = source.read_text(encoding="utf-8").splitlines()
    at = next(n for n, line in enumerate(lines) if line.startswith("name = "))
    lines[at] = f"name = {json.dumps(name)}"  # a JSON string is a TOML basic string
    return write(tmp_path / source.name, "\n".join(lines) + "\n")


# --- CSV outputs: formula escaping and the caution row ---------------------------------------------


@pytest.mark.parametrize("command", ["uncertainty", "headroom", "sensitivity"])
def test_analysis_csvs_escape_formulas_and_end_with_the_caution(tmp_path, command):
    project = renamed(tmp_path, GREY, "=HYPERLINK(1)")
    args = {
        "uncertainty": ["uncertainty", project, "--distributions", GAS_DISTRIBUTIONS, "--draws", "50"],
        "headroom": ["headroom", project, "--parameter", "natural_gas.methane_emission_share", "--scheme", "eu-low-carbon"],
        "sensitivity": ["sensitivity", project, "--distributions", GAS_DISTRIBUTIONS, "--base-sample", "8"],
    }[command]
    result = run_cli(*args, "--format", "csv", "--no-ledger")
    assert result.exit_code == 0, result.output
    rows = list(csv.reader(io.StringIO(result.stdout)))
    assert rows[-1][0] == "caution" and "not a certification" in rows[-1][1]
    cells = [cell for row in rows for cell in row]
    # OWASP CSV injection: no text cell starts with '=' (numbers like -0.5 stay numbers)
    assert not [cell for cell in cells if cell.startswith(("=", "+", "@"))], cells[:20]
    if command == "uncertainty":
        assert "'=HYPERLINK(1)" in cells


# --- plan ------------------------------------------------------------------------------------------


def test_plan_exits_nonzero_when_no_load_can_qualify(tmp_path):
    # heat from a natural-gas boiler with 1 % methane loss: above 45V's 0.45 kg tier whatever the electricity
    output = tmp_path / "plan.csv"
    result = run_cli(
        "plan", HOURLY, "--scheme", "us-45v", "--tier", "0.45", "-o", output,
        "--set", "electrolysis.heat_source=natural_gas", "--set", "electrolysis.heat_kwh_per_kg_h2=30",
        "--set", "natural_gas.methane_emission_share=0.01", "--set", "natural_gas.methane_emission_basis=methane_delivered",
    )
    assert_one_line_error(result)
    assert "runs no interval" in result.stderr and not output.exists()


@pytest.mark.parametrize(
    "option, field",
    [(["--rated-kw", "inf"], "--rated-kw"), (["--rated-kw", "1e308"], "--rated-kw"), (["--part-load", "0.2:nan,1:54"], "--part-load"), (["--part-load", "nan:50,1:54"], "--part-load"), (["--hydrogen-price", "nan"], "--hydrogen-price")],
)
def test_plan_refuses_infinite_power_and_nan_curves_and_prices(tmp_path, option, field):
    result = run_cli("plan", HOURLY, "--scheme", "eu-rfnbo", "-o", tmp_path / "plan.csv", *option)
    assert_one_line_error(result)
    assert f"error: {field}" in result.stderr and not (tmp_path / "plan.csv").exists()


# --- distribution files ----------------------------------------------------------------------------


@pytest.mark.parametrize(
    "value, expected",
    [("nan", "finite"), ("inf", "finite"), ("-inf", "finite"), ("true", "truth value"), ('"0.005"', "text"), ("1e300", "magnitude")],
)
def test_distribution_numbers_refuse_nan_inf_truth_values_quoted_and_absurd_numbers(tmp_path, value, expected):
    text = f'[parameters."natural_gas.methane_emission_share"]\ndistribution = "normal"\nmean = {value}\nsd = 0.001\n'
    result = run_cli("uncertainty", GREY, "--distributions", write(tmp_path / "d.toml", text), "--draws", "20", "--no-ledger")
    assert_one_line_error(result)
    assert "natural_gas.methane_emission_share.mean" in result.stderr and expected in result.stderr


def test_a_correlation_rank_given_as_a_truth_value_is_refused(tmp_path):
    text = f'[factors."electricity.grid.eu27_2018"]\n{GRID_FACTOR}[[correlations]]\ninputs = ["electricity.grid.eu27_2018", "natural_gas.upstream_co2"]\nrank = true\n'
    result = run_cli("uncertainty", GREY, "--distributions", write(tmp_path / "d.toml", text), "--draws", "20", "--no-ledger")
    assert_one_line_error(result)
    assert "rank" in result.stderr and "truth value" in result.stderr


@pytest.mark.parametrize("nesting", ["x = " + "[" * 3000 + "]" * 3000, "x = " + "[" * 40 + "]" * 40], ids=["arrays-3000", "arrays-40"])
def test_deeply_nested_distribution_files_are_refused_as_project_files_are(tmp_path, nesting):
    result = run_cli("uncertainty", GREY, "--distributions", write(tmp_path / "deep.toml", nesting + "\n"), "--draws", "20", "--no-ledger")
    assert_one_line_error(result)
    assert "nested at most 16 levels" in result.stderr


def test_a_run_with_no_usable_draw_exits_nonzero(tmp_path):
    # a methane loss share drawn around 0.005 with sd 10: nearly every draw is below 0 or above 1
    text = '[parameters."natural_gas.methane_emission_share"]\ndistribution = "uniform"\nlow = 2.0\nhigh = 3.0\n'
    result = run_cli("uncertainty", GREY, "--distributions", write(tmp_path / "d.toml", text), "--draws", "100", "--format", "json", "--no-ledger")
    assert_one_line_error(result)
    assert "all 100 draws break" in result.stderr and result.stdout == ""


@pytest.mark.parametrize(
    "option, expected",
    [(["--seed", "-1"], "--seed"), (["--seed", str(2**40)], "--seed"), (["--draws", "1000000000"], "--draws"), (["--draws", "1"], "--draws"), (["--draws", "4"], "rank correlations")],
)
def test_seed_and_draw_counts_no_run_can_use_are_refused_in_one_line(tmp_path, option, expected):
    text = (
        f'[factors."electricity.grid.eu27_2018"]\n{GRID_FACTOR}'
        '[parameters."natural_gas.methane_emission_share"]\ndistribution = "uniform"\nlow = 0.001\nhigh = 0.02\n'
        '[[correlations]]\ninputs = ["electricity.grid.eu27_2018", "natural_gas.methane_emission_share"]\nrank = 0.5\n'
    )
    result = run_cli("uncertainty", GREY, "--distributions", write(tmp_path / "d.toml", text), *option, "--no-ledger")
    assert_one_line_error(result)
    assert expected in result.stderr


def test_sensitivity_refuses_a_negative_seed_and_an_absurd_sample():
    for option in (["--seed", "-5"], ["--base-sample", str(2**30)]):
        result = run_cli("sensitivity", GREY, "--distributions", GAS_DISTRIBUTIONS, *option, "--no-ledger")
        assert_one_line_error(result)
        assert option[0] in result.stderr


# --- energy balances (physical floors) --------------------------------------------------------------

HYDROGEN_LHV_MJ_PER_KG = 119.96  # US DOE Hydrogen Analysis Resource Center (the shipped factor)
CARBON_LHV_MJ_PER_KG = 393.5 / 12.011  # NIST-JANAF: CO2(g) formation enthalpy -393.5 kJ/mol; graphite 12.011 g/mol
CHLOR_ALKALI_FLOOR_KWH_PER_KG = 2 * 96485.33212 * (1.358 + 0.828) / 2.01588 / 3600  # CRC potentials (from memory), SI Faraday
CHLOR_ALKALI_GIBBS_KWH_PER_KG = 422.0e3 / 2.01588 / 3600  # NBS Gibbs energies of formation (from memory)


def test_the_chlor_alkali_floor_agrees_with_gibbs_energies_of_formation():
    # two independent routes to the reversible energy of the cell agree within 0.5 %
    assert CHLOR_ALKALI_FLOOR_KWH_PER_KG == pytest.approx(CHLOR_ALKALI_GIBBS_KWH_PER_KG, rel=5e-3)


@pytest.mark.parametrize(
    "project, below, above, field",
    [
        # 0.110 GJ of biomethane (above the 0.0994 GJ methane floor) with no electricity: below 119.96 MJ
        (BIOMETHANE, ["biomethane_reforming.biomethane_gj_per_kg_h2=0.110", "biomethane_reforming.electricity_kwh_per_kg_h2=0"], ["biomethane_reforming.biomethane_gj_per_kg_h2=0.121", "biomethane_reforming.electricity_kwh_per_kg_h2=0"], "biomethane_reforming.biomethane_gj_per_kg_h2"),
        # 2.9 kg C/kg H2: products hold 119.96 + 2.9 x 32.76 = 215.0 MJ; 0.205 GJ of gas and no electricity is short
        (PYROLYSIS, ["pyrolysis.natural_gas_gj_per_kg_h2=0.205", "pyrolysis.electricity_kwh_per_kg_h2=0", "pyrolysis.carbon_kg_per_kg_h2=2.9"], ["pyrolysis.natural_gas_gj_per_kg_h2=0.205", "pyrolysis.electricity_kwh_per_kg_h2=3", "pyrolysis.carbon_kg_per_kg_h2=2.9"], "pyrolysis.natural_gas_gj_per_kg_h2"),
        (CHLOR, [f"chlor_alkali.cell_electricity_kwh_per_kg_h2={CHLOR_ALKALI_FLOOR_KWH_PER_KG * 0.99:.3f}"], [f"chlor_alkali.cell_electricity_kwh_per_kg_h2={CHLOR_ALKALI_FLOOR_KWH_PER_KG * 1.01:.3f}"], "chlor_alkali.cell_electricity_kwh_per_kg_h2"),
    ],
    ids=["biomethane", "pyrolysis", "chlor-alkali"],
)
def test_impossible_plants_are_refused_on_the_newer_routes(project, below, above, field):
    # pyrolysis check by hand: 0.205 GJ = 205 MJ < 215.0 MJ; with 3 kWh (10.8 MJ) 215.8 MJ >= 215.0 MJ
    assert 205 < HYDROGEN_LHV_MJ_PER_KG + 2.9 * CARBON_LHV_MJ_PER_KG < 205 + 3 * 3.6
    refused = run_cli("score", project, *[f"--set={item}" for item in below], "--no-ledger")
    assert_one_line_error(refused)
    assert field in refused.stderr
    accepted = run_cli("score", project, *[f"--set={item}" for item in above], "--no-ledger")
    assert accepted.exit_code == 0, accepted.output


def test_monte_carlo_draws_below_the_chlor_alkali_floor_are_left_out(tmp_path):
    text = '[parameters."chlor_alkali.cell_electricity_kwh_per_kg_h2"]\ndistribution = "uniform"\nlow = 40.0\nhigh = 100.0\n'
    result = api.uncertainty(CHLOR, distributions=write(tmp_path / "d.toml", text), draws=4000, seed=7)
    broken = {item.field: item.draws for item in result.limit_breaks}
    expected = (CHLOR_ALKALI_FLOOR_KWH_PER_KG - 40.0) / 60.0  # share of a uniform draw below the floor
    assert broken["chlor_alkali.cell_electricity_kwh_per_kg_h2"] / 4000 == pytest.approx(expected, abs=0.03)


def test_monte_carlo_draws_break_the_biomethane_energy_balance(tmp_path):
    text = '[parameters."biomethane_reforming.biomethane_gj_per_kg_h2"]\ndistribution = "uniform"\nlow = 0.100\nhigh = 0.140\n'
    project = BIOMETHANE
    result = api.uncertainty(project, distributions=write(tmp_path / "d.toml", text), draws=2000, seed=3)
    assert any("energy balance" in item.expected for item in result.limit_breaks), result.limit_breaks


# --- names shown as typed (markup) -----------------------------------------------------------------

MARKUP_NAME = "Plant [bold]one[/bold] :smile: [/] $x^2$ a $ b"


def test_markup_in_names_is_shown_as_typed_in_the_analysis_tables(tmp_path):
    project = renamed(tmp_path, GREY, MARKUP_NAME)
    for args in (
        ["uncertainty", project, "--distributions", GAS_DISTRIBUTIONS, "--draws", "50"],
        ["sensitivity", project, "--distributions", GAS_DISTRIBUTIONS, "--base-sample", "8"],
    ):
        result = run_cli(*args, "--no-ledger")
        assert result.exit_code == 0, result.output
        assert MARKUP_NAME in result.stdout


@pytest.mark.parametrize("kind", ["score", "uncertainty", "sensitivity", "compare"])
def test_dollar_signs_in_names_draw_on_every_chart_as_typed(tmp_path, kind):
    project = renamed(tmp_path, GREY, MARKUP_NAME)
    chart = tmp_path / f"{kind}.svg"
    args = {
        "score": ["score", project],
        "uncertainty": ["uncertainty", project, "--distributions", GAS_DISTRIBUTIONS, "--draws", "50"],
        "sensitivity": ["sensitivity", project, "--distributions", GAS_DISTRIBUTIONS, "--base-sample", "8"],
        "compare": ["compare", project, GREEN],
    }[kind]
    result = run_cli(*args, "--chart", chart, "--no-ledger")
    assert result.exit_code == 0, result.output
    assert chart.stat().st_size > 1000
    if kind == "score":  # the score chart keeps its text as text
        assert "$x^2$ a $ b" in chart.read_text(encoding="utf-8")


# --- quoted parameter paths ------------------------------------------------------------------------


def test_quoted_parameter_paths_from_params_work_in_headroom_and_distribution_files(tmp_path):
    text = GREEN.read_text(encoding="utf-8").replace("[electricity.sources.wind]", '[electricity.sources."wind PPA no. 2"]')
    project = write(tmp_path / "quoted.toml", text)
    path = 'electricity.sources."wind PPA no. 2".share'
    assert path in run_cli("params", project).stdout
    result = run_cli("headroom", project, "--parameter", path, "--scheme", "eu-rfnbo", "--format", "json", "--no-ledger")
    assert result.exit_code == 0, result.output
    distributions = write(tmp_path / "d.toml", '[parameters."electricity.sources.\\"wind PPA no. 2\\".share"]\ndistribution = "uniform"\nlow = 0.4\nhigh = 0.5\n')
    result = run_cli("uncertainty", project, "--distributions", distributions, "--draws", "50", "--no-ledger")
    assert result.exit_code == 0, result.output


# --- size caps ---------------------------------------------------------------------------------------


def _many_sources(tmp_path: Path, count: int) -> Path:
    base = (DEMO / "grid_electrolysis_hydrogen.toml").read_text(encoding="utf-8")
    head, _, _ = base.partition("[electricity.sources.grid]")
    sources = "".join(f'[electricity.sources.s{n}]\nshare = {1 / count!r}\nfactor = "electricity.grid.eu27_2018"\nprocurement = "grid"\n\n' for n in range(count))
    return write(tmp_path / f"many{count}.toml", head + sources)


def test_thousands_of_electricity_sources_are_refused_before_any_work(tmp_path):
    result = run_cli("uncertainty", _many_sources(tmp_path, 2000), "--distributions", write(tmp_path / "d.toml", f'[factors."electricity.grid.eu27_2018"]\n{GRID_FACTOR}'), "--no-ledger")
    assert_one_line_error(result)
    assert "electricity.sources" in result.stderr and "100" in result.stderr


def test_draw_blocks_shrink_so_a_large_system_stays_within_memory(tmp_path):
    from carbonledger.analyses.uncertainty import MEMORY_PER_BLOCK_BYTES, draws_per_block, make_plan
    from carbonledger.model.distributions import Uncertainty
    from carbonledger.model.factors import load_factor_set
    from carbonledger.routes.project import load_project

    project, _ = load_project(_many_sources(tmp_path, 100))
    plan = make_plan(project, assessment_with(factors=load_factor_set("default-2026")), Uncertainty.model_validate({"factors": {"electricity.grid.eu27_2018": {"distribution": "normal", "mean": 281.0, "sd": 28.0}}}))
    block = draws_per_block(plan)
    activities = 100 + 1  # one per source and the plant, at least
    assert 1 <= block and block * 8 * activities**2 <= MEMORY_PER_BLOCK_BYTES


@pytest.mark.parametrize("field", ["electricity.time_series", "lifetime.grid_trajectory_csv"])
def test_a_device_given_as_a_series_or_a_trajectory_is_refused_unread(field):
    project = HOURLY if field == "electricity.time_series" else PORTFOLIO / "vennor_hybrid_hydrogen.toml"
    args = ["score", project, "--set", f'{field}="/dev/zero"', "--no-ledger"] + (["--lifetime"] if field.startswith("lifetime") else [])
    result = run_cli(*args)
    assert_one_line_error(result)
    assert "/dev/zero" in result.stderr and "regular file" in result.stderr


# --- physical ranges of factors, meters and series ----------------------------------------------------


@pytest.mark.parametrize(
    "row",
    [
        "gwp.ar6.ch4_fossil,1e308,kg CO2e/kg CH4,test,,2024,,,false",  # IPCC AR6: 29.8; the largest GWP100 about 25,000
        "combustion.natural_gas.co2,1e308,kg CO2/TJ,test,,2024,,,false",  # IPCC 2006: 56,100 kg CO2/TJ
        "heating_value.hydrogen.lhv,1e308,MJ/kg,test,,2024,,,false",  # 119.96 MJ/kg
        "electricity.grid.eu27_2018,1e300,g CO2e/kWh,test,,2024,,,false",
    ],
)
def test_absurd_finite_factor_values_are_refused(tmp_path, row):
    overrides = write(tmp_path / "o.csv", FACTOR_HEADER + row + "\n")
    result = run_cli("score", GREY, "--factors", overrides, "--no-ledger")
    assert_one_line_error(result)
    assert row.split(",")[0] in result.stderr


def test_absurd_finite_meter_readings_are_refused(tmp_path):
    meters = (DEMO / "blue_atr_ammonia_meters_2026.csv").read_text(encoding="utf-8").splitlines()
    at = next(n for n, line in enumerate(meters) if line.startswith("2026-03"))
    cells = meters[at].split(",")
    cells[3] = "1e308"  # natural_gas [GJ] of one month
    meters[at] = ",".join(cells)
    result = run_cli("workbook", DEMO / "blue_atr_ammonia.toml", "--periods", write(tmp_path / "m.csv", "\n".join(meters) + "\n"), "-o", tmp_path / "w.xlsx", "--no-ledger")
    assert_one_line_error(result)
    assert "natural_gas [GJ]" in result.stderr and not (tmp_path / "w.xlsx").exists()


def test_absurd_finite_series_values_are_refused(tmp_path):
    lines = (DEMO / "hybrid_hourly_hydrogen_2026.csv").read_text(encoding="utf-8").splitlines()
    header = next(n for n, line in enumerate(lines) if line.startswith("timestamp"))
    cells = lines[header + 1].split(",")
    cells[4] = "1e308"  # grid intensity, g CO2e/kWh
    lines[header + 1] = ",".join(cells)
    write(tmp_path / "hybrid_hourly_hydrogen_2026.csv", "\n".join(lines) + "\n")
    project = write(tmp_path / "p.toml", HOURLY.read_text(encoding="utf-8"))
    result = run_cli("score", project, "--no-ledger")
    assert_one_line_error(result)
    assert "grid_intensity" in result.stderr


# --- check everything first, then write --------------------------------------------------------------


def test_a_refused_second_output_leaves_the_first_unwritten(tmp_path):
    # the draws CSV's path is a folder: refused before the workbook is written
    output = tmp_path / "w.xlsx"
    (tmp_path / "w.draws.csv").mkdir()
    result = run_cli("workbook", GREY, "-o", output, "--draws", "20", "--draws-csv", "--distributions", GAS_DISTRIBUTIONS, "--force", "--no-ledger")
    assert_one_line_error(result)
    assert not output.exists()
    # the report's HTML path is a folder: refused before the PDF is printed
    (tmp_path / "r.html").mkdir()
    result = run_cli("report", GREY, "-o", tmp_path / "r.html", "--pdf", tmp_path / "r.pdf", "--force")
    assert_one_line_error(result)
    assert not (tmp_path / "r.pdf").exists()


# --- byte-identical outputs ---------------------------------------------------------------------------


def _twice(tmp_path: Path, name: str, make) -> tuple[bytes, bytes]:
    first, second = tmp_path / f"a-{name}", tmp_path / f"b-{name}"
    make(first)
    make(second)
    return first.read_bytes(), second.read_bytes()


def test_the_workbook_is_byte_identical_between_runs(tmp_path, monkeypatch):
    monkeypatch.setenv("SOURCE_DATE_EPOCH", "1767225600")  # 2026-01-01 00:00 UTC

    def make(path):
        assert run_cli("workbook", GREY, "-o", path, "--no-ledger").exit_code == 0

    first, second = _twice(tmp_path, "w.xlsx", make)
    assert first == second
    with zipfile.ZipFile(io.BytesIO(first)) as archive:
        assert {entry.date_time for entry in archive.infolist()} == {(1980, 1, 1, 0, 0, 0)}
        assert b"2026-01-01T00:00:00Z" in archive.read("docProps/core.xml")


@pytest.mark.parametrize("kind", ["score.svg", "score.png", "uncertainty.svg", "sensitivity.svg", "compare.svg"])
def test_every_chart_is_byte_identical_between_runs(tmp_path, kind):
    command = kind.split(".")[0]
    args = {
        "score": ["score", GREY],
        "uncertainty": ["uncertainty", GREY, "--distributions", GAS_DISTRIBUTIONS, "--draws", "50"],
        "sensitivity": ["sensitivity", GREY, "--distributions", GAS_DISTRIBUTIONS, "--base-sample", "8"],
        "compare": ["compare", GREY, GREEN],
    }[command]

    def make(path):
        assert run_cli(*args, "--chart", path, "--no-ledger").exit_code == 0

    first, second = _twice(tmp_path, kind, make)
    assert first == second


@pytest.mark.parametrize("output_format", ["table", "json", "csv"])
def test_analysis_outputs_are_identical_between_runs(output_format):
    args = ["uncertainty", GREY, "--distributions", GAS_DISTRIBUTIONS, "--draws", "50", "--format", output_format, "--no-ledger"]
    first, second = run_cli(*args), run_cli(*args)
    assert first.exit_code == 0 and first.stdout == second.stdout


@pytest.mark.parametrize(
    "args",
    [
        ["report", GREEN, "-o", "r.html", "--seed", "-3"],  # no [uncertainty] table: the seed was never read
        ["compare", GREEN, GREY, "--draws", "5000000", "--no-ledger"],
        ["workbook", GREY, "-o", "w.xlsx", "--draws", "1", "--no-ledger"],
        ["uncertainty", DEMO / "uncertainty", "--seed", "-1", "--no-ledger"],  # a folder of projects (the cluster path)
    ],
    ids=["report", "compare", "workbook", "uncertainty-folder"],
)
def test_every_command_with_draws_checks_them_before_any_work(tmp_path, monkeypatch, args):
    monkeypatch.chdir(tmp_path)
    result = run_cli(*args)
    assert_one_line_error(result)
    assert "--seed" in result.stderr or "--draws" in result.stderr
    assert list(tmp_path.iterdir()) == []
