"""Your own site (issue 19, point 5): ``--rebalance SOURCE`` after ``--set`` of an electricity share,
and ``--rulebook FILE.toml``, a rulebook of the user's own (an offtake contract's limit) checked
beside the shipped schemes.

Expected values are worked by hand from the project files and the factor rows they name:
- demo_projects/blue_atr_ammonia.toml: electricity 0.5 grid / 0.5 wind;
- demo_projects/grid_electrolysis_hydrogen.toml: 52.0 kWh/kg H2 of electrolysis + 1.5 kWh/kg H2 of
  conditioning, all from the EU-27 2018 grid at 281 g CO2e/kWh (EEA indicator IND-353, the row
  electricity.grid.eu27_2018 of factors/sets/default-2026/factors.csv, read here with the csv module);
  onshore wind 11 g CO2e/kWh (IPCC AR5 WG3 Annex III Table A.III.2 median, row electricity.renewable.wind_onshore);
- demo_projects/rulebooks/offtake_contract.toml: an invented contract limit of 2.0 kg CO2e/kg H2 at the
  hydrogen plant's gate, every source at its life-cycle factor.
"""

from __future__ import annotations

import csv
import json
import zipfile

import numpy as np
import pytest
from helpers import DEMO, ROOT, assert_one_line_error, run_cli, write

from carbonledger import api
from carbonledger.model.rulebooks import user_rulebooks, using_rulebooks
from carbonledger.model.shares import rest_of

BLUE = DEMO / "blue_atr_ammonia.toml"
GRID_H2 = DEMO / "grid_electrolysis_hydrogen.toml"
OFFTAKE = DEMO / "rulebooks" / "offtake_contract.toml"
KWH_PER_KG_H2 = 52.0 + 1.5  # electrolysis + conditioning, as written in grid_electrolysis_hydrogen.toml
CONTRACT_LIMIT = 2.0  # kg CO2e/kg H2, as written in offtake_contract.toml


def factor_kg_per_kwh(factor_id: str) -> float:
    """A factor row of the default set, read with the csv module (g CO2e/kWh -> kg CO2e/kWh)."""
    with open(ROOT / "factors" / "sets" / "default-2026" / "factors.csv", encoding="utf-8") as handle:
        row = next(row for row in csv.DictReader(handle) if row["id"] == factor_id)
    assert row["unit"] == "g CO2e/kWh"
    return float(row["value"]) / 1000


def score_json(*args) -> dict:
    result = run_cli("score", *args, "--no-ledger", "--format", "json")
    assert result.exit_code == 0, result.output
    return json.loads(result.stdout)


# --rebalance


def test_the_rest_of_the_shares_worked_by_hand():
    # the named source takes the whole difference: 1 - 0.7 = 0.3
    assert rest_of({"wind": 0.7, "grid": 0.5}, "grid") == pytest.approx(0.3, abs=1e-15)
    # arrays of draws (uncertainty, qualify levers) element by element: 1 - 0.1, 1 - 0.9
    drawn = rest_of({"wind": np.array([0.1, 0.9]), "grid": 0.5}, "grid")
    assert np.allclose(drawn, [0.9, 0.1], atol=1e-15)


