"""The project report: one self-contained HTML file a practitioner can hand over.

``render_report`` is a function of results (``ScoreResult``, the project's parameter rows and,
where the project has a ``[lifetime]``, its ``LifetimeResult``) to HTML text; it never scores.
Everything is inline: the stylesheet, the charts (hand-built SVG with a <title> and <desc> for
screen readers), fonts from the system. Nothing is requested from any other address when the
file opens. The print stylesheet starts every section on a new page and fits A4 and US Letter.
``print_pdf`` prints the HTML to PDF through headless Chromium.

The look is this project's own: ink-blue and harbour-teal on warm paper, a serif for headings and
the system sans-serif for text and figures, sections named for the questions a reader asks.
"""

from __future__ import annotations

import html
import os
import re
import shutil
import subprocess
import tempfile
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import numpy as np

from ..analyses.lifetime import LifetimeResult
from ..analyses.matching import MatchingView
from ..analyses.qualify import QualifyResult
from ..analyses.uncertainty import UncertaintyResult
from ..core.results import Check, ScoreResult
from ..core.scoring import rulebooks
from ..errors import InputError
from ..model.statuses import Status
from .files import atomic_write
from .labels import (
    electricity_rule_name,
    factor_grades_sentence,
    gas_name,
    gwp_name,
    stage_name,
    status_name,
    status_of,
    unit_name,
    words,
)
from .palette import GAS_COLOURS, RAMP, STAGE_COLOURS
from .tables import display_number

PAPERS = ("a4", "letter")
CHROMIUM_NAMES = ("chromium", "chromium-browser", "google-chrome", "google-chrome-stable")

YEAR_SIGNS = {Status.QUALIFIES: "✓", Status.FAILS: "✗", Status.UNDETERMINED: "?", Status.NOT_ELIGIBLE: "n/e"}
STATUS_CLASS = {
    Status.QUALIFIES.words: "ok",
    Status.FAILS.words: "no",
    Status.NOT_ELIGIBLE.words: "off",
    Status.UNDETERMINED.words: "open",
}


@dataclass
class ProjectReport:
    """What the report shows of one project: its score, its inputs and, where the project gives
    them, its lifetime, the matching of its electricity time series and its Monte Carlo."""

    result: ScoreResult
    inputs: list[tuple[str, Any, str, str]] = field(default_factory=list)  # parameter_table rows
    lifetime: LifetimeResult | None = None
    matching: list[MatchingView] = field(default_factory=list)
    uncertainty: UncertaintyResult | None = None
    qualify: QualifyResult | None = None  # with a levers file: what it takes to qualify


# --- words and numbers -------------------------------------------------------------------

_FORMULA = re.compile(r"\b(CO2e?|CH4|N2O|NH3|H2|N2|O2)\b")


def text(value: Any) -> str:
    """Escaped text with chemical formulas subscripted (CO<sub>2</sub>e)."""
    escaped = html.escape(str(value), quote=True)
    return _FORMULA.sub(lambda m: re.sub(r"(\d)", r"<sub>\1</sub>", m.group(0)), escaped)


def number(value: float | None) -> str:
    return display_number(value).replace("-", "\u2212", 1) if value is not None and value < 0 else display_number(value)


def reasons_of(check: Check) -> list[str]:
    return [str(reason) for reason in check.reasons]


def assessment_year_of(result: ScoreResult) -> str:
    """The year whose dates the scheme rules were read on."""
    return str(result.assessment_year or "")


_REASON = re.compile(r"^(met|not met|cannot be judged|note):\s*(.*?)\s*(?:\[(.*)\])?\s*$", re.S)


def split_reason(reason: str) -> tuple[str, str, str]:
    """A reason as (result, rule, source): ``not met: value 41.6 not <= 20 [UK LCHS v4]`` ->
    ('not met', 'value 41.6 not <= 20', 'UK LCHS v4'). A reason of another shape is all rule."""
    match = _REASON.match(reason.strip())
    if not match:
        return "", reason.strip(), ""
    return match.group(1), match.group(2), match.group(3) or ""


def deciding_reason(check: Check, limit: int = 150) -> str:
    """The deciding reason (the first one) in one line: its rule without the source, cut at a word."""
    reasons = reasons_of(check)
    if not reasons:
        return ""
    result, rule, _ = split_reason(reasons[0])
    line = f"{result}: {rule}" if result else rule
    return line if len(line) <= limit else line[:limit].rsplit(" ", 1)[0] + " …"


# --- axis ticks ------------------------------------------------------------------------------


def nice_ticks(low: float, high: float, count: int = 5) -> list[float]:
    """Round tick values (1, 2 or 5 times a power of ten) covering [low, high]."""
    import math

    span = (high - low) or abs(high) or 1.0
    raw = span / max(count, 1)
    power = 10 ** math.floor(math.log10(raw))
    step = next(m * power for m in (1, 2, 5, 10) if m * power >= raw)
    first = math.ceil(low / step - 1e-9) * step
    ticks, value = [], first
    while value <= high + step * 1e-9:
        ticks.append(0.0 if abs(value) < step * 1e-9 else value)
        value += step
    return ticks


def plain_number(value: float) -> str:
    """A stated figure (a limit) as written: 28.2, 4, 0.84, 14,900; never 28.200 or 4.000."""
    text = f"{value:,.6g}"
    return text.replace("-", "\u2212", 1) if value < 0 else text


def tick_label(value: float, ticks: list[float]) -> str:
    """A tick as a plain number: as many decimals as the step needs, thousands separated (14,900; 0.5; 25)."""
    import math

    step = abs(ticks[1] - ticks[0]) if len(ticks) > 1 else abs(value) or 1.0
    decimals = max(0, -math.floor(math.log10(step) + 1e-9))
    text = f"{value:,.{decimals}f}"
    if "." in text:
        text = text.rstrip("0").rstrip(".")  # 0.5 and 1, not 0.50 and 1.00; zero is 0
    return text.replace("-", "\u2212", 1) if value < 0 else text


def badge(status: str) -> str:
    return f'<span class="badge {STATUS_CLASS.get(status, "open")}">{text(status)}</span>'


# --- charts (hand-built SVG) ---------------------------------------------------------------


def _svg(width: int, height: int, title: str, desc: str, body: list[str], key: str) -> str:
    return (
        f'<svg class="chart" viewBox="0 0 {width} {height}" role="img" aria-labelledby="{key}-t {key}-d" '
        f'xmlns="http://www.w3.org/2000/svg" preserveAspectRatio="xMinYMin meet">'
        f'<title id="{key}-t">{html.escape(title)}</title><desc id="{key}-d">{html.escape(desc)}</desc>'
        + "".join(body)
        + "</svg>"
    )


def _scale(low: float, high: float, left: float, right: float):
    span = (high - low) or 1.0
    return lambda value: left + (value - low) / span * (right - left)


def waterfall_svg(result: ScoreResult, key: str) -> str:
    """Horizontal waterfall: each stage a bar from the running sum before it to the sum after it,
    then the total from zero."""
    stages = list(result.by_stage.items())
    running, spans = 0.0, []
    for stage, value in stages:
        spans.append((stage, running, running + value, value))
        running += value
    ends = [0.0] + [s for _, a, b, _ in spans for s in (a, b)] + [result.total]
    low, high = min(ends), max(ends)
    label_width, right_pad, row, top = 250, 110, 30, 14
    width = 760
    height = top + row * (len(spans) + 1) + 36
    x = _scale(low, high if high > low else low + 1, label_width, width - right_pad)
    body = [f'<line x1="{x(0):.1f}" y1="{top - 6}" x2="{x(0):.1f}" y2="{height - 30}" class="axis"/>']
    for index, (stage, start, end, value) in enumerate(spans):
        y = top + index * row
        left, right = sorted((x(start), x(end)))
        colour = STAGE_COLOURS[index % len(STAGE_COLOURS)]
        body.append(
            f'<text x="{label_width - 10}" y="{y + 19}" class="label" '
            f'text-anchor="end">{html.escape(stage_name(stage))}</text>'
        )
        body.append(
            f'<rect x="{left:.1f}" y="{y + 5}" width="{max(right - left, 1.2):.1f}" height="{row - 10}" '
            f'fill="{colour}"><title>{html.escape(stage_name(stage))}: {html.escape(number(value))} '
            f"{html.escape(result.unit)}</title></rect>"
        )
        if index + 1 < len(spans):
            body.append(
                f'<line x1="{x(end):.1f}" y1="{y + row - 5}" x2="{x(end):.1f}" y2="{y + row + 5}" class="step"/>'
            )
        body.append(
            f'<text x="{max(left, right) + 6:.1f}" y="{y + 19}" class="value">{html.escape(number(value))}</text>'
        )
    y = top + len(spans) * row
    left, right = sorted((x(0), x(result.total)))
    body.append(f'<text x="{label_width - 10}" y="{y + 19}" class="label strong" text-anchor="end">Total</text>')
    body.append(
        f'<rect x="{left:.1f}" y="{y + 4}" width="{max(right - left, 1.2):.1f}" height="{row - 8}" class="total-bar"/>'
    )
    body.append(
        f'<text x="{right + 6:.1f}" y="{y + 19}" class="value strong">{html.escape(number(result.total))}</text>'
    )
    body.append(
        f'<text x="{label_width}" y="{height - 10}" class="note">{html.escape(result.unit)}, '
        f"{html.escape(result.boundary)}, GWP100 {html.escape(result.gwp_basis.upper())}</text>"
    )
    description = (
        "; ".join(f"{stage_name(s)} {number(v)}" for s, v in stages) + f"; total {number(result.total)} {result.unit}."
    )
    return _svg(
        width,
        height,
        f"How the stages add up to the total ({result.unit})",
        "Waterfall by stage: " + description,
        body,
        key,
    )


