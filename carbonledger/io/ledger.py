"""The run ledger: every scoring run recorded in an SQLite file or on a PostgreSQL server.

A record holds who and what: the time, the user and host, the carbonledger version, the project
file (path and sha256), the factor set (name and sha256), the assessment year, the schemes
checked, the boundary, the GWP set, a compact result (total, intensities, by stage, scheme
checks), the validated parameters and the factor rows the result used. Parameters and factor
rows are stored once per distinct content (keyed by their sha256), so a portfolio run over a
thousand projects stays small. Each record carries the sha256 of its own content, which
``copy_ledger`` checks on both sides.

One implementation serves both backends (``io/ledger_store.py``: the SQLite file through
``sqlite3``, a ``postgresql://`` URL through SQLAlchemy Core and psycopg 3; the schema in numbered
migrations, ``io/ledger_schema.py``).

Safety: a run is visible (history, export, copy) only once complete (its ``record_count`` set).
``record_run`` writes a whole run in one transaction (SQLite: ``BEGIN IMMEDIATE`` in WAL mode
with a busy timeout), so a process killed mid-run leaves nothing behind. A portfolio recalc
writes from its workers in batches (``open_run``, ``write_batch``, ``close_run``): each batch is
one transaction, each record has an item key unique in its run, and a run's key is derived from
its inputs, so a batch written twice, or a recalc run again, adds nothing. Within a transaction
content rows are written in sha256 order, so concurrent writers on PostgreSQL never deadlock.
A file or database that is not a carbonledger ledger, or whose schema is newer than this tool's,
is refused before anything is written to it.

``record_run(command, results, ledger=...)`` is the one function most commands call.

References
----------
.. [1] SQLite documentation, "Write-Ahead Logging" (https://sqlite.org/wal.html) and
   "Atomic Commit In SQLite" (https://sqlite.org/atomiccommit.html).
.. [2] PostgreSQL documentation, "Transaction Isolation" (read committed) and "INSERT ... ON CONFLICT".
"""

from __future__ import annotations

import contextlib
import functools
import getpass
import hashlib
import json
import os
import socket
import sqlite3
import tempfile
import uuid
from collections.abc import Iterable
from dataclasses import dataclass, field, fields
from datetime import UTC, datetime
from pathlib import Path
from typing import Any

from ..about import __version__
from ..errors import InputError
from ..model.factors import Factor
from ..model.factors import factor_row as plain_factor_row
from .ledger_schema import RECORD_FIELDS, RECORD_SELECT, SCHEMA_VERSION, record_sha256, schema_of, upgrade
from .ledger_store import Location, SqliteDatabase, locate, open_server

USER_ENV = "CARBONLEDGER_USER"


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
    assessment_year: int | None = None  # the year whose dates the scheme rules were read on
    carbonledger_version: str = __version__  # the version that computed the result


@dataclass(frozen=True)
class Recorder:
    """Who records: the user (``$CARBONLEDGER_USER``, else the login name) and the host."""

    user: str
    host: str


def recorder() -> Recorder:
    user = os.environ.get(USER_ENV, "").strip()
    if not user:
        try:
            user = getpass.getuser()
        except (OSError, KeyError):  # no login name in a bare container
            user = "unknown"
    return Recorder(user, socket.gethostname())


def now_text() -> str:
    return datetime.now(UTC).isoformat(timespec="milliseconds")


# ---------------------------------------------------------------------------------------------
# Opening a ledger


def _refuse(path: Path, why: str) -> InputError:
    return InputError(path, "--ledger", f"a carbonledger run ledger or a new file ({why}); the file was left untouched")


def connect(ledger: str | Path | Location | None = None, *, create: bool = True):
    """Open a ledger and check it before anything is written.

    An SQLite file is created when absent (``create``) and upgraded to this schema when older; any
    existing file that is not a ledger (an empty file, another program's database) is refused. A
    PostgreSQL database must hold a ledger (``carbonledger ledger upgrade URL`` creates or
    upgrades one); an empty database, another program's tables, or an older or newer schema
    are refused with one line.
    """
    where = locate(ledger)
    if where.on_server:
        db = open_server(where)
        try:
            version = schema_of(db)
        except db.errors as error:
            db.close()
            raise db.failure(error, "a readable carbonledger ledger; nothing was written") from None
        except InputError:
            db.close()
            raise
        if version != SCHEMA_VERSION:
            db.close()
            why = (
                "an empty database"
                if version == 0
                else f"ledger schema {version}, this carbonledger writes {SCHEMA_VERSION}"
            )
            raise InputError(
                where.shown,
                "--ledger",
                f"a carbonledger ledger of schema {SCHEMA_VERSION} ({why}: run `carbonledger "
                "ledger upgrade` on it once); nothing was written",
            )
        return db
    return _connect_file(where, create)


