"""The wheel ships what the tool needs: every package of carbonledger/ and the factor library.

(.ci/run also builds the wheel, installs it into a fresh virtual environment and scores every
demo project from a folder outside the repository.)"""

from __future__ import annotations

import tomllib
from pathlib import Path

import pytest

import carbonledger
from carbonledger.about import __version__
from carbonledger.errors import InputError
from carbonledger.model.rulebooks import load_schemes

ROOT = Path(__file__).resolve().parent.parent
PYPROJECT = tomllib.loads((ROOT / "pyproject.toml").read_text(encoding="utf-8"))


def test_pyproject_lists_every_package_and_maps_the_factor_library():
    package_root = Path(carbonledger.__file__).resolve().parent
    on_disk = {".".join(("carbonledger",) + p.parent.relative_to(package_root).parts) for p in package_root.rglob("__init__.py")}
    listed = set(PYPROJECT["tool"]["setuptools"]["packages"])
    assert on_disk <= listed
    assert PYPROJECT["tool"]["setuptools"]["package-dir"]["carbonledger.factor_library"] == "factors"
    data = PYPROJECT["tool"]["setuptools"]["package-data"]["carbonledger.factor_library"]
    assert "schemes/*.toml" in data and "sets/*/*.csv" in data and "sets/*/*.toml" in data and "uncertainty/*.toml" in data


def test_the_version_is_stated_once():
    assert PYPROJECT["project"]["dynamic"] == ["version"]
    assert PYPROJECT["tool"]["setuptools"]["dynamic"]["version"] == {"attr": "carbonledger.about.__version__"}
    assert __version__.count(".") == 2


def test_no_rulebooks_is_an_error_not_an_empty_list(tmp_path):
    (tmp_path / "schemes").mkdir()
    with pytest.raises(InputError, match="none found"):
        load_schemes(tmp_path / "schemes")
    with pytest.raises(InputError, match="none found"):
        load_schemes(tmp_path / "missing")
