"""The run ledger: every scoring run recorded in an embedded SQLite file.

A record holds the time, the carbonledger version, the project file (path and sha256), the
factor set (name and sha256), the schemes checked, the boundary, the GWP set, a compact result
(total, intensities, by stage, scheme checks), the validated parameters and the factor rows the
result used. Parameters and factor rows are stored once per distinct content (keyed by their
sha256), so a portfolio run over a thousand projects stays small.

Safety: the file is opened in WAL mode with a busy timeout, and each run is written in one
``BEGIN IMMEDIATE`` transaction (the run row, its records, then its record count), so runs from
several processes queue up rather than interleave, and a process killed mid-run leaves nothing
behind: SQLite discards the uncommitted transaction when the file is next opened. A file that
is not a carbonledger ledger is refused before anything is written to it.

``record_run(command, results, ledger=...)`` is the one function other commands call.

References
----------
.. [1] SQLite documentation, "Write-Ahead Logging" (https://sqlite.org/wal.html) and
   "Atomic Commit In SQLite" (https://sqlite.org/atomiccommit.html).
"""

from __future__ import annotations

import functools
import hashlib
import json
import os
import sqlite3
import tempfile
from collections.abc import Iterable
from dataclasses import dataclass, field
from datetime import UTC, datetime
from pathlib import Path
from typing import Any

from ..about import __version__
from ..errors import InputError
from ..model.factors import Factor
from ..model.factors import factor_row as plain_factor_row

LEDGER_ENV = "CARBONLEDGER_LEDGER"
LEDGER_FORMAT = "carbonledger run ledger"
SCHEMA_VERSION = "1"
BUSY_TIMEOUT_S = 60.0

_SCHEMA = """
CREATE TABLE IF NOT EXISTS ledger_meta (key TEXT PRIMARY KEY, value TEXT NOT NULL);
CREATE TABLE IF NOT EXISTS runs (
    id INTEGER PRIMARY KEY AUTOINCREMENT,
    time TEXT NOT NULL,
    command TEXT NOT NULL,
    carbonledger_version TEXT NOT NULL,
    record_count INTEGER
);
CREATE TABLE IF NOT EXISTS records (
    id INTEGER PRIMARY KEY AUTOINCREMENT,
    run_id INTEGER NOT NULL REFERENCES runs (id),
    kind TEXT NOT NULL,
    project_path TEXT NOT NULL,
    project_name TEXT NOT NULL,
    project_sha256 TEXT NOT NULL,
    factor_set TEXT NOT NULL,
    factor_set_sha256 TEXT NOT NULL,
    schemes TEXT NOT NULL,
    boundary TEXT NOT NULL,
    gwp TEXT NOT NULL,
    results TEXT NOT NULL,
    parameters_sha256 TEXT NOT NULL REFERENCES parameter_sets (sha256),
    factors_sha256 TEXT NOT NULL REFERENCES factor_lists (sha256)
);
CREATE TABLE IF NOT EXISTS parameter_sets (sha256 TEXT PRIMARY KEY, json TEXT NOT NULL);
CREATE TABLE IF NOT EXISTS factor_lists (sha256 TEXT PRIMARY KEY, json TEXT NOT NULL);
CREATE INDEX IF NOT EXISTS records_by_project ON records (project_path, id);
"""


@dataclass
class LedgerRecord:
    """One project scored under one factor set, as stored."""

    project_path: str
    project_name: str
    project_sha256: str
    factor_set: str
    factor_set_sha256: str
    schemes: list[str]
    boundary: str
    gwp: str
    results: dict
    parameters: dict
    factors_used: list[dict] = field(default_factory=list)
    kind: str = "score"


def default_ledger_path() -> Path:
    """$CARBONLEDGER_LEDGER, else ``ledger.sqlite`` in the user's data directory."""
    env = os.environ.get(LEDGER_ENV)
    if env:
        return Path(env)
    from platformdirs import user_data_path

    return user_data_path("carbonledger", appauthor=False) / "ledger.sqlite"


def ledger_path(ledger: str | Path | None = None, enabled: bool = True) -> Path | None:
    """The ledger a command should write: None when turned off."""
    if not enabled:
        return None
    return Path(ledger) if ledger else default_ledger_path()


def _refuse(path: Path, why: str) -> InputError:
    return InputError(path, "--ledger", f"a carbonledger run ledger or a new file ({why}); the file was left untouched")


