"""Readable tables (rich) and long-format CSV of a ScoreResult, units on every number."""

from __future__ import annotations

import csv
import io

from ..core.results import ScoreResult

INTENSITY_UNITS = {
    "kg_co2e_per_t_nh3": "kg CO2e/t NH3",
    "kg_co2e_per_kg_h2": "kg CO2e/kg H2",
    "g_co2e_per_mj": "g CO2e/MJ (LHV)",
}


def display_number(value: float | None) -> str:
    if value is None:
        return "-"
    size = abs(value)
    if size >= 100:
        return f"{value:,.1f}"
    if size >= 1 or size == 0:
        return f"{value:.3f}"
    return f"{value:.4g}"


def csv_rows(result: ScoreResult) -> list[tuple[str, str, object, str]]:
    """(section, key, value, unit) rows: the result in a shape any spreadsheet reads."""
    rows: list[tuple[str, str, object, str]] = [
        ("project", "name", result.project, ""),
        ("project", "product", result.product, ""),
        ("project", "boundary", result.boundary, ""),
        ("project", "functional_unit", result.functional_unit, ""),
        ("project", "gwp_basis", result.gwp_basis, ""),
        ("project", "factor_set", result.factor_set.name, ""),
        ("project", "factor_set_sha256", result.factor_set.sha256, ""),
        ("total", "total", result.total, result.unit),
    ]
    rows += [("intensity", key, value, INTENSITY_UNITS[key]) for key, value in result.intensity.model_dump().items() if value is not None]
    rows.append(("hydrogen_production", "kg_co2e_per_kg_h2", result.hydrogen_production_kg_co2e_per_kg_h2, "kg CO2e/kg H2"))
    rows += [("by_stage", key, value, result.unit) for key, value in result.by_stage.items()]
    rows += [("by_gas", key, value, result.unit) for key, value in result.by_gas.items()]
    rows += [("non_ghg", key, value, "kg per functional unit") for key, value in result.non_ghg_kg.items()]
    for check in result.checks:
        rows += [
            (f"check:{check.scheme}", "value", check.value, check.unit),
            (f"check:{check.scheme}", "limit", check.limit, check.unit),
            (f"check:{check.scheme}", "margin", check.margin, check.unit),
            (f"check:{check.scheme}", "passes", check.passes, ""),
            (f"check:{check.scheme}", "tier", check.tier or "", ""),
            (f"check:{check.scheme}", "status", check.status, ""),
            (f"check:{check.scheme}", "assessment_period", check.assessment_period, ""),
        ]
        rows += [(f"check:{check.scheme}", "rule_version", version, "") for version in check.rule_versions]
        rows += [(f"check:{check.scheme}", "reason", reason, "") for reason in check.reasons]
    return rows


def to_csv(rows: list[tuple]) -> str:
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow(("section", "key", "value", "unit"))
    writer.writerows(rows)
    return buffer.getvalue()


def render(result: ScoreResult) -> str:
    """A readable report of one result, as plain text."""
    from rich.console import Console
    from rich.table import Table

    console = Console(file=io.StringIO(), record=True, width=110, force_terminal=False, color_system=None)
    console.print(f"[bold]{result.project}[/bold]  ({result.product}, {result.boundary})")
    console.print(
        f"functional unit: {result.functional_unit}   GWP100: {result.gwp_basis.upper()}   "
        f"factors: {result.factor_set.name} (sha256 {result.factor_set.sha256[:12]})"
    )
    console.print(f"total: [bold]{display_number(result.total)} {result.unit}[/bold]")
    intensity = Table(title="Carbon intensity", title_justify="left", show_header=True)
    intensity.add_column("per")
    intensity.add_column("value", justify="right")
    intensity.add_column("unit")
    for key, value in result.intensity.model_dump().items():
        if value is not None:
            intensity.add_row(key.split("_per_")[1].replace("_", " "), display_number(value), INTENSITY_UNITS[key])
    intensity.add_row("hydrogen plant gate", display_number(result.hydrogen_production_kg_co2e_per_kg_h2), "kg CO2e/kg H2")
    console.print(intensity)
    for title, values in (("By stage", result.by_stage), ("By gas", result.by_gas)):
        table = Table(title=title, title_justify="left")
        table.add_column(title.split()[1])
        table.add_column("kg CO2e", justify="right")
        table.add_column("share", justify="right")
        for key, value in values.items():
            share = value / result.total if result.total else 0.0
            table.add_row(key.replace("_", " "), display_number(value), f"{share:.1%}")
        console.print(table)
    for flow, kilograms in result.non_ghg_kg.items():
        if kilograms:
            console.print(f"{flow.upper()} emitted (not a greenhouse gas, not in CO2e): {display_number(kilograms)} kg per functional unit")
    if result.checks:
        table = Table(title="Scheme checks (each under its own rulebook)", title_justify="left")
        for column in ("scheme", "value", "limit", "unit", "status", "margin", "tier", "GWP"):
            table.add_column(column, justify="right" if column in ("value", "limit", "margin") else "left")
        for check in result.checks:
            table.add_row(
                check.scheme + (" *" if check.from_memory else ""),
                display_number(check.value),
                display_number(check.limit),
                check.unit,
                check.status.replace("_", " ").upper() if check.status != "qualifies" else check.status,
                display_number(check.margin),
                check.tier or "-",
                check.gwp_basis.upper(),
            )
        console.print(table)
        for check in result.checks:
            if check.reasons:
                console.print(f"{check.scheme}: {check.status.replace('_', ' ')}, first reason: {check.reasons[0]}", highlight=False, markup=False)
        period = result.checks[0].assessment_period
        console.print(f"Scheme rules read on the dates of {period} (--year). Each check is on its rulebook's own basis and boundary; every reason is in the JSON and CSV output.")
        if any(check.from_memory for check in result.checks):
            console.print("* rulebook or threshold recorded from memory, not yet checked against the legal text")
    flagged = [f.id for f in result.factors_used if f.from_memory]
    if flagged:
        console.print(f"{len(flagged)} of {len(result.factors_used)} factors used are flagged from memory (not checked against their document): {', '.join(flagged)}")
    console.print(f"Caution: {result.caution}")
    return console.export_text()