def _connect_file(where: Location, create: bool) -> SqliteDatabase:
    path = where.path
    if path.is_dir():
        raise _refuse(path, "it is a folder")
    if not path.exists():
        if not create:
            raise InputError(
                path, "--ledger", "an existing run ledger (none found; runs are recorded by score and recalc)"
            )
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
        db = SqliteDatabase(where)
    except sqlite3.Error as error:
        raise InputError(path, "--ledger", f"a ledger file that can be opened ({error})") from None
    try:
        version = schema_of(db)
        if version == 0:
            raise _refuse(path, "an SQLite database without tables, made by another program")
        if version < SCHEMA_VERSION:
            _when_free(lambda: upgrade(db))  # a personal ledger file follows the tool that opens it
        if db.rows("PRAGMA journal_mode")[0][0].lower() != "wal":
            _when_free(lambda: db.run("PRAGMA journal_mode = WAL"))
        db.run("PRAGMA synchronous = NORMAL")
    except InputError:
        db.close()
        raise
    except sqlite3.DatabaseError as error:
        db.close()
        raise _refuse(path, str(error)) from None
    return db


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
        db = SqliteDatabase(Location(str(path), path=path), temporary)
        try:
            db.run("PRAGMA journal_mode = WAL")
            upgrade(db)
        finally:
            db.close()
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


def _when_free(statement, timeout_s: float = 60.0):
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


def check_ledger(ledger: Location | None) -> None:
    """Open and close the ledger, so a bad ledger fails before any work is done."""
    if ledger is not None:
        connect(ledger).close()


def ledger_for_run(ledger: str | Path | None, enabled: bool) -> Location | None:
    """The ledger a command will record in (None when turned off), checked before any work."""
    if not enabled:
        return None
    where = locate(ledger)
    check_ledger(where)
    return where


def upgrade_ledger(ledger: str | Path | None = None) -> tuple[int, int]:
    """Create or upgrade a ledger's schema (``carbonledger ledger upgrade``): (before, after)."""
    where = locate(ledger)
    if not where.on_server:
        before = 0
        if where.path.is_file():  # read its schema without writing; connect() refuses what is not a ledger
            with contextlib.suppress(sqlite3.Error, InputError):
                db = SqliteDatabase(where)
                try:
                    before = schema_of(db)
                finally:
                    db.close()
        connect(where).close()  # creates, or upgrades, the file
        return before, SCHEMA_VERSION
    db = open_server(where)
    try:
        return upgrade(db)
    except db.errors as error:
        raise db.failure(error, "a database where the ledger schema can be written; nothing was written") from None
    finally:
        db.close()


# ---------------------------------------------------------------------------------------------
# Writing


def _canonical(value: Any) -> tuple[str, str]:
    text = json.dumps(value, sort_keys=True, separators=(",", ":"), ensure_ascii=False, default=str)
    return text, hashlib.sha256(text.encode("utf-8")).hexdigest()


def factor_row(item) -> dict:
    """A factor row (a ``model.factors.Factor``, or its plain dict) as the ledger stores it: the
    fields of the one factor-row model, as plain values."""
    if isinstance(item, Factor):
        return dict(_stored_row(item))
    return plain_factor_row(Factor.model_validate(item))


_STORED_ROWS: dict[int, tuple[Factor, dict]] = {}


def _stored_row(row: Factor) -> dict:
    """Rows are frozen and shared by every result scored with one factor set: a portfolio of
    thousands of results turns each distinct row into plain values once (held by the row's identity,
    which costs nothing to look up, where hashing a row hashes every field)."""
    held = _STORED_ROWS.get(id(row))
    if held is None or held[0] is not row:
        if len(_STORED_ROWS) > 65536:
            _STORED_ROWS.clear()
        held = _STORED_ROWS[id(row)] = (row, plain_factor_row(row))
    return held[1]


