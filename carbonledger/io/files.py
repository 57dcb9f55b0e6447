"""Safe file writing: never overwrite without being asked, and never leave half a file."""

from __future__ import annotations

import os
import tempfile
from pathlib import Path
from typing import Callable

from ..errors import InputError


def atomic_write(path: str | Path, write: Callable[[Path], None], force: bool = False, option: str = "--force") -> Path:
    """Call ``write(tmp_path)`` on a temporary file beside ``path``, then rename it into place.

    An existing file is left untouched unless ``force``; a failure leaves no partial file.
    """
    target = Path(path)
    if target.is_dir():
        raise InputError(target, "", "a file path, not a folder (a folder is never overwritten, even with --force)")
    if target.exists() and not force:
        raise InputError(target, "", f"a path that does not exist yet (the file exists; pass {option} to overwrite it)")
    folder = target.parent if str(target.parent) else Path(".")
    if not folder.is_dir():
        raise InputError(target, "", f"a path in an existing folder ('{folder}' does not exist)")
    try:
        handle, temporary = tempfile.mkstemp(prefix=f".{target.name}.", suffix=".part", dir=folder)
    except OSError as error:
        raise InputError(target, "", f"a path in a folder that can be written ({error.strerror})") from None
    os.close(handle)
    temporary_path = Path(temporary)
    try:
        write(temporary_path)
        os.replace(temporary_path, target)
    except OSError as error:
        raise InputError(target, "", f"a path that can be written ({error.strerror}); nothing was written") from None
    finally:
        if temporary_path.exists():
            temporary_path.unlink()
    return target
