"""``carbonledger factors``: browse the factor library (list, show, sets, diff)."""

from __future__ import annotations

import textwrap
from typing import Annotated

import typer

from ..about import CAUTION
from ..core.results import strict_json
from ..errors import InputError
from ..io.csv_text import csv_text
from ..io.labels import factor_grades_sentence
from ..io.portfolio_output import diff_rows, diff_table, sets_table
from ..io.tables import plain_table, terminal_width
from ..model.factors import FACTOR_COLUMNS, diff_sets, factor_row, load_factor_set, set_listing
from ..model.grades import GRADE_MEANING, Grade, grade_kind, grades_of
from ..stages.electricity import ACCOUNTING_BASIS, accounting_basis
from .options import FactorsOption, FormatOption, OutputFormat, WordsGroup, fail, render


def _listed(factor) -> dict:
    """A factor row as `factors list` and `show` give it in JSON: its fields and the file it was read from."""
    return {**factor_row(factor), "origin": factor.origin}


def factors() -> None:
    """Browse the factor library."""


def factors_list(
    factors: FactorsOption = "default-2026",
    prefix: Annotated[str, typer.Option("--prefix", help="Only ids starting with this text.")] = "",
    output_format: FormatOption = OutputFormat.table,
) -> None:
    """List the factors of a set: id, value, unit, source grade and source."""
    try:
        factor_set = load_factor_set(factors)
    except InputError as error:
        fail(error)
    show_factors(
        factor_set, [f for key, f in sorted(factor_set.factors.items()) if key.startswith(prefix)], output_format
    )


def matches(factor, words: list[str]) -> bool:
    """Every word of the search appears (case ignored) in the factor's id, region, source, table or note."""
    text = " ".join(
        str(part)
        for part in (factor.id.replace("_", " "), factor.id, factor.region, factor.source, factor.table, factor.note)
    ).lower()
    return all(word in text for word in words)


def factors_search(
    text: Annotated[
        str,
        typer.Argument(
            help="Words to find in a factor's id, region, source or note, e.g. 'germany 2024' or 'egrid erct'."
        ),
    ],
    factors: FactorsOption = "default-2026",
    output_format: FormatOption = OutputFormat.table,
) -> None:
    """Find factors by words in their id, region, source or note (every word must appear, case ignored)."""
    try:
        factor_set = load_factor_set(factors)
    except InputError as error:
        fail(error)
    words = text.lower().split()
    rows = [f for _, f in sorted(factor_set.factors.items()) if matches(f, words)]
    if not rows:
        typer.echo(
            f"No factor of set {factor_set.name} mentions '{text}' in its id, region, source or note; `carbonledger "
            "factors list` lists them all.",
            err=True,
        )
    show_factors(factor_set, rows, output_format)


def show_factors(factor_set, rows: list, output_format: OutputFormat) -> None:
    """The factors of a list or a search, in the chosen format, with the caution and the from-memory flags."""
    bases = sorted({accounting_basis(f.id) for f in rows} - {""})
    basis_note = (
        "Electricity accounting: electricity.grid.* rows are location-based, electricity.residual_mix.* rows are "
        "market-based residual mixes; they are not interchangeable and a project may not mix them."
        if bases
        else ""
    )

    def table() -> str:
        head = f"factor set {factor_set.name} (sha256 {factor_set.sha256[:12]})"
        body = plain_table(
            ["id", "value", "grade", "source"],
            [[f.id, f"{f.value:g} {f.unit}", f.grade.value, f.source] for f in rows],
            set(),
            wrap={"value", "source"},
        )
        legend = f"Source grades: {'; '.join(f'{g.value}: {GRADE_MEANING[g]}' for g in Grade)}."
        summary = factor_grades_sentence(grades_of(rows), len(rows)).replace("factors used", "factors listed")
        width = terminal_width()
        notes = [
            textwrap.fill(line, width)
            for line in [summary, legend] + ([basis_note] if basis_note else []) + [f"Caution: {CAUTION}"]
        ]
        return "\n".join([head, body.rstrip("\n"), *notes])

    def json_text() -> str:
        return strict_json(
            {
                "caution": CAUTION,
                "factor_set": {"name": factor_set.name, "sha256": factor_set.sha256},
                "factor_grades": grades_of(rows),
                "from_memory": {"factors": [f.id for f in rows if f.from_memory]},
                "factors": [
                    {**_listed(f), **({"accounting_basis": accounting_basis(f.id)} if accounting_basis(f.id) else {})}
                    for f in rows
                ],
                **(
                    {
                        "accounting_bases": {f"electricity.{kind}.": text for kind, text in ACCOUNTING_BASIS.items()},
                        "note": basis_note,
                    }
                    if basis_note
                    else {}
                ),
            },
            factor_set.name,
        )

    typer.echo(
        render(
            output_format,
            table=table,
            json=json_text,
            csv=lambda: csv_text(
                FACTOR_COLUMNS, [tuple(getattr(f, column) for column in FACTOR_COLUMNS) for f in rows], caution=CAUTION
            ),
        ),
        nl=False,
    )


