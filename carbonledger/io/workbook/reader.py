"""Read an audit workbook back: its inputs as a validated project, its factors as a factor set.

A practitioner edits inputs (or factors) in the spreadsheet; ``score --from-workbook`` (and
``workbook --from-workbook``) read them back here, so edited values flow both ways and the
engine's score equals the workbook's own recalculated figure. A workbook whose structure was
broken (a deleted sheet, text in a number cell, a moved header) is refused with one line that
names the sheet and the cell.

Entry points for the library and the command line:

- ``load_project_from_workbook(path, overrides)`` -> (Project, sha256 of the file, settings)
- ``factor_set_from_workbook(path, base)`` -> the base set with the workbook's edited rows layered on
- ``series_from_workbook(path, project)`` -> the electricity time series of its Intervals sheet (or None)
- ``score_workbook(path, ...)`` -> ScoreResult, with the settings recorded on the cover as defaults
"""

from __future__ import annotations

import hashlib
import zipfile
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from ...analyses.electricity_series import ElectricitySeries, parse_series
from ...errors import InputError
from ...model.factors import CITED_FIELDS, DEFAULT_SET, Factor, FactorSet, check_factor_value, load_factor_set
from ...model.grades import Grade, parse_grade
from ...model.input_files import check_input_file
from ...model.project import apply_overrides, parameter_table, parse_override
from ...model.reference import molar_mass_g_per_mol
from ...routes.project import validate_project
from .intervals_sheet import INTERVAL_HEADER_ROW, SERIES_HEADERS, generation_header
from .layout import (
    COVER,
    COVER_LABELS,
    FACTOR_COLUMNS,
    FACTOR_HEADER_ROW,
    FACTORS,
    INPUT_COLUMNS,
    INPUT_HEADER_ROW,
    INPUTS,
    INTERVALS,
    LEGACY_GRADE_TITLE,
    is_number,
    text_from_cell,
)

# An audit workbook of a shipped demo project with twelve metered months is about 70 kB
# (0.5 MB unpacked), measured 2026. The limits refuse a file that would take minutes and gigabytes of
# memory to open (a small zip can unpack to a huge sheet) before openpyxl reads it.
MAX_WORKBOOK_BYTES = 20 * 1024 * 1024
MAX_UNPACKED_BYTES = 100 * 1024 * 1024


@dataclass
class WorkbookSettings:
    gwp: str
    schemes: list[str]
    factors_option: str
    factor_set: str
    evidence: dict[str, str] = field(default_factory=dict)  # Inputs sheet: parameter -> evidence text


def check_size(path: Path) -> None:
    """Refuse, before it is opened, a workbook larger than MAX_WORKBOOK_BYTES or whose parts
    unpack to more than MAX_UNPACKED_BYTES (as their zip headers state them; zipfile reads no
    more than the stated size of a part)."""
    try:
        size = path.stat().st_size
    except OSError:
        return  # not there: openpyxl's error names it
    if size > MAX_WORKBOOK_BYTES:
        raise InputError(
            path, "", f"an audit workbook of at most {MAX_WORKBOOK_BYTES // 2**20} MB, got {size / 2**20:.1f} MB"
        )
    try:
        with zipfile.ZipFile(path) as archive:
            unpacked = sum(member.file_size for member in archive.infolist())
    except (zipfile.BadZipFile, OSError):
        return  # not a zip: openpyxl's error names it
    if unpacked > MAX_UNPACKED_BYTES:
        raise InputError(
            path,
            "",
            f"an audit workbook that unpacks to at most {MAX_UNPACKED_BYTES // 2**20} "
            f"MB, got {unpacked / 2**20:.0f} MB",
        )


def _open(path: Path, data_only: bool = False, read_only: bool = False):
    from openpyxl import load_workbook

    if Path(path).exists():
        check_input_file(path, "audit workbook")
    check_size(path)
    try:
        return load_workbook(path, data_only=data_only, read_only=read_only)
    except FileNotFoundError:
        raise InputError(path, "", "an existing audit workbook (.xlsx written by `carbonledger workbook`)") from None
    except Exception as error:  # openpyxl raises zipfile, KeyError, InvalidFileException...
        raise InputError(
            path, "", f"an .xlsx audit workbook written by `carbonledger workbook` ({type(error).__name__})"
        ) from None


