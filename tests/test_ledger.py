"""The run ledger: records, history, bad files, concurrent writers and a writer killed mid-run."""

import os
import signal
import sqlite3
import subprocess
import sys
import textwrap

import pytest
from helpers import DEMO, assert_one_line_error, run_cli, write

from carbonledger.errors import InputError
from carbonledger.io.ledger import connect, project_history, record_run


def _counts(path):
    with sqlite3.connect(path) as connection:
        runs = connection.execute("SELECT id, record_count FROM runs ORDER BY id").fetchall()
        records = dict(connection.execute("SELECT run_id, COUNT(*) FROM records GROUP BY run_id").fetchall())
        assert connection.execute("PRAGMA integrity_check").fetchone()[0] == "ok"
    return runs, records


def test_score_and_recalc_are_recorded(_ledger_in_tmp):
    project = DEMO / "grid_electrolysis_hydrogen.toml"
    assert run_cli("score", project, "--format", "json").exit_code == 0
    assert run_cli("recalc", project, DEMO / "green_electrolysis_ammonia.toml", "--to", "demo-2027-grid-revision").exit_code == 0
    runs, records = _counts(_ledger_in_tmp)
    assert [count for _, count in runs] == [1, 4]  # score: 1; recalc: 2 projects x 2 sets
    assert records == {run_id: count for run_id, count in runs}
    with sqlite3.connect(_ledger_in_tmp) as connection:
        row = connection.execute("SELECT project_sha256, factor_set, factor_set_sha256, schemes, boundary, gwp, results FROM records WHERE run_id = 1").fetchone()
        assert connection.execute("PRAGMA journal_mode").fetchone()[0] == "wal"
    import hashlib
    import json

    assert row[0] == hashlib.sha256(project.read_bytes()).hexdigest()
    assert row[1] == "default-2026" and len(row[2]) == 64
    assert "us-45v" in json.loads(row[3]) and row[4] == "cradle-to-gate" and row[5] == "ar6"
    assert json.loads(row[6])["checks"]


def test_compare_is_recorded_one_record_per_project(_ledger_in_tmp):
    projects = [DEMO / "grey_smr_ammonia.toml", DEMO / "green_electrolysis_ammonia.toml"]
    assert run_cli("compare", *projects, "--boundary", "cradle-to-gate").exit_code == 0
    runs, records = _counts(_ledger_in_tmp)
    assert [count for _, count in runs] == [2]
    with sqlite3.connect(_ledger_in_tmp) as connection:
        assert connection.execute("SELECT command FROM runs").fetchone()[0] == "compare"
    assert run_cli("compare", *projects, "--no-ledger").exit_code == 0
    assert len(_counts(_ledger_in_tmp)[0]) == 1


def test_workbook_is_recorded(tmp_path, _ledger_in_tmp):
    assert run_cli("workbook", DEMO / "grey_smr_ammonia.toml", "-o", tmp_path / "grey.xlsx").exit_code == 0
    with sqlite3.connect(_ledger_in_tmp) as connection:
        assert connection.execute("SELECT command FROM runs").fetchall() == [("workbook",)]
        assert connection.execute("SELECT COUNT(*) FROM records").fetchone()[0] == 1


def test_no_ledger_and_explicit_ledger(tmp_path, _ledger_in_tmp):
    project = DEMO / "grid_electrolysis_hydrogen.toml"
    assert run_cli("score", project, "--no-ledger").exit_code == 0
    assert not _ledger_in_tmp.exists()
    chosen = tmp_path / "sub" / "mine.sqlite"
    assert run_cli("score", project, "--ledger", chosen).exit_code == 0
    assert _counts(chosen)[0] == [(1, 1)]


