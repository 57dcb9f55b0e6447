"""Bad input from every channel: one line ``error: ...`` and exit 2, never a traceback, never a
silent wrong result. Each test feeds a whole class of bad values (every numeric parameter,
every factor kind), not one example.

The physical ranges checked here are facts of the trade, not this project's choices: a global
warming potential of CO2, CH4 or N2O is positive (IPCC AR6 WG1 Table 7.15: 1, 29.8, 273); an
emission factor of electricity or of fuel combustion is a mass of gas emitted, so >= 0 (2006
IPCC Guidelines Vol. 2 Ch. 2, Table 2.2); a methane mass fraction of natural gas is a fraction
(0..1); a heating value is positive (a fuel releases heat when burnt).
"""

from __future__ import annotations

import functools
import tempfile
from pathlib import Path

import pytest
from helpers import DEMO, FACTOR_HEADER, PORTFOLIO, assert_one_line_error, run_cli, write

from carbonledger.errors import InputError
from carbonledger.model.project import parameter_table
from carbonledger.routes.project import load_project

GRID = DEMO / "grid_electrolysis_hydrogen.toml"
BLUE = DEMO / "blue_smr_hydrogen.toml"
DEMOS = sorted(DEMO.glob("*.toml")) + sorted(PORTFOLIO.glob("*.toml"))


def _numeric_parameters():
    """(project, parameter path) of every number in every demo project."""
    cases = []
    for path in DEMOS:
        model, _ = load_project(path)
        for name, value, _, _ in parameter_table(model):
            if isinstance(value, (int, float)) and not isinstance(value, bool):
                cases.append((path, name))
    return cases


NUMERIC = _numeric_parameters()


def test_the_class_is_large_enough():
    # every route and leg of the demo projects: reforming, capture, electrolysis, ammonia, shipping, cracking, lifetime
    assert len({name.split(".")[0] for _, name in NUMERIC}) >= 8, NUMERIC


@pytest.mark.parametrize("bad", ["inf", "-inf", "nan", "true", "false", '"0.5"'])
def test_every_number_refuses_infinity_nan_truth_values_and_text_through_set(bad):
    for path, name in NUMERIC:  # the loader the command line uses, for speed
        with pytest.raises(InputError) as refused:
            load_project(path, [f"{name}={bad}"])
        assert refused.value.field == name, (name, bad, str(refused.value))
    path, name = NUMERIC[0]
    result = run_cli("score", path, "--set", f"{name}={bad}", "--no-ledger")
    assert_one_line_error(result)
    assert name in result.stderr


@pytest.mark.parametrize("bad", ["inf", "nan", "true"])
def test_a_toml_file_with_inf_nan_or_true_for_a_number_is_refused(tmp_path, bad):
    text = BLUE.read_text(encoding="utf-8").replace("capture_rate = 0.9", f"capture_rate = {bad}")
    assert f"capture_rate = {bad}" in text
    result = run_cli("score", write(tmp_path / "p.toml", text), "--no-ledger")
    assert_one_line_error(result)
    assert "capture.capture_rate" in result.stderr


def test_operating_years_is_bounded_instead_of_exhausting_memory(tmp_path):
    project = PORTFOLIO / "vennor_hybrid_hydrogen.toml"
    for years in ("1000000000000", "201"):
        result = run_cli("score", project, "--lifetime", "--set", f"lifetime.operating_years={years}", "--no-ledger")
        assert_one_line_error(result)
        assert "lifetime.operating_years" in result.stderr and "<= 200" in result.stderr


@pytest.mark.parametrize("nesting", ["x = " + "[" * 5000 + "]" * 5000, "x = " + "[" * 60 + "]" * 60, "x." * 3000 + "y = 1", "x = " + "{a = " * 400 + "1" + "}" * 400], ids=["arrays-5000", "arrays-60", "dotted-keys-3000", "inline-tables-400"])
def test_deeply_nested_toml_is_one_line(tmp_path, nesting):
    path = write(tmp_path / "deep.toml", GRID.read_text(encoding="utf-8") + "\n" + nesting + "\n")
    assert_one_line_error(run_cli("score", path, "--no-ledger"))
    assert_one_line_error(run_cli("score", GRID, "--no-ledger", "--set", nesting.replace(" ", "")))


