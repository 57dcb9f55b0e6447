"""Factor sets: load, validate, layer and hash the published factors in ``factors/``.

A factor set is a folder ``factors/sets/NAME/`` holding ``set.toml`` (name, date, description,
optionally ``base`` = the set it updates) and one or more CSV files (``factors.csv``, and e.g.
``grid-electricity.csv``) with the columns of ``FACTOR_COLUMNS``. Every ``*.csv`` of the folder is
read, in sorted order; an id may appear in only one of them. Every row must name its source and
carries a ``grade`` (``model.grades``: primary text, verbatim secondary, secondary, not yet verified,
invented), which every output shows; a value not checked against its document is "not yet verified". A set with a
``base`` holds only
the rows it changes or adds; a partial override CSV (a user's own rows, each with a source)
can be layered on top of any set with the same rules.

The set's sha256 is taken over its resolved rows (sorted, canonical JSON), so it identifies the
content whatever the layout of the files that produced it.
"""

from __future__ import annotations

import bisect
import csv
import functools
import hashlib
import io
import json
import math
import os
import tomllib
from dataclasses import dataclass, field
from pathlib import Path

from pydantic import BaseModel, ConfigDict, Field, computed_field, model_serializer, model_validator

from ..errors import InputError, did_you_mean, match_id
from .grades import Grade, parse_grade
from .input_files import read_input_bytes
from .pedigree import parse_scores

UNCERTAINTY_COLUMNS = ("pedigree", "basic_gsd")  # optional: pedigree-matrix default uncertainty (model/pedigree.py)
REQUIRED_COLUMNS = ("id", "value", "unit", "source")
DEFAULT_SET = "default-2026"


class Factor(BaseModel):
    """One factor row: the one schema of a factor, read from a set's CSV files or a workbook,
    cited in results (``ScoreResult.factors_used``), stored in the run ledger and listed in the
    audit workbook. ``origin`` (the file the row was read from) is not part of its content: it is
    left out of the JSON, the ledger and the set's sha256. The uncertainty columns appear only
    when given."""

    model_config = ConfigDict(frozen=True, extra="forbid")

    id: str
    value: float
    unit: str
    source: str
    table: str = ""
    year: int | None = None
    region: str = ""
    note: str = ""
    grade: Grade = Grade.NOT_YET_VERIFIED  # how sure the value is: the text it was read in (model.grades)
    origin: str = Field("", exclude=True)  # the file the row was read from
    # five data-quality scores 1..5, for a default lognormal (model/pedigree.py)
    pedigree: tuple[int, ...] | None = None
    basic_gsd: float | None = None  # basic uncertainty (geometric standard deviation) with the pedigree scores

    @model_validator(mode="before")
    @classmethod
    def _grade_from_a_legacy_flag(cls, data):
        """A row written before grades existed (``from_memory`` true or false) gets its grade; a
        ``from_memory`` beside a grade (as the JSON and the ledger give it) must agree with it."""
        if isinstance(data, dict) and "from_memory" in data:
            data = dict(data)
            flag = data.pop("from_memory")
            grade = data.get("grade")
            data["grade"] = parse_grade(
                None if grade is None else str(grade),
                str(flag).lower() if flag is not None else "",
                str(data.get("id", "factor row")),
            )
        return data

    @computed_field
    @property
    def from_memory(self) -> bool:
        """Kept for files and programs written before grades: true exactly when the grade is "not yet verified"."""
        return self.grade is Grade.NOT_YET_VERIFIED

    @model_serializer(mode="wrap")
    def _without_empty_uncertainty(self, handler):
        data = handler(self)
        for key in UNCERTAINTY_COLUMNS:
            if data.get(key, 0) is None:
                del data[key]
        return data

    def citation(self) -> str:
        parts = [self.source]
        if self.table:
            parts.append(self.table)
        if self.year:
            parts.append(str(self.year))
        return ", ".join(parts) + f" [{self.grade.words}]"


CITED_FIELDS = tuple(name for name in Factor.model_fields if name not in ("origin",) + UNCERTAINTY_COLUMNS)
LEGACY_COLUMNS = ("from_memory",)  # read from files written before grades existed (model.grades.parse_grade)
FACTOR_COLUMNS = CITED_FIELDS  # the columns of a factor CSV (and UNCERTAINTY_COLUMNS, optional)


