"""A throwaway PostgreSQL server for the ledger tests: ``initdb`` and ``pg_ctl`` from the
``postgresql`` system package, run as a non-root user (PostgreSQL refuses to run as root: when
the tests run as root, the server runs as the ``postgres`` user the package creates).

The server listens on 127.0.0.1 at a free port. The superuser connects over the Unix socket
without a password (``trust``); TCP connections need a password (``scram-sha-256``), which the
tests give to libpq in ``PGPASSWORD`` only, never in a URL.
"""

from __future__ import annotations

import glob
import os
import shutil
import socket
import subprocess
import tempfile
import uuid
from dataclasses import dataclass
from pathlib import Path

LEDGER_ROLE = "analyst"
LEDGER_PASSWORD = "test-only-" + uuid.uuid4().hex[:12]


def postgres_binaries() -> Path | None:
    """The folder holding initdb and pg_ctl (on PATH, or the Debian package's versioned folder)."""
    found = shutil.which("initdb")
    if found and shutil.which("pg_ctl"):
        return Path(os.path.realpath(found)).parent
    candidates = sorted(glob.glob("/usr/lib/postgresql/*/bin/initdb"))
    return Path(candidates[-1]).parent if candidates else None


def _free_port() -> int:
    with socket.socket() as probe:
        probe.bind(("127.0.0.1", 0))
        return probe.getsockname()[1]


@dataclass
class Server:
    folder: Path
    port: int
    binaries: Path
    as_user: list[str]

    def url(self, database: str, role: str = LEDGER_ROLE) -> str:
        return f"postgresql://{role}@127.0.0.1:{self.port}/{database}"

    def superuser(self, database: str = "postgres"):
        import psycopg

        return psycopg.connect(host=str(self.folder), port=self.port, dbname=database, user="postgres", autocommit=True)

    def new_database(self, owner: str = LEDGER_ROLE) -> str:
        name = "ledger_" + uuid.uuid4().hex[:10]
        with self.superuser() as connection:
            connection.execute(f'CREATE DATABASE "{name}" OWNER "{owner}"')
        return name

    def stop(self) -> None:
        subprocess.run([*self.as_user, str(self.binaries / "pg_ctl"), "-D", str(self.folder / "data"), "-m", "immediate", "stop"], capture_output=True)
        shutil.rmtree(self.folder, ignore_errors=True)


def start_server() -> Server | None:
    """initdb a new cluster in a temporary folder and start it; None when PostgreSQL is not installed."""
    binaries = postgres_binaries()
    if binaries is None:
        return None
    folder = Path(tempfile.mkdtemp(prefix="carbonledger-pg-"))
    as_user: list[str] = []
    if os.geteuid() == 0:
        shutil.chown(folder, "postgres", "postgres")
        as_user = ["runuser", "-u", "postgres", "--"]
    port = _free_port()
    data = folder / "data"
    setup = subprocess.run([*as_user, str(binaries / "initdb"), "-D", str(data), "-U", "postgres", "-A", "trust", "-E", "UTF8", "--no-sync"], capture_output=True, text=True)
    if setup.returncode != 0:
        raise RuntimeError(f"initdb failed: {setup.stderr}")
    (data / "pg_hba.conf").write_text("local all all trust\nhost all all 127.0.0.1/32 scram-sha-256\n", encoding="utf-8")
    options = f"-c listen_addresses=127.0.0.1 -c port={port} -c unix_socket_directories={folder} -c fsync=off -c max_connections=60"
    started = subprocess.run([*as_user, str(binaries / "pg_ctl"), "-D", str(data), "-o", options, "-l", str(folder / "log"), "-w", "-t", "60", "start"], capture_output=True, text=True)
    if started.returncode != 0:
        raise RuntimeError(f"pg_ctl start failed: {started.stdout} {(folder / 'log').read_text() if (folder / 'log').exists() else ''}")
    server = Server(folder, port, binaries, as_user)
    with server.superuser() as connection:
        connection.execute(f"CREATE ROLE {LEDGER_ROLE} LOGIN PASSWORD '{LEDGER_PASSWORD}'")
    return server