def factors_show(
    factor_id: Annotated[str, typer.Argument(help="Factor id, e.g. combustion.natural_gas.co2")],
    factors: FactorsOption = "default-2026",
    output_format: FormatOption = OutputFormat.table,
) -> None:
    """Show one factor with its full source."""
    try:
        factor = load_factor_set(factors).get(factor_id, "FACTOR_ID")
    except InputError as error:
        fail(error)
    shown = (
        ("id", factor.id),
        ("value", f"{factor.value:g} {factor.unit}"),
        ("source", factor.source),
        ("table or article", factor.table or "-"),
        ("year", factor.year or "-"),
        ("region", factor.region or "-"),
        ("note", factor.note or "-"),
        ("source grade", f"{factor.grade.value}: {GRADE_MEANING[factor.grade]}"),
        ("file", factor.origin),
        *(
            [
                (
                    "pedigree scores",
                    f"({','.join(str(v) for v in factor.pedigree)}) reliability, completeness, temporal, "
                    f"geographical, further technological; basic GSD {factor.basic_gsd or 1:g}",
                )
            ]
            if factor.pedigree
            else []
        ),
        ("caution", CAUTION),
    )
    typer.echo(
        render(
            output_format,
            table=lambda: "\n".join(f"{label:>26}: {value}" for label, value in shown),
            json=lambda: strict_json({"caution": CAUTION, **_listed(factor)}, factor.id),
            csv=lambda: csv_text(
                FACTOR_COLUMNS, [tuple(getattr(factor, column) for column in FACTOR_COLUMNS)], caution=CAUTION
            ),
        ),
        nl=False,
    )


def factors_sets(output_format: FormatOption = OutputFormat.table) -> None:
    """List the factor sets in factors/sets: name, date, sha256, base and description."""
    try:
        sets = set_listing()
    except InputError as error:
        fail(error)
    keys = ("name", "date", "sha256", "base", "factors", "description")
    typer.echo(
        render(
            output_format,
            table=lambda: sets_table(sets),
            json=lambda: strict_json(sets, "factors sets"),
            csv=lambda: csv_text(keys, [tuple(s[k] for k in keys) for s in sets]),
        ),
        nl=False,
    )


def factors_diff(
    old: Annotated[str, typer.Argument(help="Old factor set: name, set folder or override CSV.")],
    new: Annotated[str, typer.Argument(help="New factor set: name, set folder or override CSV.")],
    output_format: FormatOption = OutputFormat.table,
) -> None:
    """Every factor changed, added or removed between two sets, with old and new value and source."""
    try:
        old_set, new_set = load_factor_set(old), load_factor_set(new)
    except InputError as error:
        fail(error)
    changes = diff_sets(old_set, new_set)
    rows = diff_rows(changes)
    keys = ("kind", "id", "old_value", "new_value", "unit", "old_source", "new_source", "grade")
    typer.echo(
        render(
            output_format,
            table=lambda: diff_table(old_set.name, new_set.name, changes),
            json=lambda: strict_json(
                {
                    "caution": CAUTION,
                    "old": {"name": old_set.name, "sha256": old_set.sha256},
                    "new": {"name": new_set.name, "sha256": new_set.sha256},
                    "changes": rows,
                },
                f"{old} -> {new}",
            ),
            csv=lambda: csv_text(keys, [tuple(r.get(k, "") for k in keys) for r in rows], caution=CAUTION),
        ),
        nl=False,
    )


def factors_grades(
    factors: FactorsOption = "default-2026",
    prefix: Annotated[str, typer.Option("--prefix", help="Only ids starting with this text.")] = "",
    output_format: FormatOption = OutputFormat.table,
) -> None:
    """Count the rows of a set by kind (electricity.grid, gwp, marine_fuel...) and source grade."""
    try:
        factor_set = load_factor_set(factors)
    except InputError as error:
        fail(error)
    counts: dict[str, dict[str, int]] = {}
    for key, row in sorted(factor_set.factors.items()):
        if key.startswith(prefix):
            kind = counts.setdefault(grade_kind(key), {grade.value: 0 for grade in Grade})
            kind[row.grade.value] += 1
    totals = {grade.value: sum(kind[grade.value] for kind in counts.values()) for grade in Grade}
    header = ("kind", *(grade.value for grade in Grade), "rows")
    rows = [(kind, *by_grade.values(), sum(by_grade.values())) for kind, by_grade in counts.items()] + [
        ("all", *totals.values(), sum(totals.values()))
    ]

    def table() -> str:
        widths = [max(len(str(row[i])) for row in (header, *rows)) for i in range(len(header))]
        lines = [f"factor set {factor_set.name} (sha256 {factor_set.sha256}): rows by kind and source grade"]
        lines += [
            "  ".join(
                str(cell).rjust(w) if i else str(cell).ljust(w)
                for i, (cell, w) in enumerate(zip(row, widths, strict=True))
            )
            for row in (header, *rows)
        ]
        lines.append(f"Source grades: {'; '.join(f'{g.value}: {GRADE_MEANING[g]}' for g in Grade)}.")
        return "\n".join(lines + [f"Caution: {CAUTION}"]) + "\n"

    typer.echo(
        render(
            output_format,
            table=table,
            json=lambda: strict_json(
                {
                    "caution": CAUTION,
                    "factor_set": {"name": factor_set.name, "sha256": factor_set.sha256},
                    "grades": counts,
                    "all": totals,
                },
                factor_set.name,
            ),
            csv=lambda: csv_text(header, rows, caution=CAUTION),
        ),
        nl=False,
    )


app = typer.Typer(cls=WordsGroup, no_args_is_help=True, rich_markup_mode=None, add_completion=False)
app.callback()(factors)
app.command("list")(factors_list)
app.command("search")(factors_search)
app.command("show")(factors_show)
app.command("sets")(factors_sets)
app.command("diff")(factors_diff)
app.command("grades")(factors_grades)
