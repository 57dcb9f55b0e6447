"""The output formats, written once (carbonledger.io.formats): every command offers the same formats,
and a further format is one function of the JSON document and one registration."""

from __future__ import annotations

import importlib
import json
import typing

import pytest
from helpers import DEMO, run_cli

from carbonledger.cli import COMMANDS, GROUPS
from carbonledger.cli.options import render
from carbonledger.io import formats as formats_module
from carbonledger.io.formats import formats, output_text, register_format


def command_functions():
    """(command path, its function) of every command, the factors and ledger subcommands included."""
    for name, (module_name, function_name) in COMMANDS.items():
        module = importlib.import_module(f"carbonledger.cli.{module_name}")
        if name in GROUPS:
            yield from ((f"{name} {info.name or info.callback.__name__}", info.callback) for info in module.app.registered_commands)
        else:
            yield name, getattr(module, function_name)


def format_choices(function) -> list[str] | None:
    """The --format choices of a command function (the enum its output_format parameter is typed with)."""
    hints = typing.get_type_hints(function, include_extras=True)
    if "output_format" not in hints:
        return None
    enum = typing.get_args(hints["output_format"])[0]
    return [member.value for member in enum]


def test_every_command_offers_every_format():
    offered = {path: choices for path, function in command_functions() if (choices := format_choices(function)) is not None}
    assert offered.pop("ledger export") == ["csv", "json"]  # a file export of the ledger's records, not a command's output
    assert len(offered) >= 15, offered  # score, compare, uncertainty, ... and the factors and ledger subcommands
    assert {tuple(choices) for choices in offered.values()} == {formats()}
    assert {"score", "compare", "uncertainty", "qualify", "recalc"} <= set(offered)


@pytest.fixture
def keys_format():
    """A format of our own for the test: the top-level keys of the JSON document, one per line."""
    register_format("keys", lambda document: "\n".join(sorted(document)))
    yield "keys"
    formats_module.FROM_JSON.pop("keys")


def test_a_registered_format_is_one_function_of_the_json_document(keys_format):
    assert formats() == ("table", "json", "csv", "keys")
    text = output_text(keys_format, table=lambda: "t", json_text=lambda: '{"total": 1.5, "caution": "c"}', csv=lambda: "c")
    assert text == "caution\ntotal\n"


def test_a_registered_format_reaches_a_command_through_its_json(keys_format, tmp_path):
    """A command's renderer gives the registered format the JSON it writes for --format json."""
    result = run_cli("score", DEMO / "grey_smr_ammonia.toml", "--format", "json", "--no-ledger")
    assert result.exit_code == 0, result.output
    written = render(keys_format, table=lambda: "", json=lambda: result.stdout, csv=lambda: "")
    assert written.split() == sorted(json.loads(result.stdout))
    assert "caution" in written.split()


def test_the_built_in_names_cannot_be_taken():
    with pytest.raises(ValueError):
        register_format("json", lambda document: "")
