"""The Uncertainty sheet of the audit workbook: the distributions of a Monte Carlo run and what
came out of it (mean, standard deviation, 5th/50th/95th percentiles, probability of each verdict
with its Monte Carlo standard error), and the draws themselves as a CSV beside the workbook.

The sheet holds values, not formulas: the draws are made and solved by carbonledger
(``analyses.uncertainty``); the writer takes that result and never draws or scores. The seed is
written, so the same run can be repeated with ``carbonledger uncertainty --seed``.
"""

from __future__ import annotations

import csv
import math
from pathlib import Path

import numpy as np

from ...analyses.uncertainty import UncertaintyResult
from ..csv_text import spreadsheet_safe
from ..files import atomic_write
from ..labels import INTENSITY_LABELS, INTENSITY_UNITS, stage_name
from .layout import put_text, put_value, set_widths
from .style import header_texts, number_format, page_setup, style_cell, wrap_columns

UNCERTAINTY = "Uncertainty"
SUMMARY_COLUMNS = (
    "figure",
    "mean",
    "standard deviation",
    "5th percentile",
    "median (50th)",
    "95th percentile",
    "standard error of the mean",
    "unit",
)
CHECK_COLUMNS = (
    "scheme",
    "limit",
    "unit",
    "mean value",
    "5th percentile",
    "95th percentile",
    "probability of qualifying",
    "standard error",
    "other statuses",
    "best tier met",
    "from memory",
)


def _number(ws, row: int, column: int, value, number: str | None = None):
    """A figure as a number (an empty cell when it is not finite, e.g. with no draw used)."""
    if value is None or (isinstance(value, float) and not math.isfinite(value)):
        return put_text(ws, row, column, "n/a")
    cell = put_value(ws, row, column, value)
    style_cell(cell, "engine", number or number_format(value))
    return cell


def _spec_text(spec: dict) -> str:
    shown = {
        key: value for key, value in spec.items() if key not in ("distribution", "from_memory") and value is not None
    }
    parts = []
    for key, value in shown.items():
        if isinstance(value, (list, tuple)):
            value = "(" + ", ".join(str(v) for v in value) + ")"
        elif isinstance(value, float):
            value = f"{value:.6g}"
        parts.append(f"{key.replace('_', ' ')} {value}")
    return "; ".join(parts)


def _write_inputs(ws, row: int, result: UncertaintyResult) -> int:
    """The uncertain inputs, where each was stated (or why it got a default), correlations; returns the next row."""
    row += 1
    style_cell(put_text(ws, row, 1, "Uncertain inputs"), "title")
    row += 1
    header_texts(ws, row, ("input", "distribution", "its parameters", "stated in", "from memory"))
    row += 1
    for item in result.inputs:
        put_text(ws, row, 1, item.input)
        put_text(ws, row, 2, item.distribution.get("distribution"))
        put_text(ws, row, 3, _spec_text(item.distribution))
        stated = f"{item.stated_in}: {item.default}" if item.default else item.stated_in
        put_text(ws, row, 4, stated or "the run's distributions (project [uncertainty] table or --distributions file)")
        put_text(
            ws,
            row,
            5,
            "yes: pedigree variances from memory of Weidema et al. (2013), ecoinvent Report 1 (v3)"
            if item.from_memory
            else "no",
        )
        row += 1
    if result.default_basis:
        put_text(ws, row, 1, f"Default distributions from the factor rows' source grades: {result.default_basis}")
        row += 1
    for pair in result.correlations:
        put_text(ws, row, 1, "rank correlation")
        put_text(ws, row, 2, f"{pair['rank']:g}")
        put_text(ws, row, 3, " and ".join(pair["inputs"]))
        row += 1
    return row


def _write_checks(ws, row: int, result: UncertaintyResult) -> int:
    """The probability of each verdict over the draws, one row per scheme check; returns the next row."""
    row += 1
    style_cell(put_text(ws, row, 1, "Probability of each verdict (with its Monte Carlo standard error)"), "title")
    row += 1
    header_texts(ws, row, CHECK_COLUMNS)
    row += 1
    for check in result.checks:
        put_text(ws, row, 1, f"{check.scheme}: {check.name}")
        _number(ws, row, 2, check.limit)
        put_text(ws, row, 3, check.unit)
        _number(ws, row, 4, check.value.mean)
        _number(ws, row, 5, check.value.p5)
        _number(ws, row, 6, check.value.p95)
        _number(ws, row, 7, check.probability_qualifies, "0.00%")
        _number(ws, row, 8, check.standard_error, "0.00%")
        others = [
            f"{name.replace('_', ' ')} {item.probability:.2%} (± {item.standard_error:.2%})"
            for name, item in check.statuses.items()
            if name != "qualifies" and item.probability > 0
        ]
        put_text(ws, row, 9, "; ".join(others) or "none")
        tiers = [f"{name}: {item.probability:.2%}" for name, item in check.tiers.items() if item.probability > 0]
        put_text(ws, row, 10, "; ".join(tiers) if len(check.tiers) > 2 else "-")
        put_text(ws, row, 11, "yes" if check.from_memory else "no")
        row += 1
    return row


