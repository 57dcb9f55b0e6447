"""A ledger under test on either backend, read with the database's own client library
(``sqlite3`` or ``psycopg`` as the server's superuser), never through carbonledger's code."""

from __future__ import annotations

import contextlib
import hashlib
import json
import sqlite3
from dataclasses import dataclass
from urllib.parse import urlsplit


@dataclass
class LedgerUnderTest:
    url: str  # an SQLite file path, or a postgresql:// URL without password
    server: object  # pg_support.Server, or None for SQLite

    @property
    def backend(self) -> str:
        return "sqlite" if self.server is None else "postgresql"

    def sql(self, query: str, params: tuple = ()) -> list[tuple]:
        if self.server is None:
            # closed at once: an sqlite3 connection left to the garbage collector keeps its view of
            # the WAL index while other processes write (and the collector may run late)
            with contextlib.closing(sqlite3.connect(self.url)) as connection:
                return connection.execute(query, params).fetchall()
        with self.server.superuser(urlsplit(self.url).path.lstrip("/")) as connection:
            cursor = connection.execute(query.replace("?", "%s"), params)
            return cursor.fetchall() if cursor.description else []

    def counts(self) -> tuple[list[tuple], dict]:
        """(id, record_count) of every run, and records per run id, after the integrity checks below."""
        runs = self.sql("SELECT id, record_count FROM runs ORDER BY id")
        records = dict(self.sql("SELECT run_id, COUNT(*) FROM records GROUP BY run_id"))
        self.check_integrity()
        return runs, records

    def check_integrity(self) -> None:
        """The database's own check (SQLite), no record without its content rows or run, no item
        twice in a run, and every record's sha256 equal to sha256 of its fields as stored, here
        recomputed from the schema's documented field list."""
        if self.server is None:
            assert self.sql("PRAGMA integrity_check")[0][0] == "ok"
        assert self.sql("SELECT COUNT(*) FROM records r LEFT JOIN parameter_sets p ON p.sha256 = r.parameters_sha256 WHERE p.sha256 IS NULL")[0][0] == 0
        assert self.sql("SELECT COUNT(*) FROM records r LEFT JOIN factor_lists f ON f.sha256 = r.factors_sha256 WHERE f.sha256 IS NULL")[0][0] == 0
        assert self.sql("SELECT COUNT(*) FROM records r LEFT JOIN runs ON runs.id = r.run_id WHERE runs.id IS NULL")[0][0] == 0
        assert self.sql("SELECT COUNT(*) FROM (SELECT run_id, item_key FROM records GROUP BY run_id, item_key HAVING COUNT(*) > 1) AS twice")[0][0] == 0
        for sha, json_text in self.sql("SELECT sha256, json FROM parameter_sets") + self.sql("SELECT sha256, json FROM factor_lists"):
            assert hashlib.sha256(json_text.encode("utf-8")).hexdigest() == sha
        fields = (
            "runs.run_key, r.item_key, r.kind, r.project_path, r.project_name, r.project_sha256, r.factor_set, r.factor_set_sha256, r.schemes, r.boundary, r.gwp,"
            " r.results, r.parameters_sha256, r.factors_sha256, r.user_name, r.host, r.carbonledger_version, r.assessment_year, r.recorded_at"
        )
        for row in self.sql(f"SELECT r.sha256, {fields} FROM records r JOIN runs ON runs.id = r.run_id"):
            text = json.dumps(list(row[1:]), separators=(",", ":"), ensure_ascii=False)
            assert hashlib.sha256(text.encode("utf-8")).hexdigest() == row[0]
