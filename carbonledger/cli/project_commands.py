"""Commands on one project: ``score``, ``params``, ``init``; and ``schemes``."""

from __future__ import annotations

from pathlib import Path
from typing import Annotated, Optional

import typer

from .. import api
from ..about import CAUTION
from ..core.results import strict_json
from ..errors import InputError
from ..io.csv_text import csv_text
from ..io.files import atomic_write
from ..io.labels import electricity_rule_name, gwp_name
from ..io.ledger import ledger_for_run, record_run
from ..io.portfolio_output import lifetime_csv, lifetime_json, lifetime_table
from ..io.score_chart import write_score_chart
from ..io.tables import plain_table, score_csv
from ..io.tables import render as render_score
from ..model.project import parameter_table
from ..model.rulebooks import load_schemes, user_rulebooks
from ..routes.project import load_project
from ..routes.starter import normalise_choice, placeholders_left, starter_choices, starter_project
from .options import (
    BoundaryOption,
    FactorsOption,
    ForceOption,
    FormatOption,
    GwpOption,
    LedgerOption,
    NoLedgerOption,
    OutputFormat,
    RebalanceOption,
    RulebookOption,
    SchemeOption,
    SetOption,
    YearOption,
    assessment_of,
    check_chart_path,
    fail,
    render,
    render_result,
    with_rebalance,
    workbook_assessment,
)


def score(
    ctx: typer.Context,
    project: Annotated[Optional[Path], typer.Argument(help="Project TOML file (or use --from-workbook).")] = None,
    scheme: SchemeOption = None,
    rulebook: RulebookOption = None,
    gwp: GwpOption = "ar6",
    factors: FactorsOption = "default-2026",
    set_: SetOption = None,
    rebalance: RebalanceOption = None,
    lifetime: Annotated[
        bool,
        typer.Option(
            "--lifetime", help="Score every operating year of the project's [lifetime] and the lifetime average."
        ),
    ] = False,
    ledger: LedgerOption = None,
    no_ledger: NoLedgerOption = False,
    output_format: FormatOption = OutputFormat.table,
    boundary: BoundaryOption = None,
    year: YearOption = None,
    from_workbook: Annotated[
        Optional[Path],
        typer.Option(
            "--from-workbook", help="Score the inputs and factors of an audit workbook (options default to its cover)."
        ),
    ] = None,
    chart: Annotated[
        Optional[Path],
        typer.Option("--chart", help="Also write a chart of stages, gases and scheme limits: FILE.png or FILE.svg."),
    ] = None,
    force: ForceOption = False,
    matching_chart: Annotated[
        Optional[Path],
        typer.Option(
            "--matching-chart",
            help="With an electricity time series: write a PNG/SVG of the matching under the first scheme checked "
            "(monthly matched/unmatched use, unmatched share by hour and month).",
        ),
    ] = None,
    matching: Annotated[
        Optional[str],
        typer.Option(
            "--matching",
            help="With an electricity time series: rule (each scheme's dated rule, the default), or interval, hour, "
            "month, quarter, year for every scheme (a what-if), or declared (ignore the series: the declared "
            "annual shares, as in the audit workbook).",
        ),
    ] = None,
) -> None:
    """Score a project: total, intensities, by stage, by gas, scheme checks."""
    set_ = with_rebalance(set_, rebalance)
    try:
        where = ledger_for_run(ledger, not no_ledger)
        _check_score_options(project, from_workbook, chart, lifetime, force)
        if lifetime:
            result = api.lifetime(project, assessment_of(factors, gwp, scheme, set_, boundary))
            text = render_result(output_format, result, lifetime_table, lifetime_json, lifetime_csv)
            command, kind = "score --lifetime", "lifetime"
        else:
            options = (factors, gwp, scheme, set_, boundary, year, matching)
            result = _single_score(ctx, project, from_workbook, options, matching_chart, force)
            text = render(
                output_format, table=lambda: render_score(result), json=result.to_json, csv=lambda: score_csv(result)
            )
            command, kind = "score", "score"
            if chart is not None:
                write_score_chart(result, chart, force=force)
        if where is not None:
            record_run(command, [result], ledger=where, kind=kind)
    except InputError as error:
        fail(error)
    typer.echo(text, nl=False)
    if chart is not None:
        typer.echo(f"wrote {chart}", err=True)
    if project is not None:
        warn_placeholders(project)


