"""Where a run ledger lives, and one small database interface over SQLite and PostgreSQL.

A ledger is an SQLite file (the embedded default; Python's own ``sqlite3``) or a PostgreSQL
database named by a ``postgresql://`` URL (SQLAlchemy Core with the psycopg 3 driver, imported
only when a URL is used, so commands that record in a file do not pay for the import). Both
backends run the same SQL text with named parameters (``:name``); ``io/ledger.py`` holds the
one implementation of records, history, export and copy, ``io/ledger_schema.py`` the numbered
migrations.

Passwords never appear on the command line, in output or in records: a URL that carries one is
refused (libpq reads it from ``PGPASSWORD``, ``~/.pgpass`` or a service file in ``PGSERVICEFILE``),
and every message names the URL with any password replaced by ``***``.

References
----------
.. [1] SQLAlchemy 2 documentation, "Working with Engines and Connections" and the psycopg dialect
   (https://docs.sqlalchemy.org/en/20/dialects/postgresql.html#module-sqlalchemy.dialects.postgresql.psycopg).
.. [2] PostgreSQL documentation, libpq "Connection Strings", "Environment Variables", "The Password
   File" and "The Connection Service File" (https://www.postgresql.org/docs/current/libpq.html).
"""

from __future__ import annotations

import functools
import os
import sqlite3
from dataclasses import dataclass
from pathlib import Path
from urllib.parse import urlsplit

from ..errors import InputError

LEDGER_ENV = "CARBONLEDGER_LEDGER"
SERVER_SCHEMES = ("postgresql", "postgres", "postgresql+psycopg")
BUSY_TIMEOUT_S = 60.0
CONNECT_TIMEOUT_S = 10


@dataclass(frozen=True)
class Location:
    """A ledger's place: an SQLite file (``path``) or a PostgreSQL URL (``url``), and how it is shown."""

    shown: str  # the path, or the URL with any password replaced by ***
    path: Path | None = None
    url: str | None = None

    @property
    def on_server(self) -> bool:
        return self.url is not None

    def __str__(self) -> str:
        return self.shown


def shown_url(text: str) -> str:
    """A URL with its password, if any, replaced by ``***`` (nothing else changed)."""
    try:
        parts = urlsplit(text)
        password = parts.password
    except ValueError:
        return text.split("://", 1)[0] + "://***"
    if not password:
        return text
    user, _, host = parts.netloc.rpartition("@")
    name = user.split(":", 1)[0]
    return parts._replace(netloc=f"{name}:***@{host}").geturl()


def default_location_text() -> str:
    """$CARBONLEDGER_LEDGER, else ``ledger.sqlite`` in the user's data directory."""
    env = os.environ.get(LEDGER_ENV)
    if env:
        return env
    from platformdirs import user_data_path

    return str(user_data_path("carbonledger", appauthor=False) / "ledger.sqlite")


def locate(ledger: str | Path | Location | None = None) -> Location:
    """Where a ledger is: a file path or a ``postgresql://`` URL (None: the default ledger).

    A URL with another scheme, or one that carries a password, is refused with one line.
    """
    if isinstance(ledger, Location):
        return ledger
    text = str(ledger) if ledger is not None and str(ledger) else default_location_text()
    if "://" not in text:
        return Location(text, path=Path(text))
    shown = shown_url(text)
    scheme = text.split("://", 1)[0].lower()
    if scheme not in SERVER_SCHEMES:
        raise InputError(
            shown,
            "--ledger",
            f"an SQLite file path or a postgresql:// URL (unknown scheme '{scheme}'); nothing was written",
        )
    try:
        password = urlsplit(text).password
    except ValueError as error:
        raise InputError(shown, "--ledger", f"a well-formed postgresql:// URL ({error}); nothing was written") from None
    if password:
        raise InputError(
            shown,
            "--ledger",
            "a URL without a password (give it to libpq in PGPASSWORD, ~/.pgpass "
            "or a service file, never on the command line); nothing was written",
        )
    return Location(shown, url=text)


class Database:
    """One open connection to a ledger: transactions and SQL text with named parameters."""

    dialect = ""

    def __init__(self, location: Location):
        self.location = location

    def failure(self, error: Exception, expected: str) -> InputError:
        """A database error as one line naming the ledger (never its password)."""
        return InputError(self.location.shown, "--ledger", f"{expected} ({first_line(error)})")


