"""--help in words and usage errors in one line: the command layer's own group (imports only typer).

Kept apart from ``options`` so that ``carbonledger --help`` imports nothing but the command layer.
"""

from __future__ import annotations

from pathlib import Path
from typing import get_args

import typer

VALUE_WORDS = {"Path": "FILE", "int": "N", "float": "NUMBER", "str": "TEXT"}


def value_word(param) -> str | None:
    """What an option or argument takes, in words for --help: FILE, N, NUMBER, TEXT or its choices
    (None for a flag). Reads typer's description of the parameter, or click's type."""
    described = getattr(param, "type_descriptor", None)
    if described is not None:
        choices = described.choices if described.is_choice else None
        annotation = get_args(described.annotation)[0] if described.is_list else described.annotation
    else:
        choices = getattr(param.type, "choices", None)
        annotation = {"path": Path, "integer": int, "float": float, "boolean": bool}.get(param.type.name, str)
    if choices:
        return "|".join(str(getattr(choice, "value", choice)) for choice in choices)
    if annotation is bool or getattr(param, "is_flag", False):
        return None
    return VALUE_WORDS.get(getattr(annotation, "__name__", ""), "TEXT")


def words_for_types(command) -> None:
    """--help shows words, not Python types (``--scheme TEXT`` rather than ``<list[str]>``): every
    option without a metavar of its own gets ``value_word``; every argument shows its word too."""
    for param in command.params:
        word = value_word(param)
        if word is None:
            continue
        if param.param_type_name == "option":
            if param.metavar is None:
                param.metavar = word
        else:
            shown = word + ("..." if param.nargs != 1 else "")
            param.display_type_rich = lambda ctx, shown=shown: shown  # typer shows an argument's type, not its metavar


def one_line_usage_error(error) -> None:
    """A mistyped option or argument (click's usage errors) reported like every other bad input:
    one line on stderr, ``error: COMMAND: what was wrong``, exit code 2 (``--help`` still helps)."""
    where = error.ctx.command_path if getattr(error, "ctx", None) is not None else "carbonledger"

    def show(file=None) -> None:
        typer.echo(f"error: {where}: {error.format_message()} (see `{where} --help`)", err=True)

    error.show = show


class WordsGroup(typer.core.TyperGroup):
    """The app's command group: each command it hands out shows words, not types, in --help, and a
    usage error is one line."""

    def invoke(self, ctx):
        try:
            return super().invoke(ctx)
        except Exception as error:
            if any(kind.__name__ == "UsageError" for kind in type(error).__mro__):
                one_line_usage_error(error)
            raise

    def get_command(self, ctx, name):
        command = super().get_command(ctx, name)
        if command is not None and not hasattr(command, "commands"):
            words_for_types(command)
        return command
