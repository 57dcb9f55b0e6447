"""The Intervals and Matching sheets: the electricity time series, one row per interval, and its
matching with contracted generation as live formulas, per scheme (Intervals), summed by month and
in all (Matching).

Schemes that match the same eligible sources over the same periods share one set of columns
(they match the same energy). For each set, interval t of matching period P:

- eligible generation G_t = sum of the eligible sources' generation in the interval;
- a period of one interval: matched m_t = MIN(L_t, G_t);
- a longer period (month, quarter, year; an hour of 15- or 30-minute data): on the period's first
  row L_P = SUM(L over P) and M_P = MIN(L_P, SUM(G over P)); every interval of P is matched in the
  same proportion, m_t = L_t M_P / L_P (0 when L_P = 0).

The monthly table sums load and matched energy over each local calendar month; the summary gives
per scheme the matched share (matched / load) and the grid electricity per kg H2,
(1 - matched share) x electricity per kg H2 (the Calculation sheet's figure). With a series of
hydrogen (kg) instead of electricity, the load is hydrogen x that figure, so it follows the
Calculation sheet too. The engine's figures stand beside the formulas for comparison.

The writer lays out what the engine matched (``core.results.ElectricityMatching`` of each
check) and never scores; the periods are the same as the engine's (``matching.period_labels``).

References
----------
.. [1] Commission Delegated Regulation (EU) 2023/1184, Art. 6 (temporal correlation).
"""

from __future__ import annotations

from copy import copy

import numpy as np

from ...analyses.matching import period_labels
from .layout import CALCULATION, INTERVALS, MATCHING, put_text
from .style import SHARE, header_texts, page_setup, style_cell

SUMMARY_TOP = 4
INTERVAL_HEADER_ROW = 3
# the headers of the series' own columns on the Intervals sheet, and the CSV column each one is read back as
SERIES_HEADERS = {
    "timestamp": ("interval start (local, with UTC offset)", "timestamp"),
    "load": ("electricity use (kWh)", "electrolyser [kWh]"),
    "hydrogen": ("hydrogen (kg), from the series", "hydrogen [kg]"),
    "grid": ("grid intensity (g CO2e/kWh)", "grid_intensity [g CO2e/kWh]"),
}


def generation_header(source: str) -> str:
    return f"generation, {source} (kWh)"


def _stamp(local, offset: int) -> str:
    sign = "+" if offset >= 0 else "-"
    return f"{str(local)[:16]}{sign}{abs(int(offset)) // 60:02d}:{abs(int(offset)) % 60:02d}"


def matching_groups(series, checks) -> list[tuple[tuple[str, ...], np.ndarray, list]]:
    """(eligible sources, period labels, checks) of each distinct matching among the checks."""
    groups: dict[tuple, tuple] = {}
    for check in checks:
        matching = check.electricity_matching
        granularity = matching.granularity
        labels = period_labels(series.utc, series.local, granularity)
        eligible = tuple(name for name in matching.eligible_sources if name in series.generation_kwh)
        key = (eligible, labels.tobytes())
        if key not in groups:
            groups[key] = (eligible, labels, [])
        groups[key][2].append(check)
    return list(groups.values())


class _FastCells:
    """Styled interval cells made directly: ``ws.cell`` and a style look-up per cell cost seconds for a
    year of hours, so the looks of ``style.style_cell`` are registered once and copied to every cell."""

    KINDS = (("input", "input", "#,##0.000"), ("grid", "input", "#,##0.0"), ("formula", "formula", "#,##0.000"))

    def __init__(self, ws):
        from openpyxl.cell.cell import Cell

        self.ws, self.cells, self.cell_type = ws, ws._cells, Cell
        self.templates = {}
        for kind, looks, number_format in self.KINDS:
            template = ws.cell(row=1, column=1000)
            style_cell(template, looks, number_format)
            self.templates[kind] = copy(template._style)
            del ws._cells[(1, 1000)]

    def put(self, row: int, column: int, value, kind: str | None = None) -> None:
        style = {} if kind is None else {"style_array": copy(self.templates[kind])}
        self.cells[(row, column)] = self.cell_type(self.ws, row=row, column=column, value=value, **style)