def project_key(path: str | Path) -> str:
    """The absolute path the ledger keys a project by, from the current folder (a recalc names each project in
    its run key and in two records: worked out once per folder and name)."""
    return _resolved(os.getcwd(), str(path))


@functools.lru_cache(maxsize=65536)
def _resolved(cwd: str, path: str) -> str:
    return str(Path(cwd, path).resolve())


_RECORD_KEYS = {item.name for item in fields(LedgerRecord)}


def assessment_year(result, entry: dict) -> int | None:
    """The year a result was assessed in: its own ``assessment_year`` when it gives one, else the
    year of its checks' ``assessment_period`` (a calendar year, or a range within one year)."""
    for value in (entry.get("assessment_year"), getattr(result, "assessment_year", None)):
        if isinstance(value, int) and not isinstance(value, bool):
            return value
    years = {str(getattr(check, "assessment_period", "") or "")[:4] for check in getattr(result, "checks", []) or []}
    years.discard("")
    return int(years.pop()) if len(years) == 1 and next(iter(years)).isdigit() else None


def to_record(result, kind: str = "score") -> LedgerRecord:
    """A LedgerRecord from any result that gives its ``ledger_entry(kind)`` (or a ready record)."""
    if isinstance(result, LedgerRecord):
        return result
    entry = result.ledger_entry(kind)
    entry["project_path"] = project_key(entry["project_path"])
    entry["factors_used"] = [factor_row(row) for row in entry["factors_used"]]
    entry["assessment_year"] = assessment_year(result, entry)
    entry["carbonledger_version"] = str(getattr(result, "carbonledger_version", None) or __version__)
    return LedgerRecord(**{key: value for key, value in entry.items() if key in _RECORD_KEYS})


_INSERT_CONTENT = "INSERT INTO {table} (sha256, json) VALUES (:sha256, :json) ON CONFLICT DO NOTHING"
_INSERT_RECORD = (
    "INSERT INTO records (run_id, sha256, "
    + ", ".join(name for name in RECORD_FIELDS if name != "run_key")
    + ") VALUES (:run_id, :sha256, "
    + ", ".join(f":{name}" for name in RECORD_FIELDS if name != "run_key")
    + ") ON CONFLICT (run_id, item_key) DO NOTHING"
)


def _write_records(
    db, run_id: int, run_key: str, items: list[tuple[str, LedgerRecord]], who: Recorder, time: str
) -> None:
    """Insert records (with their parameter sets and factor lists) inside the caller's transaction.

    Content rows go in sha256 order and records in item-key order, so two transactions never
    wait for each other in opposite orders (no deadlock on PostgreSQL)."""
    parameters: dict[str, str] = {}
    factors: dict[str, str] = {}
    factor_cache: dict[tuple, tuple[str, str]] = {}
    rows = []
    parameters_cache: dict[int, tuple[str, str]] = {}  # by identity: a rescored project's two records share one dict
    for item_key, record in items:
        if id(record.parameters) not in parameters_cache:
            parameters_cache[id(record.parameters)] = _canonical(record.parameters)
        parameters_json, parameters_sha = parameters_cache[id(record.parameters)]
        parameters[parameters_sha] = parameters_json
        cache_key = (record.factor_set_sha256, tuple(row.get("id") for row in record.factors_used))
        if cache_key not in factor_cache:
            factor_cache[cache_key] = _canonical(record.factors_used)
        factors_json, factors_sha = factor_cache[cache_key]
        factors[factors_sha] = factors_json
        row = {
            "run_key": run_key,
            "item_key": item_key,
            "kind": record.kind,
            "project_path": record.project_path,
            "project_name": record.project_name,
            "project_sha256": record.project_sha256,
            "factor_set": record.factor_set,
            "factor_set_sha256": record.factor_set_sha256,
            "schemes": json.dumps(record.schemes),
            "boundary": record.boundary,
            "gwp": record.gwp,
            "results": _canonical(record.results)[0],
            "parameters_sha256": parameters_sha,
            "factors_sha256": factors_sha,
            "user_name": who.user,
            "host": who.host,
            "carbonledger_version": record.carbonledger_version,
            "assessment_year": record.assessment_year,
            "recorded_at": time,
        }
        row["sha256"] = record_sha256(row)
        row["run_id"] = run_id
        del row["run_key"]
        rows.append(row)
    for table, content in (("parameter_sets", parameters), ("factor_lists", factors)):
        db.run_many(
            _INSERT_CONTENT.format(table=table), [{"sha256": sha, "json": content[sha]} for sha in sorted(content)]
        )
    db.run_many(_INSERT_RECORD, sorted(rows, key=lambda row: row["item_key"]))


