"""Table, CSV, JSON and the cost/margin chart of a qualify search (``analyses.qualify``); never scores."""

from __future__ import annotations

from ..analyses.qualify import QualifyResult
from ..core.results import strict_json
from .chart_files import write_figure
from .csv_text import csv_text
from .tables import display_number, plain_console


def _value(value) -> str:
    return f"{value:.6g}" if isinstance(value, float) else str(value)


def qualify_json(result: QualifyResult) -> str:
    """The stable JSON of a qualify search (top-level ``caution`` and ``from_memory``; no NaN)."""
    return strict_json(result.model_dump(mode="json"), "qualify")


def qualify_rows(result: QualifyResult) -> list[tuple]:
    """(section, key, value, unit) rows."""
    rows: list[tuple] = [
        ("result", "status", result.status, ""),
        ("result", "total_cost", "" if result.total_cost is None else result.total_cost, result.cost_unit),
        ("result", "schemes", " ".join(result.schemes), ""),
        ("result", "year", "" if result.year is None else result.year, ""),
        ("result", "confidence", "" if result.confidence is None else result.confidence, ""),
        ("result", "probability", "" if result.probability is None else result.probability, ""),
        ("result", "standard_error", "" if result.standard_error is None else result.standard_error, ""),
        ("result", "best_margin", "" if result.best_margin is None else result.best_margin, "relative to the limit"),
        ("result", "binding_lever", result.binding_lever or "", ""),
        ("result", "prices_invented", result.prices_invented, ""),
    ]
    for change in result.changes:
        rows.append((f"lever:{change.parameter}", "project_value", change.project_value, change.unit))
        rows.append((f"lever:{change.parameter}", "value", change.value, change.unit))
        rows.append((f"lever:{change.parameter}", "cost", change.cost, result.cost_unit))
    for check in result.checks:
        for key in ("status", "value", "limit", "margin", "probability", "standard_error"):
            value = getattr(check, key)
            rows.append(
                (
                    f"check:{check.scheme}",
                    key,
                    "" if value is None else value,
                    check.unit if key in ("value", "limit", "margin") else "",
                )
            )
    for number, point in enumerate(result.front):
        rows.append((f"front:{number}", "budget", point.budget, result.cost_unit))
        rows.append((f"front:{number}", "total_cost", point.total_cost, result.cost_unit))
        rows.append((f"front:{number}", "margin", point.margin, "relative to the limit"))
        if point.probability is not None:
            rows.append((f"front:{number}", "probability", point.probability, ""))
    rows += [("score_back_set", str(number), item, "") for number, item in enumerate(result.score_back_set)]
    rows += [("solver", key, value, "") for key, value in result.solver.items()]
    if result.operation is not None:
        rows += [
            ("operation", key, "" if value is None else ("; ".join(value) if isinstance(value, list) else value), "")
            for key, value in result.operation.items()
        ]
    rows += [("note", str(number), note, "") for number, note in enumerate(result.notes)]
    return rows


def qualify_csv(result: QualifyResult) -> str:
    return csv_text(("section", "key", "value", "unit"), qualify_rows(result), caution=result.caution)


def _levers_table(result: QualifyResult):
    """The levers: project value, answer (or where the margin is best), unit, cost."""
    from rich.table import Table

    table = Table(title="Levers", title_justify="left")
    for column in (
        "parameter",
        "project value",
        "answer" if result.status == "qualifies" else "best margin at",
        "unit",
        "cost",
        "kind",
    ):
        table.add_column(
            column, justify="right" if column in ("project value", "answer", "best margin at", "cost") else "left"
        )
    for change in result.changes:
        table.add_row(
            change.parameter,
            _value(change.project_value),
            _value(change.value),
            change.unit,
            f"{change.cost:,.2f}",
            change.kind,
        )
    return table


def _checks_table(result: QualifyResult):
    """Each scheme's check at the answer, with its probability when draws were asked."""
    from rich.table import Table

    checks = Table(title="Checks at the answer, scored as `score` scores them", title_justify="left")
    for column in ("scheme", "status", "value", "limit", "unit") + (
        ("probability", "± s.e.") if result.confidence is not None else ()
    ):
        checks.add_column(column, justify="left" if column in ("scheme", "status", "unit") else "right")
    for check in result.checks:
        extra = (
            (f"{check.probability:.1%}", f"{check.standard_error:.1%}")
            if result.confidence is not None and check.probability is not None
            else ()
        )
        checks.add_row(
            check.scheme,
            check.status.replace("_", " "),
            display_number(check.value),
            display_number(check.limit),
            check.unit,
            *extra,
        )
    return checks


