"""Metered operating periods: read and validate a monthly meters CSV, derive each month's parameters.

The CSV has one row per month and one column per meter, the unit in square brackets::

    month,electricity.grid [MWh],natural_gas [GJ],hydrogen [t],ammonia [t]
    2026-01,1520.5,41200,1650,9300

Columns: ``month`` (YYYY-MM, consecutive, no gaps or repeats); ``electricity.<source> [energy]``
for every electricity source of the project (MWh, kWh, GWh...); ``natural_gas [energy]`` or
``natural_gas [Nm3]`` when the project burns natural gas (Nm3 are converted with the factor
``natural_gas.net_calorific_value_volume``); ``hydrogen [mass]`` (t, kg); ``ammonia [mass]``
for an ammonia project. ``hydrogen`` is optional for an ammonia project (then a cross-check
only) and required for a hydrogen project.

A month's parameters are the project's design parameters with:

- the electricity shares from the metered electricity of each source;
- every natural gas consumption parameter times ``k_gas`` = metered gas per functional unit /
  the design's gas per functional unit (gas burnt for capture follows the captured CO2, so the
  month's gas per functional unit equals the metered figure exactly);
- every electricity consumption parameter times ``k_electricity`` = metered electricity per
  functional unit / the electricity per functional unit of the design's consumers at the
  month's gas use (so the month's electricity per functional unit equals the metered figure).

The split of electricity and gas among the plant's consumers keeps the design's proportions;
sub-meters, where a plant has them, belong in the design parameters.
"""

from __future__ import annotations

import csv
import io
import re
from dataclasses import dataclass, field
from pathlib import Path

from ..core.assessment import Assessment
from ..errors import InputError
from ..model.factors import read_csv_text
from ..model.project import split_path
from ..model.units import UnitMismatch, conversion_factor
from ..routes import metered_parameters
from ..routes.project import validate_project
from .pipeline import assess

_HEADER = re.compile(r"^\s*(?P<name>[^\[\]]+?)\s*\[(?P<unit>[^\[\]]+)\]\s*$")
_MONTH = re.compile(r"^(\d{4})-(\d{2})$")
NM3 = ("nm3", "nm^3", "nm**3")
NM3_FACTOR = "natural_gas.net_calorific_value_volume"
CANONICAL = {"electricity": "kWh", "natural_gas": "GJ", "hydrogen": "kg", "ammonia": "t"}
# The most a plant's meter can read in one month, canonical units: above the world's monthly
# production or use (about 2.5 PWh of electricity, 12 EJ of natural gas, 8 Mt of hydrogen, 15 Mt of
# ammonia: IEA statistics, facts of the trade, from memory) divided by ten or more would be a typing error.
MONTHLY_MAXIMUM = {"electricity": 1e11, "natural_gas": 1e9, "hydrogen": 1e10, "ammonia": 1e8}
NM3_MOST_GJ = 0.05  # GJ per Nm3: above the heating value of any natural gas (about 0.036-0.040 GJ/Nm3)
DIMENSION_WORDS = {
    "electricity": "an energy unit (MWh, kWh, GWh)",
    "natural_gas": "an energy unit (GJ, MJ, TJ) or Nm3",
    "hydrogen": "a mass unit (t, kg)",
    "ammonia": "a mass unit (t, kg)",
}


@dataclass
class MeterColumn:
    header: str
    quantity: str  # electricity, natural_gas, hydrogen, ammonia
    source: str  # electricity source name ('' otherwise)
    unit: str  # as written
    multiplier: float  # to the canonical unit; for Nm3, 1 (the factor is applied separately)
    by_volume: bool = False


@dataclass
class Meters:
    path: str
    columns: list[MeterColumn]
    months: list[str]
    values: list[dict[str, float]] = field(default_factory=list)  # header -> value, per month

    def column(self, quantity: str, source: str = "") -> MeterColumn | None:
        return next((c for c in self.columns if c.quantity == quantity and c.source == source), None)


def scaled_parameters(params: dict) -> tuple[list[str], list[str]]:
    """The gas and electricity parameter paths a month's scale factors apply to (declared by the route modules)."""
    paths = metered_parameters(params)
    return [p for p in paths["natural_gas"] if _get(params, p) is not None], [
        p for p in paths["electricity"] if _get(params, p) is not None
    ]


def _get(tree: dict, path: str):
    node = tree
    for part in split_path(path):
        if not isinstance(node, dict) or node.get(part) is None:
            return None
        node = node[part]
    return node


