from __future__ import annotations

import os
import sys
import textwrap
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
DEMO = ROOT / "demo_projects"
sys.path.insert(0, str(ROOT))
os.environ.setdefault("MPLBACKEND", "Agg")


@pytest.fixture(autouse=True)
def _ledger_in_tmp(tmp_path, monkeypatch):
    """Every test records runs in its own temporary ledger, never in the user's data folder."""
    path = tmp_path / "ledger.sqlite"
    monkeypatch.setenv("CARBONLEDGER_LEDGER", str(path))
    return path


@pytest.fixture
def write_project(tmp_path):
    """Write a project TOML (dedented text) into a temporary folder and return its path."""

    def write(text: str, name: str = "project.toml") -> Path:
        path = tmp_path / name
        path.write_text(textwrap.dedent(text), encoding="utf-8")
        return path

    return write
