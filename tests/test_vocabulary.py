"""One vocabulary, tables that fit the terminal (issue 19): every human label goes through
io/labels.py, statuses read qualifies, fails, not eligible, undetermined (changes: now fails,
now qualifies, still ...), and every table fits 80 columns."""

from __future__ import annotations

import re

import pytest
from helpers import DEMO, PORTFOLIO, assessment_with, run_cli

from carbonledger.analyses.portfolio import STATUSES
from carbonledger.io.labels import gas_name, per_name, status_name, unit_name

BLUE = DEMO / "blue_atr_ammonia.toml"
COMMANDS = {
    "score": ("score", BLUE),
    "score hourly": ("score", DEMO / "hybrid_hourly_hydrogen.toml"),
    "lifetime": ("score", PORTFOLIO / "vennor_hybrid_hydrogen.toml", "--lifetime"),
    "compare": ("compare", DEMO / "grey_smr_ammonia_shipped.toml", DEMO / "blue_atr_ammonia_shipped.toml", DEMO / "green_electrolysis_ammonia_shipped.toml", "--boundary", "well-to-tank", "--basis", "mj"),
    "recalc": ("recalc", PORTFOLIO, "--to", "demo-2027-grid-revision", "--year", "2028"),
    "uncertainty": ("uncertainty", BLUE, "--distributions", DEMO / "uncertainty" / "blue_atr_ammonia.toml", "--draws", "300"),
    "headroom": ("headroom", BLUE, "--scheme", "us-45v", "--parameter", "capture.capture_rate"),
    "params": ("params", BLUE),
    "factors list": ("factors", "list", "--prefix", "electricity.grid.germany"),
    "factors sets": ("factors", "sets"),
    "factors diff": ("factors", "diff", "default-2026", "demo-2027-grid-revision"),
}
TABLE_LINE = re.compile(r"[│┃┏┡└─━]")  # a line drawn as part of a table


@pytest.fixture(scope="module")
def outputs_at_80():
    with pytest.MonkeyPatch.context() as patch:
        patch.setenv("COLUMNS", "80")
        return {name: run_cli(*args, *(["--no-ledger"] if args[0] in ("score", "compare", "recalc", "uncertainty", "headroom") else [])) for name, args in COMMANDS.items()}


@pytest.mark.parametrize("name", list(COMMANDS))
def test_tables_fit_80_columns(outputs_at_80, name):
    result = outputs_at_80[name]
    assert result.exit_code == 0, result.output[-2000:]
    lines = result.stdout.splitlines()
    table_lines = [line for line in lines if TABLE_LINE.search(line) or re.match(r"\S+( {3,}\S+){2,}", line)]
    assert table_lines, name
    assert max(len(line) for line in table_lines) <= 80, max(table_lines, key=len)


def test_labels_are_words_not_identifiers(outputs_at_80):
    text = "\n".join(outputs_at_80[name].stdout for name in ("score", "compare", "uncertainty", "lifetime"))
    for identifier in ("t nh3", "kg h2", "co2e precharacterised", "co2 fossil", "functional_unit", "g_co2e_per_mj", "renewable_at_zero", "NOT ELIGIBLE", "UNDETERMINED", "FAILS", "None"):
        assert identifier not in text, identifier
    assert "t NH3" in text and "kg H2" in text and "CO2, fossil" in text


def test_the_rulebook_listing_is_in_words():
    text = run_cli("schemes").stdout
    assert "g_co2e_per_mj" not in text and "renewable_at_zero" not in text and "GWP100 AR4" in text


def test_one_status_vocabulary():
    # the four statuses of a check, and how a check moved between two factor sets
    assert [status_name(s) for s in ("qualifies", "fails", "not_eligible", "undetermined")] == ["qualifies", "fails", "not eligible", "undetermined"]
    assert {"now fails", "now qualifies"} <= set(STATUSES) and not [s for s in STATUSES if "newly" in s or "pass" in s]
    assert per_name("kg_co2e_per_t_nh3") == "t NH3" and per_name("g_co2e_per_mj") == "MJ (LHV)"
    assert unit_name("kg_co2e_per_kg_h2") == "kg CO2e/kg H2" and gas_name("ch4_fossil") == "Methane (CH4), fossil"


