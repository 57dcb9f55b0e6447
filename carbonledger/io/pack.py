"""The evidence pack: one zip a verifier can check and re-score (``carbonledger pack`` and ``verify``).

``write_pack`` writes the files and a ``manifest.json`` holding the sha256 of every file, the
carbonledger version and the assessment year; ``read_pack`` reads a pack back and checks every
file against its manifest: a file changed, missing or added is a ``PackMismatch`` naming it (the
command exits 3). Neither scores: ``api.pack`` and ``api.verify_pack`` do.

References
----------
PKWARE, APPNOTE.TXT - .ZIP File Format Specification (the zip container, read and written with
Python's zipfile); FIPS 180-4, Secure Hash Standard (SHA-256, Python's hashlib).
"""

from __future__ import annotations

import hashlib
import io
import json
import zipfile
from dataclasses import dataclass
from pathlib import Path

from ..errors import InputError
from .files import atomic_write

MANIFEST = "manifest.json"
PACK_FORMAT = 1
MAX_PACK_BYTES = 200 * 1024 * 1024  # a pack unpacking to more than this is refused before it is read


class PackMismatch(Exception):
    """A pack whose files do not match its manifest: names the file and what is wrong with it."""

    def __init__(self, pack: str | Path, name: str, why: str):
        self.pack, self.name, self.why = str(pack), name, why
        super().__init__(f"{pack}: {name}: {why}")


def sha256_of(data: bytes) -> str:
    return hashlib.sha256(data).hexdigest()


def manifest_of(files: dict[str, bytes], **about) -> dict:
    """The manifest: what the pack is (``about``: version, assessment year, options) and the sha256 of every file."""
    return {"format": PACK_FORMAT, **about, "files": {name: sha256_of(data) for name, data in sorted(files.items())}}


def write_pack(path: str | Path, files: dict[str, bytes], manifest: dict, force: bool = False) -> Path:
    """Write the zip atomically (never over an existing file without ``force``): every file, then the manifest."""

    def write(tmp: Path) -> None:
        with zipfile.ZipFile(tmp, "w", compression=zipfile.ZIP_DEFLATED) as archive:
            for name, data in sorted(files.items()):
                archive.writestr(
                    zipfile.ZipInfo(name, date_time=(2026, 1, 1, 0, 0, 0)), data, compress_type=zipfile.ZIP_DEFLATED
                )
            archive.writestr(
                zipfile.ZipInfo(MANIFEST, date_time=(2026, 1, 1, 0, 0, 0)),
                json.dumps(manifest, indent=2, sort_keys=True) + "\n",
                compress_type=zipfile.ZIP_DEFLATED,
            )

    return atomic_write(path, write, force=force)


@dataclass
class Pack:
    manifest: dict
    files: dict[str, bytes]


def read_pack(path: str | Path) -> Pack:
    """A pack read and checked against its manifest. Not a zip, no manifest, or an unreadable one:
    ``InputError`` (exit 2). A file whose sha256 differs, a file missing, a file not in the manifest:
    ``PackMismatch`` naming the file (exit 3)."""
    path = Path(path)
    try:
        archive = zipfile.ZipFile(path)
    except (OSError, zipfile.BadZipFile) as error:
        raise InputError(path, "", f"an evidence pack written by `carbonledger pack` (a zip file; {error})") from None
    with archive:
        entries = archive.infolist()
        if sum(entry.file_size for entry in entries) > MAX_PACK_BYTES:
            raise InputError(path, "", f"a pack that unpacks to at most {MAX_PACK_BYTES // 2**20} MB")
        names = [entry.filename for entry in entries if not entry.is_dir()]
        if MANIFEST not in names:
            raise InputError(path, MANIFEST, "a manifest (this zip has none; was it written by `carbonledger pack`?)")
        try:
            manifest = json.loads(archive.read(MANIFEST).decode("utf-8"))
            listed = dict(manifest["files"])
        except (ValueError, KeyError, TypeError) as error:
            raise InputError(path, MANIFEST, f"a manifest of JSON with a 'files' table ({error})") from None
        files = {name: archive.read(name) for name in names if name != MANIFEST}
    for name, expected in sorted(listed.items()):
        if name not in files:
            raise PackMismatch(path, name, "listed in the manifest but missing from the pack")
        if sha256_of(files[name]) != expected:
            raise PackMismatch(
                path,
                name,
                f"sha256 {sha256_of(files[name])} does not match the manifest's "
                f"{expected} (the file was changed after packing)",
            )
    for name in sorted(set(files) - set(listed)):
        raise PackMismatch(path, name, "in the pack but not in its manifest (added after packing)")
    return Pack(manifest, files)


def unpack(pack: Pack, folder: Path) -> None:
    """Write the pack's files below ``folder`` (names are checked to stay inside it)."""
    root = folder.resolve()
    for name, data in pack.files.items():
        target = (root / name).resolve()
        if root not in target.parents:
            raise InputError(name, "", "a file name inside the pack's folder (no absolute path or '..')")
        target.parent.mkdir(parents=True, exist_ok=True)
        target.write_bytes(data)


def workbook_bytes(workbook) -> bytes:
    buffer = io.BytesIO()
    workbook.save(buffer)
    return buffer.getvalue()