def _sheet(workbook, name: str, path: Path):
    if name not in workbook.sheetnames:
        raise InputError(path, f"sheet {name}", f"the sheet '{name}' of an audit workbook (it was deleted or renamed)")
    return workbook[name]


def _check_header(ws, row: int, expected: tuple[str, ...], path: Path) -> None:
    from openpyxl.utils import get_column_letter

    for column, title in enumerate(expected[:3], start=1):
        found = ws.cell(row=row, column=column).value
        if (found or "") != title:
            cell = f"{get_column_letter(column)}{row}"
            raise InputError(
                path,
                f"sheet {ws.title}, cell {cell}",
                f"the column header '{title}' (rows were moved or deleted), got {found!r}",
            )


class _CachedValues:
    """Values a spreadsheet program saved for formula cells, loaded only when needed."""

    def __init__(self, path: Path):
        self.path = path
        self._workbook = None

    def get(self, sheet: str, cell: str):
        if self._workbook is None:
            self._workbook = _open(self.path, data_only=True)
        return self._workbook[sheet][cell].value


def _cell_value(ws, cell: str, cached: _CachedValues, path: Path, name: str):
    """A cell's value; for a formula typed into an input cell, the value a spreadsheet saved."""
    value = ws[cell].value
    if isinstance(value, str) and ws[cell].data_type == "f":
        formula, value = value, cached.get(ws.title, cell)
        if value is None:
            raise InputError(
                path,
                f"sheet {ws.title}, cell {cell} ({name})",
                f"a number; the cell holds the formula {formula!r} with no saved value "
                "(save the workbook in a spreadsheet program, or type the number)",
            )
    return text_from_cell(value)


def read_settings(workbook, path: Path) -> WorkbookSettings:
    ws = _sheet(workbook, COVER, path)
    found: dict[str, Any] = {}
    labels = {text: key for key, text in COVER_LABELS.items()}
    for row in range(1, ws.max_row + 1):
        label = ws.cell(row=row, column=1).value
        if label in labels:
            found[labels[label]] = text_from_cell(ws.cell(row=row, column=2).value)
    for key in ("gwp", "factors_option"):
        if not found.get(key):
            raise InputError(
                path, f"sheet {COVER}", f"the row '{COVER_LABELS[key]}' written by `carbonledger workbook`"
            )
    schemes = [text.strip() for text in str(found.get("schemes") or "").split(",") if text.strip()]
    return WorkbookSettings(
        str(found["gwp"]), schemes, str(found["factors_option"]), str(found.get("factor_set") or "")
    )


def _named_rows(ws, header_row: int):
    """(row number, name) of every row below the header whose first cell holds a name."""
    for row in range(header_row + 1, ws.max_row + 1):
        name = ws.cell(row=row, column=1).value
        if name is not None and str(name).strip():
            yield row, str(name).strip()


def read_input_rows(workbook, path: Path) -> list[tuple[str, Any, str, str]]:
    """(parameter path, value, cell, evidence text) for every row of the Inputs sheet."""
    ws = _sheet(workbook, INPUTS, path)
    _check_header(ws, INPUT_HEADER_ROW, INPUT_COLUMNS, path)
    cached = _CachedValues(path)
    rows = []
    for row, name in _named_rows(ws, INPUT_HEADER_ROW):
        cell = f"B{row}"
        evidence = ws.cell(row=row, column=len(INPUT_COLUMNS)).value
        rows.append((name, _cell_value(ws, cell, cached, path, name), cell, "" if evidence is None else str(evidence)))
    if not rows:
        raise InputError(path, f"sheet {INPUTS}", "parameter rows below the header (none found)")
    return rows


