"""Text, CSV and JSON of portfolio outputs: recalc rows, factor-set diffs, lifetime, history.

They read result objects and never recompute.
"""

from __future__ import annotations

from dataclasses import asdict

from ..about import CAUTION
from ..core.results import strict_json
from ..model.statuses import Status
from .csv_text import csv_text
from .labels import status_name
from .tables import display_number, plain_table

FROM_MEMORY_RULEBOOK = "* rulebook or threshold not yet verified against the source document"


def _flagged_factors(ids: list[str]) -> str:
    return f"Factors used that are not yet verified against the source document: {', '.join(ids) or 'none'}"


def _shortened(text: str, limit: int) -> str:
    """``text`` cut to ``limit`` characters, keeping its bracketed end (the source grade) whole."""
    if len(text) <= limit:
        return text
    body, bracket, grade = text.rpartition(" [")
    tail = bracket + grade if bracket else ""
    return (body if bracket else text)[: max(0, limit - len(tail) - 3)] + "..." + tail


# --- recalc ------------------------------------------------------------------------------------

RECALC_COLUMNS = (
    "status", "project_file", "project", "scheme", "old_value", "new_value", "change", "unit", "limit",
    "old_passes", "new_passes", "rescored", "old_status", "new_status", "rulebook_from_memory", "factors_from_memory",
)  # fmt: skip


def recalc_json(recalc) -> str:
    return strict_json(
        {
            "caution": CAUTION,
            "from_memory": recalc.from_memory,
            "from": {"name": recalc.old_set, "sha256": recalc.old_sha256},
            "to": {"name": recalc.new_set, "sha256": recalc.new_sha256},
            "changed_factors": recalc.changed_factors,
            "projects": len(recalc.old_scores),
            "rescored": recalc.rescored,
            "newly_failing": len(recalc.newly_failing),
            "rows": [{key: getattr(row, key) for key in RECALC_COLUMNS} for row in recalc.rows],
        },
        "recalc",
    )


def recalc_csv(recalc) -> str:
    rows = [
        tuple(
            "; ".join(value) if isinstance(value, list) else value
            for value in (getattr(row, key) for key in RECALC_COLUMNS)
        )
        for row in recalc.rows
    ]
    return csv_text(RECALC_COLUMNS, rows, caution=CAUTION)


NEWLY_FAILING_NAMED = 20  # the closing line names the pairs that now fail up to this many (the table lists them all)
UNCHANGED_ROWS_SHOWN = 200  # beyond this many unchanged rows the table counts them by scheme (csv and json list all)


def recalc_table(recalc) -> str:
    """The recalc as text: one table per change of status, "now fails" first. The rows whose status moved are
    always listed; the unchanged ("still ...") ones too when they are at most ``UNCHANGED_ROWS_SHOWN``, else
    counted by status and scheme (a portfolio of thousands: every row is in ``--format csv`` or ``json``)."""
    rescored = recalc.rescored
    head = (
        f"recalc: {len(recalc.old_scores)} projects, factors {recalc.old_set} (sha256 {recalc.old_sha256[:12]}) -> "
        f"{recalc.new_set} (sha256 {recalc.new_sha256[:12]})\n"
        f"{len(recalc.changed_factors)} factor rows differ; {rescored} projects use one of them and were rescored, "
        f"the others kept their result\n\n"
    )
    groups: dict[str, list] = {}
    for row in recalc.rows:
        groups.setdefault(row.status, []).append(row)
    unchanged = sum(len(rows) for status, rows in groups.items() if status.startswith("still"))
    counted = unchanged > UNCHANGED_ROWS_SHOWN
    # one table per change of status: a status column would leave no room for the project's name
    body = "".join(
        _counted_rows(status, rows) if counted and status.startswith("still") else _status_table(status, rows)
        for status, rows in groups.items()
    )
    if counted:
        body += f"({unchanged:,} unchanged rows counted by scheme; --format csv or json lists every row)\n"
    newly = recalc.newly_failing
    named = "; ".join(f"{r.project} ({r.scheme})" for r in newly) if 0 < len(newly) <= NEWLY_FAILING_NAMED else ""
    tail = f"\n{len(newly)} project-scheme pairs now fail" + (f": {named}" if named else "") + "\n"
    flags = (
        (FROM_MEMORY_RULEBOOK + "\n" if any(row.rulebook_from_memory for row in recalc.rows) else "")
        + _flagged_factors(recalc.from_memory["factors"])
        + "\n"
    )
    return head + body + tail + flags + f"Caution: {CAUTION}\n"