def test_rebalance_gives_the_named_source_the_rest_and_scores_as_the_file_written_so(tmp_path):
    rebalanced = score_json(BLUE, "--set", "electricity.sources.wind.share=0.7", "--rebalance", "grid")
    text = BLUE.read_text(encoding="utf-8")
    grid_block = text.index("[electricity.sources.grid]")
    wind_block = text.index("[electricity.sources.wind]")
    assert text.count("share = 0.5") == 2
    written = text[:grid_block] + text[grid_block:wind_block].replace("share = 0.5", "share = 0.3") + text[wind_block:].replace("share = 0.5", "share = 0.7", 1)
    direct = score_json(write(tmp_path / BLUE.name, written))
    assert rebalanced["parameters"]["electricity"]["sources"]["grid"]["share"] == pytest.approx(0.3, abs=1e-12)
    assert rebalanced["parameters"]["electricity"]["sources"]["wind"]["share"] == 0.7
    assert rebalanced["rebalanced_shares"] == {"grid": pytest.approx(0.3, abs=1e-12)}
    assert rebalanced["total"] == pytest.approx(direct["total"], rel=1e-12)
    assert [(c["scheme"], c["status"]) for c in rebalanced["checks"]] == [(c["scheme"], c["status"]) for c in direct["checks"]]
    for before, after in zip(rebalanced["checks"], direct["checks"], strict=True):
        assert before["value"] == pytest.approx(after["value"], rel=1e-12)
    assert "rebalanced_shares" in direct and direct["rebalanced_shares"] == {}


def test_the_table_and_csv_say_which_source_took_up_the_difference():
    table = run_cli("score", BLUE, "--set", "electricity.sources.wind.share=0.7", "--rebalance", "grid", "--no-ledger")
    assert table.exit_code == 0, table.output
    assert "electricity share rebalanced: grid 0.3," in table.stdout and "--rebalance grid" in table.stdout
    rows = list(csv.reader(run_cli("score", BLUE, "--set", "electricity.sources.wind.share=0.7", "--rebalance", "grid", "--no-ledger", "--format", "csv").stdout.splitlines()))
    row = next(row for row in rows if row[0] == "rebalanced_share")
    assert row[1] == "electricity.sources.grid.share" and float(row[2]) == pytest.approx(0.3, abs=1e-12)


def test_params_and_the_workbook_take_rebalance_too(tmp_path):
    shown = run_cli("params", BLUE, "--set", "electricity.sources.grid.share=0.9", "--rebalance", "wind", "--format", "json")
    assert shown.exit_code == 0, shown.output
    values = {row["path"]: row["value"] for row in json.loads(shown.stdout)}
    assert values["electricity.sources.wind.share"] == pytest.approx(0.1, abs=1e-12)  # 1 - 0.9
    book = run_cli("workbook", BLUE, "-o", tmp_path / "b.xlsx", "--set", "electricity.sources.grid.share=0.9", "--rebalance", "wind", "--no-ledger")
    assert book.exit_code == 0, book.output


def test_a_new_source_with_the_rest_from_the_grid():
    # 0.95 onshore wind added, the grid takes 1 - 0.95 = 0.05 of the 53.5 kWh/kg H2
    data = score_json(GRID_H2, "--set", 'electricity.sources.wind={share=0.95, factor="electricity.renewable.wind_onshore", procurement="ppa"}', "--rebalance", "grid")
    expected = KWH_PER_KG_H2 * (0.05 * factor_kg_per_kwh("electricity.grid.eu27_2018") + 0.95 * factor_kg_per_kwh("electricity.renewable.wind_onshore"))
    assert data["hydrogen_production_kg_co2e_per_kg_h2"] == pytest.approx(expected, rel=1e-9)  # 1.31075


def test_a_rebalanced_share_below_zero_is_refused_in_one_line():
    result = run_cli("score", BLUE, "--set", "electricity.sources.wind.share=1.3", "--rebalance", "grid", "--no-ledger")
    assert_one_line_error(result)
    assert "electricity.sources.grid.share" in result.stderr and "from 0 to 1" in result.stderr and "-0.3" in result.stderr


def test_an_unknown_source_to_rebalance_is_refused_with_the_closest_name():
    result = run_cli("score", BLUE, "--set", "electricity.sources.wind.share=0.7", "--rebalance", "gird", "--no-ledger")
    assert_one_line_error(result)
    assert "--rebalance gird" in result.stderr and "did you mean 'grid'" in result.stderr