def _new_run(db, run_key: str, command: str, who: Recorder, time: str) -> tuple[int, int | None]:
    """The run's row (created unless its key is there): (id, record count or None while open)."""
    db.run(
        "INSERT INTO runs (run_key, time, command, carbonledger_version, user_name, "
        "host) VALUES (:key, :time, :command, :version, :user, :host)"
        " ON CONFLICT (run_key) DO NOTHING",
        {"key": run_key, "time": time, "command": command, "version": __version__, "user": who.user, "host": who.host},
    )
    return db.rows("SELECT id, record_count FROM runs WHERE run_key = :key", {"key": run_key})[0]


def _close(db, run_id: int) -> int:
    count = db.rows("SELECT COUNT(*) FROM records WHERE run_id = :id", {"id": run_id})[0][0]
    db.run(
        "UPDATE runs SET record_count = :count WHERE id = :id AND record_count IS NULL", {"count": count, "id": run_id}
    )
    return count


def _in_transaction(db, write, failed: str):
    """Run ``write()`` in one write transaction on ``db``; a database error becomes one line."""
    try:
        db.begin()
        value = write()
        db.commit()
        return value
    except db.errors as error:
        db.rollback()
        raise db.failure(error, f"a writable run ledger; {failed}") from None
    except BaseException:
        db.rollback()
        raise
    finally:
        db.close()


def record_run(
    command: str, results: Iterable, *, ledger: str | Path | Location | None = None, kind: str = "score"
) -> int | None:
    """Record one run (any number of results) in one transaction; return the run id.

    ``results`` may hold any result with a ``ledger_entry(kind)`` method (ScoreResult,
    LifetimeResult) or ready LedgerRecord objects; they are turned into records before the
    transaction starts, and the transaction writes the run whole or not at all.
    ``ledger=None`` writes to the default ledger ($CARBONLEDGER_LEDGER or the user's data folder).
    """
    db = connect(ledger)
    try:
        items = [(f"{number:09d}", to_record(result, kind)) for number, result in enumerate(results)]
    except BaseException:
        db.close()
        raise
    who, time = recorder(), now_text()

    def write() -> int:
        run_key = uuid.uuid4().hex
        run_id, _ = _new_run(db, run_key, command, who, time)
        _write_records(db, run_id, run_key, items, who, time)
        _close(db, run_id)
        return run_id

    return _in_transaction(db, write, "this run was not recorded")


# ---------------------------------------------------------------------------------------------
# A run written in batches (a portfolio recalc on Dask workers)


@dataclass(frozen=True)
class RunTarget:
    """Where the batches of one run go (picklable: Dask workers receive it with their piece)."""

    ledger: Location
    run_key: str
    command: str
    kind: str
    who: Recorder


def run_key_of(inputs: dict) -> str:
    """A run key derived from everything that decides a run's results (so a rerun is the same run)."""
    return _canonical({"carbonledger_version": __version__, **inputs})[1]


def run_target(ledger: Location, inputs: dict, command: str, kind: str) -> RunTarget:
    """The target of a batched run; an SQLite path is made absolute for workers in other folders."""
    if ledger.path is not None:
        ledger = Location(ledger.shown, path=ledger.path.resolve())
    return RunTarget(ledger, run_key_of(inputs), command, kind, recorder())


def open_run(target: RunTarget) -> bool:
    """Create the run (not yet visible); True when a run with this key is already complete."""
    db = connect(target.ledger)
    return _in_transaction(
        db,
        lambda: _new_run(db, target.run_key, target.command, target.who, now_text())[1] is not None,
        "the run was not opened",
    )


