"""Side-by-side table, wide CSV and stacked-bar chart of a ComparisonResult (never recomputed)."""

from __future__ import annotations

import textwrap
from pathlib import Path

from ..analyses.compare import ComparisonResult
from ..model.grades import GRADE_BY_WORDS, Grade
from .chart_files import write_figure
from .csv_text import csv_text
from .labels import INTENSITY_UNITS, gas_name, gwp_name, per_name, stage_name, status_name
from .palette import CHART_STYLE, INK, STAGE_COLOURS
from .tables import display_number, plain_console


def _label(project) -> str:
    return Path(project.project_file).stem


def _uncertainty_rows(result: ComparisonResult) -> list[tuple[str, str, str, list]]:
    """The Monte Carlo band of each project (percentiles, mean, draws, seed), or its note."""
    projects = result.projects
    bands = [p.uncertainty for p in projects]
    rows = [
        ("uncertainty", key, result.unit, [getattr(b, key) if b else None for b in bands])
        for key in ("p5", "p50", "mean", "p95")
    ]
    rows.append(
        (
            "uncertainty",
            "draws",
            "",
            [b.draws if b else (p.uncertainty_note or None) for b, p in zip(bands, projects, strict=True)],
        )
    )
    rows.append(("uncertainty", "seed", "", [b.seed if b else None for b in bands]))
    return rows


def _check_rows(scheme: str, projects: list) -> list[tuple[str, str, str, list]]:
    """The rows of one scheme's check: value, limit, status, margin, tier, probabilities, rulebook, matching."""
    checks = [next((c for c in p.checks if c.scheme == scheme), None) for p in projects]
    unit = next(c.unit for c in checks if c is not None)
    rows = [
        (f"check:{scheme}", "value", unit, [c.value if c else None for c in checks]),
        (f"check:{scheme}", "limit", unit, [c.limit if c else None for c in checks]),
        (f"check:{scheme}", "status", "", [status_name(c.status) if c else "n/a" for c in checks]),
        (f"check:{scheme}", "margin", unit, [c.margin if c else None for c in checks]),
        (f"check:{scheme}", "tier", "", [(c.tier or None) if c else "n/a" for c in checks]),
    ]
    if any(p.uncertainty is not None for p in projects):
        bands = [p.uncertainty for p in projects]
        rows += [
            (
                f"check:{scheme}",
                "probability_qualifies",
                "",
                [b.probability_qualifies.get(scheme) if b else None for b in bands],
            ),
            (
                f"check:{scheme}",
                "probability_standard_error",
                "",
                [b.standard_error.get(scheme) if b else None for b in bands],
            ),
        ]
    rows += [
        (f"check:{scheme}", "from_memory", "", [c.from_memory if c else "n/a" for c in checks]),
    ]
    # the user's own rulebook (--rulebook), with its file
    if any(c is not None and c.user_rulebook for c in checks):
        rows.append((f"check:{scheme}", "user_rulebook", "", [c.rulebook_file if c else "n/a" for c in checks]))
    if any(c is not None and c.electricity_matching is not None for c in checks):
        rows += [
            (
                f"check:{scheme}",
                "matching",
                "",
                [
                    c.electricity_matching.granularity if c and c.electricity_matching else "declared shares"
                    for c in checks
                ],
            ),
            (
                f"check:{scheme}",
                "matched_share",
                "fraction",
                [c.electricity_matching.matched_share if c and c.electricity_matching else None for c in checks],
            ),
        ]
    return rows


def comparison_rows(result: ComparisonResult) -> list[tuple[str, str, str, list]]:
    """(section, key, unit, one value per project) rows: the table and the CSV share them."""
    projects = result.projects
    rows: list[tuple[str, str, str, list]] = [
        ("project", "name", "", [p.project for p in projects]),
        ("project", "product", "", [p.product for p in projects]),
        ("project", "functional_unit", "", [p.functional_unit for p in projects]),
        ("total", "per functional unit", "kg CO2e", [p.total for p in projects]),
        ("total", "unit", "", [p.unit for p in projects]),
        ("basis", result.basis, result.unit, [p.value for p in projects]),
    ]
    if any(p.uncertainty is not None or p.uncertainty_note for p in projects):
        rows += _uncertainty_rows(result)
    for key, unit in INTENSITY_UNITS.items():
        rows.append(("intensity", key, unit, [p.intensity.get(key) for p in projects]))
    for stage in result.stages:
        rows.append(("by_stage", stage, result.unit, [p.by_stage.get(stage) for p in projects]))
    gases = list(dict.fromkeys(gas for p in projects for gas in p.by_gas))
    for gas in gases:
        rows.append(("by_gas", gas, result.unit, [p.by_gas.get(gas) for p in projects]))
    for flow in dict.fromkeys(f for p in projects for f in p.non_ghg_kg):
        rows.append(
            ("non_ghg", f"{flow} (not a GHG)", "kg per functional unit", [p.non_ghg_kg.get(flow) for p in projects])
        )
    for scheme in dict.fromkeys(c.scheme for p in projects for c in p.checks):
        rows += _check_rows(scheme, projects)
    graded = [grade for grade in Grade if any(p.factor_grades.get(grade.value) for p in projects)]
    rows += [
        ("factor_grade", grade.words, "", ["; ".join(p.factor_grades.get(grade.value, [])) or "none" for p in projects])
        for grade in graded
    ]
    return rows