def load_project_from_workbook(path: str | Path, overrides: list[str] | None = None):
    """The project written in a workbook's Inputs sheet (after ``--set`` overrides), validated.

    Returns (Project, sha256 of the workbook file, WorkbookSettings). Errors name the sheet,
    the cell and the parameter.
    """
    path = Path(path)
    workbook = _open(path)
    settings = read_settings(workbook, path)
    rows = read_input_rows(workbook, path)
    data: dict = {}
    cells: dict[str, str] = {}
    emptied: set[str] = set()
    for name, value, cell, evidence in rows:
        cells[name] = cell
        if evidence:
            settings.evidence[name] = evidence
        if value is None or value == "":
            emptied.add(name)  # allowed only where the parameter has no value (checked below)
            continue
        data = apply_overrides(data, [(name, value)], f"{path}: sheet {INPUTS}, cell {cell}")
    parsed = [parse_override(text) for text in overrides or []]
    data = apply_overrides(data, parsed, str(path))
    try:
        project = validate_project(data, str(path))
    except InputError as error:
        where = cells.get(error.field)
        field = f"sheet {INPUTS}, cell {where} ({error.field})" if where else f"sheet {INPUTS} ({error.field})"
        raise InputError(path, field, error.expected) from None
    overridden = {name for name, _ in parsed}
    for name, value, _, _ in parameter_table(project):
        if value is None or value == "" or name in overridden:
            continue  # an optional parameter without a value: an empty cell or no row is right
        if name in emptied:
            raise InputError(
                path,
                f"sheet {INPUTS}, cell {cells[name]} ({name})",
                f"a value (the cell is empty; the default {value!r} is not taken silently: type it to use it)",
            )
        if name not in cells:
            raise InputError(
                path,
                f"sheet {INPUTS} ({name})",
                f"a row for this parameter (it was deleted; the default {value!r} is "
                "not taken silently: write a new workbook from the project file)",
            )
    return project, hashlib.sha256(path.read_bytes()).hexdigest(), settings


def _column_letter(column: int) -> str:
    from openpyxl.utils import get_column_letter

    return get_column_letter(column)


def _edited_grade(record: dict, known, where: str, legacy: bool) -> Grade:
    """The grade of a row whose value or unit was edited in the workbook: the grade typed in its
    cell when it differs from the set's (the editor regraded it), else "not yet verified" (the
    set's grade belongs to the set's value). ``legacy``: a workbook written before grades, whose
    column holds yes/no ("from memory")."""
    cell = str(record["grade"] or "")
    grade = parse_grade(None, cell, where) if legacy else parse_grade(cell, None, where)
    if known is not None and grade is known.grade:
        return Grade.NOT_YET_VERIFIED
    return grade


def read_factor_rows(workbook, path: Path) -> list[tuple[dict, str]]:
    ws = _sheet(workbook, FACTORS, path)
    _check_header(ws, FACTOR_HEADER_ROW, FACTOR_COLUMNS, path)
    cached = _CachedValues(path)
    rows = []
    for row, factor_id in _named_rows(ws, FACTOR_HEADER_ROW):
        value = _cell_value(ws, f"B{row}", cached, path, factor_id)
        if not is_number(value):
            raise InputError(path, f"sheet {FACTORS}, cell B{row} ({factor_id})", f"a number, got {value!r}")
        record = {
            name: text_from_cell(ws.cell(row=row, column=column).value)
            for column, name in enumerate(CITED_FIELDS, start=1)
        }
        record["id"], record["value"] = factor_id, float(value)
        rows.append((record, f"B{row}"))
    return rows