def write_batch(target: RunTarget, items: list[tuple[str, Any]]) -> None:
    """Write one batch of (item key, result) in one transaction. Items already in the run (a
    batch written again, a task retried by Dask) are skipped; a complete run takes nothing more."""
    db = connect(target.ledger)
    try:
        records = [(key, to_record(result, target.kind)) for key, result in items]
    except BaseException:
        db.close()
        raise

    def write() -> None:
        found = db.rows("SELECT id, record_count FROM runs WHERE run_key = :key", {"key": target.run_key})
        if not found:
            raise InputError(
                target.ledger.shown, "--ledger", f"an open run {target.run_key[:12]} (not found; open_run first)"
            )
        run_id, count = found[0]
        if count is None:
            _write_records(db, run_id, target.run_key, records, target.who, now_text())

    _in_transaction(db, write, "this batch was not recorded")


def close_run(target: RunTarget) -> int:
    """Make the run visible with the number of records its batches wrote; returns that number."""
    db = connect(target.ledger)

    def write() -> int:
        run_id, count = db.rows("SELECT id, record_count FROM runs WHERE run_key = :key", {"key": target.run_key})[0]
        return count if count is not None else _close(db, run_id)

    return _in_transaction(db, write, "the run was not closed")


# ---------------------------------------------------------------------------------------------
# Reading: history and export


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


@dataclass(frozen=True)
class RecordFilter:
    """Which records to read: project files (by resolved path), a user, and a time range
    (``since`` inclusive, ``until`` exclusive; ISO 8601 texts in UTC, compared as recorded)."""

    projects: tuple[str, ...] = ()
    user: str | None = None
    since: str | None = None
    until: str | None = None

    def where(self) -> tuple[str, dict]:
        clauses, params = ["runs.record_count IS NOT NULL"], {}
        if self.projects:
            names = [f"p{n}" for n in range(len(self.projects))]
            clauses.append(f"r.project_path IN ({', '.join(':' + name for name in names)})")
            params.update(zip(names, self.projects, strict=True))
        for clause, key, value in (
            ("r.user_name = :user", "user", self.user),
            ("r.recorded_at >= :since", "since", self.since),
            ("r.recorded_at < :until", "until", self.until),
        ):
            if value is not None:
                clauses.append(clause)
                params[key] = value
        return " WHERE " + " AND ".join(clauses), params


def record_filter(
    projects: Iterable[str | Path] = (),
    user: str | None = None,
    since: datetime | None = None,
    until: datetime | None = None,
) -> RecordFilter:
    """A RecordFilter from project paths and datetimes (naive datetimes are taken as UTC)."""

    def iso(moment: datetime | None) -> str | None:
        if moment is None:
            return None
        moment = moment if moment.tzinfo else moment.replace(tzinfo=UTC)
        return moment.astimezone(UTC).isoformat(timespec="milliseconds")

    return RecordFilter(tuple(project_key(p) for p in projects), user, iso(since), iso(until))


_ENTRY_COLUMNS = (
    "record", "run", "run_key", "time", "command", "recorded_at", "user", "host", "carbonledger_version", "kind",
    "project_path", "project", "project_sha256", "factor_set", "factor_set_sha256", "assessment_year", "schemes",
    "boundary", "gwp", "results", "parameters_sha256", "factors_sha256", "sha256",
)  # fmt: skip
_ENTRY_SELECT = (
    "SELECT r.id, r.run_id, runs.run_key, runs.time, runs.command, r.recorded_at, "
    "r.user_name, r.host, r.carbonledger_version, r.kind,"
    " r.project_path, r.project_name, r.project_sha256, r.factor_set, r.factor_set_sha256, "
    "r.assessment_year, r.schemes, r.boundary, r.gwp,"
    " r.results, r.parameters_sha256, r.factors_sha256, r.sha256"
)


