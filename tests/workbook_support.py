"""Helpers for the workbook tests: write a workbook, recalculate it with an independent engine."""

from __future__ import annotations

import os
import shutil
import subprocess
from collections.abc import Callable
from pathlib import Path

import openpyxl

ROOT = Path(__file__).resolve().parent.parent
DEMO = ROOT / "demo_projects"


def run_cli(*args: str):
    """Run the command line in-process; returns (exit code, stdout, stderr)."""
    from typer.testing import CliRunner

    from carbonledger.cli import app

    result = CliRunner().invoke(app, list(args))
    return result.exit_code, result.stdout, result.stderr


def sheet(workbook, name: str):
    """A sheet by name, ignoring case (the formulas library writes names in capitals)."""
    for title in workbook.sheetnames:
        if title.lower() == name.lower():
            return workbook[title]
    raise KeyError(name)


def recalculate_with_formulas(path: Path, folder: Path):
    """Evaluate every formula with the `formulas` library; returns the values-only workbook."""
    import formulas

    folder.mkdir(parents=True, exist_ok=True)
    model = formulas.ExcelModel().loads(str(path)).finish()
    model.calculate()
    model.write(dirpath=str(folder))
    written = [p for p in folder.iterdir() if p.name.lower() == path.name.lower()]
    return openpyxl.load_workbook(written[0], data_only=True)


def soffice() -> str | None:
    return shutil.which("soffice") or shutil.which("libreoffice")


LIBREOFFICE_JOBS: dict[str, Callable[[Path], Path]] = {}


def libreoffice_job(name: str):
    """Register a workbook for the one LibreOffice recalculation of the session.

    The decorated function writes the workbook to the path it is given and returns it; the
    session fixture ``libreoffice_recalculated`` (conftest.py) writes every registered workbook,
    starts LibreOffice once for all of them, and maps each name to (written, recalculated) paths.
    """

    def register(build: Callable[[Path], Path]) -> Callable[[Path], Path]:
        assert name not in LIBREOFFICE_JOBS, name
        LIBREOFFICE_JOBS[name] = build
        return build

    return register


def recalculate_many_with_libreoffice(paths: list[Path], folder: Path) -> Path:
    """One LibreOffice start converts (and so recalculates) every workbook; returns the output folder.

    LibreOffice headless recalculates formulas without cached values when converting. The file
    names must differ: each converted workbook keeps its name in the output folder.
    """
    assert len({path.name for path in paths}) == len(paths), "workbook names must differ"
    folder.mkdir(parents=True, exist_ok=True)
    home = folder / "home"
    home.mkdir(exist_ok=True)
    environment = dict(os.environ, HOME=str(home))
    command = [
        soffice(),
        f"-env:UserInstallation=file://{home / 'profile'}",
        "--headless",
        "--norestore",
        "--convert-to",
        "xlsx",
        "--outdir",
        str(folder / "out"),
        *map(str, paths),
    ]
    subprocess.run(command, check=True, capture_output=True, env=environment, timeout=900)
    return folder / "out"


def labelled(ws, column: int = 2) -> dict[str, object]:
    """Column A label -> value in ``column`` (first occurrence of each label)."""
    found: dict[str, object] = {}
    for row in ws.iter_rows(min_row=1, max_row=ws.max_row):
        label = row[0].value
        if isinstance(label, str) and label not in found and len(row) >= column:
            found[label] = row[column - 1].value
    return found

# the live verdict formula's words for each engine status (io/workbook/writer.verdict_formula)
VERDICT_WORDS = {"qualifies": "qualifies", "fails": "fails", "not_eligible": "not eligible", "undetermined": "undetermined"}
