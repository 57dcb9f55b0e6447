"""Readable tables (rich) and long-format CSV of a ScoreResult, units on every number."""

from __future__ import annotations

import io

from ..core.results import ScoreResult
from ..model.rulebooks import USER_RULEBOOK
from .csv_text import csv_text
from .labels import INTENSITY_UNITS, factor_grades_sentence, gas_name, gwp_name, per_name, stage_name, status_name

SCORE_CSV_HEADER = ("section", "key", "value", "unit", "from_memory", "grade")


def display_number(value: float | None) -> str:
    if value is None:
        return "-"
    if abs(value) < 1e-9:  # rounding residue of a difference, e.g. a fully matched check
        value = 0.0
    size = abs(value)
    if size >= 100:
        return f"{value:,.1f}"
    if size >= 1 or size == 0:
        return f"{value:.3f}"
    return f"{value:.4g}"


def _check_csv_rows(check) -> list[tuple]:
    """The rows of one scheme check: its co-product rule, value, limit, status, rulebook and reasons."""
    section = f"check:{check.scheme}"
    rows: list[tuple] = [
        (section, f"co_products.{key}", value, "", check.from_memory) for key, value in check.co_products.items()
    ]
    rows += [
        (section, "value", check.value, check.unit, check.from_memory),
        (section, "limit", check.limit, check.unit, check.from_memory),
        (section, "margin", check.margin, check.unit, check.from_memory),
        (section, "passes", check.passes, "", check.from_memory),
        (section, "tier", check.tier or "", "", check.from_memory),
        (section, "status", check.status, "", check.from_memory),
        (section, "assessment_period", check.assessment_period, "", check.from_memory),
    ]
    if check.user_rulebook:
        rows += [
            (section, "user_rulebook", True, "", check.from_memory),
            (section, "rulebook_file", check.rulebook_file, "", check.from_memory),
        ]
    rows += [(section, "rule_version", version, "", check.from_memory) for version in check.rule_versions]
    rows += [(section, "reason", reason, "", check.from_memory) for reason in check.reasons]
    return rows


def _matching_csv_rows(check) -> list[tuple]:
    """The rows of one check's temporal matching: the year's figures, by source, then month by month."""
    matching = check.electricity_matching
    section = f"matching:{check.scheme}"
    rows: list[tuple] = [
        (section, "granularity", matching.granularity, "", ""),
        (section, "rule", matching.rule, "", ""),
        (section, "matched_share", matching.matched_share, "fraction", ""),
        (section, "load_kwh", matching.load_kwh, "kWh", ""),
        (section, "matched_kwh", matching.matched_kwh, "kWh", ""),
        (section, "unmatched_kwh", matching.unmatched_kwh, "kWh", ""),
        (section, "grid_kwh_per_kg_h2", matching.grid_kwh_per_kg_h2, "kWh/kg H2", ""),
        (section, "electricity_g_co2e_per_kwh", matching.electricity_g_co2e_per_kwh, "g CO2e/kWh", ""),
        (section, "value_with_declared_shares", matching.value_with_declared_shares, check.unit, ""),
    ]
    rows += [(section, f"matched_kwh.{name}", kwh, "kWh", "") for name, kwh in matching.matched_by_source_kwh.items()]
    for month in matching.monthly:
        rows += [
            (f"{section}:{month.month}", "load_kwh", month.load_kwh, "kWh", ""),
            (f"{section}:{month.month}", "matched_kwh", month.matched_kwh, "kWh", ""),
            (f"{section}:{month.month}", "unmatched_kwh", month.unmatched_kwh, "kWh", ""),
            (
                f"{section}:{month.month}",
                "electricity_g_co2e_per_kwh",
                month.electricity_g_co2e_per_kwh,
                "g CO2e/kWh",
                "",
            ),
            (f"{section}:{month.month}", "value", month.value, check.unit, ""),
        ]
    return rows