def test_without_rebalance_the_shares_must_still_sum_to_one():
    result = run_cli("score", BLUE, "--set", "electricity.sources.wind.share=0.7", "--no-ledger")
    assert_one_line_error(result)
    assert "summing to 1, got 1.2" in result.stderr


# --rulebook


def test_the_offtake_rulebook_is_checked_beside_the_schemes_and_marked_as_the_users():
    data = score_json(GRID_H2, "--rulebook", OFFTAKE)
    expected = KWH_PER_KG_H2 * factor_kg_per_kwh("electricity.grid.eu27_2018")  # 53.5 x 0.281 = 15.0335
    check = next(c for c in data["checks"] if c["scheme"] == "offtake-contract")
    assert check["value"] == pytest.approx(expected, rel=1e-9)
    assert check["limit"] == CONTRACT_LIMIT and check["unit"] == "kg CO2e/kg H2"
    assert expected > CONTRACT_LIMIT and check["status"] == "fails" and check["passes"] is False
    assert check["user_rulebook"] is True and check["rulebook_file"] == str(OFFTAKE)
    assert "user rulebook" in check["name"] and check["grade"] == "invented"
    assert {c["scheme"] for c in data["checks"]} >= {"us-45v", "japan-hydrogen", "offtake-contract"}
    assert not any(c["user_rulebook"] for c in data["checks"] if c["scheme"] != "offtake-contract")


def test_a_project_under_the_contract_limit_qualifies():
    # 0.95 onshore wind, 0.05 grid: 53.5 x (0.05 x 0.281 + 0.95 x 0.011) = 1.31075 <= 2.0
    data = score_json(GRID_H2, "--rulebook", OFFTAKE, "--set", 'electricity.sources.wind={share=0.95, factor="electricity.renewable.wind_onshore", procurement="ppa"}', "--rebalance", "grid")
    check = next(c for c in data["checks"] if c["scheme"] == "offtake-contract")
    expected = KWH_PER_KG_H2 * (0.05 * factor_kg_per_kwh("electricity.grid.eu27_2018") + 0.95 * factor_kg_per_kwh("electricity.renewable.wind_onshore"))
    assert check["value"] == pytest.approx(expected, rel=1e-9) and expected < CONTRACT_LIMIT
    assert check["status"] == "qualifies" and check["margin"] == pytest.approx(CONTRACT_LIMIT - expected, rel=1e-9)


def test_the_table_and_csv_mark_the_user_rulebook():
    table = run_cli("score", GRID_H2, "--rulebook", OFFTAKE, "--no-ledger")
    assert table.exit_code == 0, table.output
    assert f"offtake-contract: user rulebook, read from {OFFTAKE}" in table.stdout
    rows = list(csv.reader(run_cli("score", GRID_H2, "--rulebook", OFFTAKE, "--no-ledger", "--format", "csv").stdout.splitlines()))
    marks = {row[1]: row[2] for row in rows if row[0] == "check:offtake-contract" and row[1] in ("user_rulebook", "rulebook_file")}
    assert marks == {"user_rulebook": "True", "rulebook_file": str(OFFTAKE)}
    assert not [row for row in rows if row[0] == "check:us-45v" and row[1] == "user_rulebook"]


def test_a_user_rulebook_is_added_to_the_schemes_asked_for():
    data = score_json(GRID_H2, "--scheme", "us-45v", "--rulebook", OFFTAKE)
    assert [c["scheme"] for c in data["checks"]] == ["us-45v", "offtake-contract"]
    compared = run_cli("compare", GRID_H2, DEMO / "blue_smr_hydrogen.toml", "--scheme", "us-45v", "--rulebook", OFFTAKE, "--no-ledger", "--format", "csv")
    assert compared.exit_code == 0, compared.output
    rows = list(csv.reader(compared.stdout.splitlines()))
    assert [row[3:] for row in rows if row[:2] == ["check:offtake-contract", "user_rulebook"]] == [[str(OFFTAKE), str(OFFTAKE)]]


