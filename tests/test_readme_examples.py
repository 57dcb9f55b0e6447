"""The README's examples run: every fenced ``bash`` block of commands that start with `carbonledger`
is executed, line by line, against the demo projects (in-process, in a scratch folder that sees
the repository's `demo_projects/`), and each command must succeed. The set-up blocks are checked
against what `.ci/run` runs. The README stays a user guide of at most 400 lines (issue 19)."""

from __future__ import annotations

import re
import shlex

import pytest
from helpers import ROOT, run_cli

README = (ROOT / "README.md").read_text(encoding="utf-8")
BLOCKS = re.findall(r"^```bash\n(.*?)^```", README, re.M | re.S)


def commands(block: str) -> list[list[str]]:
    """The commands of a block: continuation lines joined, comments dropped, shell-split."""
    joined = block.replace("\\\n", " ")
    return [shlex.split(line, comments=True) for line in joined.splitlines() if line.strip() and not line.lstrip().startswith("#")]


COMMAND_BLOCKS = [block for block in BLOCKS if all(words[0] == "carbonledger" for words in commands(block))]


def test_the_readme_is_a_short_user_guide():
    assert len(README.splitlines()) <= 400
    assert README.count("**Caution.**") == 1  # the caution once, prominently
    assert len(COMMAND_BLOCKS) >= 5


def test_the_set_up_commands_are_what_ci_runs():
    ci = (ROOT / ".ci" / "run").read_text(encoding="utf-8")
    setup = [block.strip() for block in BLOCKS if block.strip().startswith("pip install")]
    assert 'pip install -e ".[test]" && python -m pytest' in setup
    assert any("for f in demo_projects/*.toml; do carbonledger score" in block for block in setup)
    assert "python -m pytest\n" in ci and 'pip install -q -e ".[test,docs]"' in ci


@pytest.mark.parametrize("block", COMMAND_BLOCKS, ids=[commands(b)[0][1] + f"-{i}" for i, b in enumerate(COMMAND_BLOCKS)])
def test_each_readme_command_block_runs_on_the_demos(block, tmp_path, monkeypatch):
    (tmp_path / "demo_projects").symlink_to(ROOT / "demo_projects")
    monkeypatch.chdir(tmp_path)
    for words in commands(block):
        if words[1] == "score" and "my_site.toml" in words and not (tmp_path / "my_site.toml").exists():
            assert run_cli("init", "my_site.toml", "--route", "electrolysis", "--product", "hydrogen").exit_code == 0
        result = run_cli(*words[1:])
        assert result.exit_code == 0, (words, result.output[-2000:])
        assert "Traceback" not in result.output
