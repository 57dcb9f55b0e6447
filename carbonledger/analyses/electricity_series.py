"""An electricity time series: read and validate a CSV of intervals against a project.

The CSV has one row per interval (15, 30 or 60 minutes, one year or many) and the unit of each
column in square brackets::

    timestamp,electrolyser [kWh],generation.solar [kWh],generation.wind [kWh],grid_intensity [g CO2e/kWh],price
    [EUR/MWh]
    2026-01-01T00:00+01:00,20000,0,13250.5,312.4,81.2

Columns:

- ``timestamp``: the start of the interval, ISO 8601 with its UTC offset (``Z``, ``+01:00``).
  Local time without an offset is refused: it is ambiguous at daylight-saving changes.
- ``electrolyser [energy]``: the project's electricity use in the interval (kWh, MWh), or
  ``hydrogen [mass]``: hydrogen produced (kg, t), turned into electricity with the project's
  electricity per kg H2. Exactly one of the two.
- ``generation.<source> [energy]``: generation available to the project from each contracted
  source, one column per source; ``<source>`` must be a source of ``[electricity.sources]``.
  Sources without a column (the grid) supply what generation does not match.
- ``grid_intensity [g CO2e/kWh]`` (optional): the grid's emission intensity in the interval;
  without it the grid source's factor is used.
- ``price [<currency>/MWh]`` (optional): the electricity price in the interval.

Rows are numbered as in a spreadsheet: the header is row 1. Every problem is one line naming
the file, the row and the column.
"""

from __future__ import annotations

import hashlib
import io
import re
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from ..errors import InputError
from ..model.input_files import read_input_bytes
from ..model.units import UnitMismatch, conversion_factor
from ..stages.electricity import kind_of_source

_HEADER = re.compile(r"^\s*(?P<name>[^\[\]]+?)\s*\[(?P<unit>[^\[\]]+)\]\s*$")
_STAMP = re.compile(r"^\d{4}-\d{2}-\d{2}[T ]\d{2}:\d{2}(:\d{2}(\.\d+)?)?(?P<offset>Z|[+-]\d{2}:?\d{2})$")
INTERVAL_MINUTES = (15, 30, 60)
CANONICAL = {
    "electrolyser": "kWh",
    "hydrogen": "kg",
    "generation": "kWh",
    "grid_intensity": "g CO2e/kWh",
    "price": "1/MWh",
}
EXAMPLE = "timestamp,electrolyser [kWh],generation.<source> [kWh],grid_intensity [g CO2e/kWh],price [EUR/MWh]"


@dataclass
class ElectricitySeries:
    """Validated intervals, in calculation units. Times are the interval starts."""

    path: str
    utc: np.ndarray  # datetime64[m], UTC start of each interval
    offset_minutes: np.ndarray  # int64, UTC offset as written (local calendar = utc + offset)
    interval_minutes: int
    load_kwh: np.ndarray | None  # electricity use, or None when the series gives hydrogen
    hydrogen_kg: np.ndarray | None
    generation_kwh: dict[str, np.ndarray] = field(default_factory=dict)  # contracted source -> kWh
    grid_g_co2e_per_kwh: np.ndarray | None = None
    price_per_mwh: np.ndarray | None = None
    price_unit: str = ""
    sha256: str = ""  # of the CSV file, for the record

    @property
    def intervals(self) -> int:
        return len(self.utc)

    @property
    def local(self) -> np.ndarray:
        """Local wall-clock start of each interval (datetime64[m]), as written in the file."""
        return self.utc + self.offset_minutes.astype("timedelta64[m]")

    def load(self, kwh_per_kg_h2: float) -> np.ndarray:
        """Electricity use per interval (kWh); hydrogen kg times the project's kWh/kg when the series gives hydrogen."""
        return self.load_kwh if self.load_kwh is not None else self.hydrogen_kg * kwh_per_kg_h2


def _parse_header(header: str, project, path: str) -> tuple[str, str, float, str]:
    """(quantity, source, multiplier to the canonical unit, unit as written) of one column."""
    match = _HEADER.match(header or "")
    if not match:
        raise InputError(
            path,
            f"row 1, column '{header}'",
            f"a column name with its unit in brackets, e.g. 'electrolyser [kWh]' ({EXAMPLE})",
        )
    name, unit = match.group("name"), match.group("unit").strip()
    quantity, _, source = name.partition(".")
    sources = project.electricity.sources
    if quantity == "generation":
        if source not in sources:
            raise InputError(
                path,
                f"row 1, column '{header}'",
                f"a source the project declares in [electricity.sources] ({', '.join(sources)}), got '{source}'",
            )
        if kind_of_source(sources[source].factor) == "grid":
            raise InputError(
                path,
                f"row 1, column '{header}'",
                f"a contracted source, not the grid source '{source}' (the grid supplies what generation "
                "does not match; give its intensity as 'grid_intensity [g CO2e/kWh]')",
            )
    elif quantity not in CANONICAL or source:
        raise InputError(
            path,
            f"row 1, column '{header}'",
            f"a known column ({EXAMPLE}; or 'hydrogen [kg]' instead of 'electrolyser')",
        )
    if quantity == "price":
        per = unit.split("/")
        if len(per) != 2 or not per[0].strip():
            raise InputError(
                path, f"row 1, column '{header}'", f"a price per energy, e.g. 'price [EUR/MWh]', got '{unit}'"
            )
        try:
            return quantity, source, conversion_factor(f"1/{per[1].strip()}", "1/MWh"), unit
        except UnitMismatch:
            raise InputError(
                path, f"row 1, column '{header}'", f"a price per energy unit (MWh, kWh), got '{unit}'"
            ) from None
    try:
        return quantity, source, conversion_factor(unit, CANONICAL[quantity]), unit
    except UnitMismatch:
        raise InputError(
            path, f"row 1, column '{header}'", f"a unit convertible to {CANONICAL[quantity]}, got '{unit}'"
        ) from None


