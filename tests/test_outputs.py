"""Every output is honest and safe: caution and from-memory flags in every format of every
command, real CSV, user text shown as typed, strict JSON, CSV cells safe in a spreadsheet,
files written with the user's umask.

Outside references checked against:
- RFC 4180 (CSV): every record has the same number of fields; a field holding a line break is quoted.
- RFC 8259, section 6: NaN and Infinity are not JSON numbers (``json.loads(..., parse_constant=...)`` refuses them).
- OWASP, "CSV Injection": a text cell starting with = + - @ tab or carriage return gets a leading single quote.
- POSIX umask: a file created with mode 0666 under umask 022 gets mode 0644 (``open(2)``).
"""

from __future__ import annotations

import csv
import io
import json
import os
import re
import sqlite3
import stat

import pytest
from helpers import DEMO, FACTOR_HEADER, PORTFOLIO, assert_one_line_error, run_cli, write

from carbonledger import api
from carbonledger.about import CAUTION
from carbonledger.errors import InputError
from carbonledger.io.files import atomic_write
from carbonledger.model.grades import GRADE_WORDS

GREEN = DEMO / "green_electrolysis_ammonia.toml"
GREY = DEMO / "grey_smr_ammonia.toml"
LIFETIME = PORTFOLIO / "vennor_hybrid_hydrogen.toml"

COMMANDS = {
    "score": ["score", GREEN, "--no-ledger"],
    "score --lifetime": ["score", LIFETIME, "--lifetime", "--no-ledger"],
    "compare": ["compare", GREEN, GREY, "--no-ledger"],
    "recalc": ["recalc", GREY, "--to", "demo-2027-grid-revision", "--no-ledger"],
    "factors list": ["factors", "list", "--prefix", "combustion"],
    "factors show": ["factors", "show", "combustion.natural_gas.ch4"],
    "factors diff": ["factors", "diff", "default-2026", "demo-2027-grid-revision"],
    "schemes": ["schemes"],
}


def _strict_json(text: str):
    """Parse as JSON the way a strict parser does (RFC 8259: no NaN, no Infinity)."""

    def refuse(constant):
        raise ValueError(f"not JSON: {constant}")

    return json.loads(text, parse_constant=refuse)


def _csv(text: str) -> list[list[str]]:
    rows = list(csv.reader(io.StringIO(text)))
    assert rows, text
    # RFC 4180 section 2.4: each line contains the same number of fields throughout the file
    assert {len(row) for row in rows} == {len(rows[0])}, text[:500]
    return rows


def _keys(data) -> set[str]:
    if isinstance(data, dict):
        return set(data) | {key for value in data.values() for key in _keys(value)}
    if isinstance(data, list):
        return {key for value in data for key in _keys(value)}
    return set()


def _words(text: str) -> str:
    return " ".join(text.split())


@pytest.fixture(scope="module")
def outputs():
    """Every command of COMMANDS in every format, run once in-process."""
    found = {}
    for name, args in COMMANDS.items():
        for output_format in ("table", "json", "csv"):
            result = run_cli(*args, "--format", output_format)
            assert result.exit_code == 0, (name, output_format, result.output)
            found[name, output_format] = result.stdout
    return found


@pytest.mark.xdist_group("outputs")  # one worker runs the module fixture once for every case
@pytest.mark.parametrize("name", COMMANDS)
def test_caution_and_from_memory_flags_in_every_format(outputs, name):
    # the default factor set holds rows not yet verified against their document (grade in
    # factors/sets/default-2026/*.csv) and every rulebook values recorded from memory
    # (factors/schemes/*.toml): each output must say so
    table = outputs[name, "table"]
    assert _words(f"Caution: {CAUTION}") in _words(table) or _words(CAUTION) in _words(table), table[-600:]
    assert "from memory" in table or any(words in table for words in GRADE_WORDS.values())
    data = _strict_json(outputs[name, "json"])
    assert data["caution"] == CAUTION
    assert {"from_memory", "grade"} & _keys(data)  # a flag, or the source grade of each factor row
    rows = _csv(outputs[name, "csv"])
    assert rows[-1][:2] == ["caution", CAUTION]
    # a from_memory or grade column, or such rows (section or key) in the long and wide formats
    flags = ("from_memory", "grade", "not_yet_verified")
    assert any(flag in cell for flag in flags for cell in rows[0]) or any(flag in cell for flag in flags for row in rows for cell in row[:2])