def read_records(
    ledger: str | Path | Location | None = None, where: RecordFilter = RecordFilter(), *, content: bool = True
) -> list[dict]:
    """The records of complete runs that pass ``where``, oldest first; with ``content`` also
    their parameters and factor rows, and what changed since the project's record before."""
    db = connect(ledger, create=False)
    clause, params = where.where()
    joins = (
        " JOIN parameter_sets p ON p.sha256 = r.parameters_sha256 JOIN factor_lists f ON f.sha256 = r.factors_sha256"
        if content
        else ""
    )
    try:
        rows = db.rows(
            _ENTRY_SELECT
            + (", p.json, f.json" if content else "")
            + " FROM records r JOIN runs ON runs.id = r.run_id"
            + joins
            + clause
            + " ORDER BY r.id",
            params,
        )
    except db.errors as error:
        raise db.failure(error, "a readable run ledger") from None
    finally:
        db.close()
    entries = []
    previous: dict[str, dict] = {}
    for row in rows:
        entry = dict(zip(_ENTRY_COLUMNS, row[: len(_ENTRY_COLUMNS)], strict=True))
        entry["schemes"] = json.loads(entry["schemes"])
        entry["results"] = json.loads(entry["results"])
        if content:
            entry["parameters"], entry["factors_used"] = json.loads(row[-2]), json.loads(row[-1])
            entry["changes"] = _changes(previous.get(entry["project_path"]), entry)
            previous[entry["project_path"]] = entry
        entries.append(entry)
    return entries


def _changes(previous: dict | None, entry: dict) -> dict | None:
    if previous is None:
        return None
    return {
        "project_file": previous["project_sha256"] != entry["project_sha256"],
        "factor_set": None
        if previous["factor_set_sha256"] == entry["factor_set_sha256"]
        else {"old": previous["factor_set"], "new": entry["factor_set"]},
        "gwp": None if previous["gwp"] == entry["gwp"] else {"old": previous["gwp"], "new": entry["gwp"]},
        "parameters": parameter_changes(previous["parameters"], entry["parameters"]),
        "factors": factor_changes(previous["factors_used"], entry["factors_used"]),
    }


def project_history(
    project_file: str | Path, ledger: str | Path | Location | None = None, where: RecordFilter | None = None
) -> list[dict]:
    """Every record of a project file (matched by its resolved path), oldest first, each with
    what changed since the one before: the project file, parameters, factor set, factor rows."""
    where = where or RecordFilter()
    return read_records(ledger, RecordFilter((project_key(project_file),), where.user, where.since, where.until))


# ---------------------------------------------------------------------------------------------
# Moving a ledger: copy every complete run, record and content row, checked by count and sha256


@dataclass
class CopyReport:
    source: str
    target: str
    runs: int  # complete runs in the source
    records: int  # their records
    runs_copied: int
    records_copied: int
    sha256: str  # of the sorted record sha256s of the source's complete runs, found equal in the target


def _digest(hashes: Iterable[str]) -> str:
    return hashlib.sha256("\n".join(sorted(hashes)).encode("ascii")).hexdigest()


def _contents(db) -> tuple[list[tuple], list[dict], dict[str, dict[str, str]]]:
    """(complete runs, their records as RECORD_FIELDS dicts with sha256, content rows by table)."""
    runs = db.rows(
        "SELECT run_key, time, command, carbonledger_version, user_name, host, "
        "record_count FROM runs WHERE record_count IS NOT NULL ORDER BY id"
    )
    rows = db.rows(
        RECORD_SELECT.replace("SELECT ", "SELECT r.sha256, ", 1) + " WHERE runs.record_count IS NOT NULL ORDER BY r.id"
    )
    records = [{"sha256": row[0], **dict(zip(RECORD_FIELDS, row[1:], strict=True))} for row in rows]
    blobs = {}
    for table, column in (("parameter_sets", "parameters_sha256"), ("factor_lists", "factors_sha256")):
        blobs[table] = dict(
            db.rows(
                f"SELECT sha256, json FROM {table} WHERE sha256 IN (SELECT r.{column} FROM records "
                "r JOIN runs ON runs.id = r.run_id WHERE runs.record_count IS NOT NULL)"
            )
        )
    return runs, records, blobs


