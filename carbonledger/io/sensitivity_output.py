"""Table, CSV, JSON and chart (tornado and Sobol indices, scheme limit marked) of a sensitivity run."""

from __future__ import annotations

from pathlib import Path

from ..analyses.sensitivity import Sensitivity
from .chart_files import write_figure
from .palette import AXIS, CHART_STYLE, HIGH, INK, LOW
from .tables import display_number, plain_console
from .uncertainty_output import rows_to_csv


def sensitivity_csv(result: Sensitivity) -> str:
    rows = [
        ("sobol", item.input, key, getattr(item, key))
        for item in result.sobol
        for key in ("first_order", "first_order_confidence", "total_order", "total_order_confidence")
    ]
    rows += [
        ("tornado", bar.input, key, getattr(bar, key))
        for bar in result.tornado
        for key in ("low_input", "high_input", "at_low", "at_high", "swing")
    ]
    rows += swing_rows(result)
    rows += [
        ("run", "figure", "", result.figure),
        ("run", "unit", "", result.unit),
        ("run", "base", "", result.base),
        ("run", "limit", "", "" if result.limit is None else result.limit),
        ("run", "seed", "", result.seed),
        ("run", "evaluations", "", result.evaluations),
    ]
    return rows_to_csv(("section", "input", "statistic", "value"), rows)


def swing_rows(result: Sensitivity) -> list[tuple]:
    """(section, input, statistic, value) rows of the swing: each figure at -x % and +x % and its change."""
    if result.swing is None:
        return []
    swing = result.swing
    x = f"{swing.percent:g} %"
    rows = [("swing", bar.input, "value", bar.value) for bar in swing.bars]
    for bar in swing.bars:
        for f in bar.figures:
            rows += [
                ("swing", bar.input, f"{f.figure} at -{x}", "" if f.at_minus is None else f.at_minus),
                ("swing", bar.input, f"{f.figure} at +{x}", "" if f.at_plus is None else f.at_plus),
                ("swing", bar.input, f"{f.figure} change at -{x}", "" if f.change_minus is None else f.change_minus),
                ("swing", bar.input, f"{f.figure} change at +{x}", "" if f.change_plus is None else f.change_plus),
            ]
    rows += [("swing", "project value", figure, value) for figure, value in swing.base.items()]
    rows += [("swing", name, "moves no figure", "") for name in swing.unmoved]
    rows += [("swing", name, "held fixed", "") for name in swing.held_fixed]
    return rows


def _change(value: float | None) -> str:
    return "breaks a limit" if value is None else ("0" if value == 0 else f"{value:+.4g}")


def swing_table(result: Sensitivity, console) -> None:
    """The swing: for each input (largest change of the total first), each figure at -x % and +x % and the change."""
    from rich.table import Table

    swing = result.swing
    if swing is None:
        return
    x = f"{swing.percent:g} %"
    table = Table(
        title=f"Swing: each input alone at -{x} and +{x} of its own value, the others as the project states",
        title_justify="left",
    )
    for column in ("input (its value)", "figure", f"at -{x}", f"at +{x}", "change"):
        table.add_column(
            column, justify="left" if column in ("input (its value)", "figure") else "right", overflow="fold"
        )
    console.print(
        "Every input as stated: "
        + "; ".join(f"{figure} {display_number(value)} {swing.units[figure]}" for figure, value in swing.base.items())
    )
    for bar in swing.bars:
        for number, f in enumerate(bar.figures):
            name = f"{bar.input} ({display_number(bar.value)} {bar.unit})" if number == 0 else ""
            shown = [_change(None) if v is None else display_number(v) for v in (f.at_minus, f.at_plus)]
            table.add_row(
                name,
                f"{f.figure} ({f.unit})",
                *shown,
                f"{_change(f.change_minus)} / {_change(f.change_plus)}",
                end_section=number == len(bar.figures) - 1,
            )
    console.print(table)
    if swing.unmoved:
        console.print(f"Moving these changes no figure: {', '.join(swing.unmoved)}")
    if swing.held_fixed:
        console.print(f"Held fixed (characterisation factors and physical properties): {', '.join(swing.held_fixed)}")