def connect(path: str | Path) -> sqlite3.Connection:
    """Open a ledger, creating it when no file is there; refuse, without writing, any existing
    file that is not one (an empty file, another program's SQLite database, any other file)."""
    path = Path(path)
    if path.is_dir():
        raise _refuse(path, "it is a folder")
    if not path.exists():
        _create(path)
    try:
        with path.open("rb") as handle:
            header = handle.read(16)
    except OSError as error:
        raise InputError(path, "--ledger", f"a readable ledger file ({error.strerror})") from None
    if not header:
        raise _refuse(path, "it is an empty file, not a ledger")
    if header != b"SQLite format 3\x00":
        raise _refuse(path, "it is not an SQLite file")
    try:
        connection = sqlite3.connect(path, timeout=BUSY_TIMEOUT_S, isolation_level=None)
    except sqlite3.Error as error:
        raise InputError(path, "--ledger", f"a ledger file that can be opened ({error})") from None
    try:
        tables = {row[0] for row in connection.execute("SELECT name FROM sqlite_master WHERE type = 'table'")}
        _check_format(connection, path, tables)
        if connection.execute("PRAGMA journal_mode").fetchone()[0].lower() != "wal":
            _when_free(lambda: connection.execute("PRAGMA journal_mode = WAL"))
        connection.execute("PRAGMA synchronous = NORMAL")
    except InputError:
        connection.close()
        raise
    except sqlite3.DatabaseError as error:
        connection.close()
        raise _refuse(path, str(error)) from None
    return connection


def _create(path: Path) -> None:
    """Write a new, complete ledger beside ``path`` and link it into place: the ledger appears
    whole or not at all, so any file found at a ledger path that is not a ledger was made by
    something else. When another process created it first, its ledger is kept."""
    try:
        path.parent.mkdir(parents=True, exist_ok=True)
        handle, name = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".new", dir=path.parent)
        os.close(handle)
    except OSError as error:
        raise InputError(path, "--ledger", f"a path where a ledger can be created ({error.strerror})") from None
    temporary = Path(name)
    try:
        connection = sqlite3.connect(temporary, isolation_level=None)
        try:
            connection.execute("PRAGMA journal_mode = WAL")
            connection.execute("BEGIN")
            for statement in _SCHEMA.split(";"):
                if statement.strip():
                    connection.execute(statement)
            connection.execute("INSERT INTO ledger_meta (key, value) VALUES ('format', ?)", (LEDGER_FORMAT,))
            connection.execute("INSERT INTO ledger_meta (key, value) VALUES ('schema_version', ?)", (SCHEMA_VERSION,))
            connection.execute("COMMIT")
        finally:
            connection.close()
        try:
            os.link(temporary, path)
        except FileExistsError:
            pass  # another process created the ledger meanwhile: use that one
        except OSError:  # a file system without hard links
            if not path.exists():
                os.replace(temporary, path)
    except (OSError, sqlite3.Error) as error:
        raise InputError(path, "--ledger", f"a path where a ledger can be created ({error})") from None
    finally:
        for leftover in (temporary, Path(f"{temporary}-wal"), Path(f"{temporary}-shm")):
            if leftover.exists():
                leftover.unlink()


def _when_free(statement, timeout_s: float = BUSY_TIMEOUT_S):
    """Run a statement that SQLite refuses at once (no busy handler) while another writer is
    active, such as switching the journal mode of a new file: retry until it is free."""
    import time

    deadline = time.monotonic() + timeout_s
    while True:
        try:
            return statement()
        except sqlite3.OperationalError as error:
            if "locked" not in str(error) and "busy" not in str(error):
                raise
            if time.monotonic() > deadline:
                raise
            time.sleep(0.01)


def _check_format(connection: sqlite3.Connection, path: Path, tables: set[str]) -> None:
    if not tables:
        raise _refuse(path, "an SQLite database without tables, made by another program")
    if "ledger_meta" not in tables:
        raise _refuse(path, "an SQLite file without a carbonledger ledger_meta table")
    meta = dict(connection.execute("SELECT key, value FROM ledger_meta"))
    if meta.get("format") != LEDGER_FORMAT:
        raise _refuse(path, "its ledger_meta does not name the carbonledger ledger format")
    if meta.get("schema_version") != SCHEMA_VERSION:
        raise _refuse(path, f"ledger schema {meta.get('schema_version')}, this carbonledger reads {SCHEMA_VERSION}")