def comparison_csv(result: ComparisonResult) -> str:
    """Wide CSV: a column per project, the factor-grade rows, and the caution row last."""
    header = ["section", "key", "unit"] + [_label(p) for p in result.projects]
    rows = [
        [section, key, unit] + ["" if v is None else v for v in values]
        for section, key, unit, values in comparison_rows(result)
    ]
    return csv_text(header, rows, caution=result.caution)


UNCERTAINTY_ROW_NAMES = {
    "p5": "5th percentile",
    "p50": "median of draws",
    "mean": "mean of draws",
    "p95": "95th percentile",
}


def comparison_row_name(section: str, key: str) -> str:
    """The words heading a row of the comparison table."""
    if section == "intensity":
        return "per " + per_name(key)
    if section == "by_stage":
        return stage_name(key)
    if section == "by_gas":
        return gas_name(key)
    if section == "basis":
        return f"on the common basis (per {per_name(key)})"
    if section == "uncertainty":
        return UNCERTAINTY_ROW_NAMES.get(key, key)
    if section.startswith("check:"):
        return f"{section.split(':', 1)[1]} {key}"
    return key


def comparison_row_words(
    section: str, key: str, unit: str, values: list, result: ComparisonResult
) -> tuple[str, str, list[str]]:
    """A comparison row as the table prints it: its name, its unit and its cells in words and plain numbers."""
    name = comparison_row_name(section, key)
    cells = [
        v if isinstance(v, str) else ("yes" if v else "no") if isinstance(v, bool) else display_number(v)
        for v in values
    ]
    if key.startswith("probability_"):
        name = (
            f"{section.split(':', 1)[1]} "
            f"{'qualifies (probability)' if key == 'probability_qualifies' else '± standard error'}"
        )
        cells = ["" if v is None else f"{v:.2%}" for v in values]
    if section == "uncertainty" and key in ("draws", "seed"):
        cells = [
            v if isinstance(v, str) else "-" if v is None else f"{v:,}" if key == "draws" else str(v) for v in values
        ]
    if section == "factor_grade":  # the ids of the rows not yet verified are listed below the table
        grade = GRADE_BY_WORDS[key]
        name, unit, cells = (
            f"factors: {key}",
            "count",
            [str(len(p.factor_grades.get(grade.value, []))) for p in result.projects],
        )
    return name, unit, cells


def render_comparison(result: ComparisonResult) -> str:
    from rich.table import Table

    console = plain_console()
    console.print(
        f"Comparison: boundary {result.boundary}, basis {result.unit}, GWP100 {gwp_name(result.gwp_basis)}, "
        f"factors {result.factor_set} (sha256 {result.factor_set_sha256[:12]})"
    )
    console.print("Projects: " + "; ".join(f"{p.project} ({Path(p.project_file).name})" for p in result.projects))
    table = Table(show_header=True, show_lines=False)
    table.add_column("")
    table.add_column("unit", overflow="fold")
    for project in result.projects:  # headed by the project's name (its file is in the JSON and CSV)
        table.add_column(project.project, justify="right", overflow="fold")
    section_titles = {"project": None, "total": None, "basis": None}
    last = None
    for section, key, unit, values in comparison_rows(result):
        if (section, key) == ("project", "name"):  # the column heads
            continue
        group = section.split(":")[0]
        if group != last and group not in section_titles:
            table.add_section()
        last = group
        name, unit, cells = comparison_row_words(section, key, unit, values, result)
        table.add_row(name.replace("_", " ") if section != "project" else name, unit, *cells)
    console.print(table)
    console.print(
        "Scheme checks follow each scheme's own rulebook (basis, boundary, "
        "GWP set, electricity rule), not the comparison's boundary."
    )
    if any(p.uncertainty is not None for p in result.projects):
        console.print(
            "Uncertainty rows: percentiles of a Monte Carlo of each project's own distributions "
            "(same seed); probabilities hold only for those distributions."
        )
    flagged = result.from_memory
    if flagged["rulebooks"]:
        console.print(
            f"Rulebooks or thresholds not yet verified against the source document: {', '.join(flagged['rulebooks'])}"
        )
    if flagged["factors"]:
        console.print(
            f"Factors used that are not yet verified against the source document: {', '.join(flagged['factors'])}"
        )
    console.print(f"Caution: {result.caution}")
    return console.export_text()