def gas_svg(result: ScoreResult, key: str) -> str:
    """One stacked bar of the total by gas (CO2e), with a key below."""
    gases = [(gas, value) for gas, value in result.by_gas.items() if value != 0]
    width, left, right, height = 760, 20, 20, 52 + 22 * len(gases)
    positive = sum(v for _, v in gases if v > 0) or 1.0
    x = _scale(0, positive, left, width - right)
    body, start = [], 0.0
    for gas, value in gases:
        if value <= 0:
            continue
        colour = GAS_COLOURS.get(gas, "#7d8088")
        body.append(
            f'<rect x="{x(start):.1f}" y="8" width="{x(start + value) - x(start):.1f}" height="26" '
            f'fill="{colour}"><title>{html.escape(gas_name(gas))}: {html.escape(number(value))}</title></rect>'
        )
        start += value
    for index, (gas, value) in enumerate(gases):
        gx, gy = left, 56 + index * 22
        colour = GAS_COLOURS.get(gas, "#7d8088")
        share = value / result.total * 100 if result.total else 0.0
        body.append(f'<rect x="{gx}" y="{gy - 10}" width="12" height="12" fill="{colour}"/>')
        body.append(
            f'<text x="{gx + 18}" y="{gy}" class="label">{html.escape(gas_name(gas))}: '
            f"{html.escape(number(value))} ({share:.1f} %)</text>"
        )
    description = "; ".join(f"{gas_name(g)} {number(v)}" for g, v in gases) + f" {result.unit}."
    return _svg(
        width,
        height,
        f"The total by greenhouse gas ({result.unit}, CO2e)",
        "Stacked bar by gas: " + description,
        body,
        key,
    )


def limits_svg(result: ScoreResult, key: str) -> str:
    """One row per scheme, each on its own scale and basis: the value against every tier limit."""
    checks = result.checks
    books = rulebooks()
    label_width, width, row = 250, 760, 46
    height = 10 + row * len(checks) + 40
    body = []
    for index, check in enumerate(checks):
        book = books.get(check.scheme)
        limits = sorted({t.limit for t in book.thresholds} if book else {check.limit})
        high = max([check.value, *limits]) * 1.15 or 1.0
        low = min(0.0, check.value)
        x = _scale(low, high, label_width, width - 20)
        y = 10 + index * row
        status = status_of(check)
        body.append(
            f'<text x="{label_width - 10}" y="{y + 16}" class="label" '
            f'text-anchor="end">{html.escape(check.scheme)}</text>'
        )
        body.append(
            f'<text x="{label_width - 10}" y="{y + 31}" class="note" text-anchor="end">{html.escape(check.unit)}</text>'
        )
        # limit labels kept apart: a label closer than 34 px to one drawn is left out (the stroke stays)
        placed: list[float] = []
        body.append(
            f'<rect x="{label_width}" y="{y + 6}" width="{width - 20 - label_width}" height="22" class="track"/>'
        )
        left, right = sorted((x(0), x(check.value)))
        body.append(
            f'<rect x="{left:.1f}" y="{y + 10}" width="{max(right - left, 1.2):.1f}" height="14" '
            f'class="bar-{STATUS_CLASS.get(status, "open")}"><title>{html.escape(check.scheme)}: '
            f"{html.escape(number(check.value))} {html.escape(check.unit)} ({html.escape(status)})</title></rect>"
        )
        for limit in sorted(limits, key=lambda v: v != check.limit):  # the verdict's own limit labelled first
            mark = "limit-main" if limit == check.limit else "limit"
            body.append(
                f'<line x1="{x(limit):.1f}" y1="{y + 2}" x2="{x(limit):.1f}" y2="{y + 32}" '
                f'class="{mark}"><title>limit {html.escape(number(limit))}</title></line>'
            )
            if all(abs(x(limit) - other) >= 34 for other in placed):
                placed.append(x(limit))
                body.append(
                    f'<text x="{x(limit):.1f}" y="{y + 42}" class="tick" '
                    f'text-anchor="middle">{plain_number(limit)}</text>'
                )
        label = number(check.value)
        inside = right + 8 + 7 * len(label) > width - 20  # no room after the bar: the label goes inside its end
        body.append(
            f'<text x="{(right - 6) if inside else (right + 6):.1f}" y="{y + 22}" '
            f'class="value{" on-bar" if inside else ""}" '
            f'text-anchor="{"end" if inside else "start"}">{html.escape(label)}</text>'
        )
    body.append(
        f'<text x="{label_width}" y="{height - 22}" class="note">Bar: '
        "this project under the scheme's own rules and basis.</text>"
    )
    body.append(
        f'<text x="{label_width}" y="{height - 6}" class="note">Strokes: the scheme\'s '
        "limits (bold: the one this verdict is read against).</text>"
    )
    description = (
        "; ".join(
            f"{c.scheme}: {number(c.value)} against a limit of {number(c.limit)} {c.unit}, {status_of(c)}"
            for c in checks
        )
        + "."
    )
    return _svg(width, height, "This project against each scheme's limits", description, body, key)


