"""A consultant entering their own site (issue 19): `init` marks every starter number as a
placeholder, and `score` warns while any mark remains (the starter figures are not the plant's)."""

from __future__ import annotations

import re

import pytest
from helpers import run_cli

from carbonledger.routes.starter import PLACEHOLDER, placeholders_left, starter_choices


@pytest.mark.parametrize("route", sorted(starter_choices()))
def test_every_starter_number_is_marked_and_the_file_still_scores(route, tmp_path):
    path = tmp_path / "site.toml"
    assert run_cli("init", path, "--route", route, "--product", "ammonia").exit_code == 0
    text = path.read_text(encoding="utf-8")
    numbers = [line for line in text.splitlines() if re.match(r"^\s*[\w.]+\s*=\s*-?[\d.]+", line)]
    assert numbers and all(PLACEHOLDER in line for line in numbers)
    assert len(placeholders_left(text)) == len(numbers)
    result = run_cli("score", path, "--no-ledger", "--format", "json")
    assert result.exit_code == 0, result.output
    assert f"{len(numbers)} numbers are still the starter's placeholders" in result.stderr
    assert result.stdout.lstrip().startswith("{")  # the warning stays out of the JSON


def test_no_warning_once_the_marks_are_gone(tmp_path):
    path = tmp_path / "site.toml"
    run_cli("init", path, "--route", "electrolysis", "--product", "hydrogen")
    path.write_text(path.read_text(encoding="utf-8").replace(PLACEHOLDER, "#"), encoding="utf-8")
    result = run_cli("score", path, "--no-ledger")
    assert result.exit_code == 0 and "placeholder" not in result.stderr