def monthly_matching(result: ComparisonResult) -> tuple[str, list[str], dict[str, tuple[list[float], list[float]]]]:
    """What the chart's monthly panel shows, read from the checks (never recomputed): the scheme whose
    matching leaves the most electricity unmatched over the projects with a series (the strictest rule
    in the comparison; ``--scheme`` narrows the choice; first in order on a tie), the months, and per
    project with a series its matched and unmatched electricity (kWh) in each month (0 where it has no data)."""
    matched: dict[str, list[float]] = {}
    for project in result.projects:
        for check in project.checks:
            if check.electricity_matching is not None:
                totals = matched.setdefault(check.scheme, [0.0, 0.0])
                totals[0] += check.electricity_matching.matched_kwh
                totals[1] += check.electricity_matching.load_kwh
    if not matched:
        return "", [], {}
    scheme = min(matched, key=lambda name: matched[name][0] / matched[name][1] if matched[name][1] > 0 else 1.0)
    matchings = {
        _label(p): c.electricity_matching
        for p in result.projects
        for c in p.checks
        if c.scheme == scheme and c.electricity_matching is not None
    }
    months = sorted({m.month for matching in matchings.values() for m in matching.monthly})
    by_project = {}
    for label, matching in matchings.items():
        found = {m.month: m for m in matching.monthly}
        by_project[label] = (
            [found[m].matched_kwh if m in found else 0.0 for m in months],
            [found[m].unmatched_kwh if m in found else 0.0 for m in months],
        )
    return scheme, months, by_project


def _monthly_panel(axes, result: ComparisonResult) -> None:
    """Grouped monthly bars: each project's matched electricity (solid), its unmatched (grid) part stacked above
    (hatched)."""

    scheme, months, by_project = monthly_matching(result)
    colours = STAGE_COLOURS
    width = 0.8 / len(by_project)
    for number, (label, (matched, unmatched)) in enumerate(by_project.items()):
        positions = [index - 0.4 + width * (number + 0.5) for index in range(len(months))]
        matched_mwh = [v / 1000.0 for v in matched]
        colour = colours[number % len(colours)]
        bars = axes.bar(positions, matched_mwh, width=width, color=colour, label=f"{label}: matched")
        for index, patch in enumerate(bars.patches):
            patch.set_gid(f"matched-{number}-{months[index]}")
        bars = axes.bar(
            positions,
            [v / 1000.0 for v in unmatched],
            bottom=matched_mwh,
            width=width,
            color="white",
            edgecolor=colour,
            hatch="///",
            label=f"{label}: unmatched (grid)",
        )
        for index, patch in enumerate(bars.patches):
            patch.set_gid(f"unmatched-{number}-{months[index]}")
    axes.set_xticks(range(len(months)), months, rotation=60, ha="right", fontsize=7)
    axes.set_ylabel("electricity use, MWh")
    axes.set_title(
        "Electricity use by month, matched with contracted generation "
        f"under {scheme}'s rule (projects with a time series)",
        fontsize=9,
    )
    axes.legend(fontsize=7, loc="upper left", bbox_to_anchor=(1.01, 1.0))


def _stage_bars(axes, result: ComparisonResult, positions: list[int]) -> tuple[list[float], list[float]]:
    """One stacked bar per project by stage; returns the tops above zero and the bottoms below it."""
    colours = STAGE_COLOURS
    above = [0.0] * len(positions)
    below = [0.0] * len(positions)
    for number, stage in enumerate(result.stages):
        values = [p.by_stage.get(stage, 0.0) for p in result.projects]
        bottoms = [a if v >= 0 else b for v, a, b in zip(values, above, below, strict=True)]
        bars = axes.bar(
            positions, values, bottom=bottoms, width=0.6, label=stage_name(stage), color=colours[number % len(colours)]
        )
        for index, patch in enumerate(bars.patches):
            patch.set_gid(f"bar-{index}-{stage}")
        above = [a + max(v, 0.0) for v, a in zip(values, above, strict=True)]
        below = [b + min(v, 0.0) for v, b in zip(values, below, strict=True)]
    return above, below


