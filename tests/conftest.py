from __future__ import annotations

import os
import sys
import textwrap
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
DEMO = ROOT / "demo_projects"
os.environ.setdefault("MPLBACKEND", "Agg")
# Keep compiled (and assertion-rewritten) modules between runs even where PYTHONDONTWRITEBYTECODE is
# set: rewriting the test modules and the pytest plugins' modules took about 8 s in each worker per run.
sys.dont_write_bytecode = False


# The command line is built once per process without reaching into typer: carbonledger.cli loads each
# command lazily and caches its click command (``load_command``), so typer's CliRunner, which turns the
# app into a click group on every invoke, rebuilds only the small root group (tests/test_startup.py).


def pytest_configure(config):
    config.addinivalue_line("markers", "xdist_group(name): run these tests in one pytest-xdist worker")


@pytest.hookimpl(tryfirst=True)  # before pytest-xdist reads the groups from the markers
def pytest_collection_modifyitems(items):
    """Under pytest-xdist (`-n 2 --dist loadgroup`), every test that uses LibreOffice's results
    runs in one worker, so LibreOffice still starts once per session."""
    for item in items:
        if "libreoffice_recalculated" in getattr(item, "fixturenames", ()):
            item.add_marker(pytest.mark.xdist_group("libreoffice"))
        if {"ledger", "postgresql_server"} & set(getattr(item, "fixturenames", ())):
            item.add_marker(pytest.mark.xdist_group("postgresql"))  # one throwaway server per session


@pytest.fixture(scope="session", autouse=True)
def _session_ledger_in_tmp(tmp_path_factory):
    """Session-scoped fixtures (which run before the per-test ledger is set) record here too."""
    with pytest.MonkeyPatch.context() as patch:
        patch.setenv("CARBONLEDGER_LEDGER", str(tmp_path_factory.mktemp("session") / "ledger.sqlite"))
        yield


@pytest.fixture(scope="session")
def libreoffice_recalculated(tmp_path_factory):
    """Every workbook registered with ``workbook_support.libreoffice_job``, recalculated by ONE
    LibreOffice start: {name: (written workbook, LibreOffice's recalculated copy)}."""
    from workbook_support import LIBREOFFICE_JOBS, recalculate_many_with_libreoffice, soffice

    if soffice() is None:
        if os.environ.get("CI") == "true":
            pytest.fail("LibreOffice (soffice) is required under CI=true; .ci/run installs libreoffice-calc")
        pytest.skip("LibreOffice not installed here")
    folder = tmp_path_factory.mktemp("libreoffice")
    (folder / "in").mkdir()
    written = {name: build(folder / "in" / f"{name}.xlsx") for name, build in sorted(LIBREOFFICE_JOBS.items())}
    out = recalculate_many_with_libreoffice(list(written.values()), folder)
    return {name: (path, out / path.name) for name, path in written.items()}


@pytest.fixture(autouse=True)
def _ledger_in_tmp(tmp_path, monkeypatch):
    """Every test records runs in its own temporary ledger, never in the user's data folder."""
    path = tmp_path / "ledger.sqlite"
    monkeypatch.setenv("CARBONLEDGER_LEDGER", str(path))
    return path


@pytest.fixture(scope="session")
def postgresql_server():
    """A throwaway PostgreSQL server for the session (tests/pg_support.py); under CI=true a missing
    server fails the tests that need it instead of skipping them (.ci/run installs postgresql)."""
    from pg_support import start_server

    server = start_server()
    if server is None:
        if os.environ.get("CI") == "true":
            pytest.fail("PostgreSQL (initdb, pg_ctl) is required under CI=true; .ci/run installs the postgresql package")
        pytest.skip("PostgreSQL (initdb, pg_ctl) not installed here")
    yield server
    server.stop()


@pytest.fixture(params=["sqlite", "postgresql"])
def ledger(request, tmp_path, monkeypatch):
    """A new, empty ledger on each backend, made the default for the command line
    ($CARBONLEDGER_LEDGER): an SQLite file, or a PostgreSQL database created with
    `carbonledger ledger upgrade` (its password only in PGPASSWORD)."""
    from ledger_support import LedgerUnderTest

    if request.param == "sqlite":
        where = LedgerUnderTest(str(tmp_path / "team.sqlite"), None)
    else:
        from pg_support import LEDGER_PASSWORD

        server = request.getfixturevalue("postgresql_server")
        monkeypatch.setenv("PGPASSWORD", LEDGER_PASSWORD)
        where = LedgerUnderTest(server.url(server.new_database()), server)
        from carbonledger.io.ledger import upgrade_ledger

        upgrade_ledger(where.url)
    monkeypatch.setenv("CARBONLEDGER_LEDGER", where.url)
    return where


@pytest.fixture
def write_project(tmp_path):
    """Write a project TOML (dedented text) into a temporary folder and return its path."""

    def write(text: str, name: str = "project.toml") -> Path:
        path = tmp_path / name
        path.write_text(textwrap.dedent(text), encoding="utf-8")
        return path

    return write