def _check_score_options(project, from_workbook, chart, lifetime: bool, force: bool) -> None:
    """``score``'s options that cannot go together, refused before any work: one project source, a chart of a
    single score, lifetime scoring from a project file."""
    if (project is None) == (from_workbook is None):
        raise InputError("score", "PROJECT", "either a project TOML file or --from-workbook WORKBOOK (one of them)")
    if chart is not None:
        if lifetime:
            raise InputError("--chart", str(chart), "a single score (not with --lifetime)")
        check_chart_path(chart, force)
    if lifetime and from_workbook is not None:
        raise InputError(
            "--lifetime",
            "--from-workbook",
            "a project TOML file (lifetime scoring reads the project's [lifetime] section)",
        )


def _single_score(ctx, project, from_workbook, options: tuple, matching_chart, force: bool):
    """One score of a project file (with its matching chart when asked) or of an audit workbook's inputs;
    ``options`` are (factors, gwp, schemes, overrides, boundary, year, matching) as given."""
    factors, gwp, scheme, set_, boundary, year, matching = options
    if from_workbook is not None:
        return api.score_workbook(
            from_workbook, workbook_assessment(ctx, factors, gwp, scheme, set_, boundary, year, from_workbook)
        )
    assessment = assessment_of(factors, gwp, scheme, set_, boundary, year, matching)
    result = api.score(project, assessment)
    if matching_chart is not None:
        api.matching_chart(
            project,
            matching_chart,
            scheme=scheme[0] if scheme else None,
            assessment=assessment.but(boundary=None),
            force=force,
        )
    return result


def warn_placeholders(project: Path) -> None:
    """A project file from `init` whose numbers still carry the "# placeholder" mark scores its
    starter figures: say so, on stderr (the output itself stays clean for a program to read)."""
    lines = placeholders_left(project.read_text(encoding="utf-8-sig"))
    if lines:
        shown = ", ".join(map(str, lines[:12])) + (", ..." if len(lines) > 12 else "")
        typer.echo(
            f"warning: {project}: {len(lines)} numbers are still the starter's placeholders (lines {shown}): replace "
            "each with the plant's own figure and delete its '# placeholder' mark",
            err=True,
        )


def params(
    project: Annotated[Path, typer.Argument(help="Project TOML file.")],
    set_: SetOption = None,
    rebalance: RebalanceOption = None,
    output_format: FormatOption = OutputFormat.table,
) -> None:
    """List every parameter path of a project with its value and unit."""
    set_ = with_rebalance(set_, rebalance)
    try:
        model, _ = load_project(project, set_)
    except InputError as error:
        fail(error)
    rows = parameter_table(model)

    def table() -> str:
        shown = [
            [path, "not given" if value is None or value == "" else str(value), unit, description]
            for path, value, unit, description in rows
        ]
        return plain_table(["parameter", "value", "unit", "meaning"], shown, wrap={"value", "unit", "meaning"})

    typer.echo(
        render(
            output_format,
            table=table,
            json=lambda: strict_json(
                [{"path": p, "value": v, "unit": u, "description": d} for p, v, u, d in rows], str(project)
            ),
            csv=lambda: csv_text(("section", "key", "value", "unit"), [("parameter", p, v, u) for p, v, u, _ in rows]),
        ),
        nl=False,
    )


def schemes(output_format: FormatOption = OutputFormat.table, rulebook: RulebookOption = None) -> None:
    """List the scheme rulebooks: quantity, basis, GWP set, electricity rule and thresholds."""
    try:
        books = {**load_schemes(), **user_rulebooks()}
    except InputError as error:
        fail(error)
    text = render_result(output_format, books, _schemes_table, _schemes_json, _schemes_csv)
    typer.echo(text, nl=False)