def test_history_shows_what_changed_and_why(tmp_path, _ledger_in_tmp):
    project = DEMO / "blue_atr_ammonia.toml"
    assert run_cli("score", project).exit_code == 0
    assert run_cli("score", project, "--set", "natural_gas.methane_emission_share=0.003").exit_code == 0
    assert run_cli("score", project, "--set", "natural_gas.methane_emission_share=0.003", "--factors", "demo-2027-grid-revision").exit_code == 0
    history = project_history(project, _ledger_in_tmp)
    assert len(history) == 3 and history[0]["changes"] is None
    second, third = history[1]["changes"], history[2]["changes"]
    assert second["parameters"] == [{"parameter": "natural_gas.methane_emission_share", "old": 0.005, "new": 0.003}]
    assert second["factors"] == [] and second["factor_set"] is None
    assert third["parameters"] == []
    assert [f["id"] for f in third["factors"]] == ["electricity.grid.eu27_2018"]
    assert (third["factors"][0]["old"], third["factors"][0]["new"]) == (281.0, 318.0)
    assert third["factor_set"] == {"old": "default-2026", "new": "demo-2027-grid-revision"}
    text = run_cli("history", project)
    assert text.exit_code == 0
    assert "input natural_gas.methane_emission_share: 0.005 -> 0.003" in text.stdout
    assert "factor electricity.grid.eu27_2018: 281 -> 318" in text.stdout
    assert run_cli("history", project, "--format", "json").exit_code == 0
    # each recorded check keeps its status: natural gas reforming is not an RFNBO (Directive (EU)
    # 2018/2001 Art. 2), so eu-rfnbo reads "not eligible", not a bare FAIL
    assert "eu-rfnbo" in text.stdout and "not eligible" in text.stdout and "FAIL" not in text.stdout
    rows = [line.split(",") for line in run_cli("history", project, "--format", "csv").stdout.splitlines()]
    status = rows[0].index("status")
    assert {row[status] for row in rows[1:] if len(row) > status and row[rows[0].index("scheme")] == "eu-rfnbo"} == {"not_eligible"}


@pytest.mark.parametrize("content", [b"project,value\nnot a ledger,1\n", "sqlite"])
def test_a_file_that_is_not_a_ledger_is_refused_and_left_untouched(tmp_path, content):
    path = tmp_path / "other.db"
    if content == "sqlite":
        with sqlite3.connect(path) as connection:
            connection.execute("CREATE TABLE invoices (id INTEGER, amount REAL)")
            connection.execute("INSERT INTO invoices VALUES (1, 9.5)")
    else:
        path.write_bytes(content)
    before = path.read_bytes()
    result = run_cli("score", DEMO / "grid_electrolysis_hydrogen.toml", "--ledger", path)
    assert_one_line_error(result)
    assert "ledger" in result.stderr
    assert result.stdout == ""
    assert_one_line_error(run_cli("recalc", DEMO, "--to", "demo-2027-grid-revision", "--ledger", path))
    assert_one_line_error(run_cli("history", DEMO / "grid_electrolysis_hydrogen.toml", "--ledger", path))
    assert path.read_bytes() == before
    assert not (tmp_path / "other.db-wal").exists() and not (tmp_path / "other.db-shm").exists()


def test_history_without_a_ledger(tmp_path):
    assert_one_line_error(run_cli("history", DEMO / "grid_electrolysis_hydrogen.toml", "--ledger", tmp_path / "none.sqlite"))


_WRITER = textwrap.dedent(
    """
    import sys
    from carbonledger.io.ledger import LedgerRecord, record_run

    def record(number, who):
        return LedgerRecord(f"/tmp/project_{{who}}_{{number}}.toml", "p", "0" * 64, "set", "1" * 64, ["s"], "cradle-to-gate", "ar6",
                            {{"total": number, "unit": "u", "checks": []}}, {{"who": who, "n": number}}, [{{"id": "f", "value": number}}])

    who = sys.argv[2]
    for run in range(int(sys.argv[3])):
        record_run(f"test {{who}} {{run}}", [record(n, who) for n in range(5)], ledger=sys.argv[1])
    """
)