def test_a_project_file_with_a_byte_order_mark_is_read(tmp_path):
    path = tmp_path / "bom.toml"
    path.write_bytes(b"\xef\xbb\xbf" + GRID.read_bytes())
    with_bom = run_cli("score", path, "--no-ledger", "--format", "json")
    plain = run_cli("score", GRID, "--no-ledger", "--format", "json")
    assert with_bom.exit_code == 0, with_bom.output
    assert with_bom.stdout.split('"total"')[1][:40] == plain.stdout.split('"total"')[1][:40]


def test_a_project_file_that_is_not_utf8_is_one_line(tmp_path):
    path = tmp_path / "cp1252.toml"
    path.write_bytes(GRID.read_text(encoding="utf-8").replace("(invented)", "(invent\u00e9)").encode("cp1252"))
    result = run_cli("score", path, "--no-ledger")
    assert_one_line_error(result)
    assert "UTF-8" in result.stderr


# --- factor rows: finite and physically possible, whatever file they come from --------------

BAD_FACTOR_ROWS = [
    ("electricity.grid.eu27_2018", "-300", "g CO2e/kWh"),  # emission factor < 0
    ("electricity.grid.eu27_2018", "inf", "g CO2e/kWh"),
    ("electricity.grid.eu27_2018", "nan", "g CO2e/kWh"),
    ("combustion.natural_gas.co2", "-1", "kg CO2/TJ"),
    ("natural_gas.methane_mass_fraction", "1.7", "kg CH4/kg"),  # a fraction above 1
    ("natural_gas.methane_mass_fraction", "-0.1", "kg CH4/kg"),
    ("heating_value.hydrogen.lhv", "0", "MJ/kg"),  # zero heating value: was ZeroDivisionError
    ("heating_value.ammonia.lhv", "-18.6", "MJ/kg"),
    ("natural_gas.net_calorific_value", "0", "TJ/Gg"),
    ("gwp.ar6.ch4_fossil", "0", "kg CO2e/kg CH4"),
    ("gwp.ar6.n2o", "-273", "kg CO2e/kg N2O"),
    ("marine_fuel.lng.methane_slip.otto_dual_fuel_medium_speed", "1.5", "kg CH4/kg fuel"),
]


@pytest.mark.parametrize("factor_id,value,unit", BAD_FACTOR_ROWS, ids=[f"{i}={v}" for i, v, _ in BAD_FACTOR_ROWS])
def test_an_impossible_factor_in_an_override_csv_is_refused_with_file_id_and_range(tmp_path, factor_id, value, unit):
    override = write(tmp_path / "override.csv", FACTOR_HEADER + f"{factor_id},{value},{unit},my own source,,2026,,,false\n")
    for project in (GRID, DEMO / "grey_smr_ammonia.toml"):
        result = run_cli("score", project, "--factors", override, "--no-ledger")
        assert_one_line_error(result)
        assert "override.csv:2" in result.stderr and factor_id in result.stderr, result.stderr


def test_an_impossible_factor_in_a_factor_set_folder_is_refused(tmp_path):
    folder = tmp_path / "bad-set"
    write(folder / "set.toml", 'name = "bad-set"\nbase = "default-2026"\n')
    write(folder / "factors.csv", FACTOR_HEADER + "heating_value.hydrogen.lhv,0,MJ/kg,my own source,,2026,,,false\n")
    result = run_cli("score", GRID, "--factors", folder, "--no-ledger")
    assert_one_line_error(result)
    assert "heating_value.hydrogen.lhv" in result.stderr and "> 0" in result.stderr


def test_every_shipped_factor_is_inside_its_physical_range():
    from carbonledger.model.factors import available_sets, load_factor_set

    # the shipped sets load through the same check; this fails if a rule refuses a published value
    for name in available_sets():
        assert load_factor_set(name).factors


# --- names that point at the right place, with a suggestion -----------------------------------


def test_a_misspelt_parameter_is_named_with_a_suggestion(tmp_path):
    text = GRID.read_text(encoding="utf-8").replace("electricity_kwh_per_kg_h2", "electricty_kwh_per_kg_h2")
    result = run_cli("score", write(tmp_path / "p.toml", text), "--no-ledger")
    assert_one_line_error(result)
    assert "electrolysis.electricty_kwh_per_kg_h2" in result.stderr
    assert "did you mean 'electricity_kwh_per_kg_h2'" in result.stderr