def _interval_columns(series, groups) -> tuple[dict, list[str], dict, list]:
    """The Intervals sheet's columns: (column of each quantity, headers, the eligible generation column of
    each set of sources, and per matching group (eligible, labels, period sizes, its columns))."""
    column = {"timestamp": 1, "load": 2}
    headers = [SERIES_HEADERS["timestamp"][0], SERIES_HEADERS["load"][0]]
    if series.load_kwh is None:
        column["hydrogen"] = 3
        headers.append(SERIES_HEADERS["hydrogen"][0])
    for name in series.generation_kwh:
        column[f"generation:{name}"] = len(headers) + 1
        headers.append(generation_header(name))
    if series.grid_g_co2e_per_kwh is not None:
        column["grid"] = len(headers) + 1
        headers.append(SERIES_HEADERS["grid"][0])
    generation_column: dict[tuple[str, ...], int] = {}  # one column per distinct set of eligible sources
    for eligible, _, _ in groups:
        if len(eligible) == 1:
            generation_column[eligible] = column[f"generation:{eligible[0]}"]
        elif eligible not in generation_column:
            generation_column[eligible] = len(headers) + 1
            headers.append(f"eligible generation, {' + '.join(eligible) if eligible else 'no eligible source'} (kWh)")
    group_columns = []
    for number, (eligible, labels, group_checks) in enumerate(groups, start=1):
        schemes = ", ".join(check.scheme for check in group_checks)
        sizes = np.bincount(labels)
        longer = bool((sizes > 1).any())
        place = {"generation": generation_column[eligible]}
        if longer:
            place["period_load"] = len(headers) + 1
            headers.append(f"matching {number} ({schemes}): use in the period (kWh, first row of each period)")
            place["period_matched"] = len(headers) + 1
            headers.append(f"matching {number}: matched in the period (kWh, first row of each period)")
        place["matched"] = len(headers) + 1
        headers.append(f"matching {number}{'' if longer else f' ({schemes})'}: matched (kWh)")
        group_columns.append((eligible, labels, sizes, place))
    return column, headers, generation_column, group_columns


def _write_interval_inputs(cells: _FastCells, series, column: dict, letter: dict, first: int, kwh_per_kg: str) -> None:
    """One row per interval: its start, the use (or hydrogen and the use it implies), generation, grid intensity."""
    stamps = [_stamp(t, o) for t, o in zip(series.local, series.offset_minutes, strict=True)]
    for index in range(series.intervals):
        row = first + index
        cells.put(row, 1, stamps[index])
        if series.load_kwh is not None:
            cells.put(row, column["load"], float(series.load_kwh[index]), "input")
        else:
            cells.put(row, column["hydrogen"], float(series.hydrogen_kg[index]), "input")
            cells.put(row, column["load"], f"={letter['hydrogen']}{row}*{MATCHING}!{kwh_per_kg}", "formula")
        for name in series.generation_kwh:
            cells.put(row, column[f"generation:{name}"], float(series.generation_kwh[name][index]), "input")
        if "grid" in column:
            cells.put(row, column["grid"], float(series.grid_g_co2e_per_kwh[index]), "grid")


def _write_eligible_generation(cells: _FastCells, generation_column: dict, letter: dict, first: int, n: int) -> None:
    for eligible, place in generation_column.items():
        if len(eligible) == 1:
            continue  # the source's own column
        sources = "+".join(f"{letter[f'generation:{name}']}{{r}}" for name in eligible)
        for index in range(n):
            row = first + index
            cells.put(row, place, "=" + sources.format(r=row) if eligible else 0.0, "formula")


def _write_matched(cells: _FastCells, group_columns: list, load: str, first: int, n: int) -> None:
    """Matched energy of each interval, per matching group (see the module text); sets each group's ``letter``."""
    from openpyxl.utils import get_column_letter

    for _eligible, labels, sizes, place in group_columns:
        g = get_column_letter(place["generation"])
        starts = np.flatnonzero(np.r_[True, labels[1:] != labels[:-1]])
        period_first = first + starts[labels]  # row of each interval's period start
        period_last = first + np.r_[starts[1:], n][labels] - 1
        for index in range(n):
            row = first + index
            if sizes[labels[index]] == 1:
                formula = f"=MIN({load}{row},{g}{row})"
            else:
                top, bottom = int(period_first[index]), int(period_last[index])
                pl, pm = get_column_letter(place["period_load"]), get_column_letter(place["period_matched"])
                if row == top:
                    cells.put(row, place["period_load"], f"=SUM({load}{top}:{load}{bottom})", "formula")
                    cells.put(row, place["period_matched"], f"=MIN({pl}{top},SUM({g}{top}:{g}{bottom}))", "formula")
                formula = f"=IF(${pl}${top}=0,0,{load}{row}*${pm}${top}/${pl}${top})"
            cells.put(row, place["matched"], formula, "formula")
        place["letter"] = get_column_letter(place["matched"])


