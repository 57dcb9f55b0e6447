"""Reading a file a user names: a regular file of bounded size, or one InputError line.

A device (``/dev/zero``), a pipe or a folder given where a file is expected would be read until
memory runs out, or block forever; a file larger than any real input is a mistake. Both are
refused before a byte is parsed. Every input file of the tool (project TOML, factor and meters
CSVs, time series, trajectories, distributions) is read through ``read_input_bytes``.
"""

from __future__ import annotations

import stat
from pathlib import Path

from ..errors import InputError

# A year of 15-minute intervals with 50 columns of numbers is about 35 MB; a factor set of every
# region and year a few MB. 256 MiB is far above any real input and far below what exhausts memory.
MAX_INPUT_BYTES = 256 * 1024 * 1024


def check_input_file(path: str | Path, what: str, limit: int = MAX_INPUT_BYTES) -> Path:
    """``path`` when it is a regular file of at most ``limit`` bytes (nothing is read), else one InputError."""
    return _checked(path, what, limit)[0]


def _checked(path: str | Path, what: str, limit: int) -> tuple[Path, int]:
    """(path, size in bytes) of a regular file of at most ``limit`` bytes, else one InputError."""
    path = Path(path)
    try:
        info = path.stat()
    except OSError as error:
        raise InputError(path, "", f"a readable {what} ({error.strerror})") from None
    if not stat.S_ISREG(info.st_mode):
        kind = "a folder" if stat.S_ISDIR(info.st_mode) else "a device, pipe or socket"
        raise InputError(path, "", f"a regular file as the {what}, got {kind}")
    if info.st_size > limit:
        raise InputError(
            path, "", f"a {what} of at most {limit // (1024 * 1024)} MiB, got {info.st_size / (1024 * 1024):,.0f} MiB"
        )
    return path, info.st_size


def read_input_bytes(path: str | Path, what: str, limit: int = MAX_INPUT_BYTES) -> bytes:
    """The bytes of ``path`` when it is a regular file of at most ``limit`` bytes.

    The file is read at the size it had when checked (one byte more shows it grew, and the rest is read up
    to the limit): reading ``limit`` bytes at once would make Python set aside the whole limit for each file.

    Parameters
    ----------
    path : the file a user named.
    what : what the file should be, for the message ("project file", "time series CSV").
    limit : the largest size accepted, bytes.
    """
    path, size = _checked(path, what, limit)
    try:
        with path.open("rb") as handle:
            raw = handle.read(size + 1)
            if len(raw) > size:  # grew since it was checked
                raw += handle.read(limit + 1 - len(raw))
    except OSError as error:
        raise InputError(path, "", f"a readable {what} ({error.strerror})") from None
    if len(raw) > limit:  # grew while read
        raise InputError(path, "", f"a {what} of at most {limit // (1024 * 1024)} MiB")
    return raw