@pytest.mark.parametrize("output_format", ["table", "json", "csv"])
def test_history_states_the_caution_and_the_flagged_factors(output_format):
    assert run_cli("score", GREEN).exit_code == 0
    result = run_cli("history", GREEN, "--format", output_format)
    assert result.exit_code == 0, result.output
    flagged = [f.id for f in api.score(GREEN).factors_used if f.from_memory]
    if output_format == "table":
        assert _words(CAUTION) in _words(result.stdout) and all(f in result.stdout for f in flagged)
    elif output_format == "json":
        data = _strict_json(result.stdout)
        assert data["caution"] == CAUTION
        assert [f["id"] for f in data["records"][0]["factors_used"] if f["from_memory"]] == flagged
    else:
        rows = _csv(result.stdout)
        assert rows[-1][:2] == ["caution", CAUTION]
        assert rows[1][rows[0].index("factors_not_yet_verified")] == "; ".join(flagged)


def test_the_flagged_factors_of_a_score_are_named_in_every_format(outputs):
    flagged = [f.id for f in api.score(GREEN).factors_used if f.from_memory]
    assert flagged, "the green demo uses factors recorded from memory (default-2026)"
    data = _strict_json(outputs["score", "json"])
    assert data["from_memory"]["factors"] == flagged
    assert all(f in outputs["score", "table"] for f in flagged)
    factor_rows = {row[1]: row[4:6] for row in _csv(outputs["score", "csv"]) if row[0] == "factor"}
    assert [key for key, (flag, _) in factor_rows.items() if flag == "True"] == flagged
    assert [key for key, (_, grade) in factor_rows.items() if grade == "not yet verified against the source document"] == flagged
    compare_rows = {row[0] + " " + row[1]: row for row in _csv(outputs["compare", "csv"])}
    assert all(f in compare_rows["factor_grade not yet verified against the source document"][3] for f in flagged)


def test_score_tables_name_the_project_file(outputs):
    # the README's demo loop scores every demo project: each table must say which file it is
    assert f"project file: {GREEN}" in outputs["score", "table"]
    assert f"project file: {LIFETIME}" in outputs["score --lifetime", "table"]


@pytest.mark.parametrize(
    "args",
    [
        ["params", GREEN],
        ["history", GREEN],
        ["factors", "sets"],
        *COMMANDS.values(),
    ],
    ids=lambda args: " ".join(str(a) for a in args[:2] if "/" not in str(a)),
)
def test_csv_format_is_csv_for_every_command(args):
    if args[0] == "history":
        assert run_cli("score", GREEN).exit_code == 0
    result = run_cli(*args, "--format", "csv")
    assert result.exit_code == 0, result.output
    rows = _csv(result.stdout)
    assert len(rows[0]) >= 2  # a header, not a text table read as one column


# --- user text shown as typed -----------------------------------------------------------------


def _renamed(tmp_path, name: str, source=GREEN, file_name="named.toml"):
    text = source.read_text(encoding="utf-8")
    text = re.sub(r'(?m)^name = ".*"$', lambda _: "name = " + json.dumps(name), text, count=1)
    return write(tmp_path / file_name, text)


@pytest.mark.parametrize("name", ["Plant [phase1] test", "[bold]Bold plant[/bold]", "Plant [/] :thumbs_up: x"])
def test_user_text_is_shown_as_typed_in_score_and_compare_tables(tmp_path, name, _ledger_in_tmp):
    project = _renamed(tmp_path, name)
    score = run_cli("score", project)
    assert score.exit_code == 0, score.output
    assert name in score.stdout
    compared = run_cli("compare", project, GREY, "--no-ledger")
    assert compared.exit_code == 0, compared.output
    assert name in compared.stdout


def test_help_text_keeps_its_brackets():
    result = run_cli("score", "--help")
    assert result.exit_code == 0
    assert "[lifetime]" in _words(result.stdout)


# --- JSON stays JSON; a failing command records nothing ------------------------------------------


def test_a_non_finite_input_is_one_line_naming_the_project(tmp_path, _ledger_in_tmp):
    project = DEMO / "grid_electrolysis_hydrogen.toml"
    result = run_cli("score", project, "--set", "electrolysis.electricity_kwh_per_kg_h2=inf", "--format", "json")
    assert_one_line_error(result)
    assert "grid_electrolysis_hydrogen" in result.stderr
    assert not _ledger_in_tmp.exists() or _records(_ledger_in_tmp) == 0


def _records(path) -> int:
    with sqlite3.connect(path) as connection:
        tables = [row[0] for row in connection.execute("select name from sqlite_master where type='table'")]
        return sum(connection.execute(f"select count(*) from {table}").fetchone()[0] for table in tables if table in ("runs", "records"))