def _write_monthly_table(
    main, series, checks, matched_letters: dict, load: str, first: int, month_header: int
) -> list[str]:
    """Use and, per scheme, matched energy and share by local calendar month; returns the headers."""
    from openpyxl.utils import get_column_letter

    at = f"{INTERVALS}!"
    months = series.local.astype("datetime64[M]")
    month_starts = np.flatnonzero(np.r_[True, months[1:] != months[:-1]])
    month_ends = np.r_[month_starts[1:], series.intervals] - 1
    month_headers = ["month", "electricity use (kWh)"]
    for check in checks:
        month_headers += [
            f"{check.scheme}: matched (kWh)",
            f"{check.scheme}: unmatched (kWh)",
            f"{check.scheme}: matched share",
        ]
    put_text(main, month_header - 1, 1, "By month (local calendar): sums over the intervals below.")
    header_texts(main, month_header, month_headers)
    for number, (start, end) in enumerate(zip(month_starts, month_ends, strict=True)):
        row = month_header + 1 + number
        put_text(main, row, 1, str(months[start]))
        style_cell(
            main.cell(row=row, column=2, value=f"=SUM({at}{load}{first + start}:{load}{first + end})"),
            "formula",
            "#,##0.000",
        )
        for position, check in enumerate(checks):
            matched_letter = matched_letters[check.scheme]
            base = 3 + 3 * position
            matched_cell = get_column_letter(base)
            style_cell(
                main.cell(
                    row=row,
                    column=base,
                    value=f"=SUM({at}{matched_letter}{first + start}:{matched_letter}{first + end})",
                ),
                "formula",
                "#,##0.000",
            )
            style_cell(
                main.cell(row=row, column=base + 1, value=f"=B{row}-{matched_cell}{row}"), "formula", "#,##0.000"
            )
            style_cell(
                main.cell(row=row, column=base + 2, value=f"=IF(B{row}=0,0,{matched_cell}{row}/B{row})"),
                "formula",
                SHARE,
            )
    return month_headers


SUMMARY_HEADERS = (
    "scheme",
    "matching (the scheme's rule)",
    "eligible sources",
    "matching columns",
    "electricity use (kWh)",
    "matched (kWh)",
    "matched share",
    "grid electricity (kWh/kg H2)",
    "matched share, engine at writing",
    "grid kWh/kg H2, engine at writing",
)


def _write_summary(
    main, checks, group_of: dict, matched_letters: dict, load: str, first: int, last: int, kwh_per_kg: str
) -> dict[str, int]:
    """Per scheme: use, matched energy and share, grid electricity per kg H2, and the engine's figures."""
    at = f"{INTERVALS}!"
    summary_header = SUMMARY_TOP + 1
    put_text(
        main,
        SUMMARY_TOP,
        1,
        "Per scheme: matched share = matched / use; grid electricity "
        "per kg H2 = (1 - matched share) x electricity per kg H2.",
    )
    header_texts(main, summary_header, SUMMARY_HEADERS)
    rows: dict[str, int] = {}
    for number, check in enumerate(checks):
        row = summary_header + 1 + number
        rows[check.scheme] = row
        matching = check.electricity_matching
        matched_letter = matched_letters[check.scheme]
        put_text(main, row, 1, check.scheme)
        put_text(main, row, 2, matching.rule)
        put_text(main, row, 3, ", ".join(matching.eligible_sources) or "none")
        put_text(main, row, 4, f"matching {group_of[check.scheme] + 1}")
        style_cell(main.cell(row=row, column=5, value=f"=SUM({at}{load}{first}:{load}{last})"), "formula", "#,##0.0")
        style_cell(
            main.cell(row=row, column=6, value=f"=SUM({at}{matched_letter}{first}:{matched_letter}{last})"),
            "formula",
            "#,##0.0",
        )
        style_cell(main.cell(row=row, column=7, value=f"=IF(E{row}=0,0,F{row}/E{row})"), "formula", SHARE)
        style_cell(main.cell(row=row, column=8, value=f"=(1-G{row})*{kwh_per_kg}"), "formula", "#,##0.000")
        style_cell(main.cell(row=row, column=9, value=matching.matched_share), "engine", SHARE)
        style_cell(main.cell(row=row, column=10, value=matching.grid_kwh_per_kg_h2), "engine", "#,##0.000")
    return rows


