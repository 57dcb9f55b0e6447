"""Source grades of factor rows (model/grades.py; factors/CHECKS.md section 16).

A row's grade says where its value was read: primary text, verbatim secondary, secondary, not yet
verified, invented. These tests check that the grade reaches every output, that the counts printed
by `factors grades` are the counts of the CSV files (read here with the csv module, not through the
package), and that files written before grades (a `from_memory` column) still read.
"""

from __future__ import annotations

import csv
import io
import json
from collections import Counter

import openpyxl
import pytest
from helpers import DEMO, assert_one_line_error, run_cli, write

from carbonledger import api
from carbonledger.errors import InputError
from carbonledger.io.workbook.reader import factor_set_from_workbook
from carbonledger.model.factors import factors_root, load_factor_set, read_factor_rows
from carbonledger.model.grades import Grade

GREY = DEMO / "grey_smr_ammonia.toml"
# Graded "not yet verified" in factors/sets/default-2026/factors.csv: a common-practice share of
# methane in pipeline gas, not read in any text (factors/CHECKS.md section 16). The grey ammonia demo reads it.
UNVERIFIED = "natural_gas.methane_mass_fraction"
WORDS = "not yet verified against the source document"
ALL_GRADES = ("primary text", "verbatim secondary", "secondary", "not yet verified", "invented")


def _csv(text: str) -> list[list[str]]:
    return list(csv.reader(io.StringIO(text)))


def test_the_demo_reads_the_unverified_row():
    row = load_factor_set().get(UNVERIFIED)
    assert row.grade is Grade.NOT_YET_VERIFIED and row.from_memory
    assert UNVERIFIED in {f.id for f in api.score(GREY).factors_used}


@pytest.mark.parametrize("command", [("score", GREY, "--no-ledger"), ("compare", GREY, DEMO / "green_electrolysis_ammonia.toml", "--no-ledger")], ids=["score", "compare"])
def test_an_unverified_row_is_shown_so_in_every_format_of_score_and_compare(command):
    table = run_cli(*command).stdout
    assert WORDS in " ".join(table.split()) and UNVERIFIED in table
    data = json.loads(run_cli(*command, "--format", "json").stdout)
    assert UNVERIFIED in data["from_memory"]["factors"]  # the flag kept for compatibility: true exactly for "not yet verified"
    if command[0] == "score":
        assert UNVERIFIED in data["factor_grades"]["not yet verified"]
        assert {f["id"]: f["grade"] for f in data["factors_used"]}[UNVERIFIED] == "not yet verified"
        rows = _csv(run_cli(*command, "--format", "csv").stdout)
        header = rows[0]
        factor = next(r for r in rows if r[0] == "factor" and r[1] == UNVERIFIED)
        assert factor[header.index("grade")] == WORDS and factor[header.index("from_memory")] == "True"
    else:
        assert UNVERIFIED in data["projects"][0]["factor_grades"]["not yet verified"]
        rows = _csv(run_cli(*command, "--format", "csv").stdout)
        graded = next(r for r in rows if r[0] == "factor_grade" and r[1] == WORDS)
        assert UNVERIFIED in graded[3]


def test_an_unverified_row_is_shown_so_by_factors_list_and_show():
    listing = run_cli("factors", "list", "--prefix", "natural_gas.")
    line = next(text for text in listing.stdout.splitlines() if text.startswith(UNVERIFIED))
    assert "not yet verified" in line
    listed = json.loads(run_cli("factors", "list", "--prefix", "natural_gas.", "--format", "json").stdout)
    assert {f["id"]: (f["grade"], f["from_memory"]) for f in listed["factors"]}[UNVERIFIED] == ("not yet verified", True)
    assert UNVERIFIED in listed["factor_grades"]["not yet verified"]
    rows = _csv(run_cli("factors", "list", "--prefix", "natural_gas.", "--format", "csv").stdout)
    assert rows[0][-1] == "grade" and next(r for r in rows if r[0] == UNVERIFIED)[-1] == "not yet verified"
    shown = run_cli("factors", "show", UNVERIFIED)
    assert WORDS in shown.stdout and "from memory" not in shown.stdout
    assert json.loads(run_cli("factors", "show", UNVERIFIED, "--format", "json").stdout)["grade"] == "not yet verified"
    shown_csv = _csv(run_cli("factors", "show", UNVERIFIED, "--format", "csv").stdout)
    assert shown_csv[1][shown_csv[0].index("grade")] == "not yet verified"


def test_an_unverified_row_is_shown_so_in_the_report_and_the_workbook(tmp_path):
    report = tmp_path / "grey.html"
    assert run_cli("report", GREY, "-o", report).exit_code == 0
    html = report.read_text(encoding="utf-8")
    row = next(part for part in html.split("<tr>") if f"<code>{UNVERIFIED}</code>" in part)
    assert WORDS in row
    book = tmp_path / "grey.xlsx"
    assert run_cli("workbook", GREY, "-o", book, "--no-ledger").exit_code == 0
    sheet = openpyxl.load_workbook(book)["Factors"]
    header = [cell.value for cell in sheet[4]]
    grades = {sheet.cell(row=r, column=1).value: sheet.cell(row=r, column=header.index("source grade") + 1).value for r in range(5, sheet.max_row + 1)}
    assert grades[UNVERIFIED] == WORDS


def test_an_unverified_row_is_named_by_history(tmp_path, monkeypatch):
    monkeypatch.setenv("CARBONLEDGER_LEDGER", str(tmp_path / "ledger.sqlite"))
    assert run_cli("score", GREY).exit_code == 0
    assert UNVERIFIED in run_cli("history", GREY).stdout
    records = json.loads(run_cli("history", GREY, "--format", "json").stdout)["records"]
    stored = {f["id"]: f for f in records[0]["factors_used"]}[UNVERIFIED]
    assert stored["grade"] == "not yet verified" and stored["from_memory"] is True
    rows = _csv(run_cli("history", GREY, "--format", "csv").stdout)
    assert UNVERIFIED in rows[1][rows[0].index("factors_not_yet_verified")]


