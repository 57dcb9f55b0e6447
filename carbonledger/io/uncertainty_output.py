"""Table, CSV and JSON of a Monte Carlo run, a headroom search and a sensitivity analysis; charts."""

from __future__ import annotations

import json

from ..about import CAUTION
from ..analyses.headroom import Headroom
from ..analyses.uncertainty import UncertaintyResult
from .chart_files import write_figure
from .csv_text import csv_text
from .labels import INTENSITY_UNITS, gas_name, gwp_name, per_name, stage_name
from .palette import CHART_STYLE, INK, TEAL
from .tables import display_number, plain_console

SUMMARY_KEYS = ("mean", "std", "p5", "p50", "p95", "standard_error")


def uncertainty_rows(result: UncertaintyResult) -> list[tuple]:
    """(section, key, statistic, value, unit) rows of a Monte Carlo run."""
    rows: list[tuple] = [
        ("run", "project", "", result.project, ""),
        ("run", "boundary", "", result.boundary, ""),
        ("run", "functional_unit", "", result.functional_unit, ""),
        ("run", "gwp_basis", "", result.gwp_basis, ""),
        ("run", "factor_set", "", result.factor_set["name"], ""),
        ("run", "draws", "", result.draws, ""),
        ("run", "seed", "", result.seed, ""),
        ("run", "sampling", "", result.sampling, ""),
        ("run", "draws_used", "", result.draws_used, ""),
        ("run", "draws_breaking_limits", "", result.draws_breaking_limits, ""),
    ]
    rows += [("limit_break", item.field, item.expected, item.draws, "draws") for item in result.limit_breaks]
    rows += input_rows(result)

    def add(section: str, key: str, summary, unit: str) -> None:
        if summary is not None:
            rows.extend((section, key, stat, getattr(summary, stat), unit) for stat in SUMMARY_KEYS)

    add("total", "total", result.total, result.unit)
    for key, summary in result.intensity.items():
        add("intensity", key, summary, INTENSITY_UNITS.get(key, key.replace("_", " ")))
    for key, summary in result.by_stage.items():
        add("by_stage", key, summary, result.unit)
    for key, summary in result.by_gas.items():
        add("by_gas", key, summary, result.unit)
    for check in result.checks:
        section = f"check:{check.scheme}"
        add(section, "value", check.value, check.unit)
        rows.append((section, "limit", "", check.limit, check.unit))
        for status, item in check.statuses.items():
            rows.append((section, f"status:{status}", "probability", item.probability, ""))
            rows.append((section, f"status:{status}", "standard_error", item.standard_error, ""))
        for tier, item in check.tiers.items():
            rows.append((section, f"tier:{tier}", "probability", item.probability, ""))
            rows.append((section, f"tier:{tier}", "standard_error", item.standard_error, ""))
    return rows


def input_rows(result: UncertaintyResult) -> list[tuple]:
    """(section, key, statistic, value, unit) rows of the uncertain inputs: each distribution's figures and,
    for a default, why the input got it (its row's pedigree scores, or its source grade) and where."""
    rows: list[tuple] = []
    for item in result.inputs:
        rows += [
            ("input", item.input, key, display_spec(value), "")
            for key, value in item.distribution.items()
            if value is not None
        ]
        if item.default:
            rows += [
                ("input", item.input, "default", item.default, ""),
                ("input", item.input, "stated_in", item.stated_in, ""),
            ]
    if result.default_basis:
        rows.append(("run", "default_distributions", "", result.default_basis, ""))
    return rows


def input_cell(item) -> str:
    """An input's distribution in words: kind, figures, and a mark for a default (footnotes below the table)."""
    spec = dict(item.distribution)
    kind = spec.pop("distribution")
    spec.pop("from_memory", None)
    if item.default:
        spec.pop("median", None)  # the factor's own value
        where = f" [{item.default.split(' (')[0]}] †"
    else:
        where = f" (scores in {item.stated_in})" if item.stated_in else ""
    return (
        f"{kind} "
        + ", ".join(f"{k} {display_spec(v)}" for k, v in spec.items() if v is not None)
        + where
        + (" *" if item.from_memory else "")
    )


