"""Safe file writing: never overwrite without being asked, and never leave half a file."""

from __future__ import annotations

import os
import stat
import tempfile
from collections.abc import Callable
from pathlib import Path

from ..errors import InputError


def atomic_write(path: str | Path, write: Callable[[Path], None], force: bool = False, option: str = "--force") -> Path:
    """Call ``write(tmp_path)`` on a temporary file beside ``path``, then rename it into place.

    An existing file is left untouched unless ``force``; a failure leaves no partial file. The
    file gets the mode a newly created file gets (0666 less the umask), or keeps the mode of the
    file it replaces: the temporary file's private 0600 is not passed on.
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
        mode = stat.S_IMODE(target.stat().st_mode) if target.is_file() else 0o666 & ~current_umask()
        write(temporary_path)
        os.chmod(temporary_path, mode)
        os.replace(temporary_path, target)
    except OSError as error:
        raise InputError(target, "", f"a path that can be written ({error.strerror}); nothing was written") from None
    finally:
        if temporary_path.exists():
            temporary_path.unlink()
    return target


def current_umask() -> int:
    """The process umask (read by setting it and putting it back at once)."""
    mask = os.umask(0o022)
    os.umask(mask)
    return mask
