"""Factor-set versions: layering, override files, listing and diff."""

import json

import pytest
from helpers import DEMO, FACTOR_HEADER, assert_one_line_error, run_cli, write

from carbonledger.errors import InputError
from carbonledger.model.factors import diff_sets, load_factor_set


def _derived_set(tmp_path):
    """A set over default-2026 that changes two rows, adds one and removes one."""
    folder = tmp_path / "my-set"
    write(folder / "set.toml", 'name = "my-set"\nbase = "default-2026"\ndate = "2027-02-01"\ndescription = "test set"\nremoved = ["electricity.renewable.geothermal"]\n')
    write(
        folder / "factors.csv",
        FACTOR_HEADER
        + "electricity.grid.eu27_2018,300,g CO2e/kWh,test source A,,2018,EU-27,,false\n"
        + "combustion.natural_gas.co2,56100,kg CO2/TJ,test source B (same value: only the source differs),,2006,,,false\n"
        + "electricity.grid.test_region_2026,123,g CO2e/kWh,test source C,,2026,,,false\n",
    )
    return folder


def test_diff_lists_exactly_the_changed_added_and_removed_rows(tmp_path):
    old = load_factor_set("default-2026")
    new = load_factor_set(_derived_set(tmp_path))
    changes = {(c.id, c.kind) for c in diff_sets(old, new)}
    assert changes == {
        ("electricity.grid.eu27_2018", "changed"),
        ("combustion.natural_gas.co2", "changed"),
        ("electricity.grid.test_region_2026", "added"),
        ("electricity.renewable.geothermal", "removed"),
    }
    value = {c.id: c for c in diff_sets(old, new)}["electricity.grid.eu27_2018"]
    # 281 g CO2e/kWh: EEA indicator IND-353, EU-27 2018 (the published value in default-2026).
    assert (value.old.value, value.new.value) == (281.0, 300.0)
    assert value.new.source == "test source A"


def test_diff_of_a_set_with_itself_is_empty():
    assert diff_sets(load_factor_set("default-2026"), load_factor_set("default-2026")) == []


def test_demo_set_changes_only_grid_rows():
    changes = diff_sets(load_factor_set("default-2026"), load_factor_set("demo-2027-grid-revision"))
    assert {c.id for c in changes if c.kind == "changed"} == {"electricity.grid.eu27_2018", "electricity.grid.ireland_2015"}
    assert all(c.id.startswith("electricity.grid.") for c in changes)
    assert not [c for c in changes if c.kind == "removed"]
    # every row of the invented demo set says so
    assert all("INVENTED" in c.new.source for c in changes)


def test_override_csv_over_a_named_set(tmp_path):
    override = write(tmp_path / "grid.csv", FACTOR_HEADER + "electricity.grid.eu27_2018,250,g CO2e/kWh,my utility's disclosure 2026,,2026,,,false\n")
    layered = load_factor_set(str(override))
    assert layered.factors["electricity.grid.eu27_2018"].value == 250.0
    assert layered.sha256 != load_factor_set("default-2026").sha256
    assert [c.id for c in diff_sets(load_factor_set("default-2026"), layered)] == ["electricity.grid.eu27_2018"]


def test_override_row_without_source_is_refused(tmp_path):
    override = write(tmp_path / "bad.csv", FACTOR_HEADER + "electricity.grid.eu27_2018,250,g CO2e/kWh,,,2026,,,false\n")
    with pytest.raises(InputError, match="source"):
        load_factor_set(str(override))
    result = run_cli("score", DEMO / "grid_electrolysis_hydrogen.toml", "--factors", override, "--no-ledger")
    assert_one_line_error(result)
    assert "source" in result.stderr
    result = run_cli("factors", "diff", "default-2026", override)
    assert_one_line_error(result)


def test_factors_sets_json_lists_objects_with_names():
    result = run_cli("factors", "sets", "--format", "json")
    assert result.exit_code == 0, result.output
    sets = json.loads(result.stdout)
    assert isinstance(sets, list) and all("name" in item for item in sets)
    by_name = {item["name"]: item for item in sets}
    assert {"default-2026", "demo-2027-grid-revision"} <= set(by_name)
    assert by_name["demo-2027-grid-revision"]["sha256"] == load_factor_set("demo-2027-grid-revision").sha256
    for key in ("date", "description"):
        assert by_name["default-2026"][key]
    table = run_cli("factors", "sets")
    assert table.exit_code == 0 and "demo-2027-grid-revision" in table.stdout


def test_factors_diff_command(tmp_path):
    folder = _derived_set(tmp_path)
    result = run_cli("factors", "diff", "default-2026", folder, "--format", "json")
    assert result.exit_code == 0, result.output
    rows = json.loads(result.stdout)["changes"]
    assert len(rows) == 4
    grid = next(r for r in rows if r["id"] == "electricity.grid.eu27_2018")
    assert (grid["kind"], grid["old_value"], grid["new_value"]) == ("changed", 281.0, 300.0)
    assert "European Environment Agency" in grid["old_source"] and grid["new_source"].startswith("test source A")
    table = run_cli("factors", "diff", "default-2026", "demo-2027-grid-revision")
    assert table.exit_code == 0 and "2 changed, 10 added, 0 removed" in table.stdout
    assert_one_line_error(run_cli("factors", "diff", "default-2026", "no-such-set"))


def _standalone_set(folder, files: dict[str, str]):
    write(folder / "set.toml", 'name = "split"\ndate = "2027-03-01"\ndescription = "test set in several files"\n')
    for name, rows in files.items():
        write(folder / name, FACTOR_HEADER + rows)
    return folder


ROW_A = "electricity.grid.test_a_2026,100,g CO2e/kWh,test source A,,2026,,,false\n"
ROW_B = "electricity.grid.test_b_2026,200,g CO2/kWh,test source B,,2026,,,false\n"


def test_a_set_reads_every_csv_and_its_hash_ignores_the_file_layout(tmp_path):
    one_file = load_factor_set(_standalone_set(tmp_path / "one", {"factors.csv": ROW_A + ROW_B}))
    two_files = load_factor_set(_standalone_set(tmp_path / "two", {"factors.csv": ROW_A, "grid-electricity.csv": ROW_B}))
    assert set(two_files.factors) == {"electricity.grid.test_a_2026", "electricity.grid.test_b_2026"}
    assert two_files.factors["electricity.grid.test_b_2026"].origin.endswith("grid-electricity.csv")
    assert one_file.sha256 == two_files.sha256


def test_an_id_in_two_files_of_one_set_is_refused(tmp_path):
    folder = _standalone_set(tmp_path / "dup", {"a.csv": ROW_A, "b.csv": ROW_A})
    with pytest.raises(InputError) as caught:
        load_factor_set(folder)
    assert "electricity.grid.test_a_2026" in str(caught.value) and "a.csv" in str(caught.value)
    result = run_cli("factors", "list", "--factors", folder)
    assert_one_line_error(result)