def rows_to_csv(header: tuple, rows: list[tuple]) -> str:
    """CSV through the one writer of every command: formula-looking text escaped, a caution row last."""
    return csv_text(header, rows, caution=CAUTION)


def uncertainty_csv(result: UncertaintyResult) -> str:
    return rows_to_csv(("section", "key", "statistic", "value", "unit"), uncertainty_rows(result))


def console_for_text(width: int | None = None):
    """A console that prints names as typed: ``[...]``, ``:name:`` and ``[/]`` are text, never markup."""
    return plain_console(width)


def display_spec(value) -> str:
    if isinstance(value, float):
        return f"{value:.6g}"
    if isinstance(value, (list, tuple)):
        return "(" + ",".join(str(v) for v in value) + ")"
    return str(value)


def print_run(result: UncertaintyResult, console) -> None:
    """The project, the run's settings and the draws left out for breaking a physical limit."""
    console.print(f"{result.project}  ({result.boundary}; {result.functional_unit})")
    console.print(
        f"Monte Carlo: {result.draws:,} draws, seed {result.seed} "
        f"(rerun with --seed {result.seed} for the same numbers), "
        f"sampling {result.sampling.replace('_', ' ')}; GWP100 {gwp_name(result.gwp_basis)}; "
        f"factors {result.factor_set['name']}"
    )
    if result.draws_breaking_limits:
        console.print(
            f"{result.draws_breaking_limits:,} draws break a physical limit and are "
            f"left out (not clipped); statistics over {result.draws_used:,} draws:"
        )
        for item in result.limit_breaks:
            console.print(f"  {item.field}: expected {item.expected}: {item.draws:,} draws")


def print_inputs(result: UncertaintyResult, console) -> None:
    """The uncertain inputs, the notes on defaults and from-memory values, and the rank correlations."""
    from rich.table import Table

    inputs = Table(title="Uncertain inputs", title_justify="left")
    inputs.add_column("input")
    inputs.add_column("distribution")
    for item in result.inputs:
        inputs.add_row(item.input, input_cell(item))
    console.print(inputs)
    defaults = [item for item in result.inputs if item.default]
    if defaults:
        folders = sorted({item.stated_in for item in defaults if item.stated_in})
        console.print(
            "† default distribution (no distribution stated for it): a lognormal "
            f"around the factor row's own value ({', '.join(folders)})"
        )
    if result.default_basis:
        console.print(
            f"  the source grade -> pedigree scores mapping: {result.default_basis}; "
            "factors/uncertainty/grade_defaults.toml"
        )
    if any(item.from_memory for item in result.inputs):
        console.print(
            "* pedigree variances recorded from memory of Weidema et al. (2013), "
            "ecoinvent Report 1 (v3); not yet checked against the report"
        )
    for pair in result.correlations:
        console.print(f"rank correlation {pair['rank']:g}: {' and '.join(pair['inputs'])}")