def _status_table(status: str, rows: list) -> str:
    """The rows of one change of status as a table: project, scheme, old and new value, change, unit, limit."""
    cells = [
        [
            row.project,
            row.scheme + (" *" if row.rulebook_from_memory else ""),
            display_number(row.old_value),
            display_number(row.new_value),
            f"{row.change:+.4g}",
            row.unit,
            display_number(row.limit),
        ]
        for row in rows
    ]
    return (
        f"{status} ({len(cells)})\n"
        + plain_table(
            ["project", "scheme", "old", "new", "change", "unit", "limit"],
            cells,
            {"old", "new", "change", "limit"},
            wrap={"project", "unit"},
        )
        + "\n"
    )


def _counted_rows(status: str, rows: list) -> str:
    """The rows of one change of status counted by scheme, with the largest change of value."""
    by_scheme: dict[str, list] = {}
    for row in rows:
        by_scheme.setdefault(row.scheme + (" *" if row.rulebook_from_memory else ""), []).append(row)
    lines = [
        f"  {scheme}: {len(members):,} (largest change {max((r.change for r in members), key=abs):+.4g} "
        f"{members[0].unit})"
        for scheme, members in by_scheme.items()
    ]
    return f"{status} ({len(rows):,})\n" + "\n".join(lines) + "\n\n"


# --- factor sets ---------------------------------------------------------------------------------


def sets_table(sets: list[dict]) -> str:
    rows = [
        [
            s["name"],
            s["date"],
            s["sha256"][:12],
            s["base"] or "-",
            s["description"][:70] + ("..." if len(s["description"]) > 70 else ""),
        ]
        for s in sets
    ]
    # the start of the sha256 (JSON and CSV: all 64 characters)
    return plain_table(["name", "date", "sha256", "base", "description"], rows, wrap={"description"})


def diff_rows(changes) -> list[dict]:
    return [
        {
            "id": c.id,
            "kind": c.kind,
            "old_value": c.old.value if c.old else None,
            "new_value": c.new.value if c.new else None,
            "unit": (c.new or c.old).unit,
            "old_source": c.old.citation() if c.old else None,
            "new_source": c.new.citation() if c.new else None,
            "grade": (c.new or c.old).grade.words,
        }
        for c in changes
    ]


def diff_table(old_name: str, new_name: str, changes) -> str:
    rows = [
        [
            r["kind"],
            r["id"],
            "-" if r["old_value"] is None else f"{r['old_value']:g}",
            "-" if r["new_value"] is None else f"{r['new_value']:g}",
            r["unit"],
            _shortened(r["new_source"] or r["old_source"], 100),
        ]
        for r in diff_rows(changes)
    ]
    grades: dict[str, int] = {}
    for r in diff_rows(changes):
        grades[r["grade"]] = grades.get(r["grade"], 0) + 1
    head = (
        f"factor set {old_name} -> {new_name}: {sum(1 for c in changes if c.kind == 'changed')} changed, "
        f"{sum(1 for c in changes if c.kind == 'added')} added, {sum(1 for c in changes if c.kind == 'removed')} "
        "removed\n"
    )
    body = (
        plain_table(["kind", "id", "old", "new", "unit", "source"], rows, {"old", "new"}, wrap={"id", "unit", "source"})
        if rows
        else ""
    )
    graded = (
        (
            "Source grades of the rows listed: "
            + "; ".join(f"{words}: {count}" for words, count in grades.items())
            + "\n"
        )
        if grades
        else ""
    )
    return head + body + graded + f"Caution: {CAUTION}\n"