def test_a_non_finite_result_never_reaches_json_and_records_nothing(monkeypatch, _ledger_in_tmp):
    good = api.score(GREEN)
    broken = good.model_copy(update={"total": float("nan")})
    with pytest.raises(InputError, match="finite"):
        broken.to_json()
    monkeypatch.setattr(api, "score", lambda *args, **kwargs: broken)
    result = run_cli("score", GREEN, "--format", "json")
    assert_one_line_error(result)
    assert result.stdout == ""
    assert not _ledger_in_tmp.exists() or _records(_ledger_in_tmp) == 0
    # the same command with a good result does record (the test above can fail)
    monkeypatch.setattr(api, "score", lambda *args, **kwargs: good)
    assert run_cli("score", GREEN, "--format", "json").exit_code == 0
    assert _records(_ledger_in_tmp) > 0


def test_scoring_refuses_a_non_finite_check_value():
    from carbonledger.core.scoring import finite_result

    good = api.score(GREEN)
    check = good.checks[0].model_copy(update={"value": float("inf")})
    with pytest.raises(InputError, match=f"check {check.scheme}"):
        finite_result(good.model_copy(update={"checks": [check]}))
    assert finite_result(good) is good


# --- CSV injection --------------------------------------------------------------------------------


def test_csv_cells_are_safe_in_a_spreadsheet():
    from carbonledger.io.csv_text import csv_text

    text = csv_text(("a", "b", "c", "d", "e", "f", "g"), [("=1+1", "+x", "-x", "@x", "\tx", "\rx", -12.5), ("plain", "note\rwith return", "", None, True, 3, "-")])
    rows = list(csv.reader(io.StringIO(text)))
    # OWASP CSV injection: text cells starting with = + - @ tab CR get a leading single quote
    assert rows[1] == ["'=1+1", "'+x", "'-x", "'@x", "'\tx", "'\rx", "-12.5"]
    assert rows[2][:2] == ["plain", "note\rwith return"]  # quoted (RFC 4180), so it reads back as one cell
    assert '"note\rwith return"' in text


def test_score_csv_escapes_a_formula_in_the_project_name(tmp_path):
    project = _renamed(tmp_path, '=HYPERLINK("http://example.invalid","x")')
    rows = _csv(run_cli("score", project, "--format", "csv", "--no-ledger").stdout)
    assert ["project", "name", '\'=HYPERLINK("http://example.invalid","x")', "", "", ""] in rows
    negative = [row for row in rows if row[0] == "check:eu-rfnbo" and row[1] == "margin"]
    assert negative and not negative[0][2].startswith("'")  # numbers stay numbers
    compare_rows = _csv(run_cli("compare", project, GREY, "--format", "csv", "--no-ledger").stdout)
    assert compare_rows[1][3].startswith("'=HYPERLINK")


def test_factor_csv_outputs_quote_a_carriage_return_and_escape_formulas(tmp_path):
    override = write(tmp_path / "override.csv", FACTOR_HEADER + 'electricity.grid.eu27_2018,250,g CO2e/kWh,"-my utility\'s disclosure",,2026,,"line one\rline two",false\n')
    listed = run_cli("factors", "list", "--factors", override, "--prefix", "electricity.grid.eu27", "--format", "csv")
    assert listed.exit_code == 0, listed.output
    rows = _csv(listed.stdout)
    row = next(r for r in rows if r[0] == "electricity.grid.eu27_2018")
    assert "line one\rline two" in row and "'-my utility's disclosure" in row
    diff = run_cli("factors", "diff", "default-2026", override, "--format", "csv")
    assert diff.exit_code == 0, diff.output
    assert any("'-my utility's disclosure" in cell for row in _csv(diff.stdout) for cell in row)


# --- file modes ------------------------------------------------------------------------------------


def test_written_files_follow_the_umask(tmp_path):
    old = os.umask(0o022)
    try:
        path = atomic_write(tmp_path / "out.txt", lambda tmp: tmp.write_text("x", encoding="utf-8"))
        started = run_cli("init", tmp_path / "starter.toml", "--route", "electrolysis")
    finally:
        os.umask(old)
    # POSIX: mode 0666 masked by umask 022 is 0644
    assert stat.S_IMODE(path.stat().st_mode) == 0o644
    assert started.exit_code == 0, started.output
    assert stat.S_IMODE((tmp_path / "starter.toml").stat().st_mode) == 0o644
    old = os.umask(0o077)
    try:
        private = atomic_write(tmp_path / "private.txt", lambda tmp: tmp.write_text("x", encoding="utf-8"))
    finally:
        os.umask(old)
    assert stat.S_IMODE(private.stat().st_mode) == 0o600
    # a file replaced with --force keeps its own mode
    path.chmod(0o640)
    atomic_write(path, lambda tmp: tmp.write_text("y", encoding="utf-8"), force=True)
    assert stat.S_IMODE(path.stat().st_mode) == 0o640 and path.read_text(encoding="utf-8") == "y"


