"""Shared helpers for the tests: run the command line in-process, write small files."""

from __future__ import annotations

from pathlib import Path

from typer.testing import CliRunner

from carbonledger.cli import app

ROOT = Path(__file__).resolve().parent.parent
DEMO = ROOT / "demo_projects"
PORTFOLIO = DEMO / "portfolio"
FACTOR_HEADER = "id,value,unit,source,table,year,region,note,from_memory\n"


def run_cli(*args: str):
    return CliRunner().invoke(app, [str(a) for a in args])


def assert_one_line_error(result, code: int = 2) -> None:
    assert result.exit_code == code, (result.exit_code, result.output)
    lines = [line for line in result.stderr.splitlines() if line.strip()]
    assert len(lines) == 1 and lines[0].startswith("error: "), result.stderr
    assert "Traceback" not in result.output


def write(path: Path, text: str) -> Path:
    path.parent.mkdir(parents=True, exist_ok=True)
    path.write_text(text, encoding="utf-8")
    return path


def assessment_with(factors="default-2026", gwp: str = "ar6", schemes=None, overrides=None, boundary=None, year=None, matching=None):
    """An ``Assessment`` from the options a test names (a factor set name, folder, CSV or loaded set; lists for
    schemes and overrides), as the command line builds one."""
    from carbonledger.api import Assessment, factor_set_of

    return Assessment(factor_set_of(factors), gwp, tuple(schemes) if schemes else None, tuple(overrides or ()), boundary, year, matching)