def _write_titles(main, intervals_ws, series, block, hydrogen_key: str, kwh_row: int) -> str:
    """The two sheets' titles and the electricity per kg H2 from the Calculation sheet; returns its cell."""
    put_text(
        intervals_ws,
        1,
        1,
        f"Electricity time series {series.path}: one row per interval ({series.interval_minutes} minutes, "
        "local time as written) and its matching with contracted generation, as live formulas.",
    )
    put_text(
        intervals_ws,
        2,
        1,
        "In each matching period: matched = MIN(use, eligible generation); an interval "
        "of a longer period is matched in the period's proportion. Generation beyond "
        "the use of one period does not carry to another. Sums on the Matching sheet.",
    )
    style_cell(intervals_ws.cell(row=1, column=1), "title")
    put_text(
        main,
        1,
        1,
        f"Matching of the electricity time series {series.path} with contracted "
        "generation, per scheme: sums over the Intervals sheet.",
    )
    style_cell(main.cell(row=1, column=1), "title")
    put_text(main, kwh_row, 1, "electricity per kg H2 at the plant gate (kWh/kg), from the Calculation sheet")
    mix, hydrogen = block.activity_row["electricity_mix"], block.activity_row[hydrogen_key]
    style_cell(
        main.cell(row=kwh_row, column=2, value=f"={CALCULATION}!$G${mix}/{CALCULATION}!$G${hydrogen}"),
        "formula",
        "#,##0.000",
    )
    return f"$B${kwh_row}"


def write_intervals_sheets(ws, intervals_ws, series, checks, block, hydrogen_key: str) -> dict:
    """Write the Matching sheet (``ws``) and the Intervals sheet; returns where the tables are."""
    from openpyxl.utils import get_column_letter

    n = series.intervals
    groups = matching_groups(series, checks)
    month_header = SUMMARY_TOP + 1 + len(checks) + 3
    first = INTERVAL_HEADER_ROW + 1
    main = ws
    cells = _FastCells(intervals_ws)
    kwh_per_kg = _write_titles(main, intervals_ws, series, block, hydrogen_key, kwh_row=3)
    column, headers, generation_column, group_columns = _interval_columns(series, groups)
    letter = {key: get_column_letter(value) for key, value in column.items()}
    header_texts(intervals_ws, INTERVAL_HEADER_ROW, headers)
    _write_interval_inputs(cells, series, column, letter, first, kwh_per_kg)
    _write_eligible_generation(cells, generation_column, letter, first, n)
    _write_matched(cells, group_columns, letter["load"], first, n)
    group_of = {check.scheme: number for number, (_, _, group_checks) in enumerate(groups) for check in group_checks}
    matched_letters = {scheme: group_columns[number][3]["letter"] for scheme, number in group_of.items()}
    month_headers = _write_monthly_table(main, series, checks, matched_letters, letter["load"], first, month_header)
    rows = _write_summary(main, checks, group_of, matched_letters, letter["load"], first, first + n - 1, kwh_per_kg)
    for sheet, count in ((intervals_ws, len(headers)), (main, max(len(month_headers), len(SUMMARY_HEADERS)))):
        sheet.column_dimensions["A"].width = 30
        for position in range(2, count + 1):
            sheet.column_dimensions[get_column_letter(position)].width = 20
    intervals_ws.freeze_panes = f"B{first}"
    page_setup(main, title_columns="A:A", pages_wide=2)
    page_setup(intervals_ws, title_rows=f"{INTERVAL_HEADER_ROW}:{INTERVAL_HEADER_ROW}", pages_wide=2, align=False)
    return {"summary": rows, "month_header": month_header, "interval_header": INTERVAL_HEADER_ROW}