def test_a_misspelt_section_is_named_with_a_suggestion(tmp_path):
    text = GRID.read_text(encoding="utf-8").replace("[project]", "[projekt]")
    result = run_cli("score", write(tmp_path / "p.toml", text), "--no-ledger")
    assert_one_line_error(result)
    assert "projekt" in result.stderr and "did you mean 'project'" in result.stderr


def test_misspelt_route_and_factor_id_get_suggestions():
    result = run_cli("score", GRID, "--no-ledger", "--set", "hydrogen.route=electrolisys")
    assert_one_line_error(result)
    assert "did you mean 'electrolysis'" in result.stderr
    result = run_cli("score", GRID, "--no-ledger", "--set", "electricity.sources.grid.factor=electricity.grid.eu27_218")
    assert_one_line_error(result)
    assert "electricity.sources.grid.factor" in result.stderr and "did you mean 'electricity.grid.eu27_2018'" in result.stderr


def test_a_factor_of_the_wrong_unit_blames_the_project_field_not_the_factor_csv():
    result = run_cli("score", GRID, "--no-ledger", "--set", "electricity.sources.grid.factor=heating_value.hydrogen.lhv")
    assert_one_line_error(result)
    assert "grid_electrolysis_hydrogen.toml: electricity.sources.grid.factor" in result.stderr
    assert "factors.csv" not in result.stderr


# --- CSV files as spreadsheet programs save them: a byte-order mark, or Windows-1252 ------------

METERS = DEMO / "blue_atr_ammonia_meters_2026.csv"
TRAJECTORY_PROJECT = PORTFOLIO / "vennor_hybrid_hydrogen.toml"


def _saved(tmp_path, name: str, text: str, encoding: str):
    """``text`` saved as 'CSV UTF-8' (with BOM) or as the Windows-1252 'CSV' of spreadsheet programs."""
    path = tmp_path / name
    if encoding == "bom":
        path.write_bytes(b"\xef\xbb\xbf" + text.encode("utf-8"))
    else:
        path.write_bytes(text.encode("cp1252"))
    return path


def _csv_channels(tmp_path, encoding: str):
    """(command line, file) for each CSV channel: factor override, factor set folder, lifetime trajectory, meters."""
    note = "Stra\u00dfe \u00e9tude \u2013 50 \u00b0C"  # characters Windows-1252 encodes differently from UTF-8
    row = f"electricity.grid.eu27_2018,281,g CO2e/kWh,my source ({note}),,2018,,,false\n"
    override = _saved(tmp_path, "override.csv", FACTOR_HEADER + row, encoding)
    folder = tmp_path / "set"
    write(folder / "set.toml", 'name = "set"\nbase = "default-2026"\n')
    in_set = _saved(folder, "factors.csv", FACTOR_HEADER + row, encoding)
    project = tmp_path / "life" / TRAJECTORY_PROJECT.name
    write(project, TRAJECTORY_PROJECT.read_text(encoding="utf-8"))
    trajectory_text = (PORTFOLIO / "vennor_grid_trajectory.csv").read_text(encoding="utf-8").replace("Invented;", f"Invented ({note});")
    trajectory = _saved(project.parent, "vennor_grid_trajectory.csv", trajectory_text, encoding)
    meters = _saved(tmp_path, "meters.csv", METERS.read_text(encoding="utf-8").replace("invented", f"invented ({note})"), encoding)
    return [
        (("score", GRID, "--factors", override, "--no-ledger"), override),
        (("score", GRID, "--factors", folder, "--no-ledger"), in_set),
        (("score", project, "--lifetime", "--no-ledger"), trajectory),
        (("workbook", DEMO / "blue_atr_ammonia.toml", "-o", tmp_path / "m.xlsx", "--periods", meters, "--no-ledger"), meters),
    ]


def test_every_csv_reader_accepts_a_byte_order_mark(tmp_path):
    for args, _ in _csv_channels(tmp_path, "bom"):
        result = run_cli(*args)
        assert result.exit_code == 0, (args, result.output)


def test_every_csv_reader_names_a_file_that_is_not_utf8(tmp_path):
    for args, path in _csv_channels(tmp_path, "cp1252"):
        result = run_cli(*args)
        assert_one_line_error(result)
        assert str(path) in result.stderr and "UTF-8 CSV (save as CSV UTF-8)" in result.stderr, result.stderr


