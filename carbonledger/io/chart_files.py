"""Writing a chart file: PNG or SVG by the file's suffix, atomically, never over an existing file
without ``force``. Every chart of the tool (compare, score, matching, uncertainty, sensitivity)
is written here; matplotlib is imported only when a chart is asked for."""

from __future__ import annotations

from collections.abc import Callable
from pathlib import Path

from ..errors import InputError
from .files import atomic_write

CHART_FORMATS = ("png", "svg")

# Every chart is drawn under these settings. Names come from users: with mathematical notation
# and TeX off, "$x$" or "a $ b" is drawn as typed (an unbalanced "$" no longer fails to draw).
# A fixed salt makes the SVG's clip-path ids, and so the file, the same on every run.
CHART_SETTINGS = {"text.usetex": False, "text.parse_math": False, "svg.hashsalt": "carbonledger"}


def write_figure(
    path: str | Path, make_figure: Callable[[], object], force: bool = False, *, svg_text: bool = False
) -> Path:
    """Draw ``make_figure()`` and save it to ``path``; ``svg_text`` keeps SVG text as text (searchable, read aloud)."""
    path = Path(path)
    kind = path.suffix.lower().lstrip(".")
    if kind not in CHART_FORMATS:
        raise InputError(path, "--chart", f"a file ending in .png or .svg, got '{path.suffix or 'no suffix'}'")
    import matplotlib

    with matplotlib.rc_context(CHART_SETTINGS | ({"svg.fonttype": "none"} if svg_text else {})):
        figure = make_figure()
        import matplotlib.pyplot as plt

        def save(tmp: Path) -> None:
            figure.savefig(tmp, format=kind, dpi=150, metadata={"Date": None} if kind == "svg" else None)

        try:
            return atomic_write(path, save, force=force)
        finally:
            plt.close(figure)