def sensitivity_table(result: Sensitivity) -> str:
    from rich.table import Table

    console = plain_console()
    limit = f"; limit {display_number(result.limit)} {result.unit}" if result.limit is not None else ""
    console.print(
        f"{result.project}: sensitivity of {result.figure} ({result.unit}); "
        f"project value {display_number(result.base)}{limit}"
    )
    console.print(
        f"Sobol indices: SALib, N = {result.base_sample} ({result.evaluations:,} evaluations), "
        f"seed {result.seed}; inputs drawn independently (rank correlations not imposed)"
    )
    if result.evaluations_breaking_limits:
        console.print(
            f"{result.evaluations_breaking_limits:,} evaluations break a physical "
            "limit; the Sobol estimator keeps them (it needs every point)"
        )
    sobol = Table(title="Sobol indices (share of the variance; ± 95 % bootstrap half-width)", title_justify="left")
    for column in ("input", "first order", "total order"):
        sobol.add_column(column, justify="left" if column == "input" else "right")
    for item in sorted(result.sobol, key=lambda i: -i.total_order):
        sobol.add_row(
            item.input,
            f"{item.first_order:.3f} ± {item.first_order_confidence:.3f}",
            f"{item.total_order:.3f} ± {item.total_order_confidence:.3f}",
        )
    console.print(sobol)
    tornado = Table(
        title="Tornado: one input at its 10th and 90th percentile, the others as the project states",
        title_justify="left",
    )
    for column in ("input", "10th percentile", "90th percentile", "figure at 10th", "figure at 90th", "swing"):
        tornado.add_column(column, justify="left" if column == "input" else "right", no_wrap=column == "input")
    for bar in result.tornado:
        shown = [
            bar.low_input if isinstance(bar.low_input, str) else display_number(bar.low_input),
            bar.high_input if isinstance(bar.high_input, str) else display_number(bar.high_input),
        ]
        tornado.add_row(
            bar.input, *shown, display_number(bar.at_low), display_number(bar.at_high), display_number(bar.swing)
        )
    console.print(tornado)
    swing_table(result, console)
    console.print(f"Caution: {result.caution}")
    return console.export_text()


def sensitivity_figure(result: Sensitivity):
    """Tornado (bars from the project's value, the scheme limit as a dashed line) beside the Sobol indices."""
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    names = [bar.input for bar in result.tornado][::-1]
    height = max(3.5, 0.45 * len(names) + 1.8)
    plt.rcParams.update(CHART_STYLE)
    figure, (left, right) = plt.subplots(1, 2, figsize=(12, height), layout="constrained", width_ratios=[3, 2])
    for row, bar in enumerate(result.tornado[::-1]):
        for value, colour, label in (
            (bar.at_low, LOW, "input at its 10th percentile"),
            (bar.at_high, HIGH, "input at its 90th percentile"),
        ):
            left.barh(
                row, value - result.base, left=result.base, color=colour, height=0.6, label=label if row == 0 else None
            )
    left.axvline(result.base, color=AXIS, linewidth=0.8)
    if result.limit is not None:
        left.axvline(
            result.limit,
            color=INK,
            linestyle="--",
            linewidth=0.9,
            label=f"{result.figure} limit {display_number(result.limit)}",
        )
    left.set_yticks(range(len(names)), names, fontsize=7.5)
    left.set_xlabel(f"{result.figure} ({result.unit})")
    left.set_title("Tornado (others at the project's values)", fontsize=10)
    left.legend(fontsize=7, loc="upper center", bbox_to_anchor=(0.5, -0.14), ncol=3)
    order = sorted(result.sobol, key=lambda i: i.total_order)
    rows = range(len(order))
    right.barh(
        [r + 0.2 for r in rows],
        [i.first_order for i in order],
        height=0.4,
        xerr=[i.first_order_confidence for i in order],
        label="first order",
        color="#55a868",
    )
    right.barh(
        [r - 0.2 for r in rows],
        [i.total_order for i in order],
        height=0.4,
        xerr=[i.total_order_confidence for i in order],
        label="total order",
        color="#8172b3",
    )
    right.set_yticks(list(rows), [i.input for i in order], fontsize=7.5)
    right.set_xlim(0, 1.05)
    right.set_xlabel("share of the variance")
    right.set_title("Sobol indices", fontsize=10)
    right.legend(fontsize=7, loc="lower right")
    figure.suptitle(f"{result.project}: what decides {result.figure}", fontsize=10)
    figure.supxlabel(
        "Screening estimate, not a certification: the scheme's official methodology, "
        "an accredited verifier and local regulation take precedence.",
        fontsize=6.5,
    )
    return figure


def write_sensitivity_chart(result: Sensitivity, path: str | Path, force: bool = False) -> Path:
    """Write the chart as PNG or SVG (by the file's suffix), atomically, refusing to overwrite."""
    return write_figure(path, lambda: sensitivity_figure(result), force)