def _schemes_table(books: dict) -> str:
    """The rulebooks as text, one block each, with the caution."""
    lines = []
    for s in books.values():
        tiers = "; ".join(
            f"{'<=' if t.inclusive else '<'} {t.limit:g}: {t.tier}"
            for t in sorted(s.thresholds, key=lambda t: -t.limit)
        )
        lines += [
            f"{s.id}{' *' if s.from_memory or any(t.from_memory for t in s.thresholds) else ''}: {s.name}",
            f"    products {', '.join(s.products)}; limits in {s.unit} of the {s.basis.replace('_', ' ')} "
            f"product; boundary {s.boundary}",
            f"    GWP100 {gwp_name(s.gwp)}; electricity: {electricity_rule_name(s.electricity)}; thresholds {tiers}",
            f"    source: {s.document}",
        ]
        if s.version:
            lines.append(f"    version read: {s.version}")
        if s.eligibility is not None:
            lines.append(
                f"    eligible routes: {', '.join(s.eligibility.routes)}"
                + (
                    f"; construction before {s.eligibility.construction_start_before.isoformat()}"
                    if s.eligibility.construction_start_before
                    else ""
                )
            )
        if s.electricity_rules is not None and s.electricity == "renewable_at_zero":
            rules = s.electricity_rules
            matching = "; ".join(t.in_words() for t in rules.temporal)
            lines.append(
                f"    counts zero: {', '.join(rules.counts_at_zero)} by {', '.join(rules.procurement)}; matching: "
                f"{matching or 'none stated'}"
            )
        if s.boundary_terms:
            lines.append(f"    formula terms: {', '.join(t.term for t in s.boundary_terms)}")
    return "\n".join(lines + ["* not yet verified against the source document", f"Caution: {CAUTION}"])


def _schemes_csv(books: dict) -> str:
    """One CSV row per rulebook threshold, with the caution."""
    header = (
        "scheme",
        "name",
        "tier",
        "limit",
        "inclusive",
        "unit",
        "quantity",
        "basis",
        "gwp",
        "electricity",
        "from_memory",
        "source",
    )
    rows = []
    for s in books.values():
        for t in s.thresholds:
            rows.append(
                (
                    s.id,
                    s.name,
                    t.tier,
                    t.limit,
                    t.inclusive,
                    s.unit,
                    s.quantity,
                    s.basis,
                    s.gwp,
                    s.electricity,
                    s.from_memory or t.from_memory,
                    t.source,
                )
            )
    return csv_text(header, rows, caution=CAUTION)


def _schemes_json(books: dict) -> str:
    """Every rulebook as JSON, the unverified ones listed."""
    flagged = [s.id for s in books.values() if s.from_memory or any(t.from_memory for t in s.thresholds)]
    return strict_json(
        {
            "caution": CAUTION,
            "from_memory": {"rulebooks": flagged},
            "schemes": [s.model_dump(mode="json") for s in books.values()],
        },
        "schemes",
    )


def init(
    path: Annotated[Path, typer.Argument(help="Where to write the starter project file.")],
    route: Annotated[
        str,
        typer.Option(
            "--route", help="A hydrogen route (hyphens or underscores): " + ", ".join(starter_choices()) + "."
        ),
    ],
    product: Annotated[str, typer.Option("--product", help="ammonia or hydrogen.")] = "ammonia",
    force: Annotated[bool, typer.Option("--force", help="Overwrite an existing file.")] = False,
) -> None:
    """Write a commented starter project file for a route."""
    try:
        choices = starter_choices()
        if normalise_choice(route) not in choices:
            raise InputError("--route", route, f"one of {', '.join(choices)}")
        if product.lower() not in ("ammonia", "hydrogen"):
            raise InputError("--product", product, "ammonia or hydrogen")
        text = starter_project(route, product.lower(), name=path.stem.replace("_", " "))
        atomic_write(path, lambda tmp: tmp.write_text(text, encoding="utf-8"), force=force)
    except InputError as error:
        fail(error)
    typer.echo(f"wrote {path}")