@dataclass
class FactorSet:
    name: str
    description: str = ""
    date: str = ""
    factors: dict[str, Factor] = field(default_factory=dict)
    layers: tuple[str, ...] = ()

    @functools.cached_property
    def sha256(self) -> str:
        rows = [_content(factor) for _, factor in sorted(self.factors.items())]
        payload = json.dumps(rows, sort_keys=True, separators=(",", ":"), ensure_ascii=False)
        return hashlib.sha256(payload.encode("utf-8")).hexdigest()

    def get(self, factor_id: str, where: str = "factor") -> Factor:
        try:
            return self.factors[factor_id]
        except KeyError:
            raise InputError(
                self.name,
                where,
                f"a factor id known to set '{self.name}', got '{factor_id}'{did_you_mean(factor_id, self.factors)}",
            ) from None

    @functools.cached_property
    def _sorted_ids(self) -> list[str]:
        return sorted(self.factors)

    @functools.cached_property
    def _ids_by_prefix(self) -> dict[str, list[str]]:
        return {}

    def ids_with_prefix(self, prefix: str) -> list[str]:
        """The ids that start with ``prefix``, in order (found once per set and prefix)."""
        if prefix not in self._ids_by_prefix:
            self._ids_by_prefix[prefix] = self._ids_starting(prefix)
        return list(self._ids_by_prefix[prefix])

    def _ids_starting(self, prefix: str) -> list[str]:
        ids = self._sorted_ids
        start = bisect.bisect_left(ids, prefix)
        end = start
        while end < len(ids) and ids[end].startswith(prefix):
            end += 1
        return ids[start:end]


def factors_root() -> Path:
    """The factor library: $CARBONLEDGER_FACTORS, else ``factors/`` of the source tree the package
    runs from, else the copy shipped in the wheel (``carbonledger/factor_library``, which
    pyproject.toml maps from the same ``factors/`` folder)."""
    env = os.environ.get("CARBONLEDGER_FACTORS")
    if env:
        return Path(env)
    package = Path(__file__).resolve().parents[1]
    source_tree = package.parent / "factors"
    return source_tree if (source_tree / "schemes").is_dir() else package / "factor_library"


def available_sets() -> list[str]:
    root = factors_root() / "sets"
    if not root.is_dir():
        return []
    return sorted(path.name for path in root.iterdir() if (path / "set.toml").is_file())


_GASES = ("CO2e", "CO2", "CH4", "N2O")
_ENERGY = ("J", "kJ", "MJ", "GJ", "TJ", "PJ", "Wh", "kWh", "MWh", "GWh")
_MJ = {
    "J": 1e-6,
    "kJ": 1e-3,
    "MJ": 1.0,
    "GJ": 1e3,
    "TJ": 1e6,
    "PJ": 1e9,
    "Wh": 3.6e-3,
    "kWh": 3.6,
    "MWh": 3.6e3,
    "GWh": 3.6e6,
}
_KG = {"mg": 1e-6, "g": 1e-3, "kg": 1.0, "t": 1e3, "Mg": 1e3, "Gg": 1e6}
# Upper ends of the physical ranges, in canonical units. Facts of the trade: the largest GWP100 of
# IPCC AR6 WG1 Table 7.SM.7 is about 25,000 (SF6); burning pure carbon releases 0.11 kg CO2/MJ
# and no fuel chain emits 10 kg CO2e/MJ; hydrogen has the highest heating value per mass of any fuel,
# 141.9 MJ/kg (HHV). Larger values are typing errors (a 1e308 overflows every sum it enters).
MAX_GWP = 1e5  # kg CO2e/kg
MAX_EMISSION_KG_PER_MJ = 10.0
MAX_EMISSION_KG_PER_KG = 1e4
MAX_HEATING_VALUE_MJ_PER_KG = 200.0
MAX_OTHER = 1e9  # any other factor, in its own unit (per MW, per unit, per tonne-km...)