# --- lifetime ------------------------------------------------------------------------------------


def lifetime_json(result) -> str:
    data = asdict(result)
    data["caution"] = CAUTION
    data["from_memory"] = result.from_memory
    return strict_json(data, result.project_file)


YEAR_MARKS = {Status.FAILS: " x", Status.UNDETERMINED: " ?", Status.NOT_ELIGIBLE: " n/e"}


LIFETIME_COLUMNS = (
    "year", "stack_age_years", "efficiency_fraction", "output_t", "grid_factor", "grid_factor_unit", "total",
    "total_unit",
)  # fmt: skip


def _lifetime_average_row(result, construction: str, blank_cells: int) -> tuple:
    """The CSV row of the lifetime average ``without`` or ``with`` construction: the output-weighted
    average of the total and of each scheme's value, each scheme's status, and the rulebooks recorded
    from memory."""
    average = f"average_{construction}_construction"
    return (
        (f"lifetime_{construction}_construction", "", "", result.lifetime_output_t, "", "")
        + (getattr(result, average), result.unit)
        + tuple(getattr(s, average) for s in result.schemes)
        + tuple(s.status for s in result.schemes)
        + ("",) * blank_cells
        + ("; ".join(result.from_memory["rulebooks"]),)
    )


def lifetime_csv(result) -> str:
    """One row per operating year, then the two lifetime averages; the ``not_yet_verified`` column
    lists the factors of each year not yet verified against the source document, and on the
    average rows the rulebooks recorded from memory."""
    schemes = [s.scheme for s in result.schemes]
    series = bool(result.time_series)
    extra = ("series_year", "grid_profile_scale") + tuple(f"{s}_matched_share" for s in schemes) if series else ()
    header = LIFETIME_COLUMNS + tuple(schemes) + tuple(f"{s}_status" for s in schemes) + extra + ("not_yet_verified",)

    def series_cells(y) -> tuple:
        if not series:
            return ()
        return (y.series_year, "" if y.grid_profile_scale is None else y.grid_profile_scale) + tuple(
            y.matched_share.get(s, "") for s in schemes
        )

    rows = [
        (
            y.year,
            y.stack_age_years,
            y.efficiency_fraction,
            y.output_t,
            "" if y.grid_factor is None else y.grid_factor,
            y.grid_factor_unit,
            y.total,
            result.unit,
        )
        + tuple(y.scheme_values[s] for s in schemes)
        + tuple(y.statuses.get(s, "") for s in schemes)
        + series_cells(y)
        + ("; ".join(y.factors_from_memory),)
        for y in result.years
    ]
    rows.append(_lifetime_average_row(result, "without", len(extra)))
    rows.append(_lifetime_average_row(result, "with", len(extra)))
    return csv_text(header, rows, caution=CAUTION)


def lifetime_table(result) -> str:
    lines = [
        f"{result.project}  ({result.product}, lifetime {result.operating_years} years)",
        f"project file: {result.project_file}",
        f"factors: {result.factor_set} (sha256 {result.factor_set_sha256[:12]}) "
        f"  GWP100 of the total: {result.gwp.upper()}"
        + (f"   grid trajectory: {result.trajectory_source}" if result.trajectory_source else ""),
    ]
    if result.time_series:
        lines.append(f"electricity time series: {result.time_series}; scheme values matched under each year's rule")
    lines.append("")
    headers = ["year", "stack age", "efficiency", "output t", "grid", f"total {result.unit}"]
    rows = [
        [
            str(y.year),
            str(y.stack_age_years),
            f"{y.efficiency_fraction:.3f}",
            f"{y.output_t:,.0f}",
            "-" if y.grid_factor is None else f"{y.grid_factor:g}",
            display_number(y.total),
        ]
        for y in result.years
    ]
    lines.append(plain_table(headers, rows, set(headers) - {"year"}))
    lines += _scheme_years_lines(result)
    lines.append("")
    lines += _lifetime_scheme_lines(result)
    lines.append(f"Caution: {CAUTION}")
    return "\n".join(lines) + "\n"