def factor_set_from_workbook(path: str | Path, base):
    """``base`` with every factor row whose value or unit was edited in the workbook layered on.

    Molar masses (``reference.*``) come from the chemicals library; an edited one is refused
    rather than silently ignored.
    """
    path = Path(path)
    workbook = _open(path)
    grade_column = CITED_FIELDS.index("grade") + 1
    legacy = (
        _sheet(workbook, FACTORS, path).cell(row=FACTOR_HEADER_ROW, column=grade_column).value == LEGACY_GRADE_TITLE
    )
    changed: dict[str, Factor] = {}
    for record, cell in read_factor_rows(workbook, path):
        factor_id = record["id"]
        if factor_id.startswith("reference.molar_mass."):
            formula = factor_id.rsplit(".", 1)[1].upper()
            library = molar_mass_g_per_mol(formula)
            if abs(record["value"] - library) > 1e-9 * library:
                raise InputError(
                    path,
                    f"sheet {FACTORS}, cell {cell} ({factor_id})",
                    f"the reference-library value {library!r} (molar masses are not read back from the workbook)",
                )
            continue
        known = base.factors.get(factor_id)
        unit = str(record["unit"] or "").strip()
        if known is not None and known.value == record["value"] and known.unit == unit:
            continue
        check_factor_value(
            factor_id, record["value"], unit or (known.unit if known else ""), f"{path}: sheet {FACTORS}, cell {cell}"
        )
        year = record["year"]
        changed[factor_id] = Factor(
            id=factor_id,
            value=record["value"],
            unit=unit or (known.unit if known else ""),
            source=str(record["source"] or (known.source if known else "")).strip() or f"edited in {path.name}",
            table=str(record["table"] or ""),
            year=int(year) if is_number(year) else None,
            region=str(record["region"] or ""),
            note=(
                str(record["note"] or "") + f" [value edited in workbook {path.name}, sheet {FACTORS}, cell {cell}]"
            ).strip(),
            grade=_edited_grade(
                record, known, f"{path}: sheet {FACTORS}, cell {_column_letter(grade_column)}{cell[1:]}", legacy
            ),
            origin=f"{path}: sheet {FACTORS}",
        )
    if not changed:
        return base
    factors = dict(base.factors)
    factors.update(changed)
    return FactorSet(
        name=f"{base.name}+edits from {path.name}",
        description=f"{base.description} with factor values edited in {path.name}".strip(),
        date=base.date,
        factors=factors,
        layers=base.layers + (f"{path}: sheet {FACTORS}",),
    )


def base_factor_set(settings: WorkbookSettings, factors: str | None):
    """The factor set the workbook was written with (or ``factors`` when given).

    When the recorded set cannot be found here (an override CSV left on another machine), the
    default set is the base: every factor the workbook uses is on its Factors sheet and is
    layered over it by ``factor_set_from_workbook``.
    """
    if factors:
        return load_factor_set(factors)
    try:
        return load_factor_set(settings.factors_option)
    except InputError:
        return load_factor_set(DEFAULT_SET)


def _series_columns(headers: list, project, where: str) -> dict[int, str]:
    """Column number on the Intervals sheet -> the CSV column it is read back as (the series' own
    columns: time, use or hydrogen, each source's generation, the grid intensity; formulas are left)."""
    wanted = {label: csv_header for label, csv_header in SERIES_HEADERS.values()}
    wanted |= {generation_header(name): f"generation.{name} [kWh]" for name in project.electricity.sources}
    if SERIES_HEADERS["hydrogen"][0] in headers:
        del wanted[SERIES_HEADERS["load"][0]]  # the use is then a formula: hydrogen x electricity per kg H2
    found = {number: wanted[str(text)] for number, text in enumerate(headers) if str(text) in wanted}
    if SERIES_HEADERS["timestamp"][1] not in found.values():
        raise InputError(
            where,
            f"row {INTERVAL_HEADER_ROW}",
            f"the header '{SERIES_HEADERS['timestamp'][0]}' of an audit workbook's Intervals sheet",
        )
    return found


def series_from_workbook(path: str | Path, project) -> ElectricitySeries | None:
    """The electricity time series written on a workbook's Intervals sheet (None without the sheet),
    validated as a time series CSV is, so that a workbook written from it keeps its Intervals sheet."""
    path = Path(path)
    workbook = _open(path, read_only=True)  # streamed: a year of 15-minute rows reads in seconds
    try:
        if INTERVALS not in workbook.sheetnames:
            return None
        where = f"{path} (sheet {INTERVALS})"
        rows = workbook[INTERVALS].iter_rows(min_row=INTERVAL_HEADER_ROW, values_only=True)
        columns = _series_columns(list(next(rows, ())), project, where)
        lines = [",".join(columns.values())]
        for row in rows:
            if row and row[0] not in (None, ""):
                lines.append(",".join(_csv_cell(row[number] if number < len(row) else None) for number in columns))
    finally:
        workbook.close()
    series = parse_series("\n".join(lines).encode("utf-8"), where, project)
    series.path = where
    return series


def _csv_cell(value) -> str:
    """A cell as CSV text that reads back to the same number (repr of a float round-trips exactly)."""
    return "" if value is None else repr(value) if isinstance(value, float) else str(value)