def check_ledger(ledger: Path | None) -> None:
    """Open and close the ledger, so a bad ledger path fails before any work is done."""
    if ledger is not None:
        connect(ledger).close()


def ledger_for_run(ledger: str | Path | None, enabled: bool) -> Path | None:
    """The ledger a command will record in (None when turned off), checked before any work."""
    where = ledger_path(ledger, enabled)
    check_ledger(where)
    return where


def _canonical(value: Any) -> tuple[str, str]:
    text = json.dumps(value, sort_keys=True, separators=(",", ":"), ensure_ascii=False, default=str)
    return text, hashlib.sha256(text.encode("utf-8")).hexdigest()


def factor_row(item) -> dict:
    """A factor row (a ``model.factors.Factor``, or its plain dict) as the ledger stores it: the
    fields of the one factor-row model, as plain values."""
    if isinstance(item, Factor):
        return dict(_stored_row(item))
    return plain_factor_row(Factor.model_validate(item))


@functools.lru_cache(maxsize=65536)
def _stored_row(row: Factor) -> dict:
    """Rows are frozen and shared by every result scored with one factor set: a portfolio of
    thousands of results turns each distinct row into plain values once."""
    return plain_factor_row(row)


def to_record(result, kind: str = "score") -> LedgerRecord:
    """A LedgerRecord from any result that gives its ``ledger_entry(kind)`` (or a ready record)."""
    if isinstance(result, LedgerRecord):
        return result
    entry = result.ledger_entry(kind)
    entry["project_path"] = str(Path(entry["project_path"]).resolve())
    entry["factors_used"] = [factor_row(row) for row in entry["factors_used"]]
    return LedgerRecord(**entry)


def record_run(command: str, results: Iterable, *, ledger: str | Path | None = None, kind: str = "score") -> int | None:
    """Record one run (any number of results) in one transaction; return the run id.

    ``results`` may hold any result with a ``ledger_entry(kind)`` method (ScoreResult,
    LifetimeResult) or ready LedgerRecord objects; it is consumed inside the
    transaction, so if the process dies before the end nothing of the run is kept.
    ``ledger=None`` writes to ``default_ledger_path()``.
    """
    path = Path(ledger) if ledger else default_ledger_path()
    connection = connect(path)
    stored_parameters: set[str] = set()
    stored_factors: set[str] = set()
    factor_cache: dict[tuple, tuple[str, str]] = {}
    try:
        connection.execute("BEGIN IMMEDIATE")
        now = datetime.now(UTC).isoformat(timespec="milliseconds")
        run_id = connection.execute(
            "INSERT INTO runs (time, command, carbonledger_version) VALUES (?, ?, ?)", (now, command, __version__)
        ).lastrowid
        count = 0
        for result in results:
            record = to_record(result, kind)
            parameters_json, parameters_sha = _canonical(record.parameters)
            if parameters_sha not in stored_parameters:
                connection.execute("INSERT OR IGNORE INTO parameter_sets (sha256, json) VALUES (?, ?)", (parameters_sha, parameters_json))
                stored_parameters.add(parameters_sha)
            cache_key = (record.factor_set_sha256, tuple(row.get("id") for row in record.factors_used))
            if cache_key not in factor_cache:
                factor_cache[cache_key] = _canonical(record.factors_used)
            factors_json, factors_sha = factor_cache[cache_key]
            if factors_sha not in stored_factors:
                connection.execute("INSERT OR IGNORE INTO factor_lists (sha256, json) VALUES (?, ?)", (factors_sha, factors_json))
                stored_factors.add(factors_sha)
            connection.execute(
                "INSERT INTO records (run_id, kind, project_path, project_name, project_sha256, factor_set, factor_set_sha256,"
                " schemes, boundary, gwp, results, parameters_sha256, factors_sha256) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)",
                (
                    run_id,
                    record.kind,
                    record.project_path,
                    record.project_name,
                    record.project_sha256,
                    record.factor_set,
                    record.factor_set_sha256,
                    json.dumps(record.schemes),
                    record.boundary,
                    record.gwp,
                    _canonical(record.results)[0],
                    parameters_sha,
                    factors_sha,
                ),
            )
            count += 1
        connection.execute("UPDATE runs SET record_count = ? WHERE id = ?", (count, run_id))
        connection.execute("COMMIT")
        return run_id
    except sqlite3.Error as error:
        if connection.in_transaction:
            connection.execute("ROLLBACK")
        raise InputError(path, "--ledger", f"a writable run ledger ({error}); this run was not recorded") from None
    except BaseException:
        if connection.in_transaction:
            connection.execute("ROLLBACK")
        raise
    finally:
        connection.close()