def _scheme_years_lines(result) -> list[str]:
    """Each scheme's value by year, in its own unit (a second table, so that both fit the terminal),
    its marks, and the lifetime output and averages."""
    schemes = result.schemes
    lines = []
    headers = ["year"] + [s.scheme for s in schemes]
    rows = [
        [str(y.year)]
        + [
            display_number(y.scheme_values[s.scheme]) + YEAR_MARKS.get(y.statuses.get(s.scheme, ""), "")
            for s in schemes
        ]
        for y in result.years
    ]
    lines.append("Scheme values by year: " + "; ".join(f"{s.scheme} in {s.unit}" for s in schemes))
    lines.append(plain_table(headers, rows, set(headers) - {"year"}))
    lines.append(
        "x = fails that year (threshold missed, construction added where the rulebook "
        "counts it, or a rule broken); ? = a rule cannot be judged; n/e = not eligible"
    )
    lines.append(
        f"lifetime output {result.lifetime_output_t:,.0f} t; construction {result.construction_t_co2e:,.0f} t CO2e = "
        f"{display_number(result.construction_kg_co2e_per_unit)} {result.unit}"
    )
    lines.append(
        f"lifetime average (output-weighted): {display_number(result.average_without_construction)} {result.unit} "
        f"without construction, {display_number(result.average_with_construction)} with"
    )
    return lines


def _lifetime_scheme_lines(result) -> list[str]:
    """The lifetime value of each scheme against its limit, the years it missed, and its notes."""
    schemes = result.schemes
    lines = []
    rows = [
        [
            s.scheme + (" *" if s.from_memory else ""),
            display_number(s.lifetime_value),
            display_number(s.limit),
            s.unit,
            status_name(s.status),
            ", ".join(str(y) for y in s.years_missed) or "none",
        ]
        for s in schemes
    ]
    lines.append(
        plain_table(
            ["scheme", "lifetime value", "limit", "unit", "status", "years missed"],
            rows,
            {"lifetime value", "limit"},
            wrap={"unit", "status", "years missed"},
        )
    )
    counting = [s.scheme for s in schemes if s.counts_construction]
    lines.append(
        f"Construction counted in the lifetime value by: {', '.join(counting) or 'none of these rulebooks'}; "
        "each scheme's averages without and with construction are in the JSON and CSV."
    )
    lines.append(
        "* each rulebook's construction rule (counts_construction in factors/schemes/*.toml) is recorded from memory"
    )
    if any(s.from_memory for s in schemes):
        lines.append(FROM_MEMORY_RULEBOOK)
    lines.append(_flagged_factors(result.from_memory["factors"]))
    return lines


# --- history -------------------------------------------------------------------------------------


def _why(changes: dict | None, year_change: str = "") -> list[str]:
    if changes is None:
        return ["first record"]
    why = [year_change] if year_change else []
    if changes["project_file"]:
        why.append("project file edited")
    if changes["factor_set"]:
        why.append(f"factor set {changes['factor_set']['old']} -> {changes['factor_set']['new']}")
    if changes["gwp"]:
        why.append(f"GWP set {changes['gwp']['old']} -> {changes['gwp']['new']}")
    for p in changes["parameters"]:
        why.append(f"input {p['parameter']}: {p['old']} -> {p['new']}")
    for f in changes["factors"]:
        if f["kind"] == "changed":
            source = "" if f["old_source"] == f["new_source"] else f" (source now: {f['new_source']})"
            why.append(f"factor {f['id']}: {f['old']:g} -> {f['new']:g} {f['unit']}{source}")
        else:
            why.append(f"factor {f['id']} {f['kind']}")
    return why or ["nothing changed in inputs or factors"]


def flagged_factors(entry: dict) -> list[str]:
    """Ids of a ledger record's factors not yet verified against the source document (``from_memory``,
    derived from the grade in records written since grades exist)."""
    return [factor["id"] for factor in entry.get("factors_used", []) if factor.get("from_memory")]