def _uncertainty_bands(axes, result: ComparisonResult, positions: list[int], tops: list[float]) -> list:
    """The 5th to 95th percentile of each project with a Monte Carlo band; ``tops`` raised to the bands' tops."""
    bands = [
        (position, project.uncertainty)
        for position, project in zip(positions, result.projects, strict=True)
        if project.uncertainty is not None
    ]
    if bands:
        draws = sorted({band.draws for _, band in bands})
        container = axes.errorbar(
            [position for position, _ in bands],
            [band.p50 for _, band in bands],
            yerr=[[band.p50 - band.p5 for _, band in bands], [band.p95 - band.p50 for _, band in bands]],
            fmt="o",
            color="black",
            markersize=3.5,
            capsize=5,
            linewidth=1.2,
            zorder=5,
            label=f"5th to 95th percentile, dot the median ({', '.join(f'{d:,}' for d in draws)} draws)",
        )
        container.lines[2][0].set_gid("uncertainty-bands")
        for position, band in bands:
            tops[position] = max(tops[position], band.p95)
    return bands


def _limit_lines(axes, result: ComparisonResult) -> None:
    """The scheme limits as horizontal lines."""
    # one line per distinct limit, named in the legend with every scheme that draws it: a label on
    # the plot would sit over a bar's figure or over another limit's label
    by_limit: dict[float, list[str]] = {}
    for line in result.thresholds:
        by_limit.setdefault(line.limit, []).append(line.label)
    styles = ("--", ":", "-.", (0, (5, 1, 1, 1)))
    for number, (limit, texts) in enumerate(sorted(by_limit.items())):
        named = "\n".join("\n  ".join(textwrap.wrap(text, 38)) for text in texts)
        axes.axhline(
            limit, color=INK, linestyle=styles[number % len(styles)], linewidth=1.0, label=f"limit {limit:g}:\n{named}"
        )


def comparison_figure(result: ComparisonResult):
    """A matplotlib figure: one stacked bar per project by stage, scheme limits as lines; below, where
    projects have an electricity time series, their monthly matched and unmatched electricity."""
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    plt.rcParams.update(CHART_STYLE)
    labels = ["\n".join(textwrap.wrap(p.project, 24)) for p in result.projects]  # the project's name, in words
    with_series = bool(monthly_matching(result)[2])
    width = max(7.0, 1.5 * len(labels) + 3.5)
    if with_series:
        figure, (axes, monthly) = plt.subplots(
            2, 1, figsize=(max(width, 10.0), 10.0), layout="constrained", height_ratios=(1.2, 1.0)
        )
        _monthly_panel(monthly, result)
    else:
        figure, axes = plt.subplots(figsize=(width, 5.5), layout="constrained")
    positions = list(range(len(labels)))
    above, below = _stage_bars(axes, result, positions)
    tops = list(above)
    bands = _uncertainty_bands(axes, result, positions, tops)
    for position, project in zip(positions, result.projects, strict=True):
        axes.annotate(
            display_number(project.value),
            (position, max(tops[position], project.value)),
            ha="center",
            va="bottom",
            fontsize=8,
            xytext=(0, 2),
            textcoords="offset points",
        )
    _limit_lines(axes, result)
    axes.set_xticks(positions, labels, rotation=20, ha="right", fontsize=8)
    axes.set_ylabel(f"{result.unit}, {result.boundary}")
    axes.set_title(f"Carbon intensity by stage, {result.boundary} (GWP100 {result.gwp_basis.upper()})", fontsize=10)
    axes.legend(fontsize=7.5, loc="upper left", bbox_to_anchor=(1.01, 1.0))
    limits = [line.limit for line in result.thresholds]
    lows = [band.p5 for _, band in bands]
    axes.set_ylim(min(below + lows + [0.0]) * 1.1, max(tops + limits + [0.0]) * 1.1 or 1.0)
    figure.supxlabel(
        "Dashed lines: scheme limits, each applying on its scheme's own "
        "boundary and basis. Screening estimate, not a certification:\n"
        "the scheme's official methodology, an accredited verifier and local regulation take precedence.",
        fontsize=6.5,
    )
    return figure


def write_chart(result: ComparisonResult, path: str | Path, force: bool = False) -> Path:
    """Write the chart as PNG or SVG (by the file's suffix), atomically, refusing to overwrite."""
    return write_figure(path, lambda: comparison_figure(result), force)