def _parse_column(header: str, project, path: str) -> MeterColumn:
    match = _HEADER.match(header or "")
    if not match:
        raise InputError(
            path, f"column '{header}'", "a meter name with its unit in brackets, e.g. 'electricity.grid [MWh]'"
        )
    name, unit = match.group("name"), match.group("unit").strip()
    quantity, _, source = name.partition(".")
    sources = project.electricity.sources
    if quantity == "electricity":
        if source not in sources:
            raise InputError(
                path,
                f"column '{header}'",
                f"an electricity source of the project ({', '.join(sources)}), got '{source}'",
            )
    elif quantity not in ("natural_gas", "hydrogen", "ammonia") or source:
        raise InputError(
            path,
            f"column '{header}'",
            "a known meter: month, electricity.<source>, natural_gas, hydrogen, ammonia (unknown column)",
        )
    if quantity == "ammonia" and project.project.product != "ammonia":
        raise InputError(path, f"column '{header}'", "no ammonia meter for a hydrogen project (unknown column)")
    if quantity == "natural_gas" and not project.uses_natural_gas():
        raise InputError(
            path, f"column '{header}'", "no natural gas meter: the project burns no natural gas (unknown column)"
        )
    if quantity == "natural_gas" and unit.replace(" ", "").lower() in NM3:
        return MeterColumn(header, quantity, source, unit, 1.0, by_volume=True)
    try:
        multiplier = conversion_factor(unit, CANONICAL[quantity])
    except UnitMismatch:
        raise InputError(path, f"column '{header}'", f"{DIMENSION_WORDS[quantity]} (unit mismatch: '{unit}')") from None
    return MeterColumn(header, quantity, source, unit, multiplier)


def _month_number(text: str) -> int:
    year, month = (int(part) for part in _MONTH.match(text).groups())
    return year * 12 + month - 1


def _meter_header(path: Path, header: list[str], project) -> list:
    """The meters CSV's columns, each parsed; every meter the project needs present, each once."""
    header = [h.strip() for h in header]
    if not header or header[0] != "month":
        raise InputError(path, "header", f"'month' as the first column, got '{header[0] if header else ''}'")
    if len(set(header)) != len(header):
        raise InputError(path, "header", "each column once")
    columns = [_parse_column(h, project, str(path)) for h in header[1:]]
    kinds = [(c.quantity, c.source) for c in columns]
    if len(set(kinds)) != len(kinds):
        raise InputError(path, "header", "one column per meter (the same meter appears twice with different units)")
    required = [("electricity", name) for name in project.electricity.sources]
    required.append(("ammonia", "") if project.project.product == "ammonia" else ("hydrogen", ""))
    if project.uses_natural_gas():
        required.append(("natural_gas", ""))
    for quantity, source in required:
        if (quantity, source) not in kinds:
            name = f"{quantity}.{source}" if source else quantity
            raise InputError(
                path,
                "header",
                f"a column '{name} [{CANONICAL[quantity] if quantity != 'electricity' else 'MWh'}]' (missing)",
            )
    return columns


def _meter_value(path: Path, where: str, text: str, column) -> float:
    """One metered amount: a finite number from 0 to the month's physical maximum of its meter."""
    try:
        value = float(text)
    except ValueError:
        raise InputError(path, where, f"a number, got '{text.strip()}'") from None
    if not value == value or value in (float("inf"), float("-inf")):
        raise InputError(path, where, f"a finite number, got '{text.strip()}'")
    if value < 0:
        raise InputError(path, where, f"a number >= 0, got {value:g}")
    most = MONTHLY_MAXIMUM[column.quantity] / (NM3_MOST_GJ if column.by_volume else column.multiplier)
    if value > most:
        raise InputError(
            path,
            where,
            f"a month's amount of at most {most:g} {column.unit} (above any plant's, a physical range), got {value:g}",
        )
    return value


def _meter_month(path: Path, line: int, row: list[str], columns: list, meters, project) -> tuple[str, dict[str, float]]:
    """(month, amounts by column header) of one row, with production, electricity and gas where the month needs them."""
    if len(row) != len(columns) + 1:
        raise InputError(path, f"line {line}", f"{len(columns) + 1} values, got {len(row)}")
    month = row[0].strip()
    if not _MONTH.match(month) or not 1 <= int(month[5:]) <= 12:
        raise InputError(path, f"line {line}, month", f"a month as YYYY-MM, got '{month}'")
    values = {
        column.header: _meter_value(path, f"line {line}, {column.header}", text, column)
        for column, text in zip(columns, row[1:], strict=True)
    }
    output = meters.column("ammonia") if project.project.product == "ammonia" else meters.column("hydrogen")
    if values[output.header] <= 0:
        raise InputError(
            path,
            f"line {line}, {output.header}",
            "a production > 0 in every month (the month's intensity divides by it)",
        )
    if sum(values[c.header] for c in columns if c.quantity == "electricity") <= 0:
        raise InputError(
            path, f"line {line}", "some electricity in every month (the shares of the sources divide by the total)"
        )
    gas = meters.column("natural_gas")
    if gas is not None and values[gas.header] <= 0:
        raise InputError(path, f"line {line}, {gas.header}", "a gas use > 0 (the project burns natural gas)")
    return month, values


