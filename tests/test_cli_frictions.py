"""Small frictions of the first hour (issue 8): version, route names as written in project files,
file names that need quoting, an output path with the wrong suffix."""

from __future__ import annotations

import tomllib

import pytest
from helpers import DEMO, assert_one_line_error, run_cli

from carbonledger.about import __version__
from carbonledger.routes.project import load_project


def test_version():
    result = run_cli("--version")
    assert result.exit_code == 0 and result.stdout.strip() == f"carbonledger {__version__}"


@pytest.mark.parametrize("route", ["electrolysis", "methane-pyrolysis", "steam_methane_reforming_with_capture", "steam-methane-reforming-with-capture", "Autothermal-Reforming"])
def test_init_takes_route_names_as_project_files_write_them(tmp_path, route):
    path = tmp_path / "p.toml"
    result = run_cli("init", path, "--route", route, "--product", "ammonia")
    assert result.exit_code == 0, result.output
    project, _ = load_project(path)
    assert project.hydrogen.route == route.lower().replace("-", "_").removesuffix("_with_capture")


def test_init_with_a_quote_or_backslash_in_the_name_writes_valid_toml(tmp_path):
    path = tmp_path / 'plant "north" \\ phase 1.toml'
    result = run_cli("init", path, "--route", "electrolysis")
    assert result.exit_code == 0, result.output
    data = tomllib.loads(path.read_text(encoding="utf-8"))
    assert data["project"]["name"] == 'plant "north" \\ phase 1'


def test_init_unknown_route_is_one_line(tmp_path):
    assert_one_line_error(run_cli("init", tmp_path / "p.toml", "--route", "plasma"))


def test_workbook_output_must_be_xlsx(tmp_path):
    out = tmp_path / "out.csv"
    assert_one_line_error(run_cli("workbook", DEMO / "grey_smr_ammonia.toml", "-o", out, "--no-ledger"))
    assert not out.exists()


def test_workbook_output_that_is_a_folder_is_refused_even_with_force(tmp_path):
    folder = tmp_path / "out.xlsx"
    folder.mkdir()
    assert_one_line_error(run_cli("workbook", DEMO / "grey_smr_ammonia.toml", "-o", folder, "--force", "--no-ledger"))
    assert folder.is_dir()