def physical_range(factor_id: str, unit: str) -> tuple[float | None, bool, float | None, str]:
    """The physically possible range of a factor, decided by its id and unit (one rule for every
    factor, whatever file it comes from): (low, low inclusive, high, what the value is).

    - a global warming potential (``gwp.*``, ``gwp_indirect.*``: kg CO2e per kg of a gas): > 0, <= ``MAX_GWP``;
    - a mass of methane per mass of gas or fuel (``kg CH4/kg``, ``kg CH4/kg fuel``): 0 to 1;
    - an emission factor (a greenhouse-gas mass per unit of activity: g CO2e/kWh, kg CO2/TJ,
      t N2O/t fuel...): >= 0 (these factors describe emissions; removals are not modelled), at most
      ``MAX_EMISSION_KG_PER_MJ`` per MJ, ``MAX_EMISSION_KG_PER_KG`` per kg, ``MAX_OTHER`` per anything else;
    - a heating value (energy per mass or volume: MJ/kg, TJ/Gg, MJ/m3): > 0, at most
      ``MAX_HEATING_VALUE_MJ_PER_KG`` per kg (``MAX_OTHER`` MJ per other unit).

    Other units: any finite number of magnitude at most ``MAX_OTHER`` (``low`` None: unbounded below).
    """
    numerator, _, denominator = (part.strip() for part in unit.partition("/"))
    top = numerator.split()
    bottom = denominator.split()
    per = bottom[0] if bottom else ""
    if factor_id.split(".")[0] in ("gwp", "gwp_indirect"):
        return 0.0, False, MAX_GWP, "a global warming potential"
    if top[-1:] == ["CH4"] and len(bottom) >= 1 and bottom[-1] in ("kg", "t", "fuel") and top[0] == bottom[0]:
        return 0.0, True, 1.0, "a mass fraction of methane"
    if top[-1:] and top[-1] in _GASES:
        mass = _KG.get(top[0], 1.0) if len(top) == 2 else 1.0
        if per in _MJ:
            return 0.0, True, MAX_EMISSION_KG_PER_MJ * _MJ[per] / mass, "an emission factor"
        if per in _KG:
            return 0.0, True, MAX_EMISSION_KG_PER_KG * _KG[per] / mass, "an emission factor"
        return 0.0, True, MAX_OTHER, "an emission factor"
    if len(top) == 1 and top[0] in _ENERGY and bottom:
        if per in _KG:
            return 0.0, False, MAX_HEATING_VALUE_MJ_PER_KG * _KG[per] / _MJ[top[0]], "a heating value"
        return 0.0, False, MAX_OTHER / _MJ[top[0]], "a heating value"
    return -MAX_OTHER, True, MAX_OTHER, "a number"


def check_factor_value(factor_id: str, value: float, unit: str, where: str) -> None:
    """Refuse a factor value that is not finite or outside ``physical_range``: one InputError naming the id."""
    if not math.isfinite(value):
        raise InputError(where, "value", f"a finite number for '{factor_id}', got {value!r}")
    low, inclusive, high, what = physical_range(factor_id, unit)
    below = low is not None and (value < low if inclusive else value <= low)
    above = high is not None and value > high
    if below or above:
        bounds = f"{'>=' if inclusive else '>'} {low:g}" + (f" and <= {high:.6g}" if high is not None else "")
        raise InputError(where, "value", f"a value {bounds} for '{factor_id}' ({what}, {unit}), got {value:g}")


def read_csv_text(path: str | Path, what: str) -> str:
    """The text of a CSV file saved as UTF-8 (a byte-order mark, as spreadsheet programs write
    it, is dropped); a file in another encoding is one InputError naming the file."""
    raw = read_input_bytes(path, what)
    try:
        return raw.decode("utf-8-sig")
    except UnicodeDecodeError as error:
        raise InputError(
            path,
            "",
            f"a UTF-8 CSV (save as CSV UTF-8); byte {error.start} is not UTF-8 "
            "(the file looks like Windows-1252 or another encoding)",
        ) from None