def test_the_workbook_and_report_mark_the_user_rulebook(tmp_path):
    import openpyxl

    book = tmp_path / "b.xlsx"
    assert run_cli("workbook", GRID_H2, "-o", book, "--rulebook", OFFTAKE, "--no-ledger").exit_code == 0
    cells = [cell.value for sheet in openpyxl.load_workbook(book) for row in sheet.iter_rows() for cell in row if isinstance(cell.value, str)]
    assert any("Offtake contract" in cell and "(user rulebook)" in cell for cell in cells)
    report = tmp_path / "r.html"
    assert run_cli("report", GRID_H2, "-o", report, "--rulebook", OFFTAKE, "--no-ledger").exit_code == 0
    assert "Offtake contract, invented buyer (user rulebook)" in report.read_text(encoding="utf-8")


def test_a_command_leaves_no_user_rulebook_in_use_after_it_ends(tmp_path):
    assert run_cli("score", GRID_H2, "--rulebook", OFFTAKE, "--no-ledger").exit_code == 0
    assert user_rulebooks() == {}
    failed = run_cli("score", tmp_path / "none.toml", "--rulebook", OFFTAKE, "--no-ledger")
    assert failed.exit_code == 2 and user_rulebooks() == {}


def test_the_library_takes_user_rulebooks_in_a_block():
    with using_rulebooks(api.user_rulebooks([OFFTAKE])):
        inside = api.score(GRID_H2)
    outside = api.score(GRID_H2)
    assert "offtake-contract" in [c.scheme for c in inside.checks]
    assert "offtake-contract" not in [c.scheme for c in outside.checks]


def test_pack_holds_the_user_rulebook_and_verify_uses_it(tmp_path):
    out = tmp_path / "p.zip"
    packed = run_cli("pack", GRID_H2, "-o", out, "--rulebook", OFFTAKE, "--no-ledger")
    assert packed.exit_code == 0, packed.output
    with zipfile.ZipFile(out) as archive:
        assert archive.read("rulebooks/offtake_contract.toml") == OFFTAKE.read_bytes()
        manifest = json.loads(archive.read("manifest.json"))
        result = json.loads(archive.read("result.json"))
    assert manifest["options"]["rulebooks"] == ["rulebooks/offtake_contract.toml"]
    assert next(c for c in result["checks"] if c["scheme"] == "offtake-contract")["status"] == "fails"
    verified = run_cli("verify", out)
    assert verified.exit_code == 0, verified.output
    assert "Reproduced: all" in verified.stdout


def bad_rulebook(tmp_path, name: str, change) -> str:
    return str(write(tmp_path / name, change(OFFTAKE.read_text(encoding="utf-8"))))


@pytest.mark.parametrize(
    ("name", "change", "field", "words"),
    [
        ("unknown_key.toml", lambda t: t.replace("limit = 2.0\n", 'limit = 2.0\ncurrency = "EUR"\n'), "thresholds.0.currency", "no such key"),
        ("misspelt_key.toml", lambda t: t.replace("limit = 2.0\n", "limt = 2.0\n"), "thresholds.0.limt", "did you mean 'limit'"),
        ("no_unit.toml", lambda t: t.replace('unit = "kg CO2e/kg H2"\n', ""), "unit", "'kg CO2e/kg H2'"),
        ("per_kwh.toml", lambda t: t.replace('unit = "kg CO2e/kg H2"', 'unit = "kg CO2e/kWh"'), "unit", "got 'kg CO2e/kWh'"),
        ("per_mj_in_kg.toml", lambda t: t.replace('quantity = "kg_co2e_per_kg_h2"', 'quantity = "g_co2e_per_mj"'), "unit", "quantity 'g_co2e_per_mj'"),
        ("shipped_id.toml", lambda t: t.replace('id = "offtake-contract"', 'id = "US-45V"'), "id", "shipped rulebook"),
        ("not_toml.toml", lambda t: "limit: 2.0 kg\n", "--rulebook", "valid TOML"),
    ],
)
def test_a_bad_rulebook_is_one_line_naming_the_file_and_field(tmp_path, name, change, field, words):
    path = bad_rulebook(tmp_path, name, change)
    result = run_cli("score", GRID_H2, "--rulebook", path, "--no-ledger")
    assert_one_line_error(result)
    assert result.stderr.startswith(f"error: {path}: {field}: ") and words in result.stderr