def _check_hashes(db, records: list[dict], blobs: dict[str, dict[str, str]], runs: list[tuple]) -> None:
    """Every record's stored sha256 equals the hash of its content, every content row its key,
    and every run holds as many records as it says; else one line naming the ledger."""
    bad = next((row for row in records if record_sha256(row) != row["sha256"]), None)
    if bad is not None:
        raise InputError(
            db.location.shown,
            "--ledger",
            f"records whose content matches their sha256 (record {bad['item_key']} "
            f"of run {bad['run_key'][:12]} does not); nothing was copied",
        )
    for table, content in blobs.items():
        wrong = next(
            (sha for sha, text in content.items() if hashlib.sha256(text.encode("utf-8")).hexdigest() != sha), None
        )
        if wrong is not None:
            raise InputError(
                db.location.shown,
                "--ledger",
                f"{table} rows that match their sha256 ({wrong[:12]} does not); nothing was copied",
            )
    counted: dict[str, int] = {}
    for row in records:
        counted[row["run_key"]] = counted.get(row["run_key"], 0) + 1
    short = next((run for run in runs if counted.get(run[0], 0) != run[6]), None)
    if short is not None:
        raise InputError(
            db.location.shown,
            "--ledger",
            f"runs holding the records they count (run {short[0][:12]} says {short[6]}, "
            f"holds {counted.get(short[0], 0)}); nothing was copied",
        )


def copy_ledger(source: str | Path | Location, target: str | Path | Location) -> CopyReport:
    """Copy every complete run of ``source`` that ``target`` does not hold yet, in one transaction.

    Records keep their content and sha256 (and so their user, host, time and version). Both sides
    are checked: the source's records against their sha256 before, the target's copies after (in
    the transaction, before it commits), and the count and the digest of all the source's record
    sha256s must be found in the target. Copying again adds nothing.
    """
    source, target = locate(source), locate(target)
    if (source.path and target.path and source.path.resolve() == target.path.resolve()) or (
        source.url and source.url == target.url
    ):
        raise InputError(target.shown, "--ledger", "a ledger other than the source; nothing was written")
    src = connect(source, create=False)
    try:
        runs, records, blobs = _contents(src)
    except src.errors as error:
        raise src.failure(error, "a readable run ledger") from None
    finally:
        src.close()
    _check_hashes(src, records, blobs, runs)
    dst = connect(target)

    def write() -> tuple[int, int]:
        held = dict(dst.rows("SELECT run_key, record_count FROM runs"))
        new_runs = [run for run in runs if held.get(run[0], "absent") is None or run[0] not in held]
        new_keys = {run[0] for run in new_runs}
        for key in [key for key in new_keys if key in held]:  # an open run in the target (never visible): replaced
            dst.run("DELETE FROM records WHERE run_id = (SELECT id FROM runs WHERE run_key = :key)", {"key": key})
            dst.run("DELETE FROM runs WHERE run_key = :key", {"key": key})
        dst.run_many(
            "INSERT INTO runs (run_key, time, command, carbonledger_version, user_name, "
            "host) VALUES (:key, :time, :command, :version, :user, :host)",
            [
                dict(zip(("key", "time", "command", "version", "user", "host"), run[:6], strict=True))
                for run in new_runs
            ],
        )
        ids = {key: run_id for run_id, key in dst.rows("SELECT id, run_key FROM runs")}
        copied = [row for row in records if row["run_key"] in new_keys]
        for table, content in blobs.items():
            column = "parameters_sha256" if table == "parameter_sets" else "factors_sha256"
            needed = sorted({row[column] for row in copied})
            dst.run_many(_INSERT_CONTENT.format(table=table), [{"sha256": sha, "json": content[sha]} for sha in needed])
        dst.run_many(
            _INSERT_RECORD,
            [{**{k: v for k, v in row.items() if k != "run_key"}, "run_id": ids[row["run_key"]]} for row in copied],
        )
        dst.run_many(
            "UPDATE runs SET record_count = :count WHERE run_key = :key",
            [{"count": run[6], "key": run[0]} for run in new_runs],
        )
        target_runs, target_records, target_blobs = _contents(dst)
        _check_hashes(dst, target_records, target_blobs, target_runs)
        found = [row["sha256"] for row in target_records if row["run_key"] in {run[0] for run in runs}]
        if len(found) != len(records) or _digest(found) != _digest(row["sha256"] for row in records):
            raise InputError(
                target.shown,
                "--ledger",
                f"a copy holding the source's {len(records)} records (found "
                f"{len(found)}, or different sha256s); nothing was written",
            )
        return len(new_runs), len(copied)

    runs_copied, records_copied = _in_transaction(dst, write, "nothing was copied")
    return CopyReport(
        source.shown,
        target.shown,
        len(runs),
        len(records),
        runs_copied,
        records_copied,
        _digest(row["sha256"] for row in records),
    )
