"""The chart of one score (``score --chart``): stages adding up to the total, the gases, and the
limits of every scheme checked, each on its own basis (matplotlib, imported only when asked)."""

from __future__ import annotations

from pathlib import Path

from ..core.results import ScoreResult
from ..core.scoring import rulebooks
from .chart_files import write_figure
from .labels import gas_name, stage_name, status_of
from .palette import AXIS, CHART_STYLE, GAS_COLOURS, INK, STAGE_COLOURS, STATUS_COLOURS, status_legend
from .tables import display_number


def _stage_waterfall(waterfall, result: ScoreResult, stages: list) -> None:
    """The stages as a waterfall of horizontal bars adding up to the total."""
    running, labels = 0.0, []
    for index, (stage, value) in enumerate(stages):
        waterfall.barh(index, value, left=running, color=STAGE_COLOURS[index % len(STAGE_COLOURS)], height=0.6)
        waterfall.annotate(
            display_number(value),
            (max(running, running + value), index),
            xytext=(4, 0),
            textcoords="offset points",
            va="center",
            fontsize=8,
        )
        running += value
        labels.append(stage_name(stage))
    waterfall.barh(len(stages), result.total, color=INK, height=0.7)
    waterfall.annotate(
        display_number(result.total),
        (max(result.total, 0.0), len(stages)),
        xytext=(4, 0),
        textcoords="offset points",
        va="center",
        fontsize=8,
        fontweight="bold",
    )
    waterfall.set_yticks(range(len(stages) + 1), labels + ["Total"], fontsize=8.5)
    waterfall.invert_yaxis()
    waterfall.axvline(0, color=AXIS, linewidth=0.8)
    waterfall.set_xlabel(result.unit, fontsize=8.5)
    waterfall.set_title(
        f"How the stages add up to the total ({result.boundary}, GWP100 {result.gwp_basis.upper()})",
        fontsize=9.5,
        loc="left",
    )
    waterfall.margins(x=0.12)


def _gas_bar(gas_axes, result: ScoreResult, gases: list) -> None:
    """One bar split by greenhouse gas (CO2e), with its legend."""
    start = 0.0
    for gas, value in gases:
        gas_axes.barh(
            0,
            value,
            left=start if value > 0 else 0.0,
            color=GAS_COLOURS.get(gas, "#7d8088"),
            height=0.6,
            label=f"{gas_name(gas)}: {display_number(value)}",
        )
        start += max(value, 0.0)
    gas_axes.set_yticks([])
    gas_axes.set_xlabel(f"{result.unit} (CO2e)", fontsize=8.5)
    gas_axes.set_title("By greenhouse gas", fontsize=9.5, loc="left")
    gas_axes.legend(fontsize=7.5, loc="upper left", bbox_to_anchor=(0.0, -0.55), ncol=2, frameon=False)


def _scheme_row(ax, check, book) -> None:
    """One scheme check: its value as a bar coloured by status, its limits as lines (bold: the deciding one)."""
    limits = sorted({t.limit for t in book.thresholds}) if book else [check.limit]
    status = status_of(check)
    ax.barh(0, check.value, color=STATUS_COLOURS.get(status, "#8a6a10"), height=0.5)
    ax.set_ylim(-0.6, 0.6)
    for limit in limits:
        ax.axvline(
            limit,
            color=INK,
            linewidth=2.2 if limit == check.limit else 0.9,
            linestyle="-" if limit == check.limit else "--",
        )
        # each tier line labelled, above the bar
        ax.annotate(
            f"{limit:g}",
            (limit, 0.32),
            xytext=(2, 0),
            textcoords="offset points",
            ha="left",
            va="bottom",
            fontsize=6.5,
            color=INK,
        )
    ax.set_xlim(min(0.0, check.value), max([check.value, *limits]) * 1.18 or 1.0)
    ax.set_yticks([])
    ax.set_title(
        f"{check.name}: {display_number(check.value)} against {display_number(check.limit)} {check.unit}, {status}",
        fontsize=8,
        loc="left",
    )
    ax.tick_params(axis="x", labelsize=7.5)


def score_figure(result: ScoreResult):
    """A matplotlib figure: a waterfall by stage, a bar by gas, one row per scheme check."""
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    plt.rcParams.update(CHART_STYLE)
    stages = list(result.by_stage.items())
    gases = [(g, v) for g, v in result.by_gas.items() if v != 0]
    checks = result.checks
    heights = [0.42 * (len(stages) + 1) + 0.8, 0.9 + 0.25 * ((len(gases) + 1) // 2)] + [0.62] * len(checks)
    figure, axes = plt.subplots(
        len(heights), 1, figsize=(8.5, sum(heights) + 1.4), height_ratios=heights, layout="constrained"
    )
    waterfall, gas_axes, scheme_axes = axes[0], axes[1], axes[2:]

    _stage_waterfall(waterfall, result, stages)
    figure.suptitle(result.project, fontsize=11, x=0.01, ha="left", fontweight="bold")

    _gas_bar(gas_axes, result, gases)

    books = rulebooks()
    for ax, check in zip(scheme_axes, checks, strict=True):
        _scheme_row(ax, check, books.get(check.scheme))
    if len(checks):
        status_legend(figure, [status_of(c) for c in checks])
    figure.supxlabel(
        "Scheme rows: each on the scheme's own basis, boundary and GWP set; "
        "lines are its limits (bold: the one the verdict is read against).\n"
        "Screening estimate, not a certification: the scheme's official methodology, "
        "an accredited verifier and local regulation take precedence.",
        fontsize=6.5,
    )
    return figure


def write_score_chart(result: ScoreResult, path: str | Path, force: bool = False) -> Path:
    """Write the chart as PNG or SVG (by the file's suffix), atomically, refusing to overwrite."""
    return write_figure(path, lambda: score_figure(result), force, svg_text=True)