def read_factor_rows(path: Path) -> list[Factor]:
    """Read and validate one factor CSV; every problem names the file, line and column."""
    text = read_csv_text(path, "factor CSV")
    lines = io.StringIO(text, newline="")
    reader = csv.DictReader(row for row in lines if not row.lstrip().startswith("#"))
    try:
        header = reader.fieldnames or []
        records = list(reader)
    except csv.Error as error:
        raise InputError(path, "", f"a well-formed CSV ({error})") from None
    missing = [column for column in REQUIRED_COLUMNS if column not in header]
    if missing:
        raise InputError(path, "header", f"columns {', '.join(FACTOR_COLUMNS)}; missing {', '.join(missing)}")
    unknown = [column for column in header if column not in FACTOR_COLUMNS + UNCERTAINTY_COLUMNS + LEGACY_COLUMNS]
    if unknown:
        raise InputError(
            path,
            "header",
            f"only the columns {', '.join(FACTOR_COLUMNS + UNCERTAINTY_COLUMNS)}; unknown {', '.join(unknown)}",
        )
    rows: list[Factor] = []
    seen: set[str] = set()
    for number, row in enumerate(records, start=2):
        where = f"{path}:{number}"
        factor_id = (row.get("id") or "").strip()
        if not factor_id:
            raise InputError(where, "id", "a factor id")
        if factor_id in seen:
            raise InputError(where, "id", f"a unique id, '{factor_id}' appears twice")
        seen.add(factor_id)
        try:
            value = float(row.get("value") or "")
        except ValueError:
            raise InputError(where, "value", f"a number for '{factor_id}', got '{row.get('value')}'") from None
        unit = (row.get("unit") or "").strip()
        if not unit:
            raise InputError(where, "unit", f"a unit for '{factor_id}'")
        check_factor_value(factor_id, value, unit, where)
        source = (row.get("source") or "").strip()
        if not source:
            raise InputError(where, "source", f"a source document for '{factor_id}' (every factor must cite one)")
        year_text = (row.get("year") or "").strip()
        try:
            year = int(year_text) if year_text else None
        except ValueError:
            raise InputError(where, "year", f"a year for '{factor_id}', got '{year_text}'") from None
        rows.append(
            Factor(
                id=factor_id,
                value=value,
                unit=unit,
                source=source,
                table=(row.get("table") or "").strip(),
                year=year,
                region=(row.get("region") or "").strip(),
                note=(row.get("note") or "").strip(),
                grade=parse_grade(row.get("grade"), row.get("from_memory"), where),
                origin=str(path),
                **_uncertainty_columns(row, factor_id, where),
            )
        )
    return rows


def _uncertainty_columns(row: dict, factor_id: str, where: str) -> dict:
    """The optional pedigree scores and basic uncertainty of a row (model/pedigree.py)."""
    scores_text = (row.get("pedigree") or "").strip()
    gsd_text = (row.get("basic_gsd") or "").strip()
    if not scores_text:
        if gsd_text:
            raise InputError(
                where,
                "basic_gsd",
                f"pedigree scores beside a basic uncertainty for '{factor_id}' (or an empty basic_gsd)",
            )
        return {}
    scores = parse_scores(scores_text, where)
    basic_gsd = None
    if gsd_text:
        try:
            basic_gsd = float(gsd_text)
        except ValueError:
            basic_gsd = float("nan")
        if not (math.isfinite(basic_gsd) and basic_gsd >= 1):
            raise InputError(
                where, "basic_gsd", f"a geometric standard deviation >= 1 for '{factor_id}', got '{gsd_text}'"
            )
    return {"pedigree": scores, "basic_gsd": basic_gsd}


def read_set_rows(folder: Path) -> list[Factor]:
    """The rows of every ``*.csv`` in a set folder, files in sorted order; an id in two files is refused."""
    paths = sorted(folder.glob("*.csv"))
    if not paths:
        raise InputError(folder, "", "a factor set folder with at least one factor CSV file")
    rows: list[Factor] = []
    first_file: dict[str, Path] = {}
    for path in paths:
        for factor in read_factor_rows(path):
            if factor.id in first_file:
                raise InputError(
                    path, "id", f"a unique id in the set, '{factor.id}' is also in {first_file[factor.id].name}"
                )
            first_file[factor.id] = path
            rows.append(factor)
    return rows


def _read_set_folder(folder: Path, chain: tuple[str, ...] = ()) -> FactorSet:
    meta_path = folder / "set.toml"
    try:
        meta = tomllib.loads(meta_path.read_text(encoding="utf-8"))
    except OSError:
        raise InputError(folder, "set.toml", "a factor set folder with set.toml and factor CSV files") from None
    except tomllib.TOMLDecodeError as error:
        raise InputError(meta_path, "", f"valid TOML ({error})") from None
    name = str(meta.get("name") or folder.name)
    if name in chain:
        raise InputError(meta_path, "base", f"a base set that does not loop back to '{name}'")
    base_name = meta.get("base")
    if base_name:
        base = load_factor_set(str(base_name), _chain=chain + (name,))
        factors = dict(base.factors)
        layers = base.layers
    else:
        factors, layers = {}, ()
    for factor in read_set_rows(folder):
        factors[factor.id] = factor
    for removed in meta.get("removed", []):
        factors.pop(removed, None)
    return FactorSet(
        name=name,
        description=str(meta.get("description", "")),
        date=str(meta.get("date", "")),
        factors=factors,
        layers=layers + (str(folder),),
    )