def csv_rows(result: ScoreResult) -> list[tuple]:
    """(section, key, value, unit, from_memory[, grade]) rows: the result in a shape any spreadsheet reads.

    Every factor used is a ``factor`` row with its source grade (``from_memory`` true exactly when
    it is "not yet verified"), and every scheme check says whether its rulebook was recorded from memory.
    """
    rows: list[tuple] = [
        ("project", "name", result.project, "", ""),
        ("project", "product", result.product, "", ""),
        ("project", "boundary", result.boundary, "", ""),
        ("project", "functional_unit", result.functional_unit, "", ""),
        ("project", "gwp_basis", result.gwp_basis, "", ""),
        ("project", "factor_set", result.factor_set.name, "", ""),
        ("project", "factor_set_sha256", result.factor_set.sha256, "", ""),
        ("total", "total", result.total, result.unit, ""),
    ]
    rows += [
        ("rebalanced_share", f"electricity.sources.{name}.share", share, "fraction", "")
        for name, share in result.rebalanced_shares.items()
    ]
    rows += [
        ("intensity", key, value, INTENSITY_UNITS[key], "")
        for key, value in result.intensity.model_dump().items()
        if value is not None
    ]
    rows.append(
        ("hydrogen_production", "kg_co2e_per_kg_h2", result.hydrogen_production_kg_co2e_per_kg_h2, "kg CO2e/kg H2", "")
    )
    rows += [("by_stage", key, value, result.unit, "") for key, value in result.by_stage.items()]
    rows += [("by_gas", key, value, result.unit, "") for key, value in result.by_gas.items()]
    rows += [("non_ghg", key, value, "kg per functional unit", "") for key, value in result.non_ghg_kg.items()]
    rows.append(
        (
            "hydrogen_leakage",
            "kg_co2e_indirect_gwp100",
            result.hydrogen_leakage_kg_co2e,
            "kg CO2e per functional unit (not in the total)",
            "",
        )
    )
    rows += [
        ("biogenic_co2", key, value, "kg CO2 per functional unit (counted apart, not in the total)", "")
        for key, value in result.biogenic_co2_kg.items()
    ]
    for check in result.checks:
        rows += _check_csv_rows(check)
        if check.electricity_matching is not None:
            rows += _matching_csv_rows(check)
    rows += [
        ("factor", factor.id, factor.value, factor.unit, factor.from_memory, factor.grade.words)
        for factor in result.factors_used
    ]
    return rows


def score_csv(result: ScoreResult) -> str:
    """The long-format CSV of a result, ending in the caution row."""
    width = len(SCORE_CSV_HEADER)
    return csv_text(
        SCORE_CSV_HEADER, [row + ("",) * (width - len(row)) for row in csv_rows(result)], caution=result.caution
    )


def terminal_width(default: int = 100) -> int:
    """The width the tables are set to: the terminal's (or $COLUMNS), at least 60 columns; when
    the output is not a terminal and $COLUMNS is unset, ``default``."""
    import shutil

    return max(60, shutil.get_terminal_size((default, 24)).columns)


def assessment_year(result) -> str:
    """The year whose dates the scheme rules were read on: ``assessment_year`` where the result
    carries it, else the first check's ``assessment_period``."""
    year = getattr(result, "assessment_year", None)
    if year is None:
        year = next(
            (c.assessment_period for c in getattr(result, "checks", []) if getattr(c, "assessment_period", "")), ""
        )
    return str(year or "")


def plain_console(width: int | None = None):
    """A rich console that renders text as written: no markup, no emoji codes, no highlighting.

    Project names, factor ids and set names come from users; with markup off, "Plant [phase1] test"
    or "[bold]" print as typed and "[/]" cannot break the output. Tables fit ``width`` (default: the
    terminal's, ``terminal_width``); lines of text are not cut (soft wrap), so a file path or a
    reason stays whole for copying.
    """
    from rich.console import Console

    return Console(
        file=io.StringIO(),
        record=True,
        width=width or terminal_width(),
        soft_wrap=True,
        force_terminal=False,
        color_system=None,
        markup=False,
        emoji=False,
        highlight=False,
    )


def plain_table(
    headers: list[str], rows: list[list[str]], right: set[str] = frozenset(), wrap: set[str] = frozenset()
) -> str:
    """A table without borders that fits the terminal. Column heads and the ``wrap`` columns (text)
    wrap between words; a figure, id or name is never cut; ``right`` columns are right-aligned; text
    as typed. A table whose narrowest layout is wider than the terminal is printed at that width
    rather than losing a column."""
    from rich import box
    from rich.table import Table

    table = Table(box=box.SIMPLE_HEAD, show_edge=False, pad_edge=False)
    for header in headers:
        table.add_column(
            header,
            justify="right" if header in right else "left",
            no_wrap=header not in wrap,
            overflow="fold",
            ratio=1 if header in wrap else None,
        )
    for row in rows:
        table.add_row(*row)
    narrowest = sum(
        8 if header in wrap else max([len(header)] + [len(row[i]) for row in rows]) for i, header in enumerate(headers)
    ) + 3 * (len(headers) - 1)
    console = plain_console(max(terminal_width(), narrowest))
    console.print(table)
    return "\n".join(line.rstrip() for line in console.export_text().splitlines()) + "\n"