def uncertainty_table(result: UncertaintyResult) -> str:
    from rich.table import Table

    console = console_for_text()
    print_run(result, console)
    print_inputs(result, console)
    figures = Table(title="Result over the draws", title_justify="left")
    for column in ("figure", "mean", "std", "p5", "p50", "p95", "unit"):
        figures.add_column(column, justify="left" if column in ("figure", "unit") else "right")

    def add(label: str, summary, unit: str) -> None:
        if summary is not None:
            figures.add_row(
                label, *(display_number(getattr(summary, k)) for k in ("mean", "std", "p5", "p50", "p95")), unit
            )

    add("total", result.total, result.unit)
    for key, summary in result.intensity.items():
        if key != "kg_co2e_per_t_nh3":
            add("per " + per_name(key), summary, INTENSITY_UNITS.get(key, key))
    for key, summary in result.by_stage.items():
        add(stage_name(key), summary, result.unit)
    for key, summary in result.by_gas.items():
        add(gas_name(key), summary, result.unit)
    console.print(figures)
    if result.checks:
        checks = Table(title="Probability of each verdict (Monte Carlo standard error)", title_justify="left")
        for column in ("scheme", "limit", "mean value", "p5", "p95", "unit", "qualifies", "best tier met"):
            checks.add_column(
                column, justify="right" if column in ("limit", "mean value", "p5", "p95", "qualifies") else "left"
            )
        for check in result.checks:
            tiers = "; ".join(
                f"{name}: {item.probability:.1%}"
                for name, item in check.tiers.items()
                if item.probability > 0 and len(check.tiers) > 2
            )
            checks.add_row(
                check.scheme + (" *" if check.from_memory else ""),
                display_number(check.limit),
                display_number(check.value.mean),
                display_number(check.value.p5),
                display_number(check.value.p95),
                check.unit,
                f"{check.probability_qualifies:.2%} ± {check.standard_error:.2%}",
                tiers or "-",
            )
        console.print(checks)
        for check in result.checks:  # the draws that do not qualify, by verdict (an undetermined draw met the limit)
            others = "; ".join(
                f"{name.replace('_', ' ')} {item.probability:.1%}"
                for name, item in check.statuses.items()
                if name != "qualifies" and item.probability > 0
            )
            if others:
                console.print(f"{check.scheme}: {others}")
        if any(check.from_memory for check in result.checks):
            console.print("* rulebook or threshold not yet verified against the source document")
    console.print(
        f"Caution: {result.caution} Probabilities hold only for the "
        "distributions given; they are not a verifier's finding."
    )
    return console.export_text()


def plain_json(data) -> str:
    return json.dumps(data, indent=2, allow_nan=False, default=str) + "\n"


def headroom_json(results: list[Headroom]) -> str:
    """One parameter: its object (key ``value``); several: {"headroom": [objects]}."""
    if len(results) == 1:
        return results[0].model_dump_json(indent=2)
    return plain_json({"headroom": [item.model_dump() for item in results]})


def headroom_csv(results: list[Headroom]) -> str:
    keys = (
        "parameter",
        "unit",
        "project_value",
        "value",
        "qualifies_when",
        "scheme",
        "tier",
        "limit",
        "scheme_unit",
        "project_scheme_value",
        "verified_scheme_value",
        "reason",
    )
    return rows_to_csv(
        keys, [tuple("" if getattr(item, k) is None else getattr(item, k) for k in keys) for item in results]
    )


def headroom_table(results: list[Headroom]) -> str:
    from rich.table import Table

    console = plain_console()
    first = results[0]
    console.print(
        f"Headroom under {first.scheme} ({first.tier}): limit {display_number(first.limit)} {first.scheme_unit}; "
        f"the project scores {display_number(first.project_scheme_value)}"
    )
    table = Table(title="Value of each parameter at which the limit is met exactly", title_justify="left")
    for column in ("parameter", "project value", "headroom value", "unit", "qualifies", "note"):
        table.add_column(column, justify="right" if "value" in column else "left", no_wrap=column == "parameter")
    for item in results:
        table.add_row(
            item.parameter,
            display_number(item.project_value),
            "none" if item.value is None else f"{item.value:.6g}",
            item.unit,
            f"{item.qualifies_when} it" if item.qualifies_when else "-",
            item.reason,
        )
    console.print(table)
    console.print(
        "Each value is found by root finding (scipy brentq) within the parameter's physical range and "
        "checked by scoring the project at it; other parameters stay as the project states them."
    )
    console.print(f"Caution: {first.caution}")
    return console.export_text()


def portfolio_uncertainty_json(results: list[UncertaintyResult]) -> str:
    return plain_json({"projects": [result.model_dump(mode="json") for result in results]})


