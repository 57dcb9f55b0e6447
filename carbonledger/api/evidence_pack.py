"""The evidence pack: write a project's pack and verify one by scoring it again."""

from __future__ import annotations

import json
import tempfile
from datetime import UTC, datetime
from pathlib import Path

from ..about import CAUTION
from ..core.assessment import Assessment
from ..core.results import ScoreResult
from ..core.scoring import DEFAULT_GWP
from ..errors import InputError
from ..io.ledger import project_history
from ..io.pack import manifest_of, read_pack, unpack, workbook_bytes, write_pack
from ..model.factors import DEFAULT_SET, load_factor_set
from ..model.rulebooks import using_rulebooks
from ..routes.project import load_project
from .reports import report
from .scoring import assessment_or_default, requested_as, score, user_rulebooks
from .workbooks import audit_workbook

# --- the evidence pack ----------------------------------------------------------------------------

PACK_PROJECT_FOLDER = "project"
PACK_RULEBOOK_FOLDER = "rulebooks"  # the user rulebooks (--rulebook) in a pack


def files_read_by(project, project_file: str | Path) -> dict[str, Path]:
    """The files a project reads beside itself, by their path relative to the project file.

    Its electricity time series and its grid trajectory CSV; one outside the project's folder is refused.

    Parameters
    ----------
    project : Project
        The validated project.
    project_file : str or Path
        The project TOML file (the files it names are relative to its folder).

    Returns
    -------
    dict of str to Path
        Relative path (POSIX) -> resolved path of every file the project reads.

    Raises
    ------
    InputError
        When a file the project reads is outside the project's folder (it could not go in the pack).
    """
    base = Path(project_file).resolve().parent
    named = [("electricity.time_series", project.electricity.time_series)]
    if project.lifetime is not None:
        named.append(("lifetime.grid_trajectory_csv", project.lifetime.grid_trajectory_csv))
    found = {}
    for field, name in named:
        if not name:
            continue
        path = (base / name).resolve()
        if base not in path.parents:
            raise InputError(
                project_file,
                field,
                f"a file in the project's folder or below it, to go in the pack (copy '{name}' beside the project "
                "file)",
            )
        found[path.relative_to(base).as_posix()] = path
    return found


def pack(
    project_file: str | Path,
    output: str | Path,
    assessment: Assessment | None = None,
    *,
    ledger: str | Path | None = None,
    force: bool = False,
    rulebooks: list[str | Path] | None = None,
) -> tuple[dict, ScoreResult]:
    """Write an evidence pack of a project.

    The pack holds the project file and every file it reads, the factor overrides (a factor CSV or set
    folder of the assessment's set; a shipped set is named with its sha256), the user's own rulebooks, the
    result as JSON, the audit workbook, the report, the project's records in the run ledger, and a manifest
    with the sha256 of every file, the version and the assessment year.

    Parameters
    ----------
    project_file : str or Path
        The project TOML file.
    output : str or Path
        The pack (zip) file to write.
    assessment : Assessment or None
        The run's options (factor set, GWP100 set, schemes, overrides, boundary, assessment year; a factor CSV or set
        folder of the user's goes in the pack); None: the
        defaults (``api.scoring.assessment_or_default``).
    ledger : str, Path or None
        The run ledger whose records of the project go in the pack; default ``$CARBONLEDGER_LEDGER``, else the
        ledger in the user's data folder.
    force : bool
        Overwrite an existing pack file.
    rulebooks : list of str or Path or None
        The user's own rulebook TOML files, checked beside the schemes and packed.

    Returns
    -------
    tuple of (dict, ScoreResult)
        The manifest and the result packed.

    Raises
    ------
    InputError
        When two rulebook files have the same file name (they would take one place in the pack).

    References
    ----------
    .. [1] PKWARE, APPNOTE.TXT - .ZIP File Format Specification (the zip container).
    .. [2] FIPS 180-4, Secure Hash Standard (SHA-256).
    """
    packed_rulebooks = {}
    for path in dict.fromkeys(Path(given) for given in rulebooks or []):
        name = f"{PACK_RULEBOOK_FOLDER}/{path.name}"
        if name in packed_rulebooks:
            raise InputError(
                path,
                "--rulebook",
                f"a file name of its own in the pack ({packed_rulebooks[name]} has the name {path.name} too)",
            )
        packed_rulebooks[name] = path
    with using_rulebooks(user_rulebooks(list(packed_rulebooks.values()))):
        return _pack(Path(project_file), output, assessment_or_default(assessment), ledger, force, packed_rulebooks)