def test_a_missing_rulebook_file_is_one_line(tmp_path):
    result = run_cli("headroom", GRID_H2, "--scheme", "offtake-contract", "--parameter", "electrolysis.electricity_kwh_per_kg_h2", "--rulebook", tmp_path / "none.toml", "--no-ledger")
    assert_one_line_error(result)
    assert f"{tmp_path / 'none.toml'}: --rulebook: " in result.stderr


def test_the_shipped_rulebooks_state_their_unit_as_their_quantity_takes_it():
    from carbonledger.model.rulebooks import QUANTITY_UNITS, load_schemes

    for scheme in load_schemes().values():  # the same check a user rulebook passes
        assert "".join(scheme.unit.split()).lower() in {"".join(u.split()).lower() for u in QUANTITY_UNITS[scheme.quantity]}


def test_qualify_finds_the_grid_share_at_the_contract_limit_worked_by_hand(tmp_path):
    # the grid share s where 53.5 x (s x 0.281 + (1 - s) x 0.011) = 2.0: s = (2.0 / 53.5 - 0.011) / (0.281 - 0.011)
    grid, wind = factor_kg_per_kwh("electricity.grid.eu27_2018"), factor_kg_per_kwh("electricity.renewable.wind_onshore")
    share = (CONTRACT_LIMIT / KWH_PER_KG_H2 - wind) / (grid - wind)  # 0.0977
    demo = (DEMO / "levers" / "grid_electrolysis_hydrogen.toml").read_text(encoding="utf-8")
    # the demo's wind PPA share lever alone (its other levers, the battery among them, are left out)
    head, wind_lever = demo.split("[[levers]]")[0], demo.split("[[levers]]")[1]
    wind_ppa = demo[demo.index("\n[sources.wind_ppa]"):demo.index("\n[battery]")]
    levers = write(tmp_path / "wind_share_only.toml", head + "[[levers]]" + wind_lever + wind_ppa)
    result = run_cli("qualify", GRID_H2, "--levers", levers, "--scheme", "offtake-contract", "--rulebook", OFFTAKE, "--front", "0", "--no-ledger", "--format", "json")
    assert result.exit_code == 0, result.output
    answer = json.loads(result.stdout)
    found = dict(item.split("=", 1) for item in answer["score_back_set"])
    assert float(found["electricity.sources.grid.share"]) == pytest.approx(share, rel=1e-6)
    assert [(c["scheme"], c["status"]) for c in answer["checks"]] == [("offtake-contract", "qualifies")]


def test_an_analysis_names_the_user_rulebook_in_its_table_and_json():
    args = ("headroom", DEMO / "blue_smr_hydrogen.toml", "--scheme", "offtake-contract", "--parameter", "capture.capture_rate", "--rulebook", OFFTAKE, "--no-ledger")
    table = run_cli(*args)
    assert table.exit_code == 0, table.output
    assert f"offtake-contract: user rulebook, read from {OFFTAKE}" in table.stdout
    data = json.loads(run_cli(*args, "--format", "json").stdout)
    assert data["user_rulebooks"] == [{"id": "offtake-contract", "file": str(OFFTAKE)}]
    plain = json.loads(run_cli("headroom", DEMO / "blue_smr_hydrogen.toml", "--scheme", "us-45v", "--parameter", "capture.capture_rate", "--no-ledger", "--format", "json").stdout)
    assert "user_rulebooks" not in plain