def portfolio_uncertainty_csv(results: list[UncertaintyResult]) -> str:
    rows = [(result.project_file, *row) for result in results for row in uncertainty_rows(result)]
    return rows_to_csv(("project_file", "section", "key", "statistic", "value", "unit"), rows)


def portfolio_uncertainty_table(results: list[UncertaintyResult]) -> str:
    from rich.table import Table

    console = plain_console()
    first = results[0]
    console.print(
        f"Monte Carlo of {len(results)} projects: {first.draws:,} draws each, seed {first.seed}, "
        f"sampling {first.sampling.replace('_', ' ')}; GWP100 {gwp_name(first.gwp_basis)}"
    )
    table = Table(title="Total and probability of qualifying per project and scheme", title_justify="left")
    for column in ("project", "total mean", "p5", "p95", "unit", "scheme", "qualifies", "draws left out"):
        table.add_column(
            column, justify="right" if column in ("total mean", "p5", "p95", "qualifies", "draws left out") else "left"
        )
    for result in results:
        head = [
            result.project,
            display_number(result.total.mean),
            display_number(result.total.p5),
            display_number(result.total.p95),
            result.unit,
        ]
        checks = result.checks or [None]
        for number, check in enumerate(checks):
            cells = head if number == 0 else [""] * len(head)
            scheme = "-" if check is None else check.scheme
            chance = "-" if check is None else f"{check.probability_qualifies:.2%} ± {check.standard_error:.2%}"
            table.add_row(*cells, scheme, chance, str(result.draws_breaking_limits) if number == 0 else "")
    console.print(table)
    console.print(f"Caution: {first.caution} Probabilities hold only for the distributions given.")
    return console.export_text()


def uncertainty_figure(result: UncertaintyResult):
    """One histogram per scheme of its value over the draws used, each threshold a dashed line."""
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    plt.rcParams.update(CHART_STYLE)
    draws = result.scheme_draws()
    checks = [check for check in result.checks if check.scheme in draws]
    count = max(1, len(checks))
    figure, axes = plt.subplots(count, 1, figsize=(9, 2.6 * count + 1.0), layout="constrained", squeeze=False)
    for axis, check in zip(axes[:, 0], checks, strict=False):
        values, thresholds = draws[check.scheme]
        axis.hist(values, bins=60, color=TEAL, alpha=0.85)
        for tier, limit in thresholds:
            axis.axvline(limit, color=INK, linestyle="--", linewidth=0.9)
            axis.annotate(
                f"{tier}: {display_number(limit)}",
                (limit, 0.97),
                xycoords=("data", "axes fraction"),
                rotation=90,
                ha="right",
                va="top",
                fontsize=6.5,
            )
        others = ", ".join(
            f"{name.replace('_', ' ')} {item.probability:.1%}"
            for name, item in check.statuses.items()
            if name != "qualifies" and item.probability > 0
        )
        axis.set_title(
            f"{check.scheme}: qualifies in {check.probability_qualifies:.1%} of draws (± {check.standard_error:.1%})"
            + (f"; {others}" if others else ""),
            fontsize=9,
        )
        axis.set_xlabel(check.unit, fontsize=8)
        axis.set_ylabel("draws", fontsize=8)
    figure.suptitle(
        f"{result.project}\n{result.draws_used:,} draws (seed {result.seed}), each scheme on its own rulebook",
        fontsize=9,
    )
    figure.supxlabel(
        "Dashed lines: scheme thresholds. Screening estimate, not a certification: the scheme's "
        "official methodology, an accredited verifier and local regulation take precedence.",
        fontsize=6,
    )
    return figure


def write_uncertainty_chart(result: UncertaintyResult, path, force: bool = False):
    """Write the histograms as PNG or SVG (by the file's suffix), atomically, refusing to overwrite."""
    return write_figure(path, lambda: uncertainty_figure(result), force)