def _kind(factor_id: str) -> str:
    # the namespace a reader of DEVELOPERS.md "How to add a factor" sees: electricity.<kind>, else the first segment
    parts = factor_id.split(".")
    return f"electricity.{parts[1]}" if parts[0] == "electricity" else parts[0]


def test_factors_grades_counts_are_the_counts_of_the_csv_files():
    counted: Counter = Counter()
    for path in sorted((factors_root() / "sets" / "default-2026").glob("*.csv")):
        with path.open(encoding="utf-8") as handle:
            for row in csv.DictReader(line for line in handle if not line.startswith("#")):
                counted[_kind(row["id"]), row["grade"]] += 1
    result = run_cli("factors", "grades", "--format", "json")
    assert result.exit_code == 0, result.output
    printed = json.loads(result.stdout)
    assert {(kind, grade): n for kind, by_grade in printed["grades"].items() for grade, n in by_grade.items() if n} == dict(counted)
    assert sum(printed["all"].values()) == sum(counted.values()) == len(load_factor_set().factors)
    assert set(printed["all"]) == set(ALL_GRADES)
    table = run_cli("factors", "grades").stdout
    total = next(line.split() for line in table.splitlines() if line.startswith("all "))
    assert [int(n) for n in total[1:]] == [printed["all"][grade] for grade in ALL_GRADES] + [sum(counted.values())]


def test_every_row_of_the_demo_set_is_invented():
    # factors/sets/demo-2027-grid-revision: every value there is invented for the demo (its own header says so)
    path = factors_root() / "sets" / "demo-2027-grid-revision" / "factors.csv"
    assert {row.grade for row in read_factor_rows(path)} == {Grade.INVENTED}


@pytest.mark.parametrize(
    ("columns", "cells", "grade"),
    [
        ("from_memory", "true", Grade.NOT_YET_VERIFIED),
        ("from_memory", "false", Grade.PRIMARY_TEXT),
        ("grade", "Verbatim Secondary", Grade.VERBATIM_SECONDARY),
        ("grade", WORDS, Grade.NOT_YET_VERIFIED),
        ("grade,from_memory", "secondary,false", Grade.SECONDARY),
        ("grade,from_memory", "not yet verified,true", Grade.NOT_YET_VERIFIED),
        ("note", "", Grade.NOT_YET_VERIFIED),  # neither column: not yet verified, never "checked" by default
    ],
)
def test_a_csv_written_before_grades_still_reads(tmp_path, columns, cells, grade):
    path = write(tmp_path / "rows.csv", f"id,value,unit,source,{columns}\nelectricity.grid.test_invented,100,g CO2e/kWh,Invented test value,{cells}\n")
    assert read_factor_rows(path)[0].grade is grade


@pytest.mark.parametrize(("columns", "cells", "field"), [("grade", "from memory", "grade"), ("grade,from_memory", "primary text,true", "from_memory"), ("from_memory", "maybe", "from_memory")])
def test_a_bad_grade_is_one_line_naming_the_file_and_field(tmp_path, columns, cells, field):
    path = write(tmp_path / "rows.csv", f"id,value,unit,source,{columns}\nelectricity.grid.test_invented,100,g CO2e/kWh,Invented test value,{cells}\n")
    with pytest.raises(InputError) as error:
        read_factor_rows(path)
    assert error.value.field == field and str(path) in error.value.source
    assert_one_line_error(run_cli("factors", "list", "--factors", path))


def _workbook_with_an_edit(tmp_path, grade_cell=None, legacy=False):
    book = tmp_path / "grid.xlsx"
    assert run_cli("workbook", DEMO / "grid_electrolysis_hydrogen.toml", "-o", book, "--no-ledger", "--force").exit_code == 0
    workbook = openpyxl.load_workbook(book)
    sheet = workbook["Factors"]
    header = [cell.value for cell in sheet[4]]
    column = header.index("source grade") + 1
    row = next(r for r in range(5, sheet.max_row + 1) if sheet.cell(row=r, column=1).value == "electricity.grid.eu27_2018")
    sheet.cell(row=row, column=2).value = 200.0
    if legacy:  # as a workbook written before grades: a "from memory" column of yes/no
        sheet.cell(row=4, column=column).value = "from memory"
        for r in range(5, sheet.max_row + 1):
            sheet.cell(row=r, column=column).value = "no"
    if grade_cell is not None:
        sheet.cell(row=row, column=column).value = grade_cell
    workbook.save(book)
    return factor_set_from_workbook(book, load_factor_set()).get("electricity.grid.eu27_2018")


def test_a_value_edited_in_the_workbook_is_not_yet_verified_unless_regraded(tmp_path):
    # the set's grade (primary text: the EEA assessment text) belongs to the set's value, not to the edit
    assert load_factor_set().get("electricity.grid.eu27_2018").grade is Grade.PRIMARY_TEXT
    edited = _workbook_with_an_edit(tmp_path)
    assert edited.value == 200.0 and edited.grade is Grade.NOT_YET_VERIFIED
    assert _workbook_with_an_edit(tmp_path, "secondary").grade is Grade.SECONDARY
    assert _workbook_with_an_edit(tmp_path, "verbatim secondary", legacy=False).grade is Grade.VERBATIM_SECONDARY


def test_a_workbook_written_before_grades_still_reads(tmp_path):
    assert _workbook_with_an_edit(tmp_path, "yes", legacy=True).grade is Grade.NOT_YET_VERIFIED