def test_two_processes_writing_at_once(tmp_path):
    ledger = tmp_path / "shared.sqlite"
    script = write(tmp_path / "writer.py", _WRITER.format())
    writers = [subprocess.Popen([sys.executable, str(script), str(ledger), who, "25"]) for who in ("a", "b")]
    assert [w.wait(timeout=120) for w in writers] == [0, 0]
    runs, records = _counts(ledger)
    assert len(runs) == 50
    assert all(count == 5 and records[run_id] == 5 for run_id, count in runs)


_KILLED = textwrap.dedent(
    """
    import sys, time
    from carbonledger.io.ledger import LedgerRecord, record_run

    def record(number):
        return LedgerRecord(f"/tmp/p{{number}}.toml", "p", "0" * 64, "set", "1" * 64, ["s"], "cradle-to-gate", "ar6",
                            {{"total": number, "unit": "u", "checks": []}}, {{"n": number}}, [])

    def slow_results():
        yield record(1)
        yield record(2)
        print("mid-run", flush=True)  # results are turned into records before the run's transaction (test_ledger_backends kills one inside it)
        time.sleep(60)
        yield record(3)

    record_run("complete run", [record(0)], ledger=sys.argv[1])
    record_run("run killed midway", slow_results(), ledger=sys.argv[1])
    """
)


def test_a_process_killed_mid_run_leaves_no_partial_record(tmp_path):
    ledger = tmp_path / "ledger.sqlite"
    script = write(tmp_path / "killed.py", _KILLED.format())
    child = subprocess.Popen([sys.executable, str(script), str(ledger)], stdout=subprocess.PIPE, text=True)
    assert child.stdout.readline().strip() == "mid-run"
    os.kill(child.pid, signal.SIGKILL)
    child.wait(timeout=30)
    runs, records = _counts(ledger)
    assert runs == [(1, 1)] and records == {1: 1}
    # the ledger still takes new runs, and the killed run left nothing behind
    from carbonledger.io.ledger import LedgerRecord

    record_run("after the crash", [LedgerRecord("/tmp/x.toml", "x", "0" * 64, "set", "1" * 64, [], "b", "ar6", {"total": 0, "unit": "u", "checks": []}, {}, [])], ledger=ledger)
    runs, records = _counts(ledger)
    assert [count for _, count in runs] == [1, 1] and sum(records.values()) == 2


def test_connect_refuses_a_folder(tmp_path):
    with pytest.raises(InputError):
        connect(tmp_path)


def test_lifetime_runs_are_recorded_with_their_lifetime_values(_ledger_in_tmp):
    from helpers import PORTFOLIO

    project = PORTFOLIO / "vennor_hybrid_hydrogen.toml"
    assert run_cli("score", project, "--lifetime").exit_code == 0
    assert run_cli("score", project).exit_code == 0
    first, second = project_history(project, _ledger_in_tmp)
    assert first["kind"] == "lifetime" and first["results"]["lifetime"] is True
    # the trajectory rows (invented, 281 g CO2e/kWh in 2027) are stored with the factors used
    assert {"id": "trajectory.2027", "value": 281.0}.items() <= next(r for r in first["factors_used"] if r["id"] == "trajectory.2027").items()
    assert second["kind"] == "score"


def test_a_relative_project_path_is_keyed_from_the_folder_it_was_named_in(tmp_path, monkeypatch):
    """The ledger keys a project by its absolute path (resolved once per folder and name): the same relative
    name given in two folders is two projects (POSIX path resolution, common practice)."""
    from carbonledger import api
    from carbonledger.io.ledger import to_record

    result = api.score(DEMO / "green_electrolysis_ammonia.toml")
    (tmp_path / "a").mkdir()
    (tmp_path / "b").mkdir()
    named = result.model_copy(update={"project_file": "p.toml"})
    monkeypatch.chdir(tmp_path / "a")
    first = to_record(named).project_path
    monkeypatch.chdir(tmp_path / "b")
    second = to_record(named).project_path
    assert (first, second) == (str((tmp_path / "a" / "p.toml").resolve()), str((tmp_path / "b" / "p.toml").resolve()))