def _pack(
    project_file: Path, output, assessment: Assessment, ledger, force, packed_rulebooks: dict[str, Path]
) -> tuple[dict, ScoreResult]:
    project, _ = load_project(project_file, assessment.project_overrides)
    factor_set = assessment.factor_set
    result = score(project_file, assessment)
    year = int(
        getattr(result, "assessment_year", None)
        or next((c.assessment_period for c in result.checks if c.assessment_period), None)
        or assessment.year
        or datetime.now(UTC).year
    )
    assessment = assessment.but(year=year)
    files = {f"{PACK_PROJECT_FOLDER}/{project_file.name}": project_file.read_bytes()}
    files.update(
        {
            f"{PACK_PROJECT_FOLDER}/{name}": path.read_bytes()
            for name, path in files_read_by(project, project_file).items()
        }
    )
    files.update({name: path.read_bytes() for name, path in packed_rulebooks.items()})
    factors_in_pack = ""
    overrides = Path(requested_as(factor_set))
    if overrides.is_file():
        factors_in_pack = f"factors/{overrides.name}"
        files[factors_in_pack] = overrides.read_bytes()
    elif overrides.is_dir():
        factors_in_pack = f"factors/{overrides.name}"
        files.update(
            {
                f"{factors_in_pack}/{path.name}": path.read_bytes()
                for path in sorted(overrides.iterdir())
                if path.is_file()
            }
        )
    files["result.json"] = result.to_json().encode("utf-8")
    book, _, _ = audit_workbook(project_file, assessment)
    files["workbook.xlsx"] = workbook_bytes(book)
    files["report.html"] = report([project_file], assessment).encode("utf-8")
    try:
        records = project_history(project_file, ledger)
    except InputError:  # no ledger yet: the pack says so
        records = []
    files["ledger.json"] = (
        json.dumps({"project_file": str(project_file.resolve()), "records": records}, indent=2, default=str) + "\n"
    ).encode("utf-8")
    manifest = manifest_of(
        files,
        carbonledger_version=result.carbonledger_version,
        assessment_year=year,
        project=f"{PACK_PROJECT_FOLDER}/{project_file.name}",
        options={
            "factors": factors_in_pack or factor_set.name,
            "gwp": assessment.gwp,
            "schemes": list(assessment.schemes or []),
            "year": year,
            "rulebooks": list(packed_rulebooks),
            **({"overrides": list(assessment.overrides)} if assessment.overrides else {}),
            **({"boundary": assessment.boundary} if assessment.boundary else {}),
        },
        factor_set={"name": factor_set.name, "sha256": factor_set.sha256},
        caution=CAUTION,
    )
    write_pack(output, files, manifest, force=force)
    return manifest, result


def packed_figures(result: dict) -> dict[str, object]:
    """The figures and statuses of a result's JSON that a re-score must reproduce.

    Parameters
    ----------
    result : dict
        A result's JSON document (``ScoreResult.to_json()``, read back).

    Returns
    -------
    dict of str to object
        Figure name -> value: total, every intensity, stage and gas (in the result's units), and each check's
        value, limit, status and tier (``<scheme>.<key>``).
    """
    figures: dict[str, object] = {"total": result["total"]}
    figures.update({f"intensity.{k}": v for k, v in result["intensity"].items()})
    figures.update({f"by_stage.{k}": v for k, v in result["by_stage"].items()})
    figures.update({f"by_gas.{k}": v for k, v in result["by_gas"].items()})
    for check in result["checks"]:
        for key in ("value", "limit", "status", "tier"):
            figures[f"{check['scheme']}.{key}"] = check.get(key)
    return figures


def verify_pack(path: str | Path) -> list[tuple[str, object, object, bool]]:
    """Verify a pack: check it against its manifest, re-score its project and compare every figure and status.

    The project is re-scored in a fresh folder with the options it was packed with. Figures are reproduced
    to a relative 1e-9; a shipped factor set must have the sha256 the pack names.

    Parameters
    ----------
    path : str or Path
        The pack (zip) file.

    Returns
    -------
    list of tuple of (str, object, object, bool)
        One row per figure: (figure, packed, re-scored, reproduced).

    Raises
    ------
    InputError
        When the pack names a shipped factor set whose sha256 differs from this installation's.
    io.pack.PackMismatch
        When a file of the pack does not match its manifest (raised by ``io.pack.read_pack``; names the file).

    References
    ----------
    .. [1] PKWARE, APPNOTE.TXT - .ZIP File Format Specification (the zip container).
    .. [2] FIPS 180-4, Secure Hash Standard (SHA-256).
    """
    packed = read_pack(path)
    manifest, options = packed.manifest, packed.manifest.get("options", {})
    with tempfile.TemporaryDirectory(prefix="carbonledger-verify-") as folder:
        unpack(packed, Path(folder))
        factors = options.get("factors", DEFAULT_SET)
        in_pack = Path(folder) / factors
        factor_set = load_factor_set(in_pack if factors.startswith("factors/") else factors)
        expected_sha = manifest.get("factor_set", {}).get("sha256")
        if not factors.startswith("factors/") and expected_sha and factor_set.sha256 != expected_sha:
            raise InputError(
                path,
                "factor_set",
                f"factor set '{factors}' with sha256 {expected_sha} as packed; this installation's has "
                f"{factor_set.sha256}",
            )
        with using_rulebooks(user_rulebooks([Path(folder) / name for name in options.get("rulebooks", [])])):
            packed_as = Assessment(
                factor_set,
                options.get("gwp", DEFAULT_GWP),
                tuple(options.get("schemes") or ()) or None,
                tuple(options.get("overrides", ())),
                options.get("boundary"),
                options.get("year"),
            )
            rescored = score(Path(folder) / manifest["project"], packed_as)
    before = packed_figures(json.loads(packed.files["result.json"]))
    after = packed_figures(json.loads(rescored.to_json()))
    rows = []
    for figure in sorted(set(before) | set(after)):
        old, new = before.get(figure), after.get(figure)
        same = old == new or (
            isinstance(old, (int, float))
            and isinstance(new, (int, float))
            and abs(old - new) <= 1e-9 * max(abs(old), abs(new), 1e-12)
        )
        rows.append((figure, old, new, same))
    return rows