# ---------------------------------------------------------------------------------------------
# History: how one project's results changed over time, and why.


def _flatten(value: Any, prefix: str = "") -> dict[str, Any]:
    if isinstance(value, dict):
        flat: dict[str, Any] = {}
        for key, child in value.items():
            flat.update(_flatten(child, f"{prefix}{key}."))
        return flat
    return {prefix[:-1]: value}


def parameter_changes(old: dict, new: dict) -> list[dict]:
    """Parameters whose value differs between two validated parameter sets (dotted paths)."""
    before, after = _flatten(old), _flatten(new)
    return [
        {"parameter": key, "old": before.get(key), "new": after.get(key)}
        for key in sorted(set(before) | set(after))
        if before.get(key) != after.get(key)
    ]


def factor_changes(old: list[dict], new: list[dict]) -> list[dict]:
    """Factor rows used by either result that differ (value, unit or source), were added or dropped."""
    before = {row["id"]: row for row in old}
    after = {row["id"]: row for row in new}
    changes = []
    for key in sorted(set(before) | set(after)):
        a, b = before.get(key), after.get(key)
        if a == b:
            continue
        kind = "added" if a is None else "removed" if b is None else "changed"
        changes.append(
            {
                "id": key,
                "kind": kind,
                "old": None if a is None else a.get("value"),
                "new": None if b is None else b.get("value"),
                "unit": (b or a).get("unit", ""),
                "old_source": None if a is None else a.get("source"),
                "new_source": None if b is None else b.get("source"),
            }
        )
    return changes


def project_history(project_file: str | Path, ledger: str | Path | None = None) -> list[dict]:
    """Every record of a project file (matched by its resolved path), oldest first, each with
    what changed since the one before: the project file, parameters, factor set, factor rows."""
    path = Path(ledger) if ledger else default_ledger_path()
    if not path.exists():
        raise InputError(path, "--ledger", "an existing run ledger (none found; runs are recorded by score and recalc)")
    connection = connect(path)
    try:
        rows = connection.execute(
            "SELECT r.id, r.run_id, runs.time, runs.command, runs.carbonledger_version, r.kind, r.project_name,"
            " r.project_sha256, r.factor_set, r.factor_set_sha256, r.schemes, r.boundary, r.gwp, r.results,"
            " p.json, f.json FROM records r JOIN runs ON runs.id = r.run_id"
            " JOIN parameter_sets p ON p.sha256 = r.parameters_sha256 JOIN factor_lists f ON f.sha256 = r.factors_sha256"
            " WHERE r.project_path = ? ORDER BY r.id",
            (str(Path(project_file).resolve()),),
        ).fetchall()
    except sqlite3.Error as error:
        raise InputError(path, "--ledger", f"a readable run ledger ({error})") from None
    finally:
        connection.close()
    history = []
    previous = None
    for row in rows:
        (record_id, run_id, time, command, version, kind, name, project_sha, set_name, set_sha, schemes, boundary, gwp, results, parameters, factors) = row
        entry = {
            "record": record_id,
            "run": run_id,
            "time": time,
            "command": command,
            "carbonledger_version": version,
            "kind": kind,
            "project": name,
            "project_sha256": project_sha,
            "factor_set": set_name,
            "factor_set_sha256": set_sha,
            "schemes": json.loads(schemes),
            "boundary": boundary,
            "gwp": gwp,
            "results": json.loads(results),
            "parameters": json.loads(parameters),
            "factors_used": json.loads(factors),
        }
        if previous is None:
            entry["changes"] = None
        else:
            entry["changes"] = {
                "project_file": previous["project_sha256"] != project_sha,
                "factor_set": None if previous["factor_set_sha256"] == set_sha else {"old": previous["factor_set"], "new": set_name},
                "gwp": None if previous["gwp"] == gwp else {"old": previous["gwp"], "new": gwp},
                "parameters": parameter_changes(previous["parameters"], entry["parameters"]),
                "factors": factor_changes(previous["factors_used"], entry["factors_used"]),
            }
        history.append(entry)
        previous = entry
    return history
