"""Command line: a thin typer layer over the library API (``carbonledger.api``).

Every bad input ends in one line on stderr (``error: FILE: FIELD: expected ...``) and exit code 2.
Each command module holds plain functions; this module builds the app and registers them by name.
A command's module (and with it the library it needs) is imported only when that command runs, so
``carbonledger --help`` imports typer and this module alone: the command list is read from the
command functions' docstrings in the source, without importing them (the lazy subcommands of the
click documentation, "Advanced patterns: lazily loading subcommands").
"""

from __future__ import annotations

import ast
import functools
import gc
import importlib
import sys
from pathlib import Path
from typing import Annotated

import typer
from typer.core import TyperCommand

from ..about import __version__
from .words import WordsGroup, words_for_types

# name -> (module of carbonledger.cli, function); "factors" is a group: the module's ``app``
COMMANDS = {
    "score": ("project_commands", "score"),
    "params": ("project_commands", "params"),
    "compare": ("compare", "compare"),
    "workbook": ("workbook", "workbook"),
    "report": ("report", "report"),
    "recalc": ("recalc", "recalc"),
    "history": ("recalc", "history"),
    "plan": ("plan", "plan"),
    "schemes": ("project_commands", "schemes"),
    "uncertainty": ("uncertainty", "uncertainty"),
    "headroom": ("uncertainty", "headroom"),
    "qualify": ("qualify", "qualify"),
    "sensitivity": ("uncertainty", "sensitivity"),
    "init": ("project_commands", "init"),
    "pack": ("pack", "pack"),
    "verify": ("pack", "verify"),
    "factors": ("factors", "factors"),
    "ledger": ("ledger", "ledger"),
}
GROUPS = {"factors", "ledger"}


@functools.cache
def load_command(name: str):
    """The click command of ``name``, built once per process (its module imported now)."""
    module_name, function_name = COMMANDS[name]
    module = importlib.import_module(f"{__name__}.{module_name}")
    if name in GROUPS:
        command = typer.main.get_command(module.app)
    else:
        single = typer.Typer(cls=WordsGroup, rich_markup_mode=None, add_completion=False)
        single.command(name)(getattr(module, function_name))
        command = typer.main.get_command(single)
    command.name = name
    return command


@functools.cache
def docstring(name: str) -> str:
    """The docstring of a command's function, read from its module's source (nothing imported)."""
    module_name, function_name = COMMANDS[name]
    tree = ast.parse((Path(__file__).parent / f"{module_name}.py").read_text(encoding="utf-8"))
    return next(
        ast.get_docstring(node) or ""
        for node in tree.body
        if isinstance(node, ast.FunctionDef) and node.name == function_name
    )


class LazyGroup(WordsGroup):
    """The root group: commands listed from ``COMMANDS``, each loaded when it is invoked or asked for help."""

    def list_commands(self, ctx) -> list[str]:
        return [*super().list_commands(ctx), *(name for name in COMMANDS if name not in self.commands)]

    def get_command(self, ctx, cmd_name: str):
        if cmd_name in COMMANDS and cmd_name not in self.commands:
            command = load_command(cmd_name)
            if not hasattr(command, "commands"):
                words_for_types(command)
            return command
        return super().get_command(ctx, cmd_name)

    def format_commands(self, ctx, formatter) -> None:
        names = self.list_commands(ctx)
        limit = formatter.width - 6 - max(len(name) for name in names)
        rows = [(name, TyperCommand(name, help=docstring(name)).get_short_help_str(limit)) for name in names]
        with formatter.section("Commands"):
            formatter.write_dl(rows)


app = typer.Typer(
    cls=LazyGroup,
    add_completion=False,
    no_args_is_help=True,
    rich_markup_mode=None,
    help="Carbon intensity of hydrogen and ammonia routes, with cited factors and scheme checks. Estimates for "
    "screening and reporting support, not a certification.",
)


def _version(value: bool) -> None:
    if value:
        typer.echo(f"carbonledger {__version__}")
        raise typer.Exit()


@app.callback()
def _main(
    version: Annotated[
        bool, typer.Option("--version", callback=_version, is_eager=True, help="Print the version and exit.")
    ] = False,
) -> None:
    """Carbon intensity of hydrogen and ammonia routes, with cited factors and scheme checks. Estimates for screening
    and reporting support, not a certification."""


def main() -> None:
    try:
        app()
    except BrokenPipeError:  # e.g. piped into head
        sys.stderr.close()
        sys.exit(0)
    finally:
        # the process ends: its last collection skips the heap of the solver's libraries (about 0.3 s of CPU)
        gc.freeze()