def lifetime_svg(life: LifetimeResult, key: str) -> str:
    """Intensity of every operating year, with the lifetime average."""
    years = [y.year for y in life.years]
    values = [y.total for y in life.years]
    width, height, left, right, top, bottom = 760, 260, 70, 20, 16, 44
    high = max(values + [life.average_with_construction]) * 1.12 or 1.0
    low = min(0.0, *values)
    x = _scale(years[0], years[-1] if len(years) > 1 else years[0] + 1, left, width - right)
    y = _scale(low, high, height - bottom, top)
    body = [
        f'<line x1="{left}" y1="{y(low):.1f}" x2="{width - right}" y2="{y(low):.1f}" class="axis"/>',
        f'<line x1="{left}" y1="{top}" x2="{left}" y2="{height - bottom}" class="axis"/>',
    ]
    ticks = [t for t in nice_ticks(low, high / 1.12, 4) if t <= high]
    for tick in ticks:
        body.append(
            f'<text x="{left - 6}" y="{y(tick) + 4:.1f}" class="tick" '
            f'text-anchor="end">{tick_label(tick, ticks)}</text>'
        )
    step = max(1, len(years) // 8)
    for year in years[::step]:
        body.append(
            f'<text x="{x(year):.1f}" y="{height - bottom + 16}" class="tick" text-anchor="middle">{year}</text>'
        )
    points = " ".join(f"{x(a):.1f},{y(b):.1f}" for a, b in zip(years, values, strict=True))
    body.append(f'<polyline points="{points}" class="trace"/>')
    for a, b in zip(years, values, strict=True):
        body.append(
            f'<circle cx="{x(a):.1f}" cy="{y(b):.1f}" r="3" class="dot"><title>{a}: '
            f"{html.escape(number(b))} {html.escape(life.unit)}</title></circle>"
        )
    average = life.average_without_construction
    body.append(f'<line x1="{left}" y1="{y(average):.1f}" x2="{width - right}" y2="{y(average):.1f}" class="limit"/>')
    body.append(
        f'<text x="{width - right}" y="{y(average) - 5:.1f}" class="note" text-anchor="end">lifetime '
        f"average {html.escape(number(average))}</text>"
    )
    body.append(
        f'<text x="{left}" y="{height - 8}" class="note">{html.escape(life.unit)} '
        "by operating year (construction not included)</text>"
    )
    description = (
        "; ".join(f"{a}: {number(b)}" for a, b in zip(years, values, strict=True))
        + f" {life.unit}; lifetime average {number(average)}."
    )
    return _svg(width, height, f"Intensity by operating year ({life.unit})", description, body, key)


def ramp_colour(share: float) -> str:
    """The heat-map colour of an unmatched share between 0 and 1 (linear between the ramp's stops)."""
    share = min(max(float(share), 0.0), 1.0)
    for (a, low), (b, high) in zip(RAMP, RAMP[1:], strict=False):
        if share <= b:
            f = (share - a) / (b - a)
            return "#" + "".join(f"{round(lo + (hi - lo) * f):02x}" for lo, hi in zip(low, high, strict=True))
    return "#" + "".join(f"{v:02x}" for v in RAMP[-1][1])


def _month_label(month: str) -> str:
    names = ("Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec")
    year, _, month_number = month.partition("-")
    return f"{names[int(month_number) - 1]} {year[2:]}" if month_number.isdigit() else month


def monthly_matching_svg(view: MatchingView, key: str) -> str:
    """Stacked bars by month: electricity use matched with eligible generation, and unmatched (MWh)."""
    load = view.monthly_load_kwh / 1000.0
    matched = view.monthly_matched_kwh / 1000.0
    count = len(view.months)
    width, height, left, right, top, bottom = 760, 250, 64, 20, 14, 52
    slot = (width - left - right) / max(count, 1)
    high = float(load.max()) * 1.08 if count and load.max() > 0 else 1.0
    y = _scale(0.0, high, height - bottom, top)
    body = [f'<line x1="{left}" y1="{y(0):.1f}" x2="{width - right}" y2="{y(0):.1f}" class="axis"/>']
    ticks = [t for t in nice_ticks(0.0, high / 1.08, 4) if t <= high]
    for tick in ticks:
        body.append(
            f'<text x="{left - 6}" y="{y(tick) + 4:.1f}" class="tick" '
            f'text-anchor="end">{tick_label(tick, ticks)}</text>'
        )
    for index, (month, use, ok) in enumerate(zip(view.months, load, matched, strict=True)):
        x0 = left + index * slot + slot * 0.15
        bar = slot * 0.7
        label = _month_label(month)
        body.append(
            f'<rect x="{x0:.1f}" y="{y(ok):.1f}" width="{bar:.1f}" height="{y(0) - y(ok):.1f}" '
            f'class="matched"><title>{html.escape(label)}: {html.escape(number(ok))} MWh matched</title></rect>'
        )
        body.append(
            f'<rect x="{x0:.1f}" y="{y(use):.1f}" width="{bar:.1f}" height="{y(ok) - y(use):.1f}" '
            f'class="unmatched"><title>{html.escape(label)}: {html.escape(number(use - ok))} '
            "MWh unmatched</title></rect>"
        )
        body.append(
            f'<text x="{x0 + bar / 2:.1f}" y="{height - bottom + 15}" class="tick" '
            f'text-anchor="middle">{html.escape(label)}</text>'
        )
    body.append(
        f'<rect x="{left}" y="{height - 22}" width="12" height="12" class="matched"/><text x="{left + 18}" '
        f'y="{height - 12}" class="label">matched with eligible generation</text>'
    )
    body.append(
        f'<rect x="{left + 280}" y="{height - 22}" width="12" height="12" class="unmatched"/><text '
        f'x="{left + 298}" y="{height - 12}" class="label">unmatched (charged as grid)</text>'
    )
    description = (
        "; ".join(
            f"{_month_label(m)}: {number(a)} MWh used, {number(b)} matched"
            for m, a, b in zip(view.months, load, matched, strict=True)
        )
        + "."
    )
    return _svg(
        width,
        height,
        f"Electricity use by month, matched and unmatched (MWh), {', '.join(view.schemes)}",
        description,
        body,
        key,
    )


def heat_map_svg(view: MatchingView, key: str) -> str:
    """Unmatched share of electricity use by local hour of day (rows) and month (columns)."""
    share = view.unmatched_share
    count = len(view.months)
    width, left, top, legend = 760, 64, 10, 90
    cell_w = (width - left - legend) / max(count, 1)
    cell_h = 11
    grid_bottom = top + 24 * cell_h
    height = grid_bottom + 40
    body = []
    for hour in range(24):
        y = grid_bottom - (hour + 1) * cell_h
        if hour % 3 == 0:
            body.append(
                f'<text x="{left - 6}" y="{y + cell_h - 2:.1f}" class="tick" text-anchor="end">{hour:02d}:00</text>'
            )
        for column in range(count):
            value = share[hour, column]
            x = left + column * cell_w
            label = _month_label(view.months[column])
            if np.isnan(value):
                body.append(
                    f'<rect x="{x:.1f}" y="{y:.1f}" width="{cell_w:.1f}" height="{cell_h}" '
                    f'class="no-use"><title>{html.escape(label)}, {hour:02d}:00: no use</title></rect>'
                )
            else:
                body.append(
                    f'<rect x="{x:.1f}" y="{y:.1f}" width="{cell_w + 0.3:.1f}" height="{cell_h + 0.3}" '
                    f'fill="{ramp_colour(value)}"><title>{html.escape(label)}, '
                    f"{hour:02d}:00: {value:.0%} unmatched</title></rect>"
                )
    for column in range(count):
        body.append(
            f'<text x="{left + (column + 0.5) * cell_w:.1f}" y="{grid_bottom + 14}" class="tick" '
            f'text-anchor="middle">{html.escape(_month_label(view.months[column]))}</text>'
        )
    lx = width - legend + 24
    steps = 10
    for step in range(steps):
        fraction = step / (steps - 1)
        body.append(
            f'<rect x="{lx}" y="{grid_bottom - (step + 1) * 24 * cell_h / steps:.1f}" width="16" '
            f'height="{24 * cell_h / steps + 0.3:.1f}" fill="{ramp_colour(fraction)}"/>'
        )
    for fraction in (0.0, 0.5, 1.0):
        body.append(
            f'<text x="{lx + 22}" y="{grid_bottom - fraction * 24 * cell_h + (4 if fraction < 1 else 9):.1f}" '
            f'class="tick">{fraction:.0%}</text>'
        )
    body.append(
        f'<text x="{left}" y="{height - 8}" class="note">Local hour of day (rows) by '
        "month (columns); colour: share of use not matched. Grey: no use.</text>"
    )
    with np.errstate(invalid="ignore"):
        by_hour = np.nanmean(share, axis=1) if count else np.zeros(24)
    worst = int(np.nanargmax(by_hour)) if count and not np.all(np.isnan(by_hour)) else 0
    best = int(np.nanargmin(by_hour)) if count and not np.all(np.isnan(by_hour)) else 0
    description = (
        f"Heat map of the unmatched share of electricity use over {count} months and 24 hours. "
        f"Least matched hour of day on average: {worst:02d}:00 ({by_hour[worst]:.0%} unmatched); "
        f"best matched: {best:02d}:00 ({by_hour[best]:.0%} unmatched). Over "
        f"the year {1 - view.matched_share:.1%} of use is unmatched."
    )
    return _svg(
        width,
        height,
        f"Unmatched share of use by hour of day and month, {', '.join(view.schemes)}",
        description,
        body,
        key,
    )


def distribution_svg(
    values: np.ndarray,
    limits: list[tuple[str, float]],
    limit: float,
    unit: str,
    scheme: str,
    probability: float,
    key: str,
) -> str:
    """Histogram of a scheme's value over the Monte Carlo draws, bins at or under the limit in the
    qualifying colour, with the tier limits as strokes."""
    values = np.asarray(values, dtype=float)
    width, height, left, right, top, bottom = 760, 230, 64, 20, 14, 56
    marks = [value for _, value in limits]
    low = min(float(values.min()), *marks) if len(values) else min(marks or [0.0])
    high = max(float(values.max()), *marks) if len(values) else max(marks or [1.0])
    pad = (high - low) * 0.04 or 1.0
    low, high = low - pad, high + pad
    counts, edges = np.histogram(values, bins=40, range=(low, high))
    x = _scale(low, high, left, width - right)
    y = _scale(0.0, float(counts.max()) * 1.1 or 1.0, height - bottom, top)
    body = [f'<line x1="{left}" y1="{y(0):.1f}" x2="{width - right}" y2="{y(0):.1f}" class="axis"/>']
    for count, a, b in zip(counts, edges[:-1], edges[1:], strict=True):
        if count:
            cls = "bar-ok" if b <= limit else "bar-no" if a >= limit else "bar-open"
            body.append(
                f'<rect x="{x(a):.1f}" y="{y(count):.1f}" width="{max(x(b) - x(a) - 0.6, 0.6):.1f}" '
                f'height="{y(0) - y(count):.1f}" class="{cls}"><title>{html.escape(number(a))} '
                f"to {html.escape(number(b))}: {count} draws</title></rect>"
            )
    placed: list[float] = []
    for tier, value in sorted(limits, key=lambda item: item[1] != limit):  # the verdict's own limit labelled first
        mark = "limit-main" if value == limit else "limit"
        body.append(
            f'<line x1="{x(value):.1f}" y1="{top}" x2="{x(value):.1f}" y2="{y(0):.1f}" '
            f'class="{mark}"><title>{html.escape(tier)}: {html.escape(number(value))}</title></line>'
        )
        if all(abs(x(value) - other) >= 40 for other in placed):
            placed.append(x(value))
            body.append(
                f'<text x="{x(value):.1f}" y="{top + 10}" class="tick" '
                f'text-anchor="middle">{plain_number(value)}</text>'
            )
    ticks = nice_ticks(low, high, 6)
    for tick in ticks:
        body.append(
            f'<text x="{x(tick):.1f}" y="{height - bottom + 15}" class="tick" '
            f'text-anchor="middle">{tick_label(tick, ticks)}</text>'
        )
    body.append(
        f'<text x="{left}" y="{height - bottom + 32}" class="note">{html.escape(scheme)} value, {html.escape(unit)}. '
        "Bars: draws, green under the limit, red over it; strokes: the limits.</text>"
    )
    body.append(
        f'<text x="{left}" y="{height - bottom + 46}" class="note">A draw under the limit may '
        "still fail another rule of the scheme (see the verdicts over the draws).</text>"
    )
    p5, p50, p95 = np.percentile(values, [5, 50, 95]) if len(values) else (float("nan"),) * 3
    description = (
        f"Histogram of {len(values)} draws of the {scheme} value: median "
        f"{number(float(p50))}, 5th percentile {number(float(p5))}, "
        f"95th percentile {number(float(p95))} {unit}; limit {number(limit)}; "
        f"probability of qualifying {probability:.1%}."
    )
    return _svg(width, height, f"Distribution of the {scheme} value over the draws ({unit})", description, body, key)


# --- sections -------------------------------------------------------------------------------


def _table(
    headers: list[str], rows: list[list[str]], cls: str = "", numeric: set[int] = frozenset(), caption: str = ""
) -> str:
    head = "".join(f'<th scope="col"{" class=num" if i in numeric else ""}>{h}</th>' for i, h in enumerate(headers))
    lines = []
    for row in rows:
        cells = []
        for i, cell in enumerate(row):
            if i == 0:
                cells.append(f'<th scope="row">{cell}</th>')
            else:
                cells.append(f"<td{' class=num' if i in numeric else ''}>{cell}</td>")
        lines.append("<tr>" + "".join(cells) + "</tr>")
    caption_html = f"<caption>{caption}</caption>" if caption else ""
    return f'<table class="{cls}">{caption_html}<thead><tr>{head}</tr></thead><tbody>{"".join(lines)}</tbody></table>'


def glance_section(item: ProjectReport, key: str, caution: str) -> str:
    """The first page: the figures, then one row per scheme (status, value, limit, tier and the
    deciding reason in one line); every reason is under "Against each scheme"."""
    result = item.result
    intensity = result.intensity.model_dump()
    cards = "".join(
        f'<div class="figure"><span class="big">{number(value)}</span><span '
        f'class="unit">{text(unit_name(name))}</span></div>'
        for name, value in intensity.items()
        if value is not None
    )
    lines = []
    for check in result.checks:
        reasons = reasons_of(check)
        remembered = (
            '<span class="flag" title="rulebook or threshold not yet verified against the source document">*</span>'
            if check.from_memory
            else ""
        )
        lines.append(
            f'<tr class="verdict"><th scope="row">{text(check.name)}{remembered} '
            f'<span class="scheme-id">{text(check.scheme)}</span></th>'
            f"<td>{badge(status_of(check))}</td><td class=num>{number(check.value)}</td><td "
            f"class=num>{number(check.limit)}</td>"
            f"<td>{text(check.unit)}</td><td>{text(check.tier or 'none met')}</td></tr>"
            f'<tr class="why"><td colspan="6" class="deciding" title="{html.escape(reasons[0]) if reasons else ""}">'
            f"{text(deciding_reason(check)) or '&ndash;'}</td></tr>"
        )
    head = "".join(
        f'<th scope="col"{" class=num" if h in ("Value", "Limit") else ""}>{h}</th>'
        for h in ("Scheme", "Status", "Value", "Limit", "Unit", "Tier")
    )
    table = (
        f'<table class="verdicts"><thead><tr>{head}</tr></thead><tbody>{"".join(lines)}</tbody></table>'
        if lines
        else "<p>No scheme applies to this product.</p>"
    )
    remembered = (
        '<p class="note">Under each scheme, its deciding reason; every reason is under "Against each scheme".'
        + (
            " * rulebook or threshold not yet verified against the source document."
            if any(c.from_memory for c in result.checks)
            else ""
        )
        + "</p>"
    )
    year = assessment_year_of(result)
    return (
        f'<section class="sheet" id="{key}-glance" aria-labelledby="{key}-glance-h"><h2 '
        f'id="{key}-glance-h">At a glance</h2>'
        f'<p class="lead">Carbon intensity, {text(result.boundary)}, per {text(result.functional_unit)}, '
        f"GWP100 {text(gwp_name(result.gwp_basis))}:</p>"
        f'<div class="figures">{cards}</div>'
        "<p>Hydrogen at the hydrogen plant's gate: "
        f"<strong>{number(result.hydrogen_production_kg_co2e_per_kg_h2)}</strong> {text('kg CO2e/kg H2')}.</p>"
        "<h3>Verdict of every "
        f"scheme{f' (rules read on the dates of {text(year)})' if year else ''}</h3>{table}{remembered}"
        f'<p class="caution" role="note"><strong>Caution.</strong> {text(caution)}</p></section>'
    )


def sources_section(item: ProjectReport, key: str) -> str:
    result = item.result
    stage_rows = [
        [text(stage_name(s)), number(v), f"{v / result.total * 100:.1f} %" if result.total else "-"]
        for s, v in result.by_stage.items()
    ]
    stage_rows.append(
        ["<strong>Total</strong>", f"<strong>{number(result.total)}</strong>", "100.0 %" if result.total else "-"]
    )
    gas_rows = [
        [text(gas_name(g)), number(v), f"{v / result.total * 100:.1f} %" if result.total else "-"]
        for g, v in result.by_gas.items()
    ]
    non_ghg = "".join(
        f"<p class=note>{text(words(flow))} (not a greenhouse gas): {number(v)} kg per functional unit.</p>"
        for flow, v in result.non_ghg_kg.items()
        if v
    )
    if any(result.biogenic_co2_kg.values()):
        non_ghg += (
            "<p class=note>Biogenic CO2 (counted apart, not in the total): "
            f"released {number(result.biogenic_co2_kg['released'])} kg, "
            f"captured and stored {number(result.biogenic_co2_kg['captured_and_stored'])} "
            "kg per functional unit; not netted unless a rulebook says so.</p>"
        )
    return (
        f'<section class="sheet" id="{key}-sources" aria-labelledby="{key}-sources-h"><h2 '
        f'id="{key}-sources-h">Where the emissions arise</h2>'
        f"<h3>By stage</h3>{waterfall_svg(result, key + '-wf')}"
        + _table(["Stage", f"{text(result.unit)}", "Share of total"], stage_rows, "compact", {1, 2})
        + f"<h3>By gas</h3>{gas_svg(result, key + '-gas')}"
        + _table(["Gas", f"{text(result.unit)} (CO<sub>2</sub>e)", "Share of total"], gas_rows, "compact", {1, 2})
        + non_ghg
        + "</section>"
    )


def article_of(source: str) -> str:
    """A rule's source as the article it cites, without the explanation the full source adds:
    ``26 U.S.C. 45V(b)(2)(A): not greater than 4 kilograms ... (from memory)`` ->
    ``26 U.S.C. 45V(b)(2)(A) (from memory)``. The full source stays in the JSON, CSV and workbook."""
    remembered = "(from memory)" in source
    whole = source.replace("(from memory)", "")
    while True:  # a parenthesis after a space that explains (longer than a date or "(EU)")
        shorter = re.sub(r" \([^()]{12,}\)", "", whole)
        if shorter == whole:
            break
        whole = shorter
    parts = []
    for part in whole.split("; "):
        part = part.split(": ", 1)[0].strip(" ,.")
        if part and part not in parts:
            parts.append(part)
    return "; ".join(parts) + (" (from memory)" if remembered else "")


def reasons_table(check: Check) -> str:
    """A scheme's reasons as a table: rule, result, and the article it rests on, once for the rules
    that share it (rows grouped by source; the deciding reason's group first, in bold)."""
    groups: dict[str, dict[tuple[str, str], list[str]]] = {}
    for reason in reasons_of(check):
        result, rule, source = split_reason(reason)
        subject, _, rest = rule.partition(": ")
        if not rest or len(subject) > 40 or subject.startswith("value"):
            subject, rest = "", rule
        # the same rule met the same way by several electricity sources: one row naming them all
        groups.setdefault(source, {}).setdefault((result, rest), []).append(subject)
    if not groups:
        return ""
    lines = []
    first = True
    for source, entries in groups.items():
        for index, ((result, rest), subjects) in enumerate(entries.items()):
            named = ", ".join(s for s in subjects if s)
            rule = f"{named}: {rest}" if named else rest
            cls = (
                f"r-{RESULT_CLASS.get(result, 'note')}"
                + (" decides" if first else "")
                + (" group" if index == 0 else "")
            )
            article = (
                f'<td class="src" rowspan="{len(entries)}" '
                f'title="{html.escape(source)}">{text(article_of(source)) or "&ndash;"}</td>'
                if index == 0
                else ""
            )
            lines.append(
                f'<tr class="{cls}"><td>{text(rule)}</td><td class=result>{text(result or "note")}</td>{article}</tr>'
            )
            first = False
    return (
        '<table class="reasons"><thead><tr><th scope="col">Rule</th><th scope="col">Result</th><th '
        f'scope="col">Article</th></tr></thead><tbody>{"".join(lines)}</tbody></table>'
    )


RESULT_CLASS = {"met": "ok", "not met": "no", "cannot be judged": "open", "note": "note"}


def schemes_section(item: ProjectReport, key: str) -> str:
    result = item.result
    if not result.checks:
        return ""
    books = rulebooks()
    details = []
    for check in result.checks:
        book = books.get(check.scheme)
        tiers = ""
        if book:
            tiers = "; ".join(
                f"{'&le;' if t.inclusive else '&lt;'} {number(t.limit)}: {text(t.tier)}"
                for t in sorted(book.thresholds, key=lambda t: -t.limit)
            )
        source = text(book.document if book else "") + (
            " (not yet verified against the source document)" if check.from_memory else ""
        )
        details.append(
            f'<div class="scheme"><h4>{text(check.name)} {badge(status_of(check))}</h4>'
            f"<dl><dt>Value against limit</dt><dd>{number(check.value)} "
            f"against {number(check.limit)} {text(check.unit)}"
            f"{f' (margin {number(check.margin)})' if check.margin is not None else ''}</dd>"
            f"<dt>Basis</dt><dd>{text(words(check.basis))}, {text(unit_name(check.quantity))}; "
            f"{text(check.boundary)}; GWP100 {text(gwp_name(check.gwp_basis))}</dd>"
            f"<dt>Electricity</dt><dd>{text(electricity_rule_name(check.electricity_rule))}</dd>"
            + (f"<dt>Tiers</dt><dd>{tiers} {text(check.unit)}</dd>" if tiers else "")
            + f"<dt class=rulebook>Rulebook</dt><dd class=rulebook>{source}</dd></dl>"
            f"{reasons_table(check)}" + (f"<p class=note>{text(check.note)}</p>" if check.note else "") + "</div>"
        )
    return (
        f'<section class="sheet flows" id="{key}-schemes" aria-labelledby="{key}-schemes-h"><h2 '
        f'id="{key}-schemes-h">Against each scheme</h2>'
        "<p>Each scheme is checked under its own rulebook: its basis, boundary, GWP "
        "set and electricity rule. The values are therefore not the headline total. "
        f"Then each scheme's reasons: the rule, its result and the article it rests on, the deciding reason first.</p>"
        f"{limits_svg(result, key + '-lim')}{''.join(details)}</section>"
    )


def lifetime_section(item: ProjectReport, key: str) -> str:
    life = item.lifetime
    if life is None:
        return ""
    schemes = [s.scheme for s in life.schemes]
    rows = [
        [
            str(y.year),
            str(y.stack_age_years),
            f"{y.efficiency_fraction * 100:.1f} %",
            number(y.output_t),
            number(y.total),
        ]
        + [f"{number(y.scheme_values.get(s))} {YEAR_SIGNS.get(y.statuses.get(s, ''), '✗')}" for s in schemes]
        for y in life.years
    ]
    summary = [
        [
            text(s.scheme),
            number(s.average_without_construction),
            number(s.average_with_construction),
            "yes" if s.counts_construction else "no",
            f"{number(s.lifetime_value)} / {number(s.limit)}",
            text(s.unit),
            badge(status_name(s.status)),
            ", ".join(map(str, s.years_missed)) or "none",
        ]
        for s in life.schemes
    ]
    return (
        f'<section class="sheet flows" id="{key}-life" aria-labelledby="{key}-life-h"><h2 '
        f'id="{key}-life-h">Over the operating life</h2>'
        f"<p>{life.operating_years} operating years from {life.years[0].year}; lifetime output "
        f"{number(life.lifetime_output_t)} t; construction {number(life.construction_t_co2e)} t CO<sub>2</sub>e "
        f"({number(life.construction_kg_co2e_per_unit)} {text(life.unit)}). Grid trajectory: "
        f"{text(life.trajectory_source or 'none (constant factor)')}.</p>"
        f"{lifetime_svg(life, key + '-life')}"
        + _table(
            [
                "Scheme",
                "Average without construction",
                "Average with construction",
                "Counts construction",
                "Lifetime value / limit",
                "Unit",
                "Verdict",
                "Years missed",
            ],
            summary,
            "compact",
            {1, 2},
        )
        + _table(
            ["Year", "Stack age (years)", "Efficiency of new", "Output (t)", f"Total ({text(life.unit)})"]
            + [text(s) for s in schemes],
            rows,
            "compact small",
            set(range(1, 5 + len(schemes))),
        )
        + "</section>"
    )


def hours_matter(view: MatchingView) -> bool:
    """A heat map by hour of day says something only where some hour is left unmatched under a
    rule finer than the year: under annual matching, or with everything matched, it is one colour."""
    share = np.asarray(view.unmatched_share, dtype=float)
    return (
        view.granularity not in ("year", "annual") and bool(np.nanmax(share, initial=0.0) > 1e-9)
        if share.size
        else False
    )


def no_heat_map_reason(view: MatchingView) -> str:
    if view.granularity in ("year", "annual"):
        return (
            "Matched over the year: the hour of day does not change the matched share, so no heat map by hour is drawn."
        )
    return "Every hour's use is matched: no heat map of the unmatched share is drawn."


def matching_section(item: ProjectReport, key: str) -> str:
    if not item.matching:
        return ""
    checks = {check.scheme: check for check in item.result.checks}
    parts = []
    for index, view in enumerate(item.matching, 1):
        first = checks.get(view.schemes[0])
        figures = first.electricity_matching if first is not None else None
        names = "; ".join(
            f"{text(checks[s].name)} (<code>{text(s)}</code>)" if s in checks else f"<code>{text(s)}</code>"
            for s in view.schemes
        )
        rows = [
            [
                text(_month_label(m)),
                number(a / 1000.0),
                number(b / 1000.0),
                number((a - b) / 1000.0),
                f"{(b / a if a > 0 else 0.0):.1%}",
            ]
            for m, a, b in zip(view.months, view.monthly_load_kwh, view.monthly_matched_kwh, strict=True)
        ]
        source = (
            f" Series <code>{text(figures.series_file)}</code>, {figures.intervals} intervals "
            f"of {figures.interval_minutes} minutes from {text(figures.first_interval)}."
            if figures
            else ""
        )
        parts.append(
            f"<h3>{names}</h3>"
            f"<p>Matching period: {text(view.granularity)} ({text(view.rule)}). "
            f"Generation counted: {text(', '.join(view.eligible) or 'none')}. "
            f"<strong>{view.matched_share:.1%}</strong> of the electricity used is matched over the series.{source}</p>"
            + monthly_matching_svg(view, f"{key}-mm{index}")
            + (
                heat_map_svg(view, f"{key}-hm{index}")
                if hours_matter(view)
                else f"<p class=note>{text(no_heat_map_reason(view))}</p>"
            )
            + _table(
                ["Month", "Use (MWh)", "Matched (MWh)", "Unmatched (MWh)", "Matched share"],
                rows,
                "compact small",
                {1, 2, 3, 4},
            )
        )
    return (
        f'<section class="sheet flows" id="{key}-matching" aria-labelledby="{key}-matching-h"><h2 '
        f'id="{key}-matching-h">Hour by hour: matching the electricity</h2>'
        "<p>The project's electricity time series is matched with the contracted "
        "generation each scheme counts, in the scheme's own matching period; "
        "electricity not matched is charged as grid electricity. Schemes with "
        "the same rule and the same counted generation share one chart. "
        "The scheme verdicts of this report use these matched values; "
        "the headline total keeps the declared annual shares.</p>" + "".join(parts) + "</section>"
    )


def uncertainty_section(item: ProjectReport, key: str) -> str:
    spread = item.uncertainty
    if spread is None:
        return ""
    draws = spread.scheme_draws()
    total = spread.total
    inputs = [
        [f"<code>{text(d.input)}</code>", text(", ".join(f"{k} {v}" for k, v in d.distribution.items()))]
        for d in spread.inputs
    ]
    rows = []
    charts = []
    for index, check in enumerate(spread.checks, 1):
        statuses = ", ".join(
            f"{text(name)} {p.probability:.1%}" for name, p in check.statuses.items() if p.probability > 0
        )
        rows.append(
            [
                f"{text(check.name)}<span class=scheme-id>{text(check.scheme)}</span>",
                f"{check.probability_qualifies:.1%} &plusmn; {check.standard_error:.1%}",
                number(check.value.p5),
                number(check.value.p50),
                number(check.value.p95),
                number(check.limit),
                text(check.unit),
                statuses,
            ]
        )
        if check.scheme in draws:
            values, tiers = draws[check.scheme]
            charts.append(
                distribution_svg(
                    values,
                    list(tiers),
                    check.limit,
                    check.unit,
                    check.scheme,
                    check.probability_qualifies,
                    f"{key}-mc{index}",
                )
            )
    breaks = (
        f" {spread.draws_breaking_limits} draws broke a physical limit and are counted apart, not clipped."
        if spread.draws_breaking_limits
        else ""
    )
    return (
        f'<section class="sheet flows" id="{key}-spread" aria-labelledby="{key}-spread-h"><h2 '
        f'id="{key}-spread-h">How sure: the spread of the result</h2>'
        "<p>Monte Carlo of the inputs given in the project's <code>[uncertainty]</code> "
        f"table: <strong>{spread.draws:,} draws</strong>, "
        f"{text(spread.sampling.replace('_', ' '))} sampling, <strong>seed {spread.seed}</strong> "
        f"(the same seed gives the same numbers); {spread.draws_used:,} draws used.{breaks} "
        "The draws score the declared annual electricity shares (a time series is not redrawn).</p>"
        f"<p>Total: mean {number(total.mean)}, 5th percentile {number(total.p5)}, median "
        f"{number(total.p50)}, 95th percentile {number(total.p95)} {text(spread.unit)} "
        f"(standard error of the mean {number(total.standard_error)}).</p>"
        + _table(
            [
                "Scheme",
                "Probability of qualifying",
                "5th percentile",
                "Median",
                "95th percentile",
                "Limit",
                "Unit",
                "Verdicts over the draws",
            ],
            rows,
            "compact small",
            {1, 2, 3, 4, 5},
        )
        + "".join(charts)
        + "<h3>Uncertain inputs</h3>"
        + _table(["Input", "Distribution"], inputs, "small")
        + "</section>"
    )


def qualify_section(item: ProjectReport, key: str) -> str:
    """What it takes to qualify (a levers file was given): the least-cost lever values, or why none."""
    found = item.qualify
    if found is None:
        return ""
    target = (
        f"in at least {found.confidence:.0%} of {found.draws:,} draws"
        if found.confidence is not None
        else "at the central value"
    )
    if found.status == "qualifies":
        head = (
            f"<p>The least-cost set of changes with which {text(', '.join(found.schemes))} "
            f"qualif{'ies' if len(found.schemes) == 1 else 'y'} {target}: <strong>{found.total_cost:,.0f} "
            f"{text(found.cost_unit)}</strong>{' (invented prices)' if found.prices_invented else ''}.</p>"
        )
    else:
        head = (
            "<p><strong>No set of changes within the levers' ranges qualifies</strong> "
            f"for {text(', '.join(found.schemes))} {target}: {text(found.reason)}.</p>"
        )
    rows = [
        [
            f"<code>{text(c.parameter)}</code>",
            text(c.project_value),
            text(f"{c.value:.6g}" if isinstance(c.value, float) else c.value),
            text(c.unit),
            f"{c.cost:,.0f}",
        ]
        for c in found.changes
    ]
    checks = [
        [text(c.scheme), badge(c.status.replace("_", " ")), number(c.value), number(c.limit), text(c.unit)]
        for c in found.checks
    ]
    back = (
        "<p class=small>Score it back with "
        f"<code>{text(' '.join('--set ' + item for item in found.score_back_set))}</code>.</p>"
        if found.score_back_set
        else ""
    )
    return (
        f'<section class="sheet" id="{key}-qualify" aria-labelledby="{key}-qualify-h"><h2 '
        f'id="{key}-qualify-h">What it takes to qualify</h2>'
        + head
        + _table(
            [
                "Lever",
                "Project value",
                "Answer" if found.status == "qualifies" else "Best margin at",
                "Unit",
                f"Cost ({text(found.cost_unit)})",
            ],
            rows,
            "compact small",
            {1, 2, 4},
        )
        + _table(["Scheme", "Status", "Value", "Limit", "Unit"], checks, "compact small", {2, 3})
        + back
        + f"<p class=small>Levers from <code>{text(found.levers_file)}</code>; solver "
        f"{text(found.solver['continuous'])}, tolerance {found.solver['tolerance']:g}; "
        f"{text(found.solver['discrete'])}.</p>" + "</section>"
    )


def input_value(value: Any) -> str:
    """A parameter's value as a reader sees it: a number formatted, an unset one "not given" (never None)."""
    if value is None or value == "":
        return '<span class="note">not given</span>'
    if isinstance(value, bool):
        return "yes" if value else "no"
    if isinstance(value, float):
        return number(value)
    return text(value)


def inputs_section(item: ProjectReport, key: str) -> str:
    result = item.result
    info = result.parameters.get("project", {})
    evidence = info.get("note", "")
    rows = [
        [f"<code>{text(path)}</code>", input_value(value), text(unit), text(description)]
        for path, value, unit, description in item.inputs
        if not path.startswith("project.")
    ]
    half = (len(rows) + 1) // 2
    paired = [
        left[:3] + (right[:3] if right else ["", "", ""])
        for left, right in zip(rows[:half], rows[half:] + [None], strict=False)
    ]
    return (
        f'<section class="sheet annex" id="{key}-inputs" aria-labelledby="{key}-inputs-h"><h2 '
        f'id="{key}-inputs-h">What went in</h2>'
        f"<p><strong>Evidence note in the project file:</strong> {text(evidence) if evidence else 'none given.'}</p>"
        + _table(["Parameter", "Value", "Unit", "Meaning"], rows, "inputs screen")
        # on paper: two parameters a line, without their meaning (`carbonledger params` gives it)
        + _table(["Parameter", "Value", "Unit", "Parameter", "Value", "Unit"], paired, "inputs paper")
        + "</section>"
    )


def factors_on_paper(result: ScoreResult) -> str:
    """The factors table for print: each factor on one line (id, value, unit, year, region, checked),
    its source, table and note on a second line across the page."""
    lines = []
    for f in result.factors_used:
        flag = '<span class="flag">not yet verified</span>' if f.from_memory else text(f.grade.value)
        source = text(f.source) + (f", {text(f.table)}" if f.table else "") + (f". {text(f.note)}" if f.note else "")
        lines.append(
            f'<tr class="factor"><th scope="row"><code>{text(f.id)}</code></th><td '
            f"class=num>{number(f.value)}</td><td>{text(f.unit)}</td>"
            f"<td>{text(f.year or '')}</td><td>{text(f.region)}</td><td>{flag}</td></tr>"
            f'<tr class="about"><td colspan="6">{source}</td></tr>'
        )
    head = "".join(f'<th scope="col">{h}</th>' for h in ("Factor", "Value", "Unit", "Year", "Region", "Source grade"))
    return f'<table class="factors paper"><thead><tr>{head}</tr></thead><tbody>{"".join(lines)}</tbody></table>'


def factors_section(item: ProjectReport, key: str) -> str:
    result = item.result
    rows = [
        [
            f"<code>{text(f.id)}</code>",
            number(f.value),
            text(f.unit),
            text(f.source) + (f" <span class=src>{text(f.table)}</span>" if f.table else ""),
            text(f.year or ""),
            text(f.region),
            f'<span class="flag">{text(f.grade.words)}</span>' if f.from_memory else text(f.grade.words),
            text(f.note),
        ]
        for f in result.factors_used
    ]
    return (
        f'<section class="sheet annex" id="{key}-factors" aria-labelledby="{key}-factors-h"><h2 '
        f'id="{key}-factors-h">Factors and their sources</h2>'
        f"<p>Factor set <strong>{text(result.factor_set.name)}</strong>, sha256 "
        f"<code class=hash>{text(result.factor_set.sha256)}</code>. "
        f"{text(factor_grades_sentence(result.factor_grades, len(result.factors_used)))}</p>"
        + _table(
            ["Factor", "Value", "Unit", "Source", "Year", "Region", "Source grade", "Note"], rows, "factors screen", {1}
        )
        + factors_on_paper(result)
        + "</section>"
    )


def provenance_section(item: ProjectReport, key: str, generated: str, caution: str) -> str:
    result = item.result
    pairs = [
        ("Project file", f"<code>{text(result.project_file)}</code>"),
        ("Project file sha256", f"<code class=hash>{text(result.project_sha256)}</code>"),
        ("Factor set", f"{text(result.factor_set.name)}"),
        ("Factor set sha256", f"<code class=hash>{text(result.factor_set.sha256)}</code>"),
        ("GWP100 set (headline)", text(result.gwp_basis.upper())),
        (
            "Heating values (LHV)",
            ", ".join(
                f"{text(words(k.replace('_lhv', '')))} {number(v)} MJ/kg"
                for k, v in result.heating_values_mj_per_kg.items()
            ),
        ),
        ("carbonledger version", text(result.carbonledger_version)),
        ("Report date", text(generated)),
    ]
    dl = "".join(f"<dt>{k}</dt><dd>{v}</dd>" for k, v in pairs)
    return (
        f'<section class="sheet annex" id="{key}-provenance" aria-labelledby="{key}-provenance-h"><h2 '
        f'id="{key}-provenance-h">How this was made</h2>'
        f"<dl class=provenance>{dl}</dl>"
        f'<p class="caution" role="note"><strong>Caution.</strong> {text(caution)}</p></section>'
    )


def project_html(item: ProjectReport, index: int, generated: str, caution: str) -> str:
    result = item.result
    key = f"p{index}"
    info = result.parameters.get("project", {})
    meta = [
        ("Site", info.get("site", "")),
        ("Product", result.product),
        ("Boundary", result.boundary),
        ("Functional unit", result.functional_unit),
    ]
    dl = "".join(f"<dt>{k}</dt><dd>{text(v)}</dd>" for k, v in meta if v)
    return (
        f'<article class="project" id="{key}" aria-labelledby="{key}-h"><header class="project-head">'
        f'<p class="kicker">Project {index}</p><h1 id="{key}-h">{text(result.project)}</h1><dl '
        f'class="meta">{dl}</dl></header>'
        + glance_section(item, key, caution)
        + sources_section(item, key)
        + schemes_section(item, key)
        + matching_section(item, key)
        + uncertainty_section(item, key)
        + qualify_section(item, key)
        + lifetime_section(item, key)
        + inputs_section(item, key)
        + factors_section(item, key)
        + provenance_section(item, key, generated, caution)
        + "</article>"
    )


def contents_html(items: list[ProjectReport]) -> str:
    rows = []
    for index, item in enumerate(items, 1):
        result = item.result
        verdicts = (
            " ".join(f'<span class="pair">{text(c.scheme)} {badge(status_of(c))}</span>' for c in result.checks)
            or "none apply"
        )
        rows.append(
            [
                f'<a href="#p{index}">{text(result.project)}</a>',
                f"{number(result.total)}",
                text(result.unit),
                text(result.boundary),
                verdicts,
            ]
        )
    return (
        '<section class="contents" aria-labelledby="contents-h"><h2 id="contents-h">Projects in this report</h2>'
        + _table(["Project", "Result", "Unit", "Boundary", "Verdicts"], rows, "compact", {1})
        + "</section>"
    )


STYLE = """
:root{--ink:#1d2a33;--paper:#fbf9f3;--rule:#d8d1c1;--teal:#24566b;--teal-soft:#e4eef0;--sand:#c9892b;\
--sand-soft:#f6ecd9;
--ok:#2f6b45;--ok-soft:#e2efe5;--no:#a4452f;--no-soft:#f6e2dc;--off:#5b616c;--off-soft:#e7e8ea;--open:#8a6a10;\
--open-soft:#f5edd2;}
*{box-sizing:border-box}
html{background:var(--paper);color:var(--ink)}
body{margin:0 auto;max-width:980px;padding:0 28px 48px;\
font:15px/1.5 system-ui,-apple-system,"Segoe UI",Roboto,"Noto Sans","DejaVu Sans",sans-serif;\
font-variant-numeric:tabular-nums}
h1,h2,h3,h4{font-family:Charter,"Bitstream Charter","Sitka Text",Cambria,"DejaVu Serif",Georgia,serif;font-weight:600;\
line-height:1.2;color:var(--teal)}
h1{font-size:30px;margin:4px 0 10px}
h2{font-size:22px;margin:0 0 12px;padding-bottom:6px;border-bottom:2px solid var(--sand)}
h3{font-size:17px;margin:22px 0 8px}
h4{font-size:15px;margin:0 0 6px;display:flex;gap:10px;align-items:center;flex-wrap:wrap}
.masthead{display:flex;justify-content:space-between;align-items:baseline;border-bottom:1px solid var(--rule);\
padding:18px 0 10px;margin-bottom:18px;font-size:13px;color:#55616b}
.masthead .brand{font-family:Charter,"Bitstream Charter",Cambria,Georgia,serif;font-size:18px;color:var(--teal);\
letter-spacing:.02em}
.kicker{margin:0;text-transform:uppercase;letter-spacing:.12em;font-size:12px;color:var(--sand)}
.meta{display:grid;grid-template-columns:max-content 1fr;gap:2px 14px;margin:0 0 10px;font-size:14px}
.meta dt,.provenance dt{color:#55616b}.meta dd,.provenance dd{margin:0}
.project-head{padding:12px 0 6px}
section.sheet{background:#fff;border:1px solid var(--rule);border-radius:6px;padding:18px 22px 20px;margin:18px 0}
.contents{margin:8px 0 26px}
.lead{font-size:16px;margin-top:0}
.figures{display:flex;gap:14px;flex-wrap:wrap;margin:8px 0 14px}
.figure{flex:1 1 200px;border-left:5px solid var(--teal);background:var(--teal-soft);padding:10px 14px;\
border-radius:0 6px 6px 0}
.figure .big{display:block;font-size:28px;font-weight:650;color:var(--teal)}
.figure .unit{font-size:13px;color:#3e4a52}
table{border-collapse:collapse;width:100%;margin:10px 0 14px;font-size:13.5px}
caption{text-align:left;font-weight:600;padding-bottom:4px}
th,td{padding:5px 8px;border-bottom:1px solid var(--rule);vertical-align:top;text-align:left}
thead th{background:var(--sand-soft);border-bottom:2px solid var(--sand);font-weight:600}
tbody th{font-weight:500}
.num{text-align:right;white-space:nowrap}
table.compact{width:auto;min-width:60%}
table.small,table.factors,table.inputs{font-size:12.5px}
table.factors td:nth-child(8){color:#4d5860}
table.factors,table.inputs{table-layout:fixed}
table.factors code,table.inputs code{word-break:break-all}
table.factors th:nth-child(1){width:18%}table.factors th:nth-child(2){width:8%}table.factors th:nth-child(3){width:10%}
table.factors th:nth-child(4){width:23%}table.factors th:nth-child(5){width:6%}table.factors th:nth-child(6){width:8%}
table.factors th:nth-child(7){width:11%}table.factors th:nth-child(8){width:16%}
table.factors td:nth-child(5){white-space:nowrap}
table.inputs.screen th:nth-child(1){width:32%}table.inputs.screen th:nth-child(2){width:20%}\
table.inputs.screen th:nth-child(3){width:14%}table.inputs.screen th:nth-child(4){width:34%}
table.inputs.paper,table.factors.paper{display:none}
table.factors.paper tr.factor td,table.factors.paper tr.factor th{border-bottom:none;padding-bottom:0}
table.factors.paper tr.about td{color:#4d5860;padding-top:0;padding-left:14px;font-size:.92em}
table.inputs.paper th:nth-child(3n+1){width:29%}table.inputs.paper th:nth-child(3n+2){width:13%}\
table.inputs.paper th:nth-child(3n){width:8%}
table.inputs.paper code{font-family:inherit;font-size:1em;word-break:normal;overflow-wrap:anywhere}
table.inputs.paper td:nth-child(4),table.inputs.paper th:nth-child(4){border-left:1px solid var(--rule)}
td .src{font-size:.92em}
tr{break-inside:avoid}
thead{display:table-header-group}
.scheme-id{display:block;font-size:12px;color:#66717a;font-family:ui-monospace,"DejaVu Sans Mono",monospace}
.badge{display:inline-block;padding:1px 9px;border-radius:11px;font-size:12.5px;font-weight:650;letter-spacing:.02em;\
border:1px solid}
.badge.ok{color:var(--ok);background:var(--ok-soft);border-color:var(--ok)}
.badge.no{color:var(--no);background:var(--no-soft);border-color:var(--no)}
.badge.off{color:var(--off);background:var(--off-soft);border-color:var(--off)}
.badge.open{color:var(--open);background:var(--open-soft);border-color:var(--open)}
.pair{white-space:nowrap;margin-right:10px}
table.verdicts{table-layout:fixed}
table.verdicts thead th:nth-child(1){width:30%}table.verdicts thead th:nth-child(2){width:15%}\
table.verdicts thead th:nth-child(3),table.verdicts thead th:nth-child(4){width:10%}
table.verdicts thead th:nth-child(5){width:14%}table.verdicts thead th:nth-child(6){width:21%}
table.verdicts tr.verdict td{border-bottom:none;padding-bottom:1px}
table.verdicts td.deciding{font-size:12px;color:#3e4a52;padding-top:0;padding-left:18px;white-space:nowrap;\
overflow:hidden;text-overflow:ellipsis}
table.verdicts td.deciding::before{content:"→ "}
.badge{white-space:nowrap}
.scheme-id{white-space:nowrap}
table.reasons{font-size:12px;table-layout:fixed;margin:6px 0 4px}
table.reasons thead th:nth-child(1){width:58%}table.reasons thead th:nth-child(2){width:13%}\
table.reasons thead th:nth-child(3){width:29%}
table.reasons td{padding:2px 6px;border-bottom:none}table.reasons tr.group td{border-top:1px solid var(--rule)}
table.reasons td.src{color:#4d5860;font-size:11.5px;border-left:1px solid var(--rule)}
table.reasons tr.r-no td.result{color:var(--no);font-weight:600}table.reasons tr.r-open td.result{color:var(--open);\
font-weight:600}
table.reasons tr.r-ok td.result{color:var(--ok)}
table.reasons tr.decides td:first-child{font-weight:600}
.caution{background:var(--sand-soft);border-left:5px solid var(--sand);padding:10px 14px;border-radius:0 6px 6px 0;\
margin:16px 0 0}
.note,.src{color:#5d6870;font-size:12.5px}
.scheme{border-top:1px solid var(--rule);padding:12px 0 4px;break-inside:avoid}
.scheme dl{display:grid;grid-template-columns:max-content 1fr;gap:2px 14px;margin:4px 0;font-size:13.5px}
.scheme dt{color:#55616b}.scheme dd{margin:0}
.tiers{margin:6px 0;padding-left:20px;font-size:13px}
.provenance{display:grid;grid-template-columns:max-content 1fr;gap:4px 16px;font-size:14px}
code{font-family:ui-monospace,"DejaVu Sans Mono",Menlo,Consolas,monospace;font-size:.92em}
.hash{word-break:break-all}
.flag{color:var(--open);font-weight:600}
svg.chart{display:block;width:100%;height:auto;max-width:760px;margin:6px 0 8px;font-family:inherit}
svg .label{font-size:13px;fill:var(--ink)}svg .value{font-size:12.5px;fill:var(--ink)}svg .strong{font-weight:700}
svg .note{font-size:11.5px;fill:#5d6870}svg .tick{font-size:11px;fill:#5d6870}
svg .axis{stroke:#8b949b;stroke-width:1}svg .step{stroke:#8b949b;stroke-width:1;stroke-dasharray:2 2}
svg .total-bar{fill:var(--ink)}svg .on-bar{fill:#fff;font-weight:600}svg .track{fill:#f1eee6}
svg .bar-ok{fill:var(--ok)}svg .bar-no{fill:var(--no)}svg .bar-off{fill:var(--off)}svg .bar-open{fill:var(--open)}
svg .limit{stroke:var(--ink);stroke-width:1.2;stroke-dasharray:4 3}svg .limit-main{stroke:var(--ink);stroke-width:2.6}
svg .matched{fill:#6f9a73}svg .unmatched{fill:#cbc3b1}svg .no-use{fill:#ece8de}
svg .trace{fill:none;stroke:var(--teal);stroke-width:2.2}svg .dot{fill:var(--teal)}
footer.colophon{margin-top:30px;font-size:12.5px;color:#5d6870;border-top:1px solid var(--rule);padding-top:10px}
@media print{
 @page{margin:11mm 12mm 12mm}
 html,body{background:#fff}
 body{max-width:none;padding:0;font-size:9.5pt;line-height:1.32}
 section.sheet{border:none;padding:0;margin:0;break-before:page;border-radius:0}
 section.sheet.annex{break-before:auto;margin-top:10pt}
 article.project{break-before:page}
 article.project:first-of-type{break-before:auto}
 .contents + article.project{break-before:page}
 .project-head + section.sheet{break-before:avoid}
 h2,h3,h4{break-after:avoid}
 svg.chart{max-width:100%;break-inside:avoid}
 table{font-size:8.8pt}table.factors,table.inputs,table.small{font-size:7.6pt}table.reasons{font-size:7.8pt}
 table.reasons td,table.factors td,table.inputs td{padding:1px 5px}
 table.reasons{font-size:7.4pt}table.reasons td.src{font-size:7pt}
 table.inputs.screen{display:none}table.inputs.paper{display:table;font-size:7pt}
 table.factors.screen{display:none}table.factors.paper{display:table;font-size:7pt;table-layout:fixed}
 table.factors.paper th:nth-child(1){width:30%}table.factors.paper th:nth-child(2){width:9%}\
table.factors.paper th:nth-child(3){width:13%}
 table.factors.paper th:nth-child(4){width:6%}table.factors.paper th:nth-child(5){width:30%}\
table.factors.paper th:nth-child(6){width:12%}
 section.sheet.flows{break-before:auto;margin-top:10pt}
 svg.chart{max-width:76%}
 footer.colophon{display:none}
 table.compact{font-size:7.8pt;min-width:0}table.compact td,table.compact th{padding:1px 6px}
 section.sheet h3{margin-top:6pt}
 .scheme h4{margin:4pt 0 2pt}.scheme dl{gap:0 10px}
 .scheme .rulebook{display:none}.scheme p.note{font-size:7.4pt;margin:2pt 0}
 .scheme{padding:6px 0 2px;break-inside:auto}.scheme dl{font-size:8.6pt}
 h3{margin:10pt 0 5pt}
 .project-head{padding:0}.project-head h1{font-size:20pt;margin:2pt 0 4pt}.meta{font-size:9pt;margin-bottom:4pt}\
.masthead{padding:0 0 6pt;margin-bottom:8pt}
 .figures{margin:4pt 0 6pt}.figure{padding:5pt 10pt}.caution{padding:6pt 10pt;font-size:9pt;margin-top:8pt}
 table.verdicts{font-size:8.4pt}table.verdicts td.deciding{font-size:7.8pt}\
table.verdicts td,table.verdicts th{padding:2px 6px}
 .figure .big{font-size:16pt}.lead{font-size:10pt;margin-bottom:2pt}h2{font-size:14pt;margin:0 0 4pt;\
padding-bottom:3pt}h4{margin:3pt 0 2pt}
 .provenance{font-size:8.4pt;gap:1pt 12pt}table{margin:4pt 0 6pt}p{margin:4pt 0}
 a{color:inherit;text-decoration:none}
 .badge,.figure,.caution,thead th{-webkit-print-color-adjust:exact;print-color-adjust:exact}
}
"""


def render_report(items: list[ProjectReport], *, generated: str, caution: str, paper: str | None = None) -> str:
    """The whole report as one HTML text (no outside request). ``paper`` ('a4' or 'letter') fixes
    the printed page size, for the PDF; without it the reader's printer decides."""
    if not items:
        raise InputError("report", "PROJECT", "at least one project")
    title = items[0].result.project if len(items) == 1 else f"{len(items)} projects"
    page = {"a4": "@page{size:A4}", "letter": "@page{size:letter}"}.get(paper or "", "")
    body = [
        '<header class="masthead"><span class="brand">carbonledger &middot; project report</span>'
        f"<span>{text(generated)} &middot; version {text(items[0].result.carbonledger_version)}</span></header>"
    ]
    if len(items) > 1:
        body.append(contents_html(items))
    body += [project_html(item, index, generated, caution) for index, item in enumerate(items, 1)]
    body.append(
        f'<footer class="colophon">Made with carbonledger {text(items[0].result.carbonledger_version)} '
        f"on {text(generated)}. {text(caution)}</footer>"
    )
    return (
        "<!DOCTYPE html>\n"
        '<html lang="en"><head><meta charset="utf-8"><meta name="viewport" '
        'content="width=device-width, initial-scale=1">'
        f'<meta name="generator" content="carbonledger {text(items[0].result.carbonledger_version)}">'
        f"<title>{text(title)}: carbon intensity report</title><style>{STYLE}{page}</style></head>"
        f"<body><main>{''.join(body)}</main></body></html>\n"
    )


# --- files ------------------------------------------------------------------------------------


def write_report(html_text: str, path: str | Path, force: bool = False) -> Path:
    return atomic_write(path, lambda tmp: tmp.write_text(html_text, encoding="utf-8"), force=force)


def find_chromium() -> str | None:
    """Headless Chromium: $CARBONLEDGER_CHROMIUM, else the usual names on PATH."""
    named = os.environ.get("CARBONLEDGER_CHROMIUM")
    if named:
        return shutil.which(named) or (named if Path(named).is_file() else None)
    return next((found for name in CHROMIUM_NAMES if (found := shutil.which(name))), None)


def chromium_command(chromium: str) -> list[str]:
    """Chromium headless with the flags it needs in a container (no sandbox as root)."""
    flags = [
        chromium,
        "--headless",
        "--disable-gpu",
        "--no-first-run",
        "--no-default-browser-check",
        "--disable-extensions",
        "--hide-scrollbars",
    ]
    if hasattr(os, "geteuid") and os.geteuid() == 0:
        flags.append("--no-sandbox")
    return flags


def print_pdf(html_text: str, path: str | Path, force: bool = False, timeout_s: float = 120.0) -> Path:
    """Print the report to PDF with headless Chromium (``--print-to-pdf``), atomically."""
    chromium = find_chromium()
    if chromium is None:
        raise InputError(
            path,
            "--pdf",
            "Chromium on PATH to print the PDF (e.g. `apt-get install chromium`), or $CARBONLEDGER_CHROMIUM naming it",
        )

    def write(tmp: Path) -> None:
        with tempfile.TemporaryDirectory(prefix="carbonledger-pdf-") as folder:
            page = Path(folder) / "report.html"
            page.write_text(html_text, encoding="utf-8")
            command = chromium_command(chromium) + [
                f"--user-data-dir={folder}/profile",
                "--no-pdf-header-footer",
                f"--print-to-pdf={tmp}",
                page.as_uri(),
            ]
            try:
                done = subprocess.run(command, capture_output=True, timeout=timeout_s)
            except subprocess.TimeoutExpired:
                raise InputError(path, "--pdf", f"Chromium to print within {timeout_s:.0f} s (it did not)") from None
            if done.returncode != 0 or not tmp.exists() or tmp.stat().st_size == 0:
                last = (done.stderr.decode("utf-8", "replace").strip().splitlines() or ["no message"])[-1]
                raise InputError(path, "--pdf", f"Chromium to print the PDF (it failed: {last[:200]})")

    return atomic_write(path, write, force=force)