def read_meters(path: str | Path, project) -> Meters:
    """Read and validate a meters CSV against a validated project; one line per problem."""
    path = Path(path)
    lines = io.StringIO(read_csv_text(path, "meters CSV"), newline="")
    try:
        rows = list(csv.reader(row for row in lines if row.strip() and not row.lstrip().startswith("#")))
    except csv.Error as error:
        raise InputError(path, "", f"a well-formed CSV ({error})") from None
    if not rows:
        raise InputError(path, "header", "a header row: month, electricity.<source> [MWh], ...")
    columns = _meter_header(path, rows[0], project)
    meters = Meters(str(path), columns, [])
    for line, row in enumerate(rows[1:], start=2):
        month, values = _meter_month(path, line, row, columns, meters, project)
        meters.months.append(month)
        meters.values.append(values)
    if not meters.months:
        raise InputError(path, "", "at least one month of metered data")
    numbers = [_month_number(m) for m in meters.months]
    if len(set(meters.months)) != len(meters.months):
        twice = next(month for number, month in enumerate(meters.months) if month in meters.months[:number])
        raise InputError(path, "month", f"each month once, {twice} appears twice")
    pairs = list(zip(meters.months, numbers, strict=True))
    for (before, previous), (month, number) in zip(pairs, pairs[1:], strict=False):
        if number < previous:
            raise InputError(path, "month", f"months in calendar order; {month} comes after {before} (out of order)")
        if number != previous + 1:
            raise InputError(
                path,
                "month",
                f"consecutive months; {number - previous - 1} month(s) missing between {before} and {month}",
            )
    return meters


def _supply(result, activity: str) -> float:
    return next((row.activity_supply for row in result.exchanges if row.activity == activity), 0.0)


def month_parameters(meters: Meters, number: int, project, factor_set, design) -> tuple[dict, dict]:
    """One month's converted meter readings and its parameters, with the engine's numbers.

    ``design`` is the engine's ScoreResult of the design project. Returns (readings in
    calculation units, parameter dict before the electricity scale factor); see
    ``month_results`` for the rest.
    """
    values = meters.values[number]
    readings: dict[tuple[str, str], float] = {}
    for column in meters.columns:
        value = values[column.header]
        if column.by_volume:
            value = value * factor_set.get(NM3_FACTOR, "--periods natural_gas [Nm3]").value / 1000.0
        else:
            value = value * column.multiplier
        readings[(column.quantity, column.source)] = value
    product = project.project.product
    output = readings[("ammonia", "")] if product == "ammonia" else readings[("hydrogen", "")]
    electricity = sum(v for (q, _), v in readings.items() if q == "electricity")
    params = project.model_dump()
    for name in params["electricity"]["sources"]:
        params["electricity"]["sources"][name]["share"] = readings[("electricity", name)] / electricity
    gas_paths, _ = scaled_parameters(params)
    if gas_paths and ("natural_gas", "") in readings:
        k_gas = readings[("natural_gas", "")] / output / _supply(design, "natural_gas_supply")
        for path in gas_paths:
            _set(params, path, _get(params, path) * k_gas)
    return {"output": output, "electricity_per_unit": electricity / output}, params


def _set(tree: dict, path: str, value) -> None:
    parts = split_path(path)
    node = tree
    for part in parts[:-1]:
        node = node[part]
    node[parts[-1]] = value


def month_results(meters: Meters, project, assessment: Assessment, *, design) -> list:
    """The engine's (bw2calc) result of every metered month under the assessment's factor set, GWP set, schemes
    and year, for comparison with the workbook."""
    results = []
    for number, month in enumerate(meters.months):
        source = f"{meters.path}: month {month} (parameters derived from the meters)"
        figures, params = month_parameters(meters, number, project, assessment.factor_set, design)
        at_gas = assess(assessment, validate_project(params, source), source=source)
        k_electricity = figures["electricity_per_unit"] / _supply(at_gas, "electricity_mix")
        for path in scaled_parameters(params)[1]:
            _set(params, path, _get(params, path) * k_electricity)
        results.append(assess(assessment, validate_project(params, source), source=source))
    return results


def output_quantity(product: str) -> str:
    """The meter column that counts the functional unit's output: ammonia, else hydrogen."""
    return "ammonia" if product == "ammonia" else "hydrogen"


def metered_year(meters: Meters, product: str, results: list) -> float:
    """The metered months together, output-weighted (what the Periods sheet's year row computes):
    sum over months of (the month's figure per unit x its metered output) / the summed output."""
    column = meters.column(output_quantity(product))
    outputs = [values[column.header] * column.multiplier for values in meters.values]
    return sum(result.total * output for result, output in zip(results, outputs, strict=True)) / sum(outputs)
