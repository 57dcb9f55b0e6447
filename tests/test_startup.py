"""A lean start: each command imports only what it uses, listed here command by command.

Each command runs in a fresh interpreter (``sys.modules`` of that process). ``--help`` loads the
command layer alone; a command's module is imported only when it runs (lazy subcommands, as the
click documentation describes them); heavy libraries are imported by the commands that use them.
Timing is in benchmarks/startup.py and benchmarks/score.py (no timing assertions in tests).
"""

from __future__ import annotations

import json
import subprocess
import sys

import pytest
from helpers import DEMO, run_cli

from carbonledger.cli import COMMANDS, docstring, load_command
from carbonledger.model.project import ProjectInfo

GREEN = DEMO / "green_electrolysis_ammonia.toml"
GREY = DEMO / "grey_smr_ammonia.toml"
SHIPPED = DEMO / "grey_smr_ammonia_shipped.toml"  # the project of benchmarks/score.py
HEAVY = ("bw2calc", "matplotlib", "openpyxl", "CoolProp", "SALib", "dask", "scipy.optimize", "pandas", "chemicals", "pint", "formulas", "pycountry")

PROBE = """
import contextlib, io, json, sys
from carbonledger.cli import main
sys.argv = ["carbonledger", *sys.argv[1:]]
try:
    with contextlib.redirect_stdout(io.StringIO()), contextlib.redirect_stderr(io.StringIO()):
        main()
except SystemExit as stop:
    assert not stop.code, stop.code
print(json.dumps(sorted(sys.modules)))
"""

# command -> the heavy libraries it loads (every other one of HEAVY must stay out)
LOADS = {
    ("--help",): set(),
    ("factors", "--help"): set(),
    ("score", "--help"): set(),
    ("factors", "list"): set(),
    ("schemes",): set(),
    ("params", GREEN): set(),
    ("score", GREEN, "--no-ledger"): {"bw2calc", "pandas"},  # the solver (bw2calc brings pandas)
    ("score", GREEN, "--format", "json", "--no-ledger"): {"bw2calc", "pandas"},
    ("compare", GREEN, GREY, "--no-ledger"): {"bw2calc", "pandas"},
}


def modules_of(*args) -> set[str]:
    out = subprocess.run([sys.executable, "-c", PROBE, *map(str, args)], capture_output=True, text=True, check=True)
    return set(json.loads(out.stdout.strip().splitlines()[-1]))


@pytest.mark.parametrize("args", list(LOADS), ids=[" ".join(str(a).rsplit("/", 1)[-1] for a in args) for args in LOADS])
def test_each_command_loads_only_the_libraries_it_uses(args, tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    loaded = modules_of(*args)
    assert {name for name in HEAVY if name in loaded} == LOADS[args]
    assert "CoolProp" not in loaded  # a test dependency only: the liquid-hydrogen states are stored


def test_help_imports_the_command_layer_alone():
    loaded = modules_of("--help")
    assert sorted(name for name in loaded if name.startswith("carbonledger")) == ["carbonledger", "carbonledger.about", "carbonledger.cli", "carbonledger.cli.words"]


def test_the_command_list_reads_each_command_docstring():
    # the short help of --help is the first sentence of the function the command runs
    help_text = run_cli("--help").stdout
    for name in COMMANDS:
        command = load_command(name)
        assert command.name == name
        assert command.help.split(".")[0][:30] == docstring(name).split(".")[0][:30]
        assert name in help_text


def test_score_imports_no_analysis_it_does_not_run(tmp_path, monkeypatch):
    """`carbonledger.api` is one module per command family, resolved lazily: `score` loads
    api.scoring, never the other families nor the analyses and outputs behind them."""
    monkeypatch.chdir(tmp_path)
    loaded = modules_of("score", GREEN, "--format", "json", "--no-ledger")
    assert "carbonledger.api.scoring" in loaded
    others = ["workbooks", "comparison", "portfolios", "operating_plan", "monte_carlo", "levers", "reports", "evidence_pack"]
    unused = {f"carbonledger.api.{name}" for name in others} | {
        f"carbonledger.analyses.{name}" for name in ("qualify", "uncertainty", "headroom", "sensitivity", "plan", "lifetime", "compare", "cluster", "periods")
    } | {"carbonledger.io.report", "carbonledger.io.workbook.writer", "carbonledger.io.workbook.reader", "carbonledger.model.levers", "carbonledger.model.distributions"}
    assert sorted(loaded & unused) == []


def test_the_api_facade_gives_every_public_name():
    """Each name of ``carbonledger.api.__all__`` and ``WHERE`` resolves to the function of its module."""
    import carbonledger.api as api

    for name in {*api.__all__, *api.WHERE}:
        assert getattr(api, name) is not None, name
    assert api.score.__module__ == "carbonledger.api.scoring" and api.recalc.__module__ == "carbonledger.api.portfolios"


def test_the_shipped_score_in_json_loads_no_table_printer_nor_country_list(tmp_path, monkeypatch):
    """The score of benchmarks/score.py (issue 18: at most 1.15 times `import bw2calc`): rich prints
    tables only, pycountry is read only for a project naming a country (none of the demos does),
    CoolProp and chemicals are test dependencies (the stored states are read instead)."""
    monkeypatch.chdir(tmp_path)
    loaded = modules_of("score", SHIPPED, "--format", "json", "--no-ledger")
    assert sorted(name for name in ("rich", "pycountry", "CoolProp", "chemicals", "matplotlib", "openpyxl", "pint", "SALib", "dask", "highspy", "jinja2") if name in loaded) == []


def test_a_project_naming_a_country_is_still_checked():
    """pycountry, loaded on first use, still refuses a code ISO 3166-1 does not assign (XK is
    user-assigned, not in the standard's list; PR is Puerto Rico's own alpha-2 code)."""
    assert ProjectInfo(name="x", product="ammonia", country="pr").country == "PR"
    with pytest.raises(ValueError, match="ISO 3166-1 alpha-2"):
        ProjectInfo(name="x", product="ammonia", country="XK")
