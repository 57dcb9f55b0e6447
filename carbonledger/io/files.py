"""Safe file writing: never overwrite without being asked, and never leave half a file."""

from __future__ import annotations

import os
import tempfile
from collections.abc import Callable
from pathlib import Path

from ..errors import InputError


def atomic_write(path: str | Path, write: Callable[[Path], None], force: bool = False, option: str = "--force") -> Path:
    """Call ``write(tmp_path)`` on a temporary file beside ``path``, then rename it into place.

    An existing file is left untouched unless ``force``; a failure leaves no partial file.
    """
    target = Path(path)
    if target.exists() and not force:
        raise InputError(target, "", f"a path that does not exist yet (the file exists; pass {option} to overwrite it)")
    folder = target.parent if str(target.parent) else Path(".")
    if not folder.is_dir():
        raise InputError(target, "", f"a path in an existing folder ('{folder}' does not exist)")
    handle, temporary = tempfile.mkstemp(prefix=f".{target.name}.", suffix=".part", dir=folder)
    os.close(handle)
    temporary_path = Path(temporary)
    try:
        write(temporary_path)
        os.replace(temporary_path, target)
    finally:
        if temporary_path.exists():
            temporary_path.unlink()
    return target