# --- workbook text ------------------------------------------------------------------------------------


def _total(result) -> float:
    assert result.exit_code == 0, result.output
    return _strict_json(result.stdout)["total"]


@pytest.mark.parametrize(
    "source_key, name",
    [
        ('"wind PPA no. 2"', "Skelmar Point (invented)"),  # a dot in an electricity source name
        ('"wind\\u0001farm"', "Bell\\u0007plant\\u001f x"),  # control characters (TOML \\u escapes) in names
    ],
)
def test_workbook_round_trip_keeps_names_with_dots_and_control_characters(tmp_path, source_key, name):
    text = GREEN.read_text(encoding="utf-8").replace("[electricity.sources.wind]", f"[electricity.sources.{source_key}]")
    text = re.sub(r'(?m)^name = ".*"$', lambda _: f'name = "{name}"', text, count=1)
    project = write(tmp_path / "named.toml", text)
    expected = _total(run_cli("score", project, "--format", "json", "--no-ledger"))
    book = tmp_path / "named.xlsx"
    written = run_cli("workbook", project, "-o", book, "--no-ledger")
    assert written.exit_code == 0, written.output
    back = run_cli("score", "--from-workbook", book, "--format", "json", "--no-ledger")
    assert _total(back) == pytest.approx(expected, rel=1e-12)
    data = _strict_json(back.stdout)
    source = json.loads(source_key)  # the TOML quoted key is also a JSON string here
    assert data["project"] == json.loads(f'"{name}"')
    assert source in data["parameters"]["electricity"]["sources"]


def test_workbook_refuses_text_longer_than_a_cell_holds(tmp_path, _ledger_in_tmp):
    # Excel specifications and limits: a cell holds at most 32,767 characters
    text = re.sub(r'(?m)^note = ".*"$', lambda _: 'note = "' + "x" * 32768 + '"', GREEN.read_text(encoding="utf-8"), count=1)
    project = write(tmp_path / "long.toml", text)
    book = tmp_path / "long.xlsx"
    result = run_cli("workbook", project, "-o", book)
    assert_one_line_error(result)
    assert "project.note" in result.stderr and "32,767" in result.stderr
    assert not book.exists()
    assert not _ledger_in_tmp.exists() or _records(_ledger_in_tmp) == 0
    exact = write(tmp_path / "exact.toml", text.replace("x" * 32768, "x" * 32767))
    assert run_cli("workbook", exact, "-o", tmp_path / "exact.xlsx", "--no-ledger").exit_code == 0


def test_workbook_states_the_caution_and_the_from_memory_flags(tmp_path):
    import openpyxl

    book = tmp_path / "green.xlsx"
    old = os.umask(0o022)
    try:
        assert run_cli("workbook", GREEN, "-o", book, "--no-ledger").exit_code == 0
    finally:
        os.umask(old)
    assert stat.S_IMODE(book.stat().st_mode) == 0o644  # POSIX: 0666 under umask 022
    workbook = openpyxl.load_workbook(book)
    cover_text = " ".join(str(c.value) for row in workbook["Cover"].iter_rows() for c in row if c.value is not None)
    assert CAUTION in cover_text
    factors = workbook["Factors"]
    header = [c.value for c in factors[4]]
    flag_column = header.index("source grade") + 1
    flagged = {factors.cell(row=r, column=1).value for r in range(5, factors.max_row + 1) if factors.cell(row=r, column=flag_column).value == "not yet verified against the source document"}
    assert flagged == {f.id for f in api.score(GREEN).factors_used if f.from_memory}
    results_text = " ".join(str(c.value) for row in workbook["Results"].iter_rows() for c in row if c.value is not None)
    assert CAUTION in results_text and "from memory" in results_text


def test_a_chart_shows_a_file_name_with_dollar_signs(tmp_path):
    # matplotlib reads text between $ signs as mathematical notation; a file name is not
    project = write(tmp_path / "a$x^{2$b.toml", GREY.read_text(encoding="utf-8"))
    chart = tmp_path / "chart.svg"
    result = run_cli("compare", project, GREEN, "--chart", chart, "--no-ledger")
    assert result.exit_code == 0, result.output
    assert chart.stat().st_size > 0