# The largest value of a column that is not a typing error, in the canonical units (CANONICAL): 10 TWh
# or 1 Mt of hydrogen in one interval is beyond any plant; the most carbon-intensive generation emits
# about 1.2 kg CO2e/kWh (IPCC AR5 WGIII Annex III, coal, lignite), 10 kg/kWh is far above; a price of
# a million per MWh is far above any market's cap. Above these, sums over a year lose their meaning.
UPPER = {"electrolyser": 1e10, "hydrogen": 1e9, "generation": 1e10, "grid_intensity": 1e4, "price": 1e6}


def _numbers(
    values,
    path: str,
    header: str,
    *,
    first_row: int = 2,
    energy: bool = True,
    multiplier: float = 1.0,
    upper: float = float("inf"),
) -> np.ndarray:
    import pandas as pd

    numbers = pd.to_numeric(values, errors="coerce").to_numpy(dtype=float)
    bad = ~np.isfinite(numbers)
    if bad.any():
        at = int(np.flatnonzero(bad)[0])
        raise InputError(path, f"row {at + first_row}, column '{header}'", f"a number, got '{values.iloc[at]}'")
    if energy and (numbers < 0).any():
        at = int(np.flatnonzero(numbers < 0)[0])
        raise InputError(path, f"row {at + first_row}, column '{header}'", f"an amount >= 0, got {numbers[at]:g}")
    too_large = np.abs(numbers) * multiplier > upper
    if too_large.any():
        at = int(np.flatnonzero(too_large)[0])
        raise InputError(
            path,
            f"row {at + first_row}, column '{header}'",
            f"a value of at most {upper / multiplier:g} in magnitude (a physical range), got {numbers[at]:g}",
        )
    return numbers * multiplier


def _times(stamps, path: str) -> tuple[np.ndarray, np.ndarray]:
    """UTC interval starts (datetime64[m]) and written offsets (minutes) of the timestamp column."""
    import pandas as pd

    text = stamps.str.strip()
    offsets = text.str.extract(_STAMP)["offset"]
    missing = offsets.isna().to_numpy()
    if missing.any():
        at = int(np.flatnonzero(missing)[0])
        raise InputError(
            path,
            f"row {at + 2}, column 'timestamp'",
            f"an ISO 8601 timestamp with its UTC offset, e.g. 2026-01-01T00:00+01:00, got '{stamps.iloc[at]}' "
            "(local time without an offset is ambiguous at daylight-saving changes)",
        )
    utc = pd.to_datetime(text, format="ISO8601", utc=True, errors="coerce")
    bad = utc.isna().to_numpy()
    if bad.any():
        at = int(np.flatnonzero(bad)[0])
        raise InputError(path, f"row {at + 2}, column 'timestamp'", f"a valid date and time, got '{stamps.iloc[at]}'")
    sign = np.where(offsets.str[0] == "-", -1, 1)
    digits = offsets.str.replace(":", "", regex=False).str[1:]
    hours = pd.to_numeric(digits.str[:2], errors="coerce").fillna(0).to_numpy(dtype=np.int64)
    minutes = pd.to_numeric(digits.str[2:4], errors="coerce").fillna(0).to_numpy(dtype=np.int64)
    offset = np.where(offsets == "Z", 0, sign * (hours * 60 + minutes)).astype(np.int64)
    return utc.dt.tz_localize(None).to_numpy().astype("datetime64[m]"), offset