def first_line(error: Exception) -> str:
    """The first line of a database error's own message (without the SQL and links SQLAlchemy adds)."""
    text = str(getattr(error, "orig", None) or error).strip()
    return (text.splitlines() or [type(error).__name__])[0]


class SqliteDatabase(Database):
    """An SQLite ledger file: WAL journal, a busy timeout, ``BEGIN IMMEDIATE`` for writes."""

    dialect = "sqlite"

    def __init__(self, location: Location, path: Path | None = None):
        super().__init__(location)
        self.connection = sqlite3.connect(path or location.path, timeout=BUSY_TIMEOUT_S, isolation_level=None)

    def begin(self) -> None:
        self.connection.execute("BEGIN IMMEDIATE")

    def commit(self) -> None:
        self.connection.execute("COMMIT")

    def rollback(self) -> None:
        if self.connection.in_transaction:
            self.connection.execute("ROLLBACK")

    def rows(self, sql: str, params: dict | None = None) -> list[tuple]:
        return self.connection.execute(sql, params or {}).fetchall()

    def run(self, sql: str, params: dict | None = None) -> int:
        """Run one statement; the number of rows it changed."""
        return self.connection.execute(sql, params or {}).rowcount

    def run_many(self, sql: str, rows: list[dict]) -> None:
        if rows:
            self.connection.executemany(sql, rows)

    def tables(self) -> set[str]:
        return {row[0] for row in self.rows("SELECT name FROM sqlite_master WHERE type = 'table'")}

    def close(self) -> None:
        self.connection.close()

    errors = (sqlite3.Error,)


@functools.cache
def server_engine(url: str):
    """One SQLAlchemy engine per URL and process (Dask workers keep theirs between batches)."""
    from sqlalchemy import create_engine
    from sqlalchemy.engine import make_url

    parsed = make_url(url)
    parsed = parsed.set(drivername="postgresql+psycopg")
    connect_args = {} if "connect_timeout" in parsed.query else {"connect_timeout": CONNECT_TIMEOUT_S}
    return create_engine(parsed, connect_args=connect_args, pool_size=2, max_overflow=4)


def server_errors() -> tuple[type[Exception], ...]:
    from sqlalchemy.exc import SQLAlchemyError

    return (SQLAlchemyError,)


class ServerDatabase(Database):
    """A PostgreSQL ledger through SQLAlchemy Core and psycopg 3 (read committed; ``BEGIN`` for writes)."""

    dialect = "postgresql"

    def __init__(self, location: Location):
        from sqlalchemy import text

        super().__init__(location)
        self.text = functools.cache(text)
        self.errors = server_errors()
        self.connection = server_engine(location.url).connect()

    def begin(self) -> None:
        if self.connection.in_transaction():
            self.connection.rollback()  # a read-only transaction SQLAlchemy began on its own
        self.connection.begin()

    def commit(self) -> None:
        self.connection.commit()

    def rollback(self) -> None:
        if self.connection.in_transaction():
            self.connection.rollback()

    def rows(self, sql: str, params: dict | None = None) -> list[tuple]:
        return [tuple(row) for row in self.connection.execute(self.text(sql), params or {})]

    def run(self, sql: str, params: dict | None = None) -> int:
        return self.connection.execute(self.text(sql), params or {}).rowcount

    def run_many(self, sql: str, rows: list[dict]) -> None:
        if rows:
            self.connection.execute(self.text(sql), rows)

    def tables(self) -> set[str]:
        # pg_class lists every table, view and sequence of the schema, whoever may read it
        # (information_schema shows only those the user has rights on)
        return {
            row[0]
            for row in self.rows(
                "SELECT c.relname FROM pg_catalog.pg_class c WHERE c.relnamespace = to_regnamespace(current_schema()) "
                "AND c.relkind IN ('r', 'p', 'v', 'm', 'f')"
            )
        }

    def close(self) -> None:
        self.rollback()
        self.connection.close()


def open_server(location: Location) -> ServerDatabase:
    """Connect to a PostgreSQL ledger; a refused connection or password is one line naming the URL."""
    try:
        return ServerDatabase(location)
    except server_errors() as error:
        raise InputError(
            location.shown,
            "--ledger",
            f"a PostgreSQL server that accepts the connection ({first_line(error)}); nothing was written",
        ) from None
    except ImportError as error:
        raise InputError(
            location.shown, "--ledger", f"SQLAlchemy and psycopg installed for a PostgreSQL ledger ({error})"
        ) from None