def test_months_out_of_order_are_called_out_of_order(tmp_path):
    lines = METERS.read_text(encoding="utf-8").splitlines(keepends=True)
    header_at = next(i for i, line in enumerate(lines) if line.startswith("month"))
    body = lines[header_at + 1 :]
    swapped = lines[: header_at + 1] + [body[2], body[0], body[1]] + body[3:]
    meters = write(tmp_path / "meters.csv", "".join(swapped))
    result = run_cli("workbook", DEMO / "blue_atr_ammonia.toml", "-o", tmp_path / "m.xlsx", "--periods", meters, "--no-ledger")
    assert_one_line_error(result)
    assert "out of order" in result.stderr and "missing" not in result.stderr and "-" + "2 month" not in result.stderr
    assert not (tmp_path / "m.xlsx").exists()


# --- ids are case-insensitive; an unknown one gets the closest known id --------------------------


def test_ids_are_accepted_whatever_their_case():
    plain = run_cli("score", GRID, "--no-ledger", "--format", "json", "--gwp", "ar6", "--scheme", "eu-rfnbo", "--boundary", "well-to-tank", "--factors", "default-2026")
    shouted = run_cli("score", GRID, "--no-ledger", "--format", "json", "--gwp", "AR6", "--scheme", "EU-RFNBO", "--boundary", "Well-To-Tank", "--factors", "Default-2026")
    assert plain.exit_code == 0 and shouted.exit_code == 0, shouted.output
    assert plain.stdout == shouted.stdout  # the ids are stored as the library spells them
    assert run_cli("compare", GRID, BLUE, "--no-ledger", "--scheme", "EU-RFNBO", "--gwp", "AR5").exit_code == 0
    assert run_cli("recalc", PORTFOLIO, "--to", "Demo-2027-Grid-Revision", "--scheme", "US-45V", "--gwp", "AR6", "--no-ledger").exit_code == 0
    assert run_cli("score", PORTFOLIO / "vennor_hybrid_hydrogen.toml", "--lifetime", "--gwp", "AR6", "--no-ledger").exit_code == 0


@pytest.mark.parametrize(
    "option,bad,suggestion",
    [("--gwp", "ar7", "ar6"), ("--scheme", "eu-rfnb", "eu-rfnbo"), ("--boundary", "well-to-tnk", "well-to-tank"), ("--factors", "default-2062", "default-2026")],
)
def test_an_unknown_id_gets_the_closest_known_one(option, bad, suggestion):
    for args in (("score", GRID), ("compare", GRID, BLUE)):
        result = run_cli(*args, option, bad, "--no-ledger")
        assert_one_line_error(result)
        assert f"did you mean '{suggestion}'" in result.stderr, result.stderr


def test_recalc_to_an_unknown_set_blames_to():
    result = run_cli("recalc", PORTFOLIO, "--to", "default-2072", "--no-ledger")
    assert_one_line_error(result)
    assert result.stderr.startswith("error: --to: default-2072") and "--factors" not in result.stderr
    result = run_cli("recalc", PORTFOLIO, "--from", "default-2062", "--to", "default-2026", "--no-ledger")
    assert_one_line_error(result)
    assert result.stderr.startswith("error: --from: default-2062")


# --- a workbook given where a project file goes; outputs that cannot be written ----------------


def test_a_workbook_given_as_project_points_to_from_workbook(tmp_path):
    book = tmp_path / "audit.xlsx"
    assert run_cli("workbook", GRID, "-o", book, "--no-ledger").exit_code == 0
    renamed = tmp_path / "audit.toml"  # the same bytes under a .toml name: recognised by content
    renamed.write_bytes(book.read_bytes())
    for path in (book, renamed):
        for command in ("score", "params"):
            result = run_cli(command, path, *(["--no-ledger"] if command == "score" else []))
            assert_one_line_error(result)
            assert "--from-workbook" in result.stderr


def test_an_output_that_is_a_folder_is_refused_even_with_force(tmp_path):
    for name in ("out.xlsx", "out.toml", "out.png"):
        (tmp_path / name).mkdir()
    cases = [
        ("workbook", GRID, "-o", tmp_path / "out.xlsx", "--force", "--no-ledger"),
        ("init", tmp_path / "out.toml", "--route", "electrolysis", "--force"),
        ("compare", GRID, BLUE, "--chart", tmp_path / "out.png", "--force", "--no-ledger"),
    ]
    for args in cases:
        result = run_cli(*args)
        assert_one_line_error(result)
        assert "folder" in result.stderr
    assert all((tmp_path / name).is_dir() for name in ("out.xlsx", "out.toml", "out.png"))