def write_uncertainty_sheet(ws, result: UncertaintyResult, draws_csv: str = "") -> None:
    """Fill ``ws`` with the distributions and the summary of ``result`` (values, not formulas)."""
    style_cell(put_text(ws, 1, 1, f"Uncertainty: Monte Carlo of {result.project}"), "title")
    run = [
        ("Draws", result.draws),
        ("Seed (the same seed gives the same numbers)", result.seed),
        ("Sampling", result.sampling.replace("_", " ")),
        ("Draws within every physical limit (the statistics are over these)", result.draws_used),
        ("Draws breaking a physical limit (left out, never clipped)", result.draws_breaking_limits),
        ("Boundary", result.boundary),
        ("Functional unit", result.functional_unit),
        ("GWP100 set of the headline result", result.gwp_basis.upper()),
        ("Factor set", f"{result.factor_set['name']} (sha256 {result.factor_set['sha256']})"),
        ("Draws CSV beside this workbook", draws_csv or "not written (ask for it with --draws-csv)"),
        (
            "Caution",
            f"{result.caution} Probabilities hold only for the distributions below; they are not a verifier's finding.",
        ),
    ]
    row = 3
    for label, value in run:
        put_text(ws, row, 1, label)
        put_value(ws, row, 2, value)
        row += 1
    for item in result.limit_breaks:
        put_text(ws, row, 1, f"Limit broken: {item.field}")
        put_text(ws, row, 2, f"expected {item.expected}: {item.draws:,} draws")
        row += 1

    row = _write_inputs(ws, row, result)
    row += 1
    style_cell(put_text(ws, row, 1, "Result over the draws"), "title")
    row += 1
    header_texts(ws, row, SUMMARY_COLUMNS)
    row += 1
    figures = [("Total per functional unit", result.total, result.unit)]
    figures += [
        (INTENSITY_LABELS.get(key, key), summary, INTENSITY_UNITS.get(key, key))
        for key, summary in result.intensity.items()
        if summary is not None
    ]
    figures += [(f"Stage: {stage_name(key)}", summary, result.unit) for key, summary in result.by_stage.items()]
    figures += [(f"Gas: {key.replace('_', ' ')}", summary, result.unit) for key, summary in result.by_gas.items()]
    for label, summary, unit in figures:
        put_text(ws, row, 1, label)
        for column, key in enumerate(("mean", "std", "p5", "p50", "p95", "standard_error"), start=2):
            _number(ws, row, column, getattr(summary, key))
        put_text(ws, row, 8, unit)
        row += 1

    if result.checks:
        row = _write_checks(ws, row, result)

    set_widths(ws, {"A": 46, "B": 16, "C": 30, "D": 16, "E": 14, "F": 14, "G": 14, "H": 16, "I": 30, "J": 30, "K": 10})
    wrap_columns(ws, "ACIJ", 3)
    page_setup(ws, title_columns="A:A", pages_wide=1)


def draws_csv_path(workbook_path: str | Path) -> Path:
    """Where the draws CSV of a workbook goes: beside it, ``NAME.draws.csv``."""
    path = Path(workbook_path)
    return path.with_name(f"{path.stem}.draws.csv")


def write_draws_csv(path: str | Path, result: UncertaintyResult, force: bool = False) -> Path:
    """Every draw of a run kept with ``keep_draws``: one row per draw, then the caution row
    (atomic; an existing file is left untouched without ``force``; text cells spreadsheet-safe)."""
    columns = result.draw_columns()
    if columns is None:
        raise ValueError("the Monte Carlo run did not keep its draws (keep_draws=True)")
    names = list(columns)

    def write(temporary: Path) -> None:
        with temporary.open("w", newline="", encoding="utf-8") as handle:
            writer = csv.writer(handle, lineterminator="\n")
            writer.writerow([spreadsheet_safe(name) for name in names])
            for values in zip(*(columns[name] for name in names), strict=True):
                writer.writerow([_cell(value) for value in values])
            writer.writerow(["caution", result.caution] + [""] * (len(names) - 2))

    return atomic_write(path, write, force=force)


def _cell(value) -> str:
    if isinstance(value, (bool, np.bool_)):
        return "true" if value else "false"
    if isinstance(value, str):
        return spreadsheet_safe(value)
    if isinstance(value, (int, np.integer)):
        return str(int(value))
    number = float(value)
    return repr(number) if math.isfinite(number) else ""