def _check_steps(utc: np.ndarray, offset: np.ndarray, stamps, path: str) -> int:
    """The interval length (minutes); refuses duplicated, missing or disordered intervals."""
    if len(utc) < 2:
        raise InputError(path, "rows", "at least two intervals")
    steps = np.diff(utc).astype(np.int64)
    interval = int(steps[0])
    if interval not in INTERVAL_MINUTES:
        raise InputError(
            path,
            "row 3, column 'timestamp'",
            f"intervals of 15, 30 or 60 minutes, got {interval} minutes between rows 2 and 3",
        )
    wrong = np.flatnonzero(steps != interval)
    if wrong.size:
        at = int(wrong[0])
        row = at + 3
        where = f"row {row}, column 'timestamp'"
        got = f"'{stamps.iloc[at + 1]}' after '{stamps.iloc[at]}'"
        if offset[at] != offset[at + 1] or (
            steps[at] == 0 and offset[at] == offset[at + 1] and (np.diff(offset) != 0).any()
        ):
            raise InputError(
                path,
                where,
                f"consecutive {interval}-minute intervals, got {got}: a daylight-saving change written "
                "as local time (write each time with the offset in force, e.g. +02:00 in summer)",
            )
        if steps[at] == 0:
            raise InputError(path, where, f"each interval once, got a duplicated interval {got}")
        if steps[at] < 0:
            raise InputError(path, where, f"intervals in time order, got {got}")
        missing = int(steps[at] // interval) - 1
        span = " (a year or more of data missing)" if steps[at] >= 365 * 24 * 60 else ""
        raise InputError(
            path, where, f"consecutive {interval}-minute intervals, got {got}: {missing} interval(s) missing{span}"
        )
    return interval


def read_series(path: str | Path, project) -> ElectricitySeries:
    """Read and validate an electricity time series CSV against a validated project."""
    path = Path(path)
    if not path.exists():
        raise InputError(
            str(path), "", "an existing time series CSV (electricity.time_series, relative to the project file)"
        )
    return parse_series(read_input_bytes(path, "time series CSV"), str(path), project)


def parse_series(raw: bytes, where: str, project) -> ElectricitySeries:
    """Validate the bytes of a time series CSV against a validated project (``where`` names it in errors)."""
    import pandas as pd

    try:
        frame = pd.read_csv(
            io.BytesIO(raw), dtype=str, keep_default_na=False, comment="#", skipinitialspace=True, encoding="utf-8-sig"
        )
    except (OSError, UnicodeDecodeError, pd.errors.ParserError, pd.errors.EmptyDataError) as error:
        raise InputError(
            where,
            "",
            f"a readable UTF-8 CSV of intervals ({str(error).splitlines()[0] if str(error) else type(error).__name__})",
        ) from None
    headers = [str(h).strip() for h in frame.columns]
    if not headers or headers[0] != "timestamp":
        raise InputError(where, "row 1, column 1", f"'timestamp' as the first column ({EXAMPLE})")
    if len(frame) == 0:
        raise InputError(where, "rows", "at least two intervals")
    columns = {h: _parse_header(h, project, where) for h in headers[1:]}
    kinds = [(q, s) for q, s, _, _ in columns.values()]
    if len(set(kinds)) != len(kinds):
        raise InputError(where, "row 1", "each column once (a quantity appears twice)")
    loads = [h for h, (q, *_) in columns.items() if q in ("electrolyser", "hydrogen")]
    if len(loads) != 1:
        raise InputError(where, "row 1", f"exactly one of 'electrolyser [kWh]' or 'hydrogen [kg]', got {len(loads)}")
    if not any(q == "generation" for q, _ in kinds):
        raise InputError(where, "row 1", "at least one 'generation.<source> [kWh]' column for a contracted source")
    has_grid_source = any(
        kind_of_source(s.factor) == "grid" or ("generation", name) not in kinds
        for name, s in project.electricity.sources.items()
    )
    if not has_grid_source and ("grid_intensity", "") not in kinds:
        raise InputError(
            where,
            "row 1",
            "a 'grid_intensity [g CO2e/kWh]' column, or a source in [electricity.sources] "
            "without a generation column (the grid) to supply unmatched electricity",
        )
    stamps = frame.iloc[:, 0].astype(str)
    utc, offset = _times(stamps, where)
    interval = _check_steps(utc, offset, stamps, where)
    series = ElectricitySeries(where, utc, offset, interval, None, None, sha256=hashlib.sha256(raw).hexdigest())
    for header, (quantity, source, multiplier, unit) in columns.items():
        values = _numbers(
            frame[frame.columns[headers.index(header)]],
            where,
            header,
            energy=quantity != "price",
            multiplier=multiplier,
            upper=UPPER[quantity],
        )
        if quantity == "electrolyser":
            series.load_kwh = values
        elif quantity == "hydrogen":
            series.hydrogen_kg = values
        elif quantity == "generation":
            series.generation_kwh[source] = values
        elif quantity == "grid_intensity":
            series.grid_g_co2e_per_kwh = values
        else:
            series.price_per_mwh, series.price_unit = values, unit
    used = series.load_kwh if series.load_kwh is not None else series.hydrogen_kg
    if not used.sum() > 0:
        raise InputError(
            where,
            f"column '{loads[0]}'",
            "some electricity use (or hydrogen) in at least one interval; the series has none",
        )
    return series


def project_series(project, project_file: str | Path) -> ElectricitySeries | None:
    """The project's electricity time series (``[electricity] time_series``, relative to the project file), or None."""
    name = project.electricity.time_series
    if not name:
        return None
    return read_series(Path(project_file).parent / name, project)