def test_an_output_in_a_folder_that_does_not_exist_is_refused(tmp_path):
    missing = tmp_path / "no such folder"
    cases = [
        ("workbook", GRID, "-o", missing / "out.xlsx", "--no-ledger"),
        ("init", missing / "out.toml", "--route", "electrolysis"),
        ("compare", GRID, BLUE, "--chart", missing / "out.png", "--no-ledger"),
    ]
    for args in cases:
        result = run_cli(*args)
        assert_one_line_error(result)
        assert "does not exist" in result.stderr
    assert not missing.exists()


# --- the ledger: only a carbonledger ledger or no file at all -------------------------------------


def _empty_sqlite(path):
    import sqlite3

    connection = sqlite3.connect(path)
    connection.execute("VACUUM")  # a valid SQLite database with no tables, as another program leaves it
    connection.close()


@pytest.mark.parametrize("kind", ["zero bytes", "sqlite without tables", "sqlite with other tables"])
def test_an_existing_file_that_is_not_a_ledger_is_refused_and_left_untouched(tmp_path, kind):
    import sqlite3

    path = tmp_path / "other.db"
    if kind == "zero bytes":
        path.write_bytes(b"")
    elif kind == "sqlite without tables":
        _empty_sqlite(path)
        assert path.read_bytes().startswith(b"SQLite format 3\x00")
    else:
        with sqlite3.connect(path) as connection:
            connection.execute("CREATE TABLE readings (month TEXT, kwh REAL)")
    before = path.read_bytes()
    for args in (("score", GRID), ("workbook", GRID, "-o", tmp_path / "w.xlsx"), ("history", GRID)):
        result = run_cli(*args, "--ledger", path)
        assert_one_line_error(result)
        assert "ledger" in result.stderr and "left untouched" in result.stderr, result.stderr
    assert path.read_bytes() == before
    assert sorted(p.name for p in tmp_path.iterdir()) == ["other.db"]


def test_a_new_ledger_is_created_whole_and_reused(tmp_path):
    import sqlite3

    path = tmp_path / "sub" / "ledger.sqlite"
    assert run_cli("score", GRID, "--ledger", path).exit_code == 0
    assert run_cli("score", GRID, "--ledger", path).exit_code == 0
    with sqlite3.connect(path) as connection:
        assert connection.execute("SELECT count(*) FROM runs").fetchone()[0] == 2
    assert sorted(p.name for p in path.parent.iterdir() if not p.name.startswith("ledger.sqlite")) == []


# --- workbook read-back: what a spreadsheet user can do to the Inputs sheet ----------------------


@functools.cache
def blue_workbook() -> bytes:
    """The blue SMR demo's audit workbook, written once per test process (each test edits its own copy)."""
    with tempfile.TemporaryDirectory() as folder:
        assert run_cli("workbook", BLUE, "-o", Path(folder) / "blue.xlsx", "--no-ledger").exit_code == 0
        return (Path(folder) / "blue.xlsx").read_bytes()


def _book_with(tmp_path, edit, name="edited.xlsx"):
    """A workbook of the blue SMR demo, with ``edit(inputs_sheet, row_of)`` applied and saved."""
    import openpyxl

    original = tmp_path / "original.xlsx"
    if not original.exists():
        original.write_bytes(blue_workbook())
    book = openpyxl.load_workbook(original)
    ws = book["Inputs"]
    row_of = {ws.cell(row=r, column=1).value: r for r in range(5, ws.max_row + 1)}
    edit(ws, row_of)
    path = tmp_path / name
    book.save(path)
    return path


def test_a_truth_value_in_a_number_cell_is_refused(tmp_path):
    def edit(ws, row_of):
        ws.cell(row=row_of["capture.capture_rate"], column=2).value = True

    result = run_cli("score", "--from-workbook", _book_with(tmp_path, edit), "--no-ledger")
    assert_one_line_error(result)
    assert "sheet Inputs, cell B" in result.stderr and "capture.capture_rate" in result.stderr and "number" in result.stderr


@pytest.mark.parametrize("parameter", ["hydrogen.conditioning_kwh_per_kg_h2", "capture.capture_rate", "project.boundary", "natural_gas.upstream_co2_factor"])
def test_an_emptied_input_cell_does_not_silently_take_the_default(tmp_path, parameter):
    def edit(ws, row_of):
        ws.cell(row=row_of[parameter], column=2).value = None

    result = run_cli("score", "--from-workbook", _book_with(tmp_path, edit), "--no-ledger")
    assert_one_line_error(result)
    assert "sheet Inputs, cell B" in result.stderr and parameter in result.stderr, result.stderr