def history_table(project_file: str, history: list[dict]) -> str:
    """The records of a project (or of every project, ``project_file`` ''), each with who made it
    and what changed since the project's record before."""
    if not history:
        return f"no runs of {project_file or 'any project'} matching in the ledger\nCaution: {CAUTION}\n"
    projects = {entry["project_path"] for entry in history}
    title = f"{history[-1]['project']} ({project_file})" if project_file else f"{len(projects)} projects"
    lines = [f"history of {title}: {len(history)} records", ""]
    previous_checks: dict[tuple[str, str], float] = {}
    previous_year: dict[str, object] = {}
    for entry in history:
        year_value = entry.get("assessment_year") or entry["results"].get("assessment_year")
        year = f"  assessment year {year_value}" if year_value else ""
        lines.append(
            f"#{entry['record']}  {entry['time']}  {entry['command']}  [{entry['kind']}] "
            f" factors {entry['factor_set']} ({entry['factor_set_sha256'][:8]})"
            f"  GWP {entry['gwp'].upper()}  file {entry['project_sha256'][:8]}{year}"
        )
        lines.append(
            f"    by {entry.get('user') or 'unknown user'} on {entry.get('host') or 'unknown host'}, "
            f"carbonledger {entry['carbonledger_version']}"
            + ("" if project_file else f"; project {entry['project']} ({entry['project_path']})")
        )
        results = entry["results"]
        if "headline" in results:  # an analysis run (uncertainty, sensitivity, headroom): its own one-line summary
            lines.append(f"    {results['headline']}")
            lines.append("")
            continue
        lines.append(f"    total {display_number(results['total'])} {results['unit']}")
        for check in results["checks"]:
            key = (entry["project_path"], check["scheme"])
            old = previous_checks.get(key)
            change = (
                0.0 if old is None or abs(check["value"] - old) <= 1e-9 * max(1.0, abs(old)) else check["value"] - old
            )
            delta = "" if old is None else f"  ({change:+.4g})"
            lines.append(
                f"    {check['scheme']:<15} {display_number(check['value']):>10} {check['unit']:<20} "
                f"{check.get('status', 'qualifies' if check.get('passes') else 'fails').replace('_', ' ')}{delta}"
            )
            previous_checks[key] = check["value"]
        last_year = previous_year.get(entry["project_path"])
        year_change = (
            f"assessment year {last_year} -> {year_value} (the rules in force that year)"
            if last_year and year_value and year_value != last_year
            else ""
        )
        previous_year[entry["project_path"]] = year_value or last_year
        for reason in _why(entry["changes"], year_change):
            lines.append(f"    why: {reason}")
        flagged = flagged_factors(entry)
        if flagged:
            lines.append(f"    factors not yet verified against the source document: {', '.join(flagged)}")
        lines.append("")
    lines.append(f"Caution: {CAUTION}")
    return "\n".join(lines) + "\n"


EXPORT_HEADER = (
    "record_sha256", "run_key", "recorded_at", "user", "host", "carbonledger_version", "command", "kind", "project",
    "project_path", "project_sha256", "factor_set", "factor_set_sha256", "assessment_year", "boundary", "gwp", "total",
    "unit", "scheme", "value", "check_unit", "limit", "status", "passes", "tier",
)  # fmt: skip


def export_rows(entries: list[dict]) -> list[tuple]:
    """One row per record and scheme check (a record without checks gives one row), for a BI tool."""
    rows = []
    for e in entries:
        head = (e["sha256"], e["run_key"], e["recorded_at"], e["user"], e["host"], e["carbonledger_version"],
                e["command"], e["kind"], e["project"], e["project_path"], e["project_sha256"], e["factor_set"],
                e["factor_set_sha256"], e["assessment_year"], e["boundary"], e["gwp"], e["results"].get("total"),
                e["results"].get("unit"))  # fmt: skip
        checks = e["results"].get("checks") or [{}]
        rows += [
            head
            + (
                c.get("scheme"),
                c.get("value"),
                c.get("unit"),
                c.get("limit"),
                c.get("status"),
                c.get("passes"),
                c.get("tier"),
            )
            for c in checks
        ]
    return rows