def _matching_tables(console, checks, Table) -> None:
    """Per scheme: the matching and its effect; per month: load and each scheme's matched share."""
    first = checks[0].electricity_matching
    console.print(
        f"Electricity matched interval by interval: {first.series_file}, {first.intervals:,} "
        f"intervals of {first.interval_minutes} minutes from {first.first_interval}; "
        "unmatched electricity at the "
        f"{'grid intensity of each interval' if first.grid_intensity == 'series' else 'grid source factor'}. "
        "The headline above uses the declared shares; the checks use the matching."
    )
    table = Table(title="Electricity matching by scheme", title_justify="left")
    for column in (
        "scheme",
        "matching",
        "matched",
        "grid kWh/kg H2",
        "electricity g CO2e/kWh",
        "with declared shares",
        "with matching",
        "unit",
    ):
        table.add_column(column, justify="left" if column in ("scheme", "matching", "unit") else "right")
    for check in checks:
        m = check.electricity_matching
        table.add_row(
            check.scheme,
            m.granularity,
            f"{m.matched_share:.1%}",
            display_number(m.grid_kwh_per_kg_h2),
            display_number(m.electricity_g_co2e_per_kwh),
            display_number(m.value_with_declared_shares),
            display_number(check.value),
            check.unit,
        )
    console.print(table)
    months = Table(title="By month: electricity use and matched share under each scheme", title_justify="left")
    months.add_column("month")
    months.add_column("use MWh", justify="right")
    for check in checks:
        months.add_column(check.scheme, justify="right")
    for number, month in enumerate(first.monthly):
        months.add_row(
            month.month,
            f"{month.load_kwh / 1000:,.1f}",
            *(f"{check.electricity_matching.monthly[number].matched_share:.1%}" for check in checks),
        )
    console.print(months)


def rebalanced_lines(shares: dict[str, float]) -> list[str]:
    """A line per electricity share that took up the difference to 1 (--rebalance)."""
    return [
        f"electricity share rebalanced: {name} {display_number(share)}, 1 "
        f"less the other sources' shares after --set (--rebalance {name})"
        for name, share in shares.items()
    ]


def user_rulebook_line(scheme) -> str:
    """The mark of a user rulebook (a ``Scheme``, or a ``Check`` under one): whose limits they are, and the file."""
    scheme_id, file = (
        (scheme.scheme, scheme.rulebook_file) if hasattr(scheme, "rulebook_file") else (scheme.id, scheme.user_file)
    )
    return f"{scheme_id}: {USER_RULEBOOK}, read from {file}: the limits are the user's own, not a shipped scheme's"


def render(result: ScoreResult) -> str:
    """A readable report of one result, as plain text."""
    from rich.table import Table

    console = plain_console()
    console.print(f"{result.project}  ({result.product}, {result.boundary})")
    console.print(f"project file: {result.project_file}")
    console.print(
        f"functional unit: {result.functional_unit}   GWP100: {gwp_name(result.gwp_basis)}   "
        f"factors: {result.factor_set.name} (sha256 {result.factor_set.sha256[:12]})"
    )
    console.print(f"total: {display_number(result.total)} {result.unit}")
    for line in rebalanced_lines(result.rebalanced_shares):
        console.print(line)
    _print_breakdowns(console, result, Table)
    for note in _result_notes(result):
        console.print(note)
    if result.checks:
        _print_checks(console, result, Table)
    console.print(factor_grades_sentence(result.factor_grades, len(result.factors_used)), highlight=False, markup=False)
    console.print(f"Caution: {result.caution}")
    return console.export_text()