@pytest.mark.parametrize("parameter", ["hydrogen.conditioning_kwh_per_kg_h2", "capture.transport_storage_loss_fraction", "project.boundary"])
def test_a_deleted_inputs_row_does_not_silently_take_the_default(tmp_path, parameter):
    def edit(ws, row_of):
        ws.delete_rows(row_of[parameter])

    result = run_cli("score", "--from-workbook", _book_with(tmp_path, edit), "--no-ledger")
    assert_one_line_error(result)
    assert "sheet Inputs" in result.stderr and parameter in result.stderr and "deleted" in result.stderr, result.stderr


def test_an_optional_text_left_empty_is_fine(tmp_path):
    def edit(ws, row_of):
        ws.cell(row=row_of["project.site"], column=2).value = None

    assert run_cli("score", "--from-workbook", _book_with(tmp_path, edit), "--no-ledger").exit_code == 0


def test_workbook_from_workbook_keeps_the_evidence_column(tmp_path):
    import openpyxl

    texts = {"capture.capture_rate": "capture test report CR-7, 2026 (invented)", "reforming.natural_gas_gj_per_kg_h2": "gas meter M-12 invoices Jan-Dec (invented)"}

    def edit(ws, row_of):
        for name, text in texts.items():
            ws.cell(row=row_of[name], column=5).value = text

    again = tmp_path / "again.xlsx"
    result = run_cli("workbook", "--from-workbook", _book_with(tmp_path, edit), "-o", again, "--no-ledger")
    assert result.exit_code == 0, result.output
    ws = openpyxl.load_workbook(again)["Inputs"]
    found = {ws.cell(row=r, column=1).value: ws.cell(row=r, column=5).value for r in range(5, ws.max_row + 1)}
    assert {name: found[name] for name in texts} == texts
    assert sum(1 for value in found.values() if value) == len(texts)


def test_a_workbook_too_large_to_open_safely_is_refused(tmp_path):
    import zipfile

    original = tmp_path / "original.xlsx"
    original.write_bytes(blue_workbook())
    big = tmp_path / "big.xlsx"  # over 20 MB on disk
    big.write_bytes(original.read_bytes())
    with big.open("r+b") as handle:
        handle.truncate(21 * 1024 * 1024)
    bomb = tmp_path / "bomb.xlsx"  # small on disk, unpacks to over 100 MB
    with zipfile.ZipFile(original) as source, zipfile.ZipFile(bomb, "w", zipfile.ZIP_DEFLATED) as target:
        for member in source.infolist():
            target.writestr(member, source.read(member))
        target.writestr("xl/media/padding.bin", b"\0" * (101 * 1024 * 1024))
    assert bomb.stat().st_size < 2 * 1024 * 1024
    for path, words in ((big, "at most 20 MB"), (bomb, "unpacks to at most 100 MB")):
        for args in (("score", "--from-workbook", path, "--no-ledger"), ("workbook", "--from-workbook", path, "-o", tmp_path / "x.xlsx", "--no-ledger"), ("compare", path, BLUE, "--no-ledger")):
            result = run_cli(*args)
            assert_one_line_error(result)
            assert words in result.stderr, result.stderr


@pytest.mark.parametrize("factor_id,value", [("heating_value.hydrogen.lhv", 0), ("electricity.grid.eu27_2018", -300), ("natural_gas.methane_mass_fraction", 1.7), ("gwp.ar6.ch4_fossil", True)])
def test_an_impossible_factor_edited_in_a_workbook_is_refused(tmp_path, factor_id, value):
    import openpyxl

    original = tmp_path / "original.xlsx"
    original.write_bytes(blue_workbook())
    book = openpyxl.load_workbook(original)
    ws = book["Factors"]
    row = next(r for r in range(5, ws.max_row + 1) if ws.cell(row=r, column=1).value == factor_id)
    ws.cell(row=row, column=2).value = value
    book.save(tmp_path / "edited.xlsx")
    result = run_cli("score", "--from-workbook", tmp_path / "edited.xlsx", "--no-ledger")
    assert_one_line_error(result)
    assert f"sheet Factors, cell B{row}" in result.stderr and factor_id in result.stderr, result.stderr