def apply_override(base: FactorSet, csv_path: str | Path) -> FactorSet:
    """Layer a partial CSV of changed or added rows (each with its source) over a set."""
    path = Path(csv_path)
    factors = dict(base.factors)
    for factor in read_factor_rows(path):
        factors[factor.id] = factor
    return FactorSet(
        name=f"{base.name}+{path.stem}",
        description=f"{base.description} with overrides from {path.name}".strip(),
        date=base.date,
        factors=factors,
        layers=base.layers + (str(path),),
    )


def load_factor_set(name_or_path: str | Path = DEFAULT_SET, overrides=(), _chain: tuple[str, ...] = ()) -> FactorSet:
    """Load a factor set by name (a folder under factors/sets) or by path.

    ``name_or_path`` may be a set folder, a set name, or a CSV file (read as an override over
    the default set). ``overrides`` are CSV files layered on top in order.
    """
    text = str(name_or_path)
    path = Path(text)
    if path.suffix.lower() == ".csv" and path.is_file():
        factor_set = apply_override(_cached_set(str((factors_root() / "sets" / DEFAULT_SET).resolve()), _chain), path)
    elif path.is_dir():
        factor_set = _cached_set(str(path.resolve()), _chain)
    elif match_id(text, available_sets()) is not None:
        name = match_id(text, available_sets())  # set names are case-insensitive
        factor_set = _cached_set(str((factors_root() / "sets" / name).resolve()), _chain)
    else:
        known = ", ".join(available_sets()) or "none found"
        raise InputError(
            text,
            "--factors",
            f"a factor set name ({known}), a set folder or an override CSV{did_you_mean(text, available_sets())}",
        )
    for override in overrides:
        factor_set = apply_override(factor_set, override)
    return factor_set


_SET_CACHE: dict[tuple[str, float], FactorSet] = {}


def _cached_set(folder: str, chain: tuple[str, ...]) -> FactorSet:
    """Parse a set folder once per process while its files are unchanged."""
    stamp = max((p.stat().st_mtime for p in Path(folder).glob("*") if p.is_file()), default=0.0)
    key = (folder, stamp)
    if key not in _SET_CACHE:
        _SET_CACHE[key] = _read_set_folder(Path(folder), chain)
    return _SET_CACHE[key]


@dataclass(frozen=True)
class FactorChange:
    """One row that differs between two sets: ``kind`` is changed, added or removed."""

    id: str
    kind: str
    old: Factor | None
    new: Factor | None


def factor_row(factor: Factor) -> dict:
    """A row as plain values, as results and the ledger cite it (not the file it came from); the
    uncertainty columns only when given."""
    return factor.model_dump(mode="json")


def _content(factor: Factor) -> dict:
    """What a row states (its fields without the derived ``from_memory``): what the set's sha256
    covers and what ``diff_sets`` compares. The uncertainty columns only when given, so a set
    without them keeps the hash it had before they existed."""
    return factor.model_dump(mode="json", exclude={"from_memory"})


def diff_sets(old: FactorSet, new: FactorSet) -> list[FactorChange]:
    """Every factor changed (any field but the file it came from), added or removed, by id."""
    changes = []
    for factor_id in sorted(set(old.factors) | set(new.factors)):
        before, after = old.factors.get(factor_id), new.factors.get(factor_id)
        if before is None:
            changes.append(FactorChange(factor_id, "added", None, after))
        elif after is None:
            changes.append(FactorChange(factor_id, "removed", before, None))
        elif _content(before) != _content(after):
            changes.append(FactorChange(factor_id, "changed", before, after))
    return changes


def set_listing() -> list[dict]:
    """Name, date, sha256, description and base of every set under factors/sets."""
    rows = []
    for name in available_sets():
        meta_path = factors_root() / "sets" / name / "set.toml"
        try:
            meta = tomllib.loads(meta_path.read_text(encoding="utf-8"))
        except tomllib.TOMLDecodeError as error:
            raise InputError(meta_path, "", f"valid TOML ({error})") from None
        loaded = load_factor_set(name)
        rows.append(
            {
                "name": loaded.name,
                "date": loaded.date,
                "sha256": loaded.sha256,
                "description": loaded.description,
                "base": str(meta.get("base", "")),
                "factors": len(loaded.factors),
            }
        )
    return rows