def test_the_deciding_reason_is_printed_with_the_status(outputs_at_80):
    text = outputs_at_80["score"].stdout
    assert re.search(r"eu-rfnbo: not eligible, because not met:", text)
    assert "Assessment year" in text


def test_help_shows_words_not_python_types():
    commands = [["score"], ["compare"], ["report"], ["recalc"], ["workbook"], ["uncertainty"], ["headroom"], ["sensitivity"], ["plan"], ["init"], ["history"], ["params"], ["factors", "list"], ["factors", "diff"]]
    for command in commands:
        text = run_cli(*command, "--help").stdout
        assert "Usage:" in text, command
        assert not re.search(r"<(list\[|str|int|float|path|Path|bool)", text), (command, re.findall(r"<[^>]*>", text))
    text = run_cli("score", "--help").stdout
    assert "--scheme ID" in text and "--gwp ar4|ar5|ar6" in text and "--set PATH=VALUE" in text and "project FILE" in text


def test_a_unit_typed_without_its_space_names_the_accepted_spelling(tmp_path):
    from helpers import FACTOR_HEADER, assert_one_line_error, write

    rows = write(tmp_path / "rows.csv", FACTOR_HEADER + "electricity.grid.eu27_2018,300,gCO2/kWh,Invented row for a test,T,2018,EU-27,Basis: CO2,true\n")
    result = run_cli("score", BLUE, "--factors", rows, "--no-ledger")
    assert_one_line_error(result)
    assert "write it 'g CO2/kWh'" in result.stderr


def test_option_errors_are_one_line_in_the_tools_style():
    from helpers import assert_one_line_error

    for args, words in ((("score", "--gwpx", "ar5"), "--gwpx"), (("scor",), "'scor'"), (("score", BLUE, "--format", "xml"), "--format"), (("pack", BLUE), "--output")):
        result = run_cli(*args)
        assert_one_line_error(result)
        assert words in result.stderr and "--help" in result.stderr


def test_one_chart_style_across_the_charts(tmp_path):
    """The report's SVG and every matplotlib chart read one palette (io/palette.py): no chart
    falls back to matplotlib's default cycle, and the score chart labels its tier lines and shows a
    legend of the status colours."""
    import matplotlib

    matplotlib.use("Agg")
    from carbonledger import api
    from carbonledger.io.palette import STAGE_COLOURS, STATUS_COLOURS
    from carbonledger.io.score_chart import score_figure

    default_cycle = {"#1f77b4", "#ff7f0e", "#4c72b0", "#dd8452", "#3b7d4f"}
    figure = score_figure(api.score(BLUE))
    colours = {matplotlib.colors.to_hex(patch.get_facecolor()) for ax in figure.axes for patch in ax.patches}
    assert colours & {c.lower() for c in STAGE_COLOURS} and colours & {c.lower() for c in STATUS_COLOURS.values()}
    assert not colours & default_cycle
    legend_texts = [t.get_text() for legend in figure.legends for t in legend.get_texts()]
    assert "qualifies" in legend_texts and "not eligible" in legend_texts
    assert any(t.get_text() == "4" for ax in figure.axes for t in ax.texts)  # the 45V tier line at 4 kg CO2e/kg H2 is labelled


def test_compare_chart_names_each_limit_once_in_its_legend():
    """Two schemes with the same limit (eu-rfnbo and eu-low-carbon, 28.2 g CO2e/MJ, Directive (EU)
    2018/2001 Art. 29a(1) as amended and Directive (EU) 2024/1788) draw one line, named once in the
    legend, and no limit label is written over the bars."""
    import matplotlib

    matplotlib.use("Agg")
    from carbonledger import api
    from carbonledger.io.compare_output import comparison_figure

    shipped = [DEMO / f"{name}.toml" for name in ("grey_smr_ammonia_shipped", "blue_atr_ammonia_shipped")]
    figure = comparison_figure(api.compare(shipped, basis="mj", assessment=assessment_with(boundary="well-to-tank")))
    axes = figure.axes[0]
    limits = [line for line in axes.get_lines() if line.get_label().startswith("limit ")]
    assert len(limits) == len({round(line.get_ydata()[0], 9) for line in limits}) >= 1
    legend = " ".join(t.get_text() for t in axes.get_legend().get_texts())
    assert "eu-rfnbo" in legend and "eu-low-carbon" in legend and legend.count("limit 28.2") == 1
    assert not [t for t in axes.texts if "eu-" in t.get_text()]