def _front_table(result: QualifyResult):
    """The cost/margin front: per budget, the cost, the margin and whether every scheme qualifies."""
    from rich.table import Table

    front = Table(
        title="Cost/margin front (margin: (limit - value) / limit of the tightest "
        f"scheme{', held in the asked share of draws' if result.confidence is not None else ''})",
        title_justify="left",
    )
    for column in ("budget", "cost", "margin", "qualifies") + (
        ("probability",) if result.confidence is not None else ()
    ):
        front.add_column(column, justify="right")
    for point in result.front:
        extra = (f"{point.probability:.1%}",) if point.probability is not None else ()
        front.add_row(
            f"{point.budget:,.0f}",
            f"{point.total_cost:,.0f}",
            f"{point.margin:+.2%}",
            "yes" if point.qualifies else "no",
            *extra,
        )
    return front


def qualify_table(result: QualifyResult) -> str:
    console = plain_console(140)
    target = (
        f"at {result.confidence:.0%} confidence over {result.draws:,} draws (seed {result.seed})"
        if result.confidence is not None
        else "at the central value"
    )
    console.print(
        f"What it takes to qualify for {', '.join(result.schemes)} {target}"
        + (f", rules of {result.year}" if result.year else "")
    )
    if result.status == "qualifies":
        console.print(
            f"Least cost: {result.total_cost:,.2f} {result.cost_unit}"
            + (" (prices invented)" if result.prices_invented else "")
        )
    else:
        console.print(f"No solution: {result.reason}")
    console.print(_levers_table(result))
    console.print(_checks_table(result))
    if result.probability is not None:
        console.print(
            f"Every named scheme qualifies in {result.probability:.1%} (± {result.standard_error:.1%}) of the draws."
        )
    if result.front:
        console.print(_front_table(result))
    if result.score_back_set:
        console.print("Score it back with: " + " ".join(f"--set '{item}'" for item in result.score_back_set))
    solver = result.solver
    console.print(
        f"Solver: {solver['continuous']}, tolerance {solver['tolerance']:g}; discrete: {solver['discrete']} "
        f"({solver['combinations']} combinations, {solver['solved']} solved, {solver['pruned']} pruned)."
    )
    if result.operation is not None:
        console.print(
            f"Operation lever solved by the plan's linear program: {solver['operation']}; objective "
            f"{result.operation['objective']}, {result.operation['lost']:,.6g} {result.operation['lost_unit']} "
            "given up against rated power in every interval."
        )
    for note in result.notes:
        console.print(f"note: {note}")
    console.print(f"Caution: {result.caution}")
    return console.export_text()


def front_figure(result: QualifyResult):
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt
    import matplotlib.ticker

    figure, axis = plt.subplots(figsize=(7, 4.2))
    costs = [point.total_cost for point in result.front]
    margins = [100 * point.margin for point in result.front]
    axis.plot(costs, margins, marker="o", color="#2f5d8a", label="best margin reached within the budget")
    axis.axhline(0.0, color="#888888", linewidth=1, linestyle="--", label="limit met exactly")
    if result.status == "qualifies" and result.total_cost is not None:
        axis.axvline(
            result.total_cost,
            color="#b5651d",
            linewidth=1,
            label=f"least cost that qualifies: {result.total_cost:,.0f}",
        )
    axis.set_xlabel(f"total cost ({result.cost_unit}{', invented prices' if result.prices_invented else ''})")
    axis.set_ylabel(
        "margin of the tightest scheme (% of its limit)"
        + (f"\nheld in {result.confidence:.0%} of draws" if result.confidence is not None else "")
    )
    axis.set_title(f"{result.project}\nwhat it takes to qualify for {', '.join(result.schemes)}", fontsize=9)
    axis.xaxis.set_major_formatter(matplotlib.ticker.FuncFormatter(lambda value, _: f"{value:,.0f}"))
    axis.legend(fontsize=8, loc="lower right")
    figure.text(0.01, 0.01, "Screening estimate, not a certification.", fontsize=7, color="#555555")
    figure.tight_layout(rect=(0, 0.03, 1, 1))
    return figure


def write_front_chart(result: QualifyResult, path, force: bool = False):
    """The cost/margin front as PNG or SVG (by the file's suffix), atomically, refusing to overwrite."""
    return write_figure(path, lambda: front_figure(result), force)
