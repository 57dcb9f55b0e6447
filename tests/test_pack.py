"""The evidence pack (issue 19): `carbonledger pack PROJECT -o PACK.zip` and `carbonledger verify
PACK.zip`. The manifest holds the SHA-256 (FIPS 180-4, checked here with hashlib on the unpacked
bytes) of every file; verify re-scores in a fresh folder; a file that does not match is named and
the command exits 3."""

from __future__ import annotations

import hashlib
import json
import zipfile

import pytest
from helpers import DEMO, FACTOR_HEADER, assert_one_line_error, run_cli, write

BLUE = DEMO / "blue_atr_ammonia.toml"


@pytest.fixture(scope="module")
def blue_pack(tmp_path_factory):
    out = tmp_path_factory.mktemp("pack") / "blue.zip"
    result = run_cli("pack", BLUE, "-o", out, "--year", "2029")
    assert result.exit_code == 0, result.output
    return out


def rewrite(source, target, change):
    """A copy of a pack with ``change(name, data) -> data or None`` applied to each entry (None: left out)."""
    with zipfile.ZipFile(source) as old, zipfile.ZipFile(target, "w") as new:
        for entry in old.infolist():
            data = change(entry.filename, old.read(entry.filename))
            if data is not None:
                new.writestr(entry.filename, data)
    return target


def test_the_pack_holds_every_deliverable_and_a_manifest_of_their_sha256(blue_pack):
    with zipfile.ZipFile(blue_pack) as archive:
        names = set(archive.namelist())
        manifest = json.loads(archive.read("manifest.json"))
        for name, digest in manifest["files"].items():
            assert hashlib.sha256(archive.read(name)).hexdigest() == digest, name
    assert {"project/blue_atr_ammonia.toml", "result.json", "workbook.xlsx", "report.html", "ledger.json", "manifest.json"} <= names
    assert set(manifest["files"]) == names - {"manifest.json"}
    assert manifest["assessment_year"] == 2029 and manifest["carbonledger_version"] and manifest["factor_set"]["name"] == "default-2026"
    assert (DEMO / "blue_atr_ammonia.toml").read_bytes() == zipfile.ZipFile(blue_pack).read("project/blue_atr_ammonia.toml")


def test_verify_reproduces_every_figure_and_status(blue_pack):
    result = run_cli("verify", blue_pack)
    assert result.exit_code == 0, result.output
    assert "every file matches its manifest" in result.stdout and "Reproduced: all" in result.stdout


def test_a_changed_file_is_named_and_exits_3(blue_pack, tmp_path):
    def edit(name, data):
        return data.replace(b"capture_rate = 0.95", b"capture_rate = 0.90") if name.endswith(".toml") else data

    tampered = rewrite(blue_pack, tmp_path / "tampered.zip", edit)
    result = run_cli("verify", tampered)
    assert_one_line_error(result, code=3)
    assert "project/blue_atr_ammonia.toml" in result.stderr and "does not match the manifest" in result.stderr


def test_a_missing_or_added_file_is_named_and_exits_3(blue_pack, tmp_path):
    missing = rewrite(blue_pack, tmp_path / "missing.zip", lambda name, data: None if name == "report.html" else data)
    assert_one_line_error(result := run_cli("verify", missing), code=3)
    assert "report.html" in result.stderr
    added = tmp_path / "added.zip"
    rewrite(blue_pack, added, lambda name, data: data)
    with zipfile.ZipFile(added, "a") as archive:
        archive.writestr("project/extra.csv", "a,b\n")
    assert_one_line_error(result := run_cli("verify", added), code=3)
    assert "project/extra.csv" in result.stderr


def test_a_result_not_reproduced_is_listed(blue_pack, tmp_path):
    """A pack made consistent again (manifest rewritten) around a result that the project does not give."""

    def change(name, data):
        if name == "result.json":
            result = json.loads(data)
            result["total"] *= 1.01
            return json.dumps(result).encode()
        return data

    altered = rewrite(blue_pack, tmp_path / "altered.zip", change)
    with zipfile.ZipFile(altered) as archive:
        files = {name: archive.read(name) for name in archive.namelist() if name != "manifest.json"}
        manifest = json.loads(archive.read("manifest.json"))
    manifest["files"] = {name: hashlib.sha256(data).hexdigest() for name, data in files.items()}
    rewrite(altered, tmp_path / "consistent.zip", lambda name, data: json.dumps(manifest).encode() if name == "manifest.json" else data)
    result = run_cli("verify", tmp_path / "consistent.zip")
    assert result.exit_code == 1
    assert "NOT reproduced: 1 of" in result.stdout and "total" in result.stdout


def test_factor_overrides_travel_in_the_pack(tmp_path):
    rows = write(tmp_path / "rows.csv", FACTOR_HEADER + "electricity.grid.eu27_2018,300,g CO2e/kWh,Invented override for a test,Table 0,2018,EU-27,Basis: CO2e; test,true\n")
    out = tmp_path / "over.zip"
    assert run_cli("pack", BLUE, "-o", out, "--factors", rows, "--year", "2029").exit_code == 0
    assert "factors/rows.csv" in zipfile.ZipFile(out).namelist()
    result = run_cli("verify", out)
    assert result.exit_code == 0, result.output


def test_bad_packs_and_projects_are_one_line(tmp_path, write_project):
    not_zip = write(tmp_path / "not.zip", "hello")
    assert_one_line_error(run_cli("verify", not_zip))
    no_manifest = tmp_path / "empty.zip"
    with zipfile.ZipFile(no_manifest, "w") as archive:
        archive.writestr("result.json", "{}")
    assert_one_line_error(run_cli("verify", no_manifest))
    # a series outside the project's folder cannot go in the pack as the project reads it
    (tmp_path / "hybrid_hourly_hydrogen_2026.csv").write_bytes((DEMO / "hybrid_hourly_hydrogen_2026.csv").read_bytes())
    outside = write(tmp_path / "p" / "hybrid.toml", (DEMO / "hybrid_hourly_hydrogen.toml").read_text(encoding="utf-8").replace('time_series = "hybrid_hourly_hydrogen_2026.csv"', 'time_series = "../hybrid_hourly_hydrogen_2026.csv"'))
    assert "../hybrid_hourly_hydrogen_2026.csv" in outside.read_text(encoding="utf-8")
    result = run_cli("pack", outside, "-o", tmp_path / "x.zip")
    assert_one_line_error(result)
    assert "electricity.time_series" in result.stderr and not (tmp_path / "x.zip").exists()
    existing = write(tmp_path / "exists.zip", "x")
    assert_one_line_error(run_cli("pack", BLUE, "-o", existing))  # never over a file without --force
    assert existing.read_text() == "x"


def test_report_and_pack_are_recorded_in_the_ledger(tmp_path):
    """Which figures went into which report or pack: `history` lists the report and pack runs."""
    ledger = tmp_path / "ledger.sqlite"
    assert run_cli("report", BLUE, "-o", tmp_path / "r.html", "--ledger", ledger).exit_code == 0
    assert run_cli("pack", BLUE, "-o", tmp_path / "p.zip", "--ledger", ledger).exit_code == 0
    history = run_cli("history", BLUE, "--ledger", ledger, "--format", "json")
    assert history.exit_code == 0, history.output
    commands = [record["command"] for record in json.loads(history.stdout)["records"]]
    assert any(c.startswith("report") for c in commands) and any(c.startswith("pack") for c in commands), commands
    packed = json.loads(zipfile.ZipFile(tmp_path / "p.zip").read("ledger.json"))
    assert any(record["command"].startswith("report") for record in packed["records"])  # the pack carries the records made before it