def _print_breakdowns(console, result: ScoreResult, Table) -> None:
    """The intensities, then the total by stage and by gas with their shares."""
    intensity = Table(title="Carbon intensity", title_justify="left", show_header=True)
    intensity.add_column("per")
    intensity.add_column("value", justify="right")
    intensity.add_column("unit")
    for key, value in result.intensity.model_dump().items():
        if value is not None:
            intensity.add_row(per_name(key), display_number(value), INTENSITY_UNITS[key])
    intensity.add_row(
        "hydrogen plant gate", display_number(result.hydrogen_production_kg_co2e_per_kg_h2), "kg CO2e/kg H2"
    )
    console.print(intensity)
    for title, values, name in (("By stage", result.by_stage, stage_name), ("By gas", result.by_gas, gas_name)):
        table = Table(title=title, title_justify="left")
        table.add_column(title.split()[1])
        table.add_column(result.unit, justify="right")
        table.add_column("share", justify="right")
        for key, value in values.items():
            share = value / result.total if result.total else 0.0
            table.add_row(name(key), display_number(value), f"{share:.1%}")
        console.print(table)


def _result_notes(result: ScoreResult) -> list[str]:
    """What the total leaves out and why: NH3, leaked hydrogen, biogenic CO2, the co-product's method."""
    notes = []
    if result.non_ghg_kg.get("nh3"):
        notes.append(
            f"NH3 emitted (not a greenhouse gas, not in CO2e): {display_number(result.non_ghg_kg['nh3'])} "
            "kg per functional unit"
        )
    if result.hydrogen_leakage_kg:
        notes.append(
            f"H2 leaked: {display_number(result.hydrogen_leakage_kg)} kg per functional unit; its indirect effect, "
            f"{display_number(result.hydrogen_leakage_kg_co2e)} kg CO2e (GWP100 "
            "of hydrogen), is not in the total or any scheme value"
        )
    biogenic = result.biogenic_co2_kg
    if biogenic.get("released") or biogenic.get("captured_and_stored"):
        notes.append(
            "Biogenic CO2 (carbon from biomass, counted apart, not in the "
            f"total): released {display_number(biogenic['released'])} kg, "
            f"captured and stored {display_number(biogenic['captured_and_stored'])} "
            "kg per functional unit; the stored CO2 is not "
            "netted against the total or a scheme value unless its rulebook says so"
        )
    if result.co_products:
        notes.append(
            f"Co-product: {result.co_products.get('co_product', '')}, the project's "
            f"method {result.co_products.get('method', '')} in the total; "
            "each scheme's value uses its rulebook's rule where it states one (JSON key co_products on each check)"
        )
    return notes


def _print_checks(console, result: ScoreResult, Table) -> None:
    """The scheme checks, each one's deciding reason, the assessment year and the matching tables."""
    table = Table(title="Scheme checks (each under its own rulebook)", title_justify="left")
    for column in ("scheme", "status", "value", "limit", "unit", "tier", "GWP"):  # tier and unit wrap first
        table.add_column(
            column,
            justify="right" if column in ("value", "limit") else "left",
            no_wrap=column in ("scheme", "status", "value", "limit", "GWP"),
            overflow="fold",
        )
    for check in result.checks:
        table.add_row(
            check.scheme + (" *" if check.from_memory else ""),
            status_name(check.status),
            display_number(check.value),
            display_number(check.limit),
            check.unit,
            check.tier or "-",
            gwp_name(check.gwp_basis),
        )
    console.print(table)
    for check in result.checks:
        if check.user_rulebook:
            console.print(user_rulebook_line(check))
    for check in result.checks:
        if check.reasons:  # the deciding reason comes first
            console.print(
                f"{check.scheme}: {status_name(check.status)}, because {check.reasons[0]}",
                highlight=False,
                markup=False,
            )
    console.print(
        f"Assessment year {assessment_year(result)}: the scheme rules "
        "are read on its dates (--year). Each check is on its "
        "rulebook's own basis and boundary; every reason is in the JSON and CSV output."
    )
    matched = [check for check in result.checks if check.electricity_matching is not None]
    if matched:
        _matching_tables(console, matched, Table)
    if result.boundary != "cradle-to-gate":
        console.print(
            "Scheme checks stay on each rulebook's own basis (the plant "
            f"gate), not on the {result.boundary} boundary above."
        )
    if any(check.from_memory for check in result.checks):
        console.print("* rulebook or threshold not yet verified against the source document")
